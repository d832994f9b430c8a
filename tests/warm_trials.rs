//! Guard rails of the planner's warm-started trials (issue 18): the fast
//! path (a local search from the latest band circles rejects or brackets a
//! trial, the full search confirms the lift accepted) against the
//! exhaustive path (`Runner::exhaustive`: every trial by the full search).
//! Tolerances are the guard rails: every figure the same, or within
//! 0.002 in FS, 1 day in a date and 1 mm in settlement. Four sites: the
//! demo (berm, drains, crust) and three variants: thick clay without
//! drains, no berm with a crust over very soft clay (su0 8 kPa at its top,
//! 3.5 m high: since the measured su0 anchors the initial strength 4 m
//! cannot be built there),
//! and the corridor's low section raised to 4 m (thin clay, no drains);
//! plan on all four, assess and risk (20 realisations) on the first three.
//! The `stability` command runs the full search alone on either path, so
//! it is not compared. Plus a physical bound: every lift the fast path
//! accepts meets the FS target by the full search. The reference is the
//! exhaustive path of the same engine: these tests guard the speed-up, the
//! engine's own checks against published sources are elsewhere.

mod common;

use common::{DEMO, fillpace, root};
use fillpace::response::Engine;
use fillpace::schedule::{Runner, assess, planner};
use serde_json::Value;

/// The demo's text with each `(from, to)` replaced (each `from` must occur).
fn vary(edits: &[(&str, &str)]) -> String {
    vary_file(DEMO, edits)
}

/// `vary` on another file.
fn vary_file(file: &str, edits: &[(&str, &str)]) -> String {
    let mut text = std::fs::read_to_string(root(file)).unwrap();
    for (from, to) in edits {
        assert!(text.contains(from), "{from:?} not in the demo");
        text = text.replacen(from, to, 1);
    }
    text
}

fn sites() -> Vec<(&'static str, String)> {
    let demo = std::fs::read_to_string(root(DEMO)).unwrap();
    let drains = &demo[demo.find("[drains]").unwrap()..demo.find("[construction]").unwrap()];
    // The proposed sequence's last three (3 m) and four lifts (5 m), for the
    // lower variants.
    let end = demo.find("# Monitoring scheme").unwrap();
    let last3 = &demo[demo.find("[[sequence]]\nthickness_m = 1.5").unwrap()..end];
    let last4 = &demo[demo.find("[[sequence]]\nthickness_m = 2.0").unwrap()..end];
    vec![
        ("demo", demo.clone()),
        (
            "thick clay without drains",
            vary(&[
                (drains, ""),
                ("thickness_m = 12.5", "thickness_m = 16.0"),
                ("design_height_m = 7.0", "design_height_m = 4.5"),
                ("surcharge_height_m = 0.5", "surcharge_height_m = 0.0"),
                (last3, ""),
            ]),
        ),
        (
            "crust over very soft clay, no berm",
            vary(&[
                ("[[embankment.berms]]\nwidth_m = 10.0\nheight_m = 2.5\n", ""),
                ("su0_top_kpa = 14", "su0_top_kpa = 8"),
                ("design_height_m = 7.0", "design_height_m = 3.5"),
                ("surcharge_height_m = 0.5", "surcharge_height_m = 0.0"),
                (last4, ""),
            ]),
        ),
        (
            "thin clay without drains, 4 m",
            vary_file("examples/kestrel-fen-low.toml", &[("design_height_m = 2.5", "design_height_m = 4.0")]),
        ),
    ]
}

fn plan(p: &fillpace::model::Project, exhaustive: bool) -> planner::Plan {
    let e = Engine::new(p);
    let mut r = Runner::new(&e);
    r.exhaustive = exhaustive;
    planner::plan(&r).unwrap()
}

/// Tolerance for a figure by its JSON key (issue 18's guard rails): FS
/// 0.002, settlement and heights 1 mm, days 1; volumes follow the
/// settlement trough (1 mm over a ~60 m wide trough is 0.06 m³/m); other
/// figures (kPa, degrees of consolidation, counts) to 1e-3 relative, which
/// a day's shift of a release stays within on the demo.
fn tolerance(key: &str) -> f64 {
    if key.contains("fs") {
        0.002
    } else if key.ends_with("_m") {
        0.001
    } else if key.contains("days") {
        1.0
    } else if key.contains("m3") || key.contains("m2") {
        0.1
    } else {
        -1e-3
    }
}

/// Every figure of `a` and `b` alike within `tolerance`, dates within one
/// day; `skip` keys (the search counts and their warnings) are not figures
/// of the answer.
fn same(a: &Value, b: &Value, key: &str, at: &str, skip: &[&str]) {
    match (a, b) {
        (Value::Object(x), Value::Object(y)) => {
            assert_eq!(x.keys().collect::<Vec<_>>(), y.keys().collect::<Vec<_>>(), "{at}: keys differ");
            for (k, v) in x {
                if !skip.contains(&k.as_str()) {
                    same(v, &y[k], k, &format!("{at}.{k}"), skip);
                }
            }
        }
        (Value::Array(x), Value::Array(y)) => {
            assert_eq!(x.len(), y.len(), "{at}: lengths differ");
            for (i, (v, w)) in x.iter().zip(y).enumerate() {
                same(v, w, key, &format!("{at}[{i}]"), skip);
            }
        }
        (Value::Number(x), Value::Number(y)) => {
            let (x, y) = (x.as_f64().unwrap(), y.as_f64().unwrap());
            let tol = tolerance(key);
            let allowed = if tol < 0.0 { -tol * x.abs().max(y.abs()) } else { tol };
            assert!((x - y).abs() <= allowed + 1e-12, "{at}: {x} against {y} (allowed {allowed})");
        }
        (Value::String(x), Value::String(y)) if x != y => {
            let d = |s: &str| chrono::NaiveDate::parse_from_str(s, "%Y-%m-%d");
            match (d(x), d(y)) {
                (Ok(p), Ok(q)) => assert!((p - q).num_days().abs() <= 1, "{at}: {x} against {y}"),
                _ => panic!("{at}: {x:?} against {y:?}"),
            }
        }
        _ => assert_eq!(a, b, "{at}"),
    }
}

