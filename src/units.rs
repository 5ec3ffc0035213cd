//! Quantities written with units: parse, convert to SI, and display in metric or imperial.
//!
//! Constants are the exact or defined values of NIST SP 811 (2008), Appendix B.

use thiserror::Error;

mod table;

pub use table::{
    CELSIUS_ZERO_K, FOOT_M, HORSEPOWER_HOUR_J, HORSEPOWER_W, HOUR_S, INCH_M, KILOGRAM_FORCE_N,
    KILOWATT_HOUR_J, KNOT_MPS, LITRE_M3, METRIC_HORSEPOWER_HOUR_J, METRIC_HORSEPOWER_W,
    NAUTICAL_MILE_M, POUND_FORCE_FOOT_NM, POUND_FORCE_N, POUND_KG, PSI_PA, STANDARD_GRAVITY_MPS2,
    US_GALLON_M3,
};
use table::{DisplayUnit, KindInfo, UnitDef, info};

/// What physical kind a quantity is; decides which units are accepted and the SI unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
pub enum Kind {
    /// Length, SI metre.
    Length,
    /// A screw or shaft dimension (diameter, pitch): parsed like a length, shown in mm or in.
    ScrewLength,
    /// A distance run (range), SI metre; shown in nautical miles in both systems.
    Distance,
    /// Fuel volume per distance run, SI m³/m; shown in L/nm or US gal/nm.
    FuelPerDistance,
    /// Mass, SI kilogram.
    Mass,
    /// Power, SI watt.
    Power,
    /// Speed, SI metre per second.
    Speed,
    /// Volume, SI cubic metre.
    Volume,
    /// Area, SI square metre.
    Area,
    /// A fraction written as a percentage ("15 %") or plain number, stored as a fraction.
    Fraction,
    /// Fuel volume flow, SI m³/s.
    FuelRate,
    /// Specific fuel consumption, SI kg/J.
    SpecificFuel,
    /// Rotational speed, stored in rpm.
    Rotation,
    /// Temperature, stored in °C.
    Temperature,
    /// Density, SI kg/m³.
    Density,
    /// Force, SI newton.
    Force,
    /// Angle, stored in degrees.
    Angle,
    /// Torque, SI N·m.
    Torque,
    /// Pressure or stress, SI pascal.
    Pressure,
    /// Time, SI second.
    Time,
}

impl Kind {
    /// Every kind, in the order of the enum.
    pub const ALL: [Kind; 20] = [
        Kind::Length,
        Kind::ScrewLength,
        Kind::Distance,
        Kind::FuelPerDistance,
        Kind::Mass,
        Kind::Power,
        Kind::Speed,
        Kind::Volume,
        Kind::Area,
        Kind::Fraction,
        Kind::FuelRate,
        Kind::SpecificFuel,
        Kind::Rotation,
        Kind::Temperature,
        Kind::Density,
        Kind::Force,
        Kind::Angle,
        Kind::Torque,
        Kind::Pressure,
        Kind::Time,
    ];
}

/// The unit system used for display.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum UnitSystem {
    /// Metres, tonnes, kilowatts, litres.
    #[default]
    Metric,
    /// Feet and inches, pounds, horsepower, US gallons.
    Imperial,
}

/// Why a quantity could not be parsed.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum UnitError {
    /// No number where one was expected.
    #[error("expected a number at character {position} of {text:?}")]
    NoNumber {
        /// The text given.
        text: String,
        /// Character offset (0-based) where the number should start.
        position: usize,
    },
    /// A number without a unit where the kind needs one.
    #[error("{text:?} has no unit; expected {kind_name} with a unit such as {examples}")]
    MissingUnit {
        /// The text given.
        text: String,
        /// The kind's name, e.g. "a length".
        kind_name: &'static str,
        /// Examples of accepted units.
        examples: &'static str,
    },
    /// A unit that is not known for this kind.
    #[error(
        "unknown unit {unit:?} at character {position} of {text:?}; expected {kind_name} in {examples}"
    )]
    UnknownUnit {
        /// The text given.
        text: String,
        /// The unit found.
        unit: String,
        /// Character offset of the unit.
        position: usize,
        /// The kind's name.
        kind_name: &'static str,
        /// Accepted units.
        examples: &'static str,
    },
    /// A number too large to hold, or a converted value that is not finite.
    #[error("{text:?} is out of range: its value is not a finite number")]
    NotFinite {
        /// The text given.
        text: String,
    },
    /// Something left over after the quantity.
    #[error("unexpected {rest:?} at character {position} of {text:?}")]
    Trailing {
        /// The text given.
        text: String,
        /// What was left.
        rest: String,
        /// Character offset of the leftover.
        position: usize,
    },
}

