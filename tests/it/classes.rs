//! The class stage on the demo field: the trained predictor against two
//! baselines (leave-one-well-out), predicted classes and permeability against
//! the forward model's truth, the model file's envelope, wells lacking a
//! feature curve, the scheme comparison and the core command.
//!
//! The demo field is invented (demo-wells/README.md); its truth is the
//! synthetic model's own, so these checks measure how well the stage recovers
//! a known answer, not published values.

use std::path::{Path, PathBuf};

use flowzone::classes::predictor::model_file::{ClassModel, ModelFileError, SMARTCORE_VERSION};

use crate::common::{col, flowzone, read_table, root, run_config, run_demo_field};

/// The demo config with its paths made absolute, and `extra` TOML lines
/// spliced in after `[predictor]`; `wells` replaces the input list.
fn demo_config(dir: &Path, wells: &[PathBuf], predictor_extra: &str) -> PathBuf {
    let demo = root().join("demo-wells");
    let text = std::fs::read_to_string(root().join("config/demo-field.toml")).expect("config");
    let list: Vec<String> = wells
        .iter()
        .map(|w| format!("{:?}", w.display().to_string()))
        .collect();
    let text = text
        .replace(
            "wells = [\"../demo-wells\"]",
            &format!("wells = [{}]", list.join(", ")),
        )
        .replace("\"../demo-wells", &format!("\"{}", demo.display()))
        .replace(
            "[predictor]\n",
            &format!("[predictor]\n{predictor_extra}\n"),
        );
    let p = dir.join("field.toml");
    std::fs::write(&p, text).expect("write config");
    p
}

/// Source: our invented demo field, scored leave-one-well-out over its three
/// cored wells. The forest must beat both baselines on exact class (the
/// issue's rule); measured 2026-12-02: forest 0.780, nearest centroid 0.624,
/// porosity bins 0.648 (287 samples), within one class 1.000 / 0.847 / 0.993.
#[test]
fn demo_predictor_beats_the_baselines() {
    let out = tempfile::tempdir().expect("temp dir");
    let summary = run_demo_field(out.path());
    assert_eq!(summary["classes"]["trained"], true);
    let report: serde_json::Value = serde_json::from_slice(
        &std::fs::read(out.path().join("model/training-report.json")).expect("report"),
    )
    .expect("json");
    let v = &report["validation"];
    let get = |m: &str, k: &str| v[m][k].as_f64().unwrap_or_else(|| panic!("{m}.{k}"));
    let forest = get("forest", "exact");
    let centroid = get("nearest_centroid", "exact");
    let bins = get("porosity_bins", "exact");
    eprintln!(
        "LOWO exact: forest {forest:.3}, nearest centroid {centroid:.3}, porosity bins {bins:.3}; within one: forest {:.3}",
        get("forest", "within_one")
    );
    assert!(forest > centroid && forest > bins, "{v}");
    assert!(forest >= 0.70, "forest exact {forest}");
    assert!(get("forest", "within_one") >= 0.95);
    assert_eq!(
        report["training_wells"],
        serde_json::json!(["Tarnby-2", "Tarnby-3", "Tarnby-5"])
    );
    // the confusion matrix adds up to the held-out samples
    let total: u64 = v["forest"]["confusion"]
        .as_array()
        .expect("rows")
        .iter()
        .flat_map(|r| {
            r.as_array()
                .expect("row")
                .iter()
                .map(|n| n.as_u64().expect("n"))
        })
        .sum();
    assert_eq!(total, v["forest"]["samples"].as_u64().expect("samples"));
    let text = std::fs::read_to_string(out.path().join("model/training-report.txt")).expect("text");
    assert!(text.contains("baseline: nearest centroid"), "{text}");
    assert!(text.contains("qualified petrophysicist"), "{text}");

    // the ablation: point features first, then depth context and the bed
    // sequence, exactly one row used; the used evidence is what each well lists
    let ab = report["ablation"].as_array().expect("ablation");
    let names: Vec<&str> = ab
        .iter()
        .map(|r| r["evidence"].as_str().expect("name"))
        .collect();
    assert_eq!(names[0], "point features", "{names:?}");
    assert!(names.contains(&"+ depth context") && names.contains(&"+ bed sequence (logs)"));
    assert_eq!(
        ab.iter().filter(|r| r["chosen"] == true).count(),
        1,
        "{ab:?}"
    );
    for r in ab {
        let e = r["exact"].as_f64().expect("exact");
        assert!((0.0..=1.0).contains(&e) && r["within_one"].as_f64().expect("w") >= e);
    }
    assert!(text.contains("what each piece of evidence adds"), "{text}");
    let uses_sequence = report["sequence"].is_object();
    let chosen = ab.iter().find(|r| r["chosen"] == true).expect("chosen");
    assert_eq!(uses_sequence, chosen["evidence"] == "+ bed sequence (logs)");
    for w in summary["wells"].as_array().expect("wells") {
        let ev: Vec<&str> = w["classes"]["evidence"]
            .as_array()
            .expect("evidence")
            .iter()
            .map(|e| e.as_str().expect("text"))
            .collect();
        assert!(ev[0].starts_with("log features"), "{ev:?}");
        assert_eq!(
            ev.iter().any(|e| e.starts_with("bed sequence")),
            uses_sequence
        );
    }
    let page = std::fs::read_to_string(out.path().join("report/index.html")).expect("page");
    assert!(page.contains("<h2>Class evidence</h2>"));
}

