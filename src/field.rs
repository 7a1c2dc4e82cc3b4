//! Many wells: the field run.
//!
//! Wells are processed in parallel with rayon, each read, processed, written
//! and dropped; results are collected in input order (paths sorted), so the
//! outputs and the summary are the same whatever the thread count. One bad
//! well never stops the others: it is recorded with its error.

use std::path::{Path, PathBuf};

use rayon::prelude::*;
use serde::{Deserialize, Serialize};

use crate::config::Config;
use crate::error::{Error, chain};
use crate::output::{self, file_stem};
use crate::well::{self, WellError};

/// What happened to one well.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct WellReport {
    pub file: String,
    pub well: Option<String>,
    pub ok: bool,
    pub error: Option<String>,
    pub rows: usize,
    pub outputs: Vec<String>,
    /// Logical curve, mnemonic used, unit as read.
    pub curves: Vec<(String, String, String)>,
    pub warnings: Vec<String>,
    /// Depth reference, zones with their parameters and picks, and what was clipped or flagged.
    pub stages: Option<well::WellReport>,
    /// Depths classed, per class, and why others have no class.
    pub classes: Option<crate::classify::ClassCounts>,
    /// Height above the FWL, SWH and the SW − SWH residual summary.
    pub saturation_height: Option<crate::sat_height::WellSatHeight>,
    /// Saturation steps with their kinds, and the FWL the logs imply.
    pub contacts: Option<crate::contacts::WellAudit>,
    /// Gross, net, net-to-gross, averages and HPT per zone.
    pub zones: Vec<crate::summary::ZoneSummary>,
    /// A sample of the well's (PHIE, RT, CLASS) for the field Pickett plot
    /// (not in the summary; shard states carry it beside the report).
    #[serde(skip)]
    pub pickett: Vec<crate::plots::PickettPoint>,
}

/// The run summary (also written as run-summary.json).
#[derive(Debug, Clone, Serialize)]
pub struct RunSummary {
    pub tool: String,
    pub project: String,
    pub wells_total: usize,
    pub wells_failed: usize,
    /// Core, scheme and class model of the run (when `[core]` or `[classes]` is set).
    pub classes: Option<crate::classify::ClassSummary>,
    /// The saturation-height model: J-function per class, FWL per compartment.
    pub saturation_height: Option<crate::sat_height::SatHeightModel>,
    /// Files of the saturation-height model and the residual summary.
    pub saturation_outputs: Vec<String>,
    /// Per compartment: apparent contacts and FWLs across wells.
    pub contacts: Vec<crate::contacts::CompartmentView>,
    /// contacts.csv and contacts.json.
    pub contact_outputs: Vec<String>,
    pub wells: Vec<WellReport>,
}

/// Where outputs go: refuse a folder that is, or is inside, an input folder.
pub fn check_out_dir(out: &Path, inputs: &[PathBuf]) -> Result<(), Error> {
    std::fs::create_dir_all(out).map_err(|source| Error::Io {
        path: out.to_path_buf(),
        source,
    })?;
    let out_abs = out.canonicalize().map_err(|source| Error::Io {
        path: out.to_path_buf(),
        source,
    })?;
    for input in inputs {
        let dir = if input.is_dir() {
            input.clone()
        } else {
            input
                .parent()
                .map_or_else(|| PathBuf::from("."), Path::to_path_buf)
        };
        let dir = if dir.as_os_str().is_empty() {
            PathBuf::from(".")
        } else {
            dir
        };
        if let Ok(d) = dir.canonicalize() {
            if out_abs.starts_with(&d) {
                return Err(Error::Usage(format!(
                    "output folder `{}` is inside the input folder `{}`; choose a folder outside the inputs",
                    out.display(),
                    dir.display()
                )));
            }
        }
    }
    Ok(())
}

/// Refuse inputs inside the output folder: a run writes there, and could
/// replace an input file with an output of the same name.
pub fn check_inputs_outside(out: &Path, inputs: &[PathBuf]) -> Result<(), Error> {
    let Ok(out_abs) = out.canonicalize() else {
        return Ok(());
    };
    for input in inputs {
        if let Ok(p) = input.canonicalize() {
            if p.starts_with(&out_abs) {
                return Err(Error::Usage(format!(
                    "input `{}` is inside the output folder `{}`: a run could overwrite it; move it or choose another output folder",
                    input.display(),
                    out.display()
                )));
            }
        }
    }
    Ok(())
}

/// The file that marks a finished run or merge in an output folder.
pub const FINISHED_MARKER: &str = "run-manifest.json";

/// Refuse to write into a folder that already holds `marker` (a previous
/// run's), unless `overwrite`: then files are replaced one by one, each
/// atomically, and files of wells no longer in the run are left as they are.
pub fn check_previous(out: &Path, marker: &Path, overwrite: bool) -> Result<(), Error> {
    let m = out.join(marker);
    if !overwrite && m.exists() {
        return Err(Error::Usage(format!(
            "`{}` holds a previous run (`{}` exists); give --overwrite to replace its files, or choose another output folder",
            out.display(),
            m.display()
        )));
    }
    Ok(())
}

