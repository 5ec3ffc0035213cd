//! The pure propulsion core: water, hull resistance, screw, engine sheet and the solver.
//!
//! Everything here works in SI `f64` (metres, kilograms, seconds, newtons, watts, m³), except
//! rotational speeds, which carry their unit in their name (`_rpm` or `_rps`). No module here
//! knows about files, text with units, or the terminal.

pub mod engine;
pub mod hull;
pub mod screw;
pub mod solver;
pub mod water;

/// Standard acceleration of gravity, m/s² (CGPM 1901; NIST SP 811).
pub const STANDARD_GRAVITY: f64 = 9.80665;

/// A caution about an input or result that the user should see; `source` names the method.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Warning {
    /// Which method or check raised it, e.g. "Holtrop-Mennen" or "B-series".
    pub source: &'static str,
    /// A sentence for the user naming the value and the limit it passed.
    pub message: String,
}

impl Warning {
    /// A warning from `source` with the given message.
    pub fn new(source: &'static str, message: impl Into<String>) -> Self {
        Self {
            source,
            message: message.into(),
        }
    }
}

impl std::fmt::Display for Warning {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}: {}", self.source, self.message)
    }
}

/// A value that was either given by the user or estimated by a published regression.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Resolved {
    /// The value in SI units (or dimensionless).
    pub value: f64,
    /// `None` when the user gave it; otherwise the name of the estimate used.
    pub estimated_by: Option<&'static str>,
}

impl Resolved {
    /// A value the user gave.
    pub fn given(value: f64) -> Self {
        Self {
            value,
            estimated_by: None,
        }
    }
    /// A value estimated by the named method.
    pub fn estimated(value: f64, method: &'static str) -> Self {
        Self {
            value,
            estimated_by: Some(method),
        }
    }
    /// Whether the value was estimated rather than given.
    pub fn is_estimated(&self) -> bool {
        self.estimated_by.is_some()
    }
}
