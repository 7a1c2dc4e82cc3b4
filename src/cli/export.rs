//! `flowzone export`: a LAS file's curves as read, in another format.
//!
//! One output file per input, named after the input file; one column per curve
//! with the file's own mnemonics (made unique) and units; values exactly as read
//! (the shortest text that reads back to the same number); missing samples empty.

use std::path::{Path, PathBuf};

use crate::config::Format;
use crate::error::Error;
use crate::input::las::LasFile;
use crate::output::{self, OutColumn, Table};

/// The file's curves as a table, unchanged.
pub fn table_as_read(las: &LasFile) -> Table {
    let columns = las
        .curves
        .iter()
        .zip(&las.columns)
        .map(|(c, v)| OutColumn {
            key: None,
            name: c.mnemonic.clone(),
            unit: c.unit.clone(),
            description: c.description.clone(),
            values: v.clone(),
            integer: false,
        })
        .collect();
    let skip = ["STRT", "STOP", "STEP", "NULL"];
    let well_items = las
        .well_items
        .iter()
        .filter(|i| !skip.iter().any(|s| i.mnemonic.eq_ignore_ascii_case(s)))
        .cloned()
        .collect();
    Table {
        columns,
        well_items,
        params: las.params.clone(),
    }
}

/// Export one file that was read from `input` into `out`; refuses to write over the input.
pub fn export_file(
    las: &LasFile,
    input: &Path,
    out: &Path,
    format: Format,
) -> Result<PathBuf, Error> {
    let stem = input
        .file_stem()
        .map_or_else(|| "well".into(), |s| s.to_string_lossy().into_owned());
    let target = out.join(format!("{stem}.{}", format.extension()));
    if let (Ok(a), Ok(b)) = (target.canonicalize(), input.canonicalize()) {
        if a == b {
            return Err(Error::Usage(format!(
                "export of `{}` would overwrite the input; choose another --out",
                input.display()
            )));
        }
    }
    let table = table_as_read(las);
    Ok(output::write_table(&table, out, &stem, format, None)?)
}

/// Write each LAS 3.0 data set other than the log data (core, tops,
/// inclinometry, user-defined) as its own CSV table, `STEM.SET.csv`: a
/// header of the set's column mnemonics, then its rows as written (text
/// items, NULL as an empty field). The paths written; none for 1.2 and 2.0.
pub fn export_data_sets(las: &LasFile, input: &Path, out: &Path) -> Result<Vec<PathBuf>, Error> {
    let stem = input
        .file_stem()
        .map_or_else(|| "well".into(), |s| s.to_string_lossy().into_owned());
    let null = las.null_value;
    let mut written = Vec::new();
    for set in &las.data_sets {
        let name: String = set
            .name
            .chars()
            .map(|c| {
                if c.is_ascii_alphanumeric() || c == '-' {
                    c
                } else {
                    '_'
                }
            })
            .collect();
        let path = out.join(format!("{stem}.{name}.csv"));
        let io = |e: csv::Error| crate::output::OutputError::Io {
            path: path.clone(),
            source: std::io::Error::other(e),
        };
        output::write_atomic(&path, |w| {
            let mut c = csv::Writer::from_writer(w);
            c.write_record(set.columns.iter().map(|k| k.mnemonic.as_str()))
                .map_err(io)?;
            for row in &set.rows {
                c.write_record(row.iter().map(|v| {
                    let is_null = v.parse::<f64>().is_ok_and(|x| {
                        null.is_some_and(|n| (x - n).abs() <= 1e-9 * n.abs().max(1.0))
                    });
                    if is_null { "" } else { v.as_str() }
                }))
                .map_err(io)?;
            }
            c.flush().map_err(|e| io(csv::Error::from(e)))
        })?;
        written.push(path);
    }
    Ok(written)
}
