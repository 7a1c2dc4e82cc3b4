//! Reading the project's CSV inputs (zone tops, surveys, and later core,
//! capillary-pressure and pressure tables) with the `csv` crate, with errors
//! that name the file, the line and the column.

use std::path::{Path, PathBuf};

use serde::de::DeserializeOwned;

/// An error reading a CSV input.
#[derive(Debug, thiserror::Error)]
pub enum TableError {
    /// The file cannot be opened.
    #[error("cannot read `{}`", .path.display())]
    Io {
        /// The CSV file.
        path: PathBuf,
        /// The I/O error.
        #[source]
        source: std::io::Error,
    },
    /// The header or a row cannot be read, or a row holds a missing or bad value.
    #[error("{}:{line}: {message}", .path.display())]
    Row {
        /// The CSV file.
        path: PathBuf,
        /// 1-based line of the row (1 for the header; 0 when the reader gives no position).
        line: u64,
        /// What is wrong, naming the 1-based column where known.
        message: String,
    },
}

/// Read every row of a CSV file with a header line into `T`; each row comes
/// with its 1-based line number. Column names are matched exactly (serde
/// renames give the header names); a missing column or a bad value is an
/// error naming the line.
pub fn read_csv<T: DeserializeOwned>(path: &Path) -> Result<Vec<(u64, T)>, TableError> {
    let file = std::fs::File::open(path).map_err(|source| TableError::Io {
        path: path.to_path_buf(),
        source,
    })?;
    let mut reader = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .comment(Some(b'#'))
        .from_reader(file);
    let row_err = |line: u64, message: String| TableError::Row {
        path: path.to_path_buf(),
        line,
        message,
    };
    let headers = reader
        .headers()
        .map_err(|e| row_err(1, e.to_string()))?
        .clone();
    let mut rows = Vec::new();
    for record in reader.records() {
        let record = record
            .map_err(|e| row_err(e.position().map_or(0, csv::Position::line), e.to_string()))?;
        let line = record.position().map_or(0, csv::Position::line);
        let row = record.deserialize::<T>(Some(&headers)).map_err(|e| {
            let message = match e.kind() {
                csv::ErrorKind::Deserialize { err, .. } => match err.field() {
                    Some(k) => format!("column {}: {}", k + 1, err.kind()),
                    None => err.kind().to_string(),
                },
                _ => e.to_string(),
            };
            row_err(line, message)
        })?;
        rows.push((line, row));
    }
    Ok(rows)
}
