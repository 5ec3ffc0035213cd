//! The boat file (`boats/NAME.toml`): schema, typed document, validation, and the core's `Vessel`.

use super::engine::{EngineDoc, UNIT_SYSTEMS};
use super::error::{Issue, ProfileError};
use super::quantity::{Quantity, Reader, guess_system, out, out_num, out_text};
use crate::propulsion::hull::interaction::ScrewAtStern;
use crate::propulsion::hull::{
    AirDrag, HullError, HullInput, Interaction, InteractionMethod, Margins, ResistanceMethod,
    ResistanceModel, ResistanceTable, choose_method,
};
use crate::propulsion::screw::{
    BSeriesScrew, OpenWaterPoint, OpenWaterTable, ScrewGeometry, ScrewModel,
};
use crate::propulsion::solver::pitch::RepitchLimit;
use crate::propulsion::solver::{
    Installation, MatchCriteria, RunDirection, TrialRun, Trip, Variant, Vessel,
};
use crate::propulsion::water::{self, WaterKind};
use crate::units::{Kind, UnitSystem};
use serde::{Deserialize, Serialize};
use toml::Spanned;

/// Which loading of the boat to solve for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum LoadCondition {
    /// Empty tanks, no stores: how boats are often propped.
    Light,
    /// Half tanks and stores.
    Half,
    /// Full tanks, water, stores and crew.
    Full,
}

impl LoadCondition {
    /// Every condition, lightest first.
    pub const ALL: [LoadCondition; 3] = [
        LoadCondition::Light,
        LoadCondition::Half,
        LoadCondition::Full,
    ];

    /// The name used in files and on screen: "light", "half" or "full".
    pub fn name(self) -> &'static str {
        match self {
            LoadCondition::Light => "light",
            LoadCondition::Half => "half",
            LoadCondition::Full => "full",
        }
    }
}

impl std::fmt::Display for LoadCondition {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.name())
    }
}

/// Hand of rotation of a screw seen from astern.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Rotation {
    /// Right-handed: clockwise seen from astern, going ahead.
    Right,
    /// Left-handed: anticlockwise seen from astern.
    Left,
}

/// Hull particulars (SI); `None` means "estimate it" (the core reports it as estimated).
#[derive(Debug, Clone, PartialEq)]
pub struct HullDoc {
    /// Waterline length, m.
    pub length_waterline: Quantity,
    /// Waterline beam, m.
    pub beam_waterline: Quantity,
    /// Canoe-body draft aft at the default condition, m.
    pub draft_aft: Quantity,
    /// Canoe-body draft forward at the default condition, m.
    pub draft_forward: Quantity,
    /// Midship section coefficient Cm.
    pub midship_coefficient: Option<f64>,
    /// Waterplane area coefficient Cwp.
    pub waterplane_coefficient: Option<f64>,
    /// Longitudinal centre of buoyancy, fraction of L forward of ½L (negative aft).
    pub lcb_fraction: Option<f64>,
    /// Bare-hull wetted surface, m².
    pub wetted_surface: Option<Quantity>,
    /// Half angle of entrance, degrees.
    pub half_entrance_angle: Option<Quantity>,
    /// Immersed transom area at rest, m².
    pub transom_area: Option<Quantity>,
    /// Transverse bulb area, m² (none when absent).
    pub bulb_area: Option<Quantity>,
    /// Height of the bulb's centre above the keel, m.
    pub bulb_centre_height: Option<Quantity>,
    /// Holtrop's stern shape coefficient (−25 … +10; 0 when absent).
    pub stern_coefficient: Option<f64>,
    /// Wetted area of rudder, skeg, shaft and brackets, m² (none when absent).
    pub appendage_area: Option<Quantity>,
    /// Equivalent appendage form factor 1+k2 (1.5 when absent).
    pub appendage_form_factor: Option<f64>,
}

/// One loading: displacement and, optionally, its own drafts.
#[derive(Debug, Clone, PartialEq)]
pub struct LoadCase {
    /// Displacement mass, kg.
    pub displacement: Quantity,
    /// Draft aft in this condition, m (the hull's draft when absent).
    pub draft_aft: Option<Quantity>,
    /// Draft forward in this condition, m (the hull's draft when absent).
    pub draft_forward: Option<Quantity>,
}

/// The boat's load conditions and which one is used by default.
#[derive(Debug, Clone, PartialEq)]
pub struct LoadDoc {
    /// The condition used when none is asked for.
    pub default: LoadCondition,
    /// Light condition.
    pub light: Option<LoadCase>,
    /// Half-load condition.
    pub half: Option<LoadCase>,
    /// Full-load condition.
    pub full: Option<LoadCase>,
}

impl LoadDoc {
    /// The case of `condition`, if the file gives it.
    pub fn case(&self, condition: LoadCondition) -> Option<&LoadCase> {
        match condition {
            LoadCondition::Light => self.light.as_ref(),
            LoadCondition::Half => self.half.as_ref(),
            LoadCondition::Full => self.full.as_ref(),
        }
    }
}

/// The calm-water resistance method.
#[derive(Debug, Clone, PartialEq)]
pub enum ResistanceMethodDoc {
    /// No method named: the core picks the one whose ranges hold the hull.
    Auto,
    /// Holtrop & Mennen (1982) / Holtrop (1984).
    HoltropMennen,
    /// Van Oortmerssen (1971), the small-ship regression.
    VanOortmerssen,
    /// A user table of (speed m/s, total calm-water resistance N).
    Table(Vec<(Quantity, Quantity)>),
}

/// Resistance method and margins.
#[derive(Debug, Clone, PartialEq)]
pub struct ResistanceDoc {
    /// The method.
    pub method: ResistanceMethodDoc,
    /// Service margin on total resistance, fraction (0.15 = +15 %).
    pub service_margin: f64,
    /// Fouling as added friction, fraction of friction.
    pub fouling: f64,
}

/// Air drag of the above-water boat.
#[derive(Debug, Clone, PartialEq)]
pub struct WindageDoc {
    /// Frontal area above water, m².
    pub frontal_area: Quantity,
    /// Drag coefficient on frontal area.
    pub drag_coefficient: f64,
    /// Headwind speed, m/s (calm when absent).
    pub headwind: Option<Quantity>,
    /// Air density, kg/m³ (the core's standard air when absent).
    pub air_density: Option<Quantity>,
}

/// The water the boat floats in.
#[derive(Debug, Clone, PartialEq)]
pub struct WaterDoc {
    /// Sea or fresh water.
    pub kind: WaterKind,
    /// Water temperature, °C.
    pub temperature: Quantity,
}

/// How wake fraction, thrust deduction and ηR are found.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum InteractionDoc {
    /// No method named: the one paired with the resistance method (van Oortmerssen's factors
    /// with van Oortmerssen, Holtrop 1984 otherwise).
    Auto,
    /// Holtrop (1984) single-screw formulas.
    Holtrop1984,
    /// Van Oortmerssen (1971) small-ship factors.
    VanOortmerssen,
    /// Taylor's wake estimate.
    Taylor,
    /// The user's values: wake fraction, thrust deduction, relative rotative efficiency.
    User {
        /// Taylor wake fraction w.
        wake_fraction: f64,
        /// Thrust deduction t.
        thrust_deduction: f64,
        /// Relative rotative efficiency ηR.
        relative_rotative_efficiency: f64,
    },
}

/// Gear, shaft line and aperture.
#[derive(Debug, Clone, PartialEq)]
pub struct InstallationDoc {
    /// Reduction ratio, engine rpm / screw rpm.
    pub gear_ratio: f64,
    /// Shaft line efficiency, fraction.
    pub shaft_efficiency: f64,
    /// Gear efficiency, fraction.
    pub gear_efficiency: f64,
    /// Depth of the shaft centreline below the waterline, m.
    pub shaft_immersion: Option<Quantity>,
    /// Existing shaft diameter, m.
    pub shaft_diameter: Option<Quantity>,
    /// Shaft material, as a name the design checks know (e.g. "stainless-316", "bronze").
    pub shaft_material: Option<String>,
    /// Largest screw diameter that fits the aperture, m.
    pub max_screw_diameter: Option<Quantity>,
    /// Tip clearance to the hull kept when sizing the screw, m.
    pub tip_clearance: Option<Quantity>,
}

