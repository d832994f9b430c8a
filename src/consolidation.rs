//! One-dimensional consolidation of a vertical column of ground, with
//! prefabricated vertical drains as a radial sink:
//!
//!   mv ∂u/∂t = ∂/∂z( (k/γw) ∂u/∂z ) − mv λ(z) u + mv ∂u_gen/∂t
//!
//! solved by finite differences on a control-volume grid (Terzaghi 1925 for
//! the vertical part). Every layer interface is a node and every element lies
//! in one layer, so interface conductances are the exact series (harmonic)
//! values. λ = 8 ch/(de² μ) within the drain depth, 0 below: Hansbo's (1981)
//! equal-strain radial solution written as a sink, which with no vertical
//! flow returns U_h = 1 − exp(−8 T_h/μ) exactly and with vertical flow
//! approximates Carrillo's (1942) product rule. Time stepping is the θ-scheme:
//! fully implicit on steps with a load change and the two after it
//! (Rannacher start-up), Crank–Nicolson otherwise; a tridiagonal (Thomas)
//! solve per step.

use crate::ground::{self, ClayProps, Node};
use crate::model::*;

/// Hansbo's (1981) drain factor μ at depth z below the drain's discharge end:
/// μ = ln(n/s) + (kh/ks) ln s − 0.75 + π z (2l − z) kh/qw,
/// with n = de/dw, s = ds/dw, l the drain length draining to one end.
pub fn hansbo_mu(n: f64, s: f64, kh_over_ks: f64, well: Option<(f64, f64, f64)>) -> f64 {
    let base = (n / s).ln() + kh_over_ks * s.ln() - 0.75;
    match well {
        // (z m, l m, kh/qw 1/m²)
        Some((z, l, kh_over_qw)) => base + std::f64::consts::PI * z * (2.0 * l - z) * kh_over_qw,
        None => base,
    }
}

/// Barron's (1948) ideal-drain factor F(n) = n²/(n²−1) ln n − (3n²−1)/(4n²).
pub fn barron_f(n: f64) -> f64 {
    let n2 = n * n;
    n2 / (n2 - 1.0) * n.ln() - (3.0 * n2 - 1.0) / (4.0 * n2)
}

/// One element of a column: between nodes i and i+1, within one layer.
#[derive(Debug, Clone)]
pub struct Element {
    /// Length, m.
    pub h_m: f64,
    /// Clay properties; None for free-draining sand.
    pub clay: Option<ClayProps>,
    /// σ'p0 at the two ends for this element's layer, kPa.
    pub sp0: [f64; 2],
    /// log10 of σ'v0 and of σ'p0 at the two ends.
    log_s0: [f64; 2],
    log_sp0: [f64; 2],
    /// Constant mv for linear mode, 1/kPa (layer reference value).
    pub mv_lin: f64,
}

/// Convergence tolerance of the storage iteration, kPa.
const PICARD_TOL_KPA: f64 = 1e-3;
/// Iteration limit of the storage iteration (the last iterate is kept and
/// the step counted as unconverged).
const PICARD_MAX: usize = 60;
/// Plain passes before the relaxation factor may be reduced.
const PICARD_UNDAMPED: usize = 2;

/// A vertical column of the ground at offset x from the centreline.
#[derive(Debug, Clone)]
pub struct Column {
    pub x_m: f64,
    pub nodes: Vec<Node>,
    pub elements: Vec<Element>,
    /// Nodes held at u = 0 (surface, sand, drained base).
    pub fixed: Vec<bool>,
    /// 8/(de² μ(z)) at each node within the drain depth, 0 elsewhere, 1/m².
    pub radial: Vec<f64>,
    pub mode: ConsolidationMode,
}

/// Evolving state of one column.
#[derive(Debug, Clone)]
pub struct ColumnState {
    /// Excess pore pressure at nodes, kPa.
    pub u: Vec<f64>,
    /// Current total stress increments at nodes.
    pub load: Vec<crate::load::Stress>,
    /// Largest σ'v reached at each node, kPa.
    pub smax: Vec<f64>,
    /// Steps remaining that must be fully implicit.
    implicit_left: u8,
}

