//! The pages of the PDF schedule: title block, summary, lift timetable,
//! figures, inputs, methods and assumptions, cautions and monitoring plan. Each
//! function draws one kind of page on a canvas; `super::Pdf` assembles them.

use super::canvas::{Canvas, Dash, PAGE_H, PAGE_W};
use crate::model::{DAYS_PER_YEAR, LayerKind, Preconsolidation, ProjectInfo, StrengthModel};
use crate::report::PlanReport;
use crate::report::fixed as f;
use crate::schedule::planner::StageKind;

pub const MARGIN: f32 = 12.0;
/// Top of the title block, mm from the top.
pub const BLOCK_TOP: f32 = PAGE_H - MARGIN - 20.0;
/// First line of content.
pub const CONTENT_TOP: f32 = MARGIN + 12.0;

/// Everything a page needs besides the canvas.
pub struct Ctx<'a> {
    pub r: &'a PlanReport<'a>,
    pub report_date: chrono::NaiveDate,
}

/// What the title block of every page shows.
pub struct Title<'a> {
    pub info: &'a ProjectInfo,
    /// Where the inputs came from.
    pub source: &'a str,
    pub date: chrono::NaiveDate,
    /// The kind of document, top right of each page.
    pub document: &'a str,
}

impl Ctx<'_> {
    /// The schedule's title block.
    pub fn title(&self) -> Title<'_> {
        Title {
            info: &self.r.project.info,
            source: &self.r.source,
            date: self.report_date,
            document: "fillpace staged construction schedule",
        }
    }
}

/// Heading line and the title block with page x of y and signature boxes.
pub fn frame(c: &mut Canvas, t: &Title, heading: &str, page: usize, pages: usize) {
    let info = t.info;
    c.text(MARGIN, MARGIN + 4.0, 13.0, true, heading);
    c.text_right(PAGE_W - MARGIN, MARGIN + 4.0, 7.5, false, t.document);
    c.line((MARGIN, MARGIN + 6.5), (PAGE_W - MARGIN, MARGIN + 6.5), 0.3, Dash::Solid, 0.0);
    let (x, y, w, h) = (MARGIN, BLOCK_TOP, PAGE_W - 2.0 * MARGIN, 20.0);
    c.rect(x, y, w, h, 0.4);
    let cols = [x + 105.0, x + 150.0];
    for cx in cols {
        c.line((cx, y), (cx, y + h), 0.3, Dash::Solid, 0.0);
    }
    c.text(x + 2.0, y + 5.0, 8.5, true, &info.title);
    c.text(x + 2.0, y + 10.0, 7.0, false, &format!("Reference {}", info.reference));
    c.text(x + 2.0, y + 14.5, 7.0, false, &info.location);
    let source = c.fit_left(&format!("Source: {}", t.source), cols[0] - x - 4.0, 6.0, false);
    c.text(x + 2.0, y + 18.5, 6.0, false, &source);
    c.text(cols[0] + 2.0, y + 5.0, 7.0, false, &format!("Revision {}", info.revision));
    c.text(cols[0] + 2.0, y + 10.0, 7.0, false, &format!("Date {}", t.date));
    c.text(cols[0] + 2.0, y + 15.0, 8.0, true, &format!("Page {page} of {pages}"));
    c.text(cols[0] + 2.0, y + 19.0, 5.5, false, &crate::report::program_version());
    let box_w = (x + w - cols[1]) / 3.0;
    for (i, role) in ["Prepared", "Checked", "Approved"].iter().enumerate() {
        let bx = cols[1] + i as f32 * box_w;
        if i > 0 {
            c.line((bx, y), (bx, y + h), 0.3, Dash::Solid, 0.0);
        }
        c.text(bx + 2.0, y + 4.5, 7.0, true, role);
        c.text(bx + 2.0, y + 10.5, 6.5, false, "Name");
        c.line((bx + 10.0, y + 10.8), (bx + box_w - 2.0, y + 10.8), 0.2, Dash::Solid, 0.3);
        c.text(bx + 2.0, y + 16.5, 6.5, false, "Date");
        c.line((bx + 10.0, y + 16.8), (bx + box_w - 2.0, y + 16.8), 0.2, Dash::Solid, 0.3);
    }
}

