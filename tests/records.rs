//! The record log on real files (issue 15, item 7): records are numbered,
//! a re-check supersedes and never overwrites, a failed run leaves nothing,
//! and `log verify` finds edits, torn lines, a dropped last entry or a
//! re-hashed forgery against a signed record's anchor, and changed PDFs.

mod common;
use common::*;
use std::path::{Path, PathBuf};

fn scratch() -> (tempfile::TempDir, PathBuf, PathBuf) {
    let dir = tempfile::tempdir().unwrap();
    let project = dir.path().join("site.toml");
    let readings = dir.path().join("readings.csv");
    std::fs::copy(root(DEMO), &project).unwrap();
    std::fs::copy(root("examples/kestrel-fen-readings.csv"), &readings).unwrap();
    (dir, project, readings)
}

fn check(project: &Path, readings: &Path, extra: &[&str]) -> std::process::Output {
    fillpace()
        .arg("release")
        .arg(project)
        .arg("--readings")
        .arg(readings)
        .args(["--lift", "1.0"])
        .args(extra)
        .output()
        .unwrap()
}

fn verify(log: &Path, extra: &[&str]) -> std::process::Output {
    fillpace().args(["log", "verify"]).arg(log).args(extra).output().unwrap()
}

#[test]
fn a_recheck_gets_a_new_number_supersedes_and_never_overwrites() {
    let (dir, project, readings) = scratch();
    assert!(check(&project, &readings, &[]).status.success());
    let first = dir.path().join("site-hold-point-2027-07-05-record-1.pdf");
    let bytes = std::fs::read(&first).unwrap();
    let out = check(&project, &readings, &["--json"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    assert_eq!(r["record"], 2);
    assert_eq!(r["supersedes"], 1);
    assert!(dir.path().join("site-hold-point-2027-07-05-record-2.pdf").exists());
    assert_eq!(std::fs::read(&first).unwrap(), bytes, "record 1 was overwritten");
    // An explicit --pdf naming an existing record is refused, nothing written.
    let log = dir.path().join("site.hold-point-log.jsonl");
    let before = std::fs::read(&log).unwrap();
    let out = check(&project, &readings, &["--pdf", first.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("never overwritten"));
    assert_eq!(std::fs::read(&log).unwrap(), before);
    assert_eq!(std::fs::read(&first).unwrap(), bytes);
}

#[test]
fn a_log_in_a_missing_folder_leaves_no_record() {
    // Found: exit 1 but a certificate saying it was recorded stayed behind.
    let (dir, project, readings) = scratch();
    let out = check(&project, &readings, &["--log", dir.path().join("no/such/log.jsonl").to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    let names: Vec<String> =
        std::fs::read_dir(dir.path()).unwrap().map(|e| e.unwrap().file_name().to_string_lossy().into()).collect();
    assert_eq!(names.len(), 2, "left behind: {names:?}");
}

#[test]
fn a_dropped_last_entry_and_a_changed_pdf_are_found() {
    let (dir, project, readings) = scratch();
    assert!(check(&project, &readings, &[]).status.success());
    let r = json_result(&check(&project, &readings, &["--json"]).stdout);
    let head = r["log_head_before"].as_str().unwrap().to_string();
    let log = dir.path().join("site.hold-point-log.jsonl");
    let out = verify(&log, &["--record", "2", "--head", &head]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    assert!(String::from_utf8_lossy(&out.stdout).contains("hash chain intact"));

    // Drop the last entry: the chain alone is intact, the anchor is not.
    let text = std::fs::read_to_string(&log).unwrap();
    let first_line = format!("{}\n", text.lines().next().unwrap());
    std::fs::write(&log, &first_line).unwrap();
    assert!(verify(&log, &[]).status.success());
    let out = verify(&log, &["--record", "2", "--head", &head]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("dropped"));
    std::fs::write(&log, &text).unwrap();

    // Change record 1's PDF: reported by number.
    let pdf = dir.path().join("site-hold-point-2027-07-05-record-1.pdf");
    let mut bytes = std::fs::read(&pdf).unwrap();
    bytes.push(b'\n');
    std::fs::write(&pdf, bytes).unwrap();
    let out = verify(&log, &[]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("record 1") && err.contains("changed"), "{err}");
}

#[test]
fn an_edited_entry_stops_the_next_check_and_a_torn_line_is_caught() {
    let (dir, project, readings) = scratch();
    assert!(check(&project, &readings, &[]).status.success());
    let log = dir.path().join("site.hold-point-log.jsonl");
    let honest = std::fs::read_to_string(&log).unwrap();
    let edited = honest.replacen("\"fs_next\":", "\"fs_next\":1", 1);
    std::fs::write(&log, &edited).unwrap();
    let out = verify(&log, &[]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("site.hold-point-log.jsonl:1:"));
    let out = check(&project, &readings, &[]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("nothing was written"));
    assert_eq!(std::fs::read_to_string(&log).unwrap(), edited);
    assert!(!dir.path().join("site-hold-point-2027-07-05-record-2.pdf").exists());
    std::fs::write(&log, &honest[..honest.len() - 30]).unwrap();
    let err = String::from_utf8_lossy(&verify(&log, &[]).stderr).to_string();
    assert!(err.contains(":1:") && err.contains("torn"), "{err}");
}
