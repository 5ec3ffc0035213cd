//! Commands on the profile store: `check`, `list`, `init`, and loading a boat for the others.

use std::io::Write;
use std::path::Path;

use anyhow::Context as _;

use super::{CheckArgs, Context, InvalidFiles, ListArgs, PlainFormat};
use crate::profile::store::{load_boat_file, load_engine_file};
use crate::profile::{BoatDoc, EngineDoc, Origin, Store};
use crate::propulsion::solver::Vessel;
use crate::report::checks::{AppliedCalibration, CheckInputs};
use crate::units::{Kind, UnitSystem};

/// A boat loaded from the store (or a path, or the demo fleet), ready to solve.
#[derive(Debug, Clone)]
pub struct LoadedBoat {
    /// The boat in SI form.
    pub vessel: Vessel,
    /// The boat document (hand of rotation, calibration, trial log as written).
    pub doc: BoatDoc,
    /// Notes for the report: values the core estimated because the profile did not give them.
    pub warnings: Vec<String>,
    /// The unit system to show it in: `--units`, else the one its file is written in.
    pub units: UnitSystem,
    /// The boat's engine sheet as loaded (to rebuild the vessel without its calibration).
    pub engine_doc: EngineDoc,
    /// The boat's profile name (its file's stem).
    pub profile_name: String,
    /// Where the boat came from (the demo fleet, or a file with its stamp at load).
    pub origin: Origin,
}

impl LoadedBoat {
    /// The vessel without the saved sea-trial correction, so that a new fit compares against
    /// the plain model and never compounds an earlier one.
    pub fn uncalibrated_vessel(&self) -> anyhow::Result<Vessel> {
        let mut doc = self.doc.clone();
        doc.calibration = None;
        doc.to_default_vessel(&self.engine_doc).with_context(|| {
            format!(
                "cannot build boat {:?} without its calibration",
                self.doc.name
            )
        })
    }

    /// The saved sea-trial correction as the reports show it.
    pub fn applied_calibration(&self) -> Option<AppliedCalibration> {
        self.doc.calibration.as_ref().map(|c| AppliedCalibration {
            resistance_factor: c.resistance_factor,
            wake_fraction: c.wake_fraction,
            trial_date: c.trial_date.clone(),
            note: c.note.clone(),
        })
    }

    /// "calibration applied: …" or "calibration: none …".
    pub fn calibration_line(&self) -> String {
        match self.applied_calibration() {
            Some(c) => c.line(),
            None => "calibration: none (uncalibrated model)".into(),
        }
    }

    /// The installation values the cavitation and shaft checks need.
    pub fn check_inputs(&self) -> CheckInputs {
        let inst = &self.doc.installation;
        CheckInputs {
            shaft_immersion: inst.shaft_immersion.as_ref().map(|q| q.value),
            shaft_diameter: inst.shaft_diameter.as_ref().map(|q| q.value),
            shaft_material: inst.shaft_material.clone(),
        }
    }
}

/// The store the global options point at.
pub fn store(ctx: &Context) -> Store {
    Store::choose(ctx.profiles.as_deref(), None)
}

fn origin_text(origin: &Origin) -> String {
    match origin {
        Origin::Demo { name } => format!("demo fleet ({name})"),
        Origin::File { path, .. } => path.display().to_string(),
    }
}

/// Loads the boat named (or at the path) `boat` with its engine sheet and builds its vessel.
pub fn load_boat(ctx: &Context, boat: &str) -> anyhow::Result<LoadedBoat> {
    let store = store(ctx);
    let (loaded, engine) = store
        .resolve_boat(boat)
        .with_context(|| format!("cannot load boat {boat:?}"))?;
    let origin = origin_text(&loaded.origin);
    let vessel = loaded
        .doc
        .to_default_vessel(&engine.doc)
        .with_context(|| format!("cannot build boat {boat:?} from {origin}"))?;
    let units = ctx.units_or(loaded.doc.units);
    let warnings = estimated_notes(&vessel, units);
    Ok(LoadedBoat {
        vessel,
        doc: loaded.doc,
        warnings,
        units,
        engine_doc: engine.doc,
        profile_name: loaded.name,
        origin: loaded.origin,
    })
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

/// What a profile file holds, told from its top-level keys.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum FileKind {
    Boat,
    Engine,
}

fn detect_kind(text: &str) -> Option<FileKind> {
    let table: toml::Table = toml::from_str(text).ok()?;
    if table.contains_key("hull")
        || table.contains_key("variant")
        || table.get("engine").is_some_and(toml::Value::is_str)
    {
        Some(FileKind::Boat)
    } else if table.contains_key("rated_rpm") || table.contains_key("full_load_power") {
        Some(FileKind::Engine)
    } else {
        None
    }
}

