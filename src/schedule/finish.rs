//! The end of a plan: when the surcharge may come off, the totals of the
//! timetable (finish, lowest FS, settlement forecast, fill volumes,
//! warnings), and — when the target height cannot be reached — how far it
//! can be approached and what stops the next lift.

use super::Effort;
use super::Runner;
use super::planner::{MAX_REST_DAYS, Plan, Stage, StageKind};
use super::record::Figures;
use crate::error::{Error, Result};
use crate::response::State;
use crate::settlement::{self, Forecast};
use serde::Serialize;

/// Day loading began: the first stage's start, or the project start when
/// the plan continues from a state that already carries fill.
pub(super) fn loading_start_day(r: &Runner, start: &State, stages: &[Stage]) -> f64 {
    match stages.first() {
        Some(s) if start.height_m <= 0.0 => r.calendar.day_of(s.start) as f64,
        _ => 0.0,
    }
}

/// The day the surcharge may come off: the first day on which the removal
/// criterion holds (centreline degree of consolidation, or residual
/// settlement over the design life after removal), searched weekly.
pub(crate) fn removal_day(
    r: &Runner,
    st: &State,
    earliest: i64,
    loading_start: f64,
    warnings: &mut Vec<String>,
) -> Result<i64> {
    let p = r.engine.project;
    let degree = p.criteria.surcharge_removal_degree;
    let limit = p.criteria.residual_settlement_limit_m;
    if degree.is_none() && limit.is_none() {
        warnings.push("no surcharge removal criterion given; the surcharge is held until 90% average consolidation under the centreline".into());
    }
    let degree = if limit.is_none() { degree.or(Some(0.9)) } else { degree };
    let mut s = st.clone();
    let mut day = r.next_workable(earliest)?;
    r.rest_until(&mut s, day, &mut |_| {});
    loop {
        let ok_u = degree.is_none_or(|u| r.engine.degree_centre(&s) >= u);
        let ok_s = limit.is_none_or(|l| residual_after_removal(r, &s, loading_start) <= l);
        if ok_u && ok_s {
            return Ok(day);
        }
        if day > r.calendar.day_of(p.info.start_date) + MAX_REST_DAYS {
            return Err(Error::Computation(
                "cannot be finished: the surcharge removal criterion is not met within 20 years of the project start; relax it or add drains".into(),
            ));
        }
        day = r.next_workable(day + 7)?;
        r.rest_until(&mut s, day, &mut |_| {});
    }
}

/// Residual settlement over the design life if the surcharge were removed
/// now (the forecast from the state just after an instant removal), m.
fn residual_after_removal(r: &Runner, st: &State, loading_start: f64) -> f64 {
    let mut s = st.clone();
    let h = r.engine.project.embankment.design_height_m;
    r.engine.advance(&mut s, 0.01, h);
    settlement::forecast(r.engine, &s, loading_start).residual_m
}

/// The plan's totals from its stages and the state at the finish (the
/// state at the end of the last stage).
pub(super) fn totals(
    r: &Runner,
    start: &State,
    stages: Vec<Stage>,
    st: &State,
    mut effort: Effort,
    mut warnings: Vec<String>,
    figures: Figures,
) -> Result<Plan> {
    let p = r.engine.project;
    let e = &p.embankment;
    let finish = match stages.last() {
        Some(s) => s.end,
        None => r.calendar.date(st.day.ceil() as i64)?,
    };
    let (min_fs, min_fs_stage) = stages
        .iter()
        .filter(|s| s.kind == StageKind::Lift)
        .map(|s| (s.fs_end, s.number))
        .min_by(|a, b| a.0.total_cmp(&b.0))
        .unwrap_or((f64::INFINITY, 0));
    // The last stage's search was made on this very state (nothing moves
    // the state between a stage's end and the totals).
    let at_finish = match stages.last().and_then(|s| s.critical.clone()) {
        Some(found) => found,
        None => r.stability(st, &mut effort)?,
    };
    let fs_finish = at_finish.governing_fs();
    effort.consolidation_steps = r.engine.steps_taken();
    warnings.extend(r.engine.convergence_warning());
    warnings.extend(r.stability_warnings());
    if fs_finish < p.criteria.fs_service {
        warnings.push(format!(
            "FS at the finish {fs_finish:.3} ({}) is below the service target {:.2}",
            at_finish.governing_mechanism(),
            p.criteria.fs_service
        ));
    }
    let f = settlement::forecast(r.engine, st, loading_start_day(r, start, &stages));
    warnings.extend(forecast_warnings(r, &f));
    warnings.extend(crate::plausibility::input_warnings(p));
    let placed = st.height_m + f.final_primary_m;
    warnings.extend(crate::plausibility::strain_warning(r.engine, st, placed, f.final_primary_m, "the final profile"));
    let areas = r.engine.fill_areas(st);
    let design = crate::load::area(&crate::load::profile(e, e.design_height_m));
    let full = crate::load::area(&crate::load::profile(e, p.max_height_m()));
    Ok(Plan {
        finish,
        duration_days: (finish - p.info.start_date).num_days() + 1,
        stage_shape: e.stage_shape,
        settlement_at_finish_m: f.at_finish_m,
        final_primary_settlement_m: f.final_primary_m,
        residual_settlement_m: f.residual_m,
        residual_primary_m: f.remaining_primary_m,
        residual_secondary_m: f.secondary_m,
        end_of_primary: f.end_of_primary_day.map(|d| r.calendar.date(d.ceil() as i64)).transpose()?,
        min_fs,
        min_fs_stage,
        volume_design_m3_per_m: design,
        volume_makeup_m3_per_m: areas.makeup_m2,
        volume_surcharge_m3_per_m: full - design,
        fs_finish,
        effort,
        warnings,
        stages,
        figures,
    })
}

