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
//! vote for the leaf's output. A test checks the flat trees against
//! smartcore's own predictions; should the serialised form ever change, the
//! mirror fails to read and the forest predicts through smartcore instead.

use std::marker::PhantomData;

use serde::Deserialize;
use smartcore::tree::decision_tree_classifier::DecisionTreeClassifierParameters;

/// One node: a split (feature, value, children) or a leaf (`true_child`
/// `u32::MAX`) voting for class index `output`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) struct FlatNode {
    feature: u32,
    true_child: u32,
    false_child: u32,
    output: u32,
    value: f64,
}

/// A tree as nodes (root first) and the labels its outputs index.
#[derive(Debug, Clone, PartialEq)]
pub(super) struct FlatTree {
    nodes: Vec<FlatNode>,
    labels: Vec<u32>,
}

impl FlatTree {
    /// The class label this tree gives `row` (one value per feature); `None`
    /// for a malformed tree (a child or output out of range).
    #[inline]
    pub(super) fn predict(&self, row: &[f64]) -> Option<u32> {
        let mut id = 0usize;
        // a well-formed tree ends in a leaf within its node count
        for _ in 0..=self.nodes.len() {
            let node = self.nodes.get(id)?;
            if node.true_child == u32::MAX {
                return self.labels.get(node.output as usize).copied();
            }
            let x = *row.get(node.feature as usize)?;
            id = if x <= node.value {
                node.true_child as usize
            } else {
                node.false_child as usize
            };
        }
        None
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

/// The flat form of a smartcore forest of one tree; `None` when its
/// serialised form is not the one mirrored here.
pub(super) fn flatten(tree: &impl serde::Serialize) -> Option<FlatTree> {
    let bytes = postcard::to_allocvec(tree).ok()?;
    let forest: ForestMirror = postcard::from_bytes(&bytes).ok()?;
    let labels = forest.classes?;
    let [tree] = <[TreeMirror; 1]>::try_from(forest.trees?).ok()?;
    let to_u32 = |v: usize| u32::try_from(v).ok();
    let nodes = tree
        .nodes
        .iter()
        .map(|n| {
            let (true_child, false_child) = match (n.true_child, n.false_child) {
                (Some(t), Some(f)) => (to_u32(t)?, to_u32(f)?),
                (None, _) => (u32::MAX, u32::MAX),
                (Some(_), None) => return None,
            };
            Some(FlatNode {
                feature: to_u32(n.split_feature)?,
                true_child,
                false_child,
                output: to_u32(n.output)?,
                value: n.split_value.unwrap_or(f64::NAN),
            })
        })
        .collect::<Option<Vec<_>>>()?;
    (!nodes.is_empty()).then_some(FlatTree { nodes, labels })
}
