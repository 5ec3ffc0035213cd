//! The advance ratio of one operating point: the thrust identity's root in J, its bracket,
//! the open-water cubics of one Reynolds pass, and where a nearby point's roots start.

use super::MAX_REYNOLDS_PASSES;
use crate::propulsion::numeric::{RootOutcome, brent};
use crate::propulsion::screw::ScrewModel;
use std::convert::Infallible;

/// Largest number of root-finder iterations for the advance ratio.
pub const MAX_ADVANCE_RATIO_ITERATIONS: u32 = 100;

/// The solver stops when |KT(J)/(J²·loading) − 1| is below this (the thrust identity residual).
pub const THRUST_IDENTITY_TOLERANCE: f64 = 1e-10;

/// Why the advance-ratio root could not be found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum AdvanceRatioFailure {
    /// No J in (0, J at KT = 0] gives the loading (KT ≤ 0 at J = 0, or a bad bracket).
    NoRoot,
    /// The iteration cap was reached.
    NotConverged {
        /// Iterations used.
        iterations: u32,
    },
}

/// The root of the thrust identity KT(J) = loading·J² on (0, `upper_j`], where
/// loading = T/(ρ·Va²·D²) is the required thrust loading KT/J², `thrust_coefficient` gives
/// KT(J), and `upper_j` is the J at KT = 0 or any J between the root and it. Returns J.
/// Brent's method on the bracket [0, `upper_j`]: at J = 0 the difference KT − loading·J² is
/// KT(0) > 0 and at zero thrust it is −loading·J0² < 0. No allocation.
pub fn advance_ratio_for_loading(
    loading: f64,
    upper_j: f64,
    thrust_coefficient: impl Fn(f64) -> f64,
) -> Result<f64, AdvanceRatioFailure> {
    advance_ratio_between(loading, 0.0, upper_j, thrust_coefficient)
}

/// As [`advance_ratio_for_loading`] on the bracket [`low_j`, `high_j`], which must hold the
/// root: KT − loading·J² > 0 at `low_j` and ≤ 0 at `high_j`.
pub(super) fn advance_ratio_between(
    loading: f64,
    low_j: f64,
    high_j: f64,
    thrust_coefficient: impl Fn(f64) -> f64,
) -> Result<f64, AdvanceRatioFailure> {
    let bracket_ok = low_j.is_finite() && low_j >= 0.0 && high_j.is_finite() && high_j > low_j;
    if !(loading.is_finite() && loading > 0.0 && bracket_ok) {
        return Err(AdvanceRatioFailure::NoRoot);
    }
    let excess = |j: f64| thrust_coefficient(j) - loading * j * j;
    let (low, high) = (excess(low_j), excess(high_j));
    if !(low > 0.0 && high <= 0.0) {
        return Err(AdvanceRatioFailure::NoRoot);
    }
    let accept =
        |j: f64, fj: f64| j > 0.0 && fj.abs() <= THRUST_IDENTITY_TOLERANCE * loading * j * j;
    let outcome = brent(
        |j| Ok::<_, Infallible>(excess(j)),
        (low_j, low),
        (high_j, high),
        accept,
        1e-15 * high_j,
        MAX_ADVANCE_RATIO_ITERATIONS,
    );
    match outcome {
        Ok(RootOutcome::Converged { x, .. }) if x > 0.0 => Ok(x),
        Ok(RootOutcome::Converged { .. }) => Err(AdvanceRatioFailure::NoRoot),
        Ok(RootOutcome::IterationCap { iterations }) => {
            Err(AdvanceRatioFailure::NotConverged { iterations })
        }
        Err(never) => match never {},
    }
}

/// The advance ratio of each Reynolds pass of the last point solved (0 for a pass not run),
/// and the first passes of the points before it: where the next, nearby speed starts its roots.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct WarmStart {
    pub(super) passes: [f64; MAX_REYNOLDS_PASSES as usize],
    /// The speed (m/s) and first pass's J of the last three points solved, newest first
    /// ((0, 0) for none).
    pub(super) firsts: [(f64, f64); 3],
    /// The speed of the point being solved, m/s.
    pub(super) speed: f64,
    /// The first pass's guess at that speed ([`WarmStart::first_guess`]).
    pub(super) first: f64,
    /// Whether the last point solved had its screw corrected for its Reynolds number.
    pub(super) corrected: bool,
    /// Whether a point's Reynolds iteration starts from the Rn of the J carried on
    /// ([`PointSolver::along_curve`]) rather than uncorrected.
    pub(super) carry_reynolds: bool,
}

