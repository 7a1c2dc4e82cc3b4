//! Many wells: the field run.
//!
//! Wells are processed in parallel with rayon, each read, processed, written
//! and dropped; results are collected in input order (paths sorted), so the
//! outputs and the summary are the same whatever the thread count. One bad
//! well never stops the others: it is recorded with its error.

pub(crate) mod journal;
pub(crate) mod outputs;
pub(crate) mod safety;
pub(crate) mod setup;
pub mod shard;

use crate::output::messages::note;
use std::path::Path;

use rayon::prelude::*;
use serde::Serialize;

use crate::config::Config;
use crate::error::{Error, chain};
use crate::field::journal::{Journal, PROGRESS_FILE, read_journal};
use crate::field::outputs::{contact_outputs, saturation_outputs};
use crate::field::setup::FieldSetup;
use crate::output;
use crate::output::write_json;
use crate::pipeline::{self, Models, WellReport};
use crate::timings::{RunTimings, Stage, StageTimes, timed};
use crate::well::WellError;

/// The run summary (also written as run-summary.json).
#[derive(Debug, Clone, Serialize)]
pub struct RunSummary {
    /// The program and its version (`flowzone 0.1.0`).
    pub tool: String,
    /// The project name (`[project] name`).
    pub project: String,
    /// LAS files in the run.
    pub wells_total: usize,
    /// Wells that failed (recorded with their error).
    pub wells_failed: usize,
    /// Core, scheme and class model of the run (when `[core]` or `[classes]` is set).
    pub classes: Option<crate::classes::stage::ClassSummary>,
    /// The saturation-height model: J-function per class, FWL per compartment.
    pub saturation_height: Option<crate::sat_height::SatHeightModel>,
    /// Files of the saturation-height model and the residual summary.
    pub saturation_outputs: Vec<String>,
    /// Per compartment: apparent contacts and FWLs across wells.
    pub contacts: Vec<crate::contacts::CompartmentView>,
    /// contacts.csv and contacts.json.
    pub contact_outputs: Vec<String>,
    /// The Monte Carlo over the parameters given as distributions, when run.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub uncertainty: Option<crate::uncertainty::UncertaintySummary>,
    /// One report per well, failed ones included.
    pub wells: Vec<WellReport>,
    /// Where the time went (in run-manifest.json, never in the summary,
    /// which is byte-identical from run to run).
    #[serde(skip)]
    pub timings: RunTimings,
}

/// The Monte Carlo's part of the run summary, and `field/hpt-drivers.csv`
/// (and `hpt-swh-drivers.csv`).
fn uncertainty_summary(
    config: &Config,
    out: &Path,
    samples: &crate::uncertainty::Samples,
    reports: &[WellReport],
) -> Result<crate::uncertainty::UncertaintySummary, output::OutputError> {
    let wells: Vec<&[(String, Vec<f64>)]> = reports
        .iter()
        .map(|r| r.view.hpt_realisations.as_slice())
        .collect();
    let wells_swh: Vec<&[(String, Vec<f64>)]> = reports
        .iter()
        .map(|r| r.view.hpt_swh_realisations.as_slice())
        .collect();
    let drivers = crate::uncertainty::drivers(samples, &wells, &wells_swh);
    let paths = crate::uncertainty::write_drivers(&drivers, &out.join("field"))?;
    let u = &config.uncertainty;
    Ok(crate::uncertainty::UncertaintySummary {
        realisations: u.realisations,
        seed: u.seed,
        sampling: u.sampling,
        variables: samples
            .vars
            .iter()
            .map(|v| (v.name.clone(), v.dist))
            .chain(
                samples
                    .fwl
                    .iter()
                    .map(|f| (format!("compartments.{}.fwl-tvdss", f.compartment), f.dist)),
            )
            .collect(),
        convention: crate::uncertainty::CONVENTION.into(),
        drivers,
        outputs: paths.iter().map(|p| output::shown(out, p)).collect(),
    })
}

/// A run's view of its output folder: the files the folder's previous run
/// listed (to remove the ones this run does not write again), and the
/// files this run writes.
pub struct Rerun {
    /// The previous run's files, from its manifest; `None` without one.
    pub previous: Option<Vec<String>>,
    /// A previous manifest that lists no files (an older flowzone).
    pub unlisted: bool,
    /// The files this run writes, as it writes them.
    pub tracking: output::written::Tracking,
    /// Files in the folder that belong to this run's result though this
    /// process did not write them (a merge: the shards' outputs and states).
    pub also: Vec<String>,
}

