//! `[core]`, `[classes]` and `[predictor]`: core data, hydraulic class
//! schemes and the trained class predictor.

use std::collections::BTreeMap;
use std::path::PathBuf;

use serde::Deserialize;

/// `[core]`: core plugs and their depth match to the logs.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct CoreConfig {
    /// Core file: a CSV (WELL, DEPTH_MD, POROSITY..., PERM_MD) or an SPWLA
    /// core-data file.
    pub file: PathBuf,
    /// "csv", "spwla" or "auto" (by extension: `.csv` is CSV, anything else SPWLA). Default "auto".
    #[serde(default)]
    pub format: CoreFormat,
    /// Depth unit of an SPWLA file (CSV files say theirs per row). Default "m".
    #[serde(default)]
    pub spwla_depth_unit: crate::units::DepthUnit,
    /// Accepted core-to-log depth shifts by well, in the project's depth unit,
    /// added to the core depth (`"Tarnby-3" = -0.6`). A suggestion from
    /// `flowzone core` is applied only once it is written here.
    #[serde(default)]
    pub shift: BTreeMap<String, f64>,
    /// Half-width of the shift search, project depth unit. Default 2.0.
    #[serde(default = "default_shift_window")]
    pub shift_window: f64,
    /// Step of the shift search, project depth unit. Default 0.05.
    #[serde(default = "default_shift_step")]
    pub shift_step: f64,
    /// Least rise in correlation (core vs log porosity) for a shift to be
    /// suggested over no shift. Default 0.01.
    #[serde(default = "default_shift_min_gain")]
    pub shift_min_gain: f64,
}

fn default_shift_window() -> f64 {
    2.0
}
fn default_shift_step() -> f64 {
    0.05
}
fn default_shift_min_gain() -> f64 {
    0.01
}

/// Core file format.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum CoreFormat {
    /// `auto` (the default): CSV for a `.csv` file, LAS 3.0 for a `.las`
    /// file, SPWLA otherwise.
    #[default]
    Auto,
    /// `csv`: a CSV with WELL, DEPTH_MD, POROSITY..., PERM_MD columns.
    Csv,
    /// `spwla`: an SPWLA core-data file.
    Spwla,
    /// `las3`: the core data set of a LAS 3.0 file, its columns named as the
    /// core CSV's (DEPTH_MD or DEPT, POROSITY..., PERM_MD...).
    Las3,
}

/// `[classes]`: the schemes that turn core into hydraulic classes.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct ClassesConfig {
    /// The scheme (a key of `[classes.scheme]`) whose classes the run predicts
    /// and writes as CLASS.
    #[serde(rename = "use")]
    pub use_scheme: String,
    /// Permeability from class and porosity: "fzi" (the class's FZI in the
    /// Amaefule relation) or "line" (the class's log10 k vs porosity line).
    /// Default "fzi".
    #[serde(default)]
    pub perm_method: PermMethod,
    /// Schemes by name; `flowzone classes compare` reports every one.
    pub scheme: BTreeMap<String, SchemeSpec>,
}

/// Permeability transform per class.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize, serde::Serialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum PermMethod {
    /// `fzi` (the default): the class's FZI in the Amaefule relation.
    #[default]
    Fzi,
    /// `line`: the class's log10 k vs porosity line (the FZI form where a class has none).
    Line,
}

/// One class scheme, `kind = ...` with its settings.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(
    tag = "kind",
    rename_all = "kebab-case",
    rename_all_fields = "kebab-case",
    deny_unknown_fields
)]
pub enum SchemeSpec {
    /// FZI boundaries in µm, given (`bounds`) or geometric (`start`, `ratio`, `count`).
    FziLadder {
        /// `bounds`: FZI boundaries, µm, ascending; give these or the series below.
        #[serde(default)]
        bounds: Option<Vec<f64>>,
        /// `start`: first boundary of the geometric series, µm of FZI.
        #[serde(default)]
        start: Option<f64>,
        /// `ratio`: factor between successive boundaries (above 1).
        #[serde(default)]
        ratio: Option<f64>,
        /// `count`: number of boundaries in the series (1 to 249).
        #[serde(default)]
        count: Option<usize>,
    },
    /// Winland R35 pore-throat classes; `bounds` in µm, default the published
    /// 0.1, 0.5, 2, 10.
    PortSize {
        /// `bounds`: R35 boundaries, µm, ascending; `None` for the published 0.1, 0.5, 2, 10.
        #[serde(default)]
        bounds: Option<Vec<f64>>,
    },
    /// Classes from a Gaussian mixture on log10 FZI of the core, the number
    /// of classes chosen by BIC (at most `max-classes`, default 6; at least
    /// `min-samples-per-class` samples per class on average, default 10).
    FziClusters {
        /// `max-classes`: most classes the mixture may have (1 to 20). Default 6.
        #[serde(default = "default_max_classes")]
        max_classes: usize,
        /// `min-samples-per-class`: fewest core samples per class on average (at least 2). Default 10.
        #[serde(default = "default_min_per_class")]
        min_samples_per_class: usize,
    },
}

