//! The engine sheet: full-load power envelope, propeller-law curve, fuel consumption.

use crate::propulsion::{Subject, Warning};
use thiserror::Error;

/// A curve of (engine rpm, value) points sorted by rpm, interpolated linearly.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct RpmCurve {
    /// Rows of (engine rpm, value), strictly increasing in rpm.
    pub points: Vec<(f64, f64)>,
}

/// How the engine's fuel consumption is described.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub enum FuelModel {
    /// Specific fuel consumption, kg/J, on a grid of engine rpm × load fraction (0–1 of full-load
    /// power at that rpm), interpolated bilinearly.
    SfcMap {
        /// Grid rpms, increasing.
        rpm: Vec<f64>,
        /// Grid load fractions, increasing.
        load: Vec<f64>,
        /// sfc[i][k] at rpm[i], load[k], kg/J.
        sfc: Vec<Vec<f64>>,
    },
    /// Fuel mass flow, kg/s, measured along the maker's propeller curve, by engine rpm.
    RateAlongPropellerCurve(RpmCurve),
    /// Full-load SFC with a Willans-line part-load model: at a fixed rpm fuel flow is linear in
    /// brake power, flow = SFC_full·(f0·P_full(rpm) + (1 − f0)·P) (Willans' line: P. W. Willans
    /// 1888; J. B. Heywood, *Internal Combustion Engine Fundamentals*, 1988).
    Willans {
        /// SFC at full load (rated), kg/J.
        full_load_sfc: f64,
        /// Fuel flow at zero brake power as a fraction of full-load flow at the same rpm.
        zero_load_fraction: f64,
    },
}

/// The duty rating the maker gives the engine.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Duty {
    /// Continuous duty: full power without a time limit.
    Continuous,
    /// Intermittent duty: full throttle limited in time.
    Intermittent,
}

/// An engine sheet in SI units (rpm named as such).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct EngineSheet {
    /// Engine name as shown to the user.
    pub name: String,
    /// Rated crankshaft speed, rpm.
    pub rated_rpm: f64,
    /// Idle speed, rpm.
    pub idle_rpm: f64,
    /// Full-load brake power by rpm, W.
    pub full_load_power: RpmCurve,
    /// The maker's published propeller-law power curve, W, if given.
    pub propeller_law: Option<RpmCurve>,
    /// Fuel consumption model.
    pub fuel: FuelModel,
    /// Fuel density, kg/m³.
    pub fuel_density: f64,
    /// Duty rating, if the maker states it.
    pub duty: Option<Duty>,
    /// Full-throttle time limit for intermittent duty, s.
    pub full_throttle_limit: Option<f64>,
    /// Maximum continuous power, W, if different from the full-load curve.
    pub max_continuous_power: Option<f64>,
}

/// Why an engine sheet is unusable.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum EngineError {
    /// A curve has too few points, unsorted rpm or non-positive values.
    #[error("{curve}: {problem}")]
    BadCurve {
        /// Which curve.
        curve: &'static str,
        /// What is wrong with it.
        problem: String,
    },
    /// A scalar value is outside its meaningful range.
    #[error("{field} = {value} is not valid: {expected}")]
    BadValue {
        /// The field.
        field: &'static str,
        /// The value given.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
}

impl RpmCurve {
    /// The value at `rpm` by linear interpolation, held at the end values outside the curve.
    /// An empty curve gives 0.
    pub fn value_at(&self, rpm: f64) -> f64 {
        match self.points.as_slice() {
            [] => 0.0,
            [(_, only)] => *only,
            points => {
                let (index, fraction) = segment(points.len(), |i| points[i].0, rpm);
                let (low, high) = (points[index].1, points[index + 1].1);
                low + (high - low) * fraction
            }
        }
    }

    /// The lowest rpm of the curve (0 for an empty curve).
    pub fn first_rpm(&self) -> f64 {
        self.points.first().map_or(0.0, |p| p.0)
    }

    /// The highest rpm of the curve (0 for an empty curve).
    pub fn last_rpm(&self) -> f64 {
        self.points.last().map_or(0.0, |p| p.0)
    }

