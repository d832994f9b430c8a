//! Changing a project file by key path: the parsed TOML document, values
//! read, set or scaled at paths such as `drains.spacing_m` or
//! `ground.layers[1].cv_m2_per_year`, and the changed document validated
//! into a `Project` again. Used by design-option comparisons (one value per
//! variant) and by Monte Carlo realisations (a factor per uncertain key).

use super::spans::LineMap;
use crate::error::{Error, InputIssue, Result};
use crate::model::Project;

/// A project file held as a TOML document.
#[derive(Debug, Clone)]
pub struct Document {
    /// File name used in messages.
    pub file: String,
    pub(super) table: toml::Table,
}

/// One step of a key path: a table key, optionally indexed into an array.
#[derive(Debug, Clone, PartialEq)]
struct Step<'a> {
    key: &'a str,
    index: Option<usize>,
}

fn steps(path: &str) -> Option<Vec<Step<'_>>> {
    path.split('.')
        .map(|part| match part.split_once('[') {
            None if !part.is_empty() => Some(Step { key: part, index: None }),
            Some((key, rest)) if !key.is_empty() => {
                let i = rest.strip_suffix(']')?.parse().ok()?;
                Some(Step { key, index: Some(i) })
            }
            _ => None,
        })
        .collect()
}

impl Document {
    /// Parse project text (TOML syntax only; `project` validates).
    pub fn parse(text: &str, file: &str) -> Result<Document> {
        let table = super::toml_table(text, file)?;
        Ok(Document { file: file.to_string(), table })
    }

    /// Validate the (changed) document. Messages name `label` as the file
    /// and carry no line numbers: the lines of a changed document are not
    /// those of the file on disk.
    pub fn project(&self, label: &str) -> Result<Project> {
        super::validate_table(self.table.clone(), label, &LineMap::default())
    }

    fn get(&self, path: &str) -> Option<&toml::Value> {
        let mut table = &self.table;
        let steps = steps(path)?;
        for (k, s) in steps.iter().enumerate() {
            let mut v = table.get(s.key)?;
            if let Some(i) = s.index {
                v = v.as_array()?.get(i)?;
            }
            if k + 1 == steps.len() {
                return Some(v);
            }
            table = v.as_table()?;
        }
        None
    }

    /// The number at `path` (integer or float).
    pub fn number(&self, path: &str) -> Option<f64> {
        match self.get(path)? {
            toml::Value::Float(x) => Some(*x),
            toml::Value::Integer(i) => Some(*i as f64),
            _ => None,
        }
    }

    /// Whether `path` names a value that may be set: one present in the
    /// file, or a key the table at its parent allows (a berm width that is
    /// not written yet, say).
    fn settable(&self, path: &str) -> bool {
        match self.get(path) {
            Some(v) => return !v.is_table() && !v.is_array(),
            None if path.ends_with(']') => return false,
            None => {}
        }
        let Some((parent, last)) = path.rsplit_once('.') else {
            return false;
        };
        let parent_exists = self.get(parent).is_some_and(toml::Value::is_table);
        parent_exists && super::known_fields(parent).contains(&last)
    }

    /// Set `path` to `value`.
    pub fn set(&mut self, path: &str, value: toml::Value) -> Result<()> {
        if !self.settable(path) {
            return Err(self.unknown_key(path));
        }
        let (parent, last) = path.rsplit_once('.').map_or(("", path), |(p, l)| (p, l));
        let missing = Error::Usage(format!("{path} does not exist in {}", self.file));
        let table = if parent.is_empty() { Some(&mut self.table) } else { self.table_mut(parent) };
        let table = table.ok_or(missing)?;
        match steps(last).and_then(|s| s.into_iter().next()) {
            Some(Step { key, index: Some(i) }) => {
                let slot = table.get_mut(key).and_then(|v| v.as_array_mut()).and_then(|a| a.get_mut(i));
                *slot.ok_or_else(|| Error::Usage(format!("{path} does not exist")))? = value;
            }
            _ => {
                table.insert(last.to_string(), value);
            }
        }
        Ok(())
    }

    /// The (changed) document as TOML text; comments and layout of the
    /// original file are not kept.
    pub fn to_text(&self) -> Result<String> {
        toml::to_string(&self.table).map_err(|e| Error::Computation(format!("{} as TOML: {e}", self.file)))
    }

    /// Insert or replace `key` of the top-level table `table` whatever its
    /// type (lists such as `construction.holidays`, which `set` refuses).
    pub fn replace(&mut self, table: &str, key: &str, value: toml::Value) -> Result<()> {
        let path = format!("{table}.{key}");
        if !super::known_fields(table).contains(&key) {
            return Err(self.unknown_key(&path));
        }
        let t = self.table.get_mut(table).and_then(toml::Value::as_table_mut);
        t.ok_or_else(|| Error::Usage(format!("{path}: there is no [{table}] in {}", self.file)))?
            .insert(key.into(), value);
        Ok(())
    }

    /// Remove a top-level key (a table or array of tables) if present.
    pub fn remove(&mut self, key: &str) {
        self.table.remove(key);
    }

