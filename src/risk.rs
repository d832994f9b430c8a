//! Monte Carlo over the uncertain parameters declared in the project file
//! (`[[uncertain]]`, `[[correlation]]`): for each realisation, (a) the
//! best-estimate timetable is checked with the realised ground (lowest FS,
//! whether any stage falls below 1.0 or the target) and (b) a fresh plan is
//! made (its finish date). Realisations run in parallel (rayon); each draws
//! from its own random stream fixed by (seed, index), and results are
//! gathered in index order, so the answer depends on the seed only, never
//! on the number of threads. `reliability_target` finds the lowest FS
//! target whose timetable keeps the estimated P(FS < 1) of every stage
//! within a stated limit.
//!
//! Slip circles in the realisations are found by `search_from` the band
//! circles of the best-estimate plan at the nearest crest height, not by the
//! full grid: uncertain soil parameters move the critical circle little, and
//! this is what makes a thousand fresh plans affordable. With every factor
//! at 1 the checked timetable reproduces the best-estimate plan exactly.

use crate::error::{Error, Result};
use crate::input::vary::Document;
use crate::model::{Distribution, Project};
use crate::random::{self, Noise};
use crate::response::Engine;
use crate::schedule::planner::{self, Plan, StageKind};
use crate::schedule::{Effort, Runner};
use crate::stability::Diagnostics;
use crate::stability::search::BandResult;
use chrono::{Duration, NaiveDate};
use rayon::prelude::*;
use serde::Serialize;

/// Most realisations one run may ask for.
pub const MAX_RUNS: usize = 100_000;

/// How to run the Monte Carlo.
#[derive(Debug, Clone, Copy)]
pub struct RiskOptions {
    /// Number of realisations.
    pub runs: usize,
    /// Master seed of the random streams.
    pub seed: u64,
    /// Worker threads; None = one per core.
    pub threads: Option<usize>,
}

/// One realisation.
#[derive(Debug, Clone, Serialize)]
pub struct Realisation {
    /// 0-based index (its random stream).
    pub index: usize,
    /// Sampled factor of each uncertain parameter, in declaration order.
    pub factors: Vec<f64>,
    /// FS at the end of each stage of the best-estimate timetable.
    pub stage_fs: Vec<f64>,
    /// Lowest of `stage_fs` and its stage number (1-based).
    pub lowest_fs: f64,
    pub governing_stage: usize,
    /// The fresh plan's finish and duration (calendar days), None when it
    /// cannot be built.
    pub finish: Option<NaiveDate>,
    pub duration_days: Option<i64>,
    /// Why the fresh plan could not be built, when it could not.
    pub not_buildable: Option<String>,
    /// Clamps and fallbacks of this realisation's slip-circle searches.
    #[serde(skip)]
    pub diagnostics: Diagnostics,
}

/// A probability estimated from the realisations.
#[derive(Debug, Clone, Serialize)]
pub struct Estimate {
    /// Realisations in which the event happened.
    pub count: usize,
    /// count / runs.
    pub probability: f64,
    /// Binomial standard error √(p(1 − p)/n).
    pub standard_error: f64,
    /// One-sided 95% upper bound (Wilson 1927 score interval, z = 1.645);
    /// about 2.7/n when the count is zero.
    pub upper_95: f64,
}

impl Estimate {
    fn of(count: usize, n: usize) -> Estimate {
        let nf = n.max(1) as f64;
        let p = count as f64 / nf;
        let z: f64 = 1.645;
        let z2 = z * z;
        let upper = (p + z2 / (2.0 * nf) + z * (p * (1.0 - p) / nf + z2 / (4.0 * nf * nf)).sqrt()) / (1.0 + z2 / nf);
        Estimate { count, probability: p, standard_error: (p * (1.0 - p) / nf).sqrt(), upper_95: upper.min(1.0) }
    }
}

/// P10, P50 and P90 of a quantity.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct Spread {
    pub p10: f64,
    pub p50: f64,
    pub p90: f64,
}

impl Spread {
    /// Percentiles of a non-empty sample.
    fn of(v: &[f64]) -> Spread {
        let [p10, p50, p90] = random::percentiles(v, [10.0, 50.0, 90.0]);
        Spread { p10, p50, p90 }
    }
}

