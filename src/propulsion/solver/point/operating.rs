//! The operating point: what a solved point holds, its point at rest and its finiteness check.

use super::PointFailure;
use crate::propulsion::hull::Interaction;
use crate::propulsion::solver::Installation;

/// A solved operating point at one boat speed. SI units, rpm named as such.
///
/// On a twin-screw boat the screw, shaft and engine figures (thrust, n, Q, PD, rpm, load) are
/// those of each driven screw and its engine, which all run alike; `brake_power` and the fuel
/// flows are the boat's totals, with `brake_power_per_engine` and the `_per_engine` flows
/// beside them. On a single screw the two agree.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct OperatingPoint {
    /// Boat speed through the water, m/s.
    pub speed: f64,
    /// Total resistance including margins, N.
    pub resistance: f64,
    /// Required thrust of each driven screw T = R/((1−t)·driven shafts), N.
    pub thrust: f64,
    /// Wake fraction w used.
    pub wake_fraction: f64,
    /// Thrust deduction t used.
    pub thrust_deduction: f64,
    /// Relative rotative efficiency ηR used.
    pub relative_rotative_efficiency: f64,
    /// Speed of advance Va = V(1−w), m/s.
    pub advance_speed: f64,
    /// Advance ratio J.
    pub advance_ratio: f64,
    /// Thrust coefficient KT at J.
    pub thrust_coefficient: f64,
    /// Torque coefficient KQ at J.
    pub torque_coefficient: f64,
    /// Open-water efficiency η0.
    pub open_water_efficiency: f64,
    /// Blade-section Reynolds number at 0.75R used for the correction (0 if none).
    pub reynolds: f64,
    /// Shafts fitted (1 or 2).
    pub shafts: u32,
    /// Shafts driven by a running engine (1 or 2); the totals are this many times the
    /// per-engine figures.
    pub driven_shafts: u32,
    /// Screw speed of each driven screw, rev/s.
    pub screw_rps: f64,
    /// Engine speed, rpm.
    pub engine_rpm: f64,
    /// Torque of each driven screw Q, N·m.
    pub torque: f64,
    /// Effective (towing) power R·V, W.
    pub effective_power: f64,
    /// Delivered power at each driven screw PD = 2π·n·Q/ηR, W.
    pub delivered_power: f64,
    /// Brake power of the boat: every running engine's PB = PD/(ηshaft·ηgear) together, W.
    pub brake_power: f64,
    /// Brake power of each running engine PB = PD/(ηshaft·ηgear), W.
    pub brake_power_per_engine: f64,
    /// Each running engine's brake power as a fraction of its full-load power at this rpm.
    pub load_fraction: f64,
    /// Fuel mass flow of the boat (every running engine), kg/s.
    pub fuel_mass_flow: f64,
    /// Fuel volume flow of the boat (every running engine), m³/s.
    pub fuel_volume_flow: f64,
    /// Fuel mass flow of each running engine, kg/s.
    pub fuel_mass_flow_per_engine: f64,
    /// Fuel volume flow of each running engine, m³/s.
    pub fuel_volume_flow_per_engine: f64,
    /// Length Froude number V/√(g·LWL) of the point (0 when solved without a hull model).
    pub froude: f64,
    /// Whether the resistance method is valid at this speed (its Froude range and the
    /// displacement regime, [`ResistanceModel::validity_at`]); true when solved without a hull
    /// model.
    ///
    /// [`ResistanceModel::validity_at`]: crate::propulsion::hull::ResistanceModel::validity_at
    pub in_method_range: bool,
    /// Which formula gave the resistance at this speed (`Method` when solved without a hull
    /// model).
    pub regime: crate::propulsion::hull::Regime,
}

