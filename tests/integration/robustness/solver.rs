//! Random boats through the whole solver: hulls, water, margins, interaction, B-series screws,
//! gears, engines and trips drawn from the documented input ranges.
//!
//! Inside the ranges every point solves, nothing is NaN or infinite, and the identities of
//! design §2.6 hold at every solved point; outside them the solver still never panics and
//! either fails with a reason or solves with a warning.

use proptest::prelude::*;
use std::f64::consts::PI;
use tidewright::propulsion::engine::{EngineSheet, FuelModel, RpmCurve};
use tidewright::propulsion::hull::{
    AirDrag, HullInput, Interaction, InteractionMethod, Margins, ResistanceMethod, ResistanceModel,
};
use tidewright::propulsion::screw::{BSeriesScrew, ScrewGeometry, ScrewModel};
use tidewright::propulsion::solver::cruise::cruise_at_speed;
use tidewright::propulsion::solver::matching::{
    match_engine, point_at_engine_rpm, point_at_engine_rpm_near,
};
use tidewright::propulsion::solver::point::{REYNOLDS_TOLERANCE, reynolds_at_075r, solve_point};
use tidewright::propulsion::solver::{
    Installation, MatchCriteria, OperatingPoint, PropellerCurve, System, Trip, Verdict,
};
use tidewright::propulsion::water::{WaterKind, water_properties};

/// Gravity for the Froude number, m/s² (standard gravity, NIST SP 811).
const GRAVITY: f64 = 9.80665;
/// Speed points on each random propeller curve.
const CURVE_POINTS: usize = 24;
/// The thrust identity must hold to this, relative (issue 2).
const IDENTITY_TOLERANCE: f64 = 1e-6;

/// Everything a random boat owns; `system()` borrows it for the solver.
#[derive(Debug, Clone)]
struct Boat {
    resistance: ResistanceModel,
    interaction: InteractionMethod,
    screw: ScrewModel,
    installation: Installation,
    engine: EngineSheet,
    reynolds_correction: bool,
    trip: Trip,
}

impl Boat {
    fn system(&self) -> System<'_> {
        System {
            resistance: &self.resistance,
            interaction: self.interaction,
            screw: &self.screw,
            installation: self.installation,
            engine: &self.engine,
            reynolds_correction: self.reynolds_correction,
        }
    }

    /// Speed at Froude number `froude`, m/s.
    fn speed_at(&self, froude: f64) -> f64 {
        froude * (GRAVITY * self.resistance.hull.input.length_waterline).sqrt()
    }
}

/// The hull's proportions, drawn inside the ranges Holtrop & Mennen (1982) state for their
/// regression (Cp 0.55–0.85, L/B 3.9–9.5, B/T 2.1–4.0), sized as displacement motorboats are.
#[derive(Debug, Clone, Copy)]
struct Proportions {
    length: f64,
    length_beam: f64,
    beam_draft: f64,
    block: f64,
    trim: f64,
}

fn in_range_proportions() -> impl Strategy<Value = Proportions> {
    (
        6.0f64..30.0,
        3.9f64..6.0,
        2.1f64..4.0,
        0.52f64..0.70,
        -0.05f64..0.1,
    )
        .prop_map(
            |(length, length_beam, beam_draft, block, trim)| Proportions {
                length,
                length_beam,
                beam_draft,
                block,
                trim,
            },
        )
}

/// Proportions with at least one ratio outside the published ranges (beamy, deep or full).
fn out_of_range_proportions() -> impl Strategy<Value = Proportions> {
    (
        6.0f64..30.0,
        prop_oneof![2.2f64..3.8, 3.9f64..6.0],
        prop_oneof![1.2f64..2.0, 4.2f64..6.0],
        0.30f64..0.48,
    )
        .prop_map(|(length, length_beam, beam_draft, block)| Proportions {
            length,
            length_beam,
            beam_draft,
            block,
            trim: 0.0,
        })
}

