//! Header lines of ~V, ~W, ~C and ~P: `MNEM.UNIT  DATA : DESCRIPTION`.
//!
//! LAS 2.0 (CWLS, 2014 update), line syntax: the mnemonic ends at the first
//! dot; the unit runs from that dot to the first space after it (no space
//! means an empty unit); the description starts after the last colon, so the
//! data field may hold dots, spaces and colons (dates, times, company names).

use super::error::LineError;

/// One parsed header line. Fields are trimmed.
#[derive(Debug, Clone, PartialEq, Eq, serde::Serialize)]
pub struct HeaderItem {
    /// The mnemonic: the text before the first dot.
    pub mnemonic: String,
    /// The unit, empty when the line gives none (in ~C it may hold a space, as `1000 LBF`).
    pub unit: String,
    /// The data field between the unit and the last colon; may be empty.
    pub value: String,
    /// The text after the last colon; empty when the line has no colon.
    pub description: String,
    /// 1-based line number in the file.
    pub line: usize,
}

/// How a header line was split, when a fallback rule had to be used.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SplitNote {
    /// The line follows the rule as written.
    Plain,
    /// The line has no colon: everything after the unit is the data field.
    NoColon,
    /// A unit with a space in it (`1000 LBF`): the numeric scale and the unit
    /// word were joined (only applied in ~C, where the data field is an API code).
    UnitWithSpace,
}

/// The parts of a header line before trimming into a [`HeaderItem`].
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SplitLine<'a> {
    /// The text before the first dot.
    pub mnemonic: &'a str,
    /// The text from the dot to the first space or tab after it; empty when none.
    pub unit: &'a str,
    /// The data field between the unit and the last colon.
    pub value: &'a str,
    /// The text after the last colon; empty when the line has no colon.
    pub description: &'a str,
    /// Whether the line had a colon ([`SplitNote::Plain`]) or not ([`SplitNote::NoColon`]).
    pub note: SplitNote,
}

/// Split a header line by the LAS 2.0 rule. `None` when the line has no dot,
/// which the caller turns into an error or a warning depending on the section.
pub fn split_header_line(line: &str) -> Option<SplitLine<'_>> {
    let line = line.trim_start();
    let dot = line.find('.')?;
    let mnemonic = line[..dot].trim();
    let after_dot = &line[dot + 1..];
    let unit_end = after_dot.find([' ', '\t']).unwrap_or(after_dot.len());
    let unit = &after_dot[..unit_end];
    let rest = &after_dot[unit_end..];
    // A unit can only end at a space before the last colon; when the first space
    // comes after the last colon of the line, the "unit" swallowed a colon.
    let (unit, rest) = match (unit.rfind(':'), rest.contains(':')) {
        (Some(colon), false) => (&unit[..colon], &after_dot[colon..]),
        _ => (unit, rest),
    };
    let (value, description, note) = match rest.rfind(':') {
        Some(colon) => (&rest[..colon], &rest[colon + 1..], SplitNote::Plain),
        None => (rest, "", SplitNote::NoColon),
    };
    Some(SplitLine {
        mnemonic,
        unit: unit.trim(),
        value: value.trim(),
        description: description.trim(),
        note,
    })
}

/// Parse a ~C line. A unit written with a space (`TENS.1000 LBF : TENSION`) is
/// joined when the unit is a bare number and the data field starts with a
/// letter, which an API log code never does.
pub fn parse_curve_line(line: &str, line_no: usize) -> Result<(HeaderItem, SplitNote), LineError> {
    let split = split_header_line(line).ok_or(LineError::CurveLineNoDot)?;
    if split.mnemonic.is_empty() {
        return Err(LineError::EmptyMnemonic);
    }
    let scale_only =
        !split.unit.is_empty() && split.unit.bytes().all(|b| b.is_ascii_digit() || b == b'.');
    let starts_alpha = split
        .value
        .bytes()
        .next()
        .is_some_and(|b| b.is_ascii_alphabetic());
    if scale_only && starts_alpha && !split.value.contains(' ') {
        let item = HeaderItem {
            mnemonic: split.mnemonic.to_string(),
            unit: format!("{} {}", split.unit, split.value),
            value: String::new(),
            description: split.description.to_string(),
            line: line_no,
        };
        return Ok((item, SplitNote::UnitWithSpace));
    }
    Ok((to_item(&split, line_no), split.note))
}

