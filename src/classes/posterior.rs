//! From a well's logs to each depth's class probabilities: the depths the
//! class stage classes, the predictor's vote shares there, and the bed
//! sequence over them. Shared by the wells of a run and by the
//! leave-one-well-out scoring that decides whether the sequence is used.

use crate::classes::core_match::{NO_CLASS_FLAGS, is_reservoir};
use crate::classes::features::depth_m;
use crate::classes::predictor::{Forest, PredictError};
use crate::classes::sequence::SequenceModel;
use crate::config::Feature;
use crate::output::Table;
use crate::output::schema::Col;

/// The depths of a well the class stage classes, with their feature rows.
#[derive(Debug, Default)]
pub struct WellInputs {
    /// Table rows classed, ascending.
    pub rows: Vec<usize>,
    /// Their feature rows, row-major.
    pub x: Vec<f64>,
    /// Depths left out for a FLAG bit that forbids a class.
    pub flagged: usize,
    /// Depths left out as shale (VSH above the predictor's limit).
    pub shale: usize,
    /// Reservoir depths left out for a missing feature value.
    pub missing_feature: usize,
}

/// Rows of `table` that are unflagged reservoir with every feature value,
/// and those values ([`crate::classes::features::rows`]).
pub fn well_inputs(
    table: &Table,
    features: &[Feature],
    scales_m: &[f64],
    max_vsh: f64,
) -> WellInputs {
    let n = table.n_rows();
    let nf = crate::classes::features::width(features.len(), scales_m.len());
    let all = crate::classes::features::rows(table, features, scales_m);
    let vsh = table.get(Col::Vsh).unwrap_or(&[]);
    let flag = table.get(Col::Flag).unwrap_or(&[]);
    let mut w = WellInputs::default();
    for i in 0..n {
        if (flag.get(i).copied().unwrap_or(0.0) as u32) & NO_CLASS_FLAGS != 0 {
            w.flagged += 1;
            continue;
        }
        if !is_reservoir(vsh.get(i).copied(), max_vsh) {
            w.shale += 1;
            continue;
        }
        let row = &all[i * nf..(i + 1) * nf];
        if row.iter().any(|v| !v.is_finite()) {
            w.missing_feature += 1;
            continue;
        }
        w.x.extend_from_slice(row);
        w.rows.push(i);
    }
    w
}

/// The saturation-height evidence of a well, as the class stage reads it.
#[derive(Debug, Clone, Copy)]
pub struct SatEvidence<'a> {
    /// SW from the logs with each class's exponents minus the SWH of that
    /// class at the depth's height above the free water level, row-major over
    /// the table's rows, one value per class (class 1 first); NaN where the
    /// height model says nothing (at or below the FWL, no TVDSS, no PHIE).
    pub residuals: &'a [f64],
    /// The tempering weight: 0 ignores the evidence, 1 takes the residuals
    /// at face value with spread [`SWH_SIGMA_VV`].
    pub weight: f64,
}

/// Nominal spread of log SW about the saturation-height SW of the right
/// class, v/v (common practice puts log SW within about 0.05-0.1 of a good
/// height model above the transition zone; the tempering weight, chosen
/// leave-one-well-out, scales it for the field).
pub const SWH_SIGMA_VV: f64 = 0.1;

/// Share added to every class's vote share before the saturation-height
/// likelihood multiplies it, so that a class no tree voted for can still be
/// raised by strong evidence (half a vote of a 100-tree forest).
pub const FUSION_FLOOR: f64 = 0.005;

