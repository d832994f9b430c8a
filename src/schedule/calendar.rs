//! The working calendar: which days fill may be placed (working weekdays, not
//! a holiday, less an evenly spread weather-downtime allowance). Day numbers
//! count calendar days from the project start date (day 0); consolidation
//! runs on every calendar day.

use crate::error::{Error, Result};
use crate::model::Construction;
use chrono::{Datelike, NaiveDate, TimeDelta};

/// Horizon over which workable days are tabulated, days (40 years).
const HORIZON_DAYS: usize = 40 * 366;

/// Workable days from a start date.
#[derive(Debug, Clone)]
pub struct Calendar {
    pub start: NaiveDate,
    workable: Vec<bool>,
}

impl Calendar {
    /// Tabulate workable days. Weather downtime f is spread evenly: each
    /// working day earns (1 − f) of a day's credit and fill is placed on the
    /// days where the running credit reaches a whole day; the credit starts
    /// at f so that the first working day is workable.
    pub fn new(start: NaiveDate, c: &Construction) -> Calendar {
        let mut workable = Vec::with_capacity(HORIZON_DAYS);
        let mut credit = c.weather_downtime_fraction;
        for d in start.iter_days().take(HORIZON_DAYS) {
            let working = c.working_days.contains(&d.weekday()) && c.holidays.binary_search(&d).is_err();
            let mut place = false;
            if working {
                credit += 1.0 - c.weather_downtime_fraction;
                if credit >= 1.0 - 1e-9 {
                    credit -= 1.0;
                    place = true;
                }
            }
            workable.push(place);
        }
        Calendar { start, workable }
    }

    /// Whether fill may be placed on day `k`.
    pub fn workable(&self, k: i64) -> bool {
        usize::try_from(k).ok().and_then(|k| self.workable.get(k).copied()).unwrap_or(false)
    }

    /// First workable day at or after day `k`, if any within the horizon.
    pub fn next_workable(&self, k: i64) -> Option<i64> {
        let from = usize::try_from(k.max(0)).ok()?;
        self.workable[from.min(self.workable.len())..].iter().position(|w| *w).map(|p| (from + p) as i64)
    }

    /// Calendar date of day `k`; an error (never a panic) when the date
    /// cannot be represented.
    pub fn date(&self, k: i64) -> Result<NaiveDate> {
        shift(self.start, k, "a lift, rest or record date")
    }

    /// Day number of a date.
    pub fn day_of(&self, d: NaiveDate) -> i64 {
        (d - self.start).num_days()
    }

    /// Last day of the tabulated horizon.
    pub fn horizon(&self) -> i64 {
        self.workable.len() as i64 - 1
    }
}

/// `start` moved by `days` (negative: earlier), checked: an error names the
/// day count and what was being dated instead of overflowing.
pub fn shift(start: NaiveDate, days: i64, context: &'static str) -> Result<NaiveDate> {
    TimeDelta::try_days(days).and_then(|d| start.checked_add_signed(d)).ok_or(Error::DateOutOfRange {
        start,
        day: days,
        context,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use chrono::Weekday;

    #[test]
    fn far_dates_are_an_error_not_a_panic() {
        // chrono represents years −262143…262142 (its documented range);
        // 10^12 days is about 2.7 billion years, beyond it either way.
        let start = NaiveDate::from_ymd_opt(2030, 1, 7).unwrap();
        let cal = Calendar::new(start, &construction(0.0, vec![]));
        assert!(matches!(cal.date(i64::MAX), Err(Error::DateOutOfRange { .. })));
        assert!(matches!(cal.date(-1_000_000_000_000), Err(Error::DateOutOfRange { .. })));
        assert_eq!(cal.date(6).unwrap(), NaiveDate::from_ymd_opt(2030, 1, 13).unwrap());
        assert_eq!(cal.date(-1).unwrap(), NaiveDate::from_ymd_opt(2030, 1, 6).unwrap());
    }

    fn construction(downtime: f64, holidays: Vec<NaiveDate>) -> Construction {
        Construction {
            placement_rate_m_per_day: 0.3,
            lift_min_m: 0.5,
            lift_max_m: 2.0,
            lift_increment_m: 0.25,
            min_rest_days: 0,
            working_days: vec![Weekday::Mon, Weekday::Tue, Weekday::Wed, Weekday::Thu, Weekday::Fri],
            holidays,
            weather_downtime_fraction: downtime,
        }
    }

    #[test]
    fn weekends_and_holidays_are_not_workable() {
        // 2030-01-07 is a Monday (proleptic Gregorian calendar).
        let start = NaiveDate::from_ymd_opt(2030, 1, 7).unwrap();
        let hol = vec![NaiveDate::from_ymd_opt(2030, 1, 9).unwrap()];
        let cal = Calendar::new(start, &construction(0.0, hol));
        let days: Vec<bool> = (0..7).map(|k| cal.workable(k)).collect();
        assert_eq!(days, [true, true, false, true, true, false, false]);
        assert_eq!(cal.next_workable(5), Some(7));
    }

    #[test]
    fn downtime_is_spread_evenly() {
        let start = NaiveDate::from_ymd_opt(2030, 1, 7).unwrap();
        let cal = Calendar::new(start, &construction(0.2, vec![]));
        // 100 working weeks = 500 working days → 400 workable.
        let n = (0..700).filter(|k| cal.workable(*k)).count();
        assert_eq!(n, 400);
    }
}
