//! Data-driven hydraulic (flow-unit) classes from the flow-zone indicator.
//!
//! The flow-zone indicator of Amaefule et al. (1993, SPE 26436) is
//! `FZI = RQI / φz` with `RQI = 0.0314 · sqrt(k / φe)` (µm, k in mD) and
//! `φz = φe / (1 − φe)`. Rock with a similar pore-throat geometry shares a
//! similar FZI, so log10(FZI) of a cored interval is often multi-modal with one
//! roughly Gaussian mode per hydraulic unit.
//!
//! This module fits a one-dimensional Gaussian mixture to **log10 of FZI in µm**
//! with the expectation–maximisation algorithm (Dempster, Laird & Rubin 1977,
//! J. R. Stat. Soc. B 39(1)), for every number of components from 1 up to a cap,
//! and keeps the number of components with the lowest Bayesian information
//! criterion (Schwarz 1978, Annals of Statistics 6(2)). Class boundaries are
//! reported back in FZI µm (not log) at the points where the weighted densities
//! of adjacent components are equal, i.e. where the most probable class
//! changes.
//!
//! Everything is deterministic: no random initialisation is used.

/// Relative log-likelihood gain below which EM is considered converged.
const EM_REL_TOL: f64 = 1e-9;
/// Maximum number of EM iterations for one value of k.
const EM_MAX_ITER: usize = 500;
/// Absolute lower bound on every component sd (log10 units), applied even when
/// the caller asks for `min_sd_log10 = 0`, so that densities stay bounded.
const HARD_MIN_SD_LOG10: f64 = 1e-6;
/// Lower bound on a mixture weight; keeps every log-weight finite.
const MIN_WEIGHT: f64 = 1e-12;
/// Total responsibility below which a component keeps its previous mean and sd.
const MIN_COMPONENT_MASS: f64 = 1e-9;
/// Hard cap on the number of components tried, whatever `max_k` says.
const MAX_COMPONENTS: usize = 32;
/// Maximum number of bisection steps when locating a class boundary.
const BISECTION_MAX_ITER: usize = 200;
/// 0.5 · ln(2π).
const HALF_LN_2PI: f64 = 0.918_938_533_204_672_7;

/// One fitted mixture component in log10(FZI µm).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Component {
    /// Mixing proportion (the weights of a fit sum to 1).
    pub weight: f64,
    /// Mean of log10(FZI / µm).
    pub mean_log10: f64,
    /// Standard deviation of log10(FZI / µm).
    pub sd_log10: f64,
}

/// Result of [`fit_log_fzi`]: the Gaussian mixture in log10(FZI µm) with the
/// lowest BIC, plus diagnostics.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct MixtureFit {
    /// components sorted by mean ascending
    pub components: Vec<Component>,
    /// Natural-log likelihood of the usable samples (in log10(FZI µm) space)
    /// under the chosen mixture.
    pub log_likelihood: f64,
    /// BIC of the chosen mixture: `-2 lnL + (3k - 1) ln n`.
    pub bic: f64,
    /// BIC of every k tried, (k, bic), k ascending
    pub bic_by_k: Vec<(usize, f64)>,
    /// class boundaries in FZI µm (NOT log), ascending, len = components.len()-1:
    /// the FZI where the weighted densities of adjacent components are equal
    /// (found between the two means by bisection on the difference of log
    /// weighted densities). If one of two adjacent components dominates the whole
    /// interval between their means, the boundary is put at the mean of the
    /// dominated component.
    pub boundaries_um: Vec<f64>,
    /// Number of usable (finite, positive) FZI values that were fitted.
    pub samples: usize,
}

/// Why [`fit_log_fzi`] cannot fit a mixture.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ClusterError {
    /// Fewer than two usable values.
    #[error(
        "fit_log_fzi: need at least 2 finite, positive FZI values, found {usable} usable out of {supplied} supplied"
    )]
    TooFewValues {
        /// Finite, positive values found.
        usable: usize,
        /// Values given.
        supplied: usize,
    },
    /// `max_k` is 0.
    #[error("fit_log_fzi: max_k must be at least 1")]
    NoComponents,
    /// `min_sd_log10` is NaN, infinite or negative.
    #[error("fit_log_fzi: min_sd_log10 must be finite and non-negative, got {0}")]
    BadMinSd(f64),
    /// No k gave a fit (cannot happen: k = 1 always fits).
    #[error("fit_log_fzi: no mixture fitted")]
    NoFit,
}

