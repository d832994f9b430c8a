//! The charts of the corridor programme PDF (`programme`): the programme
//! chart (one row per section against dates: platform, drains, lifts,
//! lifts into the surcharge, removal, rests, hold points, required finish;
//! a section that cannot be built marked so with its reason), the weekly
//! fill against the supply capacity, and the long-section sketch of
//! chainage against clay thickness and embankment height. Black and grey
//! only: the kinds of work differ by shade and line style.

use super::canvas::{Canvas, Dash, Marker};
use super::chart::{self, Axis, Chart, XAxis};
use super::pages::{CONTENT_TOP, MARGIN};
use super::programme::{CONTENT_BOTTOM, WIDTH, finish_line, fit};
use crate::corridor::output::summary_lines;
use crate::corridor::programme::Programme;
use crate::corridor::section::Kind;
use crate::report::fixed as f;
use chrono::NaiveDate;
use std::ops::Range;

/// Height of one section's row in the programme chart, mm.
pub(super) const ROW_H: f32 = 7.2;
/// Top of the programme chart's rows.
pub(super) const CHART_TOP: f32 = CONTENT_TOP + 9.0;

/// Days from the corridor start to the end of the chart (a week beyond
/// the last work, hold point or required finish; at least four weeks).
fn chart_days(p: &Programme) -> f64 {
    let last = p
        .sections
        .iter()
        .flat_map(|s| {
            let works = s.outcome.iter().flat_map(|o| &o.works);
            works.flat_map(|w| [Some(w.end), w.release]).chain([s.required_finish]).flatten()
        })
        .max()
        .unwrap_or(p.start_date);
    ((last - p.start_date).num_days() as f64 + 7.0).max(28.0)
}

/// Grey level of each kind of work's bar (black and white print).
fn shade(k: Kind) -> f32 {
    match k {
        Kind::Platform => 0.85,
        Kind::Drains => 0.6,
        Kind::Lift => 0.0,
        Kind::Surcharge => 0.35,
        Kind::Removal => 1.0,
    }
}

pub(super) fn programme_chart(c: &mut Canvas, p: &Programme, rows: Range<usize>) {
    let n = p.sections.len();
    let head = format!("Sections {}–{} of {n}. {}", rows.start + 1, rows.end, finish_line(p));
    c.paragraph(MARGIN, CONTENT_TOP + 1.0, WIDTH, 7.5, &head);
    let label_w = 62.0;
    let (cx, cw) = (MARGIN + label_w + 2.0, WIDTH - label_w - 2.0);
    let h = ROW_H * rows.len() as f32;
    let span = chart_days(p);
    let x = |d: NaiveDate| cx + ((d - p.start_date).num_days() as f64 / span) as f32 * cw;
    let bottom = CHART_TOP + h;
    for (t, label) in chart::date_ticks(p.start_date, 0.0, span) {
        let px = cx + (t / span) as f32 * cw;
        c.line((px, CHART_TOP), (px, bottom), 0.1, Dash::Solid, 0.8);
        c.text_center(px, bottom + 3.5, 6.5, false, &label);
    }
    for (row, s) in p.sections[rows.clone()].iter().enumerate() {
        let top = CHART_TOP + ROW_H * row as f32;
        if row % 2 == 1 {
            c.fill(&[(MARGIN, top), (cx + cw, top), (cx + cw, top + ROW_H), (MARGIN, top + ROW_H)], 0.95, false);
        }
        c.text(MARGIN + 1.0, top + 3.0, 6.5, true, &fit(c, &s.name, label_w - 2.0, 6.5, true));
        let sub = format!(
            "Ch {:.0}–{:.0} m, clay {} m, height {} m",
            s.from_m,
            s.to_m,
            f(s.clay_thickness_m, 1),
            f(s.design_height_m, 1)
        );
        c.text(MARGIN + 1.0, top + 6.2, 5.5, false, &fit(c, &sub, label_w - 2.0, 5.5, false));
        if let Some(d) = s.required_finish {
            c.line((x(d), top + 0.6), (x(d), top + ROW_H - 0.6), 0.6, Dash::Solid, 0.0);
        }
        let Some(o) = &s.outcome else {
            let why = format!("CANNOT BE BUILT — {}", s.reason.as_deref().unwrap_or("see the notes"));
            c.text(cx + 2.0, top + 4.6, 6.5, true, &fit(c, &why, cw - 4.0, 6.5, true));
            continue;
        };
        let (bt, bh) = (top + 1.6, ROW_H - 3.4);
        for w in &o.works {
            let (x0, x1) = (x(w.start), x(w.end + chrono::Duration::days(1)).max(x(w.start) + 0.6));
            c.fill(&[(x0, bt), (x1, bt), (x1, bt + bh), (x0, bt + bh)], shade(w.kind), true);
            if let Some(rel) = w.release {
                if x(rel) > x1 + 0.3 {
                    c.line((x1, bt + 0.5 * bh), (x(rel), bt + 0.5 * bh), 0.3, Dash::Dotted, 0.0);
                }
                c.marker(x(rel), bt - 0.2, Marker::Triangle, 1.8);
            }
        }
    }
    c.rect(cx, CHART_TOP, cw, h, 0.35);
    c.text_center(cx + 0.5 * cw, bottom + 7.5, 7.0, false, "date (working days on the corridor calendar)");
    programme_legend(c, bottom + 12.0);
}

