//! Errors of the LAS reader, in two layers.
//!
//! [`LineError`] says what is wrong with one line and knows nothing of files or
//! line numbers; [`FileError`] says what is wrong with a file as a whole; the
//! reader wraps either in [`LasError`], which adds the file name and, for a line
//! error, the 1-based line number. Messages are lower case with no final period
//! and never repeat the text of their cause.

use std::path::PathBuf;

/// What is wrong with a single line of a LAS file.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum LineError {
    /// A token in ~A is not a number.
    #[error("value {column} of the row, `{text}`, is not a number")]
    BadNumber {
        /// 1-based position of the value in its row (in wrapped data, in its depth step).
        column: usize,
        /// The token as written, cut to 40 characters.
        text: String,
    },
    /// An infinite value in ~A (NaN is accepted as missing; infinity is not data).
    #[error("value {column} of the row, `{text}`, is infinite")]
    Infinite {
        /// 1-based position of the value in its row (in wrapped data, in its depth step).
        column: usize,
        /// The token as written, cut to 40 characters.
        text: String,
    },
    /// An unwrapped row with the wrong number of values.
    #[error("row has {found} values, ~C declares {expected} curves")]
    WrongColumnCount {
        /// Number of curves ~C declares.
        expected: usize,
        /// Number of values on the row, counted to the end of the line.
        found: usize,
    },
    /// In wrapped data a line runs past the end of its depth step.
    #[error(
        "wrapped row overflows: {found} values so far, ~C declares {expected} curves per depth step"
    )]
    WrappedOverflow {
        /// Number of curves ~C declares, so values per depth step.
        expected: usize,
        /// Values of the depth step up to the end of this line.
        found: usize,
    },
    /// The file ends part-way through a wrapped depth step.
    #[error("file ends inside a wrapped depth step that starts here: {found} of {expected} values")]
    TruncatedStep {
        /// Number of curves ~C declares, so values per depth step.
        expected: usize,
        /// Values the last depth step holds when the file ends.
        found: usize,
    },
    /// A byte that cannot start a number in the ASCII data section.
    #[error("byte 0x{byte:02X} is not allowed in ~A (numbers separated by spaces expected)")]
    BadByte {
        /// The offending byte: non-ASCII or an ASCII control byte.
        byte: u8,
    },
    /// A row whose index (first column) is NaN or the NULL value.
    #[error(
        "the index (first column) has no value on this row (`{text}`): a row without a depth cannot be placed"
    )]
    MissingIndex {
        /// The index token as written, cut to 40 characters.
        text: String,
    },
    /// A ~C line without the dot that ends the mnemonic.
    #[error(
        "curve line has no `.` after the mnemonic (expected `MNEM.UNIT  API CODE : DESCRIPTION`)"
    )]
    CurveLineNoDot,
    /// A ~C line with an empty mnemonic.
    #[error("curve line has an empty mnemonic")]
    EmptyMnemonic,
    /// A ~V line is missing or unreadable.
    #[error("~V line has no `.` after the mnemonic (expected `VERS.  2.0 : ...`)")]
    VersionLineNoDot,
    /// VERS names a version this reader does not read.
    #[error("LAS version `{0}` is not supported (this reader reads LAS 1.2, 2.0 and 3.x)")]
    UnsupportedVersion(String),
    /// WRAP is neither YES nor NO.
    #[error("WRAP is `{0}`, expected YES or NO")]
    BadWrap(String),
    /// A header number (NULL) that does not parse as a finite number: a NULL
    /// of `nan` would null nothing, one of `inf` every sample.
    #[error("{mnemonic} value `{text}` is not a finite number")]
    BadHeaderNumber {
        /// The ~W mnemonic whose value is bad (`NULL`).
        mnemonic: String,
        /// The value as written in the header.
        text: String,
    },
    /// A section that LAS 2.0 allows once appears again.
    #[error("section ~{0} appears a second time")]
    RepeatedSection(char),
    /// The header contradicts the data (an error only in strict mode).
    #[error("{0}")]
    Contradiction(String),
    /// LAS 3.0 that flowzone does not read yet, with the spec's section.
    #[error("{0}")]
    Las3(String),
    /// A LAS 3.0 section name in a file that does not declare 3.0.
    #[error("section `{0}` is a LAS 3.0 data-set section; LAS 3.0 is not supported yet")]
    Las3Section(String),

    /// A line before ~A is longer than `[input] max-header-line-bytes` allows.
    #[error(
        "header line is {bytes} bytes long, above the limit of {limit} ([input] max-header-line-bytes)"
    )]
    HeaderLineTooLong {
        /// Length of the line in bytes, without its `\n`.
        bytes: usize,
        /// The configured limit, bytes.
        limit: usize,
    },

    /// More lines than `[input] max-header-lines` allows come before ~A.
    #[error("the header runs past {limit} lines with no ~A section ([input] max-header-lines)")]
    TooManyHeaderLines {
        /// The configured limit, lines.
        limit: usize,
    },

    /// ~C declares more curves than `[input] max-curves` allows.
    #[error("~C declares more than {limit} curves ([input] max-curves)")]
    TooManyCurves {
        /// The configured limit, curves.
        limit: usize,
    },
}

