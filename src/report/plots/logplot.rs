//! The per-well log plot: one SVG document per well, depth increasing
//! downward, tracks left to right:
//!
//! | group class     | content                                                             |
//! |-----------------|---------------------------------------------------------------------|
//! | `track-depth`   | MD labels (and TVDSS labels when the well has them)                 |
//! | `track-gr`      | GR 0-150 gAPI, VSH 0-1 v/v                                          |
//! | `track-rt`      | RT 0.2-2000 ohm.m, logarithmic, decade grid                         |
//! | `track-dn`      | RHOB 1.95-2.95 g/cm3, NPHI 0.45 to -0.15 v/v (limestone-compatible) |
//! | `track-phi`     | PHIT, PHIE 0.5 to 0 v/v (porosity increasing leftward)              |
//! | `track-class`   | hydraulic class band, width = class probability                     |
//! | `track-sw`      | SW, SWH 0-1 v/v, SW_FIXED faint, saturation steps                   |
//!
//! Across the data tracks: zone tops, the FWL (where the well's TVDSS
//! crosses it) and flagged depths shaded grey. A legend closes the plot.
//!
//! The page is 1100 px wide; the data area is 2 px per 0.15 m of measured
//! depth (feet converted), the whole page held to 600-6000 px high. Curves
//! are decimated to at most [`MAX_VERTICES`] vertices (minimum and maximum
//! per depth bucket), and a missing sample still breaks the line.

use super::WellCurves;
use crate::input::curves::LogicalCurve as L;
use crate::output::schema::Col;
use crate::report::svg::{Anchor, Scale, Stroke, Svg, nice_ticks, num, palette, tick_label};

const WIDTH: f64 = 1100.0;
const MARGIN: f64 = 10.0;
const GAP: f64 = 12.0;
/// Top of the track headers (the title is above).
const HEADER_TOP: f64 = 40.0;
/// Height of one header row (a curve name, its scale ends and a stroke sample).
const ROW: f64 = 22.0;
/// Top of the data area: three header rows below the title.
const DATA_TOP: f64 = HEADER_TOP + 3.0 * ROW + 12.0;
const MIN_HEIGHT: f64 = 600.0;
const MAX_HEIGHT: f64 = 6000.0;
/// Data-area pixels per metre of measured depth (2 px per 0.15 m).
const PX_PER_M: f64 = 2.0 / 0.15;
/// Most vertices drawn for one curve.
const MAX_VERTICES: usize = 2000;
/// FLAG bits that shade a depth: bad hole, out of range, missing input.
const FLAG_SHADE_BITS: u64 = 1 | 2 | 4;
const LEGEND_ROW: f64 = 18.0;
/// Gap between the data area and the legend.
const LEGEND_GAP: f64 = 26.0;
/// Most classes listed in the legend (colours cycle after 8 anyway).
const LEGEND_MAX_CLASSES: u8 = 16;

/// Track names (the `track-NAME` classes) and widths, left to right.
const TRACKS: [(&str, f64); 7] = [
    ("depth", 100.0),
    ("gr", 160.0),
    ("rt", 170.0),
    ("dn", 170.0),
    ("phi", 150.0),
    ("class", 80.0),
    ("sw", 170.0),
];

/// One curve of a track: its mnemonic, scale and stroke.
#[derive(Debug, Clone, Copy)]
struct CurveSpec {
    key: Col,
    unit: &'static str,
    lo: f64,
    hi: f64,
    lo_label: &'static str,
    hi_label: &'static str,
    log: bool,
    stroke: Stroke<'static>,
}

const fn spec(
    key: Col,
    unit: &'static str,
    (lo, lo_label): (f64, &'static str),
    (hi, hi_label): (f64, &'static str),
    log: bool,
    stroke: Stroke<'static>,
) -> CurveSpec {
    CurveSpec {
        key,
        unit,
        lo,
        hi,
        lo_label,
        hi_label,
        log,
        stroke,
    }
}

const GR: CurveSpec = spec(
    Col::Input(L::GammaRay),
    "gAPI",
    (0.0, "0"),
    (150.0, "150"),
    false,
    Stroke::solid(palette::BLUISH_GREEN, 1.2),
);
const VSH: CurveSpec = spec(
    Col::Vsh,
    "v/v",
    (0.0, "0"),
    (1.0, "1"),
    false,
    Stroke::dashed(palette::ORANGE, 1.2, "5 3"),
);
const RT: CurveSpec = spec(
    Col::Input(L::DeepResistivity),
    "ohm.m, log",
    (0.2, "0.2"),
    (2000.0, "2000"),
    true,
    Stroke::solid(palette::BLACK, 1.2),
);
const RHOB: CurveSpec = spec(
    Col::Input(L::BulkDensity),
    "g/cm3",
    (1.95, "1.95"),
    (2.95, "2.95"),
    false,
    Stroke::solid(palette::VERMILLION, 1.2),
);
const NPHI: CurveSpec = spec(
    Col::Input(L::NeutronPorosity),
    "v/v",
    (0.45, "0.45"),
    (-0.15, "-0.15"),
    false,
    Stroke::dashed(palette::BLUE, 1.2, "5 3"),
);
const PHIT: CurveSpec = spec(
    Col::Phit,
    "v/v",
    (0.5, "0.5"),
    (0.0, "0"),
    false,
    Stroke::solid(palette::SKY_BLUE, 1.2),
);
const PHIE: CurveSpec = spec(
    Col::Phie,
    "v/v",
    (0.5, "0.5"),
    (0.0, "0"),
    false,
    Stroke::solid(palette::BLUE, 1.2),
);
const SW: CurveSpec = spec(
    Col::Sw,
    "v/v",
    (0.0, "0"),
    (1.0, "1"),
    false,
    Stroke::solid(palette::BLUE, 1.3),
);
const SWH: CurveSpec = spec(
    Col::Swh,
    "v/v",
    (0.0, "0"),
    (1.0, "1"),
    false,
    Stroke::dashed(palette::VERMILLION, 1.2, "6 3"),
);
const SW_FIXED: CurveSpec = spec(
    Col::SwFixed,
    "v/v",
    (0.0, "0"),
    (1.0, "1"),
    false,
    Stroke::solid(palette::BLACK, 1.0).faint(0.3),
);

/// Curves of the curve tracks, by track index in [`TRACKS`].
const TRACK_CURVES: [(usize, &[CurveSpec], usize); 5] = [
    (1, &[GR, VSH], 5),
    (2, &[RT], 0),
    (3, &[RHOB, NPHI], 10),
    (4, &[PHIT, PHIE], 5),
    (6, &[SW, SWH, SW_FIXED], 5),
];

/// Step kinds, their stroke colour and dash (colour-blind-safe colours,
/// told apart by dash too).
const STEP_KINDS: [(&str, &str, Option<&str>); 4] = [
    ("rock-quality", palette::ORANGE, Some("6 3")),
    ("fluid-contact", palette::BLUE, None),
    ("unexplained", palette::VERMILLION, Some("2 2")),
    ("flagged", palette::REDDISH_PURPLE, Some("8 3 2 3")),
];

fn step_style(kind: &str) -> (&'static str, Option<&'static str>) {
    STEP_KINDS
        .iter()
        .find(|(k, _, _)| *k == kind)
        .map_or((palette::FRAME, Some("1 3")), |&(_, c, d)| (c, d))
}

/// A step kind as a class-name suffix: lower-case letters, digits and `-`.
fn kind_class(kind: &str) -> String {
    let k: String = kind
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() {
                c.to_ascii_lowercase()
            } else {
                '-'
            }
        })
        .collect();
    if k.is_empty() { "unknown".into() } else { k }
}

