//! Carrying out a parsed command: load and validate the project, build the
//! engines, run, and write outputs (stdout, and files written atomically).
//! Returns the text for standard output; `main.rs` prints it.

use crate::cli::{Command, LogCommand};
use crate::error::{Error, Result};
use crate::model::Project;
use crate::monitoring::{
    readings,
    release::{self as release_check},
};
use crate::report::{self, Exporter, PlanReport, ReleaseReport};
use crate::response::Engine;
use crate::schedule::{Runner, assess, planner};
use crate::stability::{Circle, Section, search};
use crate::{input, output};
use chrono::NaiveDate;
use std::path::{Path, PathBuf};

/// The bundled demo project (examples/kestrel-fen.toml).
pub const DEMO: &str = include_str!("../examples/kestrel-fen.toml");
/// The commented starter project written by `fillpace new`.
pub const TEMPLATE: &str = include_str!("../templates/project.toml");

/// Run one command; returns what to print on standard output.
pub fn run(cmd: &Command) -> Result<String> {
    match cmd {
        Command::New { dir, json } => new(dir, *json),
        Command::Check { project, step, json } => check(project, *step, *json),
        Command::Assess { project, tail_days, csv, json } => assess_cmd(project, *tail_days, csv.as_deref(), *json),
        Command::Stability { project, height, date, circle, json } => {
            stability(project, *height, date.as_deref(), circle.as_deref(), *json)
        }
        Command::Plan { project, csv, ics, pdf, out, readings, json } => {
            let outs =
                PlanOutputs { csv: csv.as_deref(), ics: ics.as_deref(), pdf: pdf.as_deref(), dir: out.as_deref() };
            plan(project.as_deref(), readings.as_deref(), &outs, *json)
        }
        Command::Compare { project, vary, csv, pdf, json } => {
            compare(project, vary, csv.as_deref(), pdf.as_deref(), *json)
        }
        Command::Risk { project, runs, seed, threads, max_failure_probability, pdf, json } => {
            let opts = crate::risk::RiskOptions { runs: *runs, seed: *seed, threads: *threads };
            risk(project, opts, *max_failure_probability, pdf.as_deref(), *json)
        }
        Command::Release { project, readings, lift, on, pdf, log, json } => {
            let files = ReleaseFiles { readings, pdf: pdf.as_deref(), log: log.as_deref() };
            release(project, &files, *lift, on.as_deref(), *json)
        }
        Command::Log(LogCommand::Verify { log, json }) => {
            if !log.exists() {
                return Err(Error::Read {
                    path: log.clone(),
                    source: std::io::Error::new(std::io::ErrorKind::NotFound, "no such file"),
                });
            }
            let v = crate::audit::verify(log)?;
            if *json {
                Ok(format!(
                    "{}\n",
                    serde_json::json!({ "fillpace": env!("CARGO_PKG_VERSION"), "command": "log verify", "result": v })
                ))
            } else {
                Ok(report::text::log_verified(&v))
            }
        }
    }
}

fn new(dir: &Path, json: bool) -> Result<String> {
    if dir.exists() && std::fs::read_dir(dir).map(|mut d| d.next().is_some()).unwrap_or(true) {
        return Err(Error::Usage(format!(
            "{} already exists and is not empty; fillpace new never overwrites",
            dir.display()
        )));
    }
    std::fs::create_dir_all(dir).map_err(|source| Error::Write { path: dir.to_path_buf(), source })?;
    let path = dir.join("project.toml");
    output::write_atomic(&path, TEMPLATE.as_bytes())?;
    if json {
        return Ok(format!(
            "{}\n",
            serde_json::json!({ "fillpace": env!("CARGO_PKG_VERSION"), "command": "new", "written": path })
        ));
    }
    Ok(format!("wrote {}\nnext: fillpace check {}\n", path.display(), path.display()))
}

fn check(path: &Path, step: f64, json: bool) -> Result<String> {
    if !(step.is_finite() && (0.05..=10.0).contains(&step)) {
        return Err(Error::Usage(format!("--step {step} must be between 0.05 and 10 m")));
    }
    let p = input::load(path)?;
    let s = crate::ground::summary(&p, step);
    let src = path.display().to_string();
    let warnings = crate::plausibility::design_warnings(&Engine::new(&p));
    if json {
        report::json::envelope_with_warnings("check", &p, &src, &s, &warnings)
    } else {
        Ok(report::text::with_warnings(report::text::check(&p, &s, &src), &warnings))
    }
}

