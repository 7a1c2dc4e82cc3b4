//! The error a command ends with, and how errors are printed.

/// Join an error with its `source()` chain using ": ".
pub fn chain(error: &dyn std::error::Error) -> String {
    let mut text = error.to_string();
    let mut cause = error.source();
    while let Some(c) = cause {
        let s = c.to_string();
        if !s.is_empty() {
            text.push_str(": ");
            text.push_str(&s);
        }
        cause = c.source();
    }
    text
}

/// An error that stops a command. Each stage's own error is wrapped as it
/// is, so the printed chain names the file, line, well, class or config key.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    #[error(transparent)]
    Config(#[from] crate::config::ConfigError),
    #[error(transparent)]
    Las(#[from] crate::input::las::LasError),
    #[error(transparent)]
    Table(#[from] crate::input::tables::TableError),
    #[error(transparent)]
    Core(#[from] crate::input::core_samples::CoreError),
    #[error(transparent)]
    Scheme(#[from] crate::classes::compare::SchemeBuildError),
    #[error(transparent)]
    ClassModel(#[from] crate::classes::stage::ClassStageError),
    #[error(transparent)]
    ModelFile(#[from] crate::classes::predictor::model_file::ModelFileError),
    #[error(transparent)]
    Predict(#[from] crate::classes::predictor::PredictError),
    #[error(transparent)]
    SatHeight(#[from] crate::sat_height::SatHeightError),
    #[error(transparent)]
    Output(#[from] crate::output::OutputError),
    /// A command asked for something its arguments or config do not give.
    #[error("{0}")]
    Usage(String),
    #[error("cannot write `{}`", .path.display())]
    Io {
        path: std::path::PathBuf,
        #[source]
        source: std::io::Error,
    },
    /// Some files or wells failed; each was reported already.
    #[error("{failed} of {total} {what} failed")]
    Partial {
        failed: usize,
        total: usize,
        what: &'static str,
    },
}