/// Bayes' rule at one depth: the class probabilities `p` (from the logs)
/// times each class's likelihood of the SW residual `r` (Gaussian with
/// spread [`SWH_SIGMA_VV`]) raised to `weight`, normalised. A class whose
/// residual is NaN gets the mean likelihood of the others (the evidence says
/// nothing about it). Returns `false`, leaving `p` as it was, when no residual
/// is finite or the weight is not positive.
pub fn fuse_saturation(p: &mut [f64], r: &[f64], weight: f64) -> bool {
    if weight.is_nan() || weight <= 0.0 || p.len() != r.len() || !r.iter().any(|v| v.is_finite()) {
        return false;
    }
    let log_l: Vec<f64> = r
        .iter()
        .map(|v| -0.5 * weight * (v / SWH_SIGMA_VV).powi(2))
        .collect();
    let top = log_l
        .iter()
        .copied()
        .filter(|v| v.is_finite())
        .fold(f64::NEG_INFINITY, f64::max);
    let lik: Vec<f64> = log_l.iter().map(|v| (v - top).exp()).collect();
    let finite: Vec<f64> = lik.iter().copied().filter(|v| v.is_finite()).collect();
    let fill = finite.iter().sum::<f64>() / finite.len() as f64;
    let mut total = 0.0;
    for (pc, l) in p.iter_mut().zip(&lik) {
        *pc = (*pc + FUSION_FLOOR) * if l.is_finite() { *l } else { fill };
        total += *pc;
    }
    if total > 0.0 {
        p.iter_mut().for_each(|v| *v /= total);
    }
    true
}

/// The forest's vote shares at `inputs.rows`, `k` per row (class 1 first).
pub fn vote_shares(
    forest: &Forest,
    inputs: &WellInputs,
    k: usize,
) -> Result<Vec<f64>, PredictError> {
    let slots = forest.class_slots();
    let shares = forest.vote_shares(&inputs.x)?;
    Ok(shares
        .chunks_exact(slots)
        .flat_map(|s| (1..=k).map(move |c| s.get(c).copied().unwrap_or(0.0)))
        .collect())
}

/// Class probabilities from vote shares (`probs`, changed in place): fused
/// with the saturation-height evidence where it speaks
/// ([`fuse_saturation`]), then, with a sequence model, the posteriors of the
/// bed sequence along each run of consecutive rows (`step_m` the sample
/// step). Returns the number of rows the saturation-height evidence informed.
pub fn posterior_from_shares(
    probs: &mut [f64],
    rows: &[usize],
    k: usize,
    sequence: Option<&SequenceModel>,
    step_m: f64,
    saturation: Option<SatEvidence<'_>>,
) -> usize {
    let mut informed = 0;
    if let Some(ev) = saturation {
        for (p, &r) in probs.chunks_exact_mut(k).zip(rows) {
            if let Some(res) = ev.residuals.get(r * k..(r + 1) * k) {
                informed += usize::from(fuse_saturation(p, res, ev.weight));
            }
        }
    }
    if let Some(seq) = sequence.filter(|s| s.prior.len() == k) {
        let mut start = 0;
        for end in 1..=rows.len() {
            if end == rows.len() || rows[end] != rows[end - 1] + 1 {
                seq.smooth(&mut probs[start * k..end * k], step_m);
                start = end;
            }
        }
    }
    informed
}

/// Class probabilities at `inputs.rows`, `k` per row (class 1 first): the
/// forest's vote shares, fused with the saturation-height evidence, then
/// smoothed by the bed sequence ([`posterior_from_shares`]); with the number
/// of rows the saturation-height evidence informed, and what the Monte Carlo
/// draws classes from (the fused probabilities before the bed sequence).
pub fn class_probabilities(
    forest: &Forest,
    inputs: &WellInputs,
    k: usize,
    sequence: Option<&SequenceModel>,
    step_m: f64,
    saturation: Option<SatEvidence<'_>>,
) -> Result<(Vec<f64>, usize, ClassEvidence), PredictError> {
    let mut probs = vote_shares(forest, inputs, k)?;
    let informed = posterior_from_shares(&mut probs, &inputs.rows, k, None, step_m, saturation);
    let evidence = ClassEvidence {
        rows: inputs.rows.clone(),
        k,
        probs: probs.clone(),
        step_m,
        sequence: sequence.filter(|s| s.prior.len() == k).cloned(),
    };
    posterior_from_shares(&mut probs, &inputs.rows, k, sequence, step_m, None);
    Ok((probs, informed, evidence))
}

/// What the Monte Carlo draws a well's classes from: its classed rows, their
/// class probabilities before the bed sequence (`k` per row, class 1
/// first), the sample step and the bed sequence model.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct ClassEvidence {
    /// The classed rows of the well, ascending.
    pub rows: Vec<usize>,
    /// Classes of the scheme.
    pub k: usize,
    /// `k` probabilities per row of `rows`, before the bed sequence.
    pub probs: Vec<f64>,
    /// The sample step, m.
    pub step_m: f64,
    /// The bed sequence model, when the class model has one.
    pub sequence: Option<SequenceModel>,
}

