//! Limit-equilibrium stability of the embankment on circular slip surfaces:
//! Bishop's (1955) simplified method, with the Ordinary (Fellenius 1927)
//! method as a cross-check and as the stated fallback where Bishop's method
//! breaks down. Clay is undrained (τ = su sampled from the consolidating
//! strength field at each slice base, on the slice's own side of a layer
//! boundary); fill and sand are drained (c', φ', pore pressure from the
//! water table, a piezometric level or ru). A fill with no strength is a
//! load: every surface enters and leaves through the ground. A tension
//! crack (2c'/(γ√Ka), Rankine) is tried on every circle and kept only where
//! it lowers the FS. Coordinates: x from the centreline towards the failing
//! (right-hand) toe, y up from the original ground level (OGL), m. `search`
//! finds the critical circle; `face` checks the fill face as an infinite
//! slope.

pub mod diagnostics;
pub mod face;
pub mod fill_load;
pub mod search;
mod section;
mod slicing;

pub use diagnostics::Diagnostics;
pub use face::FaceCheck;
pub use section::Section;

use crate::response::Cursor;
use serde::Serialize;

/// Smallest allowed Bishop m_α on a frictional slice (common practice
/// threshold, after Whitman & Bailey 1967); below it the circle is
/// evaluated by the Ordinary method instead.
pub const M_ALPHA_MIN: f64 = 0.2;
/// Thinnest sliding mass considered, m: shallower surface slivers (whose FS
/// tends to the infinite-slope value, checked separately by `face`) are
/// skipped, as is common practice in slip-circle searches.
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

/// How the FS of a circle was found.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Method {
    /// Bishop's simplified method converged with every m_α ≥ `M_ALPHA_MIN`.
    Bishop,
    /// Bishop's m_α fell below `M_ALPHA_MIN` on a frictional slice: the
    /// Ordinary method's FS is reported.
    OrdinarySmallMAlpha,
    /// Bishop's iteration did not converge: the Ordinary method's FS is
    /// reported.
    OrdinaryNoConvergence,
}

/// The result on one circle.
#[derive(Debug, Clone, Serialize)]
pub struct CircleResult {
    pub circle: Circle,
    /// Factor of safety reported for the circle: Bishop simplified, or the
    /// Ordinary method where `method` says so; the lower of the cracked and
    /// uncracked circle.
    pub fs: f64,
    /// Ordinary (Fellenius) factor of safety, for comparison.
    pub fs_ordinary: f64,
    pub method: Method,
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
    /// Depth of the tension crack of the governing evaluation, m (0: the
    /// uncracked circle governs, or no crack is possible).
    pub crack_depth_m: f64,
    /// Slice bases whose effective normal force came out negative and was
    /// taken as zero (no frictional strength there).
    pub zero_normal_slices: usize,
}

/// Why a circle cannot be analysed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum Reject {
    /// The circle does not cut the surface twice on its lower half (the
    /// ground surface where the fill is a load).
    #[error("it does not cut the ground surface twice below its centre")]
    NoIntersection,
    /// The circle dips into the stiff base.
    #[error("it dips into the stiff base")]
    IntoBase,
    /// The sliding mass is thinner than `MIN_SLIP_DEPTH_M`.
    #[error("its sliding mass is thinner than 0.5 m")]
    TooShallow,
    /// The sliding mass would move the other way (no driving moment).
    #[error("its sliding mass has no driving moment towards the toe")]
    NoDrivingMoment,
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

    /// `analyse` without naming the band: the uncracked circle and, where
    /// the fill can crack, the cracked one; the lower FS is kept.
    pub(crate) fn analyse_unnamed(&self, c: Circle) -> Result<CircleResult, Reject> {
        if c.yc_m - c.r_m < self.base_y - 1e-6 {
            return Err(Reject::IntoBase);
        }
        let (entry, exit) = self.ends(c).ok_or(Reject::NoIntersection)?;
        let plain = self.evaluate(c, entry, exit, None)?;
        let cracked = self.crack_at(c, entry, exit).and_then(|k| self.evaluate(c, entry, exit, Some(k)).ok());
        Ok(match cracked {
            Some(k) if k.fs < plain.fs => k,
            _ => plain,
        })
    }

    /// Forces and FS of the sliding mass from `entry` (or from the crack
    /// at `crack`) to `exit`.
    fn evaluate(&self, c: Circle, entry: f64, exit: f64, crack: Option<Crack>) -> Result<CircleResult, Reject> {
        let start = crack.map_or(entry, |k| k.x_m);
        let slices = self.slices(c, start, exit);
        let mut f = self.slice_forces(c, &slices);
        if f.thickest < MIN_SLIP_DEPTH_M {
            return Err(Reject::TooShallow);
        }
        if let Some(k) = crack {
            f.drive_moment += self.crack_water_moment(c, k);
        }
        if f.drive_moment <= 1e-9 {
            return Err(Reject::NoDrivingMoment);
        }
        let t_moment = self.reinforcement_moment(c.xc_m, c.yc_m, c.r_m, start, exit);
        let fs_ordinary = (f.resist_ordinary * c.r_m + t_moment) / f.drive_moment;
        let (fs, method, clamped) = match bishop(&f.slices, f.drive_moment, c.r_m, t_moment, fs_ordinary) {
            Ok(fs) => (fs, Method::Bishop, f.clamped),
            Err(m) => (fs_ordinary, m, 0),
        };
        Ok(CircleResult {
            circle: c,
            fs,
            fs_ordinary,
            method,
            entry_x_m: entry.min(exit),
            exit_x_m: exit.max(entry),
            driving_knm_per_m: f.drive_moment,
            resisting_knm_per_m: fs * f.drive_moment,
            depth_m: -(c.yc_m - c.r_m),
            band: String::new(),
            slices: f.slices.len(),
            crack_depth_m: crack.map_or(0.0, |k| k.depth_m),
            zero_normal_slices: f.zero_normal.max(clamped),
        })
    }

    /// Per-slice forces of the slices `slices` (the sliding mass).
    fn slice_forces(&self, c: Circle, slices: &[(f64, f64)]) -> Forces {
        let mut f = Forces {
            resist_ordinary: 0.0,
            drive_moment: 0.0,
            slices: Vec::with_capacity(slices.len()),
            thickest: 0.0,
            zero_normal: 0,
            clamped: 0,
        };
        // The slices run in x order: each look-up starts from the last.
        let mut cur = Cursor::default();
        for &(xa, xb) in slices {
            let x = 0.5 * (xa + xb);
            let b = xb - xa;
            let dx = x - c.xc_m;
            let y_arc = c.yc_m - (c.r_m * c.r_m - dx * dx).max(0.0).sqrt();
            let at = self.field.across_near(x, &mut cur);
            let s_x = self.field.settlement_across(at);
            let y_top = self.surface_with(x, s_x);
            if y_arc >= y_top {
                continue;
            }
            f.thickest = f.thickest.max(y_top - y_arc);
            let sin_a = (c.xc_m - x) / c.r_m;
            let cos_a = (1.0 - sin_a * sin_a).max(1e-9).sqrt();
            // The base's original depth, for its soil column and strength.
            let z = self.original_depth(s_x, y_arc);
            let w = b * self.column_weight(s_x, y_arc, y_top, z);
            let (coh, tan_phi, u) = self.strength_at(at, s_x, y_arc, z, w / b, &mut cur);
            let l = b / cos_a;
            let normal = w * cos_a - u * l;
            if normal < 0.0 && tan_phi > 0.0 {
                f.zero_normal += 1;
            }
            f.resist_ordinary += coh * l + normal.max(0.0) * tan_phi;
            f.drive_moment += w * sin_a * c.r_m;
            // Bishop's effective normal force W − u b, taken as zero where
            // negative: it does not depend on the FS, so the numerator of
            // the slice's resistance is summed once, not per iteration.
            let eff = w - u * b;
            f.clamped += usize::from(eff < 0.0 && tan_phi > 0.0);
            f.slices.push(SliceData {
                cos_a,
                sin_tan: sin_a * tan_phi,
                frictional: tan_phi > 0.0,
                resist: coh * b + eff.max(0.0) * tan_phi,
            });
        }
        f
    }
}

