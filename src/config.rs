//! Project configuration, read from TOML.
//!
//! Keys are kebab-case; unknown keys are refused with their name and the list
//! of valid keys (serde `deny_unknown_fields`). Paths are relative to the
//! config file's folder. Units are in the key name or its doc comment;
//! `config/default.toml` documents every key with its default.

pub mod params;
pub mod summary;
pub mod uncertainty;

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use serde::Deserialize;

use crate::input::curves::{AliasTable, LogicalCurve};
use crate::units::DepthUnit;

mod classes;
mod saturation;
pub use classes::{
    ClassesConfig, CoreConfig, CoreFormat, EvidenceMode, Feature, PermMethod, PredictorConfig,
    SchemeSpec,
};
pub use saturation::{
    CapillaryConfig, CompartmentConfig, ContactsConfig, FluidProps, FluidSystem, PressuresConfig,
    SatHeightConfig,
};

/// An error loading a config file.
#[derive(Debug, thiserror::Error)]
pub enum ConfigError {
    /// A file or folder cannot be read.
    #[error("cannot read config `{}`", .path.display())]
    Io {
        /// The config file, or a folder of `[input] wells`.
        path: PathBuf,
        /// The read error.
        #[source]
        source: std::io::Error,
    },
    /// An input the config names is not there.
    #[error(
        "config `{}`: key `{key}`: `{}` does not exist (resolved from the config's folder: `{}`)",
        .path.display(), .written.display(), .resolved.display()
    )]
    MissingInput {
        /// The config file.
        path: PathBuf,
        /// The full key (`input.wells`, `core.file`, `depth.well."W-1".survey`).
        key: String,
        /// The path as written in the config.
        written: PathBuf,
        /// The path the run looked for.
        resolved: PathBuf,
    },
    /// A folder of `[input] wells` cannot be listed.
    #[error("config `{}`: key `input.wells`: cannot list folder `{}`", .path.display(), .folder.display())]
    ReadFolder {
        /// The config file.
        path: PathBuf,
        /// The folder, as resolved.
        folder: PathBuf,
        /// The error.
        #[source]
        source: std::io::Error,
    },
    /// The text is not valid TOML or does not fit the config's keys and types.
    #[error("config `{}`", .path.display())]
    Parse {
        /// The config file.
        path: PathBuf,
        /// The TOML parser's error (with its line and column).
        #[source]
        source: Box<toml::de::Error>,
    },
    /// A value is out of range or contradicts another key.
    #[error("config `{}`: key `{key}`: {message}", .path.display())]
    Invalid {
        /// The config file.
        path: PathBuf,
        /// The full dotted key (`predictor.max-vsh`).
        key: String,
        /// What is wrong with the value.
        message: String,
    },
}

