//! Pictures of a run, as SVG documents (drawn with [`crate::report::svg`]): the
//! per-well log plot ([`logplot`]) and the field crossplots ([`crossplots`]).
//!
//! Plot functions take plain data (the types below), not pipeline types, so
//! they can be tested on constructed inputs; `report` converts. A plot with
//! no data draws its frame and says so in place of the points, and never
//! fails the run.

pub mod basemap;
pub mod crossplots;
pub mod fwl_chart;
pub mod logplot;
pub mod section;
pub mod tornado;

use std::collections::BTreeMap;

use crate::output::schema::Col;

/// One zone of a well, measured depths in the project unit.
#[derive(Debug, Clone, PartialEq)]
pub struct ZoneMark {
    pub name: String,
    pub top_md: f64,
    pub base_md: f64,
}

/// One audited saturation step.
#[derive(Debug, Clone, PartialEq)]
pub struct StepMark {
    pub md: f64,
    /// "rock-quality", "fluid-contact", "unexplained" or "flagged".
    pub kind: String,
    /// One-line explanation (a tooltip in the SVG).
    pub explanation: String,
}

/// A well's curves for the log plot. Every column has the length of `md`;
/// missing samples are NaN.
#[derive(Debug, Clone)]
pub struct WellCurves<'a> {
    pub well: &'a str,
    /// "m" or "ft".
    pub depth_unit: &'a str,
    /// Measured depth, increasing.
    pub md: &'a [f64],
    /// TVDSS, when the well has a depth reference.
    pub tvdss: Option<&'a [f64]>,
    /// Curves by output mnemonic: GR (gAPI), VSH (v/v), RT (ohm.m), RHOB
    /// (g/cm3), NPHI (v/v), PHIT, PHIE (v/v), CLASS (1..), CLASS_PROB
    /// (0-1), SW, SWH, SW_FIXED (v/v), FLAG (bits: 1 bad hole, 2 out of
    /// range, 4 missing input, 8 outside zones). Any may be absent.
    pub curves: BTreeMap<Col, &'a [f64]>,
    pub zones: Vec<ZoneMark>,
    pub steps: Vec<StepMark>,
    /// The compartment's free water level, TVDSS (drawn where the well
    /// crosses it).
    pub fwl_tvdss: Option<f64>,
    /// Classes of the scheme (for the legend).
    pub class_count: u8,
}

/// A core plug on the porosity-permeability crossplot.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CorePoint {
    /// Porosity, v/v.
    pub phi: f64,
    /// Permeability, mD.
    pub k_md: f64,
    /// Class in the run's scheme; `None` when the plug has no class.
    pub class: Option<u8>,
}

pub use crate::pipeline::PickettPoint;

/// The palette note every legend ends with, its first line's baseline at `y`.
pub fn palette_note(s: &mut crate::report::svg::Svg, x: f64, y: f64) {
    use crate::report::svg::{Anchor, palette};
    for (k, line) in ["colours: Okabe-Ito palette", "(colour-blind safe)"]
        .iter()
        .enumerate()
    {
        s.text_styled(
            x,
            y + 14.0 * k as f64,
            line,
            10.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
    }
}

/// The Archie parameters of one class, with the Rw the lines are drawn for.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ArchieLine {
    pub class: u8,
    pub a: f64,
    pub m: f64,
    pub n: f64,
}

/// One class on the J-function plot.
#[derive(Debug, Clone, PartialEq)]
pub struct JClass {
    pub class: u8,
    /// Measured (Sw v/v, J dimensionless) points of the class's plugs.
    pub points: Vec<(f64, f64)>,
    /// The fitted curve, sampled: (Sw, J), Sw increasing.
    pub curve: Vec<(f64, f64)>,
    /// e.g. "Brooks-Corey, rms Sw 0.012" or "borrowed from class 3".
    pub label: String,
}

