//! Conversion constants and, per kind, the accepted units and the display units.
//!
//! Every constant is an exact or defined value from NIST Special Publication 811 (2008),
//! "Guide for the Use of the International System of Units (SI)", Appendix B (B.8 and B.9);
//! derived ones are computed here from those definitions rather than retyped in rounded form.

use super::{Kind, UnitSystem};

/// International foot in metres (NIST SP 811 B.8: exact).
pub const FOOT_M: f64 = 0.3048;
/// Inch in metres (NIST SP 811 B.8: exact).
pub const INCH_M: f64 = 0.0254;
/// Avoirdupois pound in kilograms (NIST SP 811 B.8: exact).
pub const POUND_KG: f64 = 0.453_592_37;
/// US liquid gallon in cubic metres (NIST SP 811 B.8: 231 in³, 3.785 411 784 L exact).
pub const US_GALLON_M3: f64 = 3.785_411_784e-3;
/// Litre in cubic metres (NIST SP 811 B.8: exact since 1964).
pub const LITRE_M3: f64 = 1e-3;
/// International nautical mile in metres (NIST SP 811 B.8: exact).
pub const NAUTICAL_MILE_M: f64 = 1852.0;
/// Knot (one nautical mile per hour) in metres per second (NIST SP 811 B.8: 1852/3600 exact).
pub const KNOT_MPS: f64 = NAUTICAL_MILE_M / 3600.0;
/// Standard acceleration of gravity in m/s² (NIST SP 811 B.8 footnote: 9.806 65 exact).
pub const STANDARD_GRAVITY_MPS2: f64 = 9.806_65;
/// Pound-force in newtons: one pound under standard gravity (NIST SP 811 B.8: 4.448 222 N).
pub const POUND_FORCE_N: f64 = POUND_KG * STANDARD_GRAVITY_MPS2;
/// Kilogram-force in newtons (NIST SP 811 B.8: 9.806 65 N exact).
pub const KILOGRAM_FORCE_N: f64 = STANDARD_GRAVITY_MPS2;
/// Horsepower (550 ft·lbf/s) in watts (NIST SP 811 B.8: 745.699 87 W).
pub const HORSEPOWER_W: f64 = 550.0 * FOOT_M * POUND_FORCE_N;
/// Metric horsepower (PS, 75 kgf·m/s) in watts (NIST SP 811 B.8: 735.498 75 W).
pub const METRIC_HORSEPOWER_W: f64 = 75.0 * KILOGRAM_FORCE_N;
/// Pound-force per square inch in pascals (NIST SP 811 B.8: 6.894 757 kPa).
pub const PSI_PA: f64 = POUND_FORCE_N / (INCH_M * INCH_M);
/// Pound-force foot in newton metres (NIST SP 811 B.8: 1.355 818 N·m).
pub const POUND_FORCE_FOOT_NM: f64 = POUND_FORCE_N * FOOT_M;
/// Hour in seconds.
pub const HOUR_S: f64 = 3600.0;
/// Kilowatt hour in joules (NIST SP 811 B.8: 3.6 MJ exact).
pub const KILOWATT_HOUR_J: f64 = 3.6e6;
/// Horsepower hour in joules (from the horsepower above).
pub const HORSEPOWER_HOUR_J: f64 = HORSEPOWER_W * HOUR_S;
/// Metric horsepower hour in joules (from the metric horsepower above).
pub const METRIC_HORSEPOWER_HOUR_J: f64 = METRIC_HORSEPOWER_W * HOUR_S;
/// Zero of the Celsius scale in kelvins (NIST SP 811 B.9: exact).
pub const CELSIUS_ZERO_K: f64 = 273.15;

/// One accepted unit: its spellings after normalisation and how to reach the internal unit.
#[derive(Debug)]
pub(super) struct UnitDef {
    /// Spellings in normalised form (no spaces, no `·`, `²`→`2`); the first names the unit.
    pub aliases: &'static [&'static str],
    /// Whether a spelling in another letter case is accepted. False where case carries meaning
    /// in SI (m/M: milli, mega, metre), so that "MM" or "mPa" is rejected rather than guessed.
    pub fold: bool,
    /// Internal units per one of this unit.
    pub scale: f64,
    /// The reading of this unit that is the internal zero (only temperature scales differ).
    pub zero: f64,
}

