//! Range and cross-field checks that turn a `RawProject` into a `Project`.
//! Every problem is collected (not just the first); each names its key path
//! and line, the value, and what is allowed. Allowed ranges are the physical
//! or practical ranges documented in the project-file reference.

use super::raw::*;
use super::spans::LineMap;
use crate::error::InputIssue;
use crate::model::*;
use chrono::NaiveDate;

mod construction;
mod embankment;
mod ground;
mod monitoring;
mod uncertain;
use construction::{construction, sequence};
use embankment::embankment;
use ground::ground;
use monitoring::monitoring;
use uncertain::uncertainty;

#[cfg(test)]
mod tests;

/// Lower bound kind of an allowed range.
#[derive(Clone, Copy)]
enum Low {
    /// value ≥ bound
    Incl(f64),
    /// value > bound
    Excl(f64),
}

struct Check<'a> {
    lines: &'a LineMap,
    issues: Vec<InputIssue>,
}

impl Check<'_> {
    fn bad(&mut self, key: &str, message: String) {
        self.issues.push(InputIssue { line: self.lines.line(key), key: key.to_string(), message });
    }

    /// Check that `v` is finite and within the range; returns it either way
    /// (the caller's result is discarded when any issue exists).
    fn num(&mut self, key: &str, v: f64, low: Low, high: f64) -> f64 {
        let short = key.rsplit('.').next().unwrap_or(key);
        let (ok_low, low_text) = match low {
            Low::Incl(b) => (v >= b, format!("{b} ≤ {short}")),
            Low::Excl(b) => (v > b, format!("{b} < {short}")),
        };
        if !v.is_finite() {
            self.bad(key, format!("= {v} is not a finite number; allowed: {low_text} ≤ {high}"));
        } else if !ok_low || v > high {
            self.bad(key, format!("= {} is out of range; allowed: {low_text} ≤ {high}", show(v)));
        }
        v
    }

    fn opt(&mut self, key: &str, v: Option<f64>, default: f64, low: Low, high: f64) -> f64 {
        match v {
            Some(x) => self.num(key, x, low, high),
            None => default,
        }
    }

    fn date(&mut self, key: &str, v: &toml::Value) -> NaiveDate {
        let text = match v {
            toml::Value::String(s) => s.clone(),
            toml::Value::Datetime(d) => d.to_string(),
            other => {
                self.bad(key, format!("= {other} must be a date written YYYY-MM-DD"));
                return NaiveDate::MIN;
            }
        };
        self.parse_date(key, &text)
    }

    fn parse_date(&mut self, key: &str, text: &str) -> NaiveDate {
        match NaiveDate::parse_from_str(text.trim(), "%Y-%m-%d") {
            Ok(d) if (1900..=2200).contains(&chrono::Datelike::year(&d)) => d,
            Ok(_) => {
                self.bad(key, format!("= \"{text}\": the year must be 1900–2200"));
                NaiveDate::MIN
            }
            Err(_) => {
                self.bad(key, format!("= \"{text}\" is not a valid date YYYY-MM-DD"));
                NaiveDate::MIN
            }
        }
    }

    fn choice<'c>(&mut self, key: &str, v: Option<&str>, allowed: &[&'c str]) -> &'c str {
        match v {
            None => allowed[0],
            Some(s) => match allowed.iter().find(|a| **a == s) {
                Some(a) => a,
                None => {
                    self.bad(key, format!("= \"{s}\" is not allowed; use one of: {}", allowed.join(", ")));
                    allowed[0]
                }
            },
        }
    }
}

/// A number as written in a message: plain, or in exponent form when very
/// large or very small (1e300, not three hundred digits).
fn show(v: f64) -> String {
    if v != 0.0 && !(1e-6..1e9).contains(&v.abs()) { format!("{v:e}") } else { format!("{v}") }
}

