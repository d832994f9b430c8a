//! Search for the critical slip circle: a grid of centres above the slope ×
//! tangent elevations down to the stiff base (12 × 12 × 14 = 2,016 trial
//! circles), then a pattern search that halves its step from the
//! best circle of each depth band (fill only, then each ground layer) until
//! the step is below 1 cm. The band minima let an engineer see the mechanism.

use super::{Circle, CircleResult, Reject, Section};
use crate::error::{Error, Result};
use serde::Serialize;

const NX: usize = 12;
const NY: usize = 12;
const NT: usize = 14;
/// Pattern search stops when the step falls below this, m.
const MIN_STEP_M: f64 = 0.01;

/// The outcome of a search.
#[derive(Debug, Clone, Serialize)]
pub struct SearchResult {
    /// The circle with the lowest Bishop FS.
    pub critical: CircleResult,
    /// The lowest-FS circle whose lowest point lies in each band, top down.
    pub bands: Vec<CircleResult>,
    /// Circles analysed (grid and refinement).
    pub circles_tried: usize,
    /// Circles set aside (m_α too small, no convergence, no driving moment).
    pub circles_rejected: usize,
}

/// A depth band: tangent elevations from `lo` to `hi` (m, y up).
#[derive(Debug, Clone)]
struct Band {
    lo: f64,
    hi: f64,
}

struct Counter {
    tried: usize,
    rejected: usize,
}

impl Counter {
    fn eval(&mut self, s: &Section, c: Circle) -> Option<CircleResult> {
        self.tried += 1;
        match s.analyse(c) {
            Ok(r) if r.fs.is_finite() && r.fs > 0.0 => Some(r),
            Ok(_) | Err(Reject::SmallMAlpha | Reject::NoConvergence | Reject::NoDrivingMoment) => {
                self.rejected += 1;
                None
            }
            Err(_) => None,
        }
    }
}

/// Full search on a section.
pub fn search(s: &Section) -> Result<SearchResult> {
    let bands = bands(s);
    let mut count = Counter { tried: 0, rejected: 0 };
    let mut best: Vec<Option<(CircleResult, f64)>> = vec![None; bands.len()];
    let h = s.crest_m().max(0.1);
    let b = s.profile.get(1).map_or(0.0, |p| p.0);
    let toe = s.toe_m();
    let depth = -s.base_y;
    let (x0, x1) = (0.5 * b, toe + 0.5 * depth);
    let (y0, y1) = (h + 0.5, h + 1.5 * (h + depth));
    let tangents = tangent_levels(s, h);
    for i in 0..NX {
        let xc = x0 + (x1 - x0) * i as f64 / (NX - 1) as f64;
        for j in 0..NY {
            let yc = y0 + (y1 - y0) * j as f64 / (NY - 1) as f64;
            for &yt in &tangents {
                let Some(r) = count.eval(s, Circle { xc_m: xc, yc_m: yc, r_m: yc - yt }) else { continue };
                let k = band_of(&bands, yt);
                if best[k].as_ref().is_none_or(|(b, _)| r.fs < b.fs) {
                    best[k] = Some((r, yt));
                }
            }
        }
    }
    let step0 = ((x1 - x0) / (NX - 1) as f64).max((y1 - y0) / (NY - 1) as f64);
    let refined: Vec<CircleResult> = best
        .into_iter()
        .zip(&bands)
        .filter_map(|(b, band)| b.map(|(r, yt)| refine(s, &mut count, r, yt, band, step0)))
        .collect();
    let critical = refined
        .iter()
        .min_by(|a, b| a.fs.total_cmp(&b.fs))
        .cloned()
        .ok_or_else(|| Error::Computation("no trial slip circle could be analysed on this section".into()))?;
    Ok(SearchResult {
        critical,
        bands: refined,
        circles_tried: count.tried,
        circles_rejected: count.rejected,
    })
}

/// Bands: the fill (when there is some) and each ground layer.
fn bands(s: &Section) -> Vec<Band> {
    let mut out = Vec::new();
    if s.crest_m() > 0.2 {
        out.push(Band { lo: 0.0, hi: s.crest_m() });
    }
    for l in &s.layers {
        out.push(Band { lo: l.bottom_y, hi: l.top_y });
    }
    out
}

fn band_of(bands: &[Band], yt: f64) -> usize {
    bands
        .iter()
        .position(|b| yt >= b.lo - 1e-9 && yt <= b.hi + 1e-9)
        .unwrap_or(bands.len() - 1)
}

/// Tangent elevations: two within the fill, then through the ground at
/// least two per layer (mid-layer and its base, so every band is tried) and
/// the rest spread evenly in depth, NT in all or more.
fn tangent_levels(s: &Section, h: f64) -> Vec<f64> {
    let depth = -s.base_y;
    let mut t = vec![0.6 * h, 0.25 * h];
    for l in &s.layers {
        t.extend([0.5 * (l.top_y + l.bottom_y), l.bottom_y]);
    }
    let spare = NT.saturating_sub(t.len());
    for k in 1..=spare {
        t.push(-depth * (k as f64 - 0.5) / spare as f64);
    }
    t
}

/// Pattern search in (xc, yc, tangent elevation) over all 26 neighbour
/// directions (diagonals included, because the FS surface has creases where
/// a circle's entry crosses a break in the profile), tangent kept in its band.
fn refine(s: &Section, count: &mut Counter, start: CircleResult, yt0: f64, band: &Band, step0: f64) -> CircleResult {
    let mut best = start;
    let mut yt = yt0;
    let mut step = step0;
    while step >= MIN_STEP_M {
        let c = best.circle;
        let mut improved = None;
        for d in directions() {
            let t = (yt + d[2] * step * 0.5).clamp(band.lo.max(s.base_y), band.hi);
            let yc = c.yc_m + d[1] * step;
            if yc <= t + 0.1 {
                continue;
            }
            let trial = Circle { xc_m: c.xc_m + d[0] * step, yc_m: yc, r_m: yc - t };
            if let Some(r) = count.eval(s, trial) {
                if r.fs < best.fs - 1e-6 && improved.as_ref().is_none_or(|(b, _): &(CircleResult, f64)| r.fs < b.fs) {
                    improved = Some((r, t));
                }
            }
        }
        match improved {
            Some((r, t)) => {
                best = r;
                yt = t;
            }
            None => step *= 0.5,
        }
    }
    best
}

/// The 26 unit moves of a 3 × 3 × 3 stencil.
fn directions() -> impl Iterator<Item = [f64; 3]> {
    (0..27).filter(|&k| k != 13).map(|k| [(k % 3) as f64 - 1.0, ((k / 3) % 3) as f64 - 1.0, (k / 9) as f64 - 1.0])
}
