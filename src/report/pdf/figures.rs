//! The figure pages of the PDF schedule: the staging diagram (crest and FS
//! against date with hold points), settlement, excess pore pressure at key
//! points, strength profiles, and the cross-section to scale with the
//! critical circle at the governing stage.

use super::canvas::{Canvas, Dash, Marker, PAGE_W};
use super::chart::{Axis, Chart, Series, XAxis, nice_step};
use super::pages::{BLOCK_TOP, CONTENT_TOP, Ctx, MARGIN};
use crate::model::LayerKind;

fn days_since(ctx: &Ctx, d: chrono::NaiveDate) -> f64 {
    (d - ctx.r.project.info.start_date).num_days() as f64
}

fn date_axis(ctx: &Ctx) -> XAxis {
    let days = &ctx.r.plan.figures.days;
    let max = days.last().map_or(30.0, |d| days_since(ctx, d.date)).max(30.0);
    XAxis::Dates { start: ctx.r.project.info.start_date, label: "date".into(), min: 0.0, max }
}

fn hold_lines(ctx: &Ctx) -> Vec<(f64, String)> {
    ctx.r.plan.stages.iter().filter_map(|s| s.release.map(|d| (days_since(ctx, d), format!("H{}", s.number)))).collect()
}

/// A series drawn as a line.
fn line(label: &str, points: Vec<(f64, f64)>, dash: Dash) -> Series {
    Series { label: label.into(), points, dash, marker: Marker::None, right: false, markers_only: false }
}

/// A series drawn as markers only.
fn markers(label: &str, points: Vec<(f64, f64)>, marker: Marker) -> Series {
    Series { label: label.into(), points, dash: Dash::Solid, marker, right: false, markers_only: true }
}

/// Staging diagram in two panels on one date axis (crest height; FS at the
/// end of each stage and at release, with the target), then settlement to
/// the end of the design life.
pub fn figures_time(c: &mut Canvas, ctx: &Ctx) {
    let (p, pl) = (ctx.r.project, ctx.r.plan);
    let fig = &pl.figures;
    let w = PAGE_W - 2.0 * MARGIN - 30.0;
    let crest: Vec<(f64, f64)> = fig.days.iter().map(|d| (days_since(ctx, d.date), d.height_m)).collect();
    Chart {
        x: MARGIN + 14.0,
        y: CONTENT_TOP + 4.0,
        w,
        h: 30.0,
        title: "Staging diagram: crest height (H = hold point before the next stage)".into(),
        x_axis: date_axis(ctx),
        left: Axis { label: "crest (m)".into(), min: 0.0, max: (p.max_height_m() * 1.15).ceil() },
        right: None,
        left_down: false,
        series: vec![line("crest height above original ground", crest, Dash::Solid)],
        vlines: hold_lines(ctx),
        limits: Vec::new(),
    }
    .draw(c);
    let fs_end: Vec<(f64, f64)> = pl.stages.iter().map(|s| (days_since(ctx, s.end), s.fs_end)).collect();
    let fs_rel: Vec<(f64, f64)> =
        pl.stages.iter().filter_map(|s| Some((days_since(ctx, s.release?), s.fs_release?))).collect();
    let target = p.criteria.fs_construction;
    let fs_hi = pl.stages.iter().flat_map(|s| [s.fs_end, s.fs_release.unwrap_or(0.0)]).fold(target, f64::max);
    let fs_lo = pl.stages.iter().map(|s| s.fs_end).fold(target, f64::min).min(1.0);
    let x_max = days_since(ctx, pl.finish).max(30.0);
    Chart {
        x: MARGIN + 14.0,
        y: CONTENT_TOP + 58.0,
        w,
        h: 30.0,
        title: "Factor of safety at the end of each stage and at release".into(),
        x_axis: date_axis(ctx),
        // The band below the lowest value and above the highest keeps the
        // markers off the frame; the target line is drawn first so the
        // markers on it stay visible.
        left: Axis {
            label: "FS".into(),
            min: ((fs_lo - 0.1) * 10.0).floor() / 10.0,
            max: ((fs_hi + 0.1) * 10.0).ceil() / 10.0,
        },
        right: None,
        left_down: false,
        series: vec![
            line(&format!("FS target {target:.2}"), vec![(0.0, target), (x_max, target)], Dash::Dashed),
            markers("FS at end of stage", fs_end, Marker::Triangle),
            markers("FS at release", fs_rel, Marker::Circle),
        ],
        vlines: hold_lines(ctx),
        limits: Vec::new(),
    }
    .draw(c);
    settlement_chart(c, ctx, CONTENT_TOP + 112.0);
}

