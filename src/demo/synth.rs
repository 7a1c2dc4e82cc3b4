//! Deterministic synthetic forward model of an invented oil field, "Tarnby Ridge".
//!
//! Everything here is made up for demonstration: field, operator, wells and numbers.
//! The model lays down beds (rock class, shale volume, effective porosity, flow-zone
//! indicator) in true vertical depth below sea level, drills eight wells through them,
//! computes the "truth" petrophysics at every log sample and then forward-models the logs
//! and the core, capillary-pressure, formation-pressure, zone-top and survey tables from
//! that truth, adding small, stated noise. Same seed, same bits.
//!
//! Depends only on `std`, `rand` 0.9, `rand_chacha` 0.9 and `rand_distr` 0.5.

use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use rand_distr::StandardNormal;

/// Seed of the shipped demo data set.
pub const DEMO_SEED: u64 = 20_250_611;

/// One log or truth curve on the well's depth index.
#[derive(Debug, Clone, PartialEq)]
pub struct SynthCurve {
    pub mnemonic: String,
    pub unit: String,
    pub description: String,
    /// Sample values; NaN marks a missing value.
    pub values: Vec<f64>,
    /// Decimals to use when writing the curve.
    pub decimals: usize,
}

/// One LAS header line (mnemonic, unit, value, description).
#[derive(Debug, Clone, PartialEq)]
pub struct HeaderEntry {
    pub mnemonic: String,
    pub unit: String,
    pub value: String,
    pub description: String,
}

/// One synthetic well: index, headers, log curves and model truth.
#[derive(Debug, Clone, PartialEq)]
pub struct SynthWell {
    pub name: String,
    pub file_stem: String,
    /// LAS unit of the depth index: "M" or "FT".
    pub depth_unit: String,
    /// Measured depth below the kelly bushing, increasing, regular step, in `depth_unit`.
    pub depth: Vec<f64>,
    /// ~W items other than STRT/STOP/STEP/NULL.
    pub well_items: Vec<HeaderEntry>,
    /// ~P items (EKB, BS, BHT, TD, RW, RWT).
    pub params: Vec<HeaderEntry>,
    /// Log curves, depth excluded.
    pub curves: Vec<SynthCurve>,
    /// Model truth in canonical units: TVDSS_M, VSH, PHIT, PHIE, SW, PERM_MD, FZI_UM,
    /// CLASS (0 = shale, 1 = poorest .. 4 = best), HAFWL_M (signed, negative below FWL).
    pub truth: Vec<SynthCurve>,
}

/// The whole demo field.
#[derive(Debug, Clone, PartialEq)]
pub struct SynthField {
    pub field_name: String,
    pub operator: String,
    pub wells: Vec<SynthWell>,
    /// (file name relative to demo-wells/, full CSV text with a header line).
    pub tables: Vec<(String, String)>,
}

// ------------------------------------------------------------------ constants

/// Metres per international foot (exact by definition).
const FT_TO_M: f64 = 0.3048;
/// Pascal per psi (from memory: 1 lbf/in² = 6894.757 Pa).
const PA_PER_PSI: f64 = 6_894.757;
/// Square metres per millidarcy (1 D = 9.869233e-13 m², from memory).
const M2_PER_MD: f64 = 9.869_233e-16;
/// N/m per dyn/cm.
const N_PER_M_PER_DYN_CM: f64 = 1.0e-3;
/// Standard gravity, m/s² (conventional standard value).
const G: f64 = 9.806_65;
/// Gradient of a 1 g/cc fluid column in psi/m: 1000 kg/m³·g / Pa-per-psi (= 0.4335 psi/ft).
const PSI_PER_M_PER_GCC: f64 = 1.422_33;
/// Formation brine density, g/cc (scenario choice).
const RHO_W: f64 = 1.07;
/// Reservoir oil density, g/cc (scenario choice).
const RHO_O: f64 = 0.78;
/// Reservoir oil-brine σ·cosθ, dyn/cm: 30 dyn/cm at 30° contact angle (scenario choice).
const SIGMA_COS_RES: f64 = 26.0;
/// Mercury-air interfacial tension, dyn/cm (common laboratory convention).
const SIGMA_HG: f64 = 480.0;
/// Mercury-air contact angle, degrees (common laboratory convention).
const THETA_HG_DEG: f64 = 140.0;
/// Constant of the FZI permeability relation, = 1/0.0314² (Amaefule et al. 1993).
const FZI_PERM_CONST: f64 = 1014.24;
/// Constant of RQI = 0.0314·sqrt(k/φ) with k in mD, RQI in µm (Amaefule et al. 1993).
const RQI_CONST: f64 = 0.0314;
/// Porosity bound in shale (clay-bound water), v/v (scenario choice).
const PHI_SH_BOUND: f64 = 0.08;
/// Formation water resistivity at formation temperature, ohm·m; held constant.
const RW: f64 = 0.045;
/// Shale resistivity, ohm·m (scenario choice).
const R_SH: f64 = 2.5;
/// Archie tortuosity factor in sand (common practice: 1).
const ARCHIE_A: f64 = 1.0;
/// Surface temperature, °C, and geothermal gradient, °C/m (scenario choice).
const T_SURFACE_C: f64 = 10.0;
const T_GRADIENT_C_PER_M: f64 = 0.03;
/// Gamma ray of clean sand and of shale, gAPI (scenario choice).
const GR_CLEAN: f64 = 25.0;
const GR_SHALE: f64 = 130.0;
/// Matrix (quartz), shale (with bound water) densities, g/cc (quartz 2.65: textbook value).
const RHO_MATRIX: f64 = 2.65;
const RHO_SHALE: f64 = 2.55;
/// Hydrogen index of oil relative to brine, and apparent neutron porosity of shale.
const HI_OIL: f64 = 0.9;
const NPHI_SHALE: f64 = 0.35;
/// Slowness of matrix (quartz sandstone), pore fluid and shale, µs/ft (common values).
const DT_MATRIX: f64 = 55.5;
const DT_FLUID: f64 = 189.0;
const DT_SHALE: f64 = 100.0;
/// Bit size, inches.
const BIT_SIZE_IN: f64 = 8.5;
/// Depth steps: 0.1524 m (= 0.5 ft) for metric wells, 0.5 ft for the feet well.
const STEP_M: f64 = 0.1524;
const STEP_FT: f64 = 0.5;
/// Logged interval: metres above top reservoir and below base reservoir (TVD).
const LOG_ABOVE_TOP_M: f64 = 60.0;
const LOG_BELOW_BASE_M: f64 = 40.0;
/// Free water levels (m TVDSS) and pressures at the FWL (psi) per compartment.
const FWL_MAIN_M: f64 = 2085.0;
const FWL_EAST_M: f64 = 2110.0;
const P_FWL_MAIN_PSI: f64 = 3050.0;
const P_FWL_EAST_PSI: f64 = 3100.0;
/// Log noise (1σ): GR gAPI, density g/cc, neutron v/v, sonic µs/ft, ln(Rt), caliper in.
const GR_NOISE: f64 = 2.5;
const RHOB_NOISE: f64 = 0.012;
const NPHI_NOISE: f64 = 0.008;
const DT_NOISE: f64 = 1.0;
const RT_LN_NOISE: f64 = 0.03;
const CAL_NOISE: f64 = 0.03;
/// Bed-scale spread: ln(FZI) 1σ and effective porosity 1σ (draws clipped at ±2.5σ).
const FZI_LN_SD: f64 = 0.12;
const PHIE_SD: f64 = 0.012;
/// Core noise (1σ): porosity v/v, log10 permeability, grain density g/cc.
const CORE_PHI_SD: f64 = 0.01;
const CORE_LOGK_SD: f64 = 0.1;
const CORE_GD_SD: f64 = 0.008;
/// Grain density rise per unit VSH (clay grains heavier than quartz; scenario choice).
const CORE_GD_PER_VSH: f64 = 0.04;
/// Index (0-based, Tarnby-3) of the well whose core depths read deeper than log depth, and by how much (m).
const CORE_SHIFT_WELL: usize = 2;
const CORE_SHIFT_M: f64 = 0.6;
/// Plugs and pressure probes keep this distance from bed boundaries, m.
const PLUG_EDGE_M: f64 = 0.15;
/// Pressure gauge scatter 1σ, psi, truncated at ±0.5 psi; poor-test extra error range, psi.
const PRESSURE_SD_PSI: f64 = 0.05;
const PRESSURE_MAX_ERR_PSI: f64 = 0.5;
const POOR_ERR_PSI: (f64, f64) = (6.0, 15.0);
/// Lab saturation scatter 1σ, fraction.
const CAP_SW_SD: f64 = 0.01;
/// Tarnby-6 survey: kick-off MD, build per 30 m, hold inclination, azimuth, station spacing, TD.
const KOP_M: f64 = 1500.0;
const BUILD_DEG_PER_30M: f64 = 3.5;
const HOLD_INC_DEG: f64 = 35.0;
const DEV_AZI_DEG: f64 = 62.0;
const SURVEY_STATION_M: f64 = 30.0;
const SURVEY_TD_M: f64 = 2350.0;
const ZONE_NAMES: [&str; 3] = ["Upper Kell", "Lower Kell", "Base Shale"];
/// Random-number stream tags (one independent ChaCha stream per purpose).
const STREAM_BEDS: u64 = 100;
const STREAM_LOGS: u64 = 200;
const STREAM_CORE: u64 = 300;
const STREAM_CAP: u64 = 400;
const STREAM_PRESSURE: u64 = 500;

/// Hydraulic rock class (scenario choices): FZI centre (µm), porosity centre (v/v), VSH
/// range, Archie m and n, Brooks-Corey entry J (Jd), pore-size index λ, irreducible Sw.
#[derive(Debug, Clone, Copy)]
struct RockClass {
    fzi: f64,
    phie: f64,
    vsh: (f64, f64),
    m: f64,
    n: f64,
    jd: f64,
    lambda: f64,
    swirr: f64,
}

/// Class from [FZI, φe, VSH lo, VSH hi, m, n, Jd, λ, Swirr].
const fn rc(v: [f64; 9]) -> RockClass {
    let vsh = (v[2], v[3]);
    let (fzi, phie, m, n, jd, lambda, swirr) = (v[0], v[1], v[4], v[5], v[6], v[7], v[8]);
    RockClass {
        fzi,
        phie,
        vsh,
        m,
        n,
        jd,
        lambda,
        swirr,
    }
}

/// Classes 1 (poorest) to 4 (best): [FZI, φe, VSH lo, VSH hi, m, n, Jd, λ, Swirr].
const CLASSES: [RockClass; 4] = [
    rc([0.4, 0.10, 0.15, 0.35, 2.1, 2.1, 0.060, 1.0, 0.32]),
    rc([1.0, 0.15, 0.10, 0.20, 2.0, 2.0, 0.045, 1.4, 0.22]),
    rc([2.5, 0.20, 0.02, 0.10, 1.9, 1.9, 0.035, 1.8, 0.14]),
    rc([5.5, 0.24, 0.00, 0.06, 1.8, 1.8, 0.025, 2.2, 0.09]),
];
/// Shale (class 0): water-filled (Sw = 1 is imposed), Archie exponents 2.
const SHALE: RockClass = rc([0.15, 0.02, 0.80, 1.00, 2.0, 2.0, 1.0, 1.0, 1.0]);

