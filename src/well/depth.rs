//! Depth reference: measured depth (MD) to true vertical depth (TVD) and to
//! TVDSS (true vertical depth below sea level, positive down), the depth in
//! which free-water levels and contacts are compared.
//!
//! Vertical wells: TVD = MD − (0 at the depth reference), TVDSS = TVD − elevation of
//! the depth reference (kelly bushing, drill floor or ground) above sea level.
//! Deviated wells: TVD at the survey stations by the minimum-curvature method,
//! then linear in MD between stations (and straight-line extrapolation beyond).
//! All lengths in one unit (the project's depth unit).

/// Dogleg below which the ratio factor is taken as 1 (radians).
const SMALL_DOGLEG: f64 = 1e-6;

/// A directional survey: stations of MD (project depth unit), inclination and
/// azimuth (degrees).
#[derive(Debug, Clone, PartialEq)]
pub struct Survey {
    /// Measured depth of each station, project depth unit.
    pub md: Vec<f64>,
    /// Inclination at each station, degrees from vertical.
    pub inc_deg: Vec<f64>,
    /// Azimuth at each station, degrees.
    pub azi_deg: Vec<f64>,
}

/// TVD at each station by minimum curvature, starting at TVD = MD of the first
/// station (a survey starts vertical at the top).
///
/// Between stations 1 and 2: ΔTVD = ΔMD/2·(cos I1 + cos I2)·RF, where the dogleg
/// β = acos(cos(I2 − I1) − sin I1·sin I2·(1 − cos(A2 − A1))) (computed in the
/// equivalent haversine form) and the ratio
/// factor RF = (2/β)·tan(β/2) (RF → 1 as β → 0).
///
/// # Source
/// The minimum-curvature method as described in Bourgoyne, A. T., Millheim,
/// K. K., Chenevert, M. E. & Young, F. S. (1986), *Applied Drilling Engineering*,
/// SPE Textbook 2, chapter 8 (from memory); checked here against closed forms
/// (a straight inclined hole and a constant-build arc).
pub fn min_curvature_tvd(md: &[f64], inc_deg: &[f64], azi_deg: &[f64]) -> Vec<f64> {
    let n = md.len().min(inc_deg.len()).min(azi_deg.len());
    let mut tvd = Vec::with_capacity(n);
    if n == 0 {
        return tvd;
    }
    tvd.push(md[0]);
    for k in 1..n {
        let (i1, i2) = (inc_deg[k - 1].to_radians(), inc_deg[k].to_radians());
        let (a1, a2) = (azi_deg[k - 1].to_radians(), azi_deg[k].to_radians());
        let cos_beta = (i2 - i1).cos() - i1.sin() * i2.sin() * (1.0 - (a2 - a1).cos());
        let beta = cos_beta.clamp(-1.0, 1.0).acos();
        let rf = if beta < SMALL_DOGLEG {
            1.0
        } else {
            2.0 / beta * (beta / 2.0).tan()
        };
        let d_md = md[k] - md[k - 1];
        tvd.push(tvd[k - 1] + 0.5 * d_md * (i1.cos() + i2.cos()) * rf);
    }
    tvd
}

/// TVD at each MD sample: linear between stations, straight-line beyond the
/// first and last (with the inclination at that station). NaN MD gives NaN.
pub fn tvd_at(md_samples: &[f64], survey: &Survey) -> Vec<f64> {
    let st = min_curvature_tvd(&survey.md, &survey.inc_deg, &survey.azi_deg);
    let n = st.len();
    md_samples
        .iter()
        .map(|&md| {
            if !md.is_finite() || n == 0 {
                return f64::NAN;
            }
            if md <= survey.md[0] {
                return st[0] - (survey.md[0] - md) * survey.inc_deg[0].to_radians().cos();
            }
            if md >= survey.md[n - 1] {
                return st[n - 1]
                    + (md - survey.md[n - 1]) * survey.inc_deg[n - 1].to_radians().cos();
            }
            let k = survey.md.partition_point(|&m| m <= md).max(1);
            let t = (md - survey.md[k - 1]) / (survey.md[k] - survey.md[k - 1]);
            st[k - 1] + t * (st[k] - st[k - 1])
        })
        .collect()
}

/// TVDSS = TVD − elevation of the depth reference above sea level.
pub fn tvdss(tvd: &[f64], reference_elevation: f64) -> Vec<f64> {
    tvd.iter().map(|t| t - reference_elevation).collect()
}

#[cfg(test)]
mod tests {
    #[test]
    fn interpolation_inside_and_outside() {
        let xs = [100.0, 101.0, 103.0];
        let ys = [70.0, 71.0, f64::NAN];
        assert_eq!(crate::stats::interpolate(&xs, &ys, 100.25), Some(70.25));
        assert_eq!(crate::stats::interpolate(&xs, &ys, 101.0), Some(71.0));
        assert_eq!(crate::stats::interpolate(&xs, &ys, 100.0), Some(70.0));
        assert_eq!(crate::stats::interpolate(&xs, &ys, 99.9), None);
        assert_eq!(crate::stats::interpolate(&xs, &ys, 102.0), None);
        assert_eq!(
            crate::stats::interpolate(&xs[..1], &ys[..1], 100.0),
            Some(70.0)
        );
    }

    use super::*;
    use crate::stats::assert_close;

    /// Closed form: a straight hole at constant inclination I has TVD = MD·cos I.
    #[test]
    fn straight_inclined_hole() {
        let md = [0.0, 100.0, 250.0, 1000.0];
        let t = min_curvature_tvd(&md, &[30.0; 4], &[45.0; 4]);
        for (m, v) in md.iter().zip(&t) {
            assert_close(*v, m * 30f64.to_radians().cos(), 1e-9);
        }
    }

    /// Closed form: a constant-build arc of radius R from vertical has
    /// TVD = R·sin(I) at inclination I (MD = R·I). Minimum curvature is exact
    /// on a circular arc, whatever the station spacing.
    #[test]
    fn constant_build_arc() {
        let r = 1000.0;
        let incs: Vec<f64> = (0..=9).map(|k| 10.0 * f64::from(k)).collect();
        let md: Vec<f64> = incs.iter().map(|i| r * i.to_radians()).collect();
        let t = min_curvature_tvd(&md, &incs, &vec![120.0; incs.len()]);
        for (i, v) in incs.iter().zip(&t) {
            assert_close(*v, r * i.to_radians().sin(), 1e-6);
        }
    }

    #[test]
    fn interpolation_and_tvdss() {
        let s = Survey {
            md: vec![0.0, 1000.0, 2000.0],
            inc_deg: vec![0.0, 0.0, 0.0],
            azi_deg: vec![0.0; 3],
        };
        let t = tvd_at(&[500.0, 1500.0, 2500.0], &s);
        assert_eq!(t, vec![500.0, 1500.0, 2500.0]);
        assert_eq!(tvdss(&t, 30.0), vec![470.0, 1470.0, 2470.0]);
    }
}
