//! The profile store: a directory with `boats/` and `engines/`, the embedded demo fleet when it
//! does not exist, safe names, and atomic saves that keep a backup and notice changes on disk.

use super::boat::BoatDoc;
use super::demo;
use super::engine::EngineDoc;
use super::error::ProfileError;
pub use super::fields::{MAX_NAME_LEN, check_name};
use std::hash::{Hash, Hasher};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::time::SystemTime;

mod files;
mod save;
pub use files::*;
pub use save::*;

/// The environment variable that overrides the store directory.
pub const ENV_VAR: &str = "TIDEWRIGHT_PROFILES";
/// Folder of boat files inside the store.
pub const BOATS_DIR: &str = "boats";
/// Folder of engine sheets inside the store.
pub const ENGINES_DIR: &str = "engines";
/// Extension of profile files.
pub const EXTENSION: &str = "toml";
/// Suffix appended to a file's name for the previous version kept on save.
pub const BACKUP_SUFFIX: &str = ".bak";

/// What a file looked like when it was loaded, to notice later changes by someone else.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct FileStamp {
    /// Modification time, if the file system gives one.
    pub modified: Option<SystemTime>,
    /// Length, bytes.
    pub len: u64,
    /// Hash of the content (not cryptographic; detects edits, not attacks).
    pub hash: u64,
}

impl FileStamp {
    /// The stamp of `bytes` read from a file with modification time `modified`.
    pub fn of(bytes: &[u8], modified: Option<SystemTime>) -> Self {
        let mut hasher = std::collections::hash_map::DefaultHasher::new();
        bytes.hash(&mut hasher);
        Self {
            modified,
            len: bytes.len() as u64,
            hash: hasher.finish(),
        }
    }

    /// Whether `bytes` is the same content this stamp was taken of.
    fn same_content(&self, bytes: &[u8]) -> bool {
        let other = Self::of(bytes, None);
        other.len == self.len && other.hash == self.hash
    }
}

/// Where a loaded document came from.
#[derive(Debug, Clone, PartialEq)]
pub enum Origin {
    /// The embedded demo fleet (read-only), under this profile name.
    Demo {
        /// The profile name.
        name: String,
    },
    /// A file on disk, with its stamp at load.
    File {
        /// The file.
        path: PathBuf,
        /// What it looked like when loaded.
        stamp: FileStamp,
    },
}

impl Origin {
    /// The stamp to pass when saving over this document's file (`None` for the demo).
    pub fn stamp(&self) -> Option<&FileStamp> {
        match self {
            Origin::File { stamp, .. } => Some(stamp),
            Origin::Demo { .. } => None,
        }
    }
}

/// A document and where it came from.
#[derive(Debug, Clone, PartialEq)]
pub struct Loaded<T> {
    /// The profile name (the file's stem).
    pub name: String,
    /// The document.
    pub doc: T,
    /// Where it came from.
    pub origin: Origin,
}

/// What `init` did.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct InitReport {
    /// Files written from the demo fleet.
    pub created: Vec<PathBuf>,
    /// Files left alone because they already existed.
    pub kept: Vec<PathBuf>,
}

/// The result of a save.
#[derive(Debug, Clone, PartialEq)]
pub struct Saved {
    /// The file written.
    pub path: PathBuf,
    /// The previous version kept, if there was one.
    pub backup: Option<PathBuf>,
    /// The new file's stamp, for the next save.
    pub stamp: FileStamp,
}

/// The profile store.
#[derive(Debug, Clone, PartialEq)]
pub struct Store {
    root: Option<PathBuf>,
}

impl Store {
    /// The store at `root` (it need not exist yet).
    pub fn at(root: impl Into<PathBuf>) -> Self {
        Self {
            root: Some(root.into()),
        }
    }

    /// The store chosen by the `--profiles` flag, else `TIDEWRIGHT_PROFILES`, else the
    /// platform's data directory for "tidewright" (e.g. `~/.local/share/tidewright` on Linux).
    pub fn locate(flag: Option<&Path>) -> Self {
        let env = std::env::var_os(ENV_VAR)
            .filter(|v| !v.is_empty())
            .map(PathBuf::from);
        Self::choose(flag, env)
    }

