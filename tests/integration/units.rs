//! Integration tests: units — constants against NIST SP 811 and the `uom` crate, parsing of
//! every kind, compound lengths, errors, formatting and the file round trip.

use proptest::prelude::*;
use tidewright::units::{
    self, Kind, UnitError, UnitSystem, format, format_for_file, from_display, parse, to_display,
    unit_label,
};

const SYSTEMS: [UnitSystem; 2] = [UnitSystem::Metric, UnitSystem::Imperial];

fn ok(text: &str, kind: Kind) -> f64 {
    parse(text, kind).unwrap_or_else(|e| panic!("{text:?} as {kind:?}: {e}"))
}

// NIST SP 811 (2008), Appendix B.8, exact or defined values (as quoted in
// shared/reference/water-and-units.md).
#[test]
fn constants_match_nist_sp_811() {
    assert_eq!(units::FOOT_M, 0.3048); // NIST SP 811 B.8: foot = 3.048 E-01 m exact
    assert_eq!(units::INCH_M, 0.0254); // NIST SP 811 B.8: inch = 2.54 E-02 m exact
    assert_eq!(units::POUND_KG, 0.45359237); // NIST SP 811 B.8: pound (avdp) exact
    assert_close!(units::US_GALLON_M3 * 1e3, 3.785411784, 1e-15); // NIST SP 811 B.8: US gal exact
    assert_eq!(units::NAUTICAL_MILE_M, 1852.0); // NIST SP 811 B.8: nautical mile exact
    assert_close!(units::KNOT_MPS, 1852.0 / 3600.0, 1e-15); // NIST SP 811 B.8: knot
    assert_close!(units::KNOT_MPS, 0.5144444, 1e-7); // NIST SP 811 B.8: 5.144 444 E-01 m/s
    assert_close!(units::HORSEPOWER_W, 745.69987, 1e-8); // NIST SP 811 B.8: hp (550 ft·lbf/s)
    assert_close!(units::METRIC_HORSEPOWER_W, 735.49875, 1e-12); // NIST SP 811 B.8: metric hp
    assert_close!(units::POUND_FORCE_N, 4.4482216, 1e-8); // NIST SP 811 B.8: lbf
    assert_close!(units::PSI_PA, 6894.757, 1e-7); // NIST SP 811 B.8: psi = 6.894 757 E+03 Pa
    assert_close!(units::POUND_FORCE_FOOT_NM, 1.355818, 1e-6); // NIST SP 811 B.8: lbf·ft
    // A US gallon is 231 cubic inches by definition (NIST SP 811 B.8 footnote).
    assert_close!(units::US_GALLON_M3, 231.0 * units::INCH_M.powi(3), 1e-15);
}

// Cross-check against the `uom` crate, whose factors are given to 7 significant digits.
#[test]
fn constants_match_uom() {
    use uom::si::f64 as q;
    use uom::si::{force, length, mass, power, pressure, torque, velocity, volume};
    let uom_rel = 1e-6;
    assert_close!(
        units::FOOT_M,
        q::Length::new::<length::foot>(1.0).get::<length::meter>(),
        1e-12
    );
    assert_close!(
        units::INCH_M,
        q::Length::new::<length::inch>(1.0).get::<length::meter>(),
        1e-12
    );
    assert_close!(
        units::NAUTICAL_MILE_M,
        q::Length::new::<length::nautical_mile>(1.0).get::<length::meter>(),
        1e-12
    );
    assert_close!(
        units::POUND_KG,
        q::Mass::new::<mass::pound>(1.0).get::<mass::kilogram>(),
        uom_rel
    );
    assert_close!(
        units::US_GALLON_M3,
        q::Volume::new::<volume::gallon>(1.0).get::<volume::cubic_meter>(),
        uom_rel
    );
    assert_close!(
        units::KNOT_MPS,
        q::Velocity::new::<velocity::knot>(1.0).get::<velocity::meter_per_second>(),
        1e-12
    );
    assert_close!(
        units::HORSEPOWER_W,
        q::Power::new::<power::horsepower>(1.0).get::<power::watt>(),
        uom_rel
    );
    assert_close!(
        units::METRIC_HORSEPOWER_W,
        q::Power::new::<power::horsepower_metric>(1.0).get::<power::watt>(),
        uom_rel
    );
    assert_close!(
        units::POUND_FORCE_N,
        q::Force::new::<force::pound_force>(1.0).get::<force::newton>(),
        uom_rel
    );
    assert_close!(
        units::PSI_PA,
        q::Pressure::new::<pressure::pound_force_per_square_inch>(1.0).get::<pressure::pascal>(),
        uom_rel
    );
    assert_close!(
        units::POUND_FORCE_FOOT_NM,
        q::Torque::new::<torque::pound_force_foot>(1.0).get::<torque::newton_meter>(),
        uom_rel
    );
}

