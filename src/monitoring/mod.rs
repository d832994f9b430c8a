//! Field monitoring at hold points: the instruments' readings file, Asaoka's
//! settlement forecast, the back-analysis of a consolidation-rate
//! multiplier, the alarm rules and the RELEASE / HOLD decision, and the
//! synthetic readings used for tests and the invented demo file.

pub mod asaoka;
pub mod calibrate;
pub mod readings;
pub mod release;
pub mod replay;
pub mod synth;

#[cfg(test)]
mod tests;
