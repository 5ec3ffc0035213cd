//! Integration tests: solver — thrust identity, propeller curve, engine match, cruise.

use std::f64::consts::PI;
use tidewright::propulsion::engine::{EngineSheet, FuelModel, RpmCurve};
use tidewright::propulsion::hull::{
    HullInput, Interaction, InteractionMethod, Margins, ResistanceMethod, ResistanceModel,
    ResistanceTable,
};
use tidewright::propulsion::screw::{BSeriesScrew, ScrewGeometry, ScrewModel};
use tidewright::propulsion::solver::cruise::{cruise_at_rpm, cruise_at_speed};
use tidewright::propulsion::solver::matching::{match_engine, point_at_engine_rpm};
use tidewright::propulsion::solver::point::solve_point;
use tidewright::propulsion::solver::point::{
    AdvanceRatioFailure, Drive, advance_ratio_for_loading, reynolds_at_075r, solve_with_resistance,
};
use tidewright::propulsion::solver::{
    Installation, MatchCriteria, OperatingPoint, PointFailure, PropellerCurve, System, Trip,
    Verdict,
};
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
    shafts: 1,
    idle_shafts: 0,
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

// ---------------------------------------------------------------------------------------------
// Whole systems: hull resistance, interaction, screw, gear and engine.

/// The invented cruiser "Pellucid Ness" of docs/method.md §7: 11.0 m LWL, 3.5 m beam, 0.85 m
/// canoe-body draft, 13.0 m³ (invented data, not a reference).
fn pellucid_ness_hull() -> HullInput {
    HullInput {
        length_waterline: 11.0,
        beam_waterline: 3.5,
        draft_aft: 0.85,
        draft_forward: 0.85,
        displacement_volume: 13.0,
        midship_coefficient: None,
        waterplane_coefficient: None,
        lcb_fraction: None,
        wetted_surface: None,
        half_entrance_angle_deg: None,
        transom_area: None,
        bulb_area: 0.0,
        bulb_centre_height: 0.0,
        stern_coefficient: 0.0,
        appendage_area: 0.0,
        appendage_form_factor: 1.5,
    }
}

/// Sea water at 15 °C, ITTC 7.5-02-01-03 (../shared/reference/water-and-units.md).
const ITTC_SEA_15C: WaterProperties = WaterProperties {
    density: 1026.021,
    kinematic_viscosity: 1.1892e-6,
    vapour_pressure: 1705.0,
};

/// The worked example's resistance: an invented designer's table (speed m/s, N).
fn example_resistance() -> ResistanceModel {
    ResistanceModel::new(
        pellucid_ness_hull().resolve().unwrap(),
        ResistanceMethod::Table(ResistanceTable {
            rows: vec![
                (1.0, 200.0),
                (2.0, 850.0),
                (3.0, 2200.0),
                (3.5, 3300.0),
                (4.0, 5200.0),
            ],
        }),
        ITTC_SEA_15C,
        None,
        Margins::default(),
    )
}

/// The same hull by Holtrop & Mennen, for searches over a wide speed range.
fn holtrop_resistance(service_margin: f64) -> ResistanceModel {
    let mut model = example_resistance().with_method(ResistanceMethod::HoltropMennen);
    model.margins = Margins {
        service: service_margin,
        ..Margins::default()
    };
    model
}

const EXAMPLE_GEAR: Installation = Installation {
    gear_ratio: 2.5,
    shaft_efficiency: 0.98,
    gear_efficiency: 0.97,
    shafts: 1,
    idle_shafts: 0,
};

fn system<'a>(
    resistance: &'a ResistanceModel,
    screw: &'a ScrewModel,
    engine: &'a EngineSheet,
) -> System<'a> {
    System {
        resistance,
        interaction: InteractionMethod::Taylor,
        screw,
        installation: EXAMPLE_GEAR,
        engine,
        reynolds_correction: false,
    }
}

