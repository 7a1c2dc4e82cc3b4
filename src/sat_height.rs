//! The saturation-height model of a run: a J-function per hydraulic class
//! from the lab curves, a free water level per compartment from the pressure
//! points (or the config), and at every depth the height above the FWL, the
//! saturation the model predicts there (SWH) and the residual SW − SWH.
//!
//! ```text
//! capillary.csv ─► plugs classed (scheme on plug φ, k; accepted overrides) ─► J fit per class
//!                                                        (borrowed where a class has no plug)
//! pressures.csv ─► points per compartment ─► two legs ─► FWL ± σ, fluid densities
//! each well: TVDSS, CLASS, PERM, PHIE ─► HAFWL ─► Pc_res ─► J ─► SWH; SW − SWH per class
//! before the class: SW with each class's exponents − SWH of each class ─► evidence for the class
//! ```
//!
//! Units inside: depth in the project's unit for HAFWL and FWL in outputs,
//! metres for the pressure fit and the height-to-pressure step, pressure psi,
//! σ dyn/cm, density g/cm3, permeability mD, porosity and saturation v/v.

pub mod capillary;
pub mod evidence;
pub mod fwl;
pub mod lab_curves;

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use crate::classes::ClassScheme;
use crate::classes::predictor::model_file::SchemeInfo;
use crate::config::{CompartmentConfig, Config, FluidProps};
use crate::input::core_samples::Rejected;
use crate::output::schema::Col;
use crate::output::schema::{FLAG_MISSING_INPUT, FLAG_OUT_OF_RANGE, FLAG_OUTSIDE_ZONE};
use crate::output::{OutColumn, OutputError, Table, write_atomic};
use crate::sat_height::capillary::{FluidSystem, leverett_j, pc_at_height_psi, sigma_cos};
use crate::sat_height::fwl::{FwlError, FwlFit};
use crate::sat_height::lab_curves::{CapSample, J_FORM_CRITERION, JCurve, JFit, JFitError};
use crate::units::DepthUnit;

/// The J-function a class uses.
#[derive(Debug, Clone, Serialize)]
pub struct ClassJ {
    /// Class number, 1 upwards.
    pub class: u8,
    /// The class's own fit (both forms, the chosen one), when it has plugs.
    pub fit: Option<JFit>,
    /// The curve SWH uses: the class's own, or a neighbour's.
    pub curve: JCurve,
    /// The class whose curve is borrowed, when this class has no plug.
    pub borrowed_from: Option<u8>,
    /// The plugs whose points were fitted (the lending class's when borrowed).
    pub plugs: Vec<String>,
    /// Number of (J, Sw) points fitted (the lending class's when borrowed).
    pub points: usize,
}

/// How a plug was classed and how well the curves fit it.
#[derive(Debug, Clone, Serialize)]
pub struct PlugReport {
    /// Sample name (SAMPLE in the capillary file).
    pub sample: String,
    /// Well name as written in the capillary file.
    pub well: String,
    /// The plug's DEPTH_MD as written in the capillary file, not converted.
    pub depth_md: f64,
    /// Plug porosity, v/v.
    pub porosity: f64,
    /// Plug permeability, mD.
    pub perm_md: f64,
    /// The scheme's quantity of the plug (FZI or R35, µm).
    pub scheme_value: f64,
    /// The class the plug is fitted in: the scheme's, or the config's (`class_source`).
    pub class: u8,
    /// "scheme" (the plug's own φ and k) or "config" (`[capillary] plug-class`).
    pub class_source: String,
    /// RMS Sw of the plug against its class's fitted curve.
    pub rms_own: f64,
    /// The other class whose fitted curve fits it best, with that RMS.
    pub best_other: Option<(u8, f64)>,
    /// A class to consider in `[capillary] plug-class`, when another fits much better.
    pub suggested_class: Option<u8>,
}

/// A compartment's free water level.
#[derive(Debug, Clone, Serialize)]
pub struct CompartmentFwl {
    /// Compartment name: the key of `[compartments.NAME]`, or `field` when none
    /// is configured.
    pub name: String,
    /// Its wells; `None` takes every well no other compartment lists.
    pub wells: Option<Vec<String>>,
    /// FWL, TVDSS in the project's depth unit.
    pub fwl_tvdss: f64,
    /// One standard deviation of the FWL, project depth unit: the config's
    /// `fwl-sd`, else the pressure fit's standard error (none for a FWL set
    /// in the config without `fwl-sd`). The Monte Carlo samples the FWL from
    /// a normal distribution with it.
    pub fwl_sigma: Option<f64>,
    /// "config" or "pressures".
    pub source: String,
    /// The two-leg fit of the pressure points (TVDSS m, psi), when there are enough.
    pub pressure_fit: Option<FwlFit>,
    /// Why there is no pressure fit, when points were given.
    pub pressure_fit_error: Option<String>,
    /// Water density, g/cm3: from the config, else the lower leg's gradient.
    pub rho_water_gcc: f64,
    /// Hydrocarbon density, g/cm3: from the config, else the upper leg's gradient.
    pub rho_hc_gcc: f64,
    /// "config" or "pressure gradients".
    pub density_source: String,
    /// Number of pressure points in the compartment (0 without a pressures file).
    pub points_used: usize,
    /// The pressure points used, (TVDSS m, psi), for the report's plot.
    #[serde(skip)]
    pub points_m: Vec<(f64, f64)>,
}

/// The field's saturation-height model.
#[derive(Debug, Clone, Serialize)]
pub struct SatHeightModel {
    /// The capillary-pressure CSV, as resolved from the config.
    pub capillary_file: String,
    /// Reservoir σ (dyn/cm) and θ (degrees), and σ·|cos θ|.
    pub reservoir: FluidProps,
    /// σ·|cos θ| at reservoir conditions, dyn/cm, used to turn reservoir Pc into J.
    pub sigma_cos_reservoir: f64,
    /// How the J-function form of a class is chosen.
    pub form_criterion: String,
    /// One J-function per class, class 1 first (index = class − 1).
    pub classes: Vec<ClassJ>,
    /// Every accepted plug: its class and how the curves fit it.
    pub plugs: Vec<PlugReport>,
    /// Capillary rows and plugs left out, with line and reason.
    pub plugs_rejected: Vec<Rejected>,
    /// The pressure-points CSV, as resolved; `None` without `[pressures]`.
    pub pressure_file: Option<String>,
    /// Pressure points left out (quality, no compartment), with line and reason.
    pub pressure_points_left_out: Vec<Rejected>,
    /// Every compartment's FWL and fluid densities.
    pub compartments: Vec<CompartmentFwl>,
    #[serde(skip)]
    depth_unit: DepthUnit,
    /// The plugs' (class, Sw v/v, J) points, for the report's J-function plot
    /// (not in the summary: the fits above summarise them).
    #[serde(skip)]
    pub j_points: Vec<(u8, f64, f64)>,
}

