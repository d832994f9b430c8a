//! The readings file, read with the `csv` crate (quoted fields as a logger
//! exports them are accepted): one row per reading (`instrument,time,value`),
//! comment lines starting with `#`, and rows for the reserved id `fill`
//! giving the as-built crest height above OGL (m), which replaces the
//! planned sequence up to the last reading. Hard errors (unknown
//! instrument, unreadable time or number, rows out of order, duplicate
//! times, readings before the baseline) are all reported with their line and
//! stop the run; suspect values are kept, flagged with their line and left
//! out of the interpretation, never dropped silently. A time beyond the
//! horizon or far after every earlier row, and a value no instrument could
//! read (beyond the fill's weight or the ground's thickness), are errors.

use crate::error::{Error, InputIssue, Result};
use crate::ground;
use crate::model::{FILL_ID, InstrumentKind, Project};
use chrono::{NaiveDate, NaiveDateTime, NaiveTime};
use serde::Serialize;

/// The header every readings file starts with (after comments).
pub const HEADER: &str = "instrument,time,value";

/// Most hard errors listed before giving up on a file.
const MAX_ISSUES: usize = 40;

/// One instrument reading.
#[derive(Debug, Clone, Serialize)]
pub struct Reading {
    /// Index into `Project::instruments`.
    #[serde(skip)]
    pub instrument: usize,
    pub id: String,
    pub time: NaiveDateTime,
    /// Days since the project start date (00:00), may be negative for
    /// readings before filling.
    pub day: f64,
    /// The value as written, in the instrument's units.
    pub raw: f64,
    /// The measured quantity in SI: pore pressure u kPa (piezometer),
    /// settlement m (plate, downwards positive), outward movement m (marker).
    pub value: f64,
    /// 1-based line in the file.
    pub line: usize,
    /// Why the value is suspect (then it is not used).
    pub suspect: Option<String>,
}

/// One point of the as-built fill record.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct FillPoint {
    pub time: NaiveDateTime,
    pub day: f64,
    /// Crest height above OGL reached at `time`, m.
    pub height_m: f64,
    pub line: usize,
}

/// A warning about the readings that does not stop the check.
#[derive(Debug, Clone, Serialize)]
pub struct Warning {
    pub line: Option<usize>,
    pub instrument: String,
    pub message: String,
}

/// A validated readings file.
#[derive(Debug, Clone, Serialize)]
pub struct Readings {
    pub file: String,
    pub sha256: String,
    pub readings: Vec<Reading>,
    pub fill: Vec<FillPoint>,
    pub warnings: Vec<Warning>,
    /// Time of the latest row in the file: the hold point being checked.
    pub today: NaiveDateTime,
    /// `today` in days since the project start.
    pub today_day: f64,
}

impl Readings {
    /// Usable (not suspect) readings of instrument `k`, in time order.
    pub fn of(&self, k: usize) -> impl Iterator<Item = &Reading> {
        self.readings.iter().filter(move |r| r.instrument == k && r.suspect.is_none())
    }

    /// Crest height at day `t` from the fill record: linear between points,
    /// constant after the last one.
    pub fn height_at(&self, t: f64) -> f64 {
        height_at(&self.fill, t)
    }

    /// Start and end day of the last change of fill height (the last lift
    /// or removal, however many record points it spans), if any.
    pub fn last_change(&self) -> Option<(f64, f64)> {
        let changing = |i: usize| (self.fill[i + 1].height_m - self.fill[i].height_m).abs() > 1e-9;
        let last = (0..self.fill.len().saturating_sub(1)).rev().find(|i| changing(*i))?;
        let mut first = last;
        while first > 0 && changing(first - 1) {
            first -= 1;
        }
        Some((self.fill[first].day, self.fill[last + 1].day))
    }

    /// Day on which the last change of fill height ended (0 when never).
    pub fn last_change_end(&self) -> f64 {
        self.last_change().map_or(0.0, |c| c.1)
    }
}

/// Crest height at day `t` from a fill record (0 before the first point).
pub fn height_at(fill: &[FillPoint], t: f64) -> f64 {
    match fill.iter().position(|p| p.day > t) {
        None => fill.last().map_or(0.0, |p| p.height_m),
        Some(0) => 0.0,
        Some(i) => {
            let (a, b) = (&fill[i - 1], &fill[i]);
            a.height_m + (b.height_m - a.height_m) * (t - a.day) / (b.day - a.day)
        }
    }
}

