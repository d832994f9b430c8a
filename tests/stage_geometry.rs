//! Stage geometry as built (issue 14, found item 1): the FS of intermediate
//! stages with each lift a horizontal layer over the final footprint,
//! checked against hand and independent slice-by-slice calculations.

mod common;

use common::*;
use fillpace::model::Project;
use fillpace::response::Engine;
use fillpace::stability::{Circle, Section};

/// The demo with the tension crack off and the stage shape given.
fn demo_without_crack(shape: &str) -> Project {
    let text = std::fs::read_to_string(root(DEMO)).unwrap();
    let text = text
        .replace("side_slope_h_per_v = 2.0", &format!("side_slope_h_per_v = 2.0\nstage_shape = \"{shape}\""))
        .replace("[criteria]", "[stability]\nfill_tension_crack = false\n\n[criteria]");
    fillpace::input::parse(&text, "demo-without-crack.toml").unwrap()
}

/// FS (Bishop, Ordinary) of a circle on the section at crest `height_m` in
/// the initial ground state.
fn circle_fs(p: &Project, height_m: f64, c: Circle) -> (f64, f64) {
    let engine = Engine::new(p);
    let field = engine.field(&engine.initial_state());
    let r = Section::new(p, height_m, &field).analyse(c).unwrap();
    (r.fs, r.fs_ordinary)
}

#[test]
fn demo_at_four_and_a_half_metres_matches_the_hand_calculations_of_issue_14() {
    // Issue 14, found item 1: a hand Fellenius calculation on the demo at a
    // 4.5 m crest, circle (23, 14, 23), initial ground, no crack, gave
    // FS 1.520 with the constant-crest shape and 1.309 with full-width
    // layers (14% lower). Tolerance 0.5% (hand slicing).
    let c = Circle { xc_m: 23.0, yc_m: 14.0, r_m: 23.0 };
    let (_, old) = circle_fs(&demo_without_crack("constant-crest"), 4.5, c);
    assert!((old - 1.520).abs() < 0.005 * 1.520, "constant-crest Ordinary FS {old}");
    let (_, new) = circle_fs(&demo_without_crack("full-footprint"), 4.5, c);
    assert!((new - 1.309).abs() < 0.005 * 1.309, "full-footprint Ordinary FS {new}");
}

/// A 10 m uniform clay (su = 20 kPa everywhere, γ = 17 kN/m³) under a 5 m
/// design section: crest 10 m, slopes 2H:1V, a 6 m berm at 1.5 m; fill
/// γ = 20 kN/m³, c' = 0, φ' = 30°; water table at OGL; no crack.
fn uniform_site(shape: &str) -> Project {
    let text = format!(
        r#"
[project]
title = "independent slice check"
start_date = "2030-01-07"

[ground]
groundwater_depth_m = 0.0

[[ground.layers]]
name = "clay"
kind = "clay"
thickness_m = 10.0
unit_weight_kn_m3 = 17.0
e0 = 1.5
cc = 0.6
cr = 0.06
cv_m2_per_year = 2.0
strength = "gain-ratio"
gain_ratio = 0.0
su0_top_kpa = 20.0
su0_bottom_kpa = 20.0

[[ground.layers]]
name = "base"
kind = "stiff-base"
unit_weight_kn_m3 = 21.0

[embankment]
design_height_m = 5.0
crest_width_m = 10.0
side_slope_h_per_v = 2.0
fill_unit_weight_kn_m3 = 20.0
fill_friction_deg = 30.0
stage_shape = "{shape}"

[[embankment.berms]]
width_m = 6.0
height_m = 1.5

{construction}
[stability]
fill_tension_crack = false
slices = 200
"#,
        construction = include_str!("data/fixture-construction.toml")
    );
    fillpace::input::parse(&text, "uniform.toml").unwrap()
}

