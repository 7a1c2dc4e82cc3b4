//! Reads LAS 2.0 well-log files, and LAS 1.2 (the writer is [`crate::output::las`]).
//!
//! Follows CWLS, *LAS Version 2.0: A Digital Standard for Logs* (January 2014
//! update), with the 1992 original for LAS 1.2 habits. A file is made of
//! sections, each opened by a line starting with `~` and a letter:
//!
//! ```text
//! ~V  version: VERS (1.2 or 2.0) and WRAP (YES or NO)
//! ~W  well: STRT, STOP, STEP (index unit), NULL, COMP, WELL, FLD, LOC, ...
//! ~C  curves, one line per ~A column, index first: MNEM.UNIT API : DESCRIPTION
//! ~P  parameters (optional), same line syntax
//! ~O  other (optional), free text kept as it is
//! ~A  the data, last: numbers separated by spaces
//! ```
//!
//! The reader is strict where a wrong answer could pass for a right one: a row
//! with the wrong number of values, text in a numeric column, a ~C line that
//! cannot be split, a file without ~V, ~W, ~C or ~A are errors that name the
//! file and line. Where the file is readable but contradicts itself (STRT/STOP
//! against the index, STEP against the spacing, a non-monotonic index, ~A
//! column names against ~C) it reads the data and records a [`Warning`] with the
//! line number; [`ReadOptions::strict`] turns those contradictions into errors.
//!
//! After reading, the index increases: a file written with decreasing depth is
//! reversed (and says so in [`LasFile::index_reversed`]).

pub mod data;
pub mod error;
pub mod header;
pub mod v3;

use std::path::{Path, PathBuf};

pub use error::{FileError, LasError, LineError, Warning};
pub use header::HeaderItem;

/// LAS versions this reader reads.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Version {
    /// LAS 1.2 (1990): ~W values sit in the description field.
    #[serde(rename = "1.2")]
    V1_2,
    /// LAS 2.0.
    #[serde(rename = "2.0")]
    V2_0,
    /// LAS 3.0 (CWLS 2000): data sets, delimiters, formats.
    #[serde(rename = "3.0")]
    V3_0,
}

/// One curve of ~C.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct CurveInfo {
    /// Unique mnemonic: the file's own, or with `_2`, `_3`... when the file repeats it.
    pub mnemonic: String,
    /// The mnemonic as written in the file.
    pub original_mnemonic: String,
    /// The unit as written (empty when the line gives none).
    pub unit: String,
    /// The data field of the ~C line (an API log code in most files).
    pub api_code: String,
    /// The description after the colon.
    pub description: String,
    /// 1-based line number of the ~C line.
    pub line: usize,
}

/// A LAS file as read: header sections, curves and data (column per curve).
#[derive(Debug, Clone, serde::Serialize)]
pub struct LasFile {
    /// VERS of ~V: 1.2 or 2.0.
    pub version: Version,
    /// Whether ~A was wrapped in the file.
    pub wrapped: bool,
    /// The ~V lines.
    pub version_items: Vec<HeaderItem>,
    /// The ~W lines (LAS 1.2 values moved from the description field).
    pub well_items: Vec<HeaderItem>,
    /// The ~C curves in file order, the index first.
    pub curves: Vec<CurveInfo>,
    /// The ~P lines.
    pub params: Vec<HeaderItem>,
    /// ~O text, as written.
    pub other: String,
    /// The NULL value declared in ~W.
    pub null_value: Option<f64>,
    /// One column per curve, index first; missing samples are NaN.
    #[serde(skip)]
    pub columns: Vec<Vec<f64>>,
    /// True when the file's index decreased and the rows were reversed.
    pub index_reversed: bool,
    /// What the reader tolerated or patched, by line where it has one.
    pub warnings: Vec<Warning>,
    /// LAS 3.0: the data sets other than the log data the curves come from
    /// (core, tops, inclinometry, user-defined); empty for 1.2 and 2.0.
    pub data_sets: Vec<v3::DataSet>,
    /// What the reader repaired, by kind, with how many times (each also a
    /// warning with its line; every repair is refused under `--strict`).
    pub repairs: std::collections::BTreeMap<String, usize>,
}

/// A NULL value smaller in size than this is one real data can take, and is
/// warned about (our choice: usual NULLs are -999.25, -9999, -999).
pub const PLAUSIBLE_NULL_MIN_ABS: f64 = 10.0;

/// Options of the reader.
#[derive(Debug, Clone, Copy, Default)]
pub struct ReadOptions {
    /// Turn header/data contradictions (STRT, STOP, STEP, a non-monotonic index,
    /// ~A column names) into errors instead of warnings.
    pub strict: bool,
    /// Size limits that refuse a hostile or runaway file.
    pub limits: Limits,
}

/// Bounds on what one file may hold, so that a damaged or hostile file gets a
/// clear error instead of exhausting memory. A file is read whole, so memory
/// per file in flight is about its size plus 8 bytes per value.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Limits {
    /// Largest file read, bytes.
    pub max_bytes: u64,
    /// Most lines before ~A.
    pub max_header_lines: usize,
    /// Longest header line, bytes.
    pub max_header_line_bytes: usize,
    /// Most curves in ~C.
    pub max_curves: usize,
}

impl Limits {
    /// 2 GiB files, 1 000 000 header lines of at most 64 KiB, 10 000 curves:
    /// far beyond real logs (tens of curves, a few hundred header lines;
    /// our choice), small enough to fail fast on damaged files.
    pub const DEFAULT: Limits = Limits {
        max_bytes: 2 << 30,
        max_header_lines: 1_000_000,
        max_header_line_bytes: 64 << 10,
        max_curves: 10_000,
    };
}

impl Default for Limits {
    fn default() -> Limits {
        Limits::DEFAULT
    }
}

