//! The column set: every curve a run writes, with its name, unit and
//! description, and the FLAG bits.
//!
//! Stages look columns up by [`Col`], never by text, so a column that a
//! stage needs and an earlier stage did not give is `None` at the lookup,
//! not a column of NaN. The names are a contract: users' scripts read DEPTH,
//! VSH, PHIE, SW, CLASS, PERM and the rest by these names.

use crate::input::curves::LogicalCurve;
use crate::units::{DepthUnit, Quantity};

/// An output curve.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Col {
    /// Measured depth, the project's depth unit.
    Depth,
    /// True vertical depth below sea level, the project's depth unit.
    Tvdss,
    /// Shale volume, v/v.
    Vsh,
    /// Total porosity, v/v.
    Phit,
    /// Effective porosity, v/v.
    Phie,
    /// Water saturation (with each class's exponents when they are set), v/v.
    Sw,
    /// Water saturation with the zone's one set of exponents, v/v.
    SwFixed,
    /// Bulk volume water, v/v.
    Bvw,
    /// Quality flag bits ([`FLAG_BITS`]).
    Flag,
    /// Hydraulic class, 1 the poorest rock.
    Class,
    /// Probability of the class at the depth (the bed sequence's posterior,
    /// or the share of trees voting for it without one), v/v.
    ClassProb,
    /// Permeability from class and porosity, mD: 10 to the expected log10 k
    /// over the class probabilities.
    Perm,
    /// Standard deviation of log10 PERM: the spread between the classes'
    /// permeabilities weighted by their probabilities, and each class's own
    /// scatter about its porosity relation.
    PermSd,
    /// Height above the free water level, the project's depth unit.
    Hafwl,
    /// Water saturation from height (the class's J-function), v/v.
    Swh,
    /// SW minus SWH, v/v.
    SwResid,
    /// SW exceeded in 90 % of the Monte Carlo's realisations (the 10th percentile), v/v.
    SwP90,
    /// SW exceeded in half the realisations, v/v.
    SwP50,
    /// SW exceeded in 10 % of the realisations (the 90th percentile), v/v.
    SwP10,
    /// PERM exceeded in 90 % of the realisations (the 10th percentile), mD.
    PermP90,
    /// PERM exceeded in half the realisations, mD.
    PermP50,
    /// PERM exceeded in 10 % of the realisations (the 90th percentile), mD.
    PermP10,
    /// SWH exceeded in 90 % of the realisations (the 10th percentile), v/v:
    /// from the sampled free water level and the drawn classes.
    SwhP90,
    /// SWH exceeded in half the realisations, v/v.
    SwhP50,
    /// SWH exceeded in 10 % of the realisations (the 90th percentile), v/v.
    SwhP10,
    /// The contact audit's kind of the step at this depth.
    Contact,
    /// An input curve, converted to its canonical unit.
    Input(LogicalCurve),
}

