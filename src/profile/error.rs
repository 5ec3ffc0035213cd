//! Errors of profile files and the store, with file, line and column of the offending value.

use std::fmt;
use std::ops::Range;
use std::path::PathBuf;
use thiserror::Error;

/// A place in a profile file: 1-based line and column (in characters).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Location {
    /// Line, counted from 1.
    pub line: usize,
    /// Column in characters, counted from 1.
    pub column: usize,
}

impl Location {
    /// The line and column of byte `offset` in `source` (clamped to the text's end).
    pub fn of_offset(source: &str, offset: usize) -> Self {
        let mut offset = offset.min(source.len());
        while !source.is_char_boundary(offset) {
            offset -= 1;
        }
        let before = &source[..offset];
        let line = before.matches('\n').count() + 1;
        let line_start = before.rfind('\n').map_or(0, |i| i + 1);
        let column = source[line_start..offset].chars().count() + 1;
        Self { line, column }
    }
}

impl fmt::Display for Location {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}:{}", self.line, self.column)
    }
}

/// One validation problem of a document: which key, what was found, what was expected.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Issue {
    /// Dotted key path, e.g. `hull.length_waterline` or `variant[2].area_ratio` (numbered from 1).
    pub key: String,
    /// The value found, as written or formatted (empty when the key is missing).
    pub found: String,
    /// What is wrong and what was expected, e.g. `expected a positive length`.
    pub problem: String,
}

impl Issue {
    /// An issue at `key` with the value `found` and the explanation `problem`.
    pub fn new(
        key: impl Into<String>,
        found: impl Into<String>,
        problem: impl Into<String>,
    ) -> Self {
        Self {
            key: key.into(),
            found: found.into(),
            problem: problem.into(),
        }
    }
}

impl fmt::Display for Issue {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.found.is_empty() {
            write!(f, "{}: {}", self.key, self.problem)
        } else {
            write!(f, "{}: {}: {}", self.key, self.found, self.problem)
        }
    }
}

/// Why a profile could not be read, checked, built or saved.
#[derive(Debug, Error)]
pub enum ProfileError {
    /// The file is not valid TOML or does not fit the schema (unknown key, wrong type, missing key).
    #[error("{file}:{location}: {}{message}", key_prefix(key))]
    Syntax {
        /// The file as shown to the user.
        file: String,
        /// Where the problem is.
        location: Location,
        /// The key in effect at that place, when one can be named.
        key: Option<String>,
        /// The parser's description of the problem.
        message: String,
    },
    /// A value parsed but is not acceptable (bad unit, out of range, inconsistent).
    #[error("{file}:{}{issue}", location_prefix(location))]
    Invalid {
        /// The file as shown to the user (or the document's name when not from a file).
        file: String,
        /// Where the value is, if known (not known for a document edited in memory).
        location: Option<Location>,
        /// The key, the value and what was expected.
        issue: Issue,
    },
    /// A boat names an engine sheet that is in none of the places searched.
    #[error(
        "{file}:{}{field}: engine sheet {engine:?} not found; expected a file {engine}.toml in {}",
        location_prefix(location),
        searched_list(searched)
    )]
    EngineMissing {
        /// The boat file.
        file: String,
        /// Where the name is in the file, if known.
        location: Option<Location>,
        /// The key naming the sheet: "engine", or "as_found.engine" for the engine in the boat now.
        field: &'static str,
        /// The engine sheet name the boat asks for.
        engine: String,
        /// The places looked in, in order.
        searched: Vec<String>,
    },
    /// A boat or engine name that is not in the store (nor in the demo fleet).
    #[error("no {kind} named {name:?} in {place}")]
    NotFound {
        /// "boat" or "engine sheet".
        kind: &'static str,
        /// The name asked for.
        name: String,
        /// Where it was looked for.
        place: String,
    },
    /// A profile name that could escape the store or is unsafe as a file name.
    #[error(
        "profile name {name:?} is not allowed: {reason}; expected letters, digits, '-', '_' or '.' (not first)"
    )]
    UnsafeName {
        /// The name given.
        name: String,
        /// Why it is refused.
        reason: &'static str,
    },
    /// The file changed on disk since it was loaded; saving would lose those changes.
    #[error("{}: the file changed on disk since it was loaded; not overwritten (save again with force to replace it)", path.display())]
    ChangedOnDisk {
        /// The file.
        path: PathBuf,
    },
    /// The profile store has no place: no home directory and no `--profiles` or `TIDEWRIGHT_PROFILES`.
    #[error(
        "no profile directory: no home directory found; give one with --profiles DIR or TIDEWRIGHT_PROFILES"
    )]
    NoStoreDirectory,
    /// The store is the read-only demo fleet and cannot be written.
    #[error("the demo fleet is read-only; run `tidewright init` or give --profiles DIR to save")]
    ReadOnly,
    /// Reading a file or directory failed.
    // The OS error is part of this message and deliberately not a `source`, so that a chain
    // printed with `{:#}` shows it once.
    #[error("{}: cannot read: {os_error}", path.display())]
    Read {
        /// The file or directory.
        path: PathBuf,
        /// The operating system's error.
        os_error: std::io::Error,
    },
    /// Writing a file failed (nothing was replaced).
    #[error("{}: cannot write: {os_error}", path.display())]
    Write {
        /// The file or directory.
        path: PathBuf,
        /// The operating system's error.
        os_error: std::io::Error,
    },
    /// A boat name that is not in the store, with the names it may have meant.
    #[error("no {kind} named {name:?} in {place}; did you mean {}?", suggestions.join(" or "))]
    NotFoundNear {
        /// "boat" or "engine sheet".
        kind: &'static str,
        /// The name asked for.
        name: String,
        /// Where it was looked for.
        place: String,
        /// Close matches, each as `name (Display Name)`.
        suggestions: Vec<String>,
    },
    /// `new` would overwrite a file that is already there.
    #[error("{}: already exists; not overwritten (choose another name, or edit that file)", path.display())]
    AlreadyExists {
        /// The file.
        path: PathBuf,
    },
    /// Another save of the same file holds its lock.
    #[error("{}: another save of this file is under way (lock {}); try again", path.display(), lock.display())]
    Locked {
        /// The file being saved.
        path: PathBuf,
        /// The lock file.
        lock: PathBuf,
    },
}