/// The legend in rows across the page from `y`.
fn programme_legend(c: &mut Canvas, y: f32) {
    let items = [
        (Some(Kind::Platform), "working platform"),
        (Some(Kind::Drains), "drain installation"),
        (Some(Kind::Lift), "lift"),
        (Some(Kind::Surcharge), "lift into the surcharge"),
        (Some(Kind::Removal), "surcharge removal"),
        (None, "rest"),
        (None, "hold point (release check)"),
        (None, "required finish"),
    ];
    let (mut x, mut y) = (MARGIN + 1.0, y);
    for (i, (kind, label)) in items.iter().enumerate() {
        let w = 8.5 + c.fonts.width(label, 6.5, false) + 5.0;
        if x + w > MARGIN + WIDTH {
            (x, y) = (MARGIN + 1.0, y + 4.0);
        }
        match (kind, i) {
            (Some(k), _) => c.fill(&[(x, y - 2.6), (x + 7.0, y - 2.6), (x + 7.0, y), (x, y)], shade(*k), true),
            (None, 5) => c.line((x, y - 1.3), (x + 7.0, y - 1.3), 0.3, Dash::Dotted, 0.0),
            (None, 6) => c.marker(x + 3.5, y - 1.3, Marker::Triangle, 1.8),
            _ => c.line((x + 3.5, y - 3.0), (x + 3.5, y + 0.4), 0.6, Dash::Solid, 0.0),
        }
        c.text(x + 8.5, y, 6.5, false, label);
        x += w;
    }
}

pub(super) fn fill_chart(c: &mut Canvas, p: &Programme) {
    let day = |d: NaiveDate| (d - p.start_date).num_days() as f64;
    let steps = |v: &dyn Fn(&crate::corridor::quantities::Week) -> Option<f64>| {
        let mut pts = Vec::new();
        for (i, w) in p.weeks.iter().enumerate() {
            let end = p.weeks.get(i + 1).map_or(day(w.start) + 7.0, |n| day(n.start));
            if let Some(y) = v(w) {
                pts.extend([(day(w.start), y), (end, y)]);
            }
        }
        pts
    };
    let placed = steps(&|w| Some(w.placed_m3));
    let supply = steps(&|w| w.supply_m3);
    let reused = steps(&|w| Some(w.reused_m3));
    let top = placed.iter().chain(&supply).map(|q| q.1).fold(0.0, f64::max).max(1.0);
    let peak = p
        .weeks
        .iter()
        .filter_map(|w| w.supply_m3.filter(|s| *s > 0.0).map(|s| w.placed_m3 / s))
        .fold(None, |a: Option<f64>, u| Some(a.map_or(u, |a| a.max(u))));
    let text = format!(
        "Fill placed each week (imported and reused surcharge) against the supply capacity of that week's working days{}. {}",
        peak.map_or(" (supply unlimited)".to_string(), |u| format!("; the busiest week uses {:.0}% of it", 100.0 * u)),
        summary_lines(p)[2]
    );
    let y = c.paragraph(MARGIN, CONTENT_TOP + 1.0, WIDTH, 7.5, &text) + 8.0;
    let mut series = vec![line_series("fill placed (m³ per week)", placed, Dash::Solid)];
    if !supply.is_empty() {
        series.push(line_series("supply capacity (m³ per week)", supply, Dash::Dashed));
    }
    if p.totals.reused_m3 > 0.0 {
        series.push(line_series("of which reused surcharge (m³ per week)", reused, Dash::Dotted));
    }
    Chart {
        x: MARGIN + 14.0,
        y,
        w: WIDTH - 20.0,
        h: CONTENT_BOTTOM - y - 18.0,
        title: "Weekly fill demand and supply".into(),
        x_axis: XAxis::Dates { start: p.start_date, label: "week".into(), min: 0.0, max: chart_days(p) },
        left: Axis { label: "m³ per week".into(), min: 0.0, max: top * 1.1 },
        right: None,
        left_down: false,
        series,
        vlines: Vec::new(),
        limits: Vec::new(),
    }
    .draw(c);
}

