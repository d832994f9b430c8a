//! Fuzz target `plan`: see fillpace::fuzzing::plan.
#![no_main]
libfuzzer_sys::fuzz_target!(|data: &[u8]| fillpace::fuzzing::plan(data));
