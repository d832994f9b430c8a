//! Where each key of a TOML document sits: a map from key path
//! (`ground.layers[2].cr`) to its 1-based line, built from the spans the
//! `toml` parser keeps, so every error can name its line.

use std::collections::HashMap;
use toml::de::{DeTable, DeValue};

/// Key path → 1-based line of the key (or of the table header).
#[derive(Debug, Default)]
pub struct LineMap {
    lines: HashMap<String, usize>,
}

impl LineMap {
    /// Build the map for a document; a document that does not parse gives an
    /// empty map (the parse error itself carries the line).
    pub fn build(text: &str) -> Self {
        let mut map = LineMap::default();
        if let Ok(doc) = DeTable::parse(text) {
            let starts = line_starts(text);
            map.walk_table(doc.get_ref(), "", &starts);
        }
        map
    }

    fn walk_table(&mut self, table: &DeTable<'_>, prefix: &str, starts: &[usize]) {
        for (key, value) in table.iter() {
            let path = join(prefix, key.get_ref());
            let line = line_of(starts, key.span().start);
            self.lines.entry(path.clone()).or_insert(line);
            self.walk_value(value.get_ref(), value.span().start, &path, starts);
        }
    }

    fn walk_value(&mut self, value: &DeValue<'_>, start: usize, path: &str, starts: &[usize]) {
        match value {
            DeValue::Table(t) => self.walk_table(t, path, starts),
            DeValue::Array(items) => {
                for (i, item) in items.iter().enumerate() {
                    let p = format!("{path}[{i}]");
                    let line = line_of(starts, item.span().start.max(start));
                    self.lines.insert(p.clone(), line);
                    self.walk_value(item.get_ref(), item.span().start, &p, starts);
                }
            }
            _ => {}
        }
    }

    /// Line of `path`, or of its nearest enclosing key that has one.
    pub fn line(&self, path: &str) -> Option<usize> {
        let mut p = path;
        loop {
            if let Some(l) = self.lines.get(p) {
                return Some(*l);
            }
            let cut = p.rfind(['.', '['])?;
            p = &p[..cut];
        }
    }
}

fn join(prefix: &str, key: &str) -> String {
    if prefix.is_empty() { key.to_string() } else { format!("{prefix}.{key}") }
}

fn line_starts(text: &str) -> Vec<usize> {
    std::iter::once(0).chain(text.match_indices('\n').map(|(i, _)| i + 1)).collect()
}

/// 1-based line containing byte offset `pos`.
pub fn line_of(starts: &[usize], pos: usize) -> usize {
    match starts.binary_search(&pos) {
        Ok(i) => i + 1,
        Err(i) => i,
    }
}

/// 1-based line of byte offset `pos` in `text`.
pub fn line_in(text: &str, pos: usize) -> usize {
    line_of(&line_starts(text), pos)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lines_of_nested_keys_and_array_tables() {
        let text = "[a]\nx = 1\n\n[[a.items]]\ny = 2\n[[a.items]]\ny = 3\nz = 4\n";
        let m = LineMap::build(text);
        assert_eq!(m.line("a.x"), Some(2));
        assert_eq!(m.line("a.items[1].z"), Some(8));
        assert_eq!(m.line("a.items[0].y"), Some(5));
        // missing key falls back to its table
        assert_eq!(m.line("a.items[1].missing"), m.line("a.items[1]"));
    }
}
