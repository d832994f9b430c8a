//! Time on site: the working calendar, and the runner that drives the ground
//! response engine through lifts and rests day by day (fill placed only on
//! workable days at the construction rate; consolidation every calendar
//! day). The planner (fastest timetable meeting the FS target) and the check of a proposed
//! sequence build on it.

pub mod assess;
pub mod calendar;
pub mod finish;
pub mod planner;
pub mod record;

use crate::error::{Error, Result};
use crate::response::{Engine, GroundField, State};
use crate::stability::search::{BandResult, SearchResult, search, search_from, search_warm};
use crate::stability::{Diagnostics, Section, fill_load};
use calendar::Calendar;

/// Drives an engine on a calendar.
pub struct Runner<'e, 'p> {
    pub engine: &'e Engine<'p>,
    pub calendar: Calendar,
    rate_m_per_day: f64,
    place_dt: f64,
    rest_dt: f64,
    /// Seed circles by crest height (m): when set, stability is found by
    /// `search_from` the seeds of the nearest height instead of the grid.
    seeds: Vec<(f64, Vec<BandResult>)>,
    /// Results of the latest searches by crest height (m), the second start
    /// of each band in seeded searches: trials at one height from one state
    /// differ little from each other.
    recent: std::cell::RefCell<Vec<(f64, Vec<BandResult>)>>,
    /// Band circles of the latest search (full or warm) at each crest
    /// height (m): the starts of the planner's warm-started trial searches.
    warm: std::cell::RefCell<Vec<(f64, Vec<BandResult>)>>,
    /// Clamps and fallbacks of every slip-circle search run so far.
    diagnostics: std::cell::RefCell<Diagnostics>,
    /// The latest full searches of runners without seeds, by crest height
    /// and ground field (`SEARCHES_KEPT`, newest last): a search is a
    /// function of the two alone, so one asked again of the same numbers
    /// (a stage's end after the trial that accepted its lift, say) is
    /// answered from here, exactly.
    searched: std::cell::RefCell<Vec<(f64, GroundField, SearchResult)>>,
    /// Whether the planner's trials use the full search only (the
    /// reference path the guard-rail tests compare with): off by default,
    /// when a trial is first tried by a warm-started local search
    /// (`trial_stability`) and only the trial that is accepted is
    /// confirmed by the full search.
    pub exhaustive: bool,
    /// Whether plans record report detail (the figures' time series and
    /// profiles, the governing section, the FS at each release); off for
    /// Monte Carlo realisations, which need the timetable only.
    pub detail: bool,
}

/// The states of one rest from a starting state, kept at the rest-grid
/// points reached so far: a trial that rests to any day continues from the
/// latest of them instead of from the start (the planner's searches try
/// many rests from the same state). Exact: `rest_until` steps on the grid.
/// It also remembers the FS of every trial made, so none is made twice,
/// and, for runners without report detail (Monte Carlo realisations), the
/// placement and search of each trial confirmed, so that the lift accepted
/// is not placed and searched a second time.
pub struct RestCache {
    points: std::cell::RefCell<Vec<State>>,
    /// The trials already made from this rest.
    trials: std::cell::RefCell<Vec<Trial>>,
}

/// A planner trial: a lift of `lift_m` started on `day` from a rest.
struct Trial {
    day: i64,
    lift_m: f64,
    /// Its FS: the full search's once confirmed, otherwise the warm
    /// search's.
    fs: f64,
    /// The state at the end of placement while the FS is a warm search's
    /// only (None once confirmed).
    unconfirmed: Option<State>,
    /// The placement and full search that gave `fs`, when kept.
    placed: Option<Box<Placed>>,
}

/// A lift placed from a rest and its full search (a planner trial's).
pub(crate) struct Placed {
    /// The state at the end of placement.
    pub state: State,
    /// First and last working day of placement.
    pub days: (i64, i64),
    /// The full search on `state` (its `governing_fs()` is the trial's FS).
    pub found: SearchResult,
}

impl RestCache {
    pub fn new(start: &State) -> RestCache {
        RestCache { points: std::cell::RefCell::new(vec![start.clone()]), trials: Default::default() }
    }

