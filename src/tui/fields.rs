//! The fields of the three panes and how each reads the boat document: its label,
//! its [`Kind`], its nudge step, its file key (to match the profile's validation issues), and
//! where its *estimated* and *warning* markers come from.

use crate::profile::{
    BoatDoc, EngineDoc, InteractionDoc, Quantity, ResistanceMethodDoc, VariantDoc,
};
use crate::propulsion::solver::Vessel;
use crate::propulsion::water::WaterKind;
use crate::units::{self, Kind, UnitSystem};

/// One of the three editing panes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Pane {
    /// Hull, resistance method, margins, water, windage.
    Vessel,
    /// Engine sheet, gear, shaft line, fuel.
    Powerplant,
    /// The screw variants.
    Screw,
}

impl Pane {
    /// The panes left to right.
    pub const ALL: [Pane; 3] = [Pane::Vessel, Pane::Powerplant, Pane::Screw];

    /// Position in [`Pane::ALL`].
    pub fn index(self) -> usize {
        match self {
            Pane::Vessel => 0,
            Pane::Powerplant => 1,
            Pane::Screw => 2,
        }
    }

    /// The pane to the right (wrapping).
    pub fn next(self) -> Self {
        Self::ALL[(self.index() + 1) % 3]
    }

    /// The pane to the left (wrapping).
    pub fn prev(self) -> Self {
        Self::ALL[(self.index() + 2) % 3]
    }

    /// The pane's title.
    pub fn title(self) -> &'static str {
        match self {
            Pane::Vessel => "Vessel",
            Pane::Powerplant => "Powerplant",
            Pane::Screw => "Screw",
        }
    }
}

/// Every editable or shown field.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FieldId {
    /// Load condition solved for (light / half / full).
    LoadCondition,
    /// Displacement of the load condition, kg.
    Displacement,
    /// Waterline length, m.
    LengthWaterline,
    /// Waterline beam, m.
    BeamWaterline,
    /// Draft aft, m.
    DraftAft,
    /// Draft forward, m.
    DraftForward,
    /// Bare-hull wetted surface, m² (estimated when not given).
    WettedSurface,
    /// Half angle of entrance, degrees (estimated when not given).
    HalfEntranceAngle,
    /// Immersed transom area, m² (estimated when not given).
    TransomArea,
    /// Resistance method (Holtrop–Mennen or the boat's table).
    ResistanceMethod,
    /// Service margin, fraction.
    ServiceMargin,
    /// Hull fouling as added friction, fraction.
    Fouling,
    /// Wake and thrust-deduction estimate.
    Interaction,
    /// Sea or fresh water.
    Water,
    /// Water temperature, °C.
    WaterTemperature,
    /// Frontal area above water, m².
    WindageArea,
    /// Headwind, m/s.
    Headwind,
    /// The engine sheet's name.
    EngineSheet,
    /// Rated rpm of the engine sheet.
    RatedRpm,
    /// Rated power of the engine sheet, W.
    RatedPower,
    /// Shafts fitted, 1 or 2 (each with its own engine of the sheet, gear and screw).
    Shafts,
    /// Reduction gear ratio.
    GearRatio,
    /// Shaft line efficiency, fraction.
    ShaftEfficiency,
    /// Gear efficiency, fraction.
    GearEfficiency,
    /// Fuel tank, m³.
    Tank,
    /// Usable part of the tank, fraction.
    UsableFraction,
    /// Reserve kept back, fraction.
    Reserve,
    /// Fuel density of the engine sheet, kg/m³.
    FuelDensity,
    /// The active variant's label.
    VariantLabel,
    /// Blade count.
    Blades,
    /// Screw diameter, m.
    Diameter,
    /// Face pitch, m.
    Pitch,
    /// Expanded area ratio AE/A0.
    AreaRatio,
    /// Pitch ratio P/D (shown, follows from pitch and diameter).
    PitchRatio,
}

