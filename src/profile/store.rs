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
    let bytes = std::fs::read(path).map_err(|os_error| ProfileError::Read {
        path: path.to_owned(),
        os_error,
    })?;
    let modified = std::fs::metadata(path).and_then(|m| m.modified()).ok();
    let stamp = FileStamp::of(&bytes, modified);
    let text =
        String::from_utf8(bytes).map_err(|e| not_utf8(path, e.as_bytes(), e.utf8_error()))?;
    Ok((text, stamp))
}

/// "FILE:LINE:COL: not UTF-8 text (byte 0xE9); save the file as UTF-8" for the first bad byte.
fn not_utf8(path: &Path, bytes: &[u8], error: std::str::Utf8Error) -> ProfileError {
    let at = error.valid_up_to();
    // Everything before the bad byte is valid UTF-8, so its lines and columns can be counted.
    let before = std::str::from_utf8(&bytes[..at]).unwrap_or_default();
    ProfileError::Syntax {
        file: path.display().to_string(),
        location: super::error::Location::of_offset(before, before.len()),
        key: None,
        message: format!(
            "not UTF-8 text (byte 0x{:02X}); save the file as UTF-8",
            bytes.get(at).copied().unwrap_or_default()
        ),
    }
}

/// The text of a profile file with its stamp; a byte that is not UTF-8 is named with its
/// line and column.
pub fn read_profile_file(path: &Path) -> Result<(String, FileStamp), ProfileError> {
    read_file(path)
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

/// `name` without a trailing ".toml" (a profile name written as its file's name).
pub fn strip_extension(name: &str) -> &str {
    name.strip_suffix(".toml").unwrap_or(name)
}

/// Largest edit distance at which a name is suggested for a mistyped one.
const MAX_SUGGESTION_EDITS: usize = 2;

/// Levenshtein distance between `a` and `b`, in characters.
fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut row: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut diagonal = row[0];
        row[0] = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let above = row[j + 1];
            row[j + 1] = (above + 1)
                .min(row[j] + 1)
                .min(diagonal + usize::from(ca != *cb));
            diagonal = above;
        }
    }
    row[b.len()]
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
        // `engine = "x.toml"` names the sheet x.
        let name = &strip_extension(&boat.doc.engine).to_owned();
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

/// Writes `text` to a new file at `path`, whole or not at all, never over an existing file.
fn create_new_file(path: &Path, text: &str) -> Result<PathBuf, ProfileError> {
    let write_error = |os_error| ProfileError::Write {
        path: path.to_owned(),
        os_error,
    };
    if path.exists() {
        return Err(ProfileError::AlreadyExists {
            path: path.to_owned(),
        });
    }
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    std::fs::create_dir_all(dir).map_err(write_error)?;
    let mut temp = tempfile::Builder::new()
        .prefix(".tidewright-")
        .suffix(".tmp")
        .tempfile_in(dir)
        .map_err(write_error)?;
    temp.write_all(text.as_bytes()).map_err(write_error)?;
    temp.as_file().sync_all().map_err(write_error)?;
    // No-clobber rename: a file created meanwhile by someone else is kept.
    temp.persist_noclobber(path).map_err(|e| {
        if e.error.kind() == std::io::ErrorKind::AlreadyExists {
            ProfileError::AlreadyExists {
                path: path.to_owned(),
            }
        } else {
            write_error(e.error)
        }
    })?;
    Ok(path.to_owned())
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
    /// Held from the changed-on-disk check to the rename, so that two saves cannot both pass
    /// the check and the later rename silently drop the earlier update.
    _lock: SaveLock,
}

/// A lock file older than this is taken to be left by a save that died, and is taken over, s.
pub const STALE_LOCK_SECONDS: u64 = 30;

/// How long a save waits for another save of the same file to finish, ms.
const LOCK_WAIT_MS: u64 = 5_000;

/// An exclusive lock on saving one file: `.NAME.toml.lock` beside it, created with
/// `create_new` (atomic on local file systems) and removed on drop.
#[derive(Debug)]
struct SaveLock {
    path: PathBuf,
}

