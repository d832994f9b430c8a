//! CSV output (RFC 4180, comma-separated, header row, ISO 8601 dates, SI
//! units in the column names): the plan's stage table and the assessment's
//! daily time series.

use super::{Exporter, PlanReport};
use crate::error::Result;
use crate::schedule::assess::Assessment;

/// Quote a field if it needs it.
pub(crate) fn field(s: &str) -> String {
    if s.contains([',', '"', '\n']) { format!("\"{}\"", s.replace('"', "\"\"")) } else { s.to_string() }
}

fn opt<T: std::fmt::Display>(v: Option<T>) -> String {
    v.map(|x| x.to_string()).unwrap_or_default()
}

/// The plan's stages as CSV.
pub struct Csv;

impl Exporter for Csv {
    fn serialize(&self, r: &PlanReport) -> Result<Vec<u8>> {
        let mut out = String::from(
            "stage,kind,start,end,thickness_m,height_after_m,placed_after_m,fs_end,mechanism,circle_depth_m,su_governing_kpa,rest_days,release,fs_release,peak_excess_kpa,degree_centre,settlement_centre_m\n",
        );
        for s in &r.plan.stages {
            let kind = s.kind.key();
            out.push_str(&format!(
                "{},{},{},{},{:.3},{:.3},{:.3},{:.3},{},{:.2},{:.2},{},{},{},{:.2},{:.4},{:.4}\n",
                s.number,
                kind,
                s.start,
                s.end,
                s.thickness_m,
                s.height_after_m,
                s.placed_after_m,
                s.fs_end,
                field(&s.mechanism),
                s.circle_depth_m,
                s.su_governing_kpa,
                s.rest_days,
                opt(s.release),
                opt(s.fs_release.map(|f| format!("{f:.3}"))),
                s.peak_excess_kpa,
                s.degree_centre,
                s.settlement_centre_m
            ));
        }
        Ok(out.into_bytes())
    }
}

/// The assessment's daily series as CSV: one column per (column, depth)
/// excess pore pressure and per depth centreline strength.
pub fn series(a: &Assessment) -> String {
    let mut head = vec!["date", "height_m", "placed_m", "settlement_centre_m", "degree_centre", "fs"]
        .into_iter()
        .map(String::from)
        .collect::<Vec<_>>();
    for c in &a.columns {
        for z in &a.depths_m {
            head.push(format!("u_excess_kpa[{} z={z:.2}]", c.name));
        }
    }
    for z in &a.depths_m {
        head.push(format!("su_centre_kpa[z={z:.2}]"));
    }
    let mut out = head.iter().map(|h| field(h)).collect::<Vec<_>>().join(",");
    out.push('\n');
    for r in &a.series {
        let mut row = vec![
            r.date.to_string(),
            format!("{:.3}", r.height_m),
            format!("{:.3}", r.placed_m),
            format!("{:.4}", r.settlement_centre_m),
            format!("{:.4}", r.degree_centre),
            opt(r.fs.map(|f| format!("{f:.3}"))),
        ];
        row.extend(r.excess_kpa.iter().flatten().map(|u| format!("{u:.2}")));
        row.extend(r.su_centre_kpa.iter().map(|s| format!("{s:.2}")));
        out.push_str(&row.join(","));
        out.push('\n');
    }
    out
}

/// The design-option table as CSV, sorted as printed.
pub fn comparison(c: &crate::compare::Comparison) -> String {
    let mut out = String::from(
        "variant,settings,lifts,finish,duration_days,min_fs,final_settlement_m,residual_settlement_m,fill_volume_m3_per_m,drain_length_m_per_m,not_buildable\n",
    );
    for v in &c.variants {
        let o = v.outcome.as_ref();
        out.push_str(&format!(
            "{},{},{},{},{},{},{},{},{},{},{}\n",
            v.number,
            field(&v.label),
            opt(o.map(|o| o.lifts)),
            opt(o.map(|o| o.finish)),
            opt(o.map(|o| o.duration_days)),
            opt(o.map(|o| format!("{:.3}", o.min_fs))),
            opt(o.map(|o| format!("{:.4}", o.final_settlement_m))),
            opt(o.map(|o| format!("{:.4}", o.residual_settlement_m))),
            opt(o.map(|o| format!("{:.2}", o.fill_volume_m3_per_m))),
            opt(o.map(|o| format!("{:.1}", o.drain_length_m_per_m))),
            field(v.reason.as_deref().unwrap_or("")),
        ));
    }
    out
}
