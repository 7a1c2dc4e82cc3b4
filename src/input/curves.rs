//! Logical curves: finding gamma ray, bulk density, neutron and the rest in a
//! file whatever its mnemonics, and converting them to canonical units.
//!
//! Each [`LogicalCurve`] has a default alias list of common industry
//! mnemonics (common practice: the names service companies and data vendors
//! use for the measurement), tried in order; the first mnemonic present in the
//! file wins. A project overrides a list in its config (`[curves.aliases]`)
//! and can state the unit of a curve whose header unit is blank or wrong
//! (`[curves.units]`). A unit that is not known for the curve's quantity is an
//! error for a required curve, never a guess.

use std::collections::BTreeMap;

use crate::input::las::LasFile;
use crate::units::{Conversion, DepthUnit, Quantity};

/// A measurement the stages need, independent of how a file names it.
#[derive(
    Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, serde::Serialize, serde::Deserialize,
)]
#[serde(rename_all = "kebab-case")]
pub enum LogicalCurve {
    /// Natural gamma ray; gAPI once resolved.
    GammaRay,
    /// Bulk density; g/cm3 once resolved.
    BulkDensity,
    /// Neutron porosity; v/v (fraction) once resolved.
    NeutronPorosity,
    /// Compressional sonic slowness; us/ft once resolved.
    CompressionalSlowness,
    /// Deep resistivity, read as true formation resistivity; ohm.m once resolved.
    DeepResistivity,
    /// Borehole diameter from the caliper; inches once resolved.
    Caliper,
    /// Spontaneous potential; mV once resolved.
    SpontaneousPotential,
    /// Bit size (nominal hole diameter); inches once resolved.
    BitSize,
}

impl LogicalCurve {
    /// Every logical curve, in output order.
    pub const ALL: [LogicalCurve; 8] = [
        LogicalCurve::GammaRay,
        LogicalCurve::BulkDensity,
        LogicalCurve::NeutronPorosity,
        LogicalCurve::CompressionalSlowness,
        LogicalCurve::DeepResistivity,
        LogicalCurve::Caliper,
        LogicalCurve::SpontaneousPotential,
        LogicalCurve::BitSize,
    ];

    /// The config key (`[curves.aliases]`).
    pub fn key(self) -> &'static str {
        match self {
            LogicalCurve::GammaRay => "gamma-ray",
            LogicalCurve::BulkDensity => "bulk-density",
            LogicalCurve::NeutronPorosity => "neutron-porosity",
            LogicalCurve::CompressionalSlowness => "compressional-slowness",
            LogicalCurve::DeepResistivity => "deep-resistivity",
            LogicalCurve::Caliper => "caliper",
            LogicalCurve::SpontaneousPotential => "spontaneous-potential",
            LogicalCurve::BitSize => "bit-size",
        }
    }

    /// The mnemonic flowzone writes the resolved curve under.
    pub fn output_mnemonic(self) -> &'static str {
        match self {
            LogicalCurve::GammaRay => "GR",
            LogicalCurve::BulkDensity => "RHOB",
            LogicalCurve::NeutronPorosity => "NPHI",
            LogicalCurve::CompressionalSlowness => "DT",
            LogicalCurve::DeepResistivity => "RT",
            LogicalCurve::Caliper => "CALI",
            LogicalCurve::SpontaneousPotential => "SP",
            LogicalCurve::BitSize => "BS",
        }
    }

    /// A description for output headers.
    pub fn description(self) -> &'static str {
        match self {
            LogicalCurve::GammaRay => "GAMMA RAY",
            LogicalCurve::BulkDensity => "BULK DENSITY",
            LogicalCurve::NeutronPorosity => "NEUTRON POROSITY",
            LogicalCurve::CompressionalSlowness => "COMPRESSIONAL SLOWNESS",
            LogicalCurve::DeepResistivity => "DEEP RESISTIVITY",
            LogicalCurve::Caliper => "CALIPER",
            LogicalCurve::SpontaneousPotential => "SPONTANEOUS POTENTIAL",
            LogicalCurve::BitSize => "BIT SIZE",
        }
    }

    /// The quantity the curve measures, which sets its canonical unit and
    /// the unit spellings accepted for it.
    pub fn quantity(self) -> Quantity {
        match self {
            LogicalCurve::GammaRay => Quantity::GammaRay,
            LogicalCurve::BulkDensity => Quantity::Density,
            LogicalCurve::NeutronPorosity => Quantity::Fraction,
            LogicalCurve::CompressionalSlowness => Quantity::Slowness,
            LogicalCurve::DeepResistivity => Quantity::Resistivity,
            LogicalCurve::Caliper | LogicalCurve::BitSize => Quantity::Diameter,
            LogicalCurve::SpontaneousPotential => Quantity::Potential,
        }
    }

    /// Default aliases, most specific first (common practice).
    pub fn default_aliases(self) -> &'static [&'static str] {
        match self {
            LogicalCurve::GammaRay => &[
                "GR", "GRC", "GR_EDTC", "ECGR", "HSGR", "SGR", "GRGC", "GSGR", "GRD", "GAM",
                "GAMMA",
            ],
            LogicalCurve::BulkDensity => &[
                "RHOB", "RHOZ", "ZDEN", "DEN", "DENS", "RHO8", "DENB", "DLDC", "HDEN",
            ],
            LogicalCurve::NeutronPorosity => &[
                "NPHI", "TNPH", "NPOR", "CNC", "CNCF", "NPRL", "NPHI_LIM", "TNPH_LIM", "NPOR_LIM",
                "PHIN", "NCNPL",
            ],
            LogicalCurve::CompressionalSlowness => {
                &["DT", "DTC", "DTCO", "AC", "DT24", "DTLN", "ACTC"]
            }
            LogicalCurve::DeepResistivity => &[
                "RT", "RD", "RDEP", "ILD", "RILD", "AT90", "AHT90", "AF90", "LLD", "RLA5", "IDPH",
                "RTAO", "IDIM",
            ],
            LogicalCurve::Caliper => &["CALI", "HCAL", "CAL", "CALS", "C13", "DLCL"],
            LogicalCurve::SpontaneousPotential => &["SP", "SPCG", "IDSP", "SSP"],
            LogicalCurve::BitSize => &["BS", "BIT", "BITSIZE"],
        }
    }
}

