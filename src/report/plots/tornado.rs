//! The tornado chart of the Monte Carlo: per zone, what drives its
//! hydrocarbon pore thickness summed over the wells, as each input's Spearman
//! rank correlation with it, strongest on top. A bar to the right (blue)
//! raises HPT, to the left (vermillion) lowers it: side and colour both say it.

use crate::report::svg::{Anchor, Scale, Stroke, Svg, palette};
use crate::uncertainty::Driver;

const W: f64 = 900.0;
/// Left edge of the bars' area (the parameter names are left of it).
const L: f64 = 330.0;
const R: f64 = 760.0;
const BAR_H: f64 = 14.0;
const ROW_H: f64 = 18.0;
/// Inputs shown per zone (the CSV has every one).
pub const TOP: usize = 10;

/// The tornado chart of every zone's drivers (`drivers` as ranked by
/// [`crate::uncertainty::drivers`], of one quantity), as an SVG document.
/// `what` names the quantity in the title (`hydrocarbon pore thickness`),
/// `short` on the axis (`HPT`). A grey band marks the correlations within
/// chance of none over `realisations`: |ρ| < 1.96/√(n − 1), Spearman's ρ
/// having variance 1/(n − 1) between independent samples (Kendall & Stuart,
/// from memory).
pub fn tornado(drivers: &[&Driver], what: &str, short_name: &str, realisations: usize) -> String {
    let band = noise_band(realisations);
    let mut zones: Vec<&str> = Vec::new();
    for d in drivers {
        if !zones.contains(&d.zone.as_str()) {
            zones.push(&d.zone);
        }
    }
    let rows: usize = zones
        .iter()
        .map(|z| drivers.iter().filter(|d| d.zone == *z).count().min(TOP) + 2)
        .sum();
    let height = 70.0 + ROW_H * rows as f64 + 56.0;
    let mut s = Svg::new(W, height);
    s.group("tornado", None);
    s.text(
        20.0,
        20.0,
        &format!("What drives each zone's {what}"),
        15.0,
        Anchor::Start,
    );
    s.text_styled(
        20.0,
        36.0,
        &format!("Spearman rank correlation of each input with the zone's {short_name} summed over the wells, across the realisations"),
        10.0,
        Anchor::Start,
        palette::FRAME,
        0.0,
    );
    let xs = Scale::linear(-1.0, 1.0, L, R);
    let mut y = 62.0;
    for zone in &zones {
        s.group("tornado-zone", Some(zone));
        s.text(20.0, y + 4.0, zone, 12.0, Anchor::Start);
        y += ROW_H;
        let mine: Vec<&Driver> = drivers
            .iter()
            .copied()
            .filter(|d| d.zone == *zone)
            .take(TOP)
            .collect();
        let top = y - 4.0;
        if band > 0.0 && !mine.is_empty() {
            s.rect_faint(
                xs.px(-band),
                y - ROW_H / 2.0,
                xs.px(band) - xs.px(-band),
                ROW_H * mine.len() as f64,
                palette::SHADE,
                0.5,
            );
        }
        for d in &mine {
            let rho = d.rank_correlation;
            let colour = if rho >= 0.0 {
                palette::BLUE
            } else {
                palette::VERMILLION
            };
            s.group(
                "driver",
                Some(&format!("{}: rank correlation {:+.2}", d.parameter, rho)),
            );
            s.text_styled(
                L - 8.0,
                y + 4.0,
                short(&d.parameter),
                10.0,
                Anchor::End,
                "#000000",
                0.0,
            );
            let (x0, x1) = (xs.px(0.0), xs.px(rho.clamp(-1.0, 1.0)));
            s.rect(
                x0.min(x1),
                y - BAR_H / 2.0,
                (x1 - x0).abs(),
                BAR_H,
                colour,
                None,
            );
            s.text_styled(
                if rho >= 0.0 { x1 + 4.0 } else { x1 - 4.0 },
                y + 4.0,
                &format!("{rho:+.2}"),
                9.0,
                if rho >= 0.0 {
                    Anchor::Start
                } else {
                    Anchor::End
                },
                palette::FRAME,
                0.0,
            );
            s.end_group();
            y += ROW_H;
        }
        s.line(
            xs.px(0.0),
            top,
            xs.px(0.0),
            y - ROW_H + BAR_H / 2.0 + 2.0,
            Stroke::solid(palette::FRAME, 1.0),
        );
        s.end_group();
        y += ROW_H;
    }
    s.group("axis", None);
    for t in [-1.0, -0.5, 0.0, 0.5, 1.0] {
        let x = xs.px(t);
        s.line(x, y - 10.0, x, y - 4.0, Stroke::solid(palette::FRAME, 1.0));
        s.text(x, y + 8.0, &format!("{t:+.1}"), 9.0, Anchor::Middle);
    }
    s.text(
        (L + R) / 2.0,
        y + 24.0,
        &format!("lowers {short_name} ← rank correlation → raises {short_name}"),
        10.0,
        Anchor::Middle,
    );
    if band > 0.0 {
        s.text(
            (L + R) / 2.0,
            y + 40.0,
            &format!(
                "grey band: |ρ| < {band:.2}, within chance of no relation over {realisations} realisations"
            ),
            9.0,
            Anchor::Middle,
        );
    }
    super::palette_note(&mut s, R + 10.0, 62.0);
    s.end_group();
    s.end_group();
    s.finish()
}

