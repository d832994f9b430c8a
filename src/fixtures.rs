//! Small synthetic projects for unit tests (not demo data): each test states
//! the published case it reproduces.

use crate::model::Project;

/// The construction and criteria tables of every synthetic test project
/// (shared with the integration tests).
pub const CONSTRUCTION: &str = include_str!("../tests/data/fixture-construction.toml");

/// A stiff base layer under the clay of a test project.
pub const STIFF_BASE: &str = r#"
[[ground.layers]]
name = "base"
kind = "stiff-base"
unit_weight_kn_m3 = 21.0
"#;

/// An `[embankment]` table of design height `height_m` and crest width
/// `crest_m` (slopes 2H:1V, fill 20 kN/m³ at φ' 30°) followed by the
/// construction and criteria tables.
pub fn tables(height_m: f64, crest_m: f64) -> String {
    format!(
        r#"
[embankment]
design_height_m = {height_m:?}
crest_width_m = {crest_m:?}
side_slope_h_per_v = 2.0
fill_unit_weight_kn_m3 = 20.0
fill_friction_deg = 30.0

{CONSTRUCTION}"#
    )
}

/// Parse a test project made from `body` (the `[ground]` section and
/// anything else) plus minimal embankment, construction and criteria tables.
pub fn project(body: &str) -> Project {
    let text = format!(
        r#"
[project]
title = "test"
start_date = "2030-01-07"
{}
{body}
"#,
        tables(4.0, 20.0)
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
{STIFF_BASE}
[analysis]
mode = "linear"
{extra}
"#
    ))
}
