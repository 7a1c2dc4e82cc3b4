//! Input distributions: what a parameter's uncertainty is, its best value,
//! and its quantile function (for Latin hypercube sampling), truncated to the
//! parameter's physical range.
//!
//! In the config a number may be replaced by one of (TOML inline tables):
//!
//! ```toml
//! rw-ohmm   = { normal = [0.045, 0.004] }        # mean, standard deviation
//! rsh-ohmm  = { lognormal = [2.5, 0.2] }         # median, standard deviation of ln
//! archie-m  = { triangular = [1.8, 2.0, 2.2] }   # low, most likely, high
//! rho-matrix-gcc = { uniform = [2.64, 2.68] }    # low, high
//! ```
//!
//! The deterministic run uses the best value: the mean of a normal, the
//! median of a lognormal, the mode of a triangular, the middle of a uniform.

use std::fmt;

use serde::de::{self, Deserializer, MapAccess, Visitor};
use serde::{Deserialize, Serialize};
use statrs::distribution::{ContinuousCDF, Normal};

/// A parameter's distribution.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Dist {
    /// Normal.
    Normal {
        /// Mean.
        mean: f64,
        /// Standard deviation.
        sd: f64,
    },
    /// Lognormal.
    Lognormal {
        /// Median.
        median: f64,
        /// Standard deviation of the natural log.
        sd_ln: f64,
    },
    /// Triangular.
    Triangular {
        /// Lowest value.
        low: f64,
        /// Most likely value.
        mode: f64,
        /// Highest value.
        high: f64,
    },
    /// Uniform.
    Uniform {
        /// Lowest value.
        low: f64,
        /// Highest value.
        high: f64,
    },
}

fn standard_normal() -> Normal {
    // mean 0, sd 1 is always a valid normal
    Normal::standard()
}

impl Dist {
    /// The value the deterministic run uses.
    pub fn best(&self) -> f64 {
        match *self {
            Dist::Normal { mean, .. } => mean,
            Dist::Lognormal { median, .. } => median,
            Dist::Triangular { mode, .. } => mode,
            Dist::Uniform { low, high } => 0.5 * (low + high),
        }
    }

    /// Whether the parameters make a distribution, and why not: (message).
    pub fn check(&self) -> Result<(), String> {
        let finite = |v: &[f64]| v.iter().all(|x| x.is_finite());
        match *self {
            Dist::Normal { mean, sd } => {
                if !finite(&[mean, sd]) || sd <= 0.0 {
                    return Err(format!(
                        "normal [{mean}, {sd}]: the standard deviation must be a number above 0"
                    ));
                }
            }
            Dist::Lognormal { median, sd_ln } => {
                if !finite(&[median, sd_ln]) || median <= 0.0 || sd_ln <= 0.0 {
                    return Err(format!(
                        "lognormal [{median}, {sd_ln}]: the median and the standard deviation of ln must be numbers above 0"
                    ));
                }
            }
            Dist::Triangular { low, mode, high } => {
                if !(finite(&[low, mode, high]) && low <= mode && mode <= high && low < high) {
                    return Err(format!(
                        "triangular [{low}, {mode}, {high}]: needs low <= most likely <= high, and low < high"
                    ));
                }
            }
            Dist::Uniform { low, high } => {
                if !finite(&[low, high]) || low >= high {
                    return Err(format!("uniform [{low}, {high}]: needs low < high"));
                }
            }
        }
        Ok(())
    }

    /// Cumulative probability at `x`.
    pub fn cdf(&self, x: f64) -> f64 {
        match *self {
            Dist::Normal { mean, sd } => standard_normal().cdf((x - mean) / sd),
            Dist::Lognormal { median, sd_ln } => {
                if x <= 0.0 {
                    0.0
                } else {
                    standard_normal().cdf((x / median).ln() / sd_ln)
                }
            }
            Dist::Triangular { low, mode, high } => {
                if x <= low {
                    0.0
                } else if x >= high {
                    1.0
                } else if x <= mode {
                    (x - low).powi(2) / ((high - low) * (mode - low))
                } else {
                    1.0 - (high - x).powi(2) / ((high - low) * (high - mode))
                }
            }
            Dist::Uniform { low, high } => ((x - low) / (high - low)).clamp(0.0, 1.0),
        }
    }

    /// The value at cumulative probability `p` (0 < p < 1): the inverse of
    /// the CDF. Triangular and uniform in closed form; normal and lognormal
    /// through the standard normal quantile of `statrs`.
    pub fn quantile(&self, p: f64) -> f64 {
        let p = p.clamp(1e-12, 1.0 - 1e-12);
        match *self {
            Dist::Normal { mean, sd } => mean + sd * standard_normal().inverse_cdf(p),
            Dist::Lognormal { median, sd_ln } => {
                median * (sd_ln * standard_normal().inverse_cdf(p)).exp()
            }
            Dist::Triangular { low, mode, high } => {
                let f = (mode - low) / (high - low);
                if p < f {
                    low + (p * (high - low) * (mode - low)).sqrt()
                } else {
                    high - ((1.0 - p) * (high - low) * (high - mode)).sqrt()
                }
            }
            Dist::Uniform { low, high } => low + p * (high - low),
        }
    }

