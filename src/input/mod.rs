//! Reading a project file: TOML text → `raw::RawProject` (types only) →
//! `model::Project` (validated, SI units). Unknown keys, type errors and every
//! range or cross-field problem are collected and reported together, each with
//! file, line, key path, value and what is allowed.

pub mod raw;
pub mod spans;
mod validate;
pub mod vary;

use crate::error::{Error, InputIssue, Result};
use crate::model::Project;
use raw::*;
use spans::LineMap;
use std::path::Path;

/// Read and validate a project file.
pub fn load(path: &Path) -> Result<Project> {
    let text = std::fs::read_to_string(path).map_err(|source| Error::Read { path: path.to_path_buf(), source })?;
    parse(&text, &path.display().to_string())
}

/// Validate project text; `file` is the name used in messages.
pub fn parse(text: &str, file: &str) -> Result<Project> {
    let table = toml_table(text, file)?;
    validate_table(table, file, &LineMap::build(text))
}

/// The TOML syntax layer: text → table, a syntax error naming its line.
fn toml_table(text: &str, file: &str) -> Result<toml::Table> {
    text.parse().map_err(|e: toml::de::Error| {
        let line = e.span().map(|s| spans::line_in(text, s.start));
        Error::input(file, line, "", format!("not valid TOML: {}", e.message()))
    })
}

/// Types, ranges and cross-field checks of a parsed table; `lines` maps
/// key paths to lines of the file (empty for a changed document).
fn validate_table(table: toml::Table, file: &str, lines: &LineMap) -> Result<Project> {
    let doc = vary::Document { file: file.to_string(), table };
    let mut unknown = Vec::new();
    let mut on_unknown = |p: serde_ignored::Path<'_>| unknown.push(ignored_path(&p));
    let de = serde_ignored::Deserializer::new(toml::Value::Table(doc.table.clone()), &mut on_unknown);
    let typed: std::result::Result<RawProject, _> = serde_path_to_error::deserialize(de);
    let mut issues: Vec<InputIssue> = unknown.iter().map(|p| unknown_key_issue(p, lines)).collect();
    match typed {
        Err(e) => {
            let path = error_path(e.path());
            let (key, message) = describe_serde(&path, &e.into_inner().to_string());
            issues.push(InputIssue { line: lines.line(&key), key, message });
        }
        Ok(raw) if issues.is_empty() => match validate::project(&raw, lines, &doc) {
            Ok(p) => return Ok(p),
            Err(mut more) => issues.append(&mut more),
        },
        Ok(_) => {}
    }
    Err(Error::Input { file: file.to_string(), issues })
}

/// Key and sentence for a serde error at `path`: a missing field names the
/// field itself; a type error says what was expected.
fn describe_serde(path: &str, msg: &str) -> (String, String) {
    let first = msg.lines().next().unwrap_or(msg);
    if let Some(field) = first.strip_prefix("missing field `").and_then(|r| r.strip_suffix('`')) {
        let key = if path.is_empty() { field.to_string() } else { format!("{path}.{field}") };
        return (key, "is missing; this key is required (see the project-file reference in README.md)".into());
    }
    (path.to_string(), format!("wrong type: {first}"))
}

fn ignored_path(p: &serde_ignored::Path<'_>) -> String {
    use serde_ignored::Path as P;
    match p {
        P::Root => String::new(),
        P::Seq { parent, index } => format!("{}[{index}]", ignored_path(parent)),
        P::Map { parent, key } => {
            let head = ignored_path(parent);
            if head.is_empty() { key.clone() } else { format!("{head}.{key}") }
        }
        P::Some { parent } | P::NewtypeStruct { parent } | P::NewtypeVariant { parent } => ignored_path(parent),
    }
}

fn error_path(p: &serde_path_to_error::Path) -> String {
    use serde_path_to_error::Segment;
    let mut out = String::new();
    for seg in p.iter() {
        match seg {
            Segment::Seq { index } => out.push_str(&format!("[{index}]")),
            Segment::Map { key } | Segment::Enum { variant: key } => {
                if !out.is_empty() {
                    out.push('.');
                }
                out.push_str(key);
            }
            Segment::Unknown => {}
        }
    }
    out
}

/// Field names valid in the table at `parent` (array indices ignored).
fn known_fields(parent: &str) -> &'static [&'static str] {
    let normal: String = strip_indices(parent);
    match normal.as_str() {
        "" => field_names::<RawProject>(),
        "project" => field_names::<RawInfo>(),
        "ground" => field_names::<RawGround>(),
        "ground.layers[]" => field_names::<RawLayer>(),
        "embankment" => field_names::<RawEmbankment>(),
        "embankment.berms[]" => field_names::<RawBerm>(),
        "drains" => field_names::<RawDrains>(),
        "construction" => field_names::<RawConstruction>(),
        "criteria" => field_names::<RawCriteria>(),
        "stability" => field_names::<RawStability>(),
        "analysis" => field_names::<RawAnalysis>(),
        "sequence[]" => field_names::<RawLift>(),
        "instrument[]" => field_names::<RawInstrument>(),
        "monitoring" => field_names::<RawMonitoring>(),
        "uncertain[]" => field_names::<RawUncertain>(),
        "correlation[]" => field_names::<RawCorrelation>(),
        _ => &[],
    }
}

fn strip_indices(path: &str) -> String {
    let mut out = String::new();
    let mut in_index = false;
    for c in path.chars() {
        match c {
            '[' => {
                in_index = true;
                out.push_str("[]");
            }
            ']' => in_index = false,
            _ if in_index => {}
            _ => out.push(c),
        }
    }
    out
}

fn unknown_key_issue(path: &str, lines: &LineMap) -> InputIssue {
    let (parent, key) = match path.rfind('.') {
        Some(i) => (&path[..i], &path[i + 1..]),
        None => ("", path),
    };
    let fields = known_fields(parent);
    let best = fields
        .iter()
        .map(|f| (strsim::jaro_winkler(key, f), *f))
        .filter(|(score, _)| *score > 0.8)
        .max_by(|a, b| a.0.total_cmp(&b.0));
    let message = match best {
        Some((_, f)) => format!("unknown key; did you mean `{f}`?"),
        None if fields.is_empty() => "unknown key".to_string(),
        None => format!("unknown key; allowed here: {}", fields.join(", ")),
    };
    InputIssue { line: lines.line(path), key: path.to_string(), message }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn field_names_come_from_the_structs() {
        assert!(field_names::<RawBerm>().contains(&"width_m"));
        assert!(field_names::<RawLayer>().contains(&"cv_m2_per_year"));
    }

    #[test]
    fn strip_indices_normalises_paths() {
        assert_eq!(strip_indices("ground.layers[12]"), "ground.layers[]");
    }
}