/// Settlement under the centreline from the start to the end of the design
/// life: computed daily to the finish (solid), then a dashed line to the
/// computed value at the end of the design life (the curve between those
/// two points is not computed).
fn settlement_chart(c: &mut Canvas, ctx: &Ctx, y: f32) {
    let (p, pl) = (ctx.r.project, ctx.r.plan);
    let settl: Vec<(f64, f64)> =
        pl.figures.days.iter().map(|d| (days_since(ctx, d.date), d.settlement_centre_m)).collect();
    let finish = days_since(ctx, pl.finish);
    let life_end = finish + p.info.design_life_years * crate::model::DAYS_PER_YEAR;
    let s_life = pl.settlement_at_finish_m + pl.residual_settlement_m;
    Chart {
        x: MARGIN + 14.0,
        y,
        w: PAGE_W - 2.0 * MARGIN - 30.0,
        h: 26.0,
        title: format!(
            "Settlement under the centreline to the end of the design life ({} years)",
            p.info.design_life_years
        ),
        x_axis: XAxis::Dates { start: p.info.start_date, label: "date".into(), min: 0.0, max: life_end },
        left: Axis { label: "settlement (m)".into(), min: 0.0, max: (s_life * 1.2 * 10.0).ceil().max(1.0) / 10.0 },
        right: None,
        left_down: true,
        series: vec![
            line("computed to the finish", settl, Dash::Solid),
            markers(
                &format!("finish {:.3} m", pl.settlement_at_finish_m),
                vec![(finish, pl.settlement_at_finish_m)],
                Marker::Square,
            ),
            Series {
                label: format!("end of design life {s_life:.3} m (dashed: joins the two computed values)"),
                points: vec![(finish, pl.settlement_at_finish_m), (life_end, s_life)],
                dash: Dash::Dashed,
                marker: Marker::Circle,
                right: false,
                markers_only: false,
            },
        ],
        vlines: Vec::new(),
        limits: Vec::new(),
    }
    .draw(c);
}

/// Excess pore pressure against date and strength profiles.
pub fn figures_pore_strength(c: &mut Canvas, ctx: &Ctx) {
    let fig = &ctx.r.plan.figures;
    let styles = [
        (Dash::Solid, Marker::None),
        (Dash::Dashed, Marker::None),
        (Dash::Dotted, Marker::None),
        (Dash::Chain, Marker::Circle),
    ];
    let peak = fig.days.iter().flat_map(|d| d.excess_kpa.iter().copied()).fold(10.0, f64::max);
    let series = fig
        .probes
        .iter()
        .enumerate()
        .map(|(k, pr)| Series {
            label: pr.label.clone(),
            points: fig.days.iter().map(|d| (days_since(ctx, d.date), d.excess_kpa[k])).collect(),
            dash: styles[k % styles.len()].0,
            marker: styles[k % styles.len()].1,
            right: false,
            markers_only: false,
        })
        .collect();
    Chart {
        x: MARGIN + 14.0,
        y: CONTENT_TOP + 4.0,
        w: 150.0,
        h: 112.0,
        title: "Excess pore pressure".into(),
        x_axis: date_axis(ctx),
        left: Axis {
            label: "excess pore pressure Δu (kPa)".into(), min: 0.0, max: (peak * 1.15 / 10.0).ceil() * 10.0
        },
        right: None,
        left_down: false,
        series,
        vlines: hold_lines(ctx),
        limits: Vec::new(),
    }
    .draw(c);
    // Strength profiles: start, up to three releases spread over the works, end.
    let n = fig.profiles.len();
    let mut pick: Vec<usize> = vec![0];
    if n > 2 {
        for k in 1..=3 {
            let i = k * (n - 1) / 4;
            if i > 0 && i < n - 1 && !pick.contains(&i) {
                pick.push(i);
            }
        }
    }
    if n > 1 {
        pick.push(n - 1);
    }
    let styles = [
        (Dash::Dotted, Marker::None),
        (Dash::Dashed, Marker::None),
        (Dash::Chain, Marker::None),
        (Dash::Solid, Marker::Square),
        (Dash::Solid, Marker::None),
    ];
    let su_max = fig.profiles.iter().flat_map(|p| p.points.iter().map(|q| q.1)).fold(10.0, f64::max);
    let depth = ctx.r.project.profile_depth_m();
    let series = pick
        .iter()
        .enumerate()
        .map(|(k, &i)| {
            let pr = &fig.profiles[i];
            let style = if i == n - 1 { (Dash::Solid, Marker::None) } else { styles[k % styles.len()] };
            Series {
                label: pr.label.clone(),
                points: pr.points.iter().map(|&(z, su)| (su, z)).collect(),
                dash: style.0,
                marker: style.1,
                right: false,
                markers_only: false,
            }
        })
        .collect();
    Chart {
        x: MARGIN + 190.0,
        y: CONTENT_TOP + 4.0,
        w: 81.0,
        h: 112.0,
        title: "Undrained strength under the centreline".into(),
        x_axis: XAxis::Linear(Axis { label: "su (kPa)".into(), min: 0.0, max: (su_max * 1.1 / 10.0).ceil() * 10.0 }),
        left: Axis { label: "depth below original ground (m)".into(), min: 0.0, max: depth.ceil() },
        right: None,
        left_down: true,
        series,
        vlines: Vec::new(),
        limits: Vec::new(),
    }
    .draw(c);
}

