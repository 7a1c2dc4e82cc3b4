//! The binary as a user runs it: help text, exit codes, stdout for data and
//! stderr for messages, and the files each command writes.

use crate::common::{flowzone, root, run_config};

#[test]
fn every_command_has_help() {
    for cmd in [
        &["--help"][..],
        &["inspect", "--help"],
        &["export", "--help"],
        &["run", "--help"],
        &["merge", "--help"],
        &["core", "--help"],
        &["train", "--help"],
        &["classes", "compare", "--help"],
        &["demo", "--help"],
    ] {
        let out = flowzone().args(cmd).output().expect("runs");
        assert!(out.status.success(), "{cmd:?}");
        let text = String::from_utf8_lossy(&out.stdout);
        assert!(text.contains("Usage: flowzone"), "{cmd:?}: {text}");
    }
}

/// Good files are reported on stdout, bad ones refused on stderr with file:line,
/// and the exit code says that something failed.
#[test]
fn inspect_reports_good_files_and_refuses_bad_ones() {
    let good = root().join("tests/data/las/header-traps.las");
    let bad = root().join("tests/data/las-bad/text-in-column.las");
    let out = flowzone()
        .arg("inspect")
        .arg(&good)
        .arg(&bad)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(2));
    let stdout = String::from_utf8_lossy(&out.stdout);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stdout.contains("TRAP 1-2"), "{stdout}");
    assert!(
        stdout.contains("1000 to 1001 FT , 3 rows, step 0.5 (regular)"),
        "{stdout}"
    );
    assert_eq!(
        stderr.lines().collect::<Vec<_>>(),
        vec![
            format!(
                "error: {}:17: value 2 of the row, `abc`, is not a number",
                bad.display()
            ),
            "error: 1 of 2 files failed".to_string(),
        ]
    );
}

#[test]
fn inspect_json_is_machine_readable() {
    let f = root().join("tests/data/las/irregular-decreasing-duplicates.las");
    let out = flowzone()
        .args(["inspect", "--json"])
        .arg(&f)
        .output()
        .expect("runs");
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("JSON on stdout");
    let s = &v[0];
    assert_eq!(s["rows"], 3);
    assert_eq!(s["index_reversed"], true);
    assert_eq!(s["step_regular"], false);
    assert_eq!(s["curves"][1]["mnemonic"], "NPHI");
    // one of three NPHI samples is NULL
    assert!((s["curves"][1]["null_fraction"].as_f64().expect("number") - 1.0 / 3.0).abs() < 1e-12);
    assert_eq!(s["warnings"][0]["line"], 14);
}

/// `export` writes one file per input in each format, values as read.
#[test]
fn export_csv_las_parquet() {
    let dir = tempfile::tempdir().expect("temp dir");
    let src = crate::common::real("multi_channel.las");
    for format in ["csv", "las", "parquet"] {
        let out = flowzone()
            .args(["export", "--format", format, "--out"])
            .arg(dir.path())
            .arg(&src)
            .output()
            .expect("runs");
        assert!(
            out.status.success(),
            "{format}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        assert!(
            out.stdout.is_empty(),
            "data goes to files, messages to stderr"
        );
        assert!(dir.path().join(format!("multi_channel.{format}")).is_file());
    }
    let ours = flowzone::input::las::read_path(&src, flowzone::input::las::ReadOptions::default())
        .expect("readable");
    // CSV: header = mnemonics, values parse back to what was read
    let csv = std::fs::read_to_string(dir.path().join("multi_channel.csv")).expect("csv");
    let mut lines = csv.lines();
    let header: Vec<&str> = lines.next().expect("header").split(',').collect();
    assert_eq!(
        header,
        ours.curves
            .iter()
            .map(|c| c.mnemonic.as_str())
            .collect::<Vec<_>>()
    );
    for (r, line) in lines.enumerate() {
        for (c, field) in line.split(',').enumerate() {
            let v: f64 = field.parse().expect("number");
            assert_eq!(v, ours.columns[c][r], "row {r} col {c}");
        }
    }
    // Parquet: read back with polars
    use polars::prelude::{ParquetReader, SerReader};
    let file = std::fs::File::open(dir.path().join("multi_channel.parquet")).expect("parquet");
    let df = ParquetReader::new(file).finish().expect("valid parquet");
    assert_eq!(df.height(), ours.n_rows());
    assert_eq!(df.width(), ours.curves.len());
    // an input is never overwritten: exporting LAS into its own folder is refused
    let copy_dir = tempfile::tempdir().expect("temp dir");
    let copy = copy_dir.path().join("w.las");
    std::fs::copy(&src, &copy).expect("copy");
    let before = std::fs::read(&copy).expect("read");
    let out = flowzone()
        .args(["export", "--format", "las", "--out"])
        .arg(copy_dir.path())
        .arg(&copy)
        .output()
        .expect("runs");
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("would overwrite the input"));
    assert_eq!(std::fs::read(&copy).expect("read"), before);
}

