//! Formation temperature and water resistivity.
//!
//! Input: Rw at a reference temperature (ohm.m, °C), surface temperature and
//! geothermal gradient (°C, °C per metre) or a bottom-hole temperature.
//! Output: formation temperature (°C) and Rw at it (ohm.m).
//!
//! Temperatures are °C inside the crate; the Arps relation is applied in its
//! °F form (the published one) after converting, so no rounded °C constant is
//! needed (formulas.md §10).

/// Arps (1953) constant of the °F form, °F.
pub const ARPS_CONSTANT_F: f64 = 6.77;

/// °C → °F.
#[inline]
pub fn celsius_to_fahrenheit(t_c: f64) -> f64 {
    t_c * 9.0 / 5.0 + 32.0
}

/// Rw carried from temperature `t1_c` to `t2_c`: Rw2 = Rw1·(T1 + 6.77)/(T2 + 6.77), T in °F.
///
/// | argument | unit |
/// |---|---|
/// | `rw1` | ohm.m at `t1_c` |
/// | `t1_c`, `t2_c` | °C |
///
/// # Source
/// Arps, J. J. (1953), The effect of temperature on the density and electrical
/// resistivity of sodium chloride solutions, Petroleum Transactions AIME 198,
/// Technical Note 195; read via Tiab & Donaldson, *Petrophysics*, 2nd ed.,
/// Eq. 4.7 (as quoted in formulas.md §3).
#[inline]
pub fn rw_at_temperature(rw1: f64, t1_c: f64, t2_c: f64) -> f64 {
    rw1 * (celsius_to_fahrenheit(t1_c) + ARPS_CONSTANT_F)
        / (celsius_to_fahrenheit(t2_c) + ARPS_CONSTANT_F)
}

/// Formation temperature from a linear gradient: T = Tsurf + g·depth.
///
/// | argument | unit |
/// |---|---|
/// | `t_surface_c` | °C |
/// | `gradient_c_per_m` | °C/m |
/// | `depth_m` | m, true vertical depth below the surface |
///
/// # Source
/// Common practice (linear geothermal gradient); e.g. Asquith & Gibson (1982),
/// "Temperature Gradient Calculation" (formulas.md §3).
#[inline]
pub fn formation_temperature(t_surface_c: f64, gradient_c_per_m: f64, depth_m: f64) -> f64 {
    t_surface_c + gradient_c_per_m * depth_m
}

/// Geothermal gradient from a bottom-hole temperature: g = (BHT − Tsurf)/TD, °C/m.
///
/// # Source
/// As [`formation_temperature`].
#[inline]
pub fn gradient_from_bht(bht_c: f64, t_surface_c: f64, td_m: f64) -> f64 {
    (bht_c - t_surface_c) / td_m
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

    fn f_to_c(f: f64) -> f64 {
        (f - 32.0) * 5.0 / 9.0
    }

    /// Source: formulas.md §3 computed: Rw 0.10 at 75 °F → 0.039546 at 200 °F;
    /// Rw 0.20 at 77 °F → 0.091667 at 176 °F (°F form).
    #[test]
    fn arps_computed() {
        assert_close(
            rw_at_temperature(0.10, f_to_c(75.0), f_to_c(200.0)),
            0.039546,
            1e-6,
        );
        assert_close(rw_at_temperature(0.20, 25.0, 80.0), 0.091667, 1e-6);
    }

    /// Source: Asquith & Gibson (1982), Fig. 8, as quoted in formulas.md §3:
    /// Tsurf 80 °F, BHT 180 °F at 10 000 ft → 140 °F at 6 000 ft. Computed in
    /// °C and metres here and converted back.
    #[test]
    fn asquith_gibson_gradient() {
        let ft = 0.3048;
        let g = gradient_from_bht(f_to_c(180.0), f_to_c(80.0), 10_000.0 * ft);
        let t = formation_temperature(f_to_c(80.0), g, 6_000.0 * ft);
        assert_close(celsius_to_fahrenheit(t), 140.0, 1e-9);
    }

    /// Source: formulas.md §3 SI example (made up there): 15 °C, BHT 90 °C at
    /// 3 000 m → 0.025 °C/m; 70.0 °C at 2 200 m.
    #[test]
    fn si_gradient() {
        let g = gradient_from_bht(90.0, 15.0, 3000.0);
        assert_close(g, 0.025, 1e-12);
        assert_close(formation_temperature(15.0, g, 2200.0), 70.0, 1e-9);
    }

    proptest::proptest! {
        /// Hotter water conducts better: Rw falls as temperature rises.
        #[test]
        fn rw_falls_with_temperature(t1 in 0.0f64..150.0, dt in 0.1f64..100.0) {
            proptest::prop_assert!(rw_at_temperature(0.1, 20.0, t1 + dt) < rw_at_temperature(0.1, 20.0, t1));
        }
    }
}