fn key_prefix(key: &Option<String>) -> String {
    key.as_ref().map(|k| format!("{k}: ")).unwrap_or_default()
}

fn location_prefix(location: &Option<Location>) -> String {
    location
        .map(|l| format!("{l}: "))
        .unwrap_or_else(|| " ".to_owned())
}

fn searched_list(searched: &[String]) -> String {
    if searched.is_empty() {
        "no place (no store)".to_owned()
    } else {
        searched.join(", then ")
    }
}

impl ProfileError {
    /// A schema error from the `toml` crate, located in `source` and named by its key.
    pub(crate) fn from_toml(file: &str, source: &str, error: &toml::de::Error) -> Self {
        let span = error.span().unwrap_or(0..0);
        // Serde names Rust types; say what a user writes instead.
        let message = error
            .message()
            .trim()
            .replace('\n', " ")
            .replace("expected i64", "expected a whole number")
            .replace("expected f64", "expected a plain number");
        Self::Syntax {
            file: file.to_owned(),
            location: Location::of_offset(source, span.start),
            key: key_at(source, &span),
            message,
        }
    }

    /// An invalid value at byte `span` of `source` (no location when `span` is `None`).
    pub(crate) fn invalid(
        file: &str,
        source: &str,
        span: Option<Range<usize>>,
        issue: Issue,
    ) -> Self {
        Self::Invalid {
            file: file.to_owned(),
            location: span.map(|s| Location::of_offset(source, s.start)),
            issue,
        }
    }

    /// The validation issue, when this is an invalid-value error.
    pub fn issue(&self) -> Option<&Issue> {
        match self {
            Self::Invalid { issue, .. } => Some(issue),
            _ => None,
        }
    }

    /// The line and column, when the error points into a file.
    pub fn location(&self) -> Option<Location> {
        match self {
            Self::Syntax { location, .. } => Some(*location),
            Self::Invalid { location, .. } => *location,
            _ => None,
        }
    }
}

/// The dotted key whose line holds byte `span.start`: the table header in effect plus the key
/// written on that line (`[[x]]` tables are numbered from 1, e.g. `variant[2].pitch`).
fn key_at(source: &str, span: &Range<usize>) -> Option<String> {
    let start = span.start.min(source.len());
    let mut table: Option<String> = None;
    let mut counts: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    let mut offset = 0;
    for line in source.split_inclusive('\n') {
        let line_end = offset + line.len();
        let text = line.trim();
        let is_target = start >= offset && (start < line_end || line_end == source.len());
        if let Some(header) = text.strip_prefix("[[").and_then(|t| t.split("]]").next()) {
            let header = header.trim().to_owned();
            let n = counts.entry(header.clone()).or_insert(0);
            *n += 1;
            table = Some(format!("{header}[{n}]"));
            if is_target {
                return table;
            }
        } else if let Some(header) = text.strip_prefix('[').and_then(|t| t.split(']').next()) {
            table = Some(header.trim().to_owned());
            if is_target {
                return table;
            }
        } else if is_target {
            let key = text
                .split_once('=')
                .map(|(k, _)| k.trim().trim_matches('"').to_owned())
                .filter(|k| !k.is_empty() && !k.starts_with('#'));
            return match (table, key) {
                (Some(t), Some(k)) => Some(format!("{t}.{k}")),
                (None, Some(k)) => Some(k),
                (t, None) => t,
            };
        }
        offset = line_end;
    }
    table
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn offsets_become_lines_and_columns() {
        let text = "a = 1\nbé = \"x\"\n";
        assert_eq!(
            Location::of_offset(text, 0),
            Location { line: 1, column: 1 }
        );
        assert_eq!(
            Location::of_offset(text, 6),
            Location { line: 2, column: 1 }
        );
        // "bé = " is 5 characters but 6 bytes.
        assert_eq!(
            Location::of_offset(text, 12),
            Location { line: 2, column: 6 }
        );
        assert_eq!(Location::of_offset(text, 999).line, 3);
    }

    #[test]
    fn keys_are_named_with_their_table() {
        let text =
            "name = \"x\"\n[hull]\nlength = \"3 q\"\n[[variant]]\na = 1\n[[variant]]\npitch = 2\n";
        let at = |needle: &str| {
            let i = text.find(needle).unwrap();
            key_at(text, &(i..i + 1))
        };
        assert_eq!(at("name").as_deref(), Some("name"));
        assert_eq!(at("\"3 q\"").as_deref(), Some("hull.length"));
        assert_eq!(at("pitch").as_deref(), Some("variant[2].pitch"));
        assert_eq!(at("[hull]").as_deref(), Some("hull"));
    }

    #[test]
    fn display_names_file_line_key_and_expectation() {
        let err = ProfileError::Invalid {
            file: "boats/kestrel.toml".into(),
            location: Some(Location {
                line: 12,
                column: 9,
            }),
            issue: Issue::new(
                "hull.length",
                "\"11.2 q\"",
                "unknown unit \"q\"; expected a length in m, ft",
            ),
        };
        assert_eq!(
            err.to_string(),
            "boats/kestrel.toml:12:9: hull.length: \"11.2 q\": unknown unit \"q\"; expected a length in m, ft"
        );
    }
}
