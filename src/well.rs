//! One well through the stages: LAS file + config → output table.
//!
//! Stages so far: read the file, resolve the logical curves and convert them to
//! canonical units. Each stage returns a `Result`, so that a bad well becomes a
//! [`WellError`] for the field run to record, never a panic.

use std::path::{Path, PathBuf};

use crate::config::Config;
use crate::curves::{self, CurveError, LogicalCurve, ResolvedCurve};
use crate::las::{self, LasError, LasFile, ReadOptions};
use crate::output::{OutColumn, OutputError, Table};
use crate::units::Quantity;

/// Why a well failed.
#[derive(Debug, thiserror::Error)]
pub enum WellError {
    #[error(transparent)]
    Las(#[from] LasError),
    #[error("{}", .path.display())]
    Curve {
        path: PathBuf,
        #[source]
        source: CurveError,
    },
    #[error(transparent)]
    Output(#[from] OutputError),
}

/// A well after the stages, ready to write.
#[derive(Debug, Clone)]
pub struct WellOutput {
    pub name: String,
    pub table: Table,
    /// Warnings from reading and from the stages, as text.
    pub warnings: Vec<String>,
    /// Mnemonic used for each logical curve found.
    pub resolved: Vec<(LogicalCurve, String, String)>,
}

/// Curves a stage cannot run without (none yet: the later stages add theirs).
pub const REQUIRED: [LogicalCurve; 0] = [];

/// Read a well and run the stages.
pub fn process(path: &Path, config: &Config) -> Result<WellOutput, WellError> {
    let file = las::read_path(
        path,
        ReadOptions {
            strict: config.input.strict,
        },
    )?;
    process_file(path, &file, config)
}

/// Run the stages on a file already read.
pub fn process_file(path: &Path, file: &LasFile, config: &Config) -> Result<WellOutput, WellError> {
    let depth_unit = config.project.depth_unit;
    let table_aliases = config.alias_table();
    let curve_err = |source| WellError::Curve {
        path: path.to_path_buf(),
        source,
    };
    let mut warnings: Vec<String> = file.warnings.iter().map(ToString::to_string).collect();
    let depth = curves::resolve_depth(file, depth_unit).map_err(curve_err)?;

    let mut found: Vec<ResolvedCurve> = Vec::new();
    for curve in LogicalCurve::ALL {
        match curves::resolve(file, curve, &table_aliases, depth_unit) {
            Ok(r) => found.push(r),
            Err(e) if REQUIRED.contains(&curve) => return Err(curve_err(e)),
            Err(CurveError::Missing { .. }) => {}
            Err(e) => warnings.push(format!("{e}; curve not used")),
        }
    }

    let name = file
        .well_name()
        .map_or_else(|| stem_of(path), str::to_string);
    let mut columns = vec![OutColumn {
        name: "DEPTH".into(),
        unit: Quantity::Depth.canonical_unit(depth_unit).into(),
        description: "MEASURED DEPTH".into(),
        values: depth,
    }];
    let resolved = found
        .iter()
        .map(|r| (r.logical, r.mnemonic.clone(), r.source_unit.clone()))
        .collect();
    for r in found {
        columns.push(OutColumn {
            name: r.logical.output_mnemonic().into(),
            unit: r.logical.quantity().canonical_unit(depth_unit).into(),
            description: format!(
                "{} (FROM {} {})",
                r.logical.description(),
                r.mnemonic,
                r.source_unit
            ),
            values: r.values,
        });
    }
    let keep = [
        "WELL", "UWI", "API", "COMP", "FLD", "LOC", "CTRY", "PROV", "STAT", "SRVC", "DATE",
    ];
    let well_items = file
        .well_items
        .iter()
        .filter(|i| keep.iter().any(|k| i.mnemonic.eq_ignore_ascii_case(k)))
        .cloned()
        .collect();
    Ok(WellOutput {
        name,
        table: Table {
            columns,
            well_items,
            params: file.params.clone(),
        },
        warnings,
        resolved,
    })
}

/// The file name without extension, as a fallback well name.
pub fn stem_of(path: &Path) -> String {
    path.file_stem()
        .map_or_else(|| "well".into(), |s| s.to_string_lossy().into_owned())
}