    /// Checks: at least two points, finite, rpm positive and strictly increasing, values positive.
    pub fn validate(&self, curve: &'static str) -> Result<(), EngineError> {
        let bad = |problem: String| EngineError::BadCurve { curve, problem };
        if self.points.len() < 2 {
            return Err(bad(format!(
                "needs at least 2 points (rpm, value), got {}",
                self.points.len()
            )));
        }
        for (row, &(rpm, value)) in self.points.iter().enumerate() {
            if !(rpm.is_finite() && rpm > 0.0) {
                return Err(bad(format!(
                    "point {}: rpm {rpm} must be positive",
                    row + 1
                )));
            }
            if !(value.is_finite() && value > 0.0) {
                return Err(bad(format!(
                    "point {}: value {value} must be positive",
                    row + 1
                )));
            }
        }
        if let Some(pair) = self.points.windows(2).find(|w| w[1].0 <= w[0].0) {
            return Err(bad(format!(
                "rpm must increase strictly from point to point, but {} is followed by {}",
                pair[0].0, pair[1].0
            )));
        }
        Ok(())
    }
}

/// The segment of a sorted grid of `len` ≥ 2 abscissae holding `x`: its first index and the
/// fraction along it, clamped to [0, 1] at the grid's ends.
fn segment(len: usize, abscissa: impl Fn(usize) -> f64, x: f64) -> (usize, f64) {
    debug_assert!(len >= 2);
    // A NaN lands here too, on the first point.
    if x.is_nan() || x <= abscissa(0) {
        return (0, 0.0);
    }
    if x >= abscissa(len - 1) {
        return (len - 2, 1.0);
    }
    // Grids are short (a dozen points): a linear scan beats a binary search here.
    let mut index = 0;
    while index + 2 < len && abscissa(index + 1) <= x {
        index += 1;
    }
    let (low, high) = (abscissa(index), abscissa(index + 1));
    (index, ((x - low) / (high - low)).clamp(0.0, 1.0))
}

/// Exponent of the propeller law P ∝ rpm^k used when the sheet gives no propeller curve
/// (common practice: engine makers draw their propeller curve with k = 3).
pub const PROPELLER_LAW_EXPONENT: f64 = 3.0;

/// Typical range of diesel specific fuel consumption, kg/J (150–400 g/kWh, common practice);
/// values outside it give a warning, not an error.
const PLAUSIBLE_SFC: (f64, f64) = (150.0 / 3.6e9, 400.0 / 3.6e9);

