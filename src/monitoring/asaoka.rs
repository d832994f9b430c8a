//! Asaoka's (1978) observational method for settlement plates: the record
//! since the last load change is resampled at equal intervals Δt, the
//! points are fitted by least squares to s_k = β0 + β1 s_(k−1), and the
//! final settlement is the fixed point s_f = β0 / (1 − β1). The slope gives
//! the coefficient of consolidation: vertical drainage cv = −(5/12) H² ln β1
//! / Δt (Asaoka 1978, parabolic isochrones); radial drainage to drains ch =
//! −(de² μ / 8) ln β1 / Δt (Hansbo 1981 with Asaoka's construction).

use super::readings::Readings;
use crate::model::{InstrumentKind, LayerKind, Project};
use crate::response::Engine;
use nalgebra::{Matrix2, Vector2};
use serde::Serialize;

/// Fewest resampled points for a fit that is reported as reliable.
pub const MIN_POINTS: usize = 6;
/// Lowest degree of consolidation (settlement now over forecast final) at
/// which the forecast is reported as reliable (Asaoka 1978: the method rests
/// on the first term of the consolidation series, dominant beyond about 60%).
pub const MIN_DEGREE: f64 = 0.6;
/// Fewest actual readings in the fitted window for a reliable fit.
pub const MIN_READINGS: usize = 4;

/// How the implied coefficient is worked out.
#[derive(Debug, Clone, Copy)]
pub enum Drainage {
    /// One-dimensional vertical drainage with drainage path H, m.
    Vertical { path_m: f64 },
    /// Radial drainage to drains: influence diameter de (m) and Hansbo's μ.
    Radial { de_m: f64, mu: f64 },
}

/// Result of Asaoka's construction on one plate.
#[derive(Debug, Clone, Serialize)]
pub struct Asaoka {
    pub beta0_m: f64,
    pub beta1: f64,
    /// Final settlement under the current load, m (None when β1 ∉ (0, 1)).
    pub final_m: Option<f64>,
    /// Settlement now over the final settlement, 0–1.
    pub degree: Option<f64>,
    /// Implied cv (vertical) or ch (radial), m²/year.
    pub coefficient_m2_per_year: Option<f64>,
    /// "cv" or "ch".
    pub coefficient: &'static str,
    /// Resampled points used, and actual readings in the window.
    pub points: usize,
    pub readings: usize,
    pub interval_days: f64,
    /// Whether the fit rests on enough data to be trusted.
    pub reliable: bool,
    /// Why it is not reliable (empty when it is).
    pub note: String,
}

/// Points (day, settlement m) resampled every `dt` days from the first to
/// the last reading by linear interpolation.
pub fn resample(t: &[f64], s: &[f64], dt: f64) -> Vec<f64> {
    let (Some(&t0), Some(&t1)) = (t.first(), t.last()) else { return Vec::new() };
    let n = ((t1 - t0) / dt + 1e-9).floor() as usize;
    (0..=n)
        .map(|k| {
            let tk = t0 + k as f64 * dt;
            let i = t.partition_point(|x| *x <= tk).clamp(1, t.len().max(2) - 1);
            if t.len() < 2 {
                return s[0];
            }
            let w = ((tk - t[i - 1]) / (t[i] - t[i - 1])).clamp(0.0, 1.0);
            s[i - 1] + w * (s[i] - s[i - 1])
        })
        .collect()
}

/// Least-squares β0, β1 of s_k = β0 + β1 s_(k−1) from the normal equations
/// (nalgebra); None when the points do not determine them.
pub fn fit_betas(s: &[f64]) -> Option<(f64, f64)> {
    if s.len() < 3 {
        return None;
    }
    let (mut sx, mut sy, mut sxx, mut sxy) = (0.0, 0.0, 0.0, 0.0);
    let n = (s.len() - 1) as f64;
    for w in s.windows(2) {
        let (x, y) = (w[0], w[1]);
        sx += x;
        sy += y;
        sxx += x * x;
        sxy += x * y;
    }
    let a = Matrix2::new(n, sx, sx, sxx);
    let b = Vector2::new(sy, sxy);
    let scale = sxx.abs().max(1e-30);
    if a.determinant().abs() < 1e-12 * scale * n {
        return None;
    }
    let x = a.lu().solve(&b)?;
    Some((x[0], x[1]))
}

