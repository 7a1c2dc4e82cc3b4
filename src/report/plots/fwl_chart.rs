//! The FWL agreement chart of a compartment: per well, the free water level
//! its logs imply with its range, against the compartment's FWL and its
//! standard error. Wells flagged as possibly under another FWL stand out by
//! shape (a diamond, not a circle), colour and a marked label.

use crate::report::plots::section::{L, R, fwl_band, fwl_legend, implied_fwl, tvdss_axis};
use crate::report::plots::{CompartmentWells, FieldWell};
use crate::report::svg::{Anchor, Scale, Stroke, Svg, num, palette};

const W: f64 = 1360.0;
const H: f64 = 470.0;
const T: f64 = 130.0;
const B: f64 = 420.0;
const LEG_X: f64 = 1168.0;
/// Widest slot per well, px.
const MAX_SLOT: f64 = 60.0;
/// Narrowest slot at which every well is labelled, px.
const LABEL_EVERY_SLOT: f64 = 9.0;

/// The TVDSS span of the chart: the FWL band and every closed range end and
/// best fit, padded.
fn span(c: &CompartmentWells<'_>) -> (f64, f64) {
    let sd = c.fwl_sigma.unwrap_or(0.0);
    let mut lo = c.fwl - sd.max(1.0);
    let mut hi = c.fwl + sd.max(1.0);
    for m in c.wells.iter().filter_map(|w| w.implied) {
        for v in [m.best, m.lower, m.upper].into_iter().flatten() {
            if v.is_finite() {
                lo = lo.min(v);
                hi = hi.max(v);
            }
        }
    }
    let pad = 0.08 * (hi - lo).max(2.0);
    (lo - pad, hi + pad)
}

/// The agreement chart of a compartment, as an SVG document.
pub fn fwl_agreement(c: &CompartmentWells<'_>, depth_unit: &str) -> String {
    let mut s = Svg::new(W, H);
    s.group("fwl-agreement", None);
    let flagged: Vec<&str> = c
        .wells
        .iter()
        .filter(|w| w.flagged)
        .map(|w| w.name)
        .collect();
    s.group("title", None);
    s.text(
        L,
        20.0,
        &format!("Compartment {}: the FWL each well's logs imply", c.name),
        15.0,
        Anchor::Start,
    );
    let fwl = match c.fwl_sigma {
        Some(sd) => format!(
            "compartment FWL {} ± {} {depth_unit} TVDSS ({})",
            num(c.fwl),
            num(sd),
            c.fwl_source
        ),
        None => format!(
            "compartment FWL {} {depth_unit} TVDSS ({})",
            num(c.fwl),
            c.fwl_source
        ),
    };
    s.text_styled(L, 36.0, &fwl, 10.0, Anchor::Start, palette::FRAME, 0.0);
    let verdict = if flagged.is_empty() {
        "no well flagged".to_string()
    } else {
        format!(
            "{} flagged, possibly under another FWL: {}",
            flagged.len(),
            flagged.join(", ")
        )
    };
    s.text_styled(
        L,
        50.0,
        &verdict,
        10.0,
        Anchor::Start,
        if flagged.is_empty() {
            palette::FRAME
        } else {
            palette::VERMILLION
        },
        0.0,
    );
    s.end_group();

    let (lo, hi) = span(c);
    let depth = Scale::linear(lo, hi, T, B);
    tvdss_axis(&mut s, &depth, T, B, 6, depth_unit);
    s.rect(
        L,
        T,
        R - L,
        B - T,
        "none",
        Some(Stroke::solid(palette::FRAME, 0.8)),
    );
    fwl_band(&mut s, c, &depth, T, B);

    let n = c.wells.len().max(1);
    let slot = ((R - L) / n as f64).min(MAX_SLOT);
    let every = if slot >= LABEL_EVERY_SLOT {
        1
    } else {
        (LABEL_EVERY_SLOT / slot).ceil() as usize
    };
    for (i, w) in c.wells.iter().enumerate() {
        let x = L + slot * (i as f64 + 0.5);
        well(&mut s, w, x, &depth, depth_unit);
        if w.flagged || i % every == 0 {
            let (colour, label) = if w.flagged {
                (palette::VERMILLION, format!("{} ◆", w.name))
            } else {
                ("#000000", w.name.to_string())
            };
            s.text_styled(
                x + 3.0,
                T - 6.0,
                &label,
                if slot < 14.0 { 8.0 } else { 10.0 },
                Anchor::Start,
                colour,
                -55.0,
            );
        }
    }
    if every > 1 {
        s.text_styled(
            L,
            B + 22.0,
            &format!("one well in {every} named; flagged wells always"),
            9.0,
            Anchor::Start,
            palette::FRAME,
            0.0,
        );
    }
    legend(&mut s);
    s.end_group();
    s.finish()
}

fn well(s: &mut Svg, w: &FieldWell<'_>, x: f64, depth: &Scale, depth_unit: &str) {
    if w.implied.is_none() {
        s.group(
            "no-estimate",
            Some(&format!("{}: the logs do not give an FWL", w.name)),
        );
        s.text_styled(x, B - 4.0, "–", 10.0, Anchor::Middle, palette::FRAME, 0.0);
        s.end_group();
        return;
    }
    implied_fwl(s, w, x, depth, T, B, depth_unit, 4.6);
}

fn legend(s: &mut Svg) {
    s.group("legend", None);
    let x0 = LEG_X;
    let mut y = T + 6.0;
    let text = |s: &mut Svg, y: f64, t: &str| s.text(x0 + 20.0, y + 3.5, t, 10.0, Anchor::Start);
    y = fwl_legend(s, x0, y, 4.6);
    s.line(
        x0 + 7.0,
        y - 7.0,
        x0 + 7.0,
        y + 7.0,
        Stroke::dashed(palette::BLACK, 1.4, "1 2"),
    );
    text(s, y, "open range (bound only)");
    y += 20.0;
    s.text_styled(
        x0 + 3.0,
        y + 3.5,
        "–",
        10.0,
        Anchor::Start,
        palette::FRAME,
        0.0,
    );
    text(s, y, "no estimate from logs");
    y += 26.0;
    super::palette_note(s, x0, y);
    s.end_group();
}