/// Parses `text` as a quantity of `kind`, returning its value in the kind's internal unit.
///
/// The number may carry a sign, decimals and an exponent; the unit follows, with or without a
/// space. Lengths also accept feet and inches together ("36 ft 9 in", "36' 9\""). A bare
/// number is accepted only for [`Kind::Fraction`], where it is the fraction itself.
pub fn parse(text: &str, kind: Kind) -> Result<f64, UnitError> {
    let kind_info = info(kind);
    let (number, after_number) = scan_number(text, skip_space(text, 0))?;
    let unit_start = skip_space(text, after_number);
    let unit_end = scan_unit(text, unit_start);
    if unit_start == unit_end {
        if unit_start < text.len() {
            return Err(unknown_unit(text, unit_start, text.len(), kind_info));
        }
        return match kind {
            Kind::Fraction => finite(number, text),
            _ => Err(UnitError::MissingUnit {
                text: text.to_owned(),
                kind_name: kind_info.name,
                examples: kind_info.examples,
            }),
        };
    }
    let unit = find_unit(kind_info, &text[unit_start..unit_end])
        .ok_or_else(|| unknown_unit(text, unit_start, unit_end, kind_info))?;
    let mut value = (number - unit.zero) * unit.scale;
    let mut rest = skip_space(text, unit_end);
    let is_length = matches!(kind, Kind::Length | Kind::ScrewLength);
    let is_feet = unit.aliases.first() == table::FOOT_UNIT.aliases.first();
    if is_length && is_feet && starts_unsigned_number(text, rest) {
        let (inches, after_inches) = scan_number(text, rest)?;
        let inch_start = skip_space(text, after_inches);
        let inch_end = scan_unit(text, inch_start);
        if inch_start == inch_end {
            if inch_start < text.len() {
                return Err(unknown_inches(text, inch_start, text.len()));
            }
            return Err(UnitError::MissingUnit {
                text: text.to_owned(),
                kind_name: "feet and inches",
                examples: "36 ft 9 in, 36' 9\"",
            });
        }
        let inch_unit = find_unit_in(
            &text[inch_start..inch_end],
            std::slice::from_ref(table::INCH_UNIT),
        )
        .ok_or_else(|| unknown_inches(text, inch_start, inch_end))?;
        // The sign written before the feet applies to the whole length.
        value += (inches * inch_unit.scale).copysign(number);
        rest = skip_space(text, inch_end);
    }
    if rest < text.len() {
        return Err(UnitError::Trailing {
            text: text.to_owned(),
            rest: text[rest..].trim_end().to_owned(),
            position: char_position(text, rest),
        });
    }
    finite(value, text)
}

/// Formats `value` (internal unit of `kind`) in `system` with a sensible precision and unit.
///
/// Non-finite values are shown as "—".
pub fn format(value: f64, kind: Kind, system: UnitSystem) -> String {
    let unit = info(kind).display(system);
    let shown = to_display(value, kind, system);
    if !shown.is_finite() {
        return "—".to_owned();
    }
    let number = if shown.abs() >= 1e9 {
        format!("{shown:.3e}")
    } else {
        let decimals = decimals_for(shown, unit.decimals);
        let text = format!("{shown:.decimals$}");
        // A value that rounds to zero is shown without a minus sign.
        match text.strip_prefix('-') {
            Some(unsigned) if unsigned.chars().all(|c| c == '0' || c == '.') => unsigned.to_owned(),
            _ => text,
        }
    };
    join(&number, unit)
}

/// Formats `value` of `kind` for writing into a profile file: exact enough to round-trip.
///
/// Uses the shortest decimal that reads back as the same value (at most 17 significant
/// digits), in the display unit of `system`. Non-finite values give "—", which does not parse.
pub fn format_for_file(value: f64, kind: Kind, system: UnitSystem) -> String {
    let unit = info(kind).display(system);
    let shown = to_display(value, kind, system);
    if !shown.is_finite() {
        return "—".to_owned();
    }
    let mut best = shown;
    for digits in 0..17 {
        let candidate: f64 = format!("{shown:.digits$e}").parse().unwrap_or(shown);
        if from_display(candidate, kind, system) == value {
            best = candidate;
            break;
        }
    }
    let magnitude = best.abs();
    let number = if magnitude != 0.0 && !(1e-4..1e15).contains(&magnitude) {
        format!("{best:e}")
    } else {
        format!("{best}")
    };
    join(&number, unit)
}

