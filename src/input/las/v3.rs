//! LAS 3.0 (CWLS *LAS 3.0 File Structure Specifications*, 2000; its 2010
//! revision keeps the structure): the file's sections grouped into data
//! sets, each a parameter, a definition and a data section; the log data set
//! read into the same [`LasFile`] a 2.0 file gives, every other data set
//! (core, tops, inclinometry, user-defined) kept as a table of text items.
//!
//! Rules, with the spec's section and page (implementer's notes in the
//! project's reference folder):
//! - a title is `~` and the section name up to a space or `|`; a data
//!   section names its definition after the bar (`~Core_Data | Core_Definition`);
//!   `~Parameter`, `~Curve` and `~ASCII` are the log set's ('Section Title
//!   Lines', p. 9-10; '~ASCII or ~Log_Data', p. 18);
//! - a header line is `MNEM.UNIT VALUE : DESCRIPTION {FORMAT} | ASSOCIATIONS`;
//!   the format and associations come off first, so colons inside a date
//!   format do not split the line ('Parameter Data Lines', p. 10-11);
//! - `DLM` in ~Version is SPACE, COMMA or TAB; with COMMA or TAB an empty
//!   item is NULL; an item holding the delimiter is in double quotes
//!   ('~Version', p. 13; 'Column Data Lines', p. 11-12);
//! - WRAP must be NO ('What's new in LAS Ver 3.0', p. 5);
//! - an array channel is consecutive `NAME[k]` definition lines, one column
//!   each ('Three Dimension Data Arrays', p. 26-27): kept as curves `NAME[k]`.
//!
//! What the spec allows and flowzone does not read yet is refused with its
//! line and the spec's section: a data section without its definition, a
//! row with another number of items than the definition, an unknown DLM.

use std::borrow::Cow;

use super::header::split_header_line;
use super::{CurveInfo, HeaderItem, LasError, LasFile, LineError, Reader, Version};

/// A data set other than the log data the curves come from: core, tops,
/// inclinometry, a second log run, or a user-defined set.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct DataSet {
    /// The data section's name as titled (`Core_Data`, `Log_Data[2]`, `Drilling`).
    pub name: String,
    /// 1-based line of the data section's title.
    pub line: usize,
    /// The set's parameters (its `*_Parameter` section), as written.
    pub params: Vec<HeaderItem>,
    /// The set's columns (its definition section), in column order.
    pub columns: Vec<CurveInfo>,
    /// The rows, one text item per column; a NULL item is empty.
    pub rows: Vec<Vec<String>>,
    /// The 1-based file line of each row.
    pub row_lines: Vec<usize>,
}

/// Whether the file declares LAS 3.x: the first `VERS` line, before any
/// data, has a value starting with 3.
pub(super) fn declares_v3(bytes: &[u8]) -> bool {
    for raw in bytes.split(|&b| b == b'\n').take(200) {
        let text = String::from_utf8_lossy(raw);
        let t = text.trim();
        if t.as_bytes()
            .get(..4)
            .is_some_and(|b| b.eq_ignore_ascii_case(b"VERS"))
        {
            return split_header_line(t).is_some_and(|s| {
                let v = s.value.trim_start();
                v.starts_with('3') && v.parse::<f64>().is_ok_and(|x| (3.0..4.0).contains(&x))
            });
        }
        if t.starts_with('~') && !t[1..].trim_start().to_ascii_uppercase().starts_with('V') {
            return false;
        }
    }
    false
}

/// The kind of a section, from its title.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Kind {
    Version,
    Well,
    Parameter,
    Definition,
    Data,
    Other,
}

/// One section: its title and its lines (line number, text), blank and
/// comment lines left out.
struct Section {
    line: usize,
    name: String,
    kind: Kind,
    /// The data set the section belongs to (upper case, `LOG` for the log
    /// set), with its `[n]`.
    set: (String, Option<u32>),
    /// For a data section: the definition it names (set, `[n]`).
    definition: Option<(String, Option<u32>)>,
    /// For a data section: the section name after its bar, as written.
    target: Option<String>,
    lines: Vec<(usize, String)>,
}

/// `NAME[n]` to (NAME, n).
fn split_index(name: &str) -> (&str, Option<u32>) {
    if let (Some(open), true) = (name.find('['), name.ends_with(']')) {
        if let Ok(n) = name[open + 1..name.len() - 1].trim().parse::<u32>() {
            return (&name[..open], Some(n));
        }
    }
    (name, None)
}