/// Validate the whole raw project.
pub fn project(raw: &RawProject, lines: &LineMap, doc: &super::vary::Document) -> Result<Project, Vec<InputIssue>> {
    let mut c = Check { lines, issues: Vec::new() };
    let info = info(&mut c, &raw.project);
    let ground = ground(&mut c, &raw.ground);
    let embankment = embankment(&mut c, &raw.embankment);
    let drains = raw.drains.as_ref().map(|d| drains(&mut c, d, &ground));
    let construction = construction(&mut c, &raw.construction);
    let criteria = criteria(&mut c, &raw.criteria);
    let stability = stability(&mut c, raw.stability.as_ref());
    let analysis = analysis(&mut c, raw.analysis.as_ref());
    let sequence = sequence(&mut c, &raw.sequence, &info, &construction, &embankment);
    let instruments = instruments(&mut c, &raw.instrument, &info, &ground);
    let monitoring = monitoring(&mut c, raw.monitoring.as_ref(), &instruments);
    let uncertainty = uncertainty(&mut c, &raw.uncertain, &raw.correlation, doc);
    if c.issues.is_empty() {
        Ok(Project {
            info,
            ground,
            embankment,
            drains,
            construction,
            criteria,
            stability,
            analysis,
            sequence,
            instruments,
            monitoring,
            uncertainty,
        })
    } else {
        Err(c.issues)
    }
}

fn info(c: &mut Check, r: &RawInfo) -> ProjectInfo {
    if r.title.trim().is_empty() {
        c.bad("project.title", "must not be empty".into());
    }
    ProjectInfo {
        title: r.title.clone(),
        reference: r.reference.clone().unwrap_or_default(),
        location: r.location.clone().unwrap_or_default(),
        revision: r.revision.clone().unwrap_or_else(|| "-".into()),
        start_date: c.date("project.start_date", &r.start_date),
        design_life_years: c.opt("project.design_life_years", r.design_life_years, 20.0, Low::Excl(0.0), 200.0),
    }
}

fn drains(c: &mut Check, r: &RawDrains, ground: &Ground) -> Drains {
    let k = |f: &str| format!("drains.{f}");
    let pattern = match c.choice(&k("pattern"), Some(r.pattern.as_str()), &["triangular", "square"]) {
        "triangular" => DrainPattern::Triangular,
        _ => DrainPattern::Square,
    };
    let spacing_m = c.num(&k("spacing_m"), r.spacing_m, Low::Excl(0.0), 10.0);
    let diameter_m = match (r.diameter_mm, r.band_width_mm, r.band_thickness_mm) {
        (Some(d), None, None) => c.num(&k("diameter_mm"), d, Low::Excl(0.0), 1000.0) / 1000.0,
        (None, Some(a), Some(b)) => {
            let a = c.num(&k("band_width_mm"), a, Low::Excl(0.0), 500.0);
            let b = c.num(&k("band_thickness_mm"), b, Low::Excl(0.0), 50.0);
            if b > a {
                c.bad(&k("band_thickness_mm"), format!("= {b} must not exceed band_width_mm ({a})"));
            }
            // Equivalent diameter (a + b)/2 (Rixner et al. 1986).
            (a + b) / 2.0 / 1000.0
        }
        _ => {
            c.bad(&k("diameter_mm"), "give either diameter_mm or both band_width_mm and band_thickness_mm".into());
            0.05
        }
    };
    let band_mm = r.band_width_mm.unwrap_or(0.0).max(r.diameter_mm.unwrap_or(0.0));
    if spacing_m * 1000.0 <= band_mm {
        c.bad(&k("spacing_m"), format!("= {spacing_m} m must be larger than the drain width ({band_mm} mm)"));
    }
    let profile: f64 = ground.layers.iter().map(|l| l.thickness_m).sum();
    let smear_ratio = c.opt(&k("smear_ratio"), r.smear_ratio, 1.0, Low::Incl(1.0), 10.0);
    let de = match pattern {
        DrainPattern::Triangular => 1.05 * spacing_m,
        DrainPattern::Square => 1.128 * spacing_m,
    };
    if smear_ratio * diameter_m >= de {
        c.bad(&k("smear_ratio"), format!("= {smear_ratio}: the smear zone ({:.3} m) must be smaller than the drain influence diameter ({de:.3} m)", smear_ratio * diameter_m));
    }
    Drains {
        pattern,
        spacing_m,
        diameter_m,
        depth_m: c.num(&k("depth_m"), r.depth_m, Low::Excl(0.0), profile),
        smear_ratio,
        kh_over_ks: c.opt(&k("kh_over_ks"), r.kh_over_ks, 1.0, Low::Incl(1.0), 20.0),
        discharge_m3_per_day: r
            .discharge_m3_per_year
            .map(|q| c.num(&k("discharge_m3_per_year"), q, Low::Excl(0.0), 1e6) / DAYS_PER_YEAR),
    }
}

