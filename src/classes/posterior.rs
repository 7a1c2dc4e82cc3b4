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

/// Class probabilities at `inputs.rows`, `k` per row (class 1 first): the
/// forest's vote shares, then, with a sequence model, the posteriors of the
/// bed sequence along each run of consecutive rows (`step_m` the sample step).
pub fn class_probabilities(
    forest: &Forest,
    inputs: &WellInputs,
    k: usize,
    sequence: Option<&SequenceModel>,
    step_m: f64,
) -> Result<Vec<f64>, PredictError> {
    let slots = forest.class_slots();
    let shares = forest.vote_shares(&inputs.x)?;
    let mut probs: Vec<f64> = shares
        .chunks_exact(slots)
        .flat_map(|s| (1..=k).map(move |c| s.get(c).copied().unwrap_or(0.0)))
        .collect();
    if let Some(seq) = sequence.filter(|s| s.prior.len() == k) {
        let mut start = 0;
        for end in 1..=inputs.rows.len() {
            if end == inputs.rows.len() || inputs.rows[end] != inputs.rows[end - 1] + 1 {
                seq.smooth(&mut probs[start * k..end * k], step_m);
                start = end;
            }
        }
    }
    Ok(probs)
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

/// Exact and within-one shares of held-out plugs: (without the sequence, with it).
pub type SequenceScores = ((f64, f64), (f64, f64));

/// Leave one cored well out on the wells' logs: each cored well is classed
/// along its whole log by its fold's forest (`folds`, fitted without it by
/// [`crate::classes::predictor::leave_one_well_out`]) with the sequence the
/// other wells imply, and scored at its own plugs, without and with the bed
/// sequence. `None` with fewer than two cored wells with logs.
pub fn sequence_scores(
    set: &crate::classes::predictor::TrainingSet,
    logs: &std::collections::BTreeMap<String, Table>,
    folds: &[crate::classes::predictor::FoldForest],
    k: usize,
    max_vsh: f64,
) -> Result<Option<SequenceScores>, PredictError> {
    let usable: Vec<&(String, Forest)> =
        folds.iter().filter(|(w, _)| logs.contains_key(w)).collect();
    if usable.len() < 2 {
        return Ok(None);
    }
    let mut tally = [[0usize; 2]; 2];
    let mut total = 0usize;
    for (w, forest) in usable {
        let table = &logs[w];
        let train = set.without_well(w);
        let Some(seq) = sequence_from(&train, logs, k) else {
            continue;
        };
        let inputs = well_inputs(table, &set.features, &set.context_scales_m, max_vsh);
        let step = step_m(table);
        let plain = class_probabilities(forest, &inputs, k, None, step)?;
        let smooth = class_probabilities(forest, &inputs, k, Some(&seq), step)?;
        for r in (0..set.rows()).filter(|&r| &set.well[r] == w) {
            let Ok(pos) = inputs.rows.binary_search(&set.row[r]) else {
                continue;
            };
            total += 1;
            for (v, probs) in [&plain, &smooth].into_iter().enumerate() {
                if let Some((c, _)) = most_probable(&probs[pos * k..(pos + 1) * k]) {
                    tally[v][0] += usize::from(c == set.y[r]);
                    tally[v][1] += usize::from(c.abs_diff(set.y[r]) <= 1);
                }
            }
        }
    }
    if total == 0 {
        return Ok(None);
    }
    let share = |n: usize| n as f64 / total as f64;
    Ok(Some((
        (share(tally[0][0]), share(tally[0][1])),
        (share(tally[1][0]), share(tally[1][1])),
    )))
}
