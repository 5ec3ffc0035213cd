//! The study: one loaded boat made ready to solve, and the questions both front ends ask of it.
//!
//! A [`Study`] is built once from a boat document and its engine sheet — from the profile store
//! ([`Study::load`], the CLI) or from documents in memory ([`Study::from_documents`], the TUI) —
//! and holds the resolved vessel with every input the checks need. Each question (solve every
//! variant, the checks, the what-if conditions and the uncertainty band, sweeps, pitch
//! recommendations, the sea-trial fit) is defined once here; `report`, `cli` and `tui` call it
//! and only lay the answers out. Dependency order: `units`, `propulsion` → `profile` → `study`
//! → `report` → `cli`, `tui`. All values are SI.

pub mod baseline;
pub mod checks;
pub mod design;
pub mod import;
pub mod order;
pub mod power_speed;
pub mod progress;
pub mod resistance;
pub mod shortlist;
pub mod solve;
pub mod ties;
pub mod what_if;

use anyhow::Context as _;
use serde::Serialize;

use crate::profile::{BoatDoc, EngineDoc, Origin, Store};
use crate::propulsion::solver::Vessel;
use crate::units::{Kind, UnitSystem};

/// The caution shown wherever a pitch, a match verdict or an engine load is given.
pub const CAUTION: &str = "These figures are estimates from published methods and the inputs given. \
The engine maker's installation limits, local codes and a licensed marine surveyor or naval \
architect decide the final engine, gear and screw.";

/// The words every note written by a trial fit carries since the fit works on calm-water
/// resistance; a saved note without them comes from the older fit with the margins inside.
pub const CALM_WATER_NOTE: &str = "on calm-water resistance";

/// What the checks and the diameter sweep need from the boat file beyond the vessel (SI).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct CheckInputs {
    /// Depth of the shaft centreline below the waterline, m (`installation.shaft_immersion`;
    /// on a twin the shallower of it and `installation.port_shaft_immersion`, since the
    /// shallower screw cavitates first).
    pub shaft_immersion: Option<f64>,
    /// The existing shaft's diameter, m (`installation.shaft_diameter`).
    pub shaft_diameter: Option<f64>,
    /// The shaft material's name as written in the file (`installation.shaft_material`).
    pub shaft_material: Option<String>,
    /// The largest screw diameter the aperture takes, m (`installation.max_screw_diameter`).
    pub max_screw_diameter: Option<f64>,
    /// Tip clearance to keep inside the aperture, m (`installation.tip_clearance`).
    pub tip_clearance: Option<f64>,
}

impl CheckInputs {
    /// The installation values of `doc`.
    pub fn of(doc: &BoatDoc) -> Self {
        let inst = &doc.installation;
        let value = |q: &Option<crate::profile::Quantity>| q.as_ref().map(|q| q.value);
        Self {
            shaft_immersion: match (
                value(&inst.shaft_immersion),
                value(&inst.port_shaft_immersion),
            ) {
                (Some(starboard), Some(port)) => Some(starboard.min(port)),
                (starboard, port) => starboard.or(port),
            },
            shaft_diameter: value(&inst.shaft_diameter),
            shaft_material: inst.shaft_material.clone(),
            max_screw_diameter: value(&inst.max_screw_diameter),
            tip_clearance: value(&inst.tip_clearance),
        }
    }
}

/// The sea-trial correction saved with the boat and applied to every prediction.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct AppliedCalibration {
    /// Factor on calm, clean-hull water resistance (margins go on top).
    pub resistance_factor: f64,
    /// Fitted wake fraction replacing the estimate, if fitted.
    pub wake_fraction: Option<f64>,
    /// The factor varying with Froude number that replaces `resistance_factor`, if fitted so.
    pub froude_factor: Option<crate::propulsion::hull::FroudeFactor>,
    /// Date of the trial it came from.
    pub trial_date: Option<String>,
    /// How it was fitted.
    pub note: Option<String>,
}

