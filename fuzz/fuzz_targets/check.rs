//! Fuzz target `check`: see fillpace::fuzzing::check.
#![no_main]
libfuzzer_sys::fuzz_target!(|data: &[u8]| fillpace::fuzzing::check(data));