fn criteria(c: &mut Check, r: &RawCriteria) -> Criteria {
    let k = |f: &str| format!("criteria.{f}");
    Criteria {
        fs_construction: c.num(&k("fs_construction"), r.fs_construction, Low::Incl(1.0), 3.0),
        fs_service: c.opt(&k("fs_service"), r.fs_service, 1.4, Low::Incl(1.0), 3.0),
        surcharge_removal_degree: r
            .surcharge_removal_degree
            .map(|u| c.num(&k("surcharge_removal_degree"), u, Low::Excl(0.0), 0.99)),
        residual_settlement_limit_m: r
            .residual_settlement_limit_m
            .map(|s| c.num(&k("residual_settlement_limit_m"), s, Low::Excl(0.0), 5.0)),
        residual_settlement_warning_m: c.opt(
            &k("residual_settlement_warning_m"),
            r.residual_settlement_warning_m,
            0.1,
            Low::Excl(0.0),
            5.0,
        ),
    }
}

fn stability(c: &mut Check, r: Option<&RawStability>) -> StabilityOptions {
    let slices = r.and_then(|s| s.slices).unwrap_or(30);
    if !(30..=400).contains(&slices) {
        c.bad("stability.slices", format!("= {slices} is out of range; allowed: 30 ≤ slices ≤ 400"));
    }
    let fill_strength_factor =
        c.opt("stability.fill_strength_factor", r.and_then(|s| s.fill_strength_factor), 1.0, Low::Incl(0.0), 1.0);
    let face_strength = match c.choice(
        "stability.face_strength",
        r.and_then(|s| s.face_strength.as_deref()),
        &[FaceStrength::Own.label(), FaceStrength::Factored.label()],
    ) {
        "factored" => FaceStrength::Factored,
        _ => FaceStrength::Own,
    };
    if face_strength == FaceStrength::Factored && fill_strength_factor == 0.0 {
        // A face of strengthless fill cannot stand: there is no FS to
        // check, and skipping the check would hide a steep face.
        c.bad(
            "stability.face_strength",
            "= \"factored\" with stability.fill_strength_factor = 0 leaves the fill face no strength, so it cannot be checked; allowed: \"own\" (the fill's own strength), or a fill_strength_factor above 0".into(),
        );
    }
    StabilityOptions {
        fill_strength_factor,
        fill_tension_crack: r.and_then(|s| s.fill_tension_crack).unwrap_or(true),
        slices: slices.clamp(30, 400) as usize,
        crack_water_fraction: c.opt(
            "stability.crack_water_fraction",
            r.and_then(|s| s.crack_water_fraction),
            0.0,
            Low::Incl(0.0),
            1.0,
        ),
        fill_ru: c.opt("stability.fill_ru", r.and_then(|s| s.fill_ru), 0.0, Low::Incl(0.0), 0.9),
        face_strength,
    }
}

