//! Classes in the field run: read the core, train (or load) the class model,
//! then give every reservoir depth of every well a class, its vote share and a
//! permeability from class and porosity.
//!
//! ```text
//! core file ─► match to wells, accepted shifts ─► core table, shift suggestions
//!                         │
//! wells (stages) ─► features at cored depths ─► forest + LOWO scores ─► model file
//!                                                        │
//! every well ─► CLASS, CLASS_PROB, PERM, FLAG 32 ◄────────┘
//! ```

use crate::output::messages::note;
use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::sync::{Arc, Mutex};
use std::time::Instant;

use rayon::prelude::*;
use serde::{Deserialize, Serialize};

use crate::classes::core_match::{self, FieldCore};
use crate::classes::posterior;
use crate::classes::predictor::model_file::{
    AblationRow, ClassModel, FeatureInfo, ModelHeader, SMARTCORE_VERSION, SchemeInfo,
};
use crate::classes::predictor::{self, Feature, Forest, ForestParams, TrainingSet};
use crate::classes::{self, ClassScheme, perm};
use crate::config::{EvidenceMode, PermMethod, PredictorConfig};
use crate::input::core_samples::{Rejected, ShiftSuggestion};
use crate::output::messages::chain;
use crate::output::schema::{Col, FLAG_LOW_CLASS_PROBABILITY, flag_description};
use crate::output::{OutColumn, OutputError, Table, write_atomic, write_json};
use crate::well::{self, RunContext, WellOutput};
use std::io::Write as _;

/// What the class stage needs from a run.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Mode {
    /// `run`: load the configured model, or train one.
    Run,
    /// `train`: always train.
    Train,
    /// `core`: only the core table and the shift suggestions.
    Core,
}

/// The model and what it needs to serve every well.
#[derive(Debug)]
pub struct ClassSetup {
    /// The scheme CLASS is in (the model's, as trained).
    pub scheme: SchemeInfo,
    /// The class model, trained this run or loaded.
    pub model: Arc<ClassModel>,
    /// The `[predictor]` settings (defaults when the section is absent).
    pub cfg: PredictorConfig,
    /// Training rows, kept to fit models without a feature a well lacks.
    training: Option<TrainingSet>,
    reduced: Mutex<BTreeMap<Vec<Feature>, Option<Arc<ClassModel>>>>,
    /// The cored wells after the logs stages, by well name, with their file
    /// stems: for scoring the saturation-height evidence on them.
    cored: BTreeMap<String, (WellOutput, String)>,
    /// The forests fitted leave-one-well-out at training (empty when the
    /// model was loaded: refitted when needed).
    folds: Vec<predictor::FoldForest>,
    /// How this run uses the saturation-height evidence.
    pub saturation: SatChoice,
}

/// How a run uses the saturation-height evidence, and the scores it was
/// chosen by.
#[derive(Debug, Clone, Default, Serialize, Deserialize, PartialEq)]
pub struct SatChoice {
    /// The tempering weight used; 0 when the evidence is not used.
    pub weight: f64,
    /// Leave-one-well-out scores of the weights tried, as ablation rows
    /// (the first row is the model without the evidence).
    pub scored: Vec<AblationRow>,
    /// Why it is used or not, in words.
    pub note: String,
}

/// A cored well's saturation-height residuals from its output and names
/// (LAS name, file stem), or why it has none.
pub type ResidualsOf<'a> = dyn Fn(&WellOutput, &[&str]) -> Result<Vec<f64>, String> + Sync + 'a;

/// Tempering weights of the saturation-height evidence scored leave one
/// well out (0 is always scored too): from a quarter of the nominal
/// likelihood to four times it.
pub const SAT_WEIGHTS: [f64; 5] = [0.25, 0.5, 1.0, 2.0, 4.0];

/// What the class stage did before the wells, for the run summary.
#[derive(Debug, Clone, Default, Serialize)]
pub struct ClassSummary {
    /// The scheme of CLASS.
    pub scheme: Option<SchemeInfo>,
    /// Every configured scheme, as in the core table's CLASS_<NAME> columns.
    pub schemes: Vec<SchemeInfo>,
    /// The model file used (loaded or written).
    pub model_file: Option<String>,
    /// Whether this run trained the model (rather than loading one).
    pub trained: bool,
    /// The core file read, as shown to the user.
    pub core_file: Option<String>,
    /// Core samples matched to a well's log depths.
    pub core_samples: usize,
    /// Rows of the core file left out, with line and reason.
    pub core_rejected: Vec<Rejected>,
    /// Core samples not used for training, by well, with line and reason.
    pub training_excluded: BTreeMap<String, Vec<Rejected>>,
    /// Depth shift added to each well's core depths (`[core.shift]`), project unit.
    pub shifts_applied: BTreeMap<String, f64>,
    /// The shift that best lines core porosity up with the log, by well;
    /// `None` when the overlap is too small to tell.
    pub shift_suggestions: BTreeMap<String, Option<ShiftSuggestion>>,
    /// Files written by the class stage.
    pub outputs: Vec<String>,
    /// How the classes use the saturation-height evidence this run; `None`
    /// without a saturation-height model.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub saturation_height: Option<SatChoice>,
}

/// The class stage's results.
#[derive(Debug)]
pub struct Prepared {
    /// The model for the wells; `None` when the run has no class model.
    pub setup: Option<ClassSetup>,
    /// What the stage did, for the run summary.
    pub summary: ClassSummary,
    /// The core matched to the wells; `None` without `[core]`.
    pub core: Option<FieldCore>,
}

