//! A user open-water table (J, KT, KQ) for a screw that is not of the B-series.

use super::{OpenWaterPoint, ScrewError, ScrewGeometry};
use crate::propulsion::{Subject, Warning};

/// A user open-water table, interpolated in J.
#[derive(Debug, Clone, PartialEq)]
pub struct OpenWaterTable {
    geometry: ScrewGeometry,
    points: Vec<OpenWaterPoint>,
    /// J at KT = 0, found once when the table is built.
    zero_thrust_j: f64,
    /// Whether the zero-thrust J lies past the last row (found by extrapolation).
    zero_thrust_extrapolated: bool,
}

/// Checks a screw geometry: positive finite diameter, pitch, area ratio; 1–9 blades.
pub(crate) fn check_geometry(geometry: &ScrewGeometry) -> Result<(), ScrewError> {
    if !(1..=9).contains(&geometry.blades) {
        return Err(ScrewError::BadBladeCount(geometry.blades));
    }
    for (field, value) in [
        ("diameter", geometry.diameter),
        ("pitch", geometry.pitch),
        ("area ratio", geometry.area_ratio),
    ] {
        if !(value.is_finite() && value > 0.0) {
            return Err(ScrewError::NotPositive { field, value });
        }
    }
    Ok(())
}

impl OpenWaterTable {
    /// Builds the table; rows must be sorted by J with at least two rows.
    ///
    /// Every value must be finite, J ≥ 0 and strictly increasing, and KT must reach zero
    /// within the table or fall towards it at its end (so a zero-thrust J exists).
    pub fn new(geometry: ScrewGeometry, points: Vec<OpenWaterPoint>) -> Result<Self, ScrewError> {
        check_geometry(&geometry)?;
        let bad = |message: String| Err(ScrewError::BadTable(message));
        if points.len() < 2 {
            return bad(format!(
                "needs at least 2 rows (J, KT, KQ), got {}",
                points.len()
            ));
        }
        for (row, p) in points.iter().enumerate() {
            let values = [p.advance_ratio, p.thrust_coefficient, p.torque_coefficient];
            if values.iter().any(|v| !v.is_finite()) {
                return bad(format!(
                    "row {}: every value must be a finite number",
                    row + 1
                ));
            }
            if p.advance_ratio < 0.0 {
                return bad(format!(
                    "row {}: J = {} must not be negative",
                    row + 1,
                    p.advance_ratio
                ));
            }
        }
        if let Some(pair) = points
            .windows(2)
            .find(|w| w[1].advance_ratio <= w[0].advance_ratio)
        {
            return bad(format!(
                "rows must be sorted by increasing J, but J = {} is followed by J = {}",
                pair[0].advance_ratio, pair[1].advance_ratio
            ));
        }
        if points[0].thrust_coefficient <= 0.0 {
            return bad(format!(
                "KT = {} in the first row: the screw must give thrust at its lowest J",
                points[0].thrust_coefficient
            ));
        }
        let Some((zero_thrust_j, extrapolated)) = zero_crossing(&points) else {
            return bad(
                "KT neither reaches zero nor falls at the end of the table, so the \
                        zero-thrust J cannot be found"
                    .into(),
            );
        };
        Ok(Self {
            geometry,
            points,
            zero_thrust_j,
            zero_thrust_extrapolated: extrapolated,
        })
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
        let rows = &self.points;
        // Short tables: a linear scan for the segment; the end segments extrapolate.
        let mut index = 0;
        while index + 2 < rows.len() && rows[index + 1].advance_ratio <= j {
            index += 1;
        }
        let (low, high) = (rows[index], rows[index + 1]);
        let fraction = (j - low.advance_ratio) / (high.advance_ratio - low.advance_ratio);
        let lerp = |a: f64, b: f64| a + (b - a) * fraction;
        OpenWaterPoint {
            advance_ratio: j,
            thrust_coefficient: lerp(low.thrust_coefficient, high.thrust_coefficient),
            torque_coefficient: lerp(low.torque_coefficient, high.torque_coefficient),
        }
    }
    /// The J where KT = 0.
    pub fn zero_thrust_advance_ratio(&self) -> f64 {
        self.zero_thrust_j
    }
    /// Warnings (e.g. table does not reach zero thrust).
    pub fn warnings(&self) -> Vec<Warning> {
        let mut warnings = Vec::new();
        let first = self.points[0].advance_ratio;
        if first > 0.0 {
            warnings.push(Warning::about(
                Subject::OpenWaterTable,
                "open-water table",
                format!("the table starts at J = {first}; below it KT and KQ are extrapolated"),
            ));
        }
        if self.zero_thrust_extrapolated {
            warnings.push(Warning::about(
                Subject::OpenWaterTable,
                "open-water table",
                format!(
                    "the table ends before zero thrust; KT = 0 is extrapolated to J = {:.3}",
                    self.zero_thrust_j
                ),
            ));
        }
        let rising = self
            .points
            .windows(2)
            .take_while(|w| w[0].advance_ratio < self.zero_thrust_j)
            .any(|w| w[1].thrust_coefficient > w[0].thrust_coefficient);
        if rising {
            warnings.push(Warning::about(
                Subject::OpenWaterTable,
                "open-water table",
                "KT rises with J somewhere below zero thrust; the thrust identity may have more \
                 than one root and the first one is used",
            ));
        }
        warnings
    }
}

