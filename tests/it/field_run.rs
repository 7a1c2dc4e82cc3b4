//! The field run as a batch engine: byte-identical outputs whatever the
//! thread count, the field table in Parquet, and the run manifest.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use polars::prelude::{DataType, ParquetReader, SerReader};

use crate::common::{bench_field, col, files, read_table, root, run_config, run_demo_field};

/// `dir`'s files (shard states aside) are `expected`'s, byte for byte.
#[track_caller]
fn assert_same_files(expected: &BTreeMap<PathBuf, Vec<u8>>, dir: &Path, what: &str) {
    let got: BTreeMap<PathBuf, Vec<u8>> = files(dir)
        .into_iter()
        .filter(|(k, _)| !k.starts_with("shards"))
        .collect();
    crate::common::assert_same(expected, &got, what);
}

/// The demo run with 1 thread and with 4 threads, into the same folder one
/// after the other (paths in the summary name the folder): every output is
/// the same byte for byte.
#[test]
fn outputs_do_not_depend_on_the_thread_count() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    let cfg = root().join("config/demo-field.toml");
    let mut runs = Vec::new();
    for threads in ["1", "4"] {
        let run = run_config(&cfg, &out, &["--threads", threads]);
        assert!(
            run.status.success(),
            "{}",
            String::from_utf8_lossy(&run.stderr)
        );
        runs.push(files(&out));
        std::fs::remove_dir_all(&out).expect("clean");
    }
    assert!(runs[0].len() > 30, "{} files", runs[0].len());
    assert_eq!(
        runs[0].keys().collect::<Vec<_>>(),
        runs[1].keys().collect::<Vec<_>>()
    );
    for (k, v) in &runs[0] {
        assert!(
            runs[1][k] == *v,
            "{} differs between 1 and 4 threads",
            k.display()
        );
    }
}

#[track_caller]
fn ok(run: &std::process::Output) {
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
}

/// `merge --quiet --config CFG --out OUT [DIRS...]`.
fn merge(cfg: &Path, out: &Path, dirs: &[PathBuf]) -> std::process::Output {
    crate::common::flowzone()
        .args(["merge", "--quiet", "--config"])
        .arg(cfg)
        .arg("--out")
        .arg(out)
        .args(dirs)
        .output()
        .expect("runs")
}

/// Sharding: the demo field in 3 shards (each its own folder, as on three
/// machines) + merge gives the single run's files byte for byte, and so do 3
/// shards into one shared folder; every well is in exactly one shard; a
/// missing shard or a changed config is refused by name.
#[test]
fn three_shards_and_merge_equal_one_run() {
    let dir = tempfile::tempdir().expect("temp dir");
    let cfg = root().join("config/demo-field.toml");
    let one = dir.path().join("one");
    ok(&run_config(&cfg, &one, &[]));
    let single = files(&one);

    let shard_dirs: Vec<PathBuf> = (1..=3).map(|k| dir.path().join(format!("s{k}"))).collect();
    let mut wells_seen = Vec::new();
    for (k, d) in shard_dirs.iter().enumerate() {
        ok(&run_config(&cfg, d, &["--shard", &format!("{}/3", k + 1)]));
        assert!(
            d.join(format!("shards/shard-{}-of-3.state", k + 1))
                .is_file()
        );
        assert!(
            !d.join("run-summary.json").exists(),
            "a shard writes no field-level outputs"
        );
        for e in std::fs::read_dir(d.join("wells")).expect("wells") {
            wells_seen.push(e.expect("entry").file_name());
        }
    }
    let n_wells = std::fs::read_dir(one.join("wells")).expect("wells").count();
    wells_seen.sort();
    let before = wells_seen.len();
    wells_seen.dedup();
    assert_eq!(
        (before, wells_seen.len()),
        (n_wells, n_wells),
        "each well in one shard"
    );
    for d in &shard_dirs {
        let k = std::fs::read_dir(d.join("wells")).expect("wells").count();
        assert!(
            k > 0 && k < n_wells,
            "{} holds {k} of {n_wells} well files",
            d.display()
        );
    }

    let merged = dir.path().join("merged");
    ok(&merge(&cfg, &merged, &shard_dirs));
    assert_same_files(&single, &merged, "3 shards + merge");
    let manifest: serde_json::Value =
        serde_json::from_slice(&std::fs::read(merged.join("run-manifest.json")).expect("manifest"))
            .expect("json");
    let shards = manifest["shards"].as_array().expect("shards listed");
    assert_eq!(shards.len(), 3);
    assert_eq!(
        shards
            .iter()
            .map(|s| s["wells"].as_u64().expect("wells"))
            .sum::<u64>(),
        manifest["wells_total"].as_u64().expect("total")
    );

    // one shared folder: the shards' states stay beside the outputs
    let shared = dir.path().join("shared");
    for k in 1..=3 {
        ok(&run_config(&cfg, &shared, &["--shard", &format!("{k}/3")]));
    }
    ok(&merge(&cfg, &shared, &[]));
    assert_same_files(&single, &shared, "shared folder");

    // refusals: a missing shard, a config changed after the shards ran
    let run = merge(&cfg, &dir.path().join("m2"), &shard_dirs[..2]);
    assert!(!run.status.success());
    let err = String::from_utf8_lossy(&run.stderr);
    assert!(err.contains("3/3 missing"), "{err}");
    let edited = crate::common::demo_config_edited(dir.path(), |t| {
        t.replace("decimals = 4", "decimals = 5")
    });
    let run = merge(&edited, &dir.path().join("m3"), &shard_dirs);
    assert!(!run.status.success());
    let err = String::from_utf8_lossy(&run.stderr);
    assert!(err.contains("another config"), "{err}");
}

