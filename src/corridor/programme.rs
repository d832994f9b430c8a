//! The corridor programme: unconstrained section plans in parallel, the
//! sections booked one by one in priority order (see the module note of
//! `corridor`), the lower bounds, the daily and weekly fill, and the
//! rolling surcharge.
//!
//! Rolling surcharge rule: fill removed from a section's surcharge is
//! stockpiled from the day after its removal ends and is used first by any
//! later placement (platform or lift, any section) in date order until the
//! stockpile is empty; imported fill is the placed fill less the reused.
//! The scheduling itself counts every placement against the supply, so the
//! programme would also hold without reuse.

use super::ledger::{self, Ledger};
use super::quantities::{self, Volumes, Week};
use super::section::{self, Kind, Setup, Work, Works};
use super::{Corridor, SectionSpec};
use crate::error::{Error, Result};
use crate::response::Engine;
use crate::schedule::Runner;
use chrono::NaiveDate;
use rayon::prelude::*;
use serde::Serialize;

/// The heuristic, as stated in the outputs.
pub const HEURISTIC: &str = "priority-rule list scheduling: sections in order of priority, required finish, longest unconstrained duration, chainage; each booked in the earliest days the resources allow, every refused lift re-planned by the section's own planner from the later day; aims at the earliest corridor finish (not proven optimal)";

/// The whole programme.
#[derive(Debug, Clone, Serialize)]
pub struct Programme {
    pub title: String,
    pub reference: String,
    pub start_date: NaiveDate,
    /// Latest finish of the buildable sections.
    pub finish: Option<NaiveDate>,
    pub bounds: Bounds,
    pub heuristic: &'static str,
    /// Section names in the order they were scheduled.
    pub order: Vec<String>,
    pub sections: Vec<SectionResult>,
    pub totals: Totals,
    pub weeks: Vec<Week>,
    pub resources: ResourceSummary,
    /// Every file used, with its SHA-256.
    pub inputs: Vec<super::InputFile>,
    pub warnings: Vec<String>,
}

/// Lower bounds on the corridor finish.
#[derive(Debug, Clone, Serialize)]
pub struct Bounds {
    /// Latest finish of the sections planned alone with no resource limit.
    pub latest_unconstrained_finish: Option<NaiveDate>,
    /// Day by which the supply could have delivered all the fill placed
    /// (None when the supply is unlimited).
    pub supply_finish: Option<NaiveDate>,
}

/// The resources as used.
#[derive(Debug, Clone, Serialize)]
pub struct ResourceSummary {
    pub placing_crews: Option<usize>,
    pub drain_rigs: Option<usize>,
    pub drain_rig_m_per_day: Option<f64>,
    pub platform_thickness_m: f64,
    pub rolling_surcharge: bool,
    /// Sum of the sources' daily capacities once all are open, m³/day.
    pub supply_m3_per_day: Option<f64>,
    /// Most fill placed on one day, m³, and the most crews and rigs busy.
    pub peak_daily_fill_m3: f64,
    pub peak_crews: usize,
    pub peak_rigs: usize,
}

/// Corridor totals.
#[derive(Debug, Clone, Serialize)]
pub struct Totals {
    /// Fill placed (removals not deducted), m³, by part.
    pub placed: Volumes,
    /// Surcharge removed, m³.
    pub removed_m3: f64,
    /// Removed surcharge reused elsewhere, m³.
    pub reused_m3: f64,
    /// Placed less reused, m³.
    pub imported_m3: f64,
    pub drain_m: f64,
}

/// One section's result.
#[derive(Debug, Clone, Serialize)]
pub struct SectionResult {
    pub name: String,
    pub from_m: f64,
    pub to_m: f64,
    pub project_file: String,
    pub overrides: Vec<(String, String)>,
    pub priority: Option<i64>,
    pub clay_thickness_m: f64,
    pub design_height_m: f64,
    pub surcharge_height_m: f64,
    pub fs_target: f64,
    pub has_drains: bool,
    pub required_finish: Option<NaiveDate>,
    /// None when the section cannot be built; `reason` says why.
    pub outcome: Option<Outcome>,
    pub reason: Option<String>,
}