impl AppliedCalibration {
    /// "calibration applied: resistance ×1.114 (sea trial 2024-05-18; …)".
    pub fn line(&self) -> String {
        let mut line = match self.froude_factor {
            Some(f) => format!(
                "calibration applied: resistance ×{:.3} at Fn {:.3} to ×{:.3} at Fn {:.3} (held outside)",
                f.low, f.froude_low, f.high, f.froude_high
            ),
            None => format!(
                "calibration applied: resistance ×{:.3}",
                self.resistance_factor
            ),
        };
        if let Some(w) = self.wake_fraction {
            line.push_str(&format!(", wake fraction {w:.3}"));
        }
        let about: Vec<String> = self
            .trial_date
            .iter()
            .map(|d| format!("sea trial {d}"))
            .chain(self.note.iter().cloned())
            .collect();
        if about.is_empty() {
            line.push_str(" (sea-trial correction)");
        } else {
            line.push_str(&format!(" ({})", about.join("; ")));
        }
        line.push_str(" on calm, clean-hull resistance, margins on top");
        if self.fitted_with_margins() {
            line.push_str(
                "; saved by an earlier tidewright whose fit counted the service margin and fouling inside the factor, so it under-states the resistance by about the margins: run `tidewright trial BOAT --save` again",
            );
        }
        line
    }

    /// Whether the note says the factor was written by a `trial --save` from before the fit
    /// worked on calm-water resistance (its note lacks the "calm-water" its successors carry).
    pub fn fitted_with_margins(&self) -> bool {
        self.note.as_deref().is_some_and(|n| {
            n.contains("by `tidewright trial --save`") && !n.contains(CALM_WATER_NOTE)
        })
    }
}

/// No screw variant has the label asked for.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("boat {boat:?} has no screw variant {label:?}; its variants are: {known}")]
pub struct UnknownVariant {
    /// The boat.
    pub boat: String,
    /// The label asked for.
    pub label: String,
    /// The labels it has, comma-separated.
    pub known: String,
}

/// The variant labelled `label` of `vessel` (the one lookup by label every caller uses).
pub fn variant_by_label(vessel: &Vessel, label: &str) -> Result<usize, UnknownVariant> {
    vessel
        .variant_by_label(label)
        .ok_or_else(|| UnknownVariant {
            boat: vessel.name.clone(),
            label: label.to_string(),
            known: vessel.variant_labels(),
        })
}

/// The boat's active variant, clamped to the variants it has.
pub fn active_variant(vessel: &Vessel) -> usize {
    vessel
        .active_variant
        .min(vessel.variants.len().saturating_sub(1))
}

/// One boat ready to be asked questions: its documents, resolved vessel and display settings.
#[derive(Debug, Clone)]
pub struct Study {
    /// The boat in SI form, with its saved calibration applied.
    pub vessel: Vessel,
    /// The boat document (hand of rotation, calibration, trial log as written).
    pub doc: BoatDoc,
    /// The boat's engine sheet as loaded (to rebuild the vessel without its calibration).
    pub engine_doc: EngineDoc,
    /// The installation values the checks and the diameter sweep need.
    pub inputs: CheckInputs,
    /// The unit system to show it in: the one asked for, else the one its file is written in.
    pub units: UnitSystem,
    /// The saved sea-trial correction applied to every prediction, if any.
    pub calibration: Option<AppliedCalibration>,
    /// The boat's profile name (its file's stem).
    pub profile_name: String,
    /// Where the boat came from (the demo fleet, or a file with its stamp at load); `None` for
    /// documents being edited in memory.
    pub origin: Option<Origin>,
    /// "estimated: …" notes for hull values the core estimated because the file did not give them.
    pub estimated: Vec<String>,
    /// The engine sheet of the engine in the boat now (`[as_found] engine`), when loaded.
    pub as_found_engine: Option<EngineDoc>,
    /// The boat as it is today (`[as_found]`), solved as this study is: the baseline every
    /// planned figure is compared with (`None` without `[as_found]` or its engine sheet).
    pub baseline: Option<Box<Study>>,
    /// The displacement change of the repower applied to the planned side, if any.
    pub weight_change: Option<WeightChange>,
}

