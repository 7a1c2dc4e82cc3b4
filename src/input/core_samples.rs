//! Core plugs: porosity and permeability at sampled depths.
//!
//! Two inputs:
//! - a CSV with columns WELL, DEPTH_MD, optional DEPTH_UNIT (m or ft),
//!   POROSITY (fraction or percent, detected per file and stated) or
//!   POROSITY_FRAC / POROSITY_PCT, PERM_MD, optional GRAIN_DENSITY_GCC and SAMPLE_TYPE;
//! - the SPWLA core-data exchange format (fixed card records: 10 well,
//!   15 variable definitions, 30 sample depth, 36 description, 40 values).
//!
//! Bad rows (permeability not above zero, porosity outside 0-0.5, unreadable
//! numbers, a truncated record) are reported with their line and left out,
//! never dropped silently. Depths are in the project's depth unit.

use std::path::{Path, PathBuf};

use serde::Serialize;

use crate::input::tables::{TableError, read_csv};
use crate::units::DepthUnit;

/// Highest porosity accepted as a rock measurement, v/v (common practice).
pub const MAX_CORE_POROSITY: f64 = 0.5;

/// One core sample.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CoreSample {
    /// Well name as given: the trimmed WELL column, or the first word after
    /// an SPWLA record 10.
    pub well: String,
    /// Measured depth, project depth unit (before any core-to-log shift).
    pub depth: f64,
    /// Porosity, v/v.
    pub porosity: f64,
    /// Permeability, mD.
    pub perm_md: f64,
    /// Grain density, g/cm3; `None` when not given or NaN.
    pub grain_density_gcc: Option<f64>,
    /// SAMPLE_TYPE of the CSV; `None` when blank or absent, and always for SPWLA.
    pub sample_type: Option<String>,
    /// 1-based line of the sample in its file.
    pub line: u64,
}

/// A row that was left out, and why.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Rejected {
    /// 1-based line of the row (for SPWLA, of the line after the record's code line).
    pub line: u64,
    /// Why the row was left out.
    pub reason: String,
}

/// What a core file gave.
#[derive(Debug, Clone, Serialize)]
pub struct CoreData {
    /// The core file read.
    pub file: PathBuf,
    /// Samples kept, in file order.
    pub samples: Vec<CoreSample>,
    /// Rows left out, in file order.
    pub rejected: Vec<Rejected>,
    /// How porosity was read: "fraction" or "percent", and why.
    pub porosity_unit: String,
}

