//! One operating point: the thrust identity solved at one boat speed.

mod advance;
mod operating;

pub use operating::OperatingPoint;

pub use advance::{
    AdvanceRatioFailure, MAX_ADVANCE_RATIO_ITERATIONS, THRUST_IDENTITY_TOLERANCE, WarmStart,
    advance_ratio_for_loading,
};

use super::{Installation, System};
use crate::propulsion::engine::EngineSheet;
use crate::propulsion::hull::Interaction;
use crate::propulsion::screw::ScrewModel;
use crate::propulsion::screw::bseries::NOMINAL_REYNOLDS;
use crate::propulsion::water::WaterProperties;
use advance::{PassScrew, advance_ratio_between, bracket, cubic_advance_ratio};
use std::f64::consts::PI;
use thiserror::Error;

/// Why a point could not be solved. Every failure carries its reason to the screen.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum PointFailure {
    /// The speed is negative or not finite.
    #[error("speed {0} m/s is not a valid boat speed")]
    InvalidSpeed(f64),
    /// Resistance could not be evaluated.
    #[error("resistance: {0}")]
    Resistance(#[from] crate::propulsion::hull::HullError),
    /// No advance ratio in (0, J at KT = 0) gives the required thrust loading.
    #[error(
        "the screw cannot give {thrust:.0} N at {}: no advance ratio satisfies the thrust identity",
        crate::propulsion::speed_words(*speed)
    )]
    NoRoot {
        /// The boat speed, m/s.
        speed: f64,
        /// The thrust required, N.
        thrust: f64,
    },
    /// The root finder ran out of iterations before converging.
    #[error(
        "thrust identity did not converge at {} after {iterations} iterations",
        crate::propulsion::speed_words(*speed)
    )]
    NotConverged {
        /// The boat speed, m/s.
        speed: f64,
        /// Iterations used.
        iterations: u32,
    },
    /// The interaction coefficients are outside their meaningful range.
    #[error("interaction coefficient out of range: {0}")]
    BadInteraction(String),
    /// An installation, trip or query value is outside its meaningful range.
    #[error("{field} = {value} is not valid: expected {expected}")]
    BadInput {
        /// The value's name, e.g. "gear ratio".
        field: &'static str,
        /// The value given (SI).
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// A result came out non-finite or with an impossible sign (a defect in a model's data).
    #[error(
        "{quantity} came out as {value} at {}, which is not physical",
        crate::propulsion::speed_words(*speed)
    )]
    Unphysical {
        /// The boat speed, m/s.
        speed: f64,
        /// Which result, e.g. "torque coefficient".
        quantity: &'static str,
        /// The value it came out as.
        value: f64,
    },
    /// The interaction method does not fit the boat's shaft count.
    #[error("{0}")]
    InteractionForShafts(#[from] crate::propulsion::hull::interaction::InteractionShaftsError),
    /// The engine sheet is unusable.
    #[error("engine sheet: {0}")]
    Engine(#[from] crate::propulsion::engine::EngineError),
    /// No boat speed up to the largest considered turns the engine at the requested rpm.
    #[error(
        "the engine does not reach {engine_rpm:.0} rpm at any speed up to {} with this screw",
        crate::propulsion::speed_words(*max_speed)
    )]
    RpmOutOfReach {
        /// The engine rpm asked for.
        engine_rpm: f64,
        /// The largest boat speed considered, m/s.
        max_speed: f64,
    },
}

/// Largest number of passes of the Reynolds-number iteration (J → n → Rn → KT(J, Rn)).
pub const MAX_REYNOLDS_PASSES: u32 = 5;

/// The Reynolds iteration stops when Rn changes by less than this fraction between passes.
pub const REYNOLDS_TOLERANCE: f64 = 1e-3;

/// The part of a system from the screw to the engine, in its water: what turns a required
/// thrust at a speed of advance into screw rpm, power and fuel.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Drive<'a> {
    /// The screw.
    pub screw: &'a ScrewModel,
    /// Gear and shaft.
    pub installation: Installation,
    /// The engine sheet.
    pub engine: &'a EngineSheet,
    /// The water the screw works in (density kg/m³, kinematic viscosity m²/s).
    pub water: WaterProperties,
    /// Whether to apply the B-series Reynolds-number correction at full scale.
    pub reynolds_correction: bool,
}