#[test]
fn fast_plans_match_the_exhaustive_path_and_accept_only_confirmed_lifts() {
    let (mut fast_total, mut full_total) = (0, 0);
    for (name, text) in sites() {
        let p = fillpace::input::parse(&text, name).unwrap();
        let fast = plan(&p, false);
        let full = plan(&p, true);
        same(
            &serde_json::to_value(&fast).unwrap(),
            &serde_json::to_value(&full).unwrap(),
            "",
            name,
            &["effort", "warnings"],
        );
        assert!(fast.effort.warm_searches > 0, "{name}: no warm search ran");
        // Full searches are not compared site by site: the exhaustive path
        // reuses a repeated search exactly too, and on a site whose FS
        // creeps past the target its trials are fewer than the warm path's
        // (thick clay without drains: 25 full against 22 on 2026-12-02).
        // Over the sites the warm path must save full searches.
        fast_total += fast.effort.stability_searches;
        full_total += full.effort.stability_searches;
        // The physical bound: every lift released meets the target by the
        // full search (each stage's FS is the full search's).
        for s in fast.stages.iter().filter(|s| s.kind == planner::StageKind::Lift) {
            assert!(s.fs_end >= p.criteria.fs_construction - 1e-12, "{name}: stage {} FS {}", s.number, s.fs_end);
        }
    }
    assert!(
        fast_total < full_total,
        "warm trials saved no full search over the sites: {fast_total} against {full_total}"
    );
}

#[test]
fn fast_assessments_and_risk_match_the_exhaustive_path() {
    for (name, text) in sites().into_iter().take(3) {
        let p = fillpace::input::parse(&text, name).unwrap();
        let e = Engine::new(&p);
        let mut answers = Vec::new();
        for exhaustive in [false, true] {
            let mut r = Runner::new(&e);
            r.exhaustive = exhaustive;
            answers.push(serde_json::to_value(assess::assess(&r, 60).unwrap()).unwrap());
        }
        // Where the FS of a lift rises by less than the searches' resolution
        // over weeks, two search paths can settle on days further apart than
        // one: the date is then within tolerance in FS terms (both days meet
        // the target by the full search, their FS within 0.002).
        let lifts = answers[1]["lifts"].as_array().unwrap().clone();
        for (i, lift) in lifts.iter().enumerate() {
            let (a, b) = (&answers[0]["lifts"][i]["meets_target_from"], &lift["meets_target_from"]);
            let (Some(a), Some(b)) = (a.as_str(), b.as_str()) else { continue };
            let days = |s: &str| chrono::NaiveDate::parse_from_str(s, "%Y-%m-%d").unwrap();
            if (days(a) - days(b)).num_days().abs() > 1 {
                let fs = [fs_of_lift(&p, i, days(a)), fs_of_lift(&p, i, days(b))];
                let target = p.criteria.fs_construction;
                assert!(fs[0] >= target && fs[1] >= target, "{name} lift {}: FS {fs:?}", i + 1);
                assert!(
                    (fs[0] - fs[1]).abs() <= 0.002,
                    "{name} lift {}: {a} FS {} against {b} FS {}",
                    i + 1,
                    fs[0],
                    fs[1]
                );
                answers[0]["lifts"][i]["meets_target_from"] = lift["meets_target_from"].clone();
            }
        }
        same(&answers[0], &answers[1], "", &format!("{name} assess"), &["effort", "warnings"]);
        // Risk: 20 realisations from the best-estimate plan of each path.
        let doc = fillpace::input::vary::Document::parse(&text, name).unwrap();
        let opts = fillpace::risk::RiskOptions { runs: 20, seed: 3, threads: Some(2) };
        let risk: Vec<Value> = [false, true]
            .into_iter()
            .map(|x| {
                let r = fillpace::risk::run(&doc, &p, &plan(&p, x), opts, None, &|| {}).unwrap();
                serde_json::to_value(r).unwrap()
            })
            .collect();
        same(&risk[0], &risk[1], "", &format!("{name} risk"), &["warnings", "diagnostics"]);
    }
}

/// FS by the full search at the end of the proposed sequence's lift `i`
/// (0-based) started on `date`, the lifts before it as proposed.
fn fs_of_lift(p: &fillpace::model::Project, i: usize, date: chrono::NaiveDate) -> f64 {
    let e = Engine::new(p);
    let r = Runner::new(&e);
    let mut st = e.initial_state();
    for l in &p.sequence[..i] {
        r.place_on(&mut st, l.start, l.thickness_m).unwrap();
    }
    r.place_on(&mut st, date, p.sequence[i].thickness_m).unwrap();
    r.stability(&st, &mut Default::default()).unwrap().governing_fs()
}

#[test]
fn plan_is_the_same_bytes_on_one_and_two_threads() {
    let run = |threads: &str| {
        let out = fillpace().env("RAYON_NUM_THREADS", threads).args(["plan", DEMO, "--json"]).output().unwrap();
        assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
        out.stdout
    };
    assert_eq!(run("1"), run("2"), "plan --json differs between one and two threads");
}