/// Mnemonics the 2017 update allows for the index curve, plus common depth names.
const INDEX_MNEMONICS: [&str; 6] = ["DEPT", "DEPTH", "TIME", "INDEX", "MD", "ETIM"];

impl LasFile {
    /// The index column (the first curve).
    pub fn index(&self) -> &[f64] {
        self.columns.first().map_or(&[], Vec::as_slice)
    }

    /// Number of depth steps.
    pub fn n_rows(&self) -> usize {
        self.index().len()
    }

    /// The unit of the index, from its ~C line, else from STRT.
    pub fn index_unit(&self) -> &str {
        match self.curves.first() {
            Some(c) if !c.unit.is_empty() => &c.unit,
            _ => self.well_item("STRT").map_or("", |i| i.unit.as_str()),
        }
    }

    /// A ~W item by mnemonic (case-insensitive).
    pub fn well_item(&self, mnemonic: &str) -> Option<&HeaderItem> {
        self.well_items
            .iter()
            .find(|i| i.mnemonic.eq_ignore_ascii_case(mnemonic))
    }

    /// A ~P item by mnemonic (case-insensitive).
    pub fn param(&self, mnemonic: &str) -> Option<&HeaderItem> {
        self.params
            .iter()
            .find(|i| i.mnemonic.eq_ignore_ascii_case(mnemonic))
    }

    /// A ~W value by mnemonic, if present and not empty.
    pub fn well_value(&self, mnemonic: &str) -> Option<&str> {
        self.well_item(mnemonic)
            .map(|i| i.value.as_str())
            .filter(|v| !v.is_empty())
    }

    /// Position of a curve by its (unique) mnemonic, case-insensitive.
    pub fn curve_position(&self, mnemonic: &str) -> Option<usize> {
        self.curves
            .iter()
            .position(|c| c.mnemonic.eq_ignore_ascii_case(mnemonic))
    }

    /// A curve's data by its (unique) mnemonic.
    pub fn curve_data(&self, mnemonic: &str) -> Option<&[f64]> {
        self.curve_position(mnemonic)
            .map(|i| self.columns[i].as_slice())
    }

    /// The well name: WELL, else UWI, else the caller's fallback.
    pub fn well_name(&self) -> Option<&str> {
        self.well_value("WELL").or_else(|| self.well_value("UWI"))
    }
}

/// Read a LAS file from disk.
pub fn read_path(path: &Path, options: ReadOptions) -> Result<LasFile, LasError> {
    let bytes = load(path, options.limits)?;
    read_bytes(&bytes, path, options)
}

/// A LAS file's bytes, refused unread when larger than `limits` allow. The
/// caller parses them with [`read_bytes`] and may use them for more (the run
/// hashes them for its manifest, so each input is read once).
pub fn load(path: &Path, limits: Limits) -> Result<Vec<u8>, LasError> {
    let meta = std::fs::metadata(path).map_err(|source| LasError::Io {
        path: path.to_path_buf(),
        source,
    })?;
    if meta.len() > limits.max_bytes {
        return Err(LasError::File {
            path: path.to_path_buf(),
            source: FileError::TooLarge {
                bytes: meta.len(),
                limit: limits.max_bytes,
            },
        });
    }
    std::fs::read(path).map_err(|source| LasError::Io {
        path: path.to_path_buf(),
        source,
    })
}

/// Read a LAS file from bytes; `name` is used in errors.
///
/// ```
/// use flowzone::input::las::{read_bytes, ReadOptions};
/// let text = b"~V\n VERS. 2.0 :\n WRAP. NO :\n~W\n STRT.M 1500 :\n STOP.M 1500.5 :\n STEP.M 0.5 :\n NULL. -999.25 :\n~C\n DEPT.M :\n GR.GAPI :\n~A\n1500 35.2\n1500.5 -999.25\n";
/// let las = read_bytes(text, "w.las".as_ref(), ReadOptions::default()).unwrap();
/// assert_eq!(las.index(), &[1500.0, 1500.5]);
/// assert!(las.curve_data("GR").unwrap()[1].is_nan()); // NULL is missing
/// let err = read_bytes(b"~V\n VERS. 4.0 :\n", "x.las".as_ref(), ReadOptions::default()).unwrap_err();
/// assert_eq!(flowzone::error::chain(&err), "x.las:2: LAS version `4.0` is not supported (this reader reads LAS 1.2, 2.0 and 3.x)");
/// ```
pub fn read_bytes(bytes: &[u8], name: &Path, options: ReadOptions) -> Result<LasFile, LasError> {
    Reader {
        name,
        options,
        warnings: Vec::new(),
        repairs: std::collections::BTreeMap::new(),
    }
    .read(bytes)
}

/// Which header section a line belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Section {
    None,
    Version,
    Well,
    Curve,
    Param,
    Other,
    Unknown,
}

/// The header sections as read, before they are checked.
#[derive(Default)]
struct HeaderScan {
    /// Sections met so far: V W C P O A.
    seen: [bool; 6],
    version_items: Vec<HeaderItem>,
    well_items: Vec<HeaderItem>,
    curve_items: Vec<HeaderItem>,
    params: Vec<HeaderItem>,
    other: String,
    /// Where the data start: byte offset, line, the ~A line's title.
    data_start: Option<(usize, usize, String)>,
}

struct Reader<'a> {
    name: &'a Path,
    options: ReadOptions,
    warnings: Vec<Warning>,
    repairs: std::collections::BTreeMap<String, usize>,
}