/// The unit label `kind` is shown in under `system`, e.g. "m", "ft", "US gal/h".
pub fn unit_label(kind: Kind, system: UnitSystem) -> &'static str {
    info(kind).display(system).label
}

/// Converts `value` from the internal unit of `kind` to its display unit in `system`.
pub fn to_display(value: f64, kind: Kind, system: UnitSystem) -> f64 {
    let unit = info(kind).display(system);
    value / unit.scale + unit.zero
}

/// Converts `value` from the display unit of `kind` in `system` to the internal unit.
pub fn from_display(value: f64, kind: Kind, system: UnitSystem) -> f64 {
    let unit = info(kind).display(system);
    (value - unit.zero) * unit.scale
}

/// Decimal places [`format`] normally shows for `kind` in `system` (more for small values).
pub fn display_decimals(kind: Kind, system: UnitSystem) -> usize {
    info(kind).display(system).decimals
}

/// A convenient editing step for `kind` in `system`, in display units (e.g. 0.5 in, 50 rpm).
pub fn nudge_step(kind: Kind, system: UnitSystem) -> f64 {
    info(kind).display(system).nudge
}

/// The name of `kind` in a sentence, e.g. "a length".
pub fn kind_name(kind: Kind) -> &'static str {
    info(kind).name
}

/// The units accepted for `kind`, as a readable list for hints and error messages.
pub fn accepted_units(kind: Kind) -> &'static str {
    info(kind).accepted
}

/// Joins a number and its display unit label.
fn join(number: &str, unit: &DisplayUnit) -> String {
    if unit.spaced {
        format!("{number} {}", unit.label)
    } else {
        format!("{number}{}", unit.label)
    }
}

/// Decimals to show `shown`: the unit's usual number, and for units that normally show
/// decimals up to two more, so that a small value keeps two significant digits ("0.050 m").
fn decimals_for(shown: f64, usual: usize) -> usize {
    if shown == 0.0 || usual == 0 {
        return usual;
    }
    let leading = shown.abs().log10().floor();
    let needed = (1.0 - leading).clamp(0.0, 6.0) as usize;
    needed.clamp(usual, usual + 2)
}

/// Returns `value` if finite, else the out-of-range error for `text`.
fn finite(value: f64, text: &str) -> Result<f64, UnitError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(UnitError::NotFinite {
            text: text.to_owned(),
        })
    }
}

/// The 0-based character offset of byte offset `byte` in `text`.
fn char_position(text: &str, byte: usize) -> usize {
    text[..byte].chars().count()
}

/// The byte offset of the first non-whitespace character at or after `from`.
fn skip_space(text: &str, from: usize) -> usize {
    text[from..]
        .char_indices()
        .find(|(_, c)| !c.is_whitespace())
        .map_or(text.len(), |(offset, _)| from + offset)
}

/// Whether an unsigned number starts at `at` (a digit, or a point followed by a digit).
fn starts_unsigned_number(text: &str, at: usize) -> bool {
    let bytes = &text.as_bytes()[at..];
    match bytes {
        [first, ..] if first.is_ascii_digit() => true,
        [b'.', second, ..] => second.is_ascii_digit(),
        _ => false,
    }
}

/// Reads a number starting at byte `start`: sign, digits, decimals, exponent.
/// Returns its value and the byte offset just past it.
fn scan_number(text: &str, start: usize) -> Result<(f64, usize), UnitError> {
    let bytes = text.as_bytes();
    let mut at = start;
    let mut literal = String::new();
    if let Some(rest) = text[at..].strip_prefix('−') {
        // U+2212 MINUS SIGN, as typeset documents write it.
        literal.push('-');
        at = text.len() - rest.len();
    } else if matches!(bytes.get(at), Some(b'+' | b'-')) {
        literal.push(char::from(bytes[at]));
        at += 1;
    }
    let digits_start = at;
    let mut digit_count = 0;
    while let Some(byte) = bytes.get(at) {
        if byte.is_ascii_digit() {
            digit_count += 1;
        } else if *byte != b'.' || text[digits_start..at].contains('.') {
            break;
        }
        at += 1;
    }
    if digit_count == 0 {
        return Err(UnitError::NoNumber {
            text: text.to_owned(),
            position: char_position(text, start),
        });
    }
    if matches!(bytes.get(at), Some(b'e' | b'E')) {
        let mut exponent_end = at + 1;
        if matches!(bytes.get(exponent_end), Some(b'+' | b'-')) {
            exponent_end += 1;
        }
        let exponent_digits = bytes[exponent_end..]
            .iter()
            .take_while(|b| b.is_ascii_digit())
            .count();
        if exponent_digits > 0 {
            at = exponent_end + exponent_digits;
        }
    }
    literal.push_str(&text[digits_start..at]);
    let value: f64 = literal.parse().map_err(|_| UnitError::NoNumber {
        text: text.to_owned(),
        position: char_position(text, start),
    })?;
    if !value.is_finite() {
        return Err(UnitError::NotFinite {
            text: text.to_owned(),
        });
    }
    Ok((value, at))
}