/// Fit Gaussian mixtures with 1..=max_k components to log10 of the given FZI
/// values (µm) by EM (Dempster, Laird & Rubin 1977) and keep the k with the
/// lowest BIC (Schwarz 1978): `BIC = -2 lnL + p ln n`, `p = 3k - 1`
/// (k means, k sds, k - 1 free weights). Ties go to the smaller k.
///
/// * Non-finite and non-positive FZI values are skipped and not counted in
///   `samples` or `n`.
/// * k is capped so that `n / k >= min_per_component` (a `min_per_component` of
///   0 behaves like 1), by the number of distinct values, and by an internal
///   limit of 32. k = 1 is always fitted, even when `n < min_per_component`.
/// * Initialisation for each k is deterministic: means at the sample quantiles
///   `(j + 0.5) / k` (linear interpolation between order statistics), equal
///   weights, and sd = overall (population) sd / k.
/// * Every sd is floored at `min_sd_log10` (log10 units, e.g. 0.02) and, in any
///   case, at 1e-6 so that the likelihood stays bounded; this also applies to
///   the initial sds.
/// * EM stops when the log-likelihood gain falls below 1e-9 relative
///   (relative to `max(|lnL|, 1)`) or after 500 iterations.
///
/// # Errors
/// Returns `Err` if fewer than 2 usable values remain, if `max_k == 0`, or if
/// `min_sd_log10` is NaN, infinite or negative.
pub fn fit_log_fzi(
    fzi_um: &[f64],
    max_k: usize,
    min_per_component: usize,
    min_sd_log10: f64,
) -> Result<MixtureFit, ClusterError> {
    // log10 of a finite, strictly positive f64 is always finite.
    let mut x: Vec<f64> = fzi_um
        .iter()
        .copied()
        .filter(|v| v.is_finite() && *v > 0.0)
        .map(f64::log10)
        .collect();
    let n = x.len();
    if n < 2 {
        return Err(ClusterError::TooFewValues {
            usable: n,
            supplied: fzi_um.len(),
        });
    }
    if max_k == 0 {
        return Err(ClusterError::NoComponents);
    }
    if !(min_sd_log10.is_finite() && min_sd_log10 >= 0.0) {
        return Err(ClusterError::BadMinSd(min_sd_log10));
    }
    let sd_floor = min_sd_log10.max(HARD_MIN_SD_LOG10);

    x.sort_unstable_by(f64::total_cmp);
    let distinct = 1 + x.windows(2).filter(|w| w[0] != w[1]).count();
    let k_cap = max_k
        .min(n / min_per_component.max(1))
        .min(distinct)
        .clamp(1, MAX_COMPONENTS);

    let overall_sd = population_mean_sd(&x).1;
    let ln_n = (n as f64).ln();

    let mut bic_by_k = Vec::with_capacity(k_cap);
    let mut best: Option<(f64, Vec<Component>, f64)> = None;
    for k in 1..=k_cap {
        let init = initial_components(&x, k, overall_sd, sd_floor);
        let (comps, ll) = run_em(&x, init, sd_floor);
        let free_params = (3 * k - 1) as f64;
        let bic = -2.0 * ll + free_params * ln_n;
        bic_by_k.push((k, bic));
        let better = match &best {
            None => true,
            Some((best_bic, _, _)) => bic < *best_bic,
        };
        if better {
            best = Some((bic, comps, ll));
        }
    }
    // `best` is always set because k = 1 is always fitted.
    let (bic, mut components, log_likelihood) = best.ok_or(ClusterError::NoFit)?;
    components.sort_by(|a, b| a.mean_log10.total_cmp(&b.mean_log10));
    let boundaries_um = components
        .windows(2)
        .map(|pair| 10f64.powf(boundary_log10(&pair[0], &pair[1])).min(f64::MAX))
        .collect();

    Ok(MixtureFit {
        components,
        log_likelihood,
        bic,
        bic_by_k,
        boundaries_um,
        samples: n,
    })
}