/// What is wrong with a file as a whole.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FileError {
    /// The file holds only white space (after any UTF-8 byte-order mark).
    #[error("file is empty")]
    Empty,
    /// A LAS 3.0 file without any data set.
    #[error(
        "LAS 3.0 file has {0}: no log data set (~Log_Data or ~ASCII) to read curves from ('~ASCII or ~Log_Data', p. 18)"
    )]
    Las3NoLog(String),
    /// The file starts with `LASF`: a LiDAR point cloud, not a well log.
    #[error("file is a binary LiDAR LAS file (`LASF` signature), not a well-log LAS file")]
    BinaryLidar,
    /// A required section is absent; holds its letter (`V`, `W`, `C` or `A`).
    #[error("no ~{0} section")]
    MissingSection(char),
    /// ~V has no VERS item, so the version is unknown.
    #[error("~V has no VERS line")]
    MissingVersion,
    /// ~V has no WRAP item, so the layout of ~A is unknown.
    #[error("~V has no WRAP line")]
    MissingWrap,
    /// ~C is present but declares no curve.
    #[error("~C declares no curves")]
    NoCurves,
    /// ~A is present but holds no data row.
    #[error("~A holds no data rows")]
    NoRows,
    /// The header contradicts the data, not at one line (an error only in
    /// strict mode); holds the message.
    #[error("{0}")]
    Contradiction(String),
    /// A line that is not UTF-8 holds a control byte, so it is not
    /// Windows-1252 text either.
    #[error("byte 0x{byte:02X} at line {line} is neither UTF-8 nor printable Windows-1252 text")]
    BadText {
        /// 1-based line number of the line.
        line: usize,
        /// The first control byte (other than tab) on the line.
        byte: u8,
    },
    /// The file is larger than `[input] max-file-mb` allows; it is not read.
    #[error("file is {bytes} bytes, above the limit of {limit} bytes ([input] max-file-mb)")]
    TooLarge {
        /// Size of the file, bytes.
        bytes: u64,
        /// The configured limit, bytes.
        limit: u64,
    },
}

/// An error reading a LAS file: the file, where in it, and what.
#[derive(Debug, thiserror::Error)]
pub enum LasError {
    /// The file (or its metadata) could not be read.
    #[error("cannot read `{}`", .path.display())]
    Io {
        /// The file, as the caller named it.
        path: PathBuf,
        /// The I/O error.
        #[source]
        source: std::io::Error,
    },
    /// One line of the file is wrong.
    #[error("{}:{line}", .path.display())]
    Line {
        /// The file, as the caller named it.
        path: PathBuf,
        /// 1-based number of the line at fault.
        line: usize,
        /// What is wrong with the line.
        #[source]
        source: LineError,
    },
    /// The file as a whole is wrong.
    #[error("{}", .path.display())]
    File {
        /// The file, as the caller named it.
        path: PathBuf,
        /// What is wrong with the file.
        #[source]
        source: FileError,
    },
}

impl LasError {
    /// The file the error is about, as the caller named it.
    pub fn path(&self) -> &std::path::Path {
        match self {
            LasError::Io { path, .. }
            | LasError::Line { path, .. }
            | LasError::File { path, .. } => path,
        }
    }

    /// The 1-based line number, where the error is about one line.
    pub fn line(&self) -> Option<usize> {
        match self {
            LasError::Line { line, .. } => Some(*line),
            _ => None,
        }
    }
}

/// Something the reader accepted but a user should know: a contradiction between
/// header and data, a fallback rule that was applied, a renamed curve.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Warning {
    /// 1-based line number the warning is about, when it is about one line.
    pub line: Option<usize>,
    /// The warning text, lower case, without the line number.
    pub message: String,
}

impl std::fmt::Display for Warning {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.line {
            Some(line) => write!(f, "line {line}: {}", self.message),
            None => f.write_str(&self.message),
        }
    }
}