fn rock(class: u8) -> &'static RockClass {
    match class {
        1..=4 => &CLASSES[usize::from(class) - 1],
        _ => &SHALE,
    }
}

/// Fault compartment: name, free water level (m TVDSS), pressure at the FWL (psi).
#[derive(Debug, Clone, Copy)]
struct Compartment(&'static str, f64, f64);

const MAIN: Compartment = Compartment("Main", FWL_MAIN_M, P_FWL_MAIN_PSI);
const EAST: Compartment = Compartment("East", FWL_EAST_M, P_FWL_EAST_PSI);

/// How one log is named and scaled in a well (value in file = canonical value × scale).
#[derive(Debug, Clone, Copy)]
struct CurveStyle {
    mnemonic: &'static str,
    unit: &'static str,
    scale: f64,
    decimals: usize,
}

const fn style(mnemonic: &'static str, unit: &'static str, scale: f64, dec: usize) -> CurveStyle {
    let decimals = dec;
    CurveStyle {
        mnemonic,
        unit,
        scale,
        decimals,
    }
}

const GR: CurveStyle = style("GR", "GAPI", 1.0, 2);
const GRC: CurveStyle = style("GRC", "GAPI", 1.0, 2);
const SGR: CurveStyle = style("SGR", "GAPI", 1.0, 2);
const RHOB: CurveStyle = style("RHOB", "G/CC", 1.0, 4);
const RHOZ: CurveStyle = style("RHOZ", "G/CC", 1.0, 4);
const DEN_KGM3: CurveStyle = style("DEN", "K/M3", 1000.0, 1);
const NPHI: CurveStyle = style("NPHI", "V/V", 1.0, 4);
const TNPH: CurveStyle = style("TNPH", "V/V", 1.0, 4);
const TNPH_PU: CurveStyle = style("TNPH", "PU", 100.0, 2);
const NPOR: CurveStyle = style("NPOR", "V/V", 1.0, 4);
const DT: CurveStyle = style("DT", "US/F", 1.0, 2);
const DTC: CurveStyle = style("DTC", "US/F", 1.0, 2);
const AC: CurveStyle = style("AC", "US/F", 1.0, 2);
const AC_USM: CurveStyle = style("AC", "US/M", 1.0 / FT_TO_M, 2);
const ILD: CurveStyle = style("ILD", "OHMM", 1.0, 4);
const RT: CurveStyle = style("RT", "OHMM", 1.0, 4);
const AT90: CurveStyle = style("AT90", "OHMM", 1.0, 4);
const RD: CurveStyle = style("RD", "OHMM", 1.0, 4);
const CALI: CurveStyle = style("CALI", "IN", 1.0, 3);
const HCAL: CurveStyle = style("HCAL", "IN", 1.0, 3);
const CAL: CurveStyle = style("CAL", "IN", 1.0, 3);
const LOG_DESCRIPTIONS: [&str; 6] = [
    "Gamma ray",
    "Bulk density",
    "Neutron porosity (limestone matrix)",
    "Compressional slowness",
    "Deep resistivity",
    "Caliper",
];

/// Per well Tarnby-1..8: [EKB in the well's depth unit, top Upper Kell m TVDSS, Upper Kell
/// thickness m, Lower Kell thickness m, grid east m, grid north m] (all invented).
const WELL_NUMBERS: [[f64; 6]; 8] = [
    [28.4, 2034.0, 40.0, 50.0, 2400.0, 3100.0],
    [31.2, 2022.0, 42.0, 48.0, 1500.0, 3900.0],
    [26.7, 2052.0, 39.0, 51.0, 3300.0, 2500.0],
    [108.0, 2058.0, 41.0, 49.0, 3600.0, 1600.0],
    [29.9, 2010.0, 40.0, 52.0, 900.0, 4400.0],
    [34.1, 2046.0, 40.0, 49.0, 2900.0, 2800.0],
    [25.8, 2040.0, 38.0, 50.0, 5200.0, 3300.0],
    [30.5, 1998.0, 37.0, 47.0, 600.0, 5200.0],
];
/// Log names per well, in the order GR, density, neutron, sonic, resistivity, caliper.
const WELL_STYLES: [[CurveStyle; 6]; 8] = [
    [GR, RHOB, NPHI, DT, ILD, CALI],
    [GR, RHOB, NPHI, AC_USM, RD, CAL],
    [GRC, RHOZ, TNPH, DTC, AT90, HCAL],
    [GR, RHOB, NPHI, DT, ILD, CALI],
    [SGR, RHOZ, TNPH_PU, DTC, RT, HCAL],
    [GRC, RHOB, NPHI, DTC, AT90, HCAL],
    [GR, DEN_KGM3, NPOR, AC, RD, CAL],
    [GR, RHOZ, NPHI, DT, RT, CALI],
];
const LOG_DATES: [&str; 8] = [
    "2016-04-12",
    "2016-11-03",
    "2017-06-21",
    "2018-02-09",
    "2018-09-30",
    "2019-05-17",
    "2020-03-04",
    "2021-08-26",
];
/// Indices (0-based) of the feet-logged well, the deviated well and the East-compartment well.
const FEET_WELL: usize = 3;
const DEVIATED_WELL: usize = 5;
const EAST_WELL: usize = 6;
/// Null stretches: (well, log index, from, to) in m of MD below the first sample.
const NULLS: [(usize, usize, f64, f64); 2] = [(0, 3, 0.0, 20.0), (4, 1, 160.0, 164.0)];

/// One well's fixed description, assembled from the tables above.
#[derive(Debug, Clone)]
struct WellSpec {
    idx: usize,
    name: String,
    feet: bool,
    deviated: bool,
    compartment: Compartment,
    /// Kelly-bushing elevation in the well's depth unit.
    ekb: f64,
    tops: [f64; 3],
    grid_en: (f64, f64),
    styles: [CurveStyle; 6],
    /// Offset of this well's random-number streams (the demo well's index; see `field_spec`).
    stream: u64,
    /// Whether the NULLS stretches of the demo apply (demo wells only).
    log_nulls: bool,
}

fn well_spec(idx: usize) -> WellSpec {
    let v = WELL_NUMBERS[idx % 8];
    let tops = [v[1], v[1] + v[2], v[1] + v[2] + v[3]];
    let compartment = if idx == EAST_WELL { EAST } else { MAIN };
    WellSpec {
        idx,
        name: format!("Tarnby-{}", idx + 1),
        feet: idx == FEET_WELL,
        deviated: idx == DEVIATED_WELL,
        compartment,
        ekb: v[0],
        tops,
        grid_en: (v[4], v[5]),
        styles: WELL_STYLES[idx % 8],
        stream: idx as u64,
        log_nulls: true,
    }
}

// ------------------------------------------------------------------ pure physics

/// TVD by minimum curvature: the product's own function, so the demo's deviated
/// well is built with the same geometry flowzone reads it back with.
pub use crate::well::depth::min_curvature_tvd;

/// Permeability (mD) from FZI (µm) and effective porosity (v/v):
/// k = 1014.24·FZI²·φ³/(1−φ)² (Amaefule et al. 1993, hydraulic flow units).
fn perm_from_fzi(fzi_um: f64, phie: f64) -> f64 {
    FZI_PERM_CONST * fzi_um * fzi_um * phie.powi(3) / (1.0 - phie).powi(2)
}

#[cfg(test)]
/// FZI (µm) = RQI/φz with RQI = 0.0314·sqrt(k/φ) and φz = φ/(1−φ) (Amaefule et al. 1993).
fn fzi_from_perm(perm_md: f64, phie: f64) -> f64 {
    RQI_CONST * (perm_md / phie).sqrt() * (1.0 - phie) / phie
}

/// Reservoir capillary pressure (Pa) at height `h_m` above the FWL: (ρw−ρo)·g·h.
fn pc_reservoir_pa(h_m: f64) -> f64 {
    (RHO_W - RHO_O) * 1000.0 * G * h_m
}

/// Leverett J (dimensionless) = Pc·sqrt(k/φ)/(σcosθ), with Pc in Pa, k in mD, φ v/v and
/// σcosθ in dyn/cm; converted to SI inside (Leverett 1941, from memory).
fn leverett_j(pc_pa: f64, perm_md: f64, phi: f64, sigma_cos_dyn_cm: f64) -> f64 {
    pc_pa * (perm_md * M2_PER_MD / phi).sqrt() / (sigma_cos_dyn_cm * N_PER_M_PER_DYN_CM)
}

/// Brooks-Corey in J-space (Brooks & Corey 1964, from memory): J = Jd·Se^(−1/λ), so
/// Se = (J/Jd)^(−λ) and Sw = Swirr + (1−Swirr)·Se; Sw = 1 for J ≤ Jd.
fn brooks_corey_sw(j: f64, rc: &RockClass) -> f64 {
    if j <= rc.jd {
        1.0
    } else {
        rc.swirr + (1.0 - rc.swirr) * (j / rc.jd).powf(-rc.lambda)
    }
}

/// Water saturation (v/v) at height `h_m` (m) above the FWL for a rock with permeability
/// `perm_md` (mD) and effective porosity `phie`; 1 at or below the FWL and in shale.
fn sw_from_height(class: u8, perm_md: f64, phie: f64, h_m: f64) -> f64 {
    if class == 0 || h_m <= 0.0 {
        return 1.0;
    }
    brooks_corey_sw(
        leverett_j(pc_reservoir_pa(h_m), perm_md, phie, SIGMA_COS_RES),
        rock(class),
    )
}

/// Laboratory mercury-air σ·|cosθ|, dyn/cm (480·|cos 140°| ≈ 367.7).
fn sigma_cos_lab() -> f64 {
    SIGMA_HG * THETA_HG_DEG.to_radians().cos().abs()
}

/// Formation temperature (°C) at `tvdss_m`, ground taken at sea level (scenario choice).
fn formation_temp_c(tvdss_m: f64) -> f64 {
    T_SURFACE_C + T_GRADIENT_C_PER_M * tvdss_m
}

/// Gamma ray (gAPI), linear in shale volume: GR = GRclean + VSH·(GRsh − GRclean) (common practice).
fn gr_from_vsh(vsh: f64) -> f64 {
    GR_CLEAN + vsh * (GR_SHALE - GR_CLEAN)
}

/// Bulk density (g/cc), volume-weighted sum of quartz matrix, shale (with its bound water)
/// and pore fluid mixed by Sw; flushed-zone invasion ignored (standard mixing law).
fn rhob_from_volumes(vsh: f64, phie: f64, sw: f64) -> f64 {
    let fluid = sw * RHO_W + (1.0 - sw) * RHO_O;
    (1.0 - vsh - phie) * RHO_MATRIX + vsh * RHO_SHALE + phie * fluid
}

/// Neutron porosity (v/v, limestone units taken as v/v): PHIE·(Sw + (1−Sw)·HI_oil) + VSH·0.35.
fn nphi_from_volumes(vsh: f64, phie: f64, sw: f64) -> f64 {
    phie * (sw + (1.0 - sw) * HI_OIL) + vsh * NPHI_SHALE
}

/// Compressional slowness (µs/ft) by the Wyllie et al. (1956) time average, shale as a third component.
fn dt_wyllie(vsh: f64, phie: f64) -> f64 {
    (1.0 - vsh - phie) * DT_MATRIX + vsh * DT_SHALE + phie * DT_FLUID
}

/// True resistivity (ohm·m). Reservoir beds: the modified Simandoux relation
/// (Bardon & Pied 1969, after Simandoux 1963; from memory), the product's default
/// shaly-sand model, with the class's Archie exponents:
/// 1/Rt = φ^m·Sw^n/(a·Rw·(1−VSH)) + VSH·Sw/R_sh. Shale beds (class 0): Rt = R_sh.
fn rt_from_volumes(vsh: f64, phie: f64, sw: f64, class: u8) -> f64 {
    if class == 0 {
        return R_SH;
    }
    let rc = rock(class);
    let sand = phie.powf(rc.m) * sw.powf(rc.n) / (ARCHIE_A * RW * (1.0 - vsh));
    1.0 / (sand + vsh * sw / R_SH)
}

// ------------------------------------------------------------------ earth model

#[derive(Debug, Clone, Copy)]
struct Bed {
    top: f64,
    base: f64,
    class: u8,
    vsh: f64,
    phie: f64,
    fzi: f64,
    washout_in: f64,
}

const FALLBACK_BED: Bed = Bed {
    top: f64::MIN,
    base: f64::MAX,
    class: 0,
    vsh: 0.9,
    phie: 0.02,
    fzi: 0.15,
    washout_in: 0.0,
};

#[derive(Debug, Clone, Copy)]
struct Truth {
    tvdss: f64,
    vsh: f64,
    phit: f64,
    phie: f64,
    sw: f64,
    perm: f64,
    fzi: f64,
    class: u8,
    hafwl: f64,
    washout_in: f64,
}

/// Well path: KB elevation (m) and, for the deviated well, its survey stations (m, deg, deg).
struct Geometry {
    ekb_m: f64,
    survey: Option<Vec<[f64; 3]>>,
}

impl Geometry {
    fn tvdss(&self, md_m: f64) -> f64 {
        self.survey.as_ref().map_or(md_m, |s| tvd_at_md(s, md_m)) - self.ekb_m
    }
    fn md_m(&self, tvdss: f64) -> f64 {
        let tvd = tvdss + self.ekb_m;
        let Some(s) = &self.survey else { return tvd };
        let (mut lo, mut hi) = (0.0, SURVEY_TD_M + 5000.0);
        for _ in 0..80 {
            let mid = 0.5 * (lo + hi);
            if tvd_at_md(s, mid) < tvd {
                lo = mid
            } else {
                hi = mid
            }
        }
        0.5 * (lo + hi)
    }
}

struct WellModel {
    spec: WellSpec,
    geo: Geometry,
    beds: Vec<Bed>,
    depth: Vec<f64>,
    md_m: Vec<f64>,
    truth: Vec<Truth>,
}

fn sub_rng(seed: u64, stream: u64) -> ChaCha8Rng {
    let mut rng = ChaCha8Rng::seed_from_u64(seed);
    rng.set_stream(stream);
    rng
}

fn normal(rng: &mut ChaCha8Rng) -> f64 {
    rng.sample(StandardNormal)
}

fn chance(rng: &mut ChaCha8Rng, p: f64) -> bool {
    rng.random::<f64>() < p
}

/// Survey of Tarnby-6: vertical to KOP, constant build to the hold angle, then hold to TD.
fn tarnby6_survey() -> Vec<[f64; 3]> {
    let station = |md: f64| {
        let inc = ((md - KOP_M) / SURVEY_STATION_M * BUILD_DEG_PER_30M).clamp(0.0, HOLD_INC_DEG);
        [md, inc, if inc > 0.0 { DEV_AZI_DEG } else { 0.0 }]
    };
    let n = (SURVEY_TD_M / SURVEY_STATION_M).ceil() as usize;
    let mut v: Vec<[f64; 3]> = (0..n)
        .map(|k| station(k as f64 * SURVEY_STATION_M))
        .collect();
    v.push(station(SURVEY_TD_M));
    v
}

/// TVD (m) at any MD (m): stations above it plus an interpolated point, by minimum curvature.
/// Linear interpolation of inclination is exact on a planar constant-build arc.
fn tvd_at_md(survey: &[[f64; 3]], md: f64) -> f64 {
    let k = survey.partition_point(|s| s[0] < md);
    let (inc, azi) = match (k.checked_sub(1).and_then(|i| survey.get(i)), survey.get(k)) {
        (Some(a), Some(b)) if b[0] > a[0] => {
            let f = (md - a[0]) / (b[0] - a[0]);
            (a[1] + f * (b[1] - a[1]), a[2] + f * (b[2] - a[2]))
        }
        (_, Some(b)) => (b[1], b[2]),
        (Some(a), None) => (a[1], a[2]),
        (None, None) => (0.0, 0.0),
    };
    let mut mds: Vec<f64> = survey[..k].iter().map(|s| s[0]).collect();
    let mut incs: Vec<f64> = survey[..k].iter().map(|s| s[1]).collect();
    let mut azis: Vec<f64> = survey[..k].iter().map(|s| s[2]).collect();
    mds.push(md);
    incs.push(inc);
    azis.push(azi);
    min_curvature_tvd(&mds, &incs, &azis)
        .last()
        .copied()
        .unwrap_or(md)
}

fn sand_bed(rng: &mut ChaCha8Rng, top: f64, base: f64, class: u8) -> Bed {
    let rc = rock(class);
    let fzi = rc.fzi * (FZI_LN_SD * normal(rng).clamp(-2.5, 2.5)).exp();
    let phie = rc.phie + PHIE_SD * normal(rng).clamp(-2.5, 2.5);
    let vsh = rng.random_range(rc.vsh.0..rc.vsh.1);
    Bed {
        top,
        base,
        class,
        vsh,
        phie,
        fzi,
        washout_in: 0.0,
    }
}

/// Shale bed; one in four of those thicker than 1.5 m gets a 1-3 in washout.
fn shale_bed(rng: &mut ChaCha8Rng, top: f64, base: f64) -> Bed {
    let vsh = rng.random_range(SHALE.vsh.0..SHALE.vsh.1);
    let phie = rng.random_range(0.01..0.03);
    let fzi = SHALE.fzi * (0.1 * normal(rng)).exp();
    let washout_in = if base - top > 1.5 && chance(rng, 0.25) {
        rng.random_range(1.0..3.0)
    } else {
        0.0
    };
    Bed {
        top,
        base,
        class: 0,
        vsh,
        phie,
        fzi,
        washout_in,
    }
}

/// Base of the next bed starting at `t`: thickness U(lo, hi), snapped to `limit` when the
/// remainder would be thinner than 0.8 m.
fn next_base(rng: &mut ChaCha8Rng, t: f64, limit: f64, lo: f64, hi: f64) -> f64 {
    let b = t + rng.random_range(lo..hi);
    if limit - b < 0.8 { limit } else { b }
}

fn fill_shale(rng: &mut ChaCha8Rng, beds: &mut Vec<Bed>, top: f64, base: f64) {
    let mut t = top;
    while t < base {
        let b = next_base(rng, t, base, 2.0, 8.0);
        beds.push(shale_bed(rng, t, b));
        t = b;
    }
}

/// Beds (m TVDSS, top down) for zone tops `tops` = [Upper Kell, Lower Kell, Base Shale].
fn build_beds(rng: &mut ChaCha8Rng, tops: &[f64; 3]) -> Vec<Bed> {
    let mut beds = Vec::new();
    fill_shale(rng, &mut beds, tops[0] - LOG_ABOVE_TOP_M - 30.0, tops[0]);
    // Upper Kell: alternating good (class 3/4) and poor (class 1/2) beds, 1-6 m.
    let (mut t, mut good) = (tops[0], chance(rng, 0.5));
    while t < tops[1] {
        let b = next_base(rng, t, tops[1], 1.0, 6.0);
        let best = chance(rng, 0.5);
        let class = match (good, best) {
            (true, true) => 4,
            (true, false) => 3,
            (false, true) => 2,
            (false, false) => 1,
        };
        beds.push(sand_bed(rng, t, b, class));
        (t, good) = (b, !good);
    }
    // Lower Kell: medium/good sand beds 2-8 m with a few thin shale breaks.
    while t < tops[2] {
        let b = next_base(rng, t, tops[2], 2.0, 8.0);
        let u: f64 = rng.random();
        let class = if u < 0.2 {
            2
        } else if u < 0.65 {
            3
        } else {
            4
        };
        beds.push(sand_bed(rng, t, b, class));
        t = b;
        if t < tops[2] - 3.0 && chance(rng, 0.25) {
            let b = t + rng.random_range(0.3..1.2);
            beds.push(shale_bed(rng, t, b));
            t = b;
        }
    }
    fill_shale(rng, &mut beds, tops[2], tops[2] + LOG_BELOW_BASE_M + 30.0);
    beds
}

fn bed_at(beds: &[Bed], tvdss: f64) -> &Bed {
    let i = beds.partition_point(|b| b.top <= tvdss).saturating_sub(1);
    beds.get(i).unwrap_or(&FALLBACK_BED)
}

fn truth_at(beds: &[Bed], tvdss: f64, fwl: f64) -> Truth {
    let b = bed_at(beds, tvdss);
    let perm = perm_from_fzi(b.fzi, b.phie);
    let hafwl = fwl - tvdss;
    let sw = sw_from_height(b.class, perm, b.phie, hafwl);
    let washout_in = if b.washout_in > 0.0 {
        b.washout_in
            * (std::f64::consts::PI * (tvdss - b.top) / (b.base - b.top))
                .sin()
                .max(0.0)
    } else {
        0.0
    };
    Truth {
        tvdss,
        vsh: b.vsh,
        phit: b.phie + b.vsh * PHI_SH_BOUND,
        phie: b.phie,
        sw,
        perm,
        fzi: b.fzi,
        class: b.class,
        hafwl,
        washout_in,
    }
}

fn unit_factor(spec: &WellSpec) -> f64 {
    if spec.feet { FT_TO_M } else { 1.0 }
}

fn unit_name(spec: &WellSpec) -> &'static str {
    if spec.feet { "FT" } else { "M" }
}

