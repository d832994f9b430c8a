//! One section's works fitted into the shared resources: working platform,
//! drain installation, then the lifts and the surcharge removal, each
//! booked in the ledger on the working days it uses. Every lift is chosen
//! by the section's own planner (`planner::next_lift_after`) from the
//! ground state on the day it actually starts: when the resources refuse a
//! lift, the lift is not moved as it is but asked for again from a later
//! earliest day, so the engine decides afresh how thick it may be after
//! the longer rest (and the FS at its end is at or above the target by
//! the planner's own check). Placement is never slowed.

use super::ledger::{Ledger, Need};
use super::quantities::{self, Volumes};
use crate::error::{Error, Result};
use crate::response::State;
use crate::schedule::planner;
use crate::schedule::{Effort, Runner};
use chrono::NaiveDate;
use serde::Serialize;

/// What a placement does.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Kind {
    Platform,
    Drains,
    Lift,
    /// A lift that takes the crest above the design height.
    Surcharge,
    Removal,
}

impl Kind {
    /// Key used in CSV and JSON.
    pub fn key(self) -> &'static str {
        match self {
            Kind::Platform => "platform",
            Kind::Drains => "drains",
            Kind::Lift => "lift",
            Kind::Surcharge => "surcharge",
            Kind::Removal => "removal",
        }
    }
}

/// One booked piece of work of a section.
#[derive(Debug, Clone, Serialize)]
pub struct Work {
    pub kind: Kind,
    /// 1-based stage number for lifts and removal (None for platform and
    /// drains).
    pub stage: Option<usize>,
    /// First and last working day.
    pub start: NaiveDate,
    pub end: NaiveDate,
    /// Change of crest height, m (0 for platform and drains).
    pub thickness_m: f64,
    pub height_after_m: f64,
    /// FS at the end of the stage (None for platform and drains).
    pub fs_end: Option<f64>,
    /// The mechanism that gives `fs_end`: the fill face or the band of the
    /// critical circle (None for platform and drains).
    pub mechanism: Option<String>,
    /// Fill brought in, m³: the change of the fill in place since the end
    /// of the previous stage (so the make-up for settlement during a rest
    /// is booked with the stage that follows it); for a removal only the
    /// make-up, the surcharge taken off being `removed_m3`.
    pub volume: Volumes,
    /// Surcharge fill taken off, m³ (removals only).
    pub removed_m3: f64,
    /// Drain installed, m.
    pub drain_m: f64,
    /// Start of the next stage (the hold point), if any.
    pub release: Option<NaiveDate>,
    /// Working days used, day numbers from the corridor start.
    #[serde(skip)]
    pub days: Vec<i64>,
    /// The ground state at the end of the work (lifts and removal).
    #[serde(skip)]
    pub state: Option<State>,
}

impl Work {
    /// What this work asks of the resources on each of its days.
    pub fn need(&self) -> Need {
        let n = self.days.len().max(1) as f64;
        Need {
            fill_m3: self.volume.total().max(0.0) / n,
            crew: self.kind != Kind::Drains,
            rig: self.kind == Kind::Drains,
        }
    }
}

/// The fixed inputs of one section's scheduling.
pub struct Setup<'a, 'e, 'p> {
    pub runner: &'a Runner<'e, 'p>,
    pub length_m: f64,
    /// Platform thickness, m (0: none; drained sections only).
    pub platform_m: f64,
    /// Drain metres to install and the rig rate, m/day (None: drains taken
    /// as installed before the first lift).
    pub drains: Option<(f64, f64)>,
    /// First day the section may start.
    pub earliest: i64,
}

/// A section's works in order and the state at the end.
#[derive(Debug, Clone)]
pub struct Works {
    pub items: Vec<Work>,
    pub end_state: State,
    pub warnings: Vec<String>,
}

/// Schedule the section into `ledger` (booking as it goes). With `plan`
/// (the same section scheduled without limits), its works are taken over
/// unchanged as long as they fit, and the search resumes at the first that
/// does not: the result equals a search from the start, which would
/// propose the same works up to there.
pub fn schedule(s: &Setup, ledger: &mut Ledger, plan: Option<&Works>) -> Result<Works> {
    let r = s.runner;
    let mut items: Vec<Work> = Vec::new();
    let mut st = r.engine.initial_state();
    let mut earliest = s.earliest;
    let planned = plan.map_or(&[][..], |p| &p.items[..]);
    let prep = planned.iter().take_while(|w| matches!(w.kind, Kind::Platform | Kind::Drains)).count();
    // Take over the planned works while they fit; the preparation only
    // whole (platform and drains use different days, so each is checked
    // on its own).
    if planned[..prep].iter().all(|w| ledger.fits_all(&w.days, w.need())) {
        for (i, w) in planned.iter().enumerate() {
            if i >= prep && !ledger.fits_all(&w.days, w.need()) {
                break;
            }
            ledger.book(&w.days, w.need());
            earliest = next_after(r, w);
            if let Some(after) = &w.state {
                st = after.clone();
            }
            items.push(w.clone());
        }
    }
    if items.is_empty() {
        earliest = prepare(s, ledger, &mut items, s.earliest)?;
    }
    let mut warnings = Vec::new();
    if items.iter().all(|w| w.kind != Kind::Removal) {
        lifts(s, ledger, &mut items, &mut st, earliest)?;
        removal(s, ledger, &mut items, &mut st, &mut warnings)?;
    }
    set_releases(&mut items);
    Ok(Works { items, end_state: st, warnings })
}

