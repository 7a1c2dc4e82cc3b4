//! The HTML report: `report/index.html` (the field page) and
//! `report/wells/<stem>.html` (a page per well).
//!
//! A well's page is written while the well is in memory (its log plot,
//! Pickett plot, zone summary, contact steps and warnings), so the report
//! adds no second pass over the logs; the field page is written after every
//! well (wells table, crossplots, contacts, zone summary, the run's key
//! facts). Pages are self-contained: plots are inline SVG, styles inline, no
//! scripts, fonts or anything else from the network. Every page carries the
//! interpretation caution.

pub mod assemble;
pub mod field_views;
pub mod plots;
pub mod png;
pub mod svg;

use std::fmt::Write as _;
use std::path::Path;

use crate::input::curves::LogicalCurve as L;
use crate::output::schema::Col;
use crate::output::{self, OutputError, Table};
use crate::report::plots::{ArchieLine, Boundaries, CorePoint, JClass, PickettPoint, WellCurves};
use crate::report::svg::escape;

/// Folder of the report under the output folder.
pub const REPORT_DIR: &str = "report";

/// The caution every page carries.
pub const CAUTION: &str = "Interpretations inform reserves and well decisions. These results come from an automated batch and must be reviewed by a qualified petrophysicist, and used under local regulation and licensed practice.";

/// Most rows of a table on the field page; the CSV files hold them all.
pub const MAX_TABLE_ROWS: usize = 500;

/// Points per well in the field Pickett plot (the plot thins them further).
pub const FIELD_PICKETT_PER_WELL: usize = 100;

/// Most points per well on the Pickett plot.
const PICKETT_POINTS_PER_WELL: usize = 1500;

const STYLE: &str = "body{font-family:sans-serif;margin:1.5em;color:#222;max-width:1400px}\
h1{font-size:1.5em}h2{font-size:1.2em;margin-top:1.6em}\
.caution{border:2px solid #D55E00;background:#fff4ec;padding:.6em 1em;margin:1em 0}\
table{border-collapse:collapse;font-size:.85em;margin:.5em 0}\
th,td{border:1px solid #ccc;padding:.2em .5em;text-align:left}\
th{background:#f2f2f2}td.num{text-align:right}\
.failed{color:#D55E00;font-weight:bold}.plots{display:flex;flex-wrap:wrap;gap:1em}\
.plot{border:1px solid #ddd}.note{color:#555;font-size:.9em}";

/// Open an HTML page: doctype, title, inline style, the caution.
fn page_start(title: &str, h1: &str) -> String {
    let mut h = String::with_capacity(64 << 10);
    let _ = write!(
        h,
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>{}</title><style>{STYLE}</style></head><body>\n<h1>{}</h1>\n<p class=\"caution\" id=\"caution\"><strong>Caution.</strong> {}</p>\n",
        escape(title),
        escape(h1),
        escape(CAUTION)
    );
    h
}

fn page_end(h: &mut String) {
    let _ = write!(
        h,
        "<p class=\"note\">Made by flowzone {}.</p>\n</body></html>\n",
        env!("CARGO_PKG_VERSION")
    );
}

/// A table cell.
enum Cell {
    Text(String),
    Num(String),
    /// Already-escaped HTML (links).
    Html(String),
}

/// A table: header cells (none: no header row) and rows of cells, text escaped.
fn table(h: &mut String, class: &str, head: &[&str], rows: &[Vec<Cell>]) {
    let _ = write!(h, "<table class=\"{}\">", escape(class));
    if !head.is_empty() {
        h.push_str("<thead><tr>");
        for c in head {
            let _ = write!(h, "<th>{}</th>", escape(c));
        }
        h.push_str("</tr></thead>");
    }
    h.push_str("<tbody>");
    for r in rows {
        h.push_str("<tr>");
        for cell in r {
            let _ = match cell {
                Cell::Text(t) => write!(h, "<td>{}</td>", escape(t)),
                Cell::Num(t) => write!(h, "<td class=\"num\">{}</td>", escape(t)),
                Cell::Html(t) => write!(h, "<td>{t}</td>"),
            };
        }
        h.push_str("</tr>");
    }
    h.push_str("</tbody></table>\n");
}

