//! The solved results the screen shows, computed once per edit for every variant and cached:
//! the propeller curves, the match against the engine and the cruise point at the target speed.
//! All values are SI (rpm as rpm); the screen converts them only when drawing.

use crate::profile::{BoatDoc, EngineDoc};
use crate::propulsion::Warning;
use crate::propulsion::solver::cruise::cruise_at_speed;
use crate::propulsion::solver::design::{PitchOptions, PitchRecommendation, recommend_pitch};
use crate::propulsion::solver::matching::match_engine;
use crate::propulsion::solver::{CruisePoint, MatchResult, PropellerCurve, Trip, Vessel};
use crate::units::{self, Kind, UnitSystem};

/// Speeds solved per propeller curve (enough for a smooth braille line at 120 columns).
pub const CURVE_POINTS: usize = 64;

/// The results of one screw variant.
#[derive(Debug, Clone, PartialEq)]
pub struct VariantSolution {
    /// The variant's label.
    pub label: String,
    /// The match against the engine, or why it could not be found.
    pub matched: Result<MatchResult, String>,
    /// The cruise point at the target speed, or why it could not be solved.
    pub cruise: Result<CruisePoint, String>,
    /// (engine rpm, brake power W) along the propeller curve.
    pub power_by_rpm: Vec<(f64, f64)>,
    /// (engine rpm, boat speed m/s) along the propeller curve.
    pub speed_by_rpm: Vec<(f64, f64)>,
    /// (engine rpm, fuel volume flow m³/s), up to full load.
    pub fuel_by_rpm: Vec<(f64, f64)>,
    /// (boat speed m/s, range m), up to full load.
    pub range_by_speed: Vec<(f64, f64)>,
    /// Warnings about this screw (model validity range and the like).
    pub warnings: Vec<Warning>,
    /// The first failure along the curve, if any point could not be solved.
    pub curve_failure: Option<String>,
}

/// Everything solved for the document.
#[derive(Debug, Clone, PartialEq)]
pub struct Solved {
    /// The vessel built from the document.
    pub vessel: Vessel,
    /// One entry per variant, in the vessel's order.
    pub variants: Vec<VariantSolution>,
    /// Warnings about the hull, resistance method and engine sheet.
    pub warnings: Vec<Warning>,
    /// The engine's full-load envelope (engine rpm, W).
    pub envelope: Vec<(f64, f64)>,
    /// Sea-trial points (engine rpm, speed over ground m/s).
    pub trial: Vec<(f64, f64)>,
    /// The pitch recommendation for the active variant (default target: rated power at rated
    /// rpm with the service margin), or why there is none.
    pub recommendation: Result<PitchRecommendation, String>,
}

/// The cached solution: solved, or why the document could not be built into a vessel.
#[derive(Debug, Clone, PartialEq)]
pub struct Solution {
    /// The results, or the reason there are none.
    pub result: Result<Solved, String>,
}

impl Solution {
    /// Builds the vessel from `boat` and `engine` and solves every variant.
    pub fn solve(boat: &BoatDoc, engine: &EngineDoc) -> Self {
        let result = super::fields::build_vessel(boat, engine).map(solve_vessel);
        Self { result }
    }

    /// The solved results, if the document built.
    pub fn solved(&self) -> Option<&Solved> {
        self.result.as_ref().ok()
    }

    /// The active variant's results.
    pub fn active(&self) -> Option<&VariantSolution> {
        let s = self.solved()?;
        s.variants.get(s.vessel.active_variant)
    }

    /// The recommended pitch for the active variant, m, when the design core found one.
    pub fn recommended_pitch(&self) -> Option<f64> {
        self.solved()?
            .recommendation
            .as_ref()
            .ok()?
            .recommended_pitch
    }

