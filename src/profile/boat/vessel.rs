//! Building the core's `Vessel` from a boat document and its engine sheet.

use super::{
    BoatDoc, DEFAULT_APPENDAGE_FORM_FACTOR, InteractionDoc, LoadCase, LoadCondition, MatchDoc,
    ResistanceMethodDoc,
};
use crate::profile::engine::EngineDoc;
use crate::profile::error::{Issue, ProfileError};
use crate::propulsion::hull::interaction::ScrewAtStern;
use crate::propulsion::hull::{
    AirDrag, HullError, HullInput, Interaction, InteractionMethod, Margins, ResistanceMethod,
    ResistanceModel, ResistanceTable, choose_method,
};
use crate::propulsion::screw::{
    BSeriesScrew, OpenWaterPoint, OpenWaterTable, ScrewGeometry, ScrewModel,
};
use crate::propulsion::solver::pitch::RepitchLimit;
use crate::propulsion::solver::{Installation, MatchCriteria, TrialRun, Trip, Variant, Vessel};
use crate::propulsion::water;

impl BoatDoc {
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
        let hull_input = self.hull_input(case, water.density);
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
        let resistance = ResistanceModel::new(
            hull,
            method,
            water,
            air,
            Margins {
                service: self.resistance.service_margin,
                fouling: self.resistance.fouling,
                resistance_factor: calibration.map_or(1.0, |c| c.resistance_factor),
                froude_factor: calibration.and_then(|c| c.froude_factor),
            },
        );
        let interaction_follows = matches!(self.interaction, InteractionDoc::Auto);
        let mut interaction = match self.interaction {
            InteractionDoc::Auto => {
                InteractionMethod::paired_with_shafts(&resistance.method, self.installation.shafts)
            }
            InteractionDoc::VanOortmerssen => InteractionMethod::VanOortmerssen,
            // "holtrop-1984" means the paper's formulas for the boat's number of shafts.
            InteractionDoc::Holtrop1984 if self.installation.shafts == 2 => {
                InteractionMethod::Holtrop1984TwinScrew
            }
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
                shafts: self.installation.shafts,
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

    /// The core's hull input for the loading `case` floating in water of `density`, kg/m³.
    pub(super) fn hull_input(&self, case: &LoadCase, density: f64) -> HullInput {
        let h = &self.hull;
        HullInput {
            length_waterline: h.length_waterline.value,
            beam_waterline: h.beam_waterline.value,
            draft_aft: case.draft_aft.as_ref().unwrap_or(&h.draft_aft).value,
            draft_forward: case
                .draft_forward
                .as_ref()
                .unwrap_or(&h.draft_forward)
                .value,
            displacement_volume: case.displacement.value / density,
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
        }
    }

    /// The hull-form problem of each load case the file gives (a block coefficient no hull
    /// can have, from a displacement in the wrong unit, say), keyed to the file.
    pub(super) fn hull_form_issues(&self) -> Vec<Issue> {
        let Ok(water) = water::water_properties(self.water.kind, self.water.temperature.value)
        else {
            return Vec::new();
        };
        let mut issues = Vec::new();
        for condition in LoadCondition::ALL {
            let Some(case) = self.load.case(condition) else {
                continue;
            };
            if let Err(e) = self.hull_input(case, water.density).check() {
                let key = hull_error_key(&e, condition);
                let found = if key.ends_with("displacement") {
                    case.displacement.shown()
                } else {
                    String::new()
                };
                issues.push(Issue::new(key, found, e.to_string()));
            }
        }
        issues
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
