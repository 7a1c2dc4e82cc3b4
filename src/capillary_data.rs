//! Laboratory capillary-pressure curves: read, converted to Leverett J, and
//! fitted per class with a Brooks-Corey curve in J.
//!
//! CSV columns: SAMPLE, WELL, DEPTH_MD, POROSITY_FRAC, PERM_MD, PC_PSI,
//! SW_FRAC (wetting-phase saturation), SYSTEM (mercury-air, air-brine,
//! oil-brine). One row per pressure step; a sample's rows share its porosity
//! and permeability.

use std::collections::BTreeMap;
use std::path::Path;

use serde::{Deserialize, Serialize};

use crate::capillary::{FluidSystem, leverett_j};
use crate::core_data::Rejected;
use crate::tables::{TableError, read_csv};

#[derive(Deserialize)]
struct Row {
    #[serde(rename = "SAMPLE")]
    sample: String,
    #[serde(rename = "WELL")]
    well: String,
    #[serde(rename = "DEPTH_MD")]
    depth: f64,
    #[serde(rename = "POROSITY_FRAC")]
    porosity: f64,
    #[serde(rename = "PERM_MD")]
    perm_md: f64,
    #[serde(rename = "PC_PSI")]
    pc_psi: f64,
    #[serde(rename = "SW_FRAC")]
    sw: f64,
    #[serde(rename = "SYSTEM")]
    system: String,
}

/// One lab curve.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CapSample {
    pub sample: String,
    pub well: String,
    pub depth: f64,
    pub porosity: f64,
    pub perm_md: f64,
    /// (σ·|cos θ| of the lab system, dyn/cm).
    pub sigma_cos_lab: f64,
    /// (Pc psi, Sw v/v) steps in file order.
    pub steps: Vec<(f64, f64)>,
    /// Leverett J of each step.
    pub j: Vec<f64>,
}

/// Read a capillary-pressure CSV. Rows that cannot be used (unknown system,
/// Pc not above 0, Sw outside 0-1, a sample whose porosity or permeability
/// changes between rows) are left out with their line.
pub fn read(path: &Path) -> Result<(Vec<CapSample>, Vec<Rejected>), TableError> {
    let rows: Vec<(u64, Row)> = read_csv(path)?;
    let mut by: BTreeMap<String, CapSample> = BTreeMap::new();
    let mut rejected = Vec::new();
    for (line, r) in rows {
        let Some(system) = FluidSystem::parse_lab(&r.system) else {
            rejected.push(Rejected {
                line,
                reason: format!(
                    "SYSTEM `{}` is not mercury-air, air-brine or oil-brine",
                    r.system
                ),
            });
            continue;
        };
        if !(r.pc_psi.is_finite() && r.pc_psi > 0.0) {
            rejected.push(Rejected {
                line,
                reason: format!("PC_PSI {} is not above 0", r.pc_psi),
            });
            continue;
        }
        if !(0.0..=1.0).contains(&r.sw) {
            rejected.push(Rejected {
                line,
                reason: format!("SW_FRAC {} is outside 0-1", r.sw),
            });
            continue;
        }
        if !(r.porosity > 0.0 && r.porosity <= 0.5 && r.perm_md > 0.0) {
            rejected.push(Rejected {
                line,
                reason: format!(
                    "porosity {} or permeability {} mD not usable",
                    r.porosity, r.perm_md
                ),
            });
            continue;
        }
        let sc = system.sigma_cos();
        let entry = by.entry(r.sample.clone()).or_insert_with(|| CapSample {
            sample: r.sample.clone(),
            well: r.well.clone(),
            depth: r.depth,
            porosity: r.porosity,
            perm_md: r.perm_md,
            sigma_cos_lab: sc,
            steps: Vec::new(),
            j: Vec::new(),
        });
        if entry.porosity != r.porosity || entry.perm_md != r.perm_md || entry.sigma_cos_lab != sc {
            rejected.push(Rejected {
                line,
                reason: format!(
                    "sample {} changes porosity, permeability or system between rows",
                    r.sample
                ),
            });
            continue;
        }
        entry.steps.push((r.pc_psi, r.sw));
        entry
            .j
            .push(leverett_j(r.pc_psi, sc, entry.perm_md, entry.porosity));
    }
    Ok((by.into_values().collect(), rejected))
}