#[test]
fn worked_example_of_the_method_document() {
    // docs/method.md §7, "a worked example by hand": every number there, within 0.5 %.
    let (resistance, engine) = (example_resistance(), invented_engine());
    let screw = b_series(3, 0.60, 0.8, 0.50);
    // The example gives w, t and ηR as user values (the document's interaction line), so the
    // figures do not move when an estimate's formula is revised.
    let example_system = System {
        interaction: InteractionMethod::User(Interaction {
            wake_fraction: 0.148625,
            thrust_deduction: 0.098055,
            relative_rotative_efficiency: 1.0,
        }),
        ..system(&resistance, &screw, &engine)
    };
    let p = solve_point(&example_system, 3.6).unwrap();
    let hull = &resistance.hull;
    let checks = [
        ("Cb", hull.block_coefficient, 0.39725),
        ("R", p.resistance, 3680.0),
        ("w", p.wake_fraction, 0.148625),
        ("t", p.thrust_deduction, 0.098055),
        ("Va", p.advance_speed, 3.06495),
        ("T", p.thrust, 4080.07),
        (
            "loading",
            p.thrust / (1026.021 * p.advance_speed.powi(2) * 0.36),
            1.17588,
        ),
        ("J", p.advance_ratio, 0.40585),
        ("KT", p.thrust_coefficient, 0.19369),
        ("KQ", p.torque_coefficient, 0.025294),
        ("eta0", p.open_water_efficiency, 0.49461),
        ("n", p.screw_rps, 12.5864),
        ("Q", p.torque, 319.70),
        ("PE", p.effective_power, 13248.0),
        ("PD", p.delivered_power, 25282.9),
        ("PB", p.brake_power, 26596.7),
        ("rpm", p.engine_rpm, 1887.97),
        ("load", p.load_fraction, 0.69019),
        ("fuel kg/h", p.fuel_mass_flow * 3600.0, 6.5868),
        ("fuel L/h", p.fuel_volume_flow * 3.6e6, 7.8416),
    ];
    // 800 L tank, 90 % usable, 20 % reserve: 576 L for range.
    let cruise = cruise_at_speed(&example_system, &boat_trip(), 3.6).unwrap();
    let nautical_mile = 1852.0;
    let cruise_checks = [
        (
            "L/nmi",
            cruise.fuel_per_distance * 1e3 * nautical_mile,
            1.1206,
        ),
        ("range nmi", cruise.range / nautical_mile, 514.02),
        ("endurance h", cruise.endurance / 3600.0, 73.454),
    ];
    for (name, got, want) in checks.into_iter().chain(cruise_checks) {
        assert!(
            (got - want).abs() <= 0.005 * want.abs(),
            "{name}: {got} vs the document's {want}"
        );
    }
}

fn boat_trip() -> Trip {
    Trip {
        target_speed: 3.6,
        tank_volume: 0.8,
        usable_fraction: 0.9,
        reserve_fraction: 0.2,
    }
}

