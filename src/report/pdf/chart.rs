//! Line charts with axes, ticks, units, grid and a legend, in black and grey
//! with line styles and markers (never colour alone). The x axis is either
//! calendar dates (values are days since a start date) or linear; a second y
//! axis on the right is optional; a depth axis can point downwards.

use super::canvas::{Canvas, Dash, Marker};
use chrono::{Datelike, Duration, NaiveDate};

/// One plotted series.
pub struct Series {
    pub label: String,
    pub points: Vec<(f64, f64)>,
    pub dash: Dash,
    pub marker: Marker,
    /// Plot against the right axis.
    pub right: bool,
    /// Draw markers only (no line).
    pub markers_only: bool,
}

/// An alarm limit drawn as thin grey lines (one per instrument it applies
/// to) with one legend entry naming the project key and its value.
pub struct Limit {
    pub label: String,
    pub dash: Dash,
    pub lines: Vec<Vec<(f64, f64)>>,
}

/// A value axis.
pub struct Axis {
    pub label: String,
    pub min: f64,
    pub max: f64,
}

/// The x axis.
pub enum XAxis {
    /// Values are days since `start`.
    Dates {
        start: NaiveDate,
        label: String,
        min: f64,
        max: f64,
    },
    Linear(Axis),
    /// Whole numbers (e.g. stage numbers): ticks only at integers.
    Count(Axis),
}

/// A chart in a frame at (x, y) mm, w × h mm.
pub struct Chart {
    pub x: f32,
    pub y: f32,
    pub w: f32,
    pub h: f32,
    pub title: String,
    pub x_axis: XAxis,
    pub left: Axis,
    pub right: Option<Axis>,
    /// Left axis increases downwards (depth profiles).
    pub left_down: bool,
    pub series: Vec<Series>,
    /// Vertical marker lines (x value, short label), e.g. hold points.
    pub vlines: Vec<(f64, String)>,
    /// Alarm limits (left axis).
    pub limits: Vec<Limit>,
}

/// Grey level and width (mm) of alarm-limit lines.
const LIMIT_GREY: f32 = 0.45;
const LIMIT_WIDTH: f32 = 0.3;

/// "Nice" tick step for a range, giving about `n` ticks.
pub fn nice_step(span: f64, n: f64) -> f64 {
    let raw = (span / n).max(1e-12);
    let mag = 10f64.powf(raw.log10().floor());
    [1.0, 2.0, 2.5, 5.0, 10.0].iter().map(|m| m * mag).find(|s| *s >= raw).unwrap_or(10.0 * mag)
}

fn ticks(min: f64, max: f64, n: f64) -> Vec<f64> {
    let step = nice_step(max - min, n);
    let mut t = (min / step).ceil() * step;
    let mut out = Vec::new();
    while t <= max + 1e-9 * step.abs() {
        out.push(if t.abs() < 1e-12 { 0.0 } else { t });
        t += step;
    }
    out
}

/// Label with the fewest decimals that show the tick step exactly.
fn tick_label(v: f64, step: f64) -> String {
    let decimals =
        (0..4).find(|d| ((step * 10f64.powi(*d)).round() - step * 10f64.powi(*d)).abs() < 1e-6).unwrap_or(3) as usize;
    format!("{v:.decimals$}")
}

/// Date ticks between two dates (days since `start`): Mondays every one
/// or two weeks for a span under about three months, else month starts
/// every 1, 2, 3 or 6 months, or year starts every 1, 2, 5 or 10 years, so
/// that a short programme still gets several ticks.
pub(super) fn date_ticks(start: NaiveDate, min: f64, max: f64) -> Vec<(f64, String)> {
    let span = max - min;
    if span <= 92.0 {
        let every = if span <= 45.0 { 7 } else { 14 };
        let first = start + Duration::days(min.ceil() as i64);
        let monday = first + Duration::days((7 - first.weekday().num_days_from_monday() as i64) % 7);
        return (0..)
            .map(|k| monday + Duration::days(k * every))
            .map(|d| ((d - start).num_days() as f64, d))
            .take_while(|(x, _)| *x <= max)
            .map(|(x, d)| (x, d.format("%d %b").to_string()))
            .collect();
    }
    month_ticks(start, min, max)
}

