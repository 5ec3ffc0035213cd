//! Commented starting sheets for a new boat or engine (`tidewright new boat NAME`).
//!
//! A template is a TOML file with every key explained in a comment. Values the user must supply
//! are written as the blank [`BLANK`] (`key = "FILL IN"`): a blank never parses as a value, so
//! `check` refuses the file, naming the file, line and key of the first blank, until every
//! blank is replaced. Values with a common-practice default (efficiencies, margins, fuel
//! density) are filled in and marked so. A blank is replaced as a whole line, as `sed` would:
//! `sed -i 's/^length_waterline = "FILL IN"/length_waterline = "11.2 m"/' boats/NAME.toml`.

use super::error::{Issue, ProfileError};
use crate::units::UnitSystem;
use std::ops::Range;
use toml::Spanned;
use toml::de::{DeTable, DeValue};

/// The text of a blank left for the user to fill in.
pub const BLANK: &str = "FILL IN";

/// The placeholder in the template files replaced by the profile's name.
const NAME_PLACEHOLDER: &str = "{{NAME}}";

const BOAT_METRIC: &str = include_str!("../../profiles/templates/boat-metric.toml");
const BOAT_IMPERIAL: &str = include_str!("../../profiles/templates/boat-imperial.toml");
const ENGINE_METRIC: &str = include_str!("../../profiles/templates/engine-metric.toml");
const ENGINE_IMPERIAL: &str = include_str!("../../profiles/templates/engine-imperial.toml");

/// A commented boat sheet named `name`, written in `system`, with blanks for the user's values.
pub fn boat_template(name: &str, system: UnitSystem) -> String {
    let text = match system {
        UnitSystem::Metric => BOAT_METRIC,
        UnitSystem::Imperial => BOAT_IMPERIAL,
    };
    with_name(text, name)
}

/// A commented engine sheet named `name`, written in `system`, with blanks for the maker's data.
pub fn engine_template(name: &str, system: UnitSystem) -> String {
    let text = match system {
        UnitSystem::Metric => ENGINE_METRIC,
        UnitSystem::Imperial => ENGINE_IMPERIAL,
    };
    with_name(text, name)
}

/// The dotted keys whose value in `text` is still a blank, in file order (`hull.draft`,
/// `variant[1].pitch`); empty when every blank is filled or the text is not TOML.
///
/// For `new` to list what to fill in, and for `check` to name every blank at once.
pub fn unfilled_keys(text: &str) -> Vec<String> {
    blanks(text).into_iter().map(|(key, _)| key).collect()
}

/// Each key whose value in `text` is still a blank, with the byte span of that value, in file
/// order; empty when every blank is filled or the text is not TOML.
pub fn blanks(text: &str) -> Vec<(String, Range<usize>)> {
    let Ok(table) = toml::de::DeTable::parse(text) else {
        return Vec::new();
    };
    let mut found = Vec::new();
    collect_table(table.get_ref(), "", &mut found);
    found.sort_by_key(|(_, span)| span.start);
    found
}

/// Adds to `found` every key under `table` (itself at dotted `path`) whose value is a blank.
fn collect_table(table: &DeTable<'_>, path: &str, found: &mut Vec<(String, Range<usize>)>) {
    for (key, value) in table {
        let full = if path.is_empty() {
            key.get_ref().to_string()
        } else {
            format!("{path}.{}", key.get_ref())
        };
        collect_value(value, &full, found);
    }
}

/// Adds to `found` the blank `value` at `path`, or the blanks inside it.
fn collect_value(
    value: &Spanned<DeValue<'_>>,
    path: &str,
    found: &mut Vec<(String, Range<usize>)>,
) {
    match value.get_ref() {
        DeValue::String(text) if text.trim().eq_ignore_ascii_case(BLANK) => {
            found.push((path.to_owned(), value.span()));
        }
        DeValue::Table(table) => collect_table(table, path, found),
        // An array of tables (`[[variant]]`) is numbered from 1, as in error messages.
        DeValue::Array(items) => {
            for (index, item) in items.iter().enumerate() {
                if let DeValue::Table(table) = item.get_ref() {
                    collect_table(table, &format!("{path}[{}]", index + 1), found);
                }
            }
        }
        _ => {}
    }
}

/// One error per blank left in `source` (shown as `file`), each at its line and column.
pub(crate) fn blank_errors(file: &str, source: &str) -> Vec<ProfileError> {
    blanks(source)
        .into_iter()
        .map(|(key, span)| {
            let issue = Issue::new(
                key,
                format!("{BLANK:?}"),
                "still the template's blank; expected your value (see the comment beside it)",
            );
            ProfileError::invalid(file, source, Some(span), issue)
        })
        .collect()
}

/// Refuses a file with a blank left, at the first blank, saying how many more there are.
pub(crate) fn refuse_blanks(file: &str, source: &str) -> Result<(), ProfileError> {
    let mut errors = blank_errors(file, source);
    if errors.is_empty() {
        return Ok(());
    }
    let more = errors.len() - 1;
    let mut first = errors.swap_remove(0);
    if let ProfileError::Invalid { issue, .. } = &mut first
        && more > 0
    {
        issue.problem.push_str(&format!(
            " ({more} more blank{}; `tidewright check` lists them all)",
            if more == 1 { "" } else { "s" }
        ));
    }
    Err(first)
}

/// `text` with the name placeholder replaced by `name`, escaped for a TOML basic string.
fn with_name(text: &str, name: &str) -> String {
    let escaped: String = name
        .chars()
        .flat_map(|c| match c {
            '"' => vec!['\\', '"'],
            '\\' => vec!['\\', '\\'],
            c if c.is_control() => vec![' '],
            c => vec![c],
        })
        .collect();
    text.replace(NAME_PLACEHOLDER, &escaped)
}

#[cfg(test)]
mod tests {
    use super::*;

    const SYSTEMS: [UnitSystem; 2] = [UnitSystem::Metric, UnitSystem::Imperial];

    #[test]
    fn templates_are_toml_with_their_name_and_blanks() {
        for system in SYSTEMS {
            for text in [
                boat_template("Kittiwake \"II\"", system),
                engine_template("Kittiwake \"II\"", system),
            ] {
                let table: toml::Table = toml::from_str(&text).expect("a template is TOML");
                assert_eq!(table["name"].as_str(), Some("Kittiwake \"II\""));
                assert!(!text.contains(NAME_PLACEHOLDER));
                assert!(!unfilled_keys(&text).is_empty());
            }
        }
    }

    #[test]
    fn the_blanks_are_listed_with_their_tables() {
        let keys = unfilled_keys(&boat_template("x", UnitSystem::Metric));
        assert_eq!(keys.first().map(String::as_str), Some("engine"));
        for key in ["hull.draft", "load.half.displacement", "variant[1].pitch"] {
            assert!(keys.iter().any(|k| k == key), "{key} in {keys:?}");
        }
        assert!(unfilled_keys("a = \"11.2 m\"").is_empty());
    }

    #[test]
    fn each_system_writes_its_own_units() {
        let metric = boat_template("x", UnitSystem::Metric);
        let imperial = boat_template("x", UnitSystem::Imperial);
        assert!(metric.contains("units = \"metric\"") && metric.contains("\"11.2 m\""));
        assert!(imperial.contains("units = \"imperial\"") && imperial.contains("\"36 ft 9 in\""));
        assert!(!imperial.contains(" mm\"") && !imperial.contains(" kW\""));
    }
}