    /// The FS of a lift of `lift_m` started on `day`, if already tried.
    /// With `full`, the full search's verdict: a trial whose FS was only a
    /// warm search's (one that met the target: the planner keeps no other
    /// unconfirmed) is confirmed first, its FS becoming the full search's.
    pub fn known(&self, r: &Runner, day: i64, lift_m: f64, full: bool, effort: &mut Effort) -> Result<Option<f64>> {
        let mut trials = self.trials.borrow_mut();
        let Some(t) = trials.iter_mut().find(|t| t.day == day && t.lift_m == lift_m) else { return Ok(None) };
        if full && let Some(placed) = t.unconfirmed.take() {
            let f = r.stability(&placed, effort)?.governing_fs();
            t.fs = f;
        }
        Ok(Some(t.fs))
    }

    /// Record the FS of a trial: `placed` is the state at the end of
    /// placement when the FS is only a warm search's (None when it is the
    /// full search's).
    pub fn remember(&self, day: i64, lift_m: f64, fs: f64, placed: Option<State>) {
        self.trials.borrow_mut().push(Trial { day, lift_m, fs, unconfirmed: placed, placed: None });
    }

    /// Record a trial confirmed by the full search `placed.found`, keeping
    /// its placement for `take_placed`.
    pub(crate) fn remember_placed(&self, day: i64, lift_m: f64, placed: Placed) {
        let fs = placed.found.governing_fs();
        self.trials.borrow_mut().push(Trial { day, lift_m, fs, unconfirmed: None, placed: Some(Box::new(placed)) });
    }

    /// The kept placement and search of the lift of `lift_m` started on
    /// `day`, if that trial was made and kept (it is handed over once).
    pub(crate) fn take_placed(&self, day: i64, lift_m: f64) -> Option<Placed> {
        let mut trials = self.trials.borrow_mut();
        let t = trials.iter_mut().find(|t| t.day == day && t.lift_m == lift_m)?;
        t.placed.take().map(|p| *p)
    }

    /// The state after resting from the start until `day` (not before the
    /// start's own day).
    pub fn at(&self, r: &Runner, day: i64) -> State {
        let mut points = self.points.borrow_mut();
        let until = day as f64;
        let k = points.partition_point(|s| s.day <= until + 1e-9).max(1) - 1;
        let mut s = points[k].clone();
        let grid = r.grid_at_or_before(until);
        if grid > s.day + 1e-9 {
            r.rest_to(&mut s, grid, &mut |_| {});
            points.insert(k + 1, s.clone());
        }
        r.rest_to(&mut s, until, &mut |_| {});
        s
    }
}

/// Full searches kept for exact reuse by a runner (`Runner::stability`).
const SEARCHES_KEPT: usize = 4;

/// Counters for the benchmark report.
#[derive(Debug, Clone, Copy, Default, serde::Serialize)]
pub struct Effort {
    /// Full slip-circle searches run (grid and refinement, or the seeded
    /// search of a Monte Carlo realisation).
    pub stability_searches: usize,
    /// Warm-started local searches run by the planner's trials (each one
    /// only rejects a trial or brackets a search).
    pub warm_searches: usize,
    /// Consolidation time steps taken (trials included).
    pub consolidation_steps: usize,
}

impl<'e, 'p> Runner<'e, 'p> {
    pub fn new(engine: &'e Engine<'p>) -> Self {
        let p = engine.project;
        Runner {
            engine,
            calendar: Calendar::new(p.info.start_date, &p.construction),
            rate_m_per_day: p.construction.placement_rate_m_per_day,
            place_dt: p.analysis.placement_step_days,
            rest_dt: p.analysis.rest_step_days,
            seeds: Vec::new(),
            recent: Default::default(),
            warm: Default::default(),
            diagnostics: Default::default(),
            searched: Default::default(),
            exhaustive: false,
            detail: true,
        }
    }

    /// A runner for one Monte Carlo realisation: slip-circle searches start
    /// from `seeds` (band circles by crest height, m) rather than from the
    /// full grid, and plans record no figures.
    pub fn for_realisation(engine: &'e Engine<'p>, seeds: Vec<(f64, Vec<BandResult>)>) -> Self {
        Runner { seeds, detail: false, ..Runner::new(engine) }
    }

    /// Let the ground consolidate with no change of height until day `day`.
    /// Rest steps end on a fixed grid of multiples of the rest step (and at
    /// `day`), so a rest continued from any grid point reached earlier gives
    /// exactly the state of one uninterrupted rest.
    pub fn rest_until(&self, st: &mut State, day: i64, rec: &mut dyn FnMut(&State)) {
        self.rest_to(st, day as f64, rec);
    }

