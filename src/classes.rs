//! Hydraulic (flow-unit) classes of core samples.
//!
//! A class scheme maps a sample's porosity and permeability to a class number,
//! 1 for the poorest rock upward, and names its boundaries so that every
//! output carrying a class can say which scheme made it. Each scheme is one
//! small type behind [`ClassScheme`].
//!
//! Schemes: [`FziLadder`] (boundaries in FZI, explicit or geometric) and
//! [`PortSize`] (Winland R35 pore-throat size classes).

pub mod compare;
pub mod core_match;
pub mod features;
pub mod posterior;
pub mod predictor;
pub mod sequence;
pub mod stage;

pub mod clusters;
pub mod flow_units;
pub mod perm;

use flow_units::{fzi, winland_r35};

/// A way of assigning classes from core porosity (v/v) and permeability (mD).
pub trait ClassScheme: Send + Sync {
    /// The scheme's name, written beside every class it assigns.
    fn name(&self) -> String;
    /// The boundaries, ascending, in the scheme's own quantity (µm of FZI or R35).
    fn boundaries(&self) -> Vec<f64>;
    /// The quantity the boundaries are in, with its unit.
    fn quantity(&self) -> &'static str;
    /// Number of classes (boundaries + 1).
    fn class_count(&self) -> usize {
        self.boundaries().len() + 1
    }
    /// Class 1..=class_count of a sample, `None` when undefined (k or φ not positive).
    fn classify(&self, phi: f64, k_md: f64) -> Option<u8> {
        if !(phi > 0.0 && phi < 1.0 && k_md > 0.0) {
            return None;
        }
        class_of(self.value(phi, k_md), &self.boundaries())
    }
    /// The scheme's quantity for a sample.
    fn value(&self, phi: f64, k_md: f64) -> f64;
}

/// Class number of `v` between ascending `bounds`: half-open intervals, a value
/// on a boundary goes to the upper class (formulas.md §5 and §10).
///
/// ```
/// use flowzone::classes::class_of;
/// // the doubling FZI ladder's first bounds (formulas.md §5): 2.0 µm goes up
/// assert_eq!(class_of(2.0, &[0.5, 1.0, 2.0, 4.0]), Some(4));
/// assert_eq!(class_of(0.3, &[0.5, 1.0, 2.0, 4.0]), Some(1));
/// ```
pub fn class_of(v: f64, bounds: &[f64]) -> Option<u8> {
    if !v.is_finite() {
        return None;
    }
    u8::try_from(bounds.partition_point(|&b| b <= v) + 1).ok()
}

/// Classes by FZI (Amaefule et al. 1993) between given boundaries.
#[derive(Debug, Clone, PartialEq)]
pub struct FziLadder {
    /// FZI boundaries, µm, ascending.
    pub bounds: Vec<f64>,
}

impl FziLadder {
    /// Boundaries start, start·ratio, ... (`count` of them): a geometric ladder
    /// (a design choice, e.g. the doubling ladder of formulas.md §5).
    pub fn geometric(start: f64, ratio: f64, count: usize) -> FziLadder {
        FziLadder {
            bounds: (0..count).map(|j| start * ratio.powi(j as i32)).collect(),
        }
    }
}

impl ClassScheme for FziLadder {
    fn name(&self) -> String {
        "fzi-ladder".into()
    }
    fn boundaries(&self) -> Vec<f64> {
        self.bounds.clone()
    }
    fn quantity(&self) -> &'static str {
        "FZI (um)"
    }
    fn value(&self, phi: f64, k_md: f64) -> f64 {
        fzi(k_md, phi)
    }
}

/// Pore-throat size classes from Winland R35. Default boundaries 0.1, 0.5, 2
/// and 10 µm: nano, micro, meso, macro, mega (Martin, Solomon & Hartmann 1997,
/// AAPG Bulletin 81(5); nanoport after Hartmann & Beaumont 1999; from memory,
/// as recommended in formulas.md §10). Class 1 is nanoport.
#[derive(Debug, Clone, PartialEq)]
pub struct PortSize {
    /// R35 boundaries, µm, ascending.
    pub bounds: Vec<f64>,
}

/// Published port-size boundaries, µm of R35.
pub const PORT_SIZE_BOUNDS_UM: [f64; 4] = [0.1, 0.5, 2.0, 10.0];

impl Default for PortSize {
    fn default() -> Self {
        PortSize {
            bounds: PORT_SIZE_BOUNDS_UM.to_vec(),
        }
    }
}

impl ClassScheme for PortSize {
    fn name(&self) -> String {
        "port-size-r35".into()
    }
    fn boundaries(&self) -> Vec<f64> {
        self.bounds.clone()
    }
    fn quantity(&self) -> &'static str {
        "R35 (um)"
    }
    fn value(&self, phi: f64, k_md: f64) -> f64 {
        winland_r35(k_md, phi)
    }
}

/// Classes from a Gaussian mixture fitted to the core's log10 FZI
/// ([`clusters::fit_log_fzi`]); boundaries where adjacent components' weighted
/// densities are equal.
#[derive(Debug, Clone, PartialEq)]
pub struct FziClusters {
    /// The mixture fitted to the core; its `boundaries_um` are the class boundaries.
    pub fit: clusters::MixtureFit,
}

impl ClassScheme for FziClusters {
    fn name(&self) -> String {
        "fzi-clusters".into()
    }
    fn boundaries(&self) -> Vec<f64> {
        self.fit.boundaries_um.clone()
    }
    fn quantity(&self) -> &'static str {
        "FZI (um)"
    }
    fn value(&self, phi: f64, k_md: f64) -> f64 {
        fzi(k_md, phi)
    }
}