impl Col {
    /// The column's name in every output (LAS mnemonic, CSV and Parquet header).
    pub fn name(self) -> &'static str {
        match self {
            Col::Depth => "DEPTH",
            Col::Tvdss => "TVDSS",
            Col::Vsh => "VSH",
            Col::Phit => "PHIT",
            Col::Phie => "PHIE",
            Col::Sw => "SW",
            Col::SwFixed => "SW_FIXED",
            Col::Bvw => "BVW",
            Col::Flag => "FLAG",
            Col::Class => "CLASS",
            Col::ClassProb => "CLASS_PROB",
            Col::Perm => "PERM",
            Col::PermSd => "PERM_LOG10_SD",
            Col::Hafwl => "HAFWL",
            Col::Swh => "SWH",
            Col::SwResid => "SW_RESID",
            Col::SwP90 => "SW_P90",
            Col::SwP50 => "SW_P50",
            Col::SwP10 => "SW_P10",
            Col::PermP90 => "PERM_P90",
            Col::PermP50 => "PERM_P50",
            Col::PermP10 => "PERM_P10",
            Col::SwhP90 => "SWH_P90",
            Col::SwhP50 => "SWH_P50",
            Col::SwhP10 => "SWH_P10",
            Col::Contact => "CONTACT",
            Col::Input(c) => c.output_mnemonic(),
        }
    }

    /// The column's unit as written (LAS spelling), in a project whose depths
    /// are in `depth_unit`.
    pub fn unit(self, depth_unit: DepthUnit) -> &'static str {
        let depth = Quantity::Depth.canonical_unit(depth_unit);
        match self {
            Col::Depth | Col::Tvdss | Col::Hafwl => depth,
            Col::Vsh
            | Col::Phit
            | Col::Phie
            | Col::Sw
            | Col::SwFixed
            | Col::Bvw
            | Col::ClassProb
            | Col::Swh
            | Col::SwResid
            | Col::SwP90
            | Col::SwP50
            | Col::SwP10
            | Col::SwhP90
            | Col::SwhP50
            | Col::SwhP10 => "V/V",
            Col::Perm | Col::PermP90 | Col::PermP50 | Col::PermP10 => "MD",
            Col::PermSd => "LOG10(MD)",
            Col::Flag | Col::Class | Col::Contact => "",
            Col::Input(c) => c.quantity().canonical_unit(depth_unit),
        }
    }

    /// The description written when the stage has nothing more to say.
    pub fn description(self) -> &'static str {
        match self {
            Col::Depth => "MEASURED DEPTH",
            Col::Tvdss => "TRUE VERTICAL DEPTH BELOW SEA LEVEL",
            Col::Vsh => "SHALE VOLUME",
            Col::Phit => "TOTAL POROSITY",
            Col::Phie => "EFFECTIVE POROSITY",
            Col::Sw => "WATER SATURATION",
            Col::SwFixed => "WATER SATURATION, THE ZONE'S ONE SET OF EXPONENTS",
            Col::Bvw => "BULK VOLUME WATER",
            Col::Flag => "QUALITY FLAG BITS",
            Col::Class => "HYDRAULIC CLASS 1 POOREST",
            Col::ClassProb => "PROBABILITY OF THE CLASS",
            Col::Perm => "PERMEABILITY",
            Col::PermSd => "STANDARD DEVIATION OF LOG10 PERM",
            Col::Hafwl => "HEIGHT ABOVE FREE WATER LEVEL",
            Col::Swh => "WATER SATURATION FROM HEIGHT, CLASS J-FUNCTION",
            Col::SwResid => "SW MINUS SWH",
            Col::SwP90 => "SW EXCEEDED IN 90 PCT OF REALISATIONS",
            Col::SwP50 => "SW EXCEEDED IN 50 PCT OF REALISATIONS",
            Col::SwP10 => "SW EXCEEDED IN 10 PCT OF REALISATIONS",
            Col::PermP90 => "PERM EXCEEDED IN 90 PCT OF REALISATIONS, CLASS AND SCATTER",
            Col::PermP50 => "PERM EXCEEDED IN 50 PCT OF REALISATIONS, CLASS AND SCATTER",
            Col::PermP10 => "PERM EXCEEDED IN 10 PCT OF REALISATIONS, CLASS AND SCATTER",
            Col::SwhP90 => "SWH EXCEEDED IN 90 PCT OF REALISATIONS, SAMPLED FWL",
            Col::SwhP50 => "SWH EXCEEDED IN 50 PCT OF REALISATIONS, SAMPLED FWL",
            Col::SwhP10 => "SWH EXCEEDED IN 10 PCT OF REALISATIONS, SAMPLED FWL",
            Col::Contact => {
                "SATURATION STEP BELOW: 1 ROCK QUALITY 2 FLUID CONTACT 3 UNEXPLAINED 4 FLAGGED"
            }
            Col::Input(c) => c.description(),
        }
    }

    /// Whether the values are whole numbers (written without decimals).
    pub fn integer(self) -> bool {
        matches!(self, Col::Flag | Col::Class | Col::Contact)
    }
}

