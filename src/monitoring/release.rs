//! The hold-point check: interpret the readings, calibrate the model,
//! compute the factor of safety now and after the proposed lift on both the
//! calibrated model's state and the state consistent with every piezometer
//! (`measured`), judge the trends (`trends`) and the monitoring scheme's
//! minimum (`status`), and recommend one of three levels. The program
//! recommends; the lift is released only when the engineer of record signs.

use super::asaoka::{Asaoka, plates_asaoka};
use super::calibrate::{self, Fit, Observation};
use super::measured::{self, Tip};
use super::readings::{Readings, Warning};
use super::status::{self, InstrumentStatus};
use super::trends::{self, LATERAL_ACCELERATION, PORE_RISE};
use crate::error::{Error, Result};
use crate::model::{InstrumentKind, Project};
use crate::response::{Engine, State};
use crate::schedule::{Effort, Runner, planner};
use chrono::{Duration, NaiveDate, NaiveDateTime};
use serde::Serialize;

/// The program's recommendation at a hold point (three levels).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Level {
    /// Every criterion is met: release may be recommended to the engineer.
    CriteriaMet,
    /// Do not place the lift; the engineer of record reviews the reasons.
    HoldForReview,
    /// Signs of distress: stop filling and act now.
    StopFilling,
}

impl Level {
    /// Short name for tables and the log.
    pub fn label(self) -> &'static str {
        match self {
            Level::CriteriaMet => "CRITERIA MET",
            Level::HoldForReview => "HOLD PENDING REVIEW",
            Level::StopFilling => "STOP FILLING AND ACT NOW",
        }
    }

    /// What the level means, in one sentence.
    pub fn meaning(self) -> &'static str {
        match self {
            Level::CriteriaMet => {
                "criteria met: release of the lift may be recommended; the lift is released only when the engineer of record signs"
            }
            Level::HoldForReview => "do not place the lift; the engineer of record reviews the reasons below",
            Level::StopFilling => "signs of distress: stop filling now and take the immediate actions below",
        }
    }
}

/// The trade's usual immediate actions at the top level.
pub const IMMEDIATE_ACTIONS: [&str; 4] = [
    "inform the engineer of record now",
    "stop all filling and keep plant off the slopes and the toe area",
    "increase the reading frequency of every instrument (at least daily)",
    "consider unloading the crest or placing a stabilising berm at the toe",
];

/// Outcome of one rule.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Verdict {
    Pass,
    Fail,
    /// The best estimate is beyond the limit but not proven beyond the
    /// reading precision: the lift is held for the engineer's review.
    Possible,
    /// Not enough readings to judge; listed (the monitoring scheme's
    /// minimum decides whether that holds the lift).
    NotEvaluated,
}

impl Verdict {
    pub fn label(self) -> &'static str {
        match self {
            Verdict::Pass => "pass",
            Verdict::Fail => "FAIL",
            Verdict::Possible => "REVIEW",
            Verdict::NotEvaluated => "not evaluated",
        }
    }
}

/// One rule with its value, limit and verdict.
#[derive(Debug, Clone, Serialize)]
pub struct Rule {
    pub name: &'static str,
    pub value: Option<f64>,
    pub limit: f64,
    pub unit: &'static str,
    /// "above" (value must not exceed the limit) or "below".
    pub must_be: &'static str,
    pub verdict: Verdict,
    /// "readings" (a trend in the field data) or "model" (a factor of
    /// safety).
    pub basis: &'static str,
    /// Which instrument or what governs, in words.
    pub detail: String,
}

impl Rule {
    /// A rule passed while `value` does not exceed `limit`.
    pub(crate) fn at_most(name: &'static str, value: f64, limit: f64, unit: &'static str, detail: String) -> Rule {
        let verdict = if value > limit { Verdict::Fail } else { Verdict::Pass };
        Rule { name, value: Some(value), limit, unit, must_be: "above", verdict, basis: "readings", detail }
    }

    /// A rule passed while `value` is at least `limit`.
    fn at_least(name: &'static str, value: f64, limit: f64, detail: String) -> Rule {
        let verdict = if value >= limit { Verdict::Pass } else { Verdict::Fail };
        Rule { name, value: Some(value), limit, unit: "", must_be: "below", verdict, basis: "model", detail }
    }