/// The problems of one file, each as "file:line:col: message" where the place is known.
fn check_file(store: &Store, path: &Path) -> Vec<String> {
    let shown = path.display().to_string();
    let text = match std::fs::read_to_string(path) {
        Ok(text) => text,
        Err(e) => return vec![format!("{shown}: cannot read: {e}")],
    };
    let kind = match detect_kind(&text) {
        Some(kind) => kind,
        // Not TOML, or neither kind: let the boat reader report the syntax error with its place.
        None if toml::from_str::<toml::Table>(&text).is_err() => FileKind::Boat,
        None => {
            return vec![format!(
                "{shown}:1:1: cannot tell a boat from an engine sheet: expected a [hull] table and an `engine` key \
                 (boat) or `rated_rpm` and `full_load_power` (engine sheet)"
            )];
        }
    };
    match kind {
        FileKind::Engine => match load_engine_file(path) {
            Err(e) => vec![e.to_string()],
            Ok(engine) => match engine.doc.to_engine_sheet() {
                Err(e) => vec![format!("{shown}: {e}")],
                Ok(_) => Vec::new(),
            },
        },
        FileKind::Boat => {
            let boat = match load_boat_file(path) {
                Ok(boat) => boat,
                Err(e) => return vec![e.to_string()],
            };
            let engine = match store.engine_for(&boat) {
                Ok(engine) => engine,
                Err(e) => return vec![e.to_string()],
            };
            match boat.doc.to_default_vessel(&engine.doc) {
                Ok(_) => Vec::new(),
                Err(e) => vec![format!("{shown}: {e}")],
            }
        }
    }
}

/// `check FILE…`.
pub fn check(ctx: &Context, args: &CheckArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let store = store(ctx);
    let mut invalid = 0;
    for path in &args.files {
        let problems = check_file(&store, path);
        if problems.is_empty() {
            writeln!(out, "{}: ok", path.display())?;
        } else {
            invalid += 1;
            for problem in problems {
                // The error text already starts with the file (and line:column where known).
                writeln!(out, "{problem}")?;
            }
        }
    }
    if invalid > 0 {
        return Err(InvalidFiles {
            invalid,
            total: args.files.len(),
        }
        .into());
    }
    Ok(())
}

/// The JSON document of `list`.
#[derive(Debug, serde::Serialize)]
struct ListJson {
    store: Option<String>,
    demo: bool,
    boats: Vec<String>,
    engines: Vec<String>,
}

/// `list`.
pub fn list(ctx: &Context, args: &ListArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let store = store(ctx);
    let boats = store.list_boats().context("cannot list the boats")?;
    let engines = store
        .list_engines()
        .context("cannot list the engine sheets")?;
    match args.format {
        PlainFormat::Json => {
            let doc = ListJson {
                store: store.root().map(|p| p.display().to_string()),
                demo: store.uses_demo(),
                boats,
                engines,
            };
            out.write_all(crate::report::json::to_string(&doc)?.as_bytes())?;
        }
        PlainFormat::Text => {
            if store.uses_demo() {
                writeln!(
                    out,
                    "Built-in demo fleet (no profile store yet; `tidewright init` creates one)"
                )?;
            } else if let Some(root) = store.root() {
                writeln!(out, "Profile store {}", root.display())?;
            }
            writeln!(out, "Boats:")?;
            for b in &boats {
                writeln!(out, "  {b}")?;
            }
            writeln!(out, "Engine sheets:")?;
            for e in &engines {
                writeln!(out, "  {e}")?;
            }
        }
    }
    Ok(())
}

/// `init`.
pub fn init(ctx: &Context, out: &mut dyn Write) -> anyhow::Result<()> {
    let store = store(ctx);
    let root = store
        .root()
        .map(|p| p.display().to_string())
        .unwrap_or_default();
    let report = store
        .init()
        .with_context(|| format!("cannot create the profile store {root}"))?;
    for path in &report.created {
        writeln!(out, "created {}", path.display())?;
    }
    for path in &report.kept {
        writeln!(out, "kept {} (already there)", path.display())?;
    }
    writeln!(
        out,
        "profile store {root}: {} created, {} kept",
        report.created.len(),
        report.kept.len()
    )?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn kinds_are_told_apart_by_content() {
        assert_eq!(
            detect_kind("engine = \"x\"\n[hull]\n"),
            Some(FileKind::Boat)
        );
        assert_eq!(
            detect_kind("rated_rpm = \"2600 rpm\"\n"),
            Some(FileKind::Engine)
        );
        assert_eq!(detect_kind("name = \"x\"\n"), None);
        assert_eq!(detect_kind("not [ toml"), None);
    }
}
