//! A well's surface location from its LAS ~W header items, and one map frame
//! for a field's wells (the base map of the HTML report).
//!
//! Item names: the CWLS LAS 3.0 specification (2000) lists X, Y, LATI, LONG,
//! GDAT (geodetic datum) and HZCS (horizontal coordinate system) among the
//! ~Well items (from memory); the other spellings are ones LAS 2.0 files use.
//! Headers often write 0 (or the NULL value) for an unknown location, so those
//! are read as "not given" and reported, never placed on the map.

use crate::input::las::header::HeaderItem;
use crate::units::DepthUnit;

const X_NAMES: &[&str] = &["X", "XCOORD", "X_COORD", "EASTING"];
const Y_NAMES: &[&str] = &["Y", "YCOORD", "Y_COORD", "NORTHING"];
const LAT_NAMES: &[&str] = &["LATI", "LAT", "LATITUDE"];
const LON_NAMES: &[&str] = &["LONG", "LON", "LONGITUDE"];

/// Mean Earth radius R1 = (2a + b)/3 of GRS 80, metres (Moritz 2000,
/// "Geodetic Reference System 1980", from memory).
const EARTH_RADIUS_M: f64 = 6_371_008.8;
/// GRS 80 semi-major axis (m) and flattening (Moritz 2000, from memory).
const GRS80_A: f64 = 6_378_137.0;
const GRS80_F: f64 = 1.0 / 298.257_222_101;

/// A well's surface location as its LAS ~W header gives it.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize, serde::Deserialize)]
pub struct HeaderLocation {
    /// Projected X (easting) and Y (northing) in metres, when both are numeric and not both 0.
    pub xy_m: Option<(f64, f64)>,
    /// The unit X/Y were read in, e.g. "M", "FT", or "none given (taken as metres)".
    pub xy_unit: Option<String>,
    /// Latitude and longitude, decimal degrees, north and east positive.
    pub lat_lon: Option<(f64, f64)>,
    /// GDAT (geodetic datum), when given and not blank.
    pub datum: Option<String>,
    /// HZCS (horizontal coordinate system), when given and not blank.
    pub crs: Option<String>,
    /// Items present but not usable, each with its line: e.g. "line 14: LATI `abc` is not a latitude".
    pub problems: Vec<String>,
}

/// How one item of a pair reads: its partner's name, what it should be, parser, |limit|.
type Kind = (&'static str, &'static str, fn(&str) -> Option<f64>, f64);

/// The first item, in file order, with one of `names` (any case) and a non-blank value.
fn find<'a>(items: &'a [HeaderItem], names: &[&str]) -> Option<&'a HeaderItem> {
    let named = |i: &&HeaderItem| names.iter().any(|n| i.mnemonic.eq_ignore_ascii_case(n));
    items.iter().filter(named).find(|i| !i.value.is_empty())
}

/// A plain finite number (`inf` and `NaN` are not coordinates).
fn parse_number(text: &str) -> Option<f64> {
    text.trim().parse::<f64>().ok().filter(|v| v.is_finite())
}