/// Days from the project start (00:00) to `t`.
pub fn day_of(p: &Project, t: NaiveDateTime) -> f64 {
    (t - p.info.start_date.and_time(NaiveTime::MIN)).num_seconds() as f64 / 86_400.0
}

/// Parse a time written `YYYY-MM-DD`, `YYYY-MM-DDTHH:MM[:SS]` or with a
/// space instead of the `T`.
pub fn parse_time(text: &str) -> Option<NaiveDateTime> {
    let t = text.trim();
    for f in ["%Y-%m-%dT%H:%M", "%Y-%m-%d %H:%M", "%Y-%m-%dT%H:%M:%S", "%Y-%m-%d %H:%M:%S"] {
        if let Ok(v) = NaiveDateTime::parse_from_str(t, f) {
            return Some(v);
        }
    }
    NaiveDate::parse_from_str(t, "%Y-%m-%d").ok().map(|d| d.and_time(NaiveTime::MIN))
}

/// Read and validate a readings file against the project's instruments.
pub fn load(path: &std::path::Path, p: &Project) -> Result<Readings> {
    let bytes = std::fs::read(path).map_err(|source| Error::Read { path: path.to_path_buf(), source })?;
    let file = path.display().to_string();
    let text = String::from_utf8(bytes.clone())
        .map_err(|_| Error::input(&file, None, "", "is not UTF-8 text; save the readings as UTF-8 CSV".into()))?;
    let mut r = parse(&text, &file, p)?;
    r.sha256 = crate::hash::sha256_hex(&bytes);
    Ok(r)
}

