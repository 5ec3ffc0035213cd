//! The boat file (`boats/NAME.toml`): the typed document and its limits. Each stage has its
//! own file: the raw TOML form (`raw`), reading (`read`), writing (`write`), validation
//! (`validate`) and the core's `Vessel` (`vessel`).

mod raw;
mod read;
mod validate;
mod vessel;
mod write;

use super::quantity::Quantity;
use crate::propulsion::solver::pitch::RepitchLimit;
use crate::propulsion::solver::{MatchCriteria, RunDirection};
use crate::propulsion::water::WaterKind;
use crate::units::UnitSystem;
use serde::{Deserialize, Serialize};

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
    /// Displacement change of the repower, kg (the engine sheets' `dry_weight` difference
    /// when absent).
    pub weight_change: Option<Quantity>,
    /// Tip clearance to the hull kept when sizing the screw, m.
    pub tip_clearance: Option<Quantity>,
    /// Number of shafts: 1 (single screw) or 2 (twin screw: the same engine sheet, gear and
    /// screw variant on both, handed; a variant's `rotation` is the starboard screw's hand).
    pub shafts: u32,
    /// Depth of the port shaft's centreline when it differs from `shaft_immersion` (the
    /// starboard one's), m; twin screw only.
    pub port_shaft_immersion: Option<Quantity>,
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
    /// The owner's trip profile: (speed m/s, fraction of engine hours at it); empty when the
    /// file gives none.
    pub profile: Vec<(Quantity, f64)>,
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
    /// The installation the runs were made with (`None`: the one in the boat today, the
    /// `[as_found]` side when the file has one).
    pub installation: Option<Side>,
    /// The runs.
    pub runs: Vec<TrialRunDoc>,
}

/// One side of a repower: the installation in the boat today or the planned one.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub enum Side {
    /// The installation in the boat now (`[as_found]`).
    AsFound,
    /// The planned installation (`engine`, `[installation]`, the active `[[variant]]`).
    Planned,
}

impl Side {
    /// The name in files and JSON: "as-found" or "planned".
    pub fn name(self) -> &'static str {
        match self {
            Side::AsFound => "as-found",
            Side::Planned => "planned",
        }
    }
}

/// The installation in the boat today, before the repower (`[as_found]`); what it does not
/// give is as in `[installation]`.
#[derive(Debug, Clone, PartialEq)]
pub struct AsFoundDoc {
    /// The engine sheet's profile name of the engine in the boat now.
    pub engine: String,
    /// Reduction ratio of the gearbox in the boat now, engine rpm / screw rpm.
    pub gear_ratio: f64,
    /// Label of the `[[variant]]` on the shaft now.
    pub variant: String,
    /// Shaft line efficiency now, fraction (`[installation]`'s when absent).
    pub shaft_efficiency: Option<f64>,
    /// Gear efficiency now, fraction (`[installation]`'s when absent).
    pub gear_efficiency: Option<f64>,
}

/// An installation the boat had before, written when a repower was marked done (`[[history]]`).
#[derive(Debug, Clone, PartialEq)]
pub struct HistoryDoc {
    /// The day it was taken out (YYYY-MM-DD).
    pub until: String,
    /// Its engine sheet's profile name.
    pub engine: String,
    /// Its reduction ratio.
    pub gear_ratio: f64,
    /// Its screw as the shop would write it (blades, diameter, pitch, area ratio).
    pub screw: String,
    /// The sea-trial log run on it, moved here with it (it no longer describes the boat).
    pub trial: Option<TrialDoc>,
}

/// A correction fitted to a sea trial and applied to every prediction.
#[derive(Debug, Clone, PartialEq)]
pub struct CalibrationDoc {
    /// Factor on calm, clean-hull water resistance (1 = none); margins go on top.
    pub resistance_factor: f64,
    /// Fitted wake fraction, replacing the estimate, if fitted.
    pub wake_fraction: Option<f64>,
    /// A factor varying with Froude number (the two-parameter fit), replacing
    /// `resistance_factor` when given.
    pub froude_factor: Option<crate::propulsion::hull::FroudeFactor>,
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
    /// The installation in the boat today, when the file plans a change from it.
    pub as_found: Option<AsFoundDoc>,
    /// Installations the boat had before, oldest first.
    pub history: Vec<HistoryDoc>,
    /// What the propeller shop needs beyond the screw (`[screw_shop]`), if given.
    pub screw_shop: Option<ScrewShopDoc>,
}

/// Most screw variants a boat file may hold: far more than any comparison needs, few enough
/// that a file of thousands (a generated or corrupted one) is refused at once.
pub const MAX_VARIANTS: usize = 64;

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

/// Appendage form factor 1+k2 used when the file gives none: Holtrop & Mennen (1982) table,
/// rudder behind skeg 1.5–2.0 (lower end taken).
const DEFAULT_APPENDAGE_FORM_FACTOR: f64 = 1.5;

/// The note for a boat with no service margin and no fouling (as when `[resistance]` is left
/// out): one line for `check` and the report's warnings.
pub const NO_MARGIN_NOTE: &str = "no service margin or fouling applied: the screw is matched to a clean hull in calm water \
     (give [resistance] service_margin, 0.10-0.20 is common practice)";

