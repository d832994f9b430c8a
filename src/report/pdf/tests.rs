//! Checks of the hold-point check record's pages on the demo hold point:
//! every text placed lies inside the page margins (the content above the
//! title block) with the longest texts the check really writes, the
//! instrument layout names every instrument, and the alarm limits drawn on
//! the plots agree with the project keys and with the rules' verdicts.

use super::canvas::{Canvas, Fonts, PAGE_H, PAGE_W};
use super::pages::{BLOCK_TOP, MARGIN, Title};
use crate::model::{InstrumentKind, Project};
use crate::monitoring::readings::{self, Readings};
use crate::monitoring::release::{self, IMMEDIATE_ACTIONS, Level, ReleaseCheck, Verdict};
use crate::report::ReleaseReport;

fn demo() -> (Project, Readings) {
    let p = crate::input::parse(crate::app::DEMO, "demo").expect("demo validates");
    let text = include_str!("../../../examples/kestrel-fen-readings.csv");
    let r = readings::parse(text, "kestrel-fen-readings.csv", &p).expect("demo readings");
    (p, r)
}

fn fonts() -> Fonts {
    super::fonts(&mut printpdf::PdfDocument::new("test")).expect("bundled fonts")
}

fn report<'a>(p: &'a Project, k: &'a ReleaseCheck) -> ReleaseReport<'a> {
    // Long paths and full hashes, as a site's folders give them.
    let dir = "/srv/projects/kestrel-fen-relief-road/section-3-embankment/monitoring/hold-points/2027";
    ReleaseReport {
        project: p,
        check: k,
        project_file: format!("{dir}/kestrel-fen.toml"),
        project_sha256: "9".repeat(64),
        record_file: format!("{dir}/kestrel-fen-hold-point-2027-07-05-record-12.pdf"),
        log: format!("{dir}/kestrel-fen.hold-point-log.jsonl"),
        record: 12,
        supersedes: Some(11),
        log_entries_before: 11,
        log_head_before: "f".repeat(64),
        log_head_after: String::new(),
    }
}

/// Texts outside the box [MARGIN, PAGE_W − MARGIN] × [top, bottom], mm.
fn outside(c: &Canvas, top: f32, bottom: f32) -> Vec<String> {
    const TOL: f32 = 0.01;
    c.placed
        .iter()
        .filter(|t| t.x0 < MARGIN - TOL || t.x1 > PAGE_W - MARGIN + TOL || t.y0 < top - TOL || t.y1 > bottom + TOL)
        .map(|t| format!("x {:.1}..{:.1}, y {:.1}..{:.1}: {}", t.x0, t.x1, t.y0, t.y1, t.text))
        .collect()
}

/// The content of page `i` on its own (no frame) and the whole page.
fn draw<'f>(fonts: &'f Fonts, r: &ReleaseReport, i: usize) -> (Canvas<'f>, Canvas<'f>) {
    let mut content = Canvas::new(fonts);
    match i {
        0 => super::certificate::decision_page(&mut content, r),
        1 => super::certificate::details_page(&mut content, r),
        2 => super::layout::layout_page(&mut content, r),
        _ => super::certificate::readings_page(&mut content, r),
    }
    let source = format!("{} and {}", r.project_file, r.check.readings_file);
    let date = r.check.hold_point.date();
    let title = Title { info: &r.project.info, source: &source, date, document: "fillpace hold-point check record" };
    let mut page = Canvas::new(fonts);
    super::record_page(&mut page, &title, r, i);
    (content, page)
}

fn joined(c: &Canvas) -> String {
    c.placed.iter().map(|t| t.text.as_str()).collect::<Vec<_>>().join(" ")
}

#[test]
fn every_text_of_the_record_lies_inside_the_margins_with_the_longest_real_texts() {
    let (p, r) = demo();
    // The longest texts the check writes: every rule failing with its real
    // detail, the monitoring scheme's shortfalls for every instrument (a
    // scheme asking for more than the demo has) among the hold reasons, the
    // top level's two distress reasons (as release::level words them) and
    // immediate actions, and the real warnings.
    let mut strict = p.clone();
    strict.monitoring.min_per_kind = [9, 9, 9];
    strict.monitoring.min_readings_since_lift = 99;
    strict.monitoring.max_age_days = [0.01; 3];
    let base = release::check(&strict, &r, 1.0, None).expect("check");
    assert!(!base.insufficient.is_empty());
    let fonts = fonts();
    // The test must exercise wrapping: a real rule detail is wider than the
    // rules table's detail column (151 mm at 7 pt).
    assert!(base.rules.iter().any(|x| fonts.width(&x.detail, 7.0, false) > 151.0));
    for level in [Level::CriteriaMet, Level::HoldForReview, Level::StopFilling] {
        let mut k = base.clone();
        k.recommendation = level;
        for rule in &mut k.rules {
            rule.verdict = Verdict::Fail;
        }
        if level == Level::StopFilling {
            k.actions = IMMEDIATE_ACTIONS.iter().map(|s| s.to_string()).collect();
            k.reasons = vec![
                format!(
                    "FS now {:.2} is below {:.2}: the section is near failure",
                    k.fs_now, p.monitoring.stop_fs_below
                ),
                "pore pressure is rising under constant load while lateral movement accelerates (distress)".into(),
            ];
        }
        let rep = report(&strict, &k);
        for i in 0..super::RECORD_PAGES.len() {
            let (content, page) = draw(&fonts, &rep, i);
            let bad = outside(&content, MARGIN + 6.5, BLOCK_TOP);
            assert!(bad.is_empty(), "{level:?}, page {}: content outside the margins: {bad:#?}", i + 1);
            let bad = outside(&page, MARGIN, PAGE_H - MARGIN);
            assert!(bad.is_empty(), "{level:?}, page {}: text outside the margins: {bad:#?}", i + 1);
        }
        // Nothing is lost to the wrapping: each rule's detail is on page 1
        // word for word (its lines follow each other in its cell).
        let (content, _) = draw(&fonts, &rep, 0);
        let text = joined(&content);
        for rule in &k.rules {
            assert!(text.contains(&rule.detail), "{level:?}: detail not on page 1: {}", rule.detail);
        }
    }
}

