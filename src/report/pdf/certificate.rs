//! The two pages of the hold-point release certificate: the decision with
//! every rule's value and verdict, the calibration and the cautions; and the
//! readings plotted against the model with the project's parameters and
//! the calibrated model.

use super::canvas::{Canvas, Dash, Marker, PAGE_W};
use super::chart::{Axis, Chart, Series, XAxis};
use super::pages::{CONTENT_TOP, MARGIN, table};
use crate::model::InstrumentKind;
use crate::monitoring::release::{Decision, Track, Verdict};
use crate::report::ReleaseReport;
use crate::report::fixed as f;

/// Page 1: decision, rules, calibration, warnings, cautions.
pub fn decision_page(c: &mut Canvas, r: &ReleaseReport) {
    let k = r.check;
    let mut y = CONTENT_TOP + 2.0;
    let (bx, bw, bh) = (MARGIN, 120.0, 24.0);
    c.fill(
        &[(bx, y), (bx + bw, y), (bx + bw, y + bh), (bx, y + bh)],
        if k.decision == Decision::Hold { 0.82 } else { 0.95 },
        true,
    );
    c.text(bx + 4.0, y + 10.0, 20.0, true, &format!("DECISION: {}", k.decision.label()));
    let line2 = match (k.decision, k.earliest_release) {
        (Decision::Hold, Some(d)) => format!("Earliest forecast release {d} (calibrated model)"),
        (Decision::Hold, None) => "No forecast date: see the note below".to_string(),
        (Decision::Release, _) => format!("Lift may be placed from {}", k.lift_start),
    };
    c.text(bx + 4.0, y + 17.0, 8.5, false, &line2);
    c.text(bx + 4.0, y + 21.5, 7.0, false, &format!("Recorded in {} as entry {}", r.log, r.log_entry));
    let facts = [
        format!("Hold point (latest reading): {}", k.hold_point.format("%Y-%m-%d %H:%M")),
        format!("Crest now {:.2} m; proposed lift {:.2} m to {:.2} m", k.height_now_m, k.lift_m, k.height_after_m),
        format!("Placement {} to {}", k.lift_start, k.lift_end),
        format!("FS now {:.2}; after the lift {:.2}; target {:.2} ({})", k.fs_now, k.fs_next, k.fs_target, k.mechanism),
        format!(
            "Calibration: cv, ch × {:.2} (95% {:.2}–{:.2}); pore pressures × {:.2}",
            k.fit.multiplier, k.fit.interval95.0, k.fit.interval95.1, k.pore_pressure_factor
        ),
        format!("Project SHA-256 {}…", &r.project_sha256[..16]),
        format!("Readings SHA-256 {}…", &k.readings_sha256[..16.min(k.readings_sha256.len())]),
    ];
    let mut fy = y + 3.0;
    for t in &facts {
        c.text(bx + bw + 6.0, fy, 7.5, false, t);
        fy += 3.6;
    }
    y += bh + 7.0;
    let rows: Vec<Vec<String>> = k
        .rules
        .iter()
        .map(|rule| {
            let sign = if rule.must_be == "below" { "≥" } else { "≤" };
            vec![
                rule.name.to_string(),
                rule.value.map_or("-".into(), |v| f(v, 2)),
                format!("{sign} {} {}", f(rule.limit, 2), rule.unit),
                rule.verdict.label().to_string(),
                rule.detail.clone(),
            ]
        })
        .collect();
    y = table(
        c,
        MARGIN,
        y,
        &[
            ("rule", 52.0, false),
            ("value", 18.0, true),
            ("limit", 26.0, true),
            ("verdict", 22.0, false),
            ("detail", 155.0, false),
        ],
        &rows,
        7.5,
    ) + 2.0;
    if !k.release_note.is_empty() {
        y = c.paragraph(MARGIN, y + 2.0, 270.0, 7.5, &format!("Note: {}.", k.release_note)) + 1.0;
    }
    let not_eval = k.rules.iter().filter(|r| r.verdict == Verdict::NotEvaluated).count();
    if not_eval > 0 {
        y = c.paragraph(
            MARGIN,
            y + 1.0,
            270.0,
            7.5,
            &format!("{not_eval} rule(s) could not be evaluated for lack of readings; the engineer must judge them from the site."),
        ) + 1.0;
    }
    let asaoka: Vec<Vec<String>> = k
        .asaoka
        .iter()
        .map(|(id, a)| {
            vec![
                id.clone(),
                f(a.beta1, 4),
                a.final_m.map_or("-".into(), |v| f(1000.0 * v, 0)),
                a.degree.map_or("-".into(), |u| format!("{:.0}%", 100.0 * u)),
                a.coefficient_m2_per_year.map_or("-".into(), |v| format!("{} = {} m²/yr", a.coefficient, f(v, 2))),
                if a.reliable { "yes".into() } else { format!("no: {}", a.note) },
            ]
        })
        .collect();
    c.text(MARGIN, y + 4.0, 8.0, true, "Asaoka (1978) settlement forecast since the last lift ended");
    y = table(
        c,
        MARGIN,
        y + 8.0,
        &[
            ("plate", 18.0, false),
            ("β1", 16.0, true),
            ("final mm", 18.0, true),
            ("U now", 14.0, true),
            ("implied", 40.0, false),
            ("reliable", 100.0, false),
        ],
        &asaoka,
        7.2,
    ) + 2.0;
    for w in k.warnings.iter().take(4) {
        let at = w.line.map_or(String::new(), |l| format!("line {l}: "));
        y = c.paragraph(MARGIN, y + 1.0, 270.0, 7.0, &format!("Warning — {at}{} {}", w.instrument, w.message));
    }
    if k.warnings.len() > 4 {
        y = c.paragraph(
            MARGIN,
            y + 1.0,
            270.0,
            7.0,
            &format!("… and {} more warnings (see the terminal or JSON output).", k.warnings.len() - 4),
        );
    }
    y += 3.0;
    c.text(MARGIN, y, 8.0, true, "CAUTIONS");
    y += 4.0;
    for note in crate::report::cautions() {
        y = c.paragraph(MARGIN + 2.0, y, 270.0, 6.8, &format!("• {note}")) + 0.4;
    }
}

