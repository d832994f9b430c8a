//! Search for the critical slip circle: a grid of centres above the slope ×
//! tangent elevations down to the stiff base (12 × 12 × 14 = 2,016 trial
//! circles), then a pattern search that halves its step from the
//! best circle of each depth band (fill only, then each ground layer) until
//! the step is below 2 cm. The band minima let an engineer see the mechanism.
//! Every search also checks the fill face as an infinite slope (`face`);
//! `SearchResult::governing_fs` is the lower of the two, the one value every
//! FS-target check uses. Grid columns and bands run on rayon's pool.

use super::face::{self, FaceCheck};
use super::{Circle, CircleResult, Diagnostics, Section};
use crate::error::{Error, Result};
use rayon::prelude::*;
use serde::Serialize;

const NX: usize = 12;
const NY: usize = 12;
const NT: usize = 14;
/// Pattern search stops when the step falls below this, m.
const MIN_STEP_M: f64 = 0.02;
/// Seeded search: bands whose walked FS is within this fraction of the
/// lowest get the full 26-move refinement.
const REFINE_MARGIN: f64 = 0.03;
/// Grid circles per band from which refinement starts.
const STARTS: usize = 3;

/// The outcome of a search.
#[derive(Debug, Clone, Serialize)]
pub struct SearchResult {
    /// The circle with the lowest Bishop FS.
    pub critical: CircleResult,
    /// The lowest-FS circle of each depth band, top down.
    pub bands: Vec<BandResult>,
    /// Circles analysed (grid and refinement).
    pub circles_tried: usize,
    /// Circles set aside because their mass would move away from the toe.
    pub circles_rejected: usize,
    /// The fill face as an infinite slope (None: no fill, or a fill with no
    /// strength, which is a load).
    pub face: Option<FaceCheck>,
    /// Clamps and fallbacks met on the way.
    pub diagnostics: Diagnostics,
    /// The FS to compare with a target: the lower of the critical circle's
    /// and the fill face's (`governing_fs()`).
    pub fs_governing: f64,
    /// The mechanism of `fs_governing`: `FACE_MECHANISM` or the critical
    /// circle's band.
    pub mechanism: String,
}

impl SearchResult {
    fn new(critical: CircleResult, bands: Vec<BandResult>, s: &Section, mut diagnostics: Diagnostics) -> Self {
        diagnostics.record_critical(&critical);
        let face = face::check(s);
        let (fs_governing, mechanism) = match face {
            Some(f) if f.fs < critical.fs => (f.fs, FACE_MECHANISM.to_string()),
            _ => (critical.fs, critical.band.clone()),
        };
        SearchResult {
            circles_tried: diagnostics.circles,
            circles_rejected: diagnostics.no_driving_moment,
            critical,
            bands,
            face,
            diagnostics,
            fs_governing,
            mechanism,
        }
    }

    /// Whether the fill face (infinite slope) has a lower FS than the
    /// critical circle.
    pub fn face_governs(&self) -> bool {
        self.face.is_some_and(|f| f.fs < self.critical.fs)
    }

    /// The FS to compare with a target: the lower of the critical circle's
    /// and the fill face's.
    pub fn governing_fs(&self) -> f64 {
        self.fs_governing
    }

    /// The governing mechanism: "fill face (infinite slope)" or the band of
    /// the critical circle.
    pub fn governing_mechanism(&self) -> String {
        self.mechanism.clone()
    }
}

/// Name of the infinite-slope mechanism of the fill face in reports.
pub const FACE_MECHANISM: &str = "fill face (infinite slope)";

/// The best circle of one depth band.
#[derive(Debug, Clone, Serialize)]
pub struct BandResult {
    /// "fill" or the name of the ground layer the circles were tangent in.
    pub band: String,
    pub circle: CircleResult,
}

/// A depth band: tangent elevations from `lo` to `hi` (m, y up).
#[derive(Debug, Clone)]
struct Band {
    name: String,
    lo: f64,
    hi: f64,
}

#[derive(Default)]
struct Counter {
    d: Diagnostics,
    /// The circles analysed so far by their exact coordinates, when kept
    /// (`memoised`): a pattern search moving by one step at a time meets
    /// many of its earlier neighbours again.
    memo: Option<std::collections::HashMap<[u64; 3], Option<CircleResult>>>,
}

impl Counter {
    /// A counter that analyses each circle once: a circle met again (the
    /// same coordinates to the bit) gets its earlier result, which is what
    /// analysing it again would give.
    fn memoised() -> Counter {
        Counter { memo: Some(Default::default()), ..Counter::default() }
    }