/// The set a section name belongs to, with the kind its suffix gives.
fn classify(name: &str) -> (Kind, String, Option<u32>) {
    let (base, n) = split_index(name);
    let upper = base.to_ascii_uppercase();
    let plain = !upper.contains('_');
    let log = || "LOG".to_string();
    if plain && upper.starts_with('V') {
        return (Kind::Version, upper, n);
    }
    if plain && upper.starts_with('W') {
        return (Kind::Well, upper, n);
    }
    if plain && upper.starts_with('A') {
        return (Kind::Data, log(), n);
    }
    if plain && upper.starts_with('C') && upper != "CORE" {
        return (Kind::Definition, log(), n);
    }
    if plain && upper.starts_with('P') {
        return (Kind::Parameter, log(), n);
    }
    for (suffix, kind) in [
        ("_DATA", Kind::Data),
        ("_DEFINITION", Kind::Definition),
        ("_PARAMETER", Kind::Parameter),
    ] {
        if let Some(set) = upper.strip_suffix(suffix) {
            return (kind, set.to_string(), n);
        }
    }
    (Kind::Other, upper, n)
}

/// A title line (without its `~`) to a section.
fn title(text: &str, line: usize) -> Section {
    let t = text.trim();
    let end = t.find([' ', '\t', '|']).unwrap_or(t.len());
    let name = t[..end].to_string();
    let (mut kind, set, n) = classify(&name);
    let mut definition = None;
    let mut target_name = None;
    if let Some(bar) = t.find('|') {
        let target = t[bar + 1..].trim().trim_start_matches('~');
        let target = target.split_whitespace().next().unwrap_or("");
        target_name = (!target.is_empty()).then(|| target.to_string());
        let (tk, tset, tn) = classify(target);
        if tk == Kind::Definition {
            definition = Some((tset, tn));
        } else if !target.is_empty() {
            definition = Some((target.to_ascii_uppercase(), tn));
        }
        kind = Kind::Data;
    } else if kind == Kind::Data {
        definition = Some((set.clone(), n));
    }
    let set = match (&definition, kind) {
        (Some((s, _)), Kind::Data) => (s.clone(), n),
        _ => (set, n),
    };
    Section {
        line,
        name,
        kind,
        set,
        definition,
        target: target_name,
        lines: Vec::new(),
    }
}

/// The row delimiter of `DLM`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Dlm {
    Space,
    Comma,
    Tab,
}

/// Split a data row into items by `dlm`; an item in double quotes keeps
/// the delimiter. `None` when a quote is not closed.
fn split_row(line: &str, dlm: Dlm) -> Option<Vec<String>> {
    let mut items = Vec::new();
    let mut chars = line.chars().peekable();
    match dlm {
        Dlm::Space => loop {
            while chars.peek().is_some_and(|c| c.is_whitespace()) {
                chars.next();
            }
            let Some(&c) = chars.peek() else { break };
            let mut item = String::new();
            if c == '"' {
                chars.next();
                loop {
                    match chars.next() {
                        Some('"') => break,
                        Some(c) => item.push(c),
                        None => return None,
                    }
                }
            } else {
                while let Some(&c) = chars.peek().filter(|c| !c.is_whitespace()) {
                    item.push(c);
                    chars.next();
                }
            }
            items.push(item);
        },
        Dlm::Comma | Dlm::Tab => {
            let sep = if dlm == Dlm::Comma { ',' } else { '\t' };
            let mut item = String::new();
            let mut quoted = false;
            for c in chars {
                match c {
                    '"' => quoted = !quoted,
                    c if c == sep && !quoted => items.push(std::mem::take(&mut item)),
                    c => item.push(c),
                }
            }
            if quoted {
                return None;
            }
            items.push(item);
            for it in &mut items {
                *it = it.trim().to_string();
            }
        }
    }
    Some(items)
}

