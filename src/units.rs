//! Quantities written with units: parse, convert to SI, and display in metric or imperial.
//!
//! Constants are the exact or defined values of NIST SP 811 (2008), Appendix B.

use thiserror::Error;

mod parse;
mod table;
mod text;

use parse::*;
pub use parse::{parse, parse_ratio};

pub use table::{
    CELSIUS_ZERO_K, FOOT_M, HORSEPOWER_HOUR_J, HORSEPOWER_W, HOUR_S, INCH_M, KILOGRAM_FORCE_N,
    KILOWATT_HOUR_J, KNOT_MPS, LITRE_M3, METRIC_HORSEPOWER_HOUR_J, METRIC_HORSEPOWER_W,
    NAUTICAL_MILE_M, POUND_FORCE_FOOT_NM, POUND_FORCE_N, POUND_KG, PSI_PA, STANDARD_GRAVITY_MPS2,
    US_GALLON_M3,
};
use table::{DisplayUnit, KindInfo, UnitDef, info};
pub use text::{
    TextStyle, ascii_fallback, locale_is_utf8, locale_is_utf8_from, set_ascii, text_style,
};

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
    /// A fuel's density, SI kg/m³; shown in kg/L or lb/US gal, the way fuel is weighed.
    FuelDensity,
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
    pub const ALL: [Kind; 21] = [
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
        Kind::FuelDensity,
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
    /// A number written with a comma: a decimal comma, or a thousands separator.
    #[error("{}", comma_message(text, suggestion, thousands.as_deref()))]
    Comma {
        /// The text given.
        text: String,
        /// Character offset of the comma.
        position: usize,
        /// The text with the comma read as a decimal point ("22.5 in").
        suggestion: String,
        /// The text with the comma read as a thousands separator ("14500 lb"), when it may be
        /// one: three digits follow it and at most three whole digits come before.
        thousands: Option<String>,
    },
    /// A template's blank ("FILL IN") that was not replaced by a value.
    #[error("{text:?} is a blank left to fill in; write {kind_name} such as {examples}")]
    Blank {
        /// The text given.
        text: String,
        /// The kind's name, e.g. "a length".
        kind_name: &'static str,
        /// Examples of accepted values.
        examples: &'static str,
    },
    /// A gear ratio that cannot be one: not a number, zero, negative, or written inverted.
    #[error("{text:?} is not a gear ratio: {reason}")]
    BadRatio {
        /// The text given.
        text: String,
        /// What is wrong and what was expected.
        reason: String,
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

/// Formats `value` (internal unit of `kind`) in `system` with a sensible precision and unit.
///
/// Uses the program's text style (see [`set_ascii`]). Non-finite values are shown as "—".
pub fn format(value: f64, kind: Kind, system: UnitSystem) -> String {
    format_in(value, kind, system, text_style())
}

/// A message from the core with its screw lengths, which the core writes in metres with
/// inches beside them ("0.305 m (12.0 in)", `propulsion::screw_length_words`), in `system`'s
/// unit only ("305 mm" or "12.0 in"): metric output stays metric, imperial imperial.
pub fn in_system(text: &str, system: UnitSystem) -> String {
    let mut out = String::with_capacity(text.len());
    let mut rest = text;
    while let Some(end) = rest.find(" in)") {
        let head = &rest[..end];
        // "… 0.305 m (12.0": the metres before " m (", the inches after it.
        let pair = head.rfind(" m (").and_then(|open| {
            let inches: f64 = head[open + 4..].parse().ok()?;
            let start = head[..open].rfind(' ').map_or(0, |i| i + 1);
            let metres: f64 = head[start..open].parse().ok()?;
            (metres.is_finite() && inches.is_finite()).then_some((start, metres))
        });
        match pair {
            Some((start, metres)) => {
                out.push_str(&head[..start]);
                out.push_str(&format(metres, Kind::ScrewLength, system));
            }
            None => out.push_str(&rest[..end + 4]),
        }
        rest = &rest[end + 4..];
    }
    out.push_str(rest);
    out
}

/// Formats `value` like [`format`], in the text style `style` rather than the program's.
///
/// Precision per kind: the unit's usual decimals, more for small values (two significant
/// digits), at least three significant figures for fuel per distance, and screw lengths in
/// inches on a quarter (1.25 in, 17.75 in) with two decimals where one is usual.
pub fn format_in(value: f64, kind: Kind, system: UnitSystem, style: TextStyle) -> String {
    let unit = info(kind).display(system);
    match number_text(value, kind, system, style) {
        Some(number) => join(&number, unit, style),
        None => not_a_value(style).to_owned(),
    }
}

/// The number of [`format`] without its unit, e.g. "1.25" for a 1¼ in shaft in imperial.
///
/// For table cells whose column heading carries the unit. Non-finite values give "—".
pub fn format_number(value: f64, kind: Kind, system: UnitSystem) -> String {
    let style = text_style();
    number_text(value, kind, system, style).unwrap_or_else(|| not_a_value(style).to_owned())
}

/// Formats `value` of `kind` for writing into a profile file, rounded to its unit's precision.
///
/// A value that some short decimal gives exactly (11.2 m, 24 in) is written so. Otherwise it
/// is rounded, in the display unit of `system`, to the kind's file precision while keeping at
/// least four significant figures: lengths 1 mm / 0.001 ft; screw lengths 0.1 mm / 0.01 in
/// (a pitch of 21.334732 in saves as "21.33 in"); distances 0.1 nm; masses 1 kg / 1 lb; power
/// 0.01 kW / 0.01 hp; speed 0.01 kn; volume 0.1 L / 0.1 US gal; area 0.001 m² / 0.01 ft²;
/// fractions 0.01 %; fuel rate 0.01 L/h / 0.001 US gal/h; fuel per distance 0.001 L/nm or
/// US gal/nm; specific fuel 0.1 g/kWh / 0.0001 lb/hp·h; rotation 1 rpm; temperature 0.1 °C /
/// 0.1 °F; density 0.001 kg/m³ / 0.001 lb/ft³; fuel density 0.0001 kg/L / 0.001 lb/US gal;
/// force 1 N / 1 lbf; angle 0.01°; torque 0.1 N·m / 0.1 lbf·ft; pressure 0.01 kPa / 0.001 psi;
/// time 0.001 h. Files are always written in UTF-8 whatever the text style. Non-finite
/// values give "—", which does not parse.
pub fn format_for_file(value: f64, kind: Kind, system: UnitSystem) -> String {
    let unit = info(kind).display(system);
    let shown = to_display(value, kind, system);
    if !shown.is_finite() {
        return "—".to_owned();
    }
    let magnitude = shown.abs();
    let significant = if magnitude == 0.0 {
        0
    } else {
        (3.0 - magnitude.log10().floor()).clamp(0.0, 300.0) as usize
    };
    let decimals = unit.file_decimals.max(significant);
    // The shortest decimal that reads back exactly, when it is no longer than the rounding.
    let exact = (0..17).find_map(|digits| {
        let candidate: f64 = format!("{shown:.digits$e}").parse().ok()?;
        (from_display(candidate, kind, system) == value).then_some(candidate)
    });
    let best = match exact {
        Some(candidate) if decimals_of(candidate) <= decimals => candidate,
        _ => {
            let rounded: f64 = format!("{shown:.decimals$}").parse().unwrap_or(shown);
            // Rounding must not turn a tiny value into zero; keep four significant digits.
            if rounded == 0.0 && shown != 0.0 {
                format!("{shown:.3e}").parse().unwrap_or(shown)
            } else {
                rounded
            }
        }
    };
    let best = if best == 0.0 { 0.0 } else { best };
    let magnitude = best.abs();
    let number = if magnitude != 0.0 && !(1e-4..1e15).contains(&magnitude) {
        format!("{best:e}")
    } else {
        format!("{best}")
    };
    join(&number, unit, TextStyle::Unicode)
}

/// The unit label `kind` is shown in under `system`, e.g. "m", "ft", "US gal/h".
///
/// Uses the program's text style: "ft2" rather than "ft²" when ASCII is asked for.
pub fn unit_label(kind: Kind, system: UnitSystem) -> &'static str {
    unit_label_in(kind, system, text_style())
}

/// The unit label of `kind` under `system` in the text style `style`.
pub fn unit_label_in(kind: Kind, system: UnitSystem, style: TextStyle) -> &'static str {
    let unit = info(kind).display(system);
    match style {
        TextStyle::Unicode => unit.label,
        TextStyle::Ascii => unit.ascii,
    }
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

/// The shown number of `value` of `kind` in `system`, or `None` when it is not finite.
fn number_text(value: f64, kind: Kind, system: UnitSystem, style: TextStyle) -> Option<String> {
    let unit = info(kind).display(system);
    let shown = to_display(value, kind, system);
    if !shown.is_finite() {
        return None;
    }
    let text = if shown.abs() >= 1e9 {
        format!("{shown:.3e}")
    } else {
        let mut decimals = decimals_for(shown, unit.decimals);
        if unit.significant > 0 && shown != 0.0 {
            let leading = shown.abs().log10().floor();
            let needed = (unit.significant as f64 - 1.0 - leading).clamp(0.0, 6.0) as usize;
            decimals = decimals.max(needed);
        }
        if unit.quarters && decimals < 2 && is_on_quarter(shown) {
            decimals = 2;
        }
        let text = format!("{shown:.decimals$}");
        // A value that rounds to zero is shown without a minus sign.
        match text.strip_prefix('-') {
            Some(unsigned) if unsigned.chars().all(|c| c == '0' || c == '.') => unsigned.to_owned(),
            _ => text,
        }
    };
    Some(match style {
        TextStyle::Unicode => text,
        TextStyle::Ascii => ascii_fallback(&text),
    })
}

/// Whether `shown` lies on an odd quarter (x.25 or x.75) to within a thousandth.
fn is_on_quarter(shown: f64) -> bool {
    let quarters = shown * 4.0;
    (quarters - quarters.round()).abs() < 0.004 && quarters.round().rem_euclid(2.0) == 1.0
}

/// What a value that is not a number is shown as.
fn not_a_value(style: TextStyle) -> &'static str {
    match style {
        TextStyle::Unicode => "—",
        TextStyle::Ascii => "-",
    }
}