    /// Multiply the number at `path` by `factor`.
    pub fn scale(&mut self, path: &str, factor: f64) -> Result<()> {
        let v = self.number(path).ok_or_else(|| self.unknown_key(path))?;
        self.set(path, toml::Value::Float(v * factor))
    }

    fn table_mut(&mut self, path: &str) -> Option<&mut toml::Table> {
        let mut table = &mut self.table;
        for s in steps(path)? {
            let mut v = table.get_mut(s.key)?;
            if let Some(i) = s.index {
                v = v.as_array_mut()?.get_mut(i)?;
            }
            table = v.as_table_mut()?;
        }
        Some(table)
    }

    /// Every path in the document that holds a number, in file order.
    pub fn numeric_paths(&self) -> Vec<String> {
        let mut out = Vec::new();
        walk_table(&self.table, "", &mut out);
        out
    }

    /// The error for a key that names nothing settable, with the numeric
    /// keys of the file closest to it.
    pub fn unknown_key(&self, path: &str) -> Error {
        Error::Usage(self.unknown_key_message(path))
    }

    fn unknown_key_message(&self, path: &str) -> String {
        let mut near: Vec<(f64, String)> =
            self.numeric_paths().into_iter().map(|k| (strsim::jaro_winkler(path, &k), k)).collect();
        near.sort_by(|a, b| b.0.total_cmp(&a.0).then_with(|| a.1.cmp(&b.1)));
        let names: Vec<String> = near.into_iter().take(5).map(|(_, k)| k).collect();
        format!(
            "key {path} is not a value of {}; keys are paths such as ground.layers[1].cv_m2_per_year; the nearest are: {}",
            self.file,
            names.join(", ")
        )
    }

    /// Issues for `[[uncertain]]` keys that do not name a number in the
    /// document, with the line of the key.
    pub fn check_numeric_keys(&self, keys: &[(String, String)], lines: &LineMap) -> Vec<InputIssue> {
        keys.iter()
            .filter(|(_, k)| self.number(k).is_none())
            .map(|(at, k)| InputIssue { line: lines.line(at), key: at.clone(), message: self.unknown_key_message(k) })
            .collect()
    }
}

fn walk_table(t: &toml::Table, path: &str, out: &mut Vec<String>) {
    for (k, v) in t {
        let p = if path.is_empty() { k.clone() } else { format!("{path}.{k}") };
        walk(v, &p, out);
    }
}

fn walk(v: &toml::Value, path: &str, out: &mut Vec<String>) {
    match v {
        toml::Value::Table(t) => walk_table(t, path, out),
        toml::Value::Array(items) if items.iter().any(toml::Value::is_table) => {
            for (i, v) in items.iter().enumerate() {
                walk(v, &format!("{path}[{i}]"), out);
            }
        }
        toml::Value::Float(_) | toml::Value::Integer(_) => out.push(path.to_string()),
        _ => {}
    }
}

/// A value typed on the command line: a TOML number, boolean, date or
/// quoted string; anything else is taken as a bare string.
pub fn value_from_text(text: &str) -> toml::Value {
    let t = text.trim();
    format!("v = {t}")
        .parse::<toml::Table>()
        .ok()
        .and_then(|mut tb| tb.remove("v"))
        .unwrap_or_else(|| toml::Value::String(t.to_string()))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn demo() -> Document {
        Document::parse(crate::app::DEMO, "kestrel-fen.toml").unwrap()
    }

    #[test]
    fn paths_read_set_and_scale() {
        let mut d = demo();
        assert_eq!(d.number("drains.spacing_m"), Some(1.5));
        assert_eq!(d.number("ground.layers[1].cv_m2_per_year"), Some(1.5));
        d.scale("ground.layers[1].cv_m2_per_year", 2.0).unwrap();
        assert_eq!(d.number("ground.layers[1].cv_m2_per_year"), Some(3.0));
        d.set("embankment.reinforcement_kn_per_m", value_from_text("150")).unwrap();
        let p = d.project("variant").unwrap();
        assert_eq!(p.embankment.reinforcement_kn_per_m, 150.0);
        let crate::model::LayerKind::Clay(clay) = &p.ground.layers[1].kind else { panic!("layer 1 is clay") };
        assert!((clay.cv_m2_per_day * 365.25 - 3.0).abs() < 1e-9, "{}", clay.cv_m2_per_day * 365.25);
    }

    #[test]
    fn unknown_key_names_the_nearest() {
        let mut d = demo();
        let e = d.set("drains.spaceing_m", value_from_text("1.0")).unwrap_err().to_string();
        assert!(e.contains("drains.spacing_m"), "{e}");
        assert!(d.set("ground.layers[9].cv_m2_per_year", value_from_text("1")).is_err());
        assert!(d.set("embankment.berms", value_from_text("1")).is_err());
    }

    #[test]
    fn command_line_values() {
        assert_eq!(value_from_text("1.25"), toml::Value::Float(1.25));
        assert_eq!(value_from_text("2"), toml::Value::Integer(2));
        assert_eq!(value_from_text("square"), toml::Value::String("square".into()));
        assert_eq!(value_from_text("\"square\""), toml::Value::String("square".into()));
    }
}
