//! End-to-end checks of the engines through the library on the shipped
//! files: the planner's timetable is safe, not needlessly slow, and responds
//! to the design levers the right way; the response converges.

mod common;
use chrono::Datelike;
use common::*;
use fillpace::model::Project;
use fillpace::response::Engine;
use fillpace::schedule::planner::{Plan, StageKind, plan};
use fillpace::schedule::{Effort, Runner};

fn plan_of(p: &Project) -> Plan {
    let e = Engine::new(p);
    plan(&Runner::new(&e)).expect("plan")
}

/// FS at the end of placing `lift` from `start`, after replaying `stages`.
fn replay_fs(p: &Project, stages: &[(chrono::NaiveDate, f64)], start: chrono::NaiveDate, lift: f64) -> f64 {
    let e = Engine::new(p);
    let r = Runner::new(&e);
    let mut st = e.initial_state();
    for (d, t) in stages {
        r.rest_until(&mut st, r.calendar.day_of(*d), &mut |_| {});
        r.place(&mut st, *t, &mut |_| {}).unwrap();
    }
    r.rest_until(&mut st, r.calendar.day_of(start), &mut |_| {});
    r.place(&mut st, lift, &mut |_| {}).unwrap();
    r.stability(&st, &mut Effort::default()).unwrap().governing_fs()
}

#[test]
fn demo_plan_is_safe_and_not_needlessly_slow() {
    let p = load(DEMO);
    let pl = plan_of(&p);
    let lifts: Vec<_> = pl.stages.iter().filter(|s| s.kind == StageKind::Lift).collect();
    assert!(lifts.len() >= 4, "several lifts expected, got {}", lifts.len());
    let target = p.criteria.fs_construction;
    let c = &p.construction;
    let mut done: Vec<(chrono::NaiveDate, f64)> = Vec::new();
    for (k, s) in lifts.iter().enumerate() {
        // Recomputed independently (fresh engine, replayed history): safe.
        let fs = replay_fs(&p, &done, s.start, s.thickness_m);
        assert!(fs >= target - 1e-9, "lift {} FS {fs}", s.number);
        assert!((fs - s.fs_end).abs() < 1e-9);
        // One increment thicker would be unsafe (unless at the maximum or
        // the top is reached).
        let remaining = p.max_height_m() - (s.height_after_m - s.thickness_m);
        if s.thickness_m + c.lift_increment_m <= c.lift_max_m.min(remaining) + 1e-9 {
            let thicker = replay_fs(&p, &done, s.start, s.thickness_m + c.lift_increment_m);
            assert!(thicker < target, "lift {}: one increment thicker still safe ({thicker})", s.number);
        }
        // Starting on the workable day before would be unsafe unless the
        // rest is the minimum: the rest is the shortest to the day. (A
        // regression check: the rest search once stopped when its guess
        // fell on a weekend before the safe Monday, leaving the Friday
        // untried; stage 4 of the demo started 3 days late.)
        if k > 0 {
            let prev = lifts[k - 1];
            let cal = fillpace::schedule::calendar::Calendar::new(p.info.start_date, c);
            let first_allowed = cal.day_of(prev.end) + 1 + c.min_rest_days as i64;
            let before = (first_allowed..cal.day_of(s.start)).rev().find(|d| cal.workable(*d));
            if let Some(day) = before {
                let earlier = cal.date(day).unwrap();
                let fs_early = replay_fs(&p, &done, earlier, s.thickness_m);
                assert!(fs_early < target, "lift {} could start on {earlier} (FS {fs_early})", s.number);
            }
        }
        done.push((s.start, s.thickness_m));
    }
    assert!(pl.stages.iter().any(|s| s.rest_days >= 14), "rests of weeks to months expected");
}

#[test]
fn no_placement_on_weekends_or_holidays() {
    let p = load(DEMO);
    let pl = plan_of(&p);
    for s in &pl.stages {
        for d in [s.start, s.end] {
            assert!(p.construction.working_days.contains(&d.weekday()), "{d} is not a working day");
            assert!(p.construction.holidays.binary_search(&d).is_err(), "{d} is a holiday");
        }
    }
}