fn fmt(v: f64, d: usize) -> Cell {
    Cell::Num(if v.is_finite() {
        format!("{v:.d$}")
    } else {
        String::new()
    })
}

fn text(s: impl Into<String>) -> Cell {
    Cell::Text(s.into())
}

fn count(n: usize) -> Cell {
    Cell::Num(n.to_string())
}

pub(crate) fn plot(h: &mut String, svg: &str) {
    h.push_str("<div class=\"plot\">");
    h.push_str(svg.trim_end());
    h.push_str("</div>\n");
}

/// What a well page shows besides the table's curves.
pub struct WellPage<'a> {
    pub stem: &'a str,
    pub well: &'a str,
    pub file: &'a str,
    pub depth_unit: &'a str,
    pub table: &'a Table,
    pub zone_marks: Vec<plots::ZoneMark>,
    pub zones: &'a [crate::well::summary::ZoneSummary],
    pub steps: &'a [crate::contacts::Step],
    pub implied_fwl: Option<&'a crate::contacts::ImpliedFwl>,
    pub fwl_tvdss: Option<f64>,
    pub class_count: u8,
    pub archie: Vec<ArchieLine>,
    /// Median Rw of the well's depths, ohm.m.
    pub rw_ohmm: f64,
    pub warnings: &'a [String],
    /// Also write the log plot as PNG beside the page.
    pub png: bool,
}

/// The column `name` of a table.
/// Up to `max` (PHIE, RT, CLASS) points of a well, evenly strided.
pub fn pickett_points(t: &Table, max: usize) -> Vec<PickettPoint> {
    let (Some(phi), Some(rt), Some(class)) = (
        t.get(Col::Phie),
        t.get(Col::Input(L::DeepResistivity)),
        t.get(Col::Class),
    ) else {
        return Vec::new();
    };
    let all: Vec<PickettPoint> = phi
        .iter()
        .zip(rt)
        .zip(class)
        .filter(|((p, r), c)| **p > 0.0 && **r > 0.0 && c.is_finite() && **c >= 1.0)
        .map(|((p, r), c)| PickettPoint {
            phi: *p,
            rt: *r,
            class: c.round().clamp(1.0, 255.0) as u8,
        })
        .collect();
    let stride = all.len().div_ceil(max.max(1)).max(1);
    all.into_iter().step_by(stride).collect()
}

/// The curves, zones, steps and FWL the log plot draws, from a well page.
fn log_plot_curves<'a>(p: &'a WellPage<'a>) -> WellCurves<'a> {
    let t = p.table;
    let md = t.get(Col::Depth).unwrap_or(&[]);
    let mut curves = std::collections::BTreeMap::new();
    for col in [
        Col::Input(L::GammaRay),
        Col::Vsh,
        Col::Input(L::DeepResistivity),
        Col::Input(L::BulkDensity),
        Col::Input(L::NeutronPorosity),
        Col::Phit,
        Col::Phie,
        Col::Class,
        Col::ClassProb,
        Col::Sw,
        Col::Swh,
        Col::SwFixed,
        Col::Flag,
    ] {
        if let Some(c) = t.get(col) {
            curves.insert(col, c);
        }
    }
    WellCurves {
        well: p.well,
        depth_unit: p.depth_unit,
        md,
        tvdss: t.get(Col::Tvdss),
        curves,
        zones: p.zone_marks.clone(),
        steps: p
            .steps
            .iter()
            .map(|s| plots::StepMark {
                md: s.depth_md,
                kind: s.kind.name().to_string(),
                explanation: s.explanation.clone(),
            })
            .collect(),
        fwl_tvdss: p.fwl_tvdss,
        class_count: p.class_count,
    }
}

