//! LAS 2.0 writer.
//!
//! Writes what LAS readers accept: `VERS. 2.0`, `WRAP. NO`, ~W with STRT, STOP,
//! STEP and NULL taken from the data, ~C in column order with the index first,
//! ~P and ~O when present, and ~A in right-aligned fixed-width columns with a
//! precision per curve. Missing samples are written as the NULL value. Every
//! header line ends with ` : DESCRIPTION`, so that the last colon on the line is
//! the writer's own (CWLS LAS 2.0 line rule); colons inside a description are
//! written as `;`.

use std::io::{self, Write};

use crate::input::las::{CurveInfo, HeaderItem, LasFile, median_step, step_range};
use crate::output::numfmt;

/// The NULL value written for missing samples: the usual LAS value.
pub const WRITE_NULL: f64 = -999.25;

/// NULL values tried in order: the first that no written sample would read
/// back as is used, so a real -999.25 is never turned into a gap.
const NULL_CANDIDATES: [&str; 4] = ["-999.25", "-9999.25", "-99999.25", "-999999.25"];

/// The NULL text for these columns at these decimals: the first candidate
/// that no finite value, as written, equals.
fn choose_null(columns: &[&[f64]], decimals: &[usize]) -> &'static str {
    let collides = |null: f64| {
        columns.iter().zip(decimals).any(|(col, &d)| {
            let scale = 10f64.powi(d.min(15) as i32);
            col.iter()
                .any(|&v| v.is_finite() && ((v * scale).round() / scale - null).abs() < 1e-9)
        })
    };
    NULL_CANDIDATES
        .iter()
        .copied()
        .find(|t| !collides(t.parse().unwrap_or(WRITE_NULL)))
        .unwrap_or(NULL_CANDIDATES[NULL_CANDIDATES.len() - 1])
}

/// Most decimals [`decimals_needed`] returns.
pub const MAX_DECIMALS: usize = 8;

/// Fewest decimals (at most `cap`) that write every value of the column exactly
/// as it reads back, to within 1e-9 relative.
pub fn decimals_needed(values: &[f64], cap: usize) -> usize {
    let mut need = 0usize;
    for &v in values {
        if !v.is_finite() {
            continue;
        }
        while need < cap {
            let scale = 10f64.powi(need as i32);
            let back = (v * scale).round() / scale;
            if (back - v).abs() <= 1e-9 * v.abs().max(1e-300) || (back - v).abs() < 1e-12 {
                break;
            }
            need += 1;
        }
        if need == cap {
            break;
        }
    }
    need
}

/// A header field may not break the line syntax: no colon in the description.
fn clean_description(text: &str) -> String {
    text.replace(':', ";")
}

/// A mnemonic may hold no space, dot or colon.
fn clean_mnemonic(text: &str) -> String {
    text.chars()
        .map(|c| {
            if c == ' ' || c == '.' || c == ':' {
                '_'
            } else {
                c
            }
        })
        .collect()
}

fn header_line(
    out: &mut impl Write,
    mnemonic: &str,
    unit: &str,
    value: &str,
    description: &str,
) -> io::Result<()> {
    // a space before the dot keeps a unit that starts with a dot (`.1IN`) apart
    // from the mnemonic for readers that split on a run of dots
    let left = format!(
        " {:<8} .{}",
        clean_mnemonic(mnemonic),
        unit.replace(' ', "_")
    );
    writeln!(
        out,
        "{left:<20} {value:<28} : {}",
        clean_description(description)
    )
}

/// What a LAS file is written from, borrowed: the header sections and the
/// columns, index first. [`write_las`] takes a whole [`LasFile`]; computed
/// tables are written through this without copying their columns.
#[derive(Debug, Clone, Copy)]
pub struct LasParts<'a> {
    /// ~W items (STRT, STOP, STEP, NULL among them are skipped: the writer
    /// takes those from the data).
    pub well_items: &'a [HeaderItem],
    /// ~P items, written in order (no ~P section when empty).
    pub params: &'a [HeaderItem],
    /// ~O text.
    pub other: &'a str,
    /// ~C lines, one per column, index first.
    pub curves: &'a [CurveInfo],
    /// The data, one slice per curve in the same order; rows are those of the
    /// index, and a non-finite or absent value is written as the NULL value.
    pub columns: &'a [&'a [f64]],
    /// Unit of the index (STRT, STOP, STEP).
    pub index_unit: &'a str,
}

/// Write a LAS 2.0 file. `decimals[i]` is the precision of column `i`
/// (missing entries default to what [`decimals_needed`] finds).
pub fn write_las(out: impl Write, file: &LasFile, decimals: &[usize]) -> io::Result<()> {
    let columns: Vec<&[f64]> = file.columns.iter().map(Vec::as_slice).collect();
    let parts = LasParts {
        well_items: &file.well_items,
        params: &file.params,
        other: &file.other,
        curves: &file.curves,
        columns: &columns,
        index_unit: file.index_unit(),
    };
    write_parts(out, &parts, decimals)
}

