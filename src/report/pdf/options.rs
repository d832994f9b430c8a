//! PDF pages of the design-option comparison (table and a duration chart)
//! and of the Monte Carlo (summary with the per-stage table; finish-date
//! histogram and FS distribution per stage).

use super::canvas::{Canvas, Dash, Marker, PAGE_W};
use super::chart::{Axis, Chart, Series, XAxis};
use super::pages::{BLOCK_TOP, CONTENT_TOP, MARGIN, table};
use crate::report::{CompareReport, RiskReport};

const MARKS: [Marker; 3] = [Marker::Circle, Marker::Square, Marker::Triangle];
const DASHES: [Dash; 4] = [Dash::Solid, Dash::Dashed, Dash::Chain, Dash::Dotted];

/// The comparison: table of every variant, then duration against the first
/// varied key (one line per combination of the others) when its values are
/// numbers, else against the variant number.
pub fn comparison_page(c: &mut Canvas, r: &CompareReport) {
    let cmp = r.comparison;
    let widths = [8.0, 66.0, 12.0, 22.0, 12.0, 14.0, 22.0, 18.0, 18.0, 18.0, 63.0];
    let cols: Vec<(&str, f32, bool)> = crate::report::COMPARE_COLUMNS
        .iter()
        .zip(widths)
        .enumerate()
        .map(|(i, (h, w))| (*h, w, i != 1 && i != 3 && i != 10))
        .collect();
    let shown = cmp.variants.len().min(24);
    let rows: Vec<Vec<String>> = cmp.variants[..shown].iter().map(crate::report::compare_cells).collect();
    let mut y = c.paragraph(
        MARGIN,
        CONTENT_TOP,
        PAGE_W - 2.0 * MARGIN,
        8.0,
        &format!(
            "{} variants of {}, each planned to FS {:.2} at the end of every lift, sorted by finish date{}.",
            cmp.variants.len(),
            r.source,
            r.project.criteria.fs_construction,
            if shown < cmp.variants.len() { format!("; the first {shown} are listed") } else { String::new() }
        ),
    );
    y = table(c, MARGIN, y + 5.0, &cols, &rows, 7.0);
    let first = &cmp.keys[0];
    let numeric = |v: &crate::compare::Variant| v.settings[0].value.parse::<f64>().ok();
    let by_key = cmp.variants.iter().all(|v| numeric(v).is_some());
    let mut groups: Vec<(String, Vec<(f64, f64)>)> = Vec::new();
    for v in &cmp.variants {
        let Some(o) = &v.outcome else { continue };
        let x = if by_key { numeric(v).unwrap_or(0.0) } else { v.number as f64 };
        let rest: Vec<String> = v.settings[1..].iter().map(|s| format!("{}={}", s.key, s.value)).collect();
        let name = if rest.is_empty() { "duration".to_string() } else { rest.join(", ") };
        match groups.iter_mut().find(|g| g.0 == name) {
            Some(g) => g.1.push((x, o.duration_days as f64)),
            None => groups.push((name, vec![(x, o.duration_days as f64)])),
        }
    }
    for g in &mut groups {
        g.1.sort_by(|a, b| a.0.total_cmp(&b.0));
    }
    let xs = groups.iter().flat_map(|g| g.1.iter().map(|p| p.0));
    let (x0, x1) = xs.clone().fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), x| (a.min(x), b.max(x)));
    let d1 = groups.iter().flat_map(|g| g.1.iter().map(|p| p.1)).fold(0.0, f64::max);
    if groups.is_empty() {
        c.text(MARGIN, y + 10.0, 9.0, true, "No variant can be built, so there is no duration chart.");
        return;
    }
    let pad = if x1 > x0 { 0.05 * (x1 - x0) } else { 1.0 };
    // Room for the legend (two rows) above the title block.
    let h = (BLOCK_TOP - (y + 10.0) - 24.0).clamp(30.0, 80.0);
    cautions(c, MARGIN + 190.0, y + 8.0, PAGE_W - 2.0 * MARGIN - 190.0, None);
    Chart {
        x: MARGIN + 14.0,
        y: y + 10.0,
        w: 150.0,
        h,
        title: format!("Duration of the works against {}", if by_key { first.as_str() } else { "variant number" }),
        x_axis: XAxis::Linear(Axis {
            label: if by_key { first.clone() } else { "variant".into() },
            min: x0 - pad,
            max: x1 + pad,
        }),
        left: Axis { label: "duration (days)".into(), min: 0.0, max: (d1 * 1.1 / 50.0).ceil() * 50.0 },
        right: None,
        left_down: false,
        series: groups
            .into_iter()
            .enumerate()
            .map(|(i, (label, points))| Series {
                label,
                points,
                dash: DASHES[i % DASHES.len()],
                marker: MARKS[i % MARKS.len()],
                right: false,
                markers_only: !by_key,
            })
            .collect(),
        vlines: Vec::new(),
        limits: Vec::new(),
    }
    .draw(c);
}

