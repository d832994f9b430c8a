//! The planner: the fastest lift timetable that meets the FS target. From
//! the current state it takes the thickest lift (minimum to maximum, in the
//! configured increment) whose factor of safety at the end of placement
//! meets the construction target; if even the thinnest lift falls below the
//! target it rests for the shortest whole number of days after which it
//! meets it. ("Meets the target" is a computed prediction, never a
//! statement that a lift is safe: the engineer of record releases each one.) FS falls monotonically with
//! lift thickness and rises with rest (strength only grows as excess pore
//! pressure dissipates), so both searches bisect rather than try every
//! value. After design height plus surcharge it holds until the removal
//! criterion is met and then removes the surcharge.

use super::record::{self, Figures, Governing};
use super::{Effort, Placed, RestCache, Runner};
use crate::error::{Error, Result};
use crate::response::State;
use crate::stability::search::SearchResult;
use chrono::NaiveDate;
use serde::Serialize;

/// Longest rest the planner will consider before declaring the height
/// unreachable, days (about 20 years).
pub const MAX_REST_DAYS: i64 = 7300;

/// What a stage does.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum StageKind {
    Lift,
    SurchargeRemoval,
}

impl StageKind {
    /// Key as in the JSON output (kebab-case), also used in CSV.
    pub fn key(self) -> &'static str {
        match self {
            StageKind::Lift => "lift",
            StageKind::SurchargeRemoval => "surcharge-removal",
        }
    }

    /// Short label for tables.
    pub fn label(self) -> &'static str {
        match self {
            StageKind::Lift => "lift",
            StageKind::SurchargeRemoval => "remove surcharge",
        }
    }
}

/// One stage of the timetable.
#[derive(Debug, Clone, Serialize)]
pub struct Stage {
    /// 1-based stage number.
    pub number: usize,
    pub kind: StageKind,
    /// First and last working day of placement (or removal).
    pub start: NaiveDate,
    pub end: NaiveDate,
    /// Change of crest height, m (negative for removal).
    pub thickness_m: f64,
    /// Crest height above OGL after the stage, m.
    pub height_after_m: f64,
    /// Fill thickness as placed after the stage, including make-up, m.
    pub placed_after_m: f64,
    /// FS at the end of placement.
    pub fs_end: f64,
    /// Band (material at the lowest point) of the governing circle.
    pub mechanism: String,
    /// Depth below OGL of the governing circle's lowest point, m.
    pub circle_depth_m: f64,
    /// su at that point, kPa.
    pub su_governing_kpa: f64,
    /// Rest after this stage before the next one starts, days.
    pub rest_days: i64,
    /// Date the next stage may start (the hold point), if any.
    pub release: Option<NaiveDate>,
    /// FS of this section at the release date.
    pub fs_release: Option<f64>,
    /// Largest excess pore pressure at the end of placement, kPa.
    pub peak_excess_kpa: f64,
    /// Average degree of consolidation under the centreline at release (or
    /// at the end of placement for the last stage), 0–1.
    pub degree_centre: f64,
    /// Centreline settlement at release (or end), m.
    pub settlement_centre_m: f64,
    /// Fill cross-section areas of the section at the end of the stage
    /// (cumulative; the make-up is the fill in the settlement trough then),
    /// m³ per metre run. A lift's own quantities are the differences from
    /// the stage before. None in plans without report detail (Monte Carlo
    /// realisations, which need the timetable only).
    pub fill_after_m3_per_m: Option<crate::load::FillAreas>,
    /// The governing circle at the end of placement.
    #[serde(skip)]
    pub critical: Option<SearchResult>,
}

