//! Design: the pitch that meets a chosen target, and sweeps of diameter, gear, blades and area.
//!
//! The pitch search is a bracketed root over pitch (Brent 1973): the brake power the propeller
//! curve asks for at the target engine rpm rises monotonically with pitch, so the root of
//! `absorbed(pitch) / target − 1` is unique inside a bracket. Each trial pitch rebuilds the
//! B-series screw, because its polynomials are collapsed per geometry.

use super::cruise::cruise_at_speed;
use super::matching::{MatchResult, Verdict, match_engine, point_at_engine_rpm};
use super::point::PointFailure;
use super::{Installation, System, Vessel};
use crate::propulsion::Warning;
use crate::propulsion::hull::SpeedValidity;
use crate::propulsion::numeric::{self, RootOutcome};
use crate::propulsion::screw::{BSeriesScrew, ScrewError, ScrewGeometry, ScrewModel};
use thiserror::Error;

/// One inch, m (exact by definition; NIST SP 811 appendix B).
pub const INCH: f64 = 0.0254;

/// The usual re-pitch limit of ±2 in, m (common practice: beyond it the blades are weakened).
pub const DEFAULT_REPITCH_LIMIT: f64 = 2.0 * INCH;

/// How far a propeller shop may re-pitch a screw.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct RepitchLimit {
    /// Largest change of pitch, m (common practice: ±2 in).
    pub length: f64,
    /// An optional further limit as a fraction of the current pitch (a 12 in screw cannot give
    /// up as much as a 21 in one); the smaller of the two applies.
    pub fraction: Option<f64>,
}

impl Default for RepitchLimit {
    fn default() -> Self {
        Self {
            length: DEFAULT_REPITCH_LIMIT,
            fraction: None,
        }
    }
}

impl RepitchLimit {
    /// The limit for a screw of `current_pitch` (m): the smaller of the two limits, m.
    pub fn for_pitch(&self, current_pitch: f64) -> f64 {
        match self.fraction {
            Some(fraction) => self.length.min(fraction * current_pitch),
            None => self.length,
        }
    }

    /// Checks the length is finite and at least 0 and the fraction above 0 and below 1.
    pub fn check(&self) -> Result<(), DesignError> {
        if !(self.length.is_finite() && self.length >= 0.0) {
            return Err(DesignError::BadInput {
                field: "re-pitch limit",
                value: self.length,
                expected: "a length of 0 m or more",
            });
        }
        if let Some(fraction) = self.fraction
            && !(fraction.is_finite() && fraction > 0.0 && fraction < 1.0)
        {
            return Err(DesignError::BadInput {
                field: "re-pitch limit as a fraction of pitch",
                value: fraction,
                expected: "a fraction above 0 and below 1",
            });
        }
        Ok(())
    }
}

/// The caution shown beside every pitch recommendation.
pub const PITCH_CAUTION: &str = "Estimate from published methods and the boat's inputs: confirm with the propeller shop \
     and the engine maker's installation limits before re-pitching; a licensed marine surveyor \
     or naval architect has the last word.";

/// Why a design calculation could not be made at all (an unsolved search is not an error).
#[derive(Debug, Clone, PartialEq, Error)]
pub enum DesignError {
    /// The variant index is past the boat's list of screws.
    #[error("screw variant {index} does not exist: the boat has {count} variants")]
    NoSuchVariant {
        /// The index asked for.
        index: usize,
        /// How many variants the boat has.
        count: usize,
    },
    /// A user open-water table holds for its own pitch only, so pitch cannot be varied.
    #[error(
        "variant '{0}' is described by an open-water table, which holds for its own geometry only: a B-series screw is needed to search pitch, diameter, blades or area"
    )]
    NotBSeries(String),
    /// An option or input value is outside what the calculation accepts.
    #[error("{field} = {value} is not valid: {expected}")]
    BadInput {
        /// The field's name.
        field: &'static str,
        /// The value given (SI).
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// A trial screw could not be built.
    #[error("trial screw: {0}")]
    Screw(#[from] ScrewError),
    /// An operating point needed for the report could not be solved.
    #[error("operating point: {0}")]
    Point(#[from] PointFailure),
}

/// What the propeller curve should meet at the recommended pitch.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum PitchTarget {
    /// Meet the full-load curve at rated rpm plus the boat's own light-running margin
    /// ([`super::MatchCriteria::light_running`], a fraction of rated rpm): the default.
    #[default]
    Headroom,
    /// Absorb `fraction` of rated power at rated rpm (1.0 = 100 %), with the service margin
    /// already in the resistance model.
    RatedPower {
        /// Fraction of rated power to absorb at rated rpm.
        fraction: f64,
    },
    /// Meet the full-load curve at rated rpm + `rpm_margin` (a light-running screw), rpm.
    LightRunning {
        /// Engine rpm above rated at which the curves should meet, rpm.
        rpm_margin: f64,
    },
}

impl PitchTarget {
    /// The engine rpm and brake power (W) the propeller curve must pass through.
    pub fn point(&self, vessel: &Vessel) -> Result<TargetPoint, DesignError> {
        let engine = &vessel.engine;
        let (engine_rpm, brake_power) = match *self {
            PitchTarget::Headroom => {
                let margin = vessel.match_criteria.light_running;
                if !(margin.is_finite() && (0.0..0.5).contains(&margin)) {
                    return Err(DesignError::BadInput {
                        field: "light-running margin",
                        value: margin,
                        expected: "a fraction of rated rpm from 0 to below 0.5",
                    });
                }
                let rpm = engine.rated_rpm * (1.0 + margin);
                (rpm, engine.full_load_power_at(rpm))
            }
            PitchTarget::RatedPower { fraction } => {
                if !(fraction.is_finite() && fraction > 0.0 && fraction <= 1.5) {
                    return Err(DesignError::BadInput {
                        field: "target fraction of rated power",
                        value: fraction,
                        expected: "a fraction above 0 and at most 1.5",
                    });
                }
                (engine.rated_rpm, fraction * engine.rated_power())
            }
            PitchTarget::LightRunning { rpm_margin } => {
                if !(rpm_margin.is_finite() && rpm_margin.abs() < 0.5 * engine.rated_rpm) {
                    return Err(DesignError::BadInput {
                        field: "light-running rpm margin",
                        value: rpm_margin,
                        expected: "a finite rpm smaller than half the rated rpm",
                    });
                }
                let rpm = engine.rated_rpm + rpm_margin;
                (rpm, engine.full_load_power_at(rpm))
            }
        };
        if !(brake_power.is_finite() && brake_power > 0.0 && engine_rpm > 0.0) {
            return Err(DesignError::BadInput {
                field: "target brake power",
                value: brake_power,
                expected: "a positive power from the engine's full-load curve",
            });
        }
        Ok(TargetPoint {
            engine_rpm,
            brake_power,
        })
    }

    /// A short description of the target, e.g. "100 % of rated power at rated rpm".
    pub fn describe(&self) -> String {
        match *self {
            PitchTarget::Headroom => {
                "meet the full-load curve at rated rpm plus the boat's light-running margin"
                    .to_string()
            }
            PitchTarget::RatedPower { fraction } => {
                format!(
                    "absorb {:.0} % of rated power at rated rpm",
                    fraction * 100.0
                )
            }
            PitchTarget::LightRunning { rpm_margin } => {
                format!(
                    "meet the full-load curve at rated rpm {rpm_margin:+.0} rpm (light running)"
                )
            }
        }
    }
}

/// The engine rpm and brake power the propeller curve must pass through.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct TargetPoint {
    /// Engine speed, rpm.
    pub engine_rpm: f64,
    /// Brake power, W.
    pub brake_power: f64,
}

