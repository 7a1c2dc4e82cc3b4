//! Interpretation parameters, set field-wide, per zone, or per well and zone,
//! the most specific winning.
//!
//! ```toml
//! [parameters.field]               # every well, every zone
//! archie-m = 2.0
//! [parameters.zone."Upper Kell"]   # one zone, every well
//! archie-m = 1.9
//! [parameters.well-zone."Tarnby-3"."Upper Kell"]   # one zone of one well
//! gr-clean-gapi = 30
//! ```
//!
//! Archie's a, m and n can also be set per hydraulic class, field-wide or in
//! one zone; at a classed depth the class's value wins over every level above:
//!
//! ```toml
//! [parameters.class."1"]                        # class 1 in every zone
//! archie-m = 2.1
//! [parameters.zone-class."Upper Kell"."1"]      # class 1 in one zone
//! archie-n = 2.2
//! ```
//!
//! Every key is optional at each level; [`ParamSet::merge`] lays the levels
//! over each other and [`ParamSet::resolve`] fills the defaults and refuses a
//! missing required value with its key. Values are validated when the config
//! loads (e.g. matrix density below fluid density, m ≤ 0, Rw ≤ 0), with the key's
//! full name.

use std::collections::BTreeMap;

use serde::Deserialize;

use crate::petro::porosity::Matrix;
use crate::petro::saturation::{ArchieParams, SaturationModel};
use crate::petro::shale::ShaleModel;
use crate::stats::dist::{Dist, Num};

/// How porosity is computed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum PorosityMethod {
    /// Density porosity.
    Density,
    /// Mean of neutron and density porosity (liquid-filled).
    NeutronDensity,
    /// Root-mean-square of neutron and density porosity (gas).
    NeutronDensityGas,
    /// Sonic, Wyllie time average.
    SonicWyllie,
    /// Sonic, Raymer-Hunt-Gardner full form.
    SonicRhg,
}

impl PorosityMethod {
    /// Whether the method reads bulk density.
    pub fn uses_density(self) -> bool {
        matches!(
            self,
            PorosityMethod::Density
                | PorosityMethod::NeutronDensity
                | PorosityMethod::NeutronDensityGas
        )
    }

    /// Whether the method reads neutron porosity.
    pub fn uses_neutron(self) -> bool {
        matches!(
            self,
            PorosityMethod::NeutronDensity | PorosityMethod::NeutronDensityGas
        )
    }

    /// Whether the method reads compressional slowness.
    pub fn uses_sonic(self) -> bool {
        matches!(self, PorosityMethod::SonicWyllie | PorosityMethod::SonicRhg)
    }
}

/// One level of parameters; every field optional. Units are in the key names.
#[derive(Debug, Clone, Default, Deserialize, PartialEq)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct ParamSet {
    /// Clean-sand gamma ray, gAPI. Absent: picked per well and zone as the
    /// `gr-pick-percentiles` low percentile of GR (reported).
    pub gr_clean_gapi: Option<Num>,
    /// Shale gamma ray, gAPI. Absent: picked as the high percentile.
    pub gr_shale_gapi: Option<Num>,
    /// Percentiles for automatic picks, [low, high], each 0-100. Default [5, 95] (common practice).
    pub gr_pick_percentiles: Option<[f64; 2]>,
    /// Gamma-ray transform. Default "linear".
    pub shale_model: Option<ShaleModel>,
    /// Also estimate VSH from neutron-density separation and take the minimum. Default false.
    pub neutron_density_shale: Option<bool>,
    /// Matrix preset: sandstone (2.65 g/cm3, 55.5 us/ft), limestone (2.71, 47.6), dolomite (2.87, 43.5). Default sandstone.
    pub matrix: Option<Matrix>,
    /// Matrix density, g/cm3 (overrides the preset).
    pub rho_matrix_gcc: Option<Num>,
    /// Pore-fluid (filtrate) density, g/cm3. Default 1.0.
    pub rho_fluid_gcc: Option<Num>,
    /// Shale bulk density, g/cm3. Required for the density-based porosity methods.
    pub rho_shale_gcc: Option<Num>,
    /// Neutron porosity read in shale, v/v. Required for neutron-density methods and neutron-density shale.
    pub nphi_shale_vv: Option<Num>,
    /// Matrix transit time, us/ft (overrides the preset).
    pub dt_matrix_usft: Option<Num>,
    /// Pore-fluid transit time, us/ft. Default 189.
    pub dt_fluid_usft: Option<Num>,
    /// Shale transit time, us/ft. Required for the sonic methods.
    pub dt_shale_usft: Option<Num>,
    /// Porosity method. Default "density".
    pub porosity_method: Option<PorosityMethod>,
    /// Upper bound of total porosity, v/v. Default 0.5.
    pub phi_max_vv: Option<Num>,
    /// Formation-water resistivity, ohm.m. Required.
    pub rw_ohmm: Option<Num>,
    /// Temperature at which `rw-ohmm` is given, °C. Absent: Rw is taken as at formation temperature.
    pub rw_temperature_c: Option<Num>,
    /// Surface temperature, °C. Default 15.
    pub surface_temperature_c: Option<Num>,
    /// Geothermal gradient, °C per metre of TVD. Absent: from the header's BHT and TD, if any.
    pub geothermal_gradient_c_per_m: Option<Num>,
    /// Archie tortuosity factor a. Default 1.
    pub archie_a: Option<Num>,
    /// Archie cementation exponent m. Default 2.
    pub archie_m: Option<Num>,
    /// Archie saturation exponent n. Default 2.
    pub archie_n: Option<Num>,
    /// Saturation model. Default "archie".
    pub saturation_model: Option<SaturationModel>,
    /// Shale resistivity, ohm.m. Required for the shaly-sand models.
    pub rsh_ohmm: Option<Num>,
    /// Bad hole when caliper exceeds bit size by more than this, in. Default 1.0 (common practice).
    pub bad_hole_in: Option<Num>,
    /// Bit size, in, for wells without a BS curve or ~P BS value.
    pub bit_size_in: Option<Num>,
}

