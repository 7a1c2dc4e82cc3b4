//! The field page's views across wells: per compartment a cross-section and
//! an FWL agreement chart, and one base map of the field. Each is inline on
//! the page and also written as a standalone SVG under `report/field/`.
//!
//! Built from what every well's run kept ([`crate::pipeline::WellView`]: a
//! TVDSS profile and the header location), its contact audit and the
//! saturation-height model's compartments, so the views need no second pass
//! over the logs and a merge of shards draws the same bytes.

use std::fmt::Write as _;
use std::path::Path;

use crate::config::Config;
use crate::input::location::{self, Frame};
use crate::output::{self, OutputError};
use crate::pipeline::WellReport;
use crate::report::plots::{self, CompartmentWells, FieldWell, ImpliedMark};
use crate::report::svg::escape;
use crate::sat_height::SatHeightModel;

/// Folder of the standalone view files under the report folder.
pub const VIEWS_DIR: &str = "field";

/// Most wells' cross-section columns inline on the field page (about 21 kB
/// each on a synthetic field of thin beds); further compartments' sections
/// are linked, so the page stays within a few megabytes.
pub const MAX_INLINE_SECTION_WELLS: usize = 200;

/// Everything the views draw.
pub struct Views<'a> {
    /// Per compartment, its wells in drawing order (empty without a
    /// saturation-height model: no FWL to draw against).
    pub compartments: Vec<CompartmentWells<'a>>,
    /// Every read well's position in one frame, and what the frame is.
    pub frame: Frame,
    /// Wells not on the map: (name, why).
    pub left_out: Vec<(String, String)>,
    /// Without compartments, every read well as one group for the map.
    pub map_only: Option<CompartmentWells<'a>>,
}

/// The views' data from a run's wells and its saturation-height model.
pub fn build<'a>(
    config: &Config,
    sat: Option<&'a SatHeightModel>,
    reports: &'a [WellReport],
) -> Views<'a> {
    let locations: Vec<Option<&location::HeaderLocation>> = reports
        .iter()
        .map(|r| r.well.as_ref().map(|_| &r.view.location))
        .collect();
    let frame = location::common_frame(&locations);
    let name = |i: usize| {
        reports[i]
            .well
            .clone()
            .unwrap_or_else(|| reports[i].file.clone())
    };
    // why a well is off the map, with what its header items got wrong
    let left_out = frame
        .left_out
        .iter()
        .map(|&(i, ref why)| {
            let problems = &reports[i].view.location.problems;
            if problems.is_empty() {
                (name(i), why.clone())
            } else {
                (name(i), format!("{why}; {}", problems.join("; ")))
            }
        })
        .collect();
    let Some(model) = sat else {
        let wells = reports
            .iter()
            .enumerate()
            .filter_map(|(i, r)| {
                Some(FieldWell {
                    name: r.well.as_deref()?,
                    profile: None,
                    steps: Vec::new(),
                    implied: None,
                    flagged: false,
                    position: frame.positions.get(i).copied().flatten(),
                    along: None,
                })
            })
            .collect();
        return Views {
            compartments: Vec::new(),
            frame,
            left_out,
            map_only: Some(CompartmentWells {
                name: "all wells",
                fwl: f64::NAN,
                fwl_sigma: None,
                fwl_source: "",
                wells,
                order: String::new(),
            }),
        };
    };
    let audits: Vec<(String, &crate::contacts::WellAudit)> = reports
        .iter()
        .filter_map(|r| Some((r.well.clone()?, r.contacts.as_ref()?)))
        .collect();
    let view =
        crate::contacts::field_view(model, &audits, &config.contacts, config.project.depth_unit);
    let compartments = model
        .compartments
        .iter()
        .zip(&view)
        .map(|(c, v)| {
            let wells: Vec<FieldWell<'a>> = reports
                .iter()
                .enumerate()
                .filter(|(_, r)| {
                    r.saturation_height
                        .as_ref()
                        .is_some_and(|s| s.compartment == c.name)
                })
                .filter_map(|(i, r)| {
                    let name = r.well.as_deref()?;
                    let audit = r.contacts.as_ref();
                    Some(FieldWell {
                        name,
                        profile: r.view.profile.as_ref(),
                        steps: audit
                            .map(|a| {
                                a.steps
                                    .iter()
                                    .filter(|s| s.tvdss.is_finite())
                                    .map(|s| (s.tvdss, s.kind.name()))
                                    .collect()
                            })
                            .unwrap_or_default(),
                        implied: audit
                            .and_then(|a| a.implied_fwl.as_ref())
                            .map(|f| ImpliedMark {
                                best: f.fwl_tvdss,
                                lower: f.lower,
                                upper: f.upper,
                            }),
                        flagged: v.not_lined_up.iter().any(|n| n == name),
                        position: frame.positions.get(i).copied().flatten(),
                        along: None,
                    })
                })
                .collect();
            let (wells, order) = order_wells(wells);
            CompartmentWells {
                name: &c.name,
                fwl: c.fwl_tvdss,
                fwl_sigma: c.fwl_sigma,
                fwl_source: &c.source,
                wells,
                order,
            }
        })
        .collect();
    Views {
        compartments,
        frame,
        left_out,
        map_only: None,
    }
}

