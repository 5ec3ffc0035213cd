//! Saving a boat file: atomic, with a backup, a lock around the changed-on-disk check and
//! the rename, and never over a file that was not read.

use super::*;

/// Writes `text` to a new file at `path`, whole or not at all, never over an existing file.
pub(super) fn create_new_file(path: &Path, text: &str) -> Result<PathBuf, ProfileError> {
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
    // The generic prefix: this save holds no lock, so no other save may take the temporary
    // for its own.
    let mut temp = tempfile::Builder::new()
        .prefix(TEMPORARY_PREFIX)
        .suffix(TEMPORARY_SUFFIX)
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
    PendingSave::prepare_with(path, loaded, force, |previous| {
        boat_text(previous, doc, &path.display().to_string())
    })?
    .commit()
}

/// The text to save `doc` as, over a file that now holds `previous`: the boat's canonical text
/// merged into the user's (comments, order and unchanged values kept; [`crate::profile::preserve`]).
pub(super) fn boat_text(previous: Option<&[u8]>, doc: &BoatDoc, file: &str) -> Vec<u8> {
    preserved(previous, doc.to_toml(), |text| {
        BoatDoc::from_toml(text, file)
    })
}

/// The text to save the engine sheet `doc` as, as [`boat_text`] does for a boat.
pub(super) fn engine_text(previous: Option<&[u8]>, doc: &EngineDoc, file: &str) -> Vec<u8> {
    preserved(previous, doc.to_toml(), |text| {
        EngineDoc::from_toml(text, file)
    })
}

/// `canonical` merged into `previous`, kept only where the merged text reads back (with
/// `read`) to the very document the canonical text reads back to. The canonical text, not the
/// document in memory, is the reference: an edited value is written rounded to the file's
/// precision, and the merge must hold what the writer holds, no more.
fn preserved<T: PartialEq>(
    previous: Option<&[u8]>,
    canonical: String,
    read: impl Fn(&str) -> Result<T, ProfileError>,
) -> Vec<u8> {
    let Ok(target) = read(&canonical) else {
        return canonical.into_bytes();
    };
    let previous = previous.and_then(|bytes| std::str::from_utf8(bytes).ok());
    crate::profile::preserve::merge_into(previous, &canonical, |text| {
        read(text).is_ok_and(|doc| doc == target)
    })
    .into_bytes()
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

/// What every temporary file of a save starts with.
pub const TEMPORARY_PREFIX: &str = ".tidewright-";
/// What every temporary file of a save (and of a recovery file) ends with.
pub const TEMPORARY_SUFFIX: &str = ".tmp";
/// What a recovery file's temporary starts with (`tui::recovery` writes it beside the boat).
pub const RECOVERY_TEMPORARY_PREFIX: &str = ".recover-";
/// Random characters `tempfile` puts in a temporary's name (its default).
const TEMPORARY_RANDOM_LEN: usize = 6;

/// The prefix of the temporaries of a save of `path`: `.tidewright-NAME.toml-`, so that a
/// later save of the same file knows them for its own.
fn temporary_prefix(path: &Path) -> String {
    format!(
        "{TEMPORARY_PREFIX}{}-",
        path.file_name().unwrap_or_default().to_string_lossy()
    )
}

/// Whether `rest` is what `tempfile` puts between a prefix and the suffix.
fn is_random_part(rest: &str) -> bool {
    rest.len() == TEMPORARY_RANDOM_LEN && rest.bytes().all(|b| b.is_ascii_alphanumeric())
}

/// Whose a temporary file in the boat's folder is, judged by its name alone.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Temporary {
    /// A save of this very file (`.tidewright-NAME.toml-XXXXXX.tmp`).
    OfThisFile,
    /// A save of another file, a new file, an older version, or a recovery file
    /// (`.tidewright-XXXXXX.tmp`, `.tidewright-OTHER.toml-XXXXXX.tmp`, `.recover-XXXXXX.tmp`).
    OfAnother,
    /// Not a name tidewright gives its temporaries: never touched.
    NotOurs,
}

