//! fillpace: staged construction of embankments on soft clay.
//!
//! Data flows one way: `input` reads and validates a project file into a
//! `model::Project`; `ground`, `load`, `consolidation` and `response` predict
//! pore pressure, settlement and strength through time; `stability` finds the
//! factor of safety on slip circles; `schedule` plans the lifts on a working
//! calendar; `report` writes the results. `main.rs` only wires these up.

pub mod app;
pub mod audit;
pub mod cli;
pub mod compare;
pub mod consolidation;
pub mod corridor;
pub mod error;
pub mod fuzzing;
pub mod ground;
pub mod hash;
pub mod input;
pub mod load;
pub mod model;
pub mod monitoring;
pub mod output;
pub mod plausibility;
pub mod random;
pub mod report;
pub mod response;
pub mod risk;
pub mod schedule;
pub mod settlement;
pub mod stability;

#[cfg(test)]
pub(crate) mod fixtures;

pub use error::{Error, Result};
