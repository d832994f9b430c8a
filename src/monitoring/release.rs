//! The hold-point release check: interpret the readings, calibrate the
//! model, recompute the factor of safety of the proposed next lift with the
//! calibrated model and the measured pore pressures, apply the alarm rules,
//! and decide RELEASE or HOLD (with, for HOLD, the forecast earliest release
//! date from the calibrated model).

use super::asaoka::{self, Asaoka, Drainage};
use super::calibrate::{self, Fit, Observation};
use super::readings::{Readings, Warning};
use crate::error::{Error, Result};
use crate::ground;
use crate::model::{InstrumentKind, LayerKind, Project};
use crate::response::{Engine, State};
use crate::schedule::{Effort, Runner, planner};
use chrono::{NaiveDate, NaiveDateTime};
use serde::Serialize;

/// RELEASE or HOLD.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "UPPERCASE")]
pub enum Decision {
    Release,
    Hold,
}

impl Decision {
    pub fn label(self) -> &'static str {
        match self {
            Decision::Release => "RELEASE",
            Decision::Hold => "HOLD",
        }
    }
}

/// Outcome of one alarm rule.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Verdict {
    Pass,
    Fail,
    /// Not enough readings to judge; does not block a release but is listed.
    NotEvaluated,
}

impl Verdict {
    pub fn label(self) -> &'static str {
        match self {
            Verdict::Pass => "pass",
            Verdict::Fail => "FAIL",
            Verdict::NotEvaluated => "not evaluated",
        }
    }
}

/// One alarm rule with its value, limit and verdict.
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
    /// safety from the calibrated model).
    pub basis: &'static str,
    /// Which instrument or what governs, in words.
    pub detail: String,
}

impl Rule {
    /// A rule passed while `value` does not exceed `limit`.
    fn at_most(name: &'static str, value: f64, limit: f64, unit: &'static str, detail: String) -> Rule {
        let verdict = if value > limit { Verdict::Fail } else { Verdict::Pass };
        Rule { name, value: Some(value), limit, unit, must_be: "above", verdict, basis: "readings", detail }
    }

    /// A rule passed while `value` is at least `limit`.
    fn at_least(name: &'static str, value: f64, limit: f64, detail: String) -> Rule {
        let verdict = if value >= limit { Verdict::Pass } else { Verdict::Fail };
        Rule { name, value: Some(value), limit, unit: "", must_be: "below", verdict, basis: "model", detail }
    }

