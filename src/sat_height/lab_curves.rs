//! Laboratory capillary-pressure curves: read, checked, converted to Leverett
//! J, and fitted per class with a Brooks-Corey or a Thomeer curve in J,
//! whichever has the smaller RMS of Sw.
//!
//! CSV columns: SAMPLE, WELL, DEPTH_MD, POROSITY_FRAC, PERM_MD, the
//! capillary pressure in one of PC_PSI, PC_KPA, PC_MPA or PC_BAR, SW_FRAC
//! (wetting-phase saturation), SYSTEM (mercury-air, air-brine, oil-brine). One row per pressure step; a sample's rows share its porosity
//! and permeability.

use std::collections::BTreeMap;
use std::path::Path;

use serde::{Deserialize, Serialize};

use crate::sat_height::capillary::{FluidSystem, PA_PER_PSI, leverett_j, thomeer_fraction};

/// Pa per unit of each capillary-pressure column (1 bar = 1e5 Pa by
/// definition; psi from NIST SP 811 via [`PA_PER_PSI`]).
const PC_COLUMNS: [(&str, f64); 4] = [
    ("PC_PSI", PA_PER_PSI),
    ("PC_KPA", 1e3),
    ("PC_MPA", 1e6),
    ("PC_BAR", 1e5),
];

/// A row that gives no capillary pressure column, or more than one.
#[derive(Debug, thiserror::Error)]
enum PcColumns {
    #[error("no capillary pressure: give one of PC_PSI, PC_KPA, PC_MPA, PC_BAR")]
    None,
    #[error("capillary pressure given in {} columns ({}): give exactly one", .0.len(), .0.join(", "))]
    Several(Vec<&'static str>),
}

impl Row {
    /// The row's capillary pressure in psi, from whichever one PC_ column it
    /// gives; `Err` naming the columns when none or several are given.
    /// Returns (psi, column, the value as written).
    fn pc_psi(&self) -> Result<(f64, &'static str, f64), PcColumns> {
        let given: Vec<(&'static str, f64, f64)> = PC_COLUMNS
            .iter()
            .zip([self.pc_psi, self.pc_kpa, self.pc_mpa, self.pc_bar])
            .filter_map(|((name, pa), v)| v.map(|v| (*name, *pa, v)))
            .collect();
        match given.as_slice() {
            [(name, pa, v)] => Ok((v * pa / PA_PER_PSI, name, *v)),
            [] => Err(PcColumns::None),
            _ => Err(PcColumns::Several(given.iter().map(|g| g.0).collect())),
        }
    }
}
use crate::input::core_samples::Rejected;
use crate::input::tables::{TableError, read_csv};

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
    #[serde(rename = "PC_PSI", default)]
    pc_psi: Option<f64>,
    #[serde(rename = "PC_KPA", default)]
    pc_kpa: Option<f64>,
    #[serde(rename = "PC_MPA", default)]
    pc_mpa: Option<f64>,
    #[serde(rename = "PC_BAR", default)]
    pc_bar: Option<f64>,
    #[serde(rename = "SW_FRAC")]
    sw: f64,
    #[serde(rename = "SYSTEM")]
    system: String,
}

/// One lab curve.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CapSample {
    /// Sample name (SAMPLE).
    pub sample: String,
    /// Well name as written (WELL).
    pub well: String,
    /// DEPTH_MD as written in the file, not converted.
    pub depth: f64,
    /// Plug porosity, v/v (POROSITY_FRAC).
    pub porosity: f64,
    /// Plug permeability, mD (PERM_MD).
    pub perm_md: f64,
    /// The lab fluid system.
    #[serde(skip)]
    pub system: FluidSystem,
    /// (σ·|cos θ| of the lab system, dyn/cm).
    pub sigma_cos_lab: f64,
    /// (Pc psi, Sw v/v) steps by increasing Pc (file order among equal Pc).
    pub steps: Vec<(f64, f64)>,
    /// Leverett J of each step (dimensionless), paired with `steps`.
    pub j: Vec<f64>,
    /// File line of the sample's first accepted row (1-based, header = 1).
    pub line: u64,
}

/// Fewest pressure steps a sample needs to be kept.
pub const MIN_STEPS: usize = 3;

/// Largest rise of the wetting saturation (v/v) allowed from one step to any
/// step at a higher Pc before a sample is rejected. A drainage curve cannot
/// gain wetting phase as Pc rises, but step readings carry volumetric reading
/// errors, so lab-data QC commonly allows a few saturation units of noise
/// before calling a curve non-monotonic (common practice; the value 0.03 is
/// our choice within that habit).
pub const MONOTONIC_TOLERANCE_SW: f64 = 0.03;

