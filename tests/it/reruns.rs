//! Reruns, names and refusals a user can trust: a rerun with `--overwrite`
//! leaves the folder as a fresh run would (single and sharded), a missing
//! input is refused with its key before anything is written, and output
//! file names keep the well file's spelling, collisions told apart.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use crate::common::{assert_same, demo_config_edited, files, flowzone, root, run_config};

fn copy_dir(from: &Path, to: &Path) {
    std::fs::create_dir_all(to).expect("dir");
    for e in std::fs::read_dir(from).expect("read dir") {
        let p = e.expect("entry").path();
        let dest = to.join(p.file_name().expect("name"));
        if p.is_dir() {
            copy_dir(&p, &dest);
        } else {
            std::fs::copy(&p, &dest).expect("copy");
        }
    }
}

/// The demo config over a copy of the demo wells in `dir/wells`.
fn demo_copy(dir: &Path) -> (PathBuf, PathBuf) {
    let wells = dir.join("wells");
    copy_dir(&root().join("demo-wells"), &wells);
    let demo = root().join("demo-wells").display().to_string();
    let cfg = demo_config_edited(dir, |t| t.replace(&demo, &wells.display().to_string()));
    (cfg, wells)
}

fn ok(run: &std::process::Output) -> String {
    let err = String::from_utf8_lossy(&run.stderr).into_owned();
    assert!(run.status.success(), "{err}");
    err
}

fn manifest_outputs(out: &Path) -> Vec<String> {
    let m: serde_json::Value =
        serde_json::from_slice(&std::fs::read(out.join("run-manifest.json")).expect("manifest"))
            .expect("json");
    m["outputs"]
        .as_array()
        .expect("outputs listed")
        .iter()
        .map(|v| v.as_str().expect("text").to_string())
        .collect()
}

/// Run the field, take a well out of the wells folder, rerun with
/// `--overwrite`: the folder is byte for byte what a fresh run of the
/// remaining wells writes into an empty folder (the manifest aside, whose
/// times differ), but for a user's own file, which stays and is named.
#[test]
fn rerun_after_removing_a_well_leaves_the_folder_as_a_fresh_run() {
    let dir = tempfile::tempdir().expect("temp dir");
    let (cfg, wells) = demo_copy(dir.path());
    let out = dir.path().join("out");
    ok(&run_config(&cfg, &out, &[]));
    assert!(out.join("field/curves/tarnby-8.parquet").is_file());
    std::fs::write(out.join("wells/my-notes.txt"), "mine").expect("user file");
    std::fs::rename(wells.join("tarnby-8.las"), dir.path().join("tarnby-8.las")).expect("move");
    let run = flowzone()
        .args(["run", "--overwrite", "--config"])
        .arg(&cfg)
        .arg("--out")
        .arg(&out)
        .output()
        .expect("runs");
    let err = ok(&run);
    assert!(
        err.contains("`wells/my-notes.txt`") && err.contains("did not write"),
        "{err}"
    );
    assert!(err.contains("`field/curves/tarnby-8.parquet`"), "{err}");
    let fresh = dir.path().join("fresh");
    ok(&run_config(&cfg, &fresh, &[]));
    let mut rerun = files(&out);
    assert_eq!(
        rerun.remove(Path::new("wells/my-notes.txt")).as_deref(),
        Some(&b"mine"[..])
    );
    let fresh_files = files(&fresh);
    assert_same(&fresh_files, &rerun, "rerun against fresh run");
    // the manifest lists exactly the run's files
    let listed: Vec<PathBuf> = manifest_outputs(&out).iter().map(PathBuf::from).collect();
    assert_eq!(listed, fresh_files.keys().cloned().collect::<Vec<_>>());
}

/// The same with shards into one shared folder and a merge: shards rerun
/// with `--overwrite` and the merge again give the fresh single run's files.
#[test]
fn sharded_rerun_after_removing_a_well_matches_a_fresh_run() {
    let dir = tempfile::tempdir().expect("temp dir");
    let (cfg, wells) = demo_copy(dir.path());
    let shared = dir.path().join("shared");
    let shards_and_merge = |extra: &[&str]| {
        for k in 1..=3 {
            let mut args = vec!["--shard".to_string(), format!("{k}/3")];
            args.extend(extra.iter().map(|s| s.to_string()));
            let args: Vec<&str> = args.iter().map(String::as_str).collect();
            ok(&run_config(&cfg, &shared, &args));
        }
        ok(&flowzone()
            .args(["merge", "--quiet"])
            .args(extra)
            .arg("--config")
            .arg(&cfg)
            .arg("--out")
            .arg(&shared)
            .output()
            .expect("merge runs"));
    };
    shards_and_merge(&[]);
    assert!(shared.join("wells/tarnby-8.csv").is_file());
    std::fs::rename(wells.join("tarnby-8.las"), dir.path().join("tarnby-8.las")).expect("move");
    shards_and_merge(&["--overwrite"]);
    let fresh = dir.path().join("fresh");
    ok(&run_config(&cfg, &fresh, &[]));
    let got: BTreeMap<PathBuf, Vec<u8>> = files(&shared)
        .into_iter()
        .filter(|(k, _)| !k.starts_with("shards"))
        .collect();
    assert_same(&files(&fresh), &got, "sharded rerun against fresh run");
}

