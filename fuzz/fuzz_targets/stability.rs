//! Fuzz target `stability`: see fillpace::fuzzing::stability.
#![no_main]
libfuzzer_sys::fuzz_target!(|data: &[u8]| fillpace::fuzzing::stability(data));
