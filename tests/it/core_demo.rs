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
use flowzone::input::core_samples::read_core_csv;
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

/// The depth-shift suggestion finds the demo's known core offset: Tarnby-3
/// core depths read 0.60 m deeper than log depth (demo-wells/README.md), so the
/// shift is −0.60 m; Tarnby-2 and Tarnby-5 have none. Searched ±2 m in 0.05 m
/// steps against the run's PHIE, sampled every 0.1524 m, with the model's core
/// and log noise, a shift suggested only when it raises the correlation by
/// 0.01 or more: within 0.1 m (two search steps) of the known value. (Without
/// that rule Tarnby-2's best shift is 0.15 m for a correlation gain of 0.001.)
#[test]
fn core_shift_suggestion_finds_the_known_offset() {
    let core =
        read_core_csv(&root().join("demo-wells/core.csv"), DepthUnit::Metre).expect("readable");
    let out = tempfile::tempdir().expect("temp dir");
    crate::common::run_demo_field(out.path());
    let mut results = Vec::new();
    for (well, known) in [("Tarnby-2", 0.0), ("Tarnby-3", -0.6), ("Tarnby-5", 0.0)] {
        let csv = std::fs::read_to_string(
            out.path()
                .join(format!("wells/{}.csv", well.to_ascii_lowercase())),
        )
        .expect("run output");
        let (mut depth, mut phie) = (Vec::new(), Vec::new());
        for line in csv.lines().skip(1) {
            let f: Vec<&str> = line.split(',').collect();
            depth.push(f[0].parse::<f64>().expect("depth"));
            phie.push(f[4].parse::<f64>().unwrap_or(f64::NAN));
        }
        let samples: Vec<_> = core
            .samples
            .iter()
            .filter(|s| s.well == well)
            .cloned()
            .collect();
        let s =
            flowzone::input::core_samples::suggest_shift(&samples, &depth, &phie, 2.0, 0.05, 0.01)
                .expect("overlap");
        eprintln!(
            "{well}: suggested shift {:.2} m (r {:.3}, unshifted r {:.3}, {} samples)",
            s.shift, s.correlation, s.correlation_unshifted, s.samples
        );
        results.push((well, known, s));
    }
    for (well, known, s) in &results {
        assert!((s.shift - known).abs() <= 0.1 + 1e-9, "{well}: {s:?}");
    }
}

/// Permeability from class and porosity on the demo core (FZI ladder as
/// above): the class FZI of each class is near the model's class centre
/// (0.4, 1.0, 2.5, 5.5 µm; the model spreads beds by σ 0.12 in ln FZI and adds
/// core noise, so within 25 %), and the class FZI form predicts the core's
/// permeability with an RMS of log10 residuals at most 0.2 (the model's core
/// noise is σ 0.1 in log10 k, plus the bed spread, about 0.052 in log10 FZI → 0.1 in log10 k).
#[test]
fn permeability_from_class_on_demo_core() {
    let core =
        read_core_csv(&root().join("demo-wells/core.csv"), DepthUnit::Metre).expect("readable");
    let ladder = FziLadder {
        bounds: vec![
            (0.4f64 * 1.0).sqrt(),
            (1.0f64 * 2.5).sqrt(),
            (2.5f64 * 5.5).sqrt(),
        ],
    };
    let samples: Vec<(u8, f64, f64)> = core
        .samples
        .iter()
        .filter_map(|s| {
            ladder
                .classify(s.porosity, s.perm_md)
                .map(|c| (c, s.porosity, s.perm_md))
        })
        .collect();
    let fits = flowzone::classes::perm::fit(&samples);
    let centres = [0.4, 1.0, 2.5, 5.5];
    for f in &fits {
        let centre = centres[usize::from(f.class) - 1];
        eprintln!(
            "class {}: {} samples, FZI {:.3} um (model {centre}), rms log10 k {:.3} (FZI form), {:.3} (line)",
            f.class,
            f.samples,
            f.fzi_um,
            f.fzi_rms_log10,
            f.line_rms_log10.unwrap_or(f64::NAN)
        );
        if f.samples >= 10 {
            assert!(
                (f.fzi_um / centre - 1.0).abs() <= 0.25,
                "class {}: FZI {} vs {centre}",
                f.class,
                f.fzi_um
            );
            assert!(
                f.fzi_rms_log10 <= 0.2,
                "class {}: rms {}",
                f.class,
                f.fzi_rms_log10
            );
        }
    }
    assert!(
        fits.iter().filter(|f| f.samples >= 10).count() >= 3,
        "{fits:?}"
    );
}
