//! The flowzone binary: parse arguments, run, print the error chain, exit.
#![allow(clippy::print_stderr)] // the binary prints the error chain

use clap::Parser;

fn main() -> std::process::ExitCode {
    let args = flowzone::cli::Args::parse();
    match flowzone::cli::run(args) {
        Ok(()) => std::process::ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("error: {}", flowzone::error::chain(&e));
            std::process::ExitCode::from(2)
        }
    }
}
