//! The saved class model: a versioned envelope around the forest.
//!
//! Layout (our own):
//! ```text
//! flowzone-class-model 1\n        magic and format version
//! {...}\n                         header, one line of JSON: versions, scheme and
//!                                 boundaries, features with units, training
//!                                 wells, metrics, permeability per class
//! <postcard bytes>                the forest
//! ```
//! `head -2` shows what a model is without loading it. smartcore's serialised
//! layout may change between its versions, so the header records the version
//! the forest was saved with and loading refuses any other.

use std::io::Write as _;
use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use super::{Feature, Forest, ForestParams, Validation};
use crate::classes::perm::ClassPerm;
use crate::config::PermMethod;

/// First line of every model file (without the version).
pub const MAGIC: &str = "flowzone-class-model";
/// Version of the envelope layout.
pub const FORMAT_VERSION: u32 = 1;
/// The smartcore version the forest is serialised with; a test checks it
/// against Cargo.lock.
pub const SMARTCORE_VERSION: &str = "0.7.0";

/// A class scheme as written beside every class: name, quantity and boundaries.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SchemeInfo {
    /// The config's name for the scheme (the key of `[classes.scheme]`).
    pub name: String,
    /// The scheme type (fzi-ladder, port-size-r35, fzi-clusters).
    pub kind: String,
    /// The quantity the boundaries are in, with its unit (`FZI (um)`, `R35 (um)`).
    pub quantity: String,
    /// Class boundaries, ascending, in `quantity`.
    pub boundaries: Vec<f64>,
    /// Number of classes (boundaries + 1).
    pub class_count: usize,
}

impl SchemeInfo {
    /// One line for file headers: `fzi (fzi-ladder, FZI (um) bounds 0.632 1.58 3.71)`.
    pub fn describe(&self) -> String {
        let b: Vec<String> = self.boundaries.iter().map(|v| format!("{v:.4}")).collect();
        format!(
            "{} ({}, {} bounds {})",
            self.name,
            self.kind,
            self.quantity,
            b.join(" ")
        )
    }
}

/// A feature with its unit, as recorded in the model.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FeatureInfo {
    /// The feature.
    pub name: Feature,
    /// The unit of its values ([`Feature::unit`]).
    pub unit: String,
}

/// Everything about a model except the forest itself.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ModelHeader {
    /// The flowzone version that trained the model.
    pub flowzone_version: String,
    /// The smartcore version the forest was serialised with; loading requires [`SMARTCORE_VERSION`].
    pub smartcore_version: String,
    /// The class scheme whose classes the model predicts.
    pub scheme: SchemeInfo,
    /// The features, in the order the forest reads them.
    pub features: Vec<FeatureInfo>,
    /// Context window half-widths, m, of every feature; empty when the forest
    /// reads point values only. A model file from before depth context has
    /// none and loads as point features.
    #[serde(default)]
    pub context_scales_m: Vec<f64>,
    /// What each kind of evidence scored leave-one-well-out on the cored
    /// wells, in the order it was added; the chosen one is marked.
    #[serde(default)]
    pub ablation: Vec<AblationRow>,
    /// The bed sequence the class probabilities go through; `None` when the
    /// forest's own probabilities are used.
    #[serde(default)]
    pub sequence: Option<crate::classes::sequence::SequenceModel>,
    /// The forest settings it was trained with.
    pub params: ForestParams,
    /// Names of the wells trained on, sorted.
    pub training_wells: Vec<String>,
    /// Number of training samples (cored depths with features and a class).
    pub training_samples: usize,
    /// (class, training samples).
    pub samples_per_class: Vec<(u8, usize)>,
    /// How permeability is computed from class and porosity (`[classes] perm-method`).
    pub perm_method: PermMethod,
    /// Permeability from class and porosity, fitted on the training core.
    pub perm: Vec<ClassPerm>,
    /// Leave-one-well-out scores (absent with one cored well).
    pub validation: Option<Validation>,
    /// Seconds to fit the final forest. Not written (nor read), so the same
    /// training data give a byte-identical model file and report; a file
    /// from an older flowzone that has it still loads.
    #[serde(skip_serializing, default)]
    pub fit_seconds: f64,
}

/// One line of the training report's ablation table.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct AblationRow {
    /// The evidence the forest read: `point features`, `+ depth context`...
    pub evidence: String,
    /// Leave-one-well-out share of held-out plugs classed exactly.
    pub exact: f64,
    /// The same within one class.
    pub within_one: f64,
    /// Whether the model uses this evidence.
    pub chosen: bool,
}

impl ModelHeader {
    /// Values per row the forest reads.
    pub fn width(&self) -> usize {
        crate::classes::features::width(self.features.len(), self.context_scales_m.len())
    }

    /// The features in model order.
    pub fn feature_list(&self) -> Vec<Feature> {
        self.features.iter().map(|f| f.name).collect()
    }
}

/// A model: header and forest.
#[derive(Debug)]
pub struct ClassModel {
    /// Everything but the forest.
    pub header: ModelHeader,
    /// The fitted forest.
    pub forest: Forest,
}

