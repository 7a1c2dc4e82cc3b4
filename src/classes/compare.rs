//! `flowzone classes compare`: how well each configured class scheme explains
//! the core's permeability, so a user can choose one for the field.
//!
//! Per scheme: classes used, samples per class, the spread of log10 k at given
//! porosity within each class (RMS about the class's log10 k vs φ line), and
//! the leave-one-well-out error of permeability predicted from class and
//! porosity: each cored well in turn is predicted from per-class fits (and,
//! for a data-driven scheme, boundaries) made on the other wells.

use serde::Serialize;

use crate::classes::predictor::model_file::SchemeInfo;
use crate::classes::{self, perm};
use crate::config::ClassesConfig;
use crate::input::core_samples::CoreSample;

/// One scheme's figures.
#[derive(Debug, Clone, Serialize)]
pub struct SchemeComparison {
    /// The scheme: name, kind, quantity and boundaries.
    pub scheme: SchemeInfo,
    /// Classes with at least one core sample.
    pub classes_used: usize,
    /// (class, samples).
    pub samples_per_class: Vec<(u8, usize)>,
    /// (class, RMS of log10 k about the class line; `None` under 3 samples).
    pub spread_log10: Vec<(u8, Option<f64>)>,
    /// Sample-weighted RMS over the classes with a line.
    pub spread_log10_overall: Option<f64>,
    /// Samples without a class in the scheme.
    pub unclassified: usize,
    /// Leave-one-well-out RMS of log10(k core / k predicted), class FZI form.
    pub lowo_rms_log10_fzi: Option<f64>,
    /// The same with the class line (FZI form where a class has no line).
    pub lowo_rms_log10_line: Option<f64>,
    /// Held-out samples predicted, and those whose class the other wells lack.
    pub lowo_samples: usize,
    /// Held-out samples not predicted because the other wells have no core of their class.
    pub lowo_unpredicted: usize,
    /// Wells held out in turn.
    pub wells: Vec<String>,
}

/// A configured scheme that cannot be built, on all the core or on the core
/// without one well (a leave-one-well-out fold).
#[derive(Debug, thiserror::Error)]
#[error("[classes.scheme.{scheme}]{}", .without.as_ref().map(|w| format!(" without {w}")).unwrap_or_default())]
pub struct SchemeBuildError {
    /// The scheme's name under `[classes.scheme]`.
    pub scheme: String,
    /// The well left out, in a fold.
    pub without: Option<String>,
    /// Why the scheme cannot be built.
    #[source]
    pub source: classes::SchemeError,
}

fn rms(v: &[f64]) -> Option<f64> {
    (!v.is_empty()).then(|| (v.iter().map(|x| x * x).sum::<f64>() / v.len() as f64).sqrt())
}

