//! The ground response engine: several consolidation columns across the
//! half-width (centreline, crest edge, mid-slope, toe and beyond), loaded by
//! the embankment's elastic stress increments as the fill rises, with the
//! settlement make-up fill and the buoyancy of fill that settles below the
//! water table both part of the load. It owns the evolving `State`, the
//! strength field the stability engine samples, and the elastic stress
//! tables per geometry (`load::stress` at every node for each 0.25 m of
//! fill, interpolated between), kept for the whole process so that every
//! engine of one geometry shares them.

use crate::consolidation::{Column, ColumnState};
use crate::ground::{self, Node};
use crate::load::{self, Stress};
use crate::model::*;
use serde::Serialize;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{Arc, Mutex, OnceLock};

/// Spacing of the fill-thickness levels at which stress fields are computed
/// and between which they are interpolated linearly, m.
const LEVEL_M: f64 = 0.25;
/// Number of cached levels (0 … 60 m).
const LEVELS: usize = 241;
/// Geometries whose stress tables the process keeps for engines built
/// later (the most recently used; an engine keeps its own tables alive).
const KEPT_GEOMETRIES: usize = 16;

/// Unit-weight stress fields of one geometry per thickness level:
/// [level] → [column][node], each built on first use by whichever engine
/// needs it first (the same numbers whichever does).
struct Tables {
    geometry: Geometry,
    levels: Vec<OnceLock<Vec<Vec<Stress>>>>,
}

/// What the elastic stress tables depend on, compared exactly: the
/// embankment (its fill weight, strength and reinforcement, which the
/// tables do not use, left out) and the bit patterns of the column offsets
/// and node depths.
#[derive(Debug, PartialEq)]
struct Geometry {
    embankment: Embankment,
    columns: Vec<(u64, Vec<u64>)>,
}

impl Geometry {
    fn of(project: &Project, columns: &[Column]) -> Geometry {
        let embankment = Embankment {
            fill_unit_weight_kn_m3: 0.0,
            fill_cohesion_kpa: 0.0,
            fill_friction_deg: 0.0,
            reinforcement_kn_per_m: 0.0,
            ..project.embankment.clone()
        };
        let columns =
            columns.iter().map(|c| (c.x_m.to_bits(), c.nodes.iter().map(|n| n.z_m.to_bits()).collect())).collect();
        Geometry { embankment, columns }
    }
}

/// The stress tables of every geometry met in this process (up to
/// `KEPT_GEOMETRIES`, most recent last), so that engines built one after
/// another (compare's alternatives, corridor sections, the hold-point fit,
/// Monte Carlo realisations) share them.
static KEPT: Mutex<Vec<Arc<Tables>>> = Mutex::new(Vec::new());

/// The kept tables of `geometry`, or new empty ones (then kept).
fn shared_tables(geometry: Geometry) -> Arc<Tables> {
    // A panic elsewhere while holding the lock leaves the list valid.
    let mut kept = KEPT.lock().unwrap_or_else(|e| e.into_inner());
    let tables = match kept.iter().position(|t| t.geometry == geometry) {
        Some(k) => kept.remove(k),
        None => Arc::new(Tables::new(geometry)),
    };
    kept.push(tables.clone());
    if kept.len() > KEPT_GEOMETRIES {
        kept.remove(0);
    }
    tables
}

impl Tables {
    fn new(geometry: Geometry) -> Tables {
        Tables { geometry, levels: (0..LEVELS).map(|_| OnceLock::new()).collect() }
    }
}

/// The response engine for one project.
pub struct Engine<'p> {
    pub project: &'p Project,
    pub columns: Vec<Column>,
    /// Unit-weight stress fields per thickness level, shared by every
    /// engine of the same geometry.
    table: Arc<Tables>,
    /// Time steps taken so far (all columns advance together).
    steps: AtomicUsize,
    /// Column steps whose storage iteration stopped at its limit.
    unconverged: AtomicUsize,
    /// Nodes on a boundary between two clay layers, with the node as the
    /// layer above sees it (the grid's node belongs to the layer below), so
    /// that the strength field carries both sides of the step.
    interfaces: Vec<(usize, Node)>,
}