/// The first J where KT falls to zero, by linear interpolation, or past the end by extending
/// the last segment if it falls; `true` in the second place when extrapolated.
fn zero_crossing(points: &[OpenWaterPoint]) -> Option<(f64, bool)> {
    for pair in points.windows(2) {
        let (a, b) = (pair[0], pair[1]);
        if b.thrust_coefficient <= 0.0 {
            let fraction = a.thrust_coefficient / (a.thrust_coefficient - b.thrust_coefficient);
            return Some((
                a.advance_ratio + fraction * (b.advance_ratio - a.advance_ratio),
                false,
            ));
        }
    }
    let (a, b) = (points[points.len() - 2], points[points.len() - 1]);
    let slope = (b.thrust_coefficient - a.thrust_coefficient) / (b.advance_ratio - a.advance_ratio);
    (slope < 0.0).then(|| (b.advance_ratio - b.thrust_coefficient / slope, true))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn geometry() -> ScrewGeometry {
        ScrewGeometry {
            blades: 3,
            diameter: 0.6,
            pitch: 0.48,
            area_ratio: 0.5,
        }
    }

    fn row(j: f64, kt: f64, kq: f64) -> OpenWaterPoint {
        OpenWaterPoint {
            advance_ratio: j,
            thrust_coefficient: kt,
            torque_coefficient: kq,
        }
    }

    /// An invented table, KT = 0.40 − 0.45·J, KQ = 0.050 − 0.040·J at three J.
    fn linear_rows() -> Vec<OpenWaterPoint> {
        vec![
            row(0.0, 0.40, 0.050),
            row(0.4, 0.22, 0.034),
            row(0.8, 0.04, 0.018),
        ]
    }

    #[test]
    fn interpolates_linearly_and_finds_zero_thrust() {
        let table = OpenWaterTable::new(geometry(), linear_rows()).unwrap();
        let p = table.coefficients(0.6);
        assert!((p.thrust_coefficient - 0.13).abs() < 1e-12);
        assert!((p.torque_coefficient - 0.026).abs() < 1e-12);
        // KT = 0 at 0.40/0.45 = 0.8889, past the last row: extrapolated and warned.
        assert!((table.zero_thrust_advance_ratio() - 0.4 / 0.45).abs() < 1e-12);
        let warnings = table.warnings();
        assert_eq!(warnings.len(), 1);
        assert!(warnings[0].message.contains("extrapolated to J = 0.889"));
        assert!((table.coefficients(0.9).thrust_coefficient - (0.40 - 0.45 * 0.9)).abs() < 1e-12);
    }

    #[test]
    fn zero_thrust_inside_the_table_is_interpolated() {
        let rows = vec![
            row(0.1, 0.3, 0.04),
            row(0.5, 0.1, 0.02),
            row(0.7, -0.1, 0.01),
        ];
        let table = OpenWaterTable::new(geometry(), rows).unwrap();
        assert!((table.zero_thrust_advance_ratio() - 0.6).abs() < 1e-12);
        let warnings = table.warnings();
        assert_eq!(warnings.len(), 1);
        assert!(warnings[0].message.contains("starts at J = 0.1"));
    }

    #[test]
    fn bad_tables_are_refused_with_the_reason() {
        let cases: [(Vec<OpenWaterPoint>, &str); 5] = [
            (vec![row(0.0, 0.4, 0.05)], "at least 2 rows"),
            (
                vec![row(0.4, 0.2, 0.03), row(0.2, 0.3, 0.04)],
                "sorted by increasing J",
            ),
            (vec![row(0.0, 0.4, 0.05), row(0.4, f64::NAN, 0.03)], "row 2"),
            (
                vec![row(0.0, -0.1, 0.05), row(0.4, -0.2, 0.03)],
                "first row",
            ),
            (
                vec![row(0.0, 0.2, 0.05), row(0.4, 0.3, 0.03)],
                "zero-thrust J",
            ),
        ];
        for (rows, expected) in cases {
            let message = OpenWaterTable::new(geometry(), rows)
                .unwrap_err()
                .to_string();
            assert!(message.contains(expected), "{message:?} lacks {expected:?}");
        }
        let mut flat = geometry();
        flat.diameter = 0.0;
        assert_eq!(
            OpenWaterTable::new(flat, linear_rows()),
            Err(ScrewError::NotPositive {
                field: "diameter",
                value: 0.0
            })
        );
    }
}
