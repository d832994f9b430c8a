//! Trends judged on many readings: least-squares lines over stated windows
//! with their standard error, never smaller than the reading precision
//! allows (se ≥ sd/√Sxx). Rules: pore pressure rising under constant load
//! over the window and over its last readings (fails at 99% two-sided
//! significance above the rate limit; a best estimate above the limit that
//! is not proven holds for review), settlement and lateral
//! rates, lateral acceleration (the curvature of a least-squares parabola
//! through the marker readings of the trend window, significant at 99%), Δu/Δσv of the last
//! lift against a yield-indicating limit (the ratio rises towards 1 as the
//! clay passes σ'p: Leroueil, Tavenas et al. 1985), and the lateral over
//! settlement increment ratio ΔL/ΔS (Tavenas, Mieussens & Bourges 1979).

use super::readings::Readings;
use super::release::{Rule, Verdict};
use crate::load;
use crate::model::{InstrumentKind, Project};

/// z of a two-sided 99% interval (normal).
pub const Z99: f64 = 2.576;

/// Names of the rules the escalation looks for.
pub const PORE_RISE: &str = "pore pressure rising under constant load";
pub const LATERAL_ACCELERATION: &str = "lateral movement accelerating";

/// A fitted straight line: slope per day and its standard error.
#[derive(Debug, Clone, Copy)]
pub struct Line {
    pub slope: f64,
    pub se: f64,
    pub n: usize,
}

/// Least-squares line through (day, value) points; the standard error
/// uses the larger of the residual scatter and the stated precision `sd`.
pub fn regress(points: &[(f64, f64)], sd: f64) -> Option<Line> {
    let n = points.len();
    if n < 3 {
        return None;
    }
    let nf = n as f64;
    let mx = points.iter().map(|p| p.0).sum::<f64>() / nf;
    let my = points.iter().map(|p| p.1).sum::<f64>() / nf;
    let sxx: f64 = points.iter().map(|p| (p.0 - mx).powi(2)).sum();
    if sxx <= 1e-12 {
        return None;
    }
    let slope = points.iter().map(|p| (p.0 - mx) * (p.1 - my)).sum::<f64>() / sxx;
    let sse: f64 = points.iter().map(|p| (p.1 - my - slope * (p.0 - mx)).powi(2)).sum();
    let s2 = (sse / (nf - 2.0)).max(sd * sd);
    Some(Line { slope, se: (s2 / sxx).sqrt(), n })
}

/// Usable (day, SI value) readings of instrument k from day `from` on.
pub fn series_from(r: &Readings, k: usize, from: f64) -> Vec<(f64, f64)> {
    r.of(k).filter(|x| x.day >= from - 1e-9).map(|x| (x.day, x.value)).collect()
}

/// All the trend rules of a hold point.
pub fn rules(p: &Project, r: &Readings) -> Vec<Rule> {
    vec![
        pore_rise(p, r),
        rate_rule(p, r, InstrumentKind::SettlementPlate),
        rate_rule(p, r, InstrumentKind::LateralMarker),
        acceleration(p, r),
        lift_ratio(p, r),
        lateral_ratio(p, r),
    ]
}

fn of_kind(p: &Project, kind: InstrumentKind) -> impl Iterator<Item = (usize, &crate::model::Instrument)> {
    p.instruments.iter().enumerate().filter(move |(_, i)| i.kind == kind)
}

/// Readings of the recent part of the pore-pressure record: the slope over
/// the last this-many readings of the trend window is judged as well as
/// the slope over the whole window, so that a fresh rise is not diluted by
/// older readings (six readings are 15 days at the usual 3-day interval;
/// chosen here, not from a source).
pub const RECENT_READINGS: usize = 6;

/// One piezometer's rise over one part of its record, judged.
struct Rise {
    id: String,
    /// "the whole window" or "the last 6 readings".
    part: String,
    line: Line,
    verdict: Verdict,
}

impl Rise {
    fn rate(&self) -> f64 {
        7.0 * self.line.slope
    }

    /// The 99% two-sided half-width, kPa/week.
    fn half(&self) -> f64 {
        7.0 * Z99 * self.line.se
    }

    /// Fail and "possible" before pass; then the larger lower bound.
    fn severity(&self) -> (u8, f64) {
        let rank = match self.verdict {
            Verdict::Fail => 2,
            Verdict::Possible => 1,
            _ => 0,
        };
        (rank, self.rate() - self.half())
    }
}

