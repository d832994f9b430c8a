//! Terminal output: aligned plain-text tables for each command, followed by
//! the warnings and the caution notes.

use super::fixed as f;
use super::{PlanReport, ReleaseReport};
use crate::ground::Summary;
use crate::model::Project;
use crate::schedule::assess::Assessment;
use crate::stability::search::SearchResult;
use crate::stability::{CircleResult, Method};

/// A table of strings with a header row; numbers are right-aligned.
pub(crate) struct Table {
    head: Vec<String>,
    rows: Vec<Vec<String>>,
}

impl Table {
    pub(crate) fn new(head: &[&str]) -> Table {
        Table { head: head.iter().map(|s| s.to_string()).collect(), rows: Vec::new() }
    }

    pub(crate) fn row(&mut self, cells: Vec<String>) {
        self.rows.push(cells);
    }

    pub(crate) fn render(&self) -> String {
        let n = self.head.len();
        let width = |i: usize| {
            self.rows
                .iter()
                .map(|r| r.get(i).map_or(0, |c| c.chars().count()))
                .chain(std::iter::once(self.head[i].chars().count()))
                .max()
                .unwrap_or(0)
        };
        let widths: Vec<usize> = (0..n).map(width).collect();
        let mut out = String::new();
        let line = |cells: &[String], out: &mut String| {
            let parts: Vec<String> = cells
                .iter()
                .enumerate()
                .map(|(i, c)| {
                    let pad = widths[i].saturating_sub(c.chars().count());
                    if looks_numeric(c) { format!("{}{c}", " ".repeat(pad)) } else { format!("{c}{}", " ".repeat(pad)) }
                })
                .collect();
            out.push_str(parts.join("  ").trim_end());
            out.push('\n');
        };
        line(&self.head, &mut out);
        let rule: Vec<String> = widths.iter().map(|w| "-".repeat(*w)).collect();
        out.push_str(&rule.join("  "));
        out.push('\n');
        for r in &self.rows {
            line(r, &mut out);
        }
        out
    }
}

fn looks_numeric(s: &str) -> bool {
    !s.is_empty() && s.chars().all(|c| c.is_ascii_digit() || "+-.%".contains(c))
}

pub(crate) fn cautions_block() -> String {
    let mut out = String::from("\nCAUTIONS\n");
    for c in super::cautions() {
        out.push_str(&format!("  * {}\n", wrap(&c, 76, "    ")));
    }
    out.push_str(&format!("\n{}\n", super::program_version()));
    out
}

/// A terminal report with `warnings` inserted before its caution notes.
pub fn with_warnings(report: String, warnings: &[String]) -> String {
    let lines: String = warnings.iter().map(|w| format!("warning: {w}\n")).collect();
    match report.rfind("\nCAUTIONS\n") {
        Some(at) => format!("{}{lines}{}", &report[..at], &report[at..]),
        None => report + &lines,
    }
}

pub(crate) fn wrap(text: &str, width: usize, indent: &str) -> String {
    let mut out = String::new();
    let mut len = 0;
    for word in text.split_whitespace() {
        if len > 0 && len + 1 + word.chars().count() > width {
            out.push('\n');
            out.push_str(indent);
            len = 0;
        } else if len > 0 {
            out.push(' ');
            len += 1;
        }
        out.push_str(word);
        len += word.chars().count();
    }
    out
}

fn header(p: &Project, what: &str) -> String {
    format!(
        "{what}: {}\n{} | {} | rev {}\nStage geometry: {}.\nFill face check (infinite slope): {}.\n\n",
        p.info.title,
        p.info.reference,
        p.info.location,
        p.info.revision,
        p.embankment.stage_shape.describe(),
        p.stability.face_strength.describe()
    )
}