#[test]
fn a_propeller_curve_keeps_every_identity_and_every_failure_reason() {
    let (resistance, engine) = (example_resistance(), invented_engine());
    let screw = b_series(3, 0.60, 0.8, 0.50);
    let mut system = system(&resistance, &screw, &engine);
    system.reynolds_correction = true;
    // The table ends at 4.0 m/s: the points beyond are continued, and marked.
    let curve = PropellerCurve::over_speeds(&system, 0.0, 5.0, 101);
    assert_eq!(curve.points.len(), 101);
    assert_eq!(curve.points[0].0, 0.0);
    assert_eq!(curve.points[100].0, 5.0);
    let at_rest = curve.points[0].1.as_ref().unwrap();
    assert_eq!((at_rest.engine_rpm, at_rest.brake_power), (0.0, 0.0));
    let (mut rpm, mut power) = (0.0, 0.0);
    for p in curve.solved().skip(1) {
        assert_identities(p, &screw, &ITTC_SEA_15C, &EXAMPLE_GEAR);
        assert!(
            p.engine_rpm > rpm && p.brake_power > power,
            "not rising at {} m/s",
            p.speed
        );
        (rpm, power) = (p.engine_rpm, p.brake_power);
    }
    // The table covers 1.0–4.0 m/s: below and above it the curve is continued (as V² below,
    // with the last segment's slope above), so every speed solves, and those outside the table
    // are marked as outside the method's range.
    assert_eq!(curve.failures().count(), 0);
    for p in curve.solved().skip(1) {
        let inside = (1.0 - 1e-9..=4.0 + 1e-9).contains(&p.speed);
        assert_eq!(p.in_method_range, inside, "{} m/s", p.speed);
    }
    // Reading the curve by engine rpm: close to the exact solve (101 points, 0.05 m/s apart).
    let read = curve.at_engine_rpm(1800.0).unwrap();
    let exact = point_at_engine_rpm(&system, 1800.0).unwrap();
    assert_close!(read.speed, exact.speed, 2e-3);
    assert_close!(read.brake_power, exact.brake_power, 1e-2);
    assert!(curve.at_engine_rpm(9000.0).is_none());
}

#[test]
fn a_curve_solved_again_in_its_own_storage_is_the_fresh_curve() {
    let (resistance, engine) = (example_resistance(), invented_engine());
    let screw = b_series(3, 0.60, 0.8, 0.50);
    let mut system = system(&resistance, &screw, &engine);
    system.reynolds_correction = true;
    // Storage that held other points: more of them, the first ones failed (negative speeds).
    let mut reused = PropellerCurve::over_speeds(&system, -2.0, 5.0, 140);
    assert!(reused.failures().count() > 0);
    for count in [101, 7, 101, 0, 1] {
        reused.resolve(&system, 0.0, 5.0, count);
        assert_eq!(
            reused,
            PropellerCurve::over_speeds(&system, 0.0, 5.0, count)
        );
    }
}

#[test]
fn more_resistance_needs_more_power_through_the_whole_system() {
    let engine = invented_engine();
    let screw = b_series(3, 0.60, 0.8, 0.50);
    let (clean, fouled) = (holtrop_resistance(0.0), holtrop_resistance(0.25));
    for speed in [1.0, 2.5, 3.6, 4.5] {
        let a = solve_point(&system(&clean, &screw, &engine), speed).unwrap();
        let b = solve_point(&system(&fouled, &screw, &engine), speed).unwrap();
        assert_close!(b.resistance, 1.25 * a.resistance, 1e-9);
        assert!(b.brake_power > a.brake_power && b.engine_rpm > a.engine_rpm);
    }
    // And a heavier boat turns fewer rpm at full throttle (design issue, what-if check).
    let clean_match =
        match_engine(&system(&clean, &screw, &engine), &MatchCriteria::default()).unwrap();
    let fouled_match =
        match_engine(&system(&fouled, &screw, &engine), &MatchCriteria::default()).unwrap();
    assert!(fouled_match.top_speed < clean_match.top_speed);
}

#[test]
fn more_pitch_turns_fewer_rpm_through_the_whole_system() {
    let (resistance, engine) = (holtrop_resistance(0.0), invented_engine());
    let mut previous = f64::INFINITY;
    for pitch_ratio in [0.6, 0.7, 0.8, 0.9, 1.0, 1.1] {
        let screw = b_series(3, 0.60, pitch_ratio, 0.50);
        let p = solve_point(&system(&resistance, &screw, &engine), 3.6).unwrap();
        assert!(p.engine_rpm < previous, "P/D {pitch_ratio}");
        previous = p.engine_rpm;
    }
}

