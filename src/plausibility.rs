//! Plausibility warnings: values that are legal but almost certainly a unit
//! slip or a typo (warnings, never errors; printed with the other warnings
//! by check, plan, assess and stability). Each threshold says where it
//! comes from:
//!
//! * cv and ch outside 0.1–100 m²/year, the range of natural clays and silts
//!   (common practice; field values of soft clays are mostly 0.5–20
//!   m²/year): the warning names the units the number would fit;
//! * su0/σ'v0 outside 0.1–1.0 at depths where the clay is lightly
//!   overconsolidated (OCR ≤ 2.5, σ'v0 ≥ 5 kPa): normally consolidated clays
//!   have su/σ'v0 ≈ 0.2–0.3 (Mesri 1975: su/σ'p ≈ 0.22; Ladd 1991, from
//!   memory), rising as S·OCR^m; the band is common practice for soft clay;
//! * SHANSEP at the initial state above the measured su0 by more than 10%
//!   (our stated choice, about the scatter of a measured profile): the
//!   measured value is used as the initial strength (`ground` module doc),
//!   and the warning names the layer, depth and both values so that the
//!   engineer can reconcile S, m, σ'p and the profile;
//! * a piezometric level above the hydrostatic head that leaves the ground
//!   less than 1.1 times the weight needed against uplift (σv0/u0 < 1.1 at
//!   some depth; the input refuses σ'v0 ≤ 0): hydraulic heave checks
//!   commonly ask for a margin of about 1.1 on the total weight (from
//!   memory, of the partial factors for uplift in limit-state codes);
//! * vertical strain above 25% in any sublayer under the centreline: beyond
//!   it the small-strain e–log σ' settlement loses accuracy and a
//!   finite-strain analysis is advised (common practice).

use crate::ground;
use crate::model::{DAYS_PER_YEAR, LayerKind, Project};
use crate::response::{Engine, State};

/// Range of cv and ch of natural clays, m²/year (common practice).
pub const CV_RANGE_M2_PER_YEAR: (f64, f64) = (0.1, 100.0);
/// Usual band of su0/σ'v0 for lightly overconsolidated soft clay.
pub const SU_RATIO_BAND: (f64, f64) = (0.1, 1.0);
/// Largest OCR at which the su0/σ'v0 band is applied.
const SU_RATIO_MAX_OCR: f64 = 2.5;
/// Smallest σ'v0 at which the ratio is judged, kPa.
const SU_RATIO_MIN_STRESS_KPA: f64 = 5.0;
/// Relative excess of SHANSEP0 over the measured su0 above which a warning
/// is given (stated choice).
pub const SHANSEP_EXCESS: f64 = 0.10;
/// σv0/u0 below which an artesian pore pressure is warned of as a near
/// uplift (from memory; see the module doc).
pub const UPLIFT_MARGIN: f64 = 1.1;
/// Vertical strain above which a warning is given.
pub const STRAIN_LIMIT: f64 = 0.25;

/// Units a coefficient of consolidation might have been typed in, with the
/// factor to m²/year.
const CV_UNITS: [(&str, f64); 6] = [
    ("m²/s", DAYS_PER_YEAR * 86400.0),
    ("cm²/s", DAYS_PER_YEAR * 8.64),
    ("m²/day", DAYS_PER_YEAR),
    ("m²/month", 12.0),
    ("cm²/year", 1e-4),
    ("ft²/year", 0.092_903),
];

/// Undrained strengths typed in other units, with the factor to kPa.
const SU_UNITS: [(&str, f64); 3] = [("psf", 0.047_880), ("t/m²", 9.806_65), ("MPa", 1000.0)];

/// Warnings on the input values alone.
pub fn input_warnings(p: &Project) -> Vec<String> {
    let mut out = Vec::new();
    for (i, l) in p.ground.layers.iter().enumerate() {
        if let LayerKind::Clay(c) = &l.kind {
            let key = format!("ground.layers[{i}]");
            out.extend(coefficient(&format!("{key}.cv_m2_per_year"), c.cv_m2_per_day * DAYS_PER_YEAR));
            out.extend(coefficient(
                &format!("{key}.ch (cv × ch/cv or ch_m2_per_year)"),
                c.ch_m2_per_day * DAYS_PER_YEAR,
            ));
        }
    }
    out.extend(strength_ratio(p));
    out.extend(shansep_above_measured(p));
    out.extend(near_uplift(p));
    out.extend(fill_as_load(p));
    out
}