#[test]
fn stiff_site_is_built_in_one_lift_without_rest() {
    let p = load("tests/data/stiff.toml");
    let pl = plan_of(&p);
    assert_eq!(pl.stages.len(), 1);
    assert!((pl.stages[0].thickness_m - 3.0).abs() < 1e-9);
    assert_eq!(pl.stages[0].rest_days, 0);
}

#[test]
fn design_levers_move_the_finish_the_right_way() {
    let base = load(DEMO);
    let d0 = plan_of(&base).duration_days;
    let mut closer = base.clone();
    closer.drains.as_mut().unwrap().spacing_m /= 2.0;
    let mut none = base.clone();
    none.drains = None;
    // +0.02: the demo's 2:1 face of φ' = 34° fill is limited to
    // tan 34°/0.5 = 1.349 as an infinite slope, and with full-footprint
    // stages the 7.5 m surcharge crest stays below FS 1.35 even on fully
    // consolidated clay (issue 14), so 1.35 cannot be met.
    let mut stricter = base.clone();
    stricter.criteria.fs_construction += 0.02;
    let dc = plan_of(&closer).duration_days;
    assert!(dc < d0, "halving drain spacing: {dc} vs {d0} days");
    let e = Engine::new(&stricter);
    match plan(&Runner::new(&e)) {
        Ok(ps) => assert!(ps.duration_days > d0, "higher FS target: {} vs {d0} days", ps.duration_days),
        Err(err) => assert!(err.to_string().contains("cannot be"), "{err}"),
    }
    // Without drains the demo may not finish within the planner's 20-year
    // horizon at all: either answer is longer than with drains.
    let e = Engine::new(&none);
    match plan(&Runner::new(&e)) {
        Ok(pn) => assert!(pn.duration_days > d0, "no drains: {} vs {d0}", pn.duration_days),
        Err(err) => assert!(["cannot be", "horizon"].iter().any(|w| err.to_string().contains(w)), "{err}"),
    }
}

#[test]
fn first_lift_on_uniform_clay_matches_the_hand_rule() {
    // Common practice rule of thumb from the Fellenius/Taylor stability
    // number 5.52: H1 ≈ 5.5 su0/(γ FS), within 30%; never below Prandtl's
    // 5.14 su0/(γ FS).
    let p = load("tests/data/uniform-deep-clay.toml");
    let e = Engine::new(&p);
    let r = Runner::new(&e);
    let (day, h1) = fillpace::schedule::planner::next_lift(&r, &e.initial_state(), 0, &mut Effort::default()).unwrap();
    assert_eq!(day, 0, "the first lift needs no rest");
    let (su, g, fs) = (20.0, 20.0, p.criteria.fs_construction);
    let rule = 5.5 * su / (g * fs);
    assert!((h1 - rule).abs() < 0.3 * rule, "H1 {h1} vs rule {rule}");
    assert!(h1 >= 5.14 * su / (g * fs) - 0.1, "H1 {h1} below Prandtl");
}

/// Run the demo's proposed sequence and a year of rest; (U, settlement).
fn demo_sequence(p: &Project) -> (f64, f64) {
    let e = Engine::new(p);
    let r = Runner::new(&e);
    let mut st = e.initial_state();
    for l in &p.sequence {
        r.rest_until(&mut st, r.calendar.day_of(l.start), &mut |_| {});
        r.place(&mut st, l.thickness_m, &mut |_| {}).unwrap();
    }
    let end = st.day as i64 + 120;
    r.rest_until(&mut st, end, &mut |_| {});
    (e.degree_centre(&st), st.settlement_centre_m)
}

#[test]
fn response_converges_when_grid_and_steps_are_halved() {
    // Halving dz and dt moves U and settlement at the end of the demo
    // sequence by less than 0.5%.
    let coarse = load(DEMO);
    let mut fine = coarse.clone();
    fine.analysis.max_node_spacing_m /= 2.0;
    fine.analysis.placement_step_days /= 2.0;
    fine.analysis.rest_step_days /= 2.0;
    let (u1, s1) = demo_sequence(&coarse);
    let (u2, s2) = demo_sequence(&fine);
    assert!((u1 - u2).abs() < 0.005 * u2, "U {u1} vs {u2}");
    assert!((s1 - s2).abs() < 0.005 * s2, "settlement {s1} vs {s2}");
}

