//! Fuzz target: arbitrary bytes into the profile loader, as a boat and as an engine sheet.
//!
//! The loader must never panic; an accepted document must validate and survive a write and a
//! re-read; an error must name the file and, where it has a place, a line inside the text.

#![no_main]

use libfuzzer_sys::fuzz_target;
use tidewright::profile::{BoatDoc, EngineDoc, ProfileError};

/// The file name the loader is told.
const FILE: &str = "fuzz.toml";

/// Checks an error's file name and place against `text`.
fn check_error(error: &ProfileError, text: &str) {
    let message = error.to_string();
    assert!(message.contains(FILE), "no file name in {message:?}");
    if let Some(location) = error.location() {
        let lines = text.split('\n').count();
        assert!(
            (1..=lines).contains(&location.line) && location.column >= 1,
            "{message:?} points outside the text"
        );
    }
}

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    match BoatDoc::from_toml(text, FILE) {
        Ok(doc) => {
            assert!(doc.validate().is_empty(), "accepted an invalid boat");
            let written = doc.to_toml();
            let again = BoatDoc::from_toml(&written, FILE).expect("a written boat reads back");
            assert_eq!(again.to_toml(), written, "writing a boat is not stable");
        }
        Err(error) => check_error(&error, text),
    }
    match EngineDoc::from_toml(text, FILE) {
        Ok(doc) => {
            assert!(
                doc.validate().is_empty(),
                "accepted an invalid engine sheet"
            );
            let written = doc.to_toml();
            let again = EngineDoc::from_toml(&written, FILE).expect("a written sheet reads back");
            assert_eq!(
                again.to_toml(),
                written,
                "writing an engine sheet is not stable"
            );
        }
        Err(error) => check_error(&error, text),
    }
});