/// How much heavier (or lighter) the planned installation makes the boat.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct WeightChange {
    /// Displacement change, kg (positive: heavier).
    pub mass: f64,
    /// Whether it is estimated from the engine sheets' dry weights (else given in the file).
    pub estimated: bool,
}

impl WeightChange {
    /// The planned side's change for a boat file and its two engine sheets: the file's
    /// `installation.weight_change`, else the sheets' dry-weight difference times the shafts.
    pub fn of(doc: &BoatDoc, planned: &EngineDoc, as_found: Option<&EngineDoc>) -> Option<Self> {
        doc.as_found.as_ref()?;
        if let Some(given) = &doc.installation.weight_change {
            return Some(Self {
                mass: given.value,
                estimated: false,
            });
        }
        let (new, old) = (planned.dry_weight.as_ref()?, as_found?.dry_weight.as_ref()?);
        let mass = (new.value - old.value) * f64::from(doc.installation.shafts.max(1));
        (mass != 0.0).then_some(Self {
            mass,
            estimated: true,
        })
    }

    /// "+120 kg (estimated from the engines' dry weights)" in `system`'s units.
    pub fn words(&self, system: UnitSystem) -> String {
        let shown = crate::units::format(self.mass.abs(), Kind::Mass, system);
        let sign = if self.mass < 0.0 { "−" } else { "+" };
        let why = if self.estimated {
            "estimated from the engine sheets' dry weights; installation.weight_change overrides it"
        } else {
            "installation.weight_change"
        };
        format!("{sign}{shown} displacement ({why})")
    }
}

impl Study {
    /// Loads the boat named (or at the path) `boat` from `store` with its engine sheet; shown in
    /// `units`, else in the boat file's own.
    pub fn load(store: &Store, boat: &str, units: Option<UnitSystem>) -> anyhow::Result<Self> {
        let (loaded, engine) = store
            .resolve_boat(boat)
            .with_context(|| format!("cannot load boat {boat:?}"))?;
        let as_found = store
            .as_found_engine_for(&loaded)
            .with_context(|| format!("cannot load boat {boat:?}"))?;
        let origin = origin_text(&loaded.origin);
        let units = units.unwrap_or(loaded.doc.units);
        Self::from_sides(
            loaded.doc,
            engine.doc,
            as_found.map(|e| e.doc),
            units,
            loaded.name,
            Some(loaded.origin),
        )
        .with_context(|| format!("cannot build boat {boat:?} from {origin}"))
    }

    /// Builds the study of `doc` with `engine_doc` (documents in memory, as the TUI edits them);
    /// an `[as_found]` engine other than the planned one has no sheet here, so no baseline.
    pub fn from_documents(
        doc: BoatDoc,
        engine_doc: EngineDoc,
        units: UnitSystem,
        profile_name: String,
        origin: Option<Origin>,
    ) -> Result<Self, crate::profile::ProfileError> {
        Self::from_sides(doc, engine_doc, None, units, profile_name, origin)
    }

    /// Builds the study of `doc` with the planned `engine_doc` and the sheet of the engine in
    /// the boat now (`as_found_engine`; the planned one when `[as_found]` names the same).
    pub fn from_sides(
        doc: BoatDoc,
        engine_doc: EngineDoc,
        as_found_engine: Option<EngineDoc>,
        units: UnitSystem,
        profile_name: String,
        origin: Option<Origin>,
    ) -> Result<Self, crate::profile::ProfileError> {
        Self::build(
            doc,
            engine_doc,
            as_found_engine,
            units,
            profile_name,
            origin,
            true,
        )
    }