/// `[parameters]`: the three levels.
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct Parameters {
    /// `[parameters.field]`: every well, every zone.
    #[serde(default)]
    pub field: ParamSet,
    /// By zone name.
    #[serde(default)]
    pub zone: BTreeMap<String, ParamSet>,
    /// By well name, then zone name.
    #[serde(default)]
    pub well_zone: BTreeMap<String, BTreeMap<String, ParamSet>>,
    /// Archie a, m, n by hydraulic class number ("1", "2", ...), every zone.
    #[serde(default)]
    pub class: BTreeMap<String, ClassParamSet>,
    /// Archie a, m, n by zone name, then class number.
    #[serde(default)]
    pub zone_class: BTreeMap<String, BTreeMap<String, ClassParamSet>>,
}

/// The keys that may vary with hydraulic class: Archie's a, m and n.
#[derive(Debug, Clone, Copy, Default, Deserialize, PartialEq)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct ClassParamSet {
    /// Archie tortuosity factor a for this class.
    pub archie_a: Option<Num>,
    /// Archie cementation exponent m for this class.
    pub archie_m: Option<Num>,
    /// Archie saturation exponent n for this class.
    pub archie_n: Option<Num>,
}

impl ClassParamSet {
    /// `self` laid over `base`, key by key.
    pub fn over(&self, base: ArchieParams) -> ArchieParams {
        ArchieParams {
            a: v(self.archie_a).unwrap_or(base.a),
            m: v(self.archie_m).unwrap_or(base.m),
            n: v(self.archie_n).unwrap_or(base.n),
        }
    }

    fn slots(&mut self) -> Vec<(&'static str, &mut Option<Num>)> {
        vec![
            ("archie-a", &mut self.archie_a),
            ("archie-m", &mut self.archie_m),
            ("archie-n", &mut self.archie_n),
        ]
    }

    fn validate(&self, prefix: &str) -> Result<(), (String, String)> {
        for (k, n) in [
            ("archie-a", self.archie_a),
            ("archie-m", self.archie_m),
            ("archie-n", self.archie_n),
        ] {
            check_distribution(prefix, k, n)?;
            if let Some(v) = v(n) {
                if !(v.is_finite() && v > 0.0) {
                    return Err((
                        format!("{prefix}.{k}"),
                        format!("{v} must be a number above 0"),
                    ));
                }
            }
        }
        Ok(())
    }
}

/// The number a parameter holds (a distribution's best value).
fn v(n: Option<Num>) -> Option<f64> {
    n.map(|n| n.value)
}

/// The keys whose value may be a distribution, with the physical range its
/// samples are kept in (the distribution is truncated to it): the inputs of
/// shale volume, porosity and Archie-family saturation. Other keys (cutoffs
/// of bad hole, temperatures, bounds) are taken as exact.
pub const SAMPLED_KEYS: [(&str, f64, f64); 13] = [
    ("gr-clean-gapi", 0.0, 1000.0),
    ("gr-shale-gapi", 0.0, 1000.0),
    ("rho-matrix-gcc", 1.5, 3.2),
    ("rho-fluid-gcc", 0.5, 1.5),
    ("rho-shale-gcc", 1.5, 3.2),
    ("nphi-shale-vv", 0.0, 1.0),
    ("dt-matrix-usft", 40.0, 250.0),
    ("dt-fluid-usft", 40.0, 250.0),
    ("dt-shale-usft", 40.0, 250.0),
    ("rw-ohmm", 1e-6, f64::INFINITY),
    ("archie-a", 1e-6, f64::INFINITY),
    ("archie-m", 1e-6, f64::INFINITY),
    ("archie-n", 1e-6, f64::INFINITY),
];

