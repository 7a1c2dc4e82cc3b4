//! A small SVG writer for the plots: shapes, text, groups and axis scales.
//!
//! Text is left to the viewer's fonts (`font-family` generic `sans-serif`),
//! so no font file is needed to draw; numbers are written with at most two
//! decimals (a hundredth of a pixel), NaN coordinates break a curve rather
//! than draw to zero, and every text or attribute value is XML-escaped.

use std::fmt::Write as _;

/// The colour-blind-safe palette of Okabe and Ito (2008, "Color Universal
/// Design", J*FLY; from memory), in its usual order after black.
pub mod palette {
    pub const BLACK: &str = "#000000";
    pub const ORANGE: &str = "#E69F00";
    pub const SKY_BLUE: &str = "#56B4E9";
    pub const BLUISH_GREEN: &str = "#009E73";
    pub const YELLOW: &str = "#F0E442";
    pub const BLUE: &str = "#0072B2";
    pub const VERMILLION: &str = "#D55E00";
    pub const REDDISH_PURPLE: &str = "#CC79A7";
    /// Neutral greys for grids, frames and shading (not data colours).
    pub const GRID: &str = "#D0D0D0";
    pub const FRAME: &str = "#404040";
    pub const SHADE: &str = "#BDBDBD";

    /// Class colours, poorest rock first: warm for poor, cool for good.
    pub const CLASSES: [&str; 8] = [
        VERMILLION,
        ORANGE,
        YELLOW,
        SKY_BLUE,
        BLUISH_GREEN,
        BLUE,
        REDDISH_PURPLE,
        BLACK,
    ];

    /// The colour of hydraulic class `c` (1-based; classes beyond 8 cycle).
    pub fn class(c: u8) -> &'static str {
        CLASSES[(usize::from(c.max(1)) - 1) % CLASSES.len()]
    }
}

/// A relative file path as a link target: every byte but letters, digits
/// and `- _ . ~ /` percent-encoded (RFC 3986 §2; a well's file name may hold
/// spaces, `#` or `%`), then XML-escaped for the attribute.
pub fn href(path: &str) -> String {
    const KEEP: &percent_encoding::AsciiSet = &percent_encoding::NON_ALPHANUMERIC
        .remove(b'-')
        .remove(b'_')
        .remove(b'.')
        .remove(b'~')
        .remove(b'/');
    escape(&percent_encoding::utf8_percent_encode(path, KEEP).to_string())
}

/// XML-escape text for an element body or an attribute value.
pub fn escape(text: &str) -> String {
    let mut s = String::with_capacity(text.len());
    for ch in text.chars() {
        match ch {
            '&' => s.push_str("&amp;"),
            '<' => s.push_str("&lt;"),
            '>' => s.push_str("&gt;"),
            '"' => s.push_str("&quot;"),
            '\'' => s.push_str("&#39;"),
            // characters XML 1.0 does not allow
            c if (c as u32) < 0x20 && !matches!(c, '\t' | '\n' | '\r') => s.push(' '),
            c => s.push(c),
        }
    }
    s
}

/// A coordinate as text: two decimals at most, no trailing zeros, no `-0`.
pub fn num(v: f64) -> String {
    let mut s = String::with_capacity(12);
    push_num(&mut s, v);
    s
}

/// [`num`] appended to `out`, with no allocation (curves have thousands of
/// vertices). Hundredths are rounded half away from zero; values beyond
/// ±9e16 px (never a real coordinate) are held there.
pub fn push_num(out: &mut String, v: f64) {
    let v = if v.is_finite() { v } else { 0.0 };
    let c = (v * 100.0).round().clamp(-9e18, 9e18) as i64;
    if c < 0 {
        out.push('-');
    }
    let a = c.unsigned_abs();
    let mut ints = itoa::Buffer::new();
    out.push_str(ints.format(a / 100));
    let frac = a % 100;
    if frac != 0 {
        out.push('.');
        out.push(char::from(b'0' + (frac / 10) as u8));
        if frac % 10 != 0 {
            out.push(char::from(b'0' + (frac % 10) as u8));
        }
    }
}

/// Text anchoring.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Anchor {
    Start,
    Middle,
    End,
}

impl Anchor {
    fn name(self) -> &'static str {
        match self {
            Anchor::Start => "start",
            Anchor::Middle => "middle",
            Anchor::End => "end",
        }
    }
}