/// `fillpace check`.
pub fn check(p: &Project, s: &Summary, source: &str) -> String {
    let mut out = header(p, "Ground model");
    out.push_str(&format!(
        "Project file {source} is valid. Groundwater {:.2} m below original ground; base {}.\n\n",
        s.groundwater_depth_m,
        if s.base_drained { "drained" } else { "undrained" }
    ));
    let mut t = Table::new(&[
        "layer",
        "kind",
        "top m",
        "thick m",
        "γ kN/m³",
        "γsat kN/m³",
        "Cc/(1+e0)",
        "cv m²/yr",
        "ch m²/yr",
    ]);
    for l in &s.layers {
        let o = |v: Option<f64>, d| v.map_or("-".into(), |x| f(x, d));
        t.row(vec![
            l.name.clone(),
            l.kind.into(),
            f(l.top_m, 2),
            if l.kind == "stiff-base" { "-".into() } else { f(l.thickness_m, 2) },
            f(l.unit_weight_kn_m3, 1),
            f(l.saturated_unit_weight_kn_m3, 1),
            o(l.compression_ratio, 3),
            o(l.cv_m2_per_year, 2),
            o(l.ch_m2_per_year, 2),
        ]);
    }
    out.push_str(&t.render());
    out.push_str("\nInitial state\n");
    let mut t = Table::new(&["z m", "layer", "σv0 kPa", "u0 kPa", "σ'v0 kPa", "σ'p0 kPa", "OCR", "su0 kPa"]);
    for n in &s.profile {
        t.row(vec![
            f(n.z_m, 2),
            p.ground.layers[n.layer].name.clone(),
            f(n.sigma_v0_kpa, 1),
            f(n.u0_kpa, 1),
            f(n.sigma_v0_eff_kpa, 1),
            f(n.sigma_p0_kpa, 1),
            if n.sigma_v0_eff_kpa >= 1.0 { f(n.sigma_p0_kpa / n.sigma_v0_eff_kpa, 2) } else { "-".into() },
            if n.clay.is_some() { f(n.su0_kpa, 1) } else { "-".into() },
        ]);
    }
    out.push_str(&t.render());
    out.push_str(&cautions_block());
    out
}

/// `fillpace assess`.
pub fn assess(p: &Project, a: &Assessment) -> String {
    let mut out = header(p, "Proposed sequence");
    out.push_str(&format!(
        "Consolidation mode: {}. FS target at end of each lift: {:.2}.\n\n",
        a.mode.describe(),
        a.fs_target
    ));
    let mut t = Table::new(&[
        "lift",
        "start",
        "end",
        "thick m",
        "crest m",
        "FS end",
        "verdict",
        "meets target from",
        "peak Δu kPa",
        "U centre",
        "settl. m",
    ]);
    for l in &a.lifts {
        t.row(vec![
            l.number.to_string(),
            l.start.to_string(),
            l.end.to_string(),
            f(l.thickness_m, 2),
            f(l.height_after_m, 2),
            f(l.fs_end, 2),
            if l.meets_target { "meets target".into() } else { "BELOW TARGET".into() },
            match (l.meets_target, l.meets_target_from) {
                (true, _) => "-".into(),
                (false, Some(d)) => d.to_string(),
                (false, None) => "never (20 y)".into(),
            },
            f(l.peak_excess_kpa, 1),
            format!("{:.0}%", 100.0 * l.degree_centre),
            f(l.settlement_centre_m, 3),
        ]);
    }
    out.push_str(&t.render());
    out.push_str(
        "\nUnder the centreline at mid-depth of each clay layer: excess pore pressure Δu and strength su (kPa)\n",
    );
    let mut head = vec!["date".to_string(), "crest m".into(), "FS".into()];
    head.extend(a.depths_m.iter().map(|z| format!("Δu z={z:.2}")));
    head.extend(a.depths_m.iter().map(|z| format!("su z={z:.2}")));
    let head_refs: Vec<&str> = head.iter().map(String::as_str).collect();
    let mut t = Table::new(&head_refs);
    let with_fs: Vec<_> = a.series.iter().filter(|r| r.fs.is_some()).collect();
    let stride = with_fs.len().div_ceil(40).max(1);
    for r in with_fs.iter().step_by(stride) {
        let mut row = vec![r.date.to_string(), f(r.height_m, 2), r.fs.map_or("-".into(), |x| f(x, 2))];
        row.extend(r.excess_kpa[0].iter().map(|u| f(*u, 1)));
        row.extend(r.su_centre_kpa.iter().map(|s| f(*s, 1)));
        t.row(row);
    }
    out.push_str(&t.render());
    for w in &a.warnings {
        out.push_str(&format!("warning: {w}\n"));
    }
    out.push_str(&cautions_block());
    out
}