/// How the pitch search stopped (like argmin's termination reasons).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[serde(tag = "status", content = "reason", rename_all = "snake_case")]
pub enum SearchStop {
    /// The bracket shrank below the tolerance or the residual vanished.
    Converged,
    /// No pitch inside the searched range meets the target (or the range could not be solved).
    BracketLost(String),
    /// The iteration limit was reached before convergence.
    IterationsExhausted,
}

impl SearchStop {
    /// Whether the search found its answer.
    pub fn is_converged(&self) -> bool {
        matches!(self, SearchStop::Converged)
    }
}

/// Settings of the pitch search.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PitchOptions {
    /// The target to meet.
    pub target: PitchTarget,
    /// The re-pitch limit, if not the boat's own ([`Vessel::repitch`]).
    pub repitch: Option<RepitchLimit>,
    /// Smallest pitch ratio P/D searched (B-series validity starts at 0.5).
    pub min_pitch_ratio: f64,
    /// Largest pitch ratio P/D searched (B-series validity ends at 1.4).
    pub max_pitch_ratio: f64,
    /// Pitch tolerance at which the search stops, m.
    pub pitch_tolerance: f64,
    /// Relative power residual at which the search stops.
    pub power_tolerance: f64,
    /// Iteration limit of the root finder.
    pub max_iterations: u32,
}

impl Default for PitchOptions {
    fn default() -> Self {
        Self {
            target: PitchTarget::default(),
            repitch: None,
            min_pitch_ratio: 0.5,
            max_pitch_ratio: 1.4,
            pitch_tolerance: 1e-5,
            power_tolerance: 1e-5,
            max_iterations: 60,
        }
    }
}

impl PitchOptions {
    fn validate(&self) -> Result<(), DesignError> {
        let bad = |field, value, expected| {
            Err(DesignError::BadInput {
                field,
                value,
                expected,
            })
        };
        if let Some(limit) = self.repitch {
            limit.check()?;
        }
        if !(self.min_pitch_ratio.is_finite() && self.min_pitch_ratio > 0.05) {
            return bad(
                "smallest pitch ratio",
                self.min_pitch_ratio,
                "a P/D above 0.05",
            );
        }
        if !(self.max_pitch_ratio.is_finite() && self.max_pitch_ratio > self.min_pitch_ratio) {
            return bad(
                "largest pitch ratio",
                self.max_pitch_ratio,
                "a P/D above the smallest",
            );
        }
        if !(self.pitch_tolerance.is_finite() && self.pitch_tolerance > 0.0) {
            return bad("pitch tolerance", self.pitch_tolerance, "a positive length");
        }
        if !(self.power_tolerance.is_finite() && self.power_tolerance > 0.0) {
            return bad(
                "power tolerance",
                self.power_tolerance,
                "a positive fraction",
            );
        }
        if self.max_iterations == 0 {
            return bad("iteration limit", 0.0, "at least 1");
        }
        Ok(())
    }
}

/// The loading condition a recommendation or a what-if case was made for.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ConditionSummary {
    /// The condition's name, e.g. "as loaded in the boat file" or "full load".
    pub label: String,
    /// Displacement volume, m³.
    pub displacement_volume: f64,
    /// Service margin on total resistance, fraction.
    pub service_margin: f64,
    /// Fouling as added friction, fraction of friction.
    pub fouling: f64,
    /// Sea-trial resistance factor applied (1.0 = none).
    pub resistance_factor: f64,
}

impl ConditionSummary {
    /// The condition of the vessel as it stands, under `label`.
    pub fn of(vessel: &Vessel, label: impl Into<String>) -> Self {
        let margins = vessel.resistance.margins;
        Self {
            label: label.into(),
            displacement_volume: vessel.resistance.hull.input.displacement_volume,
            service_margin: margins.service,
            fouling: margins.fouling,
            resistance_factor: margins.resistance_factor,
        }
    }

    /// One line for the user, e.g. "full load: 13.0 m³, service margin 15 %, fouling 0 %".
    pub fn describe(&self) -> String {
        let mut text = format!(
            "{}: displacement {:.2} m³, service margin {:.0} %, fouling {:.0} %",
            self.label,
            self.displacement_volume,
            self.service_margin * 100.0,
            self.fouling * 100.0
        );
        if (self.resistance_factor - 1.0).abs() > 1e-9 {
            text.push_str(&format!(
                ", sea-trial resistance factor {:.3} applied",
                self.resistance_factor
            ));
        }
        text
    }
}

