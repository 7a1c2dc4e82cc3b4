//! The class predictor's inputs at every depth: each log feature at the
//! depth (the point value) and, for depth context, its mean, slope and spread
//! over windows around the depth.
//!
//! Logs are blurred over each tool's vertical resolution, and a class is a
//! property of a bed, so the log around a depth says more about its class
//! than the one sample does (a thin bed reads between its neighbours; a
//! boundary shows as a slope). Windows are in metres, not samples, so a
//! 0.5 ft and a 0.1 m log give the same features.
//!
//! Layout of a row: for each feature in order, the point value, then for each
//! window half-width the mean, the slope (per m, positive when the value
//! grows with depth) and the standard deviation (population form) of the
//! finite samples within ± the half-width. A window with fewer than two
//! finite samples gives NaN, and so does a NaN point value: the caller skips
//! such rows as it skips a missing point feature.

use crate::config::Feature;
use crate::output::Table;
use crate::output::schema::Col;
use crate::units::DepthUnit;

/// Values per feature: the point value, then mean, slope and spread per window.
pub const STATS_PER_WINDOW: usize = 3;

/// Columns of a row for `features` features and `windows` windows.
pub fn width(features: usize, windows: usize) -> usize {
    features * (1 + STATS_PER_WINDOW * windows)
}

/// The name of column `j` of a row (for reports): `RHOB`, `RHOB mean ±0.5 m`...
pub fn column_name(features: &[Feature], scales_m: &[f64], j: usize) -> String {
    let per = 1 + STATS_PER_WINDOW * scales_m.len();
    let f = features[j / per].name();
    match j % per {
        0 => f.to_string(),
        k => {
            let w = scales_m[(k - 1) / STATS_PER_WINDOW];
            let stat = ["mean", "slope", "spread"][(k - 1) % STATS_PER_WINDOW];
            format!("{f} {stat} ±{w} m")
        }
    }
}

/// The table's depths in metres (its DEPTH column is in its own unit).
pub fn depth_m(table: &Table) -> Vec<f64> {
    let to_m = table
        .column(Col::Depth)
        .and_then(|c| DepthUnit::from_las(&c.unit))
        .unwrap_or(DepthUnit::Metre)
        .factor_to(DepthUnit::Metre);
    table
        .get(Col::Depth)
        .unwrap_or(&[])
        .iter()
        .map(|d| d * to_m)
        .collect()
}

/// Every depth's row of the table (row-major, [`width`] columns), for
/// `features` with context windows of half-widths `scales_m` (m; empty for
/// point features only). A feature the table lacks is NaN throughout.
pub fn rows(table: &Table, features: &[Feature], scales_m: &[f64]) -> Vec<f64> {
    let n = table.n_rows();
    let mut depth_m = depth_m(table);
    depth_m.resize(n, f64::NAN);
    let w = width(features.len(), scales_m.len());
    let per = 1 + STATS_PER_WINDOW * scales_m.len();
    let mut x = vec![f64::NAN; n * w];
    for (fi, f) in features.iter().enumerate() {
        let Some(col) = table.get(f.column()) else {
            continue;
        };
        let v: Vec<f64> = col.iter().map(|&c| f.transform(c)).collect();
        for (i, &p) in v.iter().enumerate() {
            x[i * w + fi * per] = p;
        }
        for (si, &half) in scales_m.iter().enumerate() {
            let stats = window_stats(&depth_m, &v, half);
            for (i, s) in stats.iter().enumerate() {
                let at = i * w + fi * per + 1 + si * STATS_PER_WINDOW;
                x[at..at + STATS_PER_WINDOW].copy_from_slice(s);
            }
        }
    }
    x
}

