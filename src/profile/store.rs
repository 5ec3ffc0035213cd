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

fn read_file(path: &Path) -> Result<(String, FileStamp), ProfileError> {
    let read_error = |source| ProfileError::Read {
        path: path.to_owned(),
        source,
    };
    let bytes = std::fs::read(path).map_err(read_error)?;
    let modified = std::fs::metadata(path).and_then(|m| m.modified()).ok();
    let stamp = FileStamp::of(&bytes, modified);
    let text = String::from_utf8(bytes).map_err(|e| {
        read_error(std::io::Error::new(
            std::io::ErrorKind::InvalidData,
            format!("not UTF-8 text: {e}"),
        ))
    })?;
    Ok((text, stamp))
}

/// Loads a boat file from `path` (not through a store).
pub fn load_boat_file(path: &Path) -> Result<Loaded<BoatDoc>, ProfileError> {
    let (text, stamp) = read_file(path)?;
    let doc = BoatDoc::from_toml(&text, &path.display().to_string())?;
    Ok(Loaded {
        name: stem(path),
        doc,
        origin: Origin::File {
            path: path.to_owned(),
            stamp,
        },
    })
}

/// Loads an engine sheet from `path` (not through a store).
pub fn load_engine_file(path: &Path) -> Result<Loaded<EngineDoc>, ProfileError> {
    let (text, stamp) = read_file(path)?;
    let doc = EngineDoc::from_toml(&text, &path.display().to_string())?;
    Ok(Loaded {
        name: stem(path),
        doc,
        origin: Origin::File {
            path: path.to_owned(),
            stamp,
        },
    })
}

fn stem(path: &Path) -> String {
    path.file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default()
}

/// Whether a BOAT argument is a path to a file rather than a name in the store.
pub fn is_path_argument(arg: &str) -> bool {
    arg.contains(['/', '\\']) || arg.ends_with(".toml")
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
        let entries = std::fs::read_dir(&dir).map_err(|source| ProfileError::Read {
            path: dir.clone(),
            source,
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

    /// Loads the boat `name`.
    pub fn load_boat(&self, name: &str) -> Result<Loaded<BoatDoc>, ProfileError> {
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
            load_boat_file(Path::new(arg))?
        } else {
            self.load_boat(arg)?
        };
        let engine = self.engine_for(&boat)?;
        Ok((boat, engine))
    }

    /// The engine sheet a boat names: for a boat file, first `../engines/` beside the file's
    /// folder, then the store (or the demo fleet).
    pub fn engine_for(&self, boat: &Loaded<BoatDoc>) -> Result<Loaded<EngineDoc>, ProfileError> {
        let name = &boat.doc.engine;
        check_name(name)?;
        let mut searched = Vec::new();
        let file = match &boat.origin {
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
                path.display().to_string()
            }
            Origin::Demo { name } => format!("demo:{BOATS_DIR}/{name}.{EXTENSION}"),
        };
        match self.load_engine(name) {
            Err(ProfileError::NotFound { place, .. }) => {
                searched.push(place);
                Err(ProfileError::EngineMissing {
                    file,
                    engine: name.clone(),
                    searched,
                })
            }
            other => other,
        }
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
        PendingSave::prepare(
            &self.engine_path(name)?,
            doc.to_toml().as_bytes(),
            loaded,
            force,
        )?
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
        PendingSave::prepare(&path, doc.to_toml().as_bytes(), loaded, force)
    }
}

/// Saves a boat to an explicit file (a boat opened by path), as [`Store::save_boat`] does.
pub fn save_boat_file(
    path: &Path,
    doc: &BoatDoc,
    loaded: Option<&FileStamp>,
    force: bool,
) -> Result<Saved, ProfileError> {
    if let Some(issue) = doc.validate().into_iter().next() {
        return Err(ProfileError::Invalid {
            file: path.display().to_string(),
            location: None,
            issue,
        });
    }
    PendingSave::prepare(path, doc.to_toml().as_bytes(), loaded, force)?.commit()
}

/// A save whose new content is written and synced to a temporary file beside the target but
/// not yet renamed over it. Dropping it leaves the old file untouched and removes the temporary.
#[derive(Debug)]
pub struct PendingSave {
    path: PathBuf,
    temp: tempfile::NamedTempFile,
    previous: Option<Vec<u8>>,
}

impl PendingSave {
    /// Checks for changes on disk and writes `contents` to a synced temporary file.
    pub fn prepare(
        path: &Path,
        contents: &[u8],
        loaded: Option<&FileStamp>,
        force: bool,
    ) -> Result<Self, ProfileError> {
        let write_error = |source| ProfileError::Write {
            path: path.to_owned(),
            source,
        };
        let dir = path
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .unwrap_or(Path::new("."));
        let previous = match std::fs::read(path) {
            Ok(bytes) => Some(bytes),
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => None,
            Err(source) => {
                return Err(ProfileError::Read {
                    path: path.to_owned(),
                    source,
                });
            }
        };
        let changed = match (loaded, &previous) {
            (Some(stamp), Some(now)) => !stamp.same_content(now),
            (Some(_), None) => true,
            (None, Some(_)) => true,
            (None, None) => false,
        };
        if changed && !force {
            return Err(ProfileError::ChangedOnDisk {
                path: path.to_owned(),
            });
        }
        std::fs::create_dir_all(dir).map_err(write_error)?;
        let mut temp = tempfile::Builder::new()
            .prefix(".tidewright-")
            .suffix(".tmp")
            .tempfile_in(dir)
            .map_err(write_error)?;
        temp.write_all(contents).map_err(write_error)?;
        temp.as_file().sync_all().map_err(write_error)?;
        Ok(Self {
            path: path.to_owned(),
            temp,
            previous,
        })
    }

    /// Keeps the previous version as `NAME.toml.bak`, renames the new file into place and
    /// syncs the directory.
    pub fn commit(self) -> Result<Saved, ProfileError> {
        let write_error = |path: &Path, source| ProfileError::Write {
            path: path.to_owned(),
            source,
        };
        let dir = self
            .path
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .unwrap_or(Path::new("."))
            .to_owned();
        let backup = match &self.previous {
            Some(bytes) => {
                let mut name = self.path.file_name().unwrap_or_default().to_owned();
                name.push(BACKUP_SUFFIX);
                let backup = self.path.with_file_name(name);
                let mut temp = tempfile::Builder::new()
                    .prefix(".tidewright-")
                    .suffix(".tmp")
                    .tempfile_in(&dir)
                    .map_err(|e| write_error(&backup, e))?;
                temp.write_all(bytes).map_err(|e| write_error(&backup, e))?;
                temp.as_file()
                    .sync_all()
                    .map_err(|e| write_error(&backup, e))?;
                temp.persist(&backup)
                    .map_err(|e| write_error(&backup, e.error))?;
                Some(backup)
            }
            None => None,
        };
        let file = self
            .temp
            .persist(&self.path)
            .map_err(|e| write_error(&self.path, e.error))?;
        drop(file);
        // Make the rename itself durable; not every platform can open a directory.
        if let Ok(d) = std::fs::File::open(&dir) {
            let _ = d.sync_all();
        }
        let (_, stamp) = read_file(&self.path)?;
        Ok(Saved {
            path: self.path,
            backup,
            stamp,
        })
    }
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
