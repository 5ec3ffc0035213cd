//! The screw's cavitation and blade-loading checks at a solved operating point.

use super::OperatingPoint;
use crate::propulsion::screw::ScrewGeometry;
use crate::propulsion::screw::cavitation::{
    CavitationError, CavitationInput, CavitationReport, KELLER_CONSTANT_SINGLE_SCREW,
    KELLER_CONSTANT_TWIN_SCREW, SMALL_CRAFT_BLADE_LOADING_LIMIT, check_cavitation,
};
use crate::propulsion::water::{STANDARD_ATMOSPHERE, WaterProperties};

/// Keller, Burrill, blade loading and tip speed of one screw behind the hull at `point` (each
/// driven screw's thrust), with the shaft centreline `shaft_immersion` m below the waterline,
/// in standard atmosphere.
///
/// Keller's constant follows the shafts fitted: the single-screw K behind a single screw, the
/// twin-screw K on a twin (also with one engine out: the running screw still works in a
/// twin-screw stern's wake); the blade loading limit is the small-craft figure of about
/// 10 psi (common practice).
pub fn cavitation_at_point(
    geometry: ScrewGeometry,
    point: &OperatingPoint,
    water: &WaterProperties,
    shaft_immersion: f64,
) -> Result<CavitationReport, CavitationError> {
    let report = check_cavitation(&CavitationInput {
        geometry,
        thrust: point.thrust,
        advance_speed: point.advance_speed,
        shaft_speed_rps: point.screw_rps,
        shaft_immersion,
        water_density: water.density,
        vapour_pressure: water.vapour_pressure,
        atmospheric_pressure: STANDARD_ATMOSPHERE,
        keller_constant: keller_constant(point.shafts),
        blade_loading_limit: SMALL_CRAFT_BLADE_LOADING_LIMIT,
        tip_speed_limit: None,
    })?;
    let figures = [
        ("Keller minimum area ratio", report.keller_area_ratio.limit),
        ("cavitation number", report.cavitation_number),
        ("thrust loading coefficient", report.thrust_loading.value),
        ("Burrill limit", report.thrust_loading.limit),
        ("blade loading", report.blade_loading.value),
        ("tip speed", report.tip_speed),
    ];
    match figures.iter().find(|(_, value)| !value.is_finite()) {
        None => Ok(report),
        Some(&(field, value)) => Err(CavitationError::BadInput {
            field,
            value,
            expected: "a finite result (check the operating point's thrust and speeds)",
        }),
    }
}

/// Keller's constant K for a boat with `shafts` shafts: twin-screw K for 2, single-screw K
/// otherwise (dimensionless).
pub fn keller_constant(shafts: u32) -> f64 {
    if shafts >= 2 {
        KELLER_CONSTANT_TWIN_SCREW
    } else {
        KELLER_CONSTANT_SINGLE_SCREW
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::propulsion::water::{WaterKind, water_properties};

    fn point(thrust: f64) -> OperatingPoint {
        OperatingPoint {
            speed: 3.6,
            resistance: 0.8 * thrust,
            thrust,
            wake_fraction: 0.2,
            thrust_deduction: 0.2,
            relative_rotative_efficiency: 1.0,
            advance_speed: 2.88,
            advance_ratio: 0.48,
            thrust_coefficient: 0.15,
            torque_coefficient: 0.02,
            open_water_efficiency: 0.57,
            shafts: 1,
            driven_shafts: 1,
            screw_rps: 10.0,
            engine_rpm: 1500.0,
            torque: 500.0,
            load_fraction: 0.3,
            ..OperatingPoint::UNSOLVED
        }
    }

    #[test]
    fn more_thrust_needs_more_blade_area_by_keller() {
        let geometry = ScrewGeometry {
            blades: 3,
            diameter: 0.6,
            pitch: 0.42,
            area_ratio: 0.5,
        };
        let water = water_properties(WaterKind::Sea, 15.0).unwrap();
        let light = cavitation_at_point(geometry, &point(3000.0), &water, 0.8).unwrap();
        let heavy = cavitation_at_point(geometry, &point(12000.0), &water, 0.8).unwrap();
        assert!(heavy.keller_area_ratio.limit > light.keller_area_ratio.limit);
        assert!(heavy.blade_loading.value > 3.9 * light.blade_loading.value);
        // Tip speed π·n·D does not depend on thrust.
        assert!((light.tip_speed - std::f64::consts::PI * 10.0 * 0.6).abs() < 1e-9);
    }
}
