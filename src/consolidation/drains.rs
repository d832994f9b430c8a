//! The vertical drains' part of the consolidation column: Hansbo's (1981)
//! drain factor μ with smear and well resistance, Barron's (1948)
//! ideal-drain factor F(n), and the radial sink 8/(de² μ(z)) at each node
//! of a column within the drain penetration (parent module doc).

use super::Element;
use crate::ground::Node;
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

/// 8/(de² μ(z)) per node within the drain penetration, 0 elsewhere.
pub(super) fn radial_factors(project: &Project, nodes: &[Node], elements: &[Element]) -> Vec<f64> {
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