// Parsed values of every kind against `uom` conversions of the same quantity.
#[test]
fn parsed_quantities_agree_with_uom() {
    use uom::si::f64 as q;
    use uom::si::{
        area, mass_density, mass_per_energy, thermodynamic_temperature as temp, velocity,
        volume_rate,
    };
    let uom_rel = 1e-6;
    assert_close!(
        ok("450 sq ft", Kind::Area),
        q::Area::new::<area::square_foot>(450.0).get::<area::square_meter>(),
        uom_rel
    );
    assert_close!(
        ok("8 mph", Kind::Speed),
        q::Velocity::new::<velocity::mile_per_hour>(8.0).get::<velocity::meter_per_second>(),
        uom_rel
    );
    assert_close!(
        ok("14 km/h", Kind::Speed),
        q::Velocity::new::<velocity::kilometer_per_hour>(14.0).get::<velocity::meter_per_second>(),
        uom_rel
    );
    assert_close!(
        ok("0.2 L/min", Kind::FuelRate),
        q::VolumeRate::new::<volume_rate::liter_per_minute>(0.2)
            .get::<volume_rate::cubic_meter_per_second>(),
        uom_rel
    );
    assert_close!(
        ok("0.36 lb/hp·h", Kind::SpecificFuel),
        0.36 * q::MassPerEnergy::new::<mass_per_energy::pound_per_kilowatt_hour>(1.0)
            .get::<mass_per_energy::kilogram_per_joule>()
            / q::Power::new::<uom::si::power::horsepower>(1.0).get::<uom::si::power::kilowatt>(),
        uom_rel
    );
    assert_close!(
        ok("220 g/kWh", Kind::SpecificFuel),
        q::MassPerEnergy::new::<mass_per_energy::kilogram_per_kilowatt_hour>(0.220)
            .get::<mass_per_energy::kilogram_per_joule>(),
        1e-12
    );
    assert_close!(
        ok("3.2 gal/h", Kind::FuelRate),
        q::VolumeRate::new::<volume_rate::gallon_per_minute>(3.2 / 60.0)
            .get::<volume_rate::cubic_meter_per_second>(),
        uom_rel
    );
    assert_close!(
        ok("64 lb/ft3", Kind::Density),
        q::MassDensity::new::<mass_density::pound_per_cubic_foot>(64.0)
            .get::<mass_density::kilogram_per_cubic_meter>(),
        uom_rel
    );
    let fahrenheit = q::ThermodynamicTemperature::new::<temp::degree_fahrenheit>(59.0);
    assert_close!(
        ok("59 °F", Kind::Temperature),
        fahrenheit.get::<temp::degree_celsius>(),
        1e-9
    );
}

