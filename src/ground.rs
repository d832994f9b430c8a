//! The ground before loading and the constitutive rules every engine shares:
//! the depth grid, initial stresses (σv0, u0 with steady seepage between
//! piezometric levels, σ'v0, σ'p0), one-dimensional
//! compressibility from Cr/Cc (e–log σ'), and undrained strength by SHANSEP
//! (Ladd & Foott 1974; Ladd 1991) or a gain ratio, never below measured su0.
//!
//! Where a clay has both a measured su0 profile and SHANSEP parameters, the
//! measured profile is data and anchors the initial state (common practice):
//! su(t) = max(su_measured, SHANSEP(σ'v(t), σ'p(t)) − offset) with
//! offset = max(0, SHANSEP0 − su_measured) per node, SHANSEP0 being SHANSEP
//! at the node's initial σ'v0 and σ'p0. Where SHANSEP0 ≤ su_measured this is
//! the plain max of the two; where SHANSEP0 exceeds the measured value the
//! initial strength is the measured one and the gain with effective stress
//! is SHANSEP's. The gain-ratio model already starts from the measured su0.

use crate::model::*;
use serde::Serialize;

/// ln(10), for converting Cc/Cr (per log10 cycle) to tangent moduli.
const LN10: f64 = std::f64::consts::LN_10;

/// Least σ'v0 a node takes, kPa: the surface node's σ'v0 is 0 exactly.
pub const SURFACE_FLOOR_KPA: f64 = 0.1;

/// Properties a clay node needs, copied from its layer.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct ClayProps {
    pub e0: f64,
    pub cc: f64,
    pub cr: f64,
    pub c_alpha: f64,
    pub cv_m2_per_day: f64,
    pub ch_m2_per_day: f64,
    pub model: StrengthModel,
}

/// One node of the depth grid with its initial state.
#[derive(Debug, Clone, Serialize)]
pub struct Node {
    /// Depth below OGL, m.
    pub z_m: f64,
    /// Index of the layer the node belongs to (the one below an interface).
    pub layer: usize,
    /// Total vertical stress, kPa.
    pub sigma_v0_kpa: f64,
    /// Initial pore pressure (`u0`), kPa.
    pub u0_kpa: f64,
    /// Initial vertical effective stress, kPa.
    pub sigma_v0_eff_kpa: f64,
    /// Initial preconsolidation pressure, kPa (≥ σ'v0).
    pub sigma_p0_kpa: f64,
    /// Measured in-situ strength at this depth, kPa (0 where not measured).
    pub su_measured_kpa: f64,
    /// SHANSEP at the initial state less the measured strength, where
    /// positive and a profile is measured (else 0), kPa: subtracted from
    /// SHANSEP so that the measured su0 anchors the initial state.
    pub su_offset_kpa: f64,
    /// Initial undrained strength, kPa (0 in sand).
    pub su0_kpa: f64,
    /// Clay properties, None in sand.
    pub clay: Option<ClayProps>,
}

/// Total vertical stress at depth z below OGL, kPa (bulk weight above the
/// water table, saturated below; common practice).
pub fn sigma_v0(ground: &Ground, z_m: f64) -> f64 {
    let dw = ground.groundwater_depth_m;
    let mut top = 0.0;
    let mut sum = 0.0;
    for l in &ground.layers {
        let bottom = if matches!(l.kind, LayerKind::StiffBase) { f64::INFINITY } else { top + l.thickness_m };
        let lo = top.min(z_m);
        let hi = bottom.min(z_m);
        let dry = (hi.min(dw) - lo).max(0.0);
        let wet = (hi - lo.max(dw)).max(0.0);
        sum += dry * l.unit_weight_kn_m3 + wet * l.saturated_unit_weight_kn_m3;
        if z_m <= bottom {
            break;
        }
        top = bottom;
    }
    sum
}

/// Initial (steady) pore pressure at depth z below OGL, kPa:
/// u0 = γw × (h(z) + z) from the piezometric head h of `head_m`, and 0
/// where the head lies below the point (above the water table, suction
/// neglected: common practice).
pub fn u0(ground: &Ground, z_m: f64) -> f64 {
    GAMMA_W * (head_m(ground, z_m) + z_m).max(0.0)
}