impl Reader<'_> {
    fn path(&self) -> PathBuf {
        self.name.to_path_buf()
    }

    fn line_err(&self, line: usize, source: LineError) -> LasError {
        LasError::Line {
            path: self.path(),
            line,
            source,
        }
    }

    fn file_err(&self, source: FileError) -> LasError {
        LasError::File {
            path: self.path(),
            source,
        }
    }

    fn warn(&mut self, line: Option<usize>, message: impl Into<String>) {
        self.warnings.push(Warning {
            line,
            message: message.into(),
        });
    }

    /// A repair of a damaged file that is unambiguous (`kind` counts it,
    /// `count` times): a warning with its line, or under `--strict` an error.
    fn repair(
        &mut self,
        line: Option<usize>,
        kind: &str,
        count: usize,
        message: String,
    ) -> Result<(), LasError> {
        if self.options.strict {
            let message = format!("{message} (a repair; refused under --strict)");
            return Err(match line {
                Some(line) => self.line_err(line, LineError::Contradiction(message)),
                None => self.file_err(FileError::Contradiction(message)),
            });
        }
        *self.repairs.entry(kind.to_string()).or_default() += count;
        self.warn(line, message);
        Ok(())
    }

    /// The index direction: a break in it (line, value before, value) is a
    /// contradiction; a decreasing index is reversed to increasing, every
    /// column with it. Whether the rows were reversed.
    fn orient_index(
        &mut self,
        columns: &mut [Vec<f64>],
        first_break: Option<(Option<usize>, f64, f64)>,
    ) -> Result<bool, LasError> {
        if let Some((line, prev, value)) = first_break {
            self.contradiction(
                line,
                format!("index is not monotonic: {value} follows {prev}"),
            )?;
            return Ok(false);
        }
        let index = columns.first().map_or(&[][..], Vec::as_slice);
        if index.len() > 1 && index[0] > index[index.len() - 1] {
            columns.iter_mut().for_each(|c| c.reverse());
            return Ok(true);
        }
        Ok(false)
    }

    /// A header/data contradiction: a warning, or an error in strict mode.
    fn contradiction(&mut self, line: Option<usize>, message: String) -> Result<(), LasError> {
        if self.options.strict {
            return Err(match line {
                Some(line) => self.line_err(line, LineError::Contradiction(message)),
                None => self.file_err(FileError::Contradiction(message)),
            });
        }
        self.warn(line, message);
        Ok(())
    }

    fn read(mut self, bytes: &[u8]) -> Result<LasFile, LasError> {
        let utf16 = utf16_as_utf8(bytes);
        if let Some((_, which)) = &utf16 {
            self.repair(
                None,
                "UTF-16 decoded",
                1,
                format!("the file is UTF-16 ({which}): decoded to text"),
            )?;
        }
        let bytes: &[u8] = utf16.as_ref().map_or(bytes, |(b, _)| b.as_slice());
        let bytes = bytes.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(bytes);
        if bytes.starts_with(b"LASF") {
            return Err(self.file_err(FileError::BinaryLidar));
        }
        if bytes.iter().all(|b| b.is_ascii_whitespace()) {
            return Err(self.file_err(FileError::Empty));
        }
        let normalised = bare_cr_as_newline(bytes);
        if let std::borrow::Cow::Owned(_) = &normalised {
            let n = bytes
                .windows(2)
                .filter(|w| w[0] == b'\r' && w[1] != b'\n')
                .count()
                + usize::from(bytes.last() == Some(&b'\r'));
            self.warn(
                None,
                format!(
                    "{n} line(s) end in a bare CR (classic Mac OS line ends): read as line ends"
                ),
            );
        }
        let bytes: &[u8] = &normalised;
        if v3::declares_v3(bytes) {
            return v3::read(&mut self, bytes);
        }
        let mut head = self.scan_header(bytes)?;
        let (version, wrapped) = self.version_and_wrap(&head)?;
        if !head.seen[1] {
            return Err(self.file_err(FileError::MissingSection('W')));
        }
        if !head.seen[2] {
            return Err(self.file_err(FileError::MissingSection('C')));
        }
        if head.curve_items.is_empty() {
            return Err(self.file_err(FileError::NoCurves));
        }
        let Some((data_pos, data_line, a_title)) = head.data_start.take() else {
            return Err(self.file_err(FileError::MissingSection('A')));
        };

        // LAS 1.2 keeps the ~W value in the description field (except the index
        // and NULL lines): move it to the value.
        if version == Version::V1_2 {
            for item in &mut head.well_items {
                let keep = ["STRT", "STOP", "STEP", "NULL"]
                    .iter()
                    .any(|m| item.mnemonic.eq_ignore_ascii_case(m));
                if !keep && !item.description.is_empty() {
                    std::mem::swap(&mut item.value, &mut item.description);
                }
            }
        }
        let null_value = self.null_value(&head.well_items)?;
        let mut curves = self.unique_curves(std::mem::take(&mut head.curve_items));

        // ~A: the data, up to the next section line (LAS 2.0 puts ~A last),
        // which the parser finds in the same pass
        let rest = &bytes[data_pos.min(bytes.len())..];
        let hint = rows_hint(&head.well_items, rest.len(), curves.len(), wrapped);
        let parse =
            |b: &[u8]| data::parse_data(b, data_line, curves.len(), wrapped, null_value, hint);
        let parsed = match parse(rest) {
            // a short last row (a file cut off while written): dropped, said so
            Err((line, LineError::WrongColumnCount { expected, found }))
                if !wrapped && found < expected =>
            {
                let (data_bytes, trailing) = split_at_next_section(rest);
                match last_line_start(data_bytes, line - data_line) {
                    Some(cut) => {
                        self.repair(
                            Some(line),
                            "short last row dropped",
                            1,
                            format!("the last row has {found} of {expected} values (the file was cut off): dropped"),
                        )?;
                        let mut p =
                            parse(&data_bytes[..cut]).map_err(|(l, e)| self.line_err(l, e))?;
                        p.next_section = trailing.map(|off| {
                            data_line + rest[..off].iter().filter(|&&b| b == b'\n').count()
                        });
                        p
                    }
                    None => {
                        return Err(
                            self.line_err(line, LineError::WrongColumnCount { expected, found })
                        );
                    }
                }
            }
            r => r.map_err(|(line, e)| self.line_err(line, e))?,
        };
        if let Some(line) = parsed.next_section {
            self.warn(
                Some(line),
                "a section follows ~A; LAS 2.0 puts ~A last, so the rest of the file is skipped",
            );
        }
        if let Some((line, text)) = &parsed.scan.first_null_spelling {
            let n = parsed.scan.null_spellings;
            self.repair(
                Some(*line),
                "null spellings read as missing",
                n,
                format!(
                    "{n} value(s) written as a known null spelling (first `{text}`) read as missing"
                ),
            )?;
        }
        if parsed.scan.blank_lines > 0 {
            self.warn(
                None,
                format!(
                    "{} blank line(s) inside ~A skipped",
                    parsed.scan.blank_lines
                ),
            );
        }
        let mut columns = parsed.columns;
        if columns[0].is_empty() {
            return Err(self.file_err(FileError::NoRows));
        }

        let monotonic = parsed.scan.first_break.is_none();
        self.check_a_title(&a_title, &mut curves, data_line - 1, monotonic)?;
        self.check_index_name(&curves)?;

        let break_at = parsed.scan.first_break.map(|(l, p, v)| (Some(l), p, v));
        let index_reversed = self.orient_index(&mut columns, break_at)?;

        let mut file = LasFile {
            version,
            wrapped,
            version_items: head.version_items,
            well_items: head.well_items,
            curves,
            params: head.params,
            other: head.other,
            null_value,
            columns,
            index_reversed,
            warnings: Vec::new(),
            data_sets: Vec::new(),
            repairs: std::collections::BTreeMap::new(),
        };
        self.check_range(&file, parsed.scan.first_break.is_none())?;
        file.warnings = self.warnings;
        file.repairs = self.repairs;
        Ok(file)
    }

    /// Read the header sections line by line up to `~A`, within the limits:
    /// items by section, the ~O text, and where the data start.
    fn scan_header(&mut self, bytes: &[u8]) -> Result<HeaderScan, LasError> {
        let mut head = HeaderScan::default();
        let mut section = Section::None;
        let mut non_utf8: Option<(usize, usize)> = None; // first line, count
        let mut pos = 0usize;
        let mut line_no = 0usize;
        while pos < bytes.len() {
            line_no += 1;
            let limits = self.options.limits;
            if line_no > limits.max_header_lines {
                return Err(self.line_err(
                    line_no,
                    LineError::TooManyHeaderLines {
                        limit: limits.max_header_lines,
                    },
                ));
            }
            let end = memchr_newline(bytes, pos);
            if end - pos > limits.max_header_line_bytes {
                return Err(self.line_err(
                    line_no,
                    LineError::HeaderLineTooLong {
                        bytes: end - pos,
                        limit: limits.max_header_line_bytes,
                    },
                ));
            }
            let raw = &bytes[pos..end];
            let next = (end + 1).min(bytes.len());
            let raw = raw.strip_suffix(b"\r").unwrap_or(raw);
            let text = match std::str::from_utf8(raw) {
                Ok(t) => std::borrow::Cow::Borrowed(t),
                Err(_) => {
                    if let Some(&b) = raw.iter().find(|&&b| b < 0x20 && b != b'\t') {
                        return Err(self.file_err(FileError::BadText {
                            line: line_no,
                            byte: b,
                        }));
                    }
                    non_utf8 = Some(non_utf8.map_or((line_no, 1), |(l, n)| (l, n + 1)));
                    let (decoded, _, _) = encoding_rs::WINDOWS_1252.decode(raw);
                    std::borrow::Cow::Owned(decoded.into_owned())
                }
            };
            let trimmed = text.trim();
            if let Some(title) = trimmed.strip_prefix('~') {
                match self.section_title(title, line_no, &mut head.seen)? {
                    None => {
                        head.data_start = Some((next, line_no + 1, title.trim().to_string()));
                        break;
                    }
                    Some(s) => section = s,
                }
            } else {
                self.header_line(section, &text, line_no, &mut head)?;
            }
            pos = next;
        }
        if let Some((line, count)) = non_utf8 {
            self.warn(
                Some(line),
                format!("{count} header line(s) are not UTF-8; read as Windows-1252"),
            );
        }
        Ok(head)
    }

    /// A `~` line: the section it opens, or `None` for `~A` (the data follow).
    /// A repeated section or a LAS 3.0 section title is an error; an unknown
    /// section is skipped with a warning.
    fn section_title(
        &mut self,
        title: &str,
        line_no: usize,
        seen: &mut [bool; 6],
    ) -> Result<Option<Section>, LasError> {
        let letter = title
            .chars()
            .next()
            .map(|c| c.to_ascii_uppercase())
            .unwrap_or(' ');
        let upper = title.to_ascii_uppercase();
        if upper.contains("_DEFINITION")
            || upper.contains("_DATA")
            || upper.contains("_PARAMETER")
            || upper.contains('|')
        {
            return Err(self.line_err(line_no, LineError::Las3Section(format!("~{title}"))));
        }
        let slot = match letter {
            'V' => Some((0, Section::Version)),
            'W' => Some((1, Section::Well)),
            'C' => Some((2, Section::Curve)),
            'P' => Some((3, Section::Param)),
            'O' => Some((4, Section::Other)),
            'A' => Some((5, Section::None)),
            _ => None,
        };
        match slot {
            Some((i, s)) => {
                if seen[i] {
                    return Err(self.line_err(line_no, LineError::RepeatedSection(letter)));
                }
                seen[i] = true;
                // the version section's title may carry text (a producer banner)
                Ok((letter != 'A').then_some(s))
            }
            None => {
                self.warn(
                    Some(line_no),
                    format!("section `~{title}` is not a LAS 2.0 section; its lines are skipped"),
                );
                Ok(Some(Section::Unknown))
            }
        }
    }

    /// One line inside a header section, into `head`.
    fn header_line(
        &mut self,
        section: Section,
        text: &str,
        line_no: usize,
        head: &mut HeaderScan,
    ) -> Result<(), LasError> {
        let trimmed = text.trim();
        match section {
            Section::Other => {
                head.other.push_str(text);
                head.other.push('\n');
            }
            _ if trimmed.is_empty() => {}
            _ if trimmed.starts_with('#') => {}
            Section::None => {
                self.warn(Some(line_no), "text before the first section is skipped");
            }
            Section::Unknown => {}
            Section::Curve => {
                let clean = text.replace('\t', " ");
                let (item, note) = match header::parse_curve_line(&clean, line_no) {
                    // `.GR  .GAPI : ...` or `   .GAPI : ...`: the ~C line
                    // count settles which column it is; named, and said so
                    Err(LineError::EmptyMnemonic) => {
                        let after = clean.trim_start().trim_start_matches('.');
                        let named = header::parse_curve_line(after, line_no)
                            .ok()
                            .filter(|(i, _)| !i.unit.is_empty() || !i.description.is_empty())
                            .filter(|(i, _)| {
                                after
                                    .find('.')
                                    .is_some_and(|d| !after[..d].trim().is_empty())
                                    && i.mnemonic.chars().all(|c| !c.is_whitespace())
                            });
                        match named {
                            Some((item, note)) => {
                                self.repair(
                                    Some(line_no),
                                    "leading dot stripped from a mnemonic",
                                    1,
                                    format!(
                                        "curve mnemonic `.{}` read as `{}`",
                                        item.mnemonic, item.mnemonic
                                    ),
                                )?;
                                (item, note)
                            }
                            None => {
                                let k = head.curve_items.len() + 1;
                                let split = header::split_header_line(&clean).ok_or_else(|| {
                                    self.line_err(line_no, LineError::CurveLineNoDot)
                                })?;
                                let mut item = header::to_item(&split, line_no);
                                item.mnemonic = format!("UNKNOWN_{k}");
                                self.repair(
                                    Some(line_no),
                                    "empty mnemonic named",
                                    1,
                                    format!("curve {k} has no mnemonic: named UNKNOWN_{k}"),
                                )?;
                                (item, split.note)
                            }
                        }
                    }
                    r => r.map_err(|e| self.line_err(line_no, e))?,
                };
                if note == header::SplitNote::UnitWithSpace {
                    self.warn(
                        Some(line_no),
                        format!(
                            "unit of {} read as `{}` (a unit written with a space)",
                            item.mnemonic, item.unit
                        ),
                    );
                }
                if head.curve_items.len() >= self.options.limits.max_curves {
                    return Err(self.line_err(
                        line_no,
                        LineError::TooManyCurves {
                            limit: self.options.limits.max_curves,
                        },
                    ));
                }
                head.curve_items.push(item);
            }
            Section::Version | Section::Well | Section::Param => {
                let clean = text.replace('\t', " ");
                match header::split_header_line(&clean) {
                    Some(split) if !split.mnemonic.is_empty() => {
                        let item = header::to_item(&split, line_no);
                        match section {
                            Section::Version => head.version_items.push(item),
                            Section::Well => head.well_items.push(item),
                            _ => head.params.push(item),
                        }
                    }
                    _ if section == Section::Version => {
                        return Err(self.line_err(line_no, LineError::VersionLineNoDot));
                    }
                    _ => self.warn(
                        Some(line_no),
                        format!("header line `{trimmed}` has no `MNEM.` part; skipped"),
                    ),
                }
            }
        }
        Ok(())
    }

    /// ~V: the version (1.2 or 2.0) and whether the data are wrapped.
    fn version_and_wrap(&mut self, head: &HeaderScan) -> Result<(Version, bool), LasError> {
        if !head.seen[0] {
            return Err(self.file_err(FileError::MissingSection('V')));
        }
        let vers = head
            .version_items
            .iter()
            .find(|i| i.mnemonic.eq_ignore_ascii_case("VERS"));
        let version = match vers.map(|v| (v, v.value.parse::<f64>())) {
            Some((_, Ok(v))) if (v - 1.2).abs() < 1e-9 => Version::V1_2,
            Some((_, Ok(v))) if (v - 2.0).abs() < 1e-9 => Version::V2_0,
            // 2.1 and the like: no such version; the sections are 2.0's
            Some((item, Ok(v))) if (2.0..3.0).contains(&v) => {
                let (line, text) = (item.line, item.value.clone());
                self.repair(
                    Some(line),
                    "2.x version read as 2.0",
                    1,
                    format!("VERS {text} is no CWLS version: read as LAS 2.0"),
                )?;
                Version::V2_0
            }
            Some((item, _)) => {
                return Err(
                    self.line_err(item.line, LineError::UnsupportedVersion(item.value.clone()))
                );
            }
            None => {
                self.repair(
                    None,
                    "missing VERS inferred",
                    1,
                    "~V has no VERS line: read as LAS 2.0".into(),
                )?;
                Version::V2_0
            }
        };
        let wrap = head
            .version_items
            .iter()
            .find(|i| i.mnemonic.eq_ignore_ascii_case("WRAP"));
        let Some(wrap) = wrap else {
            self.repair(
                None,
                "missing WRAP inferred",
                1,
                "~V has no WRAP line: read as unwrapped (one line per depth step); a wrapped file then fails at its first row".into(),
            )?;
            return Ok((version, false));
        };
        let wrapped = match wrap.value.to_ascii_uppercase().as_str() {
            "YES" => true,
            "NO" => false,
            _ => return Err(self.line_err(wrap.line, LineError::BadWrap(wrap.value.clone()))),
        };
        Ok((version, wrapped))
    }

    /// ~W NULL: the missing-value marker, `None` (with a warning) when the
    /// file declares none; a warning too when real logs could take it.
    fn null_value(&mut self, well_items: &[HeaderItem]) -> Result<Option<f64>, LasError> {
        let item = well_items
            .iter()
            .find(|i| i.mnemonic.eq_ignore_ascii_case("NULL"));
        let Some(item) = item.filter(|i| !i.value.is_empty()) else {
            self.warn(
                None,
                "~W declares no NULL value; only NaN is read as missing",
            );
            return Ok(None);
        };
        let v = item
            .value
            .parse::<f64>()
            .ok()
            .filter(|v| v.is_finite())
            .ok_or_else(|| {
                self.line_err(
                    item.line,
                    LineError::BadHeaderNumber {
                        mnemonic: "NULL".into(),
                        text: item.value.clone(),
                    },
                )
            })?;
        // a NULL that real logs take (0 for SP or porosity, 1 for a ratio)
        // turns true readings into gaps; the usual values are -999.25, -9999
        // and the like (common practice)
        if v.abs() < PLAUSIBLE_NULL_MIN_ABS {
            self.warn(
                Some(item.line),
                format!(
                    "NULL is {v}, a value real logs take: every sample equal to it is read as missing; check the file's NULL"
                ),
            );
        }
        Ok(Some(v))
    }

    /// Make mnemonics unique: the first keeps its name, repeats get `_2`, `_3`...
    fn unique_curves(&mut self, items: Vec<HeaderItem>) -> Vec<CurveInfo> {
        let mut curves: Vec<CurveInfo> = Vec::with_capacity(items.len());
        for item in items {
            let mut name = item.mnemonic.clone();
            let mut k = 1;
            while curves
                .iter()
                .any(|c| c.mnemonic.eq_ignore_ascii_case(&name))
            {
                k += 1;
                name = format!("{}_{k}", item.mnemonic);
            }
            if name != item.mnemonic {
                self.warn(
                    Some(item.line),
                    format!(
                        "curve {} appears again; this one is named {name}",
                        item.mnemonic
                    ),
                );
            }
            curves.push(CurveInfo {
                mnemonic: name,
                original_mnemonic: item.mnemonic,
                unit: item.unit,
                api_code: item.value,
                description: item.description,
                line: item.line,
            });
        }
        curves
    }

    /// The `~A` line may repeat the curve names; when it does (two or more
    /// words after the section word), they must agree with ~C. When they
    /// name every ~C curve once in another order that puts the index first
    /// where ~C does not, and the data's first column is monotonic as an
    /// index is (real files list DEPT last in ~C while the title and the data
    /// put depth first), the title and the data outvote ~C: a contradiction,
    /// refused under `--strict`, else the curves are labelled in the title's
    /// order with a warning saying so. Any other disagreement is reported
    /// and ~C's order kept (the data cannot tell which is right). A title
    /// whose first word is not the first curve, and that is no such
    /// reordering, is a label. Index names (DEPT, DEPTH, ...) match each other.
    fn check_a_title(
        &mut self,
        title: &str,
        curves: &mut Vec<CurveInfo>,
        line: usize,
        first_column_monotonic: bool,
    ) -> Result<(), LasError> {
        let strip = |s: &str| s.split('[').next().unwrap_or(s).to_ascii_uppercase();
        let is_index = |m: &str| INDEX_MNEMONICS.iter().any(|x| m.eq_ignore_ascii_case(x));
        let matches = |n: &str, c: &CurveInfo| {
            n.eq_ignore_ascii_case(&c.original_mnemonic)
                || strip(n) == c.original_mnemonic.to_ascii_uppercase()
                || (is_index(&strip(n)) && is_index(&c.original_mnemonic))
        };
        let names: Vec<&str> = title.split_whitespace().skip(1).collect();
        if names.len() < 2 {
            return Ok(());
        }
        if names.len() == curves.len() {
            // the ~C curve each title word names, each curve used once
            let mut used = vec![false; curves.len()];
            let order: Option<Vec<usize>> = names
                .iter()
                .map(|n| {
                    let i = (0..curves.len()).find(|&i| !used[i] && matches(n, &curves[i]))?;
                    used[i] = true;
                    Some(i)
                })
                .collect();
            let index_moved = |o: &Vec<usize>| {
                o[0] != 0 && is_index(&curves[o[0]].original_mnemonic) && first_column_monotonic
            };
            if let Some(order) = order.filter(index_moved) {
                let message = format!(
                    "~A line names the curves in another order than ~C ({}), with the index first as the data have it; read in the ~A line's order",
                    names.join(" ")
                );
                self.contradiction(Some(line), message)?;
                let mut old: Vec<Option<CurveInfo>> =
                    std::mem::take(curves).into_iter().map(Some).collect();
                *curves = order.iter().filter_map(|&i| old[i].take()).collect();
                return Ok(());
            }
        }
        if !matches(names[0], &curves[0]) {
            return Ok(());
        }
        if names.len() != curves.len() {
            let message = format!(
                "~A line names {} columns but ~C declares {} curves",
                names.len(),
                curves.len()
            );
            self.contradiction(Some(line), message)?;
        } else if let Some((k, (n, c))) = names
            .iter()
            .zip(curves.iter())
            .enumerate()
            .find(|(_, (n, c))| !matches(n, c))
        {
            let message = format!(
                "~A line names column {} `{n}` where ~C declares `{}`",
                k + 1,
                c.original_mnemonic
            );
            self.contradiction(Some(line), message)?;
        }
        Ok(())
    }

    fn check_index_name(&mut self, curves: &[CurveInfo]) -> Result<(), LasError> {
        let first = &curves[0];
        let is_index = INDEX_MNEMONICS
            .iter()
            .any(|m| first.original_mnemonic.eq_ignore_ascii_case(m));
        if !is_index {
            if let Some(c) = curves.iter().skip(1).find(|c| {
                INDEX_MNEMONICS
                    .iter()
                    .any(|m| c.original_mnemonic.eq_ignore_ascii_case(m))
            }) {
                self.contradiction(
                    Some(c.line),
                    format!("index curve {} is not first in ~C; the first curve, {}, is used as the index", c.mnemonic, first.mnemonic),
                )?;
            } else {
                self.warn(Some(first.line), format!("first curve {} is not a usual index mnemonic (DEPT, DEPTH, TIME, INDEX); used as the index", first.mnemonic));
            }
        }
        Ok(())
    }

    /// STRT, STOP and STEP against the index column.
    fn check_range(&mut self, file: &LasFile, monotonic: bool) -> Result<(), LasError> {
        let index = file.index();
        let n = index.len();
        let number = |m: &str| {
            file.well_item(m)
                .map(|i| (i.line, i.value.trim().parse::<f64>()))
        };
        // in file order: first and last as written
        let (first, last) = if file.index_reversed {
            (index[n - 1], index[0])
        } else {
            (index[0], index[n - 1])
        };
        let spacing = median_step(index);
        let step_tol = spacing.abs().max(1e-6) * 0.5;
        for (m, actual) in [("STRT", first), ("STOP", last)] {
            match number(m) {
                Some((line, Ok(v))) => {
                    let tol = step_tol.max(1e-6 * v.abs());
                    if (v - actual).abs() > tol {
                        self.contradiction(
                            Some(line),
                            format!(
                                "{m} is {v} but the index {} at {actual}",
                                if m == "STRT" { "starts" } else { "ends" }
                            ),
                        )?;
                    }
                }
                Some((line, Err(_))) => self.warn(Some(line), format!("{m} is not a number")),
                None => self.warn(None, format!("~W has no {m}")),
            }
        }
        if n < 2 || !monotonic {
            return Ok(());
        }
        let (min_d, max_d) = step_range(index);
        match number("STEP") {
            Some((line, Ok(step))) if step != 0.0 => {
                let written = if file.index_reversed {
                    -spacing
                } else {
                    spacing
                };
                if (step - written).abs() > 1e-3 * step.abs().max(1e-9) {
                    self.contradiction(
                        Some(line),
                        format!("STEP is {step} but the index steps by {written}"),
                    )?;
                } else if (max_d - min_d) > 0.01 * spacing.abs() {
                    self.contradiction(
                        Some(line),
                        format!(
                            "STEP is {step} but the index spacing varies from {min_d} to {max_d}"
                        ),
                    )?;
                }
            }
            Some((_, Ok(_))) => {} // STEP 0 declares irregular spacing
            Some((line, Err(_))) => self.warn(Some(line), "STEP is not a number"),
            None => self.warn(None, "~W has no STEP"),
        }
        Ok(())
    }
}

