//! One well through every stage, in order.
//!
//! ```text
//! read LAS ─► curves and units ─► depth reference ─► zones ─► petrophysics   (well)
//!   ─► classes and permeability (logs, bed sequence, saturation height)  ─► class-aware SW
//!                                                                            (classes, well)
//!   ─► saturation-height ─► contact audit                                     (sat_height, contacts)
//!   ─► zone summary                                                           (well::summary)
//! ```
//!
//! [`run_well`] is the only place that chains the stages; the field run
//! schedules wells through it and hands each [`Interpreted`] well to the
//! writers and the report. A stage the run has no model for (no `[classes]`,
//! no `[capillary]`) is skipped, and the well keeps what the earlier stages
//! gave it.

use std::path::Path;

use serde::{Deserialize, Serialize};

use crate::classes::stage::{ClassCounts, ClassSetup};
use crate::contacts::WellAudit;
use crate::output::schema::Col;
use crate::sat_height::{SatHeightModel, WellSatHeight};
use crate::timings::{Stage, StageTimes};
use crate::well::summary::ZoneSummary;
use crate::well::{self, RunContext, WellError, WellOutput};

/// What every well of a run shares: the config and its tables, and the
/// models built once before the wells (absent when the config asks for none).
#[derive(Clone, Copy)]
pub struct Models<'a> {
    /// The config and the tables it names.
    pub ctx: &'a RunContext,
    /// The class scheme and predictor.
    pub classes: Option<&'a ClassSetup>,
    /// The saturation-height model (J-function per class, FWL per compartment).
    pub sat: Option<&'a SatHeightModel>,
    /// The Monte Carlo's sampled inputs, when the config gives distributions.
    pub samples: Option<&'a crate::uncertainty::Samples>,
}

/// A well after every stage: its table and what each stage found.
#[derive(Debug, Clone)]
pub struct Interpreted {
    /// The logs stage's result, with the later stages' curves added to its table.
    pub well: WellOutput,
    /// Depths classed, per class, and why others have no class.
    pub classes: Option<ClassCounts>,
    /// Height above the FWL, SWH and the SW − SWH residual summary.
    pub saturation_height: Option<WellSatHeight>,
    /// Saturation steps with their kinds, and the FWL the logs imply.
    pub contacts: Option<WellAudit>,
    /// Gross, net, net-to-gross, averages and HPT per zone.
    pub zones: Vec<ZoneSummary>,
    /// The Monte Carlo's ranges per zone and HPT per realisation, when run.
    pub uncertainty: Option<crate::uncertainty::WellUncertainty>,
}