/// The physical range of a sampled key (`None`: the key cannot be sampled).
pub fn sampled_range(key: &str) -> Option<(f64, f64)> {
    SAMPLED_KEYS
        .iter()
        .chain(std::iter::once(&("rsh-ohmm", 1e-6, f64::INFINITY)))
        .find(|(k, _, _)| *k == key)
        .map(|&(_, lo, hi)| (lo, hi))
}

/// Refuse a distribution that is not one, or on a key that is not sampled,
/// or that its key's physical range cuts away; (key, message).
fn check_distribution(prefix: &str, key: &str, n: Option<Num>) -> Result<(), (String, String)> {
    let Some(d) = n.and_then(|n| n.dist) else {
        return Ok(());
    };
    let full = format!("{prefix}.{key}");
    d.check().map_err(|m| (full.clone(), m))?;
    let Some((lo, hi)) = sampled_range(key) else {
        return Err((
            full,
            "a distribution is not taken for this key (it is held exact): give a number".into(),
        ));
    };
    if d.quantile_within(0.5, lo, hi).is_none() {
        return Err((
            full,
            format!("the distribution lies outside the key's physical range {lo}..{hi}"),
        ));
    }
    Ok(())
}

/// One distribution of the config: a random input of the Monte Carlo.
#[derive(Debug, Clone, PartialEq)]
pub struct Variable {
    /// The key's full name, e.g. `parameters.zone."Upper Kell".archie-m`.
    pub name: String,
    /// The key, e.g. `archie-m`.
    pub key: &'static str,
    /// The table the key is in, e.g. `parameters.zone."Upper Kell"`.
    pub table: String,
    /// The distribution.
    pub dist: Dist,
}

/// A class key of `[parameters.class]`: a class number 1-255.
fn class_key(prefix: &str, k: &str) -> Result<u8, (String, String)> {
    match k.trim().parse::<u8>() {
        Ok(c) if c >= 1 => Ok(c),
        _ => Err((
            format!("{prefix}.\"{k}\""),
            "a class key must be a class number from 1 to 255 (class 1 is the poorest rock)".into(),
        )),
    }
}

fn default_archie() -> ArchieParams {
    ArchieParams::DEFAULT
}

/// Parameters of one well and zone with every default filled in.
#[derive(Debug, Clone, PartialEq, serde::Serialize, serde::Deserialize)]
pub struct ZoneParams {
    /// `gr-clean-gapi`: clean-sand gamma ray, gAPI; `None`: picked from the well's GR.
    pub gr_clean_gapi: Option<f64>,
    /// `gr-shale-gapi`: shale gamma ray, gAPI; `None`: picked from the well's GR.
    pub gr_shale_gapi: Option<f64>,
    /// `gr-pick-percentiles`: [low, high] percentiles of the automatic GR picks, 0-100. Default [5, 95].
    pub gr_pick_percentiles: [f64; 2],
    /// `shale-model`: the gamma-ray transform to VSH. Default linear.
    pub shale_model: ShaleModel,
    /// `neutron-density-shale`: also take VSH from neutron-density separation, keeping the smaller. Default false.
    pub neutron_density_shale: bool,
    /// `rho-matrix-gcc`: matrix density, g/cm3. Default from the `matrix` preset (sandstone 2.65).
    pub rho_matrix_gcc: f64,
    /// `rho-fluid-gcc`: pore-fluid density, g/cm3. Default 1.0.
    pub rho_fluid_gcc: f64,
    /// `rho-shale-gcc`: shale bulk density, g/cm3; `None` when not set (the density methods then fail the well).
    pub rho_shale_gcc: Option<f64>,
    /// `nphi-shale-vv`: neutron porosity in shale, v/v; `None` when not set (neutron-density methods then fail the well).
    pub nphi_shale_vv: Option<f64>,
    /// `dt-matrix-usft`: matrix transit time, us/ft. Default from the `matrix` preset (sandstone 55.5).
    pub dt_matrix_usft: f64,
    /// `dt-fluid-usft`: pore-fluid transit time, us/ft. Default 189.
    pub dt_fluid_usft: f64,
    /// `dt-shale-usft`: shale transit time, us/ft; `None` when not set (the sonic methods then fail the well).
    pub dt_shale_usft: Option<f64>,
    /// `porosity-method`. Default density.
    pub porosity_method: PorosityMethod,
    /// `phi-max-vv`: upper bound of total porosity, v/v. Default 0.5.
    pub phi_max_vv: f64,
    /// `rw-ohmm`: formation-water resistivity, ohm.m; `None` when set at no level (the well then fails).
    pub rw_ohmm: Option<f64>,
    /// `rw-temperature-c`: temperature `rw-ohmm` is given at, °C; `None`: Rw is taken as at formation temperature.
    pub rw_temperature_c: Option<f64>,
    /// `surface-temperature-c`: surface temperature, °C. Default 15.
    pub surface_temperature_c: f64,
    /// `geothermal-gradient-c-per-m`: °C per metre of TVD; `None`: from the header's BHT and TD when needed.
    pub geothermal_gradient_c_per_m: Option<f64>,
    /// Not in the summary (written with the class table); a merged shard
    /// report gets the default here, never read after the wells are done.
    #[serde(skip, default = "default_archie")]
    pub archie: ArchieParams,
    /// `saturation-model`. Default archie.
    pub saturation_model: SaturationModel,
    /// `rsh-ohmm`: shale resistivity, ohm.m; `None` when not set (the shaly-sand models then fail the well).
    pub rsh_ohmm: Option<f64>,
    /// `bad-hole-in`: bad hole where caliper exceeds bit size by more than this, in. Default 1.0.
    pub bad_hole_in: f64,
    /// `bit-size-in`: bit size, in, where there is no BS curve; `None` when neither set nor in the ~P section (BS).
    pub bit_size_in: Option<f64>,
}

