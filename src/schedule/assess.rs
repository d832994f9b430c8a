//! Check of a proposed lift sequence (the `[[sequence]]` of the project
//! file): run the ground response through it, compute FS at the end of each
//! lift and at regular intervals, flag every lift below the construction
//! target with the earliest date from which that lift would meet it, and
//! keep a daily time series of the response for CSV export.

use super::planner::earliest_safe_day;
use super::{Effort, Runner};
use crate::error::{Error, Result};
use crate::model::ConsolidationMode;
use crate::response::ColumnInfo;
use chrono::NaiveDate;
use serde::Serialize;

/// FS is computed in the time series every this many days.
pub const FS_EVERY_DAYS: i64 = 14;

/// One lift of the proposed sequence with its verdict.
#[derive(Debug, Clone, Serialize)]
pub struct AssessedLift {
    pub number: usize,
    /// Proposed start and the actual first and last working days.
    pub proposed_start: NaiveDate,
    pub start: NaiveDate,
    pub end: NaiveDate,
    pub thickness_m: f64,
    pub height_after_m: f64,
    pub fs_end: f64,
    /// FS ≥ construction target (a computed prediction, not a release).
    pub meets_target: bool,
    /// For a lift below the target: earliest start from which it would meet
    /// it (None when it does not within 20 years; see the warnings).
    pub meets_target_from: Option<NaiveDate>,
    pub peak_excess_kpa: f64,
    pub degree_centre: f64,
    pub settlement_centre_m: f64,
}

/// One day of the response history.
#[derive(Debug, Clone, Serialize)]
pub struct SeriesRow {
    pub date: NaiveDate,
    pub height_m: f64,
    pub placed_m: f64,
    pub settlement_centre_m: f64,
    pub degree_centre: f64,
    /// Excess pore pressure, kPa: [column][depth].
    pub excess_kpa: Vec<Vec<f64>>,
    /// su under the centreline at the report depths, kPa.
    pub su_centre_kpa: Vec<f64>,
    /// FS on the days it was computed.
    pub fs: Option<f64>,
}

/// The whole assessment.
#[derive(Debug, Clone, Serialize)]
pub struct Assessment {
    pub mode: ConsolidationMode,
    /// How the intermediate stages are shaped.
    pub stage_shape: crate::model::StageShape,
    pub fs_target: f64,
    pub columns: Vec<ColumnInfo>,
    /// Depths below OGL at which the series is reported, m.
    pub depths_m: Vec<f64>,
    pub lifts: Vec<AssessedLift>,
    pub series: Vec<SeriesRow>,
    pub effort: Effort,
    /// Notes that do not stop the assessment (e.g. a lift that never meets
    /// the target).
    pub warnings: Vec<String>,
}

/// Report depths: the middle of every clay layer.
pub fn report_depths(p: &crate::model::Project) -> Vec<f64> {
    let mut top = 0.0;
    let mut out = Vec::new();
    for l in &p.ground.layers {
        if matches!(l.kind, crate::model::LayerKind::Clay(_)) {
            out.push(top + 0.5 * l.thickness_m);
        }
        top += l.thickness_m;
    }
    out
}