/// Population mean and sd (divisor n) by Welford's update.
fn population_mean_sd(x: &[f64]) -> (f64, f64) {
    let mut mean = 0.0;
    let mut m2 = 0.0;
    for (i, &v) in x.iter().enumerate() {
        let delta = v - mean;
        mean += delta / (i + 1) as f64;
        m2 += delta * (v - mean);
    }
    let var = if x.is_empty() {
        0.0
    } else {
        (m2 / x.len() as f64).max(0.0)
    };
    (mean, var.sqrt())
}

/// Deterministic starting point for EM with k components.
fn initial_components(sorted: &[f64], k: usize, overall_sd: f64, sd_floor: f64) -> Vec<Component> {
    let sd = (overall_sd / k as f64).max(sd_floor);
    (0..k)
        .map(|j| Component {
            weight: 1.0 / k as f64,
            mean_log10: crate::stats::quantile_sorted(sorted, (j as f64 + 0.5) / k as f64),
            sd_log10: sd,
        })
        .collect()
}

/// Per-component constants for fast evaluation of log(weight · density).
struct Prepared {
    offset: f64,
    mean: f64,
    inv_sd: f64,
}

fn prepare(comps: &[Component]) -> Vec<Prepared> {
    comps
        .iter()
        .map(|c| Prepared {
            offset: c.weight.ln() - c.sd_log10.ln() - HALF_LN_2PI,
            mean: c.mean_log10,
            inv_sd: 1.0 / c.sd_log10,
        })
        .collect()
}

/// Fill `out[j] = ln(w_j N(x | μ_j, σ_j))` and return `ln Σ_j exp(out[j])`
/// (log-sum-exp, shifted by the maximum term).
fn log_terms(x: f64, prep: &[Prepared], out: &mut [f64]) -> f64 {
    let mut max = f64::NEG_INFINITY;
    for (o, p) in out.iter_mut().zip(prep) {
        let z = (x - p.mean) * p.inv_sd;
        *o = p.offset - 0.5 * z * z;
        if *o > max {
            max = *o;
        }
    }
    if !max.is_finite() {
        return max;
    }
    let s: f64 = out.iter().map(|&o| (o - max).exp()).sum();
    max + s.ln()
}

/// Neumaier-compensated running sum.
#[derive(Default)]
struct CompensatedSum {
    sum: f64,
    comp: f64,
}

impl CompensatedSum {
    fn add(&mut self, v: f64) {
        let t = self.sum + v;
        if self.sum.abs() >= v.abs() {
            self.comp += (self.sum - t) + v;
        } else {
            self.comp += (v - t) + self.sum;
        }
        self.sum = t;
    }
    fn value(&self) -> f64 {
        self.sum + self.comp
    }
}

/// Log-likelihood of the data under a mixture.
fn log_likelihood(x: &[f64], comps: &[Component]) -> f64 {
    let prep = prepare(comps);
    let mut buf = vec![0.0; comps.len()];
    let mut ll = CompensatedSum::default();
    for &xi in x {
        ll.add(log_terms(xi, &prep, &mut buf));
    }
    ll.value()
}