/// A pitch recommendation for one screw variant.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct PitchRecommendation {
    /// The variant's label.
    pub label: String,
    /// The screw's current pitch, m.
    pub current_pitch: f64,
    /// The pitch that meets the target, m; `None` when the search did not converge.
    pub recommended_pitch: Option<f64>,
    /// Recommended minus current pitch, m.
    pub change: Option<f64>,
    /// Whether |change| is within `repitch_limit`.
    pub within_repitch_limit: Option<bool>,
    /// The re-pitch limit used, m.
    pub repitch_limit: f64,
    /// Change of full-throttle engine rpm per inch of added pitch, rpm/in (negative: more pitch,
    /// fewer rpm): the slope on the load-limited side, measured between the recommended pitch
    /// (or the current one if unsolved) + ½ in and + 1½ in on the rpm at which the screw
    /// absorbs full-load power — the free-running rpm of a governed engine — so it never spans
    /// the governor's pin.
    pub rpm_per_inch: Option<f64>,
    /// The same slope per 10 mm of added pitch, rpm per 10 mm.
    pub rpm_per_10mm: Option<f64>,
    /// The target asked for.
    pub target: PitchTarget,
    /// The engine rpm and brake power the curve must meet.
    pub target_point: TargetPoint,
    /// The engine's rated rpm, rpm.
    pub rated_rpm: f64,
    /// Brake power the propeller curve asks at the target rpm with the recommended pitch, W.
    pub absorbed_power: Option<f64>,
    /// The match of the current screw (direct solve), if it could be solved.
    pub current: Option<MatchSummary>,
    /// The match at the recommended pitch (direct solve), if it could be solved.
    pub at_recommended: Option<MatchSummary>,
    /// The pitch change that cures the current screw's shortfall or excess by the slope, with
    /// a direct solve at the pitch it suggests.
    pub cure: Option<PitchCure>,
    /// The loading condition the recommendation was made for.
    pub condition: ConditionSummary,
    /// How the search stopped.
    pub stop: SearchStop,
    /// Root-finder iterations used (power evaluations, including bracketing).
    pub evaluations: u32,
    /// Boat speed at the target rpm with the recommended pitch, m/s, if solved.
    pub speed_at_target: Option<f64>,
    /// Where that speed lies against the resistance method's range and the displacement
    /// regime, if solved.
    pub target_validity: Option<SpeedValidity>,
    /// Whether the speed the pitch is chosen for is inside the method's range (`None` if the
    /// speed was not solved); false means the recommendation is unreliable and a sea trial decides.
    pub in_method_range: Option<bool>,
    /// Short caution to show beside the recommendation.
    pub caution: String,
    /// Warnings: re-pitch beyond the limit, pitch ratio outside the B-series range, …
    pub warnings: Vec<Warning>,
}

/// The verdict and margin of one screw, as the match gives them.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct MatchSummary {
    /// The screw's pitch, m.
    pub pitch: f64,
    /// Full-throttle engine rpm, rpm.
    pub meeting_rpm: f64,
    /// The match's margin at full throttle, rpm (see [`MatchResult::rpm_margin`]).
    pub rpm_margin: f64,
    /// Whether the margin is only a lower bound.
    pub margin_is_lower_bound: bool,
    /// The verdict.
    pub verdict: Verdict,
    /// Brake power absorbed at rated rpm, fraction of rated power.
    pub absorbed_fraction_at_rated: f64,
}

impl MatchSummary {
    /// The summary of `result` for a screw of `pitch` (m).
    pub fn of(result: &MatchResult, pitch: f64) -> Self {
        Self {
            pitch,
            meeting_rpm: result.meeting_rpm,
            rpm_margin: result.rpm_margin,
            margin_is_lower_bound: result.margin_is_lower_bound,
            verdict: result.verdict,
            absorbed_fraction_at_rated: result.absorbed_fraction_at_rated,
        }
    }
}

/// The re-pitch that the rpm-per-inch slope gives for the current screw, checked by a solve.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PitchCure {
    /// The margin the recommendation reaches, rpm (the target's).
    pub target_margin: f64,
    /// Target margin minus the current screw's margin, rpm (positive: rpm to gain).
    pub rpm_to_cure: f64,
    /// Pitch change by the slope, m (negative: take pitch off).
    pub change: f64,
    /// The match solved directly at current pitch + `change`, if it could be solved.
    pub check: Option<MatchSummary>,
}

/// The screw of variant `index` with only its geometry changed (B-series only).
fn rebuilt_screw(geometry: ScrewGeometry) -> Result<ScrewModel, DesignError> {
    Ok(ScrewModel::BSeries(BSeriesScrew::new(geometry)?))
}

/// The geometry of variant `index`, refusing table screws.
fn bseries_geometry(vessel: &Vessel, index: usize) -> Result<ScrewGeometry, DesignError> {
    let variant = vessel
        .variants
        .get(index)
        .ok_or(DesignError::NoSuchVariant {
            index,
            count: vessel.variants.len(),
        })?;
    match &variant.screw {
        ScrewModel::BSeries(s) => Ok(*s.geometry()),
        ScrewModel::Table(_) => Err(DesignError::NotBSeries(variant.label.clone())),
    }
}

/// The system of `vessel` with a given screw and installation.
fn system_with<'a>(
    vessel: &'a Vessel,
    screw: &'a ScrewModel,
    installation: Installation,
) -> System<'a> {
    System {
        resistance: &vessel.resistance,
        interaction: vessel.interaction,
        screw,
        installation,
        engine: &vessel.engine,
        reynolds_correction: vessel.reynolds_correction,
    }
}

/// The outcome of the bracketed pitch search alone.
#[derive(Debug, Clone, PartialEq)]
struct PitchSearch {
    pitch: Option<f64>,
    absorbed_power: Option<f64>,
    stop: SearchStop,
    evaluations: u32,
}

/// Brake power (W) the propeller curve asks at `engine_rpm` with pitch `pitch`.
fn absorbed_power(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    pitch: f64,
    engine_rpm: f64,
) -> Result<f64, DesignError> {
    let screw = rebuilt_screw(ScrewGeometry { pitch, ..base })?;
    let system = system_with(vessel, &screw, installation);
    Ok(point_at_engine_rpm(&system, engine_rpm)?.brake_power)
}