    /// A rule that could not be judged for lack of readings.
    pub(crate) fn not_evaluated(name: &'static str, limit: f64, unit: &'static str, why: &str) -> Rule {
        Rule {
            name,
            value: None,
            limit,
            unit,
            must_be: "above",
            verdict: Verdict::NotEvaluated,
            basis: "readings",
            detail: why.into(),
        }
    }
}

/// A time series for the record's plots: days since the project start.
#[derive(Debug, Clone, Default)]
pub struct Track {
    pub id: String,
    pub kind: Option<InstrumentKind>,
    pub measured: Vec<(f64, f64)>,
    pub predicted: Vec<(f64, f64)>,
    pub calibrated: Vec<(f64, f64)>,
}

/// Factors of safety on the two states, now and after the lift.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct Safety {
    /// On the calibrated model's state.
    pub now_model: f64,
    pub next_model: f64,
    /// On the state consistent with every piezometer.
    pub now_measured: f64,
    pub next_measured: f64,
}

/// The conditions attached to a recommendation.
#[derive(Debug, Clone, Serialize)]
pub struct Conditions {
    /// Thickest lift the check covers, m.
    pub max_lift_m: f64,
    /// Latest start of the lift; after it a new check is needed.
    pub latest_start: NaiveDate,
    /// Days the check stays valid after the hold point.
    pub valid_days: f64,
    /// Read every instrument at least this often, days (daily while placing).
    pub reading_interval_days: f64,
}

/// The whole hold-point check.
#[derive(Debug, Clone, Serialize)]
pub struct ReleaseCheck {
    /// Time of the latest reading.
    pub hold_point: NaiveDateTime,
    pub readings_file: String,
    pub readings_sha256: String,
    pub height_now_m: f64,
    pub lift_m: f64,
    pub height_after_m: f64,
    /// First and last working day of the proposed lift.
    pub lift_start: NaiveDate,
    pub lift_end: NaiveDate,
    pub instruments: Vec<InstrumentStatus>,
    /// Asaoka's construction per settlement plate (id, result).
    pub asaoka: Vec<(String, Asaoka)>,
    pub fit: Fit,
    /// Asaoka's final settlement against the calibrated model's, for each
    /// plate whose construction is reliable (a check, not a constraint).
    pub asaoka_check: Vec<AsaokaCheck>,
    /// False when the fit's χ²/dof or an instrument's misfit exceeds its
    /// limit, or a reliable Asaoka forecast disagrees with the calibrated
    /// model beyond ASAOKA_TOLERANCE: the model does not explain the
    /// readings.
    pub fit_explains_readings: bool,
    /// Each piezometer against the model (the measured state's inputs).
    pub tips: Vec<Tip>,
    pub safety: Safety,
    /// The lower of the model-state and measured-state FS.
    pub fs_now: f64,
    pub fs_next: f64,
    pub fs_target: f64,
    /// Mechanism (band) of the governing circle of the next lift.
    pub mechanism: String,
    pub rules: Vec<Rule>,
    /// The monitoring scheme's shortfalls ("hold: insufficient monitoring").
    pub insufficient: Vec<String>,
    pub recommendation: Level,
    /// Why the level was reached, one sentence each.
    pub reasons: Vec<String>,
    /// Immediate actions (top level only).
    pub actions: Vec<String>,
    pub conditions: Conditions,
    /// When the FS rule fails: the forecast earliest start of the lift from
    /// the calibrated model (None when never within the horizon).
    pub earliest_release: Option<NaiveDate>,
    /// True when that forecast comes from a fit that does not explain the
    /// readings (a rejected fit: the date is not to be relied on).
    pub forecast_from_rejected_fit: bool,
    pub release_note: String,
    pub warnings: Vec<Warning>,
    #[serde(skip)]
    pub tracks: Vec<Track>,
    /// The trend rules' alarm limits as lines for the plots.
    #[serde(skip)]
    pub limits: Vec<trends::LimitTrace>,
}

/// Largest relative difference between a reliable Asaoka final settlement
/// and the calibrated model's final settlement under the current load at
/// the plate before the model is taken not to explain the readings (chosen
/// here: about twice the scatter of Asaoka's forecast on a first-mode
/// record with the reading precision of plates, not from a source).
pub const ASAOKA_TOLERANCE: f64 = 0.2;

