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
            // Corridor files are checked by tests/corridor.rs and CI.
            let corridor = path.to_string_lossy().ends_with("-corridor.toml");
            if path.extension().is_some_and(|e| e == "toml") && !corridor {
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
    // The critical circle of the search, given back as a user circle, must
    // reproduce the search's FS (the same circle through the same analysis;
    // the JSON carries the circle to full precision).
    let search = fillpace().args(["stability", DEMO, "--height", "3", "--json"]).output().unwrap();
    let crit = json_result(&search.stdout)["critical"].clone();
    let c = &crit["circle"];
    let text = format!("{},{},{}", c["xc_m"], c["yc_m"], c["r_m"]);
    let out = fillpace().args(["stability", DEMO, "--height", "3", "--json", "--circle", &text]).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    let (fs, fs_crit) = (r["fs"].as_f64().unwrap(), crit["fs"].as_f64().unwrap());
    assert!((fs - fs_crit).abs() < 1e-9, "user circle FS {fs} vs critical {fs_crit}");
    assert_eq!(r["slices"], crit["slices"]);
    // Any other circle is no lower than the critical one (the search
    // minimises FS; a circle shifted 1 m towards the toe).
    let shifted = format!("{},{},{}", c["xc_m"].as_f64().unwrap() + 1.0, c["yc_m"], c["r_m"]);
    let out = fillpace().args(["stability", DEMO, "--height", "3", "--json", "--circle", &shifted]).output().unwrap();
    if out.status.success() {
        assert!(json_result(&out.stdout)["fs"].as_f64().unwrap() >= fs_crit - 1e-9);
    }
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
    assert_eq!(last["meets_target"], false);
    assert!(last["meets_target_from"].as_str().unwrap() > last["proposed_start"].as_str().unwrap());
    let text = std::fs::read_to_string(&csv).unwrap();
    let mut lines = text.lines();
    assert!(lines.next().unwrap().starts_with("# fillpace "), "caution line first");
    assert!(lines.next().unwrap().starts_with("# stage geometry: full-footprint"), "{text}");
    assert!(lines.next().unwrap().starts_with("date,height_m,placed_m"));
    // A row on every whole day the time steps reach (every day while
    // filling, every rest step while resting), to 365 days (the default
    // --tail-days) after the end of the last lift.
    let step = load(DEMO).analysis.rest_step_days.ceil() as i64;
    let dates: Vec<chrono::NaiveDate> = lines.map(|l| l.split(',').next().unwrap().parse().unwrap()).collect();
    for w in dates.windows(2) {
        assert!((1..=step).contains(&(w[1] - w[0]).num_days()), "gap {} to {}", w[0], w[1]);
    }
    let last_end: chrono::NaiveDate = lifts[4]["end"].as_str().unwrap().parse().unwrap();
    let tail = (*dates.last().unwrap() - last_end).num_days();
    assert!((365..=366).contains(&tail), "series ends {tail} days after the last lift");
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
    // The caution line, a comment naming the stage geometry, the header
    // row, one row a stage.
    assert!(table.lines().nth(1).unwrap().starts_with("# stage geometry: full-footprint"), "{table}");
    assert_eq!(table.lines().count(), stages.len() + 3);
    // General-purpose iCalendar parser (icalendar crate, RFC 5545).
    let text = std::fs::read_to_string(&ics).unwrap();
    let unfolded = icalendar::parser::unfold(&text);
    let cal = icalendar::parser::read_calendar(&unfolded).expect("RFC 5545 calendar");
    let events: Vec<_> = cal.components.iter().filter(|c| c.name == "VEVENT").collect();
    assert_eq!(events.len(), stages.len() + holds);
    // DTSTAMP is the time of writing (today, UTC), every event carries a
    // SEQUENCE, and each lift event says to stop on any sign of distress.
    let today = chrono::Utc::now().format("%Y%m%d").to_string();
    let prop = |e: &icalendar::parser::Component, name: &str| {
        e.properties.iter().find(|p| p.name == name).map(|p| p.val.to_string()).unwrap_or_default()
    };
    for e in &events {
        assert!(prop(e, "DTSTAMP").starts_with(&today), "DTSTAMP {}", prop(e, "DTSTAMP"));
        assert!(prop(e, "SEQUENCE").parse::<i64>().unwrap() > 0);
        if prop(e, "SUMMARY").starts_with("Lift") {
            assert!(prop(e, "DESCRIPTION").contains("Stop filling on any sign of distress"));
        }
    }
    // Stable UIDs: a second export has the same UIDs and a SEQUENCE no lower.
    let ics2 = dir.path().join("again.ics");
    fillpace().args(["plan", DEMO, "--ics"]).arg(&ics2).assert().success();
    let text2 = std::fs::read_to_string(&ics2).unwrap();
    let unfolded2 = icalendar::parser::unfold(&text2);
    let cal2 = icalendar::parser::read_calendar(&unfolded2).unwrap();
    let events2: Vec<_> = cal2.components.iter().filter(|c| c.name == "VEVENT").collect();
    for (a, b) in events.iter().zip(&events2) {
        assert_eq!(prop(a, "UID"), prop(b, "UID"));
        assert!(prop(b, "SEQUENCE").parse::<i64>().unwrap() >= prop(a, "SEQUENCE").parse::<i64>().unwrap());
    }
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
    // Every command of the clap definition, subcommands included, has a
    // help page ending with an example.
    use clap::CommandFactory;
    fn leaves(c: &clap::Command, prefix: &[String], out: &mut Vec<Vec<String>>) {
        for s in c.get_subcommands().filter(|s| s.get_name() != "help") {
            let mut path = prefix.to_vec();
            path.push(s.get_name().to_string());
            if s.has_subcommands() {
                leaves(s, &path, out);
            } else {
                out.push(path);
            }
        }
    }
    let mut all = Vec::new();
    leaves(&fillpace::cli::Cli::command(), &[], &mut all);
    let names: Vec<String> = all.iter().map(|p| p.join(" ")).collect();
    for expected in ["new", "check", "assess", "stability", "plan", "compare", "risk", "release", "log verify"] {
        assert!(names.iter().any(|n| n == expected), "{expected} missing from {names:?}");
    }
    for path in &all {
        let out = fillpace().args(path).arg("--help").output().unwrap();
        assert!(out.status.success(), "{path:?}");
        let help = String::from_utf8_lossy(&out.stdout);
        assert!(help.contains("Example:\n  fillpace "), "{path:?} help has no example:\n{help}");
        assert!(help.contains("--quiet"), "{path:?} help lacks the global --quiet");
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
        "Methods and assumptions",
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
    let sha = fillpace::hash::sha256_hex(&std::fs::read(root(DEMO)).unwrap());
    assert!(flat.contains(&sha), "SHA-256 missing");
    assert!(flat.contains("licensed geotechnical engineer"));
    assert!(flat.contains(&format!("Page 1 of {}", pages.len())));
    // Program version on every page's title block; the metadata carries the
    // time of writing (this year, not 1970) and the version.
    let version = format!("fillpace {}", env!("CARGO_PKG_VERSION"));
    for p in &pages {
        assert!(doc.extract_text(&[*p]).unwrap().contains(&version), "page {p} lacks {version}");
    }
    let info = doc.trailer.get(b"Info").and_then(|o| o.as_reference()).and_then(|r| doc.get_dictionary(r)).unwrap();
    let created = String::from_utf8_lossy(info.get(b"CreationDate").unwrap().as_str().unwrap()).into_owned();
    let year = chrono::Utc::now().format("%Y").to_string();
    assert!(created.trim_start_matches("D:").starts_with(&year), "CreationDate {created}");
    // PDF text strings here are UTF-16BE with a byte-order mark (ISO 32000-1 §7.9.2.2).
    let producer = info.get(b"Producer").unwrap().as_str().unwrap();
    let units: Vec<u16> = producer
        .strip_prefix(&[0xFE, 0xFF])
        .unwrap_or(producer)
        .chunks(2)
        .map(|c| u16::from_be_bytes([c[0], c[c.len() - 1]]))
        .collect();
    let producer = if producer.starts_with(&[0xFE, 0xFF]) {
        String::from_utf16_lossy(&units)
    } else {
        String::from_utf8_lossy(producer).into_owned()
    };
    assert!(producer.contains(&version), "Producer {producer}");
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
fn every_output_names_the_strength_of_the_face_check() {
    // stability.face_strength: the text header, the JSON envelope and the
    // face check itself say which fill strength the face check used.
    let out = fillpace().args(["stability", DEMO, "--height", "2", "--json"]).output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["project"]["face_strength"], "own");
    assert_eq!(v["result"]["face"]["strength"], "own", "{}", v["result"]);
    fillpace()
        .args(["stability", DEMO, "--height", "2"])
        .assert()
        .success()
        .stdout(predicate::str::contains("Fill face check (infinite slope): the fill's own c' and φ'"))
        .stdout(predicate::str::contains("own strength c' = 0.0 kPa, φ' = 34.0°"));
    let dir = tempfile::tempdir().unwrap();
    let path =
        demo_variant(dir.path(), "factored.toml", |t| format!("{t}\n[stability]\nface_strength = \"factored\"\n"));
    let out = fillpace().arg("stability").arg(&path).args(["--height", "2", "--json"]).output().unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["project"]["face_strength"], "factored");
}

