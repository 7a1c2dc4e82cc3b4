//! The Monte Carlo's sampling against outside references: first-order error
//! propagation of Archie's equation for small spreads, and a brute-force
//! numerical integration over the distributions for large ones.

use crate::petro::saturation::{ArchieParams, archie};
use crate::stats::dist::Dist;
use crate::stats::sampling::{Sampling, probabilities};

/// `n` Latin hypercube samples of independent `dists`, `[var][r]`.
fn draw(dists: &[Dist], n: usize, seed: u64) -> Vec<Vec<f64>> {
    let k = dists.len();
    let mut id = vec![0.0; k * k];
    for i in 0..k {
        id[i * k + i] = 1.0;
    }
    let p = probabilities(k, n, &id, Sampling::LatinHypercube, seed).expect("sampled");
    dists
        .iter()
        .zip(p)
        .map(|(d, col)| col.iter().map(|&q| d.quantile(q)).collect())
        .collect()
}

/// A temporary folder and the demo config's text with its wells folder
/// made absolute (to be edited and written there).
fn demo_config_text() -> (tempfile::TempDir, String) {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR"));
    let dir = tempfile::tempdir().expect("temp dir");
    let text = std::fs::read_to_string(root.join("config/demo-field.toml")).expect("config");
    let text = text.replace(
        "\"../demo-wells",
        &format!("\"{}", root.join("demo-wells").display()),
    );
    (dir, text)
}

fn mean_sd(v: &[f64]) -> (f64, f64) {
    let n = v.len() as f64;
    let m = v.iter().sum::<f64>() / n;
    let var = v.iter().map(|x| (x - m).powi(2)).sum::<f64>() / (n - 1.0);
    (m, var.sqrt())
}

/// Small spreads (1 % standard deviations): the Monte Carlo's SW spread
/// equals first-order propagation, σ² = Σ (∂SW/∂xᵢ)² σᵢ² (linear error
/// propagation, e.g. Taylor 1997, "An Introduction to Error Analysis",
/// §3.11). The partial derivatives of SW = (a·Rw / (φ^m·Rt))^(1/n) are
/// those of Chen & Fang 1986 (The Log Analyst 27(5); from memory), derived
/// here from ln SW = (ln a + ln Rw − m·ln φ − ln Rt) / n:
/// ∂SW/∂Rw = SW/(n·Rw), ∂SW/∂Rt = −SW/(n·Rt), ∂SW/∂φ = −m·SW/(n·φ),
/// ∂SW/∂a = SW/(n·a), ∂SW/∂m = −SW·ln φ/n, ∂SW/∂n = −SW·ln SW/n.
/// At a = 1, Rw = 0.05, Rt = 20, φ = 0.2, m = n = 2: SW = 0.25 and, by
/// hand, the terms 0.00125, −0.00125, −0.0025, 0.00125, 0.0040236,
/// 0.0034657 give σ = 0.006256.
#[test]
fn small_spreads_agree_with_first_order_propagation() {
    let (rw, rt, phi, a, m, n) = (0.05, 20.0, 0.2, 1.0, 2.0, 2.0);
    let sw0 = archie(phi, rt, rw, ArchieParams { a, m, n });
    assert!((sw0 - 0.25).abs() < 1e-12);
    let terms = [
        sw0 / (n * rw) * (0.01 * rw),
        -sw0 / (n * rt) * (0.01 * rt),
        -m * sw0 / (n * phi) * (0.01 * phi),
        sw0 / (n * a) * (0.01 * a),
        -sw0 * phi.ln() / n * (0.01 * m),
        -sw0 * sw0.ln() / n * (0.01 * n),
    ];
    let sigma: f64 = terms.iter().map(|t| t * t).sum::<f64>().sqrt();
    assert!((sigma - 0.006256).abs() < 5e-6, "{sigma}");
    let dists: Vec<Dist> = [rw, rt, phi, a, m, n]
        .iter()
        .map(|&v| Dist::Normal {
            mean: v,
            sd: 0.01 * v,
        })
        .collect();
    let s = draw(&dists, 20_000, 11);
    let sw: Vec<f64> = (0..20_000)
        .map(|r| {
            archie(
                s[2][r],
                s[1][r],
                s[0][r],
                ArchieParams {
                    a: s[3][r],
                    m: s[4][r],
                    n: s[5][r],
                },
            )
        })
        .collect();
    let (mean, sd) = mean_sd(&sw);
    assert!((mean - sw0).abs() < 2e-4, "mean {mean}");
    assert!(
        (sd / sigma - 1.0).abs() < 0.03,
        "Monte Carlo sd {sd}, first order {sigma}"
    );
}

