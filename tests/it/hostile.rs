//! Hostile and huge input: each case gets a clear error or a documented,
//! bounded behaviour (README, "Limits"). The limits are the reader's
//! defaults (flowzone::input::las::Limits::DEFAULT) unless a case sets its own.

use std::path::Path;

use flowzone::input::core_samples::read_spwla;
use flowzone::input::las::{Limits, ReadOptions, read_bytes};
use flowzone::units::DepthUnit;

use crate::common::{chain, root, run_config};

const HEAD: &str = "~V\n VERS. 2.0 :\n WRAP. NO :\n~W\n STRT.M 1000 :\n STOP.M 1001 :\n STEP.M 0.5 :\n NULL. -999.25 :\n";

/// Rows left out, as (line, reason).
fn by_line(rejected: &[flowzone::input::core_samples::Rejected]) -> Vec<(u64, &str)> {
    rejected
        .iter()
        .map(|r| (r.line, r.reason.as_str()))
        .collect()
}

fn read(text: &[u8]) -> Result<flowzone::input::las::LasFile, String> {
    read_bytes(text, Path::new("h.las"), ReadOptions::default()).map_err(|e| chain(&e))
}

#[test]
fn a_header_line_beyond_64_kib_is_refused() {
    let long = format!(
        "{HEAD} COMP. {} : COMPANY\n~C\n DEPT.M :\n~A\n1000\n",
        "x".repeat(100_000)
    );
    let err = read(long.as_bytes()).expect_err("refused");
    assert!(
        // " COMP. " (7) + 100 000 + " : COMPANY" (10) = 100 017 bytes
        err.starts_with("h.las:9: header line is 100017 bytes long, above the limit of 65536"),
        "{err}"
    );
}

#[test]
fn a_million_curves_are_refused_at_the_limit() {
    let mut t = format!("{HEAD}~C\n DEPT.M :\n");
    for i in 0..1_000_000 {
        t.push_str(&format!(" C{i}.V :\n"));
    }
    t.push_str("~A\n1000\n");
    let err = read(t.as_bytes()).expect_err("refused");
    // line 10 is DEPT, so the 10 001st curve (C9999) is on line 10 010
    assert_eq!(
        err,
        "h.las:10010: ~C declares more than 10000 curves ([input] max-curves)"
    );
    // a row with a million values against three declared curves
    let row = vec!["1"; 1_000_000].join(" ");
    let t = format!("{HEAD}~C\n DEPT.M :\n A.V :\n B.V :\n~A\n{row}\n");
    assert_eq!(
        read(t.as_bytes()).expect_err("refused"),
        "h.las:14: row has 1000000 values, ~C declares 3 curves"
    );
}

#[test]
fn ten_million_header_lines_stop_at_the_millionth() {
    let mut t = String::with_capacity(21_000_000);
    t.push_str(HEAD);
    t.push_str("~O\n");
    for _ in 0..10_000_000 {
        t.push_str("x\n");
    }
    let err = read(t.as_bytes()).expect_err("refused");
    assert_eq!(
        err,
        "h.las:1000001: the header runs past 1000000 lines with no ~A section ([input] max-header-lines)"
    );
    // a tighter configured limit applies too
    let small = Limits {
        max_header_lines: 20,
        ..Limits::DEFAULT
    };
    let err = read_bytes(
        t.as_bytes(),
        Path::new("h.las"),
        ReadOptions {
            strict: false,
            limits: small,
        },
    )
    .expect_err("refused");
    assert!(chain(&err).starts_with("h.las:21: the header runs past 20 lines"));
}

#[test]
fn a_null_real_data_take_is_warned_and_nan_and_infinity_are_handled() {
    let t = "~V\n VERS. 2.0 :\n WRAP. NO :\n~W\n NULL. 0 :\n~C\n DEPT.M :\n SP.MV :\n~A\n1000 0\n1000.5 -12.5\n1001 nan\n";
    let f = read(t.as_bytes()).expect("reads");
    let sp = f.curve_data("SP").expect("SP");
    assert!(sp[0].is_nan() && sp[2].is_nan() && sp[1] == -12.5);
    assert!(
        f.warnings.iter().any(
            |w| w.line == Some(5) && w.message.starts_with("NULL is 0, a value real logs take")
        ),
        "{:?}",
        f.warnings
    );
    let t = "~V\n VERS. 2.0 :\n WRAP. NO :\n~W\n NULL. -999.25 :\n~C\n DEPT.M :\n SP.MV :\n~A\n1000 1\n1000.5 -inf\n";
    assert_eq!(
        read(t.as_bytes()).expect_err("refused"),
        "h.las:11: value 2 of the row, `-inf`, is infinite"
    );
}