/// Initial piezometric head at depth z, as an elevation above OGL, m
/// (−groundwater depth where the water is hydrostatic). The one rule every
/// engine uses for the initial pore pressure (σ'v0, σ'p, su0, the
/// consolidation start, piezometer baselines, sand in stability):
/// - a sand layer: its `piezometric_level_m` where given, else the water
///   table (an `ru` is a stability-only idealisation of the pore pressure
///   at failure (Bishop & Morgenstern 1960), not an initial state, so an
///   `ru` sand is hydrostatic here);
/// - a stack of contiguous clay layers: steady vertical seepage between
///   its drained boundaries with the head linear in depth (Darcy flow
///   through a uniform permeability; common practice). The upper boundary
///   is the sand above with a piezometric level at the stack's top, else
///   the water table (at the stack's top, or at its own depth where it lies
///   inside the stack; above it u0 = 0). The lower boundary is the sand
///   below at the stack's base; on a drained base the water table's head;
///   on an undrained base no flow, so the head of the upper boundary
///   throughout.
pub fn head_m(ground: &Ground, z_m: f64) -> f64 {
    let layers = &ground.layers;
    let water = -ground.groundwater_depth_m;
    let sand_head = |l: &Layer| match l.pore {
        PoreWater::Level { elevation_m } => elevation_m,
        PoreWater::Hydrostatic | PoreWater::Ratio { .. } => water,
    };
    let is_clay = |i: usize| matches!(layers[i].kind, LayerKind::Clay(_));
    let mut i = layer_index(ground, z_m);
    // The base of a clay stack resting on the stiff base is still clay.
    if !is_clay(i) && i > 0 && is_clay(i - 1) && (z_m - layer_top(ground, i)).abs() < 1e-9 {
        i -= 1;
    }
    if !is_clay(i) {
        return if matches!(layers[i].kind, LayerKind::StiffBase) { water } else { sand_head(&layers[i]) };
    }
    let first = (0..=i).rev().take_while(|&k| is_clay(k)).last().unwrap_or(i);
    let last = (i..layers.len()).take_while(|&k| is_clay(k)).last().unwrap_or(i);
    let (z_top, z_bot) = (layer_top(ground, first), layer_top(ground, last) + layers[last].thickness_m);
    let (z_a, h_a) = match first.checked_sub(1).map(|k| &layers[k]) {
        Some(l @ Layer { kind: LayerKind::Sand { .. }, pore: PoreWater::Level { .. }, .. }) => (z_top, sand_head(l)),
        _ if -water > z_top && -water < z_bot => (-water, water),
        _ => (z_top, water),
    };
    let h_b = match layers.get(last + 1) {
        Some(l) if matches!(l.kind, LayerKind::Sand { .. }) => sand_head(l),
        _ if ground.base_drained => water,
        _ => h_a,
    };
    if z_m <= z_a { h_a } else { h_a + (h_b - h_a) * (z_m - z_a) / (z_bot - z_a) }
}

/// Where the initial effective stress σ'v0 = σv0 − u0 is not positive
/// below the ground surface (the ground would heave: uplift), the first
/// such depth z m with (σ'v0, σv0, u0) kPa. σ'v0 is piecewise linear in
/// depth between layer boundaries, the water table and the seepage
/// boundaries, so it is checked there, at mid-layer and just below the
/// surface.
pub fn uplift(ground: &Ground) -> Option<(f64, f64, f64, f64)> {
    let mut zs = vec![1e-3, ground.groundwater_depth_m];
    let mut top = 0.0;
    for l in ground.layers.iter().filter(|l| !matches!(l.kind, LayerKind::StiffBase)) {
        zs.extend([top + 1e-9, top + 0.5 * l.thickness_m, top + l.thickness_m]);
        top += l.thickness_m;
    }
    zs.sort_by(f64::total_cmp);
    zs.into_iter().filter(|&z| z > 0.0 && z <= top).find_map(|z| {
        let (sv, u) = (sigma_v0(ground, z), u0(ground, z));
        (sv - u <= 0.0).then_some((z, sv - u, sv, u))
    })
}

