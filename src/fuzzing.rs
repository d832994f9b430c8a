//! Entry points of the fuzz targets (fuzz/) and of their corpus replay
//! (tests/fuzz_corpus.rs): arbitrary bytes into the project parser and
//! validator, the readings parser, and the whole `check` path. Each must
//! return (an error is fine) and never panic, hang or exhaust memory.

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
