//! A well's interpreted interval binned by TVDSS: what the report's views
//! across wells draw of it (a field page holds a profile per well, not its
//! logs), kept during the well's run and carried in shard states.

use serde::{Deserialize, Serialize};

use crate::output::Table;
use crate::output::schema::Col;

/// A well's interpreted interval for the field cross-section: its depths in
/// zones, binned by TVDSS (a field page holds a profile per well, not its
/// logs). Empty bins hold class 0 and NaN.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct Profile {
    /// TVDSS of the top of the first bin, project depth unit.
    pub top: f64,
    /// Height of a bin, project depth unit.
    pub step: f64,
    /// Most common class of the bin's depths (0: none classed).
    pub class: Vec<u8>,
    /// Mean CLASS_PROB of the depths of that class, 0-1.
    pub prob: Vec<f32>,
    /// Mean SW, v/v.
    pub sw: Vec<f32>,
    /// Mean SWH, v/v (NaN where the model gives none).
    pub swh: Vec<f32>,
    /// Zone tops, (zone, TVDSS of the zone's first depth), shallowest first.
    pub tops: Vec<(String, f64)>,
}

impl Profile {
    /// TVDSS of the base of the last bin.
    pub fn base(&self) -> f64 {
        self.top + self.step * self.class.len() as f64
    }
}

/// Bins of a well's profile on the field cross-section.
pub const PROFILE_BINS: usize = 160;

/// A well's interpreted depths (in a zone, with TVDSS) binned by TVDSS for
/// the field cross-section: per bin the most common class with its mean
/// probability, mean SW and mean SWH; and each zone's top. `None` when no
/// depth is in a zone with a TVDSS.
pub fn profile(t: &Table, zone_of: &[Option<u16>], zone_names: &[String]) -> Option<Profile> {
    let tvdss = t.get(Col::Tvdss)?;
    let rows = || {
        tvdss
            .iter()
            .zip(zone_of)
            .enumerate()
            .filter(|(_, (z, zone))| z.is_finite() && zone.is_some())
    };
    let (lo, hi) = rows().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), (_, (z, _))| {
        (a.min(*z), b.max(*z))
    });
    if !lo.is_finite() {
        return None;
    }
    let bins = PROFILE_BINS;
    let step = ((hi - lo) / bins as f64).max(1e-6);
    let bin = |z: f64| (((z - lo) / step) as usize).min(bins - 1);
    let class_count = t
        .get(Col::Class)
        .map_or(0.0, |c| {
            c.iter()
                .filter(|v| v.is_finite())
                .fold(0.0f64, |a: f64, b: &f64| a.max(*b))
        })
        .clamp(0.0, 255.0) as usize;
    let mut votes = vec![0u32; bins * (class_count + 1)];
    let mut prob = vec![0.0f64; bins * (class_count + 1)];
    let mut sums = vec![[0.0f64; 4]; bins];
    let get = |c: Col, i: usize| t.get(c).and_then(|v| v.get(i)).copied().unwrap_or(f64::NAN);
    let mut tops: Vec<(String, f64)> = Vec::new();
    let mut seen = vec![false; zone_names.len()];
    for (i, (z, zone)) in rows() {
        let b = bin(*z);
        if let Some(k) = zone
            .map(usize::from)
            .filter(|&k| k < seen.len() && !seen[k])
        {
            seen[k] = true;
            tops.push((zone_names[k].clone(), *z));
        }
        let c = get(Col::Class, i);
        if c.is_finite() && c >= 1.0 {
            let k = b * (class_count + 1) + (c.round() as usize).min(class_count);
            votes[k] += 1;
            let p = get(Col::ClassProb, i);
            prob[k] += if p.is_finite() { p } else { 1.0 };
        }
        for (slot, col) in [(0, Col::Sw), (2, Col::Swh)] {
            let v = get(col, i);
            if v.is_finite() {
                sums[b][slot] += v;
                sums[b][slot + 1] += 1.0;
            }
        }
    }
    tops.sort_by(|a, b| a.1.total_cmp(&b.1));
    let mut p = Profile {
        top: lo,
        step,
        class: Vec::with_capacity(bins),
        prob: Vec::with_capacity(bins),
        sw: Vec::with_capacity(bins),
        swh: Vec::with_capacity(bins),
        tops,
    };
    for b in 0..bins {
        let v = &votes[b * (class_count + 1)..(b + 1) * (class_count + 1)];
        // most votes; ties to the lower class, so the result is the same on any machine
        let (best, n) = v.iter().enumerate().fold(
            (0, 0),
            |(bk, bn), (k, &n)| if n > bn { (k, n) } else { (bk, bn) },
        );
        p.class.push(u8::try_from(best).unwrap_or(u8::MAX));
        p.prob.push(if n > 0 {
            (prob[b * (class_count + 1) + best] / f64::from(n)) as f32
        } else {
            f32::NAN
        });
        let mean = |s: f64, n: f64| if n > 0.0 { (s / n) as f32 } else { f32::NAN };
        p.sw.push(mean(sums[b][0], sums[b][1]));
        p.swh.push(mean(sums[b][2], sums[b][3]));
    }
    Some(p)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::output::OutColumn;
    use crate::units::DepthUnit;

    #[test]
    fn a_profile_bins_a_well_by_tvdss() {
        // 480 depths, TVDSS 2000-2047.9 by 0.1 (3 per bin of 160): class 1
        // above 2024, class 2 below; SW = 0.2 above, 0.8 below; one zone
        // top at 2000, another at 2024
        let n = 480;
        let tvdss: Vec<f64> = (0..n).map(|i| 2000.0 + 0.1 * f64::from(i)).collect();
        let half = |a: f64, b: f64| (0..n).map(move |i| if i < 240 { a } else { b });
        let table = Table {
            columns: vec![
                OutColumn::new(
                    Col::Depth,
                    DepthUnit::Metre,
                    tvdss.iter().map(|z| z + 30.0).collect(),
                ),
                OutColumn::new(Col::Tvdss, DepthUnit::Metre, tvdss.clone()),
                OutColumn::new(Col::Class, DepthUnit::Metre, half(1.0, 2.0).collect()),
                OutColumn::new(Col::ClassProb, DepthUnit::Metre, half(0.9, 0.6).collect()),
                OutColumn::new(Col::Sw, DepthUnit::Metre, half(0.2, 0.8).collect()),
            ],
            well_items: Vec::new(),
            params: Vec::new(),
        };
        let zone_of: Vec<Option<u16>> = (0..n).map(|i| Some(u16::from(i >= 240))).collect();
        let p = profile(&table, &zone_of, &["A".into(), "B".into()]).expect("profile");
        assert_eq!(p.class.len(), PROFILE_BINS);
        assert!((p.top - 2000.0).abs() < 1e-9 && (p.base() - 2047.9).abs() < 1e-6);
        assert_eq!(p.tops, vec![("A".into(), 2000.0), ("B".into(), 2024.0)]);
        assert!(p.class[..79].iter().all(|&c| c == 1) && p.class[81..].iter().all(|&c| c == 2));
        assert!((p.prob[10] - 0.9).abs() < 1e-6 && (p.prob[150] - 0.6).abs() < 1e-6);
        assert!((p.sw[10] - 0.2).abs() < 1e-6 && (p.sw[150] - 0.8).abs() < 1e-6);
        assert!(p.swh.iter().all(|v| v.is_nan()));
        // no TVDSS, or no depth in a zone: no profile
        let none: Vec<Option<u16>> = vec![None; n as usize];
        assert!(profile(&table, &none, &[]).is_none());
    }
}
