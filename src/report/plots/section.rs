//! The cross-section of a compartment: its wells side by side on one TVDSS
//! axis, each a narrow column with its class band (width = probability, as on
//! the well page) and SW against SWH, the zone tops joined between wells, the
//! compartment's FWL with its standard error as a band, each well's implied
//! FWL with its range, and the audited steps marked by kind.
//!
//! A compartment of more than [`PANEL_WELLS`] wells is drawn as panels stacked
//! in one SVG, each on the same depth axis, so a hundred wells stay readable.

use crate::report::plots::{CompartmentWells, FieldWell, Profile, STEP_MARKS};
use crate::report::svg::{Anchor, Scale, Shape, Stroke, Svg, nice_ticks, num, palette, tick_label};

/// Most wells in one panel of the cross-section.
pub const PANEL_WELLS: usize = 30;

const W: f64 = 1360.0;
/// Left edge of the data area (the TVDSS axis and the zone names are left of it).
pub(super) const L: f64 = 120.0;
/// Longest zone name drawn whole in the margin.
const ZONE_LABEL_CHARS: usize = 12;
/// Right edge of the data area; the legend is right of it.
pub(super) const R: f64 = 1150.0;
const LEG_X: f64 = 1168.0;
/// Title block height.
const TITLE_H: f64 = 52.0;
/// Room above a panel's data for the well names.
const LABEL_H: f64 = 78.0;
/// Height of a panel's data area, px.
const DATA_H: f64 = 540.0;
/// Room below a panel's data.
const FOOT_H: f64 = 34.0;
/// Widest slot per well, px (few wells do not make fat columns).
const MAX_SLOT: f64 = 120.0;
/// Probability steps of the class band (runs merge within a step).
const PROB_STEPS: f64 = 5.0;

fn panel_h() -> f64 {
    LABEL_H + DATA_H + FOOT_H
}

/// TVDSS extent of what the section draws: profiles, the FWL band, implied
/// FWLs and steps; `None` when no well has a profile.
fn extent(c: &CompartmentWells<'_>) -> Option<(f64, f64)> {
    let mut lo = f64::INFINITY;
    let mut hi = f64::NEG_INFINITY;
    for w in &c.wells {
        if let Some(p) = w.profile {
            lo = lo.min(p.top);
            hi = hi.max(p.base());
        }
    }
    if !lo.is_finite() {
        return None;
    }
    let sigma = c.fwl_sigma.unwrap_or(0.0);
    let mut more = vec![c.fwl - sigma, c.fwl + sigma];
    for w in &c.wells {
        if let Some(m) = w.implied {
            more.extend([m.best, m.lower, m.upper].into_iter().flatten());
        }
    }
    // a value far off the logged interval (a one-sided bound) would squash
    // the logs: the axis reaches at most half the logged span beyond it
    let reach = 0.5 * (hi - lo).max(1.0);
    for v in more.into_iter().filter(|v| v.is_finite()) {
        lo = lo.min(v.max(lo - reach));
        hi = hi.max(v.min(hi + reach));
    }
    let pad = 0.02 * (hi - lo).max(1.0);
    Some((lo - pad, hi + pad))
}

