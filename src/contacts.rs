//! The contact audit: every saturation step along a well, found and
//! explained as a rock-quality step, a fluid contact, or unexplained; the free
//! water level each well's logs imply, against its compartment's.
//!
//! ```text
//! SW (class-aware) ─► segments (penalised least squares, min bed) ─► steps ≥ min-step
//! each step: rock change? (CLASS, PERM) + SWH step of the same sign and size ─► rock-quality
//!            no rock change + model puts that saturation at this height        ─► fluid-contact
//!            otherwise                                                        ─► unexplained
//!            bad hole or out-of-range input at the step                        ─► flagged
//! SW against SWH(FWL) over the well ─► implied FWL ± σ ─► agrees with the compartment?
//! ```
//!
//! Units: depths in the project's unit (MD, TVDSS, HAFWL), heights for the
//! saturation-height model in m, saturation v/v, permeability mD.

use serde::{Deserialize, Serialize};

use crate::config::ContactsConfig;
use crate::output::schema::Col;
use crate::output::schema::{FLAG_MISSING_INPUT, FLAG_OUT_OF_RANGE, FLAG_OUTSIDE_ZONE};
use crate::output::{OutColumn, Table};
use crate::sat_height::{CompartmentFwl, SatHeightModel};
use crate::units::DepthUnit;

/// What a step is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum StepKind {
    /// The rock changes at the step and the saturation-height model predicts it.
    RockQuality,
    /// No rock change; the model puts this saturation change at this height.
    FluidContact,
    /// Neither: another FWL, a perched or compartmentalised contact, a tar mat, bad logs.
    Unexplained,
    /// Bad hole or an input out of range at the step: reported, not attributed.
    Flagged,
}

impl StepKind {
    /// The kind's name as written in contacts.csv (KIND) and contacts.json.
    pub fn name(self) -> &'static str {
        match self {
            StepKind::RockQuality => "rock-quality",
            StepKind::FluidContact => "fluid-contact",
            StepKind::Unexplained => "unexplained",
            StepKind::Flagged => "flagged",
        }
    }

    /// The value written in the CONTACT curve.
    pub fn code(self) -> f64 {
        match self {
            StepKind::RockQuality => 1.0,
            StepKind::FluidContact => 2.0,
            StepKind::Unexplained => 3.0,
            StepKind::Flagged => 4.0,
        }
    }
}

/// One saturation step.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct Step {
    /// Well name.
    pub well: String,
    /// MD and TVDSS of the step (between the last sample above and the first
    /// below), project depth unit.
    pub depth_md: f64,
    /// TVDSS of the step, project depth unit; NaN when the well has no TVDSS.
    pub tvdss: f64,
    /// How the step is explained.
    pub kind: StepKind,
    /// Mean SW over the bed just above and just below, v/v.
    pub sw_above: f64,
    /// Mean SW over the bed just below, v/v.
    pub sw_below: f64,
    /// Most common class just above and below (0: no class, e.g. shale).
    pub class_above: u8,
    /// Most common class just below (0: no class).
    pub class_below: u8,
    /// Mean modelled SW (SWH; 1 in shale) just above and below, v/v.
    pub swh_above: f64,
    /// Mean modelled SW just below, v/v.
    pub swh_below: f64,
    /// Height above the compartment's FWL, project depth unit.
    pub hafwl: f64,
    /// For a step without rock change: the height (project depth unit) at
    /// which the model gives this rock the step's middle saturation.
    pub model_height: Option<f64>,
    /// Why the step has its kind, in words (EXPLANATION in contacts.csv).
    pub explanation: String,
    /// Row of the first sample below the step.
    #[serde(skip)]
    pub row: usize,
}

/// The FWL a well's logs imply.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct ImpliedFwl {
    /// Best fit, TVDSS project depth unit; `None` when the logs only bound it.
    pub fwl_tvdss: Option<f64>,
    /// The range within one standard error (project depth unit); an end is
    /// `None` when the logs do not close it (e.g. no water leg in the well).
    pub lower: Option<f64>,
    /// The shallow end of that range; `None` when the logs do not close it.
    pub upper: Option<f64>,
    /// Depths in the fit: classed, unflagged, with SW, PERM, PHIE and TVDSS.
    pub samples: usize,
    /// RMS of SW − SWH at the best fit, v/v.
    pub rms: f64,
    /// The compartment's FWL and whether the implied one agrees with it.
    pub compartment_fwl: f64,
    /// Whether the implied FWL (or its one-sided bound) agrees with the
    /// compartment's; true when the logs do not constrain it.
    pub agrees: bool,
    /// The comparison with the compartment's FWL, in words.
    pub note: String,
}

/// The audit of one well.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct WellAudit {
    /// Name of the compartment the well is in.
    pub compartment: String,
    /// The saturation steps found, in row order.
    pub steps: Vec<Step>,
    /// The FWL the logs imply; `None` with fewer than 10 usable depths.
    pub implied_fwl: Option<ImpliedFwl>,
}