/// A table at (x, y); columns (header, width mm, right-aligned); a text
/// wider than its left-aligned column wraps onto more lines of the row
/// (measured with the font). Returns the y below it.
pub fn table(c: &mut Canvas, x: f32, y: f32, cols: &[(&str, f32, bool)], rows: &[Vec<String>], size: f32) -> f32 {
    let lead = size * 0.62;
    let below = 0.3 * lead;
    let total: f32 = cols.iter().map(|c| c.1).sum();
    // Rows band from the top of their first line to below their last.
    let band = |c: &mut Canvas, first: f32, last: f32, level: f32| {
        let (top, bottom) = (first - lead + below, last + below);
        c.fill(&[(x, top), (x + total, top), (x + total, bottom), (x, bottom)], level, false);
    };
    let lines = |c: &Canvas, row: &[String], bold: bool| -> Vec<Vec<String>> {
        cols.iter()
            .zip(row)
            .map(|((_, w, right), cell)| if *right { vec![cell.clone()] } else { c.wrap(cell, w - 2.0, size, bold) })
            .collect()
    };
    // Draws a row whose first baseline is `base`; returns its last baseline.
    let cells = |c: &mut Canvas, base: f32, row: &[Vec<String>], bold: bool| -> f32 {
        let mut cx = x;
        for ((_, w, right), cell) in cols.iter().zip(row) {
            for (k, l) in cell.iter().enumerate() {
                let at = base + k as f32 * lead;
                if *right { c.text_right(cx + w - 1.0, at, size, bold, l) } else { c.text(cx + 1.0, at, size, bold, l) }
            }
            cx += w;
        }
        base + (row.iter().map(Vec::len).max().unwrap_or(1).max(1) - 1) as f32 * lead
    };
    let head: Vec<String> = cols.iter().map(|c| c.0.to_string()).collect();
    let head = lines(c, &head, true);
    let n_head = head.iter().map(Vec::len).max().unwrap_or(1).max(1);
    band(c, y, y + (n_head - 1) as f32 * lead, 0.85);
    let mut base = cells(c, y, &head, true);
    c.line((x, base + below), (x + total, base + below), 0.3, Dash::Solid, 0.0);
    for (k, row) in rows.iter().enumerate() {
        let row = lines(c, row, false);
        let first = base + lead;
        let n = row.iter().map(Vec::len).max().unwrap_or(1).max(1);
        if k % 2 == 1 {
            band(c, first, first + (n - 1) as f32 * lead, 0.94);
        }
        base = cells(c, first, &row, false);
    }
    c.line((x, base + below), (x + total, base + below), 0.3, Dash::Solid, 0.0);
    base + lead
}

