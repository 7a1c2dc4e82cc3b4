//! `[capillary]`, `[pressures]`, `[compartments]` and `[saturation-height]`:
//! the inputs of the saturation-height model (lab capillary-pressure curves,
//! formation-pressure points, the free water level of each compartment).

use std::collections::BTreeMap;
use std::path::PathBuf;

use serde::Deserialize;

/// Interfacial tension and contact angle of a fluid system.
#[derive(Debug, Clone, Copy, Deserialize, serde::Serialize, PartialEq)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct FluidProps {
    /// Interfacial tension, dyn/cm (= mN/m).
    pub sigma_dyn_cm: f64,
    /// Contact angle, degrees (through the wetting phase; mercury 140).
    pub theta_deg: f64,
}

/// `[capillary]`: laboratory capillary-pressure curves.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct CapillaryConfig {
    /// CSV of lab curves: SAMPLE, WELL, DEPTH_MD, POROSITY_FRAC, PERM_MD,
    /// one of PC_PSI, PC_KPA, PC_MPA, PC_BAR, then SW_FRAC and SYSTEM
    /// (mercury-air, air-brine, oil-brine).
    pub file: PathBuf,
    /// σ and θ of a lab system, overriding the typical values, by system name
    /// ("mercury-air" 480 dyn/cm 140°, "air-brine" 72/0°, "oil-brine" 48/30°).
    #[serde(default)]
    pub lab: BTreeMap<String, FluidProps>,
    /// Accepted class of a plug by sample name, overriding the class of its
    /// own porosity and permeability (`"CAP-04" = 2`). The run suggests one
    /// when another class's curve fits a plug much better than its own.
    #[serde(default)]
    pub plug_class: BTreeMap<String, u8>,
    /// A plug is suggested for another class when that class's curve fits
    /// it with an RMS Sw at most this fraction of its own class's. Default 0.5.
    #[serde(default = "default_suggest_ratio")]
    pub suggest_ratio: f64,
}

fn default_suggest_ratio() -> f64 {
    0.5
}

/// `[pressures]`: formation-pressure points.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct PressuresConfig {
    /// CSV: WELL, TVDSS_M or TVDSS_FT (or DEPTH_MD with an optional
    /// DEPTH_UNIT, converted through the well's depth reference),
    /// PRESSURE_PSI, optional QUALITY.
    pub file: PathBuf,
    /// QUALITY values whose points are left out (case-insensitive). Default ["poor", "bad"].
    #[serde(default = "default_exclude_quality")]
    pub exclude_quality: Vec<String>,
    /// Least points in each fluid leg. Default 2.
    #[serde(default = "default_min_leg")]
    pub min_leg_points: usize,
}

fn default_exclude_quality() -> Vec<String> {
    vec!["poor".into(), "bad".into()]
}
fn default_min_leg() -> usize {
    2
}

/// `[compartments.NAME]`: a pressure compartment with one free water level.
#[derive(Debug, Clone, Deserialize, Default)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct CompartmentConfig {
    /// Wells of the compartment (LAS well name or file stem). Absent: every
    /// well that no other compartment lists (at most one compartment may omit it).
    pub wells: Option<Vec<String>>,
    /// Free water level set directly, TVDSS in the project depth unit. It
    /// wins over the pressure fit, which is still reported.
    pub fwl_tvdss: Option<f64>,
    /// One standard deviation of the free water level for the Monte Carlo
    /// ([`crate::uncertainty`]), project depth unit. Absent: the pressure
    /// fit's standard error when the FWL comes from pressures; a FWL set by
    /// `fwl-tvdss` without it is held exact.
    pub fwl_sd: Option<f64>,
    /// Depth (TVDSS, project depth unit) separating the hydrocarbon leg
    /// (at or above) from the water leg. Absent: the split with the least
    /// total squared residual.
    pub split_tvdss: Option<f64>,
    /// Formation-water density, g/cm3. Absent: from the water leg's gradient.
    pub rho_water_gcc: Option<f64>,
    /// Hydrocarbon density, g/cm3. Absent: from the hydrocarbon leg's gradient.
    pub rho_hc_gcc: Option<f64>,
}

