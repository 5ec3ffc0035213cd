//! Cavitation and blade loading checks: Keller, Burrill, blade loading and tip speed.
//!
//! All functions take and return SI values (N, m, m/s, Pa, kg/m³; shaft speed in rev/s).
//! [`check_cavitation`] gathers every check for one operating point with its limit and a
//! pass/fail, so that callers can warn at the target speed and at top speed.

use super::ScrewGeometry;
use crate::propulsion::{STANDARD_GRAVITY, Subject, Warning};
use std::f64::consts::PI;
use thiserror::Error;

/// Keller's constant K for a single-screw ship (wake behind the hull), from memory of the standard texts.
pub const KELLER_CONSTANT_SINGLE_SCREW: f64 = 0.2;
/// Keller's constant K for a twin-screw ship, from memory (0 is used for fast twin-screw craft).
pub const KELLER_CONSTANT_TWIN_SCREW: f64 = 0.1;

/// One pound-force per square inch in pascals (NIST SP 811: 6.894 757 E+03).
pub const PASCALS_PER_PSI: f64 = 6_894.757;
/// Usual small-craft ceiling on mean blade loading T/Ap, Pa: about 10 psi (common practice).
pub const SMALL_CRAFT_BLADE_LOADING_LIMIT: f64 = 10.0 * PASCALS_PER_PSI;

/// Range of cavitation numbers σ0.7R the Burrill diagram covers (from memory: 0.1 to 2).
const BURRILL_SIGMA_RANGE: (f64, f64) = (0.1, 2.0);
/// The source named in warnings.
const SOURCE: &str = "cavitation";

/// Why a cavitation check could not be made.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum CavitationError {
    /// An input was non-finite or outside its physical range.
    #[error("{field} must be {expected}, got {value}")]
    BadInput {
        /// Which input, e.g. "shaft immersion".
        field: &'static str,
        /// The value given.
        value: f64,
        /// What was expected, e.g. "a finite number ≥ 0 m".
        expected: &'static str,
    },
    /// The static pressure at the shaft does not exceed the vapour pressure: the water boils.
    #[error(
        "static pressure at the shaft ({static_pressure} Pa) does not exceed the vapour pressure ({vapour_pressure} Pa)"
    )]
    NoPressureMargin {
        /// p0 = patm + ρ·g·h, Pa.
        static_pressure: f64,
        /// Vapour pressure pv, Pa.
        vapour_pressure: f64,
    },
}

/// Static pressure at the shaft centreline p0 = patm + ρ·g·h, Pa.
pub fn static_pressure_at_shaft(
    atmospheric_pressure: f64,
    water_density: f64,
    immersion: f64,
) -> f64 {
    atmospheric_pressure + water_density * STANDARD_GRAVITY * immersion
}

/// Keller's minimum expanded area ratio AE/A0 = (1.3 + 0.3·Z)·T / ((p0 − pv)·D²) + K (dimensionless).
///
/// `thrust` in N, `pressure_margin` = p0 − pv in Pa, `diameter` in m; K as in
/// [`KELLER_CONSTANT_SINGLE_SCREW`] / [`KELLER_CONSTANT_TWIN_SCREW`].
pub fn keller_minimum_area_ratio(
    blades: u32,
    thrust: f64,
    pressure_margin: f64,
    diameter: f64,
    keller_constant: f64,
) -> f64 {
    (1.3 + 0.3 * f64::from(blades)) * thrust / (pressure_margin * diameter * diameter)
        + keller_constant
}

/// Resultant inflow speed at 0.7R, V0.7R = √(Va² + (0.7·π·n·D)²), m/s.
pub fn relative_speed_at_07r(advance_speed: f64, shaft_speed_rps: f64, diameter: f64) -> f64 {
    advance_speed.hypot(0.7 * PI * shaft_speed_rps * diameter)
}

