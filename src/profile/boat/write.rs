//! Writing a boat back to TOML in its unit system.

use super::raw::RawScrewShop;
use super::raw::{
    DIRECTIONS, ROTATIONS, RawAsFound, RawBoat, RawCalibration, RawCase, RawHistory, RawHull,
    RawInstallation, RawInteraction, RawLoad, RawMatch, RawResistance, RawRun, RawTrial, RawTrip,
    RawVariant, RawWater, RawWindage, SIDES, WATERS,
};
use super::{BoatDoc, InteractionDoc, LoadCase, ResistanceMethodDoc, TrialDoc};
use crate::profile::fields::{UNIT_SYSTEMS, name_of};
use crate::profile::quantity::{Quantity, out, out_num, out_text};
use crate::units::Kind;
use toml::Spanned;

impl BoatDoc {
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
            schema: Spanned::new(0..0, crate::profile::SCHEMA_VERSION),
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
                gear_ratio: toml::Spanned::new(0..0, toml::Value::Float(inst.gear_ratio)),
                shaft_efficiency: out_num(inst.shaft_efficiency),
                gear_efficiency: out_num(inst.gear_efficiency),
                shaft_immersion: oq(&inst.shaft_immersion, Kind::Length),
                shaft_diameter: oq(&inst.shaft_diameter, Kind::ScrewLength),
                shaft_material: inst.shaft_material.as_deref().map(out_text),
                max_screw_diameter: oq(&inst.max_screw_diameter, Kind::ScrewLength),
                tip_clearance: oq(&inst.tip_clearance, Kind::ScrewLength),
                weight_change: oq(&inst.weight_change, Kind::Mass),
                // A single screw is the default and is not written.
                shafts: (inst.shafts != 1)
                    .then(|| toml::Spanned::new(0..0, i64::from(inst.shafts))),
                port_shaft_immersion: oq(&inst.port_shaft_immersion, Kind::Length),
            },
            trip: RawTrip {
                target_speed: out(&self.trip.target_speed, Kind::Speed, s),
                tank: out(&self.trip.tank, Kind::Volume, s),
                usable_fraction: out_num(self.trip.usable_fraction),
                reserve: out_num(self.trip.reserve),
                profile: (!self.trip.profile.is_empty()).then(|| {
                    self.trip
                        .profile
                        .iter()
                        .map(|(speed, share)| (out(speed, Kind::Speed, s), out_num(*share)))
                        .collect()
                }),
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
            screw_shop: self.screw_shop.as_ref().map(|shop| RawScrewShop {
                pitch_step: oq(&shop.pitch_step, Kind::ScrewLength),
                taper: shop.taper.as_deref().map(out_text),
                bore: oq(&shop.bore, Kind::ScrewLength),
                keyway: shop.keyway.as_deref().map(out_text),
            }),
            trial: self.trial.as_ref().map(|t| write_trial(t, s)),
            calibration: self.calibration.as_ref().map(|c| RawCalibration {
                resistance_factor: out_num(c.resistance_factor),
                wake_fraction: on(c.wake_fraction),
                froude_low: c.froude_factor.map(|f| out_num(f.froude_low)),
                factor_low: c.froude_factor.map(|f| out_num(f.low)),
                froude_high: c.froude_factor.map(|f| out_num(f.froude_high)),
                factor_high: c.froude_factor.map(|f| out_num(f.high)),
                trial_date: c.trial_date.clone(),
                note: c.note.clone(),
            }),
            as_found: self.as_found.as_ref().map(|a| RawAsFound {
                engine: out_text(&a.engine),
                gear_ratio: Spanned::new(0..0, toml::Value::Float(a.gear_ratio)),
                variant: out_text(&a.variant),
                shaft_efficiency: on(a.shaft_efficiency),
                gear_efficiency: on(a.gear_efficiency),
            }),
            history: self
                .history
                .iter()
                .map(|h| RawHistory {
                    until: out_text(&h.until),
                    engine: out_text(&h.engine),
                    gear_ratio: Spanned::new(0..0, toml::Value::Float(h.gear_ratio)),
                    screw: out_text(&h.screw),
                    trial: h.trial.as_ref().map(|t| write_trial(t, s)),
                })
                .collect(),
        };
        toml::to_string_pretty(&raw).unwrap_or_else(|e| format!("# could not be written: {e}\n"))
    }
}

/// A sea-trial log in its raw form, in unit system `s`.
fn write_trial(t: &TrialDoc, s: crate::units::UnitSystem) -> RawTrial {
    RawTrial {
        date: t.date.clone(),
        note: t.note.clone(),
        installation: t.installation.map(|side| out_text(name_of(&SIDES, side))),
        run: t
            .runs
            .iter()
            .map(|run| RawRun {
                rpm: out(&run.rpm, Kind::Rotation, s),
                speed: out(&run.speed, Kind::Speed, s),
                direction: run.direction.map(|d| out_text(name_of(&DIRECTIONS, d))),
                fuel_rate: run.fuel_rate.as_ref().map(|q| out(q, Kind::FuelRate, s)),
            })
            .collect(),
    }
}
