//! The per-well petrophysics chain: quality flags, shale volume, porosity,
//! formation water and water saturation, applied depth by depth over slices.
//!
//! Input: curves in canonical units (GR gAPI, RHOB g/cm3, NPHI v/v, DT us/ft,
//! RT ohm.m, CALI/BS in), TVD in metres for temperature, the zone of each
//! sample and the resolved parameters of each zone.
//! Output: VSH, PHIT, PHIE, SW, BVW (fractions v/v) and the FLAG curve, plus
//! counts of what was clipped, flagged or undefined.
//!
//! Formulas are in [`crate::petro`] and [`crate::petro::saturation`]; this module
//! only applies them, clips to physical bounds (counting every clip) and
//! flags. No allocation per sample: one output vector per curve.

use serde::{Deserialize, Serialize};

use crate::config::params::{PorosityMethod, ZoneParams};
use crate::petro::porosity::{
    density_porosity, neutron_density_porosity, neutron_density_porosity_gas,
    shale_corrected_porosity, sonic_porosity_rhg, sonic_porosity_wyllie,
};
use crate::petro::saturation::{ArchieParams, bulk_volume_water};
use crate::petro::shale::{gamma_ray_index, shale_volume_neutron_density};
use crate::petro::water::rw_at_temperature;

use crate::output::schema::{
    FLAG_BAD_HOLE, FLAG_CLIPPED, FLAG_MISSING_INPUT, FLAG_NO_CLASS_EXPONENTS, FLAG_OUT_OF_RANGE,
    FLAG_OUTSIDE_ZONE,
};

/// Physical ranges of input curves (common practice: values outside cannot be
/// measurements of rock and usually mark tool or depth-matching problems).
pub const RANGE_GR_GAPI: (f64, f64) = (0.0, 1000.0);
/// Physical range of bulk density RHOB, g/cm3.
pub const RANGE_RHOB_GCC: (f64, f64) = (1.0, 3.2);
/// Physical range of neutron porosity NPHI, v/v.
pub const RANGE_NPHI_VV: (f64, f64) = (-0.15, 1.0);
/// Physical range of compressional slowness DT, us/ft.
pub const RANGE_DT_USFT: (f64, f64) = (40.0, 250.0);
/// Physical range of deep resistivity RT, ohm.m.
pub const RANGE_RT_OHMM: (f64, f64) = (0.01, 100_000.0);

/// The input curves of one well, canonical units; absent curves are `None`.
#[derive(Debug, Clone, Copy, Default)]
pub struct Inputs<'a> {
    /// Gamma ray, gAPI.
    pub gr: Option<&'a [f64]>,
    /// Bulk density, g/cm3.
    pub rhob: Option<&'a [f64]>,
    /// Neutron porosity, v/v.
    pub nphi: Option<&'a [f64]>,
    /// Compressional slowness, us/ft.
    pub dt: Option<&'a [f64]>,
    /// Deep (true) resistivity, ohm.m.
    pub rt: Option<&'a [f64]>,
    /// Caliper hole diameter, in (for the bad-hole flag).
    pub cali: Option<&'a [f64]>,
    /// Bit size, in; when `None` the zone's `bit_size_in` parameter is used.
    pub bs: Option<&'a [f64]>,
    /// True vertical depth below the surface, m (for temperature).
    pub tvd_m: &'a [f64],
}

/// One zone as the chain sees it: resolved parameters and the gamma-ray picks.
#[derive(Debug, Clone, Serialize, Deserialize)]
pub struct ZoneSetup {
    /// Zone name, as in the tops.
    pub name: String,
    /// The zone's resolved parameters.
    pub params: ZoneParams,
    /// Clean and shale gamma ray used, gAPI.
    pub gr_clean_gapi: f64,
    /// Shale gamma ray used, gAPI.
    pub gr_shale_gapi: f64,
    /// Whether the values above were picked from the well's GR (percentiles).
    pub gr_picked: bool,
    /// Geothermal gradient used, °C/m, when Rw is carried to formation temperature.
    pub gradient_c_per_m: Option<f64>,
}