/// One plate's Asaoka final settlement against the calibrated model's.
#[derive(Debug, Clone, Serialize)]
pub struct AsaokaCheck {
    pub plate: String,
    /// Asaoka's (1978) final settlement under the current load, m.
    pub asaoka_final_m: f64,
    /// The calibrated model's settlement at the plate once the current load
    /// has fully consolidated, m.
    pub model_final_m: f64,
    /// |model − Asaoka| / Asaoka within ASAOKA_TOLERANCE.
    pub agrees: bool,
}

/// Asaoka's check on each plate whose construction is reliable.
fn asaoka_check(p: &Project, engine: &Engine, st: &State, asaoka: &[(String, Asaoka)]) -> Vec<AsaokaCheck> {
    let done = engine.consolidated(st);
    asaoka
        .iter()
        .filter(|(_, a)| a.reliable)
        .filter_map(|(id, a)| {
            let sf = a.final_m?;
            let x = p.instruments.iter().find(|i| &i.id == id)?.offset_m;
            let model = engine.settlement_at(&done, x);
            Some(AsaokaCheck {
                plate: id.clone(),
                asaoka_final_m: sf,
                model_final_m: model,
                agrees: (model - sf).abs() <= ASAOKA_TOLERANCE * sf.abs(),
            })
        })
        .collect()
}

/// Today's calibrated ground: the calibrated project, the fit and the
/// model's state at the hold point.
pub struct Calibrated {
    pub project: Project,
    pub fit: Fit,
    pub state: State,
    pub(crate) obs: Vec<Observation>,
    pub(crate) predicted: Vec<f64>,
    pub(crate) calibrated: Vec<f64>,
}

/// Calibrate the model on the readings and build today's model state.
pub fn calibrate(p: &Project, r: &Readings) -> Result<Calibrated> {
    let (obs, tip_settlement) = calibrate::observations(p, r);
    let fit = calibrate::fit(p, r, &obs, tip_settlement)?;
    let (predicted, _) = calibrate::predict(&Engine::new(p), r, &obs);
    let q = calibrate::calibrated_project(p, fit.rate.value, fit.compressibility.value);
    let (calibrated, state) = calibrate::predict(&Engine::new(&q), r, &obs);
    Ok(Calibrated { project: q, fit, state, obs, predicted, calibrated })
}

/// Every piezometer's latest usable reading (excess at the settled tip)
/// against the calibrated model.
pub fn tips(p: &Project, r: &Readings, obs: &[Observation], engine: &Engine, st: &State) -> Vec<Tip> {
    p.instruments
        .iter()
        .enumerate()
        .filter(|(_, i)| i.kind == InstrumentKind::Piezometer)
        .filter_map(|(k, i)| {
            let excess = obs.iter().rev().find(|o| r.readings[o.reading].instrument == k)?.measured;
            let dsv = engine.fill_stress_at(st, i.offset_m, i.depth_m);
            let model = engine.excess_at_point(st, i.offset_m, i.depth_m);
            (dsv > 1.0).then(|| measured::tip(&i.id, i.offset_m, i.depth_m, excess, model, dsv))
        })
        .collect()
}

/// The state consistent with the piezometers at the hold point.
pub fn measured_state(p: &Project, r: &Readings, cal: &Calibrated) -> (State, Vec<Tip>) {
    let engine = Engine::new(&cal.project);
    let t = tips(p, r, &cal.obs, &engine, &cal.state);
    (measured::measured_state(&engine, &cal.state, &t), t)
}

/// Refuse a lift outside the project's limits.
fn check_lift(p: &Project, height_now: f64, lift_m: f64) -> Result<()> {
    let top = p.max_height_m();
    let room = top - height_now;
    let min = p.construction.lift_min_m;
    let ok = lift_m.is_finite() && lift_m > 0.0 && lift_m <= room + 1e-9;
    let below_min = lift_m < min - 1e-9 && (lift_m - room).abs() > 1e-9;
    if !ok || below_min {
        return Err(Error::Usage(format!(
            "--lift {lift_m} must be between construction.lift_min_m ({min:.2} m; less only to finish at the top) and {room:.2} m (crest now {height_now:.2} m, design height plus surcharge {top:.2} m)"
        )));
    }
    Ok(())
}