/// Validate readings text; `file` is the name used in messages.
pub fn parse(text: &str, file: &str, p: &Project) -> Result<Readings> {
    let mut issues: Vec<InputIssue> = Vec::new();
    let mut readings: Vec<Reading> = Vec::new();
    let mut fill: Vec<FillPoint> = Vec::new();
    let mut warnings = Vec::new();
    // Last time and its line per instrument (index p.instruments.len() = fill).
    let mut last: Vec<Option<(NaiveDateTime, usize)>> = vec![None; p.instruments.len() + 1];
    let mut header_seen = false;
    let top = p.max_height_m();
    let body = text.trim_start_matches('\u{feff}');
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .comment(Some(b'#'))
        .trim(csv::Trim::All)
        .from_reader(body.as_bytes());
    let lines = LineOf::new(body);
    let mut latest: Option<(NaiveDateTime, usize)> = None;
    for rec in rdr.records() {
        let rec = match rec {
            Ok(r) => r,
            Err(e) => {
                let line = e.position().map_or(0, |p| lines.at(p.byte()));
                bad(&mut issues, line, "", format!("is not a readable CSV row: {e}"));
                break;
            }
        };
        let line = rec.position().map_or(0, |p| lines.at(p.byte()));
        let fields: Vec<&str> = rec.iter().collect();
        if fields.iter().all(|f| f.is_empty()) {
            continue;
        }
        if !header_seen {
            let norm: String = fields.iter().map(|f| f.to_ascii_lowercase()).collect::<Vec<_>>().join(",");
            if norm != HEADER {
                bad(
                    &mut issues,
                    line,
                    "",
                    format!("the first row must be the header `{HEADER}`, found `{}`", fields.join(",")),
                );
                break;
            }
            header_seen = true;
            continue;
        }
        if issues.len() >= MAX_ISSUES {
            break;
        }
        if fields.len() != 3 {
            bad(&mut issues, line, "", format!("has {} fields; each row is `{HEADER}` (3 fields)", fields.len()));
            continue;
        }
        let (id, time_text, value_text) = (fields[0], fields[1], fields[2]);
        let slot =
            if id == FILL_ID { Some(p.instruments.len()) } else { p.instruments.iter().position(|i| i.id == id) };
        let Some(slot) = slot else {
            let best = p
                .instruments
                .iter()
                .map(|i| (strsim::jaro_winkler(id, &i.id), i.id.as_str()))
                .filter(|(s, _)| *s > 0.8)
                .max_by(|a, b| a.0.total_cmp(&b.0));
            let known: Vec<&str> = p.instruments.iter().map(|i| i.id.as_str()).chain([FILL_ID]).collect();
            let hint = match best {
                Some((_, b)) => format!("did you mean `{b}`?"),
                None => format!("known: {}", known.join(", ")),
            };
            bad(&mut issues, line, "instrument", format!("= \"{id}\" is not an instrument of the project; {hint}"));
            continue;
        };
        let Some(time) = parse_time(time_text) else {
            bad(&mut issues, line, "time", format!("= \"{time_text}\" is not a time YYYY-MM-DD or YYYY-MM-DDTHH:MM"));
            continue;
        };
        if let Some(why) = implausible_time(p, time, latest) {
            bad(&mut issues, line, "time", format!("= {time} {why}; check the date (the year in particular)"));
            continue;
        }
        if latest.is_none_or(|(t, _)| time > t) {
            latest = Some((time, line));
        }
        let value = match value_text.parse::<f64>() {
            Ok(v) if v.is_finite() => v,
            _ => {
                bad(&mut issues, line, "value", format!("= \"{value_text}\" is not a finite number"));
                continue;
            }
        };
        if let Some((prev, prev_line)) = last[slot] {
            if time == prev {
                bad(
                    &mut issues,
                    line,
                    "time",
                    format!("= {time} repeats the time of {id} at line {prev_line} (duplicate reading)"),
                );
                continue;
            }
            if time < prev {
                bad(
                    &mut issues,
                    line,
                    "time",
                    format!(
                        "= {time} is earlier than the previous row of {id} (line {prev_line}, {prev}); rows of each instrument must be in time order"
                    ),
                );
                continue;
            }
        }
        last[slot] = Some((time, line));
        let day = day_of(p, time);
        if slot == p.instruments.len() {
            if time.date() < p.info.start_date {
                bad(
                    &mut issues,
                    line,
                    "time",
                    format!(
                        "= {time} is before project.start_date ({}); fill rows start with the works",
                        p.info.start_date
                    ),
                );
                continue;
            }
            if !(0.0..=top + 1e-9).contains(&value) {
                bad(
                    &mut issues,
                    line,
                    "value",
                    format!(
                        "= {value} m: the crest height must be between 0 and design height plus surcharge ({top:.2} m)"
                    ),
                );
                continue;
            }
            if fill.is_empty() && value != 0.0 {
                bad(
                    &mut issues,
                    line,
                    "value",
                    format!(
                        "= {value} m: the fill record must begin with a row of height 0 (the ground before filling)"
                    ),
                );
                continue;
            }
            fill.push(FillPoint { time, day, height_m: value, line });
            continue;
        }
        let inst = &p.instruments[slot];
        if time.date() < inst.baseline_date {
            bad(
                &mut issues,
                line,
                "time",
                format!("= {time} is before the baseline date of {id} ({})", inst.baseline_date),
            );
            continue;
        }
        let (si, suspect) = match inst.kind {
            InstrumentKind::Piezometer => {
                let u = inst.units.to_si(value);
                let u0 = ground::u0(&p.ground, inst.depth_m);
                let low = u0 - p.monitoring.piezometer_tolerance_kpa;
                let why = (u < low).then(|| {
                    format!(
                        "{u:.1} kPa is below the initial pore pressure u0 ({u0:.1} kPa) by more than the tolerance ({:.1} kPa)",
                        p.monitoring.piezometer_tolerance_kpa
                    )
                });
                (u, why)
            }
            InstrumentKind::SettlementPlate => {
                let s = inst.units.to_si(inst.baseline_value - value);
                let why = (s < -p.monitoring.settlement_noise_m).then(|| {
                    format!(
                        "shows {:.0} mm of heave, more than the noise allowance ({:.0} mm)",
                        -1000.0 * s,
                        1000.0 * p.monitoring.settlement_noise_m
                    )
                });
                (s, why)
            }
            InstrumentKind::LateralMarker => (inst.units.to_si(value - inst.baseline_value), None),
        };
        if let Some(why) = implausible_value(p, inst, si) {
            bad(&mut issues, line, "value", format!("= {value} {why}"));
            continue;
        }
        if let Some(why) = &suspect {
            warnings.push(Warning {
                line: Some(line),
                instrument: id.to_string(),
                message: format!("suspect reading, not used: {why}"),
            });
        }
        readings.push(Reading {
            instrument: slot,
            id: id.to_string(),
            time,
            day,
            raw: value,
            value: si,
            line,
            suspect,
        });
    }
    if !header_seen && issues.is_empty() {
        issues.push(InputIssue {
            line: None,
            key: String::new(),
            message: format!("has no header row `{HEADER}` and no readings"),
        });
    }
    if issues.is_empty() && fill.is_empty() {
        issues.push(InputIssue {
            line: None,
            key: String::new(),
            message: format!("has no `{FILL_ID}` rows; record the as-built crest height (m above OGL) with rows such as `{FILL_ID},2027-04-05T07:00,0.0`"),
        });
    }
    if !issues.is_empty() {
        return Err(Error::Input { file: file.to_string(), issues });
    }
    for (k, inst) in p.instruments.iter().enumerate() {
        if !readings.iter().any(|r| r.instrument == k) {
            warnings.push(Warning {
                line: None,
                instrument: inst.id.clone(),
                message: "has no readings in this file".into(),
            });
        }
        if inst.kind == InstrumentKind::Piezometer {
            let (b, u0) = (inst.units.to_si(inst.baseline_value), ground::u0(&p.ground, inst.depth_m));
            if (b - u0).abs() > p.monitoring.piezometer_tolerance_kpa {
                warnings.push(Warning {
                    line: None,
                    instrument: inst.id.clone(),
                    message: format!("baseline {b:.1} kPa differs from the initial pore pressure u0 = {u0:.1} kPa by more than the tolerance; check the groundwater level or the instrument"),
                });
            }
        }
    }
    let today = readings.iter().map(|r| r.time).chain(fill.iter().map(|f| f.time)).max().unwrap_or_default();
    Ok(Readings {
        file: file.to_string(),
        sha256: crate::hash::sha256_hex(text.as_bytes()),
        readings,
        fill,
        warnings,
        today,
        today_day: day_of(p, today),
    })
}

