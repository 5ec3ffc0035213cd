//! The propeller curve: operating points over a speed range for one screw and gear.

use super::System;
use super::point::{OperatingPoint, PointFailure, PointSolver};

/// Operating points over a range of speeds; failures are kept with their speed and reason.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PropellerCurve {
    /// Each requested speed (m/s) with its point or its failure, in increasing speed.
    pub points: Vec<(f64, Result<OperatingPoint, PointFailure>)>,
}

impl PropellerCurve {
    /// Solves `count` evenly spaced speeds from `min_speed` to `max_speed` (m/s).
    ///
    /// `count` = 1 solves `min_speed` only; `count` = 0 gives an empty curve. A speed that is
    /// negative or not finite is kept as an [`PointFailure::InvalidSpeed`] point.
    pub fn over_speeds(system: &System<'_>, min_speed: f64, max_speed: f64, count: usize) -> Self {
        let mut curve = Self {
            points: Vec::with_capacity(count),
        };
        curve.resolve(system, min_speed, max_speed, count);
        curve
    }

    /// As [`PropellerCurve::over_speeds`], reusing this curve's storage (no allocation once it
    /// has held `count` points) — for re-solving on every edit.
    pub fn resolve(&mut self, system: &System<'_>, min_speed: f64, max_speed: f64, count: usize) {
        self.points.clear();
        let step = if count > 1 {
            (max_speed - min_speed) / (count - 1) as f64
        } else {
            0.0
        };
        let mut solver = PointSolver::along_curve(system);
        // Each point is solved into the place where it stays: a point is large, and copying
        // it from the solver into the curve showed in the profile.
        self.points
            .extend((0..count).map(|_| (0.0, Ok(OperatingPoint::UNSOLVED))));
        for (index, (speed, slot)) in self.points.iter_mut().enumerate() {
            *speed = if index + 1 == count && count > 1 {
                max_speed
            } else {
                min_speed + step * index as f64
            };
            if let Ok(point) = slot
                && let Err(failure) = solver.solve_into(*speed, point)
            {
                *slot = Err(failure);
            }
        }
    }

    /// The successfully solved points, in increasing speed.
    pub fn solved(&self) -> impl Iterator<Item = &OperatingPoint> {
        self.points.iter().filter_map(|(_, r)| r.as_ref().ok())
    }

    /// The failed points with their speed (m/s) and reason.
    pub fn failures(&self) -> impl Iterator<Item = (f64, &PointFailure)> {
        self.points
            .iter()
            .filter_map(|(speed, r)| r.as_ref().err().map(|e| (*speed, e)))
    }

    /// (engine rpm, brake power of each running engine W) of every solved point, for charts
    /// against the engine envelope.
    pub fn brake_power_by_rpm(&self) -> impl Iterator<Item = (f64, f64)> + '_ {
        self.solved()
            .map(|p| (p.engine_rpm, p.brake_power_per_engine))
    }

    /// The operating point at engine rpm `engine_rpm`, interpolated linearly (every field)
    /// between the two neighbouring solved points; `None` outside the solved range.
    ///
    /// Cheap (no solving), and as exact as the curve is fine: for an exact point use
    /// [`super::matching::point_at_engine_rpm`]. Engine rpm rises with speed along a propeller
    /// curve, so the first pair of consecutive solved points that brackets `engine_rpm` is used.
    pub fn at_engine_rpm(&self, engine_rpm: f64) -> Option<OperatingPoint> {
        if !engine_rpm.is_finite() {
            return None;
        }
        let mut previous: Option<&OperatingPoint> = None;
        for point in self.solved() {
            if point.engine_rpm == engine_rpm {
                return Some(*point);
            }
            if let Some(low) = previous
                && low.engine_rpm < engine_rpm
                && engine_rpm < point.engine_rpm
            {
                let fraction = (engine_rpm - low.engine_rpm) / (point.engine_rpm - low.engine_rpm);
                return Some(interpolate(low, point, fraction));
            }
            previous = Some(point);
        }
        None
    }
}

/// Every field of `low` moved `fraction` of the way towards `high`.
fn interpolate(low: &OperatingPoint, high: &OperatingPoint, fraction: f64) -> OperatingPoint {
    let mix = |a: f64, b: f64| a + (b - a) * fraction;
    OperatingPoint {
        speed: mix(low.speed, high.speed),
        resistance: mix(low.resistance, high.resistance),
        thrust: mix(low.thrust, high.thrust),
        wake_fraction: mix(low.wake_fraction, high.wake_fraction),
        thrust_deduction: mix(low.thrust_deduction, high.thrust_deduction),
        relative_rotative_efficiency: mix(
            low.relative_rotative_efficiency,
            high.relative_rotative_efficiency,
        ),
        advance_speed: mix(low.advance_speed, high.advance_speed),
        advance_ratio: mix(low.advance_ratio, high.advance_ratio),
        thrust_coefficient: mix(low.thrust_coefficient, high.thrust_coefficient),
        torque_coefficient: mix(low.torque_coefficient, high.torque_coefficient),
        open_water_efficiency: mix(low.open_water_efficiency, high.open_water_efficiency),
        reynolds: mix(low.reynolds, high.reynolds),
        shafts: low.shafts,
        driven_shafts: low.driven_shafts,
        screw_rps: mix(low.screw_rps, high.screw_rps),
        engine_rpm: mix(low.engine_rpm, high.engine_rpm),
        torque: mix(low.torque, high.torque),
        effective_power: mix(low.effective_power, high.effective_power),
        delivered_power: mix(low.delivered_power, high.delivered_power),
        brake_power: mix(low.brake_power, high.brake_power),
        brake_power_per_engine: mix(low.brake_power_per_engine, high.brake_power_per_engine),
        load_fraction: mix(low.load_fraction, high.load_fraction),
        fuel_mass_flow: mix(low.fuel_mass_flow, high.fuel_mass_flow),
        fuel_volume_flow: mix(low.fuel_volume_flow, high.fuel_volume_flow),
        fuel_mass_flow_per_engine: mix(
            low.fuel_mass_flow_per_engine,
            high.fuel_mass_flow_per_engine,
        ),
        fuel_volume_flow_per_engine: mix(
            low.fuel_volume_flow_per_engine,
            high.fuel_volume_flow_per_engine,
        ),
        froude: mix(low.froude, high.froude),
        // Between a valid and an invalid point only the valid side's own speed is vouched for.
        in_method_range: low.in_method_range && high.in_method_range,
        // The farther-out formula of the two, so an interpolated point is never called the
        // method's own when one end is not.
        regime: if high.regime.is_extrapolation() {
            high.regime
        } else {
            low.regime
        },
    }
}
