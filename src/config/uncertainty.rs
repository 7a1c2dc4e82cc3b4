//! `[uncertainty]`: the Monte Carlo over the parameters given as
//! distributions in `[parameters.*]` (see [`crate::uncertainty`]).
//!
//! ```toml
//! [uncertainty]
//! realisations = 200            # default 200; 0 turns the Monte Carlo off
//! seed = 1                      # same seed, same inputs: same results
//! sampling = "latin-hypercube"  # or "plain"
//! depth-percentiles = false     # true: SW_, SWH_ and PERM_ P90, P50, P10 in the well files
//! classes = "posterior"         # or "fixed": the class at each depth held
//! [[uncertainty.correlation]]   # rank correlation of two keys, in every
//! keys = ["archie-m", "archie-n"]   # table that gives both a distribution
//! r = 0.6
//! ```

use serde::Deserialize;

use crate::config::params::{Variable, sampled_range};
use crate::stats::sampling::Sampling;

/// `[uncertainty]`.
#[derive(Debug, Clone, Deserialize, PartialEq)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct UncertaintyConfig {
    /// Realisations of the Monte Carlo. Default 200; 0: no Monte Carlo.
    #[serde(default = "default_realisations")]
    pub realisations: usize,
    /// Seed of the sampling. Default 1.
    #[serde(default = "default_seed")]
    pub seed: u64,
    /// Latin hypercube (default) or plain.
    #[serde(default)]
    pub sampling: Sampling,
    /// Rank correlations between pairs of keys.
    #[serde(default)]
    pub correlation: Vec<Correlation>,
    /// Also write SW_P90, SW_P50 and SW_P10 per depth in the well files (and
    /// SWH's, and PERM's with drawn classes, where they vary). Default false.
    #[serde(default)]
    pub depth_percentiles: bool,
    /// The class at each depth: drawn from its posterior in every
    /// realisation (default, when the run has a class predictor), or held.
    #[serde(default)]
    pub classes: ClassDraws,
}

/// `[uncertainty] classes`.
#[derive(Debug, Clone, Copy, Deserialize, PartialEq, Eq, Default, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ClassDraws {
    /// Drawn from the posterior, bed by bed with the bed sequence.
    #[default]
    Posterior,
    /// The run's most probable class, in every realisation.
    Fixed,
}

/// `[[uncertainty.correlation]]`: the rank correlation of two keys.
#[derive(Debug, Clone, Deserialize, PartialEq)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct Correlation {
    /// Two parameter keys, e.g. `["archie-m", "archie-n"]`.
    pub keys: [String; 2],
    /// Spearman rank correlation, -1 to 1.
    pub r: f64,
}

fn default_realisations() -> usize {
    200
}

fn default_seed() -> u64 {
    1
}

impl Default for UncertaintyConfig {
    fn default() -> Self {
        UncertaintyConfig {
            realisations: default_realisations(),
            seed: default_seed(),
            sampling: Sampling::default(),
            correlation: Vec::new(),
            depth_percentiles: false,
            classes: ClassDraws::default(),
        }
    }
}

/// Most realisations a run takes (memory: a number per zone, well and
/// realisation is kept until the field outputs are written).
pub const MAX_REALISATIONS: usize = 100_000;

impl UncertaintyConfig {
    /// The target rank-correlation matrix of `vars` (row-major): 1 on the
    /// diagonal, each configured pair's r where both keys are distributions
    /// of the same table. Refuses bad entries with the key's name: (key, message).
    pub fn matrix(&self, vars: &[Variable]) -> Result<Vec<f64>, (String, String)> {
        let k = vars.len();
        let mut c = vec![0.0; k * k];
        for i in 0..k {
            c[i * k + i] = 1.0;
        }
        for (e, corr) in self.correlation.iter().enumerate() {
            let key = format!("uncertainty.correlation[{e}]");
            if !(corr.r.is_finite() && (-1.0..=1.0).contains(&corr.r)) {
                return Err((format!("{key}.r"), format!("{} must be in -1..1", corr.r)));
            }
            for name in &corr.keys {
                if sampled_range(name).is_none() {
                    return Err((
                        format!("{key}.keys"),
                        format!("`{name}` is not a key that can be given as a distribution"),
                    ));
                }
            }
            if corr.keys[0] == corr.keys[1] {
                return Err((format!("{key}.keys"), "the two keys must differ".into()));
            }
            for i in 0..k {
                for j in 0..k {
                    if vars[i].table == vars[j].table
                        && vars[i].key == corr.keys[0]
                        && vars[j].key == corr.keys[1]
                    {
                        c[i * k + j] = corr.r;
                        c[j * k + i] = corr.r;
                    }
                }
            }
        }
        if crate::stats::sampling::cholesky(&c, k).is_none() {
            return Err((
                "uncertainty.correlation".into(),
                "these correlations cannot hold together (the matrix is not positive definite): loosen one".into(),
            ));
        }
        Ok(c)
    }

