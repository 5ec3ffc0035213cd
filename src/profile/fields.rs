//! Helpers shared by the boat and engine files and the store: the schema check, the unit
//! systems' names, choice names and safe profile names.

use super::error::{Issue, ProfileError};
use super::quantity::Reader;
use crate::units::UnitSystem;
use toml::Spanned;

/// Longest profile name accepted, characters.
pub const MAX_NAME_LEN: usize = 64;

/// The names of the unit systems as written in a file's `units` key.
pub(crate) const UNIT_SYSTEMS: [(&str, UnitSystem); 2] = [
    ("metric", UnitSystem::Metric),
    ("imperial", UnitSystem::Imperial),
];

/// The file name of `value` in `choices` (the first name when it has none).
pub(crate) fn name_of<T: PartialEq + Copy>(
    choices: &[(&'static str, T)],
    value: T,
) -> &'static str {
    choices
        .iter()
        .find(|(_, v)| *v == value)
        .map_or(choices[0].0, |(n, _)| n)
}

/// Refuses a file whose `schema` is not the one this build reads.
pub(crate) fn check_schema(r: &Reader<'_>, schema: &Spanned<i64>) -> Result<(), ProfileError> {
    if *schema.get_ref() == super::SCHEMA_VERSION {
        return Ok(());
    }
    Err(r.error(
        "schema",
        schema.span(),
        Issue::new(
            "schema",
            schema.get_ref().to_string(),
            format!("expected schema = {}", super::SCHEMA_VERSION),
        ),
    ))
}

/// Refuses names that could leave the store or misbehave as file names.
pub fn check_name(name: &str) -> Result<(), ProfileError> {
    let refuse = |reason| {
        Err(ProfileError::UnsafeName {
            name: name.to_owned(),
            reason,
        })
    };
    if name.is_empty() {
        return refuse("it is empty");
    }
    if name.chars().count() > MAX_NAME_LEN {
        return refuse("it is longer than 64 characters");
    }
    if name.contains(['/', '\\']) {
        return refuse("it contains a path separator");
    }
    if name.contains("..") {
        return refuse("it contains \"..\"");
    }
    if name.starts_with('.') {
        return refuse("it starts with a dot");
    }
    if name.chars().any(char::is_control) {
        return refuse("it contains a control character");
    }
    if !name
        .chars()
        .all(|c| c.is_ascii_alphanumeric() || matches!(c, '-' | '_' | '.'))
    {
        return refuse("it contains a character other than letters, digits, '-', '_' and '.'");
    }
    let stem = name.split('.').next().unwrap_or(name).to_ascii_lowercase();
    let reserved = matches!(stem.as_str(), "con" | "prn" | "aux" | "nul")
        || ((stem.starts_with("com") || stem.starts_with("lpt"))
            && stem.len() == 4
            && stem.as_bytes()[3].is_ascii_digit());
    if reserved {
        return refuse("it is a reserved device name on Windows");
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unsafe_names_are_refused_with_a_reason() {
        for (name, reason) in [
            ("", "empty"),
            ("../etc", "path separator"),
            ("a..b", ".."),
            (".hidden", "dot"),
            ("tab\there", "control"),
            ("sp ace", "other than"),
            ("nul", "reserved"),
            ("COM1.toml", "reserved"),
        ] {
            let err = check_name(name).unwrap_err().to_string();
            assert!(err.contains(reason), "{name:?}: {err}");
        }
        for ok in ["marram", "pintle-2", "old_boat.v2", "com10"] {
            assert!(check_name(ok).is_ok(), "{ok}");
        }
    }
}