/// Predicted CLASS against the model's truth class at every classified depth
/// of every well (truth class 1-4 in reservoir beds). Measured 2026-12-02:
/// 93.1 % of 4 686 depths; every depth within one
/// class. PERM against the truth PERM_MD: RMS of log10 ratio 0.247.
#[test]
fn demo_classes_and_permeability_recover_the_truth() {
    let out = tempfile::tempdir().expect("temp dir");
    run_demo_field(out.path());
    let (mut n, mut exact, mut near, mut shale_classed) = (0usize, 0usize, 0usize, 0usize);
    let mut perm_sq = Vec::new();
    for i in 1..=8 {
        let (h, rows) = read_table(&out.path().join(format!("wells/tarnby-{i}.csv")));
        let (th, truth) = read_table(&root().join(format!("demo-wells/truth/tarnby-{i}.csv")));
        // truth depths are in the well's own unit: Tarnby-4 is logged in feet
        let to_m = if i == 4 { 0.3048 } else { 1.0 };
        let (cd, cc, cp, cprob, cflag) = (
            col(&h, "DEPTH"),
            col(&h, "CLASS"),
            col(&h, "PERM"),
            col(&h, "CLASS_PROB"),
            col(&h, "FLAG"),
        );
        let (td, tc, tk) = (col(&th, "DEPTH"), col(&th, "CLASS"), col(&th, "PERM_MD"));
        assert_eq!(
            rows.len(),
            truth.len(),
            "well {i}: same samples as the truth"
        );
        for (r, t) in rows.iter().zip(&truth) {
            let d: f64 = r[cd].parse().expect("depth");
            let tdepth: f64 = t[td].parse::<f64>().expect("truth depth") * to_m;
            assert!((d - tdepth).abs() < 1e-3, "well {i}: depth {d} vs {tdepth}");
            if r[cc].is_empty() {
                assert!(r[cp].is_empty() && r[cprob].is_empty());
                continue;
            }
            let c: i64 = r[cc].parse().expect("class");
            let prob: f64 = r[cprob].parse().expect("prob");
            let flag: u32 = r[cflag].parse().expect("flag");
            assert!((0.0..=1.0).contains(&prob));
            assert_eq!(
                flag & 32 != 0,
                prob < 0.5,
                "well {i} depth {d}: FLAG 32 iff prob < 0.5"
            );
            let truth_class: i64 = t[tc].parse().expect("truth class");
            if truth_class < 1 {
                shale_classed += 1;
                continue;
            }
            n += 1;
            exact += usize::from(c == truth_class);
            near += usize::from((c - truth_class).abs() <= 1);
            let k: f64 = r[cp].parse().expect("perm");
            let kt: f64 = t[tk].parse().expect("truth perm");
            perm_sq.push((k / kt).log10().powi(2));
        }
    }
    let rate = exact as f64 / n as f64;
    let perm_rms = (perm_sq.iter().sum::<f64>() / perm_sq.len() as f64).sqrt();
    eprintln!(
        "classes vs truth: {exact} of {n} exact ({rate:.3}), {near} within one; {shale_classed} classed depths are non-reservoir in the truth; PERM rms log10 {perm_rms:.3}"
    );
    assert!(n > 4000, "{n} classified reservoir depths");
    assert!(rate >= 0.88, "exact {rate}");
    assert!(near as f64 / n as f64 >= 0.99);
    // expected about 0.24: bed spread about the class FZI (σ 0.052 log10 FZI →
    // 0.10 in log10 k), PHIE error (σ about 0.01 → 0.08) and the 7 % of depths
    // one class off (a factor of about 2.3 in FZI → 0.72 in log10 k, 0.19 rms)
    assert!(perm_rms <= 0.30, "PERM rms log10 {perm_rms}");
    // the LAS output names the scheme beside the class
    let las = std::fs::read_to_string(out.path().join("wells/tarnby-1.las")).expect("las");
    assert!(
        las.contains("CLSCHEME")
            && las.contains("fzi (fzi-ladder, FZI (um) bounds 0.6300 1.5800 3.7000)"),
        "{}",
        &las[..2000.min(las.len())]
    );
}