/// A UTF-16 file as UTF-8 bytes, with how it was recognised: by its
/// byte-order mark, or by zero bytes in every other place of its first 200
/// bytes (LAS text is ASCII, whose UTF-16 form has a zero high byte).
/// `None` for anything else.
fn utf16_as_utf8(bytes: &[u8]) -> Option<(Vec<u8>, &'static str)> {
    let (enc, which, body) = if let Some(b) = bytes.strip_prefix(b"\xFF\xFE") {
        (encoding_rs::UTF_16LE, "little-endian, byte-order mark", b)
    } else if let Some(b) = bytes.strip_prefix(b"\xFE\xFF") {
        (encoding_rs::UTF_16BE, "big-endian, byte-order mark", b)
    } else {
        let head = &bytes[..bytes.len().min(200)];
        let zeros = |parity: usize| {
            head.iter()
                .skip(parity)
                .step_by(2)
                .filter(|&&b| b == 0)
                .count()
        };
        let half = head.len() / 2;
        if half >= 8 && zeros(1) * 10 >= half * 9 && zeros(0) == 0 {
            (
                encoding_rs::UTF_16LE,
                "little-endian, no byte-order mark",
                bytes,
            )
        } else if half >= 8 && zeros(0) * 10 >= half * 9 && zeros(1) == 0 {
            (
                encoding_rs::UTF_16BE,
                "big-endian, no byte-order mark",
                bytes,
            )
        } else {
            return None;
        }
    };
    let (text, _) = enc.decode_without_bom_handling(body);
    Some((text.into_owned().into_bytes(), which))
}