/// Run the proposed sequence, then `tail_days` of rest after the last lift.
pub fn assess(r: &Runner, tail_days: i64) -> Result<Assessment> {
    let p = r.engine.project;
    let depths = report_depths(p);
    let mut effort = Effort::default();
    let mut st = r.engine.initial_state();
    let mut series = Vec::new();
    let mut lifts = Vec::new();
    let mut warnings = Vec::new();
    for (i, lift) in p.sequence.iter().enumerate() {
        let day = r.calendar.day_of(lift.start);
        if (day as f64) < st.day - 1e-9 {
            return Err(Error::Usage(format!(
                "sequence[{i}].start_date = {} is before lift {} is finished on {}; move it to a later date",
                lift.start,
                i,
                r.calendar.date(st.day.ceil() as i64 - 1)?
            )));
        }
        {
            let mut rec = recorder(r, &depths, &mut series, &mut effort);
            r.rest_until(&mut st, day, &mut rec);
        }
        let before = st.clone();
        let (a, b) = {
            let mut rec = recorder(r, &depths, &mut series, &mut effort);
            r.place(&mut st, lift.thickness_m, &mut rec)?
        };
        let fs = r.stability(&st, &mut effort)?.governing_fs();
        if let Some(last) = series.last_mut() {
            last.fs = Some(fs);
        }
        let meets_target = fs >= p.criteria.fs_construction;
        let meets_target_from = if meets_target {
            None
        } else {
            match earliest_safe_day(r, &before, r.next_workable(day)?, lift.thickness_m, &mut effort) {
                Ok(d) => Some(r.calendar.date(d)?),
                Err(Error::Computation(why)) => {
                    warnings.push(format!("lift {}: {why}", i + 1));
                    None
                }
                Err(e) => return Err(e),
            }
        };
        lifts.push(AssessedLift {
            number: i + 1,
            proposed_start: lift.start,
            start: r.calendar.date(a)?,
            end: r.calendar.date(b)?,
            thickness_m: lift.thickness_m,
            height_after_m: st.height_m,
            fs_end: fs,
            meets_target,
            meets_target_from,
            peak_excess_kpa: r.engine.peak_excess(&st),
            degree_centre: r.engine.degree_centre(&st),
            settlement_centre_m: st.settlement_centre_m,
        });
    }
    let end = st.day.ceil() as i64 + tail_days;
    // The last recorded day must have a date (the recorder skips none then).
    r.calendar.date(end)?;
    {
        let mut rec = recorder(r, &depths, &mut series, &mut effort);
        r.rest_until(&mut st, end, &mut rec);
    }
    warnings.extend(r.engine.convergence_warning());
    warnings.extend(r.stability_warnings());
    warnings.extend(crate::plausibility::input_warnings(p));
    let (placed, s) = (st.placed_m, st.settlement_centre_m);
    warnings.extend(crate::plausibility::strain_warning(r.engine, &st, placed, s, "the proposed sequence"));
    Ok(Assessment {
        mode: p.analysis.mode,
        stage_shape: p.embankment.stage_shape,
        fs_target: p.criteria.fs_construction,
        columns: r.engine.column_info(),
        depths_m: depths,
        lifts,
        series,
        effort,
        warnings,
    })
}

/// A closure that appends one row per whole day reached, with FS on the
/// first row at or after every multiple of `FS_EVERY_DAYS`.
fn recorder<'a>(
    r: &'a Runner,
    depths: &'a [f64],
    series: &'a mut Vec<SeriesRow>,
    effort: &'a mut Effort,
) -> impl FnMut(&crate::response::State) + 'a {
    let mut next_fs = 0;
    move |st| {
        let day = st.day.round();
        if (st.day - day).abs() > 1e-6 || series.last().is_some_and(|l| r.calendar.day_of(l.date) >= day as i64) {
            return;
        }
        // Days up to the checked last day of the run always have a date.
        let Ok(date) = r.calendar.date(day as i64) else { return };
        let e = r.engine;
        let fs = if day as i64 >= next_fs && st.placed_m > 0.0 {
            next_fs = (day as i64 / FS_EVERY_DAYS + 1) * FS_EVERY_DAYS;
            r.stability(st, effort).ok().map(|s| s.governing_fs())
        } else {
            None
        };
        series.push(SeriesRow {
            date,
            height_m: st.height_m,
            placed_m: st.placed_m,
            settlement_centre_m: st.settlement_centre_m,
            degree_centre: e.degree_centre(st),
            excess_kpa: (0..e.columns.len()).map(|c| depths.iter().map(|z| e.excess_at(st, c, *z)).collect()).collect(),
            su_centre_kpa: depths.iter().map(|z| e.su_at(st, 0, *z)).collect(),
            fs,
        });
    }
}
