//! The ~A section: numbers separated by white space, one column per ~C curve.
//!
//! LAS 2.0 (CWLS, 2014 update), ~A: unwrapped data has one line per depth
//! step; wrapped data (`WRAP. YES`) puts the index value alone on a line and
//! the other values on as many following lines as needed. The file's NULL
//! value marks a missing sample; it becomes `NaN` here (the index is never
//! nulled). `NaN` written as text is also read as missing.
//!
//! Numbers are parsed straight from the byte buffer (fast-float2), with no
//! string or vector per value or line; values go straight into their column.

use super::error::LineError;

/// White space between values. Commas are not separators in LAS 2.0.
#[inline]
fn is_space(b: u8) -> bool {
    b == b' ' || b == b'\t' || b == b'\r'
}

/// Facts about the index column gathered while parsing, for the header cross-checks.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct IndexScan {
    /// First line where the index changes direction or repeats a value, with the two values.
    pub first_break: Option<(usize, f64, f64)>,
    /// Line of the first data row.
    pub first_line: usize,
    /// Number of blank lines skipped inside ~A.
    pub blank_lines: usize,
    /// Number of `#` comment lines skipped inside ~A.
    pub comment_lines: usize,
    /// Values written as a known null spelling (`-1.#IND`, `ERR`, `(null)`,
    /// a lone `-`...) and read as missing ([`null_spelling_len`]).
    pub null_spellings: usize,
    /// Line of the first of them, with its text.
    pub first_null_spelling: Option<(usize, String)>,
}

/// Spellings of "no value" that real files and other programs write in data
/// (a C runtime's printout of NaN and infinity, a spreadsheet's error, a
/// dash): the length of the token at `pos` when it is one. Case does not
/// matter; the `#IND`, `#INF` and `#QNAN` forms may carry trailing digits.
pub fn null_spelling_len(bytes: &[u8], pos: usize) -> Option<usize> {
    let end = bytes[pos..]
        .iter()
        .position(|&b| is_space(b) || b == b'\n')
        .map_or(bytes.len(), |n| pos + n);
    let token = &bytes[pos..end];
    let upper: Vec<u8> = token.to_ascii_uppercase();
    let exact: [&[u8]; 5] = [b"ERR", b"(NULL)", b"-", b"--", b"NULL"];
    if exact.contains(&upper.as_slice()) {
        return Some(token.len());
    }
    let body = upper.strip_prefix(b"-").unwrap_or(&upper);
    for stem in [&b"1.#IND"[..], b"1.#INF", b"1.#QNAN", b"1.#SNAN"] {
        if let Some(rest) = body.strip_prefix(stem) {
            if rest.iter().all(u8::is_ascii_digit) {
                return Some(token.len());
            }
        }
    }
    None
}

/// The parsed ~A section.
#[derive(Debug, Clone, Default)]
pub struct Data {
    /// One vector per curve, in ~C order; all the same length.
    pub columns: Vec<Vec<f64>>,
    /// The 1-based line of a section line (`~` first) that ended the data
    /// early, found in the same pass; `None` when the data ran to the end.
    pub next_section: Option<usize>,
    /// What parsing saw of the index column and of skipped lines.
    pub scan: IndexScan,
}

/// An error in ~A with its 1-based line number.
pub type DataError = (usize, LineError);