impl FuelModel {
    fn validate(&self, warnings: &mut Vec<Warning>) -> Result<(), EngineError> {
        match self {
            FuelModel::SfcMap { rpm, load, sfc } => {
                let bad = |problem: String| EngineError::BadCurve {
                    curve: "SFC map",
                    problem,
                };
                check_axis(rpm, "rpm").map_err(bad)?;
                check_axis(load, "load").map_err(bad)?;
                if let Some(&l) = load.iter().find(|&&l| l > 1.5) {
                    return Err(bad(format!(
                        "load fraction {l} is more than 1.5 (loads are fractions of full-load power)"
                    )));
                }
                if sfc.len() != rpm.len() {
                    return Err(bad(format!(
                        "has {} rows of SFC for {} rpm values",
                        sfc.len(),
                        rpm.len()
                    )));
                }
                for (row, values) in sfc.iter().enumerate() {
                    if values.len() != load.len() {
                        return Err(bad(format!(
                            "row {} (at {} rpm) has {} SFC values for {} load fractions",
                            row + 1,
                            rpm[row],
                            values.len(),
                            load.len()
                        )));
                    }
                    if let Some(&v) = values.iter().find(|v| !(v.is_finite() && **v > 0.0)) {
                        return Err(bad(format!(
                            "row {} (at {} rpm): SFC {v} must be positive",
                            row + 1,
                            rpm[row]
                        )));
                    }
                }
                let outside = sfc
                    .iter()
                    .flatten()
                    .any(|&v| v < PLAUSIBLE_SFC.0 || v > PLAUSIBLE_SFC.1);
                if outside {
                    warnings.push(Warning::about(
                        Subject::Fuel,
                        "engine sheet",
                        "the SFC map has values outside 150–400 g/kWh, unusual for a diesel",
                    ));
                }
            }
            FuelModel::RateAlongPropellerCurve(curve) => {
                curve.validate("fuel rate along the propeller curve")?;
            }
            FuelModel::Willans {
                full_load_sfc,
                zero_load_fraction,
            } => {
                if !(full_load_sfc.is_finite() && *full_load_sfc > 0.0) {
                    return Err(EngineError::BadValue {
                        field: "full-load SFC",
                        value: *full_load_sfc,
                        expected: "a positive specific fuel consumption",
                    });
                }
                if !(zero_load_fraction.is_finite() && (0.0..1.0).contains(zero_load_fraction)) {
                    return Err(EngineError::BadValue {
                        field: "zero-load fuel fraction",
                        value: *zero_load_fraction,
                        expected: "a fraction from 0 up to (not including) 1",
                    });
                }
                if *full_load_sfc < PLAUSIBLE_SFC.0 || *full_load_sfc > PLAUSIBLE_SFC.1 {
                    warnings.push(Warning::about(
                        Subject::Fuel,
                        "engine sheet",
                        format!(
                            "full-load SFC {:.0} g/kWh is outside 150–400 g/kWh, unusual for a diesel",
                            full_load_sfc * 3.6e9
                        ),
                    ));
                }
            }
        }
        Ok(())
    }
}

/// Checks one axis of a grid: at least two finite, positive, strictly increasing values.
fn check_axis(values: &[f64], axis: &str) -> Result<(), String> {
    if values.len() < 2 {
        return Err(format!(
            "the {axis} axis needs at least 2 values, got {}",
            values.len()
        ));
    }
    if let Some(&v) = values.iter().find(|v| !(v.is_finite() && **v > 0.0)) {
        return Err(format!("the {axis} axis value {v} must be positive"));
    }
    if let Some(w) = values.windows(2).find(|w| w[1] <= w[0]) {
        return Err(format!(
            "the {axis} axis must increase strictly, but {} is followed by {}",
            w[0], w[1]
        ));
    }
    Ok(())
}

impl EngineSheet {
    /// Checks the sheet for consistency (sorted curves, rated rpm inside the curve, …).
    pub fn validate(&self) -> Result<Vec<Warning>, EngineError> {
        let mut warnings = Vec::new();
        let positive = |field: &'static str, value: f64, expected: &'static str| {
            if value.is_finite() && value > 0.0 {
                Ok(())
            } else {
                Err(EngineError::BadValue {
                    field,
                    value,
                    expected,
                })
            }
        };
        positive(
            "rated rpm",
            self.rated_rpm,
            "a positive engine speed in rpm",
        )?;
        positive("idle rpm", self.idle_rpm, "a positive engine speed in rpm")?;
        if self.idle_rpm >= self.rated_rpm {
            return Err(EngineError::BadValue {
                field: "idle rpm",
                value: self.idle_rpm,
                expected: "an engine speed below the rated rpm",
            });
        }
        self.full_load_power.validate("full-load power curve")?;
        let (first, last) = (
            self.full_load_power.first_rpm(),
            self.full_load_power.last_rpm(),
        );
        if self.rated_rpm < first || self.rated_rpm > last {
            return Err(EngineError::BadValue {
                field: "rated rpm",
                value: self.rated_rpm,
                expected: "an rpm inside the full-load power curve's rpm range",
            });
        }
        if let Some(law) = &self.propeller_law {
            law.validate("propeller-law power curve")?;
            if let Some(&(rpm, power)) = law
                .points
                .iter()
                .find(|(rpm, p)| *p > 1.01 * self.full_load_power_at(*rpm))
            {
                warnings.push(Warning::about(
                    Subject::Engine,
                    "engine sheet",
                    format!(
                        "the propeller-law curve ({:.1} kW at {rpm:.0} rpm) lies above the \
                         full-load curve",
                        power / 1e3
                    ),
                ));
            }
        }
        self.fuel.validate(&mut warnings)?;
        positive(
            "fuel density",
            self.fuel_density,
            "a positive density in kg/m³",
        )?;
        if !(700.0..=1000.0).contains(&self.fuel_density) {
            warnings.push(Warning::about(
                Subject::Fuel,
                "engine sheet",
                format!(
                    "fuel density {:.0} kg/m³ is unusual (diesel is about 840 kg/m³)",
                    self.fuel_density
                ),
            ));
        }
        if let Some(limit) = self.full_throttle_limit {
            positive(
                "full-throttle time limit",
                limit,
                "a positive duration in seconds",
            )?;
        }
        if let Some(power) = self.max_continuous_power {
            positive(
                "maximum continuous power",
                power,
                "a positive power in watts",
            )?;
            if power > 1.001 * self.rated_power() {
                warnings.push(Warning::about(
                    Subject::Engine,
                    "engine sheet",
                    "the maximum continuous power is above the rated power",
                ));
            }
        }
        Ok(warnings)
    }

