//! Embankment geometry and the stresses it induces in the ground. The fill
//! surface is a symmetric piecewise-linear profile (crest, side slopes, berms);
//! the stress increments at (x, z) are the 2-D elastic (plane strain)
//! solutions for uniform and linearly varying strip loads (Poulos & Davis
//! 1974, from Flamant's line load integrated over the strip), summed over
//! the profile's linear pieces.

use crate::model::Embankment;
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

/// Angles from the vertical through (x, z) to the surface points a and b.
fn angles(a: f64, b: f64, x: f64, z: f64) -> (f64, f64) {
    ((x - a).atan2(z), (x - b).atan2(z))
}

/// Uniform strip pressure q on a ≤ ξ ≤ b (Poulos & Davis 1974, eq. 2.x):
/// σz = q/π [α + sin α cos(θa+θb)], σx = q/π [α − sin α cos(θa+θb)],
/// τxz = q/π sin α sin(θa+θb), α = θa − θb.
pub fn uniform_strip(q: f64, a: f64, b: f64, x: f64, z: f64) -> Stress {
    let z = z.max(1e-6);
    let (ta, tb) = angles(a, b, x, z);
    let al = ta - tb;
    let (s, c) = ((ta + tb).sin(), (ta + tb).cos());
    Stress { sz: q / PI * (al + al.sin() * c), sx: q / PI * (al - al.sin() * c), txz: q / PI * al.sin() * s }
}

/// Pressure rising linearly from 0 at ξ = a to q at ξ = b (a < b): Flamant's
/// line load integrated in closed form in terms of the angles θ to the ends.
pub fn rising_strip(q: f64, a: f64, b: f64, x: f64, z: f64) -> Stress {
    let z = z.max(1e-6);
    let w = b - a;
    let (ta, tb) = angles(a, b, x, z);
    let xa = x - a;
    let fz = |t: f64| xa * (t + t.sin() * t.cos()) - z * t.sin().powi(2);
    let fx = |t: f64| xa * (t - t.sin() * t.cos()) + 2.0 * z * t.cos().ln() - z * t.cos().powi(2);
    let ft = |t: f64| xa * t.sin().powi(2) - z * (t - t.sin() * t.cos());
    let k = q / (PI * w);
    Stress { sz: k * (fz(ta) - fz(tb)), sx: k * (fx(ta) - fx(tb)), txz: k * (ft(ta) - ft(tb)) }
}

/// Stress under a piece of profile from (x0, p0) to (x1, p1), pressures kPa.
fn piece(x0: f64, p0: f64, x1: f64, p1: f64, x: f64, z: f64) -> Stress {
    if x1 - x0 < 1e-9 {
        return Stress::default();
    }
    let base = uniform_strip(p0.min(p1), x0, x1, x, z);
    let d = p1 - p0;
    if d.abs() < 1e-12 {
        base
    } else if d > 0.0 {
        base.add(rising_strip(d, x0, x1, x, z), 1.0)
    } else {
        // falling ramp = uniform |d| minus the rising ramp of |d|
        base.add(uniform_strip(-d, x0, x1, x, z), 1.0).add(rising_strip(-d, x0, x1, x, z), -1.0)
    }
}

/// Stress at (x, z) from a symmetric profile given by its right-half vertices
/// (x ≥ 0, first at x = 0, last at height 0), heights m, unit weight kN/m³.
pub fn stress(profile: &[(f64, f64)], unit_weight: f64, x: f64, z: f64) -> Stress {
    let mut s = Stress::default();
    for w in profile.windows(2) {
        let (x0, h0) = w[0];
        let (x1, h1) = w[1];
        let (p0, p1) = (unit_weight * h0, unit_weight * h1);
        s = s.add(piece(x0, p0, x1, p1, x, z), 1.0);
        // mirrored piece on the left: from (−x1, p1) to (−x0, p0)
        s = s.add(piece(-x1, p1, -x0, p0, x, z), 1.0);
    }
    s
}

/// Right-half surface profile of fill of thickness `t_m` placed on OGL:
/// vertices (x, height) from the centreline to the outer toe. Berms are laid
/// out on the final design section (each starts where the slope above it
/// meets its height) and are raised with the fill: at thickness t a berm is
/// a platform of height min(t, its height) out to its outer edge, so the
/// profile, the maximum of the main trapezoid and the berm platforms, grows
/// continuously with t.
pub fn profile(e: &Embankment, t_m: f64) -> Vec<(f64, f64)> {
    let n = e.side_slope_h_per_v;
    let b = 0.5 * e.crest_width_m;
    // Each shape: (platform height, outer edge of the platform).
    let mut shapes = vec![(t_m, b)];
    let (mut x, mut h) = (b, e.design_height_m);
    for berm in &e.berms {
        x += n * (h - berm.height_m).max(0.0) + berm.width_m;
        h = berm.height_m;
        shapes.push((berm.height_m.min(t_m), x));
    }
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
        // Half embankment = uniform strip 0..b plus falling ramp b..a+b.
        let z = 1.0;
        let s = uniform_strip(1.0, 0.0, 1.0, 0.0, z).sz + piece(1.0, 1.0, 2.0, 0.0, 0.0, z).sz;
        assert!((s - 0.455).abs() < 0.002, "I = {s}");
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
            berms: vec![crate::model::Berm { width_m: 5.0, height_m: 2.0 }],
            reinforcement_kn_per_m: 0.0,
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
}
