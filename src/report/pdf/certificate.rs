//! The pages of the hold-point check record: the recommendation with every
//! rule's value and verdict, the calibration, the conditions, the engineer
//! of record's signature fields and the cautions; and the readings plotted
//! against the model with the project's parameters and the calibrated
//! model. The program recommends; the engineer of record releases.

use super::canvas::{Canvas, Dash, Marker, PAGE_W};
use super::chart::{Axis, Chart, Limit, Series, XAxis};
use super::pages::{CONTENT_TOP, MARGIN, table};
use crate::model::InstrumentKind;
use crate::monitoring::release::{Track, Verdict};
use crate::report::ReleaseReport;
use crate::report::fixed as f;

/// Width of the text between the margins, mm.
const WIDTH: f32 = PAGE_W - 2.0 * MARGIN;

/// Page 1: recommendation, rules, calibration, conditions, signature
/// fields, warnings, cautions.
pub fn decision_page(c: &mut Canvas, r: &ReleaseReport) {
    let k = r.check;
    let mut y = CONTENT_TOP + 2.0;
    let (bx, bw, bh) = (MARGIN, 130.0, 26.0);
    c.fill(&[(bx, y), (bx + bw, y), (bx + bw, y + bh), (bx, y + bh)], 0.92, true);
    c.text(bx + 4.0, y + 6.0, 8.0, true, &format!("HOLD-POINT CHECK RECORD {}", r.record));
    c.text(bx + 4.0, y + 13.0, 13.0, true, k.recommendation.label());
    c.paragraph(bx + 4.0, y + 17.0, bw - 8.0, 6.8, k.recommendation.meaning());
    let sup = r.supersedes.map_or(String::new(), |n| format!("; supersedes record {n}"));
    let s = &k.safety;
    let facts = [
        format!("Hold point (latest reading): {}{sup}", k.hold_point.format("%Y-%m-%d %H:%M")),
        format!("Crest now {:.2} m; proposed lift {:.2} m to {:.2} m", k.height_now_m, k.lift_m, k.height_after_m),
        format!("Placement {} to {}", k.lift_start, k.lift_end),
        format!("FS now: model {:.2}, measured pore pressures {:.2}", s.now_model, s.now_measured),
        format!(
            "FS after the lift: model {:.2}, measured {:.2}; target {:.2}",
            s.next_model, s.next_measured, k.fs_target
        ),
        format!("Log before this record: {} entries, head {}", r.log_entries_before, r.log_head_before),
        format!("Project SHA-256 {}", r.project_sha256),
        format!("Readings SHA-256 {}", k.readings_sha256),
    ];
    let mut fy = y + 3.0;
    for t in &facts {
        fy = c.paragraph(bx + bw + 6.0, fy, PAGE_W - MARGIN - (bx + bw + 6.0), 6.8, t) + 0.3;
    }
    y = (y + bh).max(fy) + 5.0;
    for why in k.reasons.iter().take(6) {
        y = c.paragraph(MARGIN, y, WIDTH, 7.0, &format!("• {why}")) + 0.3;
    }
    for act in &k.actions {
        y = c.paragraph(MARGIN, y, WIDTH, 7.5, &format!("ACTION: {act}")) + 0.3;
    }
    let rows: Vec<Vec<String>> = k.rules.iter().map(crate::report::rule_cells).collect();
    y = table(
        c,
        MARGIN,
        y + 2.0,
        &[
            ("rule", 62.0, false),
            ("value", 16.0, true),
            ("limit", 24.0, true),
            ("verdict", 20.0, false),
            ("detail", 151.0, false),
        ],
        &rows,
        7.0,
    ) + 2.0;
    if !k.release_note.is_empty() {
        y = c.paragraph(MARGIN, y + 1.0, WIDTH, 7.0, &format!("Note: {}.", k.release_note)) + 1.0;
    }
    y = c.paragraph(MARGIN, y + 1.0, WIDTH, 7.0, &crate::report::fit_summary(k)) + 1.0;
    y = c.paragraph(MARGIN, y + 1.0, WIDTH, 7.0, &crate::report::conditions_sentence(k)) + 1.0;
    y = signature_block(c, y + 2.0);
    c.paragraph(
        MARGIN,
        y + 3.0,
        WIDTH,
        6.8,
        "Instruments, the back-analysis, Asaoka's forecast, warnings and cautions: page 2. Instrument layout on the cross-section: page 3. Readings against the model, with the alarm limits: page 4.",
    );
}

