//! Limit-equilibrium stability of the embankment on circular slip surfaces:
//! Bishop's (1955) simplified method, with the Ordinary (Fellenius 1927)
//! method as a cross-check. Clay is undrained (τ = su sampled from the
//! consolidating strength field at each slice base); fill and sand are
//! drained (c', φ', pore pressure below the water table). Coordinates: x from
//! the centreline towards the failing (right-hand) toe, y up from the original
//! ground level (OGL), m. `search` finds the critical circle.

pub mod search;

use crate::load;
use crate::model::*;
use crate::response::SuField;
use serde::Serialize;

/// Smallest allowed Bishop m_α on a frictional slice (common practice
/// threshold, after Whitman & Bailey 1967); below it the circle is set aside.
pub const M_ALPHA_MIN: f64 = 0.2;
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
#[derive(Debug, Clone, PartialEq)]
pub enum Reject {
    /// The circle does not cut the ground surface twice on its lower half.
    NoIntersection,
    /// The circle dips into the stiff base.
    IntoBase,
    /// The sliding mass would move the other way (no driving moment).
    NoDrivingMoment,
    /// Bishop's m_α fell below the limit on a frictional slice.
    SmallMAlpha,
    /// The Bishop iteration did not converge.
    NoConvergence,
}

#[derive(Debug, Clone, Copy)]
enum Material {
    Clay,
    Sand { c: f64, tan_phi: f64 },
}

#[derive(Debug, Clone)]
struct SectionLayer {
    name: String,
    top_y: f64,
    bottom_y: f64,
    gamma: f64,
    gamma_sat: f64,
    material: Material,
}

/// The section at one moment: fill profile, ground, strength field.
#[derive(Debug, Clone)]
pub struct Section<'a> {
    /// Right half of the fill surface, (x, height above OGL).
    pub profile: Vec<(f64, f64)>,
    surface: Vec<(f64, f64)>,
    fill_gamma: f64,
    fill_c: f64,
    fill_tan_phi: f64,
    crack: bool,
    layers: Vec<SectionLayer>,
    /// Lowest elevation a circle may reach (top of the stiff base), m.
    pub base_y: f64,
    water_y: f64,
    su: &'a SuField,
    reinforcement_kn: f64,
    slices: usize,
}

impl<'a> Section<'a> {
    /// Section with fill of thickness `placed_m` standing on OGL.
    pub fn new(project: &Project, placed_m: f64, su: &'a SuField) -> Section<'a> {
        let e = &project.embankment;
        let o = &project.stability;
        let profile = load::profile(e, placed_m);
        let mut layers = Vec::new();
        let mut top = 0.0;
        for l in &project.ground.layers {
            let material = match l.kind {
                LayerKind::Clay(_) => Material::Clay,
                LayerKind::Sand { friction_deg, cohesion_kpa } => Material::Sand {
                    c: cohesion_kpa,
                    tan_phi: friction_deg.to_radians().tan(),
                },
                LayerKind::StiffBase => break,
            };
            layers.push(SectionLayer {
                name: l.name.clone(),
                top_y: -top,
                bottom_y: -(top + l.thickness_m),
                gamma: l.unit_weight_kn_m3,
                gamma_sat: l.saturated_unit_weight_kn_m3,
                material,
            });
            top += l.thickness_m;
        }
        Section {
            surface: full_surface(&profile),
            profile,
            fill_gamma: e.fill_unit_weight_kn_m3,
            fill_c: o.fill_strength_factor * e.fill_cohesion_kpa,
            fill_tan_phi: o.fill_strength_factor * e.fill_friction_deg.to_radians().tan(),
            crack: o.fill_tension_crack,
            layers,
            base_y: -top,
            water_y: -project.ground.groundwater_depth_m,
            su,
            reinforcement_kn: e.reinforcement_kn_per_m,
            slices: o.slices,
        }
    }

    /// Height of the section's top surface at x, m above OGL.
    pub fn surface_y(&self, x: f64) -> f64 {
        load::height_at(&self.profile, x)
    }

    /// Crest height, m.
    pub fn crest_m(&self) -> f64 {
        self.profile[0].1
    }

    /// Toe offset of the fill, m.
    pub fn toe_m(&self) -> f64 {
        self.profile.last().map_or(0.0, |p| p.0)
    }

    /// Name of the material at elevation y (below the surface).
    fn band_at(&self, y: f64) -> String {
        if y >= 0.0 {
            return "fill".into();
        }
        self.layers
            .iter()
            .find(|l| y >= l.bottom_y - 1e-9)
            .map_or_else(|| "base".into(), |l| l.name.clone())
    }

    /// Weight of a vertical strip of unit width from y_bot up to y_top, kN/m².
    fn column_weight(&self, y_bot: f64, y_top: f64) -> f64 {
        let mut w = self.fill_gamma * (y_top.max(0.0) - y_bot.max(0.0)).max(0.0);
        for l in &self.layers {
            let lo = y_bot.max(l.bottom_y);
            let hi = y_top.min(l.top_y);
            if hi <= lo {
                continue;
            }
            let wet = (hi.min(self.water_y) - lo).max(0.0);
            w += l.gamma_sat * wet + l.gamma * (hi - lo - wet);
        }
        w
    }

    /// Elevations where the arc meets a layer boundary or the water table.
    fn horizontal_breaks(&self) -> impl Iterator<Item = f64> + '_ {
        self.layers
            .iter()
            .map(|l| l.top_y)
            .chain(std::iter::once(self.water_y))
    }

