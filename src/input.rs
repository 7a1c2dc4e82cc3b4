//! Input files: the LAS reader, the CSV tables (tops, survey,
//! core, capillary pressure, formation pressures) and the SPWLA core format.
//!
//! Readers turn bytes into typed records with file:line errors; nothing here
//! interprets a value.

pub mod core_samples;
pub mod curves;
pub mod las;
pub mod location;
pub mod tables;