fn default_max_classes() -> usize {
    6
}
fn default_min_per_class() -> usize {
    10
}

/// `[predictor]`: the random forest that assigns classes from logs.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct PredictorConfig {
    /// Log features, by output name: any of VSH, PHIE, GR, RHOB, NPHI, DT,
    /// LOG10_RT. Default ["VSH", "PHIE", "RHOB", "NPHI", "LOG10_RT"].
    #[serde(default = "default_features")]
    pub features: Vec<String>,
    /// A model saved by `flowzone train`; when absent, `run` trains one from
    /// the core first.
    #[serde(default)]
    pub model: Option<PathBuf>,
    /// Trees in the forest. Default 100.
    #[serde(default = "default_trees")]
    pub trees: u16,
    /// Deepest split. Default 10.
    #[serde(default = "default_max_depth")]
    pub max_depth: u16,
    /// Fewest training samples in a leaf. Default 2.
    #[serde(default = "default_min_leaf")]
    pub min_samples_leaf: usize,
    /// Random seed (bootstrap and split features). Default 20250611.
    #[serde(default = "default_seed")]
    pub seed: u64,
    /// A depth whose class won less than this share of the trees' votes is
    /// flagged (FLAG 32). Default 0.5.
    #[serde(default = "default_min_probability")]
    pub min_probability: f64,
    /// Depths with VSH above this are shale and get no class. Default 0.5.
    #[serde(default = "default_max_vsh")]
    pub max_vsh: f64,
    /// A well without one of the feature curves gets classes from a model
    /// trained without it (true), or no classes (false). Default true.
    #[serde(default = "default_true")]
    pub allow_reduced_features: bool,
    /// Greatest distance from a core depth (after shift) to the log sample
    /// used for its features, project depth unit. Default 0.25.
    #[serde(default = "default_max_core_distance")]
    pub max_core_distance: f64,
    /// Depth context (`context`): `auto` trains the forest on point features
    /// and on point plus context features and keeps the one with the better
    /// leave-one-well-out exact score on the cored wells; `on` or `off` force
    /// one. Default `auto`.
    #[serde(default)]
    pub context: EvidenceMode,
    /// Bed sequence (`sequence`): `auto` runs the class probabilities through
    /// a hidden Markov model along depth when that scores better leave one
    /// well out on the cored wells' logs; `on` or `off` force it. Default `auto`.
    #[serde(default)]
    pub sequence: EvidenceMode,
    /// Saturation-height evidence (`saturation-height`): above a free water
    /// level, each class's J-function predicts SW at the depth's height, and
    /// the logs give SW with that class's exponents; the mismatch is a
    /// likelihood per class, combined with the log evidence by Bayes' rule
    /// under a tempering weight. `auto` scores the weights 0.25-4 leave one
    /// well out on the cored wells' logs and uses the best one when it beats
    /// no weight; `on` uses the best nonzero weight; `off` never. Needs
    /// `[capillary]` and a free water level. Default `auto`.
    #[serde(default)]
    pub saturation_height: EvidenceMode,
    /// Half-widths of the context windows, m (`context-scales-m`): for every
    /// feature, the mean, slope and spread of the log over each window around
    /// the depth. Default [0.5, 1.5], about one and three times a density or
    /// neutron tool's vertical resolution (common practice, from memory).
    #[serde(default = "default_context_scales")]
    pub context_scales_m: Vec<f64>,
}

/// Whether a piece of class evidence is used: chosen by score, or forced.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Deserialize, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum EvidenceMode {
    /// Chosen by leave-one-well-out score on the cored wells.
    #[default]
    Auto,
    /// Always used.
    On,
    /// Never used.
    Off,
}

impl PredictorConfig {
    /// The context windows the training set is built with: none when
    /// `context = "off"`.
    pub fn context_scales(&self) -> &[f64] {
        if self.context == EvidenceMode::Off {
            &[]
        } else {
            &self.context_scales_m
        }
    }
}

fn default_context_scales() -> Vec<f64> {
    vec![0.5, 1.5]
}