/// Page 1 of the Monte Carlo: the parameters, the answers and the table of
/// stages.
pub fn risk_summary(c: &mut Canvas, r: &RiskReport) {
    let k = r.risk;
    let w = PAGE_W - 2.0 * MARGIN;
    let mut y = c.paragraph(
        MARGIN,
        CONTENT_TOP,
        w,
        8.0,
        &format!(
            "{} realisations (seed {}) of the uncertain parameters declared in {}. For each, (a) the best-estimate timetable (finish {}, lowest FS {:.2}) is checked with the realised ground, and (b) the works are planned afresh to FS {:.2}. Slip circles in the realisations start from the best-estimate plan's circles.",
            k.runs, k.seed, r.source, k.best_estimate_finish, k.best_estimate_min_fs, k.fs_target
        ),
    );
    let params: Vec<Vec<String>> = k.parameters.iter().map(crate::report::parameter_cells).collect();
    let widths = [34.0, 40.0, 18.0, 14.0, 14.0, 150.0];
    let cols: Vec<(&str, f32, bool)> = crate::report::PARAMETER_COLUMNS
        .iter()
        .zip(widths)
        .enumerate()
        .map(|(i, (h, w))| (*h, w, (2..5).contains(&i)))
        .collect();
    y = table(c, MARGIN, y + 5.0, &cols, &params, 7.0);
    let answers = crate::report::RiskAnswers::of(k);
    y += 4.0;
    let heads = [
        format!("Best-estimate timetable (finish {}) with the realised ground:", k.best_estimate_finish),
        "Each realisation planned afresh:".to_string(),
    ];
    for (head, lines) in heads.iter().zip([&answers.timetable, &answers.fresh]) {
        c.text(MARGIN, y, 8.5, true, head);
        y += 4.5;
        for l in lines {
            c.text(MARGIN + 4.0, y, 8.5, false, l);
            y += 4.5;
        }
    }
    if let Some(sentence) = &answers.reliability {
        y = c.paragraph(MARGIN, y, w, 8.5, sentence);
    }
    let widths = [8.0, 26.0, 22.0, 18.0, 18.0, 18.0, 14.0, 14.0, 20.0, 26.0];
    let cols: Vec<(&str, f32, bool)> = crate::report::RISK_STAGE_COLUMNS
        .iter()
        .zip(widths)
        .enumerate()
        .map(|(i, (h, w))| (*h, w, i != 1 && i != 2))
        .collect();
    let rows: Vec<Vec<String>> = k.stages.iter().map(crate::report::risk_stage_cells).collect();
    let y = table(c, MARGIN, y + 3.0, &cols, &rows, 7.0);
    cautions(c, MARGIN, y + 4.0, PAGE_W - 2.0 * MARGIN, Some(crate::report::RISK_CAUTION));
}

/// The caution notes in small type at (x, y), width w mm, with an extra
/// note first when given.
fn cautions(c: &mut Canvas, x: f32, y: f32, w: f32, extra: Option<&str>) {
    c.text(x, y, 8.0, true, "CAUTIONS");
    let mut y = y + 4.0;
    for note in extra.map(str::to_string).into_iter().chain(crate::report::cautions()) {
        y = c.paragraph(x, y, w, 6.8, &format!("• {note}")) + 0.5;
    }
}

