//! Limit-equilibrium stability of the embankment on circular slip surfaces:
//! Bishop's (1955) simplified method, with the Ordinary (Fellenius 1927)
//! method as a cross-check. Clay is undrained (τ = su sampled from the
//! consolidating strength field at each slice base); fill and sand are
//! drained (c', φ', pore pressure below the water table). Coordinates: x from
//! the centreline towards the failing (right-hand) toe, y up from the original
//! ground level (OGL), m. `search` finds the critical circle.

pub mod search;
mod section;

pub use section::Section;

use serde::Serialize;

/// Smallest allowed Bishop m_α on a frictional slice (common practice
/// threshold, after Whitman & Bailey 1967); below it the circle is set aside.
pub const M_ALPHA_MIN: f64 = 0.2;
/// Thinnest sliding mass considered, m: shallower surface slivers (whose FS
/// tends to the infinite-slope value tan φ'/tan β) are skipped, as is
/// common practice in slip-circle searches.
pub const MIN_SLIP_DEPTH_M: f64 = 0.5;
/// Convergence tolerance of the Bishop iteration on FS.
pub const FS_TOL: f64 = 1e-4;
const MAX_ITER: usize = 200;

/// A trial circle: centre (x, y) and radius, m.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Circle {
    pub xc_m: f64,
    pub yc_m: f64,
    pub r_m: f64,
}

/// The result on one circle.
#[derive(Debug, Clone, Serialize)]
pub struct CircleResult {
    pub circle: Circle,
    /// Bishop simplified factor of safety.
    pub fs: f64,
    /// Ordinary (Fellenius) factor of safety, for comparison.
    pub fs_ordinary: f64,
    /// Where the circle enters (high side) and exits (toe side), x m.
    pub entry_x_m: f64,
    pub exit_x_m: f64,
    /// Driving and resisting moments about the centre, kN·m per m run.
    pub driving_knm_per_m: f64,
    pub resisting_knm_per_m: f64,
    /// Depth of the lowest point below OGL, m (negative: within the fill).
    pub depth_m: f64,
    /// Name of the material at the lowest point ("fill" or a layer name).
    pub band: String,
    pub slices: usize,
}

/// Why a circle cannot be analysed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum Reject {
    /// The circle does not cut the ground surface twice on its lower half.
    #[error("it does not cut the ground surface twice below its centre")]
    NoIntersection,
    /// The circle dips into the stiff base.
    #[error("it dips into the stiff base")]
    IntoBase,
    /// The sliding mass is thinner than `MIN_SLIP_DEPTH_M`.
    #[error("its sliding mass is thinner than 0.5 m")]
    TooShallow,
    /// The fill has no strength at all (it is a surcharge, not a slope) and
    /// the circle leaves the ground through the fill's side slope.
    #[error("it leaves through the side slope of a fill that has no strength")]
    ExitInStrengthlessFill,
    /// The sliding mass would move the other way (no driving moment).
    #[error("its sliding mass has no driving moment towards the toe")]
    NoDrivingMoment,
    /// Bishop's m_α fell below the limit on a frictional slice.
    #[error("Bishop's m_α falls below 0.2 on a frictional slice near its exit")]
    SmallMAlpha,
    /// The Bishop iteration did not converge.
    #[error("the Bishop iteration did not converge in 200 steps")]
    NoConvergence,
}