/// Left edge and width of track `i` of [`TRACKS`].
fn track_x(i: usize) -> (f64, f64) {
    let i = i.min(TRACKS.len() - 1);
    let x = MARGIN + TRACKS[..i].iter().map(|(_, w)| w + GAP).sum::<f64>();
    (x, TRACKS[i].1)
}

/// Left and right edges of the data tracks (all but depth).
fn data_span() -> (f64, f64) {
    let (x0, _) = track_x(1);
    let (x1, w1) = track_x(TRACKS.len() - 1);
    (x0, x1 + w1)
}

/// The depth axis: `dmin` at pixel `top`, `dmax` at pixel `bottom`.
fn depth_scale(dmin: f64, dmax: f64, top: f64, bottom: f64) -> Scale {
    Scale::linear(dmin, dmax, top, bottom)
}

/// Metres per project depth unit.
fn metres_per_unit(unit: &str) -> f64 {
    if unit.trim().to_ascii_lowercase().starts_with('f') {
        0.3048
    } else {
        1.0
    }
}

/// Data-area height for a depth range, the whole page (data plus `chrome`)
/// held to [`MIN_HEIGHT`]..=[`MAX_HEIGHT`].
fn data_height(range: f64, unit: &str, chrome: f64) -> f64 {
    let px = range * metres_per_unit(unit) * PX_PER_M;
    let px = if px.is_finite() { px.max(0.0) } else { 0.0 };
    px.clamp(MIN_HEIGHT - chrome, MAX_HEIGHT - chrome)
        .max(100.0)
}

/// The page geometry of one well.
#[derive(Debug, Clone, Copy)]
struct Layout {
    dmin: f64,
    dmax: f64,
    data_h: f64,
    height: f64,
    depth: Scale,
}

impl Layout {
    fn data_bottom(&self) -> f64 {
        DATA_TOP + self.data_h
    }
}

/// The layout, or `None` when the well has no finite depth.
fn layout(w: &WellCurves<'_>) -> Option<Layout> {
    let (dmin, dmax) = w.md.iter().filter(|d| d.is_finite()).fold(
        None,
        |acc: Option<(f64, f64)>, &d| match acc {
            None => Some((d, d)),
            Some((a, b)) => Some((a.min(d), b.max(d))),
        },
    )?;
    let chrome = DATA_TOP + LEGEND_GAP + legend_height(w) + 10.0;
    let data_h = data_height(dmax - dmin, w.depth_unit, chrome);
    Some(Layout {
        dmin,
        dmax,
        data_h,
        height: data_h + chrome,
        depth: depth_scale(dmin, dmax, DATA_TOP, DATA_TOP + data_h),
    })
}

/// A column cut to the length of `md`.
fn col<'a>(w: &WellCurves<'a>, key: Col) -> Option<&'a [f64]> {
    w.curves.get(&key).map(|c| &c[..c.len().min(w.md.len())])
}

/// The MD where the well's TVDSS reaches the FWL, if it does.
fn fwl_md(w: &WellCurves<'_>) -> Option<f64> {
    let tvdss = w.tvdss?;
    let fwl = w.fwl_tvdss?;
    crate::stats::interpolate_first_bracket(tvdss, w.md, fwl)
}

/// Upper edge of sample `i`'s row: halfway to the previous sample.
fn row_top(ys: &[f64], i: usize) -> f64 {
    match i.checked_sub(1).map(|p| ys[p]) {
        Some(p) if p.is_finite() => (p + ys[i]) / 2.0,
        _ => ys[i],
    }
}

/// Lower edge of sample `i`'s row: halfway to the next sample.
fn row_bottom(ys: &[f64], i: usize) -> f64 {
    match ys.get(i + 1) {
        Some(&n) if n.is_finite() => (n + ys[i]) / 2.0,
        _ => ys[i],
    }
}

fn is_flagged(v: f64) -> bool {
    v.is_finite() && v >= 0.0 && (v.round() as u64) & FLAG_SHADE_BITS != 0
}

/// Pixel spans (top, bottom) of the flagged depths, consecutive samples
/// (and spans less than a pixel apart) merged.
fn flagged_spans(w: &WellCurves<'_>, ys: &[f64]) -> Vec<(f64, f64)> {
    let Some(flag) = col(w, Col::Flag) else {
        return Vec::new();
    };
    let on = |i: usize| is_flagged(flag[i]) && ys[i].is_finite();
    let mut spans: Vec<(f64, f64)> = Vec::new();
    let mut i = 0;
    while i < flag.len() {
        if !on(i) {
            i += 1;
            continue;
        }
        let mut j = i;
        while j + 1 < flag.len() && on(j + 1) {
            j += 1;
        }
        let (top, bottom) = (row_top(ys, i), row_bottom(ys, j));
        let (top, bottom) = (top.min(bottom), top.max(bottom));
        match spans.last_mut() {
            Some(last) if top - last.1 < 1.0 && top >= last.0 => last.1 = last.1.max(bottom),
            _ => spans.push((top, bottom)),
        }
        i = j + 1;
    }
    spans
}

