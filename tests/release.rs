//! The hold-point release check on real files: the demo decision with its
//! certificate and log line, the audit log's chain (append preserves
//! earlier lines byte for byte, edits and torn lines are caught), HOLD for
//! pore pressure rising under constant load and RELEASE for readings that
//! match a safe prediction, re-planning from readings, and every bad
//! readings file refused with its line named.

mod common;
use chrono::NaiveDateTime;
use common::*;
use fillpace::monitoring::synth::{Recipe, readings_csv};
use std::path::{Path, PathBuf};

const READINGS: &str = "examples/kestrel-fen-readings.csv";

/// The demo project and readings copied into a fresh folder (so that the
/// default certificate and log land there).
fn scratch() -> (tempfile::TempDir, PathBuf, PathBuf) {
    let dir = tempfile::tempdir().unwrap();
    let project = dir.path().join("site.toml");
    let readings = dir.path().join("readings.csv");
    std::fs::copy(root(DEMO), &project).unwrap();
    std::fs::copy(root(READINGS), &readings).unwrap();
    (dir, project, readings)
}

fn release(project: &Path, readings: &Path, lift: &str, extra: &[&str]) -> std::process::Output {
    fillpace()
        .arg("release")
        .arg(project)
        .arg("--readings")
        .arg(readings)
        .args(["--lift", lift])
        .args(extra)
        .output()
        .unwrap()
}

fn at(s: &str) -> NaiveDateTime {
    NaiveDateTime::parse_from_str(s, "%Y-%m-%dT%H:%M").unwrap()
}

/// Synthetic readings of the demo site along the first two planned lifts
/// (full-footprint stages: 2.5 m, then 2.25 m to 4.75 m).
fn synthetic(multiplier: f64, until: &str, rise_kpa: f64) -> String {
    let p = load(DEMO);
    let fill = vec![
        (at("2027-04-05T07:00"), 0.0),
        (at("2027-04-20T17:00"), 2.5),
        (at("2027-05-05T07:00"), 2.5),
        (at("2027-05-18T17:00"), 4.75),
    ];
    let recipe =
        Recipe { sd_kpa: 0.5, sd_m: 0.002, rise_kpa, rise_days: 12.0, ..Recipe::new(fill, multiplier, at(until), 11) };
    readings_csv(&p, &recipe, "synthetic readings for a test")
}

#[test]
fn demo_release_prints_a_reasoned_decision_writes_the_certificate_and_logs_it() {
    let (dir, project, readings) = scratch();
    let out = release(&project, &readings, "1.0", &[]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    for needle in [
        "DECISION: HOLD",
        "FS of the next lift",
        "pore pressure rise under constant load",
        "Asaoka",
        "Back-analysis",
        "CAUTIONS",
    ] {
        assert!(text.contains(needle), "missing {needle}: {text}");
    }
    let cert = dir.path().join("site-release-2027-07-05.pdf");
    let doc = lopdf::Document::load(&cert).expect("certificate is a PDF");
    assert_eq!(doc.get_pages().len(), 2);
    let page1 = doc.extract_text(&[1]).unwrap();
    assert!(page1.contains("HOLD") && page1.contains("Approved"), "{page1}");
    let log = dir.path().join("site.release-log.jsonl");
    let line = std::fs::read_to_string(&log).unwrap();
    let entry: serde_json::Value = serde_json::from_str(line.trim_end()).unwrap();
    assert_eq!(entry["decision"], "HOLD");
    assert_eq!(entry["entry"], 1);
    assert_eq!(entry["readings_sha256"].as_str().unwrap().len(), 64);
    fillpace().args(["log", "verify"]).arg(&log).assert().success();
}

#[test]
fn the_demo_readings_recover_the_slower_consolidation_they_were_made_with() {
    // examples/kestrel-fen-readings.csv was generated with cv, ch × 0.6.
    let (_dir, project, readings) = scratch();
    let out = release(&project, &readings, "1.0", &["--json"]);
    assert!(out.status.success());
    let r = json_result(&out.stdout);
    let m = r["fit"]["multiplier"].as_f64().unwrap();
    assert!((m - 0.6).abs() < 0.06, "multiplier {m}");
    assert_eq!(r["decision"], "HOLD");
    assert!(r["earliest_release"].as_str().is_some());
    assert!(r["rules"].as_array().unwrap().iter().any(|x| x["verdict"] == "fail"));
}

#[test]
fn appending_keeps_earlier_lines_and_an_edit_or_a_torn_line_is_caught() {
    let (dir, project, readings) = scratch();
    let log = dir.path().join("site.release-log.jsonl");
    assert!(release(&project, &readings, "1.0", &[]).status.success());
    let first = std::fs::read(&log).unwrap();
    assert!(
        release(&project, &readings, "0.5", &["--pdf", dir.path().join("second.pdf").to_str().unwrap()])
            .status
            .success()
    );
    let both = std::fs::read(&log).unwrap();
    assert_eq!(&both[..first.len()], &first[..], "the first entry changed");
    let out = fillpace().args(["log", "verify", "--json"]).arg(&log).output().unwrap();
    assert_eq!(json_result(&out.stdout)["entries"], 2);

    // Edit the first entry: verification fails at line 1, and a release
    // refuses to append to the damaged log.
    let edited = String::from_utf8(both.clone()).unwrap().replacen("\"HOLD\"", "\"RELEASE\"", 1);
    std::fs::write(&log, &edited).unwrap();
    let out = fillpace().args(["log", "verify"]).arg(&log).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("site.release-log.jsonl:1:") && err.contains("changed after it was written"), "{err}");
    let out = release(&project, &readings, "1.0", &[]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("nothing was appended"));
    assert_eq!(std::fs::read_to_string(&log).unwrap(), edited);

    // A torn last line (an append cut short) is reported, not accepted.
    std::fs::write(&log, &both[..both.len() - 30]).unwrap();
    let out = fillpace().args(["log", "verify"]).arg(&log).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains(":2:") && err.contains("torn"), "{err}");
}

