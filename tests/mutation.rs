//! Generated mutation corpus (issue 16 §1): every numeric key of the demo
//! (examples/kestrel-fen.toml) and of the template (templates/project.toml)
//! set to each of {a string, −1e9, 0, 1e300, nan, inf}, and an unknown key
//! added to each table, run through the binary's commands that read a
//! project (check, stability, assess, plan, compare, risk with few runs,
//! release with the demo readings). Asserted for every run: exit code 0, 1
//! or 2 only; no panic; a mutant that `check` refuses is refused by every
//! command with exit 2 and the mutated key named; every run ends within a
//! generous limit (killed and failed otherwise).
//!
//! The normal suite runs the reduced set (every mutant through `check`,
//! the mutants `check` accepts through `stability` and `plan`); the full
//! set is `cargo test --release --test mutation -- --ignored`.

mod common;
use common::root;
use fillpace::input::vary::Document;
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::sync::Mutex;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::time::{Duration, Instant};

/// Generous limit for one run of the binary (the slowest valid mutant runs
/// a few seconds alone; the machine may be shared).
const LIMIT: Duration = Duration::from_secs(300);

/// The values every numeric key is set to.
fn values() -> Vec<(&'static str, toml::Value)> {
    vec![
        ("string", toml::Value::String("abc".into())),
        ("-1e9", toml::Value::Float(-1e9)),
        ("0", toml::Value::Integer(0)),
        ("1e300", toml::Value::Float(1e300)),
        ("nan", toml::Value::Float(f64::NAN)),
        ("inf", toml::Value::Float(f64::INFINITY)),
    ]
}

/// One mutated project file and the key path it changes.
struct Mutant {
    key: String,
    path: PathBuf,
}

/// Every mutant of `source`, written into `dir`.
fn mutants(source: &str, dir: &Path) -> Vec<Mutant> {
    let text = std::fs::read_to_string(root(source)).unwrap();
    let doc = Document::parse(&text, source).unwrap();
    let stem = Path::new(source).file_stem().unwrap().to_string_lossy().into_owned();
    let mut out = Vec::new();
    let mut write = |key: String, body: String| {
        let path = dir.join(format!("{stem}-{}.toml", out.len()));
        std::fs::write(&path, body).unwrap();
        out.push(Mutant { key, path });
    };
    for key in doc.numeric_paths() {
        for (_, v) in values() {
            let mut d = doc.clone();
            d.set(&key, v).unwrap();
            write(key.clone(), d.to_text().unwrap());
        }
    }
    let table: toml::Table = text.parse().unwrap();
    for at in table_paths(&toml::Value::Table(table.clone()), "") {
        let mut t = toml::Value::Table(table.clone());
        table_at(&mut t, &at).insert("zz_unknown_key".into(), toml::Value::Integer(1));
        let key = if at.is_empty() { "zz_unknown_key".to_string() } else { format!("{at}.zz_unknown_key") };
        write(key, toml::to_string(&t).unwrap());
    }
    out
}

/// Paths of every table (array elements included), the root as "".
fn table_paths(v: &toml::Value, path: &str) -> Vec<String> {
    let mut out = Vec::new();
    match v {
        toml::Value::Table(t) => {
            out.push(path.to_string());
            for (k, x) in t {
                let p = if path.is_empty() { k.clone() } else { format!("{path}.{k}") };
                out.extend(table_paths(x, &p));
            }
        }
        toml::Value::Array(items) => {
            for (i, x) in items.iter().enumerate() {
                out.extend(table_paths(x, &format!("{path}[{i}]")));
            }
        }
        _ => {}
    }
    out
}

fn table_at<'a>(v: &'a mut toml::Value, path: &str) -> &'a mut toml::Table {
    let mut cur = v;
    for part in path.split('.').filter(|p| !p.is_empty()) {
        let (key, index) = match part.split_once('[') {
            Some((k, rest)) => (k, Some(rest.trim_end_matches(']').parse::<usize>().unwrap())),
            None => (part, None),
        };
        cur = cur.as_table_mut().unwrap().get_mut(key).unwrap();
        if let Some(i) = index {
            cur = cur.as_array_mut().unwrap().get_mut(i).unwrap();
        }
    }
    cur.as_table_mut().unwrap()
}

/// The arguments of each command for project `p`; outputs go to `dir`.
fn commands(p: &Path, dir: &Path) -> Vec<(&'static str, Vec<String>)> {
    let p = p.display().to_string();
    let tag = Path::new(&p).file_stem().unwrap().to_string_lossy().into_owned();
    let out = |ext: &str| dir.join(format!("{tag}.{ext}")).display().to_string();
    let s = |v: &[&str]| v.iter().map(|x| x.to_string()).collect::<Vec<_>>();
    vec![
        ("check", s(&["check", &p])),
        ("stability", s(&["stability", &p, "--height", "2"])),
        ("assess", s(&["assess", &p, "--tail-days", "30"])),
        ("plan", s(&["plan", &p])),
        ("compare", s(&["compare", &p, "--vary", "embankment.crest_width_m=30"])),
        ("risk", s(&["risk", &p, "--runs", "3", "--seed", "1"])),
        (
            "release",
            s(&[
                "release",
                &p,
                "--readings",
                &root("examples/kestrel-fen-readings.csv").display().to_string(),
                "--lift",
                "1.0",
                "--pdf",
                &out("pdf"),
                "--log",
                &out("jsonl"),
            ]),
        ),
    ]
}