/// Judge one rise: fail when the rate is above the limit and the rise is
/// beyond the reading precision at 99%; "possible" when the best estimate
/// is above the limit but not proven (whole window) or when it exceeds the
/// limit by more than one standard error (recent part, whose slope on six
/// readings scatters about ±1.1 kPa/week at the default 2 kPa precision, so
/// its best estimate alone would hold most stable records).
fn judge(line: Line, limit_per_week: f64, recent: bool) -> Verdict {
    let (rate, se) = (7.0 * line.slope, 7.0 * line.se);
    let margin = if recent { se } else { 0.0 };
    if rate > limit_per_week && rate - Z99 * se > 0.0 {
        Verdict::Fail
    } else if rate - margin > limit_per_week {
        Verdict::Possible
    } else {
        Verdict::Pass
    }
}

fn pore_rise(p: &Project, r: &Readings) -> Rule {
    let m = &p.monitoring;
    let limit = m.pore_rise_limit_kpa_per_week;
    let from = r.last_change_end().max(r.today_day - m.trend_window_days);
    let mut rises = Vec::new();
    for (k, i) in of_kind(p, InstrumentKind::Piezometer) {
        let pts = series_from(r, k, from);
        if let Some(l) = regress(&pts, m.piezometer_sd_kpa) {
            let part = format!("{} readings over the last {:.0} days", l.n, r.today_day - from);
            rises.push(Rise { id: i.id.clone(), part, line: l, verdict: judge(l, limit, false) });
        }
        if pts.len() > RECENT_READINGS {
            let tail = &pts[pts.len() - RECENT_READINGS..];
            if let Some(l) = regress(tail, m.piezometer_sd_kpa) {
                let part = format!("the last {} readings ({:.0} days)", l.n, r.today_day - tail[0].0);
                rises.push(Rise { id: i.id.clone(), part, line: l, verdict: judge(l, limit, true) });
            }
        }
    }
    let Some(w) =
        rises.iter().max_by(|a, b| a.severity().partial_cmp(&b.severity()).unwrap_or(std::cmp::Ordering::Equal))
    else {
        return Rule::not_evaluated(
            PORE_RISE,
            limit,
            "kPa/week",
            "fewer than three piezometer readings since the last lift ended",
        );
    };
    let others: Vec<String> = rises
        .iter()
        .filter(|x| x.id == w.id && x.part != w.part)
        .map(|x| format!("{:+.2} ± {:.2} over {}", x.rate(), x.half(), x.part))
        .collect();
    let also = if others.is_empty() { String::new() } else { format!(" (and {})", others.join(", ")) };
    Rule {
        verdict: w.verdict,
        ..Rule::at_most(
            PORE_RISE,
            w.rate(),
            limit,
            "kPa/week",
            format!(
                "{}: {:+.2} ± {:.2} kPa/week (99%) over {}{also}; fails when above the limit and beyond the reading precision ({:.1} kPa); a best estimate above the limit that is not proven holds for review",
                w.id,
                w.rate(),
                w.half(),
                w.part,
                m.piezometer_sd_kpa
            ),
        )
    }
}

fn rate_rule(p: &Project, r: &Readings, kind: InstrumentKind) -> Rule {
    let m = &p.monitoring;
    let (name, limit, sd) = match kind {
        InstrumentKind::SettlementPlate => ("settlement rate", m.settlement_rate_limit_mm_per_day, m.settlement_sd_m),
        _ => ("lateral movement rate", m.lateral_rate_limit_mm_per_day, m.lateral_sd_m),
    };
    let from = r.today_day - m.rate_window_days;
    let best = of_kind(p, kind)
        .filter_map(|(k, i)| regress(&series_from(r, k, from), sd).map(|l| (l, i.id.clone())))
        .max_by(|a, b| a.0.slope.abs().total_cmp(&b.0.slope.abs()));
    match best {
        Some((l, id)) => Rule::at_most(
            name,
            1000.0 * l.slope.abs(),
            limit,
            "mm/day",
            format!(
                "largest at {id}: {:.2} ± {:.2} mm/day (99%) over the last {:.0} days",
                1000.0 * l.slope.abs(),
                1000.0 * Z99 * l.se,
                m.rate_window_days
            ),
        ),
        None => Rule::not_evaluated(name, limit, "mm/day", "fewer than three readings in the rate window"),
    }
}