/// One screw variant.
#[derive(Debug, Clone, PartialEq)]
pub struct VariantDoc {
    /// The user's label, unique in the boat.
    pub label: String,
    /// Number of blades.
    pub blades: u32,
    /// Diameter, m.
    pub diameter: Quantity,
    /// Face pitch, m.
    pub pitch: Quantity,
    /// Expanded area ratio AE/A0.
    pub area_ratio: f64,
    /// Blade thickness ratio t/D at the root, if known.
    pub thickness_ratio: Option<f64>,
    /// Hand of rotation, if known.
    pub rotation: Option<Rotation>,
    /// Open-water table rows (J, KT, KQ) for a screw that is not B-series.
    pub open_water: Option<Vec<(f64, f64, f64)>>,
}

/// The `[match]` section: what "matched" means and how far a screw may be re-pitched.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct MatchDoc {
    /// Light-running margin a recommended pitch aims at, fraction of rated rpm.
    pub light_running: Option<f64>,
    /// Largest free-running margin still matched, fraction of rated rpm.
    pub free_running_allowance: Option<f64>,
    /// Largest re-pitch, m.
    pub repitch_limit: Option<Quantity>,
    /// Largest re-pitch as a fraction of the current pitch.
    pub repitch_fraction: Option<f64>,
}

impl MatchDoc {
    /// The core's verdict limits, defaults where not given.
    pub fn criteria(&self) -> MatchCriteria {
        let default = MatchCriteria::default();
        MatchCriteria {
            light_running: self.light_running.unwrap_or(default.light_running),
            free_running_allowance: self
                .free_running_allowance
                .unwrap_or(default.free_running_allowance),
            tolerance: default.tolerance,
        }
    }

    /// The core's re-pitch limit, defaults where not given.
    pub fn repitch(&self) -> RepitchLimit {
        RepitchLimit {
            length: self
                .repitch_limit
                .as_ref()
                .map_or(RepitchLimit::default().length, |q| q.value),
            fraction: self.repitch_fraction,
        }
    }
}

/// The planned trip.
#[derive(Debug, Clone, PartialEq)]
pub struct TripDoc {
    /// Target cruising speed, m/s.
    pub target_speed: Quantity,
    /// Tank volume, m³.
    pub tank: Quantity,
    /// Usable fraction of the tank.
    pub usable_fraction: f64,
    /// Reserve kept back, fraction of usable fuel.
    pub reserve: f64,
}

/// One measured sea-trial run.
#[derive(Debug, Clone, PartialEq)]
pub struct TrialRunDoc {
    /// Engine rpm held.
    pub rpm: Quantity,
    /// Speed over ground, m/s.
    pub speed: Quantity,
    /// Direction of the run, for averaging out current.
    pub direction: Option<RunDirection>,
    /// Measured fuel rate, m³/s.
    pub fuel_rate: Option<Quantity>,
}

/// A sea-trial log.
#[derive(Debug, Clone, PartialEq)]
pub struct TrialDoc {
    /// When the trial was run (free text, e.g. "2024-05-11").
    pub date: Option<String>,
    /// Conditions (wind, sea, load).
    pub note: Option<String>,
    /// The runs.
    pub runs: Vec<TrialRunDoc>,
}

/// A correction fitted to a sea trial and applied to every prediction.
#[derive(Debug, Clone, PartialEq)]
pub struct CalibrationDoc {
    /// Factor on calm, clean-hull water resistance (1 = none); margins go on top.
    pub resistance_factor: f64,
    /// Fitted wake fraction, replacing the estimate, if fitted.
    pub wake_fraction: Option<f64>,
    /// Date of the trial it came from.
    pub trial_date: Option<String>,
    /// How it was fitted.
    pub note: Option<String>,
}

/// A boat profile in memory: SI values, editable, writable back to TOML in its unit system.
#[derive(Debug, Clone, PartialEq)]
pub struct BoatDoc {
    /// The boat's name as shown.
    pub name: String,
    /// The unit system the file is written in.
    pub units: UnitSystem,
    /// The engine sheet's profile name (`engines/NAME.toml`).
    pub engine: String,
    /// Whether to apply the B-series Reynolds-number correction (default on).
    pub reynolds_correction: bool,
    /// Hull particulars.
    pub hull: HullDoc,
    /// Load conditions.
    pub load: LoadDoc,
    /// Resistance method and margins.
    pub resistance: ResistanceDoc,
    /// Air drag, if given.
    pub windage: Option<WindageDoc>,
    /// Water.
    pub water: WaterDoc,
    /// Hull–screw interaction.
    pub interaction: InteractionDoc,
    /// Gear, shaft, aperture.
    pub installation: InstallationDoc,
    /// Screw variants; at least one.
    pub variants: Vec<VariantDoc>,
    /// Index of the active variant (written to the file as its label).
    pub active_variant: usize,
    /// The trip.
    pub trip: TripDoc,
    /// Verdict limits, light-running margin and re-pitch limits (the core's defaults when absent).
    pub match_criteria: Option<MatchDoc>,
    /// Sea-trial log.
    pub trial: Option<TrialDoc>,
    /// Saved sea-trial correction.
    pub calibration: Option<CalibrationDoc>,
}

/// Smallest screw diameter or pitch the loader accepts, m (2 in: smaller is a model, not a
/// boat's screw).
const MIN_SCREW_LENGTH: f64 = 0.05;

/// Largest screw diameter the loader accepts, m (100 in: past any small-craft screw).
const MAX_SCREW_DIAMETER: f64 = 2.54;

/// Largest screw pitch the loader accepts, m (200 in).
const MAX_SCREW_PITCH: f64 = 5.08;

/// Smallest pitch ratio P/D the loader accepts (far below any working screw).
const MIN_PITCH_RATIO: f64 = 0.3;

/// Largest pitch ratio P/D the loader accepts (far above any working screw).
const MAX_PITCH_RATIO: f64 = 2.0;

// ---------------------------------------------------------------------------------------------
// Raw file form: every value keeps its span for error messages.