/// Stroke of a line or curve.
#[derive(Debug, Clone, Copy)]
pub struct Stroke<'a> {
    pub colour: &'a str,
    pub width: f64,
    /// SVG dash array, e.g. "4 3"; `None` for solid.
    pub dash: Option<&'a str>,
    pub opacity: f64,
}

impl<'a> Stroke<'a> {
    pub const fn solid(colour: &'a str, width: f64) -> Stroke<'a> {
        Stroke {
            colour,
            width,
            dash: None,
            opacity: 1.0,
        }
    }

    pub const fn dashed(colour: &'a str, width: f64, dash: &'a str) -> Stroke<'a> {
        Stroke {
            colour,
            width,
            dash: Some(dash),
            opacity: 1.0,
        }
    }

    pub const fn faint(mut self, opacity: f64) -> Stroke<'a> {
        self.opacity = opacity;
        self
    }

    fn attrs(&self) -> String {
        let mut a = format!(
            " stroke=\"{}\" stroke-width=\"{}\"",
            escape(self.colour),
            num(self.width)
        );
        if let Some(d) = self.dash {
            let _ = write!(a, " stroke-dasharray=\"{}\"", escape(d));
        }
        if self.opacity < 1.0 {
            let _ = write!(a, " stroke-opacity=\"{}\"", num(self.opacity));
        }
        a
    }
}

/// The shape of a point marker: the second cue beside colour.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Shape {
    Circle,
    Square,
    Diamond,
    TriangleUp,
    TriangleDown,
}

/// An SVG document being drawn.
#[derive(Debug, Clone)]
pub struct Svg {
    body: String,
    width: f64,
    height: f64,
    open_groups: usize,
}

impl Svg {
    /// A drawing `width` × `height` pixels with a white background.
    pub fn new(width: f64, height: f64) -> Svg {
        let mut s = Svg {
            body: String::with_capacity(16 << 10),
            width,
            height,
            open_groups: 0,
        };
        s.rect(0.0, 0.0, width, height, "#FFFFFF", None);
        s
    }

    pub fn width(&self) -> f64 {
        self.width
    }

    /// A filled rectangle, optionally outlined.
    pub fn rect(&mut self, x: f64, y: f64, w: f64, h: f64, fill: &str, stroke: Option<Stroke>) {
        let (x, w) = if w < 0.0 { (x + w, -w) } else { (x, w) };
        let (y, h) = if h < 0.0 { (y + h, -h) } else { (y, h) };
        let _ = write!(
            self.body,
            "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\"{}/>",
            num(x),
            num(y),
            num(w),
            num(h),
            escape(fill),
            stroke.map_or_else(String::new, |s| s.attrs())
        );
    }

    /// A filled rectangle at `opacity`.
    pub fn rect_faint(&mut self, x: f64, y: f64, w: f64, h: f64, fill: &str, opacity: f64) {
        let _ = write!(
            self.body,
            "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"{}\" fill-opacity=\"{}\"/>",
            num(x),
            num(y.min(y + h)),
            num(w.abs()),
            num(h.abs()),
            escape(fill),
            num(opacity)
        );
    }

    pub fn line(&mut self, x1: f64, y1: f64, x2: f64, y2: f64, stroke: Stroke) {
        let _ = write!(
            self.body,
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\"{}/>",
            num(x1),
            num(y1),
            num(x2),
            num(y2),
            stroke.attrs()
        );
    }

    /// A curve through `points`; a point with a non-finite coordinate ends
    /// one piece and the next finite point starts another. Returns the
    /// number of pieces drawn.
    pub fn polyline(&mut self, points: &[(f64, f64)], stroke: Stroke) -> usize {
        let mut pieces = 0;
        let mut run: Vec<(f64, f64)> = Vec::new();
        let attrs = stroke.attrs();
        let mut flush = |run: &mut Vec<(f64, f64)>, body: &mut String| {
            if run.len() >= 2 {
                body.push_str("<polyline fill=\"none\"");
                body.push_str(&attrs);
                body.push_str(" points=\"");
                for (i, (x, y)) in run.iter().enumerate() {
                    if i > 0 {
                        body.push(' ');
                    }
                    push_num(body, *x);
                    body.push(',');
                    push_num(body, *y);
                }
                body.push_str("\"/>");
                pieces += 1;
            }
            run.clear();
        };
        for &(x, y) in points {
            if x.is_finite() && y.is_finite() {
                run.push((x, y));
            } else {
                flush(&mut run, &mut self.body);
            }
        }
        flush(&mut run, &mut self.body);
        pieces
    }

