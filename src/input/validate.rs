//! Range and cross-field checks that turn a `RawProject` into a `Project`.
//! Every problem is collected (not just the first); each names its key path
//! and line, the value, and what is allowed. Allowed ranges are the physical
//! or practical ranges documented in the project-file reference.

use super::raw::*;
use super::spans::LineMap;
use crate::error::InputIssue;
use crate::model::*;
use chrono::{NaiveDate, Weekday};

mod embankment;
mod monitoring;
mod uncertain;
use embankment::embankment;
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

fn ground(c: &mut Check, r: &RawGround) -> Ground {
    let base_drained =
        c.choice("ground.base_drainage", r.base_drainage.as_deref(), &["drained", "undrained"]) == "drained";
    let before = c.issues.len();
    let gwd = c.num("ground.groundwater_depth_m", r.groundwater_depth_m, Low::Incl(0.0), 50.0);
    if r.layers.is_empty() {
        c.bad("ground.layers", "is empty; give at least one clay layer".into());
    }
    let mut layers = Vec::new();
    let mut top = 0.0;
    for (i, l) in r.layers.iter().enumerate() {
        let layer = layer(c, &format!("ground.layers[{i}]"), l, top, i + 1 == r.layers.len());
        top += layer.thickness_m;
        layers.push(layer);
    }
    if !r.layers.is_empty() && !layers.iter().any(|l| matches!(l.kind, LayerKind::Clay(_))) {
        c.bad("ground.layers", "has no layer of kind = \"clay\"; at least one is needed".into());
    }
    let depth: f64 = layers.iter().filter(|l| !matches!(l.kind, LayerKind::StiffBase)).map(|l| l.thickness_m).sum();
    if depth > 80.0 {
        c.bad("ground.layers", format!("total thickness {depth} m above the base exceeds the supported 80 m"));
    }
    let ground = Ground { groundwater_depth_m: gwd, layers, base_drained };
    if c.issues.len() == before {
        uplift(c, &ground);
    }
    ground
}

/// A piezometric level that lifts the ground (σ'v0 ≤ 0 below the surface)
/// is refused, naming the level that causes it: the point's own layer's,
/// else the nearest below it (artesian pressure acts from below), else the
/// nearest above.
fn uplift(c: &mut Check, g: &Ground) {
    let Some((z, se, sv, u)) = crate::ground::uplift(g) else { return };
    let at = crate::ground::layer_index(g, (z - 1e-6).max(0.0));
    let level = |i: usize| matches!(g.layers[i].pore, PoreWater::Level { .. });
    let i = (at..g.layers.len()).find(|&i| level(i)).or_else(|| (0..at).rev().find(|&i| level(i)));
    let (key, value) = match i.map(|i| (i, g.layers[i].pore)) {
        Some((i, PoreWater::Level { elevation_m })) => {
            (format!("ground.layers[{i}].piezometric_level_m"), format!("= {}", show(elevation_m)))
        }
        _ => ("ground.layers".to_string(), "as given".to_string()),
    };
    c.bad(
        &key,
        format!(
            "{} lifts the ground: at {:.2} m depth (layer \"{}\") the initial pore pressure u0 = {:.1} kPa reaches the total vertical stress σv0 = {:.1} kPa, so σ'v0 = {:.1} kPa; allowed: a level that leaves σ'v0 > 0 at every depth (the ground would heave or boil: uplift)",
            value,
            z,
            g.layers[at].name,
            u,
            sv,
            se
        ),
    );
}