/// Blade-section Reynolds number at 0.75R: Rn = c·√(Va² + (0.75·π·n·D)²)/ν, with chord c (m),
/// speed of advance Va (m/s), screw speed n (rev/s), diameter D (m), kinematic viscosity ν
/// (m²/s) (ITTC 1978 performance prediction method).
pub fn reynolds_at_075r(
    chord: f64,
    advance_speed: f64,
    screw_rps: f64,
    diameter: f64,
    viscosity: f64,
) -> f64 {
    let section_speed = 0.75 * PI * screw_rps * diameter;
    // √(a² + b²) rather than `hypot`: boat speeds cannot overflow the squares, and the solver
    // asks this at every pass of every point.
    let resultant = (advance_speed * advance_speed + section_speed * section_speed).sqrt();
    chord * resultant / viscosity
}

/// [`reynolds_at_075r`] at advance ratio `j`, where n·D = Va/J: Rn = (c/ν)·Va·√(1 + (0.75π/J)²),
/// with `chord_per_viscosity` c/ν (s/m) and `advance_speed` Va (m/s).
fn reynolds_at_advance_ratio(chord_per_viscosity: f64, advance_speed: f64, j: f64) -> f64 {
    let section = 0.75 * PI / j;
    chord_per_viscosity * advance_speed * (1.0 + section * section).sqrt()
}

/// The operating point at `speed` (m/s) with resistance `resistance` (N) and the interaction
/// coefficients given — the thrust identity of design §2.6 without the hull model. A speed of
/// 0 gives a zero point. No allocation.
pub fn solve_with_resistance(
    drive: &Drive<'_>,
    speed: f64,
    resistance: f64,
    interaction: Interaction,
) -> Result<OperatingPoint, PointFailure> {
    let mut point = OperatingPoint::UNSOLVED;
    solve_warm(
        drive,
        &DriveTerms::new(drive),
        speed,
        resistance,
        interaction,
        &mut WarmStart::default(),
        &mut point,
    )?;
    Ok(point)
}

/// What every point of one drive shares: its checks, made once, and the screw's diameter and
/// chord at 0.75R.
#[derive(Debug, Clone)]
struct DriveTerms {
    /// The gear and shaft check ([`Installation::check`]).
    installation: Result<(), PointFailure>,
    /// The water's density and the screw's diameter, checked.
    medium: Result<(), PointFailure>,
    /// Screw diameter, m.
    diameter: f64,
    /// Blade chord at 0.75R over the water's kinematic viscosity, s/m, when the Reynolds
    /// correction applies (`None` otherwise).
    chord_per_viscosity: Option<f64>,
}

impl DriveTerms {
    fn new(drive: &Drive<'_>) -> Self {
        let density = drive.water.density;
        let diameter = drive.screw.geometry().diameter;
        let medium = if !(density.is_finite() && density > 0.0) {
            Err(PointFailure::BadInput {
                field: "water density",
                value: density,
                expected: "a positive density in kg/m³",
            })
        } else if !(diameter.is_finite() && diameter > 0.0) {
            Err(PointFailure::BadInput {
                field: "screw diameter",
                value: diameter,
                expected: "a positive diameter in metres",
            })
        } else {
            Ok(())
        };
        let correct = drive.reynolds_correction && drive.water.kinematic_viscosity > 0.0;
        Self {
            installation: drive.installation.check(),
            medium,
            diameter,
            chord_per_viscosity: correct
                .then(|| drive.screw.chord_at_075r())
                .flatten()
                .map(|chord| chord / drive.water.kinematic_viscosity),
        }
    }
}