/// The state of the ground and the fill at one moment.
#[derive(Debug, Clone)]
pub struct State {
    /// Days since the project start date (may be fractional).
    pub day: f64,
    /// Crest height above OGL that has been built (design profile), m.
    pub height_m: f64,
    /// Fill thickness as placed including settlement make-up, m.
    pub placed_m: f64,
    pub cols: Vec<ColumnState>,
    /// Settlement under the centreline, m (other columns: `Engine::settlement`).
    pub settlement_centre_m: f64,
}

/// Named offsets of the columns, for reports.
#[derive(Debug, Clone, Serialize)]
pub struct ColumnInfo {
    pub name: &'static str,
    pub x_m: f64,
}

impl<'p> Engine<'p> {
    /// Build the columns at the standard offsets of the final section. The
    /// stress tables are those of the last engines of the same geometry in
    /// this process, if any (see `KEPT`), else built as levels are needed.
    pub fn new(project: &'p Project) -> Engine<'p> {
        Engine::build(project, shared_tables)
    }

    /// `new` with stress tables of its own, built afresh as levels are
    /// needed (for measuring the cost of building them).
    pub fn with_own_tables(project: &'p Project) -> Engine<'p> {
        Engine::build(project, |g| Arc::new(Tables::new(g)))
    }

    fn build(project: &'p Project, tables: impl FnOnce(Geometry) -> Arc<Tables>) -> Engine<'p> {
        let columns: Vec<Column> = column_offsets(project).iter().map(|c| Column::new(project, c.x_m)).collect();
        let table = tables(Geometry::of(project, &columns));
        let interfaces = clay_interfaces(project, &columns);
        Engine { project, columns, table, steps: AtomicUsize::new(0), unconverged: AtomicUsize::new(0), interfaces }
    }

    /// `new`, sharing `other`'s stress tables when both have the same
    /// geometry (embankment, column offsets and node depths: the elastic
    /// stresses depend on nothing else), whether or not the process still
    /// keeps them.
    pub fn sharing(project: &'p Project, other: &Engine) -> Engine<'p> {
        Engine::build(project, |g| if g == other.table.geometry { other.table.clone() } else { shared_tables(g) })
    }

    /// Consolidation time steps taken so far by this engine.
    pub fn steps_taken(&self) -> usize {
        self.steps.load(Ordering::Relaxed)
    }

    /// Column steps so far whose storage iteration did not converge.
    pub fn unconverged_steps(&self) -> usize {
        self.unconverged.load(Ordering::Relaxed)
    }

    /// A warning when some storage iterations did not converge, else None.
    pub fn convergence_warning(&self) -> Option<String> {
        let n = self.unconverged_steps();
        (n > 0).then(|| {
            format!(
                "the consolidation storage iteration stopped at its limit without converging in {n} column step(s) of {}; results near σ'p may be less accurate: try smaller time steps",
                self.columns.len() * self.steps_taken()
            )
        })
    }

    /// Columns' names and offsets.
    pub fn column_info(&self) -> Vec<ColumnInfo> {
        column_offsets(self.project)
    }

    /// State before any fill.
    pub fn initial_state(&self) -> State {
        State {
            day: 0.0,
            height_m: 0.0,
            placed_m: 0.0,
            cols: self.columns.iter().map(|c| c.initial_state()).collect(),
            settlement_centre_m: 0.0,
        }
    }

    fn level(&self, j: usize) -> &Vec<Vec<Stress>> {
        self.table.levels[j].get_or_init(|| self.unit_stress(j as f64 * LEVEL_M))
    }

    /// Stress fields for unit fill weight and thickness t (all columns).
    fn unit_stress(&self, t: f64) -> Vec<Vec<Stress>> {
        let prof = load::profile(&self.project.embankment, t);
        self.columns.iter().map(|c| c.nodes.iter().map(|n| load::stress(&prof, 1.0, c.x_m, n.z_m)).collect()).collect()
    }

    /// Stress increments in column `c` under placed thickness t and fill
    /// weight `gamma` kN/m³.
    fn loads(&self, c: usize, t: f64, gamma: f64, out: &mut Vec<Stress>) {
        out.clear();
        let pos = t / LEVEL_M;
        let j = pos.floor() as usize;
        if j + 1 >= LEVELS {
            let prof = load::profile(&self.project.embankment, t);
            let col = &self.columns[c];
            out.extend(col.nodes.iter().map(|n| load::stress(&prof, gamma, col.x_m, n.z_m)));
            return;
        }
        let f = pos - j as f64;
        let (lo, hi) = (&self.level(j)[c], &self.level(j + 1)[c]);
        out.extend(lo.iter().zip(hi).map(|(a, b)| Stress {
            sz: gamma * (a.sz + f * (b.sz - a.sz)),
            sx: gamma * (a.sx + f * (b.sx - a.sx)),
            txz: gamma * (a.txz + f * (b.txz - a.txz)),
        }));
    }

    /// Advance by `dt_days` with the crest at `height_end_m` above OGL at the
    /// end of the step. Fill is made up for settlement so far (one step
    /// behind), and fill below the water table counts at submerged weight.
    pub fn advance(&self, st: &mut State, dt_days: f64, height_end_m: f64) {
        self.advance_columns(st, dt_days, height_end_m, self.columns.len());
        self.steps.fetch_add(1, Ordering::Relaxed);
    }

    /// Advance the centreline column alone by `dt_days` under a fixed
    /// placed thickness `placed_m` (fill weight with the centreline settled
    /// by `settlement_m`), for the settlement forecasts: the load does not
    /// change from step to step, so after the fully implicit start-up the
    /// steps are Crank–Nicolson. The other columns are left as they were;
    /// not counted in `steps_taken`.
    pub fn advance_centre(&self, st: &mut State, dt_days: f64, placed_m: f64, settlement_m: f64) {
        let mut buf = Vec::new();
        self.loads(0, placed_m, self.fill_weight(placed_m, settlement_m), &mut buf);
        if !self.columns[0].step(&mut st.cols[0], &buf, self.project.analysis.pore_pressure, dt_days) {
            self.unconverged.fetch_add(1, Ordering::Relaxed);
        }
        st.settlement_centre_m = self.columns[0].settlement(&st.cols[0]);
        st.day += dt_days;
        st.placed_m = placed_m;
    }

    fn advance_columns(&self, st: &mut State, dt_days: f64, height_end_m: f64, count: usize) {
        let s_c = st.settlement_centre_m;
        let placed = if height_end_m > 0.0 { height_end_m + s_c } else { 0.0 };
        let gamma = self.fill_weight(placed, s_c);
        let rule = self.project.analysis.pore_pressure;
        let mut buf = Vec::new();
        for (c, col) in self.columns.iter().enumerate().take(count) {
            self.loads(c, placed, gamma, &mut buf);
            if !col.step(&mut st.cols[c], &buf, rule, dt_days) {
                self.unconverged.fetch_add(1, Ordering::Relaxed);
            }
        }
        st.settlement_centre_m = self.columns[0].settlement(&st.cols[0]);
        st.day += dt_days;
        st.height_m = height_end_m;
        st.placed_m = placed;
    }

    /// Fill unit weight for placed thickness `placed_m` with the centreline
    /// settled by `settlement_m` (buoyancy below the water table), kN/m³.
    fn fill_weight(&self, placed_m: f64, settlement_m: f64) -> f64 {
        let e = &self.project.embankment;
        effective_fill_weight(e.fill_unit_weight_kn_m3, placed_m, settlement_m, self.project.ground.groundwater_depth_m)
    }

    /// The centreline column of `st` carrying placed fill `placed_m` (with
    /// the centreline settled by `settlement_m` for the buoyancy) with every
    /// excess pore pressure dissipated: its stress history kept, so earlier
    /// loading (a surcharge, say) counts.
    pub fn drained_centre(&self, st: &State, placed_m: f64, settlement_m: f64) -> ColumnState {
        let mut cs = st.cols[0].clone();
        let mut buf = Vec::new();
        self.loads(0, placed_m, self.fill_weight(placed_m, settlement_m), &mut buf);
        cs.load = buf;
        self.columns[0].consolidate_fully(&mut cs);
        cs
    }

    /// Fill areas per metre run (design, make-up in the settlement trough,
    /// surcharge) of the section in state `st`, m².
    pub fn fill_areas(&self, st: &State) -> load::FillAreas {
        // Each column's surface settlement once (the trough is sampled at
        // hundreds of offsets), then between columns as `settlement_at`.
        let s: Vec<f64> = self.columns.iter().zip(&st.cols).map(|(c, cs)| c.settlement(cs)).collect();
        load::fill_areas(&self.project.embankment, st.height_m, &|x| self.between_columns(x, |c| s[c]))
    }

    /// The state once the present load has fully consolidated (no excess
    /// pore pressure left; the fill is not made up for the extra settlement).
    pub fn consolidated(&self, st: &State) -> State {
        let mut s = st.clone();
        for (col, cs) in self.columns.iter().zip(&mut s.cols) {
            col.consolidate_fully(cs);
        }
        s.settlement_centre_m = self.columns[0].settlement(&s.cols[0]);
        s
    }

    /// Centreline settlement when the current load has fully consolidated, m.
    pub fn final_settlement_centre(&self, st: &State) -> f64 {
        self.columns[0].final_settlement(&st.cols[0])
    }

    /// Average degree of consolidation under the centreline (0–1).
    pub fn degree_centre(&self, st: &State) -> f64 {
        self.columns[0].degree(&st.cols[0])
    }

    /// Largest excess pore pressure anywhere, kPa.
    pub fn peak_excess(&self, st: &State) -> f64 {
        st.cols.iter().flat_map(|c| c.u.iter().copied()).fold(0.0, f64::max)
    }

    /// Value of a nodal quantity at depth z in column c (linear between nodes).
    pub fn at_depth(&self, c: usize, z_m: f64, f: impl Fn(usize) -> f64) -> f64 {
        let nodes = &self.columns[c].nodes;
        let (i, w) = bracket(nodes.len(), |k| nodes[k].z_m, z_m);
        f(i) * (1.0 - w) + f(i + 1) * w
    }

    /// Excess pore pressure at depth z in column c, kPa.
    pub fn excess_at(&self, st: &State, c: usize, z_m: f64) -> f64 {
        self.at_depth(c, z_m, |i| st.cols[c].u[i])
    }

    /// Undrained strength at depth z in column c, kPa.
    pub fn su_at(&self, st: &State, c: usize, z_m: f64) -> f64 {
        let col = &self.columns[c];
        self.at_depth(c, z_m, |i| col.su(&st.cols[c], i))
    }

    /// Excess pore pressure at offset x and depth z, kPa: linear in depth on
    /// each column and in offset between columns (symmetric about the
    /// centreline, constant beyond the outermost column).
    pub fn excess_at_point(&self, st: &State, x_m: f64, z_m: f64) -> f64 {
        self.between_columns(x_m, |c| self.excess_at(st, c, z_m))
    }

    /// Surface settlement at offset x, m (linear between columns).
    pub fn settlement_at(&self, st: &State, x_m: f64) -> f64 {
        self.settlement_below_at(st, x_m, f64::NEG_INFINITY)
    }

    /// Settlement of the point at offset x and original depth z (the
    /// compression of the ground below it), m (linear between columns).
    pub fn settlement_below_at(&self, st: &State, x_m: f64, z_m: f64) -> f64 {
        self.between_columns(x_m, |c| self.columns[c].settlement_below(&st.cols[c], z_m))
    }

    /// A quantity `f`(column) at offset x: linear between the columns either
    /// side (symmetric about the centreline, constant beyond the outermost).
    fn between_columns(&self, x_m: f64, f: impl Fn(usize) -> f64) -> f64 {
        let (j, w) = bracket(self.columns.len(), |k| self.columns[k].x_m, x_m.abs());
        f(j) * (1.0 - w) + f(j + 1) * w
    }

    /// Vertical total stress increment from the fill at offset x and depth
    /// z in the current state, kPa.
    pub fn fill_stress_at(&self, st: &State, x_m: f64, z_m: f64) -> f64 {
        let gamma = self.fill_weight(st.placed_m, st.settlement_centre_m);
        load::stress(&load::profile(&self.project.embankment, st.placed_m), gamma, x_m.abs(), z_m).sz
    }

    /// Strength and settlement of the current state, for the stability
    /// engine. A node on a boundary between two clay layers appears twice
    /// at the same depth: first with the strength of the layer above (its
    /// own SHANSEP or gain parameters, σ'p and measured su0 at the same
    /// σ'v), then with that of the layer below, so that sampling never
    /// smears the step across a node interval.
    pub fn field(&self, st: &State) -> GroundField {
        let nodes = &self.columns[0].nodes;
        let mut zs = Vec::with_capacity(nodes.len() + self.interfaces.len());
        let mut upper = self.interfaces.iter().peekable();
        let mut order = Vec::with_capacity(zs.capacity());
        for (i, n) in nodes.iter().enumerate() {
            if let Some((_, above)) = upper.next_if(|(k, _)| *k == i) {
                zs.push(n.z_m);
                order.push(Some(above));
            }
            zs.push(n.z_m);
            order.push(None);
        }
        let su_of = |col: &Column, s: &ColumnState| -> Vec<f64> {
            let mut i = 0;
            order
                .iter()
                .map(|above| match above {
                    Some(node) => ground::su_now(node, col.sigma_eff(s, i).max(0.1), node.sigma_p0_kpa.max(s.smax[i])),
                    None => {
                        i += 1;
                        col.su(s, i - 1)
                    }
                })
                .collect()
        };
        GroundField {
            xs: self.columns.iter().map(|c| c.x_m).collect(),
            zs,
            settlement_m: self.columns.iter().zip(&st.cols).map(|(c, s)| c.settlement(s)).collect(),
            su: self.columns.iter().zip(&st.cols).map(|(col, s)| su_of(col, s)).collect(),
        }
    }
}

/// Grid nodes on a boundary between two clay layers, each with its initial
/// state as the layer above sees it.
fn clay_interfaces(project: &Project, columns: &[Column]) -> Vec<(usize, Node)> {
    let g = &project.ground;
    let nodes = &columns[0].nodes;
    let is_clay = |li: usize| matches!(g.layers[li].kind, LayerKind::Clay(_));
    (1..nodes.len().saturating_sub(1))
        .filter_map(|i| {
            let above = ground::layer_index(g, 0.5 * (nodes[i - 1].z_m + nodes[i].z_m));
            let own = nodes[i].layer;
            (above != own && is_clay(above) && is_clay(own))
                .then(|| (i, ground::node_at_layer(project, nodes[i].z_m, above)))
        })
        .collect()
}

/// Fill unit weight averaged over the placed thickness, kN/m³, with the part
/// that has settled below the water table at submerged weight.
pub fn effective_fill_weight(gamma: f64, placed_m: f64, settlement_m: f64, water_depth_m: f64) -> f64 {
    if placed_m <= 0.0 {
        return gamma;
    }
    let submerged = (settlement_m - water_depth_m).clamp(0.0, placed_m);
    gamma - GAMMA_W * submerged / placed_m
}

/// Column offsets: centreline, crest edge, mid-slope, toe, and two beyond the
/// toe (half and one and a half times the compressible depth).
pub fn column_offsets(project: &Project) -> Vec<ColumnInfo> {
    let prof = load::profile(&project.embankment, project.max_height_m());
    let b = 0.5 * project.embankment.crest_width_m;
    let toe = prof.last().map_or(b, |p| p.0);
    let d = project.profile_depth_m();
    vec![
        ColumnInfo { name: "centreline", x_m: 0.0 },
        ColumnInfo { name: "crest edge", x_m: b },
        ColumnInfo { name: "mid-slope", x_m: 0.5 * (b + toe) },
        ColumnInfo { name: "toe", x_m: toe },
        ColumnInfo { name: "beyond toe", x_m: toe + 0.5 * d },
        ColumnInfo { name: "far field", x_m: toe + 1.5 * d },
    ]
}

/// The ground's state as the stability engine needs it: undrained strength
/// on the columns, su[column][k] kPa at original depths `zs[k]` (all columns
/// share one depth grid; a depth on a boundary between two clay layers
/// appears twice, the value above the boundary first), and the surface
/// settlement of each column, m.
#[derive(Debug, Clone)]
pub struct GroundField {
    pub xs: Vec<f64>,
    pub zs: Vec<f64>,
    pub su: Vec<Vec<f64>>,
    pub settlement_m: Vec<f64>,
}

/// Where the last look-up through it fell among a `GroundField`'s columns
/// and depths. Look-ups at nearby points (the slices of one circle, the
/// iterates of one root) start their bracket there and step to the right
/// interval, instead of a binary search each; the bracket, and so the
/// value, is the same as without it.
#[derive(Debug, Clone, Copy, Default)]
pub struct Cursor {
    col: usize,
    node: usize,
}

/// Where an offset falls among a `GroundField`'s columns: the column on
/// the centreline side and the weight of the next one (`bracket`).
#[derive(Debug, Clone, Copy)]
pub struct Across {
    col: usize,
    w: f64,
}

impl GroundField {
    /// Surface settlement at offset x, m (linear between columns, constant
    /// beyond the outermost).
    pub fn settlement(&self, x: f64) -> f64 {
        self.settlement_in(bracket(self.xs.len(), |k| self.xs[k], x.abs()))
    }

    /// Where offset x falls among the columns, bracketing from the
    /// cursor's column (and moving it): one look-up serves the settlement
    /// and every strength sampled at that offset.
    pub fn across_near(&self, x: f64, cur: &mut Cursor) -> Across {
        let (col, w) = bracket_from(self.xs.len(), |k| self.xs[k], x.abs(), cur.col);
        cur.col = col;
        Across { col, w }
    }

    /// Surface settlement at an offset found by `across_near`, m.
    pub fn settlement_across(&self, a: Across) -> f64 {
        self.settlement_in((a.col, a.w))
    }

    fn settlement_in(&self, (j, w): (usize, f64)) -> f64 {
        self.settlement_m[j] * (1.0 - w) + self.settlement_m[j + 1] * w
    }

    /// su at offset x (symmetric about the centreline) and depth z below OGL:
    /// linear in z on each column, linear in x between columns, constant
    /// beyond the outermost column.
    pub fn sample(&self, x: f64, z: f64) -> f64 {
        let (xs, zs) = (&self.xs, &self.zs);
        self.sample_in(bracket(xs.len(), |k| xs[k], x.abs()), bracket(zs.len(), |k| zs[k], z))
    }

    /// `sample` at an offset found by `across_near` and depth z,
    /// bracketing the depth from the cursor's node (and moving it).
    pub fn sample_across(&self, a: Across, z: f64, cur: &mut Cursor) -> f64 {
        let zs = &self.zs;
        let bz = bracket_from(zs.len(), |k| zs[k], z, cur.node);
        cur.node = bz.0;
        self.sample_in((a.col, a.w), bz)
    }

    fn sample_in(&self, (j, wx): (usize, f64), (i, wz): (usize, f64)) -> f64 {
        let on = |c: usize| self.su[c][i] * (1.0 - wz) + self.su[c][i + 1] * wz;
        on(j) * (1.0 - wx) + on(j + 1) * wx
    }
}

/// Linear interpolation bracket in a non-decreasing sequence of `n` ≥ 2
/// values `at(k)`: (i, w) with the value at v ≈ (1 − w)·f(i) + w·f(i + 1),
/// w clamped to 0–1 so that values beyond either end take the end value.
/// i is the last index below n − 1 with at(i) < v (0 if none), found by
/// bisection.
fn bracket(n: usize, at: impl Fn(usize) -> f64, v: f64) -> (usize, f64) {
    let (mut lo, mut hi) = (0, n - 1);
    while hi - lo > 1 {
        let mid = (lo + hi) / 2;
        if at(mid) < v { lo = mid } else { hi = mid }
    }
    weight(at, lo, v)
}

/// `bracket` found by stepping from index `hint`: the same i (the values
/// below v form a prefix of the sequence, and i is its last index, capped
/// at n − 2), in a step or two when v is near the previous look-up.
fn bracket_from(n: usize, at: impl Fn(usize) -> f64, v: f64, hint: usize) -> (usize, f64) {
    let mut lo = hint.min(n - 2);
    while lo > 0 && (at(lo) >= v || v.is_nan()) {
        lo -= 1;
    }
    while lo + 2 < n && at(lo + 1) < v {
        lo += 1;
    }
    weight(at, lo, v)
}

/// (i, w) of v in the interval from at(i) to at(i + 1).
fn weight(at: impl Fn(usize) -> f64, i: usize, v: f64) -> (usize, f64) {
    let (a, b) = (at(i), at(i + 1));
    (i, ((v - a) / (b - a)).clamp(0.0, 1.0))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The demo with `key` scaled by `factor`.
    fn demo_with(key: &str, factor: f64) -> Project {
        let mut d = crate::input::vary::Document::parse(include_str!("../examples/kestrel-fen.toml"), "demo")
            .expect("demo parses");
        d.scale(key, factor).expect("key exists");
        d.project("demo varied").expect("demo validates")
    }

    /// Engines that differ in a soil parameter or the fill's weight share
    /// the stress tables, through `sharing` and through the process's kept
    /// tables (`new`), and give bit-for-bit the ground response of an
    /// engine with its own (the tables are a function of the geometry
    /// alone); a different embankment gets its own tables. The reference
    /// is an engine with tables of its own.
    #[test]
    fn stress_tables_are_shared_only_between_the_same_geometry() {
        let p = demo_with("ground.layers[1].cv_m2_per_year", 1.0);
        let soil = demo_with("ground.layers[1].cv_m2_per_year", 2.0);
        let heavier = demo_with("embankment.fill_unit_weight_kn_m3", 1.1);
        let wider = demo_with("embankment.crest_width_m", 1.1);
        let base = Engine::new(&p);
        let shared = Engine::sharing(&soil, &base);
        assert!(Arc::ptr_eq(&base.table, &shared.table));
        assert!(Arc::ptr_eq(&base.table, &Engine::new(&soil).table));
        assert!(Arc::ptr_eq(&base.table, &Engine::new(&heavier).table));
        assert!(!Arc::ptr_eq(&base.table, &Engine::sharing(&wider, &base).table));
        assert!(!Arc::ptr_eq(&base.table, &Engine::new(&wider).table));
        let own = Engine::with_own_tables(&soil);
        assert!(!Arc::ptr_eq(&base.table, &own.table));
        let run = |e: &Engine| {
            let mut st = e.initial_state();
            e.advance(&mut st, 5.0, 2.0);
            e.advance(&mut st, 30.0, 2.0);
            st.settlement_centre_m
        };
        // Build some levels through the base engine first, then compare.
        run(&base);
        assert_eq!(run(&shared).to_bits(), run(&own).to_bits());
    }

    /// A look-up through a cursor returns the same bits as the bisection
    /// (the interval below v is unique in a non-decreasing sequence), from
    /// any starting point, including a repeated depth at a layer boundary,
    /// values beyond both ends and NaN. The field is invented; the
    /// reference is `sample`/`settlement` without a cursor.
    #[test]
    fn cursor_look_ups_match_the_bisection_bit_for_bit() {
        let field = GroundField {
            xs: vec![0.0, 6.0, 12.0, 20.0, 26.0, 38.0],
            zs: vec![0.0, 0.5, 1.0, 1.5, 1.5, 2.5, 4.0, 6.0],
            su: (0..6)
                .map(|c| (0..8).map(|k| 8.0 + c as f64 * 1.3 + k as f64 * 0.7 + (k == 4) as u8 as f64 * 5.0).collect())
                .collect(),
            settlement_m: vec![0.9, 0.85, 0.6, 0.3, 0.1, 0.02],
        };
        let xs = (-90..=90).map(|k| k as f64 * 0.5).chain([1e9, -1e9, 6.0, -12.0, f64::NAN]);
        let zs = (-4..=30).map(|k| k as f64 * 0.25).chain([1.5, 1.5 - 1e-12, 1.5 + 1e-12, 1e9, f64::NAN]);
        let pts: Vec<(f64, f64)> = xs.flat_map(|x| zs.clone().map(move |z| (x, z))).collect();
        for col in 0..7 {
            for node in 0..9 {
                let mut cur = Cursor { col, node };
                // In order, reversed and from the same start each time.
                for (x, z) in pts.iter().chain(pts.iter().rev()) {
                    let mut fresh = Cursor { col, node };
                    for c in [&mut cur, &mut fresh] {
                        let a = field.across_near(*x, c);
                        assert_eq!(field.settlement_across(a).to_bits(), field.settlement(*x).to_bits(), "x {x}");
                        assert_eq!(
                            field.sample_across(a, *z, c).to_bits(),
                            field.sample(*x, *z).to_bits(),
                            "x {x} z {z}"
                        );
                    }
                }
            }
        }
    }
}
