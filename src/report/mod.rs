//! Output formats. Each command's result is one plain serialisable struct;
//! each format is one module: `text` (terminal tables), `json`, `csv`, `ics`,
//! `pdf`.
//! The plan formats share the `Exporter` interface so that a new format is
//! one new file. Caution notes come from templates/cautions.txt.

pub mod csv;
pub mod ics;
pub mod json;
pub mod pdf;
pub mod text;

use crate::error::Result;
use crate::model::Project;
use crate::monitoring::release::ReleaseCheck;
use crate::schedule::planner::Plan;

/// The caution notes, one string per paragraph (templates/cautions.txt).
pub fn cautions() -> Vec<String> {
    parse_cautions(include_str!("../../templates/cautions.txt"))
}

/// The one-line caution at the foot of every PDF page
/// (templates/caution-footer.txt).
pub fn caution_footer() -> String {
    parse_cautions(include_str!("../../templates/caution-footer.txt")).join(" ")
}

fn parse_cautions(text: &str) -> Vec<String> {
    text.split("\n\n")
        .map(|p| p.lines().filter(|l| !l.trim_start().starts_with('#')).map(str::trim).collect::<Vec<_>>().join(" "))
        .filter(|p| !p.is_empty())
        .collect()
}

/// A plan together with the project it was made for.
pub struct PlanReport<'a> {
    pub project: &'a Project,
    pub plan: &'a Plan,
    /// Where the project came from (file name, or the bundled demo).
    pub source: String,
    /// SHA-256 of the project file's bytes, hex.
    pub source_sha256: String,
}

/// A comparison of design options with its project.
pub struct CompareReport<'a> {
    pub project: &'a Project,
    pub comparison: &'a crate::compare::Comparison,
    pub source: String,
}

/// A Monte Carlo result with its project and run time.
pub struct RiskReport<'a> {
    pub project: &'a Project,
    pub risk: &'a crate::risk::RiskResult,
    pub source: String,
    /// Wall time of the final realisations (after the best-estimate plan
    /// or the reliability search), s; not part of the JSON output.
    pub seconds: f64,
}

/// Column headings of the design-option table (terminal and PDF).
pub const COMPARE_COLUMNS: [&str; 11] = [
    "#",
    "variant",
    "lifts",
    "finish",
    "days",
    "min FS",
    "final settl. m",
    "residual m",
    "fill m³/m",
    "drains m/m",
    "service checks",
];

/// One variant as the cells of `COMPARE_COLUMNS`.
pub fn compare_cells(v: &crate::compare::Variant) -> Vec<String> {
    let f = fixed;
    match &v.outcome {
        Some(o) => vec![
            v.number.to_string(),
            v.label.clone(),
            o.lifts.to_string(),
            o.finish.to_string(),
            o.duration_days.to_string(),
            f(o.min_fs, 2),
            f(o.final_settlement_m, 3),
            f(o.residual_settlement_m, 3),
            f(o.fill_volume_m3_per_m, 1),
            f(o.drain_length_m_per_m, 0),
            if o.service_shortfalls.is_empty() { "met".into() } else { o.service_shortfalls.join("; ") },
        ],
        None => {
            let mut cells = vec![v.number.to_string(), v.label.clone(), "-".into(), "cannot be built".into()];
            cells.resize(COMPARE_COLUMNS.len(), "-".into());
            cells
        }
    }
}

/// The caution that comes first with every Monte Carlo result.
pub const RISK_CAUTION: &str = "The probabilities are conditional on the declared distributions and on the model: they leave out model error, spatial variability within a layer and construction events, and they are estimates from a finite number of realisations. They inform the choice of rests; they do not replace the factor of safety, the monitoring or the judgement required by the local code.";

/// Column headings of the per-stage risk table (terminal and PDF).
pub const RISK_STAGE_COLUMNS: [&str; 10] =
    ["#", "stage", "start", "height m", "FS best", "FS P10", "P50", "P90", "P(FS<1)", "P(FS<target)"];