/// Page 1: the summary.
pub fn summary(c: &mut Canvas, ctx: &Ctx) {
    let (p, pl) = (ctx.r.project, ctx.r.plan);
    let e = &p.embankment;
    let drains = p.drains.as_ref().map_or("none".to_string(), |d| {
        format!(
            "{} pattern at {:.2} m, dw = {:.0} mm, to {:.1} m depth",
            d.pattern.label(),
            d.spacing_m,
            d.diameter_m * 1000.0,
            d.depth_m
        )
    });
    let min_stage = pl.stages.iter().find(|s| s.number == pl.min_fs_stage);
    let rows: Vec<Vec<String>> = [
        ("Design height", format!("{:.2} m above original ground", e.design_height_m)),
        ("Surcharge", format!("{:.2} m", e.surcharge_height_m)),
        ("Vertical drains", drains),
        (
            "FS targets",
            format!(
                "{:.2} at the end of every lift; {:.2} in service",
                p.criteria.fs_construction, p.criteria.fs_service
            ),
        ),
        ("Start of earthworks", p.info.start_date.format("%Y-%m-%d (%a)").to_string()),
        (
            "Finish",
            format!(
                "{} — {} days ({:.1} months)",
                pl.finish.format("%Y-%m-%d (%a)"),
                pl.duration_days,
                pl.duration_days as f64 / 30.44
            ),
        ),
        ("Lifts", format!("{}", pl.stages.iter().filter(|s| s.kind == StageKind::Lift).count())),
        ("Lowest FS", format!("{:.2} at the end of stage {}", pl.min_fs, pl.min_fs_stage)),
        ("FS at finish", format!("{:.3}", pl.fs_finish)),
        ("Stage geometry", pl.stage_shape.describe().to_string()),
        ("Fill face check", format!("infinite slope with {}", p.stability.face_strength.describe())),
        (
            "Settlement (centreline)",
            format!(
                "{:.3} m at finish; {:.3} m final primary under the final profile (design crest + make-up)",
                pl.settlement_at_finish_m, pl.final_primary_settlement_m
            ),
        ),
        (
            "Residual settlement",
            format!(
                "{:.3} m over {} years after the finish ({:.3} m primary + {:.3} m secondary)",
                pl.residual_settlement_m, p.info.design_life_years, pl.residual_primary_m, pl.residual_secondary_m
            ),
        ),
        (
            "Fill per metre run",
            format!(
                "{:.1} m³ design profile + {:.1} m³ make-up + {:.1} m³ surcharge (removed)",
                pl.volume_design_m3_per_m, pl.volume_makeup_m3_per_m, pl.volume_surcharge_m3_per_m
            ),
        ),
    ]
    .into_iter()
    .map(|(a, b)| vec![a.to_string(), b])
    .collect();
    let mut y = table(c, MARGIN, CONTENT_TOP + 4.0, &[("Item", 55.0, false), ("Value", 150.0, false)], &rows, 8.0);
    y += 6.0;
    if let Some(s) = min_stage {
        let bottom = if s.circle_depth_m > 0.0 {
            format!(
                "passes {:.1} m below original ground with its lowest point in the {}, where su is {:.1} kPa",
                s.circle_depth_m, s.mechanism, s.su_governing_kpa
            )
        } else {
            format!("stays above original ground, its lowest point in the {}", s.mechanism)
        };
        let sentence = format!(
            "Governing mechanism: at the end of stage {} (crest {:.2} m) the critical slip circle {bottom}; FS = {:.2} against a target of {:.2}.",
            s.number, s.height_after_m, s.fs_end, p.criteria.fs_construction
        );
        y = c.paragraph(MARGIN, y, 250.0, 8.5, &sentence) + 3.0;
    }
    for w in &pl.warnings {
        y = c.paragraph(MARGIN, y, 250.0, 8.0, &format!("Warning: {w}"));
    }
    y += 3.0;
    c.text(MARGIN, y, 8.5, true, "Cautions (in full on the last page)");
    y += 5.0;
    for note in crate::report::cautions() {
        y = c.paragraph(MARGIN + 3.0, y, 255.0, 7.5, &format!("• {note}"));
    }
}

/// Column layout of the timetable.
/// Widths (mm) and alignment of the `STAGE_COLUMNS` in the PDF.
const TIMETABLE_WIDTHS: [(f32, bool); 15] = [
    (7.0, true),
    (22.0, false),
    (23.0, false),
    (23.0, false),
    (12.0, true),
    (13.0, true),
    (14.0, true),
    (12.0, true),
    (11.0, true),
    (28.0, false),
    (12.0, true),
    (18.0, true),
    (14.0, true),
    (14.0, true),
    (50.0, false),
];

/// Rows of the timetable, all stages.
pub fn timetable_rows(ctx: &Ctx) -> Vec<Vec<String>> {
    ctx.r.plan.stages.iter().map(crate::report::stage_cells).collect()
}

/// Rows of the timetable that fit on one page.
pub const TIMETABLE_ROWS_PER_PAGE: usize = 30;

/// A page of the timetable (rows already sliced), header repeated.
pub fn timetable(c: &mut Canvas, rows: &[Vec<String>], first: bool) {
    let mut y = CONTENT_TOP + 2.0;
    if first {
        y = c.paragraph(
            MARGIN,
            y,
            270.0,
            7.5,
            "Each lift is placed on working days only at the construction rate; the next lift starts on its release date only after the hold-point check. 'lift m' is the rise of the crest; 'placed m' the fill thickness including make-up for settlement; U is the average degree of consolidation under the centreline at release.",
        ) + 3.0;
    }
    let cols: Vec<(&str, f32, bool)> =
        crate::report::STAGE_COLUMNS.iter().zip(TIMETABLE_WIDTHS).map(|(h, (w, r))| (*h, w, r)).collect();
    table(c, MARGIN, y, &cols, rows, 7.0);
}