/// Alias lists and unit overrides for a project.
#[derive(Debug, Clone, Default)]
pub struct AliasTable {
    /// Replacement alias lists by logical curve.
    pub aliases: BTreeMap<LogicalCurve, Vec<String>>,
    /// Units to use for a mnemonic whose header unit is blank or wrong.
    pub units: BTreeMap<String, String>,
}

impl AliasTable {
    /// The aliases tried for `curve`, in order.
    pub fn aliases(&self, curve: LogicalCurve) -> Vec<String> {
        match self.aliases.get(&curve) {
            Some(list) => list.clone(),
            None => curve
                .default_aliases()
                .iter()
                .map(|s| s.to_string())
                .collect(),
        }
    }
}

/// A curve found in a file and converted to canonical units.
#[derive(Debug, Clone)]
pub struct ResolvedCurve {
    /// The measurement that was looked for.
    pub logical: LogicalCurve,
    /// The file's (unique) mnemonic.
    pub mnemonic: String,
    /// The unit as read (or as overridden in the config).
    pub source_unit: String,
    /// Values in the canonical unit of the curve's quantity.
    pub values: Vec<f64>,
}

/// Why a logical curve could not be resolved.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum CurveError {
    /// None of the curve's aliases is a mnemonic of the file.
    #[error("no {} curve: tried {}", .curve.key(), .tried.join(", "))]
    Missing {
        /// The measurement looked for.
        curve: LogicalCurve,
        /// The aliases tried, in order.
        tried: Vec<String>,
    },
    /// The curve's unit is not a known spelling for its quantity.
    #[error("{} curve {mnemonic} has unit `{unit}`, which is not a known {} unit", .curve.key(), quantity_name(.curve.quantity()))]
    UnknownUnit {
        /// The measurement resolved.
        curve: LogicalCurve,
        /// The file's mnemonic of the curve.
        mnemonic: String,
        /// The unit as read, or as overridden in `[curves.units]`.
        unit: String,
    },
    /// The index curve's unit is not a depth unit ([`resolve_depth`]).
    #[error("index curve {mnemonic} has unit `{unit}`, which is not a known depth unit")]
    UnknownDepthUnit {
        /// The file's mnemonic of the index curve (empty when the file has no curves).
        mnemonic: String,
        /// The unit as read.
        unit: String,
    },
}

fn quantity_name(q: Quantity) -> &'static str {
    match q {
        Quantity::Depth => "depth",
        Quantity::Density => "density",
        Quantity::Slowness => "slowness",
        Quantity::Fraction => "fraction",
        Quantity::Resistivity => "resistivity",
        Quantity::GammaRay => "gamma-ray",
        Quantity::Diameter => "diameter",
        Quantity::Potential => "potential",
    }
}