    /// Analyse one circle.
    pub fn analyse(&self, c: Circle) -> Result<CircleResult, Reject> {
        if c.yc_m - c.r_m < self.base_y - 1e-6 {
            return Err(Reject::IntoBase);
        }
        let (entry, exit) = self.ends(c).ok_or(Reject::NoIntersection)?;
        let slices = self.slices(c, entry, exit);
        let (resist_ord, drive, slice_data) = self.slice_forces(c, &slices);
        if drive <= 1e-9 {
            return Err(Reject::NoDrivingMoment);
        }
        let t_moment = self.reinforcement_moment(c, entry, exit);
        let fs_ordinary = (resist_ord * c.r_m + t_moment) / (drive * c.r_m);
        let fs = self.bishop(&slice_data, drive, c, t_moment, fs_ordinary)?;
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
            band: self.band_at(y_low.max(self.base_y)),
            slices: slices.len(),
        })
    }

    /// Entry and exit x of the lower arc with the ground surface.
    fn ends(&self, c: Circle) -> Option<(f64, f64)> {
        let mut xs: Vec<f64> = Vec::new();
        for w in self.surface.windows(2) {
            segment_hits(w[0], w[1], c, &mut xs);
        }
        let lo = xs.iter().copied().fold(f64::INFINITY, f64::min);
        let hi = xs.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        (xs.len() >= 2 && hi - lo > 1e-3).then_some((lo, hi))
    }

    /// Slice boundaries between entry and exit, with breaks at every profile
    /// vertex and layer or water-table crossing; at least `slices` slices and
    /// none wider than 0.5 m.
    fn slices(&self, c: Circle, x0: f64, x1: f64) -> Vec<(f64, f64)> {
        let mut breaks = vec![x0, x1];
        for &(x, _) in &self.profile {
            breaks.extend([x, -x]);
        }
        for y in self.horizontal_breaks().chain(std::iter::once(0.0)) {
            let d = c.r_m * c.r_m - (c.yc_m - y).powi(2);
            if d > 0.0 && y < c.yc_m {
                breaks.extend([c.xc_m - d.sqrt(), c.xc_m + d.sqrt()]);
            }
        }
        breaks.retain(|x| *x >= x0 && *x <= x1);
        breaks.sort_by(f64::total_cmp);
        breaks.dedup_by(|a, b| (*a - *b).abs() < 1e-6);
        let target = ((x1 - x0) / self.slices as f64).min(0.5);
        let mut out = Vec::new();
        for w in breaks.windows(2) {
            let n = ((w[1] - w[0]) / target).ceil().max(1.0) as usize;
            let dx = (w[1] - w[0]) / n as f64;
            for k in 0..n {
                out.push((w[0] + k as f64 * dx, w[0] + (k + 1) as f64 * dx));
            }
        }
        out
    }

    /// Per-slice forces; returns (Ordinary resisting force sum, driving
    /// force sum Σ W sin α, slice data for Bishop).
    fn slice_forces(&self, c: Circle, slices: &[(f64, f64)]) -> (f64, f64, Vec<SliceData>) {
        let (mut resist, mut drive) = (0.0, 0.0);
        let mut data = Vec::with_capacity(slices.len());
        for &(xa, xb) in slices {
            let x = 0.5 * (xa + xb);
            let b = xb - xa;
            let dx = x - c.xc_m;
            let y_arc = c.yc_m - (c.r_m * c.r_m - dx * dx).max(0.0).sqrt();
            let y_top = self.surface_y(x);
            if y_arc >= y_top {
                continue;
            }
            let sin_a = (c.xc_m - x) / c.r_m;
            let cos_a = (1.0 - sin_a * sin_a).max(1e-9).sqrt();
            let w = b * self.column_weight(y_arc, y_top);
            let (coh, tan_phi, u) = self.strength_at(x, y_arc, sin_a);
            let l = b / cos_a;
            resist += coh * l + ((w * cos_a - u * l).max(0.0)) * tan_phi;
            drive += w * sin_a;
            data.push(SliceData { b, w, sin_a, cos_a, coh, tan_phi, u });
        }
        (resist, drive, data)
    }

    /// (c kPa, tan φ, u kPa) at a slice base.
    fn strength_at(&self, x: f64, y: f64, sin_a: f64) -> (f64, f64, f64) {
        if y >= 0.0 {
            if self.crack && sin_a > 0.0 {
                return (0.0, 0.0, 0.0);
            }
            return (self.fill_c, self.fill_tan_phi, 0.0);
        }
        let layer = self.layers.iter().find(|l| y >= l.bottom_y - 1e-9);
        match layer.map(|l| l.material) {
            Some(Material::Sand { c, tan_phi }) => (c, tan_phi, GAMMA_W * (self.water_y - y).max(0.0)),
            _ => (self.su.sample(x, -y), 0.0, 0.0),
        }
    }

    /// Moment of the basal reinforcement about the centre: its design force
    /// acts horizontally at the fill base where the circle cuts it under the
    /// fill (lever arm yc), kN·m per m.
    fn reinforcement_moment(&self, c: Circle, entry: f64, exit: f64) -> f64 {
        if self.reinforcement_kn <= 0.0 || c.yc_m <= 0.0 {
            return 0.0;
        }
        let d = c.r_m * c.r_m - c.yc_m * c.yc_m;
        if d <= 0.0 {
            return 0.0;
        }
        let toe = self.toe_m();
        let cuts = [c.xc_m - d.sqrt(), c.xc_m + d.sqrt()];
        let under_fill = cuts.iter().any(|x| *x >= entry && *x <= exit && x.abs() < toe);
        if under_fill { self.reinforcement_kn * c.yc_m } else { 0.0 }
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

/// Mirror the right-half profile into a full surface polyline extended far
/// out along OGL on both sides.
fn full_surface(profile: &[(f64, f64)]) -> Vec<(f64, f64)> {
    let far = 1.0e5;
    let mut s = vec![(-far, 0.0)];
    s.extend(profile.iter().rev().filter(|p| p.0 > 0.0).map(|&(x, h)| (-x, h)));
    s.extend(profile.iter().copied());
    s.push((far, 0.0));
    s
}

/// x of the points where segment p–q meets the circle's lower half.
fn segment_hits(p: (f64, f64), q: (f64, f64), c: Circle, out: &mut Vec<f64>) {
    let (dx, dy) = (q.0 - p.0, q.1 - p.1);
    let (fx, fy) = (p.0 - c.xc_m, p.1 - c.yc_m);
    let a = dx * dx + dy * dy;
    if a < 1e-18 {
        return;
    }
    let b = 2.0 * (fx * dx + fy * dy);
    let cc = fx * fx + fy * fy - c.r_m * c.r_m;
    let disc = b * b - 4.0 * a * cc;
    if disc < 0.0 {
        return;
    }
    for s in [(-b - disc.sqrt()) / (2.0 * a), (-b + disc.sqrt()) / (2.0 * a)] {
        if (0.0..=1.0).contains(&s) {
            let y = p.1 + s * dy;
            if y <= c.yc_m {
                out.push(p.0 + s * dx);
            }
        }
    }
}

#[cfg(test)]
mod tests;