/// One stage of the risk result as the cells of `RISK_STAGE_COLUMNS`.
pub fn risk_stage_cells(s: &crate::risk::StageRisk) -> Vec<String> {
    let f = fixed;
    vec![
        s.number.to_string(),
        s.kind.label().into(),
        s.start.to_string(),
        f(s.height_after_m, 2),
        f(s.fs_best_estimate, 2),
        f(s.fs.p10, 2),
        f(s.fs.p50, 2),
        f(s.fs.p90, 2),
        f(s.below_one.probability, 3),
        f(s.below_target.probability, 3),
    ]
}

/// Column headings of the uncertain-parameter table (terminal and PDF).
pub const PARAMETER_COLUMNS: [&str; 6] = ["parameter", "distribution", "factor P10", "P50", "P90", "keys"];

/// One uncertain parameter as the cells of `PARAMETER_COLUMNS`.
pub fn parameter_cells(p: &crate::risk::ParameterSummary) -> Vec<String> {
    vec![
        p.name.clone(),
        describe_distribution(p.distribution),
        fixed(p.factor.p10, 2),
        fixed(p.factor.p50, 2),
        fixed(p.factor.p90, 2),
        p.keys.join(", "),
    ]
}

/// The Monte Carlo answers as sentences, shared by the terminal and the
/// PDF: (a) the timetable checked, (b) fresh plans, and the
/// reliability-based target when one was searched for.
pub struct RiskAnswers {
    pub timetable: Vec<String>,
    pub fresh: Vec<String>,
    pub reliability: Option<String>,
}

impl RiskAnswers {
    pub fn of(k: &crate::risk::RiskResult) -> RiskAnswers {
        let est = |e| describe_estimate(e, k.runs);
        let mut timetable = vec![
            format!("P(FS < 1.0 at some stage) = {}", est(&k.below_one)),
            format!("P(FS < {:.2} at some stage) = {}", k.fs_target, est(&k.below_target)),
            format!("lowest FS P10 {:.2}, P50 {:.2}, P90 {:.2}", k.lowest_fs.p10, k.lowest_fs.p50, k.lowest_fs.p90),
        ];
        if let Some(g) = k.governing.first() {
            timetable.push(format!("stage {} governs most often ({} of {} realisations)", g.stage, g.count, k.runs));
        }
        let mut dates: Vec<chrono::NaiveDate> = k.realisations.iter().filter_map(|r| r.finish).collect();
        dates.sort();
        let scope = if dates.len() < k.runs {
            format!("among the {} of {} realisations that can be built only: ", dates.len(), k.runs)
        } else {
            String::new()
        };
        let first = match (&k.finish, &k.duration_days) {
            (Some(d), Some(n)) => format!(
                "{scope}finish P10 {} ({:.0} days), P50 {} ({:.0} days), P90 {} ({:.0} days); best estimate {} ({} days)",
                d.p10, n.p10, d.p50, n.p50, d.p90, n.p90, k.best_estimate_finish, k.best_estimate_duration_days
            ),
            _ => "no realisation could be built".into(),
        };
        let mut fresh = vec![first, format!("cannot be built: {}", est(&k.not_buildable))];
        if !scope.is_empty() && !dates.is_empty() {
            // A realisation that cannot be built never finishes: ranked
            // after every finish date (the higher rank where a percentile
            // falls between two runs).
            let over_all = |q: f64| {
                let i = ((k.runs - 1) as f64 * q / 100.0).ceil() as usize;
                dates.get(i).map_or("cannot be built".to_string(), |d| d.to_string())
            };
            fresh.push(format!(
                "over all {} realisations, those that cannot be built counted as never finished: finish P50 {}, P90 {}",
                k.runs,
                over_all(50.0),
                over_all(90.0)
            ));
        }
        let reliability = k.reliability.as_ref().map(|rel| {
            format!(
                "Reliability-based target: FS {:.2} is the lowest target whose timetable keeps the estimated P(FS < 1) ≤ {} at every stage (lognormal fit to {} realisations per target).",
                rel.fs_target, rel.max_failure_probability, k.runs
            )
        });
        RiskAnswers { timetable, fresh, reliability }
    }
}

