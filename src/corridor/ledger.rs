//! The day-by-day book of the shared resources: fill supply (m³ per day,
//! the sum of the sources open that day), placing crews (sections placing
//! fill or removing surcharge that day) and drain rigs (sections installing
//! drains that day). Supply comes on the workable days of the corridor
//! calendar (weather downtime included: fill delivered on a lost day
//! could not be placed). Day numbers count from the corridor start date; every
//! booking is checked here, so no day is over-booked.

use super::Resources;
use crate::schedule::calendar::Calendar;

/// Days tabulated (the calendar's 40-year horizon).
pub const DAYS: usize = 40 * 366;

/// A request for one day of one activity.
#[derive(Debug, Clone, Copy, Default)]
pub struct Need {
    /// Imported fill placed that day, m³.
    pub fill_m3: f64,
    /// Whether a placing crew is needed.
    pub crew: bool,
    /// Whether a drain rig is needed.
    pub rig: bool,
}

/// Resource use by day.
#[derive(Debug, Clone)]
pub struct Ledger {
    capacity_m3: Vec<f64>,
    fill_m3: Vec<f64>,
    crews: Option<usize>,
    crews_used: Vec<u16>,
    rigs: Option<usize>,
    rigs_used: Vec<u16>,
}

impl Ledger {
    /// An empty book; without supply sources the supply is unlimited, and
    /// without a crew or rig count those are unlimited.
    /// Supply comes on the workable days of `calendar` only.
    pub fn new(res: &Resources, calendar: &Calendar) -> Ledger {
        let capacity_m3 = (0..DAYS)
            .map(|k| {
                if res.supply.is_empty() {
                    return f64::INFINITY;
                }
                if !calendar.workable(k as i64) {
                    return 0.0;
                }
                // A day beyond the dates chrono can hold gets no supply.
                let Ok(d) = calendar.date(k as i64) else { return 0.0 };
                res.supply.iter().filter(|s| s.from.is_none_or(|f| f <= d)).map(|s| s.m3_per_day).sum()
            })
            .collect();
        Ledger {
            capacity_m3,
            fill_m3: vec![0.0; DAYS],
            crews: res.placing_crews,
            crews_used: vec![0; DAYS],
            rigs: res.drain_rigs.map(|r| r.0),
            rigs_used: vec![0; DAYS],
        }
    }

    /// A book with no limits (for the unconstrained plans).
    pub fn unlimited(calendar: &Calendar) -> Ledger {
        Ledger::new(&Resources::default(), calendar)
    }

    /// Supply capacity on day `k`, m³ (infinite when unlimited).
    pub fn capacity(&self, k: i64) -> f64 {
        usize::try_from(k).ok().and_then(|k| self.capacity_m3.get(k).copied()).unwrap_or(0.0)
    }

    /// The largest daily supply on any day, m³.
    pub fn most_capacity(&self) -> f64 {
        self.capacity_m3.iter().copied().fold(0.0, f64::max)
    }

    /// Whether `need` fits on day `k` besides what is booked.
    pub fn fits(&self, k: i64, need: Need) -> bool {
        let Ok(i) = usize::try_from(k) else { return false };
        if i >= DAYS {
            return false;
        }
        let fill_ok = need.fill_m3 <= 0.0 || self.fill_m3[i] + need.fill_m3 <= self.capacity_m3[i] * (1.0 + 1e-12);
        let crew_ok = !need.crew || self.crews.is_none_or(|n| (self.crews_used[i] as usize) < n);
        let rig_ok = !need.rig || self.rigs.is_none_or(|n| (self.rigs_used[i] as usize) < n);
        fill_ok && crew_ok && rig_ok
    }

    /// Whether every (day, need) fits.
    pub fn fits_all(&self, days: &[i64], need: Need) -> bool {
        days.iter().all(|k| self.fits(*k, need))
    }

    /// Book `need` on each of `days` (all of which must fit).
    pub fn book(&mut self, days: &[i64], need: Need) {
        for &k in days {
            let i = k as usize;
            self.fill_m3[i] += need.fill_m3;
            self.crews_used[i] += u16::from(need.crew);
            self.rigs_used[i] += u16::from(need.rig);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::corridor::Source;

    #[test]
    fn bookings_fill_the_day_and_no_further() {
        let p = crate::input::parse(include_str!("../../tests/data/stiff.toml"), "stiff").unwrap();
        // 2030-01-07 is a Monday: days 0–4 workable, 5–6 a weekend.
        let cal = Calendar::new(p.info.start_date, &p.construction);
        let res = Resources {
            placing_crews: Some(1),
            supply: vec![Source { name: "pit".into(), m3_per_day: 1000.0, from: None }],
            ..Resources::default()
        };
        let mut l = Ledger::new(&res, &cal);
        assert_eq!((l.capacity(0), l.capacity(5)), (1000.0, 0.0));
        let fill = |m3| Need { fill_m3: m3, crew: false, rig: false };
        l.book(&[0], fill(600.0));
        assert!(l.fits(0, fill(400.0)) && !l.fits(0, fill(400.1)));
        let crew = Need { fill_m3: 0.0, crew: true, rig: false };
        l.book(&[1], crew);
        assert!(!l.fits(1, crew) && l.fits(2, crew));
        // No rig limit given: rigs unlimited.
        assert!(l.fits(1, Need { fill_m3: 0.0, crew: false, rig: true }));
    }
}
