//! Everything a run does before the wells: the output folder checked, the
//! tables loaded, the class model trained or loaded, the saturation-height
//! model built.

use crate::output::messages::note;
use std::path::{Path, PathBuf};

use crate::config::Config;
use crate::error::Error;
use crate::field::safety::{check_inputs_outside, check_out_dir};
use crate::output::schema::Col;
use crate::output::well_file_stem;
use crate::pipeline::Models;
use crate::sat_height::TvdssError;
use crate::timings::{RunTimings, timed};
use crate::well;

/// What every well of a run shares, made once before the wells: the files
/// (sorted) and their output stems, the tables, the class model and the
/// saturation-height model.
pub struct FieldSetup {
    pub files: Vec<PathBuf>,
    /// Output file stem of each file (unique within the field, also ignoring case).
    pub stems: Vec<String>,
    /// Per file, why its output stem is not its file's stem (suffixed or
    /// characters replaced); the well's report carries it as a warning.
    pub stem_notes: Vec<Option<String>>,
    pub(crate) ctx: well::RunContext,
    pub(crate) prepared: Option<crate::classes::stage::Prepared>,
    pub(crate) sat: Option<crate::sat_height::SatHeightModel>,
    /// The Monte Carlo's sampled inputs (drawn once, before any well).
    pub(crate) samples: Option<crate::uncertainty::Samples>,
    /// Where the run's time went; `prepare` fills the steps before the wells.
    pub(crate) timings: RunTimings,
}

impl FieldSetup {
    /// Whether this run trained the class model (rather than loading one).
    pub fn trained(&self) -> bool {
        self.prepared.as_ref().is_some_and(|p| p.summary.trained)
    }

    /// The models every well goes through.
    pub fn models(&self) -> Models<'_> {
        Models {
            ctx: &self.ctx,
            classes: self.prepared.as_ref().and_then(|p| p.setup.as_ref()),
            sat: self.sat.as_ref(),
            samples: self.samples.as_ref(),
        }
    }

    /// The identity of the run's models, equal for runs that will give the
    /// same results (shards check it against the merge): SHA-256 over the
    /// class model's bytes as its file saves them, and the exact binary
    /// encoding (postcard: every float bit for bit, NaN and infinities
    /// told apart) of the class stage's summary and of the saturation-height
    /// model, which is saved only as a report. A model that cannot be
    /// encoded is an error, never an empty fingerprint.
    pub fn fingerprint(&self) -> Result<String, Error> {
        use sha2::{Digest, Sha256};
        let bug = |what: &str, e: String| {
            Error::Usage(format!("cannot encode the {what} to compare shards: {e}"))
        };
        let mut h = Sha256::new();
        let mut part = |label: &str, bytes: Option<Vec<u8>>| {
            h.update(label.as_bytes());
            match bytes {
                Some(b) => {
                    h.update((b.len() as u64).to_le_bytes());
                    h.update(&b);
                }
                None => h.update(b"none"),
            }
        };
        let model = self.prepared.as_ref().and_then(|p| p.setup.as_ref());
        part(
            "class model",
            model
                .map(|s| s.model.to_bytes())
                .transpose()
                .map_err(|e| bug("class model", e.to_string()))?,
        );
        part(
            "class summary",
            self.prepared
                .as_ref()
                .map(|p| postcard::to_allocvec(&p.summary))
                .transpose()
                .map_err(|e| bug("class summary", e.to_string()))?,
        );
        part(
            "saturation-height model",
            self.sat
                .as_ref()
                .map(postcard::to_allocvec)
                .transpose()
                .map_err(|e| bug("saturation-height model", e.to_string()))?,
        );
        Ok(crate::output::manifest::hex(&h.finalize()))
    }
}

