//! The class predictor: a random forest from log features to core classes.
//!
//! The forest is smartcore's random forest (bootstrap samples, √p candidate
//! features per split; Breiman 2001, Machine Learning 45(1)) grown one tree
//! per smartcore forest, so that the trees' votes can be counted: the winning
//! class's share of the votes is CLASS_PROB. Each tree has its own seed
//! (`seed + tree index`), so a fit is the same on any thread count.
//!
//! Validation is leave-one-well-out: every cored well in turn is predicted by
//! a forest fitted on the other wells. Two simple baselines are scored the same
//! way, so that the forest has something to beat: the nearest class centroid in
//! standardised features, and the majority class per porosity bin.

mod flat;
pub mod model_file;

use rayon::prelude::*;
use serde::{Deserialize, Serialize};
use smartcore::ensemble::random_forest_classifier::{
    RandomForestClassifier, RandomForestClassifierParameters,
};
use smartcore::linalg::basic::matrix::DenseMatrix;

pub use crate::config::Feature;
use crate::output::schema::Col;

/// What the predictor needs of a feature beyond its name.
impl Feature {
    /// The unit of the feature's values.
    pub fn unit(self) -> &'static str {
        match self {
            Feature::Vsh | Feature::Phie | Feature::Nphi => "v/v",
            Feature::Gr => "gAPI",
            Feature::Rhob => "g/cm3",
            Feature::Dt => "us/ft",
            Feature::Log10Rt => "log10(ohm.m)",
        }
    }

    /// The per-well output column the feature is read from.
    pub fn column(self) -> Col {
        use crate::input::curves::LogicalCurve as L;
        match self {
            Feature::Vsh => Col::Vsh,
            Feature::Phie => Col::Phie,
            Feature::Gr => Col::Input(L::GammaRay),
            Feature::Rhob => Col::Input(L::BulkDensity),
            Feature::Nphi => Col::Input(L::NeutronPorosity),
            Feature::Dt => Col::Input(L::CompressionalSlowness),
            Feature::Log10Rt => Col::Input(L::DeepResistivity),
        }
    }

    /// The feature's value from the column's value (log10 for resistivity;
    /// NaN where not defined).
    #[inline]
    pub fn transform(self, v: f64) -> f64 {
        match self {
            Feature::Log10Rt if v > 0.0 => v.log10(),
            Feature::Log10Rt => f64::NAN,
            _ => v,
        }
    }
}

/// What went wrong fitting or applying a predictor.
#[derive(Debug, thiserror::Error)]
pub enum PredictError {
    /// No training samples, or no features.
    #[error("no training samples")]
    Empty,
    /// The number of values is not rows × features.
    #[error("training matrix has {values} values, not {rows} rows x {features} features")]
    Shape {
        /// Number of values given.
        values: usize,
        /// Number of rows (training samples, or the rows the values make when predicting).
        rows: usize,
        /// Features per row.
        features: usize,
    },
    /// A training value is NaN or infinite.
    #[error("training row {row} has a value that is not a number")]
    NotFinite {
        /// Index (from 0) of the training row holding it.
        row: usize,
    },
    /// smartcore could not fit or apply a tree; its message.
    #[error("random forest: {0}")]
    Forest(String),
}

/// Settings of the forest.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct ForestParams {
    /// Trees in the forest (`[predictor] trees`).
    pub trees: u16,
    /// Deepest split of each tree (`[predictor] max-depth`).
    pub max_depth: u16,
    /// Fewest training samples in a leaf (`[predictor] min-samples-leaf`).
    pub min_samples_leaf: usize,
    /// Random seed (`[predictor] seed`); tree t uses `seed + t`.
    pub seed: u64,
}

type Tree = RandomForestClassifier<f64, u32, DenseMatrix<f64>, Vec<u32>>;

/// A fitted forest.
#[derive(Debug, Serialize, Deserialize)]
pub struct Forest {
    /// Number of features per row the forest was fitted on.
    pub n_features: usize,
    /// Class numbers seen in training, ascending.
    pub classes: Vec<u8>,
    trees: Vec<Tree>,
    /// The trees as flat node arrays, made on first use ([`flat`]); `None`
    /// inside when they cannot be read (prediction then goes through smartcore).
    #[serde(skip)]
    flat: std::sync::OnceLock<Option<Vec<flat::FlatTree>>>,
}

