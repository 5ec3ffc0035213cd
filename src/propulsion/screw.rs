//! Fixed-pitch screw models: Wageningen B-series polynomials, user open-water tables, cavitation.

pub mod bseries;
pub mod cavitation;
pub mod table;

pub use bseries::{BSeriesScrew, OpenWaterRow, open_water_rows};
pub use table::OpenWaterTable;

use crate::propulsion::Warning;
use thiserror::Error;

/// The geometry of a fixed-pitch screw.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ScrewGeometry {
    /// Number of blades Z.
    pub blades: u32,
    /// Diameter D, m.
    pub diameter: f64,
    /// Face pitch P, m.
    pub pitch: f64,
    /// Expanded blade area ratio AE/A0.
    pub area_ratio: f64,
}

impl ScrewGeometry {
    /// Pitch ratio P/D.
    pub fn pitch_ratio(&self) -> f64 {
        self.pitch / self.diameter
    }
}

/// Open-water coefficients at one advance ratio.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct OpenWaterPoint {
    /// Advance ratio J = Va/(n·D).
    pub advance_ratio: f64,
    /// Thrust coefficient KT = T/(ρ n² D⁴).
    pub thrust_coefficient: f64,
    /// Torque coefficient KQ = Q/(ρ n² D⁵).
    pub torque_coefficient: f64,
}

impl OpenWaterPoint {
    /// Open-water efficiency η0 = J·KT/(2π·KQ); `None` where KT ≤ 0 or KQ ≤ 0.
    pub fn efficiency(&self) -> Option<f64> {
        let (j, kt, kq) = (
            self.advance_ratio,
            self.thrust_coefficient,
            self.torque_coefficient,
        );
        (kt > 0.0 && kq > 0.0 && j >= 0.0).then(|| j * kt / (2.0 * std::f64::consts::PI * kq))
    }
}

/// Why a screw model could not be built or evaluated.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ScrewError {
    /// A geometric value that must be positive and finite was not.
    #[error("{field} must be a positive finite number, got {value}")]
    NotPositive {
        /// Which value, e.g. "diameter".
        field: &'static str,
        /// The value given.
        value: f64,
    },
    /// The blade count is outside what any open-water model here can represent.
    #[error("{0} blades is not a usable blade count (1–9)")]
    BadBladeCount(u32),
    /// An open-water table is malformed.
    #[error("open-water table: {0}")]
    BadTable(String),
    /// The embedded coefficient file could not be read.
    #[error("B-series coefficient data: {0}")]
    BadCoefficients(String),
}

/// A screw's open-water characteristics: either model behind one interface.
#[derive(Debug, Clone, PartialEq)]
pub enum ScrewModel {
    /// Wageningen B-series polynomials for the given geometry.
    BSeries(BSeriesScrew),
    /// A user table of (J, KT, KQ) with the geometry it belongs to.
    Table(OpenWaterTable),
}

impl ScrewModel {
    /// The geometry of the screw.
    pub fn geometry(&self) -> &ScrewGeometry {
        match self {
            ScrewModel::BSeries(s) => s.geometry(),
            ScrewModel::Table(t) => t.geometry(),
        }
    }

    /// KT and KQ at advance ratio `j`, with the blade-section Reynolds number `reynolds` at 0.75R
    /// (`None` to use the model's nominal Reynolds number).
    pub fn coefficients(&self, j: f64, reynolds: Option<f64>) -> OpenWaterPoint {
        match self {
            ScrewModel::BSeries(s) => s.coefficients(j, reynolds),
            ScrewModel::Table(t) => t.coefficients(j),
        }
    }

    /// KT(J) and KQ(J) as cubics in J at Rn(0.75R) = `reynolds` (coefficients of J⁰..J³), for a
    /// model that has them (the B-series); `None` for a table.
    #[inline(always)]
    pub fn cubics_at(&self, reynolds: Option<f64>) -> Option<([f64; 4], [f64; 4])> {
        match self {
            ScrewModel::BSeries(s) => Some(s.cubics_at(reynolds)),
            ScrewModel::Table(_) => None,
        }
    }

    /// The advance ratio at which thrust falls to zero (upper end of the useful range).
    pub fn zero_thrust_advance_ratio(&self, reynolds: Option<f64>) -> f64 {
        match self {
            ScrewModel::BSeries(s) => s.zero_thrust_advance_ratio(reynolds),
            ScrewModel::Table(t) => t.zero_thrust_advance_ratio(),
        }
    }

    /// Chord length at 0.75R used for the Reynolds number, m (`None` if the model has none).
    pub fn chord_at_075r(&self) -> Option<f64> {
        match self {
            ScrewModel::BSeries(s) => Some(s.chord_at_075r()),
            ScrewModel::Table(_) => None,
        }
    }

    /// Warnings: geometry outside the model's validity range.
    pub fn warnings(&self) -> Vec<Warning> {
        match self {
            ScrewModel::BSeries(s) => s.warnings(),
            ScrewModel::Table(t) => t.warnings(),
        }
    }
}
