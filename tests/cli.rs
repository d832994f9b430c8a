//! The binary on real files: every shipped project validates, every bad
//! input is refused cleanly (exit 2, the key named, no panic, no partial
//! output), and each command prints what an engineer expects.

mod common;
use common::*;
use predicates::prelude::*;

#[test]
fn every_example_and_template_validates() {
    for dir in ["examples", "templates"] {
        for entry in std::fs::read_dir(root(dir)).unwrap() {
            let path = entry.unwrap().path();
            if path.extension().is_some_and(|e| e == "toml") {
                fillpace().arg("check").arg(&path).assert().success().stdout(predicate::str::contains("is valid"));
            }
        }
    }
}

#[test]
fn new_writes_a_valid_project_and_never_overwrites() {
    let dir = tempfile::tempdir().unwrap();
    let site = dir.path().join("site");
    let out = fillpace().arg("new").arg(&site).arg("--json").output().unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!(v["written"].as_str().unwrap().ends_with("project.toml"));
    fillpace().arg("check").arg(site.join("project.toml")).assert().success();
    fillpace().arg("new").arg(&site).assert().code(2).stderr(predicate::str::contains("never overwrites"));
}

#[test]
fn bad_input_corpus_is_refused_with_the_key_named() {
    let mut n = 0;
    for entry in std::fs::read_dir(root("tests/data/bad")).unwrap() {
        let path = entry.unwrap().path();
        let text = std::fs::read_to_string(&path).unwrap();
        let key = text.lines().next().and_then(|l| l.strip_prefix("# expect-key: ")).expect("expect-key header");
        let out = fillpace().arg("check").arg(&path).output().unwrap();
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{}: {err}", path.display());
        assert!(err.contains(key), "{}: key `{key}` not named in: {err}", path.display());
        assert!(err.contains(&*path.file_name().unwrap().to_string_lossy()), "file not named: {err}");
        assert!(!err.contains("panicked"), "{err}");
        assert_eq!(err.matches("error:").count(), 1, "error shown once: {err}");
        n += 1;
    }
    assert!(n >= 30, "only {n} bad inputs");
}

#[test]
fn several_problems_are_reported_together() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(root("tests/data/minimal.toml"))
        .unwrap()
        .replace("cr = 0.06", "cr = 0.9")
        .replace("side_slope_h_per_v = 2.0", "side_slope_h_per_v = -1.0");
    let path = dir.path().join("two.toml");
    std::fs::write(&path, text).unwrap();
    fillpace()
        .arg("check")
        .arg(&path)
        .assert()
        .code(2)
        .stderr(predicate::str::contains("2 problems"))
        .stderr(predicate::str::contains("ground.layers[0].cr"))
        .stderr(predicate::str::contains("embankment.side_slope_h_per_v"));
}

#[test]
fn check_json_has_layers_and_profile() {
    let out = fillpace().args(["check", DEMO, "--json"]).output().unwrap();
    assert!(out.status.success());
    let r = json_result(&out.stdout);
    assert_eq!(r["layers"].as_array().unwrap().len(), 4);
    assert!(r["profile"].as_array().unwrap().len() > 10);
}

#[test]
fn demo_full_height_in_one_lift_is_unsafe_and_a_first_lift_is_safe() {
    let p = load(DEMO);
    let full =
        fillpace().args(["stability", DEMO, "--json", "--height"]).arg(p.max_height_m().to_string()).output().unwrap();
    let fs_full = json_result(&full.stdout)["critical"]["fs"].as_f64().unwrap();
    assert!(fs_full < 1.0, "full height in one lift: FS {fs_full}");
    let first = fillpace().args(["stability", DEMO, "--json", "--height", "2.5"]).output().unwrap();
    let fs_first = json_result(&first.stdout)["critical"]["fs"].as_f64().unwrap();
    assert!(fs_first >= p.criteria.fs_construction, "2.5 m first lift: FS {fs_first}");
}

