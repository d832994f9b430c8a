//! A plain implementation of a column step, for the tests only, written
//! from the scheme in the parent module's doc: every pass assembles the
//! θ-scheme's tridiagonal system afresh in new vectors, with the secant
//! storage's strains from `ground::strain` (four base-10 logarithms from
//! the C library each), and solves it by Thomas' algorithm; first iterate,
//! tolerance and relaxation as in the parent. The fast step keeps its
//! vectors between steps, assembles what does not change within a step
//! once, shares each node's logarithms between the two elements meeting
//! there and takes them from the natural logarithm: the tests below check
//! that it gives the same answers.

use super::*;
use crate::load::Stress;

/// One step of `col` by the plain scheme (the counterpart of `Column::step`).
fn step(col: &Column, st: &mut ColumnState, load: &[Stress], rule: PorePressureRule, dt: f64) -> bool {
    let theta = col.apply_load(st, load, rule);
    let converged = diffuse(col, st, dt, theta);
    col.raise_smax(st);
    converged
}

fn diffuse(col: &Column, st: &mut ColumnState, dt: f64, theta: f64) -> bool {
    let s_eff: Vec<f64> = (0..col.nodes.len()).map(|i| col.sigma_eff(st, i)).collect();
    let k: Vec<f64> = (0..col.elements.len()).map(|e| col.conductivity(st, &s_eff, e)).collect();
    let sd = col.mode == ConsolidationMode::StressDependent;
    let mut u: Vec<f64> = if sd && st.du_prev.len() == st.u.len() && st.dt_prev > 0.0 {
        let f = dt / st.dt_prev;
        st.u.iter().zip(&st.du_prev).map(|(u, d)| u + f * d).collect()
    } else {
        solve(col, st, &k, dt, theta, None)
    };
    let mut converged = !sd;
    let (mut omega, mut prev) = (1.0f64, f64::INFINITY);
    for it in 0..if sd { PICARD_MAX } else { 0 } {
        let next = solve(col, st, &k, dt, theta, Some(&u));
        let residual = next.iter().zip(&u).map(|(a, b)| (a - b).abs()).fold(0.0, f64::max);
        if residual < PICARD_TOL_KPA {
            u = next;
            converged = true;
            break;
        }
        if it >= PICARD_UNDAMPED && residual > 0.9 * prev {
            omega = (0.5 * omega).max(1.0 / 256.0);
        }
        prev = residual;
        for (o, n) in u.iter_mut().zip(&next) {
            *o += omega * (n - *o);
        }
    }
    if sd {
        st.du_prev = u.iter().zip(&st.u).map(|(n, o)| n - o).collect();
        st.dt_prev = dt;
    }
    st.u.copy_from_slice(&u);
    converged
}

/// Storage mv·h/2 of element e at its end `end`: the secant over the step
/// to the trial `u_new`, else the tangent at the start.
fn storage(col: &Column, st: &ColumnState, e: usize, end: usize, u_new: Option<&[f64]>) -> f64 {
    let el = &col.elements[e];
    let Some(c) = &el.clay else { return 0.0 };
    let i = e + end;
    let s_old = col.sigma_eff(st, i);
    let sp = el.sp0[end].max(st.smax[i]);
    let mv = match (col.mode, u_new) {
        (ConsolidationMode::Linear, _) => el.mv_lin,
        (_, None) => ground::mv_tangent(c, s_old, sp),
        (_, Some(u)) => {
            let s_new = s_old + st.u[i] - u[i];
            if (s_new - s_old).abs() < 1e-6 {
                ground::mv_tangent(c, s_old, sp)
            } else {
                let s0 = col.nodes[i].sigma_v0_eff_kpa;
                let eps = |s: f64| ground::strain(c, s0, el.sp0[end], st.smax[i].max(s), s);
                (eps(s_new) - eps(s_old)) / (s_new - s_old)
            }
        }
    };
    0.5 * el.h_m * mv
}

/// One pass: assemble and solve the θ-step with the storage of `storage`.
fn solve(col: &Column, st: &ColumnState, k: &[f64], dt: f64, theta: f64, u_new: Option<&[f64]>) -> Vec<f64> {
    let n = col.nodes.len();
    let (mut a, mut b, mut c, mut d) = (vec![0.0; n], vec![0.0; n], vec![0.0; n], vec![0.0; n]);
    let u = &st.u;
    for i in 0..n {
        if col.fixed[i] {
            b[i] = 1.0;
            continue;
        }
        let (mut up, mut down, mut s, mut r) = (0.0, 0.0, 0.0, 0.0);
        if i > 0 {
            up = k[i - 1] / col.elements[i - 1].h_m;
            s += storage(col, st, i - 1, 1, u_new);
            r += col.sink_per_k(i - 1, i) * k[i - 1];
        }
        if i + 1 < n {
            down = k[i] / col.elements[i].h_m;
            s += storage(col, st, i, 0, u_new);
            r += col.sink_per_k(i, i) * k[i];
        }
        let uu = if i > 0 { u[i - 1] } else { 0.0 };
        let ud = if i + 1 < n { u[i + 1] } else { 0.0 };
        let flux = down * (ud - u[i]) - up * (u[i] - uu) - r * u[i];
        a[i] = -theta * up;
        c[i] = -theta * down;
        b[i] = s / dt + theta * (up + down + r);
        d[i] = s / dt * u[i] + (1.0 - theta) * flux;
    }
    let (mut inv, mut x) = (vec![0.0; n], vec![0.0; n]);
    thomas(&a, &c, |i| (b[i], d[i]), true, &mut inv, &mut x);
    x
}