/// Segment boundaries of a piecewise-constant mean: the rows (1..n) where a
/// new segment starts, each segment at least `min_len` long, minimising the
/// total within-segment sum of squares plus `penalty` per segment. Optimal
/// partitioning (Jackson et al. 2005, IEEE Signal Processing Letters 12(2))
/// with the pruning of PELT (Killick, Fearnhead & Eckley 2012, JASA
/// 107(500)), valid for this cost; from memory.
pub fn segment(x: &[f64], min_len: usize, penalty: f64) -> Vec<usize> {
    let n = x.len();
    let min_len = min_len.max(1);
    if n < 2 * min_len {
        return Vec::new();
    }
    let mut s1 = vec![0.0; n + 1];
    let mut s2 = vec![0.0; n + 1];
    for (i, v) in x.iter().enumerate() {
        s1[i + 1] = s1[i] + v;
        s2[i + 1] = s2[i] + v * v;
    }
    let cost = |a: usize, b: usize| {
        let len = (b - a) as f64;
        let s = s1[b] - s1[a];
        (s2[b] - s2[a] - s * s / len).max(0.0)
    };
    let mut f = vec![f64::INFINITY; n + 1];
    let mut last = vec![0usize; n + 1];
    f[0] = -penalty;
    // candidates with the time from which they are dropped: PELT's rule
    // (F(s) + C(s, t) > F(t) ⇒ s is never the last change before T) needs
    // (t, T] to be a valid segment, so with a minimum length a candidate
    // pruned at t still serves every T < t + min_len
    let mut cands: Vec<(usize, usize)> = vec![(0, usize::MAX)];
    // F(s) + C(s, t) of each candidate at this t, kept for the pruning test
    // (one cost evaluation per candidate, not two: the search's inner loop)
    let mut fc: Vec<f64> = Vec::new();
    for t in min_len..=n {
        if t >= 2 * min_len && f[t - min_len].is_finite() {
            cands.push((t - min_len, usize::MAX));
        }
        cands.retain(|&(_, drop_at)| t < drop_at);
        fc.clear();
        let (mut best, mut arg) = (f64::INFINITY, 0);
        for &(s, _) in &cands {
            let here = f[s] + cost(s, t);
            fc.push(here);
            let v = here + penalty;
            if v < best {
                best = v;
                arg = s;
            }
        }
        f[t] = best;
        last[t] = arg;
        for (c, &here) in cands.iter_mut().zip(&fc) {
            if c.1 == usize::MAX && here > best {
                c.1 = t + min_len;
            }
        }
    }
    let mut cps = Vec::new();
    let mut t = n;
    while t > 0 {
        let s = last[t];
        if s > 0 {
            cps.push(s);
        }
        t = s;
    }
    cps.reverse();
    cps
}

/// One sharp change within one rock can be cut into a staircase: two
/// boundaries around a segment shorter than two minimum lengths whose mean
/// lies between its neighbours', all three of the same class (`class`, the
/// most common in each). Such a pair becomes one boundary, the one with the
/// larger jump; a thin bed of other rock is kept. `bounds` are boundaries of
/// `x` as [`segment`] returns them.
pub fn merge_staircases(x: &[f64], class: &[f64], bounds: &[usize], min_len: usize) -> Vec<usize> {
    let mut b = bounds.to_vec();
    let mean = |a: usize, e: usize| x[a..e].iter().sum::<f64>() / (e - a) as f64;
    loop {
        let edges: Vec<usize> = std::iter::once(0)
            .chain(b.iter().copied())
            .chain(std::iter::once(x.len()))
            .collect();
        let means: Vec<f64> = edges.windows(2).map(|w| mean(w[0], w[1])).collect();
        let classes: Vec<u8> = edges
            .windows(2)
            .map(|w| mode_class(&class[w[0]..w[1]]))
            .collect();
        // segment k (between b[k-1] and b[k]) with neighbours k-1 and k+1
        let merge = (1..means.len().saturating_sub(1)).find(|&k| {
            let short = edges[k + 1] - edges[k] < 2 * min_len;
            let (lo, hi) = (
                means[k - 1].min(means[k + 1]),
                means[k - 1].max(means[k + 1]),
            );
            let same_rock = classes[k - 1] == classes[k] && classes[k] == classes[k + 1];
            short && same_rock && means[k] > lo && means[k] < hi
        });
        let Some(k) = merge else { return b };
        let (jump_up, jump_down) = (
            (means[k] - means[k - 1]).abs(),
            (means[k + 1] - means[k]).abs(),
        );
        // boundaries b[k-1] (into segment k) and b[k] (out of it)
        b.remove(if jump_up >= jump_down { k } else { k - 1 });
    }
}

/// Noise σ of a series from its first differences: 1.4826·MAD/√2 (the MAD
/// scale for a normal distribution; Hampel 1974, JASA 69(346); from memory).
pub fn noise_sigma(x: &[f64]) -> f64 {
    if x.len() < 3 {
        return 0.0;
    }
    let mut d: Vec<f64> = x.windows(2).map(|w| w[1] - w[0]).collect();
    let med = crate::stats::median(&mut d);
    let mut dev: Vec<f64> = d.iter().map(|v| (v - med).abs()).collect();
    1.4826 * crate::stats::median(&mut dev) / std::f64::consts::SQRT_2
}

fn mean_finite(v: impl Iterator<Item = f64>) -> f64 {
    let (mut s, mut n) = (0.0, 0usize);
    for x in v.filter(|x| x.is_finite()) {
        s += x;
        n += 1;
    }
    if n == 0 { f64::NAN } else { s / n as f64 }
}

fn mode_class(c: &[f64]) -> u8 {
    let mut counts = [0usize; 256];
    for v in c {
        let k = if v.is_finite() && *v >= 1.0 && *v <= 255.0 {
            *v as usize
        } else {
            0
        };
        counts[k] += 1;
    }
    // ties: the lowest class number
    let mut best = 0;
    for (k, &n) in counts.iter().enumerate() {
        if n > counts[best] {
            best = k;
        }
    }
    u8::try_from(best).unwrap_or(0)
}