fn assess_cmd(path: &Path, tail: i64, csv: Option<&Path>, json: bool) -> Result<String> {
    if !(0..=3650).contains(&tail) {
        return Err(Error::Usage(format!("--tail-days {tail} must be between 0 and 3650")));
    }
    if let Some(out) = csv {
        output::refuse_overwrite_of_inputs(out, &[path])?;
    }
    let p = input::load(path)?;
    if p.sequence.is_empty() {
        return Err(Error::input(
            &path.display().to_string(),
            None,
            "sequence",
            "is empty; add [[sequence]] lifts (thickness_m, start_date) to assess".into(),
        ));
    }
    let engine = Engine::new(&p);
    let runner = Runner::new(&engine);
    let a = assess::assess(&runner, tail)?;
    if let Some(out) = csv {
        output::write_atomic(out, report::csv::series(&a).as_bytes())?;
    }
    if json {
        report::json::envelope("assess", &p, &path.display().to_string(), &a)
    } else {
        Ok(report::text::assess(&p, &a))
    }
}

fn stability(path: &Path, height: f64, date: Option<&str>, circle: Option<&str>, json: bool) -> Result<String> {
    let p = input::load(path)?;
    if !(height.is_finite() && height >= 0.0 && height <= p.max_height_m() + 1e-9) {
        return Err(Error::Usage(format!(
            "--height {height} must be between 0 and design height plus surcharge ({:.2} m)",
            p.max_height_m()
        )));
    }
    let engine = Engine::new(&p);
    let runner = Runner::new(&engine);
    let (st, when) = state_on(&runner, &p, date)?;
    // The section at the requested height, fill made up for settlement so far.
    let placed = if height > 0.0 { height + st.settlement_centre_m } else { 0.0 };
    let field = engine.field(&st);
    let section = Section::new(&p, height, &field);
    let src = path.display().to_string();
    let warnings = crate::plausibility::design_warnings(&engine);
    match circle {
        Some(text) => {
            let c = parse_circle(text)?;
            let r = section.analyse(c).map_err(|why| Error::Usage(format!("circle {text} cannot be analysed: {why}; a circle must cut the ground surface twice below its centre, move towards the toe and stay above the stiff base")))?;
            if json {
                report::json::envelope_with_warnings("stability", &p, &src, &r, &warnings)
            } else {
                Ok(report::text::with_warnings(report::text::stability_circle(&p, height, &when, &r), &warnings))
            }
        }
        None => {
            let r = search::search(&section)?;
            if json {
                report::json::envelope_with_warnings("stability", &p, &src, &r, &warnings)
            } else {
                let out = report::text::stability_search(&p, height, &when, placed, &r);
                Ok(report::text::with_warnings(out, &warnings))
            }
        }
    }
}

/// Ground state on a date following the project's sequence (initial state
/// without a date), and a description for the report.
fn state_on(r: &Runner, p: &Project, date: Option<&str>) -> Result<(crate::response::State, String)> {
    let mut st = r.engine.initial_state();
    let Some(text) = date else {
        return Ok((st, "initial (before any fill)".into()));
    };
    let d = NaiveDate::parse_from_str(text, "%Y-%m-%d")
        .map_err(|_| Error::Usage(format!("--date {text} is not a date YYYY-MM-DD")))?;
    if d < p.info.start_date {
        return Err(Error::Usage(format!("--date {d} is before project.start_date ({})", p.info.start_date)));
    }
    let day = r.calendar.day_of(d);
    if day > r.calendar.horizon() {
        return Err(Error::Usage(format!("--date {d} is beyond the 40-year horizon")));
    }
    for lift in p.sequence.iter().filter(|l| l.start <= d) {
        r.place_on(&mut st, lift.start, lift.thickness_m)?;
    }
    if st.day > day as f64 {
        return Err(Error::Usage(format!(
            "--date {d} falls during the placement of a lift; choose a date after it ends"
        )));
    }
    r.rest_until(&mut st, day, &mut |_| {});
    Ok((st, format!("on {d} after the project's sequence")))
}

fn parse_circle(text: &str) -> Result<Circle> {
    let v: Vec<f64> = text
        .split(',')
        .map(|s| s.trim().parse::<f64>())
        .collect::<std::result::Result<_, _>>()
        .map_err(|_| Error::Usage(format!("--circle {text}: give three numbers XC,YC,R in metres")))?;
    match v[..] {
        [xc, yc, r] if v.iter().all(|x| x.is_finite()) && r > 0.5 => Ok(Circle { xc_m: xc, yc_m: yc, r_m: r }),
        [_, _, r] if r <= 0.5 => {
            Err(Error::Usage(format!("--circle {text}: radius {r} m is too small (more than 0.5 m needed)")))
        }
        _ => Err(Error::Usage(format!("--circle {text}: give three finite numbers XC,YC,R in metres"))),
    }
}