impl ClassEvidence {
    /// `draws` class columns of `n_rows` rows (draw-major; 0 where a row has
    /// no class). With a bed sequence, each run of consecutive classed rows
    /// is one joint draw of the chain ([`SequenceModel::sample_paths`]), so
    /// beds stay whole; without one, each row is drawn alone from its
    /// probabilities. `seed` fixes the draws.
    pub fn draw(&self, n_rows: usize, draws: usize, seed: u64) -> Vec<u8> {
        use rand::{Rng, SeedableRng};
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(seed);
        let k = self.k;
        let mut out = vec![0u8; draws * n_rows];
        if k == 0 {
            return out;
        }
        let rows = &self.rows;
        let mut start = 0;
        for end in 1..=rows.len() {
            if end < rows.len() && rows[end] == rows[end - 1] + 1 {
                continue;
            }
            let probs = &self.probs[start * k..end * k];
            let len = end - start;
            match &self.sequence {
                Some(seq) => {
                    let paths = seq.sample_paths(probs, self.step_m, draws, &mut rng);
                    for d in 0..draws {
                        for (i, &c) in paths[d * len..(d + 1) * len].iter().enumerate() {
                            out[d * n_rows + rows[start + i]] = c;
                        }
                    }
                }
                None => {
                    // each depth's cumulative shares, once for all draws;
                    // a depth with no probability is never drawn, and one
                    // whose class holds all but 1e-12 is that class
                    // without a draw (which depths are sure depends on the
                    // data alone: the same draws on any thread)
                    let mut cum = vec![f64::NAN; probs.len()];
                    let mut sure: Vec<Option<usize>> = vec![None; len];
                    for (i, p) in probs.chunks_exact(k).enumerate() {
                        let total: f64 = p.iter().filter(|v| v.is_finite()).sum();
                        if total.is_nan() || total <= 0.0 {
                            continue;
                        }
                        let row = &mut cum[i * k..(i + 1) * k];
                        let mut acc = 0.0;
                        for (r, v) in row.iter_mut().zip(p) {
                            acc += if v.is_finite() { *v } else { 0.0 };
                            *r = acc / total;
                        }
                        sure[i] = p
                            .iter()
                            .position(|v| v.is_finite() && *v >= (1.0 - 1e-12) * total);
                    }
                    for d in 0..draws {
                        for i in 0..len {
                            let row = &cum[i * k..(i + 1) * k];
                            if row[0].is_nan() {
                                continue;
                            }
                            let c = match sure[i] {
                                Some(c) => c,
                                None => {
                                    let u = rng.random::<f64>();
                                    row.iter().position(|&c| u < c).unwrap_or(k - 1)
                                }
                            };
                            out[d * n_rows + rows[start + i]] =
                                u8::try_from(c + 1).unwrap_or(u8::MAX);
                        }
                    }
                }
            }
            start = end;
        }
        out
    }
}

/// The most probable class (1-based; the lower on a tie) and its probability.
pub fn most_probable(p: &[f64]) -> Option<(u8, f64)> {
    let (i, v) =
        p.iter().enumerate().fold(
            (0, f64::NEG_INFINITY),
            |acc, (i, &v)| if v > acc.1 { (i, v) } else { acc },
        );
    (v.is_finite() && v > 0.0).then(|| (u8::try_from(i + 1).unwrap_or(u8::MAX), v))
}

/// The table's sample step, m (the median spacing of its depths; 0.1524
/// when it has fewer than two).
pub fn step_m(table: &Table) -> f64 {
    let mut diffs: Vec<f64> = depth_m(table)
        .windows(2)
        .map(|w| w[1] - w[0])
        .filter(|v| v.is_finite() && *v > 0.0)
        .collect();
    if diffs.is_empty() {
        return 0.1524;
    }
    crate::stats::median(&mut diffs)
}

