//! A page to draw on in millimetres from the top-left corner, with text in
//! the embedded DejaVu Sans Condensed (regular and bold; Bitstream Vera
//! licence in assets/fonts), lines with dash patterns, rectangles, filled
//! polygons and markers, all in shades of grey so the report prints in black
//! and white. Text widths come from the font's own advance widths, as
//! printpdf parsed them for embedding (the font is read once).

use printpdf::{
    Color, FontId, Greyscale, Line, LineDashPattern, LinePoint, Mm, Op, PaintMode, ParsedFont, PdfFontHandle, Point,
    Polygon, PolygonRing, Pt, TextItem, WindingOrder,
};

pub const REGULAR_TTF: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSansCondensed.ttf");
pub const BOLD_TTF: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSansCondensed-Bold.ttf");

/// Page size, A4 landscape, mm.
pub const PAGE_W: f32 = 297.0;
pub const PAGE_H: f32 = 210.0;
const PT_PER_MM: f32 = 72.0 / 25.4;

/// Line styles distinguishable in black and white.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Dash {
    Solid,
    Dashed,
    Dotted,
    Chain,
}

/// Point markers for series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Marker {
    None,
    Circle,
    Square,
    Triangle,
}

/// The fonts of the document and their metrics.
pub struct Fonts {
    pub regular: FontId,
    pub bold: FontId,
    regular_face: ParsedFont,
    bold_face: ParsedFont,
}

impl Fonts {
    /// The document's font ids with the parsed faces they were added from.
    pub fn new(regular: (FontId, ParsedFont), bold: (FontId, ParsedFont)) -> Fonts {
        Fonts { regular: regular.0, bold: bold.0, regular_face: regular.1, bold_face: bold.1 }
    }

    /// Width of `s` at `size_pt`, mm (a character the font lacks counts
    /// half an em).
    pub fn width(&self, s: &str, size_pt: f32, bold: bool) -> f32 {
        let face = if bold { &self.bold_face } else { &self.regular_face };
        let upem = f32::from(face.units_per_em.max(1));
        let units: f32 = s
            .chars()
            .map(|c| {
                face.lookup_glyph_index(u32::from(c))
                    .and_then(|g| face.get_glyph_width(g))
                    .map_or(0.5 * upem, f32::from)
            })
            .sum();
        units / upem * size_pt / PT_PER_MM
    }
}

/// The box a placed text occupies on the page, mm from the top-left
/// corner: left, top, right, bottom (baseline; the top is the ascent of
/// 0.75 em). Recorded for every text in test builds so that tests can
/// check the margins.
#[cfg(test)]
#[derive(Debug, Clone)]
pub struct Placed {
    pub x0: f32,
    pub y0: f32,
    pub x1: f32,
    pub y1: f32,
    pub text: String,
}

/// Operations of one page (and, in tests, the box of every text placed).
pub struct Canvas<'f> {
    pub fonts: &'f Fonts,
    pub ops: Vec<Op>,
    #[cfg(test)]
    pub placed: Vec<Placed>,
}

fn pt(x: f32, y: f32) -> Point {
    Point { x: Mm(x).into(), y: Mm(PAGE_H - y).into() }
}

fn grey(level: f32) -> Color {
    Color::Greyscale(Greyscale { percent: level, icc_profile: None })
}

