//! The report's views across wells on the demo field: a cross-section and an
//! FWL chart per compartment and a base map, inline on the field page and as
//! standalone SVG files; and one well audited under another compartment's
//! FWL, flagged in the chart, the section and on the map.
//!
//! The truth is the forward model's: Tarnby-7 was built under the East FWL
//! (2110 m TVDSS), the other wells under the Main FWL (2085 m); locations
//! are the invented grid positions written in the demo headers (X, Y; the
//! feet well's in FT).

use std::path::Path;

use crate::common::{demo_config_edited, root, run_summary};

fn svg(out: &Path, name: &str) -> String {
    std::fs::read_to_string(out.join("report/field").join(name))
        .unwrap_or_else(|e| panic!("{name}: {e}"))
}

/// The `<title>` texts of the groups of `class` in `doc`.
fn titles(doc: &str, class: &str) -> Vec<String> {
    let open = format!("<g class=\"{class}\"><title>");
    doc.match_indices(&open)
        .map(|(i, _)| {
            let rest = &doc[i + open.len()..];
            rest[..rest.find("</title>").expect("title end")].to_string()
        })
        .collect()
}

#[test]
fn the_demo_field_page_shows_both_compartments_across_wells() {
    let dir = tempfile::tempdir().expect("temp dir");
    let out = dir.path().join("out");
    let cfg = demo_config_edited(dir.path(), |t| t);
    run_summary(&cfg, &out);
    let index = std::fs::read_to_string(out.join("report/index.html")).expect("index");
    for (file, compartment, wells) in [("1-east", "East", 1), ("2-main", "Main", 7)] {
        let section = svg(&out, &format!("section-{file}.svg"));
        let chart = svg(&out, &format!("fwl-{file}.svg"));
        // inline on the page byte for byte, and linked
        assert!(
            index.contains(section.trim_end()),
            "{compartment} section inline"
        );
        assert!(
            index.contains(chart.trim_end()),
            "{compartment} chart inline"
        );
        assert!(index.contains(&format!("href=\"field/section-{file}.svg\"")));
        assert!(index.contains(&format!("Compartment {compartment}")));
        assert_eq!(
            titles(&section, "section-well").len(),
            wells,
            "{compartment}"
        );
        // every well's logs imply an FWL that agrees with its compartment's
        assert_eq!(titles(&chart, "implied-fwl").len(), wells, "{compartment}");
        assert!(!chart.contains("implied-fwl flagged"), "{compartment}");
        assert!(chart.contains("no well flagged"));
        assert!(section.contains("class=\"class-band\"") && section.contains("class=\"zone-tie\""));
    }
    // Main's seven wells run along the line through their locations, from
    // Tarnby-8 (600 m E, 5200 m N) in the north-west to Tarnby-4 (3600 m E,
    // 1600 m N: given in feet) in the south-east
    let main = svg(&out, "section-2-main.svg");
    let order: Vec<String> = titles(&main, "section-well");
    assert_eq!(order.first().map(String::as_str), Some("Tarnby-8"));
    assert_eq!(order.last().map(String::as_str), Some("Tarnby-4"));
    assert!(main.contains("ordered along the line of best fit"));
    let map = svg(&out, "map.svg");
    assert_eq!(titles(&map, "map-well").len(), 8);
    assert!(map.contains("<title>Tarnby-7 (compartment East): agrees with the compartment"));
    assert!(index.contains(map.trim_end()));
}

/// The East compartment removed and Tarnby-7's pressures left out (they lie
/// on the East gradients): Tarnby-7 is audited under the Main FWL, 25 m above
/// its own, and must stand out by shape and colour in Main's FWL chart, in
/// the cross-section and on the map; the six others still agree.
#[test]
fn a_well_under_another_fwl_is_flagged_in_the_chart_and_on_the_map() {
    let dir = tempfile::tempdir().expect("temp dir");
    let pressures = std::fs::read_to_string(root().join("demo-wells/pressures.csv")).expect("csv");
    let kept: String = pressures
        .lines()
        .filter(|l| !l.starts_with("Tarnby-7,"))
        .map(|l| format!("{l}\n"))
        .collect();
    let own = dir.path().join("pressures.csv");
    std::fs::write(&own, kept).expect("write pressures");
    let cfg = demo_config_edited(dir.path(), |t| {
        let t = t.replace("[compartments.\"East\"]\nwells = [\"Tarnby-7\"]\n", "");
        let start =
            t.find("[pressures]\nfile = \"").expect("pressures") + "[pressures]\nfile = \"".len();
        let end = start + t[start..].find('"').expect("quote");
        format!("{}{}{}", &t[..start], own.display(), &t[end..])
    });
    let out = dir.path().join("out");
    let summary = run_summary(&cfg, &out);
    let main = summary["contacts"]
        .as_array()
        .expect("view")
        .iter()
        .find(|v| v["name"] == "Main")
        .expect("Main");
    assert_eq!(main["not_lined_up"], serde_json::json!(["Tarnby-7"]));
    let chart = svg(&out, "fwl-1-main.svg");
    let flagged = titles(&chart, "implied-fwl flagged");
    assert_eq!(flagged.len(), 1, "{flagged:?}");
    assert!(
        flagged[0].starts_with("Tarnby-7: logs imply FWL 2"),
        "{flagged:?}"
    );
    assert!(flagged[0].ends_with("possibly under another FWL"));
    assert_eq!(titles(&chart, "implied-fwl").len(), 7);
    assert!(
        chart.contains("Tarnby-7 ◆")
            && chart.contains("1 flagged, possibly under another FWL: Tarnby-7")
    );
    let section = svg(&out, "section-1-main.svg");
    assert_eq!(
        titles(&section, "section-well flagged"),
        ["Tarnby-7: possibly under another FWL"]
    );
    let map = svg(&out, "map.svg");
    assert_eq!(
        titles(&map, "map-well flagged"),
        ["Tarnby-7 (compartment Main): possibly under another FWL"]
    );
    assert_eq!(titles(&map, "map-well").len(), 7);
}
