//! las_rs 0.2.1 (crates.io), an independent Rust LAS reader, as a second
//! oracle on well-formed files: the same curves and the same values. It is
//! used only here, because it misreads several layouts our reader handles
//! (see DEVELOPERS.md, "The LAS reader").

use flowzone::input::las::{ReadOptions, read_path};

use std::path::PathBuf;

use crate::common::{assert_same_values, chain, real, root, shared};

/// The committed real files and a hand-written one.
#[test]
fn las_rs_agrees_on_well_formed_files() {
    agree(&[
        real("6038187_v1.2.las"),
        real("multi_channel.las"),
        root().join("tests/data/las/irregular-decreasing-duplicates.las"),
    ]);
}

/// The larger real samples beside the checkout.
#[test]
#[ignore = "needs ../shared/las-samples: run `bash .ci/run`"]
fn las_rs_agrees_on_the_shared_samples() {
    agree(&[
        shared().join("las-samples/ex7_1045627887.las"),
        shared().join("las-samples/F02-1_logs.las"),
        shared().join("las-samples/00-10-26-083-05W4-0.LAS"),
    ]);
}

fn agree(files: &[PathBuf]) {
    for path in files {
        let ours =
            read_path(path, ReadOptions::default()).unwrap_or_else(|e| panic!("{}", chain(&e)));
        let theirs =
            las_rs::read_file(path).unwrap_or_else(|e| panic!("las_rs: {}: {e:?}", path.display()));
        let names = theirs.curve_mnemonics();
        assert_eq!(names.len(), ours.curves.len(), "{}", path.display());
        for (i, name) in names.iter().enumerate() {
            let mut v = theirs.curve_data(name).expect("curve data").to_vec();
            if ours.index_reversed {
                v.reverse();
            }
            assert_same_values(
                &format!("{} {name}", path.display()),
                &ours.columns[i],
                &v,
                1e-12,
            );
        }
    }
}