/// What every well of a run shares, made once before the wells: the files
/// (sorted) and their output stems, the tables, the class model and the
/// saturation-height model.
pub struct FieldSetup {
    pub files: Vec<PathBuf>,
    /// Output file stem of each file (unique within the field).
    pub stems: Vec<String>,
    ctx: well::RunContext,
    prepared: Option<crate::classify::Prepared>,
    sat: Option<crate::sat_height::SatHeightModel>,
}

impl FieldSetup {
    /// Whether this run trained the class model (rather than loading one).
    pub fn trained(&self) -> bool {
        self.prepared.as_ref().is_some_and(|p| p.summary.trained)
    }

    /// The class and saturation-height models as JSON: equal for runs that
    /// will give the same results (shards check it against the merge).
    pub fn fingerprint(&self) -> String {
        let classes = self.prepared.as_ref().map(|p| &p.summary);
        serde_json::to_string(&(classes, &self.sat)).unwrap_or_default()
    }
}

/// Check the output folder, load the tables, build the class model (or load
/// it) and the saturation-height model: everything before the wells.
pub fn setup(config: &Config, out: &Path, progress: bool) -> Result<FieldSetup, Error> {
    let files = config.well_files()?;
    if files.is_empty() {
        return Err(Error::Usage(
            "the config names no LAS files ([input] wells)".into(),
        ));
    }
    let inputs = config.input_paths();
    check_out_dir(out, &inputs)?;
    let mut every_input = files.clone();
    every_input.extend(
        crate::manifest::table_inputs(config)
            .into_iter()
            .map(|(_, p)| p),
    );
    every_input.push(config.source.clone());
    check_inputs_outside(out, &every_input)?;
    let ctx = well::RunContext::new(config.clone()).map_err(|e| Error::Usage(chain(&e)))?;
    let prepared = if config.core.is_some() || config.classes.is_some() {
        Some(crate::classify::prepare(
            &ctx,
            &files,
            out,
            crate::classify::Mode::Run,
            progress,
        )?)
    } else {
        None
    };
    let sat = {
        let setup = prepared.as_ref().and_then(|p| p.setup.as_ref());
        let lookup = DepthLookup {
            files: &files,
            ctx: &ctx,
            cache: std::sync::Mutex::new(std::collections::BTreeMap::new()),
        };
        let tvdss_of = |well: &str, md: f64| lookup.tvdss(well, md);
        match setup {
            Some(s) => crate::sat_height::prepare(config, &s.scheme, &tvdss_of)?,
            None if config.capillary.is_some() => {
                return Err(Error::Usage(
                    "[capillary] needs a class model: give [classes] with [core] or [predictor] model"
                        .into(),
                ));
            }
            None => None,
        }
    };
    if let (Some(m), true) = (&sat, progress) {
        report_model(m);
    }
    let mut stems: Vec<String> = files.iter().map(|f| file_stem(&well::stem_of(f))).collect();
    // two inputs with the same stem: suffix the later ones
    for i in 1..stems.len() {
        let mut k = 1;
        let base = stems[i].clone();
        while stems[..i].contains(&stems[i]) {
            k += 1;
            stems[i] = format!("{base}-{k}");
        }
    }
    Ok(FieldSetup {
        files,
        stems,
        ctx,
        prepared,
        sat,
    })
}

/// Run every well of the config into `out`.
pub fn run(config: &Config, out: &Path, progress: bool) -> Result<RunSummary, Error> {
    let started = std::time::SystemTime::now();
    // a killed run's temporary files (never in shard runs, which may share
    // the folder with shards still writing)
    output::remove_stale_partials(out);
    let setup = setup(config, out, progress)?;
    let all: Vec<usize> = (0..setup.files.len()).collect();
    let journal = out.join(PROGRESS_FILE);
    let reports = process_wells(&setup, &all, out, &journal, progress)?;
    let summary = finish(config, out, setup, reports, started, Vec::new(), progress)?;
    // the summary is written: the journal of a run in progress goes
    let _ = std::fs::remove_file(&journal);
    Ok(summary)
}

/// The journal of a run in progress, in the output folder: a first line
/// listing every well of the run, then a line per well as it finishes. A
/// finished run removes it; after a killed run it says which wells finished
/// (their files are whole: every file is written under a temporary name and
/// renamed) and, by difference, which did not.
pub const PROGRESS_FILE: &str = "run-progress.jsonl";

/// What the journal of an interrupted run says.
#[derive(Debug, Clone, PartialEq)]
pub struct Interrupted {
    pub started_utc: String,
    /// Every well of that run (input paths as given), in its order.
    pub wells: Vec<String>,
    /// The wells that finished (with or without an error).
    pub finished: Vec<String>,
}