/// Rows per block when predicting, so the vote counts stay small.
const PREDICT_BLOCK_ROWS: usize = 16_384;

fn matrix(x: &[f64], n_features: usize) -> Result<DenseMatrix<f64>, PredictError> {
    DenseMatrix::new(x.len() / n_features, n_features, x.to_vec(), false)
        .map_err(|e| PredictError::Forest(e.to_string()))
}

impl Forest {
    /// Fit on row-major `x` (`y.len()` rows of `n_features`) against classes `y`.
    pub fn fit(
        x: &[f64],
        n_features: usize,
        y: &[u8],
        p: &ForestParams,
    ) -> Result<Forest, PredictError> {
        if y.is_empty() || n_features == 0 {
            return Err(PredictError::Empty);
        }
        if x.len() != y.len() * n_features {
            return Err(PredictError::Shape {
                values: x.len(),
                rows: y.len(),
                features: n_features,
            });
        }
        if let Some(i) = x.iter().position(|v| !v.is_finite()) {
            return Err(PredictError::NotFinite {
                row: i / n_features,
            });
        }
        let m = matrix(x, n_features)?;
        let labels: Vec<u32> = y.iter().map(|&c| u32::from(c)).collect();
        let mut classes = y.to_vec();
        classes.sort_unstable();
        classes.dedup();
        let trees = (0..p.trees)
            .into_par_iter()
            .map(|t| {
                let params = RandomForestClassifierParameters::default()
                    .with_n_trees(1)
                    .with_max_depth(p.max_depth)
                    .with_min_samples_leaf(p.min_samples_leaf)
                    .with_seed(p.seed.wrapping_add(u64::from(t)));
                Tree::fit(&m, &labels, params).map_err(|e| PredictError::Forest(e.to_string()))
            })
            .collect::<Result<Vec<_>, _>>()?;
        Ok(Forest {
            n_features,
            classes,
            trees,
            flat: std::sync::OnceLock::new(),
        })
    }

    /// The trees as flat node arrays, when every tree could be read.
    fn flat_trees(&self) -> Option<&[flat::FlatTree]> {
        self.flat
            .get_or_init(|| {
                self.trees
                    .iter()
                    .map(|t| flat::flatten(t, self.n_features))
                    .collect()
            })
            .as_deref()
    }

    /// Class and vote share of each row of row-major `x`. Rows with a value
    /// that is not a number get `None`. Ties go to the lower class.
    pub fn predict(&self, x: &[f64]) -> Result<Vec<Option<(u8, f64)>>, PredictError> {
        let k = self.class_slots();
        let shares = self.vote_shares(x)?;
        Ok(shares
            .chunks_exact(k)
            .map(|v| {
                if v[0].is_nan() {
                    return None;
                }
                let (best, share) =
                    v.iter().enumerate().fold(
                        (0, 0.0),
                        |acc, (c, &s)| {
                            if s > acc.1 { (c, s) } else { acc }
                        },
                    );
                Some((best as u8, share))
            })
            .collect())
    }

    /// Slots per row of [`Forest::vote_shares`]: class numbers 0 to the highest.
    pub fn class_slots(&self) -> usize {
        usize::from(self.classes.last().copied().unwrap_or(0)) + 1
    }

