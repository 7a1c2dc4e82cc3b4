//! Where a run's time goes: seconds per stage of the well chain, summed over
//! wells (so on N threads they add up to about N times the wall time), and
//! the steps before and after the wells, timed once.
//!
//! Timings go to `run-manifest.json` only (and to stderr with
//! `run --timings`): every other output is byte-identical from run to run,
//! and timings never are.

use std::time::{Duration, Instant};

use serde::Serialize;

/// A stage of one well's work, in chain order.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Stage {
    /// Reading the file, hashing its bytes and parsing the LAS.
    Read,
    /// Curves and units, depth reference, zones, shale volume, porosity, SW.
    Logs,
    /// Class prediction (with the saturation-height evidence), PERM and class-aware SW.
    Classes,
    /// Height above the FWL and SWH.
    SaturationHeight,
    /// The audit of every saturation step.
    Contacts,
    /// The per-zone summary.
    ZoneSummary,
    /// The Monte Carlo over the parameters given as distributions.
    Uncertainty,
    /// The per-well tables (LAS, CSV, Parquet under `wells/`).
    WellFiles,
    /// The well's part of the field table (`field/curves/`).
    FieldTable,
    /// The well's report page and plots.
    ReportPage,
}

impl Stage {
    /// Every stage, in chain order.
    pub const ALL: [Stage; 10] = [
        Stage::Read,
        Stage::Logs,
        Stage::Classes,
        Stage::SaturationHeight,
        Stage::Contacts,
        Stage::ZoneSummary,
        Stage::Uncertainty,
        Stage::WellFiles,
        Stage::FieldTable,
        Stage::ReportPage,
    ];

    /// The stage's name in the manifest and on stderr.
    pub fn name(self) -> &'static str {
        match self {
            Stage::Read => "read",
            Stage::Logs => "logs",
            Stage::Classes => "classes",
            Stage::SaturationHeight => "saturation-height",
            Stage::Contacts => "contacts",
            Stage::ZoneSummary => "zone summary",
            Stage::Uncertainty => "uncertainty (Monte Carlo)",
            Stage::WellFiles => "well files",
            Stage::FieldTable => "field table",
            Stage::ReportPage => "report page",
        }
    }
}

/// Seconds spent in each [`Stage`] by one well, or summed over wells.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct StageTimes([f64; Stage::ALL.len()]);

impl StageTimes {
    /// Add `d` to stage `s`.
    pub fn add(&mut self, s: Stage, d: Duration) {
        self.0[s as usize] += d.as_secs_f64();
    }

    /// Run `f`, adding its time to stage `s`.
    pub fn time<T>(&mut self, s: Stage, f: impl FnOnce() -> T) -> T {
        let t = Instant::now();
        let r = f();
        self.add(s, t.elapsed());
        r
    }

    /// Seconds in stage `s`.
    pub fn get(&self, s: Stage) -> f64 {
        self.0[s as usize]
    }

    /// Add every stage of `other`.
    pub fn absorb(&mut self, other: &StageTimes) {
        for (a, b) in self.0.iter_mut().zip(other.0) {
            *a += b;
        }
    }

    /// Whether nothing was timed (a merge, whose wells ran in shards).
    pub fn is_empty(&self) -> bool {
        self.0.iter().all(|&s| s == 0.0)
    }
}

/// One timed step and its seconds.
#[derive(Debug, Clone, Serialize, PartialEq)]
pub struct Timed {
    /// What was timed.
    pub step: String,
    /// Seconds (wall time for one-off steps, summed thread time for well stages).
    pub seconds: f64,
}

impl Timed {
    /// `step`, timed from `start` to now.
    pub fn since(step: &str, start: Instant) -> Timed {
        Timed {
            step: step.into(),
            seconds: round_ms(start.elapsed().as_secs_f64()),
        }
    }
}

/// A run's timings, as `run-manifest.json` holds them.
#[derive(Debug, Clone, Serialize, Default, PartialEq)]
pub struct RunTimings {
    /// Before the wells, wall seconds: checks and tables, the class model
    /// (core matching and training, or loading), the saturation-height model,
    /// the choice of the saturation-height evidence's weight.
    pub setup: Vec<Timed>,
    /// Wall seconds from the first well started to the last finished.
    pub wells_wall_seconds: f64,
    /// Per stage, seconds summed over wells (thread time; empty for a merge,
    /// whose wells ran in the shards).
    pub well_stages: Vec<Timed>,
    /// After the wells, wall seconds: the field outputs, the field page, the
    /// manifest's hashes of the tables and config.
    pub finish: Vec<Timed>,
}

impl RunTimings {
    /// Record the summed well stages (none when nothing was timed).
    pub fn set_well_stages(&mut self, sum: &StageTimes) {
        self.well_stages = if sum.is_empty() {
            Vec::new()
        } else {
            Stage::ALL
                .iter()
                .map(|&s| Timed {
                    step: s.name().into(),
                    seconds: round_ms(sum.get(s)),
                })
                .collect()
        };
    }

    /// The timings as a table for stderr.
    pub fn table(&self) -> String {
        use std::fmt::Write as _;
        let mut s = String::from("timings (s):\n");
        let mut block = |title: &str, rows: &[Timed]| {
            if rows.is_empty() {
                return;
            }
            let _ = writeln!(s, "  {title}");
            for r in rows {
                let _ = writeln!(s, "    {:<44} {:>9.3}", r.step, r.seconds);
            }
        };
        block("before the wells (wall)", &self.setup);
        block(
            "well stages (summed over wells and threads)",
            &self.well_stages,
        );
        block("after the wells (wall)", &self.finish);
        let _ = writeln!(
            s,
            "  wells, first started to last finished (wall) {:>9.3}",
            self.wells_wall_seconds
        );
        s
    }
}

/// Run `f` and push its wall time to `into` as `step`.
pub fn timed<T>(into: &mut Vec<Timed>, step: &str, f: impl FnOnce() -> T) -> T {
    let t = Instant::now();
    let r = f();
    into.push(Timed::since(step, t));
    r
}

/// Seconds to the millisecond: finer figures are noise.
fn round_ms(s: f64) -> f64 {
    (s * 1000.0).round() / 1000.0
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stage_times_add_and_absorb() {
        let mut a = StageTimes::default();
        assert!(a.is_empty());
        a.add(Stage::Read, Duration::from_millis(250));
        a.add(Stage::Read, Duration::from_millis(250));
        let mut b = StageTimes::default();
        b.add(Stage::Contacts, Duration::from_secs(2));
        b.absorb(&a);
        assert!((b.get(Stage::Read) - 0.5).abs() < 1e-12);
        assert!((b.get(Stage::Contacts) - 2.0).abs() < 1e-12);
        assert_eq!(b.get(Stage::Logs), 0.0);
        let mut t = RunTimings::default();
        t.set_well_stages(&b);
        assert_eq!(t.well_stages.len(), Stage::ALL.len());
        assert_eq!(t.well_stages[0].step, "read");
        assert!(t.table().contains("contacts"));
        t.set_well_stages(&StageTimes::default());
        assert!(t.well_stages.is_empty());
    }
}