/// The bed sequence a training set implies: class priors from its samples'
/// classes, bed thickness from its wells' plugs in depth order
/// ([`crate::classes::sequence::bed_thickness_from_core`]). `None` without
/// a cored well holding two plugs with their log rows in `logs`.
pub fn sequence_from(
    set: &crate::classes::predictor::TrainingSet,
    logs: &std::collections::BTreeMap<String, Table>,
    k: usize,
) -> Option<SequenceModel> {
    let n = set.rows().max(1) as f64;
    let prior: Vec<f64> = (1..=k)
        .map(|c| set.y.iter().filter(|&&y| usize::from(y) == c).count() as f64 / n)
        .collect();
    let wells: Vec<Vec<(f64, u8)>> = set
        .wells()
        .iter()
        .filter_map(|w| {
            let d = depth_m(logs.get(w)?);
            Some(
                (0..set.rows())
                    .filter(|&r| &set.well[r] == w)
                    .filter_map(|r| d.get(set.row[r]).map(|z| (*z, set.y[r])))
                    .collect(),
            )
        })
        .collect();
    let bed_thickness_m = crate::classes::sequence::bed_thickness_from_core(&wells)?;
    Some(SequenceModel {
        bed_thickness_m,
        prior,
    })
}

/// One way of classing a held-out well in [`lowo_scores`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Variant {
    /// Smooth with the bed sequence the other cored wells imply.
    pub sequence: bool,
    /// Tempering weight of the saturation-height evidence (0: none).
    pub sat_weight: f64,
}

/// How one variant classed the held-out plugs in [`lowo_scores`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct VariantScore {
    /// Share of plugs classed exactly.
    pub exact: f64,
    /// Share within one class.
    pub within_one: f64,
    /// Plugs this variant classes exactly and the first variant does not.
    pub gained: usize,
    /// Plugs the first variant classes exactly and this one does not.
    pub lost: usize,
}

impl VariantScore {
    /// Whether the gain over the first variant is more than chance: the net
    /// gain in plugs exceeds one standard error of a paired comparison,
    /// √(gained + lost) (McNemar's test at z = 1; McNemar 1947,
    /// Psychometrika 12(2)).
    pub fn beats_first(&self) -> bool {
        let (g, l) = (self.gained as f64, self.lost as f64);
        g - l > (g + l).sqrt()
    }
}

/// One score per variant.
pub type VariantScores = Vec<VariantScore>;