/// What a buildable section gets.
#[derive(Debug, Clone, Serialize)]
pub struct Outcome {
    pub start: NaiveDate,
    pub finish: NaiveDate,
    pub unconstrained_finish: NaiveDate,
    pub lifts: usize,
    /// Lowest FS at the end of any lift, that stage and its mechanism
    /// (the fill face or the band of the critical circle).
    pub governing_fs: f64,
    pub governing_stage: usize,
    pub governing_mechanism: String,
    /// Governing FS at the finish (circle or fill face).
    pub fs_finish: f64,
    pub settlement_at_finish_m: f64,
    /// Final primary settlement under the final profile (as the plan's
    /// `final_primary_settlement_m`), m.
    pub final_settlement_m: f64,
    /// Fill brought in by part (removal not deducted), m³.
    pub placed: Volumes,
    pub removed_m3: f64,
    pub drain_m: f64,
    pub required_finish_met: Option<bool>,
    pub works: Vec<Work>,
    pub warnings: Vec<String>,
}

/// Plan the corridor; `tick` is called once per section plan finished
/// (twice per section in all).
pub fn run(c: &Corridor, tick: &(dyn Fn() + Sync)) -> Result<Programme> {
    let engines: Vec<Engine> = c.sections.iter().map(|s| Engine::new(&s.project)).collect();
    let free = Ledger::unlimited(&c.calendar);
    let alone: Vec<std::result::Result<Works, String>> = c
        .sections
        .par_iter()
        .zip(engines.par_iter())
        .map(|(s, e)| {
            let runner = Runner::new(e);
            let out = buildable(section::schedule(&setup(c, s, &runner), &mut free.clone(), None));
            tick();
            out
        })
        .collect::<Result<_>>()?;
    let order = priority_order(c, &alone);
    let mut book = Ledger::new(&c.resources, &c.calendar);
    let mut done: Vec<Option<std::result::Result<Works, String>>> = vec![None; c.sections.len()];
    for &i in &order {
        let Ok(plan) = &alone[i] else { continue };
        let runner = Runner::new(&engines[i]);
        let mut trial = book.clone();
        let got = buildable(section::schedule(&setup(c, &c.sections[i], &runner), &mut trial, Some(plan)))?;
        if got.is_ok() {
            book = trial;
        }
        done[i] = Some(got);
        tick();
    }
    assemble(c, &engines, &alone, done, &order, &book)
}

/// A section's works, or why it cannot be built (failed computations are
/// reported per section; other errors stop the run).
fn buildable(r: Result<Works>) -> Result<std::result::Result<Works, String>> {
    match r {
        Ok(w) => Ok(Ok(w)),
        Err(Error::Computation(why)) => Ok(Err(why)),
        Err(e) => Err(e),
    }
}

fn setup<'a, 'e, 'p>(c: &Corridor, s: &SectionSpec, runner: &'a Runner<'e, 'p>) -> Setup<'a, 'e, 'p> {
    let drained = s.project.drains.is_some();
    let drains = c
        .resources
        .drain_rigs
        .filter(|_| drained)
        .map(|(_, rate)| (crate::compare::drain_length_per_m(&s.project) * s.length_m(), rate));
    let earliest = s.earliest_start.map_or(0, |d| (d - c.start_date).num_days());
    let platform_m = if drained { c.resources.platform_thickness_m } else { 0.0 };
    Setup { runner, length_m: s.length_m(), platform_m, drains, earliest }
}

/// Buildable sections in scheduling order (see the module note).
fn priority_order(c: &Corridor, alone: &[std::result::Result<Works, String>]) -> Vec<usize> {
    let mut idx: Vec<usize> = (0..c.sections.len()).filter(|i| alone[*i].is_ok()).collect();
    let finish = |i: usize| alone[i].as_ref().ok().and_then(|w| w.items.last()).map(|w| w.end);
    idx.sort_by(|&a, &b| {
        let (sa, sb) = (&c.sections[a], &c.sections[b]);
        sa.priority
            .unwrap_or(i64::MAX)
            .cmp(&sb.priority.unwrap_or(i64::MAX))
            .then(sa.required_finish.unwrap_or(NaiveDate::MAX).cmp(&sb.required_finish.unwrap_or(NaiveDate::MAX)))
            .then(finish(b).cmp(&finish(a)))
            .then(sa.from_m.total_cmp(&sb.from_m))
    });
    idx
}

