//! Following the as-built fill record with the ground response engine:
//! the height rises and falls linearly between the record's points, the
//! engine steps with the placement step while the height changes and the
//! rest step while it holds, and every step is cut at the sample times so
//! that the model is read exactly when the instruments were.

use super::readings::{FillPoint, height_at};
use crate::response::{Engine, State};

/// Run `engine` from its initial state along `fill` until `end_day`,
/// calling `on_sample(k, state)` at each `sample_days[k]` (sorted
/// ascending; samples before day 0 see the initial state). Returns the
/// state at `end_day`.
pub fn replay(
    engine: &Engine,
    fill: &[FillPoint],
    sample_days: &[f64],
    end_day: f64,
    mut on_sample: impl FnMut(usize, &State),
) -> State {
    let opts = &engine.project.analysis;
    let mut st = engine.initial_state();
    let mut events: Vec<f64> = fill.iter().map(|f| f.day).chain(sample_days.iter().copied()).collect();
    events.push(end_day);
    events.retain(|d| *d > 0.0 && *d <= end_day);
    events.sort_by(f64::total_cmp);
    events.dedup_by(|a, b| (*a - *b).abs() < 1e-9);
    let mut next_sample = 0;
    let mut emit = |st: &State, upto: f64, next_sample: &mut usize| {
        while *next_sample < sample_days.len() && sample_days[*next_sample] <= upto + 1e-9 {
            on_sample(*next_sample, st);
            *next_sample += 1;
        }
    };
    emit(&st, 0.0, &mut next_sample);
    for e in events {
        // Between consecutive events the height is linear in time.
        let changing = (height_at(fill, e) - height_at(fill, st.day)).abs() > 1e-9;
        let step = if changing { opts.placement_step_days } else { opts.rest_step_days };
        while st.day < e - 1e-9 {
            let dt = step.min(e - st.day);
            let h = height_at(fill, st.day + dt);
            engine.advance(&mut st, dt, h);
        }
        emit(&st, e, &mut next_sample);
    }
    st
}
