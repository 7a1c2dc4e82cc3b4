//! The zone-tops CSV reader on arbitrary bytes.
#![no_main]
use libfuzzer_sys::fuzz_target;
mod common;

fuzz_target!(|data: &[u8]| {
    common::with_file(data, "csv", |p| {
        let _ = flowzone::well::zones::Tops::read(p, flowzone::units::DepthUnit::Metre);
    });
});