impl ZoneParams {
    /// Set a sampled key's value (a key of [`SAMPLED_KEYS`]; other keys are
    /// left as they are).
    pub fn set(&mut self, key: &str, value: f64) {
        match key {
            "gr-clean-gapi" => self.gr_clean_gapi = Some(value),
            "gr-shale-gapi" => self.gr_shale_gapi = Some(value),
            "rho-matrix-gcc" => self.rho_matrix_gcc = value,
            "rho-fluid-gcc" => self.rho_fluid_gcc = value,
            "rho-shale-gcc" => self.rho_shale_gcc = Some(value),
            "nphi-shale-vv" => self.nphi_shale_vv = Some(value),
            "dt-matrix-usft" => self.dt_matrix_usft = value,
            "dt-fluid-usft" => self.dt_fluid_usft = value,
            "dt-shale-usft" => self.dt_shale_usft = Some(value),
            "rw-ohmm" => self.rw_ohmm = Some(value),
            "archie-a" => self.archie.a = value,
            "archie-m" => self.archie.m = value,
            "archie-n" => self.archie.n = value,
            "rsh-ohmm" => self.rsh_ohmm = Some(value),
            _ => {}
        }
    }
}

/// Default percentiles of the automatic gamma-ray picks (common practice).
pub const DEFAULT_GR_PERCENTILES: [f64; 2] = [5.0, 95.0];
/// Default upper bound of total porosity, v/v (common practice: no reservoir rock exceeds it).
pub const DEFAULT_PHI_MAX: f64 = 0.5;
/// Default surface temperature, °C (common practice for a temperate climate).
pub const DEFAULT_SURFACE_TEMPERATURE_C: f64 = 15.0;
/// Default bad-hole tolerance, in (common practice).
pub const DEFAULT_BAD_HOLE_IN: f64 = 1.0;

macro_rules! merge_fields {
    ($base:expr, $over:expr, $($f:ident),*) => {
        ParamSet { $($f: $over.$f.clone().or_else(|| $base.$f.clone()),)* }
    };
}

impl ParamSet {
    /// `over` wins where it sets a key.
    pub fn merge(&self, over: &ParamSet) -> ParamSet {
        merge_fields!(
            self,
            over,
            gr_clean_gapi,
            gr_shale_gapi,
            gr_pick_percentiles,
            shale_model,
            neutron_density_shale,
            matrix,
            rho_matrix_gcc,
            rho_fluid_gcc,
            rho_shale_gcc,
            nphi_shale_vv,
            dt_matrix_usft,
            dt_fluid_usft,
            dt_shale_usft,
            porosity_method,
            phi_max_vv,
            rw_ohmm,
            rw_temperature_c,
            surface_temperature_c,
            geothermal_gradient_c_per_m,
            archie_a,
            archie_m,
            archie_n,
            saturation_model,
            rsh_ohmm,
            bad_hole_in,
            bit_size_in
        )
    }