/// A progress bar of `len` steps on standard error with `template`, or
/// None when standard error is not a terminal (nothing is drawn when piped).
fn terminal_bar(len: u64, template: &str) -> Option<indicatif::ProgressBar> {
    use std::io::IsTerminal;
    if !std::io::stderr().is_terminal() {
        return None;
    }
    let bar = indicatif::ProgressBar::new(len);
    bar.set_style(
        indicatif::ProgressStyle::with_template(template).unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
    );
    bar.enable_steady_tick(std::time::Duration::from_millis(200));
    Some(bar)
}

/// Run `f` with a progress bar; `f` reports progress as a fraction 0–1.
fn with_progress<T>(f: impl FnOnce(&mut dyn FnMut(f64)) -> T) -> T {
    let Some(bar) = terminal_bar(100, "planning {bar:40} {pos:>3}% of final height [{elapsed}]") else {
        return f(&mut |_| {});
    };
    let out = f(&mut |x| bar.set_position((100.0 * x).round() as u64));
    bar.finish_and_clear();
    out
}

/// Run `f` with a counting progress bar of `total` steps; `f` calls the
/// tick once per finished step (from any thread).
fn with_counter<T>(total: usize, what: &str, f: impl FnOnce(&(dyn Fn() + Sync)) -> T) -> T {
    let template = format!("{what} {{bar:40}} {{pos}}/{{len}} [{{elapsed}}, {{eta}} left]");
    let Some(bar) = terminal_bar(total as u64, &template) else {
        return f(&|| {});
    };
    let out = f(&|| bar.inc(1));
    bar.finish_and_clear();
    out
}

/// Read a project file as text and as an editable document.
fn document(path: &Path) -> Result<(String, input::vary::Document)> {
    let text = std::fs::read_to_string(path).map_err(|source| Error::Read { path: path.to_path_buf(), source })?;
    let doc = input::vary::Document::parse(&text, &path.display().to_string())?;
    Ok((text, doc))
}

fn compare(path: &Path, vary: &[String], csv: Option<&Path>, pdf: Option<&Path>, json: bool) -> Result<String> {
    for out in [csv, pdf].into_iter().flatten() {
        output::refuse_overwrite_of_inputs(out, &[path])?;
    }
    let (text, doc) = document(path)?;
    let p = input::parse(&text, &doc.file)?;
    let axes: Vec<crate::compare::Axis> = vary.iter().map(|v| crate::compare::Axis::parse(v)).collect::<Result<_>>()?;
    let total = crate::compare::grid(&axes).len();
    let c = with_counter(total, "planning variants", |tick| crate::compare::compare(&doc, &axes, tick))?;
    let rep = report::CompareReport { project: &p, comparison: &c, source: doc.file.clone() };
    if let Some(out) = csv {
        output::write_atomic(out, report::csv::comparison(&c, p.embankment.stage_shape).as_bytes())?;
    }
    if let Some(out) = pdf {
        output::write_atomic(out, &report::pdf::comparison(&rep, report::today())?)?;
    }
    if json { report::json::envelope("compare", &p, &doc.file, &c) } else { Ok(report::text::comparison(&rep)) }
}

fn risk(
    path: &Path,
    opts: crate::risk::RiskOptions,
    max_failure_probability: Option<f64>,
    pdf: Option<&Path>,
    json: bool,
) -> Result<String> {
    if let Some(out) = pdf {
        output::refuse_overwrite_of_inputs(out, &[path])?;
    }
    let (text, doc) = document(path)?;
    let p = input::parse(&text, &doc.file)?;
    crate::risk::check_request(&doc, &p, opts)?;
    let (doc, p, plan, reliability) = match max_failure_probability {
        Some(pf) => {
            let (d, q, plan, rel) = with_counter(opts.runs * 10, "reliability search, realisations", |tick| {
                crate::risk::reliability_target(&doc, &p, pf, opts, tick)
            })?;
            (d, q, plan, Some(rel))
        }
        None => {
            let engine = Engine::new(&p);
            let plan = with_progress(|tick| planner::plan_with_progress(&Runner::new(&engine), tick))?;
            (doc, p, plan, None)
        }
    };
    let started = std::time::Instant::now();
    let result =
        with_counter(opts.runs, "realisations", |tick| crate::risk::run(&doc, &p, &plan, opts, reliability, tick))?;
    let seconds = started.elapsed().as_secs_f64();
    let rep = report::RiskReport { project: &p, risk: &result, source: doc.file.clone(), seconds };
    if let Some(out) = pdf {
        output::write_atomic(out, &report::pdf::risk(&rep, report::today())?)?;
    }
    if json { report::json::envelope("risk", &p, &doc.file, &result) } else { Ok(report::text::risk(&rep)) }
}

