//! Hull particulars, derived coefficients, resistance methods and hull–propeller interaction.

pub mod friction;
pub mod holtrop;
pub mod interaction;
pub mod oortmerssen;
pub mod particulars;
pub mod regime;
pub mod resistance;
pub mod selection;

pub use interaction::{Interaction, InteractionMethod};
pub use particulars::{HullForm, HullInput};
pub use regime::{CurveShape, Regime};
pub use resistance::{
    AirDrag, FroudeFactor, Margins, ResistanceComponents, ResistanceMethod, ResistanceModel,
    ResistanceTable, SpeedValidity, UNRELIABLE_WORDS,
};
pub use selection::{MethodChoice, choose_method};

use thiserror::Error;

/// Why a hull or its resistance could not be evaluated.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum HullError {
    /// A particular that must be positive and finite was not.
    #[error("{field} must be a positive finite number, got {}", significant(*value))]
    NotPositive {
        /// The field's name, e.g. "waterline length".
        field: &'static str,
        /// The value given, SI.
        value: f64,
    },
    /// A quantity that may be zero but not negative (an area, a height) was negative or not finite.
    #[error("{field} must be zero or a positive finite number, got {}", significant(*value))]
    Negative {
        /// The field's name, e.g. "appendage wetted area".
        field: &'static str,
        /// The value given, SI.
        value: f64,
    },
    /// A coefficient lies outside the range where it has a meaning.
    #[error(
        "{field} = {}; expected {}–{} (the physically possible range)",
        significant(*value),
        significant(*min),
        significant(*max)
    )]
    OutOfRange {
        /// The field's name.
        field: &'static str,
        /// The value given.
        value: f64,
        /// The smallest value accepted.
        min: f64,
        /// The largest value accepted.
        max: f64,
    },
    /// The speed is negative or not finite.
    #[error("speed {0} m/s is not a valid boat speed")]
    InvalidSpeed(f64),
    /// A resistance table has fewer than two rows or is not sorted by speed.
    #[error("resistance table: {0}")]
    BadTable(String),
    /// A method's embedded coefficient table could not be parsed.
    #[error("coefficient table damaged: {0}")]
    BadCoefficients(String),
    /// The speed lies outside the user resistance table.
    #[error(
        "speed {} is outside the resistance table ({}–{})",
        crate::propulsion::speed_words(*speed),
        crate::propulsion::speed_words(*min),
        crate::propulsion::speed_words(*max)
    )]
    OutsideTable {
        /// The speed asked for, m/s.
        speed: f64,
        /// The table's lowest speed, m/s.
        min: f64,
        /// The table's highest speed, m/s.
        max: f64,
    },
}

/// `value` to three significant figures in plain decimal notation (0.0000153, 1450, 0.1), so
/// that a message never shows a 20-digit number or an exponent.
pub fn significant(value: f64) -> String {
    if !value.is_finite() || value == 0.0 {
        return format!("{value}");
    }
    let magnitude = value.abs().log10().floor() as i32;
    let decimals = (2 - magnitude).clamp(0, 20) as usize;
    let text = format!("{value:.decimals$}");
    if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_owned()
    } else {
        text
    }
}
