//! Depth-indexed tables and how they are written: CSV and Parquet (polars),
//! LAS 2.0 (the crate's own writer).
//!
//! Every write goes to a temporary file in the target folder that is renamed
//! into place when complete, so an interrupted run never leaves a half-written
//! file under a final name. Missing samples are an empty CSV field, a Parquet
//! null and the NULL value in LAS.

pub mod las;
pub(crate) mod manifest;
pub(crate) mod messages;
pub(crate) mod numfmt;
pub mod parquet;
pub mod schema;
pub mod written;

use std::fs::File;
use std::io::{BufWriter, Write};
use std::path::{Path, PathBuf};

use polars::prelude::{CsvWriter, DataFrame, ParquetCompression, ParquetWriter, SerWriter};

use crate::config::Format;
use crate::input::las::{CurveInfo, HeaderItem};
use crate::output::schema::Col;
use crate::units::DepthUnit;

/// An error writing an output file.
#[derive(Debug, thiserror::Error)]
pub enum OutputError {
    /// Writing, flushing or renaming an output file failed, or reading a
    /// file being copied into the output.
    #[error("cannot write `{}`", .path.display())]
    Io {
        /// The output file by its final name, or the source of a copy.
        path: PathBuf,
        /// The I/O error.
        #[source]
        source: std::io::Error,
    },
    /// polars could not build the table or write it as CSV or Parquet.
    #[error("cannot write `{}`", .path.display())]
    Table {
        /// The output file by its final name.
        path: PathBuf,
        /// The polars error.
        #[source]
        source: polars::error::PolarsError,
    },
}

/// One output column.
#[derive(Debug, Clone)]
pub struct OutColumn {
    /// Which curve of the column set this is; `None` for a column outside it
    /// (an exported LAS curve, a demo truth table).
    pub key: Option<Col>,
    /// The column header in CSV and Parquet, and the mnemonic in LAS.
    pub name: String,
    /// The unit for the LAS header; CSV and Parquet carry no unit.
    pub unit: String,
    /// The curve description for the LAS header.
    pub description: String,
    /// Missing samples are NaN.
    pub values: Vec<f64>,
    /// Whole numbers (flags, classes): written without decimals, as integers.
    pub integer: bool,
}

/// A depth-indexed table: the first column is the index.
#[derive(Debug, Clone, Default)]
pub struct Table {
    /// The columns, depth index first; the index's length is the row count.
    pub columns: Vec<OutColumn>,
    /// ~W items for LAS output (WELL, UWI, COMP...), excluding STRT/STOP/STEP/NULL.
    pub well_items: Vec<HeaderItem>,
    /// ~P items for LAS output.
    pub params: Vec<HeaderItem>,
}

impl Table {
    /// Depth samples (rows).
    pub fn n_rows(&self) -> usize {
        self.columns.first().map_or(0, |c| c.values.len())
    }

    /// The values of column `col`, `None` when no stage gave it.
    pub fn get(&self, col: Col) -> Option<&[f64]> {
        self.column(col).map(|c| c.values.as_slice())
    }

    /// Column `col`, `None` when no stage gave it.
    pub fn column(&self, col: Col) -> Option<&OutColumn> {
        self.columns.iter().find(|c| c.key == Some(col))
    }

    /// Column `col` to change in place.
    pub fn column_mut(&mut self, col: Col) -> Option<&mut OutColumn> {
        self.columns.iter_mut().find(|c| c.key == Some(col))
    }

    /// Where column `col` stands, `None` when no stage gave it.
    pub fn position(&self, col: Col) -> Option<usize> {
        self.columns.iter().position(|c| c.key == Some(col))
    }
}

impl OutColumn {
    /// Column `col` of the column set, with its name, unit and description.
    pub fn new(col: Col, depth_unit: DepthUnit, values: Vec<f64>) -> OutColumn {
        OutColumn {
            key: Some(col),
            name: col.name().into(),
            unit: col.unit(depth_unit).into(),
            description: col.description().into(),
            values,
            integer: col.integer(),
        }
    }

    /// The same column with the stage's own description.
    #[must_use]
    pub fn described(mut self, description: impl Into<String>) -> OutColumn {
        self.description = description.into();
        self
    }
}