#[test]
fn cruise_by_speed_and_by_rpm_agree() {
    let (resistance, engine) = (holtrop_resistance(0.1), invented_engine());
    let screw = b_series(3, 0.60, 0.8, 0.50);
    let mut system = system(&resistance, &screw, &engine);
    system.reynolds_correction = true;
    let trip = boat_trip();
    for speed in [1.5, 2.5, 3.6, 4.2] {
        let by_speed = cruise_at_speed(&system, &trip, speed).unwrap();
        let by_rpm = cruise_at_rpm(&system, &trip, by_speed.point.engine_rpm).unwrap();
        assert_close!(by_rpm.point.speed, speed, 1e-6);
        assert_close!(by_rpm.point.brake_power, by_speed.point.brake_power, 1e-5);
        assert_close!(by_rpm.range, by_speed.range, 1e-5);
        // Range = fuel for range / fuel per distance; endurance = range / speed.
        assert_close!(
            by_speed.range,
            trip.fuel_for_range() / by_speed.fuel_per_distance,
            1e-12
        );
        assert_close!(by_speed.endurance * speed, by_speed.range, 1e-12);
    }
    // Past the full-load curve the point is still solved, and flagged.
    let flat_out = cruise_at_speed(&system, &trip, 5.5).unwrap();
    assert!(flat_out.beyond_full_load && flat_out.point.load_fraction > 1.0);
    assert!(
        !cruise_at_speed(&system, &trip, 3.0)
            .unwrap()
            .beyond_full_load
    );
}

#[test]
fn the_match_meets_the_envelope_and_judges_by_the_criteria() {
    let (resistance, engine) = (holtrop_resistance(0.0), invented_engine());
    let criteria = MatchCriteria::default();
    let mut verdicts = Vec::new();
    // Steps of 0.01 in P/D: fine enough that one lands in the matched band (about 3 % of rated
    // rpm wide).
    for pitch_ratio in (0..=25).map(|i| 0.5 + 0.01 * f64::from(i)) {
        let screw = b_series(3, 0.60, pitch_ratio, 0.50);
        let system = system(&resistance, &screw, &engine);
        let m = match_engine(&system, &criteria).unwrap();
        assert_close!(m.rated_point.engine_rpm, 3000.0, 1e-8);
        assert_close!(
            m.absorbed_fraction_at_rated,
            m.rated_point.brake_power / 60e3,
            1e-12
        );
        if !m.margin_is_lower_bound {
            assert_eq!(m.verdict, criteria.verdict(m.rpm_margin, 3000.0));
        }
        // The margin is measured where the screw absorbs full-load power: the meeting rpm
        // when the screw loads the engine, the free-running rpm when the governor holds it.
        let loaded = m.free_running_rpm.unwrap_or(m.meeting_rpm);
        assert_close!(m.rpm_margin, loaded - 3000.0, 1e-12);
        assert_eq!(m.top_speed, m.top_point.speed);
        if m.governed {
            // Held by the governor at the top of the curve, part-loaded.
            assert_close!(m.meeting_rpm, 3000.0, 1e-8);
            assert!(m.top_point.load_fraction < 1.0);
            assert!(m.free_running_rpm.is_none_or(|rpm| rpm > 3000.0));
        } else {
            // The propeller curve meets the full-load curve: the engine is fully loaded there.
            assert_close!(m.top_point.load_fraction, 1.0, 1e-8);
            assert_close!(
                m.top_point.brake_power,
                engine.full_load_power_at(m.meeting_rpm),
                1e-8
            );
            assert!(m.meeting_rpm <= 3000.0 * (1.0 + 1e-9));
        }
        verdicts.push(m.verdict);
    }
    // Finer pitch unloads the engine: the verdicts run from under to over.
    assert_eq!(verdicts.first(), Some(&Verdict::Under));
    assert_eq!(verdicts.last(), Some(&Verdict::Over));
    assert!(verdicts.contains(&Verdict::Matched), "{verdicts:?}");
}