/// What the chain clipped, flagged and could not define.
#[derive(Debug, Clone, Default, PartialEq, Eq, Serialize, Deserialize)]
pub struct Counts {
    /// Depth samples in the well.
    pub samples: usize,
    /// Depths whose VSH was clipped to [0, 1].
    pub vsh_clipped: usize,
    /// Depths whose PHIT was clipped to [0, the zone's `phi_max_vv`].
    pub phit_clipped: usize,
    /// Depths whose PHIE was clipped to [0, PHIT].
    pub phie_clipped: usize,
    /// Depths whose SW was clipped to [0, 1].
    pub sw_clipped: usize,
    /// Depths flagged bad hole (caliper over bit size by more than `bad_hole_in`).
    pub bad_hole: usize,
    /// Depths with an input curve outside its physical range (not interpreted).
    pub out_of_range: usize,
    /// Depths missing an input curve the zone's methods need.
    pub missing_input: usize,
    /// Depths outside every zone (kept, not interpreted).
    pub outside_zone: usize,
    /// SW undefined by the method (zero effective porosity), not missing in the file.
    pub sw_undefined: usize,
}

/// The chain's output curves.
#[derive(Debug, Clone, Default)]
pub struct Outputs {
    /// Shale volume, v/v; NaN where not interpreted.
    pub vsh: Vec<f64>,
    /// Total porosity, v/v; NaN where not interpreted.
    pub phit: Vec<f64>,
    /// Effective (shale-corrected) porosity, v/v; NaN where not interpreted.
    pub phie: Vec<f64>,
    /// Water saturation with the zone's exponents, v/v; NaN where not interpreted or not computable (no Rw, PHIE 0).
    pub sw: Vec<f64>,
    /// Bulk volume water PHIE·SW, v/v.
    pub bvw: Vec<f64>,
    /// Quality flag bits at each depth (`FLAG_*` in `crate::output::schema`).
    pub flag: Vec<u32>,
    /// Formation-water resistivity used at each depth, ohm.m (kept for the
    /// class-aware saturation, which reuses it).
    pub rw: Vec<f64>,
    /// What was clipped, flagged and undefined.
    pub counts: Counts,
}

impl Outputs {
    /// A depth that is kept and flagged but not interpreted.
    fn push_uninterpreted(&mut self, flag: u32) {
        for v in [
            &mut self.vsh,
            &mut self.phit,
            &mut self.phie,
            &mut self.sw,
            &mut self.bvw,
            &mut self.rw,
        ] {
            v.push(f64::NAN);
        }
        self.flag.push(flag);
    }
}

/// Clip `v` to [lo, hi]; returns the value and whether it was clipped. NaN passes.
#[inline]
fn clip(v: f64, lo: f64, hi: f64) -> (f64, bool) {
    if v < lo {
        (lo, true)
    } else if v > hi {
        (hi, true)
    } else {
        (v, false)
    }
}

#[inline]
fn at(c: Option<&[f64]>, i: usize) -> f64 {
    c.map_or(f64::NAN, |c| c[i])
}

#[inline]
fn outside(v: f64, r: (f64, f64)) -> bool {
    v.is_finite() && (v < r.0 || v > r.1)
}

/// What the chain derives from a zone's parameters once, not per sample.
struct ZonePre {
    uses_density: bool,
    uses_neutron: bool,
    uses_sonic: bool,
    /// Density porosity read in shale, v/v.
    phi_d_shale: f64,
    /// What the porosity method reads in shale, v/v (for the shale correction).
    phi_shale: f64,
}

impl ZonePre {
    fn new(z: &ZoneSetup) -> ZonePre {
        let p = &z.params;
        let phi_d_shale = p.rho_shale_gcc.map_or(f64::NAN, |r| {
            density_porosity(r, p.rho_matrix_gcc, p.rho_fluid_gcc)
        });
        let nphi_sh = p.nphi_shale_vv.unwrap_or(f64::NAN);
        let phi_shale = match p.porosity_method {
            PorosityMethod::Density => phi_d_shale,
            PorosityMethod::NeutronDensity => neutron_density_porosity(nphi_sh, phi_d_shale),
            PorosityMethod::NeutronDensityGas => neutron_density_porosity_gas(nphi_sh, phi_d_shale),
            PorosityMethod::SonicWyllie => p.dt_shale_usft.map_or(f64::NAN, |d| {
                sonic_porosity_wyllie(d, p.dt_matrix_usft, p.dt_fluid_usft)
            }),
            PorosityMethod::SonicRhg => p.dt_shale_usft.map_or(f64::NAN, |d| {
                sonic_porosity_rhg(d, p.dt_matrix_usft, p.dt_fluid_usft)
            }),
        };
        ZonePre {
            uses_density: p.porosity_method.uses_density() || p.neutron_density_shale,
            uses_neutron: p.porosity_method.uses_neutron() || p.neutron_density_shale,
            uses_sonic: p.porosity_method.uses_sonic(),
            phi_d_shale,
            phi_shale,
        }
    }
}