/// A trial solution of a step and the strains at the step's start, for the
/// secant storage.
#[derive(Clone, Copy)]
struct Trial<'a> {
    u: &'a [f64],
    /// Strain at each element's (top, bottom) end at the start of the step.
    eps_old: &'a [[f64; 2]],
    /// log10 σ'max at each node at the start of the step.
    log_smax: &'a [f64],
    /// log10 σ' of the trial at each node (at least 1e-3 kPa).
    log_s: &'a [f64],
}

impl Column {
    /// Build a column at offset `x_m` on the project's grid.
    pub fn new(project: &Project, x_m: f64) -> Column {
        let nodes = ground::grid(project);
        let g = &project.ground;
        let mut elements = Vec::with_capacity(nodes.len() - 1);
        for w in nodes.windows(2) {
            let mid = 0.5 * (w[0].z_m + w[1].z_m);
            let li = ground::layer_index(g, mid);
            let probe = |z: f64| ground::node_at_layer(project, z, li);
            let (a, b, m) = (probe(w[0].z_m), probe(w[1].z_m), probe(mid));
            let mv_lin = m.clay.map_or(0.0, |c| ground::mv_virgin(&c, reference_stress(project, li)));
            elements.push(Element {
                h_m: w[1].z_m - w[0].z_m,
                clay: m.clay,
                sp0: [a.sigma_p0_kpa, b.sigma_p0_kpa],
                log_s0: [a.sigma_v0_eff_kpa.log10(), b.sigma_v0_eff_kpa.log10()],
                log_sp0: [a.sigma_p0_kpa.log10(), b.sigma_p0_kpa.log10()],
                mv_lin,
            });
        }
        let fixed = fixed_nodes(&elements, project.ground.base_drained);
        let radial = radial_factors(project, &nodes, &elements);
        Column { x_m, nodes, elements, fixed, radial, mode: project.analysis.mode }
    }

    /// State before any load.
    pub fn initial_state(&self) -> ColumnState {
        ColumnState {
            u: vec![0.0; self.nodes.len()],
            load: vec![Default::default(); self.nodes.len()],
            smax: self.nodes.iter().map(|n| n.sigma_v0_eff_kpa).collect(),
            implicit_left: 0,
        }
    }

    /// Current σ'v at node i, kPa.
    pub fn sigma_eff(&self, st: &ColumnState, i: usize) -> f64 {
        self.nodes[i].sigma_v0_eff_kpa + st.load[i].sz - st.u[i]
    }

    /// Dissipate every excess pore pressure at once (the long-term state
    /// under the present load).
    pub fn consolidate_fully(&self, st: &mut ColumnState) {
        st.u.iter_mut().for_each(|u| *u = 0.0);
        for i in 0..self.nodes.len() {
            st.smax[i] = st.smax[i].max(self.sigma_eff(st, i));
        }
    }

    /// Current preconsolidation pressure at node i (its own layer), kPa.
    pub fn sigma_p(&self, st: &ColumnState, i: usize) -> f64 {
        self.nodes[i].sigma_p0_kpa.max(st.smax[i])
    }

    /// Undrained strength at node i now, kPa.
    pub fn su(&self, st: &ColumnState, i: usize) -> f64 {
        ground::su_now(&self.nodes[i], self.sigma_eff(st, i).max(0.1), self.sigma_p(st, i))
    }

    /// Element permeability term K = k/γw, m²/(kPa·day), at the current state.
    fn conductivity(&self, st: &ColumnState, e: usize) -> f64 {
        let el = &self.elements[e];
        let Some(c) = el.clay else { return 0.0 };
        match self.mode {
            ConsolidationMode::Linear => c.cv_m2_per_day * el.mv_lin,
            ConsolidationMode::StressDependent => {
                // k follows the void ratio, which barely changes in the
                // over-consolidated range: evaluate it on the virgin line at
                // max(σ', σ'p), so cv is the given value in the normally
                // consolidated range.
                let s = 0.5 * (self.sigma_eff(st, e) + self.sigma_eff(st, e + 1));
                let sp = 0.5 * (el.sp0[0].max(st.smax[e]) + el.sp0[1].max(st.smax[e + 1]));
                c.cv_m2_per_day * ground::mv_virgin(&c, s.max(sp))
            }
        }
    }

