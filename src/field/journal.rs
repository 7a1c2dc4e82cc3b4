//! The journal of a run in progress (`run-progress.jsonl`): which wells a
//! run set out to process and which finished, so that a killed run says how
//! far it got.

use std::path::Path;

use crate::error::Error;
use crate::pipeline::WellReport;

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
pub(crate) struct Journal(std::sync::Mutex<std::fs::File>);

impl Journal {
    pub(crate) fn create(path: &Path, files: &[&Path]) -> Result<Journal, Error> {
        let io = |source| Error::Io {
            path: path.to_path_buf(),
            source,
        };
        let mut f = std::fs::File::create(path).map_err(io)?;
        let head = serde_json::json!({
            "flowzone": env!("CARGO_PKG_VERSION"),
            "started_utc": crate::output::manifest::utc(std::time::SystemTime::now()),
            "wells": files.iter().map(|p| p.display().to_string()).collect::<Vec<_>>(),
        });
        std::io::Write::write_all(&mut f, format!("{head}\n").as_bytes()).map_err(io)?;
        Ok(Journal(std::sync::Mutex::new(f)))
    }

    pub(crate) fn finished(&self, r: &WellReport) {
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