/// The planned timetable and its totals.
#[derive(Debug, Clone, Serialize)]
pub struct Plan {
    pub stages: Vec<Stage>,
    /// Last working day of the works.
    pub finish: NaiveDate,
    /// Calendar days from the project start to the finish.
    pub duration_days: i64,
    /// How the intermediate stages were shaped.
    pub stage_shape: crate::model::StageShape,
    /// Centreline settlement on the last day of the works, m.
    pub settlement_at_finish_m: f64,
    /// Centreline primary settlement once the final profile (final crest
    /// plus the make-up its own settlement needs) has fully consolidated,
    /// m (`settlement::final_primary`).
    pub final_primary_settlement_m: f64,
    /// Settlement still to come in the design life after the finish:
    /// remaining primary plus secondary compression, m.
    pub residual_settlement_m: f64,
    /// Its parts: final primary − settlement at finish, and secondary
    /// compression from the end of primary (Mesri's convention), m.
    pub residual_primary_m: f64,
    pub residual_secondary_m: f64,
    /// Date the centreline degree of consolidation reaches 95% (end of
    /// primary), when within the design life.
    pub end_of_primary: Option<NaiveDate>,
    /// Lowest FS at the end of any stage and that stage's number.
    pub min_fs: f64,
    pub min_fs_stage: usize,
    /// Fill volumes per metre run, m³/m: the design profile, the make-up
    /// in the settlement trough at the finish, and the surcharge (removed).
    pub volume_design_m3_per_m: f64,
    pub volume_makeup_m3_per_m: f64,
    pub volume_surcharge_m3_per_m: f64,
    /// FS at the finish against the service target.
    pub fs_finish: f64,
    pub effort: Effort,
    /// Warnings that do not stop the plan.
    pub warnings: Vec<String>,
    /// Data for the report's figures (not part of the JSON output).
    #[serde(skip)]
    pub figures: Figures,
}

/// Plan the project from its initial state.
pub fn plan(r: &Runner) -> Result<Plan> {
    plan_with_progress(r, &mut |_| {})
}

/// `plan`, reporting progress as the fraction of the final height reached
/// (0–1) after each stage.
pub fn plan_with_progress(r: &Runner, progress: &mut dyn FnMut(f64)) -> Result<Plan> {
    plan_from(r, r.engine.initial_state(), 0, progress)
}

/// Plan the remaining stages from state `start` (for example today's
/// calibrated state at a hold point), the next lift starting no earlier
/// than day `earliest`. Stages are numbered from 1. A target that cannot be
/// reached is an `Error::Computation` saying why (`plan_or_reach` also
/// gives how far it can go).
pub fn plan_from(r: &Runner, start: State, earliest: i64, progress: &mut dyn FnMut(f64)) -> Result<Plan> {
    match plan_or_reach(r, start, earliest, progress)? {
        Planned::Built(plan) => Ok(*plan),
        Planned::Unbuildable(u) => Err(Error::Computation(u.reason)),
    }
}

/// A plan to the target, or how far the target can be approached.
#[derive(Debug, Clone)]
pub enum Planned {
    Built(Box<Plan>),
    Unbuildable(Box<super::finish::Unbuildable>),
}

/// `plan_from`, but when the target height cannot be reached at the FS
/// target the answer is the partial timetable to the highest crest that
/// can be reached, with the mechanism that stops the next lift. Runners
/// without detail (Monte Carlo realisations) get the plain error at once.
pub fn plan_or_reach(r: &Runner, start: State, earliest: i64, progress: &mut dyn FnMut(f64)) -> Result<Planned> {
    let p = r.engine.project;
    let mut st = start.clone();
    let mut effort = Effort::default();
    let mut stages: Vec<Stage> = Vec::new();
    let mut fig = Figures { probes: record::probes(r.engine), ..Figures::default() };
    fig.profile(r.engine, &st, "start".into());
    let top = p.max_height_m();
    let mut earliest = earliest;
    let mut last_rest = 0;
    while st.height_m < top - 1e-6 {
        let (start_day, lift, rested, placed) = match next_lift_placed(r, &st, earliest, last_rest, &mut effort) {
            Ok(next) => next,
            Err(Error::Computation(why)) if r.detail => {
                let thinnest = lift_candidates(r, top - st.height_m).last().copied().unwrap_or(0.0);
                let blocking = super::finish::blocking(r, &st, thinnest, &mut effort)?;
                let plan = finish_plan(r, &start, stages, &st, effort, Vec::new(), fig)?;
                return Ok(Planned::Unbuildable(Box::new(super::finish::Unbuildable::new(r, why, blocking, plan))));
            }
            Err(e) => return Err(e),
        };
        last_rest = start_day - earliest;
        advance_to(r, &mut stages, &mut st, start_day, Some(rested), &mut fig, &mut effort)?;
        let ((a, b), crit) = match placed {
            // The accepted trial placed this lift on this state already and
            // searched it in full (kept only when nothing is recorded).
            Some(p) if !r.detail => {
                st = p.state;
                (p.days, p.found)
            }
            _ => {
                let days = r.place(&mut st, lift, &mut |s| fig.record_if(r, s))?;
                (days, r.stability(&st, &mut effort)?)
            }
        };
        stages.push(stage(r, stages.len() + 1, StageKind::Lift, a, b, lift, &st, crit)?);
        earliest = b + 1 + p.construction.min_rest_days as i64;
        progress(st.height_m / top);
    }
    let mut warnings = Vec::new();
    if p.embankment.surcharge_height_m > 0.0 {
        let loading = super::finish::loading_start_day(r, &start, &stages);
        let start_day = super::finish::removal_day(r, &st, earliest, loading, &mut warnings)?;
        advance_to(r, &mut stages, &mut st, start_day, None, &mut fig, &mut effort)?;
        let change = -p.embankment.surcharge_height_m;
        let (a, b) = r.place(&mut st, change, &mut |s| fig.record_if(r, s))?;
        let crit = r.stability(&st, &mut effort)?;
        stages.push(stage(r, stages.len() + 1, StageKind::SurchargeRemoval, a, b, change, &st, crit)?);
    }
    finish_plan(r, &start, stages, &st, effort, warnings, fig).map(|p| Planned::Built(Box::new(p)))
}

