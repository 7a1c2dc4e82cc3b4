//! Output-folder safety: a run never writes into its inputs, never reads
//! an input from inside its output folder, and never overwrites a finished
//! run's folder unless asked.

use std::path::{Path, PathBuf};

use crate::error::Error;

/// Where outputs go: refuse a folder that is, or is inside, an input folder.
pub fn check_out_dir(out: &Path, inputs: &[PathBuf]) -> Result<(), Error> {
    std::fs::create_dir_all(out).map_err(|source| Error::Io {
        path: out.to_path_buf(),
        source,
    })?;
    let out_abs = out.canonicalize().map_err(|source| Error::Io {
        path: out.to_path_buf(),
        source,
    })?;
    for input in inputs {
        let dir = if input.is_dir() {
            input.clone()
        } else {
            input
                .parent()
                .map_or_else(|| PathBuf::from("."), Path::to_path_buf)
        };
        let dir = if dir.as_os_str().is_empty() {
            PathBuf::from(".")
        } else {
            dir
        };
        if let Ok(d) = dir.canonicalize() {
            if out_abs.starts_with(&d) {
                return Err(Error::Usage(format!(
                    "output folder `{}` is inside the input folder `{}`; choose a folder outside the inputs",
                    out.display(),
                    dir.display()
                )));
            }
        }
    }
    Ok(())
}

/// Refuse inputs inside the output folder: a run writes there, and could
/// replace an input file with an output of the same name.
pub fn check_inputs_outside(out: &Path, inputs: &[PathBuf]) -> Result<(), Error> {
    let Ok(out_abs) = out.canonicalize() else {
        return Ok(());
    };
    for input in inputs {
        if let Ok(p) = input.canonicalize() {
            if p.starts_with(&out_abs) {
                return Err(Error::Usage(format!(
                    "input `{}` is inside the output folder `{}`: a run could overwrite it; move it or choose another output folder",
                    input.display(),
                    out.display()
                )));
            }
        }
    }
    Ok(())
}

/// The file that marks a finished run or merge in an output folder.
pub const FINISHED_MARKER: &str = "run-manifest.json";

/// Refuse to write into a folder that already holds `marker` (a previous
/// run's), unless `overwrite`: then files are replaced one by one, each
/// atomically, and files of wells no longer in the run are left as they are.
pub fn check_previous(out: &Path, marker: &Path, overwrite: bool) -> Result<(), Error> {
    let m = out.join(marker);
    if !overwrite && m.exists() {
        return Err(Error::Usage(format!(
            "`{}` holds a previous run (`{}` exists); give --overwrite to replace its files, or choose another output folder",
            out.display(),
            m.display()
        )));
    }
    Ok(())
}
