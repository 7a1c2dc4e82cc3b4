//! Placeholder until the forward model lands.
pub const DEMO_SEED: u64 = 20261202;
