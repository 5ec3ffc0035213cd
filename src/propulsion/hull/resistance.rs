//! The resistance model of a boat: a method, air drag and margins, evaluated at any speed.

use super::{HullError, HullForm};
use crate::propulsion::Warning;
use crate::propulsion::water::WaterProperties;

/// Resistance at one speed split into its components, all in newtons.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct ResistanceComponents {
    /// Frictional resistance of the bare hull by ITTC-1957 (without form factor), N.
    pub friction: f64,
    /// Form factor 1+k1 applied to friction (dimensionless).
    pub form_factor: f64,
    /// Appendage resistance, N.
    pub appendages: f64,
    /// Wave-making and wave-breaking resistance, N.
    pub wave: f64,
    /// Extra pressure resistance of a bulbous bow near the surface, N.
    pub bulb: f64,
    /// Extra pressure resistance of an immersed transom, N.
    pub transom: f64,
    /// Model–ship correlation (roughness) allowance, N.
    pub correlation: f64,
    /// Air and wind resistance of the superstructure, N.
    pub air: f64,
    /// Service margin (fouling, sea state) added on top, N.
    pub margin: f64,
    /// Total resistance including every component, the margin and the calibration factor, N.
    pub total: f64,
}

/// A user resistance table: speed (m/s) → total calm-water hull resistance (N), sorted by speed.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ResistanceTable {
    /// Rows of (speed m/s, resistance N), strictly increasing in speed.
    pub rows: Vec<(f64, f64)>,
}

/// Which calm-water resistance method to use.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub enum ResistanceMethod {
    /// Holtrop & Mennen (1982) with Holtrop (1984) revisions.
    HoltropMennen,
    /// A user-supplied table, interpolated.
    Table(ResistanceTable),
}

/// Air drag of the above-water boat: ½·ρair·Cd·A·(V + headwind)².
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct AirDrag {
    /// Air density, kg/m³.
    pub air_density: f64,
    /// Drag coefficient based on frontal area (dimensionless).
    pub drag_coefficient: f64,
    /// Frontal (transverse projected) area above water, m².
    pub frontal_area: f64,
    /// Headwind speed relative to ground, m/s (0 for calm air).
    pub headwind: f64,
}

/// Allowances added to calm-water resistance.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Margins {
    /// Service margin on total resistance (fouling, sea state), fraction (0.15 = +15 %).
    pub service: f64,
    /// Hull fouling as added frictional resistance, fraction of friction (0.2 = +20 %).
    pub fouling: f64,
    /// Calibration factor on total resistance from a sea trial (1.0 = none).
    pub resistance_factor: f64,
}

impl Default for Margins {
    fn default() -> Self {
        Self {
            service: 0.0,
            fouling: 0.0,
            resistance_factor: 1.0,
        }
    }
}

/// Everything needed to evaluate a boat's resistance at any speed.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ResistanceModel {
    /// The resolved hull.
    pub hull: HullForm,
    /// The calm-water method.
    pub method: ResistanceMethod,
    /// The water the boat floats in.
    pub water: WaterProperties,
    /// Air drag, or `None` to ignore it.
    pub air: Option<AirDrag>,
    /// Margins and calibration.
    pub margins: Margins,
}

impl ResistanceModel {
    /// Total resistance and its components at `speed` (m/s); 0 m/s gives all zeros.
    pub fn resistance(&self, speed: f64) -> Result<ResistanceComponents, HullError> {
        let _ = speed;
        unimplemented!("hull helper")
    }

    /// Warnings for this model: hull outside the method's published parameter ranges, etc.
    pub fn warnings(&self) -> Vec<Warning> {
        unimplemented!("hull helper")
    }

    /// Speed-dependent warnings, e.g. a Froude number past the method's range, at `speed` m/s.
    pub fn warnings_at(&self, speed: f64) -> Vec<Warning> {
        let _ = speed;
        unimplemented!("hull helper")
    }
}
