//! Per-well, per-zone reservoir summary: gross, net reservoir, net pay,
//! net-to-gross, average porosity and water saturation, and hydrocarbon pore
//! thickness, with net decided by cutoffs that may differ by hydraulic class.
//!
//! # Thickness of a sample (midpoint rule)
//!
//! Each sample stands for the interval between the midpoints to its
//! neighbours *in the well* (not in the zone):
//!
//! ```text
//! upper edge  u_i = md[0]                   for the well's first sample
//!                   (md[i-1] + md[i]) / 2   otherwise
//! lower edge  l_i = md[n-1]                 for the well's last sample
//!                   (md[i] + md[i+1]) / 2   otherwise
//! thickness   h_i = l_i − u_i  =  (md[i+1] − md[i-1]) / 2 inside the well,
//!                                 half a step at the well's two ends
//! ```
//!
//! So the intervals tile the logged interval `[md[0], md[n-1]]` without gap
//! or overlap, nothing is extrapolated beyond the first and last sample, and
//! the boundary between two zones falls halfway between their neighbouring
//! samples. Samples outside every zone keep their interval; it simply counts
//! in no zone. A gap in the depth index (missing rows rather than NULL rows)
//! is split between the two samples that bound it.
//!
//! Thicknesses are measured along the hole (MD), in the project's depth unit:
//! in a deviated well they are apparent, not true vertical or stratigraphic,
//! thicknesses.
//!
//! # Net and pay
//!
//! A sample with VSH, PHIE or SW missing (NaN or infinite) counts in gross and
//! in `samples_not_interpreted`, never in net. Otherwise, with the cutoffs of
//! the sample's class (a class override where one is set, the field value for
//! the others; class NaN, 0 or not a whole number 1-255: the field values):
//!
//! - net reservoir: VSH ≤ `vsh-max-vv` and PHIE ≥ `phie-min-vv`;
//! - net pay: net reservoir and SW ≤ `sw-max-vv`.
//!
//! Every comparison includes its bound (a value on the cutoff is net).
//!
//! # Source
//!
//! Common practice: the gross → net reservoir → net pay cascade of cutoffs on
//! shale volume, porosity and water saturation, thickness-weighted porosity,
//! pore-volume-weighted saturation and HPT = Σ φ·(1 − Sw)·h. The default
//! cutoff values are common practice for sandstone, not taken from a
//! particular published study; they are starting points to be set per field.

use serde::{Deserialize, Serialize};

use crate::config::summary::SummaryConfig;

/// The class number of a sample's CLASS value: a whole number 1-255, else
/// `None` (NaN, 0 = no class, fractions, out of range).
pub(crate) fn class_number(c: f64) -> Option<u8> {
    if (1.0..=255.0).contains(&c) && c.fract() == 0.0 {
        Some(c as u8)
    } else {
        None
    }
}

/// Upper and lower edges of the interval sample `i` stands for (midpoint rule,
/// see the module docs): the midpoints to the well's neighbouring samples, the
/// sample's own depth at the well's two ends. Depth unit of `md`.
pub(crate) fn sample_edges(md: &[f64], i: usize) -> (f64, f64) {
    let upper = if i == 0 {
        md[0]
    } else {
        0.5 * (md[i - 1] + md[i])
    };
    let lower = if i + 1 == md.len() {
        md[i]
    } else {
        0.5 * (md[i] + md[i + 1])
    };
    (upper, lower)
}

/// Hydrocarbon pore thickness of one sample, φ·(1 − Sw)·h.
///
/// `phie` effective porosity (v/v), `sw` water saturation (v/v), `h` thickness
/// (depth unit); the result is in the depth unit of `h`. No clipping: inputs
/// are expected in [0, 1].
///
/// # Source
///
/// Common practice (hydrocarbon pore volume per unit area).
fn hydrocarbon_pore_thickness(phie: f64, sw: f64, h: f64) -> f64 {
    phie * (1.0 - sw) * h
}