/// A parameter or definition line: the item (format and associations kept
/// at the end of the description, as written) and the format.
fn header_item(text: &str, line: usize) -> Option<(HeaderItem, Option<String>)> {
    let mut rest = text.trim();
    let mut assoc = None;
    if let Some(bar) = rest.rfind('|') {
        if !rest[bar..].contains('}') {
            assoc = Some(rest[bar + 1..].trim().to_string());
            rest = rest[..bar].trim_end();
        }
    }
    let mut format = None;
    if rest.ends_with('}') {
        if let Some(open) = rest.rfind('{') {
            format = Some(rest[open + 1..rest.len() - 1].trim().to_string());
            rest = rest[..open].trim_end();
        }
    }
    let split = split_header_line(rest)?;
    let mut description = split.description.to_string();
    if let Some(f) = &format {
        description = format!("{description} {{{f}}}").trim().to_string();
    }
    if let Some(a) = &assoc {
        description = format!("{description} | {a}");
    }
    Some((
        HeaderItem {
            mnemonic: split.mnemonic.to_string(),
            unit: split.unit.to_string(),
            value: split.value.to_string(),
            description,
            line,
        },
        format,
    ))
}

/// Whether a column format declares text or a date (not a number).
fn is_text_format(f: &str) -> bool {
    let f = f.trim();
    f.starts_with('S') || f.contains("YY") || f.contains("DD") || f.contains("hh")
}

fn unsupported(message: impl Into<String>) -> LineError {
    LineError::Las3(message.into())
}

/// A data set with the format of each of its columns.
type SetWithFormats = (DataSet, Vec<Option<String>>);

/// A section's parameter lines as items (format and associations kept in
/// the description).
fn section_items(s: &Section) -> Vec<HeaderItem> {
    s.lines
        .iter()
        .filter_map(|(n, t)| header_item(t, *n).map(|(i, _)| i))
        .collect()
}

/// The file's sections with their lines, decoded as UTF-8 or else
/// Windows-1252 ('Appendix IV', p. 42); blank and `#` lines left out.
fn sections_of(r: &Reader<'_>, bytes: &[u8]) -> Result<Vec<Section>, LasError> {
    let mut sections: Vec<Section> = Vec::new();
    for (k, raw) in bytes.split(|&b| b == b'\n').enumerate() {
        let line_no = k + 1;
        let raw = raw.strip_suffix(b"\r").unwrap_or(raw);
        let text = match std::str::from_utf8(raw) {
            Ok(t) => Cow::Borrowed(t),
            Err(_) => Cow::Owned(encoding_rs::WINDOWS_1252.decode(raw).0.into_owned()),
        };
        let t = text.trim();
        if t.is_empty() || t.starts_with('#') {
            continue;
        }
        if let Some(rest) = t.strip_prefix('~') {
            sections.push(title(rest, line_no));
            continue;
        }
        match sections.last_mut() {
            Some(s) => s.lines.push((line_no, text.into_owned())),
            None => {
                return Err(r.line_err(
                    line_no,
                    unsupported("text before the first section (LAS 3.0 'Sections', p. 9)"),
                ));
            }
        }
    }
    Ok(sections)
}

/// ~Version's items and the row delimiter; WRAP YES and an unknown DLM are
/// refused with their line.
fn version_settings(
    r: &Reader<'_>,
    sections: &[Section],
) -> Result<(Vec<HeaderItem>, Dlm), LasError> {
    let version_sec = sections
        .iter()
        .find(|s| s.kind == Kind::Version)
        .ok_or_else(|| r.file_err(super::FileError::MissingSection('V')))?;
    let version_items = section_items(version_sec);
    let find = |v: &[HeaderItem], m: &str| {
        v.iter()
            .find(|i| i.mnemonic.eq_ignore_ascii_case(m))
            .cloned()
    };
    if let Some(w) = find(&version_items, "WRAP") {
        if !w.value.eq_ignore_ascii_case("NO") {
            return Err(r.line_err(
                w.line,
                unsupported(format!(
                    "WRAP is `{}`; LAS 3.0 files are never wrapped ('What's new in LAS Ver 3.0', p. 5)",
                    w.value
                )),
            ));
        }
    }
    let dlm = match find(&version_items, "DLM") {
        None => Dlm::Space,
        Some(d) => match d.value.to_ascii_uppercase().as_str() {
            "" | "SPACE" => Dlm::Space,
            "COMMA" => Dlm::Comma,
            "TAB" => Dlm::Tab,
            other => {
                return Err(r.line_err(
                    d.line,
                    unsupported(format!(
                        "DLM is `{other}`; LAS 3.0 allows SPACE, COMMA or TAB ('~Version', p. 13)"
                    )),
                ));
            }
        },
    };
    Ok((version_items, dlm))
}