/// Acceleration of a series: 2c of the least-squares parabola
/// a + b t + c t² (t centred), with its standard error from the larger of
/// the residual scatter and the precision `sd`. Needs five points.
pub fn acceleration_of(points: &[(f64, f64)], sd: f64) -> Option<(f64, f64)> {
    let n = points.len();
    if n < 5 {
        return None;
    }
    let mt = points.iter().map(|p| p.0).sum::<f64>() / n as f64;
    let x = nalgebra::DMatrix::from_fn(n, 3, |i, j| (points[i].0 - mt).powi(j as i32));
    let y = nalgebra::DVector::from_iterator(n, points.iter().map(|p| p.1));
    let xtx = x.transpose() * &x;
    let inv = xtx.try_inverse()?;
    let c = &inv * x.transpose() * &y;
    let sse = (&y - &x * &c).norm_squared();
    let s2 = (sse / (n as f64 - 3.0)).max(sd * sd);
    Some((2.0 * c[2], 2.0 * (s2 * inv[(2, 2)]).sqrt()))
}

fn acceleration(p: &Project, r: &Readings) -> Rule {
    let m = &p.monitoring;
    let from = r.last_change_end().max(r.today_day - m.trend_window_days);
    let best = of_kind(p, InstrumentKind::LateralMarker)
        .filter_map(|(k, i)| acceleration_of(&series_from(r, k, from), m.lateral_sd_m).map(|a| (a, i.id.clone())))
        .max_by(|a, b| (a.0.0 / a.0.1).total_cmp(&(b.0.0 / b.0.1)));
    let Some(((acc, se), id)) = best else {
        return Rule::not_evaluated(
            LATERAL_ACCELERATION,
            Z99,
            "se",
            "fewer than five marker readings since the last lift ended within the trend window",
        );
    };
    let z = acc / se;
    Rule::at_most(
        LATERAL_ACCELERATION,
        z,
        Z99,
        "se",
        format!(
            "{id}: outward acceleration {:+.3} ± {:.3} mm/day² (1 se) over the last {:.0} days (parabola through the readings); fails beyond 99% significance",
            1000.0 * acc,
            1000.0 * se,
            r.today_day - from
        ),
    )
}

/// One piezometer across the last lift: its readings before the lift
/// began and after it ended (day, u kPa) and the vertical stress the lift
/// added at the tip, kPa.
struct LiftTip<'a> {
    inst: &'a crate::model::Instrument,
    before: (f64, f64),
    after: (f64, f64),
    dsv: f64,
}

/// The last lift (start and end day) and every piezometer read before and
/// after it where the lift added more than 5 kPa: the change of pore
/// pressure from the last reading before the lift began to the first after
/// it ended, over the vertical stress the lift added at the tip (elastic
/// increments of the fill placed: the crest height plus the settlement made
/// up, read on the plate nearest the centreline, at the lift's start and end).
fn lift_tips<'a>(p: &'a Project, r: &Readings) -> Option<((f64, f64), Vec<LiftTip<'a>>)> {
    let (start, end) = r.last_change()?;
    let e = &p.embankment;
    let plate: Vec<(f64, f64)> = of_kind(p, InstrumentKind::SettlementPlate)
        .min_by(|a, b| a.1.offset_m.abs().total_cmp(&b.1.offset_m.abs()))
        .map(|(k, _)| r.of(k).map(|x| (x.day, x.value)).collect())
        .unwrap_or_default();
    let settled = |t: f64| plate.iter().rev().find(|x| x.0 <= t + 1e-9).map_or(0.0, |x| x.1);
    let placed = |t: f64| r.height_at(t) + settled(t);
    let dsv = |x: f64, z: f64| {
        let at = |h: f64| load::stress(&load::profile(e, h), e.fill_unit_weight_kn_m3, x.abs(), z).sz;
        at(placed(end)) - at(placed(start))
    };
    let tips = of_kind(p, InstrumentKind::Piezometer)
        .filter_map(|(k, inst)| {
            let pts: Vec<(f64, f64)> = r.of(k).map(|x| (x.day, x.value)).collect();
            let before = *pts.iter().rev().find(|x| x.0 <= start + 1e-9)?;
            let after = *pts.iter().find(|x| x.0 >= end - 1e-9)?;
            let d = dsv(inst.offset_m, inst.depth_m);
            (d > 5.0).then_some(LiftTip { inst, before, after, dsv: d })
        })
        .collect();
    Some(((start, end), tips))
}

