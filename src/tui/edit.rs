//! Editing of the boat document, without the app: set a field from typed text, nudge it by a
//! step, move a choice on, add, duplicate and remove screw variants, set the target speed.
//!
//! Each function changes the [`BoatDoc`] it is given and says why when the change is refused;
//! [`super::app::App::update`] calls them on a copy and commits the copy when they succeed.

use super::fields::{
    FieldId, FieldKind, FieldValue, active_doc, file_key, kind_of, label, nudge_step, value,
};
use crate::profile::{BoatDoc, InteractionDoc, LoadCase, LoadCondition, Quantity, VariantDoc};
use crate::propulsion::water::WaterKind;
use crate::units::{self, Kind, UnitSystem};

fn active_doc_mut(boat: &mut BoatDoc) -> Option<&mut VariantDoc> {
    let index = boat.active_variant;
    boat.variants.get_mut(index)
}

fn load_case_mut(boat: &mut BoatDoc) -> Option<&mut LoadCase> {
    match boat.load.default {
        LoadCondition::Light => boat.load.light.as_mut(),
        LoadCondition::Half => boat.load.half.as_mut(),
        LoadCondition::Full => boat.load.full.as_mut(),
    }
}

fn set_quantity(target: &mut Quantity, typed: &Quantity) {
    *target = typed.clone();
}

/// Writes `typed` (internal unit; kept as typed for the file) into `field` of `boat`.
fn set_number(field: FieldId, boat: &mut BoatDoc, typed: Quantity) -> Result<(), String> {
    use FieldId as F;
    let value = typed.value;
    let not_here = || Err(format!("{} is not edited here", label(field)));
    match field {
        F::Displacement => match load_case_mut(boat) {
            Some(case) => set_quantity(&mut case.displacement, &typed),
            None => {
                return Err("the boat file gives no displacement for this load condition".into());
            }
        },
        F::LengthWaterline => set_quantity(&mut boat.hull.length_waterline, &typed),
        F::BeamWaterline => set_quantity(&mut boat.hull.beam_waterline, &typed),
        F::DraftAft => set_quantity(&mut boat.hull.draft_aft, &typed),
        F::DraftForward => set_quantity(&mut boat.hull.draft_forward, &typed),
        F::WettedSurface => boat.hull.wetted_surface = Some(typed.clone()),
        F::HalfEntranceAngle => boat.hull.half_entrance_angle = Some(typed.clone()),
        F::TransomArea => boat.hull.transom_area = Some(typed.clone()),
        F::ServiceMargin => boat.resistance.service_margin = value,
        F::Fouling => boat.resistance.fouling = value,
        F::WaterTemperature => set_quantity(&mut boat.water.temperature, &typed),
        F::WindageArea => match &mut boat.windage {
            Some(w) => set_quantity(&mut w.frontal_area, &typed),
            None => return not_here(),
        },
        F::Headwind => match &mut boat.windage {
            Some(w) => w.headwind = Some(typed.clone()),
            None => return not_here(),
        },
        F::Shafts => {
            // Only 1 and 2 are meaningful; a nudge past either end stays put with the reason.
            if value == 1.0 || value == 2.0 {
                boat.installation.shafts = value as u32;
            } else {
                return Err("expected 1 or 2 shafts".into());
            }
        }
        F::GearRatio => boat.installation.gear_ratio = value,
        F::ShaftEfficiency => boat.installation.shaft_efficiency = value,
        F::GearEfficiency => boat.installation.gear_efficiency = value,
        F::Tank => set_quantity(&mut boat.trip.tank, &typed),
        F::UsableFraction => boat.trip.usable_fraction = value,
        F::Reserve => boat.trip.reserve = value,
        F::Blades | F::Diameter | F::Pitch | F::AreaRatio => {
            let Some(v) = active_doc_mut(boat) else {
                return not_here();
            };
            match field {
                F::Blades => {
                    if !(value >= 0.0 && value <= f64::from(u32::MAX) && value.fract() == 0.0) {
                        return Err("expected a whole number of blades".into());
                    }
                    v.blades = value as u32;
                }
                F::Diameter => set_quantity(&mut v.diameter, &typed),
                F::Pitch => set_quantity(&mut v.pitch, &typed),
                _ => v.area_ratio = value,
            }
        }
        _ => return not_here(),
    }
    Ok(())
}

