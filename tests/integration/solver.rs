//! Integration tests: solver — thrust identity, propeller curve, engine match, cruise.

use std::f64::consts::PI;
use tidewright::propulsion::engine::{EngineSheet, FuelModel, RpmCurve};
use tidewright::propulsion::hull::Interaction;
use tidewright::propulsion::screw::{BSeriesScrew, ScrewGeometry, ScrewModel};
use tidewright::propulsion::solver::point::{
    AdvanceRatioFailure, Drive, advance_ratio_for_loading, reynolds_at_075r, solve_with_resistance,
};
use tidewright::propulsion::solver::{Installation, OperatingPoint};
use tidewright::propulsion::water::WaterProperties;

/// Sea water at 15 °C: ρ = 1025.9 kg/m³, ν = 1.1892e-6 m²/s (ITTC 7.5-02-01-03, as in
/// ../shared/reference/water-and-units.md).
const SEA_15C: WaterProperties = WaterProperties {
    density: 1025.9,
    kinematic_viscosity: 1.1892e-6,
    vapour_pressure: 1705.0,
};

const GEAR: Installation = Installation {
    gear_ratio: 2.0,
    shaft_efficiency: 0.98,
    gear_efficiency: 0.97,
};

const INTERACTION: Interaction = Interaction {
    wake_fraction: 0.22,
    thrust_deduction: 0.17,
    relative_rotative_efficiency: 1.01,
};

fn b_series(blades: u32, diameter: f64, pitch_ratio: f64, area_ratio: f64) -> ScrewModel {
    let geometry = ScrewGeometry {
        blades,
        diameter,
        pitch: pitch_ratio * diameter,
        area_ratio,
    };
    ScrewModel::BSeries(BSeriesScrew::new(geometry).expect("valid geometry"))
}

/// An invented 60 kW sheet (data made up for the tests, not a reference).
fn invented_engine() -> EngineSheet {
    EngineSheet {
        name: "Invented 4-cylinder".into(),
        rated_rpm: 3000.0,
        idle_rpm: 700.0,
        full_load_power: RpmCurve {
            points: vec![
                (1000.0, 18e3),
                (1500.0, 30e3),
                (2000.0, 41e3),
                (2500.0, 52e3),
                (3000.0, 60e3),
            ],
        },
        propeller_law: None,
        fuel: FuelModel::Willans {
            full_load_sfc: 235e-3 / 3.6e6,
            zero_load_fraction: 0.12,
        },
        fuel_density: 840.0,
        duty: None,
        full_throttle_limit: None,
        max_continuous_power: None,
    }
}

/// Checks every identity of design §2.6 at a solved point.
fn assert_identities(
    p: &OperatingPoint,
    screw: &ScrewModel,
    water: &WaterProperties,
    gear: &Installation,
) {
    let d = screw.geometry().diameter;
    let rho = water.density;
    // The thrust identity: the screw's thrust KT·ρ·n²·D⁴ equals R/(1−t).
    let residual = p.screw_thrust(rho, d) / p.thrust - 1.0;
    assert!(
        residual.abs() < 1e-6,
        "thrust identity residual {residual:e} at {} m/s",
        p.speed
    );
    assert_close!(p.thrust, p.resistance / (1.0 - p.thrust_deduction), 1e-12);
    assert_close!(p.advance_speed, p.speed * (1.0 - p.wake_fraction), 1e-12);
    assert_close!(p.advance_ratio, p.advance_speed / (p.screw_rps * d), 1e-12);
    // KT, KQ are the screw's at the reported J and Reynolds number.
    let reynolds = (p.reynolds > 0.0).then_some(p.reynolds);
    let ow = screw.coefficients(p.advance_ratio, reynolds);
    assert_close!(p.thrust_coefficient, ow.thrust_coefficient, 1e-12);
    assert_close!(p.torque_coefficient, ow.torque_coefficient, 1e-12);
    assert_close!(
        p.torque,
        p.torque_coefficient * rho * p.screw_rps.powi(2) * d.powi(5),
        1e-12
    );
    // PD = 2π·n·Q/ηR, PB = PD/(ηshaft·ηgear), engine rpm = 60·n·gear ratio.
    assert_close!(
        p.delivered_power,
        2.0 * PI * p.screw_rps * p.torque / p.relative_rotative_efficiency,
        1e-12
    );
    assert_close!(
        p.brake_power,
        p.delivered_power / (gear.shaft_efficiency * gear.gear_efficiency),
        1e-12
    );
    assert_close!(p.engine_rpm, 60.0 * p.screw_rps * gear.gear_ratio, 1e-12);
    // Propulsive efficiency splits into hull, open-water and relative rotative efficiencies:
    // PE/PD = (1−t)/(1−w)·η0·ηR (Principles of Naval Architecture, 1988, vol. II, ch. 6).
    let hull_efficiency = (1.0 - p.thrust_deduction) / (1.0 - p.wake_fraction);
    assert_close!(
        p.effective_power / p.delivered_power,
        hull_efficiency * p.open_water_efficiency * p.relative_rotative_efficiency,
        1e-6
    );
    // Froude's momentum theory bounds the open-water efficiency by the ideal efficiency of an
    // actuator disc, 2/(1 + √(1 + CT)) with CT = 8·KT/(π·J²) (Froude 1889; Carlton, Marine
    // Propellers and Propulsion, ch. 8).
    let ct = 8.0 * p.thrust_coefficient / (PI * p.advance_ratio.powi(2));
    assert!(p.open_water_efficiency < 2.0 / (1.0 + (1.0 + ct).sqrt()));
}

