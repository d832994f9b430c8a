//! The corridor programme: many cross-sections along a road, each a
//! section project with its own safe timetable, fitted into one earthworks
//! programme with shared fill supply, placing crews, drain rigs and a
//! working platform.
//!
//! Method (our own heuristic, priority-rule list scheduling with a
//! day-by-day resource book): every section is first planned alone with
//! unlimited resources (in parallel); these plans give the first lower
//! bound. The sections are then taken one at a time in priority order
//! (the file's `priority`, 1 first, sections without one last; then the earliest required
//! finish; then the longest unconstrained duration first, because the
//! longest section sets the corridor finish; then chainage), and each
//! section's works are booked in the earliest days the resources allow.
//! A lift refused by the resources is asked for again from the next day
//! that could take it, so the section's planner re-simulates the ground
//! with the dates actually given and decides the lift afresh (`section`).
//! The heuristic aims at the earliest corridor finish (the latest section
//! finish); it is not proven optimal, so both lower bounds are reported
//! beside it: the latest unconstrained section finish, and the day the
//! supply could have delivered all the fill placed.

pub mod file;
pub mod ledger;
pub mod output;
pub mod programme;
pub mod quantities;
pub mod section;

use crate::model::Project;
use crate::schedule::calendar::Calendar;
use chrono::NaiveDate;

/// A validated corridor file.
#[derive(Debug, Clone)]
pub struct Corridor {
    /// The corridor file's name, for messages and reports.
    pub file: String,
    pub title: String,
    pub reference: String,
    pub start_date: NaiveDate,
    /// The corridor's working calendar (supply comes on its workable days).
    pub calendar: Calendar,
    pub resources: Resources,
    /// Sections in file order (chainage ranges do not overlap).
    pub sections: Vec<SectionSpec>,
    /// Every file read: the corridor file, then each section file once.
    pub inputs: Vec<InputFile>,
}

/// A file used and the SHA-256 of its bytes (hex).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct InputFile {
    pub file: String,
    pub sha256: String,
}

/// Shared resources; `None` means unlimited.
#[derive(Debug, Clone, Default)]
pub struct Resources {
    /// Sections that may place fill (or remove surcharge) on the same day.
    pub placing_crews: Option<usize>,
    /// Drain rigs and the metres of drain one rig installs per working day.
    /// None: drains are taken as installed before the first lift.
    pub drain_rigs: Option<(usize, f64)>,
    /// Working platform placed on drained sections before the drains, m.
    pub platform_thickness_m: f64,
    /// Reuse removed surcharge in later placements (see `programme`).
    pub rolling_surcharge: bool,
    /// Fill sources; empty: unlimited supply.
    pub supply: Vec<Source>,
}

/// One fill source.
#[derive(Debug, Clone)]
pub struct Source {
    pub name: String,
    /// Capacity, m³ per working day.
    pub m3_per_day: f64,
    /// First day of supply (None: from the corridor start).
    pub from: Option<NaiveDate>,
}

/// One section of the corridor.
#[derive(Debug, Clone)]
pub struct SectionSpec {
    pub name: String,
    /// Chainage range, m.
    pub from_m: f64,
    pub to_m: f64,
    /// The section project file used.
    pub project_file: String,
    /// Key-path overrides applied (key, value as written).
    pub overrides: Vec<(String, String)>,
    /// The project with the corridor's start date, calendar and overrides.
    pub project: Project,
    /// 1 is scheduled first, then 2, ...; sections without a priority
    /// come after all that have one.
    pub priority: Option<i64>,
    pub earliest_start: Option<NaiveDate>,
    pub required_finish: Option<NaiveDate>,
    /// Whether the section has its own calendar keys.
    pub own_calendar: bool,
}

impl SectionSpec {
    /// Length along the road, m.
    pub fn length_m(&self) -> f64 {
        self.to_m - self.from_m
    }

    /// Total thickness of the clay layers, m.
    pub fn clay_thickness_m(&self) -> f64 {
        self.project
            .ground
            .layers
            .iter()
            .filter(|l| matches!(l.kind, crate::model::LayerKind::Clay(_)))
            .map(|l| l.thickness_m)
            .sum()
    }
}
