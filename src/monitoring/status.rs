//! What each instrument shows at the hold point, and whether the monitoring
//! scheme's minimum is met: the required instruments (or number per kind)
//! read, the latest reading no older than the kind's limit, and enough
//! readings since the last lift ended. What is missing is named per
//! instrument; a shortfall means "hold: insufficient monitoring".

use super::readings::Readings;
use super::release::Calibrated;
use super::trends::{regress, series_from};
use crate::model::{InstrumentKind, Project};
use crate::response::Engine;
use chrono::NaiveDateTime;
use serde::Serialize;

/// What each instrument shows at the hold point.
#[derive(Debug, Clone, Serialize)]
pub struct InstrumentStatus {
    pub id: String,
    pub kind: InstrumentKind,
    pub offset_m: f64,
    pub depth_m: Option<f64>,
    pub readings: usize,
    pub suspect: usize,
    /// Usable readings since the last lift ended.
    pub since_lift: usize,
    pub last_reading: Option<NaiveDateTime>,
    /// Age of the latest usable reading at the hold point, days.
    pub age_days: Option<f64>,
    /// Latest usable value: excess pore pressure kPa at the settled tip
    /// (piezometer),
    /// settlement m (plate), outward movement m (marker).
    pub measured: Option<f64>,
    /// The same quantity from the project's parameters and from the
    /// calibrated model (piezometers and plates).
    pub predicted: Option<f64>,
    pub calibrated: Option<f64>,
    /// RMS misfit of the calibrated model at this instrument, in reading
    /// standard deviations (piezometers and plates).
    pub misfit_sd: Option<f64>,
    /// Piezometers: Δu / Δσv at the tip now.
    pub pore_pressure_ratio: Option<f64>,
    /// Plates and markers: rate over the rate window, mm/day.
    pub rate_mm_per_day: Option<f64>,
    /// What the monitoring scheme finds missing (empty when sufficient).
    pub shortfall: Vec<String>,
}

/// The status of every instrument.
pub fn statuses(p: &Project, r: &Readings, cal: &Calibrated, engine: &Engine) -> Vec<InstrumentStatus> {
    let m = &p.monitoring;
    let since = r.last_change_end();
    p.instruments
        .iter()
        .enumerate()
        .map(|(k, inst)| {
            let usable: Vec<_> = r.of(k).collect();
            let own: Vec<usize> =
                (0..cal.obs.len()).filter(|j| r.readings[cal.obs[*j].reading].instrument == k).collect();
            let last = usable.last();
            let measured = match inst.kind {
                InstrumentKind::Piezometer => own.last().map(|j| cal.obs[*j].measured),
                _ => last.map(|x| x.value),
            };
            let misfit = (!own.is_empty()).then(|| {
                let ss: f64 =
                    own.iter().map(|j| ((cal.calibrated[*j] - cal.obs[*j].measured) / cal.obs[*j].sd).powi(2)).sum();
                (ss / own.len() as f64).sqrt()
            });
            let mut s = InstrumentStatus {
                id: inst.id.clone(),
                kind: inst.kind,
                offset_m: inst.offset_m,
                depth_m: (inst.kind == InstrumentKind::Piezometer).then_some(inst.depth_m),
                readings: r.readings.iter().filter(|x| x.instrument == k).count(),
                suspect: r.readings.iter().filter(|x| x.instrument == k && x.suspect.is_some()).count(),
                since_lift: usable.iter().filter(|x| x.day >= since - 1e-9).count(),
                last_reading: last.map(|x| x.time),
                age_days: last.map(|x| r.today_day - x.day),
                measured,
                predicted: own.last().map(|j| cal.predicted[*j]),
                calibrated: own.last().map(|j| cal.calibrated[*j]),
                misfit_sd: misfit,
                pore_pressure_ratio: None,
                rate_mm_per_day: None,
                shortfall: Vec::new(),
            };
            if inst.kind == InstrumentKind::Piezometer {
                let dsv = engine.fill_stress_at(&cal.state, inst.offset_m, inst.depth_m);
                s.pore_pressure_ratio = measured.filter(|_| dsv > 1.0).map(|du| du / dsv);
            } else {
                let sd = if inst.kind == InstrumentKind::SettlementPlate { m.settlement_sd_m } else { m.lateral_sd_m };
                s.rate_mm_per_day =
                    regress(&series_from(r, k, r.today_day - m.rate_window_days), sd).map(|l| 1000.0 * l.slope);
            }
            s.shortfall = shortfall(p, &s);
            s
        })
        .collect()
}

/// What a required instrument lacks.
fn shortfall(p: &Project, s: &InstrumentStatus) -> Vec<String> {
    let m = &p.monitoring;
    let mut out = Vec::new();
    let Some(age) = s.age_days else {
        return vec!["no usable reading".into()];
    };
    let max_age = m.max_age_days[s.kind.index()];
    if age > max_age {
        out.push(format!("latest reading {age:.1} days before the hold point (at most {max_age:.0})"));
    }
    if s.since_lift < m.min_readings_since_lift {
        out.push(format!(
            "{} readings since the last lift ended (at least {})",
            s.since_lift, m.min_readings_since_lift
        ));
    }
    out
}

/// The monitoring scheme's shortfalls at the hold point, one sentence each
/// (empty when the scheme's minimum is met).
pub fn insufficient(p: &Project, st: &[InstrumentStatus]) -> Vec<String> {
    let m = &p.monitoring;
    let required = |id: &str| m.required.is_empty() || m.required.iter().any(|x| x == id);
    let mut out: Vec<String> = st
        .iter()
        .filter(|s| required(&s.id) && !s.shortfall.is_empty())
        .map(|s| format!("{} ({}): {}", s.id, s.kind.label(), s.shortfall.join("; ")))
        .collect();
    for kind in [InstrumentKind::Piezometer, InstrumentKind::SettlementPlate, InstrumentKind::LateralMarker] {
        let good = st.iter().filter(|s| s.kind == kind && s.shortfall.is_empty()).count();
        let need = m.min_per_kind[kind.index()];
        if good < need {
            out.push(format!("{good} {} read sufficiently; the scheme needs at least {need}", kind.label()));
        }
    }
    out
}
