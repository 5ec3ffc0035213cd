//! The recovery file: unsaved edits written when the terminal drops or a SIGHUP/SIGTERM ends
//! the program, offered back on the next open, removed by a save or a clean quit.
//!
//! It sits beside the boat's file (`boats/NAME.toml.recover`), or for the read-only demo fleet
//! in the XDG state directory (`~/.local/state/tidewright/NAME.toml.recover`). When the boat's
//! folder cannot be written (a read-only mount, a full disk) it goes to the state directory
//! too, named after the boat and its file's path (`NAME-HASH.toml.recover`), where the next
//! open of that file looks as well ([`places`], [`find`]). When no place can be written the
//! caller is told ([`write_first`]), so the loss is never silent. It is written atomically (a
//! temporary file in the same folder, then a rename), so a second drop while writing leaves
//! either the old recovery file or the new one, never half of one.

use crate::profile::BoatDoc;
use std::io::Write;
use std::path::{Path, PathBuf};

/// What is appended to the boat file's name to name its recovery file.
pub const SUFFIX: &str = ".recover";

/// The recovery file for the boat saved at `boat_file`.
pub fn beside(boat_file: &Path) -> PathBuf {
    let mut name = boat_file.as_os_str().to_owned();
    name.push(SUFFIX);
    PathBuf::from(name)
}

/// The user's state directory for tidewright (XDG state dir, else the local data dir's
/// `state/`), if the system has one.
fn state_dir() -> Option<PathBuf> {
    let dirs = directories::ProjectDirs::from("", "", "tidewright")?;
    Some(
        dirs.state_dir()
            .map(Path::to_owned)
            .unwrap_or_else(|| dirs.data_local_dir().join("state")),
    )
}

/// The recovery file for demo boat `name`, in the XDG state directory (if there is one).
pub fn for_demo(name: &str) -> Option<PathBuf> {
    Some(state_dir()?.join(format!("{name}.toml{SUFFIX}")))
}

/// 64-bit FNV-1a of `bytes`: a short, stable tag for a path (not for security).
fn fnv1a(bytes: &[u8]) -> u64 {
    bytes.iter().fold(0xcbf2_9ce4_8422_2325, |hash, b| {
        (hash ^ u64::from(*b)).wrapping_mul(0x0100_0000_01b3)
    })
}

/// Where the recovery file of the boat saved at `boat_file` goes when its folder cannot be
/// written: the state directory, named after the boat and a hash of the file's absolute path
/// so that two stores' boats of one name keep apart.
pub fn fallback_for(boat_file: &Path) -> Option<PathBuf> {
    let absolute = std::path::absolute(boat_file).unwrap_or_else(|_| boat_file.to_owned());
    let stem = boat_file.file_stem()?.to_string_lossy();
    let tag = fnv1a(absolute.as_os_str().as_encoded_bytes());
    Some(state_dir()?.join(format!("{stem}-{tag:016x}.toml{SUFFIX}")))
}

/// Every place the recovery file of a boat may be, in the order they are tried: beside
/// `boat_file` then its fallback; for the demo (`boat_file` `None`) the state directory.
pub fn places(boat_file: Option<&Path>, demo_name: &str) -> Vec<PathBuf> {
    match boat_file {
        Some(file) => std::iter::once(beside(file))
            .chain(fallback_for(file))
            .collect(),
        None => for_demo(demo_name).into_iter().collect(),
    }
}

/// The newest recovery file among `places` (an older one may be left where it could not be
/// removed, such as beside a boat on a folder that became read-only).
pub fn find(places: &[PathBuf]) -> Option<PathBuf> {
    places
        .iter()
        .filter(|p| p.is_file())
        .max_by_key(|p| std::fs::metadata(p).and_then(|m| m.modified()).ok())
        .cloned()
}

/// Writes `text` with `write` to the first of `places` that takes it, removing older recovery
/// files from the other places where it can; the place written, or a message naming every
/// place and why it failed. `write` is [`write_text`]
/// outside tests, which give it failures of their own.
pub fn write_first(
    places: &[PathBuf],
    text: &str,
    write: impl Fn(&Path, &str) -> std::io::Result<()>,
) -> Result<PathBuf, String> {
    let mut failures = Vec::new();
    for (index, place) in places.iter().enumerate() {
        match write(place, text) {
            Ok(()) => {
                for (other_index, other) in places.iter().enumerate() {
                    if other_index != index {
                        let _ = remove(other);
                    }
                }
                return Ok(place.clone());
            }
            Err(e) => failures.push(format!("{}: {e}", place.display())),
        }
    }
    if failures.is_empty() {
        return Err("there is no place for a recovery file (no state directory)".into());
    }
    Err(failures.join("; "))
}

