//! The PDF schedule report (printpdf): a title block with signature boxes on
//! every page, summary, lift timetable split across pages with repeated
//! headers, figures drawn as vector graphics, inputs with the project file's
//! SHA-256, method statement, caution notes and monitoring plan. A4
//! landscape, black and grey only, fonts embedded (DejaVu Sans Condensed).

mod canvas;
mod chart;
mod figures;
mod pages;

use super::{Exporter, PlanReport};
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
            Kind::Methods => "Method statement",
            Kind::Cautions => "Cautions and monitoring plan",
        }
    }
}

impl Exporter for Pdf {
    fn serialize(&self, r: &PlanReport) -> Result<Vec<u8>> {
        let mut doc = PdfDocument::new(&format!("{} — lift timetable", r.project.info.title));
        let mut warn = Vec::new();
        let regular = ParsedFont::from_bytes(canvas::REGULAR_TTF, 0, &mut warn)
            .ok_or_else(|| Error::Computation("the bundled regular font could not be read".into()))?;
        let bold = ParsedFont::from_bytes(canvas::BOLD_TTF, 0, &mut warn)
            .ok_or_else(|| Error::Computation("the bundled bold font could not be read".into()))?;
        let fonts = Fonts::new(doc.add_font(&regular), doc.add_font(&bold));
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
            Kind::Methods,
            Kind::Cautions,
        ]);
        let total = kinds.len();
        let mut out = Vec::with_capacity(total);
        for (i, kind) in kinds.iter().enumerate() {
            let mut c = Canvas::new(&fonts);
            pages::frame(&mut c, &ctx, kind.heading(), i + 1, total);
            match kind {
                Kind::Summary => pages::summary(&mut c, &ctx),
                Kind::Timetable(k) => {
                    let end = (k + pages::TIMETABLE_ROWS_PER_PAGE).min(rows.len());
                    pages::timetable(&mut c, &rows[*k..end], *k == 0);
                }
                Kind::FiguresTime => figures::figures_time(&mut c, &ctx),
                Kind::FiguresPore => figures::figures_pore_strength(&mut c, &ctx),
                Kind::Section => figures::cross_section(&mut c, &ctx),
                Kind::Inputs => pages::inputs(&mut c, &ctx),
                Kind::Methods => pages::methods(&mut c),
                Kind::Cautions => pages::cautions_and_monitoring(&mut c, &ctx),
            }
            out.push(PdfPage::new(Mm(PAGE_W), Mm(PAGE_H), c.ops));
        }
        doc.with_pages(out);
        let opts = PdfSaveOptions { subset_fonts: true, ..PdfSaveOptions::default() };
        Ok(doc.save(&opts, &mut Vec::new()))
    }
}