/// Asaoka's construction on readings (days, settlement m) since the last
/// load change.
pub fn asaoka(t: &[f64], s: &[f64], dt: f64, drainage: Drainage) -> Asaoka {
    let pts = resample(t, s, dt);
    let coefficient = match drainage {
        Drainage::Vertical { .. } => "cv",
        Drainage::Radial { .. } => "ch",
    };
    let mut out = Asaoka {
        beta0_m: f64::NAN,
        beta1: f64::NAN,
        final_m: None,
        degree: None,
        coefficient_m2_per_year: None,
        coefficient,
        points: pts.len(),
        readings: t.len(),
        interval_days: dt,
        reliable: false,
        note: String::new(),
    };
    let Some((b0, b1)) = fit_betas(&pts) else {
        out.note = format!("{} resampled point(s): too few, or settlement not changing, to fit β0 and β1", pts.len());
        return out;
    };
    (out.beta0_m, out.beta1) = (b0, b1);
    if !(b1 > 0.0 && b1 < 1.0) {
        out.note = format!("β1 = {b1:.3} is outside 0–1: the record is not an approach to a final value");
        return out;
    }
    let sf = b0 / (1.0 - b1);
    out.final_m = Some(sf);
    out.degree = s.last().map(|now| now / sf);
    let per_day = match drainage {
        Drainage::Vertical { path_m } => -5.0 / 12.0 * path_m * path_m * b1.ln() / dt,
        Drainage::Radial { de_m, mu } => -de_m * de_m * mu / 8.0 * b1.ln() / dt,
    };
    out.coefficient_m2_per_year = Some(per_day * crate::model::DAYS_PER_YEAR);
    let mut notes = Vec::new();
    if pts.len() < MIN_POINTS {
        notes.push(format!("only {} resampled points (at least {MIN_POINTS} needed)", pts.len()));
    }
    if let Some(u) = out.degree
        && u < MIN_DEGREE
    {
        notes.push(format!(
            "settlement is only {:.0}% of the forecast final value; the construction needs the later, first-mode part of the record (U ≥ {:.0}%)",
            100.0 * u,
            100.0 * MIN_DEGREE
        ));
    }
    if t.len() < MIN_READINGS {
        notes.push(format!("only {} readings since the last load change (at least {MIN_READINGS} needed)", t.len()));
    }
    out.reliable = notes.is_empty();
    out.note = notes.join("; ");
    out
}

/// Drainage for Asaoka's coefficient at offset x: radial where drains are
/// installed under the fill (within the toe), with Hansbo's μ averaged over
/// the drain length as the engine uses it (smear and well resistance);
/// vertical otherwise.
fn drainage_at(p: &Project, engine: &Engine, x_m: f64) -> Drainage {
    let toe = crate::response::column_offsets(p)[3].x_m;
    if let Some(d) = &p.drains
        && x_m.abs() <= toe
    {
        let de = d.influence_diameter_m();
        let mus: Vec<f64> =
            engine.columns[0].radial.iter().filter(|f| **f > 0.0).map(|f| 8.0 / (de * de * f)).collect();
        if !mus.is_empty() {
            return Drainage::Radial { de_m: de, mu: mus.iter().sum::<f64>() / mus.len() as f64 };
        }
    }
    Drainage::Vertical { path_m: drainage_path_m(p) }
}

/// Longest vertical drainage path of the clay: each run of consecutive clay
/// layers drains at its top (the surface or a sand) and at its bottom when
/// that is sand or a drained base.
pub fn drainage_path_m(p: &Project) -> f64 {
    let layers = &p.ground.layers;
    let mut best: f64 = 0.0;
    let mut run = 0.0;
    for (i, l) in layers.iter().enumerate() {
        match l.kind {
            LayerKind::Clay(_) => run += l.thickness_m,
            _ => run = 0.0,
        }
        let ends_here = !matches!(l.kind, LayerKind::StiffBase)
            && !matches!(layers.get(i + 1).map(|n| &n.kind), Some(LayerKind::Clay(_)));
        if matches!(l.kind, LayerKind::Clay(_)) && ends_here {
            let bottom_drains = match layers.get(i + 1).map(|n| &n.kind) {
                Some(LayerKind::Sand { .. }) => true,
                Some(LayerKind::StiffBase) | None => p.ground.base_drained,
                Some(LayerKind::Clay(_)) => false,
            };
            best = best.max(if bottom_drains { run / 2.0 } else { run });
        }
    }
    best
}