/// Earth model, depth grid and truth of one well.
fn plan_well(seed: u64, spec: WellSpec) -> WellModel {
    let mut rng = sub_rng(seed, STREAM_BEDS + spec.stream);
    let tops = spec.tops;
    let beds = build_beds(&mut rng, &tops);
    let f = unit_factor(&spec);
    let survey = spec.deviated.then(tarnby6_survey);
    let geo = Geometry {
        ekb_m: spec.ekb * f,
        survey,
    };
    let start = (geo.md_m(tops[0] - LOG_ABOVE_TOP_M) / f).floor();
    let stop = geo.md_m(tops[2] + LOG_BELOW_BASE_M) / f;
    let step = if spec.feet { STEP_FT } else { STEP_M };
    let n = ((stop - start) / step).ceil().max(1.0) as usize + 1;
    let depth: Vec<f64> = (0..n).map(|i| start + i as f64 * step).collect();
    let md_m: Vec<f64> = depth.iter().map(|d| d * f).collect();
    let fwl = spec.compartment.1;
    let truth = md_m.iter().map(|&md| truth_at(&beds, geo.tvdss(md), fwl));
    let truth = truth.collect();
    WellModel {
        spec,
        geo,
        beds,
        depth,
        md_m,
        truth,
    }
}

// ------------------------------------------------------------------ rendering