    pub fn circle(&mut self, cx: f64, cy: f64, r: f64, fill: &str, stroke: Option<Stroke>) {
        if !cx.is_finite() || !cy.is_finite() {
            return;
        }
        let _ = write!(
            self.body,
            "<circle cx=\"{}\" cy=\"{}\" r=\"{}\" fill=\"{}\"{}/>",
            num(cx),
            num(cy),
            num(r),
            escape(fill),
            stroke.map_or_else(String::new, |s| s.attrs())
        );
    }

    /// A marker of `shape` centred on (cx, cy), `r` px from centre to its
    /// corners (a circle's radius); nothing for a non-finite centre.
    pub fn marker(
        &mut self,
        shape: Shape,
        cx: f64,
        cy: f64,
        r: f64,
        fill: &str,
        stroke: Option<Stroke>,
    ) {
        if !cx.is_finite() || !cy.is_finite() {
            return;
        }
        let corners: &[(f64, f64)] = match shape {
            Shape::Circle => return self.circle(cx, cy, r, fill, stroke),
            Shape::Square => &[(-0.8, -0.8), (0.8, -0.8), (0.8, 0.8), (-0.8, 0.8)],
            Shape::Diamond => &[(0.0, -1.0), (1.0, 0.0), (0.0, 1.0), (-1.0, 0.0)],
            Shape::TriangleUp => &[(0.0, -1.0), (0.95, 0.7), (-0.95, 0.7)],
            Shape::TriangleDown => &[(0.0, 1.0), (0.95, -0.7), (-0.95, -0.7)],
        };
        self.body.push_str("<polygon points=\"");
        for (i, (dx, dy)) in corners.iter().enumerate() {
            if i > 0 {
                self.body.push(' ');
            }
            push_num(&mut self.body, cx + dx * r);
            self.body.push(',');
            push_num(&mut self.body, cy + dy * r);
        }
        let _ = write!(
            self.body,
            "\" fill=\"{}\"{}/>",
            escape(fill),
            stroke.map_or_else(String::new, |s| s.attrs())
        );
    }

    /// Text at (x, y) (baseline), `size` px.
    pub fn text(&mut self, x: f64, y: f64, text: &str, size: f64, anchor: Anchor) {
        self.text_styled(x, y, text, size, anchor, "#000000", 0.0);
    }

    /// Text in `colour`, rotated by `rotate` degrees about (x, y).
    #[allow(clippy::too_many_arguments)]
    pub fn text_styled(
        &mut self,
        x: f64,
        y: f64,
        text: &str,
        size: f64,
        anchor: Anchor,
        colour: &str,
        rotate: f64,
    ) {
        let rot = if rotate == 0.0 {
            String::new()
        } else {
            format!(
                " transform=\"rotate({} {} {})\"",
                num(rotate),
                num(x),
                num(y)
            )
        };
        let _ = write!(
            self.body,
            "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"{}\" fill=\"{}\"{rot}>{}</text>",
            num(x),
            num(y),
            num(size),
            anchor.name(),
            escape(colour),
            escape(text)
        );
    }

    /// A `<title>` tooltip for the element group that follows, as a group.
    pub fn group(&mut self, class: &str, title: Option<&str>) {
        let _ = write!(self.body, "<g class=\"{}\">", escape(class));
        if let Some(t) = title {
            let _ = write!(self.body, "<title>{}</title>", escape(t));
        }
        self.open_groups += 1;
    }

    pub fn end_group(&mut self) {
        if self.open_groups > 0 {
            self.body.push_str("</g>");
            self.open_groups -= 1;
        }
    }

    /// The document, groups closed.
    pub fn finish(mut self) -> String {
        while self.open_groups > 0 {
            self.end_group();
        }
        format!(
            "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" viewBox=\"0 0 {w} {h}\" font-family=\"sans-serif\">{}</svg>\n",
            self.body,
            w = num(self.width),
            h = num(self.height),
        )
    }
}

/// A map from data values to pixels along one axis.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Scale {
    /// `lo` maps to `p0`, `hi` to `p1` (p1 < p0 for a reversed axis).
    Linear { lo: f64, hi: f64, p0: f64, p1: f64 },
    /// Logarithmic (base 10); `lo` and `hi` must be positive.
    Log { lo: f64, hi: f64, p0: f64, p1: f64 },
}

