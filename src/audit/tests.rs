//! Checks of the hash chain: clean logs verify, any edit, removal, torn
//! line or re-hashed forgery is found at its line or against the anchor.

use super::*;

fn fields(d: &str) -> Map<String, Value> {
    let mut m = Map::new();
    m.insert("recommendation".into(), Value::from(d));
    m.insert("fs".into(), Value::from(1.2345));
    m
}

fn log(n: usize) -> String {
    let mut out = String::new();
    let mut prev = GENESIS.to_string();
    for k in 1..=n {
        let line = entry_line(fields(if k % 2 == 0 { "hold" } else { "criteria-met" }), k, &prev).unwrap();
        prev = sha256_hex(line.trim_end_matches('\n').as_bytes());
        out.push_str(&line);
    }
    out
}

fn bad_line(text: &str) -> Option<usize> {
    match verify_bytes(text.as_bytes(), "log") {
        Ok(_) => None,
        Err(Error::Input { issues, .. }) => issues[0].line,
        Err(e) => panic!("{e}"),
    }
}

#[test]
fn a_clean_chain_verifies() {
    assert_eq!(verify_bytes(log(4).as_bytes(), "log").unwrap().entries, 4);
    assert_eq!(bad_line(""), None);
}

#[test]
fn editing_any_line_is_found_at_that_line() {
    let text = log(4);
    for k in 0..4 {
        let lines: Vec<String> = text
            .lines()
            .enumerate()
            .map(|(i, l)| if i == k { l.replace("1.2345", "1.3345") } else { l.to_string() })
            .collect();
        assert_eq!(bad_line(&(lines.join("\n") + "\n")), Some(k + 1), "edit at line {}", k + 1);
    }
}

#[test]
fn a_change_of_form_alone_is_an_edit() {
    // The exact bytes are hashed: the same JSON written with a space is a
    // different line (the old check re-serialised and compared).
    let text = log(2).replacen("\"fs\":1.2345", "\"fs\": 1.2345", 1);
    assert_eq!(bad_line(&text), Some(1));
}

#[test]
fn removing_a_line_breaks_the_chain_there() {
    let text = log(4);
    let lines: Vec<&str> = text.lines().collect();
    let text = [lines[0], lines[2], lines[3]].join("\n") + "\n";
    assert_eq!(bad_line(&text), Some(2));
}

#[test]
fn a_torn_last_line_is_detected() {
    let text = log(3);
    for cut in [1, 10, 40] {
        assert_eq!(bad_line(&text[..text.len() - cut]), Some(3), "cut {cut}");
    }
}

#[test]
fn a_dropped_last_entry_is_found_against_the_record_anchor() {
    // Record 4 carries the head of the log before it (line 3's hash).
    let text = log(4);
    let (_, entries) = parse(text.as_bytes(), "log").unwrap();
    let anchor = Anchor { record: 4, head: entries[2].line_sha256.clone() };
    assert!(check_anchor("log", &entries, &anchor).is_ok());
    let dropped: String = text.lines().take(3).map(|l| format!("{l}\n")).collect();
    let (v, short) = parse(dropped.as_bytes(), "log").unwrap();
    assert_eq!(v.entries, 3, "the shortened chain is itself intact");
    let err = check_anchor("log", &short, &anchor).unwrap_err().to_string();
    assert!(err.contains("dropped"), "{err}");
}

#[test]
fn a_rehashed_forgery_is_found_against_the_record_anchor() {
    // Forge entry 2 and re-hash entries 2–4 consistently: the chain is
    // intact on its own, but no longer ends in the head record 4 carries.
    let honest = log(4);
    let (_, entries) = parse(honest.as_bytes(), "log").unwrap();
    let anchor = Anchor { record: 4, head: entries[2].line_sha256.clone() };
    let mut forged = String::new();
    let mut prev = GENESIS.to_string();
    for (k, e) in entries.iter().enumerate() {
        let mut f = e.fields.clone();
        if k == 1 {
            f.insert("recommendation".into(), Value::from("criteria-met"));
        }
        let line = entry_line(f, k + 1, &prev).unwrap();
        prev = sha256_hex(line.trim_end_matches('\n').as_bytes());
        forged.push_str(&line);
    }
    let (v, fe) = parse(forged.as_bytes(), "log").unwrap();
    assert_eq!(v.entries, 4);
    let err = check_anchor("log", &fe, &anchor).unwrap_err().to_string();
    assert!(err.contains("re-hashed"), "{err}");
}

#[test]
fn awkward_floats_keep_their_written_form() {
    let mut text = String::new();
    let mut prev = GENESIS.to_string();
    let mut x = 0.1f64;
    for k in 1..=200 {
        x = (x * 7.389_056_098_930_65 + 0.123_456_789).fract() * 3.0;
        let mut m = Map::new();
        m.insert("fs_next".into(), Value::from(x));
        m.insert("multiplier".into(), Value::from(x / 3.7));
        let line = entry_line(m, k, &prev).unwrap();
        prev = sha256_hex(line.trim_end_matches('\n').as_bytes());
        text.push_str(&line);
    }
    assert_eq!(verify_bytes(text.as_bytes(), "log").unwrap().entries, 200);
}
