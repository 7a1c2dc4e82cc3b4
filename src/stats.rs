//! The statistics every stage shares, one definition each: quantiles and
//! percentiles, the median, linear interpolation in a table, the
//! least-squares line with its standard errors, and Pearson correlation.
//!
//! Conventions: missing values are NaN; a function that can have no answer
//! says so (`None` or NaN, as its doc states) rather than panicking.

pub mod dist;
pub mod sampling;

/// Sample quantile of ascending `sorted` at probability `p` (clamped to
/// [0, 1]): linear interpolation between the order statistics at position
/// `p (n − 1)`, Hyndman and Fan's definition 7 (Hyndman & Fan 1996, The
/// American Statistician 50(4); the default of R and numpy, from memory).
/// NaN for an empty slice.
pub fn quantile_sorted(sorted: &[f64], p: f64) -> f64 {
    let Some(last) = sorted.len().checked_sub(1) else {
        return f64::NAN;
    };
    let pos = (p.clamp(0.0, 1.0) * last as f64).max(0.0);
    let lo = (pos.floor() as usize).min(last);
    let frac = pos - lo as f64;
    if frac == 0.0 {
        return sorted[lo];
    }
    let hi = (lo + 1).min(last);
    sorted[lo] + frac * (sorted[hi] - sorted[lo])
}

/// Percentile `p` (0-100) of the finite values of `values`, by
/// [`quantile_sorted`]; NaN when none is finite.
pub fn percentile(values: &[f64], p: f64) -> f64 {
    let mut v: Vec<f64> = values.iter().copied().filter(|x| x.is_finite()).collect();
    v.sort_by(f64::total_cmp);
    quantile_sorted(&v, p / 100.0)
}

/// Median of `v` (sorted in place): the middle value, or the mean of the two
/// middle values for an even count; NaN for an empty slice. NaNs sort last
/// (`f64::total_cmp`), so the caller leaves them out first.
pub fn median(v: &mut [f64]) -> f64 {
    if v.is_empty() {
        return f64::NAN;
    }
    v.sort_by(f64::total_cmp);
    let n = v.len();
    if n % 2 == 1 {
        v[n / 2]
    } else {
        0.5 * (v[n / 2 - 1] + v[n / 2])
    }
}

/// `ys` at `x` by linear interpolation between the samples of ascending
/// `xs`: `None` outside [first, last], for slices of different lengths, or
/// where the result is not a number. Both ends are inside: `x` equal to the
/// last sample gives the last value.
pub fn interpolate(xs: &[f64], ys: &[f64], x: f64) -> Option<f64> {
    let (first, last) = (*xs.first()?, *xs.last()?);
    if !(x >= first && x <= last) || xs.len() != ys.len() {
        return None;
    }
    if xs.len() == 1 {
        return ys[0].is_finite().then_some(ys[0]);
    }
    let k = xs.partition_point(|&v| v <= x).clamp(1, xs.len() - 1);
    let (x0, x1) = (xs[k - 1], xs[k]);
    let y = if x == x0 {
        ys[k - 1]
    } else if x1 > x0 {
        ys[k - 1] + (x - x0) / (x1 - x0) * (ys[k] - ys[k - 1])
    } else {
        ys[k - 1]
    };
    y.is_finite().then_some(y)
}

/// `ys` at `x` along the first pair of neighbouring samples, both finite in
/// x and y, whose `xs` bracket `x`: for curves whose `xs` need not be sorted
/// and may have gaps (where a well first crosses a depth, say). `None` when
/// no pair brackets `x`.
pub fn interpolate_first_bracket(xs: &[f64], ys: &[f64], x: f64) -> Option<f64> {
    if !x.is_finite() {
        return None;
    }
    let n = xs.len().min(ys.len());
    if n == 1 && xs[0] == x && ys[0].is_finite() {
        return Some(ys[0]);
    }
    for i in 1..n {
        let (x0, x1, y0, y1) = (xs[i - 1], xs[i], ys[i - 1], ys[i]);
        if !(x0.is_finite() && x1.is_finite() && y0.is_finite() && y1.is_finite()) {
            continue;
        }
        if (x - x0) * (x - x1) <= 0.0 {
            if x1 == x0 {
                return Some(y0);
            }
            let y = y0 + (x - x0) / (x1 - x0) * (y1 - y0);
            return y.is_finite().then_some(y);
        }
    }
    None
}

