//! The corridor programme's outputs: terminal tables (programme, lower
//! bounds, weekly demand, cautions), JSON in the common envelope, CSV (one
//! row per activity) and one iCalendar file for every section, all built
//! on the report module's helpers.

use super::programme::{Programme, SectionResult};
use super::section::{Kind, Work};
use crate::error::Result;
use crate::report::fixed as f;
use crate::report::ics;
use crate::report::text::{Table, cautions_block, wrap};

/// Column headings of the programme table.
pub const PROGRAMME_COLUMNS: [&str; 14] = [
    "section",
    "chainage m",
    "clay m",
    "height m",
    "start",
    "lifts",
    "finish",
    "alone",
    "gov. FS",
    "target",
    "settl. m",
    "fill m³",
    "surch. m³",
    "drains m",
];

/// One section as the cells of `PROGRAMME_COLUMNS`.
pub fn section_cells(s: &SectionResult) -> Vec<String> {
    let mut cells = vec![
        s.name.clone(),
        format!("{:.0}–{:.0}", s.from_m, s.to_m),
        f(s.clay_thickness_m, 1),
        f(s.design_height_m, 1),
    ];
    match &s.outcome {
        Some(o) => cells.extend([
            o.start.to_string(),
            o.lifts.to_string(),
            o.finish.to_string(),
            o.unconstrained_finish.to_string(),
            f(o.governing_fs, 2),
            f(s.fs_target, 2),
            f(o.final_settlement_m, 2),
            f(o.placed.total(), 0),
            f(o.placed.surcharge_m3, 0),
            f(o.drain_m, 0),
        ]),
        None => {
            cells.push("CANNOT BE BUILT".into());
            cells.resize(PROGRAMME_COLUMNS.len(), "-".into());
        }
    }
    cells
}

/// The programme for the terminal.
pub fn text(p: &Programme, source: &str) -> String {
    let mut out = format!("Corridor programme: {}\n{} | from {}\n\n", p.title, p.reference, source);
    let mut t = Table::new(&PROGRAMME_COLUMNS);
    for s in &p.sections {
        t.row(section_cells(s));
    }
    out.push_str(&t.render());
    out.push_str(&summary_lines(p).join("\n"));
    out.push('\n');
    for s in p.sections.iter().filter(|s| s.outcome.is_none()) {
        let why = s.reason.clone().unwrap_or_default();
        out.push_str(&format!("\n  ! {}\n", wrap(&format!("{}: {why}", s.name), 76, "    ")));
    }
    out.push_str("\nWeekly fill (m³): placed / supply capacity\n");
    let mut w = Table::new(&["week of", "placed", "reused", "supply", "use"]);
    for wk in &p.weeks {
        let use_ =
            wk.supply_m3.filter(|s| *s > 0.0).map_or("-".into(), |s| format!("{:.0}%", 100.0 * wk.placed_m3 / s));
        w.row(vec![
            wk.start.to_string(),
            f(wk.placed_m3, 0),
            f(wk.reused_m3, 0),
            wk.supply_m3.map_or("unlimited".into(), |s| f(s, 0)),
            use_,
        ]);
    }
    out.push_str(&w.render());
    let named = p.sections.iter().flat_map(|s| s.outcome.iter().flat_map(move |o| &o.warnings).map(move |w| (s, w)));
    for warning in p.warnings.iter().cloned().chain(named.map(|(s, w)| format!("({}) {w}", s.name))) {
        out.push_str(&format!("\nWARNING: {}", wrap(&warning, 76, "  ")));
    }
    out.push_str("\n\nInputs (SHA-256):\n");
    for i in &p.inputs {
        out.push_str(&format!("  {}  {}\n", i.sha256, i.file));
    }
    out.push_str(&cautions_block());
    out
}

/// What the corridor finish covers: every section, or only those that can
/// be built (the others named).
pub fn finish_scope(p: &Programme) -> String {
    let out: Vec<&str> = p.sections.iter().filter(|s| s.outcome.is_none()).map(|s| s.name.as_str()).collect();
    if out.is_empty() {
        "latest section finish".into()
    } else {
        format!(
            "latest finish of the {} sections that can be built; NOT THE WHOLE CORRIDOR: {} CANNOT BE BUILT as specified",
            p.sections.len() - out.len(),
            out.join(", ")
        )
    }
}

/// The finish, the bounds, totals and resources as sentences (terminal
/// and PDF).
pub fn summary_lines(p: &Programme) -> Vec<String> {
    let date = |d: Option<chrono::NaiveDate>| d.map_or("-".to_string(), |d| d.to_string());
    let t = &p.totals;
    let r = &p.resources;
    let limit = |v: Option<usize>| v.map_or("unlimited".to_string(), |n| n.to_string());
    vec![
        format!("Corridor finish {} ({}).", date(p.finish), finish_scope(p)),
        format!(
            "Lower bounds: latest section finish planned alone {}; all fill delivered at the supply rate {}.",
            date(p.bounds.latest_unconstrained_finish),
            p.bounds.supply_finish.map_or("- (supply unlimited)".to_string(), |d| d.to_string())
        ),
        format!(
            "Fill placed {:.0} m³ = design {:.0} + settlement make-up {:.0} + surcharge {:.0} + platform {:.0}; surcharge removed {:.0} m³, reused {:.0} m³; imported {:.0} m³. Drains {:.0} m.",
            t.placed.total(),
            t.placed.design_m3,
            t.placed.makeup_m3,
            t.placed.surcharge_m3,
            t.placed.platform_m3,
            t.removed_m3,
            t.reused_m3,
            t.imported_m3,
            t.drain_m
        ),
        format!(
            "Resources: supply {} m³/working day, placing crews {}, drain rigs {}, platform {:.2} m, rolling surcharge {}. Peak use: {:.0} m³ on one day, {} crews, {} rigs.",
            r.supply_m3_per_day.map_or("unlimited".to_string(), |s| f(s, 0)),
            limit(r.placing_crews),
            limit(r.drain_rigs),
            r.platform_thickness_m,
            if r.rolling_surcharge { "on" } else { "off" },
            r.peak_daily_fill_m3,
            r.peak_crews,
            r.peak_rigs
        ),
        format!("Scheduling order: {}.", p.order.join(", ")),
        format!("Method: {}.", p.heuristic),
    ]
}

