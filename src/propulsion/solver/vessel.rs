//! A whole boat in SI form, ready to solve: resistance, interaction, gear, screws, engine, trip.

use super::cruise::{CruisePoint, Trip, cruise_at_rpm, cruise_at_speed};
use super::matching::{MatchCriteria, MatchResult, match_engine};
use super::pitch::RepitchLimit;
use super::point::PointFailure;
use super::trial::TrialRun;
use super::{Installation, System};
use crate::propulsion::engine::EngineSheet;
use crate::propulsion::hull::{InteractionMethod, MethodChoice, ResistanceModel};
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
    /// Why the resistance method was picked, when the boat named none (`None`: named).
    pub method_choice: Option<MethodChoice>,
    /// Whether `interaction` goes with the resistance method (none named), so the alternative
    /// method brings its own interaction too.
    pub interaction_follows_method: bool,
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
    /// Verdict limits and the light-running margin a recommended pitch aims at.
    pub match_criteria: MatchCriteria,
    /// How far the boat's screws may be re-pitched.
    pub repitch: RepitchLimit,
    /// Sea-trial log, possibly empty.
    pub trial: Vec<TrialRun>,
}

impl Vessel {
    /// The index of the variant labelled `label`, if there is one.
    pub fn variant_by_label(&self, label: &str) -> Option<usize> {
        self.variants.iter().position(|v| v.label == label)
    }

    /// The variants' labels, comma-separated, for messages naming the choices.
    pub fn variant_labels(&self) -> String {
        self.variants
            .iter()
            .map(|v| v.label.as_str())
            .collect::<Vec<_>>()
            .join(", ")
    }

    /// The same boat under the alternative resistance method of its method choice (and that
    /// method's interaction when the interaction follows the method), if there is one.
    pub fn with_alternative_method(&self) -> Option<Vessel> {
        let alternative = self.method_choice.as_ref()?.alternative.clone()?;
        let mut other = self.clone();
        if self.interaction_follows_method {
            other.interaction =
                InteractionMethod::paired_with_shafts(&alternative, self.installation.shafts);
        }
        other.resistance = other.resistance.with_method(alternative.clone());
        other.method_choice = None;
        Some(other)
    }

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

/// One row of the rpm-step operating table.
#[derive(Debug, Clone, PartialEq)]
pub struct OperatingRow {
    /// Engine speed of the row, rpm.
    pub engine_rpm: f64,
    /// Whether this row is the wide-open-throttle point (the match's meeting rpm).
    pub wide_open_throttle: bool,
    /// The cruise figures at this rpm, or why they could not be found.
    pub cruise: Result<CruisePoint, PointFailure>,
}

/// The most rows an operating table may have (a guard against a tiny rpm step).
pub const MAX_OPERATING_ROWS: usize = 1000;

impl Vessel {
    /// The propulsion system of the active variant.
    pub fn active_system(&self) -> System<'_> {
        self.system(self.active_variant)
    }

    /// The engine match of every variant, in the order of `variants`.
    pub fn match_all(&self) -> Vec<Result<MatchResult, PointFailure>> {
        (0..self.variants.len())
            .map(|index| match_engine(&self.system(index), &self.match_criteria))
            .collect()
    }

    /// The cruise point of variant `index` at the trip's target speed.
    pub fn cruise_at_target(&self, index: usize) -> Result<CruisePoint, PointFailure> {
        cruise_at_speed(&self.system(index), &self.trip, self.trip.target_speed)
    }

    /// The rpm-step operating table of variant `index`: a row at every multiple of
    /// `step_rpm` from idle up to the wide-open-throttle rpm of the match, and a last row at
    /// wide-open throttle itself. If the match fails, the rows go up to rated rpm and the
    /// last row's failure says why.
    pub fn operating_table(
        &self,
        index: usize,
        step_rpm: f64,
    ) -> Result<Vec<OperatingRow>, PointFailure> {
        let system = self.system(index);
        let engine = &self.engine;
        let matched = match_engine(&system, &self.match_criteria);
        let top_rpm = matched.as_ref().map_or(engine.rated_rpm, |m| m.meeting_rpm);
        if !(step_rpm.is_finite() && step_rpm > 0.0) {
            return Err(PointFailure::BadInput {
                field: "rpm step",
                value: step_rpm,
                expected: "a positive step in rpm",
            });
        }
        let first_step = (engine.idle_rpm / step_rpm).ceil();
        let last_step = (top_rpm / step_rpm).floor();
        let steps = (last_step - first_step + 1.0).max(0.0);
        if !(steps.is_finite() && steps < MAX_OPERATING_ROWS as f64) {
            return Err(PointFailure::BadInput {
                field: "rpm step",
                value: step_rpm,
                expected: "a step giving at most 1000 rows between idle and full throttle",
            });
        }
        let mut rows = Vec::with_capacity(steps as usize + 1);
        for k in 0..steps as usize {
            let engine_rpm = (first_step + k as f64) * step_rpm;
            // The step that lands on the wide-open-throttle rpm is that row.
            if (engine_rpm - top_rpm).abs() <= 1e-6 * top_rpm {
                break;
            }
            let cruise = cruise_at_rpm(&system, &self.trip, engine_rpm);
            rows.push(OperatingRow {
                engine_rpm,
                wide_open_throttle: false,
                cruise,
            });
        }
        let cruise = match matched {
            Ok(m) => CruisePoint::from_point(&self.trip, m.top_point),
            Err(failure) => Err(failure),
        };
        rows.push(OperatingRow {
            engine_rpm: top_rpm,
            wide_open_throttle: true,
            cruise,
        });
        Ok(rows)
    }
}

/// The two resistance methods side by side for one screw: the chosen one and its alternative.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct MethodSpread {
    /// The method used for every figure.
    pub method: &'static str,
    /// The alternative computed beside it.
    pub alternative: &'static str,
    /// Calm resistance at the target speed by the chosen method, N (margins included).
    pub resistance_at_target: Option<f64>,
    /// The same by the alternative, N.
    pub alternative_resistance_at_target: Option<f64>,
    /// Top speed by the chosen method, m/s.
    pub top_speed: Option<f64>,
    /// Top speed by the alternative, m/s.
    pub alternative_top_speed: Option<f64>,
}

impl MethodSpread {
    /// The alternative's resistance at the target speed over the chosen method's, less 1
    /// (dimensionless; +0.2 = the alternative is 20 % higher).
    pub fn resistance_difference(&self) -> Option<f64> {
        match (
            self.resistance_at_target,
            self.alternative_resistance_at_target,
        ) {
            (Some(a), Some(b)) if a > 0.0 => Some(b / a - 1.0),
            _ => None,
        }
    }
}

impl Vessel {
    /// Both methods' resistance at the target speed and top speed of variant `index`, when the
    /// method choice computes an alternative; `None` otherwise.
    pub fn method_spread(&self, index: usize) -> Option<MethodSpread> {
        let other = self.with_alternative_method()?;
        let resistance = |v: &Vessel| {
            v.resistance
                .resistance(v.trip.target_speed)
                .ok()
                .map(|r| r.total)
        };
        let top = |v: &Vessel| {
            match_engine(&v.system(index), &v.match_criteria)
                .ok()
                .map(|m| m.top_speed)
        };
        Some(MethodSpread {
            method: self.resistance.method.name(),
            alternative: other.resistance.method.name(),
            resistance_at_target: resistance(self),
            alternative_resistance_at_target: resistance(&other),
            top_speed: top(self),
            alternative_top_speed: top(&other),
        })
    }
}
