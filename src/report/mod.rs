//! Output formats. Each command's result is one plain serialisable struct;
//! each format is one module: `text` (terminal tables), `json`, `csv`, `ics`.
//! The plan formats share the `Exporter` interface so that a new format is
//! one new file. Caution notes come from templates/cautions.txt.

pub mod csv;
pub mod ics;
pub mod json;
pub mod text;

use crate::error::Result;
use crate::model::Project;
use crate::schedule::planner::Plan;

/// The caution notes, one string per paragraph (templates/cautions.txt).
pub fn cautions() -> Vec<String> {
    parse_cautions(include_str!("../../templates/cautions.txt"))
}

fn parse_cautions(text: &str) -> Vec<String> {
    text.split("\n\n")
        .map(|p| {
            p.lines()
                .filter(|l| !l.trim_start().starts_with('#'))
                .map(str::trim)
                .collect::<Vec<_>>()
                .join(" ")
        })
        .filter(|p| !p.is_empty())
        .collect()
}

/// A plan together with the project it was made for.
pub struct PlanReport<'a> {
    pub project: &'a Project,
    pub plan: &'a Plan,
    /// Where the project came from (file name, or the bundled demo).
    pub source: String,
}

/// One output format of a plan.
pub trait Exporter {
    /// The bytes of the file.
    fn serialize(&self, report: &PlanReport) -> Result<Vec<u8>>;
}

#[cfg(test)]
mod tests {
    #[test]
    fn cautions_cover_the_required_points() {
        let c = super::cautions().join(" ");
        for needle in [
            "uncertain",
            "monitoring governs",
            "local codes",
            "licensed geotechnical engineer",
            "distress",
        ] {
            assert!(c.contains(needle), "missing {needle}");
        }
        assert!(!c.contains('#'));
    }
}
