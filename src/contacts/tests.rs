//! Constructed profiles with known answers for the contact audit.

use super::*;
use crate::sat_height::lab_curves::JCurve;
use crate::stats::assert_close;
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use rand_distr::{Distribution, Normal};

/// Sample spacing, m (half a foot).
const DZ: f64 = 0.1524;
/// The compartment's FWL, TVDSS m.
const FWL: f64 = 2085.0;
/// Vertical well: MD = TVDSS + this.
const KB: f64 = 30.0;

use crate::sat_height::lab_curves::brooks_corey_j as bc;

fn comp(fwl: f64, rho_water: f64, rho_hc: f64) -> CompartmentFwl {
    CompartmentFwl {
        name: "Main".into(),
        wells: None,
        fwl_tvdss: fwl,
        fwl_sigma: None,
        source: "config".into(),
        pressure_fit: None,
        pressure_fit_error: None,
        rho_water_gcc: rho_water,
        rho_hc_gcc: rho_hc,
        density_source: "config".into(),
        points_used: 0,
        points_m: Vec::new(),
    }
}

/// σ·cosθ 26 dyn/cm, metres, one compartment.
fn model(curves: Vec<JCurve>, c: &CompartmentFwl) -> SatHeightModel {
    SatHeightModel::new_for_audit(curves, 26.0, vec![c.clone()], DepthUnit::Metre)
}

/// Class 1: tight rock; class 2: clean sand.
fn two_classes() -> Vec<JCurve> {
    vec![bc(0.06, 1.0, 0.32), bc(0.025, 2.2, 0.09)]
}

const K1: f64 = 0.5;
const PHI1: f64 = 0.10;
const K2: f64 = 600.0;
const PHI2: f64 = 0.24;

/// The curves of one well.
struct Well {
    md: Vec<f64>,
    tvdss: Vec<f64>,
    sw: Vec<f64>,
    swh: Vec<f64>,
    class: Vec<f64>,
    perm: Vec<f64>,
    phie: Vec<f64>,
    flag: Vec<f64>,
}

impl Well {
    /// A well from TVDSS and per-sample (class, k, φ); SWH from `m` with the
    /// FWL and densities of `c`; SW = SWH.
    fn new(
        tvdss: Vec<f64>,
        rock: &[(f64, f64, f64)],
        m: &SatHeightModel,
        c: &CompartmentFwl,
    ) -> Well {
        let mut w = Well {
            md: tvdss.iter().map(|t| t + KB).collect(),
            class: rock.iter().map(|r| r.0).collect(),
            perm: rock.iter().map(|r| r.1).collect(),
            phie: rock.iter().map(|r| r.2).collect(),
            flag: vec![0.0; tvdss.len()],
            sw: Vec::new(),
            swh: Vec::new(),
            tvdss,
        };
        w.set_swh(m, c);
        w.sw = w.swh.clone();
        w
    }

    fn set_swh(&mut self, m: &SatHeightModel, c: &CompartmentFwl) {
        let drho = c.rho_water_gcc - c.rho_hc_gcc;
        self.swh = (0..self.tvdss.len())
            .map(|i| {
                m.swh(
                    c.fwl_tvdss - self.tvdss[i],
                    self.class[i],
                    self.perm[i],
                    self.phie[i],
                    drho,
                )
            })
            .collect();
    }

    fn profile(&self) -> Profile<'_> {
        Profile {
            md: &self.md,
            tvdss: &self.tvdss,
            sw: &self.sw,
            swh: &self.swh,
            class: &self.class,
            class_prob: &[],
            perm: &self.perm,
            phie: &self.phie,
            flag: &self.flag,
        }
    }
}

fn run(w: &Well, m: &SatHeightModel, c: &CompartmentFwl) -> WellAudit {
    audit(
        "W-1",
        &w.profile(),
        m,
        c,
        &ContactsConfig::default(),
        DepthUnit::Metre,
    )
}

/// Beds per interbedded profile, samples per bed (20 · 0.1524 = 3.048 m).
const BEDS: usize = 7;
const BED: usize = 20;