/// Read a journal left by a run that did not finish; `None` when its first
/// line is not readable. A line torn by the kill is skipped.
pub fn read_journal(text: &str) -> Option<Interrupted> {
    let mut lines = text.lines();
    let head: serde_json::Value = serde_json::from_str(lines.next()?).ok()?;
    let wells = head["wells"]
        .as_array()?
        .iter()
        .filter_map(|w| w.as_str().map(String::from))
        .collect();
    let finished = lines
        .filter_map(|l| serde_json::from_str::<serde_json::Value>(l).ok())
        .filter_map(|v| v["finished"].as_str().map(String::from))
        .collect();
    Some(Interrupted {
        started_utc: head["started_utc"]
            .as_str()
            .unwrap_or("at an unknown time")
            .into(),
        wells,
        finished,
    })
}

impl Interrupted {
    /// The wells with no finished line, in the run's order.
    pub fn unfinished(&self) -> Vec<&str> {
        self.wells
            .iter()
            .filter(|w| !self.finished.contains(w))
            .map(String::as_str)
            .collect()
    }

    /// One line for stderr: how far the run got and which wells it did not
    /// finish (file names, the first ten).
    pub fn message(&self, journal: &Path) -> String {
        const SHOWN: usize = 10;
        let unfinished = self.unfinished();
        let mut names: Vec<String> = unfinished
            .iter()
            .take(SHOWN)
            .map(|w| {
                Path::new(w)
                    .file_name()
                    .map_or_else(|| (*w).to_string(), |n| n.to_string_lossy().into_owned())
            })
            .collect();
        if unfinished.len() > SHOWN {
            names.push(format!("and {} more", unfinished.len() - SHOWN));
        }
        format!(
            "`{}`: the run started {} stopped after {} of {} wells had finished; not finished: {}. This run processes every well again.",
            journal.display(),
            self.started_utc,
            self.wells.len() - unfinished.len(),
            self.wells.len(),
            if names.is_empty() {
                "none".to_string()
            } else {
                names.join(", ")
            }
        )
    }
}

/// Appends journal lines; each line is one `write` on an unbuffered file,
/// so what was written survives the process being killed.
struct Journal(std::sync::Mutex<std::fs::File>);

impl Journal {
    fn create(path: &Path, files: &[&Path]) -> Result<Journal, Error> {
        let io = |source| Error::Io {
            path: path.to_path_buf(),
            source,
        };
        let mut f = std::fs::File::create(path).map_err(io)?;
        let head = serde_json::json!({
            "flowzone": env!("CARGO_PKG_VERSION"),
            "started_utc": crate::manifest::utc(std::time::SystemTime::now()),
            "wells": files.iter().map(|p| p.display().to_string()).collect::<Vec<_>>(),
        });
        std::io::Write::write_all(&mut f, format!("{head}\n").as_bytes()).map_err(io)?;
        Ok(Journal(std::sync::Mutex::new(f)))
    }

    fn finished(&self, r: &WellReport) {
        let line = serde_json::json!({
            "finished": r.file,
            "ok": r.ok,
            "error": r.error,
            "outputs": r.outputs,
        });
        let mut f = self.0.lock().unwrap_or_else(|e| e.into_inner());
        let _ = std::io::Write::write_all(&mut *f, format!("{line}\n").as_bytes());
    }
}

/// Process the wells `indices` (into `setup.files`) in parallel, writing
/// their per-well outputs; their reports in the order of `indices`.
pub fn process_wells(
    setup: &FieldSetup,
    indices: &[usize],
    out: &Path,
    journal: &Path,
    progress: bool,
) -> Result<Vec<WellReport>, Error> {
    let listed: Vec<&Path> = indices.iter().map(|&i| setup.files[i].as_path()).collect();
    // a journal here is a run that was killed: say how far it got
    if let Some(i) = std::fs::read_to_string(journal)
        .ok()
        .as_deref()
        .and_then(read_journal)
    {
        eprintln!("note: {}", i.message(journal));
    }
    let journal = Journal::create(journal, &listed)?;
    let stage = WellStages {
        ctx: &setup.ctx,
        classes: setup.prepared.as_ref().and_then(|p| p.setup.as_ref()),
        sat: setup.sat.as_ref(),
    };
    for d in [out.join(WELLS_DIR), out.join(FIELD_CURVES_DIR)] {
        std::fs::create_dir_all(&d).map_err(|source| Error::Io { path: d, source })?;
    }
    let total = indices.len();
    let done = std::sync::atomic::AtomicUsize::new(0);
    // a bar on a terminal, a line per well otherwise, nothing with --quiet
    let bar = (progress && std::io::IsTerminal::is_terminal(&std::io::stderr())).then(|| {
        let b = indicatif::ProgressBar::new(total as u64);
        b.set_style(
            indicatif::ProgressStyle::with_template(
                "{elapsed_precise} [{bar:40}] {pos}/{len} wells, {per_sec}, eta {eta}",
            )
            .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
        );
        b
    });
    let reports: Vec<WellReport> = indices
        .par_iter()
        .map(|&i| {
            let path = &setup.files[i];
            let report = one_well(path, &setup.stems[i], &stage, out);
            journal.finished(&report);
            let n = done.fetch_add(1, std::sync::atomic::Ordering::Relaxed) + 1;
            let status = if report.ok { "ok" } else { "FAILED" };
            match &bar {
                Some(b) => {
                    b.inc(1);
                    if !report.ok {
                        b.println(format!("{} FAILED", path.display()));
                    }
                }
                None if progress => eprintln!("[{n}/{total}] {} {status}", path.display()),
                None => {}
            }
            report
        })
        .collect();
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    Ok(reports)
}