/// Index of the layer containing depth z (the lower one at an interface).
pub fn layer_index(ground: &Ground, z_m: f64) -> usize {
    let mut top = 0.0;
    for (i, l) in ground.layers.iter().enumerate() {
        if matches!(l.kind, LayerKind::StiffBase) || z_m < top + l.thickness_m - 1e-9 {
            return i;
        }
        top += l.thickness_m;
    }
    ground.layers.len() - 1
}

/// Depth of the top of layer `i` below OGL, m.
pub fn layer_top(ground: &Ground, i: usize) -> f64 {
    ground.layers[..i].iter().map(|l| l.thickness_m).sum()
}

/// Measured su0 at depth z from a layer's points (linear, constant beyond).
pub fn su_measured(points: &[(f64, f64)], z_m: f64) -> f64 {
    match points {
        [] => 0.0,
        [only] => only.1,
        _ => {
            if z_m <= points[0].0 {
                return points[0].1;
            }
            for w in points.windows(2) {
                if z_m <= w[1].0 {
                    let f = (z_m - w[0].0) / (w[1].0 - w[0].0);
                    return w[0].1 + f * (w[1].1 - w[0].1);
                }
            }
            points[points.len() - 1].1
        }
    }
}

/// SHANSEP undrained strength su = S σ'v (σ'p/σ'v)^m, kPa (Ladd 1991).
pub fn shansep(s: f64, m: f64, sigma_v_eff: f64, sigma_p: f64) -> f64 {
    let ocr = (sigma_p / sigma_v_eff).max(1.0);
    s * sigma_v_eff * ocr.powf(m)
}

/// Undrained strength at a node for the current σ'v and σ'p (kPa): SHANSEP
/// less the node's `su_offset_kpa`, or the gain ratio, never below the
/// measured su0 (the rule of the module doc).
pub fn su_now(node: &Node, sigma_v_eff: f64, sigma_p: f64) -> f64 {
    let Some(clay) = node.clay else { return 0.0 };
    let base = match clay.model {
        StrengthModel::Shansep { s, m } => shansep(s, m, sigma_v_eff.max(1e-3), sigma_p) - node.su_offset_kpa,
        StrengthModel::GainRatio { ratio } => {
            node.su_measured_kpa + ratio * (sigma_v_eff - node.sigma_v0_eff_kpa).max(0.0)
        }
    };
    base.max(node.su_measured_kpa)
}

/// Vertical strain from the stress history of a node (e–log σ' law):
/// recompression with Cr up to σ'p0, virgin compression with Cc beyond, and
/// swelling with Cr from the largest stress σ'max back to σ'.
pub fn strain(clay: &ClayProps, s0: f64, sp0: f64, smax: f64, s: f64) -> f64 {
    strain_log10(clay, s0.log10(), sp0.log10(), smax.log10(), s.max(1e-3).log10())
}

/// `strain` from the base-10 logarithms of σ'v0, σ'p0, σ'max and σ' (σ'
/// at least 1e-3 kPa): the consolidation column keeps the constant ones, so
/// that each evaluation costs at most two logarithms.
pub fn strain_log10(clay: &ClayProps, l_s0: f64, l_sp0: f64, l_smax: f64, l_s: f64) -> f64 {
    LogLaw::of(clay).strain_log10(l_s0, l_sp0, l_smax, l_s)
}

/// The constants of the e–log σ' law that a strain needs (Cr, Cc, 1 + e0),
/// copied out of a clay's properties for the consolidation column's
/// storage pass.
#[derive(Debug, Clone, Copy)]
pub struct LogLaw {
    pub cr: f64,
    pub cc: f64,
    pub one_plus_e0: f64,
}

impl LogLaw {
    /// Incompressible ground (sand, or no element at all): every strain 0.
    pub const RIGID: LogLaw = LogLaw { cr: 0.0, cc: 0.0, one_plus_e0: 1.0 };

