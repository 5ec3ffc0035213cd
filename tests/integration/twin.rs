//! Issue 13: twin-screw installations in the core — thrust identity per screw, Holtrop's
//! twin-screw interaction, Keller's twin-screw constant and one engine out.

use tidewright::profile::Store;
use tidewright::propulsion::hull::interaction::{holtrop_twin_screw, viscous_coefficient};
use tidewright::propulsion::hull::{
    Interaction, InteractionMethod, ResistanceMethod, ResistanceTable,
};
use tidewright::propulsion::screw::cavitation::{
    KELLER_CONSTANT_SINGLE_SCREW, KELLER_CONSTANT_TWIN_SCREW,
};
use tidewright::propulsion::solver::checks::cavitation_at_point;
use tidewright::propulsion::solver::conditions::{Condition, TrailingScrew, compare_conditions};
use tidewright::propulsion::solver::cruise::cruise_at_speed;
use tidewright::propulsion::solver::{PointFailure, Vessel, solve_point};

fn demo_vessel(name: &str) -> Vessel {
    let store = Store::at("/nonexistent");
    let (boat, engine) = store.resolve_boat(name).unwrap();
    boat.doc.to_default_vessel(&engine.doc).unwrap()
}

/// The demo boat made a twin with Holtrop's twin-screw interaction (an invented variation).
fn twin(name: &str) -> Vessel {
    let mut v = demo_vessel(name);
    v.installation.shafts = 2;
    v.interaction = InteractionMethod::Holtrop1984TwinScrew;
    v
}

#[test]
fn twin_with_twice_the_resistance_runs_each_screw_like_the_single() {
    // The thrust identity of design §2.6 per screw (exact algebra, not a published figure):
    // each of two screws carries half of 2R/(1 − t), so it turns as the single screw at R.
    let mut single = demo_vessel("marram");
    single.resistance.air = None;
    single.resistance.margins.fouling = 0.0;
    let rows: Vec<(f64, f64)> = (0..=20)
        .map(|k| {
            let speed = 0.3 * f64::from(k);
            (
                speed,
                single.resistance.resistance(speed).map_or(0.0, |r| r.total),
            )
        })
        .collect();
    let users = InteractionMethod::User(Interaction {
        wake_fraction: 0.18,
        thrust_deduction: 0.14,
        relative_rotative_efficiency: 1.01,
    });
    single.interaction = users;
    single.resistance = single
        .resistance
        .with_method(ResistanceMethod::Table(ResistanceTable {
            rows: rows.clone(),
        }));
    let mut double = single.clone();
    double.installation.shafts = 2;
    double.resistance = double
        .resistance
        .with_method(ResistanceMethod::Table(ResistanceTable {
            rows: rows.iter().map(|&(v, r)| (v, 2.0 * r)).collect(),
        }));
    let close = |a: f64, b: f64| (a - b).abs() <= 1e-9 * a.abs();
    for speed in [1.5, 2.5, 3.3, 4.1] {
        let one = solve_point(&single.active_system(), speed).unwrap();
        let two = solve_point(&double.active_system(), speed).unwrap();
        assert!(close(one.engine_rpm, two.engine_rpm), "rpm at {speed}");
        assert!(
            close(one.brake_power, two.brake_power_per_engine),
            "per engine at {speed}"
        );
        assert!(
            close(2.0 * one.brake_power, two.brake_power),
            "boat power at {speed}"
        );
        assert!(
            close(2.0 * one.fuel_volume_flow, two.fuel_volume_flow),
            "fuel at {speed}"
        );
        assert!(
            close(one.load_fraction, two.load_fraction),
            "load at {speed}"
        );
        assert!(close(one.thrust, two.thrust), "thrust per screw at {speed}");
        // Range from the boat's total burn: half the single boat's on the same tank.
        let (a, b) = (
            cruise_at_speed(&single.active_system(), &single.trip, speed).unwrap(),
            cruise_at_speed(&double.active_system(), &double.trip, speed).unwrap(),
        );
        assert!(close(a.range, 2.0 * b.range), "range at {speed}");
    }
}