/// Read a capillary-pressure CSV. Rows that cannot be used (unknown system,
/// Pc not a finite number above 0 in psi, Sw outside 0-1, porosity outside
/// (0, 0.5], permeability not a finite number above 0, a depth that is not
/// finite, a sample whose porosity or permeability changes between rows) are
/// left out with their line. Each sample's steps
/// are then sorted by increasing Pc, and a whole sample is left out (with the
/// line of its first row) when it has fewer than [`MIN_STEPS`] steps or its Sw
/// rises by more than [`MONOTONIC_TOLERANCE_SW`] towards a higher Pc. The
/// rejected list is in line order.
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
        let pc_psi = match r.pc_psi() {
            Ok((pc, _, _)) if pc.is_finite() && pc > 0.0 => pc,
            Ok((pc, name, raw)) => {
                let what = if pc.is_finite() {
                    "is not above 0"
                } else {
                    "is not a finite pressure"
                };
                rejected.push(Rejected {
                    line,
                    reason: format!("{name} {raw} {what}"),
                });
                continue;
            }
            Err(e) => {
                rejected.push(Rejected {
                    line,
                    reason: e.to_string(),
                });
                continue;
            }
        };
        if !(0.0..=1.0).contains(&r.sw) {
            rejected.push(Rejected {
                line,
                reason: format!("SW_FRAC {} is outside 0-1", r.sw),
            });
            continue;
        }
        if !(r.porosity > 0.0 && r.porosity <= 0.5 && r.perm_md > 0.0 && r.perm_md.is_finite()) {
            rejected.push(Rejected {
                line,
                reason: format!(
                    "porosity {} or permeability {} mD not usable",
                    r.porosity, r.perm_md
                ),
            });
            continue;
        }
        if !r.depth.is_finite() {
            rejected.push(Rejected {
                line,
                reason: format!("depth {} is not a finite number", r.depth),
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
            system,
            sigma_cos_lab: sc,
            steps: Vec::new(),
            j: Vec::new(),
            line,
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
        entry.steps.push((pc_psi, r.sw));
        entry
            .j
            .push(leverett_j(pc_psi, sc, entry.perm_md, entry.porosity));
    }
    let mut samples = Vec::with_capacity(by.len());
    for mut s in by.into_values() {
        let mut paired: Vec<((f64, f64), f64)> =
            s.steps.iter().copied().zip(s.j.iter().copied()).collect();
        // stable: equal Pc keep their file order
        paired.sort_by(|a, b| a.0.0.total_cmp(&b.0.0));
        (s.steps, s.j) = paired.into_iter().unzip();
        match sample_problem(&s) {
            Some(reason) => rejected.push(Rejected {
                line: s.line,
                reason,
            }),
            None => samples.push(s),
        }
    }
    rejected.sort_by_key(|r| r.line);
    Ok((samples, rejected))
}

/// Why a whole sample (steps sorted by Pc) cannot be used, or `None`.
fn sample_problem(s: &CapSample) -> Option<String> {
    let head = format!("sample {} (first row at line {})", s.sample, s.line);
    if s.steps.len() < MIN_STEPS {
        return Some(format!(
            "{head}: {} pressure step(s), a curve needs at least {MIN_STEPS}",
            s.steps.len()
        ));
    }
    // the largest rise of Sw from a step to any step at a strictly higher Pc
    let mut worst: Option<((f64, f64), (f64, f64))> = None;
    for (i, a) in s.steps.iter().enumerate() {
        for b in &s.steps[i + 1..] {
            if b.0 > a.0 && worst.is_none_or(|(wa, wb)| b.1 - a.1 > wb.1 - wa.1) {
                worst = Some((*a, *b));
            }
        }
    }
    let (a, b) = worst?;
    // 1e-9 keeps a rise of exactly the tolerance, written in decimals, in
    (b.1 - a.1 > MONOTONIC_TOLERANCE_SW + 1e-9).then(|| {
        format!(
            "{head}: Sw rises from {} at Pc {} psi to {} at Pc {} psi, more than the {} v/v allowed as noise",
            a.1, a.0, b.1, b.0, MONOTONIC_TOLERANCE_SW
        )
    })
}

/// The (J, Sw) pairs a fit can use: J finite and above 0, Sw finite.
fn usable(points: &[(f64, f64)]) -> Vec<(f64, f64)> {
    points
        .iter()
        .copied()
        .filter(|(j, s)| j.is_finite() && *j > 0.0 && s.is_finite())
        .collect()
}

/// RMS of Sw residuals (v/v) of `curve` over `pts`; NaN when `pts` is empty.
fn rms_of(pts: &[(f64, f64)], curve: impl Fn(f64) -> f64) -> f64 {
    (pts.iter()
        .map(|(j, s)| (s - curve(*j)).powi(2))
        .sum::<f64>()
        / pts.len() as f64)
        .sqrt()
}

/// A Brooks-Corey curve in J: Sw = Swirr + (1 − Swirr)·(Jd/J)^λ above Jd.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BrooksCoreyJ {
    /// Entry J (dimensionless): Sw is 1 at or below it.
    pub jd: f64,
    /// Pore-size distribution index λ (dimensionless).
    pub lambda: f64,
    /// Irreducible wetting saturation Swirr, v/v.
    pub swirr: f64,
    /// RMS of Sw residuals, v/v.
    pub rms_sw: f64,
    /// Number of (J, Sw) points fitted.
    pub points: usize,
}