fn line_series(label: &str, points: Vec<(f64, f64)>, dash: Dash) -> chart::Series {
    chart::Series { label: label.into(), points, dash, marker: Marker::None, right: false, markers_only: false }
}

pub(super) fn long_section(c: &mut Canvas, p: &Programme) {
    let secs = &p.sections;
    let (x0, x1) = secs.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), s| (a.min(s.from_m), b.max(s.to_m)));
    let pad = 0.02 * (x1 - x0).max(1.0);
    let clay = secs.iter().map(|s| s.clay_thickness_m).fold(1.0, f64::max);
    let high = secs.iter().map(|s| s.design_height_m + s.surcharge_height_m).fold(1.0, f64::max);
    let min = -(clay * 1.1).ceil();
    // Room above the embankment for the section names.
    let max = ((high - 0.4 * min) / 0.6).ceil();
    let text = "Sketch along the road, not to a natural scale: each section's design height (surcharge above it) over original ground, and the total thickness of its clay layers below. Gaps are lengths outside the programme (structures).";
    let y = c.paragraph(MARGIN, CONTENT_TOP + 1.0, WIDTH, 7.5, text) + 8.0;
    let ch = Chart {
        x: MARGIN + 14.0,
        y,
        w: WIDTH - 20.0,
        h: CONTENT_BOTTOM - y - 18.0,
        title: "Chainage against clay thickness and embankment height".into(),
        x_axis: XAxis::Linear(Axis { label: "chainage (m)".into(), min: x0 - pad, max: x1 + pad }),
        left: Axis { label: "level relative to original ground (m)".into(), min, max },
        right: None,
        left_down: false,
        series: Vec::new(),
        vlines: Vec::new(),
        limits: Vec::new(),
    };
    ch.draw(c);
    let rect = |a: f64, b: f64, lo: f64, hi: f64| {
        let (xa, xb, ya, yb) = (ch.px(a), ch.px(b), ch.py(lo, false), ch.py(hi, false));
        [(xa, ya), (xb, ya), (xb, yb), (xa, yb)]
    };
    for s in secs {
        let (a, b, h) = (s.from_m, s.to_m, s.design_height_m);
        c.fill(&rect(a, b, -s.clay_thickness_m, 0.0), 0.88, true);
        let top = h + s.surcharge_height_m;
        if s.outcome.is_some() {
            c.fill(&rect(a, b, 0.0, h), 0.55, true);
            if s.surcharge_height_m > 0.0 {
                c.fill(&rect(a, b, h, top), 1.0, true);
            }
        } else {
            let r = rect(a, b, 0.0, top);
            c.polyline(&[r[0], r[1], r[2], r[3], r[0]], 0.4, Dash::Dashed, 0.0);
        }
        let label = if s.outcome.is_some() { s.name.clone() } else { format!("{} — CANNOT BE BUILT", s.name) };
        let base = ch.py(top, false) - 1.5;
        let room = base - ch.y - 1.5;
        c.text_up(ch.px(0.5 * (a + b)) + 1.0, base, 6.0, &fit(c, &label, room, 6.0, false));
    }
    c.line((ch.x, ch.py(0.0, false)), (ch.x + ch.w, ch.py(0.0, false)), 0.4, Dash::Solid, 0.0);
    let items = [
        (0.55, "embankment, design height"),
        (1.0, "surcharge"),
        (0.88, "clay layers (thickness below original ground)"),
    ];
    let (mut x, ly) = (ch.x, ch.y + ch.h + 12.5);
    for (level, label) in items {
        c.fill(&[(x, ly - 2.6), (x + 7.0, ly - 2.6), (x + 7.0, ly), (x, ly)], level, true);
        c.text(x + 8.5, ly, 6.5, false, label);
        x += 8.5 + c.fonts.width(label, 6.5, false) + 6.0;
    }
    c.polyline(&[(x, ly - 2.6), (x + 7.0, ly - 2.6), (x + 7.0, ly), (x, ly), (x, ly - 2.6)], 0.4, Dash::Dashed, 0.0);
    c.text(x + 8.5, ly, 6.5, false, "cannot be built (outline of the planned fill)");
}