/// Where line `k` (0-based) of `bytes` starts, when it is the last line
/// holding anything but white space; `None` otherwise.
fn last_line_start(bytes: &[u8], k: usize) -> Option<usize> {
    let mut start = 0;
    for _ in 0..k {
        start += bytes[start..].iter().position(|&b| b == b'\n')? + 1;
    }
    let end = bytes[start..]
        .iter()
        .position(|&b| b == b'\n')
        .map_or(bytes.len(), |n| start + n);
    bytes[end..]
        .iter()
        .all(u8::is_ascii_whitespace)
        .then_some(start)
}

/// The file with every bare CR (one not followed by LF) turned into LF, so
/// that lines end at `\n`, `\r\n` or a lone `\r` alike; borrowed when the
/// file has none (the usual case: no copy).
fn bare_cr_as_newline(bytes: &[u8]) -> std::borrow::Cow<'_, [u8]> {
    let bare = |i: usize| bytes[i] == b'\r' && bytes.get(i + 1) != Some(&b'\n');
    // memchr: most files have no CR at all, and CRLF files one per line
    if !memchr::memchr_iter(b'\r', bytes).any(bare) {
        return std::borrow::Cow::Borrowed(bytes);
    }
    std::borrow::Cow::Owned(
        (0..bytes.len())
            .map(|i| if bare(i) { b'\n' } else { bytes[i] })
            .collect(),
    )
}