impl Scale {
    pub fn linear(lo: f64, hi: f64, p0: f64, p1: f64) -> Scale {
        Scale::Linear { lo, hi, p0, p1 }
    }

    /// A log scale; a non-positive end falls back to a decade below the other.
    pub fn log(lo: f64, hi: f64, p0: f64, p1: f64) -> Scale {
        let hi = if hi > 0.0 { hi } else { 1.0 };
        let lo = if lo > 0.0 && lo < hi { lo } else { hi / 10.0 };
        Scale::Log { lo, hi, p0, p1 }
    }

    /// The pixel of `v` (NaN for NaN, or for a non-positive value on a log scale).
    pub fn px(&self, v: f64) -> f64 {
        match *self {
            Scale::Linear { lo, hi, p0, p1 } => {
                if hi == lo {
                    return (p0 + p1) / 2.0;
                }
                p0 + (v - lo) / (hi - lo) * (p1 - p0)
            }
            Scale::Log { lo, hi, p0, p1 } => {
                if v <= 0.0 || !v.is_finite() {
                    return f64::NAN;
                }
                let (a, b) = (lo.log10(), hi.log10());
                p0 + (v.log10() - a) / (b - a) * (p1 - p0)
            }
        }
    }

    /// `px` held to the axis ends (for curves that run off a track).
    pub fn px_clamped(&self, v: f64) -> f64 {
        let (p0, p1) = match *self {
            Scale::Linear { p0, p1, .. } | Scale::Log { p0, p1, .. } => (p0, p1),
        };
        let p = self.px(v);
        if p.is_nan() {
            return p;
        }
        p.clamp(p0.min(p1), p0.max(p1))
    }

    /// Tick values: about `n` round linear steps, or the decades of a log axis.
    pub fn ticks(&self, n: usize) -> Vec<f64> {
        match *self {
            Scale::Linear { lo, hi, .. } => nice_ticks(lo.min(hi), lo.max(hi), n),
            Scale::Log { lo, hi, .. } => {
                let (a, b) = (
                    lo.min(hi).log10().ceil() as i32,
                    lo.max(hi).log10().floor() as i32,
                );
                (a..=b).map(|e| 10f64.powi(e)).collect()
            }
        }
    }
}

/// Round tick values (steps of 1, 2 or 5 × 10^k) covering [lo, hi].
pub fn nice_ticks(lo: f64, hi: f64, n: usize) -> Vec<f64> {
    if !lo.is_finite() || !hi.is_finite() || hi <= lo || n == 0 {
        return Vec::new();
    }
    let raw = (hi - lo) / n as f64;
    let exp = raw.log10().floor() as i32;
    let mag = 10f64.powi(exp);
    let m = [1.0, 2.0, 5.0, 10.0]
        .into_iter()
        .find(|m| m * mag >= raw)
        .unwrap_or(10.0);
    // tick k is k·m·10^exp, computed as (k·m) / 10^-exp for small steps so
    // that 3 × 0.2 gives 0.6, not 0.6000000000000001
    let value = |k: f64| {
        if exp < 0 {
            k * m / 10f64.powi(-exp)
        } else {
            k * m * mag
        }
    };
    let step = m * mag;
    let first = (lo / step - 1e-9).ceil();
    let last = (hi / step + 1e-9).floor();
    if last - first > (4 * n + 2) as f64 {
        return Vec::new();
    }
    let mut v = Vec::new();
    let mut k = first;
    while k <= last {
        let t = value(k);
        v.push(if t == 0.0 { 0.0 } else { t });
        k += 1.0;
    }
    v
}

/// A tick label: no float noise, no needless decimals.
pub fn tick_label(v: f64) -> String {
    if v == 0.0 {
        return "0".into();
    }
    let a = v.abs();
    let decimals = if a >= 100.0 {
        0
    } else if a >= 1.0 {
        1
    } else {
        ((-a.log10()).floor() as usize + 2).min(6)
    };
    trim_number(v, decimals)
}