/// The unit a value of one kind is shown in, in one system.
#[derive(Debug)]
pub(super) struct DisplayUnit {
    /// Label printed after the number.
    pub label: &'static str,
    /// Internal units per one display unit.
    pub scale: f64,
    /// The display reading that is the internal zero.
    pub zero: f64,
    /// Decimal places normally shown.
    pub decimals: usize,
    /// Whether a space separates number and label ("15.0 %" but "12.0°").
    pub spaced: bool,
    /// A convenient editing step, in display units.
    pub nudge: f64,
    /// The label in plain ASCII, for terminals without UTF-8 (the same as `label` when it is).
    pub ascii: &'static str,
    /// Significant figures shown at least (0: decimals only), so that rows of a table differ.
    pub significant: usize,
    /// Whether a value on a quarter (x.25, x.75) is shown with two decimals even where the
    /// usual is one, so that a 1¼ in shaft reads "1.25 in" and not "1.2 in".
    pub quarters: bool,
    /// Decimal places a value is rounded to when written into a profile file (at least four
    /// significant figures are kept, so a small value never rounds to zero).
    pub file_decimals: usize,
}

impl DisplayUnit {
    /// This unit with `ascii` as its plain-ASCII label.
    const fn ascii(self, ascii: &'static str) -> Self {
        Self { ascii, ..self }
    }

    /// This unit showing at least `significant` significant figures.
    const fn significant(self, significant: usize) -> Self {
        Self {
            significant,
            ..self
        }
    }

    /// This unit showing quarters with two decimals.
    const fn quarters(self) -> Self {
        Self {
            quarters: true,
            ..self
        }
    }

    /// This unit rounded to `file_decimals` decimals in files.
    const fn file(self, file_decimals: usize) -> Self {
        Self {
            file_decimals,
            ..self
        }
    }
}

/// Everything the parser and the formatter know about one kind.
#[derive(Debug)]
pub(super) struct KindInfo {
    /// The kind's name in a sentence, e.g. "a length".
    pub name: &'static str,
    /// The accepted units, listed for error messages (each entry must parse).
    pub accepted: &'static str,
    /// Short examples for a missing unit.
    pub examples: &'static str,
    /// The accepted units.
    pub units: &'static [UnitDef],
    /// Display unit in the metric system.
    pub metric: DisplayUnit,
    /// Display unit in the imperial system.
    pub imperial: DisplayUnit,
}

impl KindInfo {
    /// The display unit for `system`.
    pub fn display(&self, system: UnitSystem) -> &DisplayUnit {
        match system {
            UnitSystem::Metric => &self.metric,
            UnitSystem::Imperial => &self.imperial,
        }
    }
}

const fn unit(aliases: &'static [&'static str], fold: bool, scale: f64) -> UnitDef {
    UnitDef {
        aliases,
        fold,
        scale,
        zero: 0.0,
    }
}

const fn shown(label: &'static str, scale: f64, decimals: usize, nudge: f64) -> DisplayUnit {
    DisplayUnit {
        label,
        scale,
        zero: 0.0,
        decimals,
        spaced: true,
        nudge,
        ascii: label,
        significant: 0,
        quarters: false,
        // Two more places than shown unless a kind says otherwise.
        file_decimals: decimals + 2,
    }
}

// Spellings shared by several kinds.
const METRE: UnitDef = unit(&["m"], false, 1.0);
const MILLIMETRE: UnitDef = unit(&["mm"], false, 1e-3);
const CENTIMETRE: UnitDef = unit(&["cm"], false, 1e-2);
const KILOMETRE: UnitDef = unit(&["km", "KM", "Km"], false, 1e3);
const FOOT: UnitDef = unit(&["ft", "feet", "foot", "'"], true, FOOT_M);
const INCH: UnitDef = unit(&["in", "inch", "inches", "\""], true, INCH_M);
const NAUTICAL_MILE: UnitDef = unit(
    &["nm", "nmi", "nauticalmile", "nauticalmiles"],
    true,
    NAUTICAL_MILE_M,
);

/// The inch unit, for the second part of a compound length.
pub(super) const INCH_UNIT: &UnitDef = &INCH;
/// The foot unit, which may be followed by inches.
pub(super) const FOOT_UNIT: &UnitDef = &FOOT;

