//! Cruise queries: rpm for a speed, speed for an rpm, with fuel per hour, per mile and range.

use super::System;
use super::point::{OperatingPoint, PointFailure};

/// The trip the user plans: target speed and fuel on board.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Trip {
    /// Target cruising speed through the water, m/s.
    pub target_speed: f64,
    /// Tank volume, m³.
    pub tank_volume: f64,
    /// Usable fraction of the tank (pickup height, trim), 0–1.
    pub usable_fraction: f64,
    /// Reserve kept back from the usable fuel, fraction 0–1.
    pub reserve_fraction: f64,
}

impl Trip {
    /// Fuel available for the run after the reserve, m³.
    pub fn fuel_for_range(&self) -> f64 {
        self.tank_volume * self.usable_fraction * (1.0 - self.reserve_fraction)
    }
}

/// A cruise point: an operating point with the fuel figures of the trip.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct CruisePoint {
    /// The solved operating point.
    pub point: OperatingPoint,
    /// Fuel volume per distance run, m³/m.
    pub fuel_per_distance: f64,
    /// Range with the usable fuel less reserve, m.
    pub range: f64,
    /// Time to empty the fuel for range, s.
    pub endurance: f64,
    /// Whether the engine is past its full-load curve at this point (cannot be reached).
    pub beyond_full_load: bool,
}

/// The cruise point at boat speed `speed` (m/s).
pub fn cruise_at_speed(
    system: &System<'_>,
    trip: &Trip,
    speed: f64,
) -> Result<CruisePoint, PointFailure> {
    let _ = (system, trip, speed);
    unimplemented!("solver helper")
}

/// The cruise point at engine speed `engine_rpm`.
pub fn cruise_at_rpm(
    system: &System<'_>,
    trip: &Trip,
    engine_rpm: f64,
) -> Result<CruisePoint, PointFailure> {
    let _ = (system, trip, engine_rpm);
    unimplemented!("solver helper")
}