    /// Analyse a trial circle, counting its clamps and fallbacks; None
    /// where it cannot be analysed.
    fn eval(&mut self, s: &Section, c: Circle) -> Option<CircleResult> {
        let key = [c.xc_m.to_bits(), c.yc_m.to_bits(), c.r_m.to_bits()];
        if let Some(known) = self.memo.as_ref().and_then(|m| m.get(&key)) {
            return known.clone();
        }
        let r = s.analyse_unnamed(c);
        self.d.record(&r);
        let r = r.ok().filter(|r| r.fs.is_finite() && r.fs > 0.0);
        if let Some(m) = &mut self.memo {
            m.insert(key, r.clone());
        }
        r
    }
}

/// A grid circle: (result, tangent elevation, grid index, tangent index).
type Candidate = (CircleResult, f64, usize, usize);

/// Full search on a section. The grid columns, then every band's starts,
/// then the bands are spread over rayon's pool; ties are broken by grid
/// index and start order, so the answer does not depend on the number of
/// threads.
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
    let columns: Vec<(Vec<Vec<Candidate>>, Counter)> =
        (0..NX).into_par_iter().map(|i| grid.scan(s, &bands, i..i + 1)).collect();
    let mut count = Counter::default();
    let mut best: Vec<Vec<Candidate>> = vec![Vec::new(); bands.len()];
    for (found, c) in columns {
        count.d.merge(&c.d);
        for (k, cands) in found.into_iter().enumerate() {
            for cand in cands {
                keep(&mut best[k], cand);
            }
        }
    }
    let step0 = ((grid.x1 - grid.x0) / (NX - 1) as f64).max((grid.y1 - grid.y0) / (NY - 1) as f64);
    // Every band's starts to a coarse step, all spread over the pool (the
    // bands differ much in work), then each band's best of them to the
    // final step.
    let all = directions().collect::<Vec<_>>();
    let starts: Vec<(usize, Candidate)> =
        best.into_iter().enumerate().flat_map(|(k, list)| list.into_iter().map(move |c| (k, c))).collect();
    let coarse: Vec<(usize, (CircleResult, f64), Counter)> = starts
        .into_par_iter()
        .map(|(k, (r, yt, _, _))| {
            let mut c = Counter::memoised();
            let found = pattern(s, &mut c, (r, yt), &bands[k], step0, 8.0 * MIN_STEP_M, &all, Stride::Keep);
            (k, found, c)
        })
        .collect();
    let mut lowest: Vec<Option<(CircleResult, f64)>> = vec![None; bands.len()];
    for (k, found, c) in coarse {
        count.d.merge(&c.d);
        if lowest[k].as_ref().is_none_or(|l| found.0.fs < l.0.fs) {
            lowest[k] = Some(found);
        }
    }
    let refined_counted: Vec<(Option<BandResult>, Counter)> = lowest
        .into_par_iter()
        .zip(bands.par_iter())
        .map(|(start, band)| {
            let mut c = Counter::memoised();
            let r = start.map(|start| {
                let mut circle = pattern(s, &mut c, start, band, 4.0 * MIN_STEP_M, MIN_STEP_M, &all, Stride::Keep).0;
                s.name_band(&mut circle);
                BandResult { band: band.name.clone(), circle }
            });
            (r, c)
        })
        .collect();
    let mut refined = Vec::new();
    for (r, c) in refined_counted {
        count.d.merge(&c.d);
        refined.extend(r);
    }
    let critical = refined
        .iter()
        .map(|b| &b.circle)
        .min_by(|a, b| a.fs.total_cmp(&b.fs))
        .cloned()
        .ok_or_else(|| Error::Computation("no trial slip circle could be analysed on this section".into()))?;
    Ok(SearchResult::new(critical, refined, s, count.d))
}

