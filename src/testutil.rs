//! Test helpers (compiled for tests only).

/// Assert `actual` is within `tol` of `expected`, printing both.
#[track_caller]
pub fn assert_close(actual: f64, expected: f64, tol: f64) {
    assert!(
        (actual - expected).abs() <= tol,
        "expected {expected} ± {tol}, got {actual}"
    );
}
