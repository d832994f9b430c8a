//! Geometry of one circle on the section: where it enters and leaves,
//! where the tension crack cuts it, and the slice boundaries. Slices cover
//! the sliding mass only (from the entry or the crack to the exit), with a
//! break at every profile vertex and where the arc crosses the settled
//! ground, a layer boundary or the water table (on each side of the arc's
//! lowest point, the crossing nearest it), so that each slice base lies in
//! one material. The ground and the layer boundaries are linear between the
//! response columns, so their crossings are found exactly, segment by
//! segment. Width ≤ (mass span)/n and count ≤ n + breaks
//! (`max_slices`), whatever the geometry.

use super::{Circle, Crack, Section};
use crate::model::GAMMA_W;

/// Points at which the crack's depth condition is scanned from the entry
/// towards the lowest point before the crossing is refined.
const CRACK_SCAN: usize = 32;

impl Section<'_> {
    /// Entry and exit x of the lower arc with the surface it must cut: the
    /// top of the section, or the settled ground where the fill is a load.
    pub(super) fn ends(&self, c: Circle) -> Option<(f64, f64)> {
        let line = if self.fill_is_load() { &self.ground_line } else { &self.surface };
        let (mut n, mut lo, mut hi) = (0, f64::INFINITY, f64::NEG_INFINITY);
        for w in line.windows(2) {
            for x in segment_hits(w[0], w[1], c).into_iter().flatten() {
                n += 1;
                lo = lo.min(x);
                hi = hi.max(x);
            }
        }
        (n >= 2 && hi - lo > 1e-3).then_some((lo, hi))
    }

    /// Most slices a circle can get: `slices` plus one per possible break.
    pub fn max_slices(&self) -> usize {
        self.slices + 2 * (self.profile.len() + self.layers.len() + 3) + 2
    }

    /// Slice boundaries between x0 and x1 (the sliding mass).
    pub(super) fn slices(&self, c: Circle, x0: f64, x1: f64) -> Vec<(f64, f64)> {
        let mut breaks = Vec::with_capacity(self.max_slices() - self.slices + 2);
        breaks.extend([x0, x1]);
        for &(x, _) in &self.profile {
            breaks.extend([x, -x]);
        }
        breaks.extend(line_hits(&self.ground_line, c, x0, x1).into_iter().flatten());
        for line in &self.layer_tops {
            breaks.extend(line_hits(line, c, x0, x1).into_iter().flatten());
        }
        breaks.extend(line_hits(&self.water_line, c, x0, x1).into_iter().flatten());
        breaks.retain(|x| *x >= x0 && *x <= x1);
        breaks.sort_by(f64::total_cmp);
        breaks.dedup_by(|a, b| (*a - *b).abs() < 1e-6);
        let target = (x1 - x0) / self.slices as f64;
        let mut out = Vec::with_capacity(self.slices + breaks.len());
        for w in breaks.windows(2) {
            let n = ((w[1] - w[0]) / target - 1e-9).ceil().max(1.0) as usize;
            let dx = (w[1] - w[0]) / n as f64;
            out.extend((0..n).map(|k| (w[0] + k as f64 * dx, w[0] + (k + 1) as f64 * dx)));
        }
        out
    }

    /// Arc elevation at x, m.
    fn arc_y(c: Circle, x: f64) -> f64 {
        let dx = x - c.xc_m;
        c.yc_m - (c.r_m * c.r_m - dx * dx).max(0.0).sqrt()
    }

    /// The tension crack of a circle, if the fill can crack: a vertical
    /// crack on the active (entry) side, at the first point from the entry
    /// where the arc lies as deep below the fill surface as the crack can
    /// reach (the Rankine depth, at most the fill thickness there). The
    /// sliding mass starts there.
    pub(super) fn crack_at(&self, c: Circle, entry: f64, exit: f64) -> Option<Crack> {
        if self.crack_depth_m <= 0.0 {
            return None;
        }
        // (crack reach, depth of the arc below the surface) at x, from one
        // settlement look-up.
        let at = |x: f64| {
            let s = self.field.settlement(x);
            let top = self.surface_with(x, s);
            (self.crack_depth_m.min((top + s).max(0.0)), top - Self::arc_y(c, x))
        };
        let g = |x: f64| {
            let (reach, below) = at(x);
            reach - below
        };
        let end = c.xc_m.clamp(entry, exit);
        let mut prev = entry;
        for k in 1..=CRACK_SCAN {
            let x = entry + (end - entry) * k as f64 / CRACK_SCAN as f64;
            if g(x) < 0.0 {
                let x_m = if g(prev) > 0.0 { root(&g, prev, x) } else { prev };
                let depth_m = at(x_m).0;
                return (depth_m > 1e-3).then_some(Crack { x_m, depth_m });
            }
            prev = x;
        }
        None
    }

    /// Moment about the centre of the water in the crack (a fraction of its
    /// depth filled): thrust ½ γw hw² horizontal towards the toe at hw/3
    /// above the crack's bottom, kN·m per m.
    pub(super) fn crack_water_moment(&self, c: Circle, k: Crack) -> f64 {
        let hw = self.crack_water_fraction * k.depth_m;
        let bottom = self.surface_y(k.x_m) - k.depth_m;
        0.5 * GAMMA_W * hw * hw * (c.yc_m - (bottom + hw / 3.0))
    }
}

