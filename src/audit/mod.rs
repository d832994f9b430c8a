//! The record log of hold-point checks: one JSON object per line, only ever
//! appended (never rewritten). Each line carries `entry` (1, 2, …),
//! `prev_sha256` (SHA-256 of the exact bytes of the previous line, 64 zeros
//! for the first) and, as its last key, `sha256`: the SHA-256 of the exact
//! bytes of the line before `,"sha256":…` with the closing brace, so a line is
//! checked as written, never re-serialised. Any edit, removal or insertion
//! breaks the chain at a definite line, a torn last line is detected, and
//! `verify` can check the log against the head printed on a signed record
//! (a dropped last entry or a re-hashed forgery) and every record PDF
//! against the SHA-256 logged for it. `commit` (in `commit.rs`) writes a
//! record and its entry as one transaction under a file lock.

mod commit;

pub use commit::{Committed, Slot, Stage, commit, commit_with};

use crate::error::{Error, Result};
use crate::hash::sha256_hex;
use serde::Serialize;
use serde_json::{Map, Value};
use std::path::{Path, PathBuf};

/// `prev_sha256` of the first entry.
pub const GENESIS: &str = "0000000000000000000000000000000000000000000000000000000000000000";

/// The text between a line's body and its own hash.
const HASH_KEY: &str = ",\"sha256\":\"";

/// One entry as read back: its number, the hash of its line and its fields.
#[derive(Debug, Clone)]
pub struct Entry {
    pub number: usize,
    pub line_sha256: String,
    pub fields: Map<String, Value>,
}

/// What became of a record PDF named in the log.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum RecordState {
    /// The file's SHA-256 is the one logged.
    Matches,
    /// The file exists but its bytes differ from those logged.
    Changed,
    /// No file at the logged path (nor beside the log).
    Missing,
}

/// One record PDF checked against its logged SHA-256.
#[derive(Debug, Clone, Serialize)]
pub struct RecordCheck {
    pub entry: usize,
    pub record_file: String,
    pub state: RecordState,
}

/// A verified log.
#[derive(Debug, Clone, Serialize)]
pub struct Verified {
    pub file: String,
    pub entries: usize,
    /// SHA-256 of the last line (the `prev_sha256` of the next entry).
    pub last_sha256: String,
    /// Every record PDF named in the log, checked (empty when not asked).
    pub records: Vec<RecordCheck>,
    /// The anchor checked, when one was given.
    pub anchor: Option<Anchor>,
}

/// What a signed record says about the log: it is entry `record`, and the
/// log before it ended in `head` (the head printed on the record).
#[derive(Debug, Clone, Serialize)]
pub struct Anchor {
    pub record: usize,
    pub head: String,
}

/// Read and check the whole chain; the error names the first bad line.
/// A missing file is an empty log.
pub fn read(path: &Path) -> Result<(Verified, Vec<Entry>)> {
    let file = path.display().to_string();
    if !path.exists() {
        return Ok((Verified { file, entries: 0, last_sha256: GENESIS.into(), records: vec![], anchor: None }, vec![]));
    }
    let bytes = std::fs::read(path).map_err(|source| Error::Read { path: path.to_path_buf(), source })?;
    parse(&bytes, &file)
}

/// Check the chain of the log at `path`.
pub fn verify(path: &Path) -> Result<Verified> {
    read(path).map(|(v, _)| v)
}

/// `verify` on the log's bytes; `file` names it in messages.
pub fn verify_bytes(bytes: &[u8], file: &str) -> Result<Verified> {
    parse(bytes, file).map(|(v, _)| v)
}

fn broken(file: &str, line: usize, message: String) -> Error {
    Error::input(file, Some(line), "", message)
}

/// Parse and check every line of a log.
pub fn parse(bytes: &[u8], file: &str) -> Result<(Verified, Vec<Entry>)> {
    let mut prev = GENESIS.to_string();
    let mut entries = Vec::new();
    let mut rest = bytes;
    while !rest.is_empty() {
        let n = entries.len() + 1;
        let Some(end) = rest.iter().position(|b| *b == b'\n') else {
            return Err(broken(
                file,
                n,
                "is incomplete (no end of line): an append was interrupted, so this entry is torn. Keep a copy of the log, inspect the last record and remove the torn line only with the engineer of record's approval".into(),
            ));
        };
        let line = &rest[..end];
        rest = &rest[end + 1..];
        let fields = check_line(line, n, &prev, file)?;
        prev = sha256_hex(line);
        entries.push(Entry { number: n, line_sha256: prev.clone(), fields });
    }
    let v =
        Verified { file: file.to_string(), entries: entries.len(), last_sha256: prev, records: vec![], anchor: None };
    Ok((v, entries))
}