/// Parse the bytes of ~A (the lines after the `~A` line, up to the next
/// line whose first non-blank is `~`, or the end). `first_line` is the 1-based line number of the first byte;
/// `null` is the declared NULL value, if any.
pub fn parse_data(
    bytes: &[u8],
    first_line: usize,
    n_curves: usize,
    wrapped: bool,
    null: Option<f64>,
    rows_hint: usize,
) -> Result<Data, DataError> {
    let mut columns: Vec<Vec<f64>> = (0..n_curves)
        .map(|_| Vec::with_capacity(rows_hint))
        .collect();
    let mut scan = IndexScan::default();
    let null_tol = null.map(|v| 1e-9 * v.abs().max(1.0));
    let mut line = first_line;
    let mut pos = 0usize;
    let len = bytes.len();
    // values of the current depth step so far (wrapped) or of the current line
    let mut in_step = 0usize;
    let mut step_line = first_line;
    let mut last_index: Option<f64> = None;
    let mut direction = 0.0f64;
    let mut next_section = None;

    while pos < len {
        // one line
        let line_start = pos;
        while pos < len && is_space(bytes[pos]) {
            pos += 1;
        }
        if pos < len && bytes[pos] == b'~' {
            next_section = Some(line);
            break;
        }
        if pos >= len || bytes[pos] == b'\n' {
            if !(wrapped && in_step > 0) {
                scan.blank_lines += 1;
            }
            pos += 1;
            line += 1;
            continue;
        }
        if bytes[pos] == b'#' {
            scan.comment_lines += 1;
            while pos < len && bytes[pos] != b'\n' {
                pos += 1;
            }
            pos += 1;
            line += 1;
            continue;
        }
        let _ = line_start;
        if !wrapped || in_step == 0 {
            in_step = 0;
            step_line = line;
        }
        let mut on_line = 0usize;
        loop {
            while pos < len && is_space(bytes[pos]) {
                pos += 1;
            }
            if pos >= len || bytes[pos] == b'\n' {
                break;
            }
            let column = in_step + 1;
            let parsed = fast_float2::parse_partial::<f64, _>(&bytes[pos..]);
            let (value, used) = match parsed {
                Ok((v, used))
                    if pos + used >= len
                        || is_space(bytes[pos + used])
                        || bytes[pos + used] == b'\n' =>
                {
                    (v, used)
                }
                // a known spelling of "no value": missing, counted
                _ if null_spelling_len(bytes, pos).is_some() => {
                    let used = null_spelling_len(bytes, pos).unwrap_or(1);
                    scan.null_spellings += 1;
                    if scan.first_null_spelling.is_none() {
                        scan.first_null_spelling = Some((line, token_text(bytes, pos)));
                    }
                    (f64::NAN, used)
                }
                // a token that does not parse, or parses only in part (`1.5.2`, `2x`)
                Ok((_, used)) => return Err((line, token_error(bytes, pos, pos + used, column))),
                Err(_) => return Err((line, token_error(bytes, pos, pos, column))),
            };
            let end = pos + used;
            if value.is_infinite() {
                return Err((
                    line,
                    LineError::Infinite {
                        column,
                        text: token_text(bytes, pos),
                    },
                ));
            }
            pos = end;
            if in_step >= n_curves {
                // count the rest of the line for the message, then fail
                let mut found = in_step + 1;
                while pos < len && bytes[pos] != b'\n' {
                    if is_space(bytes[pos])
                        && pos + 1 < len
                        && !is_space(bytes[pos + 1])
                        && bytes[pos + 1] != b'\n'
                    {
                        found += 1;
                    }
                    pos += 1;
                }
                return Err(if wrapped {
                    (
                        line,
                        LineError::WrappedOverflow {
                            expected: n_curves,
                            found,
                        },
                    )
                } else {
                    (
                        line,
                        LineError::WrongColumnCount {
                            expected: n_curves,
                            found,
                        },
                    )
                });
            }
            let stored = if in_step == 0 {
                let null_index =
                    null_tol.is_some_and(|tol| (value - null.unwrap_or(0.0)).abs() <= tol);
                if value.is_nan() || null_index {
                    return Err((
                        line,
                        LineError::MissingIndex {
                            text: token_text(bytes, pos - used),
                        },
                    ));
                }
                if let Some(prev) = last_index {
                    let d = value - prev;
                    if scan.first_break.is_none() {
                        if direction == 0.0 && d != 0.0 {
                            direction = d.signum();
                        } else if d == 0.0 || d.signum() != direction {
                            scan.first_break = Some((line, prev, value));
                        }
                    }
                } else {
                    scan.first_line = line;
                }
                last_index = Some(value);
                value
            } else {
                match null_tol {
                    Some(tol) if (value - null.unwrap_or(0.0)).abs() <= tol => f64::NAN,
                    _ => value,
                }
            };
            // SAFETY of indexing: in_step < n_curves was checked above.
            columns[in_step].push(stored);
            in_step += 1;
            on_line += 1;
        }
        let _ = on_line;
        if !wrapped {
            if in_step != n_curves {
                return Err((
                    line,
                    LineError::WrongColumnCount {
                        expected: n_curves,
                        found: in_step,
                    },
                ));
            }
            in_step = 0;
        } else if in_step == n_curves {
            in_step = 0;
        }
        pos += 1;
        line += 1;
    }
    if in_step != 0 {
        return Err((
            step_line,
            LineError::TruncatedStep {
                expected: n_curves,
                found: in_step,
            },
        ));
    }
    Ok(Data {
        columns,
        next_section,
        scan,
    })
}

/// The error for a bad token starting at `start`: a byte that cannot be text
/// of a number (non-ASCII or control) at `at`, or else a bad number.
fn token_error(bytes: &[u8], start: usize, at: usize, column: usize) -> LineError {
    let b = bytes[at];
    if !b.is_ascii() || b.is_ascii_control() {
        LineError::BadByte { byte: b }
    } else {
        LineError::BadNumber {
            column,
            text: token_text(bytes, start),
        }
    }
}