/// The wells in drawing order, and the order in words. With a position for
/// every well (two or more), they are ordered by distance along the line of
/// best fit through their locations (the principal axis of the positions),
/// running from its western end (its southern end when it runs north-south);
/// otherwise in the run's order, which is that of the LAS file names.
pub fn order_wells(mut wells: Vec<FieldWell<'_>>) -> (Vec<FieldWell<'_>>, String) {
    let pos: Vec<(f64, f64)> = wells.iter().filter_map(|w| w.position).collect();
    if wells.len() < 2 || pos.len() < wells.len() {
        let why = if wells.len() < 2 {
            ""
        } else {
            "; locations in every well's header would order them along a line"
        };
        return (
            wells,
            format!("wells in the run's order (LAS file names){why}"),
        );
    }
    let Some((dir, bearing)) = principal_axis(&pos) else {
        return (
            wells,
            "wells in the run's order (LAS file names): their locations coincide".into(),
        );
    };
    let along: Vec<f64> = pos.iter().map(|(x, y)| x * dir.0 + y * dir.1).collect();
    let start = along.iter().copied().fold(f64::INFINITY, f64::min);
    for (w, a) in wells.iter_mut().zip(&along) {
        w.along = Some(a - start);
    }
    // stable: wells at the same distance keep the run's order
    wells.sort_by(|a, b| a.along.unwrap_or(0.0).total_cmp(&b.along.unwrap_or(0.0)));
    (
        wells,
        format!(
            "wells ordered along the line of best fit through their locations (bearing {bearing:.0}°, grid or true north as the map says)"
        ),
    )
}

/// Unit direction (east, north) of the principal axis of `points` and its
/// bearing in degrees clockwise from north, in [0, 180); pointing east, or
/// north when the axis runs north-south. `None` when the points coincide.
/// The axis is the eigenvector of the larger eigenvalue of the 2×2
/// covariance matrix, at angle ½·atan2(2·sxy, sxx − syy) from the east axis
/// (principal component analysis, e.g. Jolliffe 2002, "Principal Component
/// Analysis", Springer; from memory).
pub fn principal_axis(points: &[(f64, f64)]) -> Option<((f64, f64), f64)> {
    let n = points.len() as f64;
    if points.len() < 2 {
        return None;
    }
    let (mx, my) = points
        .iter()
        .fold((0.0, 0.0), |(a, b), (x, y)| (a + x / n, b + y / n));
    let (mut sxx, mut syy, mut sxy) = (0.0, 0.0, 0.0);
    for (x, y) in points {
        let (dx, dy) = (x - mx, y - my);
        sxx += dx * dx;
        syy += dy * dy;
        sxy += dx * dy;
    }
    if sxx + syy <= 1e-12 * (mx * mx + my * my).max(1.0) {
        return None;
    }
    let theta = 0.5 * (2.0 * sxy).atan2(sxx - syy);
    let (mut e, mut nn) = (theta.cos(), theta.sin());
    if e < -1e-9 || (e.abs() <= 1e-9 && nn < 0.0) {
        e = -e;
        nn = -nn;
    }
    let bearing = e.atan2(nn).to_degrees().rem_euclid(180.0);
    Some(((e, nn), bearing))
}