/// Per-well outputs (LAS, CSV, Parquet) under the output folder.
pub const WELLS_DIR: &str = "wells";
/// The field table's per-well Parquet parts under the output folder.
pub const FIELD_CURVES_DIR: &str = "field/curves";

/// After every well: the field-level outputs (saturation-height model and
/// residuals, contacts, zone summary), the manifest and the run summary.
/// `reports` are every well's, in the order of `setup.files`; `shards` the
/// shard runs merged (empty for a single run).
pub fn finish(
    config: &Config,
    out: &Path,
    setup: FieldSetup,
    mut reports: Vec<WellReport>,
    started: std::time::SystemTime,
    shards: Vec<crate::manifest::ShardRun>,
    progress: bool,
) -> Result<RunSummary, Error> {
    let total = setup.files.len();
    let class_setup = setup.prepared.as_ref().and_then(|p| p.setup.as_ref());
    let saturation_outputs = match (&setup.sat, class_setup) {
        (Some(m), Some(cs)) => saturation_outputs(config, out, m, cs, &mut reports, progress)?,
        _ => Vec::new(),
    };
    let (contact_view, contact_outputs) = match &setup.sat {
        Some(m) => contact_outputs(config, out, m, &reports, progress)?,
        None => (Vec::new(), Vec::new()),
    };
    let zone_rows: Vec<crate::summary::ZoneSummary> = reports
        .iter()
        .flat_map(|r| r.zones.iter().cloned())
        .collect();
    let zone_outputs = crate::summary::write(&zone_rows, &out.join("field"))?;
    if progress {
        eprintln!(
            "summary: {} zones of {} wells in {}",
            zone_rows.len(),
            reports.iter().filter(|r| r.ok).count(),
            zone_outputs[0].display()
        );
    }
    let failed = reports.iter().filter(|r| !r.ok).count();
    let mut manifest = crate::manifest::build(config, &setup.files, started, (total, failed));
    manifest.shards = shards;
    if config.output.report {
        let page = field_page(config, out, &setup, &reports, &zone_rows, &manifest)?;
        if progress {
            eprintln!("report: {}", out.join(page).display());
        }
    }
    let summary = RunSummary {
        tool: format!("flowzone {}", env!("CARGO_PKG_VERSION")),
        project: config.project.name.clone(),
        wells_total: total,
        wells_failed: failed,
        classes: setup.prepared.map(|p| p.summary),
        saturation_height: setup.sat,
        saturation_outputs,
        contacts: contact_view,
        contact_outputs,
        wells: reports,
    };
    write_json(&out.join("run-manifest.json"), &manifest)?;
    write_json(&out.join("run-summary.json"), &summary)?;
    Ok(summary)
}

/// Write `value` as pretty JSON through a temporary file.
fn write_json<T: Serialize>(path: &Path, value: &T) -> Result<(), Error> {
    output::write_atomic(path, |w| {
        serde_json::to_writer_pretty(&mut *w, value).map_err(|e| output::OutputError::Io {
            path: path.to_path_buf(),
            source: std::io::Error::other(e),
        })
    })?;
    Ok(())
}

/// The field-level saturation-height outputs: marks wells whose residuals
/// depart from their neighbours' (a warning on each), writes saturation/.
fn saturation_outputs(
    config: &Config,
    out: &Path,
    m: &crate::sat_height::SatHeightModel,
    setup: &crate::classify::ClassSetup,
    reports: &mut [WellReport],
    progress: bool,
) -> Result<Vec<String>, Error> {
    let mut marked_wells: Vec<(String, &mut crate::sat_height::WellSatHeight)> = reports
        .iter_mut()
        .filter_map(|r| {
            let name = r.well.clone()?;
            r.saturation_height.as_mut().map(|w| (name, w))
        })
        .collect();
    let marked = crate::sat_height::mark_biased_wells(
        &mut marked_wells,
        config.saturation_height.bias_threshold_vv,
    );
    let listed: Vec<(String, &crate::sat_height::WellSatHeight)> = reports
        .iter()
        .filter_map(|r| Some((r.well.clone()?, r.saturation_height.as_ref()?)))
        .collect();
    let header = &setup.model.header;
    let field_archie = config.parameters.field.resolve().archie;
    let max_class = u8::try_from(setup.scheme.class_count).unwrap_or(u8::MAX);
    let mut zones: Vec<String> = config.parameters.zone.keys().cloned().collect();
    zones.extend(config.parameters.zone_class.keys().cloned());
    zones.sort();
    zones.dedup();
    let export = crate::sat_height::ModelExport {
        tool: format!("flowzone {}", env!("CARGO_PKG_VERSION")),
        caution: crate::sat_height::CAUTION,
        units: crate::sat_height::export_units(),
        depth_unit: config.project.depth_unit,
        scheme: &setup.scheme,
        saturation_height: m,
        archie_by_class: config.parameters.class_archie("", field_archie, max_class),
        archie_by_zone_and_class: zones
            .into_iter()
            .map(|z| {
                let base = config.parameters.for_well_zone(&[], &z).resolve().archie;
                let t = config.parameters.class_archie(&z, base, max_class);
                (z, t)
            })
            .collect(),
        perm_method: header.perm_method,
        perm_by_class: &header.perm,
    };
    let written = crate::sat_height::write_outputs(out, &export, &listed)?
        .iter()
        .map(|p| output::shown(out, p))
        .collect::<Vec<String>>();
    for (well, msg) in marked {
        if progress {
            eprintln!("saturation-height: {well}: {msg}");
        }
        if let Some(r) = reports
            .iter_mut()
            .find(|r| r.well.as_deref() == Some(&well))
        {
            r.warnings.push(msg);
        }
    }
    Ok(written)
}