    /// The store from an explicit flag and environment value (for testing `locate`'s order).
    pub fn choose(flag: Option<&Path>, env: Option<PathBuf>) -> Self {
        let root = flag.map(Path::to_owned).or(env).or_else(|| {
            directories::ProjectDirs::from("", "", "tidewright").map(|d| d.data_dir().to_owned())
        });
        Self { root }
    }

    /// The store's directory, if one could be found.
    pub fn root(&self) -> Option<&Path> {
        self.root.as_deref()
    }

    /// Whether the store directory is missing, so that the read-only demo fleet is used.
    pub fn uses_demo(&self) -> bool {
        !self.root.as_deref().is_some_and(Path::is_dir)
    }

    fn folder(&self, sub: &str) -> Option<PathBuf> {
        self.root.as_ref().map(|r| r.join(sub))
    }

    /// The file a boat of this name lives in (whether or not it exists).
    pub fn boat_path(&self, name: &str) -> Result<PathBuf, ProfileError> {
        check_name(name)?;
        self.folder(BOATS_DIR)
            .map(|d| d.join(format!("{name}.{EXTENSION}")))
            .ok_or(ProfileError::NoStoreDirectory)
    }

    /// The file an engine sheet of this name lives in (whether or not it exists).
    pub fn engine_path(&self, name: &str) -> Result<PathBuf, ProfileError> {
        check_name(name)?;
        self.folder(ENGINES_DIR)
            .map(|d| d.join(format!("{name}.{EXTENSION}")))
            .ok_or(ProfileError::NoStoreDirectory)
    }

    fn place(&self) -> String {
        match &self.root {
            Some(root) if !self.uses_demo() => format!("the profile store {}", root.display()),
            _ => "the demo fleet".to_owned(),
        }
    }

    fn list(&self, sub: &str, demo_names: Vec<&'static str>) -> Result<Vec<String>, ProfileError> {
        if self.uses_demo() {
            return Ok(demo_names.into_iter().map(str::to_owned).collect());
        }
        let Some(dir) = self.folder(sub) else {
            return Ok(Vec::new());
        };
        if !dir.is_dir() {
            return Ok(Vec::new());
        }
        let entries = std::fs::read_dir(&dir).map_err(|os_error| ProfileError::Read {
            path: dir.clone(),
            os_error,
        })?;
        let mut names: Vec<String> = entries
            .filter_map(Result::ok)
            .map(|e| e.path())
            .filter(|p| p.is_file() && p.extension().is_some_and(|x| x == EXTENSION))
            .map(|p| stem(&p))
            .filter(|n| check_name(n).is_ok())
            .collect();
        names.sort();
        Ok(names)
    }

    /// Names of the boats in the store (or the demo fleet), sorted.
    pub fn list_boats(&self) -> Result<Vec<String>, ProfileError> {
        self.list(BOATS_DIR, demo::boat_names())
    }

    /// Names of the engine sheets in the store (or the demo fleet), sorted.
    pub fn list_engines(&self) -> Result<Vec<String>, ProfileError> {
        self.list(ENGINES_DIR, demo::engine_names())
    }

