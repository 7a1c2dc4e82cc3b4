//! Many wells: the field run.
//!
//! Wells are processed in parallel with rayon, each read, processed, written
//! and dropped; results are collected in input order (paths sorted), so the
//! outputs and the summary are the same whatever the thread count. One bad
//! well never stops the others: it is recorded with its error.

use std::path::{Path, PathBuf};

use rayon::prelude::*;
use serde::Serialize;

use crate::config::Config;
use crate::error::{Error, chain};
use crate::output::{self, file_stem};
use crate::well::{self, WellError};

/// What happened to one well.
#[derive(Debug, Clone, Serialize)]
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

/// Run every well of the config into `out`.
pub fn run(config: &Config, out: &Path, progress: bool) -> Result<RunSummary, Error> {
    let files = config.well_files()?;
    if files.is_empty() {
        return Err(Error::Usage(
            "the config names no LAS files ([input] wells)".into(),
        ));
    }
    let inputs = config.input_paths();
    check_out_dir(out, &inputs)?;
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
    let setup = prepared.as_ref().and_then(|p| p.setup.as_ref());
    let wells_dir = out.join("wells");
    std::fs::create_dir_all(&wells_dir).map_err(|source| Error::Io {
        path: wells_dir.clone(),
        source,
    })?;

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

    let total = files.len();
    let done = std::sync::atomic::AtomicUsize::new(0);
    let reports: Vec<WellReport> = files
        .par_iter()
        .zip(stems.par_iter())
        .map(|(path, stem)| {
            let report = one_well(path, stem, &ctx, setup, &wells_dir);
            let n = done.fetch_add(1, std::sync::atomic::Ordering::Relaxed) + 1;
            if progress {
                let status = if report.ok { "ok" } else { "FAILED" };
                eprintln!("[{n}/{total}] {} {status}", path.display());
            }
            report
        })
        .collect();

    let failed = reports.iter().filter(|r| !r.ok).count();
    let summary = RunSummary {
        tool: format!("flowzone {}", env!("CARGO_PKG_VERSION")),
        project: config.project.name.clone(),
        wells_total: total,
        wells_failed: failed,
        classes: prepared.map(|p| p.summary),
        wells: reports,
    };
    let summary_path = out.join("run-summary.json");
    output::write_atomic(&summary_path, |w| {
        serde_json::to_writer_pretty(&mut *w, &summary).map_err(|e| output::OutputError::Io {
            path: summary_path.clone(),
            source: std::io::Error::other(e),
        })
    })?;
    Ok(summary)
}

fn one_well(
    path: &Path,
    stem: &str,
    ctx: &well::RunContext,
    setup: Option<&crate::classify::ClassSetup>,
    dir: &Path,
) -> WellReport {
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
    };
    let result: Result<(), WellError> = (|| {
        let mut out = well::process(path, ctx)?;
        if let Some(setup) = setup {
            let name = out.name.clone();
            report.classes = Some(setup.apply(&mut out.table, &name, &mut out.warnings));
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
                output::write_table(&out.table, dir, stem, format, Some(config.output.decimals))?;
            report.outputs.push(p.display().to_string());
        }
        Ok(())
    })();
    match result {
        Ok(()) => report.ok = true,
        Err(e) => report.error = Some(chain(&e)),
    }
    report
}