/// Characters that may appear in a unit, besides letters.
fn is_unit_symbol(c: char) -> bool {
    matches!(
        c,
        '/' | '·'
            | '⋅'
            | '•'
            | '*'
            | '('
            | ')'
            | '^'
            | '²'
            | '³'
            | '°'
            | 'º'
            | '˚'
            | '%'
            | '\''
            | '"'
            | '′'
            | '″'
            | '’'
            | '‘'
            | '”'
            | '“'
    )
}

/// Finds the end (byte offset) of the unit starting at `start`; equal to `start` if none.
///
/// A unit is letters and unit symbols; it may contain spaces ("US gal", "lb/(hp · h)"), a
/// joining `.` or `-` ("lbf-ft"), and a power digit 2 or 3 after a letter ("m3", "ft²"). It
/// stops before a number, so that "36 ft 9 in" yields "ft" first.
fn scan_unit(text: &str, start: usize) -> usize {
    let chars: Vec<(usize, char)> = text[start..].char_indices().collect();
    let mut end = start;
    let mut previous: Option<char> = None;
    for (index, &(offset, c)) in chars.iter().enumerate() {
        let next = chars.get(index + 1).map(|&(_, n)| n);
        let after_letter = previous.is_some_and(|p| p.is_alphabetic() || p == '^');
        let accepted = if c.is_alphabetic() || is_unit_symbol(c) {
            true
        } else if c == '.' || c == '-' {
            previous.is_some_and(|p| p.is_alphabetic() || p == ')')
                && next.is_some_and(|n| n.is_alphabetic() || n == '(')
        } else if c == '2' || c == '3' {
            after_letter && !next.is_some_and(|n| n.is_alphanumeric() || n == '.')
        } else if c.is_whitespace() {
            previous.is_some()
                && chars[index..]
                    .iter()
                    .map(|&(_, n)| n)
                    .find(|n| !n.is_whitespace())
                    .is_some_and(|n| {
                        n.is_alphabetic() || (is_unit_symbol(n) && n != '\'' && n != '"')
                    })
        } else {
            false
        };
        if !accepted {
            break;
        }
        if !c.is_whitespace() {
            end = start + offset + c.len_utf8();
        }
        previous = Some(c);
    }
    end
}

/// The unit as written, reduced to the form the tables list: no spaces or joining marks,
/// superscript powers as digits, typographic quotes as ASCII.
fn normalise(unit: &str) -> String {
    unit.chars()
        .filter_map(|c| match c {
            c if c.is_whitespace() => None,
            '·' | '⋅' | '•' | '*' | '-' | '(' | ')' | '^' | '.' => None,
            '²' => Some('2'),
            '³' => Some('3'),
            '′' | '’' | '‘' => Some('\''),
            '″' | '”' | '“' => Some('"'),
            'º' | '˚' => Some('°'),
            c => Some(c),
        })
        .collect()
}