/// The saved model reloads and predicts the same; a model from another
/// smartcore version, another envelope version, or a file that is not a model
/// is refused with a message that says what to do.
#[test]
fn model_file_envelope() {
    let out = tempfile::tempdir().expect("temp dir");
    run_demo_field(out.path());
    let path = out.path().join("model/class-model.fzm");
    let bytes = std::fs::read(&path).expect("model");
    let model = ClassModel::load(&path).expect("loads");
    let again = ClassModel::from_bytes(&model.to_bytes().expect("bytes"), &path).expect("reloads");
    assert_eq!(again.header, model.header);
    let rows: Vec<f64> = [
        0.1, 0.25, 2.3, 0.15, 80.0, 1.5, 0.3, 0.1, 2.45, 0.3, 95.0, 0.8,
    ]
    .to_vec();
    assert_eq!(
        model.forest.predict(&rows).expect("predict"),
        again.forest.predict(&rows).expect("predict")
    );
    // `head -2` is readable: magic line, then the JSON header
    let text = String::from_utf8_lossy(&bytes);
    let mut lines = text.lines();
    assert_eq!(lines.next(), Some("flowzone-class-model 1"));
    let header: serde_json::Value =
        serde_json::from_str(lines.next().expect("header")).expect("json");
    assert_eq!(header["smartcore_version"], SMARTCORE_VERSION);
    assert_eq!(
        header["scheme"]["boundaries"],
        serde_json::json!([0.63, 1.58, 3.7])
    );
    assert_eq!(
        header["features"][1],
        serde_json::json!({"name": "PHIE", "unit": "v/v"})
    );

    // replace in the byte form (the forest bytes are not text)
    let header_end = bytes.iter().position(|&b| b == b'\n').expect("magic") + 1;
    let second = header_end
        + bytes[header_end..]
            .iter()
            .position(|&b| b == b'\n')
            .expect("header");
    let mut tampered = bytes[..header_end].to_vec();
    let h = String::from_utf8(bytes[header_end..second].to_vec()).expect("utf8");
    tampered.extend(h.replace(SMARTCORE_VERSION, "0.3.2").into_bytes());
    tampered.extend(&bytes[second..]);
    let err = ClassModel::from_bytes(&tampered, Path::new("m.fzm")).expect_err("mismatch");
    assert!(matches!(err, ModelFileError::Smartcore { .. }));
    assert_eq!(
        err.to_string(),
        format!(
            "model `m.fzm` was saved with smartcore 0.3.2; this flowzone {} uses smartcore {SMARTCORE_VERSION}, whose forests may differ: train it again with `flowzone train`",
            env!("CARGO_PKG_VERSION")
        )
    );
    let mut v2 = b"flowzone-class-model 2\n".to_vec();
    v2.extend(&bytes[header_end..]);
    let err = ClassModel::from_bytes(&v2, Path::new("m.fzm")).expect_err("version");
    assert_eq!(
        err.to_string(),
        "model `m.fzm` has envelope version 2; this flowzone reads version 1: train it again with `flowzone train`"
    );
    let err =
        ClassModel::from_bytes(b"{\"not\": 1}\n", Path::new("x.json")).expect_err("not a model");
    assert_eq!(
        err.to_string(),
        "`x.json` is not a flowzone class model (it does not start with `flowzone-class-model`)"
    );
    let err =
        ClassModel::from_bytes(&bytes[..bytes.len() - 50], Path::new("m.fzm")).expect_err("cut");
    assert!(
        err.to_string().starts_with("model `m.fzm`: forest: "),
        "{err}"
    );

    // a run with the saved model gives the same classes as the run that trained it
    let dir = tempfile::tempdir().expect("temp dir");
    let wells: Vec<PathBuf> = vec![root().join("demo-wells")];
    let cfg = demo_config(
        dir.path(),
        &wells,
        &format!("model = {:?}", path.display().to_string()),
    );
    let out2 = dir.path().join("out");
    let run = run_config(&cfg, &out2, &[]);
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    for w in ["tarnby-1.csv", "tarnby-6.csv"] {
        assert_eq!(
            std::fs::read(out.path().join("wells").join(w)).expect("a"),
            std::fs::read(out2.join("wells").join(w)).expect("b"),
            "{w}"
        );
    }
    // and a config whose scheme differs is told to retrain
    let cfg = std::fs::read_to_string(&cfg)
        .expect("cfg")
        .replace("bounds = [0.63, 1.58, 3.7]", "bounds = [0.7, 1.6, 3.7]");
    let cfg_path = dir.path().join("changed.toml");
    std::fs::write(&cfg_path, cfg).expect("write");
    let run = run_config(&cfg_path, &dir.path().join("out3"), &[]);
    assert!(!run.status.success());
    let err = String::from_utf8_lossy(&run.stderr);
    assert!(err.contains("was trained for scheme fzi (fzi-ladder, FZI (um) bounds 0.6300 1.5800 3.7000), but the config's [classes] gives fzi (fzi-ladder, FZI (um) bounds 0.7000 1.6000 3.7000): train it again"), "{err}");
}

