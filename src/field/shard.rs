//! Beyond one machine: `run --shard K/N` runs the K-th of N subsets of the
//! field's wells, and `merge` makes the field-level outputs from the shards.
//!
//! Every shard reads the same config and sees the same sorted list of wells;
//! the subsets are fixed by file size alone (largest first to the shard with
//! the fewest bytes so far, ties to the lower shard), so any machine computes
//! the same split. A shard writes its wells' outputs (`wells/`,
//! `field/curves/`) and a state file, `shards/shard-K-of-N.state`, with every
//! well's report. `merge` checks the states against its own view of the
//! config and inputs (same tool, same wells, same class and saturation-height
//! models), copies the wells' outputs from shard folders that are not the
//! merge folder, and writes the field-level outputs through the same code as
//! a single run, so N shards + merge give a single run's files byte for byte
//! (the manifest aside, which records the shards' times and hosts).

use crate::output::messages::note;
use std::path::{Component, Path, PathBuf};
use std::str::FromStr;
use std::time::SystemTime;

use serde::{Deserialize, Serialize};

use crate::config::Config;
use crate::error::Error;
use crate::field::{self, RunSummary};
use crate::output;
use crate::output::manifest::{self, ShardRun};
use crate::pipeline::WellReport;

/// Most shards a run may be split into.
pub const MAX_SHARDS: usize = 100_000;

/// Folder of the shard state files, under a shard's output folder.
pub const STATE_DIR: &str = "shards";

/// First bytes of a state file.
const STATE_MAGIC: &[u8] = b"flowzone shard state\n";

/// Which shard to run: K of N, 1-based.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ShardSpec {
    /// This shard, 1 to `n`.
    pub k: usize,
    /// Number of shards.
    pub n: usize,
}

/// A `--shard` value that is not K/N with 1 <= K <= N <= [`MAX_SHARDS`].
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum ShardSpecError {
    /// No `/`.
    #[error("`{0}` is not K/N (e.g. 3/8: the third of eight shards)")]
    NotKOverN(String),
    /// K or N is not a whole number.
    #[error("`{spec}`: {what} `{text}` is not a whole number")]
    NotANumber {
        /// The `--shard` value as given.
        spec: String,
        /// Which part is wrong: "K" or "N".
        what: &'static str,
        /// The part as given.
        text: String,
    },
    /// N is 0 or above [`MAX_SHARDS`].
    #[error("`{0}`: N must be 1 to {MAX_SHARDS}")]
    BadN(String),
    /// K is 0 or above N.
    #[error("`{spec}`: K must be 1 to N ({n})")]
    BadK {
        /// The `--shard` value as given.
        spec: String,
        /// N, the number of shards.
        n: usize,
    },
}

impl FromStr for ShardSpec {
    type Err = ShardSpecError;

    fn from_str(s: &str) -> Result<ShardSpec, ShardSpecError> {
        let (k, n) = s
            .split_once('/')
            .ok_or_else(|| ShardSpecError::NotKOverN(s.to_string()))?;
        let num = |t: &str, what: &'static str| {
            t.trim()
                .parse::<usize>()
                .map_err(|_| ShardSpecError::NotANumber {
                    spec: s.to_string(),
                    what,
                    text: t.to_string(),
                })
        };
        let (k, n) = (num(k, "K")?, num(n, "N")?);
        if n == 0 || n > MAX_SHARDS {
            return Err(ShardSpecError::BadN(s.to_string()));
        }
        if k == 0 || k > n {
            return Err(ShardSpecError::BadK {
                spec: s.to_string(),
                n,
            });
        }
        Ok(ShardSpec { k, n })
    }
}

impl std::fmt::Display for ShardSpec {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}/{}", self.k, self.n)
    }
}

/// The shard (0-based) of each file, from the files' sizes in bytes: largest
/// first (ties in input order) to the shard holding the fewest bytes so far
/// (ties to the lower shard). Longest-processing-time-first (Graham 1969,
/// SIAM J. Appl. Math. 17(2)): within 4/3 of the best possible largest shard;
/// from memory.
pub fn assign(sizes: &[u64], n: usize) -> Vec<usize> {
    let n = n.max(1);
    let mut order: Vec<usize> = (0..sizes.len()).collect();
    order.sort_by(|&a, &b| sizes[b].cmp(&sizes[a]).then(a.cmp(&b)));
    let mut load = vec![0u64; n];
    let mut shard_of = vec![0usize; sizes.len()];
    for i in order {
        let (s, _) = load
            .iter()
            .enumerate()
            .min_by_key(|&(s, &l)| (l, s))
            .unwrap_or((0, &0));
        shard_of[i] = s;
        load[s] += sizes[i];
    }
    shard_of
}

