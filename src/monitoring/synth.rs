//! Synthetic readings for tests and for the invented demo file: the engine
//! run along an as-built fill record with cv and ch, and Cc and Cr, scaled
//! by chosen multipliers, read at regular times (piezometers at their tips'
//! settled depth: hydrostatic there plus the excess), plus Gaussian noise from a seeded
//! generator (SplitMix64, Steele, Lea & Flood 2014; Box–Muller transform).
//! Lateral markers move by a fixed fraction of the centreline settlement
//! increment: one value while the fill height changes, another while it
//! holds. Nothing here is a measurement.

use super::readings::{FillPoint, HEADER, day_of};
use super::replay::replay;
use crate::model::{FILL_ID, InstrumentKind, Project};
use crate::random::Noise;
use crate::response::Engine;
use chrono::{Duration, NaiveDateTime, NaiveTime};

/// How to make the readings.
#[derive(Debug, Clone)]
pub struct Recipe {
    /// As-built record: (time, crest height above OGL m), starting at 0.
    pub fill: Vec<(NaiveDateTime, f64)>,
    /// Multiplier on cv and ch of the "true" ground.
    pub multiplier: f64,
    /// Multiplier on Cc and Cr of the "true" ground.
    pub compressibility: f64,
    /// Reading interval of every instrument from its baseline date, days.
    pub every_days: i64,
    /// Last reading time.
    pub until: NaiveDateTime,
    pub seed: u64,
    /// Noise standard deviations: pore pressure kPa, levels and positions m.
    pub sd_kpa: f64,
    pub sd_m: f64,
    /// Lateral movement over centreline settlement increment while filling
    /// and while resting.
    pub lateral_ratio_filling: f64,
    pub lateral_ratio_resting: f64,
    /// Extra rise of pore pressure added linearly over the last `rise_days`
    /// days at every piezometer, kPa (0 = none).
    pub rise_kpa: f64,
    pub rise_days: f64,
}

impl Recipe {
    /// A recipe with the standard noise (1 kPa, 3 mm), lateral ratios of
    /// 0.35 while filling and 0.1 while resting, and no added pore-pressure
    /// rise.
    pub fn new(fill: Vec<(NaiveDateTime, f64)>, multiplier: f64, until: NaiveDateTime, seed: u64) -> Recipe {
        Recipe {
            fill,
            multiplier,
            compressibility: 1.0,
            every_days: 3,
            until,
            seed,
            sd_kpa: 1.0,
            sd_m: 0.003,
            lateral_ratio_filling: 0.35,
            lateral_ratio_resting: 0.1,
            rise_kpa: 0.0,
            rise_days: 0.0,
        }
    }
}

/// The readings file text (header comment, header, rows in time order).
pub fn readings_csv(p: &Project, recipe: &Recipe, comment: &str) -> String {
    let fill: Vec<FillPoint> = recipe
        .fill
        .iter()
        .enumerate()
        .map(|(k, (t, h))| FillPoint { time: *t, day: day_of(p, *t), height_m: *h, line: k })
        .collect();
    // (time, instrument index) of every reading.
    let mut when: Vec<(NaiveDateTime, usize)> = Vec::new();
    for (k, inst) in p.instruments.iter().enumerate() {
        let mut t = inst.baseline_date.and_time(NaiveTime::from_hms_opt(9, 0, 0).unwrap_or(NaiveTime::MIN));
        while t <= recipe.until {
            when.push((t, k));
            t += Duration::days(recipe.every_days);
        }
    }
    when.sort();
    let days: Vec<f64> = when.iter().map(|(t, _)| day_of(p, *t)).collect();
    let q = super::calibrate::calibrated_project(p, recipe.multiplier, recipe.compressibility);
    let engine = Engine::new(&q);
    let mut noise = Noise::new(recipe.seed);
    let mut rows: Vec<(NaiveDateTime, String)> = Vec::new();
    let mut lateral: Vec<(f64, f64, f64)> = vec![(0.0, 0.0, 0.0); p.instruments.len()]; // (movement, s_c, height)
    let end = days.last().copied().unwrap_or(0.0).max(0.0);
    replay(&engine, &fill, &days, end, |i, st| {
        let (t, k) = when[i];
        let inst = &p.instruments[k];
        let e = noise.normal();
        let value = match inst.kind {
            InstrumentKind::Piezometer => {
                let since = recipe.rise_days - (recipe.until - t).num_seconds() as f64 / 86_400.0;
                let rise = if recipe.rise_days > 0.0 {
                    recipe.rise_kpa * (since / recipe.rise_days).clamp(0.0, 1.0)
                } else {
                    0.0
                };
                let s_tip = engine.settlement_below_at(st, inst.offset_m, inst.depth_m);
                let u = crate::ground::u0(&p.ground, inst.depth_m + s_tip)
                    + engine.excess_at_point(st, inst.offset_m, inst.depth_m)
                    + rise
                    + recipe.sd_kpa * e;
                inst.units.to_si(1.0).recip() * u
            }
            InstrumentKind::SettlementPlate => {
                let s = engine.settlement_at(st, inst.offset_m) + recipe.sd_m * e;
                inst.baseline_value - s / inst.units.to_si(1.0)
            }
            InstrumentKind::LateralMarker => {
                let (moved, s_prev, h_prev) = lateral[k];
                let ratio = if (st.height_m - h_prev).abs() > 1e-9 {
                    recipe.lateral_ratio_filling
                } else {
                    recipe.lateral_ratio_resting
                };
                let now = moved + ratio * (st.settlement_centre_m - s_prev);
                lateral[k] = (now, st.settlement_centre_m, st.height_m);
                inst.baseline_value + (now + recipe.sd_m * e) / inst.units.to_si(1.0)
            }
        };
        let decimals = match inst.units {
            crate::model::ReadingUnit::M => 3,
            crate::model::ReadingUnit::MHead => 2,
            _ => 1,
        };
        rows.push((t, format!("{},{},{value:.decimals$}", inst.id, t.format("%Y-%m-%dT%H:%M"))));
    });
    for (t, h) in &recipe.fill {
        rows.push((*t, format!("{FILL_ID},{},{h:.2}", t.format("%Y-%m-%dT%H:%M"))));
    }
    rows.sort_by_key(|a| a.0);
    let mut out = String::new();
    for l in comment.lines() {
        out.push_str(&format!("# {l}\n").replace("# \n", "#\n"));
    }
    out.push_str(HEADER);
    out.push('\n');
    for (_, r) in rows {
        out.push_str(&r);
        out.push('\n');
    }
    out
}