/// An error saving or loading a model.
#[derive(Debug, thiserror::Error)]
pub enum ModelFileError {
    /// The file cannot be read.
    #[error("cannot read model `{}`", .path.display())]
    Io {
        /// The model file.
        path: PathBuf,
        /// The read error.
        #[source]
        source: std::io::Error,
    },
    /// The file does not start with [`MAGIC`].
    #[error("`{}` is not a flowzone class model (it does not start with `{MAGIC}`)", .path.display())]
    NotAModel {
        /// The model file.
        path: PathBuf,
    },
    /// The envelope version is not [`FORMAT_VERSION`].
    #[error(
        "model `{}` has envelope version {found}; this flowzone reads version {FORMAT_VERSION}: train it again with `flowzone train`",
        .path.display()
    )]
    Version {
        /// The model file.
        path: PathBuf,
        /// The envelope version on the file's first line.
        found: String,
    },
    /// The forest was saved with a smartcore version other than [`SMARTCORE_VERSION`].
    #[error(
        "model `{}` was saved with smartcore {found}; this flowzone {} uses smartcore {SMARTCORE_VERSION}, whose forests may differ: train it again with `flowzone train`",
        .path.display(), env!("CARGO_PKG_VERSION")
    )]
    Smartcore {
        /// The model file.
        path: PathBuf,
        /// The smartcore version recorded in the file's header.
        found: String,
    },
    /// The header or the forest cannot be parsed, or they disagree.
    #[error("model `{}`: {message}", .path.display())]
    Corrupt {
        /// The model file.
        path: PathBuf,
        /// What is wrong.
        message: String,
    },
}

impl ClassModel {
    /// The file's bytes; an error only if the header or the forest cannot
    /// be serialised (a bug, not bad input).
    pub fn to_bytes(&self) -> Result<Vec<u8>, std::io::Error> {
        let mut out = Vec::new();
        writeln!(out, "{MAGIC} {FORMAT_VERSION}")?;
        serde_json::to_writer(&mut out, &self.header)?;
        out.push(b'\n');
        let body = postcard::to_allocvec(&self.forest).map_err(std::io::Error::other)?;
        out.extend_from_slice(&body);
        Ok(out)
    }

    /// Write the model (atomically).
    pub fn save(&self, path: &Path) -> Result<(), crate::output::OutputError> {
        let bytes = self
            .to_bytes()
            .map_err(|source| crate::output::OutputError::Io {
                path: path.to_path_buf(),
                source,
            })?;
        crate::output::write_atomic(path, |w| {
            w.write_all(&bytes)
                .map_err(|source| crate::output::OutputError::Io {
                    path: path.to_path_buf(),
                    source,
                })
        })
    }

    /// Read a model, refusing another envelope version or smartcore version.
    pub fn load(path: &Path) -> Result<ClassModel, ModelFileError> {
        let bytes = std::fs::read(path).map_err(|source| ModelFileError::Io {
            path: path.to_path_buf(),
            source,
        })?;
        ClassModel::from_bytes(&bytes, path)
    }

    /// Parse a model's bytes; `path` names it in errors.
    pub fn from_bytes(bytes: &[u8], path: &Path) -> Result<ClassModel, ModelFileError> {
        let p = || path.to_path_buf();
        let corrupt = |message: String| ModelFileError::Corrupt { path: p(), message };
        let first_nl = bytes.iter().position(|&b| b == b'\n');
        let first = first_nl.map_or(bytes, |i| &bytes[..i]);
        let first = std::str::from_utf8(first).unwrap_or("");
        let Some(version) = first.strip_prefix(MAGIC).map(str::trim) else {
            return Err(ModelFileError::NotAModel { path: p() });
        };
        if version != FORMAT_VERSION.to_string() {
            return Err(ModelFileError::Version {
                path: p(),
                found: version.to_string(),
            });
        }
        let rest = &bytes[first_nl.map_or(bytes.len(), |i| i + 1)..];
        let header_end = rest
            .iter()
            .position(|&b| b == b'\n')
            .ok_or_else(|| corrupt("the header line is cut short".into()))?;
        // check the smartcore version before reading anything else
        #[derive(Deserialize)]
        struct Versions {
            smartcore_version: String,
        }
        let v: Versions = serde_json::from_slice(&rest[..header_end])
            .map_err(|e| corrupt(format!("header: {e}")))?;
        if v.smartcore_version != SMARTCORE_VERSION {
            return Err(ModelFileError::Smartcore {
                path: p(),
                found: v.smartcore_version,
            });
        }
        let header: ModelHeader = serde_json::from_slice(&rest[..header_end])
            .map_err(|e| corrupt(format!("header: {e}")))?;
        let forest: Forest = postcard::from_bytes(&rest[header_end + 1..])
            .map_err(|e| corrupt(format!("forest: {e}")))?;
        if forest.n_features != header.width() {
            return Err(corrupt(format!(
                "the forest has {} features, the header lists {}",
                forest.n_features,
                header.width()
            )));
        }
        Ok(ClassModel { header, forest })
    }
}