/// Mean, least-squares slope and population standard deviation of the
/// finite `v` whose depth is within `half` of each depth (`z` ascending, m).
/// NaN where the window holds fewer than two finite samples, or the depth is
/// NaN. Running sums over the window (depths taken from the first one), so
/// the cost is linear in the samples whatever the window.
pub fn window_stats(z: &[f64], v: &[f64], half: f64) -> Vec<[f64; 3]> {
    let n = z.len().min(v.len());
    let z0 = z.iter().copied().find(|d| d.is_finite()).unwrap_or(0.0);
    // prefix sums of count, v, z, z², v·z, v² over finite (z, v)
    let mut pre = vec![[0.0f64; 6]; n + 1];
    for i in 0..n {
        let mut s = pre[i];
        let (d, y) = (z[i] - z0, v[i]);
        if d.is_finite() && y.is_finite() {
            s[0] += 1.0;
            s[1] += y;
            s[2] += d;
            s[3] += d * d;
            s[4] += y * d;
            s[5] += y * y;
        }
        pre[i + 1] = s;
    }
    let (mut lo, mut hi) = (0usize, 0usize);
    let mut out = vec![[f64::NAN; 3]; n];
    for i in 0..n {
        let c = z[i];
        if !c.is_finite() {
            continue;
        }
        while lo < n && (z[lo].is_nan() || z[lo] < c - half) {
            lo += 1;
        }
        hi = hi.max(lo);
        while hi < n && z[hi] <= c + half {
            hi += 1;
        }
        let s: [f64; 6] = std::array::from_fn(|k| pre[hi][k] - pre[lo][k]);
        let k = s[0];
        if k < 2.0 {
            continue;
        }
        let mean = s[1] / k;
        let var = (s[5] / k - mean * mean).max(0.0);
        let szz = k * s[3] - s[2] * s[2];
        let slope = if szz > 1e-12 * k * k {
            (k * s[4] - s[2] * s[1]) / szz
        } else {
            f64::NAN
        };
        out[i] = [mean, slope, var.sqrt()];
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

    /// A straight log v = 3 + 2·z: every window's mean is the centre value,
    /// the slope is 2 and the spread is 2 × the rms offset of the window's
    /// depths from its centre (constructed case, computed by hand: offsets
    /// −0.5 … 0.5 m in 0.1 m steps, 11 of them: Σ offset² = 1.1 m², rms
    /// sqrt(0.1) m).
    #[test]
    fn straight_log() {
        let z: Vec<f64> = (0..41).map(|i| 100.0 + 0.1 * f64::from(i)).collect();
        let v: Vec<f64> = z.iter().map(|d| 3.0 + 2.0 * d).collect();
        let s = window_stats(&z, &v, 0.5 + 1e-9);
        let i = 20;
        assert_close(s[i][0], v[i], 1e-9);
        assert_close(s[i][1], 2.0, 1e-9);
        assert_close(s[i][2], 2.0 * 0.1f64.sqrt(), 1e-9);
        // at the top the window is one-sided: the mean is below the centre
        assert!(s[0][0] > v[0] && (s[0][1] - 2.0).abs() < 1e-9);
    }

    /// A step from 1 to 3 at z = 2.0: the mean crosses 2 at the boundary, the
    /// slope is positive only near it, and the spread is 1 (the population sd
    /// of an even split of 1 and 3) for a window centred between the sides.
    #[test]
    fn step_log() {
        let z: Vec<f64> = (0..40).map(|i| 0.1 * f64::from(i) + 0.05).collect();
        let v: Vec<f64> = z.iter().map(|&d| if d < 2.0 { 1.0 } else { 3.0 }).collect();
        let s = window_stats(&z, &v, 0.5);
        // samples 19 (1.95) and 20 (2.05) straddle the boundary
        assert!(s[19][0] < 2.0 && s[20][0] > 2.0);
        assert!(s[19][1] > 0.0 && s[5][1].abs() < 1e-12);
        assert_close(s[5][2], 0.0, 1e-12);
        let even = window_stats(&[1.9, 1.95, 2.05, 2.1], &[1.0, 1.0, 3.0, 3.0], 0.2);
        assert_close(even[1][2], 1.0, 1e-12);
    }

    /// NaN samples are left out of the window; fewer than two finite gives NaN.
    #[test]
    fn gaps() {
        let z = [0.0, 0.1, 0.2, 0.3, 0.4];
        let v = [1.0, f64::NAN, 3.0, f64::NAN, f64::NAN];
        let s = window_stats(&z, &v, 0.2);
        assert_close(s[1][0], 2.0, 1e-12);
        assert!(s[4][0].is_nan(), "{:?}", s[4]);
    }

    fn table(unit: DepthUnit, depth: Vec<f64>, rhob: Vec<f64>) -> Table {
        Table {
            columns: vec![
                crate::output::OutColumn::new(Col::Depth, unit, depth),
                crate::output::OutColumn::new(
                    Col::Input(crate::input::curves::LogicalCurve::BulkDensity),
                    unit,
                    rhob,
                ),
            ],
            well_items: Vec::new(),
            params: Vec::new(),
        }
    }

    /// The same log indexed in feet and in metres gives the same context
    /// features: windows are in metres (0.5 ft = 0.1524 m sampling).
    #[test]
    fn windows_are_in_metres() {
        let zm: Vec<f64> = (0..200).map(|i| 1000.0 + 0.1524 * f64::from(i)).collect();
        let v: Vec<f64> = zm.iter().map(|d| 2.3 + 0.1 * (d * 1.3).sin()).collect();
        let zf: Vec<f64> = zm.iter().map(|d| d / 0.3048).collect();
        let a = rows(
            &table(DepthUnit::Metre, zm, v.clone()),
            &[Feature::Rhob],
            &[1.5],
        );
        let b = rows(&table(DepthUnit::Foot, zf, v), &[Feature::Rhob], &[1.5]);
        assert_eq!(a.len(), 200 * 4);
        for (x, y) in a.iter().zip(&b) {
            assert_close(*x, *y, 1e-9);
        }
        // the window holds ±1.5 m = ±9 samples: the mean at sample 100 is the
        // mean of samples 91..=109 (its slope is per metre, not per foot)
        let want: f64 = (91..=109).map(|i| a[i * 4]).sum::<f64>() / 19.0;
        assert_close(a[100 * 4 + 1], want, 1e-12);
    }

    #[test]
    fn names_follow_the_layout() {
        let f = [Feature::Rhob, Feature::Vsh];
        let s = [0.5, 1.5];
        assert_eq!(width(2, 2), 14);
        assert_eq!(column_name(&f, &s, 0), "RHOB");
        assert_eq!(column_name(&f, &s, 2), "RHOB slope ±0.5 m");
        assert_eq!(column_name(&f, &s, 6), "RHOB spread ±1.5 m");
        assert_eq!(column_name(&f, &s, 7), "VSH");
    }
}