/// Read the location items of a well's ~W section. Never fails: items that are
/// present but unusable are listed in `problems` with their line.
pub fn from_items(items: &[HeaderItem]) -> HeaderLocation {
    let text = |name| find(items, &[name]).map(|i| i.value.clone());
    let mut loc = HeaderLocation {
        datum: text("GDAT"),
        crs: text("HZCS"),
        ..Default::default()
    };
    // LAS 2.0 (CWLS) requires a NULL item; -999.25 is its customary value.
    let null = find(items, &["NULL"])
        .and_then(|i| parse_number(&i.value))
        .unwrap_or(-999.25);
    let (x, y) = (find(items, X_NAMES), find(items, Y_NAMES));
    let number: [Kind; 2] = [
        ("Y", "a number", parse_number, f64::INFINITY),
        ("X", "a number", parse_number, f64::INFINITY),
    ];
    let xy = read_pair([x, y], number, null, &mut loc.problems);
    let unit = match (xy, x, y) {
        (Some(_), Some(x), Some(y)) => xy_unit(x, y, &mut loc.problems),
        _ => None,
    };
    if let (Some((xv, yv)), Some((factor, unit))) = (xy, unit) {
        loc.xy_m = Some((xv * factor, yv * factor));
        loc.xy_unit = Some(unit);
    }
    let angles: [Kind; 2] = [
        (
            "longitude",
            "a latitude",
            |t| parse_angle(t, 'N', 'S'),
            90.0,
        ),
        (
            "latitude",
            "a longitude",
            |t| parse_angle(t, 'E', 'W'),
            180.0,
        ),
    ];
    let ll = [find(items, LAT_NAMES), find(items, LON_NAMES)];
    loc.lat_lon = read_pair(ll, angles, null, &mut loc.problems);
    loc
}

/// Read two items that only mean something together (X and Y, latitude and longitude).
fn read_pair(
    items: [Option<&HeaderItem>; 2],
    kinds: [Kind; 2],
    null: f64,
    problems: &mut Vec<String>,
) -> Option<(f64, f64)> {
    let mut values = [None, None];
    for (k, &(_, what, parse, limit)) in kinds.iter().enumerate() {
        let Some(it) = items[k] else { continue };
        let at = format!("line {}: {} `{}`", it.line, it.mnemonic, it.value);
        match parse(&it.value) {
            None => problems.push(format!("{at} is not {what}")),
            Some(v) if v == null => {
                problems.push(format!("{at} is the NULL value, taken as not given"))
            }
            Some(v) if v.abs() > limit => {
                problems.push(format!("{at} is outside -{limit}..{limit}"))
            }
            Some(v) => values[k] = Some(v),
        }
    }
    match (items, values) {
        ([Some(a), Some(b)], [Some(0.0), Some(0.0)]) => {
            let (m, n) = (&a.mnemonic, &b.mnemonic);
            let (i, j) = (a.line, b.line);
            problems.push(format!(
                "lines {i} and {j}: {m} and {n} are both 0, taken as not given"
            ));
            None
        }
        (_, [Some(u), Some(v)]) => Some((u, v)),
        ([Some(a), None], [Some(_), None]) | ([None, Some(a)], [None, Some(_)]) => {
            let partner = kinds[usize::from(items[0].is_none())].0;
            let (line, m) = (a.line, &a.mnemonic);
            problems.push(format!(
                "line {line}: {m} is given without a {partner} item; not used"
            ));
            None
        }
        _ => None,
    }
}

/// The factor to metres and the unit's name, when X and Y have one length unit.
fn xy_unit(x: &HeaderItem, y: &HeaderItem, problems: &mut Vec<String>) -> Option<(f64, String)> {
    let unit = |it: &HeaderItem| match it.unit.as_str() {
        "" => Ok(None),
        u => DepthUnit::from_las(u).map(Some).ok_or_else(|| {
            let (line, m) = (it.line, &it.mnemonic);
            format!("line {line}: {m} unit `{u}` is not a length unit; X/Y not used")
        }),
    };
    let problem = match (unit(x), unit(y)) {
        (Ok(None), Ok(None)) => return Some((1.0, "none given (taken as metres)".to_string())),
        (Ok(Some(u)), Ok(Some(v))) if u == v => {
            return Some((u.factor_to(DepthUnit::Metre), u.las_unit().to_string()));
        }
        (Err(e), _) | (_, Err(e)) => e,
        (Ok(_), Ok(_)) => format!(
            "lines {} and {}: {} unit `{}` and {} unit `{}` disagree; X/Y not used",
            x.line, y.line, x.mnemonic, x.unit, y.mnemonic, y.unit
        ),
    };
    problems.push(problem);
    None
}