/// The figures' last profile and governing section, then the totals.
fn finish_plan(
    r: &Runner,
    start: &State,
    stages: Vec<Stage>,
    st: &State,
    mut effort: Effort,
    warnings: Vec<String>,
    mut fig: Figures,
) -> Result<Plan> {
    let p = r.engine.project;
    fig.profile(r.engine, st, format!("end {}", stages.last().map_or(p.info.start_date, |s| s.end)));
    if r.detail {
        fig.governing = governing(r, start, &stages, &mut effort)?;
    }
    super::finish::totals(r, start, stages, st, effort, warnings, fig)
}

/// Rest until `start`, recording the days, and close the previous stage's
/// rest (release date, FS and strength profile at release). `rested` is
/// the state at `start` when the lift search already reached it; it is
/// taken as it is when no figures are recorded (it is exactly the state
/// the rest would give: rests step on a fixed grid).
fn advance_to(
    r: &Runner,
    stages: &mut [Stage],
    st: &mut State,
    start: i64,
    rested: Option<State>,
    fig: &mut Figures,
    effort: &mut Effort,
) -> Result<()> {
    match rested {
        Some(s) if !r.detail => *st = s,
        _ => r.rest_until(st, start, &mut |s| fig.record_if(r, s)),
    }
    if let Some(prev) = stages.last_mut() {
        close_rest(r, prev, st, start, effort)?;
        fig.profile(r.engine, st, format!("release after stage {} ({})", prev.number, r.calendar.date(start)?));
    }
    Ok(())
}

/// The section at the lift with the lowest FS, rebuilt by replaying the
/// timetable up to the end of that lift.
fn governing(r: &Runner, start: &State, stages: &[Stage], effort: &mut Effort) -> Result<Option<Governing>> {
    let Some(g) = stages.iter().filter(|s| s.kind == StageKind::Lift).min_by(|a, b| a.fs_end.total_cmp(&b.fs_end))
    else {
        return Ok(None);
    };
    let mut st = start.clone();
    for s in stages.iter().take(g.number) {
        r.place_on(&mut st, s.start, s.thickness_m)?;
    }
    // The stage's own search was made on this state (rests step on a fixed
    // grid, so the replay reaches it exactly).
    let critical = match &g.critical {
        Some(found) => found.critical.clone(),
        None => r.stability(&st, effort)?.critical,
    };
    Ok(Some(Governing { stage: g.number, height_m: st.height_m, field: r.engine.field(&st), critical }))
}