fn circle_lines(c: &CircleResult) -> String {
    format!(
        "  centre ({:.2}, {:.2}) m, radius {:.2} m; enters at x = {:.2} m, exits at x = {:.2} m; lowest point {} ({})\n  FS {:.3} by {}; Ordinary FS {:.3}; driving moment {:.0} kN·m/m, resisting {:.0} kN·m/m\n  {}\n",
        c.circle.xc_m,
        c.circle.yc_m,
        c.circle.r_m,
        c.entry_x_m,
        c.exit_x_m,
        if c.depth_m >= 0.0 {
            format!("{:.2} m below original ground", c.depth_m)
        } else {
            format!("{:.2} m above original ground", -c.depth_m)
        },
        c.band,
        c.fs,
        match c.method {
            Method::Bishop => "Bishop's simplified method",
            Method::OrdinarySmallMAlpha => "the Ordinary method (Bishop's m_α < 0.2 on a frictional slice)",
            Method::OrdinaryNoConvergence => "the Ordinary method (Bishop's iteration did not converge)",
        },
        c.fs_ordinary,
        c.driving_knm_per_m,
        c.resisting_knm_per_m,
        if c.crack_depth_m > 0.0 {
            format!("with a tension crack {:.2} m deep in the fill (lower than without)", c.crack_depth_m)
        } else {
            "no tension crack (none possible, or the uncracked circle is lower)".to_string()
        }
    )
}

/// `fillpace stability` with a search.
pub fn stability_search(p: &Project, height: f64, when: &str, placed: f64, s: &SearchResult) -> String {
    let mut out = header(p, "Stability");
    out.push_str(&format!(
        "Crest {height:.2} m above original ground (fill placed {placed:.2} m), ground state {when}.\n"
    ));
    out.push_str(&format!(
        "Governing FS = {:.3} (target {:.2}): {}\n",
        s.governing_fs(),
        p.criteria.fs_construction,
        s.governing_mechanism()
    ));
    out.push_str(&format!("Critical circle: FS = {:.3}\n", s.critical.fs));
    out.push_str(&circle_lines(&s.critical));
    out.push_str(&face_line(s));
    out.push_str("\nBest circle by depth band (circles tangent within the band)\n");
    let mut t = Table::new(&["band", "FS", "lowest point in", "depth m", "xc m", "yc m", "R m"]);
    for band in &s.bands {
        let b = &band.circle;
        t.row(vec![
            band.band.clone(),
            f(b.fs, 3),
            b.band.clone(),
            f(b.depth_m, 2),
            f(b.circle.xc_m, 2),
            f(b.circle.yc_m, 2),
            f(b.circle.r_m, 2),
        ]);
    }
    out.push_str(&t.render());
    out.push_str(&format!(
        "\n{} circles analysed, {} set aside (their mass would move away from the toe).\n",
        s.circles_tried, s.circles_rejected
    ));
    for w in s.diagnostics.warnings() {
        out.push_str(&format!("warning: {w}\n"));
    }
    out.push_str(&cautions_block());
    out
}

/// The fill-face line of a search: its infinite-slope FS, or why there is
/// none.
fn face_line(s: &SearchResult) -> String {
    match &s.face {
        Some(f) => format!(
            "Fill face as an infinite slope (β = {:.1}°, ru = {:.2}, plane {:.2} m deep, {} strength c' = {:.1} kPa, φ' = {:.1}°): FS = {:.3}\n",
            f.slope_deg,
            f.ru,
            f.depth_m,
            f.strength.label(),
            f.cohesion_kpa,
            f.friction_deg,
            f.fs
        ),
        None => "Fill face: not checked (no fill, or no fill strength for the face check: a load with face_strength = \"factored\")\n".into(),
    }
}

/// `fillpace stability --circle`.
pub fn stability_circle(p: &Project, height: f64, when: &str, c: &CircleResult) -> String {
    let mut out = header(p, "Stability of one circle");
    out.push_str(&format!("Crest {height:.2} m above original ground, ground state {when}.\n"));
    out.push_str(&circle_lines(c));
    out.push_str(&cautions_block());
    out
}