/// `run` with a config: per-well outputs, a summary, one bad well reported
/// without stopping the others (and a well missing a required curve named with
/// the aliases tried), exit code 2 unless --keep-going.
#[test]
fn run_isolates_a_bad_well() {
    let wells = tempfile::tempdir().expect("temp dir");
    let copy = |from: &str, to: &str| {
        std::fs::copy(root().join(from), wells.path().join(to)).expect("copy")
    };
    copy("demo-wells/tarnby-1.las", "a.las");
    copy("tests/data/las-bad/malformed-number.las", "b.las");
    copy("demo-wells/tarnby-4.las", "c.las");
    copy("tests/data/las/header-traps.las", "d.las");
    let cfg = wells.path().join("project.toml");
    std::fs::write(
        &cfg,
        "[project]\nname = \"t\"\n[input]\nwells = [\".\"]\n[parameters.field]\nrw-ohmm = 0.045\nrho-shale-gcc = 2.55\n",
    )
    .expect("config");
    // the output may not be inside an input folder
    let out = run_config(&cfg, &wells.path().join("out"), &[]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("is inside `.` ([input] wells"), "{err}");

    let out_dir = tempfile::tempdir().expect("temp dir");
    let out = run_config(&cfg, out_dir.path(), &[]);
    assert_eq!(
        out.status.code(),
        Some(2),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let summary: serde_json::Value = serde_json::from_slice(
        &std::fs::read(out_dir.path().join("run-summary.json")).expect("summary"),
    )
    .expect("json");
    assert_eq!(summary["wells_total"], 4);
    assert_eq!(summary["wells_failed"], 2);
    let w = summary["wells"].as_array().expect("wells");
    assert_eq!(
        (
            w[0]["ok"].as_bool(),
            w[1]["ok"].as_bool(),
            w[2]["ok"].as_bool(),
            w[3]["ok"].as_bool()
        ),
        (Some(true), Some(false), Some(true), Some(false))
    );
    assert!(
        w[1]["error"]
            .as_str()
            .expect("error")
            .ends_with("b.las:18: value 3 of the row, `2.33.0`, is not a number")
    );
    assert!(
        w[3]["error"].as_str().expect("error").ends_with(
            "d.las: no bulk-density curve: tried RHOB, RHOZ, ZDEN, DEN, DENS, RHO8, DENB, DLDC, HDEN"
        ),
        "{}",
        w[3]["error"]
    );
    // c.las is logged in feet and converted to metres: 6663.0 ft = 2030.8824 m
    // exactly (1 ft = 0.3048 m); its EKB of 108 ft is 32.9184 m, so TVDSS = 1997.9640
    let csv = std::fs::read_to_string(out_dir.path().join("wells/c.csv")).expect("c.csv");
    assert_eq!(
        csv.lines().next(),
        Some("DEPTH,TVDSS,VSH,PHIT,PHIE,SW,BVW,FLAG,GR,RHOB,NPHI,DT,RT,CALI")
    );
    let first: Vec<&str> = csv.lines().nth(1).expect("row").split(',').collect();
    assert_eq!(&first[..2], &["2030.8824", "1997.9640"]);
    assert!(out_dir.path().join("wells/a.las").is_file());
    let keep = run_config(&cfg, out_dir.path(), &["--keep-going", "--overwrite"]);
    assert_eq!(keep.status.code(), Some(0));
}

/// Output files are named from sanitised file stems, never from the WELL
/// header: wells called `../../escape` and `/tmp/abs`, and a file named
/// `...las`, write only inside the output folder, keep their names as data,
/// and leave the input folder untouched.
#[test]
fn hostile_well_names_stay_inside_the_output_folder() {
    let dir = tempfile::tempdir().expect("temp dir");
    let input = dir.path().join("in");
    std::fs::create_dir(&input).expect("in");
    let text = std::fs::read_to_string(root().join("demo-wells/tarnby-1.las")).expect("las");
    let named = |well: &str| {
        let t = text.replacen("Tarnby-1", well, 1);
        assert!(t.contains(well));
        t
    };
    std::fs::write(input.join("a.las"), named("../../escape")).expect("write");
    std::fs::write(input.join("b.las"), named("/tmp/abs")).expect("write");
    std::fs::write(input.join("...las"), named("dots")).expect("write");
    let cfg = dir.path().join("project.toml");
    std::fs::write(
        &cfg,
        "[project]\nname = \"t\"\n[input]\nwells = [\"in\"]\n[output]\nformats = [\"las\", \"csv\", \"parquet\"]\n[parameters.field]\nrw-ohmm = 0.045\nrho-shale-gcc = 2.55\n",
    )
    .expect("config");
    let out = dir.path().join("out");
    let run = run_config(&cfg, &out, &[]);
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );

    let names = |d: &std::path::Path| {
        let mut v: Vec<String> = std::fs::read_dir(d)
            .expect("list")
            .map(|e| e.expect("entry").file_name().to_string_lossy().into_owned())
            .collect();
        v.sort();
        v
    };
    assert_eq!(names(dir.path()), ["in", "out", "project.toml"]);
    assert_eq!(names(&input), ["...las", "a.las", "b.las"]);
    assert_eq!(
        names(&out),
        [
            "field",
            "report",
            "run-manifest.json",
            "run-summary.json",
            "wells"
        ]
    );
    assert_eq!(
        names(&out.join("report/wells")),
        ["a.html", "b.html", "well.html"]
    );
    assert_eq!(
        names(&out.join("wells")),
        [
            "a.csv",
            "a.las",
            "a.parquet",
            "b.csv",
            "b.las",
            "b.parquet",
            "well.csv",
            "well.las",
            "well.parquet"
        ]
    );
    let summary: serde_json::Value =
        serde_json::from_slice(&std::fs::read(out.join("run-summary.json")).expect("summary"))
            .expect("json");
    let wells: Vec<&str> = summary["wells"]
        .as_array()
        .expect("wells")
        .iter()
        .map(|w| w["well"].as_str().expect("name"))
        .collect();
    assert_eq!(wells, ["dots", "../../escape", "/tmp/abs"]);
}