/// The next lift from state `st`: its start day (on or after `earliest`)
/// and its crest-height increment, m.
pub fn next_lift(r: &Runner, st: &State, earliest: i64, effort: &mut Effort) -> Result<(i64, f64)> {
    next_lift_after(r, st, earliest, 0, effort).map(|(day, lift, _)| (day, lift))
}

/// `next_lift` with `last_rest` (days beyond the earliest start that the
/// previous lift waited) as the rest search's first guess, since rests grow
/// gradually from lift to lift; also returns the state on the start day.
pub(crate) fn next_lift_after(
    r: &Runner,
    st: &State,
    earliest: i64,
    last_rest: i64,
    effort: &mut Effort,
) -> Result<(i64, f64, State)> {
    next_lift_placed(r, st, earliest, last_rest, effort).map(|(day, lift, rested, _)| (day, lift, rested))
}

/// `next_lift_after`, with the accepted trial's placement and search when
/// the rest kept them (runners without report detail).
fn next_lift_placed(
    r: &Runner,
    st: &State,
    earliest: i64,
    last_rest: i64,
    effort: &mut Effort,
) -> Result<(i64, f64, State, Option<Placed>)> {
    let candidates = lift_candidates(r, r.engine.project.max_height_m() - st.height_m);
    let rest = RestCache::new(st);
    let (start, lift) = find_next(r, st, &rest, earliest, last_rest, &candidates, effort)?;
    let placed = rest.take_placed(start, lift);
    Ok((start, lift, rest.at(r, start), placed))
}

/// Lift thicknesses to try, thickest first: from min(max lift, remaining)
/// down to the minimum lift in the configured increment; the remainder when
/// less than a minimum lift is left.
pub(super) fn lift_candidates(r: &Runner, remaining: f64) -> Vec<f64> {
    let c = &r.engine.project.construction;
    if remaining <= c.lift_min_m + 1e-9 {
        return vec![remaining];
    }
    let top = c.lift_max_m.min(remaining);
    let mut out = vec![top];
    let mut t = (top / c.lift_increment_m - 1e-9).floor() * c.lift_increment_m;
    while t >= c.lift_min_m - 1e-9 {
        if t < top - 1e-9 {
            out.push(t);
        }
        t -= c.lift_increment_m;
    }
    if out.last().is_some_and(|l| *l > c.lift_min_m + 1e-9) {
        out.push(c.lift_min_m);
    }
    out
}

/// A warm-started trial whose FS is this close to the target is decided by
/// the full search: there the warm and the full search differ by their
/// resolution (a warm search can find a slightly lower neighbour of the
/// full search's circle, or stop short of its minimum), and the decision
/// should be the exhaustive path's. Measured on the demo with every trial
/// searched both ways: warm − full from −0.0001 to +0.00046 (46 trials),
/// so twice the widest gap. Safety does not rest on it: a lift is accepted
/// only on the full search's FS; the border keeps the dates those of the
/// exhaustive path (the guard-rail tests allow a day).
const WARM_BORDER: f64 = 0.001;

/// FS at the end of placing `lift` starting on or after `start`, resting
/// from the state of `rest` until then. With `full` it is the full
/// search's (an acceptance); otherwise it may be a warm-started local
/// search's (`Runner::trial_stability`), good for rejecting and bracketing
/// only.
fn trial(r: &Runner, rest: &RestCache, start: i64, lift: f64, full: bool, effort: &mut Effort) -> Result<f64> {
    if let Some(fs) = rest.known(r, start, lift, full, effort)? {
        return Ok(fs);
    }
    let mut s = rest.at(r, start);
    let days = r.place(&mut s, lift, &mut |_| {})?;
    let target = r.engine.project.criteria.fs_construction;
    let warm = if full { None } else { Some(r.trial_stability(&s, effort)?) };
    // A warm FS clearly below the target rejects, one clearly above waits
    // for confirmation (only the trial accepted needs it); one within
    // `WARM_BORDER` of the target is decided by the full search now, as
    // the exhaustive path would, and never above a lower circle the warm
    // search found (a local search can find one the grid missed: the lower
    // FS is kept).
    let (found, lower) = match warm {
        Some((w, true)) => (w, f64::INFINITY),
        Some((w, false)) if (w.governing_fs() - target).abs() >= WARM_BORDER => {
            let fs = w.governing_fs();
            rest.remember(start, lift, fs, Some(s));
            return Ok(fs);
        }
        Some((w, false)) => (r.stability(&s, effort)?, w.governing_fs()),
        None => (r.stability(&s, effort)?, f64::INFINITY),
    };
    let fs = found.governing_fs().min(lower);
    if !r.detail && fs == found.governing_fs() {
        // Nothing is recorded during placement without report detail: if
        // this lift is accepted, its placement and search are the stage's.
        rest.remember_placed(start, lift, Placed { state: s, days, found });
    } else {
        rest.remember(start, lift, fs, None);
    }
    Ok(fs)
}