/// The first validation problem of `boat` at the field's file key, if any.
fn problem_at(field: FieldId, boat: &BoatDoc) -> Option<String> {
    let key = file_key(field, boat);
    boat.validate()
        .into_iter()
        .find(|issue| issue.key == key)
        .map(|issue| issue.problem)
}

/// Parses `text` for `field` and writes it into `boat`; the reason when it is not valid.
pub fn set_from_text(field: FieldId, boat: &mut BoatDoc, text: &str) -> Result<(), String> {
    let doc_value = {
        let kind = kind_of(field);
        match kind {
            // Kept as typed, so the file shows "19 in" rather than a converted number.
            Some(FieldKind::Unit(kind)) => {
                Some(Quantity::from_text(text, kind).map_err(|e| e.to_string())?)
            }
            // A gear ratio is read as the trade writes it: "2.5", "2.5:1" or "2.5 : 1".
            Some(FieldKind::Plain(_)) if field == FieldId::GearRatio => Some(Quantity::new(
                crate::units::parse_ratio(text).map_err(|e| e.to_string())?,
            )),
            Some(FieldKind::Plain(_)) | Some(FieldKind::Count) => Some(Quantity::new(
                text.trim()
                    .parse::<f64>()
                    .ok()
                    .filter(|v| v.is_finite())
                    .ok_or_else(|| {
                        format!("expected a plain number such as 2.5, got {:?}", text.trim())
                    })?,
            )),
            None => None,
        }
    };
    match (field, doc_value) {
        (_, Some(v)) => set_number(field, boat, v)?,
        (FieldId::VariantLabel, None) => {
            let label = text.trim();
            if label.is_empty() {
                return Err("expected a label for the variant".into());
            }
            if let Some(v) = active_doc_mut(boat) {
                v.label = label.to_string();
            }
        }
        _ => return Err(format!("{} is not typed in", label(field))),
    }
    match problem_at(field, boat) {
        Some(problem) => Err(problem),
        None => Ok(()),
    }
}

/// The numeric value of `field` in `boat`, internal unit, if it has one.
fn number_of(field: FieldId, boat: &BoatDoc) -> Option<f64> {
    match value(field, boat) {
        FieldValue::Number { value, .. } => Some(value),
        _ => None,
    }
}

/// `value` rounded to 9 significant decimals of its magnitude, removing binary round-off.
fn clean(value: f64) -> f64 {
    if value == 0.0 || !value.is_finite() {
        return value;
    }
    let scale = 10f64.powi(9 - value.abs().log10().ceil() as i32);
    (value * scale).round() / scale
}

/// Nudges `field` by `direction` steps in display units of `system`.
pub fn nudge(
    field: FieldId,
    boat: &mut BoatDoc,
    direction: f64,
    system: UnitSystem,
) -> Result<(), String> {
    let Some(kind) = kind_of(field) else {
        return Err(format!("{} has no step to nudge by", label(field)));
    };
    let current = match field {
        FieldId::WettedSurface | FieldId::HalfEntranceAngle | FieldId::TransomArea => {
            return Err("type a value first: an estimate has no step".into());
        }
        _ => number_of(field, boat).ok_or_else(|| format!("{} has no value", label(field)))?,
    };
    let step = nudge_step(field, kind, system);
    let next = match kind {
        FieldKind::Unit(k) => {
            // Rounding off the last bits keeps 14.0 in + 0.1 in from showing as 14.099999 in.
            let shown = clean(units::to_display(current, k, system) + direction * step);
            units::from_display(shown, k, system)
        }
        _ => clean(current + direction * step),
    };
    set_number(field, boat, Quantity::new(next))?;
    match problem_at(field, boat) {
        Some(problem) => Err(problem),
        None => Ok(()),
    }
}

