//! The pressure-points CSV reader, then both FWL fits, on arbitrary bytes:
//! refuse or fit, never panic. Every point kept is finite with a positive
//! pressure, and a free water level given is a finite depth and pressure
//! (its sigma may be NaN: two points per leg leave no degrees of freedom).
#![no_main]
use flowzone::sat_height::fwl::{FwlFit, fit_fwl_auto, fit_fwl_split_at};
use flowzone::sat_height::read_pressure_points;
use flowzone::units::DepthUnit;
use libfuzzer_sys::fuzz_target;
mod common;

fn check(fit: &FwlFit) {
    assert!(fit.fwl_tvdss_m.is_finite(), "FWL depth {}", fit.fwl_tvdss_m);
    assert!(
        fit.fwl_pressure_psi.is_finite(),
        "FWL pressure {}",
        fit.fwl_pressure_psi
    );
    assert!(!(fit.fwl_sigma_m < 0.0), "FWL sigma {}", fit.fwl_sigma_m);
}

fuzz_target!(|data: &[u8]| {
    common::with_file(data, "csv", |p| {
        // points given by MD: a vertical well with its datum 30 m above sea level
        let tvdss_of = |_: &str, md: f64| Ok(md - 30.0);
        let Ok((obs, _left_out)) =
            read_pressure_points(p, DepthUnit::Metre, &["poor".to_string()], &tvdss_of)
        else {
            return;
        };
        assert!(
            obs.iter()
                .all(|o| o.tvdss_m.is_finite() && o.psi.is_finite() && o.psi > 0.0)
        );
        let points: Vec<(f64, f64)> = obs.iter().map(|o| (o.tvdss_m, o.psi)).collect();
        if let Ok(f) = fit_fwl_auto(&points, 2) {
            check(&f);
        }
        if let Some(&(split, _)) = points.get(points.len() / 2) {
            if let Ok(f) = fit_fwl_split_at(&points, split) {
                check(&f);
            }
        }
    });
});