/// 1-based line numbers of a text's rows. The csv reader's position of a
/// row that follows comment lines is where the comments begin, so the
/// line is the first one at or after that byte that is neither blank nor a
/// comment.
struct LineOf<'a> {
    text: &'a str,
    starts: Vec<usize>,
}

impl<'a> LineOf<'a> {
    fn new(text: &'a str) -> Self {
        let starts = std::iter::once(0).chain(text.match_indices('\n').map(|(i, _)| i + 1)).collect();
        LineOf { text, starts }
    }

    fn at(&self, byte: u64) -> usize {
        let mut k = self.starts.partition_point(|s| *s as u64 <= byte).max(1) - 1;
        while k + 1 < self.starts.len() {
            let row = self.text[self.starts[k]..self.starts[k + 1]].trim();
            if !(row.is_empty() || row.starts_with('#')) {
                break;
            }
            k += 1;
        }
        k + 1
    }
}

/// Longest gap between a row and the latest earlier row that is still
/// plausible, days (common practice reads at least monthly during works).
const MAX_GAP_DAYS: i64 = 366;

/// Why a row's time cannot be right: beyond the planning horizon, or
/// far after every earlier row.
fn implausible_time(p: &Project, time: NaiveDateTime, latest: Option<(NaiveDateTime, usize)>) -> Option<String> {
    let horizon = p.info.start_date + chrono::Duration::days((40.0 * crate::model::DAYS_PER_YEAR) as i64);
    if time.date() > horizon {
        return Some(format!("is beyond the 40-year horizon of the project ({horizon})"));
    }
    let (t, l) = latest?;
    let gap = (time - t).num_days();
    (gap > MAX_GAP_DAYS)
        .then(|| format!("is {gap} days after the latest earlier row (line {l}, {t}): more than {MAX_GAP_DAYS} days"))
}

/// Why a reading (in SI) is physically impossible for its instrument: a
/// piezometer excess above the whole fill's weight, a settlement or lateral
/// movement larger than the compressible ground's thickness.
fn implausible_value(p: &Project, inst: &crate::model::Instrument, si: f64) -> Option<String> {
    let depth: f64 = p
        .ground
        .layers
        .iter()
        .filter(|l| !matches!(l.kind, crate::model::LayerKind::StiffBase))
        .map(|l| l.thickness_m)
        .sum();
    match inst.kind {
        InstrumentKind::Piezometer => {
            let most = p.embankment.fill_unit_weight_kn_m3 * p.max_height_m() + p.monitoring.piezometer_tolerance_kpa;
            let excess = si - ground::u0(&p.ground, inst.depth_m);
            (excess > most).then(|| {
                format!("gives {excess:.0} kPa of excess pore pressure, more than the whole fill can cause ({most:.0} kPa): implausibly far from the baseline")
            })
        }
        _ => (si.abs() > depth).then(|| {
            format!("gives {:.2} m of movement from the baseline, more than the compressible ground is thick ({depth:.1} m): implausibly far from the baseline", si.abs())
        }),
    }
}

fn bad(issues: &mut Vec<InputIssue>, line: usize, key: &str, message: String) {
    issues.push(InputIssue { line: Some(line), key: key.to_string(), message });
}