/// Search started from the band circles of an earlier search (`seeds`, for
/// example those of the same stage under best-estimate parameters) instead
/// of the grid: from each seed still analysable (or from the circle of the
/// same band in `alternates`, a recent search nearby, when that is lower), a pattern search that
/// starts at the final step, doubles it after every improving move (up to
/// 16 final steps) and halves it when none improves. A seed that is already
/// a minimum at the final step costs one pass and comes back unchanged, so
/// the same section gives exactly the earlier answer. Falls back to the full
/// search when no seed can be analysed. Single-threaded (it is run many at
/// a time). Each circle is analysed once (`Counter::memoised`): the pattern
/// moves one step at a time and meets earlier neighbours again.
pub fn search_from(s: &Section, seeds: &[BandResult], alternates: &[BandResult]) -> Result<SearchResult> {
    let bands = bands(s);
    let all = directions().collect::<Vec<_>>();
    let mut count = Counter::memoised();
    let axes = axis_directions();
    let mut walked: Vec<(&Band, (CircleResult, f64))> = Vec::new();
    for seed in seeds {
        let Some(band) = bands.iter().find(|b| b.name == seed.band) else { continue };
        let other = alternates.iter().find(|a| a.band == seed.band).and_then(|a| count.eval(s, a.circle.circle));
        let start = match (count.eval(s, seed.circle.circle), other) {
            (Some(a), Some(b)) => Some(if b.fs < a.fs { b } else { a }),
            (a, b) => a.or(b),
        };
        let Some(start) = start else { continue };
        let yt = start.circle.yc_m - start.circle.r_m;
        let grow = Stride::GrowTo(16.0 * MIN_STEP_M);
        walked.push((band, pattern(s, &mut count, (start, yt), band, MIN_STEP_M, MIN_STEP_M, &axes, grow)));
    }
    // The 26-move check only where it can matter: bands within
    // `REFINE_MARGIN` of the lowest walked FS.
    let lowest = walked.iter().map(|w| w.1.0.fs).fold(f64::INFINITY, f64::min);
    let mut refined = Vec::new();
    for (band, w) in walked {
        let (mut circle, _) = if w.0.fs <= lowest * (1.0 + REFINE_MARGIN) {
            pattern(s, &mut count, w, band, MIN_STEP_M, MIN_STEP_M, &all, Stride::Keep)
        } else {
            w
        };
        s.name_band(&mut circle);
        refined.push(BandResult { band: band.name.clone(), circle });
    }
    let Some(critical) = refined.iter().map(|b| &b.circle).min_by(|a, b| a.fs.total_cmp(&b.fs)).cloned() else {
        return search(s);
    };
    Ok(SearchResult::new(critical, refined, s, count.d))
}

/// Warm-started search for the planner's trials: `search_from` the band
/// circles of a nearby earlier search (`seeds`, the previous trial's or
/// day's) when they cover every band of this section, the full `search`
/// otherwise. A local search finds a circle at least as low as its start's
/// neighbourhood allows, never the global minimum for certain: its FS may
/// only reject a trial or bracket a search; acceptance rests on `search`.
/// The flag says whether the answer is the full search's.
pub fn search_warm(s: &Section, seeds: &[BandResult]) -> Result<(SearchResult, bool)> {
    if bands(s).iter().all(|b| seeds.iter().any(|seed| seed.band == b.name)) {
        Ok((search_from(s, seeds, &[])?, false))
    } else {
        Ok((search(s)?, true))
    }
}

fn better(a: &Candidate, b: &Candidate) -> bool {
    a.0.fs < b.0.fs || (a.0.fs == b.0.fs && a.2 < b.2)
}

/// Keep the best candidate of each tangent level, at most `STARTS` levels,
/// best first: starts at different depths find distinct local minima (a
/// mid-layer circle and one tangent to the layer's base, say).
fn keep(list: &mut Vec<Candidate>, cand: Candidate) {
    if let Some(i) = list.iter().position(|b| b.3 == cand.3) {
        if !better(&cand, &list[i]) {
            return;
        }
        list.remove(i);
    }
    let pos = list.iter().position(|b| better(&cand, b)).unwrap_or(list.len());
    if pos < STARTS {
        list.insert(pos, cand);
        list.truncate(STARTS);
    }
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
    fn scan(&self, s: &Section, bands: &[Band], cols: std::ops::Range<usize>) -> (Vec<Vec<Candidate>>, Counter) {
        let mut count = Counter::default();
        let mut best: Vec<Vec<Candidate>> = vec![Vec::new(); bands.len()];
        for i in cols {
            let xc = self.x0 + (self.x1 - self.x0) * i as f64 / (NX - 1) as f64;
            for j in 0..NY {
                let yc = self.y0 + (self.y1 - self.y0) * j as f64 / (NY - 1) as f64;
                for (k, &yt) in self.tangents.iter().enumerate() {
                    let Some(r) = count.eval(s, Circle { xc_m: xc, yc_m: yc, r_m: yc - yt }) else {
                        continue;
                    };
                    let cand = (r, yt, (i * NY + j) * self.tangents.len() + k, k);
                    if let Some(band) = band_of(bands, yt) {
                        keep(&mut best[band], cand);
                    }
                }
            }
        }
        (best, count)
    }
}

/// Bands: the fill (when there is some and it is part of the slope; a fill
/// with no strength is a load, and every circle tangent in it would miss
/// the ground) and each ground layer.
fn bands(s: &Section) -> Vec<Band> {
    let mut out = Vec::new();
    if s.crest_m() > 0.2 && !s.fill_is_load() {
        out.push(Band { name: "fill".into(), lo: 0.0, hi: s.crest_m() });
    }
    let x = s.toe_m();
    for l in &s.layers {
        out.push(Band {
            name: l.name.clone(),
            lo: s.elevation_of_depth(x, l.bottom_z),
            hi: s.elevation_of_depth(x, l.top_z),
        });
    }
    out
}

