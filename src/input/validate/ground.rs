//! Checks of `[ground]` and its `[[ground.layers]]`: thicknesses and unit
//! weights, clay compressibility, preconsolidation and strength (with the
//! measured su0 profile), the pore water of sand layers, and the refusal of
//! a piezometric level that would lift the ground (σ'v0 ≤ 0).

use super::{Check, Low, show};
use crate::input::raw::{RawGround, RawLayer};
use crate::model::*;

pub(super) fn ground(c: &mut Check, r: &RawGround) -> Ground {
    let base_drained =
        c.choice("ground.base_drainage", r.base_drainage.as_deref(), &["drained", "undrained"]) == "drained";
    let before = c.issues.len();
    let gwd = c.num("ground.groundwater_depth_m", r.groundwater_depth_m, Low::Incl(0.0), 50.0);
    if r.layers.is_empty() {
        c.bad("ground.layers", "is empty; give at least one clay layer".into());
    }
    let mut layers = Vec::new();
    let mut top = 0.0;
    for (i, l) in r.layers.iter().enumerate() {
        let layer = layer(c, &format!("ground.layers[{i}]"), l, top, i + 1 == r.layers.len());
        top += layer.thickness_m;
        layers.push(layer);
    }
    if !r.layers.is_empty() && !layers.iter().any(|l| matches!(l.kind, LayerKind::Clay(_))) {
        c.bad("ground.layers", "has no layer of kind = \"clay\"; at least one is needed".into());
    }
    let depth: f64 = layers.iter().filter(|l| !matches!(l.kind, LayerKind::StiffBase)).map(|l| l.thickness_m).sum();
    if depth > 80.0 {
        c.bad("ground.layers", format!("total thickness {depth} m above the base exceeds the supported 80 m"));
    }
    let ground = Ground { groundwater_depth_m: gwd, layers, base_drained };
    if c.issues.len() == before {
        uplift(c, &ground);
    }
    ground
}

/// A piezometric level that lifts the ground (σ'v0 ≤ 0 below the surface)
/// is refused, naming the level that causes it: the point's own layer's,
/// else the nearest below it (artesian pressure acts from below), else the
/// nearest above.
fn uplift(c: &mut Check, g: &Ground) {
    let Some((z, se, sv, u)) = crate::ground::uplift(g) else { return };
    let at = crate::ground::layer_index(g, (z - 1e-6).max(0.0));
    let level = |i: usize| matches!(g.layers[i].pore, PoreWater::Level { .. });
    let i = (at..g.layers.len()).find(|&i| level(i)).or_else(|| (0..at).rev().find(|&i| level(i)));
    let (key, value) = match i.map(|i| (i, g.layers[i].pore)) {
        Some((i, PoreWater::Level { elevation_m })) => {
            (format!("ground.layers[{i}].piezometric_level_m"), format!("= {}", show(elevation_m)))
        }
        _ => ("ground.layers".to_string(), "as given".to_string()),
    };
    c.bad(
        &key,
        format!(
            "{} lifts the ground: at {:.2} m depth (layer \"{}\") the initial pore pressure u0 = {:.1} kPa reaches the total vertical stress σv0 = {:.1} kPa, so σ'v0 = {:.1} kPa; allowed: a level that leaves σ'v0 > 0 at every depth (the ground would heave or boil: uplift)",
            value,
            z,
            g.layers[at].name,
            u,
            sv,
            se
        ),
    );
}

fn layer(c: &mut Check, key: &str, r: &RawLayer, top_m: f64, last: bool) -> Layer {
    let k = |f: &str| format!("{key}.{f}");
    if r.name.trim().is_empty() {
        c.bad(&k("name"), "must not be empty".into());
    }
    let kind_name = c.choice(&k("kind"), Some(r.kind.as_str()), &["clay", "sand", "stiff-base"]);
    let thickness_m = match (r.thickness_m, kind_name) {
        (Some(t), _) => c.num(&k("thickness_m"), t, Low::Excl(0.0), 60.0),
        (None, "stiff-base") => 0.0,
        (None, _) => {
            c.bad(&k("thickness_m"), "is missing; every clay or sand layer needs a thickness".into());
            1.0
        }
    };
    if kind_name == "stiff-base" && !last {
        c.bad(&k("kind"), "= \"stiff-base\" is only allowed for the lowest layer".into());
    }
    let gamma = c.num(&k("unit_weight_kn_m3"), r.unit_weight_kn_m3, Low::Incl(10.0), 25.0);
    let gamma_sat =
        c.opt(&k("saturated_unit_weight_kn_m3"), r.saturated_unit_weight_kn_m3, gamma, Low::Incl(10.0), 25.0);
    if gamma_sat < gamma {
        c.bad(
            &k("saturated_unit_weight_kn_m3"),
            format!("= {gamma_sat} must not be smaller than unit_weight_kn_m3 ({gamma})"),
        );
    }
    let kind = match kind_name {
        "clay" => LayerKind::Clay(clay(c, key, r, top_m, thickness_m)),
        "sand" => LayerKind::Sand {
            friction_deg: c.opt(&k("friction_deg"), r.friction_deg, 32.0, Low::Excl(0.0), 50.0),
            cohesion_kpa: c.opt(&k("cohesion_kpa"), r.cohesion_kpa, 0.0, Low::Incl(0.0), 50.0),
        },
        _ => LayerKind::StiffBase,
    };
    let pore = pore_water(c, key, r, kind_name);
    Layer {
        name: r.name.clone(),
        thickness_m,
        unit_weight_kn_m3: gamma,
        saturated_unit_weight_kn_m3: gamma_sat,
        kind,
        pore,
    }
}

