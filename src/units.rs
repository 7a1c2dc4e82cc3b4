//! Units read from LAS headers, and conversion to the crate's canonical units.
//!
//! Inside flowzone every quantity has one unit; conversion happens once, when a
//! curve is resolved from a file:
//!
//! | quantity                 | canonical unit | accepted spellings (case-insensitive)          |
//! |--------------------------|----------------|-----------------------------------------------|
//! | depth                    | the project's (m or ft) | M, METER, METRE, F, FT, FEET             |
//! | bulk density             | g/cm3          | G/CC, G/CM3, GM/CC, G/C3; K/M3, KG/M3          |
//! | compressional slowness   | us/ft          | US/F, US/FT, USEC/FT, USPF; US/M, USEC/M       |
//! | porosity, neutron        | v/v (fraction) | V/V, DEC, FRAC, CFCF, M3/M3; %, PU, PERC...    |
//! | resistivity              | ohm.m          | OHMM, OHM.M, OHM-M, OHM                        |
//! | gamma ray                | gAPI           | GAPI, API                                      |
//! | caliper, bit size        | in             | IN, INCH, INCHES; MM, CM                       |
//! | spontaneous potential    | mV             | MV, MVOLT                                      |
//!
//! An unknown spelling is never guessed: [`Conversion::from_unit`] returns
//! `None`, and the caller reports the curve and the unit it found. Exact
//! factors: 1 ft = 0.3048 m (international foot, 1959), 1 in = 25.4 mm.

/// Metres per foot (international foot, exact by definition).
pub const METRES_PER_FOOT: f64 = 0.3048;
/// Millimetres per inch (exact by definition).
pub const MM_PER_INCH: f64 = 25.4;

/// A physical quantity that a log curve measures.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Quantity {
    /// Measured or vertical depth; canonical unit is the project's (m or ft).
    Depth,
    /// Bulk density, g/cm3.
    Density,
    /// Compressional slowness, us/ft.
    Slowness,
    /// A volume fraction such as neutron porosity, v/v.
    Fraction,
    /// Resistivity, ohm.m.
    Resistivity,
    /// Gamma ray, gAPI.
    GammaRay,
    /// Caliper or bit size, inches.
    Diameter,
    /// Spontaneous potential, mV.
    Potential,
}

impl Quantity {
    /// The canonical unit, as written in output headers.
    pub fn canonical_unit(self, depth: DepthUnit) -> &'static str {
        match self {
            Quantity::Depth => depth.las_unit(),
            Quantity::Density => "G/CC",
            Quantity::Slowness => "US/F",
            Quantity::Fraction => "V/V",
            Quantity::Resistivity => "OHMM",
            Quantity::GammaRay => "GAPI",
            Quantity::Diameter => "IN",
            Quantity::Potential => "MV",
        }
    }
}

/// A table's DEPTH_UNIT that is neither metres nor feet (the text as written).
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("DEPTH_UNIT `{0}` is neither m nor ft")]
pub struct UnknownDepthUnit(pub String);

/// The depth unit a project works in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize, Default)]
pub enum DepthUnit {
    /// Metres (serialised as `m`).
    #[default]
    #[serde(rename = "m")]
    Metre,
    /// International feet, 0.3048 m (serialised as `ft`).
    #[serde(rename = "ft")]
    Foot,
}

impl DepthUnit {
    /// Read a LAS depth unit (`M`, `METER`, `F`, `FT`...).
    pub fn from_las(text: &str) -> Option<DepthUnit> {
        match normalise(text).as_str() {
            "M" | "METER" | "METERS" | "METRE" | "METRES" => Some(DepthUnit::Metre),
            "F" | "FT" | "FEET" | "FOOT" => Some(DepthUnit::Foot),
            _ => None,
        }
    }

    /// A table's optional DEPTH_UNIT field: blank or absent means `default`;
    /// otherwise it must be a depth unit (`Err` carries the message).
    pub fn from_optional(
        text: Option<&str>,
        default: DepthUnit,
    ) -> Result<DepthUnit, UnknownDepthUnit> {
        match text.map(str::trim).filter(|u| !u.is_empty()) {
            None => Ok(default),
            Some(u) => DepthUnit::from_las(u).ok_or_else(|| UnknownDepthUnit(u.to_string())),
        }
    }

    /// The unit as written in LAS files.
    pub fn las_unit(self) -> &'static str {
        match self {
            DepthUnit::Metre => "M",
            DepthUnit::Foot => "FT",
        }
    }

    /// Factor that converts a length in `self` to `to`.
    pub fn factor_to(self, to: DepthUnit) -> f64 {
        match (self, to) {
            (DepthUnit::Metre, DepthUnit::Foot) => 1.0 / METRES_PER_FOOT,
            (DepthUnit::Foot, DepthUnit::Metre) => METRES_PER_FOOT,
            _ => 1.0,
        }
    }
}

/// Upper case, no spaces or brackets: `[g/cm3]` and `G/CM3` compare equal.
fn normalise(text: &str) -> String {
    text.chars()
        .filter(|c| !c.is_whitespace() && *c != '[' && *c != ']')
        .map(|c| c.to_ascii_uppercase())
        .collect()
}