/// A warning at the depth where an initial pore pressure above hydrostatic
/// (a piezometric level) leaves the smallest σv0/u0, when that is below
/// `UPLIFT_MARGIN`.
fn near_uplift(p: &Project) -> Option<String> {
    let g = &p.ground;
    // Above hydrostatic: the initial head stands above the water table's.
    ground::grid(p)
        .into_iter()
        .filter(|n| n.z_m > 0.0 && ground::head_m(g, n.z_m) > -g.groundwater_depth_m + 1e-9)
        .map(|n| (n.sigma_v0_kpa / n.u0_kpa, n))
        .min_by(|a, b| a.0.total_cmp(&b.0))
        .filter(|(f, _)| *f < UPLIFT_MARGIN)
        .map(|(f, n)| {
            format!(
                "ground.layers[{}] ({}): the piezometric level leaves σv0/u0 = {f:.2} at {:.2} m depth (σv0 {:.1} kPa, u0 {:.1} kPa; warning below {UPLIFT_MARGIN:.1}): the ground is near uplift; check the level and the weight of the ground above it by hand before relying on the strengths",
                n.layer,
                g.layers[n.layer].name,
                n.z_m,
                n.sigma_v0_kpa,
                n.u0_kpa
            )
        })
}

/// A fill with no strength is taken as a vertical load with no lateral
/// thrust; on circles through the fill that idealisation can give a higher
/// FS than the fill's own strength (found in review), so every search also
/// runs with the fill's strength and keeps the lower (`stability::fill_load`).
fn fill_as_load(p: &Project) -> Option<String> {
    (p.stability.fill_strength_factor <= 0.0).then(|| {
        "stability.fill_strength_factor = 0: the fill is taken as a vertical load with no lateral thrust, which can overstate the FS of circles through the fill; every FS reported is the lower of that and the fill at its own strength".to_string()
    })
}

/// A warning when a coefficient (m²/year) is outside the range of clays.
fn coefficient(key: &str, v: f64) -> Option<String> {
    let (lo, hi) = CV_RANGE_M2_PER_YEAR;
    if (lo..=hi).contains(&v) {
        return None;
    }
    let fits: Vec<String> = CV_UNITS
        .iter()
        .filter(|(_, f)| (lo..=hi).contains(&(v * f)))
        .map(|(u, f)| format!("{u} ({:.3} m²/year)", v * f))
        .collect();
    let hint = if fits.is_empty() { String::new() } else { format!("; as typed it would fit {}", fits.join(" or ")) };
    Some(format!(
        "{key} = {v:.4} m²/year is outside {lo}–{hi} m²/year, the range of natural clays (common practice){hint}; check the units"
    ))
}

/// Warnings where the measured su0 is far from the usual su0/σ'v0 band of
/// soft clay: the first depth of each layer.
fn strength_ratio(p: &Project) -> Vec<String> {
    let (lo, hi) = SU_RATIO_BAND;
    let mut out = Vec::new();
    let mut warned: Vec<usize> = Vec::new();
    for n in ground::grid(p) {
        let s = n.sigma_v0_eff_kpa;
        if n.clay.is_none() || n.su_measured_kpa <= 0.0 || s < SU_RATIO_MIN_STRESS_KPA || warned.contains(&n.layer) {
            continue;
        }
        let ratio = n.su_measured_kpa / s;
        if n.sigma_p0_kpa / s > SU_RATIO_MAX_OCR || (lo..=hi).contains(&ratio) {
            continue;
        }
        warned.push(n.layer);
        let fits: Vec<&str> =
            SU_UNITS.iter().filter(|(_, f)| (lo..=hi).contains(&(ratio * f))).map(|(u, _)| *u).collect();
        let hint =
            if fits.is_empty() { String::new() } else { format!("; as typed it would fit {}", fits.join(" or ")) };
        out.push(format!(
            "ground.layers[{}] ({}): su0/σ'v0 = {ratio:.2} at {:.2} m depth (su0 {:.1} kPa, σ'v0 {s:.1} kPa) is outside {lo}–{hi}, the usual band for soft clay (common practice; su/σ'v0 ≈ 0.22 when normally consolidated, Mesri 1975){hint}; check su0",
            n.layer, p.ground.layers[n.layer].name, n.z_m, n.su_measured_kpa
        ));
    }
    out
}