/// Write `text` with `edit` applied to the demo into a temporary folder.
fn demo_variant(dir: &std::path::Path, name: &str, edit: impl Fn(&str) -> String) -> std::path::PathBuf {
    let path = dir.join(name);
    std::fs::write(&path, edit(&std::fs::read_to_string(root(DEMO)).unwrap())).unwrap();
    path
}

#[test]
fn zero_placement_rate_and_huge_lift_are_refused_not_panics() {
    // Issue 16 §1: both used to panic in date arithmetic (exit 101).
    let dir = tempfile::tempdir().unwrap();
    let rate0 = demo_variant(dir.path(), "rate0.toml", |t| {
        t.replace("placement_rate_m_per_day = 0.25", "placement_rate_m_per_day = 0")
    });
    let line =
        std::fs::read_to_string(&rate0).unwrap().lines().position(|l| l.starts_with("placement_rate")).unwrap() + 1;
    for cmd in ["check", "assess", "plan"] {
        let out = fillpace().arg(cmd).arg(&rate0).output().unwrap();
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(2), "{cmd}: {err}");
        assert!(err.contains(&format!("rate0.toml:{line}: construction.placement_rate_m_per_day")), "{err}");
        assert!(!err.contains("panicked"), "{err}");
    }
    let huge = demo_variant(dir.path(), "huge.toml", |t| t.replacen("thickness_m = 2.5", "thickness_m = 1e300", 1));
    let out = fillpace().arg("check").arg(&huge).output().unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{err}");
    assert!(err.contains("sequence[0].thickness_m = 1e300 is out of range"), "{err}");
}

