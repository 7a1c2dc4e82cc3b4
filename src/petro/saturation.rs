//! Water saturation.
//!
//! Input: porosity (v/v; effective porosity for the shaly-sand models), true
//! resistivity Rt (ohm.m), formation-water resistivity Rw at formation
//! temperature (ohm.m), VSH (v/v) and shale resistivity Rsh (ohm.m), and the
//! Archie parameters a, m, n (dimensionless), which the stage looks up per depth
//! so that they can differ by zone and, later, by rock class.
//! Output: SW, fraction v/v, not clipped here; bulk volume water BVW = φ·SW.
//!
//! Methods: [`archie`], [`simandoux_modified`] (the default shaly-sand form),
//! [`simandoux_1963`], [`indonesia`].

/// Archie parameters at one depth.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct ArchieParams {
    /// Tortuosity factor a.
    pub a: f64,
    /// Cementation exponent m.
    pub m: f64,
    /// Saturation exponent n.
    pub n: f64,
}

impl ArchieParams {
    /// a = 1, m = n = 2 (common practice; formulas.md §4.1).
    pub const DEFAULT: ArchieParams = ArchieParams {
        a: 1.0,
        m: 2.0,
        n: 2.0,
    };
}

/// Archie: SW = (a·Rw/(φ^m·Rt))^(1/n).
///
/// | argument | unit |
/// |---|---|
/// | `phi` | v/v |
/// | `rt`, `rw` | ohm.m |
///
/// NaN for φ ≤ 0 or Rt ≤ 0 (undefined); may exceed 1 (the stage clips and counts).
///
/// # Source
/// Archie, G. E. (1942), The electrical resistivity log as an aid in determining
/// some reservoir characteristics, Transactions of the AIME 146(1), 54–62. The
/// factor a came later (commonly after Winsauer et al. 1952). Read via
/// formulas.md §4.1.
#[inline]
pub fn archie(phi: f64, rt: f64, rw: f64, p: ArchieParams) -> f64 {
    if phi <= 0.0 || rt <= 0.0 {
        return f64::NAN;
    }
    root_n(p.a * rw / (pow_m(phi, p.m) * rt), p.n)
}

/// φ^m, with the common m = 2 as a multiplication (same value, much faster).
#[inline]
fn pow_m(phi: f64, m: f64) -> f64 {
    if m == 2.0 { phi * phi } else { phi.powf(m) }
}

/// x^(1/n), with the common n = 2 as a square root.
#[inline]
fn root_n(x: f64, n: f64) -> f64 {
    if n == 2.0 { x.sqrt() } else { x.powf(1.0 / n) }
}

