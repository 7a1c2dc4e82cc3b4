//! `flowzone run` on the demo field recovers the synthetic model's truth
//! (demo-wells/truth/*.csv, written by the same forward model as the logs).
//!
//! Tolerances, per well, over reservoir samples (truth CLASS ≥ 1) that are
//! interpreted and not flagged bad hole or out of range:
//! - TVDSS within 0.001 m everywhere (truth is written to 6 decimals; the
//!   deviated well is built with the same minimum-curvature survey).
//! - VSH: |bias| ≤ 0.01, RMS ≤ 0.03. The GR noise of the model (σ 2.5 gAPI over
//!   a 105 gAPI clean-to-shale range) alone gives an RMS of 0.024.
//! - PHIE: |bias| ≤ 0.01, RMS ≤ 0.015. Density noise (σ 0.012 g/cm3 → 0.0076 in
//!   φD), neutron noise (σ 0.008) and VSH noise times the shale correction
//!   (0.024 × 0.207) give about 0.007; the light oil lowers the density and the
//!   neutron hydrogen index, which the neutron-density mean only partly offsets
//!   (a bias of +0.004 to +0.007 is expected in the oil leg).
//! - SW: |bias| ≤ 0.02, RMS ≤ 0.05. SW uses the exponents of the predicted
//!   class (the model's 1.8-2.1; a wrong class moves m and n by 0.1, and the
//!   zone's m = n = 2 where there is no class), porosity errors of 0.009 move
//!   SW by about (m/n)·δφ/φ ≈ 5 % relative, and resistivity noise (σ 3 % in
//!   ln Rt) adds about 1.5 %. SW_FIXED against SW is measured in sat_height.rs.

use std::collections::HashMap;

use crate::common::{root, run_demo_field};

fn read_csv(path: &std::path::Path) -> Vec<HashMap<String, String>> {
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    let mut lines = text.lines();
    let header: Vec<String> = lines
        .next()
        .expect("header")
        .split(',')
        .map(String::from)
        .collect();
    lines
        .map(|l| {
            header
                .iter()
                .cloned()
                .zip(l.split(',').map(String::from))
                .collect()
        })
        .collect()
}

fn num(row: &HashMap<String, String>, key: &str) -> f64 {
    row.get(key)
        .and_then(|v| v.parse().ok())
        .unwrap_or(f64::NAN)
}

fn stats(d: &[f64]) -> (f64, f64) {
    let n = d.len() as f64;
    (
        d.iter().sum::<f64>() / n,
        (d.iter().map(|x| x * x).sum::<f64>() / n).sqrt(),
    )
}

#[test]
fn demo_truth_is_recovered() {
    let out = tempfile::tempdir().expect("temp dir");
    run_demo_field(out.path());
    for i in 1..=8 {
        let ours = read_csv(&out.path().join(format!("wells/tarnby-{i}.csv")));
        let truth = read_csv(&root().join(format!("demo-wells/truth/tarnby-{i}.csv")));
        assert_eq!(ours.len(), truth.len(), "tarnby-{i}: rows");
        let (mut dv, mut dp, mut ds) = (Vec::new(), Vec::new(), Vec::new());
        for (o, t) in ours.iter().zip(&truth) {
            assert!(
                (num(o, "TVDSS") - num(t, "TVDSS_M")).abs() < 1e-3,
                "tarnby-{i}: TVDSS"
            );
            let flag = num(o, "FLAG") as u32;
            if num(t, "CLASS") < 1.0 || flag & 3 != 0 || !num(o, "PHIE").is_finite() {
                continue;
            }
            dv.push(num(o, "VSH") - num(t, "VSH"));
            dp.push(num(o, "PHIE") - num(t, "PHIE"));
            if num(o, "SW").is_finite() {
                ds.push(num(o, "SW") - num(t, "SW"));
            }
        }
        assert!(
            dp.len() > 400,
            "tarnby-{i}: only {} reservoir samples compared",
            dp.len()
        );
        for (name, d, bias_tol, rms_tol) in [
            ("VSH", &dv, 0.01, 0.03),
            ("PHIE", &dp, 0.01, 0.015),
            ("SW", &ds, 0.02, 0.05),
        ] {
            let (bias, rms) = stats(d);
            assert!(
                bias.abs() <= bias_tol && rms <= rms_tol,
                "tarnby-{i} {name}: bias {bias:.4} (±{bias_tol}), rms {rms:.4} (≤ {rms_tol})"
            );
        }
    }
}
