//! The solved results the screen shows, computed once per edit for every variant and cached:
//! the propeller curves, the match against the engine and the cruise point at the target speed.
//! All values are SI (rpm as rpm); the screen converts them only when drawing.

use crate::profile::{BoatDoc, EngineDoc};
use crate::propulsion::Warning;
use crate::propulsion::screw::cavitation::CavitationReport;
use crate::propulsion::solver::OperatingPoint;

use crate::propulsion::solver::cruise::cruise_at_speed;
use crate::propulsion::solver::matching::match_engine;
use crate::propulsion::solver::pitch::{PitchOptions, PitchRecommendation, recommend_pitch};
use crate::propulsion::solver::shaft::{ShaftCheck, duty_note};
use crate::propulsion::solver::{
    CruisePoint, MatchResult, MethodSpread, PropellerCurve, Trip, Vessel,
};
pub use crate::study::checks::CheckPoint;
use crate::study::checks::{cavitation, shaft_check};
use crate::study::{CheckInputs, Study};
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
    /// (engine rpm, boat speed m/s) of the first curve point outside the resistance method's
    /// range (the core's `in_method_range`): the curve is drawn differently from there on.
    pub unreliable_from: Option<(f64, f64)>,
    /// The other resistance method's figures beside the chosen one's, when both run.
    pub method_spread: Option<MethodSpread>,
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
    /// The load case the recommendation was made for ("light", "half", "full").
    pub recommendation_load: String,
    /// The displacement mass of that load case, kg.
    pub recommendation_mass: Option<f64>,
    /// Cavitation, shaft and duty checks of the active variant.
    pub checks: Checks,
}

/// The active variant's cavitation, shaft and engine-duty checks, solved with every edit.
#[derive(Debug, Clone, PartialEq)]
pub struct Checks {
    /// Cavitation and blade loading at the target speed and at top speed, or why not checked.
    pub cavitation: Vec<(CheckPoint, Result<CavitationReport, String>)>,
    /// Depth of the shaft centreline below the waterline from the boat file, m.
    pub shaft_immersion: Option<f64>,
    /// The shaft check against the boat's shaft, or why it could not be made.
    pub shaft: Result<ShaftCheck, String>,
    /// A note on the shaft material, when it was assumed (the report's rule).
    pub shaft_note: Option<String>,
    /// The engine sheet's duty note beside the load at the target speed.
    pub duty: Option<String>,
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
        let result = Study::of_documents(boat, engine).map(|study| {
            // The vessel is built for the file's default load, so that is the recommendation's.
            let (load, _) = study.default_load();
            let inputs = study.inputs.clone();
            let mut solved = solve_vessel(study.vessel);
            solved.checks = Checks::with_inputs(&solved, &inputs);
            solved.recommendation_load = load;
            solved
        });
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

    /// The loading condition the recommendation was made for in a few words, in `system`'s
    /// units, e.g. "half load 4.60 t, margin 15 %, fouling 10 %, calibrated ×1.114".
    pub fn recommendation_condition(&self, system: UnitSystem) -> Option<String> {
        let solved = self.solved()?;
        let margins = solved.vessel.resistance.margins;
        let mass = solved
            .recommendation_mass
            .map(|m| format!(" {}", units::format(m, Kind::Mass, system)))
            .unwrap_or_default();
        let mut text = format!(
            "{} load{mass}, margin {:.0} %, fouling {:.0} %",
            solved.recommendation_load,
            margins.service * 100.0,
            margins.fouling * 100.0
        );
        if (margins.resistance_factor - 1.0).abs() > 1e-9 {
            text.push_str(&format!(", calibrated ×{:.3}", margins.resistance_factor));
        }
        Some(text)
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
        let unreliable = if rec.in_method_range == Some(false) {
            " UNRELIABLE, a sea trial decides;"
        } else {
            ""
        };
        Some(format!(
            "Recommended pitch {} ({sign}{}, {limit}) for {} load;{unreliable} p adds it",
            units::format(pitch, Kind::ScrewLength, system),
            units::format(change.abs(), Kind::ScrewLength, system),
            self.solved()?.recommendation_load,
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
    let mut solved = Solved {
        variants,
        warnings,
        envelope,
        trial,
        recommendation,
        recommendation_load: String::new(),
        recommendation_mass: None,
        checks: Checks {
            cavitation: Vec::new(),
            shaft_immersion: None,
            shaft: Err("no boat file to read the shaft from".into()),
            shaft_note: None,
            duty: None,
        },
        vessel,
    };
    solved.recommendation_load = solved
        .recommendation
        .as_ref()
        .map(|r| r.condition.label.clone())
        .unwrap_or_default();
    // The mass the solver made the recommendation for, not the document's.
    solved.recommendation_mass = solved
        .recommendation
        .as_ref()
        .ok()
        .map(|r| r.condition.displacement_volume * solved.vessel.resistance.water.density);
    solved
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
        unreliable_from: curve
            .solved()
            .find(|p| !p.in_method_range)
            .map(|p| (p.engine_rpm, p.speed)),
        method_spread: vessel.method_spread(index),
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

impl Checks {
    /// The checks of the active variant of `solved`, with the installation data of `boat`.
    pub fn of(solved: &Solved, boat: &BoatDoc) -> Self {
        Self::with_inputs(solved, &CheckInputs::of(boat))
    }

    /// The checks of the active variant of `solved` with the study's installation `inputs`.
    pub fn with_inputs(solved: &Solved, inputs: &CheckInputs) -> Self {
        let vessel = &solved.vessel;
        let index = vessel.active_variant;
        let geometry = *vessel.variants[index].screw.geometry();
        let shaft_immersion = inputs.shaft_immersion;
        // Without an immersion the static pressure at the screw is unknown: the check is not
        // made rather than guessed, as in the headless report.
        let check = |point: &OperatingPoint| -> Result<CavitationReport, String> {
            let immersion = shaft_immersion.ok_or_else(|| {
                "the boat file gives no installation.shaft_immersion (depth of the shaft centreline)"
                    .to_string()
            })?;
            cavitation(vessel, geometry, point, immersion)
        };
        let mut cavitation = Vec::new();
        let mut duty = None;
        if let Some(active) = solved.variants.get(index) {
            cavitation.push((
                CheckPoint::Target,
                active.cruise.as_ref().map_err(Clone::clone).and_then(|c| {
                    duty = Some(duty_note(
                        &vessel.engine,
                        c.point.engine_rpm,
                        c.point.brake_power,
                    ));
                    check(&c.point)
                }),
            ));
            cavitation.push((
                CheckPoint::Top,
                active
                    .matched
                    .as_ref()
                    .map_err(Clone::clone)
                    .and_then(|m| check(&m.top_point)),
            ));
        }
        let (shaft, shaft_note) = shaft_check(vessel, inputs);
        Self {
            cavitation,
            shaft_immersion,
            shaft,
            shaft_note,
            duty,
        }
    }

    /// Whether any cavitation or loading check failed at either point.
    pub fn cavitation_failed(&self) -> bool {
        self.cavitation
            .iter()
            .any(|(_, r)| r.as_ref().is_ok_and(|r| !r.all_passed()))
    }

    /// Whether the boat's shaft is smaller than the minimum.
    pub fn shaft_too_small(&self) -> bool {
        self.shaft
            .as_ref()
            .is_ok_and(|s| s.existing_diameter.is_some_and(|d| d < s.min_diameter))
    }
}