#[test]
fn depth_running_backwards_half_way_warns_or_is_refused_when_strict() {
    let t = format!(
        "{HEAD}~C\n DEPT.M :\n GR.GAPI :\n~A\n1000 10\n1000.5 11\n1001 12\n1000.5 13\n1000 14\n"
    );
    let f = read(t.as_bytes()).expect("reads with a warning");
    assert!(
        f.warnings.iter().any(|w| w.message.contains("monoton")),
        "{:?}",
        f.warnings
    );
    let err = read_bytes(
        t.as_bytes(),
        Path::new("h.las"),
        ReadOptions {
            strict: true,
            ..ReadOptions::default()
        },
    )
    .expect_err("strict refuses");
    assert!(chain(&err).contains("monoton"), "{}", chain(&err));
}

/// A link loop and a file above the configured size limit in the wells
/// folder: each is that well's error in the summary; the others run.
#[cfg(unix)]
#[test]
fn a_link_loop_and_an_oversized_file_fail_only_their_wells() {
    let dir = tempfile::tempdir().expect("temp dir");
    let wells = dir.path().join("wells");
    std::fs::create_dir(&wells).expect("dir");
    std::fs::copy(root().join("demo-wells/tarnby-1.las"), wells.join("a.las")).expect("copy");
    std::os::unix::fs::symlink("loop.las", wells.join("loop.las")).expect("link");
    // 1.2 MiB of padding in ~O: over a 1 MiB limit
    let mut big = std::fs::read_to_string(root().join("demo-wells/tarnby-2.las")).expect("read");
    let at = big.find("~A").expect("~A");
    let pad: String = (0..20_000).map(|_| "#".repeat(60) + "\n").collect();
    big.insert_str(at, &pad);
    std::fs::write(wells.join("big.las"), big).expect("write");
    let cfg = dir.path().join("p.toml");
    std::fs::write(
        &cfg,
        "[project]\nname = \"t\"\n[input]\nwells = [\"wells\"]\nmax-file-mb = 1\n[parameters.field]\nrw-ohmm = 0.045\nrho-shale-gcc = 2.55\n",
    )
    .expect("config");
    let out = dir.path().join("out");
    let run = run_config(&cfg, &out, &[]);
    assert_eq!(
        run.status.code(),
        Some(2),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    let summary: serde_json::Value =
        serde_json::from_slice(&std::fs::read(out.join("run-summary.json")).expect("summary"))
            .expect("json");
    let w = summary["wells"].as_array().expect("wells");
    assert_eq!(w.len(), 3);
    let by_file = |name: &str| {
        w.iter()
            .find(|x| x["file"].as_str().expect("file").ends_with(name))
            .expect("listed")
    };
    assert_eq!(by_file("a.las")["ok"], true);
    let big_err = by_file("big.las")["error"].as_str().expect("error");
    assert!(
        big_err.contains("above the limit of 1048576 bytes ([input] max-file-mb)"),
        "{big_err}"
    );
    let loop_err = by_file("loop.las")["error"].as_str().expect("error");
    assert!(
        loop_err.contains("cannot read") && loop_err.contains("loop.las"),
        "{loop_err}"
    );
}

/// Fuzzing found (core_spwla target): a value record (40) whose declared
/// count went straight to an allocation. 6 580 775 807 values is 105 GB, and
/// a failed allocation aborts the process, which no error handling catches;
/// a larger count panicked with "capacity overflow". The minimised input,
/// kept as found, has no variable definitions: refused with the reason.
#[test]
fn fuzz_spwla_value_count_is_not_an_allocation() {
    let path = root().join("tests/data/fuzz/core_spwla-value-count-6580775807");
    for unit in [DepthUnit::Metre, DepthUnit::Foot] {
        let err = read_spwla(&path, unit, DepthUnit::Metre).expect_err("no record 15");
        assert!(chain(&err).contains("no record 15"), "{}", chain(&err));
    }
}

/// The same damage on a real sample: the record claiming 4 000 000 000 values
/// is left out by line with both counts, and the good sample after it is read.
#[test]
fn a_spwla_value_record_with_a_damaged_count_is_left_out() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("damaged.spwla");
    std::fs::write(
        &path,
        "10     1\n    TEST-1\n    Lab\n15    2    2\n\
         \x20         1512      1602  2031   0Lab    Klinkenberg corrected gas perm, Hor.\n\
         \x20         1402      1211  3084   0Lab    Porosity, Horizontal PLUG\n\
         30     1\n  2000.50\n40     1   4000000000\n  150.0  21.5\n\
         30     1\n  2001.00\n40     1   2\n  90.0  19.0\n",
    )
    .unwrap();
    let (core, _vars) = read_spwla(&path, DepthUnit::Metre, DepthUnit::Metre).expect("read");
    assert_eq!(core.samples.len(), 1);
    let s = &core.samples[0];
    assert_eq!((s.depth, s.perm_md), (2001.0, 90.0));
    assert!(
        (s.porosity - 0.19).abs() < 1e-12,
        "percent read as 0.19: {}",
        s.porosity
    );
    assert_eq!(core.rejected.len(), 1);
    assert_eq!(core.rejected[0].line, 10);
    assert_eq!(
        core.rejected[0].reason,
        "value record has 2 readable values of 4000000000 (truncated or malformed)"
    );
}

