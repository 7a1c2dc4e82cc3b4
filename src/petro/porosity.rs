//! Porosity from density, neutron-density and sonic logs, and the shale correction.
//!
//! Input: bulk density (g/cm3), neutron porosity (v/v, in the same matrix
//! units as the density porosity), compressional slowness (us/ft), VSH (v/v).
//! Output: porosities, fractions v/v, not clipped here (the stage clips to
//! physical bounds and counts what it clipped).

/// Matrix density of quartz sandstone, g/cm3 (formulas.md §2.1; quartz 2.648, from memory).
pub const RHO_MA_SANDSTONE: f64 = 2.65;
/// Matrix density of limestone (calcite), g/cm3 (formulas.md §2.1).
pub const RHO_MA_LIMESTONE: f64 = 2.71;
/// Matrix density of dolomite, g/cm3 (formulas.md §2.1; 2.876 from memory).
pub const RHO_MA_DOLOMITE: f64 = 2.87;
/// Fresh mud-filtrate density, g/cm3 (formulas.md §2.1).
pub const RHO_FLUID_FRESH: f64 = 1.0;
/// Matrix transit times, us/ft: sandstone, limestone, dolomite (Wyllie et al.
/// 1956, values as quoted in formulas.md §2.3).
pub const DT_MA_SANDSTONE: f64 = 55.5;
/// Matrix transit time of limestone (calcite), us/ft.
pub const DT_MA_LIMESTONE: f64 = 47.6;
/// Matrix transit time of dolomite, us/ft.
pub const DT_MA_DOLOMITE: f64 = 43.5;
/// Fresh-filtrate transit time, us/ft (formulas.md §2.3, from memory).
pub const DT_FLUID_FRESH: f64 = 189.0;

/// A matrix preset: density and sonic transit time.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Deserialize, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Matrix {
    /// Quartz sandstone ([`RHO_MA_SANDSTONE`], [`DT_MA_SANDSTONE`]).
    Sandstone,
    /// Limestone, calcite ([`RHO_MA_LIMESTONE`], [`DT_MA_LIMESTONE`]).
    Limestone,
    /// Dolomite ([`RHO_MA_DOLOMITE`], [`DT_MA_DOLOMITE`]).
    Dolomite,
}

impl Matrix {
    /// Matrix density, g/cm3.
    pub fn density(self) -> f64 {
        match self {
            Matrix::Sandstone => RHO_MA_SANDSTONE,
            Matrix::Limestone => RHO_MA_LIMESTONE,
            Matrix::Dolomite => RHO_MA_DOLOMITE,
        }
    }

    /// Matrix transit time, us/ft.
    pub fn transit_time(self) -> f64 {
        match self {
            Matrix::Sandstone => DT_MA_SANDSTONE,
            Matrix::Limestone => DT_MA_LIMESTONE,
            Matrix::Dolomite => DT_MA_DOLOMITE,
        }
    }
}

/// Density porosity φD = (ρma − ρb)/(ρma − ρf).
///
/// | argument | unit |
/// |---|---|
/// | `rho_b` bulk density, `rho_ma` matrix, `rho_f` pore fluid | g/cm3 |
///
/// Negative where ρb > ρma (heavy minerals, or the matrix density is too low):
/// returned as is so the stage can flag it.
///
/// # Source
/// Standard relation (volumes of matrix and fluid weighting their densities),
/// e.g. Asquith & Gibson (1982); read via formulas.md §2.1.
#[inline]
pub fn density_porosity(rho_b: f64, rho_ma: f64, rho_f: f64) -> f64 {
    (rho_ma - rho_b) / (rho_ma - rho_f)
}

/// Neutron-density porosity, liquid-filled: the mean (φN + φD)/2.
///
/// # Source
/// Asquith & Gibson (1982) (from memory; formulas.md §2.2).
#[inline]
pub fn neutron_density_porosity(phi_n: f64, phi_d: f64) -> f64 {
    0.5 * (phi_n + phi_d)
}

/// Neutron-density porosity in gas: sqrt((φN² + φD²)/2).
///
/// # Source
/// Asquith & Gibson (1982); Asquith & Krygowski (2004) (from memory;
/// formulas.md §2.2).
#[inline]
pub fn neutron_density_porosity_gas(phi_n: f64, phi_d: f64) -> f64 {
    (0.5 * (phi_n * phi_n + phi_d * phi_d)).sqrt()
}

/// Sonic porosity, Wyllie time average: φS = (Δt − Δtma)/(Δtf − Δtma).
///
/// | argument | unit |
/// |---|---|
/// | `dt`, `dt_ma`, `dt_f` | us/ft |
///
/// # Source
/// Wyllie, M. R. J., Gregory, A. R. & Gardner, L. W. (1956), Elastic wave
/// velocities in heterogeneous and porous media, Geophysics 21(1) 41–70
/// (read via formulas.md §2.3).
#[inline]
pub fn sonic_porosity_wyllie(dt: f64, dt_ma: f64, dt_f: f64) -> f64 {
    (dt - dt_ma) / (dt_f - dt_ma)
}

/// Sonic porosity, Raymer-Hunt-Gardner full form: the root in [0, 1] of
/// 1/Δt = (1 − φ)²/Δtma + φ/Δtf. NaN when there is no real root (Δt below the
/// matrix value gives a negative φ, returned as is).
///
/// | argument | unit |
/// |---|---|
/// | `dt`, `dt_ma`, `dt_f` | us/ft |
///
/// # Source
/// Raymer, L. L., Hunt, E. R. & Gardner, J. S. (1980), An improved sonic transit
/// time-to-porosity transform, SPWLA 21st Annual Logging Symposium, paper P
/// (full form from memory; root as written in formulas.md §2.4).
#[inline]
pub fn sonic_porosity_rhg(dt: f64, dt_ma: f64, dt_f: f64) -> f64 {
    let a = 1.0 / dt_ma;
    let b = 2.0 / dt_ma - 1.0 / dt_f;
    let c = 1.0 / dt_ma - 1.0 / dt;
    // a φ² − b φ + c = 0; the smaller root is the physical one
    let disc = b * b - 4.0 * a * c;
    if disc < 0.0 {
        return f64::NAN;
    }
    (b - disc.sqrt()) / (2.0 * a)
}