/// Bracketed search of the pitch at which the curve passes through `target`.
fn search_pitch(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    target: TargetPoint,
    options: &PitchOptions,
) -> PitchSearch {
    let low = options.min_pitch_ratio * base.diameter;
    let high = options.max_pitch_ratio * base.diameter;
    let mut evaluations = 0u32;
    let mut residual = |pitch: f64| -> Result<f64, DesignError> {
        evaluations += 1;
        Ok(
            absorbed_power(vessel, base, installation, pitch, target.engine_rpm)?
                / target.brake_power
                - 1.0,
        )
    };
    let lost = |reason: String, evaluations| PitchSearch {
        pitch: None,
        absorbed_power: None,
        stop: SearchStop::BracketLost(reason),
        evaluations,
    };

    // Bracket outward from the current pitch (the answer is usually near it), doubling the step.
    let start = base.pitch.clamp(low, high);
    let f_start = match residual(start) {
        Ok(f) => f,
        Err(e) => {
            return lost(
                format!("the current pitch {:.4} m could not be solved: {e}", start),
                evaluations,
            );
        }
    };
    if f_start.abs() <= options.power_tolerance {
        return PitchSearch {
            pitch: Some(start),
            absorbed_power: Some((1.0 + f_start) * target.brake_power),
            stop: SearchStop::Converged,
            evaluations,
        };
    }
    // Power rises with pitch: too much power → search towards smaller pitch.
    let direction = if f_start > 0.0 { -1.0 } else { 1.0 };
    let mut step = 0.04 * base.diameter;
    let (mut near, mut f_near) = (start, f_start);
    let far_bracket = loop {
        let limit = if direction < 0.0 { low } else { high };
        if (near - limit).abs() <= f64::EPSILON * limit.abs() {
            let bound = if direction < 0.0 {
                "smallest"
            } else {
                "largest"
            };
            return lost(
                format!(
                    "no pitch between P/D {:.2} and {:.2} meets the target: the {bound} searched pitch {:.3} m absorbs only {:.1} % of the target power",
                    options.min_pitch_ratio,
                    options.max_pitch_ratio,
                    limit,
                    (1.0 + f_near) * 100.0
                ),
                evaluations,
            );
        }
        let next = if direction < 0.0 {
            (near - step).max(low)
        } else {
            (near + step).min(high)
        };
        match residual(next) {
            Ok(f) if f.signum() != f_near.signum() || f == 0.0 => break (next, f),
            Ok(f) => {
                near = next;
                f_near = f;
                step *= 2.0;
            }
            Err(e) => {
                return lost(
                    format!("pitch {next:.4} m could not be solved while bracketing: {e}"),
                    evaluations,
                );
            }
        }
    };
    let (far, f_far) = far_bracket;
    let tolerance = options.power_tolerance;
    let result = numeric::brent(
        &mut residual,
        (near, f_near),
        (far, f_far),
        |_, fx| fx.abs() <= tolerance,
        options.pitch_tolerance,
        options.max_iterations,
    );
    match result {
        Ok(RootOutcome::Converged { x, fx, .. }) => PitchSearch {
            pitch: Some(x),
            absorbed_power: Some((1.0 + fx) * target.brake_power),
            stop: SearchStop::Converged,
            evaluations,
        },
        Ok(RootOutcome::IterationCap { .. }) => PitchSearch {
            pitch: None,
            absorbed_power: None,
            stop: SearchStop::IterationsExhausted,
            evaluations,
        },
        Err(e) => lost(
            format!("a trial pitch inside the bracket could not be solved: {e}"),
            evaluations,
        ),
    }
}

/// The pitch (m) of variant `index` that meets `options.target` and how the search stopped,
/// without the report around it (for bands and sweeps).
pub fn matching_pitch(
    vessel: &Vessel,
    index: usize,
    options: &PitchOptions,
) -> Result<(Option<f64>, SearchStop), DesignError> {
    options.validate()?;
    let base = bseries_geometry(vessel, index)?;
    let target = options.target.point(vessel)?;
    let search = search_pitch(vessel, base, vessel.installation, target, options);
    Ok((search.pitch, search.stop))
}

/// The match with pitch `pitch` (m).
fn match_at(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    pitch: f64,
) -> Result<MatchResult, DesignError> {
    let screw = rebuilt_screw(ScrewGeometry { pitch, ..base })?;
    let system = system_with(vessel, &screw, installation);
    Ok(match_engine(&system, &vessel.match_criteria)?)
}

/// The rpm at which the screw of pitch `pitch` absorbs the full-load power (the free-running
/// rpm of a governed engine, the full-throttle rpm otherwise), rpm; `None` if not found.
fn loaded_rpm(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    pitch: f64,
) -> Option<f64> {
    let m = match_at(vessel, base, installation, pitch).ok()?;
    (!m.margin_is_lower_bound).then_some(m.rpm_margin + vessel.engine.rated_rpm)
}

/// Where the slope is measured: from this much added pitch …, m.
pub const SLOPE_NEAR: f64 = 0.5 * INCH;

/// … to this much added pitch, m (the load-limited side of a recommended pitch).
pub const SLOPE_FAR: f64 = 1.5 * INCH;

/// Full-throttle rpm change per metre of added pitch on the load-limited side of `pitch`:
/// the secant of [`loaded_rpm`] between `pitch` + [`SLOPE_NEAR`] and + [`SLOPE_FAR`], rpm/m.
/// The loaded rpm is smooth in pitch (no governor pin), so the secant never spans the pin.
fn rpm_per_metre(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    pitch: f64,
) -> Option<f64> {
    let near = loaded_rpm(vessel, base, installation, pitch + SLOPE_NEAR)?;
    let far = loaded_rpm(vessel, base, installation, pitch + SLOPE_FAR)?;
    let slope = (far - near) / (SLOPE_FAR - SLOPE_NEAR);
    (slope.is_finite() && slope < 0.0).then_some(slope)
}