/// The field view of the contact audit, contacts.csv and contacts.json.
fn contact_outputs(
    config: &Config,
    out: &Path,
    m: &crate::sat_height::SatHeightModel,
    reports: &[WellReport],
    progress: bool,
) -> Result<(Vec<crate::contacts::CompartmentView>, Vec<String>), Error> {
    let audits: Vec<(String, &crate::contacts::WellAudit)> = reports
        .iter()
        .filter_map(|r| Some((r.well.clone()?, r.contacts.as_ref()?)))
        .collect();
    let contact_view =
        crate::contacts::field_view(m, &audits, &config.contacts, config.project.depth_unit);
    let steps: Vec<&crate::contacts::Step> =
        audits.iter().flat_map(|(_, a)| a.steps.iter()).collect();
    let contact_outputs =
        crate::contacts::write_outputs(out, &steps, &contact_view, config.project.depth_unit)?
            .iter()
            .map(|p| output::shown(out, p))
            .collect();
    if progress {
        for v in &contact_view {
            if !v.not_lined_up.is_empty() {
                eprintln!(
                    "contacts: compartment {}: wells not lined up with FWL {:.1}: {}",
                    v.name,
                    v.fwl_tvdss,
                    v.not_lined_up.join(", ")
                );
            }
        }
        let count = |k| steps.iter().filter(|s| s.kind == k).count();
        use crate::contacts::StepKind as K;
        eprintln!(
            "contacts: {} steps: {} rock-quality, {} fluid-contact, {} unexplained, {} flagged (contacts.csv)",
            steps.len(),
            count(K::RockQuality),
            count(K::FluidContact),
            count(K::Unexplained),
            count(K::Flagged)
        );
    }
    Ok((contact_view, contact_outputs))
}

/// A well's (MD, TVDSS) columns, or why there are none.
type DepthColumns = Result<(Vec<f64>, Vec<f64>), String>;

/// Measured depth to TVDSS in a named well, through the well's own depth
/// reference (elevation, survey); each well is processed once, when a
/// pressure point given by MD needs it.
struct DepthLookup<'a> {
    files: &'a [PathBuf],
    ctx: &'a well::RunContext,
    cache: std::sync::Mutex<std::collections::BTreeMap<String, DepthColumns>>,
}

impl DepthLookup<'_> {
    /// The (MD, TVDSS) columns of the well named `well` (LAS name or file
    /// stem): files whose stem matches are tried first, then the others.
    fn columns(&self, well: &str) -> DepthColumns {
        let mut order: Vec<&PathBuf> = self.files.iter().collect();
        order.sort_by_key(|f| !well::stem_of(f).eq_ignore_ascii_case(well));
        for f in order {
            let Ok(out) = well::process(f, self.ctx) else {
                continue;
            };
            if out.name.eq_ignore_ascii_case(well) || well::stem_of(f).eq_ignore_ascii_case(well) {
                let md = out.column("DEPTH").map(<[f64]>::to_vec).unwrap_or_default();
                let tvdss = out.column("TVDSS").map(<[f64]>::to_vec).unwrap_or_default();
                return Ok((md, tvdss));
            }
        }
        Err(format!(
            "well `{well}` is not among the field's readable LAS wells, so its MD cannot be converted to TVDSS"
        ))
    }

    fn tvdss(&self, well: &str, md: f64) -> Result<f64, String> {
        let mut cache = self.cache.lock().unwrap_or_else(|e| e.into_inner());
        let entry = cache
            .entry(well.to_ascii_lowercase())
            .or_insert_with(|| self.columns(well));
        let (mds, tvdss) = entry.as_ref().map_err(Clone::clone)?;
        crate::depth::interpolate(mds, tvdss, md).ok_or_else(|| {
            format!("{well}: MD {md} is outside the logged depths or the well has no TVDSS (no datum elevation)")
        })
    }
}

