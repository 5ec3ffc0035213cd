//! Commands on the profile store: `check`, `list`, `init`, and the store the options name.

use std::io::Write;
use std::path::{Path, PathBuf};

use anyhow::Context as _;

use super::{CheckArgs, Context, InvalidFiles, ListArgs, PlainFormat};
use crate::profile::demo;
use crate::profile::store::{
    BOATS_DIR, ENGINES_DIR, EXTENSION, is_path_argument, read_profile_file,
};
use crate::profile::template::blank_errors;
use crate::profile::{BoatDoc, EngineDoc, Loaded, Origin, ProfileError, Store};

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

/// Where the text of a `check` argument comes from.
enum Source {
    /// A file on disk.
    File(PathBuf),
    /// A profile of the embedded demo fleet, under its name.
    Demo(String),
}

/// The file (or demo profile) a `check` argument names: a path, else a boat or engine sheet
/// name in the store (a boat also by its display name).
fn locate(store: &Store, arg: &str) -> Result<(String, Source), String> {
    let path = Path::new(arg);
    if path.is_file() || is_path_argument(arg) {
        return Ok((arg.to_owned(), Source::File(path.to_owned())));
    }
    for candidate in [store.boat_path(arg), store.engine_path(arg)]
        .into_iter()
        .flatten()
    {
        if !store.uses_demo() && candidate.is_file() {
            return Ok((candidate.display().to_string(), Source::File(candidate)));
        }
    }
    if store.uses_demo() {
        if demo::boat(arg).is_some() {
            return Ok((
                format!("demo:{BOATS_DIR}/{arg}.{EXTENSION}"),
                Source::Demo(arg.to_owned()),
            ));
        }
        if demo::engine(arg).is_some() {
            return Ok((
                format!("demo:{ENGINES_DIR}/{arg}.{EXTENSION}"),
                Source::Demo(arg.to_owned()),
            ));
        }
    }
    // A display name, or a near miss with suggestions.
    match store.load_boat(arg) {
        Ok(loaded) => match loaded.origin {
            Origin::File { path, .. } => Ok((path.display().to_string(), Source::File(path))),
            Origin::Demo { name } => Ok((
                format!("demo:{BOATS_DIR}/{name}.{EXTENSION}"),
                Source::Demo(name),
            )),
        },
        Err(ProfileError::NotFound { .. }) => Err(format!(
            "{arg}: no such file, and no boat or engine sheet named {arg:?} in the store"
        )),
        Err(e) => Err(e.to_string()),
    }
}

/// What `check` says about one file: its problems (each "file:line:col: message" where the
/// place is known) and its notes.
struct Checked {
    problems: Vec<String>,
    notes: Vec<String>,
}

impl Checked {
    fn problems(problems: Vec<String>) -> Self {
        Self {
            problems,
            notes: Vec::new(),
        }
    }
}

/// Checks one file or demo profile, shown as `shown`.
fn check_source(store: &Store, shown: &str, source: &Source) -> Checked {
    let (text, origin) = match source {
        Source::File(path) => match read_profile_file(path) {
            Ok((text, stamp)) => (
                text,
                Origin::File {
                    path: path.clone(),
                    stamp,
                },
            ),
            Err(e) => return Checked::problems(vec![e.to_string()]),
        },
        Source::Demo(name) => {
            let text = demo::boat(name)
                .or_else(|| demo::engine(name))
                .unwrap_or("");
            (text.to_owned(), Origin::Demo { name: name.clone() })
        }
    };
    // Every blank a template still has, at once, before any other problem.
    let blanks = blank_errors(shown, &text);
    if !blanks.is_empty() {
        return Checked::problems(blanks.iter().map(ToString::to_string).collect());
    }
    let kind = match detect_kind(&text) {
        Some(kind) => kind,
        // Not TOML, or neither kind: let the boat reader report the syntax error with its place.
        None if toml::from_str::<toml::Table>(&text).is_err() => FileKind::Boat,
        None => {
            return Checked::problems(vec![format!(
                "{shown}:1:1: cannot tell a boat from an engine sheet: expected a [hull] table and an `engine` key \
                 (boat) or `rated_rpm` and `full_load_power` (engine sheet)"
            )]);
        }
    };
    match kind {
        FileKind::Engine => match EngineDoc::from_toml(&text, shown) {
            Err(e) => Checked::problems(vec![e.to_string()]),
            Ok(doc) => match doc.to_engine_sheet() {
                Err(e) => Checked::problems(vec![format!("{shown}: {e}")]),
                Ok(_) => Checked::problems(Vec::new()),
            },
        },
        FileKind::Boat => {
            // The boat's own document first, so that its `engine` key is checked as written
            // before the sheet it names is looked for.
            let doc = match BoatDoc::from_toml(&text, shown) {
                Ok(doc) => doc,
                Err(e) => return Checked::problems(vec![e.to_string()]),
            };
            let boat = Loaded {
                name: String::new(),
                doc,
                origin,
            };
            let engine = match store.engine_for(&boat) {
                Ok(engine) => engine,
                Err(e) => return Checked::problems(vec![e.to_string()]),
            };
            match boat.doc.to_default_vessel(&engine.doc) {
                Ok(_) => Checked {
                    problems: Vec::new(),
                    notes: boat.doc.notes(),
                },
                Err(e) => Checked::problems(vec![format!("{shown}: {e}")]),
            }
        }
    }
}

/// `check FILE|NAME…`.
pub fn check(ctx: &Context, args: &CheckArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let store = store(ctx);
    let mut invalid = 0;
    for arg in &args.files {
        let checked = match locate(&store, arg) {
            Ok((shown, source)) => {
                let checked = check_source(&store, &shown, &source);
                if checked.problems.is_empty() {
                    writeln!(out, "{shown}: ok")?;
                }
                for note in &checked.notes {
                    writeln!(out, "{shown}: note: {note}")?;
                }
                checked
            }
            Err(problem) => Checked::problems(vec![problem]),
        };
        if !checked.problems.is_empty() {
            invalid += 1;
            for problem in &checked.problems {
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