/// Large spreads, where first order no longer holds: m triangular
/// [1.6, 2.0, 2.6], n normal (2.0, 0.3), Rw lognormal (median 0.05, σ of ln
/// 0.3), φ = 0.2, Rt = 20, a = 1. The reference is a brute-force midpoint
/// integration over the three densities, written out here (not the
/// sampler's quantile functions): the mean of SW, and the probability the
/// integration gives to the Monte Carlo's P90 and P10.
#[test]
fn large_spreads_agree_with_brute_force_integration() {
    let (phi, rt) = (0.2, 20.0);
    let tri = |x: f64| {
        let (lo, mo, hi) = (1.6, 2.0, 2.6);
        if x <= lo || x >= hi {
            0.0
        } else if x <= mo {
            2.0 * (x - lo) / ((hi - lo) * (mo - lo))
        } else {
            2.0 * (hi - x) / ((hi - lo) * (hi - mo))
        }
    };
    let gauss = |z: f64| (-0.5 * z * z).exp() / (2.0 * std::f64::consts::PI).sqrt();
    // grids: m over [1.6, 2.6], n over ±6σ, ln Rw over ±6σ (midpoints)
    let (km, kn, kr) = (300, 300, 120);
    let mut cells: Vec<(f64, f64)> = Vec::with_capacity(km * kn * kr); // (SW, weight)
    for i in 0..km {
        let dm = 1.0 / km as f64;
        let m = 1.6 + (i as f64 + 0.5) * dm;
        let wm = tri(m) * dm;
        for j in 0..kn {
            let dz = 12.0 / kn as f64;
            let zn = -6.0 + (j as f64 + 0.5) * dz;
            let n = 2.0 + 0.3 * zn;
            let wn = gauss(zn) * dz;
            for k in 0..kr {
                let dz = 12.0 / kr as f64;
                let zr = -6.0 + (k as f64 + 0.5) * dz;
                let rw = 0.05 * (0.3 * zr).exp();
                let w = wm * wn * gauss(zr) * dz;
                let sw = archie(phi, rt, rw, ArchieParams { a: 1.0, m, n });
                cells.push((sw, w));
            }
        }
    }
    let total: f64 = cells.iter().map(|c| c.1).sum();
    assert!((total - 1.0).abs() < 1e-3, "weights {total}");
    let mean_ref: f64 = cells.iter().map(|(s, w)| s * w).sum::<f64>() / total;
    let cdf_ref = |x: f64| cells.iter().filter(|c| c.0 <= x).map(|c| c.1).sum::<f64>() / total;

    let dists = [
        Dist::Triangular {
            low: 1.6,
            mode: 2.0,
            high: 2.6,
        },
        Dist::Normal { mean: 2.0, sd: 0.3 },
        Dist::Lognormal {
            median: 0.05,
            sd_ln: 0.3,
        },
    ];
    let s = draw(&dists, 20_000, 5);
    let mut sw: Vec<f64> = (0..20_000)
        .map(|r| {
            archie(
                phi,
                rt,
                s[2][r],
                ArchieParams {
                    a: 1.0,
                    m: s[0][r],
                    n: s[1][r],
                },
            )
        })
        .collect();
    let (mean, _) = mean_sd(&sw);
    assert!(
        (mean / mean_ref - 1.0).abs() < 0.005,
        "mean {mean}, integration {mean_ref}"
    );
    let range = super::Range::of(&sw);
    // P90 is exceeded in 90 % of realisations: 10 % of the probability lies below it
    assert!(
        (cdf_ref(range.p90) - 0.10).abs() < 0.01,
        "P90 {}",
        range.p90
    );
    assert!(
        (cdf_ref(range.p50) - 0.50).abs() < 0.01,
        "P50 {}",
        range.p50
    );
    assert!(
        (cdf_ref(range.p10) - 0.90).abs() < 0.01,
        "P10 {}",
        range.p10
    );
    sw.sort_by(f64::total_cmp);
    assert!(range.p90 < range.p50 && range.p50 < range.p10);
}