    /// Full-load brake power at `rpm`, W.
    ///
    /// Linear between the curve's points; above its last point held at the last power (the
    /// governor's range is not described by the sheet); below its first point the full-load
    /// torque is held constant, so power falls in proportion to rpm and is 0 at 0 rpm. Never
    /// negative; 0 for a non-finite rpm or an empty curve.
    pub fn full_load_power_at(&self, rpm: f64) -> f64 {
        if !rpm.is_finite() || rpm <= 0.0 {
            return 0.0;
        }
        let first = self.full_load_power.first_rpm();
        if rpm < first {
            let first_power = self.full_load_power.value_at(first);
            return (first_power * rpm / first).max(0.0);
        }
        self.full_load_power.value_at(rpm).max(0.0)
    }

    /// The maker's propeller-law power at `rpm`, W: the published curve if given, otherwise the
    /// cubic law through rated power, P_rated·(rpm/rated)³ (common practice).
    pub fn propeller_law_power_at(&self, rpm: f64) -> f64 {
        match &self.propeller_law {
            Some(curve) => curve.value_at(rpm),
            None => self.rated_power() * (rpm / self.rated_rpm).powf(PROPELLER_LAW_EXPONENT),
        }
    }

    /// Fuel mass flow at `rpm` and brake power `power` (W), kg/s.
    ///
    /// - SFC map: flow = SFC(rpm, P/P_full(rpm))·P with SFC bilinear in the grid and clamped at its
    ///   edges; below the grid's lowest load the flow follows the straight line (in power)
    ///   through the two lowest loads — a Willans line — and is never negative.
    /// - Rate along the propeller curve: the SFC along the maker's propeller curve,
    ///   rate(r)/P_prop(r) at r = rpm clamped to the table, times P (constant SFC at a given rpm).
    /// - Willans line: flow = SFC_full·(f0·P_full(rpm) + (1 − f0)·P).
    ///
    /// Negative power is taken as 0; a non-finite input gives 0.
    pub fn fuel_mass_flow(&self, rpm: f64, power: f64) -> f64 {
        self.fuel_mass_flow_below(rpm, power, self.full_load_power_at(rpm))
    }

    /// [`EngineSheet::fuel_mass_flow`] given the full-load power at `rpm`, `full_load` (W, as
    /// [`EngineSheet::full_load_power_at`] gives it), for a caller that has it already, kg/s.
    fn fuel_mass_flow_below(&self, rpm: f64, power: f64, full_load: f64) -> f64 {
        if !(rpm.is_finite() && power.is_finite()) {
            return 0.0;
        }
        let power = power.max(0.0);
        let flow = match &self.fuel {
            FuelModel::SfcMap {
                rpm: rpms,
                load,
                sfc,
            } => self.sfc_map_flow(rpms, load, sfc, rpm, power, full_load),
            FuelModel::RateAlongPropellerCurve(rates) => {
                if rates.points.is_empty() {
                    return 0.0;
                }
                let at = rpm.clamp(rates.first_rpm(), rates.last_rpm());
                let law_power = self.propeller_law_power_at(at);
                if law_power > 0.0 {
                    rates.value_at(at) / law_power * power
                } else {
                    0.0
                }
            }
            FuelModel::Willans {
                full_load_sfc,
                zero_load_fraction,
            } => {
                full_load_sfc
                    * (zero_load_fraction * full_load + (1.0 - zero_load_fraction) * power)
            }
        };
        if flow.is_finite() { flow.max(0.0) } else { 0.0 }
    }