/// The depth-indexed inputs of the audit, project depth unit for depths.
pub struct Profile<'a> {
    /// Measured depth per row, project depth unit.
    pub md: &'a [f64],
    /// TVDSS per row, project depth unit (NaN where unknown).
    pub tvdss: &'a [f64],
    /// Interpreted SW, v/v (NaN where not computed).
    pub sw: &'a [f64],
    /// Modelled SW (SWH), v/v (NaN where undefined).
    pub swh: &'a [f64],
    /// Class number per row (NaN where unclassed, e.g. shale).
    pub class: &'a [f64],
    /// Probability of that class, v/v (NaN where unclassed).
    pub class_prob: &'a [f64],
    /// Permeability, mD.
    pub perm: &'a [f64],
    /// Effective porosity, v/v.
    pub phie: &'a [f64],
    /// FLAG bits per row, as a number.
    pub flag: &'a [f64],
}

/// Bits that keep a depth out of the audit's fits.
const SKIP_FLAGS: u32 = 1 | FLAG_OUT_OF_RANGE | FLAG_MISSING_INPUT | FLAG_OUTSIDE_ZONE;
/// Bits that make a step "flagged" (bad hole, an input out of range).
const STEP_FLAGS: u32 = 1 | FLAG_OUT_OF_RANGE;

fn flag_at(f: &[f64], i: usize) -> u32 {
    f.get(i).filter(|v| v.is_finite()).map_or(0, |v| *v as u32)
}

/// The audit's modelled SW at a depth: SWH, or 1 for an unclassed depth with
/// an SW (shale and other non-reservoir rock hold water).
fn swh_audit(p: &Profile<'_>, i: usize) -> f64 {
    if p.swh[i].is_finite() {
        p.swh[i]
    } else if p.sw[i].is_finite() && !p.class[i].is_finite() {
        1.0
    } else {
        f64::NAN
    }
}

/// `v` seen through a Gaussian of full width at half maximum `fwhm` samples
/// (the model at the logs' resolution): each value the weighted mean of the
/// finite values within three standard deviations; NaN stays NaN. `fwhm`
/// below one sample returns `v` unchanged.
fn blur(v: &[f64], fwhm: f64) -> Vec<f64> {
    if fwhm.is_nan() || fwhm < 1.0 {
        return v.to_vec();
    }
    let sigma = fwhm / (8.0 * std::f64::consts::LN_2).sqrt();
    let half = (3.0 * sigma).ceil() as usize;
    let w: Vec<f64> = (0..=half)
        .map(|d| (-0.5 * (d as f64 / sigma).powi(2)).exp())
        .collect();
    (0..v.len())
        .map(|i| {
            if !v[i].is_finite() {
                return f64::NAN;
            }
            let (mut s, mut ws) = (0.0, 0.0);
            for j in i.saturating_sub(half)..(i + half + 1).min(v.len()) {
                if v[j].is_finite() {
                    let wj = w[i.abs_diff(j)];
                    s += wj * v[j];
                    ws += wj;
                }
            }
            s / ws
        })
        .collect()
}

/// Audit one well: steps and implied FWL. `step_m` is the sample spacing in
/// m (for the minimum bed in samples).
pub fn audit(
    well: &str,
    p: &Profile<'_>,
    model: &SatHeightModel,
    comp: &CompartmentFwl,
    cfg: &ContactsConfig,
    depth_unit: DepthUnit,
) -> WellAudit {
    let n = p.sw.len();
    let to_m = depth_unit.factor_to(DepthUnit::Metre);
    let spacing_m = crate::stats::median(
        &mut p
            .md
            .windows(2)
            .map(|w| (w[1] - w[0]) * to_m)
            .collect::<Vec<_>>(),
    );
    let min_len = if spacing_m > 0.0 {
        ((cfg.min_bed_thickness_m / spacing_m).round() as usize).max(2)
    } else {
        2
    };
    let drho = comp.rho_water_gcc - comp.rho_hc_gcc;
    let swh_seen = blur(
        &(0..n).map(|k| swh_audit(p, k)).collect::<Vec<_>>(),
        cfg.log_resolution_m / spacing_m.max(1e-9),
    );
    let mut steps = Vec::new();
    let mut beds = 0usize;
    // runs of interpreted SW
    let mut i = 0;
    while i < n {
        if !p.sw[i].is_finite() {
            i += 1;
            continue;
        }
        let start = i;
        while i < n && p.sw[i].is_finite() {
            i += 1;
        }
        let run = &p.sw[start..i];
        let sigma = noise_sigma(run).max(0.01);
        let penalty = cfg.penalty * 2.0 * sigma * sigma * (run.len() as f64).ln().max(1.0);
        let bounds = merge_staircases(
            run,
            &p.class[start..i],
            &segment(run, min_len, penalty),
            min_len,
        );
        beds += bounds.len() + 1;
        for b in bounds {
            let b = start + b;
            let (lo, hi) = (b.saturating_sub(min_len).max(start), (b + min_len).min(i));
            let sw_above = mean_finite(p.sw[lo..b].iter().copied());
            let sw_below = mean_finite(p.sw[b..hi].iter().copied());
            if (sw_below - sw_above).abs() < cfg.min_step_vv
                || sw_below.is_nan()
                || sw_above.is_nan()
            {
                continue;
            }
            if let Some(step) = attribute(
                well,
                p,
                &swh_seen,
                model,
                comp,
                cfg,
                (lo, b, hi),
                drho,
                to_m,
            ) {
                steps.push(step);
            }
        }
    }
    let implied_fwl = implied_fwl(p, model, comp, cfg, drho, to_m, beds);
    WellAudit {
        compartment: comp.name.clone(),
        steps,
        implied_fwl,
    }
}