/// Seven 3.048 m beds, class 2 (600 mD, φ 0.24) first, alternating with
/// class 1 (0.5 mD, φ 0.10), 61.2 to 40.0 m above the FWL 2085; SW = SWH
/// plus uniform noise of ±0.01 (seeded). Returns the well and the rows
/// where a new bed starts.
fn interbeds() -> (Well, SatHeightModel, CompartmentFwl, Vec<usize>) {
    let c = comp(FWL, 1.07, 0.78);
    let m = model(two_classes(), &c);
    let n = BEDS * BED;
    let tvdss: Vec<f64> = (0..n).map(|i| FWL - 61.2 + i as f64 * DZ).collect();
    let rock: Vec<(f64, f64, f64)> = (0..n)
        .map(|i| {
            if (i / BED) % 2 == 0 {
                (2.0, K2, PHI2)
            } else {
                (1.0, K1, PHI1)
            }
        })
        .collect();
    let mut w = Well::new(tvdss, &rock, &m, &c);
    let mut rng = ChaCha8Rng::seed_from_u64(87);
    for v in &mut w.sw {
        *v += rng.random_range(-0.01..0.01);
    }
    let bounds = (1..BEDS).map(|j| j * BED).collect();
    (w, m, c, bounds)
}

/// Total penalised cost of a segmentation: within-segment sum of squares
/// plus `penalty` per segment; `None` when a segment is shorter than `min_len`.
fn penalised_cost(x: &[f64], bounds: &[usize], min_len: usize, penalty: f64) -> Option<f64> {
    let mut edges = vec![0];
    edges.extend_from_slice(bounds);
    edges.push(x.len());
    let mut total = 0.0;
    for w in edges.windows(2) {
        if w[1] < w[0] + min_len {
            return None;
        }
        let seg = &x[w[0]..w[1]];
        let mean = seg.iter().sum::<f64>() / seg.len() as f64;
        total += seg.iter().map(|v| (v - mean).powi(2)).sum::<f64>() + penalty;
    }
    Some(total)
}

/// The optimum by exhaustive dynamic programming (every admissible last
/// segment, no pruning): the least penalised cost over all segmentations
/// with segments of at least `min_len`.
fn exhaustive_optimum(x: &[f64], min_len: usize, penalty: f64) -> f64 {
    let n = x.len();
    let sse = |a: usize, b: usize| {
        let seg = &x[a..b];
        let mean = seg.iter().sum::<f64>() / seg.len() as f64;
        seg.iter().map(|v| (v - mean).powi(2)).sum::<f64>()
    };
    let mut f = vec![f64::INFINITY; n + 1];
    f[0] = 0.0;
    for t in min_len..=n {
        for s in 0..=t - min_len {
            if f[s].is_finite() {
                f[t] = f[t].min(f[s] + sse(s, t) + penalty);
            }
        }
    }
    f[n]
}

/// Constructed case: a noise-free piecewise-constant series 0.2 ×40, 0.8 ×30,
/// 0.5 ×50 has zero within-segment cost with boundaries at 40 and 70. With
/// segments of at least 35 the middle one cannot be 30 long; hand computed:
/// (40, 75) costs 30·0.0429² + 5·0.2571² = 0.386 (middle mean 26.5/35), the
/// best alternatives (38, 73) 0.864, (35, 70) 1.54, one boundary at 40 1.69;
/// so [40, 75]. A constant series and one shorter than 2·min_len have none.
#[test]
fn segment_finds_exact_boundaries() {
    let mut x = vec![0.2; 40];
    x.extend(vec![0.8; 30]);
    x.extend(vec![0.5; 50]);
    assert_eq!(segment(&x, 4, 0.01), vec![40, 70]);

    let b = segment(&x, 35, 0.01);
    assert!(!b.contains(&70), "{b:?}");
    assert!(
        penalised_cost(&x, &b, 35, 0.01).is_some(),
        "segment shorter than 35: {b:?}"
    );
    assert_eq!(b, vec![40, 75]);

    assert!(segment(&[0.3; 100], 4, 0.01).is_empty());
    // a clear step, but 9 < 2·5
    let short = [0.1, 0.1, 0.1, 0.1, 0.9, 0.9, 0.9, 0.9, 0.9];
    assert!(segment(&short, 5, 0.0).is_empty());
    assert_eq!(segment(&short, 4, 0.0), vec![4]);
}

