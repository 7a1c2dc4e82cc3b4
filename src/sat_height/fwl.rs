//! Free water level from formation-pressure points.
//!
//! Each fluid leg is a straight line of pressure against true vertical depth;
//! the free water level is where the water line meets the hydrocarbon line.
//! Lines are fitted by least squares, and the FWL's uncertainty follows from
//! the two fits' standard errors by first-order propagation (legs taken as
//! independent). Common practice of formation-pressure interpretation; the
//! intersection rule is written out in formulas.md §8.6.
//!
//! Units: depth TVDSS in m (positive down), pressure in psi, gradient in
//! psi/m, density in g/cm3.

use serde::Serialize;

/// Hydrostatic gradient per unit density: 0.4335 psi/ft per g/cm3 (AAPG Wiki,
/// "Normal hydrostatic pressure gradients", read via formulas.md §8.6),
/// in psi/m per g/cm3 with 1 ft = 0.3048 m.
pub const PSI_PER_M_PER_GCC: f64 = 0.4335 / 0.3048;

/// A least-squares line P = gradient·D + intercept.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Line {
    /// Slope dP/dD of the line, psi/m.
    pub gradient_psi_per_m: f64,
    /// Pressure the line gives at TVDSS 0, psi.
    pub intercept_psi: f64,
    /// Number of points fitted.
    pub points: usize,
    /// RMS of the pressure residuals, psi.
    pub rms_psi: f64,
    /// Standard errors of gradient and intercept and their covariance
    /// (NaN with two points: no residual degrees of freedom).
    pub se_gradient: f64,
    /// Standard error of the intercept, psi.
    pub se_intercept: f64,
    /// Covariance of gradient and intercept, psi²/m.
    pub cov_gi: f64,
    /// Sum of squared residuals, psi².
    pub sse: f64,
}

impl Line {
    /// The fluid density the gradient implies, g/cm3.
    pub fn density_gcc(&self) -> f64 {
        self.gradient_psi_per_m / PSI_PER_M_PER_GCC
    }

    /// Pressure on the line at a depth, psi.
    pub fn pressure_at(&self, tvdss_m: f64) -> f64 {
        self.gradient_psi_per_m * tvdss_m + self.intercept_psi
    }
}

/// Fit a line to (TVDSS m, psi) points; `None` with fewer than two points,
/// no spread in depth, a value that is not a number, or sums too large for
/// f64 (a line fitted through overflow would be NaN or falsely exact).
pub fn fit_line(points: &[(f64, f64)]) -> Option<Line> {
    let f = crate::stats::fit_line(points)?;
    Some(Line {
        gradient_psi_per_m: f.slope,
        intercept_psi: f.intercept,
        points: f.n,
        rms_psi: f.rms(),
        se_gradient: f.se_slope(),
        se_intercept: f.se_intercept(),
        cov_gi: f.cov_slope_intercept(),
        sse: f.sse,
    })
}

/// Two legs and their intersection.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FwlFit {
    /// The lighter fluid above (oil or gas).
    pub upper: Line,
    /// Water below.
    pub lower: Line,
    /// Points in the upper leg (depth-sorted order: the first `split`).
    pub split: usize,
    /// Depth where the two lines cross: the FWL, TVDSS m.
    pub fwl_tvdss_m: f64,
    /// Pressure where the two lines cross, psi.
    pub fwl_pressure_psi: f64,
    /// One standard error of the FWL depth, m.
    pub fwl_sigma_m: f64,
    /// Water density minus the upper fluid's, from the gradients, g/cm3.
    pub density_contrast_gcc: f64,
}

/// Least density contrast between the legs, g/cm3, for an intersection: below
/// it the lines are taken as parallel (one fluid), because 0.1 psi of gauge
/// error would move the crossing by more than 3.5 m (our choice; real
/// oil-water contrasts are 0.1-0.5 g/cm3 and gas-water larger).
pub const MIN_DENSITY_CONTRAST_GCC: f64 = 0.02;

