//! The formula layer of shale volume and porosity, and formation water.
//!
//! Pure functions of scalars, no config and no clipping inside: the stage
//! ([`crate::well::chain`]) applies them to a well's curves, clips to physical bounds and
//! counts what it clipped.

pub mod saturation;

pub mod porosity;
pub mod shale;
pub mod water;
