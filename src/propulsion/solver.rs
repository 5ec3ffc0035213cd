//! The shared solver: thrust identity, propeller curve, engine match, cruise, design, trials.
//!
//! The TUI and CLI both call these functions; neither does physics of its own.

pub mod checks;
pub mod conditions;
pub mod cruise;
pub mod curve;
pub mod matching;
pub mod pitch;
pub mod point;
pub mod shaft;
pub mod sweep;
pub mod trial;
pub mod vessel;

pub use cruise::{CruisePoint, Trip, cruise_at_rpm, cruise_at_speed};
pub use curve::PropellerCurve;
pub use matching::{MatchCriteria, MatchResult, Verdict, match_engine, point_at_engine_rpm};
pub use point::{Drive, OperatingPoint, PointFailure, solve_point};
pub use trial::{RunDirection, TrialRun};
pub use vessel::{MethodSpread, OperatingRow, Variant, Vessel};

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

impl Installation {
    /// Checks the gear ratio and efficiencies: ratio positive, efficiencies in (0, 1].
    pub fn check(&self) -> Result<(), PointFailure> {
        let bad = |field, value, expected| {
            Err(PointFailure::BadInput {
                field,
                value,
                expected,
            })
        };
        if !(self.gear_ratio.is_finite() && self.gear_ratio > 0.0) {
            return bad(
                "gear ratio",
                self.gear_ratio,
                "a positive ratio of engine to screw rpm",
            );
        }
        for (field, value) in [
            ("shaft efficiency", self.shaft_efficiency),
            ("gear efficiency", self.gear_efficiency),
        ] {
            if !(value > 0.0 && value <= 1.0) {
                return bad(field, value, "a fraction above 0 and at most 1");
            }
        }
        Ok(())
    }
}

impl<'a> System<'a> {
    /// The drive of this system: screw, gear and engine in the water the boat floats in.
    pub fn drive(&self) -> point::Drive<'a> {
        point::Drive {
            screw: self.screw,
            installation: self.installation,
            engine: self.engine,
            water: self.resistance.water,
            reynolds_correction: self.reynolds_correction,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn installation_is_checked() {
        let good = Installation {
            gear_ratio: 2.0,
            shaft_efficiency: 0.98,
            gear_efficiency: 0.97,
        };
        assert_eq!(good.check(), Ok(()));
        let bad = Installation {
            gear_ratio: 0.0,
            ..good
        };
        assert!(bad.check().unwrap_err().to_string().contains("gear ratio"));
        let bad = Installation {
            shaft_efficiency: 1.2,
            ..good
        };
        assert!(
            bad.check()
                .unwrap_err()
                .to_string()
                .contains("shaft efficiency")
        );
    }
}