/// The exceedance convention on a known sample: 1..=100, P90 (exceeded by
/// 90 %) is the 10th percentile, P10 the 90th (linear interpolation between
/// order statistics, as `stats::percentile`).
#[test]
fn exceedance_percentiles_of_a_known_sample() {
    let v: Vec<f64> = (1..=100).map(f64::from).collect();
    let r = super::Range::of(&v);
    assert!((r.p90 - 10.9).abs() < 1e-9, "{r:?}");
    assert!((r.p50 - 50.5).abs() < 1e-9);
    assert!((r.p10 - 90.1).abs() < 1e-9);
    assert!((r.mean - 50.5).abs() < 1e-9);
    let empty = super::Range::of(&[f64::NAN]);
    assert!(empty.p50.is_nan() && empty.mean.is_nan());
}

/// Whether two wells' Monte Carlo ranges agree zone by zone within 1e-9
/// (relative), NaN matching NaN; panics naming the first difference.
fn assert_same_ranges(a: &super::WellUncertainty, b: &super::WellUncertainty, what: &str) {
    let close =
        |x: f64, y: f64| (x.is_nan() && y.is_nan()) || (x - y).abs() <= 1e-9 * (1.0 + y.abs());
    assert_eq!(a.zones.len(), b.zones.len(), "{what}");
    for ((za, ra), (zb, rb)) in a.zones.iter().zip(&b.zones) {
        assert_eq!(za, zb, "{what}");
        for (x, y) in [
            (ra.net_pay, rb.net_pay),
            (ra.phie_avg, rb.phie_avg),
            (ra.sw_avg, rb.sw_avg),
            (ra.hpt, rb.hpt),
        ] {
            for (u, v) in [
                (x.p90, y.p90),
                (x.p50, y.p50),
                (x.p10, y.p10),
                (x.mean, y.mean),
            ] {
                assert!(close(u, v), "{what} {za}: {x:?} against {y:?}");
            }
        }
    }
}