#[allow(clippy::too_many_arguments)]
fn attribute(
    well: &str,
    p: &Profile<'_>,
    swh_seen: &[f64],
    model: &SatHeightModel,
    comp: &CompartmentFwl,
    cfg: &ContactsConfig,
    (lo, b, hi): (usize, usize, usize),
    drho: f64,
    to_m: f64,
) -> Option<Step> {
    let mid = |v: &[f64]| 0.5 * (v[b - 1] + v[b]);
    let (md, tvdss) = (mid(p.md), mid(p.tvdss));
    let hafwl = comp.fwl_tvdss - tvdss;
    let sw_above = mean_finite(p.sw[lo..b].iter().copied());
    let sw_below = mean_finite(p.sw[b..hi].iter().copied());
    let swh_above = mean_finite((lo..b).map(|k| swh_audit(p, k)));
    let swh_below = mean_finite((b..hi).map(|k| swh_audit(p, k)));
    // the model as the logs see it: compared with the logs' SW
    let seen_above = mean_finite(swh_seen[lo..b].iter().copied());
    let seen_below = mean_finite(swh_seen[b..hi].iter().copied());
    let class_above = mode_class(&p.class[lo..b]);
    let class_below = mode_class(&p.class[b..hi]);
    if class_above == 0 && class_below == 0 {
        // no reservoir on either side: SW there is not a reservoir saturation
        return None;
    }
    let log_k = |r: std::ops::Range<usize>| {
        let mut v: Vec<f64> = p.perm[r]
            .iter()
            .filter(|k| **k > 0.0)
            .map(|k| k.log10())
            .collect();
        crate::stats::median(&mut v)
    };
    let (ka, kb) = (log_k(lo..b), log_k(b..hi));
    let perm_change = (ka - kb).abs() >= cfg.rock_perm_ratio.log10();
    let rock_change = class_above != class_below || perm_change;
    let d_sw = sw_below - sw_above;
    let d_swh = seen_below - seen_above;
    let tol = cfg
        .size_tolerance_vv
        .max(cfg.size_tolerance_rel * d_sw.abs());
    let model_agrees = d_swh.is_finite() && d_swh * d_sw > 0.0 && (d_sw - d_swh).abs() <= tol;
    let flagged = (lo..hi).any(|k| flag_at(p.flag, k) & STEP_FLAGS != 0);
    let mut step = Step {
        well: well.to_string(),
        depth_md: md,
        tvdss,
        kind: StepKind::Unexplained,
        sw_above,
        sw_below,
        class_above,
        class_below,
        swh_above,
        swh_below,
        hafwl,
        model_height: None,
        explanation: String::new(),
        row: b,
    };
    let classes = if class_above == class_below {
        format!("class {class_above} on both sides")
    } else {
        format!("class {class_above} above, {class_below} below")
    };
    let observed = format!("SW {sw_above:.2} → {sw_below:.2}");
    let seen = if cfg.log_resolution_m > 0.0 {
        format!(
            " ({seen_above:.2} → {seen_below:.2} at the logs' {} m resolution)",
            cfg.log_resolution_m
        )
    } else {
        String::new()
    };
    if flagged {
        step.kind = StepKind::Flagged;
        step.explanation = format!(
            "{observed} at a bad-hole or out-of-range depth: not attributed; check the logs"
        );
        return Some(step);
    }
    if class_above == 0 || class_below == 0 {
        // reservoir against non-reservoir rock: only the reservoir side's SW
        // is a saturation to explain
        let (side, sw, swh) = if class_above == 0 {
            ("below", sw_below, seen_below)
        } else {
            ("above", sw_above, seen_above)
        };
        let ok = (sw - swh).abs() <= cfg.size_tolerance_vv;
        step.kind = if ok {
            StepKind::RockQuality
        } else {
            StepKind::Unexplained
        };
        step.explanation = if ok {
            format!(
                "reservoir against non-reservoir rock ({classes}); the reservoir {side} has SW {sw:.2} where the model gives {swh:.2}: a rock-quality step"
            )
        } else {
            format!(
                "reservoir against non-reservoir rock ({classes}); the reservoir {side} has SW {sw:.2} but the model with FWL {:.1} gives {swh:.2}: look for another FWL, a perched contact, a tar mat, or bad logs",
                comp.fwl_tvdss
            )
        };
        return Some(step);
    }
    if rock_change {
        if model_agrees {
            step.kind = StepKind::RockQuality;
            step.explanation = format!(
                "{classes}: the saturation-height model with FWL {:.1} predicts SW {swh_above:.2} → {swh_below:.2}{seen}, the logs show {observed}: a rock-quality step, not a contact",
                comp.fwl_tvdss
            );
        } else {
            step.explanation = format!(
                "{classes}, but the saturation-height model with FWL {:.1} predicts SW {swh_above:.2} → {swh_below:.2}{seen} where the logs show {observed}: look for another FWL, a perched or compartmentalised contact, a tar mat, or bad logs",
                comp.fwl_tvdss
            );
        }
        return Some(step);
    }
    // no rock change: where does the model give this rock the step's middle saturation?
    let k = 10f64.powf(crate::stats::median(
        &mut p.perm[lo..hi]
            .iter()
            .filter(|k| **k > 0.0)
            .map(|k| k.log10())
            .collect::<Vec<_>>(),
    ));
    let phi = crate::stats::median(
        &mut p.phie[lo..hi]
            .iter()
            .copied()
            .filter(|v| *v > 0.0)
            .collect::<Vec<_>>(),
    );
    let target = 0.5 * (sw_above + sw_below);
    let h_model =
        model_height_m(model, f64::from(class_above), k, phi, drho, target).map(|h| h / to_m);
    step.model_height = h_model;
    match h_model {
        Some(h) if d_sw > 0.0 && (hafwl - h).abs() * to_m <= cfg.contact_tolerance_m => {
            step.kind = StepKind::FluidContact;
            step.explanation = format!(
                "no rock change ({classes}); the model gives this rock SW {target:.2} at {h:.1} above the FWL and the step is at {hafwl:.1}: the fluid contact (transition to water below)"
            );
        }
        Some(h) => {
            step.explanation = format!(
                "no rock change ({classes}), {observed}; the model gives this rock SW {target:.2} at {h:.1} above the FWL {:.1}, but the step is at {hafwl:.1}: look for another FWL, a perched or compartmentalised contact, a tar mat, or bad logs",
                comp.fwl_tvdss
            );
        }
        None => {
            step.explanation = format!(
                "no rock change ({classes}), {observed}, and the model has no height for SW {target:.2} in this rock: look for another FWL, a perched contact, a tar mat, or bad logs"
            );
        }
    }
    Some(step)
}

