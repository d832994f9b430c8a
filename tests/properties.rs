//! Property tests (proptest) over random *valid* projects within the
//! documented ranges, kept small (thin clay, coarse grid) so that 64 cases
//! of each run in CI: planning completes with a clear answer; every factor
//! of safety is finite and positive; excess pore pressure is not negative
//! under loading; settlement does not decrease under non-decreasing load;
//! strength never falls below su0; identical input gives byte-identical
//! JSON; halving the steps moves results less than the stated tolerance;
//! plus properties of the readings parser, Asaoka's method and the log.
//! The seed is fixed so that a CI failure can be replayed.

use fillpace::model::Project;
use fillpace::response::Engine;
use fillpace::schedule::{Runner, planner};
use fillpace::stability::{Circle, Section, search};
use proptest::prelude::*;
use proptest::test_runner::{Config, RngSeed};

fn config() -> Config {
    Config { cases: 64, rng_seed: RngSeed::Fixed(20261201), failure_persistence: None, ..Config::default() }
}

/// Parameters of a random small project.
#[derive(Debug, Clone)]
struct Site {
    clay_m: f64,
    su0_top: f64,
    su0_bottom: f64,
    cv: f64,
    ch_over_cv: f64,
    drains: Option<f64>,
    height: f64,
    crest: f64,
    slope: f64,
    fs: f64,
    water: f64,
}

fn site() -> impl Strategy<Value = Site> {
    (
        (4.0..12.0f64, 12.0..30.0f64, 0.0..15.0f64, 0.5..5.0f64, 1.0..3.0f64),
        (proptest::option::of(1.2..2.5f64), 1.5..4.0f64, 10.0..20.0f64, 2.0..3.0f64, 1.2..1.4f64, 0.0..2.0f64),
    )
        .prop_map(|((clay_m, su0_top, extra, cv, ch_over_cv), (drains, height, crest, slope, fs, water))| Site {
            clay_m,
            su0_top,
            su0_bottom: su0_top + extra,
            cv,
            ch_over_cv,
            drains,
            height,
            crest,
            slope,
            fs,
            water,
        })
}

fn toml(s: &Site, steps: (f64, f64, f64)) -> String {
    let drains = s.drains.map_or(String::new(), |sp| {
        format!("[drains]\npattern = \"square\"\nspacing_m = {sp}\ndiameter_mm = 50\ndepth_m = {}\n", s.clay_m)
    });
    format!(
        r#"
[project]
title = "property"
start_date = "2030-01-07"

[ground]
groundwater_depth_m = {water}

[[ground.layers]]
name = "clay"
kind = "clay"
thickness_m = {clay}
unit_weight_kn_m3 = 16.0
e0 = 1.6
cc = 0.6
cr = 0.07
pop_kpa = 10
cv_m2_per_year = {cv}
ch_over_cv = {chr}
strength = "shansep"
shansep_s = 0.25
shansep_m = 0.8
su0_top_kpa = {sut}
su0_bottom_kpa = {sub}

[[ground.layers]]
name = "sand"
kind = "sand"
thickness_m = 2.0
unit_weight_kn_m3 = 19.0
friction_deg = 35

{drains}
[embankment]
design_height_m = {h}
crest_width_m = {crest}
side_slope_h_per_v = {slope}
fill_unit_weight_kn_m3 = 20.0
fill_friction_deg = 32.0

[construction]
placement_rate_m_per_day = 0.3
lift_min_m = 0.5
lift_max_m = 2.0
lift_increment_m = 0.5
min_rest_days = 7

[criteria]
fs_construction = {fs}

[analysis]
max_node_spacing_m = {dz}
placement_step_days = {dtp}
rest_step_days = {dtr}
"#,
        water = s.water,
        clay = s.clay_m,
        cv = s.cv,
        chr = s.ch_over_cv,
        sut = s.su0_top,
        sub = s.su0_bottom,
        h = s.height,
        crest = s.crest,
        slope = s.slope,
        fs = s.fs,
        dz = steps.0,
        dtp = steps.1,
        dtr = steps.2,
    )
}

const COARSE: (f64, f64, f64) = (0.5, 1.0, 4.0);

fn project(s: &Site, steps: (f64, f64, f64)) -> Project {
    fillpace::input::parse(&toml(s, steps), "property.toml").expect("generated projects are valid")
}

/// Raise the crest to `h` at the construction rate, then rest `rest` days,
/// calling `each` after every step.
fn load_and_rest(p: &Project, h: f64, rest: i64, mut each: impl FnMut(&Engine, &fillpace::response::State)) {
    let e = Engine::new(p);
    let r = Runner::new(&e);
    let mut st = e.initial_state();
    r.place(&mut st, h, &mut |s| each(&e, s)).expect("placement within the horizon");
    let until = st.day.ceil() as i64 + rest;
    r.rest_until(&mut st, until, &mut |s| each(&e, s));
}

