//! Zones: a tops table (well, zone, top MD) splits each well into intervals.
//!
//! A zone runs from its top to the next top of the same well; the deepest
//! zone runs to the end of the log. Depths above the first top are outside any
//! zone: they are reported and not processed (computed curves missing, FLAG
//! bit OUTSIDE_ZONE). Without a tops table the whole well is one zone, `ALL`.

use std::collections::BTreeMap;
use std::path::Path;

use serde::Deserialize;

use crate::input::tables::{TableError, read_csv};
use crate::units::{DepthUnit, METRES_PER_FOOT};

/// The zone name used when no tops table is given.
pub const WHOLE_WELL: &str = "ALL";

#[derive(Debug, Deserialize)]
struct TopRow {
    #[serde(rename = "WELL")]
    well: String,
    #[serde(rename = "ZONE")]
    zone: String,
    #[serde(rename = "TOP_MD")]
    top_md: f64,
    /// `m` or `ft`; when absent the project's depth unit.
    #[serde(rename = "DEPTH_UNIT", default)]
    depth_unit: Option<String>,
}

/// Zone tops of every well, in the project's depth unit, sorted by depth.
#[derive(Debug, Clone, Default)]
pub struct Tops {
    /// Upper-cased well name → (top MD, zone name), sorted by MD.
    by_well: BTreeMap<String, Vec<(f64, String)>>,
}

impl Tops {
    /// Read a tops CSV with columns WELL, ZONE, TOP_MD and optional DEPTH_UNIT.
    pub fn read(path: &Path, depth: DepthUnit) -> Result<Tops, TableError> {
        let rows: Vec<(u64, TopRow)> = read_csv(path)?;
        let mut by_well: BTreeMap<String, Vec<(f64, String)>> = BTreeMap::new();
        for (line, r) in rows {
            let unit = DepthUnit::from_optional(r.depth_unit.as_deref(), depth).map_err(|e| {
                TableError::Row {
                    path: path.to_path_buf(),
                    line,
                    message: e.to_string(),
                }
            })?;
            if !r.top_md.is_finite() {
                return Err(TableError::Row {
                    path: path.to_path_buf(),
                    line,
                    message: "TOP_MD is not a finite number".into(),
                });
            }
            by_well
                .entry(r.well.trim().to_ascii_uppercase())
                .or_default()
                .push((r.top_md * unit.factor_to(depth), r.zone.trim().to_string()));
        }
        for tops in by_well.values_mut() {
            tops.sort_by(|a, b| a.0.total_cmp(&b.0));
        }
        Ok(Tops { by_well })
    }

    /// The tops of a well (matched case-insensitively on any of `names`).
    pub fn of_well(&self, names: &[&str]) -> Option<&[(f64, String)]> {
        names
            .iter()
            .find_map(|n| self.by_well.get(&n.trim().to_ascii_uppercase()))
            .map(Vec::as_slice)
    }
}

/// Zone of each depth sample: index into the returned names, or `None` above
/// the first top. Without tops, every sample is in zone 0, [`WHOLE_WELL`].
pub fn assign(md: &[f64], tops: Option<&[(f64, String)]>) -> (Vec<String>, Vec<Option<u16>>) {
    match tops {
        None => (vec![WHOLE_WELL.to_string()], vec![Some(0); md.len()]),
        Some(tops) => {
            let names: Vec<String> = tops.iter().map(|(_, z)| z.clone()).collect();
            let zone = md
                .iter()
                .map(|&d| {
                    let k = tops.partition_point(|(t, _)| *t <= d);
                    if k == 0 {
                        None
                    } else {
                        u16::try_from(k - 1).ok()
                    }
                })
                .collect();
            (names, zone)
        }
    }
}

/// Feet to metres, for tables that give depths in feet.
pub fn ft_to_m(v: f64) -> f64 {
    v * METRES_PER_FOOT
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zones_from_tops() {
        let tops = vec![(100.0, "A".to_string()), (110.0, "B".to_string())];
        let (names, z) = assign(&[95.0, 100.0, 105.0, 110.0, 200.0], Some(&tops));
        assert_eq!(names, vec!["A", "B"]);
        assert_eq!(z, vec![None, Some(0), Some(0), Some(1), Some(1)]);
        let (names, z) = assign(&[1.0, 2.0], None);
        assert_eq!(
            (names, z),
            (vec![WHOLE_WELL.to_string()], vec![Some(0), Some(0)])
        );
    }

    #[test]
    fn tops_csv_with_units_and_errors() {
        let dir = tempfile::tempdir().expect("temp dir");
        let p = dir.path().join("tops.csv");
        std::fs::write(
            &p,
            "WELL,ZONE,TOP_MD,DEPTH_UNIT\nW-1,Upper,1000,ft\nW-1,Lower,300,m\n",
        )
        .expect("write");
        let t = Tops::read(&p, DepthUnit::Metre).expect("valid");
        let w = t.of_well(&["w-1"]).expect("found");
        assert_eq!(w[0], (300.0, "Lower".to_string()));
        assert!((w[1].0 - 304.8).abs() < 1e-9);
        std::fs::write(&p, "WELL,ZONE,TOP_MD\nW-1,Upper,abc\n").expect("write");
        let e = Tops::read(&p, DepthUnit::Metre).expect_err("bad number");
        assert_eq!(
            e.to_string(),
            format!("{}:2: column 3: invalid float literal", p.display())
        );
    }
}
