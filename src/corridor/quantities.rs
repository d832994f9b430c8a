//! Quantities: fill volumes split into design fill, settlement make-up,
//! surcharge and working platform, and the weekly fill demand against the
//! supply. A volume is a stage cross-section area (from `load::profile` and
//! `load::area`, the planner's own stage geometry) times the section length.
//!
//! The fill in place at a state is split as the planner splits it
//! (`Engine::fill_areas`): design fill (the stage profile up to design
//! height), surcharge (above design height) and make-up (the fill in the
//! settlement trough below original ground). A stage's volume is the
//! change of these between its start and its end (negative for a removal).

use crate::load;
use crate::model::Embankment;
use serde::Serialize;

/// Fill volumes, m³ (or m³ per metre run where stated).
#[derive(Debug, Clone, Copy, Default, PartialEq, Serialize)]
pub struct Volumes {
    pub design_m3: f64,
    pub makeup_m3: f64,
    pub surcharge_m3: f64,
    pub platform_m3: f64,
}

impl Volumes {
    /// Sum of the four parts, m³.
    pub fn total(&self) -> f64 {
        self.design_m3 + self.makeup_m3 + self.surcharge_m3 + self.platform_m3
    }

    /// Part-by-part sum.
    pub fn plus(self, o: Volumes) -> Volumes {
        Volumes {
            design_m3: self.design_m3 + o.design_m3,
            makeup_m3: self.makeup_m3 + o.makeup_m3,
            surcharge_m3: self.surcharge_m3 + o.surcharge_m3,
            platform_m3: self.platform_m3 + o.platform_m3,
        }
    }

    /// Part-by-part difference.
    pub fn minus(self, o: Volumes) -> Volumes {
        self.plus(o.times(-1.0))
    }

    /// Every part times `k` (a section length, say).
    pub fn times(self, k: f64) -> Volumes {
        Volumes {
            design_m3: self.design_m3 * k,
            makeup_m3: self.makeup_m3 * k,
            surcharge_m3: self.surcharge_m3 * k,
            platform_m3: self.platform_m3 * k,
        }
    }
}

/// Cross-section area of fill `t_m` thick, m² (the planner's stage shape).
pub fn area_m2(e: &Embankment, t_m: f64) -> f64 {
    load::area(&load::profile(e, t_m.max(0.0)))
}

/// Fill in place per metre run in a ground state (the planner's split,
/// make-up in the settlement trough), m³/m.
pub fn of_state(engine: &crate::response::Engine, st: &crate::response::State) -> Volumes {
    let a = engine.fill_areas(st);
    Volumes { design_m3: a.design_m2, makeup_m3: a.makeup_m2, surcharge_m3: a.surcharge_m2, platform_m3: 0.0 }
}

/// The working platform per metre run: the bottom `t_m` of the fill,
/// m³/m, booked as platform rather than design fill.
pub fn platform(e: &Embankment, t_m: f64) -> Volumes {
    Volumes { platform_m3: area_m2(e, t_m), ..Volumes::default() }
}

/// One week of the programme.
#[derive(Debug, Clone, Serialize)]
pub struct Week {
    /// Monday (or the corridor start) of the week.
    pub start: chrono::NaiveDate,
    /// Fill placed (imported and reused), m³.
    pub placed_m3: f64,
    /// Of which surcharge fill reused from another section, m³.
    pub reused_m3: f64,
    /// Supply capacity over the week's days, m³ (None when unlimited).
    pub supply_m3: Option<f64>,
}

/// Weekly totals of daily placement `placed` and reuse `reused` (m³ by day
/// from the corridor start), with the supply capacity by day.
pub fn weekly(start: chrono::NaiveDate, placed: &[f64], reused: &[f64], capacity: impl Fn(i64) -> f64) -> Vec<Week> {
    use chrono::Datelike;
    let last = placed.iter().rposition(|v| *v > 0.0).map_or(0, |k| k + 1);
    let mut weeks: Vec<Week> = Vec::new();
    for (k, placed_k) in placed.iter().enumerate().take(last) {
        let date = start + chrono::Duration::days(k as i64);
        if k == 0 || date.weekday() == chrono::Weekday::Mon {
            weeks.push(Week { start: date, placed_m3: 0.0, reused_m3: 0.0, supply_m3: Some(0.0) });
        }
        let Some(w) = weeks.last_mut() else { continue };
        w.placed_m3 += placed_k;
        w.reused_m3 += reused.get(k).copied().unwrap_or(0.0);
        let cap = capacity(k as i64);
        w.supply_m3 = w.supply_m3.map(|s| s + cap).filter(|s| s.is_finite());
    }
    weeks
}

#[cfg(test)]
mod tests {
    use super::*;

    fn bank() -> Embankment {
        let p = crate::input::parse(include_str!("../../tests/data/stiff.toml"), "stiff").unwrap();
        p.embankment
    }

    #[test]
    fn trapezoid_area_by_hand() {
        // Hand calculation: design crest 12 m at 3 m, side slopes 2H:1V, no
        // berms, full-footprint stages. The final toe-to-toe width is
        // 12 + 2·2·3 = 24 m; fill 1.5 m thick is a layer over that
        // footprint with top width 24 − 2·2·1.5 = 18 m:
        // A = (24 + 18)/2 · 1.5 = 31.5 m².
        let a = area_m2(&bank(), 1.5);
        assert!((a - 31.5).abs() < 31.5e-3, "{a}");
    }
}