    /// Every numeric key with its value, in declaration order.
    pub fn numbers(&self) -> [(&'static str, Option<Num>); 20] {
        [
            ("gr-clean-gapi", self.gr_clean_gapi),
            ("gr-shale-gapi", self.gr_shale_gapi),
            ("rho-matrix-gcc", self.rho_matrix_gcc),
            ("rho-fluid-gcc", self.rho_fluid_gcc),
            ("rho-shale-gcc", self.rho_shale_gcc),
            ("nphi-shale-vv", self.nphi_shale_vv),
            ("dt-matrix-usft", self.dt_matrix_usft),
            ("dt-fluid-usft", self.dt_fluid_usft),
            ("dt-shale-usft", self.dt_shale_usft),
            ("phi-max-vv", self.phi_max_vv),
            ("rw-ohmm", self.rw_ohmm),
            ("rw-temperature-c", self.rw_temperature_c),
            ("surface-temperature-c", self.surface_temperature_c),
            (
                "geothermal-gradient-c-per-m",
                self.geothermal_gradient_c_per_m,
            ),
            ("archie-a", self.archie_a),
            ("archie-m", self.archie_m),
            ("archie-n", self.archie_n),
            ("rsh-ohmm", self.rsh_ohmm),
            ("bad-hole-in", self.bad_hole_in),
            ("bit-size-in", self.bit_size_in),
        ]
    }

    /// The numeric keys as mutable slots, in the order of [`Self::numbers`].
    fn numbers_mut(&mut self) -> [&mut Option<Num>; 20] {
        [
            &mut self.gr_clean_gapi,
            &mut self.gr_shale_gapi,
            &mut self.rho_matrix_gcc,
            &mut self.rho_fluid_gcc,
            &mut self.rho_shale_gcc,
            &mut self.nphi_shale_vv,
            &mut self.dt_matrix_usft,
            &mut self.dt_fluid_usft,
            &mut self.dt_shale_usft,
            &mut self.phi_max_vv,
            &mut self.rw_ohmm,
            &mut self.rw_temperature_c,
            &mut self.surface_temperature_c,
            &mut self.geothermal_gradient_c_per_m,
            &mut self.archie_a,
            &mut self.archie_m,
            &mut self.archie_n,
            &mut self.rsh_ohmm,
            &mut self.bad_hole_in,
            &mut self.bit_size_in,
        ]
    }

    /// The random inputs that decide this (merged) set: (key, variable).
    pub fn vars(&self) -> Vec<(&'static str, usize)> {
        self.numbers()
            .into_iter()
            .filter_map(|(k, n)| Some((k, n?.var?)))
            .collect()
    }

    /// Fill defaults.
    pub fn resolve(&self) -> ZoneParams {
        let matrix = self.matrix.unwrap_or(Matrix::Sandstone);
        ZoneParams {
            gr_clean_gapi: v(self.gr_clean_gapi),
            gr_shale_gapi: v(self.gr_shale_gapi),
            gr_pick_percentiles: self.gr_pick_percentiles.unwrap_or(DEFAULT_GR_PERCENTILES),
            shale_model: self.shale_model.unwrap_or(ShaleModel::Linear),
            neutron_density_shale: self.neutron_density_shale.unwrap_or(false),
            rho_matrix_gcc: v(self.rho_matrix_gcc).unwrap_or(matrix.density()),
            rho_fluid_gcc: v(self.rho_fluid_gcc).unwrap_or(crate::petro::porosity::RHO_FLUID_FRESH),
            rho_shale_gcc: v(self.rho_shale_gcc),
            nphi_shale_vv: v(self.nphi_shale_vv),
            dt_matrix_usft: v(self.dt_matrix_usft).unwrap_or(matrix.transit_time()),
            dt_fluid_usft: v(self.dt_fluid_usft).unwrap_or(crate::petro::porosity::DT_FLUID_FRESH),
            dt_shale_usft: v(self.dt_shale_usft),
            porosity_method: self.porosity_method.unwrap_or(PorosityMethod::Density),
            phi_max_vv: v(self.phi_max_vv).unwrap_or(DEFAULT_PHI_MAX),
            rw_ohmm: v(self.rw_ohmm),
            rw_temperature_c: v(self.rw_temperature_c),
            surface_temperature_c: v(self.surface_temperature_c)
                .unwrap_or(DEFAULT_SURFACE_TEMPERATURE_C),
            geothermal_gradient_c_per_m: v(self.geothermal_gradient_c_per_m),
            archie: ArchieParams {
                a: v(self.archie_a).unwrap_or(ArchieParams::DEFAULT.a),
                m: v(self.archie_m).unwrap_or(ArchieParams::DEFAULT.m),
                n: v(self.archie_n).unwrap_or(ArchieParams::DEFAULT.n),
            },
            saturation_model: self.saturation_model.unwrap_or(SaturationModel::Archie),
            rsh_ohmm: v(self.rsh_ohmm),
            bad_hole_in: v(self.bad_hole_in).unwrap_or(DEFAULT_BAD_HOLE_IN),
            bit_size_in: v(self.bit_size_in),
        }
    }

    /// Refuse values outside their physical range; `prefix` is the table's
    /// key path (e.g. `parameters.zone."Upper Kell"`). Returns (key, message).
    pub fn validate(&self, prefix: &str) -> Result<(), (String, String)> {
        let key = |k: &str| format!("{prefix}.{k}");
        for (k, n) in self.numbers() {
            check_distribution(prefix, k, n)?;
        }
        let positive = [
            ("rw-ohmm", v(self.rw_ohmm)),
            ("rsh-ohmm", v(self.rsh_ohmm)),
            ("archie-a", v(self.archie_a)),
            ("archie-m", v(self.archie_m)),
            ("archie-n", v(self.archie_n)),
            ("rho-matrix-gcc", v(self.rho_matrix_gcc)),
            ("rho-fluid-gcc", v(self.rho_fluid_gcc)),
            ("rho-shale-gcc", v(self.rho_shale_gcc)),
            ("dt-matrix-usft", v(self.dt_matrix_usft)),
            ("dt-fluid-usft", v(self.dt_fluid_usft)),
            ("dt-shale-usft", v(self.dt_shale_usft)),
            ("phi-max-vv", v(self.phi_max_vv)),
            ("bit-size-in", v(self.bit_size_in)),
        ];
        for (k, v) in positive {
            if let Some(v) = v {
                if !(v.is_finite() && v > 0.0) {
                    return Err((key(k), format!("{v} must be a number above 0")));
                }
            }
        }
        if let (Some(c), Some(s)) = (v(self.gr_clean_gapi), v(self.gr_shale_gapi)) {
            if s <= c {
                return Err((
                    key("gr-shale-gapi"),
                    format!("{s} must be above gr-clean-gapi ({c})"),
                ));
            }
        }
        if let (Some(ma), Some(f)) = (v(self.rho_matrix_gcc), v(self.rho_fluid_gcc)) {
            if ma <= f {
                return Err((
                    key("rho-matrix-gcc"),
                    format!("{ma} must be above rho-fluid-gcc ({f})"),
                ));
            }
        }
        if let Some(f) = v(self.rho_fluid_gcc) {
            let ma = v(self.rho_matrix_gcc)
                .unwrap_or_else(|| self.matrix.unwrap_or(Matrix::Sandstone).density());
            if ma <= f {
                return Err((
                    key("rho-fluid-gcc"),
                    format!("{f} must be below the matrix density ({ma})"),
                ));
            }
        }
        if let Some([lo, hi]) = self.gr_pick_percentiles {
            if !(0.0..100.0).contains(&lo) || lo >= hi || hi > 100.0 || hi.is_nan() {
                return Err((
                    key("gr-pick-percentiles"),
                    format!("[{lo}, {hi}] must satisfy 0 <= low < high <= 100"),
                ));
            }
        }
        if let Some(v) = v(self.phi_max_vv) {
            if v > 1.0 {
                return Err((
                    key("phi-max-vv"),
                    format!("{v} is a fraction and must be at most 1"),
                ));
            }
        }
        if let Some(v) = v(self.nphi_shale_vv) {
            if !(0.0..=1.0).contains(&v) {
                return Err((
                    key("nphi-shale-vv"),
                    format!("{v} is a fraction and must be in 0-1"),
                ));
            }
        }
        Ok(())
    }
}

impl Parameters {
    /// Validate every level.
    pub fn validate(&self) -> Result<(), (String, String)> {
        self.field.validate("parameters.field")?;
        for (z, p) in &self.zone {
            p.validate(&format!("parameters.zone.\"{z}\""))?;
        }
        for (w, zones) in &self.well_zone {
            for (z, p) in zones {
                p.validate(&format!("parameters.well-zone.\"{w}\".\"{z}\""))?;
            }
        }
        for (c, p) in &self.class {
            class_key("parameters.class", c)?;
            p.validate(&format!("parameters.class.\"{c}\""))?;
        }
        for (z, classes) in &self.zone_class {
            let prefix = format!("parameters.zone-class.\"{z}\"");
            for (c, p) in classes {
                class_key(&prefix, c)?;
                p.validate(&format!("{prefix}.\"{c}\""))?;
            }
        }
        Ok(())
    }