/// Δu/Δσv of the last lift at each piezometer (`lift_tips`), the largest
/// against the limit.
fn lift_ratio(p: &Project, r: &Readings) -> Rule {
    let name = "Δu/Δσv of the last lift";
    let limit = p.monitoring.pore_pressure_ratio_limit;
    let Some((_, tips)) = lift_tips(p, r) else {
        return Rule::not_evaluated(name, limit, "", "no lift in the fill record");
    };
    let best =
        tips.iter().map(|t| ((t.after.1 - t.before.1) / t.dsv, t.inst.id.clone())).max_by(|a, b| a.0.total_cmp(&b.0));
    match best {
        Some((v, id)) => Rule::at_most(
            name,
            v,
            limit,
            "",
            format!(
                "largest at {id}; near 1 the clay at the tip has passed σ'p and is yielding (Leroueil et al. 1985)"
            ),
        ),
        None => Rule::not_evaluated(name, limit, "", "no piezometer read both before and after the last lift"),
    }
}

/// Lateral movement increment at each marker over the centreline
/// settlement increment (plate nearest the centreline) since the start of
/// the last lift: ΔL/ΔS of Tavenas, Mieussens & Bourges (1979).
fn lateral_ratio(p: &Project, r: &Readings) -> Rule {
    let name = "lateral / settlement increment ΔL/ΔS (Tavenas et al. 1979)";
    let limit = p.monitoring.lateral_ratio_limit;
    let start = r.last_change().map(|c| c.0);
    let plate =
        of_kind(p, InstrumentKind::SettlementPlate).min_by(|a, b| a.1.offset_m.abs().total_cmp(&b.1.offset_m.abs()));
    let (Some(start), Some((kp, plate))) = (start, plate) else {
        return Rule::not_evaluated(name, limit, "", "needs a lift in the fill record and a settlement plate");
    };
    let increment = |k: usize| -> Option<f64> {
        let pts: Vec<(f64, f64)> = r.of(k).map(|x| (x.day, x.value)).collect();
        let before = before_lift(&pts, start)?;
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
    let best = of_kind(p, InstrumentKind::LateralMarker)
        .filter_map(|(k, i)| increment(k).map(|d| (d / ds, i.id.clone())))
        .max_by(|a, b| a.0.total_cmp(&b.0));
    match best {
        Some((v, id)) => {
            Rule::at_most(name, v, limit, "", format!("{id} against {} since the last lift began", plate.id))
        }
        None => Rule::not_evaluated(name, limit, "", "no lateral-marker readings span the last lift"),
    }
}

/// The reading a lift's increments start from: the last at or before the
/// lift began, else the first.
fn before_lift(pts: &[(f64, f64)], start: f64) -> Option<(f64, f64)> {
    pts.iter().rev().find(|x| x.0 <= start + 1e-9).or(pts.first()).copied()
}

/// An alarm limit as a line on the record's time plots: the project key
/// (in `[monitoring]`), its value and unit, the instrument it is drawn for
/// and the line's points (days since the project start; excess pore
/// pressure kPa, settlement m or outward movement m, as the plots' tracks).
#[derive(Debug, Clone)]
pub struct LimitTrace {
    pub kind: InstrumentKind,
    pub key: &'static str,
    pub value: f64,
    pub unit: &'static str,
    pub id: String,
    pub points: Vec<(f64, f64)>,
}

/// The alarm limits of the trend rules drawn where they apply, each for
/// every instrument the rule reads: the pore-pressure rise rate and the
/// settlement and lateral rates as lines of the limiting slope ending at
/// the last reading and spanning the rule's window (readings steeper than
/// the line exceed the limit); Δu/Δσv as the excess pore pressure the limit
/// allows after the last lift (reading before the lift plus the limit times
/// Δσv at the tip); ΔL/ΔS as the outward movement the limit allows for the
/// settlement measured since the lift began at the plate nearest the
/// centreline. `excess(id, day)` is the plotted excess pore pressure of a
/// piezometer reading (after the tip-settlement correction); a reading it
/// does not know is taken above the initial u0 at the installed depth.
pub fn limit_traces(p: &Project, r: &Readings, excess: &dyn Fn(&str, f64) -> Option<f64>) -> Vec<LimitTrace> {
    let m = &p.monitoring;
    let u0 = |z: f64| crate::ground::u0(&p.ground, z);
    let plotted = |id: &str, day: f64, value: f64, z: f64| excess(id, day).unwrap_or(value - u0(z));
    let mut out = Vec::new();
    let mut slope = |kind, key, value: f64, unit, per_day: f64, window: f64, pore: bool| {
        for (k, inst) in of_kind(p, kind) {
            let from = r.today_day - window;
            let Some(last) = r.of(k).last() else { continue };
            let first = r.of(k).map(|x| x.day).find(|d| *d >= from - 1e-9).unwrap_or(last.day);
            if last.day - first < 1e-9 {
                continue;
            }
            let y = if pore { plotted(&inst.id, last.day, last.value, inst.depth_m) } else { last.value };
            out.push(LimitTrace {
                kind,
                key,
                value,
                unit,
                id: inst.id.clone(),
                points: vec![(first, y - per_day * (last.day - first)), (last.day, y)],
            });
        }
    };
    let pore_window = r.today_day - r.last_change_end().max(r.today_day - m.trend_window_days);
    let (rise, settle, lateral) =
        (m.pore_rise_limit_kpa_per_week, m.settlement_rate_limit_mm_per_day, m.lateral_rate_limit_mm_per_day);
    slope(InstrumentKind::Piezometer, "pore_rise_limit_kpa_per_week", rise, "kPa/week", rise / 7.0, pore_window, true);
    let w = m.rate_window_days;
    let (s_key, l_key) = ("settlement_rate_limit_mm_per_day", "lateral_rate_limit_mm_per_day");
    slope(InstrumentKind::SettlementPlate, s_key, settle, "mm/day", settle / 1000.0, w, false);
    slope(InstrumentKind::LateralMarker, l_key, lateral, "mm/day", lateral / 1000.0, w, false);
    if let Some(((start, end), tips)) = lift_tips(p, r) {
        for t in tips {
            let before = plotted(&t.inst.id, t.before.0, t.before.1, t.inst.depth_m);
            let y = before + m.pore_pressure_ratio_limit * t.dsv;
            out.push(LimitTrace {
                kind: InstrumentKind::Piezometer,
                key: "pore_pressure_ratio_limit",
                value: m.pore_pressure_ratio_limit,
                unit: "",
                id: t.inst.id.clone(),
                points: vec![(start, y), (end.max(t.after.0), y)],
            });
        }
    }
    let plate =
        of_kind(p, InstrumentKind::SettlementPlate).min_by(|a, b| a.1.offset_m.abs().total_cmp(&b.1.offset_m.abs()));
    if let (Some((start, _)), Some((kp, _))) = (r.last_change(), plate) {
        let s: Vec<(f64, f64)> = r.of(kp).map(|x| (x.day, x.value)).collect();
        for (k, inst) in of_kind(p, InstrumentKind::LateralMarker) {
            let l: Vec<(f64, f64)> = r.of(k).map(|x| (x.day, x.value)).collect();
            let (Some(s0), Some(l0)) = (before_lift(&s, start), before_lift(&l, start)) else { continue };
            let points: Vec<(f64, f64)> = s
                .iter()
                .filter(|x| x.0 >= s0.0 - 1e-9)
                .map(|x| (x.0, l0.1 + m.lateral_ratio_limit * (x.1 - s0.1)))
                .collect();
            if points.len() > 1 {
                out.push(LimitTrace {
                    kind: InstrumentKind::LateralMarker,
                    key: "lateral_ratio_limit",
                    value: m.lateral_ratio_limit,
                    unit: "",
                    id: inst.id.clone(),
                    points,
                });
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_straight_line_has_its_slope_and_the_precision_floor() {
        // Exact line y = 2 + 0.5 t: slope 0.5, residuals 0, so the standard
        // error is the precision's sd/√Sxx (t = 0…6: Sxx = 28, hand sum).
        let pts: Vec<(f64, f64)> = (0..7).map(|t| (t as f64, 2.0 + 0.5 * t as f64)).collect();
        let l = regress(&pts, 1.0).unwrap();
        assert!((l.slope - 0.5).abs() < 1e-12);
        assert!((l.se - 1.0 / 28f64.sqrt()).abs() < 1e-12);
        assert!(regress(&pts[..2], 1.0).is_none());
    }
}