/// The earliest day the next work may start after `w`.
fn next_after(r: &Runner, w: &Work) -> i64 {
    let last = w.days.last().copied().unwrap_or(0);
    match w.kind {
        Kind::Lift | Kind::Surcharge => last + 1 + r.engine.project.construction.min_rest_days as i64,
        _ => last + 1,
    }
}

/// Platform, then drains, each in the first window that fits; returns the
/// first day a lift may start.
fn prepare(s: &Setup, ledger: &mut Ledger, items: &mut Vec<Work>, earliest: i64) -> Result<i64> {
    let r = s.runner;
    let e = &r.engine.project.embankment;
    let mut earliest = earliest;
    if s.platform_m > 0.0 {
        let rate = r.engine.project.construction.placement_rate_m_per_day;
        let n = (s.platform_m / rate - 1e-9).ceil().max(1.0) as usize;
        let volume = quantities::platform(e, s.platform_m).times(s.length_m);
        let need = Need { fill_m3: volume.total() / n as f64, crew: true, rig: false };
        let days = fit_window(r, ledger, earliest, n, need)?;
        items.push(work(r, Kind::Platform, days, volume, 0.0)?);
        earliest = next_after(r, items.last().expect("just pushed"));
    }
    if let Some((metres, rate)) = s.drains {
        let n = (metres / rate - 1e-9).ceil().max(1.0) as usize;
        let days = fit_window(r, ledger, earliest, n, Need { fill_m3: 0.0, crew: false, rig: true })?;
        items.push(work(r, Kind::Drains, days, Volumes::default(), metres)?);
        earliest = next_after(r, items.last().expect("just pushed"));
    }
    for w in items.iter() {
        ledger.book(&w.days, w.need());
    }
    Ok(earliest)
}

fn work(r: &Runner, kind: Kind, days: Vec<i64>, volume: Volumes, drain_m: f64) -> Result<Work> {
    let (a, b) = (days[0], days[days.len() - 1]);
    Ok(Work {
        kind,
        stage: None,
        start: r.calendar.date(a)?,
        end: r.calendar.date(b)?,
        thickness_m: 0.0,
        height_after_m: 0.0,
        fs_end: None,
        mechanism: None,
        volume,
        removed_m3: 0.0,
        drain_m,
        release: None,
        days,
        state: None,
    })
}

/// The first `n` workable days from `from` on, if within the horizon.
fn window(r: &Runner, from: i64, n: usize) -> Result<Vec<i64>> {
    let mut days = Vec::with_capacity(n);
    let mut d = from;
    while days.len() < n {
        d = r.next_workable(d)?;
        days.push(d);
        d += 1;
    }
    Ok(days)
}

/// The earliest window of `n` workable days from `from` on whose every day
/// fits `need`. A window that fails on day f is followed by one starting
/// after f (every window starting at or before f holds f).
fn fit_window(r: &Runner, ledger: &Ledger, from: i64, n: usize, need: Need) -> Result<Vec<i64>> {
    let most = ledger.most_capacity();
    if need.fill_m3 > most {
        return Err(Error::Computation(format!(
            "a placement needs {:.0} m³ a day at the section's placement rate, more than the whole supply ({most:.0} m³ a day); placement is never slowed, so add supply or lower the section's placement rate",
            need.fill_m3
        )));
    }
    let mut d = from;
    loop {
        let days = window(r, d, n)?;
        match days.iter().find(|k| !ledger.fits(**k, need)) {
            None => return Ok(days),
            Some(f) if *f >= super::ledger::DAYS as i64 - 1 => {
                return Err(Error::Computation("the resources cannot take this section within 40 years".into()));
            }
            Some(f) => d = f + 1,
        }
    }
}

