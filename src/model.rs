//! The validated project: plain data in SI units (m, kN, kPa, days) that every
//! engine takes. Nothing here is optional that validation should have settled;
//! values arrive here only through `input::load`, which checks ranges and
//! cross-field rules. Field units are in the names or the doc comments.

use chrono::{NaiveDate, Weekday};
use serde::Serialize;

/// Unit weight of water, kN/m³ (common practice value).
pub const GAMMA_W: f64 = 9.81;

/// Seconds-free time: days per year used to convert cv given in m²/year.
pub const DAYS_PER_YEAR: f64 = 365.25;

/// A whole validated project.
#[derive(Debug, Clone, Serialize)]
pub struct Project {
    pub info: ProjectInfo,
    pub ground: Ground,
    pub embankment: Embankment,
    pub drains: Option<Drains>,
    pub construction: Construction,
    pub criteria: Criteria,
    pub stability: StabilityOptions,
    pub analysis: AnalysisOptions,
    /// A proposed lift sequence (may be empty).
    pub sequence: Vec<ProposedLift>,
    /// Field instruments (may be empty).
    pub instruments: Vec<Instrument>,
    /// Tolerances and alarm limits of the release check.
    pub monitoring: MonitoringRules,
    /// Uncertain parameters for Monte Carlo (may be empty).
    pub uncertainty: Uncertainty,
}

/// Declared uncertainty: factors with their distributions, and correlations
/// between them.
#[derive(Debug, Clone, Default, Serialize)]
pub struct Uncertainty {
    pub params: Vec<Uncertain>,
    pub correlations: Vec<Correlation>,
}

/// One uncertain quantity: a factor that multiplies the file's values at
/// each of its keys (so several keys move together, e.g. su0 at the top and
/// bottom of a layer).
#[derive(Debug, Clone, Serialize)]
pub struct Uncertain {
    pub name: String,
    /// Key paths in the project file.
    pub keys: Vec<String>,
    pub distribution: Distribution,
}

/// Distribution of a factor. Lognormal and normal have mean 1 and the
/// stated coefficient of variation; the normal is truncated below at
/// `NORMAL_FLOOR` (a factor must stay positive); uniform runs low–high.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "distribution", rename_all = "kebab-case")]
pub enum Distribution {
    Lognormal { cov: f64 },
    Normal { cov: f64 },
    Uniform { low: f64, high: f64 },
}

/// Lowest factor a truncated normal can take.
pub const NORMAL_FLOOR: f64 = 0.05;

/// Correlation coefficient between the underlying standard normals of two
/// factors (a Gaussian copula; for two lognormals, the correlation of their
/// logarithms).
#[derive(Debug, Clone, Serialize)]
pub struct Correlation {
    /// Indices into `Uncertainty::params`.
    pub a: usize,
    pub b: usize,
    pub coefficient: f64,
}

/// Title-block information.
#[derive(Debug, Clone, Serialize)]
pub struct ProjectInfo {
    pub title: String,
    pub reference: String,
    pub location: String,
    pub revision: String,
    /// First possible day of earthworks.
    pub start_date: NaiveDate,
    /// Period over which residual settlement is judged, years.
    pub design_life_years: f64,
}

/// Layered ground below the original ground level (OGL), top-down.
#[derive(Debug, Clone, Serialize)]
pub struct Ground {
    /// Depth of the groundwater table below OGL, m (≥ 0).
    pub groundwater_depth_m: f64,
    /// Layers from the surface down.
    pub layers: Vec<Layer>,
    /// Whether the bottom of the lowest compressible layer drains when it rests
    /// on a stiff base (sand layers always drain).
    pub base_drained: bool,
}

/// One soil layer.
#[derive(Debug, Clone, Serialize)]
pub struct Layer {
    pub name: String,
    /// Thickness, m.
    pub thickness_m: f64,
    /// Bulk unit weight above the water table, kN/m³.
    pub unit_weight_kn_m3: f64,
    /// Saturated unit weight below the water table, kN/m³.
    pub saturated_unit_weight_kn_m3: f64,
    pub kind: LayerKind,
    /// Pore water of a drained (sand) layer: its level also sets the
    /// initial pore pressure of the clay next to it (`ground::head_m`); clay
    /// is analysed undrained and always `Hydrostatic` here.
    pub pore: PoreWater,
}