/// What every well of a run goes through after the stages.
struct WellStages<'a> {
    ctx: &'a well::RunContext,
    classes: Option<&'a crate::classify::ClassSetup>,
    sat: Option<&'a crate::sat_height::SatHeightModel>,
}

/// The saturation-height model's key facts, on stderr.
fn report_model(m: &crate::sat_height::SatHeightModel) {
    for c in &m.classes {
        let how = match c.borrowed_from {
            Some(b) => format!("borrowed from class {b}"),
            None => format!("{} points from {}", c.points, c.plugs.join(", ")),
        };
        eprintln!(
            "saturation-height: class {} J-function {} (rms Sw {:.3}), {how}",
            c.class,
            c.curve.form_name(),
            c.curve.rms_sw()
        );
    }
    for p in m.plugs.iter().filter(|p| p.suggested_class.is_some()) {
        if let (Some(k), Some((_, r))) = (p.suggested_class, p.best_other) {
            eprintln!(
                "saturation-height: plug {} (class {}) fits class {k}'s curve better (rms Sw {r:.3} against {:.3}); to accept: [capillary.plug-class] \"{}\" = {k}",
                p.sample, p.class, p.rms_own, p.sample
            );
        }
    }
    for c in &m.compartments {
        let sigma = c
            .fwl_sigma
            .map_or_else(String::new, |s| format!(" ± {s:.2}"));
        eprintln!(
            "saturation-height: compartment {}: FWL {:.2}{sigma} TVDSS ({}), water {:.3} / hydrocarbon {:.3} g/cm3 ({})",
            c.name, c.fwl_tvdss, c.source, c.rho_water_gcc, c.rho_hc_gcc, c.density_source
        );
    }
    for r in &m.plugs_rejected {
        eprintln!(
            "saturation-height: capillary row or plug left out, line {}: {}",
            r.line, r.reason
        );
    }
    for r in &m.pressure_points_left_out {
        eprintln!(
            "saturation-height: pressure point left out, line {}: {}",
            r.line, r.reason
        );
    }
}

fn one_well(path: &Path, stem: &str, stage: &WellStages<'_>, out_dir: &Path) -> WellReport {
    let dir = out_dir.join(WELLS_DIR);
    let field_dir = out_dir.join(FIELD_CURVES_DIR);
    let ctx = stage.ctx;
    let setup = stage.classes;
    let config = &ctx.config;
    let mut report = WellReport {
        file: path.display().to_string(),
        well: None,
        ok: false,
        error: None,
        rows: 0,
        outputs: Vec::new(),
        curves: Vec::new(),
        warnings: Vec::new(),
        stages: None,
        classes: None,
        saturation_height: None,
        contacts: None,
        zones: Vec::new(),
        pickett: Vec::new(),
    };
    let result: Result<(), WellError> = (|| {
        let mut out = well::process(path, ctx)?;
        if let Some(setup) = setup {
            let name = out.name.clone();
            report.classes = Some(setup.apply(&mut out.table, &name, &mut out.warnings));
            if config.parameters.has_class_params() {
                let max_class = u8::try_from(setup.scheme.class_count).unwrap_or(u8::MAX);
                out.apply_class_exponents(&config.parameters, max_class);
            }
        }
        if let Some(sat) = stage.sat {
            let file_stem = well::stem_of(path);
            let names = [out.name.as_str(), file_stem.as_str()];
            report.saturation_height = sat.apply(&mut out.table, &names, &mut out.warnings);
            if report.saturation_height.is_some() {
                report.contacts = crate::contacts::apply(
                    &mut out.table,
                    &out.name,
                    &names,
                    sat,
                    &config.contacts,
                    config.project.depth_unit,
                );
                if let Some(f) = report
                    .contacts
                    .as_ref()
                    .and_then(|a| a.implied_fwl.as_ref())
                    .filter(|f| !f.agrees)
                {
                    out.warnings.push(format!("contact audit: {}", f.note));
                }
            }
        }
        report.well = Some(out.name.clone());
        report.rows = out.table.n_rows();
        report.warnings = out.warnings.clone();
        report.stages = Some(out.report.clone());
        report.curves = out
            .resolved
            .iter()
            .map(|(l, m, u)| (l.key().to_string(), m.clone(), u.clone()))
            .collect();
        for &format in &config.output.formats {
            let p =
                output::write_table(&out.table, &dir, stem, format, Some(config.output.decimals))?;
            report
                .outputs
                .push(format!("{WELLS_DIR}/{}", file_name(&p)));
        }
        let nan = vec![f64::NAN; out.table.n_rows()];
        let get = |n: &str| out.column(n).unwrap_or(&nan);
        let zone_names: Vec<String> = out.report.zones.iter().map(|z| z.name.clone()).collect();
        report.zones = crate::summary::zone_summary(
            &out.name,
            get("DEPTH"),
            &out.zone_of,
            &zone_names,
            get("VSH"),
            get("PHIE"),
            get("SW"),
            get("CLASS"),
            &config.summary,
        );
        let part = field_dir.join(format!("{stem}.parquet"));
        output::write_field_part(&out.table, &out.name, &part)?;
        report
            .outputs
            .push(format!("{FIELD_CURVES_DIR}/{}", file_name(&part)));
        if config.output.report {
            let pages = well_page(stem, path, &out, &report, setup, config, out_dir)?;
            report.outputs.extend(pages);
            report.pickett =
                crate::report::pickett_points(&out.table, crate::report::FIELD_PICKETT_PER_WELL);
        }
        Ok(())
    })();
    match result {
        Ok(()) => report.ok = true,
        Err(e) => report.error = Some(chain(&e)),
    }
    report
}