/// Pore pressure of a sand layer: hydrostatic unless a piezometric level
/// (which also sets the clay's initial pore pressure by seepage) or an ru
/// (stability only) is given, not both. Clay is analysed undrained (su
/// from the consolidation model) and its u0 follows from its boundaries,
/// so neither key applies to it.
fn pore_water(c: &mut Check, key: &str, r: &RawLayer, kind: &str) -> PoreWater {
    let k = |f: &str| format!("{key}.{f}");
    if kind != "sand" {
        for (f, v) in [("piezometric_level_m", r.piezometric_level_m), ("ru", r.ru)] {
            if let Some(v) = v {
                c.bad(&k(f), format!("= {v} only applies to sand layers: clay is analysed undrained with su from the consolidation model"));
            }
        }
        return PoreWater::Hydrostatic;
    }
    match (r.piezometric_level_m, r.ru) {
        (None, None) => PoreWater::Hydrostatic,
        (Some(h), None) => {
            PoreWater::Level { elevation_m: c.num(&k("piezometric_level_m"), h, Low::Incl(-80.0), 20.0) }
        }
        (None, Some(ru)) => PoreWater::Ratio { ru: c.num(&k("ru"), ru, Low::Incl(0.0), 0.9) },
        (Some(_), Some(_)) => {
            c.bad(&k("ru"), "give either piezometric_level_m or ru, not both".into());
            PoreWater::Hydrostatic
        }
    }
}

fn clay(c: &mut Check, key: &str, r: &RawLayer, top_m: f64, thickness_m: f64) -> Clay {
    let k = |f: &str| format!("{key}.{f}");
    // A missing key is reported and a harmless stand-in used, so that the
    // remaining checks still run (the result is discarded on any issue).
    let need = |c: &mut Check, f: &str, v: Option<f64>, low: Low, high: f64, stand_in: f64| -> f64 {
        match v {
            Some(x) => c.num(&k(f), x, low, high),
            None => {
                c.bad(&k(f), "is missing; clay layers need it".into());
                stand_in
            }
        }
    };
    let e0 = need(c, "e0", r.e0, Low::Excl(0.1), 10.0, 1.0);
    let cc = need(c, "cc", r.cc, Low::Excl(0.0), 5.0, 1.0);
    let cr = need(c, "cr", r.cr, Low::Excl(0.0), 1.0, 0.1);
    if cr >= cc {
        c.bad(&k("cr"), format!("= {cr} must be smaller than cc ({cc})"));
    }
    let cv = need(c, "cv_m2_per_year", r.cv_m2_per_year, Low::Excl(0.0), 1000.0, 1.0);
    let ch = match (r.ch_m2_per_year, r.ch_over_cv) {
        (Some(_), Some(_)) => {
            c.bad(&k("ch_over_cv"), "give either ch_m2_per_year or ch_over_cv, not both".into());
            cv
        }
        (Some(ch), None) => c.num(&k("ch_m2_per_year"), ch, Low::Excl(0.0), 1000.0),
        (None, ratio) => cv * c.opt(&k("ch_over_cv"), ratio, 1.0, Low::Excl(0.0), 20.0),
    };
    let c_alpha = c.opt(&k("c_alpha"), r.c_alpha, 0.0, Low::Incl(0.0), 0.2);
    Clay {
        e0,
        cc,
        cr,
        c_alpha,
        preconsolidation: preconsolidation(c, key, r),
        cv_m2_per_day: cv / DAYS_PER_YEAR,
        ch_m2_per_day: ch / DAYS_PER_YEAR,
        strength: strength(c, key, r, top_m, thickness_m),
    }
}

