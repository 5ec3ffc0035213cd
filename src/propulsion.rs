//! The pure propulsion core: water, hull resistance, screw, engine sheet and the solver.
//!
//! Everything here works in SI `f64` (metres, kilograms, seconds, newtons, watts, m³), except
//! rotational speeds, which carry their unit in their name (`_rpm` or `_rps`). No module here
//! knows about files, text with units, or the terminal.

pub mod engine;
pub mod hull;
pub mod numeric;
pub mod screw;
pub mod solver;
pub mod water;

/// Standard acceleration of gravity, m/s² (CGPM 1901; NIST SP 811).
pub const STANDARD_GRAVITY: f64 = 9.80665;

/// One knot, m/s (1852 m per hour, by definition; NIST SP 811).
const KNOT: f64 = 1852.0 / 3600.0;
/// One inch, m (exact; NIST SP 811).
const INCH: f64 = 0.0254;

/// A speed (m/s) for a message the user reads: SI with knots beside it, "3.60 m/s (7.0 kn)".
/// The core's messages reach both front ends as text, so they carry the trade's unit too.
pub fn speed_words(speed: f64) -> String {
    format!("{speed:.2} m/s ({:.1} kn)", speed / KNOT)
}

/// A screw length (m) for a message the user reads: metres with inches beside it,
/// "0.457 m (18.0 in)".
pub fn screw_length_words(length: f64) -> String {
    format!("{length:.3} m ({:.1} in)", length / INCH)
}

/// The input or derived quantity a [`Warning`] is about, so a screen can place the warning
/// beside the field it concerns without reading its words.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Subject {
    /// No one input: a note on the method or the result as a whole.
    General,
    /// Displacement (volume or mass) of the load case.
    Displacement,
    /// Waterline length.
    LengthWaterline,
    /// Waterline beam.
    BeamWaterline,
    /// Canoe-body draft (aft, forward or mean).
    Draft,
    /// Trim: the difference of the drafts aft and forward.
    Trim,
    /// Length–beam ratio L/B.
    LengthBeamRatio,
    /// Beam–draft ratio B/T.
    BeamDraftRatio,
    /// Block coefficient Cb.
    BlockCoefficient,
    /// Prismatic coefficient Cp.
    PrismaticCoefficient,
    /// Midship-section coefficient Cm.
    MidshipCoefficient,
    /// Waterplane coefficient Cwp.
    WaterplaneCoefficient,
    /// Longitudinal centre of buoyancy.
    Lcb,
    /// Wetted surface of the hull.
    WettedSurface,
    /// Half angle of entrance of the waterline.
    HalfEntranceAngle,
    /// Immersed transom area.
    TransomArea,
    /// Bulbous bow.
    Bulb,
    /// Appendages (area and form factor).
    Appendages,
    /// Service margin and fouling added to the resistance.
    Margins,
    /// Froude number at a speed (the method's speed range).
    FroudeNumber,
    /// The resistance method chosen or named.
    ResistanceMethod,
    /// A user resistance table.
    ResistanceTable,
    /// Wake fraction, thrust deduction and relative rotative efficiency.
    Interaction,
    /// Water temperature and kind.
    Water,
    /// Air drag inputs (windage).
    Windage,
    /// Number of blades.
    Blades,
    /// Screw diameter.
    Diameter,
    /// Screw pitch.
    Pitch,
    /// Pitch ratio P/D.
    PitchRatio,
    /// Expanded area ratio AE/A0.
    AreaRatio,
    /// A user open-water table.
    OpenWaterTable,
    /// Cavitation and blade loading at an operating point.
    Cavitation,
    /// Reduction gear ratio.
    GearRatio,
    /// Propeller shaft (diameter, material, immersion).
    Shaft,
    /// The engine sheet's power curve and limits.
    Engine,
    /// The engine sheet's fuel data.
    Fuel,
    /// The sea-trial log and its fit.
    Trial,
}

/// A caution about an input or result that the user should see; `source` names the method.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Warning {
    /// Which method or check raised it, e.g. "Holtrop-Mennen" or "B-series".
    pub source: &'static str,
    /// The input it is about, for placing it beside a field.
    pub subject: Subject,
    /// A sentence for the user naming the value and the limit it passed.
    pub message: String,
}

impl Warning {
    /// A warning from `source` about no one input ([`Subject::General`]).
    pub fn new(source: &'static str, message: impl Into<String>) -> Self {
        Self::about(Subject::General, source, message)
    }

    /// A warning from `source` about `subject`.
    pub fn about(subject: Subject, source: &'static str, message: impl Into<String>) -> Self {
        Self {
            source,
            subject,
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn message_words_carry_the_trades_units() {
        // 1 kn = 1852/3600 m/s and 1 in = 0.0254 m, both exact (NIST SP 811, appendix B).
        assert_eq!(speed_words(3.6), "3.60 m/s (7.0 kn)");
        assert_eq!(speed_words(1852.0 / 3600.0 * 8.0), "4.12 m/s (8.0 kn)");
        assert_eq!(screw_length_words(0.4572), "0.457 m (18.0 in)");
    }
}