impl WarmStart {
    /// Readies the guesses for the point at `speed` m/s.
    pub(super) fn begin(&mut self, speed: f64) {
        self.speed = speed;
        self.first = self.first_guess();
    }

    /// The guess for pass `pass` (0-based) of a point whose earlier passes found `own`; 0 for
    /// none. The first pass's J is carried on from the last points (J changes smoothly with
    /// speed): through the last three by a parabola when this speed lies close to them, else
    /// in a straight line through the last two; a later pass's is the last point's J of that
    /// pass, moved by how much this point's J has already moved from the last point's.
    pub(super) fn guess(&self, pass: usize, own: &[f64; MAX_REYNOLDS_PASSES as usize]) -> f64 {
        let neighbour = self.passes[pass];
        if pass == 0 {
            return self.first;
        }
        let (before, own_before) = (self.passes[pass - 1], own[pass - 1]);
        if neighbour > 0.0 && before > 0.0 {
            own_before * (neighbour / before)
        } else {
            own_before
        }
    }

    fn first_guess(&self) -> f64 {
        let v = self.speed;
        let [(v1, j1), (v2, j2), (v3, j3)] = self.firsts;
        if j1 > 0.0 && j2 > 0.0 && j3 > 0.0 && (v - v1).abs() <= 2.0 * (v1 - v2).abs() {
            // Lagrange's parabola through the three points.
            let parabola = j1 * ((v - v2) * (v - v3)) / ((v1 - v2) * (v1 - v3))
                + j2 * ((v - v1) * (v - v3)) / ((v2 - v1) * (v2 - v3))
                + j3 * ((v - v1) * (v - v2)) / ((v3 - v1) * (v3 - v2));
            if parabola.is_finite() && parabola > 0.0 {
                return parabola;
            }
        }
        let line = j1 + (j1 - j2) * (v - v1) / (v1 - v2);
        if j1 > 0.0 && j2 > 0.0 && line.is_finite() && line > 0.0 {
            line
        } else {
            j1
        }
    }
}

/// The open-water polynomials of one Reynolds pass: cubics in J for a B-series screw (the
/// correction folded in once per pass), the model itself for a table.
pub(super) enum PassScrew<'a> {
    Cubics { thrust: [f64; 4], torque: [f64; 4] },
    Model(&'a ScrewModel, Option<f64>),
}

/// A cubic's value at `j` by Horner's rule.
#[inline(always)]
fn cubic_at(c: &[f64; 4], j: f64) -> f64 {
    ((c[3] * j + c[2]) * j + c[1]) * j + c[0]
}

impl<'a> PassScrew<'a> {
    #[inline(always)]
    pub(super) fn new(screw: &'a ScrewModel, reynolds: Option<f64>) -> Self {
        match screw.cubics_at(reynolds) {
            Some((thrust, torque)) => PassScrew::Cubics { thrust, torque },
            None => PassScrew::Model(screw, reynolds),
        }
    }

    #[inline(always)]
    pub(super) fn thrust_coefficient(&self, j: f64) -> f64 {
        match self {
            PassScrew::Cubics { thrust, .. } => cubic_at(thrust, j),
            PassScrew::Model(screw, reynolds) => {
                screw.coefficients(j, *reynolds).thrust_coefficient
            }
        }
    }

    #[inline(always)]
    pub(super) fn coefficients(&self, j: f64) -> crate::propulsion::screw::OpenWaterPoint {
        match self {
            PassScrew::Cubics { thrust, torque } => crate::propulsion::screw::OpenWaterPoint {
                advance_ratio: j,
                thrust_coefficient: cubic_at(thrust, j),
                torque_coefficient: cubic_at(torque, j),
            },
            PassScrew::Model(screw, reynolds) => screw.coefficients(j, *reynolds),
        }
    }
}

