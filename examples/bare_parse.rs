//! The floor a LAS reader cannot beat: read each file and parse every value
//! of its `~A` section with fast-float, with no header, no checks and no
//! table. `benches/field.sh` times it as the "bare parse" every run is
//! compared with (the ratio targets in the README's benchmark table).
//!
//! Usage: `cargo run --release --example bare_parse -- FILE_OR_FOLDER...`
//! (a folder means its `*.las` files). Prints files, values and their sum
//! (so the work cannot be skipped) on stdout.
#![allow(clippy::print_stdout, clippy::print_stderr)]

use std::path::PathBuf;

fn main() {
    let mut files: Vec<PathBuf> = Vec::new();
    for arg in std::env::args_os().skip(1) {
        let p = PathBuf::from(arg);
        if p.is_dir() {
            let Ok(entries) = std::fs::read_dir(&p) else {
                eprintln!("bare_parse: cannot list {}", p.display());
                std::process::exit(2);
            };
            let mut las: Vec<PathBuf> = entries
                .flatten()
                .map(|e| e.path())
                .filter(|f| f.extension().is_some_and(|e| e.eq_ignore_ascii_case("las")))
                .collect();
            las.sort();
            files.extend(las);
        } else {
            files.push(p);
        }
    }
    let (mut values, mut sum) = (0_u64, 0.0_f64);
    for f in &files {
        let bytes = match std::fs::read(f) {
            Ok(b) => b,
            Err(e) => {
                eprintln!("bare_parse: cannot read {}: {e}", f.display());
                std::process::exit(2);
            }
        };
        // the data start after the line that opens with ~A
        let start = bytes
            .windows(3)
            .position(|w| w == b"\n~A")
            .and_then(|p| {
                bytes[p + 1..]
                    .iter()
                    .position(|&b| b == b'\n')
                    .map(|q| p + q + 2)
            })
            .unwrap_or(bytes.len());
        for token in bytes[start..]
            .split(u8::is_ascii_whitespace)
            .filter(|t| !t.is_empty())
        {
            if let Ok(v) = fast_float2::parse::<f64, _>(token) {
                values += 1;
                sum += v;
            }
        }
    }
    println!("{} files, {values} values, sum {sum:.6e}", files.len());
}
