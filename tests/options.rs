//! Design options and uncertainty on real files: `compare` plans every
//! variant of the grid, `risk` checks the timetable against realisations of
//! the declared uncertain parameters. Checks against closed forms and
//! against the deterministic plan.

mod common;
use common::*;
use predicates::prelude::*;

const PHI0: &str = "tests/data/phi0-single-lift.toml";

fn risk_json(project: &std::path::Path, args: &[&str]) -> Vec<u8> {
    let out = fillpace().arg("risk").arg(project).args(args).arg("--json").output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    out.stdout
}

/// Standard normal distribution function Φ(z) = ½(1 + erf(z/√2)), with erf
/// from its Maclaurin series (Abramowitz & Stegun 1964, eq. 7.1.5): an
/// independent reference, not the crate's own Φ. Accurate to about 1e-12
/// for |z| ≤ 4 (the terms' cancellation costs at most e^{x²} ≈ 3000 ulps).
fn phi(z: f64) -> f64 {
    let x = z / std::f64::consts::SQRT_2;
    let (mut term, mut sum) = (x, x);
    for n in 1..200 {
        term *= -x * x / n as f64;
        sum += term / (2 * n + 1) as f64;
    }
    0.5 * (1.0 + 2.0 / std::f64::consts::PI.sqrt() * sum)
}

#[test]
fn the_reference_normal_matches_the_table() {
    // Published: Φ(1) = 0.8413447, Φ(1.96) = 0.9750021, Φ(−2) = 0.0227501
    // (Abramowitz & Stegun 1964, Table 26.1).
    for (z, p) in [(1.0, 0.841_344_7), (1.96, 0.975_002_1), (-2.0, 0.022_750_1)] {
        assert!((phi(z) - p).abs() < 1e-7, "Φ({z}) = {}", phi(z));
    }
}

#[test]
fn lognormal_su_gives_the_closed_form_probability_of_failure() {
    // φ = 0 clay, strengthless fill, no strength gain: every circle's FS is
    // proportional to su0, so FS = X·F1 with X the lognormal factor (mean 1,
    // CoV v) and P(FS < 1) = P(X < 1/F1) = Φ((ln(1/F1) − μ)/σ), σ² = ln(1 + v²),
    // μ = −σ²/2 (general statistics: the lognormal distribution function).
    let runs = 4000;
    let r = json_result(&risk_json(&root(PHI0), &["--runs", &runs.to_string(), "--seed", "11"]));
    let f1 = r["stages"][0]["fs_best_estimate"].as_f64().unwrap();
    let s2 = (1.0f64 + 0.3 * 0.3).ln();
    let z = ((1.0 / f1).ln() + 0.5 * s2) / s2.sqrt();
    let closed = phi(z);
    let mc = r["below_one"]["probability"].as_f64().unwrap();
    // Monte Carlo standard error √(p(1 − p)/n); 3 standard errors.
    let se = (closed * (1.0 - closed) / runs as f64).sqrt();
    assert!((mc - closed).abs() < 3.0 * se, "Monte Carlo {mc} against closed form {closed} (s.e. {se})");
    // And each realisation's FS is the factor times the best estimate: the
    // seeded circle search finds the same critical circle.
    for x in r["realisations"].as_array().unwrap() {
        let factor = x["factors"][0].as_f64().unwrap();
        let fs = x["stage_fs"][0].as_f64().unwrap();
        assert!((fs - factor * f1).abs() < 1e-6 * fs, "FS {fs} against {factor} × {f1}");
    }
}

#[test]
fn same_seed_same_bytes_and_threads_do_not_matter() {
    let p = root(PHI0);
    let a = risk_json(&p, &["--runs", "60", "--seed", "5", "--threads", "1"]);
    let b = risk_json(&p, &["--runs", "60", "--seed", "5", "--threads", "2"]);
    let c = risk_json(&p, &["--runs", "60", "--seed", "5", "--threads", "2"]);
    let d = risk_json(&p, &["--runs", "60", "--seed", "6", "--threads", "2"]);
    assert_eq!(a, b, "one and two threads differ");
    assert_eq!(b, c, "the same seed gave different output");
    assert_ne!(c, d, "a different seed gave the same output");
}

#[test]
fn zero_cov_reproduces_the_deterministic_plan() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(root(DEMO)).unwrap();
    let zero: String = text
        .lines()
        .map(|l| if l.starts_with("cov = ") { "cov = 0.0".to_string() } else { l.to_string() })
        .collect::<Vec<_>>()
        .join("\n");
    assert!(zero.contains("cov = 0.0"));
    let path = dir.path().join("zero-cov.toml");
    std::fs::write(&path, zero).unwrap();
    let out = fillpace().arg("plan").arg(&path).arg("--json").output().unwrap();
    assert!(out.status.success());
    let plan = json_result(&out.stdout);
    let r = json_result(&risk_json(&path, &["--runs", "2"]));
    let stages = plan["stages"].as_array().unwrap();
    for x in r["realisations"].as_array().unwrap() {
        assert!(x["factors"].as_array().unwrap().iter().all(|f| f.as_f64() == Some(1.0)));
        for (s, fs) in stages.iter().zip(x["stage_fs"].as_array().unwrap()) {
            assert_eq!(s["fs_end"].as_f64(), fs.as_f64(), "stage {}", s["number"]);
        }
        assert_eq!(x["finish"], plan["finish"]);
        assert_eq!(x["duration_days"], plan["duration_days"]);
    }
    assert_eq!(r["below_one"]["count"], 0);
    assert_eq!(r["lowest_fs"]["p50"], plan["min_fs"]);
    // Risk keeps the plan's warnings (issue 14: they were lost): the demo's
    // 2:1 face of φ' = 34° fill is limited to tan 34°/0.5 = 1.349 (infinite
    // slope, closed form), below the 1.35 service target.
    assert!(has_warning(&r["warnings"], "fill face"), "{}", r["warnings"]);
}

