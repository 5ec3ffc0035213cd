//! Matching the propeller curve to the engine's full-load envelope.

use super::System;
use super::point::{OperatingPoint, PointFailure, PointSolver, solve_point};
use crate::propulsion::STANDARD_GRAVITY;
use crate::propulsion::hull::SpeedValidity;
use crate::propulsion::numeric::{RootOutcome, brent};

/// Whether the screw lets the engine reach rated rpm with a little headroom.
///
/// One definition, in rpm at full throttle (see [`MatchResult::rpm_margin`]): over-propped
/// when the engine cannot reach rated rpm, under-propped when it would run free past rated
/// rpm plus the allowed light-running margin, matched between — each edge with
/// [`MatchCriteria::tolerance`].
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Verdict {
    /// The screw absorbs more than the engine gives at rated rpm: it cannot reach rated rpm.
    Over,
    /// Rated rpm is reached with no more than the allowed light-running margin.
    Matched,
    /// The screw absorbs too little: the engine would run free too far past rated rpm.
    Under,
}

/// The default light-running margin the pitch recommendation aims at, fraction of rated rpm
/// (common practice: a clean boat in calm water should run free a little past rated rpm, about
/// 2 %, so that fouling, load and a seaway still leave the engine at rated rpm).
pub const DEFAULT_LIGHT_RUNNING: f64 = 0.02;

/// The default largest free-running margin still "matched", fraction of rated rpm (common
/// practice: rated rpm to about 3 % above it).
pub const DEFAULT_FREE_RUNNING_ALLOWANCE: f64 = 0.03;

/// The default tolerance at each edge of the verdict, fraction of rated rpm (0.2 %: about
/// 5 rpm at 2600 rpm, below what a tachometer shows; keeps a screw pitched exactly to an edge
/// off a knife-edge).
pub const DEFAULT_VERDICT_TOLERANCE: f64 = 0.002;

/// Limits for the verdict, as fractions of rated rpm.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct MatchCriteria {
    /// The light-running margin a recommended pitch aims at: free-running rpm above rated,
    /// fraction of rated rpm (common practice 0.02; 0 asks for exactly rated rpm).
    pub light_running: f64,
    /// Free-running rpm above rated beyond which the screw is under-propped, fraction of rated
    /// rpm (common practice 0.03); the band is widened to `light_running` if that is larger.
    pub free_running_allowance: f64,
    /// Tolerance at each edge of the verdict, fraction of rated rpm.
    pub tolerance: f64,
}

impl Default for MatchCriteria {
    fn default() -> Self {
        Self {
            light_running: DEFAULT_LIGHT_RUNNING,
            free_running_allowance: DEFAULT_FREE_RUNNING_ALLOWANCE,
            tolerance: DEFAULT_VERDICT_TOLERANCE,
        }
    }
}

impl MatchCriteria {
    /// Checks each fraction is finite, at least 0 and below 0.5 (tolerance below 0.05).
    pub fn check(&self) -> Result<(), PointFailure> {
        for (field, value, limit) in [
            ("light-running margin", self.light_running, 0.5),
            ("free-running allowance", self.free_running_allowance, 0.5),
            ("verdict tolerance", self.tolerance, 0.05),
        ] {
            if !(value.is_finite() && (0.0..limit).contains(&value)) {
                return Err(PointFailure::BadInput {
                    field,
                    value,
                    expected: "a fraction of rated rpm of 0 or more and well below 1",
                });
            }
        }
        Ok(())
    }

    /// The largest margin still matched, fraction of rated rpm (before the tolerance).
    pub fn upper_margin(&self) -> f64 {
        self.free_running_allowance.max(self.light_running)
    }