fn layer(c: &mut Check, key: &str, r: &RawLayer, top_m: f64, last: bool) -> Layer {
    let k = |f: &str| format!("{key}.{f}");
    if r.name.trim().is_empty() {
        c.bad(&k("name"), "must not be empty".into());
    }
    let kind_name = c.choice(&k("kind"), Some(r.kind.as_str()), &["clay", "sand", "stiff-base"]);
    let thickness_m = match (r.thickness_m, kind_name) {
        (Some(t), _) => c.num(&k("thickness_m"), t, Low::Excl(0.0), 60.0),
        (None, "stiff-base") => 0.0,
        (None, _) => {
            c.bad(&k("thickness_m"), "is missing; every clay or sand layer needs a thickness".into());
            1.0
        }
    };
    if kind_name == "stiff-base" && !last {
        c.bad(&k("kind"), "= \"stiff-base\" is only allowed for the lowest layer".into());
    }
    let gamma = c.num(&k("unit_weight_kn_m3"), r.unit_weight_kn_m3, Low::Incl(10.0), 25.0);
    let gamma_sat =
        c.opt(&k("saturated_unit_weight_kn_m3"), r.saturated_unit_weight_kn_m3, gamma, Low::Incl(10.0), 25.0);
    if gamma_sat < gamma {
        c.bad(
            &k("saturated_unit_weight_kn_m3"),
            format!("= {gamma_sat} must not be smaller than unit_weight_kn_m3 ({gamma})"),
        );
    }
    let kind = match kind_name {
        "clay" => LayerKind::Clay(clay(c, key, r, top_m, thickness_m)),
        "sand" => LayerKind::Sand {
            friction_deg: c.opt(&k("friction_deg"), r.friction_deg, 32.0, Low::Excl(0.0), 50.0),
            cohesion_kpa: c.opt(&k("cohesion_kpa"), r.cohesion_kpa, 0.0, Low::Incl(0.0), 50.0),
        },
        _ => LayerKind::StiffBase,
    };
    let pore = pore_water(c, key, r, kind_name);
    Layer {
        name: r.name.clone(),
        thickness_m,
        unit_weight_kn_m3: gamma,
        saturated_unit_weight_kn_m3: gamma_sat,
        kind,
        pore,
    }
}

/// Pore pressure of a sand layer: hydrostatic unless a piezometric level
/// (which also sets the clay's initial pore pressure by seepage) or an ru
/// (stability only) is given, not both. Clay is analysed undrained (su
/// from the consolidation model) and its u0 follows from its boundaries,
/// so neither key applies to it.
fn pore_water(c: &mut Check, key: &str, r: &RawLayer, kind: &str) -> PoreWater {
    let k = |f: &str| format!("{key}.{f}");
    if kind != "sand" {
        for (f, v) in [("piezometric_level_m", r.piezometric_level_m), ("ru", r.ru)] {
            if let Some(v) = v {
                c.bad(&k(f), format!("= {v} only applies to sand layers: clay is analysed undrained with su from the consolidation model"));
            }
        }
        return PoreWater::Hydrostatic;
    }
    match (r.piezometric_level_m, r.ru) {
        (None, None) => PoreWater::Hydrostatic,
        (Some(h), None) => {
            PoreWater::Level { elevation_m: c.num(&k("piezometric_level_m"), h, Low::Incl(-80.0), 20.0) }
        }
        (None, Some(ru)) => PoreWater::Ratio { ru: c.num(&k("ru"), ru, Low::Incl(0.0), 0.9) },
        (Some(_), Some(_)) => {
            c.bad(&k("ru"), "give either piezometric_level_m or ru, not both".into());
            PoreWater::Hydrostatic
        }
    }
}