/// "0.012 (12 of 1000, s.e. 0.003)", or the upper bound when none occurred
/// in `n` realisations.
pub fn describe_estimate(e: &crate::risk::Estimate, n: usize) -> String {
    if e.count == 0 {
        format!("0 observed (95% upper bound {:.4})", e.upper_95)
    } else {
        format!("{:.3} ({} of {n}, s.e. {:.3})", e.probability, e.count, e.standard_error)
    }
}

/// "lognormal, CoV 0.40" and the like.
pub fn describe_distribution(d: crate::model::Distribution) -> String {
    use crate::model::Distribution as D;
    match d {
        D::Lognormal { cov } => format!("lognormal, CoV {cov:.2}"),
        D::Normal { cov } => format!("normal, CoV {cov:.2}"),
        D::Uniform { low, high } => format!("uniform {low:.2}–{high:.2}"),
    }
}

/// A hold-point check together with its project, its record number and
/// the log it was recorded in.
#[derive(serde::Serialize)]
pub struct ReleaseReport<'a> {
    #[serde(skip)]
    pub project: &'a Project,
    #[serde(flatten)]
    pub check: &'a ReleaseCheck,
    pub project_file: String,
    pub project_sha256: String,
    /// The record written (PDF).
    pub record_file: String,
    /// The record log, and this record's number (its entry in the log).
    pub log: String,
    pub record: usize,
    /// The earlier record of the same hold point this one supersedes.
    pub supersedes: Option<usize>,
    /// Entries and head (SHA-256 of the last line) of the log before this
    /// record: the anchor `log verify --record N --head H` checks.
    pub log_entries_before: usize,
    pub log_head_before: String,
    /// Head of the log after this record's entry (empty while rendering).
    pub log_head_after: String,
}

/// The calibration in one line (page 1 of the record; the whole paragraph
/// of `fit_sentence` is on page 2).
pub fn fit_summary(c: &ReleaseCheck) -> String {
    let fit = &c.fit;
    let est = |e: &crate::monitoring::calibrate::Estimate| {
        format!("{:.2} (95% {:.2}–{:.2})", e.value, e.interval95.0, e.interval95.1)
    };
    format!(
        "Back-analysis: cv and ch × {}, Cc and Cr × {}, correlation {:.2}, χ²/dof {:.2}: {} (details on page 2).",
        est(&fit.rate),
        est(&fit.compressibility),
        fit.correlation,
        fit.chi2_per_dof,
        fit_verdict(c)
    )
}

/// `s` with its first letter in capitals.
fn capitalised(s: &str) -> String {
    let mut c = s.chars();
    c.next().map_or_else(String::new, |f| f.to_uppercase().chain(c).collect())
}

/// Whether the calibrated model explains the readings, in words.
fn fit_verdict(c: &ReleaseCheck) -> &'static str {
    if c.fit_explains_readings {
        "the model explains the readings within the stated limits"
    } else {
        "MODEL DOES NOT EXPLAIN THE READINGS (rejected fit): engineer's review needed"
    }
}

