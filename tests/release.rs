//! The hold-point check on real files: the demo recommendation with its
//! numbered record and log entry, the readings of the independent
//! textbook model (tests/truth/), the three levels, re-planning from
//! readings, and every bad readings file refused with its line named. The
//! record log's integrity is checked in tests/records.rs.

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
fn demo_check_recommends_writes_a_numbered_record_and_logs_it() {
    let (dir, project, readings) = scratch();
    let out = release(&project, &readings, "1.0", &[]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    for needle in [
        "RECOMMENDATION: ",
        "FS of the next lift",
        "pore pressure rising under constant load",
        "Asaoka",
        "Back-analysis",
        "Hold-point check record 1",
        "Log now: 1 entries, head ",
        "CAUTIONS",
    ] {
        assert!(text.contains(needle), "missing {needle}: {text}");
    }
    // Found (issue 15, item 7): the program appeared to release the lift.
    for banned in ["DECISION", "RELEASE", "Lift may be placed", "certificate"] {
        assert!(!text.contains(banned), "`{banned}` still printed");
    }
    let pdf = dir.path().join("site-hold-point-2027-07-05-record-1.pdf");
    let doc = lopdf::Document::load(&pdf).expect("the record is a PDF");
    assert_eq!(doc.get_pages().len(), 4);
    let page1 = doc.extract_text(&[1]).unwrap();
    // The demo record holds the lift: no lift conditions that site staff
    // could read as permission (review finding), only the reading frequency.
    for needle in ["HOLD-POINT CHECK RECORD 1", "Registration", "Signature", "No lift may be placed"] {
        assert!(page1.contains(needle), "{needle} not on page 1: {page1}");
    }
    assert!(!page1.contains("started no later than"), "{page1}");
    let log = dir.path().join("site.hold-point-log.jsonl");
    let line = std::fs::read_to_string(&log).unwrap();
    let entry: serde_json::Value = serde_json::from_str(line.trim_end()).unwrap();
    assert_eq!(entry["record"], 1);
    assert_eq!(entry["entry"], 1);
    assert_eq!(entry["record_sha256"].as_str().unwrap(), fillpace::hash::sha256_hex(&std::fs::read(&pdf).unwrap()));
    fillpace().args(["log", "verify"]).arg(&log).assert().success();
}

/// The result of a check on one readings file of the independent textbook
/// model (tests/truth/README.md).
fn truth(file: &str) -> serde_json::Value {
    truth_of(&format!("tests/data/truth/{file}"))
}

/// The result of a check (lift 1.0 m) on a readings file of the repository.
fn truth_of(path: &str) -> serde_json::Value {
    let (_dir, project, _) = scratch();
    let out = release(&project, &root(path), "1.0", &["--json"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    json_result(&out.stdout)
}

#[test]
fn independent_readings_with_ten_percent_more_compressibility_give_the_rate_within_25_percent() {
    // Issue 15's check: readings from the independent textbook model with
    // cv, ch × 1.0 and Cc, Cr × 1.1 (tests/truth/README.md): the rate
    // multiplier must come back within ±25% of the truth, 1.0.
    let r = truth("rate1.0-comp1.1-seed102.csv");
    let m = r["fit"]["rate"]["value"].as_f64().unwrap();
    assert!((m - 1.0).abs() <= 0.25, "rate multiplier {m}");
}

/// (rate, compressibility) multipliers fitted to an independent file.
fn multipliers(r: &serde_json::Value) -> (f64, f64) {
    let f = &r["fit"];
    (f["rate"]["value"].as_f64().unwrap(), f["compressibility"]["value"].as_f64().unwrap())
}

#[test]
fn joint_fit_of_independent_readings_with_rate_0_8_and_compressibility_1_1() {
    // Issue 15's check, brief item 4: the independent textbook model
    // (tests/truth/README.md) with cv, ch × 0.8 and Cc, Cr × 1.1,
    // noise-free and with noise (seed 109). The rate must come back within
    // ±25% of 0.8. The compressibility is judged two ways:
    // - absolute, within ±15% of 1.1: the two models' settlement magnitudes
    //   differ by themselves (the engine makes up fill for settlement and
    //   lets σ' and mv follow the partly consolidated state, the textbook
    //   model does neither: its README, approximations 3 and 6); measured
    //   on the same model at Cc, Cr × 1.0 (noise-free) the fit gives 0.94,
    //   6% low, so ±15% allows that bias and the noise;
    // - relative to the fit of the same model at Cc, Cr × 1.0 (noise-free,
    //   which cancels that bias): 1.1 within ±5% (noise of 3 mm on
    //   ~0.57 m and the rate–compressibility correlation near −0.95).
    let (_, c_ref) = multipliers(&truth("rate0.8-comp1.0-noisefree.csv"));
    for file in ["rate0.8-comp1.1-noisefree.csv", "rate0.8-comp1.1-seed109.csv"] {
        let r = truth(file);
        let (m, c) = multipliers(&r);
        assert!((m - 0.8).abs() <= 0.25 * 0.8, "{file}: rate {m}");
        assert!((c - 1.1).abs() <= 0.15 * 1.1, "{file}: compressibility {c}");
        assert!((c / c_ref - 1.1).abs() <= 0.05 * 1.1, "{file}: {c} / {c_ref}");
        let f = &r["fit"];
        let rho = f["correlation"].as_f64().unwrap();
        assert!((-1.0..=1.0).contains(&rho), "{file}: correlation {rho}");
        // Birge ratio (stated): intervals widened by √(χ²/dof) when above 1.
        let chi2 = f["chi2_per_dof"].as_f64().unwrap();
        assert!((f["birge_ratio"].as_f64().unwrap() - chi2.sqrt().max(1.0)).abs() < 1e-9);
    }
}

#[test]
fn piezometer_excess_is_taken_at_the_settled_tip() {
    // Hand calculation on the demo readings' last row (2027-07-05 09:00):
    // P1 (z = 5.0 m under the centreline) reads 118.0 kPa; SP1 (nearest
    // plate, same offset) reads 1.845 m against its baseline 2.415 m, a
    // settlement of 0.570 m; the tip settles 0.570 × the model's profile
    // ratio (reported); water table 1.0 m (examples/kestrel-fen.toml):
    // excess = 118.0 − 9.81 (5.0 + s_tip − 1.0).
    let r = truth_of(READINGS);
    let tip = r["fit"]["tip_settlement"].as_array().unwrap().iter().find(|t| t["id"] == "P1").unwrap().clone();
    assert_eq!(tip["plate"], "SP1");
    let ratio = tip["latest_profile_ratio"].as_f64().unwrap();
    // Physical bound: the ground below 5 m compresses less than the whole
    // column, and by more than nothing.
    assert!(ratio > 0.0 && ratio < 1.0, "{ratio}");
    let s_tip = 0.570 * ratio;
    assert!((tip["latest_m"].as_f64().unwrap() - s_tip).abs() < 1e-9, "{tip}");
    assert!((tip["latest_kpa"].as_f64().unwrap() - 9.81 * s_tip).abs() < 1e-9, "{tip}");
    let p1 = r["instruments"].as_array().unwrap().iter().find(|x| x["id"] == "P1").unwrap().clone();
    let hand = 118.0 - 9.81 * (5.0 + s_tip - 1.0);
    assert!((p1["measured"].as_f64().unwrap() - hand).abs() < 1e-9, "{p1} against {hand}");
}

#[test]
fn a_forecast_from_a_rejected_fit_is_marked_and_never_criteria_met() {
    // The demo readings (independent model, rate × 0.8) are not explained
    // by the engine (χ²/dof ≈ 6 above the limit 4): the check holds, and
    // the forecast date says it comes from a rejected fit in JSON and text.
    let r = truth_of(READINGS);
    assert_eq!(r["fit_explains_readings"], false);
    assert_ne!(r["recommendation"], "criteria-met");
    assert!(r["earliest_release"].is_string(), "{}", r["release_note"]);
    assert_eq!(r["forecast_from_rejected_fit"], true);
    assert!(r["release_note"].as_str().unwrap().starts_with("FROM A REJECTED FIT"));
    let (_dir, project, readings) = scratch();
    let out = release(&project, &readings, "1.0", &[]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("FROM A REJECTED FIT"), "{text}");
    assert!(text.contains("Birge ratio"), "{text}");
}

#[test]
fn a_model_that_does_not_explain_independent_readings_is_flagged_and_holds() {
    // Found (issue 15, item 5): χ²/dof near 8 on the independent readings
    // with no warning. The single rate multiplier cannot absorb the other
    // model's differences (tests/truth/README.md, approximations 1–9): the
    // flag (χ²/dof above the default limit 4) must be raised, and the
    // recommendation cannot be "criteria met".
    for file in ["rate1.0-comp1.0-noisefree.csv", "rate0.6-comp1.0-seed103.csv"] {
        let r = truth(file);
        assert!(r["fit"]["chi2_per_dof"].as_f64().unwrap() > 4.0, "{file}");
        assert_eq!(r["fit_explains_readings"], false, "{file}");
        assert_ne!(r["recommendation"], "criteria-met", "{file}");
        assert!(r["reasons"].as_array().unwrap().iter().any(|x| x.as_str().unwrap().contains("does not explain")));
    }
}

#[test]
fn a_true_rise_of_2_5_kpa_per_week_is_detected_and_distress_stops_filling() {
    // Injected by the independent model (stated in the files): from
    // 2027-06-14 every piezometer rises 2.5 kPa/week net. With the toe
    // accelerating at 0.2 mm/day² as well, the check goes to the top level.
    let r = truth("rate1.0-comp1.0-seed105-distress-from-2027-06-14.csv");
    let rules = r["rules"].as_array().unwrap();
    let rise = rules.iter().find(|x| x["name"] == "pore pressure rising under constant load").unwrap();
    assert_eq!(rise["verdict"], "fail", "{rise}");
    let (_dir, project, _) = scratch();
    let out = release(&project, &root("tests/data/distress-strong-seed106.csv"), "1.0", &[]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("RECOMMENDATION: STOP FILLING AND ACT NOW"), "{text}");
    assert!(text.contains("ACTION: inform the engineer of record now"), "{text}");
}

#[test]
fn readings_that_match_a_safe_prediction_release() {
    // Readings made with the project's own parameters, checked just after
    // the plan's release of lift 2 (2027-07-05) for a thin lift: every rule
    // passes.
    let (dir, project, _) = scratch();
    let readings = dir.path().join("matching.csv");
    std::fs::write(&readings, synthetic(1.0, "2027-07-12T09:00", 0.0)).unwrap();
    let out = release(&project, &readings, "0.5", &["--json"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    assert_eq!(r["recommendation"], "criteria-met", "{}", serde_json::to_string_pretty(&r["reasons"]).unwrap());
    assert!((r["fit"]["rate"]["value"].as_f64().unwrap() - 1.0).abs() < 0.1);
    assert!((r["fit"]["compressibility"]["value"].as_f64().unwrap() - 1.0).abs() < 0.05);
    assert!(r["rules"].as_array().unwrap().iter().all(|x| x["verdict"] != "fail"));
}

#[test]
fn plan_from_readings_starts_after_the_hold_point() {
    let out = fillpace().args(["plan", DEMO, "--readings", READINGS, "--json"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    let first = r["stages"][0]["start"].as_str().unwrap();
    assert!(first > "2027-07-05", "first stage {first}");
    // The first re-planned lift starts from the as-built crest (5.75 m) and
    // is a lift the project allows: lift_min_m 0.5 to lift_max_m 2.5.
    let h = r["stages"][0]["height_after_m"].as_f64().unwrap();
    assert!((5.75 + 0.5 - 1e-9..=5.75 + 2.5 + 1e-9).contains(&h), "first lift to {h} m");
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let source = v["project"]["source"].as_str().unwrap();
    assert!(source.contains("re-planned from the hold point"));
    // The demo readings' calibration is rejected (χ²/dof ≈ 6 above 4): the
    // re-planned dates say so.
    assert!(source.contains("FROM A REJECTED FIT"), "{source}");
    // The section is already below target at the hold point (`release`
    // says FS now 1.16 < 1.30 on the same state): the re-plan says so too
    // (review finding). A consistency check between the two commands, not
    // an independent truth; the FS printed agrees with release's within
    // rounding.
    let (_dir, project, readings) = scratch();
    let check = release(&project, &readings, "1.0", &["--json"]);
    let fs_now = json_result(&check.stdout)["fs_now"].as_f64().unwrap();
    assert!(fs_now < 1.30, "{fs_now}");
    let w = r["warnings"].as_array().unwrap();
    let line =
        w.iter().filter_map(|x| x.as_str()).find(|x| x.contains("already below its FS target")).expect("warning");
    assert!(line.contains(&format!("FS now {fs_now:.3}")), "{line} against release's {fs_now}");
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
    // Found: a lift below construction.lift_min_m (0.5 m) was accepted.
    let out = release(&project, &readings, "0.1", &[]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("lift_min_m"));
    let out = release(&project, &readings, "0.5", &["--on", "2027-06-01"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("before the hold point"));
}

/// The demo readings with the rows of `drop` instruments removed from
/// `after` on (all rows when `after` is empty).
fn without(readings: &Path, drop: &[&str], after: &str) -> String {
    std::fs::read_to_string(readings)
        .unwrap()
        .lines()
        .filter(|l| !drop.iter().any(|d| l.starts_with(&format!("{d},")) && l.split(',').nth(1).unwrap_or("") >= after))
        .map(|l| format!("{l}\n"))
        .collect()
}

#[test]
fn missing_piezometers_hold_for_insufficient_monitoring_without_nan() {
    // Found: no piezometer rows at all gave RELEASE with "NaN → NaN kPa rms".
    let (dir, project, readings) = scratch();
    let file = dir.path().join("no-piezometers.csv");
    std::fs::write(&file, without(&readings, &["P1", "P2", "P3"], "")).unwrap();
    let out = release(&project, &file, "1.0", &["--json"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    assert!(!String::from_utf8_lossy(&out.stdout).contains("NaN"));
    let r = json_result(&out.stdout);
    assert_ne!(r["recommendation"], "criteria-met");
    let short = r["insufficient"].to_string();
    for id in ["P1", "P2", "P3"] {
        assert!(short.contains(&format!("{id} (piezometer): no usable reading")), "{short}");
    }
    let out = release(&project, &file, "1.0", &[]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("hold: insufficient monitoring") && !text.contains("NaN"), "{text}");
}

#[test]
fn a_stale_toe_marker_holds_and_is_named() {
    // Found: the marker last read 7 weeks before the hold point gave
    // RELEASE. Its rows from 2027-05-15 on are removed: the latest is 51
    // days old against the default limit of 7.
    let (dir, project, readings) = scratch();
    let file = dir.path().join("stale.csv");
    std::fs::write(&file, without(&readings, &["LM1"], "2027-05-15")).unwrap();
    let r = json_result(&release(&project, &file, "1.0", &["--json"]).stdout);
    assert_ne!(r["recommendation"], "criteria-met");
    let short = r["insufficient"].to_string();
    assert!(short.contains("LM1 (lateral-marker): latest reading") && short.contains("at most 7"), "{short}");
}

/// The demo readings with P1 from 2027-06-20 on set to 125.5, 127.5, …
/// 135.5 kPa (issue 15 review) and, with `accelerate`, LM1 from 2027-06-20
/// on moved out by a further 0.1 t² mm (t days since 2027-06-20: an
/// outward acceleration of 0.2 mm/day² over the last 15 days; the 28-day
/// parabola of the rule sees +0.098 ± 0.019 mm/day², 5.1 se, where the
/// demo marker alone gives −0.020; measured, half as much gave 2.0 se).
fn perturbed(readings: &Path, accelerate: bool) -> String {
    let mut rise = [125.5, 127.5, 129.5, 131.5, 133.5, 135.5].iter();
    let text = std::fs::read_to_string(readings)
        .unwrap()
        .lines()
        .map(|l| match l.split(',').collect::<Vec<_>>()[..] {
            ["P1", t, _] if t >= "2027-06-20" => format!("P1,{t},{}\n", rise.next().unwrap()),
            ["LM1", t, v] if accelerate && t >= "2027-06-20" => {
                let days = (at(t) - at("2027-06-20T09:00")).num_hours() as f64 / 24.0;
                format!("LM1,{t},{:.1}\n", v.parse::<f64>().unwrap() + 0.1 * days * days)
            }
            _ => format!("{l}\n"),
        })
        .collect();
    assert!(rise.next().is_none(), "six P1 readings replaced");
    text
}

#[test]
fn a_fresh_steady_rise_at_one_piezometer_is_not_diluted_by_the_window() {
    // Issue 15 review, finding 1: a constructed perturbation of the
    // independent demo readings (examples/kestrel-fen-readings.csv, made by
    // the textbook model of tests/truth/): P1 from 2027-06-20 to 07-05 set
    // to 125.5, 127.5, … 135.5 kPa, each 2 kPa above the last, 3 days
    // apart. Hand calculation on the last six readings: slope 2/3 kPa/day =
    // 4.67 kPa/week, no residual, so the standard error is the precision's
    // 2/√157.5 kPa/day (Sxx of days 0, 3, … 15 = 157.5): 1.12 kPa/week,
    // and 4.67 is 4.2 standard errors above zero: the rule fails, where the
    // 28-day slope alone (+1.69 ± 1.93 before this change) passed.
    let (dir, project, readings) = scratch();
    let file = dir.path().join("rising.csv");
    std::fs::write(&file, perturbed(&readings, false)).unwrap();
    let out = release(&project, &file, "1.0", &["--json"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    let rule = r["rules"].as_array().unwrap().iter().find(|x| x["name"] == "pore pressure rising under constant load");
    let rule = rule.unwrap();
    assert_eq!(rule["verdict"], "fail", "{rule}");
    let rate = rule["value"].as_f64().unwrap();
    assert!((rate - 14.0 / 3.0).abs() < 1e-9, "{rule}");
    assert!(rule["detail"].as_str().unwrap().contains("P1") && rule["detail"].as_str().unwrap().contains("last 6"));
    assert_ne!(r["recommendation"], "criteria-met");
    assert!(r["reasons"].to_string().contains("pore pressure rising under constant load fails"), "{}", r["reasons"]);
    // The same rise with the toe marker accelerating outwards (also a
    // constructed perturbation): distress, stop filling.
    std::fs::write(&file, perturbed(&readings, true)).unwrap();
    let r = json_result(&release(&project, &file, "1.0", &["--json"]).stdout);
    let acc = r["rules"].as_array().unwrap().iter().find(|x| x["name"] == "lateral movement accelerating").unwrap();
    assert_eq!(acc["verdict"], "fail", "{acc}");
    assert_eq!(r["recommendation"], "stop-filling", "{}", r["reasons"]);
}

#[test]
fn a_lift_starting_after_the_validity_period_is_held_with_the_dates_named() {
    // Issue 15 review, finding 2: --on 2027-09-30 with the last reading on
    // 2027-07-05 gave "criteria met". The check is valid for the scheme's
    // shortest maximum reading age (7 days by default). Readings that
    // match a safe prediction (criteria met for a lift the next day,
    // readings_that_match_a_safe_prediction_release; last reading
    // 2027-07-11, so lifts starting by 2027-07-18) must hold for a lift
    // starting on 2027-09-30.
    let (dir, project, _) = scratch();
    let readings = dir.path().join("matching.csv");
    std::fs::write(&readings, synthetic(1.0, "2027-07-12T09:00", 0.0)).unwrap();
    let out = release(&project, &readings, "0.5", &["--json", "--on", "2027-09-30"]);
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    assert_eq!(r["recommendation"], "hold-for-review");
    let reasons = r["reasons"].to_string();
    assert!(reasons.contains("readings too old for a lift starting on 2027-09-30"), "{reasons}");
    assert!(reasons.contains("2027-07-18") && reasons.contains("take new readings"), "{reasons}");
    // Within the validity period the same readings still meet the criteria.
    let out = release(&project, &readings, "0.5", &["--json", "--on", "2027-07-14"]);
    assert_eq!(json_result(&out.stdout)["recommendation"], "criteria-met");
}