/// The FS distribution of one stage of the best-estimate timetable.
#[derive(Debug, Clone, Serialize)]
pub struct StageRisk {
    pub number: usize,
    pub kind: StageKind,
    pub start: NaiveDate,
    pub height_after_m: f64,
    /// FS of the best-estimate plan at this stage.
    pub fs_best_estimate: f64,
    pub fs: Spread,
    pub below_one: Estimate,
    pub below_target: Estimate,
    /// Lognormal reliability index β = mean(ln FS)/sd(ln FS) and the implied
    /// P(FS < 1) = Φ(−β) (FS taken as lognormal; Duncan 2000); None when
    /// the FS does not vary.
    pub beta_lognormal: Option<f64>,
    pub p_below_one_lognormal: Option<f64>,
}

/// How often a stage governs (has the lowest FS).
#[derive(Debug, Clone, Serialize)]
pub struct Governing {
    pub stage: usize,
    pub count: usize,
    pub fraction: f64,
}

/// An uncertain parameter and the spread of its sampled factor.
#[derive(Debug, Clone, Serialize)]
pub struct ParameterSummary {
    pub name: String,
    pub keys: Vec<String>,
    #[serde(flatten)]
    pub distribution: Distribution,
    pub factor: Spread,
}

/// The whole Monte Carlo answer.
#[derive(Debug, Clone, Serialize)]
pub struct RiskResult {
    pub runs: usize,
    pub seed: u64,
    pub parameters: Vec<ParameterSummary>,
    pub fs_target: f64,
    /// The best-estimate plan: finish, duration, lowest FS and its stage.
    pub best_estimate_finish: NaiveDate,
    pub best_estimate_duration_days: i64,
    pub best_estimate_min_fs: f64,
    /// (a) The best-estimate timetable with the realised ground.
    pub below_one: Estimate,
    pub below_target: Estimate,
    pub lowest_fs: Spread,
    pub governing: Vec<Governing>,
    pub stages: Vec<StageRisk>,
    /// (b) Fresh plans: finish date and duration percentiles over the
    /// buildable realisations, and the share that cannot be built.
    pub finish: Option<DateSpread>,
    pub duration_days: Option<Spread>,
    pub not_buildable: Estimate,
    /// The reliability-based target search, when asked for.
    pub reliability: Option<Reliability>,
    /// Clamps and fallbacks met by the slip-circle searches of the
    /// best-estimate plan and of every realisation.
    pub warnings: Vec<String>,
    pub realisations: Vec<Realisation>,
}

/// Finish-date percentiles (durations rounded to whole days).
#[derive(Debug, Clone, Serialize)]
pub struct DateSpread {
    pub p10: NaiveDate,
    pub p50: NaiveDate,
    pub p90: NaiveDate,
}

/// Band circles of each stage of `plan` with its crest height: the seeds of
/// the realisations' slip-circle searches (one entry per stage, in order).
pub fn seeds(plan: &Plan) -> Vec<(f64, Vec<BandResult>)> {
    plan.stages
        .iter()
        .map(|s| (s.height_after_m, s.critical.as_ref().map_or_else(Vec::new, |c| c.bands.clone())))
        .collect()
}

/// Run the Monte Carlo for the project in `doc` (already validated into
/// `base`) around its best-estimate `plan`; `reliability` is the search
/// that chose the plan's target, when there was one; `tick` is called
/// after each realisation.
pub fn run(
    doc: &Document,
    base: &Project,
    plan: &Plan,
    opts: RiskOptions,
    reliability: Option<Reliability>,
    tick: &(dyn Fn() + Sync),
) -> Result<RiskResult> {
    check_request(doc, base, opts)?;
    let all = realisations(doc, base, plan, opts, true, tick)?;
    Ok(summarise(base, plan, opts, all, reliability))
}

/// The project must declare uncertain parameters, and the number of runs
/// and threads must be sensible.
pub fn check_request(doc: &Document, base: &Project, opts: RiskOptions) -> Result<()> {
    if base.uncertainty.params.is_empty() {
        return Err(Error::input(
            &doc.file,
            None,
            "uncertain",
            "has no [[uncertain]] entries; declare the uncertain parameters (name, keys, distribution, cov or low/high) to run risk".into(),
        ));
    }
    if !(1..=MAX_RUNS).contains(&opts.runs) {
        return Err(Error::Usage(format!("--runs {} must be between 1 and {MAX_RUNS}", opts.runs)));
    }
    if opts.threads == Some(0) {
        return Err(Error::Usage("--threads must be at least 1".into()));
    }
    Ok(())
}

