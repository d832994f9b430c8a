//! The corridor programme as a PDF: a summary with the corridor finish
//! beside its two lower bounds, the programme chart (sections as rows
//! against dates), the weekly fill against the supply capacity, a
//! long-section sketch (chainage against clay thickness and embankment
//! height), the section table, the inputs with the SHA-256 of every file
//! read, and the notes (sections that cannot be built, warnings, scheduling
//! order and method). Every page carries the title block, the engineer of
//! record's sign-off fields and the caution footer. Chart rows, table rows
//! and note lines continue on further pages at a fixed number per page, so
//! a corridor of any number of sections stays inside the page.

use super::canvas::{Canvas, Dash, Marker, PAGE_W};
use super::chart::{self, Axis, Chart, XAxis};
use super::pages::{self, BLOCK_TOP, CONTENT_TOP, MARGIN, Title, table};
use crate::corridor::Corridor;
use crate::corridor::output::{PROGRAMME_COLUMNS, section_cells, summary_lines};
use crate::corridor::programme::{Programme, SectionResult};
use crate::corridor::section::Kind;
use crate::error::Result;
use crate::report::fixed as f;
use chrono::NaiveDate;
use std::ops::Range;

/// Nothing is drawn below this (mm from the top): the sign-off fields
/// and the title block follow.
pub const CONTENT_BOTTOM: f32 = BLOCK_TOP - 10.0;
/// Sections per page of the programme chart.
pub const CHART_ROWS: usize = 16;
/// Height of one section's row in the programme chart, mm.
const ROW_H: f32 = 7.2;
/// Top of the programme chart's rows.
const CHART_TOP: f32 = CONTENT_TOP + 9.0;
/// Rows per page of the tables.
pub const TABLE_ROWS: usize = 26;
/// Font size of the tables, pt (a row is 0.62 of it in mm).
const TABLE_PT: f32 = 6.8;
/// Top of the tables (header baseline).
const TABLE_TOP: f32 = CONTENT_TOP + 9.0;
/// Lines per page of the notes, and their width in characters.
pub const NOTE_LINES: usize = 32;
const NOTE_CHARS: usize = 150;
const NOTE_PT: f32 = 7.5;
/// Width of the sign-off strip, mm.
const WIDTH: f32 = PAGE_W - 2.0 * MARGIN;

// A full page stays above the sign-off fields (checked when compiling): a
// table row is 0.62 of its font size in mm as `pages::table` draws it, with
// the header and totals rows and up to three lines of text above; the chart
// rows with the date labels and legend; the note lines.
const _: () = assert!(TABLE_TOP + 12.0 + (TABLE_ROWS as f32 + 1.0) * TABLE_PT * 0.62 < CONTENT_BOTTOM);
const _: () = assert!(CHART_TOP + CHART_ROWS as f32 * ROW_H + 17.0 < CONTENT_BOTTOM);
const _: () = assert!(CONTENT_TOP + 2.0 + NOTE_LINES as f32 * NOTE_PT * 0.45 < CONTENT_BOTTOM);

enum Page {
    Summary,
    Chart(Range<usize>),
    Fill,
    LongSection,
    Table(Range<usize>),
    Files(Range<usize>),
    Sources(Range<usize>),
    Notes(Range<usize>),
}

impl Page {
    fn heading(&self) -> &'static str {
        match self {
            Page::Summary => "Corridor programme: summary",
            Page::Chart(_) => "Programme chart",
            Page::Fill => "Weekly fill against the supply",
            Page::LongSection => "Long section",
            Page::Table(_) => "Sections",
            Page::Files(_) => "Inputs: files used and their SHA-256",
            Page::Sources(_) => "Inputs: sections, their files and overrides",
            Page::Notes(_) => "Notes, warnings and method",
        }
    }
}

/// `n` items in pages of `per` (one empty page when there are none).
fn chunks(n: usize, per: usize) -> Vec<Range<usize>> {
    (0..n.max(1)).step_by(per).map(|k| k..(k + per).min(n)).collect()
}