/// Mean and RMS of SW − SWH over some depths.
#[derive(Debug, Clone, Default, Serialize, PartialEq, Deserialize)]
pub struct Residual {
    /// Number of depths summarised.
    pub samples: usize,
    /// Mean of SW − SWH, v/v; NaN with no samples.
    pub mean: f64,
    /// RMS of SW − SWH, v/v; NaN with no samples.
    pub rms: f64,
}

impl Residual {
    fn of(d: &[f64]) -> Residual {
        if d.is_empty() {
            return Residual {
                samples: 0,
                mean: f64::NAN,
                rms: f64::NAN,
            };
        }
        let n = d.len() as f64;
        Residual {
            samples: d.len(),
            mean: d.iter().sum::<f64>() / n,
            rms: (d.iter().map(|x| x * x).sum::<f64>() / n).sqrt(),
        }
    }
}

/// The saturation-height result of one well.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct WellSatHeight {
    /// Name of the compartment the well is in.
    pub compartment: String,
    /// FWL used, TVDSS project depth unit.
    pub fwl_tvdss: f64,
    /// Depths above the FWL with an SWH.
    pub swh_defined: usize,
    /// SW − SWH above the FWL at classed, unflagged depths, all classes.
    pub residual: Residual,
    /// The same by class (class, residual).
    pub residual_by_class: Vec<(u8, Residual)>,
    /// Set after every well: the mean residual departs from the neighbours'.
    pub possible_other_fwl: Option<String>,
}

/// Depths flagged with these bits are left out of the residual summary.
const RESIDUAL_SKIP_FLAGS: u32 = 1 | FLAG_OUT_OF_RANGE | FLAG_MISSING_INPUT | FLAG_OUTSIDE_ZONE;
/// Least depths for a well's mean residual to count in the neighbour comparison.
pub const MIN_RESIDUAL_SAMPLES: usize = 20;

/// Why a pressure point's TVDSS cannot be had.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum TvdssError {
    /// The row's DEPTH_UNIT is not a depth unit.
    #[error(transparent)]
    Unit(#[from] crate::units::UnknownDepthUnit),
    /// The row gives no depth, or both TVDSS columns.
    #[error("give TVDSS_M or TVDSS_FT (not both), or DEPTH_MD")]
    NoDepth,
    /// No readable LAS well of the field has this name.
    #[error(
        "well `{well}` is not among the field's readable LAS wells, so its MD cannot be converted to TVDSS"
    )]
    UnknownWell {
        /// The well name as the pressure row gives it.
        well: String,
    },
    /// The MD is outside the well's log, or the well has no TVDSS.
    #[error(
        "{well}: MD {md} is outside the logged depths or the well has no TVDSS (no datum elevation)"
    )]
    OutsideLog {
        /// The well name as the pressure row gives it.
        well: String,
        /// The measured depth asked for, project depth unit.
        md: f64,
    },
}

/// Why the saturation-height model could not be built; each names the file,
/// plug, class, compartment or config key at fault.
#[derive(Debug, thiserror::Error)]
pub enum SatHeightError {
    /// The class scheme has more classes than a class number holds.
    #[error("scheme {scheme} has too many classes")]
    TooManyClasses {
        /// The scheme's name.
        scheme: String,
    },
    /// A capillary-pressure or pressure-point file cannot be read.
    #[error(transparent)]
    Table(#[from] crate::input::tables::TableError),
    /// `capillary.plug-class` names a sample the file does not have.
    #[error("config key `capillary.plug-class.\"{sample}\"`: no usable sample `{sample}` in {}", .file.display())]
    UnknownPlug {
        /// The sample name the config gives.
        sample: String,
        /// The capillary-pressure CSV.
        file: PathBuf,
    },
    /// A plug falls in no class of the scheme.
    #[error(
        "{}: line {line}: plug {sample} (φ {porosity}, k {perm_md} mD) has no class in scheme {scheme}",
        .file.display()
    )]
    UnclassedPlug {
        /// The capillary-pressure CSV.
        file: PathBuf,
        /// File line of the plug's first accepted row (1-based, header = 1).
        line: u64,
        /// Sample name.
        sample: String,
        /// Plug porosity, v/v.
        porosity: f64,
        /// Plug permeability, mD.
        perm_md: f64,
        /// The scheme's name.
        scheme: String,
    },
    /// `capillary.plug-class` gives a class the scheme does not have.
    #[error(
        "config key `capillary.plug-class.\"{sample}\"`: class {class} is above the scheme's {class_count} classes"
    )]
    PlugClassTooHigh {
        /// Sample name.
        sample: String,
        /// The class the config gives.
        class: u8,
        /// Number of classes in the scheme.
        class_count: u8,
    },
    /// A class's plugs give no J-function.
    #[error("capillary class {class} (plugs {plugs}): the J-function fit failed")]
    JFit {
        /// The class number.
        class: u8,
        /// The class's plug names, comma-separated.
        plugs: String,
        /// Why the fit failed.
        #[source]
        source: JFitError,
    },
    /// The file has no plug usable for a J-function.
    #[error("{}: no usable capillary-pressure plug, so no class has a J-function", .file.display())]
    NoPlugs {
        /// The capillary-pressure CSV.
        file: PathBuf,
    },
    /// Neither compartments nor pressure points give a free water level.
    #[error(
        "the saturation-height model needs a free water level: add [compartments.NAME] with fwl-tvdss, or [pressures]"
    )]
    NoFwlSource,
    /// A compartment has no free water level.
    #[error("compartment `{compartment}`: no free water level: set fwl-tvdss")]
    NoFwl {
        /// Compartment name.
        compartment: String,
    },
    /// A compartment's pressure fit failed and the config gives no FWL.
    #[error(
        "compartment `{compartment}`: no free water level: the pressure fit failed ({reason}); set fwl-tvdss or fix the points"
    )]
    FwlFit {
        /// Compartment name.
        compartment: String,
        /// Why the pressure fit failed.
        reason: FwlError,
    },
    /// A compartment has no fluid densities.
    #[error(
        "compartment `{compartment}`: no fluid densities: set rho-water-gcc and rho-hc-gcc, or give pressure points for both legs"
    )]
    NoDensities {
        /// Compartment name.
        compartment: String,
    },
    /// The water is not denser than the hydrocarbon.
    #[error(
        "compartment `{compartment}`: water density {rho_water:.3} g/cm3 is not above the hydrocarbon's {rho_hc:.3}"
    )]
    Densities {
        /// Compartment name.
        compartment: String,
        /// Water density, g/cm3.
        rho_water: f64,
        /// Hydrocarbon density, g/cm3.
        rho_hc: f64,
    },
}