/// Drawing scales offered for the cross-section (1:N).
const SCALES: [f64; 10] = [50.0, 100.0, 200.0, 250.0, 500.0, 1000.0, 1250.0, 2000.0, 2500.0, 5000.0];

/// The largest standard scale 1:N at which `span_x` × `span_y` m fit in
/// `w` × `h` mm; returns N.
pub fn drawing_scale(span_x: f64, span_y: f64, w: f32, h: f32) -> f64 {
    let fit = (w as f64 / span_x).min(h as f64 / span_y);
    SCALES.iter().copied().find(|n| 1000.0 / n <= fit).unwrap_or(SCALES[SCALES.len() - 1])
}

/// Model (x from the centreline, y up from original ground, m) to page mm.
pub(super) struct Frame {
    pub bx: f32,
    pub by: f32,
    pub x_min: f64,
    pub x_max: f64,
    pub y_min: f64,
    pub y_max: f64,
    /// mm per m.
    pub scale: f32,
}

impl Frame {
    pub fn tx(&self, x: f64) -> f32 {
        self.bx + (x - self.x_min) as f32 * self.scale
    }
    pub fn ty(&self, y: f64) -> f32 {
        self.by + (self.y_max - y) as f32 * self.scale
    }
}

/// The cross-section at a standard drawing scale at the governing stage
/// with its circle, level and offset axes, dimensions and a scale bar.
pub fn cross_section(c: &mut Canvas, ctx: &Ctx) {
    let p = ctx.r.project;
    let Some(g) = &ctx.r.plan.figures.governing else { return };
    let e = &p.embankment;
    let prof = crate::load::profile(e, g.height_m);
    let toe = prof.last().map_or(10.0, |q| q.0);
    let depth = p.profile_depth_m();
    let (x_min, x_max) = (-0.5 * e.crest_width_m - 3.0, toe + 0.8 * depth);
    let (y_min, y_max) = (-depth - 1.0, e.design_height_m + e.surcharge_height_m + 3.0);
    let (bw, bh) = (PAGE_W - 2.0 * MARGIN - 34.0, BLOCK_TOP - CONTENT_TOP - 36.0);
    let n = drawing_scale(x_max - x_min, y_max - y_min, bw, bh);
    let f = Frame { bx: MARGIN + 24.0, by: CONTENT_TOP + 14.0, x_min, x_max, y_min, y_max, scale: (1000.0 / n) as f32 };
    c.text(
        MARGIN,
        CONTENT_TOP + 2.0,
        9.0,
        true,
        &format!(
            "Cross-section at 1:{n:.0} (A4, printed at 100%) at the end of stage {}: crest {:.2} m, critical circle FS {:.2}",
            g.stage, g.height_m, g.critical.fs
        ),
    );
    let settled = |x: f64| g.field.settlement(x);
    section_ground(c, &f, p, &settled, depth);
    section_fill(c, &f, &prof, &settled);
    if let Some(d) = &p.drains {
        section_drains(c, &f, d, toe, g);
    }
    section_circle(c, &f, g);
    section_axes(c, &f);
    section_dimensions(c, &f, &prof, g.height_m);
    let y = f.ty(y_min) + 13.0;
    scale_bar(c, &f, n, y);
    c.text(f.bx + 95.0, y + 1.0, 6.5, false, "Fill at the governing stage (white), settled original ground (dashed), layers shaded, groundwater dash-dot, drains thin lines, critical circle bold.");
}

