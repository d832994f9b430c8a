//! Checks of the `[monitoring]` table: the monitoring scheme's minimum at a
//! hold point (required instruments, number per kind, age of the latest
//! reading, readings since the last lift), reading precisions, alarm limits
//! and the calibration's fit-quality limits.

use super::{Check, Low};
use crate::input::raw::RawMonitoring;
use crate::model::{Instrument, MonitoringRules};

pub(super) fn monitoring(c: &mut Check, r: Option<&RawMonitoring>, instruments: &[Instrument]) -> MonitoringRules {
    let d = MonitoringRules::default();
    let Some(r) = r else { return d };
    let k = |f: &str| format!("monitoring.{f}");
    let mut num = |f: &str, v: Option<f64>, default: f64, low: Low, high: f64| c.opt(&k(f), v, default, low, high);
    let count = |x: f64| x.round() as usize;
    let rules = MonitoringRules {
        pore_rise_limit_kpa_per_week: num(
            "pore_rise_limit_kpa_per_week",
            r.pore_rise_limit_kpa_per_week,
            d.pore_rise_limit_kpa_per_week,
            Low::Excl(0.0),
            100.0,
        ),
        settlement_rate_limit_mm_per_day: num(
            "settlement_rate_limit_mm_per_day",
            r.settlement_rate_limit_mm_per_day,
            d.settlement_rate_limit_mm_per_day,
            Low::Excl(0.0),
            1000.0,
        ),
        lateral_rate_limit_mm_per_day: num(
            "lateral_rate_limit_mm_per_day",
            r.lateral_rate_limit_mm_per_day,
            d.lateral_rate_limit_mm_per_day,
            Low::Excl(0.0),
            1000.0,
        ),
        lateral_ratio_limit: num(
            "lateral_ratio_limit",
            r.lateral_ratio_limit,
            d.lateral_ratio_limit,
            Low::Excl(0.0),
            5.0,
        ),
        rate_window_days: num("rate_window_days", r.rate_window_days, d.rate_window_days, Low::Incl(1.0), 90.0),
        trend_window_days: num("trend_window_days", r.trend_window_days, d.trend_window_days, Low::Incl(3.0), 180.0),
        pore_pressure_ratio_limit: num(
            "pore_pressure_ratio_limit",
            r.pore_pressure_ratio_limit,
            d.pore_pressure_ratio_limit,
            Low::Excl(0.0),
            1.5,
        ),
        stop_fs_below: num("stop_fs_below", r.stop_fs_below, d.stop_fs_below, Low::Incl(1.0), 1.5),
        fit_chi2_limit: num("fit_chi2_limit", r.fit_chi2_limit, d.fit_chi2_limit, Low::Incl(1.0), 100.0),
        instrument_misfit_limit: num(
            "instrument_misfit_limit",
            r.instrument_misfit_limit,
            d.instrument_misfit_limit,
            Low::Incl(1.0),
            100.0,
        ),
        piezometer_tolerance_kpa: num(
            "piezometer_tolerance_kpa",
            r.piezometer_tolerance_kpa,
            d.piezometer_tolerance_kpa,
            Low::Excl(0.0),
            100.0,
        ),
        settlement_noise_m: num("settlement_noise_m", r.settlement_noise_m, d.settlement_noise_m, Low::Excl(0.0), 0.5),
        asaoka_interval_days: num(
            "asaoka_interval_days",
            r.asaoka_interval_days,
            d.asaoka_interval_days,
            Low::Incl(1.0),
            90.0,
        ),
        piezometer_sd_kpa: num("piezometer_sd_kpa", r.piezometer_sd_kpa, d.piezometer_sd_kpa, Low::Excl(0.0), 50.0),
        settlement_sd_m: num("settlement_sd_m", r.settlement_sd_m, d.settlement_sd_m, Low::Excl(0.0), 0.5),
        lateral_sd_m: num("lateral_sd_m", r.lateral_sd_m, d.lateral_sd_m, Low::Excl(0.0), 0.5),
        required: r.required.clone().unwrap_or_default(),
        min_per_kind: [
            count(num("min_piezometers", r.min_piezometers, 1.0, Low::Incl(0.0), 100.0)),
            count(num("min_settlement_plates", r.min_settlement_plates, 1.0, Low::Incl(0.0), 100.0)),
            count(num("min_lateral_markers", r.min_lateral_markers, 1.0, Low::Incl(0.0), 100.0)),
        ],
        max_age_days: [
            num("max_age_piezometer_days", r.max_age_piezometer_days, 7.0, Low::Excl(0.0), 365.0),
            num("max_age_plate_days", r.max_age_plate_days, 7.0, Low::Excl(0.0), 365.0),
            num("max_age_marker_days", r.max_age_marker_days, 7.0, Low::Excl(0.0), 365.0),
        ],
        min_readings_since_lift: count(num(
            "min_readings_since_lift",
            r.min_readings_since_lift,
            d.min_readings_since_lift as f64,
            Low::Incl(0.0),
            1000.0,
        )),
    };
    for (i, id) in rules.required.iter().enumerate() {
        if !instruments.iter().any(|x| &x.id == id) {
            let known: Vec<&str> = instruments.iter().map(|x| x.id.as_str()).collect();
            c.bad(
                &format!("monitoring.required[{i}]"),
                format!("= \"{id}\" is not an [[instrument]] of the project; known: {}", known.join(", ")),
            );
        }
    }
    rules
}