/// The version the model file records is the smartcore the build uses.
#[test]
fn smartcore_version_matches_the_lock_file() {
    let lock = std::fs::read_to_string(root().join("Cargo.lock")).expect("Cargo.lock");
    let at = lock
        .find("name = \"smartcore\"\nversion = \"")
        .expect("smartcore in the lock file");
    let version = lock[at..].lines().nth(1).expect("version line");
    assert_eq!(version, format!("version = \"{SMARTCORE_VERSION}\""));
}

/// A copy of Tarnby-8 without its sonic: with reduced models allowed, it gets
/// classes from a model trained without DT and a warning naming DT; without,
/// no classes and a warning that says why. The other wells keep the full model.
#[test]
fn well_without_a_feature_curve() {
    let dir = tempfile::tempdir().expect("temp dir");
    let src = root().join("demo-wells/tarnby-8.las");
    let file = flowzone::input::las::read_path(&src, flowzone::input::las::ReadOptions::default())
        .expect("read");
    let mut table = flowzone::cli::export::table_as_read(&file);
    let before = table.columns.len();
    table
        .columns
        .retain(|c| !["DT", "DTC", "AC"].contains(&c.name.as_str()));
    assert_eq!(
        table.columns.len(),
        before - 1,
        "Tarnby-8 has one sonic curve"
    );
    let input = dir.path().join("input");
    std::fs::create_dir_all(&input).expect("dir");
    let nodt = input.join("tarnby-8-nodt.las");
    flowzone::output::write_las(&table, &nodt, None).expect("write");
    let mut wells: Vec<PathBuf> = (1..=7)
        .map(|i| root().join(format!("demo-wells/tarnby-{i}.las")))
        .collect();
    wells.push(nodt);
    for (allow, classified) in [(true, true), (false, false)] {
        let sub = dir.path().join(format!("allow-{allow}"));
        std::fs::create_dir_all(&sub).expect("dir");
        let cfg = demo_config(&sub, &wells, &format!("allow-reduced-features = {allow}"));
        let out = sub.join("out");
        let run = run_config(&cfg, &out, &[]);
        assert!(
            run.status.success(),
            "{}",
            String::from_utf8_lossy(&run.stderr)
        );
        let s: serde_json::Value =
            serde_json::from_slice(&std::fs::read(out.join("run-summary.json")).expect("summary"))
                .expect("json");
        let w = s["wells"]
            .as_array()
            .expect("wells")
            .iter()
            .find(|w| {
                w["file"]
                    .as_str()
                    .is_some_and(|f| f.ends_with("tarnby-8-nodt.las"))
            })
            .expect("the copy");
        let warnings: Vec<&str> = w["warnings"]
            .as_array()
            .expect("w")
            .iter()
            .filter_map(|x| x.as_str())
            .collect();
        let counts = &w["classes"];
        if classified {
            assert!(
                warnings.iter().any(|x| x.starts_with("Tarnby-8 has no DT: classes from a model trained without it (features VSH, PHIE, RHOB, NPHI, LOG10_RT; leave-one-well-out exact ")),
                "{warnings:?}"
            );
            assert!(counts["classified"].as_u64().expect("n") > 400, "{counts}");
            assert_eq!(
                counts["features"],
                serde_json::json!(["VSH", "PHIE", "RHOB", "NPHI", "LOG10_RT"])
            );
        } else {
            assert!(
                warnings.contains(&"Tarnby-8 has no DT, which the class model needs: no CLASS or PERM in this well (predictor.allow-reduced-features is false)"),
                "{warnings:?}"
            );
            assert_eq!(counts["classified"], 0);
            let (h, rows) = read_table(&out.join("wells/tarnby-8-nodt.csv"));
            let c = col(&h, "CLASS");
            assert!(rows.iter().all(|r| r[c].is_empty()));
        }
        // a well with every feature is unaffected
        let full = s["wells"]
            .as_array()
            .expect("wells")
            .iter()
            .find(|w| w["well"] == "Tarnby-1")
            .expect("T1");
        assert_eq!(full["classes"]["features"].as_array().expect("f").len(), 6);
    }
}

