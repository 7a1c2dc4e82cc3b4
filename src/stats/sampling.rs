//! Sampling the input distributions: Latin hypercube (or plain random)
//! probabilities per variable, the rank correlations asked for induced by the
//! method of Iman & Conover (1982, "A distribution-free approach to inducing
//! rank correlation among input variables", Communications in Statistics -
//! Simulation and Computation 11(3); from memory), then each variable's
//! quantile function.
//!
//! Everything is drawn once per run, from one seeded generator, in a fixed
//! order, before any well: the samples do not depend on the thread count or
//! on how the wells are split into shards.

use rand::seq::SliceRandom;
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use statrs::distribution::{ContinuousCDF, Normal};

/// How probabilities are drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Deserialize, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Sampling {
    /// Latin hypercube: each variable's N probabilities fall one in each of
    /// N equal strata, in random order (McKay, Beckman & Conover 1979,
    /// Technometrics 21(2); from memory).
    #[default]
    LatinHypercube,
    /// Independent uniform probabilities.
    Plain,
}

/// The Cholesky factor L (lower triangular, row-major, L·Lᵀ = `a`) of a
/// symmetric `k`×`k` matrix; `None` when it is not positive definite.
/// Hand-written: the matrices are a few variables across, and a linear
/// algebra crate would add more build than this function's lines.
pub fn cholesky(a: &[f64], k: usize) -> Option<Vec<f64>> {
    let mut l = vec![0.0; k * k];
    for i in 0..k {
        for j in 0..=i {
            let s: f64 = (0..j).map(|p| l[i * k + p] * l[j * k + p]).sum();
            if i == j {
                let d = a[i * k + i] - s;
                if d.is_nan() || d <= 1e-10 {
                    return None;
                }
                l[i * k + j] = d.sqrt();
            } else {
                l[i * k + j] = (a[i * k + j] - s) / l[j * k + j];
            }
        }
    }
    Some(l)
}

/// Sample correlation matrix of the columns of `m` (`n` rows × `k`, column-major).
fn correlation_matrix(m: &[Vec<f64>]) -> Vec<f64> {
    let k = m.len();
    let mut c = vec![0.0; k * k];
    for i in 0..k {
        for j in 0..k {
            let pairs: Vec<(f64, f64)> = m[i].iter().copied().zip(m[j].iter().copied()).collect();
            c[i * k + j] = if i == j {
                1.0
            } else {
                crate::stats::correlation(&pairs)
            };
        }
    }
    c
}

/// Probabilities (0-1) for `k` variables × `n` realisations (`p[var][r]`),
/// with rank correlations near `target` (`k`×`k`, row-major; identity for
/// none). `Err` when `target` is not positive definite.
pub fn probabilities(
    k: usize,
    n: usize,
    target: &[f64],
    sampling: Sampling,
    seed: u64,
) -> Result<Vec<Vec<f64>>, String> {
    let l_target = cholesky(target, k).ok_or(
        "the correlations asked for are not a possible set (the matrix is not positive definite)",
    )?;
    let mut rng = ChaCha8Rng::seed_from_u64(seed);
    let mut p: Vec<Vec<f64>> = (0..k)
        .map(|_| match sampling {
            Sampling::LatinHypercube => {
                let mut strata: Vec<usize> = (0..n).collect();
                strata.shuffle(&mut rng);
                strata
                    .into_iter()
                    .map(|s| (s as f64 + rng.random::<f64>()) / n as f64)
                    .collect()
            }
            Sampling::Plain => (0..n).map(|_| rng.random::<f64>()).collect(),
        })
        .collect();
    let correlated = (0..k).any(|i| (0..k).any(|j| i != j && target[i * k + j] != 0.0));
    if !correlated || n < 3 {
        return Ok(p);
    }
    // Iman-Conover: scores with the target correlation, then each
    // variable's probabilities put in the order of its scores' ranks
    let normal = Normal::standard();
    let vdw: Vec<f64> = (1..=n)
        .map(|i| normal.inverse_cdf(i as f64 / (n as f64 + 1.0)))
        .collect();
    let scores: Vec<Vec<f64>> = (0..k)
        .map(|_| {
            let mut s = vdw.clone();
            s.shuffle(&mut rng);
            s
        })
        .collect();
    // undo the scores' own chance correlation (E = Q·Qᵀ), then impose the
    // target's: T = S · (Q⁻¹)ᵀ · Lᵀ
    let q = cholesky(&correlation_matrix(&scores), k)
        .ok_or("too few realisations to induce the correlations asked for")?;
    let q_inv = lower_inverse(&q, k);
    let m: Vec<f64> = (0..k * k)
        .map(|idx| {
            let (a, b) = (idx / k, idx % k);
            // M = (Q⁻¹)ᵀ · Lᵀ, so M[a][b] = Σ_c Q⁻¹[c][a] · L[b][c]
            (0..k).map(|c| q_inv[c * k + a] * l_target[b * k + c]).sum()
        })
        .collect();
    let t: Vec<Vec<f64>> = (0..k)
        .map(|b| {
            (0..n)
                .map(|r| (0..k).map(|a| scores[a][r] * m[a * k + b]).sum())
                .collect()
        })
        .collect();
    for (col, t) in p.iter_mut().zip(&t) {
        let mut sorted = col.clone();
        sorted.sort_by(f64::total_cmp);
        let r = crate::stats::ranks(t);
        for (row, &rank) in r.iter().enumerate() {
            col[row] = sorted[rank];
        }
    }
    Ok(p)
}