/// A field's current value, by what sort of value it is.
#[derive(Debug, Clone, PartialEq)]
pub enum FieldValue {
    /// A quantity with a unit, in the kind's internal unit.
    Number {
        /// The value, internal unit of `kind`.
        value: f64,
        /// Its kind.
        kind: FieldKind,
    },
    /// One of a few choices; Enter moves to the next.
    Choice(String),
    /// The engine sheet, chosen from the store.
    Engine(String),
    /// Free text.
    Text(String),
    /// Shown but not edited here, with the reason.
    ReadOnly(String),
}

/// How a numeric field is written.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FieldKind {
    /// A quantity with a unit.
    Unit(Kind),
    /// A plain number shown with this many decimals.
    Plain(usize),
    /// A whole number.
    Count,
}

/// The fields of `pane`, in display order.
pub fn fields_of(pane: Pane, boat: &BoatDoc) -> Vec<FieldId> {
    use FieldId as F;
    match pane {
        Pane::Vessel => {
            let mut list = vec![
                F::LoadCondition,
                F::Displacement,
                F::LengthWaterline,
                F::BeamWaterline,
                F::DraftAft,
                F::DraftForward,
                F::WettedSurface,
                F::HalfEntranceAngle,
                F::TransomArea,
                F::ResistanceMethod,
                F::ServiceMargin,
                F::Fouling,
                F::Interaction,
                F::Water,
                F::WaterTemperature,
            ];
            if boat.windage.is_some() {
                list.extend([F::WindageArea, F::Headwind]);
            }
            list
        }
        Pane::Powerplant => vec![
            F::EngineSheet,
            F::RatedRpm,
            F::RatedPower,
            F::Shafts,
            F::GearRatio,
            F::ShaftEfficiency,
            F::GearEfficiency,
            F::Tank,
            F::UsableFraction,
            F::Reserve,
            F::FuelDensity,
        ],
        Pane::Screw => vec![
            F::VariantLabel,
            F::Blades,
            F::Diameter,
            F::Pitch,
            F::AreaRatio,
            F::PitchRatio,
        ],
    }
}

/// The field's label.
pub fn label(field: FieldId) -> &'static str {
    use FieldId as F;
    match field {
        F::LoadCondition => "Load condition",
        F::Displacement => "Displacement",
        F::LengthWaterline => "Waterline length",
        F::BeamWaterline => "Waterline beam",
        F::DraftAft => "Draft aft",
        F::DraftForward => "Draft forward",
        F::WettedSurface => "Wetted surface",
        F::HalfEntranceAngle => "Entrance ½-angle",
        F::TransomArea => "Transom area",
        F::ResistanceMethod => "Resistance",
        F::ServiceMargin => "Service margin",
        F::Fouling => "Fouling",
        F::Interaction => "Wake estimate",
        F::Water => "Water",
        F::WaterTemperature => "Water temp.",
        F::WindageArea => "Windage area",
        F::Headwind => "Headwind",
        F::EngineSheet => "Engine sheet",
        F::RatedRpm => "Rated rpm",
        F::RatedPower => "Rated power",
        F::Shafts => "Shafts",
        F::GearRatio => "Gear ratio",
        F::ShaftEfficiency => "Shaft eff.",
        F::GearEfficiency => "Gear eff.",
        F::Tank => "Fuel tank",
        F::UsableFraction => "Usable fuel",
        F::Reserve => "Reserve",
        F::FuelDensity => "Fuel density",
        F::VariantLabel => "Label",
        F::Blades => "Blades",
        F::Diameter => "Diameter",
        F::Pitch => "Pitch",
        F::AreaRatio => "Area ratio AE/A0",
        F::PitchRatio => "Pitch ratio P/D",
    }
}