/// Layers (boundaries moved down by s(x)(1 − z/D) for the surface
/// settlement s(x) m), their names and levels on the left, the groundwater
/// level on the right.
pub(super) fn section_ground(
    c: &mut Canvas,
    f: &Frame,
    p: &crate::model::Project,
    settled: &dyn Fn(f64) -> f64,
    depth: f64,
) {
    let xs: Vec<f64> = (0..=200).map(|k| f.x_min + (f.x_max - f.x_min) * k as f64 / 200.0).collect();
    let sink = |x: f64, z: f64| -z - settled(x) * (1.0 - (z / depth).min(1.0));
    let mut top = 0.0;
    let shades = [0.90, 0.80, 0.70, 0.62];
    for (i, l) in p.ground.layers.iter().enumerate() {
        let base = matches!(l.kind, LayerKind::StiffBase);
        let bottom = if base { depth + 1.0 } else { top + l.thickness_m };
        let mut poly: Vec<(f32, f32)> = xs.iter().map(|&x| (f.tx(x), f.ty(sink(x, top)))).collect();
        poly.extend(xs.iter().rev().map(|&x| (f.tx(x), f.ty(if base { -bottom } else { sink(x, bottom) }))));
        c.fill(&poly, if base { 0.55 } else { shades[i % shades.len()] }, false);
        let level = |z: f64| crate::report::fixed(-z, 2);
        let label = if base {
            format!("{} (below {} m)", l.name, level(top))
        } else {
            format!("{} ({} to {} m)", l.name, level(top), level(bottom))
        };
        c.text(f.tx(f.x_min) + 1.5, f.ty(sink(f.x_min, 0.5 * (top + bottom.min(depth)))) + 1.0, 6.5, false, &label);
        top = bottom;
    }
    let wy = f.ty(-p.ground.groundwater_depth_m);
    c.line((f.tx(f.x_min), wy), (f.tx(f.x_max), wy), 0.25, Dash::Chain, 0.2);
    c.text_right(
        f.tx(f.x_max) - 1.0,
        wy - 1.0,
        6.5,
        false,
        &format!("▽ groundwater {} m", crate::report::fixed(-p.ground.groundwater_depth_m, 2)),
    );
}

/// The fill of profile `prof` over the ground settled by s(x) m, the
/// original ground line and the centreline.
pub(super) fn section_fill(c: &mut Canvas, f: &Frame, prof: &[(f64, f64)], settled: &dyn Fn(f64) -> f64) {
    let xs: Vec<f64> = (0..=200).map(|k| f.x_min + (f.x_max - f.x_min) * k as f64 / 200.0).collect();
    let ground: Vec<(f32, f32)> = xs.iter().map(|&x| (f.tx(x), f.ty(-settled(x)))).collect();
    let mut fill: Vec<(f32, f32)> = xs
        .iter()
        .map(|&x| {
            let h = crate::load::height_at(prof, x);
            (f.tx(x), f.ty(if h > 0.0 { h } else { -settled(x) }))
        })
        .collect();
    fill.extend(ground.iter().rev());
    c.fill(&fill, 0.98, true);
    c.polyline(&ground, 0.35, Dash::Dashed, 0.0);
    c.line((f.tx(f.x_min), f.ty(0.0)), (f.tx(f.x_max), f.ty(0.0)), 0.15, Dash::Dotted, 0.0);
    c.text(f.tx(f.x_min) + 0.5, f.ty(0.0) - 1.0, 6.5, false, "original ground 0.00 m");
    c.line((f.tx(0.0), f.ty(f.y_max)), (f.tx(0.0), f.ty(f.y_min)), 0.25, Dash::Chain, 0.0);
    c.text(f.tx(0.0) + 0.8, f.by - 1.0, 6.5, true, "CL");
}

