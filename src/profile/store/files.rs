//! Reading profile files: UTF-8 text with its stamp, and the names a user types for them.

use super::*;

pub(super) fn read_file(path: &Path) -> Result<(String, FileStamp), ProfileError> {
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
pub(super) fn not_utf8(path: &Path, bytes: &[u8], error: std::str::Utf8Error) -> ProfileError {
    let at = error.valid_up_to();
    // Everything before the bad byte is valid UTF-8, so its lines and columns can be counted.
    let before = std::str::from_utf8(&bytes[..at]).unwrap_or_default();
    ProfileError::Syntax {
        file: path.display().to_string(),
        location: crate::profile::error::Location::of_offset(before, before.len()),
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
pub(super) const MAX_SUGGESTION_EDITS: usize = 2;

/// Levenshtein distance between `a` and `b`, in characters.
pub(super) fn edit_distance(a: &str, b: &str) -> usize {
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

pub(super) fn stem(path: &Path) -> String {
    path.file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default()
}

/// Whether a BOAT argument is a path to a file rather than a name in the store.
pub fn is_path_argument(arg: &str) -> bool {
    arg.contains(['/', '\\']) || arg.ends_with(".toml")
}