    /// The recommendation line of the Screw pane, in `system`'s units.
    pub fn recommendation_line(&self, system: UnitSystem) -> Option<String> {
        let rec = match &self.solved()?.recommendation {
            Ok(rec) => rec,
            Err(why) => return Some(format!("No pitch recommendation: {why}")),
        };
        let Some(pitch) = rec.recommended_pitch else {
            return Some(format!(
                "No pitch found for rated power at rated rpm ({:?})",
                rec.stop
            ));
        };
        let change = rec.change.unwrap_or(0.0);
        let sign = if change >= 0.0 { "+" } else { "−" };
        let limit = match rec.within_repitch_limit {
            Some(true) => "within re-pitch limit",
            Some(false) => "BEYOND re-pitch limit: new screw",
            None => "",
        };
        Some(format!(
            "Recommended pitch {} ({sign}{}, {limit}); p adds it",
            units::format(pitch, Kind::ScrewLength, system),
            units::format(change.abs(), Kind::ScrewLength, system),
        ))
    }
}

/// Solves every variant of `vessel`.
pub fn solve_vessel(vessel: Vessel) -> Solved {
    let mut warnings = vessel.resistance.warnings();
    warnings.extend(vessel.resistance.hull.warnings.iter().cloned());
    match vessel.engine.validate() {
        Ok(w) => warnings.extend(w),
        Err(e) => warnings.push(Warning::new("engine sheet", e.to_string())),
    }
    let variants = (0..vessel.variants.len())
        .map(|i| solve_variant(&vessel, i))
        .collect();
    let envelope = vessel.engine.full_load_power.points.clone();
    let trial = vessel
        .trial
        .iter()
        .map(|run| (run.engine_rpm, run.speed_over_ground))
        .collect();
    let recommendation = recommend_pitch(&vessel, vessel.active_variant, &PitchOptions::default())
        .map_err(|e| e.to_string());
    Solved {
        variants,
        warnings,
        envelope,
        trial,
        recommendation,
        vessel,
    }
}

fn solve_variant(vessel: &Vessel, index: usize) -> VariantSolution {
    let system = vessel.system(index);
    let trip: Trip = vessel.trip;
    let matched = match_engine(&system, &vessel.match_criteria).map_err(|e| e.to_string());
    let cruise = cruise_at_speed(&system, &trip, trip.target_speed).map_err(|e| e.to_string());
    // Solve a little past the meeting point so the curve visibly crosses the envelope.
    let top = match &matched {
        Ok(m) if m.top_speed > 0.0 => m.top_speed,
        _ => trip.target_speed.max(0.5) * 1.5,
    };
    let meeting_rpm = matched
        .as_ref()
        .map(|m| m.meeting_rpm)
        .unwrap_or(f64::INFINITY);
    let curve = PropellerCurve::over_speeds(&system, 0.12 * top, 1.12 * top, CURVE_POINTS);
    let curve_failure = curve
        .points
        .iter()
        .find_map(|(_, r)| r.as_ref().err().map(|e| e.to_string()));
    let mut solution = VariantSolution {
        label: vessel.variants[index].label.clone(),
        matched,
        cruise,
        power_by_rpm: Vec::with_capacity(CURVE_POINTS),
        speed_by_rpm: Vec::with_capacity(CURVE_POINTS),
        fuel_by_rpm: Vec::with_capacity(CURVE_POINTS),
        range_by_speed: Vec::with_capacity(CURVE_POINTS),
        warnings: vessel.variants[index].screw.warnings(),
        curve_failure,
    };
    for point in curve.solved() {
        solution
            .power_by_rpm
            .push((point.engine_rpm, point.brake_power));
        solution.speed_by_rpm.push((point.engine_rpm, point.speed));
        if point.engine_rpm <= meeting_rpm * 1.0001 {
            solution
                .fuel_by_rpm
                .push((point.engine_rpm, point.fuel_volume_flow));
            if let Ok(c) = CruisePoint::from_point(&trip, *point) {
                solution.range_by_speed.push((point.speed, c.range));
            }
        }
    }
    solution
}
