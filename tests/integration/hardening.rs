//! Dockside hardening (issue 14): sloppy input read or refused clearly, trade-sensible display
//! precision, rounded saved values, plain-ASCII text, and the commented starting templates.
//! Conversion constants are the exact values of NIST SP 811 (2008), Appendix B.8.

use std::path::Path;
use tidewright::profile::Store;
use tidewright::profile::template::{self, BLANK, boat_template, engine_template, unfilled_keys};
use tidewright::units::{
    self, Kind, TextStyle, UnitError, UnitSystem, ascii_fallback, format, format_for_file,
    format_in, locale_is_utf8_from, parse, parse_ratio, unit_label_in,
};

use UnitSystem::{Imperial, Metric};

/// NIST SP 811 B.8: 1 in = 0.0254 m exactly.
const INCH_M: f64 = 0.0254;
/// NIST SP 811 B.8: 1 lb = 0.453 592 37 kg exactly.
const POUND_KG: f64 = 0.453_592_37;
/// NIST SP 811 B.8: 1 US gal = 3.785 411 784 L exactly.
const US_GALLON_M3: f64 = 3.785_411_784e-3;
/// NIST SP 811 B.8: 1 nautical mile = 1852 m exactly.
const NAUTICAL_MILE_M: f64 = 1852.0;

// ---------------------------------------------------------------------------------------------
// 1. Parsing sloppy input.

#[test]
fn a_decimal_comma_is_refused_with_the_point_form_for_every_kind() {
    for (text, kind, want) in [
        ("22,5 in", Kind::ScrewLength, "use a decimal point: 22.5 in"),
        ("2,5", Kind::Fraction, "use a decimal point: 2.5"),
        ("11,2 m", Kind::Length, "use a decimal point: 11.2 m"),
        ("7,5kn", Kind::Speed, "use a decimal point: 7.5kn"),
    ] {
        let message = parse(text, kind).unwrap_err().to_string();
        assert!(message.contains(want), "{text:?}: {message}");
        assert!(!message.contains("unknown unit"), "{text:?}: {message}");
    }
    for kind in Kind::ALL {
        assert!(
            matches!(
                parse("2,5 x", kind),
                Err(UnitError::Comma { position: 1, .. })
            ),
            "{kind:?}"
        );
    }
    // Three digits after the comma may be a thousands separator: both readings are offered.
    let message = parse("14,500 lb", Kind::Mass).unwrap_err().to_string();
    assert!(
        message.contains("14500 lb") && message.contains("14.500 lb"),
        "{message}"
    );
}

#[test]
fn a_unit_glued_to_its_number_reads_as_with_a_space() {
    for kind in Kind::ALL {
        for system in [Metric, Imperial] {
            let label = unit_label_in(kind, system, TextStyle::Unicode);
            let spaced = parse(&format!("2 {label}"), kind);
            assert!(spaced.is_ok(), "{kind:?} {label}: {spaced:?}");
            assert_eq!(
                parse(&format!("2{label}"), kind),
                spaced,
                "{kind:?} {label}"
            );
            let ascii = unit_label_in(kind, system, TextStyle::Ascii);
            assert_eq!(
                parse(&format!("2{ascii}"), kind),
                spaced,
                "{kind:?} {ascii}"
            );
        }
    }
    assert_eq!(parse("100rpm", Kind::Rotation), Ok(100.0));
    assert_eq!(
        parse("1800rpm", Kind::Rotation),
        parse("1800 rpm", Kind::Rotation)
    );
}

#[test]
fn gear_ratios_read_with_or_without_the_colon() {
    for text in ["2.5", "2.5:1", "2.5 : 1", " 2.5:1 ", "5:2"] {
        assert_eq!(parse_ratio(text), Ok(2.5), "{text:?}");
    }
    assert_eq!(parse_ratio("1:1"), Ok(1.0));
    let inverted = parse_ratio("1:2.5").unwrap_err().to_string();
    assert!(
        inverted.contains("wrong way round") && inverted.contains("2.5:1"),
        "{inverted}"
    );
    for text in ["0", "0:1", "2.5:0", "-2.5", "banana", "", "2.5:1:1", "2.5x"] {
        let message = parse_ratio(text).unwrap_err().to_string();
        assert!(message.contains("gear ratio"), "{text:?}: {message}");
    }
    let comma = parse_ratio("2,5:1").unwrap_err().to_string();
    assert!(comma.contains("use a decimal point: 2.5:1"), "{comma}");
}

