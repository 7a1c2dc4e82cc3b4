//! Uncertainty: low, best and high net pay, porosity, saturation and
//! hydrocarbon pore thickness per zone, by Monte Carlo over the parameters
//! the config gives as distributions ([`crate::stats::dist`]), the class at
//! each depth and each compartment's free water level.
//!
//! What is sampled:
//! - every `[parameters.*]` key written as a distribution (Rw, Archie a, m
//!   and n at any level including per class, matrix, fluid and shale
//!   densities and transit times, shale neutron, gamma-ray clean and shale
//!   readings, shale resistivity), one value per realisation for each table
//!   that sets it: a field-wide value is the same in every well of a
//!   realisation (parameter uncertainty is systematic, not noise from depth
//!   to depth);
//! - the class at each classed depth, drawn from its probabilities, bed by
//!   bed when the bed sequence model exists (`[uncertainty] classes`);
//! - each compartment's free water level, normal about its FWL with the
//!   config's `fwl-sd` or the pressure fit's standard error
//!   ([`Samples::add_fwl`]). It moves SWH only, so it shows in the HPT from
//!   SWH ([`swh_monte_carlo`]) and SWH's per-depth percentiles.
//!
//! What is held: the logs, the zone tops, the cutoffs, every key given as a
//! number, and each class's permeability relation where it sets SW and SWH
//! (PERM's own percentiles carry the core's scatter about it).
//!
//! Each realisation runs the well's petrophysics chain
//! ([`crate::well::chain::run`]), the class-aware saturation when the run uses
//! it, and the zone summary ([`crate::well::summary::zone_summary`]) with the
//! realisation's values: the same code as the deterministic run, so the two
//! cannot drift apart ([`fast`] is a shortcut for Archie with only SW's
//! inputs uncertain, tested equal to it).
//!
//! Percentiles follow the exceedance convention of reserves reporting: P90
//! is the value exceeded in 90 % of the realisations (the 10th percentile of
//! the realisations), P10 the value exceeded in 10 %. For net pay and
//! hydrocarbon pore thickness P90 is the low case and P10 the high case; for
//! water saturation the low case is its P10 (the highest SW).

pub mod fast;

use serde::{Deserialize, Serialize};

use crate::classes::posterior::ClassEvidence;
use crate::config::Config;
use crate::config::params::Variable;
use crate::input::curves::LogicalCurve as L;
use crate::output::schema::Col;
use crate::petro::saturation::ArchieParams;
use crate::well::WellOutput;
use crate::well::chain::{self, ClassSwInputs, Inputs};
pub use crate::well::summary::{Range, ZoneRanges};

/// The run's random inputs and their sampled values.
#[derive(Debug, Clone)]
pub struct Samples {
    /// The random inputs, in the config's order.
    pub vars: Vec<Variable>,
    /// `values[var][realisation]`, in the key's unit.
    pub values: Vec<Vec<f64>>,
    /// Realisations of the run.
    pub realisations: usize,
    /// Each compartment's free water level per realisation, where it has a
    /// standard deviation ([`Samples::add_fwl`]).
    pub fwl: Vec<FwlSamples>,
}

/// One compartment's sampled free water level.
#[derive(Debug, Clone)]
pub struct FwlSamples {
    /// The compartment's name.
    pub compartment: String,
    /// Normal, mean the compartment's FWL, sd its `fwl_sigma`; TVDSS,
    /// project depth unit.
    pub dist: crate::stats::dist::Dist,
    /// The FWL in each realisation.
    pub values: Vec<f64>,
}

