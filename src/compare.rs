//! Design options: the project planned once for every combination of the
//! values given for a few keys (drain spacing × surcharge height, say), and
//! a row of key figures for each variant, sorted by finish date.

use crate::error::{Error, Result};
use crate::input::vary::{Document, value_from_text};
use crate::model::{DrainPattern, Project};
use crate::response::Engine;
use crate::schedule::Runner;
use crate::schedule::planner::{self, Plan, StageKind};
use chrono::NaiveDate;
use rayon::prelude::*;
use serde::Serialize;

/// Most variants one comparison may ask for.
pub const MAX_VARIANTS: usize = 200;

/// One `--vary KEY=V1,V2,...`.
#[derive(Debug, Clone)]
pub struct Axis {
    pub key: String,
    /// Values as typed.
    pub values: Vec<String>,
}

impl Axis {
    /// Parse `KEY=V1,V2,...`.
    pub fn parse(text: &str) -> Result<Axis> {
        let (key, values) = text.split_once('=').ok_or_else(|| {
            Error::Usage(format!("--vary {text}: write KEY=V1,V2,... (e.g. drains.spacing_m=1.0,1.5,2.0)"))
        })?;
        let values: Vec<String> = values.split(',').map(|v| v.trim().to_string()).collect();
        if key.trim().is_empty() || values.iter().any(String::is_empty) {
            return Err(Error::Usage(format!("--vary {text}: the key and every value must be non-empty")));
        }
        Ok(Axis { key: key.trim().to_string(), values })
    }
}

/// The settings of one variant: (key, value as typed).
pub type Settings = Vec<(String, String)>;

/// Key figures of one planned variant.
#[derive(Debug, Clone, Serialize)]
pub struct Variant {
    /// 1-based number in grid order (first key slowest).
    pub number: usize,
    /// "key=value; key=value".
    pub label: String,
    pub settings: Vec<Setting>,
    /// None when the variant cannot be built; `reason` says why.
    pub outcome: Option<Outcome>,
    pub reason: Option<String>,
    /// The plan's warnings (slip-circle clamps and fallbacks among them).
    pub warnings: Vec<String>,
}

#[derive(Debug, Clone, Serialize)]
pub struct Setting {
    pub key: String,
    pub value: String,
}

/// What a buildable variant's plan gives.
#[derive(Debug, Clone, Serialize)]
pub struct Outcome {
    pub lifts: usize,
    pub finish: NaiveDate,
    pub duration_days: i64,
    pub min_fs: f64,
    /// The plan's final primary settlement under the final profile, m.
    pub final_settlement_m: f64,
    pub residual_settlement_m: f64,
    /// Design fill, make-up for settlement and surcharge, m³ per m run.
    pub fill_volume_m3_per_m: f64,
    /// Drain length per metre run of embankment (drains under the whole base
    /// between the toes, berms included), m/m; 0 without drains.
    pub drain_length_m_per_m: f64,
    /// Governing FS at the finish (circle or fill face).
    pub fs_finish: f64,
    /// The service checks the variant misses (FS at the finish below
    /// `criteria.fs_service`, residual settlement above
    /// `criteria.residual_settlement_warning_m`); empty when it meets them.
    pub service_shortfalls: Vec<String>,
}

/// Every variant, sorted by finish date (unbuildable last).
#[derive(Debug, Clone, Serialize)]
pub struct Comparison {
    pub keys: Vec<String>,
    pub variants: Vec<Variant>,
}

/// Every combination of the axes' values, first axis slowest.
pub fn grid(axes: &[Axis]) -> Vec<Settings> {
    let mut out: Vec<Settings> = vec![Vec::new()];
    for a in axes {
        out = out
            .into_iter()
            .flat_map(|s| {
                a.values.iter().map(move |v| {
                    let mut t = s.clone();
                    t.push((a.key.clone(), v.clone()));
                    t
                })
            })
            .collect();
    }
    out
}

/// The document with one variant's settings applied. The proposed
/// `[[sequence]]` plays no part in planning and is left out, so that a
/// variant of height or surcharge does not conflict with it.
pub fn apply(doc: &Document, settings: &Settings) -> Result<Document> {
    let mut d = doc.clone();
    d.remove("sequence");
    for (k, v) in settings {
        d.set(k, value_from_text(v))?;
    }
    Ok(d)
}

fn label(settings: &Settings) -> String {
    settings.iter().map(|(k, v)| format!("{k}={v}")).collect::<Vec<_>>().join("; ")
}

