//! Class-aware saturation and the saturation-height model on the demo field,
//! and the errors a failed fit must give.
//!
//! The demo field (invented; demo-wells/README.md) was built with Archie
//! exponents 2.1/2.0/1.9/1.8 for classes 1-4, Brooks-Corey J-functions per
//! class, and free water levels at 2085 m TVDSS (Main) and 2110 m (East,
//! Tarnby-7), oil 0.78 and water 1.07 g/cm3. These tests measure how well the
//! run recovers that known answer; the formulas themselves are checked against
//! published values in src/capillary.rs, src/pressure.rs and src/sat_height.rs.
//!
//! Tolerances:
//! - FWL within 1.0 m of the model's (the gauge scatter of σ 0.05 psi over
//!   legs of 20-70 m gives a standard error near 0.1-0.2 m; 1 m is the depth
//!   a modeller would notice) and within 3 standard errors.
//! - Class-aware SW must be closer to the truth than SW_FIXED field-wide (RMS
//!   over classed reservoir depths), and no well may get worse by more than
//!   0.002 (noise: the class is predicted, and a wrong class moves m and n by
//!   0.1).
//! - SWH against the model's SW above the FWL: RMS ≤ 0.08. SWH carries the
//!   errors of PHIE, PERM (RMS log10 0.25 against the truth) and of the class
//!   prediction, on top of the J fit's own RMS of about 0.02-0.03.

use crate::common::{
    col, demo_config_edited, num, read_table, root, run_config, run_demo_field, run_summary,
};

fn rms(d: &[f64]) -> f64 {
    (d.iter().map(|x| x * x).sum::<f64>() / d.len() as f64).sqrt()
}

#[test]
fn demo_class_aware_saturation_and_saturation_height() {
    let out = tempfile::tempdir().expect("temp dir");
    let summary = run_demo_field(out.path());
    let sh = &summary["saturation_height"];

    // free water levels from the pressure points (model: 2085 and 2110 m)
    for (name, fwl) in [("Main", 2085.0), ("East", 2110.0)] {
        let c = sh["compartments"]
            .as_array()
            .expect("compartments")
            .iter()
            .find(|c| c["name"] == name)
            .unwrap_or_else(|| panic!("compartment {name}"));
        let got = c["fwl_tvdss"].as_f64().expect("fwl");
        let sigma = c["fwl_sigma"].as_f64().expect("sigma");
        eprintln!(
            "{name}: FWL {got:.2} ± {sigma:.2} m (model {fwl}), water {:.3}, oil {:.3} g/cm3",
            c["rho_water_gcc"], c["rho_hc_gcc"]
        );
        assert_eq!(c["source"], "pressures");
        assert!((got - fwl).abs() <= 1.0, "{name}: {got}");
        assert!(
            (got - fwl).abs() <= 3.0 * sigma.max(0.05),
            "{name}: {got} ± {sigma}"
        );
    }
    let left_out = sh["pressure_points_left_out"].as_array().expect("list");
    assert_eq!(left_out.len(), 2, "{left_out:?}");
    assert!(left_out.iter().all(|r| {
        r["reason"]
            .as_str()
            .is_some_and(|s| s.contains("QUALITY poor"))
    }));

    // every class has plugs, so none borrows
    let classes = sh["classes"].as_array().expect("classes");
    assert_eq!(classes.len(), 4);
    assert!(classes.iter().all(|c| c["borrowed_from"].is_null()));

    // class-aware SW against SW_FIXED, and SWH, against the forward model
    let (mut d_class, mut d_fixed, mut d_swh) = (Vec::new(), Vec::new(), Vec::new());
    for i in 1..=8 {
        let (h, rows) = read_table(&out.path().join(format!("wells/tarnby-{i}.csv")));
        let (th, truth) = read_table(&root().join(format!("demo-wells/truth/tarnby-{i}.csv")));
        let (sw, fixed, swh, class, flag) = (
            col(&h, "SW"),
            col(&h, "SW_FIXED"),
            col(&h, "SWH"),
            col(&h, "CLASS"),
            col(&h, "FLAG"),
        );
        let (tsw, tclass, thaf) = (col(&th, "SW"), col(&th, "CLASS"), col(&th, "HAFWL_M"));
        let (mut wc, mut wf) = (Vec::new(), Vec::new());
        for (o, t) in rows.iter().zip(&truth) {
            let f = num(&o[flag]) as u32;
            if num(&t[tclass]) < 1.0 || f & 3 != 0 || num(&o[class]).is_nan() {
                continue;
            }
            let truth_sw = num(&t[tsw]);
            if num(&o[sw]).is_finite() && num(&o[fixed]).is_finite() {
                wc.push(num(&o[sw]) - truth_sw);
                wf.push(num(&o[fixed]) - truth_sw);
            }
            if num(&t[thaf]) > 0.0 && num(&o[swh]).is_finite() {
                d_swh.push(num(&o[swh]) - truth_sw);
            }
        }
        eprintln!(
            "tarnby-{i}: SW rms {:.4} (class-aware) vs {:.4} (fixed), {} depths",
            rms(&wc),
            rms(&wf),
            wc.len()
        );
        assert!(rms(&wc) <= rms(&wf) + 0.002, "tarnby-{i}");
        d_class.extend(wc);
        d_fixed.extend(wf);
    }
    eprintln!(
        "field: SW rms {:.4} class-aware vs {:.4} fixed; SWH rms {:.4} over {} depths above the FWL",
        rms(&d_class),
        rms(&d_fixed),
        rms(&d_swh),
        d_swh.len()
    );
    assert!(rms(&d_class) < rms(&d_fixed));
    assert!(d_swh.len() > 1000 && rms(&d_swh) <= 0.08);

    // no well looks like it sits under another FWL
    for w in summary["wells"].as_array().expect("wells") {
        assert!(
            w["saturation_height"]["possible_other_fwl"].is_null(),
            "{}",
            w["saturation_height"]
        );
    }

    // the export for the reservoir model: one row per class, with units
    let (h, rows) = read_table(&out.path().join("saturation/saturation-model.csv"));
    assert_eq!(rows.len(), 4);
    for c in [
        "CLASS", "J_FORM", "J_ENTRY", "ARCHIE_M", "ARCHIE_N", "FZI_UM",
    ] {
        col(&h, c);
    }
    let m: Vec<f64> = rows.iter().map(|r| num(&r[col(&h, "ARCHIE_M")])).collect();
    assert_eq!(m, [2.1, 2.0, 1.9, 1.8]);
    let json: serde_json::Value = serde_json::from_slice(
        &std::fs::read(out.path().join("saturation/saturation-model.json")).expect("json"),
    )
    .expect("parses");
    assert!(json["units"]["perm"] == "mD" && json["depth_unit"] == "m");
    assert!(
        json["caution"]
            .as_str()
            .is_some_and(|s| s.contains("qualified petrophysicist"))
    );
    let (_, res) = read_table(&out.path().join("saturation/residuals.csv"));
    assert!(res.len() >= 8, "a row per well at least");
}