/// Degrees from decimal ("-102.34567", "32.5 N") or degrees-minutes-seconds text
/// ("32 15 30.5 N", "32°15'30.5\"N", "102 20 44 W", "-32 15 30"); `positive` and
/// `negative` are the hemisphere letters ('N','S' or 'E','W'), before or after the
/// number, any case. None when the text is not an angle: minutes and seconds must
/// be below 60, only the last part may have a fraction, and a minus sign with a
/// hemisphere letter is refused as ambiguous. The range (±90, ±180) is not checked.
pub fn parse_angle(text: &str, positive: char, negative: char) -> Option<f64> {
    let spaced = text.replace(['°', 'º', '\'', '"', '′', '″', ':'], " ");
    let s = spaced.trim();
    let letter_at = |c: Option<char>| c.filter(char::is_ascii_alphabetic);
    let (body, letter) = match (letter_at(s.chars().next()), letter_at(s.chars().last())) {
        (_, Some(c)) => (&s[..s.len() - 1], Some(c.to_ascii_uppercase())),
        (Some(c), None) => (&s[1..], Some(c.to_ascii_uppercase())),
        (None, None) => (s, None),
    };
    let body = body.trim();
    let minus = body.starts_with('-');
    let sign = match letter {
        None if minus => -1.0,
        None => 1.0,
        Some(_) if minus => return None,
        Some(c) if c == positive.to_ascii_uppercase() => 1.0,
        Some(c) if c == negative.to_ascii_uppercase() => -1.0,
        Some(_) => return None,
    };
    let parts: Vec<&str> = body
        .strip_prefix(['-', '+'])
        .unwrap_or(body)
        .split_whitespace()
        .collect();
    if parts.is_empty() || parts.len() > 3 {
        return None;
    }
    let mut total = 0.0;
    for (k, part) in parts.iter().enumerate() {
        let plain = part.bytes().all(|b| b.is_ascii_digit() || b == b'.');
        let v = part.parse::<f64>().ok().filter(|_| plain)?;
        if (k + 1 < parts.len() && v.fract() != 0.0) || (k > 0 && v >= 60.0) {
            return None;
        }
        total += v / 60f64.powi(k as i32);
    }
    Some(sign * total)
}

/// Positions of a field's wells in one frame, metres east and north.
#[derive(Debug, Clone, PartialEq)]
pub struct Frame {
    /// Per well (same order as the input), (east, north) in metres; None when the well is not on the map.
    pub positions: Vec<Option<(f64, f64)>>,
    /// What the frame is, in words, for the map's caption (source items, unit, datum/HZCS, projection and its accuracy); or that no well gives coordinates.
    pub description: String,
    /// Wells left off the map: (index, why).
    pub left_out: Vec<(usize, String)>,
}

