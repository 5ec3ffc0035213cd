//! Arbitrary and damaged text into the profile loader: no panic, and every error names the file
//! and a line and column that exist in the text.

use proptest::prelude::*;
use tidewright::profile::{BoatDoc, EngineDoc, ProfileError, demo};

/// The file name the loader is told, which every error must repeat.
const FILE: &str = "fuzzed.toml";

/// Checks one loader outcome against `text`: an error carries the file name and, where it
/// points into the text, a line and column inside it.
fn check<T>(result: Result<T, ProfileError>, text: &str) -> Result<(), TestCaseError> {
    let Err(error) = result else {
        return Ok(());
    };
    let message = error.to_string();
    prop_assert!(message.contains(FILE), "no file name in {message:?}");
    match &error {
        ProfileError::Syntax { .. } | ProfileError::Invalid { .. } => {}
        other => prop_assert!(false, "loading text gave a non-content error: {other}"),
    }
    let Some(location) = error.location() else {
        // An invalid document as a whole (e.g. no variant at all) has no one place.
        prop_assert!(matches!(error, ProfileError::Invalid { .. }), "{message}");
        return Ok(());
    };
    let lines: Vec<&str> = text.split('\n').collect();
    prop_assert!(
        location.line >= 1 && location.line <= lines.len(),
        "line {} of {} in {message:?}",
        location.line,
        lines.len()
    );
    let columns = lines[location.line - 1].chars().count() + 1;
    prop_assert!(
        location.column >= 1 && location.column <= columns,
        "column {} of {columns} in {message:?}",
        location.column
    );
    prop_assert!(
        message.contains(&format!("{FILE}:{location}")),
        "{message:?}"
    );
    Ok(())
}

/// The demo fleet's files, boats first.
fn demo_texts() -> Vec<&'static str> {
    demo::BOATS
        .iter()
        .chain(demo::ENGINES.iter())
        .map(|(_, text)| *text)
        .collect()
}

/// `text` with the characters `start..start + len` (counted in characters, clamped) replaced.
fn splice(text: &str, start: usize, len: usize, insert: &str) -> String {
    let chars: Vec<char> = text.chars().collect();
    let start = start.min(chars.len());
    let end = (start + len).min(chars.len());
    chars[..start]
        .iter()
        .chain(insert.chars().collect::<Vec<_>>().iter())
        .chain(chars[end..].iter())
        .collect()
}

/// Text that looks like TOML: keys, tables, quantities and punctuation in random order.
fn toml_like() -> impl Strategy<Value = String> {
    let piece = prop_oneof![
        Just("schema = 1\n".to_owned()),
        Just("[hull]\n".to_owned()),
        Just("[[variant]]\n".to_owned()),
        Just("[trip]\n".to_owned()),
        Just("name = \"x\"\n".to_owned()),
        Just("engine = \"brindmoor-3b40\"\n".to_owned()),
        Just("length_waterline = ".to_owned()),
        Just("\"7.9 m\"".to_owned()),
        Just("\"1e999 ft\"".to_owned()),
        Just("[".to_owned()),
        Just("]".to_owned()),
        Just("\"".to_owned()),
        Just("=".to_owned()),
        Just("\n".to_owned()),
        Just("#".to_owned()),
        "[a-z_]{1,12}".prop_map(|key| format!("{key} = ")),
        "\\PC{0,8}".prop_map(|text| format!("\"{text}\"")),
        any::<f64>().prop_map(|value| format!("{value}")),
        any::<i64>().prop_map(|value| format!("{value}")),
    ];
    proptest::collection::vec(piece, 0..24).prop_map(|pieces| pieces.concat())
}

proptest! {
    #![proptest_config(super::cases(192))]

    #[test]
    fn any_text_loads_or_fails_with_a_place(text in "\\PC{0,200}") {
        check(BoatDoc::from_toml(&text, FILE), &text)?;
        check(EngineDoc::from_toml(&text, FILE), &text)?;
    }

    #[test]
    fn toml_like_text_loads_or_fails_with_a_place(text in toml_like()) {
        check(BoatDoc::from_toml(&text, FILE), &text)?;
        check(EngineDoc::from_toml(&text, FILE), &text)?;
    }

    // A demo file with a random stretch replaced by random text: the loader either accepts a
    // document that validates, or says where it went wrong.
    #[test]
    fn damaged_demo_files_load_or_fail_with_a_place(
        which in 0usize..6,
        start in 0usize..2000,
        len in 0usize..40,
        insert in "\\PC{0,12}",
    ) {
        let texts = demo_texts();
        let text = splice(texts[which % texts.len()], start, len, &insert);
        match BoatDoc::from_toml(&text, FILE) {
            Ok(doc) => prop_assert!(doc.validate().is_empty(), "accepted but invalid: {:?}", doc.validate()),
            result => check(result, &text)?,
        }
        check(EngineDoc::from_toml(&text, FILE), &text)?;
    }

    // A random value in place of one quantity of a demo boat: an error is on that line.
    #[test]
    fn a_random_value_for_a_quantity_loads_or_fails_at_that_line(
        which in 0usize..3,
        line_pick in any::<prop::sample::Index>(),
        // No quote or backslash inside: those end or escape the TOML string itself, and then
        // the parser rightly reports the damage where the string ends, not on this line.
        value in prop_oneof!["[^\"\\\\\\p{C}]{0,16}".prop_map(|t| format!("\"{t}\"")), any::<f64>().prop_map(|v| v.to_string())],
    ) {
        let boats = &demo::BOATS;
        let source = boats[which % boats.len()].1;
        let quantity_lines: Vec<usize> = source
            .lines()
            .enumerate()
            .filter(|(_, line)| {
                // A quantity: a string value that starts with its number, e.g. "38 ft".
                line.split_once(" = \"")
                    .is_some_and(|(key, value)| {
                        !key.trim_start().starts_with('#')
                            && value.starts_with(|c: char| c.is_ascii_digit() || c == '-' || c == '.')
                    })
            })
            .map(|(i, _)| i)
            .collect();
        let target = quantity_lines[line_pick.index(quantity_lines.len())];
        let text: String = source
            .lines()
            .enumerate()
            .map(|(i, line)| {
                if i == target {
                    let key = line.split(" = ").next().unwrap_or(line);
                    format!("{key} = {value}\n")
                } else {
                    format!("{line}\n")
                }
            })
            .collect();
        match BoatDoc::from_toml(&text, FILE) {
            Ok(doc) => prop_assert!(doc.validate().is_empty()),
            Err(error) => {
                let line = error.location().map(|l| l.line);
                check(Err::<(), _>(error), &text)?;
                // A bad value is reported on its own line (TOML errors at the value itself).
                prop_assert!(line.is_none() || line == Some(target + 1) || !value.starts_with('"'),
                    "error at line {line:?}, value on line {}", target + 1);
            }
        }
    }
}
