//! The audit log of release decisions: one JSON object per line, only ever
//! appended (never rewritten). Each line carries `entry` (1, 2, …),
//! `prev_sha256` (SHA-256 of the previous line's bytes, 64 zeros for the
//! first) and `sha256` (SHA-256 of the line's own JSON without that key),
//! with keys in sorted order so that a line has exactly one written form.
//! Any edit, removal or insertion breaks the chain at a definite line, and
//! a torn last line (an append cut short) is detected rather than accepted.

use crate::error::{Error, Result};
use crate::report::sha256_hex;
use serde::Serialize;
use serde_json::{Map, Value};
use std::io::Write;
use std::path::Path;

/// `prev_sha256` of the first entry.
pub const GENESIS: &str = "0000000000000000000000000000000000000000000000000000000000000000";

/// A verified log.
#[derive(Debug, Clone, Serialize)]
pub struct Verified {
    pub file: String,
    pub entries: usize,
    /// SHA-256 of the last line (the `prev_sha256` of the next entry).
    pub last_sha256: String,
}

/// Check the whole chain; the error names the first bad line.
pub fn verify(path: &Path) -> Result<Verified> {
    let file = path.display().to_string();
    if !path.exists() {
        return Ok(Verified { file, entries: 0, last_sha256: GENESIS.into() });
    }
    let bytes = std::fs::read(path).map_err(|source| Error::Read { path: path.to_path_buf(), source })?;
    verify_bytes(&bytes, &file)
}

/// `verify` on the log's bytes; `file` names it in messages.
pub fn verify_bytes(bytes: &[u8], file: &str) -> Result<Verified> {
    let broken = |line: usize, message: String| Error::input(file, Some(line), "", message);
    let mut prev = GENESIS.to_string();
    let mut entries = 0;
    let mut rest = bytes;
    while !rest.is_empty() {
        let n = entries + 1;
        let Some(end) = rest.iter().position(|b| *b == b'\n') else {
            return Err(broken(
                n,
                "is incomplete (no end of line): an append was interrupted, so this entry is torn. Keep a copy of the log, inspect the last decision and remove the torn line only with the engineer of record's approval".into(),
            ));
        };
        let line = &rest[..end];
        rest = &rest[end + 1..];
        let text = std::str::from_utf8(line).map_err(|_| broken(n, "is not UTF-8 text: the log was damaged".into()))?;
        let mut map: Map<String, Value> = serde_json::from_str(text)
            .map_err(|e| broken(n, format!("is not a complete JSON object ({e}): the entry is torn or was edited")))?;
        let canonical = serde_json::to_string(&map).map_err(|e| broken(n, e.to_string()))?;
        if canonical != text {
            return Err(broken(n, "is not in the form it was written in: the line was edited".into()));
        }
        if map.get("entry").and_then(Value::as_u64) != Some(n as u64) {
            return Err(broken(
                n,
                format!("does not carry entry number {n}: entries were removed, inserted or edited"),
            ));
        }
        let own = match map.remove("sha256") {
            Some(Value::String(s)) => s,
            _ => return Err(broken(n, "has no sha256: the entry was edited".into())),
        };
        let body = serde_json::to_string(&map).map_err(|e| broken(n, e.to_string()))?;
        if sha256_hex(body.as_bytes()) != own {
            return Err(broken(n, "was changed after it was written: its sha256 does not match its content".into()));
        }
        if map.get("prev_sha256").and_then(Value::as_str) != Some(prev.as_str()) {
            return Err(broken(
                n,
                format!(
                    "does not follow line {}: prev_sha256 does not match the previous line (an entry was removed, inserted or edited)",
                    n - 1
                ),
            ));
        }
        prev = sha256_hex(line);
        entries = n;
    }
    Ok(Verified { file: file.to_string(), entries, last_sha256: prev })
}

/// Verify a log before appending to it: as `verify`, with the refusal
/// stated in the message.
pub fn appendable(path: &Path) -> Result<Verified> {
    verify(path).map_err(|e| match e {
        Error::Input { file, mut issues } => {
            for i in &mut issues {
                i.message.push_str("; nothing was appended to the damaged log");
            }
            Error::Input { file, issues }
        }
        other => other,
    })
}

