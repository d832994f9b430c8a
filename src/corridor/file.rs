//! The corridor file: TOML text → raw structs (types, unknown keys) →
//! `Corridor` (ranges, chainage order, the section projects read and
//! changed by their key-path overrides). Every message names the corridor
//! file or the section file, the key and, where known, the line.

use super::{Corridor, InputFile, Resources, SectionSpec, Source};
use crate::error::{Error, InputIssue, Result};
use crate::input::spans::LineMap;
use crate::input::vary::Document;
use chrono::NaiveDate;
use serde::Deserialize;
use std::path::{Path, PathBuf};

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawCorridor {
    corridor: RawHead,
    calendar: Option<toml::Table>,
    resources: Option<RawResources>,
    section: Vec<RawSection>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawHead {
    title: String,
    reference: Option<String>,
    start_date: NaiveDate,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawResources {
    placing_crews: Option<i64>,
    drain_rigs: Option<i64>,
    drain_rig_m_per_day: Option<f64>,
    platform_thickness_m: Option<f64>,
    rolling_surcharge: Option<bool>,
    #[serde(default)]
    supply: Vec<RawSource>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSource {
    name: String,
    m3_per_day: f64,
    from: Option<NaiveDate>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSection {
    name: String,
    from_m: f64,
    to_m: f64,
    project: String,
    set: Option<toml::Table>,
    calendar: Option<toml::Table>,
    priority: Option<i64>,
    earliest_start: Option<NaiveDate>,
    required_finish: Option<NaiveDate>,
}

/// Calendar keys a corridor (or a section) may set; they replace the
/// section file's `construction` keys of the same name.
const CALENDAR_KEYS: [&str; 3] = ["working_days", "holidays", "weather_downtime_fraction"];

/// Read and validate a corridor file and every section project it names.
pub fn load(path: &Path) -> Result<Corridor> {
    let text = std::fs::read_to_string(path).map_err(|source| Error::Read { path: path.to_path_buf(), source })?;
    let dir = path.parent().map_or_else(|| PathBuf::from("."), Path::to_path_buf);
    parse(&text, &path.display().to_string(), &dir, &|p: &Path| std::fs::read_to_string(p))
}

/// Reads a section project file.
pub type Reader<'a> = &'a dyn Fn(&Path) -> std::io::Result<String>;

/// Validate corridor text; `file` names it in messages and relative section
/// paths resolve against `dir` and are read by `read`.
pub fn parse(text: &str, file: &str, dir: &Path, read: Reader) -> Result<Corridor> {
    let lines = LineMap::build(text);
    let bad = |key: &str, message: String| Error::input(file, lines.line(key), key, message);
    let table: toml::Table = text.parse().map_err(|e: toml::de::Error| {
        let line = e.span().map(|s| crate::input::spans::line_in(text, s.start));
        Error::input(file, line, "", format!("not valid TOML: {}", e.message()))
    })?;
    let raw: RawCorridor = serde_path_to_error::deserialize(toml::Value::Table(table)).map_err(|e| {
        let key = e.path().to_string().replace(".[", "[");
        let key = if key == "." { String::new() } else { key };
        bad(&key, format!("{} (see the corridor-file reference in README.md)", e.into_inner()))
    })?;
    let mut issues = Vec::new();
    let resources = resources(raw.resources.as_ref(), &mut issues);
    let calendar = raw.calendar.unwrap_or_default();
    check_calendar_keys(&calendar, "calendar", &mut issues);
    check_chainages(&raw.section, &mut issues);
    if !issues.is_empty() {
        return Err(located(file, &lines, issues));
    }
    let start = raw.corridor.start_date;
    let mut sections = Vec::new();
    let mut inputs = vec![InputFile { file: file.to_string(), sha256: crate::hash::sha256_hex(text.as_bytes()) }];
    for (i, s) in raw.section.iter().enumerate() {
        let (spec, sha256) = section(s, i, (start, &calendar), (dir, read), &|k, m| bad(k, m))?;
        let used = InputFile { file: spec.project_file.clone(), sha256 };
        if !inputs.contains(&used) {
            inputs.push(used);
        }
        sections.push(spec);
    }
    if resources.platform_thickness_m > 0.0 {
        check_platform(&sections, resources.platform_thickness_m, &|k, m| bad(k, m))?;
    }
    let base = sections.iter().find(|s| !s.own_calendar).unwrap_or(&sections[0]);
    let calendar = crate::schedule::calendar::Calendar::new(start, &base.project.construction);
    Ok(Corridor {
        file: file.to_string(),
        calendar,
        title: raw.corridor.title,
        reference: raw.corridor.reference.unwrap_or_default(),
        start_date: start,
        resources,
        sections,
        inputs,
    })
}

/// Issues with their lines filled in from the key paths.
fn located(file: &str, lines: &LineMap, issues: Vec<(String, String)>) -> Error {
    let issues = issues.into_iter().map(|(key, message)| InputIssue { line: lines.line(&key), key, message }).collect();
    Error::Input { file: file.to_string(), issues }
}

fn resources(r: Option<&RawResources>, issues: &mut Vec<(String, String)>) -> Resources {
    let Some(r) = r else { return Resources::default() };
    let mut count = |key: &str, v: Option<i64>| match v {
        Some(n) if !(1..=100).contains(&n) => {
            issues.push((format!("resources.{key}"), format!("= {n} is out of range; allowed: 1 to 100")));
            None
        }
        v => v.map(|n| n as usize),
    };
    let crews = count("placing_crews", r.placing_crews);
    let rigs = count("drain_rigs", r.drain_rigs);
    let rate = r.drain_rig_m_per_day;
    if rigs.is_some() != rate.is_some() {
        issues.push((
            "resources.drain_rigs".into(),
            "drain_rigs and drain_rig_m_per_day go together: give both (drain installation scheduled) or neither (drains taken as installed before the first lift)".into(),
        ));
    }
    if let Some(v) = rate.filter(|v| !(v.is_finite() && *v > 0.0)) {
        issues.push(("resources.drain_rig_m_per_day".into(), format!("= {v} must be a positive number of metres")));
    }
    let platform = r.platform_thickness_m.unwrap_or(0.0);
    if !(platform.is_finite() && (0.0..=2.0).contains(&platform)) {
        issues.push((
            "resources.platform_thickness_m".into(),
            format!("= {platform} is out of range; allowed: 0 to 2 m"),
        ));
    }
    let mut supply = Vec::new();
    for (i, s) in r.supply.iter().enumerate() {
        if !(s.m3_per_day.is_finite() && s.m3_per_day > 0.0) {
            issues.push((
                format!("resources.supply[{i}].m3_per_day"),
                format!("= {} must be a positive supply in m³ per working day", s.m3_per_day),
            ));
        }
        supply.push(Source { name: s.name.clone(), m3_per_day: s.m3_per_day, from: s.from });
    }
    Resources {
        placing_crews: crews,
        drain_rigs: rigs.zip(rate),
        platform_thickness_m: platform,
        rolling_surcharge: r.rolling_surcharge.unwrap_or(false),
        supply,
    }
}

fn check_calendar_keys(t: &toml::Table, at: &str, issues: &mut Vec<(String, String)>) {
    for k in t.keys().filter(|k| !CALENDAR_KEYS.contains(&k.as_str())) {
        issues.push((format!("{at}.{k}"), format!("unknown key; allowed here: {}", CALENDAR_KEYS.join(", "))));
    }
}

/// Each section's range must run forwards and no two may overlap.
fn check_chainages(sections: &[RawSection], issues: &mut Vec<(String, String)>) {
    if sections.is_empty() {
        issues.push(("section".into(), "is empty; list at least one [[section]]".into()));
    }
    for (i, s) in sections.iter().enumerate() {
        if !(s.from_m.is_finite() && s.to_m.is_finite() && s.to_m > s.from_m) {
            issues.push((
                format!("section[{i}].to_m"),
                format!("= {} must be greater than from_m ({}); chainages in m, increasing", s.to_m, s.from_m),
            ));
        }
        for (j, t) in sections.iter().enumerate().take(i) {
            if s.from_m < t.to_m && t.from_m < s.to_m {
                issues.push((
                    format!("section[{i}].from_m"),
                    format!(
                        "= {}: section '{}' ({}–{} m) overlaps section {} '{}' ({}–{} m); chainage ranges may touch but not overlap",
                        s.from_m, s.name, s.from_m, s.to_m, j + 1, t.name, t.from_m, t.to_m
                    ),
                ));
            }
        }
    }
}

/// One section: its project file read (errors name that file and line),
/// then changed by the corridor's start date, calendar and overrides and
/// validated again.
fn section(
    s: &RawSection,
    i: usize,
    (start, calendar): (NaiveDate, &toml::Table),
    (dir, read): (&Path, Reader),
    bad: &dyn Fn(&str, String) -> Error,
) -> Result<(SectionSpec, String)> {
    let key = format!("section[{i}]");
    let path = dir.join(&s.project);
    let text = read(&path).map_err(|e| {
        bad(&format!("{key}.project"), format!("= \"{}\": cannot read {}: {e}", s.project, path.display()))
    })?;
    let name = path.display().to_string();
    crate::input::parse(&text, &name)?;
    let mut doc = Document::parse(&text, &name)?;
    for k in ["sequence", "instrument", "uncertain", "correlation"] {
        doc.remove(k);
    }
    doc.replace("project", "start_date", toml::Value::Datetime(toml_date(start)))?;
    let mut issues = Vec::new();
    let own = s.calendar.clone().unwrap_or_default();
    check_calendar_keys(&own, &format!("{key}.calendar"), &mut issues);
    if let Some((k, m)) = issues.pop() {
        return Err(bad(&k, m));
    }
    for (k, v) in calendar.iter().chain(own.iter()) {
        doc.replace("construction", k, v.clone())?;
    }
    let mut overrides = Vec::new();
    flatten(&s.set.clone().unwrap_or_default(), "", &mut overrides);
    for (k, v) in &overrides {
        doc.set(k, v.clone()).map_err(|e| bad(&format!("{key}.set.{k}"), e.to_string()))?;
    }
    let label = format!("{name} as section '{}' of the corridor (start date, calendar and set applied)", s.name);
    let project = doc.project(&label)?;
    for (k, d) in [("earliest_start", s.earliest_start), ("required_finish", s.required_finish)] {
        if d.is_some_and(|d| d < start) {
            return Err(bad(
                &format!("{key}.{k}"),
                format!("= {} is before corridor.start_date ({start})", d.unwrap_or(start)),
            ));
        }
    }
    let spec = SectionSpec {
        name: s.name.clone(),
        from_m: s.from_m,
        to_m: s.to_m,
        project_file: name,
        overrides: overrides.into_iter().map(|(k, v)| (k, v.to_string())).collect(),
        project,
        priority: s.priority,
        earliest_start: s.earliest_start,
        required_finish: s.required_finish,
        own_calendar: !own.is_empty(),
    };
    Ok((spec, crate::hash::sha256_hex(text.as_bytes())))
}

/// The working platform is the bottom of the fill: it must not be thicker
/// than the thinnest lift of a drained section, so that the first lift
/// (whose FS the engine checks) carries at least the platform's load.
fn check_platform(sections: &[SectionSpec], t: f64, bad: &dyn Fn(&str, String) -> Error) -> Result<()> {
    for s in sections.iter().filter(|s| s.project.drains.is_some()) {
        let min = s.project.construction.lift_min_m;
        if t > min + 1e-9 {
            return Err(bad(
                "resources.platform_thickness_m",
                format!(
                    "= {t} m is thicker than the minimum lift ({min} m) of section '{}'; the platform is the bottom of the first lift",
                    s.name
                ),
            ));
        }
    }
    Ok(())
}

fn toml_date(d: NaiveDate) -> toml::value::Datetime {
    use chrono::Datelike;
    toml::value::Datetime {
        date: Some(toml::value::Date { year: d.year() as u16, month: d.month() as u8, day: d.day() as u8 }),
        time: None,
        offset: None,
    }
}

/// Override keys as dotted paths: `ground.layers[1].thickness_m = 11`
/// written bare in TOML nests tables, quoted it is one key; both mean the
/// same path.
fn flatten(t: &toml::Table, prefix: &str, out: &mut Vec<(String, toml::Value)>) {
    for (k, v) in t {
        let path = if prefix.is_empty() { k.clone() } else { format!("{prefix}.{k}") };
        match v {
            toml::Value::Table(inner) => flatten(inner, &path, out),
            v => out.push((path, v.clone())),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn raw(name: &str, from_m: f64, to_m: f64) -> RawSection {
        RawSection {
            name: name.into(),
            from_m,
            to_m,
            project: "p.toml".into(),
            set: None,
            calendar: None,
            priority: None,
            earliest_start: None,
            required_finish: None,
        }
    }

    #[test]
    fn chainages_may_touch_but_not_overlap() {
        let mut issues = Vec::new();
        check_chainages(&[raw("a", 0.0, 100.0), raw("b", 100.0, 200.0)], &mut issues);
        assert!(issues.is_empty(), "{issues:?}");
        check_chainages(&[raw("a", 0.0, 100.0), raw("b", 99.0, 200.0), raw("c", 300.0, 250.0)], &mut issues);
        let keys: Vec<&str> = issues.iter().map(|i| i.0.as_str()).collect();
        assert_eq!(keys, ["section[1].from_m", "section[2].to_m"]);
    }

    #[test]
    fn bare_and_quoted_override_keys_are_the_same_path() {
        let t: toml::Table =
            "\"embankment.design_height_m\" = 5\nground.layers = 1\n[drains]\nspacing_m = 2".parse().unwrap();
        let mut out = Vec::new();
        flatten(&t, "", &mut out);
        let keys: Vec<&str> = out.iter().map(|(k, _)| k.as_str()).collect();
        assert_eq!(keys, ["drains.spacing_m", "embankment.design_height_m", "ground.layers"]);
    }
}