/// `[saturation-height]`: the saturation-height model at every depth.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct SatHeightConfig {
    /// Reservoir σ and θ. Default oil-brine at reservoir conditions, 30 dyn/cm
    /// and 30° (typical values, from memory; formulas.md §8.2).
    #[serde(default)]
    pub reservoir: Option<FluidProps>,
    /// A well is reported as possibly under another free water level when its
    /// mean SW − SWH above the FWL differs from the median of its
    /// neighbours' means by more than this, v/v. Default 0.05.
    #[serde(default = "default_bias")]
    pub bias_threshold_vv: f64,
}

fn default_bias() -> f64 {
    0.05
}

impl Default for SatHeightConfig {
    fn default() -> Self {
        SatHeightConfig {
            reservoir: None,
            bias_threshold_vv: default_bias(),
        }
    }
}

fn check_fluid(key: &str, f: &FluidProps) -> Result<(), (String, String)> {
    if !(f.sigma_dyn_cm.is_finite() && f.sigma_dyn_cm > 0.0) {
        return Err((
            format!("{key}.sigma-dyn-cm"),
            format!("{} must be a number above 0", f.sigma_dyn_cm),
        ));
    }
    if !((0.0..=180.0).contains(&f.theta_deg) && (f.theta_deg - 90.0).abs() > 1e-6) {
        return Err((
            format!("{key}.theta-deg"),
            format!(
                "{} must be in 0-180 and not 90 (no capillary pressure at 90°)",
                f.theta_deg
            ),
        ));
    }
    Ok(())
}

/// Validate the saturation-height tables; `has_classes` says whether
/// `[classes]` is set (the model is per class). Returns (key, message).
pub fn validate(
    capillary: Option<&CapillaryConfig>,
    pressures: Option<&PressuresConfig>,
    compartments: &BTreeMap<String, CompartmentConfig>,
    sat: &SatHeightConfig,
    has_classes: bool,
) -> Result<(), (String, String)> {
    if let Some(c) = capillary {
        if !has_classes {
            return Err((
                "capillary".into(),
                "the J-functions are fitted per hydraulic class: [capillary] needs [classes]"
                    .into(),
            ));
        }
        for (name, f) in &c.lab {
            if FluidSystem::parse_lab(name).is_none() {
                return Err((
                    format!("capillary.lab.\"{name}\""),
                    "not a lab system: use mercury-air, air-brine or oil-brine".into(),
                ));
            }
            check_fluid(&format!("capillary.lab.\"{name}\""), f)?;
        }
        for (s, class) in &c.plug_class {
            if *class == 0 {
                return Err((
                    format!("capillary.plug-class.\"{s}\""),
                    "class numbers start at 1".into(),
                ));
            }
        }
        if !(c.suggest_ratio > 0.0 && c.suggest_ratio < 1.0) {
            return Err((
                "capillary.suggest-ratio".into(),
                format!("{} must be above 0 and below 1", c.suggest_ratio),
            ));
        }
    }
    if let Some(p) = pressures {
        if p.min_leg_points < 2 {
            return Err((
                "pressures.min-leg-points".into(),
                format!("{} is below 2: a line needs two points", p.min_leg_points),
            ));
        }
    }
    if let Some(r) = &sat.reservoir {
        check_fluid("saturation-height.reservoir", r)?;
    }
    if !(sat.bias_threshold_vv > 0.0 && sat.bias_threshold_vv < 1.0) {
        return Err((
            "saturation-height.bias-threshold-vv".into(),
            format!("{} must be above 0 and below 1", sat.bias_threshold_vv),
        ));
    }
    let mut seen: BTreeMap<String, &str> = BTreeMap::new();
    let mut catch_all: Option<&str> = None;
    for (name, c) in compartments {
        let key = format!("compartments.\"{name}\"");
        match &c.wells {
            None => {
                if let Some(other) = catch_all {
                    return Err((
                        format!("{key}.wells"),
                        format!(
                            "compartments `{other}` and `{name}` both omit `wells`; at most one may take the unlisted wells"
                        ),
                    ));
                }
                catch_all = Some(name);
            }
            Some(list) => {
                for w in list {
                    if let Some(other) = seen.insert(w.to_ascii_lowercase(), name) {
                        return Err((
                            format!("{key}.wells"),
                            format!("well `{w}` is also in compartment `{other}`"),
                        ));
                    }
                }
            }
        }
        for (k, v) in [("fwl-tvdss", c.fwl_tvdss), ("split-tvdss", c.split_tvdss)] {
            if v.is_some_and(|v| !v.is_finite()) {
                return Err((format!("{key}.{k}"), "not a number".into()));
            }
        }
        if let Some(sd) = c.fwl_sd.filter(|v| !(v.is_finite() && *v >= 0.0)) {
            return Err((
                format!("{key}.fwl-sd"),
                format!("{sd} must be a standard deviation: a number 0 or above"),
            ));
        }
        for (k, v) in [
            ("rho-water-gcc", c.rho_water_gcc),
            ("rho-hc-gcc", c.rho_hc_gcc),
        ] {
            if v.is_some_and(|v| !(v.is_finite() && v > 0.0 && v < 3.0)) {
                return Err((
                    format!("{key}.{k}"),
                    format!("{} must be a density in g/cm3 (0-3)", v.unwrap_or(f64::NAN)),
                ));
            }
        }
        if let (Some(w), Some(h)) = (c.rho_water_gcc, c.rho_hc_gcc) {
            if h >= w {
                return Err((
                    format!("{key}.rho-hc-gcc"),
                    format!("{h} must be below rho-water-gcc ({w})"),
                ));
            }
        }
        if c.fwl_tvdss.is_none() && pressures.is_none() {
            return Err((
                format!("{key}.fwl-tvdss"),
                "no free water level: set fwl-tvdss or give [pressures]".into(),
            ));
        }
    }
    Ok(())
}

