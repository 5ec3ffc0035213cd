//! The checks of a screw and its shaft, defined once: where on the curve a screw is checked,
//! cavitation at a point, and the shaft rule (the file's material, else stainless 316 with a
//! note saying so).

use serde::Serialize;

use super::CheckInputs;
use crate::propulsion::screw::ScrewGeometry;
use crate::propulsion::screw::cavitation::CavitationReport;
use crate::propulsion::solver::checks::cavitation_at_point;
use crate::propulsion::solver::shaft::{
    ShaftCheck, ShaftMaterial, YACHT_SAFETY_FACTOR, check_shaft,
};
use crate::propulsion::solver::{OperatingPoint, Vessel};

/// Material assumed for the shaft check when the boat file names none.
pub const DEFAULT_SHAFT_MATERIAL: &str = "stainless 316";

/// Where on the propeller curve a screw is checked.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum CheckPoint {
    /// At the trip's target speed.
    #[serde(rename = "target_speed")]
    Target,
    /// At full throttle (the meeting point, top speed).
    #[serde(rename = "top_speed")]
    Top,
}

impl CheckPoint {
    /// Both points, in the order they are shown.
    pub const ALL: [CheckPoint; 2] = [CheckPoint::Target, CheckPoint::Top];

    /// The point's name as shown ("target speed", "top speed").
    pub fn name(self) -> &'static str {
        match self {
            CheckPoint::Target => "target speed",
            CheckPoint::Top => "top speed",
        }
    }

    /// The point in words (the same as [`CheckPoint::name`]).
    pub fn words(self) -> &'static str {
        self.name()
    }
}

/// The built-in shaft material the file's name means, or why none does (naming the field).
pub fn shaft_material(name: &str) -> Result<ShaftMaterial, String> {
    ShaftMaterial::by_name(name).map_err(|e| format!("installation.shaft_material: {e}"))
}

/// The shaft check with the boat's material (or [`DEFAULT_SHAFT_MATERIAL`], with a note saying
/// it was assumed), and that note.
pub fn shaft_check(
    vessel: &Vessel,
    inputs: &CheckInputs,
) -> (Result<ShaftCheck, String>, Option<String>) {
    let (material, note) = match &inputs.shaft_material {
        Some(name) => (shaft_material(name), None),
        None => (
            shaft_material(DEFAULT_SHAFT_MATERIAL),
            Some(format!(
                "the boat file names no installation.shaft_material: {DEFAULT_SHAFT_MATERIAL} assumed"
            )),
        ),
    };
    let shaft = material.and_then(|m| {
        check_shaft(
            &vessel.engine,
            &vessel.installation,
            &m,
            YACHT_SAFETY_FACTOR,
            inputs.shaft_diameter,
        )
        .map_err(|e| e.to_string())
    });
    (shaft, note)
}

/// Cavitation and blade loading of `geometry` at `point` with the shaft `immersion` (m) below
/// the waterline of `vessel`'s water.
pub fn cavitation(
    vessel: &Vessel,
    geometry: ScrewGeometry,
    point: &OperatingPoint,
    immersion: f64,
) -> Result<CavitationReport, String> {
    cavitation_at_point(geometry, point, &vessel.resistance.water, immersion)
        .map_err(|e| e.to_string())
}
