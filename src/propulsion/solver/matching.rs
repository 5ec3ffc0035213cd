//! Matching the propeller curve to the engine's full-load envelope.

use super::System;
use super::point::{OperatingPoint, PointFailure};

/// Whether the screw lets the engine reach rated rpm with a little headroom.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Verdict {
    /// The screw absorbs more than the engine gives at rated rpm: it cannot reach rated rpm.
    Over,
    /// Rated rpm is reached with the headroom asked for.
    Matched,
    /// The screw absorbs too little: the engine over-revs and power is wasted.
    Under,
}

/// Limits for the verdict, as fractions of rated power absorbed at rated rpm.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct MatchCriteria {
    /// Absorbed fraction above which the screw is over-propped (common practice: 1.0).
    pub over_above: f64,
    /// Absorbed fraction below which the screw is under-propped (common practice: 0.85).
    pub under_below: f64,
}

impl Default for MatchCriteria {
    fn default() -> Self {
        Self {
            over_above: 1.0,
            under_below: 0.85,
        }
    }
}

/// The match of one screw against the engine.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct MatchResult {
    /// Engine rpm where the propeller curve meets the full-load curve (wide-open throttle), rpm.
    pub meeting_rpm: f64,
    /// Boat speed at the meeting point (top speed), m/s.
    pub top_speed: f64,
    /// The operating point at the meeting point.
    pub top_point: OperatingPoint,
    /// The operating point with the engine at rated rpm (if reachable by the screw model).
    pub rated_point: OperatingPoint,
    /// Brake power absorbed at rated rpm as a fraction of rated power.
    pub absorbed_fraction_at_rated: f64,
    /// The verdict.
    pub verdict: Verdict,
    /// Meeting rpm minus rated rpm: negative is a shortfall (over-propped), rpm.
    pub rpm_margin: f64,
}

/// Finds the boat speed at which the engine turns `engine_rpm` with this screw (m/s).
pub fn point_at_engine_rpm(
    system: &System<'_>,
    engine_rpm: f64,
) -> Result<OperatingPoint, PointFailure> {
    let _ = (system, engine_rpm);
    unimplemented!("solver helper")
}

/// Matches the system's screw against its engine.
pub fn match_engine(
    system: &System<'_>,
    criteria: &MatchCriteria,
) -> Result<MatchResult, PointFailure> {
    let _ = (system, criteria);
    unimplemented!("solver helper")
}