// Examples from the issue and design (§4), one or more per kind; the expected values follow
// from the NIST SP 811 constants.
#[test]
fn parses_every_kind() {
    let ft = 0.3048;
    let inch = 0.0254;
    assert_close!(ok("11.2 m", Kind::Length), 11.2, 1e-15);
    assert_close!(ok("11.2m", Kind::Length), 11.2, 1e-15);
    assert_close!(ok("36 ft", Kind::Length), 36.0 * ft, 1e-15);
    assert_close!(ok("24 in", Kind::ScrewLength), 24.0 * inch, 1e-15);
    assert_close!(ok("610 mm", Kind::ScrewLength), 0.610, 1e-15);
    assert_close!(ok("61 cm", Kind::ScrewLength), 0.610, 1e-15);
    assert_close!(ok("13.8 t", Kind::Mass), 13_800.0, 1e-15);
    assert_close!(ok("30400 lb", Kind::Mass), 30_400.0 * 0.45359237, 1e-15);
    assert_close!(ok("30400 lbs", Kind::Mass), 30_400.0 * 0.45359237, 1e-15);
    assert_close!(ok("14500 kg", Kind::Mass), 14_500.0, 1e-15);
    assert_close!(ok("80 hp", Kind::Power), 80.0 * 745.69987, 1e-8);
    assert_close!(ok("60 kW", Kind::Power), 60_000.0, 1e-15);
    assert_close!(ok("75 PS", Kind::Power), 75.0 * 735.49875, 1e-12);
    assert_close!(ok("5000 W", Kind::Power), 5000.0, 1e-15);
    for knots in ["7.5 kn", "7.5 kt", "7.5 knots", "7.5KN", "7.5 kts"] {
        assert_close!(ok(knots, Kind::Speed), 7.5 * 1852.0 / 3600.0, 1e-15);
    }
    assert_close!(ok("3.9 m/s", Kind::Speed), 3.9, 1e-15);
    assert_close!(ok("800 L", Kind::Volume), 0.8, 1e-15);
    assert_close!(ok("210 gal", Kind::Volume), 210.0 * 3.785411784e-3, 1e-15);
    assert_close!(
        ok("210 US gal", Kind::Volume),
        210.0 * 3.785411784e-3,
        1e-15
    );
    assert_close!(ok("2.5 m3", Kind::Volume), 2.5, 1e-15);
    assert_close!(ok("2.5 m³", Kind::Volume), 2.5, 1e-15);
    assert_close!(ok("42 m2", Kind::Area), 42.0, 1e-15);
    assert_close!(ok("42 m²", Kind::Area), 42.0, 1e-15);
    for area in ["450 ft2", "450 ft²", "450 sq ft"] {
        assert_close!(ok(area, Kind::Area), 450.0 * ft * ft, 1e-15);
    }
    assert_close!(ok("15 %", Kind::Fraction), 0.15, 1e-15);
    assert_close!(ok("15%", Kind::Fraction), 0.15, 1e-15);
    assert_close!(ok("0.97", Kind::Fraction), 0.97, 1e-15);
    assert_close!(ok("12 L/h", Kind::FuelRate), 12e-3 / 3600.0, 1e-15);
    assert_close!(
        ok("3.2 gal/h", Kind::FuelRate),
        3.2 * 3.785411784e-3 / 3600.0,
        1e-15
    );
    assert_close!(ok("1e-4 m3/s", Kind::FuelRate), 1e-4, 1e-15);
    assert_close!(ok("220 g/kWh", Kind::SpecificFuel), 0.220 / 3.6e6, 1e-15);
    let lb_per_hp_h = 0.45359237 / (745.699_871_582_270_2 * 3600.0);
    for sfc in [
        "0.36 lb/hp·h",
        "0.36 lb/hph",
        "0.36 lb/(hp·h)",
        "0.36 lb/hp h",
    ] {
        assert_close!(ok(sfc, Kind::SpecificFuel), 0.36 * lb_per_hp_h, 1e-12);
    }
    assert_close!(ok("1800 rpm", Kind::Rotation), 1800.0, 1e-15);
    assert_close!(ok("1800 RPM", Kind::Rotation), 1800.0, 1e-15);
    assert_close!(ok("30 rev/s", Kind::Rotation), 1800.0, 1e-15);
    assert_close!(ok("15 °C", Kind::Temperature), 15.0, 1e-15);
    assert_close!(ok("15 C", Kind::Temperature), 15.0, 1e-15);
    // NIST SP 811 B.9: 59 °F = 15 °C; 288.15 K = 15 °C.
    assert_close!(ok("59 °F", Kind::Temperature), 15.0, 1e-12);
    assert_close!(ok("288.15 K", Kind::Temperature), 15.0, 1e-12);
    assert_close!(ok("1025 kg/m3", Kind::Density), 1025.0, 1e-15);
    assert_close!(ok("1025 kg/m³", Kind::Density), 1025.0, 1e-15);
    assert_close!(ok("0.84 kg/L", Kind::Density), 840.0, 1e-15);
    assert_close!(
        ok("7.0 lb/gal", Kind::Density),
        7.0 * 0.45359237 / 3.785411784e-3,
        1e-15
    );
    assert_close!(ok("1200 N", Kind::Force), 1200.0, 1e-15);
    assert_close!(ok("12 kN", Kind::Force), 12_000.0, 1e-15);
    assert_close!(ok("2700 lbf", Kind::Force), 2700.0 * 4.4482216152605, 1e-12);
    for torque in ["450 N·m", "450 Nm", "450 N m", "0.45 kN·m", "0.45 kNm"] {
        assert_close!(ok(torque, Kind::Torque), 450.0, 1e-12);
    }
    for torque in ["330 lbf·ft", "330 lb·ft", "330 lbf-ft", "330 ft·lbf"] {
        assert_close!(
            ok(torque, Kind::Torque),
            330.0 * 4.4482216152605 * ft,
            1e-12
        );
    }
    assert_close!(ok("101325 Pa", Kind::Pressure), 101_325.0, 1e-15);
    assert_close!(ok("101.325 kPa", Kind::Pressure), 101_325.0, 1e-15);
    assert_close!(ok("0.101325 MPa", Kind::Pressure), 101_325.0, 1e-15);
    assert_close!(ok("1.01325 bar", Kind::Pressure), 101_325.0, 1e-15);
    // NIST SP 811 B.8: 14.695 95 psi is one standard atmosphere (101 325 Pa).
    assert_close!(ok("14.69595 psi", Kind::Pressure), 101_325.0, 1e-6);
    assert_close!(ok("90 s", Kind::Time), 90.0, 1e-15);
    assert_close!(ok("12 min", Kind::Time), 720.0, 1e-15);
    assert_close!(ok("24 h", Kind::Time), 86_400.0, 1e-15);
    assert_close!(ok("12°", Kind::Angle), 12.0, 1e-15);
    assert_close!(ok("12 deg", Kind::Angle), 12.0, 1e-15);
    assert_close!(ok("250 nm", Kind::Distance), 250.0 * 1852.0, 1e-15);
    assert_close!(ok("250 NM", Kind::Distance), 250.0 * 1852.0, 1e-15);
    assert_close!(ok("460 km", Kind::Distance), 460_000.0, 1e-15);
    assert_close!(ok("900 m", Kind::Distance), 900.0, 1e-15);
    assert_close!(
        ok("4.2 L/nm", Kind::FuelPerDistance),
        4.2e-3 / 1852.0,
        1e-15
    );
    assert_close!(
        ok("1.1 gal/nm", Kind::FuelPerDistance),
        1.1 * 3.785411784e-3 / 1852.0,
        1e-15
    );
}