/// The fast path (one exponential per net-reservoir depth) and the general
/// one (the whole chain, class-aware SW and zone summary per realisation)
/// give the same ranges and the same HPT in every realisation, on the demo
/// field made Archie with only SW's inputs uncertain (Rw, and m and n per
/// class, correlated; class 4's m a number, so a class key held exact is
/// covered too). The general path is the deterministic run's own code,
/// so this ties the fast path to it.
#[test]
fn fast_path_equals_the_whole_chain_on_the_demo_wells() {
    let (dir, text) = demo_config_text();
    let text = text
        .replace(
            "saturation-model = \"simandoux-modified\"",
            "saturation-model = \"archie\"",
        )
        .replace(
            "gr-clean-gapi = { triangular = [20, 25, 31] }",
            "gr-clean-gapi = 25",
        )
        .replace(
            "gr-shale-gapi = { triangular = [120, 130, 138] }",
            "gr-shale-gapi = 130",
        )
        .replace(
            "rho-shale-gcc = { triangular = [2.50, 2.55, 2.60] }",
            "rho-shale-gcc = 2.55",
        )
        .replace("rsh-ohmm = { lognormal = [2.5, 0.15] }", "rsh-ohmm = 2.5")
        .replace(
            "archie-m = { triangular = [1.7, 1.8, 1.9] }",
            "archie-m = 1.75",
        )
        .replace("realisations = 200", "realisations = 60");
    let cfg_path = dir.path().join("field.toml");
    std::fs::write(&cfg_path, text).expect("write config");
    let mut config = crate::config::Config::load(&cfg_path).expect("config loads");
    config.uncertainty.depth_percentiles = true;
    // Rw, and m and n of four classes but class 4's m, a number
    assert_eq!(config.variables.len(), 8);
    let setup =
        crate::field::setup::prepare(&config, &dir.path().join("out"), false).expect("setup");
    let models = setup.models();
    let samples = models.samples.expect("sampled");
    let mut fast_wells = 0;
    for path in setup.files.iter().take(4) {
        let bytes = std::fs::read(path).expect("well");
        let mut times = crate::timings::StageTimes::default();
        let w = crate::pipeline::run_well(path, &bytes, &models, &mut times).expect("well runs");
        let stem = crate::well::stem_of(path);
        let names = [w.well.name.as_str(), stem.as_str()];
        let a = super::run_well(&w.well, &names, &config, samples, None, None, None);
        assert!(super::fast::FastWell::prepare(&w.well, &names, &config).is_some());
        fast_wells += 1;
        let b = super::run_well_chain(&w.well, &names, &config, samples, None, None);
        assert_same_ranges(&a, &b, &w.well.name);
        let close =
            |x: f64, y: f64| (x.is_nan() && y.is_nan()) || (x - y).abs() <= 1e-9 * (1.0 + y.abs());
        for (ha, hb) in a.hpt.iter().zip(&b.hpt) {
            assert!(
                ha.iter().zip(hb).all(|(u, v)| close(*u, *v)),
                "{}",
                w.well.name
            );
        }
        // SW's percentiles at every depth, too
        let (da, db) = (
            a.sw_depth.as_ref().expect("fast"),
            b.sw_depth.as_ref().expect("chain"),
        );
        for (pa, pb) in da.iter().zip(db) {
            assert!(
                pa.iter().zip(pb).all(|(u, v)| close(*u, *v)),
                "{}",
                w.well.name
            );
            assert!(pa.iter().any(|v| v.is_finite()));
        }
        assert!(
            da[0]
                .iter()
                .zip(&da[2])
                .all(|(lo, hi)| lo.is_nan() || lo <= hi),
            "P90 <= P10"
        );
        // with a class drawn at every classed depth in every realisation
        // (any draws: here uniform over the four classes), the two paths
        // still agree
        let det = w
            .well
            .table
            .get(crate::output::schema::Col::Class)
            .expect("classes");
        let n = det.len();
        let mut rng = <rand_chacha::ChaCha8Rng as rand::SeedableRng>::seed_from_u64(4);
        let draws: Vec<u8> = (0..samples.realisations * n)
            .map(|j| {
                if det[j % n].is_finite() {
                    rand::Rng::random_range(&mut rng, 1..=4u8)
                } else {
                    0
                }
            })
            .collect();
        let fa = super::ranges(
            &super::fast::FastWell::prepare(&w.well, &names, &config)
                .expect("fast")
                .run(samples, Some(&draws)),
        );
        let fb = super::run_well_chain(&w.well, &names, &config, samples, Some(&draws), None);
        assert_same_ranges(&fa, &fb, &format!("{} with drawn classes", w.well.name));
        // the ranges have a spread: the realisations differ
        assert!(a.zones.iter().any(|(_, r)| r.hpt.p10 > r.hpt.p90));
    }
    assert_eq!(fast_wells, 4);
}