/// Rw carried to formation temperature with the gradient from the header's
/// BHT and TD (tarnby-4: BHT 75.6 DEGC, TD 7286.5 FT = 2220.9252 m); with a
/// 15 °C surface, g = (75.6 − 15)/2220.9252 = 0.0272860 °C/m (hand-computed).
#[test]
fn gradient_from_header_bht() {
    let wells = tempfile::tempdir().expect("temp dir");
    std::fs::copy(
        root().join("demo-wells/tarnby-4.las"),
        wells.path().join("w.las"),
    )
    .expect("copy");
    let cfg = wells.path().join("p.toml");
    std::fs::write(
        &cfg,
        "[input]\nwells = [\"w.las\"]\n[parameters.field]\nrw-ohmm = 0.1\nrw-temperature-c = 25\nsurface-temperature-c = 15\nrho-shale-gcc = 2.55\n",
    )
    .expect("config");
    let out_dir = tempfile::tempdir().expect("temp dir");
    let out = run_config(&cfg, out_dir.path(), &[]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let summary: serde_json::Value = serde_json::from_slice(
        &std::fs::read(out_dir.path().join("run-summary.json")).expect("summary"),
    )
    .expect("json");
    let zone = &summary["wells"][0]["stages"]["zones"][0];
    let g = zone["gradient_c_per_m"].as_f64().expect("gradient");
    assert!((g - 0.027_286_0).abs() < 1e-6, "{g}");
    // no tops: one zone, ALL; EKB 108 FT → 32.9184 m
    assert_eq!(zone["name"], "ALL");
    assert!(
        (summary["wells"][0]["stages"]["elevation"]
            .as_f64()
            .expect("elevation")
            - 32.9184)
            .abs()
            < 1e-9
    );
}