/// Asaoka's construction for every settlement plate on its readings since
/// the last lift ended.
pub fn plates_asaoka(p: &Project, engine: &Engine, r: &Readings) -> Vec<(String, Asaoka)> {
    let since = r.last_change_end();
    p.instruments
        .iter()
        .enumerate()
        .filter(|(_, i)| i.kind == InstrumentKind::SettlementPlate)
        .map(|(k, inst)| {
            let pts: Vec<(f64, f64)> = super::trends::series_from(r, k, since);
            let (t, s): (Vec<f64>, Vec<f64>) = pts.into_iter().unzip();
            (inst.id.clone(), asaoka(&t, &s, p.monitoring.asaoka_interval_days, drainage_at(p, engine, inst.offset_m)))
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exponential_record_gives_its_final_value() {
        // Asaoka (1978): for s(t) = s_f (1 − e^(−t/τ)) sampled every Δt,
        // s_k = s_f (1 − β1) + β1 s_(k−1) exactly with β1 = e^(−Δt/τ), so the
        // construction returns s_f to rounding.
        let (sf, tau) = (1.234, 60.0);
        let t: Vec<f64> = (0..30).map(|k| 3.0 * k as f64).collect();
        let s: Vec<f64> = t.iter().map(|t| sf * (1.0 - (-t / tau).exp())).collect();
        let a = asaoka(&t, &s, 6.0, Drainage::Vertical { path_m: 5.0 });
        assert!((a.final_m.unwrap() - sf).abs() < 1e-6, "{a:?}");
        assert!((a.beta1 - (-6.0f64 / tau).exp()).abs() < 1e-9);
        assert!(a.reliable);
    }

    #[test]
    fn coefficient_of_a_terzaghi_first_mode_record() {
        // A record that is exactly the first mode of Terzaghi's solution for
        // cv = 2 m²/yr and drainage path H = 5 m decays with
        // τ = 4H²/(π² cv) (Terzaghi 1943, closed form). Asaoka's (1978)
        // parabolic-isochrone coefficient 5/12 then returns cv × 5π²/48
        // (= 1.028 cv: 5/12 against 4/π², both published), not the code's
        // own number.
        let (cv_year, h) = (2.0, 5.0);
        let cv_day = cv_year / crate::model::DAYS_PER_YEAR;
        let tau = 4.0 * h * h / (std::f64::consts::PI.powi(2) * cv_day);
        let t: Vec<f64> = (0..40).map(|k| 6.0 * k as f64).collect();
        let s: Vec<f64> = t.iter().map(|t| 0.8 * (1.0 - (-t / tau).exp())).collect();
        let a = asaoka(&t, &s, 6.0, Drainage::Vertical { path_m: h });
        let expect = cv_year * 5.0 * std::f64::consts::PI.powi(2) / 48.0;
        assert!((a.coefficient_m2_per_year.unwrap() - expect).abs() < 1e-6 * expect, "{a:?}");
    }

    #[test]
    fn too_few_points_are_flagged() {
        let t = [0.0, 7.0, 14.0];
        let s = [0.1, 0.15, 0.18];
        let a = asaoka(&t, &s, 7.0, Drainage::Vertical { path_m: 5.0 });
        assert!(!a.reliable);
        assert!(!a.note.is_empty());
    }

    #[test]
    fn resampling_is_linear_interpolation() {
        let v = resample(&[0.0, 10.0, 20.0], &[0.0, 1.0, 3.0], 5.0);
        assert_eq!(v.len(), 5);
        assert!((v[1] - 0.5).abs() < 1e-12 && (v[3] - 2.0).abs() < 1e-12);
    }
}