/// Page 2: the instrument table, Asaoka's forecast, warnings, cautions.
pub fn details_page(c: &mut Canvas, r: &ReleaseReport) {
    let k = r.check;
    let rows: Vec<Vec<String>> = k.instruments.iter().map(instrument_cells).collect();
    let mut y = table(
        c,
        MARGIN,
        CONTENT_TOP + 2.0,
        &[
            ("instrument", 20.0, false),
            ("kind", 26.0, false),
            ("x m", 12.0, true),
            ("z m", 12.0, true),
            ("read", 12.0, true),
            ("since lift", 16.0, true),
            ("latest", 26.0, false),
            ("measured", 20.0, true),
            ("calibrated", 20.0, true),
            ("misfit sd", 16.0, true),
            ("Δu/Δσv", 14.0, true),
            ("monitoring", 76.0, false),
        ],
        &rows,
        6.8,
    ) + 2.0;
    y = c.paragraph(MARGIN, y + 1.0, WIDTH, 7.0, &crate::report::fit_sentence(k)) + 1.0;
    let not_eval = k.rules.iter().filter(|r| r.verdict == Verdict::NotEvaluated).count();
    if not_eval > 0 {
        y = c.paragraph(
            MARGIN,
            y + 1.0,
            WIDTH,
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
            ("reliable", 160.0, false),
        ],
        &asaoka,
        7.2,
    ) + 2.0;
    for w in k.warnings.iter().take(4) {
        let at = w.line.map_or(String::new(), |l| format!("line {l}: "));
        y = c.paragraph(MARGIN, y + 1.0, WIDTH, 7.0, &format!("Warning — {at}{} {}", w.instrument, w.message));
    }
    if k.warnings.len() > 4 {
        y = c.paragraph(
            MARGIN,
            y + 1.0,
            WIDTH,
            7.0,
            &format!("… and {} more warnings (see the terminal or JSON output).", k.warnings.len() - 4),
        );
    }
    y += 3.0;
    c.text(MARGIN, y, 8.0, true, "CAUTIONS");
    y += 4.0;
    for note in crate::report::cautions() {
        y = c.paragraph(MARGIN + 2.0, y, WIDTH - 2.0, 6.8, &format!("• {note}")) + 0.4;
    }
}

/// Fields the engineer of record fills in by hand; returns the y below.
fn signature_block(c: &mut Canvas, y: f32) -> f32 {
    c.text(MARGIN, y + 3.0, 7.5, true, "Engineer of record (the lift is released only by this signature)");
    let fields = ["Name", "Signature", "Date", "Registration / licence no."];
    let w = WIDTH / fields.len() as f32;
    for (i, label) in fields.iter().enumerate() {
        let x = MARGIN + i as f32 * w;
        c.text(x, y + 11.0, 6.5, false, label);
        c.line((x, y + 9.0), (x + w - 6.0, y + 9.0), 0.3, Dash::Solid, 0.0);
    }
    y + 14.0
}