/// The whole config file.
#[derive(Debug, Clone, Deserialize, Default)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct Config {
    /// `[project]`: name and depth unit.
    #[serde(default)]
    pub project: Project,
    /// `[input]`: the LAS files and the reader's limits.
    #[serde(default)]
    pub input: Input,
    /// `[output]`: output folder, formats, decimals and report.
    #[serde(default)]
    pub output: Output,
    /// `[curves]`: curve aliases and unit overrides.
    #[serde(default)]
    pub curves: Curves,
    /// `[depth]`: elevation mnemonics and per-well depth settings.
    #[serde(default)]
    pub depth: DepthConfig,
    /// `[zones]`: the zone-tops file.
    #[serde(default)]
    pub zones: ZonesConfig,
    /// `[parameters]`: interpretation parameters by field, zone, well and zone, and class.
    #[serde(default)]
    pub parameters: crate::config::params::Parameters,
    /// `[core]`: core plugs and their depth shifts; `None` without core.
    #[serde(default)]
    pub core: Option<CoreConfig>,
    /// `[classes]`: hydraulic class schemes; `None` for a run without classes.
    #[serde(default)]
    pub classes: Option<ClassesConfig>,
    /// `[predictor]`: the class predictor; `None` uses its defaults.
    #[serde(default)]
    pub predictor: Option<PredictorConfig>,
    /// Lab capillary-pressure curves for the J-function of each class.
    #[serde(default)]
    pub capillary: Option<CapillaryConfig>,
    /// Formation-pressure points for the free water levels.
    #[serde(default)]
    pub pressures: Option<PressuresConfig>,
    /// Pressure compartments by name, each with its wells and free water level.
    #[serde(default)]
    pub compartments: BTreeMap<String, CompartmentConfig>,
    /// Settings of the saturation-height model.
    #[serde(default)]
    pub saturation_height: SatHeightConfig,
    /// Settings of the saturation-step audit (contacts.csv).
    #[serde(default)]
    pub contacts: ContactsConfig,
    /// Net cutoffs of the per-well, per-zone summary (field/zone-summary.csv).
    #[serde(default)]
    pub summary: crate::config::summary::SummaryConfig,
    /// `[uncertainty]`: the Monte Carlo over the parameters given as distributions.
    #[serde(default)]
    pub uncertainty: crate::config::uncertainty::UncertaintyConfig,
    /// The distributions of `[parameters.*]`, numbered: the Monte Carlo's inputs.
    #[serde(skip)]
    pub variables: Vec<crate::config::params::Variable>,
    /// The folder the config file is in; relative paths start here.
    #[serde(skip)]
    pub base_dir: PathBuf,
    /// The config file itself (for the run manifest).
    #[serde(skip)]
    pub source: PathBuf,
}

/// `[project]`
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct Project {
    /// A name for reports. Default: "flowzone project".
    #[serde(default = "default_name")]
    pub name: String,
    /// Depth unit of every output: "m" or "ft". Default "m". Wells logged in the
    /// other unit are converted when read (1 ft = 0.3048 m).
    #[serde(default)]
    pub depth_unit: DepthUnit,
}

fn default_name() -> String {
    "flowzone project".into()
}

impl Default for Project {
    fn default() -> Self {
        Project {
            name: default_name(),
            depth_unit: DepthUnit::default(),
        }
    }
}

/// `[input]`
#[derive(Debug, Clone, Deserialize, Default)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct Input {
    /// LAS files or folders (every `*.las` / `*.LAS` inside, not recursive).
    #[serde(default)]
    pub wells: Vec<PathBuf>,
    /// Refuse files whose header contradicts the data instead of warning.
    #[serde(default)]
    pub strict: bool,
    /// Largest LAS file read, MiB. Default 2048.
    pub max_file_mb: Option<u64>,
    /// Most header lines before ~A. Default 1 000 000.
    pub max_header_lines: Option<usize>,
    /// Longest header line, bytes. Default 65 536.
    pub max_header_line_bytes: Option<usize>,
    /// Most curves in ~C. Default 10 000.
    pub max_curves: Option<usize>,
}

impl Input {
    /// The reader's limits: the config's, else the defaults.
    pub fn limits(&self) -> crate::input::las::Limits {
        let d = crate::input::las::Limits::DEFAULT;
        crate::input::las::Limits {
            max_bytes: self
                .max_file_mb
                .map_or(d.max_bytes, |m| m.saturating_mul(1 << 20)),
            max_header_lines: self.max_header_lines.unwrap_or(d.max_header_lines),
            max_header_line_bytes: self
                .max_header_line_bytes
                .unwrap_or(d.max_header_line_bytes),
            max_curves: self.max_curves.unwrap_or(d.max_curves),
        }
    }
}

/// `[output]`
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct Output {
    /// Output folder, used when `--out` is not given.
    #[serde(default)]
    pub dir: Option<PathBuf>,
    /// Per-well formats: any of "las", "csv", "parquet". Default ["las", "csv"].
    #[serde(default = "default_formats")]
    pub formats: Vec<Format>,
    /// Decimals written for computed curves in CSV and LAS. Default 4.
    #[serde(default = "default_decimals")]
    pub decimals: usize,
    /// Write the HTML report (report/index.html and a page per well). Default true.
    #[serde(default = "default_report")]
    pub report: bool,
    /// Also write each well's log plot as PNG (`report/wells/<stem>-log.png`). Default false.
    #[serde(default)]
    pub report_png: bool,
}