/// The views' part of the field page (and their standalone SVG files);
/// returns the files written, relative to the report folder.
pub fn write_section(
    h: &mut String,
    report_dir: &Path,
    v: &Views<'_>,
    depth_unit: &str,
) -> Result<Vec<String>, OutputError> {
    let dir = report_dir.join(VIEWS_DIR);
    std::fs::create_dir_all(&dir).map_err(|source| OutputError::Io {
        path: dir.clone(),
        source,
    })?;
    let mut written = Vec::new();
    let mut save = |name: String, svg: &str| -> Result<String, OutputError> {
        let path = dir.join(&name);
        output::write_atomic(&path, |w| {
            use std::io::Write as _;
            w.write_all(svg.as_bytes())
                .map_err(|source| OutputError::Io {
                    path: path.clone(),
                    source,
                })
        })?;
        let rel = format!("{VIEWS_DIR}/{name}");
        written.push(rel.clone());
        Ok(rel)
    };
    h.push_str("<h2 id=\"compartments\">Compartments across wells</h2>\n");
    h.push_str("<p class=\"note\">Each compartment's wells side by side on one TVDSS axis: per well its class band (width: the class probability), SW against the saturation-height SW, the zone tops joined from well to well, the audited saturation steps, and the free water level its logs imply with its one-standard-error range, against the compartment's FWL and its standard error. A well whose implied FWL or contacts do not line up with its compartment's is flagged (vermillion diamond, named with ◆): it may be under another FWL. Each view is also a standalone SVG file.</p>\n");
    let map = plots::basemap::base_map(
        &v.compartments_or_all(),
        &v.frame.description,
        v.left_out.len(),
    );
    let map_file = save("map.svg".into(), &map)?;
    let _ = writeln!(
        h,
        "<h3>Base map</h3>\n<p class=\"note\">{} <a href=\"{}\">map.svg</a></p>",
        escape(&v.frame.description),
        escape(&map_file)
    );
    crate::report::plot(h, &map);
    if !v.left_out.is_empty() {
        let list: Vec<String> = v
            .left_out
            .iter()
            .map(|(w, why)| format!("{w} ({why})"))
            .collect();
        let _ = writeln!(
            h,
            "<p class=\"note\">Not on the map: {}.</p>",
            escape(&list.join("; "))
        );
    }
    if v.compartments.is_empty() {
        h.push_str("<p class=\"note\">No saturation-height model in this run (no [capillary] with a free water level): no cross-section or FWL chart.</p>\n");
    }
    let mut inline_wells = 0;
    for (k, c) in v.compartments.iter().enumerate() {
        let stem = format!("{}-{}", k + 1, output::file_stem(c.name));
        let section = plots::section::cross_section(c, depth_unit);
        let chart = plots::fwl_chart::fwl_agreement(c, depth_unit);
        let section_file = save(format!("section-{stem}.svg"), &section)?;
        let chart_file = save(format!("fwl-{stem}.svg"), &chart)?;
        let _ = writeln!(
            h,
            "<h3 id=\"compartment-{}\">Compartment {}</h3>\n<p class=\"note\">{} · <a href=\"{}\">cross-section SVG</a> · <a href=\"{}\">FWL chart SVG</a></p>",
            k + 1,
            escape(c.name),
            escape(&c.order),
            escape(&section_file),
            escape(&chart_file)
        );
        // the page stays light: past MAX_INLINE_SECTION_WELLS columns, a
        // compartment's cross-section is only in its file
        inline_wells += c.wells.len();
        if inline_wells <= MAX_INLINE_SECTION_WELLS {
            crate::report::plot(h, &section);
        } else {
            let _ = writeln!(
                h,
                "<p class=\"note\">The cross-section of these {} wells ({:.1} MB) is in <a href=\"{}\">its file</a> only: this page shows at most {MAX_INLINE_SECTION_WELLS} wells' columns.</p>",
                c.wells.len(),
                section.len() as f64 / 1e6,
                escape(&section_file)
            );
        }
        crate::report::plot(h, &chart);
    }
    Ok(written)
}

impl<'a> Views<'a> {
    /// The compartments, or every read well as one group "all wells" when
    /// the run has no compartments (the map still shows the wells).
    fn compartments_or_all(&self) -> Vec<CompartmentWells<'a>> {
        match &self.map_only {
            Some(all) if self.compartments.is_empty() => vec![all.clone()],
            _ => self.compartments.clone(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::plots::Profile;

    fn well<'a>(
        name: &'a str,
        profile: Option<&'a Profile>,
        pos: Option<(f64, f64)>,
    ) -> FieldWell<'a> {
        FieldWell {
            name,
            profile,
            steps: vec![(2010.0, "rock-quality"), (2030.0, "fluid-contact")],
            implied: Some(ImpliedMark {
                best: Some(2085.0),
                lower: Some(2087.0),
                upper: Some(2083.0),
            }),
            flagged: false,
            position: pos,
            along: None,
        }
    }