impl Samples {
    /// Draw every variable's values for the run; `None` when
    /// `realisations = 0` or when the config has no distribution and no
    /// compartment sets `fwl-sd`. The config was validated at load
    /// (correlations possible, distributions inside their ranges).
    pub fn draw(config: &Config) -> Result<Option<Samples>, String> {
        let u = &config.uncertainty;
        let vars = config.variables.clone();
        let fwl_sd = config.compartments.values().any(|c| c.fwl_sd.is_some());
        if (vars.is_empty() && !fwl_sd) || u.realisations == 0 {
            return Ok(None);
        }
        let target = u.matrix(&vars).map_err(|(k, m)| format!("{k}: {m}"))?;
        let p = crate::stats::sampling::probabilities(
            vars.len(),
            u.realisations,
            &target,
            u.sampling,
            u.seed,
        )?;
        let values = vars
            .iter()
            .zip(p)
            .map(|(v, col)| {
                let (lo, hi) = crate::config::params::sampled_range(v.key)
                    .unwrap_or((f64::NEG_INFINITY, f64::INFINITY));
                col.iter()
                    .map(|&q| v.dist.quantile_within(q, lo, hi).unwrap_or(v.dist.best()))
                    .collect()
            })
            .collect();
        Ok(Some(Samples {
            vars,
            values,
            realisations: u.realisations,
            fwl: Vec::new(),
        }))
    }

    /// Sample the free water level of every compartment of `sat` with a
    /// standard deviation above 0: normal about its FWL, by the run's
    /// sampling, from a stream of its own (the parameters' draws do not
    /// change when a compartment is added), independent of the parameters.
    pub fn add_fwl(
        &mut self,
        sat: &crate::sat_height::SatHeightModel,
        config: &Config,
    ) -> Result<(), String> {
        let u = &config.uncertainty;
        let with_sd: Vec<_> = sat
            .compartments
            .iter()
            .filter(|c| c.fwl_sigma.is_some_and(|s| s > 0.0) && c.fwl_tvdss.is_finite())
            .collect();
        if with_sd.is_empty() {
            return Ok(());
        }
        let k = with_sd.len();
        let mut identity = vec![0.0; k * k];
        for i in 0..k {
            identity[i * k + i] = 1.0;
        }
        let p = crate::stats::sampling::probabilities(
            k,
            self.realisations,
            &identity,
            u.sampling,
            well_seed(u.seed, "free water level"),
        )?;
        for (c, col) in with_sd.into_iter().zip(p) {
            let dist = crate::stats::dist::Dist::Normal {
                mean: c.fwl_tvdss,
                sd: c.fwl_sigma.unwrap_or(0.0),
            };
            let values = col.iter().map(|&q| dist.quantile(q)).collect();
            self.fwl.push(FwlSamples {
                compartment: c.name.clone(),
                dist,
                values,
            });
        }
        Ok(())
    }
}

/// One well's Monte Carlo: per zone (in the zone summary's order) its
/// ranges, and its HPT in every realisation (for the field's driver ranking).
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct WellUncertainty {
    /// Per zone: (zone, ranges).
    pub zones: Vec<(String, ZoneRanges)>,
    /// HPT per zone and realisation, `hpt[zone][r]`, depth unit.
    pub hpt: Vec<Vec<f64>>,
    /// HPT from SWH per zone and realisation, `(zone, values)` (empty
    /// without a saturation-height Monte Carlo).
    pub hpt_swh: Vec<(String, Vec<f64>)>,
    /// With `depth-percentiles`: SW at every depth, P90, P50 and P10
    /// (NaN where the deterministic run has no SW).
    #[serde(skip)]
    pub sw_depth: Option<[Vec<f64>; 3]>,
    /// With `depth-percentiles` and a class model: PERM at every classed
    /// depth, P90, P50 and P10, from each realisation's class and PHIE and
    /// the core's scatter about the class's relation.
    #[serde(skip)]
    pub perm_depth: Option<[Vec<f64>; 3]>,
    /// With `depth-percentiles` and a saturation-height model whose FWL or
    /// classes vary: SWH at every depth, P90, P50 and P10.
    #[serde(skip)]
    pub swh_depth: Option<[Vec<f64>; 3]>,
}

/// The class model's permeability relations: by class, and the method.
#[derive(Debug, Clone, Copy)]
pub struct PermModel<'a> {
    /// Each class's fitted relation.
    pub by_class: &'a [crate::classes::perm::ClassPerm],
    /// FZI or the log-k line.
    pub method: crate::config::PermMethod,
}