    /// Storage mv·h/2 of element e at its end `end` (0 top, 1 bottom). With
    /// `u_new` (a trial solution of the step) in stress-dependent mode, mv is
    /// the secant (ε(σ'new) − ε(σ'old)) / (σ'new − σ'old) of the e–log σ'
    /// law, so that the step conserves volume exactly (the modified Picard
    /// scheme of Celia, Bouloutas & Zarba 1990); without it, the tangent at
    /// the start of the step.
    fn storage(&self, st: &ColumnState, e: usize, end: usize, u_new: Option<Trial>) -> f64 {
        let el = &self.elements[e];
        let Some(c) = el.clay else { return 0.0 };
        let i = e + end;
        let mv = match (self.mode, u_new) {
            (ConsolidationMode::Linear, _) => el.mv_lin,
            (ConsolidationMode::StressDependent, None) => {
                ground::mv_tangent(&c, self.sigma_eff(st, i), el.sp0[end].max(st.smax[i]))
            }
            (ConsolidationMode::StressDependent, Some(t)) => {
                let s_old = self.sigma_eff(st, i);
                let s_new = s_old + st.u[i] - t.u[i];
                let sp = el.sp0[end].max(st.smax[i]);
                if (s_new - s_old).abs() < 1e-6 {
                    ground::mv_tangent(&c, s_old, sp)
                } else {
                    let l_s = t.log_s[i];
                    let l_smax = if s_new > st.smax[i] { l_s } else { t.log_smax[i] };
                    let eps_new = ground::strain_log10(&c, el.log_s0[end], el.log_sp0[end], l_smax, l_s);
                    (eps_new - t.eps_old[e][end]) / (s_new - s_old)
                }
            }
        };
        0.5 * el.h_m * mv
    }

    /// Strain at end `end` of element e for σ' = `s` (log10 `l_s`) after a
    /// largest stress with log10 `l_smax` ≥ `l_s` (the e–log σ' law with
    /// that element's σ'p0).
    fn strain_at(&self, e: usize, end: usize, l_smax: f64, l_s: f64) -> f64 {
        let el = &self.elements[e];
        let Some(c) = el.clay else { return 0.0 };
        ground::strain_log10(&c, el.log_s0[end], el.log_sp0[end], l_smax, l_s)
    }

    /// Apply new total stress increments (generating excess pore pressure by
    /// `rule`) and advance the state by `dt_days`.
    /// Returns false when the storage iteration stopped at its limit
    /// without converging (the last iterate is kept).
    pub fn step(
        &self,
        st: &mut ColumnState,
        new_load: &[crate::load::Stress],
        rule: PorePressureRule,
        dt_days: f64,
    ) -> bool {
        let mut changed = false;
        for (i, new) in new_load.iter().enumerate() {
            let old = st.load[i];
            if new == &old {
                continue;
            }
            changed = true;
            if !self.fixed[i] {
                st.u[i] += generated(rule, &old, new);
            }
            st.load[i] = *new;
        }
        if changed {
            st.implicit_left = 3;
        }
        let theta = if st.implicit_left > 0 { 1.0 } else { 0.5 };
        st.implicit_left = st.implicit_left.saturating_sub(1);
        let converged = self.diffuse(st, dt_days, theta);
        for i in 0..self.nodes.len() {
            let s = self.sigma_eff(st, i);
            if s > st.smax[i] {
                st.smax[i] = s;
            }
        }
        converged
    }