/// A tension crack: where it cuts the sliding mass off, x m, and its depth
/// below the fill surface there, m.
#[derive(Debug, Clone, Copy)]
struct Crack {
    x_m: f64,
    depth_m: f64,
}

/// Bishop's simplified method by fixed-point iteration on FS, from the
/// Ordinary method's FS `start`: FS = (Σ [c b + max(0, W − u b) tan φ] / m_α
/// · R + T) / driving moment, m_α = cos α + sin α tan φ / FS, or the reason
/// it must fall back
/// to the Ordinary method (m_α below `M_ALPHA_MIN` at the solution or on the
/// last iterate of one that did not converge; else no convergence).
fn bishop(s: &[SliceData], drive_moment: f64, r: f64, t_moment: f64, start: f64) -> Result<f64, Method> {
    let (mut fs, mut low) = (start.max(0.05), f64::INFINITY);
    for _ in 0..MAX_ITER {
        let mut resist = 0.0;
        low = f64::INFINITY;
        let inv_fs = 1.0 / fs;
        for d in s {
            let m_alpha = d.cos_a + d.sin_tan * inv_fs;
            if d.frictional {
                low = low.min(m_alpha);
                if m_alpha <= 1e-3 {
                    return Err(Method::OrdinarySmallMAlpha);
                }
            }
            resist += d.resist / m_alpha;
        }
        let next = (resist * r + t_moment) / drive_moment;
        if (next - fs).abs() < FS_TOL {
            return if low < M_ALPHA_MIN { Err(Method::OrdinarySmallMAlpha) } else { Ok(next) };
        }
        fs = next;
    }
    // A small m_α is the usual cause of an iteration that wanders: name it.
    Err(if low < M_ALPHA_MIN { Method::OrdinarySmallMAlpha } else { Method::OrdinaryNoConvergence })
}

/// Sums over the slices of one circle.
struct Forces {
    /// Ordinary-method resisting force Σ [c l + max(0, W cos α − u l) tan φ], kN/m.
    resist_ordinary: f64,
    /// Driving moment Σ W R sin α plus any water thrust in a crack, kN·m per m.
    drive_moment: f64,
    slices: Vec<SliceData>,
    /// Thickest slice, m.
    thickest: f64,
    /// Slices whose Ordinary-method effective normal force was negative.
    zero_normal: usize,
    /// Frictional slices whose Bishop effective normal force W − u b was
    /// negative (taken as zero).
    clamped: usize,
}

/// What Bishop's iteration needs of one slice.
#[derive(Debug, Clone, Copy)]
struct SliceData {
    cos_a: f64,
    /// sin α tan φ.
    sin_tan: f64,
    /// tan φ > 0 (m_α is checked on these slices only).
    frictional: bool,
    /// c b + max(0, W − u b) tan φ, kN/m.
    resist: f64,
}

#[cfg(test)]
mod tests;
