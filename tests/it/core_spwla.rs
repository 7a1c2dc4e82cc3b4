//! The real conventional-core file in tests/data/real (well 7121/8-1,
//! SPWLA core-data format, NLOD 2.0; provenance in PROVENANCE.md there): read,
//! flow-unit quantities computed, classes assigned. Expected counts and ranges
//! come from an independent reading of the file (a short python3 parse of its
//! value records during review: 328 value records, one cut short; 263 with both
//! horizontal Klinkenberg permeability and horizontal plug porosity, 14 of them
//! with permeability 0; porosity 1.50045-24.363770 %, permeability 0.009-22285.75 mD).

use flowzone::classes::flow_units::{fzi, rqi, winland_r35};
use flowzone::classes::{ClassScheme, FziLadder, PortSize};
use flowzone::input::core_samples::read_spwla;
use flowzone::units::DepthUnit;

use crate::common::real;

#[test]
fn spwla_core_file_counts_ranges_and_classes() {
    let path = real("7121_8-1__ROCK_AND_CORE__CORE_CONV_RAW_1.SPWLA");
    let (core, vars) = read_spwla(&path, DepthUnit::Metre, DepthUnit::Metre).expect("readable");
    assert_eq!(vars.len(), 10);
    assert_eq!(vars[1].description, "Klinkenberg corrected gas perm, Hor.");
    assert_eq!(core.samples.len(), 249);
    let count = |r: &str| core.rejected.iter().filter(|x| x.reason == r).count();
    assert_eq!(count("no porosity or no permeability in this sample"), 64);
    assert_eq!(count("permeability 0 mD is not above 0"), 14);
    // the last record is cut off mid-number (PROVENANCE.md): reported by line
    assert_eq!(
        core.rejected.last().map(|r| (r.line, r.reason.as_str())),
        Some((
            1856,
            "value record has 9 readable values of 10 (truncated or malformed)"
        ))
    );
    assert_eq!(core.rejected.len(), 79);
    assert!(core.samples.iter().all(|s| s.well == "7121/8-1"));
    let (pmin, pmax) = core.samples.iter().fold((1.0f64, 0.0f64), |(a, b), s| {
        (a.min(s.porosity), b.max(s.porosity))
    });
    let (kmin, kmax) = core.samples.iter().fold((f64::MAX, 0.0f64), |(a, b), s| {
        (a.min(s.perm_md), b.max(s.perm_md))
    });
    assert!(
        (pmin - 0.0150045).abs() < 1e-9 && (pmax - 0.2436377).abs() < 1e-9,
        "{pmin} {pmax}"
    );
    assert!(
        (kmin - 0.009).abs() < 1e-12 && (kmax - 22285.75).abs() < 1e-6,
        "{kmin} {kmax}"
    );
    assert!(
        core.samples
            .iter()
            .all(|s| (1918.0..=1983.72).contains(&s.depth)),
        "depths inside the cored interval of record 20"
    );

    // flow-unit quantities are finite and positive for every accepted sample
    for s in &core.samples {
        for v in [
            rqi(s.perm_md, s.porosity),
            fzi(s.perm_md, s.porosity),
            winland_r35(s.perm_md, s.porosity),
        ] {
            assert!(v.is_finite() && v > 0.0, "{s:?}");
        }
    }
    // every sample gets a class in each scheme; classes are consistent with the quantity
    let schemes: Vec<Box<dyn ClassScheme>> = vec![
        Box::new(FziLadder::geometric(0.25, 2.0, 8)),
        Box::new(PortSize::default()),
    ];
    for scheme in &schemes {
        let mut counts = vec![0usize; scheme.class_count() + 1];
        for s in &core.samples {
            let c = scheme.classify(s.porosity, s.perm_md).expect("defined");
            counts[usize::from(c)] += 1;
        }
        assert_eq!(counts.iter().sum::<usize>(), 249, "{}", scheme.name());
        assert!(
            counts.iter().filter(|&&n| n > 0).count() >= 3,
            "{}: {counts:?}",
            scheme.name()
        );
        // monotone: a better class never has a lower median quantity
        let median = |c: u8| {
            let mut v: Vec<f64> = core
                .samples
                .iter()
                .filter(|s| scheme.classify(s.porosity, s.perm_md) == Some(c))
                .map(|s| scheme.value(s.porosity, s.perm_md))
                .collect();
            v.sort_by(f64::total_cmp);
            v.get(v.len() / 2).copied()
        };
        let medians: Vec<f64> = (1..=scheme.class_count() as u8)
            .filter_map(median)
            .collect();
        assert!(
            medians.windows(2).all(|w| w[0] < w[1]),
            "{}: {medians:?}",
            scheme.name()
        );
    }
}