/// The corridor programme as a PDF document.
pub fn corridor(c: &Corridor, p: &Programme, date: NaiveDate) -> Result<Vec<u8>> {
    let sources = source_rows(c, p);
    let notes = note_lines(p);
    let mut kinds = vec![Page::Summary];
    kinds.extend(chunks(p.sections.len(), CHART_ROWS).into_iter().map(Page::Chart));
    kinds.extend([Page::Fill, Page::LongSection]);
    // The table's last page also carries the corridor totals row.
    kinds.extend(chunks(p.sections.len() + 1, TABLE_ROWS).into_iter().map(Page::Table));
    kinds.extend(chunks(p.inputs.len(), TABLE_ROWS).into_iter().map(Page::Files));
    kinds.extend(chunks(sources.len(), TABLE_ROWS).into_iter().map(Page::Sources));
    kinds.extend(chunks(notes.len(), NOTE_LINES).into_iter().map(Page::Notes));
    let total = kinds.len();
    let (from, to) =
        p.sections.iter().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), s| (a.min(s.from_m), b.max(s.to_m)));
    super::document(&format!("{} — corridor programme", p.title), total, |cv, i| {
        let kind = &kinds[i];
        let info = crate::model::ProjectInfo {
            // Cut to the title block's first column.
            title: fit(cv, &p.title, 100.0, 8.5, true),
            reference: p.reference.clone(),
            location: format!("Chainage {from:.0}–{to:.0} m, {} sections", p.sections.len()),
            revision: "-".into(),
            start_date: p.start_date,
            // Not shown in the title block.
            design_life_years: 0.0,
        };
        let title = Title { info: &info, source: &c.file, date, document: "fillpace corridor programme" };
        pages::frame(cv, &title, kind.heading(), i + 1, total);
        sign_off(cv);
        match kind {
            Page::Summary => summary(cv, c, p),
            Page::Chart(r) => programme_chart(cv, p, r.clone()),
            Page::Fill => fill_chart(cv, p),
            Page::LongSection => long_section(cv, p),
            Page::Table(r) => section_table(cv, p, r.clone()),
            Page::Files(r) => files(cv, p, r.clone()),
            Page::Sources(r) => sources_table(cv, &sources[r.clone()], r.start == 0),
            Page::Notes(r) => {
                let mut y = CONTENT_TOP + 2.0;
                let lines = &notes[r.clone()];
                // A page does not open on the blank line between notes.
                let skip = usize::from(r.start > 0 && lines.first().is_some_and(String::is_empty));
                for l in &lines[skip..] {
                    cv.text(MARGIN, y, NOTE_PT, false, l);
                    y += NOTE_PT * 0.45;
                }
            }
        }
    })
}

/// The engineer of record's sign-off fields, above the title block.
fn sign_off(c: &mut Canvas) {
    let y = BLOCK_TOP - 3.0;
    c.text(MARGIN, y, 7.0, true, "Engineer of record:");
    let fields = ["Name", "Signature", "Date", "Registration / licence no."];
    let x0 = MARGIN + 28.0;
    let w = (WIDTH - 28.0) / fields.len() as f32;
    for (i, label) in fields.iter().enumerate() {
        let x = x0 + i as f32 * w;
        c.text(x, y, 6.5, false, label);
        let start = x + c.fonts.width(label, 6.5, false) + 1.5;
        c.line((start, y + 0.5), (x + w - 4.0, y + 0.5), 0.25, Dash::Solid, 0.0);
    }
}

/// `s` cut to `width` mm, ending in "…" when cut.
fn fit(c: &Canvas, s: &str, width: f32, size: f32, bold: bool) -> String {
    if c.fonts.width(s, size, bold) <= width {
        return s.to_string();
    }
    let mut t: String = s.to_string();
    while !t.is_empty() && c.fonts.width(&format!("{t}…"), size, bold) > width {
        t.pop();
    }
    format!("{t}…")
}

/// The finish and its lower bounds, as one sentence.
fn finish_line(p: &Programme) -> String {
    let d = |d: Option<NaiveDate>| d.map_or("-".to_string(), |d| d.to_string());
    format!(
        "Corridor finish {} — lower bounds: {} (latest section finish planned alone), {} (all fill delivered at the supply rate).",
        d(p.finish),
        d(p.bounds.latest_unconstrained_finish),
        p.bounds.supply_finish.map_or("none (supply unlimited)".to_string(), |d| d.to_string())
    )
}

fn summary(c: &mut Canvas, k: &Corridor, p: &Programme) {
    let mut y = c.paragraph(MARGIN, CONTENT_TOP + 2.0, WIDTH, 10.0, &finish_line(p)) + 2.0;
    // The fill and the resources (the finish and bounds are above; the
    // scheduling order and the method, which grow with the corridor, are in
    // the notes).
    for line in summary_lines(p).iter().skip(2).take(2) {
        y = c.paragraph(MARGIN, y, WIDTH, 8.0, line) + 1.0;
    }
    let supply = k.resources.supply.iter().map(|s| {
        format!(
            "{} {} m³ per working day from {}",
            s.name,
            f(s.m3_per_day, 0),
            s.from.map_or("the corridor start".to_string(), |d| d.to_string())
        )
    });
    let supply: Vec<String> = supply.collect();
    let supply = if supply.is_empty() { "unlimited".to_string() } else { supply.join("; ") };
    y = c.paragraph(MARGIN, y, WIDTH, 8.0, &format!("Fill sources: {supply}.")) + 1.0;
    let lost = p.sections.iter().filter(|s| s.outcome.is_none()).count();
    if lost > 0 {
        let s = format!(
            "{lost} of {} sections CANNOT BE BUILT as specified and are left out of the programme: marked on the programme chart, the reasons in the notes.",
            p.sections.len()
        );
        y = c.paragraph(MARGIN, y, WIDTH, 8.0, &s) + 1.0;
    }
    y += 3.0;
    c.text(MARGIN, y, 9.0, true, "CAUTION NOTES");
    y += 5.0;
    for note in crate::report::cautions() {
        y = c.paragraph(MARGIN + 3.0, y, WIDTH - 3.0, 7.8, &format!("• {note}")) + 0.8;
    }
}

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