fn hull_input(p: Proportions) -> HullInput {
    let beam = p.length / p.length_beam;
    let draft = beam / p.beam_draft;
    HullInput {
        length_waterline: p.length,
        beam_waterline: beam,
        draft_aft: draft * (1.0 + p.trim / 2.0),
        draft_forward: draft * (1.0 - p.trim / 2.0),
        displacement_volume: p.block * p.length * beam * draft,
        midship_coefficient: None,
        waterplane_coefficient: None,
        lcb_fraction: None,
        wetted_surface: None,
        half_entrance_angle_deg: None,
        transom_area: None,
        bulb_area: 0.0,
        bulb_centre_height: 0.0,
        stern_coefficient: 0.0,
        appendage_area: 0.02 * p.length * beam,
        appendage_form_factor: 1.5,
    }
}

/// Wake, thrust deduction and ηR: either published estimate, or user values of the usual size.
fn interaction() -> impl Strategy<Value = InteractionMethod> {
    prop_oneof![
        Just(InteractionMethod::Holtrop1984SingleScrew),
        Just(InteractionMethod::Taylor),
        (0.0f64..0.40, 0.0f64..0.30, 0.95f64..1.05).prop_map(|(w, t, eta_r)| {
            InteractionMethod::User(Interaction {
                wake_fraction: w,
                thrust_deduction: t,
                relative_rotative_efficiency: eta_r,
            })
        }),
    ]
}

/// An invented diesel of `rated_kw` at `rated_rpm`: full-load power rising as rpm^1.3 to
/// rated, fuel by a Willans line (made-up data, not a reference).
fn engine(rated_kw: f64, rated_rpm: f64, sfc_g_per_kwh: f64, zero_load: f64) -> EngineSheet {
    let points = [0.35, 0.5, 0.67, 0.83, 1.0]
        .iter()
        .map(|share: &f64| (share * rated_rpm, rated_kw * 1e3 * share.powf(1.3)))
        .collect();
    EngineSheet {
        name: "Invented test diesel".into(),
        rated_rpm,
        idle_rpm: 0.3 * rated_rpm,
        full_load_power: RpmCurve { points },
        propeller_law: None,
        fuel: FuelModel::Willans {
            full_load_sfc: sfc_g_per_kwh * 1e-3 / 3.6e6,
            zero_load_fraction: zero_load,
        },
        fuel_density: 840.0,
        duty: None,
        full_throttle_limit: None,
        max_continuous_power: None,
    }
}

/// A random boat from hull `proportions` and the screw ranges given.
fn boat(
    proportions: impl Strategy<Value = Proportions>,
    pitch_ratio: impl Strategy<Value = f64>,
    area_ratio: impl Strategy<Value = f64>,
    blades: impl Strategy<Value = u32>,
) -> impl Strategy<Value = Boat> {
    let water = (any::<bool>(), 0.0f64..30.0).prop_map(|(sea, temperature)| {
        let kind = if sea {
            WaterKind::Sea
        } else {
            WaterKind::Fresh
        };
        water_properties(kind, temperature).expect("0–30 °C is inside the ITTC table")
    });
    let margins =
        (0.0f64..0.3, 0.0f64..0.3, 0.8f64..1.25).prop_map(|(service, fouling, factor)| Margins {
            service,
            fouling,
            resistance_factor: factor,
            froude_factor: None,
        });
    let air = proptest::option::of((0.5f64..1.2, 0.05f64..0.3, 0.0f64..10.0));
    let screw = (blades, pitch_ratio, area_ratio, 0.5f64..0.9);
    let gear = (1.0f64..4.0, 0.95f64..=1.0, 0.95f64..=1.0);
    let machinery = (
        0.5f64..3.0,
        1800.0f64..4000.0,
        200.0f64..260.0,
        0.05f64..0.2,
    );
    let trip = (0.15f64..0.40, 0.05f64..5.0, 0.8f64..=1.0, 0.0f64..0.3);
    (
        (proportions, water, margins, air),
        (interaction(), screw, gear, machinery, any::<bool>(), trip),
    )
        .prop_map(
            |(
                (proportions, water, margins, air),
                (interaction, screw, gear, machinery, reynolds_correction, trip),
            )| {
                let hull = hull_input(proportions)
                    .resolve()
                    .expect("generated hulls are physical");
                let (blades, pitch_ratio, area_ratio, diameter_draft) = screw;
                let diameter = diameter_draft * hull.input.draft_aft;
                let geometry = ScrewGeometry {
                    blades,
                    diameter,
                    pitch: pitch_ratio * diameter,
                    area_ratio,
                };
                let (gear_ratio, shaft_efficiency, gear_efficiency) = gear;
                // Power sized to the displacement: 0.5–3 kW per tonne (common practice for
                // displacement motorboats is about 1–2 kW/t).
                let (kw_per_tonne, rated_rpm, sfc, zero_load) = machinery;
                let tonnes = hull.input.displacement_volume * water.density / 1e3;
                let (froude, tank_volume, usable_fraction, reserve_fraction) = trip;
                let length = hull.input.length_waterline;
                let (drag_coefficient, frontal_share, headwind) = air.unwrap_or((0.0, 0.0, 0.0));
                let beam = hull.input.beam_waterline;
                Boat {
                    resistance: ResistanceModel::new(
                        hull,
                        ResistanceMethod::HoltropMennen,
                        water,
                        air.map(|_| AirDrag {
                            air_density: 1.225,
                            drag_coefficient,
                            frontal_area: frontal_share * beam * beam * 2.0,
                            headwind,
                        }),
                        margins,
                    ),
                    interaction,
                    screw: ScrewModel::BSeries(
                        BSeriesScrew::new(geometry).expect("generated screws are physical"),
                    ),
                    installation: Installation {
                        gear_ratio,
                        shaft_efficiency,
                        gear_efficiency,
                        shafts: 1,
                        idle_shafts: 0,
                    },
                    engine: engine(kw_per_tonne * tonnes, rated_rpm, sfc, zero_load),
                    reynolds_correction,
                    trip: Trip {
                        target_speed: froude * (GRAVITY * length).sqrt(),
                        tank_volume,
                        usable_fraction,
                        reserve_fraction,
                    },
                }
            },
        )
}

