//! The Monte Carlo's fast path: when a well's zones all use Archie's
//! equation and only its saturation inputs are uncertain (Rw, a, m, n, at
//! any level including per class), shale volume, porosity and so net
//! reservoir are the deterministic run's in every realisation. Only SW
//! changes, and only at net-reservoir depths does it matter; there
//! ln SW = (ln a + ln Rw − m·ln φ − ln Rt) / n, with ln φ and ln Rt taken
//! once per depth, is one exponential per depth and realisation.
//!
//! The sums are the zone summary's (thickness by the midpoint rule, cutoffs
//! by class, pore-volume-weighted SW, HPT = Σ φ·(1 − SW)·h); a test checks
//! that this path and the general one (the whole chain per realisation)
//! agree on every zone.

use crate::config::Config;
use crate::input::curves::LogicalCurve as L;
use crate::output::schema::Col;
use crate::petro::saturation::{ArchieParams, SaturationModel};
use crate::well::WellOutput;
use crate::well::summary::{class_number, sample_edges};

use super::Samples;

/// Keys the fast path takes: they change SW only.
const SW_ONLY: [&str; 4] = ["rw-ohmm", "archie-a", "archie-m", "archie-n"];

/// One net-reservoir depth: what a realisation needs of it.
struct Depth {
    /// Index into the zone's class table (0: no class, the zone's exponents).
    class: usize,
    /// ln φ.
    ln_phi: f64,
    /// ln Rw (the deterministic run's, at this depth's temperature) − ln Rt.
    ln_rw_rt: f64,
    /// φ·h.
    phi_h: f64,
    /// h.
    h: f64,
    /// ln of the SW cutoff of the depth's class: the pay test is made on
    /// ln SW, so a depth that is not pay costs no exponential.
    ln_sw_max: f64,
}

