//! Writes the demo field.
use crate::error::Error;
use std::path::Path;
pub fn write_demo(_out: &Path, _seed: u64) -> Result<(), Error> {
    Err(Error::Usage("not yet".into()))
}