impl PermModel<'_> {
    /// PERM of class `class` (a CLASS value; NaN: none) at porosity `phie`, mD.
    fn at(&self, class: f64, phie: f64) -> f64 {
        if !(class >= 1.0 && phie > 0.0) {
            return f64::NAN;
        }
        self.relation(class)
            .map_or(f64::NAN, |c| c.perm(self.method, phie))
    }

    /// Class `class`'s fitted relation, if the model has one.
    fn relation(&self, class: f64) -> Option<&crate::classes::perm::ClassPerm> {
        self.by_class.iter().find(|c| f64::from(c.class) == class)
    }

    /// PERM at every depth in realisation `r` of `rr`, into `all[i·rr + r]`:
    /// the realisation's class relation at the depth's PHIE, scattered as
    /// the core scatters about it, k·10^(s·z) with s the class's RMS of
    /// log10 k and z a standard normal drawn per depth (Box & Muller 1958;
    /// from memory). The draws are seeded by `seed` (the well's) and `r`,
    /// one pair of uniforms per depth, so both Monte Carlo paths and any
    /// thread draw the same.
    fn realisation(
        &self,
        class: &[f64],
        phie: &[f64],
        seed: u64,
        r: usize,
        rr: usize,
        all: &mut [f64],
    ) {
        use rand::{Rng, SeedableRng};
        let stream = seed ^ 0x7065_726d_u64 ^ (r as u64).wrapping_mul(0x9e37_79b9_7f4a_7c15);
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(stream);
        for (i, (&c, &phi)) in class.iter().zip(phie).enumerate() {
            let (u1, u2): (f64, f64) = (rng.random(), rng.random());
            let z = (-2.0 * (1.0 - u1).ln()).sqrt() * (std::f64::consts::TAU * u2).cos();
            // one lookup of the class's relation gives its k and its scatter
            all[i * rr + r] = match self.relation(c).filter(|_| c >= 1.0 && phi > 0.0) {
                Some(rel) => {
                    rel.perm(self.method, phi) * 10f64.powf(rel.scatter_log10(self.method) * z)
                }
                None => f64::NAN,
            };
        }
    }
}

/// The well's zone summary in every realisation: by the fast path
/// ([`fast`]) when only SW's inputs are uncertain and the zones use Archie,
/// else by the whole chain per realisation ([`run_well_chain`]). With
/// `classes`, each realisation also draws the class of every classed depth
/// from its posterior, bed by bed ([`ClassEvidence::draw`]), seeded by the
/// run's seed and the well's name (the same draws on any thread or shard).
pub fn run_well(
    w: &WellOutput,
    names: &[&str],
    config: &Config,
    samples: &Samples,
    classes: Option<&ClassEvidence>,
    perm: Option<PermModel<'_>>,
    sat: Option<&crate::sat_height::SatHeightModel>,
) -> WellUncertainty {
    let draws = classes.map(|ev| {
        ev.draw(
            w.table.n_rows(),
            samples.realisations,
            well_seed(config.uncertainty.seed, &w.name),
        )
    });
    let mut u = run_well_logs(w, names, config, samples, draws.as_deref(), perm);
    if let Some((zones, depth)) = sat.and_then(|sat| {
        swh_monte_carlo(
            w,
            names,
            config,
            sat,
            samples,
            draws.as_deref(),
            perm.filter(|_| draws.is_some()),
        )
    }) {
        for (zone, values) in &zones {
            if let Some((_, z)) = u.zones.iter_mut().find(|(name, _)| name == zone) {
                z.hpt_swh = Some(Range::of(values));
            }
        }
        u.hpt_swh = zones;
        u.swh_depth = depth;
    }
    u
}

/// The Monte Carlo of the logs' interpretation (VSH, PHIE, SW and the zone
/// summary; see [`run_well`]).
fn run_well_logs(
    w: &WellOutput,
    names: &[&str],
    config: &Config,
    samples: &Samples,
    draws: Option<&[u8]>,
    perm: Option<PermModel<'_>>,
) -> WellUncertainty {
    let n = w.table.n_rows();
    let depth = config.uncertainty.depth_percentiles;
    // PERM per depth: the drawn class (or the run's) and the scatter about
    // its relation
    let perm = perm.filter(|_| depth);
    let perm_seed = well_seed(config.uncertainty.seed, &w.name);
    match fast::FastWell::prepare(w, names, config) {
        Some(f) => {
            let mut u = ranges(&f.run(samples, draws));
            if depth {
                u.sw_depth = Some(depth_percentiles(
                    &f.sw_at_depths(samples, n, draws),
                    samples.realisations,
                ));
            }
            if let Some(pm) = perm {
                // the fast path's PHIE is the deterministic run's
                let nan = vec![f64::NAN; n];
                let phie = w.table.get(Col::Phie).unwrap_or(&nan);
                let det = w.table.get(Col::Class).unwrap_or(&nan);
                let rr = samples.realisations;
                let mut all = vec![f64::NAN; n * rr];
                for r in 0..rr {
                    let class = class_column(det, draws, r);
                    pm.realisation(&class, phie, perm_seed, r, rr, &mut all);
                }
                u.perm_depth = Some(depth_percentiles(&all, rr));
            }
            u
        }
        None => run_well_chain(w, names, config, samples, draws, perm),
    }
}

