//! `flowzone inspect`: what a LAS file holds, for a person or a script.
//!
//! For each file: version, wrap, the well header, the curves with units, the
//! depth range and step, the fraction of missing samples per curve, and every
//! warning the reader recorded.

use std::fmt::Write as _;

use serde::Serialize;

use crate::input::las::{LasFile, Warning, median_step, step_range};

/// A curve's summary.
#[derive(Debug, Clone, Serialize)]
pub struct CurveSummary {
    pub mnemonic: String,
    pub unit: String,
    pub description: String,
    /// Fraction of samples that are missing (NULL or NaN), 0-1.
    pub null_fraction: f64,
    pub min: Option<f64>,
    pub max: Option<f64>,
}

/// A file's summary.
#[derive(Debug, Clone, Serialize)]
pub struct FileSummary {
    pub file: String,
    pub version: crate::input::las::Version,
    pub wrapped: bool,
    pub well: Vec<(String, String)>,
    pub index_unit: String,
    pub rows: usize,
    pub depth_top: f64,
    pub depth_base: f64,
    /// Median step of the index; `step_regular` says whether every step equals it.
    pub step: f64,
    pub step_regular: bool,
    pub index_reversed: bool,
    pub null_value: Option<f64>,
    pub curves: Vec<CurveSummary>,
    /// LAS 3.0 data sets besides the log data: name, columns, rows.
    pub data_sets: Vec<DataSetSummary>,
    /// What the reader repaired, by kind, with counts.
    pub repairs: std::collections::BTreeMap<String, usize>,
    pub warnings: Vec<Warning>,
}

/// A LAS 3.0 data set other than the log data, as `inspect` lists it.
#[derive(Debug, Clone, Serialize)]
pub struct DataSetSummary {
    /// The data section's name as titled.
    pub name: String,
    /// Line of its title.
    pub line: usize,
    /// Its column mnemonics, in order.
    pub columns: Vec<String>,
    /// Its number of rows.
    pub rows: usize,
    /// Its number of parameters.
    pub params: usize,
}

/// Summarise a file that was read.
pub fn summarise(file_name: &str, las: &LasFile) -> FileSummary {
    let index = las.index();
    let step = median_step(index);
    let (lo, hi) = step_range(index);
    let curves = las
        .curves
        .iter()
        .zip(&las.columns)
        .map(|(c, col)| {
            let present: Vec<f64> = col.iter().copied().filter(|v| v.is_finite()).collect();
            let n = col.len().max(1);
            CurveSummary {
                mnemonic: c.mnemonic.clone(),
                unit: c.unit.clone(),
                description: c.description.clone(),
                null_fraction: (col.len() - present.len()) as f64 / n as f64,
                min: present.iter().copied().reduce(f64::min),
                max: present.iter().copied().reduce(f64::max),
            }
        })
        .collect();
    FileSummary {
        file: file_name.to_string(),
        version: las.version,
        wrapped: las.wrapped,
        well: las
            .well_items
            .iter()
            .map(|i| (i.mnemonic.clone(), i.value.clone()))
            .collect(),
        index_unit: las.index_unit().to_string(),
        rows: index.len(),
        depth_top: index.first().copied().unwrap_or(f64::NAN),
        depth_base: index.last().copied().unwrap_or(f64::NAN),
        step,
        step_regular: index.len() > 1 && (hi - lo) <= 1e-6 * step.abs().max(1e-9),
        index_reversed: las.index_reversed,
        null_value: las.null_value,
        curves,
        data_sets: las
            .data_sets
            .iter()
            .map(|d| DataSetSummary {
                name: d.name.clone(),
                line: d.line,
                columns: d.columns.iter().map(|c| c.mnemonic.clone()).collect(),
                rows: d.rows.len(),
                params: d.params.len(),
            })
            .collect(),
        repairs: las.repairs.clone(),
        warnings: las.warnings.clone(),
    }
}

/// The summary as text for a terminal.
pub fn to_text(s: &FileSummary) -> String {
    let mut t = String::new();
    let _ = writeln!(t, "{}", s.file);
    let _ = writeln!(
        t,
        "  LAS {} {}",
        serde_json::to_value(s.version)
            .ok()
            .and_then(|v| v.as_str().map(String::from))
            .unwrap_or_default(),
        if s.wrapped { "wrapped" } else { "unwrapped" }
    );
    for (m, v) in &s.well {
        if !v.is_empty() {
            let _ = writeln!(t, "  {m:<6} {v}");
        }
    }
    let _ = writeln!(
        t,
        "  depth  {} to {} {} , {} rows, step {} ({}){}",
        s.depth_top,
        s.depth_base,
        s.index_unit,
        s.rows,
        s.step,
        if s.step_regular {
            "regular"
        } else {
            "irregular"
        },
        if s.index_reversed {
            ", written with decreasing depth"
        } else {
            ""
        }
    );
    let _ = writeln!(t, "  curves ({}):", s.curves.len());
    let w = s
        .curves
        .iter()
        .map(|c| c.mnemonic.len())
        .max()
        .unwrap_or(4)
        .max(4);
    let wu = s
        .curves
        .iter()
        .map(|c| c.unit.len())
        .max()
        .unwrap_or(4)
        .max(4);
    for c in &s.curves {
        let range = match (c.min, c.max) {
            (Some(a), Some(b)) => format!("{a} .. {b}"),
            _ => "no data".into(),
        };
        let _ = writeln!(
            t,
            "    {:<w$}  {:<wu$}  null {:>5.1}%  {:<24}  {}",
            c.mnemonic,
            c.unit,
            100.0 * c.null_fraction,
            range,
            c.description
        );
    }
    if !s.data_sets.is_empty() {
        let _ = writeln!(
            t,
            "  other data sets ({}; `export` writes each as a table):",
            s.data_sets.len()
        );
        for d in &s.data_sets {
            let _ = writeln!(
                t,
                "    {} (line {}): {} rows, {} parameters, columns {}",
                d.name,
                d.line,
                d.rows,
                d.params,
                d.columns.join(" ")
            );
        }
    }
    if !s.repairs.is_empty() {
        let list: Vec<String> = s.repairs.iter().map(|(k, n)| format!("{k} {n}")).collect();
        let _ = writeln!(
            t,
            "  repaired ({}; refused under --strict): {}",
            s.repairs.values().sum::<usize>(),
            list.join(", ")
        );
    }
    if s.warnings.is_empty() {
        let _ = writeln!(t, "  warnings: none");
    } else {
        let _ = writeln!(t, "  warnings ({}):", s.warnings.len());
        for wn in &s.warnings {
            let _ = writeln!(t, "    {wn}");
        }
    }
    t
}