/// Hand computed: x = [0, 1, 1, 2, 0, 3], segments of at least 2, no
/// penalty. Admissible segmentations and their sums of squares: none 6.83,
/// [2] 0.5 + 5 = 5.5, [3] 2/3 + 14/3 = 5.33, [4] 2 + 4.5 = 6.5, [2, 4] 0.5 +
/// 0.5 + 4.5 = 5.5: the optimum is [3]. (Plain PELT pruning discards the
/// candidate 3 at t = 5, where 2/3 + C(3,5) = 2.67 exceeds f(5) = 2.5, but 5
/// cannot end a segment before t = 7, so the bound behind the rule does not
/// hold at t = 6; `segment` keeps a pruned candidate until t + min_len.)
#[test]
fn segment_min_len_keeps_the_optimum() {
    let x = [0.0, 1.0, 1.0, 2.0, 0.0, 3.0];
    assert_close(penalised_cost(&x, &[3], 2, 0.0).unwrap(), 16.0 / 3.0, 1e-12);
    assert_close(penalised_cost(&x, &[2], 2, 0.0).unwrap(), 5.5, 1e-12);
    assert_eq!(segment(&x, 2, 0.0), vec![3]);
}

/// Constructed case: the optimum of the penalised cost is defined
/// independently of the algorithm; an exhaustive search over every
/// admissible last segment (no pruning) gives it. The pruned search must
/// reach the same cost on seeded noisy step series, for several minimum
/// segment lengths and penalties.
#[test]
fn segment_reaches_the_exhaustive_optimum() {
    let mut rng = ChaCha8Rng::seed_from_u64(11);
    let noise = Normal::new(0.0, 0.05).unwrap();
    for case in 0..200 {
        let n = rng.random_range(10..70);
        let mut level = 0.5;
        let x: Vec<f64> = (0..n)
            .map(|_| {
                if rng.random_bool(0.08) {
                    level = rng.random_range(0.0..1.0);
                }
                level + noise.sample(&mut rng)
            })
            .collect();
        let min_len = rng.random_range(1..8);
        let penalty = [0.0, 0.005, 0.02, 0.1][case % 4];
        let b = segment(&x, min_len, penalty);
        let best = if n < 2 * min_len {
            // one segment only
            penalised_cost(&x, &[], min_len, penalty).unwrap()
        } else {
            exhaustive_optimum(&x, min_len, penalty)
        };
        let got = penalised_cost(&x, &b, min_len, penalty)
            .unwrap_or_else(|| panic!("case {case}: segment shorter than {min_len}: {b:?}"));
        assert!(
            got <= best + 1e-9,
            "case {case}: n {n}, min_len {min_len}, penalty {penalty}: cost {got} of {b:?} above the optimum {best}"
        );
    }
}

/// Constructed case: seeded normal noise of σ 0.03 on two large steps (0.5
/// and −0.4); differences of independent normals have σ·√2, and the
/// MAD-based estimate is robust to the two step differences: σ within 15 %.
#[test]
fn noise_sigma_of_known_noise() {
    let mut rng = ChaCha8Rng::seed_from_u64(3);
    let normal = Normal::new(0.0, 0.03).unwrap();
    let x: Vec<f64> = (0..3000)
        .map(|i| {
            let level = if i < 1000 {
                0.2
            } else if i < 2000 {
                0.7
            } else {
                0.3
            };
            level + normal.sample(&mut rng)
        })
        .collect();
    assert_close(noise_sigma(&x), 0.03, 0.15 * 0.03);
    // noise-free steps: no noise
    let mut y = vec![0.2; 50];
    y.extend(vec![0.8; 50]);
    assert_eq!(noise_sigma(&y), 0.0);
}