/// How the pore pressure in a drained layer (or the fill) is described:
/// a level is the initial head (`ground::head_m`); an ru is for stability
/// only. Excess pore pressure from loading is that of the
/// consolidation model (none in free-draining sand).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "by", rename_all = "kebab-case")]
pub enum PoreWater {
    /// u = γw × depth below the groundwater table.
    Hydrostatic,
    /// u = γw × height of a piezometric level above the point; the level is
    /// an elevation above OGL, m (positive above ground: artesian).
    Level { elevation_m: f64 },
    /// u = ru × total vertical stress at the point (Bishop & Morgenstern
    /// 1960's pore-pressure ratio).
    Ratio { ru: f64 },
}

/// What a layer is, with the properties that kind needs.
#[derive(Debug, Clone, Serialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum LayerKind {
    /// Compressible, low-permeability clay (undrained in stability).
    Clay(Clay),
    /// Free-draining sand or gravel (drained in stability, u = 0 boundary).
    Sand {
        /// Effective friction angle, degrees.
        friction_deg: f64,
        /// Effective cohesion, kPa.
        cohesion_kpa: f64,
    },
    /// Stiff base: incompressible, no slip surface passes through it.
    StiffBase,
}

/// Clay compressibility, flow and strength.
#[derive(Debug, Clone, Serialize)]
pub struct Clay {
    pub e0: f64,
    pub cc: f64,
    pub cr: f64,
    /// Secondary compression index (per log cycle of time), 0 when not given.
    pub c_alpha: f64,
    pub preconsolidation: Preconsolidation,
    /// Vertical coefficient of consolidation, m²/day.
    pub cv_m2_per_day: f64,
    /// Horizontal coefficient of consolidation, m²/day.
    pub ch_m2_per_day: f64,
    pub strength: Strength,
}

/// How σ'p is described for a clay layer.
#[derive(Debug, Clone, Copy, Serialize)]
#[serde(tag = "by", content = "value", rename_all = "kebab-case")]
pub enum Preconsolidation {
    /// σ'p = OCR · σ'v0.
    Ocr(f64),
    /// σ'p = σ'v0 + POP, kPa.
    PopKpa(f64),
    /// σ'p given directly, kPa (constant over the layer).
    SigmaPKpa(f64),
}

/// Undrained strength description for a clay layer.
#[derive(Debug, Clone, Serialize)]
pub struct Strength {
    pub model: StrengthModel,
    /// Measured in-situ profile su0(z): (depth below OGL m, su kPa), sorted by
    /// depth; empty when not measured. su never falls below it.
    pub su0_points: Vec<(f64, f64)>,
}

/// How strength evolves with effective stress.
#[derive(Debug, Clone, Copy, Serialize)]
#[serde(tag = "model", rename_all = "kebab-case")]
pub enum StrengthModel {
    /// su = S σ'v (σ'p/σ'v)^m (Ladd & Foott 1974; Ladd 1991).
    Shansep { s: f64, m: f64 },
    /// su = su0 + ratio · Δσ'v (Δσ'v above the initial σ'v0, only when loaded
    /// beyond the largest previous stress).
    GainRatio { ratio: f64 },
}

/// Embankment cross-section (symmetric trapezoid).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Embankment {
    /// Final design height of the crest above OGL, m.
    pub design_height_m: f64,
    /// Full crest width, m.
    pub crest_width_m: f64,
    /// Side slope, horizontal per vertical.
    pub side_slope_h_per_v: f64,
    /// Fill bulk unit weight, kN/m³.
    pub fill_unit_weight_kn_m3: f64,
    /// Fill effective cohesion, kPa.
    pub fill_cohesion_kpa: f64,
    /// Fill effective friction angle, degrees.
    pub fill_friction_deg: f64,
    /// Temporary surcharge above design height, m (0 = none).
    pub surcharge_height_m: f64,
    /// Stability berms on both sides, inner first.
    pub berms: Vec<Berm>,
    /// Basal geosynthetic design tensile force, kN/m (0 = none).
    pub reinforcement_kn_per_m: f64,
    /// How the intermediate stages are shaped.
    pub stage_shape: StageShape,
}