/// Start day and thickness of the next lift: the earliest day on which the
/// thinnest candidate is safe, then the thickest candidate safe that day.
/// The searches run on the trials' provisional FS (warm searches reject
/// and bracket); the lift found is then confirmed by the full search, and
/// when the full search rejects it the search runs again with that trial
/// now known to be unsafe. Each round confirms a new trial, so it ends.
fn find_next(
    r: &Runner,
    st: &State,
    rest: &RestCache,
    earliest: i64,
    last_rest: i64,
    cands: &[f64],
    effort: &mut Effort,
) -> Result<(i64, f64)> {
    let target = r.engine.project.criteria.fs_construction;
    loop {
        let (day, lift) = find_provisional(r, st, rest, earliest, last_rest, cands, effort)?;
        if trial(r, rest, day, lift, true, effort)? >= target {
            return Ok((day, lift));
        }
    }
}

/// `find_next` on the trials' provisional FS.
fn find_provisional(
    r: &Runner,
    st: &State,
    rest: &RestCache,
    earliest: i64,
    last_rest: i64,
    cands: &[f64],
    effort: &mut Effort,
) -> Result<(i64, f64)> {
    let target = r.engine.project.criteria.fs_construction;
    let last = cands.len() - 1;
    let first = r.next_workable(earliest.max(st.day.ceil() as i64))?;
    let safe = |i: usize, day: i64, effort: &mut Effort| -> Result<bool> {
        Ok(trial(r, rest, day, cands[i], false, effort)? >= target)
    };
    if safe(last, first, effort)? {
        // Lift-limited: the thickest safe candidate on the first day.
        if last == 0 || safe(0, first, effort)? {
            return Ok((first, cands[0]));
        }
        return Ok((first, cands[thickest_safe(0, last, |i, e| safe(i, first, e), effort)?]));
    }
    // Rest-limited: on the day the thinnest lift first becomes safe a
    // thicker one rarely is; try one increment up before bisecting.
    let start = provisional_safe_day(r, st, rest, first, cands[last], last_rest, effort)?;
    if last == 0 || !safe(last - 1, start, effort)? {
        return Ok((start, cands[last]));
    }
    if safe(0, start, effort)? {
        return Ok((start, cands[0]));
    }
    Ok((start, cands[thickest_safe(0, last - 1, |i, e| safe(i, start, e), effort)?]))
}

/// Bisection over candidate indices: `unsafe_i` is known unsafe and
/// `safe_i` known safe (thickest first, so FS rises with the index).
fn thickest_safe(
    mut unsafe_i: usize,
    mut safe_i: usize,
    mut safe: impl FnMut(usize, &mut Effort) -> Result<bool>,
    effort: &mut Effort,
) -> Result<usize> {
    while safe_i - unsafe_i > 1 {
        let mid = (unsafe_i + safe_i) / 2;
        if safe(mid, effort)? {
            safe_i = mid;
        } else {
            unsafe_i = mid;
        }
    }
    Ok(safe_i)
}

/// Shortest rest (to the day) after which `lift` started then is safe.
/// A bracket is grown by doubling, then narrowed to one day by false
/// position on FS − target, switching to bisection whenever the same end of
/// the bracket is kept twice running (so it cannot stall).
pub(crate) fn earliest_safe_day(r: &Runner, st: &State, first: i64, lift: f64, effort: &mut Effort) -> Result<i64> {
    safe_day_from(r, st, &RestCache::new(st), first, lift, 0, effort)
}