/// `classes compare` on the demo core. The FZI ladder's boundaries sit
/// between the model's class centres (0.4, 1.0, 2.5, 5.5 µm), so it must use
/// 4 classes and predict held-out permeability within the model's noise
/// (core σ 0.1 in log10 k plus bed spread; measured 0.168 rms log10); R35
/// classes fall in 4 of the 5 published sizes; the data-driven scheme finds at
/// least 3 classes.
#[test]
fn compare_schemes_on_the_demo_core() {
    let out = flowzone()
        .args(["classes", "compare", "--json", "--config"])
        .arg(root().join("config/demo-field.toml"))
        .output()
        .expect("runs");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let rows: serde_json::Value = serde_json::from_slice(&out.stdout).expect("json");
    let by = |name: &str| {
        rows.as_array()
            .expect("rows")
            .iter()
            .find(|r| r["scheme"]["name"] == name)
            .unwrap_or_else(|| panic!("{name}"))
            .clone()
    };
    let fzi = by("fzi");
    eprintln!("compare: {rows}");
    assert_eq!(fzi["classes_used"], 4);
    assert_eq!(fzi["lowo_samples"], 287);
    assert!(fzi["lowo_rms_log10_fzi"].as_f64().expect("rms") <= 0.25);
    assert!(fzi["spread_log10_overall"].as_f64().expect("spread") <= 0.2);
    let r35 = by("r35");
    assert_eq!(r35["classes_used"], 4);
    assert_eq!(
        r35["scheme"]["boundaries"],
        serde_json::json!([0.1, 0.5, 2.0, 10.0])
    );
    let clusters = by("clusters");
    assert!(
        clusters["classes_used"].as_u64().expect("n") >= 3,
        "{clusters}"
    );
    let text = flowzone()
        .args(["classes", "compare", "--config"])
        .arg(root().join("config/demo-field.toml"))
        .output()
        .expect("runs");
    let text = String::from_utf8_lossy(&text.stdout);
    assert!(
        text.starts_with("class schemes on 287 core samples"),
        "{text}"
    );
}