/// Shape of the fill at intermediate stages (`embankment.stage_shape`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum StageShape {
    /// Each lift is a horizontal layer over the footprint of the final
    /// design section: the toe stays at the final toe and the crest is
    /// wider than the design crest below design height; above it (make-up,
    /// surcharge) the side slopes carry on upwards. The default: how fill
    /// is normally placed on site.
    FullFootprint,
    /// The design crest width at every height, the side slopes (and the
    /// toe) moving outwards as the fill rises.
    ConstantCrest,
}

impl StageShape {
    /// Name as written in the project file.
    pub fn label(self) -> &'static str {
        match self {
            StageShape::FullFootprint => "full-footprint",
            StageShape::ConstantCrest => "constant-crest",
        }
    }

    /// One sentence for reports.
    pub fn describe(self) -> &'static str {
        match self {
            StageShape::FullFootprint => {
                "full-footprint: each lift a horizontal layer over the final footprint (toe at the final toe, crest wider than the design crest until design height)"
            }
            StageShape::ConstantCrest => {
                "constant-crest: the design crest width at every stage, the toe moving outwards as the fill rises"
            }
        }
    }
}

/// A stability berm: a flat platform at `height_m` above OGL extending
/// `width_m` beyond where the main slope meets that height.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Berm {
    pub width_m: f64,
    pub height_m: f64,
    /// Crest height above OGL from which the berm is raised with the fill,
    /// m (0 = with the first lifts): at crest height h the berm stands
    /// min(h − this, height_m) high, so it is complete at this + height_m.
    pub placed_from_height_m: f64,
}

/// Drain installation pattern.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum DrainPattern {
    Triangular,
    Square,
}

/// Prefabricated vertical drains.
#[derive(Debug, Clone, Serialize)]
pub struct Drains {
    pub pattern: DrainPattern,
    /// Centre-to-centre spacing, m.
    pub spacing_m: f64,
    /// Equivalent drain diameter dw, m ((a+b)/2 for a band drain).
    pub diameter_m: f64,
    /// Penetration below OGL, m.
    pub depth_m: f64,
    /// Smear-zone diameter over drain diameter, ds/dw (1 = no smear).
    pub smear_ratio: f64,
    /// Undisturbed over smeared horizontal permeability, kh/ks.
    pub kh_over_ks: f64,
    /// Discharge capacity qw, m³/day; None = infinite (no well resistance).
    pub discharge_m3_per_day: Option<f64>,
}

/// Construction practice and calendar.
#[derive(Debug, Clone, Serialize)]
pub struct Construction {
    /// Rate of placing fill on a working day, m/day.
    pub placement_rate_m_per_day: f64,
    pub lift_min_m: f64,
    pub lift_max_m: f64,
    pub lift_increment_m: f64,
    pub min_rest_days: u32,
    /// Working days of the week.
    #[serde(serialize_with = "ser_weekdays")]
    pub working_days: Vec<Weekday>,
    /// Non-working dates (ranges expanded, sorted, unique).
    pub holidays: Vec<NaiveDate>,
    /// Fraction of working days lost to weather, spread evenly (0 ≤ f < 0.8).
    pub weather_downtime_fraction: f64,
}

fn ser_weekdays<S: serde::Serializer>(days: &[Weekday], s: S) -> Result<S::Ok, S::Error> {
    s.collect_seq(days.iter().map(|d| d.to_string()))
}

/// Acceptance criteria.
#[derive(Debug, Clone, Serialize)]
pub struct Criteria {
    /// FS required at the end of each lift.
    pub fs_construction: f64,
    /// FS required in service (long term, at design height).
    pub fs_service: f64,
    /// Surcharge comes off when the centreline average degree of consolidation
    /// reaches this value (0–1), if set.
    pub surcharge_removal_degree: Option<f64>,
    /// …or when the residual settlement over the design life falls below this, m.
    pub residual_settlement_limit_m: Option<f64>,
    /// A plan whose residual settlement over the design life exceeds this
    /// is flagged with a warning, m (default 0.1 m, common practice for
    /// road embankments).
    pub residual_settlement_warning_m: f64,
}

