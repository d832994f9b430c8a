//! The instrument layout page of the hold-point check record: the
//! cross-section at the hold point to a standard drawing scale (the fill as
//! built from the readings' fill record, the proposed lift dashed, the
//! ground layers at their original levels, the groundwater level) with
//! every instrument of the project file drawn at its position and labelled
//! with its id: a piezometer tip as a filled circle at its depth on a thin
//! riser, a settlement plate as an open square on original ground with its
//! rod to the fill surface, a lateral marker as an open triangle on the
//! ground. Positions are the project file's `offset_m` (from the
//! centreline) and `depth_m` (piezometer tips below original ground); an
//! instrument too far out to draw at a readable scale is named in a note,
//! never drawn at a guessed place.

use super::canvas::{Canvas, Dash, Marker, PAGE_W};
use super::figures::{Frame, drawing_scale, scale_bar, section_axes, section_fill, section_ground};
use super::pages::{BLOCK_TOP, CONTENT_TOP, MARGIN};
use crate::model::{Instrument, InstrumentKind};
use crate::report::ReleaseReport;
use crate::report::fixed as f;

/// Text size of the labels and notes, pt.
const SIZE: f32 = 6.5;

/// Page 3: the instrument layout on the cross-section.
pub fn layout_page(c: &mut Canvas, r: &ReleaseReport) {
    let (p, k) = (r.project, r.check);
    let e = &p.embankment;
    let now = crate::load::profile(e, k.height_now_m);
    let next = crate::load::profile(e, k.height_after_m);
    let toe = next.last().map_or(10.0, |q| q.0);
    let depth = p.profile_depth_m();
    // Instruments further out than three profile depths beyond the toe of
    // the proposed lift would shrink the drawing: they are named instead.
    let reach = toe + 3.0 * depth;
    let (near, far): (Vec<&Instrument>, Vec<&Instrument>) =
        p.instruments.iter().partition(|i| i.offset_m.abs() <= reach);
    let x_min = near.iter().map(|i| i.offset_m - 4.0).fold(-0.5 * e.crest_width_m - 3.0, f64::min);
    let x_max = near.iter().map(|i| i.offset_m + 4.0).fold(toe + 0.8 * depth, f64::max);
    let (y_min, y_max) = (-depth - 1.0, k.height_after_m + 3.0);
    let unread: Vec<&str> = k.instruments.iter().filter(|s| s.last_reading.is_none()).map(|s| s.id.as_str()).collect();
    let width = PAGE_W - 2.0 * MARGIN;
    let first = format!(
        "Cross-section at the hold point {}: crest {:.2} m as built (fill record of the readings), proposed lift to {:.2} m dashed",
        k.hold_point.format("%Y-%m-%d %H:%M"),
        k.height_now_m,
        k.height_after_m
    );
    let mut y = c.paragraph(MARGIN, CONTENT_TOP + 2.0, width, 9.0, &first);
    let mut note = String::from(
        "Instrument positions as given in the project file ([[instrument]] offset_m from the centreline; depth_m of each piezometer tip below original ground); the readings file carries readings only. Ground and instruments at their original levels (measured settlements: page 2); x from the centreline, y up from original ground.",
    );
    if !far.is_empty() {
        let named: Vec<String> =
            far.iter().map(|i| format!("{} ({}, offset {} m)", i.id, i.kind.label(), f(i.offset_m, 1))).collect();
        note.push_str(&format!(" Not drawn, beyond the drawing: {}.", named.join(", ")));
    }
    if !unread.is_empty() {
        note.push_str(&format!(" No usable reading at the hold point: {}.", unread.join(", ")));
    }
    y = c.paragraph(MARGIN, y + 0.5, width, 7.0, &note);
    let by = y + 5.0;
    let (bw, bh) = (width - 34.0, BLOCK_TOP - by - 24.0);
    let n = drawing_scale(x_max - x_min, y_max - y_min, bw, bh);
    let fr = Frame { bx: MARGIN + 24.0, by, x_min, x_max, y_min, y_max, scale: (1000.0 / n) as f32 };
    let original = |_: f64| 0.0;
    section_ground(c, &fr, p, &original, depth);
    section_fill(c, &fr, &now, &original);
    let xs: Vec<f64> = (0..=200).map(|j| x_min + (x_max - x_min) * j as f64 / 200.0).collect();
    let lift: Vec<(f32, f32)> = xs.iter().map(|&x| (fr.tx(x), fr.ty(crate::load::height_at(&next, x)))).collect();
    c.polyline(&lift, 0.3, Dash::Dashed, 0.0);
    section_axes(c, &fr);
    for inst in &near {
        instrument(c, &fr, inst, crate::load::height_at(&now, inst.offset_m), unread.contains(&inst.id.as_str()));
    }
    let bar = fr.ty(y_min) + 13.0;
    scale_bar(c, &fr, n, bar);
    key(c, fr.bx + 75.0, bar + 1.0);
}