    /// The verdict for a screw that lets the engine reach `rpm_margin` rpm past `rated_rpm`
    /// at full throttle (negative: a shortfall).
    pub fn verdict(&self, rpm_margin: f64, rated_rpm: f64) -> Verdict {
        let tolerance = self.tolerance * rated_rpm;
        if rpm_margin < -tolerance {
            Verdict::Over
        } else if rpm_margin > self.upper_margin() * rated_rpm + tolerance {
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
    /// The verdict, from `rpm_margin` (see [`MatchCriteria::verdict`]).
    pub verdict: Verdict,
    /// The margin at full throttle, rpm: the rpm at which the screw absorbs the engine's
    /// full-load power minus rated rpm. Negative is a shortfall (the engine cannot reach rated
    /// rpm: over-propped); positive is headroom — for a governed engine, how far past rated
    /// the screw would let it run free (`free_running_rpm` − rated). When the free-running
    /// point lies past the largest speed considered, this is the lower bound `meeting_rpm` −
    /// rated and `margin_is_lower_bound` is set.
    pub rpm_margin: f64,
    /// Whether `rpm_margin` is only a lower bound (free-running point not found).
    pub margin_is_lower_bound: bool,
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
/// V/√(g·LWL). Displacement hulls live below about Fn 0.5 (common practice) and
/// semi-displacement ones below about 1.0; the resistance curve rises at every speed
/// (`hull::regime`), so the searches go on to 2.0 — where the screw, not the hull, decides
/// whether an rpm is reached — while staying bounded.
pub const MAX_FROUDE_NUMBER: f64 = 2.0;

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
    // One solver for the whole search: its terms found once, each root started from the last.
    let mut solver = PointSolver::new(system);
    let mut ceiling = ceiling;
    let mut low = (0.0, -engine_rpm);
    let mut speed = FIRST_PROBE_FROUDE_NUMBER / MAX_FROUDE_NUMBER * ceiling;
    for _ in 0..MAX_SPEED_ITERATIONS {
        let point = match solver.solve(speed) {
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
                &mut solver,
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

/// How far past the target rpm the probes of [`point_at_engine_rpm_near`] aim at first, as a
/// fraction of speed: enough to close the bracket where rpm grows about in proportion to
/// speed, little enough that Brent's first secant step from it lands on the root.
const NEAR_AIM_PAST: f64 = 0.002;

/// [`point_at_engine_rpm`] started at `near` m/s, a speed where the engine turns close to
/// `engine_rpm` (the answer for a nearby screw): a probe there and probes aimed a little past
/// the target from it — rpm grows at least in proportion to speed along a propeller curve —
/// close a tight bracket for Brent's method. Where three aims do not close it (or a probe
/// fails) the full search runs, so the answer is always [`point_at_engine_rpm`]'s to within
/// its tolerance.
pub fn point_at_engine_rpm_near(
    system: &System<'_>,
    engine_rpm: f64,
    near: f64,
) -> Result<OperatingPoint, PointFailure> {
    let ceiling = max_speed(system);
    if !(engine_rpm.is_finite() && engine_rpm > 0.0 && near.is_finite() && near > 0.0)
        || near >= ceiling
    {
        return point_at_engine_rpm(system, engine_rpm);
    }
    let excess = |p: &OperatingPoint| p.engine_rpm - engine_rpm;
    let mut solver = PointSolver::new(system);
    // (speed, rpm missing) below the target, and (speed, rpm past it, its point) above.
    let mut below: Option<(f64, f64)> = None;
    let mut above: Option<(f64, f64, OperatingPoint)> = None;
    let mut speed = near;
    let mut past = NEAR_AIM_PAST;
    for _ in 0..3 {
        let Ok(point) = solver.solve(speed) else {
            break;
        };
        let missing = excess(&point);
        if missing >= 0.0 {
            above = Some((speed, missing, point));
        } else {
            below = Some((speed, missing));
        }
        if let (Some(low), Some((high, at_high, high_point))) = (below, above) {
            return root_in_speed(
                &mut solver,
                low,
                (high, at_high),
                high_point,
                excess,
                engine_rpm,
            );
        }
        // A point with no rpm (or a NaN) gives no aim.
        if point.engine_rpm.is_nan() || point.engine_rpm <= 0.0 {
            break;
        }
        let side = if missing < 0.0 {
            1.0 + past
        } else {
            1.0 - past
        };
        speed = (speed * engine_rpm / point.engine_rpm * side).min(ceiling);
        past *= 5.0;
    }
    point_at_engine_rpm(system, engine_rpm)
}

/// The point between speeds `low` and `high` (each with its value of `quantity`, of opposite
/// signs) where `quantity` is 0, to within `SPEED_SEARCH_TOLERANCE`·`scale`. `high_point` is the
/// point already solved at `high`.
fn root_in_speed(
    solver: &mut PointSolver<'_>,
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
            last = solver.solve(speed)?;
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
        RootOutcome::Converged { x, .. } => solver.solve(x),
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
    // Each engine against its own envelope; identical engines give one answer.
    let absorbed = rated_point.brake_power_per_engine / engine.rated_power();
    let overload = |p: &OperatingPoint| p.load_fraction - 1.0;
    let top_rpm = engine.full_load_power.last_rpm().max(engine.rated_rpm);
    let mut solver = PointSolver::new(system);

    let (top_point, governed) = if overload(&rated_point) >= 0.0 {
        // Over-propped (or exactly matched): the meeting point lies below rated speed. Near
        // rest, load falls as speed² (PB ∝ V³ against P_full ∝ rpm), so halving finds a
        // speed with load below 1.
        let mut high = (rated_point.speed, overload(&rated_point), rated_point);
        let mut low = None;
        for _ in 0..60 {
            let speed = 0.5 * high.0;
            let point = solver.solve(speed)?;
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
            root_in_speed(&mut solver, low, (high.0, high.1), high.2, overload, 1.0)?,
            false,
        )
    } else if top_rpm > engine.rated_rpm {
        let top = point_at_engine_rpm(system, top_rpm)?;
        if overload(&top) >= 0.0 {
            let low = (rated_point.speed, overload(&rated_point));
            (
                root_in_speed(
                    &mut solver,
                    low,
                    (top.speed, overload(&top)),
                    top,
                    overload,
                    1.0,
                )?,
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
    let rated_rpm = engine.rated_rpm;
    let rpm_margin = free_running_rpm.unwrap_or(top_point.engine_rpm) - rated_rpm;
    let margin_is_lower_bound = free_running_rpm.is_none();
    let verdict = if margin_is_lower_bound {
        // Never loaded to full power below the largest speed considered: far too light.
        Verdict::Under
    } else {
        criteria.verdict(rpm_margin, rated_rpm)
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
        verdict,
        rpm_margin,
        margin_is_lower_bound,
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
    let mut solver = PointSolver::new(system);
    let ceiling = max_speed(system);
    let mut low = (top.speed, overload(top));
    let mut speed = top.speed;
    while speed < ceiling {
        // Absorbed power grows about as speed³, so this step is aimed at load 1.
        let aim = (1.0 / top.load_fraction.max(1e-3)).cbrt().clamp(1.02, 2.0);
        speed = (speed * aim).min(ceiling);
        let point = match solver.solve(speed) {
            Ok(point) => point,
            // Past the resistance model's reach: report "not found" rather than failing the match.
            Err(PointFailure::Resistance(_)) => return Ok(None),
            Err(other) => return Err(other),
        };
        if overload(&point) >= 0.0 {
            let found = root_in_speed(
                &mut solver,
                low,
                (speed, overload(&point)),
                point,
                overload,
                1.0,
            )?;
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
        // common practice: matched from rated rpm to about +3 % free-running, with a small
        // tolerance at each edge.
        let criteria = MatchCriteria::default();
        let rated = 2600.0;
        assert_eq!(criteria.verdict(-20.0, rated), Verdict::Over);
        assert_eq!(criteria.verdict(-1e-6, rated), Verdict::Matched);
        assert_eq!(criteria.verdict(0.0, rated), Verdict::Matched);
        assert_eq!(criteria.verdict(52.0, rated), Verdict::Matched);
        assert_eq!(criteria.verdict(80.0, rated), Verdict::Matched);
        assert_eq!(criteria.verdict(90.0, rated), Verdict::Under);
        let wide = MatchCriteria {
            light_running: 0.05,
            ..criteria
        };
        assert_eq!(wide.verdict(130.0, rated), Verdict::Matched);
        let negative = MatchCriteria {
            light_running: -0.1,
            ..criteria
        };
        assert!(
            negative
                .check()
                .unwrap_err()
                .to_string()
                .contains("light-running margin")
        );
        let nan = MatchCriteria {
            tolerance: f64::NAN,
            ..criteria
        };
        assert!(nan.check().is_err());
    }
}