/// Extremes (by x) of a run of points, with their sample order.
#[derive(Debug, Clone, Copy)]
struct Extremes {
    min: (usize, (f64, f64)),
    max: (usize, (f64, f64)),
}

impl Extremes {
    fn add(e: &mut Option<Extremes>, i: usize, p: (f64, f64)) {
        match e {
            None => {
                *e = Some(Extremes {
                    min: (i, p),
                    max: (i, p),
                })
            }
            Some(x) => {
                if p.0 < x.min.1.0 {
                    x.min = (i, p);
                }
                if p.0 > x.max.1.0 {
                    x.max = (i, p);
                }
            }
        }
    }

    fn push_to(e: Option<Extremes>, out: &mut Vec<(f64, f64)>) {
        if let Some(x) = e {
            let (a, b) = if x.min.0 <= x.max.0 {
                (x.min, x.max)
            } else {
                (x.max, x.min)
            };
            out.push(a.1);
            if b.0 != a.0 {
                out.push(b.1);
            }
        }
    }
}

/// At most `max_vertices` finite points: the points themselves when few
/// enough, otherwise the minimum and maximum x of each of `max_vertices / 4`
/// buckets of samples. A non-finite point inside a bucket still breaks the
/// curve there (the pieces after the first break of a bucket are merged,
/// being less than a bucket apart).
fn decimate(pts: &[(f64, f64)], max_vertices: usize) -> Vec<(f64, f64)> {
    if pts.len() <= max_vertices {
        return pts.to_vec();
    }
    let n = pts.len();
    let buckets = (max_vertices / 4).max(1);
    let nan = (f64::NAN, f64::NAN);
    let mut out = Vec::with_capacity(max_vertices + 2 * buckets);
    for b in 0..buckets {
        let (lo, hi) = (b * n / buckets, (b + 1) * n / buckets);
        let (mut before, mut after) = (None, None);
        let (mut broke, mut trailing_break) = (false, false);
        for (i, &p) in pts.iter().enumerate().take(hi).skip(lo) {
            if p.0.is_finite() && p.1.is_finite() {
                Extremes::add(if broke { &mut after } else { &mut before }, i, p);
                trailing_break = false;
            } else {
                broke = true;
                trailing_break = true;
            }
        }
        Extremes::push_to(before, &mut out);
        if broke {
            out.push(nan);
        }
        if after.is_some() {
            Extremes::push_to(after, &mut out);
            if trailing_break {
                out.push(nan);
            }
        }
    }
    out
}

fn curve_scale(c: &CurveSpec, x: f64, w: f64) -> Scale {
    if c.log {
        Scale::log(c.lo, c.hi, x, x + w)
    } else {
        Scale::linear(c.lo, c.hi, x, x + w)
    }
}

/// Points (x, y) of a curve, off-scale values held to the track edges and
/// missing (or, on a log track, non-positive) values as NaN.
fn curve_points(values: &[f64], ys: &[f64], scale: &Scale) -> Vec<(f64, f64)> {
    values
        .iter()
        .zip(ys)
        .map(|(&v, &y)| {
            let x = if v.is_finite() {
                scale.px_clamped(v)
            } else {
                f64::NAN
            };
            (x, y)
        })
        .collect()
}

/// One header row: low end, name and unit, high end, and a stroke sample.
#[allow(clippy::too_many_arguments)]
fn header_row(
    s: &mut Svg,
    x: f64,
    w: f64,
    row: usize,
    lo: &str,
    mid: &str,
    hi: &str,
    stroke: Option<Stroke>,
) {
    let y = HEADER_TOP + 14.0 + ROW * row as f64;
    let colour = stroke.map_or(palette::BLACK, |st| st.colour);
    let colour = if stroke.is_some_and(|st| st.opacity < 0.5) {
        palette::FRAME
    } else {
        colour
    };
    if !lo.is_empty() {
        s.text_styled(x + 2.0, y, lo, 10.0, Anchor::Start, colour, 0.0);
    }
    s.text_styled(x + w / 2.0, y, mid, 10.0, Anchor::Middle, colour, 0.0);
    if !hi.is_empty() {
        s.text_styled(x + w - 2.0, y, hi, 10.0, Anchor::End, colour, 0.0);
    }
    if let Some(st) = stroke {
        s.line(x, y + 5.0, x + w, y + 5.0, st);
    }
}

/// Frame of a track's data area.
fn frame(s: &mut Svg, x: f64, w: f64, l: &Layout) {
    s.rect(
        x,
        DATA_TOP,
        w,
        l.data_h,
        "none",
        Some(Stroke::solid(palette::FRAME, 1.0)),
    );
}

/// Depth grid lines and flagged shading inside a data track.
fn background(s: &mut Svg, x: f64, w: f64, l: &Layout, ticks: &[f64], flagged: &[(f64, f64)]) {
    for &(top, bottom) in flagged {
        let top = top.clamp(DATA_TOP, l.data_bottom());
        let bottom = bottom.clamp(DATA_TOP, l.data_bottom());
        let h = (bottom - top).max(0.5);
        s.rect_faint(x, top, w, h, palette::SHADE, 0.45);
    }
    for &t in ticks {
        let y = l.depth.px(t);
        s.line(x, y, x + w, y, Stroke::solid(palette::GRID, 0.5));
    }
}

fn no_data(s: &mut Svg, x: f64, w: f64, l: &Layout) {
    s.group("no-data", None);
    s.text_styled(
        x + w / 2.0,
        DATA_TOP + l.data_h.min(400.0) / 2.0,
        "no data",
        12.0,
        Anchor::Middle,
        palette::FRAME,
        0.0,
    );
    s.end_group();
}