    /// Share of the trees voting for each class number (slot 0 unused by
    /// schemes, whose classes start at 1), [`Forest::class_slots`] per row of
    /// row-major `x`; NaN throughout for a row with a value that is not a number.
    pub fn vote_shares(&self, x: &[f64]) -> Result<Vec<f64>, PredictError> {
        let nf = self.n_features;
        if x.len() % nf != 0 {
            return Err(PredictError::Shape {
                values: x.len(),
                rows: x.len() / nf,
                features: nf,
            });
        }
        let rows = x.len() / nf;
        let n_classes = self.class_slots();
        let mut out = vec![f64::NAN; rows * n_classes];
        let ok: Vec<usize> = (0..rows)
            .filter(|&r| x[r * nf..(r + 1) * nf].iter().all(|v| v.is_finite()))
            .collect();
        let total = f64::from(self.trees.len() as u32);
        let flat = self.flat_trees();
        // blocks in parallel (each block's votes are its own, so the result is
        // the same on any thread count)
        let blocks: Vec<Vec<u16>> = ok
            .par_chunks(PREDICT_BLOCK_ROWS)
            .map(|block| -> Result<Vec<u16>, PredictError> {
                if let Some(trees) = flat {
                    return flat_votes(trees, x, nf, block, n_classes);
                }
                let mut values = Vec::with_capacity(block.len() * nf);
                for &r in block {
                    values.extend_from_slice(&x[r * nf..(r + 1) * nf]);
                }
                let m = matrix(&values, nf)?;
                let mut votes = vec![0u16; block.len() * n_classes];
                for tree in &self.trees {
                    let pred = tree
                        .predict(&m)
                        .map_err(|e| PredictError::Forest(e.to_string()))?;
                    for (i, c) in pred.iter().enumerate() {
                        votes[i * n_classes + *c as usize] += 1;
                    }
                }
                Ok(votes)
            })
            .collect::<Result<_, _>>()?;
        for (block, votes) in ok.chunks(PREDICT_BLOCK_ROWS).zip(blocks) {
            for (&r, v) in block.iter().zip(votes.chunks_exact(n_classes)) {
                for (slot, &n) in out[r * n_classes..(r + 1) * n_classes].iter_mut().zip(v) {
                    *slot = f64::from(n) / total;
                }
            }
        }
        Ok(out)
    }
}

/// Votes of `trees` for rows `block` of row-major `x` (`nf` values per row),
/// `n_classes` counts per row.
fn flat_votes(
    trees: &[flat::FlatTree],
    x: &[f64],
    nf: usize,
    block: &[usize],
    n_classes: usize,
) -> Result<Vec<u16>, PredictError> {
    let row = |r: usize| &x[r * nf..(r + 1) * nf];
    let mut votes = vec![0u16; block.len() * n_classes];
    let mut vote = |i: usize, label: u32| -> Result<(), PredictError> {
        let slot = votes
            .get_mut(i * n_classes + label as usize)
            .filter(|_| (label as usize) < n_classes)
            .ok_or_else(|| PredictError::Forest(format!("a tree voted for class {label}")))?;
        *slot += 1;
        Ok(())
    };
    let lanes = block.len() / flat::LANES * flat::LANES;
    for tree in trees {
        for (g, group) in block[..lanes].chunks_exact(flat::LANES).enumerate() {
            let labels = tree.predict_lanes(std::array::from_fn(|k| row(group[k])));
            for (k, label) in labels.into_iter().enumerate() {
                vote(g * flat::LANES + k, label)?;
            }
        }
        for (i, &r) in block.iter().enumerate().skip(lanes) {
            vote(i, tree.predict(row(r)))?;
        }
    }
    Ok(votes)
}

/// Samples to train and validate on: features at cored depths and the core class.
#[derive(Debug, Clone, Default, Serialize)]
pub struct TrainingSet {
    /// The features, in the order of each row's blocks.
    pub features: Vec<Feature>,
    /// Context window half-widths, m; empty for point features only. Each
    /// feature's block is its point value then mean, slope and spread per
    /// window ([`crate::classes::features`]).
    pub context_scales_m: Vec<f64>,
    /// Row-major feature values, [`TrainingSet::width`] per row.
    pub x: Vec<f64>,
    /// Core class of each row.
    pub y: Vec<u8>,
    /// Well of each row.
    pub well: Vec<String>,
    /// Log effective porosity of each row, v/v (for the porosity-bin baseline).
    pub phie: Vec<f64>,
    /// Row of the well's log table each sample was read at.
    pub row: Vec<usize>,
}

impl TrainingSet {
    /// Number of rows (samples).
    pub fn rows(&self) -> usize {
        self.y.len()
    }