/// `fillpace plan`.
pub fn plan(r: &PlanReport) -> String {
    let (p, pl) = (r.project, r.plan);
    let mut out = header(p, "Lift timetable");
    out.push_str(&format!(
        "Planned from {}. Design height {:.2} m, surcharge {:.2} m, FS target {:.2} at the end of every lift.\nConsolidation mode: {}.\n\n",
        r.source, p.embankment.design_height_m, p.embankment.surcharge_height_m, p.criteria.fs_construction, p.analysis.mode.describe()
    ));
    let mut t = Table::new(&super::STAGE_COLUMNS);
    for s in &pl.stages {
        t.row(super::stage_cells(s));
    }
    out.push_str(&t.render());
    out.push_str(&format!(
        "\nFinish {} ({} days, {:.1} months). Lowest FS {:.2} at stage {}; FS at finish {:.3} (service target {:.2}).\n",
        pl.finish,
        pl.duration_days,
        pl.duration_days as f64 / 30.44,
        pl.min_fs,
        pl.min_fs_stage,
        pl.fs_finish,
        p.criteria.fs_service
    ));
    out.push_str(&settlement_lines(pl, p.info.design_life_years));
    out.push_str(&format!(
        "Fill per metre run: {:.1} m³ design profile + {:.1} m³ settlement make-up + {:.1} m³ surcharge (removed).\n",
        pl.volume_design_m3_per_m, pl.volume_makeup_m3_per_m, pl.volume_surcharge_m3_per_m
    ));
    out.push_str(&format!(
        "Effort: {} full slip-circle searches, {} warm-started local searches, {} consolidation steps.\n",
        pl.effort.stability_searches, pl.effort.warm_searches, pl.effort.consolidation_steps
    ));
    for w in &pl.warnings {
        out.push_str(&format!("warning: {w}\n"));
    }
    out.push_str(&cautions_block());
    out
}

/// `fillpace plan` when the target height cannot be reached: how far it
/// can go, the timetable to there and what stops the next lift.
pub fn unbuildable(p: &Project, u: &crate::schedule::finish::Unbuildable) -> String {
    let (pl, b) = (&u.partial_plan, &u.blocking);
    let mut out = header(p, "Lift timetable (target not reachable)");
    out.push_str(&format!(
        "CANNOT BE BUILT to {:.2} m with FS ≥ {:.2}. Highest crest reachable at the FS target: {:.2} m.\n",
        u.target_height_m, u.fs_target, u.highest_crest_m
    ));
    let how = if b.face_governs {
        format!("governed by the {} (a flatter face or a stronger fill is needed)", b.mechanism)
    } else {
        format!(
            "critical circle ({:.2}, {:.2}) m, radius {:.2} m, lowest point {:.2} m below original ground in {}",
            b.circle.xc_m, b.circle.yc_m, b.circle.r_m, b.circle_depth_m, b.mechanism
        )
    };
    out.push_str(&format!(
        "Governing mechanism: the thinnest next lift ({:.2} m on the {:.2} m crest) has FS {:.3} even with the clay fully consolidated under the fill already placed; {how}.\n",
        b.lift_m, b.on_crest_m, b.fs
    ));
    out.push_str(&format!("  {}\n\n", wrap(&u.reason, 76, "  ")));
    if pl.stages.is_empty() {
        out.push_str("Not even the first lift can be placed.\n");
    } else {
        out.push_str("Timetable to the highest crest:\n");
        let mut t = Table::new(&super::STAGE_COLUMNS);
        for s in &pl.stages {
            t.row(super::stage_cells(s));
        }
        out.push_str(&t.render());
        out.push_str(&format!("\nLast lift ends {}; FS then {:.2}.\n", pl.finish, pl.fs_finish));
    }
    for w in &pl.warnings {
        out.push_str(&format!("warning: {w}\n"));
    }
    out.push_str(&cautions_block());
    out
}

/// The settlement forecast of a plan, in the words the README defines.
fn settlement_lines(pl: &crate::schedule::planner::Plan, life_years: f64) -> String {
    format!(
        "Centreline settlement: {:.3} m at finish; final primary {:.3} m under the final profile (crest + the make-up it needs); residual over the {life_years} years after the finish {:.3} m ({:.3} m primary still to come + {:.3} m secondary from the end of primary{}).\n",
        pl.settlement_at_finish_m,
        pl.final_primary_settlement_m,
        pl.residual_settlement_m,
        pl.residual_primary_m,
        pl.residual_secondary_m,
        pl.end_of_primary.map_or(", which is not reached within the design life".into(), |d| format!(" on {d}"))
    )
}

fn opt(v: Option<f64>, d: usize) -> String {
    v.map_or("-".into(), |x| f(x, d))
}