impl OperatingPoint {
    /// A point with every figure 0, for a solver to write its point into.
    pub const UNSOLVED: Self = Self {
        speed: 0.0,
        resistance: 0.0,
        thrust: 0.0,
        wake_fraction: 0.0,
        thrust_deduction: 0.0,
        relative_rotative_efficiency: 0.0,
        advance_speed: 0.0,
        advance_ratio: 0.0,
        thrust_coefficient: 0.0,
        torque_coefficient: 0.0,
        open_water_efficiency: 0.0,
        reynolds: 0.0,
        shafts: 0,
        driven_shafts: 0,
        screw_rps: 0.0,
        engine_rpm: 0.0,
        torque: 0.0,
        effective_power: 0.0,
        delivered_power: 0.0,
        brake_power: 0.0,
        brake_power_per_engine: 0.0,
        load_fraction: 0.0,
        fuel_mass_flow: 0.0,
        fuel_volume_flow: 0.0,
        fuel_mass_flow_per_engine: 0.0,
        fuel_volume_flow_per_engine: 0.0,
        froude: 0.0,
        in_method_range: true,
        regime: crate::propulsion::hull::Regime::Method,
    };

    /// The point of a boat at rest: every speed, force, power and flow 0.
    pub(super) fn at_rest(interaction: Interaction, installation: Installation) -> Self {
        Self {
            wake_fraction: interaction.wake_fraction,
            thrust_deduction: interaction.thrust_deduction,
            relative_rotative_efficiency: interaction.relative_rotative_efficiency,
            shafts: installation.shafts,
            driven_shafts: installation.driven_shafts(),
            ..Self::UNSOLVED
        }
    }

    /// Delivered power of the boat: every driven screw's PD together, W.
    pub fn delivered_power_total(&self) -> f64 {
        f64::from(self.driven_shafts) * self.delivered_power
    }

    /// Thrust of every driven screw together, N.
    pub fn thrust_total(&self) -> f64 {
        f64::from(self.driven_shafts) * self.thrust
    }

    /// Thrust each screw gives at this point, KT·ρ·n²·D⁴, N (for checking the thrust identity).
    pub fn screw_thrust(&self, density: f64, diameter: f64) -> f64 {
        self.thrust_coefficient * density * self.screw_rps.powi(2) * diameter.powi(4)
    }

    /// Every field finite, or the first that is not as a failure.
    #[inline(always)]
    pub(super) fn check_finite(&self) -> Result<(), PointFailure> {
        // The common case first, without building the named list: a sum of finite values is
        // finite, and any NaN or infinity makes it not (a sum that overflows goes on to the
        // list, which then finds nothing).
        let sum = self.resistance
            + self.thrust
            + self.advance_speed
            + self.advance_ratio
            + self.thrust_coefficient
            + self.open_water_efficiency
            + self.reynolds
            + self.screw_rps
            + self.engine_rpm
            + self.torque
            + self.effective_power
            + self.delivered_power
            + self.brake_power
            + self.brake_power_per_engine
            + self.load_fraction
            + self.fuel_mass_flow
            + self.fuel_volume_flow
            + self.fuel_mass_flow_per_engine
            + self.fuel_volume_flow_per_engine;
        if sum.is_finite() {
            Ok(())
        } else {
            self.first_not_finite()
        }
    }

    /// The first field of [`OperatingPoint::check_finite`]'s list that is not finite, as a
    /// failure (none when only their sum overflowed).
    #[cold]
    fn first_not_finite(&self) -> Result<(), PointFailure> {
        let fields = [
            ("resistance", self.resistance),
            ("thrust", self.thrust),
            ("speed of advance", self.advance_speed),
            ("advance ratio", self.advance_ratio),
            ("thrust coefficient KT", self.thrust_coefficient),
            ("open-water efficiency", self.open_water_efficiency),
            ("Reynolds number", self.reynolds),
            ("screw rps", self.screw_rps),
            ("engine rpm", self.engine_rpm),
            ("torque", self.torque),
            ("effective power", self.effective_power),
            ("delivered power", self.delivered_power),
            ("brake power", self.brake_power),
            ("brake power per engine", self.brake_power_per_engine),
            ("load fraction", self.load_fraction),
            ("fuel mass flow", self.fuel_mass_flow),
            ("fuel volume flow", self.fuel_volume_flow),
            ("fuel mass flow per engine", self.fuel_mass_flow_per_engine),
            (
                "fuel volume flow per engine",
                self.fuel_volume_flow_per_engine,
            ),
        ];
        match fields.iter().find(|(_, value)| !value.is_finite()) {
            Some(&(quantity, value)) => Err(PointFailure::Unphysical {
                speed: self.speed,
                quantity,
                value,
            }),
            None => Ok(()),
        }
    }
}
