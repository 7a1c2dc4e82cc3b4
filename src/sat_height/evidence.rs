//! Saturation-height evidence for the class: at a depth above the free water
//! level, rock of each class would hold a known SW at that height (its
//! J-function, Leverett 1941, at the class's permeability for the depth's
//! porosity), and the logs give SW with that class's Archie exponents. The
//! difference, one per class, is what the class stage turns into a
//! likelihood ([`crate::classes::posterior::fuse_saturation`]).
//!
//! At or below the FWL every class holds SW = 1, so the height model cannot
//! tell classes apart there: those depths carry no residual (NaN), and the
//! class stage says how many depths of a well the evidence informed.

use crate::classes::perm::ClassPerm;
use crate::config::PermMethod;
use crate::config::params::Parameters;
use crate::output::schema::Col;
use crate::sat_height::{CompartmentFwl, SatHeightModel};
use crate::units::DepthUnit;
use crate::well::WellOutput;

/// For every depth of `out` and every class c (row-major, class 1 first):
/// SW from the logs with class c's exponents minus SWH of class c at the
/// depth's height above its compartment's FWL, porosity PHIE and class c's
/// permeability at that porosity (`perm`, by `method`). NaN at or below the
/// FWL, where PHIE or TVDSS is missing, and for a class without a
/// permeability relation. `Err` says why the well has no evidence at all
/// (no compartment, no TVDSS). `names` are the well's LAS name and file stem.
pub fn class_residuals(
    model: &SatHeightModel,
    out: &WellOutput,
    names: &[&str],
    params: &Parameters,
    perm: &[ClassPerm],
    method: PermMethod,
    classes: u8,
) -> Result<Vec<f64>, String> {
    let comp = model
        .compartment(names)
        .ok_or_else(|| "in no compartment, so no free water level".to_string())?;
    let table = &out.table;
    let tvdss = table
        .get(Col::Tvdss)
        .filter(|t| t.iter().any(|v| v.is_finite()))
        .ok_or_else(|| "no TVDSS (no datum elevation), so no height above the FWL".to_string())?;
    let phie = table.get(Col::Phie).ok_or_else(|| "no PHIE".to_string())?;
    let sw = out.sw_for_each_class(params, classes);
    Ok(residuals(
        model, comp, tvdss, phie, &sw, perm, method, classes,
    ))
}

/// [`class_residuals`] on plain curves: `tvdss` (project depth unit) and
/// `phie` (v/v) per depth, `sw` the logs' SW with each class's exponents
/// (row-major, `classes` per depth).
#[allow(clippy::too_many_arguments)]
pub fn residuals(
    model: &SatHeightModel,
    comp: &CompartmentFwl,
    tvdss: &[f64],
    phie: &[f64],
    sw: &[f64],
    perm: &[ClassPerm],
    method: PermMethod,
    classes: u8,
) -> Vec<f64> {
    let k = usize::from(classes);
    let to_m = model.depth_unit.factor_to(DepthUnit::Metre);
    let drho = comp.rho_water_gcc - comp.rho_hc_gcc;
    let by_class: Vec<Option<&ClassPerm>> = (1..=classes)
        .map(|c| perm.iter().find(|p| p.class == c))
        .collect();
    let mut res = vec![f64::NAN; sw.len()];
    for (i, (&z, &phi)) in tvdss.iter().zip(phie).enumerate() {
        let h_m = (comp.fwl_tvdss - z) * to_m;
        if !(h_m > 0.0 && phi > 0.0) {
            continue;
        }
        for (c, cp) in by_class.iter().enumerate() {
            let (Some(cp), Some(&s)) = (cp, sw.get(i * k + c)) else {
                continue;
            };
            let k_md = cp.perm(method, phi);
            res[i * k + c] = s - model.swh(h_m, (c + 1) as f64, k_md, phi, drho);
        }
    }
    res
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::sat_height::lab_curves::brooks_corey_j as bc;

    /// A residual is the logs' SW minus the class curve's SW at the height:
    /// checked against [`SatHeightModel::swh`] evaluated by hand for a
    /// depth 30 m above the FWL, and NaN below it.
    #[test]
    fn residual_is_log_sw_minus_class_swh_and_silent_below_fwl() {
        let curves = vec![bc(0.06, 1.0, 0.32), bc(0.025, 2.2, 0.09)];
        let comp = CompartmentFwl {
            name: "field".into(),
            wells: None,
            fwl_tvdss: 2030.0,
            fwl_sigma: None,
            source: "config".into(),
            pressure_fit: None,
            pressure_fit_error: None,
            rho_water_gcc: 1.05,
            rho_hc_gcc: 0.75,
            density_source: "config".into(),
            points_used: 0,
            points_m: Vec::new(),
        };
        let model =
            SatHeightModel::new_for_audit(curves, 26.0, vec![comp.clone()], DepthUnit::Metre);
        let perm = [
            crate::classes::perm::fit(&[(1, 0.2, 10.0), (1, 0.21, 10.0)]),
            crate::classes::perm::fit(&[(2, 0.2, 100.0), (2, 0.21, 100.0)]),
        ]
        .concat();
        // two depths, 30 m above and 10 m below the FWL; log SW 0.3 for both classes
        let r = residuals(
            &model,
            &comp,
            &[2000.0, 2040.0],
            &[0.2, 0.2],
            &[0.3; 4],
            &perm,
            PermMethod::Fzi,
            2,
        );
        for c in 0..2 {
            let k_md = perm[c].perm(PermMethod::Fzi, 0.2);
            let want = 0.3 - model.swh(30.0, (c + 1) as f64, k_md, 0.2, 0.30);
            assert!(
                (r[c] - want).abs() < 1e-12,
                "class {}: {} vs {want}",
                c + 1,
                r[c]
            );
        }
        // the poorer class holds more water at the same height
        assert!(r[0] < r[1]);
        assert!(r[2].is_nan() && r[3].is_nan(), "below the FWL: no evidence");
    }
}
