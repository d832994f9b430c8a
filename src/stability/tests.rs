//! Checks of the stability engine against classical published solutions.

use super::search::search;
use super::*;
use crate::fixtures;
use crate::model::*;
use crate::response::GroundField;

/// A strength field with the same su everywhere.
fn uniform_su(su: f64) -> GroundField {
    GroundField {
        xs: vec![0.0, 1.0e4],
        zs: vec![0.0, 100.0],
        su: vec![vec![su, su], vec![su, su]],
        settlement_m: vec![0.0, 0.0],
    }
}

/// Deep uniform clay (40 m, su given by the field) under a strip of width
/// 2 m carrying q: a 1 cm "fill" of weight q/0.01 with no strength.
fn strip_project(q: f64) -> Project {
    let mut p = fixtures::uniform_clay(40.0, 1.0, "drained", "");
    p.embankment.crest_width_m = 2.0;
    p.embankment.side_slope_h_per_v = 0.001;
    p.embankment.fill_friction_deg = 0.0;
    p.embankment.fill_unit_weight_kn_m3 = q / 0.01;
    p
}

#[test]
fn strip_load_on_clay_fellenius_circle() {
    // Fellenius (1927): the critical circle under a strip load on φ = 0 clay
    // fails at q = 5.52 su, so FS = 5.52 su/q (within 1.5%), and never below
    // Prandtl's 5.14 su/q.
    let (su, q) = (10.0, 50.0);
    let p = strip_project(q);
    let field = uniform_su(su);
    let s = Section::new(&p, 0.01, &field);
    let r = search(&s).unwrap();
    let expect = 5.52 * su / q;
    assert!((r.critical.fs - expect).abs() < 0.015 * expect, "FS = {} vs {expect}", r.critical.fs);
    assert!(r.critical.fs > 5.14 * su / q);
    assert!(r.circles_tried >= 2000);
}

#[test]
fn fs_scales_with_su_in_phi_zero_problem() {
    // φ = 0: FS is proportional to su (exact for any method).
    let p = strip_project(50.0);
    let (f1, f2) = (uniform_su(10.0), uniform_su(20.0));
    let c = Circle { xc_m: 1.0, yc_m: 0.7, r_m: 2.2 };
    let a = Section::new(&p, 0.01, &f1).analyse(c).unwrap();
    let b = Section::new(&p, 0.01, &f2).analyse(c).unwrap();
    assert!((b.fs / a.fs - 2.0).abs() < 1e-9);
}

/// Homogeneous φ = 0 slope: the slope body is fill with c' = su and the
/// foundation 40 m of the same clay.
fn taylor_project(su: f64, gamma: f64, h: f64, n: f64) -> Project {
    let mut p = fixtures::uniform_clay(40.0, 1.0, "drained", "");
    p.ground.groundwater_depth_m = 50.0;
    for l in &mut p.ground.layers {
        l.unit_weight_kn_m3 = gamma;
        l.saturated_unit_weight_kn_m3 = gamma;
    }
    let e = &mut p.embankment;
    e.design_height_m = h;
    e.crest_width_m = 200.0;
    e.side_slope_h_per_v = n;
    e.fill_unit_weight_kn_m3 = gamma;
    e.fill_cohesion_kpa = su;
    e.fill_friction_deg = 0.0;
    p.stability.fill_tension_crack = false;
    p
}

#[test]
fn taylor_deep_base_failure_stability_number() {
    // Taylor (1948): a φ = 0 slope flatter than 53° on a deep deposit fails
    // by a deep base circle at the stability number N = γH/cm = 5.52, where
    // cm = su/FS is the mobilised strength (within 3%).
    let (su, gamma, h) = (20.0, 18.0, 5.0);
    let p = taylor_project(su, gamma, h, 2.0);
    let field = uniform_su(su);
    let s = Section::new(&p, h, &field);
    let r = search(&s).unwrap();
    let n = gamma * h * r.critical.fs / su;
    assert!((n - 5.52).abs() < 0.03 * 5.52, "N = {n}, FS = {}", r.critical.fs);
}

