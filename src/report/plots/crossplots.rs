//! Field crossplots, each a complete SVG document of 640 × 480 px:
//!
//! - [`core_phi_k`]: core porosity against permeability (log), by class, with
//!   the iso-FZI or iso-R35 class boundaries;
//! - [`pickett`]: log RT against log PHIE, by class, with Archie lines for
//!   Sw = 1, 0.5 and 0.2;
//! - [`j_function`]: Leverett J (log) against Sw, plug points and fitted curves;
//! - [`pressure_depth`]: pressure against TVDSS (down), gradients and FWL per
//!   compartment;
//! - [`confusion`]: a confusion matrix shaded by the row fraction.
//!
//! Layout: the plot area is x 70–460 px, y 40–420 px; the legend (a
//! `<g class="legend">`) sits to its right. Colours are the Okabe-Ito palette
//! of [`crate::report::svg::palette`]. Values a plot cannot place (NaN, infinities,
//! non-positive values on a log axis, values beyond the axis limits) are
//! skipped; a plot with nothing to draw keeps its frame and says so in a
//! `<g class="no-data">`.

use std::cmp::Ordering;
use std::collections::BTreeMap;

use super::{ArchieLine, Boundaries, CorePoint, JClass, PickettPoint, PressureCompartment};
use crate::classes::flow_units::{
    WINLAND_INTERCEPT, WINLAND_LOG_K, WINLAND_LOG_PHI, perm_from_fzi,
};
use crate::report::svg::{Anchor, Scale, Stroke, Svg, palette, tick_label, trim_number};

const W: f64 = 640.0;
const H: f64 = 480.0;
/// Plot area: left, right, top, bottom (px).
const L: f64 = 70.0;
const R: f64 = 460.0;
const T: f64 = 40.0;
const B: f64 = 420.0;
/// Left edge of the legend.
const LEG_X: f64 = 476.0;
/// Legend entries shown before "… n more".
const LEG_MAX: usize = 22;
/// Points drawn on the Pickett plot at most (stride-subsampled beyond).
const MAX_PICKETT_POINTS: usize = 3000;
/// Marker radius (px).
const DOT_R: f64 = 3.0;
/// Colour of unclassed points and of neutral lines.
const GREY: &str = palette::FRAME;
/// Compartment colours: strong contrasts first, yellow last.
const COMPARTMENT_COLOURS: [&str; 8] = [
    palette::BLUE,
    palette::VERMILLION,
    palette::BLUISH_GREEN,
    palette::ORANGE,
    palette::REDDISH_PURPLE,
    palette::SKY_BLUE,
    palette::BLACK,
    palette::YELLOW,
];
const DASH_BOUNDARY: &str = "5 4";
const DASH_SW_HALF: &str = "7 4";
const DASH_SW_FIFTH: &str = "2 3";
const DASH_FWL: &str = "8 4";

// ---------------------------------------------------------------------------
// shared drawing helpers

