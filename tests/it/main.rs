//! flowzone integration tests: one binary, one module per area.

/// The binary: --help, inspect, export and run, exit codes.
mod cli;
/// Shared helpers: paths, the lasio oracle, float comparison.
mod common;
/// Malformed LAS files and the whole error text each must give.
mod las_errors;
/// Tiny hand-written LAS files, each testing one rule of the LAS 2.0 standard, plus CRLF twins.
mod las_fixtures;
/// las_rs, an independent Rust reader, agrees with ours on well-formed files.
mod las_rs_oracle;
/// Files flowzone writes read by lasio, and files lasio writes read by flowzone.
mod lasio_interop;
/// The real, openly licensed files in ../shared/las-samples, against lasio.
mod real_files;
