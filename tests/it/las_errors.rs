//! The corpus of malformed files in tests/data/las-bad and tests/data/las-warn:
//! each gives exactly the error (or the warnings) written here, reviewed by hand
//! against the file (line numbers counted in the file, whose first line is a
//! `#` comment naming the case). Every case also runs with CRLF line endings,
//! which must change nothing.

use std::path::Path;

use flowzone::input::las::{ReadOptions, read_bytes};

use crate::common::{chain, crlf, root};

const BAD: &[(&str, &str)] = &[
    (
        "bad-null.las",
        "bad-null.las:9: NULL value `none` is not a finite number",
    ),
    (
        "bad-wrap.las",
        "bad-wrap.las:4: WRAP is `MAYBE`, expected YES or NO",
    ),
    (
        "binary-lidar.las",
        "binary-lidar.las: file is a binary LiDAR LAS file (`LASF` signature), not a well-log LAS file",
    ),
    ("blank-only.las", "blank-only.las: file is empty"),
    (
        "curve-without-dot.las",
        "curve-without-dot.las:14: curve line has no `.` after the mnemonic (expected `MNEM.UNIT  API CODE : DESCRIPTION`)",
    ),
    ("empty.las", "empty.las: file is empty"),
    (
        "extra-values.las",
        "extra-values.las:18: row has 5 values, ~C declares 3 curves",
    ),
    (
        "infinite-value.las",
        "infinite-value.las:16: value 2 of the row, `inf`, is infinite",
    ),
    (
        "malformed-number.las",
        "malformed-number.las:18: value 3 of the row, `2.33.0`, is not a number",
    ),
    ("missing-a.las", "missing-a.las: no ~A section"),
    ("missing-c.las", "missing-c.las: no ~C section"),
    ("missing-v.las", "missing-v.las: no ~V section"),
    ("no-rows.las", "no-rows.las: ~A holds no data rows"),
    (
        "non-utf8-in-data.las",
        "non-utf8-in-data.las:18: byte 0xB0 is not allowed in ~A (numbers separated by spaces expected)",
    ),
    (
        "repeated-section.las",
        "repeated-section.las:11: section ~W appears a second time",
    ),
    (
        "text-in-column.las",
        "text-in-column.las:17: value 2 of the row, `abc`, is not a number",
    ),
    (
        "wrapped-truncated.las",
        "wrapped-truncated.las:18: file ends inside a wrapped depth step that starts here: 2 of 3 values",
    ),
    ("zero-curves.las", "zero-curves.las: ~C declares no curves"),
];

/// Readable files that contradict themselves: the warnings by default, and the
/// first of them as an error in strict mode.
const WARN: &[(&str, &[&str])] = &[
    (
        "a-names-disagree.las",
        &["line 15: ~A line names column 2 `RHOB` where ~C declares `GR`"],
    ),
    (
        "index-not-first.las",
        &[
            "line 13: index curve DEPT is not first in ~C; the first curve, GR, is used as the index",
            "line 18: index is not monotonic: 41.7 follows 88.1",
            "line 6: STRT is 1500 but the index starts at 35.2",
            "line 7: STOP is 1501 but the index ends at 41.7",
        ],
    ),
    (
        "non-monotonic.las",
        &[
            "line 18: index is not monotonic: 1500.2 follows 1500.5",
            "line 7: STOP is 1501 but the index ends at 1500.2",
        ],
    ),
    (
        "step-contradicts.las",
        &["line 8: STEP is 0.25 but the index steps by 0.5"],
    ),
    (
        "strt-stop-contradict.las",
        &[
            "line 6: STRT is 1400 but the index starts at 1500",
            "line 7: STOP is 1601 but the index ends at 1501",
        ],
    ),
];

fn corpus(dir: &str) -> Vec<String> {
    let mut names: Vec<String> = std::fs::read_dir(root().join("tests/data").join(dir))
        .expect("corpus folder")
        .map(|e| e.expect("entry").file_name().to_string_lossy().into_owned())
        .collect();
    names.sort();
    names
}

#[test]
fn every_bad_file_gives_its_error_with_file_and_line() {
    let names = corpus("las-bad");
    assert_eq!(
        names.len(),
        BAD.len(),
        "each corpus file needs an expected error here"
    );
    for name in names {
        let (_, expected) = BAD
            .iter()
            .find(|(n, _)| *n == name)
            .unwrap_or_else(|| panic!("no expectation for {name}"));
        let bytes = std::fs::read(root().join("tests/data/las-bad").join(&name)).expect("read");
        for (label, input) in [("LF", bytes.clone()), ("CRLF", crlf(&bytes))] {
            let err = read_bytes(&input, Path::new(&name), ReadOptions::default())
                .expect_err(&format!("{name} ({label}) must fail"));
            assert_eq!(chain(&err), *expected, "{name} ({label})");
        }
    }
}