/// The computed curves of the field table, in order; a well without one
/// (no classes, no saturation-height) gets nulls, so every file has one schema.
pub const FIELD_COLUMNS: [Col; 16] = [
    Col::Depth,
    Col::Tvdss,
    Col::Vsh,
    Col::Phit,
    Col::Phie,
    Col::Sw,
    Col::SwFixed,
    Col::Bvw,
    Col::Class,
    Col::ClassProb,
    Col::Perm,
    Col::Hafwl,
    Col::Swh,
    Col::SwResid,
    Col::Contact,
    Col::Flag,
];

/// Write a well's rows of the field table: WELL, then [`FIELD_COLUMNS`], as
/// Parquet ([`parquet::write_columns`]: PLAIN floats, Snappy). One file per well,
/// each with the same schema, so a glob over the folder reads as one table
/// sorted by file name and depth.
pub fn write_field_part(table: &Table, well: &str, path: &Path) -> Result<(), OutputError> {
    let n = table.n_rows();
    let missing = vec![f64::NAN; n];
    let mut columns = vec![parquet::PqColumn {
        name: "WELL",
        values: parquet::Values::Repeated(well),
        min_max: true,
    }];
    for col in FIELD_COLUMNS {
        let values = table.get(col).unwrap_or(&missing);
        columns.push(parquet::PqColumn {
            name: col.name(),
            values: parquet::Values::of(values, col.integer()),
            // readers skip files by well and depth range
            min_max: matches!(col, Col::Depth | Col::Tvdss),
        });
    }
    write_columns_parquet(path, &columns, n)
}