fn instrument_cells(s: &crate::monitoring::status::InstrumentStatus) -> Vec<String> {
    let scale = if s.kind == InstrumentKind::Piezometer { 1.0 } else { 1000.0 };
    let o = |v: Option<f64>, d: usize| v.map_or("-".to_string(), |x| f(x, d));
    vec![
        s.id.clone(),
        s.kind.label().into(),
        f(s.offset_m, 1),
        o(s.depth_m, 1),
        s.readings.to_string(),
        s.since_lift.to_string(),
        s.last_reading.map_or("-".into(), |t| t.format("%Y-%m-%d %H:%M").to_string()),
        o(s.measured.map(|v| v * scale), 1),
        o(s.calibrated.map(|v| v * scale), 1),
        o(s.misfit_sd, 1),
        o(s.pore_pressure_ratio, 2),
        if s.shortfall.is_empty() { "sufficient".into() } else { s.shortfall.join("; ") },
    ]
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

/// The alarm limits of one kind of instrument, one entry per project key
/// (rates dashed, ratios chain-dotted), in the plot's units.
fn limits(k: &crate::monitoring::release::ReleaseCheck, kind: InstrumentKind, scale: f64) -> Vec<Limit> {
    let mut out: Vec<(&str, Limit)> = Vec::new();
    for t in k.limits.iter().filter(|t| t.kind == kind) {
        let line: Vec<(f64, f64)> = t.points.iter().map(|p| (p.0, p.1 * scale)).collect();
        if let Some((_, l)) = out.iter_mut().find(|(key, _)| *key == t.key) {
            l.lines.push(line);
            continue;
        }
        let (dash, what) = match t.key {
            "pore_pressure_ratio_limit" => (Dash::Chain, "Δu/Δσv of the last lift"),
            "lateral_ratio_limit" => (Dash::Chain, "ΔL/ΔS since the lift began"),
            _ => (Dash::Dashed, "slope ending at each last reading"),
        };
        let value = format!("{} {}", f(t.value, 2), t.unit);
        out.push((
            t.key,
            Limit { label: format!("limit {} = {} ({what})", t.key, value.trim()), dash, lines: vec![line] },
        ));
    }
    out.into_iter().map(|(_, l)| l).collect()
}

/// Axis range of the tracks and limit lines (scaled), from 0 or below.
fn range(tracks: &[&Track], limits: &[Limit], scale: f64) -> (f64, f64) {
    let v = tracks.iter().flat_map(|t| t.measured.iter().chain(&t.predicted).chain(&t.calibrated)).map(|p| p.1 * scale);
    let v = v.chain(limits.iter().flat_map(|l| l.lines.iter().flatten()).map(|p| p.1));
    let (lo, hi) = v.fold((0.0f64, 0.0f64), |(a, b), x| (a.min(x), b.max(x)));
    (lo.floor(), (hi * 1.1).max(lo + 1.0).ceil())
}

/// Page 4: fill record, pore pressures, settlements and lateral movement,
/// each with the alarm limits that apply to it.
pub fn readings_page(c: &mut Canvas, r: &ReleaseReport) {
    let k = r.check;
    let start = r.project.info.start_date;
    let x_min = k.tracks.iter().flat_map(|t| t.measured.first()).map(|p| p.0).fold(0.0, f64::min);
    let x_max = k.tracks.iter().flat_map(|t| t.measured.last()).map(|p| p.0).fold(30.0, f64::max);
    let axis = || XAxis::Dates { start, label: "date".into(), min: x_min, max: x_max };
    let marks = [Marker::Circle, Marker::Square, Marker::Triangle];
    let dashes = [Dash::Solid, Dash::Dashed, Dash::Chain];
    // Room below each chart for its axis label and legend rows.
    let (w, h) = (0.5 * (PAGE_W - 2.0 * MARGIN) - 22.0, 44.0);
    let cells = [(MARGIN + 14.0, CONTENT_TOP + 2.0), (MARGIN + 14.0 + w + 30.0, CONTENT_TOP + 2.0)];
    let lower = [(MARGIN + 14.0, CONTENT_TOP + h + 40.0), (MARGIN + 14.0 + w + 30.0, CONTENT_TOP + h + 40.0)];
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
        let limits = limits(k, kind, scale);
        let (lo, hi) = range(&tracks, &limits, scale);
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
            limits,
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
        limits: Vec::new(),
    }
    .draw(c);
    chart_for(InstrumentKind::Piezometer, "Excess pore pressure above the initial u0", "excess (kPa)", 1.0, cells[1])
        .draw(c);
    chart_for(InstrumentKind::SettlementPlate, "Settlement of the plates", "settlement (mm)", 1000.0, lower[0]).draw(c);
    chart_for(InstrumentKind::LateralMarker, "Outward movement of the markers", "movement (mm)", 1000.0, lower[1])
        .draw(c);
}