    fn sfc_map_flow(
        &self,
        rpms: &[f64],
        loads: &[f64],
        sfc: &[Vec<f64>],
        rpm: f64,
        power: f64,
        full: f64,
    ) -> f64 {
        if rpms.len() < 2 || loads.len() < 2 || sfc.len() != rpms.len() {
            return 0.0;
        }
        if full <= 0.0 {
            return 0.0;
        }
        let (i, u) = segment(rpms.len(), |i| rpms[i], rpm);
        let sfc_at = |k: usize| {
            let (low, high) = (sfc[i].get(k).copied(), sfc[i + 1].get(k).copied());
            match (low, high) {
                (Some(low), Some(high)) => low + (high - low) * u,
                _ => 0.0,
            }
        };
        let load = power / full;
        if load < loads[0] {
            // Fuel flow is close to linear in power at fixed rpm (Willans line), so below the
            // map it is extended along the line through the two lowest loads.
            let (p0, p1) = (loads[0] * full, loads[1] * full);
            let (f0, f1) = (sfc_at(0) * p0, sfc_at(1) * p1);
            return (f0 + (power - p0) * (f1 - f0) / (p1 - p0)).max(0.0);
        }
        let (k, v) = segment(loads.len(), |k| loads[k], load);
        let (low, high) = (sfc_at(k), sfc_at(k + 1));
        (low + (high - low) * v) * power
    }

    /// Rated power: full-load power at rated rpm, W.
    pub fn rated_power(&self) -> f64 {
        self.full_load_power_at(self.rated_rpm)
    }
    /// Full-load torque at `rpm`, N·m.
    pub fn full_load_torque_at(&self, rpm: f64) -> f64 {
        let omega = rpm * std::f64::consts::TAU / 60.0;
        if omega > 0.0 {
            self.full_load_power_at(rpm) / omega
        } else {
            0.0
        }
    }
    /// Fuel volume flow at `rpm` and brake power `power` (W), m³/s (0 if the fuel density is
    /// not positive; `validate` rejects such a sheet).
    pub fn fuel_volume_flow(&self, rpm: f64, power: f64) -> f64 {
        self.fuel_flows(rpm, power).1
    }

    /// Fuel mass flow (kg/s) and volume flow (m³/s) at `rpm` and brake power `power` (W): the
    /// two of [`EngineSheet::fuel_mass_flow`] and [`EngineSheet::fuel_volume_flow`] from one
    /// look-up of the fuel model.
    pub fn fuel_flows(&self, rpm: f64, power: f64) -> (f64, f64) {
        self.fuel_flows_below(rpm, power, self.full_load_power_at(rpm))
    }