    /// One θ-scheme step of the diffusion–sink equation. Conductivities are
    /// taken at the start of the step; in stress-dependent mode the storage
    /// is iterated (modified Picard, secant mv) until the step's solution
    /// changes by less than `PICARD_TOL_KPA`, at most `PICARD_MAX` times,
    /// so that the result depends smoothly on the inputs even where σ'
    /// crosses σ'p within a step.
    /// Returns whether the iteration converged.
    fn diffuse(&self, st: &mut ColumnState, dt: f64, theta: f64) -> bool {
        let ne = self.elements.len();
        let k: Vec<f64> = (0..ne).map(|e| self.conductivity(st, e)).collect();
        let mut u = self.solve_step(st, &k, dt, theta, None);
        let mut converged = self.mode != ConsolidationMode::StressDependent;
        if !converged {
            // Strains at the start of the step and log10 σ'max, the same in
            // every pass.
            let log_smax: Vec<f64> = st.smax.iter().map(|s| s.log10()).collect();
            let mut log_new = vec![0.0; ne + 1];
            let log_s: Vec<f64> = (0..=ne).map(|i| self.sigma_eff(st, i).max(1e-3).log10()).collect();
            let eps_old: Vec<[f64; 2]> = (0..ne)
                .map(|e| {
                    [0, 1].map(|end| self.strain_at(e, end, log_smax[e + end].max(log_s[e + end]), log_s[e + end]))
                })
                .collect();
            let (mut omega, mut prev): (f64, f64) = (1.0, f64::INFINITY);
            for it in 0..PICARD_MAX {
                // log10 σ' of the trial at each node, shared by both
                // elements that meet there.
                for (i, l) in log_new.iter_mut().enumerate() {
                    let s_old = self.sigma_eff(st, i);
                    *l = (s_old + st.u[i] - u[i]).max(1e-3).log10();
                }
                let trial = Trial { u: &u, eps_old: &eps_old, log_smax: &log_smax, log_s: &log_new };
                let next = self.solve_step(st, &k, dt, theta, Some(trial));
                let residual = next.iter().zip(&u).map(|(a, b)| (a - b).abs()).fold(0.0, f64::max);
                if residual < PICARD_TOL_KPA {
                    u = next;
                    converged = true;
                    break;
                }
                // Where σ' crosses σ'p the secant mv changes steeply with
                // the trial solution and plain iteration oscillates: the
                // relaxation factor is halved whenever the residual falls
                // by less than 10% in a pass (down to 1/256).
                if it >= PICARD_UNDAMPED && residual > 0.9 * prev {
                    omega = (0.5 * omega).max(1.0 / 256.0);
                }
                prev = residual;
                for (o, n) in u.iter_mut().zip(&next) {
                    *o += omega * (n - *o);
                }
            }
        }
        st.u.copy_from_slice(&u);
        converged
    }

    /// Assemble and solve one θ-step from `st` with conductances K = k/γw per
    /// element and the storage of `storage(…, trial)`; returns the new u.
    fn solve_step(&self, st: &ColumnState, k: &[f64], dt: f64, theta: f64, trial: Option<Trial>) -> Vec<f64> {
        let n = self.nodes.len();
        let ne = self.elements.len();
        let (mut a, mut b, mut c, mut d) = (vec![0.0; n], vec![0.0; n], vec![0.0; n], vec![0.0; n]);
        for i in 0..n {
            if self.fixed[i] {
                b[i] = 1.0;
                continue;
            }
            let up = if i > 0 { k[i - 1] / self.elements[i - 1].h_m } else { 0.0 };
            let down = if i < ne { k[i] / self.elements[i].h_m } else { 0.0 };
            let mut s = 0.0;
            let mut r = 0.0;
            if i > 0 {
                s += self.storage(st, i - 1, 1, trial);
                r += self.sink(i - 1, i, k[i - 1]);
            }
            if i < ne {
                s += self.storage(st, i, 0, trial);
                r += self.sink(i, i, k[i]);
            }
            let u = &st.u;
            let uu = if i > 0 { u[i - 1] } else { 0.0 };
            let ud = if i + 1 < n { u[i + 1] } else { 0.0 };
            let flux = down * (ud - u[i]) - up * (u[i] - uu) - r * u[i];
            a[i] = -theta * up;
            c[i] = -theta * down;
            b[i] = s / dt + theta * (up + down + r);
            d[i] = s / dt * u[i] + (1.0 - theta) * flux;
        }
        thomas(&a, &mut b, &c, &mut d);
        d
    }

    /// Radial sink conductance of element e's half-cell at node i, given the
    /// element's K = k/γw.
    fn sink(&self, e: usize, i: usize, k: f64) -> f64 {
        if self.radial[i] == 0.0 {
            return 0.0;
        }
        let el = &self.elements[e];
        let Some(c) = el.clay else { return 0.0 };
        // ch_eff = (ch/cv)·K/mv, so the sink per unit area is (h/2)·λ·mv =
        // (h/2)·8/(de²μ)·(ch/cv)·K, independent of mv.
        0.5 * el.h_m * self.radial[i] * (c.ch_m2_per_day / c.cv_m2_per_day) * k
    }