/// The seed of a well's class draws: the run's seed mixed with the well's
/// name (FNV-1a, 64 bit: Fowler, Noll & Vo; from memory), so each well has
/// its own stream whatever order the wells run in.
fn well_seed(seed: u64, name: &str) -> u64 {
    let mut h: u64 = 0xcbf2_9ce4_8422_2325;
    for b in name.bytes() {
        h ^= u64::from(b);
        h = h.wrapping_mul(0x0000_0100_0000_01b3);
    }
    h ^ seed.rotate_left(17)
}

/// The class column of realisation `r`: the drawn class where one was
/// drawn, else the deterministic one.
fn class_column(det: &[f64], draws: Option<&[u8]>, r: usize) -> Vec<f64> {
    let n = det.len();
    match draws {
        Some(d) => det
            .iter()
            .zip(&d[r * n..(r + 1) * n])
            .map(|(&c, &k)| if k > 0 { f64::from(k) } else { c })
            .collect(),
        None => det.to_vec(),
    }
}

/// P90, P50 and P10 (exceedance) at each depth of `sw` (`n` depths ×
/// `realisations`, depth-major); NaN where no realisation has a value.
fn depth_percentiles(sw: &[f64], realisations: usize) -> [Vec<f64>; 3] {
    let n = sw.len() / realisations.max(1);
    let mut out = [vec![f64::NAN; n], vec![f64::NAN; n], vec![f64::NAN; n]];
    let mut v: Vec<f64> = Vec::with_capacity(realisations);
    for i in 0..n {
        v.clear();
        v.extend(
            sw[i * realisations..(i + 1) * realisations]
                .iter()
                .copied()
                .filter(|x| x.is_finite()),
        );
        if v.is_empty() {
            continue;
        }
        v.sort_by(f64::total_cmp);
        for (slot, p) in out.iter_mut().zip([0.10, 0.50, 0.90]) {
            slot[i] = crate::stats::quantile_sorted(&v, p);
        }
    }
    out
}

/// Each zone's ranges and HPT per realisation from its rows of (net pay,
/// PHIE average, SW average, HPT), one per realisation.
fn ranges(per_zone: &[(String, Vec<[f64; 4]>)]) -> WellUncertainty {
    let pick = |rows: &[[f64; 4]], k: usize| -> Vec<f64> { rows.iter().map(|r| r[k]).collect() };
    WellUncertainty {
        zones: per_zone
            .iter()
            .map(|(z, rows)| {
                (
                    z.clone(),
                    ZoneRanges {
                        net_pay: Range::of(&pick(rows, 0)),
                        phie_avg: Range::of(&pick(rows, 1)),
                        sw_avg: Range::of(&pick(rows, 2)),
                        hpt: Range::of(&pick(rows, 3)),
                        hpt_swh: None,
                    },
                )
            })
            .collect(),
        hpt: per_zone.iter().map(|(_, rows)| pick(rows, 3)).collect(),
        hpt_swh: Vec::new(),
        sw_depth: None,
        perm_depth: None,
        swh_depth: None,
    }
}