fn series(label: &str, points: &[(f64, f64)], dash: Dash, marker: Marker, markers_only: bool, scale: f64) -> Series {
    Series {
        label: label.into(),
        points: points.iter().map(|p| (p.0, p.1 * scale)).collect(),
        dash,
        marker,
        right: false,
        markers_only,
    }
}

fn range(tracks: &[&Track], scale: f64) -> (f64, f64) {
    let v = tracks.iter().flat_map(|t| t.measured.iter().chain(&t.predicted).chain(&t.calibrated)).map(|p| p.1 * scale);
    let (lo, hi) = v.fold((0.0f64, 0.0f64), |(a, b), x| (a.min(x), b.max(x)));
    (lo.floor(), (hi * 1.1).max(lo + 1.0).ceil())
}

/// Page 2: fill record, pore pressures, settlements and lateral movement.
pub fn readings_page(c: &mut Canvas, r: &ReleaseReport) {
    let k = r.check;
    let start = r.project.info.start_date;
    let x_min = k.tracks.iter().flat_map(|t| t.measured.first()).map(|p| p.0).fold(0.0, f64::min);
    let x_max = k.tracks.iter().flat_map(|t| t.measured.last()).map(|p| p.0).fold(30.0, f64::max);
    let axis = || XAxis::Dates { start, label: "date".into(), min: x_min, max: x_max };
    let marks = [Marker::Circle, Marker::Square, Marker::Triangle];
    let dashes = [Dash::Solid, Dash::Dashed, Dash::Chain];
    let (w, h) = (0.5 * (PAGE_W - 2.0 * MARGIN) - 22.0, 52.0);
    let cells = [(MARGIN + 14.0, CONTENT_TOP + 2.0), (MARGIN + 14.0 + w + 30.0, CONTENT_TOP + 2.0)];
    let lower = [(MARGIN + 14.0, CONTENT_TOP + h + 32.0), (MARGIN + 14.0 + w + 30.0, CONTENT_TOP + h + 32.0)];
    let of = |kind: InstrumentKind| -> Vec<&Track> { k.tracks.iter().filter(|t| t.kind == Some(kind)).collect() };
    let chart_for = |kind: InstrumentKind, title: &str, label: &str, scale: f64, at: (f32, f32)| {
        let tracks = of(kind);
        let mut s = Vec::new();
        for (i, t) in tracks.iter().enumerate() {
            let m = marks[i % marks.len()];
            s.push(series(&format!("{} measured", t.id), &t.measured, Dash::Solid, m, true, scale));
            if !t.calibrated.is_empty() {
                s.push(series(
                    &format!("{} calibrated", t.id),
                    &t.calibrated,
                    dashes[i % dashes.len()],
                    Marker::None,
                    false,
                    scale,
                ));
                s.push(series(
                    &format!("{} design values", t.id),
                    &t.predicted,
                    Dash::Dotted,
                    Marker::None,
                    false,
                    scale,
                ));
            }
        }
        let (lo, hi) = range(&tracks, scale);
        Chart {
            x: at.0,
            y: at.1,
            w,
            h,
            title: title.into(),
            x_axis: axis(),
            left: Axis { label: label.into(), min: lo, max: hi },
            right: None,
            left_down: kind == InstrumentKind::SettlementPlate,
            series: s,
            vlines: Vec::new(),
        }
    };
    let fill = k.tracks.iter().find(|t| t.kind.is_none());
    let top = r.project.max_height_m();
    Chart {
        x: cells[0].0,
        y: cells[0].1,
        w,
        h,
        title: "As-built fill record (crest above original ground)".into(),
        x_axis: axis(),
        left: Axis { label: "crest (m)".into(), min: 0.0, max: (top * 1.1).ceil() },
        right: None,
        left_down: false,
        series: vec![series(
            "as built",
            fill.map_or(&[][..], |t| &t.measured[..]),
            Dash::Solid,
            Marker::None,
            false,
            1.0,
        )],
        vlines: Vec::new(),
    }
    .draw(c);
    chart_for(InstrumentKind::Piezometer, "Excess pore pressure above hydrostatic", "excess (kPa)", 1.0, cells[1])
        .draw(c);
    chart_for(InstrumentKind::SettlementPlate, "Settlement of the plates", "settlement (mm)", 1000.0, lower[0]).draw(c);
    chart_for(InstrumentKind::LateralMarker, "Outward movement of the markers", "movement (mm)", 1000.0, lower[1])
        .draw(c);
}
