//! The PDF schedule report (printpdf): a title block with signature boxes on
//! every page, summary, lift timetable split across pages with repeated
//! headers, figures drawn as vector graphics, inputs with the project file's
//! SHA-256, methods and assumptions, caution notes and monitoring plan, and
//! a caution footer with the program version on every page of every PDF. A4
//! landscape, black and grey only, fonts embedded (DejaVu Sans Condensed).
//! The hold-point check record, the option comparison, the Monte Carlo and
//! the corridor programme (`programme`) share the title block and charts; the
//! record also shares the cross-section drawing.

mod canvas;
mod certificate;
mod chart;
mod figures;
mod layout;
mod more_inputs;
mod options;
mod pages;
mod programme;
mod programme_charts;
#[cfg(test)]
mod tests;

pub use programme::corridor;

use super::{CompareReport, Exporter, PlanReport, ReleaseReport, RiskReport};
use crate::error::{Error, Result};
use canvas::{Canvas, Fonts, PAGE_H, PAGE_W};
use pages::Ctx;
use printpdf::{Mm, ParsedFont, PdfDocument, PdfPage, PdfSaveOptions};

/// The plan as a PDF document.
pub struct Pdf {
    /// Date printed in the title block.
    pub report_date: chrono::NaiveDate,
}

enum Kind {
    Summary,
    Timetable(usize),
    FiguresTime,
    FiguresPore,
    Section,
    Inputs,
    MoreInputs,
    Methods,
    Cautions,
}

impl Kind {
    fn heading(&self) -> &'static str {
        match self {
            Kind::Summary => "Summary",
            Kind::Timetable(_) => "Lift timetable",
            Kind::FiguresTime => "Staging diagram and settlement",
            Kind::FiguresPore => "Pore pressure and strength gain",
            Kind::Section => "Cross-section at the governing stage",
            Kind::Inputs => "Inputs",
            Kind::MoreInputs => "Inputs (continued): strength, calendar, sequence, instruments",
            Kind::Methods => "Methods and assumptions",
            Kind::Cautions => "Cautions and monitoring plan",
        }
    }
}

impl Exporter for Pdf {
    fn serialize(&self, r: &PlanReport) -> Result<Vec<u8>> {
        let ctx = Ctx { r, report_date: self.report_date };
        let rows = pages::timetable_rows(&ctx);
        let mut kinds = vec![Kind::Summary];
        for k in (0..rows.len().max(1)).step_by(pages::TIMETABLE_ROWS_PER_PAGE) {
            kinds.push(Kind::Timetable(k));
        }
        kinds.extend([
            Kind::FiguresTime,
            Kind::FiguresPore,
            Kind::Section,
            Kind::Inputs,
            Kind::MoreInputs,
            Kind::Methods,
            Kind::Cautions,
        ]);
        let total = kinds.len();
        let title = ctx.title();
        document(&format!("{} — lift timetable", r.project.info.title), total, |c, i| {
            let kind = &kinds[i];
            pages::frame(c, &title, kind.heading(), i + 1, total);
            match kind {
                Kind::Summary => pages::summary(c, &ctx),
                Kind::Timetable(k) => {
                    let end = (k + pages::TIMETABLE_ROWS_PER_PAGE).min(rows.len());
                    pages::timetable(c, &rows[*k..end], *k == 0);
                }
                Kind::FiguresTime => figures::figures_time(c, &ctx),
                Kind::FiguresPore => figures::figures_pore_strength(c, &ctx),
                Kind::Section => figures::cross_section(c, &ctx),
                Kind::Inputs => pages::inputs(c, &ctx),
                Kind::MoreInputs => more_inputs::more_inputs(c, &ctx),
                Kind::Methods => pages::methods(c),
                Kind::Cautions => pages::cautions_and_monitoring(c, &ctx),
            }
        })
    }
}

/// The hold-point check record (four pages): recommendation, rules,
/// conditions and signature fields; instruments and cautions; the
/// instrument layout on the cross-section; the readings against the model
/// with the alarm limits.
pub fn certificate(r: &ReleaseReport, date: chrono::NaiveDate) -> Result<Vec<u8>> {
    let source = format!("{} and {}", r.project_file, r.check.readings_file);
    let title =
        pages::Title { info: &r.project.info, source: &source, date, document: "fillpace hold-point check record" };
    let name = format!("{} — hold-point check record {}", r.project.info.title, r.record);
    document(&name, RECORD_PAGES.len(), |c, i| record_page(c, &title, r, i))
}

