//! The forest's trees as flat node arrays, for prediction without smartcore's
//! per-row allocation.
//!
//! smartcore's forest predicts one row at a time and allocates a vote vector
//! for every row and tree; at field scale (millions of depths, tens of
//! trees) that allocation was most of the class stage's time (a profile of
//! the bench field's full pipeline: `calloc` and `free` under
//! `RandomForestClassifier::predict`, 29 % of the run). The nodes are not
//! public, so they are read from the tree's own serialised form (postcard:
//! field order, exact floats) into the mirror types below, and walked the
//! way smartcore walks them: go to the true child when the value is `<=` the
//! split value (a NaN split value sends every row to the false child), and
//! vote for the leaf's output. Leaves point to themselves, so every row takes
//! the tree's depth in steps and four rows are walked side by side. A test checks the flat trees against
//! smartcore's own predictions; should the serialised form ever change, the
//! mirror fails to read and the forest predicts through smartcore instead.

use std::marker::PhantomData;

use serde::Deserialize;
use smartcore::tree::decision_tree_classifier::DecisionTreeClassifierParameters;

/// One node: a split (feature, value, children) or a leaf voting for class
/// index `output`. A leaf points to itself with both children (feature 0,
/// value NaN, so the comparison fails and the walk stays), which lets every
/// row take the same number of steps ([`FlatTree::depth`]) without a test
/// for leaves: rows can then be walked several at a time.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) struct FlatNode {
    feature: u32,
    true_child: u32,
    false_child: u32,
    output: u32,
    value: f64,
}

/// A tree as nodes (root first), the labels its outputs index, and the
/// longest root-to-leaf path. Every index in it was checked when it was
/// made ([`flatten`]), so walking it cannot go out of bounds.
#[derive(Debug, Clone, PartialEq)]
pub(super) struct FlatTree {
    nodes: Vec<FlatNode>,
    labels: Vec<u32>,
    depth: usize,
}

/// Rows walked through a tree side by side (independent walks keep the
/// processor busy while each waits on its next node).
pub(super) const LANES: usize = 4;

impl FlatTree {
    /// One step from node `id` for `row`.
    #[inline(always)]
    fn step(&self, id: usize, row: &[f64]) -> usize {
        let node = &self.nodes[id];
        if row[node.feature as usize] <= node.value {
            node.true_child as usize
        } else {
            node.false_child as usize
        }
    }

    /// The class label this tree gives `row` (one value per feature, at
    /// least as many as the forest was fitted on).
    #[inline]
    pub(super) fn predict(&self, row: &[f64]) -> u32 {
        let mut id = 0;
        for _ in 0..self.depth {
            id = self.step(id, row);
        }
        self.labels[self.nodes[id].output as usize]
    }

    /// [`FlatTree::predict`] for [`LANES`] rows at once.
    #[inline]
    pub(super) fn predict_lanes(&self, rows: [&[f64]; LANES]) -> [u32; LANES] {
        let mut id = [0usize; LANES];
        for _ in 0..self.depth {
            for (k, row) in rows.iter().enumerate() {
                id[k] = self.step(id[k], row);
            }
        }
        id.map(|i| self.labels[self.nodes[i].output as usize])
    }
}

// Mirrors of smartcore 0.7's serialised forest of one tree
// (ensemble::random_forest_classifier and tree::decision_tree_classifier):
// the same fields in the same order; the names are ours.

#[derive(Deserialize)]
struct NodeMirror {
    output: usize,
    _n_node_samples: usize,
    split_feature: usize,
    split_value: Option<f64>,
    _split_score: Option<f64>,
    true_child: Option<usize>,
    false_child: Option<usize>,
    _impurity: Option<f64>,
}

#[derive(Deserialize)]
struct TreeMirror {
    nodes: Vec<NodeMirror>,
    _parameters: Option<DecisionTreeClassifierParameters>,
    _num_classes: usize,
    _classes: Vec<u32>,
    _depth: u16,
    _num_features: usize,
    _x: PhantomData<()>,
    _y: PhantomData<()>,
    _z: PhantomData<()>,
}

#[derive(Deserialize)]
struct ForestMirror {
    trees: Option<Vec<TreeMirror>>,
    classes: Option<Vec<u32>>,
    // the bootstrap samples follow; not needed
}

/// The flat form of a smartcore forest of one tree, for rows of
/// `n_features` values; `None` when its serialised form is not the one
/// mirrored here or an index in it is out of range.
pub(super) fn flatten(tree: &impl serde::Serialize, n_features: usize) -> Option<FlatTree> {
    let bytes = postcard::to_allocvec(tree).ok()?;
    let forest: ForestMirror = postcard::from_bytes(&bytes).ok()?;
    let labels = forest.classes?;
    let [tree] = <[TreeMirror; 1]>::try_from(forest.trees?).ok()?;
    let n = tree.nodes.len();
    let index = |v: usize, below: usize| (v < below).then(|| u32::try_from(v).ok()).flatten();
    let nodes = tree
        .nodes
        .iter()
        .enumerate()
        .map(|(id, node)| {
            let output = index(node.output, labels.len())?;
            Some(match (node.true_child, node.false_child) {
                (Some(t), Some(f)) => FlatNode {
                    feature: index(node.split_feature, n_features)?,
                    true_child: index(t, n)?,
                    false_child: index(f, n)?,
                    output,
                    value: node.split_value.unwrap_or(f64::NAN),
                },
                // a leaf stays where it is
                (None, _) => FlatNode {
                    feature: 0,
                    true_child: index(id, n)?,
                    false_child: index(id, n)?,
                    output,
                    value: f64::NAN,
                },
                (Some(_), None) => return None,
            })
        })
        .collect::<Option<Vec<_>>>()?;
    if nodes.is_empty() || n_features == 0 {
        return None;
    }
    let depth = longest_path(&nodes)?;
    Some(FlatTree {
        nodes,
        labels,
        depth,
    })
}

/// Steps from the root to the deepest leaf; `None` when a walk does not
/// reach a leaf within the node count (a cycle: not a tree).
fn longest_path(nodes: &[FlatNode]) -> Option<usize> {
    let mut deepest = 0;
    let mut stack = vec![(0usize, 0usize)];
    while let Some((id, d)) = stack.pop() {
        if d > nodes.len() {
            return None;
        }
        let node = &nodes[id];
        if node.true_child as usize == id {
            deepest = deepest.max(d);
        } else {
            stack.push((node.true_child as usize, d + 1));
            stack.push((node.false_child as usize, d + 1));
        }
    }
    Some(deepest)
}