    fn rest_to(&self, st: &mut State, until: f64, rec: &mut dyn FnMut(&State)) {
        let h = st.height_m;
        while st.day < until - 1e-9 {
            let next_grid = self.grid_after(st.day);
            let end = next_grid.min(until);
            self.engine.advance(st, end - st.day, h);
            st.day = end;
            rec(st);
        }
    }

    /// The first rest-grid point after day `t`.
    fn grid_after(&self, t: f64) -> f64 {
        ((t + 1e-9) / self.rest_dt).floor() * self.rest_dt + self.rest_dt
    }

    /// The last rest-grid point at or before day `t`.
    fn grid_at_or_before(&self, t: f64) -> f64 {
        ((t + 1e-9) / self.rest_dt).floor() * self.rest_dt
    }

    /// Raise (or lower, for a negative `change_m`) the crest by `change_m`
    /// from the first workable day at or after the state's day. Returns the
    /// first and last working day used.
    pub fn place(&self, st: &mut State, change_m: f64, rec: &mut dyn FnMut(&State)) -> Result<(i64, i64)> {
        let today = st.day.ceil() as i64;
        let first = self.next_workable(today)?;
        self.rest_until(st, first, rec);
        let target = st.height_m + change_m;
        let sign = change_m.signum();
        let mut day = first;
        let mut last = first;
        let substeps = (1.0 / self.place_dt).ceil() as usize;
        let dt = 1.0 / substeps as f64;
        while (target - st.height_m) * sign > 1e-9 {
            if self.calendar.workable(day) {
                last = day;
                for _ in 0..substeps {
                    let rise = (self.rate_m_per_day * dt).min((target - st.height_m).abs());
                    let h = st.height_m + sign * rise;
                    self.engine.advance(st, dt, h);
                }
            } else {
                self.engine.advance(st, 1.0, st.height_m);
            }
            rec(st);
            day += 1;
            if day > self.calendar.horizon() {
                return Err(Error::Computation("placement ran past the 40-year calendar horizon".into()));
            }
        }
        st.height_m = target;
        Ok((first, last))
    }

    /// Rest until `date`, then raise the crest by `thickness_m` (a stage
    /// of a timetable or of a proposed sequence, replayed).
    pub fn place_on(&self, st: &mut State, date: chrono::NaiveDate, thickness_m: f64) -> Result<(i64, i64)> {
        self.rest_until(st, self.calendar.day_of(date), &mut |_| {});
        self.place(st, thickness_m, &mut |_| {})
    }

    /// First workable day at or after `day`.
    pub fn next_workable(&self, day: i64) -> Result<i64> {
        self.calendar.next_workable(day).ok_or_else(|| {
            Error::Computation(
                "no workable day left within the 40-year calendar horizon; check working_days and holidays".into(),
            )
        })
    }

    /// Critical slip circle of the section in its current state (compare
    /// its `governing_fs()` with a target: it includes the fill face).
    /// A search asked again of the same crest height and ground field
    /// (bit for bit) is answered from the latest ones kept, not run again
    /// (nor counted again in `effort` or the diagnostics, which count the
    /// searches run).
    pub fn stability(&self, st: &State, effort: &mut Effort) -> Result<SearchResult> {
        let field = self.engine.field(st);
        let h = st.height_m;
        let reusable = self.seeds.is_empty();
        if reusable {
            let kept = self.searched.borrow();
            if let Some((_, _, found)) =
                kept.iter().rev().find(|(k, f, _)| k.to_bits() == h.to_bits() && same_field(f, &field))
            {
                // The warm trials' seeds at this height are this search's
                // bands again, as when it was run.
                self.remember_bands(h, &found.bands);
                return Ok(found.clone());
            }
        }
        let mut found = self.stability_uncounted(st, &field, effort)?;
        if fill_load::applies(self.engine.project) {
            found = fill_load::lower_search(self.engine.project, h, &field, found)?;
        }
        self.diagnostics.borrow_mut().merge(&found.diagnostics);
        self.remember_bands(h, &found.bands);
        if reusable {
            let mut kept = self.searched.borrow_mut();
            if kept.len() == SEARCHES_KEPT {
                kept.remove(0);
            }
            kept.push((h, field, found.clone()));
        }
        Ok(found)
    }