/// [`solve_with_resistance`] into `point`, its roots started from `warm` (the last nearby
/// point), which it updates when the point solves; on a failure `point` holds nothing of use.
#[inline(always)]
fn solve_warm(
    drive: &Drive<'_>,
    terms: &DriveTerms,
    speed: f64,
    resistance: f64,
    interaction: Interaction,
    warm: &mut WarmStart,
    point: &mut OperatingPoint,
) -> Result<(), PointFailure> {
    warm.begin(speed);
    if !(speed.is_finite() && speed >= 0.0) {
        return Err(PointFailure::InvalidSpeed(speed));
    }
    terms.installation.clone()?;
    check_interaction(&interaction)?;
    let Interaction {
        wake_fraction,
        thrust_deduction,
        relative_rotative_efficiency,
    } = interaction;
    if speed == 0.0 {
        *point = OperatingPoint::at_rest(interaction, drive.installation);
        return Ok(());
    }
    if !(resistance.is_finite() && resistance > 0.0) {
        return Err(PointFailure::Unphysical {
            speed,
            quantity: "resistance",
            value: resistance,
        });
    }
    terms.medium.clone()?;
    let density = drive.water.density;
    let diameter = terms.diameter;
    let advance_speed = speed * (1.0 - wake_fraction);
    // Each driven screw gives its share of R/(1 − t); the engines and screws are alike.
    let driven_shafts = drive.installation.driven_shafts();
    let thrust = resistance / ((1.0 - thrust_deduction) * f64::from(driven_shafts));
    let loading = thrust / (density * advance_speed * advance_speed * diameter * diameter);

    let chord = terms.chord_per_viscosity;
    // A nearby point's Rn, carried on, is usually within the iteration's tolerance of this
    // point's: one pass settles it where a start without correction takes three.
    let carried = warm.carry_reynolds && warm.corrected && warm.first > 0.0;
    let mut reynolds: Option<f64> = chord.filter(|_| carried).and_then(|per_viscosity| {
        // The Rn of this point's own speed of advance at the J carried on from the last
        // points: as close as that J is.
        let rn = reynolds_at_advance_ratio(per_viscosity, advance_speed, warm.first);
        (rn.is_finite() && rn > 0.0).then_some(rn)
    });
    let mut previous_j: Option<f64> = None;
    let mut previous_thrust: Option<[f64; 4]> = None;
    let mut found = [0.0; MAX_REYNOLDS_PASSES as usize];
    let mut pass = 1;
    let (advance_ratio, coefficients) = loop {
        let polynomials = PassScrew::new(drive.screw, reynolds);
        let kt = |j: f64| polynomials.thrust_coefficient(j);
        let excess = |j: f64| kt(j) - loading * j * j;
        let root = match (&polynomials, previous_j) {
            // Below the nominal Reynolds number the correction is nil: the pass has the last
            // pass's polynomial, so the last pass's root.
            (PassScrew::Cubics { thrust, .. }, Some(j)) if previous_thrust == Some(*thrust) => {
                Ok(j)
            }
            (PassScrew::Cubics { thrust, .. }, _) => {
                let ends = match previous_j {
                    // A later pass of the Reynolds iteration moves J very little: a tight
                    // bracket around the last root, widened to the full one where it does
                    // not hold.
                    Some(j) => {
                        let (low, high) = (0.97 * j, 1.03 * j);
                        let (f_low, f_high) = (excess(low), excess(high));
                        if f_low > 0.0 && f_high <= 0.0 {
                            ((low, f_low), (high, f_high))
                        } else {
                            let (low, high) = bracket(drive.screw, reynolds, loading, kt);
                            ((low, excess(low)), (high, excess(high)))
                        }
                    }
                    None => {
                        // The last point's root, carried on, usually lies within 1 % of this
                        // one's: a tight bracket around it, the full one where it does not hold.
                        let guess = warm.guess(0, &found);
                        let (low, high) = (0.99 * guess, 1.01 * guess);
                        let (f_low, f_high) = (excess(low), excess(high));
                        if guess > 0.0 && f_low > 0.0 && f_high <= 0.0 {
                            ((low, f_low), (high, f_high))
                        } else {
                            let (low, high) = bracket(drive.screw, reynolds, loading, kt);
                            ((low, excess(low)), (high, excess(high)))
                        }
                    }
                };
                previous_thrust = Some(*thrust);
                let guess = warm.guess(pass as usize - 1, &found);
                cubic_advance_ratio(thrust, loading, ends, guess)
            }
            (PassScrew::Model(..), _) => {
                let (low_j, high_j) = match previous_j {
                    Some(j) if excess(0.97 * j) > 0.0 && excess(1.03 * j) <= 0.0 => {
                        (0.97 * j, 1.03 * j)
                    }
                    _ => bracket(drive.screw, reynolds, loading, kt),
                };
                advance_ratio_between(loading, low_j, high_j, kt)
            }
        };
        let advance_ratio = root.map_err(|f| match f {
            AdvanceRatioFailure::NoRoot => PointFailure::NoRoot { speed, thrust },
            AdvanceRatioFailure::NotConverged { iterations } => {
                PointFailure::NotConverged { speed, iterations }
            }
        })?;
        found[pass as usize - 1] = advance_ratio;
        let coefficients = polynomials.coefficients(advance_ratio);
        let Some(per_viscosity) = chord else {
            break (advance_ratio, coefficients);
        };
        let updated = reynolds_at_advance_ratio(per_viscosity, advance_speed, advance_ratio);
        let settled = reynolds.is_some_and(|r| (updated - r).abs() <= REYNOLDS_TOLERANCE * r);
        if settled || pass >= MAX_REYNOLDS_PASSES || !updated.is_finite() {
            break (advance_ratio, coefficients);
        }
        // At or below the series' nominal Rn the correction is nil: a pass there and the next
        // one, also there, have one polynomial and so one root.
        let nil = |rn: Option<f64>| rn.is_none_or(|r| r.is_nan() || r <= NOMINAL_REYNOLDS);
        if matches!(polynomials, PassScrew::Cubics { .. }) && nil(reynolds) && nil(Some(updated)) {
            reynolds = Some(updated);
            break (advance_ratio, coefficients);
        }
        reynolds = Some(updated);
        previous_j = Some(advance_ratio);
        pass += 1;
    };

    let kt = coefficients.thrust_coefficient;
    let kq = coefficients.torque_coefficient;
    if !(kq.is_finite() && kq > 0.0) {
        return Err(PointFailure::Unphysical {
            speed,
            quantity: "torque coefficient KQ",
            value: kq,
        });
    }
    let screw_rps = advance_speed / (advance_ratio * diameter);
    let torque = kq * density * screw_rps * screw_rps * diameter.powi(5);
    let delivered_power = 2.0 * PI * screw_rps * torque / relative_rotative_efficiency;
    let installation = drive.installation;
    let brake_power_per_engine =
        delivered_power / (installation.shaft_efficiency * installation.gear_efficiency);
    let engines = f64::from(driven_shafts);
    let engine_rpm = 60.0 * screw_rps * installation.gear_ratio;
    let full_load = drive.engine.full_load_power_at(engine_rpm);
    let load_fraction = if full_load > 0.0 {
        brake_power_per_engine / full_load
    } else {
        f64::INFINITY
    };
    let (fuel_mass_flow_per_engine, fuel_volume_flow_per_engine) =
        drive
            .engine
            .fuel_flows_below(engine_rpm, brake_power_per_engine, full_load);
    // Written where the caller keeps it: an operating point is large, and each copy of it
    // showed in the profile of a curve.
    *point = OperatingPoint {
        speed,
        resistance,
        thrust,
        wake_fraction,
        thrust_deduction,
        relative_rotative_efficiency,
        advance_speed,
        advance_ratio,
        thrust_coefficient: kt,
        torque_coefficient: kq,
        open_water_efficiency: coefficients.efficiency().unwrap_or(0.0),
        reynolds: reynolds.unwrap_or(0.0),
        shafts: installation.shafts,
        driven_shafts,
        screw_rps,
        engine_rpm,
        torque,
        effective_power: resistance * speed,
        delivered_power,
        brake_power: engines * brake_power_per_engine,
        brake_power_per_engine,
        load_fraction,
        fuel_mass_flow: engines * fuel_mass_flow_per_engine,
        fuel_volume_flow: engines * fuel_volume_flow_per_engine,
        fuel_mass_flow_per_engine,
        fuel_volume_flow_per_engine,
        froude: 0.0,
        in_method_range: true,
        regime: crate::propulsion::hull::Regime::Method,
    };
    point.check_finite()?;
    // Passes past the last one run keep no guess from an earlier point.
    warm.passes = found;
    warm.firsts = [(speed, found[0]), warm.firsts[0], warm.firsts[1]];
    warm.corrected = reynolds.is_some();
    Ok(())
}

