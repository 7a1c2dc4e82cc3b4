//! The deviation-survey CSV reader on arbitrary bytes.
#![no_main]
use libfuzzer_sys::fuzz_target;
mod common;

fuzz_target!(|data: &[u8]| {
    common::with_file(data, "csv", |p| {
        let _ = flowzone::well::read_survey(p, flowzone::units::DepthUnit::Metre);
    });
});