/// Options of the stability engine.
#[derive(Debug, Clone, Serialize)]
pub struct StabilityOptions {
    /// Factor applied to fill c' and tan φ' (1 = full drained strength).
    pub fill_strength_factor: f64,
    /// Whether each circle is also analysed with a tension crack in the fill
    /// on its active side, as deep as the fill's reduced strength allows
    /// (2c'/(γ√Ka), at most the fill thickness); the lower FS is reported.
    pub fill_tension_crack: bool,
    /// Number of slices per circle (≥ 30).
    pub slices: usize,
    /// Share of the tension crack's depth that is filled with water (0 dry,
    /// 1 full); the water pushes on the sliding mass.
    pub crack_water_fraction: f64,
    /// Pore-pressure ratio ru in the fill (0: hydrostatic below the water
    /// table only).
    pub fill_ru: f64,
    /// The fill strength of the fill-face check (`stability.face_strength`).
    pub face_strength: FaceStrength,
}

/// Which fill strength the infinite-slope check of the fill face uses.
/// `fill_strength_factor` stands for strain compatibility between the fill
/// and the clay on deep circles; a shallow slide within the face mobilises
/// the fill's own strength, hence the default.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum FaceStrength {
    /// The fill's own c' and φ' (the default).
    Own,
    /// c' and tan φ' after `fill_strength_factor`, as on the circles.
    Factored,
}

impl FaceStrength {
    /// Name as written in the project file.
    pub fn label(self) -> &'static str {
        match self {
            FaceStrength::Own => "own",
            FaceStrength::Factored => "factored",
        }
    }

    /// One phrase for reports.
    pub fn describe(self) -> &'static str {
        match self {
            FaceStrength::Own => "the fill's own c' and φ' (not reduced by fill_strength_factor)",
            FaceStrength::Factored => "the fill's c' and tan φ' reduced by fill_strength_factor, as on the circles",
        }
    }
}

/// How consolidation is modelled.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ConsolidationMode {
    /// Constant mv and cv per layer (for checks against closed forms).
    Linear,
    /// mv from Cr/Cc at the current σ'v against σ'p; k held constant.
    StressDependent,
}

/// How excess pore pressure is generated by a load increment.
#[derive(Debug, Clone, Copy, Serialize)]
#[serde(tag = "rule", rename_all = "kebab-case")]
pub enum PorePressureRule {
    /// Δu = Δσz (one-dimensional loading).
    Vertical,
    /// Δu = B [Δσ3 + A (Δσ1 − Δσ3)] from the 2-D principal increments.
    Skempton { a: f64, b: f64 },
}

/// Options of the ground response engine.
#[derive(Debug, Clone, Serialize)]
pub struct AnalysisOptions {
    pub mode: ConsolidationMode,
    pub pore_pressure: PorePressureRule,
    /// Largest node spacing in the depth grid, m.
    pub max_node_spacing_m: f64,
    /// Time step while fill is being placed, days.
    pub placement_step_days: f64,
    /// Time step during rests, days.
    pub rest_step_days: f64,
}

/// One lift of a proposed sequence: `thickness_m` placed from `start` at the
/// construction rate on working days.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct ProposedLift {
    pub thickness_m: f64,
    pub start: NaiveDate,
}

impl Project {
    /// Depth of the top of the stiff base below OGL, or of the profile bottom.
    pub fn profile_depth_m(&self) -> f64 {
        self.ground.layers.iter().filter(|l| !matches!(l.kind, LayerKind::StiffBase)).map(|l| l.thickness_m).sum()
    }

    /// Highest crest the fill may reach above OGL, m (design + surcharge).
    pub fn max_height_m(&self) -> f64 {
        self.embankment.design_height_m + self.embankment.surcharge_height_m
    }
}

impl DrainPattern {
    /// Name as written in the project file.
    pub fn label(self) -> &'static str {
        match self {
            DrainPattern::Triangular => "triangular",
            DrainPattern::Square => "square",
        }
    }
}