fn assemble(
    c: &Corridor,
    engines: &[Engine],
    alone: &[std::result::Result<Works, String>],
    done: Vec<Option<std::result::Result<Works, String>>>,
    order: &[usize],
    book: &Ledger,
) -> Result<Programme> {
    let mut sections = Vec::new();
    for (i, got) in done.into_iter().enumerate() {
        let unconstrained = alone[i].as_ref().ok().and_then(|w| w.items.last()).map(|w| w.end);
        let got = got.unwrap_or_else(|| Err(alone[i].clone().err().unwrap_or_default()));
        sections.push(section_result(&c.sections[i], &engines[i], got, unconstrained)?);
    }
    let daily = Daily::of(&sections, c.resources.rolling_surcharge);
    let placed = sections.iter().filter_map(|s| s.outcome.as_ref()).fold(Volumes::default(), |a, o| a.plus(o.placed));
    let removed_m3: f64 = sections.iter().filter_map(|s| s.outcome.as_ref()).map(|o| o.removed_m3).sum();
    let reused_m3: f64 = daily.reused.iter().sum();
    let totals = Totals {
        placed,
        removed_m3,
        reused_m3,
        imported_m3: placed.total() - reused_m3,
        drain_m: sections.iter().filter_map(|s| s.outcome.as_ref()).map(|o| o.drain_m).sum(),
    };
    let outcomes = || sections.iter().filter_map(|s| s.outcome.as_ref());
    let bounds = Bounds {
        latest_unconstrained_finish: outcomes().map(|o| o.unconstrained_finish).max(),
        supply_finish: supply_finish(c, book, placed.total()),
    };
    let mut warnings: Vec<String> = Vec::new();
    for s in &sections {
        if let Some(why) = &s.reason {
            warnings.push(format!(
                "section '{}' cannot be built as specified and is left out of the programme: {why}",
                s.name
            ));
        }
        if s.outcome.as_ref().and_then(|o| o.required_finish_met) == Some(false) {
            warnings.push(format!(
                "section '{}' finishes after its required finish {}",
                s.name,
                s.required_finish.map_or(String::new(), |d| d.to_string())
            ));
        }
    }
    Ok(Programme {
        title: c.title.clone(),
        reference: c.reference.clone(),
        start_date: c.start_date,
        finish: outcomes().map(|o| o.finish).max(),
        bounds,
        heuristic: HEURISTIC,
        order: order.iter().map(|&i| c.sections[i].name.clone()).collect(),
        weeks: quantities::weekly(c.start_date, &daily.placed, &daily.reused, |k| book.capacity(k)),
        resources: resource_summary(c, &daily),
        totals,
        sections,
        inputs: c.inputs.clone(),
        warnings,
    })
}

fn section_result(
    s: &SectionSpec,
    engine: &Engine,
    got: std::result::Result<Works, String>,
    unconstrained: Option<NaiveDate>,
) -> Result<SectionResult> {
    let p = &s.project;
    let (outcome, reason) = match got {
        Ok(w) => (Some(outcome(s, engine, w, unconstrained)?), None),
        Err(why) => (None, Some(why)),
    };
    Ok(SectionResult {
        name: s.name.clone(),
        from_m: s.from_m,
        to_m: s.to_m,
        project_file: s.project_file.clone(),
        overrides: s.overrides.clone(),
        priority: s.priority,
        clay_thickness_m: s.clay_thickness_m(),
        design_height_m: p.embankment.design_height_m,
        surcharge_height_m: p.embankment.surcharge_height_m,
        fs_target: p.criteria.fs_construction,
        has_drains: p.drains.is_some(),
        required_finish: s.required_finish,
        outcome,
        reason,
    })
}

