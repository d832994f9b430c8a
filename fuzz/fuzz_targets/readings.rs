//! Fuzz target `readings`: see fillpace::fuzzing::readings.
#![no_main]
libfuzzer_sys::fuzz_target!(|data: &[u8]| fillpace::fuzzing::readings(data));