#[test]
fn closed_pipe_ends_quietly_and_a_full_disk_is_one_line() {
    use std::io::Read;
    use std::process::{Command, Stdio};
    // The reader takes nothing and closes the pipe (as `| head -0` would).
    let mut child = Command::new(env!("CARGO_BIN_EXE_fillpace"))
        .args(["check", &root(DEMO).display().to_string()])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    drop(child.stdout.take());
    let status = child.wait().unwrap();
    let mut err = String::new();
    child.stderr.take().unwrap().read_to_string(&mut err).unwrap();
    assert_eq!(status.code(), Some(0), "{err}");
    assert!(err.is_empty(), "{err}");
    // /dev/full: every write fails with ENOSPC (Linux).
    if let Ok(full) = std::fs::OpenOptions::new().write(true).open("/dev/full") {
        let out = Command::new(env!("CARGO_BIN_EXE_fillpace"))
            .args(["check", &root(DEMO).display().to_string()])
            .stdout(full)
            .output()
            .unwrap();
        let err = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(1), "{err}");
        assert_eq!(err.lines().count(), 1, "{err}");
        assert!(err.starts_with("error: cannot write standard output"), "{err}");
    }
}

#[test]
fn json_errors_are_one_object_on_stdout() {
    let out = fillpace().args(["check", "tests/data/bad/sequence-lift-too-thick.toml", "--json"]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).expect("one JSON object");
    assert_eq!(v["command"], "check");
    assert_eq!(v["error"]["exit_code"], 2);
    assert_eq!(v["error"]["kind"], "input");
    let issue = &v["error"]["issues"][0];
    assert!(issue["key"].as_str().unwrap().starts_with("sequence"), "{issue}");
    assert!(issue["line"].as_u64().unwrap() > 0);
    assert!(String::from_utf8_lossy(&out.stderr).starts_with("error: "));
    // A usage error too, with the same exit code as without --json.
    let out = fillpace().args(["stability", DEMO, "--height", "50", "--json"]).output().unwrap();
    assert_eq!(out.status.code(), Some(2));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert!(v["error"]["message"].as_str().unwrap().contains("--height"));
}

