//! Matching the propeller curve to the engine's full-load envelope.

use super::point::{OperatingPoint, PointFailure, solve_point};
use super::{RootOutcome, System, brent};
use crate::propulsion::STANDARD_GRAVITY;
use crate::propulsion::hull::SpeedValidity;

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

impl MatchCriteria {
    /// Checks 0 < `under_below` ≤ `over_above`, both finite.
    pub fn check(&self) -> Result<(), PointFailure> {
        if !(self.under_below.is_finite() && self.under_below > 0.0) {
            return Err(PointFailure::BadInput {
                field: "under-propped limit",
                value: self.under_below,
                expected: "a positive fraction of rated power",
            });
        }
        if !(self.over_above.is_finite() && self.over_above >= self.under_below) {
            return Err(PointFailure::BadInput {
                field: "over-propped limit",
                value: self.over_above,
                expected: "a fraction of rated power at least the under-propped limit",
            });
        }
        Ok(())
    }

    /// The verdict for a screw absorbing `absorbed_fraction` of rated power at rated rpm.
    pub fn verdict(&self, absorbed_fraction: f64) -> Verdict {
        if absorbed_fraction > self.over_above {
            Verdict::Over
        } else if absorbed_fraction < self.under_below {
            Verdict::Under
        } else {
            Verdict::Matched
        }
    }
}

/// The match of one screw against the engine.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct MatchResult {
    /// Engine rpm where the propeller curve meets the full-load curve (wide-open throttle), rpm.
    /// When the screw never loads the engine to its full-load curve up to the curve's top rpm,
    /// the governor holds the engine there, and this is that top rpm (see `governed`).
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
    /// Whether the governor, not the screw, sets the wide-open-throttle rpm: the propeller
    /// curve stays below the full-load curve up to the curve's top rpm.
    pub governed: bool,
    /// The engine rpm at which the screw would absorb the full-load power if no governor
    /// stopped it (the full-load power held at its last value beyond the curve), rpm; equal to
    /// `meeting_rpm` when not governed, `None` if not reached below [`MAX_FROUDE_NUMBER`].
    pub free_running_rpm: Option<f64>,
    /// Where the top speed lies against the resistance method's range and the displacement
    /// regime: the decision every front end shows beside the top speed.
    pub top_validity: SpeedValidity,
    /// Whether the top speed is inside the method's range (`top_validity.in_method_range`).
    pub top_speed_in_method_range: bool,
}

/// The largest boat speed any search here considers, as a length Froude number
/// V/√(g·LWL). Displacement hulls live below about Fn 0.5 (common practice); 1.0 leaves room
/// for a light boat with a big engine while keeping the search bounded.
pub const MAX_FROUDE_NUMBER: f64 = 1.0;

/// Froude number of the first probe when bracketing a speed (about hull speed).
const FIRST_PROBE_FROUDE_NUMBER: f64 = 0.3;

/// Largest number of point solves in one root search in speed.
const MAX_SPEED_ITERATIONS: u32 = 60;

/// Relative tolerance on engine rpm and on load fraction for the searches in speed.
const SPEED_SEARCH_TOLERANCE: f64 = 1e-9;

/// The largest speed considered for this system, m/s (see [`MAX_FROUDE_NUMBER`]).
pub fn max_speed(system: &System<'_>) -> f64 {
    let length = system.resistance.hull.input.length_waterline;
    MAX_FROUDE_NUMBER * (STANDARD_GRAVITY * length.max(0.0)).sqrt()
}