/// The well's zone summary in every realisation, each running the well's
/// chain, class-aware SW and zone summary again with the sampled values.
pub fn run_well_chain(
    w: &WellOutput,
    names: &[&str],
    config: &Config,
    samples: &Samples,
    draws: Option<&[u8]>,
    perm: Option<PermModel<'_>>,
) -> WellUncertainty {
    let t = &w.table;
    let n = t.n_rows();
    let nan = vec![f64::NAN; n];
    let col = |c: Col| t.get(c);
    let inputs = Inputs {
        gr: col(Col::Input(L::GammaRay)),
        rhob: col(Col::Input(L::BulkDensity)),
        nphi: col(Col::Input(L::NeutronPorosity)),
        dt: col(Col::Input(L::CompressionalSlowness)),
        rt: col(Col::Input(L::DeepResistivity)),
        cali: col(Col::Input(L::Caliper)),
        bs: col(Col::Input(L::BitSize)),
        tvd_m: &w.tvd_m,
    };
    let det_class = col(Col::Class).unwrap_or(&nan);
    let md = col(Col::Depth).unwrap_or(&nan);
    let zone_names: Vec<String> = w.report.zones.iter().map(|z| z.name.clone()).collect();
    let params = &config.parameters;
    let zone_vars: Vec<Vec<(&'static str, usize)>> = zone_names
        .iter()
        .map(|z| params.for_well_zone(names, z).vars())
        .collect();
    // the class-aware saturation, when the run applied it
    let by_class = w.report.class_exponents.as_ref().map(|c| {
        let max_class = c
            .by_zone
            .first()
            .map_or(0, |(_, t)| u8::try_from(t.len()).unwrap_or(u8::MAX));
        let vars: Vec<Vec<Vec<(&'static str, usize)>>> = zone_names
            .iter()
            .map(|z| params.class_archie_vars(z, max_class))
            .collect();
        (max_class, vars)
    });
    let mut per_zone: Vec<(String, Vec<[f64; 4]>)> = Vec::new();
    let keep_sw = config.uncertainty.depth_percentiles;
    let realisations = samples.realisations;
    let mut sw_all = if keep_sw {
        vec![f64::NAN; t.n_rows() * realisations]
    } else {
        Vec::new()
    };
    let mut perm_all = if perm.is_some() {
        vec![f64::NAN; t.n_rows() * realisations]
    } else {
        Vec::new()
    };
    for r in 0..samples.realisations {
        let value = |var: usize| samples.values[var][r];
        let class_r = class_column(det_class, draws, r);
        let class = class_r.as_slice();
        let mut setups = w.report.zones.clone();
        for (s, vars) in setups.iter_mut().zip(&zone_vars) {
            for &(key, var) in vars {
                match key {
                    "gr-clean-gapi" => s.gr_clean_gapi = value(var),
                    "gr-shale-gapi" => s.gr_shale_gapi = value(var),
                    _ => s.params.set(key, value(var)),
                }
            }
        }
        let out = chain::run(&inputs, &w.zone_of, &setups);
        let sw = match &by_class {
            Some((max_class, vars)) => {
                let archie: Vec<Vec<ArchieParams>> = setups
                    .iter()
                    .zip(vars)
                    .map(|(s, class_vars)| {
                        let mut table = params.class_archie(&s.name, s.params.archie, *max_class);
                        for (a, cv) in table.iter_mut().zip(class_vars) {
                            for &(key, var) in cv {
                                let v = value(var);
                                match key {
                                    "archie-a" => a.a = v,
                                    "archie-m" => a.m = v,
                                    _ => a.n = v,
                                }
                            }
                        }
                        table
                    })
                    .collect();
                let inp = ClassSwInputs {
                    zone_of: &w.zone_of,
                    rw: &out.rw,
                    rt: inputs.rt.unwrap_or(&nan),
                    vsh: &out.vsh,
                    phie: &out.phie,
                    sw_fixed: &out.sw,
                    class,
                };
                let mut flag = out.flag.clone();
                chain::saturation_by_class(&inp, &setups, &archie, &mut flag).sw
            }
            None => out.sw.clone(),
        };
        if keep_sw {
            for (i, v) in sw.iter().enumerate() {
                sw_all[i * realisations + r] = *v;
            }
        }
        if let Some(pm) = perm {
            let seed = well_seed(config.uncertainty.seed, &w.name);
            pm.realisation(class, &out.phie, seed, r, realisations, &mut perm_all);
        }
        let zones = crate::well::summary::zone_summary(
            &w.name,
            md,
            &w.zone_of,
            &zone_names,
            &out.vsh,
            &out.phie,
            &sw,
            class,
            &config.summary,
        );
        for z in zones {
            let row = [z.net_pay, z.phie_avg, z.sw_avg, z.hpt];
            match per_zone.iter_mut().find(|(name, _)| *name == z.zone) {
                Some((_, rows)) => rows.push(row),
                None => per_zone.push((z.zone, vec![row])),
            }
        }
    }
    let mut u = ranges(&per_zone);
    if keep_sw {
        u.sw_depth = Some(depth_percentiles(&sw_all, realisations));
    }
    if perm.is_some() {
        u.perm_depth = Some(depth_percentiles(&perm_all, realisations));
    }
    u
}

/// Per zone HPT from SWH in every realisation, and SWH's P90, P50 and P10
/// per depth.
type SwhRanges = (Vec<(String, Vec<f64>)>, Option<[Vec<f64>; 3]>);

/// The saturation-height side of the Monte Carlo: SWH at every depth in
/// every realisation, from the well's compartment's FWL in that realisation
/// ([`Samples::fwl`]; its FWL when not sampled) and the realisation's classes
/// (`draws`) with their permeability (`perm`, else the run's PERM), at the
/// run's PHIE; the same function as the run's SWH
/// ([`crate::sat_height::SatHeightModel::swh`]). Returns per zone the HPT
/// the zone summary gives with SWH in SW's place in every realisation, and with
/// `depth-percentiles` SWH's P90, P50 and P10 per depth. `None` when neither
/// the FWL nor the classes vary, or the well is in no compartment.
fn swh_monte_carlo(
    w: &WellOutput,
    names: &[&str],
    config: &Config,
    sat: &crate::sat_height::SatHeightModel,
    samples: &Samples,
    draws: Option<&[u8]>,
    perm: Option<PermModel<'_>>,
) -> Option<SwhRanges> {
    let comp = sat.compartment(names)?;
    let fwl = samples
        .fwl
        .iter()
        .find(|f| f.compartment == comp.name)
        .map(|f| f.values.as_slice());
    if fwl.is_none() && draws.is_none() {
        return None;
    }
    let t = &w.table;
    let n = t.n_rows();
    let nan = vec![f64::NAN; n];
    let get = |c: Col| t.get(c).unwrap_or(&nan);
    let (md, tvdss, vsh, phie, sw) = (
        get(Col::Depth),
        get(Col::Tvdss),
        get(Col::Vsh),
        get(Col::Phie),
        get(Col::Sw),
    );
    let (det_class, det_perm) = (get(Col::Class), get(Col::Perm));
    let to_m = config
        .project
        .depth_unit
        .factor_to(crate::units::DepthUnit::Metre);
    let drho = comp.rho_water_gcc - comp.rho_hc_gcc;
    let rr = samples.realisations;
    let keep = config.uncertainty.depth_percentiles;
    let mut all = if keep {
        vec![f64::NAN; n * rr]
    } else {
        Vec::new()
    };
    let zone_names: Vec<String> = w.report.zones.iter().map(|z| z.name.clone()).collect();
    let mut hpt: Vec<(String, Vec<f64>)> = Vec::new();
    let mut swh = vec![f64::NAN; n];
    // each depth's rock in every class it may be drawn in (that class's
    // permeability at the depth's PHIE), looked up once for all
    // realisations: a realisation then evaluates only the height
    let k = sat.classes.len();
    let rocks: Vec<crate::sat_height::RockSwh<'_>> = match perm {
        Some(pm) => (0..n)
            .flat_map(|i| {
                (1..=k).map(move |c| {
                    let c = c as f64;
                    sat.rock(c, pm.at(c, phie[i]), phie[i])
                })
            })
            .collect(),
        None => Vec::new(),
    };
    let rock_at = |i: usize, c: f64| match perm {
        Some(_) if c >= 1.0 && (c as usize) <= k => rocks[i * k + c as usize - 1],
        Some(pm) => sat.rock(c, pm.at(c, phie[i]), phie[i]),
        None => sat.rock(c, det_perm[i], phie[i]),
    };
    for r in 0..rr {
        let level = fwl.map_or(comp.fwl_tvdss, |v| v[r]);
        let class = class_column(det_class, draws, r);
        for i in 0..n {
            swh[i] = if sw[i].is_finite() {
                rock_at(i, class[i]).swh((level - tvdss[i]) * to_m, drho)
            } else {
                f64::NAN
            };
        }
        if keep {
            for (i, v) in swh.iter().enumerate() {
                all[i * rr + r] = *v;
            }
        }
        let zones = crate::well::summary::zone_summary(
            &w.name,
            md,
            &w.zone_of,
            &zone_names,
            vsh,
            phie,
            &swh,
            &class,
            &config.summary,
        );
        for z in zones {
            match hpt.iter_mut().find(|(name, _)| *name == z.zone) {
                Some((_, v)) => v.push(z.hpt),
                None => hpt.push((z.zone, vec![z.hpt])),
            }
        }
    }
    Some((hpt, keep.then(|| depth_percentiles(&all, rr))))
}

/// One driver of a zone's field-wide HPT: a variable and the Spearman rank
/// correlation between its samples and the zone's HPT summed over wells.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Driver {
    /// The zone.
    pub zone: String,
    /// The variable's full key name.
    pub parameter: String,
    /// Spearman's rank correlation with the zone's HPT, -1 to 1.
    pub rank_correlation: f64,
    /// What it drives: `HPT` (from the logs' SW) or `HPT_SWH` (from the
    /// saturation-height model's SWH).
    pub quantity: String,
}

