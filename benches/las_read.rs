//! LAS read and write throughput (criterion): a generated LAS 2.0 file of
//! about 30 MB, 200 000 depth steps by 12 curves written `%12.5f`-style with
//! about 0.1 % NULLs, parsed from memory and written back to memory with 5
//! decimals, so the figures are the parser's and the writer's, not the disk's.
//! `benches/lasio_read.py` times lasio on the same file for comparison.
//!
//! Run: `cargo bench --bench las_read`; the generated file is left at
//! target/bench-data/bench-30mb.las.
#![allow(missing_docs)] // criterion_group! defines a pub fn that cannot carry a doc

use std::hint::black_box;
use std::path::Path;

use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use flowzone::input::las::{ReadOptions, read_bytes};
use flowzone::output::las::write_las;

const ROWS: usize = 200_000;
const CURVES: usize = 12;

/// A deterministic LAS 2.0 file: depth plus 11 curves of smooth values.
fn generate() -> Vec<u8> {
    use std::fmt::Write as _;
    let mut s = String::with_capacity(32 << 20);
    s.push_str("~VERSION INFORMATION\n VERS. 2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0\n WRAP. NO : ONE LINE PER DEPTH STEP\n");
    let _ = write!(
        s,
        "~WELL INFORMATION\n STRT.M 1000.0 : START DEPTH\n STOP.M {:.5} : STOP DEPTH\n STEP.M 0.1524 : STEP\n NULL. -999.25 : NULL VALUE\n WELL. BENCH 1 : WELL\n~CURVE INFORMATION\n DEPT.M : DEPTH\n",
        1000.0 + 0.1524 * (ROWS - 1) as f64
    );
    for c in 1..CURVES {
        let _ = writeln!(s, " C{c:02}.V/V : CURVE {c}");
    }
    s.push_str("~A\n");
    let mut state: u64 = 0x9E37_79B9_7F4A_7C15;
    for r in 0..ROWS {
        let _ = write!(s, "{:12.5}", 1000.0 + 0.1524 * r as f64);
        for c in 1..CURVES {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            if state % 1000 == 0 {
                s.push_str("     -999.25");
            } else {
                let v =
                    (r as f64 * 0.001 * c as f64).sin() * 100.0 + (state % 10_000) as f64 * 1e-3;
                let _ = write!(s, " {v:12.5}");
            }
        }
        s.push('\n');
    }
    s.into_bytes()
}

fn bench(c: &mut Criterion) {
    let bytes = generate();
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("target/bench-data");
    let _ = std::fs::create_dir_all(&dir);
    let _ = std::fs::write(dir.join("bench-30mb.las"), &bytes);
    let mut group = c.benchmark_group("las_read");
    group.throughput(Throughput::Bytes(bytes.len() as u64));
    group.sample_size(20);
    group.bench_function("read_bytes_30mb", |b| {
        b.iter(|| {
            let f = read_bytes(
                black_box(&bytes),
                Path::new("bench.las"),
                ReadOptions::default(),
            )
            .expect("benchmark input should be valid");
            black_box(f.columns.len())
        })
    });
    group.finish();

    let file = read_bytes(&bytes, Path::new("bench.las"), ReadOptions::default())
        .expect("benchmark input should be valid");
    let decimals = vec![5; file.columns.len()];
    let mut group = c.benchmark_group("las_write");
    group.throughput(Throughput::Bytes(bytes.len() as u64));
    group.sample_size(20);
    group.bench_function("write_las_30mb", |b| {
        let mut out = Vec::with_capacity(bytes.len() + (1 << 20));
        b.iter(|| {
            out.clear();
            write_las(&mut out, black_box(&file), &decimals).expect("in memory");
            black_box(out.len())
        })
    });
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