#[test]
fn pore_pressure_jumps_with_each_lift_and_falls_in_rests_faster_with_drains() {
    let p = load(DEMO);
    let trace = |p: &Project| {
        let e = Engine::new(p);
        let r = Runner::new(&e);
        let mut st = e.initial_state();
        let z = 8.0;
        let mut out = Vec::new();
        for l in &p.sequence {
            r.rest_until(&mut st, r.calendar.day_of(l.start), &mut |_| {});
            let before = e.excess_at(&st, 0, z);
            r.place(&mut st, l.thickness_m, &mut |_| {}).unwrap();
            out.push((before, e.excess_at(&st, 0, z)));
        }
        out
    };
    let with = trace(&p);
    for w in with.windows(2) {
        assert!(w[0].1 > w[0].0 + 5.0, "lift raises Δu: {w:?}");
        assert!(w[1].0 < w[0].1, "rest lowers Δu: {w:?}");
    }
    let mut bare = p.clone();
    bare.drains = None;
    let without = trace(&bare);
    // Before the last lift, Δu with drains is well below Δu without.
    let last = with.len() - 1;
    assert!(with[last].0 < 0.7 * without[last].0, "{:?} vs {:?}", with[last], without[last]);
}

#[test]
fn an_extreme_site_ends_with_a_clear_answer() {
    // 50 m of clay with su0 = 2 kPa, cv = 0.1 m²/year and no drains under
    // a 15 m embankment (issue #9's extreme case): the planner must stop
    // with "cannot be built" and the reason, not search for ever.
    let p = load("tests/data/extreme.toml");
    let e = Engine::new(&p);
    let err = plan(&Runner::new(&e)).expect_err("not buildable");
    let msg = err.to_string();
    assert!(msg.contains("cannot be built to 15.00 m") && msg.contains("untouched ground"), "{msg}");
    assert_eq!(err.exit_code(), 1);
}

/// FS at the end of a `lift` m first lift; `old_rule` zeroes every node's
/// SHANSEP offset, which is the former rule su = max(SHANSEP, measured).
fn first_lift_fs(p: &Project, lift: f64, old_rule: bool) -> f64 {
    let mut e = Engine::new(p);
    if old_rule {
        e.columns.iter_mut().flat_map(|c| c.nodes.iter_mut()).for_each(|n| n.su_offset_kpa = 0.0);
    }
    let r = Runner::new(&e);
    let mut st = e.initial_state();
    r.place(&mut st, lift, &mut |_| {}).unwrap();
    r.stability(&st, &mut Effort::default()).unwrap().governing_fs()
}

#[test]
fn measured_su0_below_shansep_lowers_the_fs_and_never_raises_it() {
    // Physical bound: the anchored rule gives su no higher than the former
    // max(SHANSEP, measured) at every node and time, so the FS of a 2.5 m
    // first lift can only fall; on the reviewer's case (measured 5–9 kPa,
    // SHANSEP0 up to 21.4 kPa) it falls (measured when written: 0.676
    // against 0.693; little, as shallow circles in the 5 kPa top govern,
    // where SHANSEP0 is below the measured value). (The case has one clay
    // layer, so no clay/clay interface carries a second node the override
    // would miss.)
    let p = load("tests/data/measured-below-shansep.toml");
    let (new, old) = (first_lift_fs(&p, 2.5, false), first_lift_fs(&p, 2.5, true));
    assert!(new < old, "anchored FS {new} vs old rule {old}");
    // Measured su0 at or above SHANSEP0 everywhere (25–40 kPa against at
    // most 21.4): every offset is 0 and the FS is the old rule's.
    let mut strong = p.clone();
    if let fillpace::model::LayerKind::Clay(c) = &mut strong.ground.layers[0].kind {
        c.strength.su0_points = vec![(0.0, 25.0), (10.0, 40.0)];
    }
    let e = Engine::new(&strong);
    assert!(e.columns.iter().flat_map(|c| &c.nodes).all(|n| n.su_offset_kpa == 0.0));
    assert_eq!(first_lift_fs(&strong, 2.5, false), first_lift_fs(&strong, 2.5, true));
}
