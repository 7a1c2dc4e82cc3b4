//! The report's page data, built from a run's models and its wells' results.

use std::path::Path;

use crate::classes::stage::Prepared;
use crate::config::Config;
use crate::output;
use crate::output::schema::Col;
use crate::pipeline::{Interpreted, Models, WellReport};
use crate::sat_height::SatHeightModel;

/// The Pickett plot's Archie lines: the field's a, m, n for each class, as
/// `[parameters.class."N"]` overrides them (zone-independent).
pub fn archie_lines(config: &Config, class_count: u8) -> Vec<crate::report::plots::ArchieLine> {
    let field_archie = config.parameters.field.resolve().archie;
    config
        .parameters
        .class_archie("", field_archie, class_count)
        .into_iter()
        .zip(1u8..)
        .map(|(a, class)| crate::report::plots::ArchieLine {
            class,
            a: a.a,
            m: a.m,
            n: a.n,
        })
        .collect()
}
/// What the field page keeps of a well: its Pickett sample, its profile for
/// the cross-section and its header location.
pub fn well_view(w: &Interpreted) -> crate::pipeline::WellView {
    let out = &w.well;
    let names: Vec<String> = out.report.zones.iter().map(|z| z.name.clone()).collect();
    crate::pipeline::WellView {
        pickett: crate::report::pickett_points(&out.table, crate::report::FIELD_PICKETT_PER_WELL),
        profile: crate::well::profile::profile(&out.table, &out.zone_of, &names),
        location: crate::input::location::from_items(&out.table.well_items),
        hpt_realisations: Vec::new(),
        hpt_swh_realisations: Vec::new(),
    }
}

/// Write a well's report page (log plot, Pickett plot, zones, steps, warnings).
pub fn well_page(
    stem: &str,
    path: &Path,
    w: &Interpreted,
    models: &Models<'_>,
    config: &Config,
    out_dir: &Path,
) -> Result<Vec<String>, output::OutputError> {
    let out = &w.well;
    let class_count = models
        .classes
        .map_or(0, |s| u8::try_from(s.scheme.class_count).unwrap_or(u8::MAX));
    let archie = archie_lines(config, class_count);
    let mut rw: Vec<f64> = out.rw.iter().copied().filter(|v| v.is_finite()).collect();
    rw.sort_by(f64::total_cmp);
    let rw_ohmm = rw.get(rw.len() / 2).copied().unwrap_or(f64::NAN);
    let md = out.table.get(Col::Depth).unwrap_or(&[]);
    let mut zone_marks: Vec<crate::report::plots::ZoneMark> = out
        .report
        .zones
        .iter()
        .map(|z| crate::report::plots::ZoneMark {
            name: z.name.clone(),
            top_md: f64::INFINITY,
            base_md: f64::NEG_INFINITY,
        })
        .collect();
    for (d, z) in md.iter().zip(&out.zone_of) {
        if let Some(m) = z.and_then(|z| zone_marks.get_mut(usize::from(z))) {
            m.top_md = m.top_md.min(*d);
            m.base_md = m.base_md.max(*d);
        }
    }
    zone_marks.retain(|m| m.top_md <= m.base_md);
    let audit = w.contacts.as_ref();
    let unit = config.project.depth_unit.las_unit().to_lowercase();
    let page = crate::report::WellPage {
        stem,
        well: &out.name,
        file: &path.display().to_string(),
        depth_unit: &unit,
        table: &out.table,
        zone_marks,
        zones: &w.zones,
        steps: audit.map_or(&[], |a| a.steps.as_slice()),
        implied_fwl: audit.and_then(|a| a.implied_fwl.as_ref()),
        fwl_tvdss: w.saturation_height.as_ref().map(|s| s.fwl_tvdss),
        class_count,
        archie,
        rw_ohmm,
        warnings: &out.warnings,
        png: config.output.report_png,
    };
    crate::report::write_well_page(out_dir, &page)
}

/// What the field page reports of the run after its wells.
pub struct RunResults<'a> {
    /// Every well's report, failed ones included.
    pub reports: &'a [WellReport],
    /// The zone summary's rows.
    pub zones: &'a [crate::well::summary::ZoneSummary],
    pub manifest: &'a crate::output::manifest::Manifest,
    /// The Monte Carlo's drivers of HPT (empty without one).
    pub drivers: &'a [crate::uncertainty::Driver],
}