/// Interaction coefficients must be finite with w < 1, t < 1 and ηR > 0.
fn check_interaction(interaction: &Interaction) -> Result<(), PointFailure> {
    let Interaction {
        wake_fraction: w,
        thrust_deduction: t,
        relative_rotative_efficiency: eta,
    } = *interaction;
    // The bounds alone: NaN fails every comparison and an infinity the bounds, so the
    // finiteness the messages name is checked too.
    if w > -1.0 && w < 1.0 && t > -1.0 && t < 1.0 && eta > 0.0 && eta < 2.0 {
        return Ok(());
    }
    let problem = if !(w.is_finite() && w > -1.0 && w < 1.0) {
        Some(format!("wake fraction {w} must lie between -1 and 1"))
    } else if !(t.is_finite() && t > -1.0 && t < 1.0) {
        Some(format!("thrust deduction {t} must lie between -1 and 1"))
    } else if !(eta.is_finite() && eta > 0.0 && eta < 2.0) {
        Some(format!(
            "relative rotative efficiency {eta} must lie between 0 and 2"
        ))
    } else {
        None
    };
    // Allocates only on the failure path.
    problem.map_or(Ok(()), |p| Err(PointFailure::BadInteraction(p)))
}

/// Solves the thrust identity at `speed` m/s (design §2.6). A speed of 0 gives a zero point.
///
/// Resistance from the system's model; wake, thrust deduction and ηR at that speed; then
/// [`solve_with_resistance`]. No allocation on the success path. For many speeds of one
/// system, [`PointSolver`] finds the same points faster.
pub fn solve_point(system: &System<'_>, speed: f64) -> Result<OperatingPoint, PointFailure> {
    PointSolver::new(system).solve(speed)
}

