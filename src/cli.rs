//! The command line: clap types (their doc comments are the `--help` text) and
//! the dispatch to the library. No formulas here.

pub mod export;
pub(crate) mod inspect;

use crate::output::messages::note;
use std::io::Write as _;
use std::path::PathBuf;

use clap::{Parser, Subcommand};

use crate::classes::stage::Mode;
use crate::config::{Config, Format};
use crate::error::{Error, chain};
use crate::field;
use crate::input::las::{self, ReadOptions};

/// flowzone: field-scale petrophysics from LAS logs, core, capillary-pressure
/// and pressure data. Messages go to stderr; data to stdout or files.
#[derive(Debug, Parser)]
#[command(name = "flowzone", version, about, long_about = None)]
pub struct Args {
    /// The subcommand to run.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands of `flowzone`.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Show each LAS file's well header, curves with units, depth range and
    /// step, missing-value fraction per curve, and warnings.
    Inspect {
        /// LAS files to inspect.
        #[arg(required = true)]
        files: Vec<PathBuf>,
        /// Print JSON (one array of file summaries) instead of text.
        #[arg(long)]
        json: bool,
        /// Refuse files whose header contradicts their data.
        #[arg(long)]
        strict: bool,
    },
    /// Write each LAS file's curves as read (original mnemonics and units) to
    /// CSV, LAS 2.0 or Parquet, one output file per input.
    Export {
        /// LAS files to export.
        #[arg(required = true)]
        files: Vec<PathBuf>,
        /// Output format.
        #[arg(long, value_enum)]
        format: Format,
        /// Output folder (created if needed).
        #[arg(long)]
        out: PathBuf,
        /// Refuse files whose header contradicts their data.
        #[arg(long)]
        strict: bool,
    },
    /// Run the field: every well of the config through the stages, into an
    /// output folder.
    Run {
        /// Project config (TOML).
        #[arg(long)]
        config: PathBuf,
        /// Output folder; overrides [output] dir of the config.
        #[arg(long)]
        out: Option<PathBuf>,
        /// Worker threads (default: one per core).
        #[arg(long)]
        threads: Option<usize>,
        /// No progress lines.
        #[arg(long)]
        quiet: bool,
        /// Exit 0 even when some wells failed (they are still reported).
        #[arg(long)]
        keep_going: bool,
        /// Run only the K-th of N subsets of the wells (e.g. 3/8), balanced by
        /// file size and the same on every machine; writes the wells' outputs
        /// and shards/shard-K-of-N.state for `flowzone merge`, but no
        /// field-level outputs.
        #[arg(long, value_name = "K/N")]
        shard: Option<crate::field::shard::ShardSpec>,
        /// Write into an output folder that holds a previous run (or this
        /// shard's previous state), replacing its files one by one.
        #[arg(long)]
        overwrite: bool,
        /// Print where the time went on stderr: seconds per stage summed
        /// over wells, and the steps before and after the wells
        /// (run-manifest.json holds them either way).
        #[arg(long)]
        timings: bool,
    },
    /// Combine the shards of a sharded run (`run --shard K/N`) into the
    /// field-level outputs a single run makes: run summary and manifest, zone
    /// summary, saturation-height residuals, contacts. Checks that every
    /// shard ran with the same tool, config and inputs.
    Merge {
        /// The project config the shards ran with.
        #[arg(long)]
        config: PathBuf,
        /// Output folder; overrides [output] dir of the config.
        #[arg(long)]
        out: Option<PathBuf>,
        /// Shard output folders (default: the output folder itself, for
        /// shards that all wrote to one shared folder). Their wells' files
        /// are copied into the output folder.
        shards: Vec<PathBuf>,
        /// No progress lines.
        #[arg(long)]
        quiet: bool,
        /// Exit 0 even when some wells failed (they are still reported).
        #[arg(long)]
        keep_going: bool,
        /// Write into an output folder that already holds a merged run.
        #[arg(long)]
        overwrite: bool,
    },
    /// Core: match the core file to the wells, apply the accepted depth
    /// shifts, write the core table (RQI, FZI, R35, class per scheme) and
    /// print a suggested core-to-log shift per cored well.
    Core {
        /// Project config (TOML) with a [core] section.
        #[arg(long)]
        config: PathBuf,
        /// Output folder (core/core-table.csv, core/core-report.json).
        #[arg(long)]
        out: PathBuf,
        /// No progress lines.
        #[arg(long)]
        quiet: bool,
    },
    /// Train the class predictor on the core and score it leave-one-well-out
    /// against two baselines; save the model and its report.
    Train {
        /// Project config (TOML) with [core] and [classes].
        #[arg(long)]
        config: PathBuf,
        /// Output folder (model/class-model.fzm, model/training-report.*, core/).
        #[arg(long)]
        out: PathBuf,
        /// No progress lines.
        #[arg(long)]
        quiet: bool,
    },
    /// Hydraulic class schemes.
    Classes {
        /// The `classes` subcommand to run.
        #[command(subcommand)]
        command: ClassesCommand,
    },
    /// Write the invented demo field (LAS wells and CSV tables) made by the
    /// synthetic forward model; with --wells, a synthetic bench field instead.
    Demo {
        /// Output folder.
        #[arg(long)]
        out: PathBuf,
        /// Random seed of the model.
        #[arg(long, default_value_t = crate::demo::synth::DEMO_SEED)]
        seed: u64,
        /// Write a synthetic bench field of this many wells (synth-0001.las,
        /// ...; eight logs each), with zones.csv and field.toml (stages: read,
        /// shale volume, porosity, saturation), instead of the demo field.
        #[arg(long)]
        wells: Option<usize>,
        /// Depth samples per bench well, about (at least 1000). Default 10000.
        #[arg(long, requires = "wells")]
        depths: Option<usize>,
    },
}