#[test]
fn parses_signs_exponents_and_spacing() {
    assert_close!(ok("-2.5 m", Kind::Length), -2.5, 1e-15);
    assert_close!(ok("+2.5 m", Kind::Length), 2.5, 1e-15);
    assert_close!(ok("−2.5 m", Kind::Length), -2.5, 1e-15); // U+2212 minus sign
    assert_close!(ok("1.5e3 mm", Kind::Length), 1.5, 1e-15);
    assert_close!(ok("1.5E+3mm", Kind::Length), 1.5, 1e-15);
    assert_close!(ok(".5 m", Kind::Length), 0.5, 1e-15);
    assert_close!(ok("5. m", Kind::Length), 5.0, 1e-15);
    assert_close!(ok("  11.2   m  ", Kind::Length), 11.2, 1e-15);
}

#[test]
fn parses_compound_feet_and_inches() {
    let want = 36.0 * 0.3048 + 9.0 * 0.0254;
    for text in [
        "36 ft 9 in",
        "36ft 9in",
        "36ft9in",
        "36' 9\"",
        "36'9\"",
        "36′ 9″",
        "36 feet 9 inches",
    ] {
        assert_close!(ok(text, Kind::Length), want, 1e-15);
    }
    assert_close!(
        ok("2 ft 0.5 in", Kind::ScrewLength),
        2.0 * 0.3048 + 0.5 * 0.0254,
        1e-15
    );
    // The sign before the feet applies to the whole length.
    assert_close!(
        ok("-1 ft 6 in", Kind::Length),
        -(0.3048 + 6.0 * 0.0254),
        1e-15
    );
}