/// Why no free water level comes out of a set of pressure points.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FwlError {
    /// The legs' densities differ by less than [`MIN_DENSITY_CONTRAST_GCC`].
    #[error(
        "the two legs are parallel: gradients {upper_psi_per_m:.4} and {lower_psi_per_m:.4} psi/m ({upper_gcc:.3} and {lower_gcc:.3} g/cm3) differ by less than {MIN_DENSITY_CONTRAST_GCC} g/cm3, so the points show one fluid and no free water level"
    )]
    Parallel {
        /// Gradient of the upper leg, psi/m.
        upper_psi_per_m: f64,
        /// Gradient of the lower leg, psi/m.
        lower_psi_per_m: f64,
        /// Density the upper gradient implies, g/cm3.
        upper_gcc: f64,
        /// Density the lower gradient implies, g/cm3.
        lower_gcc: f64,
    },
    /// The upper leg is the denser fluid.
    #[error(
        "the upper leg's gradient ({upper_psi_per_m:.4} psi/m, {upper_gcc:.3} g/cm3) is not lighter than the lower leg's ({lower_psi_per_m:.4} psi/m, {lower_gcc:.3} g/cm3): a denser fluid cannot sit above a lighter one"
    )]
    Inverted {
        /// Gradient of the upper leg, psi/m.
        upper_psi_per_m: f64,
        /// Gradient of the lower leg, psi/m.
        lower_psi_per_m: f64,
        /// Density the upper gradient implies, g/cm3.
        upper_gcc: f64,
        /// Density the lower gradient implies, g/cm3.
        lower_gcc: f64,
    },
    /// The crossing overflows.
    #[error(
        "the legs cross at no finite depth and pressure (TVDSS {tvdss_m} m, {psi} psi): check the points' units"
    )]
    NoCrossing {
        /// Crossing depth as computed, TVDSS m (may be infinite or NaN).
        tvdss_m: f64,
        /// Crossing pressure as computed, psi (may be infinite or NaN).
        psi: f64,
    },
    /// A point's depth or pressure is NaN or infinite.
    #[error("pressure point ({tvdss_m}, {psi}) is not a number")]
    NotANumber {
        /// The point's depth, TVDSS m.
        tvdss_m: f64,
        /// The point's pressure, psi.
        psi: f64,
    },
    /// Fewer points than two legs need.
    #[error("{count} pressure points: two legs need at least {need}")]
    TooFewPoints {
        /// Points given.
        count: usize,
        /// Points two legs need (twice the least per leg).
        need: usize,
    },
    /// Fewer usable points (after exclusions) than two legs need.
    #[error("{count} usable pressure points: two legs need at least {need}")]
    TooFewUsable {
        /// Usable points.
        count: usize,
        /// Points two legs need (twice the least per leg).
        need: usize,
    },
    /// No automatic split gives two fitted lines.
    #[error(
        "no split gives two legs with a depth spread (or the values are too large to fit: check the points' units)"
    )]
    NoSplit,
    /// The user's split leaves a leg that cannot be fitted.
    #[error(
        "fewer than two points {side} the split (or no depth spread, or values too large to fit)"
    )]
    BadLeg {
        /// Which leg fails: `above` or `below` the split.
        side: &'static str,
    },
}