/// Run the chain. `zone_of[i]` indexes `zones`, or is `None` outside every zone.
pub fn run(inputs: &Inputs<'_>, zone_of: &[Option<u16>], zones: &[ZoneSetup]) -> Outputs {
    let n = zone_of.len();
    let mut out = Outputs {
        vsh: Vec::with_capacity(n),
        phit: Vec::with_capacity(n),
        phie: Vec::with_capacity(n),
        sw: Vec::with_capacity(n),
        bvw: Vec::with_capacity(n),
        flag: Vec::with_capacity(n),
        rw: Vec::with_capacity(n),
        counts: Counts {
            samples: n,
            ..Counts::default()
        },
    };
    let mut counts = Counts {
        samples: n,
        ..Counts::default()
    };
    let c = &mut counts;
    let pre: Vec<ZonePre> = zones.iter().map(ZonePre::new).collect();
    for i in 0..n {
        let mut flag = 0u32;
        let (gr, rhob, nphi, dt, rt) = (
            at(inputs.gr, i),
            at(inputs.rhob, i),
            at(inputs.nphi, i),
            at(inputs.dt, i),
            at(inputs.rt, i),
        );
        let Some((z, zp)) =
            zone_of[i].and_then(|z| Some((zones.get(usize::from(z))?, pre.get(usize::from(z))?)))
        else {
            c.outside_zone += 1;
            out.push_uninterpreted(FLAG_OUTSIDE_ZONE);
            continue;
        };
        let p = &z.params;
        let bs = match inputs.bs {
            Some(b) => b[i],
            None => p.bit_size_in.unwrap_or(f64::NAN),
        };
        let cali = at(inputs.cali, i);
        if cali.is_finite() && bs.is_finite() && cali - bs > p.bad_hole_in {
            flag |= FLAG_BAD_HOLE;
            c.bad_hole += 1;
        }
        let (uses_density, uses_neutron, uses_sonic) =
            (zp.uses_density, zp.uses_neutron, zp.uses_sonic);
        let bad = outside(gr, RANGE_GR_GAPI)
            || (uses_density && outside(rhob, RANGE_RHOB_GCC))
            || (uses_neutron && outside(nphi, RANGE_NPHI_VV))
            || (uses_sonic && outside(dt, RANGE_DT_USFT))
            || outside(rt, RANGE_RT_OHMM);
        if bad {
            flag |= FLAG_OUT_OF_RANGE;
            c.out_of_range += 1;
        }
        let missing = !gr.is_finite()
            || !rt.is_finite()
            || (uses_density && !rhob.is_finite())
            || (uses_neutron && !nphi.is_finite())
            || (uses_sonic && !dt.is_finite());
        if missing {
            flag |= FLAG_MISSING_INPUT;
            c.missing_input += 1;
        }
        if bad {
            out.push_uninterpreted(flag);
            continue;
        }

        // shale volume
        let (igr, _) = clip(
            gamma_ray_index(gr, z.gr_clean_gapi, z.gr_shale_gapi),
            0.0,
            1.0,
        );
        let mut vsh = p.shale_model.vsh(igr);
        let phi_d = density_porosity(rhob, p.rho_matrix_gcc, p.rho_fluid_gcc);
        let phi_d_sh = zp.phi_d_shale;
        if p.neutron_density_shale {
            let v_nd = shale_volume_neutron_density(
                nphi,
                phi_d,
                p.nphi_shale_vv.unwrap_or(f64::NAN),
                phi_d_sh,
            );
            vsh = if vsh.is_nan() {
                v_nd
            } else if v_nd.is_nan() {
                vsh
            } else {
                vsh.min(v_nd)
            };
        }
        let (vsh, vc) = clip(vsh, 0.0, 1.0);
        c.vsh_clipped += usize::from(vc);

        // porosity
        let phit = match p.porosity_method {
            PorosityMethod::Density => phi_d,
            PorosityMethod::NeutronDensity => neutron_density_porosity(nphi, phi_d),
            PorosityMethod::NeutronDensityGas => neutron_density_porosity_gas(nphi, phi_d),
            PorosityMethod::SonicWyllie => {
                sonic_porosity_wyllie(dt, p.dt_matrix_usft, p.dt_fluid_usft)
            }
            PorosityMethod::SonicRhg => sonic_porosity_rhg(dt, p.dt_matrix_usft, p.dt_fluid_usft),
        };
        let phi_sh = zp.phi_shale;
        let (phit, tc) = clip(phit, 0.0, p.phi_max_vv);
        c.phit_clipped += usize::from(tc);
        let (phie, ec) = clip(shale_corrected_porosity(phit, vsh, phi_sh), 0.0, phit);
        c.phie_clipped += usize::from(ec);

        // formation water and saturation
        let rw = match (p.rw_ohmm, p.rw_temperature_c, z.gradient_c_per_m) {
            (Some(rw), Some(t_ref), Some(g)) => {
                rw_at_temperature(rw, t_ref, p.surface_temperature_c + g * inputs.tvd_m[i])
            }
            (Some(rw), _, _) => rw,
            (None, _, _) => f64::NAN,
        };
        let rsh = p.rsh_ohmm.unwrap_or(f64::NAN);
        let sw_raw = if phie > 0.0 {
            p.saturation_model.sw(phie, rt, rw, vsh, rsh, p.archie)
        } else {
            f64::NAN
        };
        if phie.is_finite() && phie <= 0.0 && rt.is_finite() {
            c.sw_undefined += 1;
        }
        let (sw, sc) = clip(sw_raw, 0.0, 1.0);
        c.sw_clipped += usize::from(sc);
        if vc || tc || ec || sc {
            flag |= FLAG_CLIPPED;
        }
        out.vsh.push(vsh);
        out.phit.push(phit);
        out.phie.push(phie);
        out.sw.push(sw);
        out.bvw.push(bulk_volume_water(phie, sw));
        out.flag.push(flag);
        out.rw.push(rw);
    }
    out.counts = counts;
    out
}