    /// Values per row.
    pub fn width(&self) -> usize {
        crate::classes::features::width(self.features.len(), self.context_scales_m.len())
    }

    /// The same rows with only `keep` features (in the order of `keep`), and
    /// their context when `context` (else point values only).
    pub fn select(&self, keep: &[Feature], context: bool) -> TrainingSet {
        let w = self.width();
        let per = 1 + crate::classes::features::STATS_PER_WINDOW * self.context_scales_m.len();
        let take = if context { per } else { 1 };
        let idx: Vec<usize> = keep
            .iter()
            .filter_map(|f| self.features.iter().position(|g| g == f))
            .collect();
        let mut x = Vec::with_capacity(self.rows() * idx.len() * take);
        for r in 0..self.rows() {
            for &j in &idx {
                let at = r * w + j * per;
                x.extend_from_slice(&self.x[at..at + take]);
            }
        }
        TrainingSet {
            features: idx.iter().map(|&j| self.features[j]).collect(),
            context_scales_m: if context {
                self.context_scales_m.clone()
            } else {
                Vec::new()
            },
            x,
            y: self.y.clone(),
            well: self.well.clone(),
            phie: self.phie.clone(),
            row: self.row.clone(),
        }
    }

    /// Wells in the set, sorted.
    pub fn wells(&self) -> Vec<String> {
        let mut w = self.well.clone();
        w.sort();
        w.dedup();
        w
    }

    /// The rows of every well but `well`.
    pub fn without_well(&self, well: &str) -> TrainingSet {
        let rows: Vec<usize> = (0..self.rows()).filter(|&r| self.well[r] != well).collect();
        self.subset(&rows)
    }

    fn subset(&self, rows: &[usize]) -> TrainingSet {
        let nf = self.width();
        TrainingSet {
            features: self.features.clone(),
            context_scales_m: self.context_scales_m.clone(),
            x: rows
                .iter()
                .flat_map(|&r| self.x[r * nf..(r + 1) * nf].iter().copied())
                .collect(),
            y: rows.iter().map(|&r| self.y[r]).collect(),
            well: rows.iter().map(|&r| self.well[r].clone()).collect(),
            phie: rows.iter().map(|&r| self.phie[r]).collect(),
            row: rows.iter().map(|&r| self.row[r]).collect(),
        }
    }
}

/// Scores of one way of predicting, over held-out wells.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Scores {
    /// Held-out samples scored.
    pub samples: usize,
    /// Share predicted exactly.
    pub exact: f64,
    /// Share predicted within one class.
    pub within_one: f64,
    /// `confusion[true - 1][predicted - 1]`.
    pub confusion: Vec<Vec<usize>>,
    /// Recall of each class 1.., `None` where the class has no samples.
    pub recall: Vec<Option<f64>>,
    /// Per held-out well: (well, samples, exact share).
    pub folds: Vec<(String, usize, f64)>,
}

fn score(pairs: &[(u8, u8, usize)], wells: &[String], class_count: usize) -> Scores {
    let mut confusion = vec![vec![0usize; class_count]; class_count];
    let (mut exact, mut near) = (0usize, 0usize);
    let mut folds = Vec::new();
    for (w, name) in wells.iter().enumerate() {
        let mine: Vec<&(u8, u8, usize)> = pairs.iter().filter(|p| p.2 == w).collect();
        let e = mine.iter().filter(|p| p.0 == p.1).count();
        folds.push((name.clone(), mine.len(), ratio(e, mine.len())));
    }
    for &(t, p, _) in pairs {
        let (ti, pi) = (
            usize::from(t).saturating_sub(1),
            usize::from(p).saturating_sub(1),
        );
        if ti < class_count && pi < class_count {
            confusion[ti][pi] += 1;
        }
        exact += usize::from(t == p);
        near += usize::from(t.abs_diff(p) <= 1);
    }
    let recall = confusion
        .iter()
        .enumerate()
        .map(|(i, row)| {
            let n: usize = row.iter().sum();
            (n > 0).then(|| ratio(row[i], n))
        })
        .collect();
    Scores {
        samples: pairs.len(),
        exact: ratio(exact, pairs.len()),
        within_one: ratio(near, pairs.len()),
        confusion,
        recall,
        folds,
    }
}