/// Recommends the pitch of variant `index` of `vessel` for `options.target`, for the vessel's
/// own condition (named "as loaded in the boat file").
pub fn recommend_pitch(
    vessel: &Vessel,
    index: usize,
    options: &PitchOptions,
) -> Result<PitchRecommendation, DesignError> {
    recommend_pitch_for_condition(
        vessel,
        index,
        options,
        ConditionSummary::of(vessel, "as loaded in the boat file"),
    )
}

/// Recommends the pitch of variant `index` of `vessel`, labelling the result with `condition`
/// (the caller has already applied the condition to `vessel`).
pub fn recommend_pitch_for_condition(
    vessel: &Vessel,
    index: usize,
    options: &PitchOptions,
    condition: ConditionSummary,
) -> Result<PitchRecommendation, DesignError> {
    options.validate()?;
    let base = bseries_geometry(vessel, index)?;
    let target_point = options.target.point(vessel)?;
    let search = search_pitch(vessel, base, vessel.installation, target_point, options);
    let installation = vessel.installation;
    let slope_pitch = search.pitch.unwrap_or(base.pitch);
    let slope = rpm_per_metre(vessel, base, installation, slope_pitch);
    let change = search.pitch.map(|p| p - base.pitch);
    let repitch = options.repitch.unwrap_or(vessel.repitch);
    repitch.check()?;
    let repitch_limit = repitch.for_pitch(base.pitch);
    let within = change.map(|c| c.abs() <= repitch_limit + 1e-12);
    let summary = |pitch: f64| {
        match_at(vessel, base, installation, pitch)
            .ok()
            .map(|m| MatchSummary::of(&m, pitch))
    };
    let current = summary(base.pitch);
    let at_recommended = search.pitch.and_then(summary);
    let rated_rpm = vessel.engine.rated_rpm;
    let target_margin = at_recommended
        .filter(|m| !m.margin_is_lower_bound)
        .map_or(target_point.engine_rpm - rated_rpm, |m| m.rpm_margin);
    let cure = match (current, slope) {
        (Some(now), Some(slope)) if !now.margin_is_lower_bound => {
            let rpm_to_cure = target_margin - now.rpm_margin;
            let change = rpm_to_cure / slope;
            let check = (base.pitch + change > 0.0)
                .then(|| summary(base.pitch + change))
                .flatten();
            Some(PitchCure {
                target_margin,
                rpm_to_cure,
                change,
                check,
            })
        }
        _ => None,
    };

    let mut warnings = Vec::new();
    if let (Some(c), Some(false)) = (change, within) {
        warnings.push(Warning::new(
            "pitch recommendation",
            format!(
                "the change of {:+.1} mm ({:+.2} in) is beyond the re-pitch limit of ±{:.1} mm (common practice): a new screw is the answer",
                c * 1000.0,
                c / INCH,
                repitch_limit * 1000.0
            ),
        ));
    }
    if let PitchTarget::RatedPower { fraction } = options.target
        && fraction > 1.0 + 1e-9
    {
        warnings.push(Warning::new(
            "pitch recommendation",
            format!(
                "a target of {:.0} % of rated power at rated rpm overloads the engine: the screw would ask more than the engine's rating",
                fraction * 100.0
            ),
        ));
    }
    if let Some(p) = search.pitch {
        let ratio = p / base.diameter;
        if !(0.5..=1.4).contains(&ratio) {
            warnings.push(Warning::new(
                "B-series",
                format!("the recommended pitch ratio P/D = {ratio:.2} is outside the series' range 0.5–1.4"),
            ));
        }
    }
    match &search.stop {
        SearchStop::Converged => {}
        SearchStop::BracketLost(reason) => {
            warnings.push(Warning::new(
                "pitch recommendation",
                format!("no pitch recommended: {reason}"),
            ));
        }
        SearchStop::IterationsExhausted => warnings.push(Warning::new(
            "pitch recommendation",
            "no pitch recommended: the search reached its iteration limit",
        )),
    }

    // The pitch is decided at the target rpm: where the boat then runs outside the resistance
    // method's range the whole recommendation rests on an extrapolated resistance.
    let speed_at_target = search.pitch.and_then(|pitch| {
        let screw = rebuilt_screw(ScrewGeometry { pitch, ..base }).ok()?;
        let system = system_with(vessel, &screw, vessel.installation);
        point_at_engine_rpm(&system, target_point.engine_rpm)
            .ok()
            .map(|p| p.speed)
    });
    let target_validity = speed_at_target.map(|v| vessel.resistance.validity_at(v));
    let in_method_range = target_validity.map(|v| v.in_method_range);
    if let Some(reason) = target_validity.and_then(|v| v.reason()) {
        warnings.push(Warning::new(
            "pitch recommendation",
            format!(
                "UNRELIABLE: at {:.0} rpm with the recommended pitch the boat runs outside the range of {} ({reason}); the resistance there is an extrapolation, so a sea trial decides the pitch",
                target_point.engine_rpm,
                vessel.resistance.method.name()
            ),
        ));
    }
    let mut caution = PITCH_CAUTION.to_string();
    if in_method_range == Some(false) {
        caution = format!(
            "Unreliable: the pitch is chosen at a speed outside the resistance method's range; a sea trial decides. {caution}"
        );
    }
    if within == Some(false) {
        caution = format!("Beyond the re-pitch limit: a new screw is needed. {caution}");
    }
    Ok(PitchRecommendation {
        label: vessel.variants[index].label.clone(),
        current_pitch: base.pitch,
        recommended_pitch: search.pitch,
        change,
        within_repitch_limit: within,
        repitch_limit,
        rpm_per_inch: slope.map(|s| s * INCH),
        rpm_per_10mm: slope.map(|s| s * 0.010),
        target: options.target,
        target_point,
        rated_rpm,
        absorbed_power: search.absorbed_power,
        current,
        at_recommended,
        cure,
        condition,
        stop: search.stop,
        evaluations: search.evaluations,
        speed_at_target,
        target_validity,
        in_method_range,
        caution,
        warnings,
    })
}

/// The limit the aperture around the screw sets on its diameter.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ApertureLimit {
    /// Diameter of the largest disc that fits the aperture around the shaft centre, m.
    pub aperture_diameter: f64,
    /// Radial clearance kept between blade tip and hull, as a fraction of screw diameter
    /// (common practice: about 0.10–0.15 D).
    pub tip_clearance_fraction: f64,
}