/// What a shard leaves for the merge.
#[derive(Debug, Serialize, Deserialize)]
struct ShardState {
    run: ShardRun,
    /// Every well file of the field (not only this shard's), with its size.
    files: Vec<(String, u64)>,
    /// SHA-256 of the config file.
    config_sha256: String,
    /// [`field::setup::FieldSetup::fingerprint`] of the shard's run.
    fingerprint: String,
    /// This shard's wells: index into `files`, report.
    reports: Vec<(usize, WellReport)>,
    /// What the field page draws of each report's well (kept out of the
    /// report's serialised form).
    views: Vec<crate::pipeline::WellView>,
}

fn state_name(spec: ShardSpec) -> String {
    format!("shard-{}-of-{}.state", spec.k, spec.n)
}

/// Where shard `spec` leaves its state, relative to its output folder.
pub fn state_path(spec: ShardSpec) -> PathBuf {
    Path::new(STATE_DIR).join(state_name(spec))
}

fn file_list(files: &[PathBuf]) -> Vec<(String, u64)> {
    files
        .iter()
        .map(|f| {
            let bytes = std::fs::metadata(f).map_or(0, |m| m.len());
            (f.display().to_string(), bytes)
        })
        .collect()
}

fn config_sha(config: &Config) -> String {
    manifest::hash_file(&config.source).map_or_else(|_| String::new(), |(_, h)| h)
}

/// The outcome of one shard run.
#[derive(Debug)]
pub struct ShardOutcome {
    /// What the shard ran: K of N, wells, host, threads, times.
    pub run: ShardRun,
    /// Reports of the shard's wells.
    pub reports: Vec<WellReport>,
    /// The state file written for `merge`.
    pub state_file: PathBuf,
    /// Whether the shard trained the class model itself (every shard then
    /// trains the same one: train once and share it instead).
    pub trained: bool,
}

/// Run shard `spec` of the field into `out`.
pub fn run_shard(
    config: &Config,
    out: &Path,
    spec: ShardSpec,
    progress: bool,
) -> Result<ShardOutcome, Error> {
    let started = SystemTime::now();
    // this shard's previous state, when rerun into the same folder
    let previous = read_state(&out.join(state_path(spec))).ok();
    let setup = field::setup::prepare(config, out, progress)?;
    let files = file_list(&setup.files);
    let sizes: Vec<u64> = files.iter().map(|(_, b)| *b).collect();
    let shard_of = assign(&sizes, spec.n);
    let indices: Vec<usize> = (0..files.len())
        .filter(|&i| shard_of[i] == spec.k - 1)
        .collect();
    if progress {
        let bytes: u64 = indices.iter().map(|&i| sizes[i]).sum();
        note!(
            "shard {spec}: {} of {} wells, {:.1} MB",
            indices.len(),
            files.len(),
            bytes as f64 / 1e6
        );
    }
    let dir = out.join(STATE_DIR);
    std::fs::create_dir_all(&dir).map_err(|source| Error::Io {
        path: dir.clone(),
        source,
    })?;
    let journal = dir.join(format!("shard-{}-of-{}.progress.jsonl", spec.k, spec.n));
    let reports = field::process_wells(&setup, &indices, out, &journal, progress)?;
    let finished = SystemTime::now();
    let run = ShardRun {
        shard: spec.k,
        of: spec.n,
        wells: reports.len(),
        wells_failed: reports.iter().filter(|r| !r.ok).count(),
        command: std::env::args().collect(),
        host: std::env::var("HOSTNAME").unwrap_or_default(),
        threads: rayon::current_num_threads(),
        started_utc: manifest::utc(started),
        finished_utc: manifest::utc(finished),
        seconds: finished
            .duration_since(started)
            .map_or(0.0, |d| d.as_secs_f64()),
    };
    let mut reports = reports;
    let views = reports
        .iter_mut()
        .map(|r| std::mem::take(&mut r.view))
        .collect();
    let state = ShardState {
        run: run.clone(),
        files,
        config_sha256: config_sha(config),
        fingerprint: setup.fingerprint()?,
        reports: indices.into_iter().zip(reports).collect(),
        views,
    };
    let path = dir.join(state_name(spec));
    write_state(&path, &state)?;
    let _ = std::fs::remove_file(&journal);
    // the previous run of this shard wrote wells that are no longer in the
    // field: their files go (not those of wells now in another shard, which
    // that shard writes, perhaps at this moment into the same folder)
    if let Some(prev) = previous {
        let now: Vec<String> = state
            .reports
            .iter()
            .flat_map(|(_, r)| r.outputs.iter().cloned())
            .collect();
        let gone: Vec<String> = prev
            .reports
            .iter()
            .filter(|(_, r)| !state.files.iter().any(|(f, _)| *f == r.file))
            .flat_map(|(_, r)| r.outputs.iter().cloned())
            .collect();
        let c = output::written::clean_up(out, Some(&gone), &now, &[], false);
        if progress {
            if let Some(n) = output::written::cleanup_note(&c) {
                note!("note: shard {spec}: {n}");
            }
        }
    }
    Ok(ShardOutcome {
        run,
        reports: state.reports.into_iter().map(|(_, r)| r).collect(),
        state_file: path,
        trained: setup.trained(),
    })
}

