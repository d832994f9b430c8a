//! The figure pages of the PDF schedule: the staging diagram (crest and FS
//! against date with hold points), settlement, excess pore pressure at key
//! points, strength profiles, and the cross-section to scale with the
//! critical circle at the governing stage.

use super::canvas::{Canvas, Dash, Marker, PAGE_W};
use super::chart::{Axis, Chart, Series, XAxis};
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

/// Staging diagram (crest and FS) and settlement against date.
pub fn figures_time(c: &mut Canvas, ctx: &Ctx) {
    let (p, pl) = (ctx.r.project, ctx.r.plan);
    let fig = &pl.figures;
    let crest: Vec<(f64, f64)> = fig.days.iter().map(|d| (days_since(ctx, d.date), d.height_m)).collect();
    let fs_end: Vec<(f64, f64)> = pl.stages.iter().map(|s| (days_since(ctx, s.end), s.fs_end)).collect();
    let fs_rel: Vec<(f64, f64)> =
        pl.stages.iter().filter_map(|s| Some((days_since(ctx, s.release?), s.fs_release?))).collect();
    let x_max = match date_axis(ctx) {
        XAxis::Dates { max, .. } => max,
        XAxis::Linear(a) => a.max,
    };
    let target = vec![(0.0, p.criteria.fs_construction), (x_max, p.criteria.fs_construction)];
    let fs_hi = pl
        .stages
        .iter()
        .flat_map(|s| [s.fs_end, s.fs_release.unwrap_or(0.0)])
        .fold(p.criteria.fs_construction, f64::max);
    Chart {
        x: MARGIN + 14.0,
        y: CONTENT_TOP + 4.0,
        w: PAGE_W - 2.0 * MARGIN - 30.0,
        h: 58.0,
        title: "Staging diagram: crest height and factor of safety (H = hold point before the next stage)".into(),
        x_axis: date_axis(ctx),
        left: Axis { label: "crest above original ground (m)".into(), min: 0.0, max: (p.max_height_m() * 1.15).ceil() },
        right: Some(Axis { label: "factor of safety".into(), min: 1.0, max: (fs_hi + 0.1).max(1.5) }),
        left_down: false,
        series: vec![
            Series {
                label: "crest height".into(),
                points: crest,
                dash: Dash::Solid,
                marker: Marker::None,
                right: false,
                markers_only: false,
            },
            Series {
                label: "FS at end of stage".into(),
                points: fs_end,
                dash: Dash::Solid,
                marker: Marker::Triangle,
                right: true,
                markers_only: true,
            },
            Series {
                label: "FS at release".into(),
                points: fs_rel,
                dash: Dash::Solid,
                marker: Marker::Circle,
                right: true,
                markers_only: true,
            },
            Series {
                label: "FS target".into(),
                points: target,
                dash: Dash::Dashed,
                marker: Marker::None,
                right: true,
                markers_only: false,
            },
        ],
        vlines: hold_lines(ctx),
    }
    .draw(c);
    let settl: Vec<(f64, f64)> = fig.days.iter().map(|d| (days_since(ctx, d.date), d.settlement_centre_m)).collect();
    let design_life = pl.settlement_at_finish_m + pl.residual_settlement_m;
    let finish = days_since(ctx, pl.finish);
    Chart {
        x: MARGIN + 14.0,
        y: CONTENT_TOP + 90.0,
        w: PAGE_W - 2.0 * MARGIN - 30.0,
        h: 48.0,
        title: "Settlement under the centreline".into(),
        x_axis: date_axis(ctx),
        left: Axis { label: "settlement (m)".into(), min: 0.0, max: (design_life * 1.2 * 10.0).ceil() / 10.0 },
        right: None,
        left_down: true,
        series: vec![
            Series {
                label: "predicted settlement".into(),
                points: settl,
                dash: Dash::Solid,
                marker: Marker::None,
                right: false,
                markers_only: false,
            },
            Series {
                label: format!("end of construction {:.3} m", pl.settlement_at_finish_m),
                points: vec![(finish, pl.settlement_at_finish_m)],
                dash: Dash::Solid,
                marker: Marker::Square,
                right: false,
                markers_only: true,
            },
            Series {
                label: format!("after design life ({} y) {:.3} m", p.info.design_life_years, design_life),
                points: vec![(0.0, design_life), (x_max, design_life)],
                dash: Dash::Dashed,
                marker: Marker::None,
                right: false,
                markers_only: false,
            },
        ],
        vlines: Vec::new(),
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
    }
    .draw(c);
}