/// End of the line starting at `pos` (position of `\n`, or the buffer length).
fn memchr_newline(bytes: &[u8], pos: usize) -> usize {
    memchr::memchr(b'\n', &bytes[pos..]).map_or(bytes.len(), |n| pos + n)
}

/// Split ~A bytes at the first line that starts a new section (`~` first
/// non-blank). Only for a short last row's repair: the parser finds the
/// section itself.
fn split_at_next_section(rest: &[u8]) -> (&[u8], Option<usize>) {
    let mut pos = 0;
    while pos < rest.len() {
        let mut p = pos;
        while p < rest.len() && (rest[p] == b' ' || rest[p] == b'\t') {
            p += 1;
        }
        if p < rest.len() && rest[p] == b'~' {
            return (&rest[..pos], Some(pos));
        }
        pos = memchr_newline(rest, pos) + 1;
    }
    (rest, None)
}

/// Expected number of rows, to size the column vectors once. STRT, STOP and
/// STEP give it when they agree with the data section's size: every value
/// takes at least two bytes (a digit and a separator), so a header that
/// claims more rows than the bytes can hold (damaged, or hostile) cannot
/// make the reader reserve memory the file does not need.
fn rows_hint(well: &[HeaderItem], data_len: usize, n_curves: usize, wrapped: bool) -> usize {
    let most_rows = data_len / (2 * n_curves.max(1)) + 1;
    let get = |m: &str| {
        well.iter()
            .find(|i| i.mnemonic.eq_ignore_ascii_case(m))
            .and_then(|i| i.value.parse::<f64>().ok())
    };
    if let (Some(a), Some(b), Some(s)) = (get("STRT"), get("STOP"), get("STEP")) {
        if s != 0.0 {
            let n = ((b - a) / s).round();
            if (0.0..1e8).contains(&n) {
                return (n as usize + 1).min(most_rows);
            }
        }
    }
    // about 10 bytes per value
    let per_row = (n_curves * 10 + if wrapped { 8 } else { 1 }).max(1);
    data_len / per_row + 1
}