/// The free water level's spread reaches SWH as a monotone transform:
/// SWH falls as the height above the FWL grows, so with only the FWL
/// varying (classes held), SWH's P90 at a depth (its low case, 10th
/// percentile) is the SWH at the FWL's 90th percentile, and its P10 the SWH
/// at the FWL's 10th. The sampled FWL itself is normal with the config's
/// `fwl-sd`: its 10th and 90th percentiles sit 1.2816 sd either side of
/// the mean (standard normal table, e.g. Abramowitz & Stegun 1964, table
/// 26.1). And HPT with SWH grows with the FWL: its P90 ≤ P50 ≤ P10.
#[test]
fn swh_percentiles_follow_the_sampled_free_water_level() {
    use crate::output::schema::Col;
    let (dir, text) = demo_config_text();
    let text = text.replace(
        "[compartments.\"Main\"]",
        "[compartments.\"Main\"]\nfwl-sd = 2.0",
    );
    let cfg_path = dir.path().join("field.toml");
    std::fs::write(&cfg_path, text).expect("write config");
    let mut config = crate::config::Config::load(&cfg_path).expect("config loads");
    config.uncertainty.depth_percentiles = true;
    config.uncertainty.classes = crate::config::uncertainty::ClassDraws::Fixed;
    let setup =
        crate::field::setup::prepare(&config, &dir.path().join("out"), false).expect("setup");
    let models = setup.models();
    let samples = models.samples.expect("sampled");
    let sat = models.sat.expect("saturation-height model");
    let main = samples
        .fwl
        .iter()
        .find(|f| f.compartment == "Main")
        .expect("Main's FWL sampled");
    let crate::stats::dist::Dist::Normal { mean, sd } = main.dist else {
        panic!("normal")
    };
    assert_eq!(sd, 2.0, "the config's fwl-sd wins over the fit's");
    let mut fwl = main.values.clone();
    fwl.sort_by(f64::total_cmp);
    let (lo, hi) = (
        crate::stats::quantile_sorted(&fwl, 0.10),
        crate::stats::quantile_sorted(&fwl, 0.90),
    );
    // 200 Latin hypercube strata: a sample percentile sits within a stratum
    // (0.005 in probability, 0.03 sd at z = 1.28) of the normal quantile
    assert!((lo - (mean - 1.2816 * sd)).abs() < 0.05 * sd, "{lo}");
    assert!((hi - (mean + 1.2816 * sd)).abs() < 0.05 * sd, "{hi}");
    let path = setup
        .files
        .iter()
        .find(|p| p.to_string_lossy().contains("tarnby-1"))
        .expect("Tarnby-1");
    let bytes = std::fs::read(path).expect("well");
    let mut times = crate::timings::StageTimes::default();
    let w = crate::pipeline::run_well(path, &bytes, &models, &mut times).expect("well runs");
    let t = &w.well.table;
    let get = |c: Col| t.get(c).expect("column");
    let (tvdss, class, perm, phie) = (
        get(Col::Tvdss),
        get(Col::Class),
        get(Col::Perm),
        get(Col::Phie),
    );
    let (p90, p50, p10) = (get(Col::SwhP90), get(Col::SwhP50), get(Col::SwhP10));
    let comp = sat.compartment(&["Tarnby-1"]).expect("in Main");
    let drho = comp.rho_water_gcc - comp.rho_hc_gcc;
    let swh_at = |level: f64, i: usize| sat.swh(level - tvdss[i], class[i], perm[i], phie[i], drho);
    let mut checked = 0;
    for i in 0..t.n_rows() {
        if !p50[i].is_finite() || swh_at(hi, i).is_nan() || swh_at(hi, i) >= 0.999 {
            continue;
        }
        checked += 1;
        // order statistics interpolate: a monotone curve's value between two
        // neighbouring FWLs, so within the SWH change over a 0.1 sd step
        let step = (swh_at(lo - 0.1 * sd, i) - swh_at(lo + 0.1 * sd, i)).abs()
            + (swh_at(hi - 0.1 * sd, i) - swh_at(hi + 0.1 * sd, i)).abs();
        assert!(
            (p90[i] - swh_at(hi, i)).abs() <= step + 1e-9,
            "depth {i}: P90 {} vs {}",
            p90[i],
            swh_at(hi, i)
        );
        assert!(
            (p10[i] - swh_at(lo, i)).abs() <= step + 1e-9,
            "depth {i}: P10 {} vs {}",
            p10[i],
            swh_at(lo, i)
        );
        assert!(p90[i] <= p50[i] && p50[i] <= p10[i], "depth {i}");
    }
    assert!(checked > 100, "{checked} depths checked");
    let ranges: Vec<_> = w
        .zones
        .iter()
        .filter_map(|z| z.uncertainty.as_ref().and_then(|u| u.hpt_swh))
        .collect();
    assert!(!ranges.is_empty());
    assert!(ranges.iter().all(|r| r.p90 <= r.p50 && r.p50 <= r.p10));
    assert!(
        ranges.iter().any(|r| r.p10 > r.p90),
        "the FWL's spread moves HPT from SWH"
    );
}