/// `flowzone classes ...`
#[derive(Debug, Subcommand)]
pub enum ClassesCommand {
    /// Compare every scheme of [classes.scheme] on the core: classes used,
    /// samples per class, log-k spread at given porosity, and the
    /// leave-one-well-out error of permeability from class and porosity.
    Compare {
        /// Project config (TOML) with [core] and [classes].
        #[arg(long)]
        config: PathBuf,
        /// Print JSON instead of text.
        #[arg(long)]
        json: bool,
    },
}

/// Run a parsed command; returns the process exit code.
pub fn run(args: Args) -> Result<(), Error> {
    match args.command {
        Command::Inspect {
            files,
            json,
            strict,
        } => cmd_inspect(&files, json, strict),
        Command::Export {
            files,
            format,
            out,
            strict,
        } => cmd_export(&files, format, &out, strict),
        Command::Run {
            config,
            out,
            threads,
            quiet,
            keep_going,
            shard,
            overwrite,
            timings,
        } => cmd_run(
            &config,
            out,
            threads,
            shard,
            RunFlags {
                quiet,
                keep_going,
                overwrite,
                timings,
            },
        ),
        Command::Merge {
            config,
            out,
            shards,
            quiet,
            keep_going,
            overwrite,
        } => cmd_merge(&config, out, &shards, quiet, keep_going, overwrite),
        Command::Demo {
            out,
            seed,
            wells,
            depths,
        } => match wells {
            None => crate::demo::write_demo(&out, seed),
            Some(n) => crate::demo::write_field(
                &out,
                n,
                depths.unwrap_or(crate::demo::synth::FIELD_DEFAULT_DEPTHS),
                seed,
            ),
        },
        Command::Core { config, out, quiet } => cmd_class_stage(&config, &out, quiet, Mode::Core),
        Command::Train { config, out, quiet } => cmd_class_stage(&config, &out, quiet, Mode::Train),
        Command::Classes {
            command: ClassesCommand::Compare { config, json },
        } => cmd_compare(&config, json),
    }
}

fn cmd_inspect(files: &[PathBuf], json: bool, strict: bool) -> Result<(), Error> {
    let mut summaries = Vec::new();
    let mut failed = 0;
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    for f in files {
        match las::read_path(
            f,
            ReadOptions {
                strict,
                ..ReadOptions::default()
            },
        ) {
            Ok(file) => {
                let s = inspect::summarise(&f.display().to_string(), &file);
                if json {
                    summaries.push(s);
                } else {
                    let _ = writeln!(out, "{}", inspect::to_text(&s));
                }
            }
            Err(e) => {
                failed += 1;
                note!("error: {}", chain(&e));
            }
        }
    }
    if json {
        let _ = serde_json::to_writer_pretty(&mut out, &summaries);
        let _ = writeln!(out);
    }
    if failed > 0 {
        return Err(Error::Partial {
            failed,
            total: files.len(),
            what: "files",
        });
    }
    Ok(())
}