impl BrooksCoreyJ {
    /// Sw at Leverett J.
    pub fn sw(&self, j: f64) -> f64 {
        crate::sat_height::capillary::brooks_corey_sw(j, self.jd, self.lambda, self.swirr)
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
/// [`fit_j_curve`] polishes this fit further to the least RMS.
pub fn fit_brooks_corey(points: &[(f64, f64)]) -> Option<BrooksCoreyJ> {
    let pts = usable(points);
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
        // x = ln J does not depend on Swirr: no spread in it fails every step alike
        let Some(f) = crate::stats::fit_line(&line) else {
            continue;
        };
        let (a, b) = (f.intercept, f.slope);
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
        let rms = rms_of(&pts, |j| c.sw(j));
        if best.as_ref().is_none_or(|b| rms < b.rms_sw) {
            best = Some(BrooksCoreyJ { rms_sw: rms, ..c });
        }
    }
    best
}

/// Move a Brooks-Corey fit to the least RMS of Sw over `pts` by a
/// Nelder-Mead simplex on (ln Jd, ln λ, 0 ≤ Swirr < 1), as [`fit_thomeer`]
/// ends, so that the two forms' RMS compare on equal terms. Never worse than
/// `start`. Simplex: Nelder & Mead (1965), from memory.
fn polish_brooks_corey(pts: &[(f64, f64)], start: &BrooksCoreyJ) -> BrooksCoreyJ {
    let objective = |p: &[f64; 3]| -> f64 {
        if !(p[2] >= 0.0 && p[2] < 1.0) {
            return f64::INFINITY;
        }
        let (jd, lambda) = (p[0].exp(), p[1].exp());
        let r = rms_of(pts, |j| {
            crate::sat_height::capillary::brooks_corey_sw(j, jd, lambda, p[2])
        });
        if r.is_finite() { r } else { f64::INFINITY }
    };
    // Swirr may start at 0, so its first step is upwards
    let (p, rms) = nelder_mead(
        objective,
        [start.jd.ln(), start.lambda.ln(), start.swirr],
        [0.05, 0.1, 4.0 * SWIRR_STEP],
    );
    BrooksCoreyJ {
        jd: p[0].exp(),
        lambda: p[1].exp(),
        swirr: p[2],
        rms_sw: rms,
        points: pts.len(),
    }
}

/// Whether Sw falls as J rises over `below` (the points below the plateau):
/// the least-squares slope of Sw against ln J is negative. Without it the
/// Thomeer fit would end on a step (G → 0) through rising data.
fn falls_with_j(below: &[(f64, f64)]) -> bool {
    let n = below.len() as f64;
    let mx = below.iter().map(|p| p.0.ln()).sum::<f64>() / n;
    let my = below.iter().map(|p| p.1).sum::<f64>() / n;
    let sxy: f64 = below.iter().map(|p| (p.0.ln() - mx) * (p.1 - my)).sum();
    sxy < 0.0
}

/// Thomeer's hyperbola written in Leverett J: the non-wetting saturation is
/// Snw = Snw∞·exp(−G/log10(J/Jd)) for J > Jd and 0 at or below, and
/// Sw = 1 − Snw.
///
/// | field | unit |
/// |---|---|
/// | `jd` | dimensionless (entry J: Sw is 1 at or below it) |
/// | `g` | dimensionless (Thomeer's pore geometrical factor) |
/// | `snw_inf` | v/v of pore volume (non-wetting saturation at infinite J) |
/// | `rms_sw` | v/v (RMS of the fit's Sw residuals) |
///
/// # Source
/// Thomeer (1960), Introduction of a pore geometrical factor defined by the
/// capillary pressure curve, JPT 12(3), 73-77 (from memory; formulas.md §8.5),
/// which writes it in Pc with the displacement pressure Pd and the bulk
/// volume Bv∞. Writing it in J, with Snw∞ as a fraction of pore volume, is
/// our choice, so that one curve serves a class of plugs as the Brooks-Corey
/// curve does here; for one plug J is proportional to Pc, so J/Jd = Pc/Pd and
/// G is the same number in both spaces.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ThomeerJ {
    /// Entry J (dimensionless): Sw is 1 at or below it.
    pub jd: f64,
    /// Thomeer's pore geometrical factor G (dimensionless).
    pub g: f64,
    /// Non-wetting saturation at infinite J, v/v of pore volume.
    pub snw_inf: f64,
    /// RMS of Sw residuals, v/v.
    pub rms_sw: f64,
    /// Number of (J, Sw) points fitted.
    pub points: usize,
}

impl ThomeerJ {
    /// Sw (v/v) at Leverett J: 1 − Snw∞·exp(−G/log10(J/Jd)) above Jd, 1 at or
    /// below (Thomeer 1960, see the type).
    pub fn sw(&self, j: f64) -> f64 {
        1.0 - self.snw_inf * thomeer_fraction(j, self.jd, self.g)
    }
}

