//! What the plan's figures need, recorded while the committed timetable is
//! run: a daily history (crest, settlement, excess pore pressure at key
//! points), strength profiles under the centreline at the start, at each
//! release and at the end, and the section with its critical circle at the
//! governing stage.

use crate::response::{Engine, GroundField, State};
use crate::stability::CircleResult;
use chrono::NaiveDate;

/// A point where excess pore pressure is followed: column index and depth.
#[derive(Debug, Clone)]
pub struct Probe {
    pub label: String,
    pub column: usize,
    pub z_m: f64,
}

/// One day of the committed timetable.
#[derive(Debug, Clone)]
pub struct Day {
    pub date: NaiveDate,
    pub height_m: f64,
    pub settlement_centre_m: f64,
    /// Excess pore pressure at each probe, kPa.
    pub excess_kpa: Vec<f64>,
}

/// su under the centreline at one moment: (depth m, su kPa) at clay nodes.
#[derive(Debug, Clone)]
pub struct Profile {
    pub label: String,
    pub points: Vec<(f64, f64)>,
}

/// The section at the governing stage.
#[derive(Debug, Clone)]
pub struct Governing {
    pub stage: usize,
    pub height_m: f64,
    pub field: GroundField,
    pub critical: CircleResult,
}

/// Everything the figures need.
#[derive(Debug, Clone, Default)]
pub struct Figures {
    pub probes: Vec<Probe>,
    pub days: Vec<Day>,
    pub profiles: Vec<Profile>,
    pub governing: Option<Governing>,
}

/// Probes: the quarter points and middle of the thickest clay layer under
/// the centreline, and its middle under the toe.
pub fn probes(e: &Engine) -> Vec<Probe> {
    let p = e.project;
    let mut top = 0.0;
    let mut best = (0.0, 0.0);
    for l in &p.ground.layers {
        if matches!(l.kind, crate::model::LayerKind::Clay(_)) && l.thickness_m > best.1 {
            best = (top, l.thickness_m);
        }
        top += l.thickness_m;
    }
    let (t, h) = best;
    let toe = e.column_info().iter().position(|c| c.name == "toe").unwrap_or(0);
    let mut out: Vec<Probe> = [0.25, 0.5, 0.75]
        .iter()
        .map(|f| Probe { label: format!("centreline, z = {:.1} m", t + f * h), column: 0, z_m: t + f * h })
        .collect();
    out.push(Probe { label: format!("toe, z = {:.1} m", t + 0.5 * h), column: toe, z_m: t + 0.5 * h });
    out
}

impl Figures {
    /// Append a row for each new whole day, when the runner keeps detail.
    pub fn record_if(&mut self, r: &super::Runner, st: &State) {
        if r.detail {
            self.record(r.engine, &r.calendar, st);
        }
    }

    fn record(&mut self, e: &Engine, cal: &super::calendar::Calendar, st: &State) {
        let day = st.day.round();
        if (st.day - day).abs() > 1e-6 {
            return;
        }
        // Placements stop at the calendar horizon, whose dates exist.
        let Ok(date) = cal.date(day as i64) else { return };
        if self.days.last().is_some_and(|d| d.date >= date) {
            return;
        }
        let excess_kpa = self.probes.iter().map(|p| e.excess_at(st, p.column, p.z_m)).collect();
        self.days.push(Day { date, height_m: st.height_m, settlement_centre_m: st.settlement_centre_m, excess_kpa });
    }

    /// Add the su profile under the centreline now.
    pub fn profile(&mut self, e: &Engine, st: &State, label: String) {
        let col = &e.columns[0];
        let points = col
            .nodes
            .iter()
            .enumerate()
            .filter(|(_, n)| n.clay.is_some())
            .map(|(i, n)| (n.z_m, col.su(&st.cols[0], i)))
            .collect();
        self.profiles.push(Profile { label, points });
    }
}