/// One instrument at its position with its id; `surface` is the fill
/// height above it (0 beyond the toe), m.
fn instrument(c: &mut Canvas, fr: &Frame, inst: &Instrument, surface: f64, unread: bool) {
    let (x, ground, top) = (fr.tx(inst.offset_m), fr.ty(0.0), fr.ty(surface));
    let id = if unread { format!("{} (no reading)", inst.id) } else { inst.id.clone() };
    match inst.kind {
        InstrumentKind::Piezometer => {
            let tip = fr.ty(-inst.depth_m);
            c.line((x, top), (x, tip), 0.2, Dash::Solid, 0.4);
            c.marker(x, tip, Marker::Circle, 1.8);
            label_beside(c, x, tip + 1.0, &format!("{id} at {} m", f(-inst.depth_m, 1)));
        }
        InstrumentKind::SettlementPlate => {
            c.line((x, ground), (x, top - 1.0), 0.25, Dash::Solid, 0.0);
            c.marker(x, ground, Marker::Square, 2.0);
            label_beside(c, x, ground - 1.8, &id);
        }
        InstrumentKind::LateralMarker => {
            c.marker(x, ground - 1.0, Marker::Triangle, 2.0);
            c.text_center(x, ground - 3.0, SIZE, false, &id);
        }
    }
}

/// A label right of x, or left of it when it would pass the right margin.
fn label_beside(c: &mut Canvas, x: f32, y: f32, s: &str) {
    if x + 1.8 + c.fonts.width(s, SIZE, false) > PAGE_W - MARGIN {
        c.text_right(x - 1.8, y, SIZE, false, s);
    } else {
        c.text(x + 1.8, y, SIZE, false, s);
    }
}

/// The symbols and line styles of the drawing, wrapping at the margin.
fn key(c: &mut Canvas, x0: f32, y0: f32) {
    let items = [
        (Some(Marker::Circle), "piezometer tip (riser to the surface)"),
        (Some(Marker::Square), "settlement plate on original ground (rod to the fill surface)"),
        (Some(Marker::Triangle), "lateral marker"),
        (None, "proposed lift"),
    ];
    let (mut x, mut y) = (x0, y0);
    for (m, text) in items {
        let w = c.fonts.width(text, SIZE, false) + 10.0;
        if x + w > PAGE_W - MARGIN {
            (x, y) = (x0, y + 4.0);
        }
        match m {
            Some(m) => c.marker(x + 2.0, y - 1.0, m, 2.0),
            None => c.line((x, y - 1.0), (x + 5.0, y - 1.0), 0.3, Dash::Dashed, 0.0),
        }
        c.text(x + 6.0, y, SIZE, false, text);
        x += w;
    }
    c.paragraph(x0, y + 4.0, PAGE_W - MARGIN - x0, SIZE, "Fill as built white, layers shaded, groundwater dash-dot.");
}