fn clay(c: &mut Check, key: &str, r: &RawLayer, top_m: f64, thickness_m: f64) -> Clay {
    let k = |f: &str| format!("{key}.{f}");
    // A missing key is reported and a harmless stand-in used, so that the
    // remaining checks still run (the result is discarded on any issue).
    let need = |c: &mut Check, f: &str, v: Option<f64>, low: Low, high: f64, stand_in: f64| -> f64 {
        match v {
            Some(x) => c.num(&k(f), x, low, high),
            None => {
                c.bad(&k(f), "is missing; clay layers need it".into());
                stand_in
            }
        }
    };
    let e0 = need(c, "e0", r.e0, Low::Excl(0.1), 10.0, 1.0);
    let cc = need(c, "cc", r.cc, Low::Excl(0.0), 5.0, 1.0);
    let cr = need(c, "cr", r.cr, Low::Excl(0.0), 1.0, 0.1);
    if cr >= cc {
        c.bad(&k("cr"), format!("= {cr} must be smaller than cc ({cc})"));
    }
    let cv = need(c, "cv_m2_per_year", r.cv_m2_per_year, Low::Excl(0.0), 1000.0, 1.0);
    let ch = match (r.ch_m2_per_year, r.ch_over_cv) {
        (Some(_), Some(_)) => {
            c.bad(&k("ch_over_cv"), "give either ch_m2_per_year or ch_over_cv, not both".into());
            cv
        }
        (Some(ch), None) => c.num(&k("ch_m2_per_year"), ch, Low::Excl(0.0), 1000.0),
        (None, ratio) => cv * c.opt(&k("ch_over_cv"), ratio, 1.0, Low::Excl(0.0), 20.0),
    };
    let c_alpha = c.opt(&k("c_alpha"), r.c_alpha, 0.0, Low::Incl(0.0), 0.2);
    Clay {
        e0,
        cc,
        cr,
        c_alpha,
        preconsolidation: preconsolidation(c, key, r),
        cv_m2_per_day: cv / DAYS_PER_YEAR,
        ch_m2_per_day: ch / DAYS_PER_YEAR,
        strength: strength(c, key, r, top_m, thickness_m),
    }
}

fn preconsolidation(c: &mut Check, key: &str, r: &RawLayer) -> Preconsolidation {
    let k = |f: &str| format!("{key}.{f}");
    match (r.ocr, r.pop_kpa, r.sigma_p_kpa) {
        (Some(o), None, None) => Preconsolidation::Ocr(c.num(&k("ocr"), o, Low::Incl(1.0), 50.0)),
        (None, Some(p), None) => Preconsolidation::PopKpa(c.num(&k("pop_kpa"), p, Low::Incl(0.0), 1000.0)),
        (None, None, Some(s)) => Preconsolidation::SigmaPKpa(c.num(&k("sigma_p_kpa"), s, Low::Excl(0.0), 5000.0)),
        (None, None, None) => Preconsolidation::Ocr(1.0),
        _ => {
            c.bad(&k("ocr"), "give only one of ocr, pop_kpa, sigma_p_kpa".into());
            Preconsolidation::Ocr(1.0)
        }
    }
}

fn strength(c: &mut Check, key: &str, r: &RawLayer, top_m: f64, thickness_m: f64) -> Strength {
    let k = |f: &str| format!("{key}.{f}");
    let su0_points = su0_profile(c, key, r, top_m, thickness_m);
    let model = match c.choice(&k("strength"), r.strength.as_deref(), &["shansep", "gain-ratio"]) {
        "shansep" => {
            if r.gain_ratio.is_some() {
                c.bad(&k("gain_ratio"), "only applies with strength = \"gain-ratio\"".into());
            }
            StrengthModel::Shansep {
                s: c.opt(&k("shansep_s"), r.shansep_s, 0.22, Low::Excl(0.05), 0.6),
                m: c.opt(&k("shansep_m"), r.shansep_m, 0.8, Low::Incl(0.5), 1.0),
            }
        }
        _ => {
            if su0_points.is_empty() {
                c.bad(
                    &k("strength"),
                    "= \"gain-ratio\" needs a measured su0 profile (su0_top_kpa/su0_bottom_kpa or su0_points)".into(),
                );
            }
            let ratio = r.gain_ratio.unwrap_or_else(|| {
                c.bad(&k("gain_ratio"), "is missing; strength = \"gain-ratio\" needs it".into());
                0.2
            });
            StrengthModel::GainRatio { ratio: c.num(&k("gain_ratio"), ratio, Low::Incl(0.0), 0.6) }
        }
    };
    Strength { model, su0_points }
}