/// Find `curve` in `file` and convert it. `depth` is the project's depth unit.
pub fn resolve(
    file: &LasFile,
    curve: LogicalCurve,
    table: &AliasTable,
    depth: DepthUnit,
) -> Result<ResolvedCurve, CurveError> {
    let tried = table.aliases(curve);
    let Some((pos, alias)) = tried
        .iter()
        .find_map(|a| file.curve_position(a).map(|p| (p, a)))
    else {
        return Err(CurveError::Missing { curve, tried });
    };
    let info = &file.curves[pos];
    let unit = table
        .units
        .iter()
        .find(|(m, _)| m.eq_ignore_ascii_case(alias))
        .map_or(info.unit.clone(), |(_, u)| u.clone());
    let conversion = Conversion::from_unit(curve.quantity(), &unit, depth).ok_or_else(|| {
        CurveError::UnknownUnit {
            curve,
            mnemonic: info.mnemonic.clone(),
            unit: unit.clone(),
        }
    })?;
    let mut values = file.columns[pos].clone();
    conversion.apply(&mut values);
    Ok(ResolvedCurve {
        logical: curve,
        mnemonic: info.mnemonic.clone(),
        source_unit: unit,
        values,
    })
}

/// The index converted to the project's depth unit; the index unit must be a
/// depth unit.
pub fn resolve_depth(file: &LasFile, depth: DepthUnit) -> Result<Vec<f64>, CurveError> {
    let unit = file.index_unit().to_string();
    let conversion = Conversion::from_unit(Quantity::Depth, &unit, depth).ok_or_else(|| {
        CurveError::UnknownDepthUnit {
            mnemonic: file
                .curves
                .first()
                .map_or(String::new(), |c| c.mnemonic.clone()),
            unit: unit.clone(),
        }
    })?;
    let mut values = file.index().to_vec();
    conversion.apply(&mut values);
    Ok(values)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::las::{ReadOptions, read_bytes};

    fn file(curves: &str, row: &str) -> LasFile {
        let text = format!(
            "~V\nVERS. 2.0 :\nWRAP. NO :\n~W\nSTRT.M 100 :\nSTOP.M 100 :\nSTEP.M 0 :\nNULL. -999.25 :\n~C\n{curves}~A\n{row}\n"
        );
        read_bytes(
            text.as_bytes(),
            std::path::Path::new("t.las"),
            ReadOptions::default(),
        )
        .expect("valid test file")
    }

    /// An index in an unknown unit is named as the index and its depth
    /// unit, not as a gamma-ray curve (it used to borrow GammaRay's wording).
    #[test]
    fn unknown_index_unit_names_the_index() {
        let f = file("DEPT.FURLONG :\nGR.GAPI :\n", "100 50");
        let e = resolve_depth(&f, DepthUnit::Metre).expect_err("furlongs");
        assert_eq!(
            e.to_string(),
            "index curve DEPT has unit `FURLONG`, which is not a known depth unit"
        );
        let f = file("DEPT.FT :\nGR.GAPI :\n", "100 50");
        let d = resolve_depth(&f, DepthUnit::Metre).expect("feet");
        assert!((d[0] - 30.48).abs() < 1e-9, "{d:?}"); // 100 ft = 30.48 m exactly
    }

    #[test]
    fn finds_first_alias_and_converts() {
        let f = file("DEPT.M :\nRHOZ.K/M3 :\nTNPH.PU :\n", "100 2450 25");
        let t = AliasTable::default();
        let rho = resolve(&f, LogicalCurve::BulkDensity, &t, DepthUnit::Metre).expect("found");
        assert_eq!(rho.mnemonic, "RHOZ");
        assert!((rho.values[0] - 2.45).abs() < 1e-12);
        let n = resolve(&f, LogicalCurve::NeutronPorosity, &t, DepthUnit::Metre).expect("found");
        assert!((n.values[0] - 0.25).abs() < 1e-12);
    }

    #[test]
    fn missing_curve_names_the_aliases_tried() {
        let f = file("DEPT.M :\nRHOZ.G/CC :\n", "100 2.45");
        let mut t = AliasTable::default();
        t.aliases
            .insert(LogicalCurve::GammaRay, vec!["GR".into(), "SGR".into()]);
        let err = resolve(&f, LogicalCurve::GammaRay, &t, DepthUnit::Metre).expect_err("no GR");
        assert_eq!(err.to_string(), "no gamma-ray curve: tried GR, SGR");
    }

    #[test]
    fn unknown_unit_is_an_error_unless_overridden() {
        let f = file("DEPT.M :\nPHIN. :\n", "100 0.3");
        let mut t = AliasTable::default();
        let err = resolve(&f, LogicalCurve::NeutronPorosity, &t, DepthUnit::Metre)
            .expect_err("blank unit");
        assert_eq!(
            err.to_string(),
            "neutron-porosity curve PHIN has unit ``, which is not a known fraction unit"
        );
        t.units.insert("PHIN".into(), "v/v".into());
        let n =
            resolve(&f, LogicalCurve::NeutronPorosity, &t, DepthUnit::Metre).expect("overridden");
        assert_eq!(n.values, vec![0.3]);
    }
}