/// Every data section with its definition (the one its bar names, else the
/// nearest of its set above) and parameters; sections that are no data set
/// kept as text, with a warning.
fn data_sets(
    r: &mut Reader<'_>,
    sections: &[Section],
    dlm: Dlm,
) -> Result<(Vec<SetWithFormats>, String), LasError> {
    // a section a data title names after its bar is a definition, whatever its name
    let targets: Vec<String> = sections
        .iter()
        .filter_map(|s| s.target.as_ref().map(|t| t.to_ascii_uppercase()))
        .collect();
    let is_target = |s: &Section| targets.contains(&s.name.to_ascii_uppercase());
    // data sets: each data section with its definition and parameters
    let mut sets: Vec<SetWithFormats> = Vec::new();
    let mut other = String::new();
    for s in sections {
        match s.kind {
            Kind::Other if is_target(s) => {}
            Kind::Other => {
                r.warn(
                    Some(s.line),
                    format!("section `~{}` is no LAS 3.0 data set; kept as text", s.name),
                );
                other.push_str(&format!("~{}\n", s.name));
                for (_, t) in &s.lines {
                    other.push_str(t.trim_end());
                    other.push('\n');
                }
            }
            Kind::Data => {
                let target = s.definition.clone().unwrap_or_else(|| s.set.clone());
                // the section the bar names, whatever its name says; else by set
                let named = s.target.as_ref().and_then(|t| {
                    sections
                        .iter()
                        .find(|d| d.kind != Kind::Data && d.name.eq_ignore_ascii_case(t))
                });
                // sets repeated without [n] (real files do): the nearest one above
                let nearest = |kind: Kind, key: &(String, Option<u32>), exact: bool| {
                    let mut c = sections.iter().filter(|d| {
                        d.kind == kind && d.set.0 == key.0 && (!exact || d.set.1 == key.1)
                    });
                    let all: Vec<&Section> = c.by_ref().collect();
                    all.iter()
                        .rev()
                        .find(|d| d.line < s.line)
                        .or_else(|| all.first())
                        .copied()
                };
                let def = named
                    .or_else(|| nearest(Kind::Definition, &target, true))
                    .or_else(|| nearest(Kind::Definition, &target, false))
                    .ok_or_else(|| {
                        r.line_err(
                            s.line,
                            unsupported(format!(
                                "data section `~{}` has no definition section `{}` ('Section Title Lines', p. 10)",
                                s.name,
                                s.target.clone().unwrap_or_else(|| format!("{}_Definition", target.0))
                            )),
                        )
                    })?;
                let mut columns: Vec<CurveInfo> = Vec::new();
                let mut formats = Vec::new();
                for (n, t) in &def.lines {
                    let (item, format) = header_item(t, *n)
                        .filter(|(i, _)| !i.mnemonic.is_empty())
                        .ok_or_else(|| r.line_err(*n, LineError::CurveLineNoDot))?;
                    columns.push(CurveInfo {
                        mnemonic: item.mnemonic.clone(),
                        original_mnemonic: item.mnemonic,
                        unit: item.unit,
                        api_code: item.value,
                        description: item.description,
                        line: item.line,
                    });
                    formats.push(format);
                }
                if columns.is_empty() {
                    return Err(r.file_err(super::FileError::NoCurves));
                }
                let params = nearest(Kind::Parameter, &s.set, true)
                    .map(section_items)
                    .unwrap_or_default();
                let mut rows = Vec::with_capacity(s.lines.len());
                let mut row_lines = Vec::with_capacity(s.lines.len());
                for (n, t) in &s.lines {
                    let row = split_row(t, dlm).ok_or_else(|| {
                        r.line_err(
                            *n,
                            unsupported(
                                "a double quote is not closed ('Column Data Lines', p. 12)",
                            ),
                        )
                    })?;
                    if row.len() != columns.len() {
                        return Err(r.line_err(
                            *n,
                            LineError::WrongColumnCount {
                                expected: columns.len(),
                                found: row.len(),
                            },
                        ));
                    }
                    rows.push(row);
                    row_lines.push(*n);
                }
                sets.push((
                    DataSet {
                        name: s.name.clone(),
                        line: s.line,
                        params,
                        columns,
                        rows,
                        row_lines,
                    },
                    formats,
                ));
            }
            _ => {}
        }
    }
    Ok((sets, other))
}

