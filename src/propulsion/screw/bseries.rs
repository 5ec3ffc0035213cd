//! Wageningen B-series open-water polynomials (Oosterveld & van Oossanen 1975).

use super::{OpenWaterPoint, ScrewError, ScrewGeometry};
use crate::propulsion::Warning;

/// A B-series screw with its polynomials collapsed into polynomials in J for speed.
#[derive(Debug, Clone, PartialEq)]
pub struct BSeriesScrew {
    geometry: ScrewGeometry,
}

impl BSeriesScrew {
    /// Builds the screw for `geometry`; errors for non-physical geometry (warnings are separate).
    pub fn new(geometry: ScrewGeometry) -> Result<Self, ScrewError> {
        let _ = geometry;
        unimplemented!("screw helper")
    }
    /// The geometry.
    pub fn geometry(&self) -> &ScrewGeometry {
        &self.geometry
    }
    /// KT, KQ at `j`, with the Reynolds correction when `reynolds` > 2e6 is given.
    pub fn coefficients(&self, j: f64, reynolds: Option<f64>) -> OpenWaterPoint {
        let _ = (j, reynolds);
        unimplemented!("screw helper")
    }
    /// The J where KT = 0.
    pub fn zero_thrust_advance_ratio(&self, reynolds: Option<f64>) -> f64 {
        let _ = reynolds;
        unimplemented!("screw helper")
    }
    /// Chord at 0.75R, m: c = 2.073·(AE/A0)·D/Z.
    pub fn chord_at_075r(&self) -> f64 {
        2.073 * self.geometry.area_ratio * self.geometry.diameter / self.geometry.blades as f64
    }
    /// Validity warnings (Z 2–7, AE/A0 0.30–1.05, P/D 0.5–1.4).
    pub fn warnings(&self) -> Vec<Warning> {
        unimplemented!("screw helper")
    }
}
