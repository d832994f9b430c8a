//! Embankment geometry and the stresses it induces in the ground. The fill
//! surface is a symmetric piecewise-linear profile (crest, side slopes, berms);
//! the stress increments at (x, z) are the 2-D elastic (plane strain)
//! solutions for uniform and linearly varying strip loads (Poulos & Davis
//! 1974, from Flamant's line load integrated over the strip), summed over
//! the profile's linear pieces.

use crate::model::{Embankment, StageShape};
use serde::Serialize;
use std::f64::consts::PI;

/// Stress increments at a point, kPa (compression positive).
#[derive(Debug, Clone, Copy, Default, PartialEq, Serialize)]
pub struct Stress {
    pub sz: f64,
    pub sx: f64,
    pub txz: f64,
}

impl Stress {
    fn add(self, o: Stress, f: f64) -> Stress {
        Stress { sz: self.sz + f * o.sz, sx: self.sx + f * o.sx, txz: self.txz + f * o.txz }
    }

    /// Major and minor principal increments (σ1, σ3), kPa.
    pub fn principal(&self) -> (f64, f64) {
        let mid = 0.5 * (self.sz + self.sx);
        let r = (0.25 * (self.sz - self.sx).powi(2) + self.txz.powi(2)).sqrt();
        (mid + r, mid - r)
    }
}

/// The ray from (x, z) to a surface point ξ: its angle θ from the vertical,
/// θ = atan2(x − ξ, z), with sin θ = (x − ξ)/r and cos θ = z/r, r the
/// ray's length, the quantities the strip solutions take at each end of a
/// strip. A profile's adjacent pieces share their vertex's ray, so
/// `stress` takes one `atan2` and one square root per vertex instead of
/// an `atan2` and a `sin_cos` per strip and end.
#[derive(Debug, Clone, Copy)]
struct Ray {
    t: f64,
    sin: f64,
    cos: f64,
}

impl Ray {
    /// The ray to ξ = `a` from (x, z), z > 0.
    fn new(a: f64, x: f64, z: f64) -> Ray {
        let dx = x - a;
        let r = (dx * dx + z * z).sqrt();
        Ray { t: dx.atan2(z), sin: dx / r, cos: z / r }
    }
}

/// The angular terms of a uniform strip between the rays to its ends a and
/// b, shared by every uniform pressure on that strip: α = θa − θb and the
/// sines and cosine of α and θa + θb, these by the angle-sum formulas from
/// the rays' sines and cosines (no further trigonometric calls).
#[derive(Debug, Clone, Copy)]
struct Strip {
    al: f64,
    sin_al: f64,
    sin_sum: f64,
    cos_sum: f64,
}

impl Strip {
    fn new(ra: Ray, rb: Ray) -> Strip {
        Strip {
            al: ra.t - rb.t,
            sin_al: ra.sin * rb.cos - ra.cos * rb.sin,
            sin_sum: ra.sin * rb.cos + ra.cos * rb.sin,
            cos_sum: ra.cos * rb.cos - ra.sin * rb.sin,
        }
    }

    /// The stress of a uniform pressure q on the strip (`uniform_strip`).
    fn uniform(&self, q: f64) -> Stress {
        let Strip { al, sin_al, sin_sum: s, cos_sum: c } = *self;
        Stress { sz: q / PI * (al + sin_al * c), sx: q / PI * (al - sin_al * c), txz: q / PI * sin_al * s }
    }
}

/// Uniform strip pressure q on a ≤ ξ ≤ b (Poulos & Davis 1974, eq. 2.x):
/// σz = q/π [α + sin α cos(θa+θb)], σx = q/π [α − sin α cos(θa+θb)],
/// τxz = q/π sin α sin(θa+θb), α = θa − θb.
pub fn uniform_strip(q: f64, a: f64, b: f64, x: f64, z: f64) -> Stress {
    let z = z.max(1e-6);
    Strip::new(Ray::new(a, x, z), Ray::new(b, x, z)).uniform(q)
}

/// Pressure rising linearly from 0 at ξ = a to q at ξ = b (a < b): Flamant's
/// line load integrated in closed form in terms of the angles θ to the ends.
pub fn rising_strip(q: f64, a: f64, b: f64, x: f64, z: f64) -> Stress {
    let z = z.max(1e-6);
    rising(q, a, b, x, z, Ray::new(a, x, z), Ray::new(b, x, z))
}

