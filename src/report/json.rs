//! JSON output: every command's result inside one envelope
//! `{ "fillpace": version, "command", "project": {title, reference, source,
//! stage_shape}, "result": ..., "cautions": [...] }` (the corridor programme
//! has `"corridor": {title, reference, source}` in place of `project`). Field meanings are documented in
//! README.md ("Machine-readable output").

use super::{Exporter, PlanReport};
use crate::error::{Error, Result};
use crate::model::Project;
use serde::Serialize;

#[derive(Serialize)]
struct Envelope<'a, T: Serialize> {
    fillpace: &'static str,
    command: &'a str,
    /// `"project": {...}` or, for the corridor programme, `"corridor": {...}`.
    #[serde(flatten)]
    subject: Subject<'a>,
    result: &'a T,
    /// Plausibility warnings of commands whose result has no warnings of
    /// its own (check, stability); left out when empty.
    #[serde(skip_serializing_if = "<[String]>::is_empty")]
    warnings: &'a [String],
    cautions: Vec<String>,
}

/// What the result is about.
#[derive(Serialize)]
#[serde(rename_all = "lowercase")]
enum Subject<'a> {
    Project(Head<'a>),
    Corridor(CorridorHead<'a>),
}

#[derive(Serialize)]
struct Head<'a> {
    title: &'a str,
    reference: &'a str,
    source: &'a str,
    /// The stage geometry used (`embankment.stage_shape`).
    stage_shape: &'static str,
    /// The fill strength of the fill-face check (`stability.face_strength`).
    face_strength: &'static str,
}

/// A corridor file's title block (its sections name their own stage
/// geometry).
#[derive(Serialize)]
struct CorridorHead<'a> {
    title: &'a str,
    reference: &'a str,
    source: &'a str,
}

/// Pretty JSON of `result` in the envelope.
pub fn envelope<T: Serialize>(command: &str, project: &Project, source: &str, result: &T) -> Result<String> {
    envelope_with_warnings(command, project, source, result, &[])
}

/// `envelope` with warnings beside the result.
pub fn envelope_with_warnings<T: Serialize>(
    command: &str,
    project: &Project,
    source: &str,
    result: &T,
    warnings: &[String],
) -> Result<String> {
    with_cautions(command, project, source, result, warnings, super::cautions())
}

/// The Monte Carlo result in the envelope, its own caution first among the
/// caution notes.
pub fn risk<T: Serialize>(project: &Project, source: &str, result: &T, warnings: &[String]) -> Result<String> {
    let cautions = std::iter::once(super::RISK_CAUTION.to_string()).chain(super::cautions()).collect();
    with_cautions("risk", project, source, result, warnings, cautions)
}

/// The corridor programme in the envelope, with `corridor` (title,
/// reference, source) in place of `project`.
pub fn corridor<T: Serialize>(title: &str, reference: &str, source: &str, result: &T) -> Result<String> {
    let subject = Subject::Corridor(CorridorHead { title, reference, source });
    pretty("corridor", subject, result, &[], super::cautions())
}

fn with_cautions<T: Serialize>(
    command: &str,
    project: &Project,
    source: &str,
    result: &T,
    warnings: &[String],
    cautions: Vec<String>,
) -> Result<String> {
    let subject = Subject::Project(Head {
        title: &project.info.title,
        reference: &project.info.reference,
        source,
        stage_shape: project.embankment.stage_shape.label(),
        face_strength: project.stability.face_strength.label(),
    });
    pretty(command, subject, result, warnings, cautions)
}

fn pretty<T: Serialize>(
    command: &str,
    subject: Subject,
    result: &T,
    warnings: &[String],
    cautions: Vec<String>,
) -> Result<String> {
    let e = Envelope { fillpace: env!("CARGO_PKG_VERSION"), command, subject, result, warnings, cautions };
    serde_json::to_string_pretty(&e)
        .map(|mut s| {
            s.push('\n');
            s
        })
        .map_err(|e| Error::Computation(format!("JSON serialisation failed: {e}")))
}

/// The plan as JSON.
pub struct Json;

impl Exporter for Json {
    fn serialize(&self, r: &PlanReport) -> Result<Vec<u8>> {
        envelope("plan", r.project, &r.source, r.plan).map(String::into_bytes)
    }
}