fn curve(mn: &str, unit: &str, desc: &str, decimals: usize, values: Vec<f64>) -> SynthCurve {
    let (mnemonic, unit, description) = (mn.into(), unit.into(), desc.into());
    SynthCurve {
        mnemonic,
        unit,
        description,
        values,
        decimals,
    }
}

fn entry(mn: &str, unit: &str, value: String, desc: &str) -> HeaderEntry {
    let (mnemonic, unit, description) = (mn.into(), unit.into(), desc.into());
    HeaderEntry {
        mnemonic,
        unit,
        value,
        description,
    }
}

/// Forward-models the logs (with noise and null stretches) and assembles one well.
fn render_well(seed: u64, m: &WellModel) -> SynthWell {
    let s = &m.spec;
    let mut rng = sub_rng(seed, STREAM_LOGS + s.stream);
    let mut logs: [Vec<f64>; 6] = Default::default();
    for t in &m.truth {
        let rt = rt_from_volumes(t.vsh, t.phie, t.sw, t.class);
        let vals = [
            gr_from_vsh(t.vsh) + GR_NOISE * normal(&mut rng),
            rhob_from_volumes(t.vsh, t.phie, t.sw) + RHOB_NOISE * normal(&mut rng),
            nphi_from_volumes(t.vsh, t.phie, t.sw) + NPHI_NOISE * normal(&mut rng),
            dt_wyllie(t.vsh, t.phie) + DT_NOISE * normal(&mut rng),
            rt * (RT_LN_NOISE * normal(&mut rng)).exp(),
            BIT_SIZE_IN + t.washout_in + CAL_NOISE * normal(&mut rng),
        ];
        for (log, v) in logs.iter_mut().zip(vals) {
            log.push(v);
        }
    }
    let md0 = m.md_m.first().copied().unwrap_or(0.0);
    for &(_, li, from, to) in NULLS.iter().filter(|n| s.log_nulls && n.0 == s.idx) {
        if let Some(log) = logs.get_mut(li) {
            for (v, md) in log.iter_mut().zip(&m.md_m) {
                if (from..to).contains(&(md - md0)) {
                    *v = f64::NAN;
                }
            }
        }
    }
    let mut curves = Vec::new();
    for ((vals, st), desc) in logs.into_iter().zip(s.styles).zip(LOG_DESCRIPTIONS) {
        let scaled = vals.iter().map(|v| v * st.scale).collect();
        curves.push(curve(st.mnemonic, st.unit, desc, st.decimals, scaled));
    }
    let tc = |f: fn(&Truth) -> f64| m.truth.iter().map(f).collect::<Vec<f64>>();
    let class = tc(|t| f64::from(t.class));
    let truth = vec![
        curve("TVDSS_M", "M", "TVD below sea level", 3, tc(|t| t.tvdss)),
        curve("VSH", "V/V", "Shale volume", 4, tc(|t| t.vsh)),
        curve("PHIT", "V/V", "Total porosity", 4, tc(|t| t.phit)),
        curve("PHIE", "V/V", "Effective porosity", 4, tc(|t| t.phie)),
        curve("SW", "V/V", "Water saturation", 4, tc(|t| t.sw)),
        curve("PERM_MD", "MD", "Permeability", 6, tc(|t| t.perm)),
        curve("FZI_UM", "UM", "Flow zone indicator", 4, tc(|t| t.fzi)),
        curve("CLASS", "", "Rock class (0 = shale)", 0, class),
        curve("HAFWL_M", "M", "Height above FWL", 3, tc(|t| t.hafwl)),
    ];
    let unit = unit_name(s);
    let (td, td_dec) = (
        m.depth.last().copied().unwrap_or(0.0),
        if s.feet { 2 } else { 4 },
    );
    let bht = formation_temp_c(m.truth.last().map_or(0.0, |t| t.tvdss));
    let rwt = formation_temp_c(0.5 * (s.tops[0] + s.tops[2]));
    let (east, north) = s.grid_en;
    let loc = format!("E {east:.0} m N {north:.0} m (local grid, invented)");
    let (xy_unit, xy_m) = if s.feet { ("FT", 0.3048) } else { ("M", 1.0) };
    let date = LOG_DATES[s.idx % 8].to_string();
    let well_items = vec![
        entry("COMP", "", "Moravel Energy".into(), "Company"),
        entry("WELL", "", s.name.clone(), "Well"),
        entry("FLD", "", "Tarnby Ridge".into(), "Field"),
        entry("LOC", "", loc, "Location"),
        // the feet well gives its location in feet too (international foot)
        entry(
            "X",
            xy_unit,
            format!("{:.1}", east / xy_m),
            "Easting, local grid",
        ),
        entry(
            "Y",
            xy_unit,
            format!("{:.1}", north / xy_m),
            "Northing, local grid",
        ),
        entry(
            "HZCS",
            "",
            "Tarnby local grid (invented)".into(),
            "Coordinate system",
        ),
        entry("CTRY", "", "Fictional".into(), "Country"),
        entry("SRVC", "", "Synthetic model".into(), "Service company"),
        entry("DATE", "", date, "Log date"),
        entry(
            "UWI",
            "",
            format!("MRV-TR-{:04}", s.idx + 1),
            "Unique well id",
        ),
    ];
    let params = vec![
        entry(
            "EKB",
            unit,
            format!("{:.2}", s.ekb),
            "KB elevation above SL",
        ),
        entry("BS", "IN", format!("{BIT_SIZE_IN:.2}"), "Bit size"),
        entry("BHT", "DEGC", format!("{bht:.1}"), "Bottom hole temp."),
        entry("TD", unit, format!("{td:.td_dec$}"), "Total depth logged"),
        entry("RW", "OHMM", format!("{RW:.3}"), "Formation water res."),
        entry("RWT", "DEGC", format!("{rwt:.1}"), "Temperature of RW"),
    ];
    SynthWell {
        name: s.name.clone(),
        file_stem: s.name.to_lowercase(),
        depth_unit: unit.into(),
        depth: m.depth.clone(),
        well_items,
        params,
        curves,
        truth,
    }
}

// ------------------------------------------------------------------ tables

/// A core plug: well index, reported depth (well unit), measured φ and k, class, true φe, k.
struct Plug {
    well: usize,
    depth: f64,
    phi: f64,
    perm: f64,
    class: u8,
    phie_true: f64,
    perm_true: f64,
}

/// Cored intervals: (well index, from, to) in m TVD below top Upper Kell.
const CORE_PLAN: [(usize, f64, f64); 3] = [(1, 2.0, 34.0), (2, -1.0, 55.0), (4, 36.0, 75.0)];
/// A pressure survey: (well index, oil points, water points, index of the one poor test).
type PressureSurvey = (usize, usize, usize, Option<usize>);
/// The demo's pressure surveys.
const PRESSURE_PLAN: [PressureSurvey; 5] = [
    (0, 7, 5, None),
    (1, 7, 4, Some(2)),
    (2, 6, 6, None),
    (4, 8, 4, Some(5)),
    (6, 14, 10, None),
];

fn round_to(x: f64, decimals: i32) -> f64 {
    let p = 10f64.powi(decimals);
    (x * p).round() / p
}

/// True if `tv` (m TVDSS) lies in a bed of at least `min_class`, away from its boundaries.
fn probe_ok(b: &Bed, tv: f64, min_class: u8) -> bool {
    b.class >= min_class && tv - b.top > PLUG_EDGE_M && b.base - tv > PLUG_EDGE_M
}

/// Core plugs along `plan` ((well index into `models`, from, to) in m TVD
/// below top Upper Kell), the core of well `shifted` reported
/// CORE_SHIFT_M deep; pushes the core.csv rows and returns the plugs.
fn core_plugs(
    seed: u64,
    models: &[WellModel],
    plan: &[(usize, f64, f64)],
    shifted: Option<usize>,
    rows: &mut Vec<String>,
) -> Vec<Plug> {
    let mut rng = sub_rng(seed, STREAM_CORE);
    let mut plugs = Vec::new();
    for &(wi, from, to) in plan {
        let Some(m) = models.get(wi) else { continue };
        let (f, name, unit) = (unit_factor(&m.spec), &m.spec.name, unit_name(&m.spec));
        let shift = if shifted == Some(wi) {
            CORE_SHIFT_M / f
        } else {
            0.0
        };
        let mut tv = m.spec.tops[0] + from;
        while tv < m.spec.tops[0] + to {
            let md = round_to(m.geo.md_m(tv) / f, 2);
            let t = m.geo.tvdss(md * f);
            let b = bed_at(&m.beds, t);
            if probe_ok(b, t, 1) {
                let perm_true = perm_from_fzi(b.fzi, b.phie);
                let phi = (b.phie + CORE_PHI_SD * normal(&mut rng)).max(0.005);
                let perm = perm_true * 10f64.powf(CORE_LOGK_SD * normal(&mut rng));
                let gd = RHO_MATRIX + CORE_GD_PER_VSH * b.vsh + CORE_GD_SD * normal(&mut rng);
                let depth = round_to(md + shift, 2);
                rows.push(format!(
                    "{name},{depth:.2},{unit},{phi:.4},{perm:.4},{gd:.3}"
                ));
                let (class, phie_true) = (b.class, b.phie);
                plugs.push(Plug {
                    well: wi,
                    depth,
                    phi,
                    perm,
                    class,
                    phie_true,
                    perm_true,
                });
            }
            tv += rng.random_range(0.3..0.5);
        }
    }
    plugs
}