/// `[contacts]`: the saturation-step audit (needs the saturation-height model).
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct ContactsConfig {
    /// Least change of SW across a step, between the beds just above and
    /// below it, v/v. Default 0.10.
    #[serde(default = "default_min_step")]
    pub min_step_vv: f64,
    /// Thinnest bed a step may bound, m. Default 0.6 (about the vertical
    /// resolution of deep resistivity tools; common practice).
    #[serde(default = "default_min_bed")]
    pub min_bed_thickness_m: f64,
    /// Vertical resolution of the logs behind SW, m (`log-resolution-m`):
    /// the model's SW is blurred to it (a Gaussian of this full width at half
    /// maximum) before a step's size is compared with the logs', so a thin
    /// bed the logs cannot resolve is not held against the model. 0 turns it
    /// off. Default 0.6, the finest deep resistivity resolution (common
    /// practice), the same as `min-bed-thickness-m`.
    #[serde(default = "default_min_bed")]
    pub log_resolution_m: f64,
    /// Multiplier of the segmentation penalty 2·σ²·ln n (σ the SW noise,
    /// estimated from the data). Default 1.
    #[serde(default = "default_penalty")]
    pub penalty: f64,
    /// Permeability ratio across a step that counts as a rock change even
    /// when the class does not change. Default 3.
    #[serde(default = "default_perm_ratio")]
    pub rock_perm_ratio: f64,
    /// A modelled step matches an observed one when their sizes differ by at
    /// most this (v/v) or by `size-tolerance-rel` of the observed size. Default 0.08.
    #[serde(default = "default_size_tol")]
    pub size_tolerance_vv: f64,
    /// Relative part of the size tolerance. Default 0.5.
    #[serde(default = "default_size_rel")]
    pub size_tolerance_rel: f64,
    /// A step without rock change is a fluid contact when the model puts the
    /// same saturation within this height of it, m. Default 2.
    #[serde(default = "default_contact_tol")]
    pub contact_tolerance_m: f64,
    /// A well's implied FWL disagrees with its compartment's when they differ
    /// by more than twice their combined standard error and by more than this, m. Default 2.
    #[serde(default = "default_fwl_tol")]
    pub fwl_tolerance_m: f64,
}

fn default_min_step() -> f64 {
    0.10
}
fn default_min_bed() -> f64 {
    0.6
}
fn default_penalty() -> f64 {
    1.0
}
fn default_perm_ratio() -> f64 {
    3.0
}
fn default_size_tol() -> f64 {
    0.08
}
fn default_size_rel() -> f64 {
    0.5
}
fn default_contact_tol() -> f64 {
    2.0
}
fn default_fwl_tol() -> f64 {
    2.0
}