    /// Number every distribution of the config, in a fixed order (field,
    /// zones, well-zones, classes, zone-classes; keys in declaration
    /// order), and list them: the Monte Carlo's random inputs.
    pub fn number_distributions(&mut self) -> Vec<Variable> {
        let mut vars: Vec<Variable> = Vec::new();
        let mut take = |table: String, slots: Vec<(&'static str, &mut Option<Num>)>| {
            for (key, slot) in slots {
                if let Some(n) = slot.as_mut() {
                    if let Some(dist) = n.dist {
                        n.var = Some(vars.len());
                        vars.push(Variable {
                            name: format!("{table}.{key}"),
                            key,
                            table: table.clone(),
                            dist,
                        });
                    }
                }
            }
        };
        let keys = ParamSet::default().numbers().map(|(k, _)| k);
        take(
            "parameters.field".into(),
            keys.iter().copied().zip(self.field.numbers_mut()).collect(),
        );
        for (z, p) in &mut self.zone {
            take(
                format!("parameters.zone.\"{z}\""),
                keys.iter().copied().zip(p.numbers_mut()).collect(),
            );
        }
        for (w, zones) in &mut self.well_zone {
            for (z, p) in zones {
                take(
                    format!("parameters.well-zone.\"{w}\".\"{z}\""),
                    keys.iter().copied().zip(p.numbers_mut()).collect(),
                );
            }
        }
        for (c, p) in &mut self.class {
            take(format!("parameters.class.\"{c}\""), p.slots());
        }
        for (z, classes) in &mut self.zone_class {
            for (c, p) in classes {
                take(format!("parameters.zone-class.\"{z}\".\"{c}\""), p.slots());
            }
        }
        vars
    }

