//! Output-folder safety: a run never writes into its inputs, never reads
//! an input from inside its output folder, and never overwrites a finished
//! run's folder unless asked.

use std::path::{Path, PathBuf};

use crate::error::Error;

/// Where outputs go: refuse a folder that is, or is inside, a folder of
/// `[input] wells` (`folders`: as written in the config, as resolved), named
/// as the user wrote it. A folder that merely holds an input file is not
/// refused: a run never writes over its inputs ([`check_inputs_outside`]).
pub fn check_out_dir(out: &Path, folders: &[(PathBuf, PathBuf)]) -> Result<(), Error> {
    std::fs::create_dir_all(out).map_err(|source| Error::Io {
        path: out.to_path_buf(),
        source,
    })?;
    let out_abs = out.canonicalize().map_err(|source| Error::Io {
        path: out.to_path_buf(),
        source,
    })?;
    for (written, dir) in folders {
        if let Ok(d) = dir.canonicalize() {
            if out_abs.starts_with(&d) {
                return Err(Error::Usage(format!(
                    "output folder `{}` is inside `{}` ([input] wells, `{}`): a later run would read its LAS outputs as wells; choose a folder outside it",
                    out.display(),
                    written.display(),
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
/// atomically, and at the end the files the previous run listed that this
/// run did not write are removed ([`crate::field::Rerun`]).
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