/// Write a LAS 2.0 file from borrowed parts; `decimals` as in [`write_las`].
pub fn write_parts(mut out: impl Write, file: &LasParts<'_>, decimals: &[usize]) -> io::Result<()> {
    let index: &[f64] = file.columns.first().copied().unwrap_or(&[]);
    let n = index.len();
    let unit = file.index_unit;
    let decimals: Vec<usize> = (0..file.columns.len())
        .map(|i| {
            decimals
                .get(i)
                .copied()
                .unwrap_or_else(|| decimals_needed(file.columns[i], MAX_DECIMALS))
        })
        .collect();
    let d0 = decimals.first().copied().unwrap_or(4).max(1);
    let fmt = |v: f64, d: usize| format!("{v:.d$}");

    writeln!(out, "~VERSION INFORMATION")?;
    header_line(
        &mut out,
        "VERS",
        "",
        "2.0",
        "CWLS LOG ASCII STANDARD - VERSION 2.0",
    )?;
    header_line(&mut out, "WRAP", "", "NO", "ONE LINE PER DEPTH STEP")?;
    writeln!(out, "~WELL INFORMATION")?;
    let (strt, stop) = if n > 0 {
        (index[0], index[n - 1])
    } else {
        (0.0, 0.0)
    };
    let spacing = median_step(index);
    let (lo, hi) = step_range(index);
    let regular = n > 1 && (hi - lo) <= 1e-6 * spacing.abs().max(1e-9);
    let step = if regular { spacing } else { 0.0 };
    header_line(&mut out, "STRT", unit, &fmt(strt, d0), "START DEPTH")?;
    header_line(&mut out, "STOP", unit, &fmt(stop, d0), "STOP DEPTH")?;
    header_line(
        &mut out,
        "STEP",
        unit,
        &fmt(step, d0),
        if regular {
            "STEP"
        } else {
            "STEP (0: IRREGULAR SPACING)"
        },
    )?;
    let null_text = choose_null(file.columns, &decimals);
    header_line(&mut out, "NULL", "", null_text, "NULL VALUE")?;
    let skip = ["STRT", "STOP", "STEP", "NULL"];
    for item in file
        .well_items
        .iter()
        .filter(|i| !skip.iter().any(|s| i.mnemonic.eq_ignore_ascii_case(s)))
    {
        write_item(&mut out, item)?;
    }
    writeln!(out, "~CURVE INFORMATION")?;
    for c in file.curves {
        header_line(&mut out, &c.mnemonic, &c.unit, &c.api_code, &c.description)?;
    }
    if !file.params.is_empty() {
        writeln!(out, "~PARAMETER INFORMATION")?;
        for item in file.params {
            write_item(&mut out, item)?;
        }
    }
    let other = file.other.trim_end();
    if !other.is_empty() {
        writeln!(out, "~OTHER")?;
        for line in other.lines() {
            // a line starting with `~` would open a section
            let line = line.trim_start_matches('~');
            writeln!(out, "{line}")?;
        }
    }

    // column widths from the extremes, the NULL text and the mnemonic
    let widths: Vec<usize> = file
        .columns
        .iter()
        .zip(&decimals)
        .zip(file.curves)
        .map(|((col, &d), c)| {
            let (lo, hi) = col
                .iter()
                .filter(|v| v.is_finite())
                .fold((0.0f64, 0.0f64), |(a, b), &v| (a.min(v), b.max(v)));
            fmt(lo, d)
                .len()
                .max(fmt(hi, d).len())
                .max(null_text.len())
                .max(c.mnemonic.len())
                + 1
        })
        .collect();
    write!(out, "~A")?;
    for (c, w) in file.curves.iter().zip(&widths) {
        write!(out, " {:>w$}", clean_mnemonic(&c.mnemonic), w = w - 1)?;
    }
    writeln!(out)?;
    let mut line: Vec<u8> = Vec::with_capacity(widths.iter().sum::<usize>() + 2);
    for row in 0..n {
        line.clear();
        line.push(b' ');
        for (col, (&d, &w)) in file.columns.iter().zip(decimals.iter().zip(&widths)) {
            let v = col.get(row).copied().unwrap_or(f64::NAN);
            line.push(b' ');
            if v.is_finite() {
                numfmt::push_fixed_right(&mut line, v, d, w - 1);
            } else {
                numfmt::push_right(&mut line, null_text.as_bytes(), w - 1);
            }
        }
        line.push(b'\n');
        out.write_all(&line)?;
    }
    Ok(())
}

fn write_item(out: &mut impl Write, item: &HeaderItem) -> io::Result<()> {
    header_line(
        out,
        &item.mnemonic,
        &item.unit,
        &item.value,
        &item.description,
    )
}