/// Half-width of the band of rank correlations within chance of none over
/// `n` realisations (two-sided 95 %): 1.96/√(n − 1); 0 below 3.
pub fn noise_band(n: usize) -> f64 {
    if n < 3 {
        0.0
    } else {
        1.96 / ((n - 1) as f64).sqrt()
    }
}

/// A parameter's full key name without the `parameters.` prefix.
fn short(name: &str) -> &str {
    name.strip_prefix("parameters.").unwrap_or(name)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn d(zone: &str, p: &str, r: f64) -> Driver {
        Driver {
            zone: zone.into(),
            parameter: p.into(),
            rank_correlation: r,
            quantity: "HPT".into(),
        }
    }

    #[test]
    fn bars_fall_on_the_side_of_their_sign_and_only_the_top_are_drawn() {
        let mut drivers = vec![
            d("A", "parameters.field.rw-ohmm", -0.6),
            d("A", "parameters.field.gr-clean-gapi", 0.4),
        ];
        drivers.extend((0..12).map(|i| {
            d(
                "B",
                &format!("parameters.field.k{i}"),
                0.5 - 0.01 * f64::from(i),
            )
        }));
        let refs: Vec<&Driver> = drivers.iter().collect();
        let svg = tornado(&refs, "hydrocarbon pore thickness", "HPT", 200);
        assert_eq!(svg.matches("<g class=\"tornado-zone\">").count(), 2);
        assert_eq!(svg.matches("<g class=\"driver\">").count(), 2 + TOP);
        assert!(svg.contains("<title>parameters.field.rw-ohmm: rank correlation -0.60</title>"));
        // the bar of −0.6 ends left of the zero line at x = 545 (the middle
        // of 330..760), the bar of +0.4 starts on it
        let zero = (L + R) / 2.0;
        let left = zero - 0.6 * (R - L) / 2.0;
        assert!(
            svg.contains(&format!("<rect x=\"{}\"", crate::report::svg::num(left))),
            "{svg}"
        );
        assert!(svg.contains(&format!("<rect x=\"{}\"", crate::report::svg::num(zero))));
        assert!(!svg.contains(">field.k11<"), "beyond the top {TOP}");
        // the chance band: 1.96/√199 = 0.1389 either side of zero, one per zone
        assert!((noise_band(200) - 0.138_94).abs() < 1e-5);
        let band_left = zero - noise_band(200) * (R - L) / 2.0;
        assert_eq!(
            svg.matches(&format!(
                "<rect x=\"{}\"",
                crate::report::svg::num(band_left)
            ))
            .count(),
            2
        );
        assert!(svg.contains("within chance of no relation over 200 realisations"));
    }

    /// Spearman's ρ between independent samples has variance 1/(n − 1)
    /// (Kendall & Stuart, from memory): over 2000 pairs of independent
    /// shuffles of 200, about 5 % fall outside the band.
    #[test]
    fn about_one_in_twenty_independent_correlations_fall_outside_the_band() {
        use rand::SeedableRng;
        use rand::seq::SliceRandom;
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(3);
        let n = 200;
        let x: Vec<f64> = (0..n).map(f64::from).collect();
        let mut outside = 0;
        for _ in 0..2000 {
            let mut y = x.clone();
            y.shuffle(&mut rng);
            if crate::stats::rank_correlation(&x, &y).abs() >= noise_band(200) {
                outside += 1;
            }
        }
        // binomial(2000, 0.05): mean 100, sd 9.7
        assert!((70..=130).contains(&outside), "{outside}");
    }
}
