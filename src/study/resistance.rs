//! The hull's resistance curve on its own: speed, Froude numbers, resistance and its parts,
//! effective power and which formula gives it, for the `resistance` command and the charts.

use serde::Serialize;

use super::Study;
use crate::propulsion::hull::regime::calm_total;
use crate::propulsion::solver::matching::MAX_FROUDE_NUMBER;

/// Speed step of the curve when none is asked for, m/s (half a knot: 1852/7200).
pub const DEFAULT_STEP: f64 = 1852.0 / 7200.0;
/// More rows than this is a typing mistake, not a curve anyone reads.
pub const MAX_ROWS: usize = 2000;
/// The curve's default end as a length Froude number: where Holtrop (1984)'s high-speed
/// branch ends, past which only the continuation speaks (dimensionless).
pub const DEFAULT_END_FROUDE: f64 = crate::propulsion::hull::regime::HOLTROP_1984_FROUDE_MAX;

/// One speed of the curve (SI).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ResistanceRow {
    /// Boat speed, m/s.
    pub speed: f64,
    /// Length Froude number V/√(g·LWL) (dimensionless).
    pub froude: f64,
    /// Volume Froude number V/√(g·∇^⅓) (dimensionless).
    pub froude_volume: f64,
    /// Speed/length ratio V[kn]/√LWL[ft] (kn/√ft).
    pub speed_length: f64,
    /// Viscous resistance: ITTC-1957 friction times the form factor, N.
    pub friction: f64,
    /// Wave (residuary) resistance with bulb and transom terms, N.
    pub residuary: f64,
    /// Appendage resistance, N.
    pub appendages: f64,
    /// Correlation (roughness) allowance, N.
    pub correlation: f64,
    /// Air drag, N.
    pub air: f64,
    /// Service margin and fouling on top, N.
    pub margin: f64,
    /// Total resistance, N (the model's total: calibrated calm water, air and margins).
    pub total: f64,
    /// Effective power R·V, W.
    pub effective_power: f64,
    /// Which formula gives the resistance here, in a few words.
    pub method: &'static str,
    /// Whether the figure is the method's own inside its range.
    pub in_method_range: bool,
    /// Why not, in words (the method's range, the speed/length limit, the regime).
    pub reason: Option<String>,
}

/// The hull's resistance curve from rest to an end speed.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ResistanceCurve {
    /// The boat's name.
    pub boat: String,
    /// The boat's resistance method, its full name.
    pub method: &'static str,
    /// The rows, by rising speed.
    pub rows: Vec<ResistanceRow>,
}

impl Study {
    /// The resistance curve from one `step` (m/s) up to `to` (m/s; default Fn 1.0) in steps of
    /// `step` (default half a knot), or why it cannot be made.
    pub fn resistance_curve(
        &self,
        to: Option<f64>,
        step: Option<f64>,
    ) -> Result<ResistanceCurve, String> {
        let model = &self.vessel.resistance;
        let hull_speed = |froude: f64| model.hull.speed_at_froude(froude);
        let step = step.unwrap_or(DEFAULT_STEP);
        if !(step.is_finite() && step > 0.0) {
            return Err(format!(
                "the speed step must be a positive speed, got {step} m/s"
            ));
        }
        let end = to.unwrap_or_else(|| hull_speed(DEFAULT_END_FROUDE));
        let ceiling = hull_speed(MAX_FROUDE_NUMBER);
        if !(end.is_finite() && end > 0.0) {
            return Err(format!(
                "the end speed must be a positive speed, got {end} m/s"
            ));
        }
        if end > ceiling * (1.0 + 1e-9) {
            return Err(format!(
                "{} is past the fastest speed the solver considers for this hull, {} (Fn {MAX_FROUDE_NUMBER})",
                crate::propulsion::speed_words(end),
                crate::propulsion::speed_words(ceiling)
            ));
        }
        let count = (end / step + 1e-9).floor() as usize;
        if count > MAX_ROWS {
            return Err(format!(
                "{count} rows is more than the {MAX_ROWS} allowed: use a larger step"
            ));
        }
        let mut rows = Vec::with_capacity(count + 1);
        let mut speeds: Vec<f64> = (1..=count).map(|k| step * k as f64).collect();
        if speeds.last().is_none_or(|&last| end - last > 1e-9 * end) {
            speeds.push(end);
        }
        for speed in speeds {
            let parts = model.resistance(speed).map_err(|e| {
                format!(
                    "resistance at {}: {e}",
                    crate::propulsion::speed_words(speed)
                )
            })?;
            let validity = model.validity_at(speed);
            let viscous = parts.friction * parts.form_factor;
            let calm = calm_total(&parts);
            rows.push(ResistanceRow {
                speed,
                froude: validity.froude,
                froude_volume: validity.froude_volume,
                speed_length: validity.speed_length_ratio,
                friction: viscous,
                residuary: calm - viscous - parts.appendages - parts.correlation,
                appendages: parts.appendages,
                correlation: parts.correlation,
                air: parts.air,
                margin: parts.margin,
                total: parts.total,
                effective_power: parts.total * speed,
                method: validity.regime_words,
                in_method_range: validity.in_method_range,
                reason: validity.reason(),
            });
        }
        Ok(ResistanceCurve {
            boat: self.vessel.name.clone(),
            method: model.method.name(),
            rows,
        })
    }
}