    /// Loads the boat `name`: its file's stem, else (ignoring case) a stem or a boat's display
    /// name (`name = "…"` inside the file). An unknown name says which boats come close.
    pub fn load_boat(&self, name: &str) -> Result<Loaded<BoatDoc>, ProfileError> {
        let missed = match self.load_boat_by_stem(name) {
            Err(e @ (ProfileError::NotFound { .. } | ProfileError::UnsafeName { .. })) => e,
            other => return other,
        };
        let known = self.boat_display_names();
        let wanted = name.trim().to_lowercase();
        let same = |text: &str| text.trim().to_lowercase() == wanted;
        // A stem in another case first ("Marram" for marram), then a display name.
        let by_stem: Vec<&(String, Option<String>)> =
            known.iter().filter(|(stem, _)| same(stem)).collect();
        let by_display: Vec<&(String, Option<String>)> = known
            .iter()
            .filter(|(_, display)| display.as_deref().is_some_and(same))
            .collect();
        for matches in [&by_stem, &by_display] {
            if let [(stem, _)] = matches.as_slice() {
                return self.load_boat_by_stem(stem);
            }
        }
        let exact: Vec<&(String, Option<String>)> = by_stem.into_iter().chain(by_display).collect();
        let near =
            |text: &str| edit_distance(&text.to_lowercase(), &wanted) <= MAX_SUGGESTION_EDITS;
        let suggestions: Vec<String> = known
            .iter()
            .filter(|(stem, display)| {
                exact.iter().any(|(s, _)| s == stem)
                    || near(stem)
                    || display.as_deref().is_some_and(near)
            })
            .map(|(stem, display)| match display {
                Some(d) if d != stem => format!("{stem} ({d})"),
                _ => stem.clone(),
            })
            .collect();
        if suggestions.is_empty() {
            return Err(missed);
        }
        Err(ProfileError::NotFoundNear {
            kind: "boat",
            name: name.to_owned(),
            place: self.place(),
            suggestions,
        })
    }

    /// Every boat's stem with the display name inside its file (`None` when it cannot be read).
    fn boat_display_names(&self) -> Vec<(String, Option<String>)> {
        let stems = self.list_boats().unwrap_or_default();
        stems
            .into_iter()
            .map(|stem| {
                let text = if self.uses_demo() {
                    demo::boat(&stem).map(str::to_owned)
                } else {
                    self.boat_path(&stem)
                        .ok()
                        .and_then(|p| std::fs::read_to_string(p).ok())
                };
                let display = text
                    .and_then(|t| toml::from_str::<toml::Table>(&t).ok())
                    .and_then(|t| t.get("name").and_then(|n| n.as_str()).map(str::to_owned));
                (stem, display)
            })
            .collect()
    }

    fn load_boat_by_stem(&self, name: &str) -> Result<Loaded<BoatDoc>, ProfileError> {
        check_name(name)?;
        if self.uses_demo() {
            let text = demo::boat(name).ok_or_else(|| self.not_found("boat", name))?;
            let doc = BoatDoc::from_toml(text, &format!("demo:{BOATS_DIR}/{name}.{EXTENSION}"))?;
            return Ok(Loaded {
                name: name.to_owned(),
                doc,
                origin: Origin::Demo {
                    name: name.to_owned(),
                },
            });
        }
        let path = self.boat_path(name)?;
        if !path.is_file() {
            return Err(self.not_found("boat", name));
        }
        load_boat_file(&path)
    }

    /// Loads the engine sheet `name`.
    pub fn load_engine(&self, name: &str) -> Result<Loaded<EngineDoc>, ProfileError> {
        check_name(name)?;
        if self.uses_demo() {
            let text = demo::engine(name).ok_or_else(|| self.not_found("engine sheet", name))?;
            let doc =
                EngineDoc::from_toml(text, &format!("demo:{ENGINES_DIR}/{name}.{EXTENSION}"))?;
            return Ok(Loaded {
                name: name.to_owned(),
                doc,
                origin: Origin::Demo {
                    name: name.to_owned(),
                },
            });
        }
        let path = self.engine_path(name)?;
        if !path.is_file() {
            return Err(self.not_found("engine sheet", name));
        }
        load_engine_file(&path)
    }

    fn not_found(&self, kind: &'static str, name: &str) -> ProfileError {
        ProfileError::NotFound {
            kind,
            name: name.to_owned(),
            place: self.place(),
        }
    }