fn write_state(path: &Path, state: &ShardState) -> Result<(), Error> {
    let io = |source| output::OutputError::Io {
        path: path.to_path_buf(),
        source,
    };
    let body = postcard::to_stdvec(&(env!("CARGO_PKG_VERSION"), state))
        .map_err(|e| io(std::io::Error::other(e)))?;
    output::write_atomic(path, |w| {
        use std::io::Write as _;
        w.write_all(STATE_MAGIC)
            .and_then(|()| w.write_all(&body))
            .map_err(io)
    })?;
    Ok(())
}

fn read_state(path: &Path) -> Result<ShardState, Error> {
    let bad = |msg: String| Error::Usage(format!("shard state `{}`: {msg}", path.display()));
    let bytes = std::fs::read(path).map_err(|source| Error::Io {
        path: path.to_path_buf(),
        source,
    })?;
    let body = bytes
        .strip_prefix(STATE_MAGIC)
        .ok_or_else(|| bad("not a flowzone shard state file".into()))?;
    let (version, rest): (String, &[u8]) =
        postcard::take_from_bytes(body).map_err(|e| bad(format!("unreadable ({e})")))?;
    if version != env!("CARGO_PKG_VERSION") {
        return Err(bad(format!(
            "written by flowzone {version}; this is flowzone {}: run the shards and the merge with one version",
            env!("CARGO_PKG_VERSION")
        )));
    }
    let (state, rest): (ShardState, &[u8]) =
        postcard::take_from_bytes(rest).map_err(|e| bad(format!("unreadable ({e})")))?;
    if !rest.is_empty() {
        return Err(bad(format!("{} bytes after the state", rest.len())));
    }
    Ok(state)
}

/// The state files in `dir/shards/`, sorted.
fn state_files(dir: &Path) -> Result<Vec<PathBuf>, Error> {
    let sdir = dir.join(STATE_DIR);
    let entries = std::fs::read_dir(&sdir).map_err(|source| Error::Io {
        path: sdir.clone(),
        source,
    })?;
    let mut v: Vec<PathBuf> = entries
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| p.extension().is_some_and(|x| x == "state") && p.is_file())
        .collect();
    v.sort();
    Ok(v)
}

/// A relative path of plain names (no `..`, root or prefix), as reports hold.
fn is_plain_relative(p: &Path) -> bool {
    p.components().all(|c| matches!(c, Component::Normal(_)))
}

