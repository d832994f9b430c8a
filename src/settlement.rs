//! Settlement words that mean what they say, under the centreline:
//!
//! * **settlement at the finish** — computed by the response engine on the
//!   last day of the works;
//! * **final primary settlement** S_f — once every excess pore pressure has
//!   dissipated under the *final profile*: the final crest plus the make-up
//!   fill that S_f itself requires (the fill is topped up until the crest
//!   stays at its level). That is the fixed point S = g(H + S), g(t) the
//!   fully drained settlement under placed thickness t from the ground's
//!   state at the finish (its stress history kept, so a surcharge's
//!   preloading counts), found by plain fixed-point iteration from the
//!   settlement at the finish to 0.1 mm (g rises far more slowly than t:
//!   dg/dt = Σ mv γ Δz ≪ 1, so the iteration contracts);
//! * **residual settlement over the design life** — what is still to come
//!   in the design life after the finish: the remaining primary S_f − S_finish
//!   (all of it, even where consolidation would outlast the design life:
//!   the safe side) plus secondary compression from the end of primary,
//!   Mesri's convention ε = Cα/(1+e0)·log10(t/t_p) (Mesri 1973; Mesri &
//!   Godlewski 1977, from memory), t counted from the start of loading,
//!   summed over the clay layers: Σ Cα/(1+e0)·H·log10(t2/t1), t1 = max(t_finish,
//!   t_p), t2 = t_finish + design life (none when t_p ≥ t2). The end of
//!   primary t_p is the day the centreline average degree of consolidation
//!   reaches `EOP_DEGREE`, found by running the centreline column on under
//!   the final profile (Crank–Nicolson steps of 2% of the time since loading
//!   began).

use crate::model::LayerKind;
use crate::response::{Engine, State};
use serde::Serialize;

/// Average degree of consolidation taken as the end of primary (common
/// practice; an earlier t_p than at 98–100% gives more secondary
/// compression, so the choice errs on the safe side).
pub const EOP_DEGREE: f64 = 0.95;
/// Tolerance of the final-settlement fixed point, m.
const FIXED_POINT_TOL_M: f64 = 1e-4;
const FIXED_POINT_MAX: usize = 100;
/// Steps of the run to the end of primary grow with the time since loading
/// began, at this fraction of it (at least the rest step of the analysis).
const EOP_STEP_FRACTION: f64 = 0.02;

/// The settlement forecast at the finish, m (centreline).
#[derive(Debug, Clone, Serialize)]
pub struct Forecast {
    /// Settlement on the last day of the works.
    pub at_finish_m: f64,
    /// Final primary settlement under the final profile (fixed point).
    pub final_primary_m: f64,
    /// S_f − settlement at the finish (negative: swelling still to come).
    pub remaining_primary_m: f64,
    /// Secondary compression within the design life after the finish.
    pub secondary_m: f64,
    /// remaining primary + secondary.
    pub residual_m: f64,
    /// Day (from the project start) the centreline degree of consolidation
    /// reaches `EOP_DEGREE`; None when not within the design life.
    pub end_of_primary_day: Option<f64>,
    /// Whether the fixed point converged (a warning when not).
    pub converged: bool,
}

/// Final primary settlement under the crest at `height_m` made up for its
/// own settlement, from state `st`: (S_f m, converged).
pub fn final_primary(engine: &Engine, st: &State, height_m: f64) -> (f64, bool) {
    let col = &engine.columns[0];
    let mut s = st.settlement_centre_m;
    for _ in 0..FIXED_POINT_MAX {
        let next = col.settlement(&engine.drained_centre(st, height_m + s, s));
        if (next - s).abs() < FIXED_POINT_TOL_M {
            return (next, true);
        }
        s = next;
    }
    (s, false)
}

/// The forecast from the state `st` at the finish (crest at its final
/// height), loading having begun on day `loading_start_day`.
pub fn forecast(engine: &Engine, st: &State, loading_start_day: f64) -> Forecast {
    let p = engine.project;
    let (final_primary_m, converged) = final_primary(engine, st, st.height_m);
    let life = p.info.design_life_years * crate::model::DAYS_PER_YEAR;
    let end = st.day + life;
    let eop = end_of_primary(engine, st, loading_start_day, end, final_primary_m);
    let secondary_m = match eop {
        Some(tp) => {
            let (t1, t2) = (st.day.max(tp) - loading_start_day, end - loading_start_day);
            secondary_per_log_cycle(engine) * (t2 / t1.max(1.0)).log10().max(0.0)
        }
        None => 0.0,
    };
    let remaining_primary_m = final_primary_m - st.settlement_centre_m;
    Forecast {
        at_finish_m: st.settlement_centre_m,
        final_primary_m,
        remaining_primary_m,
        secondary_m,
        residual_m: remaining_primary_m + secondary_m,
        end_of_primary_day: eop,
        converged,
    }
}

/// Σ Cα/(1+e0)·H over the clay layers, m per log cycle of time.
pub fn secondary_per_log_cycle(engine: &Engine) -> f64 {
    engine
        .project
        .ground
        .layers
        .iter()
        .filter_map(|l| match &l.kind {
            LayerKind::Clay(c) => Some(c.c_alpha / (1.0 + c.e0) * l.thickness_m),
            _ => None,
        })
        .sum()
}

/// Day the centreline degree reaches `EOP_DEGREE` under the final profile
/// (the present crest plus the make-up for the final primary settlement
/// `final_m`, placed at once), by running the centreline column on in steps
/// growing with the time since loading began; interpolated linearly in
/// ln(1 − U) between steps (the tail of consolidation decays
/// exponentially). None when not reached by day `until`.
fn end_of_primary(engine: &Engine, st: &State, loading_start_day: f64, until: f64, final_m: f64) -> Option<f64> {
    let mut s = st.clone();
    let mut u = engine.degree_centre(&s);
    if u >= EOP_DEGREE {
        return Some(s.day);
    }
    let min_dt = engine.project.analysis.rest_step_days;
    while s.day < until {
        let dt = (EOP_STEP_FRACTION * (s.day - loading_start_day)).max(min_dt).min(until - s.day);
        let (t0, u0) = (s.day, u);
        engine.advance_centre(&mut s, dt, st.height_m + final_m, final_m);
        u = engine.degree_centre(&s);
        if u >= EOP_DEGREE {
            let ln = |v: f64| (1.0 - v).max(1e-12).ln();
            let w = (ln(EOP_DEGREE) - ln(u0)) / (ln(u) - ln(u0));
            return Some(t0 + w.clamp(0.0, 1.0) * dt);
        }
    }
    None
}

#[cfg(test)]
mod tests;