/// The drivers of each zone's HPT, strongest first: per zone, the rank
/// correlation of every variable with the zone's HPT summed over the wells
/// in each realisation. `wells`: each well's HPT per zone and realisation;
/// `wells_swh` likewise its HPT from SWH, ranked against the parameters and
/// each compartment's free water level (quantity `HPT_SWH`; none when no
/// well has it). A variable that does not change the zone's HPT (or a zone
/// whose HPT does not vary) gets a correlation of 0.
pub fn drivers(
    samples: &Samples,
    wells: &[&[(String, Vec<f64>)]],
    wells_swh: &[&[(String, Vec<f64>)]],
) -> Vec<Driver> {
    let params: Vec<(&str, &[f64])> = samples
        .vars
        .iter()
        .zip(&samples.values)
        .map(|(v, x)| (v.name.as_str(), x.as_slice()))
        .collect();
    let fwl_names: Vec<String> = samples
        .fwl
        .iter()
        .map(|f| format!("compartments.{}.fwl-tvdss", f.compartment))
        .collect();
    let with_fwl: Vec<(&str, &[f64])> = params
        .iter()
        .copied()
        .chain(
            fwl_names
                .iter()
                .zip(&samples.fwl)
                .map(|(n, f)| (n.as_str(), f.values.as_slice())),
        )
        .collect();
    let mut out = rank_drivers("HPT", &params, wells, samples.realisations);
    out.extend(rank_drivers(
        "HPT_SWH",
        &with_fwl,
        wells_swh,
        samples.realisations,
    ));
    out
}

