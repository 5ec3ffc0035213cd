//! Fuzz target: arbitrary bytes into the quantity parser, for every kind.
//!
//! The parser must never panic, must return only finite values, and an error that points into
//! the text must point inside it.

#![no_main]

use libfuzzer_sys::fuzz_target;
use tidewright::units::{Kind, UnitError, parse};

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let length = text.chars().count();
    for kind in Kind::ALL {
        match parse(text, kind) {
            Ok(value) => assert!(value.is_finite(), "{text:?} as {kind:?} gave {value}"),
            Err(
                UnitError::NoNumber { position, .. }
                | UnitError::UnknownUnit { position, .. }
                | UnitError::Trailing { position, .. }
                | UnitError::Comma { position, .. },
            ) => assert!(
                position <= length,
                "{text:?}: position {position} past the end"
            ),
            Err(
                UnitError::MissingUnit { .. }
                | UnitError::NotFinite { .. }
                | UnitError::Blank { .. }
                | UnitError::BadRatio { .. },
            ) => {}
        }
    }
});