/// TVDSS (project depth unit) of a measured depth (project depth unit) in a
/// well, by the well's own depth reference; `Err` says why not.
pub type TvdssOf<'a> = &'a (dyn Fn(&str, f64) -> Result<f64, TvdssError> + Sync);

/// Build the model before the wells: read and class the plugs, fit a
/// J-function per class, find every compartment's FWL. `None` when the config
/// has no `[capillary]`. A fit that fails is an error naming the class or
/// compartment. `tvdss_of` converts pressure points given by MD only.
pub fn prepare(
    config: &Config,
    scheme: &SchemeInfo,
    tvdss_of: TvdssOf<'_>,
) -> Result<Option<SatHeightModel>, SatHeightError> {
    let Some(cap) = &config.capillary else {
        return Ok(None);
    };
    let class_count =
        u8::try_from(scheme.class_count).map_err(|_| SatHeightError::TooManyClasses {
            scheme: scheme.name.clone(),
        })?;
    let reservoir = config.saturation_height.reservoir.unwrap_or_else(|| {
        let (s, t) = FluidSystem::OilBrineReservoir.typical();
        FluidProps {
            sigma_dyn_cm: s,
            theta_deg: t,
        }
    });
    let sc_res = sigma_cos(reservoir.sigma_dyn_cm, reservoir.theta_deg);

    // plugs
    let cap_path = config.resolve_path(&cap.file);
    let (mut samples, plugs_rejected) = lab_curves::read(&cap_path)?;
    for s in &mut samples {
        if let Some(o) = lab_override(cap, s.system) {
            relabel(s, sigma_cos(o.sigma_dyn_cm, o.theta_deg));
        }
    }
    for name in cap.plug_class.keys() {
        if !samples.iter().any(|s| s.sample == *name) {
            return Err(SatHeightError::UnknownPlug {
                sample: name.clone(),
                file: cap_path,
            });
        }
    }
    let plug_class = plug_classes(cap, &samples, scheme, class_count, &cap_path)?;

    // a J-function per class that has plugs, borrowed from the nearest
    // class with plugs where a class has none
    let (classes, j_points) = class_curves(&samples, &plug_class, class_count, &cap_path)?;

    // how each plug sits against the fitted curves
    let plugs: Vec<PlugReport> = samples
        .iter()
        .zip(&plug_class)
        .map(|(s, (c, src))| {
            let rms_own = lab_curves::plug_rms(s, &classes[usize::from(*c) - 1].curve);
            let best_other = classes
                .iter()
                .filter(|k| k.class != *c && k.borrowed_from.is_none())
                .map(|k| (k.class, lab_curves::plug_rms(s, &k.curve)))
                .min_by(|a, b| a.1.total_cmp(&b.1));
            let suggested_class = best_other
                .filter(|(_, r)| src == "scheme" && *r <= cap.suggest_ratio * rms_own)
                .map(|(k, _)| k);
            PlugReport {
                sample: s.sample.clone(),
                well: s.well.clone(),
                depth_md: s.depth,
                porosity: s.porosity,
                perm_md: s.perm_md,
                scheme_value: scheme.value(s.porosity, s.perm_md),
                class: *c,
                class_source: src.clone(),
                rms_own,
                best_other,
                suggested_class,
            }
        })
        .collect();

    // free water levels
    let (compartments, pressure_points_left_out) = compartments(config, tvdss_of)?;
    Ok(Some(SatHeightModel {
        capillary_file: cap_path.display().to_string(),
        reservoir,
        sigma_cos_reservoir: sc_res,
        form_criterion: J_FORM_CRITERION.to_string(),
        classes,
        plugs,
        plugs_rejected,
        pressure_file: config
            .pressures
            .as_ref()
            .map(|p| config.resolve_path(&p.file).display().to_string()),
        pressure_points_left_out,
        compartments,
        depth_unit: config.project.depth_unit,
        j_points,
    }))
}

/// Each plug's class and where it came from (`config` for
/// `capillary.plug-class`, else `scheme`); a plug the scheme cannot class,
/// or a configured class above the scheme's, is an error.
fn plug_classes(
    cap: &crate::config::CapillaryConfig,
    samples: &[CapSample],
    scheme: &SchemeInfo,
    class_count: u8,
    cap_path: &Path,
) -> Result<Vec<(u8, String)>, SatHeightError> {
    let mut plug_class: Vec<(u8, String)> = Vec::with_capacity(samples.len());
    for s in samples {
        let (c, src) = match cap.plug_class.get(&s.sample) {
            Some(&c) => (c, "config".to_string()),
            None => match scheme.classify(s.porosity, s.perm_md) {
                Some(c) => (c, "scheme".to_string()),
                None => {
                    return Err(SatHeightError::UnclassedPlug {
                        file: cap_path.to_path_buf(),
                        line: s.line,
                        sample: s.sample.clone(),
                        porosity: s.porosity,
                        perm_md: s.perm_md,
                        scheme: scheme.name.clone(),
                    });
                }
            },
        };
        if c > class_count {
            return Err(SatHeightError::PlugClassTooHigh {
                sample: s.sample.clone(),
                class: c,
                class_count,
            });
        }
        plug_class.push((c, src));
    }
    Ok(plug_class)
}

/// The points of each class's J (class, Sw, J) for the plots.
type JPoints = Vec<(u8, f64, f64)>;

/// A J-function fitted to each class's plugs; a class without plugs
/// borrows the curve of the nearest class that has them.
fn class_curves(
    samples: &[CapSample],
    plug_class: &[(u8, String)],
    class_count: u8,
    cap_path: &Path,
) -> Result<(Vec<ClassJ>, JPoints), SatHeightError> {
    let mut own: BTreeMap<u8, (JFit, Vec<String>, usize)> = BTreeMap::new();
    let mut j_points = Vec::new();
    for c in 1..=class_count {
        let members: Vec<&CapSample> = samples
            .iter()
            .zip(plug_class)
            .filter(|(_, (pc, _))| *pc == c)
            .map(|(s, _)| s)
            .collect();
        if members.is_empty() {
            continue;
        }
        let pts: Vec<(f64, f64)> = members
            .iter()
            .flat_map(|s| s.j.iter().zip(&s.steps).map(|(j, st)| (*j, st.1)))
            .collect();
        let names: Vec<String> = members.iter().map(|s| s.sample.clone()).collect();
        j_points.extend(pts.iter().map(|&(j, sw)| (c, sw, j)));
        let fit = lab_curves::fit_j_curve(&pts).map_err(|source| SatHeightError::JFit {
            class: c,
            plugs: names.join(", "),
            source,
        })?;
        own.insert(c, (fit, names, pts.len()));
    }
    if own.is_empty() {
        return Err(SatHeightError::NoPlugs {
            file: cap_path.to_path_buf(),
        });
    }
    let classes: Vec<ClassJ> = (1..=class_count)
        .map(|c| match own.get(&c) {
            Some((fit, plugs, points)) => ClassJ {
                class: c,
                fit: Some(fit.clone()),
                curve: fit.chosen.clone(),
                borrowed_from: None,
                plugs: plugs.clone(),
                points: *points,
            },
            None => {
                let lender = nearest_with_data(c, &own.keys().copied().collect::<Vec<_>>());
                let (fit, plugs, points) = &own[&lender];
                ClassJ {
                    class: c,
                    fit: None,
                    curve: fit.chosen.clone(),
                    borrowed_from: Some(lender),
                    plugs: plugs.clone(),
                    points: *points,
                }
            }
        })
        .collect();
    Ok((classes, j_points))
}

