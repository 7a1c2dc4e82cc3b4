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

/// An error that stops a command.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    #[error(transparent)]
    Config(#[from] crate::config::ConfigError),
    #[error(transparent)]
    Las(#[from] crate::input::las::LasError),
    #[error(transparent)]
    Output(#[from] crate::output::OutputError),
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
