//! The raw file form of a boat: every value keeps its span for error messages.

use super::{LoadCondition, Rotation, Side};
use crate::propulsion::solver::RunDirection;
use crate::propulsion::water::WaterKind;
use serde::{Deserialize, Serialize};
use toml::Spanned;

pub(super) type RawOpenWaterRow = (Spanned<f64>, Spanned<f64>, Spanned<f64>);
pub(super) type RawPairs = Vec<(Spanned<String>, Spanned<String>)>;

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawBoat {
    pub(super) schema: Spanned<i64>,
    pub(super) name: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) units: Option<Spanned<String>>,
    pub(super) engine: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) active_variant: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) reynolds_correction: Option<bool>,
    pub(super) hull: RawHull,
    pub(super) load: RawLoad,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) resistance: Option<RawResistance>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) windage: Option<RawWindage>,
    pub(super) water: RawWater,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) interaction: Option<RawInteraction>,
    pub(super) installation: RawInstallation,
    pub(super) trip: RawTrip,
    #[serde(rename = "match", default, skip_serializing_if = "Option::is_none")]
    pub(super) match_criteria: Option<RawMatch>,
    #[serde(default)]
    pub(super) variant: Vec<RawVariant>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) screw_shop: Option<RawScrewShop>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) trial: Option<RawTrial>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) calibration: Option<RawCalibration>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) as_found: Option<RawAsFound>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub(super) history: Vec<RawHistory>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawAsFound {
    pub(super) engine: Spanned<String>,
    /// A number (2.5) or a ratio written as text ("2.5:1").
    pub(super) gear_ratio: Spanned<toml::Value>,
    pub(super) variant: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) shaft_efficiency: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) gear_efficiency: Option<Spanned<f64>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawHistory {
    pub(super) until: Spanned<String>,
    pub(super) engine: Spanned<String>,
    pub(super) gear_ratio: Spanned<toml::Value>,
    pub(super) screw: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) trial: Option<RawTrial>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawHull {
    pub(super) length_waterline: Spanned<String>,
    pub(super) beam_waterline: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) draft: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) draft_aft: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) draft_forward: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) midship_coefficient: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) waterplane_coefficient: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) lcb_fraction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) wetted_surface: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) half_entrance_angle: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) transom_area: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) bulb_area: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) bulb_centre_height: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) stern_coefficient: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) appendage_area: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) appendage_form_factor: Option<Spanned<f64>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawLoad {
    pub(super) default: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) light: Option<RawCase>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) half: Option<RawCase>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) full: Option<RawCase>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawCase {
    pub(super) displacement: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) draft_aft: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) draft_forward: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawResistance {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) method: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) service_margin: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) fouling: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) table: Option<RawPairs>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawWindage {
    pub(super) frontal_area: Spanned<String>,
    pub(super) drag_coefficient: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) headwind: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) air_density: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawWater {
    pub(super) kind: Spanned<String>,
    pub(super) temperature: Spanned<String>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawInteraction {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) method: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) wake_fraction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) thrust_deduction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) relative_rotative_efficiency: Option<Spanned<f64>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawInstallation {
    /// A number (2.5) or a ratio written as text ("2.5:1").
    pub(super) gear_ratio: Spanned<toml::Value>,
    pub(super) shaft_efficiency: Spanned<f64>,
    pub(super) gear_efficiency: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) shaft_immersion: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) shaft_diameter: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) shaft_material: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) max_screw_diameter: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) tip_clearance: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) weight_change: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) shafts: Option<Spanned<i64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) port_shaft_immersion: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawVariant {
    pub(super) label: Spanned<String>,
    pub(super) blades: Spanned<i64>,
    pub(super) diameter: Spanned<String>,
    pub(super) pitch: Spanned<String>,
    pub(super) area_ratio: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) thickness_ratio: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) rotation: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) open_water: Option<Vec<RawOpenWaterRow>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawTrip {
    pub(super) target_speed: Spanned<String>,
    pub(super) tank: Spanned<String>,
    pub(super) usable_fraction: Spanned<f64>,
    pub(super) reserve: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) profile: Option<Vec<(Spanned<String>, Spanned<f64>)>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawMatch {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) light_running: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) free_running_allowance: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) repitch_limit: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) repitch_fraction: Option<Spanned<f64>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawTrial {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) date: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) note: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) installation: Option<Spanned<String>>,
    #[serde(default)]
    pub(super) run: Vec<RawRun>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawRun {
    pub(super) rpm: Spanned<String>,
    pub(super) speed: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) direction: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) fuel_rate: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawCalibration {
    pub(super) resistance_factor: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) wake_fraction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) froude_low: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) factor_low: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) froude_high: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) factor_high: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) trial_date: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) note: Option<String>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawScrewShop {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) pitch_step: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) taper: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) bore: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub(super) keyway: Option<Spanned<String>>,
}

// The names each choice is spelt with in a file (read and written).
pub(super) const CONDITIONS: [(&str, LoadCondition); 3] = [
    ("light", LoadCondition::Light),
    ("half", LoadCondition::Half),
    ("full", LoadCondition::Full),
];
pub(super) const WATERS: [(&str, WaterKind); 2] =
    [("sea", WaterKind::Sea), ("fresh", WaterKind::Fresh)];
pub(super) const METHODS: [(&str, u8); 4] = [
    ("auto", 0),
    ("holtrop-mennen", 1),
    ("van-oortmerssen", 2),
    ("table", 3),
];
pub(super) const INTERACTIONS: [(&str, u8); 5] = [
    ("auto", 0),
    ("holtrop-1984", 1),
    ("taylor", 2),
    ("van-oortmerssen", 3),
    ("user", 4),
];
pub(super) const ROTATIONS: [(&str, Rotation); 2] =
    [("right", Rotation::Right), ("left", Rotation::Left)];
pub(super) const SIDES: [(&str, Side); 2] =
    [("as-found", Side::AsFound), ("planned", Side::Planned)];
pub(super) const DIRECTIONS: [(&str, RunDirection); 2] =
    [("out", RunDirection::Out), ("back", RunDirection::Back)];