/// Constructed case: interbedded clean sand (class 2: Jd 0.025, λ 2.2, Swirr
/// 0.09; 600 mD, φ 0.24) and tight rock (class 1: Jd 0.06, λ 1.0, Swirr 0.32;
/// 0.5 mD, φ 0.10) 40-61 m above the FWL, SW = SWH ± 0.01. Hand computed at
/// 50 m (Δρ 0.29, Pc = 0.29·1.4223·50 = 20.6 psi, J = 0.2166·Pc/26·√(k/φ)):
/// sand J 8.6, Sw 0.09; tight J 0.38, Sw 0.43: a 0.33 step at every one of
/// the six bed boundaries, each explained by the rock. The tight beds' SW
/// falls with height, so the logs fix the FWL near 2085.
#[test]
fn interbed_far_above_fwl_is_rock_quality() {
    let (w, m, c, bounds) = interbeds();
    let a = run(&w, &m, &c);
    assert_eq!(a.steps.len(), bounds.len(), "{:#?}", a.steps);
    for (s, &b) in a.steps.iter().zip(&bounds) {
        assert!(
            s.row.abs_diff(b) <= 1,
            "step at row {} for boundary {b}",
            s.row
        );
        assert_eq!(s.kind, StepKind::RockQuality, "{s:#?}");
        let z = 0.5 * (w.tvdss[b - 1] + w.tvdss[b]);
        assert_close(s.tvdss, z, DZ);
        assert_close(s.depth_md, z + KB, DZ);
        assert_close(s.hafwl, FWL - z, DZ);
        let (above, below) = if (b / BED) % 2 == 1 { (2, 1) } else { (1, 2) };
        assert_eq!((s.class_above, s.class_below), (above, below));
        assert!((s.sw_below - s.sw_above).abs() > 0.25, "{s:#?}");
    }
    let f = a.implied_fwl.expect("implied FWL");
    assert!(f.agrees, "{f:#?}");
    match (f.upper, f.lower) {
        (Some(u), Some(l)) => assert!(u <= FWL && FWL <= l, "{f:#?}"),
        (Some(u), None) => assert!(u <= FWL, "{f:#?}"),
        (None, Some(l)) => assert!(FWL <= l, "{f:#?}"),
        (None, None) => panic!("the tight beds bound the FWL: {f:#?}"),
    }
}

/// One clean-sand class (Jd 0.025, λ 2.2, Swirr 0.09; 600 mD, φ 0.24) from
/// 2070 to 2100 m, SW = SWH with the FWL at 2085 (no noise).
fn uniform_bed() -> Well {
    let c = comp(FWL, 1.07, 0.78);
    let m = model(two_classes(), &c);
    let tvdss: Vec<f64> = (0..=196).map(|i| 2070.0 + i as f64 * DZ).collect();
    let rock = vec![(2.0, K2, PHI2); tvdss.len()];
    Well::new(tvdss, &rock, &m, &c)
}

/// Hand computed entry height of the clean sand: J per m of height =
/// 0.2166·(0.29·1.4223 psi/m)/26·√(600/0.24) = 0.1717; h_d = Jd/0.1717 =
/// 0.146 m. Above it SW falls to 0.10 within a metre; below it SW is 1.
const ENTRY_H: f64 = 0.146;

/// Constructed case: one rock, SW = SWH with the FWL at 2085: the contact
/// is at FWL + entry height (2084.85); every step there is a fluid contact
/// where the model puts it (within the 2 m contact tolerance), the deepest
/// has water (SW 1) below, and the logs imply the FWL 2085 (SW = SWH exactly
/// there).
#[test]
fn uniform_bed_crossing_its_entry_height_is_fluid_contact() {
    let w = uniform_bed();
    let c = comp(FWL, 1.07, 0.78);
    let m = model(two_classes(), &c);
    let a = run(&w, &m, &c);
    assert!(!a.steps.is_empty());
    for s in &a.steps {
        assert_eq!(s.kind, StepKind::FluidContact, "{s:#?}");
        assert_close(s.tvdss, FWL - ENTRY_H, 1.0);
        assert!(s.sw_below > s.sw_above, "{s:#?}");
        assert_eq!((s.class_above, s.class_below), (2, 2));
        let h = s.model_height.expect("model height");
        assert!((h - s.hafwl).abs() <= 2.0, "{s:#?}");
        assert!((ENTRY_H - 0.01..1.0).contains(&h), "{s:#?}");
    }
    let s = a.steps.last().unwrap();
    assert_close(s.tvdss, FWL - ENTRY_H, 0.5);
    assert!(s.sw_below > 0.95, "{s:#?}");
    let f = a.implied_fwl.expect("implied FWL");
    let fwl = f.fwl_tvdss.expect("closed range");
    assert_close(fwl, FWL, 0.5);
    assert!(f.agrees, "{f:#?}");
}