/// An ordinary least-squares line y = intercept + slope·x.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LineFit {
    /// Slope, y per x.
    pub slope: f64,
    /// Value at x = 0.
    pub intercept: f64,
    /// Points fitted.
    pub n: usize,
    /// Mean of the x values.
    pub mean_x: f64,
    /// Σ (x − mean x)².
    pub sxx: f64,
    /// Sum of squared residuals.
    pub sse: f64,
}

impl LineFit {
    /// The residual variance sse / (n − 2); NaN with two points (no degree
    /// of freedom left).
    pub fn residual_variance(&self) -> f64 {
        if self.n > 2 {
            self.sse / (self.n as f64 - 2.0)
        } else {
            f64::NAN
        }
    }

    /// Variance of the slope, s² / Sxx.
    pub fn var_slope(&self) -> f64 {
        self.residual_variance() / self.sxx
    }

    /// Standard error of the slope.
    pub fn se_slope(&self) -> f64 {
        self.var_slope().sqrt()
    }

    /// Standard error of the intercept, √(s²/n + x̄² s²/Sxx).
    pub fn se_intercept(&self) -> f64 {
        let n = self.n as f64;
        (self.residual_variance() / n + self.mean_x * self.mean_x * self.var_slope()).sqrt()
    }

    /// Covariance of slope and intercept, −x̄ s²/Sxx.
    pub fn cov_slope_intercept(&self) -> f64 {
        -self.mean_x * self.var_slope()
    }

    /// Root mean square of the residuals, √(sse / n).
    pub fn rms(&self) -> f64 {
        (self.sse / self.n as f64).sqrt()
    }
}

/// The least-squares line through `points` (x, y), by centred sums (the
/// textbook normal equations; e.g. Montgomery & Runger, Applied Statistics
/// and Probability for Engineers, ch. 11, from memory). `None` with fewer
/// than two points, a value that is not a number, no spread in x, or sums
/// too large for f64 (a line fitted through overflow would be NaN or
/// falsely exact).
pub fn fit_line(points: &[(f64, f64)]) -> Option<LineFit> {
    if points.len() < 2 || points.iter().any(|(x, y)| !x.is_finite() || !y.is_finite()) {
        return None;
    }
    let n = points.len() as f64;
    let mx = points.iter().map(|p| p.0).sum::<f64>() / n;
    let my = points.iter().map(|p| p.1).sum::<f64>() / n;
    let sxx: f64 = points.iter().map(|p| (p.0 - mx).powi(2)).sum();
    if !(sxx.is_finite() && sxx > 0.0) {
        return None;
    }
    let sxy: f64 = points.iter().map(|p| (p.0 - mx) * (p.1 - my)).sum();
    let slope = sxy / sxx;
    let intercept = my - slope * mx;
    let sse: f64 = points
        .iter()
        .map(|p| (p.1 - (slope * p.0 + intercept)).powi(2))
        .sum();
    if !(slope.is_finite() && intercept.is_finite() && sse.is_finite()) {
        return None;
    }
    Some(LineFit {
        slope,
        intercept,
        n: points.len(),
        mean_x: mx,
        sxx,
        sse,
    })
}

/// Pearson correlation of paired values; NaN with fewer than 3 pairs or no
/// spread in either.
pub fn correlation(pairs: &[(f64, f64)]) -> f64 {
    let n = pairs.len() as f64;
    if pairs.len() < 3 {
        return f64::NAN;
    }
    let (mx, my) = (
        pairs.iter().map(|p| p.0).sum::<f64>() / n,
        pairs.iter().map(|p| p.1).sum::<f64>() / n,
    );
    let (mut sxy, mut sxx, mut syy) = (0.0, 0.0, 0.0);
    for (x, y) in pairs {
        sxy += (x - mx) * (y - my);
        sxx += (x - mx) * (x - mx);
        syy += (y - my) * (y - my);
    }
    sxy / (sxx * syy).sqrt()
}

/// Assert `actual` is within `tol` of `expected`, printing both (a test
/// helper for every module's reference checks).
/// Ranks (0-based) of `v`, ties broken by position.
pub fn ranks(v: &[f64]) -> Vec<usize> {
    let mut idx: Vec<usize> = (0..v.len()).collect();
    idx.sort_by(|&a, &b| v[a].total_cmp(&v[b]).then(a.cmp(&b)));
    let mut r = vec![0; v.len()];
    for (rank, &i) in idx.iter().enumerate() {
        r[i] = rank;
    }
    r
}