/// Page 2 of the Monte Carlo: histogram of the fresh plans' finish dates
/// and the FS distribution at each stage of the timetable.
pub fn risk_charts(c: &mut Canvas, r: &RiskReport) {
    let k = r.risk;
    let start = r.project.info.start_date;
    let days: Vec<f64> = k.realisations.iter().filter_map(|x| x.duration_days.map(|d| d as f64 - 1.0)).collect();
    let (w, h) = (0.5 * (PAGE_W - 2.0 * MARGIN) - 22.0, 110.0);
    if let (Some(lo), Some(hi)) = (days.iter().copied().reduce(f64::min), days.iter().copied().reduce(f64::max)) {
        let bins = 20usize;
        let width = ((hi - lo) / bins as f64).max(7.0);
        let mut counts = vec![0usize; bins + 1];
        for d in &days {
            counts[(((d - lo) / width).floor() as usize).min(bins)] += 1;
        }
        let mut steps = Vec::new();
        for (i, n) in counts.iter().enumerate() {
            let a = lo + i as f64 * width;
            steps.extend([(a, 0.0), (a, *n as f64), (a + width, *n as f64), (a + width, 0.0)]);
        }
        let top = counts.iter().copied().max().unwrap_or(1) as f64;
        let mut vlines = vec![((k.best_estimate_duration_days - 1) as f64, "best estimate".to_string())];
        if let Some(s) = &k.duration_days {
            vlines.extend([(s.p10 - 1.0, "P10".into()), (s.p50 - 1.0, "P50".into()), (s.p90 - 1.0, "P90".into())]);
        }
        Chart {
            x: MARGIN + 14.0,
            y: CONTENT_TOP + 4.0,
            w,
            h,
            title: if days.len() < k.runs {
                format!("Finish date of the fresh plans: the {} of {} that can be built", days.len(), k.runs)
            } else {
                "Finish date of the fresh plans".into()
            },
            x_axis: XAxis::Dates { start, label: "finish".into(), min: lo - width, max: hi + 2.0 * width },
            left: Axis { label: "realisations".into(), min: 0.0, max: (top * 1.15).ceil() },
            right: None,
            left_down: false,
            series: vec![Series {
                label: format!("{} buildable of {}", days.len(), k.runs),
                points: steps,
                dash: Dash::Solid,
                marker: Marker::None,
                right: false,
                markers_only: false,
            }],
            vlines,
            limits: Vec::new(),
        }
        .draw(c);
    } else {
        c.text(MARGIN, CONTENT_TOP + 10.0, 9.0, true, "No realisation could be built: no finish-date histogram.");
    }
    let at = |pick: fn(&crate::risk::StageRisk) -> f64| -> Vec<(f64, f64)> {
        k.stages.iter().map(|s| (s.number as f64, pick(s))).collect()
    };
    let n = k.stages.len() as f64;
    let fs_hi = k.stages.iter().map(|s| s.fs.p90.max(s.fs_best_estimate)).fold(k.fs_target, f64::max);
    let fs_lo = k.stages.iter().map(|s| s.fs.p10).fold(1.0, f64::min);
    let level = |v: f64| vec![(0.5, v), (n + 0.5, v)];
    let series = |label: &str, points: Vec<(f64, f64)>, dash: Dash, marker: Marker, markers_only: bool| Series {
        label: label.into(),
        points,
        dash,
        marker,
        right: false,
        markers_only,
    };
    Chart {
        x: MARGIN + 14.0 + w + 30.0,
        y: CONTENT_TOP + 4.0,
        w,
        h,
        title: "FS at the end of each stage of the timetable".into(),
        x_axis: XAxis::Count(Axis { label: "stage".into(), min: 0.5, max: n + 0.5 }),
        left: Axis {
            label: "factor of safety".into(),
            min: ((fs_lo - 0.1) * 10.0).floor() / 10.0,
            max: ((fs_hi + 0.1) * 10.0).ceil() / 10.0,
        },
        right: None,
        left_down: false,
        series: vec![
            series("P90", at(|s| s.fs.p90), Dash::Dashed, Marker::Triangle, false),
            series("P50", at(|s| s.fs.p50), Dash::Solid, Marker::Circle, false),
            series("P10", at(|s| s.fs.p10), Dash::Dashed, Marker::Triangle, false),
            series("best estimate", at(|s| s.fs_best_estimate), Dash::Solid, Marker::Square, true),
            series(&format!("target {:.2}", k.fs_target), level(k.fs_target), Dash::Chain, Marker::None, false),
            series("FS 1.0", level(1.0), Dash::Dotted, Marker::None, false),
        ],
        vlines: Vec::new(),
        limits: Vec::new(),
    }
    .draw(c);
}