/// The cross-section of a compartment, as an SVG document.
pub fn cross_section(c: &CompartmentWells<'_>, depth_unit: &str) -> String {
    let panels = c.wells.len().div_ceil(PANEL_WELLS).max(1);
    let height = TITLE_H + panels as f64 * panel_h();
    let mut s = Svg::new(W, height);
    s.group("cross-section", None);
    title(&mut s, c, depth_unit);
    let Some((lo, hi)) = extent(c) else {
        s.text_styled(
            L,
            TITLE_H + LABEL_H + 30.0,
            "no well of this compartment has TVDSS and interpreted depths: nothing to draw",
            12.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
        s.group("no-data", None);
        s.end_group();
        s.end_group();
        return s.finish();
    };
    for (k, chunk) in c.wells.chunks(PANEL_WELLS.max(1)).enumerate() {
        let top = TITLE_H + k as f64 * panel_h() + LABEL_H;
        let depth = Scale::linear(lo, hi, top, top + DATA_H);
        panel(&mut s, c, chunk, &depth, depth_unit);
    }
    legend(&mut s, c);
    s.end_group();
    s.finish()
}

fn title(s: &mut Svg, c: &CompartmentWells<'_>, depth_unit: &str) {
    s.group("title", None);
    let n = c.wells.len();
    s.text(
        L,
        20.0,
        &format!(
            "Compartment {}: {n} well{} on TVDSS ({depth_unit})",
            c.name,
            if n == 1 { "" } else { "s" }
        ),
        15.0,
        Anchor::Start,
    );
    let fwl = match c.fwl_sigma {
        Some(sd) => format!(
            "FWL {} ± {} {depth_unit} ({})",
            num(c.fwl),
            num(sd),
            c.fwl_source
        ),
        None => format!("FWL {} {depth_unit} ({})", num(c.fwl), c.fwl_source),
    };
    s.text_styled(
        L,
        36.0,
        &format!("{fwl}; {}", c.order),
        10.0,
        Anchor::Start,
        palette::FRAME,
        0.0,
    );
    s.end_group();
}

/// Left edge and width of well `i`'s column (and its slot) in a panel of `n`.
fn column(i: usize, n: usize) -> (f64, f64, f64) {
    let slot = ((R - L) / n.max(1) as f64).min(MAX_SLOT);
    let x = L + slot * i as f64;
    let w = (slot * 0.6).max(4.0);
    (x + 0.1 * slot, w, slot)
}

fn panel(
    s: &mut Svg,
    c: &CompartmentWells<'_>,
    wells: &[FieldWell<'_>],
    depth: &Scale,
    depth_unit: &str,
) {
    let top = depth.px(match *depth {
        Scale::Linear { lo, .. } | Scale::Log { lo, .. } => lo,
    });
    let bottom = top + DATA_H;
    s.group("panel", None);
    tvdss_axis(s, depth, top, bottom, 8, depth_unit);
    fwl_band(s, c, depth, top, bottom);
    zone_ties(s, wells, depth, top, bottom);
    for (i, w) in wells.iter().enumerate() {
        let (x, cw, slot) = column(i, wells.len());
        well_column(s, w, x, cw, slot, depth, top, bottom, depth_unit);
    }
    s.end_group();
}

/// The TVDSS grid across the data area, its labels and the axis title;
/// `top` and `bottom` are the pixels of the scale's ends.
pub(super) fn tvdss_axis(
    s: &mut Svg,
    depth: &Scale,
    top: f64,
    bottom: f64,
    ticks: usize,
    depth_unit: &str,
) {
    let (lo, hi) = match *depth {
        Scale::Linear { lo, hi, .. } | Scale::Log { lo, hi, .. } => (lo, hi),
    };
    s.group("axis", None);
    for t in nice_ticks(lo, hi, ticks) {
        let y = depth.px(t);
        s.line(L, y, R, y, Stroke::solid(palette::GRID, 0.6));
        s.text(L - 6.0, y + 3.5, &tick_label(t), 10.0, Anchor::End);
    }
    s.text_styled(
        16.0,
        (top + bottom) / 2.0,
        &format!("TVDSS {depth_unit}"),
        11.0,
        Anchor::Middle,
        "#000000",
        -90.0,
    );
    s.end_group();
}

/// The compartment's FWL across the data area: a band of one standard
/// error, then the dashed line, labelled.
pub(super) fn fwl_band(
    s: &mut Svg,
    c: &CompartmentWells<'_>,
    depth: &Scale,
    top: f64,
    bottom: f64,
) {
    let fwl_y = depth.px(c.fwl);
    s.group("fwl-band", Some(&format!("compartment FWL {}", num(c.fwl))));
    if let Some(sd) = c.fwl_sigma.filter(|v| *v > 0.0) {
        let (a, b) = (
            depth.px(c.fwl - sd).clamp(top, bottom),
            depth.px(c.fwl + sd).clamp(top, bottom),
        );
        s.rect_faint(L, a, R - L, b - a, palette::SKY_BLUE, 0.35);
    }
    if (top..=bottom).contains(&fwl_y) {
        s.line(
            L,
            fwl_y,
            R,
            fwl_y,
            Stroke::dashed(palette::BLUE, 1.5, "8 4"),
        );
        s.text_styled(
            R - 3.0,
            fwl_y - 3.0,
            "FWL",
            10.0,
            Anchor::End,
            palette::BLUE,
            0.0,
        );
    }
    s.end_group();
}

/// Each zone's top joined from well to well (dashed between columns, solid across one).
fn zone_ties(s: &mut Svg, wells: &[FieldWell<'_>], depth: &Scale, top: f64, bottom: f64) {
    let mut names: Vec<&str> = Vec::new();
    for w in wells {
        for (z, _) in w.profile.map_or(&[][..], |p| p.tops.as_slice()) {
            if !names.contains(&z.as_str()) {
                names.push(z);
            }
        }
    }
    if names.is_empty() {
        return;
    }
    s.group("zone-ties", None);
    let n = wells.len();
    for name in names {
        let at = |i: usize| -> Option<f64> {
            wells[i]
                .profile?
                .tops
                .iter()
                .find(|(z, _)| z == name)
                .map(|(_, t)| depth.px(*t))
                .filter(|y| (top..=bottom).contains(y))
        };
        s.group("zone-tie", Some(&format!("top {name}")));
        let mut last: Option<(f64, f64)> = None;
        for i in 0..n {
            let Some(y) = at(i) else { continue };
            let (x, cw, _) = column(i, n);
            s.line(x, y, x + cw, y, Stroke::solid(palette::FRAME, 1.0));
            if let Some((lx, ly)) = last {
                s.line(lx, ly, x, y, Stroke::dashed(palette::FRAME, 0.8, "3 2"));
            } else {
                // in the margin left of the depth labels (the tooltip has
                // a long name whole)
                let short: String = if name.chars().count() > ZONE_LABEL_CHARS {
                    let mut t: String = name.chars().take(ZONE_LABEL_CHARS - 1).collect();
                    t.push('…');
                    t
                } else {
                    name.to_string()
                };
                s.line(L, y, x, y, Stroke::dashed(palette::FRAME, 0.6, "1 2"));
                s.text_styled(
                    L - 46.0,
                    y + 3.0,
                    &short,
                    9.0,
                    Anchor::End,
                    palette::FRAME,
                    0.0,
                );
            }
            last = Some((x + cw, y));
        }
        s.end_group();
    }
    s.end_group();
}

/// One well's column: label, class band, SW and SWH, steps, implied FWL.
#[allow(clippy::too_many_arguments)]
fn well_column(
    s: &mut Svg,
    w: &FieldWell<'_>,
    x: f64,
    cw: f64,
    slot: f64,
    depth: &Scale,
    top: f64,
    bottom: f64,
    depth_unit: &str,
) {
    let (panel_top, panel_bottom) = (top, bottom);
    let mut tip = w.name.to_string();
    if w.flagged {
        tip.push_str(": possibly under another FWL");
    }
    s.group(
        if w.flagged {
            "section-well flagged"
        } else {
            "section-well"
        },
        Some(&tip),
    );
    let colour = if w.flagged {
        palette::VERMILLION
    } else {
        "#000000"
    };
    let label = if w.flagged {
        format!("{} ◆", w.name)
    } else {
        w.name.to_string()
    };
    s.text_styled(
        x + cw / 2.0,
        top - 6.0,
        &label,
        if slot < 30.0 { 8.0 } else { 10.0 },
        Anchor::Start,
        colour,
        -55.0,
    );
    if let Some(a) = w.along {
        s.text_styled(
            x + cw / 2.0,
            bottom + 13.0,
            &format!("{:.1}", a / 1000.0),
            8.0,
            Anchor::Middle,
            palette::FRAME,
            0.0,
        );
    }
    // the column spans the well's interpreted interval only
    let (top, bottom) = w.profile.map_or((top, bottom), |p| {
        (
            depth.px(p.top).clamp(top, bottom),
            depth.px(p.base()).clamp(top, bottom),
        )
    });
    s.rect(x, top, cw, bottom - top, "#FFFFFF", None);
    let band_w = cw * 0.45;
    match w.profile {
        Some(p) => {
            class_band(s, p, x, band_w, depth);
            curves(s, p, x + band_w, cw - band_w, depth);
        }
        None => s.text_styled(
            x + cw / 2.0,
            top + 8.0,
            "no TVDSS",
            8.0,
            Anchor::Start,
            palette::FRAME,
            90.0,
        ),
    }
    s.rect(
        x,
        top,
        cw,
        bottom - top,
        "none",
        Some(Stroke::solid(palette::FRAME, 0.8)),
    );
    step_marks(s, w, x + cw, depth, panel_top, panel_bottom, depth_unit);
    implied_fwl(
        s,
        w,
        x + cw + 0.12 * slot.min(40.0) + 2.0,
        depth,
        panel_top,
        panel_bottom,
        depth_unit,
        4.0,
    );
    s.end_group();
}

/// Pixels within which steps of one kind share a marker.
const STEP_MERGE_PX: f64 = 6.0;

/// The well's audited steps as markers on its column's right edge, shape
/// and colour by kind; steps of a kind closer than [`STEP_MERGE_PX`] share
/// one marker whose tooltip counts them (a long well can have hundreds).
fn step_marks(
    s: &mut Svg,
    w: &FieldWell<'_>,
    x: f64,
    depth: &Scale,
    top: f64,
    bottom: f64,
    depth_unit: &str,
) {
    for (kind, colour, shape) in STEP_MARKS {
        let mut ys: Vec<(f64, f64)> = w
            .steps
            .iter()
            .filter(|(_, k)| *k == kind)
            .map(|&(z, _)| (depth.px(z), z))
            .filter(|(y, _)| (top..=bottom).contains(y))
            .collect();
        ys.sort_by(|a, b| a.0.total_cmp(&b.0));
        let mut i = 0;
        while i < ys.len() {
            let mut j = i + 1;
            while j < ys.len() && ys[j].0 - ys[i].0 < STEP_MERGE_PX {
                j += 1;
            }
            let title = if j - i == 1 {
                format!("{kind} step at TVDSS {} {depth_unit}", num(ys[i].1))
            } else {
                format!(
                    "{} {kind} steps at TVDSS {}-{} {depth_unit}",
                    j - i,
                    num(ys[i].1),
                    num(ys[j - 1].1)
                )
            };
            s.group("step-mark", Some(&title));
            s.marker(shape, x, 0.5 * (ys[i].0 + ys[j - 1].0), 3.5, colour, None);
            s.end_group();
            i = j;
        }
    }
}

/// The class band: runs of bins of one class and probability step, width
/// = mean probability of the class.
fn class_band(s: &mut Svg, p: &Profile, x: f64, w: f64, depth: &Scale) {
    s.group("class-band", None);
    let mut i = 0;
    let n = p.class.len();
    while i < n {
        let c = p.class[i];
        if c == 0 {
            i += 1;
            continue;
        }
        let step = |k: usize| (f64::from(p.prob[k]).clamp(0.0, 1.0) * PROB_STEPS).round();
        let b = step(i);
        let mut j = i + 1;
        let mut sum = f64::from(p.prob[i]);
        while j < n && p.class[j] == c && step(j) == b {
            sum += f64::from(p.prob[j]);
            j += 1;
        }
        let mean = (sum / (j - i) as f64).clamp(0.05, 1.0);
        let y0 = depth.px(p.top + p.step * i as f64);
        let y1 = depth.px(p.top + p.step * j as f64);
        s.rect(x, y0, w * mean, (y1 - y0).max(0.5), palette::class(c), None);
        i = j;
    }
    s.end_group();
}

/// SW (solid) and SWH (dashed) on 0-1 across the column's right part.
fn curves(s: &mut Svg, p: &Profile, x: f64, w: f64, depth: &Scale) {
    let xs = Scale::linear(0.0, 1.0, x + 1.0, x + w - 1.0);
    let line = |v: &[f32]| -> Vec<(f64, f64)> {
        v.iter()
            .enumerate()
            .map(|(i, &sw)| {
                let y = depth.px(p.top + p.step * (i as f64 + 0.5));
                (xs.px_clamped(f64::from(sw)), y)
            })
            .collect()
    };
    s.group("sw", None);
    s.polyline(&line(&p.sw), Stroke::solid(palette::BLUE, 1.1));
    s.end_group();
    s.group("swh", None);
    s.polyline(
        &line(&p.swh),
        Stroke::dashed(palette::VERMILLION, 1.0, "4 2"),
    );
    s.end_group();
}

/// A well's implied FWL at `x` between `top` and `bottom` px: its range as
/// a bar (an open end runs to the edge, dotted), its best fit as a marker of
/// radius `r` (1.3 `r` when flagged); flagged wells in vermillion with a
/// diamond, the others black with a circle. Shared by the cross-section and
/// the FWL chart.
#[allow(clippy::too_many_arguments)]
pub fn implied_fwl(
    s: &mut Svg,
    w: &FieldWell<'_>,
    x: f64,
    depth: &Scale,
    top: f64,
    bottom: f64,
    depth_unit: &str,
    r: f64,
) {
    let Some(m) = w.implied else { return };
    let (colour, shape) = agreement_mark(w.flagged);
    let range = match (m.upper, m.lower) {
        (Some(u), Some(l)) => format!("{}-{}", num(u), num(l)),
        (None, Some(l)) => format!("above {}", num(l)),
        (Some(u), None) => format!("below {}", num(u)),
        (None, None) => "open".into(),
    };
    let best = m.best.map_or_else(|| "bounded only".into(), num);
    s.group(
        if w.flagged {
            "implied-fwl flagged"
        } else {
            "implied-fwl"
        },
        Some(&format!(
            "{}: logs imply FWL {best} (range {range}) {depth_unit} TVDSS{}",
            w.name,
            if w.flagged {
                "; possibly under another FWL"
            } else {
                ""
            }
        )),
    );
    let px = |v: Option<f64>, open: f64| v.map_or(open, |v| depth.px(v).clamp(top, bottom));
    let (y_up, y_lo) = (px(m.upper, top), px(m.lower, bottom));
    let solid = Stroke::solid(colour, 1.7);
    let bar = if m.upper.is_some() && m.lower.is_some() {
        solid
    } else {
        Stroke::dashed(colour, 1.3, "1 2")
    };
    s.line(x, y_up, x, y_lo, bar);
    for (end, y) in [(m.upper, y_up), (m.lower, y_lo)] {
        if end.is_some() {
            s.line(x - 0.8 * r, y, x + 0.8 * r, y, solid);
        }
    }
    if let Some(y) = m
        .best
        .map(|b| depth.px(b))
        .filter(|y| (top..=bottom).contains(y))
    {
        let r = if w.flagged { 1.3 * r } else { r };
        s.marker(shape, x, y, r, colour, Some(Stroke::solid("#FFFFFF", 0.8)));
    }
    s.end_group();
}

/// The legend rows the section and the FWL chart share: the compartment
/// FWL band, then the implied FWL and range of an agreeing and of a flagged
/// well (marker radius `r`); returns the y below them.
pub(super) fn fwl_legend(s: &mut Svg, x0: f64, mut y: f64, r: f64) -> f64 {
    let text = |s: &mut Svg, y: f64, t: &str| s.text(x0 + 20.0, y + 3.5, t, 10.0, Anchor::Start);
    s.rect_faint(x0, y - 5.0, 14.0, 10.0, palette::SKY_BLUE, 0.35);
    s.line(
        x0,
        y,
        x0 + 14.0,
        y,
        Stroke::dashed(palette::BLUE, 1.5, "8 4"),
    );
    text(s, y, "compartment FWL ± 1 sd");
    y += 20.0;
    for flagged in [false, true] {
        let (col, shape) = agreement_mark(flagged);
        s.line(
            x0 + 7.0,
            y - 7.0,
            x0 + 7.0,
            y + 7.0,
            Stroke::solid(col, 1.7),
        );
        let r = if flagged { 1.3 * r } else { r };
        s.marker(shape, x0 + 7.0, y, r, col, None);
        text(
            s,
            y,
            if flagged {
                "implied FWL, flagged"
            } else {
                "implied FWL and range"
            },
        );
        y += 20.0;
    }
    y
}

/// Colour and shape of a well's implied FWL: flagged wells stand out by both.
pub fn agreement_mark(flagged: bool) -> (&'static str, Shape) {
    if flagged {
        (palette::VERMILLION, Shape::Diamond)
    } else {
        (palette::BLACK, Shape::Circle)
    }
}

fn legend(s: &mut Svg, c: &CompartmentWells<'_>) {
    s.group("legend", None);
    let mut y = TITLE_H + LABEL_H + 6.0;
    let x0 = LEG_X;
    let mut classes: Vec<u8> = c
        .wells
        .iter()
        .filter_map(|w| w.profile)
        .flat_map(|p| p.class.iter().copied())
        .filter(|&k| k > 0)
        .collect();
    classes.sort_unstable();
    classes.dedup();
    let text = |s: &mut Svg, y: f64, t: &str| s.text(x0 + 20.0, y + 3.5, t, 10.0, Anchor::Start);
    for k in &classes {
        s.rect(x0 + 2.0, y - 5.0, 12.0, 10.0, palette::class(*k), None);
        text(s, y, &format!("class {k} (width: probability)"));
        y += 15.0;
    }
    y += 4.0;
    s.line(x0, y, x0 + 14.0, y, Stroke::solid(palette::BLUE, 1.3));
    text(s, y, "SW 0-1 (left to right)");
    y += 15.0;
    s.line(
        x0,
        y,
        x0 + 14.0,
        y,
        Stroke::dashed(palette::VERMILLION, 1.2, "4 2"),
    );
    text(s, y, "SWH, saturation-height");
    y += 15.0;
    s.line(x0, y, x0 + 14.0, y, Stroke::solid(palette::FRAME, 1.0));
    text(s, y, "zone top, joined");
    y = fwl_legend(s, x0, y + 15.0, 4.0) + 2.0;
    s.text_styled(
        x0,
        y + 3.5,
        "steps audited:",
        10.0,
        Anchor::Start,
        palette::FRAME,
        0.0,
    );
    y += 14.0;
    for (kind, col, shape) in STEP_MARKS {
        s.marker(shape, x0 + 7.0, y, 4.0, col, None);
        text(s, y, kind);
        y += 14.0;
    }
    y += 8.0;
    super::palette_note(s, x0, y + 3.5);
    if c.wells.iter().any(|w| w.along.is_some()) {
        s.text_styled(
            x0,
            y + 35.0,
            "under each column: km along",
            10.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
        s.text_styled(
            x0,
            y + 48.0,
            "the section's line",
            10.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
    }
    s.end_group();
}