/// Write `columns` (`rows` each) as Parquet to `path` through [`write_atomic`].
fn write_columns_parquet(
    path: &Path,
    columns: &[parquet::PqColumn<'_>],
    rows: usize,
) -> Result<(), OutputError> {
    write_atomic(path, |out| {
        parquet::write_columns(out, columns, rows)
            .map(|_| ())
            .map_err(|source| OutputError::Table {
                path: path.to_path_buf(),
                source,
            })
    })
}

/// Write a data frame as Parquet (zstd) through [`write_atomic`].
///
/// Single-threaded on purpose, as is [`write_frame_csv`]: runs parallelise
/// across wells, and a rayon worker that waits on polars' own pool keeps
/// taking other wells from ours while it waits, nesting them on one stack
/// until it overflows (found at 1 000 wells).
pub fn write_frame_parquet(df: &mut DataFrame, path: &Path) -> Result<(), OutputError> {
    write_atomic(path, |out| {
        ParquetWriter::new(out)
            .set_parallel(false)
            .with_compression(ParquetCompression::Zstd(None))
            .finish(df)
            .map(|_| ())
            .map_err(|source| OutputError::Table {
                path: path.to_path_buf(),
                source,
            })
    })
}

/// A tag no other writer uses at the same time: several processes may write
/// the same final file at once (shards on a shared folder, containers that
/// all run as pid 1), and threads of one process may too.
fn temp_tag() -> String {
    use std::sync::atomic::{AtomicU64, Ordering};
    static COUNTER: AtomicU64 = AtomicU64::new(0);
    let n = COUNTER.fetch_add(1, Ordering::Relaxed);
    format!("{}-{n}-{:016x}", std::process::id(), rand::random::<u64>())
}

/// Remove temporary files a killed run left (`.NAME.partial-*`) in the
/// output folder and the folders a run writes under it. Best effort.
pub fn remove_stale_partials(out: &Path) {
    for sub in [
        "",
        "wells",
        "field",
        "field/curves",
        "report",
        "report/wells",
        "report/field",
        "saturation",
        "core",
        "model",
        "shards",
    ] {
        let Ok(entries) = std::fs::read_dir(out.join(sub)) else {
            continue;
        };
        for e in entries.flatten() {
            let name = e.file_name();
            let name = name.to_string_lossy();
            if name.starts_with('.') && name.contains(".partial-") {
                let _ = std::fs::remove_file(e.path());
            }
        }
    }
}

/// Write `value` as pretty JSON and a final newline, through a temporary file
/// ([`write_atomic`]).
pub fn write_json<T: serde::Serialize>(path: &Path, value: &T) -> Result<(), OutputError> {
    let io = |source| OutputError::Io {
        path: path.to_path_buf(),
        source,
    };
    write_atomic(path, |w| {
        serde_json::to_writer_pretty(&mut *w, value).map_err(|e| io(std::io::Error::other(e)))?;
        w.write_all(b"\n").map_err(io)
    })
}

/// Write `path` through a temporary file in the same folder: written,
/// synced to the disk, renamed into place, and the folder synced.
pub fn write_atomic(
    path: &Path,
    write: impl FnOnce(&mut BufWriter<File>) -> Result<(), OutputError>,
) -> Result<(), OutputError> {
    let io = |source| OutputError::Io {
        path: path.to_path_buf(),
        source,
    };
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    let tmp = dir.join(format!(".{name}.partial-{}", temp_tag()));
    let file = File::create(&tmp).map_err(io)?;
    let mut out = BufWriter::new(file);
    // the bytes reach the disk before the name points at them, and the
    // rename reaches it before the write is reported done: after a power
    // loss a final name holds the old file or the whole new one
    let result = write(&mut out)
        .and_then(|()| out.flush().map_err(io))
        .and_then(|()| out.get_ref().sync_all().map_err(io));
    match result {
        Ok(()) => {
            drop(out);
            std::fs::rename(&tmp, path).map_err(io)?;
            sync_dir(dir).map_err(io)?;
            written::record(path);
            Ok(())
        }
        Err(e) => {
            drop(out);
            let _ = std::fs::remove_file(&tmp);
            Err(e)
        }
    }
}

/// Flush a folder's entries (a rename in it) to the disk. On Unix a folder
/// is opened and synced like a file (fsync(2) on the directory, POSIX);
/// Windows commits renames with the file system's journal and cannot open a
/// folder this way, so there it does nothing.
pub fn sync_dir(dir: &Path) -> std::io::Result<()> {
    #[cfg(unix)]
    {
        File::open(dir)?.sync_all()
    }
    #[cfg(not(unix))]
    {
        let _ = dir;
        Ok(())
    }
}

/// Write a table as CSV. `decimals`: fixed decimals for every float, or `None`
/// for the shortest text that reads back to the same value. Whole-number
/// columns are written as integers, missing samples as empty fields.
///
/// The crate's own writer rather than polars': the text is the same, the
/// numbers go through [`numfmt`] (several times faster on fixed decimals).
pub fn write_csv(table: &Table, path: &Path, decimals: Option<usize>) -> Result<(), OutputError> {
    write_atomic(path, |out| {
        write_csv_to(out, table, decimals).map_err(|source| OutputError::Io {
            path: path.to_path_buf(),
            source,
        })
    })
}

/// Flush the line buffer to the file past this many bytes.
const CSV_CHUNK_BYTES: usize = 1 << 16;

fn write_csv_to(
    out: &mut impl Write,
    table: &Table,
    decimals: Option<usize>,
) -> std::io::Result<()> {
    let mut buf: Vec<u8> = Vec::with_capacity(CSV_CHUNK_BYTES + 1024);
    for (i, c) in table.columns.iter().enumerate() {
        if i > 0 {
            buf.push(b',');
        }
        push_csv_text(&mut buf, &c.name);
    }
    buf.push(b'\n');
    for row in 0..table.n_rows() {
        for (i, c) in table.columns.iter().enumerate() {
            if i > 0 {
                buf.push(b',');
            }
            let v = c.values.get(row).copied().unwrap_or(f64::NAN);
            if !v.is_finite() {
                continue;
            }
            if c.integer {
                numfmt::push_int(&mut buf, v.round() as i64);
            } else if let Some(d) = decimals {
                numfmt::push_fixed(&mut buf, v, d);
            } else {
                numfmt::push_shortest(&mut buf, v);
            }
        }
        buf.push(b'\n');
        if buf.len() >= CSV_CHUNK_BYTES {
            out.write_all(&buf)?;
            buf.clear();
        }
    }
    out.write_all(&buf)
}

/// A CSV field, quoted (RFC 4180) when it holds a comma, quote or line break.
fn push_csv_text(buf: &mut Vec<u8>, text: &str) {
    if text.contains([',', '"', '\n', '\r']) {
        buf.push(b'"');
        buf.extend_from_slice(text.replace('"', "\"\"").as_bytes());
        buf.push(b'"');
    } else {
        buf.extend_from_slice(text.as_bytes());
    }
}

/// Write a data frame as CSV through [`write_atomic`]; `decimals` as in [`write_csv`].
pub fn write_frame_csv(
    df: &mut DataFrame,
    path: &Path,
    decimals: Option<usize>,
) -> Result<(), OutputError> {
    write_atomic(path, |out| {
        CsvWriter::new(out)
            .n_threads(1)
            .include_header(true)
            .with_float_precision(decimals)
            .finish(df)
            .map_err(|source| OutputError::Table {
                path: path.to_path_buf(),
                source,
            })
    })
}

/// Write a table as Parquet, as the field table is ([`parquet::write_columns`]):
/// floats as Float64, whole-number columns as Int64, missing values null.
pub fn write_parquet(table: &Table, path: &Path) -> Result<(), OutputError> {
    let columns: Vec<parquet::PqColumn<'_>> = table
        .columns
        .iter()
        .enumerate()
        .map(|(i, c)| parquet::PqColumn {
            name: &c.name,
            values: parquet::Values::of(&c.values, c.integer),
            // the depth index, for readers that skip files by depth range
            min_max: i == 0,
        })
        .collect();
    write_columns_parquet(path, &columns, table.n_rows())
}

/// Write a table as LAS 2.0; `decimals` as in [`write_csv`].
pub fn write_las(table: &Table, path: &Path, decimals: Option<usize>) -> Result<(), OutputError> {
    let curves: Vec<CurveInfo> = table
        .columns
        .iter()
        .map(|c| CurveInfo {
            mnemonic: c.name.clone(),
            original_mnemonic: c.name.clone(),
            unit: c.unit.clone(),
            api_code: String::new(),
            description: c.description.clone(),
            line: 0,
        })
        .collect();
    let columns: Vec<&[f64]> = table.columns.iter().map(|c| c.values.as_slice()).collect();
    let parts = las::LasParts {
        well_items: &table.well_items,
        params: &table.params,
        other: "",
        curves: &curves,
        columns: &columns,
        index_unit: table.columns.first().map_or("", |c| c.unit.as_str()),
    };
    let precision: Vec<usize> = match decimals {
        Some(d) => table
            .columns
            .iter()
            .map(|c| if c.integer { 0 } else { d })
            .collect(),
        None => Vec::new(),
    };
    write_atomic(path, |out| {
        las::write_parts(out, &parts, &precision).map_err(|source| OutputError::Io {
            path: path.to_path_buf(),
            source,
        })
    })
}

/// Write a table in `format` to `dir/stem.ext`; returns the path written.
pub fn write_table(
    table: &Table,
    dir: &Path,
    stem: &str,
    format: Format,
    decimals: Option<usize>,
) -> Result<PathBuf, OutputError> {
    let path = dir.join(format!("{stem}.{}", format.extension()));
    match format {
        Format::Csv => write_csv(table, &path, decimals)?,
        Format::Parquet => write_parquet(table, &path)?,
        Format::Las => write_las(table, &path, decimals)?,
    }
    Ok(path)
}

/// How an output path is shown in summaries and reports: relative to the
/// output folder when it is inside it (so a run's reports do not depend on
/// where the folder is, and shard outputs merge byte for byte).
pub fn shown(out: &Path, path: &Path) -> String {
    path.strip_prefix(out).unwrap_or(path).display().to_string()
}

/// A file name from a well name: lower case, letters, digits, `-` and `_`.
pub fn file_stem(name: &str) -> String {
    let s: String = name
        .trim()
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || c == '-' || c == '_' {
                c.to_ascii_lowercase()
            } else {
                '-'
            }
        })
        .collect();
    let s = s.trim_matches('-').to_string();
    if s.is_empty() { "well".into() } else { s }
}