/// Finds the boat speed at which the engine turns `engine_rpm` with this screw (m/s).
///
/// Engine rpm rises with speed, so the speed is bracketed from 0 (engine at rest) upwards —
/// a first probe at Fn 0.3, then steps scaled by the rpm still missing — up to the speed of
/// [`MAX_FROUDE_NUMBER`]; then Brent's method in speed until the rpm is within 1e-9 of the
/// target. `engine_rpm` = 0 gives the point at rest.
pub fn point_at_engine_rpm(
    system: &System<'_>,
    engine_rpm: f64,
) -> Result<OperatingPoint, PointFailure> {
    if !(engine_rpm.is_finite() && engine_rpm >= 0.0) {
        return Err(PointFailure::BadInput {
            field: "engine rpm",
            value: engine_rpm,
            expected: "a positive engine speed in rpm",
        });
    }
    if engine_rpm == 0.0 {
        return solve_point(system, 0.0);
    }
    let ceiling = max_speed(system);
    if !(ceiling.is_finite() && ceiling > 0.0) {
        return Err(PointFailure::BadInput {
            field: "waterline length",
            value: system.resistance.hull.input.length_waterline,
            expected: "a positive length in metres",
        });
    }
    let excess = |p: &OperatingPoint| p.engine_rpm - engine_rpm;
    let mut ceiling = ceiling;
    let mut low = (0.0, -engine_rpm);
    let mut speed = FIRST_PROBE_FROUDE_NUMBER / MAX_FROUDE_NUMBER * ceiling;
    for _ in 0..MAX_SPEED_ITERATIONS {
        let point = match solve_point(system, speed) {
            Ok(point) => point,
            // Past the reach of the resistance model (e.g. the end of a resistance table):
            // search below it, and report the failure if the target lies beyond it.
            Err(PointFailure::Resistance(error)) => {
                if speed - low.0 <= 1e-3 * speed {
                    return Err(PointFailure::Resistance(error));
                }
                ceiling = speed;
                speed = 0.5 * (low.0 + speed);
                continue;
            }
            Err(other) => return Err(other),
        };
        if point.engine_rpm >= engine_rpm {
            return root_in_speed(
                system,
                low,
                (speed, excess(&point)),
                point,
                excess,
                engine_rpm,
            );
        }
        if speed >= ceiling {
            return Err(PointFailure::RpmOutOfReach {
                engine_rpm,
                max_speed: ceiling,
            });
        }
        low = (speed, excess(&point));
        // rpm is close to proportional to speed; aim a little past the target.
        let scale = if point.engine_rpm > 0.0 {
            engine_rpm / point.engine_rpm
        } else {
            2.0
        };
        speed = (speed * (1.1 * scale).clamp(1.05, 4.0)).min(ceiling);
    }
    Err(PointFailure::NotConverged {
        speed,
        iterations: MAX_SPEED_ITERATIONS,
    })
}

/// The point between speeds `low` and `high` (each with its value of `quantity`, of opposite
/// signs) where `quantity` is 0, to within `SPEED_SEARCH_TOLERANCE`·`scale`. `high_point` is the
/// point already solved at `high`.
fn root_in_speed(
    system: &System<'_>,
    low: (f64, f64),
    high: (f64, f64),
    high_point: OperatingPoint,
    quantity: impl Fn(&OperatingPoint) -> f64,
    scale: f64,
) -> Result<OperatingPoint, PointFailure> {
    let mut last = high_point;
    let accept = |_: f64, value: f64| value.abs() <= SPEED_SEARCH_TOLERANCE * scale;
    let outcome = brent(
        |speed| {
            last = solve_point(system, speed)?;
            Ok::<_, PointFailure>(quantity(&last))
        },
        low,
        high,
        accept,
        1e-12 * high.0,
        MAX_SPEED_ITERATIONS,
    )?;
    match outcome {
        RootOutcome::Converged { x, .. } if x == last.speed => Ok(last),
        RootOutcome::Converged { x, .. } => solve_point(system, x),
        RootOutcome::IterationCap { iterations } => Err(PointFailure::NotConverged {
            speed: last.speed,
            iterations,
        }),
    }
}