fn programme_chart(c: &mut Canvas, p: &Programme, rows: Range<usize>) {
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

fn fill_chart(c: &mut Canvas, p: &Programme) {
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
    }
    .draw(c);
}

fn line_series(label: &str, points: Vec<(f64, f64)>, dash: Dash) -> chart::Series {
    chart::Series { label: label.into(), points, dash, marker: Marker::None, right: false, markers_only: false }
}

fn long_section(c: &mut Canvas, p: &Programme) {
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

/// Column widths (mm) and alignment of the section table: the terminal's
/// programme columns with the governing mechanism after the FS target.
const TABLE_WIDTHS: [(f32, bool); 15] = [
    (46.0, false),
    (18.0, false),
    (12.0, true),
    (14.0, true),
    (18.0, false),
    (8.0, true),
    (18.0, false),
    (18.0, false),
    (11.0, true),
    (10.0, true),
    (36.0, false),
    (12.0, true),
    (16.0, true),
    (14.0, true),
    (15.0, true),
];

/// Index of the mechanism among the table's columns.
const MECHANISM: usize = 10;

fn section_table(c: &mut Canvas, p: &Programme, rows: Range<usize>) {
    let mut y = c.paragraph(MARGIN, CONTENT_TOP + 1.0, WIDTH, 7.5, &finish_line(p));
    y = c.paragraph(
        MARGIN,
        y,
        WIDTH,
        7.5,
        "'alone': the section's finish planned alone with unlimited resources (its own lower bound). gov. FS: the lowest FS at the end of any lift, with its mechanism and stage; settl.: final primary settlement under the final profile; fill: all fill brought in (design, settlement make-up, surcharge, platform).",
    );
    let mut heads: Vec<&str> = PROGRAMME_COLUMNS.to_vec();
    heads.insert(MECHANISM, "mechanism (stage)");
    let cols: Vec<(&str, f32, bool)> = heads.iter().zip(TABLE_WIDTHS).map(|(h, (w, r))| (*h, w, r)).collect();
    let n = p.sections.len();
    let mut cells: Vec<Vec<String>> =
        p.sections[rows.start.min(n)..rows.end.min(n)].iter().map(|s| table_cells(c, s, &cols)).collect();
    if rows.end > n {
        cells.push(total_cells(p));
    }
    y = y.max(TABLE_TOP - 3.0) + 3.0;
    table(c, MARGIN, y, &cols, &cells, TABLE_PT);
}

/// One section's row; a section that cannot be built says so across the
/// columns it has no value for.
fn table_cells(c: &Canvas, s: &SectionResult, cols: &[(&str, f32, bool)]) -> Vec<String> {
    let mut cells = section_cells(s);
    let fitted = |k: usize, text: &str, bold| fit(c, text, cols[k].1 - 1.5, TABLE_PT, bold);
    cells[0] = fitted(0, &s.name, false);
    match &s.outcome {
        Some(o) => {
            let mech = format!("{} ({})", o.governing_mechanism, o.governing_stage);
            cells.insert(MECHANISM, fitted(MECHANISM, &mech, false));
        }
        None => {
            let room: f32 = cols[4..].iter().map(|c| c.1).sum();
            let why = format!("CANNOT BE BUILT — {}", s.reason.as_deref().unwrap_or("see the notes"));
            cells.truncate(4);
            cells.push(fit(c, &why, room - 2.0, TABLE_PT, false));
            cells.resize(cols.len(), String::new());
        }
    }
    cells
}

fn total_cells(p: &Programme) -> Vec<String> {
    let outcomes = || p.sections.iter().filter_map(|s| s.outcome.as_ref());
    let date = |d: Option<NaiveDate>| d.map_or("-".to_string(), |d| d.to_string());
    let t = &p.totals;
    let mut cells = vec![
        "Corridor total".to_string(),
        String::new(),
        String::new(),
        String::new(),
        date(outcomes().map(|o| o.start).min()),
        outcomes().map(|o| o.lifts).sum::<usize>().to_string(),
        date(p.finish),
        date(p.bounds.latest_unconstrained_finish),
    ];
    cells.resize(12, String::new());
    cells.extend([f(t.placed.total(), 0), f(t.placed.surcharge_m3, 0), f(t.drain_m, 0)]);
    cells
}

fn files(c: &mut Canvas, p: &Programme, rows: Range<usize>) {
    let y = c.paragraph(
        MARGIN,
        CONTENT_TOP + 1.0,
        WIDTH,
        7.5,
        "Every file read, the corridor file first and then each section file once, with the SHA-256 of its bytes (FIPS 180-4): a checking engineer can confirm that this report was made from these files.",
    );
    let cols = [("file", 150.0, false), ("SHA-256", 120.0, false)];
    let cells: Vec<Vec<String>> = p.inputs[rows.start.min(p.inputs.len())..rows.end.min(p.inputs.len())]
        .iter()
        .map(|i| {
            // A long path keeps its end (the file name).
            let name = if c.fonts.width(&i.file, TABLE_PT, false) > 148.0 {
                let tail: String = i.file.chars().rev().collect();
                fit(c, &tail, 148.0, TABLE_PT, false).chars().rev().collect()
            } else {
                i.file.clone()
            };
            vec![name, i.sha256.clone()]
        })
        .collect();
    table(c, MARGIN, y.max(TABLE_TOP - 3.0) + 3.0, &cols, &cells, TABLE_PT);
}

/// Rows of the sources table: section, file, overrides (key = value),
/// constraints; long lists continue on rows below with the section blank.
fn source_rows(c: &Corridor, p: &Programme) -> Vec<Vec<String>> {
    let mut rows = Vec::new();
    for (spec, s) in c.sections.iter().zip(&p.sections) {
        let set: Vec<String> = s.overrides.iter().map(|(k, v)| format!("{k} = {v}")).collect();
        let set = if set.is_empty() { "none".to_string() } else { set.join(", ") };
        let set: Vec<String> = crate::report::text::wrap(&set, 80, "").lines().map(String::from).collect();
        let mut limits = Vec::new();
        limits.extend(s.priority.map(|k| format!("priority {k}")));
        limits.extend(spec.earliest_start.map(|d| format!("earliest start {d}")));
        limits.extend(s.required_finish.map(|d| format!("required finish {d}")));
        let file = std::path::Path::new(&s.project_file)
            .file_name()
            .map_or(s.project_file.clone(), |n| n.to_string_lossy().into_owned());
        for k in 0..set.len().max(limits.len()) {
            let first = k == 0;
            rows.push(vec![
                if first { s.name.clone() } else { String::new() },
                if first { file.clone() } else { String::new() },
                set.get(k).cloned().unwrap_or_default(),
                limits.get(k).cloned().unwrap_or_default(),
            ]);
        }
    }
    rows
}

fn sources_table(c: &mut Canvas, rows: &[Vec<String>], first: bool) {
    let mut y = CONTENT_TOP + 1.0;
    if first {
        y = c.paragraph(
            MARGIN,
            y,
            WIDTH,
            7.5,
            "Each section is its project file (paths against the corridor file; SHA-256 on the files page) with the corridor's start date and calendar and the key-path overrides below.",
        );
    }
    let cols = [
        ("section", 60.0, false),
        ("project file", 55.0, false),
        ("overrides", 110.0, false),
        ("constraints", 45.0, false),
    ];
    let cells: Vec<Vec<String>> = rows
        .iter()
        .map(|r| r.iter().zip(cols).map(|(cell, (_, w, _))| fit(c, cell, w - 1.5, TABLE_PT, false)).collect())
        .collect();
    table(c, MARGIN, y.max(TABLE_TOP - 3.0) + 3.0, &cols, &cells, TABLE_PT);
}

/// The notes as lines: warnings (each section that cannot be built, with
/// the reason, first), the scheduling order and the method.
fn note_lines(p: &Programme) -> Vec<String> {
    let mut notes: Vec<String> = p.warnings.iter().map(|w| format!("WARNING: {w}")).collect();
    for s in &p.sections {
        for w in s.outcome.iter().flat_map(|o| &o.warnings) {
            notes.push(format!("WARNING ({}): {w}", s.name));
        }
    }
    notes.extend(summary_lines(p).into_iter().skip(4));
    let mut lines = Vec::new();
    for n in notes {
        lines.extend(
            crate::report::text::wrap(&n, NOTE_CHARS, "")
                .lines()
                .enumerate()
                .map(|(i, l)| if i == 0 { l.to_string() } else { format!("    {l}") }),
        );
        lines.push(String::new());
    }
    lines.pop();
    lines
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pages_hold_every_item_once() {
        for n in [0, 1, 15, 16, 17, 40] {
            let c = chunks(n, 16);
            let all: Vec<usize> = c.iter().flat_map(|r| r.clone()).collect();
            assert_eq!(all, (0..n).collect::<Vec<_>>(), "{n} items");
            assert!(c.iter().all(|r| r.len() <= 16));
        }
    }
}