#[test]
fn holtrop_twin_screw_factors_match_the_formulas_by_hand() {
    // Holtrop (1984), "A statistical re-analysis of resistance and propulsion data",
    // International Shipbuilding Progress 31(363) — twin-screw formulas from memory:
    // w = 0.3095·Cb + 10·CV·Cb − 0.23·D/√(B·T), t = 0.325·Cb − 0.1885·D/√(B·T),
    // ηR = 0.9737 + 0.111·(Cp − 0.0225·lcb) − 0.06325·P/D.
    let v = twin("sorrel");
    let system = v.active_system();
    let screw = system.screw_at_stern();
    let hull = &v.resistance.hull;
    let speed = 3.5;
    let got = holtrop_twin_screw(hull, &v.resistance.water, &screw, speed);
    let (cb, cp, lcb) = (
        hull.block_coefficient,
        hull.prismatic_coefficient,
        hull.lcb_percent(),
    );
    let ratio = screw.diameter / (hull.input.beam_waterline * hull.draft_mean).sqrt();
    let cv = viscous_coefficient(hull, &v.resistance.water, speed);
    // CV is Holtrop's (1+k)·CF + CA, the same as in his single-screw wake.
    assert!(cv > 0.001 && cv < 0.01, "CV {cv}");
    assert!((got.wake_fraction - (0.3095 * cb + 10.0 * cv * cb - 0.23 * ratio)).abs() < 1e-12);
    assert!((got.thrust_deduction - (0.325 * cb - 0.1885 * ratio)).abs() < 1e-12);
    let eta = 0.9737 + 0.111 * (cp - 0.0225 * lcb) - 0.06325 * screw.pitch_ratio;
    assert!((got.relative_rotative_efficiency - eta).abs() < 1e-12);
}

#[test]
fn single_screw_estimates_are_refused_for_a_twin() {
    // Van Oortmerssen (1971) regressed single-screw small ships only; Holtrop's single-screw
    // formulas and Taylor's single-screw wake likewise do not describe twin open shafts.
    for method in [
        InteractionMethod::VanOortmerssen,
        InteractionMethod::Holtrop1984SingleScrew,
        InteractionMethod::Taylor,
    ] {
        let mut v = twin("marram");
        v.interaction = method;
        let error = solve_point(&v.active_system(), 3.0).unwrap_err();
        assert!(matches!(error, PointFailure::InteractionForShafts(_)));
        let message = error.to_string();
        assert!(message.contains(method.name()), "{message}");
        assert!(message.contains("Holtrop (1984) twin screw"), "{message}");
    }
    // And the twin-screw formulas on a single screw.
    let mut single = demo_vessel("marram");
    single.interaction = InteractionMethod::Holtrop1984TwinScrew;
    assert!(solve_point(&single.active_system(), 3.0).is_err());
    // The default for a twin picks Holtrop's twin-screw formulas, whatever the method.
    for method in [
        ResistanceMethod::HoltropMennen,
        ResistanceMethod::VanOortmerssen,
    ] {
        assert_eq!(
            InteractionMethod::paired_with_shafts(&method, 2),
            InteractionMethod::Holtrop1984TwinScrew
        );
    }
    assert_eq!(
        InteractionMethod::paired_with_shafts(&ResistanceMethod::VanOortmerssen, 1),
        InteractionMethod::VanOortmerssen
    );
}