/// The inverse of a lower-triangular `k`×`k` matrix (row-major).
fn lower_inverse(l: &[f64], k: usize) -> Vec<f64> {
    let mut inv = vec![0.0; k * k];
    for i in 0..k {
        inv[i * k + i] = 1.0 / l[i * k + i];
        for j in 0..i {
            let s: f64 = (j..i).map(|p| l[i * k + p] * inv[p * k + j]).sum();
            inv[i * k + j] = -s / l[i * k + i];
        }
    }
    inv
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cholesky_of_a_known_matrix() {
        // [[4, 2], [2, 3]] = L·Lᵀ with L = [[2, 0], [1, sqrt 2]] (by hand)
        let l = cholesky(&[4.0, 2.0, 2.0, 3.0], 2).expect("positive definite");
        let want = [2.0, 0.0, 1.0, 2f64.sqrt()];
        for (a, b) in l.iter().zip(want) {
            assert!((a - b).abs() < 1e-12, "{l:?}");
        }
        // correlations 0.9, 0.9 and -0.9 between three variables cannot hold together
        let bad = [1.0, 0.9, 0.9, 0.9, 1.0, -0.9, 0.9, -0.9, 1.0];
        assert!(cholesky(&bad, 3).is_none());
        let inv = lower_inverse(&l, 2);
        // L · L⁻¹ = I
        let prod = [l[0] * inv[0], l[2] * inv[0] + l[3] * inv[2], l[3] * inv[3]];
        assert!(
            (prod[0] - 1.0).abs() < 1e-12 && prod[1].abs() < 1e-12 && (prod[2] - 1.0).abs() < 1e-12
        );
    }

    /// Latin hypercube: each of the N strata holds exactly one probability
    /// (the definition); plain sampling does not promise it.
    #[test]
    fn latin_hypercube_fills_every_stratum_once() {
        let id = [1.0, 0.0, 0.0, 1.0];
        let p = probabilities(2, 200, &id, Sampling::LatinHypercube, 7).expect("sampled");
        for col in &p {
            let mut seen = [false; 200];
            for &u in col {
                let s = (u * 200.0) as usize;
                assert!(!seen[s], "stratum {s} twice");
                seen[s] = true;
            }
        }
        // the same seed gives the same samples; another seed others
        assert_eq!(
            p,
            probabilities(2, 200, &id, Sampling::LatinHypercube, 7).expect("again")
        );
        assert_ne!(
            p,
            probabilities(2, 200, &id, Sampling::LatinHypercube, 8).expect("other")
        );
    }

    /// The induced rank correlation lands near the target (Iman & Conover
    /// report agreement within a few hundredths at N of a few hundred), and
    /// the marginals are untouched: the same set of probabilities per variable.
    #[test]
    fn rank_correlation_is_induced_and_marginals_kept() {
        for target in [0.6, -0.8, 0.0] {
            let c = [1.0, target, target, 1.0];
            let p = probabilities(2, 400, &c, Sampling::LatinHypercube, 3).expect("sampled");
            let rho = crate::stats::rank_correlation(&p[0], &p[1]);
            assert!((rho - target).abs() < 0.05, "target {target}: {rho}");
            let plain = probabilities(2, 400, &[1.0, 0.0, 0.0, 1.0], Sampling::LatinHypercube, 3)
                .expect("uncorrelated");
            let sorted = |v: &[f64]| {
                let mut s = v.to_vec();
                s.sort_by(f64::total_cmp);
                s
            };
            assert_eq!(sorted(&p[0]), sorted(&plain[0]));
        }
        let bad = [1.0, 0.9, 0.9, 0.9, 1.0, -0.9, 0.9, -0.9, 1.0];
        assert!(probabilities(3, 100, &bad, Sampling::LatinHypercube, 1).is_err());
    }
}
