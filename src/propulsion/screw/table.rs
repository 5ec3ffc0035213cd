//! A user open-water table (J, KT, KQ) for a screw that is not of the B-series.

use super::{OpenWaterPoint, ScrewError, ScrewGeometry};
use crate::propulsion::Warning;

/// A user open-water table, interpolated in J.
#[derive(Debug, Clone, PartialEq)]
pub struct OpenWaterTable {
    geometry: ScrewGeometry,
    points: Vec<OpenWaterPoint>,
}

impl OpenWaterTable {
    /// Builds the table; rows must be sorted by J with at least two rows.
    pub fn new(geometry: ScrewGeometry, points: Vec<OpenWaterPoint>) -> Result<Self, ScrewError> {
        let _ = (geometry, points);
        unimplemented!("screw helper")
    }
    /// The geometry the table belongs to.
    pub fn geometry(&self) -> &ScrewGeometry {
        &self.geometry
    }
    /// The table's rows.
    pub fn points(&self) -> &[OpenWaterPoint] {
        &self.points
    }
    /// KT, KQ at `j` (linear interpolation; linear extrapolation past the ends).
    pub fn coefficients(&self, j: f64) -> OpenWaterPoint {
        let _ = j;
        unimplemented!("screw helper")
    }
    /// The J where KT = 0.
    pub fn zero_thrust_advance_ratio(&self) -> f64 {
        unimplemented!("screw helper")
    }
    /// Warnings (e.g. table does not reach zero thrust).
    pub fn warnings(&self) -> Vec<Warning> {
        unimplemented!("screw helper")
    }
}