/// Per-well class counts.
#[derive(Debug, Clone, Default, Serialize, PartialEq, Deserialize)]
pub struct ClassCounts {
    /// Depths given a class.
    pub classified: usize,
    /// Depths given a class with less than the minimum vote share (FLAG 32).
    pub low_probability: usize,
    /// Depths with VSH above the shale limit: no class.
    pub shale: usize,
    /// Depths flagged out of range, missing input or outside zones: no class.
    pub flagged: usize,
    /// Reservoir depths where a feature value is missing: no class.
    pub missing_feature: usize,
    /// Depths per class, class 1 first.
    pub per_class: Vec<usize>,
    /// The features of the model used; empty when none could be used.
    pub features: Vec<Feature>,
    /// The evidence the well's classes came from, in words: log features,
    /// depth context, bed sequence; empty when the well has no classes.
    #[serde(default)]
    pub evidence: Vec<String>,
    /// What the Monte Carlo draws the well's classes from (taken by the
    /// pipeline; never in the summary).
    #[serde(skip)]
    pub draw_from: Option<posterior::ClassEvidence>,
}

/// Run the class stage before the wells: core, schemes, model.
pub fn prepare(
    ctx: &RunContext,
    files: &[PathBuf],
    out: &Path,
    mode: Mode,
    progress: bool,
) -> Result<Prepared, ClassStageError> {
    let config = &ctx.config;
    let mut summary = ClassSummary::default();
    let predictor_cfg = config.predictor.clone().unwrap_or_default();
    let wants_model =
        config.classes.is_some() && (config.predictor.is_some() || config.core.is_some());
    let loaded = match (&predictor_cfg.model, mode, wants_model) {
        (Some(p), Mode::Run, true) => {
            let path = config.resolve_path(p);
            Some((ClassModel::load(&path)?, path))
        }
        _ => None,
    };
    let Some(core_cfg) = &config.core else {
        if mode != Mode::Run {
            return Err(ClassStageError::NoCore);
        }
        // a saved model can run without core (no reduced-feature models then)
        let setup = loaded.map(|(model, path)| {
            summary.model_file = Some(path.display().to_string());
            summary.scheme = Some(model.header.scheme.clone());
            ClassSetup {
                scheme: model.header.scheme.clone(),
                model: Arc::new(model),
                cfg: predictor_cfg.clone(),
                training: None,
                reduced: Mutex::new(BTreeMap::new()),
                cored: BTreeMap::new(),
                folds: Vec::new(),
                saturation: SatChoice::default(),
            }
        });
        return Ok(Prepared {
            setup,
            summary,
            core: None,
        });
    };

    let data = core_match::load(config, core_cfg)?;
    summary.core_file = Some(data.file.display().to_string());
    let core_wells: Vec<String> = data
        .samples
        .iter()
        .map(|s| s.well.to_ascii_lowercase())
        .collect();

    // pass 1: the stages on every well, keeping the cored wells' tables
    if progress {
        note!(
            "core: reading {} wells to match {} core samples",
            files.len(),
            data.samples.len()
        );
    }
    let pass = read_wells(files, ctx, &core_wells);
    let names: Vec<(String, String)> = pass
        .iter()
        .map(|(n, s, _)| (n.clone(), s.clone()))
        .collect();
    let core = core_match::match_wells(data, &names, core_cfg);
    summary.core_samples = core.samples.len();
    summary.core_rejected = core.rejected.clone();
    summary.shifts_applied = core.shifts.clone();
    let (cored, failed) = cored_wells(pass);
    let tables: BTreeMap<String, Table> = cored
        .iter()
        .map(|(n, (o, _))| (n.clone(), o.table.clone()))
        .collect();
    summary.shift_suggestions = core_match::suggest_shifts(&core, &tables, core_cfg);

    // schemes: every configured one for the core table, the used one for the model
    let phi_k = core.phi_k();
    let schemes = build_schemes(config, &phi_k, &mut summary)?;
    let core_dir = out.join("core");
    std::fs::create_dir_all(&core_dir).map_err(|source| OutputError::Io {
        path: core_dir.clone(),
        source,
    })?;
    let table_path = core_dir.join("core-table.csv");
    let refs: Vec<(String, &dyn ClassScheme)> = schemes
        .iter()
        .map(|(n, s)| (n.clone(), s.as_ref()))
        .collect();
    core_match::write_core_table(&table_path, &core, &refs)?;
    summary.outputs.push(crate::output::shown(out, &table_path));

    let setup = if mode == Mode::Core || !wants_model {
        None
    } else {
        let cl = config
            .classes
            .as_ref()
            .expect("wants_model needs [classes]");
        let (_, scheme) = schemes
            .iter()
            .find(|(n, _)| *n == cl.use_scheme)
            .expect("validated: classes.use names a scheme");
        let info = classes::info(&cl.use_scheme, scheme.as_ref());
        summary.scheme = Some(info.clone());
        let features: Vec<Feature> = predictor_cfg
            .features
            .iter()
            .filter_map(|f| Feature::parse(f))
            .collect();
        let set = training_set(
            &core,
            &tables,
            &failed,
            &features,
            scheme.as_ref(),
            &predictor_cfg,
            &mut summary,
        );
        // permeability from class and porosity: every matched core sample
        let perm_samples: Vec<(u8, f64, f64)> = phi_k
            .iter()
            .filter_map(|&(p, k)| scheme.classify(p, k).map(|c| (c, p, k)))
            .collect();
        let perm_fit = perm::fit(&perm_samples);
        let (model, folds) = match loaded {
            Some((model, path)) => {
                check_scheme(&model.header.scheme, &info, &path)?;
                summary.model_file = Some(path.display().to_string());
                (model, Vec::new())
            }
            None => train_and_save(
                &set,
                &info,
                &predictor_cfg,
                cl.perm_method,
                perm_fit,
                &tables,
                out,
                &mut summary,
                progress,
            )?,
        };
        Some(ClassSetup {
            scheme: model.header.scheme.clone(),
            model: Arc::new(model),
            cfg: predictor_cfg.clone(),
            training: (set.rows() > 0).then_some(set),
            reduced: Mutex::new(BTreeMap::new()),
            cored,
            folds,
            saturation: SatChoice::default(),
        })
    };
    let report_path = core_dir.join("core-report.json");
    summary
        .outputs
        .push(crate::output::shown(out, &report_path));
    write_json(&report_path, &summary)?;
    Ok(Prepared {
        setup,
        summary,
        core: Some(core),
    })
}