impl ApertureLimit {
    /// The largest screw diameter that leaves the tip clearance: D = A/(1 + 2c), m.
    pub fn max_diameter(&self) -> f64 {
        self.aperture_diameter / (1.0 + 2.0 * self.tip_clearance_fraction)
    }
}

/// The usual gear sweep: the boat's ratio and ±0.25, ±0.5 around it (never below 1:1).
pub fn gear_ratios_around(gear_ratio: f64) -> Vec<f64> {
    let mut ratios: Vec<f64> = [-0.5, -0.25, 0.0, 0.25, 0.5]
        .iter()
        .map(|step| (gear_ratio + step).max(1.0))
        .collect();
    ratios.dedup_by(|a, b| (*a - *b).abs() < 1e-9);
    ratios
}

/// The usual blade-count sweep (inside the B-series range Z 2–7).
pub const USUAL_BLADE_COUNTS: [u32; 4] = [2, 3, 4, 5];

/// The usual expanded-area-ratio sweep (inside the B-series range 0.30–1.05).
pub const USUAL_AREA_RATIOS: [f64; 4] = [0.40, 0.55, 0.70, 0.85];

/// How many diameters the usual diameter sweep tries.
pub const DIAMETER_SWEEP_STEPS: usize = 6;

/// What a sweep varies, with its candidate values.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
#[serde(tag = "parameter", rename_all = "snake_case")]
pub enum SweepParameter {
    /// Screw diameter from `min_diameter` up to the aperture's limit in `count` even steps (m);
    /// the pitch ratio of the current screw is kept as the search's starting point.
    Diameter {
        /// Smallest diameter, m.
        min_diameter: f64,
        /// The aperture that sets the largest diameter.
        aperture: ApertureLimit,
        /// Number of diameters (≥ 2).
        count: usize,
    },
    /// Each available reduction ratio (engine rpm / screw rpm).
    GearRatio(Vec<f64>),
    /// Each blade count.
    Blades(Vec<u32>),
    /// Each expanded area ratio AE/A0.
    AreaRatio(Vec<f64>),
}

impl SweepParameter {
    /// The usual diameter sweep: `DIAMETER_SWEEP_STEPS` diameters from 80 % of the current
    /// screw (or of the largest, if smaller) up to `largest`, the largest screw the aperture
    /// takes with `tip_clearance` (m) kept between blade tip and hull, all in m.
    pub fn diameters_up_to(
        current: f64,
        largest: f64,
        tip_clearance: f64,
    ) -> Result<Self, DesignError> {
        if !(largest.is_finite() && largest > 0.0) {
            return Err(DesignError::BadInput {
                field: "largest screw diameter",
                value: largest,
                expected: "a positive length",
            });
        }
        if !(tip_clearance.is_finite() && tip_clearance >= 0.0 && tip_clearance < 0.5 * largest) {
            return Err(DesignError::BadInput {
                field: "tip clearance",
                value: tip_clearance,
                expected: "at least 0 and less than half of the largest screw diameter",
            });
        }
        // The aperture disc and the clearance as a fraction of the largest screw give back
        // exactly `largest` as the aperture's limit.
        Ok(SweepParameter::Diameter {
            min_diameter: (0.8 * current).min(0.8 * largest),
            aperture: ApertureLimit {
                aperture_diameter: largest + 2.0 * tip_clearance,
                tip_clearance_fraction: tip_clearance / largest,
            },
            count: DIAMETER_SWEEP_STEPS,
        })
    }

    /// The parameter's name for the user.
    pub fn name(&self) -> &'static str {
        match self {
            SweepParameter::Diameter { .. } => "diameter",
            SweepParameter::GearRatio(_) => "gear ratio",
            SweepParameter::Blades(_) => "blade count",
            SweepParameter::AreaRatio(_) => "area ratio AE/A0",
        }
    }
}

/// How sweep candidates are ranked.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum RankCriterion {
    /// Least fuel per distance at the target speed; within 0.1 % of each other, higher top
    /// speed first.
    #[default]
    LeastFuelPerDistance,
    /// Highest top speed; within 0.1 %, least fuel per distance first.
    HighestTopSpeed,
    /// Highest propulsive efficiency ηD = PE/PD at the target speed; within 0.1 %, higher top
    /// speed first.
    HighestPropulsiveEfficiency,
}

impl RankCriterion {
    /// The criterion as a sentence for the user.
    pub fn describe(&self) -> &'static str {
        match self {
            RankCriterion::LeastFuelPerDistance => {
                "least fuel per distance at the target speed; ties (within 0.1 %) by higher top speed"
            }
            RankCriterion::HighestTopSpeed => {
                "highest top speed; ties (within 0.1 %) by least fuel per distance at the target speed"
            }
            RankCriterion::HighestPropulsiveEfficiency => {
                "highest propulsive efficiency at the target speed; ties (within 0.1 %) by higher top speed"
            }
        }
    }
}

/// One candidate of a sweep with its matching pitch and performance.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SweepCandidate {
    /// 1-based rank (unsolved candidates come last).
    pub rank: usize,
    /// The swept value (diameter m, gear ratio, blade count or area ratio).
    pub value: f64,
    /// The screw geometry at the matching pitch (pitch is the current one if unsolved).
    pub geometry: ScrewGeometry,
    /// Gear ratio used.
    pub gear_ratio: f64,
    /// How the pitch search stopped.
    pub stop: SearchStop,
    /// Matching pitch, m.
    pub pitch: Option<f64>,
    /// Top speed at full throttle, m/s.
    pub top_speed: Option<f64>,
    /// Whether the top speed is inside the resistance method's range (false: unreliable).
    pub top_speed_in_method_range: Option<bool>,
    /// Full-throttle engine rpm, rpm.
    pub meeting_rpm: Option<f64>,
    /// Open-water efficiency η0 at the target speed.
    pub open_water_efficiency_at_target: Option<f64>,
    /// Open-water efficiency η0 at top speed.
    pub open_water_efficiency_at_top: Option<f64>,
    /// Propulsive efficiency ηD = PE/PD at the target speed.
    pub propulsive_efficiency_at_target: Option<f64>,
    /// Propulsive efficiency ηD = PE/PD at top speed.
    pub propulsive_efficiency_at_top: Option<f64>,
    /// Fuel volume per distance at the target speed, m³/m.
    pub fuel_per_distance_at_target: Option<f64>,
    /// Why a figure is missing, if one is.
    pub problem: Option<String>,
}