    /// [`EngineSheet::fuel_flows`] given the full-load power at `rpm`, `full_load` (W, as
    /// [`EngineSheet::full_load_power_at`] gives it): kg/s and m³/s.
    pub fn fuel_flows_below(&self, rpm: f64, power: f64, full_load: f64) -> (f64, f64) {
        let mass = self.fuel_mass_flow_below(rpm, power, full_load);
        let volume = if self.fuel_density > 0.0 && self.fuel_density.is_finite() {
            mass / self.fuel_density
        } else {
            0.0
        };
        (mass, volume)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// g/kWh → kg/J.
    const G_PER_KWH: f64 = 1e-3 / 3.6e6;
    /// kg/h → kg/s.
    const KG_PER_H: f64 = 1.0 / 3600.0;

    fn close(got: f64, want: f64, rel: f64) {
        assert!(
            got.is_finite() && (got - want).abs() <= rel * want.abs().max(1e-300),
            "got {got}, want {want}"
        );
    }

    /// An invented sheet: 20 kW at 1000 rpm, 50 kW at 2000 rpm, 60 kW at 3000 rpm (rated).
    fn sheet(fuel: FuelModel) -> EngineSheet {
        EngineSheet {
            name: "Invented 4-cylinder".into(),
            rated_rpm: 3000.0,
            idle_rpm: 700.0,
            full_load_power: RpmCurve {
                points: vec![(1000.0, 20e3), (2000.0, 50e3), (3000.0, 60e3)],
            },
            propeller_law: None,
            fuel,
            fuel_density: 840.0,
            duty: Some(Duty::Continuous),
            full_throttle_limit: None,
            max_continuous_power: None,
        }
    }

    fn willans() -> FuelModel {
        FuelModel::Willans {
            full_load_sfc: 230.0 * G_PER_KWH,
            zero_load_fraction: 0.1,
        }
    }

    #[test]
    fn full_load_power_interpolates_and_is_defined_outside_the_curve() {
        let engine = sheet(willans());
        // Hand-computed from the invented curve.
        close(engine.full_load_power_at(1500.0), 35e3, 1e-12);
        close(engine.full_load_power_at(2500.0), 55e3, 1e-12);
        close(engine.rated_power(), 60e3, 1e-12);
        // Below the first point: constant torque, so power ∝ rpm.
        close(engine.full_load_power_at(500.0), 10e3, 1e-12);
        close(
            engine.full_load_torque_at(500.0),
            engine.full_load_torque_at(1000.0),
            1e-12,
        );
        // Above the last point: held.
        close(engine.full_load_power_at(3400.0), 60e3, 1e-12);
        assert_eq!(engine.full_load_power_at(0.0), 0.0);
        assert_eq!(engine.full_load_power_at(f64::NAN), 0.0);
    }

    #[test]
    fn willans_line_matches_hand_computation() {
        let engine = sheet(willans());
        // 230 g/kWh × (0.1 × 50 kW + 0.9 × 25 kW) = 230 × 27.5 = 6325 g/h.
        close(engine.fuel_mass_flow(2000.0, 25e3), 6.325 * KG_PER_H, 1e-12);
        // At full load the line gives the full-load SFC: 230 × 60 = 13.8 kg/h.
        close(engine.fuel_mass_flow(3000.0, 60e3), 13.8 * KG_PER_H, 1e-12);
        // At zero load, the idle share: 230 × 0.1 × 50 = 1.15 kg/h.
        close(engine.fuel_mass_flow(2000.0, 0.0), 1.15 * KG_PER_H, 1e-12);
        close(
            engine.fuel_volume_flow(3000.0, 60e3),
            13.8 * KG_PER_H / 840.0,
            1e-12,
        );
    }

    #[test]
    fn rate_along_propeller_curve_scales_with_power_at_constant_sfc() {
        let rates = RpmCurve {
            points: vec![(1000.0, 1.0 * KG_PER_H), (3000.0, 15.0 * KG_PER_H)],
        };
        let engine = sheet(FuelModel::RateAlongPropellerCurve(rates));
        // Cubic law through 60 kW at 3000 rpm: 60 × (2/3)³ = 17.778 kW at 2000 rpm, where the
        // table gives 8 kg/h; on the law the flow is the table's, at twice the power twice that.
        let law = 60e3 * (2.0f64 / 3.0).powi(3);
        close(engine.propeller_law_power_at(2000.0), law, 1e-12);
        close(engine.fuel_mass_flow(2000.0, law), 8.0 * KG_PER_H, 1e-12);
        close(
            engine.fuel_mass_flow(2000.0, 2.0 * law),
            16.0 * KG_PER_H,
            1e-12,
        );
        // A published propeller-law curve replaces the cubic law.
        let mut engine = engine;
        engine.propeller_law = Some(RpmCurve {
            points: vec![(1000.0, 2e3), (3000.0, 50e3)],
        });
        // At 2000 rpm: law 26 kW, rate 8 kg/h; at 13 kW → 4 kg/h.
        close(engine.fuel_mass_flow(2000.0, 13e3), 4.0 * KG_PER_H, 1e-12);
    }

    #[test]
    fn sfc_map_is_bilinear_and_extends_below_along_a_willans_line() {
        let engine = sheet(FuelModel::SfcMap {
            rpm: vec![1000.0, 3000.0],
            load: vec![0.25, 1.0],
            sfc: vec![
                vec![300.0 * G_PER_KWH, 220.0 * G_PER_KWH],
                vec![280.0 * G_PER_KWH, 240.0 * G_PER_KWH],
            ],
        });
        // At 2000 rpm (full load 50 kW) and 31.25 kW (load 0.625): SFC halfway in both axes,
        // (290 + 230)/2 = 260 g/kWh → 260 × 31.25 = 8125 g/h.
        close(
            engine.fuel_mass_flow(2000.0, 31.25e3),
            8.125 * KG_PER_H,
            1e-12,
        );
        // Load 0.1 (5 kW): the line through 12.5 kW → 3625 g/h and 50 kW → 11500 g/h gives
        // 3625 − 7.5 × 210 = 2050 g/h.
        close(engine.fuel_mass_flow(2000.0, 5e3), 2.05 * KG_PER_H, 1e-12);
        // Clamped beyond the grid: at 3500 rpm and full load, the 3000 rpm row: 240 × 60.
        close(engine.fuel_mass_flow(3500.0, 60e3), 14.4 * KG_PER_H, 1e-12);
        assert_eq!(engine.fuel_mass_flow(2000.0, f64::INFINITY), 0.0);
        assert!(engine.validate().unwrap().is_empty());
    }

    #[test]
    fn a_good_sheet_validates_without_warnings() {
        assert_eq!(sheet(willans()).validate(), Ok(vec![]));
    }

    #[test]
    fn bad_sheets_name_the_field() {
        let mut one_point = sheet(willans());
        one_point.full_load_power.points.truncate(1);
        let mut unsorted = sheet(willans());
        unsorted.full_load_power.points.swap(0, 1);
        let mut negative = sheet(willans());
        negative.full_load_power.points[1].1 = -5.0;
        let mut idle = sheet(willans());
        idle.idle_rpm = 3000.0;
        let mut rated = sheet(willans());
        rated.rated_rpm = 3200.0;
        let mut density = sheet(willans());
        density.fuel_density = 0.0;
        let bad_fraction = sheet(FuelModel::Willans {
            full_load_sfc: 230.0 * G_PER_KWH,
            zero_load_fraction: 1.0,
        });
        let bad_map = sheet(FuelModel::SfcMap {
            rpm: vec![1000.0, 3000.0],
            load: vec![0.25, 1.0],
            sfc: vec![vec![300.0 * G_PER_KWH]],
        });
        let cases = [
            (one_point, "full-load power curve: needs at least 2 points"),
            (unsorted, "rpm must increase strictly"),
            (negative, "value -5 must be positive"),
            (idle, "idle rpm = 3000"),
            (rated, "rated rpm = 3200"),
            (density, "fuel density = 0"),
            (bad_fraction, "zero-load fuel fraction = 1"),
            (bad_map, "SFC map: has 1 rows of SFC for 2 rpm values"),
        ];
        for (engine, expected) in cases {
            let message = engine.validate().unwrap_err().to_string();
            assert!(
                message.contains(expected),
                "{message:?} should contain {expected:?}"
            );
        }
    }

    #[test]
    fn unusual_values_give_warnings() {
        let mut engine = sheet(FuelModel::Willans {
            full_load_sfc: 500.0 * G_PER_KWH,
            zero_load_fraction: 0.1,
        });
        engine.fuel_density = 1200.0;
        let warnings = engine.validate().unwrap();
        assert_eq!(warnings.len(), 2, "{warnings:?}");
        assert!(warnings[0].message.contains("500 g/kWh"));
        assert!(warnings[1].message.contains("1200 kg/m³"));
    }
}