#[test]
fn unreachable_and_bad_requests_fail_with_their_reason() {
    let (resistance, engine) = (holtrop_resistance(0.0), invented_engine());
    let screw = b_series(3, 0.60, 0.8, 0.50);
    let system = system(&resistance, &screw, &engine);
    assert!(matches!(
        point_at_engine_rpm(&system, 50_000.0),
        Err(PointFailure::RpmOutOfReach { engine_rpm, .. }) if engine_rpm == 50_000.0
    ));
    assert_eq!(
        solve_point(&system, -1.0),
        Err(PointFailure::InvalidSpeed(-1.0))
    );
    assert!(matches!(
        point_at_engine_rpm(&system, f64::NAN),
        Err(PointFailure::BadInput {
            field: "engine rpm",
            ..
        })
    ));
    let trip = Trip {
        reserve_fraction: -0.1,
        ..boat_trip()
    };
    let message = cruise_at_speed(&system, &trip, 3.0)
        .unwrap_err()
        .to_string();
    assert!(message.contains("reserve fraction = -0.1"), "{message}");
    assert!(cruise_at_speed(&system, &boat_trip(), 0.0).is_err());
    let mut bad_gear = system.clone();
    bad_gear.installation.gear_efficiency = 0.0;
    assert!(
        solve_point(&bad_gear, 3.0)
            .unwrap_err()
            .to_string()
            .contains("gear efficiency = 0")
    );
    let mut bad_engine = invented_engine();
    bad_engine.idle_rpm = 4000.0;
    let bad = System {
        engine: &bad_engine,
        ..system.clone()
    };
    let message = match_engine(&bad, &MatchCriteria::default())
        .unwrap_err()
        .to_string();
    assert!(
        message.contains("engine sheet: idle rpm = 4000"),
        "{message}"
    );
}

#[test]
fn a_demo_vessel_gives_a_match_per_variant_and_an_operating_table() {
    use tidewright::profile::store::Store;
    // The embedded demo (invented boats); a store path that does not exist leaves only it.
    let (boat, engine) = Store::at("/nonexistent").resolve_boat("marram").unwrap();
    let vessel = boat.doc.to_default_vessel(&engine.doc).unwrap();
    let matches = vessel.match_all();
    assert_eq!(matches.len(), vessel.variants.len());
    for (index, result) in matches.iter().enumerate() {
        let m = result.as_ref().unwrap();
        let alone = match_engine(&vessel.system(index), &vessel.match_criteria).unwrap();
        assert_eq!(m, &alone);
    }
    let active = vessel.active_variant;
    let table = vessel.operating_table(active, 200.0).unwrap();
    let wide_open = table.last().unwrap();
    assert!(wide_open.wide_open_throttle);
    assert_close!(
        wide_open.engine_rpm,
        matches[active].as_ref().unwrap().meeting_rpm,
        1e-12
    );
    assert!(table[0].engine_rpm >= vessel.engine.idle_rpm);
    for pair in table.windows(2) {
        assert!(pair[1].engine_rpm > pair[0].engine_rpm);
        let (a, b) = (
            pair[0].cruise.as_ref().unwrap(),
            pair[1].cruise.as_ref().unwrap(),
        );
        assert!(
            b.point.speed > a.point.speed && b.point.fuel_volume_flow > a.point.fuel_volume_flow
        );
    }
    for row in &table[..table.len() - 1] {
        assert_eq!(row.engine_rpm % 200.0, 0.0);
        assert_close!(
            row.cruise.as_ref().unwrap().point.engine_rpm,
            row.engine_rpm,
            1e-8
        );
    }
    assert!(
        vessel
            .operating_table(active, 0.0)
            .unwrap_err()
            .to_string()
            .contains("rpm step")
    );
    assert!(vessel.operating_table(active, 0.01).is_err());
    let target = vessel.cruise_at_target(active).unwrap();
    assert_close!(target.point.speed, vessel.trip.target_speed, 1e-12);
}