/// The Slurm example (deploy/slurm) run here without Slurm: the scripts are
/// plain bash with `#SBATCH` comments, so setting the array variables Slurm
/// sets runs them as the cluster would. Train once, 3 shard tasks that load
/// the model (none trains), merge: the same files as a single run with that
/// config.
#[test]
fn slurm_example_scripts_run_the_field() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("shared");
    let model = out.join("model-run/model/class-model.fzm");
    let cfg = crate::common::demo_config_edited(dir.path(), |t| {
        t.replace(
            "[predictor]\n",
            &format!("[predictor]\nmodel = \"{}\"\n", model.display()),
        )
    });
    let script = |name: &str, env: &[(&str, String)]| {
        let run = std::process::Command::new("bash")
            .arg(root().join("deploy/slurm").join(name))
            .env("FLOWZONE", env!("CARGO_BIN_EXE_flowzone"))
            .env("CONFIG", &cfg)
            .env("OUT", &out)
            .envs(env.iter().map(|(k, v)| (*k, v.as_str())))
            .output()
            .expect("bash runs");
        ok(&run);
        String::from_utf8_lossy(&run.stderr).into_owned()
    };
    script("train.sbatch", &[]);
    assert!(model.is_file());
    for k in 1..=3 {
        let err = script(
            "shard.sbatch",
            &[
                ("SLURM_ARRAY_TASK_ID", k.to_string()),
                ("SLURM_ARRAY_TASK_COUNT", "3".into()),
                ("SLURM_CPUS_PER_TASK", "1".into()),
            ],
        );
        assert!(!err.contains("trained the class model"), "{err}");
    }
    script("merge.sbatch", &[]);
    let merged = out.join("field-run");
    let summary: serde_json::Value =
        serde_json::from_slice(&std::fs::read(merged.join("run-summary.json")).expect("summary"))
            .expect("json");
    assert_eq!(summary["wells_total"], 8);
    assert_eq!(summary["wells_failed"], 0);
    assert_eq!(summary["classes"]["trained"], false);

    let one = dir.path().join("one");
    ok(&run_config(&cfg, &one, &[]));
    let single = files(&one);
    assert_same_files(&single, &merged, "Slurm example");
}