/// Build a [`LasFile`] from curves, for writing computed results. The first
/// curve is the index.
pub fn new_file(
    well_items: Vec<HeaderItem>,
    params: Vec<HeaderItem>,
    curves: Vec<(crate::input::las::CurveInfo, Vec<f64>)>,
) -> LasFile {
    let (curves, columns): (Vec<_>, Vec<_>) = curves.into_iter().unzip();
    LasFile {
        version: crate::input::las::Version::V2_0,
        wrapped: false,
        version_items: Vec::new(),
        well_items,
        curves,
        params,
        other: String::new(),
        null_value: Some(WRITE_NULL),
        columns,
        index_reversed: false,
        data_sets: Vec::new(),
        repairs: std::collections::BTreeMap::new(),
        warnings: Vec::new(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A real sample of -999.25 (as written) moves the NULL to the next
    /// candidate, so it reads back as a value, not a gap.
    #[test]
    fn a_real_minus_999_25_is_not_written_as_null() {
        let cols: [&[f64]; 2] = [&[1.0, 2.0], &[-999.2500001, f64::NAN]];
        assert_eq!(choose_null(&cols, &[1, 4]), "-9999.25");
        // at 1 decimal it is written -999.3, which is not the NULL
        assert_eq!(choose_null(&cols, &[1, 1]), "-999.25");
        let info = |m: &str| crate::input::las::CurveInfo {
            mnemonic: m.into(),
            original_mnemonic: m.into(),
            unit: String::new(),
            api_code: String::new(),
            description: String::new(),
            line: 0,
        };
        let file = new_file(
            Vec::new(),
            Vec::new(),
            vec![
                (info("DEPT"), vec![1.0, 2.0]),
                (info("X"), vec![-999.25, f64::NAN]),
            ],
        );
        let mut out = Vec::new();
        write_las(&mut out, &file, &[1, 2]).expect("in memory");
        let back = crate::input::las::read_bytes(
            &out,
            std::path::Path::new("n.las"),
            crate::input::las::ReadOptions::default(),
        )
        .expect("reads");
        assert_eq!(back.null_value, Some(-9999.25));
        assert_eq!(back.columns[1][0], -999.25);
        assert!(back.columns[1][1].is_nan());
    }

    #[test]
    fn decimals_found() {
        assert_eq!(decimals_needed(&[1.0, 2.0], 8), 0);
        assert_eq!(decimals_needed(&[0.21, 1500.5], 8), 2);
        assert_eq!(decimals_needed(&[1.0 / 3.0], 5), 5);
        assert_eq!(decimals_needed(&[f64::NAN, 0.125], 8), 3);
    }

    #[test]
    fn descriptions_keep_the_last_colon_ours() {
        let mut out = Vec::new();
        header_line(&mut out, "TIME", "", "14:30:00", "TIME: STARTED").expect("write to memory");
        let text = String::from_utf8(out).expect("ascii");
        let split = crate::input::las::header::split_header_line(&text).expect("dot");
        assert_eq!(
            (split.value, split.description),
            ("14:30:00", "TIME; STARTED")
        );
    }

    proptest::proptest! {
        /// Write then read gives every value back to the written precision
        /// (half a unit in the last decimal, plus float noise) and NaN as
        /// NaN (written as the NULL value), for any decimals 0-8.
        #[test]
        fn write_then_read_round_trips(
            values in proptest::collection::vec(proptest::option::of(-1.0e5f64..1.0e5), 1..60),
            d in 0usize..=8,
        ) {
            let n = values.len();
            let depth: Vec<f64> = (0..n).map(|i| 1000.0 + 0.5 * i as f64).collect();
            let v: Vec<f64> = values.iter().map(|x| x.unwrap_or(f64::NAN)).collect();
            let info = |m: &str| crate::input::las::CurveInfo {
                mnemonic: m.into(),
                original_mnemonic: m.into(),
                unit: "M".into(),
                api_code: String::new(),
                description: String::new(),
                line: 0,
            };
            let file = new_file(Vec::new(), Vec::new(), vec![(info("DEPT"), depth.clone()), (info("X"), v.clone())]);
            let mut out = Vec::new();
            write_las(&mut out, &file, &[1, d]).expect("in memory");
            let back = crate::input::las::read_bytes(&out, std::path::Path::new("p.las"), crate::input::las::ReadOptions::default())
                .expect("reads back");
            proptest::prop_assert_eq!(back.columns[0].clone(), depth);
            let tol = 0.5 * 10f64.powi(-(d as i32)) * (1.0 + 1e-9) + 1e-9;
            for (a, b) in back.columns[1].iter().zip(&v) {
                if b.is_nan() {
                    proptest::prop_assert!(a.is_nan());
                } else {
                    proptest::prop_assert!((a - b).abs() <= tol, "{} read back as {} ({} decimals)", b, a, d);
                }
            }
        }
    }
}