/// Inputs: layers, drains, construction and calendar, criteria, SHA-256.
pub fn inputs(c: &mut Canvas, ctx: &Ctx) {
    let p = ctx.r.project;
    let mut rows = Vec::new();
    let mut top = 0.0;
    for l in &p.ground.layers {
        let (kind, props) = match &l.kind {
            LayerKind::Clay(cl) => {
                let pre = match cl.preconsolidation {
                    Preconsolidation::Ocr(o) => format!("OCR {o}"),
                    Preconsolidation::PopKpa(v) => format!("POP {v} kPa"),
                    Preconsolidation::SigmaPKpa(v) => format!("σ'p {v} kPa"),
                };
                let st = match cl.strength.model {
                    StrengthModel::Shansep { s, m } => format!("SHANSEP S {s}, m {m}"),
                    StrengthModel::GainRatio { ratio } => format!("gain ratio {ratio}"),
                };
                (
                    "clay",
                    format!(
                        "e0 {} · Cc {} · Cr {} · Cα {} · {pre} · cv {:.2} m²/year · ch {:.2} m²/year · {st}{}",
                        cl.e0,
                        cl.cc,
                        cl.cr,
                        cl.c_alpha,
                        cl.cv_m2_per_day * DAYS_PER_YEAR,
                        cl.ch_m2_per_day * DAYS_PER_YEAR,
                        if cl.strength.su0_points.is_empty() {
                            String::new()
                        } else {
                            " · su0 measured (next page)".into()
                        }
                    ),
                )
            }
            LayerKind::Sand { friction_deg, cohesion_kpa } => {
                ("sand", format!("φ' {friction_deg}° · c' {cohesion_kpa} kPa"))
            }
            LayerKind::StiffBase => ("stiff base", "no slip surface passes through it".into()),
        };
        rows.push(vec![
            l.name.clone(),
            kind.into(),
            f(top, 2),
            if matches!(l.kind, LayerKind::StiffBase) { "-".into() } else { f(l.thickness_m, 2) },
            format!("{} / {}", l.unit_weight_kn_m3, l.saturated_unit_weight_kn_m3),
            props,
        ]);
        top += l.thickness_m;
    }
    c.text(
        MARGIN,
        CONTENT_TOP + 2.0,
        9.0,
        true,
        &format!(
            "Ground (groundwater {:.2} m below original ground; base {})",
            p.ground.groundwater_depth_m,
            if p.ground.base_drained { "drained" } else { "undrained" }
        ),
    );
    let mut y = table(
        c,
        MARGIN,
        CONTENT_TOP + 7.0,
        &[
            ("layer", 40.0, false),
            ("kind", 16.0, false),
            ("top m", 12.0, true),
            ("thick m", 13.0, true),
            ("γ / γsat kN/m³", 22.0, true),
            ("properties", 170.0, false),
        ],
        &rows,
        6.8,
    ) + 5.0;
    let e = &p.embankment;
    let k = &p.construction;
    let lines = [
        format!(
            "Embankment: design height {} m, crest {} m, side slopes {}H:1V, fill γ {} kN/m³, c' {} kPa, φ' {}°, surcharge {} m, berms {}, reinforcement {} kN/m; stages {}.",
            e.design_height_m,
            e.crest_width_m,
            e.side_slope_h_per_v,
            e.fill_unit_weight_kn_m3,
            e.fill_cohesion_kpa,
            e.fill_friction_deg,
            e.surcharge_height_m,
            if e.berms.is_empty() {
                "none".into()
            } else {
                e.berms
                    .iter()
                    .map(|b| {
                        format!(
                            "{} m wide at {} m raised from a {} m crest",
                            b.width_m, b.height_m, b.placed_from_height_m
                        )
                    })
                    .collect::<Vec<_>>()
                    .join(", ")
            },
            e.reinforcement_kn_per_m,
            e.stage_shape.label()
        ),
        match &p.drains {
            Some(d) => format!(
                "Drains: {} pattern at {} m (de = {:.3} m), dw = {:.0} mm, to {} m, smear ratio {}, kh/ks {}, qw {}.",
                d.pattern.label(),
                d.spacing_m,
                d.influence_diameter_m(),
                d.diameter_m * 1000.0,
                d.depth_m,
                d.smear_ratio,
                d.kh_over_ks,
                d.discharge_m3_per_day.map_or("infinite".into(), |q| format!("{:.0} m³/year", q * DAYS_PER_YEAR))
            ),
            None => "Drains: none.".into(),
        },
        format!(
            "Construction: {} m per working day; lifts {}–{} m in steps of {} m; minimum rest {} days; working days {}; weather downtime {:.0}%; holidays as listed on the next page ({} days).",
            k.placement_rate_m_per_day,
            k.lift_min_m,
            k.lift_max_m,
            k.lift_increment_m,
            k.min_rest_days,
            k.working_days.iter().map(|d| d.to_string()).collect::<Vec<_>>().join(" "),
            100.0 * k.weather_downtime_fraction,
            k.holidays.len()
        ),
        format!(
            "Criteria: FS ≥ {} at the end of every lift, {} in service; surcharge removal at {}.",
            p.criteria.fs_construction,
            p.criteria.fs_service,
            match (p.criteria.surcharge_removal_degree, p.criteria.residual_settlement_limit_m) {
                (Some(u), _) => format!("U ≥ {:.0}% under the centreline", 100.0 * u),
                (None, Some(s)) => format!("residual settlement ≤ {s} m"),
                _ => "U ≥ 90% (default)".into(),
            }
        ),
        format!(
            "Analysis: {} consolidation, pore pressure {}, node spacing ≤ {} m, steps {} / {} days; stability: {} slices, fill strength factor {}, tension crack {}, fill ru {}; FS is the lower of the critical circle and the fill face as an infinite slope, the face checked with {}.",
            p.analysis.mode.describe(),
            match p.analysis.pore_pressure {
                crate::model::PorePressureRule::Vertical => "Δu = Δσz".to_string(),
                crate::model::PorePressureRule::Skempton { a, b } => format!("Skempton A = {a}, B = {b}"),
            },
            p.analysis.max_node_spacing_m,
            p.analysis.placement_step_days,
            p.analysis.rest_step_days,
            p.stability.slices,
            p.stability.fill_strength_factor,
            if p.stability.fill_tension_crack {
                format!(
                    "tried on every circle (2c'/(γ√Ka), lower FS kept, {:.0}% water-filled)",
                    100.0 * p.stability.crack_water_fraction
                )
            } else {
                "none".to_string()
            },
            p.stability.fill_ru,
            p.stability.face_strength.describe()
        ),
    ];
    for l in lines {
        y = c.paragraph(MARGIN, y, 270.0, 7.5, &l) + 1.5;
    }
    y += 2.0;
    c.text(MARGIN, y, 7.5, true, "Project file SHA-256:");
    c.text(MARGIN + 30.0, y, 7.5, false, &ctx.r.source_sha256);
}

