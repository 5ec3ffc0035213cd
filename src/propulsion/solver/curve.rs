//! The propeller curve: operating points over a speed range for one screw and gear.

use super::System;
use super::point::{OperatingPoint, PointFailure};

/// Operating points over a range of speeds; failures are kept with their speed and reason.
#[derive(Debug, Clone, PartialEq)]
pub struct PropellerCurve {
    /// Each requested speed (m/s) with its point or its failure, in increasing speed.
    pub points: Vec<(f64, Result<OperatingPoint, PointFailure>)>,
}

impl PropellerCurve {
    /// Solves `count` evenly spaced speeds from `min_speed` to `max_speed` (m/s).
    pub fn over_speeds(system: &System<'_>, min_speed: f64, max_speed: f64, count: usize) -> Self {
        let _ = (system, min_speed, max_speed, count);
        unimplemented!("solver helper")
    }
    /// The successfully solved points, in increasing speed.
    pub fn solved(&self) -> impl Iterator<Item = &OperatingPoint> {
        self.points.iter().filter_map(|(_, r)| r.as_ref().ok())
    }
}
