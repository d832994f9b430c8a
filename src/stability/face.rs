//! The fill face as an infinite slope: a slip plane parallel to the side
//! slope at vertical depth z in the fill, FS = c'/(γ z sin β cos β) +
//! (1 − ru sec²β) tan φ'/tan β (Skempton & DeLory 1957; Duncan & Wright
//! 2005, Slope Stability and Limit Equilibrium, ch. 6), with the fill's own
//! c' and φ' by default (a shallow slide within the face mobilises the
//! fill's own strength; `fill_strength_factor` is for strain compatibility
//! on deep circles) or, by `stability.face_strength = "factored"`, the
//! reduced ones. With c' = 0 and ru = 0 it is tan φ'/tan β whatever the depth;
//! with c' > 0 the deepest plane (z = crest height) is the lowest. Shallow
//! circles tend to this value but are skipped by the circle search, so
//! this check stands beside it in every FS comparison.

use super::Section;
use crate::model::FaceStrength;
use serde::Serialize;

/// The infinite-slope check of the fill face.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct FaceCheck {
    /// Factor of safety of the face.
    pub fs: f64,
    /// Face inclination β, degrees.
    pub slope_deg: f64,
    /// Vertical depth of the slip plane, m.
    pub depth_m: f64,
    /// Pore-pressure ratio used.
    pub ru: f64,
    /// Which fill strength the check used, and its c' kPa and φ' degrees.
    pub strength: FaceStrength,
    pub cohesion_kpa: f64,
    pub friction_deg: f64,
}

/// The check on the section, None where there is no fill or the strength
/// it uses is nil (a fill taken as a load, with `face_strength =
/// "factored"`, or a fill with no strength of its own).
pub fn check(s: &Section) -> Option<FaceCheck> {
    let h = s.crest_m();
    if h <= 0.0 || (s.face_c <= 0.0 && s.face_tan_phi <= 0.0) {
        return None;
    }
    let beta = (1.0 / s.side_slope_h_per_v()).atan();
    let fs = infinite_slope_fs(s.face_c, s.face_tan_phi, s.fill_gamma, h, beta, s.fill_ru);
    Some(FaceCheck {
        fs,
        slope_deg: beta.to_degrees(),
        depth_m: h,
        ru: s.fill_ru,
        strength: s.face_strength,
        cohesion_kpa: s.face_c,
        friction_deg: s.face_tan_phi.atan().to_degrees(),
    })
}

/// Infinite-slope FS of a plane at vertical depth `z` m under a face at
/// `beta` rad: c' kPa, tan φ', γ kN/m³, pore-pressure ratio ru.
pub fn infinite_slope_fs(c: f64, tan_phi: f64, gamma: f64, z: f64, beta: f64, ru: f64) -> f64 {
    let (sin_b, cos_b) = beta.sin_cos();
    c / (gamma * z * sin_b * cos_b) + (1.0 - ru / (cos_b * cos_b)) * tan_phi / beta.tan()
}