/// FS now and after a lift of `lift_m` from state `st` (rested to `day`).
fn fs_pair(
    runner: &Runner,
    st: &State,
    day: Option<i64>,
    lift_m: f64,
    effort: &mut Effort,
) -> Result<(f64, f64, State, String)> {
    let now = runner.stability(st, effort)?.governing_fs();
    let mut rested = st.clone();
    if let Some(d) = day {
        runner.rest_until(&mut rested, d, &mut |_| {});
    }
    let mut after = rested.clone();
    runner.place(&mut after, lift_m, &mut |_| {})?;
    let next = runner.stability(&after, effort)?;
    Ok((now, next.governing_fs(), rested, next.governing_mechanism()))
}

/// Run the hold-point check for a lift of `lift_m` starting on or after
/// `on` (the day after the hold point when None).
pub fn check(p: &Project, r: &Readings, lift_m: f64, on: Option<NaiveDate>) -> Result<ReleaseCheck> {
    check_lift(p, r.height_at(r.today_day), lift_m)?;
    let cal = calibrate(p, r)?;
    let engine = Engine::new(&cal.project);
    let runner = Runner::new(&engine);
    let height_now = cal.state.height_m;
    let day = match on {
        Some(d) if d < r.today.date() => {
            return Err(Error::Usage(format!("--on {d} is before the hold point ({})", r.today.date())));
        }
        Some(d) if runner.calendar.day_of(d) > runner.calendar.horizon() => {
            return Err(Error::Usage(format!("--on {d} is beyond the 40-year horizon")));
        }
        Some(d) => Some(runner.calendar.day_of(d)),
        None => None,
    };
    let (measured_st, tips) = measured_state(p, r, &cal);
    let mut effort = Effort::default();
    let (now_model, next_model, rested, band_model) = fs_pair(&runner, &cal.state, day, lift_m, &mut effort)?;
    let (now_measured, next_measured, _, band_measured) = fs_pair(&runner, &measured_st, day, lift_m, &mut effort)?;
    let safety = Safety { now_model, next_model, now_measured, next_measured };
    let (fs_now, fs_next) = (now_model.min(now_measured), next_model.min(next_measured));
    let mechanism = if next_measured < next_model { band_measured } else { band_model };
    let (a, b) = runner.place(&mut rested.clone(), lift_m, &mut |_| {})?;
    let target = p.criteria.fs_construction;
    let instruments = status::statuses(p, r, &cal, &engine);
    let insufficient = status::insufficient(p, &instruments);
    let mut rules = trends::rules(p, r);
    rules.push(Rule::at_least(
        "FS of the section now",
        fs_now,
        target,
        format!("crest {height_now:.2} m: model {now_model:.2}, measured pore pressures {now_measured:.2} (the lower)"),
    ));
    rules.push(Rule::at_least(
        "FS of the next lift",
        fs_next,
        target,
        format!(
            "{lift_m:.2} m lift to {:.2} m (cv, ch × {:.2}; Cc, Cr × {:.2}): model {next_model:.2}, measured pore pressures {next_measured:.2} (the lower)",
            height_now + lift_m,
            cal.fit.rate.value,
            cal.fit.compressibility.value
        ),
    ));
    let asaoka = plates_asaoka(p, &engine, r);
    let asaoka_check = asaoka_check(p, &engine, &cal.state, &asaoka);
    let explains = explains(p, &cal.fit, &instruments, &asaoka_check);
    let (mut recommendation, mut reasons) = level(p, fs_now, &rules, &insufficient, explains, &cal.fit);
    let valid_days = p.monitoring.max_age_days.iter().copied().fold(f64::INFINITY, f64::min);
    let latest_start = r.today.date() + Duration::days(valid_days.floor() as i64);
    let lift_start = runner.calendar.date(a)?;
    if lift_start > latest_start && recommendation != Level::StopFilling {
        recommendation = Level::HoldForReview;
        reasons.push(format!(
            "readings too old for a lift starting on {lift_start}: the check of the hold point {} is valid for {valid_days:.0} days (lifts starting by {latest_start}, the monitoring scheme's shortest maximum reading age); take new readings and check again",
            r.today.date()
        ));
    }
    let (earliest_release, mut release_note) = forecast(&runner, &rested, lift_m, fs_next < target, &mut effort)?;
    let forecast_from_rejected_fit = earliest_release.is_some() && !explains;
    if forecast_from_rejected_fit {
        release_note = format!(
            "FROM A REJECTED FIT (the model does not explain the readings; do not rely on this date): {release_note}"
        );
    }
    let mut warnings = r.warnings.clone();
    for message in engine.convergence_warning().into_iter().chain(runner.stability_warnings()) {
        warnings.push(Warning { line: None, instrument: String::new(), message });
    }
    let conditions = Conditions { max_lift_m: lift_m, latest_start, valid_days, reading_interval_days: valid_days };
    Ok(ReleaseCheck {
        hold_point: r.today,
        readings_file: r.file.clone(),
        readings_sha256: r.sha256.clone(),
        height_now_m: height_now,
        lift_m,
        height_after_m: height_now + lift_m,
        lift_start,
        lift_end: runner.calendar.date(b)?,
        asaoka,
        limits: trends::limit_traces(p, r, &|id, day| {
            let x = |o: &&Observation| &r.readings[o.reading];
            cal.obs.iter().find(|o| x(o).id == id && x(o).day == day).map(|o| o.measured)
        }),
        tracks: tracks(p, r, &cal),
        instruments,
        fit: cal.fit,
        asaoka_check,
        fit_explains_readings: explains,
        tips,
        safety,
        fs_now,
        fs_next,
        fs_target: target,
        mechanism,
        rules,
        insufficient,
        actions: if recommendation == Level::StopFilling {
            IMMEDIATE_ACTIONS.iter().map(|s| s.to_string()).collect()
        } else {
            Vec::new()
        },
        recommendation,
        reasons,
        conditions,
        earliest_release,
        forecast_from_rejected_fit,
        release_note,
        warnings,
    })
}

