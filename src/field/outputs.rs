//! The field-level outputs written after every well: the saturation-height
//! model and residual comparison (`saturation/`), and the contact audit's
//! field view (`contacts.csv`, `contacts.json`).

use crate::output::messages::note;
use std::path::Path;

use crate::config::Config;
use crate::error::Error;
use crate::output;
use crate::pipeline::WellReport;

/// The field-level saturation-height outputs: marks wells whose residuals
/// depart from their neighbours' (a warning on each), writes saturation/.
pub(crate) fn saturation_outputs(
    config: &Config,
    out: &Path,
    m: &crate::sat_height::SatHeightModel,
    setup: &crate::classes::stage::ClassSetup,
    reports: &mut [WellReport],
    progress: bool,
) -> Result<Vec<String>, Error> {
    let mut marked_wells: Vec<(String, &mut crate::sat_height::WellSatHeight)> = reports
        .iter_mut()
        .filter_map(|r| {
            let name = r.well.clone()?;
            r.saturation_height.as_mut().map(|w| (name, w))
        })
        .collect();
    let marked = crate::sat_height::mark_biased_wells(
        &mut marked_wells,
        config.saturation_height.bias_threshold_vv,
    );
    let listed: Vec<(String, &crate::sat_height::WellSatHeight)> = reports
        .iter()
        .filter_map(|r| Some((r.well.clone()?, r.saturation_height.as_ref()?)))
        .collect();
    let header = &setup.model.header;
    let field_archie = config.parameters.field.resolve().archie;
    let max_class = u8::try_from(setup.scheme.class_count).unwrap_or(u8::MAX);
    let mut zones: Vec<String> = config.parameters.zone.keys().cloned().collect();
    zones.extend(config.parameters.zone_class.keys().cloned());
    zones.sort();
    zones.dedup();
    let export = crate::sat_height::ModelExport {
        tool: format!("flowzone {}", env!("CARGO_PKG_VERSION")),
        caution: crate::sat_height::CAUTION,
        units: crate::sat_height::export_units(),
        depth_unit: config.project.depth_unit,
        scheme: &setup.scheme,
        saturation_height: m,
        archie_by_class: config.parameters.class_archie("", field_archie, max_class),
        archie_by_zone_and_class: zones
            .into_iter()
            .map(|z| {
                let base = config.parameters.for_well_zone(&[], &z).resolve().archie;
                let t = config.parameters.class_archie(&z, base, max_class);
                (z, t)
            })
            .collect(),
        perm_method: header.perm_method,
        perm_by_class: &header.perm,
    };
    let written = crate::sat_height::write_outputs(out, &export, &listed)?
        .iter()
        .map(|p| output::shown(out, p))
        .collect::<Vec<String>>();
    for (well, msg) in marked {
        if progress {
            note!("saturation-height: {well}: {msg}");
        }
        if let Some(r) = reports
            .iter_mut()
            .find(|r| r.well.as_deref() == Some(&well))
        {
            r.warnings.push(msg);
        }
    }
    Ok(written)
}

/// The field view of the contact audit, contacts.csv and contacts.json.
pub(crate) fn contact_outputs(
    config: &Config,
    out: &Path,
    m: &crate::sat_height::SatHeightModel,
    reports: &[WellReport],
    progress: bool,
) -> Result<(Vec<crate::contacts::CompartmentView>, Vec<String>), Error> {
    let audits: Vec<(String, &crate::contacts::WellAudit)> = reports
        .iter()
        .filter_map(|r| Some((r.well.clone()?, r.contacts.as_ref()?)))
        .collect();
    let contact_view =
        crate::contacts::field_view(m, &audits, &config.contacts, config.project.depth_unit);
    let steps: Vec<&crate::contacts::Step> =
        audits.iter().flat_map(|(_, a)| a.steps.iter()).collect();
    let contact_outputs =
        crate::contacts::write_outputs(out, &steps, &contact_view, config.project.depth_unit)?
            .iter()
            .map(|p| output::shown(out, p))
            .collect();
    if progress {
        for v in &contact_view {
            if !v.not_lined_up.is_empty() {
                note!(
                    "contacts: compartment {}: wells not lined up with FWL {:.1}: {}",
                    v.name,
                    v.fwl_tvdss,
                    v.not_lined_up.join(", ")
                );
            }
        }
        let count = |k| steps.iter().filter(|s| s.kind == k).count();
        use crate::contacts::StepKind as K;
        note!(
            "contacts: {} steps: {} rock-quality, {} fluid-contact, {} unexplained, {} flagged (contacts.csv)",
            steps.len(),
            count(K::RockQuality),
            count(K::FluidContact),
            count(K::Unexplained),
            count(K::Flagged)
        );
    }
    Ok((contact_view, contact_outputs))
}
