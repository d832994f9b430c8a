//! Each validation rule refuses a bad value with the key path and the line
//! of the project file (the demo with one line changed).

use crate::error::Error;

/// Change `old` (a whole line of the demo, first occurrence) to `new`;
/// return the text and the 1-based line of the change.
fn demo_with(old: &str, new: &str) -> (String, usize) {
    let demo = crate::app::DEMO;
    let line = demo.lines().position(|l| l == old).unwrap_or_else(|| panic!("`{old}` is not a line of the demo")) + 1;
    (demo.replacen(old, new, 1), line)
}

#[test]
fn every_rule_names_the_key_and_the_line() {
    // (line of the demo, replacement, key reported, words of the message)
    let cases = [
        ("cr = 0.05", "cr = 0.50", "ground.layers[0].cr", "smaller than cc"),
        ("thickness_m = 12.5", "thickness_m = -1.0", "ground.layers[1].thickness_m", "out of range"),
        ("e0 = 1.9", "e0 = nan", "ground.layers[1].e0", "not a finite number"),
        ("base_drainage = \"drained\"", "base_drainage = \"leaky\"", "ground.base_drainage", "use one of"),
        ("start_date = 2027-04-05", "start_date = \"2027-13-01\"", "project.start_date", "not a valid date"),
        ("lift_min_m = 0.5", "lift_min_m = 3.0", "construction.lift_min_m", "must not exceed lift_max_m"),
        (
            "holidays = [\"2027-12-20..2028-01-02\", \"2028-04-14..2028-04-17\", \"2028-12-18..2029-01-01\"]",
            "holidays = [\"2028-01-02..2027-12-20\"]",
            "construction.holidays[0]",
            "ends before it starts",
        ),
        (
            "working_days = [\"mon\", \"tue\", \"wed\", \"thu\", \"fri\"]",
            "working_days = [\"mon\", \"mon\"]",
            "construction.working_days[1]",
            "listed twice",
        ),
        ("spacing_m = 1.5", "spacing_m = 0.05", "drains.spacing_m", "larger than the drain width"),
        ("smear_ratio = 2.0", "smear_ratio = 40.0", "drains.smear_ratio", "out of range"),
        ("fs_construction = 1.3", "fs_construction = 0.9", "criteria.fs_construction", "out of range"),
        ("id = \"P2\"", "id = \"P1\"", "instrument[1].id", "ids must be unique"),
        ("kind = \"piezometer\"", "kind = \"tiltmeter\"", "instrument[0].kind", "use one of"),
    ];
    for (old, new, key, words) in cases {
        let (text, line) = demo_with(old, new);
        match crate::input::parse(&text, "demo.toml") {
            Err(Error::Input { file, issues }) => {
                assert_eq!(file, "demo.toml");
                let hit = issues.iter().find(|i| i.key == key);
                let hit = hit.unwrap_or_else(|| panic!("`{new}`: no issue for {key}: {issues:?}"));
                assert_eq!(hit.line, Some(line), "`{new}`: {hit:?}");
                assert!(hit.message.contains(words), "`{new}`: {}", hit.message);
            }
            other => panic!("`{new}` was not refused: {other:?}"),
        }
    }
}

#[test]
fn several_problems_are_reported_together() {
    let (text, _) = demo_with("cr = 0.05", "cr = 0.50");
    let text = text.replacen("fs_construction = 1.3", "fs_construction = 0.9", 1);
    match crate::input::parse(&text, "demo.toml") {
        Err(Error::Input { issues, .. }) => {
            assert!(issues.iter().any(|i| i.key == "ground.layers[0].cr"), "{issues:?}");
            assert!(issues.iter().any(|i| i.key == "criteria.fs_construction"), "{issues:?}");
        }
        other => panic!("not refused: {other:?}"),
    }
}

#[test]
fn an_artesian_level_that_lifts_the_ground_is_refused() {
    // Hand arithmetic: 10 m of clay at 16 kN/m³, water table 1 m down, on
    // a sand whose level is 8 m above ground. At the clay's base (10 m)
    // σv0 = 160 kPa and u0 = 9.81 × (8 + 10) = 176.6 kPa: σ'v0 < 0, the
    // ground would heave. A level of 4 m leaves σ'v0 = 160 − 137.3 > 0.
    let text =
        std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/tests/data/bad/artesian-uplift.toml")).unwrap();
    match crate::input::parse(&text, "uplift.toml") {
        Err(Error::Input { issues, .. }) => {
            let hit = issues.iter().find(|i| i.key == "ground.layers[1].piezometric_level_m");
            let hit = hit.unwrap_or_else(|| panic!("{issues:?}"));
            let line = text.lines().position(|l| l.starts_with("piezometric_level_m")).unwrap() + 1;
            assert_eq!(hit.line, Some(line));
            for words in ["= 8 lifts the ground", "layer \"clay\"", "u0 = 176.6 kPa", "σv0 = 160.0 kPa", "σ'v0 > 0"] {
                assert!(hit.message.contains(words), "{words}: {}", hit.message);
            }
        }
        other => panic!("not refused: {other:?}"),
    }
    assert!(
        crate::input::parse(&text.replace("piezometric_level_m = 8.0", "piezometric_level_m = 4.0"), "ok.toml").is_ok()
    );
}
