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
    BadNumber { column: usize, text: String },
    /// An infinite value in ~A (NaN is accepted as missing; infinity is not data).
    #[error("value {column} of the row, `{text}`, is infinite")]
    Infinite { column: usize, text: String },
    /// An unwrapped row with the wrong number of values.
    #[error("row has {found} values, ~C declares {expected} curves")]
    WrongColumnCount { expected: usize, found: usize },
    /// In wrapped data a line runs past the end of its depth step.
    #[error(
        "wrapped row overflows: {found} values so far, ~C declares {expected} curves per depth step"
    )]
    WrappedOverflow { expected: usize, found: usize },
    /// The file ends part-way through a wrapped depth step.
    #[error("file ends inside a wrapped depth step that starts here: {found} of {expected} values")]
    TruncatedStep { expected: usize, found: usize },
    /// A byte that cannot start a number in the ASCII data section.
    #[error("byte 0x{byte:02X} is not allowed in ~A (numbers separated by spaces expected)")]
    BadByte { byte: u8 },
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
    #[error(
        "LAS version `{0}` is not supported (this reader reads LAS 1.2 and 2.0; LAS 3.0 is not supported yet)"
    )]
    UnsupportedVersion(String),
    /// WRAP is neither YES nor NO.
    #[error("WRAP is `{0}`, expected YES or NO")]
    BadWrap(String),
    /// A header number (NULL) that does not parse as a finite number: a NULL
    /// of `nan` would null nothing, one of `inf` every sample.
    #[error("{mnemonic} value `{text}` is not a finite number")]
    BadHeaderNumber { mnemonic: String, text: String },
    /// A section that LAS 2.0 allows once appears again.
    #[error("section ~{0} appears a second time")]
    RepeatedSection(char),
    /// The header contradicts the data (an error only in strict mode).
    #[error("{0}")]
    Contradiction(String),
    /// A LAS 3.0 section name in a file that does not declare 3.0.
    #[error("section `{0}` is a LAS 3.0 data-set section; LAS 3.0 is not supported yet")]
    Las3Section(String),

    #[error(
        "header line is {bytes} bytes long, above the limit of {limit} ([input] max-header-line-bytes)"
    )]
    HeaderLineTooLong { bytes: usize, limit: usize },

    #[error("the header runs past {limit} lines with no ~A section ([input] max-header-lines)")]
    TooManyHeaderLines { limit: usize },

    #[error("~C declares more than {limit} curves ([input] max-curves)")]
    TooManyCurves { limit: usize },
}

/// What is wrong with a file as a whole.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FileError {
    #[error("file is empty")]
    Empty,
    #[error("file is a binary LiDAR LAS file (`LASF` signature), not a well-log LAS file")]
    BinaryLidar,
    #[error("no ~{0} section")]
    MissingSection(char),
    #[error("~V has no VERS line")]
    MissingVersion,
    #[error("~V has no WRAP line")]
    MissingWrap,
    #[error("~C declares no curves")]
    NoCurves,
    #[error("~A holds no data rows")]
    NoRows,
    #[error("{0}")]
    Contradiction(String),
    #[error("byte 0x{byte:02X} at line {line} is neither UTF-8 nor printable Windows-1252 text")]
    BadText { line: usize, byte: u8 },
    #[error("file is {bytes} bytes, above the limit of {limit} bytes ([input] max-file-mb)")]
    TooLarge { bytes: u64, limit: u64 },
}

/// An error reading a LAS file: the file, where in it, and what.
#[derive(Debug, thiserror::Error)]
pub enum LasError {
    #[error("cannot read `{}`", .path.display())]
    Io {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
    #[error("{}:{line}", .path.display())]
    Line {
        path: PathBuf,
        line: usize,
        #[source]
        source: LineError,
    },
    #[error("{}", .path.display())]
    File {
        path: PathBuf,
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