/// One well's pass through the logs stages: (name, file stem, its output when
/// the well is cored, or why it failed).
type WellPass = (String, String, Result<Option<WellOutput>, well::WellError>);

/// Pass 1 of the class stage: the logs stages on every well (in parallel),
/// keeping the tables of the wells in `core_wells` (lower case).
fn read_wells(files: &[PathBuf], ctx: &RunContext, core_wells: &[String]) -> Vec<WellPass> {
    files
        .par_iter()
        .map(|f| {
            let stem = well::stem_of(f);
            match well::process(f, ctx) {
                Ok(o) => {
                    let cored = core_wells
                        .iter()
                        .any(|w| w.eq_ignore_ascii_case(&o.name) || w.eq_ignore_ascii_case(&stem));
                    (o.name.clone(), stem, Ok(cored.then_some(o)))
                }
                Err(e) => (stem.clone(), stem, Err(e)),
            }
        })
        .collect()
}

/// The cored wells' outputs (with file stems) by well name, and the wells
/// that failed with why.
type CoredWells = BTreeMap<String, (WellOutput, String)>;

fn cored_wells(pass: Vec<WellPass>) -> (CoredWells, BTreeMap<String, String>) {
    let mut tables: CoredWells = BTreeMap::new();
    let mut failed: BTreeMap<String, String> = BTreeMap::new();
    for (name, stem, r) in pass {
        match r {
            Ok(Some(o)) => {
                tables.insert(name, (o, stem));
            }
            Ok(None) => {}
            Err(e) => {
                failed.insert(name, chain(&e));
            }
        }
    }
    (tables, failed)
}

/// Schemes by their `[classes.scheme]` name, in config order.
type NamedSchemes = Vec<(String, Box<dyn ClassScheme>)>;

/// Every scheme of `[classes.scheme]`, built (data-driven ones fitted to the
/// core's φ-k pairs) and recorded in `summary`.
fn build_schemes(
    config: &crate::config::Config,
    phi_k: &[(f64, f64)],
    summary: &mut ClassSummary,
) -> Result<NamedSchemes, ClassStageError> {
    let mut schemes: Vec<(String, Box<dyn ClassScheme>)> = Vec::new();
    if let Some(cl) = &config.classes {
        for (name, spec) in &cl.scheme {
            let s = classes::build(spec, phi_k).map_err(|source| {
                crate::classes::compare::SchemeBuildError {
                    scheme: name.clone(),
                    without: None,
                    source,
                }
            })?;
            summary.schemes.push(classes::info(name, s.as_ref()));
            schemes.push((name.clone(), s));
        }
    }
    Ok(schemes)
}

/// The training set: log features at every matched core sample of the wells
/// that ran; samples left out are recorded by well in `summary`.
fn training_set(
    core: &FieldCore,
    tables: &BTreeMap<String, Table>,
    failed: &BTreeMap<String, String>,
    features: &[Feature],
    scheme: &dyn ClassScheme,
    predictor_cfg: &PredictorConfig,
    summary: &mut ClassSummary,
) -> TrainingSet {
    let mut set = TrainingSet {
        features: features.to_vec(),
        context_scales_m: predictor_cfg.context_scales().to_vec(),
        ..TrainingSet::default()
    };
    for w in core.wells() {
        let samples: Vec<&core_match::MatchedSample> =
            core.samples.iter().filter(|s| s.well == w).collect();
        let Some(table) = tables.get(&w) else {
            let why = failed
                .get(&w)
                .cloned()
                .unwrap_or_else(|| "not processed".into());
            summary.training_excluded.insert(
                w.clone(),
                samples
                    .iter()
                    .map(|s| Rejected {
                        line: s.sample.line,
                        reason: format!("the well failed: {why}"),
                    })
                    .collect(),
            );
            continue;
        };
        let (rows, excluded) =
            core_match::training_rows(&samples, table, features, scheme, predictor_cfg);
        if !excluded.is_empty() {
            summary.training_excluded.insert(w.clone(), excluded);
        }
        for (x, y, phie, row) in rows {
            set.x.extend(x);
            set.y.push(y);
            set.well.push(w.clone());
            set.phie.push(phie);
            set.row.push(row);
        }
    }
    set
}

/// Train the forest, save it under `model/` with its training report, and
/// record the files in `summary`.
#[allow(clippy::too_many_arguments)]
fn train_and_save(
    set: &TrainingSet,
    info: &SchemeInfo,
    predictor_cfg: &PredictorConfig,
    perm_method: PermMethod,
    perm_fit: Vec<perm::ClassPerm>,
    logs: &BTreeMap<String, Table>,
    out: &Path,
    summary: &mut ClassSummary,
    progress: bool,
) -> Result<(ClassModel, Vec<predictor::FoldForest>), ClassStageError> {
    let model_dir = out.join("model");
    if progress {
        note!(
            "train: {} samples from {} wells, {} features",
            set.rows(),
            set.wells().len(),
            set.features.len()
        );
    }
    let (model, folds) =
        train_with_folds(set, info, predictor_cfg, perm_method, perm_fit, Some(logs))?;
    if progress {
        note!("train: forest fitted in {:.3} s", model.header.fit_seconds);
    }
    std::fs::create_dir_all(&model_dir).map_err(|source| OutputError::Io {
        path: model_dir.clone(),
        source,
    })?;
    let path = model_dir.join("class-model.fzm");
    model.save(&path)?;
    summary.model_file = Some(crate::output::shown(out, &path));
    summary.trained = true;
    summary.outputs.push(crate::output::shown(out, &path));
    let [json, text] = write_report_files(&model.header, summary, out)?;
    summary.outputs.push(crate::output::shown(out, &json));
    summary.outputs.push(crate::output::shown(out, &text));
    Ok((model, folds))
}