/// The ranked result of a sweep.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct SweepResult {
    /// What was varied.
    pub parameter: &'static str,
    /// The ranking criterion, as a sentence.
    pub criterion: &'static str,
    /// The pitch target each candidate was matched to.
    pub target: PitchTarget,
    /// Target speed the efficiencies and fuel are given at, m/s.
    pub target_speed: f64,
    /// Candidates in rank order.
    pub candidates: Vec<SweepCandidate>,
}

/// Settings of a sweep.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct SweepOptions {
    /// Pitch search settings (target, range, tolerances).
    pub pitch: PitchOptions,
    /// Ranking criterion.
    pub criterion: RankCriterion,
}

/// Sweeps `parameter` for variant `index` of `vessel`: each candidate gets its matching pitch,
/// top speed, efficiencies and fuel per distance, ranked by `options.criterion`.
pub fn sweep(
    vessel: &Vessel,
    index: usize,
    parameter: &SweepParameter,
    options: &SweepOptions,
) -> Result<SweepResult, DesignError> {
    options.pitch.validate()?;
    let base = bseries_geometry(vessel, index)?;
    let target_point = options.pitch.target.point(vessel)?;
    let bad = |field, value, expected| DesignError::BadInput {
        field,
        value,
        expected,
    };
    let positive = |field: &'static str, v: f64| {
        if v.is_finite() && v > 0.0 {
            Ok(v)
        } else {
            Err(bad(field, v, "a positive finite number"))
        }
    };

    let mut setups: Vec<(f64, ScrewGeometry, f64)> = Vec::new();
    let gear = vessel.installation.gear_ratio;
    match parameter {
        SweepParameter::Diameter {
            min_diameter,
            aperture,
            count,
        } => {
            positive("smallest diameter", *min_diameter)?;
            positive("aperture diameter", aperture.aperture_diameter)?;
            let c = aperture.tip_clearance_fraction;
            if !(c.is_finite() && (0.0..0.5).contains(&c)) {
                return Err(bad(
                    "tip clearance fraction",
                    c,
                    "a fraction of diameter from 0 to 0.5",
                ));
            }
            let max = aperture.max_diameter();
            if max < *min_diameter {
                return Err(bad(
                    "smallest diameter",
                    *min_diameter,
                    "a diameter no larger than the aperture allows with the tip clearance",
                ));
            }
            if *count < 2 {
                return Err(bad("number of diameters", *count as f64, "at least 2"));
            }
            let ratio = base.pitch_ratio();
            for i in 0..*count {
                let d = min_diameter + (max - min_diameter) * i as f64 / (*count - 1) as f64;
                setups.push((
                    d,
                    ScrewGeometry {
                        diameter: d,
                        pitch: ratio * d,
                        ..base
                    },
                    gear,
                ));
            }
        }
        SweepParameter::GearRatio(ratios) => {
            for &g in ratios {
                positive("gear ratio", g)?;
                setups.push((g, base, g));
            }
        }
        SweepParameter::Blades(counts) => {
            for &z in counts {
                if !(2..=7).contains(&z) {
                    return Err(bad(
                        "blade count",
                        z as f64,
                        "2 to 7 blades (B-series range)",
                    ));
                }
                setups.push((z as f64, ScrewGeometry { blades: z, ..base }, gear));
            }
        }
        SweepParameter::AreaRatio(ratios) => {
            for &a in ratios {
                positive("area ratio", a)?;
                setups.push((
                    a,
                    ScrewGeometry {
                        area_ratio: a,
                        ..base
                    },
                    gear,
                ));
            }
        }
    }
    if setups.is_empty() {
        return Err(bad(
            "number of candidates",
            0.0,
            "at least one candidate value",
        ));
    }

    let target_speed = vessel.trip.target_speed;
    let mut candidates: Vec<SweepCandidate> = setups
        .into_iter()
        .map(|(value, geometry, gear_ratio)| {
            evaluate_candidate(
                vessel,
                value,
                geometry,
                gear_ratio,
                target_point,
                &options.pitch,
            )
        })
        .collect();
    rank_candidates(&mut candidates, options.criterion);
    Ok(SweepResult {
        parameter: parameter.name(),
        criterion: options.criterion.describe(),
        target: options.pitch.target,
        target_speed,
        candidates,
    })
}