// ---------------------------------------------------------------------------------------------
// 2. Display precision a tradesman expects, and rounded saved values.

#[test]
fn screw_lengths_show_quarters_and_pitch_to_a_tenth() {
    // A 1 1/4 in shaft is 31.75 mm (NIST SP 811 B.8: 1 in = 25.4 mm exactly).
    let shaft = 1.25 * INCH_M;
    assert_eq!(format(shaft, Kind::ScrewLength, Imperial), "1.25 in");
    assert_eq!(format(shaft, Kind::ScrewLength, Metric), "32 mm");
    assert_eq!(
        format(17.75 * INCH_M, Kind::ScrewLength, Imperial),
        "17.75 in"
    );
    assert_eq!(format(1.5 * INCH_M, Kind::ScrewLength, Imperial), "1.5 in");
    assert_eq!(
        format(24.0 * INCH_M, Kind::ScrewLength, Imperial),
        "24.0 in"
    );
    // A pitch off the quarters keeps the tenth of an inch (common practice for pitch).
    assert_eq!(
        format(17.334 * INCH_M, Kind::ScrewLength, Imperial),
        "17.3 in"
    );
}

#[test]
fn fuel_density_shows_in_kg_per_litre_and_lb_per_us_gallon() {
    let diesel = 840.0; // kg/m³, 0.84 kg/L (common practice)
    assert_eq!(format(diesel, Kind::FuelDensity, Metric), "0.840 kg/L");
    // 840 kg/m³ × 3.785 411 784e-3 m³/gal ÷ 0.453 592 37 kg/lb = 7.010 lb/gal (NIST SP 811 B.8).
    let want = diesel * US_GALLON_M3 / POUND_KG;
    assert!((want - 7.0102).abs() < 1e-3, "{want}");
    assert_eq!(
        format(diesel, Kind::FuelDensity, Imperial),
        "7.01 lb/US gal"
    );
    assert_eq!(
        parse("7.01 lb/US gal", Kind::FuelDensity).map(|v| v.round()),
        Ok(840.0)
    );
    // Water keeps kg/m³ and lb/ft³, as the trade writes seawater (1025 kg/m³).
    assert_eq!(format(1025.0, Kind::Density, Metric), "1025.0 kg/m³");
}

#[test]
fn ranges_are_whole_nautical_miles_and_fuel_per_mile_keeps_three_figures() {
    let range = 1618.4 * NAUTICAL_MILE_M;
    assert_eq!(format(range, Kind::Distance, Metric), "1618 nm");
    assert_eq!(format(range, Kind::Distance, Imperial), "1618 nm");
    // Rows of a sweep 1 % apart must not all read "0.11".
    let per_nm = |gallons: f64| gallons * US_GALLON_M3 / NAUTICAL_MILE_M;
    let rows: Vec<String> = [0.1134, 0.1146, 0.1158]
        .map(|g| format(per_nm(g), Kind::FuelPerDistance, Imperial))
        .to_vec();
    assert_eq!(
        rows,
        ["0.113 US gal/nm", "0.115 US gal/nm", "0.116 US gal/nm"]
    );
    let litres = 4.234 * 1e-3 / NAUTICAL_MILE_M;
    assert_eq!(format(litres, Kind::FuelPerDistance, Metric), "4.23 L/nm");
    assert_eq!(
        units::format_number(litres, Kind::FuelPerDistance, Metric),
        "4.23"
    );
}