    /// Refuse out-of-range settings: (key, message).
    pub fn validate(&self, vars: &[Variable]) -> Result<(), (String, String)> {
        if self.realisations > MAX_REALISATIONS {
            return Err((
                "uncertainty.realisations".into(),
                format!("{} is more than {MAX_REALISATIONS}", self.realisations),
            ));
        }
        if self.realisations > 0 && self.realisations < 10 && !vars.is_empty() {
            return Err((
                "uncertainty.realisations".into(),
                format!(
                    "{} is too few for percentiles: use at least 10 (0 turns the Monte Carlo off)",
                    self.realisations
                ),
            ));
        }
        self.matrix(vars).map(|_| ())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::config::params::Parameters;

    fn params(text: &str) -> Parameters {
        toml::from_str(text).expect("parameters parse")
    }

    fn uncertainty(text: &str) -> UncertaintyConfig {
        toml::from_str(text).expect("uncertainty parses")
    }

    /// Bad distributions are refused when the config loads, each with its
    /// key's full name.
    #[test]
    fn bad_distributions_are_refused_with_the_key() {
        for (text, key, words) in [
            (
                "[zone.\"Upper Kell\"]\nrw-ohmm = { normal = [0.05, -0.01] }",
                "parameters.zone.\"Upper Kell\".rw-ohmm",
                "standard deviation",
            ),
            (
                "[field]\narchie-m = { triangular = [2.2, 2.0, 1.8] }",
                "parameters.field.archie-m",
                "low <= most likely",
            ),
            (
                "[class.\"2\"]\narchie-n = { uniform = [2.1, 1.9] }",
                "parameters.class.\"2\".archie-n",
                "low < high",
            ),
            (
                "[field]\nbad-hole-in = { normal = [1.0, 0.1] }",
                "parameters.field.bad-hole-in",
                "held exact",
            ),
            (
                "[field]\nrw-ohmm = { uniform = [-2, -1] }",
                "parameters.field.rw-ohmm",
                "physical range",
            ),
        ] {
            let (k, m) = params(text).validate().expect_err(text);
            assert_eq!(k, key, "{text}");
            assert!(m.contains(words), "{text}: {m}");
        }
    }

    /// Distributions are numbered in a fixed order and keep their table, so
    /// a correlation applies within each table that gives both keys.
    #[test]
    fn correlations_apply_per_table_and_impossible_sets_are_refused() {
        let mut p = params(
            "[field]\nrw-ohmm = { normal = [0.05, 0.005] }\n\
             [class.\"1\"]\narchie-m = { triangular = [2.0, 2.1, 2.2] }\narchie-n = { normal = [2.1, 0.1] }\n\
             [class.\"2\"]\narchie-m = { triangular = [1.9, 2.0, 2.1] }\narchie-n = { normal = [2.0, 0.1] }",
        );
        let vars = p.number_distributions();
        let names: Vec<&str> = vars.iter().map(|v| v.name.as_str()).collect();
        assert_eq!(
            names,
            [
                "parameters.field.rw-ohmm",
                "parameters.class.\"1\".archie-m",
                "parameters.class.\"1\".archie-n",
                "parameters.class.\"2\".archie-m",
                "parameters.class.\"2\".archie-n",
            ]
        );
        let u = uncertainty("[[correlation]]\nkeys = [\"archie-m\", \"archie-n\"]\nr = 0.6");
        let c = u.matrix(&vars).expect("possible");
        let k = vars.len();
        // m and n correlated within class 1 and within class 2, not across
        assert_eq!(
            (c[k + 2], c[3 * k + 4], c[k + 4], c[1]),
            (0.6, 0.6, 0.0, 0.0)
        );
        let (key, m) = uncertainty("[[correlation]]\nkeys = [\"archie-m\", \"archie-n\"]\nr = 1.5")
            .validate(&vars)
            .expect_err("r out of range");
        assert_eq!(key, "uncertainty.correlation[0].r");
        assert!(m.contains("-1..1"), "{m}");
        let (key, _) =
            uncertainty("[[correlation]]\nkeys = [\"archie-m\", \"bad-hole-in\"]\nr = 0.5")
                .validate(&vars)
                .expect_err("not a sampled key");
        assert_eq!(key, "uncertainty.correlation[0].keys");
        // three field keys pairwise 0.9, 0.9 and -0.9 cannot hold together
        let mut p = params(
            "[field]\nrw-ohmm = { normal = [0.05, 0.005] }\narchie-m = { normal = [2, 0.1] }\narchie-n = { normal = [2, 0.1] }",
        );
        let vars = p.number_distributions();
        let u = uncertainty(
            "[[correlation]]\nkeys = [\"archie-m\", \"archie-n\"]\nr = 0.9\n\
             [[correlation]]\nkeys = [\"archie-m\", \"rw-ohmm\"]\nr = 0.9\n\
             [[correlation]]\nkeys = [\"archie-n\", \"rw-ohmm\"]\nr = -0.9",
        );
        let (key, m) = u.validate(&vars).expect_err("not positive definite");
        assert_eq!(key, "uncertainty.correlation");
        assert!(m.contains("positive definite"), "{m}");
        let (key, _) = uncertainty("realisations = 5")
            .validate(&vars)
            .expect_err("too few");
        assert_eq!(key, "uncertainty.realisations");
    }
}
