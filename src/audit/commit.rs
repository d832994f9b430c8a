//! A hold-point check record (PDF) and its log entry written as one
//! transaction: under an exclusive lock on the log, the log is verified,
//! the record is written to a temporary file beside its final name, the
//! entry is appended and synced, and the temporary file is linked to its
//! final name without replacing anything. On any failure the log is cut
//! back to its length before the append, the temporary file is removed and
//! a log this run created is deleted: nothing remains.

use super::{Entry, GENESIS, appendable_bytes, entry_line};
use crate::error::{Error, Result};
use crate::hash::sha256_hex;
use serde_json::{Map, Value};
use std::fs::File;
use std::io::{Read, Write};
use std::path::{Path, PathBuf};

/// Points of the transaction where a test can simulate a crash.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Stage {
    /// The record's temporary file is written and synced.
    RecordWritten,
    /// The log entry is appended and synced; the record is not yet in place.
    LogAppended,
}

/// What the record being written needs to know about the log.
#[derive(Debug, Clone)]
pub struct Slot {
    /// Number of the new record (its entry number in the log).
    pub record: usize,
    /// Entries and head (SHA-256 of the last line) before the new record.
    pub entries_before: usize,
    pub head_before: String,
    /// The entries already in the log.
    pub entries: Vec<Entry>,
}

/// The transaction's outcome: the record number and the log's new head.
#[derive(Debug, Clone)]
pub struct Committed {
    pub slot: Slot,
    pub record_sha256: String,
    pub entries_after: usize,
    pub head_after: String,
}

/// Write the record and its log entry as one transaction. `make` renders
/// the record's bytes and the entry's fields for the slot it is given.
pub fn commit(
    log: &Path,
    record: &Path,
    make: impl FnOnce(&Slot) -> Result<(Vec<u8>, Map<String, Value>)>,
) -> Result<Committed> {
    commit_with(log, record, make, |_| Ok(()))
}

/// As `commit`, with a hook run at each stage (tests inject crashes).
pub fn commit_with(
    log: &Path,
    record: &Path,
    make: impl FnOnce(&Slot) -> Result<(Vec<u8>, Map<String, Value>)>,
    mut hook: impl FnMut(Stage) -> std::io::Result<()>,
) -> Result<Committed> {
    if record.exists() {
        return Err(Error::Usage(format!(
            "{} exists; hold-point check records are never overwritten: choose another --pdf name",
            record.display()
        )));
    }
    let existed = log.exists();
    let werr = |path: &Path| {
        let path = path.to_path_buf();
        move |source| Error::Write { path, source }
    };
    let mut f = std::fs::OpenOptions::new().read(true).append(true).create(true).open(log).map_err(werr(log))?;
    let result = locked(&mut f, log, record, make, &mut hook);
    if result.is_err() && !existed {
        drop(f);
        let _ = std::fs::remove_file(log);
    }
    result
}

fn locked(
    f: &mut File,
    log: &Path,
    record: &Path,
    make: impl FnOnce(&Slot) -> Result<(Vec<u8>, Map<String, Value>)>,
    hook: &mut impl FnMut(Stage) -> std::io::Result<()>,
) -> Result<Committed> {
    let werr = |source| Error::Write { path: log.to_path_buf(), source };
    f.lock().map_err(werr)?;
    let mut bytes = Vec::new();
    f.read_to_end(&mut bytes).map_err(|source| Error::Read { path: log.to_path_buf(), source })?;
    let (v, entries) = appendable_bytes(&bytes, &log.display().to_string())?;
    let slot = Slot {
        record: v.entries + 1,
        entries_before: v.entries,
        head_before: if v.entries == 0 { GENESIS.into() } else { v.last_sha256.clone() },
        entries,
    };
    let (pdf, mut fields) = make(&slot)?;
    let record_sha256 = sha256_hex(&pdf);
    fields.insert("record_sha256".into(), Value::from(record_sha256.clone()));
    let line = entry_line(fields, slot.record, &slot.head_before)?;
    let tmp = temporary(record);
    let outcome = (|| -> Result<()> {
        write_new(&tmp, &pdf).map_err(|source| Error::Write { path: record.to_path_buf(), source })?;
        hook(Stage::RecordWritten).map_err(|source| Error::Write { path: record.to_path_buf(), source })?;
        f.write_all(line.as_bytes()).and_then(|()| f.sync_all()).map_err(werr)?;
        hook(Stage::LogAppended).map_err(werr)?;
        std::fs::hard_link(&tmp, record).map_err(|source| Error::Write { path: record.to_path_buf(), source })
    })();
    let _ = std::fs::remove_file(&tmp);
    if let Err(e) = outcome {
        // Cut the log back to its length before the append.
        let _ = f.set_len(bytes.len() as u64).and_then(|()| f.sync_all());
        return Err(e);
    }
    let head_after = sha256_hex(line.trim_end_matches('\n').as_bytes());
    Ok(Committed { entries_after: slot.record, slot, record_sha256, head_after })
}

