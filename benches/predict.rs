//! The class predictor: fitting the forest on 3 000 training samples of 6
//! features (4 classes), and predicting 1 000 000 depths with it. The data are
//! synthetic: each class has its own feature centre plus deterministic noise,
//! so the trees are about as deep as on the demo core.
//!
//! Run: `cargo bench --bench predict`. Criterion reports the time per fit and
//! elements (depths) per second for prediction.
#![allow(missing_docs)] // criterion_group! defines a pub fn that cannot carry a doc

use std::hint::black_box;

use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use flowzone::classes::predictor::{Forest, ForestParams};
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;

const FEATURES: usize = 6;

fn data(rows: usize, seed: u64) -> (Vec<f64>, Vec<u8>) {
    let mut rng = ChaCha8Rng::seed_from_u64(seed);
    let mut x = Vec::with_capacity(rows * FEATURES);
    let mut y = Vec::with_capacity(rows);
    for _ in 0..rows {
        let c: u8 = rng.random_range(1..=4);
        for j in 0..FEATURES {
            let centre = f64::from(c) * (1.0 + j as f64 * 0.3);
            x.push(centre + rng.random_range(-1.2..1.2));
        }
        y.push(c);
    }
    (x, y)
}

fn bench(c: &mut Criterion) {
    let params = ForestParams {
        trees: 100,
        max_depth: 10,
        min_samples_leaf: 2,
        seed: 20_250_611,
    };
    let (x, y) = data(3_000, 1);
    let mut g = c.benchmark_group("predictor");
    g.sample_size(10);
    g.bench_function("fit 3000 x 6, 100 trees", |b| {
        b.iter(|| Forest::fit(black_box(&x), FEATURES, black_box(&y), &params).expect("fit"))
    });
    let forest = Forest::fit(&x, FEATURES, &y, &params).expect("fit");
    let (depths, _) = data(1_000_000, 2);
    g.throughput(Throughput::Elements(1_000_000));
    g.bench_function("predict 1M depths", |b| {
        b.iter(|| forest.predict(black_box(&depths)).expect("predict"))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
