//! The invented demo field: the committed files are exactly what the forward
//! model writes (so nobody edits them by hand), and the main job runs on them.

use std::path::Path;

use crate::common::{flowzone, root, run_demo_field};

fn files_under(dir: &Path) -> Vec<String> {
    let mut out = Vec::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        for e in std::fs::read_dir(&d).expect("folder") {
            let p = e.expect("entry").path();
            if p.is_dir() {
                stack.push(p);
            } else {
                out.push(
                    p.strip_prefix(dir)
                        .expect("under dir")
                        .display()
                        .to_string(),
                );
            }
        }
    }
    out.sort();
    out
}

#[test]
fn committed_demo_is_the_model_output_byte_for_byte() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = flowzone()
        .args(["demo", "--out"])
        .arg(dir.path())
        .output()
        .expect("runs");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let committed = root().join("demo-wells");
    let names = files_under(dir.path());
    assert_eq!(names, files_under(&committed));
    assert!(names.len() >= 20, "{names:?}");
    for name in names {
        let a = std::fs::read(dir.path().join(&name)).expect("generated");
        let b = std::fs::read(committed.join(&name)).expect("committed");
        assert!(
            a == b,
            "demo-wells/{name} differs from `flowzone demo` output: regenerate it with `flowzone demo --out demo-wells`"
        );
    }
}

/// The README's first command: every demo well runs, with the expected curves.
#[test]
fn main_job_runs_on_the_demo_field() {
    let out_dir = tempfile::tempdir().expect("temp dir");
    let summary = run_demo_field(out_dir.path());
    assert_eq!(summary["wells_total"], 8);
    assert_eq!(summary["wells_failed"], 0);
    for w in summary["wells"].as_array().expect("wells") {
        let curves: Vec<&str> = w["curves"]
            .as_array()
            .expect("curves")
            .iter()
            .map(|c| c[0].as_str().expect("key"))
            .collect();
        for needed in [
            "gamma-ray",
            "bulk-density",
            "neutron-porosity",
            "compressional-slowness",
            "deep-resistivity",
            "caliper",
        ] {
            assert!(
                curves.contains(&needed),
                "{}: {needed} not resolved ({curves:?})",
                w["file"]
            );
        }
    }
}
