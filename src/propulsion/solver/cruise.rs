//! Cruise queries: rpm for a speed, speed for an rpm, with fuel per hour, per mile and range.

use super::System;
use super::matching::point_at_engine_rpm;
use super::point::{OperatingPoint, PointFailure, solve_point};

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

    /// Checks the tank volume (≥ 0) and the fractions (0–1).
    pub fn check(&self) -> Result<(), PointFailure> {
        if !(self.tank_volume.is_finite() && self.tank_volume >= 0.0) {
            return Err(PointFailure::BadInput {
                field: "tank volume",
                value: self.tank_volume,
                expected: "a volume of 0 or more in m³",
            });
        }
        for (field, value) in [
            ("usable fraction", self.usable_fraction),
            ("reserve fraction", self.reserve_fraction),
        ] {
            if !(0.0..=1.0).contains(&value) {
                return Err(PointFailure::BadInput {
                    field,
                    value,
                    expected: "a fraction from 0 to 1",
                });
            }
        }
        Ok(())
    }
}

/// A cruise point: an operating point with the fuel figures of the trip (range and endurance
/// from the boat's total burn, every running engine together).
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

impl CruisePoint {
    /// The trip's fuel figures at a solved point moving through the water (speed > 0).
    pub fn from_point(trip: &Trip, point: OperatingPoint) -> Result<Self, PointFailure> {
        trip.check()?;
        let flow = point.fuel_volume_flow;
        if !(point.speed.is_finite() && point.speed > 0.0) {
            return Err(PointFailure::InvalidSpeed(point.speed));
        }
        if !(flow.is_finite() && flow > 0.0) {
            // Range and endurance would be infinite.
            return Err(PointFailure::Unphysical {
                speed: point.speed,
                quantity: "fuel volume flow",
                value: flow,
            });
        }
        let fuel = trip.fuel_for_range();
        let endurance = fuel / flow;
        Ok(Self {
            point,
            fuel_per_distance: flow / point.speed,
            range: endurance * point.speed,
            endurance,
            // Tolerate the round-off of a point solved exactly on the full-load curve.
            beyond_full_load: point.load_fraction > 1.0 + 1e-9,
        })
    }
}

/// The cruise point at boat speed `speed` (m/s), which must be above 0.
pub fn cruise_at_speed(
    system: &System<'_>,
    trip: &Trip,
    speed: f64,
) -> Result<CruisePoint, PointFailure> {
    if !(speed.is_finite() && speed > 0.0) {
        return Err(PointFailure::InvalidSpeed(speed));
    }
    CruisePoint::from_point(trip, solve_point(system, speed)?)
}

/// The cruise point at engine speed `engine_rpm`, which must be above 0.
pub fn cruise_at_rpm(
    system: &System<'_>,
    trip: &Trip,
    engine_rpm: f64,
) -> Result<CruisePoint, PointFailure> {
    if !(engine_rpm.is_finite() && engine_rpm > 0.0) {
        return Err(PointFailure::BadInput {
            field: "engine rpm",
            value: engine_rpm,
            expected: "a positive engine speed in rpm",
        });
    }
    CruisePoint::from_point(trip, point_at_engine_rpm(system, engine_rpm)?)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn trip() -> Trip {
        Trip {
            target_speed: 3.5,
            tank_volume: 0.8,
            usable_fraction: 0.9,
            reserve_fraction: 0.2,
        }
    }

    fn point(speed: f64, flow: f64, load: f64) -> OperatingPoint {
        OperatingPoint {
            speed,
            wake_fraction: 0.2,
            thrust_deduction: 0.15,
            relative_rotative_efficiency: 1.0,
            shafts: 1,
            driven_shafts: 1,
            load_fraction: load,
            fuel_mass_flow: flow * 840.0,
            fuel_volume_flow: flow,
            fuel_mass_flow_per_engine: flow * 840.0,
            fuel_volume_flow_per_engine: flow,
            ..OperatingPoint::UNSOLVED
        }
    }

    #[test]
    fn fuel_figures_match_hand_computation() {
        // 800 L × 0.9 × 0.8 = 576 L for range; 10 L/h at 7 kn (3.6011 m/s).
        let trip = trip();
        assert!((trip.fuel_for_range() - 0.576).abs() < 1e-12);
        let speed = 7.0 * 1852.0 / 3600.0;
        let flow = 10e-3 / 3600.0;
        let cruise = CruisePoint::from_point(&trip, point(speed, flow, 0.5)).unwrap();
        // 57.6 h, 57.6 × 7 = 403.2 nmi, 10/7 L per nmi.
        assert!((cruise.endurance - 57.6 * 3600.0).abs() < 1e-6);
        assert!((cruise.range - 403.2 * 1852.0).abs() < 1e-6);
        assert!((cruise.fuel_per_distance * 1852.0 - 10e-3 / 7.0).abs() < 1e-15);
        assert!(!cruise.beyond_full_load);
        assert!(
            CruisePoint::from_point(&trip, point(speed, flow, 1.02))
                .unwrap()
                .beyond_full_load
        );
    }

    #[test]
    fn bad_trips_and_points_are_refused() {
        let speed = 3.0;
        let bad = Trip {
            usable_fraction: 1.5,
            ..trip()
        };
        let message = CruisePoint::from_point(&bad, point(speed, 1e-6, 0.5))
            .unwrap_err()
            .to_string();
        assert!(message.contains("usable fraction = 1.5"), "{message}");
        let bad = Trip {
            tank_volume: -1.0,
            ..trip()
        };
        assert!(CruisePoint::from_point(&bad, point(speed, 1e-6, 0.5)).is_err());
        assert!(matches!(
            CruisePoint::from_point(&trip(), point(speed, 0.0, 0.5)),
            Err(PointFailure::Unphysical {
                quantity: "fuel volume flow",
                ..
            })
        ));
        assert_eq!(
            CruisePoint::from_point(&trip(), point(0.0, 1e-6, 0.0)),
            Err(PointFailure::InvalidSpeed(0.0))
        );
    }
}
