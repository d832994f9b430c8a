//! Piezometer tips settle with the ground: the excess pore pressure a
//! piezometer shows is its reading less the hydrostatic pressure at the
//! tip's *settled* depth, u_e = u − γw (z + s_tip − z_w) (the water table
//! stays at its original level). The tip's settlement s_tip is the
//! compression of the ground below it. Where a settlement plate has
//! readings around the time, it is taken from the nearest plate (by offset)
//! scaled by the model's settlement profile:
//! s_tip = s_plate,measured × s_model(x_tip, below z_tip) / s_model(x_plate, surface);
//! otherwise from the model alone, s_tip = s_model(x_tip, below z_tip). The
//! model here is the project's (before calibration), so the correction is
//! fixed data for the back-analysis: the profile ratio does not depend on
//! the compressibility multiplier at all (it scales both settlements), and
//! only weakly on the rate. The plate is read between its readings by
//! linear interpolation, never extrapolated.

use super::readings::Readings;
use super::replay::replay;
use crate::ground;
use crate::model::{GAMMA_W, InstrumentKind, Project};
use crate::response::Engine;
use serde::Serialize;

/// Smallest model settlement of the plate (m) for which the profile ratio
/// is used; below it the tip takes the model's own settlement.
const MIN_PLATE_MODEL_M: f64 = 1e-4;

/// How one piezometer's tip settlement was found, at its latest reading.
#[derive(Debug, Clone, Serialize)]
pub struct TipSettlement {
    pub id: String,
    /// The settlement plate used (nearest by offset), None when there is
    /// no plate with readings.
    pub plate: Option<String>,
    /// Readings whose tip settlement came from the plate, and from the
    /// model alone (no plate reading around the time, or the model's
    /// settlement at the plate still below 0.1 mm).
    pub from_plate: usize,
    pub from_model: usize,
    /// Tip settlement at the latest reading, m, and the hydrostatic pressure
    /// it adds (taken off the excess), kPa.
    pub latest_m: f64,
    pub latest_kpa: f64,
    /// Model settlement below the tip over model settlement at the plate,
    /// at the latest reading (None when the model alone was used).
    pub latest_profile_ratio: Option<f64>,
}

impl TipSettlement {
    /// Where the settlement came from, in words.
    pub fn source(&self) -> String {
        match (&self.plate, self.from_model) {
            (Some(p), 0) => format!("plate {p} × model profile"),
            (Some(p), n) => format!(
                "plate {p} × model profile (model alone for {n} early reading(s): no plate reading or no settlement yet)"
            ),
            (None, _) => "model (no plate)".into(),
        }
    }
}

/// The tip's settlement from a plate reading and the model's settlements
/// below the tip and at the plate, m.
pub fn from_plate(plate_measured_m: f64, model_tip_m: f64, model_plate_m: f64) -> f64 {
    plate_measured_m * model_tip_m / model_plate_m
}

/// Excess pore pressure from a reading u (kPa) at a tip installed at depth
/// z that has settled by s_tip (m): u less the initial pore pressure at the
/// tip's own soil, whose head stays that of the initial profile
/// (`ground::head_m`) while its elevation drops by s_tip, so the initial
/// pressure there grows by γw·s_tip (hydrostatic: the water-table pressure
/// at the settled depth).
pub fn excess(p: &Project, reading_kpa: f64, z_m: f64, s_tip_m: f64) -> f64 {
    if z_m >= p.ground.groundwater_depth_m {
        reading_kpa - ground::u0(&p.ground, z_m) - GAMMA_W * s_tip_m
    } else {
        // A tip above the water table: the pressure at its settled depth.
        reading_kpa - ground::u0(&p.ground, z_m + s_tip_m)
    }
}

/// A plate's measured settlement at `day` by linear interpolation between
/// its usable readings; None outside its record.
fn plate_at(r: &Readings, plate: usize, day: f64) -> Option<f64> {
    let pts: Vec<(f64, f64)> = r.of(plate).map(|x| (x.day, x.value)).collect();
    let k = pts.partition_point(|(d, _)| *d < day - 1e-9);
    let (d1, v1) = *pts.get(k)?;
    if (d1 - day).abs() <= 1e-9 {
        return Some(v1);
    }
    let (d0, v0) = *pts.get(k.checked_sub(1)?)?;
    Some(v0 + (v1 - v0) * (day - d0) / (d1 - d0))
}