#[test]
fn pore_pressure_rising_under_constant_load_holds_with_that_reason() {
    let (dir, project, _) = scratch();
    let readings = dir.path().join("rising.csv");
    std::fs::write(&readings, synthetic(1.0, "2027-06-20T09:00", 8.0)).unwrap();
    let out = release(&project, &readings, "0.5", &["--json"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    assert_eq!(r["decision"], "HOLD");
    let rule = r["rules"]
        .as_array()
        .unwrap()
        .iter()
        .find(|x| x["name"] == "pore pressure rise under constant load")
        .unwrap()
        .clone();
    assert_eq!(rule["verdict"], "fail", "{rule}");
    assert!(rule["value"].as_f64().unwrap() > 3.0);
}

#[test]
fn readings_that_match_a_safe_prediction_release() {
    // Readings made with the project's own parameters, checked just after
    // the plan's release of lift 2 (2027-06-22) for a thin lift: every rule
    // passes.
    let (dir, project, _) = scratch();
    let readings = dir.path().join("matching.csv");
    std::fs::write(&readings, synthetic(1.0, "2027-06-24T09:00", 0.0)).unwrap();
    let out = release(&project, &readings, "0.25", &["--json"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    assert_eq!(r["decision"], "RELEASE", "{}", serde_json::to_string_pretty(&r["rules"]).unwrap());
    assert!((r["fit"]["multiplier"].as_f64().unwrap() - 1.0).abs() < 0.1);
    assert!(r["rules"].as_array().unwrap().iter().all(|x| x["verdict"] != "fail"));
}

#[test]
fn plan_from_readings_starts_after_the_hold_point() {
    let out = fillpace().args(["plan", DEMO, "--readings", READINGS, "--json"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    let first = r["stages"][0]["start"].as_str().unwrap();
    assert!(first > "2027-07-05", "first stage {first}");
    assert!((r["stages"][0]["height_after_m"].as_f64().unwrap() - 5.75) > 0.0);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!(v["project"]["source"].as_str().unwrap().contains("re-planned from the hold point"));
}

#[test]
fn suspect_readings_are_listed_with_their_line_and_not_used() {
    let (_dir, project, readings) = scratch();
    let mut text = std::fs::read_to_string(&readings).unwrap();
    // A plate reading 50 mm above its baseline (heave beyond noise), and a
    // piezometer 20 kPa below hydrostatic.
    text.push_str("SP1,2027-07-05T15:00,2.465\nP1,2027-07-05T15:00,19.0\n");
    let n = text.lines().count();
    std::fs::write(&readings, &text).unwrap();
    let out = release(&project, &readings, "1.0", &[]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let s = String::from_utf8_lossy(&out.stdout);
    assert!(s.contains(&format!("readings.csv:{}: SP1 suspect reading, not used", n - 1)), "{s}");
    assert!(s.contains(&format!("readings.csv:{}: P1 suspect reading, not used", n)), "{s}");
}

#[test]
fn bad_readings_are_refused_with_the_line_named() {
    let mut n = 0;
    for entry in std::fs::read_dir(root("tests/data/bad-readings")).unwrap() {
        let path = entry.unwrap().path();
        let text = std::fs::read_to_string(&path).unwrap();
        let expect = text.lines().next().and_then(|l| l.strip_prefix("# expect: ")).expect("expect header");
        let dir = tempfile::tempdir().unwrap();
        let out = fillpace()
            .args(["release", DEMO, "--readings"])
            .arg(&path)
            .args(["--lift", "1.0", "--log"])
            .arg(dir.path().join("log.jsonl"))
            .arg("--pdf")
            .arg(dir.path().join("c.pdf"))
            .output()
            .unwrap();
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{}: {err}", path.display());
        assert!(err.contains(expect), "{}: `{expect}` not in: {err}", path.display());
        assert!(err.contains(&*path.file_name().unwrap().to_string_lossy()), "file not named: {err}");
        assert!(!err.contains("panicked"));
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0, "output left behind");
        n += 1;
    }
    assert!(n >= 12, "only {n} bad readings files");
}

#[test]
fn a_lift_above_the_top_or_a_date_before_the_hold_point_is_refused() {
    let (_dir, project, readings) = scratch();
    let out = release(&project, &readings, "3.0", &[]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("--lift 3"));
    let out = release(&project, &readings, "0.5", &["--on", "2027-06-01"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("before the hold point"));
}