impl ConsolidationMode {
    /// One-line description for reports.
    pub fn describe(self) -> &'static str {
        match self {
            ConsolidationMode::Linear => "linear (constant mv and cv)",
            ConsolidationMode::StressDependent => "stress-dependent (mv from Cr/Cc at current σ'v against σ'p)",
        }
    }
}

impl Drains {
    /// Diameter of the soil cylinder drained by one drain, de, m:
    /// 1.05 s (triangular) or 1.128 s (square) (Barron 1948; Hansbo 1981).
    pub fn influence_diameter_m(&self) -> f64 {
        match self.pattern {
            DrainPattern::Triangular => 1.05 * self.spacing_m,
            DrainPattern::Square => 1.128 * self.spacing_m,
        }
    }
}

/// Id reserved in readings files for the as-built fill record (crest height
/// above OGL, m).
pub const FILL_ID: &str = "fill";

/// What an instrument measures.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum InstrumentKind {
    /// Pore pressure at a tip in the ground.
    Piezometer,
    /// Level of a plate on original ground (settlement = baseline − reading).
    SettlementPlate,
    /// Horizontal position of a marker at or beyond the toe, measured
    /// outwards from the centreline (movement = reading − baseline).
    LateralMarker,
}

impl InstrumentKind {
    /// Name as written in the project file.
    pub fn label(self) -> &'static str {
        match self {
            InstrumentKind::Piezometer => "piezometer",
            InstrumentKind::SettlementPlate => "settlement-plate",
            InstrumentKind::LateralMarker => "lateral-marker",
        }
    }
}

/// Units of an instrument's readings.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ReadingUnit {
    /// Pore pressure, kPa.
    Kpa,
    /// Head of water above the piezometer tip, m (× γw to kPa).
    MHead,
    /// Length, m.
    M,
    /// Length, mm.
    Mm,
}

impl ReadingUnit {
    /// Name as written in the project file.
    pub fn label(self) -> &'static str {
        match self {
            ReadingUnit::Kpa => "kPa",
            ReadingUnit::MHead => "m-head",
            ReadingUnit::M => "m",
            ReadingUnit::Mm => "mm",
        }
    }

    /// A reading in these units in SI (kPa for pore pressure, m for lengths).
    pub fn to_si(self, v: f64) -> f64 {
        match self {
            ReadingUnit::Kpa | ReadingUnit::M => v,
            ReadingUnit::MHead => v * GAMMA_W,
            ReadingUnit::Mm => v / 1000.0,
        }
    }
}

/// A field instrument of the monitoring scheme.
#[derive(Debug, Clone, Serialize)]
pub struct Instrument {
    pub id: String,
    pub kind: InstrumentKind,
    /// Offset from the centreline, m (the section is symmetric; the sign only
    /// tells the side).
    pub offset_m: f64,
    /// Depth of a piezometer tip below OGL, m (0 for other kinds).
    pub depth_m: f64,
    /// Reading at the baseline date, in the instrument's units.
    pub baseline_value: f64,
    pub baseline_date: NaiveDate,
    pub units: ReadingUnit,
}