impl Rerun {
    /// Read the previous run's listing from `out`'s manifest and start
    /// tracking the files written under `out`: before anything is written.
    pub fn start(out: &Path) -> Rerun {
        let (previous, unlisted) = previous_listing(&out.join(safety::FINISHED_MARKER));
        Rerun {
            previous,
            unlisted,
            tracking: output::written::track(out),
            also: Vec::new(),
        }
    }
}

/// The `outputs` of a manifest: `(None, false)` without a manifest,
/// `(None, true)` for a manifest without the list (or unreadable).
fn previous_listing(manifest: &Path) -> (Option<Vec<String>>, bool) {
    let Ok(text) = std::fs::read_to_string(manifest) else {
        return (None, false);
    };
    let listed = serde_json::from_str::<serde_json::Value>(&text)
        .ok()
        .and_then(|v| {
            v.get("outputs")?
                .as_array()?
                .iter()
                .map(|x| x.as_str().map(str::to_string))
                .collect::<Option<Vec<String>>>()
        });
    let unlisted = listed.is_none();
    (listed, unlisted)
}

/// Run every well of the config into `out`.
pub fn run(config: &Config, out: &Path, progress: bool) -> Result<RunSummary, Error> {
    let started = std::time::SystemTime::now();
    let rerun = Rerun::start(out);
    // a killed run's temporary files (never in shard runs, which may share
    // the folder with shards still writing)
    output::remove_stale_partials(out);
    let mut setup = setup::prepare(config, out, progress)?;
    let all: Vec<usize> = (0..setup.files.len()).collect();
    let journal = out.join(PROGRESS_FILE);
    let wells_start = std::time::Instant::now();
    let reports = process_wells(&setup, &all, out, &journal, progress)?;
    setup.timings.wells_wall_seconds = wells_start.elapsed().as_secs_f64();
    let summary = finish(
        config,
        out,
        setup,
        reports,
        (started, Vec::new()),
        rerun,
        progress,
    )?;
    // the summary is written: the journal of a run in progress goes
    let _ = std::fs::remove_file(&journal);
    Ok(summary)
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
        note!("note: {}", i.message(journal));
    }
    let journal = Journal::create(journal, &listed)?;
    let models = setup.models();
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
            let mut report = one_well(path, &setup.stems[i], &models, out);
            if let Some(n) = &setup.stem_notes[i] {
                report.warnings.push(n.clone());
            }
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
                None if progress => note!("[{n}/{total}] {} {status}", path.display()),
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
    mut setup: FieldSetup,
    mut reports: Vec<WellReport>,
    (started, shards): (
        std::time::SystemTime,
        Vec<crate::output::manifest::ShardRun>,
    ),
    rerun: Rerun,
    progress: bool,
) -> Result<RunSummary, Error> {
    let total = setup.files.len();
    let mut timings = std::mem::take(&mut setup.timings);
    let mut stage_sum = StageTimes::default();
    for r in &reports {
        stage_sum.absorb(&r.times);
    }
    timings.set_well_stages(&stage_sum);
    let class_setup = setup.prepared.as_ref().and_then(|p| p.setup.as_ref());
    let saturation_outputs = timed(&mut timings.finish, "saturation-height outputs", || match (
        &setup.sat,
        class_setup,
    ) {
        (Some(m), Some(cs)) => saturation_outputs(config, out, m, cs, &mut reports, progress),
        _ => Ok(Vec::new()),
    })?;
    let (contact_view, contact_outputs) = timed(&mut timings.finish, "contact outputs", || {
        match &setup.sat {
            Some(m) => contact_outputs(config, out, m, &reports, progress),
            None => Ok((Vec::new(), Vec::new())),
        }
    })?;
    let zone_rows: Vec<crate::well::summary::ZoneSummary> = reports
        .iter()
        .flat_map(|r| r.zones.iter().cloned())
        .collect();
    let zone_outputs = timed(&mut timings.finish, "zone summary", || {
        crate::well::summary::write(&zone_rows, &out.join("field"))
    })?;
    if progress {
        note!(
            "summary: {} zones of {} wells in {}",
            zone_rows.len(),
            reports.iter().filter(|r| r.ok).count(),
            zone_outputs[0].display()
        );
    }
    let uncertainty = match &setup.samples {
        Some(samples) => Some(timed(&mut timings.finish, "uncertainty drivers", || {
            uncertainty_summary(config, out, samples, &reports)
        })?),
        None => None,
    };
    let failed = reports.iter().filter(|r| !r.ok).count();
    let known: Vec<(&Path, Option<&crate::output::manifest::InputFile>)> = setup
        .files
        .iter()
        .zip(&reports)
        .map(|(f, r)| (f.as_path(), r.input.as_ref()))
        .collect();
    let mut manifest = timed(&mut timings.finish, "manifest (hashes)", || {
        crate::output::manifest::build(config, &known, started, (total, failed))
    });
    manifest.shards = shards;
    if config.output.report {
        let report_start = std::time::Instant::now();
        let page = crate::report::assemble::field_page(
            config,
            out,
            setup.prepared.as_ref(),
            setup.sat.as_ref(),
            &crate::report::assemble::RunResults {
                reports: &reports,
                zones: &zone_rows,
                manifest: &manifest,
                drivers: uncertainty.as_ref().map_or(&[], |u| u.drivers.as_slice()),
            },
        )?;
        if progress {
            note!("report: {}", out.join(page).display());
        }
        let step = crate::timings::Timed::since("field report page", report_start);
        timings.finish.push(step);
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
        uncertainty,
        wells: reports,
        timings,
    };
    manifest.timings = summary.timings.clone();
    write_json(&out.join("run-summary.json"), &summary)?;
    // the folder as a fresh run would leave it: the previous run's files
    // this run did not write go, then the manifest (the mark of a finished
    // run) lists this run's files
    let mut outputs = rerun.tracking.files();
    outputs.extend(rerun.also);
    outputs.sort();
    outputs.dedup();
    let cleanup = output::written::clean_up(
        out,
        rerun.previous.as_deref(),
        &outputs,
        &[safety::FINISHED_MARKER, PROGRESS_FILE],
        true,
    );
    manifest.outputs = outputs;
    write_json(&out.join(safety::FINISHED_MARKER), &manifest)?;
    if progress {
        if rerun.unlisted {
            note!(
                "note: the previous run's manifest in {} lists no files (an older flowzone): files it wrote that this run did not are left",
                out.display()
            );
        }
        if let Some(n) = output::written::cleanup_note(&cleanup) {
            note!("note: {}: {n}", out.display());
        }
    }
    Ok(summary)
}

