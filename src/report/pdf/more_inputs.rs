//! The second inputs page of the PDF schedule: every input that the first
//! page only summarises — the measured su0 values of each clay layer, the
//! working calendar with its holidays, the proposed sequence and the
//! instruments with the alarm limits of the hold-point check — so that a
//! checking engineer can compare the report with the project file.

use super::canvas::Canvas;
use super::pages::{CONTENT_TOP, Ctx, MARGIN, table};
use crate::model::{LayerKind, Project};
use crate::report::fixed as f;
use chrono::NaiveDate;

/// Draw the page.
pub fn more_inputs(c: &mut Canvas, ctx: &Ctx) {
    let p = ctx.r.project;
    let mut y = CONTENT_TOP + 2.0;
    c.text(MARGIN, y, 9.0, true, "Measured undrained strength su0 (the strength never falls below it)");
    let su0 = su0_rows(p);
    y = if su0.is_empty() {
        c.paragraph(
            MARGIN,
            y + 5.0,
            270.0,
            7.5,
            "No measured su0 profile is given; su follows the strength model alone.",
        )
    } else {
        table(
            c,
            MARGIN,
            y + 5.0,
            &[("layer", 45.0, false), ("su0: kPa at depth below original ground", 225.0, false)],
            &su0,
            7.0,
        )
    } + 4.0;
    c.text(MARGIN, y, 9.0, true, "Working calendar");
    let k = &p.construction;
    let calendar = format!(
        "Working days {}; weather downtime {:.0}% of working days; holidays (no fill placed): {}.",
        k.working_days.iter().map(|d| d.to_string()).collect::<Vec<_>>().join(" "),
        100.0 * k.weather_downtime_fraction,
        if k.holidays.is_empty() { "none".to_string() } else { date_ranges(&k.holidays).join(", ") }
    );
    y = c.paragraph(MARGIN, y + 5.0, 270.0, 7.5, &calendar) + 3.0;
    c.text(MARGIN, y, 9.0, true, "Proposed sequence ([[sequence]], checked by fillpace assess; not used by the plan)");
    y = if p.sequence.is_empty() {
        c.paragraph(MARGIN, y + 5.0, 270.0, 7.5, "None given.")
    } else {
        table(
            c,
            MARGIN,
            y + 5.0,
            &[("#", 8.0, true), ("start", 24.0, false), ("lift m", 16.0, true), ("crest after m", 22.0, true)],
            &sequence_rows(p),
            7.0,
        )
    } + 4.0;
    c.text(MARGIN, y, 9.0, true, "Instruments ([[instrument]]) and the alarm limits of the hold-point check");
    y = if p.instruments.is_empty() {
        c.paragraph(MARGIN, y + 5.0, 270.0, 7.5, "None given.")
    } else {
        let cols = [
            ("id", 20.0, false),
            ("kind", 30.0, false),
            ("offset m", 16.0, true),
            ("depth m", 16.0, true),
            ("baseline", 24.0, true),
            ("baseline date", 24.0, false),
        ];
        table(c, MARGIN, y + 5.0, &cols, &instrument_rows(p), 7.0)
    } + 3.0;
    let m = &p.monitoring;
    let limits = format!(
        "Alarm limits (defaults are common practice; the engineer of record confirms them): pore pressure rise under constant load {} kPa/week; settlement rate {} mm/day; lateral movement rate {} mm/day; ratio of lateral movement to settlement {}; over {} days.",
        m.pore_rise_limit_kpa_per_week,
        m.settlement_rate_limit_mm_per_day,
        m.lateral_rate_limit_mm_per_day,
        m.lateral_ratio_limit,
        m.rate_window_days
    );
    c.paragraph(MARGIN, y, 270.0, 7.5, &limits);
}

fn su0_rows(p: &Project) -> Vec<Vec<String>> {
    p.ground
        .layers
        .iter()
        .filter_map(|l| match &l.kind {
            LayerKind::Clay(cl) if !cl.strength.su0_points.is_empty() => Some(vec![
                l.name.clone(),
                cl.strength
                    .su0_points
                    .iter()
                    .map(|(z, su)| format!("{} kPa at {} m", f(*su, 1), f(*z, 2)))
                    .collect::<Vec<_>>()
                    .join("; "),
            ]),
            _ => None,
        })
        .collect()
}

fn sequence_rows(p: &Project) -> Vec<Vec<String>> {
    let mut crest = 0.0;
    p.sequence
        .iter()
        .enumerate()
        .map(|(i, s)| {
            crest += s.thickness_m;
            vec![(i + 1).to_string(), s.start.to_string(), f(s.thickness_m, 2), f(crest, 2)]
        })
        .collect()
}

fn instrument_rows(p: &Project) -> Vec<Vec<String>> {
    use crate::model::InstrumentKind as K;
    p.instruments
        .iter()
        .map(|i| {
            vec![
                i.id.clone(),
                i.kind.label().into(),
                f(i.offset_m, 1),
                if i.kind == K::Piezometer { f(i.depth_m, 1) } else { "-".into() },
                format!("{} {}", i.baseline_value, i.units.label()),
                i.baseline_date.to_string(),
            ]
        })
        .collect()
}

/// Dates as runs of consecutive days: "2027-12-20..2028-01-02" or a single
/// date, in date order.
pub fn date_ranges(dates: &[NaiveDate]) -> Vec<String> {
    let mut d = dates.to_vec();
    d.sort();
    d.dedup();
    let mut out = Vec::new();
    let mut i = 0;
    while i < d.len() {
        let mut j = i;
        while j + 1 < d.len() && d[j + 1] == d[j] + chrono::Duration::days(1) {
            j += 1;
        }
        out.push(if j == i { d[i].to_string() } else { format!("{}..{}", d[i], d[j]) });
        i = j + 1;
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn holidays_are_printed_as_runs_of_days() {
        // Hand example: 24–26 Dec is one run, 1 Jan stands alone.
        let d = |m, day| NaiveDate::from_ymd_opt(if m == 1 { 2028 } else { 2027 }, m, day).unwrap();
        let r = date_ranges(&[d(1, 1), d(12, 25), d(12, 24), d(12, 26)]);
        assert_eq!(r, vec!["2027-12-24..2027-12-26".to_string(), "2028-01-01".into()]);
    }
}