/// `rising_strip` at depth z (> 0) with the rays to a and b given.
fn rising(q: f64, a: f64, b: f64, x: f64, z: f64, ra: Ray, rb: Ray) -> Stress {
    let w = b - a;
    let xa = x - a;
    let fz = |r: Ray| xa * (r.t + r.sin * r.cos) - z * r.sin.powi(2);
    let fx = |r: Ray| xa * (r.t - r.sin * r.cos) + 2.0 * z * r.cos.ln() - z * r.cos.powi(2);
    let ft = |r: Ray| xa * r.sin.powi(2) - z * (r.t - r.sin * r.cos);
    let k = q / (PI * w);
    Stress { sz: k * (fz(ra) - fz(rb)), sx: k * (fx(ra) - fx(rb)), txz: k * (ft(ra) - ft(rb)) }
}

/// Stress under a piece of profile from (x0, p0) to (x1, p1), pressures
/// kPa, given with the rays r0 and r1 to its ends, at (x, z), z > 0.
fn piece((x0, p0, r0): (f64, f64, Ray), (x1, p1, r1): (f64, f64, Ray), x: f64, z: f64) -> Stress {
    if x1 - x0 < 1e-9 {
        return Stress::default();
    }
    let strip = Strip::new(r0, r1);
    let base = strip.uniform(p0.min(p1));
    let d = p1 - p0;
    if d.abs() < 1e-12 {
        base
    } else if d > 0.0 {
        base.add(rising(d, x0, x1, x, z, r0, r1), 1.0)
    } else {
        // falling ramp = uniform |d| minus the rising ramp of |d|
        base.add(strip.uniform(-d), 1.0).add(rising(-d, x0, x1, x, z, r0, r1), -1.0)
    }
}

/// Stress at (x, z) from a symmetric profile given by its right-half vertices
/// (x ≥ 0, first at x = 0, last at height 0), heights m, unit weight kN/m³:
/// the sum over the profile's pieces and their mirror images of the uniform
/// and rising strip solutions, each vertex's rays taken once.
pub fn stress(profile: &[(f64, f64)], unit_weight: f64, x: f64, z: f64) -> Stress {
    let mut s = Stress::default();
    let Some(&(first, _)) = profile.first() else { return s };
    let z = z.max(1e-6);
    // Rays to the vertex at x0 and to its mirror image at −x0.
    let (mut r0, mut l0) = (Ray::new(first, x, z), Ray::new(-first, x, z));
    for w in profile.windows(2) {
        let (x0, h0) = w[0];
        let (x1, h1) = w[1];
        let (r1, l1) = (Ray::new(x1, x, z), Ray::new(-x1, x, z));
        let (p0, p1) = (unit_weight * h0, unit_weight * h1);
        s = s.add(piece((x0, p0, r0), (x1, p1, r1), x, z), 1.0);
        // mirrored piece on the left: from (−x1, p1) to (−x0, p0)
        s = s.add(piece((-x1, p1, l1), (-x0, p0, l0), x, z), 1.0);
        (r0, l0) = (r1, l1);
    }
    s
}

