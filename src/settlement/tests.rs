use super::*;

/// One 10 m clay layer drained at both faces (cv = 0.01 m²/day, linear
/// mode, Cα = 0.02) under a 2 m fill 200 m wide; the clay is made stiff
/// (Cc = 0.006) so that the make-up fill and its buoyancy change the load
/// by a few parts per thousand only.
fn layer() -> crate::model::Project {
    let text = format!(
        r#"
[project]
title = "residual check"
start_date = "2030-01-07"
design_life_years = 30

[ground]
groundwater_depth_m = 0.0
base_drainage = "drained"

[[ground.layers]]
name = "clay"
kind = "clay"
thickness_m = 10.0
unit_weight_kn_m3 = 16.0
e0 = 1.5
cc = 0.006
cr = 0.001
c_alpha = 0.02
cv_m2_per_year = 3.6525
{}{}
[analysis]
mode = "linear"
"#,
        crate::fixtures::STIFF_BASE,
        crate::fixtures::tables(2.0, 200.0)
    );
    crate::input::parse(&text, "residual.toml").unwrap()
}

/// Terzaghi's (1925) average degree of consolidation, exact series
/// U(T) = 1 − Σ 2/M² exp(−M² T), M = π(2m+1)/2 (e.g. Craig's Soil Mechanics).
fn terzaghi_u(t: f64) -> f64 {
    1.0 - (0..200)
        .map(|m| {
            let mm = std::f64::consts::PI * (2 * m + 1) as f64 / 2.0;
            2.0 / (mm * mm) * (-mm * mm * t).exp()
        })
        .sum::<f64>()
}

#[test]
fn residual_matches_terzaghi_and_mesri_on_one_layer() {
    // Issue 14, check "residual settlement on a single uniform layer without
    // drains equals the Terzaghi closed form for the remaining primary
    // (plus the Cα term) within 1%". Closed forms computed here:
    // mv = Cc/(ln10 (1+e0) σ'ref), σ'ref = σ'v0 at mid-layer (the linear
    // mode's definition, DEVELOPERS.md); final settlement with the make-up
    // and its buoyancy (water table at OGL): S_f = mv H γ h / (1 − mv H (γ − γw));
    // remaining primary S_f (1 − U(T)); secondary Cα/(1+e0) H log10(t2/t_p)
    // with t_p at U = 95% (Mesri's convention), t2 = finish + 30 years.
    let p = layer();
    let engine = Engine::new(&p);
    let mut st = engine.initial_state();
    engine.advance(&mut st, 1e-3, 2.0);
    let (hdr, cv) = (5.0, 0.01);
    let t_finish = 0.2 * hdr * hdr / cv; // T = 0.2
    while st.day < t_finish - 1e-9 {
        let dt = (t_finish - st.day).min(0.5);
        engine.advance(&mut st, dt, 2.0);
    }
    let f = forecast(&engine, &st, 0.0);
    let gw = crate::model::GAMMA_W;
    let s_ref = (16.0 - gw) * 5.0;
    let mv = 0.006 / (std::f64::consts::LN_10 * 2.5 * s_ref);
    let s_f = mv * 10.0 * 20.0 * 2.0 / (1.0 - mv * 10.0 * (20.0 - gw));
    assert!((f.final_primary_m - s_f).abs() < 0.01 * s_f, "S_f {} vs {s_f}", f.final_primary_m);
    let remaining = s_f * (1.0 - terzaghi_u(0.2));
    assert!((f.remaining_primary_m - remaining).abs() < 0.01 * remaining, "{} vs {remaining}", f.remaining_primary_m);
    // T at U = 95% by bisection of the series (≈ 1.129).
    let (mut lo, mut hi) = (0.5, 2.0);
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        if terzaghi_u(mid) < EOP_DEGREE { lo = mid } else { hi = mid }
    }
    let t_p = lo * hdr * hdr / cv;
    let eop = f.end_of_primary_day.unwrap();
    assert!((eop - t_p).abs() < 0.01 * t_p, "t_p {eop} vs {t_p}");
    let t2 = t_finish + 30.0 * crate::model::DAYS_PER_YEAR;
    let secondary = 0.02 / 2.5 * 10.0 * (t2 / t_p).log10();
    assert!((f.secondary_m - secondary).abs() < 0.01 * secondary, "{} vs {secondary}", f.secondary_m);
    assert!((f.residual_m - (remaining + secondary)).abs() < 0.01 * (remaining + secondary));
}

#[test]
fn no_secondary_when_primary_outlasts_the_design_life() {
    // A 1-year design life ends long before U = 95% (T = 1.13 is 7.7
    // years here): no secondary compression is counted, all the remaining
    // primary is (the safe side).
    let mut p = layer();
    p.info.design_life_years = 1.0;
    let engine = Engine::new(&p);
    let mut st = engine.initial_state();
    engine.advance(&mut st, 1.0, 2.0);
    let f = forecast(&engine, &st, 0.0);
    assert_eq!(f.end_of_primary_day, None);
    assert_eq!(f.secondary_m, 0.0);
    assert!((f.residual_m - (f.final_primary_m - f.at_finish_m)).abs() < 1e-12);
}
