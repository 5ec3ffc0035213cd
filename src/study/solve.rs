//! Solving the screw variants, defined once for the report and the screen: the match against
//! the engine, the cruise point at the target speed, the engine-duty note there, the operating
//! table at chosen engine speeds and the propeller curves. One [`VariantSolution`] per variant;
//! the report lays out its table, the TUI draws its curves. All values are SI (rpm as rpm).

use super::checks::{CheckPoint, cavitation, shaft_check};
use super::{CheckInputs, Study};
use crate::profile::BoatDoc;
use crate::propulsion::Warning;
use crate::propulsion::hull::interaction::small_craft_warning;
use crate::propulsion::screw::ScrewGeometry;
use crate::propulsion::screw::cavitation::CavitationReport;
use crate::propulsion::solver::cruise::{cruise_at_rpm, cruise_at_speed};
use crate::propulsion::solver::matching::match_engine;
use crate::propulsion::solver::pitch::{PitchOptions, PitchRecommendation, recommend_pitch};
use crate::propulsion::solver::shaft::{ShaftCheck, duty_note};
use crate::propulsion::solver::{
    CruisePoint, MatchResult, MethodSpread, OperatingPoint, PropellerCurve, Vessel,
};

/// Speeds solved per propeller curve (enough for a smooth braille line at 120 columns).
pub const CURVE_POINTS: usize = 64;

/// More rows than this in one operating table is a mistake in the step.
const MAX_ROWS: usize = 400;

/// The rpm step of an operating table is not usable.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[error("rpm step {0} is not usable: expected a positive number giving at most 400 rows")]
pub struct BadStep(pub f64);

/// A round rpm step giving about ten rows between idle and rated, rpm.
pub fn default_step(idle_rpm: f64, rated_rpm: f64) -> f64 {
    let span = (rated_rpm - idle_rpm).max(1.0);
    [25.0, 50.0, 100.0, 200.0, 250.0, 500.0, 1000.0]
        .into_iter()
        .find(|s| span / s <= 14.0)
        .unwrap_or(1000.0)
}

/// Engine speeds (rpm) from idle to rated in `step`: the round multiples of the step plus both
/// ends.
pub fn rpm_steps(idle_rpm: f64, rated_rpm: f64, step: f64) -> Result<Vec<f64>, BadStep> {
    if !(step.is_finite() && step > 0.0) || (rated_rpm - idle_rpm) / step > MAX_ROWS as f64 {
        return Err(BadStep(step));
    }
    let mut steps = vec![idle_rpm];
    let mut k = (idle_rpm / step).floor() + 1.0;
    while k * step < rated_rpm - 1e-6 {
        if k * step > idle_rpm + 1e-6 {
            steps.push(k * step);
        }
        k += 1.0;
    }
    if rated_rpm > idle_rpm {
        steps.push(rated_rpm);
    }
    Ok(steps)
}

/// What to solve beyond the match and the cruise point at the target speed.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct SolveOptions {
    /// Engine speeds of the operating table, rpm (empty: no table).
    pub rpm_rows: Vec<f64>,
    /// Speeds solved per propeller curve (0: no curve).
    pub curve_points: usize,
    /// Whether the other resistance method's figures are solved for the active variant only
    /// (the screen shows them for that one; each costs a second match).
    pub spread_for_active_only: bool,
    /// Whether to leave the other resistance method's figures out altogether (the shortlist
    /// shows none, and each costs a second resistance model and two matches).
    pub without_method_spread: bool,
}

impl SolveOptions {
    /// What the screen draws: the propeller curves, no table.
    pub fn curves() -> Self {
        Self {
            rpm_rows: Vec::new(),
            curve_points: CURVE_POINTS,
            spread_for_active_only: true,
            without_method_spread: false,
        }
    }

    /// What a report lays out: the operating table at `rpm_rows` (rpm), no curves.
    pub fn table(rpm_rows: Vec<f64>) -> Self {
        Self {
            rpm_rows,
            curve_points: 0,
            spread_for_active_only: false,
            without_method_spread: false,
        }
    }
}