/// The cross-section to scale at the governing stage with its circle.
pub fn cross_section(c: &mut Canvas, ctx: &Ctx) {
    let p = ctx.r.project;
    let Some(g) = &ctx.r.plan.figures.governing else { return };
    let e = &p.embankment;
    let prof = crate::load::profile(e, g.height_m);
    let toe = prof.last().map_or(10.0, |q| q.0);
    let depth = p.profile_depth_m();
    let (x_min, x_max) = (-0.5 * e.crest_width_m - 4.0, toe + 1.2 * depth);
    let (y_min, y_max) = (-depth - 1.0, e.design_height_m + e.surcharge_height_m + 2.0);
    let (bx, by, bw, bh) =
        (MARGIN + 8.0, CONTENT_TOP + 12.0, PAGE_W - 2.0 * MARGIN - 16.0, BLOCK_TOP - CONTENT_TOP - 26.0);
    let scale = (bw / (x_max - x_min) as f32).min(bh / (y_max - y_min) as f32);
    let tx = |x: f64| bx + (x - x_min) as f32 * scale;
    let ty = |y: f64| by + (y_max - y) as f32 * scale;
    c.text(
        MARGIN,
        CONTENT_TOP + 2.0,
        9.0,
        true,
        &format!("Cross-section to scale (1 m = {scale:.2} mm) at the end of stage {}: crest {:.2} m, critical circle FS {:.2}", g.stage, g.height_m, g.critical.fs),
    );
    // layers, their boundaries moved down by s(x)(1 − z/D)
    let xs: Vec<f64> = (0..=200).map(|k| x_min + (x_max - x_min) * k as f64 / 200.0).collect();
    let sink = |x: f64, z: f64| -z - g.field.settlement(x) * (1.0 - (z / depth).min(1.0));
    let mut top = 0.0;
    let shades = [0.90, 0.80, 0.70, 0.62];
    for (i, l) in p.ground.layers.iter().enumerate() {
        let base = matches!(l.kind, LayerKind::StiffBase);
        let bottom = if base { depth + 1.0 } else { top + l.thickness_m };
        let mut poly: Vec<(f32, f32)> = xs.iter().map(|&x| (tx(x), ty(sink(x, top)))).collect();
        poly.extend(xs.iter().rev().map(|&x| (tx(x), ty(if base { -bottom } else { sink(x, bottom) }))));
        c.fill(&poly, if base { 0.55 } else { shades[i % shades.len()] }, false);
        c.text(tx(x_max) - 45.0, ty(sink(x_max, 0.5 * (top + bottom))) + 1.0, 7.0, false, &l.name);
        top = bottom;
    }
    // settled ground and fill
    let ground: Vec<(f32, f32)> = xs.iter().map(|&x| (tx(x), ty(-g.field.settlement(x)))).collect();
    let mut fill: Vec<(f32, f32)> = xs
        .iter()
        .map(|&x| {
            let h = crate::load::height_at(&prof, x);
            (tx(x), ty(if h > 0.0 { h } else { -g.field.settlement(x) }))
        })
        .collect();
    fill.extend(ground.iter().rev());
    c.fill(&fill, 0.98, true);
    c.polyline(&ground, 0.35, Dash::Dashed, 0.0);
    c.line((tx(x_min), ty(0.0)), (tx(x_min + 6.0), ty(0.0)), 0.3, Dash::Solid, 0.0);
    c.text(tx(x_min) + 0.5, ty(0.0) - 1.0, 6.0, false, "OGL");
    c.line((tx(0.0), ty(y_max)), (tx(0.0), ty(-depth)), 0.25, Dash::Chain, 0.0);
    c.text(tx(0.0) + 0.8, ty(y_max) + 3.0, 6.5, true, "CL");
    // water table
    let wy = ty(-p.ground.groundwater_depth_m);
    c.line((tx(x_min), wy), (tx(x_max), wy), 0.25, Dash::Chain, 0.2);
    c.text(tx(x_max) - 22.0, wy - 1.0, 6.0, false, "groundwater ▽");
    // drains under the fill footprint (every k-th shown)
    if let Some(d) = &p.drains {
        let k = ((1.5 / (d.spacing_m as f32 * scale)).ceil() as usize).max(1);
        let mut x = 0.0;
        let mut i = 0;
        while x <= toe {
            if i % k == 0 {
                for sx in [x, -x] {
                    if sx >= x_min {
                        c.line(
                            (tx(sx), ty(-g.field.settlement(sx))),
                            (tx(sx), ty(-d.depth_m)),
                            0.15,
                            Dash::Solid,
                            0.35,
                        );
                    }
                }
            }
            x += d.spacing_m;
            i += 1;
        }
        c.text(
            tx(0.0) + 1.0,
            ty(-d.depth_m) + 4.0,
            6.0,
            false,
            &format!("drains at {:.2} m to {:.1} m (every {k} shown)", d.spacing_m, d.depth_m),
        );
    }
    // critical circle: arc from entry to exit, centre and radius
    let cr = &g.critical;
    let circ = cr.circle;
    let arc: Vec<(f32, f32)> = (0..=120)
        .map(|k| {
            let x = cr.entry_x_m + (cr.exit_x_m - cr.entry_x_m) * k as f64 / 120.0;
            let dy = (circ.r_m * circ.r_m - (x - circ.xc_m).powi(2)).max(0.0).sqrt();
            (tx(x), ty(circ.yc_m - dy))
        })
        .collect();
    c.polyline(&arc, 0.6, Dash::Solid, 0.0);
    let (cx, cy) = (tx(circ.xc_m), ty(circ.yc_m));
    if cy > by {
        c.line((cx - 1.5, cy), (cx + 1.5, cy), 0.3, Dash::Solid, 0.0);
        c.line((cx, cy - 1.5), (cx, cy + 1.5), 0.3, Dash::Solid, 0.0);
        c.line((cx, cy), arc[arc.len() / 2], 0.2, Dash::Dotted, 0.0);
    }
    c.text(
        MARGIN,
        CONTENT_TOP + 7.0,
        7.0,
        false,
        &format!(
            "Critical circle: centre ({:.1}, {:.1}) m, radius {:.1} m, from x = {:.1} m to {:.1} m, lowest point {:.1} m below original ground in the {}; x from the centreline, y up from original ground.",
            circ.xc_m, circ.yc_m, circ.r_m, cr.entry_x_m, cr.exit_x_m, cr.depth_m, cr.band
        ),
    );
    // scale bar
    let sb = 10.0;
    let (sx, sy) = (bx, by + bh + 8.0);
    c.line((sx, sy), (sx + sb as f32 * scale, sy), 0.6, Dash::Solid, 0.0);
    c.text(sx, sy + 3.5, 6.5, false, &format!("{sb:.0} m"));
    c.text(sx + sb as f32 * scale + 6.0, sy + 1.0, 6.5, false, "Fill at the governing stage (white), settled original ground (dashed), layers shaded, groundwater dash-dot, drains thin lines, critical circle bold.");
}