/// The calibration in one paragraph (terminal and record).
pub fn fit_sentence(c: &ReleaseCheck) -> String {
    let fit = &c.fit;
    let o = |v: Option<f64>, d: usize| v.map_or("-".to_string(), |x| fixed(x, d));
    let est = |e: &crate::monitoring::calibrate::Estimate| {
        format!(
            "{:.2} (standard error of ln {:.3}; 95% interval {:.2}–{:.2})",
            e.value, e.se_ln, e.interval95.0, e.interval95.1
        )
    };
    let widened = if fit.birge_ratio > 1.0 {
        format!(
            " (standard errors from (JᵀWJ)⁻¹; intervals widened by the Birge ratio √(χ²/dof) = {:.2})",
            fit.birge_ratio
        )
    } else {
        String::new()
    };
    let tips: Vec<String> = fit
        .tip_settlement
        .iter()
        .map(|t| format!("{} {:.0} mm ({:.1} kPa) from {}", t.id, 1000.0 * t.latest_m, t.latest_kpa, t.source()))
        .collect();
    let asaoka: Vec<String> = c
        .asaoka_check
        .iter()
        .map(|a| {
            format!(
                "{} Asaoka final {:.0} mm against the model's {:.0} mm ({})",
                a.plate,
                1000.0 * a.asaoka_final_m,
                1000.0 * a.model_final_m,
                if a.agrees { "agrees" } else { "DISAGREES" }
            )
        })
        .collect();
    format!(
        "Back-analysis (weighted least squares, Levenberg–Marquardt): cv and ch × {}, Cc and Cr × {}, correlation {:.2}, from {} piezometer and {} plate readings; misfit before → after: pore pressure {} → {} kPa rms, settlement {} → {} mm rms; χ²/dof {:.2}{widened}. Tip settlement at the latest reading (taken off the excess): {}. Asaoka check: {}. {}.",
        est(&fit.rate),
        est(&fit.compressibility),
        fit.correlation,
        fit.piezometer_readings,
        fit.plate_readings,
        o(fit.rms_piezometer_kpa_before, 1),
        o(fit.rms_piezometer_kpa_after, 1),
        o(fit.rms_settlement_mm_before, 0),
        o(fit.rms_settlement_mm_after, 0),
        fit.chi2_per_dof,
        if tips.is_empty() { "no piezometer".to_string() } else { tips.join("; ") },
        if asaoka.is_empty() { "no plate with a reliable Asaoka forecast".to_string() } else { asaoka.join("; ") },
        capitalised(fit_verdict(c))
    )
}

/// One rule as the cells rule, value, limit, verdict, detail.
pub fn rule_cells(rule: &crate::monitoring::release::Rule) -> Vec<String> {
    let sign = if rule.must_be == "below" { "≥" } else { "≤" };
    vec![
        rule.name.to_string(),
        rule.value.map_or("-".into(), |v| fixed(v, 2)),
        format!("{sign} {} {}", fixed(rule.limit, 2), rule.unit).trim_end().to_string(),
        rule.verdict.label().to_string(),
        rule.detail.clone(),
    ]
}

/// The conditions of the recommendation in one sentence. Under a hold or
/// a stop there is nothing to place, so no lift conditions are given (site
/// staff must not read them as permission), only the reading frequency.
pub fn conditions_sentence(c: &ReleaseCheck) -> String {
    let k = &c.conditions;
    if c.recommendation != crate::monitoring::release::Level::CriteriaMet {
        return format!(
            "No lift may be placed on this record. Keep reading every instrument at least every {:.0} days until a new check.",
            k.reading_interval_days
        );
    }
    format!(
        "Conditions: a lift of at most {:.2} m, started no later than {} (the check is valid {:.0} days after the hold point; later, a new check is needed); read every instrument at least every {:.0} days, and daily while placing.",
        k.max_lift_m, k.latest_start, k.valid_days, k.reading_interval_days
    )
}

/// The record's number, supersession and the log anchor in one sentence.
pub fn record_sentence(rep: &ReleaseReport) -> String {
    let sup = rep.supersedes.map_or(String::new(), |n| format!(", supersedes record {n}"));
    format!(
        "Hold-point check record {}{sup}: {}. Log {} before this record: {} entries, head {} (verify with: fillpace log verify {} --record {} --head {}).",
        rep.record,
        rep.record_file,
        rep.log,
        rep.log_entries_before,
        rep.log_head_before,
        rep.log,
        rep.record,
        rep.log_head_before
    )
}

/// Column headings of the stage table shared by the terminal and PDF.
pub const STAGE_COLUMNS: [&str; 15] = [
    "#",
    "stage",
    "start",
    "end",
    "lift m",
    "crest m",
    "placed m",
    "FS end",
    "rest d",
    "release (hold point)",
    "FS rel.",
    "peak Δu kPa",
    "U centre",
    "settl. m",
    "governs: circle lowest point, su kPa",
];

/// `v` with `d` decimals (the one number formatter of the reports); a value
/// that rounds to zero is printed without a minus sign ("0.00", not
/// "-0.00").
pub fn fixed(v: f64, d: usize) -> String {
    let s = format!("{v:.d$}");
    match s.strip_prefix('-') {
        Some(rest) if rest.chars().all(|c| c == '0' || c == '.') => rest.to_string(),
        _ => s,
    }
}