/// One system solved at many speeds (a propeller curve): what does not change with speed —
/// the interaction's hull and screw terms, the validity limits, the shaft-count check — found
/// once, and each point's roots started from the last point's. Gives the points of
/// [`solve_point`] within the thrust identity's tolerance; [`PointSolver::along_curve`] within
/// the Reynolds iteration's.
#[derive(Debug, Clone)]
pub struct PointSolver<'a> {
    system: &'a System<'a>,
    interaction: crate::propulsion::hull::interaction::PreparedInteraction<'a>,
    validity: crate::propulsion::hull::resistance::ValidityScale,
    fits: Result<(), PointFailure>,
    drive: Drive<'a>,
    terms: DriveTerms,
    warm: WarmStart,
}

impl<'a> PointSolver<'a> {
    /// The solver of `system` for speeds along a propeller curve, in order: each point's
    /// Reynolds iteration also starts from the Rn its carried-on J gives, which settles it in
    /// one pass instead of three. A point then depends on the points before it within the
    /// iteration's tolerance ([`REYNOLDS_TOLERANCE`] of Rn, a few parts in 10⁷ of rpm), which
    /// a curve does not notice and a root search in speed would (its probes would not be a
    /// function of speed alone): searches use [`PointSolver::new`].
    pub fn along_curve(system: &'a System<'a>) -> Self {
        let mut solver = Self::new(system);
        solver.warm.carry_reynolds = true;
        solver
    }

    /// The solver of `system`: each point's root started from the last point's, its Reynolds
    /// iteration from no correction, so that every point is a function of its speed alone.
    pub fn new(system: &'a System<'a>) -> Self {
        let model = system.resistance;
        Self {
            system,
            interaction: system.interaction.prepared(
                &model.hull,
                &model.water,
                &system.screw_at_stern(),
            ),
            validity: model.validity_scale(),
            fits: system.check_interaction_fits(),
            drive: system.drive(),
            terms: DriveTerms::new(&system.drive()),
            warm: WarmStart::default(),
        }
    }

    /// The operating point at `speed` m/s, as [`solve_point`] gives it.
    #[inline]
    pub fn solve(&mut self, speed: f64) -> Result<OperatingPoint, PointFailure> {
        let mut point = OperatingPoint::UNSOLVED;
        self.solve_into(speed, &mut point)?;
        Ok(point)
    }