    /// Resolves a BOAT argument (a name in the store or a path to a boat file) with its engine.
    pub fn resolve_boat(
        &self,
        arg: &str,
    ) -> Result<(Loaded<BoatDoc>, Loaded<EngineDoc>), ProfileError> {
        let boat = if is_path_argument(arg) {
            let path = Path::new(arg);
            let with_extension = PathBuf::from(format!("{arg}.{EXTENSION}"));
            let bare = !arg.contains(['/', '\\']);
            if path.is_file() {
                load_boat_file(path)?
            } else if bare {
                // "marram.toml" and no such file here: the store's boat of that name, else
                // the error of the file asked for.
                match self.load_boat(strip_extension(arg)) {
                    Err(ProfileError::NotFound { .. }) => load_boat_file(path)?,
                    other => other?,
                }
            } else if with_extension.is_file() {
                // "boats/marram": the file with its extension.
                load_boat_file(&with_extension)?
            } else {
                load_boat_file(path)?
            }
        } else {
            self.load_boat(arg)?
        };
        let engine = self.engine_for(&boat)?;
        Ok((boat, engine))
    }

    /// The engine sheet a boat names: for a boat file, first `../engines/` beside the file's
    /// folder, then the store (or the demo fleet).
    pub fn engine_for(&self, boat: &Loaded<BoatDoc>) -> Result<Loaded<EngineDoc>, ProfileError> {
        self.engine_named(boat, &boat.doc.engine, "engine")
    }

    /// The engine sheet of the engine in the boat now (`[as_found] engine`), found as
    /// [`Store::engine_for`] finds the planned one; `None` when the boat has no `[as_found]`.
    pub fn as_found_engine_for(
        &self,
        boat: &Loaded<BoatDoc>,
    ) -> Result<Option<Loaded<EngineDoc>>, ProfileError> {
        match &boat.doc.as_found {
            None => Ok(None),
            Some(found) => self
                .engine_named(boat, &found.engine, "as_found.engine")
                .map(Some),
        }
    }

    /// The engine sheet `named` by key `field` of `boat`.
    fn engine_named(
        &self,
        boat: &Loaded<BoatDoc>,
        named: &str,
        field: &'static str,
    ) -> Result<Loaded<EngineDoc>, ProfileError> {
        // `engine = "x.toml"` names the sheet x.
        let name = &strip_extension(named).to_owned();
        check_name(name)?;
        let mut searched = Vec::new();
        let (file, location) = match &boat.origin {
            Origin::File { path, .. } => {
                let beside = path
                    .parent()
                    .and_then(Path::parent)
                    .unwrap_or(Path::new("."))
                    .join(ENGINES_DIR);
                let candidate = beside.join(format!("{name}.{EXTENSION}"));
                if candidate.is_file() {
                    return load_engine_file(&candidate);
                }
                searched.push(beside.display().to_string());
                let source = std::fs::read_to_string(path).unwrap_or_default();
                (path.display().to_string(), key_location(&source, field))
            }
            Origin::Demo { name } => (format!("demo:{BOATS_DIR}/{name}.{EXTENSION}"), None),
        };
        match self.load_engine(name) {
            Err(ProfileError::NotFound { place, .. }) => {
                searched.push(place);
                Err(ProfileError::EngineMissing {
                    file,
                    location,
                    field,
                    engine: name.clone(),
                    searched,
                })
            }
            other => other,
        }
    }

    /// Writes `text` as the new boat `name`, refusing to replace a file that is there.
    pub fn create_boat(&self, name: &str, text: &str) -> Result<PathBuf, ProfileError> {
        create_new_file(&self.boat_path(name)?, text)
    }

    /// Writes `text` as the new engine sheet `name`, refusing to replace a file that is there.
    pub fn create_engine(&self, name: &str, text: &str) -> Result<PathBuf, ProfileError> {
        create_new_file(&self.engine_path(name)?, text)
    }

    /// Copies the demo fleet into the store, never over an existing file.
    pub fn init(&self) -> Result<InitReport, ProfileError> {
        let mut report = InitReport::default();
        let files = demo::BOATS
            .iter()
            .map(|(n, t)| (self.boat_path(n), *t))
            .chain(demo::ENGINES.iter().map(|(n, t)| (self.engine_path(n), *t)));
        for (path, text) in files {
            let path = path?;
            if path.exists() {
                report.kept.push(path);
                continue;
            }
            let pending = PendingSave::prepare(&path, text.as_bytes(), None, false)?;
            report.created.push(pending.commit()?.path);
        }
        Ok(report)
    }