/// Drains under the fill footprint (every k-th when they would crowd).
fn section_drains(
    c: &mut Canvas,
    f: &Frame,
    d: &crate::model::Drains,
    toe: f64,
    g: &crate::schedule::record::Governing,
) {
    let k = ((1.5 / (d.spacing_m as f32 * f.scale)).ceil() as usize).max(1);
    let mut i = 0;
    while (i as f64) * d.spacing_m <= toe {
        let x = i as f64 * d.spacing_m;
        if i % k == 0 {
            for sx in [x, -x].into_iter().filter(|sx| *sx >= f.x_min) {
                c.line(
                    (f.tx(sx), f.ty(-g.field.settlement(sx))),
                    (f.tx(sx), f.ty(-d.depth_m)),
                    0.15,
                    Dash::Solid,
                    0.35,
                );
            }
        }
        i += 1;
    }
    let shown = if k == 1 { "all shown".to_string() } else { format!("one in {k} shown") };
    c.text(
        f.tx(toe) + 2.0,
        f.ty(-d.depth_m) - 1.5,
        6.5,
        false,
        &format!("drains at {:.2} m centres to {:.1} m depth ({shown})", d.spacing_m, d.depth_m),
    );
}

/// The critical circle: arc from entry to exit, centre and radius.
fn section_circle(c: &mut Canvas, f: &Frame, g: &crate::schedule::record::Governing) {
    let cr = &g.critical;
    let circ = cr.circle;
    let arc: Vec<(f32, f32)> = (0..=120)
        .map(|k| {
            let x = cr.entry_x_m + (cr.exit_x_m - cr.entry_x_m) * k as f64 / 120.0;
            let dy = (circ.r_m * circ.r_m - (x - circ.xc_m).powi(2)).max(0.0).sqrt();
            (f.tx(x), f.ty(circ.yc_m - dy))
        })
        .collect();
    c.polyline(&arc, 0.6, Dash::Solid, 0.0);
    let (cx, cy) = (f.tx(circ.xc_m), f.ty(circ.yc_m));
    if cy > f.by {
        c.line((cx - 1.5, cy), (cx + 1.5, cy), 0.3, Dash::Solid, 0.0);
        c.line((cx, cy - 1.5), (cx, cy + 1.5), 0.3, Dash::Solid, 0.0);
        c.line((cx, cy), arc[arc.len() / 2], 0.2, Dash::Dotted, 0.0);
    }
    let lowest = if cr.depth_m > 0.0 {
        format!("{:.1} m below original ground in the {}", cr.depth_m, cr.band)
    } else {
        format!("in the {}, above original ground", cr.band)
    };
    c.text(
        MARGIN,
        CONTENT_TOP + 7.0,
        7.0,
        false,
        &format!(
            "Critical circle: centre ({:.1}, {:.1}) m, radius {:.1} m, from x = {:.1} m to {:.1} m, lowest point {lowest}; x from the centreline, y up from original ground.",
            circ.xc_m, circ.yc_m, circ.r_m, cr.entry_x_m, cr.exit_x_m
        ),
    );
}

/// Level axis (m relative to original ground) on the left and offset axis
/// (m from the centreline) below.
pub(super) fn section_axes(c: &mut Canvas, f: &Frame) {
    let (left, bottom) = (f.bx - 3.0, f.ty(f.y_min) + 2.0);
    c.line((left, f.ty(f.y_max)), (left, f.ty(f.y_min)), 0.3, Dash::Solid, 0.0);
    let step = nice_step(f.y_max - f.y_min, 8.0);
    let decimals = if (step - step.round()).abs() > 1e-9 { 1 } else { 0 };
    let mut y = (f.y_min / step).ceil() * step;
    while y <= f.y_max + 1e-9 {
        c.line((left - 1.2, f.ty(y)), (left, f.ty(y)), 0.3, Dash::Solid, 0.0);
        c.text_right(left - 1.8, f.ty(y) + 1.0, 6.5, false, &crate::report::fixed(y, decimals));
        y += step;
    }
    c.text_up(left - 10.0, f.ty(f.y_min), 7.0, "level relative to original ground (m)");
    c.line((f.tx(f.x_min), bottom), (f.tx(f.x_max), bottom), 0.3, Dash::Solid, 0.0);
    let step = nice_step(f.x_max - f.x_min, 12.0);
    let decimals = if (step - step.round()).abs() > 1e-9 { 1 } else { 0 };
    let mut x = (f.x_min / step).ceil() * step;
    while x <= f.x_max + 1e-9 {
        c.line((f.tx(x), bottom), (f.tx(x), bottom + 1.2), 0.3, Dash::Solid, 0.0);
        c.text_center(f.tx(x), bottom + 4.0, 6.5, false, &crate::report::fixed(x, decimals));
        x += step;
    }
    c.text_center(f.tx(0.5 * (f.x_min + f.x_max)), bottom + 8.0, 7.0, false, "offset from the centreline (m)");
}

