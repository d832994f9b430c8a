//! Time on site: the working calendar, and the runner that drives the ground
//! response engine through lifts and rests day by day (fill placed only on
//! workable days at the construction rate; consolidation every calendar
//! day). The planner (fastest safe timetable) and the check of a proposed
//! sequence build on it.

pub mod assess;
pub mod calendar;
pub mod planner;
pub mod record;

use crate::error::{Error, Result};
use crate::response::{Engine, State};
use crate::stability::Section;
use crate::stability::search::{BandResult, SearchResult, search, search_from};
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
    /// Whether plans record the data of the report's figures (time series,
    /// profiles, the governing section); off for Monte Carlo realisations.
    pub figures: bool,
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
            figures: true,
        }
    }

    /// A runner for one Monte Carlo realisation: slip-circle searches start
    /// from `seeds` (band circles by crest height, m) rather than from the
    /// full grid, and plans record no figures.
    pub fn for_realisation(engine: &'e Engine<'p>, seeds: Vec<(f64, Vec<BandResult>)>) -> Self {
        Runner { seeds, figures: false, ..Runner::new(engine) }
    }

    /// Let the ground consolidate with no change of height until day `day`.
    pub fn rest_until(&self, st: &mut State, day: i64, rec: &mut dyn FnMut(&State)) {
        let h = st.height_m;
        while st.day < day as f64 - 1e-9 {
            let dt = self.rest_dt.min(day as f64 - st.day);
            self.engine.advance(st, dt, h);
            rec(st);
        }
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

    /// First workable day at or after `day`.
    pub fn next_workable(&self, day: i64) -> Result<i64> {
        self.calendar.next_workable(day).ok_or_else(|| {
            Error::Computation(
                "no workable day left within the 40-year calendar horizon; check working_days and holidays".into(),
            )
        })
    }

    /// Critical slip circle of the section in its current state.
    pub fn stability(&self, st: &State, effort: &mut Effort) -> Result<SearchResult> {
        effort.stability_searches += 1;
        let field = self.engine.field(st);
        let section = Section::new(self.engine.project, st.height_m, &field);
        let nearest = self.seeds.iter().min_by(|a, b| (a.0 - st.height_m).abs().total_cmp(&(b.0 - st.height_m).abs()));
        match nearest {
            Some((_, seeds)) => search_from(&section, seeds),
            None => search(&section),
        }
    }
}