/// Median of the index steps (0 for fewer than two rows).
pub fn median_step(index: &[f64]) -> f64 {
    if index.len() < 2 {
        return 0.0;
    }
    let mut d: Vec<f64> = index.windows(2).map(|w| w[1] - w[0]).collect();
    let mid = d.len() / 2;
    d.select_nth_unstable_by(mid, f64::total_cmp);
    d[mid]
}

/// Smallest and largest index step.
pub fn step_range(index: &[f64]) -> (f64, f64) {
    index
        .windows(2)
        .map(|w| w[1] - w[0])
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), d| {
            (lo.min(d), hi.max(d))
        })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn items(strt: &str, stop: &str, step: &str) -> Vec<HeaderItem> {
        [("STRT", strt), ("STOP", stop), ("STEP", step)]
            .into_iter()
            .enumerate()
            .map(|(k, (m, v))| HeaderItem {
                mnemonic: m.into(),
                unit: "M".into(),
                value: v.into(),
                description: String::new(),
                line: k + 1,
            })
            .collect()
    }

    /// LAS 2.0 puts ~A last (CWLS LAS 2.0, section ~A). A section after it
    /// ends the data, found in the same pass as the numbers: the rows before
    /// it are read, the rest is skipped with a warning naming the section's
    /// line, also when the last row before it is short and dropped.
    #[test]
    fn a_section_after_the_data_ends_it_with_a_warning_on_its_line() {
        let head = "~V\n VERS. 2.0 :\n WRAP. NO :\n~W\n NULL. -999.25 :\n~C\n DEPT.M :\n GR.GAPI :\n~A DEPT GR\n";
        let read = |tail: &str| {
            let text = format!("{head}{tail}");
            read_bytes(text.as_bytes(), Path::new("t.las"), ReadOptions::default()).expect("read")
        };
        let warned_at = |f: &LasFile, line: usize| {
            f.warnings
                .iter()
                .any(|w| w.line == Some(line) && w.to_string().contains("a section follows ~A"))
        };
        // lines 10-11 are data, line 12 the section
        let f = read("100 1\n101 2\n  ~O other\n 7 8\n");
        assert_eq!(f.columns[1], vec![1.0, 2.0]);
        assert!(warned_at(&f, 12), "{:?}", f.warnings);
        // a short row before the section: dropped, and the section still named
        let f = read("100 1\n101 2\n102\n~O other\n");
        assert_eq!(f.columns[0], vec![100.0, 101.0]);
        assert!(warned_at(&f, 13), "{:?}", f.warnings);
        // no section: no such warning
        let f = read("100 1\n101 2\n");
        assert!(
            f.warnings
                .iter()
                .all(|w| !w.to_string().contains("section follows"))
        );
    }

    /// The hint sizes every curve's column. An honest header gives the row
    /// count exactly; a header claiming more rows than the data section's
    /// bytes can hold (two bytes a value at least) gets what the bytes allow:
    /// found by fuzzing the SPWLA reader, whose value count went straight to
    /// an allocation the same way (common practice: never size a buffer by
    /// an untrusted count).
    #[test]
    fn rows_hint_trusts_the_header_only_as_far_as_the_bytes_go() {
        let data = "1000 1\n1000.5 2\n1001 3\n";
        assert_eq!(
            rows_hint(&items("1000", "1001", "0.5"), data.len(), 2, false),
            3
        );
        // 10 million rows claimed over 2 000 curves: 160 GB if believed
        let hint = rows_hint(&items("0", "9999999", "1"), 100, 2000, false);
        assert_eq!(hint, 1);
        // no usable STEP: the byte estimate (about 10 bytes a value)
        assert_eq!(
            rows_hint(&items("0", "10", "0"), 2100, 2, false),
            2100 / 21 + 1
        );
    }
}