/// Mercury-air capillary curves on plugs drawn per class (2 of class 1, 3 of the others).
fn capillary_rows(seed: u64, plugs: &[Plug], models: &[WellModel]) -> Vec<String> {
    let mut rng = sub_rng(seed, STREAM_CAP);
    let (mut rows, mut sample, sc_lab) = (Vec::new(), 0, sigma_cos_lab());
    for class in 1..=4u8 {
        let need = if class == 1 { 2 } else { 3 };
        let mut cand: Vec<usize> = (0..plugs.len())
            .filter(|&i| plugs[i].class == class)
            .collect();
        for k in 0..need.min(cand.len()) {
            let j = rng.random_range(k..cand.len());
            cand.swap(k, j);
        }
        cand.truncate(need);
        cand.sort_unstable();
        for p in cand.iter().filter_map(|&i| plugs.get(i)) {
            sample += 1;
            let rc = rock(class);
            let name = models.get(p.well).map_or("?", |m| m.spec.name.as_str());
            // Entry pressure at lab conditions: Pc_d = Jd·(σ|cosθ|)_lab / sqrt(k/φ).
            let sqrt_k_phi = (p.perm_true * M2_PER_MD / p.phie_true).sqrt();
            let pcd_psi = rc.jd * sc_lab * N_PER_M_PER_DYN_CM / sqrt_k_phi / PA_PER_PSI;
            let (lo, hi) = (0.5 * pcd_psi, pcd_psi * 100f64.powf(1.0 / rc.lambda));
            let steps = rng.random_range(10..=14usize);
            let (d, phi, k) = (p.depth, p.phi, p.perm);
            for s in 0..steps {
                let pc = round_to(lo * (hi / lo).powf(s as f64 / (steps - 1) as f64), 3);
                let j = leverett_j(pc * PA_PER_PSI, p.perm_true, p.phie_true, sc_lab);
                let mut sw = brooks_corey_sw(j, rc);
                if sw < 1.0 {
                    sw = (sw + CAP_SW_SD * normal(&mut rng)).clamp(0.0, 1.0);
                }
                let row = format!("CAP-{sample:02},{name},{d:.2},{phi:.4},{k:.4},{pc:.3},{sw:.4}");
                rows.push(row + ",mercury-air");
            }
        }
    }
    rows
}

/// Formation-pressure points on the compartment's oil and water gradients.
fn pressure_rows(seed: u64, models: &[WellModel], plan: &[PressureSurvey]) -> Vec<String> {
    let mut rng = sub_rng(seed, STREAM_PRESSURE);
    let mut rows = Vec::new();
    for &(wi, n_oil, n_water, poor) in plan {
        let Some(m) = models.get(wi) else { continue };
        let Compartment(_, fwl, p_fwl) = m.spec.compartment;
        let [top, _, base] = m.spec.tops;
        let legs = [
            (top + 0.5, fwl.min(base) - 0.5, n_oil),
            (fwl.max(top) + 0.5, base - 0.5, n_water),
        ];
        let mut pts: Vec<f64> = Vec::new();
        for (lo, hi, n) in legs.into_iter().filter(|l| l.1 - l.0 > 2.0) {
            let mut got = 0;
            for _ in 0..400 {
                let tv = rng.random_range(lo..hi);
                if got < n && probe_ok(bed_at(&m.beds, tv), tv, 2) {
                    pts.push(tv);
                    got += 1;
                }
            }
        }
        pts.sort_by(f64::total_cmp);
        let (f, name) = (unit_factor(&m.spec), &m.spec.name);
        for (k, tv) in pts.into_iter().enumerate() {
            let md = round_to(m.geo.md_m(tv) / f, 2);
            let tvdss = round_to(m.geo.tvdss(md * f), 2);
            let rho = if tvdss < fwl { RHO_O } else { RHO_W };
            let err = PRESSURE_SD_PSI * normal(&mut rng);
            let err = err.clamp(-PRESSURE_MAX_ERR_PSI, PRESSURE_MAX_ERR_PSI);
            let mut p = p_fwl + (tvdss - fwl) * PSI_PER_M_PER_GCC * rho + err;
            let q = if poor == Some(k) { "poor" } else { "good" };
            if poor == Some(k) {
                p += rng.random_range(POOR_ERR_PSI.0..POOR_ERR_PSI.1);
            }
            rows.push(format!("{name},{md:.2},{tvdss:.2},{p:.2},{q}"));
        }
    }
    rows
}

/// (file name, CSV text): header line then one line per row.
fn table(name: &str, header: &str, rows: Vec<String>) -> (String, String) {
    let mut s = format!("{header}\n");
    for r in rows {
        s += &r;
        s.push('\n');
    }
    (name.to_string(), s)
}

/// Generates the whole demo field from `seed` (bit-identical output for the same seed).
pub fn generate(seed: u64) -> SynthField {
    let models: Vec<WellModel> = (0..8).map(|i| plan_well(seed, well_spec(i))).collect();
    let wells = models.iter().map(|m| render_well(seed, m)).collect();
    let mut core_rows = Vec::new();
    let plugs = core_plugs(
        seed,
        &models,
        &CORE_PLAN,
        Some(CORE_SHIFT_WELL),
        &mut core_rows,
    );
    let mut zone_rows = Vec::new();
    for m in &models {
        let (name, unit) = (&m.spec.name, unit_name(&m.spec));
        for (zone, top) in ZONE_NAMES.iter().zip(m.spec.tops) {
            let md = m.geo.md_m(top) / unit_factor(&m.spec);
            zone_rows.push(format!("{name},{zone},{md:.2},{unit}"));
        }
    }
    let survey = tarnby6_survey().into_iter();
    let survey = survey.map(|[md, inc, azi]| format!("{md:.2},{inc:.2},{azi:.2}"));
    let (cap, pres) = (
        capillary_rows(seed, &plugs, &models),
        pressure_rows(seed, &models, &PRESSURE_PLAN),
    );
    let tables = vec![
        table("core.csv", CORE_HEADER, core_rows),
        table("capillary.csv", CAP_HEADER, cap),
        table("pressures.csv", PRESSURE_HEADER, pres),
        table("zones.csv", "WELL,ZONE,TOP_MD,DEPTH_UNIT", zone_rows),
        table(
            "surveys/tarnby-6.csv",
            "MD_M,INC_DEG,AZI_DEG",
            survey.collect(),
        ),
    ];
    SynthField {
        field_name: "Tarnby Ridge".into(),
        operator: "Moravel Energy".into(),
        wells,
        tables,
    }
}

const PRESSURE_HEADER: &str = "WELL,DEPTH_MD,TVDSS_M,PRESSURE_PSI,QUALITY";
const CAP_HEADER: &str = "SAMPLE,WELL,DEPTH_MD,POROSITY_FRAC,PERM_MD,PC_PSI,SW_FRAC,SYSTEM";
const CORE_HEADER: &str = "WELL,DEPTH_MD,DEPTH_UNIT,POROSITY_FRAC,PERM_MD,GRAIN_DENSITY_GCC";

/// Top Upper Kell (m TVDSS) and the zone in which the compartment FWL lies.
fn fwl_position(spec: &WellSpec) -> (f64, &'static str) {
    let ([top, mid, base], fwl) = (spec.tops, spec.compartment.1);
    let zone = match fwl {
        z if z < top => "above reservoir",
        z if z < mid => "Upper Kell",
        z if z < base => "Lower Kell",
        _ => "below reservoir (fully oil)",
    };
    (top, zone)
}