/// One fused E + M step. Returns the log-likelihood of the *current*
/// components and the updated components. Responsibilities are not stored:
/// weighted sufficient statistics are accumulated with a weighted Welford
/// update, so memory is O(k) and the variance has no cancellation problem.
fn em_step(x: &[f64], comps: &[Component], sd_floor: f64) -> (f64, Vec<Component>) {
    let k = comps.len();
    let prep = prepare(comps);
    let mut buf = vec![0.0; k];
    let mut mass = vec![0.0; k];
    let mut mean = vec![0.0; k];
    let mut m2 = vec![0.0; k];
    let mut ll = CompensatedSum::default();

    for &xi in x {
        let lse = log_terms(xi, &prep, &mut buf);
        ll.add(lse);
        if !lse.is_finite() {
            continue;
        }
        for j in 0..k {
            let r = (buf[j] - lse).exp();
            if r > 0.0 {
                mass[j] += r;
                let delta = xi - mean[j];
                mean[j] += delta * (r / mass[j]);
                m2[j] += r * delta * (xi - mean[j]);
            }
        }
    }

    let n = x.len() as f64;
    let mut next: Vec<Component> = comps
        .iter()
        .enumerate()
        .map(|(j, old)| {
            if mass[j] > MIN_COMPONENT_MASS && mass[j].is_finite() {
                let var = (m2[j] / mass[j]).max(0.0);
                Component {
                    weight: (mass[j] / n).max(MIN_WEIGHT),
                    mean_log10: mean[j],
                    sd_log10: var.sqrt().max(sd_floor),
                }
            } else {
                Component {
                    weight: MIN_WEIGHT,
                    ..old.clone()
                }
            }
        })
        .collect();
    let total: f64 = next.iter().map(|c| c.weight).sum();
    for c in &mut next {
        c.weight /= total;
    }
    (ll.value(), next)
}

/// EM from the given start; returns the final components and their
/// log-likelihood.
fn run_em(x: &[f64], mut comps: Vec<Component>, sd_floor: f64) -> (Vec<Component>, f64) {
    let mut prev = f64::NEG_INFINITY;
    for _ in 0..EM_MAX_ITER {
        let (ll, next) = em_step(x, &comps, sd_floor);
        comps = next;
        if !ll.is_finite() || ll - prev <= EM_REL_TOL * ll.abs().max(1.0) {
            break;
        }
        prev = ll;
    }
    let ll = log_likelihood(x, &comps);
    (comps, ll)
}

/// ln(w · N(x | μ, σ)) for one component, x in log10(FZI µm).
fn log_weighted_density(c: &Component, x: f64) -> f64 {
    let z = (x - c.mean_log10) / c.sd_log10;
    c.weight.ln() - c.sd_log10.ln() - HALF_LN_2PI - 0.5 * z * z
}