    /// The random inputs of Archie a, m, n of every class 1..=`max_class` in
    /// `zone`, with the precedence of [`Self::class_archie`]: per class,
    /// (key, variable) of each key a class level sets with a distribution.
    pub fn class_archie_vars(&self, zone: &str, max_class: u8) -> Vec<Vec<(&'static str, usize)>> {
        (1..=max_class)
            .map(|c| {
                let levels = self.class_levels(zone, c);
                ["archie-a", "archie-m", "archie-n"]
                    .into_iter()
                    .enumerate()
                    .filter_map(|(i, key)| {
                        // the most specific level that sets the key decides it
                        let n = levels
                            .iter()
                            .rev()
                            .flatten()
                            .find_map(|cp| [cp.archie_a, cp.archie_m, cp.archie_n][i])?;
                        Some((key, n.var?))
                    })
                    .collect()
            })
            .collect()
    }

    /// Whether any Archie value is set per class.
    pub fn has_class_params(&self) -> bool {
        !self.class.is_empty() || self.zone_class.values().any(|m| !m.is_empty())
    }

    /// Archie a, m, n of every class 1..=`max_class` in `zone`, laid over the
    /// zone's own values `base`: zone-class wins over class, class over the
    /// zone. Index 0 of the result is class 1.
    pub fn class_archie(&self, zone: &str, base: ArchieParams, max_class: u8) -> Vec<ArchieParams> {
        (1..=max_class)
            .map(|c| {
                self.class_levels(zone, c)
                    .iter()
                    .flatten()
                    .fold(base, |p, cp| cp.over(p))
            })
            .collect()
    }

    /// Class `c`'s tables in `zone`, least specific first: `[parameters.class]`,
    /// then `[parameters.zone-class]` (each `None` when it does not name the class).
    fn class_levels(&self, zone: &str, c: u8) -> [Option<ClassParamSet>; 2] {
        let by_class = |m: &BTreeMap<String, ClassParamSet>| {
            m.iter()
                .find(|(k, _)| k.trim().parse::<u8>() == Ok(c))
                .map(|(_, v)| *v)
        };
        let zone_map = self
            .zone_class
            .iter()
            .find(|(k, _)| k.eq_ignore_ascii_case(zone))
            .map(|(_, v)| v);
        [by_class(&self.class), zone_map.and_then(by_class)]
    }