/// Burrill's cavitation number at 0.7R, σ0.7R = (p0 − pv) / (½·ρ·V²0.7R) (dimensionless).
pub fn cavitation_number_at_07r(
    pressure_margin: f64,
    water_density: f64,
    relative_speed: f64,
) -> f64 {
    pressure_margin / (0.5 * water_density * relative_speed * relative_speed)
}

/// Projected blade area from the expanded area by Taylor's approximation
/// Ap ≈ AE·(1.067 − 0.229·P/D), m² (Taylor, *Speed and Power of Ships*; for P/D about 0.6–2.0).
pub fn projected_area_taylor(expanded_area: f64, pitch_ratio: f64) -> f64 {
    expanded_area * (1.067 - 0.229 * pitch_ratio)
}

/// Burrill's thrust loading coefficient τc = T / (½·ρ·V²0.7R·Ap) (dimensionless).
pub fn thrust_loading_coefficient(
    thrust: f64,
    water_density: f64,
    relative_speed: f64,
    projected_area: f64,
) -> f64 {
    thrust / (0.5 * water_density * relative_speed * relative_speed * projected_area)
}

/// The limiting τc on Burrill's 5 % back-cavitation line ("suggested upper limit for merchant
/// ship propellers") at cavitation number `sigma` = σ0.7R.
///
/// Fitted form τc = 0.28·(σ0.7R − 0.03)^0.57 (from memory of the standard design texts; it
/// follows the published line over σ0.7R ≈ 0.1–2). Zero at or below σ0.7R = 0.03.
pub fn burrill_five_percent_thrust_loading(sigma: f64) -> f64 {
    if sigma > 0.03 {
        0.28 * (sigma - 0.03).powf(0.57)
    } else {
        0.0
    }
}

/// Mean blade loading T/Ap, Pa (thrust over projected blade area).
pub fn blade_loading(thrust: f64, projected_area: f64) -> f64 {
    thrust / projected_area
}

/// Blade tip speed π·n·D, m/s.
pub fn tip_speed(shaft_speed_rps: f64, diameter: f64) -> f64 {
    PI * shaft_speed_rps * diameter
}

/// One operating point of one screw, in SI.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CavitationInput {
    /// The screw.
    pub geometry: ScrewGeometry,
    /// Thrust of this screw, N.
    pub thrust: f64,
    /// Speed of advance Va = V·(1 − w), m/s.
    pub advance_speed: f64,
    /// Shaft speed n, rev/s.
    pub shaft_speed_rps: f64,
    /// Depth of the shaft centreline below the water surface h, m.
    pub shaft_immersion: f64,
    /// Water density ρ, kg/m³.
    pub water_density: f64,
    /// Vapour pressure of the water pv, Pa.
    pub vapour_pressure: f64,
    /// Atmospheric pressure patm, Pa.
    pub atmospheric_pressure: f64,
    /// Keller's constant K (0 to 0.2 by single/twin screw).
    pub keller_constant: f64,
    /// Highest acceptable mean blade loading T/Ap, Pa (e.g. [`SMALL_CRAFT_BLADE_LOADING_LIMIT`]).
    pub blade_loading_limit: f64,
    /// Highest acceptable tip speed, m/s, if the caller has one.
    pub tip_speed_limit: Option<f64>,
}

/// A value, its limit and whether it is on the safe side of the limit.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LimitCheck {
    /// The value at this operating point.
    pub value: f64,
    /// The limit it is compared with (same unit).
    pub limit: f64,
    /// Whether the value is on the safe side of the limit.
    pub passed: bool,
}

impl LimitCheck {
    /// A check that passes when `value` ≥ `limit`.
    fn at_least(value: f64, limit: f64) -> Self {
        Self {
            value,
            limit,
            passed: value >= limit,
        }
    }
    /// A check that passes when `value` ≤ `limit`.
    fn at_most(value: f64, limit: f64) -> Self {
        Self {
            value,
            limit,
            passed: value <= limit,
        }
    }
}