impl Section<'_> {
    /// Analyse one circle.
    pub fn analyse(&self, c: Circle) -> Result<CircleResult, Reject> {
        let mut r = self.analyse_unnamed(c)?;
        self.name_band(&mut r);
        Ok(r)
    }

    /// Fill in `band`, the material at the circle's lowest point (left
    /// empty by the searches' trial evaluations, where it is not needed).
    pub fn name_band(&self, r: &mut CircleResult) {
        r.band = self.band_at(r.circle.xc_m, (r.circle.yc_m - r.circle.r_m).max(self.base_y));
    }

    /// `analyse` without naming the band.
    pub(crate) fn analyse_unnamed(&self, c: Circle) -> Result<CircleResult, Reject> {
        if c.yc_m - c.r_m < self.base_y - 1e-6 {
            return Err(Reject::IntoBase);
        }
        let (entry, exit) = self.ends(c).ok_or(Reject::NoIntersection)?;
        if self.fill_c <= 0.0 && self.fill_tan_phi <= 0.0 && self.surface_y(exit) > self.ground_y(exit) + 1e-6 {
            return Err(Reject::ExitInStrengthlessFill);
        }
        let slices = self.slices(c, entry, exit);
        let f = self.slice_forces(c, &slices);
        if f.thickest < MIN_SLIP_DEPTH_M {
            return Err(Reject::TooShallow);
        }
        if f.drive_moment <= 1e-9 {
            return Err(Reject::NoDrivingMoment);
        }
        let drive = f.drive_moment / c.r_m;
        let t_moment = self.reinforcement_moment(c.xc_m, c.yc_m, c.r_m, entry, exit);
        let fs_ordinary = (f.resist_ordinary * c.r_m + t_moment) / f.drive_moment;
        let fs = self.bishop(&f.slices, drive, c, t_moment, fs_ordinary)?;
        let y_low = c.yc_m - c.r_m;
        Ok(CircleResult {
            circle: c,
            fs,
            fs_ordinary,
            entry_x_m: entry.min(exit),
            exit_x_m: exit.max(entry),
            driving_knm_per_m: drive * c.r_m,
            resisting_knm_per_m: fs * drive * c.r_m,
            depth_m: -y_low,
            band: String::new(),
            slices: f.slices.len(),
        })
    }

    /// Entry and exit x of the lower arc with the ground surface.
    fn ends(&self, c: Circle) -> Option<(f64, f64)> {
        let (mut n, mut lo, mut hi) = (0, f64::INFINITY, f64::NEG_INFINITY);
        for w in self.surface.windows(2) {
            for x in segment_hits(w[0], w[1], c).into_iter().flatten() {
                n += 1;
                lo = lo.min(x);
                hi = hi.max(x);
            }
        }
        (n >= 2 && hi - lo > 1e-3).then_some((lo, hi))
    }

    /// Slice boundaries between entry and exit, with breaks at every profile
    /// vertex and layer or water-table crossing, and at least `slices` (≥ 30)
    /// slices in all.
    fn slices(&self, c: Circle, x0: f64, x1: f64) -> Vec<(f64, f64)> {
        let mut breaks = Vec::with_capacity(6 + 2 * (self.profile.len() + self.layers.len()));
        breaks.extend([x0, x1]);
        for &(x, _) in &self.profile {
            breaks.extend([x, -x]);
        }
        let crossings = self.ground_crossings(c, x0, x1);
        // With the crack on, the sliding mass starts at the active-side
        // crossing: slice that part finely enough on its own.
        let mass_start = match crossings.iter().flatten().next() {
            Some(&x) if self.crack && x < c.xc_m => x,
            _ => x0,
        };
        breaks.extend(crossings.into_iter().flatten());
        for y in self.horizontal_breaks(c.xc_m) {
            let d = c.r_m * c.r_m - (c.yc_m - y).powi(2);
            if d > 0.0 && y < c.yc_m {
                breaks.extend([c.xc_m - d.sqrt(), c.xc_m + d.sqrt()]);
            }
        }
        breaks.retain(|x| *x >= x0 && *x <= x1);
        breaks.sort_by(f64::total_cmp);
        breaks.dedup_by(|a, b| (*a - *b).abs() < 1e-6);
        let target = (x1 - mass_start) / self.slices as f64;
        let mut out = Vec::with_capacity(self.slices + breaks.len());
        for w in breaks.windows(2) {
            let n = ((w[1] - w[0]) / target).ceil().max(1.0) as usize;
            let dx = (w[1] - w[0]) / n as f64;
            for k in 0..n {
                out.push((w[0] + k as f64 * dx, w[0] + (k + 1) as f64 * dx));
            }
        }
        out
    }

    /// Where the arc crosses the settled original ground on each side of its
    /// lowest point (a root of arc − ground, which changes sign there),
    /// so the crack and the fill/ground boundary fall on slice boundaries.
    fn ground_crossings(&self, c: Circle, x0: f64, x1: f64) -> [Option<f64>; 2] {
        let g = |x: f64| {
            let dx = x - c.xc_m;
            c.yc_m - (c.r_m * c.r_m - dx * dx).max(0.0).sqrt() - self.ground_y(x)
        };
        let mid = c.xc_m.clamp(x0, x1);
        if g(mid) >= 0.0 {
            return [None, None];
        }
        [(x0, mid), (x1, mid)].map(|(above, below)| (g(above) > 0.0).then(|| root(&g, above, below)))
    }

    /// Per-slice forces. With the fill tension crack on, a circle that goes
    /// below the ground is cut by a dry vertical crack through the full fill
    /// thickness where it first enters the ground on the active side: the
    /// fill between the entry and the crack is not part of the sliding mass,
    /// and pushes on it with the Rankine active thrust ½ Ka γ h² (c' = 0)
    /// at a third of the crack height.
    fn slice_forces(&self, c: Circle, slices: &[(f64, f64)]) -> Forces {
        let mut f =
            Forces { resist_ordinary: 0.0, drive_moment: 0.0, slices: Vec::with_capacity(slices.len()), thickest: 0.0 };
        let below_ground = c.yc_m - c.r_m < self.ground_y(c.xc_m);
        let mut cracked = self.crack && below_ground;
        for &(xa, xb) in slices {
            let x = 0.5 * (xa + xb);
            let b = xb - xa;
            let dx = x - c.xc_m;
            let y_arc = c.yc_m - (c.r_m * c.r_m - dx * dx).max(0.0).sqrt();
            let s_x = self.field.settlement(x);
            let y_top = self.surface_with(x, s_x);
            if y_arc >= y_top {
                continue;
            }
            if cracked {
                if y_arc >= -s_x && x < c.xc_m {
                    continue; // beyond the crack
                }
                cracked = false;
                f.drive_moment += self.crack_thrust_moment(c, xa);
            }
            f.thickest = f.thickest.max(y_top - y_arc);
            let sin_a = (c.xc_m - x) / c.r_m;
            let cos_a = (1.0 - sin_a * sin_a).max(1e-9).sqrt();
            let w = b * self.column_weight(s_x, y_arc, y_top);
            let (coh, tan_phi, u) = self.strength_at(x, s_x, y_arc);
            let l = b / cos_a;
            f.resist_ordinary += coh * l + ((w * cos_a - u * l).max(0.0)) * tan_phi;
            f.drive_moment += w * sin_a * c.r_m;
            f.slices.push(SliceData { b, w, sin_a, cos_a, coh, tan_phi, u });
        }
        f
    }

    /// Moment about the centre of the active thrust of the cracked fill at
    /// x (horizontal, towards the toe), kN·m per m.
    fn crack_thrust_moment(&self, c: Circle, x: f64) -> f64 {
        let ground = self.ground_y(x);
        let h = (self.surface_y(x) - ground).max(0.0);
        let thrust = 0.5 * self.fill_ka * self.fill_gamma * h * h;
        thrust * (c.yc_m - (ground + h / 3.0))
    }

    /// Bishop's simplified method by fixed-point iteration on FS.
    fn bishop(&self, s: &[SliceData], drive: f64, c: Circle, t_moment: f64, start: f64) -> Result<f64, Reject> {
        let mut fs = start.max(0.05);
        for _ in 0..MAX_ITER {
            let mut resist = 0.0;
            for d in s {
                let m_alpha = d.cos_a + d.sin_a * d.tan_phi / fs;
                if d.tan_phi > 0.0 && m_alpha < M_ALPHA_MIN {
                    return Err(Reject::SmallMAlpha);
                }
                resist += (d.coh * d.b + (d.w - d.u * d.b).max(0.0) * d.tan_phi) / m_alpha;
            }
            let next = (resist * c.r_m + t_moment) / (drive * c.r_m);
            if (next - fs).abs() < FS_TOL {
                return Ok(next);
            }
            fs = next;
        }
        Err(Reject::NoConvergence)
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

/// Sums over the slices of one circle.
struct Forces {
    /// Ordinary-method resisting force Σ [c l + (W cos α − u l) tan φ], kN/m.
    resist_ordinary: f64,
    /// Driving moment Σ W R sin α plus any crack thrust, kN·m per m.
    drive_moment: f64,
    slices: Vec<SliceData>,
    /// Thickest slice, m.
    thickest: f64,
}

#[derive(Debug, Clone, Copy)]
struct SliceData {
    b: f64,
    w: f64,
    sin_a: f64,
    cos_a: f64,
    coh: f64,
    tan_phi: f64,
    u: f64,
}

/// x of the points (at most two) where segment p–q meets the circle's
/// lower half.
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
        .map(|s| ((0.0..=1.0).contains(&s) && p.1 + s * dy <= c.yc_m).then_some(p.0 + s * dx))
}

#[cfg(test)]
mod tests;
