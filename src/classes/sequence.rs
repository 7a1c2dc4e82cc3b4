//! Bed sequence: a hidden Markov model along depth that turns each depth's
//! class probabilities into posteriors that know their neighbours.
//!
//! Classes are bed properties and beds span many samples, so the class at a
//! depth is not independent of the class just above it. The hidden state is
//! the class; the chain stays in its class from one sample to the next with
//! probability `stay` = 1 − step / L (L the mean bed thickness) and otherwise
//! moves to another class in proportion to that class's prior. Each depth
//! emits the predictor's class probabilities divided by the class priors
//! (a scaled likelihood, the usual way a classifier's posterior enters an
//! HMM). The forward-backward recursions give each depth's posterior; the
//! class is the most probable one at that depth.
//!
//! # Source
//! Rabiner, L. R. (1989), A tutorial on hidden Markov models and selected
//! applications in speech recognition, Proc. IEEE 77(2), 257-286: the
//! forward-backward procedure with scaling (from memory). Scaled likelihoods
//! from a classifier's posteriors: Bourlard & Morgan (1994), Connectionist
//! Speech Recognition (from memory).

/// Share of every probability spread evenly over the classes before the
/// chain reads it, so a class no tree voted for stays possible (our choice:
/// a forest of 100 trees cannot say less than 1 %).
pub const PROBABILITY_FLOOR: f64 = 0.02;

/// The chain's settings.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct SequenceModel {
    /// Mean bed thickness, m, that sets how often the class changes.
    pub bed_thickness_m: f64,
    /// Prior of each class, class 1 first (the training core's shares).
    pub prior: Vec<f64>,
}

impl SequenceModel {
    /// Probability that the class stays the same over `step_m` of depth.
    pub fn stay(&self, step_m: f64) -> f64 {
        (1.0 - step_m / self.bed_thickness_m.max(step_m)).clamp(0.0, 1.0 - 1e-9)
    }

    /// The chain's emissions (`k` per depth: floored probabilities over the
    /// priors) and transition matrix (row-major, from → to) for `probs`.
    fn emissions_and_transitions(&self, probs: &[f64], step_m: f64) -> (Vec<f64>, Vec<f64>) {
        let k = self.prior.len();
        let stay = self.stay(step_m);
        let prior: Vec<f64> = self.prior.iter().map(|p| p.max(1e-6)).collect();
        // emissions: floored probabilities over priors
        let emit: Vec<f64> = probs
            .chunks_exact(k)
            .flat_map(|row| {
                let sum: f64 = row.iter().filter(|v| v.is_finite()).sum();
                row.iter()
                    .zip(&prior)
                    .map(move |(v, p)| {
                        let v = if v.is_finite() && sum > 0.0 {
                            v / sum
                        } else {
                            1.0 / k as f64
                        };
                        ((1.0 - PROBABILITY_FLOOR) * v + PROBABILITY_FLOOR / k as f64) / p
                    })
                    .collect::<Vec<_>>()
            })
            .collect();
        // leave class i for class j in proportion to j's prior among the others
        let trans = |i: usize, j: usize| -> f64 {
            if i == j {
                stay
            } else {
                (1.0 - stay) * prior[j] / (1.0 - prior[i]).max(1e-9)
            }
        };
        let t: Vec<f64> = (0..k * k).map(|ij| trans(ij / k, ij % k)).collect();
        (emit, t)
    }

    /// The forward pass: each depth's filtered probabilities (normalised
    /// alphas), `k` per depth.
    fn forward(&self, emit: &[f64], t: &[f64]) -> Vec<f64> {
        let k = self.prior.len();
        let n = emit.len() / k;
        let prior: Vec<f64> = self.prior.iter().map(|p| p.max(1e-6)).collect();
        let mut alpha = vec![0.0; n * k];
        for j in 0..k {
            alpha[j] = prior[j] * emit[j];
        }
        normalise(&mut alpha[..k]);
        for i in 1..n {
            let (done, rest) = alpha.split_at_mut(i * k);
            let prev = &done[(i - 1) * k..];
            for j in 0..k {
                let into: f64 = (0..k).map(|a| prev[a] * t[a * k + j]).sum();
                rest[j] = into * emit[i * k + j];
            }
            normalise(&mut rest[..k]);
        }
        alpha
    }