/// An error that stops reading a core file.
#[derive(Debug, thiserror::Error)]
pub enum CoreError {
    /// The core CSV cannot be read, or its header or a row does not parse.
    #[error(transparent)]
    Table(#[from] TableError),
    /// The SPWLA file cannot be read.
    #[error("cannot read `{}`", .path.display())]
    Io {
        /// The SPWLA file.
        path: PathBuf,
        /// The I/O error.
        #[source]
        source: std::io::Error,
    },
    /// A LAS 3.0 core file cannot be read as LAS.
    #[error(transparent)]
    Las(#[from] crate::input::las::LasError),
    /// The SPWLA file has no record 15, or a record 15 without a count or cut short.
    #[error("{}: {message}", .path.display())]
    Format {
        /// The SPWLA file.
        path: PathBuf,
        /// What is wrong, with the line number where there is one.
        message: String,
    },
}

#[derive(serde::Deserialize)]
struct CoreRow {
    #[serde(rename = "WELL")]
    well: String,
    #[serde(rename = "DEPTH_MD")]
    depth: f64,
    #[serde(rename = "DEPTH_UNIT", default)]
    depth_unit: Option<String>,
    #[serde(rename = "POROSITY", default)]
    porosity: Option<f64>,
    #[serde(rename = "POROSITY_FRAC", default)]
    porosity_frac: Option<f64>,
    #[serde(rename = "POROSITY_PCT", default)]
    porosity_pct: Option<f64>,
    #[serde(rename = "PERM_MD")]
    perm_md: f64,
    #[serde(rename = "GRAIN_DENSITY_GCC", default)]
    grain_density: Option<f64>,
    #[serde(rename = "SAMPLE_TYPE", default)]
    sample_type: Option<String>,
}

/// Why a core sample is left out (the reason recorded by line).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
enum SampleProblem {
    #[error("permeability {0} mD is not a finite number")]
    PermNotFinite(f64),
    #[error("permeability {0} mD is not above 0")]
    PermNotPositive(f64),
    #[error("porosity {0} is outside 0-{MAX_CORE_POROSITY}")]
    Porosity(f64),
    #[error("depth {0} is not a finite number")]
    Depth(f64),
    #[error("grain density {0} g/cm3 is not a finite number")]
    GrainDensity(f64),
}

/// Check one sample; `Err` is the reason it is left out.
fn check(porosity: f64, perm: f64) -> Result<(), SampleProblem> {
    if !perm.is_finite() {
        return Err(SampleProblem::PermNotFinite(perm));
    }
    if perm <= 0.0 {
        return Err(SampleProblem::PermNotPositive(perm));
    }
    if !(porosity.is_finite() && (0.0..=MAX_CORE_POROSITY).contains(&porosity)) {
        return Err(SampleProblem::Porosity(porosity));
    }
    Ok(())
}

/// A sample's depth in the project's unit: a finite number, or the reason to
/// leave it out (`nan` and `inf` parse as numbers, and 1e308 m overflows in
/// feet; no log depth matches any of them).
fn finite_depth(d: f64) -> Result<f64, SampleProblem> {
    if d.is_finite() {
        Ok(d)
    } else {
        Err(SampleProblem::Depth(d))
    }
}

/// Grain density as read: NaN is missing (as `nan` is in LAS data), an
/// infinity is refused.
fn grain_density(g: Option<f64>) -> Result<Option<f64>, SampleProblem> {
    match g {
        Some(g) if g.is_nan() => Ok(None),
        Some(g) if g.is_infinite() => Err(SampleProblem::GrainDensity(g)),
        g => Ok(g),
    }
}

/// Read a core CSV into the project's depth unit.
pub fn read_core_csv(path: &Path, depth: DepthUnit) -> Result<CoreData, CoreError> {
    let rows: Vec<(u64, CoreRow)> = read_csv(path)?;
    from_rows(path, rows, depth)
}

/// Read the core data set of a LAS 3.0 file (a data set named `Core...`
/// with a depth and a PERM_MD column; CWLS LAS 3.0, 'Sections', p. 9) into
/// the project's depth unit. Its columns carry the core CSV's names
/// (DEPTH_MD, or DEPT/DEPTH/MD; POROSITY, POROSITY_FRAC or POROSITY_PCT;
/// PERM_MD; optional GRAIN_DENSITY_GCC, SAMPLE_TYPE, WELL); the depth unit
/// is the depth column's, and the well the file's WELL unless a WELL column
/// gives it. Rows are checked as the CSV's are, by line.
pub fn read_core_las3(path: &Path, depth: DepthUnit) -> Result<CoreData, CoreError> {
    let fmt = |message: String| CoreError::Format {
        path: path.to_path_buf(),
        message,
    };
    let las = crate::input::las::read_path(path, crate::input::las::ReadOptions::default())?;
    let find = |set: &crate::input::las::v3::DataSet, names: &[&str]| {
        set.columns
            .iter()
            .position(|c| names.iter().any(|n| c.mnemonic.eq_ignore_ascii_case(n)))
    };
    let set = las
        .data_sets
        .iter()
        .find(|s| {
            s.name.to_ascii_uppercase().starts_with("CORE")
                && find(s, &["DEPTH_MD", "DEPT", "DEPTH", "MD"]).is_some()
                && find(s, &["PERM_MD"]).is_some()
        })
        .ok_or_else(|| {
            let names: Vec<&str> = las.data_sets.iter().map(|s| s.name.as_str()).collect();
            fmt(format!(
                "no LAS 3.0 core data set with a depth (DEPTH_MD, DEPT, DEPTH or MD) and a PERM_MD column; data sets: {}",
                if names.is_empty() { "none".to_string() } else { names.join(", ") }
            ))
        })?;
    let at = |names: &[&str]| find(set, names);
    let depth_col = at(&["DEPTH_MD", "DEPT", "DEPTH", "MD"]).unwrap_or(0);
    let unit = set.columns[depth_col].unit.clone();
    let well = las.well_name().unwrap_or("").to_string();
    let num = |row: &[String], c: Option<usize>| -> Result<Option<f64>, String> {
        match c.map(|c| row[c].trim()) {
            None | Some("") => Ok(None),
            Some(t) => t
                .parse::<f64>()
                .map(Some)
                .map_err(|_| format!("`{t}` is not a number")),
        }
    };
    let cols = (
        at(&["POROSITY"]),
        at(&["POROSITY_FRAC"]),
        at(&["POROSITY_PCT"]),
        at(&["PERM_MD"]),
        at(&["GRAIN_DENSITY_GCC"]),
        at(&["SAMPLE_TYPE"]),
        at(&["WELL"]),
    );
    let mut rows = Vec::new();
    let mut rejected = Vec::new();
    for (row, &line) in set.rows.iter().zip(&set.row_lines) {
        let parsed = (|| -> Result<CoreRow, String> {
            Ok(CoreRow {
                well: cols.6.map_or_else(|| well.clone(), |c| row[c].clone()),
                depth: num(row, Some(depth_col))?.unwrap_or(f64::NAN),
                depth_unit: (!unit.is_empty()).then(|| unit.clone()),
                porosity: num(row, cols.0)?,
                porosity_frac: num(row, cols.1)?,
                porosity_pct: num(row, cols.2)?,
                perm_md: num(row, cols.3)?.unwrap_or(f64::NAN),
                grain_density: num(row, cols.4)?,
                sample_type: cols.5.map(|c| row[c].clone()),
            })
        })();
        match parsed {
            Ok(r) => rows.push((line as u64, r)),
            Err(reason) => rejected.push(Rejected {
                line: line as u64,
                reason,
            }),
        }
    }
    let mut data = from_rows(path, rows, depth)?;
    data.rejected.extend(rejected);
    data.rejected.sort_by_key(|r| r.line);
    Ok(data)
}

/// Core samples from parsed rows (line, row): porosity unit settled once
/// for the file, every row checked, bad rows left out with their line.
fn from_rows(
    path: &Path,
    rows: Vec<(u64, CoreRow)>,
    depth: DepthUnit,
) -> Result<CoreData, CoreError> {
    // a POROSITY column without a unit: percent when any value is above 1
    let plain: Vec<f64> = rows
        .iter()
        .filter_map(|(_, r)| r.porosity)
        .filter(|v| v.is_finite())
        .collect();
    let plain_is_percent = plain.iter().any(|&v| v > 1.0);
    let porosity_unit = if rows.iter().any(|(_, r)| r.porosity.is_some()) {
        if plain_is_percent {
            "percent (a POROSITY value above 1)".to_string()
        } else {
            "fraction (every POROSITY value is 1 or less)".to_string()
        }
    } else if rows.iter().any(|(_, r)| r.porosity_pct.is_some()) {
        "percent (POROSITY_PCT)".to_string()
    } else {
        "fraction (POROSITY_FRAC)".to_string()
    };
    let mut samples = Vec::new();
    let mut rejected = Vec::new();
    for (line, r) in rows {
        let porosity = match (r.porosity_frac, r.porosity_pct, r.porosity) {
            (Some(f), None, None) => f,
            (None, Some(p), None) => p / 100.0,
            (None, None, Some(v)) => {
                if plain_is_percent {
                    v / 100.0
                } else {
                    v
                }
            }
            _ => {
                rejected.push(Rejected {
                    line,
                    reason: "give exactly one of POROSITY, POROSITY_FRAC, POROSITY_PCT".into(),
                });
                continue;
            }
        };
        let unit = match DepthUnit::from_optional(r.depth_unit.as_deref(), depth) {
            Ok(u) => u,
            Err(e) => {
                rejected.push(Rejected {
                    line,
                    reason: e.to_string(),
                });
                continue;
            }
        };
        let checked = check(porosity, r.perm_md)
            .and_then(|()| finite_depth(r.depth * unit.factor_to(depth)))
            .and_then(|d| Ok((d, grain_density(r.grain_density)?)));
        let (d, grain) = match checked {
            Ok(v) => v,
            Err(e) => {
                rejected.push(Rejected {
                    line,
                    reason: e.to_string(),
                });
                continue;
            }
        };
        samples.push(CoreSample {
            well: r.well.trim().to_string(),
            depth: d,
            porosity,
            perm_md: r.perm_md,
            grain_density_gcc: grain,
            sample_type: r.sample_type.filter(|s| !s.trim().is_empty()),
            line,
        });
    }
    Ok(CoreData {
        file: path.to_path_buf(),
        samples,
        rejected,
        porosity_unit,
    })
}

/// A variable of an SPWLA file's record 15.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SpwlaVariable {
    /// The variable's code: the first word of its line.
    pub code: String,
    /// The text after the last run of three spaces on its line.
    pub description: String,
}

/// Which SPWLA variables give porosity and permeability: the first whose
/// description matches, in order of preference (common practice: horizontal
/// plugs; Klinkenberg-corrected permeability before uncorrected).
fn pick(vars: &[SpwlaVariable], wants: &[&[&str]]) -> Option<usize> {
    wants.iter().find_map(|words| {
        vars.iter().position(|v| {
            let d = v.description.to_ascii_lowercase();
            words.iter().all(|w| d.contains(w))
        })
    })
}

/// Read an SPWLA core-data file (depths in metres unless the caller says
/// otherwise; values below its null are missing). Porosity values above 1 are
/// read as percent.
pub fn read_spwla(
    path: &Path,
    file_depth: DepthUnit,
    depth: DepthUnit,
) -> Result<(CoreData, Vec<SpwlaVariable>), CoreError> {
    let bytes = std::fs::read(path).map_err(|source| CoreError::Io {
        path: path.to_path_buf(),
        source,
    })?;
    let text = String::from_utf8_lossy(&bytes);
    let lines: Vec<&str> = text.lines().collect();
    let fmt = |message: String| CoreError::Format {
        path: path.to_path_buf(),
        message,
    };
    let code = |l: &str| l.get(0..2).map(str::trim).unwrap_or("").to_string();
    let mut well = String::new();
    let mut vars: Vec<SpwlaVariable> = Vec::new();
    let mut samples = Vec::new();
    let mut rejected = Vec::new();
    let mut i = 0;
    let mut depth_now: Option<(f64, u64)> = None;
    let (mut phi_i, mut k_i, mut gd_i) = (None, None, None);
    while i < lines.len() {
        let l = lines[i];
        match code(l).as_str() {
            "10" => {
                well = lines
                    .get(i + 1)
                    .map(|s| s.split_whitespace().next().unwrap_or("").to_string())
                    .unwrap_or_default();
                i += 3;
            }
            "15" => {
                let n: usize = l
                    .split_whitespace()
                    .nth(1)
                    .and_then(|v| v.parse().ok())
                    .ok_or_else(|| {
                        fmt(format!("line {}: record 15 has no variable count", i + 1))
                    })?;
                for k in 0..n {
                    let v = lines
                        .get(i + 1 + k)
                        .ok_or_else(|| fmt(format!("line {}: record 15 ends early", i + 1)))?;
                    let code = v.split_whitespace().next().unwrap_or("").to_string();
                    // the description follows the laboratory name: take the text after the last run of 3+ spaces
                    let description = v
                        .trim_end()
                        .rsplit("   ")
                        .next()
                        .unwrap_or("")
                        .trim()
                        .to_string();
                    vars.push(SpwlaVariable { code, description });
                }
                phi_i = pick(
                    &vars,
                    &[
                        &["porosity", "hor"],
                        &["porosity", "summation"],
                        &["porosity"],
                    ],
                );
                k_i = pick(
                    &vars,
                    &[&["klinkenberg", "hor"], &["perm", "hor"], &["perm"]],
                );
                gd_i = pick(&vars, &[&["grain density"]]);
                i += 1 + n;
            }
            "30" => {
                let line_no = (i + 2) as u64;
                let d = lines
                    .get(i + 1)
                    .and_then(|s| s.split_whitespace().next())
                    .and_then(|v| v.parse::<f64>().ok())
                    .map(|d| d * file_depth.factor_to(depth))
                    .filter(|d| d.is_finite());
                depth_now = d.map(|d| (d, line_no));
                if d.is_none() {
                    rejected.push(Rejected {
                        line: line_no,
                        reason: "sample depth is not a finite number".into(),
                    });
                }
                i += 2;
            }
            "40" => {
                let n: usize = l
                    .split_whitespace()
                    .nth(2)
                    .and_then(|v| v.parse().ok())
                    .unwrap_or(vars.len());
                // sized by the variables read, never by the record's own count:
                // a damaged count (billions) must not become an allocation
                let mut values: Vec<Option<f64>> = Vec::with_capacity(n.min(vars.len()));
                let mut j = i + 1;
                let mut bad = false;
                while values.len() < n && j < lines.len() && code(lines[j]).parse::<u32>().is_err()
                {
                    for tok in lines[j].split_whitespace() {
                        match tok.parse::<f64>() {
                            // the format's null is -1002 (and any value at or below -999)
                            Ok(v) if v > -999.0 => values.push(Some(v)),
                            Ok(_) => values.push(None),
                            Err(_) => bad = true,
                        }
                    }
                    j += 1;
                }
                let line_no = (i + 2) as u64;
                i = j;
                let Some((d, _)) = depth_now.take() else {
                    continue;
                };
                if bad || values.len() != n {
                    rejected.push(Rejected {
                        line: line_no,
                        reason: format!(
                            "value record has {} readable values of {n} (truncated or malformed)",
                            values.len()
                        ),
                    });
                    continue;
                }
                let get = |k: Option<usize>| k.and_then(|k| values.get(k).copied().flatten());
                let (Some(phi_raw), Some(k)) = (get(phi_i), get(k_i)) else {
                    rejected.push(Rejected {
                        line: line_no,
                        reason: "no porosity or no permeability in this sample".into(),
                    });
                    continue;
                };
                let porosity = if phi_raw > 1.0 {
                    phi_raw / 100.0
                } else {
                    phi_raw
                };
                let grain = match check(porosity, k).and_then(|()| grain_density(get(gd_i))) {
                    Ok(g) => g,
                    Err(e) => {
                        rejected.push(Rejected {
                            line: line_no,
                            reason: e.to_string(),
                        });
                        continue;
                    }
                };
                samples.push(CoreSample {
                    well: well.clone(),
                    depth: d,
                    porosity,
                    perm_md: k,
                    grain_density_gcc: grain,
                    sample_type: None,
                    line: line_no,
                });
            }
            _ => i += 1,
        }
    }
    if vars.is_empty() {
        return Err(fmt(
            "no record 15 (variable definitions): not an SPWLA core-data file".into(),
        ));
    }
    let porosity_unit = match phi_i {
        Some(k) => format!(
            "percent when above 1; porosity from `{}`, permeability from `{}`",
            vars[k].description,
            k_i.map_or("none", |k| vars[k].description.as_str())
        ),
        None => "no porosity variable".into(),
    };
    Ok((
        CoreData {
            file: path.to_path_buf(),
            samples,
            rejected,
            porosity_unit,
        },
        vars,
    ))
}

/// A suggested core-to-log depth shift.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ShiftSuggestion {
    /// Add this to core depths to put them on log depth (project depth unit):
    /// the best shift when it raises the correlation by at least the minimum
    /// gain, else 0 (the profile does not tell shifts that small apart).
    pub shift: f64,
    /// The shift of highest correlation, whatever its gain.
    pub best_shift: f64,
    /// Correlation of core porosity with log porosity at that shift.
    pub correlation: f64,
    /// Correlation with no shift, for comparison.
    pub correlation_unshifted: f64,
    /// Core samples that fell inside the log at the best shift.
    pub samples: usize,
}