/// The depth-wise inputs of the class-aware saturation, canonical units.
#[derive(Debug, Clone, Copy)]
pub struct ClassSwInputs<'a> {
    /// Zone index of each depth (into the zones), `None` outside every zone.
    pub zone_of: &'a [Option<u16>],
    /// Rw at each depth, ohm.m ([`Outputs::rw`]).
    pub rw: &'a [f64],
    /// Deep resistivity at each depth, ohm.m.
    pub rt: &'a [f64],
    /// Shale volume at each depth, v/v.
    pub vsh: &'a [f64],
    /// Effective porosity at each depth, v/v.
    pub phie: &'a [f64],
    /// SW with the zone's own exponents (the chain's SW), v/v.
    pub sw_fixed: &'a [f64],
    /// Hydraulic class (1..), NaN where there is none.
    pub class: &'a [f64],
}

/// What the class-aware saturation wrote and counted.
#[derive(Debug, Clone, Default)]
pub struct ClassSw {
    /// Class-aware water saturation, v/v; NaN where the chain's SW is.
    pub sw: Vec<f64>,
    /// Bulk volume water PHIE·SW with the class-aware SW, v/v.
    pub bvw: Vec<f64>,
    /// Interpreted depths without a class (zone exponents used, FLAG 64).
    pub no_class: usize,
    /// Depths whose class-aware SW was clipped to [0, 1].
    pub clipped: usize,
}