fn default_features() -> Vec<String> {
    ["VSH", "PHIE", "RHOB", "NPHI", "LOG10_RT"]
        .iter()
        .map(|s| s.to_string())
        .collect()
}
fn default_trees() -> u16 {
    100
}
fn default_max_depth() -> u16 {
    10
}
fn default_min_leaf() -> usize {
    2
}
fn default_seed() -> u64 {
    20_250_611
}
fn default_min_probability() -> f64 {
    0.5
}
fn default_max_vsh() -> f64 {
    0.5
}
fn default_true() -> bool {
    true
}
fn default_max_core_distance() -> f64 {
    0.25
}

impl Default for PredictorConfig {
    fn default() -> Self {
        PredictorConfig {
            features: default_features(),
            model: None,
            trees: default_trees(),
            max_depth: default_max_depth(),
            min_samples_leaf: default_min_leaf(),
            seed: default_seed(),
            min_probability: default_min_probability(),
            max_vsh: default_max_vsh(),
            allow_reduced_features: true,
            max_core_distance: default_max_core_distance(),
            context: EvidenceMode::Auto,
            sequence: EvidenceMode::Auto,
            saturation_height: EvidenceMode::Auto,
            context_scales_m: default_context_scales(),
        }
    }
}

/// Check the class settings; `Err((key, message))`.
pub fn validate(
    core: Option<&CoreConfig>,
    classes: Option<&ClassesConfig>,
    predictor: Option<&PredictorConfig>,
) -> Result<(), (String, String)> {
    if let Some(c) = core {
        if !(c.shift_window > 0.0 && c.shift_step > 0.0 && c.shift_step <= c.shift_window) {
            return Err((
                "core.shift-step".into(),
                format!(
                    "{} must be above 0 and at most shift-window ({})",
                    c.shift_step, c.shift_window
                ),
            ));
        }
        for (well, s) in &c.shift {
            if !s.is_finite() {
                return Err((
                    format!("core.shift.\"{well}\""),
                    format!("{s} is not a number"),
                ));
            }
        }
    }
    if let Some(cl) = classes {
        if !cl.scheme.contains_key(&cl.use_scheme) {
            return Err((
                "classes.use".into(),
                format!(
                    "`{}` is not a scheme of [classes.scheme] (have: {})",
                    cl.use_scheme,
                    cl.scheme.keys().cloned().collect::<Vec<_>>().join(", ")
                ),
            ));
        }
        for (name, spec) in &cl.scheme {
            let key = format!("classes.scheme.{name}");
            spec.check().map_err(|e| (key, e.to_string()))?;
        }
    }
    if let Some(p) = predictor {
        if classes.is_none() {
            return Err((
                "predictor".into(),
                "needs [classes] (which scheme it predicts)".into(),
            ));
        }
        if p.model.is_none() && core.is_none() {
            return Err((
                "predictor.model".into(),
                "no saved model and no [core] to train one from".into(),
            ));
        }
        if p.features.is_empty() {
            return Err(("predictor.features".into(), "the list is empty".into()));
        }
        if p.context_scales_m.len() > 4
            || p.context_scales_m
                .iter()
                .any(|w| !(w.is_finite() && *w > 0.0 && *w <= 20.0))
        {
            return Err((
                "predictor.context-scales-m".into(),
                format!(
                    "{:?}: give up to 4 half-widths, each above 0 and at most 20 m",
                    p.context_scales_m
                ),
            ));
        }
        if p.context == EvidenceMode::On && p.context_scales_m.is_empty() {
            return Err((
                "predictor.context".into(),
                "`on` needs at least one context-scales-m".into(),
            ));
        }
        for f in &p.features {
            if Feature::parse(f).is_none() {
                return Err((
                    "predictor.features".into(),
                    format!(
                        "`{f}` is not a feature (valid: {})",
                        Feature::ALL
                            .iter()
                            .map(|f| f.name())
                            .collect::<Vec<_>>()
                            .join(", ")
                    ),
                ));
            }
        }
        if p.trees == 0 || p.max_depth == 0 || p.min_samples_leaf == 0 {
            return Err((
                "predictor.trees".into(),
                "trees, max-depth and min-samples-leaf must be at least 1".into(),
            ));
        }
        if !(0.0..=1.0).contains(&p.min_probability) {
            return Err((
                "predictor.min-probability".into(),
                format!("{} is outside 0-1", p.min_probability),
            ));
        }
        if !(p.max_vsh > 0.0 && p.max_vsh <= 1.0) {
            return Err((
                "predictor.max-vsh".into(),
                format!("{} is outside (0, 1]", p.max_vsh),
            ));
        }
    }
    Ok(())
}