/// The field table: one Parquet file per well with one schema (WELL, then
/// the computed curves), its rows those of the well's CSV; the manifest
/// hashes every input (checked against coreutils `sha256sum`).
#[test]
fn field_table_and_manifest() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    run_demo_field(&out);
    let mut schema = None;
    for i in 1..=8 {
        let f = std::fs::File::open(out.join(format!("field/curves/tarnby-{i}.parquet")))
            .expect("part");
        let df = ParquetReader::new(f).finish().expect("parquet");
        let names: Vec<String> = df
            .get_column_names()
            .iter()
            .map(|s| s.to_string())
            .collect();
        assert_eq!(names[0], "WELL");
        assert!(names.iter().any(|n| n == "CONTACT") && names.iter().any(|n| n == "SWH"));
        let types: Vec<DataType> = df.dtypes();
        match &schema {
            None => schema = Some((names.clone(), types.clone())),
            Some(s) => assert_eq!(*s, (names.clone(), types.clone()), "tarnby-{i}"),
        }
        let well = df
            .column("WELL")
            .expect("WELL")
            .str()
            .expect("text")
            .get(0)
            .map(String::from);
        assert_eq!(well.as_deref(), Some(format!("Tarnby-{i}").as_str()));
        let (h, rows) = read_table(&out.join(format!("wells/tarnby-{i}.csv")));
        assert_eq!(df.height(), rows.len());
        let sw = df.column("SW").expect("SW").f64().expect("f64");
        let c = col(&h, "SW");
        for (k, r) in rows.iter().enumerate().step_by(97) {
            match (sw.get(k), r[c].parse::<f64>().ok()) {
                (Some(a), Some(b)) => assert!((a - b).abs() <= 5e-5, "row {k}: {a} vs {b}"),
                (None, None) => {}
                (a, b) => panic!("tarnby-{i} row {k}: {a:?} vs {b:?}"),
            }
        }
    }
    let m: serde_json::Value =
        serde_json::from_slice(&std::fs::read(out.join("run-manifest.json")).expect("manifest"))
            .expect("json");
    let inputs = m["inputs"].as_array().expect("inputs");
    let wells: Vec<&serde_json::Value> = inputs.iter().filter(|i| i["role"] == "well").collect();
    assert_eq!(wells.len(), 8);
    for role in ["tops", "survey", "core", "capillary", "pressures"] {
        assert!(inputs.iter().any(|i| i["role"] == role), "no {role}");
    }
    let file = root().join("demo-wells/tarnby-3.las");
    let sum = std::process::Command::new("sha256sum")
        .arg(&file)
        .output()
        .expect("sha256sum runs");
    let expected = String::from_utf8_lossy(&sum.stdout)
        .split_whitespace()
        .next()
        .unwrap_or("")
        .to_string();
    let ours = wells
        .iter()
        .find(|w| {
            w["path"]
                .as_str()
                .is_some_and(|p| p.ends_with("tarnby-3.las"))
        })
        .expect("tarnby-3");
    assert_eq!(ours["sha256"], expected.as_str());
    assert!(
        m["config_text"]
            .as_str()
            .is_some_and(|t| t.contains("Tarnby Ridge"))
    );
    assert!(m["started_utc"].as_str().is_some_and(|t| t.ends_with('Z')));
}

/// The zone summary on the demo: GROSS is the distance between consecutive
/// tops of zones.csv (within one 0.1524 m sample), and net pay and HPT come
/// close to those of the forward model's own curves (truth VSH, PHIE, SW,
/// CLASS) under the same default cutoffs, summed here independently with
/// 0.1524 m per sample: HPT within 10 % and net pay within 15 % per
/// Upper/Lower Kell zone (SW and PHIE errors of 0.02-0.04 and 0.01 move
/// samples across the SW 0.6 and PHIE 0.06 cutoffs).
#[test]
fn zone_summary_against_tops_and_truth() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    run_demo_field(&out);
    let (h, rows) = read_table(&out.join("field/zone-summary.csv"));
    let (w, z, g, np, hpt) = (
        col(&h, "WELL"),
        col(&h, "ZONE"),
        col(&h, "GROSS"),
        col(&h, "NET_PAY"),
        col(&h, "HPT"),
    );
    let (th, tops) = read_table(&root().join("demo-wells/zones.csv"));
    let (tw, tz, tt) = (col(&th, "WELL"), col(&th, "ZONE"), col(&th, "TOP_MD"));
    let unit = th.iter().position(|c| c == "DEPTH_UNIT");
    let to_m = |r: &Vec<String>| -> f64 {
        let v: f64 = r[tt].parse().expect("top");
        match unit.map(|u| r[u].as_str()) {
            Some("ft") | Some("FT") => v * 0.3048,
            _ => v,
        }
    };
    let mut checked = 0;
    for r in &rows {
        let well_tops: Vec<&Vec<String>> = tops.iter().filter(|t| t[tw] == r[w]).collect();
        let Some(k) = well_tops.iter().position(|t| t[tz] == r[z]) else {
            continue;
        };
        let Some(next) = well_tops.get(k + 1) else {
            continue;
        };
        let gross: f64 = r[g].parse().expect("gross");
        assert!(
            ((to_m(next) - to_m(well_tops[k])) - gross).abs() <= 0.1524,
            "{} {}: gross {gross}",
            r[w],
            r[z]
        );
        checked += 1;
        // truth: the model's curves with the default cutoffs
        let well = r[w].to_lowercase();
        let (eh, truth) = read_table(&root().join(format!("demo-wells/truth/{well}.csv")));
        let (d, v, p, s) = (
            col(&eh, "DEPTH"),
            col(&eh, "VSH"),
            col(&eh, "PHIE"),
            col(&eh, "SW"),
        );
        let to_m_well = if well == "tarnby-4" { 0.3048 } else { 1.0 };
        let (top, base) = (to_m(well_tops[k]), to_m(next));
        let (mut net, mut h_pt) = (0.0, 0.0);
        for t in &truth {
            let md = t[d].parse::<f64>().expect("md") * to_m_well;
            let (vsh, phie, sw) = (
                t[v].parse::<f64>().unwrap_or(f64::NAN),
                t[p].parse::<f64>().unwrap_or(f64::NAN),
                t[s].parse::<f64>().unwrap_or(f64::NAN),
            );
            if md >= top && md < base && vsh <= 0.5 && phie >= 0.06 && sw <= 0.6 {
                net += 0.1524;
                h_pt += 0.1524 * phie * (1.0 - sw);
            }
        }
        if r[z].contains("Kell") && h_pt > 0.5 {
            let (ours_np, ours_hpt): (f64, f64) =
                (r[np].parse().expect("np"), r[hpt].parse().expect("hpt"));
            eprintln!(
                "{} {}: net pay {ours_np:.2} (truth {net:.2}), HPT {ours_hpt:.3} (truth {h_pt:.3})",
                r[w], r[z]
            );
            assert!(
                (ours_hpt / h_pt - 1.0).abs() <= 0.10,
                "{} {} HPT",
                r[w],
                r[z]
            );
            assert!(
                (ours_np / net - 1.0).abs() <= 0.15,
                "{} {} net pay",
                r[w],
                r[z]
            );
        }
    }
    assert!(checked >= 16, "{checked} zones checked");
}