/// Right-half surface profile of fill of thickness `t_m` placed on OGL:
/// vertices (x, height) from the centreline to the outer toe, shaped as
/// `e.stage_shape` says. Berms are laid out on the final design section
/// (each starts where the slope above it meets its height); each stands
/// r = min(t − its `placed_from_height_m`, its height) high, and the profile
/// is the maximum of the main body and the berm platforms, so it grows
/// continuously with t.
///
/// With `ConstantCrest` the main body is a platform of height t out to the
/// design crest edge and a berm a platform of height r out to its design
/// outer edge, their slopes moving outwards as they rise. With
/// `FullFootprint` every part is its final design shape (the main side
/// slopes carried on upwards above design height) cut off by a horizontal
/// plane: the main body at t, a berm at r, so the toes stay at the final
/// toes and each layer is as wide as the final section at its level.
pub fn profile(e: &Embankment, t_m: f64) -> Vec<(f64, f64)> {
    let n = e.side_slope_h_per_v;
    let shapes = shapes(e, t_m);
    let height = |x: f64| shapes.iter().map(|&(hp, edge)| (hp - (x - edge).max(0.0) / n).max(0.0)).fold(0.0, f64::max);
    let toe = shapes.iter().map(|&(hp, edge)| edge + n * hp).fold(0.0, f64::max);
    // Vertices: every platform edge and foot, and every point where one
    // shape's slope meets another's platform.
    let mut xs: Vec<f64> = shapes.iter().flat_map(|&(hp, edge)| [edge, edge + n * hp]).chain([0.0, toe]).collect();
    for &(ha, ea) in &shapes {
        for &(hb, _) in &shapes {
            if ha > hb {
                xs.push(ea + n * (ha - hb));
            }
        }
    }
    xs.sort_by(f64::total_cmp);
    xs.dedup_by(|a, b| (*a - *b).abs() < 1e-9);
    xs.retain(|x| *x <= toe + 1e-9);
    let pts: Vec<(f64, f64)> = xs.iter().map(|&x| (x, height(x))).collect();
    // drop collinear interior points
    let mut out: Vec<(f64, f64)> = Vec::with_capacity(pts.len());
    for p in pts {
        while out.len() >= 2 {
            let (a, b) = (out[out.len() - 2], out[out.len() - 1]);
            let cross = (b.0 - a.0) * (p.1 - a.1) - (b.1 - a.1) * (p.0 - a.0);
            if cross.abs() < 1e-9 {
                out.pop();
            } else {
                break;
            }
        }
        out.push(p);
    }
    out
}

/// The platforms whose maximum is the profile at thickness t: (platform
/// height m, outer edge of the platform m), main body first; berms not yet
/// started are left out (a platform of no height would put a fill surface
/// of no thickness over the settlement trough).
fn shapes(e: &Embankment, t_m: f64) -> Vec<(f64, f64)> {
    let n = e.side_slope_h_per_v;
    let b = 0.5 * e.crest_width_m;
    let main = match e.stage_shape {
        StageShape::ConstantCrest => (t_m, b),
        StageShape::FullFootprint => {
            // The final slope has height t at b + n (H − t); above the
            // apex of the slopes carried upwards (H + b/n) nothing is left.
            let apex = e.design_height_m + b / n;
            (t_m.min(apex), (b + n * (e.design_height_m - t_m)).max(0.0))
        }
    };
    let mut shapes = vec![main];
    let (mut x, mut h) = (b, e.design_height_m);
    for berm in &e.berms {
        x += n * (h - berm.height_m).max(0.0) + berm.width_m;
        h = berm.height_m;
        let raised = (t_m - berm.placed_from_height_m).clamp(0.0, berm.height_m);
        if raised > 0.0 {
            // A full-footprint layer reaches the berm's final outer slope.
            let edge = match e.stage_shape {
                StageShape::ConstantCrest => x,
                StageShape::FullFootprint => x + n * (berm.height_m - raised),
            };
            shapes.push((raised, edge));
        }
    }
    shapes
}

/// Height of a profile at offset x (symmetric), m.
pub fn height_at(profile: &[(f64, f64)], x: f64) -> f64 {
    let x = x.abs();
    for w in profile.windows(2) {
        if x <= w[1].0 {
            let span = w[1].0 - w[0].0;
            if span <= 0.0 {
                return w[1].1;
            }
            return w[0].1 + (x - w[0].0) / span * (w[1].1 - w[0].1);
        }
    }
    0.0
}

/// Cross-section area of a profile (both halves), m² per metre run.
pub fn area(profile: &[(f64, f64)]) -> f64 {
    2.0 * profile.windows(2).map(|w| 0.5 * (w[0].1 + w[1].1) * (w[1].0 - w[0].0)).sum::<f64>()
}

/// Fill cross-section areas per metre run (both halves), m²: the stage
/// profile above OGL split at the design height into design fill and
/// surcharge, and the settlement make-up, the fill below OGL in the
/// settlement trough (down to the settled ground under the profile, and
/// under its side slopes carried on below OGL beyond the toe, as the
/// stability section has it).
#[derive(Debug, Clone, Copy, Default, PartialEq, Serialize)]
pub struct FillAreas {
    pub design_m2: f64,
    pub makeup_m2: f64,
    pub surcharge_m2: f64,
}

impl FillAreas {
    /// All the fill, m² per metre run.
    pub fn total_m2(&self) -> f64 {
        self.design_m2 + self.makeup_m2 + self.surcharge_m2
    }
}

