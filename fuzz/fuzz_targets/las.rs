//! The LAS reader on arbitrary bytes: it may refuse, never panic; what it
//! accepts has one column per curve, all the same length.
#![no_main]
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    for strict in [false, true] {
        let options = flowzone::input::las::ReadOptions {
            strict,
            ..Default::default()
        };
        if let Ok(f) = flowzone::input::las::read_bytes(data, "fuzz.las".as_ref(), options) {
            assert_eq!(f.columns.len(), f.curves.len());
            let n = f.index().len();
            assert!(f.columns.iter().all(|c| c.len() == n));
            // what was read can be written
            let mut out = Vec::new();
            flowzone::output::las::write_las(&mut out, &f, &[]).expect("in memory");
        }
    }
});
