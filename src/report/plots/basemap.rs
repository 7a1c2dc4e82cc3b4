//! The base map: every well at its header location, its compartment as the
//! marker's shape and its FWL agreement as the fill (flagged wells also
//! ringed and named in vermillion). Without coordinates in the headers the
//! map says so instead of guessing.

use crate::report::plots::CompartmentWells;
use crate::report::plots::crossplots::wrap;
use crate::report::svg::{Anchor, Scale, Shape, Stroke, Svg, nice_ticks, palette, tick_label};

const W: f64 = 820.0;
const H: f64 = 640.0;
const L: f64 = 80.0;
const R: f64 = 570.0;
const T: f64 = 64.0;
const B: f64 = 560.0;
const LEG_X: f64 = 590.0;
/// Most wells named on the map; beyond it only flagged wells are.
const MAX_LABELS: usize = 40;
/// Compartment shapes, in compartment order (cycled); the diamond is kept
/// for flagged wells in the FWL chart, so it is not one of them.
const SHAPES: [Shape; 4] = [
    Shape::Circle,
    Shape::Square,
    Shape::TriangleUp,
    Shape::TriangleDown,
];

fn fill(flagged: bool, estimated: bool) -> (&'static str, &'static str) {
    match (flagged, estimated) {
        (true, _) => (palette::VERMILLION, palette::VERMILLION),
        (false, true) => (palette::BLUE, palette::FRAME),
        (false, false) => ("#FFFFFF", palette::FRAME),
    }
}