static LENGTH_UNITS: [UnitDef; 6] = [METRE, MILLIMETRE, CENTIMETRE, KILOMETRE, FOOT, INCH];

static LENGTH: KindInfo = KindInfo {
    name: "a length",
    accepted: "m, mm, cm, km, ft, in, ', \" (or feet and inches: 36 ft 9 in)",
    examples: "11.2 m, 36 ft 9 in, 610 mm",
    units: &LENGTH_UNITS,
    metric: shown("m", 1.0, 2, 0.1).file(3),
    imperial: shown("ft", FOOT_M, 2, 0.5).file(3),
};

static SCREW_LENGTH: KindInfo = KindInfo {
    name: "a screw dimension",
    accepted: "mm, cm, m, in, \", ft",
    examples: "24 in, 610 mm",
    units: &LENGTH_UNITS,
    metric: shown("mm", 1e-3, 0, 10.0).file(1),
    imperial: shown("in", INCH_M, 1, 0.5).quarters().file(2),
};

static DISTANCE: KindInfo = KindInfo {
    name: "a distance",
    accepted: "nm (nautical mile), nmi, km, m",
    examples: "250 nm, 460 km",
    units: &[NAUTICAL_MILE, KILOMETRE, METRE],
    metric: shown("nm", NAUTICAL_MILE_M, 0, 10.0).file(1),
    imperial: shown("nm", NAUTICAL_MILE_M, 0, 10.0).file(1),
};

static FUEL_PER_DISTANCE: KindInfo = KindInfo {
    name: "a fuel use per distance",
    accepted: "L/nm, US gal/nm, gal/nm, L/km, m3/m",
    examples: "4.2 L/nm, 1.1 gal/nm",
    units: &[
        unit(&["L/nm", "L/nmi"], true, LITRE_M3 / NAUTICAL_MILE_M),
        unit(
            &["gal/nm", "USgal/nm", "gal/nmi", "USgal/nmi"],
            true,
            US_GALLON_M3 / NAUTICAL_MILE_M,
        ),
        unit(&["L/km", "l/km"], false, LITRE_M3 / 1e3),
        unit(&["m3/m"], false, 1.0),
    ],
    metric: shown("L/nm", LITRE_M3 / NAUTICAL_MILE_M, 1, 0.1)
        .significant(3)
        .file(3),
    imperial: shown("US gal/nm", US_GALLON_M3 / NAUTICAL_MILE_M, 1, 0.05)
        .significant(3)
        .file(3),
};

static MASS: KindInfo = KindInfo {
    name: "a mass",
    accepted: "t, kg, lb, lbs",
    examples: "13.8 t, 14500 kg, 30400 lb",
    units: &[
        unit(
            &["t", "tonne", "tonnes", "metricton", "metrictons"],
            true,
            1e3,
        ),
        unit(&["kg", "kilogram", "kilograms"], true, 1.0),
        unit(&["lb", "lbs", "pound", "pounds"], true, POUND_KG),
    ],
    metric: shown("t", 1e3, 2, 0.1).file(3),
    imperial: shown("lb", POUND_KG, 0, 100.0).file(0),
};

static POWER: KindInfo = KindInfo {
    name: "a power",
    accepted: "kW, W, hp, bhp, PS (metric hp)",
    examples: "60 kW, 80 hp",
    units: &[
        unit(&["kW", "kilowatt", "kilowatts"], true, 1e3),
        unit(&["W", "watt", "watts"], true, 1.0),
        unit(&["hp", "bhp", "shp", "horsepower"], true, HORSEPOWER_W),
        unit(&["PS", "metrichp"], true, METRIC_HORSEPOWER_W),
    ],
    metric: shown("kW", 1e3, 1, 1.0).file(2),
    imperial: shown("hp", HORSEPOWER_W, 1, 1.0).file(2),
};