/// The log data set's columns as numbers: empty items and NULL missing, a
/// text column (its format or its items) missing with a warning; a row
/// without an index value refused with its line. Whether any column held text.
fn log_columns(
    r: &mut Reader<'_>,
    log: &DataSet,
    formats: &[Option<String>],
    curves: &[CurveInfo],
    null_value: Option<f64>,
) -> Result<(Vec<Vec<f64>>, bool), LasError> {
    // the log data set as curves: numbers, NULL and empty items missing
    let null_tol = null_value.map(|v| 1e-9 * v.abs().max(1.0));
    let is_null = |v: f64| null_tol.is_some_and(|t| (v - null_value.unwrap_or(0.0)).abs() <= t);
    let mut columns = vec![Vec::with_capacity(log.rows.len()); curves.len()];
    let mut text_columns = Vec::new();
    for (j, col) in columns.iter_mut().enumerate() {
        let text = formats[j].as_deref().is_some_and(is_text_format);
        for (k, row) in log.rows.iter().enumerate() {
            let item = row[j].trim();
            let v = if item.is_empty() {
                f64::NAN
            } else {
                match fast_float2::parse::<f64, _>(item) {
                    Ok(v) if v.is_finite() && !is_null(v) => v,
                    Ok(v) if is_null(v) => f64::NAN,
                    _ if text || j > 0 => {
                        if !text_columns.contains(&j) {
                            text_columns.push(j);
                        }
                        f64::NAN
                    }
                    _ => f64::NAN,
                }
            };
            if j == 0 && v.is_nan() {
                return Err(r.line_err(
                    log.row_lines.get(k).copied().unwrap_or(0),
                    LineError::MissingIndex {
                        text: item.to_string(),
                    },
                ));
            }
            col.push(v);
        }
    }
    let has_text = !text_columns.is_empty();
    for j in text_columns {
        r.warn(
            Some(curves[j].line),
            format!(
                "curve {} holds text, not numbers: missing in the log curves; the log data set is kept whole as the table `{}` too",
                curves[j].mnemonic, log.name
            ),
        );
    }
    Ok((columns, has_text))
}