    /// [`PointSolver::solve`] written into `point`, for a caller that keeps many points (a
    /// curve) and so saves the copy of each; on a failure `point` holds nothing of use.
    #[inline]
    pub fn solve_into(
        &mut self,
        speed: f64,
        point: &mut OperatingPoint,
    ) -> Result<(), PointFailure> {
        if !(speed.is_finite() && speed >= 0.0) {
            return Err(PointFailure::InvalidSpeed(speed));
        }
        self.fits.clone()?;
        let system = self.system;
        let model = system.resistance;
        let interaction = self.interaction.at_speed(speed);
        if speed == 0.0 {
            // The estimates may be undefined at rest; a boat at rest needs none of them.
            let interaction = if check_interaction(&interaction).is_ok() {
                interaction
            } else {
                Interaction {
                    wake_fraction: 0.0,
                    thrust_deduction: 0.0,
                    relative_rotative_efficiency: 1.0,
                }
            };
            *point = solve_with_resistance(&system.drive(), 0.0, 0.0, interaction)?;
            return Ok(());
        }
        let resistance = model.resistance(speed)?.total;
        solve_warm(
            &self.drive,
            &self.terms,
            speed,
            resistance,
            interaction,
            &mut self.warm,
            point,
        )?;
        let validity = model.validity_with(&self.validity, speed);
        point.froude = validity.froude;
        point.in_method_range = validity.in_method_range;
        point.regime = validity.regime;
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::propulsion::engine::{FuelModel, RpmCurve};
    use crate::propulsion::screw::{OpenWaterPoint, OpenWaterTable, ScrewGeometry};

    /// The positive root of a − b·J − L·J² = 0: the thrust identity for KT = a − b·J.
    fn quadratic_root(a: f64, b: f64, loading: f64) -> f64 {
        (-b + (b * b + 4.0 * loading * a).sqrt()) / (2.0 * loading)
    }

    #[test]
    fn linear_thrust_curve_gives_the_quadratic_root() {
        let (a, b) = (0.40, 0.45);
        for loading in [1e-6, 0.01, 0.5, 1.55, 10.0, 1e3, 1e7] {
            let j = advance_ratio_for_loading(loading, a / b, |j| a - b * j).unwrap();
            let want = quadratic_root(a, b, loading);
            assert!(
                (j - want).abs() <= 1e-9 * want,
                "loading {loading}: {j} vs {want}"
            );
            let residual = (a - b * j) / (loading * j * j) - 1.0;
            assert!(
                residual.abs() < 1e-9,
                "loading {loading}: residual {residual}"
            );
        }
    }

    #[test]
    fn no_root_is_reported() {
        let kt = |j: f64| 0.4 - 0.45 * j;
        assert_eq!(
            advance_ratio_for_loading(0.0, 0.9, kt),
            Err(AdvanceRatioFailure::NoRoot)
        );
        assert_eq!(
            advance_ratio_for_loading(f64::NAN, 0.9, kt),
            Err(AdvanceRatioFailure::NoRoot)
        );
        assert_eq!(
            advance_ratio_for_loading(1.0, -1.0, kt),
            Err(AdvanceRatioFailure::NoRoot)
        );
        // A screw that gives no thrust at J = 0.
        let dead = |j: f64| -0.1 - j;
        assert_eq!(
            advance_ratio_for_loading(1.0, 0.5, dead),
            Err(AdvanceRatioFailure::NoRoot)
        );
    }

    fn table_screw() -> ScrewModel {
        let geometry = ScrewGeometry {
            blades: 3,
            diameter: 0.6,
            pitch: 0.48,
            area_ratio: 0.5,
        };
        let row = |j: f64| OpenWaterPoint {
            advance_ratio: j,
            thrust_coefficient: 0.40 - 0.45 * j,
            torque_coefficient: 0.050 - 0.040 * j,
        };
        ScrewModel::Table(
            OpenWaterTable::new(geometry, vec![row(0.0), row(0.5), row(1.0)]).unwrap(),
        )
    }

    fn engine() -> EngineSheet {
        EngineSheet {
            name: "Invented 4-cylinder".into(),
            rated_rpm: 3000.0,
            idle_rpm: 700.0,
            full_load_power: RpmCurve {
                points: vec![(1000.0, 20e3), (3000.0, 60e3)],
            },
            propeller_law: None,
            fuel: FuelModel::Willans {
                full_load_sfc: 230e-3 / 3.6e6,
                zero_load_fraction: 0.1,
            },
            fuel_density: 840.0,
            duty: None,
            full_throttle_limit: None,
            max_continuous_power: None,
        }
    }

    const SEA: WaterProperties = WaterProperties {
        density: 1025.0,
        kinematic_viscosity: 1.19e-6,
        vapour_pressure: 1700.0,
    };
    const GEAR: Installation = Installation {
        gear_ratio: 2.0,
        shaft_efficiency: 0.98,
        gear_efficiency: 0.97,
        shafts: 1,
        idle_shafts: 0,
    };
    const INTERACTION: Interaction = Interaction {
        wake_fraction: 0.2,
        thrust_deduction: 0.15,
        relative_rotative_efficiency: 1.02,
    };

    #[test]
    fn a_point_with_a_table_screw_satisfies_every_identity() {
        let (screw, engine) = (table_screw(), engine());
        let drive = Drive {
            screw: &screw,
            installation: GEAR,
            engine: &engine,
            water: SEA,
            reynolds_correction: true,
        };
        let p = solve_with_resistance(&drive, 4.0, 5000.0, INTERACTION).unwrap();
        // By hand: Va = 4·0.8 = 3.2 m/s, T = 5000/0.85 = 5882.35 N,
        // loading = T/(1025·3.2²·0.6²) = 1.55677; J from a − bJ − L·J² = 0.
        assert!((p.advance_speed - 3.2).abs() < 1e-12);
        assert!((p.thrust - 5000.0 / 0.85).abs() < 1e-9);
        let loading = p.thrust / (1025.0 * 3.2 * 3.2 * 0.36);
        assert!((loading - 1.55677).abs() < 1e-5);
        let j = quadratic_root(0.40, 0.45, loading);
        assert!((p.advance_ratio - j).abs() < 1e-9 * j);
        assert!(((p.screw_thrust(1025.0, 0.6) - p.thrust) / p.thrust).abs() < 1e-9);
        let n = 3.2 / (j * 0.6);
        assert!((p.screw_rps - n).abs() < 1e-8 * n);
        let kq = 0.050 - 0.040 * j;
        let torque = kq * 1025.0 * n * n * 0.6f64.powi(5);
        assert!((p.torque - torque).abs() < 1e-8 * torque);
        let delivered = 2.0 * PI * n * torque / 1.02;
        assert!((p.delivered_power - delivered).abs() < 1e-8 * delivered);
        assert!((p.brake_power - delivered / (0.98 * 0.97)).abs() < 1e-8 * delivered);
        assert!((p.engine_rpm - 120.0 * n).abs() < 1e-8 * p.engine_rpm);
        let full = 20e3 + (p.engine_rpm - 1000.0) / 2000.0 * 40e3;
        assert!((p.load_fraction - p.brake_power / full).abs() < 1e-9);
        assert!(
            (p.fuel_mass_flow - engine.fuel_mass_flow(p.engine_rpm, p.brake_power)).abs() < 1e-15
        );
        // A table screw has no chord, so no Reynolds correction is made.
        assert_eq!(p.reynolds, 0.0);
        assert!((p.open_water_efficiency - j * (0.40 - 0.45 * j) / (2.0 * PI * kq)).abs() < 1e-9);
    }

    #[test]
    fn twin_screws_each_run_like_one_screw_with_half_the_resistance() {
        // The thrust identity of design §2.6 applied per screw (exact algebra): twice the
        // resistance on two shafts turns each screw exactly as the single screw turns at the
        // single resistance.
        let (screw, engine) = (table_screw(), engine());
        let single = Drive {
            screw: &screw,
            installation: GEAR,
            engine: &engine,
            water: SEA,
            reynolds_correction: true,
        };
        let twin = Drive {
            installation: Installation { shafts: 2, ..GEAR },
            ..single
        };
        let one = solve_with_resistance(&single, 4.0, 5000.0, INTERACTION).unwrap();
        let two = solve_with_resistance(&twin, 4.0, 10000.0, INTERACTION).unwrap();
        let close = |a: f64, b: f64| (a - b).abs() <= 1e-9 * a.abs().max(1e-12);
        assert!(close(one.thrust, two.thrust));
        assert!(close(one.engine_rpm, two.engine_rpm));
        assert!(close(one.torque, two.torque));
        assert!(close(
            one.brake_power_per_engine,
            two.brake_power_per_engine
        ));
        assert!(close(one.load_fraction, two.load_fraction));
        assert!(close(2.0 * one.brake_power, two.brake_power));
        assert!(close(2.0 * one.fuel_volume_flow, two.fuel_volume_flow));
        assert!(close(one.fuel_volume_flow, two.fuel_volume_flow_per_engine));
        assert!(close(
            2.0 * one.delivered_power_total(),
            two.delivered_power_total()
        ));
        assert_eq!((two.shafts, two.driven_shafts), (2, 2));
        // One engine out: the one running screw carries all of R/(1 − t).
        let one_out = Drive {
            installation: Installation {
                shafts: 2,
                idle_shafts: 1,
                ..GEAR
            },
            ..single
        };
        let alone = solve_with_resistance(&one_out, 4.0, 10000.0, INTERACTION).unwrap();
        assert!(close(alone.thrust, 10000.0 / 0.85));
        assert!(close(alone.brake_power, alone.brake_power_per_engine));
        assert!(alone.load_fraction > two.load_fraction);
    }

    #[test]
    fn extreme_loadings_still_solve_or_fail_cleanly() {
        let (screw, engine) = (table_screw(), engine());
        let drive = Drive {
            screw: &screw,
            installation: GEAR,
            engine: &engine,
            water: SEA,
            reynolds_correction: false,
        };
        // Towing a barge at a crawl and a feather-light hull at speed.
        for (speed, resistance) in [(0.01, 5e4), (1e-6, 1.0), (8.0, 1e-3), (20.0, 1e6)] {
            let p = solve_with_resistance(&drive, speed, resistance, INTERACTION).unwrap();
            let residual = p.screw_thrust(1025.0, 0.6) / p.thrust - 1.0;
            assert!(residual.abs() < 1e-6, "speed {speed}: residual {residual}");
            assert!(p.advance_ratio > 0.0 && p.advance_ratio < 0.4 / 0.45);
        }
    }

    #[test]
    fn failures_carry_their_reason() {
        let (screw, engine) = (table_screw(), engine());
        let drive = Drive {
            screw: &screw,
            installation: GEAR,
            engine: &engine,
            water: SEA,
            reynolds_correction: false,
        };
        assert_eq!(
            solve_with_resistance(&drive, -1.0, 100.0, INTERACTION),
            Err(PointFailure::InvalidSpeed(-1.0))
        );
        assert!(matches!(
            solve_with_resistance(&drive, f64::NAN, 100.0, INTERACTION),
            Err(PointFailure::InvalidSpeed(_))
        ));
        let wake = Interaction {
            wake_fraction: 1.0,
            ..INTERACTION
        };
        let message = solve_with_resistance(&drive, 3.0, 100.0, wake)
            .unwrap_err()
            .to_string();
        assert!(message.contains("wake fraction 1"), "{message}");
        let infinite = solve_with_resistance(&drive, 3.0, f64::INFINITY, INTERACTION);
        assert!(matches!(
            infinite,
            Err(PointFailure::Unphysical {
                quantity: "resistance",
                ..
            })
        ));
        let bad_gear = Drive {
            installation: Installation {
                gear_ratio: -2.0,
                ..GEAR
            },
            ..drive
        };
        assert!(matches!(
            solve_with_resistance(&bad_gear, 3.0, 100.0, INTERACTION),
            Err(PointFailure::BadInput {
                field: "gear ratio",
                ..
            })
        ));
    }

    #[test]
    fn at_rest_everything_is_zero() {
        let (screw, engine) = (table_screw(), engine());
        let drive = Drive {
            screw: &screw,
            installation: GEAR,
            engine: &engine,
            water: SEA,
            reynolds_correction: true,
        };
        let p = solve_with_resistance(&drive, 0.0, 0.0, INTERACTION).unwrap();
        assert_eq!(
            (p.engine_rpm, p.brake_power, p.fuel_mass_flow, p.thrust),
            (0.0, 0.0, 0.0, 0.0)
        );
        assert_eq!(p.wake_fraction, 0.2);
    }

    #[test]
    fn reynolds_formula_matches_hand_value() {
        // c = 0.2 m, Va = 3 m/s, n = 10 rev/s, D = 0.6 m, ν = 1.19e-6 m²/s:
        // section speed 0.75·π·10·0.6 = 14.137 m/s, √(9 + 199.86) = 14.452 m/s → Rn = 2.4289e6.
        let rn = reynolds_at_075r(0.2, 3.0, 10.0, 0.6, 1.19e-6);
        assert!((rn - 2.4289e6).abs() < 0.0005e6, "{rn}");
        // The solver's form in J: the same point has J = Va/(n·D) = 0.5.
        let in_j = reynolds_at_advance_ratio(0.2 / 1.19e-6, 3.0, 3.0 / (10.0 * 0.6));
        assert!((in_j - rn).abs() <= 1e-12 * rn, "{in_j} against {rn}");
    }
}
