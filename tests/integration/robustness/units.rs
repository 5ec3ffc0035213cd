//! Arbitrary text into the quantity parser: no panic, finite values only, and every error says
//! where in the text it went wrong (or quotes the whole text when the text as a whole is wrong).

use proptest::prelude::*;
use tidewright::units::{Kind, UnitError, parse};

/// Pieces that look like the start, middle or end of a real quantity, so that random joins
/// reach deep into the parser (compound lengths, exponents, unit spellings, stray symbols).
const PIECES: [&str; 40] = [
    "0",
    "1",
    "36",
    "9.5",
    ".5",
    "1e308",
    "1e309",
    "-",
    "+",
    "−",
    "e",
    "E+",
    "ft",
    "in",
    "'",
    "\"",
    "m",
    "mm",
    "kn",
    "kW",
    "hp",
    "%",
    "L",
    "gal",
    "US gal",
    "g/kWh",
    "lb/(hp·h)",
    "°C",
    "°F",
    "t",
    "lb",
    "rpm",
    "m/s",
    "m²",
    "ft3",
    " ",
    "  ",
    "·",
    "/",
    "é",
];

/// Checks the contract of one parse: a finite value, or an error whose position (where it has
/// one) lies inside the text and points at what it names, and whose message quotes the text.
fn check(text: &str, kind: Kind) -> Result<(), TestCaseError> {
    let chars: Vec<char> = text.chars().collect();
    let at =
        |position: usize, len: usize| -> String { chars.iter().skip(position).take(len).collect() };
    match parse(text, kind) {
        Ok(value) => prop_assert!(value.is_finite(), "{text:?} as {kind:?} gave {value}"),
        Err(error) => {
            let message = error.to_string();
            prop_assert!(!message.is_empty());
            match &error {
                UnitError::NoNumber { position, .. } => {
                    prop_assert!(*position <= chars.len(), "{message}");
                    prop_assert!(
                        message.contains(&format!("character {position}")),
                        "{message}"
                    );
                }
                UnitError::UnknownUnit { unit, position, .. } => {
                    prop_assert!(*position < chars.len(), "{message}");
                    let unit_len = unit.chars().count();
                    prop_assert_eq!(&at(*position, unit_len), unit, "{}", message);
                    prop_assert!(
                        message.contains(&format!("character {position}")),
                        "{message}"
                    );
                }
                UnitError::Trailing { rest, position, .. } => {
                    prop_assert!(*position < chars.len(), "{message}");
                    prop_assert!(!rest.is_empty(), "{message}");
                    prop_assert_eq!(&at(*position, rest.chars().count()), rest, "{}", message);
                }
                UnitError::Comma { position, .. } => {
                    prop_assert_eq!(chars.get(*position), Some(&','), "{}", message);
                    prop_assert!(message.contains("decimal point"), "{message}");
                }
                // A template's blank and a gear ratio concern the text as a whole.
                UnitError::Blank { text: quoted, .. }
                | UnitError::BadRatio { text: quoted, .. } => {
                    prop_assert_eq!(quoted, text, "{}", message);
                }
                // These two concern the text as a whole (no unit at all; a value too large),
                // so they quote it instead of pointing into it.
                UnitError::MissingUnit { text: quoted, .. }
                | UnitError::NotFinite { text: quoted } => {
                    prop_assert_eq!(quoted, text, "{}", message);
                }
            }
        }
    }
    Ok(())
}

proptest! {
    #![proptest_config(super::cases(256))]

    // Any printable text, every kind.
    #[test]
    fn any_text_parses_or_fails_with_a_position(text in "\\PC{0,32}") {
        for kind in Kind::ALL {
            check(&text, kind)?;
        }
    }

    // Any bytes that happen to be valid UTF-8, including control characters and odd spaces.
    #[test]
    fn any_string_parses_or_fails_with_a_position(text in any::<String>()) {
        for kind in Kind::ALL {
            check(&text, kind)?;
        }
    }

    // Joins of quantity-like pieces reach the compound-length, exponent and unit paths.
    #[test]
    fn quantity_like_text_parses_or_fails_with_a_position(
        pieces in proptest::collection::vec(0usize..PIECES.len(), 0..8),
    ) {
        let text: String = pieces.iter().map(|&i| PIECES[i]).collect();
        for kind in Kind::ALL {
            check(&text, kind)?;
        }
    }

    // A number with a unit that the kind does not know is refused at the unit's position,
    // never read as some other unit.
    #[test]
    fn a_wrong_unit_is_refused_where_it_stands(value in 0.0f64..1e6, spaces in 0usize..3) {
        let number = format!("{value}");
        let text = format!("{number}{}zorp", " ".repeat(spaces));
        for kind in Kind::ALL {
            match parse(&text, kind) {
                Err(UnitError::UnknownUnit { position, .. }) => {
                    prop_assert_eq!(position, number.len() + spaces);
                }
                other => prop_assert!(false, "{text:?} as {kind:?} gave {other:?}"),
            }
        }
    }
}

#[test]
fn huge_and_odd_numbers_are_errors_not_infinities() {
    for kind in Kind::ALL {
        for text in [
            "1e309 m",
            "1e309",
            "-1e400 kn",
            "1e308 ft 1e308 in",
            "NaN m",
            "inf kW",
        ] {
            check(text, kind).unwrap();
            if let Ok(value) = parse(text, kind) {
                assert!(value.is_finite(), "{text:?} as {kind:?} gave {value}");
            }
        }
        // Non-numbers are never accepted, whatever the kind.
        for text in ["NaN m", "inf kW", "", " ", "m", "."] {
            assert!(
                parse(text, kind).is_err(),
                "{text:?} as {kind:?} was accepted"
            );
        }
    }
}
