//! `[summary]`: the cutoffs that decide net reservoir and net pay, field-wide
//! and per hydraulic class (see [`crate::well::summary`] for how they apply).

use std::collections::BTreeMap;

use serde::Deserialize;

/// Default net-rock cutoff: VSH ≤ 0.5 v/v (common practice).
pub const DEFAULT_VSH_MAX_VV: f64 = 0.5;
/// Default net-reservoir cutoff: PHIE ≥ 0.06 v/v (common practice for sandstone).
pub const DEFAULT_PHIE_MIN_VV: f64 = 0.06;
/// Default net-pay cutoff: SW ≤ 0.6 v/v (common practice).
pub const DEFAULT_SW_MAX_VV: f64 = 0.6;

/// `[summary]` in the config: the cutoffs that decide net reservoir and net pay.
///
/// ```toml
/// [summary]
/// vsh-max-vv = 0.5
/// phie-min-vv = 0.06
/// sw-max-vv = 0.6
/// [summary.class."1"]
/// sw-max-vv = 0.3
/// ```
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct SummaryConfig {
    /// Net rock: VSH ≤ this, v/v. Default 0.5 (common practice).
    #[serde(default = "default_vsh_max")]
    pub vsh_max_vv: f64,
    /// Net reservoir: PHIE ≥ this, v/v. Default 0.06 (common practice for sandstone).
    #[serde(default = "default_phie_min")]
    pub phie_min_vv: f64,
    /// Net pay: SW ≤ this, v/v. Default 0.6 (common practice).
    #[serde(default = "default_sw_max")]
    pub sw_max_vv: f64,
    /// Overrides per class number ("1" to "255", class 1 the poorest rock);
    /// a cutoff left out keeps the field value above.
    #[serde(default)]
    pub class: BTreeMap<String, ClassCutoffs>,
}

/// `[summary.class."N"]`: cutoffs of one hydraulic class, each optional.
#[derive(Debug, Clone, Copy, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct ClassCutoffs {
    /// Net rock: VSH ≤ this, v/v.
    pub vsh_max_vv: Option<f64>,
    /// Net reservoir: PHIE ≥ this, v/v.
    pub phie_min_vv: Option<f64>,
    /// Net pay: SW ≤ this, v/v.
    pub sw_max_vv: Option<f64>,
}

fn default_vsh_max() -> f64 {
    DEFAULT_VSH_MAX_VV
}
fn default_phie_min() -> f64 {
    DEFAULT_PHIE_MIN_VV
}
fn default_sw_max() -> f64 {
    DEFAULT_SW_MAX_VV
}

impl Default for SummaryConfig {
    fn default() -> Self {
        SummaryConfig {
            vsh_max_vv: default_vsh_max(),
            phie_min_vv: default_phie_min(),
            sw_max_vv: default_sw_max(),
            class: BTreeMap::new(),
        }
    }
}

/// Parse a class key: a class number 1-255 (surrounding blanks allowed, as in
/// `[parameters.class]`). `None` for anything else.
fn parse_class_key(k: &str) -> Option<u8> {
    match k.trim().parse::<u8>() {
        Ok(c) if c >= 1 => Some(c),
        _ => None,
    }
}

/// A cutoff must be a number in [0, 1] v/v (0 and 1 allowed: 1 on VSH or SW,
/// 0 on PHIE, switches that cutoff off).
fn check_cutoff(key: String, v: f64) -> Result<(), (String, String)> {
    if (0.0..=1.0).contains(&v) {
        Ok(())
    } else {
        Err((key, format!("{v} must be a fraction from 0 to 1 (v/v)")))
    }
}

impl SummaryConfig {
    /// Refuse a cutoff outside [0, 1] v/v (negative, above 1, NaN) and a class
    /// key that is not a class number 1-255 or repeats another's class
    /// (`"2"` and `"02"`); `Err((key, message))` with the full key, such as
    /// `summary.class."2".sw-max-vv`.
    pub fn validate(&self) -> Result<(), (String, String)> {
        check_cutoff("summary.vsh-max-vv".into(), self.vsh_max_vv)?;
        check_cutoff("summary.phie-min-vv".into(), self.phie_min_vv)?;
        check_cutoff("summary.sw-max-vv".into(), self.sw_max_vv)?;
        let mut seen: [Option<&str>; 256] = [None; 256];
        for (k, c) in &self.class {
            let key = format!("summary.class.\"{k}\"");
            let Some(n) = parse_class_key(k) else {
                return Err((
                    key,
                    "a class key must be a class number from 1 to 255 (class 1 is the poorest rock)"
                        .into(),
                ));
            };
            if let Some(other) = seen[n as usize] {
                return Err((key, format!("class {n} is already set by \"{other}\"")));
            }
            seen[n as usize] = Some(k);
            let fields = [
                ("vsh-max-vv", c.vsh_max_vv),
                ("phie-min-vv", c.phie_min_vv),
                ("sw-max-vv", c.sw_max_vv),
            ];
            for (name, v) in fields {
                if let Some(v) = v {
                    check_cutoff(format!("{key}.{name}"), v)?;
                }
            }
        }
        Ok(())
    }

    /// Cutoffs for every class number: index 0 is the field values (used for
    /// samples without a class), index c the field values laid under class c's
    /// overrides. Keys that are not class numbers are ignored (`validate`
    /// refuses them).
    pub(crate) fn cutoffs_by_class(&self) -> Vec<Cutoffs> {
        let field = Cutoffs {
            vsh_max: self.vsh_max_vv,
            phie_min: self.phie_min_vv,
            sw_max: self.sw_max_vv,
        };
        let mut table = vec![field; 256];
        for (k, c) in &self.class {
            if let Some(n) = parse_class_key(k) {
                table[n as usize] = Cutoffs {
                    vsh_max: c.vsh_max_vv.unwrap_or(field.vsh_max),
                    phie_min: c.phie_min_vv.unwrap_or(field.phie_min),
                    sw_max: c.sw_max_vv.unwrap_or(field.sw_max),
                };
            }
        }
        table
    }
}

/// The three cutoffs that apply to one sample, v/v.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Cutoffs {
    pub(crate) vsh_max: f64,
    pub(crate) phie_min: f64,
    pub(crate) sw_max: f64,
}

impl Cutoffs {
    /// Net reservoir: VSH ≤ vsh_max and PHIE ≥ phie_min (bounds included).
    /// VSH and PHIE in v/v. Common practice.
    pub(crate) fn is_net_reservoir(&self, vsh: f64, phie: f64) -> bool {
        vsh <= self.vsh_max && phie >= self.phie_min
    }

    /// Net pay: net reservoir and SW ≤ sw_max (bound included). v/v. Common practice.
    pub(crate) fn is_net_pay(&self, vsh: f64, phie: f64, sw: f64) -> bool {
        self.is_net_reservoir(vsh, phie) && sw <= self.sw_max
    }
}