    /// Settlement of the column, m (positive down).
    pub fn settlement(&self, st: &ColumnState) -> f64 {
        let mut s = 0.0;
        for (e, el) in self.elements.iter().enumerate() {
            let Some(c) = el.clay else { continue };
            for end in 0..2 {
                let i = e + end;
                let se = self.sigma_eff(st, i);
                let eps = match self.mode {
                    ConsolidationMode::Linear => el.mv_lin * (se - self.nodes[i].sigma_v0_eff_kpa),
                    ConsolidationMode::StressDependent => {
                        let s0 = self.nodes[i].sigma_v0_eff_kpa;
                        ground::strain(&c, s0, el.sp0[end], st.smax[i].max(se), se)
                    }
                };
                s += 0.5 * el.h_m * eps;
            }
        }
        s
    }

    /// Settlement when all excess pore pressure has dissipated under the
    /// current load, m.
    pub fn final_settlement(&self, st: &ColumnState) -> f64 {
        let mut drained = st.clone();
        for i in 0..drained.u.len() {
            drained.u[i] = 0.0;
            let s = self.sigma_eff(&drained, i);
            drained.smax[i] = drained.smax[i].max(s);
        }
        self.settlement(&drained)
    }

    /// Average degree of consolidation by excess pore pressure over the clay,
    /// U = 1 − ∫u dz / ∫u_total dz, where u_total is the excess that the
    /// current load would have generated undrained (Δσz).
    pub fn degree(&self, st: &ColumnState) -> f64 {
        let (mut num, mut den) = (0.0, 0.0);
        for (e, el) in self.elements.iter().enumerate() {
            if el.clay.is_none() {
                continue;
            }
            num += 0.5 * el.h_m * (st.u[e] + st.u[e + 1]);
            den += 0.5 * el.h_m * (st.load[e].sz + st.load[e + 1].sz);
        }
        if den <= 1e-9 { 1.0 } else { (1.0 - num / den).clamp(0.0, 1.0) }
    }
}

/// Reference σ' of a layer for linear mode and permeability: max(σ'v0, σ'p0)
/// at mid-layer, kPa.
fn reference_stress(project: &Project, li: usize) -> f64 {
    let g = &project.ground;
    let mid = ground::layer_top(g, li) + 0.5 * g.layers[li].thickness_m;
    let n = ground::node_at_layer(project, mid, li);
    n.sigma_v0_eff_kpa.max(n.sigma_p0_kpa)
}

/// Excess pore pressure generated by a change of total stress.
fn generated(rule: PorePressureRule, old: &crate::load::Stress, new: &crate::load::Stress) -> f64 {
    match rule {
        PorePressureRule::Vertical => new.sz - old.sz,
        PorePressureRule::Skempton { a, b } => {
            // Skempton (1954): Δu = B [Δσ3 + A (Δσ1 − Δσ3)].
            let (n1, n3) = new.principal();
            let (o1, o3) = old.principal();
            let (d1, d3) = (n1 - o1, n3 - o3);
            b * (d3 + a * (d1 - d3))
        }
    }
}

/// Nodes held at u = 0: the ground surface, every node touching a sand
/// element, and the base node when the base drains.
fn fixed_nodes(elements: &[Element], base_drained: bool) -> Vec<bool> {
    let n = elements.len() + 1;
    let mut fixed = vec![false; n];
    fixed[0] = true;
    for (e, el) in elements.iter().enumerate() {
        if el.clay.is_none() {
            fixed[e] = true;
            fixed[e + 1] = true;
        }
    }
    if base_drained {
        fixed[n - 1] = true;
    }
    fixed
}

/// 8/(de² μ(z)) per node within the drain penetration, 0 elsewhere.
fn radial_factors(project: &Project, nodes: &[Node], elements: &[Element]) -> Vec<f64> {
    let Some(d) = &project.drains else {
        return vec![0.0; nodes.len()];
    };
    let de = d.influence_diameter_m();
    let n = de / d.diameter_m;
    let profile = project.profile_depth_m();
    // Drains discharge at the top; if they reach a drained base, both ends.
    let both_ends = d.depth_m >= profile - 1e-6 && project.ground.base_drained;
    let l = if both_ends { 0.5 * d.depth_m } else { d.depth_m };
    nodes
        .iter()
        .enumerate()
        .map(|(i, node)| {
            if node.z_m > d.depth_m + 1e-9 {
                return 0.0;
            }
            let well = d.discharge_m3_per_day.map(|qw| {
                let el = &elements[i.min(elements.len() - 1)];
                let kh = el.clay.map_or(0.0, |c| c.ch_m2_per_day * el.mv_lin * GAMMA_W);
                let z = if both_ends { node.z_m.min(d.depth_m - node.z_m) } else { node.z_m };
                (z, l, kh / qw)
            });
            8.0 / (de * de * hansbo_mu(n, d.smear_ratio, d.kh_over_ks, well))
        })
        .collect()
}