/// Write `model/training-report.json` and `.txt` for `header`; their paths.
fn write_report_files(
    header: &ModelHeader,
    summary: &ClassSummary,
    out: &Path,
) -> Result<[PathBuf; 2], ClassStageError> {
    let model_dir = out.join("model");
    let json = model_dir.join("training-report.json");
    write_json(&json, header)?;
    let text = model_dir.join("training-report.txt");
    let report = report_text(header, summary);
    write_atomic(&text, |w| {
        w.write_all(report.as_bytes())
            .map_err(|source| OutputError::Io {
                path: text.clone(),
                source,
            })
    })?;
    Ok([json, text])
}

/// Write the training report again once the run has scored the
/// saturation-height evidence: its rows join the ablation table.
pub fn write_training_report(
    setup: &ClassSetup,
    summary: &ClassSummary,
    out: &Path,
) -> Result<(), ClassStageError> {
    let mut header = setup.model.header.clone();
    header.ablation = setup.ablation();
    write_report_files(&header, summary, out).map(|_| ())
}

/// Why the class stage cannot give a model.
#[derive(Debug, thiserror::Error)]
pub enum ClassStageError {
    /// A saved model was trained for another scheme than the config's.
    #[error(
        "model `{}` was trained for scheme {trained_for}, but the config's [classes] gives {config_gives}: train it again with `flowzone train`",
        .model.display()
    )]
    SchemeMismatch {
        /// The model file.
        model: PathBuf,
        /// The scheme the model was trained for.
        trained_for: String,
        /// The scheme the config's `[classes]` gives.
        config_gives: String,
    },
    /// No core sample has log features at its depth.
    #[error(
        "no core sample could be paired with log features (see core/core-report.json: training_excluded)"
    )]
    NoTrainingSamples,
    /// `classes core` or `train` without a `[core]` section.
    #[error("the config has no [core] section")]
    NoCore,
    /// The core file cannot be read.
    #[error(transparent)]
    Core(#[from] crate::input::core_samples::CoreError),
    /// A configured scheme cannot be built on the core.
    #[error(transparent)]
    Scheme(#[from] crate::classes::compare::SchemeBuildError),
    /// A saved model cannot be loaded.
    #[error(transparent)]
    ModelFile(#[from] crate::classes::predictor::model_file::ModelFileError),
    /// The forest cannot be fitted or scored.
    #[error(transparent)]
    Predict(#[from] crate::classes::predictor::PredictError),
    /// A class-stage output cannot be written.
    #[error(transparent)]
    Output(#[from] OutputError),
}

/// A loaded model must have been trained for the scheme the config uses.
fn check_scheme(
    model: &SchemeInfo,
    config: &SchemeInfo,
    path: &Path,
) -> Result<(), ClassStageError> {
    let same_bounds = model.boundaries.len() == config.boundaries.len()
        && model
            .boundaries
            .iter()
            .zip(&config.boundaries)
            .all(|(a, b)| (a - b).abs() <= 1e-9 * b.abs().max(1.0));
    if model.name != config.name || model.kind != config.kind || !same_bounds {
        return Err(ClassStageError::SchemeMismatch {
            model: path.to_path_buf(),
            trained_for: model.describe(),
            config_gives: config.describe(),
        });
    }
    Ok(())
}

/// Fit the forest on the training set, score it leave-one-well-out, and wrap
/// it with its header. With `predictor.context = "auto"` and two or more
/// cored wells, the forest is scored on point features and on point plus
/// depth context, and the better leave-one-well-out exact score is kept
/// (point features on a tie: the simpler model); every variant scored is a
/// line of the header's ablation table.
pub fn train(
    set: &TrainingSet,
    scheme: &SchemeInfo,
    cfg: &PredictorConfig,
    perm_method: PermMethod,
    perm: Vec<perm::ClassPerm>,
    logs: Option<&BTreeMap<String, Table>>,
) -> Result<ClassModel, ClassStageError> {
    train_with_folds(set, scheme, cfg, perm_method, perm, logs).map(|(m, _)| m)
}

/// [`train`], also giving the leave-one-well-out forests it fitted (one per
/// cored well, fitted without it), for scoring more evidence on them later.
pub fn train_with_folds(
    set: &TrainingSet,
    scheme: &SchemeInfo,
    cfg: &PredictorConfig,
    perm_method: PermMethod,
    perm: Vec<perm::ClassPerm>,
    logs: Option<&BTreeMap<String, Table>>,
) -> Result<(ClassModel, Vec<predictor::FoldForest>), ClassStageError> {
    if set.rows() == 0 {
        return Err(ClassStageError::NoTrainingSamples);
    }
    let params = ForestParams {
        trees: cfg.trees,
        max_depth: cfg.max_depth,
        min_samples_leaf: cfg.min_samples_leaf,
        seed: cfg.seed,
    };
    let has_context = !set.context_scales_m.is_empty();
    let mut variants: Vec<(&str, TrainingSet)> = Vec::new();
    if cfg.context != EvidenceMode::On || !has_context {
        variants.push(("point features", set.select(&set.features, false)));
    }
    if cfg.context != EvidenceMode::Off && has_context {
        variants.push(("+ depth context", set.clone()));
    }
    let mut scored = Vec::with_capacity(variants.len());
    for (name, v) in variants {
        let validation = predictor::leave_one_well_out(&v, &params, scheme.class_count)?;
        scored.push((name, v, validation));
    }
    // the first (simplest) variant wins unless a later one scores higher
    let best = (0..scored.len())
        .max_by(|&i, &j| {
            let e = |k: usize| {
                scored[k]
                    .2
                    .as_ref()
                    .map_or(f64::NEG_INFINITY, |(v, _)| v.forest.exact)
            };
            e(i).total_cmp(&e(j)).then(j.cmp(&i))
        })
        .unwrap_or(0);
    let mut ablation: Vec<AblationRow> = scored
        .iter()
        .enumerate()
        .filter_map(|(k, (name, _, v))| {
            v.as_ref().map(|(v, _)| AblationRow {
                evidence: (*name).to_string(),
                exact: v.forest.exact,
                within_one: v.forest.within_one,
                chosen: k == best,
            })
        })
        .collect();
    let (_, chosen, scores) = scored.swap_remove(best);
    let (validation, folds) = scores.map_or((None, Vec::new()), |(v, f)| (Some(v), f));
    // the bed sequence, scored on the cored wells' whole logs
    let k = scheme.class_count;
    let mut sequence = None;
    if let (Some(logs), true) = (logs, cfg.sequence != EvidenceMode::Off) {
        // on the same folds as the forest's own score: no forest is fitted twice
        let variants = [false, true].map(|sequence| posterior::Variant {
            sequence,
            sat_weight: 0.0,
        });
        let none = BTreeMap::new();
        let scores =
            posterior::lowo_scores(&chosen, logs, &folds, k, cfg.max_vsh, &none, &variants)?;
        let model = posterior::sequence_from(&chosen, logs, k);
        if let (Some([s0, s1]), Some(model)) = (scores.as_deref(), model) {
            let ((e0, w0), (e1, w1)) = ((s0.exact, s0.within_one), (s1.exact, s1.within_one));
            let use_it = cfg.sequence == EvidenceMode::On || e1 > e0;
            for r in &mut ablation {
                r.chosen = r.chosen && !use_it;
            }
            ablation.push(AblationRow {
                evidence: "same, on the cored logs".into(),
                exact: e0,
                within_one: w0,
                chosen: false,
            });
            ablation.push(AblationRow {
                evidence: "+ bed sequence (logs)".into(),
                exact: e1,
                within_one: w1,
                chosen: use_it,
            });
            sequence = use_it.then_some(model);
        } else if cfg.sequence == EvidenceMode::On {
            sequence = posterior::sequence_from(&chosen, logs, k);
        }
    }
    let start = Instant::now();
    let forest = Forest::fit(&chosen.x, chosen.width(), &chosen.y, &params)?;
    let fit_seconds = start.elapsed().as_secs_f64();
    let samples_per_class = (1..=scheme.class_count)
        .filter_map(|c| {
            let c = u8::try_from(c).ok()?;
            let n = chosen.y.iter().filter(|&&y| y == c).count();
            (n > 0).then_some((c, n))
        })
        .collect();
    let header = ModelHeader {
        flowzone_version: env!("CARGO_PKG_VERSION").into(),
        smartcore_version: SMARTCORE_VERSION.into(),
        scheme: scheme.clone(),
        features: chosen
            .features
            .iter()
            .map(|f| FeatureInfo {
                name: *f,
                unit: f.unit().into(),
            })
            .collect(),
        context_scales_m: chosen.context_scales_m.clone(),
        ablation,
        sequence,
        params,
        training_wells: chosen.wells(),
        training_samples: chosen.rows(),
        samples_per_class,
        perm_method,
        perm,
        validation,
        fit_seconds,
    };
    Ok((ClassModel { header, forest }, folds))
}

fn pct(v: f64) -> String {
    format!("{:.1} %", 100.0 * v)
}

/// The training report as text.
pub fn report_text(h: &ModelHeader, summary: &ClassSummary) -> String {
    use std::fmt::Write as _;
    let mut s = String::new();
    let _ = writeln!(
        s,
        "flowzone class model (flowzone {}, smartcore {})",
        h.flowzone_version, h.smartcore_version
    );
    let _ = writeln!(s, "scheme: {}", h.scheme.describe());
    let feats: Vec<String> = h
        .features
        .iter()
        .map(|f| format!("{} ({})", f.name.name(), f.unit))
        .collect();
    let _ = writeln!(s, "features: {}", feats.join(", "));
    if h.context_scales_m.is_empty() {
        let _ = writeln!(s, "depth context: none (point values only)");
    } else {
        let w: Vec<String> = h
            .context_scales_m
            .iter()
            .map(|w| format!("±{w} m"))
            .collect();
        let _ = writeln!(
            s,
            "depth context: mean, slope and spread of each feature over {} ({} values per depth)",
            w.join(" and "),
            h.width()
        );
    }
    match &h.sequence {
        None => {
            let _ = writeln!(s, "bed sequence: none (each depth classed on its own)");
        }
        Some(q) => {
            let _ = writeln!(
                s,
                "bed sequence: hidden Markov model along depth, mean bed {:.2} m from the cored wells' plugs (Rabiner 1989)",
                q.bed_thickness_m
            );
        }
    }
    let _ = writeln!(
        s,
        "forest: {} trees, max depth {}, min leaf {}, seed {}",
        h.params.trees, h.params.max_depth, h.params.min_samples_leaf, h.params.seed
    );
    let _ = writeln!(
        s,
        "training: {} samples from wells {}",
        h.training_samples,
        h.training_wells.join(", ")
    );
    for (c, n) in &h.samples_per_class {
        let _ = writeln!(s, "  class {c}: {n} samples");
    }
    let excluded: usize = summary.training_excluded.values().map(Vec::len).sum();
    if excluded > 0 {
        let _ = writeln!(
            s,
            "core samples not used for training: {excluded} (reasons in core/core-report.json)"
        );
    }
    if !h.ablation.is_empty() {
        let _ = writeln!(
            s,
            "\nwhat each piece of evidence adds (leave-one-well-out on the cored wells; gain over point features, % points)"
        );
        let _ = writeln!(
            s,
            "  {:<36} {:>8} {:>11} {:>8}",
            "evidence", "exact", "within one", "gain"
        );
        let first = h.ablation.first().map_or(0.0, |r| r.exact);
        for (i, r) in h.ablation.iter().enumerate() {
            let gain = if i == 0 {
                "-".to_string()
            } else {
                format!("{:+.1}", 100.0 * (r.exact - first))
            };
            let _ = writeln!(
                s,
                "  {:<36} {:>8} {:>11} {:>8}{}",
                r.evidence,
                pct(r.exact),
                pct(r.within_one),
                gain,
                if r.chosen { "   <- used" } else { "" }
            );
        }
    }
    match &h.validation {
        None => {
            let _ = writeln!(s, "validation: none (fewer than two cored wells)");
        }
        Some(v) => {
            let _ = writeln!(
                s,
                "\nleave-one-well-out ({} held-out samples)",
                v.forest.samples
            );
            let _ = writeln!(s, "  {:<28} {:>8} {:>12}", "method", "exact", "within one");
            for (name, sc) in [
                ("random forest", &v.forest),
                ("baseline: nearest centroid", &v.nearest_centroid),
                ("baseline: porosity bins", &v.porosity_bins),
            ] {
                let _ = writeln!(
                    s,
                    "  {:<28} {:>8} {:>12}",
                    name,
                    pct(sc.exact),
                    pct(sc.within_one)
                );
            }
            let _ = writeln!(s, "\n  per well (forest): well, samples, exact");
            for (w, n, e) in &v.forest.folds {
                let _ = writeln!(s, "    {w:<16} {n:>5} {:>8}", pct(*e));
            }
            let _ = writeln!(
                s,
                "\n  confusion (rows: core class, columns: predicted class)"
            );
            let k = v.forest.confusion.len();
            let _ = write!(s, "    {:>6}", "");
            for c in 1..=k {
                let _ = write!(s, " {c:>6}");
            }
            let _ = writeln!(s, " {:>8}", "recall");
            for (i, row) in v.forest.confusion.iter().enumerate() {
                let _ = write!(s, "    {:>6}", i + 1);
                for n in row {
                    let _ = write!(s, " {n:>6}");
                }
                let r = v.forest.recall[i].map_or_else(|| "-".to_string(), pct);
                let _ = writeln!(s, " {r:>8}");
            }
        }
    }
    let _ = writeln!(
        s,
        "\npermeability from class and porosity ({:?} used):",
        h.perm_method
    );
    for p in &h.perm {
        let line = match (p.intercept, p.slope, p.line_rms_log10) {
            (Some(a), Some(b), Some(r)) => format!("log10 k = {a:.3} + {b:.3} phi (rms {r:.3})"),
            _ => "no line (fewer than 3 samples)".into(),
        };
        let _ = writeln!(
            s,
            "  class {}: {} samples, FZI {:.3} um (rms log10 k {:.3}); {line}",
            p.class, p.samples, p.fzi_um, p.fzi_rms_log10
        );
    }
    let _ = writeln!(
        s,
        "\nResults are interpretations: review by a qualified petrophysicist before use, under local regulation and licensed practice."
    );
    s
}

impl ClassSetup {
    /// The model for a well lacking `missing` features: the full model when
    /// none is missing; a model trained without them when allowed and there
    /// are training rows; else `None`.
    fn model_without(&self, missing: &[Feature]) -> Option<Arc<ClassModel>> {
        if missing.is_empty() {
            return Some(self.model.clone());
        }
        if !self.cfg.allow_reduced_features {
            return None;
        }
        let training = self.training.as_ref()?;
        let keep: Vec<Feature> = self
            .model
            .header
            .feature_list()
            .into_iter()
            .filter(|f| !missing.contains(f))
            .collect();
        if keep.is_empty() {
            return None;
        }
        let mut cache = self.reduced.lock().unwrap_or_else(|e| e.into_inner());
        cache
            .entry(keep.clone())
            .or_insert_with(|| {
                let h = &self.model.header;
                let context = !h.context_scales_m.is_empty();
                let cfg = PredictorConfig {
                    context: if context {
                        EvidenceMode::On
                    } else {
                        EvidenceMode::Off
                    },
                    sequence: EvidenceMode::Off,
                    ..self.cfg.clone()
                };
                train(
                    &training.select(&keep, context),
                    &h.scheme,
                    &cfg,
                    h.perm_method,
                    h.perm.clone(),
                    None,
                )
                .ok()
                .map(|mut m| {
                    // the same bed sequence as the full model
                    m.header.sequence = h.sequence.clone();
                    Arc::new(m)
                })
            })
            .clone()
    }

    /// The run's ablation table: the model's rows, then the saturation-height
    /// weights scored this run (the chosen row marked).
    pub fn ablation(&self) -> Vec<AblationRow> {
        let mut rows = self.model.header.ablation.clone();
        if self.saturation.weight > 0.0 {
            rows.iter_mut().for_each(|r| r.chosen = false);
        }
        rows.extend(self.saturation.scored.iter().cloned());
        rows
    }

    /// Choose the tempering weight of the saturation-height evidence for this
    /// run (`[predictor] saturation-height`): each cored well is classed
    /// along its log by forests fitted without it, with the model's bed
    /// sequence, at weight 0 and every weight of [`SAT_WEIGHTS`], and scored
    /// at its plugs. `auto` keeps the best weight (the smaller on a tie) when
    /// it beats weight 0 by more than chance
    /// ([`posterior::VariantScore::beats_first`]); `on` keeps the best nonzero
    /// weight (1 when nothing can be scored). `residuals_of` gives a cored
    /// well's residuals ([`crate::sat_height::evidence::class_residuals`]),
    /// from its output and names (LAS name, file stem), or why it has none.
    pub fn choose_saturation_weight(
        &mut self,
        residuals_of: &ResidualsOf<'_>,
    ) -> Result<(), ClassStageError> {
        let mode = self.cfg.saturation_height;
        if mode == EvidenceMode::Off {
            self.saturation = SatChoice {
                note: "not used ([predictor] saturation-height = \"off\")".into(),
                ..SatChoice::default()
            };
            return Ok(());
        }
        let mut residuals = BTreeMap::new();
        let mut why = Vec::new();
        for (name, (out, stem)) in &self.cored {
            match residuals_of(out, &[name.as_str(), stem.as_str()]) {
                Ok(r) if r.iter().any(|v| v.is_finite()) => {
                    residuals.insert(name.clone(), r);
                }
                Ok(_) => why.push(format!("{name} has no depth above a free water level")),
                Err(e) => why.push(format!("{name}: {e}")),
            }
        }
        let k = self.scheme.class_count;
        let h = &self.model.header;
        let mut scores = None;
        if let (Some(training), false) = (&self.training, residuals.is_empty()) {
            let set = training.select(&h.feature_list(), !h.context_scales_m.is_empty());
            if self.folds.is_empty() {
                self.folds = predictor::leave_one_well_out(&set, &h.params, k)?
                    .map(|(_, f)| f)
                    .unwrap_or_default();
            }
            let logs: BTreeMap<String, Table> = self
                .cored
                .iter()
                .map(|(n, (o, _))| (n.clone(), o.table.clone()))
                .collect();
            let variants: Vec<posterior::Variant> = std::iter::once(0.0)
                .chain(SAT_WEIGHTS)
                .map(|sat_weight| posterior::Variant {
                    sequence: h.sequence.is_some(),
                    sat_weight,
                })
                .collect();
            scores = posterior::lowo_scores(
                &set,
                &logs,
                &self.folds,
                k,
                self.cfg.max_vsh,
                &residuals,
                &variants,
            )?;
        }
        let unscored = if why.is_empty() {
            String::new()
        } else {
            format!(" (not scored on {})", why.join("; "))
        };
        self.saturation = match scores {
            Some(sc) if sc.len() == SAT_WEIGHTS.len() + 1 => {
                let best = (1..sc.len())
                    .max_by(|&i, &j| {
                        (sc[i].exact.total_cmp(&sc[j].exact))
                            .then(sc[i].within_one.total_cmp(&sc[j].within_one))
                            .then(j.cmp(&i))
                    })
                    .unwrap_or(1);
                let use_it = mode == EvidenceMode::On || sc[best].beats_first();
                let weight = if use_it { SAT_WEIGHTS[best - 1] } else { 0.0 };
                let mut scored = vec![AblationRow {
                    evidence: "chosen evidence, on the cored logs".into(),
                    exact: sc[0].exact,
                    within_one: sc[0].within_one,
                    chosen: false,
                }];
                scored.extend(SAT_WEIGHTS.iter().zip(&sc[1..]).map(|(w, s)| AblationRow {
                    evidence: format!("+ saturation height (weight {w})"),
                    exact: s.exact,
                    within_one: s.within_one,
                    chosen: use_it && *w == weight,
                }));
                let note = if use_it {
                    format!(
                        "used with weight {weight}: leave-one-well-out exact {} against {} without it ({} plugs gained, {} lost){unscored}",
                        pct(sc[best].exact),
                        pct(sc[0].exact),
                        sc[best].gained,
                        sc[best].lost
                    )
                } else {
                    format!(
                        "not used: no weight beat the classes without it by more than chance leave one well out (best {} exact against {}: {} plugs gained, {} lost){unscored}",
                        pct(sc[best].exact),
                        pct(sc[0].exact),
                        sc[best].gained,
                        sc[best].lost
                    )
                };
                SatChoice {
                    weight,
                    scored,
                    note,
                }
            }
            _ => SatChoice {
                weight: if mode == EvidenceMode::On && !residuals.is_empty() {
                    1.0
                } else {
                    0.0
                },
                scored: Vec::new(),
                note: format!(
                    "{}: needs two cored wells with logs, one of them above a free water level{unscored}",
                    if mode == EvidenceMode::On && !residuals.is_empty() {
                        "used with weight 1, not scored"
                    } else {
                        "not used, not scored"
                    }
                ),
            },
        };
        Ok(())
    }

    /// Give a well's table CLASS, CLASS_PROB and PERM columns (inserted before
    /// FLAG) and set FLAG 32 where the class is uncertain. `saturation` is the
    /// well's saturation-height residuals
    /// ([`crate::sat_height::evidence::class_residuals`]) or why it has none;
    /// `None` when the run does not use that evidence.
    pub fn apply(
        &self,
        table: &mut Table,
        well: &str,
        warnings: &mut Vec<String>,
        saturation: Option<&Result<Vec<f64>, String>>,
    ) -> ClassCounts {
        let n = table.n_rows();
        let features = self.model.header.feature_list();
        let missing: Vec<Feature> = features
            .iter()
            .copied()
            .filter(|f| {
                table
                    .get(f.column())
                    .is_none_or(|c| c.iter().all(|v| v.is_nan()))
            })
            .collect();
        let model = self.model_without(&missing);
        let names = |fs: &[Feature]| fs.iter().map(|f| f.name()).collect::<Vec<_>>().join(", ");
        if !missing.is_empty() {
            match &model {
                Some(m) => warnings.push(format!(
                    "{well} has no {}: classes from a model trained without it (features {}; leave-one-well-out exact {})",
                    names(&missing),
                    names(&m.header.feature_list()),
                    m.header.validation.as_ref().map_or_else(|| "not scored".into(), |v| pct(v.forest.exact))
                )),
                None => warnings.push(format!(
                    "{well} has no {}, which the class model needs: no CLASS or PERM in this well{}",
                    names(&missing),
                    if self.cfg.allow_reduced_features { "" } else { " (predictor.allow-reduced-features is false)" }
                )),
            }
        }
        let mut class = vec![f64::NAN; n];
        let mut prob = vec![f64::NAN; n];
        let mut permv = vec![f64::NAN; n];
        let mut perm_sd = vec![f64::NAN; n];
        let mut counts = ClassCounts {
            per_class: vec![0; self.scheme.class_count],
            ..ClassCounts::default()
        };
        let mut flag: Vec<f64> = table
            .get(Col::Flag)
            .map_or_else(|| vec![0.0; n], <[f64]>::to_vec);
        if let Some(model) = &model {
            let feats = model.header.feature_list();
            counts.features = feats.clone();
            let inputs = posterior::well_inputs(
                table,
                &feats,
                &model.header.context_scales_m,
                self.cfg.max_vsh,
            );
            counts.evidence.push(format!(
                "log features ({})",
                feats
                    .iter()
                    .map(|f| f.name())
                    .collect::<Vec<_>>()
                    .join(", ")
            ));
            if !model.header.context_scales_m.is_empty() {
                counts.evidence.push(format!(
                    "depth context (±{} m)",
                    model
                        .header
                        .context_scales_m
                        .iter()
                        .map(|w| w.to_string())
                        .collect::<Vec<_>>()
                        .join(", ±")
                ));
            }
            if let Some(q) = &model.header.sequence {
                counts.evidence.push(format!(
                    "bed sequence (mean bed {:.2} m)",
                    q.bed_thickness_m
                ));
            }
            counts.flagged = inputs.flagged;
            counts.shale = inputs.shale;
            counts.missing_feature = inputs.missing_feature;
            let phie = table.get(Col::Phie).unwrap_or(&[]);
            let k = self.scheme.class_count;
            let sat = match saturation.filter(|_| self.saturation.weight > 0.0) {
                Some(Ok(r)) => Some(posterior::SatEvidence {
                    residuals: r,
                    weight: self.saturation.weight,
                }),
                Some(Err(why)) => {
                    counts
                        .evidence
                        .push(format!("no saturation height: the well is {why}"));
                    None
                }
                None => None,
            };
            match posterior::class_probabilities(
                &model.forest,
                &inputs,
                k,
                model.header.sequence.as_ref(),
                posterior::step_m(table),
                sat,
            ) {
                Ok((probs, informed, evidence)) => {
                    counts.draw_from = Some(evidence);
                    if sat.is_some() {
                        counts.evidence.push(if informed > 0 {
                            format!(
                                "saturation height (weight {}; {informed} depths above the free water level)",
                                self.saturation.weight
                            )
                        } else {
                            "no saturation height: no classed depth above the free water level".into()
                        });
                    }
                    let perm_by_class: BTreeMap<u8, &perm::ClassPerm> =
                        model.header.perm.iter().map(|p| (p.class, p)).collect();
                    for (r, p) in inputs.rows.iter().zip(probs.chunks_exact(k)) {
                        let Some((c, share)) = posterior::most_probable(p) else {
                            continue;
                        };
                        class[*r] = f64::from(c);
                        prob[*r] = share;
                        counts.classified += 1;
                        if let Some(slot) = counts.per_class.get_mut(usize::from(c).wrapping_sub(1))
                        {
                            *slot += 1;
                        }
                        if share < self.cfg.min_probability {
                            counts.low_probability += 1;
                            flag[*r] = f64::from((flag[*r] as u32) | FLAG_LOW_CLASS_PROBABILITY);
                        }
                        if let Some(&ph) = phie.get(*r).filter(|ph| **ph > 0.0) {
                            let method = model.header.perm_method;
                            if let Some((m, sd)) =
                                perm::from_probabilities(p, &perm_by_class, method, ph)
                            {
                                permv[*r] = 10f64.powf(m);
                                perm_sd[*r] = sd;
                            }
                        }
                    }
                }
                Err(e) => warnings.push(format!("{well}: class prediction failed: {}", chain(&e))),
            }
        }
        let describe = self.scheme.describe();
        let at = table.position(Col::Flag).unwrap_or(table.columns.len());
        if let Some(fc) = table.column_mut(Col::Flag) {
            fc.values = flag;
            fc.description = flag_description(FLAG_LOW_CLASS_PROBABILITY);
        }
        // none of the three has a depth unit
        let du = crate::units::DepthUnit::Metre;
        let new = [
            OutColumn::new(Col::Class, du, class)
                .described(format!("{} ({describe})", Col::Class.description())),
            OutColumn::new(Col::ClassProb, du, prob),
            OutColumn::new(Col::Perm, du, permv).described(format!(
                "PERMEABILITY FROM CLASS PROBABILITIES AND PHIE ({})",
                match self.model.header.perm_method {
                    PermMethod::Fzi => "CLASS FZI",
                    PermMethod::Line => "CLASS LOG-K LINE",
                }
            )),
            OutColumn::new(Col::PermSd, du, perm_sd),
        ];
        for (k, c) in new.into_iter().enumerate() {
            table.columns.insert(at + k, c);
        }
        table.params.push(crate::input::las::HeaderItem {
            mnemonic: "CLSCHEME".into(),
            unit: String::new(),
            value: describe,
            description: "HYDRAULIC CLASS SCHEME".into(),
            line: 0,
        });
        counts
    }
}