impl SaveLock {
    /// The lock file of `path`.
    fn path_for(path: &Path) -> PathBuf {
        let mut name = std::ffi::OsString::from(".");
        name.push(path.file_name().unwrap_or_default());
        name.push(".lock");
        path.with_file_name(name)
    }

    /// Takes the lock of `path`, waiting for another save to finish and taking over a lock
    /// left by a save that died (older than [`STALE_LOCK_SECONDS`]).
    fn acquire(path: &Path) -> Result<Self, ProfileError> {
        let lock = Self::path_for(path);
        let started = std::time::Instant::now();
        loop {
            match std::fs::OpenOptions::new()
                .write(true)
                .create_new(true)
                .open(&lock)
            {
                Ok(mut file) => {
                    // Who holds it, for a person looking at a lock left behind.
                    let _ = writeln!(file, "{}", std::process::id());
                    return Ok(Self { path: lock });
                }
                Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => {
                    if let Some(left) = stale_lock(&lock) {
                        take_over(&lock, &left);
                        continue;
                    }
                    if started.elapsed().as_millis() >= u128::from(LOCK_WAIT_MS) {
                        return Err(ProfileError::Locked {
                            path: path.to_owned(),
                            lock,
                        });
                    }
                    std::thread::sleep(std::time::Duration::from_millis(5));
                }
                Err(os_error) => {
                    return Err(ProfileError::Write {
                        path: lock,
                        os_error,
                    });
                }
            }
        }
    }
}

/// The content of `lock` when it was left by a save that died: its process is gone (where the
/// system lists processes in /proc), or it is older than [`STALE_LOCK_SECONDS`].
fn stale_lock(lock: &Path) -> Option<String> {
    let content = std::fs::read_to_string(lock).ok()?;
    let owner_gone = content
        .trim()
        .parse::<u32>()
        .ok()
        .filter(|&pid| pid != std::process::id())
        .is_some_and(|pid| {
            Path::new("/proc/self").exists() && !Path::new(&format!("/proc/{pid}")).exists()
        });
    let age = std::fs::metadata(lock)
        .and_then(|m| m.modified())
        .ok()
        .and_then(|t| t.elapsed().ok());
    let old = age.is_some_and(|a| a.as_secs() >= STALE_LOCK_SECONDS);
    (owner_gone || old).then_some(content)
}

/// Removes the stale lock whose content was `left`; moved aside first, so that a fresh lock
/// another process took in the meantime is put back rather than deleted.
fn take_over(lock: &Path, left: &str) {
    let mut aside = lock.as_os_str().to_owned();
    aside.push(format!(".stale-{}", std::process::id()));
    let aside = PathBuf::from(aside);
    if std::fs::rename(lock, &aside).is_err() {
        return;
    }
    if std::fs::read_to_string(&aside).ok().as_deref() == Some(left) {
        let _ = std::fs::remove_file(&aside);
    } else {
        let _ = std::fs::rename(&aside, lock);
    }
}

impl Drop for SaveLock {
    fn drop(&mut self) {
        let _ = std::fs::remove_file(&self.path);
    }
}

impl PendingSave {
    /// Checks for changes on disk and writes `contents` to a synced temporary file.
    pub fn prepare(
        path: &Path,
        contents: &[u8],
        loaded: Option<&FileStamp>,
        force: bool,
    ) -> Result<Self, ProfileError> {
        let write_error = |os_error| ProfileError::Write {
            path: path.to_owned(),
            os_error,
        };
        let dir = path
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .unwrap_or(Path::new("."));
        std::fs::create_dir_all(dir).map_err(write_error)?;
        let lock = SaveLock::acquire(path)?;
        let previous = match std::fs::read(path) {
            Ok(bytes) => Some(bytes),
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => None,
            Err(os_error) => {
                return Err(ProfileError::Read {
                    path: path.to_owned(),
                    os_error,
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
            _lock: lock,
        })
    }

    /// Keeps the previous version as `NAME.toml.bak`, renames the new file into place and
    /// syncs the directory.
    pub fn commit(self) -> Result<Saved, ProfileError> {
        let write_error = |path: &Path, os_error| ProfileError::Write {
            path: path.to_owned(),
            os_error,
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
