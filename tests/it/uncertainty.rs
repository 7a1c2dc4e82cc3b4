//! The Monte Carlo on the demo field: the low/best/high columns of the zone
//! summary, the ranking of what drives HPT, and the switch that turns it off.
//! (Its samplers are checked against first-order propagation and brute-force
//! integration in `uncertainty::tests`; its independence from the thread
//! count and from shards by the `field_run` tests, whose demo config has
//! distributions.)

use crate::common::{col, demo_config_edited, num, read_table, run_summary};

#[test]
fn demo_zone_summary_has_ordered_low_best_high_and_ranked_drivers() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    let cfg = demo_config_edited(dir.path(), |t| t);
    let summary = run_summary(&cfg, &out);
    let u = &summary["uncertainty"];
    assert_eq!(u["realisations"], 200);
    // 13 parameters, and each compartment's FWL with the pressure fit's
    // standard error
    let vars = u["variables"].as_array().expect("variables");
    assert_eq!(vars.len(), 15);
    for c in ["East", "Main"] {
        let name = format!("compartments.{c}.fwl-tvdss");
        let fwl = vars.iter().find(|v| v[0] == name.as_str()).expect("FWL");
        assert!(fwl[1]["normal"]["sd"].as_f64().expect("sd") > 0.0, "{fwl}");
    }
    let (h, rows) = read_table(&out.join("field/zone-summary.csv"));
    let (pay, hpt) = (col(&h, "NET_PAY"), col(&h, "HPT"));
    let q = |name: &str| col(&h, name);
    let mut pay_zones = 0;
    for r in &rows {
        if num(&r[pay]) <= 0.0 {
            continue;
        }
        pay_zones += 1;
        for what in ["NET_PAY", "HPT", "PHIE_AVG_VV", "SW_AVG_VV", "HPT_SWH"] {
            let (p90, p50, p10) = (
                num(&r[q(&format!("{what}_P90"))]),
                num(&r[q(&format!("{what}_P50"))]),
                num(&r[q(&format!("{what}_P10"))]),
            );
            assert!(p90 <= p50 && p50 <= p10, "{what} {r:?}");
        }
        // the deterministic HPT (every key at its best value) lies within
        // the range, give or take the skew of the nonlinear chain
        let (lo, hi, det) = (num(&r[q("HPT_P90")]), num(&r[q("HPT_P10")]), num(&r[hpt]));
        assert!(det >= 0.95 * lo && det <= 1.05 * hi, "{r:?}");
        assert!(hi > lo, "HPT has a spread: {r:?}");
    }
    assert!(pay_zones >= 8, "{pay_zones} zones with pay");
    // the signs Archie's equation and the shale volume give: more Rw or a
    // larger n makes more water (∂SW/∂Rw > 0, ∂SW/∂n = −SW·ln SW/n > 0 for
    // SW < 1), less HPT; a higher clean-sand GR makes less shale, more porosity
    let (dh, drows) = read_table(&out.join("field/hpt-drivers.csv"));
    let (z, p, rho, rank) = (
        col(&dh, "ZONE"),
        col(&dh, "PARAMETER"),
        col(&dh, "RANK_CORRELATION"),
        col(&dh, "RANK"),
    );
    let upper: Vec<&Vec<String>> = drows.iter().filter(|r| r[z] == "Upper Kell").collect();
    assert_eq!(upper.len(), 13);
    assert_eq!(upper[0][rank], "1");
    let of = |name: &str| {
        upper
            .iter()
            .find(|r| r[p] == name)
            .map(|r| num(&r[rho]))
            .expect(name)
    };
    assert!(of("parameters.field.rw-ohmm") < -0.2);
    assert!(of("parameters.field.gr-clean-gapi") > 0.2);
    assert!(of("parameters.class.\"1\".archie-n") < 0.0);
    let strongest: Vec<f64> = upper.iter().map(|r| num(&r[rho]).abs()).collect();
    assert!(
        strongest.windows(2).all(|w| w[0] >= w[1]),
        "ranked: {strongest:?}"
    );
}

#[test]
fn no_realisations_means_no_monte_carlo() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    let cfg = demo_config_edited(dir.path(), |t| {
        t.replace("realisations = 200", "realisations = 0")
    });
    let summary = run_summary(&cfg, &out);
    assert!(summary.get("uncertainty").is_none());
    let (h, _) = read_table(&out.join("field/zone-summary.csv"));
    assert!(!h.iter().any(|c| c.ends_with("_P90")), "{h:?}");
    assert!(!out.join("field/hpt-drivers.csv").exists());
}