/// Check the output folder, load the tables, build the class model (or load
/// it) and the saturation-height model: everything before the wells.
pub fn prepare(config: &Config, out: &Path, progress: bool) -> Result<FieldSetup, Error> {
    let mut timings = RunTimings::default();
    let (files, ctx) = timed(&mut timings.setup, "checks, well list and tables", || {
        checked_inputs(config, out)
    })?;
    let mut prepared = timed(
        &mut timings.setup,
        "class model (core, training or loading)",
        || -> Result<_, Error> {
            if config.core.is_none() && config.classes.is_none() {
                return Ok(None);
            }
            Ok(Some(crate::classes::stage::prepare(
                &ctx,
                &files,
                out,
                crate::classes::stage::Mode::Run,
                progress,
            )?))
        },
    )?;
    let sat = timed(
        &mut timings.setup,
        "saturation-height model",
        || match prepared.as_ref().and_then(|p| p.setup.as_ref()) {
            Some(s) => saturation_model(config, &files, &ctx, &s.scheme),
            None if config.capillary.is_some() => Err(Error::Usage(
                "[capillary] needs a class model: give [classes] with [core] or [predictor] model"
                    .into(),
            )),
            None => Ok(None),
        },
    )?;
    if let (Some(m), true) = (&sat, progress) {
        report_model(m);
    }
    if let (Some(sat), Some(p)) = (&sat, prepared.as_mut()) {
        timed(
            &mut timings.setup,
            "saturation-height evidence weight (leave-one-well-out)",
            || choose_saturation_evidence(config, sat, p, out, progress),
        )?;
    }
    let samples = timed(
        &mut timings.setup,
        "uncertainty: sampling the distributions",
        || -> Result<_, String> {
            let mut s = crate::uncertainty::Samples::draw(config)?;
            if let (Some(s), Some(sat)) = (s.as_mut(), sat.as_ref()) {
                s.add_fwl(sat, config)?;
            }
            Ok(s)
        },
    )
    .map_err(|e| Error::Usage(format!("uncertainty: {e}")))?;
    let (stems, stem_notes) = unique_stems(&files);
    Ok(FieldSetup {
        files,
        stems,
        stem_notes,
        ctx,
        prepared,
        sat,
        samples,
        timings,
    })
}

/// The run's LAS files, checked with every other input against the output
/// folder, and the run context (config and tables).
fn checked_inputs(config: &Config, out: &Path) -> Result<(Vec<PathBuf>, well::RunContext), Error> {
    // every input there, before the output folder is made
    config.check_inputs_exist(true)?;
    let files = config.well_files()?;
    if files.is_empty() {
        return Err(Error::Usage(
            "the config names no LAS files ([input] wells)".into(),
        ));
    }
    check_out_dir(out, &config.input_folders())?;
    let mut every_input = files.clone();
    every_input.extend(
        crate::output::manifest::table_inputs(config)
            .into_iter()
            .map(|(_, p)| p),
    );
    every_input.push(config.source.clone());
    check_inputs_outside(out, &every_input)?;
    let ctx = well::RunContext::new(config.clone())?;
    Ok((files, ctx))
}

/// Each file's output stem ([`well_file_stem`]), unique within the field
/// also ignoring case (case-insensitive file systems): in the sorted file
/// order the first file keeps its stem and each later one that collides
/// with a stem already taken gets `-2`, `-3`, ... (the first suffix not
/// taken). Returns the stems and, per file, a note when its stem was
/// changed or suffixed.
pub fn unique_stems(files: &[PathBuf]) -> (Vec<String>, Vec<Option<String>>) {
    let mut stems: Vec<String> = Vec::with_capacity(files.len());
    let mut notes = Vec::with_capacity(files.len());
    let mut taken: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    for (i, f) in files.iter().enumerate() {
        let written = well::stem_of(f);
        let base = well_file_stem(&written);
        let mut stem = base.clone();
        let mut k = 1;
        while taken.contains_key(&stem.to_lowercase()) {
            k += 1;
            stem = format!("{base}-{k}");
        }
        let note = match (k > 1, stem != written) {
            (true, _) => {
                let other = taken[&base.to_lowercase()];
                Some(format!(
                    "output files named `{stem}`: `{base}` (ignoring case) is taken by `{}`",
                    files[other].display()
                ))
            }
            (false, true) => Some(format!(
                "output files named `{stem}`: characters file systems refuse in `{written}` replaced"
            )),
            (false, false) => None,
        };
        taken.insert(stem.to_lowercase(), i);
        stems.push(stem);
        notes.push(note);
    }
    (stems, notes)
}

/// A well's (MD, TVDSS) columns, or why there are none.
type DepthColumns = Result<(Vec<f64>, Vec<f64>), TvdssError>;

