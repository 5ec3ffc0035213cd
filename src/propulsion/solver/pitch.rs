//! Pitch: the pitch that meets a chosen target (the target, the search and its options), and
//! in [`recommend`] the recommendation around it (rpm per inch, the cure of the current screw).
//!
//! The pitch search is a bracketed root over pitch (Brent 1973): the brake power the propeller
//! curve asks for at the target engine rpm rises monotonically with pitch, so the root of
//! `absorbed(pitch) / target − 1` is unique inside a bracket. Each trial pitch rebuilds the
//! B-series screw, because its polynomials are collapsed per geometry.

mod recommend;

pub use recommend::{
    ConditionSummary, MatchSummary, PitchCure, PitchRecommendation, SLOPE_FAR, SLOPE_NEAR,
    recommend_pitch, recommend_pitch_for_condition,
};

use super::matching::{point_at_engine_rpm, point_at_engine_rpm_near};
use super::point::PointFailure;
use super::{Installation, System, Vessel};
use crate::propulsion::numeric::{self, RootOutcome};
use crate::propulsion::screw::bseries::BSeriesPitchFamily;
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
    /// Brake power of each engine, W (on its own envelope).
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
    /// Checks the options: re-pitch limit, P/D range, tolerances and iteration limit.
    pub(super) fn validate(&self) -> Result<(), DesignError> {
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

/// The screw of variant `index` with only its geometry changed (B-series only).
pub(super) fn rebuilt_screw(geometry: ScrewGeometry) -> Result<ScrewModel, DesignError> {
    Ok(ScrewModel::BSeries(BSeriesScrew::new(geometry)?))
}

/// The geometry of variant `index`, refusing table screws.
pub fn bseries_geometry(vessel: &Vessel, index: usize) -> Result<ScrewGeometry, DesignError> {
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
pub(super) fn system_with<'a>(
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
pub struct PitchSearch {
    /// The pitch found, m.
    pub pitch: Option<f64>,
    /// Brake power the curve asks at the target rpm with that pitch, W.
    pub absorbed_power: Option<f64>,
    /// How the search stopped.
    pub stop: SearchStop,
    /// Power evaluations used, including bracketing.
    pub evaluations: u32,
}

/// The pitch search of [`recommend_pitch`] alone, for a B-series screw of `geometry` (its pitch,
/// m, where the search starts) on `vessel` with its installation: the pitch that meets
/// `options.target`, without the figures the recommendation adds around it (rpm per inch, the
/// current screw's match, the cure) — for a caller that needs only the pitch.
pub fn target_pitch(
    vessel: &Vessel,
    geometry: ScrewGeometry,
    options: &PitchOptions,
) -> Result<PitchSearch, DesignError> {
    options.validate()?;
    let target_point = options.target.point(vessel)?;
    Ok(search_pitch(
        vessel,
        geometry,
        vessel.installation,
        target_point,
        options,
    ))
}

/// Brake power of each engine (W) the propeller curve asks at `engine_rpm` with the screw of
/// `family` at pitch `pitch` (m), and the boat speed there (m/s); the speed searched from
/// `near` (m/s) when given, the speed of a nearby pitch.
fn absorbed_power(
    vessel: &Vessel,
    family: &Result<BSeriesPitchFamily, ScrewError>,
    installation: Installation,
    pitch: f64,
    engine_rpm: f64,
    near: Option<f64>,
) -> Result<(f64, f64), DesignError> {
    let family = family.as_ref().map_err(|e| e.clone())?;
    let screw = ScrewModel::BSeries(family.at_pitch(pitch)?);
    let system = system_with(vessel, &screw, installation);
    let point = match near {
        Some(speed) => point_at_engine_rpm_near(&system, engine_rpm, speed)?,
        None => point_at_engine_rpm(&system, engine_rpm)?,
    };
    Ok((point.brake_power_per_engine, point.speed))
}

/// Bracketed search of the pitch at which the curve passes through `target`.
pub(super) fn search_pitch(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    target: TargetPoint,
    options: &PitchOptions,
) -> PitchSearch {
    let low = options.min_pitch_ratio * base.diameter;
    let high = options.max_pitch_ratio * base.diameter;
    let mut evaluations = 0u32;
    // The published terms are gathered once; each trial pitch then costs a few polynomials.
    let family = BSeriesPitchFamily::new(base);
    // Each trial pitch's speed is searched from the last one's: the pitches tried close in.
    let mut near: Option<f64> = None;
    let mut residual = |pitch: f64| -> Result<f64, DesignError> {
        evaluations += 1;
        let (power, speed) = absorbed_power(
            vessel,
            &family,
            installation,
            pitch,
            target.engine_rpm,
            near,
        )?;
        near = Some(speed);
        Ok(power / target.brake_power - 1.0)
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
                format!(
                    "the current pitch {} could not be solved: {e}",
                    crate::propulsion::screw_length_words(start)
                ),
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
                    "no pitch between P/D {:.2} and {:.2} meets the target: the {bound} searched pitch {} absorbs {} {:.0} % of the target power",
                    options.min_pitch_ratio,
                    options.max_pitch_ratio,
                    crate::propulsion::screw_length_words(limit),
                    // Short of the target only below 100 %; past it, still too much.
                    if f_near < 0.0 { "only" } else { "still" },
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
                    format!(
                        "pitch {} could not be solved while bracketing: {e}",
                        crate::propulsion::screw_length_words(next)
                    ),
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