/// A curve track, its group left open (the caller may add to it).
#[allow(clippy::too_many_arguments)]
fn curve_track(
    s: &mut Svg,
    w: &WellCurves<'_>,
    l: &Layout,
    index: usize,
    curves: &[CurveSpec],
    divisions: usize,
    ys: &[f64],
    ticks: &[f64],
    flagged: &[(f64, f64)],
) {
    let (x, tw) = track_x(index);
    s.group(&format!("track track-{}", TRACKS[index].0), None);
    for (row, c) in curves.iter().enumerate() {
        let mid = format!("{} {}", c.key.name(), c.unit);
        header_row(s, x, tw, row, c.lo_label, &mid, c.hi_label, Some(c.stroke));
    }
    background(s, x, tw, l, ticks, flagged);
    // vertical grid: divisions of a linear track, decades (and their
    // multiples, fainter) of a log track
    match curves.first() {
        Some(c) if c.log => {
            let scale = curve_scale(c, x, tw);
            let (a, b) = (c.lo.min(c.hi), c.lo.max(c.hi));
            let (e0, e1) = (a.log10().floor() as i32, b.log10().ceil() as i32);
            for e in e0..=e1 {
                for m in 1..=9 {
                    let v = f64::from(m) * 10f64.powi(e);
                    if v <= a || v >= b {
                        continue;
                    }
                    let px = scale.px(v);
                    let st = if m == 1 {
                        Stroke::solid(palette::GRID, 1.0)
                    } else {
                        Stroke::solid(palette::GRID, 0.5).faint(0.6)
                    };
                    s.line(px, DATA_TOP, px, l.data_bottom(), st);
                }
            }
        }
        _ => {
            for k in 1..divisions {
                let px = x + tw * k as f64 / divisions as f64;
                s.line(
                    px,
                    DATA_TOP,
                    px,
                    l.data_bottom(),
                    Stroke::solid(palette::GRID, 0.6),
                );
            }
        }
    }
    let mut drawn = false;
    for c in curves {
        let Some(values) = col(w, c.key) else {
            continue;
        };
        let scale = curve_scale(c, x, tw);
        let pts = curve_points(values, ys, &scale);
        if !pts.iter().any(|p| p.0.is_finite() && p.1.is_finite()) {
            continue;
        }
        drawn = true;
        s.polyline(&decimate(&pts, MAX_VERTICES), c.stroke);
    }
    if !drawn {
        no_data(s, x, tw, l);
    }
    frame(s, x, tw, l);
}

fn depth_track(s: &mut Svg, w: &WellCurves<'_>, l: &Layout, ticks: &[f64]) {
    let (x, tw) = track_x(0);
    let tvdss = w.tvdss;
    let col_w = if tvdss.is_some() { tw / 2.0 } else { tw };
    s.group("track track-depth", None);
    let unit = format!("({})", w.depth_unit);
    header_row(s, x, col_w, 0, "", "MD", "", None);
    header_row(s, x, col_w, 1, "", &unit, "", None);
    if tvdss.is_some() {
        header_row(s, x + col_w, col_w, 0, "", "TVDSS", "", None);
        header_row(s, x + col_w, col_w, 1, "", &unit, "", None);
    }
    for &t in ticks {
        let y = l.depth.px(t);
        s.text(x + col_w - 6.0, y + 3.5, &tick_label(t), 10.0, Anchor::End);
        s.line(
            x + tw - 5.0,
            y,
            x + tw,
            y,
            Stroke::solid(palette::FRAME, 1.0),
        );
        if let Some(tv) = tvdss.and_then(|tv| crate::stats::interpolate_first_bracket(w.md, tv, t))
        {
            let label = tick_label((tv * 10.0).round() / 10.0);
            s.text_styled(
                x + tw - 8.0,
                y + 3.5,
                &label,
                10.0,
                Anchor::End,
                palette::FRAME,
                0.0,
            );
        }
    }
    frame(s, x, tw, l);
    s.end_group();
}

/// One merged run of class samples.
struct ClassRun {
    class: u8,
    bucket: i64,
    top: f64,
    bottom: f64,
    prob_sum: f64,
    count: usize,
    last: usize,
}

fn class_runs(w: &WellCurves<'_>, ys: &[f64]) -> Vec<ClassRun> {
    let Some(class) = col(w, Col::Class) else {
        return Vec::new();
    };
    let prob = col(w, Col::ClassProb);
    let mut runs: Vec<ClassRun> = Vec::new();
    for (i, &c) in class.iter().enumerate() {
        if !c.is_finite() || c < 0.5 || !ys[i].is_finite() {
            continue;
        }
        let c = c.round().clamp(1.0, 255.0) as u8;
        let p = prob
            .and_then(|p| p.get(i).copied())
            .filter(|p| p.is_finite())
            .map_or(1.0, |p| p.clamp(0.0, 1.0));
        let bucket = (p * 10.0).round() as i64;
        let (top, bottom) = (row_top(ys, i), row_bottom(ys, i));
        match runs.last_mut() {
            Some(r)
                if r.class == c
                    && r.last + 1 == i
                    && (r.bucket == bucket || (r.bottom - r.top).abs() < 1.0) =>
            {
                r.bottom = bottom;
                r.prob_sum += p;
                r.count += 1;
                r.last = i;
            }
            _ => runs.push(ClassRun {
                class: c,
                bucket,
                top,
                bottom,
                prob_sum: p,
                count: 1,
                last: i,
            }),
        }
    }
    runs
}

fn class_track(s: &mut Svg, w: &WellCurves<'_>, l: &Layout, ys: &[f64], flagged: &[(f64, f64)]) {
    let index = 5;
    let (x, tw) = track_x(index);
    s.group("track track-class", None);
    header_row(s, x, tw, 0, "", "CLASS", "", None);
    header_row(s, x, tw, 1, "", "width:", "", None);
    header_row(s, x, tw, 2, "", "probability 0-1", "", None);
    background(s, x, tw, l, &[], flagged);
    let runs = class_runs(w, ys);
    if runs.is_empty() {
        no_data(s, x, tw, l);
    } else {
        s.group("class-band", None);
        for r in &runs {
            let mean = r.prob_sum / r.count.max(1) as f64;
            let (top, bottom) = (r.top.min(r.bottom), r.top.max(r.bottom));
            let h = (bottom - top).max(0.5);
            s.rect(x, top, tw * mean, h, palette::class(r.class), None);
        }
        s.end_group();
    }
    frame(s, x, tw, l);
    s.end_group();
}