/// The last part of a path, as text.
fn file_name(p: &Path) -> String {
    p.file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default()
}

/// The Pickett plot's Archie lines: the field's a, m, n for each class, as
/// `[parameters.class."N"]` overrides them (zone-independent).
fn archie_lines(config: &Config, class_count: u8) -> Vec<crate::plots::ArchieLine> {
    let field_archie = config.parameters.field.resolve().archie;
    config
        .parameters
        .class_archie("", field_archie, class_count)
        .into_iter()
        .zip(1u8..)
        .map(|(a, class)| crate::plots::ArchieLine {
            class,
            a: a.a,
            m: a.m,
            n: a.n,
        })
        .collect()
}
/// Write a well's report page (log plot, Pickett plot, zones, steps, warnings).
fn well_page(
    stem: &str,
    path: &Path,
    out: &well::WellOutput,
    report: &WellReport,
    setup: Option<&crate::classify::ClassSetup>,
    config: &Config,
    out_dir: &Path,
) -> Result<Vec<String>, output::OutputError> {
    let class_count = setup.map_or(0, |s| u8::try_from(s.scheme.class_count).unwrap_or(u8::MAX));
    let archie = archie_lines(config, class_count);
    let mut rw: Vec<f64> = out.rw.iter().copied().filter(|v| v.is_finite()).collect();
    rw.sort_by(f64::total_cmp);
    let rw_ohmm = rw.get(rw.len() / 2).copied().unwrap_or(f64::NAN);
    let md = out.column("DEPTH").unwrap_or(&[]);
    let mut zone_marks: Vec<crate::plots::ZoneMark> = out
        .report
        .zones
        .iter()
        .map(|z| crate::plots::ZoneMark {
            name: z.name.clone(),
            top_md: f64::INFINITY,
            base_md: f64::NEG_INFINITY,
        })
        .collect();
    for (d, z) in md.iter().zip(&out.zone_of) {
        if let Some(m) = z.and_then(|z| zone_marks.get_mut(usize::from(z))) {
            m.top_md = m.top_md.min(*d);
            m.base_md = m.base_md.max(*d);
        }
    }
    zone_marks.retain(|m| m.top_md <= m.base_md);
    let audit = report.contacts.as_ref();
    let unit = config.project.depth_unit.las_unit().to_lowercase();
    let page = crate::report::WellPage {
        stem,
        well: &out.name,
        file: &path.display().to_string(),
        depth_unit: &unit,
        table: &out.table,
        zone_marks,
        zones: &report.zones,
        steps: audit.map_or(&[], |a| a.steps.as_slice()),
        implied_fwl: audit.and_then(|a| a.implied_fwl.as_ref()),
        fwl_tvdss: report.saturation_height.as_ref().map(|s| s.fwl_tvdss),
        class_count,
        archie,
        rw_ohmm,
        warnings: &out.warnings,
        png: config.output.report_png,
    };
    crate::report::write_well_page(out_dir, &page)
}

