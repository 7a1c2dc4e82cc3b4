//! The error a command ends with, and how errors are printed.

pub use crate::output::messages::chain;

/// An error that stops a command. Each stage's own error is wrapped as it
/// is, so the printed chain names the file, line, well, class or config key.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    /// The project config cannot be loaded.
    #[error(transparent)]
    Config(#[from] crate::config::ConfigError),
    /// A LAS file cannot be read.
    #[error(transparent)]
    Las(#[from] crate::input::las::LasError),
    /// A CSV input (tops, surveys, tables) cannot be read.
    #[error(transparent)]
    Table(#[from] crate::input::tables::TableError),
    /// A core file cannot be read.
    #[error(transparent)]
    Core(#[from] crate::input::core_samples::CoreError),
    /// A configured class scheme cannot be built on the core.
    #[error(transparent)]
    Scheme(#[from] crate::classes::compare::SchemeBuildError),
    /// The class stage cannot give a model.
    #[error(transparent)]
    ClassModel(#[from] crate::classes::stage::ClassStageError),
    /// A class model cannot be saved or loaded.
    /// The class predictor cannot be fitted or applied.
    /// The saturation-height model cannot be built.
    #[error(transparent)]
    SatHeight(#[from] crate::sat_height::SatHeightError),
    /// An output file cannot be written.
    #[error(transparent)]
    Output(#[from] crate::output::OutputError),
    /// A command asked for something its arguments or config do not give.
    #[error("{0}")]
    Usage(String),
    /// An output folder or file cannot be created, written or read back.
    #[error("cannot write `{}`", .path.display())]
    Io {
        /// The folder or file at fault.
        path: std::path::PathBuf,
        /// The I/O error.
        #[source]
        source: std::io::Error,
    },
    /// Some files or wells failed; each was reported already.
    #[error("{failed} of {total} {what} failed")]
    Partial {
        /// How many failed.
        failed: usize,
        /// How many the command was given.
        total: usize,
        /// What they are, plural: `files` or `wells`.
        what: &'static str,
    },
}