fn outcome(s: &SectionSpec, engine: &Engine, w: Works, unconstrained: Option<NaiveDate>) -> Result<Outcome> {
    let runner = Runner::new(engine);
    let stages = || w.items.iter().filter(|x| matches!(x.kind, Kind::Lift | Kind::Surcharge));
    let (governing_fs, governing_stage, governing_mechanism) = stages()
        .map(|x| (x.fs_end.unwrap_or(f64::NAN), x.stage.unwrap_or(0), x.mechanism.clone().unwrap_or_default()))
        .min_by(|a, b| a.0.total_cmp(&b.0))
        .unwrap_or((f64::INFINITY, 0, String::new()));
    let at_finish = runner.stability(&w.end_state, &mut Default::default())?;
    let fs_finish = at_finish.governing_fs();
    let placed = w.items.iter().fold(Volumes::default(), |a, x| a.plus(x.volume));
    let removed_m3 = w.items.iter().map(|x| x.removed_m3).sum::<f64>();
    let start = w.items.first().map_or(s.project.info.start_date, |x| x.start);
    let finish = w.items.last().map_or(start, |x| x.end);
    let mut warnings = w.warnings.clone();
    warnings.extend(engine.convergence_warning());
    warnings.extend(runner.stability_warnings());
    let service = s.project.criteria.fs_service;
    if fs_finish < service {
        warnings.push(format!(
            "FS at the finish {fs_finish:.3} ({}) is below the service target {service:.2}",
            at_finish.governing_mechanism()
        ));
    }
    // Secondary compression and the settlement forecast count from the
    // first fill placed.
    let loading_start = w.items.iter().find(|x| x.kind != Kind::Drains).map_or(0.0, |x| x.days[0] as f64);
    Ok(Outcome {
        start,
        finish,
        unconstrained_finish: unconstrained.unwrap_or(finish),
        lifts: stages().count(),
        governing_fs,
        governing_stage,
        governing_mechanism,
        fs_finish,
        settlement_at_finish_m: w.end_state.settlement_centre_m,
        final_settlement_m: crate::settlement::forecast(engine, &w.end_state, loading_start).final_primary_m,
        placed,
        removed_m3,
        drain_m: w.items.iter().map(|x| x.drain_m).sum(),
        required_finish_met: s.required_finish.map(|d| finish <= d),
        works: w.items,
        warnings,
    })
}

/// Fill by day from the corridor start: placed, reused (rolling
/// surcharge), and crews and rigs busy.
pub struct Daily {
    pub placed: Vec<f64>,
    pub reused: Vec<f64>,
    pub crews: Vec<usize>,
    pub rigs: Vec<usize>,
}

impl Daily {
    /// Rebuilt from the sections' works (independently of the ledger).
    pub fn of(sections: &[SectionResult], rolling: bool) -> Daily {
        let n = ledger::DAYS;
        let mut d = Daily { placed: vec![0.0; n], reused: vec![0.0; n], crews: vec![0; n], rigs: vec![0; n] };
        let mut freed = vec![0.0; n + 1];
        for w in sections.iter().filter_map(|s| s.outcome.as_ref()).flat_map(|o| &o.works) {
            let need = w.need();
            for &k in &w.days {
                let k = k as usize;
                d.placed[k] += need.fill_m3;
                d.crews[k] += usize::from(need.crew);
                d.rigs[k] += usize::from(need.rig);
            }
            freed[w.days.last().map_or(0, |k| *k as usize) + 1] += w.removed_m3;
        }
        if rolling {
            let mut stock = 0.0;
            for ((reused, placed), freed) in d.reused.iter_mut().zip(&d.placed).zip(&freed) {
                stock += freed;
                *reused = stock.min(*placed);
                stock -= *reused;
            }
        }
        d
    }
}

fn resource_summary(c: &Corridor, d: &Daily) -> ResourceSummary {
    let r = &c.resources;
    let supply = (!r.supply.is_empty()).then(|| r.supply.iter().map(|s| s.m3_per_day).sum());
    ResourceSummary {
        placing_crews: r.placing_crews,
        drain_rigs: r.drain_rigs.map(|x| x.0),
        drain_rig_m_per_day: r.drain_rigs.map(|x| x.1),
        platform_thickness_m: r.platform_thickness_m,
        rolling_surcharge: r.rolling_surcharge,
        supply_m3_per_day: supply,
        peak_daily_fill_m3: d.placed.iter().copied().fold(0.0, f64::max),
        peak_crews: d.crews.iter().copied().max().unwrap_or(0),
        peak_rigs: d.rigs.iter().copied().max().unwrap_or(0),
    }
}

/// The day the cumulative supply first reaches `total_m3`.
fn supply_finish(c: &Corridor, book: &Ledger, total_m3: f64) -> Option<NaiveDate> {
    if c.resources.supply.is_empty() {
        return None;
    }
    let mut sum = 0.0;
    (0..ledger::DAYS as i64)
        .find(|k| {
            sum += book.capacity(*k);
            sum >= total_m3 * (1.0 - 1e-12)
        })
        .and_then(|k| c.calendar.date(k).ok())
}