/// One row of an operating table: an engine rpm and the cruise point there, or why not.
#[derive(Debug, Clone, PartialEq)]
pub struct RpmRow {
    /// Engine speed asked for, rpm.
    pub engine_rpm: f64,
    /// The point, or the solver's reason for not giving one.
    pub outcome: Result<CruisePoint, String>,
}

/// The results of one screw variant, read by the report and the screen alike.
#[derive(Debug, Clone, PartialEq)]
pub struct VariantSolution {
    /// The variant's label.
    pub label: String,
    /// Its geometry.
    pub geometry: ScrewGeometry,
    /// The match against the engine, or why it could not be found (or shown).
    pub matched: Result<MatchResult, String>,
    /// The cruise point at the target speed, or why it could not be solved (or shown).
    pub cruise: Result<CruisePoint, String>,
    /// The engine sheet's duty rating beside the load at the target speed, if solved.
    pub duty: Option<String>,
    /// The operating table at the engine speeds asked for (empty when none were).
    pub rows: Vec<RpmRow>,
    /// (engine rpm, brake power of each engine W) along the propeller curve: what the engine's
    /// own full-load curve is drawn against (the boat's on a single screw).
    pub power_by_rpm: Vec<(f64, f64)>,
    /// (engine rpm, boat speed m/s) along the propeller curve.
    pub speed_by_rpm: Vec<(f64, f64)>,
    /// (engine rpm, fuel volume flow m³/s), up to full load.
    pub fuel_by_rpm: Vec<(f64, f64)>,
    /// (boat speed m/s, range m), up to full load.
    pub range_by_speed: Vec<(f64, f64)>,
    /// Warnings about this screw (model validity range and the like).
    pub warnings: Vec<Warning>,
    /// The small-craft warning of the interaction method at the target speed, if it gives one.
    pub interaction_warning: Option<Warning>,
    /// Set when the screw is outside its model's validity range: its results are extrapolated.
    pub extrapolated: bool,
    /// The first failure along the curve, if any point could not be solved.
    pub curve_failure: Option<String>,
    /// (engine rpm, boat speed m/s) of the first curve point outside the resistance method's
    /// range (the core's `in_method_range`): the curve is drawn differently from there on.
    pub unreliable_from: Option<(f64, f64)>,
    /// The other resistance method's figures beside the chosen one's, when both run.
    pub method_spread: Option<MethodSpread>,
}

/// The reason a cruise point cannot be shown, if any of its numbers is not finite.
fn checked(point: CruisePoint) -> Result<CruisePoint, String> {
    let p = &point.point;
    for (value, field) in [
        (p.speed, "speed"),
        (p.resistance, "resistance"),
        (p.thrust, "thrust"),
        (p.advance_ratio, "advance ratio"),
        (p.thrust_coefficient, "KT"),
        (p.torque_coefficient, "KQ"),
        (p.open_water_efficiency, "open-water efficiency"),
        (p.screw_rps, "screw speed"),
        (p.engine_rpm, "engine speed"),
        (p.delivered_power, "delivered power"),
        (p.brake_power, "brake power"),
        (p.load_fraction, "engine load"),
        (p.fuel_volume_flow, "fuel rate"),
        (point.fuel_per_distance, "fuel per distance"),
        (point.range, "range"),
    ] {
        finite(value, field).map_err(|e| format!("not shown: {e}"))?;
    }
    Ok(point)
}

/// The reason a match cannot be shown, if any of its numbers is not finite.
fn checked_match(m: MatchResult) -> Result<MatchResult, String> {
    for (value, field) in [
        (m.meeting_rpm, "meeting rpm"),
        (m.top_speed, "top speed"),
        (m.absorbed_fraction_at_rated, "power absorbed at rated rpm"),
        (m.rpm_margin, "rpm margin"),
    ] {
        finite(value, field).map_err(|e| format!("match not shown: {e}"))?;
    }
    Ok(m)
}

/// `value`, or the words saying `field` is not a finite number (the report's JSON rule).
fn finite(value: f64, field: &str) -> Result<f64, String> {
    if value.is_finite() {
        Ok(value)
    } else {
        // Named, never printed: the screen and the report never show NaN.
        Err(format!("{field} is not a finite number"))
    }
}

