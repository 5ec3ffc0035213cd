//! The engine sheet: full-load power envelope, propeller-law curve, fuel consumption.

use crate::propulsion::Warning;
use thiserror::Error;

/// A curve of (engine rpm, value) points sorted by rpm, interpolated linearly.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct RpmCurve {
    /// Rows of (engine rpm, value), strictly increasing in rpm.
    pub points: Vec<(f64, f64)>,
}

/// How the engine's fuel consumption is described.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub enum FuelModel {
    /// Specific fuel consumption, kg/J, on a grid of engine rpm × load fraction (0–1 of full-load
    /// power at that rpm), interpolated bilinearly.
    SfcMap {
        /// Grid rpms, increasing.
        rpm: Vec<f64>,
        /// Grid load fractions, increasing.
        load: Vec<f64>,
        /// sfc[i][k] at rpm[i], load[k], kg/J.
        sfc: Vec<Vec<f64>>,
    },
    /// Fuel mass flow, kg/s, measured along the maker's propeller curve, by engine rpm.
    RateAlongPropellerCurve(RpmCurve),
    /// Full-load SFC with a Willans-line part-load model: fuel flow = a·P + b·rpm-dependent idle.
    Willans {
        /// SFC at full load (rated), kg/J.
        full_load_sfc: f64,
        /// Fuel flow at zero brake power as a fraction of full-load flow at the same rpm.
        zero_load_fraction: f64,
    },
}

/// The duty rating the maker gives the engine.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Duty {
    /// Continuous duty: full power without a time limit.
    Continuous,
    /// Intermittent duty: full throttle limited in time.
    Intermittent,
}

/// An engine sheet in SI units (rpm named as such).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct EngineSheet {
    /// Engine name as shown to the user.
    pub name: String,
    /// Rated crankshaft speed, rpm.
    pub rated_rpm: f64,
    /// Idle speed, rpm.
    pub idle_rpm: f64,
    /// Full-load brake power by rpm, W.
    pub full_load_power: RpmCurve,
    /// The maker's published propeller-law power curve, W, if given.
    pub propeller_law: Option<RpmCurve>,
    /// Fuel consumption model.
    pub fuel: FuelModel,
    /// Fuel density, kg/m³.
    pub fuel_density: f64,
    /// Duty rating, if the maker states it.
    pub duty: Option<Duty>,
    /// Full-throttle time limit for intermittent duty, s.
    pub full_throttle_limit: Option<f64>,
    /// Maximum continuous power, W, if different from the full-load curve.
    pub max_continuous_power: Option<f64>,
}

/// Why an engine sheet is unusable.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum EngineError {
    /// A curve has too few points, unsorted rpm or non-positive values.
    #[error("{curve}: {problem}")]
    BadCurve {
        /// Which curve.
        curve: &'static str,
        /// What is wrong with it.
        problem: String,
    },
    /// A scalar value is outside its meaningful range.
    #[error("{field} = {value} is not valid: {expected}")]
    BadValue {
        /// The field.
        field: &'static str,
        /// The value given.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
}

impl EngineSheet {
    /// Checks the sheet for consistency (sorted curves, rated rpm inside the curve, …).
    pub fn validate(&self) -> Result<Vec<Warning>, EngineError> {
        unimplemented!("solver helper")
    }
    /// Full-load brake power at `rpm`, W (clamped to the curve's ends; 0 below idle... see docs).
    pub fn full_load_power_at(&self, rpm: f64) -> f64 {
        let _ = rpm;
        unimplemented!("solver helper")
    }
    /// Rated power: full-load power at rated rpm, W.
    pub fn rated_power(&self) -> f64 {
        self.full_load_power_at(self.rated_rpm)
    }
    /// Full-load torque at `rpm`, N·m.
    pub fn full_load_torque_at(&self, rpm: f64) -> f64 {
        let omega = rpm * std::f64::consts::TAU / 60.0;
        if omega > 0.0 {
            self.full_load_power_at(rpm) / omega
        } else {
            0.0
        }
    }
    /// Fuel mass flow at `rpm` and brake power `power` (W), kg/s.
    pub fn fuel_mass_flow(&self, rpm: f64, power: f64) -> f64 {
        let _ = (rpm, power);
        unimplemented!("solver helper")
    }
    /// Fuel volume flow at `rpm` and brake power `power` (W), m³/s.
    pub fn fuel_volume_flow(&self, rpm: f64, power: f64) -> f64 {
        self.fuel_mass_flow(rpm, power) / self.fuel_density
    }
}