fn evaluate_candidate(
    vessel: &Vessel,
    value: f64,
    geometry: ScrewGeometry,
    gear_ratio: f64,
    target: TargetPoint,
    options: &PitchOptions,
) -> SweepCandidate {
    let installation = Installation {
        gear_ratio,
        ..vessel.installation
    };
    let mut candidate = SweepCandidate {
        rank: 0,
        value,
        geometry,
        gear_ratio,
        stop: SearchStop::IterationsExhausted,
        pitch: None,
        top_speed: None,
        top_speed_in_method_range: None,
        meeting_rpm: None,
        open_water_efficiency_at_target: None,
        open_water_efficiency_at_top: None,
        propulsive_efficiency_at_target: None,
        propulsive_efficiency_at_top: None,
        fuel_per_distance_at_target: None,
        problem: None,
    };
    if let Err(e) = BSeriesScrew::new(geometry) {
        candidate.stop = SearchStop::BracketLost(format!("screw could not be built: {e}"));
        candidate.problem = Some(e.to_string());
        return candidate;
    }
    let search = search_pitch(vessel, geometry, installation, target, options);
    candidate.stop = search.stop.clone();
    let Some(pitch) = search.pitch else {
        candidate.problem = Some(match &search.stop {
            SearchStop::BracketLost(reason) => reason.clone(),
            _ => "the pitch search reached its iteration limit".to_string(),
        });
        return candidate;
    };
    candidate.pitch = Some(pitch);
    candidate.geometry.pitch = pitch;
    let screw = match rebuilt_screw(candidate.geometry) {
        Ok(s) => s,
        Err(e) => {
            candidate.problem = Some(e.to_string());
            return candidate;
        }
    };
    let system = system_with(vessel, &screw, installation);
    let propulsive = |pe: f64, pd: f64| (pd > 0.0).then(|| pe / pd);
    let mut problems = Vec::new();
    match match_engine(&system, &vessel.match_criteria) {
        Ok(m) => {
            candidate.top_speed = Some(m.top_speed);
            candidate.top_speed_in_method_range = Some(m.top_speed_in_method_range);
            candidate.meeting_rpm = Some(m.meeting_rpm);
            candidate.open_water_efficiency_at_top = Some(m.top_point.open_water_efficiency);
            candidate.propulsive_efficiency_at_top =
                propulsive(m.top_point.effective_power, m.top_point.delivered_power);
        }
        Err(e) => problems.push(format!("top speed: {e}")),
    }
    match cruise_at_speed(&system, &vessel.trip, vessel.trip.target_speed) {
        Ok(c) => {
            candidate.open_water_efficiency_at_target = Some(c.point.open_water_efficiency);
            candidate.propulsive_efficiency_at_target =
                propulsive(c.point.effective_power, c.point.delivered_power);
            candidate.fuel_per_distance_at_target = Some(c.fuel_per_distance);
            if c.beyond_full_load {
                problems
                    .push("the target speed is beyond the engine's full-load curve".to_string());
            }
        }
        Err(e) => problems.push(format!("target speed: {e}")),
    }
    if !problems.is_empty() {
        candidate.problem = Some(problems.join("; "));
    }
    candidate
}

/// Sorts candidates by the criterion; values are bucketed to 0.1 % of the best so that ties
/// fall to the second key while the order stays a total order.
fn rank_candidates(candidates: &mut [SweepCandidate], criterion: RankCriterion) {
    let primary = |c: &SweepCandidate| -> Option<f64> {
        match criterion {
            RankCriterion::LeastFuelPerDistance => c.fuel_per_distance_at_target,
            RankCriterion::HighestTopSpeed => c.top_speed.map(|v| -v),
            RankCriterion::HighestPropulsiveEfficiency => {
                c.propulsive_efficiency_at_target.map(|v| -v)
            }
        }
    };
    let secondary = |c: &SweepCandidate| -> f64 {
        match criterion {
            RankCriterion::HighestTopSpeed => {
                c.fuel_per_distance_at_target.unwrap_or(f64::INFINITY)
            }
            _ => c.top_speed.map(|v| -v).unwrap_or(f64::INFINITY),
        }
    };
    let scale = candidates
        .iter()
        .filter_map(&primary)
        .map(f64::abs)
        .fold(f64::INFINITY, f64::min);
    let bucket = if scale.is_finite() && scale > 0.0 {
        0.001 * scale
    } else {
        1.0
    };
    let key = |c: &SweepCandidate| -> (f64, f64) {
        match primary(c) {
            Some(v) if v.is_finite() => ((v / bucket).round(), secondary(c)),
            _ => (f64::INFINITY, f64::INFINITY),
        }
    };
    candidates.sort_by(|a, b| {
        let (ka, kb) = (key(a), key(b));
        ka.0.total_cmp(&kb.0).then(ka.1.total_cmp(&kb.1))
    });
    for (i, c) in candidates.iter_mut().enumerate() {
        c.rank = i + 1;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn usual_diameter_sweep_ends_at_the_largest_screw() {
        let SweepParameter::Diameter {
            min_diameter,
            aperture,
            count,
        } = SweepParameter::diameters_up_to(0.66, 0.71, 0.09).unwrap()
        else {
            panic!("a diameter sweep");
        };
        assert!((aperture.max_diameter() - 0.71).abs() < 1e-12);
        assert!((min_diameter - 0.8 * 0.66).abs() < 1e-12);
        assert_eq!(count, DIAMETER_SWEEP_STEPS);
        assert!(SweepParameter::diameters_up_to(0.66, 0.71, 0.4).is_err());
        assert!(SweepParameter::diameters_up_to(0.66, -0.71, 0.0).is_err());
        assert_eq!(gear_ratios_around(1.2), vec![1.0, 1.2, 1.45, 1.7]);
    }

    #[test]
    fn aperture_limit_leaves_the_clearance_on_both_sides() {
        let limit = ApertureLimit {
            aperture_diameter: 0.72,
            tip_clearance_fraction: 0.1,
        };
        let d = limit.max_diameter();
        // the disc of the screw plus a clearance of 0.1·D each side fills the aperture
        assert!((d + 2.0 * 0.1 * d - 0.72).abs() < 1e-12);
    }

    #[test]
    fn ranking_puts_least_fuel_first_and_breaks_ties_by_top_speed() {
        let make = |fuel: Option<f64>, top: f64| SweepCandidate {
            rank: 0,
            value: top,
            geometry: ScrewGeometry {
                blades: 3,
                diameter: 0.5,
                pitch: 0.4,
                area_ratio: 0.5,
            },
            gear_ratio: 2.0,
            stop: SearchStop::Converged,
            pitch: Some(0.4),
            top_speed: Some(top),
            top_speed_in_method_range: Some(true),
            meeting_rpm: None,
            open_water_efficiency_at_target: None,
            open_water_efficiency_at_top: None,
            propulsive_efficiency_at_target: None,
            propulsive_efficiency_at_top: None,
            fuel_per_distance_at_target: fuel,
            problem: None,
        };
        let mut list = vec![
            make(Some(2.0e-6), 4.0),
            make(None, 9.0),
            make(Some(1.0e-6), 4.1),
            make(Some(1.0000001e-6), 4.3),
        ];
        rank_candidates(&mut list, RankCriterion::LeastFuelPerDistance);
        let order: Vec<f64> = list.iter().map(|c| c.value).collect();
        assert_eq!(order, vec![4.3, 4.1, 4.0, 9.0]);
        assert_eq!(list[3].rank, 4);
    }
}