fn analysis(c: &mut Check, r: Option<&RawAnalysis>) -> AnalysisOptions {
    let mode = match c.choice("analysis.mode", r.and_then(|a| a.mode.as_deref()), &["stress-dependent", "linear"]) {
        "linear" => ConsolidationMode::Linear,
        _ => ConsolidationMode::StressDependent,
    };
    let rule =
        c.choice("analysis.pore_pressure", r.and_then(|a| a.pore_pressure.as_deref()), &["vertical", "skempton"]);
    let pore_pressure = if rule == "skempton" {
        PorePressureRule::Skempton {
            a: c.opt("analysis.skempton_a", r.and_then(|a| a.skempton_a), 0.5, Low::Incl(-0.5), 1.5),
            b: c.opt("analysis.skempton_b", r.and_then(|a| a.skempton_b), 1.0, Low::Excl(0.0), 1.0),
        }
    } else {
        PorePressureRule::Vertical
    };
    AnalysisOptions {
        mode,
        pore_pressure,
        max_node_spacing_m: c.opt(
            "analysis.max_node_spacing_m",
            r.and_then(|a| a.max_node_spacing_m),
            0.25,
            Low::Incl(0.01),
            1.0,
        ),
        placement_step_days: c.opt(
            "analysis.placement_step_days",
            r.and_then(|a| a.placement_step_days),
            1.0,
            Low::Incl(0.01),
            1.0,
        ),
        rest_step_days: c.opt("analysis.rest_step_days", r.and_then(|a| a.rest_step_days), 2.0, Low::Incl(0.01), 10.0),
    }
}

fn instruments(c: &mut Check, raw: &[RawInstrument], info: &ProjectInfo, g: &Ground) -> Vec<Instrument> {
    let depth_limit: f64 =
        g.layers.iter().filter(|l| !matches!(l.kind, LayerKind::StiffBase)).map(|l| l.thickness_m).sum();
    let mut out: Vec<Instrument> = Vec::new();
    for (i, r) in raw.iter().enumerate() {
        let key = |f: &str| format!("instrument[{i}].{f}");
        let id = r.id.trim().to_string();
        let id_ok = !id.is_empty()
            && id.len() <= 24
            && id.chars().all(|ch| ch.is_ascii_alphanumeric() || "-_.".contains(ch))
            && !id.eq_ignore_ascii_case(FILL_ID);
        if !id_ok {
            c.bad(
                &key("id"),
                format!(
                    "= \"{}\" is not allowed; use 1–24 letters, digits, '-', '_' or '.', and not \"{FILL_ID}\" (reserved for the fill record)",
                    r.id
                ),
            );
        } else if out.iter().any(|o| o.id == id) {
            c.bad(&key("id"), format!("= \"{id}\" is used by an earlier instrument; ids must be unique"));
        }
        let kind = match c.choice(&key("kind"), Some(&r.kind), &["piezometer", "settlement-plate", "lateral-marker"]) {
            "settlement-plate" => InstrumentKind::SettlementPlate,
            "lateral-marker" => InstrumentKind::LateralMarker,
            _ => InstrumentKind::Piezometer,
        };
        let units = if kind == InstrumentKind::Piezometer {
            match c.choice(&key("units"), r.units.as_deref(), &["kPa", "m-head"]) {
                "m-head" => ReadingUnit::MHead,
                _ => ReadingUnit::Kpa,
            }
        } else {
            match c.choice(&key("units"), r.units.as_deref(), &["m", "mm"]) {
                "mm" => ReadingUnit::Mm,
                _ => ReadingUnit::M,
            }
        };
        let offset_m = c.num(&key("offset_m"), r.offset_m, Low::Incl(-500.0), 500.0);
        let depth_m = match (kind, r.depth_m) {
            (InstrumentKind::Piezometer, Some(d)) => c.num(&key("depth_m"), d, Low::Excl(0.0), depth_limit),
            (InstrumentKind::Piezometer, None) if r.kind == "piezometer" => {
                c.bad(&key("depth_m"), "is missing; a piezometer needs the depth of its tip below OGL".into());
                0.0
            }
            (_, Some(d)) => {
                c.bad(
                    &key("depth_m"),
                    format!("= {d} is only allowed for piezometers (plates and markers sit on the ground)"),
                );
                0.0
            }
            _ => 0.0,
        };
        let baseline_value = c.num(&key("baseline_value"), r.baseline_value, Low::Incl(-1.0e5), 1.0e5);
        let baseline_date = c.date(&key("baseline_date"), &r.baseline_date);
        if baseline_date > info.start_date {
            c.bad(
                &key("baseline_date"),
                format!(
                    "= {baseline_date} is after project.start_date ({}); take baselines before filling starts",
                    info.start_date
                ),
            );
        }
        out.push(Instrument { id, kind, offset_m, depth_m, baseline_value, baseline_date, units });
    }
    out
}