#[test]
fn stability_rejects_bad_heights_and_circles() {
    for h in ["-1", "50", "nan"] {
        fillpace()
            .args(["stability", DEMO, "--height", h])
            .assert()
            .code(2)
            .stderr(predicate::str::contains("--height"));
    }
    // far above the ground: no intersection
    fillpace()
        .args(["stability", DEMO, "--height", "3", "--circle", "200,50,5"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("cannot be analysed"));
    fillpace()
        .args(["stability", DEMO, "--height", "3", "--circle", "10,5,0.1"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("too small"));
    fillpace().args(["stability", DEMO, "--height", "3", "--circle", "10,x,5"]).assert().code(2);
}

#[test]
fn stability_of_one_user_circle() {
    let out =
        fillpace().args(["stability", DEMO, "--height", "3", "--json", "--circle", "29.5,4.2,8.7"]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    assert!(r["fs"].as_f64().unwrap() > 0.5);
    assert!(r["slices"].as_u64().unwrap() >= 30);
}

#[test]
fn assess_writes_series_and_flags_the_unsafe_lift() {
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("history.csv");
    let out = fillpace().args(["assess", DEMO, "--json", "--csv"]).arg(&csv).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    let lifts = r["lifts"].as_array().unwrap();
    assert_eq!(lifts.len(), 5);
    // The demo's proposed fourth lift is too early: flagged with a date.
    let last = &lifts[3];
    assert_eq!(last["safe"], false);
    assert!(last["safe_from"].as_str().unwrap() > last["proposed_start"].as_str().unwrap());
    let text = std::fs::read_to_string(&csv).unwrap();
    assert!(text.starts_with("# stage geometry: full-footprint"), "{text}");
    assert!(text.lines().nth(1).unwrap().starts_with("date,height_m,placed_m"));
    assert!(text.lines().count() > 300);
}

#[test]
fn assess_bad_sequence_leaves_no_csv() {
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("history.csv");
    fillpace()
        .arg("assess")
        .arg(root("tests/data/bad/sequence-lift-too-thick.toml"))
        .arg("--csv")
        .arg(&csv)
        .assert()
        .code(2);
    assert!(!csv.exists());
}

#[test]
fn plan_without_arguments_plans_the_bundled_demo() {
    fillpace()
        .arg("plan")
        .assert()
        .success()
        .stdout(predicate::str::contains("bundled demo"))
        .stdout(predicate::str::contains("CAUTIONS"));
}

#[test]
fn plan_outputs_csv_and_an_icalendar_that_parses() {
    let dir = tempfile::tempdir().unwrap();
    let (csv, ics) = (dir.path().join("plan.csv"), dir.path().join("holds.ics"));
    let out = fillpace().args(["plan", DEMO, "--json", "--csv"]).arg(&csv).arg("--ics").arg(&ics).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let plan = json_result(&out.stdout);
    let stages = plan["stages"].as_array().unwrap();
    let holds = stages.iter().filter(|s| !s["release"].is_null()).count();
    let table = std::fs::read_to_string(&csv).unwrap();
    // A comment naming the stage geometry, the header row, one row a stage.
    assert!(table.starts_with("# stage geometry: full-footprint"), "{table}");
    assert_eq!(table.lines().count(), stages.len() + 2);
    // General-purpose iCalendar parser (icalendar crate, RFC 5545).
    let text = std::fs::read_to_string(&ics).unwrap();
    let unfolded = icalendar::parser::unfold(&text);
    let cal = icalendar::parser::read_calendar(&unfolded).expect("RFC 5545 calendar");
    let events = cal.components.iter().filter(|c| c.name == "VEVENT").count();
    assert_eq!(events, stages.len() + holds);
}

#[test]
fn output_over_an_input_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let project = dir.path().join("p.toml");
    std::fs::copy(root(DEMO), &project).unwrap();
    let before = std::fs::read(&project).unwrap();
    fillpace()
        .arg("plan")
        .arg(&project)
        .arg("--csv")
        .arg(&project)
        .assert()
        .code(2)
        .stderr(predicate::str::contains("also an input"));
    assert_eq!(std::fs::read(&project).unwrap(), before);
}

#[test]
fn help_and_version() {
    fillpace().arg("--version").assert().success().stdout(predicate::str::contains(env!("CARGO_PKG_VERSION")));
    for cmd in ["new", "check", "assess", "stability", "plan"] {
        fillpace().args([cmd, "--help"]).assert().success().stdout(predicate::str::contains("Example"));
    }
}

#[test]
fn plan_pdf_has_every_section_stage_hash_and_caution() {
    // Read back with a general-purpose PDF library (lopdf).
    let dir = tempfile::tempdir().unwrap();
    let pdf = dir.path().join("schedule.pdf");
    let out = fillpace().args(["plan", DEMO, "--json", "--pdf"]).arg(&pdf).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let plan = json_result(&out.stdout);
    let doc = lopdf::Document::load(&pdf).expect("valid PDF");
    let pages: Vec<u32> = doc.get_pages().keys().copied().collect();
    assert!(pages.len() >= 8, "{} pages", pages.len());
    let text = doc.extract_text(&pages).expect("text extracts");
    let flat: String = text.split_whitespace().collect::<Vec<_>>().join(" ");
    for title in [
        "Summary",
        "Lift timetable",
        "Staging diagram",
        "Cross-section",
        "Inputs",
        "Method statement",
        "CAUTION NOTES",
        "MONITORING PLAN",
        "Prepared",
        "Checked",
        "Approved",
    ] {
        assert!(flat.contains(title), "missing {title}");
    }
    for s in plan["stages"].as_array().unwrap() {
        assert!(flat.contains(s["start"].as_str().unwrap()), "stage date {} missing", s["start"]);
    }
    let sha = fillpace::report::sha256_hex(&std::fs::read(root(DEMO)).unwrap());
    assert!(flat.contains(&sha), "SHA-256 missing");
    assert!(flat.contains("licensed geotechnical engineer"));
    assert!(flat.contains(&format!("Page 1 of {}", pages.len())));
}

#[test]
fn out_folder_receives_all_formats() {
    let dir = tempfile::tempdir().unwrap();
    let folder = dir.path().join("issue-A");
    fillpace().args(["plan", DEMO, "--out"]).arg(&folder).assert().success();
    for f in ["plan.csv", "plan.ics", "plan.pdf", "plan.json"] {
        assert!(folder.join(f).metadata().unwrap().len() > 100, "{f}");
    }
}

#[test]
fn every_output_names_the_stage_geometry() {
    // Issue 14, what to build 1: every report states the stage geometry.
    let out = fillpace().args(["plan", DEMO, "--json"]).output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["project"]["stage_shape"], "full-footprint");
    assert_eq!(v["result"]["stage_shape"], "full-footprint");
    fillpace()
        .args(["stability", DEMO, "--height", "2"])
        .assert()
        .success()
        .stdout(predicate::str::contains("Stage geometry: full-footprint"));
    fillpace()
        .args(["check", DEMO])
        .assert()
        .success()
        .stdout(predicate::str::contains("Stage geometry: full-footprint"));
}

#[test]
fn an_unreachable_target_still_gives_the_highest_crest_and_its_timetable() {
    // Issue 14, what to build 6: the demo raised to a 10 m design height
    // cannot be built at FS 1.30; plan says how high it can go, with the
    // timetable to there and the blocking mechanism, then exits 1 and
    // writes no files.
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("high.toml");
    let text = std::fs::read_to_string(root(DEMO)).unwrap().replace("design_height_m = 7.0", "design_height_m = 10.0");
    std::fs::write(&file, text).unwrap();
    let csv = dir.path().join("plan.csv");
    let out = fillpace().arg("plan").arg(&file).arg("--json").arg("--csv").arg(&csv).output().unwrap();
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("cannot be built to 10.50 m"));
    assert!(!csv.exists());
    let r = json_result(&out.stdout);
    let top = r["highest_crest_m"].as_f64().unwrap();
    assert!(top > 5.0 && top < 10.5, "{top}");
    let stages = r["partial_plan"]["stages"].as_array().unwrap();
    assert_eq!(stages.last().unwrap()["height_after_m"].as_f64().unwrap(), top);
    assert!(r["blocking"]["fs"].as_f64().unwrap() < 1.3);
    assert!(!r["blocking"]["mechanism"].as_str().unwrap().is_empty());
    fillpace()
        .arg("plan")
        .arg(&file)
        .assert()
        .code(1)
        .stdout(predicate::str::contains("Highest crest reachable at the FS target"))
        .stdout(predicate::str::contains("Governing mechanism"));
}

#[test]
fn a_cv_typed_in_square_metres_per_day_is_flagged_not_refused() {
    // Issue 14, what to build 7: 0.0041 in cv_m2_per_year is 1.5 m²/year
    // written in m²/day; check warns and names the unit, exit 0.
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("slip.toml");
    let text = std::fs::read_to_string(root(DEMO)).unwrap().replace("cv_m2_per_year = 1.5", "cv_m2_per_year = 0.0041");
    std::fs::write(&file, text).unwrap();
    fillpace()
        .arg("check")
        .arg(&file)
        .assert()
        .success()
        .stdout(predicate::str::contains("warning: ground.layers[1].cv_m2_per_year"))
        .stdout(predicate::str::contains("m²/day"));
    let out = fillpace().arg("check").arg(&file).arg("--json").output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!(v["warnings"].as_array().unwrap().iter().any(|w| w.as_str().unwrap().contains("m²/day")));
}