/// Number of log-spaced Jd values in the Thomeer grid.
const JD_GRID_N: usize = 200;
/// The Jd grid starts at the smallest J divided by this.
const JD_GRID_SPAN: f64 = 20.0;
/// Step of the Snw∞ grid, v/v.
const SNW_INF_STEP: f64 = 0.0025;
/// Iteration cap of the simplex polish (one iteration is one to four RMS
/// evaluations; a few hundred are enough on 50 points).
const POLISH_MAX_ITER: usize = 2000;

/// Fit Thomeer in J ([`ThomeerJ`]) to (J, Sw) points; `None` with fewer than
/// 3 points below the entry plateau (Sw < 0.999), when Sw does not fall as J
/// rises, or when no G > 0 exists.
///
/// Method, deterministic: (1) a grid of 200 log-spaced Jd from the smallest J
/// over 20 to just below the first J below the plateau, and of Snw∞ on a
/// 0.0025 grid above the largest observed Snw up to 1; (2) for each pair, G
/// from least squares through the origin on the linearised form
/// ln(Snw/Snw∞) = −G/log10(J/Jd) over the points below the plateau
/// (G = Σxy/Σx², x = −1/log10(J/Jd), y = ln(Snw/Snw∞)), kept when above 0;
/// (3) the candidate with the least RMS of Sw over all points (plateau
/// included) is polished by a Nelder-Mead simplex on (ln Jd, ln G, Snw∞ ≤ 1)
/// minimising the same RMS. Least squares on a linearised form is common
/// practice; the simplex is Nelder & Mead (1965), Computer Journal 7(4),
/// 308-313 (from memory); the grid and the polish are our choice.
pub fn fit_thomeer(points: &[(f64, f64)]) -> Option<ThomeerJ> {
    let pts = usable(points);
    let below: Vec<(f64, f64)> = pts.iter().copied().filter(|p| p.1 < PLATEAU_SW).collect();
    if below.len() < 3 || !falls_with_j(&below) {
        return None;
    }
    let j_min = pts.iter().map(|p| p.0).fold(f64::INFINITY, f64::min);
    let j_first = below.iter().map(|p| p.0).fold(f64::INFINITY, f64::min);
    let max_snw = below.iter().map(|p| 1.0 - p.1).fold(0.0, f64::max);
    let jd_lo = j_min / JD_GRID_SPAN;
    let jd_hi = j_first * (1.0 - 1e-6);
    let k_hi = (1.0 / SNW_INF_STEP).round() as usize;
    let k_lo = (max_snw / SNW_INF_STEP).floor() as usize + 1;
    let mut snw_grid: Vec<f64> = (k_lo..=k_hi).map(|k| k as f64 * SNW_INF_STEP).collect();
    if snw_grid.is_empty() {
        snw_grid.push(1.0);
    }
    let ln_ratio = (jd_hi / jd_lo).ln();
    let mut best: Option<(f64, [f64; 3])> = None;
    for a in 0..JD_GRID_N {
        let jd = jd_lo * (ln_ratio * a as f64 / (JD_GRID_N - 1) as f64).exp();
        // every point below the plateau lies above jd, so x is finite and < 0
        let xs: Vec<f64> = below.iter().map(|(j, _)| -1.0 / (j / jd).log10()).collect();
        let sxx: f64 = xs.iter().map(|x| x * x).sum();
        if !(sxx.is_finite() && sxx > 0.0) {
            continue;
        }
        for &snw_inf in &snw_grid {
            let sxy: f64 = xs
                .iter()
                .zip(&below)
                .map(|(x, (_, sw))| x * ((1.0 - sw) / snw_inf).ln())
                .sum();
            let g = sxy / sxx;
            if !(g.is_finite() && g > 0.0) {
                continue;
            }
            let rms = rms_of(&pts, |j| 1.0 - snw_inf * thomeer_fraction(j, jd, g));
            if best.is_none_or(|(b, _)| rms < b) {
                best = Some((rms, [jd.ln(), g.ln(), snw_inf]));
            }
        }
    }
    let (_, start) = best?;
    let objective = |p: &[f64; 3]| -> f64 {
        if !(p[2] > 0.0 && p[2] <= 1.0) {
            return f64::INFINITY;
        }
        let (jd, g) = (p[0].exp(), p[1].exp());
        let r = rms_of(&pts, |j| 1.0 - p[2] * thomeer_fraction(j, jd, g));
        if r.is_finite() { r } else { f64::INFINITY }
    };
    let jd_step = ln_ratio / (JD_GRID_N - 1) as f64;
    let (p, rms) = nelder_mead(objective, start, [jd_step.max(1e-3), 0.1, -0.01]);
    Some(ThomeerJ {
        jd: p[0].exp(),
        g: p[1].exp(),
        snw_inf: p[2],
        rms_sw: rms,
        points: pts.len(),
    })
}