/// The monitoring scheme's minimum, tolerances, precisions and alarm limits
/// of the hold-point check. Defaults are common practice (see the README's
/// project-file reference).
#[derive(Debug, Clone, Serialize)]
pub struct MonitoringRules {
    /// Rise rate of a piezometer under constant fill height that raises the
    /// alarm when the regression shows it beyond the reading precision, kPa/week.
    pub pore_rise_limit_kpa_per_week: f64,
    /// Settlement rate limit at any plate, mm/day.
    pub settlement_rate_limit_mm_per_day: f64,
    /// Lateral movement rate limit at any marker, mm/day.
    pub lateral_rate_limit_mm_per_day: f64,
    /// Limit of lateral movement increment over centreline settlement increment.
    pub lateral_ratio_limit: f64,
    /// Window over which rates and the ratio are measured, days.
    pub rate_window_days: f64,
    /// Window of the pore-pressure trend regression (readings since the last
    /// lift ended, at most this old), days.
    pub trend_window_days: f64,
    /// Δu/Δσv of the last lift at a piezometer above which the clay there is
    /// taken to have yielded (passed σ'p; Leroueil et al. 1985).
    pub pore_pressure_ratio_limit: f64,
    /// FS now below which the check goes to the top level (distress).
    pub stop_fs_below: f64,
    /// Weighted misfit per degree of freedom of the calibration above which
    /// the model is taken not to explain the readings.
    pub fit_chi2_limit: f64,
    /// RMS misfit of any one instrument, in its reading standard deviations,
    /// above which the model is taken not to explain the readings.
    pub instrument_misfit_limit: f64,
    /// Piezometer readings further than this below the initial pore pressure
    /// u0 (`ground::u0`) are suspect, kPa.
    pub piezometer_tolerance_kpa: f64,
    /// Plate readings showing more heave than this are suspect, m.
    pub settlement_noise_m: f64,
    /// Resampling interval for Asaoka's method, days.
    pub asaoka_interval_days: f64,
    /// Standard deviation (precision) of a piezometer reading, kPa.
    pub piezometer_sd_kpa: f64,
    /// Standard deviation (precision) of a plate reading, m.
    pub settlement_sd_m: f64,
    /// Standard deviation (precision) of a lateral-marker reading, m.
    pub lateral_sd_m: f64,
    /// Instruments that must be read at every hold point (empty: all).
    pub required: Vec<String>,
    /// Least number of current, sufficiently read instruments per kind:
    /// piezometers, settlement plates, lateral markers.
    pub min_per_kind: [usize; 3],
    /// Oldest the latest reading may be at the hold point, days, per kind
    /// (piezometer, plate, marker).
    pub max_age_days: [f64; 3],
    /// Least number of readings of each instrument since the last lift ended.
    pub min_readings_since_lift: usize,
}

impl Default for MonitoringRules {
    /// Common practice, not from a single published source: limits of the
    /// order used on staged embankments on soft clay, to be confirmed by the
    /// engineer of record for each site (README, "References").
    fn default() -> Self {
        MonitoringRules {
            pore_rise_limit_kpa_per_week: 1.0,
            settlement_rate_limit_mm_per_day: 20.0,
            lateral_rate_limit_mm_per_day: 5.0,
            lateral_ratio_limit: 0.5,
            rate_window_days: 7.0,
            trend_window_days: 28.0,
            pore_pressure_ratio_limit: 0.9,
            stop_fs_below: 1.1,
            fit_chi2_limit: 4.0,
            instrument_misfit_limit: 3.0,
            piezometer_tolerance_kpa: 5.0,
            settlement_noise_m: 0.01,
            asaoka_interval_days: 7.0,
            piezometer_sd_kpa: 2.0,
            settlement_sd_m: 0.01,
            lateral_sd_m: 0.002,
            required: Vec::new(),
            min_per_kind: [1, 1, 1],
            max_age_days: [7.0, 7.0, 7.0],
            min_readings_since_lift: 3,
        }
    }
}

impl InstrumentKind {
    /// Index of the kind in the per-kind arrays of `MonitoringRules`.
    pub fn index(self) -> usize {
        match self {
            InstrumentKind::Piezometer => 0,
            InstrumentKind::SettlementPlate => 1,
            InstrumentKind::LateralMarker => 2,
        }
    }
}

impl Project {
    /// The project with every clay layer's cv and ch multiplied by `factor`
    /// (the back-analysed consolidation-rate multiplier).
    pub fn with_consolidation_factor(&self, factor: f64) -> Project {
        self.with_each_clay(|c| {
            c.cv_m2_per_day *= factor;
            c.ch_m2_per_day *= factor;
        })
    }

    /// The project with every clay layer's Cc and Cr multiplied by `factor`
    /// (the back-analysed compressibility multiplier: it scales the
    /// settlement; cv and ch stay as given, the permeability k = cv·mv·γw
    /// scaling with mv).
    pub fn with_compressibility_factor(&self, factor: f64) -> Project {
        self.with_each_clay(|c| {
            c.cc *= factor;
            c.cr *= factor;
        })
    }

    fn with_each_clay(&self, f: impl Fn(&mut Clay)) -> Project {
        let mut p = self.clone();
        for l in &mut p.ground.layers {
            if let LayerKind::Clay(c) = &mut l.kind {
                f(c);
            }
        }
        p
    }
}