static SPEED: KindInfo = KindInfo {
    name: "a speed",
    accepted: "kn, kt, kts, knots, m/s, km/h, kph, mph",
    examples: "7.5 kn, 3.9 m/s",
    units: &[
        unit(&["kn", "kt", "kts", "knot", "knots"], true, KNOT_MPS),
        unit(&["m/s"], false, 1.0),
        unit(&["km/h", "KM/H", "kmh", "kph", "KPH"], false, 1e3 / HOUR_S),
        // Statute mile: 5280 ft (NIST SP 811 B.8: 1609.344 m exact).
        unit(&["mph", "mi/h"], true, 5280.0 * FOOT_M / HOUR_S),
    ],
    metric: shown("kn", KNOT_MPS, 1, 0.1).file(2),
    imperial: shown("kn", KNOT_MPS, 1, 0.1).file(2),
};

static VOLUME: KindInfo = KindInfo {
    name: "a volume",
    accepted: "L, US gal, gal (US), m3, m³, ft3",
    examples: "800 L, 210 gal",
    units: &[
        unit(&["L", "litre", "litres", "liter", "liters"], true, LITRE_M3),
        unit(
            &["gal", "USgal", "gallon", "gallons", "USgallon", "USgallons"],
            true,
            US_GALLON_M3,
        ),
        unit(&["m3"], false, 1.0),
        unit(&["ft3", "cuft"], true, FOOT_M * FOOT_M * FOOT_M),
    ],
    metric: shown("L", LITRE_M3, 0, 10.0).file(1),
    imperial: shown("US gal", US_GALLON_M3, 1, 5.0).file(1),
};

static AREA: KindInfo = KindInfo {
    name: "an area",
    accepted: "m2, m², ft2, ft², sq ft, in2, cm2",
    examples: "42 m2, 450 sq ft",
    units: &[
        unit(&["m2", "sqm"], false, 1.0),
        unit(&["ft2", "sqft"], true, FOOT_M * FOOT_M),
        unit(&["in2", "sqin"], true, INCH_M * INCH_M),
        unit(&["cm2"], false, 1e-4),
    ],
    metric: shown("m²", 1.0, 2, 0.5).ascii("m2").file(3),
    imperial: shown("ft²", FOOT_M * FOOT_M, 1, 5.0).ascii("ft2").file(2),
};

static FRACTION: KindInfo = KindInfo {
    name: "a fraction",
    accepted: "%, or a plain number such as 0.97",
    examples: "15 %, 0.97",
    units: &[unit(&["%", "percent"], true, 0.01)],
    metric: shown("%", 0.01, 1, 1.0).file(2),
    imperial: shown("%", 0.01, 1, 1.0).file(2),
};

static FUEL_RATE: KindInfo = KindInfo {
    name: "a fuel rate",
    accepted: "L/h, US gal/h, gal/h, gph, L/min, m3/h, m3/s",
    examples: "12 L/h, 3.2 gal/h",
    units: &[
        unit(&["L/h", "L/hr", "lph"], true, LITRE_M3 / HOUR_S),
        unit(
            &["gal/h", "USgal/h", "gal/hr", "USgal/hr", "gph"],
            true,
            US_GALLON_M3 / HOUR_S,
        ),
        unit(&["L/min", "l/min"], false, LITRE_M3 / 60.0),
        unit(&["m3/h"], false, 1.0 / HOUR_S),
        unit(&["m3/s"], false, 1.0),
    ],
    metric: shown("L/h", LITRE_M3 / HOUR_S, 1, 0.5).file(2),
    imperial: shown("US gal/h", US_GALLON_M3 / HOUR_S, 2, 0.1).file(3),
};

static SPECIFIC_FUEL: KindInfo = KindInfo {
    name: "a specific fuel consumption",
    accepted: "g/kWh, kg/kWh, lb/hp·h, lb/hph, lb/(hp·h), g/PSh, kg/J",
    examples: "220 g/kWh, 0.36 lb/hp·h",
    units: &[
        unit(&["g/kWh"], true, 1e-3 / KILOWATT_HOUR_J),
        unit(&["kg/kWh"], true, 1.0 / KILOWATT_HOUR_J),
        unit(
            &["lb/hph", "lb/hp/h", "lb/bhph", "lbs/hph"],
            true,
            POUND_KG / HORSEPOWER_HOUR_J,
        ),
        unit(&["g/PSh"], true, 1e-3 / METRIC_HORSEPOWER_HOUR_J),
        unit(&["kg/J"], true, 1.0),
    ],
    metric: shown("g/kWh", 1e-3 / KILOWATT_HOUR_J, 0, 1.0).file(1),
    imperial: shown("lb/hp·h", POUND_KG / HORSEPOWER_HOUR_J, 3, 0.005)
        .ascii("lb/hp.h")
        .file(4),
};