/// Spearman's rank correlation of two samples: the Pearson correlation of
/// their ranks (Spearman 1904; any statistics text).
pub fn rank_correlation(a: &[f64], b: &[f64]) -> f64 {
    let (ra, rb) = (ranks(a), ranks(b));
    let pairs: Vec<(f64, f64)> = ra
        .iter()
        .zip(&rb)
        .map(|(&x, &y)| (x as f64, y as f64))
        .collect();
    correlation(&pairs)
}

#[cfg(test)]
#[track_caller]
pub(crate) fn assert_close(actual: f64, expected: f64, tol: f64) {
    assert!(
        (actual - expected).abs() <= tol,
        "expected {expected} ± {tol}, got {actual}"
    );
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Hyndman-Fan type 7 on 1..=5 and on 10, 20, 30, 40 (hand-computed:
    /// position p (n − 1), linear between neighbours).
    #[test]
    fn quantiles_by_hand() {
        let a = [1.0, 2.0, 3.0, 4.0, 5.0];
        assert_eq!(quantile_sorted(&a, 0.0), 1.0);
        assert_eq!(quantile_sorted(&a, 0.25), 2.0);
        assert_eq!(quantile_sorted(&a, 0.5), 3.0);
        assert_eq!(quantile_sorted(&a, 1.0), 5.0);
        let b = [10.0, 20.0, 30.0, 40.0];
        // position 0.1 × 3 = 0.3: 10 + 0.3 × 10
        assert!((quantile_sorted(&b, 0.1) - 13.0).abs() < 1e-12);
        // position 0.9 × 3 = 2.7: 30 + 0.7 × 10
        assert!((quantile_sorted(&b, 0.9) - 37.0).abs() < 1e-12);
        // out-of-range probabilities clamp rather than index past the end
        assert_eq!(quantile_sorted(&b, 1.5), 40.0);
        assert_eq!(quantile_sorted(&b, -0.5), 10.0);
        assert!(quantile_sorted(&[], 0.5).is_nan());
        assert_eq!(quantile_sorted(&[7.0], 0.3), 7.0);
    }

    /// Percentiles skip NaN and infinities; 5th and 95th of 0..=100 are 5 and 95.
    #[test]
    fn percentiles_of_finite_values() {
        let mut v: Vec<f64> = (0..=100).map(f64::from).collect();
        v.extend([f64::NAN, f64::INFINITY, f64::NEG_INFINITY]);
        assert!((percentile(&v, 5.0) - 5.0).abs() < 1e-12);
        assert!((percentile(&v, 95.0) - 95.0).abs() < 1e-12);
        assert!(percentile(&[f64::NAN], 50.0).is_nan());
        assert!(percentile(&[], 50.0).is_nan());
        // a value at the top of the range, exactly the largest order statistic
        assert_eq!(percentile(&[3.0, 1.0, 2.0], 100.0), 3.0);
    }

    #[test]
    fn median_odd_even_empty() {
        assert_eq!(median(&mut [3.0, 1.0, 2.0]), 2.0);
        assert_eq!(median(&mut [4.0, 1.0, 3.0, 2.0]), 2.5);
        assert!(median(&mut []).is_nan());
    }

    /// Interpolation is defined on the closed interval: both end samples give
    /// their own value (one of the three copies this replaced gave NaN at
    /// exactly the last sample).
    #[test]
    fn interpolation_at_both_ends_and_outside() {
        let xs = [100.0, 100.5, 101.0];
        let ys = [70.0, 70.5, 71.0];
        assert_eq!(interpolate(&xs, &ys, 100.0), Some(70.0));
        assert_eq!(interpolate(&xs, &ys, 101.0), Some(71.0));
        assert_eq!(interpolate(&xs, &ys, 100.25), Some(70.25));
        assert_eq!(interpolate(&xs, &ys, 99.99), None);
        assert_eq!(interpolate(&xs, &ys, 101.01), None);
        assert_eq!(interpolate(&xs, &ys, f64::NAN), None);
        assert_eq!(interpolate(&xs[..2], &ys, 100.0), None);
        assert_eq!(interpolate(&[], &[], 1.0), None);
    }

    /// The first bracketing pair wins, gaps are stepped over, and unsorted
    /// x works (a curve that turns back).
    #[test]
    fn first_bracket_skips_gaps() {
        let xs = [0.0, f64::NAN, 2.0, 4.0, 2.0];
        let ys = [0.0, 1.0, 20.0, 40.0, 60.0];
        assert_eq!(interpolate_first_bracket(&xs, &ys, 3.0), Some(30.0));
        assert_eq!(interpolate_first_bracket(&xs, &ys, 5.0), None);
        assert_eq!(interpolate_first_bracket(&[1.0], &[9.0], 1.0), Some(9.0));
    }

    /// y = 2 + 3x exactly: slope, intercept and zero residual; then a
    /// hand-worked noisy set, (0, 1), (1, 3), (2, 2), (3, 5): x̄ 1.5, ȳ 2.75,
    /// Sxx 5, Sxy 5.5, slope 1.1, intercept 1.1, residuals −0.1, 0.8, −1.3,
    /// 0.6, sse 2.7, s² 1.35, var slope 1.35/5 = 0.27, se intercept
    /// √(1.35/4 + 2.25 × 0.27) = √0.945, covariance −1.5 × 0.27.
    #[test]
    fn least_squares_line_by_hand() {
        let exact: Vec<(f64, f64)> = (0..5)
            .map(|i| (f64::from(i), 2.0 + 3.0 * f64::from(i)))
            .collect();
        let f = fit_line(&exact).expect("line");
        assert!((f.slope - 3.0).abs() < 1e-12 && (f.intercept - 2.0).abs() < 1e-12);
        assert!(f.sse < 1e-20);
        let f = fit_line(&[(0.0, 1.0), (1.0, 3.0), (2.0, 2.0), (3.0, 5.0)]).expect("line");
        assert!((f.slope - 1.1).abs() < 1e-12);
        assert!((f.intercept - 1.1).abs() < 1e-12);
        assert!((f.sse - 2.7).abs() < 1e-12);
        assert!((f.se_slope() - 0.27f64.sqrt()).abs() < 1e-12);
        assert!((f.se_intercept() - 0.945f64.sqrt()).abs() < 1e-12);
        assert!((f.cov_slope_intercept() + 1.5 * 0.27).abs() < 1e-12);
        assert!((f.rms() - (2.7f64 / 4.0).sqrt()).abs() < 1e-12);
        // two points: a line, but no residual variance
        let two = fit_line(&[(0.0, 0.0), (1.0, 1.0)]).expect("line");
        assert!(two.se_slope().is_nan());
        assert!(
            fit_line(&[(1.0, 0.0), (1.0, 1.0)]).is_none(),
            "no spread in x"
        );
        assert!(fit_line(&[(0.0, f64::NAN), (1.0, 1.0)]).is_none());
        assert!(
            fit_line(&[(0.0, 0.0), (1e300, f64::MAX), (-1e300, -f64::MAX)]).is_none(),
            "overflow"
        );
    }

    #[test]
    fn correlation_by_hand() {
        assert!((correlation(&[(1.0, 2.0), (2.0, 4.0), (3.0, 6.0)]) - 1.0).abs() < 1e-12);
        assert!((correlation(&[(1.0, 6.0), (2.0, 4.0), (3.0, 2.0)]) + 1.0).abs() < 1e-12);
        assert!(correlation(&[(1.0, 1.0), (2.0, 2.0)]).is_nan());
    }

    #[test]
    fn spearman_of_known_samples() {
        // a monotone transform has rank correlation 1; a reversal −1;
        // [1,2,3,4,5] against [2,1,4,3,5]: d² = 1+1+1+1+0 = 4,
        // ρ = 1 − 6·4/(5·24) = 0.8 (Spearman's formula, no ties)
        let a = [1.0, 2.0, 3.0, 4.0, 5.0];
        assert!((rank_correlation(&a, &[1.0, 8.0, 27.0, 64.0, 125.0]) - 1.0).abs() < 1e-12);
        assert!((rank_correlation(&a, &[5.0, 4.0, 3.0, 2.0, 1.0]) + 1.0).abs() < 1e-12);
        assert!((rank_correlation(&a, &[2.0, 1.0, 4.0, 3.0, 5.0]) - 0.8).abs() < 1e-12);
    }
}