/// What governs the stage's FS. For a slip circle, where it bottoms out
/// and the clay strength there: "Soft clay at 3.2 m: 18.4" (layer, depth
/// below original ground, su kPa); a circle whose lowest point lies in the
/// fill has no clay strength to show. For the fill face (infinite slope),
/// its name alone.
pub fn circle_bottom(s: &crate::schedule::planner::Stage) -> String {
    if s.mechanism == crate::stability::search::FACE_MECHANISM {
        s.mechanism.clone()
    } else if s.circle_depth_m > 0.0 {
        format!("{} at {:.1} m: {:.1}", s.mechanism, s.circle_depth_m, s.su_governing_kpa)
    } else {
        format!("{} (above original ground)", s.mechanism)
    }
}

/// One stage as the cells of `STAGE_COLUMNS`.
pub fn stage_cells(s: &crate::schedule::planner::Stage) -> Vec<String> {
    let f = fixed;
    vec![
        s.number.to_string(),
        s.kind.label().into(),
        s.start.format("%Y-%m-%d %a").to_string(),
        s.end.format("%Y-%m-%d %a").to_string(),
        f(s.thickness_m, 2),
        f(s.height_after_m, 2),
        f(s.placed_after_m, 2),
        f(s.fs_end, 2),
        if s.release.is_some() { s.rest_days.to_string() } else { "-".into() },
        s.release.map_or("-".into(), |d| d.format("%Y-%m-%d %a").to_string()),
        s.fs_release.map_or("-".into(), |x| f(x, 2)),
        f(s.peak_excess_kpa, 1),
        format!("{:.0}%", 100.0 * s.degree_centre),
        f(s.settlement_centre_m, 3),
        circle_bottom(s),
    ]
}

/// Now (UTC) from the system clock, to the second.
pub fn now_utc() -> chrono::NaiveDateTime {
    use chrono::Timelike;
    let now = chrono::Utc::now().naive_utc();
    now.with_nanosecond(0).unwrap_or(now)
}

/// The program and its version, "fillpace 0.1.0", printed on every report:
/// the terminal footer, the PDF title block and metadata, the CSV comment
/// line and the iCalendar PRODID.
pub fn program_version() -> String {
    format!("fillpace {}", env!("CARGO_PKG_VERSION"))
}

/// The caution in one line, for outputs with room for a line only (the CSV
/// comment line, calendar events).
pub const SHORT_CAUTION: &str = "prediction from uncertain soil parameters; field monitoring governs; stop filling on any sign of distress; not for use on site until checked and signed by the engineer of record";

/// Today's date (UTC) from the system clock, for title blocks.
pub fn today() -> chrono::NaiveDate {
    now_utc().date()
}

/// One output format of a plan.
pub trait Exporter {
    /// The bytes of the file.
    fn serialize(&self, report: &PlanReport) -> Result<Vec<u8>>;
}

#[cfg(test)]
mod tests {
    #[test]
    fn cautions_cover_the_required_points() {
        let c = super::cautions().join(" ");
        for needle in ["uncertain", "monitoring governs", "local codes", "licensed geotechnical engineer", "distress"] {
            assert!(c.contains(needle), "missing {needle}");
        }
        assert!(!c.contains('#'));
    }

    #[test]
    fn numbers_that_round_to_zero_have_no_sign() {
        assert_eq!(super::fixed(-0.0001, 2), "0.00");
        assert_eq!(super::fixed(-0.0, 1), "0.0");
        assert_eq!(super::fixed(-0.006, 2), "-0.01");
        assert_eq!(super::fixed(2.5, 0), "2");
    }

    #[test]
    fn the_footer_is_one_short_caution() {
        // One line of A4 landscape at 6.5 pt holds about 200 characters.
        let f = super::caution_footer();
        assert!(f.contains("monitoring governs") && f.contains("checked and signed"), "{f}");
        assert!(!f.contains('#') && !f.contains('\n') && f.len() < 180, "{f}");
    }
}