/// Leave one cored well out on the wells' logs: each cored well is classed
/// along its whole log by its fold's forest (`folds`, fitted without it by
/// [`crate::classes::predictor::leave_one_well_out`]), in each of
/// `variants` (the bed sequence from the other wells; the saturation-height
/// residuals of the well in `residuals`, when it has them), and scored at its
/// own plugs. `None` with fewer than two cored wells with logs or no plug
/// classed.
pub fn lowo_scores(
    set: &crate::classes::predictor::TrainingSet,
    logs: &std::collections::BTreeMap<String, Table>,
    folds: &[crate::classes::predictor::FoldForest],
    k: usize,
    max_vsh: f64,
    residuals: &std::collections::BTreeMap<String, Vec<f64>>,
    variants: &[Variant],
) -> Result<Option<VariantScores>, PredictError> {
    let usable: Vec<&(String, Forest)> =
        folds.iter().filter(|(w, _)| logs.contains_key(w)).collect();
    if usable.len() < 2 {
        return Ok(None);
    }
    let mut tally = vec![[0usize; 4]; variants.len()];
    let mut total = 0usize;
    for (w, forest) in usable {
        let table = &logs[w];
        let train = set.without_well(w);
        let seq = sequence_from(&train, logs, k);
        if seq.is_none() && variants.iter().any(|v| v.sequence) {
            continue;
        }
        let inputs = well_inputs(table, &set.features, &set.context_scales_m, max_vsh);
        let step = step_m(table);
        let shares = vote_shares(forest, &inputs, k)?;
        let classed: Vec<Vec<f64>> = variants
            .iter()
            .map(|v| {
                let mut p = shares.clone();
                let sat = residuals.get(w).map(|r| SatEvidence {
                    residuals: r,
                    weight: v.sat_weight,
                });
                let seq = seq.as_ref().filter(|_| v.sequence);
                posterior_from_shares(&mut p, &inputs.rows, k, seq, step, sat);
                p
            })
            .collect();
        for r in (0..set.rows()).filter(|&r| &set.well[r] == w) {
            let Ok(pos) = inputs.rows.binary_search(&set.row[r]) else {
                continue;
            };
            total += 1;
            let right: Vec<Option<u8>> = classed
                .iter()
                .map(|p| most_probable(&p[pos * k..(pos + 1) * k]).map(|(c, _)| c))
                .collect();
            let first_right = right.first().copied().flatten() == Some(set.y[r]);
            for (v, c) in right.iter().enumerate() {
                let Some(c) = *c else { continue };
                tally[v][0] += usize::from(c == set.y[r]);
                tally[v][1] += usize::from(c.abs_diff(set.y[r]) <= 1);
                tally[v][2] += usize::from(c == set.y[r] && !first_right);
                tally[v][3] += usize::from(c != set.y[r] && first_right);
            }
        }
    }
    if total == 0 {
        return Ok(None);
    }
    let share = |n: usize| n as f64 / total as f64;
    Ok(Some(
        tally
            .iter()
            .map(|t| VariantScore {
                exact: share(t[0]),
                within_one: share(t[1]),
                gained: t[2],
                lost: t[3],
            })
            .collect(),
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Bayes' rule by hand: equal prior shares, residuals 0 and one spread
    /// (0.1 v/v) at weight 1 give likelihoods 1 and e^-0.5 = 0.606531, so
    /// the posteriors are 1/1.606531 = 0.622459 and 0.377541.
    #[test]
    fn fusion_is_bayes_rule_with_a_gaussian_likelihood() {
        let mut p = [0.5, 0.5];
        assert!(fuse_saturation(&mut p, &[0.0, SWH_SIGMA_VV], 1.0));
        assert!((p[0] - 0.622_459).abs() < 1e-6, "{p:?}");
        assert!((p[1] - 0.377_541).abs() < 1e-6, "{p:?}");
    }

    /// A class the height model says nothing about (NaN) gets the mean
    /// likelihood of the others: (1 + 0.606531)/2 = 0.803265 by hand.
    #[test]
    fn a_class_without_a_residual_is_neither_favoured_nor_dropped() {
        let mut p = [1.0 / 3.0; 3];
        assert!(fuse_saturation(&mut p, &[0.0, f64::NAN, SWH_SIGMA_VV], 1.0));
        let l = [1.0, 0.803_265, 0.606_531];
        let total: f64 = l.iter().sum();
        for (got, want) in p.iter().zip(l) {
            assert!((got - want / total).abs() < 1e-6, "{p:?}");
        }
    }

    /// At or below the free water level (every residual NaN) and at weight 0
    /// the evidence says nothing, and the probabilities are left alone.
    #[test]
    fn no_evidence_leaves_the_probabilities_alone() {
        let mut p = [0.2, 0.8];
        assert!(!fuse_saturation(&mut p, &[f64::NAN, f64::NAN], 1.0));
        assert!(!fuse_saturation(&mut p, &[0.0, 0.3], 0.0));
        assert_eq!(p, [0.2, 0.8]);
    }

    /// The further a class's SW from the logs departs from its SWH, the less
    /// probable it is, and a heavier weight separates the classes more.
    #[test]
    fn larger_mismatch_lowers_a_class_and_weight_sharpens() {
        let fused = |r1: f64, w: f64| {
            let mut p = [0.5, 0.5];
            fuse_saturation(&mut p, &[0.02, r1], w);
            p[1]
        };
        let mut last = 1.0;
        for r1 in [0.0, 0.05, 0.1, 0.2, 0.4] {
            let v = fused(r1, 1.0);
            assert!(v < last || r1 == 0.0, "r1 {r1}: {v} after {last}");
            last = v;
        }
        assert!(fused(0.2, 4.0) < fused(0.2, 0.25));
    }

    /// McNemar's paired comparison at one standard error: 10 plugs gained
    /// and 2 lost is a net 8 against √12 = 3.46 (more than chance); 3 gained
    /// and 1 lost is 2 against √4 = 2 (not more).
    #[test]
    fn a_gain_counts_only_beyond_one_standard_error() {
        let v = |gained, lost| VariantScore {
            exact: 0.0,
            within_one: 0.0,
            gained,
            lost,
        };
        assert!(v(10, 2).beats_first());
        assert!(!v(3, 1).beats_first());
        assert!(!v(0, 0).beats_first());
        assert!(!v(2, 10).beats_first());
    }
}