/// Write the report's field page from the run's models and every well's report.
fn field_page(
    config: &Config,
    out: &Path,
    setup: &FieldSetup,
    reports: &[WellReport],
    zones: &[crate::summary::ZoneSummary],
    manifest: &crate::manifest::Manifest,
) -> Result<String, output::OutputError> {
    use crate::classes::ClassScheme as _;
    use crate::plots::{
        Boundaries, CorePoint, GradientLine, JClass, PressureCompartment, PressurePoint,
    };
    let class_setup = setup.prepared.as_ref().and_then(|p| p.setup.as_ref());
    let scheme = class_setup.map(|c| &c.scheme);
    let class_count = scheme.map_or(0, |s| u8::try_from(s.class_count).unwrap_or(u8::MAX));
    let core: Vec<CorePoint> = setup
        .prepared
        .as_ref()
        .and_then(|p| p.core.as_ref())
        .map(|c| {
            c.samples
                .iter()
                .map(|m| CorePoint {
                    phi: m.sample.porosity,
                    k_md: m.sample.perm_md,
                    class: scheme.and_then(|s| s.classify(m.sample.porosity, m.sample.perm_md)),
                })
                .collect()
        })
        .unwrap_or_default();
    let boundaries = match scheme {
        Some(s) if s.kind.starts_with("fzi") => Boundaries::Fzi(s.boundaries.clone()),
        Some(s) if s.kind.contains("r35") => Boundaries::R35(s.boundaries.clone()),
        _ => Boundaries::None,
    };
    let (j_classes, pressures) = match &setup.sat {
        Some(m) => {
            let j: Vec<JClass> = m
                .classes
                .iter()
                .map(|c| JClass {
                    class: c.class,
                    points: m
                        .j_points
                        .iter()
                        .filter(|p| p.0 == c.class)
                        .map(|p| (p.1, p.2))
                        .collect(),
                    curve: crate::report::sample_j_curve(&c.curve),
                    label: match c.borrowed_from {
                        Some(b) => format!("borrowed from class {b}"),
                        None => format!("{}, rms Sw {:.3}", c.curve.form_name(), c.curve.rms_sw()),
                    },
                })
                .collect();
            let to_m = config
                .project
                .depth_unit
                .factor_to(crate::units::DepthUnit::Metre);
            let p: Vec<PressureCompartment> = m
                .compartments
                .iter()
                .map(|c| {
                    let pts: Vec<PressurePoint> = c
                        .points_m
                        .iter()
                        .map(|&(z, psi)| PressurePoint {
                            tvdss: z / to_m,
                            psi,
                            well: String::new(),
                            used: true,
                        })
                        .collect();
                    let (lo, hi) = pts
                        .iter()
                        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| {
                            (a.min(p.tvdss), b.max(p.tvdss))
                        });
                    let lines = c
                        .pressure_fit
                        .as_ref()
                        .map(|f| {
                            let line =
                                |l: &crate::pressure::Line, what: &str, top: f64, base: f64| {
                                    GradientLine {
                                        label: format!("{what} {:.3} g/cm3", l.density_gcc()),
                                        intercept_psi: l.intercept_psi,
                                        psi_per_unit: l.gradient_psi_per_m * to_m,
                                        top,
                                        base,
                                    }
                                };
                            vec![
                                line(&f.upper, "hydrocarbon", lo.min(c.fwl_tvdss), c.fwl_tvdss),
                                line(&f.lower, "water", c.fwl_tvdss, hi.max(c.fwl_tvdss)),
                            ]
                        })
                        .unwrap_or_default();
                    PressureCompartment {
                        name: c.name.clone(),
                        points: pts,
                        lines,
                        fwl_tvdss: c.fwl_tvdss,
                        fwl_sigma: c.fwl_sigma,
                    }
                })
                .collect();
            (j, p)
        }
        None => (Vec::new(), Vec::new()),
    };
    let pickett: Vec<crate::plots::PickettPoint> = reports
        .iter()
        .flat_map(|r| r.pickett.iter().copied())
        .collect();
    let field_archie = config.parameters.field.resolve();
    let archie = archie_lines(config, class_count);
    let confusion = class_setup
        .and_then(|c| c.model.header.validation.as_ref())
        .map(|v| v.forest.confusion.clone());
    let unit = config.project.depth_unit.las_unit().to_lowercase();
    let wells = reports
        .iter()
        .map(|r| crate::report::WellRow {
            report: r,
            page: r
                .outputs
                .iter()
                .find(|o| o.starts_with("report/wells/"))
                .map(|o| o.trim_start_matches("report/").to_string()),
        })
        .collect();
    let page = crate::report::FieldPage {
        project: &config.project.name,
        depth_unit: &unit,
        wells,
        manifest,
        core,
        boundaries,
        class_count,
        j_classes,
        pressures,
        confusion,
        zones,
        pickett,
        archie,
        rw_ohmm: field_archie.rw_ohmm.unwrap_or(f64::NAN),
    };
    crate::report::write_field_page(out, &page)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A journal as a run killed after two of thirteen wells leaves it, the
    /// last line torn by the kill: the torn line does not count, the message
    /// names the first ten unfinished wells and how many more.
    #[test]
    fn an_interrupted_journal_says_what_did_not_finish() {
        let wells: Vec<String> = (1..=13).map(|k| format!("/data/w{k:02}.las")).collect();
        let head = serde_json::json!({
            "flowzone": "0.1.0",
            "started_utc": "2026-12-03T10:00:00Z",
            "wells": wells,
        });
        let text = format!(
            "{head}\n{{\"finished\":\"/data/w03.las\",\"ok\":true}}\n{{\"finished\":\"/data/w01.las\",\"ok\":false}}\n{{\"finished\":\"/data/w0"
        );
        let j = read_journal(&text).expect("readable");
        assert_eq!(j.finished, ["/data/w03.las", "/data/w01.las"]);
        assert_eq!(j.unfinished().len(), 11);
        assert_eq!(j.unfinished()[0], "/data/w02.las");
        let m = j.message(Path::new("out/run-progress.jsonl"));
        assert_eq!(
            m,
            "`out/run-progress.jsonl`: the run started 2026-12-03T10:00:00Z stopped after 2 of 13 wells had finished; not finished: w02.las, w04.las, w05.las, w06.las, w07.las, w08.las, w09.las, w10.las, w11.las, w12.las, and 1 more. This run processes every well again."
        );
        assert!(read_journal("not json\n").is_none());
        assert!(read_journal("").is_none());
    }
}