/// Tarnby-7 given the Main FWL (25 m too shallow for it): its heights are too
/// small, SWH too high, and its mean SW − SWH departs from the field's.
#[test]
fn a_well_under_the_wrong_fwl_is_reported() {
    let dir = tempfile::tempdir().expect("temp dir");
    let cfg = demo_config_edited(dir.path(), |t| {
        t.replace(
            "wells = [\"Tarnby-7\"]",
            "wells = [\"Tarnby-7\"]\nfwl-tvdss = 2085.0",
        )
    });
    let summary = run_summary(&cfg, &dir.path().join("out"));
    let marked: Vec<&str> = summary["wells"]
        .as_array()
        .expect("wells")
        .iter()
        .filter(|w| !w["saturation_height"]["possible_other_fwl"].is_null())
        .filter_map(|w| w["well"].as_str())
        .collect();
    assert_eq!(marked, ["Tarnby-7"]);
    let east = &summary["saturation_height"]["compartments"][0];
    assert_eq!(east["name"], "East");
    assert_eq!(east["source"], "config");
}

fn run_expect_error(edit: impl Fn(String) -> String, files: &[(&str, &str)], needles: &[&str]) {
    let dir = tempfile::tempdir().expect("temp dir");
    for (name, text) in files {
        std::fs::write(dir.path().join(name), text).expect("write");
    }
    let cfg = demo_config_edited(dir.path(), |t| {
        edit(t).replace("@DIR@", &dir.path().display().to_string())
    });
    let run = run_config(&cfg, &dir.path().join("out"), &[]);
    let err = String::from_utf8_lossy(&run.stderr);
    assert_eq!(run.status.code(), Some(2), "{err}");
    for n in needles {
        assert!(err.contains(n), "`{n}` not in: {err}");
    }
}