/// Headings of the record's pages.
const RECORD_PAGES: [&str; 4] = [
    "Hold-point check record",
    "Instruments and cautions",
    "Instrument layout on the cross-section",
    "Readings against the model",
];

/// Page `i` of the record with its frame.
fn record_page(c: &mut Canvas, title: &pages::Title, r: &ReleaseReport, i: usize) {
    pages::frame(c, title, RECORD_PAGES[i], i + 1, RECORD_PAGES.len());
    match i {
        0 => certificate::decision_page(c, r),
        1 => certificate::details_page(c, r),
        2 => layout::layout_page(c, r),
        _ => certificate::readings_page(c, r),
    }
}

/// The design-option comparison (one page).
pub fn comparison(r: &CompareReport, date: chrono::NaiveDate) -> Result<Vec<u8>> {
    let title = pages::Title { info: &r.project.info, source: &r.source, date, document: "fillpace design options" };
    document(&format!("{} — design options", r.project.info.title), 1, |c, _| {
        pages::frame(c, &title, "Design options compared", 1, 1);
        options::comparison_page(c, r);
    })
}

/// The Monte Carlo pages: summary and table, then the charts.
pub fn risk(r: &RiskReport, date: chrono::NaiveDate) -> Result<Vec<u8>> {
    let title = pages::Title { info: &r.project.info, source: &r.source, date, document: "fillpace timetable risk" };
    document(&format!("{} — timetable risk", r.project.info.title), 2, |c, i| {
        let heading = if i == 0 { "Risk of the timetable" } else { "Finish dates and FS distribution" };
        pages::frame(c, &title, heading, i + 1, 2);
        if i == 0 { options::risk_summary(c, r) } else { options::risk_charts(c, r) }
    })
}

/// The document information: creation, modification and metadata dates are
/// the time of writing (UTC); creator and producer name the program version.
fn stamp_metadata(info: &mut printpdf::PdfDocumentInfo) {
    let secs = crate::report::now_utc().and_utc().timestamp();
    if let Ok(now) = printpdf::OffsetDateTime::from_unix_timestamp(secs) {
        info.creation_date = now;
        info.modification_date = now;
        info.metadata_date = now;
    }
    info.creator = crate::report::program_version();
    info.producer = crate::report::program_version();
}

/// The caution footer (templates/caution-footer.txt) and the program
/// version, below the title block of every page of every PDF.
fn footer(c: &mut Canvas) {
    let y = pages::BLOCK_TOP + 24.5;
    c.text(pages::MARGIN, y, 6.5, true, &crate::report::caution_footer());
    c.text_right(PAGE_W - pages::MARGIN, y, 6.5, false, &crate::report::program_version());
}

/// The bundled fonts added to `doc`, with their metrics.
fn fonts(doc: &mut PdfDocument) -> Result<Fonts> {
    let mut warn = Vec::new();
    let regular = ParsedFont::from_bytes(canvas::REGULAR_TTF, 0, &mut warn)
        .ok_or_else(|| Error::Computation("the bundled regular font could not be read".into()))?;
    let bold = ParsedFont::from_bytes(canvas::BOLD_TTF, 0, &mut warn)
        .ok_or_else(|| Error::Computation("the bundled bold font could not be read".into()))?;
    Ok(Fonts::new((doc.add_font(&regular), regular), (doc.add_font(&bold), bold)))
}

/// An A4-landscape document of `pages` pages, each drawn by `draw(canvas,
/// index)`, with the bundled fonts embedded (subset).
fn document(name: &str, pages: usize, mut draw: impl FnMut(&mut Canvas, usize)) -> Result<Vec<u8>> {
    let mut doc = PdfDocument::new(name);
    let fonts = fonts(&mut doc)?;
    stamp_metadata(&mut doc.metadata.info);
    let mut out = Vec::with_capacity(pages);
    for i in 0..pages {
        let mut c = Canvas::new(&fonts);
        draw(&mut c, i);
        footer(&mut c);
        out.push(PdfPage::new(Mm(PAGE_W), Mm(PAGE_H), c.ops));
    }
    doc.with_pages(out);
    let opts = PdfSaveOptions { subset_fonts: true, ..PdfSaveOptions::default() };
    Ok(doc.save(&opts, &mut Vec::new()))
}
