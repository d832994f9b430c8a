//! iCalendar (RFC 5545) output: one all-day event per placement (first to
//! last working day) and one per hold point (the release date of the next
//! lift), so a contractor can load the timetable into any calendar. Lines
//! end in CRLF and are folded at 75 octets as the RFC requires.
//!
//! Re-imports update rather than duplicate: each event's UID is stable
//! (project reference, start date and stage), DTSTAMP is the time the file
//! was written, and SEQUENCE (RFC 5545 §3.8.7.4) counts seconds from
//! 2020-01-01 UTC to that time, so a later file always carries the higher
//! revision number.

use super::{Exporter, PlanReport};
use crate::error::Result;
use crate::schedule::planner::StageKind;
use chrono::{NaiveDate, NaiveDateTime};

/// The plan as an iCalendar file written at `written` (UTC).
pub struct Ics {
    pub written: NaiveDateTime,
}

/// Event identity and revision shared by every event of one file.
pub(crate) struct Stamp {
    dtstamp: String,
    sequence: i64,
}

impl Stamp {
    pub(crate) fn at(written: NaiveDateTime) -> Stamp {
        let epoch = NaiveDate::from_ymd_opt(2020, 1, 1).and_then(|d| d.and_hms_opt(0, 0, 0)).unwrap_or_default();
        Stamp {
            dtstamp: written.format("%Y%m%dT%H%M%SZ").to_string(),
            sequence: (written - epoch).num_seconds().clamp(0, i64::from(i32::MAX)),
        }
    }
}

impl Exporter for Ics {
    fn serialize(&self, r: &PlanReport) -> Result<Vec<u8>> {
        let p = r.project;
        let mut lines = vec![
            "BEGIN:VCALENDAR".to_string(),
            "VERSION:2.0".into(),
            format!("PRODID:-//fillpace//staged fill timetable {}//EN", env!("CARGO_PKG_VERSION")),
            "CALSCALE:GREGORIAN".into(),
        ];
        let uid_base = format!("{}-{}", slug(&p.info.reference), p.info.start_date);
        let stamp = Stamp::at(self.written);
        for s in &r.plan.stages {
            let what = match s.kind {
                StageKind::Lift => {
                    format!("Lift {}: place {:.2} m (crest to {:.2} m)", s.number, s.thickness_m, s.height_after_m)
                }
                StageKind::SurchargeRemoval => format!("Stage {}: remove {:.2} m surcharge", s.number, -s.thickness_m),
            };
            let wait = if s.number > 1 {
                format!(
                    " Planned date only: stage {} starts only after the hold point before it is released and signed by the engineer of record.",
                    s.number
                )
            } else {
                String::new()
            };
            let desc = format!(
                "{} — predicted FS at end {:.2}.{wait} Prediction only: field monitoring governs. Stop filling on any sign of distress (cracks, heave beyond the toe, rising pore pressure) and call the engineer.",
                p.info.title, s.fs_end
            );
            event(&mut lines, &format!("{uid_base}-stage{}@fillpace", s.number), &stamp, s.start, s.end, &what, &desc);
            if let Some(rel) = s.release {
                let hold = format!("HOLD POINT before stage {}: release check", s.number + 1);
                let desc = format!(
                    "Check piezometer, settlement and lateral-movement readings; the next stage may start only when released by the engineer. Predicted FS now {:.2}.",
                    s.fs_release.unwrap_or(f64::NAN)
                );
                event(&mut lines, &format!("{uid_base}-hold{}@fillpace", s.number), &stamp, rel, rel, &hold, &desc);
            }
        }
        lines.push("END:VCALENDAR".into());
        let mut out = String::new();
        for l in lines {
            out.push_str(&fold(&l));
        }
        Ok(out.into_bytes())
    }
}

pub(crate) fn event(
    lines: &mut Vec<String>,
    uid: &str,
    stamp: &Stamp,
    first: NaiveDate,
    last: NaiveDate,
    summary: &str,
    desc: &str,
) {
    lines.push("BEGIN:VEVENT".into());
    lines.push(format!("UID:{uid}"));
    lines.push(format!("DTSTAMP:{}", stamp.dtstamp));
    lines.push(format!("SEQUENCE:{}", stamp.sequence));
    lines.push(format!("DTSTART;VALUE=DATE:{}", first.format("%Y%m%d")));
    // DTEND of an all-day event is exclusive (RFC 5545 §3.6.1); the last
    // representable date has no day after it and ends on itself.
    lines.push(format!("DTEND;VALUE=DATE:{}", last.succ_opt().unwrap_or(last).format("%Y%m%d")));
    lines.push(format!("SUMMARY:{}", escape(summary)));
    lines.push(format!("DESCRIPTION:{}", escape(desc)));
    lines.push("END:VEVENT".into());
}

/// Escape text values (RFC 5545 §3.3.11).
fn escape(s: &str) -> String {
    s.replace('\\', "\\\\").replace(';', "\\;").replace(',', "\\,").replace('\n', "\\n")
}

/// Fold a content line at 75 octets with CRLF + space (RFC 5545 §3.1).
pub(crate) fn fold(line: &str) -> String {
    let mut out = String::new();
    let mut len = 0;
    for ch in line.chars() {
        let n = ch.len_utf8();
        if len + n > 75 {
            out.push_str("\r\n ");
            len = 1;
        }
        out.push(ch);
        len += n;
    }
    out.push_str("\r\n");
    out
}

pub(crate) fn slug(s: &str) -> String {
    let t: String = s.chars().map(|c| if c.is_ascii_alphanumeric() { c } else { '-' }).collect();
    if t.is_empty() { "fillpace".into() } else { t }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn folding_keeps_lines_within_75_octets() {
        let long = format!("DESCRIPTION:{}", "σ'v ".repeat(40));
        let folded = fold(&long);
        for l in folded.split("\r\n") {
            assert!(l.len() <= 75, "{} octets", l.len());
        }
        let unfolded = folded.replace("\r\n ", "");
        assert_eq!(unfolded.strip_suffix("\r\n"), Some(long.as_str()));
    }

    #[test]
    fn stamp_is_the_time_of_writing_and_later_files_have_higher_sequence() {
        let t = |s: &str| NaiveDateTime::parse_from_str(s, "%Y-%m-%d %H:%M:%S").unwrap();
        let a = Stamp::at(t("2026-12-02 06:30:00"));
        let b = Stamp::at(t("2026-12-02 06:30:01"));
        assert_eq!(a.dtstamp, "20261202T063000Z");
        assert_eq!(b.sequence, a.sequence + 1);
        // 2020-01-01 to 2020-01-02 is 86 400 s.
        assert_eq!(Stamp::at(t("2020-01-02 00:00:00")).sequence, 86_400);
    }

    #[test]
    fn text_is_escaped() {
        assert_eq!(escape("a,b;c\\d"), "a\\,b\\;c\\\\d");
    }
}
