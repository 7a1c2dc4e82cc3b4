//! Interoperability with lasio (PyPI), the general-purpose Python LAS reader:
//! LAS files flowzone writes are read by lasio with the same values, and LAS
//! files lasio writes are read by flowzone with the same values.

use std::path::Path;

use flowzone::config::Format;
use flowzone::input::las::{ReadOptions, read_path};
use serde_json::json;

use crate::common::{assert_same_values, chain, json_values, lasio_dump, lasio_write, shared};

/// Every readable real sample, exported by flowzone as LAS 2.0, reads back in
/// lasio with the values flowzone read from the original (the writer picks
/// enough decimals per curve to write each value exactly; tolerance 1e-9 relative).
#[test]
#[ignore = "needs lasio in .venv and ../shared/las-samples: run `bash .ci/run`"]
fn files_flowzone_writes_are_read_by_lasio() {
    let dir = tempfile::tempdir().expect("temp dir");
    let samples = [
        "1001178549.las",
        "6038187_v1.2.las",
        "ex1_1045399775.las",
        "ex2_1044839000.las",
        "ex4_1044782786.las",
        "ex7_1045627887.las",
        "F02-1_logs.las",
        "sample_2.0_wrapped.las",
        "00-10-26-083-05W4-0.LAS",
    ];
    for name in samples {
        let src = shared().join("las-samples").join(name);
        let ours =
            read_path(&src, ReadOptions::default()).unwrap_or_else(|e| panic!("{}", chain(&e)));
        let written = flowzone::cli::export::export_file(&ours, &src, dir.path(), Format::Las)
            .unwrap_or_else(|e| panic!("{}", chain(&e)));
        let theirs =
            lasio_dump(&written).unwrap_or_else(|e| panic!("lasio cannot read our {name}: {e}"));
        let curves = theirs["curves"].as_array().expect("curves");
        assert_eq!(curves.len(), ours.curves.len(), "{name}");
        assert_eq!(theirs["version"], "2.0");
        for (i, c) in curves.iter().enumerate() {
            assert_eq!(
                c["mnemonic"].as_str().map(str::to_ascii_uppercase),
                Some(ours.curves[i].mnemonic.to_ascii_uppercase()),
                "{name}"
            );
            assert_same_values(
                &format!("{name} {}", ours.curves[i].mnemonic),
                &ours.columns[i],
                &json_values(c),
                1e-9,
            );
        }
        // and flowzone reads its own file back to the same values, with no warnings
        let again =
            read_path(&written, ReadOptions::default()).unwrap_or_else(|e| panic!("{}", chain(&e)));
        assert!(again.warnings.is_empty(), "{name}: {:?}", again.warnings);
        for (i, col) in again.columns.iter().enumerate() {
            assert_same_values(
                &format!("{name} reread {}", again.curves[i].mnemonic),
                col,
                &ours.columns[i],
                1e-9,
            );
        }
        assert_eq!(again.well_value("WELL"), ours.well_value("WELL"), "{name}");
    }
}

/// A file lasio writes (its own formatting and header layout) reads in flowzone
/// with the values given to lasio (five decimals or fewer, so lasio's text is exact).
#[test]
#[ignore = "needs lasio in .venv: run `bash .ci/run`"]
fn files_lasio_writes_are_read_by_flowzone() {
    let dir = tempfile::tempdir().expect("temp dir");
    let depth: Vec<f64> = (0..200).map(|i| 1200.0 + 0.5 * f64::from(i)).collect();
    let gr: Vec<Option<f64>> = (0..200)
        .map(|i| {
            if i % 37 == 5 {
                None
            } else {
                Some(20.0 + f64::from(i % 90) * 1.25)
            }
        })
        .collect();
    let rhob: Vec<f64> = (0..200).map(|i| 2.2 + f64::from(i % 40) * 0.0125).collect();
    let rt: Vec<f64> = (0..200)
        .map(|i| 0.2 * 1.05f64.powi(i % 50))
        .map(|v| (v * 1e5).round() / 1e5)
        .collect();
    let spec = json!({
        "well": {"WELL": "LASIO WRITTEN 1", "COMP": "TEST CO"},
        "curves": [
            {"mnemonic": "DEPT", "unit": "M", "data": depth},
            {"mnemonic": "GR", "unit": "GAPI", "data": gr},
            {"mnemonic": "RHOB", "unit": "G/CC", "data": rhob},
            {"mnemonic": "RT", "unit": "OHMM", "data": rt},
        ]
    });
    let path = dir.path().join("lasio-written.las");
    lasio_write(&spec, &path);
    let f = read_path(Path::new(&path), ReadOptions::default())
        .unwrap_or_else(|e| panic!("{}", chain(&e)));
    assert_eq!(f.well_value("WELL"), Some("LASIO WRITTEN 1"));
    assert!(f.warnings.is_empty(), "{:?}", f.warnings);
    for (i, c) in spec["curves"]
        .as_array()
        .expect("curves")
        .iter()
        .enumerate()
    {
        assert_eq!(f.curves[i].mnemonic, c["mnemonic"].as_str().expect("name"));
        assert_eq!(f.curves[i].unit, c["unit"].as_str().expect("unit"));
        assert_same_values(&f.curves[i].mnemonic, &f.columns[i], &json_values(c), 1e-12);
    }
}