/// `v` with at most `decimals` decimals and no trailing zeros ("-0" is "0").
pub fn trim_number(v: f64, decimals: usize) -> String {
    let mut s = format!("{v:.decimals$}");
    if s.contains('.') {
        while s.ends_with('0') {
            s.pop();
        }
        if s.ends_with('.') {
            s.pop();
        }
    }
    if s == "-0" { "0".into() } else { s }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Link targets are percent-encoded (RFC 3986 §2.1: `%` and two hex
    /// digits of each UTF-8 byte).
    #[test]
    fn hrefs_are_percent_encoded() {
        assert_eq!(href("wells/TB-01.html"), "wells/TB-01.html");
        assert_eq!(
            href("wells/Tarnby 3 #2.html"),
            "wells/Tarnby%203%20%232.html"
        );
        assert_eq!(href("wells/Brønn.html"), "wells/Br%C3%B8nn.html");
        assert_eq!(href("a%b&c"), "a%25b%26c");
    }

    #[test]
    fn escaping_and_numbers() {
        assert_eq!(trim_number(2.0, 2), "2");
        assert_eq!(trim_number(0.05, 4), "0.05");
        assert_eq!(trim_number(-0.0001, 2), "0");
        assert_eq!(tick_label(-1e-7), "0");
        assert_eq!(
            escape("a<b & \"c\" 'd'>"),
            "a&lt;b &amp; &quot;c&quot; &#39;d&#39;&gt;"
        );
        assert_eq!(escape("x\u{1}y"), "x y");
        assert_eq!(num(1.0), "1");
        assert_eq!(num(1.256), "1.26");
        assert_eq!(num(-0.001), "0");
        assert_eq!(num(f64::NAN), "0");
        assert_eq!(num(-12.5), "-12.5");
    }

    #[test]
    fn scales_map_ends_and_middles() {
        let s = Scale::linear(0.0, 150.0, 10.0, 110.0);
        assert_eq!((s.px(0.0), s.px(75.0), s.px(150.0)), (10.0, 60.0, 110.0));
        assert_eq!(s.px_clamped(300.0), 110.0);
        // reversed: neutron porosity 0.45 on the left, -0.15 on the right
        let n = Scale::linear(0.45, -0.15, 0.0, 60.0);
        assert!((n.px(0.15) - 30.0).abs() < 1e-9);
        // log: decades equally spaced; non-positive values are not drawn
        let l = Scale::log(0.2, 2000.0, 0.0, 400.0);
        assert!((l.px(2.0) - 100.0).abs() < 1e-9);
        assert!((l.px(200.0) - 300.0).abs() < 1e-9);
        assert!(l.px(0.0).is_nan() && l.px(-1.0).is_nan());
        assert_eq!(l.ticks(5), vec![1.0, 10.0, 100.0, 1000.0]);
    }

    #[test]
    fn ticks_are_round_and_labels_clean() {
        assert_eq!(nice_ticks(0.0, 150.0, 5), vec![0.0, 50.0, 100.0, 150.0]);
        assert_eq!(nice_ticks(0.0, 1.0, 5), vec![0.0, 0.2, 0.4, 0.6, 0.8, 1.0]);
        let t = nice_ticks(1.95, 2.95, 5);
        assert_eq!(t.first().copied(), Some(2.0));
        assert_eq!(tick_label(0.30000000000000004), "0.3");
        assert_eq!(tick_label(2000.0), "2000");
        assert_eq!(tick_label(0.02), "0.02");
        assert_eq!(tick_label(-0.15), "-0.15");
    }

    #[test]
    fn curves_break_at_gaps_and_documents_close() {
        let mut s = Svg::new(100.0, 50.0);
        let pts = [
            (0.0, 0.0),
            (1.0, 1.0),
            (f64::NAN, 2.0),
            (3.0, 3.0),
            (4.0, 4.0),
            (5.0, f64::NAN),
            (6.0, 6.0),
        ];
        assert_eq!(s.polyline(&pts, Stroke::solid("#000", 1.0)), 2);
        s.group("track", Some("a <title>"));
        s.text(1.0, 2.0, "GR & VSH", 10.0, Anchor::Middle);
        let doc = s.finish();
        assert!(doc.starts_with("<svg xmlns=\"http://www.w3.org/2000/svg\""));
        assert_eq!(doc.matches("<polyline").count(), 2);
        assert_eq!(doc.matches("<g ").count(), doc.matches("</g>").count());
        assert!(doc.contains("GR &amp; VSH") && doc.contains("a &lt;title&gt;"));
    }
}
