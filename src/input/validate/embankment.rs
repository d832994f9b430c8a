//! Checks of `[embankment]` and its `[[embankment.berms]]`: dimensions,
//! fill properties, the stage shape and the order in which berms are
//! raised, with the cross-field rules these need (a berm lower than the
//! one inside it and complete by design height; a surcharge that still has
//! a crest when the side slopes are carried on upwards).

use super::{Check, Low};
use crate::input::raw::RawEmbankment;
use crate::model::{Berm, Embankment, StageShape};

pub(super) fn embankment(c: &mut Check, r: &RawEmbankment) -> Embankment {
    let k = |f: &str| format!("embankment.{f}");
    let h = c.num(&k("design_height_m"), r.design_height_m, Low::Excl(0.0), 20.0);
    let stage_shape = match c.choice(&k("stage_shape"), r.stage_shape.as_deref(), &["full-footprint", "constant-crest"])
    {
        "constant-crest" => StageShape::ConstantCrest,
        _ => StageShape::FullFootprint,
    };
    let e = Embankment {
        design_height_m: h,
        crest_width_m: c.num(&k("crest_width_m"), r.crest_width_m, Low::Excl(0.0), 200.0),
        side_slope_h_per_v: c.num(&k("side_slope_h_per_v"), r.side_slope_h_per_v, Low::Excl(0.0), 20.0),
        fill_unit_weight_kn_m3: c.num(&k("fill_unit_weight_kn_m3"), r.fill_unit_weight_kn_m3, Low::Incl(12.0), 24.0),
        fill_cohesion_kpa: c.opt(&k("fill_cohesion_kpa"), r.fill_cohesion_kpa, 0.0, Low::Incl(0.0), 100.0),
        fill_friction_deg: c.num(&k("fill_friction_deg"), r.fill_friction_deg, Low::Incl(0.0), 50.0),
        surcharge_height_m: c.opt(&k("surcharge_height_m"), r.surcharge_height_m, 0.0, Low::Incl(0.0), 10.0),
        berms: berms(c, r, h),
        reinforcement_kn_per_m: c.opt(
            &k("reinforcement_kn_per_m"),
            r.reinforcement_kn_per_m,
            0.0,
            Low::Incl(0.0),
            5000.0,
        ),
        stage_shape,
    };
    surcharge_top(c, &e);
    e
}

fn berms(c: &mut Check, r: &RawEmbankment, h: f64) -> Vec<Berm> {
    let mut berms = Vec::new();
    for (i, b) in r.berms.iter().enumerate() {
        let bk = format!("embankment.berms[{i}]");
        let width_m = c.num(&format!("{bk}.width_m"), b.width_m, Low::Excl(0.0), 100.0);
        let height_m = c.num(&format!("{bk}.height_m"), b.height_m, Low::Excl(0.0), h);
        if let Some(prev) = berms.last().map(|b: &Berm| b.height_m)
            && height_m >= prev
        {
            c.bad(&format!("{bk}.height_m"), format!("= {height_m} must be lower than the berm inside it ({prev} m)"));
        }
        let from_key = format!("{bk}.placed_from_height_m");
        let placed_from_height_m = c.opt(&from_key, b.placed_from_height_m, 0.0, Low::Incl(0.0), h);
        if placed_from_height_m + height_m > h + 1e-9 {
            c.bad(
                &from_key,
                format!(
                    "= {placed_from_height_m}: a berm raised from a {placed_from_height_m} m crest is complete only at {} m, above the design height ({h} m); allowed: 0 ≤ placed_from_height_m ≤ design_height_m − height_m = {}",
                    placed_from_height_m + height_m,
                    h - height_m
                ),
            );
        }
        berms.push(Berm { width_m, height_m, placed_from_height_m });
    }
    berms
}

/// With full-footprint stages the surcharge is placed within the design
/// side slopes carried on upwards, so it needs a crest of its own.
fn surcharge_top(c: &mut Check, e: &Embankment) {
    let top = e.crest_width_m - 2.0 * e.side_slope_h_per_v * e.surcharge_height_m;
    if e.stage_shape == StageShape::FullFootprint && e.surcharge_height_m > 0.0 && top <= 0.0 {
        c.bad(
            "embankment.surcharge_height_m",
            format!(
                "= {}: with stage_shape = \"full-footprint\" the surcharge is placed within the design side slopes carried on upwards, and its top would be {top:.2} m wide; allowed: surcharge_height_m < crest_width_m / (2 × side_slope_h_per_v) = {:.2} m, or stage_shape = \"constant-crest\"",
                e.surcharge_height_m,
                e.crest_width_m / (2.0 * e.side_slope_h_per_v)
            ),
        );
    }
}