/// Per zone, each of `vars` ranked by its Spearman correlation with the
/// zone's `quantity` summed over `wells`, strongest first.
fn rank_drivers(
    quantity: &str,
    vars: &[(&str, &[f64])],
    wells: &[&[(String, Vec<f64>)]],
    realisations: usize,
) -> Vec<Driver> {
    let mut totals: Vec<(String, Vec<f64>)> = Vec::new();
    for w in wells {
        for (zone, hpt) in w.iter() {
            let slot = match totals.iter().position(|(z, _)| z == zone) {
                Some(i) => i,
                None => {
                    totals.push((zone.clone(), vec![0.0; realisations]));
                    totals.len() - 1
                }
            };
            for (t, v) in totals[slot].1.iter_mut().zip(hpt) {
                if v.is_finite() {
                    *t += v;
                }
            }
        }
    }
    let mut out = Vec::new();
    for (zone, total) in &totals {
        let mut ds: Vec<Driver> = vars
            .iter()
            .map(|(name, x)| {
                let rho = crate::stats::rank_correlation(x, total);
                Driver {
                    zone: zone.clone(),
                    parameter: (*name).to_string(),
                    rank_correlation: if rho.is_finite() { rho } else { 0.0 },
                    quantity: quantity.to_string(),
                }
            })
            .collect();
        ds.sort_by(|a, b| {
            b.rank_correlation
                .abs()
                .total_cmp(&a.rank_correlation.abs())
                .then_with(|| a.parameter.cmp(&b.parameter))
        });
        out.extend(ds);
    }
    out
}