fn in_range_boat() -> impl Strategy<Value = Boat> {
    boat(
        in_range_proportions(),
        0.5f64..=1.4,
        0.30f64..=1.05,
        2u32..=7,
    )
}

/// Every numeric field of a point.
fn fields(p: &OperatingPoint) -> [(&'static str, f64); 21] {
    [
        ("speed", p.speed),
        ("resistance", p.resistance),
        ("thrust", p.thrust),
        ("wake fraction", p.wake_fraction),
        ("thrust deduction", p.thrust_deduction),
        ("ηR", p.relative_rotative_efficiency),
        ("Va", p.advance_speed),
        ("J", p.advance_ratio),
        ("KT", p.thrust_coefficient),
        ("KQ", p.torque_coefficient),
        ("η0", p.open_water_efficiency),
        ("Rn", p.reynolds),
        ("n", p.screw_rps),
        ("engine rpm", p.engine_rpm),
        ("Q", p.torque),
        ("PE", p.effective_power),
        ("PD", p.delivered_power),
        ("PB", p.brake_power),
        ("load", p.load_fraction),
        ("fuel mass", p.fuel_mass_flow),
        ("fuel volume", p.fuel_volume_flow),
    ]
}

/// The identities of design §2.6 at a solved point moving through the water.
fn check_identities(boat: &Boat, p: &OperatingPoint) -> Result<(), TestCaseError> {
    for (name, value) in fields(p) {
        prop_assert!(value.is_finite(), "{name} = {value} at {} m/s", p.speed);
    }
    let diameter = boat.screw.geometry().diameter;
    let density = boat.resistance.water.density;
    let close = |got: f64, want: f64, rel: f64| (got - want).abs() <= rel * want.abs().max(1e-300);
    // The Reynolds iteration settled: the Rn the screw was corrected for is, within the
    // iteration's tolerance, the Rn of the point's own J and rpm (ITTC 1978 at 0.75R).
    if p.reynolds > 0.0 {
        let chord = boat
            .screw
            .chord_at_075r()
            .expect("a B-series screw has a chord");
        let own = reynolds_at_075r(
            chord,
            p.advance_speed,
            p.screw_rps,
            diameter,
            boat.resistance.water.kinematic_viscosity,
        );
        prop_assert!(
            (own - p.reynolds).abs() <= REYNOLDS_TOLERANCE * p.reynolds * (1.0 + 1e-9),
            "corrected for Rn {} but runs at Rn {own} at {} m/s",
            p.reynolds,
            p.speed
        );
    }
    // Thrust identity: KT/J² = T/(ρ·Va²·D²).
    let left = p.thrust_coefficient / p.advance_ratio.powi(2);
    let right = p.thrust / (density * p.advance_speed.powi(2) * diameter.powi(2));
    prop_assert!(
        close(left, right, IDENTITY_TOLERANCE),
        "KT/J² {left} vs T/(ρVa²D²) {right}"
    );
    prop_assert!(close(
        p.thrust,
        p.resistance / (1.0 - p.thrust_deduction),
        1e-12
    ));
    prop_assert!(close(
        p.advance_speed,
        p.speed * (1.0 - p.wake_fraction),
        1e-12
    ));
    prop_assert!(close(
        p.advance_ratio,
        p.advance_speed / (p.screw_rps * diameter),
        1e-12
    ));
    prop_assert!(close(
        p.torque,
        p.torque_coefficient * density * p.screw_rps.powi(2) * diameter.powi(5),
        1e-12
    ));
    // PD = 2π·n·Q/ηR; PB = PD/(ηshaft·ηgear); engine rpm = 60·n·gear ratio.
    let pd = 2.0 * PI * p.screw_rps * p.torque / p.relative_rotative_efficiency;
    prop_assert!(
        close(p.delivered_power, pd, 1e-12),
        "PD {} vs {pd}",
        p.delivered_power
    );
    let gear = boat.installation;
    prop_assert!(close(
        p.brake_power,
        p.delivered_power / (gear.shaft_efficiency * gear.gear_efficiency),
        1e-12
    ));
    prop_assert!(close(
        p.engine_rpm,
        60.0 * p.screw_rps * gear.gear_ratio,
        1e-12
    ));
    // Inside (0, J at zero thrust), with positive thrust, torque and power.
    let reynolds = (p.reynolds > 0.0).then_some(p.reynolds);
    let zero_thrust = boat.screw.zero_thrust_advance_ratio(reynolds);
    prop_assert!(p.advance_ratio > 0.0 && p.advance_ratio < zero_thrust);
    prop_assert!(p.thrust > 0.0 && p.torque > 0.0 && p.brake_power > 0.0);
    prop_assert!(p.open_water_efficiency > 0.0 && p.open_water_efficiency < 1.0);
    prop_assert!(p.fuel_volume_flow > 0.0 && p.load_fraction > 0.0);
    Ok(())
}

proptest! {
    #![proptest_config(super::cases(128))]

    #[test]
    fn in_range_boats_solve_everywhere_with_every_identity(boat in in_range_boat()) {
        let system = boat.system();
        prop_assert!(boat.screw.warnings().is_empty(), "{:?}", boat.screw.warnings());
        let top = boat.speed_at(0.45);
        let curve = PropellerCurve::over_speeds(&system, 0.0, top, CURVE_POINTS);
        prop_assert_eq!(curve.points.len(), CURVE_POINTS);
        let mut previous: Option<&OperatingPoint> = None;
        for (speed, result) in &curve.points {
            let point = match result {
                Ok(point) => point,
                Err(failure) => {
                    prop_assert!(false, "in-range boat failed at {speed} m/s: {failure}");
                    unreachable!()
                }
            };
            if *speed == 0.0 {
                prop_assert_eq!(point.engine_rpm, 0.0);
                continue;
            }
            check_identities(&boat, point)?;
            // Faster needs more thrust, more rpm and more power.
            if let Some(before) = previous.filter(|p| p.speed > 0.0) {
                prop_assert!(point.engine_rpm > before.engine_rpm, "rpm fell at {speed} m/s");
                prop_assert!(point.brake_power > before.brake_power, "power fell at {speed} m/s");
            }
            previous = Some(point);
        }
        // A single solve agrees with the curve's point.
        let (speed, Ok(from_curve)) = &curve.points[CURVE_POINTS / 2] else { unreachable!() };
        let single = solve_point(&system, *speed).expect("solved on the curve");
        // A curve starts each point's Reynolds iteration from its neighbour's Rn, a single
        // solve from no correction: both stop within the iteration's tolerance (1e-3 of Rn),
        // which moves rpm by a few parts in 10⁷.
        prop_assert!(
            (single.engine_rpm - from_curve.engine_rpm).abs() <= 2e-6 * single.engine_rpm,
            "rpm {} alone against {} on the curve", single.engine_rpm, from_curve.engine_rpm
        );
    }

    #[test]
    fn a_speed_search_started_near_its_answer_finds_the_full_searchs_point(
        boat in in_range_boat(),
        rpm_share in 0.3f64..1.1,
        start in prop::sample::select(vec![0.02, 0.5, 0.97, 1.0, 1.03, 1.6, 50.0]),
    ) {
        let system = boat.system();
        let rpm = rpm_share * boat.engine.rated_rpm;
        let full = point_at_engine_rpm(&system, rpm);
        let near = point_at_engine_rpm_near(&system, rpm, start * full.as_ref().map_or(1.0, |p| p.speed));
        match (full, near) {
            (Ok(full), Ok(near)) => {
                // Both within the searches' tolerance on rpm (1e-9 of it), so the same root:
                // where rpm rises slowly with speed that tolerance spans a few 1e-7 of speed.
                prop_assert!(
                    (near.engine_rpm - rpm).abs() <= 1e-9 * rpm,
                    "{} rpm for {rpm}",
                    near.engine_rpm
                );
                prop_assert!(
                    (near.speed - full.speed).abs() <= 1e-5 * full.speed,
                    "{} m/s started near, {} m/s by the full search",
                    near.speed,
                    full.speed
                );
            }
            (Err(full), Err(near)) => prop_assert_eq!(full.to_string(), near.to_string()),
            (full, near) => prop_assert!(false, "full search {full:?}, started near: {near:?}"),
        }
    }

    #[test]
    fn the_match_and_the_cruise_are_finite_or_say_why(boat in in_range_boat()) {
        let system = boat.system();
        let criteria = MatchCriteria::default();
        match match_engine(&system, &criteria) {
            Ok(found) => {
                for (name, value) in [
                    ("meeting rpm", found.meeting_rpm),
                    ("top speed", found.top_speed),
                    ("absorbed", found.absorbed_fraction_at_rated),
                    ("rpm margin", found.rpm_margin),
                ] {
                    prop_assert!(value.is_finite(), "{name} = {value}");
                }
                prop_assert!(found.meeting_rpm > 0.0 && found.top_speed > 0.0);
                // One definition: the verdict follows the rpm margin (over-propped short of
                // rated rpm, under-propped past rated + the allowance), with the tolerance.
                let rated = system.engine.rated_rpm;
                let margin = found.rpm_margin;
                let expected = if found.margin_is_lower_bound {
                    Verdict::Under
                } else if margin < -criteria.tolerance * rated {
                    Verdict::Over
                } else if margin > (criteria.upper_margin() + criteria.tolerance) * rated {
                    Verdict::Under
                } else {
                    Verdict::Matched
                };
                // A screw absorbing more than rated power at rated rpm cannot reach rated rpm.
                if found.absorbed_fraction_at_rated > 1.0 + 1e-6 {
                    prop_assert!(margin < 0.0, "absorbs {} but margin {margin}", found.absorbed_fraction_at_rated);
                }
                prop_assert_eq!(found.verdict, expected, "margin {}", margin);
            }
            Err(failure) => prop_assert!(!failure.to_string().is_empty()),
        }
        match cruise_at_speed(&system, &boat.trip, boat.trip.target_speed) {
            Ok(cruise) => {
                check_identities(&boat, &cruise.point)?;
                for value in [cruise.fuel_per_distance, cruise.range, cruise.endurance] {
                    prop_assert!(value.is_finite() && value > 0.0, "{cruise:?}");
                }
            }
            Err(failure) => prop_assert!(!failure.to_string().is_empty()),
        }
    }

    // More pitch at the same speed turns the screw slower (design §2.6; issue 2).
    #[test]
    fn more_pitch_turns_fewer_rpm(boat in in_range_boat(), froude in 0.1f64..0.45) {
        let geometry = *boat.screw.geometry();
        prop_assume!(geometry.pitch_ratio() <= 1.3);
        let coarser = ScrewModel::BSeries(BSeriesScrew::new(ScrewGeometry {
            pitch: geometry.pitch + 0.1 * geometry.diameter,
            ..geometry
        }).unwrap());
        let speed = boat.speed_at(froude);
        let fine = solve_point(&boat.system(), speed).unwrap();
        let system = System { screw: &coarser, ..boat.system() };
        let coarse = solve_point(&system, speed).unwrap();
        prop_assert!(coarse.engine_rpm < fine.engine_rpm,
            "P/D {:.3}: {} rpm, +0.1: {} rpm", geometry.pitch_ratio(), fine.engine_rpm, coarse.engine_rpm);
    }

    // Outside the hull's and the screw's ranges: warnings, and never a NaN.
    #[test]
    fn out_of_range_boats_warn_and_never_give_nan(
        boat in boat(
            out_of_range_proportions(),
            prop_oneof![0.3f64..0.49, 1.41f64..2.0],
            prop_oneof![0.15f64..0.29, 1.06f64..1.4],
            prop_oneof![Just(1u32), 8u32..=9],
        ),
        froude in 0.05f64..1.4,
    ) {
        prop_assert!(!boat.resistance.warnings().is_empty(), "hull {:?}", boat.resistance.hull);
        prop_assert!(!boat.screw.warnings().is_empty());
        let speed = boat.speed_at(froude);
        if froude > 1.0 {
            prop_assert!(!boat.resistance.warnings_at(speed).is_empty());
        }
        match solve_point(&boat.system(), speed) {
            Ok(point) => {
                for (name, value) in fields(&point) {
                    prop_assert!(value.is_finite(), "{name} = {value}");
                }
            }
            Err(failure) => prop_assert!(!failure.to_string().is_empty()),
        }
        let curve = PropellerCurve::over_speeds(&boat.system(), 0.0, speed, 8);
        for point in curve.solved() {
            for (name, value) in fields(point) {
                prop_assert!(value.is_finite(), "{name} = {value}");
            }
        }
    }

    // Speeds and inputs that are not numbers or not physical are errors, never panics.
    #[test]
    fn bad_inputs_are_errors(
        boat in in_range_boat(),
        speed in prop_oneof![Just(f64::NAN), Just(f64::INFINITY), -100.0f64..-1e-9],
        gear_ratio in prop_oneof![Just(0.0), Just(f64::NAN), -5.0f64..-0.01],
        efficiency in prop_oneof![Just(0.0), Just(f64::NAN), 1.0001f64..2.0, -1.0f64..-0.01],
    ) {
        let system = boat.system();
        prop_assert!(solve_point(&system, speed).is_err());
        let cruising = boat.speed_at(0.3);
        let bad_gear = System {
            installation: Installation { gear_ratio, ..boat.installation },
            ..boat.system()
        };
        prop_assert!(solve_point(&bad_gear, cruising).is_err());
        let bad_shaft = System {
            installation: Installation { shaft_efficiency: efficiency, ..boat.installation },
            ..boat.system()
        };
        let error = solve_point(&bad_shaft, cruising).unwrap_err();
        prop_assert!(error.to_string().contains("shaft efficiency"), "{error}");
        let bad_trip = Trip { tank_volume: -1.0, ..boat.trip };
        prop_assert!(cruise_at_speed(&system, &bad_trip, cruising).is_err());
    }
}

#[test]
fn non_physical_hulls_are_errors_not_panics() {
    let good = hull_input(Proportions {
        length: 11.0,
        length_beam: 4.0,
        beam_draft: 3.0,
        block: 0.55,
        trim: 0.0,
    });
    let broken = [
        HullInput {
            length_waterline: -11.0,
            ..good
        },
        HullInput {
            beam_waterline: 0.0,
            ..good
        },
        HullInput {
            draft_aft: f64::NAN,
            ..good
        },
        HullInput {
            displacement_volume: f64::INFINITY,
            ..good
        },
        // A volume larger than the box around the hull (Cb > 1).
        HullInput {
            displacement_volume: 2.0 * 11.0 * 2.75 * 0.92,
            ..good
        },
    ];
    for input in broken {
        assert!(input.resolve().is_err(), "{input:?}");
    }
    assert!(good.resolve().is_ok());
}