/// The step markers, inside the SW track's (open) group.
fn steps(s: &mut Svg, w: &WellCurves<'_>, l: &Layout) {
    let (x, tw) = track_x(6);
    for st in &w.steps {
        if !st.md.is_finite() || st.md < l.dmin || st.md > l.dmax {
            continue;
        }
        let y = l.depth.px(st.md);
        let (colour, dash) = step_style(&st.kind);
        let title = format!(
            "{} step at MD {} {}: {}",
            st.kind,
            num(st.md),
            w.depth_unit,
            st.explanation
        );
        s.group(&format!("step step-{}", kind_class(&st.kind)), Some(&title));
        let stroke = Stroke {
            colour,
            width: 2.5,
            dash,
            opacity: 1.0,
        };
        s.line(x, y, x + tw, y, stroke);
        s.end_group();
    }
}

fn zone_tops(s: &mut Svg, w: &WellCurves<'_>, l: &Layout) {
    let (x0, x1) = data_span();
    s.group("zone-tops", None);
    for z in &w.zones {
        if !z.top_md.is_finite() {
            continue;
        }
        let label_y = if z.top_md >= l.dmin && z.top_md <= l.dmax {
            let y = l.depth.px(z.top_md);
            s.line(x0, y, x1, y, Stroke::solid(palette::FRAME, 0.8));
            y + 11.0
        } else if z.top_md < l.dmin && z.base_md > l.dmin {
            DATA_TOP + 11.0
        } else {
            continue;
        };
        s.text_styled(
            x0 + 3.0,
            label_y,
            &z.name,
            10.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
    }
    s.end_group();
}

fn fwl_line(s: &mut Svg, w: &WellCurves<'_>, l: &Layout) {
    let (Some(md), Some(fwl)) = (fwl_md(w), w.fwl_tvdss) else {
        return;
    };
    let (x0, x1) = data_span();
    let y = l.depth.px(md);
    let title = format!(
        "FWL {} {} TVDSS, at MD {} {}",
        num(fwl),
        w.depth_unit,
        num(md),
        w.depth_unit
    );
    s.group("fwl", Some(&title));
    s.line(x0, y, x1, y, Stroke::dashed(palette::BLUE, 1.5, "8 4"));
    s.text_styled(
        x1 - 3.0,
        y - 3.0,
        "FWL",
        10.0,
        Anchor::End,
        palette::BLUE,
        0.0,
    );
    s.end_group();
}

/// A legend entry's swatch.
#[derive(Debug, Clone, Copy)]
enum Swatch {
    Line(Stroke<'static>),
    Box(&'static str, f64),
}

/// Legend rows, each a list of (swatch, label).
fn legend_rows(w: &WellCurves<'_>) -> Vec<Vec<(Swatch, String)>> {
    let mut sections: Vec<Vec<(Swatch, String)>> = Vec::new();
    sections.push(
        TRACK_CURVES
            .iter()
            .flat_map(|(_, cs, _)| cs.iter())
            .map(|c| (Swatch::Line(c.stroke), c.key.name().to_string()))
            .collect(),
    );
    let shown = w.class_count.min(LEGEND_MAX_CLASSES);
    let mut classes: Vec<(Swatch, String)> = (1..=shown)
        .map(|c| (Swatch::Box(palette::class(c), 1.0), format!("class {c}")))
        .collect();
    if w.class_count > shown {
        classes.push((
            Swatch::Box("none", 0.0),
            format!("(colours repeat to class {})", w.class_count),
        ));
    }
    sections.push(classes);
    let mut marks = vec![
        (
            Swatch::Line(Stroke::solid(palette::FRAME, 0.8)),
            "zone top".to_string(),
        ),
        (
            Swatch::Line(Stroke::dashed(palette::BLUE, 1.5, "8 4")),
            "FWL".to_string(),
        ),
        (
            Swatch::Box(palette::SHADE, 0.45),
            "flagged depth".to_string(),
        ),
    ];
    for (kind, colour, dash) in STEP_KINDS {
        marks.push((
            Swatch::Line(Stroke {
                colour,
                width: 2.5,
                dash,
                opacity: 1.0,
            }),
            format!("{kind} step"),
        ));
    }
    sections.push(marks);

    let mut rows = Vec::new();
    for section in sections {
        let mut row: Vec<(Swatch, String)> = Vec::new();
        let mut x = MARGIN;
        for item in section {
            let iw = item_width(&item.1);
            if !row.is_empty() && x + iw > WIDTH - MARGIN {
                rows.push(std::mem::take(&mut row));
                x = MARGIN;
            }
            x += iw;
            row.push(item);
        }
        if !row.is_empty() {
            rows.push(row);
        }
    }
    rows
}

fn item_width(label: &str) -> f64 {
    30.0 + 6.2 * label.chars().count() as f64 + 16.0
}

fn legend_height(w: &WellCurves<'_>) -> f64 {
    (legend_rows(w).len() + 1) as f64 * LEGEND_ROW + 6.0
}

fn legend(s: &mut Svg, w: &WellCurves<'_>, l: &Layout) {
    let top = l.data_bottom() + LEGEND_GAP;
    s.group("legend", None);
    let rows = legend_rows(w);
    for (r, row) in rows.iter().enumerate() {
        let y = top + LEGEND_ROW * r as f64 + 12.0;
        let mut x = MARGIN;
        for (swatch, label) in row {
            match *swatch {
                Swatch::Line(st) => s.line(x, y - 4.0, x + 24.0, y - 4.0, st),
                Swatch::Box(fill, op) if op > 0.0 => {
                    s.rect_faint(x + 4.0, y - 10.0, 16.0, 11.0, fill, op);
                }
                Swatch::Box(..) => {}
            }
            s.text(x + 30.0, y, label, 10.0, Anchor::Start);
            x += item_width(label);
        }
    }
    let y = top + LEGEND_ROW * rows.len() as f64 + 12.0;
    s.text_styled(
        MARGIN,
        y,
        "Colours: Okabe-Ito palette (colour-blind safe); line dashes also tell curves and step kinds apart.",
        10.0,
        Anchor::Start,
        palette::FRAME,
        0.0,
    );
    s.end_group();
}

fn title(s: &mut Svg, w: &WellCurves<'_>, sub: &str) {
    s.text(
        MARGIN,
        24.0,
        &format!("Well {}", w.well),
        16.0,
        Anchor::Start,
    );
    s.text_styled(
        s.width() - MARGIN,
        24.0,
        sub,
        11.0,
        Anchor::End,
        palette::FRAME,
        0.0,
    );
}

fn no_depths(w: &WellCurves<'_>) -> String {
    let mut s = Svg::new(420.0, 120.0);
    title(&mut s, w, "log plot");
    s.group("no-data", None);
    s.text(MARGIN, 70.0, "no depths", 12.0, Anchor::Start);
    s.end_group();
    s.finish()
}

/// The log plot of one well as an SVG document (see the module notes).
/// Never fails: missing curves draw "no data" in their track, and a well
/// without depths gives a small document saying so.
pub fn log_plot(w: &WellCurves<'_>) -> String {
    let Some(l) = layout(w) else {
        return no_depths(w);
    };
    let ys: Vec<f64> =
        w.md.iter()
            .map(|&d| {
                if d.is_finite() {
                    l.depth.px(d)
                } else {
                    f64::NAN
                }
            })
            .collect();
    let mut s = Svg::new(WIDTH, l.height);
    let sub = format!(
        "MD {} to {} {}, {} samples",
        num(l.dmin),
        num(l.dmax),
        w.depth_unit,
        w.md.len()
    );
    title(&mut s, w, &sub);

    let n_ticks = ((l.data_h / 60.0) as usize).max(2);
    let mut ticks = nice_ticks(l.dmin, l.dmax, n_ticks);
    if ticks.is_empty() {
        ticks.push(l.dmin);
    }
    let flagged = flagged_spans(w, &ys);

    depth_track(&mut s, w, &l, &ticks);
    for (index, curves, divisions) in TRACK_CURVES {
        curve_track(
            &mut s, w, &l, index, curves, divisions, &ys, &ticks, &flagged,
        );
        if index == 6 {
            steps(&mut s, w, &l);
        }
        s.end_group();
        if index == 4 {
            class_track(&mut s, w, &l, &ys, &flagged);
        }
    }
    zone_tops(&mut s, w, &l);
    fwl_line(&mut s, w, &l);
    legend(&mut s, w, &l);
    s.finish()
}

#[cfg(test)]
mod tests {
    use super::super::{StepMark, ZoneMark};
    use super::*;
    use std::collections::BTreeMap;

    /// Owned columns for a constructed well.
    struct Cols {
        md: Vec<f64>,
        tvdss: Vec<f64>,
        curves: Vec<(Col, Vec<f64>)>,
    }

    /// 500 depths 2000-2075 m, analytic curves, a few NaNs and flags.
    fn cols(n: usize) -> Cols {
        let md: Vec<f64> = (0..n)
            .map(|i| 2000.0 + 75.0 * i as f64 / (n - 1) as f64)
            .collect();
        let tvdss: Vec<f64> = md.iter().map(|d| 0.98 * d - 30.0).collect();
        let f = |g: &dyn Fn(f64) -> f64| md.iter().map(|&d| g(d)).collect::<Vec<f64>>();
        let mut gr = f(&|d| 75.0 + 60.0 * (d / 3.0).sin());
        gr[10] = f64::NAN;
        gr[11] = f64::INFINITY;
        let mut rt = f(&|d| 10f64.powf(1.0 + (d / 5.0).sin()));
        rt[20] = 0.0;
        rt[21] = -3.0;
        let flag = (0..n)
            .map(|i| match i {
                100..=109 => 1.0,
                200 => 4.0,
                300 => 8.0, // outside zones only: not shaded
                _ => 0.0,
            })
            .collect();
        let curves = vec![
            (Col::Input(L::GammaRay), gr),
            (Col::Vsh, f(&|d| 0.5 + 0.4 * (d / 3.0).sin())),
            (Col::Input(L::DeepResistivity), rt),
            (
                Col::Input(L::BulkDensity),
                f(&|d| 2.4 + 0.2 * (d / 4.0).cos()),
            ),
            (
                Col::Input(L::NeutronPorosity),
                f(&|d| 0.2 + 0.1 * (d / 4.0).sin()),
            ),
            (Col::Phit, f(&|d| 0.22 + 0.05 * (d / 6.0).sin())),
            (Col::Phie, f(&|d| 0.18 + 0.05 * (d / 6.0).sin())),
            (Col::Class, f(&|d| if d < 2030.0 { 2.0 } else { 4.0 })),
            (Col::ClassProb, f(&|d| if d < 2050.0 { 0.9 } else { 0.6 })),
            (Col::Sw, f(&|d| ((d - 2000.0) / 75.0).clamp(0.05, 1.0))),
            (Col::Swh, f(&|d| ((d - 1995.0) / 70.0).clamp(0.05, 1.0))),
            (Col::SwFixed, f(&|d| ((d - 2005.0) / 70.0).clamp(0.05, 1.0))),
            (Col::Flag, flag),
        ];
        Cols { md, tvdss, curves }
    }

    fn well<'a>(c: &'a Cols, name: &'a str) -> WellCurves<'a> {
        WellCurves {
            well: name,
            depth_unit: "m",
            md: &c.md,
            tvdss: Some(&c.tvdss),
            curves: c.curves.iter().map(|(k, v)| (*k, v.as_slice())).collect(),
            zones: vec![
                ZoneMark {
                    name: "Upper".into(),
                    top_md: 2000.0,
                    base_md: 2040.0,
                },
                ZoneMark {
                    name: "Lower".into(),
                    top_md: 2040.0,
                    base_md: 2075.0,
                },
            ],
            steps: vec![
                StepMark {
                    md: 2030.0,
                    kind: "rock-quality".into(),
                    explanation: "class 2 -> 4 & PHIE up".into(),
                },
                StepMark {
                    md: 2060.0,
                    kind: "fluid-contact".into(),
                    explanation: "SW < 0.5 above FWL".into(),
                },
            ],
            fwl_tvdss: Some(0.98 * 2050.0 - 30.0),
            class_count: 5,
        }
    }

    /// The body of the group that starts with `open`, up to the next track.
    fn track_body<'d>(doc: &'d str, name: &str) -> &'d str {
        let open = format!("<g class=\"track track-{name}\">");
        let start = doc.find(&open).expect("track present") + open.len();
        let rest = &doc[start..];
        let end = rest
            .find("<g class=\"track ")
            .or_else(|| rest.find("<g class=\"zone-tops\">"))
            .unwrap_or(rest.len());
        &rest[..end]
    }

    fn polyline_vertices(text: &str) -> Vec<usize> {
        text.split("<polyline")
            .skip(1)
            .map(|p| {
                let s = p.find("points=\"").unwrap() + 8;
                let e = p[s..].find('"').unwrap();
                p[s..s + e].split_whitespace().count()
            })
            .collect()
    }

    #[test]
    fn depth_scale_by_hand() {
        let s = depth_scale(2000.0, 2075.0, 100.0, 1100.0);
        assert_eq!(s.px(2000.0), 100.0);
        assert_eq!(s.px(2075.0), 1100.0);
        assert!((s.px(2037.5) - 600.0).abs() < 1e-9);
        assert!((s.px(2015.0) - 300.0).abs() < 1e-9);
        // 2 px per 0.15 m: 75 m is 1000 px; 30 m is held to the minimum page
        assert!((data_height(75.0, "m", 200.0) - 1000.0).abs() < 1e-9);
        assert!((data_height(30.0, "m", 200.0) - 400.0).abs() < 1e-9);
        assert!((data_height(1e6, "m", 200.0) - 5800.0).abs() < 1e-9);
        // feet are converted: 250 ft = 76.2 m
        assert!((data_height(250.0, "ft", 200.0) - 76.2 * PX_PER_M).abs() < 1e-9);
        assert!(data_height(f64::NAN, "m", 200.0) >= 100.0);
    }

    #[test]
    fn interpolation_and_fwl_crossing() {
        let xs = [0.0, 10.0, 20.0];
        let ys = [100.0, 200.0, 400.0];
        assert_eq!(
            crate::stats::interpolate_first_bracket(&xs, &ys, 15.0),
            Some(300.0)
        );
        assert_eq!(
            crate::stats::interpolate_first_bracket(&xs, &ys, 0.0),
            Some(100.0)
        );
        assert_eq!(
            crate::stats::interpolate_first_bracket(&xs, &ys, 25.0),
            None
        );
        assert_eq!(
            crate::stats::interpolate_first_bracket(&xs, &ys, f64::NAN),
            None
        );
        let c = cols(500);
        let w = well(&c, "W");
        let md = fwl_md(&w).unwrap();
        assert!((md - 2050.0).abs() < 1e-6, "{md}");
        let mut no_tv = well(&c, "W");
        no_tv.tvdss = None;
        assert_eq!(fwl_md(&no_tv), None);
        let mut deep = well(&c, "W");
        deep.fwl_tvdss = Some(5000.0);
        assert_eq!(fwl_md(&deep), None);
        assert!(!log_plot(&deep).contains("class=\"fwl\""));
    }

    #[test]
    fn full_plot_structure() {
        let c = cols(500);
        let w = well(&c, "W-1");
        let doc = log_plot(&w);
        assert!(doc.starts_with("<svg"));
        assert_eq!(doc.matches("<g").count(), doc.matches("</g>").count());
        for t in ["depth", "gr", "rt", "dn", "phi", "class", "sw"] {
            assert_eq!(
                doc.matches(&format!("<g class=\"track track-{t}\">"))
                    .count(),
                1,
                "{t}"
            );
        }
        assert!(!doc.contains("no data"));
        assert!(doc.contains("<g class=\"legend\">") && doc.contains("Okabe-Ito"));
        assert!(doc.contains("TVDSS") && doc.contains("gAPI") && doc.contains("ohm.m"));
        // steps: two groups, right kinds, escaped explanations
        assert_eq!(doc.matches("<g class=\"step ").count(), 2);
        assert!(doc.contains("<g class=\"step step-rock-quality\"><title>"));
        assert!(doc.contains("<g class=\"step step-fluid-contact\"><title>"));
        assert!(doc.contains("class 2 -&gt; 4 &amp; PHIE up"));
        assert!(doc.contains("SW &lt; 0.5 above FWL"));
        let sw = track_body(&doc, "sw");
        assert_eq!(sw.matches("<g class=\"step ").count(), 2);
        // zone names
        assert!(doc.contains(">Upper</text>") && doc.contains(">Lower</text>"));
        // class band: two classes, three probability runs merged
        let class = track_body(&doc, "class");
        assert!(class.contains("<g class=\"class-band\">"));
        assert_eq!(class.matches(palette::class(2)).count(), 1);
        assert_eq!(class.matches(palette::class(4)).count(), 2);
        // flagged: one run of ten samples and one single sample (bit 8 not
        // shaded), in each of the six data tracks
        let gr = track_body(&doc, "gr");
        assert_eq!(gr.matches(palette::SHADE).count(), 2);
        assert_eq!(doc.matches(palette::SHADE).count(), 2 * 6 + 1);
        // the NaN and inf in GR break its line, the 0 and -3 break RT's
        assert_eq!(polyline_vertices(gr).len(), 3);
        assert_eq!(polyline_vertices(track_body(&doc, "rt")).len(), 2);
    }

    #[test]
    fn fwl_at_the_right_pixel() {
        let c = cols(500);
        let w = well(&c, "W");
        let l = layout(&w).unwrap();
        assert_eq!((l.dmin, l.dmax), (2000.0, 2075.0));
        assert!((l.data_h - 1000.0).abs() < 1e-9);
        let s = depth_scale(2000.0, 2075.0, DATA_TOP, DATA_TOP + l.data_h);
        let y = s.px(2050.0);
        assert!((y - (DATA_TOP + 50.0 / 75.0 * 1000.0)).abs() < 1e-6);
        let doc = log_plot(&w);
        let g = doc.find("<g class=\"fwl\">").expect("fwl drawn");
        let line = &doc[g..];
        let line = &line[line.find("<line").unwrap()..];
        let line = &line[..line.find("/>").unwrap()];
        let y_txt = num(y);
        assert!(
            line.contains(&format!("y1=\"{y_txt}\" ")),
            "{line} vs {y_txt}"
        );
        assert!(line.contains(&format!("y2=\"{y_txt}\" ")), "{line}");
        assert!(line.contains("stroke-dasharray"));
        assert!(doc[g..].contains(">FWL</text>"));
    }

    #[test]
    fn long_curves_are_decimated() {
        let n = 20_000;
        let md: Vec<f64> = (0..n).map(|i| 1000.0 + 0.1 * i as f64).collect();
        let mut gr: Vec<f64> = md.iter().map(|d| 75.0 + 70.0 * (d * 3.0).sin()).collect();
        let rt: Vec<f64> = md
            .iter()
            .map(|d| 10f64.powf((d * 0.7).sin() * 2.0))
            .collect();
        gr[5000] = f64::NAN;
        let mut curves = BTreeMap::new();
        curves.insert(Col::Input(L::GammaRay), gr.as_slice());
        curves.insert(Col::Input(L::DeepResistivity), rt.as_slice());
        let w = WellCurves {
            well: "long",
            depth_unit: "m",
            md: &md,
            tvdss: None,
            curves,
            zones: vec![],
            steps: vec![],
            fwl_tvdss: Some(1500.0),
            class_count: 3,
        };
        let doc = log_plot(&w);
        let gr_v = polyline_vertices(track_body(&doc, "gr"));
        assert_eq!(gr_v.len(), 2, "the NaN breaks the decimated line");
        let total: usize = gr_v.iter().sum();
        assert!((1000..=MAX_VERTICES).contains(&total), "{total}");
        let rt_v: usize = polyline_vertices(track_body(&doc, "rt")).iter().sum();
        assert!((1000..=MAX_VERTICES).contains(&rt_v), "{rt_v}");
        // page height held to the maximum; no tvdss: no FWL
        assert!(doc.contains("height=\"6000\""));
        assert!(!doc.contains("class=\"fwl\""));
        // decimation keeps the extremes of a bucket, in order
        let pts: Vec<(f64, f64)> = (0..10).map(|i| (i as f64 % 3.0, i as f64)).collect();
        let d = decimate(&pts, 4);
        assert_eq!(d, vec![(0.0, 0.0), (2.0, 2.0)]);
    }

    #[test]
    fn missing_tracks_say_no_data() {
        let c = cols(500);
        let mut w = well(&c, "W");
        w.curves.remove(&Col::Input(L::DeepResistivity));
        w.curves.insert(Col::Input(L::BulkDensity), &[]);
        let nan = vec![f64::NAN; 500];
        w.curves.insert(Col::Input(L::NeutronPorosity), &nan);
        w.curves.remove(&Col::Class);
        let doc = log_plot(&w);
        for t in ["rt", "dn", "class"] {
            let body = track_body(&doc, t);
            assert!(body.contains("<g class=\"no-data\"><text"), "{t}");
            assert!(body.contains(">no data</text>"), "{t}");
        }
        assert!(!track_body(&doc, "gr").contains("no-data"));
        assert_eq!(doc.matches("<g").count(), doc.matches("</g>").count());
    }

    #[test]
    fn names_escaped_and_odd_wells_do_not_panic() {
        let c = cols(500);
        let doc = log_plot(&well(&c, "a<b&c"));
        assert!(doc.contains("Well a&lt;b&amp;c"));
        assert!(!doc.contains("a<b"));

        let empty = WellCurves {
            well: "empty/1",
            depth_unit: "ft",
            md: &[],
            tvdss: None,
            curves: BTreeMap::new(),
            zones: vec![],
            steps: vec![],
            fwl_tvdss: None,
            class_count: 0,
        };
        let doc = log_plot(&empty);
        assert!(doc.starts_with("<svg") && doc.contains("no depths"));
        assert_eq!(doc.matches("<g").count(), doc.matches("</g>").count());

        // one depth, NaN depths, short and odd columns, inf, steps off the plot
        let md = [1500.0, f64::NAN, 1500.0];
        let tv = [f64::INFINITY];
        let short = [3.0];
        let odd = [f64::NEG_INFINITY, 1e300, -1e300, 7.0];
        let mut curves = BTreeMap::new();
        curves.insert(Col::Input(L::GammaRay), &short[..]);
        curves.insert(Col::Input(L::DeepResistivity), &odd[..]);
        curves.insert(Col::Class, &odd[..]);
        curves.insert(Col::ClassProb, &short[..]);
        curves.insert(Col::Flag, &odd[..]);
        let w = WellCurves {
            well: "",
            depth_unit: "",
            md: &md,
            tvdss: Some(&tv),
            curves,
            zones: vec![ZoneMark {
                name: "z".into(),
                top_md: f64::NAN,
                base_md: 0.0,
            }],
            steps: vec![StepMark {
                md: 9999.0,
                kind: "x y\"".into(),
                explanation: String::new(),
            }],
            fwl_tvdss: Some(f64::NAN),
            class_count: 255,
        };
        let doc = log_plot(&w);
        assert!(doc.starts_with("<svg"));
        assert_eq!(doc.matches("<g").count(), doc.matches("</g>").count());
        let nan_md = [f64::NAN, f64::NAN];
        let w2 = WellCurves { md: &nan_md, ..w };
        assert!(log_plot(&w2).contains("no depths"));
    }

    #[test]
    fn step_kinds_have_distinct_styles() {
        let styles: Vec<_> = STEP_KINDS.iter().map(|k| step_style(k.0)).collect();
        for i in 0..styles.len() {
            for j in i + 1..styles.len() {
                assert_ne!(styles[i].0, styles[j].0);
                assert_ne!(styles[i].1, styles[j].1);
            }
        }
        assert_eq!(kind_class("Fluid Contact"), "fluid-contact");
        assert_eq!(kind_class(""), "unknown");
    }
}