/// One well through the pipeline, then its files: the per-well tables, its
/// part of the field table and its report page. Never fails: a well's error
/// is recorded in its report.
fn one_well(path: &Path, stem: &str, models: &Models<'_>, out_dir: &Path) -> WellReport {
    let config = &models.ctx.config;
    let mut report = WellReport::new(path);
    let mut times = StageTimes::default();
    let result: Result<(), WellError> = (|| {
        // the file is read once: its bytes are hashed for the manifest here
        let bytes = times.time(Stage::Read, || {
            crate::input::las::load(path, config.input.limits()).inspect(|b| {
                report.input = Some(crate::output::manifest::input_of_bytes("well", path, b));
            })
        })?;
        let w = pipeline::run_well(path, &bytes, models, &mut times)?;
        drop(bytes);
        report.record(&w);
        write_well(&w, stem, config, out_dir, &mut report.outputs, &mut times)?;
        if config.output.report {
            let start = std::time::Instant::now();
            let pages =
                crate::report::assemble::well_page(stem, path, &w, models, config, out_dir)?;
            report.outputs.extend(pages);
            report.view = crate::report::assemble::well_view(&w);
            times.add(Stage::ReportPage, start.elapsed());
        }
        if let Some(u) = &w.uncertainty {
            report.view.hpt_realisations = u
                .zones
                .iter()
                .map(|(z, _)| z.clone())
                .zip(u.hpt.iter().cloned())
                .collect();
            report.view.hpt_swh_realisations = u.hpt_swh.clone();
        }
        Ok(())
    })();
    report.times = times;
    match result {
        Ok(()) => report.ok = true,
        Err(e) => report.error = Some(chain(&e)),
    }
    report
}

/// A well's files: its table in each configured format under `wells/`, and
/// its part of the field table; each path, relative to `out_dir`, is added
/// to `written`.
fn write_well(
    w: &pipeline::Interpreted,
    stem: &str,
    config: &Config,
    out_dir: &Path,
    written: &mut Vec<String>,
    times: &mut StageTimes,
) -> Result<(), output::OutputError> {
    let table = &w.well.table;
    let dir = out_dir.join(WELLS_DIR);
    let start = std::time::Instant::now();
    for &format in &config.output.formats {
        let p = output::write_table(table, &dir, stem, format, Some(config.output.decimals))?;
        written.push(format!("{WELLS_DIR}/{}", file_name(&p)));
    }
    times.add(Stage::WellFiles, start.elapsed());
    let part = out_dir
        .join(FIELD_CURVES_DIR)
        .join(format!("{stem}.parquet"));
    times.time(Stage::FieldTable, || {
        output::write_field_part(table, &w.well.name, &part)
    })?;
    written.push(format!("{FIELD_CURVES_DIR}/{}", file_name(&part)));
    Ok(())
}

/// The last part of a path, as text.
pub(crate) fn file_name(p: &Path) -> String {
    p.file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default()
}