/// A `[classes.scheme.NAME]` whose values cannot make a scheme.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SchemeSpecError {
    /// Bounds empty, not positive, not ascending or too many.
    #[error("bounds must be positive and ascending (1 to 249 of them)")]
    Bounds,
    /// A geometric ladder's start, ratio or count out of range.
    #[error("start {start} must be above 0, ratio {ratio} above 1 and count {count} in 1-249")]
    Series {
        start: f64,
        ratio: f64,
        count: usize,
    },
    /// Neither bounds nor a full geometric series.
    #[error("give either bounds, or start, ratio and count")]
    Ladder,
    /// Cluster limits out of range.
    #[error(
        "max-classes {max_classes} must be 1-20 and min-samples-per-class {min_samples_per_class} at least 2"
    )]
    Clusters {
        max_classes: usize,
        min_samples_per_class: usize,
    },
}

impl SchemeSpec {
    fn check(&self) -> Result<(), SchemeSpecError> {
        let ascending_positive = |b: &[f64]| {
            !b.is_empty()
                && b.iter().all(|v| v.is_finite() && *v > 0.0)
                && b.windows(2).all(|w| w[0] < w[1])
        };
        match self {
            SchemeSpec::FziLadder {
                bounds,
                start,
                ratio,
                count,
            } => match (bounds, start, ratio, count) {
                (Some(b), None, None, None) => {
                    if ascending_positive(b) && b.len() < 250 {
                        Ok(())
                    } else {
                        Err(SchemeSpecError::Bounds)
                    }
                }
                (None, Some(s), Some(r), Some(n)) => {
                    if *s > 0.0
                        && *r > 1.0
                        && (1..250).contains(n)
                        && s.is_finite()
                        && r.is_finite()
                    {
                        Ok(())
                    } else {
                        Err(SchemeSpecError::Series {
                            start: *s,
                            ratio: *r,
                            count: *n,
                        })
                    }
                }
                _ => Err(SchemeSpecError::Ladder),
            },
            SchemeSpec::PortSize { bounds } => match bounds {
                Some(b) if !(ascending_positive(b) && b.len() < 250) => {
                    Err(SchemeSpecError::Bounds)
                }
                _ => Ok(()),
            },
            SchemeSpec::FziClusters {
                max_classes,
                min_samples_per_class,
            } => {
                if (1..=20).contains(max_classes) && *min_samples_per_class >= 2 {
                    Ok(())
                } else {
                    Err(SchemeSpecError::Clusters {
                        max_classes: *max_classes,
                        min_samples_per_class: *min_samples_per_class,
                    })
                }
            }
        }
    }
}

/// A log feature the predictor can use, by its output name.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, serde::Serialize, serde::Deserialize,
)]
pub enum Feature {
    /// `VSH`: shale volume, v/v.
    #[serde(rename = "VSH")]
    Vsh,
    /// `PHIE`: effective porosity, v/v.
    #[serde(rename = "PHIE")]
    Phie,
    /// `GR`: gamma ray, gAPI.
    #[serde(rename = "GR")]
    Gr,
    /// `RHOB`: bulk density, g/cm3.
    #[serde(rename = "RHOB")]
    Rhob,
    /// `NPHI`: neutron porosity, v/v.
    #[serde(rename = "NPHI")]
    Nphi,
    /// `DT`: compressional slowness, us/ft.
    #[serde(rename = "DT")]
    Dt,
    /// `LOG10_RT`: log10 of deep resistivity (ohm.m).
    #[serde(rename = "LOG10_RT")]
    Log10Rt,
}

impl Feature {
    /// Every feature, in declaration order.
    pub const ALL: [Feature; 7] = [
        Feature::Vsh,
        Feature::Phie,
        Feature::Gr,
        Feature::Rhob,
        Feature::Nphi,
        Feature::Dt,
        Feature::Log10Rt,
    ];

    /// The name used in the config and reports.
    pub fn name(self) -> &'static str {
        match self {
            Feature::Vsh => "VSH",
            Feature::Phie => "PHIE",
            Feature::Gr => "GR",
            Feature::Rhob => "RHOB",
            Feature::Nphi => "NPHI",
            Feature::Dt => "DT",
            Feature::Log10Rt => "LOG10_RT",
        }
    }

    /// A feature by name, case-insensitive.
    pub fn parse(s: &str) -> Option<Feature> {
        Feature::ALL
            .into_iter()
            .find(|f| f.name().eq_ignore_ascii_case(s.trim()))
    }
}