/// Height above the FWL (m) at which the model gives a rock of class `class`,
/// k (mD) and φ the saturation `target`: SWH falls with height, so bisection
/// between the FWL and 2 000 m. `None` when the rock is undefined or the model
/// never reaches `target` there.
pub fn model_height_m(
    model: &SatHeightModel,
    class: f64,
    k: f64,
    phi: f64,
    drho: f64,
    target: f64,
) -> Option<f64> {
    let f = |h: f64| model.swh(h, class, k, phi, drho);
    let (mut lo, mut hi) = (1e-6, 2000.0);
    let (flo, fhi) = (f(lo), f(hi));
    if !(flo.is_finite() && fhi.is_finite()) || target > flo || target < fhi {
        return None;
    }
    for _ in 0..60 {
        let m = 0.5 * (lo + hi);
        if f(m) > target {
            lo = m;
        } else {
            hi = m;
        }
    }
    Some(0.5 * (lo + hi))
}

/// Steps of the implied-FWL search, m.
const COARSE_STEP_M: f64 = 2.0;
const FINE_STEP_M: f64 = 0.25;

/// The FWL that best explains the well's SW with its classes and the class
/// J-functions: least squares of SW − SWH(FWL) over classed, unflagged depths,
/// from 20 m above the shallowest depth to 200 m below the deepest: a 2 m
/// grid on a subsample of rows, then 0.25 m steps about the best. The range holds the FWLs whose rise in the sum of squares stays
/// within one residual variance per independent bed: residuals are
/// correlated within a bed, so the well carries about as many independent
/// values as the segmentation found beds (`beds`); its ends are the first
/// grid values outside. Our choice, in the spirit of a profile-likelihood
/// interval.
/// Resamples of the beds for the implied FWL's range.
const BOOTSTRAP_DRAWS: usize = 200;
/// Grid of the resampled fits about the best FWL: 0.5 m steps, ±12 m.
const BOOTSTRAP_STEP_M: f64 = 0.5;
const BOOTSTRAP_HALF_STEPS: i32 = 24;

/// The 16th and 84th percentiles (m TVDSS) of the best FWL over resamples of
/// the beds (runs of consecutive `rows`) drawn with replacement, on a grid
/// about `best`; `misfit(row, fwl)` is a row's weighted squared residual.
/// A block bootstrap (Künsch 1989, Ann. Statist. 17(3), from memory) with
/// beds as blocks, since residuals are correlated within a bed. `None` with
/// fewer than three beds. Draws come from a fixed-seed generator, so a run
/// repeats exactly.
fn bed_bootstrap(
    rows: &[usize],
    best: f64,
    misfit: impl Fn(usize, f64) -> f64,
) -> Option<(f64, f64)> {
    use rand::{Rng, SeedableRng};
    let mut runs: Vec<(usize, usize)> = Vec::new();
    let mut start = 0;
    for k in 1..=rows.len() {
        if k == rows.len() || rows[k] != rows[k - 1] + 1 {
            runs.push((start, k));
            start = k;
        }
    }
    if runs.len() < 3 {
        return None;
    }
    let grid: Vec<f64> = (-BOOTSTRAP_HALF_STEPS..=BOOTSTRAP_HALF_STEPS)
        .map(|k| best + BOOTSTRAP_STEP_M * f64::from(k))
        .collect();
    // each bed's misfit at each grid FWL
    let per_run: Vec<Vec<f64>> = runs
        .iter()
        .map(|&(a, b)| {
            grid.iter()
                .map(|&f| rows[a..b].iter().map(|&i| misfit(i, f)).sum())
                .collect()
        })
        .collect();
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(0x5EED_F00D);
    let mut fits: Vec<f64> = (0..BOOTSTRAP_DRAWS)
        .map(|_| {
            let mut total = vec![0.0; grid.len()];
            for _ in 0..runs.len() {
                let r = &per_run[rng.random_range(0..runs.len())];
                for (t, v) in total.iter_mut().zip(r) {
                    *t += v;
                }
            }
            let k = (0..grid.len())
                .min_by(|&a, &b| total[a].total_cmp(&total[b]))
                .unwrap_or(0);
            grid[k]
        })
        .collect();
    fits.sort_by(f64::total_cmp);
    Some((
        crate::stats::quantile_sorted(&fits, 0.16),
        crate::stats::quantile_sorted(&fits, 0.84),
    ))
}