/// Methods and assumptions (not a contractor's method statement).
pub fn methods(c: &mut Canvas) {
    let items = [
        (
            "Stresses",
            "2-D elastic (plane strain) solutions for uniform and linearly varying strip loads, integrated from Flamant's line load (Poulos & Davis 1974, Elastic Solutions for Soil and Rock Mechanics); the embankment's piecewise-linear profile is superposed. Osterberg (1957) is the centreline special case.",
        ),
        (
            "Pore pressure",
            "Excess pore pressure generated equals the increment of vertical total stress (one-dimensional loading), or Skempton's (1954) A and B with the 2-D principal stress increments where selected.",
        ),
        (
            "Consolidation",
            "Terzaghi's (1925) one-dimensional consolidation by finite differences on six vertical columns across the half-width, multi-layer with series conductances at interfaces, θ-scheme time stepping (fully implicit after every change of load, which with the make-up for settlement is nearly every step; Crank–Nicolson under constant load), tridiagonal solution.",
        ),
        (
            "Vertical drains",
            "Radial consolidation towards drains as a sink term λ = 8 ch/(de² μ) within the drain depth: Hansbo's (1981) equal-strain solution with smear and well resistance; de = 1.05 s (triangular) or 1.128 s (square) (Barron 1948); band-drain equivalent diameter (a + b)/2 (Rixner et al. 1986). Combined with vertical flow this approximates Carrillo's (1942) rule.",
        ),
        (
            "Settlement",
            "e–log σ' compression with Cr up to σ'p and Cc beyond, swelling with Cr on unloading; small strain; secondary compression (Cα) after the finish in the residual settlement. Settlement make-up fill and the buoyancy of fill settled below the water table are part of the load history.",
        ),
        (
            "Strength",
            "Undrained strength by SHANSEP, su = S σ'v (σ'p/σ'v)^m (Ladd & Foott 1974; Ladd 1991), σ'p being the largest effective stress reached, or by a gain ratio; never below the measured in-situ profile.",
        ),
        (
            "Stability",
            "Limit equilibrium on circular slip surfaces by Bishop's (1955) simplified method (Ordinary method of Fellenius 1927 alongside), at least 30 slices; clay undrained with su sampled from the consolidating strength field; fill and sand drained. Each circle also tried with a Rankine tension crack in the fill (2c'/(γ√Ka), reduced strength, at most the fill thickness), the lower FS kept; a fill with no strength is a load and every surface passes through the ground. Bishop's method falls back to the Ordinary method where m_α < 0.2 (counted and warned). Grid search of centres and tangent depths with pattern refinement in each depth band; the fill face is checked as an infinite slope and the lower FS governs.",
        ),
        (
            "Timetable",
            "Thickest lift meeting the FS target at each stage by bisection over lift thicknesses; shortest rest to the day by bracketing and false position, relying on FS falling with lift thickness and rising with rest; working-day calendar with holidays and weather downtime; consolidation on every calendar day.",
        ),
    ];
    let assumptions = "Assumptions and limits: plane strain section (long embankment); saturated clay; horizontally layered ground; small-strain consolidation; stability checked undrained at the end of each placement on circular surfaces only (non-circular failures along thin weak layers are not found); parameters are best estimates without partial factors. Outside these limits the results are not valid.";
    let mut y = CONTENT_TOP + 2.0;
    for (head, text) in items {
        c.text(MARGIN, y, 8.0, true, head);
        y = c.paragraph(MARGIN + 30.0, y, 240.0, 7.8, text) + 1.5;
    }
    y += 2.0;
    c.paragraph(MARGIN, y, 270.0, 7.8, assumptions);
}