/// Text of demo-wells/README.md describing the scenario, every model choice and the wells.
pub fn scenario_markdown(field: &SynthField) -> String {
    let mut s = format!(
        "# {f} demo wells (synthetic)\n\n\
All data in this folder is **synthetic, made for the flowzone demo only**. The field \"{f}\", the operator \
\"{o}\", the wells and every number are invented; they describe no real place. The files are produced by a \
deterministic forward model (`synth.rs`) from seed `{DEMO_SEED}`: the same seed gives identical files.\n\n\
## Earth model\n\n\
- Depths of the model are in m TVDSS (true vertical depth below sea level); TVDSS = TVD − EKB.\n\
- Stratigraphy, top down: overburden shale; **Upper Kell** (~40 m, interbedded good class 3/4 and poor class 1/2 \
sand beds 1-6 m thick); **Lower Kell** (~50 m, class 2-4 sand beds 2-8 m with occasional 0.3-1.2 m shale breaks); \
**Base Shale**. Top reservoir varies from 1998 to 2058 m TVDSS across the field (gentle structural dip). \
Bed properties are constant within a bed.\n\
- Compartments: Main (FWL {FWL_MAIN_M} m TVDSS) and East (Tarnby-7 only, FWL {FWL_EAST_M} m TVDSS).\n\
- Rock classes by flow zone indicator, FZI = RQI/φz, RQI = {RQI_CONST}·sqrt(k/φe), φz = φe/(1−φe), hence \
k = {FZI_PERM_CONST}·FZI²·φe³/(1−φe)² (k in mD, FZI in µm; hydraulic-unit method of Amaefule et al., 1993, from memory). \
Each bed draws ln FZI normally about its class centre (σ = {FZI_LN_SD}) and φe normally about the class mean (σ = {PHIE_SD}), both clipped at ±2.5σ.\n\n\
| class | FZI µm | φe | VSH | Archie m | Archie n | Jd | λ | Swirr |\n|---|---|---|---|---|---|---|---|---|\n",
        f = field.field_name,
        o = field.operator,
    );
    for (i, c) in CLASSES.iter().enumerate() {
        s += &format!(
            "| {} | {} | {:.2} | {:.2}-{:.2} | {} | {} | {} | {} | {} |\n",
            i + 1,
            c.fzi,
            c.phie,
            c.vsh.0,
            c.vsh.1,
            c.m,
            c.n,
            c.jd,
            c.lambda,
            c.swirr
        );
    }
    s += &format!(
        "| 0 (shale) | ~{} | 0.01-0.03 | 0.80-1.00 | 2 | 2 | - | - | Sw = 1 |\n\n\
Class 1 is the poorest. Archie exponents follow common practice (near 2, lower for clean well-sorted sand, higher for shaly rock).\n\n\
## Saturation\n\n\
- Height above FWL h (m); reservoir capillary pressure Pc = (ρw−ρo)·g·h with ρw = {RHO_W} g/cc, ρo = {RHO_O} g/cc, g = {G} m/s².\n\
- Leverett J = Pc·sqrt(k/φe)/(σcosθ) in SI units (Leverett 1941, from memory), reservoir σcosθ = {SIGMA_COS_RES} dyn/cm (oil-brine, 30 dyn/cm at 30°).\n\
- Brooks-Corey form in J (Brooks and Corey 1964, from memory): J = Jd·Se^(−1/λ), Se = (Sw−Swirr)/(1−Swirr); Sw = 1 where J ≤ Jd and below the FWL; shale Sw = 1.\n\n\
## Logs (forward model)\n\n\
- GR = {GR_CLEAN} + VSH·({GR_SHALE} − {GR_CLEAN}) gAPI (linear shale index, common practice); noise σ {GR_NOISE} gAPI.\n\
- Bulk density: volume mix of quartz matrix {RHO_MATRIX}, shale {RHO_SHALE} (including its bound water) and pore fluid Sw·{RHO_W} + (1−Sw)·{RHO_O} g/cc; flushed-zone invasion is ignored; noise σ {RHOB_NOISE} g/cc.\n\
- Neutron (limestone units treated as v/v) = φe·(Sw + (1−Sw)·{HI_OIL}) + VSH·{NPHI_SHALE}; noise σ {NPHI_NOISE}.\n\
- Sonic: Wyllie time average (Wyllie et al. 1956) with matrix {DT_MATRIX}, fluid {DT_FLUID}, shale {DT_SHALE} µs/ft; noise σ {DT_NOISE} µs/ft.\n\
- Resistivity: Archie (1942) sand resistivity a·Rw/(φe^m·Sw^n), a = {ARCHIE_A}, Rw = {RW} ohm·m held constant at formation temperature, with shale R_sh = {R_SH} ohm·m by the modified Simandoux relation (Bardon & Pied 1969, after Simandoux 1963; from memory) in reservoir beds, 1/Rt = φe^m·Sw^n/(a·Rw·(1−VSH)) + VSH·Sw/R_sh, and Rt = R_sh in shale beds; multiplicative noise σ(ln Rt) = {RT_LN_NOISE}.\n\
- Caliper: bit size {BIT_SIZE_IN} in, with 1-3 in washouts in about a quarter of the shale beds thicker than 1.5 m; noise σ {CAL_NOISE} in. Washouts do not disturb the other logs.\n\
- Total porosity PHIT = PHIE + VSH·{PHI_SH_BOUND} (shale-bound porosity {PHI_SH_BOUND}).\n\
- Temperature {T_SURFACE_C} °C at the surface (taken at sea level) plus {T_GRADIENT_C_PER_M} °C/m; BHT and RWT in the ~P section come from it.\n\
- Depth step {STEP_M} m (0.5 ft) in metric wells, {STEP_FT} ft in Tarnby-4. Logged from ~{LOG_ABOVE_TOP_M} m above top reservoir to ~{LOG_BELOW_BASE_M} m below its base.\n\
- Missing data (NULL): Tarnby-1 sonic in the top 20 m logged; Tarnby-5 density over 4 m in the Base Shale (160-164 m below the first sample).\n\n\
## Wells\n\n| well | depth unit | curves | compartment | EKB | path | top Upper Kell, m TVDSS | FWL lies in |\n|---|---|---|---|---|---|---|---|\n",
        SHALE.fzi
    );
    for w in &field.wells {
        let spec = (0..8).map(well_spec).find(|s| s.name == w.name);
        let comp = spec.as_ref().map_or("unknown", |s| s.compartment.0);
        let dev = spec.as_ref().is_some_and(|s| s.deviated);
        let path = if dev { "deviated" } else { "vertical" };
        let (top, fwl_in) = spec.as_ref().map_or((f64::NAN, "?"), fwl_position);
        let ekb = w.params.iter().find(|p| p.mnemonic == "EKB");
        let ekb = ekb.map_or("?".into(), |p| format!("{} {}", p.value, p.unit));
        let curves: Vec<String> = w
            .curves
            .iter()
            .map(|c| format!("{} ({})", c.mnemonic, c.unit))
            .collect();
        let (name, unit, curves) = (&w.name, &w.depth_unit, curves.join(", "));
        s += &format!(
            "| {name} | {unit} | {curves} | {comp} | {ekb} | {path} | {top:.0} | {fwl_in} |\n"
        );
    }
    s += &format!(
        "\nEach well also carries truth curves TVDSS_M, VSH, PHIT, PHIE, SW, PERM_MD, FZI_UM, CLASS and HAFWL_M in canonical units (metres even for Tarnby-4).\n\n\
Tarnby-6 survey: vertical to {KOP_M} m MD, builds {BUILD_DEG_PER_30M}°/30 m to {HOLD_INC_DEG}° at azimuth {DEV_AZI_DEG}°, then holds. \
TVD is computed by the minimum-curvature method (as described e.g. in Bourgoyne et al., Applied Drilling Engineering, 1986; from memory).\n\n\
## Tables\n\n\
- `core.csv`: plugs every 0.3-0.5 m in Tarnby-2, Tarnby-3 and Tarnby-5 (sand beds only, not within {PLUG_EDGE_M} m of a bed boundary); \
porosity = φe + noise σ {CORE_PHI_SD}; log10 k noise σ {CORE_LOGK_SD}; grain density {RHO_MATRIX} + {CORE_GD_PER_VSH}·VSH + noise σ {CORE_GD_SD} g/cc.\n\
- **Known core-to-log depth shift: Tarnby-3 core depths read {CORE_SHIFT_M:.2} m deeper than log depth** (subtract {CORE_SHIFT_M:.2} m from core DEPTH_MD to match the logs). The other cored wells are on depth.\n\
- `capillary.csv`: mercury-air curves (σ = {SIGMA_HG} dyn/cm, θ = {THETA_HG_DEG}°) on 2 class-1 and 3 each class-2/3/4 plugs, 10-14 steps each, \
from the class J-model at lab conditions, Pc_lab = Pc_res·(σ|cosθ|)_lab/(σcosθ)_res; SW_FRAC is the non-mercury saturation, noise σ {CAP_SW_SD}. \
Porosity and permeability are the plug's core values.\n\
- `pressures.csv`: formation-pressure points in Tarnby-1, -2, -3, -5 (Main) and -7 (East); gradients {PSI_PER_M_PER_GCC}·ρ psi/m (oil {RHO_O}, water {RHO_W} g/cc) \
through {P_FWL_MAIN_PSI} psi at the Main FWL and {P_FWL_EAST_PSI} psi at the East FWL; gauge scatter normal σ {PRESSURE_SD_PSI} psi, never beyond ±{PRESSURE_MAX_ERR_PSI} psi; \
two points flagged QUALITY=poor carry an extra +{}-{} psi (supercharging-like).\n\
- `zones.csv`: tops of Upper Kell, Lower Kell and Base Shale in each well's own MD unit.\n\
- `surveys/tarnby-6.csv`: the survey stations.\n",
        POOR_ERR_PSI.0, POOR_ERR_PSI.1
    );
    s
}

// ------------------------------------------------------------------ bench field

/// Default depth samples per well of a synthetic bench field.
pub const FIELD_DEFAULT_DEPTHS: usize = 10_000;
/// Fewest depth samples per well of a bench field: the log must hold the
/// margins above and below the reservoir (100 m) and some reservoir.
pub const FIELD_MIN_DEPTHS: usize = 1_000;
/// Header line of a bench field's zones.csv.
pub const FIELD_ZONES_HEADER: &str = "WELL,ZONE,TOP_MD,DEPTH_UNIT";
/// Random-number stream tags of a bench well's layout and of its extra log (SP).
const STREAM_LAYOUT: u64 = 600;
const STREAM_EXTRA_LOGS: u64 = 700;
/// Bench well k's streams are offset by (k + 1)·2^16, clear of every demo stream
/// (tag + demo well index < 2^16) and of each other.
const FIELD_STREAM_SHIFT: u32 = 16;
/// Bench field structure (invented): an anticline elongated east-west, top Upper Kell
/// at FIELD_CREST_M m TVDSS over the crest at grid (E, N) = FIELD_CREST_EN m, deepening
/// quadratically (m per m², east and north) away from it, plus a small per-well
/// scatter (1σ, m, clipped at ±2.5σ). Wells are scattered uniformly over FIELD_EXTENT_M.
const FIELD_CREST_M: f64 = 1990.0;
const FIELD_CREST_EN: (f64, f64) = (6000.0, 4500.0);
const FIELD_CURVATURE: (f64, f64) = (1.5e-6, 8.0e-6);
const FIELD_EXTENT_M: (f64, f64) = (12_000.0, 9_000.0);
const FIELD_TOP_SD_M: f64 = 3.0;
/// KB elevation range of bench wells, m.
const FIELD_EKB_M: (f64, f64) = (24.0, 36.0);
/// Upper Kell's share of the reservoir (drawn per well); the rest is Lower Kell.
const FIELD_UPPER_SHARE: (f64, f64) = (0.40, 0.50);
/// The field's FWL lies this share of the reservoir thickness below the crest's top.
const FIELD_FWL_SHARE: f64 = 0.55;
/// Pressure at the surface, psi: the bench field is normally pressured, water
/// gradient from the surface to its FWL (scenario choice).
const FIELD_SURFACE_PSI: f64 = 14.7;
/// One bench well in this many is cored (the first included), at most
/// FIELD_CORED_MAX wells; each cored well also has a pressure survey.
const FIELD_CORED_EVERY: usize = 20;
const FIELD_CORED_MAX: usize = 12;
/// A bench well's cored interval, m TVD below top Upper Kell.
const FIELD_CORE_M: (f64, f64) = (2.0, 40.0);
/// Pressure points per bench survey above and below the FWL.
const FIELD_PRESSURE_POINTS: (usize, usize) = (6, 4);
/// SP: shale baseline 0 mV, clean-sand deflection and noise (1σ), mV (scenario choices).
const SP_CLEAN_MV: f64 = -70.0;
const SP_NOISE_MV: f64 = 1.5;
/// Log names of every bench well, in the order GR, density, neutron, sonic, resistivity, caliper.
const FIELD_STYLES: [CurveStyle; 6] = [GR, RHOB, NPHI, DT, RT, CALI];

/// SP (mV), linear in shale volume between the shale baseline (0 mV) and the clean-sand
/// deflection (the SP shale index, common practice).
fn sp_from_vsh(vsh: f64) -> f64 {
    SP_CLEAN_MV * (1.0 - vsh)
}

/// Reservoir (Upper plus Lower Kell) thickness, m, that makes a vertical well's log
/// about `depths` samples long.
fn field_reservoir_m(depths: usize) -> f64 {
    let logged = depths.saturating_sub(1) as f64 * STEP_M;
    (logged - LOG_ABOVE_TOP_M - LOG_BELOW_BASE_M).max(10.0)
}

