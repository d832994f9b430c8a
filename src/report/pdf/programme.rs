//! The corridor programme as a PDF: a summary with the corridor finish
//! beside its two lower bounds, the programme chart (sections as rows
//! against dates), the weekly fill against the supply capacity, a
//! long-section sketch (chainage against clay thickness and embankment
//! height), the section table, the inputs with the SHA-256 of every file
//! read, and the notes (sections that cannot be built, warnings, scheduling
//! order and method). Every page carries the title block, the engineer of
//! record's sign-off fields and the caution footer. Chart rows, table rows
//! and note lines continue on further pages at a fixed number per page, so
//! a corridor of any number of sections stays inside the page. The three
//! charts are drawn by `programme_charts`.

use super::canvas::{Canvas, Dash, PAGE_W};
use super::pages::{self, BLOCK_TOP, CONTENT_TOP, MARGIN, Title, table};
use super::programme_charts::{CHART_TOP, ROW_H, fill_chart, long_section, programme_chart};
use crate::corridor::Corridor;
use crate::corridor::output::{PROGRAMME_COLUMNS, section_cells, summary_lines};
use crate::corridor::programme::{Programme, SectionResult};
use crate::error::Result;
use crate::report::fixed as f;
use chrono::NaiveDate;
use std::ops::Range;

/// Nothing is drawn below this (mm from the top): the sign-off fields
/// and the title block follow.
pub(super) const CONTENT_BOTTOM: f32 = BLOCK_TOP - 10.0;
/// Sections per page of the programme chart.
pub(super) const CHART_ROWS: usize = 16;
/// Rows per page of the tables.
const TABLE_ROWS: usize = 26;
/// Font size of the tables, pt (a row is 0.62 of it in mm).
const TABLE_PT: f32 = 6.8;
/// Top of the tables (header baseline).
const TABLE_TOP: f32 = CONTENT_TOP + 9.0;
/// Lines per page of the notes, and their width in characters.
const NOTE_LINES: usize = 32;
const NOTE_CHARS: usize = 150;
const NOTE_PT: f32 = 7.5;
/// Width between the margins, mm.
pub(super) const WIDTH: f32 = PAGE_W - 2.0 * MARGIN;

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
pub(super) fn fit(c: &Canvas, s: &str, width: f32, size: f32, bold: bool) -> String {
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
pub(super) fn finish_line(p: &Programme) -> String {
    let d = |d: Option<NaiveDate>| d.map_or("-".to_string(), |d| d.to_string());
    format!(
        "Corridor finish {} ({}) — lower bounds: {} (latest section finish planned alone), {} (all fill delivered at the supply rate).",
        d(p.finish),
        crate::corridor::output::finish_scope(p),
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