fn month_ticks(start: NaiveDate, min: f64, max: f64) -> Vec<(f64, String)> {
    let months = (max - min) / 30.44;
    let every = [1, 2, 3, 6, 12, 24, 60, 120].into_iter().find(|m| months / *m as f64 <= 12.0).unwrap_or(120);
    let first = start + Duration::days(min.floor() as i64);
    let mut d = NaiveDate::from_ymd_opt(first.year(), first.month(), 1).unwrap_or(first);
    let mut out = Vec::new();
    for _ in 0..2000 {
        let x = (d - start).num_days() as f64;
        if x > max {
            break;
        }
        if x >= min && (d.year() * 12 + d.month0() as i32) % every == 0 {
            out.push((x, d.format(if every >= 12 { "%Y" } else { "%Y-%m" }).to_string()));
        }
        d = if d.month() == 12 {
            NaiveDate::from_ymd_opt(d.year() + 1, 1, 1).unwrap_or(d)
        } else {
            NaiveDate::from_ymd_opt(d.year(), d.month() + 1, 1).unwrap_or(d)
        };
    }
    out
}

impl Chart {
    fn x_range(&self) -> (f64, f64) {
        match &self.x_axis {
            XAxis::Dates { min, max, .. } => (*min, *max),
            XAxis::Linear(a) | XAxis::Count(a) => (a.min, a.max),
        }
    }

    /// Page x (mm) of an x value.
    pub(super) fn px(&self, v: f64) -> f32 {
        let (a, b) = self.x_range();
        self.x + ((v - a) / (b - a)) as f32 * self.w
    }

    /// Page y (mm) of a value on the left (or right) axis.
    pub(super) fn py(&self, v: f64, right: bool) -> f32 {
        let axis = if right { self.right.as_ref().unwrap_or(&self.left) } else { &self.left };
        let f = ((v - axis.min) / (axis.max - axis.min)) as f32;
        if self.left_down && !right { self.y + f * self.h } else { self.y + self.h - f * self.h }
    }

    /// Draw the chart.
    pub fn draw(&self, c: &mut Canvas) {
        c.text(self.x, self.y - 3.0, 9.0, true, &self.title);
        self.grid_and_ticks(c);
        self.vlines(c);
        for s in &self.series {
            let pts: Vec<(f32, f32)> = s.points.iter().map(|&(x, y)| (self.px(x), self.py(y, s.right))).collect();
            if !s.markers_only {
                c.polyline(&pts, 0.45, s.dash, 0.0);
            }
            if s.marker != Marker::None {
                let stride = if s.markers_only { 1 } else { (pts.len() / 12).max(1) };
                for p in pts.iter().step_by(stride) {
                    c.marker(p.0, p.1, s.marker, 1.6);
                }
            }
        }
        let (x0, x1) = self.x_range();
        for l in &self.limits {
            for pts in &l.lines {
                let inside = pts.iter().filter(|p| p.0 >= x0 - 1e-9 && p.0 <= x1 + 1e-9);
                let pts: Vec<(f32, f32)> = inside.map(|&(x, y)| (self.px(x), self.py(y, false))).collect();
                c.polyline(&pts, LIMIT_WIDTH, l.dash, LIMIT_GREY);
            }
        }
        c.rect(self.x, self.y, self.w, self.h, 0.35);
        self.legend(c);
    }

    /// Vertical marker lines with their labels reading upwards from the
    /// bottom; a label that would overlap one drawn close to its left is
    /// stacked above it instead.
    fn vlines(&self, c: &mut Canvas) {
        const SIZE: f32 = 7.0;
        let mut marks: Vec<(f32, &str)> = self.vlines.iter().map(|(x, l)| (self.px(*x), l.as_str())).collect();
        marks.sort_by(|a, b| a.0.total_cmp(&b.0));
        let mut placed: Vec<(f32, f32)> = Vec::new();
        for (px, label) in marks {
            c.line((px, self.y), (px, self.y + self.h), 0.25, Dash::Dotted, 0.4);
            let len = c.fonts.width(label, SIZE, false);
            let base = placed
                .iter()
                .filter(|(x, _)| px - x < 2.8)
                .map(|(_, top)| top - 1.5)
                .fold(self.y + self.h - 1.0, f32::min);
            c.text_up(px - 0.8, base, SIZE, label);
            placed.push((px, base - len));
        }
    }

