//! Core on log depth: the core file of `[core]`, matched to the field's wells,
//! shifted by the accepted core-to-log shifts, tabled with its flow-unit
//! quantities and classes, and paired with log features for training.

use std::collections::BTreeMap;
use std::path::Path;

use serde::Serialize;

use crate::classes::ClassScheme;
use crate::classes::flow_units::{fzi, normalised_porosity, rqi, winland_r35};
use crate::classes::predictor::Feature;
use crate::config::{Config, CoreConfig, CoreFormat, PredictorConfig};
use crate::input::core_samples::{
    self, CoreData, CoreError, CoreSample, Rejected, ShiftSuggestion,
};
use crate::output::schema::Col;
use crate::output::schema::{
    FLAG_BAD_HOLE, FLAG_MISSING_INPUT, FLAG_OUT_OF_RANGE, FLAG_OUTSIDE_ZONE,
};
use crate::output::{OutputError, Table};

/// Read the core file of `[core]` in the project's depth unit.
pub fn load(config: &Config, core: &CoreConfig) -> Result<CoreData, CoreError> {
    let path = config.resolve_path(&core.file);
    let ext = path
        .extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase);
    let format = match (core.format, ext.as_deref()) {
        (CoreFormat::Auto, Some("csv")) => CoreFormat::Csv,
        (CoreFormat::Auto, Some("las")) => CoreFormat::Las3,
        (CoreFormat::Auto, _) => CoreFormat::Spwla,
        (f, _) => f,
    };
    match format {
        CoreFormat::Csv => core_samples::read_core_csv(&path, config.project.depth_unit),
        CoreFormat::Las3 => core_samples::read_core_las3(&path, config.project.depth_unit),
        _ => core_samples::read_spwla(&path, core.spwla_depth_unit, config.project.depth_unit)
            .map(|(d, _)| d),
    }
}

/// A core sample matched to a field well and put on log depth.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MatchedSample {
    /// The core sample as read (core depth before the shift, porosity v/v, permeability mD).
    pub sample: CoreSample,
    /// The field well's name (from its LAS file).
    pub well: String,
    /// The accepted shift applied (project depth unit).
    pub shift: f64,
    /// Core depth + shift: the depth on the log.
    pub log_depth: f64,
}

/// The core of a field run.
#[derive(Debug, Clone, Serialize)]
pub struct FieldCore {
    /// The core file, as a path.
    pub file: String,
    /// How the file's porosity unit was taken (percent or fraction), as text.
    pub porosity_unit: String,
    /// Samples matched to a field well, shifts applied.
    pub samples: Vec<MatchedSample>,
    /// Rows left out when read, and samples of wells the field does not have.
    pub rejected: Vec<Rejected>,
    /// Accepted shifts by well as applied.
    pub shifts: BTreeMap<String, f64>,
}

/// Match core samples to field wells (by the LAS well name or the file stem,
/// case-insensitive) and apply accepted shifts. `wells` holds (name, stem).
pub fn match_wells(data: CoreData, wells: &[(String, String)], core: &CoreConfig) -> FieldCore {
    let mut rejected = data.rejected;
    let mut samples = Vec::new();
    let mut shifts = BTreeMap::new();
    for s in data.samples {
        let Some((name, _)) = wells.iter().find(|(n, stem)| {
            n.eq_ignore_ascii_case(&s.well) || stem.eq_ignore_ascii_case(&s.well)
        }) else {
            rejected.push(Rejected {
                line: s.line,
                reason: format!("well `{}` is not among the field's LAS wells", s.well),
            });
            continue;
        };
        let shift = core
            .shift
            .iter()
            .find(|(k, _)| k.eq_ignore_ascii_case(name) || k.eq_ignore_ascii_case(&s.well))
            .map_or(0.0, |(_, v)| *v);
        if shift != 0.0 {
            shifts.insert(name.clone(), shift);
        }
        samples.push(MatchedSample {
            log_depth: s.depth + shift,
            well: name.clone(),
            shift,
            sample: s,
        });
    }
    rejected.sort_by_key(|r| r.line);
    FieldCore {
        file: data.file.display().to_string(),
        porosity_unit: data.porosity_unit,
        samples,
        rejected,
        shifts,
    }
}

impl FieldCore {
    /// Wells with core, sorted.
    pub fn wells(&self) -> Vec<String> {
        let mut w: Vec<String> = self.samples.iter().map(|s| s.well.clone()).collect();
        w.sort();
        w.dedup();
        w
    }