/// One zone of one well: thicknesses in the project's depth unit, measured
/// along the hole (MD); porosity and saturation in v/v.
#[derive(Debug, Clone, Serialize, PartialEq, Deserialize)]
pub struct ZoneSummary {
    pub well: String,
    pub zone: String,
    /// Upper edge of the zone's first sample (see the module docs: halfway to
    /// the sample above, or the first sample's depth at the top of the log).
    pub top_md: f64,
    /// Lower edge of the zone's last sample.
    pub base_md: f64,
    /// Σ h over the zone's samples; equals `base_md − top_md` when the zone is
    /// one unbroken run of samples.
    pub gross: f64,
    /// Σ h over samples passing the VSH and PHIE cutoffs.
    pub net_reservoir: f64,
    /// Σ h over net-reservoir samples also passing the SW cutoff.
    pub net_pay: f64,
    /// net_reservoir / gross (NaN when gross is 0).
    pub ntg: f64,
    /// Thickness-weighted mean PHIE over net reservoir, Σ φ·h / Σ h (NaN when
    /// there is no net reservoir).
    pub phie_avg: f64,
    /// Pore-volume-weighted mean SW over net pay, Σ φ·Sw·h / Σ φ·h (NaN when
    /// Σ φ·h over net pay is 0).
    pub sw_avg: f64,
    /// Hydrocarbon pore thickness over net pay, Σ φ·(1 − Sw)·h, depth unit.
    /// Equals (Σ φ·h over net pay)·(1 − sw_avg); `phie_avg` is over net
    /// reservoir, so it does not in general equal net_pay·phie_avg·(1 − sw_avg).
    pub hpt: f64,
    /// Samples in the zone.
    pub samples: usize,
    /// Samples in the zone with VSH, PHIE or SW missing (in gross, never in net).
    pub samples_not_interpreted: usize,
    /// Net pay, PHIE and SW averages and HPT over the Monte Carlo's
    /// realisations (P90, P50, P10, mean); only when parameters are given
    /// as distributions. (Written as null without: shard states are
    /// postcard, which cannot skip a field.)
    #[serde(default)]
    pub uncertainty: Option<ZoneRanges>,
}

/// A quantity's spread over the realisations (exceedance percentiles).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct Range {
    /// Exceeded in 90 % of the realisations (the 10th percentile).
    pub p90: f64,
    /// Exceeded in half the realisations (the median).
    pub p50: f64,
    /// Exceeded in 10 % of the realisations (the 90th percentile).
    pub p10: f64,
    /// Mean over the realisations.
    pub mean: f64,
}

impl Range {
    /// The range of `values` (NaNs left out); NaN everywhere without any.
    pub fn of(values: &[f64]) -> Range {
        let finite: Vec<f64> = values.iter().copied().filter(|v| v.is_finite()).collect();
        let mean = if finite.is_empty() {
            f64::NAN
        } else {
            finite.iter().sum::<f64>() / finite.len() as f64
        };
        Range {
            p90: crate::stats::percentile(&finite, 10.0),
            p50: crate::stats::percentile(&finite, 50.0),
            p10: crate::stats::percentile(&finite, 90.0),
            mean,
        }
    }
}

/// One zone of one well over the realisations.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ZoneRanges {
    /// Net pay, depth unit.
    pub net_pay: Range,
    /// Thickness-weighted PHIE over net reservoir, v/v.
    pub phie_avg: Range,
    /// Pore-volume-weighted SW over net pay, v/v.
    pub sw_avg: Range,
    /// Hydrocarbon pore thickness, depth unit.
    pub hpt: Range,
    /// Hydrocarbon pore thickness with the saturation-height model's SWH in
    /// SW's place (the same cutoffs), depth unit: over the sampled free
    /// water level and the drawn classes; `None` without a
    /// saturation-height model or when neither varies.
    #[serde(default)]
    pub hpt_swh: Option<Range>,
}

/// Running sums of one zone.
struct Acc {
    zone: usize,
    top: f64,
    base: f64,
    gross: f64,
    net_res: f64,
    phi_h_res: f64,
    net_pay: f64,
    phi_h_pay: f64,
    phi_sw_h_pay: f64,
    hpt: f64,
    samples: usize,
    not_interpreted: usize,
}

/// `num / den`, NaN when `den` is 0.
fn ratio(num: f64, den: f64) -> f64 {
    if den == 0.0 { f64::NAN } else { num / den }
}