    /// A planner trial's search (compare its `governing_fs()`, as
    /// `stability`'s) and whether it is
    /// the full search's (`true`) or a warm-started local search's from
    /// the band circles of the latest search at the nearest crest height
    /// (`false`). A warm FS is an upper bound on what the full search could
    /// confirm only in the sense that its circle is real: a trial whose
    /// warm FS misses the target is rejected, one that meets it must still
    /// be confirmed by `stability` before it is accepted. The full search
    /// is used directly when `exhaustive` is set, for Monte Carlo
    /// realisations (already seeded), for a fill taken as a load (two
    /// idealisations per search) and when no search has run yet.
    pub fn trial_stability(&self, st: &State, effort: &mut Effort) -> Result<(SearchResult, bool)> {
        let h = st.height_m;
        let seeds = {
            let warm = self.warm.borrow();
            warm.iter().min_by(|a, b| (a.0 - h).abs().total_cmp(&(b.0 - h).abs())).map(|w| w.1.clone())
        };
        let direct = self.exhaustive || !self.seeds.is_empty() || fill_load::applies(self.engine.project);
        let Some(seeds) = seeds.filter(|_| !direct) else {
            return Ok((self.stability(st, effort)?, true));
        };
        let field = self.engine.field(st);
        let (found, full) = search_warm(&Section::new(self.engine.project, h, &field), &seeds)?;
        if full {
            effort.stability_searches += 1;
        } else {
            effort.warm_searches += 1;
        }
        self.diagnostics.borrow_mut().merge(&found.diagnostics);
        self.remember_bands(h, &found.bands);
        Ok((found, full))
    }

    /// Keep `bands` as the latest band circles at crest height `h_m` (for
    /// the runners whose trials start warm).
    fn remember_bands(&self, h_m: f64, bands: &[BandResult]) {
        if self.exhaustive || !self.seeds.is_empty() {
            return;
        }
        let mut warm = self.warm.borrow_mut();
        match warm.iter().position(|w| (w.0 - h_m).abs() < 1e-9) {
            Some(k) => warm[k].1 = bands.to_vec(),
            None => warm.push((h_m, bands.to_vec())),
        }
    }

    /// Warnings for every clamp and fallback met by the searches so far.
    pub fn stability_warnings(&self) -> Vec<String> {
        self.diagnostics.borrow().warnings()
    }

    /// The clamps and fallbacks met by the searches so far.
    pub fn stability_diagnostics(&self) -> Diagnostics {
        *self.diagnostics.borrow()
    }

    fn stability_uncounted(&self, st: &State, field: &GroundField, effort: &mut Effort) -> Result<SearchResult> {
        effort.stability_searches += 1;
        let section = Section::new(self.engine.project, st.height_m, field);
        let h = st.height_m;
        let nearest = self.seeds.iter().min_by(|a, b| (a.0 - h).abs().total_cmp(&(b.0 - h).abs()));
        let Some((_, seeds)) = nearest else { return search(&section) };
        let mut recent = self.recent.borrow_mut();
        let at = recent.iter().position(|r| (r.0 - h).abs() < 1e-9);
        let found = search_from(&section, seeds, at.map_or(&[][..], |k| &recent[k].1))?;
        match at {
            Some(k) => recent[k].1.clone_from(&found.bands),
            None => recent.push((h, found.bands.clone())),
        }
        Ok(found)
    }

    /// Critical slip circle searched from the given band circles only (the
    /// same stage of an earlier plan, say).
    pub fn stability_from(&self, st: &State, seeds: &[BandResult], effort: &mut Effort) -> Result<SearchResult> {
        effort.stability_searches += 1;
        let field = self.engine.field(st);
        let found = search_from(&Section::new(self.engine.project, st.height_m, &field), seeds, &[])?;
        let found = fill_load::lower_search(self.engine.project, st.height_m, &field, found)?;
        self.diagnostics.borrow_mut().merge(&found.diagnostics);
        Ok(found)
    }
}

/// Whether two ground fields hold the same numbers, bit for bit (every
/// field of `GroundField` named, so that one added later must be compared).
fn same_field(a: &GroundField, b: &GroundField) -> bool {
    let GroundField { xs, zs, su, settlement_m } = a;
    let bits = |p: &[f64], q: &[f64]| p.len() == q.len() && p.iter().zip(q).all(|(x, y)| x.to_bits() == y.to_bits());
    bits(xs, &b.xs)
        && bits(zs, &b.zs)
        && bits(settlement_m, &b.settlement_m)
        && su.len() == b.su.len()
        && su.iter().zip(&b.su).all(|(p, q)| bits(p, q))
}