#[test]
fn compound_is_only_for_lengths_and_only_feet_then_inches() {
    assert!(matches!(
        parse("36 ft 9 m", Kind::Length),
        Err(UnitError::UnknownUnit { .. })
    ));
    assert!(matches!(
        parse("36 ft 9", Kind::Length),
        Err(UnitError::MissingUnit { .. })
    ));
    assert!(matches!(
        parse("11 m 20 cm", Kind::Length),
        Err(UnitError::Trailing { .. })
    ));
    assert!(matches!(
        parse("36 ft 9 in 2", Kind::Length),
        Err(UnitError::Trailing { .. })
    ));
    assert!(matches!(
        parse("36 ft -9 in", Kind::Length),
        Err(UnitError::Trailing { .. })
    ));
    assert!(matches!(
        parse("12 kn 3 kn", Kind::Speed),
        Err(UnitError::Trailing { .. })
    ));
}

#[test]
fn missing_unit_is_an_error_except_for_fractions() {
    for kind in Kind::ALL {
        let result = parse("12", kind);
        if kind == Kind::Fraction {
            assert_eq!(result, Ok(12.0));
        } else {
            let error = result.expect_err("a bare number needs a unit");
            assert!(
                matches!(error, UnitError::MissingUnit { .. }),
                "{kind:?}: {error}"
            );
            assert!(error.to_string().contains("no unit"), "{error}");
        }
    }
    let message = parse("11.2", Kind::Length).unwrap_err().to_string();
    assert!(
        message.contains("a length") && message.contains("11.2 m"),
        "{message}"
    );
}

#[test]
fn unknown_unit_names_it_its_position_and_the_accepted_units() {
    let error = parse("13.8 tons", Kind::Mass).unwrap_err();
    assert_eq!(
        error,
        UnitError::UnknownUnit {
            text: "13.8 tons".into(),
            unit: "tons".into(),
            position: 5,
            kind_name: "a mass",
            examples: units::accepted_units(Kind::Mass),
        }
    );
    let message = error.to_string();
    assert!(
        message.contains("\"tons\"") && message.contains("character 5"),
        "{message}"
    );
    assert!(
        message.contains("kg") && message.contains("lb"),
        "{message}"
    );
    // A speed unit is not a length, and an imperial gallon is not guessed.
    assert!(matches!(
        parse("7.5 kn", Kind::Length),
        Err(UnitError::UnknownUnit { .. })
    ));
    assert!(matches!(
        parse("210 imp gal", Kind::Volume),
        Err(UnitError::UnknownUnit { .. })
    ));
    assert!(matches!(
        parse("3 miles", Kind::Distance),
        Err(UnitError::UnknownUnit { .. })
    ));
}