static ROTATION: KindInfo = KindInfo {
    name: "a rotational speed",
    accepted: "rpm, r/min, rev/min, rev/s, rps, r/s",
    examples: "1800 rpm, 30 rev/s",
    units: &[
        unit(&["rpm", "r/min", "rev/min"], true, 1.0),
        unit(&["rev/s", "rps", "r/s"], true, 60.0),
    ],
    metric: shown("rpm", 1.0, 0, 50.0).file(0),
    imperial: shown("rpm", 1.0, 0, 50.0).file(0),
};

static TEMPERATURE: KindInfo = KindInfo {
    name: "a temperature",
    accepted: "°C, C, degC, °F, F, degF, K",
    examples: "15 °C, 59 °F",
    units: &[
        unit(&["°C", "C", "degC", "celsius"], true, 1.0),
        // NIST SP 811 B.9: t/°C = (t/°F − 32)/1.8.
        UnitDef {
            aliases: &["°F", "F", "degF", "fahrenheit"],
            fold: true,
            scale: 1.0 / 1.8,
            zero: 32.0,
        },
        UnitDef {
            aliases: &["K", "kelvin"],
            fold: false,
            scale: 1.0,
            zero: CELSIUS_ZERO_K,
        },
    ],
    metric: shown("°C", 1.0, 1, 1.0).ascii("degC").file(1),
    imperial: DisplayUnit {
        label: "°F",
        scale: 1.0 / 1.8,
        zero: 32.0,
        decimals: 1,
        spaced: true,
        nudge: 1.0,
        ascii: "degF",
        significant: 0,
        quarters: false,
        file_decimals: 1,
    },
};

static DENSITY_UNITS: [UnitDef; 6] = [
    unit(&["kg/m3", "Kg/m3"], false, 1.0),
    unit(&["kg/L", "kg/l", "Kg/L", "kg/dm3"], false, 1e3),
    unit(&["g/cm3", "g/mL", "g/ml"], false, 1e3),
    unit(&["t/m3"], false, 1e3),
    unit(
        &["lb/gal", "lb/USgal", "lbs/gal"],
        true,
        POUND_KG / US_GALLON_M3,
    ),
    unit(
        &["lb/ft3", "lbs/ft3"],
        true,
        POUND_KG / (FOOT_M * FOOT_M * FOOT_M),
    ),
];

static DENSITY: KindInfo = KindInfo {
    name: "a density",
    accepted: "kg/m3, kg/m³, kg/L, g/cm3, t/m3, lb/gal (US), lb/ft3",
    examples: "1025 kg/m3, 0.84 kg/L, 7.0 lb/gal",
    units: &DENSITY_UNITS,
    metric: shown("kg/m³", 1.0, 1, 1.0).ascii("kg/m3").file(3),
    imperial: shown("lb/ft³", POUND_KG / (FOOT_M * FOOT_M * FOOT_M), 2, 0.1)
        .ascii("lb/ft3")
        .file(3),
};

/// A fuel's density, shown the way fuel is bought and weighed: kg/L or lb/US gal.
static FUEL_DENSITY: KindInfo = KindInfo {
    name: "a fuel density",
    accepted: "kg/L, kg/m3, kg/m³, g/cm3, t/m3, lb/gal (US), lb/ft3",
    examples: "0.84 kg/L, 7.0 lb/gal",
    units: &DENSITY_UNITS,
    metric: shown("kg/L", 1e3, 3, 0.005).file(4),
    imperial: shown("lb/US gal", POUND_KG / US_GALLON_M3, 2, 0.05).file(3),
};

static FORCE: KindInfo = KindInfo {
    name: "a force",
    accepted: "N, kN, lbf, kgf",
    examples: "12 kN, 2700 lbf",
    units: &[
        unit(&["N", "newton", "newtons"], false, 1.0),
        unit(&["kN", "KN"], false, 1e3),
        unit(&["lbf"], true, POUND_FORCE_N),
        unit(&["kgf"], true, KILOGRAM_FORCE_N),
    ],
    metric: shown("kN", 1e3, 2, 0.1).file(3),
    imperial: shown("lbf", POUND_FORCE_N, 0, 25.0).file(0),
};