/// `fillpace release`.
pub fn release(rep: &ReleaseReport) -> String {
    let (p, c) = (rep.project, rep.check);
    let mut out = header(p, "Hold-point check");
    out.push_str(&format!(
        "Readings {} up to {} (hold point). Crest now {:.2} m; proposed lift {:.2} m to {:.2} m, placed {} to {}.\n\n",
        c.readings_file,
        c.hold_point.format("%Y-%m-%d %H:%M"),
        c.height_now_m,
        c.lift_m,
        c.height_after_m,
        c.lift_start,
        c.lift_end
    ));
    out.push_str("Instruments (measured: excess pore pressure above the initial u0 at the settled tip, or settlement / outward movement since baseline; misfit in reading sd)\n");
    out.push_str(&instrument_table(c).render());
    let mut a = Table::new(&["plate", "points", "readings", "β0 mm", "β1", "final mm", "U now", "implied", "reliable"]);
    for (id, r) in &c.asaoka {
        a.row(vec![
            id.clone(),
            r.points.to_string(),
            r.readings.to_string(),
            f(1000.0 * r.beta0_m, 1),
            f(r.beta1, 4),
            opt(r.final_m.map(|x| 1000.0 * x), 0),
            r.degree.map_or("-".into(), |u| format!("{:.0}%", 100.0 * u)),
            r.coefficient_m2_per_year.map_or("-".into(), |v| format!("{} {} m²/yr", r.coefficient, f(v, 2))),
            if r.reliable { "yes".into() } else { format!("no: {}", r.note) },
        ]);
    }
    out.push_str(&format!(
        "\nAsaoka (1978) since the last lift ended, resampled every {:.0} days\n",
        p.monitoring.asaoka_interval_days
    ));
    out.push_str(&a.render());
    out.push_str(&format!("\n{}\n", super::fit_sentence(c)));
    let s = &c.safety;
    out.push_str(&format!(
        "FS now: model {:.2}, measured pore pressures {:.2}; after the lift: model {:.2}, measured {:.2}; the lower governs (target {:.2}, {}).\n\n",
        s.now_model, s.now_measured, s.next_model, s.next_measured, c.fs_target, c.mechanism
    ));
    let mut r = Table::new(&["rule", "value", "limit", "verdict", "detail"]);
    for rule in &c.rules {
        let cells = super::rule_cells(rule);
        r.row(cells);
    }
    out.push_str(&r.render());
    out.push_str(&format!("\nRECOMMENDATION: {} — {}\n", c.recommendation.label(), c.recommendation.meaning()));
    for why in &c.reasons {
        out.push_str(&format!("  - {}\n", wrap(why, 74, "    ")));
    }
    for act in &c.actions {
        out.push_str(&format!("  ACTION: {act}\n"));
    }
    if !c.release_note.is_empty() {
        out.push_str(&format!("  {}\n", wrap(&c.release_note, 76, "  ")));
    }
    out.push_str(&format!("  {}\n", wrap(&super::conditions_sentence(c), 76, "  ")));
    for w in &c.warnings {
        let at = w.line.map_or(String::new(), |l| format!("{}:{l}: ", c.readings_file));
        let who = if w.instrument.is_empty() { String::new() } else { format!("{} ", w.instrument) };
        out.push_str(&format!("warning: {at}{who}{}\n", w.message));
    }
    out.push_str(&format!("\n{}\n", super::record_sentence(rep)));
    out.push_str(&format!("Log now: {} entries, head {}.\n", rep.record, rep.log_head_after));
    out.push_str(&cautions_block());
    out
}

fn instrument_table(c: &crate::monitoring::release::ReleaseCheck) -> Table {
    use crate::model::InstrumentKind as K;
    let mut t = Table::new(&[
        "instrument",
        "kind",
        "x m",
        "z m",
        "readings",
        "suspect",
        "since lift",
        "last reading",
        "measured",
        "predicted",
        "calibrated",
        "misfit",
        "Δu/Δσv",
        "rate mm/d",
        "monitoring",
    ]);
    for s in &c.instruments {
        let (scale, unit) = match s.kind {
            K::Piezometer => (1.0, "kPa"),
            _ => (1000.0, "mm"),
        };
        let val = |v: Option<f64>| v.map_or("-".into(), |x| format!("{} {unit}", f(x * scale, 1)));
        t.row(vec![
            s.id.clone(),
            s.kind.label().into(),
            f(s.offset_m, 1),
            opt(s.depth_m, 1),
            s.readings.to_string(),
            s.suspect.to_string(),
            s.since_lift.to_string(),
            s.last_reading.map_or("-".into(), |t| t.format("%Y-%m-%d %H:%M").to_string()),
            val(s.measured),
            val(s.predicted),
            val(s.calibrated),
            opt(s.misfit_sd, 1),
            opt(s.pore_pressure_ratio, 2),
            opt(s.rate_mm_per_day, 1),
            if s.shortfall.is_empty() { "sufficient".into() } else { "SHORT".into() },
        ]);
    }
    t
}