#[test]
fn letter_case_is_not_guessed_where_it_carries_meaning() {
    // "Mm" would be megametres and "M" is both a nautical mile and a mega prefix: rejected.
    for text in ["610 Mm", "610 MM", "6 M"] {
        assert!(
            matches!(
                parse(text, Kind::Length),
                Err(UnitError::UnknownUnit { .. })
            ),
            "{text}"
        );
    }
    assert!(parse("6 M", Kind::Distance).is_err());
    assert!(parse("2 mPa", Kind::Pressure).is_err()); // millipascal is not megapascal
    assert!(parse("12 n", Kind::Force).is_err());
    assert!(parse("450 nm", Kind::Torque).is_err()); // not N·m
    // Where case carries no meaning it is accepted.
    assert_close!(ok("80 HP", Kind::Power), 80.0 * 745.69987, 1e-8);
    assert_close!(ok("60 KW", Kind::Power), 60_000.0, 1e-15);
    assert_close!(ok("36 FT", Kind::Length), 36.0 * 0.3048, 1e-15);
    assert_close!(ok("210 GAL", Kind::Volume), 210.0 * 3.785411784e-3, 1e-15);
}

#[test]
fn bad_numbers_are_errors_not_panics() {
    for text in [
        "", "   ", "m", "abc", "-", ".", "e5 m", "NaN", "inf m", "½ m", "١٢ m",
    ] {
        assert!(
            matches!(parse(text, Kind::Length), Err(UnitError::NoNumber { .. })),
            "{text:?} gave {:?}",
            parse(text, Kind::Length)
        );
    }
    assert_eq!(
        parse("1e400 m", Kind::Length),
        Err(UnitError::NotFinite {
            text: "1e400 m".into()
        })
    );
    // Finite as written but not once converted.
    assert!(matches!(
        parse("1e308 t", Kind::Mass),
        Err(UnitError::NotFinite { .. })
    ));
    // A decimal comma is named as such (issue 14), not taken for an unknown unit.
    assert!(matches!(
        parse("1,5 m", Kind::Length),
        Err(UnitError::Comma { position: 1, .. })
    ));
    assert!(matches!(
        parse("12 m²", Kind::Length),
        Err(UnitError::UnknownUnit { .. })
    ));
}

#[test]
fn formats_with_display_units_and_precision() {
    use UnitSystem::{Imperial, Metric};
    assert_eq!(format(11.2, Kind::Length, Metric), "11.20 m");
    assert_eq!(
        format(36.0 * 0.3048 + 9.0 * 0.0254, Kind::Length, Imperial),
        "36.75 ft"
    );
    assert_eq!(
        format(24.0 * 0.0254, Kind::ScrewLength, Imperial),
        "24.0 in"
    );
    assert_eq!(format(0.610, Kind::ScrewLength, Metric), "610 mm");
    assert_eq!(format(7.5 * 1852.0 / 3600.0, Kind::Speed, Metric), "7.5 kn");
    assert_eq!(
        format(7.5 * 1852.0 / 3600.0, Kind::Speed, Imperial),
        "7.5 kn"
    );
    assert_eq!(format(1850.0, Kind::Rotation, Metric), "1850 rpm");
    assert_eq!(format(13_800.0, Kind::Mass, Metric), "13.80 t");
    assert_eq!(
        format(30_400.0 * 0.45359237, Kind::Mass, Imperial),
        "30400 lb"
    );
    assert_eq!(format(60_000.0, Kind::Power, Metric), "60.0 kW");
    assert_eq!(
        format(80.0 * 745.69987158227, Kind::Power, Imperial),
        "80.0 hp"
    );
    assert_eq!(format(0.8, Kind::Volume, Metric), "800 L");
    assert_eq!(
        format(210.0 * 3.785411784e-3, Kind::Volume, Imperial),
        "210.0 US gal"
    );
    assert_eq!(format(0.15, Kind::Fraction, Metric), "15.0 %");
    assert_eq!(format(12e-3 / 3600.0, Kind::FuelRate, Metric), "12.0 L/h");
    assert_eq!(
        format(0.220 / 3.6e6, Kind::SpecificFuel, Metric),
        "220 g/kWh"
    );
    assert_eq!(format(15.0, Kind::Temperature, Metric), "15.0 °C");
    assert_eq!(format(15.0, Kind::Temperature, Imperial), "59.0 °F"); // NIST SP 811 B.9
    assert_eq!(format(12.0, Kind::Angle, Metric), "12.0°");
    // A range is shown in whole nautical miles: no false precision (issue 14).
    assert_eq!(format(250.0 * 1852.0, Kind::Distance, Imperial), "250 nm");
    assert_eq!(format(14_500.0, Kind::Force, Metric), "14.50 kN");
    assert_eq!(format(101_325.0, Kind::Pressure, Metric), "101.3 kPa");
    assert_eq!(format(101_325.0, Kind::Pressure, Imperial), "14.70 psi");
    // Small values keep two significant digits; a rounded zero has no minus sign.
    assert_eq!(format(0.05, Kind::Length, Metric), "0.050 m");
    assert_eq!(format(-0.001, Kind::Rotation, Metric), "0 rpm");
    assert_eq!(format(-0.0, Kind::Length, Metric), "0.00 m");
}