/// Class boundary (log10 FZI µm) between adjacent components `a` and `b`
/// (`a.mean_log10 <= b.mean_log10`): the point in `[μa, μb]` where their
/// weighted densities are equal, by bisection on the difference of log
/// weighted densities. The difference is quadratic in x, so a sign change
/// across the interval brackets exactly one root. If `a` is dominated over the
/// whole interval the boundary is `μa`; if `b` is, it is `μb`.
fn boundary_log10(a: &Component, b: &Component) -> f64 {
    let diff = |x: f64| log_weighted_density(a, x) - log_weighted_density(b, x);
    let (mut lo, mut hi) = (a.mean_log10, b.mean_log10);
    let d_lo = diff(lo);
    let d_hi = diff(hi);
    if d_lo == 0.0 {
        return lo;
    }
    if d_hi == 0.0 {
        return hi;
    }
    if d_lo < 0.0 && d_hi < 0.0 {
        return lo;
    }
    if d_lo > 0.0 && d_hi > 0.0 {
        return hi;
    }
    if !(d_lo > 0.0 && d_hi < 0.0) {
        // Only reachable with non-finite parameters.
        return 0.5 * (lo + hi);
    }
    for _ in 0..BISECTION_MAX_ITER {
        let mid = 0.5 * (lo + hi);
        if mid <= lo || mid >= hi {
            break;
        }
        let d = diff(mid);
        if d > 0.0 {
            lo = mid;
        } else if d < 0.0 {
            hi = mid;
        } else {
            return mid;
        }
    }
    0.5 * (lo + hi)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Inverse standard-normal CDF by P. J. Acklam's rational approximation
    /// (unpublished web note, c. 2003): a rational function of `p - 0.5` in
    /// the centre and of `sqrt(-2 ln p)` in the tails, split at p = 0.02425;
    /// relative error about 1.15e-9. Coefficients written from memory and
    /// checked against reference quantiles in `inverse_normal_reference_values`.
    fn inverse_normal_cdf(p: f64) -> f64 {
        const A: [f64; 6] = [
            -3.969683028665376e1,
            2.209460984245205e2,
            -2.759285104469687e2,
            1.38357751867269e2,
            -3.066479806614716e1,
            2.506628277459239,
        ];
        const B: [f64; 5] = [
            -5.447609879822406e1,
            1.615858368580409e2,
            -1.556989798598866e2,
            6.680131188771972e1,
            -1.328068155288572e1,
        ];
        const C: [f64; 6] = [
            -7.784894002430293e-3,
            -3.223964580411365e-1,
            -2.400758277161838,
            -2.549732539343734,
            4.374664141464968,
            2.938163982698783,
        ];
        const D: [f64; 4] = [
            7.784695709041462e-3,
            3.224671290700398e-1,
            2.445134137142996,
            3.754408661907416,
        ];
        const P_LOW: f64 = 0.02425;
        let tail = |q: f64| {
            (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5])
                / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1.0)
        };
        if p < P_LOW {
            tail((-2.0 * p.ln()).sqrt())
        } else if p > 1.0 - P_LOW {
            -tail((-2.0 * (1.0 - p).ln()).sqrt())
        } else {
            let q = p - 0.5;
            let r = q * q;
            (((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q
                / (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1.0)
        }
    }

    /// n deterministic "samples" of N(mean, sd) in log10 space at the normal
    /// quantiles (i + 0.5) / n, returned as FZI in µm.
    fn lognormal_group(mean_log10: f64, sd_log10: f64, n: usize) -> Vec<f64> {
        (0..n)
            .map(|i| {
                let z = inverse_normal_cdf((i as f64 + 0.5) / n as f64);
                10f64.powf(mean_log10 + sd_log10 * z)
            })
            .collect()
    }

    fn rel_diff(a: f64, b: f64) -> f64 {
        (a - b).abs() / b.abs().max(f64::MIN_POSITIVE)
    }

    #[test]
    fn half_ln_2pi_constant() {
        assert!((HALF_LN_2PI - 0.5 * (2.0 * std::f64::consts::PI).ln()).abs() < 1e-15);
    }

    #[test]
    fn inverse_normal_reference_values() {
        let cases = [
            (0.5, 0.0),
            (0.975, 1.959_963_984_540_054),
            (0.841_344_746_068_542_9, 1.0),
            (0.02, -2.053_748_910_631_823),
            (0.001, -3.090_232_306_167_813_5),
            (0.999_9, 3.719_016_485_455_68),
        ];
        for (p, z) in cases {
            let got = inverse_normal_cdf(p);
            assert!(
                (got - z).abs() < 1e-8 * z.abs().max(1.0),
                "p={p}: {got} vs {z}"
            );
        }
    }

    /// Test 1: three well-separated log-normal groups.
    #[test]
    fn three_separated_groups_recovered() {
        let truth = [0.4f64.log10(), 1.5f64.log10(), 5.0f64.log10()];
        let sd = 0.06;
        let mut data = Vec::new();
        for &m in &truth {
            data.extend(lognormal_group(m, sd, 150));
        }
        let fit = fit_log_fzi(&data, 6, 20, 0.02).unwrap();
        assert_eq!(fit.samples, 450);
        assert_eq!(fit.bic_by_k.len(), 6);
        assert_eq!(fit.components.len(), 3, "bic_by_k = {:?}", fit.bic_by_k);
        for (c, &m) in fit.components.iter().zip(&truth) {
            assert!((c.mean_log10 - m).abs() < 0.02, "{c:?} vs mean {m}");
            assert!(rel_diff(c.sd_log10, sd) < 0.2, "{c:?} vs sd {sd}");
            assert!((c.weight - 1.0 / 3.0).abs() < 0.03, "{c:?}");
        }
        let best = fit
            .bic_by_k
            .iter()
            .min_by(|a, b| a.1.total_cmp(&b.1))
            .unwrap();
        assert_eq!(best.0, 3);
        assert_eq!(best.1, fit.bic);
        let expected_bic = -2.0 * fit.log_likelihood + 8.0 * 450f64.ln();
        assert!((fit.bic - expected_bic).abs() < 1e-9 * expected_bic.abs());

        assert_eq!(fit.boundaries_um.len(), 2);
        let centres = [0.4, 1.5, 5.0];
        for (i, &b) in fit.boundaries_um.iter().enumerate() {
            assert!(b > centres[i] && b < centres[i + 1], "boundary {b}");
            let geo_mid = (centres[i] * centres[i + 1]).sqrt();
            assert!(rel_diff(b, geo_mid) < 0.05, "boundary {b} vs {geo_mid}");
        }
    }

    /// Test 2: a single group must not be split.
    #[test]
    fn one_group_gives_one_component() {
        let data = lognormal_group(2.0f64.log10(), 0.1, 300);
        let fit = fit_log_fzi(&data, 6, 10, 0.02).unwrap();
        assert_eq!(fit.components.len(), 1, "bic_by_k = {:?}", fit.bic_by_k);
        assert!(fit.boundaries_um.is_empty());
        assert!((fit.components[0].weight - 1.0).abs() < 1e-12);
        assert!((fit.components[0].mean_log10 - 2.0f64.log10()).abs() < 1e-3);
    }

    /// Test 3: k = 1 reproduces the closed-form Gaussian MLE log-likelihood.
    #[test]
    fn single_component_matches_closed_form_mle() {
        let mut data = lognormal_group(0.3, 0.25, 200);
        data.extend(lognormal_group(-0.1, 0.1, 57)); // skewed, not Gaussian
        let x: Vec<f64> = data.iter().map(|v| v.log10()).collect();
        let n = x.len() as f64;
        let mean = x.iter().sum::<f64>() / n;
        let var = x.iter().map(|v| (v - mean).powi(2)).sum::<f64>() / n;
        let ll_closed = -0.5 * n * ((2.0 * std::f64::consts::PI * var).ln() + 1.0);

        let fit = fit_log_fzi(&data, 1, 1, 0.02).unwrap();
        assert_eq!(fit.components.len(), 1);
        assert!(
            rel_diff(fit.log_likelihood, ll_closed) < 1e-9,
            "{} vs {ll_closed}",
            fit.log_likelihood
        );
        assert!((fit.components[0].mean_log10 - mean).abs() < 1e-12);
        assert!(rel_diff(fit.components[0].sd_log10, var.sqrt()) < 1e-12);
        let expected_bic = -2.0 * ll_closed + 2.0 * n.ln();
        assert!(rel_diff(fit.bic, expected_bic) < 1e-9);
    }

    /// Test 4: bad input is rejected or skipped, never panics.
    #[test]
    fn bad_input_handling() {
        assert!(fit_log_fzi(&[], 4, 1, 0.02).is_err());
        assert!(fit_log_fzi(&[1.0], 4, 1, 0.02).is_err());
        let only_one_good = [f64::NAN, 0.0, -1.0, f64::INFINITY, f64::NEG_INFINITY, 1.0];
        let err = fit_log_fzi(&only_one_good, 4, 1, 0.02).unwrap_err();
        assert_eq!(
            err,
            ClusterError::TooFewValues {
                usable: 1,
                supplied: 6
            }
        );
        assert!(err.to_string().contains("at least 2"), "{err}");

        let mixed = [f64::NAN, 0.0, -1.0, 1.0, f64::INFINITY, 2.0, -0.0, 3.0];
        let fit = fit_log_fzi(&mixed, 4, 1, 0.02).unwrap();
        assert_eq!(fit.samples, 3);
        let w: f64 = fit.components.iter().map(|c| c.weight).sum();
        assert!((w - 1.0).abs() < 1e-12);

        // Parameter problems are errors, not panics.
        assert_eq!(
            fit_log_fzi(&[1.0, 2.0], 0, 1, 0.02).unwrap_err(),
            ClusterError::NoComponents
        );
        assert!(fit_log_fzi(&[1.0, 2.0], 3, 1, f64::NAN).is_err());
        assert_eq!(
            fit_log_fzi(&[1.0, 2.0], 3, 1, -0.1).unwrap_err(),
            ClusterError::BadMinSd(-0.1)
        );
        assert!(fit_log_fzi(&[1.0, 2.0], 3, 1, f64::INFINITY).is_err());
        // min_per_component = 0 and larger than n are tolerated: k = 1 still fitted.
        assert!(fit_log_fzi(&[1.0, 2.0, 3.0], 3, 0, 0.0).is_ok());
        let fit = fit_log_fzi(&[1.0, 2.0, 3.0], 3, 100, 0.02).unwrap();
        assert_eq!(fit.bic_by_k.len(), 1);
    }

    #[test]
    fn all_equal_values_give_one_component() {
        let mut data = vec![1.7; 100];
        data.push(f64::NAN);
        let fit = fit_log_fzi(&data, 5, 1, 0.02).unwrap();
        assert_eq!(fit.samples, 100);
        assert_eq!(fit.components.len(), 1);
        assert_eq!(fit.bic_by_k.len(), 1);
        assert!(fit.boundaries_um.is_empty());
        assert!((fit.components[0].mean_log10 - 1.7f64.log10()).abs() < 1e-12);
        assert_eq!(fit.components[0].sd_log10, 0.02);
        assert!(fit.log_likelihood.is_finite() && fit.bic.is_finite());
        // Even with no sd floor requested, the hard floor keeps it finite.
        let fit = fit_log_fzi(&data, 5, 1, 0.0).unwrap();
        assert_eq!(fit.components[0].sd_log10, HARD_MIN_SD_LOG10);
        assert!(fit.log_likelihood.is_finite());
    }

    #[test]
    fn min_per_component_caps_k() {
        let mut data = Vec::new();
        for m in [0.4f64, 1.5, 5.0] {
            data.extend(lognormal_group(m.log10(), 0.06, 150));
        }
        let fit = fit_log_fzi(&data, 6, 200, 0.02).unwrap();
        assert_eq!(
            fit.bic_by_k.iter().map(|p| p.0).collect::<Vec<_>>(),
            vec![1, 2]
        );
        assert_eq!(fit.components.len(), 2);
    }

    /// Test 5: equal-weight, equal-sd pair → boundary at the log-space midpoint.
    #[test]
    fn symmetric_pair_boundary_at_midpoint() {
        let (m1, m2) = (0.5f64.log10(), 3.0f64.log10());
        let mut data = lognormal_group(m1, 0.08, 200);
        data.extend(lognormal_group(m2, 0.08, 200));
        let fit = fit_log_fzi(&data, 4, 10, 0.02).unwrap();
        assert_eq!(fit.components.len(), 2, "bic_by_k = {:?}", fit.bic_by_k);
        let b = fit.boundaries_um[0].log10();
        assert!(
            (b - 0.5 * (m1 + m2)).abs() < 1e-3,
            "{b} vs {}",
            0.5 * (m1 + m2)
        );
        // Between the fitted means as well.
        let fitted_mid = 0.5 * (fit.components[0].mean_log10 + fit.components[1].mean_log10);
        assert!((b - fitted_mid).abs() < 1e-3);
    }

    #[test]
    fn boundary_helper_exact_cases() {
        let a = Component {
            weight: 0.5,
            mean_log10: -0.3,
            sd_log10: 0.07,
        };
        let b = Component {
            weight: 0.5,
            mean_log10: 0.45,
            sd_log10: 0.07,
        };
        assert!((boundary_log10(&a, &b) - 0.075).abs() < 1e-12);

        // Unequal weights and sds: compare with the root of the quadratic
        // ln(wa/sa) - (x-ma)^2/(2 sa^2) = ln(wb/sb) - (x-mb)^2/(2 sb^2).
        let a = Component {
            weight: 0.7,
            mean_log10: -0.2,
            sd_log10: 0.05,
        };
        let b = Component {
            weight: 0.3,
            mean_log10: 0.3,
            sd_log10: 0.1,
        };
        let (pa, pb) = (
            1.0 / (a.sd_log10 * a.sd_log10),
            1.0 / (b.sd_log10 * b.sd_log10),
        );
        let qa = 0.5 * (pb - pa);
        let qb = pa * a.mean_log10 - pb * b.mean_log10;
        let qc = 0.5 * (pb * b.mean_log10.powi(2) - pa * a.mean_log10.powi(2))
            + (a.weight / a.sd_log10).ln()
            - (b.weight / b.sd_log10).ln();
        let disc = (qb * qb - 4.0 * qa * qc).sqrt();
        let roots = [(-qb - disc) / (2.0 * qa), (-qb + disc) / (2.0 * qa)];
        let root = *roots
            .iter()
            .find(|r| **r > a.mean_log10 && **r < b.mean_log10)
            .unwrap();
        assert!((boundary_log10(&a, &b) - root).abs() < 1e-10);

        // Dominated component: boundary at the dominated mean.
        let tiny = Component {
            weight: 1e-9,
            mean_log10: 0.0,
            sd_log10: 0.5,
        };
        let big = Component {
            weight: 1.0,
            mean_log10: 0.1,
            sd_log10: 0.05,
        };
        assert_eq!(boundary_log10(&tiny, &big), 0.0);
    }

    #[test]
    fn large_n_two_groups() {
        let mut data = lognormal_group(0.2f64.log10(), 0.1, 12_000);
        data.extend(lognormal_group(2.0f64.log10(), 0.15, 8_000));
        let fit = fit_log_fzi(&data, 3, 100, 0.02).unwrap();
        assert_eq!(fit.samples, 20_000);
        assert!(fit.components.len() >= 2);
        assert!(fit.log_likelihood.is_finite() && fit.bic.is_finite());
    }

    /// Pseudo-random garbage in (xorshift, no crates): never panic, and any
    /// successful fit satisfies the structural invariants.
    #[test]
    fn fuzz_invariants() {
        let mut state: u64 = 0x9E37_79B9_7F4A_7C15;
        let mut next = move || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            state
        };
        for _ in 0..300 {
            let n = (next() % 120) as usize;
            let data: Vec<f64> = (0..n)
                .map(|_| match next() % 12 {
                    0 => f64::NAN,
                    1 => f64::INFINITY,
                    2 => -1.0,
                    3 => 0.0,
                    4 => f64::MAX,
                    5 => 5e-324,
                    6 => 1.0,
                    _ => 10f64.powf((next() % 10_000) as f64 / 2_500.0 - 2.0),
                })
                .collect();
            let max_k = (next() % 8) as usize;
            let min_per = (next() % 12) as usize;
            let min_sd = [0.0, 0.02, 0.1, 1e-9][(next() % 4) as usize];
            let usable = data.iter().filter(|v| v.is_finite() && **v > 0.0).count();
            match fit_log_fzi(&data, max_k, min_per, min_sd) {
                Ok(fit) => {
                    assert_eq!(fit.samples, usable);
                    let k = fit.components.len();
                    assert!(k >= 1 && k <= max_k);
                    assert_eq!(fit.boundaries_um.len(), k - 1);
                    let w: f64 = fit.components.iter().map(|c| c.weight).sum();
                    assert!((w - 1.0).abs() < 1e-9);
                    assert!(fit.log_likelihood.is_finite() && fit.bic.is_finite());
                    assert!(
                        fit.components
                            .windows(2)
                            .all(|p| p[0].mean_log10 <= p[1].mean_log10)
                    );
                    assert!(
                        fit.components
                            .iter()
                            .all(|c| c.sd_log10 >= min_sd.max(HARD_MIN_SD_LOG10))
                    );
                    assert!(fit.boundaries_um.windows(2).all(|p| p[0] <= p[1]));
                    for (i, b) in fit.boundaries_um.iter().enumerate() {
                        let lb = b.log10();
                        let (lo, hi) = (
                            fit.components[i].mean_log10,
                            fit.components[i + 1].mean_log10,
                        );
                        assert!(
                            lb >= lo - 1e-9 * lo.abs().max(1.0)
                                && lb <= hi + 1e-9 * hi.abs().max(1.0)
                        );
                    }
                    assert!(fit.bic_by_k.iter().enumerate().all(|(i, p)| p.0 == i + 1));
                }
                Err(_) => assert!(usable < 2 || max_k == 0),
            }
        }
    }
}
