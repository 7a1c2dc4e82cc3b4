//! Flow-unit quantities of a core sample.
//!
//! Input: porosity φ (fraction v/v) and permeability k (mD).
//! Output: RQI and FZI in µm, normalised porosity φz (v/v), Winland R35 in µm.

/// RQI constant, µm per sqrt(mD): sqrt(9.869233e-4 µm²/mD) rounded as published.
pub const RQI_CONSTANT: f64 = 0.0314;
/// k-from-FZI constant, 1/0.0314² = 1014.23995 rounded as published (formulas.md
/// §5), so k → FZI → k round-trips to 5e-8 relative.
pub const FZI_PERM_CONSTANT: f64 = 1014.24;
/// Winland R35 coefficients (log10 form, Ka in mD, φ in percent).
pub const WINLAND_INTERCEPT: f64 = 0.732;
/// Winland R35 coefficient of log10 k (k in mD).
pub const WINLAND_LOG_K: f64 = 0.588;
/// Winland R35 coefficient of log10 φ (φ in percent), subtracted.
pub const WINLAND_LOG_PHI: f64 = 0.864;

/// Reservoir quality index RQI = 0.0314·sqrt(k/φ), µm.
///
/// | argument | unit |
/// |---|---|
/// | `k_md` | mD |
/// | `phi` | v/v (effective porosity) |
///
/// # Source
/// Amaefule, J. O., Altunbay, M., Tiab, D., Kersey, D. G. & Keelan, D. K.
/// (1993), Enhanced reservoir description: using core and log data to identify
/// hydraulic (flow) units, SPE 26436 (read via formulas.md §5).
#[inline]
pub fn rqi(k_md: f64, phi: f64) -> f64 {
    RQI_CONSTANT * (k_md / phi).sqrt()
}

/// Normalised porosity φz = φ/(1 − φ), v/v. Source: Amaefule et al. (1993).
#[inline]
pub fn normalised_porosity(phi: f64) -> f64 {
    phi / (1.0 - phi)
}

/// Flow zone indicator FZI = RQI/φz, µm. Source: Amaefule et al. (1993).
#[inline]
pub fn fzi(k_md: f64, phi: f64) -> f64 {
    rqi(k_md, phi) / normalised_porosity(phi)
}

/// Permeability from FZI and porosity: k = 1014.24·FZI²·φ³/(1 − φ)², mD.
/// Source: Amaefule et al. (1993), the inverse of [`fzi`].
#[inline]
pub fn perm_from_fzi(fzi_um: f64, phi: f64) -> f64 {
    FZI_PERM_CONSTANT * fzi_um * fzi_um * phi.powi(3) / (1.0 - phi).powi(2)
}

/// Winland R35 (pore-throat radius at 35 % mercury saturation), µm:
/// log R35 = 0.732 + 0.588·log Ka − 0.864·log φ, φ in percent.
///
/// # Source
/// Winland's equation as published by Kolodzie, S. (1980), Analysis of pore
/// throat size and use of the Waxman-Smits equation to determine OOIP in
/// Spindle field, Colorado, SPE 9382 (coefficients from memory; formulas.md §6).
#[inline]
pub fn winland_r35(k_md: f64, phi: f64) -> f64 {
    10f64.powf(
        WINLAND_INTERCEPT + WINLAND_LOG_K * k_md.log10() - WINLAND_LOG_PHI * (100.0 * phi).log10(),
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::assert_close;

    /// Source: formulas.md §5 computed table (relative 1e-4 suggested there).
    #[test]
    fn rqi_fzi_table() {
        for (k, phi, rq, pz, f) in [
            (100.0, 0.20, 0.70213, 0.25000, 2.80850),
            (1.0, 0.10, 0.099296, 0.11111, 0.89366),
            (1000.0, 0.25, 1.98591, 0.33333, 5.95773),
            (10.0, 0.15, 0.25638, 0.17647, 1.45282),
            (0.5, 0.08, 0.078500, 0.086957, 0.90275),
        ] {
            assert_close(rqi(k, phi), rq, 1e-4 * rq);
            assert_close(normalised_porosity(phi), pz, 1e-4 * pz);
            assert_close(fzi(k, phi), f, 1e-4 * f);
            // k back: formulas.md §5 calls 1014.24 exactly consistent with 0.0314,
            // but 1/0.0314² = 1014.23995, so the round trip holds to 5e-8 relative
            assert_close(perm_from_fzi(fzi(k, phi), phi), k, 1e-7 * k);
        }
    }

    /// Source: formulas.md §6 computed Winland column; boundary test Ka 10 mD,
    /// φ 15 % → 2.0131 µm; Ka 9.8899 mD → 2.0000.
    #[test]
    fn winland_table() {
        for (k, phi, r) in [
            (100.0, 0.20, 6.0801),
            (1.0, 0.10, 0.73790),
            (1000.0, 0.25, 19.417),
            (10.0, 0.15, 2.0131),
            (0.1, 0.08, 0.23106),
        ] {
            assert_close(winland_r35(k, phi), r, 1e-4 * r);
        }
        assert_close(winland_r35(9.8899, 0.15), 2.0, 1e-4);
    }

    proptest::proptest! {
        /// k → FZI → k round-trips (to 1e-7: 1014.24 is 1/0.0314² rounded);
        /// FZI and R35 rise with k at fixed porosity.
        #[test]
        fn round_trip_and_monotonic(k in 0.001f64..10_000.0, phi in 0.02f64..0.45, f in 1.01f64..10.0) {
            let back = perm_from_fzi(fzi(k, phi), phi);
            proptest::prop_assert!((back - k).abs() <= 1e-7 * k);
            proptest::prop_assert!(fzi(k * f, phi) > fzi(k, phi));
            proptest::prop_assert!(winland_r35(k * f, phi) > winland_r35(k, phi));
        }
    }
}