/// A well's output file stem from its LAS file's stem, kept as the user
/// wrote it (case, spaces, letters of any script): only what no common file
/// system takes is replaced by `_` (control characters and
/// `/ \ : * ? " < > |`, a leading dot, which would hide the file, and
/// trailing dots and spaces, which Windows drops), and a Windows device
/// name (CON, PRN, AUX, NUL, COM1-9, LPT1-9) gets a `_` after it.
pub fn well_file_stem(stem: &str) -> String {
    const UNSAFE: &[char] = &['/', '\\', ':', '*', '?', '"', '<', '>', '|'];
    let mut s: String = stem
        .trim()
        .chars()
        .map(|c| {
            if c.is_control() || UNSAFE.contains(&c) {
                '_'
            } else {
                c
            }
        })
        .collect();
    while s.ends_with(['.', ' ']) {
        s.pop();
    }
    if s.starts_with('.') {
        s.replace_range(..1, "_");
    }
    if s.is_empty() {
        return "well".into();
    }
    let device = {
        let u = s.split('.').next().unwrap_or("").to_ascii_uppercase();
        matches!(u.as_str(), "CON" | "PRN" | "AUX" | "NUL")
            || ((u.starts_with("COM") || u.starts_with("LPT"))
                && u.len() == 4
                && u.as_bytes()[3].is_ascii_digit()
                && u.as_bytes()[3] != b'0')
    };
    if device {
        s.push('_');
    }
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Output names keep the file's stem as written; only characters file
    /// systems refuse are replaced (the characters Windows forbids in a name
    /// and its device names, from Microsoft's "Naming Files, Paths, and
    /// Namespaces", from memory; `/` everywhere).
    #[test]
    fn well_file_stems_keep_the_name() {
        for (given, want) in [
            ("TB-01", "TB-01"),
            ("Tarnby 3 (sidetrack)", "Tarnby 3 (sidetrack)"),
            ("Brønn-7", "Brønn-7"),
            ("A:1/2?", "A_1_2_"),
            ("tab\there", "tab_here"),
            (".hidden", "_hidden"),
            ("trailing. ", "trailing"),
            ("CON", "CON_"),
            ("com1", "com1_"),
            ("COM0", "COM0"),
            ("console", "console"),
            ("  ", "well"),
        ] {
            assert_eq!(well_file_stem(given), want, "{given:?}");
        }
    }

    #[test]
    fn stems() {
        assert_eq!(file_stem("Tarnby-3"), "tarnby-3");
        assert_eq!(file_stem(" 1-28 / A "), "1-28---a");
        assert_eq!(file_stem("//"), "well");
    }

    /// The table as a polars data frame: integers as i64, floats as f64,
    /// NaN as null (how the CSV writer reads them).
    fn polars_frame(t: &Table) -> DataFrame {
        use polars::prelude::Column;
        let columns: Vec<Column> = t
            .columns
            .iter()
            .map(|c| {
                let name = c.name.as_str().into();
                let finite = |x: &f64| x.is_finite();
                if c.integer {
                    let v: Vec<Option<i64>> = c
                        .values
                        .iter()
                        .map(|x| finite(x).then(|| x.round() as i64))
                        .collect();
                    Column::new(name, v)
                } else {
                    let v: Vec<Option<f64>> =
                        c.values.iter().map(|x| finite(x).then_some(*x)).collect();
                    Column::new(name, v)
                }
            })
            .collect();
        DataFrame::new(t.n_rows(), columns).expect("frame")
    }

    /// The crate's CSV writer gives polars' text, byte for byte (polars'
    /// `CsvWriter` is the reference; it wrote these files before).
    #[test]
    fn csv_same_text_as_polars() {
        let dir = tempfile::tempdir().expect("temp dir");
        let col = |name: &str, values: Vec<f64>, integer: bool| OutColumn {
            key: None,
            name: name.into(),
            unit: String::new(),
            description: String::new(),
            values,
            integer,
        };
        let t = Table {
            columns: vec![
                col("DEPTH", vec![1500.0, 1500.1524, -3.25, 1e-7], false),
                col("SW", vec![f64::NAN, 0.123456789, 1.005, -0.00004], false),
                col("CLASS", vec![1.0, f64::NAN, 3.0, 2.0], true),
                col("A,\"B\"", vec![2.5e20, 0.5, f64::INFINITY, -0.0], false),
            ],
            ..Table::default()
        };
        for decimals in [None, Some(0), Some(3), Some(4)] {
            let ours = dir.path().join("ours.csv");
            write_csv(&t, &ours, decimals).expect("written");
            let theirs = dir.path().join("polars.csv");
            let mut df = polars_frame(&t);
            write_frame_csv(&mut df, &theirs, decimals).expect("written");
            let read = |p: &Path| std::fs::read_to_string(p).expect("read back");
            assert_eq!(read(&ours), read(&theirs), "decimals {decimals:?}");
        }
    }

    #[test]
    fn csv_missing_is_empty_and_shortest_text() {
        let dir = tempfile::tempdir().expect("temp dir");
        let t = Table {
            columns: vec![
                OutColumn {
                    key: None,
                    name: "DEPT".into(),
                    unit: "M".into(),
                    description: String::new(),
                    values: vec![1.0, 1.5],
                    integer: false,
                },
                OutColumn {
                    key: None,
                    name: "GR".into(),
                    unit: "GAPI".into(),
                    description: String::new(),
                    values: vec![f64::NAN, 0.21],
                    integer: false,
                },
            ],
            ..Table::default()
        };
        let p = dir.path().join("a.csv");
        write_csv(&t, &p, None).expect("written");
        let text = std::fs::read_to_string(&p).expect("read back");
        assert_eq!(text, "DEPT,GR\n1.0,\n1.5,0.21\n");
        // no temporary file is left behind
        assert_eq!(std::fs::read_dir(dir.path()).expect("list").count(), 1);
    }
}