/// The Monte Carlo in the run summary: what was sampled, how, and what drives HPT.
#[derive(Debug, Clone, Serialize)]
pub struct UncertaintySummary {
    /// Realisations run.
    pub realisations: usize,
    /// Seed of the sampling.
    pub seed: u64,
    /// Latin hypercube or plain.
    pub sampling: crate::stats::sampling::Sampling,
    /// Every distribution: its full key name and parameters.
    pub variables: Vec<(String, crate::stats::dist::Dist)>,
    /// The percentile convention, in words.
    pub convention: String,
    /// Per zone, every variable's rank correlation with the zone's HPT
    /// (quantity `HPT`) and, with a saturation-height model, with its HPT
    /// from SWH, the free water levels included (quantity `HPT_SWH`).
    pub drivers: Vec<Driver>,
    /// hpt-drivers.csv, and hpt-swh-drivers.csv when written.
    pub outputs: Vec<String>,
}

/// The convention of the P90/P50/P10 columns, in words.
pub const CONVENTION: &str = "P90 is the value exceeded in 90 % of the realisations (the 10th percentile), P10 the value exceeded in 10 %; for net pay and HPT, P90 is the low case and P10 the high case; for SW the low case is its P10 (the highest SW)";

/// Write `field/hpt-drivers.csv` (ZONE, PARAMETER, RANK_CORRELATION, RANK):
/// per zone, each variable's rank correlation with the zone's HPT, strongest
/// first; and, when there are drivers of HPT from SWH, `hpt-swh-drivers.csv`
/// with the same columns. Returns the paths written.
pub fn write_drivers(
    drivers: &[Driver],
    dir: &std::path::Path,
) -> Result<Vec<std::path::PathBuf>, crate::output::OutputError> {
    std::fs::create_dir_all(dir).map_err(|source| crate::output::OutputError::Io {
        path: dir.to_path_buf(),
        source,
    })?;
    let mut written = Vec::new();
    for (quantity, name) in [
        ("HPT", "hpt-drivers.csv"),
        ("HPT_SWH", "hpt-swh-drivers.csv"),
    ] {
        let of: Vec<&Driver> = drivers.iter().filter(|d| d.quantity == quantity).collect();
        if of.is_empty() && quantity != "HPT" {
            continue;
        }
        let path = dir.join(name);
        write_driver_table(&of, &path)?;
        written.push(path);
    }
    Ok(written)
}

/// One drivers table as CSV, ranked within each zone.
fn write_driver_table(
    drivers: &[&Driver],
    path: &std::path::Path,
) -> Result<(), crate::output::OutputError> {
    let io = |source| crate::output::OutputError::Io {
        path: path.to_path_buf(),
        source,
    };
    // quoted where a field needs it (parameter names hold quotes)
    let mut csv = csv::Writer::from_writer(Vec::new());
    let mut rank = 0;
    let mut zone: Option<&str> = None;
    let mut rows = vec![[
        "ZONE".to_string(),
        "PARAMETER".into(),
        "RANK_CORRELATION".into(),
        "RANK".into(),
    ]];
    for d in drivers {
        rank = if zone == Some(d.zone.as_str()) {
            rank + 1
        } else {
            1
        };
        zone = Some(&d.zone);
        rows.push([
            d.zone.clone(),
            d.parameter.clone(),
            format!("{:.4}", d.rank_correlation),
            rank.to_string(),
        ]);
    }
    for r in &rows {
        csv.write_record(r)
            .map_err(|e| io(std::io::Error::other(e)))?;
    }
    let text = csv
        .into_inner()
        .map_err(|e| io(std::io::Error::other(e.to_string())))?;
    crate::output::write_atomic(path, |w| {
        use std::io::Write as _;
        w.write_all(&text).map_err(io)
    })
}

#[cfg(test)]
mod tests;