/// The temporary name of a record beside its final name.
fn temporary(record: &Path) -> PathBuf {
    let name = record.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    record.with_file_name(format!(".{name}.{}.tmp", std::process::id()))
}

fn write_new(path: &Path, bytes: &[u8]) -> std::io::Result<()> {
    let mut f = std::fs::OpenOptions::new().write(true).create_new(true).open(path)?;
    f.write_all(bytes)?;
    f.sync_all()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn entry(n: usize) -> (Vec<u8>, Map<String, Value>) {
        let mut m = Map::new();
        m.insert("record_file".into(), Value::from(format!("r{n}.pdf")));
        (format!("%PDF record {n}").into_bytes(), m)
    }

    #[test]
    fn a_crash_at_either_stage_leaves_nothing() {
        let dir = tempfile::tempdir().unwrap();
        let log = dir.path().join("log.jsonl");
        commit(&log, &dir.path().join("r1.pdf"), |s| Ok(entry(s.record))).unwrap();
        let before = std::fs::read(&log).unwrap();
        for stage in [Stage::RecordWritten, Stage::LogAppended] {
            let r = commit_with(
                &log,
                &dir.path().join("r2.pdf"),
                |s| Ok(entry(s.record)),
                |at| if at == stage { Err(std::io::Error::other("simulated crash")) } else { Ok(()) },
            );
            assert!(r.is_err(), "{stage:?}");
            assert_eq!(std::fs::read(&log).unwrap(), before, "log changed after a crash at {stage:?}");
            let mut names: Vec<String> = std::fs::read_dir(dir.path())
                .unwrap()
                .map(|e| e.unwrap().file_name().to_string_lossy().into())
                .collect();
            names.sort();
            assert_eq!(names, ["log.jsonl", "r1.pdf"], "left behind after {stage:?}");
        }
        let c = commit(&log, &dir.path().join("r2.pdf"), |s| Ok(entry(s.record))).unwrap();
        assert_eq!(c.slot.record, 2);
        assert_eq!(super::super::verify(&log).unwrap().last_sha256, c.head_after);
    }

    #[test]
    fn a_first_record_that_fails_leaves_no_log() {
        let dir = tempfile::tempdir().unwrap();
        let log = dir.path().join("log.jsonl");
        let r = commit(&log, &dir.path().join("no-such-folder/r1.pdf"), |s| Ok(entry(s.record)));
        assert!(r.is_err());
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
    }

    #[test]
    fn an_existing_record_is_never_overwritten() {
        let dir = tempfile::tempdir().unwrap();
        let (log, pdf) = (dir.path().join("log.jsonl"), dir.path().join("r1.pdf"));
        commit(&log, &pdf, |s| Ok(entry(s.record))).unwrap();
        let first = std::fs::read(&pdf).unwrap();
        assert!(matches!(commit(&log, &pdf, |s| Ok(entry(s.record))), Err(Error::Usage(_))));
        assert_eq!(std::fs::read(&pdf).unwrap(), first);
        assert_eq!(super::super::verify(&log).unwrap().entries, 1);
    }
}
