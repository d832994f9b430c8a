//! Back-analysis of a consolidation-rate multiplier m (applied to cv and ch
//! of every clay layer) from the piezometer and settlement-plate histories.
//! Weighted least squares: residual_i = (model_i(m) − reading_i) / sd_i
//! with the reading standard deviations of `[monitoring]`. The sum of
//! squares is scanned on a log grid of m from 0.1 to 10, and the best
//! bracket is refined by golden-section search on ln m (a robust 1-D
//! search: no derivatives, cannot diverge). The uncertainty is the
//! linearised one at the optimum: var(ln m) = s² / (JᵀJ), J = ∂r/∂ln m by
//! central differences, s² = SSE / (n − 1) (e.g. Bates & Watts 1988, ch. 2).

use super::readings::Readings;
use super::replay::replay;
use crate::error::{Error, Result};
use crate::ground;
use crate::model::{InstrumentKind, Project};
use crate::response::{Engine, State};
use nalgebra::DVector;
use serde::Serialize;

/// Search range of the multiplier.
pub const M_MIN: f64 = 0.1;
pub const M_MAX: f64 = 10.0;
/// Points of the coarse log grid over the range.
const GRID: usize = 17;
/// Golden-section tolerance on ln m, and its iteration limit.
const TOL_LN: f64 = 1e-3;
const MAX_ITER: usize = 60;

/// A reading the model can predict.
#[derive(Debug, Clone, Copy)]
pub struct Observation {
    /// Index into `Readings::readings`.
    pub reading: usize,
    pub kind: InstrumentKind,
    pub x_m: f64,
    pub z_m: f64,
    /// Measured excess pore pressure kPa (piezometer) or settlement m.
    pub measured: f64,
    pub sd: f64,
}

/// The usable piezometer and plate readings of a file.
pub fn observations(p: &Project, r: &Readings) -> Vec<Observation> {
    r.readings
        .iter()
        .enumerate()
        .filter(|(_, x)| x.suspect.is_none())
        .filter_map(|(k, x)| {
            let inst = &p.instruments[x.instrument];
            let (measured, sd) = match inst.kind {
                InstrumentKind::Piezometer => {
                    (x.value - ground::u0(&p.ground, inst.depth_m), p.monitoring.piezometer_sd_kpa)
                }
                InstrumentKind::SettlementPlate => (x.value, p.monitoring.settlement_sd_m),
                InstrumentKind::LateralMarker => return None,
            };
            Some(Observation { reading: k, kind: inst.kind, x_m: inst.offset_m, z_m: inst.depth_m, measured, sd })
        })
        .collect()
}

/// Model values at the observations, and the state at the last reading.
pub fn predict(engine: &Engine, r: &Readings, obs: &[Observation]) -> (Vec<f64>, State) {
    let mut order: Vec<usize> = (0..obs.len()).collect();
    order.sort_by(|a, b| r.readings[obs[*a].reading].day.total_cmp(&r.readings[obs[*b].reading].day));
    let days: Vec<f64> = order.iter().map(|k| r.readings[obs[*k].reading].day).collect();
    let mut out = vec![0.0; obs.len()];
    let st = replay(engine, &r.fill, &days, r.today_day, |i, st| {
        let o = &obs[order[i]];
        out[order[i]] = match o.kind {
            InstrumentKind::Piezometer => engine.excess_at_point(st, o.x_m, o.z_m),
            _ => engine.settlement_at(st, o.x_m),
        };
    });
    (out, st)
}

/// The fitted multiplier and how well it fits.
#[derive(Debug, Clone, Serialize)]
pub struct Fit {
    /// Best-fit multiplier on cv and ch.
    pub multiplier: f64,
    /// Approximate 95% interval of the multiplier (exp(ln m ± 1.96 sd)).
    pub interval95: (f64, f64),
    /// Standard deviation of ln m.
    pub sd_ln: f64,
    /// Readings used (piezometer, plate).
    pub piezometer_readings: usize,
    pub plate_readings: usize,
    /// Root-mean-square misfit with the project's values and after fitting:
    /// excess pore pressure kPa and settlement mm (None without readings of
    /// that kind).
    pub rms_piezometer_kpa_before: Option<f64>,
    pub rms_piezometer_kpa_after: Option<f64>,
    pub rms_settlement_mm_before: Option<f64>,
    pub rms_settlement_mm_after: Option<f64>,
    /// Weighted sum of squares per degree of freedom after fitting (≈ 1
    /// when the misfit is as large as the stated reading scatter).
    pub chi2_per_dof: f64,
    /// Model evaluations used.
    pub evaluations: usize,
    /// False when the best fit lies at the edge of the search range.
    pub within_range: bool,
}