/// A linear conversion `canonical = value * factor`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Conversion {
    /// Multiplier from the unit as read to the canonical unit (1 when they are the same).
    pub factor: f64,
}

impl Conversion {
    /// No conversion (factor 1): the values are already in the canonical unit.
    pub const IDENTITY: Conversion = Conversion { factor: 1.0 };

    /// The conversion of `unit` to the canonical unit of `quantity`, or `None`
    /// when the spelling is not known for that quantity.
    pub fn from_unit(quantity: Quantity, unit: &str, depth: DepthUnit) -> Option<Conversion> {
        let u = normalise(unit);
        let f = match quantity {
            Quantity::Depth => DepthUnit::from_las(&u)?.factor_to(depth),
            Quantity::Density => match u.as_str() {
                "G/CC" | "G/CM3" | "GM/CC" | "G/C3" | "GR/CC" | "GRAM/CC" | "G/CM^3" | "GCC" => 1.0,
                "K/M3" | "KG/M3" | "KG/M^3" => 1e-3,
                _ => return None,
            },
            Quantity::Slowness => match u.as_str() {
                "US/F" | "US/FT" | "USEC/FT" | "USPF" | "µS/FT" | "MICROSEC/FT" => 1.0,
                "US/M" | "USEC/M" | "µS/M" => METRES_PER_FOOT,
                _ => return None,
            },
            Quantity::Fraction => match u.as_str() {
                "V/V" | "DEC" | "FRAC" | "FRACTION" | "CFCF" | "M3/M3" | "FT3/FT3" | "PU_FRAC" => {
                    1.0
                }
                "%" | "PU" | "PERC" | "PERCNT" | "PERCENT" | "P.U." | "PU_PCT" => 0.01,
                _ => return None,
            },
            Quantity::Resistivity => match u.as_str() {
                "OHMM" | "OHM.M" | "OHM-M" | "OHM" | "OHMS" | "OHM_M" | "OHMMETER" => 1.0,
                _ => return None,
            },
            Quantity::GammaRay => match u.as_str() {
                "GAPI" | "API" | "GAPI_UNITS" => 1.0,
                _ => return None,
            },
            Quantity::Diameter => match u.as_str() {
                "IN" | "INCH" | "INCHES" => 1.0,
                "MM" => 1.0 / MM_PER_INCH,
                "CM" => 10.0 / MM_PER_INCH,
                _ => return None,
            },
            Quantity::Potential => match u.as_str() {
                "MV" | "MVOLT" | "MILLIVOLT" => 1.0,
                _ => return None,
            },
        };
        Some(Conversion { factor: f })
    }

    /// Convert values in place (NaN stays NaN).
    pub fn apply(self, values: &mut [f64]) {
        if self.factor != 1.0 {
            for v in values {
                *v *= self.factor;
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn factor(q: Quantity, u: &str) -> Option<f64> {
        Conversion::from_unit(q, u, DepthUnit::Metre).map(|c| c.factor)
    }

    /// Exact definitions: 1 ft = 0.3048 m; 1 in = 25.4 mm; 1000 kg/m3 = 1 g/cm3.
    #[test]
    fn exact_factors() {
        assert_eq!(factor(Quantity::Depth, "FT"), Some(0.3048));
        assert_eq!(factor(Quantity::Depth, "meter"), Some(1.0));
        assert_eq!(factor(Quantity::Density, "KG/M3"), Some(1e-3));
        assert_eq!(factor(Quantity::Density, "g/cm3"), Some(1.0));
        assert_eq!(factor(Quantity::Slowness, "us/m"), Some(0.3048));
        assert_eq!(factor(Quantity::Fraction, "PU"), Some(0.01));
        assert_eq!(factor(Quantity::Fraction, "[v/v]"), Some(1.0));
        assert_eq!(factor(Quantity::Diameter, "MM"), Some(1.0 / 25.4));
        let f = Conversion::from_unit(Quantity::Depth, "M", DepthUnit::Foot)
            .expect("metre known")
            .factor;
        assert!((f - 3.280_839_895).abs() < 1e-9);
    }

    /// 189 us/ft (a common water transit time) is 620.08 us/m; converting back
    /// must give 189 (1 ft = 0.3048 m).
    #[test]
    fn slowness_round_trip() {
        let mut v = [189.0 / 0.3048];
        Conversion::from_unit(Quantity::Slowness, "US/M", DepthUnit::Metre)
            .expect("known")
            .apply(&mut v);
        assert!((v[0] - 189.0).abs() < 1e-9);
    }

    #[test]
    fn unknown_units_are_not_guessed() {
        assert_eq!(factor(Quantity::Density, ""), None);
        assert_eq!(factor(Quantity::Fraction, "CPS"), None);
        assert_eq!(factor(Quantity::Resistivity, "MMHO/M"), None);
        assert_eq!(factor(Quantity::GammaRay, "CPS"), None);
    }
}
