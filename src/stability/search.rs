//! Search for the critical slip circle: a grid of centres above the slope ×
//! tangent elevations down to the stiff base (12 × 12 × 14 = 2,016 trial
//! circles), then a pattern search that halves its step from the
//! best circle of each depth band (fill only, then each ground layer) until
//! the step is below 2 cm. The band minima let an engineer see the mechanism.

use super::{Circle, CircleResult, Reject, Section};
use crate::error::{Error, Result};
use serde::Serialize;

const NX: usize = 12;
const NY: usize = 12;
const NT: usize = 14;
/// Pattern search stops when the step falls below this, m.
const MIN_STEP_M: f64 = 0.02;

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

/// Best grid circle found in a band: (result, tangent elevation, grid index).
type Candidate = (CircleResult, f64, usize);

/// Full search on a section. The grid is split across the machine's cores;
/// ties are broken by grid index, so the answer does not depend on the
/// number of threads.
pub fn search(s: &Section) -> Result<SearchResult> {
    let bands = bands(s);
    let h = s.crest_m().max(0.1);
    let b = s.profile.get(1).map_or(0.0, |p| p.0);
    let toe = s.toe_m();
    let depth = -s.base_y;
    let grid = Grid {
        x0: 0.5 * b,
        x1: toe + 0.5 * depth,
        y0: h + 0.5,
        y1: h + 1.5 * (h + depth),
        tangents: tangent_levels(s, h),
    };
    let threads = std::thread::available_parallelism().map_or(1, |n| n.get()).clamp(1, NX);
    let chunks: Vec<(Vec<Option<Candidate>>, Counter)> = std::thread::scope(|scope| {
        let handles: Vec<_> = (0..threads)
            .map(|t| {
                let (grid, bands) = (&grid, &bands);
                scope.spawn(move || grid.scan(s, bands, (t * NX / threads)..((t + 1) * NX / threads)))
            })
            .collect();
        handles
            .into_iter()
            .map(|h| h.join().expect("search thread panicked"))
            .collect()
    });
    let mut count = Counter { tried: 0, rejected: 0 };
    let mut best: Vec<Option<Candidate>> = vec![None; bands.len()];
    for (found, c) in chunks {
        count.tried += c.tried;
        count.rejected += c.rejected;
        for (k, cand) in found.into_iter().enumerate() {
            if let Some(cand) = cand {
                if best[k].as_ref().is_none_or(|b| better(&cand, b)) {
                    best[k] = Some(cand);
                }
            }
        }
    }
    let step0 = ((grid.x1 - grid.x0) / (NX - 1) as f64).max((grid.y1 - grid.y0) / (NY - 1) as f64);
    let refined: Vec<CircleResult> = best
        .into_iter()
        .zip(&bands)
        .filter_map(|(b, band)| b.map(|(r, yt, _)| refine(s, &mut count, r, yt, band, step0)))
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

fn better(a: &Candidate, b: &Candidate) -> bool {
    a.0.fs < b.0.fs || (a.0.fs == b.0.fs && a.2 < b.2)
}

/// The trial grid: centres over [x0, x1] × [y0, y1] and tangent elevations.
struct Grid {
    x0: f64,
    x1: f64,
    y0: f64,
    y1: f64,
    tangents: Vec<f64>,
}

impl Grid {
    /// Scan the grid columns `cols`; best candidate per band.
    fn scan(&self, s: &Section, bands: &[Band], cols: std::ops::Range<usize>) -> (Vec<Option<Candidate>>, Counter) {
        let mut count = Counter { tried: 0, rejected: 0 };
        let mut best: Vec<Option<Candidate>> = vec![None; bands.len()];
        for i in cols {
            let xc = self.x0 + (self.x1 - self.x0) * i as f64 / (NX - 1) as f64;
            for j in 0..NY {
                let yc = self.y0 + (self.y1 - self.y0) * j as f64 / (NY - 1) as f64;
                for (k, &yt) in self.tangents.iter().enumerate() {
                    let Some(r) = count.eval(
                        s,
                        Circle {
                            xc_m: xc,
                            yc_m: yc,
                            r_m: yc - yt,
                        },
                    ) else {
                        continue;
                    };
                    let cand = (r, yt, (i * NY + j) * self.tangents.len() + k);
                    let band = band_of(bands, yt);
                    if best[band].as_ref().is_none_or(|b| better(&cand, b)) {
                        best[band] = Some(cand);
                    }
                }
            }
        }
        (best, count)
    }
}

/// Bands: the fill (when there is some) and each ground layer.
fn bands(s: &Section) -> Vec<Band> {
    let mut out = Vec::new();
    if s.crest_m() > 0.2 {
        out.push(Band {
            lo: 0.0,
            hi: s.crest_m(),
        });
    }
    let x = s.profile.get(1).map_or(0.0, |p| p.0);
    for l in &s.layers {
        out.push(Band {
            lo: s.elevation_of_depth(x, l.bottom_z),
            hi: s.elevation_of_depth(x, l.top_z),
        });
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
    let x = s.profile.get(1).map_or(0.0, |p| p.0);
    for l in &s.layers {
        let (top, bottom) = (s.elevation_of_depth(x, l.top_z), s.elevation_of_depth(x, l.bottom_z));
        t.extend([0.5 * (top + bottom), bottom]);
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
            let trial = Circle {
                xc_m: c.xc_m + d[0] * step,
                yc_m: yc,
                r_m: yc - t,
            };
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
    (0..27)
        .filter(|&k| k != 13)
        .map(|k| [(k % 3) as f64 - 1.0, ((k / 3) % 3) as f64 - 1.0, (k / 9) as f64 - 1.0])
}
