//! Reports of solved boats: text, CSV, JSON, Markdown and SVG charts, one-file HTML.
//!
//! The report layer calls the solver and lays its results out; it does no physics. Numbers in
//! text, CSV, Markdown and charts are shown in the chosen [`UnitSystem`]; JSON always carries SI
//! values or the unit in the field's name (`speed_kn`, `brake_kw`, `fuel_lph`).

pub mod baseline;
pub mod checks;
pub mod design;
pub mod documents;
pub mod export;
pub mod html;
pub mod import;
pub mod json;
pub mod model;
pub mod openwater;
pub mod order;
pub mod power_speed;
pub mod resistance;
pub mod shortlist;
pub mod svg;
pub mod table;
pub mod text;
pub mod what_if;

use crate::units::{self, Kind, UnitSystem};

pub use crate::study::CAUTION;
pub use crate::units::{INCH_M, KNOT_MPS, LITRE_M3, NAUTICAL_MILE_M};

/// Numbers and units of a report in one unit system (the units module decides the units).
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

    /// Label of `kind`'s display unit.
    pub fn unit(&self, kind: Kind) -> String {
        units::unit_label(kind, self.system).to_string()
    }

    /// `value` (SI) of `kind` as a bare number in the display unit with `decimals` places.
    pub fn number(&self, value: f64, kind: Kind, decimals: usize) -> String {
        let shown = self.scaled(value, kind);
        if shown.is_finite() {
            format!("{shown:.decimals$}")
        } else {
            "—".into()
        }
    }

    /// `value` (SI) of `kind` as a table cell at the unit's own display precision (the same
    /// figure the TUI and `cruise` show, e.g. three significant figures of fuel per distance).
    pub fn figure(&self, value: f64, kind: Kind) -> String {
        units::format_number(value, kind, self.system)
    }

    /// `value` (SI) of `kind` in the display unit, as a plain number for charts.
    pub fn scaled(&self, value: f64, kind: Kind) -> f64 {
        units::to_display(value, kind, self.system)
    }

    /// A core message with its screw lengths in the display unit only ([`units::in_system`]).
    pub fn words(&self, text: &str) -> String {
        units::in_system(text, self.system)
    }

    /// `value` (SI) of `kind` with its unit, as the units module writes it.
    pub fn quantity(&self, value: f64, kind: Kind) -> String {
        units::format(value, kind, self.system)
    }
}

/// `value` when it is a finite number; `None` for a missing or non-finite one (JSON never
/// carries NaN).
pub fn finite_or_none(value: Option<f64>) -> Option<f64> {
    value.filter(|v| v.is_finite())
}

/// `n` with its noun in the singular or plural ("1 candidate", "3 candidates").
pub fn count(n: usize, one: &str, many: &str) -> String {
    if n == 1 {
        format!("1 {one}")
    } else {
        format!("{n} {many}")
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
    fn counts_take_the_singular_for_one() {
        assert_eq!(count(1, "candidate", "candidates"), "1 candidate");
        assert_eq!(count(0, "candidate", "candidates"), "0 candidates");
        assert_eq!(count(2, "run", "runs"), "2 runs");
    }

    #[test]
    fn percent_never_prints_nan() {
        assert_eq!(percent(0.853, 1), "85.3 %");
        assert_eq!(percent(f64::NAN, 1), "—");
    }

    #[test]
    fn display_numbers_follow_the_unit_system() {
        // 1 kn = 1852/3600 m/s exactly (NIST SP 811 B.8).
        let metric = Display::new(UnitSystem::Metric);
        assert_eq!(metric.number(7.0 * KNOT_MPS, Kind::Speed, 2), "7.00");
        assert_eq!(metric.number(f64::NAN, Kind::Speed, 2), "—");
        let imperial = Display::new(UnitSystem::Imperial);
        assert_ne!(metric.unit(Kind::Power), imperial.unit(Kind::Power));
    }
}
