//! flowzone: field-scale petrophysics from well logs, core, capillary-pressure
//! and formation-pressure data.
//!
//! ```text
//! LAS files ──► las (read, check) ──► curves (aliases, units) ──► stages ──► output
//!                                                                  │          (LAS, CSV, Parquet)
//!   config (TOML) ──────────────────────────────────────────────────┘
//! ```
//!
//! Modules:
//! - [`las`]: LAS 2.0 / 1.2 reader and LAS 2.0 writer, strict with file:line errors.
//! - [`units`]: unit spellings and conversion to the canonical units.
//! - [`curves`]: logical curves found by alias lists, converted to canonical units.
//! - [`config`]: the project config (TOML).
//! - [`well`]: one well through the stages; [`field`]: many wells in parallel.
//! - [`output`]: depth-indexed tables written as CSV, Parquet and LAS.
//! - [`core_data`], [`core_set`]: core plugs read, matched to wells and shifted.
//! - [`classes`]: flow-unit quantities, class schemes, permeability per class.
//! - [`predictor`]: the random-forest class predictor and its model file;
//!   [`classify`]: the class stage of a run (train or load, apply to wells).
//! - [`capillary`], [`capillary_data`], [`pressure`]: Leverett J and curve
//!   forms, lab curves and their J fits, free water levels from pressures;
//!   [`sat_height`]: the saturation-height stage of a run (SWH per depth);
//!   [`contacts`]: the audit of every saturation step.
//! - [`inspect`], [`export`]: the `inspect` and `export` commands.
//! - [`synth`], [`demo`]: the synthetic forward model behind the invented demo field.
//! - [`cli`]: the command line.
//!
//! Results are interpretations: they must be reviewed by a qualified
//! petrophysicist before they inform reserves, well or investment decisions,
//! and used under local regulation and licensed practice.

pub mod classes;
pub mod cli;
pub mod config;
pub mod contacts;
pub mod demo;
pub mod error;
pub mod field;
pub mod input;
pub mod output;
pub mod petro;
pub mod pipeline;
pub mod report;
pub mod sat_height;
pub mod stats;
pub mod units;
pub mod well;

#[cfg(test)]
mod testutil;