    fn grid_and_ticks(&self, c: &mut Canvas) {
        let (x0, x1) = self.x_range();
        let bottom = self.y + self.h;
        match &self.x_axis {
            XAxis::Dates { start, label, .. } => {
                for (x, text) in date_ticks(*start, x0, x1) {
                    let px = self.px(x);
                    c.line((px, self.y), (px, bottom), 0.1, Dash::Solid, 0.8);
                    c.text_center(px, bottom + 3.5, 6.5, false, &text);
                }
                c.text_center(self.x + 0.5 * self.w, bottom + 7.5, 7.0, false, label);
            }
            XAxis::Linear(a) => {
                let step = nice_step(a.max - a.min, 6.0);
                for t in ticks(a.min, a.max, 6.0) {
                    let px = self.px(t);
                    c.line((px, self.y), (px, bottom), 0.1, Dash::Solid, 0.8);
                    c.text_center(px, bottom + 3.5, 6.5, false, &tick_label(t, step));
                }
                c.text_center(self.x + 0.5 * self.w, bottom + 7.5, 7.0, false, &a.label);
            }
            XAxis::Count(a) => {
                let step = nice_step(a.max - a.min, 12.0).max(1.0).ceil();
                let mut t = a.min.ceil();
                while t <= a.max + 1e-9 {
                    let px = self.px(t);
                    c.line((px, self.y), (px, bottom), 0.1, Dash::Solid, 0.8);
                    c.text_center(px, bottom + 3.5, 6.5, false, &format!("{t:.0}"));
                    t += step;
                }
                c.text_center(self.x + 0.5 * self.w, bottom + 7.5, 7.0, false, &a.label);
            }
        }
        let step = nice_step(self.left.max - self.left.min, 5.0);
        for t in ticks(self.left.min, self.left.max, 5.0) {
            let py = self.py(t, false);
            c.line((self.x, py), (self.x + self.w, py), 0.1, Dash::Solid, 0.8);
            c.text_right(self.x - 1.2, py + 1.0, 6.5, false, &tick_label(t, step));
        }
        c.text_up(self.x - 9.5, self.y + self.h, 7.0, &self.left.label);
        if let Some(r) = &self.right {
            let step = nice_step(r.max - r.min, 5.0);
            for t in ticks(r.min, r.max, 5.0) {
                let py = self.py(t, true);
                c.line((self.x + self.w, py), (self.x + self.w + 1.2, py), 0.3, Dash::Solid, 0.0);
                c.text(self.x + self.w + 1.8, py + 1.0, 6.5, false, &tick_label(t, step));
            }
            c.text_up(self.x + self.w + 10.5, self.y + self.h, 7.0, &r.label);
        }
    }

    /// Legend in rows under the x-axis label, wrapping within the width:
    /// the series, then the alarm limits.
    fn legend(&self, c: &mut Canvas) {
        let entries = self.series.iter().map(|s| (&s.label, s.dash, !s.markers_only, s.marker, 0.0, 0.45));
        let limits = self.limits.iter().map(|l| (&l.label, l.dash, true, Marker::None, LIMIT_GREY, LIMIT_WIDTH));
        let mut x = self.x;
        let mut y = self.y + self.h + 12.5;
        for (label, dash, line, marker, grey, width) in entries.chain(limits) {
            let w = c.fonts.width(label, 6.5, false) + 16.0;
            if x + w > self.x + self.w && x > self.x {
                x = self.x;
                y += 4.0;
            }
            if line {
                c.line((x, y - 1.0), (x + 9.0, y - 1.0), width, dash, grey);
            }
            if marker != Marker::None {
                c.marker(x + 4.5, y - 1.0, marker, 1.6);
            }
            c.text(x + 11.0, y, 6.5, false, label);
            x += w;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn nice_steps() {
        assert_eq!(nice_step(10.0, 5.0), 2.0);
        assert_eq!(nice_step(7.5, 5.0), 2.0);
        assert_eq!(nice_step(0.9, 5.0), 0.2);
        assert_eq!(ticks(0.0, 1.0, 4.0), vec![0.0, 0.25, 0.5, 0.75, 1.0]);
    }

    #[test]
    fn a_short_programme_gets_weekly_ticks_and_a_long_one_yearly() {
        // 2027-04-05 is a Monday (calendar): a 40-day span gets Mondays
        // every week, 6 of them (days 0, 7, …, 35).
        let start = NaiveDate::from_ymd_opt(2027, 4, 5).unwrap();
        let t = date_ticks(start, 0.0, 40.0);
        assert_eq!(t.iter().map(|x| x.0).collect::<Vec<_>>(), vec![0.0, 7.0, 14.0, 21.0, 28.0, 35.0]);
        assert_eq!(t[1].1, "12 Apr");
        // 32 years: ticks every 5 years on 1 January, labelled by year.
        let t = date_ticks(start, 0.0, 32.0 * 365.25);
        assert_eq!(
            t.iter().map(|x| x.1.as_str()).collect::<Vec<_>>(),
            vec!["2030", "2035", "2040", "2045", "2050", "2055"]
        );
    }
}
