//! Small synthetic projects for unit tests (not demo data): each test states
//! the published case it reproduces.

use crate::model::Project;

/// Parse a test project made from `body` (the `[ground]` section and
/// anything else) plus minimal embankment, construction and criteria tables.
pub fn project(body: &str) -> Project {
    let text = format!(
        r#"
[project]
title = "test"
start_date = "2030-01-07"

[embankment]
design_height_m = 4.0
crest_width_m = 20.0
side_slope_h_per_v = 2.0
fill_unit_weight_kn_m3 = 20.0
fill_friction_deg = 30.0

[construction]
placement_rate_m_per_day = 0.5
lift_min_m = 0.5
lift_max_m = 2.0

[criteria]
fs_construction = 1.3

{body}
"#
    );
    match crate::input::parse(&text, "fixture.toml") {
        Ok(p) => p,
        Err(e) => panic!("fixture does not validate: {e}"),
    }
}

/// One uniform clay layer of thickness `h` m with cv = ch = `cv` m²/year,
/// linear mode, on a base drained or not.
pub fn uniform_clay(h: f64, cv: f64, base: &str, extra: &str) -> Project {
    project(&format!(
        r#"
[ground]
groundwater_depth_m = 0.0
base_drainage = "{base}"

[[ground.layers]]
name = "clay"
kind = "clay"
thickness_m = {h}
unit_weight_kn_m3 = 16.0
e0 = 1.5
cc = 0.6
cr = 0.06
cv_m2_per_year = {cv}

[[ground.layers]]
name = "base"
kind = "stiff-base"
unit_weight_kn_m3 = 21.0

[analysis]
mode = "linear"
{extra}
"#
    ))
}
