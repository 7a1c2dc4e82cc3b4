//! The demo field's core (demo-wells/core.csv): read, classed with an FZI
//! ladder whose boundaries sit at the geometric midpoints of the model's class
//! centres (0.4, 1.0, 2.5, 5.5 µm → 0.632, 1.581, 3.708), and compared with the
//! model's truth class at the same depth. Tarnby-3 is left out: its core depths
//! carry a known 0.6 m shift (demo-wells/README.md) that a later stage corrects.
//! The model's core noise (σ 0.01 porosity, σ 0.1 in log10 k, so FZI scatters
//! by about ±12 % against a factor of 2.2-2.5 between class centres) and samples
//! within a plug length of a bed boundary allow some misses: at least 90 % must
//! agree.

use flowzone::classes::{ClassScheme, FziLadder};
use flowzone::core_data::read_core_csv;
use flowzone::units::DepthUnit;

use crate::common::root;

#[test]
fn demo_core_classes_match_the_model() {
    let core =
        read_core_csv(&root().join("demo-wells/core.csv"), DepthUnit::Metre).expect("readable");
    assert!(core.rejected.is_empty(), "{:?}", core.rejected);
    assert_eq!(core.porosity_unit, "fraction (POROSITY_FRAC)");
    let ladder = FziLadder {
        bounds: vec![
            (0.4f64 * 1.0).sqrt(),
            (1.0f64 * 2.5).sqrt(),
            (2.5f64 * 5.5).sqrt(),
        ],
    };
    let (mut agree, mut total) = (0usize, 0usize);
    for well in ["Tarnby-2", "Tarnby-5"] {
        let stem = well.to_ascii_lowercase();
        let truth = std::fs::read_to_string(root().join(format!("demo-wells/truth/{stem}.csv")))
            .expect("truth");
        let rows: Vec<(f64, i64)> = truth
            .lines()
            .skip(1)
            .map(|l| {
                let f: Vec<&str> = l.split(',').collect();
                (f[0].parse().expect("depth"), f[8].parse().expect("class"))
            })
            .collect();
        for s in core.samples.iter().filter(|s| s.well == well) {
            let nearest = rows
                .iter()
                .min_by(|a, b| (a.0 - s.depth).abs().total_cmp(&(b.0 - s.depth).abs()))
                .expect("rows");
            if nearest.1 < 1 {
                continue;
            }
            total += 1;
            agree += usize::from(ladder.classify(s.porosity, s.perm_md) == Some(nearest.1 as u8));
        }
    }
    assert!(total > 50, "only {total} core samples in reservoir beds");
    let rate = agree as f64 / total as f64;
    eprintln!("demo core: FZI classes agree at {agree} of {total} samples ({rate:.3})");
    assert!(
        rate >= 0.9,
        "FZI classes agree with the model at {agree} of {total} samples ({rate:.3})"
    );
}