/// One key adds SW's and PERM's P90, P50 and P10 at every depth to the well
/// files, beside SW and PERM: ordered, and given wherever SW is (also where a
/// realisation's porosity makes SW defined when the deterministic one does
/// not).
#[test]
fn depth_percentiles_are_written_beside_sw_on_request() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    let cfg = demo_config_edited(dir.path(), |t| {
        t.replace(
            "realisations = 200",
            "realisations = 50\ndepth-percentiles = true",
        )
    });
    run_summary(&cfg, &out);
    let (h, rows) = read_table(&out.join("wells/tarnby-2.csv"));
    let sw = col(&h, "SW");
    assert_eq!(&h[sw + 1..sw + 4], ["SW_P90", "SW_P50", "SW_P10"]);
    let mut spread = 0;
    for r in &rows {
        let (det, p90, p50, p10) = (
            num(&r[sw]),
            num(&r[sw + 1]),
            num(&r[sw + 2]),
            num(&r[sw + 3]),
        );
        assert!(det.is_nan() || p50.is_finite(), "{r:?}");
        if p50.is_nan() {
            continue;
        }
        assert!(
            p90 <= p50 && p50 <= p10 && (0.0..=1.0).contains(&p10),
            "{r:?}"
        );
        if p10 - p90 > 0.01 {
            spread += 1;
        }
    }
    assert!(spread > 100, "{spread} depths with a spread");
    // PERM too, beside PERM: each realisation's drawn class at its PHIE
    let perm = col(&h, "PERM");
    assert_eq!(&h[perm + 1..perm + 4], ["PERM_P90", "PERM_P50", "PERM_P10"]);
    let (mut classed, mut wide) = (0, 0);
    for r in &rows {
        let (p90, p50, p10) = (num(&r[perm + 1]), num(&r[perm + 2]), num(&r[perm + 3]));
        if num(&r[perm]).is_nan() || p50.is_nan() {
            continue;
        }
        classed += 1;
        assert!(p90 > 0.0 && p90 <= p50 && p50 <= p10, "{r:?}");
        if p10 > 1.5 * p90 {
            wide += 1;
        }
    }
    assert!(classed > 300, "{classed} classed depths");
    assert!(wide > 0, "the class draws give some depth a PERM range");
    // and SWH's beside SWH, from the sampled FWL and the drawn classes
    let swh = col(&h, "SWH");
    assert_eq!(&h[swh + 1..swh + 4], ["SWH_P90", "SWH_P50", "SWH_P10"]);
    let mut defined = 0;
    for r in &rows {
        let (p90, p50, p10) = (num(&r[swh + 1]), num(&r[swh + 2]), num(&r[swh + 3]));
        if p50.is_nan() {
            continue;
        }
        defined += 1;
        assert!(p90 <= p50 && p50 <= p10 && p10 <= 1.0, "{r:?}");
    }
    assert!(defined > 300, "{defined} depths with SWH percentiles");
}

/// Drawing each depth's class from its posterior (the default) changes the
/// ranges the parameters alone give; `classes = "fixed"` holds the class
/// and gives the parameters-only ranges.
#[test]
fn drawn_classes_change_the_ranges_and_fixed_holds_them() {
    let ranges = |classes: &str| {
        let dir = tempfile::tempdir().expect("temp dir");
        let out = dir.path().join("out");
        let cfg = demo_config_edited(dir.path(), |t| {
            t.replace(
                "realisations = 200",
                &format!("realisations = 60\nclasses = \"{classes}\""),
            )
        });
        run_summary(&cfg, &out);
        let (h, rows) = read_table(&out.join("field/zone-summary.csv"));
        let (lo, hi) = (col(&h, "HPT_P90"), col(&h, "HPT_P10"));
        rows.iter()
            .map(|r| (num(&r[lo]), num(&r[hi])))
            .collect::<Vec<_>>()
    };
    let (drawn, fixed) = (ranges("posterior"), ranges("fixed"));
    assert_eq!(drawn.len(), fixed.len());
    let changed = drawn
        .iter()
        .zip(&fixed)
        .filter(|(a, b)| (a.0 - b.0).abs() > 1e-4 || (a.1 - b.1).abs() > 1e-4)
        .count();
    assert!(changed > 0, "class draws changed no range");
}