fn intersect(upper: Line, lower: Line, split: usize) -> Result<FwlFit, FwlError> {
    let dg = upper.gradient_psi_per_m - lower.gradient_psi_per_m;
    let legs = |parallel: bool| {
        let (upper_psi_per_m, lower_psi_per_m) =
            (upper.gradient_psi_per_m, lower.gradient_psi_per_m);
        let (upper_gcc, lower_gcc) = (upper.density_gcc(), lower.density_gcc());
        if parallel {
            FwlError::Parallel {
                upper_psi_per_m,
                lower_psi_per_m,
                upper_gcc,
                lower_gcc,
            }
        } else {
            FwlError::Inverted {
                upper_psi_per_m,
                lower_psi_per_m,
                upper_gcc,
                lower_gcc,
            }
        }
    };
    if dg.abs() / PSI_PER_M_PER_GCC < MIN_DENSITY_CONTRAST_GCC {
        return Err(legs(true));
    }
    if dg >= 0.0 {
        return Err(legs(false));
    }
    let d = (lower.intercept_psi - upper.intercept_psi) / dg;
    let p = upper.pressure_at(d);
    if !(d.is_finite() && p.is_finite()) {
        return Err(FwlError::NoCrossing { tvdss_m: d, psi: p });
    }
    // D = (b_l − b_u)/(g_u − g_l): partial derivatives for error propagation
    let dd_dbl = 1.0 / dg;
    let dd_dbu = -1.0 / dg;
    let dd_dgu = -d / dg;
    let dd_dgl = d / dg;
    let var = |l: &Line, d_db: f64, d_dg: f64| {
        d_db * d_db * l.se_intercept.powi(2)
            + d_dg * d_dg * l.se_gradient.powi(2)
            + 2.0 * d_db * d_dg * l.cov_gi
    };
    let sigma = (var(&upper, dd_dbu, dd_dgu) + var(&lower, dd_dbl, dd_dgl)).sqrt();
    Ok(FwlFit {
        fwl_pressure_psi: p,
        fwl_tvdss_m: d,
        fwl_sigma_m: sigma,
        density_contrast_gcc: lower.density_gcc() - upper.density_gcc(),
        upper,
        lower,
        split,
    })
}

fn sorted(points: &[(f64, f64)]) -> Result<Vec<(f64, f64)>, FwlError> {
    if let Some(&(tvdss_m, psi)) = points
        .iter()
        .find(|(d, p)| !d.is_finite() || !p.is_finite())
    {
        return Err(FwlError::NotANumber { tvdss_m, psi });
    }
    let mut v = points.to_vec();
    v.sort_by(|a, b| a.0.total_cmp(&b.0));
    Ok(v)
}

/// The split found automatically: every split with at least `min_leg` (≥ 2)
/// points per leg is tried and the least total squared residual wins.
pub fn fit_fwl_auto(points: &[(f64, f64)], min_leg: usize) -> Result<FwlFit, FwlError> {
    let min_leg = min_leg.max(2);
    let v = sorted(points)?;
    if v.len() < 2 * min_leg {
        return Err(FwlError::TooFewPoints {
            count: v.len(),
            need: 2 * min_leg,
        });
    }
    let mut best: Option<(f64, usize, Line, Line)> = None;
    for k in min_leg..=v.len() - min_leg {
        let (Some(u), Some(l)) = (fit_line(&v[..k]), fit_line(&v[k..])) else {
            continue;
        };
        let sse = u.sse + l.sse;
        if best.as_ref().is_none_or(|b| sse < b.0) {
            best = Some((sse, k, u, l));
        }
    }
    let (_, k, u, l) = best.ok_or(FwlError::NoSplit)?;
    intersect(u, l, k)
}