/// Bench well `idx` (0-based): a vertical metric well placed on the field's structure,
/// everything drawn from its own streams of `seed`.
fn field_spec(seed: u64, idx: usize, depths: usize) -> WellSpec {
    let stream = (idx as u64 + 1) << FIELD_STREAM_SHIFT;
    let mut rng = sub_rng(seed, STREAM_LAYOUT + stream);
    let east = rng.random_range(0.0..FIELD_EXTENT_M.0);
    let north = rng.random_range(0.0..FIELD_EXTENT_M.1);
    let (de, dn) = (east - FIELD_CREST_EN.0, north - FIELD_CREST_EN.1);
    let scatter = FIELD_TOP_SD_M * normal(&mut rng).clamp(-2.5, 2.5);
    let structure = FIELD_CURVATURE.0 * de * de + FIELD_CURVATURE.1 * dn * dn;
    let top = round_to(FIELD_CREST_M + structure + scatter, 1);
    let ekb = round_to(rng.random_range(FIELD_EKB_M.0..FIELD_EKB_M.1), 1);
    let thick = field_reservoir_m(depths);
    let upper = round_to(
        rng.random_range(FIELD_UPPER_SHARE.0..FIELD_UPPER_SHARE.1) * thick,
        1,
    );
    let fwl = FIELD_CREST_M + FIELD_FWL_SHARE * thick;
    WellSpec {
        idx,
        name: format!("Synth-{:04}", idx + 1),
        feet: false,
        deviated: false,
        compartment: Compartment(
            "Field",
            fwl,
            FIELD_SURFACE_PSI + PSI_PER_M_PER_GCC * RHO_W * fwl,
        ),
        ekb,
        tops: [top, top + upper, top + thick],
        grid_en: (east, north),
        styles: FIELD_STYLES,
        stream,
        log_nulls: false,
    }
}

/// Well `idx` (0-based) of a synthetic bench field: the demo's forward model (beds,
/// classes, truth, logs) on a vertical metric well of about `depths` samples whose
/// structure, KB and zone thicknesses come from `seed` and `idx`, with eight logs
/// (GR, RHOB, NPHI, DT, RT, CALI, SP, BS). The Upper and Lower Kell are stretched to
/// fill the log. Returns the well and its zones.csv rows (see [`FIELD_ZONES_HEADER`]).
/// Same seed and index, same bits, whatever else is generated.
pub fn field_well(seed: u64, idx: usize, depths: usize) -> (SynthWell, Vec<String>) {
    let m = plan_well(seed, field_spec(seed, idx, depths));
    let mut w = render_well(seed, &m);
    let mut rng = sub_rng(seed, STREAM_EXTRA_LOGS + m.spec.stream);
    let sp: Vec<f64> = m
        .truth
        .iter()
        .map(|t| sp_from_vsh(t.vsh) + SP_NOISE_MV * normal(&mut rng))
        .collect();
    w.curves
        .push(curve("SP", "MV", "Spontaneous potential", 2, sp));
    let bs = vec![BIT_SIZE_IN; m.depth.len()];
    w.curves.push(curve("BS", "IN", "Bit size", 2, bs));
    for e in &mut w.well_items {
        match e.mnemonic.as_str() {
            "FLD" => e.value = "Tarnby Ridge (synthetic bench field)".into(),
            "UWI" => e.value = format!("MRV-TRS-{:05}", idx + 1),
            _ => {}
        }
    }
    let s = &m.spec;
    let zone_rows = ZONE_NAMES
        .iter()
        .zip(s.tops)
        .map(|(zone, top)| format!("{},{zone},{:.2},M", s.name, m.geo.md_m(top)))
        .collect();
    (w, zone_rows)
}

/// The cored wells of a bench field of `wells` wells (0-based indices,
/// spread evenly, the first included).
pub fn field_cored_wells(wells: usize) -> Vec<usize> {
    let n = (wells / FIELD_CORED_EVERY)
        .clamp(1, FIELD_CORED_MAX)
        .min(wells);
    (0..n).map(|k| k * wells / n).collect()
}

/// The bench field's core, capillary-pressure and formation-pressure tables
/// (file name, CSV text), from its cored wells ([`field_cored_wells`]): the
/// demo's sampling (plugs every 0.3-0.5 m, 2-3 capillary curves per class,
/// pressure points clear of bed boundaries) on the bench wells' own beds.
pub fn field_tables(seed: u64, wells: usize, depths: usize) -> Vec<(String, String)> {
    let cored = field_cored_wells(wells);
    let models: Vec<WellModel> = cored
        .iter()
        .map(|&i| plan_well(seed, field_spec(seed, i, depths)))
        .collect();
    let core_plan: Vec<(usize, f64, f64)> = (0..models.len())
        .map(|k| (k, FIELD_CORE_M.0, FIELD_CORE_M.1))
        .collect();
    let pressure_plan: Vec<PressureSurvey> = (0..models.len())
        .map(|k| (k, FIELD_PRESSURE_POINTS.0, FIELD_PRESSURE_POINTS.1, None))
        .collect();
    let mut core_rows = Vec::new();
    let plugs = core_plugs(seed, &models, &core_plan, None, &mut core_rows);
    vec![
        table("core.csv", CORE_HEADER, core_rows),
        table(
            "capillary.csv",
            CAP_HEADER,
            capillary_rows(seed, &plugs, &models),
        ),
        table(
            "pressures.csv",
            PRESSURE_HEADER,
            pressure_rows(seed, &models, &pressure_plan),
        ),
    ]
}

/// Text of a bench field's `field-full.toml`: `field.toml`'s stages, then
/// classes from core (the FZI ladder the demo uses, a random forest on the
/// logs), Archie exponents per class (the forward model's), the
/// saturation-height model from the capillary curves and the pressures, and
/// the contact audit.
pub fn field_full_config(wells: usize, depths: usize, seed: u64) -> String {
    let mut s = String::from(
        "# field-full.toml: the whole pipeline on the bench field (the stages of\n\
# field.toml, then hydraulic classes from core, class-aware SW, the\n\
# saturation-height model and the contact audit).\n",
    );
    s += &field_config(wells, depths, seed);
    s += "\n[core]\nfile = \"core.csv\"\n\n\
[classes]\nuse = \"fzi\"\nperm-method = \"fzi\"\n\n\
[classes.scheme.fzi]\nkind = \"fzi-ladder\"\nbounds = [0.63, 1.58, 3.7]\n\n\
[predictor]\nfeatures = [\"VSH\", \"PHIE\", \"RHOB\", \"NPHI\", \"DT\", \"LOG10_RT\"]\n";
    for (k, c) in CLASSES.iter().enumerate() {
        s += &format!(
            "\n[parameters.class.\"{}\"]\narchie-m = {:.1}\narchie-n = {:.1}\n",
            k + 1,
            c.m,
            c.n
        );
    }
    s += "\n[capillary]\nfile = \"capillary.csv\"\n\n\
[pressures]\nfile = \"pressures.csv\"\n\n\
[compartments.\"Field\"]\n# every well\n";
    s
}