/// Put a field's wells in one frame. Projected X/Y when at least one well has
/// them and at least as many wells have X/Y as latitude/longitude (used as
/// given); otherwise latitude/longitude by a local flat (equirectangular)
/// projection about the wells' mean position; otherwise no map. `None` in the
/// input is a well whose header was not read.
pub fn common_frame(locations: &[Option<&HeaderLocation>]) -> Frame {
    let wells = || locations.iter().flatten();
    let n_xy = wells().filter(|l| l.xy_m.is_some()).count();
    let lat_lons: Vec<(f64, f64)> = wells().filter_map(|l| l.lat_lon).collect();
    let use_xy = n_xy >= 1 && n_xy >= lat_lons.len();
    let centre = (!use_xy).then(|| mean_position(&lat_lons)).flatten();
    let mut positions = vec![None; locations.len()];
    let mut left_out = Vec::new();
    for (i, loc) in locations.iter().enumerate() {
        let Some(loc) = loc else {
            left_out.push((i, "not read".to_string()));
            continue;
        };
        let pos = match centre {
            None if use_xy => loc.xy_m,
            None => None,
            Some(c) => loc.lat_lon.map(|p| project(p, c)),
        };
        let why = match (use_xy, loc.xy_m.is_some(), loc.lat_lon.is_some()) {
            (true, _, true) => "only latitude/longitude; the map uses X/Y",
            (true, _, false) => "no X/Y in its header",
            (false, true, _) => "only X/Y; the map uses latitude/longitude",
            _ if centre.is_some() => "no latitude/longitude in its header",
            _ => "no X/Y or latitude/longitude in its header",
        };
        match pos {
            Some(p) => positions[i] = Some(p),
            None => left_out.push((i, why.to_string())),
        }
    }
    let zipped = locations.iter().zip(&positions);
    let on_map: Vec<&HeaderLocation> = zipped.filter_map(|(l, p)| p.and(*l)).collect();
    let field =
        |f: fn(&HeaderLocation) -> Option<&str>| on_map.iter().map(|l| f(l)).collect::<Vec<_>>();
    let datums = field(|l| l.datum.as_deref());
    let description = if use_xy {
        let read_in = match distinct(&field(|l| l.xy_unit.as_deref())).as_slice() {
            [u] if *u == "M" => String::new(),
            list => format!("; X/Y units as read: {}", quoted(list)),
        };
        format!(
            "east and north from the LAS headers' X/Y, metres ({}; {}); used as given, with no reprojection{read_in}",
            agreement("HZCS", &field(|l| l.crs.as_deref())),
            agreement("GDAT", &datums)
        )
    } else if let Some((lat0, lon0)) = centre {
        let scale = |p: &(f64, f64)| lat0.to_radians().cos() / p.0.to_radians().cos();
        let flat = lat_lons
            .iter()
            .map(|p| (scale(p) - 1.0).abs())
            .fold(0.0, f64::max);
        format!(
            "east and north in metres from the LAS headers' LATI/LONG, by a local flat (equirectangular) \
             projection about the wells' mean position {:.5}° {}, {:.5}° {} ({}); scale error {} across \
             this field from the flat projection, plus {} from taking the Earth as a sphere of radius 6 371 008.8 m",
            lat0.abs(),
            if lat0 < 0.0 { 'S' } else { 'N' },
            lon0.abs(),
            if lon0 < 0.0 { 'W' } else { 'E' },
            agreement("GDAT", &datums),
            percent_under(flat),
            percent_under(sphere_error(lat0))
        )
    } else {
        "No well gives coordinates in its LAS header (X/Y or LATI/LONG), so no map is drawn."
            .to_string()
    };
    Frame {
        positions,
        description,
        left_out,
    }
}

/// Mean latitude and longitude; longitudes averaged as offsets from the first
/// well so that a field across the 180° meridian stays together.
fn mean_position(points: &[(f64, f64)]) -> Option<(f64, f64)> {
    let &(_, lon_ref) = points.first()?;
    let n = points.len() as f64;
    let lat0 = points.iter().map(|p| p.0).sum::<f64>() / n;
    let lon0 = lon_ref + points.iter().map(|p| wrap(p.1 - lon_ref)).sum::<f64>() / n;
    Some((lat0, wrap(lon0)))
}

/// Degrees into [-180, 180).
fn wrap(deg: f64) -> f64 {
    (deg + 180.0).rem_euclid(360.0) - 180.0
}

/// east = R·(λ−λ0)·cos φ0, north = R·(φ−φ0), angles in radians.
fn project((lat, lon): (f64, f64), (lat0, lon0): (f64, f64)) -> (f64, f64) {
    let east = EARTH_RADIUS_M * wrap(lon - lon0).to_radians() * lat0.to_radians().cos();
    (east, EARTH_RADIUS_M * (lat - lat0).to_radians())
}