/// The unit of `kind_info` written as `written`, if any.
fn find_unit(kind_info: &'static KindInfo, written: &str) -> Option<&'static UnitDef> {
    find_unit_in(written, kind_info.units)
}

/// The unit among `units` written as `written`: an exact spelling first; otherwise a spelling
/// in another letter case, for units where case carries no meaning, if exactly one matches.
fn find_unit_in(written: &str, units: &'static [UnitDef]) -> Option<&'static UnitDef> {
    let normal = normalise(written);
    if let Some(exact) = units.iter().find(|u| u.aliases.contains(&normal.as_str())) {
        return Some(exact);
    }
    let lower = normal.to_lowercase();
    let mut folded = units
        .iter()
        .filter(|u| u.fold && u.aliases.iter().any(|a| a.to_lowercase() == lower));
    match (folded.next(), folded.next()) {
        (Some(only), None) => Some(only),
        _ => None,
    }
}

/// The error for an unknown unit spanning bytes `start..end` of `text`.
fn unknown_unit(text: &str, start: usize, end: usize, kind_info: &KindInfo) -> UnitError {
    UnitError::UnknownUnit {
        text: text.to_owned(),
        unit: text[start..end].trim_end().to_owned(),
        position: char_position(text, start),
        kind_name: kind_info.name,
        examples: kind_info.accepted,
    }
}

/// The error for something other than inches after a number of feet.
fn unknown_inches(text: &str, start: usize, end: usize) -> UnitError {
    UnitError::UnknownUnit {
        text: text.to_owned(),
        unit: text[start..end].trim_end().to_owned(),
        position: char_position(text, start),
        kind_name: "the inches after the feet",
        examples: "in or \", as in 36 ft 9 in",
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_listed_spelling_parses_to_its_unit() {
        for kind in Kind::ALL {
            for unit in info(kind).units {
                for alias in unit.aliases {
                    let got = parse(&format!("2 {alias}"), kind);
                    let want = (2.0 - unit.zero) * unit.scale;
                    assert_eq!(got, Ok(want), "{kind:?} {alias:?}");
                }
            }
        }
    }

    #[test]
    fn every_unit_named_in_the_error_hint_is_accepted() {
        for kind in Kind::ALL {
            let listed = accepted_units(kind);
            let units_only = listed.split(" (or").next().unwrap_or(listed);
            for entry in units_only.split(", ") {
                let name = entry.split(" (").next().unwrap_or(entry);
                if name.starts_with("or a plain") {
                    continue;
                }
                assert!(
                    parse(&format!("2 {name}"), kind).is_ok(),
                    "{kind:?} lists {name:?}"
                );
            }
        }
    }

    #[test]
    fn display_labels_parse_back_to_the_display_scale() {
        for kind in Kind::ALL {
            for system in [UnitSystem::Metric, UnitSystem::Imperial] {
                let unit = info(kind).display(system);
                let got = parse(&format!("2 {}", unit.label), kind);
                assert_eq!(
                    got,
                    Ok((2.0 - unit.zero) * unit.scale),
                    "{kind:?} {}",
                    unit.label
                );
            }
        }
    }

    #[test]
    fn spellings_are_unambiguous_within_a_kind() {
        for kind in Kind::ALL {
            let units = info(kind).units;
            for (index, unit) in units.iter().enumerate() {
                for alias in unit.aliases {
                    let lower = alias.to_lowercase();
                    for other in &units[index + 1..] {
                        assert!(!other.aliases.contains(alias), "{kind:?} {alias}");
                        let clash = unit.fold
                            && other.fold
                            && other.aliases.iter().any(|a| a.to_lowercase() == lower);
                        assert!(!clash, "{kind:?}: {alias} folds onto another unit");
                    }
                }
            }
        }
    }

    #[test]
    fn unit_span_stops_before_a_number() {
        let text = "36 ft 9 in";
        assert_eq!(&text[3..scan_unit(text, 3)], "ft");
        let text = "2 lb/(hp · h) x";
        assert_eq!(&text[2..scan_unit(text, 2)], "lb/(hp · h) x");
        let text = "3 m3/s";
        assert_eq!(&text[2..scan_unit(text, 2)], "m3/s");
        let text = "3ft2in";
        assert_eq!(&text[1..scan_unit(text, 1)], "ft");
    }

    #[test]
    fn file_format_is_short_when_it_can_be() {
        assert_eq!(
            format_for_file(0.15, Kind::Fraction, UnitSystem::Metric),
            "15 %"
        );
        assert_eq!(
            format_for_file(11.2, Kind::Length, UnitSystem::Metric),
            "11.2 m"
        );
        assert_eq!(
            format_for_file(24.0 * INCH_M, Kind::ScrewLength, UnitSystem::Imperial),
            "24 in"
        );
        assert_eq!(
            format_for_file(15.0, Kind::Temperature, UnitSystem::Imperial),
            "59 °F"
        );
        assert_eq!(
            format_for_file(2e-9, Kind::Length, UnitSystem::Metric),
            "2e-9 m"
        );
    }

    #[test]
    fn positions_count_characters_not_bytes() {
        let error = parse("15 °X", Kind::Temperature).unwrap_err();
        assert!(
            matches!(error, UnitError::UnknownUnit { position: 3, .. }),
            "{error:?}"
        );
        let error = parse("12 kn ñ", Kind::Speed).unwrap_err();
        assert!(
            matches!(error, UnitError::UnknownUnit { position: 3, .. }),
            "{error:?}"
        );
        let error = parse("°5", Kind::Angle).unwrap_err();
        assert_eq!(
            error,
            UnitError::NoNumber {
                text: "°5".into(),
                position: 0
            }
        );
    }
}