/// `earliest_safe_day` with the rests from `st` shared through `rest`, the
/// bracket grown from a first rest of `guess` days (at least 14): found on
/// the trials' provisional FS, then confirmed by the full search (again
/// from the confirmed-unsafe day when the full search rejects it).
fn safe_day_from(
    r: &Runner,
    st: &State,
    rest: &RestCache,
    first: i64,
    lift: f64,
    guess: i64,
    effort: &mut Effort,
) -> Result<i64> {
    let target = r.engine.project.criteria.fs_construction;
    loop {
        let day = provisional_safe_day(r, st, rest, first, lift, guess, effort)?;
        if trial(r, rest, day, lift, true, effort)? >= target {
            return Ok(day);
        }
    }
}

/// `safe_day_from` on the trials' provisional FS.
fn provisional_safe_day(
    r: &Runner,
    st: &State,
    rest: &RestCache,
    first: i64,
    lift: f64,
    guess: i64,
    effort: &mut Effort,
) -> Result<i64> {
    let target = r.engine.project.criteria.fs_construction;
    let f = |day: i64, effort: &mut Effort| -> Result<f64> { Ok(trial(r, rest, day, lift, false, effort)? - target) };
    let (mut lo, mut f_lo) = (first, f(first, effort)?);
    if st.height_m <= 1e-9 && r.engine.peak_excess(st) < 1e-6 {
        // The FS printed is the full search's.
        let mut s = rest.at(r, first);
        r.place(&mut s, lift, &mut |_| {})?;
        let res = r.stability(&s, effort)?;
        let p = r.engine.project;
        return Err(Error::Computation(format!(
            "cannot be built to {:.2} m with FS ≥ {:.2}: even the thinnest lift ({lift:.2} m) on the untouched ground has FS {:.3} ({}), and resting without load brings no strength gain. {}",
            p.max_height_m(),
            target,
            res.governing_fs(),
            res.governing_mechanism(),
            advice(&res, "Consider berms, reinforcement, a lighter fill or ground improvement.")
        )));
    }
    let mut step = guess.max(14);
    let mut asked_if_ever = false;
    // The longest rest tried is 20 years, or up to the last workable day of
    // the calendar when that comes first.
    let last_day = (first..=r.calendar.horizon()).rev().find(|d| r.calendar.workable(*d));
    let (mut hi, mut f_hi) = loop {
        let Some(day) = (match r.calendar.next_workable(first + step.min(MAX_REST_DAYS)) {
            Some(d) if d <= r.calendar.horizon() => Some(d),
            _ => last_day.filter(|d| *d > lo),
        }) else {
            return Err(unreachable_height(r, st, lift, lo - first));
        };
        let v = f(day, effort)?;
        if v >= 0.0 {
            break (day, v);
        }
        (lo, f_lo) = (day, v);
        if day - first >= MAX_REST_DAYS || Some(day) == last_day {
            return Err(unreachable_height(r, st, lift, day - first));
        }
        if day - first >= LONG_REST_DAYS && !asked_if_ever {
            never_safe(r, st, lift, effort)?;
            asked_if_ever = true;
        }
        step *= 2;
    };
    let mut side: i32 = 0;
    while hi - lo > 1 {
        let guess = lo as f64 + (hi - lo) as f64 * (-f_lo) / (f_hi - f_lo);
        let mut mid = (guess.round() as i64).clamp(lo + 1, hi - 1);
        if side.abs() >= 2 {
            mid = (lo + hi) / 2;
        }
        let mut mid_w = r.next_workable(mid)?;
        if mid_w >= hi {
            // The guess fell on days off running up to `hi`: try the last
            // workable day before it; none strictly inside the bracket
            // means `hi` is the answer.
            match (lo + 1..mid).rev().find(|d| r.calendar.workable(*d)) {
                Some(d) => mid_w = d,
                None => break,
            }
        }
        let v = f(mid_w, effort)?;
        if v >= 0.0 {
            (hi, f_hi) = (mid_w, v);
            side = if side < 0 { side - 1 } else { -1 };
        } else {
            (lo, f_lo) = (mid_w, v);
            side = if side > 0 { side + 1 } else { 1 };
        }
    }
    Ok(hi)
}