/// Moves `field` to its next choice in `boat`.
pub fn next_choice(field: FieldId, boat: &mut BoatDoc) -> Result<(), String> {
    match field {
        FieldId::LoadCondition => {
            let given: Vec<LoadCondition> = LoadCondition::ALL
                .into_iter()
                .filter(|c| boat.load.case(*c).is_some())
                .collect();
            let at = given
                .iter()
                .position(|c| *c == boat.load.default)
                .unwrap_or(0);
            match given.get((at + 1) % given.len().max(1)) {
                Some(next) => boat.load.default = *next,
                None => return Err("the boat file gives no load conditions".into()),
            }
        }
        FieldId::Interaction => {
            boat.interaction = match boat.interaction {
                InteractionDoc::Auto => InteractionDoc::Holtrop1984,
                InteractionDoc::Holtrop1984 => InteractionDoc::Taylor,
                InteractionDoc::Taylor => InteractionDoc::VanOortmerssen,
                _ => InteractionDoc::Auto,
            }
        }
        FieldId::Water => {
            boat.water.kind = match boat.water.kind {
                WaterKind::Sea => WaterKind::Fresh,
                WaterKind::Fresh => WaterKind::Sea,
            }
        }
        _ => return Err(format!("{} has no choices", label(field))),
    }
    Ok(())
}

/// The target speed of the trip, m/s.
pub fn target_speed(boat: &BoatDoc) -> f64 {
    boat.trip.target_speed.value
}

/// Parses a typed target speed, m/s.
pub fn parse_target_speed(text: &str) -> Result<f64, String> {
    let speed = units::parse(text, Kind::Speed).map_err(|e| e.to_string())?;
    if speed > 0.0 {
        Ok(speed)
    } else {
        Err("expected a target speed above zero".into())
    }
}

/// Sets the trip's target speed, m/s.
pub fn set_target_speed(boat: &mut BoatDoc, speed: f64) {
    boat.trip.target_speed = Quantity::new(speed);
}

/// Number of screw variants.
pub fn variant_count(boat: &BoatDoc) -> usize {
    boat.variants.len()
}

/// Index of the active variant.
pub fn active_variant(boat: &BoatDoc) -> usize {
    boat.active_variant
}

/// Makes variant `index` the active one.
pub fn set_active_variant(boat: &mut BoatDoc, index: usize) {
    if index < boat.variants.len() {
        boat.active_variant = index;
    }
}

/// A label not yet used by a variant, starting from `base`.
fn unused_label(boat: &BoatDoc, base: &str) -> String {
    let taken = |label: &str| boat.variants.iter().any(|v| v.label == label);
    if !taken(base) {
        return base.to_string();
    }
    (2..)
        .map(|n| format!("{base} {n}"))
        .find(|l| !taken(l))
        .unwrap_or_else(|| base.to_string())
}

/// Adds a copy of the active variant (named "new" when `fresh`, else "… copy") and makes it
/// active; returns its label.
pub fn duplicate_active_variant(boat: &mut BoatDoc, fresh: bool) -> String {
    let Some(source) = active_doc(boat).cloned() else {
        return String::new();
    };
    let base = if fresh {
        "new".to_string()
    } else {
        format!("{} copy", source.label)
    };
    let label = unused_label(boat, &base);
    boat.variants.push(VariantDoc {
        label: label.clone(),
        ..source
    });
    boat.active_variant = boat.variants.len() - 1;
    label
}

/// Removes the active variant unless it is the only one; returns its label.
pub fn remove_active_variant(boat: &mut BoatDoc) -> Result<String, String> {
    if boat.variants.len() <= 1 {
        return Err("the last screw variant cannot be removed".into());
    }
    let removed = boat.variants.remove(boat.active_variant);
    boat.active_variant = boat.active_variant.min(boat.variants.len() - 1);
    Ok(removed.label)
}

/// Adds a copy of the active variant with `pitch` (m) and makes it active; returns its label.
pub fn add_variant_with_pitch(boat: &mut BoatDoc, pitch: f64, system: UnitSystem) -> String {
    let Some(source) = active_doc(boat).cloned() else {
        return String::new();
    };
    let base = format!("pitch {}", units::format(pitch, Kind::ScrewLength, system));
    let label = unused_label(boat, &base);
    boat.variants.push(VariantDoc {
        label: label.clone(),
        pitch: Quantity::new(pitch),
        ..source
    });
    boat.active_variant = boat.variants.len() - 1;
    label
}