/// Shale-corrected porosity: φe = φ − VSH·φsh, where φsh is what the same
/// method reads in a pure shale (e.g. φDsh = (ρma − ρsh)/(ρma − ρf)).
///
/// # Source
/// Common practice; the density form is the one on nafta.wiki and Crain's
/// handbook (formulas.md §2.5). Chosen over φt·(1 − VSH) and used throughout.
#[inline]
pub fn shale_corrected_porosity(phi: f64, vsh: f64, phi_shale: f64) -> f64 {
    phi - vsh * phi_shale
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

    /// Source: formulas.md §2.1 computed table for ρb = 2.40.
    #[test]
    fn density_porosity_table() {
        for (ma, f, e) in [
            (2.65, 1.0, 0.15152),
            (2.65, 1.1, 0.16129),
            (2.71, 1.0, 0.18129),
            (2.71, 1.1, 0.19255),
            (2.87, 1.0, 0.25134),
            (2.87, 1.1, 0.26554),
        ] {
            assert_close(density_porosity(2.40, ma, f), e, 1e-5);
        }
    }

    /// Source: Rider, *The Geological Interpretation of Well Logs*, Fig. 9.1, as
    /// quoted in formulas.md §2.1: a water sandstone at 20 % porosity reads 2.32
    /// g/cm3, and 2.49 at 10 % (printed to 0.01 g/cm3, so porosity ±0.005).
    #[test]
    fn rider_published_points() {
        assert_close(
            density_porosity(2.32, RHO_MA_SANDSTONE, RHO_FLUID_FRESH),
            0.20,
            1e-9,
        );
        assert_close(
            density_porosity(2.49, RHO_MA_SANDSTONE, RHO_FLUID_FRESH),
            0.10,
            0.005,
        );
    }

    /// Source: formulas.md §2.2 computed values.
    #[test]
    fn neutron_density_forms() {
        assert_close(neutron_density_porosity_gas(0.10, 0.30), 0.22361, 1e-5);
        assert_close(neutron_density_porosity(0.10, 0.30), 0.20, 1e-12);
        assert_close(neutron_density_porosity_gas(0.18, 0.22), 0.20100, 1e-5);
    }

    /// Source: formulas.md §2.4 table (sandstone, Δtma 55.5, Δtf 189), and the
    /// ogbonlab sonic page quoted there (DT 80 → 18 p.u. by Wyllie).
    #[test]
    fn sonic_table() {
        for (dt, wy, rhg) in [
            (80.0, 0.18352, 0.20382),
            (90.0, 0.25843, 0.26617),
            (100.0, 0.33333, 0.32129),
        ] {
            assert_close(
                sonic_porosity_wyllie(dt, DT_MA_SANDSTONE, DT_FLUID_FRESH),
                wy,
                1e-5,
            );
            assert_close(
                sonic_porosity_rhg(dt, DT_MA_SANDSTONE, DT_FLUID_FRESH),
                rhg,
                1e-5,
            );
        }
        assert_close(
            sonic_porosity_wyllie(80.0, DT_MA_LIMESTONE, DT_FLUID_FRESH),
            0.22914,
            1e-5,
        );
        assert_close(sonic_porosity_wyllie(80.0, 55.5, 189.0), 0.18, 0.005);
        // at the matrix transit time both give zero porosity
        assert_close(
            sonic_porosity_rhg(DT_MA_SANDSTONE, DT_MA_SANDSTONE, DT_FLUID_FRESH),
            0.0,
            1e-12,
        );
    }

    /// Source: formulas.md §2.5 computed examples: sandstone, ρsh 2.50 →
    /// φDsh 0.090909; φD 0.24, VSH 0.30 → φe 0.21273. ND: φNc 0.230, φDc 0.182, mean 0.2060.
    #[test]
    fn shale_correction() {
        let phi_dsh = density_porosity(2.50, RHO_MA_SANDSTONE, RHO_FLUID_FRESH);
        assert_close(phi_dsh, 0.090909, 1e-6);
        assert_close(shale_corrected_porosity(0.24, 0.30, phi_dsh), 0.21273, 1e-5);
        let n = shale_corrected_porosity(0.30, 0.20, 0.35);
        let d = shale_corrected_porosity(0.20, 0.20, 0.09);
        assert_close(neutron_density_porosity(n, d), 0.2060, 1e-9);
        assert_close(neutron_density_porosity_gas(n, d), 0.20739, 1e-5);
    }

    proptest::proptest! {
        /// More shale never raises effective porosity; denser rock never has more density porosity.
        #[test]
        fn monotonic(phi in 0.0f64..0.4, v1 in 0.0f64..1.0, v2 in 0.0f64..1.0, phish in 0.0f64..0.3, r1 in 1.9f64..2.9, r2 in 1.9f64..2.9) {
            let (lo, hi) = if v1 < v2 { (v1, v2) } else { (v2, v1) };
            proptest::prop_assert!(shale_corrected_porosity(phi, hi, phish) <= shale_corrected_porosity(phi, lo, phish));
            let (a, b) = if r1 < r2 { (r1, r2) } else { (r2, r1) };
            proptest::prop_assert!(density_porosity(b, 2.65, 1.0) <= density_porosity(a, 2.65, 1.0));
        }
    }
}