/// Solves variant `index` of `vessel`: match, cruise at the target speed, duty, and what
/// `options` asks for beyond them.
pub fn solve_variant(vessel: &Vessel, index: usize, options: &SolveOptions) -> VariantSolution {
    let variant = &vessel.variants[index];
    let system = vessel.system(index);
    let trip = vessel.trip;
    let matched = match_engine(&system, &vessel.match_criteria)
        .map_err(|e| e.to_string())
        .and_then(checked_match);
    let cruise = cruise_at_speed(&system, &trip, trip.target_speed)
        .map_err(|e| e.to_string())
        .and_then(checked);
    let duty = cruise.as_ref().ok().map(|c| {
        duty_note(
            &vessel.engine,
            c.point.engine_rpm,
            c.point.brake_power_per_engine,
        )
    });
    let rows = options
        .rpm_rows
        .iter()
        .map(|&rpm| RpmRow {
            engine_rpm: rpm,
            outcome: cruise_at_rpm(&system, &trip, rpm)
                .map_err(|e| e.to_string())
                .and_then(checked),
        })
        .collect();
    let factors = vessel.interaction.at_speed(
        &vessel.resistance.hull,
        &vessel.resistance.water,
        &system.screw_at_stern(),
        trip.target_speed,
    );
    let warnings = variant.screw.warnings();
    let mut solution = VariantSolution {
        label: variant.label.clone(),
        geometry: *variant.screw.geometry(),
        matched,
        cruise,
        duty,
        rows,
        power_by_rpm: Vec::new(),
        speed_by_rpm: Vec::new(),
        fuel_by_rpm: Vec::new(),
        range_by_speed: Vec::new(),
        extrapolated: !warnings.is_empty(),
        warnings,
        interaction_warning: small_craft_warning(&vessel.interaction, &factors),
        curve_failure: None,
        unreliable_from: None,
        method_spread: (!options.without_method_spread
            && (!options.spread_for_active_only || index == vessel.active_variant))
            .then(|| vessel.method_spread(index))
            .flatten(),
    };
    if options.curve_points > 0 {
        add_curves(&mut solution, vessel, index, options.curve_points);
    }
    solution
}

