//! Validating a boat document: every problem, each naming its file key and what was expected.

use super::MAX_BORE;
use super::{
    BoatDoc, InteractionDoc, LoadCondition, MAX_PITCH_RATIO, MAX_SCREW_DIAMETER, MAX_SCREW_PITCH,
    MIN_PITCH_RATIO, MIN_SCREW_LENGTH, ResistanceMethodDoc,
};
use crate::profile::error::{Issue, ProfileError};
use crate::profile::fields::check_name;
use crate::profile::quantity::Quantity;

impl BoatDoc {
    /// Every problem of the boat, in file order (empty when it is valid).
    pub fn validate(&self) -> Vec<Issue> {
        let mut v = Validator { issues: Vec::new() };
        if self.name.trim().is_empty() {
            v.push("name", "\"\"", "expected the boat's name");
        }
        if let Err(ProfileError::UnsafeName { reason, .. }) = check_name(&self.engine) {
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
                v.positive(
                    format_args!("{key}.displacement"),
                    &case.displacement,
                    "mass",
                );
                v.opt_positive(format_args!("{key}.draft_aft"), &case.draft_aft, "draft");
                v.opt_positive(
                    format_args!("{key}.draft_forward"),
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
        if !(1..=2).contains(&inst.shafts) {
            v.push(
                "installation.shafts",
                inst.shafts.to_string(),
                "expected 1 (single screw) or 2 (twin screw)",
            );
        }
        v.opt_positive(
            "installation.port_shaft_immersion",
            &inst.port_shaft_immersion,
            "depth",
        );
        if inst.shafts == 2 {
            let single_only = match self.interaction {
                InteractionDoc::VanOortmerssen => Some("van-oortmerssen"),
                InteractionDoc::Taylor => Some("taylor"),
                _ => None,
            };
            if let Some(name) = single_only {
                v.push(
                    "interaction.method",
                    format!("{name:?}"),
                    "a method for a twin-screw boat: this one is fitted to single screws; use \
                     \"holtrop-1984\" (its twin-screw formulas), \"auto\" or user values",
                );
            }
        } else if inst.port_shaft_immersion.is_some() {
            v.push(
                "installation.port_shaft_immersion",
                "given",
                "only with shafts = 2 (a single-screw boat has one shaft immersion)",
            );
        }
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
            v.positive(
                format_args!("{key}.diameter"),
                &variant.diameter,
                "diameter",
            );
            v.positive(format_args!("{key}.pitch"), &variant.pitch, "pitch");
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
                format_args!("{key}.thickness_ratio"),
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
        for (i, (speed, share)) in self.trip.profile.iter().enumerate() {
            let row = format!("trip.profile[{}]", i + 1);
            v.positive(format_args!("{row}.speed"), speed, "speed");
            if !(*share > 0.0 && *share <= 1.0) {
                v.push(
                    format!("{row}.fraction"),
                    share.to_string(),
                    "expected a fraction of engine hours above 0 and at most 1",
                );
            }
        }
        let hours: f64 = self.trip.profile.iter().map(|(_, share)| share).sum();
        // Fractions as typed rarely add to exactly 1; 1 % is what rounding to two places gives.
        if !self.trip.profile.is_empty() && (hours - 1.0).abs() > 0.01 {
            v.push(
                "trip.profile",
                format!("fractions summing to {hours}"),
                "expected fractions of engine hours that sum to 1 (within 1 %)",
            );
        }
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
                v.positive(format_args!("{key}.rpm"), &run.rpm, "rpm");
                v.positive(format_args!("{key}.speed"), &run.speed, "speed");
                v.opt_positive(format_args!("{key}.fuel_rate"), &run.fuel_rate, "fuel rate");
            }
        }
        if let Some(a) = &self.as_found {
            if let Err(ProfileError::UnsafeName { reason, .. }) = check_name(&a.engine) {
                v.push(
                    "as_found.engine",
                    format!("{:?}", a.engine),
                    format!("expected the name of the engine sheet of the engine in the boat now (letters, digits, '-', '_', '.'): {reason}"),
                );
            }
            if !(a.gear_ratio > 0.0 && a.gear_ratio <= 20.0) {
                v.push(
                    "as_found.gear_ratio",
                    a.gear_ratio.to_string(),
                    "expected the reduction ratio of the gearbox in the boat now, above 0 and at most 20 (2.5 for 2.5:1)",
                );
            }
            if !self.variants.iter().any(|x| x.label == a.variant) {
                let labels: Vec<String> = self
                    .variants
                    .iter()
                    .map(|x| format!("{:?}", x.label))
                    .collect();
                v.push(
                    "as_found.variant",
                    format!("{:?}", a.variant),
                    format!(
                        "expected the label of the [[variant]] on the shaft now: {}",
                        labels.join(", ")
                    ),
                );
            }
            if let Some(e) = a.shaft_efficiency {
                v.efficiency("as_found.shaft_efficiency", e);
            }
            if let Some(e) = a.gear_efficiency {
                v.efficiency("as_found.gear_efficiency", e);
            }
        }
        if let Some(w) = &self.installation.weight_change
            && (w.value.is_nan() || w.value.abs() > MAX_WEIGHT_CHANGE)
        {
            v.push(
                "installation.weight_change",
                w.shown(),
                "expected the displacement change of the repower, at most 10 t either way",
            );
        }
        if self.trial.as_ref().and_then(|t| t.installation) == Some(super::Side::AsFound)
            && self.as_found.is_none()
        {
            v.push(
                "trial.installation",
                "\"as-found\"",
                "expected \"planned\" or no value: the file has no [as_found] installation for the trial to have been run on",
            );
        }
        for (i, h) in self.history.iter().enumerate() {
            if !(h.gear_ratio > 0.0 && h.gear_ratio <= 20.0) {
                v.push(
                    format!("history[{}].gear_ratio", i + 1),
                    h.gear_ratio.to_string(),
                    "expected a reduction ratio above 0 and at most 20",
                );
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
            if let Some(f) = c.froude_factor {
                for (key, value) in [
                    ("calibration.factor_low", f.low),
                    ("calibration.factor_high", f.high),
                ] {
                    if value.is_nan() {
                        v.push(key, "", "missing: the two-parameter fit needs froude_low, factor_low, froude_high and factor_high together");
                    } else {
                        v.range(
                            key,
                            Some(value),
                            0.5,
                            2.0,
                            "a resistance factor from 0.5 to 2",
                        );
                    }
                }
                let ordered =
                    f.froude_low > 0.0 && f.froude_high > f.froude_low && f.froude_high <= 2.0;
                if !ordered {
                    v.push(
                        "calibration.froude_high",
                        format!("{} after froude_low {}", f.froude_high, f.froude_low),
                        "expected Froude numbers 0 < froude_low < froude_high ≤ 2 (the trial's slowest and fastest speeds)",
                    );
                }
            }
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
        if let Some(shop) = &self.screw_shop {
            if let Some(step) = &shop.pitch_step {
                let (max, written) = self.max_pitch_step();
                if !(step.value > 0.0 && step.value <= max + 1e-12) {
                    v.push(
                        "screw_shop.pitch_step",
                        step.shown(),
                        format!("expected a positive pitch step of at most {written}, e.g. \"0.5 in\" or \"10 mm\""),
                    );
                }
            }
            v.opt_positive("screw_shop.bore", &shop.bore, "hub bore");
            if shop.bore.as_ref().is_some_and(|b| b.value > MAX_BORE) {
                v.push(
                    "screw_shop.bore",
                    shop.bore.as_ref().map_or(String::new(), Quantity::shown),
                    "expected a hub bore of at most 12 in (305 mm)",
                );
            }
            for (key, text) in [
                ("screw_shop.taper", &shop.taper),
                ("screw_shop.keyway", &shop.keyway),
            ] {
                if text.as_ref().is_some_and(|t| t.trim().is_empty()) {
                    v.push(
                        key,
                        "\"\"",
                        "expected the text the shop writes, or leave the key out",
                    );
                }
            }
        }
        // The hull's form only once its particulars are each acceptable on their own.
        if v.issues.is_empty() {
            v.issues.extend(self.hull_form_issues());
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
}

/// Largest displacement change a repower may give, kg (10 t: far past any engine swap).
const MAX_WEIGHT_CHANGE: f64 = 10_000.0;

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
    fn positive(&mut self, key: impl std::fmt::Display, q: &Quantity, what: &str) {
        if !(q.value > 0.0 && q.value.is_finite()) {
            self.push(
                key.to_string(),
                q.shown(),
                format!("expected a positive {what}"),
            );
        }
    }
    fn opt_positive(&mut self, key: impl std::fmt::Display, q: &Option<Quantity>, what: &str) {
        if let Some(q) = q {
            self.positive(key, q, what);
        }
    }
    fn opt_not_negative(&mut self, key: impl std::fmt::Display, q: &Option<Quantity>, what: &str) {
        if let Some(q) = q
            && !(q.value >= 0.0 && q.value.is_finite())
        {
            self.push(
                key.to_string(),
                q.shown(),
                format!("expected an {what} of zero or more"),
            );
        }
    }
    fn range(
        &mut self,
        key: impl std::fmt::Display,
        value: Option<f64>,
        min: f64,
        max: f64,
        expected: &str,
    ) {
        if let Some(x) = value
            && !(min..=max).contains(&x)
        {
            self.push(
                key.to_string(),
                x.to_string(),
                format!("expected {expected}"),
            );
        }
    }
    fn range_open(
        &mut self,
        key: impl std::fmt::Display,
        value: f64,
        min: f64,
        below: f64,
        expected: &str,
    ) {
        if !(value >= min && value < below) {
            self.push(
                key.to_string(),
                value.to_string(),
                format!("expected {expected}"),
            );
        }
    }
    fn efficiency(&mut self, key: impl std::fmt::Display, value: f64) {
        if !(value > 0.5 && value <= 1.0) {
            self.push(
                key.to_string(),
                value.to_string(),
                "expected an efficiency above 0.5 and at most 1 (0.97 = 97 %)",
            );
        }
    }
}
