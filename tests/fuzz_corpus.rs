//! Replays the fuzz targets' seed corpus (fuzz/corpus/<target>/) and every
//! crashing input found while fuzzing (fuzz/regressions/<target>/) through
//! the same entry points as the fuzzers, on the stable toolchain: each
//! input must return without a panic.

use std::path::Path;

fn replay(dir: &str, target: fn(&[u8])) -> usize {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join(dir);
    let Ok(entries) = std::fs::read_dir(&path) else { return 0 };
    let mut n = 0;
    for entry in entries {
        let file = entry.unwrap().path();
        let bytes = std::fs::read(&file).unwrap();
        let result = std::panic::catch_unwind(|| target(&bytes));
        assert!(result.is_ok(), "{} panicked", file.display());
        n += 1;
    }
    n
}

#[test]
fn project_corpus_replays() {
    let n = replay("fuzz/corpus/project", fillpace::fuzzing::project)
        + replay("fuzz/regressions/project", fillpace::fuzzing::project);
    assert!(n >= 5, "only {n} inputs");
}

#[test]
fn readings_corpus_replays() {
    let n = replay("fuzz/corpus/readings", fillpace::fuzzing::readings)
        + replay("fuzz/regressions/readings", fillpace::fuzzing::readings);
    assert!(n >= 4, "only {n} inputs");
}

#[test]
fn check_corpus_replays() {
    let n = replay("fuzz/corpus/check", fillpace::fuzzing::check)
        + replay("fuzz/regressions/check", fillpace::fuzzing::check);
    assert!(n >= 5, "only {n} inputs");
}

#[test]
fn plan_corpus_replays() {
    let n =
        replay("fuzz/corpus/plan", fillpace::fuzzing::plan) + replay("fuzz/regressions/plan", fillpace::fuzzing::plan);
    assert!(n >= 5, "only {n} inputs");
}

#[test]
fn stability_corpus_replays() {
    let n = replay("fuzz/corpus/stability", fillpace::fuzzing::stability)
        + replay("fuzz/regressions/stability", fillpace::fuzzing::stability);
    assert!(n >= 5, "only {n} inputs");
}

/// The engine targets must reach the engines: every seed of the corpus
/// makes a valid project (a seed that fails validation tests nothing).
#[test]
fn engine_seeds_make_valid_projects() {
    for dir in ["fuzz/corpus/plan", "fuzz/corpus/stability"] {
        for entry in std::fs::read_dir(Path::new(env!("CARGO_MANIFEST_DIR")).join(dir)).unwrap() {
            let file = entry.unwrap().path();
            let bytes = std::fs::read(&file).unwrap();
            assert!(fillpace::fuzzing::extreme_project(&bytes[1..]).is_some(), "{} is not valid", file.display());
        }
    }
}