/// A gear ratio as a label writes it: "2.5:1", "2.47:1", "2.0:1".
pub fn gear_label(gear_ratio: f64) -> String {
    let text = format!("{gear_ratio:.2}");
    let text = text.trim_end_matches('0');
    let text = if text.ends_with('.') {
        format!("{text}0")
    } else {
        text.to_string()
    };
    format!("{text}:1")
}

/// Points the boat at engine sheet `engine` with `gear_ratio` and adds `screw` as a new active
/// variant labelled "shortlist ENGINE G:1"; returns its label.
pub fn add_shortlist_variant(
    boat: &mut BoatDoc,
    engine: &str,
    gear_ratio: f64,
    screw: VariantDoc,
) -> String {
    let base = format!("shortlist {engine} {}", gear_label(gear_ratio));
    let label = unused_label(boat, &base);
    set_engine_name(boat, engine);
    boat.installation.gear_ratio = gear_ratio;
    boat.variants.push(VariantDoc {
        label: label.clone(),
        ..screw
    });
    boat.active_variant = boat.variants.len() - 1;
    label
}

/// Points the boat at the engine sheet `name`.
pub fn set_engine_name(boat: &mut BoatDoc, name: &str) {
    boat.engine = name.to_string();
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::profile::Store;

    fn demo_boat(name: &str) -> BoatDoc {
        let store = Store::at(std::env::temp_dir().join("tidewright-edit-tests-no-store"));
        crate::tui::open_app(&store, Some(name))
            .expect("demo boat opens")
            .doc
            .boat
    }

    #[test]
    fn a_gear_ratio_is_taken_as_the_trade_writes_it() {
        let mut boat = demo_boat("marram");
        for (typed, want) in [("2.5:1", 2.5), ("3 : 1", 3.0), ("2.25", 2.25), ("5:2", 2.5)] {
            set_from_text(FieldId::GearRatio, &mut boat, typed).unwrap();
            assert_eq!(boat.installation.gear_ratio, want, "{typed}");
        }
        // An inverted ratio (screw faster than the engine) and a decimal comma are refused.
        assert!(set_from_text(FieldId::GearRatio, &mut boat, "1:2.5").is_err());
        let comma = set_from_text(FieldId::GearRatio, &mut boat, "2,5:1").unwrap_err();
        assert!(comma.contains("decimal point"), "{comma}");
    }

    #[test]
    fn pitch_nudged_in_tenths_of_an_inch_lands_on_the_tenth() {
        let mut boat = demo_boat("marram");
        set_from_text(FieldId::Pitch, &mut boat, "14 in").unwrap();
        nudge(FieldId::Pitch, &mut boat, 1.0, UnitSystem::Imperial).unwrap();
        // 1 in = 25.4 mm exactly (international yard and pound, 1959); a 0.1 in step is
        // common practice for re-pitching.
        let pitch = active_doc(&boat).unwrap().pitch.value;
        assert!((pitch - 14.1 * 0.0254).abs() < 1e-12, "pitch {pitch} m");
        assert_eq!(
            units::format(pitch, Kind::ScrewLength, UnitSystem::Imperial),
            "14.1 in"
        );
    }

    #[test]
    fn variants_get_unused_labels_and_the_last_one_stays() {
        let mut boat = demo_boat("marram");
        let first = duplicate_active_variant(&mut boat, true);
        let second = duplicate_active_variant(&mut boat, true);
        assert_eq!((first.as_str(), second.as_str()), ("new", "new 2"));
        assert_eq!(active_variant(&boat), variant_count(&boat) - 1);
        while variant_count(&boat) > 1 {
            remove_active_variant(&mut boat).unwrap();
        }
        assert_eq!(
            remove_active_variant(&mut boat),
            Err("the last screw variant cannot be removed".into())
        );
    }

    #[test]
    fn a_typed_value_the_profile_refuses_is_not_accepted() {
        let mut boat = demo_boat("marram");
        let before = boat.clone();
        assert!(set_from_text(FieldId::Diameter, &mut boat, "banana").is_err());
        assert!(parse_target_speed("0 kn").is_err());
        next_choice(FieldId::Water, &mut boat).unwrap();
        next_choice(FieldId::Water, &mut boat).unwrap();
        assert_eq!(boat.water.kind, before.water.kind);
        assert!(next_choice(FieldId::Pitch, &mut boat).is_err());
    }
}