/// The configured σ and θ of a lab system, if overridden.
fn lab_override(cap: &crate::config::CapillaryConfig, system: FluidSystem) -> Option<FluidProps> {
    cap.lab
        .iter()
        .find(|(k, _)| FluidSystem::parse_lab(k) == Some(system))
        .map(|(_, v)| *v)
}

/// Recompute a plug's J with another lab σ·|cos θ| (dyn/cm).
fn relabel(s: &mut CapSample, sc_lab: f64) {
    s.sigma_cos_lab = sc_lab;
    s.j = s
        .steps
        .iter()
        .map(|(pc, _)| leverett_j(*pc, sc_lab, s.perm_md, s.porosity))
        .collect();
}

/// The class with data nearest `c`; on a tie the poorer (lower) class, which
/// predicts more water: the cautious choice for hydrocarbons in place.
pub fn nearest_with_data(c: u8, with_data: &[u8]) -> u8 {
    let mut best = with_data[0];
    for &d in with_data {
        let (dd, db) = (d.abs_diff(c), best.abs_diff(c));
        if dd < db || (dd == db && d < best) {
            best = d;
        }
    }
    best
}

#[derive(serde::Deserialize)]
struct PressureRow {
    #[serde(rename = "WELL")]
    well: String,
    #[serde(rename = "DEPTH_MD", default)]
    depth_md: Option<f64>,
    #[serde(rename = "DEPTH_UNIT", default)]
    depth_unit: Option<String>,
    #[serde(rename = "TVDSS_M", default)]
    tvdss_m: Option<f64>,
    #[serde(rename = "TVDSS_FT", default)]
    tvdss_ft: Option<f64>,
    #[serde(rename = "PRESSURE_PSI")]
    psi: f64,
    #[serde(rename = "QUALITY", default)]
    quality: Option<String>,
}

/// A pressure point the FWL fit can use.
#[derive(Debug, Clone, PartialEq)]
pub struct PressureObs {
    /// The CSV line it came from (1 = header).
    pub line: u64,
    /// Well name as written in the file.
    pub well: String,
    /// True vertical depth subsea, m (positive down).
    pub tvdss_m: f64,
    /// Formation pressure, psi (> 0).
    pub psi: f64,
}

/// Read a pressure-points CSV: WELL, PRESSURE_PSI, the depth as TVDSS_M or
/// TVDSS_FT (one of them) or DEPTH_MD (with an optional DEPTH_UNIT, else
/// `depth_unit`), and an optional QUALITY. Points given by MD go through
/// `tvdss_of` (MD and TVDSS in `depth_unit`). Returns the usable points and,
/// by line, the rows left out with the reason: a depth that cannot be had, a
/// depth or pressure that is not a finite number (pressure must be > 0), a
/// QUALITY listed in `exclude_quality` (any case). A file that cannot be read
/// as the table is an error.
pub fn read_pressure_points(
    path: &Path,
    depth_unit: DepthUnit,
    exclude_quality: &[String],
    tvdss_of: TvdssOf<'_>,
) -> Result<(Vec<PressureObs>, Vec<Rejected>), crate::input::tables::TableError> {
    let to_m = depth_unit.factor_to(DepthUnit::Metre);
    let rows: Vec<(u64, PressureRow)> = crate::input::tables::read_csv(path)?;
    let mut points = Vec::with_capacity(rows.len());
    let mut left_out = Vec::new();
    for (line, r) in rows {
        let tvdss_m = match (r.tvdss_m, r.tvdss_ft, r.depth_md) {
            (Some(m), None, _) => Ok(m),
            (None, Some(f), _) => Ok(f * DepthUnit::Foot.factor_to(DepthUnit::Metre)),
            (None, None, Some(md)) => DepthUnit::from_optional(r.depth_unit.as_deref(), depth_unit)
                .map_err(TvdssError::from)
                .and_then(|u| tvdss_of(&r.well, md * u.factor_to(depth_unit)))
                .map(|t| t * to_m),
            _ => Err(TvdssError::NoDepth),
        };
        let tvdss_m = match tvdss_m {
            Ok(t) => t,
            Err(e) => {
                left_out.push(Rejected {
                    line,
                    reason: e.to_string(),
                });
                continue;
            }
        };
        if !(tvdss_m.is_finite() && r.psi.is_finite() && r.psi > 0.0) {
            left_out.push(Rejected {
                line,
                reason: format!("TVDSS {tvdss_m} m or pressure {} psi not usable", r.psi),
            });
            continue;
        }
        if let Some(q) = r
            .quality
            .as_deref()
            .map(str::trim)
            .filter(|q| exclude_quality.iter().any(|x| x.eq_ignore_ascii_case(q)))
        {
            left_out.push(Rejected {
                line,
                reason: format!("{}: QUALITY {q}", r.well),
            });
            continue;
        }
        points.push(PressureObs {
            line,
            well: r.well,
            tvdss_m,
            psi: r.psi,
        });
    }
    Ok((points, left_out))
}

/// Does compartment `c` hold the well named by any of `names`?
fn holds(c: &Option<Vec<String>>, names: &[&str]) -> Option<bool> {
    c.as_ref().map(|list| {
        list.iter()
            .any(|w| names.iter().any(|n| w.eq_ignore_ascii_case(n)))
    })
}

/// The compartment of a well: the one that lists it, else the one without a
/// well list.
pub fn compartment_of<'a, T>(
    list: &'a [(String, T)],
    wells: impl Fn(&T) -> &Option<Vec<String>>,
    names: &[&str],
) -> Option<&'a (String, T)> {
    list.iter()
        .find(|(_, c)| holds(wells(c), names) == Some(true))
        .or_else(|| list.iter().find(|(_, c)| wells(c).is_none()))
}

