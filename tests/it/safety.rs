//! Data safety: inputs are never written, a previous run is not overwritten
//! unless asked, inputs inside the output folder are refused, and a run
//! killed with SIGKILL leaves every finished well's files whole and a
//! journal saying which wells finished.

use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use crate::common::{bench_field, files, flowzone, root, run_config};

#[test]
fn reruns_need_overwrite_and_inputs_are_never_written() {
    let dir = tempfile::tempdir().expect("temp dir");
    let cfg = root().join("config/demo-field.toml");
    let inputs_before = files(&root().join("demo-wells"));
    let out = dir.path().join("out");
    let first = run_config(&cfg, &out, &[]);
    assert!(
        first.status.success(),
        "{}",
        String::from_utf8_lossy(&first.stderr)
    );
    let again = run_config(&cfg, &out, &[]);
    assert_eq!(again.status.code(), Some(2));
    let err = String::from_utf8_lossy(&again.stderr);
    assert!(
        err.contains("holds a previous run") && err.contains("--overwrite"),
        "{err}"
    );
    let over = run_config(&cfg, &out, &["--overwrite"]);
    assert!(
        over.status.success(),
        "{}",
        String::from_utf8_lossy(&over.stderr)
    );
    assert!(
        !out.join("run-progress.jsonl").exists(),
        "a finished run removes its journal"
    );
    assert_eq!(
        files(&root().join("demo-wells")),
        inputs_before,
        "inputs unchanged"
    );

    // a well file inside the output folder is refused before anything is written
    let inside = dir.path().join("inside");
    std::fs::create_dir_all(inside.join("in")).expect("dir");
    std::fs::copy(
        root().join("demo-wells/tarnby-1.las"),
        inside.join("in/a.las"),
    )
    .expect("copy");
    let cfg2 = dir.path().join("p.toml");
    std::fs::write(
        &cfg2,
        format!(
            "[project]\nname = \"t\"\n[input]\nwells = [\"{}\"]\n[parameters.field]\nrw-ohmm = 0.045\nrho-shale-gcc = 2.55\n",
            inside.join("in/a.las").display()
        ),
    )
    .expect("config");
    let run = run_config(&cfg2, &inside, &[]);
    assert_eq!(run.status.code(), Some(2));
    let err = String::from_utf8_lossy(&run.stderr);
    assert!(err.contains("is inside the output folder"), "{err}");
    assert!(!inside.join("wells").exists());
}

/// SIGKILL part-way through a one-thread run of a synthetic field: every
/// well file present is byte-identical to a complete run's, the journal
/// lists every well and the finished ones, and a second run (no
/// --overwrite needed: the first never finished) cleans up and completes.
#[test]
fn a_killed_run_leaves_whole_files_and_a_journal() {
    let dir = tempfile::tempdir().expect("temp dir");
    let wells = dir.path().join("field");
    bench_field(&wells, 60, 8000);
    // LAS and the report too, so each well takes a while to write
    let cfg = wells.join("field.toml");
    let text = std::fs::read_to_string(&cfg).expect("config");
    let edited = text
        .replace("formats = [\"csv\"]", "formats = [\"las\", \"csv\"]")
        .replace("report = false", "report = true");
    assert_eq!(
        edited.matches("formats = [\"las\", \"csv\"]").count()
            + edited.matches("report = true").count(),
        2,
        "the bench field.toml no longer has the lines this test edits"
    );
    std::fs::write(&cfg, edited).expect("config");

    let reference = dir.path().join("reference");
    let run = run_config(&cfg, &reference, &["--threads", "1"]);
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    let complete = files(&reference);

    let killed = dir.path().join("killed");
    let journal = killed.join("run-progress.jsonl");
    let mut child = flowzone()
        .args(["run", "--quiet", "--threads", "1", "--config"])
        .arg(&cfg)
        .arg("--out")
        .arg(&killed)
        .spawn()
        .expect("starts");
    let t0 = Instant::now();
    let finished_lines = |p: &Path| {
        std::fs::read_to_string(p).map_or(0, |t| {
            t.lines().filter(|l| l.contains("\"finished\"")).count()
        })
    };
    while finished_lines(&journal) < 5 {
        assert!(
            t0.elapsed() < Duration::from_secs(120),
            "run too slow to reach 5 wells"
        );
        assert!(
            child.try_wait().expect("status").is_none(),
            "run ended before the kill"
        );
        std::thread::sleep(Duration::from_millis(2));
    }
    child.kill().expect("SIGKILL"); // Child::kill sends SIGKILL on Unix
    child.wait().expect("reaped");

    assert!(!killed.join("run-summary.json").exists());
    let text = std::fs::read_to_string(&journal).expect("journal left");
    let mut lines = text.lines();
    let head: serde_json::Value = serde_json::from_str(lines.next().expect("head")).expect("json");
    assert_eq!(head["wells"].as_array().expect("wells").len(), 60);
    let finished: Vec<serde_json::Value> = lines
        .map(|l| serde_json::from_str(l).expect("every journal line is whole JSON"))
        .collect();
    assert!(
        finished.len() >= 5 && finished.len() < 60,
        "{} finished",
        finished.len()
    );
    // every file of a finished well is there and whole
    for f in &finished {
        assert_eq!(f["ok"], true);
        for o in f["outputs"].as_array().expect("outputs") {
            let rel = PathBuf::from(o.as_str().expect("path"));
            let got = std::fs::read(killed.join(&rel)).expect("finished well's file");
            assert!(
                got == complete[&rel],
                "{} differs from the complete run",
                rel.display()
            );
        }
    }
    // and any other file under a final name is whole too (renamed only when complete)
    for (rel, bytes) in files(&killed) {
        if rel.starts_with("wells")
            || rel.starts_with("field/curves")
            || rel.starts_with("report/wells")
        {
            assert!(bytes == complete[&rel], "{} is not whole", rel.display());
        }
    }

    let rerun = run_config(&cfg, &killed, &["--threads", "1"]);
    assert!(
        rerun.status.success(),
        "{}",
        String::from_utf8_lossy(&rerun.stderr)
    );
    // the rerun says how far the killed run got
    let said = String::from_utf8_lossy(&rerun.stderr);
    assert!(
        said.contains(&format!(
            "stopped after {} of 60 wells had finished; not finished: ",
            finished.len()
        )),
        "{said}"
    );
    assert!(!journal.exists());
    let after = files(&killed);
    assert_eq!(
        after.keys().collect::<Vec<_>>(),
        complete.keys().collect::<Vec<_>>()
    );
    for (k, v) in &complete {
        assert!(after[k] == *v, "{} differs after the rerun", k.display());
    }
    // no temporary file is left anywhere
    let mut stack = vec![killed.clone()];
    while let Some(d) = stack.pop() {
        for e in std::fs::read_dir(&d).expect("dir") {
            let p = e.expect("entry").path();
            if p.is_dir() {
                stack.push(p);
            } else {
                let n = p.file_name().expect("name").to_string_lossy().into_owned();
                assert!(!n.contains(".partial-"), "left over: {}", p.display());
            }
        }
    }
}