impl<'f> Canvas<'f> {
    pub fn new(fonts: &'f Fonts) -> Canvas<'f> {
        Canvas {
            fonts,
            ops: Vec::new(),
            #[cfg(test)]
            placed: Vec::new(),
        }
    }

    /// Text with its baseline-left at (x, y) mm.
    pub fn text(&mut self, x: f32, y: f32, size: f32, bold: bool, s: &str) {
        if s.is_empty() {
            return;
        }
        #[cfg(test)]
        {
            let (w, em) = (self.fonts.width(s, size, bold), size / PT_PER_MM);
            self.placed.push(Placed { x0: x, y0: y - 0.75 * em, x1: x + w, y1: y, text: s.to_string() });
        }
        let font = if bold { self.fonts.bold.clone() } else { self.fonts.regular.clone() };
        self.ops.extend([
            Op::SaveGraphicsState,
            Op::SetFillColor { col: grey(0.0) },
            Op::StartTextSection,
            Op::SetTextCursor { pos: pt(x, y) },
            Op::SetFont { font: PdfFontHandle::External(font), size: Pt(size) },
            Op::ShowText { items: vec![TextItem::Text(s.to_string())] },
            Op::EndTextSection,
            Op::RestoreGraphicsState,
        ]);
    }

    /// Text ending at x.
    pub fn text_right(&mut self, x: f32, y: f32, size: f32, bold: bool, s: &str) {
        let w = self.fonts.width(s, size, bold);
        self.text(x - w, y, size, bold, s);
    }

    /// Text centred on x.
    pub fn text_center(&mut self, x: f32, y: f32, size: f32, bold: bool, s: &str) {
        let w = self.fonts.width(s, size, bold);
        self.text(x - 0.5 * w, y, size, bold, s);
    }

    /// Text rotated 90° (reading upwards) with its start at (x, y).
    pub fn text_up(&mut self, x: f32, y: f32, size: f32, s: &str) {
        #[cfg(test)]
        {
            let (w, em) = (self.fonts.width(s, size, false), size / PT_PER_MM);
            self.placed.push(Placed { x0: x - 0.75 * em, y0: y - w, x1: x, y1: y, text: s.to_string() });
        }
        let font = self.fonts.regular.clone();
        let p = pt(x, y);
        self.ops.extend([
            Op::SaveGraphicsState,
            Op::StartTextSection,
            Op::SetTextMatrix { matrix: printpdf::TextMatrix::TranslateRotate(p.x, p.y, 90.0) },
            Op::SetFont { font: PdfFontHandle::External(font), size: Pt(size) },
            Op::ShowText { items: vec![TextItem::Text(s.to_string())] },
            Op::EndTextSection,
            Op::RestoreGraphicsState,
        ]);
    }

    /// Wrap `s` into lines no wider than `width` mm, measured with the
    /// font; a word wider than a line (a hash, a path) is broken between
    /// characters. Returns the lines.
    pub fn wrap(&self, s: &str, width: f32, size: f32, bold: bool) -> Vec<String> {
        let fits = |t: &str| self.fonts.width(t, size, bold) <= width;
        let mut lines = Vec::new();
        let mut cur = String::new();
        for word in s.split_whitespace() {
            let trial = if cur.is_empty() { word.to_string() } else { format!("{cur} {word}") };
            if fits(&trial) {
                cur = trial;
                continue;
            }
            if !cur.is_empty() {
                lines.push(std::mem::take(&mut cur));
            }
            for ch in word.chars() {
                cur.push(ch);
                if !fits(&cur) && cur.chars().count() > 1 {
                    cur.pop();
                    lines.push(std::mem::replace(&mut cur, ch.to_string()));
                }
            }
        }
        if !cur.is_empty() {
            lines.push(cur);
        }
        lines
    }

    /// A wrapped paragraph from (x, y); returns the y below it.
    pub fn paragraph(&mut self, x: f32, y: f32, width: f32, size: f32, s: &str) -> f32 {
        let lead = size * 0.45;
        let mut y = y;
        for l in self.wrap(s, width, size, false) {
            self.text(x, y, size, false, &l);
            y += lead;
        }
        y
    }

    /// `s` shortened from the left with "…" until it fits `width` mm (for
    /// file paths in a fixed box: the file name stays readable).
    pub fn fit_left(&self, s: &str, width: f32, size: f32, bold: bool) -> String {
        if self.fonts.width(s, size, bold) <= width {
            return s.to_string();
        }
        let chars: Vec<char> = s.chars().collect();
        (1..chars.len())
            .map(|k| format!("…{}", chars[k..].iter().collect::<String>()))
            .find(|t| self.fonts.width(t, size, bold) <= width)
            .unwrap_or_default()
    }

    /// A polyline through points (mm), width in mm, grey level 0 = black.
    pub fn polyline(&mut self, points: &[(f32, f32)], width: f32, dash: Dash, level: f32) {
        if points.len() < 2 {
            return;
        }
        let pattern: &[f32] = match dash {
            Dash::Solid => &[],
            Dash::Dashed => &[6.0, 3.0],
            Dash::Dotted => &[1.0, 2.5],
            Dash::Chain => &[6.0, 2.5, 1.0, 2.5],
        };
        self.ops.extend([
            Op::SaveGraphicsState,
            Op::SetOutlineColor { col: grey(level) },
            Op::SetOutlineThickness { pt: Pt(width * PT_PER_MM) },
            Op::SetLineDashPattern {
                dash: if pattern.is_empty() { LineDashPattern::solid() } else { LineDashPattern::new(0.0, pattern) },
            },
            Op::DrawLine {
                line: Line {
                    points: points.iter().map(|&(x, y)| LinePoint { p: pt(x, y), bezier: false }).collect(),
                    is_closed: false,
                },
            },
            Op::RestoreGraphicsState,
        ]);
    }

    /// A straight segment.
    pub fn line(&mut self, a: (f32, f32), b: (f32, f32), width: f32, dash: Dash, level: f32) {
        self.polyline(&[a, b], width, dash, level);
    }

    /// A filled polygon (grey level), optionally outlined in black.
    pub fn fill(&mut self, points: &[(f32, f32)], level: f32, outline: bool) {
        let ring =
            PolygonRing { points: points.iter().map(|&(x, y)| LinePoint { p: pt(x, y), bezier: false }).collect() };
        self.ops.extend([
            Op::SaveGraphicsState,
            Op::SetFillColor { col: grey(level) },
            Op::SetOutlineColor { col: grey(0.0) },
            Op::SetOutlineThickness { pt: Pt(0.2 * PT_PER_MM) },
            Op::DrawPolygon {
                polygon: Polygon {
                    rings: vec![ring],
                    mode: if outline { PaintMode::FillStroke } else { PaintMode::Fill },
                    winding_order: WindingOrder::NonZero,
                },
            },
            Op::RestoreGraphicsState,
        ]);
    }

    /// An outlined rectangle with top-left (x, y), size w × h mm.
    pub fn rect(&mut self, x: f32, y: f32, w: f32, h: f32, width: f32) {
        self.polyline(&[(x, y), (x + w, y), (x + w, y + h), (x, y + h), (x, y)], width, Dash::Solid, 0.0);
    }

    /// A marker of size `s` mm centred at (x, y).
    pub fn marker(&mut self, x: f32, y: f32, m: Marker, s: f32) {
        let h = 0.5 * s;
        match m {
            Marker::None => {}
            Marker::Square => self.fill(&[(x - h, y - h), (x + h, y - h), (x + h, y + h), (x - h, y + h)], 1.0, true),
            Marker::Triangle => self.fill(&[(x, y - h), (x + h, y + h), (x - h, y + h)], 1.0, true),
            Marker::Circle => {
                let pts: Vec<(f32, f32)> = (0..16)
                    .map(|k| {
                        let a = k as f32 / 16.0 * std::f32::consts::TAU;
                        (x + h * a.cos(), y + h * a.sin())
                    })
                    .collect();
                self.fill(&pts, 0.0, false);
            }
        }
    }
}