#[test]
fn contradictions_warn_and_strict_mode_refuses() {
    let names = corpus("las-warn");
    assert_eq!(
        names.len(),
        WARN.len(),
        "each corpus file needs expected warnings here"
    );
    for name in names {
        let (_, expected) = WARN
            .iter()
            .find(|(n, _)| *n == name)
            .unwrap_or_else(|| panic!("no expectation for {name}"));
        let bytes = std::fs::read(root().join("tests/data/las-warn").join(&name)).expect("read");
        for (label, input) in [("LF", bytes.clone()), ("CRLF", crlf(&bytes))] {
            let file = read_bytes(&input, Path::new(&name), ReadOptions::default())
                .unwrap_or_else(|e| panic!("{name}: {}", chain(&e)));
            let got: Vec<String> = file.warnings.iter().map(ToString::to_string).collect();
            assert_eq!(got, *expected, "{name} ({label})");
            let err = read_bytes(
                &input,
                Path::new(&name),
                ReadOptions {
                    strict: true,
                    ..ReadOptions::default()
                },
            )
            .expect_err("strict refuses");
            let first = expected[0].strip_prefix("line ").expect("line prefix");
            let (line, message) = first.split_once(": ").expect("line: message");
            assert_eq!(
                chain(&err),
                format!("{name}:{line}: {message}"),
                "{name} ({label}) strict"
            );
        }
    }
}

/// Damaged files with one unambiguous repair each (tests/data/las-repair):
/// the repair counted by kind, its warning, the values read (off each
/// fixture's text by hand), and under `--strict` a refusal at the same
/// place saying it is a repair.
const REPAIRED: &[(&str, &str, &str)] = &[
    (
        "empty-and-dotted-mnemonics.las",
        "empty mnemonic named",
        "line 13: curve 2 has no mnemonic: named UNKNOWN_2",
    ),
    (
        "missing-vers.las",
        "missing VERS inferred",
        "~V has no VERS line: read as LAS 2.0",
    ),
    (
        "missing-wrap.las",
        "missing WRAP inferred",
        "~V has no WRAP line: read as unwrapped (one line per depth step); a wrapped file then fails at its first row",
    ),
    (
        "null-spellings.las",
        "null spellings read as missing",
        "line 16: 4 value(s) written as a known null spelling (first `-1.#IND0000`) read as missing",
    ),
    (
        "truncated-row.las",
        "short last row dropped",
        "line 18: the last row has 2 of 3 values (the file was cut off): dropped",
    ),
    (
        "utf16le-bom.las",
        "UTF-16 decoded",
        "the file is UTF-16 (little-endian, byte-order mark): decoded to text",
    ),
    (
        "vers-2.1.las",
        "2.x version read as 2.0",
        "line 3: VERS 2.1 is no CWLS version: read as LAS 2.0",
    ),
];

#[test]
fn damaged_files_are_repaired_counted_and_refused_when_strict() {
    let names = corpus("las-repair");
    assert_eq!(
        names.len(),
        REPAIRED.len(),
        "each repair file needs an expectation"
    );
    for (name, kind, warning) in REPAIRED {
        let bytes = std::fs::read(root().join("tests/data/las-repair").join(name)).expect("read");
        let f = read_bytes(&bytes, Path::new(name), ReadOptions::default())
            .unwrap_or_else(|e| panic!("{name}: {}", chain(&e)));
        assert!(f.repairs.contains_key(*kind), "{name}: {:?}", f.repairs);
        let got: Vec<String> = f.warnings.iter().map(ToString::to_string).collect();
        assert_eq!(got[0], *warning, "{name}");
        let err = read_bytes(
            &bytes,
            Path::new(name),
            ReadOptions {
                strict: true,
                ..ReadOptions::default()
            },
        )
        .expect_err("strict refuses a repair");
        let text = chain(&err);
        let message = warning
            .split_once(": ")
            .filter(|(l, _)| l.starts_with("line "))
            .map_or(*warning, |(_, m)| m);
        assert!(
            text.ends_with(&format!("{message} (a repair; refused under --strict)")),
            "{name}: {text}"
        );
    }
    let read = |name: &str| {
        let bytes = std::fs::read(root().join("tests/data/las-repair").join(name)).expect("read");
        read_bytes(&bytes, Path::new(name), ReadOptions::default()).expect("repaired")
    };
    let nan = f64::NAN;
    let same = |a: &[f64], b: &[f64]| {
        a.len() == b.len()
            && a.iter()
                .zip(b)
                .all(|(x, y)| (x.is_nan() && y.is_nan()) || x == y)
    };
    let f = read("null-spellings.las");
    assert!(same(f.curve_data("GR").expect("GR"), &[nan, 88.1, nan]));
    assert!(same(f.curve_data("RHOB").expect("RHOB"), &[2.35, nan, nan]));
    assert_eq!(f.repairs["null spellings read as missing"], 4);
    let f = read("empty-and-dotted-mnemonics.las");
    let names: Vec<&str> = f.curves.iter().map(|c| c.mnemonic.as_str()).collect();
    assert_eq!(names, ["DEPT", "UNKNOWN_2", "RHOB"]);
    assert_eq!(f.curve_data("RHOB").expect("RHOB"), [2.35, 2.34, 2.33]);
    assert_eq!(
        read("utf16le-bom.las").curve_data("GR").expect("GR"),
        [35.2, 88.1, 41.7]
    );
    assert_eq!(read("truncated-row.las").index(), [1500.0, 1500.5]);
}