type RawOpenWaterRow = (Spanned<f64>, Spanned<f64>, Spanned<f64>);
type RawPairs = Vec<(Spanned<String>, Spanned<String>)>;

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawBoat {
    schema: Spanned<i64>,
    name: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    units: Option<Spanned<String>>,
    engine: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    active_variant: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    reynolds_correction: Option<bool>,
    hull: RawHull,
    load: RawLoad,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    resistance: Option<RawResistance>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    windage: Option<RawWindage>,
    water: RawWater,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    interaction: Option<RawInteraction>,
    installation: RawInstallation,
    trip: RawTrip,
    #[serde(rename = "match", default, skip_serializing_if = "Option::is_none")]
    match_criteria: Option<RawMatch>,
    #[serde(default)]
    variant: Vec<RawVariant>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    trial: Option<RawTrial>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    calibration: Option<RawCalibration>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawHull {
    length_waterline: Spanned<String>,
    beam_waterline: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    draft: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    draft_aft: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    draft_forward: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    midship_coefficient: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    waterplane_coefficient: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    lcb_fraction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    wetted_surface: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    half_entrance_angle: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    transom_area: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    bulb_area: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    bulb_centre_height: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    stern_coefficient: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    appendage_area: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    appendage_form_factor: Option<Spanned<f64>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawLoad {
    default: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    light: Option<RawCase>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    half: Option<RawCase>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    full: Option<RawCase>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawCase {
    displacement: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    draft_aft: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    draft_forward: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawResistance {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    method: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    service_margin: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    fouling: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    table: Option<RawPairs>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawWindage {
    frontal_area: Spanned<String>,
    drag_coefficient: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    headwind: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    air_density: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawWater {
    kind: Spanned<String>,
    temperature: Spanned<String>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawInteraction {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    method: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    wake_fraction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    thrust_deduction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    relative_rotative_efficiency: Option<Spanned<f64>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawInstallation {
    gear_ratio: Spanned<f64>,
    shaft_efficiency: Spanned<f64>,
    gear_efficiency: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    shaft_immersion: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    shaft_diameter: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    shaft_material: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    max_screw_diameter: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    tip_clearance: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawVariant {
    label: Spanned<String>,
    blades: Spanned<i64>,
    diameter: Spanned<String>,
    pitch: Spanned<String>,
    area_ratio: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    thickness_ratio: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    rotation: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    open_water: Option<Vec<RawOpenWaterRow>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawTrip {
    target_speed: Spanned<String>,
    tank: Spanned<String>,
    usable_fraction: Spanned<f64>,
    reserve: Spanned<f64>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawMatch {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    light_running: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    free_running_allowance: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    repitch_limit: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    repitch_fraction: Option<Spanned<f64>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawTrial {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    date: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    note: Option<String>,
    #[serde(default)]
    run: Vec<RawRun>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawRun {
    rpm: Spanned<String>,
    speed: Spanned<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    direction: Option<Spanned<String>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    fuel_rate: Option<Spanned<String>>,
}

#[derive(Debug, Deserialize, Serialize)]
#[serde(deny_unknown_fields)]
struct RawCalibration {
    resistance_factor: Spanned<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    wake_fraction: Option<Spanned<f64>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    trial_date: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    note: Option<String>,
}

const CONDITIONS: [(&str, LoadCondition); 3] = [
    ("light", LoadCondition::Light),
    ("half", LoadCondition::Half),
    ("full", LoadCondition::Full),
];
const WATERS: [(&str, WaterKind); 2] = [("sea", WaterKind::Sea), ("fresh", WaterKind::Fresh)];
const METHODS: [(&str, u8); 4] = [
    ("auto", 0),
    ("holtrop-mennen", 1),
    ("van-oortmerssen", 2),
    ("table", 3),
];
const INTERACTIONS: [(&str, u8); 5] = [
    ("auto", 0),
    ("holtrop-1984", 1),
    ("taylor", 2),
    ("van-oortmerssen", 3),
    ("user", 4),
];
const ROTATIONS: [(&str, Rotation); 2] = [("right", Rotation::Right), ("left", Rotation::Left)];
const DIRECTIONS: [(&str, RunDirection); 2] =
    [("out", RunDirection::Out), ("back", RunDirection::Back)];

/// Appendage form factor 1+k2 used when the file gives none: Holtrop & Mennen (1982) table,
/// rudder behind skeg 1.5–2.0 (lower end taken).
const DEFAULT_APPENDAGE_FORM_FACTOR: f64 = 1.5;

fn name_of<T: PartialEq + Copy>(choices: &[(&'static str, T)], value: T) -> &'static str {
    choices
        .iter()
        .find(|(_, v)| *v == value)
        .map_or(choices[0].0, |(n, _)| n)
}

/// Refuses a file whose `schema` is not the one this build reads.
pub(crate) fn check_schema(r: &Reader<'_>, schema: &Spanned<i64>) -> Result<(), ProfileError> {
    if *schema.get_ref() == super::SCHEMA_VERSION {
        return Ok(());
    }
    Err(r.error(
        "schema",
        schema.span(),
        Issue::new(
            "schema",
            schema.get_ref().to_string(),
            format!("expected schema = {}", super::SCHEMA_VERSION),
        ),
    ))
}

impl BoatDoc {
    /// Reads a boat from TOML `source`; `file` names it in error messages.
    pub fn from_toml(source: &str, file: &str) -> Result<Self, ProfileError> {
        let raw: RawBoat =
            toml::from_str(source).map_err(|e| ProfileError::from_toml(file, source, &e))?;
        let mut r = Reader::new(file, source);
        check_schema(&r, &raw.schema)?;
        let units = match &raw.units {
            Some(u) => r.choice("units", u, &UNIT_SYSTEMS)?,
            None => guess_system(
                [
                    &raw.hull.length_waterline,
                    &raw.hull.beam_waterline,
                    &raw.trip.tank,
                ]
                .into_iter()
                .chain(raw.variant.iter().map(|v| &v.diameter))
                .map(|s| s.get_ref().as_str()),
            ),
        };
        let hull = read_hull(&mut r, &raw.hull)?;
        let load = read_load(&mut r, &raw.load)?;
        let resistance = match &raw.resistance {
            None => ResistanceDoc {
                method: ResistanceMethodDoc::Auto,
                service_margin: 0.0,
                fouling: 0.0,
            },
            Some(res) => {
                let chosen = match &res.method {
                    Some(m) => r.choice("resistance.method", m, &METHODS)?,
                    None => 0,
                };
                let method_span = res.method.as_ref().map_or(0..0, |m| m.span());
                let method = match (chosen, &res.table) {
                    (0, _) => ResistanceMethodDoc::Auto,
                    (1, _) => ResistanceMethodDoc::HoltropMennen,
                    (2, _) => ResistanceMethodDoc::VanOortmerssen,
                    (_, Some(rows)) => {
                        r.spans.insert(
                            "resistance.table".into(),
                            rows.first().map_or(method_span.clone(), |(s, _)| s.span()),
                        );
                        let mut table = Vec::with_capacity(rows.len());
                        for (i, (speed, force)) in rows.iter().enumerate() {
                            let key = format!("resistance.table[{}]", i + 1);
                            table.push((
                                r.qty(&format!("{key}.speed"), speed, Kind::Speed)?,
                                r.qty(&format!("{key}.resistance"), force, Kind::Force)?,
                            ));
                        }
                        ResistanceMethodDoc::Table(table)
                    }
                    (_, None) => {
                        return Err(r.error(
                            "resistance.table",
                            method_span,
                            Issue::new("resistance.table", "", "missing; expected `table = [[speed, resistance], …]` for method = \"table\""),
                        ));
                    }
                };
                ResistanceDoc {
                    method,
                    service_margin: r
                        .opt_num("resistance.service_margin", &res.service_margin)
                        .unwrap_or(0.0),
                    fouling: r.opt_num("resistance.fouling", &res.fouling).unwrap_or(0.0),
                }
            }
        };
        let windage = match &raw.windage {
            None => None,
            Some(w) => Some(WindageDoc {
                frontal_area: r.qty("windage.frontal_area", &w.frontal_area, Kind::Area)?,
                drag_coefficient: r.num("windage.drag_coefficient", &w.drag_coefficient),
                headwind: r.opt_qty("windage.headwind", &w.headwind, Kind::Speed)?,
                air_density: r.opt_qty("windage.air_density", &w.air_density, Kind::Density)?,
            }),
        };
        let water = WaterDoc {
            kind: r.choice("water.kind", &raw.water.kind, &WATERS)?,
            temperature: r.qty(
                "water.temperature",
                &raw.water.temperature,
                Kind::Temperature,
            )?,
        };
        let interaction = match &raw.interaction {
            None => InteractionDoc::Auto,
            Some(i) => match match &i.method {
                Some(m) => r.choice("interaction.method", m, &INTERACTIONS)?,
                None => 0,
            } {
                0 => InteractionDoc::Auto,
                1 => InteractionDoc::Holtrop1984,
                2 => InteractionDoc::Taylor,
                3 => InteractionDoc::VanOortmerssen,
                _ => {
                    let mut need = |key: &str, v: &Option<Spanned<f64>>| {
                        let full = format!("interaction.{key}");
                        match v {
                            Some(v) => Ok(r.num(&full, v)),
                            None => Err(r.error(
                                &full,
                                i.method.as_ref().map_or(0..0, |m| m.span()),
                                Issue::new(
                                    full.clone(),
                                    "",
                                    format!("missing; expected `{key}` for method = \"user\""),
                                ),
                            )),
                        }
                    };
                    InteractionDoc::User {
                        wake_fraction: need("wake_fraction", &i.wake_fraction)?,
                        thrust_deduction: need("thrust_deduction", &i.thrust_deduction)?,
                        relative_rotative_efficiency: need(
                            "relative_rotative_efficiency",
                            &i.relative_rotative_efficiency,
                        )?,
                    }
                }
            },
        };
        let inst = &raw.installation;
        let installation = InstallationDoc {
            gear_ratio: r.num("installation.gear_ratio", &inst.gear_ratio),
            shaft_efficiency: r.num("installation.shaft_efficiency", &inst.shaft_efficiency),
            gear_efficiency: r.num("installation.gear_efficiency", &inst.gear_efficiency),
            shaft_immersion: r.opt_qty(
                "installation.shaft_immersion",
                &inst.shaft_immersion,
                Kind::Length,
            )?,
            shaft_diameter: r.opt_qty(
                "installation.shaft_diameter",
                &inst.shaft_diameter,
                Kind::ScrewLength,
            )?,
            shaft_material: inst
                .shaft_material
                .as_ref()
                .map(|m| r.text("installation.shaft_material", m)),
            max_screw_diameter: r.opt_qty(
                "installation.max_screw_diameter",
                &inst.max_screw_diameter,
                Kind::ScrewLength,
            )?,
            tip_clearance: r.opt_qty(
                "installation.tip_clearance",
                &inst.tip_clearance,
                Kind::ScrewLength,
            )?,
        };
        let mut variants = Vec::with_capacity(raw.variant.len());
        for (i, v) in raw.variant.iter().enumerate() {
            variants.push(read_variant(&mut r, &format!("variant[{}]", i + 1), v)?);
        }
        let active_variant = match &raw.active_variant {
            None => 0,
            Some(label) => {
                r.spans.insert("active_variant".into(), label.span());
                variants
                    .iter()
                    .position(|v| &v.label == label.get_ref())
                    .ok_or_else(|| {
                        let labels: Vec<String> =
                            variants.iter().map(|v| format!("{:?}", v.label)).collect();
                        r.error(
                            "active_variant",
                            label.span(),
                            Issue::new(
                                "active_variant",
                                format!("{:?}", label.get_ref()),
                                format!(
                                    "expected the label of a [[variant]]: {}",
                                    if labels.is_empty() {
                                        "none given".to_owned()
                                    } else {
                                        labels.join(", ")
                                    }
                                ),
                            ),
                        )
                    })?
            }
        };
        let t = &raw.trip;
        let trip = TripDoc {
            target_speed: r.qty("trip.target_speed", &t.target_speed, Kind::Speed)?,
            tank: r.qty("trip.tank", &t.tank, Kind::Volume)?,
            usable_fraction: r.num("trip.usable_fraction", &t.usable_fraction),
            reserve: r.num("trip.reserve", &t.reserve),
        };
        let match_criteria = match raw.match_criteria.as_ref() {
            None => None,
            Some(m) => Some(MatchDoc {
                light_running: r.opt_num("match.light_running", &m.light_running),
                free_running_allowance: r
                    .opt_num("match.free_running_allowance", &m.free_running_allowance),
                repitch_limit: r.opt_qty(
                    "match.repitch_limit",
                    &m.repitch_limit,
                    Kind::ScrewLength,
                )?,
                repitch_fraction: r.opt_num("match.repitch_fraction", &m.repitch_fraction),
            }),
        };
        let trial = match &raw.trial {
            None => None,
            Some(tr) => {
                let mut runs = Vec::with_capacity(tr.run.len());
                for (i, run) in tr.run.iter().enumerate() {
                    let key = format!("trial.run[{}]", i + 1);
                    runs.push(TrialRunDoc {
                        rpm: r.qty(&format!("{key}.rpm"), &run.rpm, Kind::Rotation)?,
                        speed: r.qty(&format!("{key}.speed"), &run.speed, Kind::Speed)?,
                        direction: run
                            .direction
                            .as_ref()
                            .map(|d| r.choice(&format!("{key}.direction"), d, &DIRECTIONS))
                            .transpose()?,
                        fuel_rate: r.opt_qty(
                            &format!("{key}.fuel_rate"),
                            &run.fuel_rate,
                            Kind::FuelRate,
                        )?,
                    });
                }
                Some(TrialDoc {
                    date: tr.date.clone(),
                    note: tr.note.clone(),
                    runs,
                })
            }
        };
        let calibration = raw.calibration.as_ref().map(|c| CalibrationDoc {
            resistance_factor: r.num("calibration.resistance_factor", &c.resistance_factor),
            wake_fraction: r.opt_num("calibration.wake_fraction", &c.wake_fraction),
            trial_date: c.trial_date.clone(),
            note: c.note.clone(),
        });
        let doc = BoatDoc {
            name: r.text("name", &raw.name),
            units,
            engine: r.text("engine", &raw.engine),
            reynolds_correction: raw.reynolds_correction.unwrap_or(true),
            hull,
            load,
            resistance,
            windage,
            water,
            interaction,
            installation,
            variants,
            active_variant,
            trip,
            match_criteria,
            trial,
            calibration,
        };
        match doc.validate().into_iter().next() {
            Some(issue) => Err(r.locate(issue)),
            None => Ok(doc),
        }
    }

    /// Writes the boat as TOML in its unit system (unedited values keep their original text).
    pub fn to_toml(&self) -> String {
        let s = self.units;
        let h = &self.hull;
        let even_keel = h.draft_aft == h.draft_forward;
        let oq = |q: &Option<Quantity>, kind: Kind| q.as_ref().map(|q| out(q, kind, s));
        let on = |v: Option<f64>| v.map(out_num);
        let case = |c: &Option<LoadCase>| {
            c.as_ref().map(|c| RawCase {
                displacement: out(&c.displacement, Kind::Mass, s),
                draft_aft: oq(&c.draft_aft, Kind::Length),
                draft_forward: oq(&c.draft_forward, Kind::Length),
            })
        };
        let (method, table) = match &self.resistance.method {
            ResistanceMethodDoc::Auto => ("auto", None),
            ResistanceMethodDoc::HoltropMennen => ("holtrop-mennen", None),
            ResistanceMethodDoc::VanOortmerssen => ("van-oortmerssen", None),
            ResistanceMethodDoc::Table(rows) => (
                "table",
                Some(
                    rows.iter()
                        .map(|(v, f)| (out(v, Kind::Speed, s), out(f, Kind::Force, s)))
                        .collect(),
                ),
            ),
        };
        let named = |name: &str| RawInteraction {
            method: Some(out_text(name)),
            wake_fraction: None,
            thrust_deduction: None,
            relative_rotative_efficiency: None,
        };
        let interaction = match self.interaction {
            InteractionDoc::Auto => None,
            InteractionDoc::VanOortmerssen => Some(named("van-oortmerssen")),
            InteractionDoc::Holtrop1984 => Some(named("holtrop-1984")),
            InteractionDoc::Taylor => Some(named("taylor")),
            InteractionDoc::User {
                wake_fraction,
                thrust_deduction,
                relative_rotative_efficiency,
            } => Some(RawInteraction {
                method: Some(out_text("user")),
                wake_fraction: Some(out_num(wake_fraction)),
                thrust_deduction: Some(out_num(thrust_deduction)),
                relative_rotative_efficiency: Some(out_num(relative_rotative_efficiency)),
            }),
        };
        let inst = &self.installation;
        let raw = RawBoat {
            schema: Spanned::new(0..0, super::SCHEMA_VERSION),
            name: out_text(&self.name),
            units: Some(out_text(name_of(&UNIT_SYSTEMS, s))),
            engine: out_text(&self.engine),
            active_variant: self
                .variants
                .get(self.active_variant)
                .map(|v| out_text(&v.label)),
            reynolds_correction: (!self.reynolds_correction).then_some(false),
            hull: RawHull {
                length_waterline: out(&h.length_waterline, Kind::Length, s),
                beam_waterline: out(&h.beam_waterline, Kind::Length, s),
                draft: even_keel.then(|| out(&h.draft_aft, Kind::Length, s)),
                draft_aft: (!even_keel).then(|| out(&h.draft_aft, Kind::Length, s)),
                draft_forward: (!even_keel).then(|| out(&h.draft_forward, Kind::Length, s)),
                midship_coefficient: on(h.midship_coefficient),
                waterplane_coefficient: on(h.waterplane_coefficient),
                lcb_fraction: on(h.lcb_fraction),
                wetted_surface: oq(&h.wetted_surface, Kind::Area),
                half_entrance_angle: oq(&h.half_entrance_angle, Kind::Angle),
                transom_area: oq(&h.transom_area, Kind::Area),
                bulb_area: oq(&h.bulb_area, Kind::Area),
                bulb_centre_height: oq(&h.bulb_centre_height, Kind::Length),
                stern_coefficient: on(h.stern_coefficient),
                appendage_area: oq(&h.appendage_area, Kind::Area),
                appendage_form_factor: on(h.appendage_form_factor),
            },
            load: RawLoad {
                default: out_text(self.load.default.name()),
                light: case(&self.load.light),
                half: case(&self.load.half),
                full: case(&self.load.full),
            },
            resistance: Some(RawResistance {
                method: (method != "auto").then(|| out_text(method)),
                service_margin: Some(out_num(self.resistance.service_margin)),
                fouling: Some(out_num(self.resistance.fouling)),
                table,
            }),
            windage: self.windage.as_ref().map(|w| RawWindage {
                frontal_area: out(&w.frontal_area, Kind::Area, s),
                drag_coefficient: out_num(w.drag_coefficient),
                headwind: oq(&w.headwind, Kind::Speed),
                air_density: oq(&w.air_density, Kind::Density),
            }),
            water: RawWater {
                kind: out_text(name_of(&WATERS, self.water.kind)),
                temperature: out(&self.water.temperature, Kind::Temperature, s),
            },
            interaction,
            installation: RawInstallation {
                gear_ratio: out_num(inst.gear_ratio),
                shaft_efficiency: out_num(inst.shaft_efficiency),
                gear_efficiency: out_num(inst.gear_efficiency),
                shaft_immersion: oq(&inst.shaft_immersion, Kind::Length),
                shaft_diameter: oq(&inst.shaft_diameter, Kind::ScrewLength),
                shaft_material: inst.shaft_material.as_deref().map(out_text),
                max_screw_diameter: oq(&inst.max_screw_diameter, Kind::ScrewLength),
                tip_clearance: oq(&inst.tip_clearance, Kind::ScrewLength),
            },
            trip: RawTrip {
                target_speed: out(&self.trip.target_speed, Kind::Speed, s),
                tank: out(&self.trip.tank, Kind::Volume, s),
                usable_fraction: out_num(self.trip.usable_fraction),
                reserve: out_num(self.trip.reserve),
            },
            match_criteria: self.match_criteria.as_ref().map(|m| RawMatch {
                light_running: m.light_running.map(out_num),
                free_running_allowance: m.free_running_allowance.map(out_num),
                repitch_limit: oq(&m.repitch_limit, Kind::ScrewLength),
                repitch_fraction: m.repitch_fraction.map(out_num),
            }),
            variant: self
                .variants
                .iter()
                .map(|v| RawVariant {
                    label: out_text(&v.label),
                    blades: Spanned::new(0..0, i64::from(v.blades)),
                    diameter: out(&v.diameter, Kind::ScrewLength, s),
                    pitch: out(&v.pitch, Kind::ScrewLength, s),
                    area_ratio: out_num(v.area_ratio),
                    thickness_ratio: on(v.thickness_ratio),
                    rotation: v.rotation.map(|h| out_text(name_of(&ROTATIONS, h))),
                    open_water: v.open_water.as_ref().map(|rows| {
                        rows.iter()
                            .map(|&(j, kt, kq)| (out_num(j), out_num(kt), out_num(kq)))
                            .collect()
                    }),
                })
                .collect(),
            trial: self.trial.as_ref().map(|t| RawTrial {
                date: t.date.clone(),
                note: t.note.clone(),
                run: t
                    .runs
                    .iter()
                    .map(|run| RawRun {
                        rpm: out(&run.rpm, Kind::Rotation, s),
                        speed: out(&run.speed, Kind::Speed, s),
                        direction: run.direction.map(|d| out_text(name_of(&DIRECTIONS, d))),
                        fuel_rate: oq(&run.fuel_rate, Kind::FuelRate),
                    })
                    .collect(),
            }),
            calibration: self.calibration.as_ref().map(|c| RawCalibration {
                resistance_factor: out_num(c.resistance_factor),
                wake_fraction: on(c.wake_fraction),
                trial_date: c.trial_date.clone(),
                note: c.note.clone(),
            }),
        };
        toml::to_string_pretty(&raw).unwrap_or_else(|e| format!("# could not be written: {e}\n"))
    }

    /// The active variant, if the index is valid.
    pub fn active(&self) -> Option<&VariantDoc> {
        self.variants.get(self.active_variant)
    }

    /// Every problem of the boat, in file order (empty when it is valid).
    pub fn validate(&self) -> Vec<Issue> {
        let mut v = Validator { issues: Vec::new() };
        if self.name.trim().is_empty() {
            v.push("name", "\"\"", "expected the boat's name");
        }
        if let Err(ProfileError::UnsafeName { reason, .. }) = super::store::check_name(&self.engine)
        {
            v.push(
                "engine",
                format!("{:?}", self.engine),
                format!("expected a safe profile name (letters, digits, '-', '_', '.'): {reason}"),
            );
        }
        let h = &self.hull;
        v.positive("hull.length_waterline", &h.length_waterline, "length");
        v.positive("hull.beam_waterline", &h.beam_waterline, "beam");
        if h.beam_waterline.value >= h.length_waterline.value && h.length_waterline.value > 0.0 {
            v.push(
                "hull.beam_waterline",
                h.beam_waterline.shown(),
                "expected a beam smaller than the waterline length",
            );
        }
        v.positive("hull.draft_aft", &h.draft_aft, "draft");
        v.positive("hull.draft_forward", &h.draft_forward, "draft");
        v.range(
            "hull.midship_coefficient",
            h.midship_coefficient,
            0.3,
            1.0,
            "a midship coefficient from 0.3 to 1",
        );
        v.range(
            "hull.waterplane_coefficient",
            h.waterplane_coefficient,
            0.3,
            1.0,
            "a waterplane coefficient from 0.3 to 1",
        );
        v.range(
            "hull.lcb_fraction",
            h.lcb_fraction,
            -0.2,
            0.2,
            "an LCB from -0.2 to 0.2 of the length (forward of midships positive)",
        );
        v.opt_positive("hull.wetted_surface", &h.wetted_surface, "area");
        if let Some(a) = &h.half_entrance_angle
            && !(a.value > 0.0 && a.value < 90.0)
        {
            v.push(
                "hull.half_entrance_angle",
                a.shown(),
                "expected an angle between 0 and 90 degrees",
            );
        }
        v.opt_not_negative("hull.transom_area", &h.transom_area, "area");
        v.opt_not_negative("hull.bulb_area", &h.bulb_area, "area");
        v.opt_not_negative("hull.bulb_centre_height", &h.bulb_centre_height, "height");
        v.range(
            "hull.stern_coefficient",
            h.stern_coefficient,
            -25.0,
            10.0,
            "a stern coefficient from -25 (pram) to 10 (U-shaped)",
        );
        v.opt_not_negative("hull.appendage_area", &h.appendage_area, "area");
        v.range(
            "hull.appendage_form_factor",
            h.appendage_form_factor,
            1.0,
            5.0,
            "a form factor 1+k2 from 1 to 5",
        );
        for condition in LoadCondition::ALL {
            if let Some(case) = self.load.case(condition) {
                let key = format!("load.{condition}");
                v.positive(&format!("{key}.displacement"), &case.displacement, "mass");
                v.opt_positive(&format!("{key}.draft_aft"), &case.draft_aft, "draft");
                v.opt_positive(
                    &format!("{key}.draft_forward"),
                    &case.draft_forward,
                    "draft",
                );
            }
        }
        if self.load.case(self.load.default).is_none() {
            v.push(
                format!("load.{}", self.load.default),
                "",
                format!(
                    "missing; expected [load.{}] with a displacement, since load.default = {:?}",
                    self.load.default,
                    self.load.default.name()
                ),
            );
        }
        if let ResistanceMethodDoc::Table(rows) = &self.resistance.method {
            if rows.len() < 2 {
                v.push(
                    "resistance.table",
                    format!("{} row(s)", rows.len()),
                    "expected at least two [speed, resistance] rows",
                );
            }
            for (i, pair) in rows.windows(2).enumerate() {
                if pair[1].0.value <= pair[0].0.value {
                    v.push(
                        format!("resistance.table[{}].speed", i + 2),
                        pair[1].0.shown(),
                        "expected rows sorted by increasing speed",
                    );
                }
            }
            for (i, (speed, force)) in rows.iter().enumerate() {
                if speed.value < 0.0 {
                    v.push(
                        format!("resistance.table[{}].speed", i + 1),
                        speed.shown(),
                        "expected a speed of zero or more",
                    );
                }
                if force.value < 0.0 {
                    v.push(
                        format!("resistance.table[{}].resistance", i + 1),
                        force.shown(),
                        "expected a resistance of zero or more",
                    );
                }
            }
        }
        v.range(
            "resistance.service_margin",
            Some(self.resistance.service_margin),
            0.0,
            1.0,
            "a margin from 0 to 1 (0.15 = +15 %)",
        );
        v.range(
            "resistance.fouling",
            Some(self.resistance.fouling),
            0.0,
            3.0,
            "added friction from 0 to 3 (0.2 = +20 %)",
        );
        if let Some(w) = &self.windage {
            v.positive("windage.frontal_area", &w.frontal_area, "area");
            v.range(
                "windage.drag_coefficient",
                Some(w.drag_coefficient),
                0.05,
                3.0,
                "a drag coefficient from 0.05 to 3",
            );
            if let Some(h) = &w.headwind
                && !h.value.is_finite()
            {
                v.push("windage.headwind", h.shown(), "expected a finite speed");
            }
            v.opt_positive("windage.air_density", &w.air_density, "density");
        }
        if !(0.0..=40.0).contains(&self.water.temperature.value) {
            v.push(
                "water.temperature",
                self.water.temperature.shown(),
                "expected 0 to 40 °C (the range of ITTC 7.5-02-01-03)",
            );
        }
        if let InteractionDoc::User {
            wake_fraction,
            thrust_deduction,
            relative_rotative_efficiency,
        } = self.interaction
        {
            v.range_open(
                "interaction.wake_fraction",
                wake_fraction,
                0.0,
                1.0,
                "a wake fraction from 0 up to (not including) 1",
            );
            v.range_open(
                "interaction.thrust_deduction",
                thrust_deduction,
                0.0,
                1.0,
                "a thrust deduction from 0 up to (not including) 1",
            );
            v.range(
                "interaction.relative_rotative_efficiency",
                Some(relative_rotative_efficiency),
                0.5,
                1.5,
                "a relative rotative efficiency from 0.5 to 1.5",
            );
        }
        let inst = &self.installation;
        if !(inst.gear_ratio > 0.0 && inst.gear_ratio <= 20.0) {
            v.push(
                "installation.gear_ratio",
                inst.gear_ratio.to_string(),
                "expected a reduction ratio above 0 and at most 20 (2.5 for 2.5:1)",
            );
        }
        v.efficiency("installation.shaft_efficiency", inst.shaft_efficiency);
        v.efficiency("installation.gear_efficiency", inst.gear_efficiency);
        v.opt_positive(
            "installation.shaft_immersion",
            &inst.shaft_immersion,
            "depth",
        );
        v.opt_positive(
            "installation.shaft_diameter",
            &inst.shaft_diameter,
            "diameter",
        );
        v.opt_positive(
            "installation.max_screw_diameter",
            &inst.max_screw_diameter,
            "diameter",
        );
        v.opt_not_negative(
            "installation.tip_clearance",
            &inst.tip_clearance,
            "clearance",
        );
        if let Some(m) = &inst.shaft_material
            && m.trim().is_empty()
        {
            v.push(
                "installation.shaft_material",
                "\"\"",
                "expected a material name such as \"stainless-316\" or \"bronze\"",
            );
        }
        if self.variants.is_empty() {
            v.push(
                "variant",
                "",
                "missing; expected at least one screw variant ([[variant]] table)",
            );
        }
        for (i, variant) in self.variants.iter().enumerate() {
            let key = format!("variant[{}]", i + 1);
            if variant.label.trim().is_empty() {
                v.push(
                    format!("{key}.label"),
                    "\"\"",
                    "expected a label for the variant",
                );
            } else if self.variants[..i].iter().any(|o| o.label == variant.label) {
                v.push(
                    format!("{key}.label"),
                    format!("{:?}", variant.label),
                    "expected a label not used by another variant",
                );
            }
            if !(2..=9).contains(&variant.blades) {
                v.push(
                    format!("{key}.blades"),
                    variant.blades.to_string(),
                    "expected 2 to 9 blades",
                );
            }
            v.positive(&format!("{key}.diameter"), &variant.diameter, "diameter");
            v.positive(&format!("{key}.pitch"), &variant.pitch, "pitch");
            // What no small-craft screw can be; the B-series range is only warned about.
            let (diameter, pitch) = (variant.diameter.value, variant.pitch.value);
            if diameter > 0.0 && !(MIN_SCREW_LENGTH..=MAX_SCREW_DIAMETER).contains(&diameter) {
                v.push(
                    format!("{key}.diameter"),
                    variant.diameter.shown(),
                    "expected a screw diameter from 2 in (50 mm) to 100 in (2.5 m)",
                );
            } else if pitch > 0.0 && !(MIN_SCREW_LENGTH..=MAX_SCREW_PITCH).contains(&pitch) {
                v.push(
                    format!("{key}.pitch"),
                    variant.pitch.shown(),
                    "expected a screw pitch from 2 in (50 mm) to 200 in (5 m)",
                );
            } else if diameter > 0.0
                && pitch > 0.0
                && !(MIN_PITCH_RATIO..=MAX_PITCH_RATIO).contains(&(pitch / diameter))
            {
                v.push(
                    format!("{key}.pitch"),
                    format!("{} (P/D {:.2})", variant.pitch.shown(), pitch / diameter),
                    "expected a pitch from 0.3 to 2.0 times the diameter (P/D 0.3–2.0; the B-series covers 0.5–1.4)",
                );
            }
            if !(variant.area_ratio > 0.0 && variant.area_ratio <= 1.5) {
                v.push(
                    format!("{key}.area_ratio"),
                    variant.area_ratio.to_string(),
                    "expected an expanded area ratio AE/A0 above 0 and at most 1.5",
                );
            }
            v.range_open(
                &format!("{key}.thickness_ratio"),
                variant.thickness_ratio.unwrap_or(0.05),
                0.0,
                0.2,
                "a blade thickness ratio above 0 and below 0.2",
            );
            if variant.thickness_ratio == Some(0.0) {
                v.push(
                    format!("{key}.thickness_ratio"),
                    "0",
                    "expected a blade thickness ratio above 0 and below 0.2",
                );
            }
            if let Some(rows) = &variant.open_water {
                if rows.len() < 2 {
                    v.push(
                        format!("{key}.open_water"),
                        format!("{} row(s)", rows.len()),
                        "expected at least two [J, KT, KQ] rows",
                    );
                }
                for (k, pair) in rows.windows(2).enumerate() {
                    if pair[1].0 <= pair[0].0 {
                        v.push(
                            format!("{key}.open_water[{}]", k + 2),
                            pair[1].0.to_string(),
                            "expected rows sorted by increasing J",
                        );
                    }
                }
                if rows
                    .iter()
                    .any(|r| r.0 < 0.0 || !(r.0.is_finite() && r.1.is_finite() && r.2.is_finite()))
                {
                    v.push(
                        format!("{key}.open_water"),
                        "",
                        "expected finite values with J of zero or more",
                    );
                }
            }
        }
        if !self.variants.is_empty() && self.active_variant >= self.variants.len() {
            v.push(
                "active_variant",
                (self.active_variant + 1).to_string(),
                "expected the label of a [[variant]]",
            );
        }
        v.positive("trip.target_speed", &self.trip.target_speed, "speed");
        v.positive("trip.tank", &self.trip.tank, "volume");
        if !(self.trip.usable_fraction > 0.0 && self.trip.usable_fraction <= 1.0) {
            v.push(
                "trip.usable_fraction",
                self.trip.usable_fraction.to_string(),
                "expected a fraction above 0 and at most 1",
            );
        }
        v.range_open(
            "trip.reserve",
            self.trip.reserve,
            0.0,
            1.0,
            "a reserve fraction from 0 up to (not including) 1",
        );
        if let Some(m) = &self.match_criteria {
            v.range(
                "match.light_running",
                m.light_running,
                0.0,
                0.2,
                "a light-running margin from 0 to 0.2 of rated rpm (0.02 for 2 %)",
            );
            v.range(
                "match.free_running_allowance",
                m.free_running_allowance,
                0.0,
                0.2,
                "a free-running allowance from 0 to 0.2 of rated rpm (0.03 for 3 %)",
            );
            v.opt_not_negative("match.repitch_limit", &m.repitch_limit, "re-pitch limit");
            if m.repitch_limit.as_ref().is_some_and(|q| q.value > 0.3) {
                v.push(
                    "match.repitch_limit",
                    m.repitch_limit
                        .as_ref()
                        .map_or(String::new(), Quantity::shown),
                    "expected a re-pitch limit of at most 300 mm (about 12 in)",
                );
            }
            v.range_open(
                "match.repitch_fraction",
                m.repitch_fraction.unwrap_or(0.1),
                0.0,
                1.0,
                "a re-pitch limit as a fraction of pitch above 0 and below 1 (0.1 for 10 %)",
            );
            if m.repitch_fraction == Some(0.0) {
                v.push(
                    "match.repitch_fraction",
                    "0",
                    "expected a re-pitch limit as a fraction of pitch above 0 and below 1 (0.1 for 10 %)",
                );
            }
        }
        if let Some(trial) = &self.trial {
            for (i, run) in trial.runs.iter().enumerate() {
                let key = format!("trial.run[{}]", i + 1);
                v.positive(&format!("{key}.rpm"), &run.rpm, "rpm");
                v.positive(&format!("{key}.speed"), &run.speed, "speed");
                v.opt_positive(&format!("{key}.fuel_rate"), &run.fuel_rate, "fuel rate");
            }
        }
        if let Some(c) = &self.calibration {
            v.range(
                "calibration.resistance_factor",
                Some(c.resistance_factor),
                0.5,
                2.0,
                "a resistance factor from 0.5 to 2",
            );
            if let Some(w) = c.wake_fraction {
                v.range_open(
                    "calibration.wake_fraction",
                    w,
                    0.0,
                    1.0,
                    "a wake fraction from 0 up to (not including) 1",
                );
            }
        }
        v.issues
    }

    /// The problems as one error (the first), or `Ok` when valid; for documents edited in memory.
    pub fn check(&self) -> Result<(), ProfileError> {
        match self.validate().into_iter().next() {
            Some(issue) => Err(ProfileError::Invalid {
                file: self.name.clone(),
                location: None,
                issue,
            }),
            None => Ok(()),
        }
    }

    /// Builds the core's `Vessel` for `condition` with `engine`, every value in SI.
    pub fn to_vessel(
        &self,
        engine: &EngineDoc,
        condition: LoadCondition,
    ) -> Result<Vessel, ProfileError> {
        self.check()?;
        let invalid = |key: &str, found: String, problem: String| ProfileError::Invalid {
            file: self.name.clone(),
            location: None,
            issue: Issue::new(key, found, problem),
        };
        let engine_sheet = engine.to_engine_sheet()?;
        let case = self.load.case(condition).ok_or_else(|| {
            invalid(
                &format!("load.{condition}"),
                String::new(),
                format!("missing; expected [load.{condition}] with a displacement to solve the {condition} condition"),
            )
        })?;
        let water = water::water_properties(self.water.kind, self.water.temperature.value)
            .map_err(|e| {
                invalid(
                    "water.temperature",
                    self.water.temperature.shown(),
                    e.to_string(),
                )
            })?;
        let h = &self.hull;
        let hull_input = HullInput {
            length_waterline: h.length_waterline.value,
            beam_waterline: h.beam_waterline.value,
            draft_aft: case.draft_aft.as_ref().unwrap_or(&h.draft_aft).value,
            draft_forward: case
                .draft_forward
                .as_ref()
                .unwrap_or(&h.draft_forward)
                .value,
            displacement_volume: case.displacement.value / water.density,
            midship_coefficient: h.midship_coefficient,
            waterplane_coefficient: h.waterplane_coefficient,
            lcb_fraction: h.lcb_fraction,
            wetted_surface: h.wetted_surface.as_ref().map(|q| q.value),
            half_entrance_angle_deg: h.half_entrance_angle.as_ref().map(|q| q.value),
            transom_area: h.transom_area.as_ref().map(|q| q.value),
            bulb_area: h.bulb_area.as_ref().map_or(0.0, |q| q.value),
            bulb_centre_height: h.bulb_centre_height.as_ref().map_or(0.0, |q| q.value),
            stern_coefficient: h.stern_coefficient.unwrap_or(0.0),
            appendage_area: h.appendage_area.as_ref().map_or(0.0, |q| q.value),
            appendage_form_factor: h
                .appendage_form_factor
                .unwrap_or(DEFAULT_APPENDAGE_FORM_FACTOR),
        };
        let hull = hull_input
            .resolve()
            .map_err(|e| invalid(hull_error_key(&e, condition), String::new(), e.to_string()))?;
        // The core picks the method for a boat that names none, and says why.
        let method_choice = matches!(self.resistance.method, ResistanceMethodDoc::Auto)
            .then(|| choose_method(&hull));
        let method = match &self.resistance.method {
            ResistanceMethodDoc::Auto => method_choice
                .as_ref()
                .map_or(ResistanceMethod::HoltropMennen, |c| c.method.clone()),
            ResistanceMethodDoc::HoltropMennen => ResistanceMethod::HoltropMennen,
            ResistanceMethodDoc::VanOortmerssen => ResistanceMethod::VanOortmerssen,
            ResistanceMethodDoc::Table(rows) => ResistanceMethod::Table(ResistanceTable {
                rows: rows.iter().map(|(v, r)| (v.value, r.value)).collect(),
            }),
        };
        let air = self.windage.as_ref().map(|w| AirDrag {
            // Dry air at the water's temperature and standard pressure unless the file says.
            air_density: w.air_density.as_ref().map_or_else(
                || water::air_density(self.water.temperature.value, water::STANDARD_ATMOSPHERE),
                |q| q.value,
            ),
            drag_coefficient: w.drag_coefficient,
            frontal_area: w.frontal_area.value,
            headwind: w.headwind.as_ref().map_or(0.0, |q| q.value),
        });
        let calibration = self.calibration.as_ref();
        let resistance = ResistanceModel {
            hull,
            method,
            water,
            air,
            margins: Margins {
                service: self.resistance.service_margin,
                fouling: self.resistance.fouling,
                resistance_factor: calibration.map_or(1.0, |c| c.resistance_factor),
            },
        };
        let interaction_follows = matches!(self.interaction, InteractionDoc::Auto);
        let mut interaction = match self.interaction {
            InteractionDoc::Auto => InteractionMethod::paired_with(&resistance.method),
            InteractionDoc::VanOortmerssen => InteractionMethod::VanOortmerssen,
            InteractionDoc::Holtrop1984 => InteractionMethod::Holtrop1984SingleScrew,
            InteractionDoc::Taylor => InteractionMethod::Taylor,
            InteractionDoc::User {
                wake_fraction,
                thrust_deduction,
                relative_rotative_efficiency,
            } => InteractionMethod::User(Interaction {
                wake_fraction,
                thrust_deduction,
                relative_rotative_efficiency,
            }),
        };
        let mut variants = Vec::with_capacity(self.variants.len());
        for (i, v) in self.variants.iter().enumerate() {
            let key = format!("variant[{}]", i + 1);
            let geometry = ScrewGeometry {
                blades: v.blades,
                diameter: v.diameter.value,
                pitch: v.pitch.value,
                area_ratio: v.area_ratio,
            };
            let screw = match &v.open_water {
                None => BSeriesScrew::new(geometry).map(ScrewModel::BSeries),
                Some(rows) => OpenWaterTable::new(
                    geometry,
                    rows.iter()
                        .map(|&(advance_ratio, thrust_coefficient, torque_coefficient)| {
                            OpenWaterPoint {
                                advance_ratio,
                                thrust_coefficient,
                                torque_coefficient,
                            }
                        })
                        .collect(),
                )
                .map(ScrewModel::Table),
            }
            .map_err(|e| invalid(&key, format!("{:?}", v.label), e.to_string()))?;
            variants.push(Variant {
                label: v.label.clone(),
                screw,
            });
        }
        let calibrated_wake = calibration.and_then(|c| c.wake_fraction).is_some();
        if let Some(wake_fraction) = calibration.and_then(|c| c.wake_fraction) {
            // A fitted wake replaces the estimate; t and ηR are frozen at the trial's mean speed
            // (the target speed without a log), as the calibration fit does.
            let speeds: Vec<f64> = self
                .trial
                .iter()
                .flat_map(|t| &t.runs)
                .map(|r| r.speed.value)
                .collect();
            let at_speed = if speeds.is_empty() {
                self.trip.target_speed.value
            } else {
                speeds.iter().sum::<f64>() / speeds.len() as f64
            };
            let active = &variants[self.active_variant];
            let g = active.screw.geometry();
            let screw = ScrewAtStern {
                diameter: g.diameter,
                pitch_ratio: g.pitch_ratio(),
                area_ratio: g.area_ratio,
                blades: g.blades,
            };
            let frozen =
                interaction.at_speed(&resistance.hull, &resistance.water, &screw, at_speed);
            interaction = InteractionMethod::User(Interaction {
                wake_fraction,
                ..frozen
            });
        }
        let trip = Trip {
            target_speed: self.trip.target_speed.value,
            tank_volume: self.trip.tank.value,
            usable_fraction: self.trip.usable_fraction,
            reserve_fraction: self.trip.reserve,
        };
        let trial = self
            .trial
            .iter()
            .flat_map(|t| &t.runs)
            .map(|run| TrialRun {
                engine_rpm: run.rpm.value,
                speed_over_ground: run.speed.value,
                direction: run.direction,
                fuel_volume_flow: run.fuel_rate.as_ref().map(|q| q.value),
            })
            .collect();
        Ok(Vessel {
            name: self.name.clone(),
            resistance,
            interaction,
            method_choice,
            interaction_follows_method: interaction_follows && !calibrated_wake,
            installation: Installation {
                gear_ratio: self.installation.gear_ratio,
                shaft_efficiency: self.installation.shaft_efficiency,
                gear_efficiency: self.installation.gear_efficiency,
                shafts: 1,
                idle_shafts: 0,
            },
            engine: engine_sheet,
            variants,
            active_variant: self.active_variant,
            reynolds_correction: self.reynolds_correction,
            trip,
            match_criteria: self
                .match_criteria
                .as_ref()
                .map_or_else(MatchCriteria::default, MatchDoc::criteria),
            repitch: self
                .match_criteria
                .as_ref()
                .map_or_else(RepitchLimit::default, MatchDoc::repitch),
            trial,
        })
    }

    /// The `Vessel` in the boat's default load condition.
    pub fn to_default_vessel(&self, engine: &EngineDoc) -> Result<Vessel, ProfileError> {
        self.to_vessel(engine, self.load.default)
    }
}

/// The file key a hull error from the core refers to.
fn hull_error_key(error: &HullError, condition: LoadCondition) -> &'static str {
    let field = match error {
        HullError::NotPositive { field, .. } | HullError::OutOfRange { field, .. } => *field,
        _ => "",
    };
    let field = field.to_ascii_lowercase();
    if field.contains("length") {
        "hull.length_waterline"
    } else if field.contains("beam") {
        "hull.beam_waterline"
    } else if field.contains("draft") {
        "hull.draft_aft"
    } else if field.contains("displacement") || field.contains("block") {
        match condition {
            LoadCondition::Light => "load.light.displacement",
            LoadCondition::Half => "load.half.displacement",
            LoadCondition::Full => "load.full.displacement",
        }
    } else {
        "hull"
    }
}

fn read_hull(r: &mut Reader<'_>, h: &RawHull) -> Result<HullDoc, ProfileError> {
    let length = Kind::Length;
    let (draft_aft, draft_forward) = match (&h.draft, &h.draft_aft, &h.draft_forward) {
        (Some(d), None, None) => {
            let q = r.qty("hull.draft", d, length)?;
            r.aliases
                .insert("hull.draft_aft".into(), "hull.draft".into());
            r.aliases
                .insert("hull.draft_forward".into(), "hull.draft".into());
            (q.clone(), q)
        }
        (None, Some(a), Some(f)) => (
            r.qty("hull.draft_aft", a, length)?,
            r.qty("hull.draft_forward", f, length)?,
        ),
        (Some(d), _, _) => {
            return Err(r.error(
                "hull.draft",
                d.span(),
                Issue::new(
                    "hull.draft",
                    format!("{:?}", d.get_ref()),
                    "expected either `draft` or both `draft_aft` and `draft_forward`, not both",
                ),
            ));
        }
        (None, a, f) => {
            let span = a
                .as_ref()
                .or(f.as_ref())
                .map_or(r.spans.get("hull").cloned().unwrap_or(0..0), |s| s.span());
            return Err(r.error(
                "hull.draft",
                span,
                Issue::new(
                    "hull.draft",
                    "",
                    "missing; expected `draft` (even keel) or both `draft_aft` and `draft_forward`",
                ),
            ));
        }
    };
    Ok(HullDoc {
        length_waterline: r.qty("hull.length_waterline", &h.length_waterline, length)?,
        beam_waterline: r.qty("hull.beam_waterline", &h.beam_waterline, length)?,
        draft_aft,
        draft_forward,
        midship_coefficient: r.opt_num("hull.midship_coefficient", &h.midship_coefficient),
        waterplane_coefficient: r.opt_num("hull.waterplane_coefficient", &h.waterplane_coefficient),
        lcb_fraction: r.opt_num("hull.lcb_fraction", &h.lcb_fraction),
        wetted_surface: r.opt_qty("hull.wetted_surface", &h.wetted_surface, Kind::Area)?,
        half_entrance_angle: r.opt_qty(
            "hull.half_entrance_angle",
            &h.half_entrance_angle,
            Kind::Angle,
        )?,
        transom_area: r.opt_qty("hull.transom_area", &h.transom_area, Kind::Area)?,
        bulb_area: r.opt_qty("hull.bulb_area", &h.bulb_area, Kind::Area)?,
        bulb_centre_height: r.opt_qty("hull.bulb_centre_height", &h.bulb_centre_height, length)?,
        stern_coefficient: r.opt_num("hull.stern_coefficient", &h.stern_coefficient),
        appendage_area: r.opt_qty("hull.appendage_area", &h.appendage_area, Kind::Area)?,
        appendage_form_factor: r.opt_num("hull.appendage_form_factor", &h.appendage_form_factor),
    })
}

fn read_load(r: &mut Reader<'_>, l: &RawLoad) -> Result<LoadDoc, ProfileError> {
    r.spans.insert("load".into(), l.default.span());
    let default = r.choice("load.default", &l.default, &CONDITIONS)?;
    let mut case = |name: &str, c: &Option<RawCase>| -> Result<Option<LoadCase>, ProfileError> {
        let Some(c) = c else { return Ok(None) };
        let key = format!("load.{name}");
        r.spans.insert(key.clone(), c.displacement.span());
        Ok(Some(LoadCase {
            displacement: r.qty(&format!("{key}.displacement"), &c.displacement, Kind::Mass)?,
            draft_aft: r.opt_qty(&format!("{key}.draft_aft"), &c.draft_aft, Kind::Length)?,
            draft_forward: r.opt_qty(
                &format!("{key}.draft_forward"),
                &c.draft_forward,
                Kind::Length,
            )?,
        }))
    };
    Ok(LoadDoc {
        default,
        light: case("light", &l.light)?,
        half: case("half", &l.half)?,
        full: case("full", &l.full)?,
    })
}

fn read_variant(r: &mut Reader<'_>, key: &str, v: &RawVariant) -> Result<VariantDoc, ProfileError> {
    r.spans.insert(key.to_owned(), v.label.span());
    let blades_key = format!("{key}.blades");
    r.spans.insert(blades_key.clone(), v.blades.span());
    let blades = u32::try_from(*v.blades.get_ref()).map_err(|_| {
        r.error(
            &blades_key,
            v.blades.span(),
            Issue::new(
                blades_key.clone(),
                v.blades.get_ref().to_string(),
                "expected 2 to 9 blades",
            ),
        )
    })?;
    let open_water = v.open_water.as_ref().map(|rows| {
        if let Some(first) = rows.first() {
            r.spans.insert(format!("{key}.open_water"), first.0.span());
        }
        rows.iter()
            .enumerate()
            .map(|(i, (j, kt, kq))| {
                r.spans
                    .insert(format!("{key}.open_water[{}]", i + 1), j.span());
                (*j.get_ref(), *kt.get_ref(), *kq.get_ref())
            })
            .collect()
    });
    Ok(VariantDoc {
        label: r.text(&format!("{key}.label"), &v.label),
        blades,
        diameter: r.qty(&format!("{key}.diameter"), &v.diameter, Kind::ScrewLength)?,
        pitch: r.qty(&format!("{key}.pitch"), &v.pitch, Kind::ScrewLength)?,
        area_ratio: r.num(&format!("{key}.area_ratio"), &v.area_ratio),
        thickness_ratio: r.opt_num(&format!("{key}.thickness_ratio"), &v.thickness_ratio),
        rotation: v
            .rotation
            .as_ref()
            .map(|h| r.choice(&format!("{key}.rotation"), h, &ROTATIONS))
            .transpose()?,
        open_water,
    })
}

/// Collects validation issues.
struct Validator {
    issues: Vec<Issue>,
}

impl Validator {
    fn push(
        &mut self,
        key: impl Into<String>,
        found: impl Into<String>,
        problem: impl Into<String>,
    ) {
        self.issues.push(Issue::new(key, found, problem));
    }
    fn positive(&mut self, key: &str, q: &Quantity, what: &str) {
        if !(q.value > 0.0 && q.value.is_finite()) {
            self.push(key, q.shown(), format!("expected a positive {what}"));
        }
    }
    fn opt_positive(&mut self, key: &str, q: &Option<Quantity>, what: &str) {
        if let Some(q) = q {
            self.positive(key, q, what);
        }
    }
    fn opt_not_negative(&mut self, key: &str, q: &Option<Quantity>, what: &str) {
        if let Some(q) = q
            && !(q.value >= 0.0 && q.value.is_finite())
        {
            self.push(
                key,
                q.shown(),
                format!("expected an {what} of zero or more"),
            );
        }
    }
    fn range(&mut self, key: &str, value: Option<f64>, min: f64, max: f64, expected: &str) {
        if let Some(x) = value
            && !(min..=max).contains(&x)
        {
            self.push(key, x.to_string(), format!("expected {expected}"));
        }
    }
    fn range_open(&mut self, key: &str, value: f64, min: f64, below: f64, expected: &str) {
        if !(value >= min && value < below) {
            self.push(key, value.to_string(), format!("expected {expected}"));
        }
    }
    fn efficiency(&mut self, key: &str, value: f64) {
        if !(value > 0.5 && value <= 1.0) {
            self.push(
                key,
                value.to_string(),
                "expected an efficiency above 0.5 and at most 1 (0.97 = 97 %)",
            );
        }
    }
}