/// Exit code and standard error of one run, killed after `LIMIT`.
fn run(args: &[String]) -> (Option<i32>, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_fillpace"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .stdin(Stdio::null())
        .stdout(Stdio::null())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let started = Instant::now();
    loop {
        if let Some(status) = child.try_wait().unwrap() {
            let mut err = String::new();
            std::io::Read::read_to_string(child.stderr.as_mut().unwrap(), &mut err).unwrap();
            return (status.code(), err);
        }
        if started.elapsed() > LIMIT {
            child.kill().unwrap();
            let _ = child.wait();
            return (None, format!("killed after {} s", LIMIT.as_secs()));
        }
        std::thread::sleep(Duration::from_millis(5));
    }
}

/// `f` over `items` on as many threads as there are cores, in order.
fn par_map<T: Sync, R: Send>(items: &[T], f: impl Fn(&T) -> R + Sync) -> Vec<R> {
    let next = AtomicUsize::new(0);
    let results = Mutex::new(Vec::new());
    let threads = std::thread::available_parallelism().map_or(2, |n| n.get());
    std::thread::scope(|s| {
        for _ in 0..threads {
            s.spawn(|| {
                loop {
                    let i = next.fetch_add(1, Ordering::Relaxed);
                    let Some(item) = items.get(i) else { break };
                    let r = f(item);
                    results.lock().unwrap().push((i, r));
                }
            });
        }
    });
    let mut r = results.into_inner().unwrap();
    r.sort_by_key(|(i, _)| *i);
    r.into_iter().map(|(_, x)| x).collect()
}

/// Run the jobs; returns the failures.
fn run_all(jobs: Vec<(String, Vec<String>, Option<String>)>) -> Vec<String> {
    par_map(&jobs, |(label, args, must_name)| {
        judge(&run(args), must_name.as_deref()).map(|why| format!("{label}: {why}"))
    })
    .into_iter()
    .flatten()
    .collect()
}

/// Why a run fails the corpus' rules, if it does. `must_name`: the key a
/// refused mutant's message must name (exit 2 required).
fn judge((code, err): &(Option<i32>, String), must_name: Option<&str>) -> Option<String> {
    if err.contains("panicked") {
        return Some(format!("panicked: {err}"));
    }
    match (code, must_name) {
        (None, _) => Some(format!("no exit code: {err}")),
        (Some(c), _) if !(0..=2).contains(c) => Some(format!("exit code {c}: {err}")),
        (Some(2), Some(key)) if err.contains(key) => None,
        (Some(c), Some(key)) => Some(format!("exit {c}, key {key} not named as a refusal: {err}")),
        (Some(_), None) => None,
    }
}

/// Check every mutant; returns whether `check` accepted each, and the
/// failures.
fn check_all(mutants: &[Mutant]) -> (Vec<bool>, Vec<String>) {
    let runs = par_map(mutants, |m| run(&["check".to_string(), m.path.display().to_string()]));
    let mut failures = Vec::new();
    for (m, (code, err)) in mutants.iter().zip(&runs) {
        if let Some(why) = judge(&(*code, err.clone()), None) {
            failures.push(format!("check {} ({}): {why}", m.key, m.path.display()));
        } else if *code == Some(2) && !err.contains(&m.key) {
            failures.push(format!("check {} refused without naming the key: {err}", m.key));
        }
    }
    (runs.iter().map(|(code, _)| *code == Some(0)).collect(), failures)
}

/// Jobs for `commands` (by name) on each mutant: refused mutants must be
/// refused naming their key, accepted ones only end cleanly.
fn jobs(
    mutants: &[Mutant],
    accepted: &[bool],
    names: &[&str],
    dir: &Path,
    refused_too: bool,
) -> Vec<(String, Vec<String>, Option<String>)> {
    let mut out = Vec::new();
    for (m, ok) in mutants.iter().zip(accepted) {
        if !ok && !refused_too {
            continue;
        }
        for (name, args) in commands(&m.path, dir) {
            if name != "check" && names.contains(&name) {
                let label = format!("{name} {} ({})", m.key, m.path.display());
                out.push((label, args, (!ok).then(|| m.key.clone())));
            }
        }
    }
    out
}

fn corpus(full: bool) {
    let dir = tempfile::tempdir().unwrap();
    let mut all = Vec::new();
    for source in ["examples/kestrel-fen.toml", "templates/project.toml"] {
        all.extend(mutants(source, dir.path()));
    }
    assert!(all.len() > 6 * 100, "only {} mutants", all.len());
    let (accepted, mut failures) = check_all(&all);
    let n_ok = accepted.iter().filter(|a| **a).count();
    assert!(n_ok > 0 && n_ok < all.len() / 2, "{n_ok} of {} mutants accepted", all.len());
    let names: &[&str] =
        if full { &["stability", "assess", "plan", "compare", "risk", "release"] } else { &["stability", "plan"] };
    failures.extend(run_all(jobs(&all, &accepted, names, dir.path(), full)));
    assert!(failures.is_empty(), "{} failures:\n{}", failures.len(), failures.join("\n"));
}

#[test]
fn mutation_corpus_reduced() {
    corpus(false);
}

#[test]
#[ignore = "full mutation corpus, minutes; CI runs it with --ignored"]
fn mutation_corpus_full() {
    corpus(true);
}