fn su0_profile(c: &mut Check, key: &str, r: &RawLayer, top_m: f64, thickness_m: f64) -> Vec<(f64, f64)> {
    let k = |f: &str| format!("{key}.{f}");
    match (&r.su0_points, r.su0_top_kpa, r.su0_bottom_kpa) {
        (None, None, None) => Vec::new(),
        (None, Some(t), b) => {
            let t = c.num(&k("su0_top_kpa"), t, Low::Excl(0.0), 500.0);
            let b = c.opt(&k("su0_bottom_kpa"), b, t, Low::Excl(0.0), 500.0);
            vec![(top_m, t), (top_m + thickness_m, b)]
        }
        (None, None, Some(_)) => {
            c.bad(&k("su0_top_kpa"), "is missing; su0_bottom_kpa needs su0_top_kpa".into());
            Vec::new()
        }
        (Some(points), None, None) => su0_points(c, &k("su0_points"), points, top_m, thickness_m),
        (Some(_), _, _) => {
            c.bad(&k("su0_points"), "give either su0_points or su0_top_kpa/su0_bottom_kpa, not both".into());
            Vec::new()
        }
    }
}

fn su0_points(c: &mut Check, key: &str, points: &[Vec<f64>], top_m: f64, thickness_m: f64) -> Vec<(f64, f64)> {
    if points.is_empty() {
        c.bad(key, "is empty; give [[depth_m, su_kpa], ...]".into());
    }
    let mut out: Vec<(f64, f64)> = Vec::new();
    for (i, p) in points.iter().enumerate() {
        let pk = format!("{key}[{i}]");
        if p.len() != 2 {
            c.bad(&pk, format!("has {} numbers; each point is [depth below ground m, su kPa]", p.len()));
            continue;
        }
        let z = c.num(&pk, p[0], Low::Incl(top_m), top_m + thickness_m);
        let su = c.num(&pk, p[1], Low::Excl(0.0), 500.0);
        if let Some(last) = out.last()
            && z <= last.0
        {
            c.bad(&pk, format!("depth {z} m must be deeper than the previous point ({} m)", last.0));
        }
        out.push((z, su));
    }
    out
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

fn construction(c: &mut Check, r: &RawConstruction) -> Construction {
    let k = |f: &str| format!("construction.{f}");
    let lift_min_m = c.num(&k("lift_min_m"), r.lift_min_m, Low::Excl(0.0), 5.0);
    let lift_max_m = c.num(&k("lift_max_m"), r.lift_max_m, Low::Excl(0.0), 10.0);
    if lift_min_m > lift_max_m {
        c.bad(&k("lift_min_m"), format!("= {lift_min_m} must not exceed lift_max_m ({lift_max_m})"));
    }
    let inc = c.opt(&k("lift_increment_m"), r.lift_increment_m, 0.25, Low::Incl(0.05), 5.0);
    let rest = r.min_rest_days.unwrap_or(0);
    if !(0..=365).contains(&rest) {
        c.bad(&k("min_rest_days"), format!("= {rest} is out of range; allowed: 0 ≤ min_rest_days ≤ 365"));
    }
    let working_days = working_days(c, r.working_days.as_deref());
    Construction {
        placement_rate_m_per_day: c.num(
            &k("placement_rate_m_per_day"),
            r.placement_rate_m_per_day,
            Low::Excl(0.0),
            5.0,
        ),
        lift_min_m,
        lift_max_m,
        lift_increment_m: inc,
        min_rest_days: rest.clamp(0, 365) as u32,
        working_days,
        holidays: holidays(c, r.holidays.as_deref().unwrap_or(&[])),
        weather_downtime_fraction: c.opt(
            &k("weather_downtime_fraction"),
            r.weather_downtime_fraction,
            0.0,
            Low::Incl(0.0),
            0.8,
        ),
    }
}

fn working_days(c: &mut Check, days: Option<&[String]>) -> Vec<Weekday> {
    let Some(days) = days else {
        return vec![Weekday::Mon, Weekday::Tue, Weekday::Wed, Weekday::Thu, Weekday::Fri];
    };
    let mut out = Vec::new();
    for (i, d) in days.iter().enumerate() {
        match d.parse::<Weekday>() {
            Ok(w) if !out.contains(&w) => out.push(w),
            Ok(_) => c.bad(&format!("construction.working_days[{i}]"), format!("= \"{d}\" is listed twice")),
            Err(_) => c.bad(
                &format!("construction.working_days[{i}]"),
                format!("= \"{d}\" is not a weekday; use mon, tue, wed, thu, fri, sat, sun"),
            ),
        }
    }
    if out.is_empty() {
        c.bad("construction.working_days", "is empty; at least one working day is needed".into());
    }
    out
}

fn holidays(c: &mut Check, items: &[String]) -> Vec<NaiveDate> {
    let mut ranges: Vec<(NaiveDate, NaiveDate, usize)> = Vec::new();
    for (i, h) in items.iter().enumerate() {
        let key = format!("construction.holidays[{i}]");
        let (a, b) = match h.split_once("..") {
            Some((a, b)) => (c.parse_date(&key, a), c.parse_date(&key, b)),
            None => {
                let d = c.parse_date(&key, h);
                (d, d)
            }
        };
        if b < a {
            c.bad(&key, format!("= \"{h}\": the range ends before it starts"));
            continue;
        }
        if (b - a).num_days() > 366 {
            c.bad(&key, format!("= \"{h}\": a holiday range may span at most one year"));
            continue;
        }
        if let Some((_, _, j)) = ranges.iter().find(|(x, y, _)| a <= *y && *x <= b) {
            c.bad(&key, format!("= \"{h}\" overlaps construction.holidays[{j}]"));
        }
        ranges.push((a, b, i));
    }
    let mut out: Vec<NaiveDate> =
        ranges.iter().flat_map(|(a, b, _)| a.iter_days().take_while(move |d| d <= b)).collect();
    out.sort();
    out.dedup();
    out
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
    StabilityOptions {
        fill_strength_factor: c.opt(
            "stability.fill_strength_factor",
            r.and_then(|s| s.fill_strength_factor),
            1.0,
            Low::Incl(0.0),
            1.0,
        ),
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
        face_strength: match c.choice(
            "stability.face_strength",
            r.and_then(|s| s.face_strength.as_deref()),
            &[FaceStrength::Own.label(), FaceStrength::Factored.label()],
        ) {
            "factored" => FaceStrength::Factored,
            _ => FaceStrength::Own,
        },
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

fn sequence(
    c: &mut Check,
    lifts: &[RawLift],
    info: &ProjectInfo,
    k: &Construction,
    e: &Embankment,
) -> Vec<ProposedLift> {
    let mut out: Vec<ProposedLift> = Vec::new();
    let mut total = 0.0;
    for (i, l) in lifts.iter().enumerate() {
        let key = format!("sequence[{i}]");
        let t = c.num(&format!("{key}.thickness_m"), l.thickness_m, Low::Excl(0.0), k.lift_max_m);
        let start = c.date(&format!("{key}.start_date"), &l.start_date);
        if start < info.start_date {
            c.bad(
                &format!("{key}.start_date"),
                format!("= {start} is before project.start_date ({})", info.start_date),
            );
        }
        // The overlap check needs a valid rate and thickness (bad values are
        // reported above and would give a meaningless day count).
        let rate_ok = (0.0..=5.0).contains(&k.placement_rate_m_per_day) && k.placement_rate_m_per_day > 0.0;
        if let Some(prev) = out.last().filter(|p| rate_ok && p.thickness_m > 0.0 && p.thickness_m <= k.lift_max_m) {
            let days = (prev.thickness_m / k.placement_rate_m_per_day).ceil() as i64;
            let last_day = crate::schedule::calendar::shift(prev.start, days.max(1) - 1, "the end of a lift");
            if last_day.is_ok_and(|end| start <= end) {
                c.bad(
                    &format!("{key}.start_date"),
                    format!(
                        "= {start} overlaps the previous lift, which needs at least {days} day(s) of placement from {}",
                        prev.start
                    ),
                );
            }
        }
        total += t;
        out.push(ProposedLift { thickness_m: t, start });
    }
    let limit = e.design_height_m + e.surcharge_height_m;
    if total > limit + 1e-9 {
        c.bad(
            "sequence",
            format!(
                "lifts add up to {} m, above embankment.design_height_m + embankment.surcharge_height_m ({limit:.2} m)",
                show((total * 100.0).round() / 100.0)
            ),
        );
    }
    out
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