/// A legend mark.
#[derive(Debug, Clone, Copy)]
enum Mark {
    /// A filled marker (drawn as a square swatch).
    Dot(&'static str),
    /// A hollow marker.
    Ring(&'static str),
    /// A line, optionally dashed.
    Line(&'static str, Option<&'static str>),
    /// A shaded cell at an opacity.
    Shade(&'static str, f64),
    /// Text only.
    Note,
}

struct Entry {
    mark: Mark,
    label: String,
}

fn entry(mark: Mark, label: impl Into<String>) -> Entry {
    Entry {
        mark,
        label: label.into(),
    }
}

/// A new document with the title (and an optional smaller subtitle).
fn page(title: &str, subtitle: Option<&str>) -> Svg {
    let mut s = Svg::new(W, H);
    s.group("title", None);
    s.text(L, 20.0, title, 15.0, Anchor::Start);
    if let Some(sub) = subtitle {
        s.text_styled(L, 34.0, sub, 10.0, Anchor::Start, GREY, 0.0);
    }
    s.end_group();
    s
}

/// Tick values of a scale: round linear steps or the decades of a log axis.
fn ticks(scale: &Scale) -> Vec<f64> {
    scale.ticks(6)
}

/// The 2..9 × 10^k values inside a log scale (minor grid), for spans of a
/// few decades only.
fn minor_ticks(scale: &Scale) -> Vec<f64> {
    let Scale::Log { lo, hi, .. } = *scale else {
        return Vec::new();
    };
    let (a, b) = (lo.min(hi).log10().floor(), lo.max(hi).log10().ceil());
    if !(a.is_finite() && b.is_finite()) || b - a > 8.0 {
        return Vec::new();
    }
    let mut v = Vec::new();
    let mut e = a as i32;
    while f64::from(e) < b {
        for m in 2..=9 {
            let x = f64::from(m) * 10f64.powi(e);
            if x >= lo.min(hi) && x <= lo.max(hi) {
                v.push(x);
            }
        }
        e += 1;
    }
    v
}

/// Grid, frame, ticks, tick labels and axis titles.
fn axes(s: &mut Svg, xs: &Scale, ys: &Scale, x_title: &str, y_title: &str) {
    s.group("axes", None);
    let minor = Stroke::solid(palette::GRID, 0.5).faint(0.5);
    for v in minor_ticks(xs) {
        let p = xs.px(v);
        if p.is_finite() {
            s.line(p, T, p, B, minor);
        }
    }
    for v in minor_ticks(ys) {
        let p = ys.px(v);
        if p.is_finite() {
            s.line(L, p, R, p, minor);
        }
    }
    let grid = Stroke::solid(palette::GRID, 0.8);
    let tick = Stroke::solid(palette::FRAME, 1.0);
    for v in ticks(xs) {
        let p = xs.px(v);
        if !p.is_finite() {
            continue;
        }
        s.line(p, T, p, B, grid);
        s.line(p, B, p, B + 5.0, tick);
        s.text(p, B + 18.0, &tick_label(v), 10.0, Anchor::Middle);
    }
    for v in ticks(ys) {
        let p = ys.px(v);
        if !p.is_finite() {
            continue;
        }
        s.line(L, p, R, p, grid);
        s.line(L - 5.0, p, L, p, tick);
        s.text(L - 8.0, p + 3.5, &tick_label(v), 10.0, Anchor::End);
    }
    s.rect(
        L,
        T,
        R - L,
        B - T,
        "none",
        Some(Stroke::solid(palette::FRAME, 1.0)),
    );
    s.text((L + R) / 2.0, B + 40.0, x_title, 12.0, Anchor::Middle);
    s.text_styled(
        L - 52.0,
        (T + B) / 2.0,
        y_title,
        12.0,
        Anchor::Middle,
        "#000000",
        -90.0,
    );
    s.end_group();
}

/// The "nothing to draw" message in the middle of the plot area.
fn no_data(s: &mut Svg, message: &str) {
    s.group("no-data", None);
    s.text_styled(
        (L + R) / 2.0,
        (T + B) / 2.0,
        message,
        14.0,
        Anchor::Middle,
        palette::FRAME,
        0.0,
    );
    s.end_group();
}

/// The legend, right of the plot area, ending with the palette note.
fn legend(s: &mut Svg, entries: &[Entry]) {
    s.group("legend", None);
    let mut y = T + 8.0;
    for (i, e) in entries.iter().enumerate() {
        if i == LEG_MAX {
            let more = format!("… and {} more", entries.len() - LEG_MAX);
            s.text(LEG_X, y + 3.5, &more, 10.0, Anchor::Start);
            y += 16.0;
            break;
        }
        let (x0, x1) = (LEG_X, LEG_X + 14.0);
        match e.mark {
            Mark::Dot(c) => s.rect(
                x0 + 2.0,
                y - 5.0,
                10.0,
                10.0,
                c,
                Some(Stroke::solid(palette::FRAME, 0.5)),
            ),
            Mark::Ring(c) => s.rect(
                x0 + 2.0,
                y - 5.0,
                10.0,
                10.0,
                "#FFFFFF",
                Some(Stroke::solid(c, 1.5)),
            ),
            Mark::Line(c, None) => s.line(x0, y, x1, y, Stroke::solid(c, 2.0)),
            Mark::Line(c, Some(d)) => s.line(x0, y, x1, y, Stroke::dashed(c, 1.5, d)),
            Mark::Shade(c, o) => {
                s.rect(
                    x0,
                    y - 6.0,
                    14.0,
                    12.0,
                    "#FFFFFF",
                    Some(Stroke::solid(palette::GRID, 1.0)),
                );
                s.rect_faint(x0, y - 6.0, 14.0, 12.0, c, o);
            }
            Mark::Note => {}
        }
        let tx = if matches!(e.mark, Mark::Note) {
            x0
        } else {
            x1 + 6.0
        };
        for (k, line) in wrap(&e.label, 26).iter().enumerate() {
            if k > 0 {
                y += 12.0;
            }
            s.text(tx, y + 3.5, line, 10.0, Anchor::Start);
        }
        y += 16.0;
    }
    y += 8.0;
    super::palette_note(s, LEG_X, y + 3.5);
    s.end_group();
}

/// A 9 px label on a translucent white box (estimated text width), so that
/// it stays readable over lines and grid.
fn boxed_label(s: &mut Svg, x: f64, y: f64, text: &str, anchor: Anchor, colour: &str) {
    let size = 9.0;
    let w = 0.55 * size * text.chars().count() as f64 + 2.0;
    let x0 = match anchor {
        Anchor::Start => x - 1.0,
        Anchor::Middle => x - w / 2.0,
        Anchor::End => x - w + 1.0,
    };
    s.rect_faint(x0, y - size, w, size + 3.0, "#FFFFFF", 0.9);
    s.text_styled(x, y, text, size, anchor, colour, 0.0);
}

/// `text` in lines of at most about `width` characters, broken at spaces.
pub(super) fn wrap(text: &str, width: usize) -> Vec<String> {
    let mut lines: Vec<String> = Vec::new();
    let mut cur = String::new();
    for word in text.split(' ') {
        if !cur.is_empty() && cur.chars().count() + 1 + word.chars().count() > width {
            lines.push(std::mem::take(&mut cur));
        }
        if !cur.is_empty() {
            cur.push(' ');
        }
        cur.push_str(word);
    }
    if !cur.is_empty() || lines.is_empty() {
        lines.push(cur);
    }
    lines
}

/// Decade limits (10^a, 10^b) covering the positive finite `values` and at
/// least 10^default_lo..10^default_hi, held within 10^min_e..10^max_e.
fn log_span(
    values: impl Iterator<Item = f64>,
    default_lo: i32,
    default_hi: i32,
    min_e: i32,
    max_e: i32,
) -> (f64, f64) {
    let (mut a, mut b) = (default_lo, default_hi);
    for v in values {
        if v > 0.0 && v.is_finite() {
            let e = v.log10();
            a = a.min(e.floor() as i32);
            b = b.max(e.ceil() as i32);
        }
    }
    let a = a.max(min_e);
    let b = b.min(max_e).max(a + 1);
    (10f64.powi(a), 10f64.powi(b))
}

/// Whether `v` lies on a log axis limited to [lo, hi] (with a little slack
/// for the rounding of the decade limits).
fn on_log(v: f64, lo: f64, hi: f64) -> bool {
    v.is_finite() && v > 0.0 && v >= lo * (1.0 - 1e-9) && v <= hi * (1.0 + 1e-9)
}

/// A linear range [lo, hi] with round ends (steps of 1, 2 or 5 × 10^k,
/// about `n` of them) covering [min, max]; a single value is widened.
fn nice_range(min: f64, max: f64, n: usize) -> (f64, f64) {
    let (mut lo, mut hi) = (min, max);
    if !(lo.is_finite() && hi.is_finite()) || hi < lo {
        return (0.0, 1.0);
    }
    if hi == lo {
        let pad = (lo.abs() * 0.01).max(1.0);
        lo -= pad;
        hi += pad;
    }
    let raw = (hi - lo) / n.max(1) as f64;
    let exp = raw.log10().floor() as i32;
    let mag = 10f64.powi(exp);
    let m = [1.0, 2.0, 5.0, 10.0]
        .into_iter()
        .find(|m| m * mag >= raw)
        .unwrap_or(10.0);
    let step = m * mag;
    let a = (lo / step + 1e-9).floor();
    let b = (hi / step - 1e-9).ceil();
    let (a, b) = if b > a { (a, b) } else { (a, a + 1.0) };
    // k·step as (k·m)/10^-exp for small steps, to keep the ends round
    let value = |k: f64| {
        if exp < 0 {
            k * m / 10f64.powi(-exp)
        } else {
            k * step
        }
    };
    (value(a), value(b))
}

/// Where the increasing `pred` first holds on [lo, hi] (`pred(lo)` false,
/// `pred(hi)` true), by bisection.
fn bisect(pred: impl Fn(f64) -> bool, mut lo: f64, mut hi: f64) -> f64 {
    for _ in 0..80 {
        let mid = 0.5 * (lo + hi);
        if pred(mid) {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    0.5 * (lo + hi)
}

// ---------------------------------------------------------------------------
// 1. core porosity-permeability

/// Permeability (mD) on the Winland R35 line of `r35_um` at porosity `phi`
/// (v/v): the inverse of [`crate::classes::flow_units::winland_r35`],
/// log k = (log R35 − 0.732 + 0.864·log φ%) / 0.588.
fn perm_from_r35(r35_um: f64, phi: f64) -> f64 {
    10f64.powf(
        (r35_um.log10() - WINLAND_INTERCEPT + WINLAND_LOG_PHI * (100.0 * phi).log10())
            / WINLAND_LOG_K,
    )
}

/// An iso-line k = f(φ) (f increasing in φ) over the x range, cut where it
/// leaves the y range, with its label at the upper end.
fn iso_line(s: &mut Svg, xs: &Scale, ys: &Scale, f: impl Fn(f64) -> f64, label: &str) {
    let (
        Scale::Linear { hi: xhi, .. },
        Scale::Log {
            lo: klo, hi: khi, ..
        },
    ) = (*xs, *ys)
    else {
        return;
    };
    let a0 = 1e-3;
    let b0 = xhi.min(0.999);
    if b0.partial_cmp(&a0) != Some(Ordering::Greater) {
        return;
    }
    let (fa, fb) = (f(a0), f(b0));
    if !(fa.is_finite() && fb.is_finite()) || fa > khi || fb < klo {
        return;
    }
    let xa = if fa >= klo {
        a0
    } else {
        bisect(|x| f(x) >= klo, a0, b0)
    };
    let xb = if fb <= khi {
        b0
    } else {
        bisect(|x| f(x) > khi, a0, b0)
    };
    if xb.partial_cmp(&xa) != Some(Ordering::Greater) {
        return;
    }
    const N: usize = 120;
    let pts: Vec<(f64, f64)> = (0..=N)
        .map(|i| {
            let x = xa + (xb - xa) * i as f64 / N as f64;
            (xs.px(x), ys.px_clamped(f(x)))
        })
        .collect();
    if s.polyline(&pts, Stroke::dashed(GREY, 1.0, DASH_BOUNDARY)) > 0 {
        if let Some(&(px, py)) = pts
            .iter()
            .rev()
            .find(|(x, y)| x.is_finite() && y.is_finite())
        {
            // right of a line that leaves through the top, when it fits
            let w = 0.55 * 9.0 * label.chars().count() as f64;
            if py < T + 1.0 && px + 4.0 + w < R {
                boxed_label(s, px + 4.0, py + 12.0, label, Anchor::Start, GREY);
            } else {
                boxed_label(s, px - 4.0, py + 12.0, label, Anchor::End, GREY);
            }
        }
    }
}

/// Core porosity against permeability (log), coloured by class, with the
/// class boundaries.
pub fn core_phi_k(points: &[CorePoint], bounds: &Boundaries, class_count: u8) -> String {
    let (k_min, k_max) = (1e-6, 1e6);
    let valid: Vec<(f64, f64, Option<u8>)> = points
        .iter()
        .filter(|p| {
            p.phi.is_finite() && (0.0..=1.0).contains(&p.phi) && on_log(p.k_md, k_min, k_max)
        })
        .map(|p| (p.phi, p.k_md, p.class.filter(|&c| c > 0)))
        .collect();
    let phi_max = valid.iter().map(|p| p.0).fold(0.0, f64::max);
    let x_hi = if valid.is_empty() {
        0.3
    } else {
        ((phi_max * 20.0 - 1e-9).ceil().max(1.0) / 20.0).min(1.0)
    };
    let (k_lo, k_hi) = log_span(valid.iter().map(|p| p.1), -2, 3, -6, 6);
    let xs = Scale::linear(0.0, x_hi, L, R);
    let ys = Scale::log(k_lo, k_hi, B, T);

    let subtitle = format!("{} of {} plugs drawn", valid.len(), points.len());
    let mut s = page("Core porosity and permeability", Some(&subtitle));
    axes(
        &mut s,
        &xs,
        &ys,
        "core porosity (v/v)",
        "core permeability (mD)",
    );

    let mut entries = Vec::new();
    let mut classes: Vec<u8> = (1..=class_count).collect();
    let mut unclassed = false;
    for p in &valid {
        match p.2 {
            Some(c) if !classes.contains(&c) => classes.push(c),
            Some(_) => {}
            None => unclassed = true,
        }
    }
    classes.sort_unstable();
    for &c in &classes {
        entries.push(entry(Mark::Dot(palette::class(c)), format!("class {c}")));
    }
    if unclassed {
        entries.push(entry(Mark::Ring(GREY), "no class"));
    }

    if valid.is_empty() {
        no_data(&mut s, "no core samples");
    } else {
        let what = match bounds {
            Boundaries::Fzi(v) => Some(("FZI", v)),
            Boundaries::R35(v) => Some(("R35", v)),
            Boundaries::None => None,
        };
        if let Some((kind, values)) = what {
            s.group("boundaries", Some(&format!("iso-{kind} class boundaries")));
            for &v in values.iter().filter(|v| v.is_finite() && **v > 0.0) {
                let label = format!("{kind} {v:.2} µm");
                if kind == "FZI" {
                    iso_line(&mut s, &xs, &ys, |phi| perm_from_fzi(v, phi), &label);
                } else {
                    iso_line(&mut s, &xs, &ys, |phi| perm_from_r35(v, phi), &label);
                }
            }
            s.end_group();
            entries.push(entry(
                Mark::Line(GREY, Some(DASH_BOUNDARY)),
                format!("iso-{kind} boundary"),
            ));
        }
        // unclassed plugs first, underneath
        let mut groups: BTreeMap<Option<u8>, Vec<(f64, f64)>> = BTreeMap::new();
        for &(phi, k, c) in &valid {
            groups.entry(c).or_default().push((xs.px(phi), ys.px(k)));
        }
        for (c, pts) in &groups {
            let title = c.map_or_else(|| "no class".to_string(), |c| format!("class {c}"));
            s.group("points", Some(&title));
            for &(x, y) in pts {
                match c {
                    Some(c) => s.circle(
                        x,
                        y,
                        DOT_R,
                        palette::class(*c),
                        Some(Stroke::solid(palette::FRAME, 0.5).faint(0.6)),
                    ),
                    None => s.circle(x, y, DOT_R, "none", Some(Stroke::solid(GREY, 1.0))),
                }
            }
            s.end_group();
        }
    }
    legend(&mut s, &entries);
    s.finish()
}

// ---------------------------------------------------------------------------
// 2. Pickett

/// Pickett plot: log RT against log PHIE, per class, with Archie lines.
pub fn pickett(points: &[PickettPoint], lines: &[ArchieLine], rw_ohmm: f64) -> String {
    let (rt_min, rt_max, phi_min) = (1e-3, 1e6, 1e-4);
    let valid: Vec<&PickettPoint> = points
        .iter()
        .filter(|p| on_log(p.rt, rt_min, rt_max) && on_log(p.phi, phi_min, 1.0))
        .collect();
    let (x_lo, x_hi) = log_span(valid.iter().map(|p| p.rt), -1, 3, -3, 6);
    let (y_lo, y_hi) = log_span(valid.iter().map(|p| p.phi), -2, 0, -4, 0);
    let xs = Scale::log(x_lo, x_hi, L, R);
    let ys = Scale::log(y_lo, y_hi, B, T);
    let rw_ok = rw_ohmm.is_finite() && rw_ohmm > 0.0;

    let stride = valid.len().div_ceil(MAX_PICKETT_POINTS).max(1);
    let drawn: Vec<&PickettPoint> = valid.iter().copied().step_by(stride).collect();
    let subtitle = if rw_ok {
        format!(
            "Rw {} ohm.m; {} of {} depths drawn",
            trim_number(rw_ohmm, 4),
            drawn.len(),
            points.len()
        )
    } else {
        format!(
            "Rw not set: no Archie lines; {} of {} depths drawn",
            drawn.len(),
            points.len()
        )
    };
    let mut s = page("Pickett plot", Some(&subtitle));
    axes(
        &mut s,
        &xs,
        &ys,
        "deep resistivity RT (ohm.m)",
        "effective porosity PHIE (v/v)",
    );

    let mut classes: Vec<u8> = drawn.iter().map(|p| p.class).collect();
    classes.extend(lines.iter().map(|l| l.class));
    classes.sort_unstable();
    classes.dedup();
    let mut entries: Vec<Entry> = classes
        .iter()
        .map(|&c| {
            let label = match lines.iter().find(|l| l.class == c) {
                Some(l) => format!(
                    "class {c}: a {}, m {}, n {}",
                    trim_number(l.a, 2),
                    trim_number(l.m, 2),
                    trim_number(l.n, 2)
                ),
                None => format!("class {c}"),
            };
            entry(Mark::Dot(palette::class(c)), label)
        })
        .collect();

    if drawn.is_empty() {
        no_data(&mut s, "no log depths with porosity and resistivity");
    } else {
        if rw_ok && !lines.is_empty() {
            archie_lines(&mut s, &xs, &ys, lines, rw_ohmm);
            entries.push(entry(Mark::Line(GREY, None), "Sw = 1"));
            entries.push(entry(Mark::Line(GREY, Some(DASH_SW_HALF)), "Sw = 0.5"));
            entries.push(entry(Mark::Line(GREY, Some(DASH_SW_FIFTH)), "Sw = 0.2"));
        }
        let mut groups: BTreeMap<u8, Vec<(f64, f64)>> = BTreeMap::new();
        for p in &drawn {
            groups
                .entry(p.class)
                .or_default()
                .push((xs.px(p.rt), ys.px(p.phi)));
        }
        for (c, pts) in &groups {
            s.group("points", Some(&format!("class {c}")));
            for &(x, y) in pts {
                s.circle(
                    x,
                    y,
                    2.2,
                    palette::class(*c),
                    Some(Stroke::solid(palette::FRAME, 0.3).faint(0.5)),
                );
            }
            s.end_group();
        }
    }
    legend(&mut s, &entries);
    s.finish()
}

/// Archie lines: log φ = (log(a·Rw) − n·log Sw − log Rt)/m, straight on
/// log-log axes, cut to the plot area.
fn archie_lines(s: &mut Svg, xs: &Scale, ys: &Scale, lines: &[ArchieLine], rw: f64) {
    let (Scale::Log { lo: xl, hi: xh, .. }, Scale::Log { lo: yl, hi: yh, .. }) = (*xs, *ys) else {
        return;
    };
    let (u_lo, u_hi, v_lo, v_hi) = (xl.log10(), xh.log10(), yl.log10(), yh.log10());
    s.group("archie-lines", Some("Archie lines, Sw = 1, 0.5, 0.2"));
    for (index, l) in lines.iter().enumerate() {
        let ok = l.a.is_finite() && l.a > 0.0 && l.m.is_finite() && l.m > 0.0;
        if !ok {
            continue;
        }
        let colour = palette::class(l.class);
        for (sw, dash) in [
            (1.0, None),
            (0.5, Some(DASH_SW_HALF)),
            (0.2, Some(DASH_SW_FIFTH)),
        ] {
            if sw < 1.0 && !(l.n.is_finite() && l.n > 0.0) {
                continue;
            }
            let n_term = if sw < 1.0 { l.n * f64::log10(sw) } else { 0.0 };
            // v = c − u/m, with u = log Rt and v = log φ
            let c = ((l.a * rw).log10() - n_term) / l.m;
            let ua = (l.m * (c - v_hi)).max(u_lo);
            let ub = (l.m * (c - v_lo)).min(u_hi);
            if ub.partial_cmp(&ua) != Some(Ordering::Greater) {
                continue;
            }
            let end = |u: f64| (xs.px(10f64.powf(u)), ys.px_clamped(10f64.powf(c - u / l.m)));
            let (p, q) = (end(ua), end(ub));
            let stroke = match dash {
                None => Stroke::solid(colour, 1.6),
                Some(d) => Stroke::dashed(colour, 1.2, d),
            };
            s.polyline(&[p, q], stroke);
            if sw == 1.0 {
                let label = format!(
                    "class {}, m {}, n {}",
                    l.class,
                    trim_number(l.m, 2),
                    trim_number(l.n, 2)
                );
                // staggered rows above the bottom so that labels of lines
                // ending close together do not overlap
                let y = B - 8.0 - 13.0 * (index % 20) as f64;
                let v = v_lo + (B - y) / (B - T) * (v_hi - v_lo);
                let u = l.m * (c - v);
                let (x, y) = if u >= ua && u <= ub {
                    (xs.px(10f64.powf(u)), y)
                } else {
                    q
                };
                boxed_label(s, x - 4.0, y + 3.0, &label, Anchor::End, colour);
            }
        }
    }
    s.end_group();
}

// ---------------------------------------------------------------------------
// 3. Leverett J

/// Leverett J against Sw: plug points and fitted curves per class.
pub fn j_function(classes: &[JClass]) -> String {
    let (j_min, j_max) = (1e-6, 1e6);
    let ok = |&(sw, j): &(f64, f64)| {
        sw.is_finite() && (0.0..=1.0).contains(&sw) && on_log(j, j_min, j_max)
    };
    let all = || {
        classes
            .iter()
            .flat_map(|c| c.points.iter().chain(c.curve.iter()))
            .filter(|p| ok(p))
    };
    let has_data = all().next().is_some();
    let (y_lo, y_hi) = log_span(all().map(|p| p.1), -2, 2, -6, 6);
    let xs = Scale::linear(0.0, 1.0, L, R);
    let ys = Scale::log(y_lo, y_hi, B, T);

    let mut s = page(
        "Leverett J-function by class",
        Some("plug points and fitted curves"),
    );
    axes(
        &mut s,
        &xs,
        &ys,
        "water saturation Sw (v/v)",
        "Leverett J (dimensionless)",
    );
    let mut entries: Vec<Entry> = classes
        .iter()
        .map(|c| {
            entry(
                Mark::Dot(palette::class(c.class)),
                format!("class {}: {}", c.class, c.label),
            )
        })
        .collect();

    if !has_data {
        no_data(&mut s, "no capillary-pressure data");
    } else {
        entries.push(entry(Mark::Line(GREY, None), "fitted curve"));
        entries.push(entry(Mark::Ring(GREY), "plug points"));
        for c in classes {
            let colour = palette::class(c.class);
            s.group("j-class", Some(&format!("class {}: {}", c.class, c.label)));
            let curve: Vec<(f64, f64)> = c
                .curve
                .iter()
                .map(|p| {
                    if ok(p) {
                        (xs.px(p.0), ys.px(p.1))
                    } else {
                        (f64::NAN, f64::NAN)
                    }
                })
                .collect();
            s.polyline(&curve, Stroke::solid(colour, 1.8));
            for p in c.points.iter().filter(|p| ok(p)) {
                s.circle(
                    xs.px(p.0),
                    ys.px(p.1),
                    DOT_R,
                    colour,
                    Some(Stroke::solid(palette::FRAME, 0.6)),
                );
            }
            s.end_group();
        }
    }
    legend(&mut s, &entries);
    s.finish()
}

// ---------------------------------------------------------------------------
// 4. pressure against depth

/// Pressure against TVDSS with the fitted gradients and the FWL, per compartment.
pub fn pressure_depth(compartments: &[PressureCompartment], depth_unit: &str) -> String {
    let finite = |a: f64, b: f64| a.is_finite() && b.is_finite();
    let has_data = compartments
        .iter()
        .any(|c| c.points.iter().any(|p| finite(p.psi, p.tvdss)));

    // ranges: points, gradient line ends and FWLs
    let (mut p_lo, mut p_hi, mut d_lo, mut d_hi) = (f64::MAX, f64::MIN, f64::MAX, f64::MIN);
    let mut take = |psi: Option<f64>, z: f64| {
        if let Some(p) = psi {
            p_lo = p_lo.min(p);
            p_hi = p_hi.max(p);
        }
        d_lo = d_lo.min(z);
        d_hi = d_hi.max(z);
    };
    for c in compartments {
        for p in c.points.iter().filter(|p| finite(p.psi, p.tvdss)) {
            take(Some(p.psi), p.tvdss);
        }
        for g in &c.lines {
            for z in [g.top, g.base] {
                let psi = g.intercept_psi + g.psi_per_unit * z;
                if finite(psi, z) {
                    take(Some(psi), z);
                }
            }
        }
        if c.fwl_tvdss.is_finite() {
            take(None, c.fwl_tvdss);
        }
    }
    let pad = |lo: f64, hi: f64| {
        let d = 0.05 * (hi - lo);
        (lo - d, hi + d)
    };
    let (x_lo, x_hi) = if has_data {
        let (a, b) = pad(p_lo, p_hi);
        nice_range(a, b, 5)
    } else {
        (0.0, 5000.0)
    };
    let (y_lo, y_hi) = if has_data {
        let (a, b) = pad(d_lo, d_hi);
        nice_range(a, b, 5)
    } else {
        (0.0, 1000.0)
    };
    let xs = Scale::linear(x_lo, x_hi, L, R);
    let ys = Scale::linear(y_lo, y_hi, T, B); // depth increases downward

    let mut s = page(
        "Formation pressure against depth",
        Some("fitted gradients and free water level per compartment"),
    );
    axes(
        &mut s,
        &xs,
        &ys,
        "pressure (psi)",
        &format!("TVDSS ({depth_unit})"),
    );
    let mut entries = Vec::new();
    for (i, c) in compartments.iter().enumerate() {
        let colour = COMPARTMENT_COLOURS[i % COMPARTMENT_COLOURS.len()];
        entries.push(entry(Mark::Dot(colour), c.name.clone()));
        if c.points.iter().any(|p| !p.used && finite(p.psi, p.tvdss)) {
            entries.push(entry(Mark::Ring(colour), format!("{}: left out", c.name)));
        }
    }

    if !has_data {
        no_data(&mut s, "no pressure points");
    } else {
        entries.push(entry(Mark::Line(GREY, None), "fitted gradient"));
        entries.push(entry(Mark::Line(GREY, Some(DASH_FWL)), "free water level"));
        for (i, c) in compartments.iter().enumerate() {
            let colour = COMPARTMENT_COLOURS[i % COMPARTMENT_COLOURS.len()];
            s.group("compartment", Some(&c.name));
            if c.fwl_tvdss.is_finite() {
                let y = ys.px(c.fwl_tvdss);
                s.line(L, y, R, y, Stroke::dashed(colour, 1.2, DASH_FWL));
                let label = match c.fwl_sigma.filter(|v| v.is_finite()) {
                    Some(sd) => format!("FWL {:.1} ± {:.1} {depth_unit}", c.fwl_tvdss, sd),
                    None => format!("FWL {:.1} {depth_unit}", c.fwl_tvdss),
                };
                boxed_label(&mut s, R - 4.0, y - 4.0, &label, Anchor::End, colour);
            }
            for g in &c.lines {
                let ends: Vec<(f64, f64)> = [g.top, g.base]
                    .iter()
                    .map(|&z| {
                        let psi = g.intercept_psi + g.psi_per_unit * z;
                        if finite(psi, z) {
                            (xs.px(psi), ys.px(z))
                        } else {
                            (f64::NAN, f64::NAN)
                        }
                    })
                    .collect();
                if s.polyline(&ends, Stroke::solid(colour, 1.5)) > 0 {
                    let (x, y) = if ends[0].1 <= ends[1].1 {
                        ends[0]
                    } else {
                        ends[1]
                    };
                    boxed_label(&mut s, x + 6.0, y + 12.0, &g.label, Anchor::Start, colour);
                }
            }
            for p in c.points.iter().filter(|p| finite(p.psi, p.tvdss)) {
                let (x, y) = (xs.px(p.psi), ys.px(p.tvdss));
                if p.used {
                    s.circle(
                        x,
                        y,
                        DOT_R,
                        colour,
                        Some(Stroke::solid(palette::FRAME, 0.5)),
                    );
                } else {
                    s.circle(x, y, DOT_R, "#FFFFFF", Some(Stroke::solid(colour, 1.4)));
                }
            }
            s.end_group();
        }
    }
    legend(&mut s, &entries);
    s.finish()
}

// ---------------------------------------------------------------------------
// 5. confusion matrix

/// A confusion matrix (rows: true class, columns: predicted class).
pub fn confusion(matrix: &[Vec<usize>], title: &str) -> String {
    let rows = matrix.len();
    let cols = matrix.iter().map(Vec::len).max().unwrap_or(0);
    let total: f64 = matrix.iter().flatten().map(|&v| v as f64).sum();
    let agree: f64 = matrix
        .iter()
        .enumerate()
        .filter_map(|(i, r)| r.get(i))
        .map(|&v| v as f64)
        .sum();
    let subtitle = if total > 0.0 {
        format!(
            "agreement {} of {} samples ({:.0}%)",
            agree,
            total,
            100.0 * agree / total
        )
    } else {
        "rows: core class, columns: predicted class".to_string()
    };
    let mut s = page(title, Some(&subtitle));
    let shade_max = 0.85;
    let entries = vec![
        entry(Mark::Shade(palette::BLUE, shade_max), "whole row"),
        entry(
            Mark::Shade(palette::BLUE, shade_max / 2.0),
            "half of the row",
        ),
        entry(Mark::Shade(palette::BLUE, 0.0), "none of the row"),
        entry(Mark::Line(palette::FRAME, None), "outline: same class"),
        entry(
            Mark::Note,
            format!("classes 1-{}, poorest first", rows.max(cols)),
        ),
    ];

    if rows == 0 || cols == 0 {
        s.rect(
            L,
            T,
            R - L,
            B - T,
            "none",
            Some(Stroke::solid(palette::FRAME, 1.0)),
        );
        s.text(
            (L + R) / 2.0,
            B + 40.0,
            "predicted class",
            12.0,
            Anchor::Middle,
        );
        s.text_styled(
            L - 52.0,
            (T + B) / 2.0,
            "core class",
            12.0,
            Anchor::Middle,
            "#000000",
            -90.0,
        );
        no_data(&mut s, "no classified samples");
        legend(&mut s, &entries);
        return s.finish();
    }

    let cell = ((R - L) / cols as f64).min((B - T) / rows as f64);
    let (gw, gh) = (cell * cols as f64, cell * rows as f64);
    let font = (cell * 0.35).clamp(4.0, 13.0);
    let label_font = (cell * 0.35).clamp(4.0, 10.0);

    s.group("axes", None);
    for j in 0..cols {
        let x = L + (j as f64 + 0.5) * cell;
        s.text(
            x,
            T + gh + 14.0,
            &(j + 1).to_string(),
            label_font,
            Anchor::Middle,
        );
    }
    for i in 0..rows {
        let y = T + (i as f64 + 0.5) * cell;
        s.text(
            L - 6.0,
            y + 3.5,
            &(i + 1).to_string(),
            label_font,
            Anchor::End,
        );
    }
    s.text(
        L + gw / 2.0,
        T + gh + 36.0,
        "predicted class",
        12.0,
        Anchor::Middle,
    );
    s.text_styled(
        L - 30.0,
        T + gh / 2.0,
        "core class",
        12.0,
        Anchor::Middle,
        "#000000",
        -90.0,
    );
    s.end_group();

    s.group("cells", None);
    for (i, row) in matrix.iter().enumerate() {
        let sum: f64 = row.iter().map(|&v| v as f64).sum();
        for j in 0..cols {
            let (x, y) = (L + j as f64 * cell, T + i as f64 * cell);
            let count = row.get(j).copied().unwrap_or(0);
            let frac = if sum > 0.0 { count as f64 / sum } else { 0.0 };
            let opacity = frac * shade_max;
            s.rect(
                x,
                y,
                cell,
                cell,
                "#FFFFFF",
                Some(Stroke::solid(palette::GRID, 1.0)),
            );
            if opacity > 0.0 {
                s.rect_faint(x, y, cell, cell, palette::BLUE, opacity);
            }
            let ink = if opacity > 0.5 { "#FFFFFF" } else { "#000000" };
            s.text_styled(
                x + cell / 2.0,
                y + cell / 2.0 + font * 0.35,
                &count.to_string(),
                font,
                Anchor::Middle,
                ink,
                0.0,
            );
        }
    }
    for i in 0..rows.min(cols) {
        let c = i as f64 * cell;
        s.rect(
            L + c + 1.0,
            T + c + 1.0,
            cell - 2.0,
            cell - 2.0,
            "none",
            Some(Stroke::solid(palette::FRAME, 2.0)),
        );
    }
    s.end_group();
    legend(&mut s, &entries);
    s.finish()
}

#[cfg(test)]
mod tests {
    use super::super::{GradientLine, PressurePoint};
    use super::*;
    use crate::classes::flow_units::winland_r35;
    use crate::stats::assert_close;

    /// The bodies of every `<g class="{class}">` group (nesting respected).
    fn groups(doc: &str, class: &str) -> Vec<String> {
        let open = format!("<g class=\"{class}\">");
        let mut out = Vec::new();
        let mut from = 0;
        while let Some(at) = doc[from..].find(&open) {
            let start = from + at + open.len();
            let mut depth = 1;
            let mut i = start;
            while depth > 0 {
                let next_open = doc[i..].find("<g ").map(|p| p + i);
                let next_close = doc[i..]
                    .find("</g>")
                    .map(|p| p + i)
                    .expect("unclosed group");
                match next_open {
                    Some(o) if o < next_close => {
                        depth += 1;
                        i = o + 3;
                    }
                    _ => {
                        depth -= 1;
                        i = next_close + 4;
                    }
                }
            }
            out.push(doc[start..i - 4].to_string());
            from = start;
        }
        out
    }

    fn polylines(body: &str) -> Vec<Vec<(f64, f64)>> {
        body.split("points=\"")
            .skip(1)
            .map(|rest| {
                rest[..rest.find('"').unwrap()]
                    .split(' ')
                    .map(|xy| {
                        let (x, y) = xy.split_once(',').unwrap();
                        (x.parse().unwrap(), y.parse().unwrap())
                    })
                    .collect()
            })
            .collect()
    }

    fn texts(body: &str) -> Vec<String> {
        body.split("<text ")
            .skip(1)
            .map(|t| {
                let a = t.find('>').unwrap() + 1;
                let b = t.find("</text>").unwrap();
                t[a..b].to_string()
            })
            .collect()
    }

    /// Pixel distance from `p` to the nearest segment of `line`.
    fn distance(p: (f64, f64), line: &[(f64, f64)]) -> f64 {
        line.windows(2)
            .map(|w| {
                let ((x1, y1), (x2, y2)) = (w[0], w[1]);
                let (dx, dy) = (x2 - x1, y2 - y1);
                let len2 = dx * dx + dy * dy;
                let t = if len2 > 0.0 {
                    (((p.0 - x1) * dx + (p.1 - y1) * dy) / len2).clamp(0.0, 1.0)
                } else {
                    0.0
                };
                ((p.0 - x1 - t * dx).powi(2) + (p.1 - y1 - t * dy).powi(2)).sqrt()
            })
            .fold(f64::INFINITY, f64::min)
    }

    fn balanced(doc: &str) {
        assert_eq!(
            doc.matches("<g ").count(),
            doc.matches("</g>").count(),
            "unbalanced groups"
        );
        assert!(doc.starts_with("<svg ") && doc.trim_end().ends_with("</svg>"));
        assert_eq!(doc.matches("class=\"legend\"").count(), 1);
        assert!(doc.contains("Okabe-Ito"));
    }

    fn core(phi: f64, k: f64, class: Option<u8>) -> CorePoint {
        CorePoint {
            phi,
            k_md: k,
            class,
        }
    }

    #[test]
    fn iso_fzi_line_passes_through_hand_point() {
        // From memory (Amaefule et al. 1993, SPE 26436): RQI = 0.0314·sqrt(k/φ),
        // φz = φ/(1−φ), FZI = RQI/φz, so k = FZI²·φ³/(1−φ)² / 0.0314².
        // FZI 1 µm, φ 0.2: k = 0.008/0.64/0.00098596 = 12.678 mD
        // (1014.24 × 0.2³/0.8² = 12.678).
        let k = 0.2f64.powi(3) / 0.8f64.powi(2) / (0.0314f64 * 0.0314);
        assert_close(k, 12.678, 1e-3);
        // plugs spanning φ 0.05-0.3 and k 0.01-1000 mD: axes 0-0.3, 1e-2..1e3
        let pts = [core(0.05, 0.5, Some(1)), core(0.3, 800.0, Some(2))];
        let doc = core_phi_k(&pts, &Boundaries::Fzi(vec![1.0, 4.0]), 2);
        balanced(&doc);
        // by hand: x = 70 + 0.2/0.3 × 390 = 330; y = 420 − (log10 k + 2)/5 × 380
        let want = (
            70.0 + 0.2 / 0.3 * 390.0,
            420.0 - (k.log10() + 2.0) / 5.0 * 380.0,
        );
        assert_close(want.1, 420.0 - 3.10307 / 5.0 * 380.0, 0.01);
        let b = groups(&doc, "boundaries");
        assert_eq!(b.len(), 1);
        let lines = polylines(&b[0]);
        assert_eq!(lines.len(), 2);
        assert!(
            distance(want, &lines[0]) < 0.5,
            "{}",
            distance(want, &lines[0])
        );
        // FZI 4 is 16× the permeability: log10 16 / 5 × 380 = 91.5 px above
        assert!(distance(want, &lines[1]) > 80.0);
        assert!(texts(&b[0]).contains(&"FZI 1.00 µm".to_string()));
        assert!(!doc.contains("class=\"no-data\""));
    }

    #[test]
    fn iso_r35_inverts_winland() {
        // By hand: R35 1 µm at φ 10 %: log k = (0 − 0.732 + 0.864)/0.588
        // = 0.22449, k = 1.6773 mD.
        assert_close(perm_from_r35(1.0, 0.1), 1.6773, 1e-3);
        for (r, phi) in [(0.5, 0.08), (2.0, 0.15), (10.0, 0.25)] {
            assert_close(winland_r35(perm_from_r35(r, phi), phi), r, 1e-9 * r);
        }
        let pts = [core(0.05, 0.5, Some(1)), core(0.3, 800.0, None)];
        let doc = core_phi_k(&pts, &Boundaries::R35(vec![1.0]), 3);
        balanced(&doc);
        let line = &polylines(&groups(&doc, "boundaries")[0])[0];
        let want = (
            70.0 + 0.1 / 0.3 * 390.0,
            420.0 - (1.6773f64.log10() + 2.0) / 5.0 * 380.0,
        );
        assert!(distance(want, line) < 0.5);
        let leg = &groups(&doc, "legend")[0];
        for name in ["class 1", "class 2", "class 3", "no class"] {
            assert!(texts(leg).contains(&name.to_string()), "{name}");
        }
        // no boundaries for a scheme without a closed form
        let doc = core_phi_k(&pts, &Boundaries::None, 3);
        assert!(groups(&doc, "boundaries").is_empty());
    }

    #[test]
    fn circles_count_the_finite_in_range_plugs() {
        let pts = [
            core(0.1, 1.0, Some(1)),
            core(0.2, 50.0, Some(2)),
            core(0.25, 5000.0, None),
            core(f64::NAN, 1.0, Some(1)),
            core(0.1, f64::INFINITY, Some(1)),
            core(0.1, 0.0, Some(1)),
            core(0.1, -3.0, Some(1)),
            core(-0.1, 3.0, Some(1)),
            core(1.5, 3.0, Some(1)),
            core(0.1, 1e300, Some(1)),
        ];
        let doc = core_phi_k(&pts, &Boundaries::Fzi(vec![f64::NAN, -1.0, 2.0]), 4);
        balanced(&doc);
        assert_eq!(doc.matches("<circle").count(), 3);
        // one group per class present: 1, 2 and unclassed
        assert_eq!(groups(&doc, "points").len(), 3);
        // 5000 mD widens the axis to 10^4: the "10000" tick is labelled
        assert!(texts(&groups(&doc, "axes")[0]).contains(&"10000".to_string()));
    }

    #[test]
    fn pickett_sw1_line_through_hand_point() {
        // a = 1, m = 2, n = 2, Rw = 0.05: Rt = a·Rw/(φ^m·Sw^n); at φ = 0.1,
        // Sw = 1: Rt = 0.05/0.01 = 5; Sw = 0.5: Rt = 5/0.25 = 20.
        let pts: Vec<PickettPoint> = [(1.0, 0.2), (100.0, 0.05)]
            .iter()
            .map(|&(rt, phi)| PickettPoint { phi, rt, class: 2 })
            .collect();
        let lines = [ArchieLine {
            class: 2,
            a: 1.0,
            m: 2.0,
            n: 2.0,
        }];
        let doc = pickett(&pts, &lines, 0.05);
        balanced(&doc);
        // axes 0.1-1000 ohm.m (4 decades), 0.01-1 (2 decades)
        let px = |rt: f64, phi: f64| {
            (
                70.0 + (rt.log10() + 1.0) / 4.0 * 390.0,
                420.0 - (phi.log10() + 2.0) / 2.0 * 380.0,
            )
        };
        let g = groups(&doc, "archie-lines");
        assert_eq!(g.len(), 1);
        let ls = polylines(&g[0]);
        assert_eq!(ls.len(), 3);
        assert!(distance(px(5.0, 0.1), &ls[0]) < 0.05);
        assert!(distance(px(20.0, 0.1), &ls[1]) < 0.05);
        assert!(distance(px(5.0, 0.1), &ls[1]) > 20.0);
        // Sw = 0.2: Rt = 5/0.04 = 125 at φ = 0.1
        assert!(distance(px(125.0, 0.1), &ls[2]) < 0.05);
        assert!(texts(&g[0]).contains(&"class 2, m 2, n 2".to_string()));
        assert_eq!(doc.matches("<circle").count(), 2);
        // no Rw: no lines, points still drawn
        let doc = pickett(&pts, &lines, f64::NAN);
        assert!(groups(&doc, "archie-lines").is_empty());
        assert_eq!(doc.matches("<circle").count(), 2);
    }

    #[test]
    fn pickett_subsamples_by_stride() {
        let pts: Vec<PickettPoint> = (0..10_000)
            .map(|i| PickettPoint {
                phi: 0.05 + 0.2 * (i % 97) as f64 / 97.0,
                rt: 1.0 + (i % 89) as f64,
                class: (i % 3) as u8 + 1,
            })
            .collect();
        let doc = pickett(&pts, &[], 0.05);
        balanced(&doc);
        // stride ceil(10000/3000) = 4: 2500 drawn
        assert_eq!(doc.matches("<circle").count(), 2500);
        assert!(doc.contains("2500 of 10000 depths drawn"));
    }

    #[test]
    fn j_function_groups_points_and_curves() {
        let classes = vec![
            JClass {
                class: 1,
                points: vec![(0.3, 5.0), (0.6, 0.8), (f64::NAN, 1.0), (0.5, 0.0)],
                curve: vec![(0.2, 20.0), (0.5, 1.0), (1.0, 0.05)],
                label: "Brooks-Corey, rms Sw 0.012".into(),
            },
            JClass {
                class: 3,
                points: vec![(0.4, 2.0)],
                curve: vec![],
                label: "borrowed from class 1 <shared>".into(),
            },
        ];
        let doc = j_function(&classes);
        balanced(&doc);
        let g = groups(&doc, "j-class");
        assert_eq!(g.len(), 2);
        assert_eq!(g[0].matches("<circle").count(), 2);
        assert_eq!(g[1].matches("<circle").count(), 1);
        assert_eq!(polylines(&g[0]).len(), 1);
        assert!(doc.contains("borrowed from class 1 &lt;shared&gt;"));
        // J axis 0.01-100 (4 decades): J = 1 at mid-height, Sw 0.5 mid-width
        let curve = &polylines(&g[0])[0];
        assert!(curve.contains(&(265.0, 230.0)), "{curve:?}");
    }

    #[test]
    fn pressure_fwl_at_expected_pixel() {
        let pt = |z: f64, psi: f64, used: bool| PressurePoint {
            tvdss: z,
            psi,
            well: "W-1".into(),
            used,
        };
        let comp = PressureCompartment {
            name: "North & main".into(),
            points: vec![
                pt(2000.0, 3000.0, true),
                pt(2050.0, 3020.0, true),
                pt(2200.0, 3100.0, false),
                pt(f64::NAN, 3100.0, true),
            ],
            lines: vec![GradientLine {
                label: "oil 0.8 g/cm3".into(),
                intercept_psi: 2300.0,
                psi_per_unit: 0.35,
                top: 2000.0,
                base: 2100.0,
            }],
            fwl_tvdss: 2100.0,
            fwl_sigma: Some(3.0),
        };
        let doc = pressure_depth(&[comp], "m");
        balanced(&doc);
        // depths 2000-2200, padded 5 % to 1990-2210, rounded to steps of 50:
        // axis 1950-2250, FWL 2100 at the middle, y = 40 + 150/300 × 380 = 230
        let g = groups(&doc, "compartment");
        assert_eq!(g.len(), 1);
        assert!(g[0].contains("stroke-dasharray"));
        let fwl = g[0]
            .split("<line ")
            .skip(1)
            .find(|l| l.contains("stroke-dasharray"))
            .unwrap();
        assert!(
            fwl.contains("y1=\"230\"") && fwl.contains("y2=\"230\""),
            "{fwl}"
        );
        assert!(texts(&g[0]).contains(&"FWL 2100.0 ± 3.0 m".to_string()));
        assert_eq!(g[0].matches("<circle").count(), 3);
        // the left-out point is hollow (white fill) and named in the legend
        let hollow = g[0]
            .split("<circle")
            .skip(1)
            .filter(|c| c[..c.find("/>").unwrap()].contains("fill=\"#FFFFFF\""))
            .count();
        assert_eq!(hollow, 1);
        let leg = texts(&groups(&doc, "legend")[0]);
        assert!(leg.contains(&"North &amp; main: left out".to_string()));
    }

    #[test]
    fn confusion_cells_show_counts() {
        let doc = confusion(&[vec![5, 1], vec![2, 7]], "predictor");
        balanced(&doc);
        let cells = &groups(&doc, "cells")[0];
        assert_eq!(texts(cells), vec!["5", "1", "2", "7"]);
        // row fractions 5/6 × 0.85 = 0.71 and 1/6 × 0.85 = 0.14
        assert!(cells.contains("fill-opacity=\"0.71\""));
        assert!(cells.contains("fill-opacity=\"0.14\""));
        assert!(doc.contains("agreement 12 of 15 samples (80%)"));
        assert!(doc.contains(">core class<") && doc.contains(">predicted class<"));
        // ragged: missing cells count 0
        let doc = confusion(&[vec![3], vec![0, 4, 1]], "ragged");
        balanced(&doc);
        assert_eq!(
            texts(&groups(&doc, "cells")[0]),
            vec!["3", "0", "0", "0", "4", "1"]
        );
    }

    #[test]
    fn empty_inputs_draw_no_data() {
        let nan = f64::NAN;
        let docs = [
            core_phi_k(&[], &Boundaries::Fzi(vec![1.0]), 3),
            core_phi_k(&[core(nan, nan, None)], &Boundaries::None, 0),
            pickett(&[], &[], 0.05),
            pickett(
                &[PickettPoint {
                    phi: 0.0,
                    rt: -1.0,
                    class: 0,
                }],
                &[ArchieLine {
                    class: 1,
                    a: nan,
                    m: 0.0,
                    n: nan,
                }],
                0.0,
            ),
            j_function(&[]),
            j_function(&[JClass {
                class: 1,
                points: vec![(nan, 1.0), (2.0, 1.0)],
                curve: vec![(0.5, -1.0)],
                label: String::new(),
            }]),
            pressure_depth(&[], "ft"),
            confusion(&[], "none"),
            confusion(&[vec![], vec![]], "empty rows"),
        ];
        for doc in &docs {
            balanced(doc);
            assert_eq!(groups(doc, "no-data").len(), 1, "{doc}");
            assert_eq!(doc.matches("<circle").count(), 0);
        }
    }

    #[test]
    fn odd_inputs_do_not_panic() {
        let inf = f64::INFINITY;
        let pts = [core(1.0, 1e-6, Some(255)), core(0.0, 1e6, Some(0))];
        balanced(&core_phi_k(
            &pts,
            &Boundaries::Fzi(vec![1e-300, 1e300, inf]),
            255,
        ));
        balanced(&core_phi_k(&pts, &Boundaries::R35(vec![0.0, 1e-9, 1e9]), 0));
        let pp = [PickettPoint {
            phi: 1.0,
            rt: 1e6,
            class: 9,
        }];
        let al = [ArchieLine {
            class: 9,
            a: 1e300,
            m: 1e-300,
            n: -inf,
        }];
        balanced(&pickett(&pp, &al, 1e300));
        let comp = PressureCompartment {
            name: String::new(),
            points: vec![PressurePoint {
                tvdss: 5.0,
                psi: 5.0,
                well: String::new(),
                used: false,
            }],
            lines: vec![GradientLine {
                label: String::new(),
                intercept_psi: inf,
                psi_per_unit: f64::NAN,
                top: -inf,
                base: 1.0,
            }],
            fwl_tvdss: f64::NAN,
            fwl_sigma: Some(f64::NAN),
        };
        balanced(&pressure_depth(&[comp.clone(), comp], ""));
        balanced(&confusion(&[vec![usize::MAX, usize::MAX], vec![0]], "big"));
    }

    #[test]
    fn helpers_round_ranges() {
        assert_eq!(nice_range(2000.0, 2200.0, 5), (2000.0, 2200.0));
        assert_eq!(nice_range(3000.0, 3100.0, 5), (3000.0, 3100.0));
        assert_eq!(nice_range(0.12, 0.31, 5), (0.1, 0.35));
        assert_eq!(nice_range(5.0, 5.0, 5), (4.0, 6.0));
        assert_eq!(
            log_span([0.5, 3000.0].into_iter(), -2, 3, -6, 6),
            (0.01, 10000.0)
        );
        assert_eq!(
            wrap("class 2: Brooks-Corey, rms Sw 0.012", 26),
            vec!["class 2: Brooks-Corey, rms", "Sw 0.012"]
        );
        assert_eq!(wrap("", 26), vec![""]);
    }
}
