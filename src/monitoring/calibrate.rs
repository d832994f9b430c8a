//! Back-analysis of two multipliers of the project's clay parameters from
//! the piezometer and settlement-plate histories: a consolidation-rate
//! multiplier m on cv and ch, and a compressibility multiplier c on Cc and
//! Cr (the settlement magnitude; cv and ch stay as given, so c does not
//! change the rate). Weighted least squares over both kinds of instrument:
//! residual_i = (model_i(m, c) − reading_i) / sd_i with the reading
//! precisions of `[monitoring]` (piezometer_sd_kpa, settlement_sd_m) as
//! the standard deviations. Piezometer readings are turned into excess pore
//! pressure at the tip's settled depth (`tip`).
//!
//! Method: Levenberg–Marquardt (Press et al. 1992, Numerical Recipes in C §15.5;
//! Bard 1974, Nonlinear Parameter Estimation, ch. 5) on θ = (ln m, ln c),
//! with the Jacobian by central differences, started from the best point
//! of a log grid of m in which c is the weighted least-squares scale of the
//! plates at that m (settlement is nearly proportional to c), and kept in
//! the box M_MIN–M_MAX, C_MIN–C_MAX (a multiplier on a bound whose step
//! points out of the box is held there). The standard errors and correlation
//! come from the covariance (JᵀWJ)⁻¹ at the optimum (J of the weighted
//! residuals, so W is inside it). When χ²/dof > 1 the standard errors are
//! multiplied by the Birge ratio √(χ²/dof) (Birge 1932; the misfit is
//! larger than the stated precisions explain), never narrowed when below 1.

use super::readings::Readings;
use super::replay::replay;
use super::tip::{self, TipSettlement};
use crate::error::{Error, Result};
use crate::model::{InstrumentKind, Project};
use crate::response::{Engine, State};
use nalgebra::{DMatrix, DVector, Matrix2, Vector2};
use serde::Serialize;

/// Search range of the rate multiplier.
pub const M_MIN: f64 = 0.1;
pub const M_MAX: f64 = 10.0;
/// Search range of the compressibility multiplier.
pub const C_MIN: f64 = 0.25;
pub const C_MAX: f64 = 4.0;
/// Points of the starting grid of ln m over its range.
const GRID: usize = 13;
/// Levenberg–Marquardt: step on θ (ln units) below which it has converged,
/// largest step, iteration limit, central-difference step on θ.
const TOL_STEP: f64 = 1e-4;
const MAX_STEP: f64 = 1.0;
const MAX_ITER: usize = 40;
/// Relative decrease of the sum of squares below which it has converged.
const TOL_GAIN: f64 = 1e-9;
const H: f64 = 0.01;

/// A reading the model can predict.
#[derive(Debug, Clone, Copy)]
pub struct Observation {
    /// Index into `Readings::readings`.
    pub reading: usize,
    pub kind: InstrumentKind,
    pub x_m: f64,
    pub z_m: f64,
    /// Measured excess pore pressure kPa at the settled tip (piezometer) or
    /// settlement m (plate).
    pub measured: f64,
    pub sd: f64,
}