    /// [`Study::from_sides`] without solving the baseline (a shortlist candidate needs the
    /// weight change of its own engine, not the boat as found again).
    pub(crate) fn planned_side(
        doc: BoatDoc,
        engine_doc: EngineDoc,
        as_found_engine: Option<EngineDoc>,
        units: UnitSystem,
        profile_name: String,
    ) -> Result<Self, crate::profile::ProfileError> {
        Self::build(
            doc,
            engine_doc,
            as_found_engine,
            units,
            profile_name,
            None,
            false,
        )
    }

    fn build(
        doc: BoatDoc,
        engine_doc: EngineDoc,
        as_found_engine: Option<EngineDoc>,
        units: UnitSystem,
        profile_name: String,
        origin: Option<Origin>,
        with_baseline: bool,
    ) -> Result<Self, crate::profile::ProfileError> {
        let as_found_engine = as_found_engine.or_else(|| {
            doc.as_found
                .as_ref()
                .filter(|a| a.engine == doc.engine)
                .map(|_| engine_doc.clone())
        });
        let weight_change = WeightChange::of(&doc, &engine_doc, as_found_engine.as_ref());
        let vessel = match weight_change {
            Some(w) => doc.with_displacement_change(w.mass),
            None => doc.clone(),
        }
        .to_default_vessel(&engine_doc)?;
        let mut estimated = estimated_notes(&vessel, units);
        // "no service margin or fouling applied" when the file leaves both at zero.
        estimated.extend(doc.notes());
        let calibration = doc.calibration.as_ref().map(|c| AppliedCalibration {
            resistance_factor: c.resistance_factor,
            wake_fraction: c.wake_fraction,
            froude_factor: c.froude_factor,
            trial_date: c.trial_date.clone(),
            note: c.note.clone(),
        });
        let found = if with_baseline {
            doc.as_found_doc()
        } else {
            None
        };
        let baseline = match (found, &as_found_engine) {
            (Some(found), Some(sheet)) => Some(Box::new(Self::from_sides(
                found,
                sheet.clone(),
                None,
                units,
                profile_name.clone(),
                origin.clone(),
            )?)),
            _ => None,
        };
        Ok(Self {
            vessel,
            inputs: CheckInputs::of(&doc),
            doc,
            engine_doc,
            units,
            calibration,
            profile_name,
            origin,
            estimated,
            as_found_engine,
            baseline,
            weight_change,
        })
    }

    /// This study rebuilt from `doc` (the same sheets, units, name and origin).
    pub fn rebuilt_with(&self, doc: BoatDoc) -> Result<Study, crate::profile::ProfileError> {
        Study::from_sides(
            doc,
            self.engine_doc.clone(),
            self.as_found_engine.clone(),
            self.units,
            self.profile_name.clone(),
            self.origin.clone(),
        )
    }

    /// The displacement change of the repower on the planned side, kg (0 without one).
    pub fn displacement_change(&self) -> f64 {
        self.weight_change.map_or(0.0, |w| w.mass)
    }

    /// The study the sea-trial log was run on: the baseline when the log belongs to the
    /// as-found installation, else this one.
    pub fn trial_study(&self) -> &Study {
        match (self.doc.trial_side(), &self.baseline) {
            (crate::profile::Side::AsFound, Some(found)) => found,
            _ => self,
        }
    }

    /// The study of documents being edited in memory (no file behind them yet), shown in the
    /// boat's own units; the error is the document's problem in words.
    pub fn of_documents(doc: &BoatDoc, engine_doc: &EngineDoc) -> Result<Self, String> {
        Self::of_sides(doc, engine_doc, None)
    }

    /// [`Study::of_documents`] with the sheet of the engine in the boat now (`[as_found]`).
    pub fn of_sides(
        doc: &BoatDoc,
        engine_doc: &EngineDoc,
        as_found_engine: Option<&EngineDoc>,
    ) -> Result<Self, String> {
        let name = doc.name.clone();
        Self::from_sides(
            doc.clone(),
            engine_doc.clone(),
            as_found_engine.cloned(),
            doc.units,
            name,
            None,
        )
        .map_err(|e| e.to_string())
    }

