//! The one door to stderr for the library: progress, notes and warnings
//! for the person running flowzone, never data (data goes to files or to
//! stdout through an explicit writer); and [`chain`], how an error and its
//! causes become one line of text. Everything else in the crate is
//! linted against `eprintln!` (`clippy::print_stderr`), so a message cannot
//! slip onto the terminal from a stage by accident.
#![allow(clippy::print_stderr)]

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

/// Write one line to stderr. Call it through [`note!`](crate::output::messages::note).
pub fn write_line(args: std::fmt::Arguments<'_>) {
    eprintln!("{args}");
}

/// `note!("...", args)`: one message line on stderr, formatted as `format!`.
macro_rules! note {
    ($($arg:tt)*) => {
        $crate::output::messages::write_line(format_args!($($arg)*))
    };
}
pub(crate) use note;