/// Depths this close to a change of class (a bed boundary, shale included)
/// stay out of the implied FWL, m: half of 0.6 m, the finest vertical
/// resolution of deep resistivity tools (common practice), so a kept depth
/// reads mostly its own bed. Tried on the demo and on the blind benchmark's
/// fields at 0.3 and 0.6 m; 0.6 m leaves thin-bedded wells too few depths.
pub const BED_EDGE_M: f64 = 0.3;

/// Whether each depth lies within `edge` (depth unit) of a change of class
/// (NaN, e.g. shale, counts as a class of its own).
fn near_class_change(class: &[f64], md: &[f64], edge: f64) -> Vec<bool> {
    let n = class.len().min(md.len());
    let same = |a: f64, b: f64| a == b || (a.is_nan() && b.is_nan());
    let edges: Vec<f64> = (1..n)
        .filter(|&i| !same(class[i], class[i - 1]))
        .map(|i| 0.5 * (md[i] + md[i - 1]))
        .collect();
    (0..n)
        .map(|i| {
            let k = edges.partition_point(|e| *e < md[i]);
            let d_up = k.checked_sub(1).map_or(f64::INFINITY, |j| md[i] - edges[j]);
            let d_down = edges.get(k).map_or(f64::INFINITY, |e| e - md[i]);
            d_up.min(d_down) < edge
        })
        .collect()
}

/// A depth kept for the implied FWL, with its rock's saturation-height
/// function looked up once.
struct KeptDepth<'a> {
    /// TVDSS, m.
    t_m: f64,
    /// The class probability (1 without one).
    weight: f64,
    /// Log SW, v/v.
    sw: f64,
    rock: crate::sat_height::RockSwh<'a>,
}

impl KeptDepth<'_> {
    /// Weighted squared SW − SWH were the FWL at `fwl_m` m TVDSS.
    #[inline]
    fn misfit(&self, fwl_m: f64, drho: f64) -> f64 {
        self.weight * (self.sw - self.rock.swh(fwl_m - self.t_m, drho)).powi(2)
    }
}

fn implied_fwl(
    p: &Profile<'_>,
    model: &SatHeightModel,
    comp: &CompartmentFwl,
    cfg: &ContactsConfig,
    drho: f64,
    to_m: f64,
    beds: usize,
) -> Option<ImpliedFwl> {
    let near = near_class_change(p.class, p.md, BED_EDGE_M / to_m);
    let rows: Vec<usize> = (0..p.sw.len())
        .filter(|&i| {
            p.sw[i].is_finite()
                && !near[i]
                && p.class[i].is_finite()
                && p.perm[i] > 0.0
                && p.phie[i] > 0.0
                && p.tvdss[i].is_finite()
                && flag_at(p.flag, i) & SKIP_FLAGS == 0
        })
        .collect();
    if rows.len() < 10 {
        return None;
    }
    // each depth counts as much as its class is sure (a depth without a
    // probability counts fully)
    let weight = |i: usize| {
        p.class_prob
            .get(i)
            .copied()
            .filter(|w| w.is_finite())
            .unwrap_or(1.0)
    };
    // what the FWL search needs of each kept depth, looked up once (the
    // search evaluates every depth at hundreds of trial FWLs)
    let kept: Vec<KeptDepth<'_>> = rows
        .iter()
        .map(|&i| KeptDepth {
            t_m: p.tvdss[i] * to_m,
            weight: weight(i),
            sw: p.sw[i],
            rock: model.rock(p.class[i], p.perm[i], p.phie[i]),
        })
        .collect();
    let t_m: Vec<f64> = kept.iter().map(|d| d.t_m).collect();
    let sse = |fwl_m: f64| -> f64 { kept.iter().map(|d| d.misfit(fwl_m, drho)).sum() };
    let top = t_m.iter().copied().fold(f64::INFINITY, f64::min) - 20.0;
    let bottom = t_m.iter().copied().fold(f64::NEG_INFINITY, f64::max) + 200.0;
    // coarse pass: 2 m steps on at most ~1000 rows
    let stride = (rows.len() / 1000).max(1);
    let sse_coarse = |fwl_m: f64| -> f64 {
        kept.iter()
            .step_by(stride)
            .map(|d| d.misfit(fwl_m, drho))
            .sum()
    };
    let coarse = (0..)
        .map(|k| top + COARSE_STEP_M * f64::from(k))
        .take_while(|f| *f <= bottom)
        .map(|f| (f, sse_coarse(f)))
        .min_by(|a, b| a.1.total_cmp(&b.1))?;
    // fine pass: 0.25 m steps within one coarse step either side, all rows
    let (fbest, smin) = (-8..=8)
        .map(|k| coarse.0 + FINE_STEP_M * f64::from(k))
        .filter(|f| *f >= top && *f <= bottom)
        .map(|f| (f, sse(f)))
        .min_by(|a, b| a.1.total_cmp(&b.1))?;
    let n: f64 = kept.iter().map(|d| d.weight).sum::<f64>().max(1e-9);
    // independent values: the beds the kept depths come from (runs of
    // consecutive kept rows), never more than the segmentation found
    let runs = 1 + rows.windows(2).filter(|w| w[1] != w[0] + 1).count();
    let per_bed = (n / runs.min(beds.max(1)) as f64).max(1.0);
    let s2 = smin / n;
    let allowance = s2 * per_bed;
    // walk out from the best until the sum of squares leaves the allowance:
    // 0.25 m steps for the first 8 m, then 2 m steps; `None` at the grid's end
    let walk = |dir: f64| -> Option<f64> {
        let mut d = 0.0;
        loop {
            d += if d < 8.0 { FINE_STEP_M } else { COARSE_STEP_M };
            let f = fbest + dir * d;
            if f < top || f > bottom {
                return None;
            }
            if sse(f) - smin > allowance {
                return Some(f);
            }
        }
    };
    // resampling the beds: the range also holds the FWLs that the well's
    // beds, drawn again with replacement, put the best fit at (16th-84th
    // percentile), so a few beds that pull the fit widen it
    let mut position = vec![usize::MAX; p.sw.len()];
    for (k, &i) in rows.iter().enumerate() {
        position[i] = k;
    }
    let boot = bed_bootstrap(&rows, fbest, |i, f| kept[position[i]].misfit(f, drho));
    let upper = walk(-1.0).map(|f| f.min(boot.map_or(f, |b| b.0)) / to_m);
    let lower = walk(1.0).map(|f| f.max(boot.map_or(f, |b| b.1)) / to_m);
    let closed = upper.is_some() && lower.is_some();
    let fwl = closed.then_some(fbest / to_m);
    let tol = cfg.fwl_tolerance_m / to_m;
    let cf = comp.fwl_tvdss;
    let comp_sigma = comp.fwl_sigma.unwrap_or(0.0);
    let (agrees, note) = match (upper, lower) {
        (Some(u), Some(l)) => {
            let sigma = 0.5 * (l - u);
            let bound = tol.max(2.0 * (sigma * sigma + comp_sigma * comp_sigma).sqrt());
            let d = fbest / to_m - cf;
            (
                d.abs() <= bound,
                format!(
                    "logs imply FWL {:.1} (range {u:.1}-{l:.1}), the compartment's is {cf:.1}: {}",
                    fbest / to_m,
                    if d.abs() <= bound {
                        "they agree".to_string()
                    } else {
                        format!("{d:+.1} apart, beyond {bound:.1}: possibly another compartment")
                    }
                ),
            )
        }
        (Some(u), None) => (
            cf + tol >= u,
            format!(
                "logs only bound the FWL: at or below {u:.1} (no water leg seen); the compartment's {cf:.1} {}",
                if cf + tol >= u {
                    "is consistent"
                } else {
                    "is too shallow: possibly another compartment"
                }
            ),
        ),
        (None, Some(l)) => (
            cf - tol <= l,
            format!(
                "logs only bound the FWL: at or above {l:.1}; the compartment's {cf:.1} {}",
                if cf - tol <= l {
                    "is consistent"
                } else {
                    "is too deep: possibly another compartment"
                }
            ),
        ),
        (None, None) => (true, "the logs do not constrain the FWL".into()),
    };
    Some(ImpliedFwl {
        fwl_tvdss: fwl,
        lower,
        upper,
        samples: rows.len(),
        rms: (smin / n).sqrt(),
        compartment_fwl: cf,
        agrees,
        note,
    })
}