/// FLAG bit: caliper exceeds bit size by more than the bad-hole tolerance.
pub const FLAG_BAD_HOLE: u32 = 1;
/// FLAG bit: an input curve is outside its physical range (the sample is not interpreted).
pub const FLAG_OUT_OF_RANGE: u32 = 2;
/// FLAG bit: an input the chain needs is missing at this depth.
pub const FLAG_MISSING_INPUT: u32 = 4;
/// FLAG bit: the depth is outside every zone (not interpreted).
pub const FLAG_OUTSIDE_ZONE: u32 = 8;
/// FLAG bit: a computed value was clipped to its physical bounds.
pub const FLAG_CLIPPED: u32 = 16;
/// FLAG bit: the predicted class won less than the configured share of votes
/// (set by the class predictor, [`crate::classes::stage`]).
pub const FLAG_LOW_CLASS_PROBABILITY: u32 = 32;
/// FLAG bit: class-dependent exponents are configured, but this interpreted
/// depth has no class, so SW uses the zone's own a, m, n.
pub const FLAG_NO_CLASS_EXPONENTS: u32 = 64;

/// Every FLAG bit with the words the FLAG column's description gives it.
pub const FLAG_BITS: [(u32, &str); 7] = [
    (FLAG_BAD_HOLE, "BAD HOLE"),
    (FLAG_OUT_OF_RANGE, "OUT OF RANGE"),
    (FLAG_MISSING_INPUT, "MISSING INPUT"),
    (FLAG_OUTSIDE_ZONE, "OUTSIDE ZONE"),
    (FLAG_CLIPPED, "CLIPPED"),
    (FLAG_LOW_CLASS_PROBABILITY, "LOW CLASS PROBABILITY"),
    (FLAG_NO_CLASS_EXPONENTS, "NO CLASS EXPONENTS"),
];

/// The FLAG column's description listing the bits up to and including
/// `last_bit`: the logs stage sets bits up to 16, the class stages the rest.
pub fn flag_description(last_bit: u32) -> String {
    let mut s = String::from(Col::Flag.description());
    for (bit, words) in FLAG_BITS.iter().filter(|(b, _)| *b <= last_bit) {
        s.push_str(&format!(" {bit} {words}"));
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The FLAG descriptions as the outputs have always written them (read
    /// off a LAS header written before the schema existed).
    #[test]
    fn flag_descriptions_list_each_bit_once() {
        assert_eq!(
            flag_description(FLAG_CLIPPED),
            "QUALITY FLAG BITS 1 BAD HOLE 2 OUT OF RANGE 4 MISSING INPUT 8 OUTSIDE ZONE 16 CLIPPED"
        );
        assert_eq!(
            flag_description(FLAG_NO_CLASS_EXPONENTS),
            "QUALITY FLAG BITS 1 BAD HOLE 2 OUT OF RANGE 4 MISSING INPUT 8 OUTSIDE ZONE 16 CLIPPED 32 LOW CLASS PROBABILITY 64 NO CLASS EXPONENTS"
        );
        let mut seen = 0u32;
        for (bit, _) in FLAG_BITS {
            assert_eq!(bit.count_ones(), 1, "{bit} is one bit");
            assert_eq!(seen & bit, 0, "{bit} is listed once");
            seen |= bit;
        }
    }

    /// Names are the output contract; no two columns share one.
    #[test]
    fn names_are_unique_and_stable() {
        let all = [
            Col::Depth,
            Col::Tvdss,
            Col::Vsh,
            Col::Phit,
            Col::Phie,
            Col::Sw,
            Col::SwFixed,
            Col::Bvw,
            Col::Flag,
            Col::Class,
            Col::ClassProb,
            Col::Perm,
            Col::PermSd,
            Col::Hafwl,
            Col::Swh,
            Col::SwResid,
            Col::SwP90,
            Col::SwP50,
            Col::SwP10,
            Col::PermP90,
            Col::PermP50,
            Col::PermP10,
            Col::SwhP90,
            Col::SwhP50,
            Col::SwhP10,
            Col::Contact,
        ];
        let mut names: Vec<&str> = all.iter().map(|c| c.name()).collect();
        names.extend(LogicalCurve::ALL.iter().map(|&c| Col::Input(c).name()));
        let n = names.len();
        names.sort_unstable();
        names.dedup();
        assert_eq!(names.len(), n);
        for contract in ["DEPTH", "VSH", "PHIE", "SW", "CLASS", "PERM"] {
            assert!(names.contains(&contract), "{contract}");
        }
        assert_eq!(Col::Hafwl.unit(DepthUnit::Metre), "M");
        assert_eq!(Col::Depth.unit(DepthUnit::Foot), "FT");
    }
}