fn rms(v: impl Iterator<Item = f64>) -> Option<f64> {
    let (n, s) = v.fold((0usize, 0.0), |(n, s), x| (n + 1, s + x * x));
    (n > 0).then(|| (s / n as f64).sqrt())
}

/// Fit the multiplier to the readings.
pub fn fit(p: &Project, r: &Readings) -> Result<Fit> {
    let obs = observations(p, r);
    if obs.len() < 3 {
        return Err(Error::input(
            &r.file,
            None,
            "",
            format!(
                "has {} usable piezometer or settlement readings; at least 3 are needed to calibrate the model",
                obs.len()
            ),
        ));
    }
    let mut evaluations = 0;
    let mut residuals = |m: f64| -> DVector<f64> {
        evaluations += 1;
        let q = p.with_consolidation_factor(m);
        let engine = Engine::new(&q);
        let (pred, _) = predict(&engine, r, &obs);
        DVector::from_iterator(obs.len(), obs.iter().zip(&pred).map(|(o, m)| (m - o.measured) / o.sd))
    };
    let (lo, hi) = (M_MIN.ln(), M_MAX.ln());
    let grid: Vec<(f64, f64)> = (0..GRID)
        .map(|k| {
            let x = lo + (hi - lo) * k as f64 / (GRID - 1) as f64;
            (x, residuals(x.exp()).norm_squared())
        })
        .collect();
    let best = grid.iter().enumerate().min_by(|a, b| a.1.1.total_cmp(&b.1.1)).map_or(0, |(k, _)| k);
    let within_range = best > 0 && best < GRID - 1;
    let (mut a, mut b) = (grid[best.saturating_sub(1)].0, grid[(best + 1).min(GRID - 1)].0);
    let g = 0.5 * (5f64.sqrt() - 1.0);
    let mut c = b - g * (b - a);
    let mut d = a + g * (b - a);
    let (mut fc, mut fd) = (residuals(c.exp()).norm_squared(), residuals(d.exp()).norm_squared());
    let mut iter = 0;
    while b - a > TOL_LN {
        iter += 1;
        if iter > MAX_ITER {
            return Err(Error::Computation(format!(
                "the back-analysis did not converge in {MAX_ITER} golden-section steps (bracket ln m {a:.4}–{b:.4})"
            )));
        }
        if fc < fd {
            (b, d, fd) = (d, c, fc);
            c = b - g * (b - a);
            fc = residuals(c.exp()).norm_squared();
        } else {
            (a, c, fc) = (c, d, fd);
            d = a + g * (b - a);
            fd = residuals(d.exp()).norm_squared();
        }
    }
    let x = 0.5 * (a + b);
    let r_best = residuals(x.exp());
    let h = 0.02;
    let jac = (residuals((x + h).exp()) - residuals((x - h).exp())) / (2.0 * h);
    let n = obs.len() as f64;
    let sse = r_best.norm_squared();
    let s2 = sse / (n - 1.0);
    let jtj = jac.dot(&jac);
    let sd_ln = if jtj > 0.0 { (s2 / jtj).sqrt() } else { f64::INFINITY };
    let r_one = residuals(1.0);
    let pick = |v: &DVector<f64>, kind: InstrumentKind, scale: f64| {
        rms(obs.iter().zip(v.iter()).filter(|(o, _)| o.kind == kind).map(|(o, r)| r * o.sd * scale))
    };
    Ok(Fit {
        multiplier: x.exp(),
        interval95: ((x - 1.96 * sd_ln).exp(), (x + 1.96 * sd_ln).exp()),
        sd_ln,
        piezometer_readings: obs.iter().filter(|o| o.kind == InstrumentKind::Piezometer).count(),
        plate_readings: obs.iter().filter(|o| o.kind == InstrumentKind::SettlementPlate).count(),
        rms_piezometer_kpa_before: pick(&r_one, InstrumentKind::Piezometer, 1.0),
        rms_piezometer_kpa_after: pick(&r_best, InstrumentKind::Piezometer, 1.0),
        rms_settlement_mm_before: pick(&r_one, InstrumentKind::SettlementPlate, 1000.0),
        rms_settlement_mm_after: pick(&r_best, InstrumentKind::SettlementPlate, 1000.0),
        chi2_per_dof: s2,
        evaluations,
        within_range,
    })
}