/// Constructed case: the uniform bed has one contact, so one step. Hand
/// computed SWH at 0.52, 0.37, 0.22 and 0.06 m above the FWL (samples 95-98):
/// 0.145, 0.207, 0.468, 1; the transition zone is thinner than a metre but
/// its four samples (0.61 m) pass the 0.6 m minimum bed, so the segmentation
/// alone cuts it into a staircase of two steps, which must be merged.
#[test]
fn one_contact_is_one_step() {
    let w = uniform_bed();
    let c = comp(FWL, 1.07, 0.78);
    let m = model(two_classes(), &c);
    let a = run(&w, &m, &c);
    assert_eq!(a.steps.len(), 1, "{:#?}", a.steps);
    assert_close(a.steps[0].tvdss, FWL - ENTRY_H, 0.5);
}

/// Constructed case: the profile of the uniform bed (contact from an FWL at
/// 2085) audited in a compartment whose FWL is 2100 (SWH recomputed with it):
/// the step sits 15 m above that FWL where the model gives this rock its
/// middle saturation within a metre of it: unexplained; the logs still imply
/// 2085, 15 m from 2100, beyond the 2 m tolerance: no agreement.
#[test]
fn contact_under_the_wrong_fwl_is_unexplained() {
    let mut w = uniform_bed();
    let c = comp(2100.0, 1.07, 0.78);
    let m = model(two_classes(), &c);
    w.set_swh(&m, &c);
    let a = run(&w, &m, &c);
    assert!(!a.steps.is_empty());
    for s in &a.steps {
        assert_eq!(s.kind, StepKind::Unexplained, "{s:#?}");
        assert_close(s.hafwl, 2100.0 - (FWL - ENTRY_H), 1.0);
    }
    let f = a.implied_fwl.expect("implied FWL");
    assert_close(f.fwl_tvdss.expect("closed range"), FWL, 0.5);
    assert!(!f.agrees, "{f:#?}");
}

/// Constructed case: the interbedded profile with bad hole (FLAG bit 1) on the
/// two samples either side of the third bed boundary: that step is flagged,
/// the other five remain rock-quality steps.
#[test]
fn bad_hole_at_the_step_is_flagged() {
    let (mut w, m, c, bounds) = interbeds();
    let bad = bounds[2];
    w.flag[bad - 1] = 1.0;
    w.flag[bad] = 1.0;
    let a = run(&w, &m, &c);
    assert_eq!(a.steps.len(), bounds.len(), "{:#?}", a.steps);
    for (s, &b) in a.steps.iter().zip(&bounds) {
        assert!(
            s.row.abs_diff(b) <= 1,
            "step at row {} for boundary {b}",
            s.row
        );
        let want = if b == bad {
            StepKind::Flagged
        } else {
            StepKind::RockQuality
        };
        assert_eq!(s.kind, want, "{s:#?}");
    }
}