/// Every cavitation and loading check for one operating point.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct CavitationReport {
    /// Static pressure at the shaft centreline p0, Pa.
    pub static_pressure: f64,
    /// The screw's AE/A0 against Keller's minimum (passes when AE/A0 ≥ minimum).
    pub keller_area_ratio: LimitCheck,
    /// Resultant inflow speed at 0.7R, m/s.
    pub relative_speed_07r: f64,
    /// Cavitation number σ0.7R.
    pub cavitation_number: f64,
    /// Projected blade area Ap (Taylor's approximation), m².
    pub projected_area: f64,
    /// τc against Burrill's 5 % back-cavitation line (passes when τc ≤ limit).
    pub thrust_loading: LimitCheck,
    /// The smallest projected area that keeps τc on Burrill's 5 % line, m² (`None` when
    /// σ0.7R ≤ 0.03, where no area does).
    pub burrill_minimum_projected_area: Option<f64>,
    /// The AE/A0 that gives that projected area by Taylor's approximation.
    pub burrill_minimum_area_ratio: Option<f64>,
    /// Mean blade loading T/Ap against the given limit, Pa (passes when ≤ limit).
    pub blade_loading: LimitCheck,
    /// Tip speed π·n·D, m/s.
    pub tip_speed: f64,
    /// Tip speed against the caller's limit, if one was given (passes when ≤ limit).
    pub tip_speed_check: Option<LimitCheck>,
    /// Cautions: a failed check, or σ0.7R outside the Burrill diagram.
    pub warnings: Vec<Warning>,
}

impl CavitationReport {
    /// Whether every check with a limit passed.
    pub fn all_passed(&self) -> bool {
        self.keller_area_ratio.passed
            && self.thrust_loading.passed
            && self.blade_loading.passed
            && self.tip_speed_check.is_none_or(|c| c.passed)
    }
}

/// Checks `value` is finite and at least `minimum` (or above it when `strict`).
fn require(
    field: &'static str,
    value: f64,
    minimum: f64,
    strict: bool,
    expected: &'static str,
) -> Result<(), CavitationError> {
    let ok = value.is_finite()
        && if strict {
            value > minimum
        } else {
            value >= minimum
        };
    if ok {
        Ok(())
    } else {
        Err(CavitationError::BadInput {
            field,
            value,
            expected,
        })
    }
}

