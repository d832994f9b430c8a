//! Field monitoring at hold points: the instruments' readings file, Asaoka's
//! settlement forecast, the back-analysis of a consolidation-rate
//! multiplier, the state consistent with the piezometers, the trend rules,
//! the monitoring scheme's minimum and the three-level recommendation, and
//! the synthetic readings used for tests.

pub mod asaoka;
pub mod calibrate;
pub mod measured;
pub mod readings;
pub mod release;
pub mod replay;
pub mod status;
pub mod synth;
pub mod tip;
pub mod trends;

#[cfg(test)]
mod tests;
