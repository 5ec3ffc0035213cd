//! Hull–propeller interaction: wake fraction, thrust deduction, relative rotative efficiency.

use super::HullForm;
use crate::propulsion::water::WaterProperties;

/// Interaction coefficients at one speed (all dimensionless).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Interaction {
    /// Taylor wake fraction w: Va = V·(1 − w).
    pub wake_fraction: f64,
    /// Thrust deduction fraction t: T = R/(1 − t).
    pub thrust_deduction: f64,
    /// Relative rotative efficiency ηR.
    pub relative_rotative_efficiency: f64,
}

/// How the interaction coefficients are found.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub enum InteractionMethod {
    /// Holtrop (1984) single-screw formulas, speed dependent through CV.
    Holtrop1984SingleScrew,
    /// Taylor's wake w = 0.5·Cb − 0.05 with t = 0.6·w·(1 + 0.67·w) and ηR = 1.0.
    Taylor,
    /// Values the user gives.
    User(Interaction),
}

/// What the interaction estimate needs to know about the screw and stern.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ScrewAtStern {
    /// Screw diameter, m.
    pub diameter: f64,
    /// Pitch ratio P/D.
    pub pitch_ratio: f64,
    /// Expanded area ratio AE/A0.
    pub area_ratio: f64,
    /// Number of blades.
    pub blades: u32,
}

impl InteractionMethod {
    /// The interaction coefficients at `speed` (m/s) for this hull, water and screw.
    pub fn at_speed(
        &self,
        hull: &HullForm,
        water: &WaterProperties,
        screw: &ScrewAtStern,
        speed: f64,
    ) -> Interaction {
        let _ = (hull, water, screw, speed);
        unimplemented!("hull helper")
    }
}