/// `flowzone core`: the suggestion table on stdout and the core table. The
/// demo's Tarnby-3 core reads 0.60 m deep (demo-wells/README.md); the
/// suggestion is within 0.1 m of −0.60 and the config's accepted −0.6 is
/// applied. Core table: one row per matched sample, its flow-unit columns
/// consistent with POROSITY and PERM_MD by Amaefule et al. (1993) (the
/// formulas are checked against worked values in src/classes/flow_units.rs).
#[test]
fn core_command_table_and_suggestions() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = flowzone()
        .args(["core", "--quiet", "--config"])
        .arg(root().join("config/demo-field.toml"))
        .arg("--out")
        .arg(dir.path())
        .output()
        .expect("runs");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = String::from_utf8_lossy(&out.stdout);
    let t3: Vec<&str> = text
        .lines()
        .find(|l| l.starts_with("Tarnby-3"))
        .expect("Tarnby-3 row")
        .split_whitespace()
        .collect();
    let suggested: f64 = t3[2].parse().expect("suggested");
    assert!((suggested + 0.6).abs() <= 0.1 + 1e-9, "{text}");
    assert_eq!(t3[6], "-0.60", "{text}");
    let (h, rows) = read_table(&dir.path().join("core/core-table.csv"));
    assert_eq!(
        h,
        [
            "WELL",
            "LINE",
            "DEPTH_CORE",
            "SHIFT",
            "DEPTH",
            "POROSITY",
            "PERM_MD",
            "RQI_UM",
            "PHIZ",
            "FZI_UM",
            "R35_UM",
            "CLASS_CLUSTERS",
            "CLASS_FZI",
            "CLASS_R35"
        ]
    );
    assert_eq!(rows.len(), 287);
    for r in &rows {
        let f = |i: usize| r[i].parse::<f64>().expect("number");
        let (phi, k) = (f(5), f(6));
        let rqi = 0.0314 * (k / phi).sqrt();
        assert!((f(7) - rqi).abs() <= 1e-6 + 1e-4 * rqi, "{r:?}");
        assert!(
            (f(9) - rqi * (1.0 - phi) / phi).abs() <= 1e-5 + 1e-4 * f(9),
            "{r:?}"
        );
        assert!((f(4) - (f(2) + f(3))).abs() < 1e-3);
        if r[0] == "Tarnby-3" {
            assert_eq!(r[3], "-0.6000");
        }
    }
}

/// No silent fallback: with the saturation-height evidence forced on, a well
/// in a compartment with a free water level uses it above the FWL, a well in
/// no compartment is still classed from its logs, and run-summary.json says
/// which evidence each well used and why one well had none. The weights
/// scored leave one well out are in the summary and the training report.
/// Source: the acceptance rule; the demo field is invented.
#[test]
fn saturation_height_evidence_is_stated_per_well() {
    let dir = tempfile::tempdir().expect("temp dir");
    let cfg = crate::common::demo_config_edited(dir.path(), |t| {
        t.replace(
            "[predictor]\n",
            "[predictor]\nsaturation-height = \"on\"\n",
        )
        .replace(
            "[compartments.\"Main\"]\n",
            "[compartments.\"Main\"]\nwells = [\"Tarnby-1\", \"Tarnby-2\", \"Tarnby-3\", \"Tarnby-4\", \"Tarnby-5\", \"Tarnby-6\"]\n",
        )
    });
    let out = dir.path().join("out");
    let summary = crate::common::run_summary(&cfg, &out);
    let choice = &summary["classes"]["saturation_height"];
    let weight = choice["weight"].as_f64().expect("weight");
    assert!(weight > 0.0, "forced on: {choice}");
    let scored = choice["scored"].as_array().expect("scored");
    assert_eq!(scored.len(), 6, "weight 0 and five weights: {choice}");
    assert_eq!(scored.iter().filter(|r| r["chosen"] == true).count(), 1);
    let report: serde_json::Value = serde_json::from_slice(
        &std::fs::read(out.join("model/training-report.json")).expect("report"),
    )
    .expect("json");
    assert!(
        report["ablation"]
            .as_array()
            .expect("rows")
            .iter()
            .any(|r| r["evidence"]
                .as_str()
                .is_some_and(|e| e.starts_with("+ saturation height"))),
        "{report}"
    );
    let mut seen = 0;
    for w in summary["wells"].as_array().expect("wells") {
        let name = w["well"].as_str().expect("name");
        let classes = &w["classes"];
        let ev: Vec<&str> = classes["evidence"]
            .as_array()
            .expect("evidence")
            .iter()
            .map(|e| e.as_str().expect("text"))
            .collect();
        assert!(classes["classified"].as_u64().expect("n") > 0, "{name}");
        assert!(ev[0].starts_with("log features"), "{name}: {ev:?}");
        if name == "Tarnby-8" {
            assert!(
                ev.iter()
                    .any(|e| e.contains("no saturation height") && e.contains("no compartment")),
                "{name}: {ev:?}"
            );
        } else if name != "Tarnby-7" {
            seen += usize::from(
                ev.iter()
                    .any(|e| e.starts_with("saturation height (weight")),
            );
        }
    }
    assert!(seen >= 5, "wells above a free water level use the evidence");
}