/// The lifts, each proposed by the planner from the actual state and
/// earliest day, and asked for again later while it does not fit.
fn lifts(s: &Setup, ledger: &mut Ledger, items: &mut Vec<Work>, st: &mut State, earliest: i64) -> Result<()> {
    let r = s.runner;
    let p = r.engine.project;
    let top = p.max_height_m();
    let mut effort = Effort::default();
    let mut earliest = earliest;
    let mut last_rest = 0;
    while st.height_m < top - 1e-6 {
        let (lift_earliest, w) = loop {
            let (day, lift, rested) = planner::next_lift_after(r, st, earliest, last_rest, &mut effort)?;
            let w = placed(s, items, st, &rested, lift)?;
            if ledger.fits_all(&w.days, w.need()) {
                break (earliest, w);
            }
            earliest = fit_window(r, ledger, day + 1, w.days.len(), w.need())?[0];
        };
        last_rest = w.days[0] - lift_earliest;
        ledger.book(&w.days, w.need());
        let mut w = w;
        let after = w.state.as_ref().expect("lifts carry their state");
        let at_end = r.stability(after, &mut effort)?;
        (w.fs_end, w.mechanism) = (Some(at_end.governing_fs()), Some(at_end.governing_mechanism()));
        earliest = next_after(r, &w);
        *st = after.clone();
        items.push(w);
    }
    Ok(())
}

/// A lift of `change_m` (negative: removal) placed from `from` (the state
/// on its first day; `prev` is the state at the end of the previous
/// stage): its days, volumes and the state at its end.
fn placed(s: &Setup, items: &[Work], prev: &State, from: &State, change_m: f64) -> Result<Work> {
    let r = s.runner;
    let e = &r.engine.project.embankment;
    let mut after = from.clone();
    let (a, b) = r.place(&mut after, change_m, &mut |_| {})?;
    let days: Vec<i64> = (a..=b).filter(|k| r.calendar.workable(*k)).collect();
    let mut volume =
        quantities::of_state(r.engine, &after).minus(quantities::of_state(r.engine, prev)).times(s.length_m);
    let removed_m3 = (-volume.surcharge_m3).max(0.0);
    volume.surcharge_m3 += removed_m3;
    if prev.placed_m <= 1e-9 && s.platform_m > 0.0 {
        // The platform already placed is the bottom of the first lift.
        volume.design_m3 -= quantities::platform(e, s.platform_m).times(s.length_m).platform_m3;
    }
    let kind = match () {
        _ if change_m < 0.0 => Kind::Removal,
        _ if after.height_m > e.design_height_m + 1e-9 => Kind::Surcharge,
        _ => Kind::Lift,
    };
    let stage = items.iter().filter(|w| w.stage.is_some()).count() + 1;
    Ok(Work {
        kind,
        stage: Some(stage),
        start: r.calendar.date(a)?,
        end: r.calendar.date(b)?,
        thickness_m: change_m,
        height_after_m: after.height_m,
        fs_end: None,
        mechanism: None,
        volume,
        removed_m3,
        drain_m: 0.0,
        release: None,
        days,
        state: Some(after),
    })
}

/// The surcharge removal: on the first day the section's removal criterion
/// holds and a crew is free.
fn removal(
    s: &Setup,
    ledger: &mut Ledger,
    items: &mut Vec<Work>,
    st: &mut State,
    warn: &mut Vec<String>,
) -> Result<()> {
    let r = s.runner;
    let p = r.engine.project;
    if p.embankment.surcharge_height_m <= 0.0 {
        return Ok(());
    }
    let mut earliest = items.last().map_or(s.earliest, |w| next_after(r, w));
    // Secondary compression is counted from the first fill placed.
    let loading = items.iter().find(|w| w.kind != Kind::Drains).map_or(0.0, |w| w.days[0] as f64);
    let w = loop {
        warn.clear();
        let day = crate::schedule::finish::removal_day(r, st, earliest, loading, warn)?;
        let mut rested = st.clone();
        r.rest_until(&mut rested, day, &mut |_| {});
        let w = placed(s, items, st, &rested, -p.embankment.surcharge_height_m)?;
        if ledger.fits_all(&w.days, w.need()) {
            break w;
        }
        earliest = fit_window(r, ledger, day + 1, w.days.len(), w.need())?[0];
    };
    ledger.book(&w.days, w.need());
    let mut w = w;
    let after = w.state.clone().expect("removal carries its state");
    let at_end = r.stability(&after, &mut Effort::default())?;
    (w.fs_end, w.mechanism) = (Some(at_end.governing_fs()), Some(at_end.governing_mechanism()));
    *st = after;
    items.push(w);
    Ok(())
}

/// Each stage's release (hold point) is the start of the next stage.
fn set_releases(items: &mut [Work]) {
    let starts: Vec<(usize, NaiveDate)> =
        items.iter().enumerate().filter(|(_, w)| w.stage.is_some()).map(|(i, w)| (i, w.start)).collect();
    for pair in starts.windows(2) {
        items[pair[0].0].release = Some(pair[1].1);
    }
}