    /// A profile whose class changes at every bin (the most rectangles a
    /// class band can need) and whose SW wiggles at every bin.
    fn busy_profile(top: f64) -> Profile {
        let n = crate::well::profile::PROFILE_BINS;
        Profile {
            top,
            step: 0.5,
            class: (0..n).map(|i| 1 + (i % 4) as u8).collect(),
            prob: (0..n)
                .map(|i| 0.3 + 0.7 * ((i * 7) % 10) as f32 / 10.0)
                .collect(),
            sw: (0..n).map(|i| ((i * 13) % 100) as f32 / 100.0).collect(),
            swh: (0..n).map(|i| 1.0 - i as f32 / n as f32).collect(),
            tops: vec![("Upper".into(), top), ("Lower".into(), top + 40.0)],
        }
    }

    fn compartment<'a>(wells: Vec<FieldWell<'a>>) -> CompartmentWells<'a> {
        CompartmentWells {
            name: "North",
            fwl: 2085.0,
            fwl_sigma: Some(1.5),
            fwl_source: "pressures",
            wells,
            order: "wells in the run's order".into(),
        }
    }

    #[test]
    fn principal_axis_gives_the_bearing_of_a_line_of_wells() {
        // geometry, exact: wells on a line at bearing 30° (east = d·sin 30°,
        // north = d·cos 30°), and a north-south line
        let b30 = 30f64.to_radians();
        let pts: Vec<(f64, f64)> = (0..5)
            .map(|k| {
                let d = 1000.0 * f64::from(k);
                (5e5 + d * b30.sin(), 6e6 + d * b30.cos())
            })
            .collect();
        let ((e, n), bearing) = principal_axis(&pts).expect("axis");
        assert!((bearing - 30.0).abs() < 1e-6, "{bearing}");
        assert!((e - b30.sin()).abs() < 1e-9 && (n - b30.cos()).abs() < 1e-9);
        let ns = [(0.0, 0.0), (0.0, 500.0), (0.0, 1200.0)];
        let ((e, n), bearing) = principal_axis(&ns).expect("axis");
        assert!(bearing.abs() < 1e-6 && e.abs() < 1e-9 && (n - 1.0).abs() < 1e-9);
        assert!(principal_axis(&[(1.0, 1.0), (1.0, 1.0)]).is_none());
    }

    #[test]
    fn wells_are_ordered_along_the_line_only_when_every_well_has_a_location() {
        // west to east along a line at bearing 120°: given east-most first
        let b = 120f64.to_radians();
        let at = |d: f64| Some((d * b.sin(), d * b.cos()));
        let wells = vec![
            well("C", None, at(2000.0)),
            well("A", None, at(0.0)),
            well("B", None, at(900.0)),
        ];
        let (w, order) = order_wells(wells);
        let names: Vec<&str> = w.iter().map(|w| w.name).collect();
        assert_eq!(names, ["A", "B", "C"], "{order}");
        assert!(order.contains("bearing 120°"), "{order}");
        let along: Vec<f64> = w.iter().map(|w| w.along.expect("along")).collect();
        for (got, want) in along.iter().zip([0.0, 900.0, 2000.0]) {
            assert!((got - want).abs() < 1e-6, "{along:?}");
        }
        // one well without a location: the run's order, said so
        let wells = vec![well("C", None, at(2000.0)), well("A", None, None)];
        let (w, order) = order_wells(wells);
        assert_eq!(w[0].name, "C");
        assert!(w.iter().all(|w| w.along.is_none()));
        assert!(order.contains("run's order"), "{order}");
    }

    #[test]
    fn a_flagged_well_stands_out_in_the_chart_the_section_and_the_map() {
        let p = busy_profile(2000.0);
        let mut wells: Vec<FieldWell<'_>> = ["W-1", "W-2", "W-3"]
            .iter()
            .enumerate()
            .map(|(i, n)| well(n, Some(&p), Some((1000.0 * i as f64, 0.0))))
            .collect();
        wells[1].flagged = true;
        wells[1].implied = Some(ImpliedMark {
            best: Some(2110.0),
            lower: Some(2112.0),
            upper: Some(2108.0),
        });
        let c = compartment(wells);
        let chart = plots::fwl_chart::fwl_agreement(&c, "m");
        assert_eq!(chart.matches("<g class=\"implied-fwl\">").count(), 2);
        assert_eq!(
            chart.matches("<g class=\"implied-fwl flagged\">").count(),
            1
        );
        assert!(chart.contains("<title>W-2: logs imply FWL 2110 (range 2108-2112) m TVDSS; possibly under another FWL</title>"));
        // the second cue besides colour: a diamond (polygon) for the flagged
        // well, circles for the others, and its name marked
        let flagged = &chart[chart.find("implied-fwl flagged").expect("group")..];
        let flagged = &flagged[..flagged.find("</g>").expect("end")];
        assert!(flagged.contains("<polygon") && !flagged.contains("<circle"));
        assert!(
            chart.contains("W-2 ◆") && chart.contains("1 flagged, possibly under another FWL: W-2")
        );
        let section = plots::section::cross_section(&c, "m");
        assert_eq!(section.matches("class=\"section-well flagged\"").count(), 1);
        assert_eq!(section.matches("class=\"section-well\"").count(), 2);
        assert_eq!(section.matches("class=\"step-mark\"").count(), 6);
        assert_eq!(section.matches("class=\"zone-tie\"").count(), 2);
        let map = plots::basemap::base_map(std::slice::from_ref(&c), "test frame", 0);
        assert_eq!(map.matches("class=\"map-well flagged\"").count(), 1);
        assert_eq!(map.matches("class=\"map-well\"").count(), 2);
        assert!(map.contains("<title>W-2 (compartment North): possibly under another FWL</title>"));
    }

    #[test]
    fn without_coordinates_the_map_says_so() {
        let c = compartment(vec![well("W-1", None, None)]);
        let map = plots::basemap::base_map(std::slice::from_ref(&c), "no coordinates", 1);
        assert!(map.contains("class=\"no-map\""));
        assert!(map.contains("No map: no LAS header gives a well location"));
        assert!(!map.contains("map-well"));
    }

    /// The size the report states (README): a compartment of 100 wells,
    /// each at the worst case of a class change and an SW wiggle at every
    /// bin, draws its cross-section within 2 MB and its chart within
    /// 80 kB, every well named, in four panels.
    #[test]
    fn a_hundred_wells_stay_within_the_stated_size() {
        let profiles: Vec<Profile> = (0..100)
            .map(|i| busy_profile(1990.0 + f64::from(i % 7)))
            .collect();
        let names: Vec<String> = (1..=100).map(|i| format!("Well-{i:03}")).collect();
        let mut wells: Vec<FieldWell<'_>> = names
            .iter()
            .zip(&profiles)
            .map(|(n, p)| well(n, Some(p), None))
            .collect();
        wells[57].flagged = true;
        let c = compartment(wells);
        let section = plots::section::cross_section(&c, "m");
        assert!(section.len() < 2_000_000, "{} bytes", section.len());
        assert_eq!(section.matches("<g class=\"panel\">").count(), 4);
        for n in &names {
            assert!(section.contains(&format!(">{n}")), "{n} not named");
        }
        let chart = plots::fwl_chart::fwl_agreement(&c, "m");
        assert!(chart.len() < 80_000, "{} bytes", chart.len());
        // every well has its mark; the flagged one is named even when
        // only one well in N is
        assert_eq!(chart.matches("class=\"implied-fwl").count(), 100);
        assert!(chart.contains("Well-058 ◆"));
    }

    #[test]
    fn past_the_inline_limit_a_section_is_linked_not_inlined() {
        let p = busy_profile(2000.0);
        let names: Vec<String> = (0..300).map(|i| format!("W-{i}")).collect();
        let group = |r: std::ops::Range<usize>| {
            let mut c = compartment(names[r].iter().map(|n| well(n, Some(&p), None)).collect());
            c.order = "run order".into();
            c
        };
        let v = Views {
            compartments: vec![group(0..150), group(150..300)],
            frame: Frame {
                positions: vec![None; 300],
                description: "no coordinates".into(),
                left_out: Vec::new(),
            },
            left_out: Vec::new(),
            map_only: None,
        };
        let dir = tempfile::tempdir().expect("temp dir");
        let mut h = String::new();
        let files = write_section(&mut h, dir.path(), &v, "m").expect("written");
        assert_eq!(files.len(), 1 + 2 * 2, "{files:?}");
        assert_eq!(h.matches("class=\"cross-section\"").count(), 1);
        assert_eq!(h.matches("class=\"fwl-agreement\"").count(), 2);
        assert!(h.contains("The cross-section of these 150 wells"));
        let linked =
            std::fs::read_to_string(dir.path().join("field/section-2-north.svg")).expect("file");
        assert_eq!(linked.matches("class=\"section-well\"").count(), 150);
    }
}