    /// A rule that could not be judged for lack of readings.
    fn not_evaluated(name: &'static str, limit: f64, unit: &'static str, why: &str) -> Rule {
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

/// What each instrument shows at the hold point.
#[derive(Debug, Clone, Serialize)]
pub struct InstrumentStatus {
    pub id: String,
    pub kind: InstrumentKind,
    pub offset_m: f64,
    pub depth_m: Option<f64>,
    pub readings: usize,
    pub suspect: usize,
    pub last_reading: Option<NaiveDateTime>,
    /// Latest usable value: excess pore pressure kPa (piezometer),
    /// settlement m (plate), outward movement m (marker).
    pub measured: Option<f64>,
    /// The same quantity from the project's parameters and from the
    /// calibrated model (piezometers and plates).
    pub predicted: Option<f64>,
    pub calibrated: Option<f64>,
    /// Piezometers: Δu / Δσv at the tip now.
    pub pore_pressure_ratio: Option<f64>,
    /// Piezometers: fraction of the excess pore pressure at the end of the
    /// last lift that has dissipated since.
    pub dissipated_since_lift: Option<f64>,
    /// Plates and markers: rate over the rate window, mm/day.
    pub rate_mm_per_day: Option<f64>,
}

/// A time series for the certificate's plots: days since the project start.
#[derive(Debug, Clone, Default)]
pub struct Track {
    pub id: String,
    pub kind: Option<InstrumentKind>,
    pub measured: Vec<(f64, f64)>,
    pub predicted: Vec<(f64, f64)>,
    pub calibrated: Vec<(f64, f64)>,
}

/// The whole release check.
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
    /// Factor applied to the calibrated excess pore pressures so that they
    /// are no lower than the piezometers show (≥ 1).
    pub pore_pressure_factor: f64,
    pub fs_now: f64,
    pub fs_next: f64,
    pub fs_target: f64,
    /// Mechanism (band) of the governing circle of the next lift.
    pub mechanism: String,
    pub rules: Vec<Rule>,
    pub decision: Decision,
    /// For HOLD: the forecast earliest start of the lift from the
    /// calibrated model (None when the FS rule passes or never within 20 y).
    pub earliest_release: Option<NaiveDate>,
    pub release_note: String,
    pub warnings: Vec<Warning>,
    #[serde(skip)]
    pub tracks: Vec<Track>,
}

/// Today's calibrated ground: the calibrated project, the fit, the state
/// at the hold point with the measured pore pressures applied, and that
/// factor.
pub struct Calibrated {
    pub project: Project,
    pub fit: Fit,
    pub state: State,
    pub pore_pressure_factor: f64,
    pub(crate) obs: Vec<Observation>,
    pub(crate) predicted: Vec<f64>,
    pub(crate) calibrated: Vec<f64>,
}

/// Calibrate the model on the readings and build today's state.
pub fn calibrate(p: &Project, r: &Readings) -> Result<Calibrated> {
    let fit = calibrate::fit(p, r)?;
    let obs = calibrate::observations(p, r);
    let (predicted, _) = calibrate::predict(&Engine::new(p), r, &obs);
    let q = p.with_consolidation_factor(fit.multiplier);
    let engine = Engine::new(&q);
    let (calibrated, mut state) = calibrate::predict(&engine, r, &obs);
    // Measured over calibrated excess at each piezometer's latest reading.
    let (mut meas, mut model) = (0.0, 0.0);
    for (k, inst) in p.instruments.iter().enumerate() {
        if inst.kind != InstrumentKind::Piezometer {
            continue;
        }
        if let Some(j) = obs.iter().rposition(|o| r.readings[o.reading].instrument == k)
            && calibrated[j] > 1.0
        {
            meas += obs[j].measured;
            model += calibrated[j];
        }
    }
    let ratio = if model > 0.0 { meas / model } else { 1.0 };
    let pore_pressure_factor = ratio.max(1.0);
    for c in &mut state.cols {
        for u in &mut c.u {
            *u *= pore_pressure_factor;
        }
    }
    Ok(Calibrated { project: q, fit, state, pore_pressure_factor, obs, predicted, calibrated })
}

/// Run the release check for a lift of `lift_m` starting on or after `on`
/// (the day after the hold point when None).
pub fn check(p: &Project, r: &Readings, lift_m: f64, on: Option<NaiveDate>) -> Result<ReleaseCheck> {
    let cal = calibrate(p, r)?;
    let engine = Engine::new(&cal.project);
    let runner = Runner::new(&engine);
    let height_now = cal.state.height_m;
    let top = p.max_height_m();
    if !(lift_m.is_finite() && lift_m > 0.0 && height_now + lift_m <= top + 1e-9) {
        return Err(Error::Usage(format!(
            "--lift {lift_m} must be more than 0 and at most {:.2} m (crest now {height_now:.2} m, design height plus surcharge {top:.2} m)",
            top - height_now
        )));
    }
    let mut st = cal.state.clone();
    if let Some(d) = on {
        if d < r.today.date() {
            return Err(Error::Usage(format!("--on {d} is before the hold point ({})", r.today.date())));
        }
        let day = runner.calendar.day_of(d);
        if day > runner.calendar.horizon() {
            return Err(Error::Usage(format!("--on {d} is beyond the 40-year horizon")));
        }
        runner.rest_until(&mut st, day, &mut |_| {});
    }
    let mut effort = Effort::default();
    let fs_now = runner.stability(&cal.state, &mut effort)?.governing_fs();
    let mut after = st.clone();
    let (a, b) = runner.place(&mut after, lift_m, &mut |_| {})?;
    let next = runner.stability(&after, &mut effort)?;
    let target = p.criteria.fs_construction;
    let fs_next = next.governing_fs();

    let instruments = statuses(p, r, &cal, &engine);
    let mut rules = trend_rules(p, r, &instruments);
    rules.push(Rule::at_least(
        "FS of the section now",
        fs_now,
        target,
        format!("crest {height_now:.2} m at the hold point, calibrated model and measured pore pressures"),
    ));
    rules.push(Rule::at_least(
        "FS of the next lift",
        fs_next,
        target,
        format!(
            "{lift_m:.2} m lift to {:.2} m, calibrated model (cv, ch × {:.2}), pore pressures × {:.2}",
            height_now + lift_m,
            cal.fit.multiplier,
            cal.pore_pressure_factor
        ),
    ));
    let decision = if rules.iter().any(|r| r.verdict == Verdict::Fail) { Decision::Hold } else { Decision::Release };
    let fs_fails = fs_next < target;
    let trend_fails = rules.iter().any(|r| r.verdict == Verdict::Fail && r.basis == "readings");
    let (earliest_release, release_note) = if !fs_fails {
        let note = if trend_fails {
            "the factor of safety is met; release when the failing readings rules clear on new readings".to_string()
        } else {
            String::new()
        };
        (None, note)
    } else {
        let first = runner.next_workable(st.day.ceil() as i64)?;
        match planner::earliest_safe_day(&runner, &st, first, lift_m, &mut effort) {
            Ok(day) => {
                let d = runner.calendar.date(day)?;
                let mut note = format!(
                    "forecast from the calibrated model: the {lift_m:.2} m lift reaches FS {target:.2} if started on {d}"
                );
                if trend_fails {
                    note.push_str(", and only once the failing readings rules clear");
                }
                (Some(d), note)
            }
            Err(Error::Computation(why)) => (None, why),
            Err(e) => return Err(e),
        }
    };
    let mut warnings = r.warnings.clone();
    for message in engine.convergence_warning().into_iter().chain(runner.stability_warnings()) {
        warnings.push(Warning { line: None, instrument: String::new(), message });
    }
    if !cal.fit.within_range {
        warnings.push(Warning {
            line: None,
            instrument: String::new(),
            message: format!(
                "the fitted multiplier {:.2} lies at the edge of the search range {}–{}: the readings disagree with the model beyond a change of consolidation rate; check the instruments and the parameters",
                cal.fit.multiplier,
                calibrate::M_MIN,
                calibrate::M_MAX
            ),
        });
    }
    Ok(ReleaseCheck {
        hold_point: r.today,
        readings_file: r.file.clone(),
        readings_sha256: r.sha256.clone(),
        height_now_m: height_now,
        lift_m,
        height_after_m: height_now + lift_m,
        lift_start: runner.calendar.date(a)?,
        lift_end: runner.calendar.date(b)?,
        asaoka: plates_asaoka(p, &engine, r),
        tracks: tracks(p, r, &cal),
        instruments,
        fit: cal.fit,
        pore_pressure_factor: cal.pore_pressure_factor,
        fs_now,
        fs_next,
        fs_target: target,
        mechanism: next.governing_mechanism(),
        rules,
        decision,
        earliest_release,
        release_note,
        warnings,
    })
}

/// Least-squares slope of (day, value) points, per day.
fn slope(points: &[(f64, f64)]) -> Option<f64> {
    if points.len() < 2 {
        return None;
    }
    let n = points.len() as f64;
    let (mx, my) = (points.iter().map(|p| p.0).sum::<f64>() / n, points.iter().map(|p| p.1).sum::<f64>() / n);
    let sxx: f64 = points.iter().map(|p| (p.0 - mx).powi(2)).sum();
    if sxx <= 0.0 {
        return None;
    }
    Some(points.iter().map(|p| (p.0 - mx) * (p.1 - my)).sum::<f64>() / sxx)
}

/// Usable (day, SI value) readings of instrument k.
fn series(r: &Readings, k: usize) -> Vec<(f64, f64)> {
    r.of(k).map(|x| (x.day, x.value)).collect()
}

fn statuses(p: &Project, r: &Readings, cal: &Calibrated, engine: &Engine) -> Vec<InstrumentStatus> {
    let window = p.monitoring.rate_window_days;
    let since = r.last_change_end();
    p.instruments
        .iter()
        .enumerate()
        .map(|(k, inst)| {
            let all: Vec<_> = r.readings.iter().filter(|x| x.instrument == k).collect();
            let pts = series(r, k);
            let last_obs = cal.obs.iter().rposition(|o| r.readings[o.reading].instrument == k);
            let u0 = ground::u0(&p.ground, inst.depth_m);
            let measured = match inst.kind {
                InstrumentKind::Piezometer => pts.last().map(|x| x.1 - u0),
                _ => pts.last().map(|x| x.1),
            };
            let mut s = InstrumentStatus {
                id: inst.id.clone(),
                kind: inst.kind,
                offset_m: inst.offset_m,
                depth_m: (inst.kind == InstrumentKind::Piezometer).then_some(inst.depth_m),
                readings: all.len(),
                suspect: all.iter().filter(|x| x.suspect.is_some()).count(),
                last_reading: r.of(k).last().map(|x| x.time),
                measured,
                predicted: last_obs.map(|j| cal.predicted[j]),
                calibrated: last_obs.map(|j| cal.calibrated[j]),
                pore_pressure_ratio: None,
                dissipated_since_lift: None,
                rate_mm_per_day: None,
            };
            match inst.kind {
                InstrumentKind::Piezometer => {
                    let dsv = engine.fill_stress_at(&cal.state, inst.offset_m, inst.depth_m);
                    s.pore_pressure_ratio = measured.filter(|_| dsv > 1.0).map(|du| du / dsv);
                    let at_end = pts.iter().find(|x| x.0 >= since - 1e-9).map(|x| x.1 - u0);
                    s.dissipated_since_lift = match (at_end, measured) {
                        (Some(a), Some(b)) if a > 0.5 && since > 0.0 => Some((a - b) / a),
                        _ => None,
                    };
                }
                _ => {
                    let recent: Vec<(f64, f64)> =
                        pts.iter().copied().filter(|x| x.0 >= r.today_day - window - 1e-9).collect();
                    s.rate_mm_per_day = slope(&recent).map(|v| 1000.0 * v);
                }
            }
            s
        })
        .collect()
}

/// The readings rules: pore pressure under constant load, settlement and
/// lateral movement rates, and lateral over settlement increment.
fn trend_rules(p: &Project, r: &Readings, st: &[InstrumentStatus]) -> Vec<Rule> {
    let m = &p.monitoring;
    let since = r.last_change_end();
    let mut rules = Vec::new();
    // Pore pressure rise since the end of the last lift.
    let mut rise: Option<(f64, String)> = None;
    for (k, inst) in p.instruments.iter().enumerate() {
        if inst.kind != InstrumentKind::Piezometer {
            continue;
        }
        let pts: Vec<(f64, f64)> = series(r, k).into_iter().filter(|x| x.0 >= since - 1e-9).collect();
        if pts.len() < 2 {
            continue;
        }
        let low = pts.iter().map(|x| x.1).fold(f64::INFINITY, f64::min);
        let v = pts[pts.len() - 1].1 - low;
        if rise.as_ref().is_none_or(|(b, _)| v > *b) {
            rise = Some((v, inst.id.clone()));
        }
    }
    rules.push(match rise {
        Some((v, id)) => Rule::at_most(
            "pore pressure rise under constant load",
            v,
            m.pore_rise_limit_kpa,
            "kPa",
            format!("largest at {id}: latest reading over the lowest since the last lift ended"),
        ),
        None => Rule::not_evaluated(
            "pore pressure rise under constant load",
            m.pore_rise_limit_kpa,
            "kPa",
            "fewer than two piezometer readings since the last lift ended",
        ),
    });
    let rate_rule = |kind: InstrumentKind, name: &'static str, limit: f64| -> Rule {
        let best = st
            .iter()
            .filter(|s| s.kind == kind)
            .filter_map(|s| s.rate_mm_per_day.map(|v| (v.abs(), s.id.clone())))
            .max_by(|a, b| a.0.total_cmp(&b.0));
        match best {
            Some((v, id)) => Rule::at_most(
                name,
                v,
                limit,
                "mm/day",
                format!("largest at {id} over the last {:.0} days", m.rate_window_days),
            ),
            None => Rule::not_evaluated(name, limit, "mm/day", "fewer than two readings in the rate window"),
        }
    };
    rules.push(rate_rule(InstrumentKind::SettlementPlate, "settlement rate", m.settlement_rate_limit_mm_per_day));
    rules.push(rate_rule(InstrumentKind::LateralMarker, "lateral movement rate", m.lateral_rate_limit_mm_per_day));
    rules.push(ratio_rule(p, r));
    rules
}

