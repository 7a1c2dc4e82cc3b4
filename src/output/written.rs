//! Which files a run wrote, so that a rerun into the same folder leaves it
//! exactly as a fresh run would: the manifest lists the run's files
//! ([`crate::output::manifest::Manifest::outputs`]), and a rerun removes the
//! files the previous run listed that it did not write again. Nothing the
//! previous run did not list is ever removed; a user's own files are named
//! in a note and left.
//!
//! Every output goes through [`crate::output::write_atomic`], which records
//! the file with every [`Tracking`] whose folder holds it. The record is
//! process-wide (writes happen on many threads, deep inside the stages) and
//! keyed by folder, so runs into different folders in one process (tests)
//! keep their own lists.

use std::collections::BTreeSet;
use std::path::{Component, Path, PathBuf};
use std::sync::Mutex;

/// Folders being tracked, each with the files written under it so far.
static TRACKED: Mutex<Vec<(u64, PathBuf, BTreeSet<String>)>> = Mutex::new(Vec::new());
/// Identity of the next [`Tracking`].
static NEXT: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(1);

/// Files written under one output folder while this lives.
#[derive(Debug)]
pub struct Tracking {
    id: u64,
}

/// Start recording the files written under `root` (as the run names it:
/// outputs are paths joined onto it).
pub fn track(root: &Path) -> Tracking {
    let id = NEXT.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
    let mut t = TRACKED
        .lock()
        .unwrap_or_else(std::sync::PoisonError::into_inner);
    t.push((id, root.to_path_buf(), BTreeSet::new()));
    Tracking { id }
}

impl Tracking {
    /// The files written so far, relative to the folder, `/`-separated, sorted.
    pub fn files(&self) -> Vec<String> {
        let t = TRACKED
            .lock()
            .unwrap_or_else(std::sync::PoisonError::into_inner);
        t.iter()
            .find(|(id, _, _)| *id == self.id)
            .map(|(_, _, f)| f.iter().cloned().collect())
            .unwrap_or_default()
    }
}

impl Drop for Tracking {
    fn drop(&mut self) {
        let mut t = TRACKED
            .lock()
            .unwrap_or_else(std::sync::PoisonError::into_inner);
        t.retain(|(id, _, _)| *id != self.id);
    }
}

/// Record `path` as written, with every tracked folder that holds it.
pub(crate) fn record(path: &Path) {
    let mut t = TRACKED
        .lock()
        .unwrap_or_else(std::sync::PoisonError::into_inner);
    for (_, root, files) in t.iter_mut() {
        if let Some(rel) = relative(path, root) {
            files.insert(rel);
        }
    }
}

/// `path` relative to `root`, `/`-separated; `None` when outside it.
fn relative(path: &Path, root: &Path) -> Option<String> {
    let rel = path.strip_prefix(root).ok()?;
    let parts: Option<Vec<String>> = rel
        .components()
        .map(|c| match c {
            Component::Normal(s) => Some(s.to_string_lossy().into_owned()),
            Component::CurDir => Some(String::new()),
            _ => None,
        })
        .collect();
    let parts: Vec<String> = parts?.into_iter().filter(|s| !s.is_empty()).collect();
    (!parts.is_empty()).then(|| parts.join("/"))
}

/// A listed file's path under `root`, or `None` when the entry could reach
/// outside it (absolute, `..`, a drive or root): a listing read from disk
/// is never trusted to name a file elsewhere.
pub fn listed_path(root: &Path, entry: &str) -> Option<PathBuf> {
    let p = Path::new(entry);
    let safe = !entry.is_empty()
        && p.components().all(|c| matches!(c, Component::Normal(_)))
        && !entry.contains('\\');
    safe.then(|| root.join(p))
}

/// What a rerun cleaned up, for the note on stderr.
#[derive(Debug, Default, Clone, PartialEq, Eq)]
pub struct Cleanup {
    /// Files the previous run wrote and this one did not: removed.
    pub removed: Vec<String>,
    /// Files in the folder neither run wrote (a user's own): left.
    pub foreign: Vec<String>,
}

/// After a run that wrote `now` into `root` (relative paths, plus `keep`,
/// e.g. the manifest): remove each file of `previous` (the previous run's
/// listing) not in `now`, then the folders that leaves empty, and, with
/// `foreign`, list the files in `root` that neither run wrote.
/// `previous = None` (no previous run, or one whose manifest lists
/// nothing) removes nothing.
pub fn clean_up(
    root: &Path,
    previous: Option<&[String]>,
    now: &[String],
    keep: &[&str],
    foreign: bool,
) -> Cleanup {
    let now: BTreeSet<&str> = now
        .iter()
        .map(String::as_str)
        .chain(keep.iter().copied())
        .collect();
    let mut removed = Vec::new();
    for entry in previous.unwrap_or_default() {
        if now.contains(entry.as_str()) {
            continue;
        }
        let Some(path) = listed_path(root, entry) else {
            continue;
        };
        // a file (or a link) only: never a folder
        let is_file = std::fs::symlink_metadata(&path).is_ok_and(|m| !m.is_dir());
        if is_file && std::fs::remove_file(&path).is_ok() {
            removed.push(entry.clone());
            let mut dir = path.parent();
            while let Some(d) = dir.filter(|d| *d != root && d.starts_with(root)) {
                // only an empty folder goes; the first one that is not stops it
                if std::fs::remove_dir(d).is_err() {
                    break;
                }
                dir = d.parent();
            }
        }
    }
    let mut stack = if foreign {
        vec![root.to_path_buf()]
    } else {
        Vec::new()
    };
    let mut foreign = Vec::new();
    while let Some(dir) = stack.pop() {
        let Ok(entries) = std::fs::read_dir(&dir) else {
            continue;
        };
        for e in entries.flatten() {
            let p = e.path();
            if e.file_type().is_ok_and(|t| t.is_dir()) {
                stack.push(p);
            } else if let Some(rel) = relative(&p, root) {
                if !now.contains(rel.as_str()) {
                    foreign.push(rel);
                }
            }
        }
    }
    foreign.sort();
    Cleanup { removed, foreign }
}

