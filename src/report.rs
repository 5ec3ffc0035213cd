//! Reports of solved boats: text, CSV, JSON, Markdown and SVG charts.
//!
//! The report layer calls the solver and lays its results out; it does no physics. Numbers in
//! text, CSV, Markdown and charts are shown in the chosen [`UnitSystem`]; JSON always carries SI
//! values or the unit in the field's name (`speed_kn`, `brake_kw`, `fuel_lph`).

pub mod boat;
pub mod export;
pub mod json;
pub mod openwater;
pub mod svg;
pub mod table;

use crate::units::{self, Kind, UnitSystem};

/// The caution shown wherever a pitch, a match verdict or an engine load is given.
pub const CAUTION: &str = "These figures are estimates from published methods and the inputs given. \
The engine maker's installation limits, local codes and a licensed marine surveyor or naval \
architect decide the final engine, gear and screw.";

/// Metres per second in one knot (1852 m per hour, exact; NIST SP 811 B.8).
pub const KNOT_MPS: f64 = 1852.0 / 3600.0;
/// Metres in one nautical mile (exact; NIST SP 811 B.8).
pub const NAUTICAL_MILE_M: f64 = 1852.0;
/// Cubic metres in one litre (exact; NIST SP 811 B.8).
pub const LITRE_M3: f64 = 1e-3;
/// Metres in one inch (exact; NIST SP 811 B.8).
pub const INCH_M: f64 = 0.0254;

/// How one kind of quantity is shown in one unit system: its label and SI units per label unit.
#[derive(Debug, Clone, PartialEq)]
pub struct DisplayScale {
    /// The unit label, e.g. "kW".
    pub label: String,
    /// Internal (SI) units per one display unit, e.g. 1000 for kW.
    pub scale: f64,
}

impl DisplayScale {
    /// The display unit of `kind` in `system`, as the units module prints and parses it.
    ///
    /// The label is what [`units::format`] writes after the number; the scale is what
    /// [`units::parse`] gives for one of that unit, so the report holds no constants of its own.
    pub fn of(kind: Kind, system: UnitSystem) -> Option<Self> {
        let printed = units::format(1.0, kind, system);
        let (_, label) = split_quantity(&printed);
        if label.is_empty() {
            return None;
        }
        let scale = units::parse(&format!("1 {label}"), kind)
            .or_else(|_| units::parse(&format!("1{label}"), kind))
            .ok()
            .filter(|s| s.is_finite() && *s > 0.0)?;
        Some(Self {
            label: label.to_string(),
            scale,
        })
    }

    /// `value` (SI) in this display unit with `decimals` places.
    pub fn number(&self, value: f64, decimals: usize) -> String {
        format!("{:.*}", decimals, value / self.scale)
    }
}

/// Splits "7.50 kn" or "12.0°" into its number and its unit label.
pub fn split_quantity(text: &str) -> (&str, &str) {
    let text = text.trim();
    let end = text
        .char_indices()
        .find(|&(i, c)| {
            !(c.is_ascii_digit()
                || c == '.'
                || c == ','
                || ((c == '-' || c == '+' || c == '−') && i == 0))
        })
        .map_or(text.len(), |(i, _)| i);
    (text[..end].trim(), text[end..].trim())
}

/// A unit system with the display scales of the kinds a report uses, resolved once.
#[derive(Debug, Clone)]
pub struct Display {
    /// The system.
    pub system: UnitSystem,
}

impl Display {
    /// The display for `system`.
    pub fn new(system: UnitSystem) -> Self {
        Self { system }
    }

    /// Label of `kind`'s display unit ("" when the units module has none for it).
    pub fn unit(&self, kind: Kind) -> String {
        DisplayScale::of(kind, self.system)
            .map(|d| d.label)
            .unwrap_or_default()
    }

    /// `value` (SI) of `kind` as a bare number in the display unit with `decimals` places.
    pub fn number(&self, value: f64, kind: Kind, decimals: usize) -> String {
        if !value.is_finite() {
            return "—".into();
        }
        match DisplayScale::of(kind, self.system) {
            Some(d) => d.number(value, decimals),
            None => units::format(value, kind, self.system),
        }
    }

    /// `value` (SI) of `kind` in the display unit, as a plain number for charts.
    pub fn scaled(&self, value: f64, kind: Kind) -> f64 {
        DisplayScale::of(kind, self.system).map_or(value, |d| value / d.scale)
    }

    /// `value` (SI) of `kind` with its unit, as the units module writes it.
    pub fn quantity(&self, value: f64, kind: Kind) -> String {
        if value.is_finite() {
            units::format(value, kind, self.system)
        } else {
            "—".into()
        }
    }
}

/// `fraction` as a percentage with `decimals` places ("—" when not finite).
pub fn percent(fraction: f64, decimals: usize) -> String {
    if fraction.is_finite() {
        format!("{:.*} %", decimals, fraction * 100.0)
    } else {
        "—".into()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn split_quantity_handles_spaced_unspaced_and_multiword_units() {
        assert_eq!(split_quantity("7.50 kn"), ("7.50", "kn"));
        assert_eq!(split_quantity("12.0°"), ("12.0", "°"));
        assert_eq!(split_quantity("1.234 US gal/nm"), ("1.234", "US gal/nm"));
        assert_eq!(split_quantity("-3.5 %"), ("-3.5", "%"));
        assert_eq!(split_quantity("42"), ("42", ""));
    }

    #[test]
    fn percent_never_prints_nan() {
        assert_eq!(percent(0.853, 1), "85.3 %");
        assert_eq!(percent(f64::NAN, 1), "—");
    }
}
