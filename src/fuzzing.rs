//! Entry points of the fuzz targets (fuzz/) and of their corpus replay
//! (tests/fuzz_corpus.rs): arbitrary bytes into the project parser and
//! validator, the readings parser, the whole `check` path, and the planner
//! and slip-circle search on valid-but-extreme projects made from the demo
//! by the bytes. Each must return (an error is fine) and never panic, hang
//! or exhaust memory.

/// Project file text → validated project (or an input error).
pub fn project(data: &[u8]) {
    if let Ok(text) = std::str::from_utf8(data) {
        let _ = crate::input::parse(text, "fuzz.toml");
    }
}

/// Readings file text against the demo project's instruments.
pub fn readings(data: &[u8]) {
    use std::sync::OnceLock;
    static DEMO: OnceLock<Option<crate::model::Project>> = OnceLock::new();
    let Some(p) = DEMO.get_or_init(|| crate::input::parse(crate::app::DEMO, "demo").ok()).as_ref() else { return };
    if let Ok(text) = std::str::from_utf8(data) {
        let _ = crate::monitoring::readings::parse(text, "fuzz.csv", p);
    }
}

/// The `check` command on arbitrary bytes: parse, validate, the initial
/// ground model, and its text and JSON reports.
pub fn check(data: &[u8]) {
    let text = String::from_utf8_lossy(data);
    if let Ok(p) = crate::input::parse(&text, "fuzz.toml") {
        let s = crate::ground::summary(&p, 1.0);
        let _ = crate::report::text::check(&p, &s, "fuzz.toml");
        let _ = crate::report::json::envelope("check", &p, "fuzz.toml", &s);
    }
}

/// Factors a fuzzed key's demo value is multiplied by: from zero through
/// tiny and large to a thousandfold. Results outside the allowed ranges are
/// refused by validation, so the projects that go on to be planned are
/// valid but extreme.
const FACTORS: [f64; 11] = [0.0, 1e-3, 0.05, 0.3, 0.7, 0.95, 1.05, 1.5, 3.0, 20.0, 1e3];

/// At most this many keys are changed per input (keeps each run short).
const MAX_CHANGES: usize = 8;

/// A valid project derived from the demo by fuzz bytes: each pair of bytes
/// picks a numeric key of the demo (in sorted order) and a factor from `FACTORS`; `None` when
/// the changed project does not validate. The first byte is left for the
/// caller.
pub fn extreme_project(data: &[u8]) -> Option<crate::model::Project> {
    let mut doc = crate::input::vary::Document::parse(crate::app::DEMO, "demo").ok()?;
    // Sorted, so that a byte names the same key whatever the map order.
    let mut keys = doc.numeric_paths();
    keys.sort();
    for pair in data.chunks_exact(2).take(MAX_CHANGES) {
        let key = &keys[usize::from(pair[0]) % keys.len()];
        let factor = FACTORS[usize::from(pair[1]) % FACTORS.len()];
        let v = doc.number(key)? * factor;
        // Integer keys stay integers (a float there is a type error).
        let value = if is_integer_key(key) { toml::Value::Integer(v.round() as i64) } else { toml::Value::Float(v) };
        doc.set(key, value).ok()?;
    }
    doc.project("fuzz").ok()
}

fn is_integer_key(key: &str) -> bool {
    key.ends_with("min_rest_days") || key.ends_with("slices")
}

/// The planner (the `plan` command's engine) on a valid-but-extreme
/// project: it must return a plan or an error, never panic; libFuzzer's
/// `-timeout` bounds its run time (see fuzz/Cargo.toml).
pub fn plan(data: &[u8]) {
    let Some(p) = data.split_first().and_then(|(_, rest)| extreme_project(rest)) else { return };
    let engine = crate::response::Engine::new(&p);
    let _ = crate::schedule::planner::plan(&crate::schedule::Runner::new(&engine));
}

/// The slip-circle search (the `stability` command's engine) on a
/// valid-but-extreme project in its initial state, at a crest height from
/// the first byte (0–100% of the maximum height).
pub fn stability(data: &[u8]) {
    let Some((first, rest)) = data.split_first() else { return };
    let Some(p) = extreme_project(rest) else { return };
    let height = p.max_height_m() * f64::from(*first) / 255.0;
    let engine = crate::response::Engine::new(&p);
    let field = engine.field(&engine.initial_state());
    let section = crate::stability::Section::new(&p, height, &field);
    let _ = crate::stability::search::search(&section);
}