/// Fill surface of the 3 m stage, written out by hand from the section
/// above. Final section: crest to x = 5, slope to 1.5 m at x = 12, berm to
/// x = 18, slope to OGL at x = 21. Full footprint at 3 m: min(3, final).
/// Constant crest at 3 m: a 3 m platform to x = 5 and slope to x = 11,
/// over the berm (1.5 m to x = 18, slope to x = 21).
fn stage_surface(full_footprint: bool, x: f64) -> f64 {
    let final_section = |x: f64| {
        let main = 5.0 - (x - 5.0).max(0.0) / 2.0;
        let berm = 1.5 - (x - 18.0).max(0.0) / 2.0;
        main.max(berm).max(0.0)
    };
    if full_footprint {
        final_section(x).min(3.0)
    } else {
        let main = 3.0 - (x - 5.0).max(0.0) / 2.0;
        let berm = 1.5 - (x - 18.0).max(0.0) / 2.0;
        main.max(berm).max(0.0)
    }
}

/// Independent slice-by-slice Bishop and Ordinary FS on circle c over the
/// stage surface: 20 000 equal slices between entry and exit, weight from
/// the fill above OGL (20 kN/m³) and the clay below (17 kN/m³); a base in
/// clay has τ = 20 kPa, a base in fill c' = 0, φ' = 30°, u = 0 (above the
/// water table). Ordinary: F = Σ(c l + W cos α tan φ)/Σ W sin α (Fellenius
/// 1927); Bishop (1955): F = Σ[(c b + W tan φ)/m_α]/Σ W sin α,
/// m_α = cos α + sin α tan φ/F, iterated.
fn independent_fs(full_footprint: bool, c: Circle, entry: f64, exit: f64) -> (f64, f64) {
    let n = 20_000;
    let b = (exit - entry) / n as f64;
    let tan_phi = 30f64.to_radians().tan();
    let mut slices = Vec::with_capacity(n);
    for k in 0..n {
        let x = entry + (k as f64 + 0.5) * b;
        let y = c.yc_m - (c.r_m * c.r_m - (x - c.xc_m).powi(2)).sqrt();
        let top = stage_surface(full_footprint, x);
        let w = b * (20.0 * (top - y.max(0.0)).max(0.0) + 17.0 * (-y).max(0.0));
        let sin_a = (c.xc_m - x) / c.r_m;
        let cos_a = (1.0 - sin_a * sin_a).sqrt();
        let (coh, tp) = if y < 0.0 { (20.0, 0.0) } else { (0.0, tan_phi) };
        slices.push((w, sin_a, cos_a, coh, tp));
    }
    let drive: f64 = slices.iter().map(|s| s.0 * s.1).sum();
    let ordinary = slices.iter().map(|s| s.3 * b / s.2 + s.0 * s.2 * s.4).sum::<f64>() / drive;
    let mut f = ordinary;
    for _ in 0..200 {
        f = slices.iter().map(|s| (s.3 * b + s.0 * s.4) / (s.2 + s.1 * s.4 / f)).sum::<f64>() / drive;
    }
    (f, ordinary)
}

#[test]
fn full_footprint_stage_matches_an_independent_slice_calculation() {
    // Issue 14, check "full-footprint stage geometry: on a stated circle,
    // the tool's Bishop and Ordinary FS equal an independent slice-by-slice
    // computation within 0.5%". Circle (13, 12, 15) on the 3 m stage:
    // enters the crest platform at x = 1 (13 − √(15² − 9²)) and leaves the
    // ground at x = 22 (13 + √(15² − 12²)), lowest point 3 m into the clay.
    let c = Circle { xc_m: 13.0, yc_m: 12.0, r_m: 15.0 };
    for (shape, full) in [("full-footprint", true), ("constant-crest", false)] {
        let p = uniform_site(shape);
        let (bishop, ordinary) = circle_fs(&p, 3.0, c);
        // Constant crest at 3 m: the circle enters the 3 m platform at x = 1 too.
        let (b_ref, o_ref) = independent_fs(full, c, 1.0, 22.0);
        assert!((bishop - b_ref).abs() < 0.005 * b_ref, "{shape}: Bishop {bishop} vs {b_ref}");
        assert!((ordinary - o_ref).abs() < 0.005 * o_ref, "{shape}: Ordinary {ordinary} vs {o_ref}");
    }
    // The full footprint puts more fill on the active side of this circle:
    // its FS is well below the constant-crest one (2.53 against 3.19 by
    // the independent calculation), so the check tells the shapes apart.
    let ff = independent_fs(true, c, 1.0, 22.0).0;
    let cc = independent_fs(false, c, 1.0, 22.0).0;
    assert!(ff < 0.85 * cc, "{ff} vs {cc}");
}