/// Joins a number and its display unit label in `style`.
fn join(number: &str, unit: &DisplayUnit, style: TextStyle) -> String {
    match style {
        TextStyle::Unicode if !unit.spaced => format!("{number}{}", unit.label),
        TextStyle::Unicode => format!("{number} {}", unit.label),
        // A spelled-out label ("deg") always stands apart from its number.
        TextStyle::Ascii => format!("{number} {}", unit.ascii),
    }
}

/// Number of decimal places `value` is written with by `{}` formatting.
fn decimals_of(value: f64) -> usize {
    let text = format!("{value}");
    text.split_once('.')
        .map_or(0, |(_, fraction)| fraction.len())
}

/// `text` without trailing zeros after a decimal point ("3.500" → "3.5", "4.000" → "4").
fn trim_number(text: &str) -> &str {
    if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.')
    } else {
        text
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_core_message_keeps_only_the_display_unit() {
        let text =
            "the smallest searched pitch 0.305 m (12.0 in) absorbs still 112 % of the target";
        let metric = in_system(text, UnitSystem::Metric);
        assert_eq!(
            metric,
            "the smallest searched pitch 305 mm absorbs still 112 % of the target"
        );
        let imperial = in_system(text, UnitSystem::Imperial);
        assert!(imperial.contains("pitch 12.0 in absorbs"), "{imperial}");
        assert!(!imperial.contains(" m "), "{imperial}");
        // Text without the core's pair is left as it is, brackets and all.
        let plain = "a shaft (1.5 in) and 3 m (of chain)";
        assert_eq!(in_system(plain, UnitSystem::Metric), plain);
    }

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

    #[test]
    fn a_decimal_comma_is_refused_with_the_decimal_point_form() {
        let error = parse("22,5 in", Kind::ScrewLength).unwrap_err();
        assert!(
            error.to_string().contains("use a decimal point: 22.5 in"),
            "{error}"
        );
        assert!(matches!(error, UnitError::Comma { position: 2, .. }));
        let error = parse("2,5", Kind::Fraction).unwrap_err();
        assert!(
            error.to_string().contains("use a decimal point: 2.5"),
            "{error}"
        );
        let error = parse("14,500 lb", Kind::Mass).unwrap_err().to_string();
        assert!(
            error.contains("14500 lb") && error.contains("14.500 lb"),
            "{error}"
        );
    }

    #[test]
    fn ratios_read_plain_and_with_a_colon() {
        assert_eq!(parse_ratio("2.5"), Ok(2.5));
        assert_eq!(parse_ratio("2.5:1"), Ok(2.5));
        assert_eq!(parse_ratio(" 2.5 : 1 "), Ok(2.5));
        assert_eq!(parse_ratio("5:2"), Ok(2.5));
        assert_eq!(parse_ratio("1:1"), Ok(1.0));
        for bad in [
            "1:2.5", "0.4", "0", "0:1", "2.5:0", "-2", "", "2.5:1:1", "x", "2.5 to 1",
        ] {
            assert!(
                matches!(parse_ratio(bad), Err(UnitError::BadRatio { .. })),
                "{bad:?}: {:?}",
                parse_ratio(bad)
            );
        }
        let inverted = parse_ratio("1:2.5").unwrap_err().to_string();
        assert!(
            inverted.contains("wrong way round") && inverted.contains("2.5:1"),
            "{inverted}"
        );
        let comma = parse_ratio("2,5:1").unwrap_err().to_string();
        assert!(comma.contains("use a decimal point: 2.5:1"), "{comma}");
    }

    #[test]
    fn a_template_blank_names_what_to_write() {
        let error = parse("FILL IN", Kind::Length).unwrap_err().to_string();
        assert!(
            error.contains("blank") && error.contains("a length"),
            "{error}"
        );
    }

    #[test]
    fn file_values_are_rounded_to_their_unit() {
        let pitch = 21.334_732_161_838_904 * INCH_M;
        assert_eq!(
            format_for_file(pitch, Kind::ScrewLength, UnitSystem::Imperial),
            "21.33 in"
        );
        assert_eq!(
            format_for_file(0.541_234_56, Kind::ScrewLength, UnitSystem::Metric),
            "541.2 mm"
        );
        assert_eq!(
            format_for_file(14_523.7, Kind::Mass, UnitSystem::Metric),
            "14.524 t"
        );
        assert_eq!(
            format_for_file(14_523.7, Kind::Mass, UnitSystem::Imperial),
            "32019 lb"
        );
    }
}