/// Minimise `f` from `x0` by the Nelder-Mead simplex (Nelder & Mead 1965,
/// from memory; reflection 1, expansion 2, contraction ½, shrink ½), with a
/// first simplex of `x0` and `x0` moved by `step` along each axis. Stops after
/// [`POLISH_MAX_ITER`] iterations or when the simplex has collapsed. Returns
/// the best vertex and its value; it is never worse than `x0`.
fn nelder_mead(f: impl Fn(&[f64; 3]) -> f64, x0: [f64; 3], step: [f64; 3]) -> ([f64; 3], f64) {
    let mut simplex: Vec<([f64; 3], f64)> = Vec::with_capacity(4);
    simplex.push((x0, f(&x0)));
    for (i, s) in step.iter().enumerate() {
        let mut x = x0;
        x[i] += s;
        simplex.push((x, f(&x)));
    }
    let along = |from: &[f64; 3], to: &[f64; 3], t: f64| -> [f64; 3] {
        [0, 1, 2].map(|i| from[i] + t * (to[i] - from[i]))
    };
    for _ in 0..POLISH_MAX_ITER {
        simplex.sort_by(|a, b| a.1.total_cmp(&b.1));
        let size = simplex[1..]
            .iter()
            .flat_map(|(x, _)| (0..3).map(|i| (x[i] - simplex[0].0[i]).abs()))
            .fold(0.0, f64::max);
        if size < 1e-12 {
            break;
        }
        let centroid = [0, 1, 2].map(|i| simplex[..3].iter().map(|(x, _)| x[i]).sum::<f64>() / 3.0);
        let (worst, f_worst) = simplex[3];
        let reflected = along(&centroid, &worst, -1.0);
        let f_r = f(&reflected);
        if f_r < simplex[0].1 {
            let expanded = along(&centroid, &worst, -2.0);
            let f_e = f(&expanded);
            simplex[3] = if f_e < f_r {
                (expanded, f_e)
            } else {
                (reflected, f_r)
            };
        } else if f_r < simplex[2].1 {
            simplex[3] = (reflected, f_r);
        } else {
            // contract towards the better of the worst vertex and its reflection
            let (toward, f_t) = if f_r < f_worst {
                (reflected, f_r)
            } else {
                (worst, f_worst)
            };
            let contracted = along(&centroid, &toward, 0.5);
            let f_c = f(&contracted);
            if f_c < f_t {
                simplex[3] = (contracted, f_c);
            } else {
                let best = simplex[0].0;
                for v in &mut simplex[1..] {
                    v.0 = along(&best, &v.0, 0.5);
                    v.1 = f(&v.0);
                }
            }
        }
    }
    simplex.sort_by(|a, b| a.1.total_cmp(&b.1));
    simplex[0]
}

/// A fitted J-curve of either form.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(tag = "form", rename_all = "kebab-case")]
pub enum JCurve {
    /// Brooks-Corey in J ([`BrooksCoreyJ`]).
    BrooksCorey(BrooksCoreyJ),
    /// Thomeer in J ([`ThomeerJ`]).
    Thomeer(ThomeerJ),
}

impl JCurve {
    /// Sw (v/v) at Leverett J, by the curve's own formula.
    pub fn sw(&self, j: f64) -> f64 {
        match self {
            JCurve::BrooksCorey(c) => c.sw(j),
            JCurve::Thomeer(c) => c.sw(j),
        }
    }

    /// RMS of the fit's Sw residuals, v/v.
    pub fn rms_sw(&self) -> f64 {
        match self {
            JCurve::BrooksCorey(c) => c.rms_sw,
            JCurve::Thomeer(c) => c.rms_sw,
        }
    }

    /// Number of (J, Sw) points fitted.
    pub fn points(&self) -> usize {
        match self {
            JCurve::BrooksCorey(c) => c.points,
            JCurve::Thomeer(c) => c.points,
        }
    }

    /// "brooks-corey" or "thomeer", as serialised.
    pub fn form_name(&self) -> &'static str {
        match self {
            JCurve::BrooksCorey(_) => "brooks-corey",
            JCurve::Thomeer(_) => "thomeer",
        }
    }

    /// Entry J (dimensionless): the J above which Sw first drops below 1 (Jd
    /// of either form).
    pub fn entry_j(&self) -> f64 {
        match self {
            JCurve::BrooksCorey(c) => c.jd,
            JCurve::Thomeer(c) => c.jd,
        }
    }
}

/// Fewest usable (J, Sw) points [`fit_j_curve`] accepts, plateau included.
pub const MIN_J_POINTS: usize = 4;
/// Fewest points below the entry plateau (Sw < 0.999) either form needs.
pub const MIN_J_POINTS_BELOW_PLATEAU: usize = 3;

/// How [`fit_j_curve`] chooses between the forms, for reports.
pub const J_FORM_CRITERION: &str = "least RMS of Sw (v/v) over all points, plateau included; \
     Brooks-Corey (Jd, lambda, Swirr) and Thomeer (Jd, G, Snw_inf) both have three parameters \
     and are both fitted to that RMS, so their RMS compare fairly; Brooks-Corey on a tie";