/// One row per activity: section, kind, start, end, quantity (after the
/// caution line, as every CSV of fillpace).
pub fn csv(p: &Programme) -> Result<Vec<u8>> {
    let head: Vec<String> = [
        "section",
        "kind",
        "stage",
        "start",
        "end",
        "quantity",
        "unit",
        "thickness_m",
        "height_after_m",
        "fs_end",
        "design_m3",
        "makeup_m3",
        "surcharge_m3",
        "platform_m3",
    ]
    .map(String::from)
    .to_vec();
    let mut rows = Vec::new();
    for s in &p.sections {
        let Some(o) = &s.outcome else { continue };
        for w in &o.works {
            rows.push(work_row(&s.name, w));
            if let Some(rel) = w.release.filter(|rel| (*rel - w.end).num_days() > 1) {
                let rest = (rel - w.end).num_days() - 1;
                let mut row = vec![
                    s.name.clone(),
                    "rest".into(),
                    w.stage.map_or(String::new(), |n| n.to_string()),
                    w.end.succ_opt().unwrap_or(w.end).to_string(),
                    rel.pred_opt().unwrap_or(rel).to_string(),
                    rest.to_string(),
                    "days".into(),
                ];
                row.resize(head.len(), String::new());
                rows.push(row);
            }
        }
    }
    crate::report::csv::table(None, &head, rows)
}

/// The CSV row of one activity.
fn work_row(section: &str, w: &Work) -> Vec<String> {
    let (q, unit) = match w.kind {
        Kind::Drains => (w.drain_m, "m"),
        Kind::Removal => (w.removed_m3, "m3"),
        _ => (w.volume.total(), "m3"),
    };
    let v = &w.volume;
    vec![
        section.to_string(),
        w.kind.key().to_string(),
        w.stage.map_or(String::new(), |n| n.to_string()),
        w.start.to_string(),
        w.end.to_string(),
        format!("{q:.1}"),
        unit.to_string(),
        format!("{:.3}", w.thickness_m),
        format!("{:.3}", w.height_after_m),
        w.fs_end.map_or(String::new(), |x| format!("{x:.3}")),
        format!("{:.1}", v.design_m3),
        format!("{:.1}", v.makeup_m3),
        format!("{:.1}", v.surcharge_m3),
        format!("{:.1}", v.platform_m3),
    ]
}

/// One calendar: every placement and hold point, the section named in
/// each event.
pub fn ics(p: &Programme) -> String {
    let mut lines = vec![
        "BEGIN:VCALENDAR".to_string(),
        "VERSION:2.0".into(),
        "PRODID:-//fillpace//corridor programme//EN".into(),
        "CALSCALE:GREGORIAN".into(),
    ];
    let base = format!("{}-{}", ics::slug(&p.reference), p.start_date);
    let stamp = ics::Stamp::at(crate::report::now_utc());
    let distress = crate::report::cautions().into_iter().find(|c| c.contains("distress")).unwrap_or_default();
    for (i, s) in p.sections.iter().enumerate() {
        let Some(o) = &s.outcome else { continue };
        for (j, w) in o.works.iter().enumerate() {
            let what = match w.kind {
                Kind::Platform => format!("{}: working platform", s.name),
                Kind::Drains => format!("{}: install {:.0} m of drains", s.name, w.drain_m),
                Kind::Removal => format!("{}: remove {:.2} m surcharge", s.name, -w.thickness_m),
                _ => format!(
                    "{}: lift {} — place {:.2} m (crest to {:.2} m)",
                    s.name,
                    w.stage.unwrap_or(0),
                    w.thickness_m,
                    w.height_after_m
                ),
            };
            let fs = w.fs_end.map_or(String::new(), |x| format!(" Predicted FS at end {x:.2}."));
            let desc = format!(
                "{} ({:.0}–{:.0} m).{fs} {distress} Prediction only: field monitoring governs.",
                s.name, s.from_m, s.to_m
            );
            ics::event(&mut lines, &format!("{base}-s{i}-w{j}@fillpace"), &stamp, w.start, w.end, &what, &desc);
            if let (Some(rel), Some(n)) = (w.release, w.stage) {
                let hold = format!("{}: HOLD POINT before stage {}", s.name, n + 1);
                let desc = format!(
                    "{}: check piezometer, settlement and lateral-movement readings; the next stage starts only when released by the engineer.",
                    s.name
                );
                ics::event(&mut lines, &format!("{base}-s{i}-hold{n}@fillpace"), &stamp, rel, rel, &hold, &desc);
            }
        }
    }
    lines.push("END:VCALENDAR".into());
    lines.iter().map(|l| ics::fold(l)).collect()
}

/// The programme as JSON in the common envelope (with `corridor` in place
/// of `project`).
pub fn json(p: &Programme, source: &str) -> Result<String> {
    crate::report::json::corridor(&p.title, &p.reference, source, p)
}