/// Warnings where SHANSEP at the initial state exceeds the measured su0 by
/// more than `SHANSEP_EXCESS`: one per layer, at its largest relative excess.
fn shansep_above_measured(p: &Project) -> Vec<String> {
    let mut worst: Vec<(usize, f64, f64, f64)> = Vec::new();
    for n in ground::grid(p) {
        if n.su_offset_kpa <= SHANSEP_EXCESS * n.su_measured_kpa {
            continue;
        }
        let excess = n.su_offset_kpa / n.su_measured_kpa;
        match worst.iter_mut().find(|w| w.0 == n.layer) {
            Some(w) if excess > w.3 => *w = (n.layer, n.z_m, n.su_measured_kpa, excess),
            Some(_) => {}
            None => worst.push((n.layer, n.z_m, n.su_measured_kpa, excess)),
        }
    }
    worst
        .into_iter()
        .map(|(li, z, su_m, excess)| {
            format!(
                "ground.layers[{li}] ({}): SHANSEP gives su0 {:.1} kPa at {z:.2} m depth, {:.0}% above the measured {su_m:.1} kPa (warning above {:.0}%); the measured value is used as the initial strength and SHANSEP only for the gain with effective stress; check S, m and σ'p against the profile",
                p.ground.layers[li].name,
                su_m * (1.0 + excess),
                100.0 * excess,
                100.0 * SHANSEP_EXCESS
            )
        })
        .collect()
}

/// A warning when the vertical strain in some sublayer under the centreline
/// exceeds `STRAIN_LIMIT` once placed fill `placed_m` (the centreline
/// settled by `settlement_m`) has fully consolidated from state `st`;
/// `what` names the load for the message.
pub fn strain_warning(engine: &Engine, st: &State, placed_m: f64, settlement_m: f64, what: &str) -> Option<String> {
    let col = &engine.columns[0];
    let cs = engine.drained_centre(st, placed_m, settlement_m);
    let mut worst = (0.0f64, 0.0);
    for (e, el) in col.elements.iter().enumerate() {
        let Some(c) = el.clay else { continue };
        for end in 0..2 {
            let i = e + end;
            let (s0, se) = (col.nodes[i].sigma_v0_eff_kpa, col.sigma_eff(&cs, i));
            let eps = match col.mode {
                crate::model::ConsolidationMode::Linear => el.mv_lin * (se - s0),
                crate::model::ConsolidationMode::StressDependent => {
                    ground::strain(&c, s0, el.sp0[end], cs.smax[i].max(se), se)
                }
            };
            if eps > worst.0 {
                worst = (eps, col.nodes[i].z_m);
            }
        }
    }
    (worst.0 > STRAIN_LIMIT).then(|| {
        format!(
            "vertical strain {:.0}% at {:.2} m depth under the centreline once {what} has consolidated, above {:.0}%: small-strain settlement theory loses accuracy there (common practice: use a finite-strain analysis), and a value this large may come from a slip in Cc, e0 or σ'p",
            100.0 * worst.0,
            worst.1,
            100.0 * STRAIN_LIMIT
        )
    })
}