/// Check one line (entry `n`, previous line's hash `prev`); its fields.
fn check_line(line: &[u8], n: usize, prev: &str, file: &str) -> Result<Map<String, Value>> {
    let text =
        std::str::from_utf8(line).map_err(|_| broken(file, n, "is not UTF-8 text: the log was damaged".into()))?;
    let cut = text.rfind(HASH_KEY).filter(|k| text.len() == k + HASH_KEY.len() + 66 && text.ends_with("\"}"));
    let Some(cut) = cut else {
        return Err(broken(file, n, "does not end in its own sha256: the entry is torn or was edited".into()));
    };
    let own = &text[cut + HASH_KEY.len()..text.len() - 2];
    let body = format!("{}}}", &text[..cut]);
    if sha256_hex(body.as_bytes()) != own {
        return Err(broken(file, n, "was changed after it was written: its sha256 does not match its bytes".into()));
    }
    let fields: Map<String, Value> = serde_json::from_str(&body)
        .map_err(|e| broken(file, n, format!("is not a complete JSON object ({e}): the entry was edited")))?;
    if fields.get("entry").and_then(Value::as_u64) != Some(n as u64) {
        return Err(broken(
            file,
            n,
            format!("does not carry entry number {n}: entries were removed, inserted or edited"),
        ));
    }
    if fields.get("prev_sha256").and_then(Value::as_str) != Some(prev) {
        return Err(broken(
            file,
            n,
            format!(
                "does not follow line {}: prev_sha256 does not match the previous line (an entry was removed, inserted or edited)",
                n - 1
            ),
        ));
    }
    Ok(fields)
}

/// Check the log against the anchor printed on a signed record: the record
/// must be in the log, and the log before it must end in the head the
/// record carries.
pub fn check_anchor(file: &str, entries: &[Entry], a: &Anchor) -> Result<()> {
    let fail = |message: String| Error::input(file, None, "", message);
    if a.record == 0 || a.record > entries.len() {
        return Err(fail(format!(
            "has {} entries but record {} was issued from it: entries were dropped from the end of the log (or the record number is wrong)",
            entries.len(),
            a.record
        )));
    }
    let before = if a.record == 1 { GENESIS } else { entries[a.record - 2].line_sha256.as_str() };
    if before != a.head {
        return Err(fail(format!(
            "does not match record {}: the log before it ends in {before}, the record carries {}; entries before the record were changed and re-hashed",
            a.record, a.head
        )));
    }
    Ok(())
}

/// Check every record PDF named in the log against its logged SHA-256. A
/// relative path is looked up beside the log; a path that is gone is also
/// looked up beside the log by its file name.
pub fn check_records(log: &Path, entries: &[Entry]) -> Vec<RecordCheck> {
    let dir = log.parent().map_or_else(|| PathBuf::from("."), Path::to_path_buf);
    entries
        .iter()
        .filter_map(|e| {
            let name = e.fields.get("record_file")?.as_str()?;
            let logged = e.fields.get("record_sha256")?.as_str()?;
            let given = PathBuf::from(name);
            let found = [dir.join(&given), given.file_name().map(|f| dir.join(f)).unwrap_or_default()]
                .into_iter()
                .find(|p| p.is_file());
            let state = match found.and_then(|p| std::fs::read(p).ok()) {
                None => RecordState::Missing,
                Some(b) if sha256_hex(&b) == logged => RecordState::Matches,
                Some(_) => RecordState::Changed,
            };
            Some(RecordCheck { entry: e.number, record_file: name.to_string(), state })
        })
        .collect()
}

/// Verify a log before appending to it: as `read`, with the refusal
/// stated in the message.
pub fn appendable(path: &Path) -> Result<(Verified, Vec<Entry>)> {
    read(path).map_err(refusal)
}

/// `appendable` on the log's bytes.
fn appendable_bytes(bytes: &[u8], file: &str) -> Result<(Verified, Vec<Entry>)> {
    parse(bytes, file).map_err(refusal)
}

fn refusal(e: Error) -> Error {
    match e {
        Error::Input { file, mut issues } => {
            for i in &mut issues {
                i.message.push_str("; nothing was written to the damaged log");
            }
            Error::Input { file, issues }
        }
        other => other,
    }
}

/// The text of entry `n` with its chain fields, ending in a newline: the
/// fields in sorted order, then `sha256` of those exact bytes.
pub fn entry_line(mut fields: Map<String, Value>, n: usize, prev: &str) -> Result<String> {
    fields.insert("entry".into(), Value::from(n));
    fields.insert("prev_sha256".into(), Value::from(prev));
    fields.remove("sha256");
    let body = serde_json::to_string(&fields).map_err(|e| Error::Computation(e.to_string()))?;
    let own = sha256_hex(body.as_bytes());
    Ok(format!("{}{HASH_KEY}{own}\"}}\n", &body[..body.len() - 1]))
}

#[cfg(test)]
mod tests;