/// The shift within ±`window` (in steps of `step`) that best correlates core
/// porosity with log porosity (interpolated linearly at the shifted core
/// depths). Common practice for depth-matching core to logs; reported to the
/// user, who accepts it in the config. A shift is suggested only when it raises
/// the correlation by at least `min_gain` over no shift: over thick beds the
/// correlation is flat within a bed's width, and a shift there is noise.
/// `None` without enough overlap.
pub fn suggest_shift(
    core: &[CoreSample],
    log_depth: &[f64],
    log_phi: &[f64],
    window: f64,
    step: f64,
    min_gain: f64,
) -> Option<ShiftSuggestion> {
    let pairs_at = |shift: f64| -> Vec<(f64, f64)> {
        core.iter()
            .map(|c| {
                (
                    c.porosity,
                    crate::stats::interpolate(log_depth, log_phi, c.depth + shift)
                        .unwrap_or(f64::NAN),
                )
            })
            .filter(|(a, b)| a.is_finite() && b.is_finite())
            .collect()
    };
    let n = (window / step).floor() as i64;
    let mut best: Option<(f64, f64, usize)> = None;
    for k in -n..=n {
        let shift = k as f64 * step;
        let pairs = pairs_at(shift);
        let r = crate::stats::correlation(&pairs);
        if r.is_finite() && best.is_none_or(|(_, br, _)| r > br) {
            best = Some((shift, r, pairs.len()));
        }
    }
    let (best_shift, correlation_best, samples) = best?;
    let correlation_unshifted = crate::stats::correlation(&pairs_at(0.0));
    let shift = if correlation_best - correlation_unshifted >= min_gain {
        best_shift
    } else {
        0.0
    };
    Some(ShiftSuggestion {
        shift,
        best_shift,
        correlation: correlation_best,
        correlation_unshifted,
        samples,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A log porosity profile sampled every 0.1 m and core taken from it 0.6 m
    /// too deep: the suggestion is −0.6 m with a correlation of 1 (constructed case).
    #[test]
    fn shift_recovers_a_constructed_offset() {
        let depth: Vec<f64> = (0..400).map(|i| 1000.0 + 0.1 * f64::from(i)).collect();
        let phi: Vec<f64> = depth
            .iter()
            .map(|d| 0.15 + 0.08 * (d * 1.7).sin() * (d * 0.31).cos())
            .collect();
        let core: Vec<CoreSample> = (0..60)
            .map(|i| {
                let d = 1005.0 + 0.45 * f64::from(i);
                CoreSample {
                    well: "W".into(),
                    depth: d + 0.6,
                    porosity: crate::stats::interpolate(&depth, &phi, d).unwrap_or(f64::NAN),
                    perm_md: 1.0,
                    grain_density_gcc: None,
                    sample_type: None,
                    line: 0,
                }
            })
            .collect();
        let s = suggest_shift(&core, &depth, &phi, 2.0, 0.05, 0.01).expect("overlap");
        assert!((s.shift + 0.6).abs() < 1e-9, "{s:?}");
        assert!(s.correlation > 0.999 && s.correlation_unshifted < s.correlation);
    }

    #[test]
    fn csv_percent_detected_and_bad_rows_reported() {
        let dir = tempfile::tempdir().expect("temp dir");
        let p = dir.path().join("core.csv");
        std::fs::write(&p, "WELL,DEPTH_MD,DEPTH_UNIT,POROSITY,PERM_MD\nA,1000,ft,18.5,120\nA,1001,ft,21,0\nA,1002,ft,55,10\nB,300,m,12.0,1.5\n").expect("write");
        let c = read_core_csv(&p, DepthUnit::Metre).expect("readable");
        assert_eq!(c.porosity_unit, "percent (a POROSITY value above 1)");
        assert_eq!(c.samples.len(), 2);
        assert!((c.samples[0].depth - 304.8).abs() < 1e-9);
        assert!((c.samples[0].porosity - 0.185).abs() < 1e-12);
        assert_eq!(
            c.rejected,
            vec![
                Rejected {
                    line: 3,
                    reason: "permeability 0 mD is not above 0".into()
                },
                Rejected {
                    line: 4,
                    reason: "porosity 0.55 is outside 0-0.5".into()
                },
            ]
        );
    }
}