/// Write the report's field page from the run's models and every well's report.
pub fn field_page(
    config: &Config,
    out: &Path,
    prepared: Option<&Prepared>,
    sat: Option<&SatHeightModel>,
    run: &RunResults<'_>,
) -> Result<String, output::OutputError> {
    let RunResults {
        reports,
        zones,
        manifest,
        drivers,
    } = *run;
    use crate::classes::ClassScheme as _;
    use crate::report::plots::{
        Boundaries, CorePoint, GradientLine, JClass, PressureCompartment, PressurePoint,
    };
    let class_setup = prepared.and_then(|p| p.setup.as_ref());
    let scheme = class_setup.map(|c| &c.scheme);
    let class_count = scheme.map_or(0, |s| u8::try_from(s.class_count).unwrap_or(u8::MAX));
    let core: Vec<CorePoint> = prepared
        .and_then(|p| p.core.as_ref())
        .map(|c| {
            c.samples
                .iter()
                .map(|m| CorePoint {
                    phi: m.sample.porosity,
                    k_md: m.sample.perm_md,
                    class: scheme.and_then(|s| s.classify(m.sample.porosity, m.sample.perm_md)),
                })
                .collect()
        })
        .unwrap_or_default();
    let boundaries = match scheme {
        Some(s) if s.kind.starts_with("fzi") => Boundaries::Fzi(s.boundaries.clone()),
        Some(s) if s.kind.contains("r35") => Boundaries::R35(s.boundaries.clone()),
        _ => Boundaries::None,
    };
    let (j_classes, pressures) = match sat {
        Some(m) => {
            let j: Vec<JClass> = m
                .classes
                .iter()
                .map(|c| JClass {
                    class: c.class,
                    points: m
                        .j_points
                        .iter()
                        .filter(|p| p.0 == c.class)
                        .map(|p| (p.1, p.2))
                        .collect(),
                    curve: crate::report::sample_j_curve(&c.curve),
                    label: match c.borrowed_from {
                        Some(b) => format!("borrowed from class {b}"),
                        None => format!("{}, rms Sw {:.3}", c.curve.form_name(), c.curve.rms_sw()),
                    },
                })
                .collect();
            let to_m = config
                .project
                .depth_unit
                .factor_to(crate::units::DepthUnit::Metre);
            let p: Vec<PressureCompartment> = m
                .compartments
                .iter()
                .map(|c| {
                    let pts: Vec<PressurePoint> = c
                        .points_m
                        .iter()
                        .map(|&(z, psi)| PressurePoint {
                            tvdss: z / to_m,
                            psi,
                            well: String::new(),
                            used: true,
                        })
                        .collect();
                    let (lo, hi) = pts
                        .iter()
                        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| {
                            (a.min(p.tvdss), b.max(p.tvdss))
                        });
                    let lines = c
                        .pressure_fit
                        .as_ref()
                        .map(|f| {
                            let line = |l: &crate::sat_height::fwl::Line,
                                        what: &str,
                                        top: f64,
                                        base: f64| {
                                GradientLine {
                                    label: format!("{what} {:.3} g/cm3", l.density_gcc()),
                                    intercept_psi: l.intercept_psi,
                                    psi_per_unit: l.gradient_psi_per_m * to_m,
                                    top,
                                    base,
                                }
                            };
                            vec![
                                line(&f.upper, "hydrocarbon", lo.min(c.fwl_tvdss), c.fwl_tvdss),
                                line(&f.lower, "water", c.fwl_tvdss, hi.max(c.fwl_tvdss)),
                            ]
                        })
                        .unwrap_or_default();
                    PressureCompartment {
                        name: c.name.clone(),
                        points: pts,
                        lines,
                        fwl_tvdss: c.fwl_tvdss,
                        fwl_sigma: c.fwl_sigma,
                    }
                })
                .collect();
            (j, p)
        }
        None => (Vec::new(), Vec::new()),
    };
    let pickett: Vec<crate::report::plots::PickettPoint> = reports
        .iter()
        .flat_map(|r| r.view.pickett.iter().copied())
        .collect();
    let field_archie = config.parameters.field.resolve();
    let archie = archie_lines(config, class_count);
    let confusion = class_setup
        .and_then(|c| c.model.header.validation.as_ref())
        .map(|v| v.forest.confusion.clone());
    let ablation = class_setup.map_or_else(Vec::new, |c| c.ablation());
    let unit = config.project.depth_unit.las_unit().to_lowercase();
    let wells = reports
        .iter()
        .map(|r| crate::report::WellRow {
            report: r,
            page: r
                .outputs
                .iter()
                .find(|o| o.starts_with("report/wells/"))
                .map(|o| o.trim_start_matches("report/").to_string()),
        })
        .collect();
    let page = crate::report::FieldPage {
        project: &config.project.name,
        depth_unit: &unit,
        wells,
        manifest,
        core,
        boundaries,
        class_count,
        j_classes,
        pressures,
        confusion,
        ablation,
        zones,
        pickett,
        archie,
        rw_ohmm: field_archie.rw_ohmm.unwrap_or(f64::NAN),
        views: crate::report::field_views::build(config, sat, reports),
        drivers,
        realisations: config.uncertainty.realisations,
    };
    crate::report::write_field_page(out, &page)
}