/// Largest relative difference between the mean radius and GRS 80's meridian
/// (M) and prime-vertical (N) radii of curvature at `lat` (standard formulas,
/// from memory): the scale error of using a sphere there.
fn sphere_error(lat: f64) -> f64 {
    let e2 = GRS80_F * (2.0 - GRS80_F);
    let w2 = 1.0 - e2 * lat.to_radians().sin().powi(2);
    let n = GRS80_A / w2.sqrt();
    let m = GRS80_A * (1.0 - e2) / (w2 * w2.sqrt());
    let error = |radius: f64| (EARTH_RADIUS_M / radius - 1.0).abs();
    error(m).max(error(n))
}

/// "under 0.3 %": a fraction rounded up to one significant figure of a percent.
fn percent_under(fraction: f64) -> String {
    if !fraction.is_finite() {
        return "unbounded (a well is at a pole)".to_string();
    }
    let pct = (fraction * 100.0).max(1e-4);
    let power = pct.log10().floor();
    let step = 10f64.powf(power);
    let decimals = (-power).max(0.0) as usize;
    format!("under {:.decimals$} %", ((pct / step).floor() + 1.0) * step)
}

/// Distinct values, first seen first, compared without case.
fn distinct<'a>(values: &[Option<&'a str>]) -> Vec<&'a str> {
    let mut out: Vec<&str> = Vec::new();
    for v in values.iter().flatten() {
        if !out.iter().any(|d| d.eq_ignore_ascii_case(v)) {
            out.push(v);
        }
    }
    out
}

/// "`a`, `b`".
fn quoted(list: &[&str]) -> String {
    let quoted: Vec<String> = list.iter().map(|d| format!("`{d}`")).collect();
    quoted.join(", ")
}