impl BoatDoc {
    /// Notes on what the file leaves out that changes the answer (not errors), one line each.
    pub fn notes(&self) -> Vec<String> {
        let mut notes = Vec::new();
        if self.resistance.service_margin == 0.0 && self.resistance.fouling == 0.0 {
            notes.push(NO_MARGIN_NOTE.to_owned());
        }
        notes
    }

    /// The active variant, if the index is valid.
    pub fn active(&self) -> Option<&VariantDoc> {
        self.variants.get(self.active_variant)
    }

    /// The side the trial log was run on: as written, else the as-found side when the file
    /// has one, else the planned (the only) one.
    pub fn trial_side(&self) -> Side {
        match (
            self.trial.as_ref().and_then(|t| t.installation),
            &self.as_found,
        ) {
            (Some(side), Some(_)) => side,
            (_, Some(_)) => Side::AsFound,
            (_, None) => Side::Planned,
        }
    }

    /// The boat as it is today: the planned document set to the `[as_found]` engine, gear,
    /// efficiencies and screw (`None` without `[as_found]` or when its variant is not listed).
    pub fn as_found_doc(&self) -> Option<BoatDoc> {
        let found = self.as_found.as_ref()?;
        let index = self
            .variants
            .iter()
            .position(|v| v.label == found.variant)?;
        let mut doc = self.clone();
        doc.engine = found.engine.clone();
        doc.installation.gear_ratio = found.gear_ratio;
        if let Some(e) = found.shaft_efficiency {
            doc.installation.shaft_efficiency = e;
        }
        if let Some(e) = found.gear_efficiency {
            doc.installation.gear_efficiency = e;
        }
        doc.installation.weight_change = None;
        doc.active_variant = index;
        doc.as_found = None;
        // In the boat as it is, its one installation is the one the trial names.
        if let Some(trial) = doc.trial.as_mut() {
            trial.installation = None;
        }
        Some(doc)
    }

    /// The document with every load case's displacement changed by `change` kg (the planned
    /// side's weight after a repower).
    pub fn with_displacement_change(&self, change: f64) -> BoatDoc {
        let mut doc = self.clone();
        for case in [&mut doc.load.light, &mut doc.load.half, &mut doc.load.full]
            .into_iter()
            .flatten()
        {
            case.displacement = Quantity::new(case.displacement.value + change);
        }
        doc
    }
}

/// The `[screw_shop]` section: how the propeller shop cuts pitch and what fits the screw to
/// the shaft. Every value is optional; the order sheet says "not given" for a missing one.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ScrewShopDoc {
    /// The step the shop cuts pitch in, m (the unit system's default when absent).
    pub pitch_step: Option<Quantity>,
    /// The shaft taper as the shop writes it, e.g. "1:16" (text).
    pub taper: Option<String>,
    /// The hub bore at the large end of the taper, m.
    pub bore: Option<Quantity>,
    /// The keyway as the shop writes it, e.g. "5/16 in" (text).
    pub keyway: Option<String>,
}

/// The pitch step of a file in imperial units when `[screw_shop]` gives none, m (0.5 in:
/// common practice, shops quote and cut pitch in half inches).
pub const DEFAULT_PITCH_STEP_IMPERIAL: f64 = 0.5 * 0.0254;

/// The pitch step of a file in metric units when `[screw_shop]` gives none, m (10 mm: common
/// practice).
pub const DEFAULT_PITCH_STEP_METRIC: f64 = 0.010;

/// Largest pitch step of a file in imperial units, m (2 in: a coarser step is no choice of
/// pitch at all).
pub const MAX_PITCH_STEP_IMPERIAL: f64 = 2.0 * 0.0254;

/// Largest pitch step of a file in metric units, m (50 mm).
pub const MAX_PITCH_STEP_METRIC: f64 = 0.050;

/// Largest hub bore the loader accepts, m (12 in: past any small-craft shaft).
const MAX_BORE: f64 = 12.0 * 0.0254;

impl BoatDoc {
    /// The step the propeller shop cuts pitch in, m, and whether the file gives it (else the
    /// default of the file's unit system).
    pub fn pitch_step(&self) -> (f64, bool) {
        match self.screw_shop.as_ref().and_then(|s| s.pitch_step.as_ref()) {
            Some(step) => (step.value, true),
            None => (
                match self.units {
                    UnitSystem::Imperial => DEFAULT_PITCH_STEP_IMPERIAL,
                    UnitSystem::Metric => DEFAULT_PITCH_STEP_METRIC,
                },
                false,
            ),
        }
    }

    /// The largest pitch step this file's unit system allows, m, and how it is written.
    fn max_pitch_step(&self) -> (f64, &'static str) {
        match self.units {
            UnitSystem::Imperial => (MAX_PITCH_STEP_IMPERIAL, "2 in"),
            UnitSystem::Metric => (MAX_PITCH_STEP_METRIC, "50 mm"),
        }
    }
}