/// Whether the calibrated model explains the readings, judged as the
/// hold-point check judges it (for a re-plan from a hold point).
pub fn fit_accepted(p: &Project, r: &Readings, cal: &Calibrated) -> bool {
    let engine = Engine::new(&cal.project);
    let st = status::statuses(p, r, cal, &engine);
    let a = asaoka_check(p, &engine, &cal.state, &plates_asaoka(p, &engine, r));
    explains(p, &cal.fit, &st, &a)
}

/// Whether the calibrated model explains the readings: χ²/dof and every
/// instrument's RMS misfit within their limits, and every reliable Asaoka
/// final settlement within ASAOKA_TOLERANCE of the model's.
fn explains(p: &Project, fit: &Fit, st: &[InstrumentStatus], asaoka: &[AsaokaCheck]) -> bool {
    let m = &p.monitoring;
    fit.chi2_per_dof <= m.fit_chi2_limit
        && st.iter().all(|s| s.misfit_sd.is_none_or(|x| x <= m.instrument_misfit_limit))
        && asaoka.iter().all(|a| a.agrees)
}

/// The level and its reasons.
pub(super) fn level(
    p: &Project,
    fs_now: f64,
    rules: &[Rule],
    short: &[String],
    explains: bool,
    fit: &Fit,
) -> (Level, Vec<String>) {
    let m = &p.monitoring;
    let failed = |name: &str| rules.iter().any(|r| r.name == name && r.verdict == Verdict::Fail);
    let mut stop = Vec::new();
    if fs_now < m.stop_fs_below {
        stop.push(format!("FS now {fs_now:.2} is below {:.2}: the section is near failure", m.stop_fs_below));
    }
    // Distress: one sign proven and the other above its limit at the best
    // estimate (a pore-pressure rate above its limit; an outward
    // acceleration, whose limit is none).
    let rule = |name: &str| rules.iter().find(|r| r.name == name);
    let rise_above = rule(PORE_RISE).is_some_and(|r| matches!(r.verdict, Verdict::Fail | Verdict::Possible));
    let accelerating = rule(LATERAL_ACCELERATION).is_some_and(|r| r.value.is_some_and(|z| z > 0.0));
    if (failed(PORE_RISE) && accelerating) || (rise_above && failed(LATERAL_ACCELERATION)) {
        stop.push(
            "pore pressure is rising under constant load while lateral movement accelerates (distress: one of the two proven beyond the reading precision, the other above its limit at the best estimate)"
                .into(),
        );
    }
    if !stop.is_empty() {
        return (Level::StopFilling, stop);
    }
    let mut hold: Vec<String> =
        rules
            .iter()
            .filter(|r| r.verdict == Verdict::Fail)
            .map(|r| format!("{} fails: {}", r.name, r.detail))
            .chain(rules.iter().filter(|r| r.verdict == Verdict::Possible).map(|r| {
                format!("{} may be above its limit (best estimate, not proven; review): {}", r.name, r.detail)
            }))
            .collect();
    hold.extend(short.iter().map(|s| format!("hold: insufficient monitoring — {s}")));
    if !explains {
        hold.push(format!(
            "model does not explain the readings (χ²/dof {:.1}, limit {:.1}, or an instrument's misfit above {:.1} sd, or a reliable Asaoka final settlement more than {:.0}% from the model's): the engineer must review the parameters and instruments",
            fit.chi2_per_dof,
            m.fit_chi2_limit,
            m.instrument_misfit_limit,
            100.0 * ASAOKA_TOLERANCE
        ));
    }
    if !fit.converged {
        hold.push(format!(
            "the back-analysis stopped after {} iterations without converging (last rate × {:.2}, compressibility × {:.2})",
            fit.iterations, fit.rate.value, fit.compressibility.value
        ));
    }
    if !fit.rate.within_range {
        hold.push(format!(
            "the fitted rate multiplier {:.2} lies at the edge of its search range {}–{}",
            fit.rate.value,
            calibrate::M_MIN,
            calibrate::M_MAX
        ));
    }
    if !fit.compressibility.within_range {
        hold.push(format!(
            "the fitted compressibility multiplier {:.2} lies at the edge of its search range {}–{}",
            fit.compressibility.value,
            calibrate::C_MIN,
            calibrate::C_MAX
        ));
    }
    if hold.is_empty() { (Level::CriteriaMet, hold) } else { (Level::HoldForReview, hold) }
}