    /// The quantile of the distribution truncated to [`lo`, `hi`] (the
    /// parameter's physical range): `p` is spread over the probability the
    /// range holds, so a sample never leaves it. `None` when the range holds
    /// (almost) none of the distribution.
    pub fn quantile_within(&self, p: f64, lo: f64, hi: f64) -> Option<f64> {
        let (a, b) = (self.cdf(lo), self.cdf(hi));
        if (b - a).is_nan() || b - a <= 1e-9 {
            return None;
        }
        Some(self.quantile(a + p * (b - a)).clamp(lo, hi))
    }
}

/// A parameter's value in the config: a number, or a distribution (its best
/// value is the number the deterministic run uses). `var` numbers the
/// distributions of a config (see
/// [`crate::config::params::Parameters::number_distributions`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Num {
    /// The number, or the distribution's best value.
    pub value: f64,
    /// The distribution, when one is given.
    pub dist: Option<Dist>,
    /// The distribution's number among the config's random inputs.
    pub var: Option<usize>,
}

impl From<f64> for Num {
    fn from(value: f64) -> Num {
        Num {
            value,
            dist: None,
            var: None,
        }
    }
}

/// The table form of a distribution, as written in the config.
#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct DistTable {
    normal: Option<[f64; 2]>,
    lognormal: Option<[f64; 2]>,
    triangular: Option<[f64; 3]>,
    uniform: Option<[f64; 2]>,
}

impl DistTable {
    fn dist(self) -> Result<Dist, String> {
        let mut found = Vec::new();
        if let Some([mean, sd]) = self.normal {
            found.push(Dist::Normal { mean, sd });
        }
        if let Some([median, sd_ln]) = self.lognormal {
            found.push(Dist::Lognormal { median, sd_ln });
        }
        if let Some([low, mode, high]) = self.triangular {
            found.push(Dist::Triangular { low, mode, high });
        }
        if let Some([low, high]) = self.uniform {
            found.push(Dist::Uniform { low, high });
        }
        match found.as_slice() {
            [d] => Ok(*d),
            [] => Err("a distribution needs one of normal, lognormal, triangular, uniform".into()),
            _ => Err(
                "a distribution names one of normal, lognormal, triangular, uniform, not several"
                    .into(),
            ),
        }
    }
}

struct NumVisitor;

impl<'de> Visitor<'de> for NumVisitor {
    type Value = Num;

    fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("a number, or a distribution such as { normal = [mean, sd] }")
    }

    fn visit_f64<E: de::Error>(self, v: f64) -> Result<Num, E> {
        Ok(Num::from(v))
    }

    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Num, E> {
        Ok(Num::from(v as f64))
    }

    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Num, E> {
        Ok(Num::from(v as f64))
    }

    fn visit_map<A: MapAccess<'de>>(self, map: A) -> Result<Num, A::Error> {
        let table = DistTable::deserialize(de::value::MapAccessDeserializer::new(map))?;
        let dist = table.dist().map_err(de::Error::custom)?;
        Ok(Num {
            value: dist.best(),
            dist: Some(dist),
            var: None,
        })
    }
}

impl<'de> Deserialize<'de> for Num {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Num, D::Error> {
        d.deserialize_any(NumVisitor)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[derive(Deserialize)]
    struct T {
        v: Num,
    }

    fn parse(text: &str) -> Result<Num, String> {
        toml::from_str::<T>(text)
            .map(|t| t.v)
            .map_err(|e| e.to_string())
    }

    #[test]
    fn numbers_and_distributions_parse_with_their_best_values() {
        assert_eq!(parse("v = 2").expect("int").value, 2.0);
        assert_eq!(parse("v = 0.045").expect("float"), Num::from(0.045));
        let n = parse("v = { normal = [0.045, 0.004] }").expect("normal");
        assert_eq!(n.value, 0.045);
        assert_eq!(
            n.dist,
            Some(Dist::Normal {
                mean: 0.045,
                sd: 0.004
            })
        );
        assert_eq!(
            parse("v = { lognormal = [2.5, 0.2] }").expect("ln").value,
            2.5
        );
        assert_eq!(
            parse("v = { triangular = [1.8, 2.0, 2.3] }")
                .expect("tri")
                .value,
            2.0
        );
        assert!((parse("v = { uniform = [2.64, 2.68] }").expect("u").value - 2.66).abs() < 1e-12);
        let e = parse("v = { normal = [1, 2], uniform = [0, 1] }").expect_err("two");
        assert!(e.contains("not several"), "{e}");
        let e = parse("v = { gaussian = [1, 2] }").expect_err("unknown");
        assert!(e.contains("gaussian") && e.contains("line 1"), "{e}");
        let e = parse("v = { normal = [1] }").expect_err("short");
        assert!(e.contains("line 1"), "{e}");
    }

