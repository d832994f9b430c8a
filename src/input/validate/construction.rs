//! Checks of `[construction]` (rates, lift limits, working days and
//! holidays) and of the proposed `[[sequence]]` of lifts.

use super::{Check, Low, show};
use crate::input::raw::{RawConstruction, RawLift};
use crate::model::*;
use chrono::{NaiveDate, Weekday};

pub(super) fn construction(c: &mut Check, r: &RawConstruction) -> Construction {
    let k = |f: &str| format!("construction.{f}");
    let lift_min_m = c.num(&k("lift_min_m"), r.lift_min_m, Low::Excl(0.0), 5.0);
    let lift_max_m = c.num(&k("lift_max_m"), r.lift_max_m, Low::Excl(0.0), 10.0);
    if lift_min_m > lift_max_m {
        c.bad(&k("lift_min_m"), format!("= {lift_min_m} must not exceed lift_max_m ({lift_max_m})"));
    }
    let inc = c.opt(&k("lift_increment_m"), r.lift_increment_m, 0.25, Low::Incl(0.05), 5.0);
    let rest = r.min_rest_days.unwrap_or(0);
    if !(0..=365).contains(&rest) {
        c.bad(&k("min_rest_days"), format!("= {rest} is out of range; allowed: 0 ≤ min_rest_days ≤ 365"));
    }
    let working_days = working_days(c, r.working_days.as_deref());
    Construction {
        placement_rate_m_per_day: c.num(
            &k("placement_rate_m_per_day"),
            r.placement_rate_m_per_day,
            Low::Excl(0.0),
            5.0,
        ),
        lift_min_m,
        lift_max_m,
        lift_increment_m: inc,
        min_rest_days: rest.clamp(0, 365) as u32,
        working_days,
        holidays: holidays(c, r.holidays.as_deref().unwrap_or(&[])),
        weather_downtime_fraction: c.opt(
            &k("weather_downtime_fraction"),
            r.weather_downtime_fraction,
            0.0,
            Low::Incl(0.0),
            0.8,
        ),
    }
}

fn working_days(c: &mut Check, days: Option<&[String]>) -> Vec<Weekday> {
    let Some(days) = days else {
        return vec![Weekday::Mon, Weekday::Tue, Weekday::Wed, Weekday::Thu, Weekday::Fri];
    };
    let mut out = Vec::new();
    for (i, d) in days.iter().enumerate() {
        match d.parse::<Weekday>() {
            Ok(w) if !out.contains(&w) => out.push(w),
            Ok(_) => c.bad(&format!("construction.working_days[{i}]"), format!("= \"{d}\" is listed twice")),
            Err(_) => c.bad(
                &format!("construction.working_days[{i}]"),
                format!("= \"{d}\" is not a weekday; use mon, tue, wed, thu, fri, sat, sun"),
            ),
        }
    }
    if out.is_empty() {
        c.bad("construction.working_days", "is empty; at least one working day is needed".into());
    }
    out
}

fn holidays(c: &mut Check, items: &[String]) -> Vec<NaiveDate> {
    let mut ranges: Vec<(NaiveDate, NaiveDate, usize)> = Vec::new();
    for (i, h) in items.iter().enumerate() {
        let key = format!("construction.holidays[{i}]");
        let (a, b) = match h.split_once("..") {
            Some((a, b)) => (c.parse_date(&key, a), c.parse_date(&key, b)),
            None => {
                let d = c.parse_date(&key, h);
                (d, d)
            }
        };
        if b < a {
            c.bad(&key, format!("= \"{h}\": the range ends before it starts"));
            continue;
        }
        if (b - a).num_days() > 366 {
            c.bad(&key, format!("= \"{h}\": a holiday range may span at most one year"));
            continue;
        }
        if let Some((_, _, j)) = ranges.iter().find(|(x, y, _)| a <= *y && *x <= b) {
            c.bad(&key, format!("= \"{h}\" overlaps construction.holidays[{j}]"));
        }
        ranges.push((a, b, i));
    }
    let mut out: Vec<NaiveDate> =
        ranges.iter().flat_map(|(a, b, _)| a.iter_days().take_while(move |d| d <= b)).collect();
    out.sort();
    out.dedup();
    out
}

pub(super) fn sequence(
    c: &mut Check,
    lifts: &[RawLift],
    info: &ProjectInfo,
    k: &Construction,
    e: &Embankment,
) -> Vec<ProposedLift> {
    let mut out: Vec<ProposedLift> = Vec::new();
    let mut total = 0.0;
    for (i, l) in lifts.iter().enumerate() {
        let key = format!("sequence[{i}]");
        let t = c.num(&format!("{key}.thickness_m"), l.thickness_m, Low::Excl(0.0), k.lift_max_m);
        let start = c.date(&format!("{key}.start_date"), &l.start_date);
        if start < info.start_date {
            c.bad(
                &format!("{key}.start_date"),
                format!("= {start} is before project.start_date ({})", info.start_date),
            );
        }
        // The overlap check needs a valid rate and thickness (bad values are
        // reported above and would give a meaningless day count).
        let rate_ok = (0.0..=5.0).contains(&k.placement_rate_m_per_day) && k.placement_rate_m_per_day > 0.0;
        if let Some(prev) = out.last().filter(|p| rate_ok && p.thickness_m > 0.0 && p.thickness_m <= k.lift_max_m) {
            let days = (prev.thickness_m / k.placement_rate_m_per_day).ceil() as i64;
            let last_day = crate::schedule::calendar::shift(prev.start, days.max(1) - 1, "the end of a lift");
            if last_day.is_ok_and(|end| start <= end) {
                c.bad(
                    &format!("{key}.start_date"),
                    format!(
                        "= {start} overlaps the previous lift, which needs at least {days} day(s) of placement from {}",
                        prev.start
                    ),
                );
            }
        }
        total += t;
        out.push(ProposedLift { thickness_m: t, start });
    }
    let limit = e.design_height_m + e.surcharge_height_m;
    if total > limit + 1e-9 {
        c.bad(
            "sequence",
            format!(
                "lifts add up to {} m, above embankment.design_height_m + embankment.surcharge_height_m ({limit:.2} m)",
                show((total * 100.0).round() / 100.0)
            ),
        );
    }
    out
}