/// The forecast earliest start of the lift when its FS falls short.
fn forecast(
    runner: &Runner,
    st: &State,
    lift_m: f64,
    fs_fails: bool,
    effort: &mut Effort,
) -> Result<(Option<NaiveDate>, String)> {
    if !fs_fails {
        return Ok((None, String::new()));
    }
    let target = runner.engine.project.criteria.fs_construction;
    let first = runner.next_workable(st.day.ceil() as i64)?;
    match planner::earliest_safe_day(runner, st, first, lift_m, effort) {
        Ok(day) => {
            let d = runner.calendar.date(day)?;
            Ok((
                Some(d),
                format!(
                    "forecast from the calibrated model: the {lift_m:.2} m lift would reach FS {target:.2} if started on {d}; a new check with readings is needed then"
                ),
            ))
        }
        Err(Error::Computation(why)) => Ok((None, why)),
        Err(e) => Err(e),
    }
}

fn tracks(p: &Project, r: &Readings, cal: &Calibrated) -> Vec<Track> {
    let mut out: Vec<Track> =
        p.instruments.iter().map(|i| Track { id: i.id.clone(), kind: Some(i.kind), ..Track::default() }).collect();
    for (j, o) in cal.obs.iter().enumerate() {
        let x = &r.readings[o.reading];
        let t = &mut out[x.instrument];
        t.measured.push((x.day, o.measured));
        t.predicted.push((x.day, cal.predicted[j]));
        t.calibrated.push((x.day, cal.calibrated[j]));
    }
    for (k, inst) in p.instruments.iter().enumerate() {
        if inst.kind == InstrumentKind::LateralMarker {
            out[k].measured = r.of(k).map(|x| (x.day, x.value)).collect();
        }
    }
    out.push(Track {
        id: "fill".into(),
        kind: None,
        measured: r.fill.iter().map(|f| (f.day, f.height_m)).chain([(r.today_day, r.height_at(r.today_day))]).collect(),
        ..Track::default()
    });
    out
}