    /// Saves `doc` as boat `name`; `loaded` is the stamp from when it was loaded (`None` for a
    /// new boat or one from the demo). Refuses an invalid document or a file changed on disk
    /// since (unless `force`).
    pub fn save_boat(
        &self,
        name: &str,
        doc: &BoatDoc,
        loaded: Option<&FileStamp>,
        force: bool,
    ) -> Result<Saved, ProfileError> {
        self.prepare_boat(name, doc, loaded, force)?.commit()
    }

    /// Saves `doc` as engine sheet `name`, as [`Store::save_boat`] does.
    pub fn save_engine(
        &self,
        name: &str,
        doc: &EngineDoc,
        loaded: Option<&FileStamp>,
        force: bool,
    ) -> Result<Saved, ProfileError> {
        if let Some(issue) = doc.validate().into_iter().next() {
            return Err(ProfileError::Invalid {
                file: format!("{ENGINES_DIR}/{name}.{EXTENSION}"),
                location: None,
                issue,
            });
        }
        let path = self.engine_path(name)?;
        let file = path.display().to_string();
        PendingSave::prepare_with(&path, loaded, force, |previous| {
            engine_text(previous, doc, &file)
        })?
        .commit()
    }

    /// Validates and writes the boat's temporary file, ready to [`PendingSave::commit`].
    pub fn prepare_boat(
        &self,
        name: &str,
        doc: &BoatDoc,
        loaded: Option<&FileStamp>,
        force: bool,
    ) -> Result<PendingSave, ProfileError> {
        let path = self.boat_path(name)?;
        if let Some(issue) = doc.validate().into_iter().next() {
            return Err(ProfileError::Invalid {
                file: path.display().to_string(),
                location: None,
                issue,
            });
        }
        let file = path.display().to_string();
        PendingSave::prepare_with(&path, loaded, force, |previous| {
            boat_text(previous, doc, &file)
        })
    }
}

/// Where key `field` ("engine", or "table.key") is written in TOML `source`: the first line
/// assigning the key inside its table (top level before any table header).
fn key_location(source: &str, field: &str) -> Option<crate::profile::error::Location> {
    let (table, key) = field.rsplit_once('.').unwrap_or(("", field));
    let mut current = String::new();
    for (i, line) in source.lines().enumerate() {
        let trimmed = line.trim();
        if let Some(header) = trimmed.strip_prefix('[') {
            current = header
                .trim_start_matches('[')
                .split(']')
                .next()
                .unwrap_or("")
                .trim()
                .to_string();
            continue;
        }
        let assigns = trimmed
            .strip_prefix(key)
            .is_some_and(|rest| rest.trim_start().starts_with('='));
        if current == table && assigns {
            let column = line.len() - line.trim_start().len() + 1;
            return Some(crate::profile::error::Location {
                line: i + 1,
                column,
            });
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn flag_wins_over_environment() {
        let s = Store::choose(Some(Path::new("/a")), Some(PathBuf::from("/b")));
        assert_eq!(s.root(), Some(Path::new("/a")));
        let s = Store::choose(None, Some(PathBuf::from("/b")));
        assert_eq!(s.root(), Some(Path::new("/b")));
    }

    #[test]
    fn a_store_that_does_not_exist_serves_the_demo() {
        let dir = tempfile::tempdir().unwrap();
        let store = Store::at(dir.path().join("nowhere"));
        assert!(store.uses_demo());
        assert_eq!(store.list_boats().unwrap(), demo::boat_names());
    }

    #[test]
    fn stamps_notice_content_changes() {
        let a = FileStamp::of(b"abc", None);
        assert!(a.same_content(b"abc"));
        assert!(!a.same_content(b"abd"));
    }

    #[test]
    fn a_dropped_pending_save_leaves_no_temporary() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("x.toml");
        std::fs::write(&path, "old").unwrap();
        let stamp = FileStamp::of(b"old", None);
        let pending = PendingSave::prepare(&path, b"new", Some(&stamp), false).unwrap();
        drop(pending);
        assert_eq!(std::fs::read_to_string(&path).unwrap(), "old");
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
    }
}
