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
use crate::response::{Engine, State};
use crate::stability::search::{BandResult, SearchResult, search, search_from};
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
    /// Clamps and fallbacks of every slip-circle search run so far.
    diagnostics: std::cell::RefCell<Diagnostics>,
    /// Whether plans record report detail (the figures' time series and
    /// profiles, the governing section, the FS at each release); off for
    /// Monte Carlo realisations, which need the timetable only.
    pub detail: bool,
}

/// The states of one rest from a starting state, kept at the rest-grid
/// points reached so far: a trial that rests to any day continues from the
/// latest of them instead of from the start (the planner's searches try
/// many rests from the same state). Exact: `rest_until` steps on the grid.
/// It also remembers the FS of every trial made, so none is made twice.
pub struct RestCache {
    points: std::cell::RefCell<Vec<State>>,
    /// FS of the trials already made from this rest: (start day, lift m, FS).
    trials: std::cell::RefCell<Vec<(i64, f64, f64)>>,
}

impl RestCache {
    pub fn new(start: &State) -> RestCache {
        RestCache { points: std::cell::RefCell::new(vec![start.clone()]), trials: Default::default() }
    }

    /// The FS of a lift of `lift_m` started on `day`, if already tried.
    pub fn known(&self, day: i64, lift_m: f64) -> Option<f64> {
        self.trials.borrow().iter().find(|t| t.0 == day && t.1 == lift_m).map(|t| t.2)
    }

    /// Record the FS of a trial.
    pub fn remember(&self, day: i64, lift_m: f64, fs: f64) {
        self.trials.borrow_mut().push((day, lift_m, fs));
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

/// Counters for the benchmark report.
#[derive(Debug, Clone, Copy, Default, serde::Serialize)]
pub struct Effort {
    /// Full slip-circle searches run.
    pub stability_searches: usize,
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
            diagnostics: Default::default(),
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
    pub fn stability(&self, st: &State, effort: &mut Effort) -> Result<SearchResult> {
        let mut found = self.stability_uncounted(st, effort)?;
        if fill_load::applies(self.engine.project) {
            // The ground field again only for a fill taken as a load: the
            // planner's hot path pays nothing otherwise.
            let field = self.engine.field(st);
            found = fill_load::lower_search(self.engine.project, st.height_m, &field, found)?;
        }
        self.diagnostics.borrow_mut().merge(&found.diagnostics);
        Ok(found)
    }

    /// Warnings for every clamp and fallback met by the searches so far.
    pub fn stability_warnings(&self) -> Vec<String> {
        self.diagnostics.borrow().warnings()
    }

    /// The clamps and fallbacks met by the searches so far.
    pub fn stability_diagnostics(&self) -> Diagnostics {
        *self.diagnostics.borrow()
    }

    fn stability_uncounted(&self, st: &State, effort: &mut Effort) -> Result<SearchResult> {
        effort.stability_searches += 1;
        let field = self.engine.field(st);
        let section = Section::new(self.engine.project, st.height_m, &field);
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