/// Crest width above the crest, crest height beside it, half base width on
/// the ground line.
fn section_dimensions(c: &mut Canvas, f: &Frame, prof: &[(f64, f64)], height: f64) {
    let crest = prof.iter().take_while(|q| (q.1 - height).abs() < 1e-9).last().map_or(0.0, |q| q.0);
    let toe = prof.last().map_or(0.0, |q| q.0);
    let y = f.ty(height) - 5.0;
    dimension(c, (f.tx(-crest), y), (f.tx(crest), y), &format!("crest {:.1} m", 2.0 * crest));
    let x = f.tx(crest) + 4.0;
    c.line((x, f.ty(0.0)), (x, f.ty(height)), 0.2, Dash::Solid, 0.0);
    for yy in [f.ty(0.0), f.ty(height)] {
        c.line((x - 1.0, yy), (x + 1.0, yy), 0.3, Dash::Solid, 0.0);
    }
    c.text(x + 1.0, f.ty(0.5 * height) + 1.0, 6.5, false, &format!("{height:.2} m"));
    let y = f.by + 3.0;
    dimension(c, (f.tx(0.0), y), (f.tx(toe), y), &format!("CL to toe {toe:.1} m"));
}

/// A horizontal dimension line with end ticks and its label above.
fn dimension(c: &mut Canvas, a: (f32, f32), b: (f32, f32), label: &str) {
    c.line(a, b, 0.2, Dash::Solid, 0.0);
    for p in [a, b] {
        c.line((p.0 - 0.8, p.1 + 0.8), (p.0 + 0.8, p.1 - 0.8), 0.3, Dash::Solid, 0.0);
        c.line((p.0, p.1 - 1.2), (p.0, p.1 + 1.2), 0.2, Dash::Solid, 0.0);
    }
    c.text_center(0.5 * (a.0 + b.0), a.1 - 1.0, 6.5, false, label);
}

/// A scale bar of five alternating segments with its drawing scale.
pub(super) fn scale_bar(c: &mut Canvas, f: &Frame, n: f64, y: f32) {
    let length = [5.0, 10.0, 20.0, 25.0, 50.0, 100.0].into_iter().find(|l| l * f.scale as f64 >= 30.0).unwrap_or(100.0);
    let seg = (length / 5.0) as f32 * f.scale;
    for k in 0..5 {
        let x = f.bx + k as f32 * seg;
        c.fill(
            &[(x, y - 1.0), (x + seg, y - 1.0), (x + seg, y + 0.5), (x, y + 0.5)],
            if k % 2 == 0 { 0.0 } else { 1.0 },
            true,
        );
    }
    c.text_center(f.bx, y + 4.0, 6.5, false, "0");
    c.text_center(f.bx + 5.0 * seg, y + 4.0, 6.5, false, &format!("{length:.0} m"));
    c.text(f.bx + 5.0 * seg + 6.0, y + 1.0, 7.0, true, &format!("1:{n:.0}"));
}

#[cfg(test)]
mod tests {
    #[test]
    fn the_section_is_drawn_at_the_largest_standard_scale_that_fits() {
        // Hand calculation: 57 m × 29.5 m in 239 × 118 mm allows 4.19 and
        // 4.00 mm per m; 1:250 is 4 mm per m (fits), 1:200 is 5 (does not).
        assert_eq!(super::drawing_scale(57.0, 29.5, 239.0, 118.0), 250.0);
        // 65 m wide allows 3.68 mm per m: 1:250 no longer fits, 1:500 does.
        assert_eq!(super::drawing_scale(65.0, 29.5, 239.0, 118.0), 500.0);
        // A small section: 20 m × 10 m in the same box, 11.8 mm per m: 1:100.
        assert_eq!(super::drawing_scale(20.0, 10.0, 239.0, 118.0), 100.0);
    }
}