/// One zone of the well.
struct Zone {
    name: String,
    depths: Vec<Depth>,
    /// Deterministic PHIE average over net reservoir (it does not change).
    phie_avg: f64,
    /// (key, variable) of the zone's own sampled keys.
    vars: Vec<(&'static str, usize)>,
    /// The best Rw of the zone (its sampled Rw scales every depth's Rw:
    /// the temperature correction is proportional to Rw).
    rw_best: f64,
    /// The zone's Archie a, m, n (best values).
    archie: ArchieParams,
    /// Per class 1, 2, ... (index 1 on; index 0 is "no class"), the a, m, n
    /// a class level sets (`None`: the class follows the zone's value).
    class_set: Vec<[Option<f64>; 3]>,
    /// Per class (index as `archie`), (key, variable) set at class level.
    class_vars: Vec<Vec<(&'static str, usize)>>,
}

/// An interpreted depth, for SW at every depth (`depth-percentiles`).
struct AnyDepth {
    /// Row in the well.
    row: usize,
    /// Zone (index into the zones as first listed) and class index.
    zone: usize,
    class: usize,
    ln_phi: f64,
    ln_rw_rt: f64,
}

/// The well prepared for the fast path; `None` when it does not qualify.
pub struct FastWell {
    zones: Vec<Zone>,
    /// Every interpreted depth, when SW at every depth is asked for.
    all: Vec<AnyDepth>,
    /// Index into `zones` of each zone of the well's setup order.
    slot_of: Vec<Option<usize>>,
}

impl FastWell {
    /// Prepare `w` when every zone uses Archie and only [`SW_ONLY`] keys
    /// are sampled in it.
    pub fn prepare(
        w: &WellOutput,
        names: &[&str],
        config: &Config,
        every_depth: bool,
    ) -> Option<FastWell> {
        let t = &w.table;
        let params = &config.parameters;
        let zone_names: Vec<&str> = w.report.zones.iter().map(|z| z.name.as_str()).collect();
        let by_class = w.report.class_exponents.as_ref();
        let max_class = by_class
            .and_then(|c| c.by_zone.first())
            .map_or(0, |(_, t)| u8::try_from(t.len()).unwrap_or(u8::MAX));
        let mut zones: Vec<Zone> = Vec::with_capacity(zone_names.len());
        for (z, setup) in zone_names.iter().zip(&w.report.zones) {
            if setup.params.saturation_model != SaturationModel::Archie {
                return None;
            }
            let vars = params.for_well_zone(names, z).vars();
            if vars.iter().any(|(k, _)| !SW_ONLY.contains(k)) {
                return None;
            }
            let mut class_set = vec![[None; 3]];
            let mut class_vars = vec![Vec::new()];
            if by_class.is_some() {
                // a NaN base shows which keys no class level sets
                let nan = ArchieParams {
                    a: f64::NAN,
                    m: f64::NAN,
                    n: f64::NAN,
                };
                class_set.extend(
                    params
                        .class_archie(z, nan, max_class)
                        .into_iter()
                        .map(|p| [p.a, p.m, p.n].map(|v| Some(v).filter(|v| !v.is_nan()))),
                );
                class_vars.extend(params.class_archie_vars(z, max_class));
            }
            zones.push(Zone {
                name: setup.name.clone(),
                depths: Vec::new(),
                phie_avg: f64::NAN,
                vars,
                rw_best: setup.params.rw_ohmm.unwrap_or(f64::NAN),
                archie: setup.params.archie,
                class_set,
                class_vars,
            });
        }
        let n = t.n_rows();
        let (md, vsh, phie, sw, rt) = (
            t.get(Col::Depth)?,
            t.get(Col::Vsh)?,
            t.get(Col::Phie)?,
            t.get(Col::Sw)?,
            t.get(Col::Input(L::DeepResistivity))?,
        );
        let class = t.get(Col::Class);
        let cutoffs = config.summary.cutoffs_by_class();
        let mut phi_h_res = vec![0.0; zones.len()];
        let mut h_res = vec![0.0; zones.len()];
        let mut order: Vec<usize> = Vec::new();
        let mut all: Vec<AnyDepth> = Vec::new();
        for i in 0..n {
            let Some(z) = w.zone_of[i].map(usize::from).filter(|&z| z < zones.len()) else {
                continue;
            };
            if !order.contains(&z) {
                order.push(z);
            }
            let (v, p, s) = (vsh[i], phie[i], sw[i]);
            if !(v.is_finite() && p.is_finite() && s.is_finite()) {
                continue;
            }
            let c = class.map_or(f64::NAN, |c| c[i]);
            let cls = class_number(c).map_or(0, usize::from);
            let cut = &cutoffs[cls];
            let k = if by_class.is_some() && cls < zones[z].class_set.len() {
                cls
            } else {
                0
            };
            if every_depth {
                all.push(AnyDepth {
                    row: i,
                    zone: z,
                    class: k,
                    ln_phi: p.ln(),
                    ln_rw_rt: w.rw[i].ln() - rt[i].ln(),
                });
            }
            if !cut.is_net_reservoir(v, p) {
                continue;
            }
            let (upper, lower) = sample_edges(md, i);
            let h = lower - upper;
            phi_h_res[z] += p * h;
            h_res[z] += h;
            zones[z].depths.push(Depth {
                class: k,
                ln_phi: p.ln(),
                ln_rw_rt: w.rw[i].ln() - rt[i].ln(),
                phi_h: p * h,
                h,
                ln_sw_max: cut.sw_max.ln(),
            });
        }
        for (z, zone) in zones.iter_mut().enumerate() {
            zone.phie_avg = if h_res[z] == 0.0 {
                f64::NAN
            } else {
                phi_h_res[z] / h_res[z]
            };
        }
        // the zones in the order they first appear down the well, as the
        // zone summary lists them
        let mut ordered: Vec<Zone> = Vec::with_capacity(order.len());
        let mut slot_of: Vec<Option<usize>> = vec![None; zones.len()];
        let mut slots: Vec<Option<Zone>> = zones.into_iter().map(Some).collect();
        for z in order {
            if let Some(zone) = slots[z].take() {
                slot_of[z] = Some(ordered.len());
                ordered.push(zone);
            }
        }
        Some(FastWell {
            zones: ordered,
            all,
            slot_of,
        })
    }

    /// Every zone's (net pay, PHIE average, SW average, HPT) in every
    /// realisation: `out[zone]` (in [`Self::zone_names`] order), one row per
    /// realisation.
    pub fn run(&self, samples: &Samples) -> Vec<(String, Vec<[f64; 4]>)> {
        self.zones
            .iter()
            .map(|zone| {
                let rows = (0..samples.realisations)
                    .map(|r| zone_realisation(zone, samples, r))
                    .collect();
                (zone.name.clone(), rows)
            })
            .collect()
    }
}

impl FastWell {
    /// SW at every interpreted depth in every realisation: `n` rows ×
    /// realisations, depth-major; NaN elsewhere. Needs `every_depth` at
    /// [`FastWell::prepare`].
    pub fn sw_at_depths(&self, samples: &Samples, n: usize) -> Vec<f64> {
        let rr = samples.realisations;
        let mut out = vec![f64::NAN; n * rr];
        for r in 0..rr {
            let coefs: Vec<Vec<(f64, f64, f64)>> = self
                .zones
                .iter()
                .map(|z| coefficients(z, samples, r).0)
                .collect();
            for d in &self.all {
                let Some(z) = self.slot_of.get(d.zone).copied().flatten() else {
                    continue;
                };
                let (c, m, inv_n) = coefs[z][d.class];
                out[d.row * rr + r] = ((c + d.ln_rw_rt - m * d.ln_phi) * inv_n).exp().min(1.0);
            }
        }
        out
    }
}

/// A zone's per-class (ln a + ln Rw factor, m, 1/n) in realisation `r`,
/// and the zone's Archie values.
fn coefficients(zone: &Zone, samples: &Samples, r: usize) -> (Vec<(f64, f64, f64)>, ArchieParams) {
    let value = |var: usize| samples.values[var][r];
    // the zone's own values, then each class's over them, as the chain
    // resolves them (a class level wins key by key)
    let mut zone_archie = zone.archie;
    let mut rw_factor = 1.0;
    for &(key, var) in &zone.vars {
        match key {
            "rw-ohmm" => rw_factor = value(var) / zone.rw_best,
            "archie-a" => zone_archie.a = value(var),
            "archie-m" => zone_archie.m = value(var),
            _ => zone_archie.n = value(var),
        }
    }
    let ln_f = rw_factor.ln();
    // per class: ln a + ln(Rw factor), m, 1/n
    let coef: Vec<(f64, f64, f64)> = zone
        .class_set
        .iter()
        .zip(&zone.class_vars)
        .enumerate()
        .map(|(k, (set, vars))| {
            let mut a = zone_archie;
            if k > 0 {
                a.a = set[0].unwrap_or(a.a);
                a.m = set[1].unwrap_or(a.m);
                a.n = set[2].unwrap_or(a.n);
                for &(key, var) in vars {
                    match key {
                        "archie-a" => a.a = value(var),
                        "archie-m" => a.m = value(var),
                        _ => a.n = value(var),
                    }
                }
            }
            (a.a.ln() + ln_f, a.m, 1.0 / a.n)
        })
        .collect();
    (coef, zone_archie)
}

/// One zone in realisation `r`: (net pay, PHIE average, SW average, HPT).
fn zone_realisation(zone: &Zone, samples: &Samples, r: usize) -> [f64; 4] {
    let (coef, _) = coefficients(zone, samples, r);
    let (mut pay, mut phi_h, mut phi_sw_h, mut hpt) = (0.0, 0.0, 0.0, 0.0);
    for d in &zone.depths {
        let (c, m, inv_n) = coef[d.class];
        let ln_sw = (c + d.ln_rw_rt - m * d.ln_phi) * inv_n;
        if ln_sw <= d.ln_sw_max {
            let sw = ln_sw.exp().min(1.0);
            pay += d.h;
            phi_h += d.phi_h;
            phi_sw_h += d.phi_h * sw;
            hpt += d.phi_h * (1.0 - sw);
        }
    }
    let sw_avg = if phi_h == 0.0 {
        f64::NAN
    } else {
        phi_sw_h / phi_h
    };
    [pay, zone.phie_avg, sw_avg, hpt]
}