/// All realisations around `plan`, in index order, on `opts.threads`.
fn realisations(
    doc: &Document,
    base: &Project,
    plan: &Plan,
    opts: RiskOptions,
    afresh: bool,
    tick: &(dyn Fn() + Sync),
) -> Result<Vec<Realisation>> {
    let l = random::correlation_factor(&base.uncertainty)
        .ok_or_else(|| Error::Computation("the correlation matrix is not positive definite".into()))?;
    let seeds = seeds(plan);
    // The best estimate's engine lends its stress tables to every
    // realisation of the same geometry.
    let shared = Engine::new(base);
    let work = || -> Result<Vec<Realisation>> {
        (0..opts.runs)
            .into_par_iter()
            .map(|i| {
                let r = realise(doc, base, &shared, &l, plan, &seeds, i, opts.seed, afresh);
                tick();
                r
            })
            .collect()
    };
    match opts.threads {
        None => work(),
        Some(n) => rayon::ThreadPoolBuilder::new()
            .num_threads(n)
            .build()
            .map_err(|e| Error::Computation(format!("cannot start {n} worker threads: {e}")))?
            .install(work),
    }
}

/// One FS target tried by the reliability-based search.
#[derive(Debug, Clone, Serialize)]
pub struct TargetTrial {
    pub fs_target: f64,
    /// Finish of the timetable planned to this target (None: cannot be built).
    pub finish: Option<NaiveDate>,
    /// Highest estimated P(FS < 1) over the stages, and that stage.
    pub p_below_one: Option<f64>,
    pub worst_stage: Option<usize>,
    pub meets: bool,
}

/// The reliability-based target: the lowest FS target (to 0.01) whose
/// best-estimate timetable keeps the estimated P(FS < 1) at every stage at
/// or below `max_failure_probability`.
#[derive(Debug, Clone, Serialize)]
pub struct Reliability {
    pub max_failure_probability: f64,
    pub fs_target: f64,
    pub trials: Vec<TargetTrial>,
}

/// A project planned to one target: its document, validated project and plan.
type Planned = (Document, Project, Plan);

/// Highest FS target the search will try (the largest the project file
/// allows).
const TARGET_MAX: f64 = 3.0;

/// Find the reliability-based FS target and return the project planned to
/// it (document, project, plan) with the search record. Each target tried
/// is planned in full, then checked by `opts.runs` realisations (the same
/// streams every time, so the estimates move smoothly with the target).
/// A stage's P(FS < 1) is the lognormal estimate Φ(−β) where the FS varies
/// (small probabilities cannot be counted from a few hundred runs), else
/// the counted share.
pub fn reliability_target(
    doc: &Document,
    base: &Project,
    max_failure_probability: f64,
    opts: RiskOptions,
    tick: &(dyn Fn() + Sync),
) -> Result<(Document, Project, Plan, Reliability)> {
    if !(max_failure_probability > 0.0 && max_failure_probability < 0.5) {
        return Err(Error::Usage(format!(
            "--max-failure-probability {max_failure_probability} must be between 0 and 0.5 (e.g. 0.001)"
        )));
    }
    check_request(doc, base, opts)?;
    // One target: planned in full, then its timetable checked by the
    // realisations; the planned project is kept when the target meets the
    // limit. A target "fails" when its timetable can be built but some
    // stage's P(FS < 1) exceeds the limit.
    let mut trials: Vec<TargetTrial> = Vec::new();
    let mut try_target = |t: f64| -> Result<(bool, Option<Planned>)> {
        let mut d = doc.clone();
        d.set("criteria.fs_construction", toml::Value::Float(t))?;
        let p = d.project(&format!("{} with criteria.fs_construction = {t:.2}", doc.file))?;
        let engine = Engine::new(&p);
        let plan = match planner::plan(&Runner::new(&engine)) {
            Ok(plan) => plan,
            Err(Error::Computation(_)) => {
                let none =
                    TargetTrial { fs_target: t, finish: None, p_below_one: None, worst_stage: None, meets: false };
                trials.push(none);
                return Ok((false, None));
            }
            Err(e) => return Err(e),
        };
        let all = realisations(&d, &p, &plan, opts, false, tick)?;
        let risk = summarise(&p, &plan, opts, all, None);
        let (worst_stage, pf) = risk
            .stages
            .iter()
            .map(|s| (s.number, s.p_below_one_lognormal.unwrap_or(s.below_one.probability)))
            .max_by(|a, b| a.1.total_cmp(&b.1))
            .unwrap_or((0, 0.0));
        let meets = pf <= max_failure_probability;
        let finish = Some(plan.finish);
        trials.push(TargetTrial { fs_target: t, finish, p_below_one: Some(pf), worst_stage: Some(worst_stage), meets });
        Ok((!meets, meets.then_some((d, p, plan))))
    };
    // Higher targets lower the probability and eventually cannot be built:
    // bracket the lowest target that does not fail (1.0, then upwards in
    // steps of 0.25), then bisect to 0.01. `at_hi` is the planned project
    // at `hi` when `hi` meets the limit (None when it cannot be built).
    let (mut lo, mut hi) = (1.0, 1.0);
    let (mut failing, mut at_hi) = try_target(hi)?;
    while failing && hi < TARGET_MAX - 1e-9 {
        (lo, hi) = (hi, (hi + 0.25).min(TARGET_MAX));
        (failing, at_hi) = try_target(hi)?;
    }
    while !failing && hi - lo > 0.01 + 1e-9 {
        let mid = ((lo + hi) / 2.0 * 100.0).round() / 100.0;
        if mid <= lo + 1e-9 || mid >= hi - 1e-9 {
            break;
        }
        match try_target(mid)? {
            (true, _) => lo = mid,
            (false, planned) => (hi, at_hi) = (mid, planned),
        }
    }
    let Some((d, p, plan)) = at_hi else {
        return Err(Error::Computation(format!(
            "no FS target up to {TARGET_MAX:.2} gives a timetable that can be built with P(FS < 1) ≤ {max_failure_probability} at every stage; the uncertainty is too large for this design (targets tried — {})",
            trials
                .iter()
                .map(|t| match t.p_below_one {
                    Some(p) => format!(
                        "FS {:.2}: P(FS < 1) up to {p:.1e} at stage {}",
                        t.fs_target,
                        t.worst_stage.unwrap_or(0)
                    ),
                    None => format!("FS {:.2}: cannot be built", t.fs_target),
                })
                .collect::<Vec<_>>()
                .join("; ")
        )));
    };
    let rel = Reliability { max_failure_probability, fs_target: p.criteria.fs_construction, trials };
    Ok((d, p, plan, rel))
}

