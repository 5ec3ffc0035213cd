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
    /// Shafts fitted, 1 or 2; each has its own engine (the same sheet), gear and screw (the
    /// same variant, handed on a twin).
    pub shafts: u32,
    /// Shafts whose engine is stopped and whose screw trails, 0 normally; the one-engine-out
    /// condition sets 1 on a twin.
    pub idle_shafts: u32,
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
    /// Refuses an interaction method that does not fit the shaft count: the single-screw
    /// estimates (Holtrop 1984 single screw, Taylor, van Oortmerssen) on a twin-screw boat.
    pub fn check_interaction_fits(&self) -> Result<(), PointFailure> {
        self.interaction
            .check_shafts(self.installation.shafts)
            .map_err(PointFailure::InteractionForShafts)
    }

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

/// Most shafts an installation may have.
pub const MAX_SHAFTS: u32 = 2;

impl Installation {
    /// A single-screw installation with this gear ratio and these shaft and gear efficiencies.
    pub fn single_screw(gear_ratio: f64, shaft_efficiency: f64, gear_efficiency: f64) -> Self {
        Self {
            gear_ratio,
            shaft_efficiency,
            gear_efficiency,
            shafts: 1,
            idle_shafts: 0,
        }
    }

    /// Shafts whose engine runs and drives its screw (count).
    pub fn driven_shafts(&self) -> u32 {
        self.shafts.saturating_sub(self.idle_shafts)
    }

    /// Whether the boat has two screws (whatever is running).
    pub fn is_twin_screw(&self) -> bool {
        self.shafts == 2
    }

    /// Checks the gear ratio and efficiencies (ratio positive, efficiencies in (0, 1]), the
    /// shaft count (1 or 2) and that at least one engine runs.
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
        if !(1..=MAX_SHAFTS).contains(&self.shafts) {
            return bad(
                "shafts",
                f64::from(self.shafts),
                "1 (single screw) or 2 (twin screw)",
            );
        }
        if self.idle_shafts >= self.shafts {
            return bad(
                "idle shafts",
                f64::from(self.idle_shafts),
                "fewer idle shafts than shafts (at least one engine running)",
            );
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
        let good = Installation::single_screw(2.0, 0.98, 0.97);
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
        let twin = Installation { shafts: 2, ..good };
        assert_eq!(twin.check(), Ok(()));
        assert_eq!(twin.driven_shafts(), 2);
        for shafts in [0, 3] {
            let bad = Installation { shafts, ..good };
            let message = bad.check().unwrap_err().to_string();
            assert!(
                message.contains("shafts = ") && message.contains("1 (single screw) or 2"),
                "{message}"
            );
        }
        let one_out = Installation {
            idle_shafts: 1,
            ..twin
        };
        assert_eq!(one_out.check(), Ok(()));
        assert_eq!(one_out.driven_shafts(), 1);
        let none_running = Installation {
            idle_shafts: 1,
            ..good
        };
        assert!(
            none_running
                .check()
                .unwrap_err()
                .to_string()
                .contains("idle shafts")
        );
    }
}