/// "HZCS `UTM 16`", "GDAT not given", or that the headers disagree.
fn agreement(label: &str, values: &[Option<&str>]) -> String {
    let list = distinct(values);
    let missing = values.iter().filter(|v| v.is_none()).count();
    let gap = match missing {
        0 => String::new(),
        1 => " (not given by 1 well)".to_string(),
        n => format!(" (not given by {n} wells)"),
    };
    match list.len() {
        0 => format!("{label} not given"),
        1 => format!("{label} {}{gap}", quoted(&list)),
        _ => format!(
            "headers disagree on {label}: {}{gap}: positions may not share one frame",
            quoted(&list)
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::{Rng, SeedableRng};

    fn item(mnemonic: &str, unit: &str, value: &str, line: usize) -> HeaderItem {
        let (mnemonic, unit, value) = (mnemonic.into(), unit.into(), value.into());
        HeaderItem {
            mnemonic,
            unit,
            value,
            description: String::new(),
            line,
        }
    }

    fn close(a: f64, b: f64, tol: f64) -> bool {
        (a - b).abs() <= tol
    }

    fn has(loc: &HeaderLocation, needle: &str) {
        let found = loc.problems.iter().any(|p| p.contains(needle));
        assert!(found, "{needle:?} not in {:?}", loc.problems);
    }

    /// A well's position; NaN when it is off the map, so no check can pass by accident.
    fn pos(frame: &Frame, i: usize) -> (f64, f64) {
        frame.positions[i].unwrap_or((f64::NAN, f64::NAN))
    }

    fn at(xy: Option<(f64, f64)>, lat_lon: Option<(f64, f64)>, crs: &str) -> HeaderLocation {
        let crs = Some(crs.to_string()).filter(|c| !c.is_empty());
        let (datum, xy_unit) = (Some("NAD83".into()), xy.map(|_| "M".into()));
        HeaderLocation {
            xy_m: xy,
            xy_unit,
            lat_lon,
            crs,
            datum,
            problems: vec![],
        }
    }

    #[test]
    fn parse_angle_reads_decimal_signed_hemisphere_and_dms() {
        let dms = 32.0 + 15.0 / 60.0 + 30.0 / 3600.0; // arithmetic: 32 + 15/60 + 30/3600
        assert!(close(dms, 32.258_333_333, 1e-9)); // arithmetic, to 9 places
        let w102 = -(102.0 + 20.0 / 60.0 + 44.0 / 3600.0); // arithmetic, W negative
        let cases = [
            ("-102.34567", 'E', 'W', -102.34567), // spec: decimal, signed
            ("32.5 N", 'N', 'S', 32.5),           // spec: hemisphere letter
            ("32.5 s", 'N', 'S', -32.5),          // spec: S negative (any case)
            ("W102.5", 'E', 'W', -102.5),         // spec: W negative, letter first
            ("32 15 30 N", 'N', 'S', dms),        // spec: DMS with spaces
            ("32°15'30\"N", 'N', 'S', dms),       // spec: DMS with symbols
            ("-32 15 30", 'N', 'S', -dms),        // spec: the sign covers M and S
            ("102 20 44 W", 'E', 'W', w102),      // spec example
            ("95", 'N', 'S', 95.0),               // spec: range is from_items' job
        ];
        for (text, pos, neg, want) in cases {
            let got = parse_angle(text, pos, neg);
            assert!(
                got.is_some_and(|g| close(g, want, 1e-12)),
                "{text}: {got:?}, want {want}"
            );
        }
    }

    #[test]
    fn parse_angle_refuses_non_angles() {
        // spec: not angles; minutes or seconds >= 60; wrong hemisphere letter;
        // ours: a sign with a letter, inf, exponents, fractional degrees before minutes
        let bad = [
            "abc",
            "",
            "N",
            "32 75 00 N",
            "32 15 60",
            "32 15 30 E",
            "-32.5 N",
            "inf",
            "1e2",
        ];
        for text in bad.into_iter().chain(["32.5 15", "1 2 3 4"]) {
            assert_eq!(parse_angle(text, 'N', 'S'), None, "{text}");
        }
    }

    #[test]
    fn dms_text_round_trips_within_1e_9() {
        // property (spec): D M S text made from an angle parses back to the angle
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(42);
        for n in 0..5000 {
            let angle: f64 = rng.random_range(-180.0..180.0);
            let (a, west) = (angle.abs(), if angle < 0.0 { 'W' } else { 'E' });
            let (d, m) = (a.floor(), ((a - a.floor()) * 60.0).floor());
            let s = ((a - d) * 60.0 - m) * 60.0;
            let text = match n % 3 {
                0 => format!("{d} {m} {s} {west}"),
                1 => format!("{}{d}°{m}'{s}\"", if angle < 0.0 { "-" } else { "" }),
                _ => format!("{west}{d} {m} {s}"),
            };
            let back = parse_angle(&text, 'E', 'W');
            assert!(
                back.is_some_and(|b| close(b, angle, 1e-9)),
                "{text}: {back:?}, want {angle}"
            );
        }
    }

    #[test]
    fn from_items_converts_feet_and_keeps_datum_and_crs() {
        let loc = from_items(&[
            item("xcoord", "FT", "1000", 10),
            item("YCOORD", "F", "2000", 11),
            item("GDAT", "", "NAD27", 12),
            item("HZCS", "", "Texas Central", 13),
            item("LATI", "", "32 15 30 N", 14),
            item("LONG", "DEG", "102 20 44 W", 15),
        ]);
        assert_eq!(loc.xy_m, Some((304.8, 609.6))); // international foot 0.3048 m (NIST SP 811)
        assert_eq!(loc.xy_unit.as_deref(), Some("FT"));
        assert_eq!(loc.datum.as_deref(), Some("NAD27"));
        assert_eq!(loc.crs.as_deref(), Some("Texas Central"));
        let (lat, lon) = loc.lat_lon.unwrap_or((f64::NAN, f64::NAN));
        assert!(close(lat, 32.258_333_333, 1e-9), "{lat}"); // arithmetic, as above
        assert!(lon < -102.0, "{lon}"); // spec: W negative
        assert!(loc.problems.is_empty(), "{:?}", loc.problems);
    }

    #[test]
    fn from_items_blank_unit_zeros_and_bad_values() {
        // spec: a blank unit is metres, with a note
        let loc = from_items(&[
            item("EASTING", "", "512345.5", 3),
            item("NORTHING", "", "3571234", 4),
        ]);
        assert_eq!(loc.xy_m, Some((512_345.5, 3_571_234.0)));
        assert_eq!(loc.xy_unit.as_deref(), Some("none given (taken as metres)"));
        // spec: zeros are blanks in real headers: not used, reported
        let zeros = [("X", "M", 5), ("Y", "M", 6), ("LAT", "", 7), ("LON", "", 8)];
        let loc = from_items(&zeros.map(|(m, u, line)| item(m, u, "0", line)));
        assert_eq!((loc.xy_m, loc.lat_lon), (None, None));
        has(&loc, "lines 5 and 6: X and Y are both 0, taken");
        has(&loc, "lines 7 and 8: LAT and LON are both 0");
        // spec: a non-numeric latitude names its line; the range is checked here
        let loc = from_items(&[item("LATI", "", "abc", 14), item("LONG", "", "-102", 15)]);
        assert_eq!(loc.lat_lon, None);
        assert_eq!(loc.problems, ["line 14: LATI `abc` is not a latitude"]);
        let loc = from_items(&[item("LATI", "", "95", 14), item("LONG", "", "-102", 15)]);
        assert_eq!(loc.lat_lon, None);
        has(&loc, "line 14: LATI `95` is outside -90..90");
        // spec: an unknown unit or X/Y units that disagree are not used; blank values are absent
        let loc = from_items(&[
            item("X", "DEG", "1", 1),
            item("Y", "DEG", "2", 2),
            item("GDAT", "", "", 3),
        ]);
        assert_eq!((loc.xy_m, loc.datum.as_deref()), (None, None));
        has(&loc, "line 1: X unit `DEG` is not a length unit");
        let loc = from_items(&[item("X", "M", "1", 1), item("Y", "FT", "2", 2)]);
        assert_eq!(loc.xy_m, None);
        has(&loc, "disagree");
        // ours: X without Y; the LAS 2.0 NULL value (CWLS) is a blank too
        let loc = from_items(&[
            item("NULL", "", "-999.25", 1),
            item("LATI", "", "-999.25", 2),
            item("X", "", "7", 3),
        ]);
        assert_eq!((loc.lat_lon, loc.xy_m), (None, None));
        has(&loc, "line 2: LATI `-999.25` is the NULL value");
        has(&loc, "line 3: X is given without a Y item");
    }

    #[test]
    fn projected_frame_when_more_wells_have_xy() {
        let a = at(Some((500_000.0, 3_500_000.0)), None, "UTM 16");
        let (xy_b, ll_b) = (Some((501_000.0, 3_501_000.0)), Some((31.6, -87.0)));
        let b = at(xy_b, ll_b, "UTM 16");
        let c = at(None, Some((31.6, -87.01)), "");
        let frame = common_frame(&[Some(&a), Some(&b), Some(&c), None]);
        // spec: X/Y as given; c has only latitude/longitude; None is "not read"
        assert_eq!(
            (pos(&frame, 0), pos(&frame, 1)),
            ((500_000.0, 3_500_000.0), (501_000.0, 3_501_000.0))
        );
        assert_eq!(frame.positions[2..], [None, None]);
        let why = |s: &str| s.to_string();
        let want = [
            (2, why("only latitude/longitude; the map uses X/Y")),
            (3, why("not read")),
        ];
        assert_eq!(frame.left_out, want);
        let text = "east and north from the LAS headers' X/Y, metres (HZCS `UTM 16`; GDAT `NAD83`)";
        assert!(frame.description.starts_with(text), "{}", frame.description);
        let d = HeaderLocation {
            xy_unit: Some("FT".into()),
            ..at(Some((1.0, 2.0)), None, "UTM 15")
        };
        let frame = common_frame(&[Some(&a), Some(&d)]);
        let text =
            "headers disagree on HZCS: `UTM 16`, `UTM 15`: positions may not share one frame";
        assert!(frame.description.contains(text), "{}", frame.description); // spec wording
        assert!(
            frame.description.ends_with("X/Y units as read: `M`, `FT`"),
            "{}",
            frame.description
        );
    }

    #[test]
    fn lat_lon_frame_distances() {
        let r = 6_371_008.8; // GRS 80 mean radius (Moritz 2000, from memory)
        let (a, b) = (
            at(None, Some((44.995, -100.0)), ""),
            at(None, Some((45.005, -100.0)), ""),
        );
        let c = at(Some((1.0, 1.0)), None, "");
        let frame = common_frame(&[Some(&a), Some(&b), Some(&c)]);
        let (pa, pb) = (pos(&frame, 0), pos(&frame, 1));
        let want = std::f64::consts::PI * r / 180.0 * 0.01; // arc length: π·R/180 per degree
        assert!(
            close(pb.1 - pa.1, want, 1e-6) && close(want, 1111.95, 0.01),
            "{pa:?} {pb:?}"
        );
        assert!(close(pa.0, 0.0, 1e-9) && close(pa.1 + pb.1, 0.0, 1e-6)); // spec: about the mean
        assert_eq!(
            frame.left_out,
            [(2, "only X/Y; the map uses latitude/longitude".to_string())]
        );
        let text = &frame.description;
        assert!(
            text.contains("45.00000° N, 100.00000° W (GDAT `NAD83`)"),
            "{text}"
        );
        // tan 45° · (0.005° in radians) = 8.7e-5 (spec's bound); GRS 80 at 45°: N = a/√(1 − e²/2)
        // = 6 388 838 m, R/N − 1 = −0.28 % (Moritz 2000 a and e², from memory)
        assert!(
            text.contains("scale error under 0.009 % across this field"),
            "{text}"
        );
        assert!(
            text.contains("plus under 0.3 % from taking the Earth as a sphere"),
            "{text}"
        );

        // about 10 km apart at 55° N: the flat distance against the haversine
        // great-circle distance (Sinnott 1984, Sky & Telescope 68(2):159, from memory)
        let (p, q) = ((55.0, 12.0), (55.06, 12.1));
        let frame = common_frame(&[Some(&at(None, Some(p), "")), Some(&at(None, Some(q), ""))]);
        let (u, v) = (pos(&frame, 0), pos(&frame, 1));
        let flat = (v.0 - u.0).hypot(v.1 - u.1);
        let (f1, f2, dl) = (p.0.to_radians(), q.0.to_radians(), (q.1 - p.1).to_radians());
        let h = ((f2 - f1) / 2.0).sin().powi(2) + f1.cos() * f2.cos() * (dl / 2.0).sin().powi(2);
        let great = 2.0 * r * h.sqrt().asin();
        assert!(
            great > 9000.0 && ((flat - great) / great).abs() < 1e-3,
            "{flat} vs {great}"
        );

        // ours: across the 180° meridian two wells 0.02° apart stay about 2.2 km apart
        let (w, e) = (
            at(None, Some((0.0, 179.99)), ""),
            at(None, Some((0.0, -179.99)), ""),
        );
        let frame = common_frame(&[Some(&w), Some(&e)]);
        let gap = pos(&frame, 1).0 - pos(&frame, 0).0;
        assert!(close(gap, 2.0 * want, 1e-3), "{gap}"); // π·R/180 · 0.02 at the equator
    }

    #[test]
    fn no_coordinates_no_map() {
        let none = HeaderLocation::default();
        let frame = common_frame(&[Some(&none), None]);
        assert_eq!(frame.positions, [None, None]); // spec: all None
        let text =
            "No well gives coordinates in its LAS header (X/Y or LATI/LONG), so no map is drawn.";
        assert_eq!(frame.description, text); // spec wording
        assert_eq!(frame.left_out.len(), 2);
        assert!(common_frame(&[]).positions.is_empty()); // spec: never panic
    }
}
