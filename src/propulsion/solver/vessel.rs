//! A whole boat in SI form, ready to solve: resistance, interaction, gear, screws, engine, trip.

use super::cruise::Trip;
use super::matching::MatchCriteria;
use super::trial::TrialRun;
use super::{Installation, System};
use crate::propulsion::engine::EngineSheet;
use crate::propulsion::hull::{InteractionMethod, ResistanceModel};
use crate::propulsion::screw::ScrewModel;

/// One screw variant of a boat, as the user labelled it.
#[derive(Debug, Clone, PartialEq)]
pub struct Variant {
    /// The user's label, e.g. "current 20x14".
    pub label: String,
    /// The screw model.
    pub screw: ScrewModel,
}

/// A boat ready to solve: every input in SI, owned, built from a profile or by hand.
#[derive(Debug, Clone, PartialEq)]
pub struct Vessel {
    /// The boat's name.
    pub name: String,
    /// Resistance model: hull, water, air, margins and calibration.
    pub resistance: ResistanceModel,
    /// How wake, thrust deduction and ηR are found.
    pub interaction: InteractionMethod,
    /// Gear and shaft line.
    pub installation: Installation,
    /// The engine sheet.
    pub engine: EngineSheet,
    /// Screw variants; at least one.
    pub variants: Vec<Variant>,
    /// Index of the active variant in `variants`.
    pub active_variant: usize,
    /// Whether to apply the B-series Reynolds correction.
    pub reynolds_correction: bool,
    /// The planned trip.
    pub trip: Trip,
    /// Verdict limits.
    pub match_criteria: MatchCriteria,
    /// Sea-trial log, possibly empty.
    pub trial: Vec<TrialRun>,
}

impl Vessel {
    /// The propulsion system of variant `index` (clamped to the last variant).
    pub fn system(&self, index: usize) -> System<'_> {
        let variant = &self.variants[index.min(self.variants.len().saturating_sub(1))];
        System {
            resistance: &self.resistance,
            interaction: self.interaction,
            screw: &variant.screw,
            installation: self.installation,
            engine: &self.engine,
            reynolds_correction: self.reynolds_correction,
        }
    }
}
