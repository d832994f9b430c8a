//! CSV output (RFC 4180 via the `csv` crate: comma-separated, header row,
//! any field holding a comma, quote, CR or LF quoted; ISO 8601 dates, SI
//! units in the column names): the plan's stage table, the assessment's
//! daily time series and the design-option table. Each file starts with
//! comment lines (`# `): the program version and the caution, then the
//! stage geometry used; read it with the comment character `#` (e.g.
//! pandas `comment="#"`).

use super::{Exporter, PlanReport};
use crate::error::{Error, Result};
use crate::model::StageShape;
use crate::schedule::assess::Assessment;

fn opt<T: std::fmt::Display>(v: Option<T>) -> String {
    v.map(|x| x.to_string()).unwrap_or_default()
}

/// The comment line that opens every CSV file written by fillpace.
pub fn caution_line() -> String {
    format!("# {}: {}\n", super::program_version(), super::SHORT_CAUTION)
}

/// The comment line naming the stage geometry used.
fn geometry_line(shape: StageShape) -> String {
    format!("# stage geometry: {}\n", shape.describe())
}

/// The caution line, the geometry line (if any), then `head` and `rows` as
/// RFC 4180 records.
pub(crate) fn table<R: IntoIterator<Item = Vec<String>>>(
    shape: Option<StageShape>,
    head: &[String],
    rows: R,
) -> Result<Vec<u8>> {
    let fail = |e: &dyn std::fmt::Display| Error::Computation(format!("CSV output failed: {e}"));
    let mut lines = caution_line();
    lines.push_str(&shape.map(geometry_line).unwrap_or_default());
    let mut w = csv::WriterBuilder::new().comment(Some(b'#')).from_writer(lines.into_bytes());
    w.write_record(head).map_err(|e| fail(&e))?;
    for r in rows {
        w.write_record(&r).map_err(|e| fail(&e))?;
    }
    w.into_inner().map_err(|e| fail(&e))
}

fn strings(names: &[&str]) -> Vec<String> {
    names.iter().map(|s| s.to_string()).collect()
}

/// The plan's stages as CSV.
pub struct Csv;

impl Exporter for Csv {
    fn serialize(&self, r: &PlanReport) -> Result<Vec<u8>> {
        let head = strings(&[
            "stage",
            "kind",
            "start",
            "end",
            "thickness_m",
            "height_after_m",
            "placed_after_m",
            "fs_end",
            "mechanism",
            "circle_depth_m",
            "su_governing_kpa",
            "rest_days",
            "release",
            "fs_release",
            "peak_excess_kpa",
            "degree_centre",
            "settlement_centre_m",
            "design_fill_after_m3_per_m",
            "makeup_fill_after_m3_per_m",
            "surcharge_fill_after_m3_per_m",
        ]);
        let rows = r.plan.stages.iter().map(|s| {
            let a = s.fill_after_m3_per_m;
            vec![
                s.number.to_string(),
                s.kind.key().to_string(),
                s.start.to_string(),
                s.end.to_string(),
                format!("{:.3}", s.thickness_m),
                format!("{:.3}", s.height_after_m),
                format!("{:.3}", s.placed_after_m),
                format!("{:.3}", s.fs_end),
                s.mechanism.clone(),
                format!("{:.2}", s.circle_depth_m),
                format!("{:.2}", s.su_governing_kpa),
                s.rest_days.to_string(),
                opt(s.release),
                opt(s.fs_release.map(|f| format!("{f:.3}"))),
                format!("{:.2}", s.peak_excess_kpa),
                format!("{:.4}", s.degree_centre),
                format!("{:.4}", s.settlement_centre_m),
                opt(a.map(|a| format!("{:.2}", a.design_m2))),
                opt(a.map(|a| format!("{:.2}", a.makeup_m2))),
                opt(a.map(|a| format!("{:.2}", a.surcharge_m2))),
            ]
        });
        table(Some(r.plan.stage_shape), &head, rows)
    }
}

/// The assessment's daily series as CSV: one column per (column, depth)
/// excess pore pressure and per depth centreline strength.
pub fn series(a: &Assessment) -> Result<Vec<u8>> {
    let mut head = strings(&["date", "height_m", "placed_m", "settlement_centre_m", "degree_centre", "fs"]);
    for c in &a.columns {
        for z in &a.depths_m {
            head.push(format!("u_excess_kpa[{} z={z:.2}]", c.name));
        }
    }
    for z in &a.depths_m {
        head.push(format!("su_centre_kpa[z={z:.2}]"));
    }
    let rows = a.series.iter().map(|r| {
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
        row
    });
    table(Some(a.stage_shape), &head, rows)
}

/// The design-option table as CSV, sorted as printed.
pub fn comparison(c: &crate::compare::Comparison, shape: StageShape) -> Result<Vec<u8>> {
    let head = strings(&[
        "variant",
        "settings",
        "lifts",
        "finish",
        "duration_days",
        "min_fs",
        "final_settlement_m",
        "residual_settlement_m",
        "fill_volume_m3_per_m",
        "drain_length_m_per_m",
        "fs_finish",
        "service_shortfalls",
        "not_buildable",
    ]);
    let rows = c.variants.iter().map(|v| {
        let o = v.outcome.as_ref();
        vec![
            v.number.to_string(),
            v.label.clone(),
            opt(o.map(|o| o.lifts)),
            opt(o.map(|o| o.finish)),
            opt(o.map(|o| o.duration_days)),
            opt(o.map(|o| format!("{:.3}", o.min_fs))),
            opt(o.map(|o| format!("{:.4}", o.final_settlement_m))),
            opt(o.map(|o| format!("{:.4}", o.residual_settlement_m))),
            opt(o.map(|o| format!("{:.2}", o.fill_volume_m3_per_m))),
            opt(o.map(|o| format!("{:.1}", o.drain_length_m_per_m))),
            opt(o.map(|o| format!("{:.3}", o.fs_finish))),
            o.map_or(String::new(), |o| o.service_shortfalls.join("; ")),
            v.reason.clone().unwrap_or_default(),
        ]
    });
    table(Some(shape), &head, rows)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn special_characters_are_quoted_and_the_caution_comes_first() {
        // RFC 4180 §2 rules 6 and 7: fields with CR, LF, comma or quote are
        // enclosed in quotes, and a quote inside is doubled; `#` is quoted
        // too, as the comment character of the caution line.
        let head = strings(&["a", "b"]);
        let rows = vec![strings(&["x\ry", "p,q"]), strings(&["say \"hi\"", "line\nbreak"]), strings(&["#1", "2"])];
        let text = String::from_utf8(table(None, &head, rows).unwrap()).unwrap();
        let mut lines = text.splitn(2, '\n');
        let first = lines.next().unwrap();
        assert!(first.starts_with("# fillpace ") && first.contains("monitoring governs"), "{first}");
        assert_eq!(lines.next().unwrap(), "a,b\n\"x\ry\",\"p,q\"\n\"say \"\"hi\"\"\",\"line\nbreak\"\n\"#1\",2\n");
        // and a general-purpose reader gives the fields back unchanged
        let mut rd = csv::ReaderBuilder::new().comment(Some(b'#')).from_reader(text.as_bytes());
        let recs: Vec<csv::StringRecord> = rd.records().map(|r| r.unwrap()).collect();
        assert_eq!(&recs[0][0], "x\ry");
        assert_eq!(&recs[1][1], "line\nbreak");
        assert_eq!(&recs[2][0], "#1");
    }
}