proptest! {
    #![proptest_config(config())]

    #[test]
    fn planning_completes_with_a_clear_answer(s in site()) {
        let p = project(&s, COARSE);
        let e = Engine::new(&p);
        match planner::plan(&Runner::new(&e)) {
            Ok(plan) => {
                prop_assert!(!plan.stages.is_empty());
                for st in &plan.stages {
                    prop_assert!(st.fs_end.is_finite() && st.fs_end > 0.0);
                    if st.kind == planner::StageKind::Lift {
                        prop_assert!(st.fs_end >= p.criteria.fs_construction - 1e-9, "stage {} FS {}", st.number, st.fs_end);
                    }
                }
                prop_assert!((plan.stages.last().unwrap().height_after_m - p.embankment.design_height_m).abs() < 1e-6);
            }
            Err(err) => {
                let msg = err.to_string();
                prop_assert!(msg.contains("cannot be built") || msg.contains("not met within"), "{msg}");
            }
        }
    }

    #[test]
    fn factors_of_safety_are_finite_and_positive(s in site(), frac in 0.2..1.0f64, dx in -5.0..15.0f64, dy in 2.0..20.0f64) {
        let p = project(&s, COARSE);
        let e = Engine::new(&p);
        let h = frac * p.embankment.design_height_m;
        let field = e.field(&e.initial_state());
        let sec = Section::new(&p, h, &field);
        let found = search::search(&sec).expect("search");
        prop_assert!(found.critical.fs.is_finite() && found.critical.fs > 0.0);
        let xc = 0.5 * p.embankment.crest_width_m + dx;
        for r in [dy + 1.0, dy + 4.0, dy + 8.0] {
            if let Ok(c) = sec.analyse(Circle { xc_m: xc, yc_m: dy, r_m: r }) {
                prop_assert!(c.fs.is_finite() && c.fs > 0.0, "circle ({xc}, {dy}, {r}): {}", c.fs);
                prop_assert!(c.fs_ordinary.is_finite() && c.fs_ordinary > 0.0);
            }
        }
    }

    #[test]
    fn excess_pore_pressure_is_not_negative_under_loading(s in site(), frac in 0.2..1.0f64, rest in 0i64..200) {
        let p = project(&s, COARSE);
        let mut low = f64::INFINITY;
        load_and_rest(&p, frac * p.embankment.design_height_m, rest, |_, st| {
            low = st.cols.iter().flat_map(|c| c.u.iter().copied()).fold(low, f64::min);
        });
        // Tolerance 0.5 kPa: the θ-scheme's start-up after a load change.
        prop_assert!(low > -0.5, "lowest excess {low} kPa");
    }

    #[test]
    fn settlement_does_not_decrease_under_non_decreasing_load(s in site(), frac in 0.2..1.0f64, rest in 0i64..200) {
        let p = project(&s, COARSE);
        let mut prev = 0.0;
        let mut worst: f64 = 0.0;
        load_and_rest(&p, frac * p.embankment.design_height_m, rest, |_, st| {
            worst = worst.min(st.settlement_centre_m - prev);
            prev = st.settlement_centre_m;
        });
        prop_assert!(worst > -1e-6, "settlement fell by {} m in a step", -worst);
    }

    #[test]
    fn strength_never_falls_below_su0(s in site(), frac in 0.2..1.0f64, rest in 0i64..200) {
        let p = project(&s, COARSE);
        let mut worst = f64::INFINITY;
        load_and_rest(&p, frac * p.embankment.design_height_m, rest, |e, st| {
            for (c, col) in e.columns.iter().enumerate() {
                for (i, n) in col.nodes.iter().enumerate() {
                    if n.clay.is_some() {
                        worst = worst.min(col.su(&st.cols[c], i) - n.su0_kpa);
                    }
                }
            }
        });
        // Numerical tolerance 1e-3 kPa: a θ-step may overshoot u by a hair.
        prop_assert!(worst >= -1e-3, "su below su0 by {} kPa", -worst);
    }

    #[test]
    fn identical_input_gives_byte_identical_json(s in site(), frac in 0.3..1.0f64) {
        let text = toml(&s, COARSE);
        let run = || {
            let p = fillpace::input::parse(&text, "p.toml").unwrap();
            let e = Engine::new(&p);
            let field = e.field(&e.initial_state());
            let r = search::search(&Section::new(&p, frac * p.embankment.design_height_m, &field)).unwrap();
            fillpace::report::json::envelope("stability", &p, "p.toml", &r).unwrap()
        };
        prop_assert_eq!(run(), run());
    }

    #[test]
    fn halving_the_steps_moves_results_little(s in site(), frac in 0.3..1.0f64) {
        // Stated tolerance: from the default grid and steps (0.25 m, 1 and
        // 2 days), halving the grid spacing and both time steps moves the
        // centreline settlement 60 days after placement by less than 5%
        // (+ 5 mm) and the largest excess pore pressure by less than 3 kPa.
        // (From a 0.5 m grid the early settlement of a thin layer near its
        // drained faces is not yet converged: see DEVELOPERS.md.)
        let run = |steps| {
            let p = project(&s, steps);
            let (mut settle, mut peak) = (0.0, 0.0);
            load_and_rest(&p, frac * p.embankment.design_height_m, 60, |e, st| {
                settle = st.settlement_centre_m;
                peak = e.peak_excess(st);
            });
            (settle, peak)
        };
        let (s1, u1) = run((0.25, 1.0, 2.0));
        let (s2, u2) = run((0.125, 0.5, 1.0));
        prop_assert!((s1 - s2).abs() < 0.05 * s2 + 0.005, "settlement {s1} vs {s2}");
        prop_assert!((u1 - u2).abs() < 3.0, "peak excess {u1} vs {u2}");
    }

    #[test]
    fn asaoka_returns_the_final_value_of_any_exponential_record(sf in 0.05..3.0f64, tau in 5.0..400.0f64, dt in 1.0..20.0f64) {
        use fillpace::monitoring::asaoka::{Drainage, asaoka};
        // Asaoka (1978): an exponential approach is a fixed point of the
        // construction for any interval.
        let t: Vec<f64> = (0..40).map(|k| k as f64 * dt).collect();
        let s: Vec<f64> = t.iter().map(|t| sf * (1.0 - (-t / tau).exp())).collect();
        let a = asaoka(&t, &s, dt, Drainage::Vertical { path_m: 5.0 });
        if let Some(f) = a.final_m {
            prop_assert!((f - sf).abs() < 1e-6 * sf.max(1.0), "{f} vs {sf}");
        } else {
            // Only when the record is flat to rounding (β1 indistinguishable from 1).
            prop_assert!(dt / tau < 1e-3 || (-(t[39]) / tau).exp() < 1e-12, "{a:?}");
        }
    }

    #[test]
    fn readings_with_garbage_rows_are_refused_at_that_line(row in "[a-zA-Z0-9,:.\\- ]{0,30}", at in 0usize..4) {
        let p = fillpace::input::parse(fillpace::app::DEMO, "demo").unwrap();
        let mut lines = vec![
            "instrument,time,value".to_string(),
            "fill,2027-04-05T07:00,0.0".into(),
            "P1,2027-04-06T09:00,42.0".into(),
            "SP1,2027-04-06T09:00,2.400".into(),
            "fill,2027-04-10T17:00,1.5".into(),
        ];
        // A row that starts with a known id could be a valid reading (or
        // put a valid one out of order); every other non-blank row is
        // garbage and must be refused at its own line, the (at + 2)-th of
        // the file (the header is line 1).
        let first = row.split(',').next().unwrap_or("").trim().to_string();
        prop_assume!(!p.instruments.iter().any(|i| i.id == first) && first != "fill");
        lines.insert(at + 1, row.clone());
        let text = lines.join("\n");
        let line = at + 2;
        match fillpace::monitoring::readings::parse(&text, "r.csv", &p) {
            Ok(r) => {
                prop_assert!(row.trim().is_empty(), "garbage row `{row}` at line {line} accepted");
                prop_assert_eq!(r.readings.len() + r.fill.len(), 4);
            }
            Err(fillpace::error::Error::Input { issues, .. }) => {
                prop_assert!(!row.trim().is_empty());
                prop_assert!(issues.iter().any(|i| i.line == Some(line)), "not refused at line {line}: {issues:?}");
            }
            Err(e) => prop_assert!(false, "unexpected error {e}"),
        }
    }

    #[test]
    fn an_edit_anywhere_in_the_log_is_found_at_its_line(n in 1usize..6, which in 0usize..6, pos in 0usize..200, byte in 32u8..127) {
        use fillpace::audit::{GENESIS, entry_line, verify_bytes};
        let mut text = String::new();
        let mut prev = GENESIS.to_string();
        for k in 1..=n {
            let mut m = serde_json::Map::new();
            m.insert("fs".into(), serde_json::Value::from(1.0 + k as f64 / 7.0));
            let line = entry_line(m, k, &prev).unwrap();
            prev = fillpace::hash::sha256_hex(line.trim_end().as_bytes());
            text.push_str(&line);
        }
        prop_assert!(verify_bytes(text.as_bytes(), "log").is_ok());
        let k = which % n;
        let starts: Vec<usize> = std::iter::once(0).chain(text.match_indices('\n').map(|(i, _)| i + 1)).collect();
        let len = starts[k + 1] - 1 - starts[k];
        let at = starts[k] + pos % len;
        let mut bytes = text.into_bytes();
        prop_assume!(bytes[at] != byte);
        bytes[at] = byte;
        match verify_bytes(&bytes, "log") {
            Ok(_) => prop_assert!(false, "edit at line {} not found", k + 1),
            Err(fillpace::error::Error::Input { issues, .. }) => prop_assert_eq!(issues[0].line, Some(k + 1)),
            Err(e) => prop_assert!(false, "{e}"),
        }
    }
}
