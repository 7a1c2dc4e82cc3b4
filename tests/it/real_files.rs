//! Every file in ../shared/las-samples (real, openly licensed; provenance in
//! ../shared/las-samples/PROVENANCE.md) is either read and checked against the
//! Python reader lasio 0.32, or refused with the error written here, and the
//! reason for the refusal is stated beside it.

use std::path::Path;

use flowzone::input::las::{ReadOptions, read_bytes};

use crate::common::{assert_same_values, chain, json_values, lasio_dump, real, shared};

/// Files flowzone refuses, with the whole error and why that is right.
const REFUSED: &[(&str, &str)] = &[];

/// Files flowzone reads by a repair that lasio cannot read: (file, repair,
/// rows, last index). `ex10`: a stray value `59` on the last line, a short
/// row; the 6,274 full rows end at 9618.00 (counted with awk: rows of four
/// values after `~A`). lasio fails to reshape the data.
const REPAIRED_ONLY_OURS: &[(&str, &str, usize, f64)] = &[(
    "ex10_1046102494.las",
    "short last row dropped",
    6274,
    9618.0,
)];

/// Units lasio reports differently, and why ours is the file's text.
/// (file, unit as written, unit as lasio gives it).
const UNIT_EXCEPTIONS: &[(&str, &str, &str)] = &[
    // lasio drops the outer brackets of `(m/s)*(kg/m3)`; we keep the unit as written.
    ("F02-1_logs.las", "(m/s)*(kg/m3)", "m/s)*(kg/m3"),
];

/// Header facts checked per file, from PROVENANCE.md (what the file holds, read
/// there independently of both readers): rows, first and last index in file order.
const FACTS: &[(&str, usize, f64, f64)] = &[
    ("1001178549.las", 5, 1783.5, 1784.5),
    ("6038187_v1.2.las", 2732, 0.05, 136.6),
    ("alog.las", 24, 0.0, 0.0),
    ("multi_channel.las", 5, 7508.0, 7506.0),
    ("sample_2.0_wrapped.las", 2, 910.0, 909.875),
    ("ex1_1045399775.las", 4520, 48.5, 2308.0),
    ("ex2_1044839000.las", 641, 5270.5, 4950.5),
    ("ex4_1044782786.las", 64, 173.0, 5580.0),
    ("ex7_1045627887.las", 7481, 1650.0, 5390.0),
    ("00-10-26-083-05W4-0.LAS", 814, 60.9, 304.8),
    ("00-10-04-081-05W4-0.LAS", 508, 122.1, 274.2),
    ("Pechelbronn.las", 141, 139.0, 279.0),
    ("F02-1_logs.las", 9680, 48.0, 1499.85),
];

fn sample_files() -> Vec<std::path::PathBuf> {
    let dir = shared().join("las-samples");
    let mut files: Vec<_> = std::fs::read_dir(&dir)
        .unwrap_or_else(|e| {
            panic!(
                "{} must exist (../shared beside the checkout): {e}",
                dir.display()
            )
        })
        .map(|e| e.expect("dir entry").path())
        .filter(|p| p.extension().is_some_and(|x| x.eq_ignore_ascii_case("las")))
        .collect();
    files.sort();
    files
}

#[test]
#[ignore = "needs lasio in .venv and ../shared/las-samples: run `bash .ci/run`"]
fn every_real_file_is_read_like_lasio_or_refused_with_a_reason() {
    let files = sample_files();
    assert!(
        files.len() >= 25,
        "expected the 25 sample files, found {}",
        files.len()
    );
    let (mut compared, mut las3, mut repaired) = (0, 0, 0);
    for path in &files {
        let name = path
            .file_name()
            .expect("name")
            .to_string_lossy()
            .into_owned();
        let bytes = std::fs::read(path).expect("readable");
        let result = read_bytes(&bytes, Path::new(&name), ReadOptions::default());
        if let Some((_, kind, rows, last)) = REPAIRED_ONLY_OURS.iter().find(|(n, ..)| *n == name) {
            let f = result.unwrap_or_else(|e| panic!("{name}: {}", chain(&e)));
            assert_eq!(f.repairs.get(*kind), Some(&1), "{name}: {:?}", f.repairs);
            assert_eq!(
                (f.n_rows(), f.index().last().copied()),
                (*rows, Some(*last)),
                "{name}"
            );
            repaired += 1;
            continue;
        }
        if let Some((_, expected)) = REFUSED.iter().find(|(n, _)| *n == name) {
            let err = result.expect_err(&format!("{name} should be refused"));
            assert_eq!(chain(&err), *expected);
            continue;
        }
        let ours = result.unwrap_or_else(|e| panic!("{name}: {}", chain(&e)));
        if ours.version == flowzone::input::las::Version::V3_0 {
            // LAS 3.0: checked against the files themselves in las3.rs
            las3 += 1;
            continue;
        }
        let theirs = lasio_dump(path).unwrap_or_else(|e| panic!("lasio fails on {name}: {e}"));
        let curves = theirs["curves"].as_array().expect("curves");
        assert_eq!(ours.curves.len(), curves.len(), "{name}: curve count");
        for (i, (c, t)) in ours.curves.iter().zip(curves).enumerate() {
            // lasio upper-cases mnemonics by default; we keep the case as written
            assert_eq!(
                c.original_mnemonic.to_ascii_uppercase(),
                t["original"].as_str().unwrap_or_default(),
                "{name}: curve {i} mnemonic"
            );
            let lasio_unit = t["unit"].as_str().unwrap_or_default();
            let exception = UNIT_EXCEPTIONS
                .iter()
                .find(|(f, ours, theirs)| *f == name && *ours == c.unit && *theirs == lasio_unit);
            if exception.is_none() {
                assert_eq!(c.unit, lasio_unit, "{name}: {} unit", c.mnemonic);
            }
            let mut theirs_v = json_values(t);
            if ours.index_reversed {
                theirs_v.reverse();
            }
            assert_same_values(
                &format!("{name}: {}", c.mnemonic),
                &ours.columns[i],
                &theirs_v,
                1e-12,
            );
        }
        if let Some((_, rows, first, last)) = FACTS.iter().find(|(n, ..)| *n == name) {
            let idx = ours.index();
            assert_eq!(idx.len(), *rows, "{name}: rows");
            let (f, l) = if ours.index_reversed {
                (idx[idx.len() - 1], idx[0])
            } else {
                (idx[0], idx[idx.len() - 1])
            };
            // PROVENANCE.md prints the index rounded (1499.8501 as 1499.85): tolerance 5e-4
            assert!(
                (f - first).abs() < 5e-4 && (l - last).abs() < 5e-4,
                "{name}: index {f}..{l}, expected {first}..{last}"
            );
        }
        compared += 1;
    }
    assert_eq!(compared + las3 + repaired + REFUSED.len(), files.len());
    assert_eq!((compared, las3, repaired), (13, 11, 1));
}

