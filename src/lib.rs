//! flowzone: field-scale petrophysics from well logs, core, capillary-pressure
//! and formation-pressure data. The modules are the stages of a run:
//!
//! ```text
//! read (input::las) ─► curves (input::curves) ─► depth/zones (well) ─► petro (well::chain)
//!   ─► classes ─► class-aware SW (well::chain) ─► sat_height ─► contacts ─► output/report
//! pipeline.rs: one well through every stage, in order; field: schedules the wells (rayon, shards)
//! ```
//!
//! - [`input`]: LAS reader, CSV tables, core samples, logical curves in canonical units.
//! - [`well`]: one well's logs: depth reference, zones, the petrophysics chain, zone summary.
//! - [`petro`]: the formulas of shale volume, porosity, formation water and saturation.
//! - [`classes`]: flow units, class schemes, core on log depth, the predictor, the class stage.
//! - [`sat_height`]: Leverett J, lab curves and their fits, free water levels, SWH per depth.
//! - [`contacts`]: the audit of every saturation step and the FWL the logs imply.
//! - [`output`]: tables written as CSV, Parquet and LAS; the column set ([`output::schema::Col`]).
//! - `report`: the HTML pages and their plots (SVG, PNG).
//! - [`pipeline`]: [`pipeline::run_well`], the one place that chains the stages for a well.
//! - [`field`]: the field run: wells in parallel or in shards, the journal, field-level outputs.
//! - [`config`]: the project config (TOML); [`units`]: unit spellings and conversions.
//! - [`stats`]: the shared statistics; [`timings`]: seconds per stage; [`error`]: the error a command ends with.
//! - [`cli`]: the command line and the `inspect` and `export` commands.
//! - `demo`: the synthetic forward model behind the invented demo field.
//!
//! Results are interpretations: they must be reviewed by a qualified
//! petrophysicist before they inform reserves, well or investment decisions,
//! and used under local regulation and licensed practice.

pub mod classes;
pub mod cli;
pub mod config;
pub mod contacts;
pub(crate) mod demo;
pub mod error;
pub mod field;
pub mod input;
pub mod output;
pub mod petro;
pub mod pipeline;
pub(crate) mod report;
pub mod sat_height;
pub mod stats;
pub mod timings;
pub mod uncertainty;
pub mod units;
pub mod well;