/// Every compartment's FWL and the pressure points left out.
fn compartments(
    config: &Config,
    tvdss_of: TvdssOf<'_>,
) -> Result<(Vec<CompartmentFwl>, Vec<Rejected>), SatHeightError> {
    let du = config.project.depth_unit;
    let to_m = du.factor_to(DepthUnit::Metre);
    let mut cfgs: Vec<(String, CompartmentConfig)> = config
        .compartments
        .iter()
        .map(|(k, v)| (k.clone(), v.clone()))
        .collect();
    if cfgs.is_empty() {
        if config.pressures.is_none() {
            return Err(SatHeightError::NoFwlSource);
        }
        cfgs.push(("field".into(), CompartmentConfig::default()));
    }
    let mut points: Vec<Vec<(f64, f64)>> = vec![Vec::new(); cfgs.len()];
    let mut left_out = Vec::new();
    let mut min_leg = 2;
    if let Some(p) = &config.pressures {
        min_leg = p.min_leg_points;
        let path = config.resolve_path(&p.file);
        let (obs, rejected) = read_pressure_points(&path, du, &p.exclude_quality, tvdss_of)?;
        left_out = rejected;
        for o in obs {
            match compartment_of(&cfgs, |c| &c.wells, &[o.well.as_str()]) {
                Some((name, _)) => {
                    let k = cfgs.iter().position(|(n, _)| n == name).unwrap_or(0);
                    points[k].push((o.tvdss_m, o.psi));
                }
                None => left_out.push(Rejected {
                    line: o.line,
                    reason: format!("well {} is in no compartment", o.well),
                }),
            }
        }
        left_out.sort_by_key(|r| r.line);
    }
    let mut out = Vec::with_capacity(cfgs.len());
    for ((name, c), pts) in cfgs.into_iter().zip(points) {
        let fit = if config.pressures.is_none() {
            None
        } else if pts.len() < 2 * min_leg {
            Some(Err(FwlError::TooFewUsable {
                count: pts.len(),
                need: 2 * min_leg,
            }))
        } else {
            Some(match c.split_tvdss {
                Some(s) => fwl::fit_fwl_split_at(&pts, s * to_m),
                None => fwl::fit_fwl_auto(&pts, min_leg),
            })
        };
        let (fwl_tvdss, fwl_sigma, source) = match (c.fwl_tvdss, &fit) {
            (Some(f), _) => (f, c.fwl_sd, "config"),
            (None, Some(Ok(f))) => (
                f.fwl_tvdss_m / to_m,
                Some(c.fwl_sd.unwrap_or(f.fwl_sigma_m / to_m)),
                "pressures",
            ),
            (None, Some(Err(reason))) => {
                return Err(SatHeightError::FwlFit {
                    compartment: name,
                    reason: reason.clone(),
                });
            }
            (None, None) => return Err(SatHeightError::NoFwl { compartment: name }),
        };
        let fitted = fit.as_ref().and_then(|f| f.as_ref().ok());
        let (rho_water, rho_hc, density_source) = match (c.rho_water_gcc, c.rho_hc_gcc, fitted) {
            (Some(w), Some(h), _) => (w, h, "config"),
            (w, h, Some(f)) => (
                w.unwrap_or_else(|| f.lower.density_gcc()),
                h.unwrap_or_else(|| f.upper.density_gcc()),
                "pressure gradients",
            ),
            _ => {
                return Err(SatHeightError::NoDensities { compartment: name });
            }
        };
        if !(rho_water > rho_hc && rho_hc > 0.0) {
            return Err(SatHeightError::Densities {
                compartment: name,
                rho_water,
                rho_hc,
            });
        }
        out.push(CompartmentFwl {
            wells: c.wells.clone(),
            fwl_tvdss,
            fwl_sigma,
            source: source.into(),
            pressure_fit_error: fit
                .as_ref()
                .and_then(|f| f.as_ref().err().map(ToString::to_string)),
            pressure_fit: fitted.cloned(),
            rho_water_gcc: rho_water,
            rho_hc_gcc: rho_hc,
            density_source: density_source.into(),
            points_used: pts.len(),
            points_m: pts,
            name,
        });
    }
    Ok((out, left_out))
}

/// A rock's saturation-height function: its class curve and √(k/φ) looked
/// up once, so that a search over free water levels (the contact audit's
/// implied FWL) evaluates only what changes with height. Gives what
/// [`SatHeightModel::swh`] gives, bit for bit.
#[derive(Debug, Clone, Copy)]
pub struct RockSwh<'a> {
    /// The class's J-curve; `None` where the class or rock is undefined.
    curve: Option<&'a JCurve>,
    sqrt_k_phi: f64,
    sigma_cos: f64,
}

impl RockSwh<'_> {
    /// SWH at `h_m` m above the FWL with density contrast `delta_rho` (g/cm3):
    /// 1 at or below the FWL, NaN for an undefined rock or height.
    #[inline]
    pub fn swh(&self, h_m: f64, delta_rho: f64) -> f64 {
        if !h_m.is_finite() {
            return f64::NAN;
        }
        if h_m <= 0.0 {
            return 1.0;
        }
        let Some(curve) = self.curve else {
            return f64::NAN;
        };
        let pc = pc_at_height_psi(h_m, delta_rho);
        curve.sw(crate::sat_height::capillary::leverett_j_root(
            pc,
            self.sigma_cos,
            self.sqrt_k_phi,
        ))
    }
}

impl SatHeightModel {
    /// A model from given class curves (class 1 first) and compartments, for
    /// audits and tests that do not read lab or pressure files.
    pub fn new_for_audit(
        classes: Vec<JCurve>,
        sigma_cos_reservoir: f64,
        compartments: Vec<CompartmentFwl>,
        depth_unit: DepthUnit,
    ) -> SatHeightModel {
        SatHeightModel {
            capillary_file: String::new(),
            reservoir: FluidProps {
                sigma_dyn_cm: sigma_cos_reservoir,
                theta_deg: 0.0,
            },
            sigma_cos_reservoir,
            form_criterion: J_FORM_CRITERION.to_string(),
            classes: classes
                .into_iter()
                .zip(1u8..)
                .map(|(curve, class)| ClassJ {
                    class,
                    fit: None,
                    points: curve.points(),
                    curve,
                    borrowed_from: None,
                    plugs: Vec::new(),
                })
                .collect(),
            plugs: Vec::new(),
            plugs_rejected: Vec::new(),
            pressure_file: None,
            pressure_points_left_out: Vec::new(),
            compartments,
            depth_unit,
            j_points: Vec::new(),
        }
    }

    /// The compartment of a well (LAS name or file stem).
    pub fn compartment(&self, names: &[&str]) -> Option<&CompartmentFwl> {
        let list: Vec<(String, &CompartmentFwl)> = self
            .compartments
            .iter()
            .map(|c| (c.name.clone(), c))
            .collect();
        compartment_of(&list, |c| &c.wells, names).map(|(_, c)| *c)
    }