/// A well page's zone table.
fn well_zones_section(h: &mut String, p: &WellPage<'_>) {
    h.push_str("<h2>Zones</h2>\n");
    let rows: Vec<Vec<Cell>> = p
        .zones
        .iter()
        .map(|z| {
            vec![
                text(&z.zone),
                fmt(z.top_md, 2),
                fmt(z.base_md, 2),
                fmt(z.gross, 2),
                fmt(z.net_reservoir, 2),
                fmt(z.net_pay, 2),
                fmt(z.ntg, 3),
                fmt(z.phie_avg, 3),
                fmt(z.sw_avg, 3),
                fmt(z.hpt, 3),
            ]
        })
        .collect();
    let u = p.depth_unit;
    table(
        h,
        "zones",
        &[
            "zone",
            &format!("top MD {u}"),
            &format!("base MD {u}"),
            &format!("gross {u}"),
            &format!("net reservoir {u}"),
            &format!("net pay {u}"),
            "NTG",
            "PHIE avg",
            "SW avg",
            &format!("HPT {u}"),
        ],
        &rows,
    );
}

/// A well page's audited saturation steps and implied FWL.
fn well_steps_section(h: &mut String, p: &WellPage<'_>) {
    h.push_str("<h2>Saturation steps</h2>\n");
    let u = p.depth_unit;
    if let Some(f) = p.implied_fwl {
        let _ = writeln!(h, "<p>{}</p>", escape(&f.note));
    }
    if p.steps.is_empty() {
        h.push_str("<p class=\"note\">No saturation step audited in this well.</p>\n");
    } else {
        let rows: Vec<Vec<Cell>> = p
            .steps
            .iter()
            .map(|s| {
                vec![
                    fmt(s.depth_md, 2),
                    fmt(s.tvdss, 2),
                    text(s.kind.name()),
                    fmt(s.sw_above, 3),
                    fmt(s.sw_below, 3),
                    text(format!("{} → {}", s.class_above, s.class_below)),
                    text(&s.explanation),
                ]
            })
            .collect();
        table(
            h,
            "steps",
            &[
                &format!("MD {u}"),
                &format!("TVDSS {u}"),
                "kind",
                "SW above",
                "SW below",
                "class above → below",
                "explanation",
            ],
            &rows,
        );
    }
}

/// Write a well's page (and its PNG log plot when asked); returns the files
/// written, relative to `out`.
pub fn write_well_page(out: &Path, p: &WellPage<'_>) -> Result<Vec<String>, OutputError> {
    let dir = out.join(REPORT_DIR).join("wells");
    std::fs::create_dir_all(&dir).map_err(|source| OutputError::Io {
        path: dir.clone(),
        source,
    })?;
    let t = p.table;
    let md = t.get(Col::Depth).unwrap_or(&[]);
    let curves_in = log_plot_curves(p);
    let mut h = page_start(&format!("{} — flowzone", p.well), p.well);
    let _ = writeln!(
        h,
        "<p><a href=\"../index.html\">Field page</a> · file <code>{}</code> · {} depths</p>",
        escape(p.file),
        md.len()
    );
    if !p.warnings.is_empty() {
        h.push_str("<h2>Warnings</h2><ul class=\"warnings\">");
        for w in p.warnings {
            let _ = write!(h, "<li>{}</li>", escape(w));
        }
        h.push_str("</ul>\n");
    }
    well_zones_section(&mut h, p);
    well_steps_section(&mut h, p);
    let log_svg = plots::logplot::log_plot(&curves_in);
    let mut written = Vec::new();
    h.push_str("<h2>Log plot</h2>\n");
    if p.png {
        let png_path = dir.join(format!("{}-log.png", p.stem));
        let png = crate::report::png::svg_to_png(&log_svg).map_err(|e| OutputError::Io {
            path: png_path.clone(),
            source: std::io::Error::other(e),
        })?;
        output::write_atomic(&png_path, |w| {
            use std::io::Write as _;
            w.write_all(&png).map_err(|source| OutputError::Io {
                path: png_path.clone(),
                source,
            })
        })?;
        let _ = writeln!(
            h,
            "<p><a href=\"{}\">The log plot as PNG</a></p>",
            svg::href(&format!("{}-log.png", p.stem))
        );
        written.push(format!("{REPORT_DIR}/wells/{}-log.png", p.stem));
    }
    plot(&mut h, &log_svg);
    h.push_str("<h2>Pickett plot</h2>\n");
    plot(
        &mut h,
        &plots::crossplots::pickett(
            &pickett_points(t, PICKETT_POINTS_PER_WELL),
            &p.archie,
            p.rw_ohmm,
        ),
    );
    page_end(&mut h);
    let path = dir.join(format!("{}.html", p.stem));
    output::write_atomic(&path, |w| {
        use std::io::Write as _;
        w.write_all(h.as_bytes()).map_err(|source| OutputError::Io {
            path: path.clone(),
            source,
        })
    })?;
    written.insert(0, format!("{REPORT_DIR}/wells/{}.html", p.stem));
    Ok(written)
}