#[test]
fn saved_values_are_rounded_to_their_unit() {
    let pitch = 21.334_732_161_838_904 * INCH_M;
    assert_eq!(
        format_for_file(pitch, Kind::ScrewLength, Imperial),
        "21.33 in"
    );
    assert_eq!(
        format_for_file(0.541_873_2, Kind::ScrewLength, Metric),
        "541.9 mm"
    );
    assert_eq!(format_for_file(14_523.71, Kind::Mass, Metric), "14.524 t");
    // 14 523.71 kg ÷ 0.453 592 37 kg/lb = 32 019.3 lb (NIST SP 811 B.8).
    assert_eq!(format_for_file(14_523.71, Kind::Mass, Imperial), "32019 lb");
    assert_eq!(format_for_file(1801.37, Kind::Rotation, Metric), "1801 rpm");
    // A value a short decimal gives exactly is written so, as before.
    assert_eq!(format_for_file(11.2, Kind::Length, Metric), "11.2 m");
    assert_eq!(
        format_for_file(17.5 * INCH_M, Kind::ScrewLength, Imperial),
        "17.5 in"
    );
    // A small value keeps four significant figures rather than rounding to zero.
    assert_eq!(
        format_for_file(0.000_123_456, Kind::Length, Metric),
        "0.0001235 m"
    );
    // What is written reads back within half the last place kept.
    let read = parse(
        &format_for_file(pitch, Kind::ScrewLength, Imperial),
        Kind::ScrewLength,
    );
    assert!((read.unwrap() - pitch).abs() <= 0.005 * INCH_M);
}

// ---------------------------------------------------------------------------------------------
// 3. Plain-ASCII text.

#[test]
fn ascii_style_writes_every_quantity_in_ascii_that_reads_back() {
    for kind in Kind::ALL {
        for system in [Metric, Imperial] {
            let value_in = units::from_display(12.25, kind, system);
            for value in [value_in, -value_in, f64::NAN] {
                let text = format_in(value, kind, system, TextStyle::Ascii);
                assert!(text.is_ascii(), "{kind:?} {system:?}: {text}");
                if value.is_finite() {
                    // The ASCII text reads back to what the UTF-8 text reads back to.
                    let back = parse(&text, kind).unwrap_or_else(|e| panic!("{text}: {e}"));
                    let utf8 = format_in(value, kind, system, TextStyle::Unicode);
                    assert_eq!(Ok(back), parse(&utf8, kind), "{text} / {utf8}");
                }
            }
        }
    }
    assert_eq!(
        format_in(15.0, Kind::Temperature, Metric, TextStyle::Ascii),
        "15.0 degC"
    );
    assert_eq!(
        format_in(12.0, Kind::Angle, Metric, TextStyle::Ascii),
        "12.0 deg"
    );
    assert_eq!(
        format_in(42.0, Kind::Area, Metric, TextStyle::Ascii),
        "42.00 m2"
    );
    assert_eq!(
        format_in(12.0, Kind::Angle, Metric, TextStyle::Unicode),
        "12.0°"
    );
}

#[test]
fn ascii_fallback_leaves_no_character_outside_ascii() {
    let printed = [
        "·", "½", "²", "³", "°", "−", "×", "→", "←", "↑", "↓", "▶", "◀", "✓", "✗", "⚠", "≈", "≥",
        "≤", "—", "–", "η", "─", "│", "┌", "┐", "└", "┘", "├", "┤", "┬", "┴", "┼", "╭", "╯", "⣿",
        "⠁", "█",
    ];
    for text in printed {
        let plain = ascii_fallback(text);
        assert!(
            plain.is_ascii() && !plain.is_empty(),
            "{text:?} gave {plain:?}"
        );
        assert!(!plain.contains('?'), "{text:?} has no spelling of its own");
    }
    assert_eq!(
        ascii_fallback("rpm · 42 kW · ηD 0.55"),
        "rpm - 42 kW - etaD 0.55"
    );
    assert_eq!(
        ascii_fallback("2½ in, −3 °C, 3×4"),
        "2 1/2 in, -3 degC, 3x4"
    );
    assert!(ascii_fallback("Ærø 日本").is_ascii());
}

#[test]
fn the_locale_decides_utf8_in_posix_order() {
    // POSIX.1-2017 §8.2: LC_ALL overrides LC_CTYPE, which overrides LANG.
    assert!(locale_is_utf8_from(None, None, Some("en_GB.UTF-8")));
    assert!(locale_is_utf8_from(None, Some("C.utf8"), Some("C")));
    assert!(!locale_is_utf8_from(
        Some("C"),
        Some("en_US.UTF-8"),
        Some("en_US.UTF-8")
    ));
    assert!(!locale_is_utf8_from(
        None,
        Some("POSIX"),
        Some("en_US.UTF-8")
    ));
    assert!(!locale_is_utf8_from(None, None, Some("C")));
    assert!(!locale_is_utf8_from(None, None, None));
}