#[test]
fn completions_and_man_page_come_from_the_definitions() {
    for shell in ["bash", "zsh", "fish", "elvish", "powershell"] {
        let out = fillpace().args(["completions", shell]).output().unwrap();
        assert!(out.status.success(), "{shell}");
        let s = String::from_utf8_lossy(&out.stdout);
        for word in ["stability", "max-failure-probability", "verify"] {
            assert!(s.contains(word), "{shell} completions lack {word}");
        }
    }
    fillpace().args(["completions", "tcsh"]).assert().code(2);
    let man = fillpace().arg("man").output().unwrap();
    assert!(man.status.success());
    let roff = String::from_utf8_lossy(&man.stdout);
    assert!(roff.starts_with(".ie") || roff.contains(".TH fillpace"), "{}", &roff[..roff.len().min(200)]);
    for word in ["release", "compare", "quiet"] {
        assert!(roff.contains(word), "man page lacks {word}");
    }
}

#[test]
fn quiet_drops_warning_lines_only() {
    // The template's plan carries a warning line.
    let loud = fillpace().args(["plan", "templates/project.toml"]).output().unwrap();
    let quiet = fillpace().args(["plan", "templates/project.toml", "--quiet"]).output().unwrap();
    assert!(loud.status.success() && quiet.status.success());
    let (loud, quiet) = (String::from_utf8_lossy(&loud.stdout), String::from_utf8_lossy(&quiet.stdout));
    assert!(loud.lines().any(|l| l.starts_with("warning: ")), "no warning to suppress:\n{loud}");
    let kept: String = loud.split_inclusive('\n').filter(|l| !l.starts_with("warning: ")).collect();
    assert_eq!(quiet, kept);
    assert!(quiet.contains("CAUTIONS") && quiet.contains("Lift timetable"));
    assert!(quiet.trim_end().ends_with(&format!("fillpace {}", env!("CARGO_PKG_VERSION"))), "version footer");
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

#[test]
fn a_fill_without_strength_never_raises_the_fs_of_a_circle() {
    // Review finding: with `fill_strength_factor = 0` (the fill a vertical
    // load with no lateral thrust) a given circle through the fill came out
    // at FS 1.56 against 1.31 with the fill's own strength. Physical bound:
    // taking strength away cannot raise the FS, so the reported FS (a
    // given circle and the search) is never above the full-strength one,
    // and the output says what was assumed.
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(root(DEMO)).unwrap();
    let weak = dir.path().join("load.toml");
    std::fs::write(&weak, format!("{text}\n[stability]\nfill_strength_factor = 0\n")).unwrap();
    let fs = |file: &std::path::Path, circle: Option<&str>| {
        let mut cmd = fillpace();
        cmd.arg("stability").arg(file).args(["--height", "7.5", "--date", "2032-01-01", "--json"]);
        if let Some(c) = circle {
            cmd.args(["--circle", c]);
        }
        let out = cmd.output().unwrap();
        assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
        let r = json_result(&out.stdout);
        r["fs_governing"].as_f64().or(r["fs"].as_f64()).unwrap()
    };
    for circle in [Some("22.72,16.66,27.26"), Some("18.0,14.0,24.0"), None] {
        let (strong, load) = (fs(&root(DEMO), circle), fs(&weak, circle));
        assert!(load <= strong + 1e-9, "{circle:?}: fill as a load {load} > full strength {strong}");
    }
    fillpace()
        .arg("check")
        .arg(&weak)
        .assert()
        .success()
        .stdout(predicate::str::contains("every FS reported is the lower of that and the fill at its own strength"));
}