    pub fn of(clay: &ClayProps) -> LogLaw {
        LogLaw { cr: clay.cr, cc: clay.cc, one_plus_e0: 1.0 + clay.e0 }
    }

    /// `strain_log10` of a clay with these constants.
    pub fn strain_log10(&self, l_s0: f64, l_sp0: f64, l_smax: f64, l_s: f64) -> f64 {
        let recompression = self.cr * (l_smax.min(l_sp0) - l_s0).max(0.0);
        let virgin = self.cc * (l_smax - l_sp0).max(0.0);
        let swell = self.cr * (l_smax - l_s);
        (recompression + virgin - swell) / self.one_plus_e0
    }
}

/// Tangent coefficient of volume compressibility mv = dε/dσ', 1/kPa.
pub fn mv_tangent(clay: &ClayProps, s: f64, sp: f64) -> f64 {
    let index = if s >= sp { clay.cc } else { clay.cr };
    index / (LN10 * (1.0 + clay.e0) * s.max(1.0))
}

/// mv on the virgin line at σ', 1/kPa (the reference for permeability).
pub fn mv_virgin(clay: &ClayProps, s: f64) -> f64 {
    clay.cc / (LN10 * (1.0 + clay.e0) * s.max(1.0))
}

/// Build the depth grid: every layer interface is a node; clay layers get
/// spacing ≤ `max_dz` and at least 8 intervals; sand layers 2 intervals.
pub fn grid(project: &Project) -> Vec<Node> {
    let g = &project.ground;
    let mut zs = vec![0.0];
    let mut top = 0.0;
    for l in g.layers.iter().filter(|l| !matches!(l.kind, LayerKind::StiffBase)) {
        let n = match l.kind {
            LayerKind::Clay(_) => ((l.thickness_m / project.analysis.max_node_spacing_m).ceil() as usize).max(8),
            _ => 2,
        };
        for j in 1..=n {
            zs.push(top + l.thickness_m * j as f64 / n as f64);
        }
        top += l.thickness_m;
    }
    zs.into_iter().map(|z| node_at(project, z)).collect()
}

/// Initial state of the ground at depth z.
/// An interface node belongs to the layer below it, except that the top of
/// a sand layer (or the base) under clay belongs to the clay above, so that
/// the clay's strength and preconsolidation reach its drained boundary.
pub fn node_at(project: &Project, z_m: f64) -> Node {
    let g = &project.ground;
    let depth = project.profile_depth_m();
    let mut li = layer_index(g, z_m.min(depth - 1e-6).max(0.0));
    let at_top = li > 0 && (z_m - layer_top(g, li)).abs() < 1e-9;
    if at_top && !matches!(g.layers[li].kind, LayerKind::Clay(_)) && matches!(g.layers[li - 1].kind, LayerKind::Clay(_))
    {
        li -= 1;
    }
    node_at_layer(project, z_m, li)
}

/// Initial state at depth z taking the properties of layer `li` (used for
/// the two sides of a layer interface).
pub fn node_at_layer(project: &Project, z_m: f64, li: usize) -> Node {
    let g = &project.ground;
    let layer = &g.layers[li];
    let sv = sigma_v0(g, z_m);
    let u = u0(g, z_m);
    // σ'v0 is 0 at the ground surface and the e–log σ' law needs a positive
    // stress: a numerical floor of SURFACE_FLOOR_KPA (reached only in the
    // top centimetres; σ'v0 ≤ 0 below the surface is refused at input by
    // `uplift`).
    let se = (sv - u).max(SURFACE_FLOOR_KPA);
    let (clay, sp, su_m, measured) = match &layer.kind {
        LayerKind::Clay(c) => {
            let sp = match c.preconsolidation {
                Preconsolidation::Ocr(o) => o * se,
                Preconsolidation::PopKpa(p) => se + p,
                Preconsolidation::SigmaPKpa(p) => p,
            }
            .max(se);
            let props = ClayProps {
                e0: c.e0,
                cc: c.cc,
                cr: c.cr,
                c_alpha: c.c_alpha,
                cv_m2_per_day: c.cv_m2_per_day,
                ch_m2_per_day: c.ch_m2_per_day,
                model: c.strength.model,
            };
            (Some(props), sp, su_measured(&c.strength.su0_points, z_m), !c.strength.su0_points.is_empty())
        }
        _ => (None, se, 0.0, false),
    };
    let mut node = Node {
        z_m,
        layer: li,
        sigma_v0_kpa: sv,
        u0_kpa: u,
        sigma_v0_eff_kpa: se,
        sigma_p0_kpa: sp,
        su_measured_kpa: su_m,
        su_offset_kpa: 0.0,
        su0_kpa: 0.0,
        clay,
    };
    // With no offset su_now is max(SHANSEP0, su_measured) (su_measured for
    // the gain ratio): the excess over the measured value is the offset.
    if measured {
        node.su_offset_kpa = su_now(&node, se, sp) - su_m;
    }
    node.su0_kpa = su_now(&node, se, sp);
    node
}