/// One well's line on the field page.
pub struct WellRow<'a> {
    pub report: &'a crate::pipeline::WellReport,
    /// The well's page, relative to the report folder, when it has one.
    pub page: Option<String>,
}

/// What the field page shows.
pub struct FieldPage<'a> {
    pub project: &'a str,
    pub depth_unit: &'a str,
    pub wells: Vec<WellRow<'a>>,
    pub manifest: &'a crate::output::manifest::Manifest,
    pub core: Vec<CorePoint>,
    pub boundaries: Boundaries,
    pub class_count: u8,
    pub j_classes: Vec<JClass>,
    pub pressures: Vec<plots::PressureCompartment>,
    /// The class predictor's leave-one-well-out confusion matrix.
    pub confusion: Option<Vec<Vec<usize>>>,
    /// What each piece of class evidence scored leave one well out.
    pub ablation: Vec<crate::classes::predictor::model_file::AblationRow>,
    pub zones: &'a [crate::well::summary::ZoneSummary],
    /// A sample of every well's depths, and the field's Archie lines by class.
    pub pickett: Vec<PickettPoint>,
    pub archie: Vec<ArchieLine>,
    /// The field's Rw, ohm.m (NaN when set per zone only: no lines then).
    pub rw_ohmm: f64,
    /// The views across wells: cross-sections, FWL charts, base map.
    pub views: field_views::Views<'a>,
    /// The Monte Carlo's drivers of each zone's HPT, ranked (empty without one).
    pub drivers: &'a [crate::uncertainty::Driver],
    /// The Monte Carlo's realisations (0 without one).
    pub realisations: usize,
}