/// Where `plan` writes its files.
pub struct PlanOutputs<'a> {
    pub csv: Option<&'a Path>,
    pub ics: Option<&'a Path>,
    pub pdf: Option<&'a Path>,
    /// Folder receiving plan.csv, plan.ics, plan.pdf and plan.json.
    pub dir: Option<&'a Path>,
}

impl PlanOutputs<'_> {
    /// (format, path) pairs to write.
    fn files(&self) -> Vec<(&'static str, PathBuf)> {
        let mut v: Vec<(&'static str, PathBuf)> = Vec::new();
        for (kind, p) in [("csv", self.csv), ("ics", self.ics), ("pdf", self.pdf)] {
            if let Some(p) = p {
                v.push((kind, p.to_path_buf()));
            }
        }
        if let Some(d) = self.dir {
            for kind in ["csv", "ics", "pdf", "json"] {
                v.push((kind, d.join(format!("plan.{kind}"))));
            }
        }
        v
    }
}

fn plan(path: Option<&Path>, readings_file: Option<&Path>, outs: &PlanOutputs, json: bool) -> Result<String> {
    let (text, mut source, mut inputs): (String, String, Vec<PathBuf>) = match path {
        Some(f) => {
            let t = std::fs::read_to_string(f).map_err(|source| Error::Read { path: f.to_path_buf(), source })?;
            (t, f.display().to_string(), vec![f.to_path_buf()])
        }
        None => (DEMO.to_string(), "the bundled demo site (examples/kestrel-fen.toml)".into(), vec![]),
    };
    let name = path.map_or("bundled demo (examples/kestrel-fen.toml)".to_string(), |f| f.display().to_string());
    let mut p = input::parse(&text, &name)?;
    let mut start = None;
    if let Some(rf) = readings_file {
        if path.is_none() {
            return Err(Error::Usage("--readings needs the project file the readings belong to".into()));
        }
        let r = readings::load(rf, &p)?;
        let cal = release_check::calibrate(&p, &r)?;
        let min_rest = f64::from(p.construction.min_rest_days);
        let earliest = (r.today_day.ceil()).max((r.last_change_end() + min_rest).ceil()) as i64;
        source = format!(
            "{source}, re-planned from the hold point {} of {} (cv, ch × {:.2}; pore pressures × {:.2})",
            r.today.format("%Y-%m-%d %H:%M"),
            rf.display(),
            cal.fit.multiplier,
            cal.pore_pressure_factor
        );
        inputs.push(rf.to_path_buf());
        start = Some((cal.state, earliest));
        p = cal.project;
    }
    let input_refs: Vec<&Path> = inputs.iter().map(PathBuf::as_path).collect();
    let files = outs.files();
    for (_, out) in &files {
        output::refuse_overwrite_of_inputs(out, &input_refs)?;
    }
    if let Some(d) = outs.dir {
        std::fs::create_dir_all(d).map_err(|source| Error::Write { path: d.to_path_buf(), source })?;
    }
    let engine = Engine::new(&p);
    let runner = Runner::new(&engine);
    let (st, earliest) = start.unwrap_or_else(|| (engine.initial_state(), 0));
    let plan = match with_progress(|tick| planner::plan_or_reach(&runner, st, earliest, tick))? {
        planner::Planned::Built(plan) => *plan,
        planner::Planned::Unbuildable(u) => return Err(unbuildable(&p, &source, &u, json)),
    };
    let rep = PlanReport { project: &p, plan: &plan, source, source_sha256: report::sha256_hex(text.as_bytes()) };
    for (kind, out) in &files {
        let bytes = match *kind {
            "csv" => report::csv::Csv.serialize(&rep)?,
            "ics" => report::ics::Ics.serialize(&rep)?,
            "pdf" => report::pdf::Pdf { report_date: report::today() }.serialize(&rep)?,
            _ => report::json::Json.serialize(&rep)?,
        };
        output::write_atomic(out, &bytes)?;
    }
    if json {
        String::from_utf8(report::json::Json.serialize(&rep)?).map_err(|e| Error::Computation(e.to_string()))
    } else {
        Ok(report::text::plan(&rep))
    }
}

