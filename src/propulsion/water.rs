//! Water and air properties (ITTC Recommended Procedure 7.5-02-01-03).

use thiserror::Error;

/// Which kind of water the boat floats in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum WaterKind {
    /// Fresh water (salinity 0).
    Fresh,
    /// Standard sea water (salinity 35 g/kg).
    Sea,
}

/// Physical properties of the water at one temperature.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct WaterProperties {
    /// Density, kg/m³.
    pub density: f64,
    /// Kinematic viscosity, m²/s.
    pub kinematic_viscosity: f64,
    /// Saturation vapour pressure, Pa.
    pub vapour_pressure: f64,
}

/// Why water properties could not be computed.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum WaterError {
    /// The temperature lies outside the procedure's tables.
    #[error("water temperature {temperature_c} °C is outside 0–40 °C covered by ITTC 7.5-02-01-03")]
    TemperatureOutOfRange {
        /// The temperature given, °C.
        temperature_c: f64,
    },
}