impl Default for ContactsConfig {
    fn default() -> Self {
        ContactsConfig {
            min_step_vv: default_min_step(),
            min_bed_thickness_m: default_min_bed(),
            log_resolution_m: default_min_bed(),
            penalty: default_penalty(),
            rock_perm_ratio: default_perm_ratio(),
            size_tolerance_vv: default_size_tol(),
            size_tolerance_rel: default_size_rel(),
            contact_tolerance_m: default_contact_tol(),
            fwl_tolerance_m: default_fwl_tol(),
        }
    }
}

impl ContactsConfig {
    /// Refuse values outside their range; (key, message).
    pub fn validate(&self) -> Result<(), (String, String)> {
        let checks = [
            ("min-step-vv", self.min_step_vv, 0.0, 1.0),
            ("min-bed-thickness-m", self.min_bed_thickness_m, 0.0, 100.0),
            ("log-resolution-m", self.log_resolution_m, 0.0, 20.0),
            ("penalty", self.penalty, 0.0, 1000.0),
            ("rock-perm-ratio", self.rock_perm_ratio, 1.0, 1e6),
            ("size-tolerance-vv", self.size_tolerance_vv, 0.0, 1.0),
            ("size-tolerance-rel", self.size_tolerance_rel, 0.0, 10.0),
            ("contact-tolerance-m", self.contact_tolerance_m, 0.0, 1000.0),
            ("fwl-tolerance-m", self.fwl_tolerance_m, 0.0, 1000.0),
        ];
        for (k, v, lo, hi) in checks {
            if !(v > lo && v <= hi) {
                return Err((
                    format!("contacts.{k}"),
                    format!("{v} must be above {lo} and at most {hi}"),
                ));
            }
        }
        Ok(())
    }
}

/// A laboratory or reservoir fluid system with typical interfacial tension
/// and contact angle (formulas.md §8.2 table; values commonly quoted after
/// Purcell 1949 and Vavra, Kaldi & Sneider 1992, AAPG Bulletin 76(6); from
/// memory). Overridable in the config.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FluidSystem {
    /// Mercury-air (lab): σ 480 dyn/cm, θ 140°.
    MercuryAir,
    /// Air-brine (lab): σ 72 dyn/cm, θ 0°.
    AirBrine,
    /// Oil-brine in the lab: σ 48 dyn/cm, θ 30°.
    OilBrineLab,
    /// Oil-brine at reservoir conditions: σ 30 dyn/cm, θ 30°.
    OilBrineReservoir,
    /// Gas-brine at reservoir conditions: σ 50 dyn/cm, θ 0°.
    GasBrineReservoir,
}

impl FluidSystem {
    /// By the names used in capillary-pressure tables: mercury-air,
    /// air-brine, oil-brine (lab), case-insensitive.
    pub fn parse_lab(s: &str) -> Option<FluidSystem> {
        match s.trim().to_ascii_lowercase().as_str() {
            "mercury-air" | "air-mercury" | "hg-air" => Some(FluidSystem::MercuryAir),
            "air-brine" | "brine-air" | "gas-brine" => Some(FluidSystem::AirBrine),
            "oil-brine" | "brine-oil" => Some(FluidSystem::OilBrineLab),
            _ => None,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// `fwl-sd` is a standard deviation: a negative or non-numeric one is
    /// refused with the compartment's key; 0 (the FWL held) is taken.
    #[test]
    fn fwl_sd_must_be_a_standard_deviation() {
        let check = |text: &str| {
            let compartments: BTreeMap<String, CompartmentConfig> =
                toml::from_str(text).expect("compartments parse");
            validate(None, None, &compartments, &SatHeightConfig::default(), true)
        };
        let (key, message) =
            check("[Main]\nfwl-tvdss = 2085.0\nfwl-sd = -1.5\n").expect_err("negative refused");
        assert!(key.ends_with("fwl-sd"), "{key}");
        assert!(key.contains("Main"), "{key}");
        assert!(message.contains("standard deviation"), "{message}");
        assert!(check("[Main]\nfwl-tvdss = 2085.0\nfwl-sd = nan\n").is_err());
        assert!(check("[Main]\nfwl-tvdss = 2085.0\nfwl-sd = 0.0\n").is_ok());
        assert!(check("[Main]\nfwl-tvdss = 2085.0\nfwl-sd = 3\n").is_ok());
    }
}