fn default_report() -> bool {
    true
}

fn default_formats() -> Vec<Format> {
    vec![Format::Las, Format::Csv]
}

fn default_decimals() -> usize {
    4
}

impl Default for Output {
    fn default() -> Self {
        Output {
            dir: None,
            formats: default_formats(),
            decimals: default_decimals(),
            report: default_report(),
            report_png: false,
        }
    }
}

/// An output table format.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize, serde::Serialize, clap::ValueEnum)]
#[serde(rename_all = "kebab-case")]
pub enum Format {
    /// `las`: LAS 2.0.
    Las,
    /// `csv`: comma-separated values.
    Csv,
    /// `parquet`: Apache Parquet.
    Parquet,
}

impl Format {
    /// The file extension, without the dot.
    pub fn extension(self) -> &'static str {
        match self {
            Format::Las => "las",
            Format::Csv => "csv",
            Format::Parquet => "parquet",
        }
    }
}

/// `[curves]`
#[derive(Debug, Clone, Deserialize, Default)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct Curves {
    /// Alias lists that replace the defaults, by logical curve
    /// (`gamma-ray = ["GR", "SGR"]`).
    #[serde(default)]
    pub aliases: BTreeMap<LogicalCurve, Vec<String>>,
    /// Units for mnemonics whose header unit is blank or wrong (`PHIN = "v/v"`).
    #[serde(default)]
    pub units: BTreeMap<String, String>,
}

/// `[depth]`: how measured depth becomes TVD and TVDSS.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct DepthConfig {
    /// ~P/~W mnemonics tried, in order, for the elevation of the depth reference
    /// above sea level (kelly bushing, drill floor, ground). Default EKB, KB,
    /// EREF, EDF, DFE, ELEV, EGL, GL.
    #[serde(default = "default_elevation_mnemonics")]
    pub elevation_mnemonics: Vec<String>,
    /// Per-well settings, by well name.
    #[serde(default)]
    pub well: BTreeMap<String, WellDepth>,
}

fn default_elevation_mnemonics() -> Vec<String> {
    ["EKB", "KB", "EREF", "EDF", "DFE", "ELEV", "EGL", "GL"]
        .iter()
        .map(|s| s.to_string())
        .collect()
}

impl Default for DepthConfig {
    fn default() -> Self {
        DepthConfig {
            elevation_mnemonics: default_elevation_mnemonics(),
            well: BTreeMap::new(),
        }
    }
}

impl DepthConfig {
    /// The settings of a well known by any of `names` (case-insensitive).
    pub fn for_well(&self, names: &[&str]) -> Option<&WellDepth> {
        self.well
            .iter()
            .find(|(k, _)| names.iter().any(|n| k.eq_ignore_ascii_case(n)))
            .map(|(_, w)| w)
    }
}

/// `[depth.well."NAME"]`
#[derive(Debug, Clone, Deserialize, Default)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct WellDepth {
    /// Elevation of the depth reference above sea level, in the project's depth
    /// unit; overrides the header.
    pub elevation: Option<f64>,
    /// Directional survey CSV with columns MD_M or MD_FT, INC_DEG, AZI_DEG.
    pub survey: Option<PathBuf>,
}

/// `[zones]`
#[derive(Debug, Clone, Deserialize, Default)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct ZonesConfig {
    /// Zone-tops CSV with columns WELL, ZONE, TOP_MD and optional DEPTH_UNIT (m or ft).
    pub tops: Option<PathBuf>,
}