    /// `draws` class sequences (1-based, draw-major, `n` per draw) from the
    /// chain's joint posterior along one run of consecutive depths, by
    /// forward filtering and backward sampling (Frühwirth-Schnatter 1994,
    /// J. Time Series Analysis 15(2); Chib 1996, J. Econometrics 75(1);
    /// from memory): a class is drawn at the deepest depth from its filtered
    /// probabilities, then each depth above given the one below. Draws keep
    /// beds whole (a class changes where the chain would change it), which
    /// independent draws per depth would not.
    pub fn sample_paths(
        &self,
        probs: &[f64],
        step_m: f64,
        draws: usize,
        rng: &mut impl rand::Rng,
    ) -> Vec<u8> {
        let k = self.prior.len();
        if k < 1 || probs.len() < k {
            return Vec::new();
        }
        let n = probs.len() / k;
        let (emit, t) = self.emissions_and_transitions(probs, step_m);
        let alpha = self.forward(&emit, &t);
        // the backward step's distribution at depth i given the class below
        // it, p(c_i | c_i+1, data up to i) ∝ alpha_i · t(c_i → c_i+1), as
        // cumulative shares, once for all draws: a draw is then one uniform
        // and a search per depth
        let cumulative = |w: &mut [f64]| {
            let mut acc = 0.0;
            for v in w.iter_mut() {
                acc += *v;
                *v = acc;
            }
            for v in w.iter_mut() {
                *v /= acc;
            }
        };
        let mut table = vec![0.0; n * k * k];
        for i in 0..n - 1 {
            for next in 0..k {
                let row = &mut table[(i * k + next) * k..(i * k + next + 1) * k];
                for (j, r) in row.iter_mut().enumerate() {
                    *r = alpha[i * k + j] * t[j * k + next];
                }
                cumulative(row);
            }
        }
        let mut last = alpha[(n - 1) * k..n * k].to_vec();
        cumulative(&mut last);
        // a row whose one class holds all but 1e-12 of the share is that
        // class without a draw (inside a clear bed, most rows): the bias is
        // below 1e-12 per depth, and which rows are sure depends on the
        // data alone, so draws stay the same on any thread
        const SURE: f64 = 1.0 - 1e-12;
        let sure: Vec<Option<usize>> = table
            .chunks_exact(k)
            .map(|row| {
                let mut below = 0.0;
                row.iter().position(|&c| {
                    let share = c - below;
                    below = c;
                    share >= SURE
                })
            })
            .collect();
        // the first class whose cumulative share passes u (the last when
        // none does: a row of zeros or NaN)
        let pick = |row: &[f64], u: f64| row.iter().position(|&c| u < c).unwrap_or(k - 1);
        let mut out = vec![0u8; draws * n];
        for d in 0..draws {
            let path = &mut out[d * n..(d + 1) * n];
            let mut next = pick(&last, rng.random::<f64>());
            path[n - 1] = u8::try_from(next + 1).unwrap_or(u8::MAX);
            for i in (0..n - 1).rev() {
                let at = i * k + next;
                next = match sure[at] {
                    Some(c) => c,
                    None => pick(&table[at * k..(at + 1) * k], rng.random::<f64>()),
                };
                path[i] = u8::try_from(next + 1).unwrap_or(u8::MAX);
            }
        }
        out
    }

    /// Posteriors along one run of consecutive depths, in place:
    /// `probs` holds `k` class probabilities (class 1 first) per depth, and
    /// is replaced by each depth's posterior. `step_m` is the sample step.
    pub fn smooth(&self, probs: &mut [f64], step_m: f64) {
        let k = self.prior.len();
        if k < 2 || probs.len() < k {
            return;
        }
        let n = probs.len() / k;
        let (emit, t) = self.emissions_and_transitions(probs, step_m);
        let alpha = self.forward(&emit, &t);
        let mut beta = vec![1.0; k];
        let mut next = vec![0.0; k];
        for i in (0..n).rev() {
            let post = &mut probs[i * k..(i + 1) * k];
            for j in 0..k {
                post[j] = alpha[i * k + j] * beta[j];
            }
            normalise(post);
            if i > 0 {
                for a in 0..k {
                    next[a] = (0..k)
                        .map(|b| t[a * k + b] * emit[i * k + b] * beta[b])
                        .sum();
                }
                normalise(&mut next);
                beta.copy_from_slice(&next);
            }
        }
    }
}

fn normalise(v: &mut [f64]) {
    let s: f64 = v.iter().sum();
    if s > 0.0 && s.is_finite() {
        for x in v.iter_mut() {
            *x /= s;
        }
    } else {
        let u = 1.0 / v.len() as f64;
        v.iter_mut().for_each(|x| *x = u);
    }
}

