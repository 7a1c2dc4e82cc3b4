//! `flowzone demo`: writes the invented demo field (see `demo-wells/README.md`)
//! from the synthetic forward model in [`crate::demo::synth`]: one LAS 2.0 file per
//! well, the CSV tables (core, capillary pressure, pressures, zone tops,
//! survey), the model's truth per well under `truth/`, and the README; or,
//! with `--wells N`, a synthetic bench field of N wells from the same model
//! ([`write_field`]).

pub mod synth;

use crate::output::messages::note;
use std::io::Write as _;
use std::path::Path;

use rayon::prelude::*;

use crate::demo::synth::{HeaderEntry, SynthCurve, SynthWell};
use crate::error::Error;
use crate::input::las::{CurveInfo, HeaderItem};
use crate::output::{OutColumn, Table, write_atomic, write_csv};

fn item(h: &HeaderEntry) -> HeaderItem {
    HeaderItem {
        mnemonic: h.mnemonic.clone(),
        unit: h.unit.clone(),
        value: h.value.clone(),
        description: h.description.clone(),
        line: 0,
    }
}

fn curve_info(mnemonic: &str, unit: &str, description: &str) -> CurveInfo {
    CurveInfo {
        mnemonic: mnemonic.into(),
        original_mnemonic: mnemonic.into(),
        unit: unit.into(),
        api_code: String::new(),
        description: description.into(),
        line: 0,
    }
}

/// The well as a LAS file, and the precision of each column.
pub fn well_las(w: &SynthWell) -> (crate::input::las::LasFile, Vec<usize>) {
    let depth_decimals = 4;
    let mut curves = vec![(
        curve_info("DEPT", &w.depth_unit, "MEASURED DEPTH"),
        w.depth.clone(),
    )];
    let mut decimals = vec![depth_decimals];
    for c in &w.curves {
        curves.push((
            curve_info(&c.mnemonic, &c.unit, &c.description),
            c.values.clone(),
        ));
        decimals.push(c.decimals);
    }
    let file = crate::output::las::new_file(
        w.well_items.iter().map(item).collect(),
        w.params.iter().map(item).collect(),
        curves,
    );
    (file, decimals)
}

fn truth_table(w: &SynthWell) -> Table {
    let mut columns = vec![OutColumn {
        key: None,
        name: "DEPTH".into(),
        unit: w.depth_unit.clone(),
        description: "MEASURED DEPTH".into(),
        values: w.depth.clone(),
        integer: false,
    }];
    columns.extend(w.truth.iter().map(|c: &SynthCurve| OutColumn {
        key: None,
        name: c.mnemonic.clone(),
        unit: c.unit.clone(),
        description: c.description.clone(),
        values: c.values.clone(),
        integer: c.mnemonic == "CLASS",
    }));
    Table {
        columns,
        ..Table::default()
    }
}

/// Write the demo field into `out`.
pub fn write_demo(out: &Path, seed: u64) -> Result<(), Error> {
    let io = |path: &Path| {
        let path = path.to_path_buf();
        move |source| Error::Io { path, source }
    };
    let field = synth::generate(seed);
    for sub in ["", "surveys", "truth"] {
        let d = out.join(sub);
        std::fs::create_dir_all(&d).map_err(io(&d))?;
    }
    for w in &field.wells {
        write_well_las(out, w)?;
        write_csv(
            &truth_table(w),
            &out.join("truth").join(format!("{}.csv", w.file_stem)),
            Some(6),
        )?;
    }
    for (name, text) in &field.tables {
        write_text(&out.join(name), text)?;
    }
    write_text(&out.join("README.md"), &synth::scenario_markdown(&field))?;
    note!(
        "wrote the demo field ({} wells, seed {seed}) to {}",
        field.wells.len(),
        out.display()
    );
    Ok(())
}

/// Write `out/<file stem>.las`.
fn write_well_las(out: &Path, w: &SynthWell) -> Result<(), crate::output::OutputError> {
    let (las, decimals) = well_las(w);
    let path = out.join(format!("{}.las", w.file_stem));
    write_atomic(&path, |f| {
        crate::output::las::write_las(f, &las, &decimals).map_err(|source| {
            crate::output::OutputError::Io {
                path: path.clone(),
                source,
            }
        })
    })
}

/// Write a synthetic bench field into `out`: `wells` LAS files
/// (`synth-0001.las`, ...) of about `depths` samples each, `zones.csv`,
/// `field.toml`, which runs the stages read, shale volume, porosity and
/// saturation on them, and the core, capillary and pressure tables of a few
/// cored wells with `field-full.toml`, which runs every stage. Wells are generated in parallel; the files depend only
/// on `seed`, `wells` and `depths`.
pub fn write_field(out: &Path, wells: usize, depths: usize, seed: u64) -> Result<(), Error> {
    if wells == 0 {
        return Err(Error::Usage("--wells must be at least 1".into()));
    }
    if depths < synth::FIELD_MIN_DEPTHS {
        return Err(Error::Usage(format!(
            "--depths must be at least {} (the log holds 100 m above and below the reservoir)",
            synth::FIELD_MIN_DEPTHS
        )));
    }
    std::fs::create_dir_all(out).map_err(|source| Error::Io {
        path: out.to_path_buf(),
        source,
    })?;
    let written: Vec<(String, Vec<String>)> = (0..wells)
        .into_par_iter()
        .map(|i| -> Result<(String, Vec<String>), Error> {
            let (w, rows) = synth::field_well(seed, i, depths);
            write_well_las(out, &w)?;
            Ok((format!("{}.las", w.file_stem), rows))
        })
        .collect::<Result<_, Error>>()?;
    let mut zones = format!("{}\n", synth::FIELD_ZONES_HEADER);
    for row in written.iter().flat_map(|w| &w.1) {
        zones += row;
        zones.push('\n');
    }
    write_text(&out.join("zones.csv"), &zones)?;
    write_text(
        &out.join("field.toml"),
        &synth::field_config(wells, depths, seed),
    )?;
    for (name, text) in synth::field_tables(seed, wells, depths) {
        write_text(&out.join(name), &text)?;
    }
    write_text(
        &out.join("field-full.toml"),
        &synth::field_full_config(wells, depths, seed),
    )?;
    let ours: std::collections::BTreeSet<&str> = written.iter().map(|w| w.0.as_str()).collect();
    let others = std::fs::read_dir(out)
        .map(|rd| {
            rd.filter_map(Result::ok)
                .map(|e| e.file_name().to_string_lossy().into_owned())
                .filter(|n| n.to_ascii_lowercase().ends_with(".las") && !ours.contains(n.as_str()))
                .count()
        })
        .unwrap_or(0);
    if others > 0 {
        note!(
            "warning: {} holds {others} other LAS files, which field.toml's [input] reads too",
            out.display()
        );
    }
    note!(
        "wrote a synthetic field ({wells} wells of ~{depths} samples, seed {seed}), field.toml and field-full.toml to {}",
        out.display()
    );
    Ok(())
}

/// Write a text file atomically.
fn write_text(path: &Path, text: &str) -> Result<(), crate::output::OutputError> {
    write_atomic(path, |f| {
        f.write_all(text.as_bytes())
            .map_err(|source| crate::output::OutputError::Io {
                path: path.to_path_buf(),
                source,
            })
    })
}