impl Config {
    /// Read and validate a config file.
    pub fn load(path: &Path) -> Result<Config, ConfigError> {
        let text = std::fs::read_to_string(path).map_err(|source| ConfigError::Io {
            path: path.to_path_buf(),
            source,
        })?;
        let base = path
            .parent()
            .map_or_else(|| PathBuf::from("."), Path::to_path_buf);
        Config::from_toml(&text, path, base)
    }

    /// Parse config text; `path` names it in errors, `base_dir` anchors relative paths.
    pub fn from_toml(text: &str, path: &Path, base_dir: PathBuf) -> Result<Config, ConfigError> {
        let mut config: Config = toml::from_str(text).map_err(|source| ConfigError::Parse {
            path: path.to_path_buf(),
            source: Box::new(source),
        })?;
        config.base_dir = base_dir;
        config.source = path.to_path_buf();
        config.variables = config.parameters.number_distributions();
        config.validate(path)?;
        Ok(config)
    }

    fn validate(&self, path: &Path) -> Result<(), ConfigError> {
        let invalid = |key: &str, message: String| ConfigError::Invalid {
            path: path.to_path_buf(),
            key: key.into(),
            message,
        };
        if self.output.decimals > 10 {
            return Err(invalid(
                "output.decimals",
                format!("{} is more than 10", self.output.decimals),
            ));
        }
        if let Err((key, message)) = self.parameters.validate() {
            return Err(invalid(&key, message));
        }
        if let Err((key, message)) = self.uncertainty.validate(&self.variables) {
            return Err(invalid(&key, message));
        }
        if let Err((key, message)) = classes::validate(
            self.core.as_ref(),
            self.classes.as_ref(),
            self.predictor.as_ref(),
        ) {
            return Err(invalid(&key, message));
        }
        if let Err((key, message)) = saturation::validate(
            self.capillary.as_ref(),
            self.pressures.as_ref(),
            &self.compartments,
            &self.saturation_height,
            self.classes.is_some(),
        ) {
            return Err(invalid(&key, message));
        }
        if let Err((key, message)) = self.summary.validate() {
            return Err(invalid(&key, message));
        }
        if let Err((key, message)) = self.contacts.validate() {
            return Err(invalid(&key, message));
        }
        if self.parameters.has_class_params() && self.classes.is_none() {
            return Err(invalid(
                "parameters.class",
                "class-dependent parameters need [classes] (the class of each depth)".into(),
            ));
        }
        for (curve, list) in &self.curves.aliases {
            if list.is_empty() {
                return Err(invalid(
                    &format!("curves.aliases.{}", curve.key()),
                    "alias list is empty".into(),
                ));
            }
        }
        Ok(())
    }

    /// A path from the config, anchored at the config's folder.
    pub fn resolve_path(&self, p: &Path) -> PathBuf {
        if p.is_absolute() {
            p.to_path_buf()
        } else {
            self.base_dir.join(p)
        }
    }

    /// The folders of `[input] wells`: (as written, as resolved). A run's
    /// output folder may not be inside one (the next run would read its LAS
    /// outputs as wells).
    pub fn input_folders(&self) -> Vec<(PathBuf, PathBuf)> {
        self.input
            .wells
            .iter()
            .map(|p| (p.clone(), self.resolve_path(p)))
            .filter(|(_, r)| r.is_dir())
            .collect()
    }