fn ratio(a: usize, b: usize) -> f64 {
    if b == 0 { 0.0 } else { a as f64 / b as f64 }
}

/// The forest and the two baselines, each scored leave-one-well-out.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Validation {
    /// Scores of the random forest.
    pub forest: Scores,
    /// Scores of the nearest class centroid in standardised features (baseline).
    pub nearest_centroid: Scores,
    /// Scores of the majority class per porosity bin (baseline).
    pub porosity_bins: Scores,
}

/// Score the forest and the baselines leave-one-well-out, and keep each
/// fold's forest (for scoring more evidence on the same folds). Needs at
/// least two wells; `None` otherwise.
pub fn leave_one_well_out(
    set: &TrainingSet,
    params: &ForestParams,
    class_count: usize,
) -> Result<Option<(Validation, Vec<FoldForest>)>, PredictError> {
    let wells = set.wells();
    if wells.len() < 2 {
        return Ok(None);
    }
    let nf = set.width();
    type Fold = (
        Vec<(u8, u8, usize)>,
        Vec<(u8, u8, usize)>,
        Vec<(u8, u8, usize)>,
        FoldForest,
    );
    let folds: Vec<Fold> = wells
        .par_iter()
        .enumerate()
        .map(|(wi, w)| -> Result<Fold, PredictError> {
            let train_rows: Vec<usize> = (0..set.rows()).filter(|&r| &set.well[r] != w).collect();
            let test_rows: Vec<usize> = (0..set.rows()).filter(|&r| &set.well[r] == w).collect();
            let train = set.subset(&train_rows);
            let test = set.subset(&test_rows);
            let forest = Forest::fit(&train.x, nf, &train.y, params)?;
            let pred = forest.predict(&test.x)?;
            let centroid = NearestCentroid::fit(&train);
            let bins = PorosityBins::fit(&train);
            let mut f = Vec::new();
            let mut c = Vec::new();
            let mut b = Vec::new();
            for (i, &t) in test.y.iter().enumerate() {
                if let Some((p, _)) = pred[i] {
                    f.push((t, p, wi));
                }
                c.push((t, centroid.predict(&test.x[i * nf..(i + 1) * nf]), wi));
                b.push((t, bins.predict(test.phie[i]), wi));
            }
            Ok((f, c, b, (w.clone(), forest)))
        })
        .collect::<Result<_, _>>()?;
    let (mut all_f, mut all_c, mut all_b) = (Vec::new(), Vec::new(), Vec::new());
    let mut forests = Vec::with_capacity(folds.len());
    for (f, c, b, forest) in folds {
        all_f.extend(f);
        all_c.extend(c);
        all_b.extend(b);
        forests.push(forest);
    }
    let validation = Validation {
        forest: score(&all_f, &wells, class_count),
        nearest_centroid: score(&all_c, &wells, class_count),
        porosity_bins: score(&all_b, &wells, class_count),
    };
    Ok(Some((validation, forests)))
}

/// A forest fitted without one well: (the well held out, the forest).
pub type FoldForest = (String, Forest);

/// Baseline: the class whose centroid is nearest in standardised features.
struct NearestCentroid {
    mean: Vec<f64>,
    sd: Vec<f64>,
    centroids: Vec<(u8, Vec<f64>)>,
}

