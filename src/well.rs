//! One well through the stages: LAS file + config → output table.
//!
//! Stages: read the file; resolve the logical curves and convert them to
//! canonical units; depth reference (TVD, TVDSS); zones; parameters per zone
//! (with gamma-ray picks); the petrophysics chain ([`crate::well::chain`]). Each
//! stage returns a `Result`, so a bad well becomes a [`WellError`] for the
//! field run to record, never a panic.

pub mod chain;
pub mod depth;
pub mod profile;
pub(crate) mod summary;
pub mod zones;

use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use crate::config::Config;
use crate::input::curves::{self, CurveError, LogicalCurve, ResolvedCurve};
use crate::input::las::{self, LasError, LasFile, ReadOptions};
use crate::input::tables::{TableError, read_csv};
use crate::output::schema::{Col, FLAG_CLIPPED, FLAG_NO_CLASS_EXPONENTS, flag_description};
use crate::output::{OutColumn, OutputError, Table};
use crate::petro::saturation::{ArchieParams, SaturationModel};
use crate::units::{DepthUnit, Quantity};
use crate::well::chain::{Counts, Inputs, ZoneSetup};
use crate::well::depth::{Survey, tvd_at};
use crate::well::zones::Tops;

/// Why a well failed.
#[derive(Debug, thiserror::Error)]
pub enum WellError {
    /// The LAS file cannot be read.
    #[error(transparent)]
    Las(#[from] LasError),
    /// A log the well's methods need is missing or in an unknown unit.
    #[error("{}", .path.display())]
    Curve {
        /// The LAS file.
        path: PathBuf,
        /// Which curve, and why.
        #[source]
        source: CurveError,
    },
    /// A zone's parameters do not give what its methods need.
    #[error("{}: zone `{zone}`: {message}", .path.display())]
    Params {
        /// The LAS file.
        path: PathBuf,
        /// The zone, as named in the tops table (or the whole well).
        zone: String,
        /// What is missing or unusable, naming the config key.
        message: String,
    },
    /// The depth reference cannot be built.
    #[error("{}: {message}", .path.display())]
    Depth {
        /// The LAS file.
        path: PathBuf,
        /// What is wrong.
        message: String,
    },
    /// A table the well needs (survey, tops) cannot be read.
    #[error(transparent)]
    Table(#[from] TableError),
    /// An output of the well cannot be written.
    #[error(transparent)]
    Output(#[from] OutputError),
}

/// What the stages did to a well, for the run summary.
#[derive(Debug, Clone, Serialize, Default, Deserialize)]
pub struct WellReport {
    /// Elevation of the depth reference above sea level (project depth unit) and where it came from.
    pub elevation: Option<f64>,
    /// Where the elevation came from (config, LAS header item), or why none.
    pub elevation_source: String,
    /// Whether a survey gave TVD (otherwise the well is taken as vertical).
    pub deviated: bool,
    /// Each zone's resolved parameters and gamma-ray picks, in depth order.
    pub zones: Vec<ZoneSetup>,
    /// What the chain clipped, flagged or left out, in samples.
    pub counts: Counts,
    /// The class-aware saturation, when class-dependent exponents are set.
    pub class_exponents: Option<ClassExponentCounts>,
    /// What the LAS reader repaired in the file, by kind, with counts (each
    /// repair is also a warning with its line).
    #[serde(default)]
    pub las_repairs: std::collections::BTreeMap<String, usize>,
}

/// What the class-dependent exponents did in a well.
#[derive(Debug, Clone, Serialize, Default, Deserialize)]
pub struct ClassExponentCounts {
    /// Interpreted depths without a class: the zone's exponents (FLAG 64).
    pub no_class: usize,
    /// Depths whose class-aware SW was clipped to [0, 1].
    pub clipped: usize,
    /// Per zone, Archie a, m, n of each class (class 1 first).
    pub by_zone: Vec<(String, Vec<ArchieParams>)>,
}

/// A well after the stages, ready to write.
#[derive(Debug, Clone)]
pub struct WellOutput {
    /// The well's name: ~W WELL, or the file stem without one.
    pub name: String,
    /// The output curves, depth first, with the header items kept.
    pub table: Table,
    /// Warnings from reading and from the stages, as text.
    pub warnings: Vec<String>,
    /// Mnemonic and unit used for each logical curve found.
    pub resolved: Vec<(LogicalCurve, String, String)>,
    /// What the stages did, for the run summary.
    pub report: WellReport,
    /// Zone index of each depth (into `report.zones`), `None` outside every zone.
    pub zone_of: Vec<Option<u16>>,
    /// Rw used at each depth, ohm.m.
    pub rw: Vec<f64>,
    /// True vertical depth below the surface of each depth, m (the chain's
    /// temperature input; the Monte Carlo runs the chain again).
    pub tvd_m: Vec<f64>,
}

/// What every well of a run shares: the config and the tables it names.
#[derive(Debug, Clone)]
pub struct RunContext {
    /// The project config.
    pub config: Config,
    /// The zone tops table, when the config names one.
    pub tops: Option<Tops>,
}

impl RunContext {
    /// Load the tables the config names.
    pub fn new(config: Config) -> Result<RunContext, TableError> {
        let tops = match &config.zones.tops {
            Some(p) => Some(Tops::read(
                &config.resolve_path(p),
                config.project.depth_unit,
            )?),
            None => None,
        };
        Ok(RunContext { config, tops })
    }
}

/// Read a well and run the stages.
pub fn process(path: &Path, ctx: &RunContext) -> Result<WellOutput, WellError> {
    let file = las::read_path(path, read_options(ctx))?;
    process_file(path, &file, ctx)
}

/// How the run's config asks LAS files to be read.
pub fn read_options(ctx: &RunContext) -> ReadOptions {
    ReadOptions {
        strict: ctx.config.input.strict,
        limits: ctx.config.input.limits(),
    }
}

/// Elevation of the depth reference: config, else the first header mnemonic
/// found (~P, then ~W), converted to the project's depth unit.
fn elevation(
    file: &LasFile,
    names: &[&str],
    ctx: &RunContext,
    warnings: &mut Vec<String>,
) -> (Option<f64>, String) {
    let cfg = &ctx.config;
    let depth_unit = cfg.project.depth_unit;
    if let Some(v) = cfg.depth.for_well(names).and_then(|w| w.elevation) {
        return (Some(v), "config".into());
    }
    for m in &cfg.depth.elevation_mnemonics {
        let Some(item) = file.param(m).or_else(|| file.well_item(m)) else {
            continue;
        };
        let Ok(v) = item.value.trim().parse::<f64>() else {
            warnings.push(format!(
                "line {}: {} value `{}` is not a number; not used as the elevation",
                item.line, item.mnemonic, item.value
            ));
            continue;
        };
        let unit = if item.unit.is_empty() {
            file.index_unit()
        } else {
            item.unit.as_str()
        };
        match DepthUnit::from_las(unit) {
            Some(u) => {
                return (
                    Some(v * u.factor_to(depth_unit)),
                    format!("{} (line {})", item.mnemonic, item.line),
                );
            }
            None => warnings.push(format!(
                "line {}: {} has unit `{unit}`, not a depth unit; not used as the elevation",
                item.line, item.mnemonic
            )),
        }
    }
    warnings
        .push("no elevation of the depth reference (config or header); TVDSS is missing".into());
    (None, "none".into())
}

#[derive(serde::Deserialize)]
struct SurveyRow {
    #[serde(rename = "MD_M", default)]
    md_m: Option<f64>,
    #[serde(rename = "MD_FT", default)]
    md_ft: Option<f64>,
    #[serde(rename = "INC_DEG")]
    inc: f64,
    #[serde(rename = "AZI_DEG")]
    azi: f64,
}

/// Read a survey CSV (MD_M or MD_FT, INC_DEG, AZI_DEG) into the project's depth unit.
pub fn read_survey(path: &Path, depth: DepthUnit) -> Result<Survey, WellError> {
    let rows: Vec<(u64, SurveyRow)> = read_csv(path)?;
    let mut s = Survey {
        md: Vec::new(),
        inc_deg: Vec::new(),
        azi_deg: Vec::new(),
    };
    for (line, r) in rows {
        let md = match (r.md_m, r.md_ft) {
            (Some(m), None) => m * DepthUnit::Metre.factor_to(depth),
            (None, Some(f)) => f * DepthUnit::Foot.factor_to(depth),
            _ => {
                return Err(TableError::Row {
                    path: path.to_path_buf(),
                    line,
                    message: "give exactly one of MD_M and MD_FT".into(),
                }
                .into());
            }
        };
        if !(md.is_finite() && r.inc.is_finite() && r.azi.is_finite()) {
            return Err(TableError::Row {
                path: path.to_path_buf(),
                line,
                message: format!(
                    "MD {md}, INC_DEG {} and AZI_DEG {} must be finite numbers",
                    r.inc, r.azi
                ),
            }
            .into());
        }
        if s.md.last().is_some_and(|&last| md <= last) {
            return Err(TableError::Row {
                path: path.to_path_buf(),
                line,
                message: "MD must increase down the survey".into(),
            }
            .into());
        }
        if !(0.0..=180.0).contains(&r.inc) {
            return Err(TableError::Row {
                path: path.to_path_buf(),
                line,
                message: format!("INC_DEG {} is outside 0-180", r.inc),
            }
            .into());
        }
        s.md.push(md);
        s.inc_deg.push(r.inc);
        s.azi_deg.push(r.azi);
    }
    if s.md.is_empty() {
        return Err(TableError::Row {
            path: path.to_path_buf(),
            line: 1,
            message: "survey has no stations".into(),
        }
        .into());
    }
    Ok(s)
}

/// A temperature from a header item in DEGC or DEGF, as °C.
fn header_temperature_c(file: &LasFile, mnemonic: &str) -> Option<f64> {
    let item = file.param(mnemonic).or_else(|| file.well_item(mnemonic))?;
    let v: f64 = item.value.trim().parse().ok()?;
    match item.unit.to_ascii_uppercase().as_str() {
        "DEGC" | "C" | "°C" => Some(v),
        "DEGF" | "F" | "°F" => Some((v - 32.0) * 5.0 / 9.0),
        _ => None,
    }
}

/// Run the stages on a file already read.
pub fn process_file(
    path: &Path,
    file: &LasFile,
    ctx: &RunContext,
) -> Result<WellOutput, WellError> {
    let config = &ctx.config;
    let depth_unit = config.project.depth_unit;
    let aliases = config.alias_table();
    let curve_err = |source| WellError::Curve {
        path: path.to_path_buf(),
        source,
    };
    let mut warnings: Vec<String> = file.warnings.iter().map(ToString::to_string).collect();
    let md = curves::resolve_depth(file, depth_unit).map_err(curve_err)?;
    let stem = stem_of(path);
    let name = file
        .well_name()
        .map_or_else(|| stem.clone(), str::to_string);
    let names: Vec<&str> = vec![name.as_str(), stem.as_str()];

    let (found, missing): (Vec<_>, Vec<_>) = LogicalCurve::ALL
        .into_iter()
        .map(|c| curves::resolve(file, c, &aliases, depth_unit))
        .partition(Result::is_ok);
    let found: Vec<ResolvedCurve> = found.into_iter().filter_map(Result::ok).collect();
    let missing: Vec<CurveError> = missing.into_iter().filter_map(Result::err).collect();
    let curve = |c: LogicalCurve| {
        found
            .iter()
            .find(|r| r.logical == c)
            .map(|r| r.values.as_slice())
    };

    let (elev, elevation_source) = elevation(file, &names, ctx, &mut warnings);
    let DepthRef {
        tvdss,
        tvd_m,
        deviated,
    } = depth_reference(&md, elev, &names, ctx)?;

    // zones
    let well_tops = match &ctx.tops {
        Some(t) => match t.of_well(&names) {
            Some(tops) => Some(tops),
            None => {
                warnings.push(format!("no zone tops for well {name} in the tops table: every depth is outside the zones and not interpreted"));
                Some(&[][..])
            }
        },
        None => None,
    };
    let (zone_names, zone_of) = zones::assign(&md, well_tops);

    // parameters per zone
    let mut setups = Vec::with_capacity(zone_names.len());
    let mut needed: Vec<LogicalCurve> = vec![LogicalCurve::GammaRay, LogicalCurve::DeepResistivity];
    let gr = curve(LogicalCurve::GammaRay);
    for (zi, zone) in zone_names.iter().enumerate() {
        let params = config.parameters.for_well_zone(&names, zone).resolve();
        let in_zone: Vec<f64> = match gr {
            Some(g) => g
                .iter()
                .zip(&zone_of)
                .filter(|(_, z)| **z == u16::try_from(zi).ok())
                .map(|(v, _)| *v)
                .collect(),
            None => Vec::new(),
        };
        let setup = zone_setup(path, file, zone, params, &in_zone, &tvd_m)?;
        needed.extend(curves_needed(&setup.params));
        setups.push(setup);
    }
    needed.sort();
    needed.dedup();
    check_needed(&needed, &found, &missing, &mut warnings).map_err(curve_err)?;

    let inputs = Inputs {
        gr: curve(LogicalCurve::GammaRay),
        rhob: curve(LogicalCurve::BulkDensity),
        nphi: curve(LogicalCurve::NeutronPorosity),
        dt: curve(LogicalCurve::CompressionalSlowness),
        rt: curve(LogicalCurve::DeepResistivity),
        cali: curve(LogicalCurve::Caliper),
        bs: curve(LogicalCurve::BitSize),
        tvd_m: &tvd_m,
    };
    if inputs.bs.is_none() {
        bit_size_from_header(file, depth_unit, &mut setups);
    }
    let mut out = chain::run(&inputs, &zone_of, &setups);
    let rw = std::mem::take(&mut out.rw);
    if out.counts.outside_zone > 0 && well_tops.is_some() {
        warnings.push(format!(
            "{} samples above the first zone top are outside every zone and not interpreted",
            out.counts.outside_zone
        ));
    }

    let (columns, resolved) = output_columns(depth_unit, md, tvdss, &mut out, found);
    // identity, and the surface location (LAS 3.0 ~Well: LATI LONG GDAT or
    // X Y GDAT HZCS), which the report's base map reads
    let keep = [
        "WELL",
        "UWI",
        "API",
        "COMP",
        "FLD",
        "LOC",
        "CTRY",
        "PROV",
        "STAT",
        "SRVC",
        "DATE",
        "LATI",
        "LAT",
        "LATITUDE",
        "LONG",
        "LON",
        "LONGITUDE",
        "X",
        "Y",
        "XCOORD",
        "YCOORD",
        "X_COORD",
        "Y_COORD",
        "EASTING",
        "NORTHING",
        "GDAT",
        "HZCS",
    ];
    let well_items = file
        .well_items
        .iter()
        .filter(|i| keep.iter().any(|k| i.mnemonic.eq_ignore_ascii_case(k)))
        .cloned()
        .collect();
    let report = WellReport {
        elevation: elev,
        elevation_source,
        deviated,
        zones: setups,
        counts: out.counts,
        class_exponents: None,
        las_repairs: file.repairs.clone(),
    };
    Ok(WellOutput {
        name,
        table: Table {
            columns,
            well_items,
            params: file.params.clone(),
        },
        warnings,
        resolved,
        report,
        zone_of,
        rw,
        tvd_m,
    })
}

/// Every curve in `needed` must have been found: the first that was not is
/// the error (missing, or in an unknown unit). A curve in an unknown unit
/// that no method needs is only a warning.
fn check_needed(
    needed: &[LogicalCurve],
    found: &[ResolvedCurve],
    missing: &[CurveError],
    warnings: &mut Vec<String>,
) -> Result<(), CurveError> {
    for c in needed {
        if found.iter().any(|r| r.logical == *c) {
            continue;
        }
        let e = missing.iter().find(|e| match e {
            CurveError::Missing { curve, .. } | CurveError::UnknownUnit { curve, .. } => curve == c,
            CurveError::UnknownDepthUnit { .. } => false,
        });
        if let Some(e) = e {
            return Err(e.clone());
        }
    }
    for e in missing {
        if let CurveError::UnknownUnit { curve, .. } = e {
            if !needed.contains(curve) {
                warnings.push(format!("{e}; curve not used"));
            }
        }
    }
    Ok(())
}

/// Bit size from the header's ~P BS when the file has no bit-size curve:
/// set in every zone that does not give `bit-size-in` itself.
fn bit_size_from_header(file: &LasFile, depth_unit: DepthUnit, setups: &mut [ZoneSetup]) {
    let Some(bs) = file.param("BS").and_then(|i| {
        i.value
            .trim()
            .parse::<f64>()
            .ok()
            .map(|v| (v, i.unit.clone()))
    }) else {
        return;
    };
    let conv = crate::units::Conversion::from_unit(Quantity::Diameter, &bs.1, depth_unit);
    for s in setups {
        if s.params.bit_size_in.is_none() {
            s.params.bit_size_in = conv.map(|c| bs.0 * c.factor);
        }
    }
}

/// The logs stage's output columns: depth, TVDSS, the chain's curves, FLAG,
/// then every input log found (its mnemonic and unit in the description);
/// also which mnemonic and unit each logical curve was read from.
fn output_columns(
    depth_unit: DepthUnit,
    md: Vec<f64>,
    tvdss: Vec<f64>,
    out: &mut chain::Outputs,
    found: Vec<ResolvedCurve>,
) -> (Vec<OutColumn>, Vec<(LogicalCurve, String, String)>) {
    let col = |c: Col, values: Vec<f64>| OutColumn::new(c, depth_unit, values);
    let mut columns = vec![
        col(Col::Depth, md),
        col(Col::Tvdss, tvdss),
        col(Col::Vsh, std::mem::take(&mut out.vsh)),
        col(Col::Phit, std::mem::take(&mut out.phit)),
        col(Col::Phie, std::mem::take(&mut out.phie)),
        col(Col::Sw, std::mem::take(&mut out.sw)),
        col(Col::Bvw, std::mem::take(&mut out.bvw)),
        col(Col::Flag, out.flag.iter().map(|&f| f64::from(f)).collect())
            .described(flag_description(FLAG_CLIPPED)),
    ];
    let resolved = found
        .iter()
        .map(|r| (r.logical, r.mnemonic.clone(), r.source_unit.clone()))
        .collect();
    for r in found {
        let c = Col::Input(r.logical);
        let description = format!(
            "{} (FROM {} {})",
            c.description(),
            r.mnemonic,
            r.source_unit
        );
        columns.push(OutColumn::new(c, depth_unit, r.values).described(description));
    }
    (columns, resolved)
}

/// TVDSS (project unit, NaN without an elevation) and TVD in metres of each
/// measured depth, and whether a survey made the well deviated.
struct DepthRef {
    tvdss: Vec<f64>,
    tvd_m: Vec<f64>,
    deviated: bool,
}

/// The well's depth reference: TVD from its survey (vertical without one),
/// TVDSS from its elevation.
fn depth_reference(
    md: &[f64],
    elev: Option<f64>,
    names: &[&str],
    ctx: &RunContext,
) -> Result<DepthRef, WellError> {
    let config = &ctx.config;
    let depth_unit = config.project.depth_unit;
    let (tvd, deviated) = match config.depth.for_well(names).and_then(|w| w.survey.as_ref()) {
        Some(p) => (
            tvd_at(md, &read_survey(&config.resolve_path(p), depth_unit)?),
            true,
        ),
        None => (md.to_vec(), false),
    };
    let tvdss: Vec<f64> = match elev {
        Some(e) => tvd.iter().map(|t| t - e).collect(),
        None => vec![f64::NAN; md.len()],
    };
    let to_m = depth_unit.factor_to(DepthUnit::Metre);
    let tvd_m: Vec<f64> = tvd.iter().map(|t| t * to_m).collect();
    Ok(DepthRef {
        tvdss,
        tvd_m,
        deviated,
    })
}

/// A zone's parameters checked against what its methods need, with the
/// gamma-ray picks (from the zone's own GR percentiles when not set) and the
/// geothermal gradient (from the header's BHT and TD when not set).
fn zone_setup(
    path: &Path,
    file: &LasFile,
    zone: &str,
    params: crate::config::params::ZoneParams,
    gr_in_zone: &[f64],
    tvd_m: &[f64],
) -> Result<ZoneSetup, WellError> {
    let perr = |message: String| WellError::Params {
        path: path.to_path_buf(),
        zone: zone.to_string(),
        message,
    };
    let [lo, hi] = params.gr_pick_percentiles;
    let (clean, shale, picked) = match (params.gr_clean_gapi, params.gr_shale_gapi) {
        (Some(c), Some(s)) => (c, s, false),
        (c, s) => (
            c.unwrap_or_else(|| crate::stats::percentile(gr_in_zone, lo)),
            s.unwrap_or_else(|| crate::stats::percentile(gr_in_zone, hi)),
            true,
        ),
    };
    if picked && !gr_in_zone.is_empty() && (shale <= clean || shale.is_nan() || clean.is_nan()) {
        return Err(perr(format!(
            "gamma-ray picks are not usable (clean {clean}, shale {shale}); set gr-clean-gapi and gr-shale-gapi"
        )));
    }
    if params.rw_ohmm.is_none() {
        return Err(perr(
            "rw-ohmm is not set (at any level of [parameters])".into(),
        ));
    }
    let density_method = params.porosity_method.uses_density();
    let neutron_method = params.porosity_method.uses_neutron();
    if (density_method || params.neutron_density_shale) && params.rho_shale_gcc.is_none() {
        return Err(perr(
            "rho-shale-gcc is needed for the density-based porosity and shale corrections".into(),
        ));
    }
    if (neutron_method || params.neutron_density_shale) && params.nphi_shale_vv.is_none() {
        return Err(perr(
            "nphi-shale-vv is needed for the neutron-density methods".into(),
        ));
    }
    if !density_method && params.dt_shale_usft.is_none() {
        return Err(perr(
            "dt-shale-usft is needed for the sonic porosity methods".into(),
        ));
    }
    if params.saturation_model != SaturationModel::Archie && params.rsh_ohmm.is_none() {
        return Err(perr(format!(
            "rsh-ohmm is needed for the {} model",
            params.saturation_model.name()
        )));
    }
    let gradient = match (params.rw_temperature_c, params.geothermal_gradient_c_per_m) {
        (None, _) => None,
        (Some(_), Some(g)) => Some(g),
        (Some(_), None) => {
            let bht = header_temperature_c(file, "BHT").ok_or_else(|| {
                perr("rw-temperature-c is set, but there is no geothermal-gradient-c-per-m and no BHT (DEGC or DEGF) in the header".into())
            })?;
            let td_m = file
                .param("TD")
                .and_then(|i| {
                    let v: f64 = i.value.trim().parse().ok()?;
                    let u = DepthUnit::from_las(if i.unit.is_empty() {
                        file.index_unit()
                    } else {
                        &i.unit
                    })?;
                    Some(v * u.factor_to(DepthUnit::Metre))
                })
                .or_else(|| tvd_m.last().copied())
                .unwrap_or(f64::NAN);
            Some(crate::petro::water::gradient_from_bht(
                bht,
                params.surface_temperature_c,
                td_m,
            ))
        }
    };
    Ok(ZoneSetup {
        name: zone.to_string(),
        params,
        gr_clean_gapi: clean,
        gr_shale_gapi: shale,
        gr_picked: picked,
        gradient_c_per_m: gradient,
    })
}

/// The logs a zone's methods read beyond GR and deep resistivity.
fn curves_needed(params: &crate::config::params::ZoneParams) -> Vec<LogicalCurve> {
    let density_method = params.porosity_method.uses_density();
    let neutron_method = params.porosity_method.uses_neutron();
    let mut needed = Vec::new();
    if density_method || params.neutron_density_shale {
        needed.push(LogicalCurve::BulkDensity);
    }
    if neutron_method || params.neutron_density_shale {
        needed.push(LogicalCurve::NeutronPorosity);
    }
    if !density_method {
        needed.push(LogicalCurve::CompressionalSlowness);
    }
    needed
}

impl WellOutput {
    /// Each zone's Archie a, m, n by class (class 1 first), as
    /// [`crate::config::params::Parameters::class_archie`] resolves them.
    fn class_archie_by_zone(
        &self,
        params: &crate::config::params::Parameters,
        max_class: u8,
    ) -> Vec<(String, Vec<ArchieParams>)> {
        self.report
            .zones
            .iter()
            .map(|z| {
                (
                    z.name.clone(),
                    params.class_archie(&z.name, z.params.archie, max_class),
                )
            })
            .collect()
    }

    /// SW at every depth as if the rock there were of each class in turn:
    /// row-major, `classes` values per depth (class 1 first), each with that
    /// class's Archie a, m, n in the depth's zone and the zone's saturation
    /// model and Rw ([`chain::saturation_by_class`]). NaN where the chain
    /// gave no SW. Reads the chain's SW (SW_FIXED once the class exponents
    /// are applied); the well is not changed.
    pub fn sw_for_each_class(
        &self,
        params: &crate::config::params::Parameters,
        classes: u8,
    ) -> Vec<f64> {
        let n = self.table.n_rows();
        let k = usize::from(classes);
        let nan = vec![f64::NAN; n];
        let archie: Vec<Vec<ArchieParams>> = self
            .class_archie_by_zone(params, classes)
            .into_iter()
            .map(|(_, t)| t)
            .collect();
        let sw_fixed = self
            .table
            .get(Col::SwFixed)
            .or_else(|| self.table.get(Col::Sw))
            .unwrap_or(&nan);
        let mut out = vec![f64::NAN; n * k];
        let mut scratch = vec![0u32; n];
        for c in 1..=classes {
            let class = vec![f64::from(c); n];
            let inputs = class_sw_inputs(self, &self.table, &nan, sw_fixed, &class);
            let sw =
                chain::saturation_by_class(&inputs, &self.report.zones, &archie, &mut scratch).sw;
            for (i, v) in sw.into_iter().enumerate() {
                out[i * k + usize::from(c) - 1] = v;
            }
        }
        out
    }

    /// Recompute SW (and BVW) with Archie a, m, n looked up at each depth from
    /// its CLASS ([`chain::saturation_by_class`]); the chain's SW, with the
    /// zone's own exponents, is kept beside it as SW_FIXED. Needs the CLASS
    /// column; without it every interpreted depth keeps the zone's exponents
    /// and is flagged 64. `max_class` is the scheme's class count.
    pub fn apply_class_exponents(
        &mut self,
        params: &crate::config::params::Parameters,
        max_class: u8,
    ) {
        let n = self.table.n_rows();
        let nan = vec![f64::NAN; n];
        let by_zone = self.class_archie_by_zone(params, max_class);
        let archie: Vec<Vec<ArchieParams>> = by_zone.iter().map(|(_, t)| t.clone()).collect();
        let mut flag: Vec<u32> = self
            .table
            .get(Col::Flag)
            .map_or_else(|| vec![0; n], |f| f.iter().map(|&v| v as u32).collect());
        let (sw, class) = (
            self.table.get(Col::Sw).unwrap_or(&nan),
            self.table.get(Col::Class).unwrap_or(&nan),
        );
        let inputs = class_sw_inputs(self, &self.table, &nan, sw, class);
        let result = chain::saturation_by_class(&inputs, &self.report.zones, &archie, &mut flag);
        let table = &mut self.table;
        let sw_fixed = table.get(Col::Sw).map(<[f64]>::to_vec).unwrap_or_default();
        if let Some(c) = table.column_mut(Col::Sw) {
            c.values = result.sw;
            c.description = "WATER SATURATION, ARCHIE EXPONENTS BY CLASS".into();
        }
        if let Some(c) = table.column_mut(Col::Bvw) {
            c.values = result.bvw;
        }
        if let Some(c) = table.column_mut(Col::Flag) {
            c.values = flag.iter().map(|&f| f64::from(f)).collect();
            c.description = flag_description(FLAG_NO_CLASS_EXPONENTS);
        }
        let at = table
            .position(Col::Sw)
            .map_or(table.columns.len(), |i| i + 1);
        let depth_unit = crate::units::DepthUnit::Metre; // SW_FIXED has no depth unit
        table
            .columns
            .insert(at, OutColumn::new(Col::SwFixed, depth_unit, sw_fixed));
        self.report.class_exponents = Some(ClassExponentCounts {
            no_class: result.no_class,
            clipped: result.clipped,
            by_zone,
        });
    }
}

/// What the class-aware saturation reads of a well: its zones and Rw, and
/// RT, VSH and PHIE from `table` (`nan` where one is missing), with the SW to
/// start from and the class at each depth.
fn class_sw_inputs<'a>(
    w: &'a WellOutput,
    table: &'a Table,
    nan: &'a [f64],
    sw_fixed: &'a [f64],
    class: &'a [f64],
) -> chain::ClassSwInputs<'a> {
    let col = |c: Col| table.get(c).unwrap_or(nan);
    chain::ClassSwInputs {
        zone_of: &w.zone_of,
        rw: &w.rw,
        rt: col(Col::Input(LogicalCurve::DeepResistivity)),
        vsh: col(Col::Vsh),
        phie: col(Col::Phie),
        sw_fixed,
        class,
    }
}

/// The file name without extension, as a fallback well name.
pub fn stem_of(path: &Path) -> String {
    path.file_stem()
        .map_or_else(|| "well".into(), |s| s.to_string_lossy().into_owned())
}
