//! Fuzz target `project`: see fillpace::fuzzing::project.
#![no_main]
libfuzzer_sys::fuzz_target!(|data: &[u8]| fillpace::fuzzing::project(data));