/// Caution notes and the monitoring plan.
pub fn cautions_and_monitoring(c: &mut Canvas, ctx: &Ctx) {
    let mut y = CONTENT_TOP + 2.0;
    c.text(MARGIN, y, 10.0, true, "CAUTION NOTES");
    y += 6.0;
    for note in crate::report::cautions() {
        y = c.paragraph(MARGIN + 3.0, y, 265.0, 8.3, &format!("• {note}")) + 1.0;
    }
    y += 4.0;
    c.text(MARGIN, y, 10.0, true, "MONITORING PLAN (common practice; the engineer of record sets the final scope)");
    y += 5.0;
    let rows: Vec<Vec<String>> = [
        [
            "Piezometers",
            "centreline at quarter points of the soft clay; under the crest edge and toe at mid-depth",
            "daily",
            "twice weekly, weekly after 4 weeks",
            "monthly",
        ],
        [
            "Settlement plates",
            "centreline and both crest edges, on the original ground",
            "daily",
            "twice weekly",
            "monthly",
        ],
        [
            "Toe markers / inclinometers",
            "at the toe and 5–10 m beyond it, both sides",
            "daily",
            "twice weekly",
            "monthly",
        ],
        ["Visual inspection", "fill surface, crest, slopes, ground beyond the toe", "every shift", "weekly", "monthly"],
    ]
    .iter()
    .map(|r| r.iter().map(|s| s.to_string()).collect())
    .collect();
    y = table(
        c,
        MARGIN,
        y,
        &[
            ("instrument", 40.0, false),
            ("position", 110.0, false),
            ("during placement", 28.0, false),
            ("during rests", 50.0, false),
            ("after works", 25.0, false),
        ],
        &rows,
        7.2,
    ) + 4.0;
    let fs = ctx.r.project.criteria.fs_construction;
    let criteria = format!(
        "Hold-point criteria before each release (common practice; thresholds to be confirmed by the engineer of record): excess pore pressure falling under constant load at every piezometer and not above the predicted value at the same date; settlement rate decreasing; no acceleration of lateral movement at the toe and a ratio of toe lateral movement to centreline settlement increments well below about 0.5; no cracks or heave; factor of safety recomputed with the readings not below {fs:.2} for the next lift."
    );
    c.paragraph(MARGIN, y, 270.0, 7.8, &criteria);
}