/// Measured depth to TVDSS in a named well, through the well's own depth
/// reference (elevation, survey); each well is processed once, when a
/// pressure point given by MD needs it.
struct DepthLookup<'a> {
    files: &'a [PathBuf],
    ctx: &'a well::RunContext,
    cache: std::sync::Mutex<std::collections::BTreeMap<String, DepthColumns>>,
}

impl DepthLookup<'_> {
    /// The (MD, TVDSS) columns of the well named `well` (LAS name or file
    /// stem): files whose stem matches are tried first, then the others.
    fn columns(&self, well: &str) -> DepthColumns {
        let mut order: Vec<&PathBuf> = self.files.iter().collect();
        order.sort_by_key(|f| !well::stem_of(f).eq_ignore_ascii_case(well));
        for f in order {
            let Ok(out) = well::process(f, self.ctx) else {
                continue;
            };
            if out.name.eq_ignore_ascii_case(well) || well::stem_of(f).eq_ignore_ascii_case(well) {
                let md = out
                    .table
                    .get(Col::Depth)
                    .map(<[f64]>::to_vec)
                    .unwrap_or_default();
                let tvdss = out
                    .table
                    .get(Col::Tvdss)
                    .map(<[f64]>::to_vec)
                    .unwrap_or_default();
                return Ok((md, tvdss));
            }
        }
        Err(TvdssError::UnknownWell {
            well: well.to_string(),
        })
    }

    fn tvdss(&self, well: &str, md: f64) -> Result<f64, TvdssError> {
        let mut cache = self.cache.lock().unwrap_or_else(|e| e.into_inner());
        let entry = cache
            .entry(well.to_ascii_lowercase())
            .or_insert_with(|| self.columns(well));
        let (mds, tvdss) = entry.as_ref().map_err(Clone::clone)?;
        crate::stats::interpolate(mds, tvdss, md).ok_or_else(|| TvdssError::OutsideLog {
            well: well.to_string(),
            md,
        })
    }
}

/// The saturation-height model's key facts, on stderr.
fn report_model(m: &crate::sat_height::SatHeightModel) {
    for c in &m.classes {
        let how = match c.borrowed_from {
            Some(b) => format!("borrowed from class {b}"),
            None => format!("{} points from {}", c.points, c.plugs.join(", ")),
        };
        note!(
            "saturation-height: class {} J-function {} (rms Sw {:.3}), {how}",
            c.class,
            c.curve.form_name(),
            c.curve.rms_sw()
        );
    }
    for p in m.plugs.iter().filter(|p| p.suggested_class.is_some()) {
        if let (Some(k), Some((_, r))) = (p.suggested_class, p.best_other) {
            note!(
                "saturation-height: plug {} (class {}) fits class {k}'s curve better (rms Sw {r:.3} against {:.3}); to accept: [capillary.plug-class] \"{}\" = {k}",
                p.sample,
                p.class,
                p.rms_own,
                p.sample
            );
        }
    }
    for c in &m.compartments {
        let sigma = c
            .fwl_sigma
            .map_or_else(String::new, |s| format!(" ± {s:.2}"));
        note!(
            "saturation-height: compartment {}: FWL {:.2}{sigma} TVDSS ({}), water {:.3} / hydrocarbon {:.3} g/cm3 ({})",
            c.name,
            c.fwl_tvdss,
            c.source,
            c.rho_water_gcc,
            c.rho_hc_gcc,
            c.density_source
        );
    }
    for r in &m.plugs_rejected {
        note!(
            "saturation-height: capillary row or plug left out, line {}: {}",
            r.line,
            r.reason
        );
    }
    for r in &m.pressure_points_left_out {
        note!(
            "saturation-height: pressure point left out, line {}: {}",
            r.line,
            r.reason
        );
    }
}

/// The saturation-height model of the run for the class `scheme`; `None`
/// without `[capillary]`. Pressure points given by MD are converted through
/// their well's own depth reference.
pub fn saturation_model(
    config: &Config,
    files: &[PathBuf],
    ctx: &well::RunContext,
    scheme: &crate::classes::predictor::model_file::SchemeInfo,
) -> Result<Option<crate::sat_height::SatHeightModel>, Error> {
    let lookup = DepthLookup {
        files,
        ctx,
        cache: std::sync::Mutex::new(std::collections::BTreeMap::new()),
    };
    let tvdss_of = |well: &str, md: f64| lookup.tvdss(well, md);
    Ok(crate::sat_height::prepare(config, scheme, &tvdss_of)?)
}