/// Text of a bench field's `field.toml`: the stages read, shale volume, porosity and
/// water saturation only (no core, classes or capillary data), with the values the
/// model was built with; `wells` and `depths` only go into the comments.
pub fn field_config(wells: usize, depths: usize, seed: u64) -> String {
    format!(
        "# Synthetic bench field: {wells} invented wells of about {depths} depth samples,\n\
# written by `flowzone demo --wells {wells} --depths {depths} --seed {seed}` from the\n\
# Tarnby Ridge forward model (field, operator, wells and numbers are made up).\n\
# Run: flowzone run --config field.toml --out OUT   (OUT outside this folder)\n\
# Stages: read, shale volume, porosity, water saturation. The parameters are the\n\
# ones the model was built with, except Archie m and n: the model's rock classes\n\
# have 1.8-2.1, which field-full.toml sets per class; here m = n = 2 throughout.\n\
\n\
[project]\n\
name = \"Tarnby Ridge synthetic field ({wells} wells, seed {seed})\"\n\
depth-unit = \"m\"\n\
\n\
[input]\n\
wells = [\".\"]\n\
\n\
[output]\n\
formats = [\"csv\"]\n\
decimals = 4\n\
# the HTML report is left out of the pipeline benchmark (its cost is measured apart)\n\
report = false\n\
\n\
[zones]\n\
tops = \"zones.csv\"\n\
\n\
[parameters.field]\n\
# linear gamma-ray index between clean sand and shale, gAPI\n\
gr-clean-gapi = {GR_CLEAN}\n\
gr-shale-gapi = {GR_SHALE}\n\
shale-model = \"linear\"\n\
# neutron-density mean, shale-corrected with what it reads in shale\n\
porosity-method = \"neutron-density\"\n\
rho-matrix-gcc = {RHO_MATRIX}\n\
rho-fluid-gcc = {RHO_W}\n\
rho-shale-gcc = {RHO_SHALE}\n\
nphi-shale-vv = {NPHI_SHALE}\n\
phi-max-vv = 0.5\n\
# Archie, Rw at formation temperature (no temperature correction)\n\
saturation-model = \"archie\"\n\
rw-ohmm = {RW}\n\
archie-a = {ARCHIE_A:.1}\n\
archie-m = 2.0\n\
archie-n = 2.0\n\
bad-hole-in = 1.0\n"
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    fn truth<'a>(w: &'a SynthWell, mn: &str) -> &'a [f64] {
        let c = w.truth.iter().find(|c| c.mnemonic == mn);
        c.map_or(&[], |c| c.values.as_slice())
    }

    fn rows<'a>(f: &'a SynthField, name: &str) -> Vec<Vec<&'a str>> {
        let text = f.tables.iter().find(|t| t.0 == name).map_or("", |t| &t.1);
        text.lines()
            .skip(1)
            .map(|l| l.split(',').collect())
            .collect()
    }

    fn num(s: &str) -> f64 {
        s.parse().unwrap_or(f64::NAN)
    }

    #[test]
    fn deterministic_for_a_seed() {
        let (a, b) = (generate(DEMO_SEED), generate(DEMO_SEED));
        assert_eq!(a.tables, b.tables);
        let bits = |f: &SynthField| -> Vec<u64> {
            let curves = f.wells.iter().flat_map(|w| w.curves.iter().chain(&w.truth));
            let vals = curves.flat_map(|c| c.values.iter());
            let depths = f.wells.iter().flat_map(|w| w.depth.iter());
            depths.chain(vals).map(|v| v.to_bits()).collect()
        };
        assert_eq!(bits(&a), bits(&b));
        assert_eq!(scenario_markdown(&a), scenario_markdown(&b));
        let headers = |f: &SynthField| f.wells.iter().map(|w| w.params.clone()).collect::<Vec<_>>();
        assert_eq!(headers(&a), headers(&b));
        assert_ne!(generate(DEMO_SEED + 1).tables, a.tables);
    }

    #[test]
    fn saturation_porosity_and_permeability_are_consistent() {
        let f = generate(DEMO_SEED);
        assert_eq!(f.wells.len(), 8);
        for w in &f.wells {
            let (sw, h, class) = (truth(w, "SW"), truth(w, "HAFWL_M"), truth(w, "CLASS"));
            let (phie, phit, vsh) = (truth(w, "PHIE"), truth(w, "PHIT"), truth(w, "VSH"));
            let (k, fzi) = (truth(w, "PERM_MD"), truth(w, "FZI_UM"));
            assert_eq!(sw.len(), w.depth.len());
            for i in 0..sw.len() {
                if h[i] <= 0.0 || class[i] == 0.0 {
                    assert_eq!(sw[i], 1.0);
                } else {
                    assert!(sw[i] >= rock(class[i] as u8).swirr && sw[i] <= 1.0);
                }
                assert!((phit[i] - phie[i] - vsh[i] * PHI_SH_BOUND).abs() < 1e-12);
                // 1014.24 is 1/0.0314² rounded, so the round trip holds to ~1e-7.
                assert!((fzi_from_perm(k[i], phie[i]) / fzi[i] - 1.0).abs() < 1e-6);
                assert!((perm_from_fzi(fzi[i], phie[i]) / k[i] - 1.0).abs() < 1e-12);
            }
        }
    }

    #[test]
    fn resistivity_and_density_follow_the_model() {
        let f = generate(DEMO_SEED);
        for w in &f.wells {
            let (sw, phie) = (truth(w, "SW"), truth(w, "PHIE"));
            let (vsh, class) = (truth(w, "VSH"), truth(w, "CLASS"));
            for (i, rt) in w.curves[4].values.iter().enumerate() {
                // modified Simandoux in reservoir beds, R_sh in shale, recomputed here from the truth curves
                let rc = rock(class[i] as u8);
                let model = if class[i] == 0.0 {
                    R_SH
                } else {
                    1.0 / (phie[i].powf(rc.m) * sw[i].powf(rc.n) / (RW * (1.0 - vsh[i]))
                        + vsh[i] * sw[i] / R_SH)
                };
                assert!(
                    (rt / model).ln().abs() < 6.0 * RT_LN_NOISE,
                    "{} {i}",
                    w.name
                );
            }
            let den = &w.curves[1];
            let scale = if den.unit == "K/M3" { 1000.0 } else { 1.0 };
            let vals: Vec<f64> = den
                .values
                .iter()
                .filter(|v| v.is_finite())
                .copied()
                .collect();
            assert!(vals.len() > 1000);
            assert!(
                vals.iter().all(|v| (1.9..=2.8).contains(&(v / scale))),
                "{}",
                w.name
            );
        }
        let units: Vec<&str> = f
            .wells
            .iter()
            .flat_map(|w| &w.curves)
            .map(|c| &*c.unit)
            .collect();
        for u in [
            "PU", "K/M3", "US/M", "US/F", "V/V", "G/CC", "OHMM", "GAPI", "IN",
        ] {
            assert!(units.contains(&u), "{u}");
        }
        assert!(f.wells[0].curves[3].values[0].is_nan());
        assert!(f.wells[4].curves[1].values.iter().any(|v| v.is_nan()));
    }

    #[test]
    fn class_one_is_poorest_and_classes_are_ordered() {
        let f = generate(DEMO_SEED);
        let (mut sum, mut n) = ([0.0; 5], [0.0; 5]);
        for w in &f.wells {
            for (c, z) in truth(w, "CLASS").iter().zip(truth(w, "FZI_UM")) {
                sum[*c as usize] += z;
                n[*c as usize] += 1.0;
            }
        }
        let mean: Vec<f64> = (1..5).map(|c| sum[c] / n[c]).collect();
        assert!(mean.windows(2).all(|p| p[0] < p[1]), "{mean:?}");
    }

    #[test]
    fn upper_kell_has_saturation_steps_above_fwl() {
        let f = generate(DEMO_SEED);
        let mut wells_with_steps = 0;
        for (i, w) in f.wells.iter().enumerate() {
            let tops = well_spec(i).tops;
            let (sw, h) = (truth(w, "SW"), truth(w, "HAFWL_M"));
            let (class, tv) = (truth(w, "CLASS"), truth(w, "TVDSS_M"));
            let steps = (1..sw.len())
                .filter(|&j| (tops[0]..tops[1]).contains(&tv[j]) && h[j] > 0.0)
                .filter(|&j| class[j] != class[j - 1] && class[j] * class[j - 1] > 0.0)
                .filter(|&j| (sw[j] - sw[j - 1]).abs() > 0.1)
                .count();
            wells_with_steps += usize::from(steps >= 3);
        }
        assert!(wells_with_steps >= 2, "{wells_with_steps}");
    }

    /// Least-squares line p = slope·z + intercept.
    fn fit(pts: &[(f64, f64)]) -> (f64, f64) {
        let n = pts.len() as f64;
        let mx = pts.iter().map(|p| p.0).sum::<f64>() / n;
        let my = pts.iter().map(|p| p.1).sum::<f64>() / n;
        let sxy: f64 = pts.iter().map(|p| (p.0 - mx) * (p.1 - my)).sum();
        let sxx: f64 = pts.iter().map(|p| (p.0 - mx).powi(2)).sum();
        (sxy / sxx, my - sxy / sxx * mx)
    }

    #[test]
    fn pressure_legs_meet_at_compartment_fwl() {
        let f = generate(DEMO_SEED);
        let rows = rows(&f, "pressures.csv");
        assert_eq!(rows.iter().filter(|r| r[4] == "poor").count(), 2);
        for (east, fwl) in [(false, FWL_MAIN_M), (true, FWL_EAST_M)] {
            let leg = |oil: bool| -> Vec<(f64, f64)> {
                let mine = rows
                    .iter()
                    .filter(|r| (r[0] == "Tarnby-7") == east && r[4] == "good");
                let on_leg = mine.filter(|r| (num(r[2]) < fwl) == oil);
                on_leg.map(|r| (num(r[2]), num(r[3]))).collect()
            };
            let (oil, water) = (leg(true), leg(false));
            assert!(oil.len() >= 5 && water.len() >= 5);
            let ((so, bo), (sw, bw)) = (fit(&oil), fit(&water));
            assert!((so - PSI_PER_M_PER_GCC * RHO_O).abs() < 0.03, "{so}");
            assert!((sw - PSI_PER_M_PER_GCC * RHO_W).abs() < 0.05, "{sw}");
            let z = (bo - bw) / (sw - so);
            assert!((z - fwl).abs() < 0.5, "east={east} z={z}");
        }
    }

    #[test]
    fn tables_have_expected_shape() {
        let f = generate(DEMO_SEED);
        let names: Vec<&str> = f.tables.iter().map(|t| t.0.as_str()).collect();
        let expect = ["core.csv", "capillary.csv", "pressures.csv", "zones.csv"];
        assert_eq!(names[..4], expect);
        assert_eq!(names[4], "surveys/tarnby-6.csv");
        for (name, text) in &f.tables {
            let cols = text.lines().next().map_or(0, |h| h.split(',').count());
            assert!(
                text.lines().skip(1).all(|l| l.split(',').count() == cols),
                "{name}"
            );
            assert!(text.lines().count() > 3, "{name}");
        }
        assert_eq!(rows(&f, "zones.csv").len(), 24);
        // Capillary: 2 class-1 samples and 3 of each other class, 10-14 steps each.
        let cap = rows(&f, "capillary.csv");
        let mut samples: Vec<&str> = cap.iter().map(|r| r[0]).collect();
        samples.dedup();
        assert_eq!(samples.len(), 11);
        for s in &samples {
            let n = cap.iter().filter(|r| r[0] == *s).count();
            assert!((10..=14).contains(&n));
        }
        // Tarnby-3 core reads 0.6 m deep: shifted back, it matches the log-depth truth.
        let w3 = &f.wells[2];
        let phie = truth(w3, "PHIE");
        let core = rows(&f, "core.csv");
        let t3: Vec<_> = core.iter().filter(|r| r[0] == "Tarnby-3").collect();
        assert!(t3.len() > 50);
        let matched = t3.iter().filter(|r| {
            let d = num(r[1]) - CORE_SHIFT_M;
            let j = ((d - w3.depth[0]) / STEP_M).round() as usize;
            (num(r[3]) - phie[j]).abs() < 0.05
        });
        assert!(matched.count() * 10 >= t3.len() * 9);
    }

    #[test]
    fn bench_field_wells_are_deterministic_and_differ() {
        let (a, rows) = field_well(DEMO_SEED, 0, 2_000);
        let (b, _) = field_well(DEMO_SEED, 0, 2_000);
        assert_eq!(a, b);
        assert_eq!(a.file_stem, "synth-0001");
        assert!(
            (1_990..=2_010).contains(&a.depth.len()),
            "{}",
            a.depth.len()
        );
        let names: Vec<&str> = a.curves.iter().map(|c| c.mnemonic.as_str()).collect();
        assert_eq!(
            names,
            ["GR", "RHOB", "NPHI", "DT", "RT", "CALI", "SP", "BS"]
        );
        assert!(
            a.curves
                .iter()
                .all(|c| c.values.iter().all(|v| v.is_finite()))
        );
        assert_eq!(rows.len(), 3);
        assert!(rows[0].starts_with("Synth-0001,Upper Kell,"));
        let (c, _) = field_well(DEMO_SEED, 1, 2_000);
        assert_ne!(a.depth[0], c.depth[0]);
        assert_ne!(a.curves[0].values[..100], c.curves[0].values[..100]);
        let (d, _) = field_well(DEMO_SEED + 1, 0, 2_000);
        assert_ne!(a.curves[0].values[..100], d.curves[0].values[..100]);
        // the demo wells are untouched by the bench wells' streams
        assert_ne!(
            generate(DEMO_SEED).wells[0].curves[0].values[..100],
            a.curves[0].values[..100]
        );
        let toml = field_config(3, 2_000, DEMO_SEED);
        assert!(toml.contains("rw-ohmm = 0.045") && toml.contains("gr-shale-gapi = 130"));
    }

    #[test]
    fn feet_well_and_deviated_well_geometry() {
        let f = generate(DEMO_SEED);
        let w4 = &f.wells[FEET_WELL];
        assert_eq!(w4.depth_unit, "FT");
        assert!(
            w4.depth
                .windows(2)
                .all(|p| (p[1] - p[0] - 0.5).abs() < 1e-9)
        );
        let ekb4 = well_spec(FEET_WELL).ekb;
        for (d, t) in w4.depth.iter().zip(truth(w4, "TVDSS_M")) {
            assert!(((d - ekb4) * FT_TO_M - t).abs() < 1e-9);
        }
        let w6 = &f.wells[DEVIATED_WELL];
        let tv = truth(w6, "TVDSS_M");
        let ekb6 = well_spec(DEVIATED_WELL).ekb;
        assert!(tv.windows(2).all(|p| p[1] > p[0]));
        // The logged interval is in the 35° hold: MD runs well ahead of TVD.
        assert!(w6.depth.iter().zip(tv).all(|(d, t)| d - ekb6 - t > 30.0));
        let (n, d) = (tv.len() - 1, &w6.depth);
        let dz = (tv[n] - tv[0]) / (d[n] - d[0]);
        assert!((dz - HOLD_INC_DEG.to_radians().cos()).abs() < 1e-9);
        let md = scenario_markdown(&f);
        assert!(md.contains("synthetic") && md.contains("0.60 m deeper"));
        assert!(md.contains("| Tarnby-8 | M |"));
    }
}