/// Turn a split line into an owned item.
pub fn to_item(split: &SplitLine<'_>, line_no: usize) -> HeaderItem {
    HeaderItem {
        mnemonic: split.mnemonic.to_string(),
        unit: split.unit.to_string(),
        value: split.value.to_string(),
        description: split.description.to_string(),
        line: line_no,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn parts(line: &str) -> (String, String, String, String) {
        let s = split_header_line(line).expect("line has a dot");
        (
            s.mnemonic.into(),
            s.unit.into(),
            s.value.into(),
            s.description.into(),
        )
    }

    fn p(a: &str, b: &str, c: &str, d: &str) -> (String, String, String, String) {
        (a.into(), b.into(), c.into(), d.into())
    }

    /// Source: the expected splits in ../shared/reference/formulas.md §9, which
    /// apply the CWLS LAS 2.0 rule (first dot, first space after it, last colon).
    #[test]
    fn reference_sheet_splits() {
        assert_eq!(
            parts(" STRT.M         1500.0000 : START DEPTH"),
            p("STRT", "M", "1500.0000", "START DEPTH")
        );
        assert_eq!(
            parts(" NULL.          -999.25 : NULL VALUE"),
            p("NULL", "", "-999.25", "NULL VALUE")
        );
        assert_eq!(
            parts(" COMP.   EXAMPLE PETROLEUM LTD.   : COMPANY"),
            p("COMP", "", "EXAMPLE PETROLEUM LTD.", "COMPANY")
        );
        assert_eq!(
            parts(" DATE.   2024-03-15 14:30  : LOG DATE"),
            p("DATE", "", "2024-03-15 14:30", "LOG DATE")
        );
        assert_eq!(
            parts(" TIME.   14:30:00  : TIME STARTED"),
            p("TIME", "", "14:30:00", "TIME STARTED")
        );
        assert_eq!(
            parts(" FLD .          TEST FIELD : FIELD"),
            p("FLD", "", "TEST FIELD", "FIELD")
        );
        assert_eq!(
            parts(" RHOB.K/M3      2650 : MATRIX DENSITY"),
            p("RHOB", "K/M3", "2650", "MATRIX DENSITY")
        );
        assert_eq!(
            parts(" DEPT.M   : MEASURED DEPTH"),
            p("DEPT", "M", "", "MEASURED DEPTH")
        );
        assert_eq!(
            parts(" RUN .1   : RUN NUMBER"),
            p("RUN", "1", "", "RUN NUMBER")
        );
    }

    /// The last colon starts the description, so a company name with a colon
    /// stays in the data field (CWLS LAS 2.0 line rule).
    #[test]
    fn last_colon_rule() {
        assert_eq!(
            parts("COMP.  ANY OIL COMPANY : INC. : COMPANY"),
            p("COMP", "", "ANY OIL COMPANY : INC.", "COMPANY")
        );
    }

    /// Old files write no space before the colon.
    #[test]
    fn colon_without_space() {
        assert_eq!(
            parts("DFD .KG/M3 1525.0000: DRILL FLUID DENSITY"),
            p("DFD", "KG/M3", "1525.0000", "DRILL FLUID DENSITY")
        );
        assert_eq!(
            parts("WRAP. YES: MULTIPLE LINES"),
            p("WRAP", "", "YES", "MULTIPLE LINES")
        );
        assert_eq!(parts("VERS.  1.2: CWLS"), p("VERS", "", "1.2", "CWLS"));
        // unit directly followed by the colon
        assert_eq!(parts("DEPT.M: DEPTH"), p("DEPT", "M", "", "DEPTH"));
    }

    #[test]
    fn units_with_dots_and_brackets() {
        assert_eq!(
            parts("TDEP.1IN  : TIME DEPTH"),
            p("TDEP", "1IN", "", "TIME DEPTH")
        );
        assert_eq!(
            parts("RHOB.G.CM3  : DENSITY"),
            p("RHOB", "G.CM3", "", "DENSITY")
        );
    }

    #[test]
    fn unit_with_space_in_curve_section() {
        let (item, note) = parse_curve_line("TENS.1000 LBF  : CABLE TENSION", 7).expect("valid");
        assert_eq!(item.unit, "1000 LBF");
        assert_eq!(item.value, "");
        assert_eq!(note, SplitNote::UnitWithSpace);
        // an API code is digits, so it is not joined
        let (item, _) = parse_curve_line("GR  .GAPI  07 310 01 00 : GAMMA", 8).expect("valid");
        assert_eq!(item.unit, "GAPI");
        assert_eq!(item.value, "07 310 01 00");
    }

    #[test]
    fn curve_line_without_dot_is_an_error() {
        assert_eq!(
            parse_curve_line("RHOB G/CM3 BULK DENSITY", 3),
            Err(LineError::CurveLineNoDot)
        );
        assert_eq!(
            parse_curve_line(" .M : x", 3),
            Err(LineError::EmptyMnemonic)
        );
    }

    #[test]
    fn no_colon_keeps_data() {
        let s = split_header_line("STRT.M 100.0").expect("dot");
        assert_eq!(
            (s.value, s.description, s.note),
            ("100.0", "", SplitNote::NoColon)
        );
    }
}