/// The root of the thrust identity KT(J) = loading·J² with KT a cubic in J, on the bracket
/// ((low J, excess there), (high J, excess there)), the excess KT − loading·J² > 0 at the low
/// end and ≤ 0 at the high one, by Halley's method from
/// `guess` (any J inside the bracket; otherwise the secant through its ends), each step kept
/// inside the shrinking bracket by bisection. Stops as [`advance_ratio_for_loading`] does.
#[inline(always)]
pub(super) fn cubic_advance_ratio(
    thrust: &[f64; 4],
    loading: f64,
    ((low_j, f_low), (high_j, f_high)): ((f64, f64), (f64, f64)),
    guess: f64,
) -> Result<f64, AdvanceRatioFailure> {
    let bracket_ok = low_j.is_finite() && low_j >= 0.0 && high_j.is_finite() && high_j > low_j;
    if !(loading.is_finite() && loading > 0.0 && bracket_ok) {
        return Err(AdvanceRatioFailure::NoRoot);
    }
    let excess = |j: f64| cubic_at(thrust, j) - loading * j * j;
    let slope = |j: f64| thrust[1] + j * (2.0 * (thrust[2] - loading) + 3.0 * thrust[3] * j);
    let curvature = |j: f64| 2.0 * (thrust[2] - loading) + 6.0 * thrust[3] * j;
    if !(f_low > 0.0 && f_high <= 0.0) {
        return Err(AdvanceRatioFailure::NoRoot);
    }
    let accept =
        |j: f64, fj: f64| j > 0.0 && fj.abs() <= THRUST_IDENTITY_TOLERANCE * loading * j * j;
    if accept(high_j, f_high) {
        return Ok(high_j);
    }
    let (mut low, mut high) = (low_j, high_j);
    let mut j = if guess > low && guess < high {
        guess
    } else {
        low + (high - low) * f_low / (f_low - f_high)
    };
    for _ in 0..MAX_ADVANCE_RATIO_ITERATIONS {
        let fj = excess(j);
        if accept(j, fj) {
            return Ok(j);
        }
        if fj > 0.0 {
            low = j;
        } else {
            high = j;
        }
        if high - low <= 1e-15 * high_j {
            return if j > 0.0 {
                Ok(j)
            } else {
                Err(AdvanceRatioFailure::NoRoot)
            };
        }
        // Halley's step (the cubic's second derivative is at hand): from a neighbour's root
        // one step reaches the tolerance.
        let (d1, d2) = (slope(j), curvature(j));
        let next = j - 2.0 * fj * d1 / (2.0 * d1 * d1 - fj * d2);
        j = if next > low && next < high {
            next
        } else {
            0.5 * (low + high)
        };
    }
    Err(AdvanceRatioFailure::NotConverged {
        iterations: MAX_ADVANCE_RATIO_ITERATIONS,
    })
}

/// A bracket [low, high] of the advance-ratio root, found without searching for zero thrust
/// when it can be avoided. With KT falling in J, KT(J) ≤ KT(0) = loading·J² at
/// J = √(KT(0)/loading), so that J is past the root; it is used when it lies below 0.9·P/D,
/// where a fixed-pitch screw still gives thrust (zero thrust lies near or beyond the face
/// pitch) and KT still falls. Otherwise, for a lightly loaded screw, J steps up from 0.9·P/D
/// by 0.1·P/D to the first J past the root (up to 2·P/D), and only failing that is the screw's
/// zero-thrust J used.
pub(super) fn bracket(
    screw: &ScrewModel,
    reynolds: Option<f64>,
    loading: f64,
    thrust_coefficient: impl Fn(f64) -> f64,
) -> (f64, f64) {
    let pitch_ratio = screw.geometry().pitch_ratio();
    let by_loading = (thrust_coefficient(0.0) / loading).sqrt();
    if by_loading.is_finite() && by_loading > 0.0 && by_loading <= 0.9 * pitch_ratio {
        return (0.0, by_loading);
    }
    let excess = |j: f64| thrust_coefficient(j) - loading * j * j;
    let mut low = 0.0;
    for tenths in 9..=20 {
        let j = 0.1 * f64::from(tenths) * pitch_ratio;
        if j.is_nan() || j <= low {
            break;
        }
        if excess(j) <= 0.0 {
            return (low, j);
        }
        low = j;
    }
    (0.0, screw.zero_thrust_advance_ratio(reynolds))
}