#[test]
fn keller_uses_the_twin_screw_constant_on_a_twin() {
    // Keller: AE/A0 min = (1.3 + 0.3·Z)·T/((p0 − pv)·D²) + K, K = 0.2 single and 0.1 twin
    // (from memory, as in src/propulsion/screw/cavitation.rs): at the same thrust per screw
    // the twin's minimum is lower by exactly K_single − K_twin.
    let v = demo_vessel("marram");
    let point = solve_point(&v.active_system(), 3.0).unwrap();
    let geometry = *v.variants[v.active_variant].screw.geometry();
    let water = v.resistance.water;
    let single = cavitation_at_point(geometry, &point, &water, 0.8).unwrap();
    let as_twin = tidewright::propulsion::solver::OperatingPoint { shafts: 2, ..point };
    let twin = cavitation_at_point(geometry, &as_twin, &water, 0.8).unwrap();
    let drop = single.keller_area_ratio.limit - twin.keller_area_ratio.limit;
    assert!((drop - (KELLER_CONSTANT_SINGLE_SCREW - KELLER_CONSTANT_TWIN_SCREW)).abs() < 1e-12);
}

#[test]
fn one_engine_out_is_slower_and_loads_the_running_engine_harder() {
    // Common practice: on one engine a twin makes less speed and the running engine works
    // harder at any speed than with both (its screw carries all of R/(1 − t)).
    let v = twin("sorrel");
    let cases = [Condition::one_engine_out(
        "one engine out",
        TrailingScrew::Windmilling,
    )];
    let outcomes = compare_conditions(&v, v.active_variant, &cases).unwrap();
    let (both, one) = (&outcomes[0], &outcomes[1]);
    assert_eq!((both.engines_running, one.engines_running), (2, 1));
    assert!(one.top_speed.unwrap() < both.top_speed.unwrap());
    assert!(one.cruise_load_fraction.unwrap() > both.cruise_load_fraction.unwrap());
    assert!(both.warnings.is_empty());
    assert!(
        one.warnings
            .iter()
            .any(|w| w.message.contains("trailing screw's drag is not included"))
    );
    // A single-screw boat has no engine to spare.
    let single = demo_vessel("sorrel");
    let error = compare_conditions(&single, single.active_variant, &cases).unwrap_err();
    assert!(error.to_string().contains("shafts"), "{error}");
}

// ---- The twin demo boat everywhere: report, JSON, pitch, conditions (issue 13 §3–5) ----

use tidewright::propulsion::solver::checks::keller_constant;
use tidewright::report::Display;
use tidewright::report::design::pitch_text;
use tidewright::report::model::BoatReport;
use tidewright::report::what_if::WhatIfSettings;
use tidewright::study::Study;
use tidewright::units::UnitSystem;

fn samphire_study() -> Study {
    Study::load(&Store::at("/nonexistent"), "samphire", None).expect("the twin demo boat loads")
}

#[test]
fn twin_report_text_labels_boat_and_each_engine_and_the_duty_is_per_engine() {
    let study = samphire_study();
    let report = BoatReport::of_study(&study, None, None).unwrap();
    let text = report.to_text(UnitSystem::Metric);
    for needle in [
        "2 shafts, handed",
        "boat power",
        "each engine",
        "each screw absorbs",
        "Shaft (each shaft)",
        // Keller's K for two screws (the core's keller_constant, not the single-screw 0.2).
        &format!("K = {}, twin screw", keller_constant(2)),
    ] {
        assert!(text.contains(needle), "{needle:?} missing:\n{text}");
    }
    assert!(!text.contains("single screw"), "{text}");
    // The duty note quotes each engine's load, the same figure as the cruise point's load
    // (the boat's power against one engine's curve would double it).
    let v = &report.variants[0];
    let cruise = v.cruise.as_ref().unwrap();
    let load = format!("{:.0} % load", cruise.point.load_fraction * 100.0);
    assert!(v.duty.as_ref().unwrap().starts_with(&load), "{:?}", v.duty);
    let duty_line = text
        .lines()
        .find(|l| l.contains("Engine duty at the target speed (each engine)"))
        .expect("duty line");
    assert!(duty_line.contains(&load), "{duty_line}");
    // CSV and Markdown carry the boat and per-engine columns too.
    let csv = report.to_csv(UnitSystem::Metric);
    assert!(
        csv.contains("boat power (kW)") && csv.contains("each engine (kW)"),
        "{csv}"
    );
    assert!(
        report
            .to_markdown(UnitSystem::Metric)
            .contains("each engine")
    );
}