    /// SWH at a height above the FWL (m) for a rock of class `class`, k (mD)
    /// and φ (v/v), with density contrast Δρ (g/cm3): 1 at or below the FWL,
    /// else the class curve at J = J(Pc_res(h), σcosθ_res, k, φ)
    /// (Leverett 1941; height to pressure by hydrostatics, formulas.md §8.3).
    /// NaN where the rock or class is undefined.
    pub fn swh(&self, h_m: f64, class: f64, k_md: f64, phi: f64, delta_rho: f64) -> f64 {
        self.rock(class, k_md, phi).swh(h_m, delta_rho)
    }

    /// One rock's saturation-height function ([`RockSwh`]), for many heights.
    pub fn rock(&self, class: f64, k_md: f64, phi: f64) -> RockSwh<'_> {
        let defined = class.is_finite() && class >= 1.0 && k_md > 0.0 && phi > 0.0;
        RockSwh {
            curve: defined
                .then(|| self.classes.get(class as usize - 1))
                .flatten()
                .map(|c| &c.curve),
            sqrt_k_phi: (k_md / phi).sqrt(),
            sigma_cos: self.sigma_cos_reservoir,
        }
    }

    /// Give a well's table HAFWL, SWH and SW_RESID (before FLAG). `None`, with
    /// a warning, when the well is in no compartment.
    pub fn apply(
        &self,
        table: &mut Table,
        names: &[&str],
        warnings: &mut Vec<String>,
    ) -> Option<WellSatHeight> {
        let Some(comp) = self.compartment(names) else {
            warnings.push(format!(
                "well {} is in no compartment of [compartments]: no SWH",
                names.first().copied().unwrap_or("?")
            ));
            return None;
        };
        let n = table.n_rows();
        let nan = vec![f64::NAN; n];
        let get = |c: Col| table.get(c).unwrap_or(&nan);
        let (tvdss, class, perm, phie, sw, flag) = (
            get(Col::Tvdss),
            get(Col::Class),
            get(Col::Perm),
            get(Col::Phie),
            get(Col::Sw),
            get(Col::Flag),
        );
        let to_m = self.depth_unit.factor_to(DepthUnit::Metre);
        let drho = comp.rho_water_gcc - comp.rho_hc_gcc;
        let mut hafwl = Vec::with_capacity(n);
        let mut swh = Vec::with_capacity(n);
        let mut resid = Vec::with_capacity(n);
        let mut all = Vec::new();
        let mut by_class: BTreeMap<u8, Vec<f64>> = BTreeMap::new();
        let mut defined = 0;
        for i in 0..n {
            let h = comp.fwl_tvdss - tvdss[i];
            hafwl.push(h);
            let s = if sw[i].is_finite() {
                self.swh(h * to_m, class[i], perm[i], phie[i], drho)
            } else {
                f64::NAN
            };
            swh.push(s);
            let r = sw[i] - s;
            resid.push(r);
            if h > 0.0 && s.is_finite() {
                defined += 1;
                let f = if flag[i].is_finite() {
                    flag[i] as u32
                } else {
                    0
                };
                if r.is_finite() && f & RESIDUAL_SKIP_FLAGS == 0 {
                    all.push(r);
                    by_class.entry(class[i] as u8).or_default().push(r);
                }
            }
        }
        if tvdss.iter().all(|t| t.is_nan()) {
            warnings.push(
                "no TVDSS (no datum elevation): no height above the free water level, no SWH"
                    .into(),
            );
        }
        let du = self.depth_unit;
        let new = [
            OutColumn::new(Col::Hafwl, du, hafwl).described(format!(
                "{} ({} {:.2})",
                Col::Hafwl.description(),
                comp.name.to_ascii_uppercase(),
                comp.fwl_tvdss
            )),
            OutColumn::new(Col::Swh, du, swh),
            OutColumn::new(Col::SwResid, du, resid),
        ];
        let at = table.position(Col::Flag).unwrap_or(table.columns.len());
        for (k, c) in new.into_iter().enumerate() {
            table.columns.insert(at + k, c);
        }
        Some(WellSatHeight {
            compartment: comp.name.clone(),
            fwl_tvdss: comp.fwl_tvdss,
            swh_defined: defined,
            residual: Residual::of(&all),
            residual_by_class: by_class
                .into_iter()
                .map(|(c, d)| (c, Residual::of(&d)))
                .collect(),
            possible_other_fwl: None,
        })
    }
}

/// Mark wells whose mean SW − SWH departs from their neighbours' by more
/// than `threshold` (v/v): neighbours are the other wells of the compartment
/// with at least [`MIN_RESIDUAL_SAMPLES`] residuals, or of the field when the
/// compartment has no other. Returns the wells marked, with the message.
pub fn mark_biased_wells(
    wells: &mut [(String, &mut WellSatHeight)],
    threshold: f64,
) -> Vec<(String, String)> {
    let means: Vec<(String, String, f64)> = wells
        .iter()
        .filter(|(_, w)| w.residual.samples >= MIN_RESIDUAL_SAMPLES)
        .map(|(n, w)| (n.clone(), w.compartment.clone(), w.residual.mean))
        .collect();
    let mut marked = Vec::new();
    for (name, w) in wells.iter_mut() {
        if w.residual.samples < MIN_RESIDUAL_SAMPLES {
            continue;
        }
        let mut same: Vec<f64> = means
            .iter()
            .filter(|(n, c, _)| n != name && *c == w.compartment)
            .map(|m| m.2)
            .collect();
        let scope = if same.is_empty() {
            same = means
                .iter()
                .filter(|(n, _, _)| n != name)
                .map(|m| m.2)
                .collect();
            "the field's other wells"
        } else {
            "its compartment's other wells"
        };
        if same.is_empty() {
            continue;
        }
        let med = crate::stats::median(&mut same);
        if (w.residual.mean - med).abs() > threshold {
            let msg = format!(
                "mean SW − SWH above the FWL is {:+.3} against {:+.3} in {scope} (threshold {threshold}): possibly another free water level than compartment `{}`'s {:.1}",
                w.residual.mean, med, w.compartment, w.fwl_tvdss
            );
            w.possible_other_fwl = Some(msg.clone());
            marked.push((name.clone(), msg));
        }
    }
    marked
}

fn io_err(path: &Path) -> impl Fn(std::io::Error) -> OutputError + '_ {
    move |source| OutputError::Io {
        path: path.to_path_buf(),
        source,
    }
}

/// Write a CSV from rows through [`write_atomic`].
fn write_csv_rows(path: &Path, header: &[&str], rows: &[Vec<String>]) -> Result<(), OutputError> {
    write_atomic(path, |w| {
        let mut c = csv::Writer::from_writer(w);
        let e = |e: csv::Error| OutputError::Io {
            path: path.to_path_buf(),
            source: std::io::Error::other(e),
        };
        c.write_record(header).map_err(e)?;
        for r in rows {
            c.write_record(r).map_err(e)?;
        }
        c.flush().map_err(io_err(path))
    })
}