/// Whether a JSON array of warnings has one containing `text`.
fn has_warning(warnings: &serde_json::Value, text: &str) -> bool {
    warnings.as_array().is_some_and(|w| w.iter().any(|w| w.as_str().is_some_and(|w| w.contains(text))))
}

#[test]
fn risk_without_uncertain_parameters_is_refused() {
    fillpace()
        .args(["risk", "tests/data/minimal.toml", "--runs", "5"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("[[uncertain]]"));
    fillpace().args(["risk", PHI0, "--runs", "0"]).assert().code(2).stderr(predicate::str::contains("--runs"));
}

#[test]
fn compare_plans_every_variant_sorted_by_finish() {
    let dir = tempfile::tempdir().unwrap();
    let (csv, pdf) = (dir.path().join("options.csv"), dir.path().join("options.pdf"));
    let out = fillpace()
        .args(["compare", DEMO, "--vary", "drains.spacing_m=2.5,1.2", "--json", "--csv"])
        .arg(&csv)
        .arg("--pdf")
        .arg(&pdf)
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    let v = r["variants"].as_array().unwrap();
    assert_eq!(v.len(), 2);
    // Closer drains consolidate faster (Hansbo 1981: the radial time factor
    // scales with 1/de²), so the 1.2 m variant finishes first.
    assert_eq!(v[0]["settings"][0]["value"], "1.2");
    assert!(v[0]["outcome"]["finish"].as_str().unwrap() < v[1]["outcome"]["finish"].as_str().unwrap());
    let d = |k: usize| v[k]["outcome"]["drain_length_m_per_m"].as_f64().unwrap();
    // Drain length goes as 1/s²: (2.5/1.2)² = 4.34.
    assert!((d(0) / d(1) - (2.5f64 / 1.2).powi(2)).abs() < 1e-9);
    // Each variant keeps its plan's warnings (issue 14: they were lost); the
    // demo's fill face (1.349, closed form) is below the service target.
    assert!(v.iter().all(|x| has_warning(&x["warnings"], "fill face")), "{r}");
    // The table says so too (review finding: a variant ranked first could
    // miss the service checks with only a warning under the table): the
    // fill face's tan 34°/tan 26.57° = 1.349 (closed form, Skempton &
    // DeLory 1957) is below the demo's service target 1.35 in both.
    for x in v {
        let o = &x["outcome"];
        assert!((o["fs_finish"].as_f64().unwrap() - 34f64.to_radians().tan() / 0.5).abs() < 1e-3, "{o}");
        assert!(o["service_shortfalls"][0].as_str().unwrap().starts_with("FS at finish 1.349 < 1.35"), "{o}");
    }
    let text = std::fs::read_to_string(&csv).unwrap();
    // caution comment line, stage geometry comment, header, one row per
    // variant
    assert_eq!(text.lines().count(), 5);
    assert!(text.starts_with("# fillpace "));
    assert!(text.lines().nth(1).unwrap().starts_with("# stage geometry: full-footprint"), "{text}");
    assert!(text.lines().nth(2).unwrap().starts_with("variant,settings,lifts,finish"));
    assert!(std::fs::read(&pdf).unwrap().starts_with(b"%PDF"));
}

#[test]
fn compare_names_the_nearest_keys_for_an_unknown_one() {
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("x.csv");
    fillpace()
        .args(["compare", DEMO, "--vary", "drains.spaceing_m=1,2", "--csv"])
        .arg(&csv)
        .assert()
        .code(2)
        .stderr(predicate::str::contains("drains.spacing_m"));
    assert!(!csv.exists());
    fillpace()
        .args(["compare", DEMO, "--vary", "drains.spacing_m=0.01"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("drains.spacing_m"));
}

#[test]
fn reliability_target_is_the_lowest_that_meets_the_probability() {
    // The limit is an input of the scenario, not a tolerance. It was 0.05;
    // since a measured su0 anchors the initial strength, the demo's su0
    // uncertainty (CoV 0.2) reaches the FS where SHANSEP used to mask it,
    // and 30 runs give P(FS < 1) ≈ 0.12 at target 1.30 with no higher
    // target buildable, so 0.05 has no answer; 0.15 keeps a bracketed search.
    let out = fillpace()
        .args(["risk", DEMO, "--runs", "30", "--max-failure-probability", "0.15", "--json"])
        .output()
        .unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    let r = json_result(&out.stdout);
    let rel = &r["reliability"];
    let t = rel["fs_target"].as_f64().unwrap();
    assert_eq!(r["fs_target"].as_f64(), Some(t), "the result is for the plan at the chosen target");
    let trials = rel["trials"].as_array().unwrap();
    let at = |x: f64| trials.iter().find(|k| (k["fs_target"].as_f64().unwrap() - x).abs() < 1e-9);
    assert_eq!(at(t).unwrap()["meets"], true);
    if t > 1.0 + 1e-9 {
        assert_eq!(at(t - 0.01).expect("the target 0.01 lower was tried")["meets"], false);
    }
    // The final run uses the same random streams: every stage meets the limit.
    for s in r["stages"].as_array().unwrap() {
        let p = s["p_below_one_lognormal"].as_f64().or(s["below_one"]["probability"].as_f64()).unwrap();
        assert!(p <= 0.15, "stage {} P(FS < 1) = {p}", s["number"]);
    }
}