/// Solve f(sw) = 0 for an increasing f with f(0) ≤ 0 by bisection, widening
/// the bracket from [0, 2] as needed (SW above 1 is returned; the stage clips);
/// NaN if there is no root.
fn bisect_increasing(f: impl Fn(f64) -> f64) -> f64 {
    let (mut lo, mut hi) = (0.0f64, 2.0f64);
    let f0 = f(lo);
    if f0.is_nan() || f0 > 0.0 {
        return f64::NAN;
    }
    while f(hi) < 0.0 {
        hi *= 2.0;
        if hi > 1e12 {
            return f64::NAN;
        }
    }
    for _ in 0..200 {
        if hi - lo <= 1e-15 * hi {
            break;
        }
        let mid = 0.5 * (lo + hi);
        if f(mid) < 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// Modified Simandoux: 1/Rt = φ^m·SW^n/(a·Rw·(1 − VSH)) + VSH·SW/Rsh.
/// Closed form for n = 2, bisection otherwise (the right-hand side increases with SW).
///
/// | argument | unit |
/// |---|---|
/// | `phi` effective porosity, `vsh` | v/v |
/// | `rt`, `rw`, `rsh` | ohm.m |
///
/// # Source
/// Bardon, C. & Pied, B. (1969), Formation water saturation in shaly sands,
/// SPWLA 10th Symposium (from memory), modifying Simandoux, P. (1963),
/// Revue de l'IFP, supplementary issue, 193–215 (from memory). Form and check
/// values from formulas.md §4.2 and §10 (the recommended form).
#[inline]
pub fn simandoux_modified(phi: f64, rt: f64, rw: f64, vsh: f64, rsh: f64, p: ArchieParams) -> f64 {
    if phi <= 0.0 || rt <= 0.0 || vsh >= 1.0 {
        return f64::NAN;
    }
    let a_term = pow_m(phi, p.m) / (p.a * rw * (1.0 - vsh));
    shaly_quadratic(a_term, vsh / rsh, 1.0 / rt, p.n)
}

/// Original Simandoux (1963): 1/Rt = φ^m·SW^n/(a·Rw) + VSH·SW/Rsh.
///
/// # Source
/// Simandoux (1963) (from memory; formulas.md §4.2, form S63).
#[inline]
pub fn simandoux_1963(phi: f64, rt: f64, rw: f64, vsh: f64, rsh: f64, p: ArchieParams) -> f64 {
    if phi <= 0.0 || rt <= 0.0 {
        return f64::NAN;
    }
    shaly_quadratic(pow_m(phi, p.m) / (p.a * rw), vsh / rsh, 1.0 / rt, p.n)
}

/// A·SW^n + B·SW = C for SW ≥ 0.
fn shaly_quadratic(a: f64, b: f64, c: f64, n: f64) -> f64 {
    if n == 2.0 {
        return (-b + (b * b + 4.0 * a * c).sqrt()) / (2.0 * a);
    }
    newton_convex(a, b, c, n).unwrap_or_else(|| bisect_increasing(|sw| a * sw.powf(n) + b * sw - c))
}

/// Newton's method for A·s^n + B·s = C with n > 1 (A > 0, B ≥ 0, C > 0): the
/// function is increasing and convex, so Newton started at s0 = (C/A)^(1/n),
/// where it is ≥ 0, falls monotonically to the root. `None` outside those
/// conditions (the caller bisects) or if it has not converged in 60 steps.
fn newton_convex(a: f64, b: f64, c: f64, n: f64) -> Option<f64> {
    if !(n > 1.0 && a > 0.0 && b >= 0.0 && c > 0.0) {
        return None;
    }
    let mut s = (c / a).powf(1.0 / n);
    for _ in 0..60 {
        let sn1 = s.powf(n - 1.0);
        let f = a * sn1 * s + b * s - c;
        let d = n * a * sn1 + b;
        let next = s - f / d;
        if (s - next).abs() <= 1e-14 * s.max(1e-300) {
            return Some(next);
        }
        s = next;
    }
    None
}

/// Indonesia: 1/sqrt(Rt) = [VSH^(1 − VSH/2)/sqrt(Rsh) + sqrt(φ^m/(a·Rw))]·SW^(n/2).
///
/// # Source
/// Poupon, A. & Leveaux, J. (1971), Evaluation of water saturation in shaly
/// formations, SPWLA 12th Annual Logging Symposium; form as in formulas.md §4.2.
#[inline]
pub fn indonesia(phi: f64, rt: f64, rw: f64, vsh: f64, rsh: f64, p: ArchieParams) -> f64 {
    if phi <= 0.0 || rt <= 0.0 {
        return f64::NAN;
    }
    let shale = if vsh > 0.0 {
        vsh.powf(1.0 - 0.5 * vsh) / rsh.sqrt()
    } else {
        0.0
    };
    let denom = shale + (pow_m(phi, p.m) / (p.a * rw)).sqrt();
    (1.0 / (rt.sqrt() * denom)).powf(2.0 / p.n)
}

/// Bulk volume water BVW = φ·SW, v/v.
#[inline]
pub fn bulk_volume_water(phi: f64, sw: f64) -> f64 {
    phi * sw
}

/// The saturation model a zone uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum SaturationModel {
    /// Clean-formation Archie ([`archie`]); VSH and Rsh are not used.
    Archie,
    /// Modified Simandoux ([`simandoux_modified`]); needs Rsh.
    SimandouxModified,
    /// Original Simandoux 1963 ([`simandoux_1963`]); needs Rsh.
    #[serde(rename = "simandoux-1963")]
    Simandoux1963,
    /// Indonesia, Poupon & Leveaux 1971 ([`indonesia`]); needs Rsh.
    Indonesia,
}

impl SaturationModel {
    /// SW at one depth.
    #[inline]
    pub fn sw(self, phi: f64, rt: f64, rw: f64, vsh: f64, rsh: f64, p: ArchieParams) -> f64 {
        match self {
            SaturationModel::Archie => archie(phi, rt, rw, p),
            SaturationModel::SimandouxModified => simandoux_modified(phi, rt, rw, vsh, rsh, p),
            SaturationModel::Simandoux1963 => simandoux_1963(phi, rt, rw, vsh, rsh, p),
            SaturationModel::Indonesia => indonesia(phi, rt, rw, vsh, rsh, p),
        }
    }

    /// The model's name as written in the config (kebab-case).
    pub fn name(self) -> &'static str {
        match self {
            SaturationModel::Archie => "archie",
            SaturationModel::SimandouxModified => "simandoux-modified",
            SaturationModel::Simandoux1963 => "simandoux-1963",
            SaturationModel::Indonesia => "indonesia",
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

    const AM2: ArchieParams = ArchieParams::DEFAULT;

    /// Source: the Archie nomograph example quoted in formulas.md §4.1: F = 20,
    /// n = 2, Rw 0.05, φ 20 %, Rt 10 → SW 31.6 % (printed to 0.1 %). With F = 20
    /// at φ = 0.2 and m = 2, a = 0.8.
    #[test]
    fn archie_published_nomograph() {
        let p = ArchieParams {
            a: 20.0 * 0.04,
            m: 2.0,
            n: 2.0,
        };
        assert_close(archie(0.20, 10.0, 0.05, p), 0.316, 0.0005);
        // computed values of the same section
        assert_close(archie(0.20, 10.0, 0.05, AM2), 0.35355, 1e-5);
        assert_close(
            archie(0.20, 10.0, 0.05, ArchieParams { a: 0.81, ..AM2 }),
            0.31820,
            1e-5,
        );
        assert_close(
            archie(
                0.20,
                10.0,
                0.05,
                ArchieParams {
                    a: 0.62,
                    m: 2.15,
                    n: 2.0,
                },
            ),
            0.31410,
            1e-5,
        );
    }

    /// Source: formulas.md §4.1 table, effect of n (a = 1, m = 2, Rw 0.05).
    /// (0.70711 is a printed check value, not an approximation of 1/√2.)
    #[test]
    #[allow(clippy::approx_constant)]
    fn archie_effect_of_n() {
        let rows = [
            (1.8, [0.31498, 0.29503, 0.68040]),
            (2.0, [0.35355, 0.33333, 0.70711]),
            (2.2, [0.38860, 0.36834, 0.72974]),
            (2.5, [0.43528, 0.41524, 0.75786]),
        ];
        for (n, e) in rows {
            let p = ArchieParams { n, ..AM2 };
            assert_close(archie(0.20, 10.0, 0.05, p), e[0], 1e-5);
            assert_close(archie(0.15, 20.0, 0.05, p), e[1], 1e-5);
            assert_close(archie(0.20, 2.5, 0.05, p), e[2], 1e-5);
        }
    }

    /// Source: formulas.md §4.2 worked example: φe 0.20, VSH 0.20, Rt 5, Rw 0.05,
    /// Rsh 2, a 1, m 2. Archie 0.5 / 0.54731; S63 0.44139 / 0.48505; MS 0.40000;
    /// Indonesia 0.42168 / 0.47196 (n = 2 / 2.3).
    #[test]
    fn shaly_sand_worked_example() {
        let n23 = ArchieParams { n: 2.3, ..AM2 };
        assert_close(archie(0.2, 5.0, 0.05, AM2), 0.5, 1e-12);
        assert_close(archie(0.2, 5.0, 0.05, n23), 0.54731, 1e-5);
        assert_close(simandoux_1963(0.2, 5.0, 0.05, 0.2, 2.0, AM2), 0.44139, 1e-5);
        assert_close(simandoux_1963(0.2, 5.0, 0.05, 0.2, 2.0, n23), 0.48505, 1e-5);
        assert_close(
            simandoux_modified(0.2, 5.0, 0.05, 0.2, 2.0, AM2),
            0.40000,
            1e-5,
        );
        assert_close(indonesia(0.2, 5.0, 0.05, 0.2, 2.0, AM2), 0.42168, 1e-5);
        assert_close(indonesia(0.2, 5.0, 0.05, 0.2, 2.0, n23), 0.47196, 1e-5);
        // every model reduces to Archie with no shale
        for m in [
            SaturationModel::SimandouxModified,
            SaturationModel::Simandoux1963,
            SaturationModel::Indonesia,
        ] {
            assert_close(m.sw(0.2, 5.0, 0.05, 0.0, 2.0, AM2), 0.5, 1e-9);
        }
    }

    /// Identity from formulas.md §4.1: SW(n) = SW(2)^(2/n).
    #[test]
    fn archie_identity_in_n() {
        let s2 = archie(0.17, 13.0, 0.04, AM2);
        for n in [1.6, 1.9, 2.4, 3.0] {
            assert_close(
                archie(0.17, 13.0, 0.04, ArchieParams { n, ..AM2 }),
                s2.powf(2.0 / n),
                1e-12,
            );
        }
    }

    /// Newton and bisection solve the same equation to 1e-12.
    #[test]
    fn newton_matches_bisection() {
        for (a, b, c, n) in [
            (5.0, 0.1, 0.2, 2.3),
            (0.8, 0.0, 0.05, 1.7),
            (12.0, 0.3, 1.5, 2.5),
        ] {
            let nw = newton_convex(a, b, c, n).expect("converges");
            let bi = bisect_increasing(|s| a * s.powf(n) + b * s - c);
            assert_close(nw, bi, 1e-12);
        }
    }

    #[test]
    fn undefined_inputs_are_nan() {
        assert!(archie(0.0, 10.0, 0.05, AM2).is_nan());
        assert!(archie(0.2, 0.0, 0.05, AM2).is_nan());
        assert_close(bulk_volume_water(0.25, 0.4), 0.1, 1e-12);
    }

    proptest::proptest! {
        /// More resistivity never raises SW, in every model.
        #[test]
        fn sw_does_not_rise_with_rt(phi in 0.02f64..0.4, rt in 0.2f64..200.0, k in 1.0f64..5.0, vsh in 0.0f64..0.6, n in 1.5f64..3.0) {
            let p = ArchieParams { a: 1.0, m: 2.0, n };
            for m in [SaturationModel::Archie, SaturationModel::SimandouxModified, SaturationModel::Simandoux1963, SaturationModel::Indonesia] {
                let lo = m.sw(phi, rt, 0.05, vsh, 2.0, p);
                let hi = m.sw(phi, rt * k, 0.05, vsh, 2.0, p);
                proptest::prop_assert!(hi <= lo + 1e-9, "{:?}: {} then {}", m, lo, hi);
            }
        }
    }
}
