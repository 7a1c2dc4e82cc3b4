//! The config loader on arbitrary text: refuse with an error or load, never panic.
#![no_main]
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = std::str::from_utf8(data) {
        let _ = flowzone::config::Config::from_toml(text, "fuzz.toml".as_ref(), ".".into());
    }
});