    /// (φ, k) of every sample.
    pub fn phi_k(&self) -> Vec<(f64, f64)> {
        self.samples
            .iter()
            .map(|s| (s.sample.porosity, s.sample.perm_md))
            .collect()
    }
}

/// Index of the table row nearest `depth` within `max_distance`, if any.
fn nearest_row(depth: &[f64], at: f64, max_distance: f64) -> Option<usize> {
    let k = depth.partition_point(|&d| d < at);
    [k.checked_sub(1), (k < depth.len()).then_some(k)]
        .into_iter()
        .flatten()
        .filter(|&i| (depth[i] - at).abs() <= max_distance)
        .min_by(|&a, &b| (depth[a] - at).abs().total_cmp(&(depth[b] - at).abs()))
}

/// Flag bits that keep a depth out of training and prediction: out of range,
/// missing input, outside every zone (a bad hole is kept for prediction but
/// not trained on).
pub const NO_CLASS_FLAGS: u32 = FLAG_OUT_OF_RANGE | FLAG_MISSING_INPUT | FLAG_OUTSIDE_ZONE;

/// Reservoir, not shale: VSH known and at most `max_vsh`.
#[inline]
pub fn is_reservoir(vsh: Option<f64>, max_vsh: f64) -> bool {
    vsh.is_some_and(|v| v <= max_vsh)
}

/// One training row: features, class, log PHIE.
pub type TrainingRow = (Vec<f64>, u8, f64, usize);

/// Pair a well's core samples with the log features at their log depth. Each
/// sample left out is returned with its line and reason.
pub fn training_rows(
    samples: &[&MatchedSample],
    table: &Table,
    features: &[Feature],
    scheme: &dyn ClassScheme,
    cfg: &PredictorConfig,
) -> (Vec<TrainingRow>, Vec<Rejected>) {
    let mut rows = Vec::new();
    let mut out = Vec::new();
    let mut skip = |line: u64, reason: String| out.push(Rejected { line, reason });
    let (Some(depth), Some(vsh), Some(phie), Some(fl)) = (
        table.get(Col::Depth),
        table.get(Col::Vsh),
        table.get(Col::Phie),
        table.get(Col::Flag),
    ) else {
        for s in samples {
            skip(s.sample.line, "the well has no computed curves".into());
        }
        return (rows, out);
    };
    let scales = cfg.context_scales();
    let w = crate::classes::features::width(features.len(), scales.len());
    let all = crate::classes::features::rows(table, features, scales);
    for s in samples {
        let line = s.sample.line;
        let Some(class) = scheme.classify(s.sample.porosity, s.sample.perm_md) else {
            skip(
                line,
                "no class (porosity or permeability not usable)".into(),
            );
            continue;
        };
        let Some(i) = nearest_row(depth, s.log_depth, cfg.max_core_distance) else {
            skip(
                line,
                format!("log depth {:.3} is not within the log", s.log_depth),
            );
            continue;
        };
        let f = fl[i] as u32;
        if f & (NO_CLASS_FLAGS | FLAG_BAD_HOLE) != 0 {
            skip(
                line,
                format!("log flagged at depth {:.3} (FLAG {f})", depth[i]),
            );
            continue;
        }
        if !is_reservoir(Some(vsh[i]), cfg.max_vsh) {
            skip(
                line,
                format!("shale at depth {:.3} (VSH {:.3})", depth[i], vsh[i]),
            );
            continue;
        }
        let x = &all[i * w..(i + 1) * w];
        if let Some(j) = x.iter().position(|v| !v.is_finite()) {
            let name = crate::classes::features::column_name(features, scales, j);
            skip(line, format!("no {name} at depth {:.3}", depth[i]));
            continue;
        }
        rows.push((x.to_vec(), class, phie[i], i));
    }
    (rows, out)
}

/// Shift suggestions for each cored well from its log PHIE (see
/// [`core_samples::suggest_shift`]); the samples' own depths, before any accepted shift.
pub fn suggest_shifts(
    core: &FieldCore,
    tables: &BTreeMap<String, Table>,
    c: &CoreConfig,
) -> BTreeMap<String, Option<ShiftSuggestion>> {
    core.wells()
        .into_iter()
        .map(|w| {
            let s = tables.get(&w).and_then(|t| {
                let (depth, phie) = (t.get(Col::Depth)?, t.get(Col::Phie)?);
                let samples: Vec<CoreSample> = core
                    .samples
                    .iter()
                    .filter(|s| s.well == w)
                    .map(|s| s.sample.clone())
                    .collect();
                core_samples::suggest_shift(
                    &samples,
                    depth,
                    phie,
                    c.shift_window,
                    c.shift_step,
                    c.shift_min_gain,
                )
            });
            (w, s)
        })
        .collect()
}