/// Draw realisation `index`, check the timetable and (when `afresh`) plan
/// afresh.
#[allow(clippy::too_many_arguments)]
fn realise(
    doc: &Document,
    base: &Project,
    shared: &Engine,
    l: &nalgebra::DMatrix<f64>,
    plan: &Plan,
    seeds: &[(f64, Vec<BandResult>)],
    index: usize,
    seed: u64,
    afresh: bool,
) -> Result<Realisation> {
    let u = &base.uncertainty;
    let factors = random::draw(u, l, &mut Noise::stream(seed, index as u64));
    let mut d = doc.clone();
    for (param, f) in u.params.iter().zip(&factors) {
        for k in &param.keys {
            d.scale(k, *f)?;
        }
    }
    let named: Vec<String> = u.params.iter().zip(&factors).map(|(p, f)| format!("{} × {f:.3}", p.name)).collect();
    let p = d.project(&format!("{} in realisation {index} ({})", doc.file, named.join(", ")))?;
    let engine = Engine::sharing(&p, shared);
    let r = Runner::for_realisation(&engine, seeds.to_vec());
    let mut effort = Effort::default();
    let mut st = engine.initial_state();
    let mut stage_fs = Vec::with_capacity(plan.stages.len());
    for (s, (_, bands)) in plan.stages.iter().zip(seeds) {
        r.place_on(&mut st, s.start, s.thickness_m)?;
        stage_fs.push(r.stability_from(&st, bands, &mut effort)?.governing_fs());
    }
    let (governing_stage, lowest_fs) = plan
        .stages
        .iter()
        .zip(&stage_fs)
        .filter(|(s, _)| s.kind == StageKind::Lift)
        .map(|(s, fs)| (s.number, *fs))
        .min_by(|a, b| a.1.total_cmp(&b.1))
        .unwrap_or((0, f64::INFINITY));
    let (finish, duration_days, not_buildable) = match afresh.then(|| planner::plan(&r)) {
        None => (None, None, None),
        Some(Ok(fresh)) => (Some(fresh.finish), Some(fresh.duration_days), None),
        Some(Err(Error::Computation(why))) => (None, None, Some(why)),
        Some(Err(e)) => return Err(e),
    };
    Ok(Realisation {
        index,
        factors,
        stage_fs,
        lowest_fs,
        governing_stage,
        finish,
        duration_days,
        not_buildable,
        diagnostics: r.stability_diagnostics(),
    })
}