// ---------------------------------------------------------------------------------------------
// 4. Templates for `new boat` and `new engine`.

/// Replacements for the blanks of one template: (key, TOML value as written).
pub(crate) type Fills = Vec<(&'static str, &'static str)>;

/// Values that fill every blank of the boat and engine templates in `system`.
pub(crate) fn fills(system: UnitSystem) -> (Fills, Fills) {
    let boat_common = [
        ("engine", "\"harbour-diesel\""),
        ("gear_ratio", "2.5"),
        ("target_speed", "\"7 kn\""),
        ("blades", "3"),
        ("area_ratio", "0.55"),
    ];
    let (boat, engine) = match system {
        Metric => (
            vec![
                ("length_waterline", "\"11.2 m\""),
                ("beam_waterline", "\"3.6 m\""),
                ("draft", "\"0.85 m\""),
                ("displacement", "\"14.5 t\""),
                ("tank", "\"800 L\""),
                ("diameter", "\"610 mm\""),
                ("pitch", "\"480 mm\""),
            ],
            vec![
                ("rated_rpm", "\"2800 rpm\""),
                ("idle_rpm", "\"800 rpm\""),
                (
                    "full_load_power",
                    "[[\"1000 rpm\", \"22 kW\"], [\"1800 rpm\", \"42 kW\"], [\"2800 rpm\", \"62 kW\"]]",
                ),
                ("full_load_sfc", "\"235 g/kWh\""),
            ],
        ),
        Imperial => (
            vec![
                ("length_waterline", "\"36 ft 9 in\""),
                ("beam_waterline", "\"11 ft 10 in\""),
                ("draft", "\"2 ft 9 in\""),
                ("displacement", "\"31300 lb\""),
                ("tank", "\"210 gal\""),
                ("diameter", "\"24 in\""),
                ("pitch", "\"19 in\""),
            ],
            vec![
                ("rated_rpm", "\"2800 rpm\""),
                ("idle_rpm", "\"800 rpm\""),
                (
                    "full_load_power",
                    "[[\"1000 rpm\", \"30 hp\"], [\"1800 rpm\", \"56 hp\"], [\"2800 rpm\", \"83 hp\"]]",
                ),
                ("full_load_sfc", "\"0.38 lb/hp·h\""),
            ],
        ),
    };
    (boat.into_iter().chain(boat_common).collect(), engine)
}

/// `text` with each blank `KEY = "FILL IN"` replaced, as `sed 's/^KEY = "FILL IN"/KEY = V/'` does.
pub(crate) fn fill(text: &str, values: &[(&str, &str)]) -> String {
    values.iter().fold(text.to_owned(), |text, (key, value)| {
        let blank = format!("{key} = \"{BLANK}\"");
        assert_eq!(text.matches(&blank).count(), 1, "one blank {blank}");
        text.replace(&blank, &format!("{key} = {value}"))
    })
}

/// Writes `boat` and `engine` into a fresh store and builds the boat's vessel, as `check` would.
fn load_and_build(dir: &Path, boat: &str, engine: &str) -> Result<(), String> {
    std::fs::create_dir_all(dir.join("boats")).unwrap();
    std::fs::create_dir_all(dir.join("engines")).unwrap();
    std::fs::write(dir.join("boats/kittiwake.toml"), boat).unwrap();
    std::fs::write(dir.join("engines/harbour-diesel.toml"), engine).unwrap();
    let store = Store::at(dir);
    let loaded = store.load_boat("kittiwake").map_err(|e| e.to_string())?;
    loaded.doc.check().map_err(|e| e.to_string())?;
    let engine = store.engine_for(&loaded).map_err(|e| e.to_string())?;
    loaded
        .doc
        .to_default_vessel(&engine.doc)
        .map(|_| ())
        .map_err(|e| e.to_string())
}

#[test]
fn filled_templates_load_and_build_a_vessel_in_both_systems() {
    for system in [Metric, Imperial] {
        let (boat_values, engine_values) = fills(system);
        let boat = fill(&boat_template("Kittiwake", system), &boat_values);
        let engine = fill(&engine_template("Harbour Diesel", system), &engine_values);
        assert!(unfilled_keys(&boat).is_empty() && unfilled_keys(&engine).is_empty());
        let dir = tempfile::tempdir().unwrap();
        load_and_build(dir.path(), &boat, &engine).unwrap_or_else(|e| panic!("{system:?}: {e}"));
    }
}

