//! The core-analysis CSV reader on arbitrary bytes: refuse or read, never panic.
#![no_main]
use libfuzzer_sys::fuzz_target;
mod common;

fuzz_target!(|data: &[u8]| {
    common::with_file(data, "csv", |p| {
        for unit in [
            flowzone::units::DepthUnit::Metre,
            flowzone::units::DepthUnit::Foot,
        ] {
            let _ = flowzone::input::core_samples::read_core_csv(p, unit);
        }
    });
});