/// `nan` and `inf` in the core, capillary and pressure tables (Rust reads
/// both as numbers): a value the row cannot do without leaves the row out
/// with its line and reason; a grain density of `nan` is missing, as `nan`
/// is in LAS data.
#[test]
fn nan_and_infinity_in_the_tables_are_left_out_by_line() {
    let dir = tempfile::tempdir().unwrap();
    let core = dir.path().join("core.csv");
    std::fs::write(
        &core,
        "WELL,DEPTH_MD,DEPTH_UNIT,POROSITY_FRAC,PERM_MD,GRAIN_DENSITY_GCC\n\
         A-1,nan,M,0.2,10,2.65\n\
         A-1,inf,M,0.2,10,2.65\n\
         A-1,2000.0,M,0.2,inf,2.65\n\
         A-1,2000.5,M,nan,10,2.65\n\
         A-1,2001.0,M,0.2,10,nan\n\
         A-1,2001.5,M,0.2,10,-inf\n\
         A-1,2002.0,M,0.21,12,2.66\n",
    )
    .unwrap();
    let c = flowzone::input::core_samples::read_core_csv(&core, DepthUnit::Metre).expect("read");
    let kept: Vec<(u64, Option<f64>)> = c
        .samples
        .iter()
        .map(|s| (s.line, s.grain_density_gcc))
        .collect();
    assert_eq!(kept, [(6, None), (8, Some(2.66))]);
    let left = by_line(&c.rejected);
    assert_eq!(
        left,
        [
            (2, "depth NaN is not a finite number"),
            (3, "depth inf is not a finite number"),
            (4, "permeability inf mD is not a finite number"),
            (5, "porosity NaN is outside 0-0.5"), // MAX_CORE_POROSITY
            (7, "grain density -inf g/cm3 is not a finite number"),
        ]
    );

    let cap = dir.path().join("capillary.csv");
    std::fs::write(
        &cap,
        "SAMPLE,WELL,DEPTH_MD,POROSITY_FRAC,PERM_MD,PC_PSI,SW_FRAC,SYSTEM\n\
         P-1,A-1,2000,0.2,10,inf,0.5,mercury-air\n\
         P-1,A-1,2000,0.2,10,20,nan,mercury-air\n\
         P-2,A-1,2000,0.2,inf,20,0.5,mercury-air\n\
         P-3,A-1,nan,0.2,10,20,0.5,mercury-air\n",
    )
    .unwrap();
    let (plugs, left) = flowzone::sat_height::lab_curves::read(&cap).expect("read");
    assert!(plugs.is_empty(), "{plugs:?}");
    let lines: Vec<u64> = left.iter().map(|r| r.line).collect();
    assert_eq!(lines, [2, 3, 4, 5], "{left:?}");
    assert!(
        left[2].reason.contains("permeability inf mD not usable"),
        "{left:?}"
    );
    assert_eq!(left[3].reason, "depth NaN is not a finite number");

    let pressures = dir.path().join("pressures.csv");
    std::fs::write(
        &pressures,
        "WELL,TVDSS_M,PRESSURE_PSI\nA-1,nan,3000\nA-1,2000,inf\nA-1,2001,3001.5\n",
    )
    .unwrap();
    let tvdss_of = |_: &str, md: f64| Ok(md);
    let (points, left) =
        flowzone::sat_height::read_pressure_points(&pressures, DepthUnit::Metre, &[], &tvdss_of)
            .expect("read");
    assert_eq!(points.len(), 1);
    assert_eq!((points[0].line, points[0].tvdss_m), (4, 2001.0));
    assert_eq!(
        left.iter().map(|r| r.line).collect::<Vec<_>>(),
        [2, 3],
        "{left:?}"
    );
}

