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
use clap::CommandFactory;
use std::path::{Path, PathBuf};

/// The bundled demo project (examples/kestrel-fen.toml).
pub const DEMO: &str = include_str!("../examples/kestrel-fen.toml");
/// The commented starter project written by `fillpace new`.
pub const TEMPLATE: &str = include_str!("../templates/project.toml");
/// What `fillpace new` says after writing the template.
const NEW_CAUTION: &str = "CAUTION: the values in the template are placeholders, not advice. Every result of fillpace\nis a prediction from uncertain parameters; field monitoring governs, and a licensed\ngeotechnical engineer must check and sign any schedule or release before it is used on site.";

/// Whether progress bars are suppressed (`--quiet`); set by `run_with`.
static QUIET: std::sync::atomic::AtomicBool = std::sync::atomic::AtomicBool::new(false);

/// Run one command; returns what to print on standard output.
pub fn run(cmd: &Command) -> Result<String> {
    run_with(cmd, false)
}

/// Run one command; with `quiet` (for scripts) no progress bars are drawn
/// and the `warning:` lines of the terminal text are left out. JSON output,
/// files and errors are the same either way.
pub fn run_with(cmd: &Command, quiet: bool) -> Result<String> {
    if quiet {
        QUIET.store(true, std::sync::atomic::Ordering::Relaxed);
    }
    let text = dispatch(cmd)?;
    if quiet && !cmd.json() {
        return Ok(text.split_inclusive('\n').filter(|l| !l.starts_with("warning: ")).collect());
    }
    Ok(text)
}

fn dispatch(cmd: &Command) -> Result<String> {
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
        Command::Corridor { corridor, csv, ics, pdf, json } => {
            let outs = CorridorOutputs { csv: csv.as_deref(), ics: ics.as_deref(), pdf: pdf.as_deref() };
            corridor_cmd(corridor.as_deref(), &outs, *json)
        }
        Command::Release { project, readings, lift, on, pdf, log, json } => {
            let files = ReleaseFiles { readings, pdf: pdf.as_deref(), log: log.as_deref() };
            release(project, &files, *lift, on.as_deref(), *json)
        }
        Command::Log(LogCommand::Verify { log, record, head, json }) => {
            let anchor = record.zip(head.clone()).map(|(record, head)| crate::audit::Anchor { record, head });
            log_verify(log, anchor, *json)
        }
        Command::Completions { shell, json } => {
            let mut buf = Vec::new();
            clap_complete::generate(*shell, &mut crate::cli::Cli::command(), "fillpace", &mut buf);
            generated(buf, "completions", "script", *json)
        }
        Command::Man { json } => {
            let mut buf = Vec::new();
            clap_mangen::Man::new(crate::cli::Cli::command())
                .render(&mut buf)
                .map_err(|e| Error::Computation(format!("the manual page could not be rendered: {e}")))?;
            generated(buf, "man", "roff", *json)
        }
    }
}

/// Text generated from the command-line definitions, as is or in JSON
/// under `field`.
fn generated(bytes: Vec<u8>, command: &str, field: &str, json: bool) -> Result<String> {
    let text = String::from_utf8(bytes).map_err(|e| Error::Computation(format!("{command}: not UTF-8: {e}")))?;
    if json {
        let mut v = serde_json::json!({ "fillpace": env!("CARGO_PKG_VERSION"), "command": command });
        v[field] = text.into();
        Ok(format!("{v}\n"))
    } else {
        Ok(text)
    }
}