/// With the class held, PERM's range at a depth is the core's scatter about
/// its class's relation: log10 k normal with the class's RMS s, so
/// log10(P10 / P90) = s · (z0.9 − z0.1) = 2.5631 s (standard normal table:
/// z0.9 = 1.28155). Averaged over the classed depths of a well (each depth
/// its own draws), within 3 %; P50 at the relation itself, within s / 5.
#[test]
fn perm_range_with_fixed_classes_is_the_cores_scatter() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    let cfg = demo_config_edited(dir.path(), |t| {
        t.replace(
            "realisations = 200",
            "realisations = 200\ndepth-percentiles = true\nclasses = \"fixed\"",
        )
    });
    run_summary(&cfg, &out);
    let model: serde_json::Value = serde_json::from_slice(
        &std::fs::read(out.join("saturation/saturation-model.json")).expect("model"),
    )
    .expect("json");
    assert_eq!(model["perm_method"], "fzi");
    let scatter = |class: f64| {
        model["perm_by_class"]
            .as_array()
            .expect("classes")
            .iter()
            .find(|c| c["class"].as_f64() == Some(class))
            .and_then(|c| c["fzi_rms_log10"].as_f64())
            .expect("scatter")
    };
    let (h, rows) = read_table(&out.join("wells/tarnby-2.csv"));
    let (class, perm) = (col(&h, "CLASS"), col(&h, "PERM"));
    assert_eq!(&h[perm + 1..perm + 4], ["PERM_P90", "PERM_P50", "PERM_P10"]);
    let (mut ratio, mut mid, mut n) = (0.0, 0.0, 0.0);
    for r in &rows {
        let (c, k, p90, p50, p10) = (
            num(&r[class]),
            num(&r[perm]),
            num(&r[perm + 1]),
            num(&r[perm + 2]),
            num(&r[perm + 3]),
        );
        if !(c >= 1.0 && k > 0.0 && p90 > 0.0) {
            continue;
        }
        let s = scatter(c);
        ratio += (p10 / p90).log10() / s;
        mid += (p50 / k).log10().abs() / s;
        n += 1.0;
    }
    assert!(n > 300.0, "{n} classed depths");
    let (ratio, mid) = (ratio / n, mid / n);
    assert!((ratio - 2.5631).abs() < 0.03 * 2.5631, "{ratio}");
    assert!(mid < 0.2, "{mid}");
}

/// With a 2 m standard deviation on Main's free water level, the FWL leads
/// the ranking of what drives HPT from SWH in both reservoir zones, with
/// the physical sign: a deeper FWL (larger TVDSS) puts every depth higher
/// above it, so SWH falls and HPT rises (Leverett J grows with height). The
/// report draws a second tornado for it.
#[test]
fn the_free_water_level_drives_hpt_from_swh() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    let cfg = demo_config_edited(dir.path(), |t| {
        t.replace(
            "[compartments.\"Main\"]",
            "[compartments.\"Main\"]\nfwl-sd = 2.0",
        )
    });
    let summary = run_summary(&cfg, &out);
    let (h, rows) = read_table(&out.join("field/hpt-swh-drivers.csv"));
    let (z, p, rho, rank) = (
        col(&h, "ZONE"),
        col(&h, "PARAMETER"),
        col(&h, "RANK_CORRELATION"),
        col(&h, "RANK"),
    );
    for zone in ["Upper Kell", "Lower Kell"] {
        let first = rows
            .iter()
            .find(|r| r[z] == zone && r[rank] == "1")
            .expect("ranked");
        assert_eq!(first[p], "compartments.Main.fwl-tvdss", "{zone}");
        assert!(num(&first[rho]) > 0.9, "{first:?}");
    }
    // HPT from the logs' SW is not driven by the FWL: it is not ranked there
    let (dh, drows) = read_table(&out.join("field/hpt-drivers.csv"));
    let dp = col(&dh, "PARAMETER");
    assert!(drows.iter().all(|r| !r[dp].contains("fwl")));
    let outputs = summary["uncertainty"]["outputs"].to_string();
    assert!(outputs.contains("field/hpt-swh-drivers.csv"), "{outputs}");
    let page = std::fs::read_to_string(out.join("report/index.html")).expect("page");
    assert!(page.contains("pore thickness from the saturation-height model</text>"));
}