/// Take the well whose file `path` holds `bytes` through every stage the run
/// has a model for, adding each stage's time to `times`.
pub fn run_well(
    path: &Path,
    bytes: &[u8],
    models: &Models<'_>,
    times: &mut StageTimes,
) -> Result<Interpreted, WellError> {
    let config = &models.ctx.config;
    // read, then curves and units, depth reference, zones, petrophysics
    let file = times.time(Stage::Read, || {
        crate::input::las::read_bytes(bytes, path, well::read_options(models.ctx))
    })?;
    let mut out = times.time(Stage::Logs, || well::process_file(path, &file, models.ctx))?;
    drop(file);
    let file_stem = well::stem_of(path);
    // classes and permeability (from the logs and, above a free water level,
    // the saturation-height evidence), then SW with each class's exponents
    let class_start = std::time::Instant::now();
    let mut classes = models.classes.map(|setup| {
        let name = out.name.clone();
        let saturation = models
            .sat
            .filter(|_| setup.saturation.weight > 0.0)
            .map(|sat| {
                let h = &setup.model.header;
                crate::sat_height::evidence::class_residuals(
                    sat,
                    &out,
                    &[name.as_str(), file_stem.as_str()],
                    &config.parameters,
                    &h.perm,
                    h.perm_method,
                    u8::try_from(setup.scheme.class_count).unwrap_or(u8::MAX),
                )
            });
        let counts = setup.apply(
            &mut out.table,
            &name,
            &mut out.warnings,
            saturation.as_ref(),
        );
        if config.parameters.has_class_params() {
            let max_class = u8::try_from(setup.scheme.class_count).unwrap_or(u8::MAX);
            out.apply_class_exponents(&config.parameters, max_class);
        }
        counts
    });
    times.add(Stage::Classes, class_start.elapsed());
    // saturation-height, and the audit of every saturation step against it
    let mut saturation_height = None;
    let mut contacts = None;
    if let Some(sat) = models.sat {
        let names = [out.name.as_str(), file_stem.as_str()];
        saturation_height = times.time(Stage::SaturationHeight, || {
            sat.apply(&mut out.table, &names, &mut out.warnings)
        });
        if saturation_height.is_some() {
            let contact_start = std::time::Instant::now();
            contacts = crate::contacts::apply(
                &mut out.table,
                &out.name,
                &names,
                sat,
                &config.contacts,
                config.project.depth_unit,
            );
            if let Some(f) = contacts
                .as_ref()
                .and_then(|a| a.implied_fwl.as_ref())
                .filter(|f| !f.agrees)
            {
                out.warnings.push(format!("contact audit: {}", f.note));
            }
            times.add(Stage::Contacts, contact_start.elapsed());
        }
    }
    // the per-zone summary of the final curves
    let summary_start = std::time::Instant::now();
    let zone_names: Vec<String> = out.report.zones.iter().map(|z| z.name.clone()).collect();
    let nan = vec![f64::NAN; out.table.n_rows()];
    let get = |c: Col| out.table.get(c).unwrap_or(&nan);
    let zones = crate::well::summary::zone_summary(
        &out.name,
        get(Col::Depth),
        &out.zone_of,
        &zone_names,
        get(Col::Vsh),
        get(Col::Phie),
        get(Col::Sw),
        get(Col::Class),
        &config.summary,
    );
    times.add(Stage::ZoneSummary, summary_start.elapsed());
    // low, best and high by Monte Carlo over the parameters' distributions
    let mut zones = zones;
    // what the Monte Carlo draws classes from (large: never kept in the report)
    let class_evidence = classes
        .as_mut()
        .and_then(|c| c.draw_from.take())
        .filter(|_| {
            config.uncertainty.classes == crate::config::uncertainty::ClassDraws::Posterior
        });
    let uncertainty = models.samples.map(|samples| {
        let well_name = out.name.clone();
        let names = [well_name.as_str(), file_stem.as_str()];
        times.time(Stage::Uncertainty, || {
            let perm = models.classes.map(|c| crate::uncertainty::PermModel {
                by_class: &c.model.header.perm,
                method: c.model.header.perm_method,
            });
            let mut u = crate::uncertainty::run_well(
                &out,
                &names,
                config,
                samples,
                class_evidence.as_ref(),
                perm,
                models.sat,
            );
            let du = config.project.depth_unit;
            for (beside, cols, values) in [
                (
                    Col::Sw,
                    [Col::SwP90, Col::SwP50, Col::SwP10],
                    u.sw_depth.take(),
                ),
                (
                    Col::Perm,
                    [Col::PermP90, Col::PermP50, Col::PermP10],
                    u.perm_depth.take(),
                ),
                (
                    Col::Swh,
                    [Col::SwhP90, Col::SwhP50, Col::SwhP10],
                    u.swh_depth.take(),
                ),
            ] {
                let Some(values) = values else { continue };
                let t = &mut out.table;
                let at = t.position(beside).map_or(t.columns.len(), |i| i + 1);
                for (k, (col, v)) in cols.into_iter().zip(values).enumerate() {
                    t.columns
                        .insert(at + k, crate::output::OutColumn::new(col, du, v));
                }
            }
            for z in &mut zones {
                z.uncertainty = u
                    .zones
                    .iter()
                    .find(|(name, _)| *name == z.zone)
                    .map(|(_, r)| r.clone());
            }
            u
        })
    });
    Ok(Interpreted {
        well: out,
        classes,
        saturation_height,
        contacts,
        zones,
        uncertainty,
    })
}