/// Writes `boat` to `path` atomically, creating its folder if needed.
pub fn write(path: &Path, boat: &BoatDoc) -> std::io::Result<()> {
    write_text(path, &boat.to_toml())
}

/// Writes a boat document's TOML `text` to `path` atomically, creating its folder if needed.
pub fn write_text(path: &Path, text: &str) -> std::io::Result<()> {
    let dir = path.parent().unwrap_or(Path::new("."));
    std::fs::create_dir_all(dir)?;
    let mut file = tempfile::Builder::new()
        .prefix(crate::profile::store::RECOVERY_TEMPORARY_PREFIX)
        .suffix(crate::profile::store::TEMPORARY_SUFFIX)
        .tempfile_in(dir)?;
    file.write_all(text.as_bytes())?;
    file.as_file().sync_all()?;
    file.persist(path).map_err(|e| e.error)?;
    Ok(())
}

/// Reads the recovery file at `path` back as a boat document; the message names the file.
pub fn read(path: &Path) -> Result<BoatDoc, String> {
    let text = std::fs::read_to_string(path)
        .map_err(|e| format!("cannot read the recovery file {}: {e}", path.display()))?;
    BoatDoc::from_toml(&text, &path.display().to_string()).map_err(|e| e.to_string())
}

/// Removes the recovery file at `path`; a missing one is not an error.
pub fn remove(path: &Path) -> std::io::Result<()> {
    match std::fs::remove_file(path) {
        Err(e) if e.kind() != std::io::ErrorKind::NotFound => Err(e),
        _ => Ok(()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_folder_that_cannot_be_written_sends_the_file_to_the_next_place_or_says_so() {
        let dir = tempfile::tempdir().unwrap();
        let places = vec![
            dir.path().join("boats/b.toml.recover"),
            dir.path().join("state/b.recover"),
        ];
        let refuse_boats = |path: &Path, text: &str| {
            if path.starts_with(dir.path().join("boats")) {
                Err(std::io::Error::from(std::io::ErrorKind::ReadOnlyFilesystem))
            } else {
                write_text(path, text)
            }
        };
        assert_eq!(
            write_first(&places, "x", refuse_boats),
            Ok(places[1].clone())
        );
        assert_eq!(find(&places), Some(places[1].clone()));
        // Writable again: the file goes beside the boat and the fallback's copy is removed.
        assert_eq!(write_first(&places, "y", write_text), Ok(places[0].clone()));
        assert_eq!(find(&places), Some(places[0].clone()));
        assert!(!places[1].exists());
        let refuse_all = |_: &Path, _: &str| Err(std::io::Error::other("disk gone"));
        let why = write_first(&places, "z", refuse_all).unwrap_err();
        assert!(why.contains("boats/b.toml.recover: disk gone"), "{why}");
        assert!(why.contains("state/b.recover: disk gone"), "{why}");
        assert!(
            write_first(&[], "z", write_text)
                .unwrap_err()
                .contains("no place")
        );
    }

    #[test]
    fn the_fallback_keeps_two_stores_boats_apart() {
        let a = fallback_for(Path::new("/one/boats/marram.toml"));
        let b = fallback_for(Path::new("/two/boats/marram.toml"));
        if let (Some(a), Some(b)) = (a, b) {
            assert_ne!(a, b);
            assert!(
                a.file_name()
                    .unwrap()
                    .to_string_lossy()
                    .starts_with("marram-")
            );
            assert_eq!(Some(a), fallback_for(Path::new("/one/boats/marram.toml")));
        }
    }

    #[test]
    fn the_recovery_file_sits_beside_the_boat_and_round_trips() {
        let dir = tempfile::tempdir().unwrap();
        let store = crate::profile::Store::at(dir.path().join("p"));
        store.init().unwrap();
        let path = store.boat_path("marram").unwrap();
        let mut boat = store.load_boat("marram").unwrap().doc;
        boat.name = "edited".into();
        let recover = beside(&path);
        assert!(
            recover
                .to_string_lossy()
                .ends_with("boats/marram.toml.recover")
        );
        write(&recover, &boat).unwrap();
        assert_eq!(read(&recover).unwrap().name, "edited");
        // No temporary file is left beside it.
        let left: Vec<_> = std::fs::read_dir(path.parent().unwrap())
            .unwrap()
            .filter_map(|e| e.ok())
            .filter(|e| e.file_name().to_string_lossy().ends_with(".tmp"))
            .collect();
        assert!(left.is_empty());
        remove(&recover).unwrap();
        assert!(!recover.exists());
        remove(&recover).unwrap();
    }
}