fn cmd_export(files: &[PathBuf], format: Format, out: &PathBuf, strict: bool) -> Result<(), Error> {
    std::fs::create_dir_all(out).map_err(|source| Error::Io {
        path: out.clone(),
        source,
    })?;
    let mut failed = 0;
    for f in files {
        let result = las::read_path(
            f,
            ReadOptions {
                strict,
                ..ReadOptions::default()
            },
        )
        .map_err(Error::from)
        .and_then(|file| {
            for w in &file.warnings {
                note!("warning: {}: {w}", f.display());
            }
            let mut paths = vec![export::export_file(&file, f, out, format)?];
            paths.extend(export::export_data_sets(&file, f, out)?);
            Ok(paths)
        });
        match result {
            Ok(paths) => {
                for p in paths {
                    note!("wrote {}", p.display());
                }
            }
            Err(e) => {
                failed += 1;
                note!("error: {}", chain(&e));
            }
        }
    }
    if failed > 0 {
        return Err(Error::Partial {
            failed,
            total: files.len(),
            what: "files",
        });
    }
    Ok(())
}

/// The output folder: --out, or [output] dir of the config.
fn out_dir(config: &Config, out: Option<PathBuf>) -> Result<PathBuf, Error> {
    out.or_else(|| config.output.dir.as_ref().map(|d| config.resolve_path(d)))
        .ok_or_else(|| {
            Error::Usage(
                "no output folder: give --out DIR or set [output] dir in the config".into(),
            )
        })
}

/// Print the failed wells and the totals; an error when wells failed and
/// `keep_going` is off.
fn report_wells(
    wells: &[crate::pipeline::WellReport],
    total: usize,
    quiet: bool,
    keep_going: bool,
    done: &str,
) -> Result<(), Error> {
    let failed = wells.iter().filter(|w| !w.ok).count();
    for w in wells.iter().filter(|w| !w.ok) {
        note!("error: {}", w.error.as_deref().unwrap_or("unknown error"));
    }
    if !quiet {
        note!("{total} wells, {failed} failed; {done}");
    }
    if failed > 0 && !keep_going {
        return Err(Error::Partial {
            failed,
            total,
            what: "wells",
        });
    }
    Ok(())
}

fn cmd_run(
    config_path: &std::path::Path,
    out: Option<PathBuf>,
    threads: Option<usize>,
    shard: Option<crate::field::shard::ShardSpec>,
    flags: RunFlags,
) -> Result<(), Error> {
    let RunFlags {
        quiet,
        keep_going,
        overwrite,
        timings,
    } = flags;
    let config = Config::load(config_path)?;
    // a missing input is refused before the output folder is touched
    config.check_inputs_exist(true)?;
    let out = out_dir(&config, out)?;
    let marker = match shard {
        Some(spec) => crate::field::shard::state_path(spec),
        None => PathBuf::from(field::safety::FINISHED_MARKER),
    };
    field::safety::check_previous(&out, &marker, overwrite)?;
    if let Some(n) = threads {
        // a second call in the same process fails; the first pool stays in use
        let _ = rayon::ThreadPoolBuilder::new()
            .num_threads(n.max(1))
            .build_global();
    }
    if let Some(spec) = shard {
        let done = crate::field::shard::run_shard(&config, &out, spec, !quiet)?;
        if done.trained && !quiet {
            note!(
                "note: shard {spec} trained the class model itself, as every shard will; train it once (`flowzone train`) and set [predictor] model to share it"
            );
        }
        let msg = format!(
            "shard {spec} done; state in {} (then: flowzone merge)",
            done.state_file.display()
        );
        return report_wells(&done.reports, done.reports.len(), quiet, keep_going, &msg);
    }
    let summary = field::run(&config, &out, !quiet)?;
    if timings {
        note!("{}", summary.timings.table().trim_end());
    }
    let msg = format!("outputs in {} (summary: run-summary.json)", out.display());
    report_wells(&summary.wells, summary.wells_total, quiet, keep_going, &msg)
}

/// The switches of `run`.
#[derive(Debug, Clone, Copy)]
struct RunFlags {
    quiet: bool,
    keep_going: bool,
    overwrite: bool,
    timings: bool,
}