/// The error for a target that cannot be reached, carrying the partial
/// timetable to the highest crest (text or JSON) for standard output; no
/// files are written.
fn unbuildable(p: &Project, source: &str, u: &crate::schedule::finish::Unbuildable, json: bool) -> Error {
    let report = if json { report::json::envelope("plan", p, source, u) } else { Ok(report::text::unbuildable(p, u)) };
    match report {
        Ok(report) => Error::Unbuildable { reason: u.reason.clone(), report },
        Err(e) => e,
    }
}

/// Files of a release check.
pub struct ReleaseFiles<'a> {
    pub readings: &'a Path,
    /// Certificate; default next to the project.
    pub pdf: Option<&'a Path>,
    /// Audit log; default next to the project.
    pub log: Option<&'a Path>,
}

fn release(path: &Path, files: &ReleaseFiles, lift: f64, on: Option<&str>, json: bool) -> Result<String> {
    let text = std::fs::read(path).map_err(|source| Error::Read { path: path.to_path_buf(), source })?;
    let name = path.display().to_string();
    let p = input::parse(&String::from_utf8_lossy(&text), &name)?;
    if p.instruments.is_empty() {
        return Err(Error::input(
            &name,
            None,
            "instrument",
            "has no [[instrument]] entries; the release check needs the piezometers, settlement plates and markers the readings come from".into(),
        ));
    }
    let r = readings::load(files.readings, &p)?;
    let on = on
        .map(|t| {
            NaiveDate::parse_from_str(t, "%Y-%m-%d")
                .map_err(|_| Error::Usage(format!("--on {t} is not a date YYYY-MM-DD")))
        })
        .transpose()?;
    let dir = path.parent().map_or_else(|| PathBuf::from("."), Path::to_path_buf);
    let stem = path.file_stem().map_or("project".into(), |s| s.to_string_lossy().into_owned());
    let cert = files.pdf.map_or_else(|| dir.join(format!("{stem}-release-{}.pdf", r.today.date())), Path::to_path_buf);
    let log = files.log.map_or_else(|| dir.join(format!("{stem}.release-log.jsonl")), Path::to_path_buf);
    for out in [&cert, &log] {
        output::refuse_overwrite_of_inputs(out, &[path, files.readings])?;
    }
    if cert == log {
        return Err(Error::Usage("the certificate and the log must be different files".into()));
    }
    // A damaged log stops the check before anything is written.
    let next_entry = crate::audit::appendable(&log)?.entries + 1;
    let check = release_check::check(&p, &r, lift, on)?;
    let mut rep = ReleaseReport {
        project: &p,
        check: &check,
        project_file: name.clone(),
        project_sha256: report::sha256_hex(&text),
        certificate: cert.display().to_string(),
        log: log.display().to_string(),
        log_entry: next_entry,
    };
    let now = report::now_utc();
    let pdf = report::pdf::certificate(&rep, now.date())?;
    output::write_atomic(&cert, &pdf)?;
    let entry = serde_json::json!({
        "fillpace": env!("CARGO_PKG_VERSION"),
        "written_utc": now.format("%Y-%m-%dT%H:%M:%SZ").to_string(),
        "project_file": name,
        "project_sha256": rep.project_sha256,
        "readings_file": r.file,
        "readings_sha256": r.sha256,
        "hold_point": check.hold_point.format("%Y-%m-%dT%H:%M").to_string(),
        "lift_m": check.lift_m,
        "lift_start": check.lift_start.to_string(),
        "decision": check.decision.label(),
        "fs_now": check.fs_now,
        "fs_next": check.fs_next,
        "fs_target": check.fs_target,
        "multiplier": check.fit.multiplier,
        "pore_pressure_factor": check.pore_pressure_factor,
        "failing_rules": check.rules.iter().filter(|r| r.verdict == release_check::Verdict::Fail).map(|r| r.name).collect::<Vec<_>>(),
        "earliest_release": check.earliest_release.map(|d| d.to_string()),
        "certificate": rep.certificate,
        "certificate_sha256": report::sha256_hex(&pdf),
    });
    let serde_json::Value::Object(fields) = entry else {
        return Err(Error::Computation("the log entry is not a JSON object".into()));
    };
    rep.log_entry = crate::audit::append(&log, fields)?;
    if json { report::json::envelope("release", &p, &name, &rep) } else { Ok(report::text::release(&rep)) }
}
