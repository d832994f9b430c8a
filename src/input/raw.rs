//! What the user typed: serde structs that mirror the project file key for key,
//! with field units in the key names and `Option` wherever a key may be left
//! out. No checking happens here beyond types; `validate` turns this into a
//! `model::Project`.

use serde::Deserialize;

/// The whole project file.
#[derive(Debug, Deserialize)]
pub struct RawProject {
    pub project: RawInfo,
    pub ground: RawGround,
    pub embankment: RawEmbankment,
    pub drains: Option<RawDrains>,
    pub construction: RawConstruction,
    pub criteria: RawCriteria,
    pub stability: Option<RawStability>,
    pub analysis: Option<RawAnalysis>,
    #[serde(default)]
    pub sequence: Vec<RawLift>,
    #[serde(default)]
    pub instrument: Vec<RawInstrument>,
    pub monitoring: Option<RawMonitoring>,
    #[serde(default)]
    pub uncertain: Vec<RawUncertain>,
    #[serde(default)]
    pub correlation: Vec<RawCorrelation>,
}

#[derive(Debug, Deserialize)]
pub struct RawInfo {
    pub title: String,
    pub reference: Option<String>,
    pub location: Option<String>,
    pub revision: Option<String>,
    /// A TOML date or a "YYYY-MM-DD" string.
    pub start_date: toml::Value,
    pub design_life_years: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawGround {
    pub groundwater_depth_m: f64,
    /// "drained" or "undrained".
    pub base_drainage: Option<String>,
    pub layers: Vec<RawLayer>,
}

#[derive(Debug, Deserialize)]
pub struct RawLayer {
    pub name: String,
    /// "clay", "sand" or "stiff-base".
    pub kind: String,
    pub thickness_m: Option<f64>,
    pub unit_weight_kn_m3: f64,
    pub saturated_unit_weight_kn_m3: Option<f64>,
    // clay
    pub e0: Option<f64>,
    pub cc: Option<f64>,
    pub cr: Option<f64>,
    pub c_alpha: Option<f64>,
    pub ocr: Option<f64>,
    pub pop_kpa: Option<f64>,
    pub sigma_p_kpa: Option<f64>,
    pub cv_m2_per_year: Option<f64>,
    pub ch_m2_per_year: Option<f64>,
    pub ch_over_cv: Option<f64>,
    /// "shansep" or "gain-ratio".
    pub strength: Option<String>,
    pub shansep_s: Option<f64>,
    pub shansep_m: Option<f64>,
    pub gain_ratio: Option<f64>,
    pub su0_top_kpa: Option<f64>,
    pub su0_bottom_kpa: Option<f64>,
    /// [[depth below OGL m, su kPa], ...]
    pub su0_points: Option<Vec<Vec<f64>>>,
    // sand
    pub friction_deg: Option<f64>,
    pub cohesion_kpa: Option<f64>,
    /// Piezometric level of a sand layer: elevation above OGL, m (negative
    /// below ground; above ground is artesian).
    pub piezometric_level_m: Option<f64>,
    /// Pore-pressure ratio of a sand layer.
    pub ru: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawEmbankment {
    pub design_height_m: f64,
    pub crest_width_m: f64,
    pub side_slope_h_per_v: f64,
    pub fill_unit_weight_kn_m3: f64,
    pub fill_cohesion_kpa: Option<f64>,
    pub fill_friction_deg: f64,
    pub surcharge_height_m: Option<f64>,
    #[serde(default)]
    pub berms: Vec<RawBerm>,
    pub reinforcement_kn_per_m: Option<f64>,
    /// "full-footprint" (default) or "constant-crest".
    pub stage_shape: Option<String>,
}

#[derive(Debug, Deserialize)]
pub struct RawBerm {
    pub width_m: f64,
    pub height_m: f64,
    pub placed_from_height_m: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawDrains {
    /// "triangular" or "square".
    pub pattern: String,
    pub spacing_m: f64,
    pub band_width_mm: Option<f64>,
    pub band_thickness_mm: Option<f64>,
    pub diameter_mm: Option<f64>,
    pub depth_m: f64,
    pub smear_ratio: Option<f64>,
    pub kh_over_ks: Option<f64>,
    pub discharge_m3_per_year: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawConstruction {
    pub placement_rate_m_per_day: f64,
    pub lift_min_m: f64,
    pub lift_max_m: f64,
    pub lift_increment_m: Option<f64>,
    pub min_rest_days: Option<i64>,
    pub working_days: Option<Vec<String>>,
    /// "YYYY-MM-DD" or "YYYY-MM-DD..YYYY-MM-DD" (inclusive).
    pub holidays: Option<Vec<String>>,
    pub weather_downtime_fraction: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawCriteria {
    pub fs_construction: f64,
    pub fs_service: Option<f64>,
    pub surcharge_removal_degree: Option<f64>,
    pub residual_settlement_limit_m: Option<f64>,
    pub residual_settlement_warning_m: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawStability {
    pub fill_strength_factor: Option<f64>,
    pub fill_tension_crack: Option<bool>,
    pub slices: Option<i64>,
    pub crack_water_fraction: Option<f64>,
    pub fill_ru: Option<f64>,
    pub face_strength: Option<String>,
}

#[derive(Debug, Deserialize)]
pub struct RawAnalysis {
    /// "stress-dependent" or "linear".
    pub mode: Option<String>,
    /// "vertical" or "skempton".
    pub pore_pressure: Option<String>,
    pub skempton_a: Option<f64>,
    pub skempton_b: Option<f64>,
    pub max_node_spacing_m: Option<f64>,
    pub placement_step_days: Option<f64>,
    pub rest_step_days: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawLift {
    pub thickness_m: f64,
    pub start_date: toml::Value,
}

#[derive(Debug, Deserialize)]
pub struct RawInstrument {
    pub id: String,
    /// "piezometer", "settlement-plate" or "lateral-marker".
    pub kind: String,
    pub offset_m: f64,
    pub depth_m: Option<f64>,
    pub baseline_value: f64,
    pub baseline_date: toml::Value,
    /// "kPa" or "m-head" (piezometers); "m" or "mm" (plates and markers).
    pub units: Option<String>,
}

#[derive(Debug, Deserialize)]
pub struct RawMonitoring {
    pub pore_rise_limit_kpa_per_week: Option<f64>,
    pub trend_window_days: Option<f64>,
    pub pore_pressure_ratio_limit: Option<f64>,
    pub stop_fs_below: Option<f64>,
    pub fit_chi2_limit: Option<f64>,
    pub instrument_misfit_limit: Option<f64>,
    pub lateral_sd_m: Option<f64>,
    pub required: Option<Vec<String>>,
    pub min_piezometers: Option<f64>,
    pub min_settlement_plates: Option<f64>,
    pub min_lateral_markers: Option<f64>,
    pub max_age_piezometer_days: Option<f64>,
    pub max_age_plate_days: Option<f64>,
    pub max_age_marker_days: Option<f64>,
    pub min_readings_since_lift: Option<f64>,
    pub settlement_rate_limit_mm_per_day: Option<f64>,
    pub lateral_rate_limit_mm_per_day: Option<f64>,
    pub lateral_ratio_limit: Option<f64>,
    pub rate_window_days: Option<f64>,
    pub piezometer_tolerance_kpa: Option<f64>,
    pub settlement_noise_m: Option<f64>,
    pub asaoka_interval_days: Option<f64>,
    pub piezometer_sd_kpa: Option<f64>,
    pub settlement_sd_m: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawUncertain {
    pub name: String,
    /// Key paths whose file values are multiplied by the sampled factor.
    pub keys: Vec<String>,
    /// "lognormal", "normal" or "uniform".
    pub distribution: String,
    pub cov: Option<f64>,
    pub low: Option<f64>,
    pub high: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct RawCorrelation {
    /// Names of two `[[uncertain]]` entries.
    pub between: Vec<String>,
    pub coefficient: f64,
}

/// Field names of a struct, read from its `Deserialize` impl, so that "did
/// you mean" suggestions can never drift from the structs above.
pub fn field_names<'de, T: Deserialize<'de>>() -> &'static [&'static str] {
    struct Probe(Option<&'static [&'static str]>);
    #[derive(Debug)]
    struct Stop;
    impl std::fmt::Display for Stop {
        fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
            f.write_str("probe")
        }
    }
    impl std::error::Error for Stop {}
    impl serde::de::Error for Stop {
        fn custom<M: std::fmt::Display>(_: M) -> Self {
            Stop
        }
    }
    impl<'de> serde::Deserializer<'de> for &mut Probe {
        type Error = Stop;
        fn deserialize_any<V: serde::de::Visitor<'de>>(self, _: V) -> Result<V::Value, Stop> {
            Err(Stop)
        }
        fn deserialize_struct<V: serde::de::Visitor<'de>>(
            self,
            _: &'static str,
            fields: &'static [&'static str],
            _: V,
        ) -> Result<V::Value, Stop> {
            self.0 = Some(fields);
            Err(Stop)
        }
        serde::forward_to_deserialize_any! {
            bool i8 i16 i32 i64 i128 u8 u16 u32 u64 u128 f32 f64 char str string
            bytes byte_buf option unit unit_struct newtype_struct seq tuple
            tuple_struct map enum identifier ignored_any
        }
    }
    let mut probe = Probe(None);
    let _ = T::deserialize(&mut probe);
    probe.0.unwrap_or(&[])
}