/// Rest after which the planner asks whether any rest at all would do,
/// days.
const LONG_REST_DAYS: i64 = 448;

/// Fail at once when `lift` would be unsafe even on the fully consolidated
/// ground under the present height (every excess pore pressure dissipated,
/// so the strength cannot grow further by resting): the rest search would
/// otherwise simulate twenty years to find that out.
fn never_safe(r: &Runner, st: &State, lift: f64, effort: &mut Effort) -> Result<()> {
    let mut s = r.engine.consolidated(st);
    r.place(&mut s, lift, &mut |_| {})?;
    let res = r.stability(&s, effort)?;
    let fs = res.governing_fs();
    let p = r.engine.project;
    if fs >= p.criteria.fs_construction {
        return Ok(());
    }
    Err(Error::Computation(format!(
        "cannot be built to {:.2} m with FS ≥ {:.2}: a {:.2} m lift on {:.2} m of fill has FS {fs:.3} ({}) even with the clay fully consolidated under the fill already placed, so no rest is long enough. {}",
        p.max_height_m(),
        p.criteria.fs_construction,
        lift,
        st.height_m,
        res.governing_mechanism(),
        advice(&res, "Consider berms, reinforcement, closer drains or a lower target height.")
    )))
}

/// What to consider when a height cannot be reached: `general` for a
/// failure through the ground; a face of fill is helped only by a flatter
/// slope or a stronger fill.
fn advice(res: &SearchResult, general: &str) -> String {
    if res.face_governs() {
        "The fill face governs: consider a flatter side slope or a stronger fill (berms, drains and resting do not help the face).".into()
    } else {
        general.into()
    }
}

/// The error for a lift that stays unsafe after resting `rested` days (the
/// longest rest tried; shorter than 20 years when the calendar horizon
/// ends first).
fn unreachable_height(r: &Runner, st: &State, lift: f64, rested: i64) -> Error {
    let p = r.engine.project;
    Error::Computation(format!(
        "cannot be built to {:.2} m with FS ≥ {:.2}: even after resting {:.1} years at {:.2} m a {:.2} m lift stays below the target. Consider berms, reinforcement, closer drains or a lower target height.",
        p.max_height_m(),
        p.criteria.fs_construction,
        rested as f64 / crate::model::DAYS_PER_YEAR,
        st.height_m,
        lift
    ))
}

/// Record the rest after a stage from the state `s` at its end (day
/// `start`): release date, FS, degree and settlement at release.
fn close_rest(r: &Runner, prev: &mut Stage, s: &State, start: i64, effort: &mut Effort) -> Result<()> {
    prev.rest_days = start - r.calendar.day_of(prev.end) - 1;
    prev.release = Some(r.calendar.date(start)?);
    prev.fs_release = if r.detail { Some(r.stability(s, effort)?.governing_fs()) } else { None };
    prev.degree_centre = r.engine.degree_centre(s);
    prev.settlement_centre_m = s.settlement_centre_m;
    Ok(())
}

#[allow(clippy::too_many_arguments)]
pub(super) fn stage(
    r: &Runner,
    number: usize,
    kind: StageKind,
    a: i64,
    b: i64,
    change: f64,
    st: &State,
    crit: SearchResult,
) -> Result<Stage> {
    let c = &crit.critical;
    let field = r.engine.field(st);
    let su = field.sample(c.circle.xc_m, c.depth_m.max(0.0));
    Ok(Stage {
        number,
        kind,
        start: r.calendar.date(a)?,
        end: r.calendar.date(b)?,
        thickness_m: change,
        height_after_m: st.height_m,
        placed_after_m: st.placed_m,
        fs_end: crit.governing_fs(),
        mechanism: crit.governing_mechanism(),
        circle_depth_m: c.depth_m,
        su_governing_kpa: su,
        rest_days: 0,
        release: None,
        fs_release: None,
        peak_excess_kpa: r.engine.peak_excess(st),
        degree_centre: r.engine.degree_centre(st),
        settlement_centre_m: st.settlement_centre_m,
        fill_after_m3_per_m: r.detail.then(|| r.engine.fill_areas(st)),
        critical: Some(crit),
    })
}

#[cfg(test)]
mod tests;