impl NearestCentroid {
    fn fit(set: &TrainingSet) -> NearestCentroid {
        let nf = set.width();
        let n = set.rows().max(1) as f64;
        let mut mean = vec![0.0; nf];
        for row in set.x.chunks_exact(nf) {
            for (m, v) in mean.iter_mut().zip(row) {
                *m += v / n;
            }
        }
        let mut sd = vec![0.0; nf];
        for row in set.x.chunks_exact(nf) {
            for ((s, v), m) in sd.iter_mut().zip(row).zip(&mean) {
                *s += (v - m).powi(2) / n;
            }
        }
        let sd: Vec<f64> = sd
            .iter()
            .map(|v| if *v > 0.0 { v.sqrt() } else { 1.0 })
            .collect();
        let mut classes = set.y.clone();
        classes.sort_unstable();
        classes.dedup();
        let centroids = classes
            .iter()
            .map(|&c| {
                let rows: Vec<usize> = (0..set.rows()).filter(|&r| set.y[r] == c).collect();
                let centre = (0..nf)
                    .map(|j| {
                        rows.iter()
                            .map(|&r| (set.x[r * nf + j] - mean[j]) / sd[j])
                            .sum::<f64>()
                            / rows.len() as f64
                    })
                    .collect();
                (c, centre)
            })
            .collect();
        NearestCentroid {
            mean,
            sd,
            centroids,
        }
    }

    fn predict(&self, row: &[f64]) -> u8 {
        let z: Vec<f64> = row
            .iter()
            .zip(self.mean.iter().zip(&self.sd))
            .map(|(v, (m, s))| (v - m) / s)
            .collect();
        self.centroids
            .iter()
            .map(|(c, centre)| {
                let d: f64 = centre.iter().zip(&z).map(|(a, b)| (a - b).powi(2)).sum();
                (*c, d)
            })
            .fold(
                (0u8, f64::INFINITY),
                |acc, (c, d)| if d < acc.1 { (c, d) } else { acc },
            )
            .0
    }
}

/// Porosity bins of the baseline (quintiles of the training porosity).
const POROSITY_BINS: usize = 5;

/// Baseline: the most common class in the sample's porosity bin.
struct PorosityBins {
    edges: Vec<f64>,
    majority: Vec<u8>,
}

fn majority(classes: impl Iterator<Item = u8>) -> Option<u8> {
    let mut counts = [0usize; 256];
    for c in classes {
        counts[usize::from(c)] += 1;
    }
    let (best, n) = counts
        .iter()
        .enumerate()
        .fold((0, 0), |acc, (c, &n)| if n > acc.1 { (c, n) } else { acc });
    (n > 0).then_some(best as u8)
}

impl PorosityBins {
    fn fit(set: &TrainingSet) -> PorosityBins {
        let mut phi: Vec<f64> = set.phie.iter().copied().filter(|v| v.is_finite()).collect();
        phi.sort_by(f64::total_cmp);
        let edges: Vec<f64> = (1..POROSITY_BINS)
            .filter_map(|i| phi.get(i * phi.len() / POROSITY_BINS).copied())
            .collect();
        let overall = majority(set.y.iter().copied()).unwrap_or(1);
        let majority = (0..=edges.len())
            .map(|b| {
                majority(
                    (0..set.rows())
                        .filter(|&r| edges.partition_point(|&e| e <= set.phie[r]) == b)
                        .map(|r| set.y[r]),
                )
                .unwrap_or(overall)
            })
            .collect();
        PorosityBins { edges, majority }
    }