/// Write the field page, `report/index.html`; returns its path relative to `out`.
pub fn write_field_page(out: &Path, p: &FieldPage<'_>) -> Result<String, OutputError> {
    let dir = out.join(REPORT_DIR);
    std::fs::create_dir_all(&dir).map_err(|source| OutputError::Io {
        path: dir.clone(),
        source,
    })?;
    let m = p.manifest;
    let failed = p.wells.iter().filter(|w| !w.report.ok).count();
    let mut h = page_start(&format!("{} — flowzone", p.project), p.project);
    h.push_str("<h2>Run</h2>\n");
    // no times and no shard list here: the report is byte-identical for the
    // same inputs, however the run was split; run-manifest.json has both
    let facts = vec![
        vec![text("tool"), text(&m.tool)],
        vec![
            text("config"),
            text(format!("{} (SHA-256 {})", m.config.path, m.config.sha256)),
        ],
        vec![text("input files hashed"), count(m.inputs.len())],
        vec![
            text("wells"),
            text(format!("{} ({failed} failed)", p.wells.len())),
        ],
    ];
    table(&mut h, "facts", &[], &facts);
    h.push_str("<p class=\"note\">run-manifest.json holds every input's SHA-256, the command, the start and end times and, for a sharded run, the shards; run-summary.json and the CSV files hold every number shown here.</p>\n");

    wells_section(&mut h, p);
    crossplots_section(&mut h, p);
    evidence_section(&mut h, p);
    field_views::write_section(&mut h, &dir, &p.views, p.depth_unit)?;
    uncertainty_section(&mut h, p);
    steps_section(&mut h, p);
    zone_section(&mut h, p);
    page_end(&mut h);
    let path = dir.join("index.html");
    output::write_atomic(&path, |w| {
        use std::io::Write as _;
        w.write_all(h.as_bytes()).map_err(|source| OutputError::Io {
            path: path.clone(),
            source,
        })
    })?;
    Ok(format!("{REPORT_DIR}/index.html"))
}

/// The field page's table of wells, each linked to its page.
fn wells_section(h: &mut String, p: &FieldPage<'_>) {
    h.push_str("<h2>Wells</h2>\n");
    let rows: Vec<Vec<Cell>> = p
        .wells
        .iter()
        .map(|w| {
            let r = w.report;
            let name = r.well.clone().unwrap_or_else(|| "(unread)".into());
            let steps = r.contacts.as_ref().map_or(0, |a| a.steps.len());
            let fluid = r.contacts.as_ref().map_or(0, |a| {
                a.steps
                    .iter()
                    .filter(|s| s.kind == crate::contacts::StepKind::FluidContact)
                    .count()
            });
            let unexplained = r.contacts.as_ref().map_or(0, |a| {
                a.steps
                    .iter()
                    .filter(|s| s.kind == crate::contacts::StepKind::Unexplained)
                    .count()
            });
            let name_cell = match &w.page {
                Some(page) => Cell::Html(format!(
                    "<a href=\"{}\">{}</a>",
                    svg::href(page),
                    escape(&name)
                )),
                None => text(name),
            };
            vec![
                name_cell,
                text(&r.file),
                text(if r.ok { "ok" } else { "FAILED" }),
                count(r.rows),
                count(steps),
                count(fluid),
                count(unexplained),
                count(r.warnings.len()),
                text(r.error.clone().unwrap_or_default()),
            ]
        })
        .collect();
    let mut wells_html = String::new();
    table(
        &mut wells_html,
        "wells",
        &[
            "well",
            "file",
            "status",
            "depths",
            "steps",
            "fluid contacts",
            "unexplained",
            "warnings",
            "error",
        ],
        &rows,
    );
    h.push_str(&wells_html);
}

/// The field page's class-evidence table: each piece of evidence the class
/// predictor can use, its leave-one-well-out scores on the cored wells, and
/// which the run used.
fn evidence_section(h: &mut String, p: &FieldPage<'_>) {
    if p.ablation.is_empty() {
        return;
    }
    h.push_str("<h2>Class evidence</h2>\n");
    let first = p.ablation[0].exact;
    let rows: Vec<Vec<Cell>> = p
        .ablation
        .iter()
        .enumerate()
        .map(|(i, r)| {
            vec![
                text(&r.evidence),
                fmt(100.0 * r.exact, 1),
                fmt(100.0 * r.within_one, 1),
                if i == 0 {
                    text("-")
                } else {
                    text(format!("{:+.1}", 100.0 * (r.exact - first)))
                },
                text(if r.chosen { "used" } else { "" }),
            ]
        })
        .collect();
    table(
        h,
        "evidence",
        &["evidence", "exact %", "within one %", "gain (points)", ""],
        &rows,
    );
    h.push_str("<p class=\"note\">Each cored well held out in turn and classed by a model trained on the others; the run uses the evidence marked, chosen by this score (model/training-report.txt).</p>\n");
}