/// Copy `from` to `to` through a temporary file.
fn copy_atomic(from: &Path, to: &Path) -> Result<(), Error> {
    if let Some(d) = to.parent() {
        std::fs::create_dir_all(d).map_err(|source| Error::Io {
            path: d.to_path_buf(),
            source,
        })?;
    }
    output::write_atomic(to, |w| {
        let mut f = std::fs::File::open(from).map_err(|source| output::OutputError::Io {
            path: from.to_path_buf(),
            source,
        })?;
        std::io::copy(&mut f, w)
            .map(|_| ())
            .map_err(|source| output::OutputError::Io {
                path: to.to_path_buf(),
                source,
            })
    })?;
    Ok(())
}

/// Merge shard runs into `out`: the field-level outputs of a single run.
/// `dirs` are the shards' output folders (`out` itself when empty: shards
/// that wrote to one shared folder).
pub fn merge(
    config: &Config,
    out: &Path,
    dirs: &[PathBuf],
    progress: bool,
) -> Result<RunSummary, Error> {
    let mut rerun = field::Rerun::start(out);
    output::remove_stale_partials(out);
    let setup = field::setup::prepare(config, out, progress)?;
    let files = file_list(&setup.files);
    let fingerprint = setup.fingerprint()?;
    let sha = config_sha(config);
    let out_abs = out.canonicalize().map_err(|source| Error::Io {
        path: out.to_path_buf(),
        source,
    })?;
    let dirs: Vec<PathBuf> = if dirs.is_empty() {
        vec![out.to_path_buf()]
    } else {
        dirs.to_vec()
    };
    let mut seen_dirs = Vec::new();
    let mut states: Vec<(PathBuf, PathBuf, ShardState)> = Vec::new();
    for dir in &dirs {
        let abs = dir.canonicalize().map_err(|source| Error::Io {
            path: dir.clone(),
            source,
        })?;
        if seen_dirs.contains(&abs) {
            continue;
        }
        seen_dirs.push(abs.clone());
        let found = state_files(dir)?;
        if found.is_empty() {
            return Err(Error::Usage(format!(
                "no shard state in `{}`: run `flowzone run --shard K/N` into it first",
                dir.join(STATE_DIR).display()
            )));
        }
        for p in found {
            let st = read_state(&p)?;
            states.push((abs.clone(), p, st));
        }
    }
    let n = states[0].2.run.of;
    let mut by_k: Vec<Option<&Path>> = vec![None; n + 1];
    for (_, p, st) in &states {
        let here = |msg: String| Error::Usage(format!("shard state `{}`: {msg}", p.display()));
        if st.run.of != n {
            return Err(here(format!(
                "a shard of {} shards, others are of {n}",
                st.run.of
            )));
        }
        if st.run.shard == 0 || st.run.shard > n {
            return Err(here(format!("shard number {} out of 1-{n}", st.run.shard)));
        }
        if let Some(other) = by_k[st.run.shard] {
            return Err(here(format!(
                "shard {}/{n} is also in `{}`: give each shard once",
                st.run.shard,
                other.display()
            )));
        }
        by_k[st.run.shard] = Some(p);
        if st.config_sha256 != sha {
            return Err(here(format!(
                "run with another config (SHA-256 {}) than `{}`",
                st.config_sha256,
                config.source.display()
            )));
        }
        if st.files != files {
            let diff = files
                .iter()
                .zip(&st.files)
                .find(|(a, b)| a != b)
                .map_or_else(
                    || format!("{} wells there, {} here", st.files.len(), files.len()),
                    |(a, b)| {
                        format!(
                            "`{}` ({} bytes) there, `{}` ({} bytes) here",
                            b.0, b.1, a.0, a.1
                        )
                    },
                );
            return Err(here(format!(
                "run on other well files than the merge sees: {diff}"
            )));
        }
        if st.fingerprint != fingerprint {
            return Err(here(
                "run with another class or saturation-height model than the merge builds (core, capillary, pressure or model files changed?)"
                    .into(),
            ));
        }
    }
    let missing: Vec<String> = (1..=n)
        .filter(|&k| by_k[k].is_none())
        .map(|k| format!("{k}/{n}"))
        .collect();
    if !missing.is_empty() {
        return Err(Error::Usage(format!(
            "shard(s) {} missing: run them, or give the folders they wrote to",
            missing.join(", ")
        )));
    }
    let mut reports: Vec<Option<WellReport>> = vec![None; files.len()];
    let mut runs: Vec<ShardRun> = Vec::new();
    let mut started = SystemTime::now();
    for (dir, p, st) in states {
        if dir == out_abs {
            // a shard's state in the merge folder is part of its result
            if let Some(name) = p.file_name() {
                rerun
                    .also
                    .push(format!("{STATE_DIR}/{}", name.to_string_lossy()));
            }
        }
        if let Ok(t) = humantime::parse_rfc3339(&st.run.started_utc) {
            started = started.min(t);
        }
        runs.push(st.run);
        let mut views = st.views.into_iter();
        for (i, mut r) in st.reports {
            r.view = views.next().unwrap_or_default();
            let slot = reports.get_mut(i).ok_or_else(|| {
                Error::Usage(format!(
                    "shard state `{}`: well {i} out of range",
                    p.display()
                ))
            })?;
            if slot.is_some() {
                return Err(Error::Usage(format!(
                    "shard state `{}`: `{}` is in two shards",
                    p.display(),
                    files[i].0
                )));
            }
            // in the merge folder at the end, copied or written there
            rerun.also.extend(r.outputs.iter().cloned());
            if dir != out_abs {
                for rel in &r.outputs {
                    let rel_path = Path::new(rel);
                    if !is_plain_relative(rel_path) {
                        return Err(Error::Usage(format!(
                            "shard state `{}`: output `{rel}` is not a path inside the shard folder",
                            p.display()
                        )));
                    }
                    copy_atomic(&dir.join(rel_path), &out.join(rel_path))?;
                }
            }
            *slot = Some(r);
        }
    }
    let mut all = Vec::with_capacity(files.len());
    for (i, r) in reports.into_iter().enumerate() {
        all.push(
            r.ok_or_else(|| Error::Usage(format!("`{}` is in no shard's state", files[i].0)))?,
        );
    }
    runs.sort_by_key(|r| r.shard);
    if progress {
        note!("merge: {n} shards, {} wells", all.len());
    }
    field::finish(config, out, setup, all, (started, runs), rerun, progress)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn spec_parsing() {
        assert_eq!("3/8".parse(), Ok(ShardSpec { k: 3, n: 8 }));
        assert_eq!(" 1 / 1 ".parse(), Ok(ShardSpec { k: 1, n: 1 }));
        for bad in ["0/3", "4/3", "3", "a/3", "1/0", "1/-2", "1/100001"] {
            assert!(bad.parse::<ShardSpec>().is_err(), "{bad}");
        }
    }

    /// Every file in exactly one shard; the split depends on sizes alone;
    /// no shard exceeds total / n + (1 − 1/n) × the largest file, the bound
    /// of any greedy list schedule (Graham 1966, Bell System Technical
    /// Journal 45(9); from memory).
    #[test]
    fn assignment_is_complete_deterministic_and_balanced() {
        use rand::{Rng, SeedableRng};
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(11);
        for _ in 0..200 {
            let m = rng.random_range(1..300);
            let n = rng.random_range(1..12);
            let sizes: Vec<u64> = (0..m).map(|_| rng.random_range(1..5_000_000)).collect();
            let a = assign(&sizes, n);
            assert_eq!(a, assign(&sizes, n));
            assert!(a.iter().all(|&s| s < n));
            let mut load = vec![0u64; n];
            for (i, &s) in a.iter().enumerate() {
                load[s] += sizes[i];
            }
            assert_eq!(load.iter().sum::<u64>(), sizes.iter().sum::<u64>());
            let total = sizes.iter().sum::<u64>() as f64;
            let largest = *sizes.iter().max().unwrap_or(&0) as f64;
            let bound = total / n as f64 + (1.0 - 1.0 / n as f64) * largest;
            let worst = *load.iter().max().unwrap_or(&0) as f64;
            assert!(worst <= bound + 1.0, "{worst} vs bound {bound}");
        }
        // equal sizes: round robin in input order
        assert_eq!(assign(&[5; 7], 3), vec![0, 1, 2, 0, 1, 2, 0]);
    }

    #[test]
    fn plain_relative_paths_only() {
        assert!(is_plain_relative(Path::new("wells/a.las")));
        assert!(!is_plain_relative(Path::new("../a.las")));
        assert!(!is_plain_relative(Path::new("/etc/passwd")));
        assert!(!is_plain_relative(Path::new("wells/../../a")));
    }
}