#[test]
fn every_blank_left_unfilled_is_refused_naming_its_key() {
    for system in [Metric, Imperial] {
        let (boat_values, engine_values) = fills(system);
        let engine_full = fill(&engine_template("Harbour Diesel", system), &engine_values);
        let boat_full = fill(&boat_template("Kittiwake", system), &boat_values);
        let boat_keys = unfilled_keys(&boat_template("Kittiwake", system));
        assert_eq!(boat_keys.len(), boat_values.len(), "{boat_keys:?}");
        for (index, (key, _)) in boat_values.iter().enumerate() {
            let mut others = boat_values.clone();
            others.remove(index);
            let boat = fill(&boat_template("Kittiwake", system), &others);
            let dir = tempfile::tempdir().unwrap();
            let message = load_and_build(dir.path(), &boat, &engine_full)
                .expect_err("a blank must be refused");
            assert!(
                message.contains(key) && message.contains(BLANK),
                "{key}: {message}"
            );
        }
        for (index, (key, _)) in engine_values.iter().enumerate() {
            let mut others = engine_values.clone();
            others.remove(index);
            let engine = fill(&engine_template("Harbour Diesel", system), &others);
            let dir = tempfile::tempdir().unwrap();
            let message = load_and_build(dir.path(), &boat_full, &engine)
                .expect_err("a blank must be refused");
            assert!(
                message.contains(key) && message.contains(BLANK),
                "{key}: {message}"
            );
        }
        // Nothing filled: refused, and the message names a key the template lists.
        let dir = tempfile::tempdir().unwrap();
        let raw = boat_template("Kittiwake", system);
        let message = load_and_build(dir.path(), &raw, &engine_full).unwrap_err();
        assert!(
            boat_keys.iter().any(|k| message.contains(k.as_str())),
            "{message}"
        );
    }
}

#[test]
fn templates_state_the_canoe_body_draft_and_the_margins() {
    for system in [Metric, Imperial] {
        let boat = boat_template("x", system);
        for needed in [
            "CANOE-BODY draft",
            "NOT the draft an",
            "service_margin = 0.15",
            "common practice",
            "means NO margin",
        ] {
            assert!(boat.contains(needed), "{system:?}: {needed}");
        }
        // Every key line written out carries a comment saying what it is.
        for text in [boat, engine_template("x", system)] {
            for line in text
                .lines()
                .filter(|l| l.contains(" = ") && !l.starts_with('#'))
            {
                let key = line.split(" = ").next().unwrap();
                let explained = line.contains('#') || key == "full_load_power" || key == "form";
                assert!(explained, "{system:?}: {line}");
            }
        }
    }
    assert_eq!(template::BLANK, "FILL IN");
}

#[test]
fn templates_give_the_repitch_limit_pitch_prints_and_the_gears_the_shortlist_reads() {
    use tidewright::propulsion::solver::pitch::DEFAULT_REPITCH_LIMIT;
    for system in [Metric, Imperial] {
        let boat = boat_template("x", system);
        let line = boat
            .lines()
            .find(|l| l.starts_with("# repitch_limit = "))
            .unwrap_or_else(|| panic!("{system:?}: no repitch_limit line"));
        let value = line.split('"').nth(1).unwrap();
        // The template's value is the default the solver applies: 2 in = 50.8 mm exactly
        // (the international inch, NIST SP 811 B.8).
        let parsed = tidewright::units::parse(value, tidewright::units::Kind::ScrewLength).unwrap();
        assert!(
            (parsed - DEFAULT_REPITCH_LIMIT).abs() < 1e-9,
            "{system:?}: {line}"
        );
        let engine = engine_template("x", system);
        assert!(
            engine.contains("# gears = [") && engine.contains("shortlist"),
            "{system:?}: the engine template names no gears"
        );
    }
    // And `pitch` prints that limit as the template writes it, not rounded to 51 mm.
    let out = assert_cmd::Command::cargo_bin("tidewright")
        .unwrap()
        .env_remove("TIDEWRIGHT_PROFILES")
        .args(["--profiles", "/nonexistent-store", "pitch", "pintle"])
        .output()
        .unwrap();
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("re-pitch limit of ±50.8 mm"), "{text}");
}