    /// Every input path the config names and a run reads: (full key, as
    /// written). Wells files and folders, tops, surveys, core, capillary,
    /// pressures, and, with `model`, the class model when a run would load
    /// it (`train` writes it instead).
    pub fn named_inputs(&self, model: bool) -> Vec<(String, PathBuf)> {
        let mut v: Vec<(String, PathBuf)> = self
            .input
            .wells
            .iter()
            .map(|p| ("input.wells".to_string(), p.clone()))
            .collect();
        if let Some(p) = &self.zones.tops {
            v.push(("zones.tops".into(), p.clone()));
        }
        for (name, w) in &self.depth.well {
            if let Some(p) = &w.survey {
                v.push((format!("depth.well.\"{name}\".survey"), p.clone()));
            }
        }
        if let Some(c) = &self.core {
            v.push(("core.file".into(), c.file.clone()));
        }
        if let Some(c) = &self.capillary {
            v.push(("capillary.file".into(), c.file.clone()));
        }
        if let Some(p) = &self.pressures {
            v.push(("pressures.file".into(), p.file.clone()));
        }
        let loads_model =
            model && self.classes.is_some() && (self.predictor.is_some() || self.core.is_some());
        if let Some(m) = self.predictor.as_ref().and_then(|p| p.model.as_ref()) {
            if loads_model {
                v.push(("predictor.model".into(), m.clone()));
            }
        }
        v
    }

    /// Refuse the first input of [`Config::named_inputs`] that does not
    /// exist, with its key and its path as written and as resolved: before
    /// a run writes anything.
    pub fn check_inputs_exist(&self, model: bool) -> Result<(), ConfigError> {
        for (key, written) in self.named_inputs(model) {
            let resolved = self.resolve_path(&written);
            // `metadata` follows links: a broken link is missing too
            if std::fs::metadata(&resolved).is_err() {
                return Err(ConfigError::MissingInput {
                    path: self.source.clone(),
                    key,
                    written,
                    resolved,
                });
            }
        }
        Ok(())
    }

    /// The alias table for curve resolution.
    pub fn alias_table(&self) -> AliasTable {
        AliasTable {
            aliases: self.curves.aliases.clone(),
            units: self.curves.units.clone(),
        }
    }