/// The bench field's whole pipeline (`demo --wells`, then field-full.toml:
/// classes from core, saturation-height, contacts): every well succeeds, the
/// outputs are the same bytes on 1 and 2 threads, and the manifest's timings
/// name every stage of the chain (what `benches/field.sh` reads).
#[test]
fn bench_field_full_pipeline_is_the_same_on_any_thread_count() {
    let dir = tempfile::tempdir().expect("temp dir");
    let wells = dir.path().join("wells");
    bench_field(&wells, 24, 2500);
    for table in [
        "core.csv",
        "capillary.csv",
        "pressures.csv",
        "field-full.toml",
    ] {
        assert!(wells.join(table).is_file(), "no {table}");
    }
    let cfg = wells.join("field-full.toml");
    let (one, two) = (dir.path().join("t1"), dir.path().join("t2"));
    let run = run_config(&cfg, &one, &["--threads", "1", "--timings"]);
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    assert!(String::from_utf8_lossy(&run.stderr).contains("timings (s):"));
    let run = run_config(&cfg, &two, &["--threads", "2"]);
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    let summary: serde_json::Value =
        serde_json::from_slice(&std::fs::read(one.join("run-summary.json")).expect("summary"))
            .expect("json");
    assert_eq!(summary["wells_failed"], 0);
    assert!(summary["classes"].is_object() && summary["saturation_height"].is_object());
    assert!(one.join("contacts.csv").is_file());
    assert_same_files(&files(&one), &two, "2 threads against 1");
    let manifest: serde_json::Value =
        serde_json::from_slice(&std::fs::read(one.join("run-manifest.json")).expect("manifest"))
            .expect("json");
    let t = &manifest["timings"];
    let steps = |key: &str| -> Vec<(String, f64)> {
        t[key]
            .as_array()
            .expect("steps")
            .iter()
            .map(|s| {
                (
                    s["step"].as_str().unwrap_or("").to_string(),
                    s["seconds"].as_f64().unwrap_or(-1.0),
                )
            })
            .collect()
    };
    let stages = steps("well_stages");
    let names: Vec<&str> = stages.iter().map(|s| s.0.as_str()).collect();
    for stage in [
        "read",
        "logs",
        "classes",
        "saturation-height",
        "contacts",
        "well files",
        "field table",
    ] {
        assert!(names.contains(&stage), "no stage {stage} in {names:?}");
    }
    assert!(stages.iter().all(|s| s.1 >= 0.0));
    let worked = |name: &str| stages.iter().any(|s| s.0 == name && s.1 > 0.0);
    assert!(worked("read") && worked("classes") && worked("contacts"));
    assert!(
        steps("setup")
            .iter()
            .any(|s| s.0.starts_with("class model"))
    );
    assert!(t["wells_wall_seconds"].as_f64().is_some_and(|s| s > 0.0));
}