fn num(v: f64) -> String {
    if v.is_finite() {
        format!("{v:.6}")
    } else {
        String::new()
    }
}

fn opt(v: Option<f64>) -> String {
    v.map_or_else(String::new, num)
}

/// What the reservoir model needs, in one JSON file.
#[derive(Debug, Serialize)]
pub struct ModelExport<'a> {
    /// The program and version that wrote the file (`flowzone x.y.z`).
    pub tool: String,
    /// The review caution ([`CAUTION`]).
    pub caution: &'static str,
    /// Unit of each exported quantity ([`export_units`]).
    pub units: BTreeMap<&'static str, &'static str>,
    /// The project's depth unit (FWL, HAFWL).
    pub depth_unit: DepthUnit,
    /// The class scheme the class numbers refer to.
    pub scheme: &'a SchemeInfo,
    /// The saturation-height model: J-functions, plugs, compartments.
    pub saturation_height: &'a SatHeightModel,
    /// Archie a, m, n per class: field-level (index 0 = class 1), then the
    /// zones that set their own.
    pub archie_by_class: Vec<crate::petro::saturation::ArchieParams>,
    /// Archie a, m, n per class (index 0 = class 1) for each zone the config
    /// gives parameters for.
    pub archie_by_zone_and_class: BTreeMap<String, Vec<crate::petro::saturation::ArchieParams>>,
    /// The permeability transform in use: FZI or the log-k line.
    pub perm_method: crate::config::PermMethod,
    /// Permeability models per class.
    pub perm_by_class: &'a [crate::classes::perm::ClassPerm],
}

/// The caution written in every export.
pub const CAUTION: &str = "Interpretation results: review by a qualified petrophysicist before use, under local regulation and licensed practice.";

/// Write `saturation/saturation-model.json` and `.csv` (one row per class)
/// and `saturation/residuals.csv` (per well and class). Returns the paths.
pub fn write_outputs(
    out: &Path,
    export: &ModelExport<'_>,
    wells: &[(String, &WellSatHeight)],
) -> Result<Vec<PathBuf>, OutputError> {
    let dir = out.join("saturation");
    std::fs::create_dir_all(&dir).map_err(|source| OutputError::Io {
        path: dir.clone(),
        source,
    })?;
    let json = dir.join("saturation-model.json");
    write_atomic(&json, |w| {
        serde_json::to_writer_pretty(&mut *w, export)
            .map_err(|e| io_err(&json)(std::io::Error::other(e)))?;
        w.write_all(b"\n").map_err(io_err(&json))
    })?;
    let m = export.saturation_height;
    let perm: BTreeMap<u8, &crate::classes::perm::ClassPerm> =
        export.perm_by_class.iter().map(|p| (p.class, p)).collect();
    let rows: Vec<Vec<String>> = m
        .classes
        .iter()
        .map(|c| {
            let a = export
                .archie_by_class
                .get(usize::from(c.class) - 1)
                .copied()
                .unwrap_or(crate::petro::saturation::ArchieParams::DEFAULT);
            let (jd, lambda, swirr, g, snw) = match &c.curve {
                JCurve::BrooksCorey(b) => (b.jd, Some(b.lambda), Some(b.swirr), None, None),
                JCurve::Thomeer(t) => (t.jd, None, None, Some(t.g), Some(t.snw_inf)),
            };
            let p = perm.get(&c.class);
            vec![
                c.class.to_string(),
                c.curve.form_name().into(),
                num(jd),
                opt(lambda),
                opt(swirr),
                opt(g),
                opt(snw),
                num(c.curve.rms_sw()),
                c.points.to_string(),
                c.plugs.join(" "),
                c.borrowed_from.map_or_else(String::new, |b| b.to_string()),
                num(a.a),
                num(a.m),
                num(a.n),
                opt(p.map(|p| p.fzi_um)),
                opt(p.and_then(|p| p.intercept)),
                opt(p.and_then(|p| p.slope)),
            ]
        })
        .collect();
    let csv_path = dir.join("saturation-model.csv");
    write_csv_rows(
        &csv_path,
        &[
            "CLASS",
            "J_FORM",
            "J_ENTRY",
            "BC_LAMBDA",
            "BC_SWIRR_VV",
            "THOMEER_G",
            "THOMEER_SNW_INF_VV",
            "J_RMS_SW_VV",
            "J_POINTS",
            "J_PLUGS",
            "J_BORROWED_FROM",
            "ARCHIE_A",
            "ARCHIE_M",
            "ARCHIE_N",
            "FZI_UM",
            "LOGK_INTERCEPT",
            "LOGK_SLOPE_PER_VV",
        ],
        &rows,
    )?;
    let mut rrows = Vec::new();
    for (well, w) in wells {
        let mut push = |class: String, r: &Residual| {
            rrows.push(vec![
                well.clone(),
                w.compartment.clone(),
                class,
                r.samples.to_string(),
                num(r.mean),
                num(r.rms),
                if w.possible_other_fwl.is_some() {
                    "1".into()
                } else {
                    "0".into()
                },
            ]);
        };
        push("ALL".into(), &w.residual);
        for (c, r) in &w.residual_by_class {
            push(c.to_string(), r);
        }
    }
    let res_path = dir.join("residuals.csv");
    write_csv_rows(
        &res_path,
        &[
            "WELL",
            "COMPARTMENT",
            "CLASS",
            "SAMPLES",
            "MEAN_SW_MINUS_SWH_VV",
            "RMS_VV",
            "POSSIBLE_OTHER_FWL",
        ],
        &rrows,
    )?;
    Ok(vec![json, csv_path, res_path])
}

/// Units of the exported quantities.
pub fn export_units() -> BTreeMap<&'static str, &'static str> {
    BTreeMap::from([
        (
            "J",
            "dimensionless (Leverett J; Pc psi, sigma dyn/cm, k mD, phi v/v)",
        ),
        ("J_ENTRY", "dimensionless: J where Sw first drops below 1"),
        ("Sw, Swirr, Snw_inf", "v/v"),
        (
            "fwl_tvdss, fwl_sigma, HAFWL",
            "project depth unit, TVDSS positive down",
        ),
        ("pressure fit", "TVDSS m, psi, psi/m"),
        ("sigma", "dyn/cm"),
        ("theta", "degrees"),
        ("density", "g/cm3"),
        ("perm", "mD"),
        ("FZI", "um"),
        ("log-k line", "log10 k(mD) = intercept + slope * phi(v/v)"),
    ])
}