    #[test]
    fn bad_distributions_are_refused_with_the_reason() {
        for (d, want) in [
            (
                Dist::Normal {
                    mean: 1.0,
                    sd: -0.1,
                },
                "standard deviation",
            ),
            (Dist::Normal { mean: 1.0, sd: 0.0 }, "standard deviation"),
            (
                Dist::Lognormal {
                    median: -1.0,
                    sd_ln: 0.1,
                },
                "median",
            ),
            (
                Dist::Triangular {
                    low: 2.0,
                    mode: 1.9,
                    high: 2.2,
                },
                "low <= most likely",
            ),
            (
                Dist::Triangular {
                    low: 2.0,
                    mode: 2.0,
                    high: 2.0,
                },
                "low < high",
            ),
            (
                Dist::Uniform {
                    low: 3.0,
                    high: 2.0,
                },
                "low < high",
            ),
        ] {
            let e = d.check().expect_err("refused");
            assert!(e.contains(want), "{d:?}: {e}");
        }
        assert!(
            Dist::Triangular {
                low: 1.8,
                mode: 1.8,
                high: 2.2
            }
            .check()
            .is_ok()
        );
    }

    /// Quantiles against known values: the standard normal's 0.975 point is
    /// 1.959964 and its 0.9 point 1.281552 (any statistics table, e.g.
    /// Abramowitz & Stegun 1964, table 26.5); the triangular and uniform
    /// quantiles invert their CDFs (closed forms, checked both ways).
    #[test]
    fn quantiles_match_tables_and_invert_the_cdf() {
        let n = Dist::Normal {
            mean: 10.0,
            sd: 2.0,
        };
        assert!((n.quantile(0.975) - (10.0 + 2.0 * 1.959_964)).abs() < 1e-5);
        assert!((n.quantile(0.9) - (10.0 + 2.0 * 1.281_552)).abs() < 1e-5);
        let ln = Dist::Lognormal {
            median: 2.0,
            sd_ln: 0.5,
        };
        assert!((ln.quantile(0.5) - 2.0).abs() < 1e-12);
        assert!((ln.quantile(0.9) - 2.0 * (0.5 * 1.281_552f64).exp()).abs() < 1e-5);
        for d in [
            Dist::Triangular {
                low: 1.0,
                mode: 1.5,
                high: 3.0,
            },
            Dist::Triangular {
                low: 1.0,
                mode: 1.0,
                high: 3.0,
            },
            Dist::Uniform {
                low: -1.0,
                high: 4.0,
            },
            n,
            ln,
        ] {
            for k in 1..100 {
                let p = f64::from(k) / 100.0;
                let x = d.quantile(p);
                assert!((d.cdf(x) - p).abs() < 1e-9, "{d:?} p {p}");
            }
        }
        // the triangular's median by hand: F(mode) = 0.25 < 0.5, so
        // x = 3 − sqrt(0.5·2·1.5) = 3 − sqrt(1.5)
        let t = Dist::Triangular {
            low: 1.0,
            mode: 1.5,
            high: 3.0,
        };
        assert!((t.quantile(0.5) - (3.0 - 1.5f64.sqrt())).abs() < 1e-12);
    }

    #[test]
    fn truncation_keeps_samples_in_the_physical_range() {
        // Rw ~ N(0.02, 0.02): 16 % of the untruncated normal is below 0
        let d = Dist::Normal {
            mean: 0.02,
            sd: 0.02,
        };
        let mut prev = 0.0;
        for k in 0..=100 {
            let x = d
                .quantile_within(f64::from(k) / 100.0, 1e-6, f64::INFINITY)
                .expect("range");
            assert!(x >= 1e-6 && x >= prev, "{k}: {x}");
            prev = x;
        }
        // the truncated median is the untruncated quantile at F(0) + (1 − F(0))/2
        let f0 = d.cdf(1e-6);
        let med = d.quantile_within(0.5, 1e-6, f64::INFINITY).expect("range");
        assert!((med - d.quantile(f0 + 0.5 * (1.0 - f0))).abs() < 1e-12);
        assert!(
            Dist::Uniform {
                low: 2.0,
                high: 3.0
            }
            .quantile_within(0.5, 5.0, 6.0)
            .is_none()
        );
    }
}
