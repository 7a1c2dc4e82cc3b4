//! Tiny LAS files in tests/data/las, each testing rules of the LAS 2.0 standard
//! (CWLS, 2014 update) named in its first `#` line. Expected values are read
//! off the fixture text by hand. Every fixture runs twice: as stored (LF) and
//! with CRLF line endings, which must give the same result.

use std::path::Path;

use flowzone::input::las::{LasFile, ReadOptions, Version, read_bytes};

use crate::common::{chain, crlf, root};

fn both_endings(name: &str) -> Vec<LasFile> {
    let bytes = std::fs::read(root().join("tests/data/las").join(name)).expect("fixture");
    let crlf = crlf(&bytes);
    [bytes, crlf]
        .iter()
        .map(|b| {
            read_bytes(b, Path::new(name), ReadOptions::default())
                .unwrap_or_else(|e| panic!("{}", chain(&e)))
        })
        .collect()
}

fn nan_eq(a: &[f64], b: &[f64]) -> bool {
    a.len() == b.len()
        && a.iter()
            .zip(b)
            .all(|(x, y)| (x.is_nan() && y.is_nan()) || x == y)
}

#[test]
fn wrapped_with_colon_after_yes_and_nulls() {
    for f in both_endings("wrap-no-space-colon.las") {
        assert!(f.wrapped);
        assert_eq!(f.null_value, Some(-9999.0));
        // decreasing depth (STEP -0.125) reversed to increasing
        assert!(f.index_reversed);
        assert_eq!(f.index(), &[909.75, 909.875, 910.0]);
        assert!(nan_eq(
            f.curve_data("DT").expect("DT"),
            &[125.0, f64::NAN, 123.45]
        ));
        assert!(nan_eq(
            f.curve_data("SFLU").expect("SFLU"),
            &[11.0, 10.5, f64::NAN]
        ));
        assert_eq!(f.curves[2].unit, "K/M3");
        assert!(f.warnings.is_empty(), "{:?}", f.warnings);
    }
}

#[test]
fn header_traps() {
    for f in both_endings("header-traps.las") {
        assert_eq!(f.well_value("COMP"), Some("ANY OIL COMPANY : INC."));
        assert_eq!(f.well_value("DATE"), Some("2024-03-15 14:30"));
        assert_eq!(f.well_value("TIME"), Some("14:30:00"));
        let run = f.well_item("RUN").expect("RUN");
        assert_eq!(
            (
                run.unit.as_str(),
                run.value.as_str(),
                run.description.as_str()
            ),
            ("1", "", "RUN NUMBER")
        );
        let dfd = f.well_item("DFD").expect("DFD");
        assert_eq!(
            (dfd.unit.as_str(), dfd.value.as_str()),
            ("KG/M3", "1525.0000")
        );
        assert_eq!(f.curves[1].unit, "1IN");
        assert_eq!(f.curves[2].unit, "1000 LBF");
        assert_eq!(f.curves[3].api_code, "07 310 01 00");
        assert_eq!(f.param("BHT").map(|p| p.value.as_str()), Some("85.0"));
        assert_eq!(f.other.trim(), "Free text: kept as written.");
        assert!(nan_eq(
            f.curve_data("GR").expect("GR"),
            &[45.0, 50.5, f64::NAN]
        ));
        let w: Vec<String> = f.warnings.iter().map(ToString::to_string).collect();
        assert_eq!(
            w,
            vec!["line 21: unit of TENS read as `1000 LBF` (a unit written with a space)"]
        );
    }
}

#[test]
fn irregular_decreasing_duplicates() {
    for f in both_endings("irregular-decreasing-duplicates.las") {
        assert_eq!(f.index(), &[1500.0, 1502.2, 1503.0]);
        assert_eq!(f.curves[1].mnemonic, "NPHI");
        assert_eq!(f.curves[2].mnemonic, "NPHI_2");
        assert_eq!(f.curves[2].original_mnemonic, "NPHI");
        assert!(nan_eq(
            f.curve_data("NPHI").expect("NPHI"),
            &[f64::NAN, 21.0, 20.0]
        ));
        let w: Vec<String> = f.warnings.iter().map(ToString::to_string).collect();
        // STEP 0 declares irregular spacing: no STEP warning
        assert_eq!(
            w,
            vec!["line 14: curve NPHI appears again; this one is named NPHI_2"]
        );
    }
}

