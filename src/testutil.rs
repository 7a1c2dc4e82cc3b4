//! Test helpers (compiled for tests only).

/// Assert `actual` is within `tol` of `expected`, printing both.
#[track_caller]
pub fn assert_close(actual: f64, expected: f64, tol: f64) {
    assert!(
        (actual - expected).abs() <= tol,
        "expected {expected} ± {tol}, got {actual}"
    );
}

/// A Brooks-Corey J-curve (entry J, pore-size index λ, irreducible Sw) with
/// no fit statistics, for tests that build saturation-height models by hand.
pub fn brooks_corey_j(jd: f64, lambda: f64, swirr: f64) -> crate::sat_height::lab_curves::JCurve {
    crate::sat_height::lab_curves::JCurve::BrooksCorey(
        crate::sat_height::lab_curves::BrooksCoreyJ {
            jd,
            lambda,
            swirr,
            rms_sw: 0.0,
            points: 0,
        },
    )
}