/// One row of the layer table of `fillpace check`.
#[derive(Debug, Clone, Serialize)]
pub struct LayerRow {
    pub name: String,
    /// "clay", "sand" or "stiff-base".
    pub kind: &'static str,
    pub top_m: f64,
    pub thickness_m: f64,
    pub unit_weight_kn_m3: f64,
    pub saturated_unit_weight_kn_m3: f64,
    /// Cc/(1+e0), clay only.
    pub compression_ratio: Option<f64>,
    /// cv and ch, m²/year, clay only.
    pub cv_m2_per_year: Option<f64>,
    pub ch_m2_per_year: Option<f64>,
}

/// The initial ground model: layers and a sampled depth profile.
#[derive(Debug, Clone, Serialize)]
pub struct Summary {
    pub groundwater_depth_m: f64,
    pub base_drained: bool,
    pub layers: Vec<LayerRow>,
    /// Initial state sampled every `step` m and at layer mid-depths.
    pub profile: Vec<Node>,
}

/// Build the initial ground model summary, profile sampled every `step_m`.
pub fn summary(project: &Project, step_m: f64) -> Summary {
    let g = &project.ground;
    let mut layers = Vec::new();
    let mut top = 0.0;
    for l in &g.layers {
        let (kind, ratio, cv, ch) = match &l.kind {
            LayerKind::Clay(c) => (
                "clay",
                Some(c.cc / (1.0 + c.e0)),
                Some(c.cv_m2_per_day * DAYS_PER_YEAR),
                Some(c.ch_m2_per_day * DAYS_PER_YEAR),
            ),
            LayerKind::Sand { .. } => ("sand", None, None, None),
            LayerKind::StiffBase => ("stiff-base", None, None, None),
        };
        layers.push(LayerRow {
            name: l.name.clone(),
            kind,
            top_m: top,
            thickness_m: l.thickness_m,
            unit_weight_kn_m3: l.unit_weight_kn_m3,
            saturated_unit_weight_kn_m3: l.saturated_unit_weight_kn_m3,
            compression_ratio: ratio,
            cv_m2_per_year: cv,
            ch_m2_per_year: ch,
        });
        top += l.thickness_m;
    }
    let depth = project.profile_depth_m();
    let n = (depth / step_m).ceil() as usize;
    let profile = (0..=n).map(|k| node_at(project, (k as f64 * step_m).min(depth))).collect();
    Summary { groundwater_depth_m: g.groundwater_depth_m, base_drained: g.base_drained, layers, profile }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn two_layer_ground() -> Ground {
        let clay = Clay {
            e0: 1.5,
            cc: 0.5,
            cr: 0.05,
            c_alpha: 0.0,
            preconsolidation: Preconsolidation::Ocr(1.0),
            cv_m2_per_day: 0.01,
            ch_m2_per_day: 0.01,
            strength: Strength { model: StrengthModel::Shansep { s: 0.22, m: 0.8 }, su0_points: vec![] },
        };
        Ground {
            groundwater_depth_m: 1.0,
            base_drained: true,
            layers: vec![
                Layer {
                    name: "crust".into(),
                    thickness_m: 2.0,
                    unit_weight_kn_m3: 17.0,
                    saturated_unit_weight_kn_m3: 18.0,
                    kind: LayerKind::Clay(clay.clone()),
                    pore: PoreWater::Hydrostatic,
                },
                Layer {
                    name: "soft".into(),
                    thickness_m: 10.0,
                    unit_weight_kn_m3: 15.0,
                    saturated_unit_weight_kn_m3: 16.0,
                    kind: LayerKind::Clay(clay),
                    pore: PoreWater::Hydrostatic,
                },
            ],
        }
    }

    #[test]
    fn effective_stress_by_hand() {
        // Common practice arithmetic: water table 1 m down; crust 17 kN/m³
        // above it and 18 below; soft clay 16 saturated. At z = 5 m:
        // σv = 1×17 + 1×18 + 3×16 = 83 kPa; u0 = 9.81×4 = 39.24 kPa;
        // σ'v = 43.76 kPa.
        let g = two_layer_ground();
        assert!((sigma_v0(&g, 5.0) - 83.0).abs() < 1e-9);
        assert!((u0(&g, 5.0) - 39.24).abs() < 1e-9);
        assert!((sigma_v0(&g, 5.0) - u0(&g, 5.0) - 43.76).abs() < 1e-9);
        // Above the water table: σv = 0.5 × 17.
        assert!((sigma_v0(&g, 0.5) - 8.5).abs() < 1e-9);
    }

    /// 6 m of clay (16 kN/m³, OCR 1.5, SHANSEP 0.22/0.8) on 2 m of sand
    /// whose piezometric level is `level` (None: hydrostatic), water table
    /// `dw` m down, on a stiff base.
    fn clay_on_sand(level: Option<f64>, dw: f64) -> Project {
        let level = level.map_or(String::new(), |h| format!("piezometric_level_m = {h}\n"));
        crate::fixtures::project(&format!(
            "[ground]\ngroundwater_depth_m = {dw}\n[[ground.layers]]\nname = \"clay\"\nkind = \"clay\"\nthickness_m = 6.0\nunit_weight_kn_m3 = 16.0\ne0 = 1.5\ncc = 0.6\ncr = 0.06\nocr = 1.5\ncv_m2_per_year = 1.0\n[[ground.layers]]\nname = \"sand\"\nkind = \"sand\"\nthickness_m = 2.0\nunit_weight_kn_m3 = 19.0\n{level}[[ground.layers]]\nname = \"base\"\nkind = \"stiff-base\"\nunit_weight_kn_m3 = 21.0\n"
        ))
    }

    #[test]
    fn artesian_sand_lowers_the_clay_effective_stress_and_strength() {
        // Hand calculation (steady vertical seepage, head linear in depth
        // across the clay: common practice). Water table at OGL (head 0 at
        // the top of the clay), sand level 2 m above OGL (head +2 m at the
        // clay's base, z = 6 m). At mid-depth z = 3 m: head = 0 + 2 × 3/6 =
        // 1 m; u0 = 9.81 × (1 + 3) = 39.24 kPa; σv0 = 16 × 3 = 48 kPa;
        // σ'v0 = 8.76 kPa; σ'p = 1.5 × 8.76 = 13.14 kPa; SHANSEP (Ladd
        // 1991) su0 = 0.22 × 8.76 × 1.5^0.8 = 2.666 kPa. Hydrostatic would
        // give u0 = 29.43, σ'v0 = 18.57 kPa and su0 = 5.651 kPa: more than
        // twice as strong (the defect this replaces).
        let p = clay_on_sand(Some(2.0), 0.0);
        assert!((head_m(&p.ground, 3.0) - 1.0).abs() < 1e-12);
        let n = node_at(&p, 3.0);
        assert!((n.u0_kpa - 39.24).abs() < 1e-9, "u0 {}", n.u0_kpa);
        assert!((n.sigma_v0_eff_kpa - 8.76).abs() < 1e-9, "σ'v0 {}", n.sigma_v0_eff_kpa);
        assert!((n.sigma_p0_kpa - 13.14).abs() < 1e-9, "σ'p {}", n.sigma_p0_kpa);
        assert!((n.su0_kpa - 2.6656).abs() < 1e-3, "su0 {}", n.su0_kpa);
        let hydro = node_at(&clay_on_sand(None, 0.0), 3.0);
        assert!((hydro.su0_kpa - 5.6508).abs() < 1e-3, "hydrostatic su0 {}", hydro.su0_kpa);
        // The same u0 reaches the consolidation engine's initial state and
        // the strength field the stability section reads.
        let engine = crate::response::Engine::new(&p);
        let field = engine.field(&engine.initial_state());
        assert!((field.sample(0.0, 3.0) - n.su0_kpa).abs() < 1e-6, "field {}", field.sample(0.0, 3.0));
        // In the sand the head is the level: u0 = 9.81 × (2 + 7) at 7 m.
        assert!((u0(&p.ground, 7.0) - 88.29).abs() < 1e-9);
        // Water table 1 m down, inside the clay: the seepage runs from the
        // water table (head −1 m at z = 1 m) to the sand (+2 m at 6 m), so
        // at z = 3.5 m the head is −1 + 3 × 2.5/5 = 0.5 m and u0 =
        // 9.81 × 4 = 39.24 kPa; above the water table u0 = 0.
        let p = clay_on_sand(Some(2.0), 1.0);
        assert!((u0(&p.ground, 3.5) - 39.24).abs() < 1e-9);
        assert_eq!(u0(&p.ground, 0.5), 0.0);
    }

    #[test]
    fn an_undrained_base_carries_the_upper_head_through_the_clay() {
        // Hand arithmetic: a 2 m sand at the surface with its level 0.5 m
        // below OGL (water table 1 m down) over 10 m of clay. On an
        // undrained base there is no flow, so the head is −0.5 m throughout
        // and at z = 7 m u0 = 9.81 × 6.5 = 63.765 kPa; on a drained base the
        // head runs linearly from −0.5 m (z = 2) to −1 m (z = 12): −0.75 m
        // at z = 7, u0 = 9.81 × 6.25 = 61.3125 kPa.
        let mut g = two_layer_ground();
        g.layers[0].kind = LayerKind::Sand { friction_deg: 32.0, cohesion_kpa: 0.0 };
        g.layers[0].pore = PoreWater::Level { elevation_m: -0.5 };
        assert!((u0(&g, 7.0) - 61.3125).abs() < 1e-9, "{}", u0(&g, 7.0));
        g.base_drained = false;
        assert!((u0(&g, 7.0) - 63.765).abs() < 1e-9, "{}", u0(&g, 7.0));
        assert!(uplift(&g).is_none());
    }

    #[test]
    fn shansep_ladd_typical_values() {
        // Ladd (1991) typical S = 0.22, m = 0.8: σ'v = 50, σ'p = 100 kPa →
        // su = 0.22 × 50 × 2^0.8 = 19.15 kPa.
        let su = shansep(0.22, 0.8, 50.0, 100.0);
        assert!((su - 19.15).abs() < 0.05, "su = {su}");
    }

    #[test]
    fn measured_su0_anchors_the_initial_state_and_shansep_adds_the_gain() {
        // Hand calculation, the reviewer's case (tests/data): at z = 9 m
        // σ'v0 = 9 × (17.2 − 9.81) = 66.51 kPa, σ'p0 = 81.51 (POP 15);
        // SHANSEP0 = 0.25 × 66.51 × (81.51/66.51)^0.8 = 19.565 kPa (Ladd
        // 1991); measured su0 = 5 + 4 × 0.9 = 8.6 kPa; offset = 10.965 kPa;
        // su0 = 8.6 (the old max rule gave 19.565). Loaded to σ'v = σ'p =
        // 100 kPa: su = 0.25 × 100 − 10.965 = 14.035 kPa (the old rule 25).
        let text = include_str!("../tests/data/measured-below-shansep.toml");
        let p = crate::input::parse(text, "measured-below-shansep.toml").unwrap();
        let n = node_at(&p, 9.0);
        assert!((n.sigma_v0_eff_kpa - 66.51).abs() < 1e-9, "σ'v0 {}", n.sigma_v0_eff_kpa);
        assert!((n.su_measured_kpa - 8.6).abs() < 1e-9);
        assert!((n.su_offset_kpa - 10.965).abs() < 1e-3, "offset {}", n.su_offset_kpa);
        assert!((n.su0_kpa - 8.6).abs() < 1e-9, "su0 {}", n.su0_kpa);
        assert!((su_now(&n, 100.0, 100.0) - 14.035).abs() < 1e-3, "{}", su_now(&n, 100.0, 100.0));
        // No measured profile: no offset, SHANSEP alone (19.565 kPa).
        let bare = text.replace("su0_top_kpa = 5\nsu0_bottom_kpa = 9\n", "");
        let b = node_at(&crate::input::parse(&bare, "bare").unwrap(), 9.0);
        assert_eq!(b.su_offset_kpa, 0.0);
        assert!((b.su0_kpa - 19.565).abs() < 1e-3, "su0 {}", b.su0_kpa);
    }

    #[test]
    fn settlement_of_overconsolidated_layer_loaded_past_sigma_p() {
        // S = H/(1+e0) [Cr log(σ'p/σ'0) + Cc log(σ'f/σ'p)] with H = 4 m,
        // e0 = 1.2, Cc = 0.6, Cr = 0.06, σ'0 = 40, σ'p = 60, Δσ = 60 kPa
        // (textbook e–log σ' rule) gives 0.261 m.
        let clay = ClayProps {
            e0: 1.2,
            cc: 0.6,
            cr: 0.06,
            c_alpha: 0.0,
            cv_m2_per_day: 0.0,
            ch_m2_per_day: 0.0,
            model: StrengthModel::GainRatio { ratio: 0.0 },
        };
        let s = 4.0 * strain(&clay, 40.0, 60.0, 100.0, 100.0);
        assert!((s - 0.261).abs() < 0.261 * 0.005, "s = {s}");
    }

    #[test]
    fn strain_swells_back_with_cr() {
        let clay = ClayProps {
            e0: 1.0,
            cc: 0.5,
            cr: 0.05,
            c_alpha: 0.0,
            cv_m2_per_day: 0.0,
            ch_m2_per_day: 0.0,
            model: StrengthModel::GainRatio { ratio: 0.0 },
        };
        let loaded = strain(&clay, 50.0, 50.0, 100.0, 100.0);
        let unloaded = strain(&clay, 50.0, 50.0, 100.0, 50.0);
        assert!((loaded - unloaded - 0.05 * 2f64.log10() / 2.0).abs() < 1e-12);
    }

    #[test]
    fn measured_profile_interpolates() {
        let pts = [(1.0, 10.0), (5.0, 20.0)];
        assert_eq!(su_measured(&pts, 0.0), 10.0);
        assert!((su_measured(&pts, 3.0) - 15.0).abs() < 1e-12);
        assert_eq!(su_measured(&pts, 9.0), 20.0);
    }

    #[test]
    fn clay_strength_reaches_a_drained_sand_interface() {
        // Regression: the node on top of a sand layer under clay belonged to
        // the sand and had su = 0, a false weak seam at the clay's base.
        let p = crate::fixtures::project(
            "[ground]\ngroundwater_depth_m = 0.0\n[[ground.layers]]\nname = \"clay\"\nkind = \"clay\"\nthickness_m = 5.0\nunit_weight_kn_m3 = 16.0\ne0 = 1.5\ncc = 0.6\ncr = 0.06\ncv_m2_per_year = 1.0\n[[ground.layers]]\nname = \"sand\"\nkind = \"sand\"\nthickness_m = 2.0\nunit_weight_kn_m3 = 19.0\n",
        );
        let n = node_at(&p, 5.0);
        assert!(n.clay.is_some());
        // SHANSEP, NC: su = 0.22 σ'v0 = 0.22 × 5 × (16 − 9.81)
        assert!((n.su0_kpa - 0.22 * 5.0 * (16.0 - GAMMA_W)).abs() < 1e-9);
        assert!(node_at(&p, 6.0).clay.is_none());
    }
}
