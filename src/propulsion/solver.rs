//! The shared solver: thrust identity, propeller curve, engine match, cruise, design, trials.
//!
//! The TUI and CLI both call these functions; neither does physics of its own.

pub mod conditions;
pub mod cruise;
pub mod curve;
pub mod design;
pub mod matching;
pub mod point;
pub mod shaft;
pub mod trial;
pub mod vessel;

pub use cruise::{CruisePoint, Trip};
pub use curve::PropellerCurve;
pub use matching::{MatchCriteria, MatchResult, Verdict};
pub use point::{OperatingPoint, PointFailure};
pub use trial::{RunDirection, TrialRun};
pub use vessel::{Variant, Vessel};

use crate::propulsion::engine::EngineSheet;
use crate::propulsion::hull::interaction::ScrewAtStern;
use crate::propulsion::hull::{InteractionMethod, ResistanceModel};
use crate::propulsion::screw::ScrewModel;

/// Shaft line and reduction gear between engine and screw.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Installation {
    /// Reduction ratio: engine rpm / screw rpm (≥ 1 for a reduction gear).
    pub gear_ratio: f64,
    /// Shaft line (bearings, seals) efficiency, fraction.
    pub shaft_efficiency: f64,
    /// Reduction gear efficiency, fraction.
    pub gear_efficiency: f64,
}

/// One complete propulsion system to solve: boat, interaction, screw, installation and engine.
#[derive(Debug, Clone, PartialEq)]
pub struct System<'a> {
    /// The boat's resistance model (hull, water, air, margins).
    pub resistance: &'a ResistanceModel,
    /// How wake, thrust deduction and ηR are found.
    pub interaction: InteractionMethod,
    /// The screw.
    pub screw: &'a ScrewModel,
    /// Gear and shaft.
    pub installation: Installation,
    /// The engine sheet.
    pub engine: &'a EngineSheet,
    /// Whether to apply the B-series Reynolds-number correction at full scale.
    pub reynolds_correction: bool,
}

impl System<'_> {
    /// What the interaction estimate needs to know about this system's screw.
    pub fn screw_at_stern(&self) -> ScrewAtStern {
        let g = self.screw.geometry();
        ScrewAtStern {
            diameter: g.diameter,
            pitch_ratio: g.pitch_ratio(),
            area_ratio: g.area_ratio,
            blades: g.blades,
        }
    }
}