    fn predict(&self, phie: f64) -> u8 {
        self.majority[self.edges.partition_point(|&e| e <= phie)]
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Two classes split by the first feature at 0.5, the second feature
    /// noise: the forest learns the split (constructed case), gives the same
    /// votes twice, and refuses non-numbers in training.
    /// The flat trees vote exactly as smartcore's own predictions do: four
    /// noisy, overlapping classes (so trees are deep and leaves mixed), rows
    /// on and around the training values (so ties with split values occur),
    /// before and after the forest is saved and loaded.
    #[test]
    fn flat_trees_vote_as_smartcore_does() {
        use rand::{Rng, SeedableRng};
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(5);
        let (mut x, mut y) = (Vec::new(), Vec::new());
        for _ in 0..600 {
            let c: u8 = rng.random_range(1..=4);
            let row: [f64; 3] = std::array::from_fn(|k| {
                f64::from(c) * (k as f64 + 1.0) + rng.random_range(-2.5..2.5)
            });
            x.extend(row);
            y.push(c);
        }
        let p = ForestParams {
            trees: 15,
            max_depth: 12,
            min_samples_leaf: 1,
            seed: 3,
        };
        let f = Forest::fit(&x, 3, &y, &p).expect("fit");
        let mut probe = x.clone();
        probe.extend((0..3000).map(|_| rng.random_range(-3.0..16.0)));
        let loaded: Forest =
            postcard::from_bytes(&postcard::to_allocvec(&f).expect("saved")).expect("loaded");
        for forest in [&f, &loaded] {
            let trees = forest
                .flat_trees()
                .expect("smartcore's form is the mirrored one");
            assert_eq!(trees.len(), 15);
            let m = matrix(&probe, 3).expect("matrix");
            for (tree, t) in forest.trees.iter().zip(trees) {
                let theirs = tree.predict(&m).expect("smartcore predicts");
                let ours: Vec<u32> = probe.chunks_exact(3).map(|r| t.predict(r)).collect();
                assert_eq!(ours, theirs);
                let lanes: Vec<u32> = probe
                    .chunks_exact(3 * flat::LANES)
                    .flat_map(|g| t.predict_lanes(std::array::from_fn(|k| &g[3 * k..3 * k + 3])))
                    .collect();
                assert_eq!(lanes, theirs[..lanes.len()]);
            }
        }
    }

    fn two_class_set() -> (Vec<f64>, Vec<u8>) {
        let mut x = Vec::new();
        let mut y = Vec::new();
        for i in 0..200 {
            let a = f64::from(i) / 200.0;
            let b = ((f64::from(i) * 7.31).sin() + 1.0) / 2.0;
            x.extend([a, b]);
            y.push(if a < 0.5 { 1 } else { 2 });
        }
        (x, y)
    }

    #[test]
    fn forest_learns_a_split_and_is_repeatable() {
        let (x, y) = two_class_set();
        let p = ForestParams {
            trees: 20,
            max_depth: 6,
            min_samples_leaf: 1,
            seed: 7,
        };
        let f = Forest::fit(&x, 2, &y, &p).expect("fit");
        let pred = f
            .predict(&[0.1, 0.5, 0.9, 0.5, f64::NAN, 0.5])
            .expect("predict");
        assert_eq!(pred[0].map(|p| p.0), Some(1));
        assert_eq!(pred[1].map(|p| p.0), Some(2));
        assert!(pred[0].expect("class").1 > 0.9);
        assert_eq!(pred[2], None);
        let g = Forest::fit(&x, 2, &y, &p).expect("fit");
        assert_eq!(g.predict(&x).expect("p"), f.predict(&x).expect("p"));
        let mut bad = x.clone();
        bad[21] = f64::NAN;
        assert!(matches!(
            Forest::fit(&bad, 2, &y, &p),
            Err(PredictError::NotFinite { row: 10 })
        ));
    }

    /// Scores on a hand-counted confusion: true 1,1,2,3 predicted 1,2,2,1 →
    /// exact 2/4, within one 3/4, recall class 1 = 1/2, class 2 = 1, class 3 = 0.
    #[test]
    fn scores_by_hand() {
        let s = score(
            &[(1, 1, 0), (1, 2, 0), (2, 2, 1), (3, 1, 1)],
            &["A".into(), "B".into()],
            3,
        );
        assert_eq!(s.exact, 0.5);
        assert_eq!(s.within_one, 0.75);
        assert_eq!(s.recall, vec![Some(0.5), Some(1.0), Some(0.0)]);
        assert_eq!(
            s.confusion,
            vec![vec![1, 1, 0], vec![0, 1, 0], vec![1, 0, 0]]
        );
        assert_eq!(s.folds, vec![("A".into(), 2, 0.5), ("B".into(), 2, 0.5)]);
    }

    #[test]
    fn feature_names_round_trip() {
        for f in Feature::ALL {
            assert_eq!(Feature::parse(f.name()), Some(f));
            assert_eq!(Feature::parse(&f.name().to_lowercase()), Some(f));
        }
        assert_eq!(Feature::Log10Rt.transform(100.0), 2.0);
        assert!(Feature::Log10Rt.transform(0.0).is_nan());
    }
}
