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

/// One interpreted depth: what a realisation needs of it.
struct Depth {
    /// Row in the well.
    row: usize,
    /// The deterministic run's class number (0: none).
    class: u8,
    vsh: f64,
    phie: f64,
    /// ln φ.
    ln_phi: f64,
    /// ln Rw (the deterministic run's, at this depth's temperature) − ln Rt.
    ln_rw_rt: f64,
    /// Thickness h (midpoint rule).
    h: f64,
}

/// One zone of the well.
struct Zone {
    name: String,
    depths: Vec<Depth>,
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

/// The well prepared for the fast path; `None` when it does not qualify.
pub struct FastWell {
    /// The zones in the order they first appear down the well.
    zones: Vec<Zone>,
    /// Per class number (0: none): VSH maximum, PHIE minimum, ln SW maximum.
    cutoffs: Vec<(f64, f64, f64)>,
    /// Whether SW takes its exponents from the class.
    by_class: bool,
}

impl FastWell {
    /// Prepare `w` when every zone uses Archie and only [`SW_ONLY`] keys
    /// are sampled in it.
    pub fn prepare(w: &WellOutput, names: &[&str], config: &Config) -> Option<FastWell> {
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
        let mut order: Vec<usize> = Vec::new();
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
            let (upper, lower) = sample_edges(md, i);
            zones[z].depths.push(Depth {
                row: i,
                class: class.and_then(|c| class_number(c[i])).unwrap_or(0),
                vsh: v,
                phie: p,
                ln_phi: p.ln(),
                ln_rw_rt: w.rw[i].ln() - rt[i].ln(),
                h: lower - upper,
            });
        }
        // the zones in the order they first appear down the well, as the
        // zone summary lists them
        let mut ordered: Vec<Zone> = Vec::with_capacity(order.len());
        let mut slots: Vec<Option<Zone>> = zones.into_iter().map(Some).collect();
        for z in order {
            if let Some(zone) = slots[z].take() {
                ordered.push(zone);
            }
        }
        let cutoffs = config
            .summary
            .cutoffs_by_class()
            .iter()
            .map(|c| (c.vsh_max, c.phie_min, c.sw_max.ln()))
            .collect();
        Some(FastWell {
            zones: ordered,
            cutoffs,
            by_class: by_class.is_some(),
        })
    }

    /// Every zone's (net pay, PHIE average, SW average, HPT) in every
    /// realisation, the zones in the order they first appear down the well.
    /// `classes`: each realisation's class column (realisation-major, 0 =
    /// the deterministic class), when classes are drawn.
    pub fn run(&self, samples: &Samples, classes: Option<&[u8]>) -> Vec<(String, Vec<[f64; 4]>)> {
        self.zones
            .iter()
            .map(|zone| {
                let rows = (0..samples.realisations)
                    .map(|r| self.zone_realisation(zone, samples, r, classes))
                    .collect();
                (zone.name.clone(), rows)
            })
            .collect()
    }

    /// The class number of depth `d` in realisation `r`, and the index of
    /// its exponents in the zone's table.
    fn class_of(
        &self,
        zone: &Zone,
        d: &Depth,
        r: usize,
        n_rows: usize,
        classes: Option<&[u8]>,
    ) -> (usize, usize) {
        let drawn = classes.map_or(0, |c| c[r * n_rows + d.row]);
        let cn = usize::from(if drawn > 0 { drawn } else { d.class });
        let k = if self.by_class && cn < zone.class_set.len() {
            cn
        } else {
            0
        };
        (cn, k)
    }

    /// SW at every interpreted depth in every realisation: `n` rows ×
    /// realisations, depth-major; NaN elsewhere.
    pub fn sw_at_depths(&self, samples: &Samples, n: usize, classes: Option<&[u8]>) -> Vec<f64> {
        let rr = samples.realisations;
        let mut out = vec![f64::NAN; n * rr];
        for r in 0..rr {
            for zone in &self.zones {
                let (coef, _) = coefficients(zone, samples, r);
                for d in &zone.depths {
                    let (_, k) = self.class_of(zone, d, r, n, classes);
                    let (c, m, inv_n) = coef[k];
                    out[d.row * rr + r] = ((c + d.ln_rw_rt - m * d.ln_phi) * inv_n).exp().min(1.0);
                }
            }
        }
        out
    }

    /// One zone in realisation `r`: (net pay, PHIE average, SW average, HPT),
    /// the sums of the zone summary.
    fn zone_realisation(
        &self,
        zone: &Zone,
        samples: &Samples,
        r: usize,
        classes: Option<&[u8]>,
    ) -> [f64; 4] {
        let (coef, _) = coefficients(zone, samples, r);
        let n_rows = classes.map_or(0, |c| c.len() / samples.realisations.max(1));
        let (mut h_res, mut phi_h_res) = (0.0, 0.0);
        let (mut pay, mut phi_h, mut phi_sw_h, mut hpt) = (0.0, 0.0, 0.0, 0.0);
        for d in &zone.depths {
            let (cn, k) = self.class_of(zone, d, r, n_rows, classes);
            let (vsh_max, phie_min, ln_sw_max) = self.cutoffs[cn.min(self.cutoffs.len() - 1)];
            if !(d.vsh <= vsh_max && d.phie >= phie_min) {
                continue;
            }
            let phi_h_d = d.phie * d.h;
            h_res += d.h;
            phi_h_res += phi_h_d;
            let (c, m, inv_n) = coef[k];
            // the pay test on ln SW: a depth that is not pay needs no exponential
            let ln_sw = (c + d.ln_rw_rt - m * d.ln_phi) * inv_n;
            // SW is clipped to 1 (ln 0) before the cutoff, as in the chain
            if ln_sw.min(0.0) <= ln_sw_max {
                let sw = ln_sw.exp().min(1.0);
                pay += d.h;
                phi_h += phi_h_d;
                phi_sw_h += phi_h_d * sw;
                hpt += phi_h_d * (1.0 - sw);
            }
        }
        let ratio = |a: f64, b: f64| if b == 0.0 { f64::NAN } else { a / b };
        [pay, ratio(phi_h_res, h_res), ratio(phi_sw_h, phi_h), hpt]
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
