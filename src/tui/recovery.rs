//! The recovery file: unsaved edits written when the terminal drops or a SIGHUP/SIGTERM ends
//! the program, offered back on the next open, removed by a save or a clean quit.
//!
//! It sits beside the boat's file (`boats/NAME.toml.recover`), or for the read-only demo fleet
//! in the XDG state directory (`~/.local/state/tidewright/NAME.toml.recover`). It is written
//! atomically (a temporary file in the same folder, then a rename), so a second drop while
//! writing leaves either the old recovery file or the new one, never half of one.

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

/// The recovery file for demo boat `name`, in the XDG state directory (if there is one).
pub fn for_demo(name: &str) -> Option<PathBuf> {
    let dirs = directories::ProjectDirs::from("", "", "tidewright")?;
    let dir = dirs
        .state_dir()
        .map(Path::to_owned)
        .unwrap_or_else(|| dirs.data_local_dir().join("state"));
    Some(dir.join(format!("{name}.toml{SUFFIX}")))
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