/// Both fits of a set of (J, Sw) points and the chosen one.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct JFit {
    /// The form with the smaller RMS of Sw (Brooks-Corey on a tie).
    pub chosen: JCurve,
    /// The Brooks-Corey fit, polished; `None` when it cannot be fitted.
    pub brooks_corey: Option<BrooksCoreyJ>,
    /// The Thomeer fit; `None` when it cannot be fitted.
    pub thomeer: Option<ThomeerJ>,
}

/// Why no J-function comes out of a class's (J, Sw) points.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum JFitError {
    /// Fewer than [`MIN_J_POINTS`] usable points.
    #[error("{count} usable (J, Sw) points: a J-function needs at least {MIN_J_POINTS}")]
    TooFewPoints {
        /// Usable points.
        count: usize,
    },
    /// Fewer than [`MIN_J_POINTS_BELOW_PLATEAU`] points below the plateau.
    #[error(
        "{count} points below the entry plateau (Sw < {PLATEAU_SW}): a J-function needs at least {MIN_J_POINTS_BELOW_PLATEAU}"
    )]
    TooFewBelowPlateau {
        /// Points below the plateau.
        count: usize,
    },
    /// Sw does not fall as J rises below the plateau.
    #[error("Sw does not fall as J rises over the {count} points below the entry plateau")]
    NotFalling {
        /// Points below the plateau.
        count: usize,
    },
    /// Neither curve form could be fitted.
    #[error("neither Brooks-Corey nor Thomeer fits the {count} points")]
    NoForm {
        /// Usable points.
        count: usize,
    },
}

/// Fit Brooks-Corey ([`fit_brooks_corey`], then polished to the least RMS as
/// [`fit_thomeer`] is) and Thomeer ([`fit_thomeer`]) in J to (J, Sw) points,
/// and choose the one with the smaller RMS of Sw over all points
/// ([`J_FORM_CRITERION`]): both forms have three parameters and both are
/// fitted to that same RMS, so neither gains from extra freedom; Brooks-Corey
/// wins a tie. A [`JFitError`] with fewer than [`MIN_J_POINTS`]
/// usable points, fewer than [`MIN_J_POINTS_BELOW_PLATEAU`] below the plateau,
/// when Sw does not fall as J rises, or when neither form fits.
pub fn fit_j_curve(points: &[(f64, f64)]) -> Result<JFit, JFitError> {
    let pts = usable(points);
    if pts.len() < MIN_J_POINTS {
        return Err(JFitError::TooFewPoints { count: pts.len() });
    }
    let below: Vec<(f64, f64)> = pts.iter().copied().filter(|p| p.1 < PLATEAU_SW).collect();
    if below.len() < MIN_J_POINTS_BELOW_PLATEAU {
        return Err(JFitError::TooFewBelowPlateau { count: below.len() });
    }
    if !falls_with_j(&below) {
        return Err(JFitError::NotFalling { count: below.len() });
    }
    let brooks_corey = fit_brooks_corey(&pts).map(|b| polish_brooks_corey(&pts, &b));
    let thomeer = fit_thomeer(&pts);
    let chosen = match (&brooks_corey, &thomeer) {
        (Some(b), Some(t)) if t.rms_sw < b.rms_sw => JCurve::Thomeer(t.clone()),
        (Some(b), _) => JCurve::BrooksCorey(b.clone()),
        (None, Some(t)) => JCurve::Thomeer(t.clone()),
        (None, None) => return Err(JFitError::NoForm { count: pts.len() }),
    };
    Ok(JFit {
        chosen,
        brooks_corey,
        thomeer,
    })
}

/// RMS (v/v) of a plug's Sw against `curve` at the plug's own J values:
/// sqrt(Σ(Sw − curve.sw(J))²/n). NaN for a sample without steps (`read`
/// never returns one).
pub fn plug_rms(sample: &CapSample, curve: &JCurve) -> f64 {
    let pts: Vec<(f64, f64)> = sample
        .j
        .iter()
        .zip(&sample.steps)
        .map(|(j, st)| (*j, st.1))
        .collect();
    rms_of(&pts, |j| curve.sw(j))
}