/// A config naming an input that is not there is refused with the key and
/// the path as written and as resolved, and no output folder is made.
#[test]
fn a_missing_input_is_refused_before_anything_is_written() {
    let dir = tempfile::tempdir().expect("temp dir");
    let cfg = demo_config_edited(dir.path(), |t| {
        t.replace("core.csv\"", "no-such-core.csv\"")
    });
    let out = dir.path().join("out");
    let run = run_config(&cfg, &out, &[]);
    assert_eq!(run.status.code(), Some(2));
    let err = String::from_utf8_lossy(&run.stderr);
    assert!(err.contains("key `core.file`"), "{err}");
    assert!(err.contains("no-such-core.csv` does not exist"), "{err}");
    assert!(!out.exists(), "nothing written");
    // a wells folder that is not there, the output beside the config: the
    // fault named, not a folder the user did not name
    std::fs::write(
        dir.path().join("p.toml"),
        "[project]\nname = \"t\"\n[input]\nwells = [\"missing-wells\"]\n",
    )
    .expect("config");
    let out = dir.path().join("badout");
    let run = run_config(&dir.path().join("p.toml"), &out, &[]);
    assert_eq!(run.status.code(), Some(2));
    let err = String::from_utf8_lossy(&run.stderr);
    assert!(
        err.contains("key `input.wells`: `missing-wells` does not exist"),
        "{err}"
    );
    assert!(
        err.contains(&dir.path().join("missing-wells").display().to_string()),
        "{err}"
    );
    assert!(!err.contains("inside"), "{err}");
    assert!(!out.exists(), "nothing written");
}

/// Output files keep the well file's stem as written (case, spaces); two
/// stems equal but for case (which a case-insensitive file system would
/// merge) are told apart: the first in sorted order keeps its name, the
/// next gets `-2`, and its report says why. Report links are encoded.
#[test]
fn output_names_keep_the_spelling_and_collisions_are_told_apart() {
    let dir = tempfile::tempdir().expect("temp dir");
    let (a, b) = (dir.path().join("a"), dir.path().join("b"));
    std::fs::create_dir_all(&a).expect("dir");
    std::fs::create_dir_all(&b).expect("dir");
    let demo = root().join("demo-wells");
    std::fs::copy(demo.join("tarnby-1.las"), a.join("TB-01.las")).expect("copy");
    std::fs::copy(demo.join("tarnby-3.las"), a.join("Tarnby 3.las")).expect("copy");
    std::fs::copy(demo.join("tarnby-2.las"), b.join("tb-01.las")).expect("copy");
    let cfg = dir.path().join("p.toml");
    std::fs::write(
        &cfg,
        "[project]\nname = \"t\"\n[input]\nwells = [\"a\", \"b\"]\n[parameters.field]\nrw-ohmm = 0.045\nrho-shale-gcc = 2.55\n",
    )
    .expect("config");
    let out = dir.path().join("out");
    ok(&run_config(&cfg, &out, &[]));
    for f in [
        "wells/TB-01.csv",
        "wells/TB-01.las",
        "wells/Tarnby 3.csv",
        "field/curves/Tarnby 3.parquet",
        "report/wells/Tarnby 3.html",
        "wells/tb-01-2.csv",
        "field/curves/tb-01-2.parquet",
    ] {
        assert!(out.join(f).is_file(), "{f}");
    }
    // the second file's stem is the first's but for case: it was told apart
    // by its content (Tarnby-2's WELL), not merged over
    let las = std::fs::read_to_string(out.join("wells/tb-01-2.las")).expect("las");
    assert!(las.contains("Tarnby-2"));
    let summary: serde_json::Value =
        serde_json::from_slice(&std::fs::read(out.join("run-summary.json")).expect("summary"))
            .expect("json");
    let w = summary["wells"]
        .as_array()
        .expect("wells")
        .iter()
        .find(|w| w["file"].as_str().is_some_and(|f| f.ends_with("tb-01.las")))
        .expect("b/tb-01.las");
    let warnings = w["warnings"].to_string();
    assert!(
        warnings.contains("tb-01-2") && warnings.contains("TB-01.las"),
        "{warnings}"
    );
    let page = std::fs::read_to_string(out.join("report/index.html")).expect("page");
    assert!(page.contains("href=\"wells/Tarnby%203.html\""));
}