/// SW with Archie a, m, n looked up at each depth from its class:
/// `class_archie[zone][class − 1]` (resolved by
/// [`crate::config::params::Parameters::class_archie`]). Depths the chain did not
/// interpret (SW_FIXED empty) stay empty; an interpreted depth without a
/// class keeps the zone's exponents and gets [`FLAG_NO_CLASS_EXPONENTS`].
/// The saturation model and Rw are the zone's, as in [`run`].
pub fn saturation_by_class(
    inp: &ClassSwInputs<'_>,
    zones: &[ZoneSetup],
    class_archie: &[Vec<ArchieParams>],
    flag: &mut [u32],
) -> ClassSw {
    let n = inp.zone_of.len();
    let mut out = ClassSw {
        sw: Vec::with_capacity(n),
        bvw: Vec::with_capacity(n),
        ..ClassSw::default()
    };
    for (i, fl) in flag.iter_mut().enumerate().take(n) {
        let zone = inp.zone_of[i].map(usize::from);
        let (Some(z), true) = (zone, inp.sw_fixed[i].is_finite()) else {
            out.sw.push(inp.sw_fixed[i]);
            out.bvw
                .push(bulk_volume_water(inp.phie[i], inp.sw_fixed[i]));
            continue;
        };
        let (Some(setup), Some(table)) = (zones.get(z), class_archie.get(z)) else {
            out.sw.push(f64::NAN);
            out.bvw.push(f64::NAN);
            continue;
        };
        let p = &setup.params;
        let c = inp.class[i];
        let archie = if c.is_finite() && c >= 1.0 {
            table.get(c as usize - 1).copied()
        } else {
            None
        };
        let archie = archie.unwrap_or_else(|| {
            out.no_class += 1;
            *fl |= FLAG_NO_CLASS_EXPONENTS;
            p.archie
        });
        let raw = p.saturation_model.sw(
            inp.phie[i],
            inp.rt[i],
            inp.rw[i],
            inp.vsh[i],
            p.rsh_ohmm.unwrap_or(f64::NAN),
            archie,
        );
        let (sw, clipped) = clip(raw, 0.0, 1.0);
        if clipped {
            out.clipped += 1;
            *fl |= FLAG_CLIPPED;
        }
        out.sw.push(sw);
        out.bvw.push(bulk_volume_water(inp.phie[i], sw));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::config::params::ParamSet;
    use crate::stats::assert_close;
    use crate::stats::dist::Num;

    fn zone(p: ParamSet) -> ZoneSetup {
        ZoneSetup {
            name: "Z".into(),
            params: p.resolve(),
            gr_clean_gapi: 20.0,
            gr_shale_gapi: 120.0,
            gr_picked: false,
            gradient_c_per_m: None,
        }
    }

    /// Hand-computed chain at one depth: GR 70 → IGR 0.5 → VSH 0.5 (linear);
    /// RHOB 2.32 → φD 0.2 (Rider's water sandstone, formulas.md §2.1);
    /// ρsh 2.50 → φDsh 0.090909; PHIE = 0.2 − 0.5·0.090909 = 0.154545;
    /// Archie a 1, m n 2, Rw 0.05, RT 10 → SW = sqrt(0.05/(0.1545455²·10)) = sqrt(0.209343) = 0.457540.
    #[test]
    fn one_depth_by_hand() {
        let z = zone(ParamSet {
            rw_ohmm: Some(Num::from(0.05)),
            rho_shale_gcc: Some(Num::from(2.50)),
            ..ParamSet::default()
        });
        let inputs = Inputs {
            gr: Some(&[70.0]),
            rhob: Some(&[2.32]),
            rt: Some(&[10.0]),
            tvd_m: &[2000.0],
            ..Inputs::default()
        };
        let out = run(&inputs, &[Some(0)], &[z]);
        assert_close(out.vsh[0], 0.5, 1e-12);
        assert_close(out.phit[0], 0.2, 1e-12);
        assert_close(out.phie[0], 0.2 - 0.5 * 0.15 / 1.65, 1e-12);
        assert_close(
            out.sw[0],
            (0.05f64 / (out.phie[0].powi(2) * 10.0)).sqrt(),
            1e-12,
        );
        assert_close(out.sw[0], 0.457540, 1e-6);
        assert_close(out.bvw[0], out.phie[0] * out.sw[0], 1e-15);
        assert_eq!(out.flag[0], 0);
    }

    #[test]
    fn flags_and_counts() {
        let z = zone(ParamSet {
            rw_ohmm: Some(Num::from(0.05)),
            rho_shale_gcc: Some(Num::from(2.5)),
            bit_size_in: Some(Num::from(8.5)),
            ..ParamSet::default()
        });
        let gr = [70.0, 70.0, 70.0, 70.0, 200.0];
        let rhob = [2.32, 0.2, f64::NAN, 2.32, 2.32];
        let rt = [0.2, 10.0, 10.0, 10.0, 10.0];
        let cali = [8.5, 8.5, 8.5, 10.0, 8.5];
        let inputs = Inputs {
            gr: Some(&gr),
            rhob: Some(&rhob),
            rt: Some(&rt),
            cali: Some(&cali),
            tvd_m: &[0.0; 5],
            ..Inputs::default()
        };
        let out = run(&inputs, &[Some(0), Some(0), Some(0), Some(0), None], &[z]);
        // row 0: RT 0.2 makes SW > 1 → clipped to 1
        assert_eq!(out.sw[0], 1.0);
        assert_eq!(out.flag[0], FLAG_CLIPPED);
        // row 1: RHOB 0.2 is outside 1.0-3.2 → not interpreted
        assert_eq!(out.flag[1], FLAG_OUT_OF_RANGE);
        assert!(out.phit[1].is_nan());
        // row 2: RHOB missing
        assert_eq!(out.flag[2] & FLAG_MISSING_INPUT, FLAG_MISSING_INPUT);
        assert!(out.sw[2].is_nan());
        // row 3: caliper 1.5 in over bit size
        assert_eq!(out.flag[3], FLAG_BAD_HOLE);
        // row 4: outside every zone, kept and marked
        assert_eq!(out.flag[4], FLAG_OUTSIDE_ZONE);
        assert_eq!(
            out.counts,
            Counts {
                samples: 5,
                sw_clipped: 1,
                bad_hole: 1,
                out_of_range: 1,
                missing_input: 1,
                outside_zone: 1,
                ..Counts::default()
            }
        );
    }

    /// Rw carried to formation temperature by Arps: Rw 0.10 at 23.889 °C (75 °F),
    /// surface 15 °C, gradient chosen so that T = 93.333 °C (200 °F) → Rw 0.039546
    /// (formulas.md §3), so SW = sqrt(0.039546/(φ²·Rt)).
    #[test]
    fn rw_temperature_in_the_chain() {
        let mut z = zone(ParamSet {
            rw_ohmm: Some(Num::from(0.10)),
            rw_temperature_c: Some(Num::from((75.0 - 32.0) * 5.0 / 9.0)),
            rho_shale_gcc: Some(Num::from(2.65)),
            surface_temperature_c: Some(Num::from(15.0)),
            ..ParamSet::default()
        });
        let t = (200.0 - 32.0) * 5.0 / 9.0;
        z.gradient_c_per_m = Some((t - 15.0) / 2000.0);
        let inputs = Inputs {
            gr: Some(&[20.0]),
            rhob: Some(&[2.32]),
            rt: Some(&[10.0]),
            tvd_m: &[2000.0],
            ..Inputs::default()
        };
        let out = run(&inputs, &[Some(0)], &[z]);
        assert_close(out.sw[0], (0.039546f64 / (0.04 * 10.0)).sqrt(), 1e-5);
    }

    /// Class-aware SW at three depths, Archie, φ 0.2, Rt 10, Rw 0.05 (hand
    /// computed, SW = (a·Rw/(φ^m·Rt))^(1/n), Archie 1942): class 1 with
    /// m = n = 2.1 → 0.401090; class 2 with m = n = 1.8 → 0.263403; no class →
    /// the zone's m = n = 2 → 0.353553 and FLAG 64; a depth the chain did not
    /// interpret stays empty.
    #[test]
    fn saturation_by_class_by_hand() {
        let z = zone(ParamSet {
            rw_ohmm: Some(Num::from(0.05)),
            ..ParamSet::default()
        });
        let table = vec![vec![
            ArchieParams {
                a: 1.0,
                m: 2.1,
                n: 2.1,
            },
            ArchieParams {
                a: 1.0,
                m: 1.8,
                n: 1.8,
            },
        ]];
        let inp = ClassSwInputs {
            zone_of: &[Some(0), Some(0), Some(0), None],
            rw: &[0.05; 4],
            rt: &[10.0; 4],
            vsh: &[0.0; 4],
            phie: &[0.2; 4],
            sw_fixed: &[0.353553, 0.353553, 0.353553, f64::NAN],
            class: &[1.0, 2.0, f64::NAN, 1.0],
        };
        let mut flag = [0u32, 0, 0, FLAG_OUTSIDE_ZONE];
        let out = saturation_by_class(&inp, &[z], &table, &mut flag);
        assert_close(out.sw[0], 0.401090, 1e-6);
        assert_close(out.sw[1], 0.263403, 1e-6);
        assert_close(out.sw[2], 0.353553, 1e-6);
        assert!(out.sw[3].is_nan() && out.bvw[3].is_nan());
        assert_close(out.bvw[0], 0.2 * out.sw[0], 1e-15);
        assert_eq!(flag, [0, 0, FLAG_NO_CLASS_EXPONENTS, FLAG_OUTSIDE_ZONE]);
        assert_eq!((out.no_class, out.clipped), (1, 0));
    }

    #[test]
    fn percentiles() {
        let v = [5.0, 1.0, f64::NAN, 3.0, 2.0, 4.0];
        assert_eq!(crate::stats::percentile(&v, 0.0), 1.0);
        assert_eq!(crate::stats::percentile(&v, 50.0), 3.0);
        assert_eq!(crate::stats::percentile(&v, 100.0), 5.0);
        assert_close(crate::stats::percentile(&v, 5.0), 1.2, 1e-12);
    }
}