/// Floor of a cluster's spread in log10 FZI, so a component cannot collapse
/// onto a few equal samples (a design choice: a factor of 1.05 in FZI).
pub const CLUSTER_MIN_SD_LOG10: f64 = 0.02;

/// Why a configured scheme cannot be built.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SchemeError {
    /// An FZI ladder with neither bounds nor a full geometric series.
    #[error("give either bounds, or start, ratio and count")]
    LadderSpec,
    /// The FZI clusters cannot be fitted to the core.
    #[error(transparent)]
    Clusters(#[from] clusters::ClusterError),
}

/// Build a configured scheme; data-driven schemes are fitted to `core`
/// (φ v/v, k mD pairs).
pub fn build(
    spec: &crate::config::SchemeSpec,
    core: &[(f64, f64)],
) -> Result<Box<dyn ClassScheme>, SchemeError> {
    use crate::config::SchemeSpec;
    Ok(match spec {
        SchemeSpec::FziLadder {
            bounds: Some(b), ..
        } => Box::new(FziLadder { bounds: b.clone() }),
        SchemeSpec::FziLadder {
            start: Some(s),
            ratio: Some(r),
            count: Some(n),
            ..
        } => Box::new(FziLadder::geometric(*s, *r, *n)),
        SchemeSpec::FziLadder { .. } => {
            return Err(SchemeError::LadderSpec);
        }
        SchemeSpec::PortSize { bounds } => Box::new(PortSize {
            bounds: bounds
                .clone()
                .unwrap_or_else(|| PORT_SIZE_BOUNDS_UM.to_vec()),
        }),
        SchemeSpec::FziClusters {
            max_classes,
            min_samples_per_class,
        } => {
            let values: Vec<f64> = core.iter().map(|(p, k)| fzi(*k, *p)).collect();
            Box::new(FziClusters {
                fit: clusters::fit_log_fzi(
                    &values,
                    *max_classes,
                    *min_samples_per_class,
                    CLUSTER_MIN_SD_LOG10,
                )?,
            })
        }
    })
}

/// The name, kind, quantity and boundaries of a scheme, for outputs.
pub fn info(
    name: &str,
    scheme: &dyn ClassScheme,
) -> crate::classes::predictor::model_file::SchemeInfo {
    crate::classes::predictor::model_file::SchemeInfo {
        name: name.to_string(),
        kind: scheme.name(),
        quantity: scheme.quantity().to_string(),
        boundaries: scheme.boundaries(),
        class_count: scheme.class_count(),
    }
}

/// A scheme as recorded in a model file classifies samples too: the
/// quantity it names (R35 or FZI) between its recorded boundaries.
impl ClassScheme for crate::classes::predictor::model_file::SchemeInfo {
    fn name(&self) -> String {
        self.kind.clone()
    }
    fn boundaries(&self) -> Vec<f64> {
        self.boundaries.clone()
    }
    fn quantity(&self) -> &'static str {
        if self.quantity.starts_with("R35") {
            "R35 (um)"
        } else {
            "FZI (um)"
        }
    }
    fn value(&self, phi: f64, k_md: f64) -> f64 {
        if self.quantity.starts_with("R35") {
            winland_r35(k_md, phi)
        } else {
            fzi(k_md, phi)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Source: formulas.md §5, doubling ladder F0 = 0.25 µm: bounds 0.25, 0.5,
    /// 1, 2, 4, 8, 16, 32; FZI 2.8085 is in [2, 4); a value on a boundary goes up.
    /// (The sheet numbers classes from floor(log2(FZI/F0)); ours start at 1 below
    /// the first boundary, so sheet class j is our class j + 2.)
    #[test]
    fn doubling_ladder() {
        let l = FziLadder::geometric(0.25, 2.0, 8);
        assert_eq!(l.bounds, vec![0.25, 0.5, 1.0, 2.0, 4.0, 8.0, 16.0, 32.0]);
        for (f, sheet) in [(0.3, 0), (0.9, 1), (2.8085, 3), (7.0, 4)] {
            assert_eq!(class_of(f, &l.bounds), Some(sheet + 2), "FZI {f}");
        }
        assert_eq!(class_of(0.1, &l.bounds), Some(1));
        assert_eq!(class_of(2.0, &l.bounds), Some(5));
        assert_eq!(class_of(1.999_999, &l.bounds), Some(4));
        // k 100 mD, φ 0.20 → FZI 2.8085 (formulas.md §5)
        assert_eq!(l.classify(0.20, 100.0), Some(5));
        assert_eq!(l.classify(0.20, 0.0), None);
    }

    /// Source: formulas.md §6 boundary test: Ka 10 mD, φ 15 % → R35 2.0131 µm,
    /// a macroport (class 4 of 5) just above the 2 µm line; 9.8899 mD → exactly
    /// 2.0000, which also goes up (half-open intervals). 1 mD at 10 % → 0.738 µm, mesoport.
    #[test]
    fn port_size_boundaries() {
        let p = PortSize::default();
        assert_eq!(p.classify(0.15, 10.0), Some(4));
        assert_eq!(p.classify(0.15, 9.88), Some(3));
        assert_eq!(p.classify(0.10, 1.0), Some(3));
        assert_eq!(p.classify(0.08, 0.1), Some(2));
        assert_eq!(p.classify(0.25, 1000.0), Some(5));
        assert_eq!(p.class_count(), 5);
    }
}