/// The token starting at `pos`, for an error message (at most 40 characters).
fn token_text(bytes: &[u8], pos: usize) -> String {
    let end = bytes[pos..]
        .iter()
        .position(|&b| is_space(b) || b == b'\n')
        .map_or(bytes.len(), |n| pos + n);
    let end = end.min(pos + 40);
    String::from_utf8_lossy(&bytes[pos..end]).into_owned()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn parse(text: &str, n: usize, wrapped: bool) -> Result<Data, DataError> {
        parse_data(text.as_bytes(), 10, n, wrapped, Some(-999.25), 0)
    }

    /// The unwrapped example of ../shared/reference/formulas.md §9: three rows,
    /// RT at 1500.5 is the NULL value and becomes missing.
    #[test]
    fn unwrapped_reference_example() {
        let text = " 1500.0   35.20    2.3500   0.2100   25.300\n 1500.5   88.10    2.5200   0.3100  -999.25\n 1501.0   41.70    2.3300   0.1900   31.800\n";
        let d = parse(text, 5, false).expect("valid");
        assert_eq!(d.columns[0], vec![1500.0, 1500.5, 1501.0]);
        assert_eq!(d.columns[1], vec![35.2, 88.1, 41.7]);
        assert!(d.columns[4][1].is_nan());
        assert_eq!(d.columns[4][2], 31.8);
    }

    /// The wrapped form of the same example (formulas.md §9): NULL is replaced in
    /// wrapped data too, and "-999.2500" matches a NULL declared as "-999.25".
    #[test]
    fn wrapped_reference_example() {
        let text = " 1500.0000\n   35.2000   2.3500   0.2100  25.3000\n 1500.5000\n   88.1000   2.5200   0.3100 -999.2500\n 1501.0000\n   41.7000   2.3300   0.1900  31.8000\n";
        let d = parse(text, 5, true).expect("valid");
        assert_eq!(d.columns[0], vec![1500.0, 1500.5, 1501.0]);
        assert!(d.columns[4][1].is_nan());
        assert_eq!(d.columns[3], vec![0.21, 0.31, 0.19]);
    }

    #[test]
    fn crlf_tabs_blank_and_comment_lines() {
        let text = "1\t2 3\r\n\r\n# note\r\n2 4\t5\r\n";
        let d = parse(text, 3, false).expect("valid");
        assert_eq!(d.columns[2], vec![3.0, 5.0]);
        assert_eq!(d.scan.blank_lines, 1);
        assert_eq!(d.scan.comment_lines, 1);
    }

    #[test]
    fn short_row_names_line_and_counts() {
        let err = parse("1 2 3\n2 4\n", 3, false).expect_err("short row");
        assert_eq!(
            err,
            (
                11,
                LineError::WrongColumnCount {
                    expected: 3,
                    found: 2
                }
            )
        );
    }

    #[test]
    fn long_row_names_line_and_counts() {
        let err = parse("1 2 3\n2 4 5 6 7\n", 3, false).expect_err("long row");
        assert_eq!(
            err,
            (
                11,
                LineError::WrongColumnCount {
                    expected: 3,
                    found: 5
                }
            )
        );
    }

    #[test]
    fn text_and_malformed_numbers() {
        let err = parse("1 2 abc\n", 3, false).expect_err("text");
        assert_eq!(
            err,
            (
                10,
                LineError::BadNumber {
                    column: 3,
                    text: "abc".into()
                }
            )
        );
        let err = parse("1 1.5110.2.3 4\n", 3, false).expect_err("two dots");
        assert_eq!(
            err,
            (
                10,
                LineError::BadNumber {
                    column: 2,
                    text: "1.5110.2.3".into()
                }
            )
        );
    }

    #[test]
    fn non_ascii_byte_in_data() {
        let err = parse_data(b"1 2\xB0 3\n", 1, 3, false, None, 0).expect_err("degree sign");
        assert_eq!(err, (1, LineError::BadByte { byte: 0xB0 }));
    }

    #[test]
    fn nan_text_is_missing_and_infinity_is_refused() {
        let d = parse("1 NaN 3\n", 3, false).expect("NaN accepted");
        assert!(d.columns[1][0].is_nan());
        let err = parse("1 inf 3\n", 3, false).expect_err("infinite");
        assert_eq!(
            err,
            (
                10,
                LineError::Infinite {
                    column: 2,
                    text: "inf".into()
                }
            )
        );
    }

    #[test]
    fn truncated_wrapped_step() {
        let err = parse("1\n2 3\n2\n4\n", 3, true).expect_err("truncated");
        assert_eq!(
            err,
            (
                12,
                LineError::TruncatedStep {
                    expected: 3,
                    found: 2
                }
            )
        );
    }

    #[test]
    fn wrapped_overflow() {
        let err = parse("1\n2 3 4\n", 3, true).expect_err("overflow");
        assert_eq!(
            err,
            (
                11,
                LineError::WrappedOverflow {
                    expected: 3,
                    found: 4
                }
            )
        );
    }

    #[test]
    fn index_direction_break_is_recorded() {
        let d = parse("1 0\n2 0\n1.5 0\n", 2, false).expect("valid");
        assert_eq!(d.scan.first_break, Some((12, 2.0, 1.5)));
        let d = parse("3 0\n2 0\n1 0\n", 2, false).expect("valid");
        assert_eq!(d.scan.first_break, None);
    }

    #[test]
    fn file_without_final_newline() {
        let d = parse("1 2\n3 4", 2, false).expect("valid");
        assert_eq!(d.columns[1], vec![2.0, 4.0]);
    }
}