/// formulas.md §8.7: one Brooks-Corey J-curve (Jd 0.05, λ 1.5, Swirr 0.10),
/// σcosθ 26, Δρ 0.30; class A 500 mD φ 0.25, class B 5 mD φ 0.15; at 20 ft
/// above the FWL, Sw 0.11058 (A) and 0.32804 (B). Here A lies over B with
/// the boundary at 20 ft (6.096 m), SW constant 0.111 and 0.328: a
/// rock-quality step. The audit's SWH is the mean over the four samples
/// either side (20.25-21.75 ft in A, 18.25-19.75 ft in B); from the sheet,
/// Sw − Swirr ∝ J^−λ ∝ h^−1.5, so the expected means are
/// 0.10 + (Sw₂₀ − 0.10)·mean((20/h)^1.5): 0.1098 (A) and 0.3467 (B).
#[test]
fn formulas_sheet_8_7_step() {
    let c = comp(FWL, 1.30, 1.00);
    let curve = bc(0.05, 1.5, 0.10);
    let m = model(vec![curve.clone(), curve], &c);
    let h20 = 20.0 * 0.3048;
    let t0 = FWL - h20 - 19.5 * DZ;
    let tvdss: Vec<f64> = (0..40).map(|i| t0 + i as f64 * DZ).collect();
    let rock: Vec<(f64, f64, f64)> = (0..40)
        .map(|i| {
            if i < 20 {
                (1.0, 500.0, 0.25)
            } else {
                (2.0, 5.0, 0.15)
            }
        })
        .collect();
    let mut w = Well::new(tvdss, &rock, &m, &c);
    w.sw = (0..40)
        .map(|i| if i < 20 { 0.111 } else { 0.328 })
        .collect();
    let a = run(&w, &m, &c);
    assert_eq!(a.steps.len(), 1, "{:#?}", a.steps);
    let s = &a.steps[0];
    assert_eq!(s.kind, StepKind::RockQuality, "{s:#?}");
    assert_eq!(s.row, 20);
    assert_close(s.hafwl, h20, 1e-6);
    assert_eq!((s.class_above, s.class_below), (1, 2));
    assert_close(s.sw_above, 0.11058, 0.01);
    assert_close(s.sw_below, 0.32804, 0.01);
    let sheet_mean = |sw20: f64, hs: [f64; 4]| {
        0.10 + (sw20 - 0.10) * hs.iter().map(|h| (20.0 / h).powf(1.5)).sum::<f64>() / 4.0
    };
    let want_a = sheet_mean(0.11058, [20.25, 20.75, 21.25, 21.75]);
    let want_b = sheet_mean(0.32804, [18.25, 18.75, 19.25, 19.75]);
    assert_close(want_a, 0.1098, 1e-4);
    assert_close(want_b, 0.3467, 1e-4);
    assert_close(s.swh_above, want_a, 0.003);
    assert_close(s.swh_below, want_b, 0.003);
    // the sheet's values at the boundary itself
    assert_close(s.swh_above, 0.11058, 0.01);
    assert_close(s.swh_below, 0.32804, 0.025);
}

/// The model seen at the logs' resolution: a constant stays put, a sharp
/// step 0 → 1 becomes symmetric about the boundary (the two samples either
/// side of it sum to 1, as a symmetric kernel gives), NaN stays NaN, and a
/// width under one sample changes nothing (constructed cases).
#[test]
fn blur_to_log_resolution() {
    let flat = super::blur(&[0.3; 20], 4.0);
    assert!(flat.iter().all(|v| (v - 0.3).abs() < 1e-12));
    let step: Vec<f64> = (0..40).map(|i| if i < 20 { 0.0 } else { 1.0 }).collect();
    let b = super::blur(&step, 4.0);
    assert_close(b[19] + b[20], 1.0, 1e-12);
    assert!(b[19] > 0.05 && b[19] < 0.5, "{}", b[19]);
    assert_close(b[0], 0.0, 1e-12);
    assert!(b.windows(2).all(|w| w[1] >= w[0]));
    let mut gap = step.clone();
    gap[5] = f64::NAN;
    assert!(super::blur(&gap, 4.0)[5].is_nan());
    assert_eq!(super::blur(&step, 0.5), step);
}

/// Beds that all put the FWL at one level give a range of that level; beds
/// that disagree (optima 95-105 m, one per bed) give a range inside their
/// spread and wider than one grid step; fewer than three beds give none
/// (constructed cases; misfit quadratic about each bed's own optimum).
#[test]
fn bed_bootstrap_widens_with_disagreeing_beds() {
    // five beds of four rows each, separated by gaps in the row numbers
    let rows: Vec<usize> = (0..5)
        .flat_map(|b| (0..4).map(move |k| b * 10 + k))
        .collect();
    let same = super::bed_bootstrap(&rows, 100.0, |_, f| (f - 100.0).powi(2)).expect("range");
    assert_eq!(same, (100.0, 100.0));
    let optimum = |i: usize| 95.0 + 2.5 * (i / 10) as f64;
    let spread =
        super::bed_bootstrap(&rows, 100.0, |i, f| (f - optimum(i)).powi(2)).expect("range");
    assert!(spread.0 >= 95.0 && spread.1 <= 105.0, "{spread:?}");
    assert!(spread.1 - spread.0 > 0.5, "{spread:?}");
    assert!(spread.0 < 100.0 && spread.1 > 100.0, "{spread:?}");
    assert_eq!(super::bed_bootstrap(&rows[..8], 100.0, |_, f| f), None);
}