/// The usable piezometer and plate readings of a file, piezometers
/// corrected for the tip's settlement (`tip`), and how each tip's
/// settlement was found.
pub fn observations(p: &Project, r: &Readings) -> (Vec<Observation>, Vec<TipSettlement>) {
    let (s_tip, tips) = tip::settlements(p, r);
    let obs = r
        .readings
        .iter()
        .enumerate()
        .filter(|(_, x)| x.suspect.is_none())
        .filter_map(|(k, x)| {
            let inst = &p.instruments[x.instrument];
            let (measured, sd) = match inst.kind {
                InstrumentKind::Piezometer => {
                    (tip::excess(p, x.value, inst.depth_m, s_tip[k]), p.monitoring.piezometer_sd_kpa)
                }
                InstrumentKind::SettlementPlate => (x.value, p.monitoring.settlement_sd_m),
                InstrumentKind::LateralMarker => return None,
            };
            Some(Observation { reading: k, kind: inst.kind, x_m: inst.offset_m, z_m: inst.depth_m, measured, sd })
        })
        .collect();
    (obs, tips)
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

/// The project with both multipliers applied.
pub fn calibrated_project(p: &Project, rate: f64, compressibility: f64) -> Project {
    p.with_consolidation_factor(rate).with_compressibility_factor(compressibility)
}

/// One back-analysed multiplier.
#[derive(Debug, Clone, Serialize)]
pub struct Estimate {
    /// Best-fit value.
    pub value: f64,
    /// Standard error of ln(value) from the covariance (JᵀWJ)⁻¹ with the
    /// stated reading precisions.
    pub se_ln: f64,
    /// The same widened by the Birge ratio (what the interval uses).
    pub se_ln_widened: f64,
    /// Approximate 95% interval, exp(ln value ± 1.96 se_ln_widened).
    pub interval95: (f64, f64),
    /// False when the estimate lies at a bound of its search range.
    pub within_range: bool,
}

/// The fitted multipliers and how well they fit.
#[derive(Debug, Clone, Serialize)]
pub struct Fit {
    /// Multiplier on cv and ch.
    pub rate: Estimate,
    /// Multiplier on Cc and Cr.
    pub compressibility: Estimate,
    /// Correlation coefficient of ln(rate) and ln(compressibility) from the
    /// covariance.
    pub correlation: f64,
    /// Readings used (piezometer, plate) and degrees of freedom (n − 2).
    pub piezometer_readings: usize,
    pub plate_readings: usize,
    pub dof: usize,
    /// Root-mean-square misfit with the project's values and after fitting:
    /// excess pore pressure kPa and settlement mm (None without readings of
    /// that kind).
    pub rms_piezometer_kpa_before: Option<f64>,
    pub rms_piezometer_kpa_after: Option<f64>,
    pub rms_settlement_mm_before: Option<f64>,
    pub rms_settlement_mm_after: Option<f64>,
    /// Weighted sum of squares per degree of freedom after fitting (≈ 1
    /// when the misfit is as large as the stated reading precision).
    pub chi2_per_dof: f64,
    /// max(1, √(χ²/dof)): the factor on the standard errors.
    pub birge_ratio: f64,
    /// Model evaluations and Levenberg–Marquardt iterations used.
    pub evaluations: usize,
    pub iterations: usize,
    /// False when the iteration stopped at its limit (the last iterate is
    /// reported, and the check holds for review).
    pub converged: bool,
    /// How each piezometer's tip settlement was found.
    pub tip_settlement: Vec<TipSettlement>,
}

impl Fit {
    /// Both estimates inside their search ranges.
    pub fn within_range(&self) -> bool {
        self.rate.within_range && self.compressibility.within_range
    }
}

fn rms(v: impl Iterator<Item = f64>) -> Option<f64> {
    let (n, s) = v.fold((0usize, 0.0), |(n, s), x| (n + 1, s + x * x));
    (n > 0).then(|| (s / n as f64).sqrt())
}

/// The box of θ = (ln m, ln c).
fn bounds() -> [(f64, f64); 2] {
    [(M_MIN.ln(), M_MAX.ln()), (C_MIN.ln(), C_MAX.ln())]
}

fn clamp_box(t: Vector2<f64>) -> Vector2<f64> {
    let b = bounds();
    Vector2::new(t[0].clamp(b[0].0, b[0].1), t[1].clamp(b[1].0, b[1].1))
}

/// Fit both multipliers to the observations (from `observations`).
pub fn fit(p: &Project, r: &Readings, obs: &[Observation], tips: Vec<TipSettlement>) -> Result<Fit> {
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
    let mut residuals = |t: Vector2<f64>| -> DVector<f64> {
        evaluations += 1;
        let q = calibrated_project(p, t[0].exp(), t[1].exp());
        let (pred, _) = predict(&Engine::new(&q), r, obs);
        DVector::from_iterator(obs.len(), obs.iter().zip(&pred).map(|(o, m)| (m - o.measured) / o.sd))
    };
    // Start: a grid of ln m at c = 1, each with the plates' weighted
    // least-squares scale c* = Σ s_i y_i / Σ s_i² (residuals in sd units).
    let is_plate: Vec<bool> = obs.iter().map(|o| o.kind == InstrumentKind::SettlementPlate).collect();
    let [bm, bc] = bounds();
    let mut start = (f64::INFINITY, Vector2::new(0.0, 0.0));
    for k in 0..GRID {
        let x = bm.0 + (bm.1 - bm.0) * k as f64 / (GRID - 1) as f64;
        let res = residuals(Vector2::new(x, 0.0));
        let (mut sy, mut ss) = (0.0, 0.0);
        for (j, o) in obs.iter().enumerate().filter(|(j, _)| is_plate[*j]) {
            let model = res[j] + o.measured / o.sd;
            sy += model * o.measured / o.sd;
            ss += model * model;
        }
        let c = if ss > 0.0 && sy > 0.0 { (sy / ss).ln().clamp(bc.0, bc.1) } else { 0.0 };
        let sse: f64 = obs
            .iter()
            .enumerate()
            .map(|(j, o)| {
                if is_plate[j] {
                    (c.exp() * (res[j] + o.measured / o.sd) - o.measured / o.sd).powi(2)
                } else {
                    res[j].powi(2)
                }
            })
            .sum();
        if sse < start.0 {
            start = (sse, Vector2::new(x, c));
        }
    }
    let jacobian = |t: Vector2<f64>, residuals: &mut dyn FnMut(Vector2<f64>) -> DVector<f64>| {
        let mut j = DMatrix::zeros(obs.len(), 2);
        for k in 0..2 {
            let mut e = Vector2::zeros();
            e[k] = H;
            j.set_column(k, &((residuals(t + e) - residuals(t - e)) / (2.0 * H)));
        }
        j
    };
    let mut t = start.1;
    let mut res = residuals(t);
    let mut sse = res.norm_squared();
    let mut lambda = 1e-3;
    let mut iterations = 0;
    let b = bounds();
    // A coordinate on a bound whose step points out of the box is held
    // there (projected Levenberg–Marquardt).
    let outward = |t: &Vector2<f64>, k: usize, dk: f64| {
        (t[k] <= b[k].0 + 1e-9 && dk < 0.0) || (t[k] >= b[k].1 - 1e-9 && dk > 0.0)
    };
    let converged = loop {
        iterations += 1;
        if iterations > MAX_ITER {
            break false;
        }
        let j = jacobian(t, &mut residuals);
        let a = j.tr_mul(&j);
        let g = j.tr_mul(&res);
        let a2 = Matrix2::new(a[(0, 0)], a[(0, 1)], a[(1, 0)], a[(1, 1)]);
        let g2 = Vector2::new(g[0], g[1]);
        let mut step = Vector2::zeros();
        let mut gain = 0.0;
        let mut improved = false;
        while lambda < 1e10 {
            let damped = a2 + Matrix2::from_diagonal(&Vector2::new(a2[(0, 0)], a2[(1, 1)])) * lambda;
            let Some(mut d) = damped.lu().solve(&-g2) else {
                lambda *= 10.0;
                continue;
            };
            for k in 0..2 {
                if outward(&t, k, d[k]) {
                    let o = 1 - k;
                    d[k] = 0.0;
                    d[o] = if outward(&t, o, -g2[o]) { 0.0 } else { -g2[o] / (a2[(o, o)] * (1.0 + lambda)) };
                }
            }
            if d.amax() == 0.0 {
                break;
            }
            let d = d * (MAX_STEP / d.amax().max(MAX_STEP));
            let trial = clamp_box(t + d);
            let r_trial = residuals(trial);
            let s_trial = r_trial.norm_squared();
            if s_trial < sse {
                step = trial - t;
                gain = (sse - s_trial) / sse.max(f64::MIN_POSITIVE);
                (t, res, sse) = (trial, r_trial, s_trial);
                lambda = (lambda / 10.0).max(1e-9);
                improved = true;
                break;
            }
            lambda *= 10.0;
        }
        if !improved || step.amax() < TOL_STEP || gain < TOL_GAIN {
            break true;
        }
    };
    // Covariance of θ at the optimum: (JᵀWJ)⁻¹ (W inside the weighted J).
    let j = jacobian(t, &mut residuals);
    let a = j.tr_mul(&j);
    let cov = Matrix2::new(a[(0, 0)], a[(0, 1)], a[(1, 0)], a[(1, 1)]).try_inverse();
    let n = obs.len();
    let dof = n.saturating_sub(2).max(1);
    let chi2 = sse / dof as f64;
    let birge = chi2.sqrt().max(1.0);
    let se = |k: usize| cov.map_or(f64::INFINITY, |c| c[(k, k)].max(0.0).sqrt());
    let correlation = cov.map_or(f64::NAN, |c| c[(0, 1)] / (c[(0, 0)] * c[(1, 1)]).sqrt());
    let estimate = |k: usize| {
        let (s, w) = (se(k), se(k) * birge);
        Estimate {
            value: t[k].exp(),
            se_ln: s,
            se_ln_widened: w,
            interval95: ((t[k] - 1.96 * w).exp(), (t[k] + 1.96 * w).exp()),
            within_range: t[k] > b[k].0 + 1e-6 && t[k] < b[k].1 - 1e-6,
        }
    };
    let r_one = residuals(Vector2::zeros());
    let pick = |v: &DVector<f64>, kind: InstrumentKind, scale: f64| {
        rms(obs.iter().zip(v.iter()).filter(|(o, _)| o.kind == kind).map(|(o, r)| r * o.sd * scale))
    };
    Ok(Fit {
        rate: estimate(0),
        compressibility: estimate(1),
        correlation,
        piezometer_readings: obs.iter().filter(|o| o.kind == InstrumentKind::Piezometer).count(),
        plate_readings: obs.iter().filter(|o| o.kind == InstrumentKind::SettlementPlate).count(),
        dof,
        rms_piezometer_kpa_before: pick(&r_one, InstrumentKind::Piezometer, 1.0),
        rms_piezometer_kpa_after: pick(&res, InstrumentKind::Piezometer, 1.0),
        rms_settlement_mm_before: pick(&r_one, InstrumentKind::SettlementPlate, 1000.0),
        rms_settlement_mm_after: pick(&res, InstrumentKind::SettlementPlate, 1000.0),
        chi2_per_dof: chi2,
        birge_ratio: birge,
        evaluations,
        iterations,
        converged,
        tip_settlement: tips,
    })
}
