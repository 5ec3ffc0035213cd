//! One operating point: the thrust identity solved at one boat speed.

use super::System;
use thiserror::Error;

/// A solved operating point at one boat speed. SI units, rpm named as such.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct OperatingPoint {
    /// Boat speed through the water, m/s.
    pub speed: f64,
    /// Total resistance including margins, N.
    pub resistance: f64,
    /// Required thrust T = R/(1−t), N.
    pub thrust: f64,
    /// Wake fraction w used.
    pub wake_fraction: f64,
    /// Thrust deduction t used.
    pub thrust_deduction: f64,
    /// Relative rotative efficiency ηR used.
    pub relative_rotative_efficiency: f64,
    /// Speed of advance Va = V(1−w), m/s.
    pub advance_speed: f64,
    /// Advance ratio J.
    pub advance_ratio: f64,
    /// Thrust coefficient KT at J.
    pub thrust_coefficient: f64,
    /// Torque coefficient KQ at J.
    pub torque_coefficient: f64,
    /// Open-water efficiency η0.
    pub open_water_efficiency: f64,
    /// Blade-section Reynolds number at 0.75R used for the correction (0 if none).
    pub reynolds: f64,
    /// Screw speed, rev/s.
    pub screw_rps: f64,
    /// Engine speed, rpm.
    pub engine_rpm: f64,
    /// Screw torque Q, N·m.
    pub torque: f64,
    /// Effective (towing) power R·V, W.
    pub effective_power: f64,
    /// Delivered power at the screw PD = 2π·n·Q/ηR, W.
    pub delivered_power: f64,
    /// Brake power at the engine PB = PD/(ηshaft·ηgear), W.
    pub brake_power: f64,
    /// Brake power as a fraction of full-load power at this rpm.
    pub load_fraction: f64,
    /// Fuel mass flow, kg/s.
    pub fuel_mass_flow: f64,
    /// Fuel volume flow, m³/s.
    pub fuel_volume_flow: f64,
}

/// Why a point could not be solved. Every failure carries its reason to the screen.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum PointFailure {
    /// The speed is negative or not finite.
    #[error("speed {0} m/s is not a valid boat speed")]
    InvalidSpeed(f64),
    /// Resistance could not be evaluated.
    #[error("resistance: {0}")]
    Resistance(#[from] crate::propulsion::hull::HullError),
    /// No advance ratio in (0, J at KT = 0) gives the required thrust loading.
    #[error(
        "the screw cannot give {thrust:.0} N at {speed:.2} m/s: no advance ratio satisfies the thrust identity"
    )]
    NoRoot {
        /// The boat speed, m/s.
        speed: f64,
        /// The thrust required, N.
        thrust: f64,
    },
    /// The root finder ran out of iterations before converging.
    #[error("thrust identity did not converge at {speed:.2} m/s after {iterations} iterations")]
    NotConverged {
        /// The boat speed, m/s.
        speed: f64,
        /// Iterations used.
        iterations: u32,
    },
    /// The interaction coefficients are outside their meaningful range.
    #[error("interaction coefficient out of range: {0}")]
    BadInteraction(String),
}

/// Solves the thrust identity at `speed` m/s (design §2.6). A speed of 0 gives a zero point.
pub fn solve_point(system: &System<'_>, speed: f64) -> Result<OperatingPoint, PointFailure> {
    let _ = (system, speed);
    unimplemented!("solver helper")
}