/// A formation-pressure point.
#[derive(Debug, Clone, PartialEq)]
pub struct PressurePoint {
    /// TVDSS, project depth unit.
    pub tvdss: f64,
    /// Pressure, psi.
    pub psi: f64,
    pub well: String,
    /// Whether the fit used it (false: left out, e.g. poor quality).
    pub used: bool,
}

/// A fitted pressure gradient: psi = intercept + gradient × TVDSS, drawn
/// between `top` and `base` (TVDSS).
#[derive(Debug, Clone, PartialEq)]
pub struct GradientLine {
    /// e.g. "water 1.069 g/cm3".
    pub label: String,
    pub intercept_psi: f64,
    pub psi_per_unit: f64,
    pub top: f64,
    pub base: f64,
}

/// One compartment on the pressure plot.
#[derive(Debug, Clone, PartialEq)]
pub struct PressureCompartment {
    pub name: String,
    pub points: Vec<PressurePoint>,
    pub lines: Vec<GradientLine>,
    /// FWL, TVDSS, with its one-sigma when known.
    pub fwl_tvdss: f64,
    pub fwl_sigma: Option<f64>,
}

/// The class boundaries drawn on the porosity-permeability plot: lines of
/// constant FZI (µm) or constant Winland R35 (µm), or none (a scheme with
/// no closed form, e.g. clusters).
#[derive(Debug, Clone, PartialEq)]
pub enum Boundaries {
    Fzi(Vec<f64>),
    R35(Vec<f64>),
    None,
}

pub use crate::well::profile::Profile;

/// The FWL a well's logs imply, as the field views draw it (TVDSS).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ImpliedMark {
    /// Best fit; `None` when the logs only bound it.
    pub best: Option<f64>,
    /// Deep end of the one-standard-error range (`None`: open).
    pub lower: Option<f64>,
    /// Shallow end of the range (`None`: open).
    pub upper: Option<f64>,
}

/// One well in the field views.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldWell<'a> {
    pub name: &'a str,
    /// `None`: the well has no TVDSS or no interpreted depth.
    pub profile: Option<&'a Profile>,
    /// Audited steps: (TVDSS, kind as in contacts.csv).
    pub steps: Vec<(f64, &'a str)>,
    pub implied: Option<ImpliedMark>,
    /// The well's implied FWL or its contacts do not line up with the
    /// compartment's FWL (possibly under another FWL).
    pub flagged: bool,
    /// Position on the map, metres east and north in the field's frame.
    pub position: Option<(f64, f64)>,
    /// Distance along the cross-section's line, metres (when ordered by it).
    pub along: Option<f64>,
}

/// A compartment's wells for the cross-section and the FWL chart, in the
/// order they are drawn.
#[derive(Debug, Clone, PartialEq)]
pub struct CompartmentWells<'a> {
    pub name: &'a str,
    /// The compartment's FWL, TVDSS, and its one standard error when known.
    pub fwl: f64,
    pub fwl_sigma: Option<f64>,
    /// "config" or "pressures".
    pub fwl_source: &'a str,
    pub wells: Vec<FieldWell<'a>>,
    /// How the wells are ordered, in words.
    pub order: String,
}

/// Step kinds with their colour and marker shape (the same colours as the
/// well page's step lines).
pub const STEP_MARKS: [(&str, &str, crate::report::svg::Shape); 4] = [
    (
        "rock-quality",
        crate::report::svg::palette::ORANGE,
        crate::report::svg::Shape::TriangleUp,
    ),
    (
        "fluid-contact",
        crate::report::svg::palette::BLUE,
        crate::report::svg::Shape::Square,
    ),
    (
        "unexplained",
        crate::report::svg::palette::VERMILLION,
        crate::report::svg::Shape::Diamond,
    ),
    (
        "flagged",
        crate::report::svg::palette::REDDISH_PURPLE,
        crate::report::svg::Shape::TriangleDown,
    ),
];