fn cmd_merge(
    config_path: &std::path::Path,
    out: Option<PathBuf>,
    shards: &[PathBuf],
    quiet: bool,
    keep_going: bool,
    overwrite: bool,
) -> Result<(), Error> {
    let config = Config::load(config_path)?;
    config.check_inputs_exist(true)?;
    let out = out_dir(&config, out)?;
    field::safety::check_previous(
        &out,
        std::path::Path::new(field::safety::FINISHED_MARKER),
        overwrite,
    )?;
    let summary = crate::field::shard::merge(&config, &out, shards, !quiet)?;
    let msg = format!("outputs in {} (summary: run-summary.json)", out.display());
    report_wells(&summary.wells, summary.wells_total, quiet, keep_going, &msg)
}

fn cmd_class_stage(
    config_path: &std::path::Path,
    out: &std::path::Path,
    quiet: bool,
    mode: Mode,
) -> Result<(), Error> {
    let config = Config::load(config_path)?;
    if mode == Mode::Train && config.classes.is_none() {
        return Err(Error::Usage(
            "the config has no [classes] section: which scheme should the model predict?".into(),
        ));
    }
    config.check_inputs_exist(mode == Mode::Run)?;
    let files = config.well_files()?;
    field::safety::check_out_dir(out, &config.input_folders())?;
    let ctx = crate::well::RunContext::new(config)?;
    let mut prepared = crate::classes::stage::prepare(&ctx, &files, out, mode, !quiet)?;
    // training also scores the saturation-height evidence when the config
    // has a saturation-height model, so the report's ablation table is whole
    let scheme = prepared.setup.as_ref().map(|s| s.scheme.clone());
    if let (Mode::Train, Some(scheme)) = (mode, scheme) {
        if let Some(sat) = field::setup::saturation_model(&ctx.config, &files, &ctx, &scheme)? {
            field::setup::choose_saturation_evidence(
                &ctx.config,
                &sat,
                &mut prepared,
                out,
                !quiet,
            )?;
        }
    }
    let summary = &prepared.summary;
    for r in &summary.core_rejected {
        note!("core: line {}: left out: {}", r.line, r.reason);
    }
    let stdout = std::io::stdout();
    let mut o = stdout.lock();
    match mode {
        Mode::Core => {
            let _ = writeln!(
                o,
                "{:<16} {:>8} {:>10} {:>10} {:>8} {:>12} {:>8}",
                "well", "samples", "suggested", "best", "r", "r unshifted", "applied"
            );
            for (w, s) in &summary.shift_suggestions {
                let n = prepared
                    .core
                    .as_ref()
                    .map_or(0, |c| c.samples.iter().filter(|m| &m.well == w).count());
                let applied = summary.shifts_applied.get(w).copied().unwrap_or(0.0);
                match s {
                    Some(s) => {
                        let _ = writeln!(
                            o,
                            "{w:<16} {n:>8} {:>10.2} {:>10.2} {:>8.3} {:>12.3} {applied:>8.2}",
                            s.shift, s.best_shift, s.correlation, s.correlation_unshifted
                        );
                    }
                    None => {
                        let _ = writeln!(
                            o,
                            "{w:<16} {n:>8} {:>10} (too little overlap with the log)",
                            "-"
                        );
                    }
                }
            }
            let _ = writeln!(
                o,
                "shifts are added to core depths; accept one by writing it under [core.shift] in the config"
            );
        }
        Mode::Train | Mode::Run => {
            if let Some(setup) = &prepared.setup {
                let mut header = setup.model.header.clone();
                header.ablation = setup.ablation();
                let _ = write!(
                    o,
                    "{}",
                    crate::classes::stage::report_text(&header, summary)
                );
            }
        }
    }
    if !quiet {
        for p in &summary.outputs {
            note!("wrote {p}");
        }
    }
    Ok(())
}

fn cmd_compare(config_path: &std::path::Path, json: bool) -> Result<(), Error> {
    let config = Config::load(config_path)?;
    let (Some(core_cfg), Some(classes)) = (&config.core, &config.classes) else {
        return Err(Error::Usage(
            "classes compare needs [core] and [classes] in the config".into(),
        ));
    };
    let data = crate::classes::core_match::load(&config, core_cfg)?;
    for r in &data.rejected {
        note!("core: line {}: left out: {}", r.line, r.reason);
    }
    let rows = crate::classes::compare::compare(classes, &data.samples)?;
    let stdout = std::io::stdout();
    let mut o = stdout.lock();
    if json {
        let _ = serde_json::to_writer_pretty(&mut o, &rows);
        let _ = writeln!(o);
    } else {
        let _ = write!(
            o,
            "{}",
            crate::classes::compare::to_text(&rows, data.samples.len())
        );
    }
    Ok(())
}