/// Coverage of the implied-FWL range on `wells` constructed wells (seeded)
/// with a known FWL: beds 1-4 m thick of either class from 30 m above the
/// FWL to `base_m` below it (negative: above it), SW = SWH plus a bias per
/// bed (sd `bias_sd`, standing for the rock and blur each bed reads
/// differently) plus noise per sample (sd 0.02). Returns (wells with a
/// closed range, wells whose range holds the FWL, wells flagged off the FWL,
/// mean range width m).
fn fwl_coverage(wells: u64, base_m: f64, bias_sd: f64) -> (usize, usize, usize, f64) {
    let c = comp(FWL, 1.07, 0.78);
    let m = model(two_classes(), &c);
    let (mut held, mut flagged, mut ranged, mut width) = (0usize, 0usize, 0usize, 0.0);
    for seed in 0..wells {
        let mut rng = ChaCha8Rng::seed_from_u64(1000 + seed);
        let bias = Normal::new(0.0, bias_sd).expect("sd");
        let noise = Normal::new(0.0, 0.02).expect("sd");
        let top = FWL - 30.0;
        let n = ((30.0 + base_m) / DZ) as usize;
        let tvdss: Vec<f64> = (0..n).map(|i| top + i as f64 * DZ).collect();
        let mut rock = Vec::with_capacity(n);
        let mut biases = Vec::with_capacity(n);
        while rock.len() < n {
            let len = rng.random_range((1.0 / DZ) as usize..=(4.0 / DZ) as usize);
            let r = if rng.random_bool(0.5) {
                (2.0, K2, PHI2)
            } else {
                (1.0, K1, PHI1)
            };
            let b = bias.sample(&mut rng);
            for _ in 0..len.min(n - rock.len()) {
                rock.push(r);
                biases.push(b);
            }
        }
        let mut w = Well::new(tvdss, &rock, &m, &c);
        for (v, b) in w.sw.iter_mut().zip(&biases) {
            *v = (*v + b + noise.sample(&mut rng)).clamp(0.0, 1.0);
        }
        let a = run(&w, &m, &c);
        let Some(f) = a.implied_fwl else { continue };
        flagged += usize::from(!f.agrees);
        let (Some(lo), Some(hi)) = (f.lower, f.upper) else {
            continue;
        };
        let (lo, hi) = (lo.min(hi), lo.max(hi));
        ranged += 1;
        width += hi - lo;
        held += usize::from(lo <= FWL && FWL <= hi);
    }
    (ranged, held, flagged, width / ranged.max(1) as f64)
}

/// The implied-FWL range is never over-confident, and one FWL per
/// compartment gives (almost) no "another compartment" flags: on 200
/// constructed wells per case, logged through the FWL (to 4 m below) or
/// stopping 3 m above it, with per-bed SW bias sd 0.03 or 0.06, the range
/// (nominally 68 %, the 16th-84th percentile of the bed bootstrap) holds the
/// true FWL at least 0.61 of the time (68 % less two binomial standard
/// errors of 200 wells), and at most 2 % of wells are flagged. Measured
/// 2026-12-04: coverage 0.975, 0.940, 0.960, 0.885, mean widths 1.8-5.4 m,
/// flags 0-3 of 200: the range is conservative when the classes are right
/// (on the blind benchmark, with a third of the classes wrong, it holds the
/// truth in 0.71-0.79 of wells).
#[test]
fn implied_fwl_range_holds_the_truth_about_as_often_as_it_claims() {
    for (base, bias) in [(4.0, 0.03), (4.0, 0.06), (-3.0, 0.03), (-3.0, 0.06)] {
        let (ranged, held, flagged, width) = fwl_coverage(200, base, bias);
        let coverage = held as f64 / ranged.max(1) as f64;
        let case = format!("base {base} m, bias sd {bias}: {held} of {ranged}, width {width:.2} m");
        assert!(ranged >= 180, "{case}");
        assert!(coverage >= 0.61, "over-confident: {case}");
        assert!(flagged <= 4, "{flagged} flagged under one FWL: {case}");
    }
}