/// Lateral movement increment at each marker over the centreline settlement
/// increment (plate nearest the centreline) since the start of the last lift.
fn ratio_rule(p: &Project, r: &Readings) -> Rule {
    let name = "lateral / settlement increment";
    let limit = p.monitoring.lateral_ratio_limit;
    let start = r.last_change().map(|c| c.0);
    let plate = p
        .instruments
        .iter()
        .enumerate()
        .filter(|(_, i)| i.kind == InstrumentKind::SettlementPlate)
        .min_by(|a, b| a.1.offset_m.abs().total_cmp(&b.1.offset_m.abs()));
    let (Some(start), Some((kp, plate))) = (start, plate) else {
        return Rule::not_evaluated(name, limit, "", "needs a lift in the fill record and a settlement plate");
    };
    let increment = |k: usize| -> Option<f64> {
        let pts = series(r, k);
        let before = pts.iter().rev().find(|x| x.0 <= start + 1e-9).or(pts.first())?;
        let now = pts.last()?;
        (now.0 > before.0).then_some(now.1 - before.1)
    };
    let Some(ds) = increment(kp) else {
        return Rule::not_evaluated(name, limit, "", "no plate readings span the last lift");
    };
    if ds < 2.0 * p.monitoring.settlement_noise_m {
        return Rule::not_evaluated(
            name,
            limit,
            "",
            "settlement since the last lift is within twice the reading noise",
        );
    }
    let best = p
        .instruments
        .iter()
        .enumerate()
        .filter(|(_, i)| i.kind == InstrumentKind::LateralMarker)
        .filter_map(|(k, i)| increment(k).map(|d| (d / ds, i.id.clone())))
        .max_by(|a, b| a.0.total_cmp(&b.0));
    match best {
        Some((v, id)) => {
            Rule::at_most(name, v, limit, "", format!("{id} against {} since the last lift began", plate.id))
        }
        None => Rule::not_evaluated(name, limit, "", "no lateral-marker readings span the last lift"),
    }
}

