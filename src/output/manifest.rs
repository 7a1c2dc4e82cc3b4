//! The run manifest: what a run read and made, so it can be reproduced and
//! checked later. Written as `run-manifest.json` beside `run-summary.json`.
//!
//! It holds the tool version, the command line, the config (its path, hash
//! and text), the SHA-256 of every input file (wells, tables, surveys, the
//! class model used), the thread count, and the start and end times (UTC,
//! RFC 3339). Everything else a run writes is byte-identical for the same
//! inputs and config whatever the thread count; the manifest's times are
//! the only part that changes from run to run.

use std::io::Read;
use std::path::{Path, PathBuf};
use std::time::SystemTime;

use rayon::prelude::*;
use serde::Serialize;
use sha2::{Digest, Sha256};

use crate::config::Config;

/// One input file.
#[derive(Debug, Clone, Serialize)]
pub struct InputFile {
    /// What the run used it for: config, well, tops, survey, core, capillary, pressures, model.
    pub role: String,
    pub path: String,
    pub bytes: u64,
    /// SHA-256 of the contents, hex; empty when the file could not be read.
    pub sha256: String,
    pub error: Option<String>,
}

/// The manifest.
#[derive(Debug, Clone, Serialize)]
pub struct Manifest {
    pub tool: String,
    pub command: Vec<String>,
    pub started_utc: String,
    pub finished_utc: String,
    pub seconds: f64,
    pub threads: usize,
    pub config: InputFile,
    /// The config as read.
    pub config_text: String,
    pub inputs: Vec<InputFile>,
    pub wells_total: usize,
    pub wells_failed: usize,
    /// The shard runs a `flowzone merge` combined (absent for a single run).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub shards: Vec<ShardRun>,
    /// Where the time went: setup, well stages, field outputs.
    pub timings: crate::timings::RunTimings,
    /// Every file the run wrote, relative to the output folder,
    /// `/`-separated, sorted (the manifest itself aside): a rerun with
    /// `--overwrite` removes the ones it does not write again.
    pub outputs: Vec<String>,
}

/// One shard run (`run --shard K/N`) as the merge's manifest records it.
#[derive(Debug, Clone, Serialize, serde::Deserialize, PartialEq)]
pub struct ShardRun {
    /// K of K/N (1-based) and N.
    pub shard: usize,
    pub of: usize,
    pub wells: usize,
    pub wells_failed: usize,
    pub command: Vec<String>,
    /// Machine the shard ran on (the HOSTNAME environment variable; empty when unset).
    pub host: String,
    pub threads: usize,
    pub started_utc: String,
    pub finished_utc: String,
    pub seconds: f64,
}

/// SHA-256 and size of a file, read in 1 MiB blocks.
pub fn hash_file(path: &Path) -> std::io::Result<(u64, String)> {
    let mut f = std::fs::File::open(path)?;
    let mut h = Sha256::new();
    let mut buf = vec![0u8; 1 << 20];
    let mut n = 0u64;
    loop {
        let k = f.read(&mut buf)?;
        if k == 0 {
            break;
        }
        h.update(&buf[..k]);
        n += k as u64;
    }
    Ok((n, hex(&h.finalize())))
}

/// SHA-256 of `bytes`, hex.
pub fn sha256_hex(bytes: &[u8]) -> String {
    hex(&Sha256::digest(bytes))
}

pub fn hex(digest: &[u8]) -> String {
    use std::fmt::Write as _;
    let mut s = String::with_capacity(2 * digest.len());
    for b in digest {
        let _ = write!(s, "{b:02x}");
    }
    s
}

/// The record of an input the run has already read into memory: hashed
/// from those bytes, not read again.
pub fn input_of_bytes(role: &str, path: &Path, bytes: &[u8]) -> InputFile {
    InputFile {
        role: role.into(),
        path: path.display().to_string(),
        bytes: bytes.len() as u64,
        sha256: sha256_hex(bytes),
        error: None,
    }
}

fn input(role: &str, path: &Path) -> InputFile {
    match hash_file(path) {
        Ok((bytes, sha256)) => InputFile {
            role: role.into(),
            path: path.display().to_string(),
            bytes,
            sha256,
            error: None,
        },
        Err(e) => InputFile {
            role: role.into(),
            path: path.display().to_string(),
            bytes: 0,
            sha256: String::new(),
            error: Some(e.to_string()),
        },
    }
}

/// UTC time as RFC 3339, to the second.
pub fn utc(t: SystemTime) -> String {
    humantime::format_rfc3339_seconds(t).to_string()
}

/// Every input the config names besides the wells: (role, path).
pub fn table_inputs(config: &Config) -> Vec<(&'static str, PathBuf)> {
    let mut v = Vec::new();
    if let Some(p) = &config.zones.tops {
        v.push(("tops", config.resolve_path(p)));
    }
    for w in config.depth.well.values() {
        if let Some(p) = &w.survey {
            v.push(("survey", config.resolve_path(p)));
        }
    }
    if let Some(c) = &config.core {
        v.push(("core", config.resolve_path(&c.file)));
    }
    if let Some(c) = &config.capillary {
        v.push(("capillary", config.resolve_path(&c.file)));
    }
    if let Some(p) = &config.pressures {
        v.push(("pressures", config.resolve_path(&p.file)));
    }
    if let Some(m) = config.predictor.as_ref().and_then(|p| p.model.as_ref()) {
        v.push(("model", config.resolve_path(m)));
    }
    v
}

/// Build the manifest of a finished run. `wells` are the run's LAS files,
/// each with its record when the run hashed the bytes it read (a well whose
/// file could not be read, or a merge, is hashed here).
pub fn build(
    config: &Config,
    wells: &[(&Path, Option<&InputFile>)],
    started: SystemTime,
    counts: (usize, usize),
) -> Manifest {
    let mut inputs: Vec<InputFile> = wells
        .par_iter()
        .map(|(w, known)| known.cloned().unwrap_or_else(|| input("well", w)))
        .collect();
    inputs.extend(table_inputs(config).iter().map(|(r, p)| input(r, p)));
    let finished = SystemTime::now();
    Manifest {
        tool: format!("flowzone {}", env!("CARGO_PKG_VERSION")),
        command: std::env::args().collect(),
        started_utc: utc(started),
        finished_utc: utc(finished),
        seconds: finished
            .duration_since(started)
            .map_or(0.0, |d| d.as_secs_f64()),
        threads: rayon::current_num_threads(),
        config: input("config", &config.source),
        config_text: std::fs::read_to_string(&config.source).unwrap_or_default(),
        inputs,
        wells_total: counts.0,
        wells_failed: counts.1,
        shards: Vec::new(),
        timings: crate::timings::RunTimings::default(),
        outputs: Vec::new(),
    }
}

#[cfg(test)]
mod tests {
    /// SHA-256 of "abc" is the FIPS 180-2 example value
    /// ba7816bf…f20015ad (NIST FIPS 180-2, Appendix B.1).
    #[test]
    fn sha256_of_the_standard_example() {
        let dir = tempfile::tempdir().expect("tempdir");
        let p = dir.path().join("abc");
        std::fs::write(&p, b"abc").expect("write");
        let (n, hex) = super::hash_file(&p).expect("hash");
        assert_eq!(n, 3);
        assert_eq!(
            hex,
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
        assert_eq!(super::sha256_hex(b"abc"), hex);
        assert_eq!(
            super::utc(std::time::UNIX_EPOCH + std::time::Duration::from_secs(86_400)),
            "1970-01-02T00:00:00Z"
        );
    }
}
