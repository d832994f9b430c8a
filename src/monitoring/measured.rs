//! The effective-stress state consistent with the piezometers. At each
//! piezometer the measured excess is compared with the calibrated model's
//! through a dissipation index g: g < 0 where the piezometer reads more
//! excess than the model, g = (1 − R)/(1 − Rm) − 1 with R = Δu/Δσv measured
//! and Rm the model's (−1 means no dissipation at all); g > 0 where it reads
//! less, g = 1 − R/Rm (1 means hydrostatic). g is interpolated linearly by
//! depth between the tips of one offset and linearly in offset between
//! offsets; beyond the shallowest or deepest tip, and beyond the outermost
//! offsets, the nearest value is used only where it shows more excess than
//! the model (min(g, 0)): never extrapolated optimistically. At each node,
//! g < 0 gives u = Δσv − (1 + g)(Δσv − um) and g > 0 gives u = (1 − g) um;
//! the largest σ'v reached (and so σ'p and su) follows: lowered by the extra
//! excess (not below the initial σ'v0) or raised to the new σ'v.

use crate::response::{Engine, State};

/// One piezometer's comparison with the model at the hold point.
#[derive(Debug, Clone, serde::Serialize)]
pub struct Tip {
    pub id: String,
    pub offset_m: f64,
    pub depth_m: f64,
    /// Δu/Δσv measured and from the calibrated model.
    pub ratio_measured: f64,
    pub ratio_model: f64,
    /// The dissipation index g (−1 none, 0 as the model, 1 hydrostatic).
    pub index: f64,
}

/// The tip's index from the measured and model excess and Δσv (kPa).
pub fn tip(id: &str, x_m: f64, z_m: f64, measured: f64, model: f64, dsv: f64) -> Tip {
    let r = (measured / dsv).clamp(0.0, 1.0);
    let rm = (model / dsv).clamp(0.0, 0.999);
    let index = if r >= rm { (1.0 - r) / (1.0 - rm) - 1.0 } else { 1.0 - r / rm };
    Tip { id: id.into(), offset_m: x_m.abs(), depth_m: z_m, ratio_measured: r, ratio_model: rm, index }
}

/// Index at depth z from the tips of one offset (sorted by depth).
fn along(tips: &[&Tip], z: f64) -> f64 {
    let (first, last) = (tips[0], tips[tips.len() - 1]);
    if z <= first.depth_m {
        return first.index.min(0.0);
    }
    if z >= last.depth_m {
        return last.index.min(0.0);
    }
    let k = tips.windows(2).position(|w| z <= w[1].depth_m).unwrap_or(0);
    let (a, b) = (tips[k], tips[k + 1]);
    let w = (z - a.depth_m) / (b.depth_m - a.depth_m).max(1e-9);
    a.index + w * (b.index - a.index)
}

/// Index at offset x and depth z from all tips.
pub fn index_at(tips: &[Tip], x: f64, z: f64) -> f64 {
    let mut groups: Vec<(f64, Vec<&Tip>)> = Vec::new();
    for t in tips {
        match groups.iter_mut().find(|g| (g.0 - t.offset_m).abs() < 0.5) {
            Some(g) => g.1.push(t),
            None => groups.push((t.offset_m, vec![t])),
        }
    }
    if groups.is_empty() {
        return 0.0;
    }
    groups.sort_by(|a, b| a.0.total_cmp(&b.0));
    for g in &mut groups {
        g.1.sort_by(|a, b| a.depth_m.total_cmp(&b.depth_m));
    }
    let x = x.abs();
    let at = |g: &(f64, Vec<&Tip>)| along(&g.1, z);
    let (first, last) = (&groups[0], &groups[groups.len() - 1]);
    if x <= first.0 {
        return if x >= first.0 - 0.5 { at(first) } else { at(first).min(0.0) };
    }
    if x >= last.0 {
        return if x <= last.0 + 0.5 { at(last) } else { at(last).min(0.0) };
    }
    let k = groups.windows(2).position(|w| x <= w[1].0).unwrap_or(0);
    let (a, b) = (&groups[k], &groups[k + 1]);
    let w = (x - a.0) / (b.0 - a.0);
    at(a) + w * (at(b) - at(a))
}

/// The state with every node's excess set from the tips' indices.
pub fn measured_state(engine: &Engine, st: &State, tips: &[Tip]) -> State {
    let mut out = st.clone();
    for ((col, cs), init) in engine.columns.iter().zip(&mut out.cols).zip(engine.initial_state().cols) {
        for i in 0..col.nodes.len() {
            let g = index_at(tips, col.x_m, col.nodes[i].z_m);
            let (um, dsv) = (cs.u[i], cs.load[i].sz.max(0.0));
            let u = if g < 0.0 { dsv - (1.0 + g) * (dsv - um).max(0.0) } else { (1.0 - g) * um };
            let extra = u - um;
            cs.u[i] = u;
            cs.smax[i] =
                if extra > 0.0 { (cs.smax[i] - extra).max(init.smax[i]) } else { cs.smax[i].max(col.sigma_eff(cs, i)) };
        }
    }
    out
}