    /// The boat's name.
    pub fn name(&self) -> &str {
        &self.vessel.name
    }

    /// The variant labelled `label`, or the active one when no label is given.
    pub fn variant(&self, label: Option<&str>) -> Result<usize, UnknownVariant> {
        match label {
            None => Ok(active_variant(&self.vessel)),
            Some(label) => variant_by_label(&self.vessel, label),
        }
    }

    /// The variants asked for: one by label, or all.
    pub fn variants(&self, label: Option<&str>) -> Result<Vec<usize>, UnknownVariant> {
        match label {
            None => Ok((0..self.vessel.variants.len()).collect()),
            Some(label) => Ok(vec![variant_by_label(&self.vessel, label)?]),
        }
    }

    /// The label of variant `index`.
    pub fn label(&self, index: usize) -> &str {
        &self.vessel.variants[index].label
    }

    /// "calibration applied: …" or "calibration: none …".
    pub fn calibration_line(&self) -> String {
        match &self.calibration {
            Some(c) => c.line(),
            None => "calibration: none (uncalibrated model)".into(),
        }
    }

    /// The vessel without the saved sea-trial correction, so that a new fit compares against
    /// the plain model and never compounds an earlier one.
    pub fn uncalibrated_vessel(&self) -> anyhow::Result<Vessel> {
        Ok(self.without_calibration()?.vessel)
    }

    /// The same study without its sea-trial calibration (the plain model), to show a fit's
    /// before and after.
    pub fn without_calibration(&self) -> anyhow::Result<Study> {
        let mut doc = self.doc.clone();
        doc.calibration = None;
        self.rebuilt_with(doc).with_context(|| {
            format!(
                "cannot build boat {:?} without its calibration",
                self.doc.name
            )
        })
    }

    /// The default load case's name ("half") and displacement mass, kg, if the file gives it.
    pub fn default_load(&self) -> (String, Option<f64>) {
        let load = &self.doc.load;
        (
            load.default.to_string(),
            load.case(load.default).map(|c| c.displacement.value),
        )
    }
}

/// Where a boat came from, in words.
pub fn origin_text(origin: &Origin) -> String {
    match origin {
        Origin::Demo { name } => format!("demo fleet ({name})"),
        Origin::File { path, .. } => path.display().to_string(),
    }
}

/// "estimated: …" notes for hull values the core estimated.
fn estimated_notes(vessel: &Vessel, system: UnitSystem) -> Vec<String> {
    let hull = &vessel.resistance.hull;
    let mut notes = Vec::new();
    let mut note = |what: &str, value: String, by: Option<&'static str>| {
        if let Some(method) = by {
            notes.push(format!("estimated: {what} {value} ({method})"));
        }
    };
    let ms = hull.midship_coefficient;
    note(
        "midship coefficient",
        format!("{:.3}", ms.value),
        ms.estimated_by,
    );
    let wp = hull.waterplane_coefficient;
    note(
        "waterplane coefficient",
        format!("{:.3}", wp.value),
        wp.estimated_by,
    );
    let lcb = hull.lcb_fraction;
    note(
        "LCB",
        format!("{:+.1} % of Lwl", lcb.value * 100.0),
        lcb.estimated_by,
    );
    let ws = hull.wetted_surface;
    note(
        "wetted surface",
        crate::units::format(ws.value, Kind::Area, system),
        ws.estimated_by,
    );
    let ie = hull.half_entrance_angle_deg;
    note(
        "half angle of entrance",
        format!("{:.1}°", ie.value),
        ie.estimated_by,
    );
    let tr = hull.transom_area;
    note(
        "immersed transom area",
        crate::units::format(tr.value, Kind::Area, system),
        tr.estimated_by,
    );
    notes
}