#[test]
fn twin_report_json_carries_shafts_and_per_engine_figures_at_half_the_boat() {
    let study = samphire_study();
    let report = BoatReport::of_study(&study, None, None).unwrap();
    let json = serde_json::to_value(report.to_json()).unwrap();
    assert_eq!(json["installation"]["shafts"], 2);
    let points = json["variants"][0]["points"].as_array().unwrap();
    assert!(!points.is_empty());
    for p in points
        .iter()
        .chain(std::iter::once(&json["variants"][0]["cruise"]))
    {
        let f = |k: &str| {
            p[k].as_f64()
                .unwrap_or_else(|| panic!("{k} missing in {p}"))
        };
        // Two identical engines running: each carries exactly half (exact algebra).
        assert!(
            (f("brake_kw_per_engine") - f("brake_kw") / 2.0).abs() < 1e-9,
            "{p}"
        );
        assert!(
            (f("fuel_lph_per_engine") - f("fuel_lph") / 2.0).abs() < 1e-9,
            "{p}"
        );
        assert_eq!(p["driven_shafts"], 2);
    }
    // A single-screw boat: the per-engine figures are the boat's, and shafts is 1.
    let single = Study::load(&Store::at("/nonexistent"), "marram", None).unwrap();
    let json =
        serde_json::to_value(BoatReport::of_study(&single, None, None).unwrap().to_json()).unwrap();
    assert_eq!(json["installation"]["shafts"], 1);
    let p = &json["variants"][0]["points"][0];
    assert_eq!(p["brake_kw_per_engine"], p["brake_kw"]);
}

#[test]
fn twin_pitch_is_one_answer_for_each_screw() {
    let study = samphire_study();
    let recs = study
        .recommendations(&[0], &Default::default())
        .expect("pitch for the twin");
    let d = Display::new(UnitSystem::Metric);
    let text = pitch_text(&recs[0], &d, &study);
    assert!(text.contains("each screw"), "{text}");
    assert!(text.contains("each engine"), "{text}");
    // The displacement is shown as a mass in the boat's units, not the core's m³.
    assert!(text.contains("displacement 17.00 t"), "{text}");
    assert!(!text.contains("m³"), "{text}");
}

#[test]
fn twin_conditions_add_one_engine_out_slower_with_its_warning_marked() {
    let study = samphire_study();
    let index = study.vessel.active_variant;
    let result = study.what_if(index, &WhatIfSettings::default()).unwrap();
    let out = result
        .outcomes
        .iter()
        .find(|o| o.engines_running == 1)
        .expect("a one-engine-out case on the twin");
    let both = &result.outcomes[0];
    assert_eq!(both.engines_running, 2);
    // Half the thrust available: the top speed drops (physics, not a published figure).
    assert!(out.top_speed.unwrap() < both.top_speed.unwrap());
    assert!(!out.warnings.is_empty());
    let d = Display::new(UnitSystem::Metric);
    let text = result.to_text(&d, &study.doc.load);
    assert!(text.contains("one engine out"), "{text}");
    assert!(
        text.contains("† one engine out: the trailing screw's drag is not included"),
        "{text}"
    );
    // The pitch line says the real target (rated rpm plus the light-running margin).
    assert!(text.contains("light-running margin"), "{text}");
    assert!(!text.contains("absorb 100 %"), "{text}");
    assert!(text.contains("power each engine"), "{text}");
    // A single-screw boat has no such case.
    let single = Study::load(&Store::at("/nonexistent"), "marram", None).unwrap();
    let cases = single.what_if_cases(&WhatIfSettings::default());
    assert!(cases.iter().all(|c| c.short != "1 engine"));
}