/// A compartment whose points show one fluid: parallel legs, an error naming it.
#[test]
fn parallel_pressure_legs_name_the_compartment() {
    let mut csv = String::from("WELL,TVDSS_M,PRESSURE_PSI,QUALITY\n");
    for i in 0..8 {
        let d = 2060.0 + 8.0 * f64::from(i);
        let p = 3100.0 + 1.07 * 1.42224 * (d - 2110.0) + if i % 2 == 0 { 0.04 } else { -0.04 };
        csv.push_str(&format!("Tarnby-7,{d},{p:.2},good\n"));
    }
    for (d, p) in [
        (2040.0, 3015.0),
        (2050.0, 3026.0),
        (2100.0, 3082.0),
        (2110.0, 3097.0),
    ] {
        csv.push_str(&format!("Tarnby-1,{d},{p},good\n"));
    }
    run_expect_error(
        |t| {
            t.replace(
                &format!("{}/pressures.csv", root().join("demo-wells").display()),
                "@DIR@/p.csv",
            )
        },
        &[("p.csv", &csv)],
        &["compartment `East`", "parallel"],
    );
}

/// A class whose only plug never leaves the entry plateau cannot be fitted:
/// the error names the class and the plug.
#[test]
fn a_failed_j_fit_names_the_class_and_plug() {
    let mut csv =
        String::from("SAMPLE,WELL,DEPTH_MD,POROSITY_FRAC,PERM_MD,PC_PSI,SW_FRAC,SYSTEM\n");
    // FZI of 5 µm at φ 0.24 (class 4): k = 1014.24·25·0.24³/0.76² = 606 mD
    for (pc, sw) in [(2.0, 1.0), (4.0, 1.0), (8.0, 1.0), (16.0, 1.0)] {
        csv.push_str(&format!(
            "FLAT-1,Tarnby-2,2050.0,0.24,606,{pc},{sw},mercury-air\n"
        ));
    }
    run_expect_error(
        |t| {
            t.replace(
                &format!("{}/capillary.csv", root().join("demo-wells").display()),
                "@DIR@/c.csv",
            )
            .replace("\"CAP-04\" = 2", "")
        },
        &[("c.csv", &csv)],
        &["capillary class 4", "FLAT-1", "J-function"],
    );
}

/// Without pressures a compartment needs its FWL in the config: refused at load
/// with the key.
#[test]
fn a_compartment_without_a_free_water_level_is_refused() {
    run_expect_error(
        |t| {
            let i = t.find("[pressures]").expect("pressures");
            let j = t[i..].find("[compartments").expect("compartments") + i;
            format!("{}{}", &t[..i], &t[j..])
        },
        &[],
        &[
            "compartments.\"East\".fwl-tvdss",
            "set fwl-tvdss or give [pressures]",
        ],
    );
}

/// The demo's pressure points given by MD only (the TVDSS_M column removed)
/// are converted through each well's own elevation and path: the FWLs agree
/// with the TVDSS run within 0.02 m (both columns are written to 0.01 m).
#[test]
fn pressure_points_by_md_give_the_same_fwl() {
    let dir = tempfile::tempdir().expect("temp dir");
    let text = std::fs::read_to_string(root().join("demo-wells/pressures.csv")).expect("csv");
    let head: Vec<&str> = text.lines().next().expect("header").split(',').collect();
    let drop = head.iter().position(|h| *h == "TVDSS_M").expect("TVDSS_M");
    let md_only: String = text
        .lines()
        .map(|l| {
            let mut f: Vec<&str> = l.split(',').collect();
            f.remove(drop);
            f.join(",") + "\n"
        })
        .collect();
    std::fs::write(dir.path().join("p.csv"), md_only).expect("write");
    let cfg = demo_config_edited(dir.path(), |t| {
        t.replace(
            &format!("{}/pressures.csv", root().join("demo-wells").display()),
            &format!("{}/p.csv", dir.path().display()),
        )
    });
    let md = run_summary(&cfg, &dir.path().join("out"));
    let reference = run_demo_field(&dir.path().join("ref"));
    for k in 0..2 {
        let a = &md["saturation_height"]["compartments"][k];
        let b = &reference["saturation_height"]["compartments"][k];
        assert_eq!(a["points_used"], b["points_used"]);
        let (fa, fb) = (
            a["fwl_tvdss"].as_f64().expect("fwl"),
            b["fwl_tvdss"].as_f64().expect("fwl"),
        );
        assert!((fa - fb).abs() <= 0.02, "{}: {fa} vs {fb}", a["name"]);
    }
}