/// Thomas algorithm for a tridiagonal system; the solution replaces `d`.
fn thomas(a: &[f64], b: &mut [f64], c: &[f64], d: &mut [f64]) {
    let n = d.len();
    for i in 1..n {
        let w = a[i] / b[i - 1];
        b[i] -= w * c[i - 1];
        d[i] -= w * d[i - 1];
    }
    d[n - 1] /= b[n - 1];
    for i in (0..n - 1).rev() {
        d[i] = (d[i] - c[i] * d[i + 1]) / b[i];
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hansbo_mu_worked_case() {
        // Hansbo (1981): 100 × 4 mm band drain (dw = 52 mm, Rixner et al. 1986),
        // triangular spacing 1.5 m (de = 1.575 m), no smear: μ = 2.6608;
        // smear ratio 2 with kh/ks = 2: μ = 3.3539.
        let n = 1.05 * 1.5 / 0.052;
        assert!((hansbo_mu(n, 1.0, 1.0, None) - 2.6608).abs() < 5e-4);
        assert!((hansbo_mu(n, 2.0, 2.0, None) - 3.3539).abs() < 5e-4);
        // U_h = 1 − exp(−8 T_h/μ), ch = 2 m²/year, t = 0.5 year:
        let th = 2.0 * 0.5 / (1.575f64 * 1.575);
        let uh = |mu: f64| 1.0 - (-8.0 * th / mu).exp();
        assert!((uh(2.6608) - 0.702).abs() < 0.001);
        assert!((uh(3.3539) - 0.618).abs() < 0.001);
    }

    #[test]
    fn barron_ideal_drain_factor() {
        // Barron (1948) F(n): n = 10 → 1.5783, n = 50 → 3.1637.
        assert!((barron_f(10.0) - 1.5783).abs() < 1e-4);
        assert!((barron_f(50.0) - 3.1637).abs() < 1e-4);
        // Hansbo's simplified μ (no smear, no well resistance) tends to F(n)
        // for large n: within 0.1% at n = 50.
        assert!((hansbo_mu(50.0, 1.0, 1.0, None) - barron_f(50.0)).abs() / barron_f(50.0) < 1e-3);
    }

    #[test]
    fn skempton_pore_pressure_from_principal_increments() {
        // Skempton (1954): Δu = B [Δσ3 + A (Δσ1 − Δσ3)]. A vertical-only
        // increment of 100 kPa with A = 0.5, B = 1 gives 50 kPa; an isotropic
        // increment gives B × 100 whatever A is.
        let zero = Stress::default();
        let rule = PorePressureRule::Skempton { a: 0.5, b: 1.0 };
        assert!((generated(rule, &zero, &Stress { sz: 100.0, sx: 0.0, txz: 0.0 }) - 50.0).abs() < 1e-9);
        let iso = Stress { sz: 100.0, sx: 100.0, txz: 0.0 };
        assert!((generated(PorePressureRule::Skempton { a: 0.2, b: 0.9 }, &zero, &iso) - 90.0).abs() < 1e-9);
        // Pure shear has σ1 − σ3 = 2τ about a zero mean: Δu = B(−τ + A·2τ).
        let shear = Stress { sz: 0.0, sx: 0.0, txz: 10.0 };
        assert!((generated(rule, &zero, &shear) - 0.0).abs() < 1e-9);
        assert!((generated(PorePressureRule::Vertical, &zero, &shear)).abs() < 1e-12);
    }

    #[test]
    fn thomas_solves_small_system() {
        // [2 -1 0; -1 2 -1; 0 -1 2] x = [1 0 1] → x = [1 1 1]
        let a = [0.0, -1.0, -1.0];
        let mut b = [2.0, 2.0, 2.0];
        let c = [-1.0, -1.0, 0.0];
        let mut d = [1.0, 0.0, 1.0];
        thomas(&a, &mut b, &c, &mut d);
        for x in d {
            assert!((x - 1.0).abs() < 1e-12);
        }
    }

    use crate::fixtures;
    use crate::load::Stress;

    /// Terzaghi's exact series (Terzaghi 1925; e.g. Craig's Soil Mechanics):
    /// U(Tv) = 1 − Σ 2/M² exp(−M² Tv), M = π(2m+1)/2.
    fn terzaghi_u(tv: f64) -> f64 {
        1.0 - (0..200)
            .map(|m| {
                let mm = std::f64::consts::PI * (2 * m + 1) as f64 / 2.0;
                2.0 / (mm * mm) * (-mm * mm * tv).exp()
            })
            .sum::<f64>()
    }

    /// Isochrone u/u0 at depth ratio Z = z/Hdr (same source).
    fn terzaghi_isochrone(tv: f64, zr: f64) -> f64 {
        (0..200)
            .map(|m| {
                let mm = std::f64::consts::PI * (2 * m + 1) as f64 / 2.0;
                2.0 / mm * (mm * zr).sin() * (-mm * mm * tv).exp()
            })
            .sum()
    }

    /// Load a column instantly with a uniform Δσz = q and run to time
    /// factor `tv` (Hdr = H/2, double drainage) with step `dt`.
    fn run_terzaghi(col: &Column, q: f64, tv: f64, hdr: f64, cv_day: f64, dt: f64) -> ColumnState {
        let mut st = col.initial_state();
        let load = vec![Stress { sz: q, sx: 0.0, txz: 0.0 }; col.nodes.len()];
        let t_end = tv * hdr * hdr / cv_day;
        let steps = (t_end / dt).ceil() as usize;
        let dt = t_end / steps as f64;
        col.step(&mut st, &load, PorePressureRule::Vertical, dt);
        for _ in 1..steps {
            col.step(&mut st, &load, PorePressureRule::Vertical, dt);
        }
        st
    }

    #[test]
    fn terzaghi_average_degree_double_drainage() {
        // Exact series: U = 50.0% at Tv = 0.19673 and 90.0% at Tv = 0.84809.
        let p = fixtures::uniform_clay(10.0, 3.6525, "drained", "");
        let col = Column::new(&p, 0.0);
        for (tv, expect) in [(0.19673, 0.5), (0.84809, 0.9)] {
            assert!((terzaghi_u(tv) - expect).abs() < 1e-4);
            let st = run_terzaghi(&col, 50.0, tv, 5.0, 0.01, 1.0);
            let u = col.degree(&st);
            assert!((u - expect).abs() < 0.003, "Tv {tv}: U = {u}");
        }
    }

    #[test]
    fn terzaghi_isochrones_within_one_percent() {
        let p = fixtures::uniform_clay(10.0, 3.6525, "drained", "");
        let col = Column::new(&p, 0.0);
        for tv in [0.05, 0.2, 0.5] {
            let st = run_terzaghi(&col, 100.0, tv, 5.0, 0.01, 0.5);
            for (i, n) in col.nodes.iter().enumerate() {
                let exact = 100.0 * terzaghi_isochrone(tv, n.z_m / 5.0);
                let exact = if i == 0 || i == col.nodes.len() - 1 { 0.0 } else { exact };
                assert!((st.u[i] - exact).abs() < 1.0, "Tv {tv} z {}: {} vs {exact}", n.z_m, st.u[i]);
            }
        }
    }

    #[test]
    fn single_drainage_equals_double_drainage_of_twice_the_layer() {
        // Terzaghi: an undrained base is a plane of symmetry, so a 5 m layer
        // drained at the top only behaves as half of a 10 m layer drained at
        // both faces (same Tv with Hdr = 5 m).
        let one = fixtures::uniform_clay(5.0, 3.6525, "undrained", "");
        let col = Column::new(&one, 0.0);
        let st = run_terzaghi(&col, 50.0, 0.19673, 5.0, 0.01, 1.0);
        assert!((col.degree(&st) - 0.5).abs() < 0.003, "U = {}", col.degree(&st));
    }

    #[test]
    fn linear_settlement_is_degree_times_final() {
        // Linear mode: settlement(t) = U(t) × final settlement (Terzaghi).
        let p = fixtures::uniform_clay(10.0, 3.6525, "drained", "");
        let col = Column::new(&p, 0.0);
        let st = run_terzaghi(&col, 40.0, 0.3, 5.0, 0.01, 1.0);
        let ratio = col.settlement(&st) / col.final_settlement(&st);
        assert!((ratio - col.degree(&st)).abs() < 0.005 * col.degree(&st), "{ratio} vs {}", col.degree(&st));
    }

    #[test]
    fn radial_only_matches_hansbo() {
        // Hansbo (1981): with no vertical flow (undrained top and base — here
        // a very low cv with drains of ch = 2 m²/year), U_h = 1 − exp(−8 T_h/μ).
        // Case: 100 × 4 mm band, triangular 1.5 m, t = 0.5 year, no smear:
        // U_h = 0.702; smear ratio 2, kh/ks = 2: U_h = 0.618.
        for (smear, expect) in [(1.0, 0.702), (2.0, 0.618)] {
            let drains = format!(
                "[drains]\npattern = \"triangular\"\nspacing_m = 1.5\nband_width_mm = 100\nband_thickness_mm = 4\ndepth_m = 10\nsmear_ratio = {smear}\nkh_over_ks = {smear}\n"
            );
            let p = fixtures::uniform_clay(10.0, 1e-4, "undrained", &format!("\n{drains}"));
            let mut p = p;
            // ch = 2 m²/year while cv is negligible: pure radial flow.
            for l in &mut p.ground.layers {
                if let LayerKind::Clay(c) = &mut l.kind {
                    c.ch_m2_per_day = 2.0 / DAYS_PER_YEAR;
                }
            }
            let col = Column::new(&p, 0.0);
            let mut st = col.initial_state();
            let load = vec![Stress { sz: 50.0, sx: 0.0, txz: 0.0 }; col.nodes.len()];
            let days = 0.5 * DAYS_PER_YEAR;
            let n = 730;
            for _ in 0..n {
                col.step(&mut st, &load, PorePressureRule::Vertical, days / n as f64);
            }
            // away from the drained top the flow is purely radial
            let i = col.nodes.len() / 2;
            let uh = 1.0 - st.u[i] / 50.0;
            assert!((uh - expect).abs() < 0.003, "smear {smear}: U_h = {uh}");
        }
    }

    #[test]
    fn combined_flow_close_to_carrillo() {
        // Carrillo (1942): 1 − U = (1 − Uv)(1 − Uh); Zhu & Yin (2004) report
        // Carrillo within about 3% of exact combined solutions.
        let drains = "[drains]\npattern = \"square\"\nspacing_m = 2.0\ndiameter_mm = 50\ndepth_m = 10\n";
        let p = fixtures::uniform_clay(10.0, 3.6525, "drained", drains);
        let col = Column::new(&p, 0.0);
        let days = 200.0;
        let st = run_terzaghi(&col, 50.0, days * 0.01 / 25.0, 5.0, 0.01, 0.5);
        let uv = terzaghi_u(days * 0.01 / 25.0);
        let de: f64 = 1.128 * 2.0;
        let mu = hansbo_mu(de / 0.05, 1.0, 1.0, None);
        let uh = 1.0 - (-8.0 * 0.01 * days / (de * de) / mu).exp();
        let carrillo = 1.0 - (1.0 - uv) * (1.0 - uh);
        let u = col.degree(&st);
        assert!((u - carrillo).abs() < 0.03 * carrillo, "U = {u}, Carrillo {carrillo}");
    }

    #[test]
    fn halving_steps_changes_degree_little() {
        // Convergence: halving dz and dt moves U by less than 0.5%.
        let coarse = fixtures::uniform_clay(10.0, 3.6525, "drained", "max_node_spacing_m = 0.5");
        let fine = fixtures::uniform_clay(10.0, 3.6525, "drained", "max_node_spacing_m = 0.25");
        let a = Column::new(&coarse, 0.0);
        let b = Column::new(&fine, 0.0);
        let ua = a.degree(&run_terzaghi(&a, 50.0, 0.1, 5.0, 0.01, 2.0));
        let ub = b.degree(&run_terzaghi(&b, 50.0, 0.1, 5.0, 0.01, 1.0));
        assert!((ua - ub).abs() < 0.005 * ub, "{ua} vs {ub}");
    }
}