/// What the field is, shown when it is selected.
pub fn about(field: FieldId) -> &'static str {
    use FieldId as F;
    match field {
        F::LoadCondition => "which loading is solved; Enter: next condition the boat file gives",
        F::Displacement => "displacement mass in the load condition solved",
        F::LengthWaterline | F::BeamWaterline => "at the waterline of the load condition",
        F::DraftAft | F::DraftForward => "canoe-body draft, without keel or skeg",
        F::WettedSurface | F::HalfEntranceAngle | F::TransomArea => {
            "type a value to replace the estimate"
        }
        F::ResistanceMethod => "a resistance table is edited in the boat's file",
        F::ServiceMargin => "added to total resistance for sea state and fouling",
        F::Fouling => "added to frictional resistance",
        F::Interaction => "how wake fraction and thrust deduction are found; Enter: next method",
        F::Water => "Enter: sea / fresh",
        F::WaterTemperature => "sets density and viscosity (ITTC 7.5-02-01-03)",
        F::WindageArea => "frontal area above water, for air drag",
        F::Headwind => "wind against the boat, for air drag",
        F::EngineSheet => "Enter or e: choose an engine sheet from the store",
        F::RatedRpm | F::RatedPower | F::FuelDensity => "from the engine sheet",
        F::Shafts => "1 or 2; two: one engine, gear and screw each, handed",
        F::GearRatio => "engine rpm / screw rpm",
        F::ShaftEfficiency => "bearings and seals of the shaft line",
        F::GearEfficiency => "reduction gear",
        F::Tank => "total fuel tank volume",
        F::UsableFraction => "part of the tank the pickup can draw",
        F::Reserve => "kept back from the range",
        F::VariantLabel => "the variant's name; [ ] choose, a add, d duplicate, x remove",
        F::Blades => "blade count Z",
        F::Diameter => "screw diameter D",
        F::Pitch => "face pitch P",
        F::AreaRatio => "expanded blade area ratio",
        F::PitchRatio => "follows from pitch and diameter",
    }
}

/// The key of the field in the boat file, to match the profile's validation issues.
pub fn file_key(field: FieldId, boat: &BoatDoc) -> String {
    use FieldId as F;
    let variant = format!("variant[{}]", boat.active_variant + 1);
    match field {
        F::LoadCondition => "load.default".into(),
        F::Displacement => format!("load.{}.displacement", boat.load.default),
        F::LengthWaterline => "hull.length_waterline".into(),
        F::BeamWaterline => "hull.beam_waterline".into(),
        F::DraftAft => "hull.draft_aft".into(),
        F::DraftForward => "hull.draft_forward".into(),
        F::WettedSurface => "hull.wetted_surface".into(),
        F::HalfEntranceAngle => "hull.half_entrance_angle".into(),
        F::TransomArea => "hull.transom_area".into(),
        F::ResistanceMethod => "resistance.method".into(),
        F::ServiceMargin => "resistance.service_margin".into(),
        F::Fouling => "resistance.fouling".into(),
        F::Interaction => "interaction".into(),
        F::Water => "water.kind".into(),
        F::WaterTemperature => "water.temperature".into(),
        F::WindageArea => "windage.frontal_area".into(),
        F::Headwind => "windage.headwind".into(),
        F::EngineSheet => "engine".into(),
        F::RatedRpm | F::RatedPower | F::FuelDensity => "engine sheet".into(),
        F::Shafts => "installation.shafts".into(),
        F::GearRatio => "installation.gear_ratio".into(),
        F::ShaftEfficiency => "installation.shaft_efficiency".into(),
        F::GearEfficiency => "installation.gear_efficiency".into(),
        F::Tank => "trip.tank".into(),
        F::UsableFraction => "trip.usable_fraction".into(),
        F::Reserve => "trip.reserve".into(),
        F::VariantLabel => format!("{variant}.label"),
        F::Blades => format!("{variant}.blades"),
        F::Diameter => format!("{variant}.diameter"),
        F::Pitch => format!("{variant}.pitch"),
        F::AreaRatio => format!("{variant}.area_ratio"),
        F::PitchRatio => format!("{variant}.pitch_ratio"),
    }
}

/// The active screw variant of `boat`, if it has one.
pub fn active_doc(boat: &BoatDoc) -> Option<&VariantDoc> {
    boat.variants.get(boat.active_variant)
}