/// The base map of the field, as an SVG document. `frame` says what the
/// positions are (source, unit, datum, projection); `left_out` counts the
/// wells not on it.
pub fn base_map(compartments: &[CompartmentWells<'_>], frame: &str, left_out: usize) -> String {
    let mut s = Svg::new(W, H);
    s.group("base-map", None);
    s.group("title", None);
    s.text(
        L,
        20.0,
        "Wells at their header locations",
        15.0,
        Anchor::Start,
    );
    for (k, line) in wrap(frame, 120).iter().enumerate() {
        s.text_styled(
            L,
            36.0 + 12.0 * k as f64,
            line,
            10.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
    }
    s.end_group();
    let points: Vec<(usize, &crate::report::plots::FieldWell<'_>, (f64, f64))> = compartments
        .iter()
        .enumerate()
        .flat_map(|(k, c)| {
            c.wells
                .iter()
                .filter_map(move |w| w.position.map(|p| (k, w, p)))
        })
        .filter(|(_, _, (x, y))| x.is_finite() && y.is_finite())
        .collect();
    if points.is_empty() {
        s.group("no-map", None);
        s.rect(
            L,
            T,
            R - L,
            B - T,
            "#FFFFFF",
            Some(Stroke::solid(palette::GRID, 1.0)),
        );
        s.text_styled(
            (L + R) / 2.0,
            (T + B) / 2.0,
            "No map: no LAS header gives a well location",
            12.0,
            Anchor::Middle,
            palette::FRAME,
            0.0,
        );
        s.text_styled(
            (L + R) / 2.0,
            (T + B) / 2.0 + 16.0,
            "(X and Y, or LATI and LONG, in the ~W section).",
            11.0,
            Anchor::Middle,
            palette::FRAME,
            0.0,
        );
        s.end_group();
        s.end_group();
        return s.finish();
    }
    // equal scale on both axes, the wells' extent centred in the square
    let (mut x0, mut x1, mut y0, mut y1) = (
        f64::INFINITY,
        f64::NEG_INFINITY,
        f64::INFINITY,
        f64::NEG_INFINITY,
    );
    for (_, _, (x, y)) in &points {
        x0 = x0.min(*x);
        x1 = x1.max(*x);
        y0 = y0.min(*y);
        y1 = y1.max(*y);
    }
    let half = 0.5 * (x1 - x0).max(y1 - y0).max(100.0) * 1.25;
    let (cx, cy) = (0.5 * (x0 + x1), 0.5 * (y0 + y1));
    let xs = Scale::linear(cx - half, cx + half, L, R);
    let ys = Scale::linear(cy - half, cy + half, B, T);
    s.group("axis", None);
    for t in nice_ticks(cx - half, cx + half, 6) {
        let x = xs.px(t);
        s.line(x, T, x, B, Stroke::solid(palette::GRID, 0.6));
        s.text(x, B + 14.0, &tick_label(t), 9.0, Anchor::Middle);
    }
    for t in nice_ticks(cy - half, cy + half, 6) {
        let y = ys.px(t);
        s.line(L, y, R, y, Stroke::solid(palette::GRID, 0.6));
        s.text(L - 5.0, y + 3.0, &tick_label(t), 9.0, Anchor::End);
    }
    s.rect(
        L,
        T,
        R - L,
        B - T,
        "none",
        Some(Stroke::solid(palette::FRAME, 0.8)),
    );
    s.text((L + R) / 2.0, B + 30.0, "east, m", 11.0, Anchor::Middle);
    s.text_styled(
        18.0,
        (T + B) / 2.0,
        "north, m",
        11.0,
        Anchor::Middle,
        "#000000",
        -90.0,
    );
    // north arrow: up is north in both frames
    s.line(
        R - 18.0,
        T + 34.0,
        R - 18.0,
        T + 12.0,
        Stroke::solid(palette::FRAME, 1.5),
    );
    s.marker(
        Shape::TriangleUp,
        R - 18.0,
        T + 12.0,
        5.0,
        palette::FRAME,
        None,
    );
    s.text(R - 18.0, T + 48.0, "N", 11.0, Anchor::Middle);
    scale_bar(&mut s, &xs, half);
    s.end_group();

    let label_all = points.len() <= MAX_LABELS;
    s.group("wells", None);
    for (k, w, (x, y)) in &points {
        let (px, py) = (xs.px(*x), ys.px(*y));
        let shape = SHAPES[k % SHAPES.len()];
        let (f, outline) = fill(w.flagged, w.implied.is_some());
        let tip = format!(
            "{} (compartment {}){}",
            w.name,
            compartments[*k].name,
            if w.flagged {
                ": possibly under another FWL"
            } else if w.implied.is_none() {
                ": no FWL from its logs"
            } else {
                ": agrees with the compartment's FWL"
            }
        );
        s.group(
            if w.flagged {
                "map-well flagged"
            } else {
                "map-well"
            },
            Some(&tip),
        );
        if w.flagged {
            s.circle(
                px,
                py,
                10.0,
                "none",
                Some(Stroke::solid(palette::VERMILLION, 1.6)),
            );
        }
        s.marker(
            shape,
            px,
            py,
            if w.flagged { 6.5 } else { 5.0 },
            f,
            Some(Stroke::solid(outline, 1.0)),
        );
        if label_all || w.flagged {
            s.text_styled(
                px + 8.0,
                py - 6.0,
                &if w.flagged {
                    format!("{} ◆", w.name)
                } else {
                    w.name.to_string()
                },
                9.0,
                Anchor::Start,
                if w.flagged {
                    palette::VERMILLION
                } else {
                    "#000000"
                },
                0.0,
            );
        }
        s.end_group();
    }
    s.end_group();
    legend(&mut s, compartments, left_out, label_all);
    s.end_group();
    s.finish()
}

/// A scale bar of a round length about a quarter of the map's width.
fn scale_bar(s: &mut Svg, xs: &Scale, half: f64) {
    let target = half / 2.0;
    let p = 10f64.powf(target.log10().floor());
    let len = [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * p)
        .rfind(|l| *l <= target)
        .unwrap_or(p);
    let (a, b) = (xs.px(0.0), xs.px(len));
    let w = (b - a).abs();
    let (x, y) = (L + 12.0, B - 14.0);
    s.rect(x - 4.0, y - 14.0, w + 8.0, 22.0, "#FFFFFF", None);
    s.line(x, y, x + w, y, Stroke::solid("#000000", 2.0));
    for e in [x, x + w] {
        s.line(e, y - 4.0, e, y + 4.0, Stroke::solid("#000000", 1.2));
    }
    let label = if len >= 1000.0 {
        format!("{} km", tick_label(len / 1000.0))
    } else {
        format!("{} m", tick_label(len))
    };
    s.text(x + w / 2.0, y - 5.0, &label, 9.0, Anchor::Middle);
}

fn legend(s: &mut Svg, compartments: &[CompartmentWells<'_>], left_out: usize, label_all: bool) {
    s.group("legend", None);
    let x0 = LEG_X;
    let mut y = T + 6.0;
    let text = |s: &mut Svg, y: f64, t: &str| s.text(x0 + 20.0, y + 3.5, t, 10.0, Anchor::Start);
    s.text_styled(
        x0,
        y + 3.5,
        "shape: compartment",
        10.0,
        Anchor::Start,
        palette::FRAME,
        0.0,
    );
    y += 16.0;
    for (k, c) in compartments.iter().enumerate() {
        s.marker(
            SHAPES[k % SHAPES.len()],
            x0 + 7.0,
            y,
            5.0,
            "#FFFFFF",
            Some(Stroke::solid(palette::FRAME, 1.0)),
        );
        text(s, y, c.name);
        y += 16.0;
    }
    y += 8.0;
    s.text_styled(
        x0,
        y + 3.5,
        "fill: FWL agreement",
        10.0,
        Anchor::Start,
        palette::FRAME,
        0.0,
    );
    y += 16.0;
    for (flagged, estimated, label) in [
        (false, true, "agrees"),
        (true, true, "flagged: another FWL?"),
        (false, false, "no FWL from its logs"),
    ] {
        let (f, o) = fill(flagged, estimated);
        if flagged {
            s.circle(
                x0 + 7.0,
                y,
                10.0,
                "none",
                Some(Stroke::solid(palette::VERMILLION, 1.6)),
            );
        }
        s.marker(
            Shape::Circle,
            x0 + 7.0,
            y,
            5.0,
            f,
            Some(Stroke::solid(o, 1.0)),
        );
        text(s, y, label);
        y += 22.0;
    }
    y += 4.0;
    if !label_all {
        s.text_styled(
            x0,
            y,
            "only flagged wells named",
            10.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
        y += 14.0;
    }
    if left_out > 0 {
        s.text_styled(
            x0,
            y,
            &format!("{left_out} well(s) not on the map"),
            10.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
        y += 14.0;
    }
    super::palette_note(s, x0, y + 8.0);
    s.end_group();
}