/// The best-estimate plan's warnings and the clamps and fallbacks of the
/// realisations' slip-circle searches.
fn risk_warnings(plan: &Plan, all: &[Realisation]) -> Vec<String> {
    let mut d = Diagnostics::default();
    all.iter().for_each(|r| d.merge(&r.diagnostics));
    let best = plan.warnings.iter().map(|w| format!("best-estimate plan: {w}"));
    best.chain(d.warnings().into_iter().map(|w| format!("realisations: {w}"))).collect()
}

fn summarise(
    base: &Project,
    plan: &Plan,
    opts: RiskOptions,
    all: Vec<Realisation>,
    reliability: Option<Reliability>,
) -> RiskResult {
    let n = all.len();
    let target = base.criteria.fs_construction;
    let lowest: Vec<f64> = all.iter().map(|r| r.lowest_fs).collect();
    let stages = plan
        .stages
        .iter()
        .enumerate()
        .map(|(k, s)| {
            let fs: Vec<f64> = all.iter().map(|r| r.stage_fs[k]).collect();
            let ln: Vec<f64> = fs.iter().map(|f| f.ln()).collect();
            let mean = ln.iter().sum::<f64>() / n as f64;
            let sd = (ln.iter().map(|x| (x - mean).powi(2)).sum::<f64>() / (n.max(2) - 1) as f64).sqrt();
            let beta = (sd > 1e-12).then(|| mean / sd);
            StageRisk {
                number: s.number,
                kind: s.kind,
                start: s.start,
                height_after_m: s.height_after_m,
                fs_best_estimate: s.fs_end,
                fs: Spread::of(&fs),
                below_one: Estimate::of(fs.iter().filter(|f| **f < 1.0).count(), n),
                below_target: Estimate::of(fs.iter().filter(|f| **f < target).count(), n),
                beta_lognormal: beta,
                p_below_one_lognormal: beta.map(|b| random::normal_cdf(-b)),
            }
        })
        .collect();
    let mut governing: Vec<Governing> = Vec::new();
    for r in &all {
        match governing.iter_mut().find(|g| g.stage == r.governing_stage) {
            Some(g) => g.count += 1,
            None => governing.push(Governing { stage: r.governing_stage, count: 1, fraction: 0.0 }),
        }
    }
    for g in &mut governing {
        g.fraction = g.count as f64 / n as f64;
    }
    governing.sort_by(|a, b| b.count.cmp(&a.count).then(a.stage.cmp(&b.stage)));
    let durations: Vec<f64> = all.iter().filter_map(|r| r.duration_days.map(|d| d as f64)).collect();
    let duration_days = (!durations.is_empty()).then(|| Spread::of(&durations));
    let start = base.info.start_date;
    let date = |d: f64| start + Duration::days(d.round() as i64 - 1);
    let u = &base.uncertainty;
    let parameters = u
        .params
        .iter()
        .enumerate()
        .map(|(k, p)| {
            let f: Vec<f64> = all.iter().map(|r| r.factors[k]).collect();
            ParameterSummary {
                name: p.name.clone(),
                keys: p.keys.clone(),
                distribution: p.distribution,
                factor: Spread::of(&f),
            }
        })
        .collect();
    RiskResult {
        runs: n,
        seed: opts.seed,
        parameters,
        fs_target: target,
        best_estimate_finish: plan.finish,
        best_estimate_duration_days: plan.duration_days,
        best_estimate_min_fs: plan.min_fs,
        below_one: Estimate::of(lowest.iter().filter(|f| **f < 1.0).count(), n),
        below_target: Estimate::of(lowest.iter().filter(|f| **f < target).count(), n),
        lowest_fs: Spread::of(&lowest),
        governing,
        stages,
        finish: duration_days.map(|s| DateSpread { p10: date(s.p10), p50: date(s.p50), p90: date(s.p90) }),
        duration_days,
        not_buildable: Estimate::of(all.iter().filter(|r| r.not_buildable.is_some()).count(), n),
        reliability,
        warnings: risk_warnings(plan, &all),
        realisations: all,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_realisations_stages_are_the_states_its_timetable_replays_to() {
        // CONSISTENCY check (the fast path against a reference path of the
        // same engine): a realisation's fresh plan takes each lift's
        // placement and search from the trial that accepted it instead of
        // placing it again. Replaying the plan's own timetable on the same
        // engine must reach the same states, to the bit (rests step on a
        // fixed grid, placement is deterministic): each stage's last working
        // day, peak excess pore pressure and placed thickness at the end of
        // placement, and the settlement and degree of consolidation at its
        // release. The demo with cv × 0.7 rests before most lifts.
        let text = include_str!("../examples/kestrel-fen.toml");
        let doc = Document::parse(text, "kestrel-fen.toml").unwrap();
        let base = crate::input::parse(text, "kestrel-fen.toml").unwrap();
        let plan = planner::plan(&Runner::new(&Engine::new(&base))).unwrap();
        let mut d = doc.clone();
        d.scale("ground.layers[1].cv_m2_per_year", 0.7).unwrap();
        let p = d.project("realisation").unwrap();
        let engine = Engine::new(&p);
        let fresh = planner::plan(&Runner::for_realisation(&engine, seeds(&plan))).unwrap();
        assert!(fresh.stages.len() >= 4, "{} stages", fresh.stages.len());
        let replay = Runner::new(&engine);
        let mut st = engine.initial_state();
        let mut previous: Option<&planner::Stage> = None;
        for s in &fresh.stages {
            replay.rest_until(&mut st, replay.calendar.day_of(s.start), &mut |_| {});
            if let Some(prev) = previous {
                assert_eq!(st.settlement_centre_m, prev.settlement_centre_m, "stage {} at release", prev.number);
                assert_eq!(engine.degree_centre(&st), prev.degree_centre, "stage {} at release", prev.number);
            }
            let (_, last) = replay.place(&mut st, s.thickness_m, &mut |_| {}).unwrap();
            assert_eq!(replay.calendar.date(last).unwrap(), s.end, "stage {} end", s.number);
            assert_eq!(engine.peak_excess(&st), s.peak_excess_kpa, "stage {} excess", s.number);
            assert_eq!(st.placed_m, s.placed_after_m, "stage {} placed", s.number);
            assert!(s.fill_after_m3_per_m.is_none(), "a realisation's plan keeps no fill areas");
            previous = Some(s);
        }
    }

    #[test]
    fn a_linear_case_gives_the_lognormal_distribution_of_fs() {
        // tests/data/phi0-single-lift.toml: φ = 0 clay without strength gain
        // under strengthless fill, so every circle's FS is proportional to
        // su0 and FS = X·F1 with X lognormal (mean 1, CoV 0.3): ln FS is
        // normal with mean ln F1 + μ and sd σ, σ² = ln(1 + 0.3²), μ = −σ²/2
        // (general statistics). Its q-th percentile is F1·exp(μ + σ z_q),
        // z_0.9 = 1.281552 (Abramowitz & Stegun 1964, Table 26.5); a sample
        // percentile has standard error σ√(q(1 − q)/n)/φ(z_q) in ln FS and
        // the lognormal index β = E[ln FS]/sd[ln FS] about √(1 + β²/2)/√n
        // (general statistics); 4 standard errors are allowed.
        let text = include_str!("../tests/data/phi0-single-lift.toml");
        let doc = Document::parse(text, "phi0.toml").unwrap();
        let p = crate::input::parse(text, "phi0.toml").unwrap();
        let engine = Engine::new(&p);
        let plan = planner::plan(&Runner::new(&engine)).unwrap();
        let n = 400;
        let opts = RiskOptions { runs: n, seed: 3, threads: Some(1) };
        let r = run(&doc, &p, &plan, opts, None, &|| {}).unwrap();
        let f1 = plan.stages[0].fs_end;
        let s2 = (1.0f64 + 0.3 * 0.3).ln();
        let (mu, sigma) = (-0.5 * s2, s2.sqrt());
        let density = |z: f64| (-0.5 * z * z).exp() / std::f64::consts::TAU.sqrt();
        let st = &r.stages[0];
        for (q, z, got) in [(0.1, -1.281_552, st.fs.p10), (0.5, 0.0, st.fs.p50), (0.9, 1.281_552, st.fs.p90)] {
            let expected = f1 * (mu + sigma * z).exp();
            let se = sigma * (q * (1.0 - q) / n as f64).sqrt() / density(z);
            assert!((got / expected).ln().abs() < 4.0 * se, "P{}: {got} against {expected}", 100.0 * q);
        }
        let beta = (f1.ln() + mu) / sigma;
        let got = st.beta_lognormal.unwrap();
        assert!((got - beta).abs() < 4.0 * (1.0 + 0.5 * beta * beta).sqrt() / (n as f64).sqrt(), "β {got} vs {beta}");
    }
}