/// The note on stderr for a clean-up: what was removed and what was left.
pub fn cleanup_note(c: &Cleanup) -> Option<String> {
    const SHOWN: usize = 8;
    let list = |v: &[String]| {
        let mut s: Vec<String> = v.iter().take(SHOWN).map(|f| format!("`{f}`")).collect();
        if v.len() > SHOWN {
            s.push(format!("and {} more", v.len() - SHOWN));
        }
        s.join(", ")
    };
    let mut parts = Vec::new();
    if !c.removed.is_empty() {
        parts.push(format!(
            "removed {} file(s) the previous run wrote and this one did not: {}",
            c.removed.len(),
            list(&c.removed)
        ));
    }
    if !c.foreign.is_empty() {
        parts.push(format!(
            "left {} file(s) flowzone did not write: {}",
            c.foreign.len(),
            list(&c.foreign)
        ));
    }
    (!parts.is_empty()).then(|| parts.join("; "))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A listing never names a file outside the folder.
    #[test]
    fn listed_paths_stay_inside_the_folder() {
        let root = Path::new("/out");
        assert_eq!(
            listed_path(root, "wells/a.csv"),
            Some(PathBuf::from("/out/wells/a.csv"))
        );
        for bad in [
            "../x",
            "/etc/passwd",
            "wells/../../x",
            "",
            "a\\..\\b",
            "./x",
        ] {
            assert_eq!(listed_path(root, bad), None, "{bad}");
        }
    }

    /// Files the previous run listed and this one did not write are
    /// removed, with the folders left empty; a user's file and everything
    /// this run wrote stay; a file listed by neither is reported.
    #[test]
    fn clean_up_removes_only_the_previous_runs_files() {
        let dir = tempfile::tempdir().expect("temp dir");
        let root = dir.path();
        let write = |rel: &str| {
            let p = root.join(rel);
            std::fs::create_dir_all(p.parent().expect("parent")).expect("dir");
            std::fs::write(&p, rel).expect("write");
        };
        for f in [
            "wells/a.csv",
            "wells/b.csv",
            "report/wells/b.html",
            "wells/notes.txt",
            "run-manifest.json",
        ] {
            write(f);
        }
        let previous: Vec<String> = ["wells/a.csv", "wells/b.csv", "report/wells/b.html"]
            .iter()
            .map(|s| s.to_string())
            .collect();
        let now = vec!["wells/a.csv".to_string()];
        let c = clean_up(root, Some(&previous), &now, &["run-manifest.json"], true);
        assert_eq!(c.removed, ["wells/b.csv", "report/wells/b.html"]);
        assert_eq!(c.foreign, ["wells/notes.txt"]);
        assert!(root.join("wells/a.csv").exists());
        assert!(root.join("wells/notes.txt").exists());
        assert!(!root.join("report").exists(), "emptied folders go");
        assert!(root.join("run-manifest.json").exists());
        let note = cleanup_note(&c).expect("a note");
        assert!(note.contains("wells/b.csv") && note.contains("wells/notes.txt"));
        // no previous listing: nothing removed
        let c = clean_up(root, None, &[], &[], false);
        assert!(c.removed.is_empty());
        assert!(root.join("wells/a.csv").exists());
    }

    /// Writes are recorded with the folder that holds them, not another's.
    #[test]
    fn writes_are_recorded_per_folder() {
        let a = tempfile::tempdir().expect("temp dir");
        let b = tempfile::tempdir().expect("temp dir");
        let ta = track(a.path());
        let tb = track(b.path());
        for (dir, name) in [(a.path(), "x/one.csv"), (b.path(), "two.csv")] {
            let p = dir.join(name);
            std::fs::create_dir_all(p.parent().expect("parent")).expect("dir");
            crate::output::write_atomic(&p, |w| {
                use std::io::Write as _;
                w.write_all(b"1")
                    .map_err(|source| crate::output::OutputError::Io {
                        path: p.clone(),
                        source,
                    })
            })
            .expect("written");
        }
        assert_eq!(ta.files(), ["x/one.csv"]);
        assert_eq!(tb.files(), ["two.csv"]);
        drop(ta);
        assert_eq!(tb.files(), ["two.csv"]);
    }
}