#[test]
fn the_layout_names_every_instrument_and_the_plots_carry_every_alarm_limit() {
    let (p, r) = demo();
    let k = release::check(&p, &r, 1.0, None).expect("check");
    let rep = report(&p, &k);
    let fonts = fonts();
    let (layout, _) = draw(&fonts, &rep, 2);
    let placed: Vec<&str> = layout.placed.iter().map(|t| t.text.as_str()).collect();
    for inst in &p.instruments {
        assert!(
            placed.iter().any(|t| t.split_whitespace().next() == Some(inst.id.as_str())),
            "{} not labelled",
            inst.id
        );
    }
    // Piezometer tips labelled with their level (P2 at 9.0 m in the demo
    // project file).
    assert!(placed.contains(&"P2 at -9.0 m"), "{placed:?}");
    let (plots, _) = draw(&fonts, &rep, 3);
    let text = joined(&plots);
    for needle in [
        "limit pore_rise_limit_kpa_per_week = 1.00 kPa/week",
        "limit pore_pressure_ratio_limit = 0.90",
        "limit settlement_rate_limit_mm_per_day = 20.00 mm/day",
        "limit lateral_rate_limit_mm_per_day = 5.00 mm/day",
        "limit lateral_ratio_limit = 0.50",
    ] {
        assert!(text.contains(needle), "{needle} not on the plots: {text}");
    }
}

#[test]
fn the_limit_lines_have_the_limiting_slope_and_agree_with_the_rules() {
    let (p, r) = demo();
    let k = release::check(&p, &r, 1.0, None).expect("check");
    let m = &p.monitoring;
    let last = |id: &str| k.tracks.iter().find(|t| t.id == id).and_then(|t| t.measured.last().copied()).unwrap();
    for t in &k.limits {
        let (a, b) = (t.points[0], *t.points.last().unwrap());
        let slope = (b.1 - a.1) / (b.0 - a.0);
        // Hand calculation: the rate limits per day in the plots' units
        // (kPa/week ÷ 7; mm/day ÷ 1000 for metres), ending at the last reading.
        let expected = match t.key {
            "pore_rise_limit_kpa_per_week" => Some(m.pore_rise_limit_kpa_per_week / 7.0),
            "settlement_rate_limit_mm_per_day" => Some(m.settlement_rate_limit_mm_per_day / 1000.0),
            "lateral_rate_limit_mm_per_day" => Some(m.lateral_rate_limit_mm_per_day / 1000.0),
            _ => None,
        };
        if let Some(s) = expected {
            assert!((slope - s).abs() < 1e-9 * s.max(1.0), "{} {}: slope {slope} against {s}", t.key, t.id);
            let end = last(&t.id);
            assert!(
                (b.0 - end.0).abs() < 1e-9 && (b.1 - end.1).abs() < 1e-9,
                "{} {} does not end at the last reading",
                t.key,
                t.id
            );
        }
    }
    let keys: Vec<&str> = k.limits.iter().map(|t| t.key).collect();
    for key in ["pore_rise_limit_kpa_per_week", "pore_pressure_ratio_limit", "lateral_ratio_limit"] {
        assert!(keys.contains(&key), "{key} not drawn: {keys:?}");
    }
    // The ΔL/ΔS line is the movement the limit allows for the settlement
    // measured: the rule passes exactly when the marker's last reading lies
    // on or below the line's last point (same readings, same limit).
    let rule = k.rules.iter().find(|x| x.name.starts_with("lateral / settlement")).unwrap();
    for t in k.limits.iter().filter(|t| t.key == "lateral_ratio_limit") {
        assert_eq!(p.instruments.iter().find(|i| i.id == t.id).unwrap().kind, InstrumentKind::LateralMarker);
        let below = last(&t.id).1 <= t.points.last().unwrap().1 + 1e-12;
        assert_eq!(below, rule.verdict == Verdict::Pass, "{}: line and rule disagree", t.id);
    }
    // Δu/Δσv: a tip's reading after the lift at or below the drawn level
    // means a ratio within the limit; the rule fails exactly when some tip
    // lies above its level.
    let rule = k.rules.iter().find(|x| x.name == "Δu/Δσv of the last lift").unwrap();
    let above = k.limits.iter().filter(|t| t.key == "pore_pressure_ratio_limit").any(|t| {
        let end = t.points.last().unwrap();
        let track = k.tracks.iter().find(|x| x.id == t.id).unwrap();
        let after = track.measured.iter().find(|x| x.0 >= t.points[0].0 && x.0 >= end.0 - 1e-9).unwrap();
        after.1 > end.1 + 1e-12
    });
    assert_eq!(above, rule.verdict == Verdict::Fail);
}