#[test]
fn formatting_never_shows_nan_or_infinity() {
    for kind in Kind::ALL {
        for system in SYSTEMS {
            for value in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
                assert_eq!(format(value, kind, system), "—");
                assert_eq!(format_for_file(value, kind, system), "—");
            }
            for value in [
                0.0,
                -0.0,
                1e-300,
                -1e-12,
                1.0,
                1e12,
                1e300,
                f64::MAX,
                f64::MIN_POSITIVE,
            ] {
                let text = format(value, kind, system);
                let lower = text.to_lowercase();
                assert!(
                    !lower.contains("nan") && !lower.contains("inf"),
                    "{kind:?}: {text}"
                );
            }
        }
    }
}

#[test]
fn display_conversion_and_labels_agree_with_format() {
    for kind in Kind::ALL {
        for system in SYSTEMS {
            let value = ok(&format!("3.7 {}", unit_label(kind, system)), kind);
            assert_close!(to_display(value, kind, system), 3.7, 1e-12);
            assert_close!(from_display(3.7, kind, system), value, 1e-12);
            assert!(format(value, kind, system).contains(unit_label(kind, system)));
            assert!(units::nudge_step(kind, system) > 0.0);
        }
    }
}

proptest! {
    #![proptest_config(crate::robustness::cases(400))]

    // format_for_file rounds to its unit's file precision but keeps four significant figures,
    // so it reads back within 5e-4 relative (plus float noise) for any magnitude and kind.
    #[test]
    fn file_format_round_trips(
        mantissa in -10.0f64..10.0,
        exponent in -12i32..12,
        kind_index in 0usize..Kind::ALL.len(),
        imperial in any::<bool>(),
    ) {
        let kind = Kind::ALL[kind_index];
        let system = if imperial { UnitSystem::Imperial } else { UnitSystem::Metric };
        let value = mantissa * 10f64.powi(exponent);
        let written = format_for_file(value, kind, system);
        let read = parse(&written, kind).map_err(|e| TestCaseError::fail(e.to_string()))?;
        // Temperature scales are affine: the rounding is of the °F reading, which lies up to
        // 32 °F (17.8 °C) away from the internal zero, so its error is relative to that.
        let scale = if kind == Kind::Temperature { value.abs() + 17.8 } else { value.abs() };
        prop_assert!((read - value).abs() <= 5.0001e-4 * scale, "{} -> {:?} -> {}", value, written, read);
    }

    // No input text makes the parser panic.
    #[test]
    fn parser_never_panics(text in "\\PC{0,24}", kind_index in 0usize..Kind::ALL.len()) {
        if let Ok(value) = parse(&text, Kind::ALL[kind_index]) {
            prop_assert!(value.is_finite());
        }
    }
}