/// The split given by the user: points at or above `split_tvdss_m` are the upper leg.
pub fn fit_fwl_split_at(points: &[(f64, f64)], split_tvdss_m: f64) -> Result<FwlFit, FwlError> {
    let v = sorted(points)?;
    let k = v.partition_point(|p| p.0 <= split_tvdss_m);
    let u = fit_line(&v[..k]).ok_or(FwlError::BadLeg { side: "above" })?;
    let l = fit_line(&v[k..]).ok_or(FwlError::BadLeg { side: "below" })?;
    intersect(u, l, k)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

    const FT: f64 = 0.3048;

    fn ft_points(p: &[(f64, f64)]) -> Vec<(f64, f64)> {
        p.iter().map(|(d, x)| (d * FT, *x)).collect()
    }

    /// Source: formulas.md §8.6 exact example (computed, feet and psi): oil
    /// g 0.33 psi/ft, water 0.45 psi/ft, FWL 6000.0 ft at 2820.0 psi. The
    /// automatic split finds 3 | 3.
    #[test]
    fn exact_example() {
        let pts = ft_points(&[
            (5800.0, 2754.0),
            (5850.0, 2770.5),
            (5900.0, 2787.0),
            (6050.0, 2842.5),
            (6100.0, 2865.0),
            (6150.0, 2887.5),
        ]);
        for f in [
            fit_fwl_auto(&pts, 2).expect("fit"),
            fit_fwl_split_at(&pts, 6000.0 * FT).expect("fit"),
        ] {
            assert_eq!(f.split, 3);
            assert_close(f.fwl_tvdss_m / FT, 6000.0, 1e-6 * 6000.0);
            assert_close(f.fwl_pressure_psi, 2820.0, 1e-6 * 2820.0);
            assert_close(f.upper.gradient_psi_per_m * FT, 0.33, 1e-9);
            assert_close(f.lower.gradient_psi_per_m * FT, 0.45, 1e-9);
            // Δρ from the gradients: (0.45 − 0.33)/0.4335 = 0.27682 g/cc
            assert_close(f.density_contrast_gcc, 0.27682, 1e-4 * 0.27682);
        }
    }

    /// Source: formulas.md §8.6 noisy example: g_o 0.3272, g_w 0.4482 psi/ft
    /// (printed to 4 decimals), FWL 5994.628 ft at 2817.842 psi (relative 1e-4).
    #[test]
    fn noisy_example() {
        let pts = ft_points(&[
            (5800.0, 2754.3),
            (5850.0, 2770.2),
            (5900.0, 2787.1),
            (5950.0, 2803.2),
            (6050.0, 2842.9),
            (6100.0, 2864.8),
            (6150.0, 2887.3),
            (6200.0, 2910.1),
        ]);
        let f = fit_fwl_auto(&pts, 2).expect("fit");
        assert_eq!(f.split, 4);
        assert!((f.upper.gradient_psi_per_m * FT - 0.3272).abs() <= 0.00005);
        assert!((f.lower.gradient_psi_per_m * FT - 0.4482).abs() <= 0.00005);
        assert_close(f.fwl_tvdss_m / FT, 5994.628, 1e-4 * 5994.628);
        assert_close(f.fwl_pressure_psi, 2817.842, 1e-4 * 2817.842);
        assert!(
            f.fwl_sigma_m > 0.0 && f.fwl_sigma_m < 10.0,
            "{}",
            f.fwl_sigma_m
        );
    }

    /// Source: formulas.md §8.6, computed: 0.45 psi/ft → 1.0380 g/cc, 0.33 → 0.76121.
    #[test]
    fn density_from_gradient() {
        let line = |g_ft: f64| Line {
            gradient_psi_per_m: g_ft / FT,
            intercept_psi: 0.0,
            points: 2,
            rms_psi: 0.0,
            se_gradient: 0.0,
            se_intercept: 0.0,
            cov_gi: 0.0,
            sse: 0.0,
        };
        assert_close(line(0.45).density_gcc(), 1.0380, 1e-4 * 1.038);
        assert_close(line(0.33).density_gcc(), 0.76121, 1e-4 * 0.76121);
    }

    #[test]
    fn refusals() {
        // water above oil
        let pts = ft_points(&[
            (5800.0, 2754.0),
            (5850.0, 2776.5),
            (5900.0, 2799.0),
            (6050.0, 2848.5),
            (6100.0, 2865.0),
            (6150.0, 2881.5),
        ]);
        let err = fit_fwl_split_at(&pts, 6000.0 * FT).expect_err("inverted");
        assert!(matches!(err, FwlError::Inverted { .. }), "{err}");
        assert!(
            err.to_string()
                .contains("a denser fluid cannot sit above a lighter one"),
            "{err}"
        );
        assert_eq!(
            fit_fwl_auto(&pts[..3], 2).expect_err("3 points"),
            FwlError::TooFewPoints { count: 3, need: 4 }
        );
        assert!(
            fit_fwl_auto(&[(1.0, f64::NAN); 6], 2)
                .expect_err("nan")
                .to_string()
                .contains("not a number")
        );
        assert!(fit_fwl_auto(&[(1000.0, 1400.0); 6], 2).is_err());
        // one water line through every point, with ±0.05 psi of gauge scatter
        // (constructed case): no split gives two fluids
        let one: Vec<(f64, f64)> = (0..8)
            .map(|i| {
                let d = 2000.0 + 10.0 * f64::from(i);
                (
                    d,
                    3000.0 + 1.07 * PSI_PER_M_PER_GCC * d + if i % 2 == 0 { 0.05 } else { -0.05 },
                )
            })
            .collect();
        let err = fit_fwl_auto(&one, 2).expect_err("parallel");
        assert!(matches!(err, FwlError::Parallel { .. }), "{err}");
        assert!(
            err.to_string().contains("the two legs are parallel"),
            "{err}"
        );
    }

    /// Finite points whose sums overflow (pressures near f64::MAX, depths of
    /// 1e200 m) made NaN lines, and every comparison with NaN is false, so a
    /// NaN free water level came back as a fit. Found while triaging the
    /// pressures fuzz target (by reading, not by the fuzzer in its 2 minutes).
    #[test]
    fn overflowing_points_are_refused_not_fitted_to_nan() {
        let huge_p: Vec<(f64, f64)> = (0..6)
            .map(|i| (2000.0 + 10.0 * f64::from(i), 1e308 - 1e300 * f64::from(i)))
            .collect();
        assert!(fit_line(&huge_p[..3]).is_none());
        let err = fit_fwl_auto(&huge_p, 2).expect_err("overflow");
        assert_eq!(err, FwlError::NoSplit);
        assert!(err.to_string().contains("no split gives two legs"), "{err}");
        assert!(fit_fwl_split_at(&huge_p, 2025.0).is_err());
        // depths of 1e200 m: the depth spread overflows, so no line (it used
        // to be a flat line with a zero standard error, and "parallel legs")
        let huge_d: Vec<(f64, f64)> = (0..6)
            .map(|i| (1e200 * f64::from(i + 1), 3000.0 + f64::from(i)))
            .collect();
        assert!(fit_line(&huge_d).is_none());
        let err = fit_fwl_auto(&huge_d, 2).expect_err("overflow");
        assert!(err.to_string().contains("too large to fit"), "{err}");
        // two finite legs, flat at 5e307 psi over a 0.05 psi/m leg through 0
        // (contrast 0.035 g/cm3, above the least): they cross at 1e309 m
        let far = [
            (0.0, 5e307),
            (1.0, 5e307),
            (2.0, 5e307),
            (3.0, 0.15),
            (4.0, 0.2),
            (5.0, 0.25),
        ];
        let err = fit_fwl_split_at(&far, 2.5).expect_err("beyond f64");
        assert!(matches!(err, FwlError::NoCrossing { .. }), "{err}");
        assert!(err.to_string().contains("no finite depth"), "{err}");
    }

    /// Exact points on an oil and a water line recover the FWL over a grid of
    /// densities and levels (constructed cases).
    #[test]
    fn grid_of_exact_cases() {
        for ro in [0.6, 0.7, 0.8, 0.9] {
            for rw in [1.0, 1.07, 1.15] {
                for fwl in [1500.0, 2000.0, 2500.0] {
                    let pf = 3000.0;
                    let (go, gw) = (ro * PSI_PER_M_PER_GCC, rw * PSI_PER_M_PER_GCC);
                    let mut pts: Vec<(f64, f64)> = (1..=4)
                        .map(|i| {
                            let d = fwl - 12.0 * f64::from(i);
                            (d, pf + go * (d - fwl))
                        })
                        .collect();
                    pts.extend((1..=3).map(|i| {
                        let d = fwl + 9.0 * f64::from(i);
                        (d, pf + gw * (d - fwl))
                    }));
                    let f = fit_fwl_auto(&pts, 2).expect("fit");
                    assert!((f.fwl_tvdss_m - fwl).abs() < 1e-6, "{ro} {rw} {fwl}: {f:?}");
                    assert!((f.fwl_pressure_psi - pf).abs() < 1e-6);
                }
            }
        }
    }
}