/// A Brooks-Corey J-curve (entry J, pore-size index λ, irreducible Sw) with
/// no fit statistics, for tests that build saturation-height models by hand.
#[cfg(test)]
pub(crate) fn brooks_corey_j(jd: f64, lambda: f64, swirr: f64) -> JCurve {
    JCurve::BrooksCorey(BrooksCoreyJ {
        jd,
        lambda,
        swirr,
        rms_sw: 0.0,
        points: 0,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

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

    /// Thomeer with jd 5, G 0.3, Snw∞ 1 in J reproduces the 1 − SHg column of
    /// formulas.md §8.5 (Pd 5 psi, G 0.3), since J/Jd plays Pc/Pd; the table
    /// gives 5 digits, hence relative 1e-4.
    #[test]
    fn thomeer_sw_matches_table() {
        let c = ThomeerJ {
            jd: 5.0,
            g: 0.3,
            snw_inf: 1.0,
            rms_sw: 0.0,
            points: 0,
        };
        for (j, sw) in [
            (6.0, 0.97738),
            (10.0, 0.63086),
            (50.0, 0.25918),
            (500.0, 0.13929),
        ] {
            assert_close(c.sw(j), sw, 1e-4 * sw);
        }
        assert_eq!(c.sw(5.0), 1.0);
        assert_eq!(c.sw(1.0), 1.0);
        // Snw∞ scales the non-wetting part: at J = 50, 1 − 0.8·e^−0.3
        let c8 = ThomeerJ { snw_inf: 0.8, ..c };
        assert_close(c8.sw(50.0), 1.0 - 0.8 * (-0.3f64).exp(), 1e-12);
    }

    /// A Thomeer curve (Jd 0.04, G 0.25, Snw∞ 0.85) and 14 exact points on it,
    /// J log-spaced 0.03-3 (constructed case).
    fn thomeer_truth() -> (ThomeerJ, Vec<(f64, f64)>) {
        let truth = ThomeerJ {
            jd: 0.04,
            g: 0.25,
            snw_inf: 0.85,
            rms_sw: 0.0,
            points: 0,
        };
        let pts = (0..14)
            .map(|i| {
                let j = 0.03 * 100f64.powf(i as f64 / 13.0);
                (j, truth.sw(j))
            })
            .collect();
        (truth, pts)
    }

    /// The exact Thomeer points give the curve back: Jd within 2 %, G within
    /// 3 %, Snw∞ within 0.005, RMS below 0.002 (tolerances of the brief; the
    /// polish gets much closer).
    #[test]
    fn exact_thomeer_recovered() {
        let (_, pts) = thomeer_truth();
        let f = fit_thomeer(&pts).expect("fit");
        assert!((f.jd / 0.04 - 1.0).abs() < 0.02, "{f:?}");
        assert!((f.g / 0.25 - 1.0).abs() < 0.03, "{f:?}");
        assert!((f.snw_inf - 0.85).abs() < 0.005, "{f:?}");
        assert!(f.rms_sw < 0.002, "{f:?}");
        assert_eq!(f.points, 14);
        // deterministic
        assert_eq!(fit_thomeer(&pts), Some(f));
        // two points below the plateau are not enough
        assert_eq!(fit_thomeer(&pts[..3]), None);
    }

    /// Each form is chosen on exact points of itself (constructed cases), the
    /// other form is still reported, and the tagged JSON names the form.
    #[test]
    fn fit_j_curve_chooses_generating_form() {
        let bc = BrooksCoreyJ {
            jd: 0.05,
            lambda: 1.6,
            swirr: 0.15,
            rms_sw: 0.0,
            points: 0,
        };
        let bc_pts: Vec<(f64, f64)> = (0..14)
            .map(|i| {
                let j = 0.03 * 1.45f64.powi(i);
                (j, bc.sw(j))
            })
            .collect();
        let f = fit_j_curve(&bc_pts).expect("fit");
        assert_eq!(f.chosen.form_name(), "brooks-corey", "{f:?}");
        assert!(f.thomeer.as_ref().expect("thomeer").rms_sw > f.chosen.rms_sw());
        assert_close(f.chosen.entry_j(), 0.05, 1e-6);
        assert_eq!(f.chosen.points(), 14);

        let (_, th_pts) = thomeer_truth();
        let f = fit_j_curve(&th_pts).expect("fit");
        assert_eq!(f.chosen.form_name(), "thomeer", "{f:?}");
        assert!(f.brooks_corey.as_ref().expect("bc").rms_sw > f.chosen.rms_sw());
        assert!((f.chosen.entry_j() / 0.04 - 1.0).abs() < 0.02);
        let json = serde_json::to_string(&f.chosen).expect("json");
        assert!(json.contains(r#""form":"thomeer""#), "{json}");
        let back: JCurve = serde_json::from_str(&json).expect("back");
        assert_eq!(back.form_name(), "thomeer");
        // serde_json may round the last bit
        assert_close(back.entry_j(), f.chosen.entry_j(), 1e-15);
    }

    /// Too few points, or too few below the plateau, are an Err naming the count.
    #[test]
    fn fit_j_curve_too_few_points_is_err() {
        let e = fit_j_curve(&[(0.1, 0.8), (0.2, 0.6)]).expect_err("2 points");
        assert_eq!(e, JFitError::TooFewPoints { count: 2 });
        assert!(e.to_string().starts_with("2 usable"), "{e}");
        let e = fit_j_curve(&[(0.01, 1.0), (0.02, 1.0), (0.1, 0.8), (0.2, 0.6)])
            .expect_err("2 below the plateau");
        assert_eq!(e, JFitError::TooFewBelowPlateau { count: 2 });
        assert!(
            e.to_string()
                .starts_with("2 points below the entry plateau"),
            "{e}"
        );
        // Sw rising with J: no J-function
        let rising = [(0.1, 0.3), (0.2, 0.5), (0.4, 0.7), (0.8, 0.9)];
        let e = fit_j_curve(&rising).expect_err("rising");
        assert_eq!(e, JFitError::NotFalling { count: 4 });
        assert!(e.to_string().starts_with("Sw does not fall"), "{e}");
        assert_eq!(fit_thomeer(&rising), None);
    }

    /// Sw 0.02 above the curve at every step gives a plug RMS of 0.02
    /// (constructed case).
    #[test]
    fn plug_rms_of_shifted_plug() {
        let (truth, pts) = thomeer_truth();
        let curve = JCurve::Thomeer(truth);
        let plug = CapSample {
            sample: "P".into(),
            well: "W".into(),
            depth: 0.0,
            porosity: 0.2,
            perm_md: 10.0,
            system: FluidSystem::MercuryAir,
            sigma_cos_lab: 367.7,
            steps: pts.iter().map(|(j, s)| (*j, s + 0.02)).collect(),
            j: pts.iter().map(|p| p.0).collect(),
            line: 2,
        };
        assert_close(plug_rms(&plug, &curve), 0.02, 1e-12);
    }

    /// A file with a good sample (rows out of Pc order), a sample whose Sw rises
    /// by 0.1 at a higher Pc and a sample with two steps (constructed case):
    /// only the good one is kept, sorted by Pc with J paired; the others are
    /// rejected at the line of their first row with their name in the reason.
    /// Pressures in kPa read as psi: 10, 20, 40 psi are 68.94757, 137.89514,
    /// 275.79028 kPa (1 psi = 6894.757 Pa, NIST SP 811); a row with two
    /// pressure columns or none is left out with the reason.
    #[test]
    fn pressure_unit_columns() {
        let dir = tempfile::tempdir().expect("tempdir");
        let path = dir.path().join("cap.csv");
        let mut text =
            "SAMPLE,WELL,DEPTH_MD,POROSITY_FRAC,PERM_MD,PC_PSI,PC_KPA,SW_FRAC,SYSTEM\n".to_string();
        for (kpa, sw) in [(68.94757, 1.0), (137.89514, 0.8), (275.79028, 0.5)] {
            text += &format!("K,W,1,0.2,50,,{kpa},{sw},mercury-air\n");
        }
        text += "K,W,1,0.2,50,80,551.58,0.4,mercury-air\n";
        text += "K,W,1,0.2,50,,,0.3,mercury-air\n";
        std::fs::write(&path, text).expect("write");
        let (samples, rejected) = read(&path).expect("read");
        let pcs: Vec<f64> = samples[0].steps.iter().map(|s| s.0).collect();
        for (got, want) in pcs.iter().zip([10.0, 20.0, 40.0]) {
            assert_close(*got, want, 1e-6);
        }
        assert_eq!(rejected.len(), 2, "{rejected:?}");
        assert!(
            rejected[0].reason.contains("PC_PSI, PC_KPA"),
            "{rejected:?}"
        );
        assert!(
            rejected[1].reason.contains("no capillary pressure"),
            "{rejected:?}"
        );
    }

    #[test]
    fn read_checks_samples_and_sorts_steps() {
        let dir = tempfile::tempdir().expect("tempdir");
        let path = dir.path().join("cap.csv");
        let head = "SAMPLE,WELL,DEPTH_MD,POROSITY_FRAC,PERM_MD,PC_PSI,SW_FRAC,SYSTEM\n";
        let row =
            |s: &str, pc: f64, sw: f64| format!("{s},W-1,2000.0,0.2,50,{pc},{sw},mercury-air\n");
        let mut text = head.to_string();
        for (pc, sw) in [(40.0, 0.7), (10.0, 1.0), (80.0, 0.5), (20.0, 0.9)] {
            text += &row("GOOD", pc, sw); // lines 2-5
        }
        for (pc, sw) in [(10.0, 1.0), (20.0, 0.6), (40.0, 0.7), (80.0, 0.4)] {
            text += &row("BAD", pc, sw); // lines 6-9
        }
        for (pc, sw) in [(10.0, 1.0), (20.0, 0.8)] {
            text += &row("SHORT", pc, sw); // lines 10-11
        }
        std::fs::write(&path, text).expect("write");
        let (samples, rejected) = read(&path).expect("read");
        assert_eq!(samples.len(), 1, "{samples:?}");
        let good = &samples[0];
        assert_eq!(good.sample, "GOOD");
        assert_eq!(good.line, 2);
        assert_eq!(
            good.steps,
            [(10.0, 1.0), (20.0, 0.9), (40.0, 0.7), (80.0, 0.5)]
        );
        for ((pc, _), j) in good.steps.iter().zip(&good.j) {
            assert_close(*j, leverett_j(*pc, good.sigma_cos_lab, 50.0, 0.2), 1e-12);
        }
        assert_eq!(rejected.len(), 2, "{rejected:?}");
        assert_eq!(rejected[0].line, 6);
        let r = &rejected[0].reason;
        assert!(r.contains("sample BAD") && r.contains("line 6"), "{r}");
        assert!(r.contains("0.6 at Pc 20 psi to 0.7 at Pc 40 psi"), "{r}");
        assert_eq!(rejected[1].line, 10);
        let r = &rejected[1].reason;
        assert!(
            r.contains("sample SHORT") && r.contains("2 pressure step"),
            "{r}"
        );
    }
}