/// Tip settlement (m) of every usable piezometer reading, indexed like
/// `r.readings` (0 for other readings), and one summary per piezometer.
pub fn settlements(p: &Project, r: &Readings) -> (Vec<f64>, Vec<TipSettlement>) {
    let engine = Engine::new(p);
    let plates: Vec<usize> = (0..p.instruments.len())
        .filter(|k| p.instruments[*k].kind == InstrumentKind::SettlementPlate && r.of(*k).next().is_some())
        .collect();
    let nearest = |x: f64| {
        plates.iter().copied().min_by(|a, b| {
            let d = |k: usize| (p.instruments[k].offset_m.abs() - x.abs()).abs();
            d(*a).total_cmp(&d(*b))
        })
    };
    let idx: Vec<usize> = (0..r.readings.len())
        .filter(|k| {
            let x = &r.readings[*k];
            x.suspect.is_none() && p.instruments[x.instrument].kind == InstrumentKind::Piezometer
        })
        .collect();
    let days: Vec<f64> = idx.iter().map(|k| r.readings[*k].day).collect();
    let mut out = vec![0.0; r.readings.len()];
    let mut ratio = vec![None; r.readings.len()];
    replay(&engine, &r.fill, &days, r.today_day, |i, st| {
        let x = &r.readings[idx[i]];
        let inst = &p.instruments[x.instrument];
        let model_tip = engine.settlement_below_at(st, inst.offset_m, inst.depth_m);
        out[idx[i]] = model_tip;
        if let Some(j) = nearest(inst.offset_m) {
            let model_plate = engine.settlement_at(st, p.instruments[j].offset_m);
            if let Some(s) = plate_at(r, j, x.day).filter(|_| model_plate > MIN_PLATE_MODEL_M) {
                out[idx[i]] = from_plate(s, model_tip, model_plate);
                ratio[idx[i]] = Some(model_tip / model_plate);
            }
        }
    });
    let summaries = p
        .instruments
        .iter()
        .enumerate()
        .filter(|(_, i)| i.kind == InstrumentKind::Piezometer)
        .filter_map(|(k, inst)| {
            let own: Vec<usize> = idx.iter().copied().filter(|j| r.readings[*j].instrument == k).collect();
            let last = *own.last()?;
            let from_plate = own.iter().filter(|j| ratio[**j].is_some()).count();
            Some(TipSettlement {
                id: inst.id.clone(),
                plate: nearest(inst.offset_m).map(|j| p.instruments[j].id.clone()),
                from_plate,
                from_model: own.len() - from_plate,
                latest_m: out[last],
                latest_kpa: GAMMA_W * out[last],
                latest_profile_ratio: ratio[last],
            })
        })
        .collect();
    (out, summaries)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn corrected_excess_by_hand() {
        // Hand calculation: plate reads 0.400 m; the model settles 0.300 m
        // below the tip and 0.480 m at the plate, so the tip has settled
        // 0.400 × 0.300 / 0.480 = 0.250 m. Demo ground: water table 1.0 m
        // below the surface (examples/kestrel-fen.toml); tip installed at
        // 9.0 m now at 9.25 m: hydrostatic 9.81 × (9.25 − 1.0) = 80.9325 kPa,
        // so a reading of 160.0 kPa is 79.0675 kPa excess (not 81.52 as at
        // the installed depth: 2.4525 kPa = 9.81 × 0.25 less).
        let p = crate::input::parse(crate::app::DEMO, "demo").expect("demo validates");
        assert!((p.ground.groundwater_depth_m - 1.0).abs() < 1e-12, "the hand calculation assumes zw = 1.0 m");
        let s = from_plate(0.400, 0.300, 0.480);
        assert!((s - 0.25).abs() < 1e-12);
        assert!((excess(&p, 160.0, 9.0, s) - 79.0675).abs() < 1e-9);
        assert!((excess(&p, 160.0, 9.0, 0.0) - excess(&p, 160.0, 9.0, s) - 2.4525).abs() < 1e-9);
    }
}