fn preconsolidation(c: &mut Check, key: &str, r: &RawLayer) -> Preconsolidation {
    let k = |f: &str| format!("{key}.{f}");
    match (r.ocr, r.pop_kpa, r.sigma_p_kpa) {
        (Some(o), None, None) => Preconsolidation::Ocr(c.num(&k("ocr"), o, Low::Incl(1.0), 50.0)),
        (None, Some(p), None) => Preconsolidation::PopKpa(c.num(&k("pop_kpa"), p, Low::Incl(0.0), 1000.0)),
        (None, None, Some(s)) => Preconsolidation::SigmaPKpa(c.num(&k("sigma_p_kpa"), s, Low::Excl(0.0), 5000.0)),
        (None, None, None) => Preconsolidation::Ocr(1.0),
        _ => {
            c.bad(&k("ocr"), "give only one of ocr, pop_kpa, sigma_p_kpa".into());
            Preconsolidation::Ocr(1.0)
        }
    }
}

fn strength(c: &mut Check, key: &str, r: &RawLayer, top_m: f64, thickness_m: f64) -> Strength {
    let k = |f: &str| format!("{key}.{f}");
    let su0_points = su0_profile(c, key, r, top_m, thickness_m);
    let model = match c.choice(&k("strength"), r.strength.as_deref(), &["shansep", "gain-ratio"]) {
        "shansep" => {
            if r.gain_ratio.is_some() {
                c.bad(&k("gain_ratio"), "only applies with strength = \"gain-ratio\"".into());
            }
            StrengthModel::Shansep {
                s: c.opt(&k("shansep_s"), r.shansep_s, 0.22, Low::Excl(0.05), 0.6),
                m: c.opt(&k("shansep_m"), r.shansep_m, 0.8, Low::Incl(0.5), 1.0),
            }
        }
        _ => {
            if su0_points.is_empty() {
                c.bad(
                    &k("strength"),
                    "= \"gain-ratio\" needs a measured su0 profile (su0_top_kpa/su0_bottom_kpa or su0_points)".into(),
                );
            }
            let ratio = r.gain_ratio.unwrap_or_else(|| {
                c.bad(&k("gain_ratio"), "is missing; strength = \"gain-ratio\" needs it".into());
                0.2
            });
            StrengthModel::GainRatio { ratio: c.num(&k("gain_ratio"), ratio, Low::Incl(0.0), 0.6) }
        }
    };
    Strength { model, su0_points }
}

fn su0_profile(c: &mut Check, key: &str, r: &RawLayer, top_m: f64, thickness_m: f64) -> Vec<(f64, f64)> {
    let k = |f: &str| format!("{key}.{f}");
    match (&r.su0_points, r.su0_top_kpa, r.su0_bottom_kpa) {
        (None, None, None) => Vec::new(),
        (None, Some(t), b) => {
            let t = c.num(&k("su0_top_kpa"), t, Low::Excl(0.0), 500.0);
            let b = c.opt(&k("su0_bottom_kpa"), b, t, Low::Excl(0.0), 500.0);
            vec![(top_m, t), (top_m + thickness_m, b)]
        }
        (None, None, Some(_)) => {
            c.bad(&k("su0_top_kpa"), "is missing; su0_bottom_kpa needs su0_top_kpa".into());
            Vec::new()
        }
        (Some(points), None, None) => su0_points(c, &k("su0_points"), points, top_m, thickness_m),
        (Some(_), _, _) => {
            c.bad(&k("su0_points"), "give either su0_points or su0_top_kpa/su0_bottom_kpa, not both".into());
            Vec::new()
        }
    }
}

fn su0_points(c: &mut Check, key: &str, points: &[Vec<f64>], top_m: f64, thickness_m: f64) -> Vec<(f64, f64)> {
    if points.is_empty() {
        c.bad(key, "is empty; give [[depth_m, su_kpa], ...]".into());
    }
    let mut out: Vec<(f64, f64)> = Vec::new();
    for (i, p) in points.iter().enumerate() {
        let pk = format!("{key}[{i}]");
        if p.len() != 2 {
            c.bad(&pk, format!("has {} numbers; each point is [depth below ground m, su kPa]", p.len()));
            continue;
        }
        let z = c.num(&pk, p[0], Low::Incl(top_m), top_m + thickness_m);
        let su = c.num(&pk, p[1], Low::Excl(0.0), 500.0);
        if let Some(last) = out.last()
            && z <= last.0
        {
            c.bad(&pk, format!("depth {z} m must be deeper than the previous point ({} m)", last.0));
        }
        out.push((z, su));
    }
    out
}