/// `log verify`: the chain, the anchor of a signed record, every record PDF.
fn log_verify(log: &Path, anchor: Option<crate::audit::Anchor>, json: bool) -> Result<String> {
    if !log.exists() {
        return Err(Error::Read {
            path: log.to_path_buf(),
            source: std::io::Error::new(std::io::ErrorKind::NotFound, "no such file"),
        });
    }
    let (mut v, entries) = crate::audit::read(log)?;
    if let Some(a) = &anchor {
        crate::audit::check_anchor(&v.file, &entries, a)?;
    }
    v.anchor = anchor;
    v.records = crate::audit::check_records(log, &entries);
    let bad: Vec<String> = v
        .records
        .iter()
        .filter(|r| r.state != crate::audit::RecordState::Matches)
        .map(|r| format!("record {} ({}) is {:?}", r.entry, r.record_file, r.state).to_lowercase())
        .collect();
    if !bad.is_empty() {
        return Err(Error::input(
            &v.file,
            None,
            "",
            format!(
                "names record PDFs that no longer match their logged SHA-256: {}; the chain itself is intact",
                bad.join("; ")
            ),
        ));
    }
    if json {
        Ok(format!(
            "{}\n",
            serde_json::json!({ "fillpace": env!("CARGO_PKG_VERSION"), "command": "log verify", "result": v })
        ))
    } else {
        Ok(report::text::log_verified(&v))
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
            serde_json::json!({ "fillpace": env!("CARGO_PKG_VERSION"), "command": "new", "written": path, "cautions": report::cautions() })
        ));
    }
    Ok(format!("wrote {}\nnext: fillpace check {}\n\n{NEW_CAUTION}\n", path.display(), path.display()))
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
        output::write_atomic(out, &report::csv::series(&a)?)?;
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
            let r = crate::stability::fill_load::lower_circle(&p, height, &field, c).map_err(|why| Error::Usage(format!("circle {text} cannot be analysed: {why}; a circle must cut the ground surface twice below its centre, move towards the toe and stay above the stiff base")))?;
            if json {
                report::json::envelope_with_warnings("stability", &p, &src, &r, &warnings)
            } else {
                Ok(report::text::with_warnings(report::text::stability_circle(&p, height, &when, &r), &warnings))
            }
        }
        None => {
            let r = crate::stability::fill_load::lower_search(&p, height, &field, search::search(&section)?)?;
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
    if QUIET.load(std::sync::atomic::Ordering::Relaxed) || !std::io::stderr().is_terminal() {
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
        output::write_atomic(out, &report::csv::comparison(&c, p.embankment.stage_shape)?)?;
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
    if json { report::json::risk(&p, &doc.file, &result, &[]) } else { Ok(report::text::risk(&rep)) }
}

/// The bundled demo corridor (examples/kestrel-fen-corridor.toml).
pub const DEMO_CORRIDOR: &str = include_str!("../examples/kestrel-fen-corridor.toml");
/// The demo corridor's low-embankment section file.
pub(crate) const DEMO_LOW: &str = include_str!("../examples/kestrel-fen-low.toml");

/// Where `corridor` writes its files.
pub struct CorridorOutputs<'a> {
    pub csv: Option<&'a Path>,
    pub ics: Option<&'a Path>,
    pub pdf: Option<&'a Path>,
}