/// Root of g between a (g > 0) and b (g < 0) by the Illinois variant of
/// false position (Dowell & Jarratt 1971), to 1e-7 m or 60 iterations.
fn root(g: &impl Fn(f64) -> f64, a: f64, b: f64) -> f64 {
    let (mut a, mut b) = (a, b);
    let (mut fa, mut fb) = (g(a), g(b));
    let mut side = 0;
    for _ in 0..60 {
        let x = (a * fb - b * fa) / (fb - fa);
        let fx = g(x);
        if (b - a).abs() < 1e-7 || fx == 0.0 {
            return x;
        }
        if (fx > 0.0) == (fa > 0.0) {
            (a, fa) = (x, fx);
            if side == -1 {
                fb *= 0.5;
            }
            side = -1;
        } else {
            (b, fb) = (x, fx);
            if side == 1 {
                fa *= 0.5;
            }
            side = 1;
        }
    }
    0.5 * (a + b)
}

/// Where the polyline `line` (left to right, linear between its vertices)
/// meets the circle's lower half within [x0, x1], on each side of the
/// lowest point of the arc there: the crossing nearest that point on each
/// side (one per side, so that the slice count stays within
/// `Section::max_slices`), found exactly, segment by segment.
fn line_hits(line: &[(f64, f64)], c: Circle, x0: f64, x1: f64) -> [Option<f64>; 2] {
    let mid = c.xc_m.clamp(x0, x1);
    let (mut left, mut right): (Option<f64>, Option<f64>) = (None, None);
    for w in line.windows(2) {
        if w[1].0 < x0 || w[0].0 > x1 {
            continue;
        }
        for x in segment_hits(w[0], w[1], c).into_iter().flatten() {
            if x >= x0 && x < mid {
                left = Some(left.map_or(x, |l| l.max(x)));
            } else if x >= mid && x <= x1 {
                right = Some(right.map_or(x, |r| r.min(x)));
            }
        }
    }
    [left, right]
}

/// x of the points (at most two) where segment p–q meets the circle's
/// lower half (a point at a vertex, to round-off, on both segments).
fn segment_hits(p: (f64, f64), q: (f64, f64), c: Circle) -> [Option<f64>; 2] {
    let (dx, dy) = (q.0 - p.0, q.1 - p.1);
    let (fx, fy) = (p.0 - c.xc_m, p.1 - c.yc_m);
    let a = dx * dx + dy * dy;
    if a < 1e-18 {
        return [None, None];
    }
    let b = 2.0 * (fx * dx + fy * dy);
    let cc = fx * fx + fy * fy - c.r_m * c.r_m;
    let disc = b * b - 4.0 * a * cc;
    if disc < 0.0 {
        return [None, None];
    }
    [(-b - disc.sqrt()) / (2.0 * a), (-b + disc.sqrt()) / (2.0 * a)]
        .map(|s| ((-1e-12..=1.0 + 1e-12).contains(&s) && p.1 + s * dy <= c.yc_m).then_some(p.0 + s * dx))
}