/// Trapezoids over the settlement trough in `fill_areas`.
const TROUGH_STEPS: usize = 800;

/// Fill areas of the section with the crest at `height_m` above OGL where
/// the ground surface has settled by `settlement(x)` m at offset x.
pub fn fill_areas(e: &Embankment, height_m: f64, settlement: &dyn Fn(f64) -> f64) -> FillAreas {
    if height_m <= 0.0 {
        return FillAreas::default();
    }
    let prof = profile(e, height_m);
    let design_m2 = area(&profile(e, height_m.min(e.design_height_m)));
    let surcharge_m2 = (area(&prof) - design_m2).max(0.0);
    let toe = prof.last().map_or(0.0, |p| p.0);
    let n = e.side_slope_h_per_v;
    let under = |x: f64| (settlement(x) - ((x - toe) / n).max(0.0)).max(0.0);
    let deepest = (0..=TROUGH_STEPS).map(|k| settlement(toe * k as f64 / TROUGH_STEPS as f64)).fold(0.0, f64::max);
    let end = toe + n * deepest;
    let dx = end / TROUGH_STEPS as f64;
    let inner: f64 = (1..TROUGH_STEPS).map(|k| under(k as f64 * dx)).sum();
    let makeup_m2 = 2.0 * dx * (inner + 0.5 * (under(0.0) + under(end)));
    FillAreas { design_m2, makeup_m2, surcharge_m2 }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn uniform_strip_under_centre_at_depth_b() {
        // Poulos & Davis (1974) strip-load table: x = 0, z = b (half-width):
        // σz/q = 0.818, σx/q = 0.182.
        let s = uniform_strip(1.0, -1.0, 1.0, 0.0, 1.0);
        assert!((s.sz - 0.818).abs() < 0.0005, "{s:?}");
        assert!((s.sx - 0.182).abs() < 0.0005, "{s:?}");
        assert!(s.txz.abs() < 1e-12);
    }

    #[test]
    fn osterberg_embankment_factor() {
        // Computed from Osterberg's (1957) formula (the closed form behind
        // his chart, not a chart reading): I = [((a + b)/a)(α1 + α2) −
        // (b/a)α2]/π with a/z = b/z = 1, α2 = atan 1, α1 = atan 2 − atan 1:
        // I = (2·1.10715 − 0.78540)/π = 0.4548 for one half of the
        // embankment (crest half-width b, slope width a) at its centreline.
        // The symmetric profile's stress there is twice that.
        let z = 1.0;
        let s = 0.5 * stress(&[(0.0, 1.0), (1.0, 1.0), (2.0, 0.0)], 1.0, 0.0, z).sz;
        assert!((s - 0.455).abs() < 0.002, "I = {s}");
    }

    /// CONSISTENCY check of `stress` (each vertex's ray taken once, its sine
    /// and cosine from its length, the angle sums by the angle-sum
    /// formulas) against the plain sum written
    /// here of Poulos & Davis's (1974) uniform strip, with sin and cos of
    /// α and θa + θb from the library, and `rising_strip`, over every piece
    /// and its mirror image (the strips themselves are checked against
    /// published values and Flamant above), on a profile with crest,
    /// slopes, a berm and a surcharge, at points under and beyond it, at
    /// the surface and under a vertex. They differ by round-off: bound
    /// 1e-11 kPa under fill of at most 7 m × 19 kN/m³ = 133 kPa.
    #[test]
    fn stress_matches_the_plain_sum_of_strips() {
        let uniform = |q: f64, a: f64, b: f64, x: f64, z: f64| {
            let z = z.max(1e-6);
            let (ta, tb) = ((x - a).atan2(z), (x - b).atan2(z));
            let al = ta - tb;
            let (s, c) = ((ta + tb).sin(), (ta + tb).cos());
            Stress { sz: q / PI * (al + al.sin() * c), sx: q / PI * (al - al.sin() * c), txz: q / PI * al.sin() * s }
        };
        let plain = |profile: &[(f64, f64)], g: f64, x: f64, z: f64| {
            let mut s = Stress::default();
            for w in profile.windows(2) {
                for ((x0, h0), (x1, h1)) in [(w[0], w[1]), ((-w[1].0, w[1].1), (-w[0].0, w[0].1))] {
                    let (p0, p1) = (g * h0, g * h1);
                    if x1 - x0 < 1e-9 {
                        continue;
                    }
                    let mut piece = uniform(p0.min(p1), x0, x1, x, z);
                    let d = p1 - p0;
                    if d.abs() >= 1e-12 {
                        if d > 0.0 {
                            piece = piece.add(rising_strip(d, x0, x1, x, z), 1.0);
                        } else {
                            piece = piece.add(uniform(-d, x0, x1, x, z), 1.0).add(rising_strip(-d, x0, x1, x, z), -1.0);
                        }
                    }
                    s = s.add(piece, 1.0);
                }
            }
            s
        };
        let e = demo_like(StageShape::FullFootprint, 0.0);
        for t in [0.5, 2.5, 6.0, 7.0] {
            let prof = profile(&e, t);
            for x in [0.0, 3.3, 10.0, 18.0, 26.0, 40.0] {
                for z in [0.0, 0.25, 1.7, 6.0, 15.0] {
                    let (a, b) = (stress(&prof, 19.0, x, z), plain(&prof, 19.0, x, z));
                    for (u, v) in [(a.sz, b.sz), (a.sx, b.sx), (a.txz, b.txz)] {
                        assert!((u - v).abs() < 1e-11, "t {t} x {x} z {z}: {a:?} vs {b:?}");
                    }
                }
            }
        }
    }

    #[test]
    fn wide_load_gives_full_pressure() {
        // Under the middle of a very wide load the vertical increment tends
        // to q (one-dimensional loading; common practice limit).
        let p = [(0.0, 1.0), (500.0, 1.0), (502.0, 0.0)];
        let s = stress(&p, 20.0, 0.0, 5.0);
        assert!((s.sz - 20.0).abs() < 0.05, "{s:?}");
    }

    #[test]
    fn ramp_matches_numerical_integration_of_flamant() {
        // Independent check: integrate Flamant's line load (σz = 2P z³/(π r⁴))
        // over a rising ramp by Simpson's rule.
        let (a, b, q, x, z) = (-1.0, 3.0, 10.0, 0.7, 2.3);
        let n = 2000;
        let h = (b - a) / n as f64;
        let f = |xi: f64| {
            let p = q * (xi - a) / (b - a);
            let dx = x - xi;
            let r2 = dx * dx + z * z;
            2.0 * p * z.powi(3) / (PI * r2 * r2)
        };
        let mut sum = f(a) + f(b);
        for i in 1..n {
            sum += f(a + i as f64 * h) * if i % 2 == 1 { 4.0 } else { 2.0 };
        }
        let numeric = sum * h / 3.0;
        let closed = rising_strip(q, a, b, x, z).sz;
        assert!((numeric - closed).abs() < 1e-6, "{numeric} vs {closed}");
    }

    #[test]
    fn profile_with_berm_and_area() {
        let e = Embankment {
            design_height_m: 6.0,
            crest_width_m: 20.0,
            side_slope_h_per_v: 2.0,
            fill_unit_weight_kn_m3: 20.0,
            fill_cohesion_kpa: 0.0,
            fill_friction_deg: 30.0,
            surcharge_height_m: 0.0,
            berms: vec![crate::model::Berm { width_m: 5.0, height_m: 2.0, placed_from_height_m: 0.0 }],
            reinforcement_kn_per_m: 0.0,
            stage_shape: StageShape::ConstantCrest,
        };
        let p = profile(&e, 6.0);
        assert_eq!(p, vec![(0.0, 6.0), (10.0, 6.0), (18.0, 2.0), (23.0, 2.0), (27.0, 0.0)]);
        assert!((height_at(&p, -20.0) - 2.0).abs() < 1e-12);
        // area: 2 × (60 + 32 + 10 + 4) = 212
        assert!((area(&p) - 212.0).abs() < 1e-9);
        // Below berm height the fill is one platform out to the berm edge.
        let low = profile(&e, 1.0);
        assert_eq!(low, vec![(0.0, 1.0), (23.0, 1.0), (25.0, 0.0)]);
        // Just above it, the berm is there at full height: no jump.
        let a = area(&profile(&e, 2.0 - 1e-6));
        let b = area(&profile(&e, 2.0 + 1e-6));
        assert!((a - b).abs() < 1e-3, "{a} vs {b}");
    }

    fn demo_like(shape: StageShape, berm_from: f64) -> Embankment {
        Embankment {
            design_height_m: 6.0,
            crest_width_m: 20.0,
            side_slope_h_per_v: 2.0,
            fill_unit_weight_kn_m3: 20.0,
            fill_cohesion_kpa: 0.0,
            fill_friction_deg: 30.0,
            surcharge_height_m: 1.0,
            berms: vec![crate::model::Berm { width_m: 5.0, height_m: 2.0, placed_from_height_m: berm_from }],
            reinforcement_kn_per_m: 0.0,
            stage_shape: shape,
        }
    }

    #[test]
    fn full_footprint_stages_are_horizontal_cuts_of_the_final_section() {
        // Issue 14, found item 1: on site each lift is a horizontal layer
        // over the final footprint, so the stage profile at thickness t is
        // min(t, final section) (the definition, checked point by point),
        // the toe stays at the final toe and the crest is wider.
        let e = demo_like(StageShape::FullFootprint, 0.0);
        let last = profile(&e, 6.0);
        assert_eq!(last, vec![(0.0, 6.0), (10.0, 6.0), (18.0, 2.0), (23.0, 2.0), (27.0, 0.0)]);
        for k in 1..24 {
            let t = 0.25 * k as f64;
            let p = profile(&e, t);
            assert!((p.last().unwrap().0 - 27.0).abs() < 1e-9, "toe at t = {t}: {p:?}");
            for j in 0..=300 {
                let x = 0.1 * j as f64;
                let want = t.min(height_at(&last, x));
                assert!((height_at(&p, x) - want).abs() < 1e-9, "t {t} x {x}: {} vs {want}", height_at(&p, x));
            }
        }
        // Hand values: at 4 m the crest platform reaches x = 14 m (design
        // crest edge 10 m + 2 × (6 − 4)); area 2 × (56 + 12 + 10 + 4) m².
        let p = profile(&e, 4.0);
        assert_eq!(p, vec![(0.0, 4.0), (14.0, 4.0), (18.0, 2.0), (23.0, 2.0), (27.0, 0.0)]);
        assert!((area(&p) - 164.0).abs() < 1e-9);
        // Above design height (surcharge) the side slopes carry on upwards:
        // the 1 m surcharge top is 2 × (10 − 2) = 16 m wide.
        assert_eq!(profile(&e, 7.0), vec![(0.0, 7.0), (8.0, 7.0), (18.0, 2.0), (23.0, 2.0), (27.0, 0.0)]);
    }

    #[test]
    fn berm_raised_from_a_given_crest_height() {
        // A berm with placed_from_height_m = 3 is absent below a 3 m crest
        // and then rises with the fill (hand values on the section above).
        let e = demo_like(StageShape::FullFootprint, 3.0);
        assert_eq!(profile(&e, 1.0), vec![(0.0, 1.0), (20.0, 1.0), (22.0, 0.0)]);
        assert_eq!(profile(&e, 4.0), vec![(0.0, 4.0), (14.0, 4.0), (20.0, 1.0), (25.0, 1.0), (27.0, 0.0)]);
        assert_eq!(profile(&e, 6.0), profile(&demo_like(StageShape::FullFootprint, 0.0), 6.0));
        let c = demo_like(StageShape::ConstantCrest, 3.0);
        assert_eq!(profile(&c, 1.0), vec![(0.0, 1.0), (10.0, 1.0), (12.0, 0.0)]);
    }

    #[test]
    fn fill_areas_split_and_trough() {
        // Uniform settlement s = 0.3 m: the trough under the 27 m half-base
        // plus the triangle under the slope carried on below OGL,
        // 2 × (27 × 0.3 + ½ × 2 × 0.3²) = 16.38 m² (hand calculation).
        let e = demo_like(StageShape::FullFootprint, 0.0);
        let a = fill_areas(&e, 7.0, &|_| 0.3);
        assert!((a.makeup_m2 - 16.38).abs() < 1e-3, "{a:?}");
        assert!((a.design_m2 - area(&profile(&e, 6.0))).abs() < 1e-9);
        // Surcharge: the 1 m band from 16 m to 20 m wide, 18 m² (hand).
        assert!((a.surcharge_m2 - 18.0).abs() < 1e-9, "{a:?}");
        assert_eq!(fill_areas(&e, 0.0, &|_| 0.3), FillAreas::default());
    }
}