/// Header rules on the Kansas Geological Survey files beside the checkout
/// (several MB each, so not committed), checked by hand against the file text.
#[test]
#[ignore = "needs ../shared/las-samples: run `bash .ci/run`"]
fn kgs_header_details() {
    let read = |name: &str| {
        let p = shared().join("las-samples").join(name);
        flowzone::input::las::read_path(&p, ReadOptions::default())
            .unwrap_or_else(|e| panic!("{}", chain(&e)))
    };
    // LAS 1.2: the ~W value sits in the description field (`COMP . COMPANY: McElvain Energy, Inc.`).
    let ex1 = read("ex1_1045399775.las");
    assert_eq!(ex1.well_value("COMP"), Some("McElvain Energy, Inc."));
    assert_eq!(ex1.well_value("WELL"), Some("JW 10-11"));
    // cp1252 degree sign decoded.
    assert_eq!(ex1.well_value("LATI"), Some("37\u{b0} 48' 2.2\" N"));
    // decreasing depth normalised to increasing.
    let ex2 = read("ex2_1044839000.las");
    assert!(ex2.index_reversed);
    assert!(ex2.index().windows(2).all(|w| w[1] > w[0]));
    // duplicate mnemonics kept and renamed, with a warning naming the line.
    assert!(ex2.curve_position("NPHI_LIM_2").is_some());
    assert!(
        ex2.warnings
            .iter()
            .any(|w| w.message == "curve NPHI_LIM appears again; this one is named NPHI_LIM_2")
    );
}

/// Header rules on the committed real files (tests/data/real), checked by
/// hand against the file text.
#[test]
fn real_header_details() {
    let read = |name: &str| {
        flowzone::input::las::read_path(&real(name), ReadOptions::default())
            .unwrap_or_else(|e| panic!("{}", chain(&e)))
    };
    // header inconsistent with data (PROVENANCE.md): three warnings with lines.
    let p = read("Pechelbronn.las");
    let w: Vec<String> = p.warnings.iter().map(ToString::to_string).collect();
    assert_eq!(
        w,
        vec![
            "line 8: STRT is 279 but the index starts at 139",
            "line 9: STOP is 129 but the index ends at 279",
            "line 10: STEP is 0.125 but the index steps by 1",
        ]
    );
    // wrapped CWLS example: 36 curves, 2 steps; RHOB unit `K/M` as distributed.
    let s = read("sample_2.0_wrapped.las");
    assert!(s.wrapped);
    assert_eq!(s.curves.len(), 36);
    assert_eq!(
        s.curves[s.curve_position("RHOB").expect("RHOB")].unit,
        "K/M"
    );
    // non-standard NULL -99999 applied.
    let sa = read("6038187_v1.2.las");
    assert_eq!(sa.null_value, Some(-99999.0));
    assert!(
        sa.curve_data("NEUT")
            .expect("NEUT")
            .iter()
            .any(|v| v.is_nan())
    );
}

/// Strict mode turns header contradictions into errors with the line.
#[test]
fn strict_mode_refuses_contradictions() {
    let bytes = std::fs::read(real("Pechelbronn.las")).expect("readable");
    let err = read_bytes(
        &bytes,
        Path::new("Pechelbronn.las"),
        ReadOptions {
            strict: true,
            ..ReadOptions::default()
        },
    )
    .expect_err("contradiction");
    assert_eq!(
        chain(&err),
        "Pechelbronn.las:8: STRT is 279 but the index starts at 139"
    );
}