/// Audit a well's table (after SWH) and add the CONTACT curve (before FLAG):
/// the step's kind code at the first sample below each step, 0 elsewhere.
pub fn apply(
    table: &mut Table,
    well: &str,
    names: &[&str],
    model: &SatHeightModel,
    cfg: &ContactsConfig,
    depth_unit: DepthUnit,
) -> Option<WellAudit> {
    let comp = model.compartment(names)?;
    let n = table.n_rows();
    let nan = vec![f64::NAN; n];
    let get = |c: Col| table.get(c).unwrap_or(&nan);
    let p = Profile {
        md: get(Col::Depth),
        tvdss: get(Col::Tvdss),
        sw: get(Col::Sw),
        swh: get(Col::Swh),
        class: get(Col::Class),
        class_prob: get(Col::ClassProb),
        perm: get(Col::Perm),
        phie: get(Col::Phie),
        flag: get(Col::Flag),
    };
    let audit = audit(well, &p, model, comp, cfg, depth_unit);
    let mut curve = vec![0.0; n];
    for s in &audit.steps {
        curve[s.row] = s.kind.code();
    }
    let at = table.position(Col::Flag).unwrap_or(table.columns.len());
    table
        .columns
        .insert(at, OutColumn::new(Col::Contact, depth_unit, curve));
    Some(audit)
}

/// A fluid contact seen in a well, and the FWL it implies.
#[derive(Debug, Clone, Serialize)]
pub struct ApparentContact {
    /// Well name.
    pub well: String,
    /// MD of the step, project depth unit.
    pub depth_md: f64,
    /// TVDSS of the step, project depth unit.
    pub tvdss: f64,
    /// TVDSS of the contact plus the model's height for its saturation:
    /// where this contact puts the FWL.
    pub fwl_from_contact: Option<f64>,
}

/// One compartment across its wells.
#[derive(Debug, Clone, Serialize)]
pub struct CompartmentView {
    /// Compartment name.
    pub name: String,
    /// The compartment's FWL, TVDSS project depth unit.
    pub fwl_tvdss: f64,
    /// One standard error of that FWL, project depth unit; `None` unless it
    /// comes from the pressure fit.
    pub fwl_sigma: Option<f64>,
    /// Where the FWL comes from: "config" or "pressures".
    pub fwl_source: String,
    /// Each well's implied FWL (from its logs) with its note.
    pub wells: Vec<(String, Option<ImpliedFwl>)>,
    /// The fluid-contact steps in its wells.
    pub apparent_contacts: Vec<ApparentContact>,
    /// Wells whose implied FWL or contacts do not line up with the compartment's FWL.
    pub not_lined_up: Vec<String>,
}