/// Drainage for Asaoka's coefficient at offset x: radial where drains are
/// installed under the fill (within the toe), with Hansbo's μ averaged over
/// the drain length as the engine uses it (smear and well resistance);
/// vertical otherwise.
fn drainage_at(p: &Project, engine: &Engine, x_m: f64) -> Drainage {
    let toe = crate::response::column_offsets(p)[3].x_m;
    if let Some(d) = &p.drains
        && x_m.abs() <= toe
    {
        let de = d.influence_diameter_m();
        let mus: Vec<f64> =
            engine.columns[0].radial.iter().filter(|f| **f > 0.0).map(|f| 8.0 / (de * de * f)).collect();
        if !mus.is_empty() {
            return Drainage::Radial { de_m: de, mu: mus.iter().sum::<f64>() / mus.len() as f64 };
        }
    }
    Drainage::Vertical { path_m: drainage_path_m(p) }
}

/// Longest vertical drainage path of the clay: each run of consecutive clay
/// layers drains at its top (the surface or a sand) and at its bottom when
/// that is sand or a drained base.
pub fn drainage_path_m(p: &Project) -> f64 {
    let layers = &p.ground.layers;
    let mut best: f64 = 0.0;
    let mut run = 0.0;
    for (i, l) in layers.iter().enumerate() {
        match l.kind {
            LayerKind::Clay(_) => run += l.thickness_m,
            _ => run = 0.0,
        }
        let ends_here = !matches!(l.kind, LayerKind::StiffBase)
            && !matches!(layers.get(i + 1).map(|n| &n.kind), Some(LayerKind::Clay(_)));
        if matches!(l.kind, LayerKind::Clay(_)) && ends_here {
            let bottom_drains = match layers.get(i + 1).map(|n| &n.kind) {
                Some(LayerKind::Sand { .. }) => true,
                Some(LayerKind::StiffBase) | None => p.ground.base_drained,
                Some(LayerKind::Clay(_)) => false,
            };
            best = best.max(if bottom_drains { run / 2.0 } else { run });
        }
    }
    best
}

fn plates_asaoka(p: &Project, engine: &Engine, r: &Readings) -> Vec<(String, Asaoka)> {
    let since = r.last_change_end();
    p.instruments
        .iter()
        .enumerate()
        .filter(|(_, i)| i.kind == InstrumentKind::SettlementPlate)
        .map(|(k, inst)| {
            let pts: Vec<(f64, f64)> = series(r, k).into_iter().filter(|x| x.0 >= since - 1e-9).collect();
            let (t, s): (Vec<f64>, Vec<f64>) = pts.into_iter().unzip();
            (
                inst.id.clone(),
                asaoka::asaoka(&t, &s, p.monitoring.asaoka_interval_days, drainage_at(p, engine, inst.offset_m)),
            )
        })
        .collect()
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
            out[k].measured = series(r, k);
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