/// Classifies `name`, found beside the boat file `path`.
pub fn classify_temporary(name: &str, path: &Path) -> Temporary {
    let Some(stem) = name.strip_suffix(TEMPORARY_SUFFIX) else {
        return Temporary::NotOurs;
    };
    if let Some(rest) = stem.strip_prefix(&temporary_prefix(path))
        && is_random_part(rest)
    {
        return Temporary::OfThisFile;
    }
    if let Some(rest) = stem.strip_prefix(RECOVERY_TEMPORARY_PREFIX) {
        return if is_random_part(rest) {
            Temporary::OfAnother
        } else {
            Temporary::NotOurs
        };
    }
    let Some(rest) = stem.strip_prefix(TEMPORARY_PREFIX) else {
        return Temporary::NotOurs;
    };
    let random = rest
        .rsplit_once('-')
        .filter(|(file, _)| file.ends_with(".toml"))
        .map_or(rest, |(_, random)| random);
    if is_random_part(random) {
        Temporary::OfAnother
    } else {
        Temporary::NotOurs
    }
}

/// Removes what interrupted saves (a SIGKILL, a power cut) left beside `path`, while its lock
/// `lock` is held: this file's own temporaries older than the lock (no save of it can be
/// under way: it would hold the lock), and any other temporary of ours older than
/// [`STALE_LOCK_SECONDS`] as well (no save takes that long). A failure only leaves a file.
fn remove_stale_temporaries(path: &Path, lock: &Path) {
    let Some(dir) = path.parent().filter(|p| !p.as_os_str().is_empty()) else {
        return;
    };
    let Ok(locked_at) = std::fs::metadata(lock).and_then(|m| m.modified()) else {
        return;
    };
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for entry in entries.flatten() {
        let name = entry.file_name();
        let kind = classify_temporary(&name.to_string_lossy(), path);
        if kind == Temporary::NotOurs {
            continue;
        }
        let Ok(meta) = entry.metadata() else { continue };
        let Ok(modified) = meta.modified() else {
            continue;
        };
        let before_lock = modified < locked_at;
        let old = modified
            .elapsed()
            .is_ok_and(|age| age.as_secs() >= STALE_LOCK_SECONDS);
        let stale = match kind {
            Temporary::OfThisFile => before_lock,
            Temporary::OfAnother => before_lock && old,
            Temporary::NotOurs => false,
        };
        if stale && meta.is_file() {
            let _ = std::fs::remove_file(entry.path());
        }
    }
}

/// A lock file older than this is taken to be left by a save that died, and is taken over, s.
pub const STALE_LOCK_SECONDS: u64 = 30;

/// How long a save waits for another save of the same file to finish, ms.
pub(super) const LOCK_WAIT_MS: u64 = 5_000;

/// An exclusive lock on saving one file: `.NAME.toml.lock` beside it, created with
/// `create_new` (atomic on local file systems) and removed on drop.
#[derive(Debug)]
pub(super) struct SaveLock {
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
pub(super) fn stale_lock(lock: &Path) -> Option<String> {
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
pub(super) fn take_over(lock: &Path, left: &str) {
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
        Self::prepare_with(path, loaded, force, |_| contents.to_vec())
    }

    /// As [`PendingSave::prepare`], with the contents made from the file's current bytes
    /// (`None` when there is no file yet), read under the lock after the changed-on-disk check.
    pub fn prepare_with(
        path: &Path,
        loaded: Option<&FileStamp>,
        force: bool,
        contents: impl FnOnce(Option<&[u8]>) -> Vec<u8>,
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
        remove_stale_temporaries(path, &lock.path);
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
            .prefix(&temporary_prefix(path))
            .suffix(TEMPORARY_SUFFIX)
            .tempfile_in(dir)
            .map_err(write_error)?;
        let contents = contents(previous.as_deref());
        temp.write_all(&contents).map_err(write_error)?;
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
                    .prefix(&temporary_prefix(&self.path))
                    .suffix(TEMPORARY_SUFFIX)
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
    fn temporaries_are_known_by_name() {
        let boat = Path::new("/store/boats/marram.toml");
        let of = |name| classify_temporary(name, boat);
        assert_eq!(
            of(".tidewright-marram.toml-a1B2c3.tmp"),
            Temporary::OfThisFile
        );
        assert_eq!(
            of(".tidewright-pintle.toml-a1B2c3.tmp"),
            Temporary::OfAnother
        );
        assert_eq!(of(".tidewright-a1B2c3.tmp"), Temporary::OfAnother);
        assert_eq!(of(".recover-a1B2c3.tmp"), Temporary::OfAnother);
        for name in [
            ".tidewright-marram.toml-a1B2c3.tmp.bak",
            ".tidewright-marram.toml-a1B2c.tmp",
            ".tidewright-my-own.tmp",
            ".recover-x.tmp",
            "marram.toml",
            ".marram.toml.lock",
        ] {
            assert_eq!(of(name), Temporary::NotOurs, "{name}");
        }
    }
}