#[test]
fn fs_independent_of_slice_count_beyond_thirty() {
    let p = taylor_project(20.0, 18.0, 5.0, 2.0);
    let field = uniform_su(20.0);
    let c = Circle { xc_m: 108.0, yc_m: 15.0, r_m: 25.0 };
    let mut fs = Vec::new();
    for n in [30, 60, 240] {
        let mut q = p.clone();
        q.stability.slices = n;
        fs.push(Section::new(&q, 5.0, &field).analyse(c).unwrap().fs);
    }
    for f in &fs {
        assert!((f - fs[2]).abs() < 0.005 * fs[2], "{fs:?}");
    }
}

#[test]
fn reinforcement_adds_its_moment_to_the_resistance() {
    // Hand calculation (moment equilibrium about the centre): on a φ = 0
    // circle the basal reinforcement force T acting horizontally at the
    // fill base (y = 0 here, no settlement) adds T·yc to the resisting
    // moment, so FS rises by exactly T·yc / M_driving.
    let mut p = taylor_project(20.0, 18.0, 5.0, 2.0);
    let field = uniform_su(20.0);
    let c = Circle { xc_m: 104.0, yc_m: 9.0, r_m: 13.0 };
    let plain = Section::new(&p, 5.0, &field).analyse(c).unwrap();
    p.embankment.reinforcement_kn_per_m = 200.0;
    let reinforced = Section::new(&p, 5.0, &field).analyse(c).unwrap();
    let expect = plain.fs + 200.0 * c.yc_m / plain.driving_knm_per_m;
    assert!((reinforced.fs - expect).abs() < 1e-9 * expect, "{} vs {expect}", reinforced.fs);
}

#[test]
fn berm_never_lowers_fs_of_through_toe_mechanism() {
    let mut p = taylor_project(20.0, 18.0, 5.0, 2.0);
    let field = uniform_su(20.0);
    let plain = search(&Section::new(&p, 5.0, &field)).unwrap().critical.fs;
    p.embankment.berms = vec![Berm { width_m: 8.0, height_m: 2.0, placed_from_height_m: 0.0 }];
    let bermed = search(&Section::new(&p, 5.0, &field)).unwrap().critical.fs;
    assert!(bermed >= plain - 1e-6, "{bermed} < {plain}");
}

#[test]
fn circle_missing_the_ground_is_rejected() {
    let p = taylor_project(20.0, 18.0, 5.0, 2.0);
    let field = uniform_su(20.0);
    let s = Section::new(&p, 5.0, &field);
    let miss = s.analyse(Circle { xc_m: 100.0, yc_m: 20.0, r_m: 5.0 });
    assert_eq!(miss.unwrap_err(), Reject::NoIntersection);
    let deep = s.analyse(Circle { xc_m: 100.0, yc_m: 20.0, r_m: 80.0 });
    assert_eq!(deep.unwrap_err(), Reject::IntoBase);
}

#[test]
fn crack_position_moves_smoothly_with_settlement() {
    // Regression: the crack used to sit on the nearest slice boundary, so a
    // millimetre of settlement could move it by a whole slice and change FS
    // by several per cent. Now it sits on the arc's crossing of the ground.
    let p = taylor_project(20.0, 18.0, 5.0, 2.0);
    let mut field = uniform_su(20.0);
    field.xs = vec![0.0, 100.0, 110.0, 1.0e4];
    field.zs = vec![0.0, 100.0];
    field.su = vec![vec![20.0, 20.0]; 4];
    let c = Circle { xc_m: 108.0, yc_m: 12.0, r_m: 20.0 };
    let mut last = None;
    for k in 0..20 {
        let s = 0.5 + 0.001 * k as f64;
        field.settlement_m = vec![s, s, 0.1, 0.0];
        let mut q = p.clone();
        q.stability.fill_tension_crack = true;
        let fs = Section::new(&q, 5.0, &field).analyse(c).unwrap().fs;
        if let Some(prev) = last {
            let change: f64 = fs - prev;
            assert!(change.abs() < 0.002 * fs, "FS jumped {prev} → {fs} at s = {s}");
        }
        last = Some(fs);
    }
}

mod benchmarks;
mod fill;
mod robust;
