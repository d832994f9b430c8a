//! Shared helpers of the integration tests: run the real binary, read the
//! demo, write scratch projects into temporary folders.

#![allow(dead_code)]

use assert_cmd::Command;
use std::path::{Path, PathBuf};

pub const DEMO: &str = "examples/kestrel-fen.toml";

/// The fillpace binary, run from the crate root.
pub fn fillpace() -> Command {
    let mut c = Command::cargo_bin("fillpace").expect("binary built");
    c.current_dir(env!("CARGO_MANIFEST_DIR"));
    c
}

/// Path relative to the crate root.
pub fn root(rel: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join(rel)
}

/// Load and validate a project file through the library.
pub fn load(rel: &str) -> fillpace::model::Project {
    fillpace::input::load(&root(rel)).expect("valid project")
}

/// Parse the JSON envelope printed on stdout and return its `result`.
pub fn json_result(out: &[u8]) -> serde_json::Value {
    let v: serde_json::Value = serde_json::from_slice(out).expect("JSON on stdout");
    v["result"].clone()
}

/// Text of each page of a PDF, whitespace collapsed (read back with a
/// general-purpose PDF library, lopdf).
pub fn pages_text(pdf: &Path) -> Vec<String> {
    let doc = lopdf::Document::load(pdf).expect("valid PDF");
    doc.get_pages().keys().map(|n| collapse(&doc.extract_text(&[*n]).expect("text"))).collect()
}

/// `s` with every run of whitespace made one space.
pub fn collapse(s: &str) -> String {
    s.split_whitespace().collect::<Vec<_>>().join(" ")
}