    /// The LAS files named by `[input] wells`, sorted, folders expanded.
    pub fn well_files(&self) -> Result<Vec<PathBuf>, ConfigError> {
        let mut files = Vec::new();
        for entry in &self.input.wells {
            let p = self.resolve_path(entry);
            if p.is_dir() {
                let dir = std::fs::read_dir(&p).map_err(|source| ConfigError::ReadFolder {
                    path: self.source.clone(),
                    folder: p.clone(),
                    source,
                })?;
                for e in dir {
                    let e = e.map_err(|source| ConfigError::ReadFolder {
                        path: self.source.clone(),
                        folder: p.clone(),
                        source,
                    })?;
                    let f = e.path();
                    let is_las = f
                        .extension()
                        .and_then(|x| x.to_str())
                        .is_some_and(|x| x.eq_ignore_ascii_case("las"));
                    // not `is_file()`: an entry that cannot be followed (a
                    // broken link, a link loop) is kept, so that its read
                    // fails and is reported with the well, never skipped
                    if is_las && !f.is_dir() {
                        files.push(f);
                    }
                }
            } else {
                files.push(p);
            }
        }
        files.sort();
        files.dedup();
        Ok(files)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn parse(text: &str) -> Result<Config, ConfigError> {
        Config::from_toml(text, Path::new("t.toml"), PathBuf::from("."))
    }

    fn chain(e: &dyn std::error::Error) -> String {
        let mut s = e.to_string();
        let mut cur = e.source();
        while let Some(c) = cur {
            s.push_str(": ");
            s.push_str(&c.to_string());
            cur = c.source();
        }
        s
    }

    #[test]
    fn empty_config_has_defaults() {
        let c = parse("").expect("empty is valid");
        assert_eq!(c.project.depth_unit, DepthUnit::Metre);
        assert_eq!(c.output.formats, vec![Format::Las, Format::Csv]);
    }

    #[test]
    fn unknown_key_names_the_key_and_the_valid_ones() {
        let err = parse("[project]\ndepth-units = \"m\"\n").expect_err("typo");
        let text = chain(&err);
        assert!(
            text.starts_with("config `t.toml`: TOML parse error at line 2, column 1"),
            "{text}"
        );
        assert!(
            text.contains("unknown field `depth-units`, expected `name` or `depth-unit`"),
            "{text}"
        );
    }

    /// The documented default config and the demo config load as they are.
    #[test]
    fn shipped_configs_load() {
        let root = Path::new(env!("CARGO_MANIFEST_DIR"));
        for name in ["default.toml", "demo-field.toml"] {
            Config::load(&root.join("config").join(name))
                .unwrap_or_else(|e| panic!("{name}: {}", chain(&e)));
        }
    }

    /// A parameter outside its physical range is refused at load, with the key.
    #[test]
    fn out_of_range_parameter_refused_at_load() {
        let err = parse("[parameters.zone.\"Lower Kell\"]\narchie-n = -2\n").expect_err("n < 0");
        assert_eq!(
            chain(&err),
            "config `t.toml`: key `parameters.zone.\"Lower Kell\".archie-n`: -2 must be a number above 0"
        );
        let err = parse("[parameters.field]\nmatrix = \"sandstone\"\nrho-fluid-gcc = 2.7\n")
            .expect_err("fluid denser than matrix");
        assert_eq!(
            chain(&err),
            "config `t.toml`: key `parameters.field.rho-fluid-gcc`: 2.7 must be below the matrix density (2.65)"
        );
    }

    /// Class settings are checked at load, with the key.
    #[test]
    fn class_settings_refused_at_load() {
        let scheme = "[classes]\nuse = \"f\"\n[classes.scheme.f]\nkind = \"fzi-ladder\"\n";
        let err = parse(&format!("{scheme}bounds = [1.0, 0.5]\n")).expect_err("descending");
        assert_eq!(
            chain(&err),
            "config `t.toml`: key `classes.scheme.f`: bounds must be positive and ascending (1 to 249 of them)"
        );
        let err = parse(&format!("{scheme}start = 0.25\n")).expect_err("half a series");
        assert_eq!(
            chain(&err),
            "config `t.toml`: key `classes.scheme.f`: give either bounds, or start, ratio and count"
        );
        parse(&format!("{scheme}start = 0.25\nratio = 2.0\ncount = 8\n")).expect("geometric");
        let err = parse("[classes]\nuse = \"g\"\n[classes.scheme.f]\nkind = \"port-size\"\n")
            .expect_err("unknown scheme");
        assert_eq!(
            chain(&err),
            "config `t.toml`: key `classes.use`: `g` is not a scheme of [classes.scheme] (have: f)"
        );
        let err = parse("[predictor]\nseed = 1\n").expect_err("no classes");
        assert_eq!(
            chain(&err),
            "config `t.toml`: key `predictor`: needs [classes] (which scheme it predicts)"
        );
        let err = parse(&format!(
            "{scheme}bounds = [1.0]\n[core]\nfile = \"c.csv\"\n[predictor]\nfeatures = [\"VSH\", \"PEF\"]\n"
        ))
        .expect_err("unknown feature");
        assert_eq!(
            chain(&err),
            "config `t.toml`: key `predictor.features`: `PEF` is not a feature (valid: VSH, PHIE, GR, RHOB, NPHI, DT, LOG10_RT)"
        );
        let err = parse("[classes]\nuse = \"f\"\n[classes.scheme.f]\nkind = \"kmeans\"\n")
            .expect_err("unknown kind");
        assert!(
            chain(&err).contains("unknown variant `kmeans`"),
            "{}",
            chain(&err)
        );
    }

    #[test]
    fn aliases_by_logical_curve() {
        let c = parse("[curves.aliases]\ngamma-ray = [\"SGR\"]\n[curves.units]\nPHIN = \"v/v\"\n")
            .expect("valid");
        assert_eq!(
            c.alias_table().aliases(LogicalCurve::GammaRay),
            vec!["SGR".to_string()]
        );
        let err = parse("[curves.aliases]\ngamma-rays = [\"SGR\"]\n").expect_err("bad key");
        assert!(
            chain(&err).contains("unknown variant `gamma-rays`"),
            "{}",
            chain(&err)
        );
    }
}