/// Read a LAS 3.0 file (already known to declare 3.x).
pub(super) fn read(r: &mut Reader<'_>, bytes: &[u8]) -> Result<LasFile, LasError> {
    let sections = sections_of(r, bytes)?;
    let (version_items, dlm) = version_settings(r, &sections)?;
    let well_sec = sections
        .iter()
        .find(|s| s.kind == Kind::Well)
        .ok_or_else(|| r.file_err(super::FileError::MissingSection('W')))?;
    let well_items = section_items(well_sec);
    let null_value = r.null_value(&well_items)?;
    let (mut sets, other) = data_sets(r, &sections, dlm)?;
    let data_secs: Vec<&Section> = sections.iter().filter(|s| s.kind == Kind::Data).collect();
    let log_at = match data_secs.iter().position(|s| s.set.0 == "LOG") {
        Some(i) => i,
        // no log set: the first data set gives the curves, said in a warning
        None if !sets.is_empty() => {
            let first = &sets[0].0;
            let message = format!(
                "no log data set (~Log_Data or ~ASCII): the first data set, `{}`, is read as the curves",
                first.name
            );
            r.contradiction(Some(first.line), message)?;
            0
        }
        None => {
            return Err(r.file_err(super::FileError::Las3NoLog("no data section at all".into())));
        }
    };
    let (log, formats) = sets.remove(log_at);
    let log_params: Vec<HeaderItem> = log.params.clone();

    let curves = r.unique_curves(
        log.columns
            .iter()
            .map(|c| HeaderItem {
                mnemonic: c.original_mnemonic.clone(),
                unit: c.unit.clone(),
                value: c.api_code.clone(),
                description: c.description.clone(),
                line: c.line,
            })
            .collect(),
    );
    let (mut columns, has_text) = log_columns(r, &log, &formats, &curves, null_value)?;
    if columns[0].is_empty() {
        return Err(r.file_err(super::FileError::NoRows));
    }
    let break_at = columns[0]
        .windows(2)
        .position(|w| w[1] == w[0] || (w[1] > w[0]) != (columns[0][1] > columns[0][0]));
    let first_break = break_at.map(|k| {
        (
            log.row_lines.get(k + 1).copied(),
            columns[0][k],
            columns[0][k + 1],
        )
    });
    let index_reversed = r.orient_index(&mut columns, first_break)?;
    let mut data_sets: Vec<DataSet> = Vec::with_capacity(sets.len() + 1);
    if has_text {
        data_sets.push(log);
    }
    data_sets.extend(sets.into_iter().map(|(d, _)| d));
    let mut file = LasFile {
        version: Version::V3_0,
        wrapped: false,
        version_items,
        well_items,
        curves,
        params: log_params,
        other,
        null_value,
        columns,
        index_reversed,
        warnings: Vec::new(),
        data_sets,
        repairs: std::collections::BTreeMap::new(),
    };
    r.check_range(&file, break_at.is_none())?;
    file.warnings = std::mem::take(&mut r.warnings);
    file.repairs = std::mem::take(&mut r.repairs);
    Ok(file)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Check cases of the implementer's notes (§9), from the spec's
    /// 'Column Data Lines' (p. 11-12): a COMMA row with a quoted item
    /// holding the delimiter and a trailing empty item; a SPACE row with a
    /// quoted item; a TAB row with an empty item.
    #[test]
    fn rows_split_by_delimiter_with_quotes_and_empty_items() {
        assert_eq!(
            split_row("2150.5, 87.2 ,\"SHALE, SILTY\",", Dlm::Comma).expect("row"),
            ["2150.5", "87.2", "SHALE, SILTY", ""]
        );
        assert_eq!(
            split_row("  2150.5   87.2   \"FINE SAND\"   -999.2500", Dlm::Space).expect("row"),
            ["2150.5", "87.2", "FINE SAND", "-999.2500"]
        );
        assert_eq!(
            split_row("310.0\t04/11/2019 08:15:00\t\t 12.5", Dlm::Tab).expect("row"),
            ["310.0", "04/11/2019 08:15:00", "", "12.5"]
        );
        assert_eq!(split_row("1, \"open", Dlm::Comma), None);
    }

    /// Titles (spec 'Section Title Lines', p. 9-10; 'Section Title Arrays',
    /// p. 28): a numbered data section naming its definition, the log set's
    /// short names, and a core definition that is not ~Curve.
    #[test]
    fn titles_name_their_set_and_definition() {
        let s = title("Gas_Data[2] | Gas_Definition", 1);
        assert_eq!(
            (s.kind, s.set.clone()),
            (Kind::Data, ("GAS".to_string(), Some(2)))
        );
        assert_eq!(s.definition, Some(("GAS".to_string(), None)));
        let a = title("ASCII  DEPT  GR", 1);
        assert_eq!((a.kind, a.set.0.as_str()), (Kind::Data, "LOG"));
        let c = title("Core_Definition", 1);
        assert_eq!((c.kind, c.set.0.as_str()), (Kind::Definition, "CORE"));
        assert_eq!(title("Curve", 1).set.0, "LOG");
        assert_eq!(title("Core[1] | Core_Definition", 1).kind, Kind::Data);
    }

    /// Header lines (notes §9 case 2; spec 'Parameter Data Lines', p. 10-11;
    /// 'Date and Time', p. 24): the format and association come off before
    /// the last colon splits value from description.
    #[test]
    fn header_lines_with_format_and_association() {
        let (i, f) =
            header_item("TSTART .  14:05:30 : Test start {hh:mm:ss} | RUN[2]", 3).expect("item");
        assert_eq!((i.mnemonic.as_str(), i.unit.as_str()), ("TSTART", ""));
        assert_eq!(i.value, "14:05:30");
        assert_eq!(i.description, "Test start {hh:mm:ss} | RUN[2]");
        assert_eq!(f.as_deref(), Some("hh:mm:ss"));
        let (g, _) = header_item("GRZ[1] .M  1200.0,1350.0 : Zone {F}", 4).expect("item");
        assert_eq!(
            (g.mnemonic.as_str(), g.unit.as_str(), g.value.as_str()),
            ("GRZ[1]", "M", "1200.0,1350.0")
        );
    }
}