/// `fillpace log verify`.
pub fn log_verified(v: &crate::audit::Verified) -> String {
    let mut out = format!("{}: {} entries, hash chain intact (head {}).\n", v.file, v.entries, v.last_sha256);
    if let Some(a) = &v.anchor {
        out.push_str(&format!(
            "Record {} is in the log and the log before it ends in the head it carries ({}).\n",
            a.record, a.head
        ));
    }
    for r in &v.records {
        out.push_str(&format!(
            "record {} {}: {}\n",
            r.entry,
            r.record_file,
            match r.state {
                crate::audit::RecordState::Matches => "PDF matches its logged SHA-256",
                crate::audit::RecordState::Changed => "PDF CHANGED since it was logged",
                crate::audit::RecordState::Missing => "PDF MISSING",
            }
        ));
    }
    out
}

/// `fillpace compare`.
pub fn comparison(r: &super::CompareReport) -> String {
    let c = r.comparison;
    let mut out = header(r.project, "Design options");
    out.push_str(&format!(
        "{} variants of {} (varying {}), each planned to FS {:.2}; sorted by finish date.\n\n",
        c.variants.len(),
        r.source,
        c.keys.join(", "),
        r.project.criteria.fs_construction
    ));
    let mut t = Table::new(&super::COMPARE_COLUMNS);
    for v in &c.variants {
        t.row(super::compare_cells(v));
    }
    out.push_str(&t.render());
    for v in c.variants.iter().filter(|v| v.outcome.is_none()) {
        out.push_str(&format!(
            "\nvariant {} ({}) cannot be built: {}\n",
            v.number,
            v.label,
            v.reason.as_deref().unwrap_or("")
        ));
    }
    for v in &c.variants {
        for w in &v.warnings {
            out.push_str(&format!("warning: variant {}: {w}\n", v.number));
        }
    }
    out.push_str(&cautions_block());
    out
}

/// `fillpace risk`.
pub fn risk(r: &super::RiskReport) -> String {
    let k = r.risk;
    let mut out = header(r.project, "Risk of the timetable");
    out.push_str(&format!(
        "{} realisations of {} (seed {}), {:.1} s ({:.1} realisations/s).\n\n",
        k.runs,
        r.source,
        k.seed,
        r.seconds,
        k.runs as f64 / r.seconds.max(1e-9)
    ));
    let mut t = Table::new(&super::PARAMETER_COLUMNS);
    for p in &k.parameters {
        t.row(super::parameter_cells(p));
    }
    out.push_str(&t.render());
    let answers = super::RiskAnswers::of(k);
    out.push_str(&format!(
        "\n(a) The best-estimate timetable (finish {}, lowest FS {:.2}) with the realised ground:\n",
        k.best_estimate_finish, k.best_estimate_min_fs
    ));
    for line in &answers.timetable {
        out.push_str(&format!("    {line}\n"));
    }
    out.push('\n');
    let mut t = Table::new(&super::RISK_STAGE_COLUMNS);
    for s in &k.stages {
        t.row(super::risk_stage_cells(s));
    }
    out.push_str(&t.render());
    out.push_str("\n(b) Each realisation planned afresh:\n");
    for line in &answers.fresh {
        out.push_str(&format!("    {line}\n"));
    }
    if let (Some(rel), Some(sentence)) = (&k.reliability, &answers.reliability) {
        out.push_str(&format!("\n{sentence} Targets tried:\n"));
        let mut t = Table::new(&["FS target", "finish", "worst stage", "P(FS<1)", "meets"]);
        for x in &rel.trials {
            t.row(vec![
                f(x.fs_target, 2),
                x.finish.map_or("cannot be built".into(), |d| d.to_string()),
                x.worst_stage.map_or("-".into(), |s| s.to_string()),
                x.p_below_one.map_or("-".into(), |p| format!("{p:.2e}")),
                if x.meets { "yes".into() } else { "no".into() },
            ]);
        }
        out.push_str(&t.render());
    }
    for w in &k.warnings {
        out.push_str(&format!("warning: {w}\n"));
    }
    out.push_str(&format!("\nNOTE: {}\n", wrap(super::RISK_CAUTION, 76, "  ")));
    out.push_str(&cautions_block());
    out
}