/// One well's summary, one entry per zone present, in the order the zones
/// first appear going down the well.
///
/// `md` ascending measured depth (project depth unit); `zone_of[i]` indexes
/// `zone_names` (`None`: outside every zone, not summarised, though it still
/// bounds its neighbours' intervals); `vsh`, `phie`, `sw` (v/v) and `class`
/// (class number, 0 or NaN for none) per depth, NaN = missing. Thickness per
/// sample by the midpoint rule, cutoffs per sample by its class; both are
/// described in the module docs.
///
/// Slices of different lengths or a descending `md` give no summary, and a
/// sample whose zone index is outside `zone_names` is skipped: the columns
/// of one well's table never do either.
#[allow(clippy::too_many_arguments)]
pub fn zone_summary(
    well: &str,
    md: &[f64],
    zone_of: &[Option<u16>],
    zone_names: &[String],
    vsh: &[f64],
    phie: &[f64],
    sw: &[f64],
    class: &[f64],
    cfg: &SummaryConfig,
) -> Vec<ZoneSummary> {
    let n = md.len();
    // columns of one table always agree; anything else has no summary
    if [zone_of.len(), vsh.len(), phie.len(), sw.len(), class.len()]
        .iter()
        .any(|&len| len != n)
        || md.windows(2).any(|w| w[0] > w[1])
    {
        return Vec::new();
    }
    let cutoffs = cfg.cutoffs_by_class();
    // Position in `accs` of each zone index, in first-appearance order.
    let mut slot: Vec<Option<usize>> = vec![None; zone_names.len()];
    let mut accs: Vec<Acc> = Vec::new();
    for i in 0..n {
        let Some(z) = zone_of[i] else { continue };
        let z = z as usize;
        if z >= zone_names.len() {
            continue;
        }
        let (upper, lower) = sample_edges(md, i);
        let h = lower - upper;
        let k = *slot[z].get_or_insert_with(|| {
            accs.push(Acc {
                zone: z,
                top: upper,
                base: lower,
                gross: 0.0,
                net_res: 0.0,
                phi_h_res: 0.0,
                net_pay: 0.0,
                phi_h_pay: 0.0,
                phi_sw_h_pay: 0.0,
                hpt: 0.0,
                samples: 0,
                not_interpreted: 0,
            });
            accs.len() - 1
        });
        let a = &mut accs[k];
        a.base = lower;
        a.gross += h;
        a.samples += 1;
        let (v, p, s) = (vsh[i], phie[i], sw[i]);
        if !(v.is_finite() && p.is_finite() && s.is_finite()) {
            a.not_interpreted += 1;
            continue;
        }
        let c = &cutoffs[class_number(class[i]).map_or(0, usize::from)];
        if c.is_net_reservoir(v, p) {
            a.net_res += h;
            a.phi_h_res += p * h;
        }
        if c.is_net_pay(v, p, s) {
            a.net_pay += h;
            a.phi_h_pay += p * h;
            a.phi_sw_h_pay += p * s * h;
            a.hpt += hydrocarbon_pore_thickness(p, s, h);
        }
    }
    accs.into_iter()
        .map(|a| ZoneSummary {
            well: well.to_string(),
            zone: zone_names[a.zone].clone(),
            top_md: a.top,
            base_md: a.base,
            gross: a.gross,
            net_reservoir: a.net_res,
            net_pay: a.net_pay,
            ntg: ratio(a.net_res, a.gross),
            phie_avg: ratio(a.phi_h_res, a.net_res),
            sw_avg: ratio(a.phi_sw_h_pay, a.phi_h_pay),
            hpt: a.hpt,
            samples: a.samples,
            samples_not_interpreted: a.not_interpreted,
            uncertainty: None,
        })
        .collect()
}