/// Input warnings and the strain under the highest fill (design height plus
/// surcharge, no make-up) consolidated from the initial state: for commands
/// that run no timetable (check, stability).
pub fn design_warnings(engine: &Engine) -> Vec<String> {
    let p = engine.project;
    let mut out = input_warnings(p);
    out.extend(strain_warning(engine, &engine.initial_state(), p.max_height_m(), 0.0, "the highest fill"));
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cv_typed_in_m2_per_day_is_named() {
        // 0.0041 m²/day is 1.5 m²/year: typed into cv_m2_per_year it is
        // below the range, and m²/day (and m²/month) are named as fits.
        let w = coefficient("k", 0.0041).unwrap();
        assert!(w.contains("m²/day (1.498 m²/year)"), "{w}");
        // 4.8e-8 m²/s is 1.5 m²/year.
        assert!(coefficient("k", 4.8e-8).unwrap().contains("m²/s (1.515 m²/year)"));
        assert_eq!(coefficient("k", 1.5), None);
    }

    #[test]
    fn demo_input_is_plausible_and_a_psf_strength_is_not() {
        let p = crate::input::parse(crate::app::DEMO, "demo").unwrap();
        assert!(input_warnings(&p).is_empty(), "{:?}", input_warnings(&p));
        // su0 typed in psf (14 kPa ≈ 292 psf; the bottom kept under the 500 limit): ratio ≈ 12 at 2 m, psf named.
        let text = crate::app::DEMO
            .replace("su0_top_kpa = 14", "su0_top_kpa = 292")
            .replace("su0_bottom_kpa = 26", "su0_bottom_kpa = 480");
        let q = crate::input::parse(&text, "demo").unwrap();
        let w = strength_ratio(&q);
        assert_eq!(w.len(), 1, "{w:?}");
        assert!(w[0].contains("ground.layers[1]") && w[0].contains("psf"), "{w:?}");
    }

    #[test]
    fn an_artesian_level_near_uplift_is_named() {
        // Hand calculation on the low demo section with its sand's level at
        // +3.0 m (found in review): at the sand's top, 5.0 m down, σv0 =
        // 17.5 × 1.0 + 18.0 × 0.5 + 15.8 × 3.5 = 81.8 kPa and u0 = 9.81 ×
        // (5.0 + 3.0) = 78.5 kPa: σv0/u0 = 1.04 < 1.1. The file as issued
        // (hydrostatic) gives no warning.
        let text = crate::app::DEMO_LOW.replacen("kind = \"sand\"", "kind = \"sand\"\npiezometric_level_m = 3.0", 1);
        let w = near_uplift(&crate::input::parse(&text, "t").unwrap()).expect("a warning");
        assert!(w.contains("σv0/u0 = 1.04 at 5.00 m") && w.contains("σv0 81.8 kPa, u0 78.5 kPa"), "{w}");
        assert!(near_uplift(&crate::input::parse(crate::app::DEMO_LOW, "t").unwrap()).is_none());
    }

    #[test]
    fn shansep_far_above_the_measured_su0_is_named() {
        // Hand calculation (tests/data/measured-below-shansep.toml): the
        // relative excess (SHANSEP0 − su0)/su0 grows with depth and is
        // largest at the clay's base, z = 10 m: σ'v0 = 10 × 7.39 = 73.9,
        // σ'p0 = 88.9 kPa, SHANSEP0 = 0.25 × 73.9 × (88.9/73.9)^0.8 =
        // 21.42 kPa (Ladd 1991) against the measured 9.0 kPa: 138% above.
        let text = include_str!("../tests/data/measured-below-shansep.toml");
        let w = shansep_above_measured(&crate::input::parse(text, "t").unwrap());
        assert_eq!(w.len(), 1, "{w:?}");
        assert!(w[0].contains("ground.layers[0] (soft clay)") && w[0].contains("21.4 kPa at 10.00 m"), "{w:?}");
        assert!(w[0].contains("138% above the measured 9.0 kPa") && w[0].contains("measured value is used"), "{w:?}");
        // The demo's SHANSEP0 exceeds its measured su0 only by about 4% at
        // 14 m (27.1 against 26.0 kPa, the brief's figures): no warning.
        let demo = crate::input::parse(crate::app::DEMO, "demo").unwrap();
        assert!(shansep_above_measured(&demo).is_empty());
    }

    #[test]
    fn large_strain_is_flagged() {
        // A very compressible clay (Cc/(1+e0) = 0.8) under 7.5 m of fill:
        // ε ≈ 0.8·log10((σ'v0 + 150)/σ'p0) exceeds 25% (hand estimate).
        let text = crate::app::DEMO.replace("cc = 0.75", "cc = 2.3");
        let p = crate::input::parse(&text, "demo").unwrap();
        let engine = Engine::new(&p);
        assert!(design_warnings(&engine).iter().any(|w| w.contains("vertical strain")));
        let demo = crate::input::parse(crate::app::DEMO, "demo").unwrap();
        assert!(design_warnings(&Engine::new(&demo)).is_empty());
    }
}