/// Mean bed thickness, m, from the cored wells: along each well's plugs in
/// depth order, the cored length over the number of class runs. `None` with
/// no well holding two plugs.
pub fn bed_thickness_from_core(wells: &[Vec<(f64, u8)>]) -> Option<f64> {
    let (mut length, mut runs) = (0.0, 0usize);
    for w in wells {
        let mut v = w.clone();
        v.sort_by(|a, b| a.0.total_cmp(&b.0));
        if v.len() < 2 {
            continue;
        }
        length += v[v.len() - 1].0 - v[0].0;
        runs += 1 + v.windows(2).filter(|p| p[0].1 != p[1].1).count();
    }
    (runs > 0 && length > 0.0).then(|| length / runs as f64)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

    fn model(l: f64) -> SequenceModel {
        SequenceModel {
            bed_thickness_m: l,
            prior: vec![0.5, 0.5],
        }
    }

    /// A single depth has no neighbours: its posterior is its (floored)
    /// probability, since the priors are equal (computed by hand: 0.98·0.8 +
    /// 0.01 = 0.794).
    #[test]
    fn one_depth_keeps_its_probability() {
        let mut p = vec![0.8, 0.2];
        model(1.0).smooth(&mut p, 0.1524);
        assert_close(p[0], 0.794, 1e-12);
    }

    /// A lone dissenting depth inside a thick bed is outvoted by its
    /// neighbours; with beds as thin as one sample it keeps its own class.
    #[test]
    fn a_lone_outlier_follows_its_bed() {
        let mut p: Vec<f64> = (0..21)
            .flat_map(|i| if i == 10 { [0.3, 0.7] } else { [0.8, 0.2] })
            .collect();
        let raw = p.clone();
        model(3.0).smooth(&mut p, 0.1524);
        assert!(p[20] > 0.5, "thick beds: {:?}", &p[20..22]);
        let mut q = raw;
        model(0.1524).smooth(&mut q, 0.1524);
        assert!(q[21] > 0.5, "one-sample beds: {:?}", &q[20..22]);
    }

    /// Two clear beds keep their boundary: the posterior switches between the
    /// same two samples as the probabilities do.
    #[test]
    fn a_clear_boundary_stays_put() {
        let mut p: Vec<f64> = (0..30)
            .flat_map(|i| if i < 15 { [0.9, 0.1] } else { [0.1, 0.9] })
            .collect();
        model(2.0).smooth(&mut p, 0.1524);
        assert!(p[14 * 2] > 0.5 && p[15 * 2] < 0.5);
    }

    /// Posteriors are probabilities whatever the input, NaN rows included.
    #[test]
    fn posteriors_sum_to_one() {
        let mut p = vec![0.0, 0.0, f64::NAN, 1.0, 0.3, 0.7, 1.0, 0.0];
        let m = SequenceModel {
            bed_thickness_m: 0.5,
            prior: vec![0.9, 0.1],
        };
        m.smooth(&mut p, 0.1524);
        for r in p.chunks(2) {
            assert_close(r[0] + r[1], 1.0, 1e-12);
            assert!(r.iter().all(|v| (0.0..=1.0).contains(v)));
        }
    }

    /// Bed thickness from plug classes: 3 m cored with classes 1 1 2 2 2 1 is
    /// three runs, 1 m each (constructed case).
    #[test]
    fn bed_thickness_counts_runs() {
        let w: Vec<(f64, u8)> = [1, 1, 2, 2, 2, 1]
            .iter()
            .enumerate()
            .map(|(i, &c)| (100.0 + 0.6 * i as f64, c))
            .collect();
        assert_close(bed_thickness_from_core(&[w]).unwrap(), 1.0, 1e-12);
        assert_eq!(bed_thickness_from_core(&[vec![(1.0, 1)]]), None);
    }

    /// Forward filtering and backward sampling draws from the chain's joint
    /// posterior, so each depth's share of draws in a class converges to the
    /// forward-backward posterior of that depth ([`SequenceModel::smooth`]),
    /// the check Frühwirth-Schnatter (1994) gives for the sampler; and a
    /// draw keeps beds whole: its class changes about as often as the chain
    /// allows (L / step samples a bed), far less than independent draws.
    #[test]
    fn sampled_paths_follow_the_posterior_and_keep_beds_whole() {
        use rand::SeedableRng;
        let m = model(1.0);
        // 60 depths: class 1 likely above, class 2 likely below, an
        // ambiguous stretch between
        let mut p: Vec<f64> = (0..60)
            .flat_map(|i| {
                let w = if i < 25 {
                    0.8
                } else if i < 35 {
                    0.5
                } else {
                    0.25
                };
                [w, 1.0 - w]
            })
            .collect();
        let raw = p.clone();
        m.smooth(&mut p, 0.1524);
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(9);
        let draws = 4000;
        let paths = m.sample_paths(&raw, 0.1524, draws, &mut rng);
        assert_eq!(paths.len(), draws * 60);
        for i in 0..60 {
            let ones = (0..draws).filter(|d| paths[d * 60 + i] == 1).count() as f64 / draws as f64;
            // 4000 draws: 3 standard errors of a share are at most 0.024
            assert!(
                (ones - p[2 * i]).abs() < 0.024,
                "depth {i}: {ones} against {}",
                p[2 * i]
            );
        }
        let changes = |path: &[u8]| path.windows(2).filter(|w| w[0] != w[1]).count();
        let mean_changes = (0..draws)
            .map(|d| changes(&paths[d * 60..(d + 1) * 60]))
            .sum::<usize>() as f64
            / draws as f64;
        // independent draws from the same posteriors change class at about
        // Σ (p·q' + q·p') over neighbours: many times more often
        let independent: f64 = (0..59)
            .map(|i| {
                let (a, b) = (p[2 * i], p[2 * i + 2]);
                a * (1.0 - b) + (1.0 - a) * b
            })
            .sum();
        assert!(
            mean_changes < 0.5 * independent,
            "{mean_changes} changes, independent {independent}"
        );
    }
}