/// Write `zone-summary.csv` and `zone-summary.parquet` into `dir`: one row
/// per well and zone, columns in upper case with units in the names.
pub fn write(
    rows: &[ZoneSummary],
    dir: &std::path::Path,
) -> Result<Vec<std::path::PathBuf>, crate::output::OutputError> {
    use polars::prelude::{Column, DataFrame};
    let csv_path = dir.join("zone-summary.csv");
    let parquet_path = dir.join("zone-summary.parquet");
    let text =
        |f: fn(&ZoneSummary) -> &str| rows.iter().map(|r| f(r).to_string()).collect::<Vec<_>>();
    let num = |f: fn(&ZoneSummary) -> f64| {
        rows.iter()
            .map(|r| Some(f(r)).filter(|v| v.is_finite()))
            .collect::<Vec<Option<f64>>>()
    };
    let count =
        |f: fn(&ZoneSummary) -> usize| rows.iter().map(|r| f(r) as u64).collect::<Vec<u64>>();
    let mut columns = vec![
        Column::new("WELL".into(), text(|r| &r.well)),
        Column::new("ZONE".into(), text(|r| &r.zone)),
        Column::new("TOP_MD".into(), num(|r| r.top_md)),
        Column::new("BASE_MD".into(), num(|r| r.base_md)),
        Column::new("GROSS".into(), num(|r| r.gross)),
        Column::new("NET_RESERVOIR".into(), num(|r| r.net_reservoir)),
        Column::new("NET_PAY".into(), num(|r| r.net_pay)),
        Column::new("NTG_VV".into(), num(|r| r.ntg)),
        Column::new("PHIE_AVG_VV".into(), num(|r| r.phie_avg)),
        Column::new("SW_AVG_VV".into(), num(|r| r.sw_avg)),
        Column::new("HPT".into(), num(|r| r.hpt)),
        Column::new("SAMPLES".into(), count(|r| r.samples)),
        Column::new(
            "SAMPLES_NOT_INTERPRETED".into(),
            count(|r| r.samples_not_interpreted),
        ),
    ];
    // the Monte Carlo's ranges, when the run has them: per quantity P90 (the
    // value exceeded in 90 % of the realisations), P50, P10 and the mean
    if rows.iter().any(|r| r.uncertainty.is_some()) {
        type Get = fn(&ZoneRanges) -> Option<&Range>;
        let mut quantities: Vec<(&str, Get)> = vec![
            ("NET_PAY", |u| Some(&u.net_pay)),
            ("PHIE_AVG_VV", |u| Some(&u.phie_avg)),
            ("SW_AVG_VV", |u| Some(&u.sw_avg)),
            ("HPT", |u| Some(&u.hpt)),
        ];
        // HPT from the saturation-height model, when its FWL or classes vary
        if rows
            .iter()
            .any(|r| r.uncertainty.as_ref().is_some_and(|u| u.hpt_swh.is_some()))
        {
            quantities.push(("HPT_SWH", |u| u.hpt_swh.as_ref()));
        }
        type Pick = fn(&Range) -> f64;
        let stats: [(&str, Pick); 4] = [
            ("P90", |r| r.p90),
            ("P50", |r| r.p50),
            ("P10", |r| r.p10),
            ("MEAN", |r| r.mean),
        ];
        for (q, get) in quantities {
            for (stat, pick) in stats {
                let values: Vec<Option<f64>> = rows
                    .iter()
                    .map(|r| {
                        r.uncertainty
                            .as_ref()
                            .and_then(get)
                            .map(pick)
                            .filter(|v| v.is_finite())
                    })
                    .collect();
                columns.push(Column::new(format!("{q}_{stat}").into(), values));
            }
        }
    }
    let err = |path: &std::path::Path| {
        let path = path.to_path_buf();
        move |source| crate::output::OutputError::Table {
            path: path.clone(),
            source,
        }
    };
    let mut df = DataFrame::new(rows.len(), columns).map_err(err(&csv_path))?;
    crate::output::write_frame_csv(&mut df, &csv_path, Some(4))?;
    crate::output::write_frame_parquet(&mut df, &parquet_path)?;
    Ok(vec![csv_path, parquet_path])
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::config::summary::{ClassCutoffs, DEFAULT_VSH_MAX_VV};
    use std::collections::BTreeMap;

    const NAN: f64 = f64::NAN;

    fn close(got: f64, want: f64, tol: f64, what: &str) {
        assert!(
            (got - want).abs() <= tol,
            "{what}: got {got}, want {want} (tolerance {tol})"
        );
    }

    /// Parse a config as it appears in the project file, under `[summary]`.
    fn parse(text: &str) -> SummaryConfig {
        #[derive(Deserialize)]
        struct File {
            summary: SummaryConfig,
        }
        let f: File = toml::from_str(text).expect("config parses");
        f.summary.validate().expect("config is valid");
        f.summary
    }

    /// The hand example: 10 samples at 0.5 m from 1000.0 m, one zone, the
    /// whole well. h = 0.25 at the two ends, 0.5 between (midpoint rule).
    ///
    /// ```text
    ///  i    md      h    VSH   PHIE   SW   class  field cutoffs (0.5, 0.06, 0.6)
    ///  0  1000.0  0.25  0.10  0.20  0.30   1     pay
    ///  1  1000.5  0.5   0.20  0.25  0.20   1     pay
    ///  2  1001.0  0.5   0.60  0.10  0.40   NaN   VSH > 0.5: not net
    ///  3  1001.5  0.5   0.30  0.04  0.50   NaN   PHIE < 0.06: not net
    ///  4  1002.0  0.5   0.15  0.18  0.70   2     net reservoir, SW > 0.6: not pay
    ///  5  1002.5  0.5   0.25  NaN   0.30   1     PHIE missing: not interpreted
    ///  6  1003.0  0.5   0.10  0.22  0.50   2     pay
    ///  7  1003.5  0.5   0.50  0.06  0.60   1     pay (on all three cutoffs: bounds included)
    ///  8  1004.0  0.5   0.05  0.30  0.10   1     pay
    ///  9  1004.5  0.25  0.20  0.15  0.55   0     pay (class 0: field cutoffs)
    /// ```
    fn hand_example() -> [Vec<f64>; 5] {
        let md: Vec<f64> = (0..10).map(|i| 1000.0 + 0.5 * i as f64).collect();
        let vsh = vec![0.10, 0.20, 0.60, 0.30, 0.15, 0.25, 0.10, 0.50, 0.05, 0.20];
        let phie = vec![0.20, 0.25, 0.10, 0.04, 0.18, NAN, 0.22, 0.06, 0.30, 0.15];
        let sw = vec![0.30, 0.20, 0.40, 0.50, 0.70, 0.30, 0.50, 0.60, 0.10, 0.55];
        let class = vec![1.0, 1.0, NAN, NAN, 2.0, 1.0, 2.0, 1.0, 1.0, 0.0];
        [md, vsh, phie, sw, class]
    }

    fn run_hand(cfg: &SummaryConfig) -> ZoneSummary {
        let [md, vsh, phie, sw, class] = hand_example();
        let zone_of = vec![Some(0u16); md.len()];
        let names = vec!["Sand A".to_string()];
        let mut out = zone_summary("W-1", &md, &zone_of, &names, &vsh, &phie, &sw, &class, cfg);
        assert_eq!(out.len(), 1);
        out.remove(0)
    }

    /// Expected values hand computed (table in `hand_example`):
    ///
    /// ```text
    /// gross       = 2·0.25 + 8·0.5                             = 4.5
    /// net res.    = samples 0,1,4,6,7,8,9: 0.25+5·0.5+0.25     = 3.0
    /// NTG         = 3.0 / 4.5                                  = 2/3
    /// Σφh (res.)  = 0.20·0.25 + 0.25·0.5 + 0.18·0.5 + 0.22·0.5
    ///             + 0.06·0.5 + 0.30·0.5 + 0.15·0.25
    ///             = 0.05 + 0.125 + 0.09 + 0.11 + 0.03 + 0.15 + 0.0375 = 0.5925
    /// PHIE avg    = 0.5925 / 3.0                               = 0.1975
    /// net pay     = samples 0,1,6,7,8,9: 0.25+4·0.5+0.25       = 2.5
    /// Σφh (pay)   = 0.5925 − 0.09 (sample 4)                   = 0.5025
    /// Σφ·Sw·h     = 0.05·0.30 + 0.125·0.20 + 0.11·0.50 + 0.03·0.60
    ///             + 0.15·0.10 + 0.0375·0.55
    ///             = 0.015 + 0.025 + 0.055 + 0.018 + 0.015 + 0.020625 = 0.148625
    /// SW avg      = 0.148625 / 0.5025
    /// HPT         = 0.5025 − 0.148625                          = 0.353875
    /// ```
    /// Tolerance 1e-9: a few additions of exact-ish decimals in f64.
    #[test]
    fn hand_computed_zone() {
        let s = run_hand(&SummaryConfig::default());
        assert_eq!(s.well, "W-1");
        assert_eq!(s.zone, "Sand A");
        close(s.top_md, 1000.0, 1e-9, "top");
        close(s.base_md, 1004.5, 1e-9, "base");
        close(s.gross, 4.5, 1e-9, "gross");
        close(s.net_reservoir, 3.0, 1e-9, "net reservoir");
        close(s.net_pay, 2.5, 1e-9, "net pay");
        close(s.ntg, 2.0 / 3.0, 1e-9, "ntg");
        close(s.phie_avg, 0.1975, 1e-9, "phie avg");
        close(s.sw_avg, 0.148625 / 0.5025, 1e-9, "sw avg");
        close(s.hpt, 0.353875, 1e-9, "hpt");
        assert_eq!(s.samples, 10);
        assert_eq!(s.samples_not_interpreted, 1);
    }

    /// `[summary.class."1"] sw-max-vv = 0.3`, hand computed from the table in
    /// `hand_example`: class-1 samples 0 (SW 0.30, on the cutoff), 1 (0.20)
    /// and 8 (0.10) stay pay, sample 7 (SW 0.60) leaves it; class 2 (sample
    /// 6, SW 0.50) and class 0 (sample 9, SW 0.55) keep the field 0.6. VSH and
    /// PHIE cutoffs of class 1 fall back to the field's, so net reservoir is
    /// unchanged.
    ///
    /// ```text
    /// net res.  = 3.0 (unchanged), PHIE avg = 0.1975 (unchanged)
    /// net pay   = 2.5 − 0.5                   = 2.0
    /// Σφh       = 0.5025 − 0.06·0.5           = 0.4725
    /// Σφ·Sw·h   = 0.148625 − 0.03·0.60        = 0.130625
    /// SW avg    = 0.130625 / 0.4725
    /// HPT       = 0.4725 − 0.130625           = 0.341875
    /// ```
    #[test]
    fn class_override_changes_net_pay() {
        let cfg = parse("[summary]\n[summary.class.\"1\"]\nsw-max-vv = 0.3\n");
        assert_eq!(cfg.vsh_max_vv, DEFAULT_VSH_MAX_VV);
        let s = run_hand(&cfg);
        close(s.gross, 4.5, 1e-9, "gross");
        close(s.net_reservoir, 3.0, 1e-9, "net reservoir");
        close(s.phie_avg, 0.1975, 1e-9, "phie avg");
        close(s.net_pay, 2.0, 1e-9, "net pay");
        close(s.sw_avg, 0.130625 / 0.4725, 1e-9, "sw avg");
        close(s.hpt, 0.341875, 1e-9, "hpt");
    }

    /// Two zones, samples outside any zone, a zone broken by an outside
    /// sample, and zone indices in the opposite order to depth. Hand computed:
    ///
    /// ```text
    ///  i   md     zone   h      edges
    ///  0  100.0   -      0.25
    ///  1  100.5   A      0.5    100.25-100.75
    ///  2  101.0   A      0.5
    ///  3  101.5   A      0.5            -101.75
    ///  4  102.0   B      0.5    101.75-
    ///  5  102.5   B      0.5
    ///  6  103.0   -      0.5
    ///  7  103.5   B      0.5          -103.75
    ///  8  104.0   -      0.5
    ///  9  104.5   -      0.25
    /// A: gross 1.5, top 100.25, base 101.75, 3 samples
    /// B: gross 1.5 (samples 4, 5, 7), top 101.75, base 103.75, 3 samples
    /// ```
    /// Every sample is clean pay (VSH 0.1, PHIE 0.2, SW 0.2), so net pay =
    /// gross and HPT = 0.2·0.8·1.5 = 0.24 in each zone: an outside sample
    /// leaking in would raise them.
    #[test]
    fn zones_in_depth_order_outside_samples_excluded() {
        let md: Vec<f64> = (0..10).map(|i| 100.0 + 0.5 * i as f64).collect();
        let names = vec!["B".to_string(), "A".to_string()];
        let (a, b) = (Some(1u16), Some(0u16));
        let zone_of = vec![None, a, a, a, b, b, None, b, None, None];
        let vsh = vec![0.1; 10];
        let phie = vec![0.2; 10];
        let sw = vec![0.2; 10];
        let class = vec![NAN; 10];
        let cfg = SummaryConfig::default();
        let out = zone_summary("W-2", &md, &zone_of, &names, &vsh, &phie, &sw, &class, &cfg);
        let zones: Vec<&str> = out.iter().map(|s| s.zone.as_str()).collect();
        assert_eq!(zones, ["A", "B"]);
        let expect = [("A", 100.25, 101.75), ("B", 101.75, 103.75)];
        for (s, (name, top, base)) in out.iter().zip(expect) {
            close(s.top_md, top, 1e-9, &format!("{name} top"));
            close(s.base_md, base, 1e-9, &format!("{name} base"));
            close(s.gross, 1.5, 1e-9, &format!("{name} gross"));
            close(s.net_pay, 1.5, 1e-9, &format!("{name} net pay"));
            close(s.ntg, 1.0, 1e-9, &format!("{name} ntg"));
            close(s.sw_avg, 0.2, 1e-9, &format!("{name} sw avg"));
            close(s.hpt, 0.24, 1e-9, &format!("{name} hpt"));
            assert_eq!(s.samples, 3, "{name} samples");
            assert_eq!(s.samples_not_interpreted, 0);
        }
    }

    /// No net reservoir: the averages are NaN (denominator 0), sums are 0.
    #[test]
    fn averages_nan_without_net() {
        let md = [10.0, 11.0, 12.0];
        let zone_of = [Some(0u16); 3];
        let names = ["Shale".to_string()];
        let out = zone_summary(
            "W-3",
            &md,
            &zone_of,
            &names,
            &[0.9; 3],
            &[0.02; 3],
            &[1.0; 3],
            &[NAN; 3],
            &SummaryConfig::default(),
        );
        let s = &out[0];
        close(s.gross, 2.0, 1e-12, "gross");
        assert_eq!(
            (s.net_reservoir, s.net_pay, s.hpt, s.ntg),
            (0.0, 0.0, 0.0, 0.0)
        );
        assert!(s.phie_avg.is_nan() && s.sw_avg.is_nan());
    }

    #[test]
    fn validate_names_the_key() {
        let mut cfg = SummaryConfig {
            phie_min_vv: -0.01,
            ..SummaryConfig::default()
        };
        assert_eq!(cfg.validate().unwrap_err().0, "summary.phie-min-vv");
        cfg.phie_min_vv = 0.06;
        assert!(cfg.validate().is_ok());

        cfg.class.insert(
            "2".into(),
            ClassCutoffs {
                sw_max_vv: Some(-0.2),
                ..ClassCutoffs::default()
            },
        );
        assert_eq!(
            cfg.validate().unwrap_err().0,
            "summary.class.\"2\".sw-max-vv"
        );
        cfg.class.clear();

        for bad in ["0", "256", "x", "1.5"] {
            let mut c = SummaryConfig::default();
            c.class.insert(bad.into(), ClassCutoffs::default());
            let (key, msg) = c.validate().unwrap_err();
            assert_eq!(key, format!("summary.class.\"{bad}\""));
            assert!(msg.contains("1 to 255"), "{msg}");
        }
        let mut c = SummaryConfig::default();
        c.class.insert("2".into(), ClassCutoffs::default());
        c.class.insert("02".into(), ClassCutoffs::default());
        assert_eq!(c.validate().unwrap_err().0, "summary.class.\"2\"");
        c.class.remove("02");
        c.class.insert("255".into(), ClassCutoffs::default());
        assert!(c.validate().is_ok());

        let nan = SummaryConfig {
            sw_max_vv: f64::NAN,
            ..SummaryConfig::default()
        };
        assert_eq!(nan.validate().unwrap_err().0, "summary.sw-max-vv");
    }

    #[test]
    fn config_defaults_and_unknown_keys() {
        let cfg = parse("[summary]\n");
        assert_eq!(
            (cfg.vsh_max_vv, cfg.phie_min_vv, cfg.sw_max_vv),
            (0.5, 0.06, 0.6)
        );
        assert!(cfg.class.is_empty());
        #[derive(Deserialize, Debug)]
        #[allow(dead_code)]
        struct File {
            summary: SummaryConfig,
        }
        assert!(toml::from_str::<File>("[summary]\nvsh-max = 0.4\n").is_err());
        assert!(toml::from_str::<File>("[summary.class.\"1\"]\nsw-max = 0.4\n").is_err());
    }

    /// Independent per-zone reference for the property test: h from the
    /// closed form (md[i+1] − md[i−1]) / 2, half a step at the ends, and the
    /// cutoffs looked up directly in the config.
    #[allow(clippy::too_many_arguments)]
    fn reference_pay_pore_thickness(
        md: &[f64],
        zone_of: &[Option<u16>],
        vsh: &[f64],
        phie: &[f64],
        sw: &[f64],
        class: &[f64],
        cfg: &SummaryConfig,
        zone: u16,
    ) -> f64 {
        let n = md.len();
        let mut total = 0.0;
        for i in 0..n {
            if zone_of[i] != Some(zone) {
                continue;
            }
            let h = match (i, n) {
                (_, 1) => 0.0,
                (0, _) => (md[1] - md[0]) / 2.0,
                (i, n) if i == n - 1 => (md[i] - md[i - 1]) / 2.0,
                (i, _) => (md[i + 1] - md[i - 1]) / 2.0,
            };
            if vsh[i].is_nan() || phie[i].is_nan() || sw[i].is_nan() {
                continue;
            }
            let over = if class[i] >= 1.0 {
                cfg.class.get(&format!("{}", class[i] as u8)).copied()
            } else {
                None
            }
            .unwrap_or_default();
            let vmax = over.vsh_max_vv.unwrap_or(cfg.vsh_max_vv);
            let pmin = over.phie_min_vv.unwrap_or(cfg.phie_min_vv);
            let smax = over.sw_max_vv.unwrap_or(cfg.sw_max_vv);
            if vsh[i] <= vmax && phie[i] >= pmin && sw[i] <= smax {
                total += phie[i] * h;
            }
        }
        total
    }

    fn maybe_nan(v: f64, missing: bool) -> f64 {
        if missing { f64::NAN } else { v }
    }

    proptest::proptest! {
        /// For random wells, zones and cutoffs: net pay ≤ net reservoir ≤
        /// gross, 0 ≤ NTG ≤ 1, 0 ≤ HPT ≤ Σ φ·h over net pay (the reference
        /// above), the zones' gross within the logged interval.
        #[test]
        fn summary_bounds_hold(
            rows in proptest::collection::vec(
                (0.01f64..2.0, proptest::option::of(0u16..3), 0.0f64..1.0, 0.0f64..0.4,
                 0.0f64..1.0, 0u8..4, 0u8..10),
                1..80),
            field in (0.0f64..=1.0, 0.0f64..=0.3, 0.0f64..=1.0),
            over in proptest::collection::vec(
                (1u8..4, proptest::option::of(0.0f64..=1.0), proptest::option::of(0.0f64..=0.3),
                 proptest::option::of(0.0f64..=1.0)),
                0..4),
        ) {
            let mut md = Vec::new();
            let (mut zone_of, mut vsh, mut phie, mut sw, mut class) =
                (Vec::new(), Vec::new(), Vec::new(), Vec::new(), Vec::new());
            let mut depth = 2000.0;
            for &(step, z, v, p, s, c, miss) in &rows {
                depth += step;
                md.push(depth);
                zone_of.push(z);
                vsh.push(maybe_nan(v, miss == 0));
                phie.push(maybe_nan(p, miss == 1));
                sw.push(maybe_nan(s, miss == 2));
                class.push(if c == 0 { f64::NAN } else { f64::from(c - 1) });
            }
            let mut cfg = SummaryConfig {
                vsh_max_vv: field.0,
                phie_min_vv: field.1,
                sw_max_vv: field.2,
                class: BTreeMap::new(),
            };
            for (c, v, p, s) in over {
                cfg.class.insert(c.to_string(), ClassCutoffs {
                    vsh_max_vv: v,
                    phie_min_vv: p,
                    sw_max_vv: s,
                });
            }
            proptest::prop_assert!(cfg.validate().is_ok());
            let names: Vec<String> = ["Z0", "Z1", "Z2"].iter().map(|s| s.to_string()).collect();
            let out = zone_summary("P", &md, &zone_of, &names, &vsh, &phie, &sw, &class, &cfg);
            let tol = 1e-9;
            let mut total_gross = 0.0;
            let mut total_samples = 0;
            for s in &out {
                proptest::prop_assert!(s.net_pay <= s.net_reservoir + tol, "{:?}", s);
                proptest::prop_assert!(s.net_reservoir <= s.gross + tol, "{:?}", s);
                proptest::prop_assert!(s.net_pay >= 0.0);
                if s.gross > 0.0 {
                    proptest::prop_assert!((0.0..=1.0 + tol).contains(&s.ntg), "{:?}", s);
                }
                let z = names.iter().position(|n| *n == s.zone).unwrap() as u16;
                let phi_h_pay = reference_pay_pore_thickness(
                    &md, &zone_of, &vsh, &phie, &sw, &class, &cfg, z);
                proptest::prop_assert!(s.hpt >= 0.0, "{:?}", s);
                proptest::prop_assert!(s.hpt <= phi_h_pay + tol, "{:?} vs {}", s, phi_h_pay);
                if s.sw_avg.is_finite() {
                    let hpt = phi_h_pay * (1.0 - s.sw_avg);
                    proptest::prop_assert!((s.hpt - hpt).abs() <= 1e-9, "{:?} vs {}", s, hpt);
                }
                total_gross += s.gross;
                total_samples += s.samples;
            }
            proptest::prop_assert!(total_gross <= md[md.len() - 1] - md[0] + tol);
            proptest::prop_assert_eq!(total_samples, zone_of.iter().flatten().count());
        }
    }
}