#[test]
fn cp1252_degree_sign_in_unit() {
    for f in both_endings("cp1252-unit.las") {
        assert_eq!(f.curves[1].unit, "\u{b0}/30M");
        let w: Vec<String> = f.warnings.iter().map(ToString::to_string).collect();
        assert_eq!(
            w,
            vec!["line 12: 1 header line(s) are not UTF-8; read as Windows-1252"]
        );
    }
}

#[test]
fn las_1_2_value_in_description() {
    for f in both_endings("las12.las") {
        assert_eq!(f.version, Version::V1_2);
        assert_eq!(f.well_value("COMP"), Some("Example Energy, Inc."));
        assert_eq!(f.well_value("WELL"), Some("EX 1-2"));
        assert_eq!(f.well_value("STRT"), Some("48.5000"));
        assert!(nan_eq(
            f.curve_data("GR").expect("GR"),
            &[10.0, 20.0, f64::NAN]
        ));
        assert!(f.warnings.is_empty(), "{:?}", f.warnings);
    }
}

/// A regression fixture in tests/data/las-regress, read as given.
fn regress(name: &str, strict: bool) -> Result<LasFile, flowzone::input::las::LasError> {
    let bytes = std::fs::read(root().join("tests/data/las-regress").join(name)).expect("fixture");
    read_bytes(
        &bytes,
        Path::new(name),
        ReadOptions {
            strict,
            ..ReadOptions::default()
        },
    )
}

/// Silent misread 1: ~C lists DEPT last, the `~A` line and the data put
/// depth first. Read in the `~A` line's order (values off the fixture text:
/// depth 1000-1001 ft, GR 45-55, RHOB 2.71-2.60), with a warning on the
/// `~A` line; refused under `--strict` (a contradiction, CWLS LAS 2.0 puts
/// the index first in ~C and the ~A columns in ~C order).
#[test]
fn depth_last_in_curve_section_is_read_in_the_title_order() {
    let f = regress("depth-last-in-curve-section.las", false)
        .unwrap_or_else(|e| panic!("{}", chain(&e)));
    let names: Vec<&str> = f.curves.iter().map(|c| c.mnemonic.as_str()).collect();
    assert_eq!(names, ["DEPT", "GR", "RHOB"]);
    assert_eq!(f.columns[0], [1000.0, 1000.5, 1001.0]);
    assert_eq!(f.curve_data("GR").expect("GR"), [45.0, 50.0, 55.0]);
    assert_eq!(f.curve_data("RHOB").expect("RHOB"), [2.71, 2.65, 2.60]);
    assert_eq!(f.curves[2].unit, "G/CC");
    let w: Vec<String> = f.warnings.iter().map(ToString::to_string).collect();
    assert!(
        w.iter()
            .any(|m| m.starts_with("line 14: ~A line names the curves in another order than ~C")),
        "{w:?}"
    );
    let err = regress("depth-last-in-curve-section.las", true).expect_err("strict refuses");
    assert!(
        chain(&err).contains("depth-last-in-curve-section.las:14:"),
        "{}",
        chain(&err)
    );
}

/// Silent misread 2: lines ending in a bare CR. Each header line is its own
/// line, NULL -999.25 applies (GR at 1000.5 m is missing) and the warning
/// says what was done.
#[test]
fn bare_cr_line_ends_are_line_ends() {
    let f = regress("bare-cr-line-ends.las", false).unwrap_or_else(|e| panic!("{}", chain(&e)));
    assert_eq!(f.null_value, Some(-999.25));
    assert_eq!(f.well_value("WELL"), Some("INVENTED-2"));
    assert_eq!(f.columns[0], [1000.0, 1000.5, 1001.0]);
    assert!(nan_eq(
        f.curve_data("GR").expect("GR"),
        &[45.0, f64::NAN, 55.0]
    ));
    let w: Vec<String> = f.warnings.iter().map(ToString::to_string).collect();
    assert!(w.iter().any(|m| m.contains("end in a bare CR")), "{w:?}");
    assert!(!w.iter().any(|m| m.contains("no NULL")), "{w:?}");
}

/// A row without a depth is refused with its line, never kept.
#[test]
fn missing_depth_is_refused_with_its_line() {
    let err = regress("missing-depth.las", false).expect_err("refused");
    assert_eq!(
        chain(&err),
        "missing-depth.las:16: the index (first column) has no value on this row (`NaN`): a row without a depth cannot be placed"
    );
}