/// The field page's crossplots: core φ-k, J-functions, pressures, the predictor's confusion matrix, Pickett.
fn crossplots_section(h: &mut String, p: &FieldPage<'_>) {
    h.push_str("<h2>Crossplots</h2>\n<div class=\"plots\">\n");
    plot(
        h,
        &plots::crossplots::core_phi_k(&p.core, &p.boundaries, p.class_count),
    );
    plot(h, &plots::crossplots::j_function(&p.j_classes));
    plot(
        h,
        &plots::crossplots::pressure_depth(&p.pressures, p.depth_unit),
    );
    match &p.confusion {
        Some(c) => plot(
            h,
            &plots::crossplots::confusion(c, "class predictor, leave one well out"),
        ),
        None => plot(
            h,
            &plots::crossplots::confusion(&[], "no class predictor in this run"),
        ),
    }
    plot(
        h,
        &plots::crossplots::pickett(&p.pickett, &p.archie, p.rw_ohmm),
    );
    h.push_str("</div>\n<p class=\"note\">The Pickett plot thins every well's depths to a sample; each well's page has its own.</p>\n");
}

/// The field page's Monte Carlo: the tornado chart of what drives each
/// zone's HPT, and the percentile convention.
fn uncertainty_section(h: &mut String, p: &FieldPage<'_>) {
    if p.drivers.is_empty() {
        return;
    }
    h.push_str("<h2 id=\"uncertainty\">Uncertainty</h2>\n");
    let _ = writeln!(
        h,
        "<p class=\"note\">Monte Carlo over the parameters the config gives as distributions, the class at each depth (drawn from its probabilities, bed by bed, unless <code>[uncertainty] classes = \"fixed\"</code>) and each compartment's free water level (normal, with the pressure fit's standard error or the config's <code>fwl-sd</code>); the logs, zone tops and cutoffs are held. {}. The zone summary below and <a href=\"../field/zone-summary.csv\">field/zone-summary.csv</a> give each zone's P90, P50, P10 and mean, of HPT from the logs' SW and, where a saturation-height model is run, of HPT from its SWH (which carries the free water level's spread); <a href=\"../field/hpt-drivers.csv\">field/hpt-drivers.csv</a> ranks the parameters by their hold on HPT from SW, and <code>field/hpt-swh-drivers.csv</code> (the second chart, when drawn) ranks them with each compartment's free water level by their hold on HPT from SWH. The ranges reflect only the stated input uncertainties.</p>",
        escape(crate::uncertainty::CONVENTION)
    );
    for (quantity, what, short) in [
        ("HPT", "hydrocarbon pore thickness", "HPT"),
        (
            "HPT_SWH",
            "hydrocarbon pore thickness from the saturation-height model",
            "HPT from SWH",
        ),
    ] {
        let of: Vec<&crate::uncertainty::Driver> = p
            .drivers
            .iter()
            .filter(|d| d.quantity == quantity)
            .collect();
        if !of.is_empty() {
            plot(
                h,
                &plots::tornado::tornado(&of, what, short, p.realisations),
            );
        }
    }
}

