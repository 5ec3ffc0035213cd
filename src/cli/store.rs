//! Commands on the profile store: `check`, `list`, `init`, and the store the options name.

use std::io::Write;
use std::path::Path;

use anyhow::Context as _;

use super::{CheckArgs, Context, InvalidFiles, ListArgs, PlainFormat};
use crate::profile::Store;
use crate::profile::store::{load_boat_file, load_engine_file};

/// The store the global options point at.
pub fn store(ctx: &Context) -> Store {
    Store::choose(ctx.profiles.as_deref(), None)
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