fn band_of(bands: &[Band], yt: f64) -> Option<usize> {
    bands.iter().position(|b| yt >= b.lo - 1e-9 && yt <= b.hi + 1e-9)
}

/// Tangent elevations: two within the fill (none where it is a load), then through the ground at
/// least two per layer (mid-layer and its base, so every band is tried) and
/// the rest spread evenly in depth, NT in all or more.
fn tangent_levels(s: &Section, h: f64) -> Vec<f64> {
    let depth = -s.base_y;
    let mut t = if s.fill_is_load() { Vec::new() } else { vec![0.6 * h, 0.25 * h] };
    let x = s.toe_m();
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

/// How the pattern search changes its step after an improving move.
#[derive(Clone, Copy)]
enum Stride {
    /// Keep the step (a refinement from a coarse start).
    Keep,
    /// Double it, up to this many metres (a walk from a seed circle whose
    /// minimum may have moved some way).
    GrowTo(f64),
}

/// Pattern search in (xc, yc, tangent elevation), tangent kept in its band:
/// each pass tries the moves of `dirs` at the current step, moves to the
/// best improvement, and halves the step when none improves, down to
/// `min_step`. Returns the best circle and its tangent elevation.
///
/// Trial centres lie on a lattice of the smallest step the search uses
/// (every step is that one times a power of two), counted in whole units
/// from the start, and so does the tangent from its latest clamp to the
/// band: a circle met again (the neighbours that two successive centres
/// share, or moves that the band's clamp makes equal) has the same
/// coordinates to the bit, so a memoised `Counter` analyses it once.
#[allow(clippy::too_many_arguments)]
fn pattern(
    s: &Section,
    count: &mut Counter,
    start: (CircleResult, f64),
    band: &Band,
    step: f64,
    min_step: f64,
    dirs: &[[f64; 3]],
    stride: Stride,
) -> (CircleResult, f64) {
    let (mut best, mut best_t) = start;
    let yt = best_t;
    let mut unit = step;
    while 0.5 * unit >= min_step {
        unit *= 0.5;
    }
    let origin = (best.circle.xc_m, best.circle.yc_m);
    let (lo, hi) = (band.lo.max(s.base_y), band.hi);
    // Centre (i, j) and tangent k (in half units from `t_origin`), and the
    // step, in lattice units.
    let (mut i, mut j, mut k, mut t_origin) = (0i64, 0i64, 0i64, yt);
    let mut m = (step / unit).round() as i64;
    let cap = match stride {
        Stride::Keep => m,
        Stride::GrowTo(cap) => ((cap / unit).round() as i64).max(m),
    };
    let at = |n: i64, o: f64| o + n as f64 * unit;
    let tangent = |k: i64, o: f64| (o + k as f64 * 0.5 * unit).clamp(lo, hi);
    while m as f64 * unit >= min_step {
        let mut improved: Option<(CircleResult, [i64; 3], f64)> = None;
        for d in dirs {
            let (ni, nj, nk) = (i + d[0] as i64 * m, j + d[1] as i64 * m, k + d[2] as i64 * m);
            let t = tangent(nk, t_origin);
            let (xc, yc) = (at(ni, origin.0), at(nj, origin.1));
            if yc <= t + 0.1 {
                continue;
            }
            if let Some(r) = count.eval(s, Circle { xc_m: xc, yc_m: yc, r_m: yc - t }) {
                let current = improved.as_ref().map_or(best.fs - 1e-6, |b| b.0.fs);
                if r.fs < current {
                    improved = Some((r, [ni, nj, nk], t));
                }
            }
        }
        match improved {
            Some((better, [ni, nj, nk], t)) => {
                (best, best_t, i, j) = (better, t, ni, nj);
                // A tangent held at the band's limit moves on from there.
                (k, t_origin) = if t != lo && t != hi { (nk, t_origin) } else { (0, t) };
                if let Stride::GrowTo(_) = stride {
                    m = (2 * m).min(cap);
                }
            }
            None => m /= 2,
        }
    }
    (best, best_t)
}

/// The 6 unit moves along the axes (xc, yc, tangent).
fn axis_directions() -> Vec<[f64; 3]> {
    directions().filter(|d| d.iter().map(|v| v.abs()).sum::<f64>() == 1.0).collect()
}

/// The 26 unit moves of a 3 × 3 × 3 stencil.
fn directions() -> impl Iterator<Item = [f64; 3]> {
    (0..27).filter(|&k| k != 13).map(|k| [(k % 3) as f64 - 1.0, ((k / 3) % 3) as f64 - 1.0, (k / 9) as f64 - 1.0])
}