/// Warnings from the settlement forecast: a fixed point that did not
/// converge, and a residual settlement above the project's threshold.
fn forecast_warnings(r: &Runner, f: &Forecast) -> Vec<String> {
    let p = r.engine.project;
    let mut out = Vec::new();
    if !f.converged {
        out.push(format!(
            "the final primary settlement under the final profile did not converge (last estimate {:.3} m): the make-up needed grows almost as fast as the settlement it causes; check the compressibility",
            f.final_primary_m
        ));
    }
    let limit = p.criteria.residual_settlement_warning_m;
    if f.residual_m > limit {
        out.push(format!(
            "residual settlement over the {} years after the finish is {:.3} m ({:.3} m primary still to come + {:.3} m secondary), above the {limit:.3} m of criteria.residual_settlement_warning_m: consider a surcharge, a longer hold or closer drains",
            p.info.design_life_years, f.residual_m, f.remaining_primary_m, f.secondary_m
        ));
    }
    out
}

/// What stops the next lift: the thinnest lift placed on the present crest
/// with the clay fully consolidated under it (the best the ground can do)
/// and its critical circle.
#[derive(Debug, Clone, Serialize)]
pub struct Blocking {
    pub lift_m: f64,
    pub on_crest_m: f64,
    /// FS of that lift at the end of placement.
    pub fs: f64,
    /// What governs: the fill face, or the material at the lowest point of
    /// the critical circle.
    pub mechanism: String,
    /// The fill face (infinite slope) governs, not the circle.
    pub face_governs: bool,
    /// Depth of the critical circle's lowest point below OGL, m.
    pub circle_depth_m: f64,
    pub circle: crate::stability::Circle,
}

/// The blocking mechanism above state `st` for a lift of `lift_m`.
pub(super) fn blocking(r: &Runner, st: &State, lift_m: f64, effort: &mut Effort) -> Result<Blocking> {
    let mut s = r.engine.consolidated(st);
    r.place(&mut s, lift_m, &mut |_| {})?;
    let found = r.stability(&s, effort)?;
    let (fs, mechanism, face_governs) = (found.governing_fs(), found.governing_mechanism(), found.face_governs());
    let c = found.critical;
    Ok(Blocking {
        lift_m,
        on_crest_m: st.height_m,
        fs,
        mechanism,
        face_governs,
        circle_depth_m: c.depth_m,
        circle: c.circle,
    })
}

/// The answer when the target height cannot be reached at the FS target.
#[derive(Debug, Clone, Serialize)]
pub struct Unbuildable {
    /// Why the planner stopped.
    pub reason: String,
    pub target_height_m: f64,
    pub fs_target: f64,
    /// Highest crest reached by the partial timetable, m.
    pub highest_crest_m: f64,
    pub blocking: Blocking,
    /// The timetable up to the highest crest.
    pub partial_plan: Plan,
}

impl Unbuildable {
    pub(super) fn new(r: &Runner, reason: String, blocking: Blocking, partial_plan: Plan) -> Unbuildable {
        let p = r.engine.project;
        Unbuildable {
            reason,
            target_height_m: p.max_height_m(),
            fs_target: p.criteria.fs_construction,
            highest_crest_m: blocking.on_crest_m,
            blocking,
            partial_plan,
        }
    }
}