/// Write the core table: each sample with its flow-unit quantities and its
/// class in every scheme (`CLASS_<name>`), as CSV.
///
/// Columns: WELL, LINE (in the core file), DEPTH_CORE, SHIFT, DEPTH (on the
/// log), POROSITY (v/v), PERM_MD, RQI_UM, PHIZ (v/v), FZI_UM, R35_UM.
pub fn write_core_table(
    path: &Path,
    core: &FieldCore,
    schemes: &[(String, &dyn ClassScheme)],
) -> Result<(), OutputError> {
    let io = |e: csv::Error| OutputError::Io {
        path: path.to_path_buf(),
        source: std::io::Error::other(e),
    };
    crate::output::write_atomic(path, |w| {
        let mut wr = csv::Writer::from_writer(w);
        let mut head: Vec<String> = [
            "WELL",
            "LINE",
            "DEPTH_CORE",
            "SHIFT",
            "DEPTH",
            "POROSITY",
            "PERM_MD",
            "RQI_UM",
            "PHIZ",
            "FZI_UM",
            "R35_UM",
        ]
        .iter()
        .map(|s| s.to_string())
        .collect();
        head.extend(
            schemes
                .iter()
                .map(|(n, _)| format!("CLASS_{}", n.to_ascii_uppercase().replace('-', "_"))),
        );
        wr.write_record(&head).map_err(io)?;
        for m in &core.samples {
            let (phi, k) = (m.sample.porosity, m.sample.perm_md);
            let mut rec = vec![
                m.well.clone(),
                m.sample.line.to_string(),
                format!("{:.4}", m.sample.depth),
                format!("{:.4}", m.shift),
                format!("{:.4}", m.log_depth),
                format!("{phi:.4}"),
                format!("{k:.6}"),
                format!("{:.6}", rqi(k, phi)),
                format!("{:.6}", normalised_porosity(phi)),
                format!("{:.6}", fzi(k, phi)),
                format!("{:.6}", winland_r35(k, phi)),
            ];
            for (_, s) in schemes {
                rec.push(s.classify(phi, k).map_or(String::new(), |c| c.to_string()));
            }
            wr.write_record(&rec).map_err(io)?;
        }
        wr.flush().map_err(|source| OutputError::Io {
            path: path.to_path_buf(),
            source,
        })
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A sample of a well the field lacks is reported by line; shifts are
    /// matched case-insensitively and added to the core depth.
    #[test]
    fn unknown_well_rejected_and_shift_applied() {
        let sample = |well: &str, depth: f64, line: u64| CoreSample {
            well: well.into(),
            depth,
            porosity: 0.2,
            perm_md: 10.0,
            grain_density_gcc: None,
            sample_type: None,
            line,
        };
        let data = CoreData {
            file: "core.csv".into(),
            samples: vec![sample("WELL-A", 1000.0, 2), sample("Nowhere-1", 900.0, 3)],
            rejected: vec![Rejected {
                line: 4,
                reason: "permeability 0 mD is not above 0".into(),
            }],
            porosity_unit: "fraction".into(),
        };
        let cfg: CoreConfig =
            toml::from_str("file = \"core.csv\"\n[shift]\n\"well-a\" = -0.5\n").expect("cfg");
        let fc = match_wells(data, &[("Well-A".into(), "well-a".into())], &cfg);
        assert_eq!(fc.samples.len(), 1);
        assert_eq!(fc.samples[0].well, "Well-A");
        assert_eq!(fc.samples[0].log_depth, 999.5);
        assert_eq!(
            fc.rejected,
            vec![
                Rejected {
                    line: 3,
                    reason: "well `Nowhere-1` is not among the field's LAS wells".into()
                },
                Rejected {
                    line: 4,
                    reason: "permeability 0 mD is not above 0".into()
                },
            ]
        );
    }

    #[test]
    fn nearest_row_within_distance() {
        let d = [1.0, 1.5, 2.0, 2.5];
        assert_eq!(nearest_row(&d, 1.6, 0.25), Some(1));
        assert_eq!(nearest_row(&d, 1.8, 0.25), Some(2));
        assert_eq!(nearest_row(&d, 0.7, 0.25), None);
        assert_eq!(nearest_row(&d, 2.7, 0.25), Some(3));
        assert_eq!(nearest_row(&d, 3.0, 0.25), None);
        assert_eq!(nearest_row(&[], 1.0, 1.0), None);
    }
}