/// Compare every scheme of `[classes]` on the core samples.
pub fn compare(
    classes_cfg: &ClassesConfig,
    core: &[CoreSample],
) -> Result<Vec<SchemeComparison>, SchemeBuildError> {
    let phi_k: Vec<(f64, f64)> = core.iter().map(|s| (s.porosity, s.perm_md)).collect();
    let mut wells: Vec<String> = core.iter().map(|s| s.well.clone()).collect();
    wells.sort();
    wells.dedup();
    let mut out = Vec::new();
    for (name, spec) in &classes_cfg.scheme {
        let scheme = classes::build(spec, &phi_k).map_err(|source| SchemeBuildError {
            scheme: name.clone(),
            without: None,
            source,
        })?;
        let classed: Vec<(u8, f64, f64)> = phi_k
            .iter()
            .filter_map(|&(p, k)| scheme.classify(p, k).map(|c| (c, p, k)))
            .collect();
        let fits = perm::fit(&classed);
        let with_line: Vec<&perm::ClassPerm> =
            fits.iter().filter(|f| f.line_rms_log10.is_some()).collect();
        let n_line: usize = with_line.iter().map(|f| f.samples).sum();
        let spread_log10_overall = (n_line > 0).then(|| {
            (with_line
                .iter()
                .map(|f| f.line_rms_log10.unwrap_or(0.0).powi(2) * f.samples as f64)
                .sum::<f64>()
                / n_line as f64)
                .sqrt()
        });
        // leave one well out
        let (mut r_fzi, mut r_line, mut unpredicted) = (Vec::new(), Vec::new(), 0usize);
        if wells.len() >= 2 {
            for w in &wells {
                let train: Vec<(f64, f64)> = core
                    .iter()
                    .filter(|s| &s.well != w)
                    .map(|s| (s.porosity, s.perm_md))
                    .collect();
                let fold_scheme =
                    classes::build(spec, &train).map_err(|source| SchemeBuildError {
                        scheme: name.clone(),
                        without: Some(w.clone()),
                        source,
                    })?;
                let fold_classed: Vec<(u8, f64, f64)> = train
                    .iter()
                    .filter_map(|&(p, k)| fold_scheme.classify(p, k).map(|c| (c, p, k)))
                    .collect();
                let fold_fits = perm::fit(&fold_classed);
                for s in core.iter().filter(|s| &s.well == w) {
                    let Some(c) = fold_scheme.classify(s.porosity, s.perm_md) else {
                        continue;
                    };
                    let Some(f) = fold_fits.iter().find(|f| f.class == c) else {
                        unpredicted += 1;
                        continue;
                    };
                    let lk = s.perm_md.log10();
                    r_fzi.push(lk - f.perm_fzi(s.porosity).log10());
                    r_line.push(lk - f.perm(crate::config::PermMethod::Line, s.porosity).log10());
                }
            }
        }
        out.push(SchemeComparison {
            scheme: classes::info(name, scheme.as_ref()),
            classes_used: fits.len(),
            samples_per_class: fits.iter().map(|f| (f.class, f.samples)).collect(),
            spread_log10: fits.iter().map(|f| (f.class, f.line_rms_log10)).collect(),
            spread_log10_overall,
            unclassified: phi_k.len() - classed.len(),
            lowo_rms_log10_fzi: rms(&r_fzi),
            lowo_rms_log10_line: rms(&r_line),
            lowo_samples: r_fzi.len(),
            lowo_unpredicted: unpredicted,
            wells: wells.clone(),
        });
    }
    Ok(out)
}

fn opt(v: Option<f64>) -> String {
    v.map_or_else(|| "-".into(), |x| format!("{x:.3}"))
}

/// The comparison as a readable table.
pub fn to_text(rows: &[SchemeComparison], samples: usize) -> String {
    use std::fmt::Write as _;
    let mut s = String::new();
    let _ = writeln!(
        s,
        "class schemes on {samples} core samples (log10 k residuals; lower is better)"
    );
    let _ = writeln!(
        s,
        "{:<16} {:>7} {:>12} {:>14} {:>14} {:>9}",
        "scheme", "classes", "spread", "LOWO fzi", "LOWO line", "held out"
    );
    for r in rows {
        let _ = writeln!(
            s,
            "{:<16} {:>7} {:>12} {:>14} {:>14} {:>9}",
            r.scheme.name,
            r.classes_used,
            opt(r.spread_log10_overall),
            opt(r.lowo_rms_log10_fzi),
            opt(r.lowo_rms_log10_line),
            r.lowo_samples
        );
    }
    for r in rows {
        let _ = writeln!(s, "\n{}", r.scheme.describe());
        for ((c, n), (_, sp)) in r.samples_per_class.iter().zip(&r.spread_log10) {
            let _ = writeln!(s, "  class {c}: {n:>5} samples, spread {}", opt(*sp));
        }
        if r.unclassified > 0 {
            let _ = writeln!(s, "  {} samples without a class", r.unclassified);
        }
        if r.lowo_unpredicted > 0 {
            let _ = writeln!(
                s,
                "  {} held-out samples in a class the other wells lack (not scored)",
                r.lowo_unpredicted
            );
        }
    }
    let _ = writeln!(
        s,
        "\nspread: RMS of log10 k about each class's log10 k vs porosity line, sample-weighted.\nLOWO: each well predicted from the other wells' class fits (fzi: class FZI; line: class line)."
    );
    s
}