/// The field page's saturation steps, the first [`MAX_TABLE_ROWS`].
fn steps_section(h: &mut String, p: &FieldPage<'_>) {
    h.push_str("<h2>Saturation steps</h2>\n");
    let steps: Vec<&crate::contacts::Step> = p
        .wells
        .iter()
        .filter_map(|w| w.report.contacts.as_ref())
        .flat_map(|a| a.steps.iter())
        .collect();
    let u = p.depth_unit;
    let rows: Vec<Vec<Cell>> = steps
        .iter()
        .take(MAX_TABLE_ROWS)
        .map(|s| {
            vec![
                text(&s.well),
                fmt(s.depth_md, 2),
                fmt(s.tvdss, 2),
                text(s.kind.name()),
                fmt(s.sw_above, 3),
                fmt(s.sw_below, 3),
                text(&s.explanation),
            ]
        })
        .collect();
    if steps.len() > MAX_TABLE_ROWS {
        let _ = writeln!(
            h,
            "<p class=\"note\">The first {MAX_TABLE_ROWS} of {} steps; all are in contacts.csv.</p>",
            steps.len()
        );
    }
    table(
        h,
        "contacts",
        &[
            "well",
            &format!("MD {u}"),
            &format!("TVDSS {u}"),
            "kind",
            "SW above",
            "SW below",
            "explanation",
        ],
        &rows,
    );
}

/// The field page's zone summary, the first [`MAX_TABLE_ROWS`].
fn zone_section(h: &mut String, p: &FieldPage<'_>) {
    h.push_str("<h2>Zone summary</h2>\n");
    let u = p.depth_unit;
    let ranges = p.zones.iter().any(|z| z.uncertainty.is_some());
    let swh_ranges = p
        .zones
        .iter()
        .any(|z| z.uncertainty.as_ref().is_some_and(|u| u.hpt_swh.is_some()));
    let rows: Vec<Vec<Cell>> = p
        .zones
        .iter()
        .take(MAX_TABLE_ROWS)
        .map(|z| {
            let mut row = vec![
                text(&z.well),
                text(&z.zone),
                fmt(z.gross, 2),
                fmt(z.net_pay, 2),
                fmt(z.ntg, 3),
                fmt(z.phie_avg, 3),
                fmt(z.sw_avg, 3),
                fmt(z.hpt, 3),
            ];
            if ranges {
                let r = z.uncertainty.as_ref().map(|u| u.hpt);
                for v in [r.map(|r| r.p90), r.map(|r| r.p50), r.map(|r| r.p10)] {
                    row.push(fmt(v.unwrap_or(f64::NAN), 3));
                }
            }
            if swh_ranges {
                let r = z.uncertainty.as_ref().and_then(|u| u.hpt_swh);
                for v in [r.map(|r| r.p90), r.map(|r| r.p10)] {
                    row.push(fmt(v.unwrap_or(f64::NAN), 3));
                }
            }
            row
        })
        .collect();
    if p.zones.len() > MAX_TABLE_ROWS {
        let _ = writeln!(
            h,
            "<p class=\"note\">The first {MAX_TABLE_ROWS} of {} zones; all are in field/zone-summary.csv.</p>",
            p.zones.len()
        );
    }
    let mut head: Vec<String> = vec![
        "well".into(),
        "zone".into(),
        format!("gross {u}"),
        format!("net pay {u}"),
        "NTG".into(),
        "PHIE avg".into(),
        "SW avg".into(),
        format!("HPT {u}"),
    ];
    if ranges {
        head.extend([
            format!("HPT P90 (low) {u}"),
            format!("HPT P50 {u}"),
            format!("HPT P10 (high) {u}"),
        ]);
    }
    if swh_ranges {
        head.extend([
            format!("HPT from SWH P90 {u}"),
            format!("HPT from SWH P10 {u}"),
        ]);
    }
    let head: Vec<&str> = head.iter().map(String::as_str).collect();
    table(h, "zone-summary", &head, &rows);
}

/// A J-curve sampled for plotting: Sw at J on a log grid, Sw increasing.
pub fn sample_j_curve(curve: &crate::sat_height::lab_curves::JCurve) -> Vec<(f64, f64)> {
    let mut v: Vec<(f64, f64)> = (0..=80)
        .map(|i| 10f64.powf(-2.0 + 4.0 * f64::from(i) / 80.0))
        .map(|j| (curve.sw(j), j))
        .filter(|(sw, _)| sw.is_finite())
        .collect();
    v.sort_by(|a, b| a.0.total_cmp(&b.0));
    v
}