/// SPWLA core data with every kind of non-finite value, read into a project
/// in feet: each damaged sample is left out by line and reason, the good one
/// is kept (2003 m = 2003 / 0.3048 ft, international foot).
#[test]
fn nan_and_infinity_in_spwla_core_data_are_left_out_by_line() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("nonfinite.spwla");
    let var =
        |code: &str, what: &str| format!("          {code}      1602  2031   0Lab    {what}\n");
    let mut t = String::from("10     1\n    TEST-1\n    Lab\n15    3    3\n");
    t += &var("1512", "Klinkenberg corrected gas perm, Hor.");
    t += &var("1402", "Porosity, Horizontal PLUG");
    t += &var("1601", "Grain density");
    for (depth, values) in [
        ("nan", "150.0  21.5  2.65"),    // depth on line 9
        ("inf", "150.0  21.5  2.65"),    // line 13
        ("1e308", "150.0  21.5  2.65"),  // line 17: finite in m, infinite in ft
        ("2001.00", "inf  19.0  2.65"),  // values on line 23
        ("2002.00", "90.0  19.0  inf"),  // line 27
        ("2003.00", "90.0  19.0  2.66"), // kept
    ] {
        t += &format!("30     1\n  {depth}\n40     1   3\n  {values}\n");
    }
    std::fs::write(&path, t).unwrap();
    let (core, _) = read_spwla(&path, DepthUnit::Metre, DepthUnit::Foot).expect("read");
    assert_eq!(core.samples.len(), 1, "{:?}", core.rejected);
    assert!((core.samples[0].depth - 2003.0 / 0.3048).abs() < 1e-9);
    assert_eq!(core.samples[0].grain_density_gcc, Some(2.66));
    let left = by_line(&core.rejected);
    assert_eq!(
        left,
        [
            (9, "sample depth is not a finite number"),
            (13, "sample depth is not a finite number"),
            (17, "sample depth is not a finite number"),
            (23, "permeability inf mD is not a finite number"),
            (27, "grain density inf g/cm3 is not a finite number"),
        ]
    );
}

/// A survey station with a NaN azimuth made every TVD below it NaN, and a
/// NaN MD passed the "MD must increase" check (comparisons with NaN are
/// false); a LAS NULL of `inf` would null every sample and one of `nan` none.
/// All three are refused with their line.
#[test]
fn nan_in_a_survey_and_a_non_finite_null_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    for (rows, line) in [
        ("0,0,0\n100,1,nan\n200,2,10\n", 3),
        ("0,0,0\n100,1,10\nnan,2,10\n150,2,10\n", 4),
    ] {
        let path = dir.path().join("survey.csv");
        std::fs::write(&path, format!("MD_M,INC_DEG,AZI_DEG\n{rows}")).unwrap();
        let err = flowzone::well::read_survey(&path, DepthUnit::Metre).expect_err("refused");
        let msg = chain(&err);
        assert!(msg.contains(&format!(":{line}")), "{msg}");
        assert!(msg.contains("must be finite numbers"), "{msg}");
    }
    for null in ["inf", "nan"] {
        let t = format!(
            "~V\n VERS. 2.0 :\n WRAP. NO :\n~W\n STRT.M 1000 :\n STOP.M 1001 :\n STEP.M 0.5 :\n NULL. {null} :\n~C\n DEPT.M :\n GR.API :\n~A\n1000 50\n"
        );
        let err = read(t.as_bytes()).expect_err("refused");
        assert!(
            err.starts_with(&format!(
                "h.las:8: NULL value `{null}` is not a finite number"
            )),
            "{err}"
        );
    }
}