use std::io::Write as _;

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

    fn model(curves: Vec<JCurve>) -> SatHeightModel {
        SatHeightModel::new_for_audit(curves, 26.0, Vec::new(), DepthUnit::Foot)
    }

    use crate::sat_height::lab_curves::brooks_corey_j as bc;

    /// Each way of giving a point's depth, and each reason to leave one out.
    /// 1 ft = 0.3048 m exactly (international foot, 1959); MD points go
    /// through the caller's conversion (here TVDSS = MD − 30 m).
    #[test]
    fn pressure_points_by_depth_kind_and_reason() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("pressures.csv");
        std::fs::write(
            &path,
            "WELL,DEPTH_MD,DEPTH_UNIT,TVDSS_M,TVDSS_FT,PRESSURE_PSI,QUALITY\n\
             A-1,,,2000.0,,2900.5,good\n\
             A-1,,,,6600.0,2910.0,\n\
             A-2,2040.0,,,,2920.0,Good\n\
             A-2,6700.0,FT,,,2930.0,\n\
             A-2,,,2050.0,6725.0,2940.0,\n\
             A-3,,,2060.0,,-5.0,\n\
             A-3,,,2070.0,,2950.0, POOR \n\
             A-3,,,,,2960.0,\n\
             B-9,2090.0,,,,2970.0,\n",
        )
        .unwrap();
        let tvdss_of = |well: &str, md: f64| {
            if well == "B-9" {
                Err(TvdssError::UnknownWell {
                    well: well.to_string(),
                })
            } else {
                Ok(md - 30.0)
            }
        };
        let (points, left_out) =
            read_pressure_points(&path, DepthUnit::Metre, &["poor".to_string()], &tvdss_of)
                .unwrap();
        let got: Vec<(u64, &str, f64, f64)> = points
            .iter()
            .map(|p| (p.line, p.well.as_str(), p.tvdss_m, p.psi))
            .collect();
        assert_eq!(got.len(), 4, "{got:?}");
        assert_eq!(got[0], (2, "A-1", 2000.0, 2900.5));
        assert_eq!((got[1].0, got[1].1), (3, "A-1"));
        assert_close(got[1].2, 6600.0 * 0.3048, 1e-9);
        assert_eq!(got[2], (4, "A-2", 2010.0, 2920.0));
        assert_eq!((got[3].0, got[3].1), (5, "A-2"));
        assert_close(got[3].2, 6700.0 * 0.3048 - 30.0, 1e-9);
        let lines: Vec<u64> = left_out.iter().map(|r| r.line).collect();
        assert_eq!(lines, [6, 7, 8, 9, 10]);
        assert!(left_out[0].reason.contains("not both"), "{:?}", left_out[0]);
        assert!(left_out[1].reason.contains("-5 psi"), "{:?}", left_out[1]);
        assert!(
            left_out[2].reason.contains("QUALITY POOR"),
            "{:?}",
            left_out[2]
        );
        assert!(left_out[3].reason.contains("not both"), "{:?}", left_out[3]);
        assert_eq!(
            left_out[4].reason,
            "well `B-9` is not among the field's readable LAS wells, so its MD cannot be converted to TVDSS"
        );
    }

    /// Source: formulas.md §8.7 constructed check (σcosθ 26, Δρ 0.30, one
    /// Brooks-Corey J-curve Jd 0.05, λ 1.5, Swirr 0.10): class A (500 mD, φ
    /// 0.25) and class B (5 mD, φ 0.15) at 20, 50 and 100 ft above the FWL.
    /// The sheet uses 0.21645 and 0.433 psi/ft; our exact constants move J by
    /// 0.07 % and Pc by 0.12 %, hence the relative 0.3 % on Sw − Swirr.
    #[test]
    fn swh_reference_table() {
        let m = model(vec![bc(0.05, 1.5, 0.10), bc(0.05, 1.5, 0.10)]);
        for (h_ft, sw_a, sw_b) in [
            (20.0, 0.11058, 0.32804),
            (50.0, 0.10268, 0.15769),
            (100.0, 0.10095, 0.12040),
        ] {
            let h_m = h_ft * 0.3048;
            let a = m.swh(h_m, 1.0, 500.0, 0.25, 0.30);
            let b = m.swh(h_m, 2.0, 5.0, 0.15, 0.30);
            assert_close(a - 0.10, sw_a - 0.10, 0.003 * (sw_a - 0.10) + 1e-5);
            assert_close(b - 0.10, sw_b - 0.10, 0.003 * (sw_b - 0.10) + 1e-5);
        }
        // at and below the FWL the rock is water-filled; no class, no SWH above it
        assert_eq!(m.swh(0.0, 1.0, 500.0, 0.25, 0.30), 1.0);
        assert_eq!(m.swh(-5.0, f64::NAN, 500.0, 0.25, 0.30), 1.0);
        assert!(m.swh(5.0, f64::NAN, 500.0, 0.25, 0.30).is_nan());
        assert!(m.swh(5.0, 3.0, 500.0, 0.25, 0.30).is_nan());
        // entry height of class B (sheet: 8.008 ft): water-filled just below it
        assert_eq!(m.swh(7.9 * 0.3048, 2.0, 5.0, 0.15, 0.30), 1.0);
        assert!(m.swh(8.2 * 0.3048, 2.0, 5.0, 0.15, 0.30) < 1.0);
    }

    #[test]
    fn borrowing_prefers_nearest_then_poorer() {
        assert_eq!(nearest_with_data(1, &[2, 4]), 2);
        assert_eq!(nearest_with_data(3, &[2, 4]), 2);
        assert_eq!(nearest_with_data(5, &[2, 4]), 4);
        assert_eq!(nearest_with_data(3, &[4]), 4);
    }

    #[test]
    fn biased_well_is_marked() {
        let w = |comp: &str, mean: f64| WellSatHeight {
            compartment: comp.into(),
            fwl_tvdss: 2085.0,
            swh_defined: 100,
            residual: Residual {
                samples: 100,
                mean,
                rms: mean.abs(),
            },
            residual_by_class: Vec::new(),
            possible_other_fwl: None,
        };
        let mut a = w("Main", 0.01);
        let mut b = w("Main", -0.01);
        let mut c = w("Main", 0.0);
        let mut d = w("Main", -0.12);
        let mut e = w("East", 0.005);
        let mut v = vec![
            ("A".to_string(), &mut a),
            ("B".to_string(), &mut b),
            ("C".to_string(), &mut c),
            ("D".to_string(), &mut d),
            ("E".to_string(), &mut e),
        ];
        let marked = mark_biased_wells(&mut v, 0.05);
        let names: Vec<&str> = marked.iter().map(|m| m.0.as_str()).collect();
        assert_eq!(names, ["D"]);
        assert!(d.possible_other_fwl.is_some() && e.possible_other_fwl.is_none());
    }
}