/// What happened to one well, as the run summary and the report give it.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct WellReport {
    /// The LAS file, as given.
    pub file: String,
    /// The well's name (LAS `WELL`, else the file stem); `None` when unread.
    pub well: Option<String>,
    /// Whether every stage and every write succeeded.
    pub ok: bool,
    /// Why the well failed, with its cause chain.
    pub error: Option<String>,
    /// Depth samples.
    pub rows: usize,
    /// Files written, relative to the output folder.
    pub outputs: Vec<String>,
    /// Logical curve, mnemonic used, unit as read.
    pub curves: Vec<(String, String, String)>,
    /// Warnings from reading and from the stages.
    pub warnings: Vec<String>,
    /// Depth reference, zones with their parameters and picks, and what was clipped or flagged.
    pub stages: Option<well::WellReport>,
    /// Depths classed, per class, and why others have no class.
    pub classes: Option<ClassCounts>,
    /// Height above the FWL, SWH and the SW − SWH residual summary.
    pub saturation_height: Option<WellSatHeight>,
    /// Saturation steps with their kinds, and the FWL the logs imply.
    pub contacts: Option<WellAudit>,
    /// Gross, net, net-to-gross, averages and HPT per zone.
    pub zones: Vec<ZoneSummary>,
    /// What the report's field page draws of the well (not in the summary;
    /// shard states carry it beside the report).
    #[serde(skip)]
    pub view: WellView,
    /// The LAS file's size and SHA-256, from the bytes the run read (for the
    /// manifest; `None` when the file could not be read).
    #[serde(skip)]
    pub input: Option<crate::output::manifest::InputFile>,
    /// Seconds per stage (for the manifest's timings; never in the summary,
    /// which is byte-identical from run to run).
    #[serde(skip)]
    pub times: StageTimes,
}

/// What the field-level outputs need of a well beyond its summary, kept from
/// its run: the report's field page and the Monte Carlo's driver ranking are
/// made after every well, without their logs.
#[derive(Debug, Clone, Default, Serialize, Deserialize)]
pub struct WellView {
    /// A sample of the well's (PHIE, RT, CLASS) for the field Pickett plot.
    pub pickett: Vec<PickettPoint>,
    /// Its interpreted interval binned by TVDSS, for the cross-section.
    pub profile: Option<crate::well::profile::Profile>,
    /// Its surface location as the LAS header gives it.
    pub location: crate::input::location::HeaderLocation,
    /// HPT per zone and Monte Carlo realisation, `(zone, values)`, for the
    /// field's ranking of what drives it (empty without a Monte Carlo).
    pub hpt_realisations: Vec<(String, Vec<f64>)>,
    /// HPT from SWH per zone and realisation, likewise (empty without a
    /// saturation-height Monte Carlo).
    pub hpt_swh_realisations: Vec<(String, Vec<f64>)>,
}

impl WellReport {
    /// The report of a well not processed yet (or that failed before any stage).
    pub fn new(path: &Path) -> WellReport {
        WellReport {
            file: path.display().to_string(),
            well: None,
            ok: false,
            error: None,
            rows: 0,
            outputs: Vec::new(),
            curves: Vec::new(),
            warnings: Vec::new(),
            stages: None,
            classes: None,
            saturation_height: None,
            contacts: None,
            zones: Vec::new(),
            view: WellView::default(),
            input: None,
            times: StageTimes::default(),
        }
    }

    /// Take what every stage found in `w`.
    pub fn record(&mut self, w: &Interpreted) {
        let out = &w.well;
        self.classes.clone_from(&w.classes);
        self.saturation_height.clone_from(&w.saturation_height);
        self.contacts.clone_from(&w.contacts);
        self.well = Some(out.name.clone());
        self.rows = out.table.n_rows();
        self.warnings.clone_from(&out.warnings);
        self.stages = Some(out.report.clone());
        self.curves = out
            .resolved
            .iter()
            .map(|(l, m, u)| (l.key().to_string(), m.clone(), u.clone()))
            .collect();
        self.zones.clone_from(&w.zones);
    }
}

/// A log depth as the Pickett plot shows it: a well keeps a sample of these
/// for the field page (which no longer has the logs).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct PickettPoint {
    /// Effective porosity, v/v.
    pub phi: f64,
    /// Deep resistivity, ohm.m.
    pub rt: f64,
    /// Hydraulic class, 1 the poorest rock.
    pub class: u8,
}