/// The vessel the document builds (for the default load condition), or why it does not.
pub fn build_vessel(boat: &BoatDoc, engine: &EngineDoc) -> Result<Vessel, String> {
    boat.to_default_vessel(engine).map_err(|e| e.to_string())
}

/// The value of `field` in `doc`.
pub fn value(field: FieldId, boat: &BoatDoc) -> FieldValue {
    use FieldId as F;
    let num = |value: f64, kind: Kind| FieldValue::Number {
        value,
        kind: FieldKind::Unit(kind),
    };
    let plain = |value: f64, decimals: usize| FieldValue::Number {
        value,
        kind: FieldKind::Plain(decimals),
    };
    let opt = |q: &Option<Quantity>, kind: Kind| match q {
        Some(q) => num(q.value, kind),
        None => FieldValue::ReadOnly("estimated".into()),
    };
    match field {
        F::LoadCondition => FieldValue::Choice(boat.load.default.name().into()),
        F::Displacement => match boat.load.case(boat.load.default) {
            Some(case) => num(case.displacement.value, Kind::Mass),
            None => FieldValue::ReadOnly("missing".into()),
        },
        F::LengthWaterline => num(boat.hull.length_waterline.value, Kind::Length),
        F::BeamWaterline => num(boat.hull.beam_waterline.value, Kind::Length),
        F::DraftAft => num(boat.hull.draft_aft.value, Kind::Length),
        F::DraftForward => num(boat.hull.draft_forward.value, Kind::Length),
        F::WettedSurface => opt(&boat.hull.wetted_surface, Kind::Area),
        F::HalfEntranceAngle => opt(&boat.hull.half_entrance_angle, Kind::Angle),
        F::TransomArea => opt(&boat.hull.transom_area, Kind::Area),
        F::ResistanceMethod => FieldValue::ReadOnly(match &boat.resistance.method {
            // Shown as the method the core chose (see `derived_text`).
            ResistanceMethodDoc::Auto => String::new(),
            ResistanceMethodDoc::HoltropMennen => "Holtrop–Mennen".into(),
            ResistanceMethodDoc::VanOortmerssen => "van Oortmerssen".into(),
            ResistanceMethodDoc::Table(rows) => format!("table, {} rows", rows.len()),
        }),
        F::ServiceMargin => num(boat.resistance.service_margin, Kind::Fraction),
        F::Fouling => num(boat.resistance.fouling, Kind::Fraction),
        F::Interaction => FieldValue::Choice(
            match boat.interaction {
                InteractionDoc::Auto => "auto (with the resistance method)",
                InteractionDoc::VanOortmerssen => "van Oortmerssen",
                InteractionDoc::Holtrop1984 => "Holtrop 1984",
                InteractionDoc::Taylor => "Taylor",
                InteractionDoc::User { .. } => "user values",
            }
            .into(),
        ),
        F::Water => FieldValue::Choice(
            match boat.water.kind {
                WaterKind::Sea => "sea",
                WaterKind::Fresh => "fresh",
            }
            .into(),
        ),
        F::WaterTemperature => num(boat.water.temperature.value, Kind::Temperature),
        F::WindageArea => match &boat.windage {
            Some(w) => num(w.frontal_area.value, Kind::Area),
            None => FieldValue::ReadOnly("none".into()),
        },
        F::Headwind => match boat.windage.as_ref().and_then(|w| w.headwind.as_ref()) {
            Some(h) => num(h.value, Kind::Speed),
            None => num(0.0, Kind::Speed),
        },
        F::EngineSheet => FieldValue::Engine(boat.engine.clone()),
        F::RatedRpm | F::RatedPower | F::FuelDensity | F::PitchRatio => {
            FieldValue::ReadOnly(String::new())
        }
        F::Shafts => FieldValue::Number {
            value: f64::from(boat.installation.shafts),
            kind: FieldKind::Count,
        },
        F::GearRatio => plain(boat.installation.gear_ratio, 2),
        F::ShaftEfficiency => num(boat.installation.shaft_efficiency, Kind::Fraction),
        F::GearEfficiency => num(boat.installation.gear_efficiency, Kind::Fraction),
        F::Tank => num(boat.trip.tank.value, Kind::Volume),
        F::UsableFraction => num(boat.trip.usable_fraction, Kind::Fraction),
        F::Reserve => num(boat.trip.reserve, Kind::Fraction),
        F::VariantLabel => FieldValue::Text(
            active_doc(boat)
                .map(|v| v.label.clone())
                .unwrap_or_default(),
        ),
        F::Blades => match active_doc(boat) {
            Some(v) => FieldValue::Number {
                value: f64::from(v.blades),
                kind: FieldKind::Count,
            },
            None => FieldValue::ReadOnly("no variant".into()),
        },
        F::Diameter => match active_doc(boat) {
            Some(v) => num(v.diameter.value, Kind::ScrewLength),
            None => FieldValue::ReadOnly("no variant".into()),
        },
        F::Pitch => match active_doc(boat) {
            Some(v) => num(v.pitch.value, Kind::ScrewLength),
            None => FieldValue::ReadOnly("no variant".into()),
        },
        F::AreaRatio => match active_doc(boat) {
            Some(v) => plain(v.area_ratio, 2),
            None => FieldValue::ReadOnly("no variant".into()),
        },
    }
}