#[test]
fn thrust_identity_holds_for_b_series_screws_across_loadings() {
    let engine = invented_engine();
    for (blades, pitch_ratio, area_ratio) in [
        (3, 0.8, 0.50),
        (4, 1.0, 0.70),
        (2, 0.6, 0.35),
        (5, 1.3, 0.9),
    ] {
        let screw = b_series(blades, 0.6, pitch_ratio, area_ratio);
        for reynolds_correction in [false, true] {
            let drive = Drive {
                screw: &screw,
                installation: GEAR,
                engine: &engine,
                water: SEA_15C,
                reynolds_correction,
            };
            // From a crawl towing hard to light running at speed.
            for (speed, resistance) in [
                (0.05, 400.0),
                (1.0, 300.0),
                (3.0, 2500.0),
                (4.5, 9000.0),
                (6.0, 1500.0),
            ] {
                let p = solve_with_resistance(&drive, speed, resistance, INTERACTION)
                    .unwrap_or_else(|e| panic!("B{blades} P/D {pitch_ratio} at {speed} m/s: {e}"));
                assert_identities(&p, &screw, &SEA_15C, &GEAR);
                if reynolds_correction {
                    // The Reynolds number used is that of the solved rpm (to the iteration's
                    // tolerance).
                    let chord = screw.chord_at_075r().unwrap();
                    let rn = reynolds_at_075r(
                        chord,
                        p.advance_speed,
                        p.screw_rps,
                        0.6,
                        SEA_15C.kinematic_viscosity,
                    );
                    assert_close!(p.reynolds, rn, 1e-3);
                } else {
                    assert_eq!(p.reynolds, 0.0);
                }
            }
        }
    }
}

#[test]
fn more_pitch_turns_fewer_rpm_at_the_same_speed() {
    let engine = invented_engine();
    let mut previous_rpm = f64::INFINITY;
    for pitch_ratio in [0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2, 1.3] {
        let screw = b_series(3, 0.6, pitch_ratio, 0.5);
        let drive = Drive {
            screw: &screw,
            installation: GEAR,
            engine: &engine,
            water: SEA_15C,
            reynolds_correction: true,
        };
        let p = solve_with_resistance(&drive, 3.5, 3000.0, INTERACTION).unwrap();
        assert!(
            p.engine_rpm < previous_rpm,
            "P/D {pitch_ratio}: {} rpm",
            p.engine_rpm
        );
        previous_rpm = p.engine_rpm;
    }
}

#[test]
fn more_resistance_needs_more_power_and_rpm() {
    let engine = invented_engine();
    let screw = b_series(4, 0.6, 0.9, 0.55);
    let drive = Drive {
        screw: &screw,
        installation: GEAR,
        engine: &engine,
        water: SEA_15C,
        reynolds_correction: true,
    };
    let (mut power, mut rpm) = (0.0, 0.0);
    for resistance in [500.0, 1000.0, 2000.0, 4000.0, 8000.0] {
        let p = solve_with_resistance(&drive, 3.5, resistance, INTERACTION).unwrap();
        assert!(
            p.brake_power > power && p.engine_rpm > rpm,
            "R {resistance} N"
        );
        (power, rpm) = (p.brake_power, p.engine_rpm);
    }
}

#[test]
fn a_screw_without_bollard_thrust_has_no_root() {
    // KT(0) ≤ 0: no J gives any thrust.
    assert_eq!(
        advance_ratio_for_loading(1.0, 0.5, |j| -0.01 - 0.3 * j),
        Err(AdvanceRatioFailure::NoRoot)
    );
}