/// Matches the system's screw against its engine.
///
/// The meeting point is where the load fraction PB/P_full(rpm) along the propeller curve
/// reaches 1, found in speed by Brent's method: below rated rpm for a screw that absorbs more
/// than rated power at rated rpm, otherwise between rated rpm and the full-load curve's top
/// rpm. If the screw has not loaded the engine fully even at the top rpm, the engine is
/// governed there (`governed`), and the meeting point is the top rpm at part load.
pub fn match_engine(
    system: &System<'_>,
    criteria: &MatchCriteria,
) -> Result<MatchResult, PointFailure> {
    criteria.check()?;
    let engine = system.engine;
    engine.validate()?;
    let rated_point = point_at_engine_rpm(system, engine.rated_rpm)?;
    let absorbed = rated_point.brake_power / engine.rated_power();
    let overload = |p: &OperatingPoint| p.load_fraction - 1.0;
    let top_rpm = engine.full_load_power.last_rpm().max(engine.rated_rpm);

    let (top_point, governed) = if overload(&rated_point) >= 0.0 {
        // Over-propped (or exactly matched): the meeting point lies below rated speed. Near
        // rest, load falls as speed² (PB ∝ V³ against P_full ∝ rpm), so halving finds a
        // speed with load below 1.
        let mut high = (rated_point.speed, overload(&rated_point), rated_point);
        let mut low = None;
        for _ in 0..60 {
            let speed = 0.5 * high.0;
            let point = solve_point(system, speed)?;
            if overload(&point) < 0.0 {
                low = Some((speed, overload(&point)));
                break;
            }
            high = (speed, overload(&point), point);
        }
        let low = low.ok_or(PointFailure::NotConverged {
            speed: high.0,
            iterations: 60,
        })?;
        (
            root_in_speed(system, low, (high.0, high.1), high.2, overload, 1.0)?,
            false,
        )
    } else if top_rpm > engine.rated_rpm {
        let top = point_at_engine_rpm(system, top_rpm)?;
        if overload(&top) >= 0.0 {
            let low = (rated_point.speed, overload(&rated_point));
            (
                root_in_speed(system, low, (top.speed, overload(&top)), top, overload, 1.0)?,
                false,
            )
        } else {
            (top, true)
        }
    } else {
        (rated_point, true)
    };

    let free_running_rpm = if governed {
        free_running(system, &top_point)?.map(|p| p.engine_rpm)
    } else {
        Some(top_point.engine_rpm)
    };
    let top_validity = system.resistance.validity_at(top_point.speed);
    Ok(MatchResult {
        top_validity,
        top_speed_in_method_range: top_validity.in_method_range,
        meeting_rpm: top_point.engine_rpm,
        top_speed: top_point.speed,
        top_point,
        rated_point,
        absorbed_fraction_at_rated: absorbed,
        verdict: criteria.verdict(absorbed),
        rpm_margin: top_point.engine_rpm - engine.rated_rpm,
        governed,
        free_running_rpm,
    })
}

/// The point past the governed `top` where the screw would absorb the full-load power (held
/// at its last value), or `None` below the largest speed considered.
fn free_running(
    system: &System<'_>,
    top: &OperatingPoint,
) -> Result<Option<OperatingPoint>, PointFailure> {
    let overload = |p: &OperatingPoint| p.load_fraction - 1.0;
    let ceiling = max_speed(system);
    let mut low = (top.speed, overload(top));
    let mut speed = top.speed;
    while speed < ceiling {
        // Absorbed power grows about as speed³, so this step is aimed at load 1.
        let aim = (1.0 / top.load_fraction.max(1e-3)).cbrt().clamp(1.02, 2.0);
        speed = (speed * aim).min(ceiling);
        let point = match solve_point(system, speed) {
            Ok(point) => point,
            // Past the resistance model's reach: report "not found" rather than failing the match.
            Err(PointFailure::Resistance(_)) => return Ok(None),
            Err(other) => return Err(other),
        };
        if overload(&point) >= 0.0 {
            let found =
                root_in_speed(system, low, (speed, overload(&point)), point, overload, 1.0)?;
            return Ok(Some(found));
        }
        low = (speed, overload(&point));
    }
    Ok(None)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn verdict_follows_the_criteria() {
        let criteria = MatchCriteria::default();
        assert_eq!(criteria.verdict(1.05), Verdict::Over);
        assert_eq!(criteria.verdict(1.0), Verdict::Matched);
        assert_eq!(criteria.verdict(0.9), Verdict::Matched);
        assert_eq!(criteria.verdict(0.8), Verdict::Under);
        let inverted = MatchCriteria {
            over_above: 0.8,
            under_below: 0.9,
        };
        assert!(
            inverted
                .check()
                .unwrap_err()
                .to_string()
                .contains("over-propped limit")
        );
        let negative = MatchCriteria {
            over_above: 1.0,
            under_below: -0.1,
        };
        assert!(
            negative
                .check()
                .unwrap_err()
                .to_string()
                .contains("under-propped limit")
        );
    }
}
