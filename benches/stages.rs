//! Samples per second of the per-well petrophysics chain (flags, VSH, porosity,
//! Rw, SW, BVW) without the classifier, on 1 000 000 synthetic depth samples in
//! two zones: linear VSH, neutron-density porosity, modified Simandoux with
//! n = 2 (closed form) in one zone and n = 2.2 (root finding) in the other.
//!
//! Run: `cargo bench --bench stages`. Criterion reports elements (samples) per second.
#![allow(missing_docs)] // criterion_group! defines a pub fn that cannot carry a doc

use std::hint::black_box;

use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use flowzone::config::params::{ParamSet, PorosityMethod};
use flowzone::petro::saturation::SaturationModel;
use flowzone::well::chain::{Inputs, ZoneSetup, run};

const N: usize = 1_000_000;

fn zone(name: &str, p: ParamSet) -> ZoneSetup {
    ZoneSetup {
        name: name.into(),
        params: p.resolve(),
        gr_clean_gapi: 25.0,
        gr_shale_gapi: 130.0,
        gr_picked: false,
        gradient_c_per_m: None,
    }
}

fn bench(c: &mut Criterion) {
    let f = |i: usize, a: f64, b: f64| a + b * ((i as f64) * 0.013).sin().abs();
    let gr: Vec<f64> = (0..N).map(|i| f(i, 25.0, 100.0)).collect();
    let rhob: Vec<f64> = (0..N).map(|i| f(i, 2.2, 0.4)).collect();
    let nphi: Vec<f64> = (0..N).map(|i| f(i, 0.1, 0.25)).collect();
    let rt: Vec<f64> = (0..N).map(|i| f(i, 1.0, 50.0)).collect();
    let cali: Vec<f64> = (0..N).map(|i| f(i, 8.4, 1.5)).collect();
    let tvd: Vec<f64> = (0..N).map(|i| 2000.0 + i as f64 * 0.15).collect();
    let zone_of: Vec<Option<u16>> = (0..N).map(|i| Some(u16::from(i >= N / 2))).collect();
    let base = ParamSet {
        rw_ohmm: Some(0.045.into()),
        rho_shale_gcc: Some(2.55.into()),
        nphi_shale_vv: Some(0.35.into()),
        rsh_ohmm: Some(2.5.into()),
        bit_size_in: Some(8.5.into()),
        porosity_method: Some(PorosityMethod::NeutronDensity),
        saturation_model: Some(SaturationModel::SimandouxModified),
        ..ParamSet::default()
    };
    let zones = vec![
        zone("A", base.clone()),
        zone(
            "B",
            ParamSet {
                archie_n: Some(2.2.into()),
                ..base.clone()
            },
        ),
    ];
    let archie = vec![
        zone(
            "A",
            ParamSet {
                saturation_model: Some(SaturationModel::Archie),
                ..base.clone()
            }
        );
        2
    ];
    let inputs = Inputs {
        gr: Some(&gr),
        rhob: Some(&rhob),
        nphi: Some(&nphi),
        rt: Some(&rt),
        cali: Some(&cali),
        tvd_m: &tvd,
        ..Inputs::default()
    };
    let mut g = c.benchmark_group("stage_chain");
    g.throughput(Throughput::Elements(N as u64));
    g.sample_size(10);
    g.bench_function("simandoux_n2_and_n2.2", |b| {
        b.iter(|| black_box(run(black_box(&inputs), &zone_of, &zones).sw.len()))
    });
    g.bench_function("archie_m2_n2", |b| {
        b.iter(|| black_box(run(black_box(&inputs), &zone_of, &archie).sw.len()))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