/// The propeller curves of variant `index`, solved a little past the meeting point so the
/// curve visibly crosses the engine's envelope.
fn add_curves(solution: &mut VariantSolution, vessel: &Vessel, index: usize, points: usize) {
    let system = vessel.system(index);
    let trip = vessel.trip;
    let top = match &solution.matched {
        Ok(m) if m.top_speed > 0.0 => m.top_speed,
        _ => trip.target_speed.max(0.5) * 1.5,
    };
    let meeting_rpm = solution
        .matched
        .as_ref()
        .map(|m| m.meeting_rpm)
        .unwrap_or(f64::INFINITY);
    let curve = PropellerCurve::over_speeds(&system, 0.12 * top, 1.12 * top, points);
    solution.curve_failure = curve
        .points
        .iter()
        .find_map(|(_, r)| r.as_ref().err().map(|e| e.to_string()));
    solution.unreliable_from = curve
        .solved()
        .find(|p| !p.in_method_range)
        .map(|p| (p.engine_rpm, p.speed));
    for point in curve.solved() {
        solution
            .power_by_rpm
            .push((point.engine_rpm, point.brake_power_per_engine));
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
}

/// Everything solved for a boat on screen: every variant with its curves, and the active
/// variant's pitch recommendation and checks.
#[derive(Debug, Clone, PartialEq)]
pub struct Solved {
    /// The vessel solved.
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

/// The active variant's cavitation, shaft and engine-duty checks.
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

/// Solves every variant of `vessel` with `options`, and the active variant's pitch
/// recommendation; the checks are left unmade (no installation data).
pub fn solve_vessel(vessel: Vessel, options: &SolveOptions) -> Solved {
    let mut warnings = vessel.resistance.warnings();
    warnings.extend(vessel.resistance.hull.warnings.iter().cloned());
    match vessel.engine.validate() {
        Ok(w) => warnings.extend(w),
        Err(e) => warnings.push(Warning::new("engine sheet", e.to_string())),
    }
    let variants = (0..vessel.variants.len())
        .map(|i| solve_variant(&vessel, i, options))
        .collect();
    let envelope = vessel.engine.full_load_power.points.clone();
    let trial = vessel
        .trial
        .iter()
        .map(|run| (run.engine_rpm, run.speed_over_ground))
        .collect();
    let recommendation = recommend_pitch(&vessel, vessel.active_variant, &PitchOptions::default())
        .map_err(|e| e.to_string());
    let recommendation_load = recommendation
        .as_ref()
        .map(|r| r.condition.label.clone())
        .unwrap_or_default();
    // The mass the solver made the recommendation for, not the document's.
    let recommendation_mass = recommendation
        .as_ref()
        .ok()
        .map(|r| r.condition.displacement_volume * vessel.resistance.water.density);
    Solved {
        variants,
        warnings,
        envelope,
        trial,
        recommendation,
        recommendation_load,
        recommendation_mass,
        checks: Checks {
            cavitation: Vec::new(),
            shaft_immersion: None,
            shaft: Err("no boat file to read the shaft from".into()),
            shaft_note: None,
            duty: None,
        },
        vessel,
    }
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
            duty = active.duty.clone();
            cavitation.push((
                CheckPoint::Target,
                active
                    .cruise
                    .as_ref()
                    .map_err(Clone::clone)
                    .and_then(|c| check(&c.point)),
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

impl Study {
    /// Variant `index` solved with `options`.
    pub fn solve_variant(&self, index: usize, options: &SolveOptions) -> VariantSolution {
        solve_variant(&self.vessel, index, options)
    }

    /// The variants at `indices` solved with `options`, in that order.
    pub fn solve_variants(
        &self,
        indices: &[usize],
        options: &SolveOptions,
    ) -> Vec<VariantSolution> {
        indices
            .iter()
            .map(|&i| solve_variant(&self.vessel, i, options))
            .collect()
    }

    /// Every variant solved with `options`, with the active variant's pitch recommendation
    /// (for the file's default load) and checks with the study's installation data.
    pub fn solve(&self, options: &SolveOptions) -> Solved {
        self.clone().into_solved(options)
    }

    /// [`Study::solve`] without copying the vessel (the screen solves once per edit).
    pub fn into_solved(self, options: &SolveOptions) -> Solved {
        // The vessel is built for the file's default load, so that is the recommendation's.
        let (load, _) = self.default_load();
        let mut solved = solve_vessel(self.vessel, options);
        solved.checks = Checks::with_inputs(&solved, &self.inputs);
        solved.recommendation_load = load;
        solved
    }

    /// The operating-table engine speeds from idle to rated in `step` rpm (the default step
    /// when `None`).
    pub fn rpm_rows(&self, step: Option<f64>) -> Result<Vec<f64>, BadStep> {
        let engine = &self.vessel.engine;
        let step = step.unwrap_or_else(|| default_step(engine.idle_rpm, engine.rated_rpm));
        rpm_steps(engine.idle_rpm, engine.rated_rpm, step)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finite_rejects_nan_and_infinity_without_printing_them() {
        assert_eq!(finite(1.5, "kt"), Ok(1.5));
        let why = finite(f64::NAN, "kt").unwrap_err();
        assert!(why.contains("kt") && !why.contains("NaN"), "{why}");
        assert!(finite(f64::INFINITY, "kq").is_err());
    }

    #[test]
    fn steps_run_from_idle_to_rated_on_round_numbers() {
        let s = rpm_steps(750.0, 2600.0, 200.0).unwrap();
        assert_eq!(s.first(), Some(&750.0));
        assert_eq!(s[1], 800.0);
        assert_eq!(s.last(), Some(&2600.0));
        assert!(s.windows(2).all(|w| w[1] > w[0]));
        assert_eq!(rpm_steps(800.0, 2600.0, 200.0).unwrap()[1], 1000.0);
        assert!(rpm_steps(800.0, 2600.0, 0.0).is_err());
        assert!(rpm_steps(800.0, 2600.0, f64::NAN).is_err());
        assert!(rpm_steps(800.0, 2600.0, 0.5).is_err());
    }

    #[test]
    fn default_step_gives_a_readable_table() {
        assert_eq!(default_step(700.0, 2600.0), 200.0);
        assert_eq!(default_step(600.0, 1800.0), 100.0);
        assert_eq!(default_step(900.0, 3800.0), 250.0);
    }
}