static ANGLE: KindInfo = KindInfo {
    name: "an angle",
    accepted: "°, deg, degrees, rad",
    examples: "12°, 12 deg",
    units: &[
        unit(&["°", "deg", "degree", "degrees"], true, 1.0),
        unit(
            &["rad", "radian", "radians"],
            true,
            180.0 / std::f64::consts::PI,
        ),
    ],
    metric: DisplayUnit {
        label: "°",
        scale: 1.0,
        zero: 0.0,
        decimals: 1,
        spaced: false,
        nudge: 1.0,
        ascii: "deg",
        significant: 0,
        quarters: false,
        file_decimals: 2,
    },
    imperial: DisplayUnit {
        label: "°",
        scale: 1.0,
        zero: 0.0,
        decimals: 1,
        spaced: false,
        nudge: 1.0,
        ascii: "deg",
        significant: 0,
        quarters: false,
        file_decimals: 2,
    },
};

static TORQUE: KindInfo = KindInfo {
    name: "a torque",
    accepted: "N·m, Nm, kN·m, kNm, lbf·ft, lb·ft, ft·lbf",
    examples: "450 N·m, 330 lbf·ft",
    units: &[
        unit(&["Nm", "NM"], false, 1.0),
        unit(&["kNm", "KNm"], false, 1e3),
        unit(
            &["lbfft", "lbft", "lbsft", "ftlbf", "ftlb", "ftlbs"],
            true,
            POUND_FORCE_FOOT_NM,
        ),
    ],
    metric: shown("N·m", 1.0, 0, 10.0).ascii("N.m").file(1),
    imperial: shown("lbf·ft", POUND_FORCE_FOOT_NM, 0, 10.0)
        .ascii("lbf.ft")
        .file(1),
};

static PRESSURE: KindInfo = KindInfo {
    name: "a pressure",
    accepted: "Pa, kPa, MPa, bar, psi",
    examples: "101.3 kPa, 14.7 psi",
    units: &[
        unit(&["Pa", "pa"], false, 1.0),
        unit(&["kPa", "kpa", "KPa", "KPA"], false, 1e3),
        unit(&["MPa", "MPA", "N/mm2"], false, 1e6),
        unit(&["bar"], true, 1e5),
        unit(&["psi", "lbf/in2"], true, PSI_PA),
    ],
    metric: shown("kPa", 1e3, 1, 1.0).file(2),
    imperial: shown("psi", PSI_PA, 2, 0.1).file(3),
};

static TIME: KindInfo = KindInfo {
    name: "a time",
    accepted: "s, min, h, hr",
    examples: "90 s, 12 min, 24 h",
    units: &[
        unit(&["s", "sec", "secs", "second", "seconds"], true, 1.0),
        unit(&["min", "mins", "minute", "minutes"], true, 60.0),
        unit(&["h", "hr", "hrs", "hour", "hours"], true, HOUR_S),
    ],
    metric: shown("h", HOUR_S, 2, 0.5).file(3),
    imperial: shown("h", HOUR_S, 2, 0.5).file(3),
};

/// What is known about `kind`.
pub(super) fn info(kind: Kind) -> &'static KindInfo {
    match kind {
        Kind::Length => &LENGTH,
        Kind::ScrewLength => &SCREW_LENGTH,
        Kind::Distance => &DISTANCE,
        Kind::FuelPerDistance => &FUEL_PER_DISTANCE,
        Kind::Mass => &MASS,
        Kind::Power => &POWER,
        Kind::Speed => &SPEED,
        Kind::Volume => &VOLUME,
        Kind::Area => &AREA,
        Kind::Fraction => &FRACTION,
        Kind::FuelRate => &FUEL_RATE,
        Kind::SpecificFuel => &SPECIFIC_FUEL,
        Kind::Rotation => &ROTATION,
        Kind::Temperature => &TEMPERATURE,
        Kind::Density => &DENSITY,
        Kind::FuelDensity => &FUEL_DENSITY,
        Kind::Force => &FORCE,
        Kind::Angle => &ANGLE,
        Kind::Torque => &TORQUE,
        Kind::Pressure => &PRESSURE,
        Kind::Time => &TIME,
    }
}