/// Settlement summed plainly with `ground::strain`, m.
fn settlement(col: &Column, st: &ColumnState) -> f64 {
    let mut total = 0.0;
    for (e, el) in col.elements.iter().enumerate() {
        let Some(c) = &el.clay else { continue };
        for end in 0..2 {
            let i = e + end;
            let se = col.sigma_eff(st, i);
            let s0 = col.nodes[i].sigma_v0_eff_kpa;
            total += 0.5 * el.h_m * ground::strain(c, s0, el.sp0[end], st.smax[i].max(se), se);
        }
    }
    total
}

/// The demo's centreline and toe columns in consolidation `mode` driven
/// by both steps through two lifts (daily steps), rests with a small
/// make-up load at every 2-day step (as the planner does), an unloading and
/// a rest under constant load: the largest differences in u (kPa) and
/// settlement (m) over all steps and both columns, and whether the two ever
/// disagreed on convergence.
fn compare_on_demo(mode: ConsolidationMode) -> (f64, f64, bool) {
    let mut p = crate::input::parse(include_str!("../../examples/kestrel-fen.toml"), "kestrel-fen.toml")
        .expect("demo validates");
    assert_eq!(p.analysis.mode, ConsolidationMode::StressDependent);
    p.analysis.mode = mode;
    // Settlement of the plain step: its own sum in stress-dependent mode,
    // the column's (mv × Δσ') in linear mode.
    let plain_settlement = |col: &Column, st: &ColumnState| match mode {
        ConsolidationMode::StressDependent => settlement(col, st),
        ConsolidationMode::Linear => col.settlement(st),
    };
    let engine = crate::response::Engine::new(&p);
    let (mut du, mut ds, mut disagree) = (0.0f64, 0.0f64, false);
    // (steps, dt days, load change per step kPa)
    let schedule = [(25, 1.0, 2.4), (75, 2.0, 0.05), (20, 1.0, 2.4), (200, 2.0, 0.03), (5, 1.0, -4.0), (150, 2.0, 0.0)];
    for col in [&engine.columns[0], &engine.columns[3]] {
        let (mut fast, mut plain) = (col.initial_state(), col.initial_state());
        let mut q = 0.0;
        for &(n, dt, dq) in &schedule {
            for _ in 0..n {
                q += dq;
                let load: Vec<Stress> = col
                    .nodes
                    .iter()
                    .map(|nd| Stress { sz: q / (1.0 + 0.05 * nd.z_m), sx: 0.4 * q, txz: 0.05 * q })
                    .collect();
                let a = col.step(&mut fast, &load, p.analysis.pore_pressure, dt);
                let b = step(col, &mut plain, &load, p.analysis.pore_pressure, dt);
                disagree |= a != b;
                du = fast.u.iter().zip(&plain.u).map(|(x, y)| (x - y).abs()).fold(du, f64::max);
                ds = ds.max((col.settlement(&fast) - plain_settlement(col, &plain)).abs());
            }
        }
        assert!(settlement(col, &plain) > 0.05, "the comparison must load the clay well into virgin compression");
    }
    (du, ds, disagree)
}

#[test]
fn fast_step_matches_plain_step_on_the_demo() {
    // The two differ only by rounding (the logarithms in their last bits;
    // the order of the arithmetic is otherwise the same), which the storage
    // iteration carries into its last iterate, converged to 1e-3 kPa. Bound
    // asserted: a tenth of that tolerance in u, and 1 µm in settlement (a
    // thousandth of the 1 mm to which settlements are reported).
    let (du, ds, disagree) = compare_on_demo(ConsolidationMode::StressDependent);
    assert!(!disagree, "convergence flags differ");
    assert!(du < 1e-4, "u differs by {du} kPa");
    assert!(ds < 1e-6, "settlement differs by {ds} m");
}

#[test]
fn fast_step_matches_plain_step_in_linear_mode() {
    // Linear mode: the fast step reuses the last factorisation of the
    // tridiagonal matrix while the step length and θ stay the same (in the
    // rests: 2-day steps, θ = 1 while the make-up load changes, then 0.5);
    // the plain step factorises afresh every step. Same arithmetic on the
    // same numbers otherwise, so the same bits: a factorisation reused
    // for a matrix that had changed (the step length or θ) would show here.
    let (du, ds, disagree) = compare_on_demo(ConsolidationMode::Linear);
    assert!(!disagree, "convergence flags differ");
    assert_eq!(du, 0.0, "u differs by {du} kPa");
    assert_eq!(ds, 0.0, "settlement differs by {ds} m");
}