/// The field view: per compartment, contacts and FWLs across wells.
pub fn field_view(
    model: &SatHeightModel,
    audits: &[(String, &WellAudit)],
    cfg: &ContactsConfig,
    depth_unit: DepthUnit,
) -> Vec<CompartmentView> {
    let tol = cfg.contact_tolerance_m / depth_unit.factor_to(DepthUnit::Metre);
    model
        .compartments
        .iter()
        .map(|c| {
            let mine: Vec<&(String, &WellAudit)> = audits
                .iter()
                .filter(|(_, a)| a.compartment == c.name)
                .collect();
            let apparent_contacts: Vec<ApparentContact> = mine
                .iter()
                .flat_map(|(w, a)| {
                    a.steps
                        .iter()
                        .filter(|s| s.kind == StepKind::FluidContact)
                        .map(|s| ApparentContact {
                            well: w.clone(),
                            depth_md: s.depth_md,
                            tvdss: s.tvdss,
                            fwl_from_contact: s.model_height.map(|h| s.tvdss + h),
                        })
                })
                .collect();
            let mut not_lined_up: Vec<String> = mine
                .iter()
                .filter(|(w, a)| {
                    a.implied_fwl.as_ref().is_some_and(|f| !f.agrees)
                        || apparent_contacts.iter().any(|ac| {
                            ac.well == *w
                                && ac
                                    .fwl_from_contact
                                    .is_some_and(|f| (f - c.fwl_tvdss).abs() > tol)
                        })
                })
                .map(|(w, _)| w.clone())
                .collect();
            not_lined_up.dedup();
            CompartmentView {
                name: c.name.clone(),
                fwl_tvdss: c.fwl_tvdss,
                fwl_sigma: c.fwl_sigma,
                fwl_source: c.source.clone(),
                wells: mine
                    .iter()
                    .map(|(w, a)| (w.clone(), a.implied_fwl.clone()))
                    .collect(),
                apparent_contacts,
                not_lined_up,
            }
        })
        .collect()
}

/// contacts.json: the steps and the field view.
#[derive(Debug, Serialize)]
struct ContactsJson<'a> {
    caution: &'static str,
    depth_unit: DepthUnit,
    kinds: [(&'static str, &'static str); 4],
    steps: Vec<&'a Step>,
    compartments: &'a [CompartmentView],
}

/// Write `contacts.csv` (one row per step) and `contacts.json` (the steps
/// and the field view) into `out`. Returns the paths.
pub fn write_outputs(
    out: &std::path::Path,
    steps: &[&Step],
    view: &[CompartmentView],
    depth_unit: DepthUnit,
) -> Result<Vec<std::path::PathBuf>, crate::output::OutputError> {
    use std::io::Write as _;
    let json_path = out.join("contacts.json");
    let doc = ContactsJson {
        caution: crate::sat_height::CAUTION,
        depth_unit,
        kinds: [
            (
                "rock-quality",
                "the rock changes at the step and the saturation-height model predicts a step of that sign and size",
            ),
            (
                "fluid-contact",
                "no rock change; the model gives this rock the step's saturation at about this height above the FWL",
            ),
            (
                "unexplained",
                "neither: another FWL, a perched or compartmentalised contact, a tar mat, or bad logs; look at it",
            ),
            (
                "flagged",
                "bad hole or an input out of range at the step; not attributed",
            ),
        ],
        steps: steps.to_vec(),
        compartments: view,
    };
    let io = |p: &std::path::Path| {
        let p = p.to_path_buf();
        move |e: std::io::Error| crate::output::OutputError::Io {
            path: p.clone(),
            source: e,
        }
    };
    crate::output::write_atomic(&json_path, |w| {
        serde_json::to_writer_pretty(&mut *w, &doc)
            .map_err(|e| io(&json_path)(std::io::Error::other(e)))?;
        w.write_all(b"\n").map_err(io(&json_path))
    })?;
    let csv_path = out.join("contacts.csv");
    crate::output::write_atomic(&csv_path, |w| {
        let mut c = csv::Writer::from_writer(w);
        let e = |e: csv::Error| io(&csv_path)(std::io::Error::other(e));
        c.write_record([
            "WELL",
            "DEPTH",
            "TVDSS",
            "KIND",
            "SW_ABOVE",
            "SW_BELOW",
            "CLASS_ABOVE",
            "CLASS_BELOW",
            "SWH_ABOVE",
            "SWH_BELOW",
            "HAFWL",
            "EXPLANATION",
        ])
        .map_err(e)?;
        let f = |v: f64| {
            if v.is_finite() {
                format!("{v:.4}")
            } else {
                String::new()
            }
        };
        let class = |c: u8| if c == 0 { String::new() } else { c.to_string() };
        for s in steps {
            c.write_record([
                s.well.clone(),
                f(s.depth_md),
                f(s.tvdss),
                s.kind.name().to_string(),
                f(s.sw_above),
                f(s.sw_below),
                class(s.class_above),
                class(s.class_below),
                f(s.swh_above),
                f(s.swh_below),
                f(s.hafwl),
                s.explanation.clone(),
            ])
            .map_err(e)?;
        }
        c.flush().map_err(io(&csv_path))
    })?;
    Ok(vec![csv_path, json_path])
}

#[cfg(test)]
mod tests;