/// Runs every check for one operating point.
pub fn check_cavitation(input: &CavitationInput) -> Result<CavitationReport, CavitationError> {
    let g = &input.geometry;
    require("diameter", g.diameter, 0.0, true, "a finite number > 0 m")?;
    require("pitch", g.pitch, 0.0, true, "a finite number > 0 m")?;
    require("area ratio", g.area_ratio, 0.0, true, "a finite number > 0")?;
    if g.blades == 0 {
        return Err(CavitationError::BadInput {
            field: "blades",
            value: 0.0,
            expected: "at least 1 blade",
        });
    }
    require("thrust", input.thrust, 0.0, false, "a finite number ≥ 0 N")?;
    require(
        "advance speed",
        input.advance_speed,
        0.0,
        false,
        "a finite number ≥ 0 m/s",
    )?;
    require(
        "shaft speed",
        input.shaft_speed_rps,
        0.0,
        true,
        "a finite number > 0 rev/s",
    )?;
    require(
        "shaft immersion",
        input.shaft_immersion,
        0.0,
        false,
        "a finite number ≥ 0 m",
    )?;
    require(
        "water density",
        input.water_density,
        0.0,
        true,
        "a finite number > 0 kg/m³",
    )?;
    require(
        "vapour pressure",
        input.vapour_pressure,
        0.0,
        false,
        "a finite number ≥ 0 Pa",
    )?;
    require(
        "atmospheric pressure",
        input.atmospheric_pressure,
        0.0,
        false,
        "a finite number ≥ 0 Pa",
    )?;
    require(
        "Keller constant",
        input.keller_constant,
        0.0,
        false,
        "a finite number ≥ 0 (0 to 0.2)",
    )?;
    require(
        "blade loading limit",
        input.blade_loading_limit,
        0.0,
        true,
        "a finite number > 0 Pa",
    )?;
    if let Some(limit) = input.tip_speed_limit {
        require(
            "tip speed limit",
            limit,
            0.0,
            true,
            "a finite number > 0 m/s",
        )?;
    }

    let static_pressure = static_pressure_at_shaft(
        input.atmospheric_pressure,
        input.water_density,
        input.shaft_immersion,
    );
    let pressure_margin = static_pressure - input.vapour_pressure;
    if pressure_margin <= 0.0 {
        return Err(CavitationError::NoPressureMargin {
            static_pressure,
            vapour_pressure: input.vapour_pressure,
        });
    }

    let keller_minimum = keller_minimum_area_ratio(
        g.blades,
        input.thrust,
        pressure_margin,
        g.diameter,
        input.keller_constant,
    );
    let keller_area_ratio = LimitCheck::at_least(g.area_ratio, keller_minimum);

    let relative_speed_07r =
        relative_speed_at_07r(input.advance_speed, input.shaft_speed_rps, g.diameter);
    let cavitation_number =
        cavitation_number_at_07r(pressure_margin, input.water_density, relative_speed_07r);
    let disc_area = PI * g.diameter * g.diameter / 4.0;
    let taylor_factor = 1.067 - 0.229 * g.pitch_ratio();
    if taylor_factor <= 0.0 {
        return Err(CavitationError::BadInput {
            field: "pitch ratio",
            value: g.pitch_ratio(),
            expected: "below 4.66 for Taylor's projected-area approximation",
        });
    }
    let projected_area = projected_area_taylor(g.area_ratio * disc_area, g.pitch_ratio());
    let dynamic_pressure = 0.5 * input.water_density * relative_speed_07r * relative_speed_07r;
    let thrust_loading_value = input.thrust / (dynamic_pressure * projected_area);
    let burrill_limit = burrill_five_percent_thrust_loading(cavitation_number);
    let thrust_loading = LimitCheck::at_most(thrust_loading_value, burrill_limit);
    let burrill_minimum_projected_area =
        (burrill_limit > 0.0).then(|| input.thrust / (dynamic_pressure * burrill_limit));
    let burrill_minimum_area_ratio =
        burrill_minimum_projected_area.map(|area| area / taylor_factor / disc_area);

    let blade_loading = LimitCheck::at_most(
        blade_loading(input.thrust, projected_area),
        input.blade_loading_limit,
    );
    let tip_speed = tip_speed(input.shaft_speed_rps, g.diameter);
    let tip_speed_check = input
        .tip_speed_limit
        .map(|limit| LimitCheck::at_most(tip_speed, limit));

    let mut warnings = Vec::new();
    if !keller_area_ratio.passed {
        warnings.push(Warning::about(
            Subject::AreaRatio,
            SOURCE,
            format!(
                "area ratio AE/A0 = {:.3} is below Keller's minimum of {:.3}",
                keller_area_ratio.value, keller_area_ratio.limit
            ),
        ));
    }
    if !thrust_loading.passed {
        warnings.push(Warning::about(
            Subject::Cavitation,
            SOURCE,
            format!(
                "thrust loading τc = {:.3} is above Burrill's 5 % back-cavitation limit of {:.3} at σ0.7R = {:.3}",
                thrust_loading.value, thrust_loading.limit, cavitation_number
            ),
        ));
    }
    if !(BURRILL_SIGMA_RANGE.0..=BURRILL_SIGMA_RANGE.1).contains(&cavitation_number) {
        warnings.push(Warning::about(
            Subject::Cavitation,
            SOURCE,
            format!(
                "cavitation number σ0.7R = {cavitation_number:.3} is outside the Burrill diagram ({} to {}); its limit is extrapolated",
                BURRILL_SIGMA_RANGE.0, BURRILL_SIGMA_RANGE.1
            ),
        ));
    }
    if !blade_loading.passed {
        warnings.push(Warning::about(
            Subject::Cavitation,
            SOURCE,
            format!(
                "blade loading {:.1} psi ({:.1} kPa) is above the limit of {:.1} psi ({:.1} kPa)",
                blade_loading.value / PASCALS_PER_PSI,
                blade_loading.value / 1000.0,
                blade_loading.limit / PASCALS_PER_PSI,
                blade_loading.limit / 1000.0
            ),
        ));
    }
    if let Some(check) = tip_speed_check.filter(|c| !c.passed) {
        warnings.push(Warning::about(
            Subject::Cavitation,
            SOURCE,
            format!(
                "tip speed {:.1} m/s is above the limit of {:.1} m/s",
                check.value, check.limit
            ),
        ));
    }

    Ok(CavitationReport {
        static_pressure,
        keller_area_ratio,
        relative_speed_07r,
        cavitation_number,
        projected_area,
        thrust_loading,
        burrill_minimum_projected_area,
        burrill_minimum_area_ratio,
        blade_loading,
        tip_speed,
        tip_speed_check,
        warnings,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn input() -> CavitationInput {
        CavitationInput {
            geometry: ScrewGeometry {
                blades: 3,
                diameter: 0.6,
                pitch: 0.5,
                area_ratio: 0.5,
            },
            thrust: 5_000.0,
            advance_speed: 3.5,
            shaft_speed_rps: 20.0,
            shaft_immersion: 0.8,
            water_density: 1025.0,
            vapour_pressure: 1_700.0,
            atmospheric_pressure: 101_325.0,
            keller_constant: KELLER_CONSTANT_SINGLE_SCREW,
            blade_loading_limit: SMALL_CRAFT_BLADE_LOADING_LIMIT,
            tip_speed_limit: Some(40.0),
        }
    }

    #[test]
    fn minimum_burrill_area_sits_exactly_on_the_line() {
        let report = check_cavitation(&input()).unwrap();
        let area = report.burrill_minimum_projected_area.unwrap();
        let tau = thrust_loading_coefficient(5_000.0, 1025.0, report.relative_speed_07r, area);
        assert!((tau - report.thrust_loading.limit).abs() < 1e-12);
        // The minimum AE/A0 gives that projected area back through Taylor's approximation.
        let d = 0.6_f64;
        let back = projected_area_taylor(
            report.burrill_minimum_area_ratio.unwrap() * PI * d * d / 4.0,
            0.5 / 0.6,
        );
        assert!((back - area).abs() < 1e-12);
    }

    #[test]
    fn more_thrust_fails_more_checks() {
        let light = check_cavitation(&input()).unwrap();
        assert!(light.all_passed(), "{:?}", light.warnings);
        let heavy = check_cavitation(&CavitationInput {
            thrust: 50_000.0,
            ..input()
        })
        .unwrap();
        assert!(!heavy.keller_area_ratio.passed && !heavy.thrust_loading.passed);
        assert!(!heavy.blade_loading.passed && !heavy.all_passed());
        assert!(heavy.warnings.iter().any(|w| w.message.contains("psi")));
    }

    #[test]
    fn bad_inputs_name_the_field() {
        let err = check_cavitation(&CavitationInput {
            shaft_immersion: -1.0,
            ..input()
        });
        assert!(matches!(
            err,
            Err(CavitationError::BadInput {
                field: "shaft immersion",
                ..
            })
        ));
        let err = check_cavitation(&CavitationInput {
            thrust: f64::NAN,
            ..input()
        });
        assert!(matches!(
            err,
            Err(CavitationError::BadInput {
                field: "thrust",
                ..
            })
        ));
        let err = check_cavitation(&CavitationInput {
            vapour_pressure: 2.0e5,
            ..input()
        });
        assert!(matches!(err, Err(CavitationError::NoPressureMargin { .. })));
    }
}