/// Append one entry (an object's fields) to the log after verifying it;
/// returns the entry number. The write is one `write_all` followed by a
/// flush and an fsync.
pub fn append(path: &Path, fields: Map<String, Value>) -> Result<usize> {
    let v = appendable(path)?;
    let line = entry_line(fields, v.entries + 1, &v.last_sha256)?;
    let err = |source| Error::Write { path: path.to_path_buf(), source };
    let mut f = std::fs::OpenOptions::new().create(true).append(true).open(path).map_err(err)?;
    f.write_all(line.as_bytes()).map_err(err)?;
    f.flush().map_err(err)?;
    f.sync_all().map_err(err)?;
    Ok(v.entries + 1)
}

/// The text of entry `n` with its chain fields, ending in a newline.
pub fn entry_line(mut fields: Map<String, Value>, n: usize, prev: &str) -> Result<String> {
    fields.insert("entry".into(), Value::from(n));
    fields.insert("prev_sha256".into(), Value::from(prev));
    fields.remove("sha256");
    let body = serde_json::to_string(&fields).map_err(|e| Error::Computation(e.to_string()))?;
    fields.insert("sha256".into(), Value::from(sha256_hex(body.as_bytes())));
    let mut line = serde_json::to_string(&fields).map_err(|e| Error::Computation(e.to_string()))?;
    line.push('\n');
    Ok(line)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn fields(d: &str) -> Map<String, Value> {
        let mut m = Map::new();
        m.insert("decision".into(), Value::from(d));
        m.insert("fs".into(), Value::from(1.2345));
        m
    }

    fn log(n: usize) -> String {
        let mut out = String::new();
        let mut prev = GENESIS.to_string();
        for k in 1..=n {
            let line = entry_line(fields(if k % 2 == 0 { "HOLD" } else { "RELEASE" }), k, &prev).unwrap();
            prev = sha256_hex(line.trim_end_matches('\n').as_bytes());
            out.push_str(&line);
        }
        out
    }

    fn bad_line(text: &str) -> Option<usize> {
        match verify_bytes(text.as_bytes(), "log") {
            Ok(_) => None,
            Err(Error::Input { issues, .. }) => issues[0].line,
            Err(e) => panic!("{e}"),
        }
    }

    #[test]
    fn a_clean_chain_verifies() {
        assert_eq!(verify_bytes(log(4).as_bytes(), "log").unwrap().entries, 4);
        assert_eq!(bad_line(""), None);
    }

    #[test]
    fn editing_any_line_is_found_at_that_line() {
        let text = log(4);
        for k in 0..4 {
            let lines: Vec<String> = text
                .lines()
                .enumerate()
                .map(|(i, l)| if i == k { l.replace("1.2345", "1.3345") } else { l.to_string() })
                .collect();
            assert_eq!(bad_line(&(lines.join("\n") + "\n")), Some(k + 1), "edit at line {}", k + 1);
        }
    }

    #[test]
    fn removing_a_line_breaks_the_chain_there() {
        let text = log(4);
        let lines: Vec<&str> = text.lines().collect();
        let text = [lines[0], lines[2], lines[3]].join("\n") + "\n";
        assert_eq!(bad_line(&text), Some(2));
    }

    #[test]
    fn awkward_floats_keep_their_written_form() {
        // A line must parse back to exactly the same text (serde_json's
        // float_roundtrip feature); without it some values were re-written
        // one digit apart and honest lines read as edited.
        let mut text = String::new();
        let mut prev = GENESIS.to_string();
        let mut x = 0.1f64;
        for k in 1..=200 {
            x = (x * 7.389_056_098_930_65 + 0.123_456_789).fract() * 3.0;
            let mut m = Map::new();
            m.insert("fs_next".into(), Value::from(x));
            m.insert("multiplier".into(), Value::from(x / 3.7));
            let line = entry_line(m, k, &prev).unwrap();
            prev = sha256_hex(line.trim_end_matches('\n').as_bytes());
            text.push_str(&line);
        }
        assert_eq!(verify_bytes(text.as_bytes(), "log").unwrap().entries, 200);
    }

    #[test]
    fn a_torn_last_line_is_detected() {
        let text = log(3);
        for cut in [1, 10, 40] {
            assert_eq!(bad_line(&text[..text.len() - cut]), Some(3), "cut {cut}");
        }
    }
}