/// Choose how the classes use the saturation-height evidence (a weight
/// scored leave one well out on the cored wells), record it in the class
/// summary, and add its rows to the training report when this run trained.
pub fn choose_saturation_evidence(
    config: &Config,
    sat: &crate::sat_height::SatHeightModel,
    prepared: &mut crate::classes::stage::Prepared,
    out: &Path,
    progress: bool,
) -> Result<(), Error> {
    let Some(setup) = prepared.setup.as_mut() else {
        return Ok(());
    };
    let perm = setup.model.header.perm.clone();
    let method = setup.model.header.perm_method;
    let classes = u8::try_from(setup.scheme.class_count).unwrap_or(u8::MAX);
    let residuals_of = |w: &well::WellOutput, names: &[&str]| {
        crate::sat_height::evidence::class_residuals(
            sat,
            w,
            names,
            &config.parameters,
            &perm,
            method,
            classes,
        )
    };
    setup.choose_saturation_weight(&residuals_of)?;
    if progress {
        note!(
            "classes: saturation-height evidence {}",
            setup.saturation.note
        );
    }
    prepared.summary.saturation_height = Some(setup.saturation.clone());
    if prepared.summary.trained {
        crate::classes::stage::write_training_report(setup, &prepared.summary, out)?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn demo_setup(dir: &Path, edit: impl Fn(String) -> String) -> FieldSetup {
        let root = Path::new(env!("CARGO_MANIFEST_DIR"));
        let text = std::fs::read_to_string(root.join("config/demo-field.toml")).expect("config");
        let text = edit(text.replace(
            "\"../demo-wells",
            &format!("\"{}", root.join("demo-wells").display()),
        ));
        let cfg = dir.join("field.toml");
        std::fs::write(&cfg, text).expect("write config");
        let config = Config::load(&cfg).expect("config loads");
        prepare(&config, &dir.join("out"), false).expect("setup")
    }

    /// Shards compare models by a SHA-256 of their exact bytes (never an
    /// empty text): the same inputs give the same fingerprint, and a fluid
    /// density changed in its tenth decimal gives another.
    #[test]
    fn fingerprints_tell_models_apart_by_their_bytes() {
        let dirs: Vec<_> = (0..3)
            .map(|_| tempfile::tempdir().expect("temp dir"))
            .collect();
        let densities = |w: &'static str| {
            move |t: String| {
                t.replace(
                    "[compartments.\"Main\"]",
                    &format!("[compartments.\"Main\"]\nrho-water-gcc = {w}\nrho-hc-gcc = 0.78"),
                )
            }
        };
        let a = demo_setup(dirs[0].path(), densities("1.07"))
            .fingerprint()
            .expect("fingerprint");
        let b = demo_setup(dirs[1].path(), densities("1.07"))
            .fingerprint()
            .expect("fingerprint");
        let c = demo_setup(dirs[2].path(), densities("1.0700000001"))
            .fingerprint()
            .expect("fingerprint");
        assert_eq!(a.len(), 64);
        assert!(a.bytes().all(|b| b.is_ascii_hexdigit()));
        assert_eq!(a, b);
        assert_ne!(a, c);
    }

    /// Stems are unique ignoring case, the first in sorted order keeps its
    /// own, and each change is said.
    #[test]
    fn stems_are_unique_ignoring_case() {
        let files: Vec<PathBuf> = ["a/TB-01.las", "a/x:y.las", "b/tb-01.las", "c/TB-01.LAS"]
            .iter()
            .map(PathBuf::from)
            .collect();
        let (stems, notes) = unique_stems(&files);
        assert_eq!(stems, ["TB-01", "x_y", "tb-01-2", "TB-01-3"]);
        assert!(notes[0].is_none());
        assert!(notes[1].as_deref().is_some_and(|n| n.contains("replaced")));
        assert!(
            notes[2]
                .as_deref()
                .is_some_and(|n| n.contains("a/TB-01.las"))
        );
        assert!(notes[3].is_some());
    }
}