/// A Brooks-Corey curve in J: Sw = Swirr + (1 − Swirr)·(Jd/J)^λ above Jd.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BrooksCoreyJ {
    pub jd: f64,
    pub lambda: f64,
    pub swirr: f64,
    /// RMS of Sw residuals, v/v.
    pub rms_sw: f64,
    pub points: usize,
}

impl BrooksCoreyJ {
    /// Sw at Leverett J.
    pub fn sw(&self, j: f64) -> f64 {
        crate::capillary::brooks_corey_sw(j, self.jd, self.lambda, self.swirr)
    }
}

/// Step of the Swirr search, v/v.
const SWIRR_STEP: f64 = 0.0025;
/// Saturations at or above this are on the entry plateau (not used for the line).
const PLATEAU_SW: f64 = 0.999;

/// Fit Brooks-Corey in J to (J, Sw) points: for each Swirr on a grid below the
/// lowest Sw, log Se against log J is a straight line (slope −λ, intercept
/// λ·log Jd), fitted by least squares on the points below the plateau; the
/// Swirr with the least RMS Sw residual over all points wins. Least squares on
/// the linearised form is common practice; Brooks & Corey (1964) for the curve.
pub fn fit_brooks_corey(points: &[(f64, f64)]) -> Option<BrooksCoreyJ> {
    let pts: Vec<(f64, f64)> = points
        .iter()
        .copied()
        .filter(|(j, s)| j.is_finite() && *j > 0.0 && s.is_finite())
        .collect();
    let min_sw = pts.iter().map(|p| p.1).fold(f64::INFINITY, f64::min);
    if !min_sw.is_finite() {
        return None;
    }
    let mut best: Option<BrooksCoreyJ> = None;
    let steps = ((min_sw - 1e-6).max(0.0) / SWIRR_STEP).floor() as usize;
    for k in 0..=steps {
        let swirr = k as f64 * SWIRR_STEP;
        if swirr >= min_sw {
            break;
        }
        let line: Vec<(f64, f64)> = pts
            .iter()
            .filter(|p| p.1 < PLATEAU_SW)
            .map(|(j, s)| (j.ln(), ((s - swirr) / (1.0 - swirr)).ln()))
            .collect();
        if line.len() < 3 {
            return None;
        }
        let n = line.len() as f64;
        let mx = line.iter().map(|p| p.0).sum::<f64>() / n;
        let my = line.iter().map(|p| p.1).sum::<f64>() / n;
        let sxx: f64 = line.iter().map(|p| (p.0 - mx).powi(2)).sum();
        let sxy: f64 = line.iter().map(|p| (p.0 - mx) * (p.1 - my)).sum();
        if sxx <= 0.0 {
            return None;
        }
        let b = sxy / sxx;
        let a = my - b * mx;
        let lambda = -b;
        if lambda.is_nan() || lambda <= 0.0 {
            continue;
        }
        let jd = (a / lambda).exp();
        let c = BrooksCoreyJ {
            jd,
            lambda,
            swirr,
            rms_sw: 0.0,
            points: pts.len(),
        };
        let rms = (pts.iter().map(|(j, s)| (s - c.sw(*j)).powi(2)).sum::<f64>() / pts.len() as f64)
            .sqrt();
        if best.as_ref().is_none_or(|b| rms < b.rms_sw) {
            best = Some(BrooksCoreyJ { rms_sw: rms, ..c });
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Points on an exact Brooks-Corey curve (Jd 0.05, λ 1.6, Swirr 0.15, on
    /// the search grid) give the curve back (constructed case).
    #[test]
    fn exact_curve_recovered() {
        let truth = BrooksCoreyJ {
            jd: 0.05,
            lambda: 1.6,
            swirr: 0.15,
            rms_sw: 0.0,
            points: 0,
        };
        let pts: Vec<(f64, f64)> = (0..14)
            .map(|i| {
                let j = 0.03 * 1.45f64.powi(i);
                (j, truth.sw(j))
            })
            .collect();
        let f = fit_brooks_corey(&pts).expect("fit");
        assert!((f.swirr - 0.15).abs() < 1e-9, "{f:?}");
        assert!((f.lambda - 1.6).abs() < 1e-6, "{f:?}");
        assert!((f.jd - 0.05).abs() < 1e-6, "{f:?}");
        assert!(f.rms_sw < 1e-9);
        assert_eq!(fit_brooks_corey(&pts[..2]), None);
    }
}
