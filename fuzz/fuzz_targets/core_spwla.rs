//! The SPWLA core-data reader on arbitrary bytes: refuse or read, never panic.
#![no_main]
use flowzone::units::DepthUnit;
use libfuzzer_sys::fuzz_target;
mod common;

fuzz_target!(|data: &[u8]| {
    common::with_file(data, "spwla", |p| {
        for file_depth in [DepthUnit::Metre, DepthUnit::Foot] {
            let _ = flowzone::input::core_samples::read_spwla(p, file_depth, DepthUnit::Metre);
        }
    });
});