    /// The merged parameters of a well (any of `well_names`) and zone.
    pub fn for_well_zone(&self, well_names: &[&str], zone: &str) -> ParamSet {
        let find = |m: &BTreeMap<String, ParamSet>, name: &str| {
            m.iter()
                .find(|(k, _)| k.eq_ignore_ascii_case(name))
                .map(|(_, v)| v.clone())
        };
        let mut p = self.field.clone();
        if let Some(z) = find(&self.zone, zone) {
            p = p.merge(&z);
        }
        let well = self
            .well_zone
            .iter()
            .find(|(k, _)| well_names.iter().any(|n| k.eq_ignore_ascii_case(n)));
        if let Some((_, zones)) = well {
            if let Some(z) = find(zones, zone) {
                p = p.merge(&z);
            }
        }
        p
    }
}

#[cfg(test)]
mod tests {
    /// Class values win over the zone's, zone-class over class, key by key;
    /// a class key that is not a class number is refused with its key.
    #[test]
    fn class_exponents_precedence_and_validation() {
        let p: Parameters = toml::from_str(
            r#"
            [field]
            archie-m = 2.0
            [class."1"]
            archie-m = 2.1
            archie-n = 2.2
            [zone-class."Upper Kell"."1"]
            archie-n = 2.4
            "#,
        )
        .expect("parses");
        p.validate().expect("valid");
        let base = ArchieParams {
            a: 0.8,
            m: 2.0,
            n: 2.0,
        };
        let up = p.class_archie("upper kell", base, 2);
        assert_eq!(
            up[0],
            ArchieParams {
                a: 0.8,
                m: 2.1,
                n: 2.4
            }
        );
        assert_eq!(up[1], base);
        let low = p.class_archie("Lower Kell", base, 2);
        assert_eq!(
            low[0],
            ArchieParams {
                a: 0.8,
                m: 2.1,
                n: 2.2
            }
        );
        assert!(p.has_class_params());
        let bad: Parameters = toml::from_str("[class.\"0\"]\narchie-m = 2.0").expect("parses");
        let (key, msg) = bad.validate().expect_err("class 0");
        assert_eq!(key, "parameters.class.\"0\"");
        assert!(msg.contains("class number"), "{msg}");
        let neg: Parameters = toml::from_str("[class.\"2\"]\narchie-n = -1").expect("parses");
        assert_eq!(
            neg.validate().expect_err("negative").0,
            "parameters.class.\"2\".archie-n"
        );
    }

    use super::*;

    fn parse(text: &str) -> Parameters {
        toml::from_str(text).expect("valid parameters")
    }

    #[test]
    fn most_specific_wins() {
        let p = parse(
            "[field]\narchie-m = 2.0\nrw-ohmm = 0.05\n[zone.Upper]\narchie-m = 1.9\n[well-zone.W-1.Upper]\narchie-m = 1.8\n",
        );
        assert_eq!(
            p.for_well_zone(&["W-2"], "Upper").archie_m.map(|n| n.value),
            Some(1.9)
        );
        assert_eq!(
            p.for_well_zone(&["w-1"], "upper").archie_m.map(|n| n.value),
            Some(1.8)
        );
        assert_eq!(
            p.for_well_zone(&["W-1"], "Lower").archie_m.map(|n| n.value),
            Some(2.0)
        );
        assert_eq!(
            p.for_well_zone(&["W-1"], "Upper").rw_ohmm.map(|n| n.value),
            Some(0.05)
        );
        let r = p.for_well_zone(&["W-9"], "Other").resolve();
        assert_eq!(
            r.archie,
            ArchieParams {
                a: 1.0,
                m: 2.0,
                n: 2.0
            }
        );
        assert_eq!(r.rho_matrix_gcc, 2.65);
    }

    #[test]
    fn physical_ranges_refused_with_the_key() {
        let p = parse("[zone.\"Upper Kell\"]\narchie-m = 0\n");
        assert_eq!(
            p.validate(),
            Err((
                "parameters.zone.\"Upper Kell\".archie-m".into(),
                "0 must be a number above 0".into()
            ))
        );
        let p = parse("[field]\nrho-matrix-gcc = 1.0\nrho-fluid-gcc = 1.1\n");
        assert_eq!(
            p.validate(),
            Err((
                "parameters.field.rho-matrix-gcc".into(),
                "1 must be above rho-fluid-gcc (1.1)".into()
            ))
        );
        let p = parse("[field]\nrw-ohmm = -0.1\n");
        assert_eq!(
            p.validate(),
            Err((
                "parameters.field.rw-ohmm".into(),
                "-0.1 must be a number above 0".into()
            ))
        );
        let p = parse("[well-zone.A.B]\ngr-clean-gapi = 100\ngr-shale-gapi = 50\n");
        assert_eq!(
            p.validate(),
            Err((
                "parameters.well-zone.\"A\".\"B\".gr-shale-gapi".into(),
                "50 must be above gr-clean-gapi (100)".into()
            ))
        );
    }
}