/// `value` written for typing or showing in `system`.
pub fn format_number(value: f64, kind: FieldKind, system: UnitSystem) -> String {
    match kind {
        FieldKind::Unit(k) => units::format(value, k, system),
        FieldKind::Plain(decimals) => format!("{value:.decimals$}"),
        FieldKind::Count => format!("{value:.0}"),
    }
}

/// The nudge step of `field` in display units of `system`.
pub fn nudge_step(field: FieldId, kind: FieldKind, system: UnitSystem) -> f64 {
    let metric = system == UnitSystem::Metric;
    match (field, kind) {
        // Re-pitching is done in tenths of an inch or a couple of millimetres (common practice).
        (FieldId::Pitch, _) => {
            if metric {
                2.0
            } else {
                0.1
            }
        }
        (FieldId::Diameter, _) => {
            if metric {
                10.0
            } else {
                0.5
            }
        }
        (FieldId::GearRatio, _) => 0.01,
        (FieldId::AreaRatio, _) => 0.01,
        (FieldId::ShaftEfficiency | FieldId::GearEfficiency, _) => 0.5,
        (_, FieldKind::Count) => 1.0,
        (_, FieldKind::Plain(decimals)) => 10f64.powi(-(decimals as i32)),
        (_, FieldKind::Unit(k)) => units::nudge_step(k, system),
    }
}

/// How a numeric field is typed; `None` for fields that are not numbers.
pub fn kind_of(field: FieldId) -> Option<FieldKind> {
    use FieldId as F;
    Some(match field {
        F::Displacement => FieldKind::Unit(Kind::Mass),
        F::LengthWaterline | F::BeamWaterline | F::DraftAft | F::DraftForward => {
            FieldKind::Unit(Kind::Length)
        }
        F::WettedSurface | F::TransomArea | F::WindageArea => FieldKind::Unit(Kind::Area),
        F::HalfEntranceAngle => FieldKind::Unit(Kind::Angle),
        F::ServiceMargin
        | F::Fouling
        | F::ShaftEfficiency
        | F::GearEfficiency
        | F::UsableFraction
        | F::Reserve => FieldKind::Unit(Kind::Fraction),
        F::WaterTemperature => FieldKind::Unit(Kind::Temperature),
        F::Headwind => FieldKind::Unit(Kind::Speed),
        F::Tank => FieldKind::Unit(Kind::Volume),
        F::Diameter | F::Pitch => FieldKind::Unit(Kind::ScrewLength),
        F::GearRatio | F::AreaRatio => FieldKind::Plain(2),
        F::Blades | F::Shafts => FieldKind::Count,
        _ => return None,
    })
}