/// Plan every variant (in parallel) and sort them by finish date. Keys are
/// checked, and every variant validated, before any planning starts, so a
/// bad key or value is reported at once.
pub fn compare(doc: &Document, axes: &[Axis], tick: &(dyn Fn() + Sync)) -> Result<Comparison> {
    if axes.is_empty() {
        return Err(Error::Usage("give at least one --vary KEY=V1,V2,...".into()));
    }
    for (i, a) in axes.iter().enumerate() {
        if axes[..i].iter().any(|b| b.key == a.key) {
            return Err(Error::Usage(format!("--vary {} is given twice", a.key)));
        }
    }
    let settings = grid(axes);
    if settings.len() > MAX_VARIANTS {
        return Err(Error::Usage(format!(
            "{} variants requested; at most {MAX_VARIANTS} can be compared in one run",
            settings.len()
        )));
    }
    let projects: Vec<Project> = settings
        .iter()
        .map(|s| apply(doc, s)?.project(&format!("{} with {}", doc.file, label(s))))
        .collect::<Result<_>>()?;
    let mut variants: Vec<Variant> = settings
        .par_iter()
        .zip(projects.par_iter())
        .enumerate()
        .map(|(i, (s, p))| {
            let engine = Engine::new(p);
            let runner = Runner::new(&engine);
            let (outcome, reason, warnings) = match planner::plan(&runner) {
                Ok(plan) => (Some(outcome(p, &plan)), None, plan.warnings),
                Err(Error::Computation(why)) => (None, Some(why), runner.stability_warnings()),
                Err(e) => return Err(e),
            };
            tick();
            Ok(Variant {
                number: i + 1,
                label: label(s),
                settings: s.iter().map(|(k, v)| Setting { key: k.clone(), value: v.clone() }).collect(),
                outcome,
                reason,
                warnings,
            })
        })
        .collect::<Result<_>>()?;
    variants.sort_by(|a, b| match (&a.outcome, &b.outcome) {
        (Some(x), Some(y)) => x.finish.cmp(&y.finish).then(a.number.cmp(&b.number)),
        (Some(_), None) => std::cmp::Ordering::Less,
        (None, Some(_)) => std::cmp::Ordering::Greater,
        (None, None) => a.number.cmp(&b.number),
    });
    Ok(Comparison { keys: axes.iter().map(|a| a.key.clone()).collect(), variants })
}

fn outcome(p: &Project, plan: &Plan) -> Outcome {
    let c = &p.criteria;
    let mut service_shortfalls = Vec::new();
    if plan.fs_finish < c.fs_service {
        service_shortfalls.push(format!("FS at finish {:.3} < {:.2}", plan.fs_finish, c.fs_service));
    }
    if plan.residual_settlement_m > c.residual_settlement_warning_m {
        service_shortfalls
            .push(format!("residual {:.3} > {:.3} m", plan.residual_settlement_m, c.residual_settlement_warning_m));
    }
    Outcome {
        lifts: plan.stages.iter().filter(|s| s.kind == StageKind::Lift).count(),
        finish: plan.finish,
        duration_days: plan.duration_days,
        min_fs: plan.min_fs,
        final_settlement_m: plan.final_primary_settlement_m,
        residual_settlement_m: plan.residual_settlement_m,
        fill_volume_m3_per_m: plan.volume_design_m3_per_m
            + plan.volume_makeup_m3_per_m
            + plan.volume_surcharge_m3_per_m,
        drain_length_m_per_m: drain_length_per_m(p),
        fs_finish: plan.fs_finish,
        service_shortfalls,
    }
}

/// Drain length per metre run: base width between the toes × depth ÷ the
/// plan area served by one drain (s² on a square grid, (√3/2)s² on a
/// triangular one; Hansbo 1981).
pub fn drain_length_per_m(p: &Project) -> f64 {
    let Some(d) = &p.drains else { return 0.0 };
    let profile = crate::load::profile(&p.embankment, p.embankment.design_height_m);
    let half_width = profile.last().map_or(0.0, |q| q.0);
    let area = match d.pattern {
        DrainPattern::Square => d.spacing_m * d.spacing_m,
        DrainPattern::Triangular => 0.75f64.sqrt() * d.spacing_m * d.spacing_m,
    };
    2.0 * half_width * d.depth_m / area
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grid_multiplies_the_axes() {
        let a = Axis::parse("drains.spacing_m=1.0,1.5").unwrap();
        let b = Axis::parse("embankment.surcharge_height_m=0,1,2").unwrap();
        let g = grid(&[a, b]);
        assert_eq!(g.len(), 6);
        assert_eq!(label(&g[1]), "drains.spacing_m=1.0; embankment.surcharge_height_m=1");
        assert!(Axis::parse("drains.spacing_m").is_err());
        assert!(Axis::parse("drains.spacing_m=1,,2").is_err());
    }

    #[test]
    fn drain_length_follows_the_pattern_area() {
        // Hand calculation on the demo section: half crest 8 m; 2H:1V slope
        // from 7.0 m down to the 2.5 m berm, 9 m; berm 10 m; 2H:1V slope to
        // the ground, 5 m: half base width 32 m. Drains 14 m long at 1.5 m
        // triangular serve (√3/2)·1.5² = 1.9486 m² each (Hansbo 1981), so
        // 2 × 32 × 14 / 1.9486 = 459.83 m of drain per metre run.
        let p = crate::input::parse(crate::app::DEMO, "demo").unwrap();
        assert!((drain_length_per_m(&p) - 459.83).abs() < 0.01, "{}", drain_length_per_m(&p));
        // Square grid at 2 m: 4 m² each, 2 × 32 × 14 / 4 = 224 m/m.
        let mut q = p.clone();
        if let Some(d) = q.drains.as_mut() {
            d.pattern = DrainPattern::Square;
            d.spacing_m = 2.0;
        }
        assert!((drain_length_per_m(&q) - 224.0).abs() < 1e-9, "{}", drain_length_per_m(&q));
    }
}