fn corridor_cmd(path: Option<&Path>, outs: &CorridorOutputs, json: bool) -> Result<String> {
    let c = match path {
        Some(f) => crate::corridor::file::load(f)?,
        None => {
            // The demo's sections are the bundled demo project.
            let read = |p: &Path| match p.file_name().and_then(|n| n.to_str()) {
                Some("kestrel-fen.toml") => Ok(DEMO.to_string()),
                Some("kestrel-fen-low.toml") => Ok(DEMO_LOW.to_string()),
                _ => Err(std::io::Error::new(std::io::ErrorKind::NotFound, "not bundled")),
            };
            crate::corridor::file::parse(
                DEMO_CORRIDOR,
                "bundled demo corridor (examples/kestrel-fen-corridor.toml)",
                Path::new(""),
                &read,
            )?
        }
    };
    if path.is_some() {
        // The corridor file and every section file (the bundled demo's
        // are not on disk).
        let read: Vec<PathBuf> = c.inputs.iter().map(|i| PathBuf::from(&i.file)).collect();
        let read: Vec<&Path> = read.iter().map(PathBuf::as_path).collect();
        for out in [outs.csv, outs.ics, outs.pdf].into_iter().flatten() {
            output::refuse_overwrite_of_inputs(out, &read)?;
        }
    }
    let total = 2 * c.sections.len();
    let p = with_counter(total, "planning sections", |tick| crate::corridor::programme::run(&c, tick))?;
    // Every file is made before any is written, so that an error leaves
    // none behind; each is written atomically.
    let mut files = Vec::new();
    if let Some(out) = outs.csv {
        files.push((out, crate::corridor::output::csv(&p)?));
    }
    if let Some(out) = outs.ics {
        files.push((out, crate::corridor::output::ics(&p).into_bytes()));
    }
    if let Some(out) = outs.pdf {
        files.push((out, report::pdf::corridor(&c, &p, report::today())?));
    }
    for (out, bytes) in files {
        output::write_atomic(out, &bytes)?;
    }
    if json { crate::corridor::output::json(&p, &c.file) } else { Ok(crate::corridor::output::text(&p, &c.file)) }
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
        let (state, _) = release_check::measured_state(&p, &r, &cal);
        let min_rest = f64::from(p.construction.min_rest_days);
        let earliest = (r.today_day.ceil()).max((r.last_change_end() + min_rest).ceil()) as i64;
        source = format!(
            "{source}, re-planned from the hold point {} of {} (cv, ch × {:.2}; Cc, Cr × {:.2}; pore pressures as the piezometers read){}",
            r.today.format("%Y-%m-%d %H:%M"),
            rf.display(),
            cal.fit.rate.value,
            cal.fit.compressibility.value,
            if release_check::fit_accepted(&p, &r, &cal) {
                String::new()
            } else {
                "; FROM A REJECTED FIT: the model does not explain the readings, so the dates below are not to be relied on".into()
            },
        );
        inputs.push(rf.to_path_buf());
        start = Some((state, earliest));
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
    let from_hold_point = start.is_some();
    let (st, earliest) = start.unwrap_or_else(|| (engine.initial_state(), 0));
    // At a hold point the section may already be below its target: the
    // re-plan must say so (found in review), not only `release`.
    let below_now = if from_hold_point {
        let now = runner.stability(&st, &mut Default::default())?;
        let target = p.criteria.fs_construction;
        (now.governing_fs() < target).then(|| {
            format!(
                "at the hold point the section is already below its FS target: FS now {:.3} ({}) < {target:.2} on the calibrated state with the measured pore pressures; no lift should be placed before the engineer of record has reviewed it (see `fillpace release`)",
                now.governing_fs(),
                now.governing_mechanism()
            )
        })
    } else {
        None
    };
    let mut plan = match with_progress(|tick| planner::plan_or_reach(&runner, st, earliest, tick))? {
        planner::Planned::Built(plan) => *plan,
        planner::Planned::Unbuildable(u) => return Err(unbuildable(&p, &source, &u, json)),
    };
    plan.warnings.splice(0..0, below_now);
    let rep = PlanReport { project: &p, plan: &plan, source, source_sha256: crate::hash::sha256_hex(text.as_bytes()) };
    for (kind, out) in &files {
        let bytes = match *kind {
            "csv" => report::csv::Csv.serialize(&rep)?,
            "ics" => report::ics::Ics { written: report::now_utc() }.serialize(&rep)?,
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

/// Files of a hold-point check.
pub struct ReleaseFiles<'a> {
    pub readings: &'a Path,
    /// Record PDF; default next to the project, named by hold point and
    /// record number.
    pub pdf: Option<&'a Path>,
    /// Record log; default next to the project.
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
            "has no [[instrument]] entries; the hold-point check needs the piezometers, settlement plates and markers the readings come from".into(),
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
    let log = files.log.map_or_else(|| dir.join(format!("{stem}.hold-point-log.jsonl")), Path::to_path_buf);
    // A damaged log stops the check before anything is computed or written.
    let (before, _) = crate::audit::appendable(&log)?;
    let record = files.pdf.map_or_else(
        || dir.join(format!("{stem}-hold-point-{}-record-{}.pdf", r.today.date(), before.entries + 1)),
        Path::to_path_buf,
    );
    for out in [&record, &log] {
        output::refuse_overwrite_of_inputs(out, &[path, files.readings])?;
    }
    if record == log {
        return Err(Error::Usage("the record and the log must be different files".into()));
    }
    let check = release_check::check(&p, &r, lift, on)?;
    let project_sha256 = crate::hash::sha256_hex(&text);
    let now = report::now_utc();
    let rep_for = |slot: &crate::audit::Slot| ReleaseReport {
        project: &p,
        check: &check,
        project_file: name.clone(),
        project_sha256: project_sha256.clone(),
        record_file: record.display().to_string(),
        log: log.display().to_string(),
        record: slot.record,
        supersedes: supersedes(&slot.entries, &name, &check),
        log_entries_before: slot.entries_before,
        log_head_before: slot.head_before.clone(),
        log_head_after: String::new(),
    };
    let committed = crate::audit::commit(&log, &record, |slot| {
        let rep = rep_for(slot);
        let pdf = report::pdf::certificate(&rep, now.date())?;
        Ok((pdf, log_fields(&rep, &r, now)?))
    })?;
    let mut rep = rep_for(&committed.slot);
    rep.log_head_after = committed.head_after.clone();
    if json { report::json::envelope("release", &p, &name, &rep) } else { Ok(report::text::release(&rep)) }
}

/// The latest earlier record of the same project file and hold point.
fn supersedes(entries: &[crate::audit::Entry], project: &str, check: &release_check::ReleaseCheck) -> Option<usize> {
    let hold = check.hold_point.format("%Y-%m-%dT%H:%M").to_string();
    entries
        .iter()
        .rev()
        .find(|e| {
            e.fields.get("hold_point").and_then(|v| v.as_str()) == Some(hold.as_str())
                && e.fields.get("project_file").and_then(|v| v.as_str()) == Some(project)
        })
        .map(|e| e.number)
}

/// The fields of a record's log entry.
fn log_fields(
    rep: &ReleaseReport,
    r: &readings::Readings,
    now: chrono::NaiveDateTime,
) -> Result<serde_json::Map<String, serde_json::Value>> {
    let check = rep.check;
    let entry = serde_json::json!({
        "fillpace": env!("CARGO_PKG_VERSION"),
        "written_utc": now.format("%Y-%m-%dT%H:%M:%SZ").to_string(),
        "project_file": rep.project_file,
        "project_sha256": rep.project_sha256,
        "readings_file": r.file,
        "readings_sha256": r.sha256,
        "hold_point": check.hold_point.format("%Y-%m-%dT%H:%M").to_string(),
        "record": rep.record,
        "supersedes": rep.supersedes,
        "lift_m": check.lift_m,
        "lift_start": check.lift_start.to_string(),
        "recommendation": check.recommendation,
        "fs_now": check.fs_now,
        "fs_next": check.fs_next,
        "fs_target": check.fs_target,
        "rate_multiplier": check.fit.rate.value,
        "compressibility_multiplier": check.fit.compressibility.value,
        "fit_explains_readings": check.fit_explains_readings,
        "failing_rules": check.rules.iter().filter(|r| r.verdict == release_check::Verdict::Fail).map(|r| r.name).collect::<Vec<_>>(),
        "insufficient": check.insufficient,
        "earliest_release": check.earliest_release.map(|d| d.to_string()),
        "earliest_release_from_rejected_fit": check.forecast_from_rejected_fit,
        "record_file": rep.record_file,
    });
    match entry {
        serde_json::Value::Object(fields) => Ok(fields),
        _ => Err(Error::Computation("the log entry is not a JSON object".into())),
    }
}
