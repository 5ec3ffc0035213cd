//! Issue 10: the rpm per inch a propeller shop can act on, a recommended pitch with headroom,
//! and one verdict and margin in every front end.

use tidewright::profile::Store;
use tidewright::propulsion::screw::{BSeriesScrew, ScrewGeometry, ScrewModel};
use tidewright::propulsion::solver::matching::{DEFAULT_LIGHT_RUNNING, match_engine};
use tidewright::propulsion::solver::pitch::{INCH, PitchOptions, recommend_pitch};
use tidewright::propulsion::solver::{Variant, Verdict, Vessel};
use tidewright::report::model::BoatReport;
use tidewright::report::text::{signed_rpm, verdict_words};
use tidewright::tui::ui;

fn demo_vessel(name: &str) -> Vessel {
    let store = Store::at("/nonexistent");
    let (boat, engine) = store.resolve_boat(name).unwrap();
    boat.doc.to_default_vessel(&engine.doc).unwrap()
}

/// The boats checked: the three demo boats and two more — Marram with a 2.5:1 gear instead of
/// its own and Sorrel at 30 % more displacement (invented variations, not references).
fn boats() -> Vec<(String, Vessel)> {
    let mut out: Vec<(String, Vessel)> = ["marram", "pintle", "sorrel"]
        .iter()
        .map(|n| (n.to_string(), demo_vessel(n)))
        .collect();
    let mut geared = demo_vessel("marram");
    geared.installation.gear_ratio = 2.5;
    out.push(("marram at 2.5:1".into(), geared));
    let mut heavy = demo_vessel("sorrel");
    let mut hull = heavy.resistance.hull.clone();
    hull.input.displacement_volume *= 1.3;
    heavy.resistance = heavy.resistance.with_hull(hull);
    out.push(("sorrel +30 %".into(), heavy));
    out
}

/// The boat with variant `index` re-pitched to `pitch` (m) added as a new variant.
fn with_pitch(vessel: &Vessel, index: usize, pitch: f64) -> (Vessel, usize) {
    let mut v = vessel.clone();
    let geometry = ScrewGeometry {
        pitch,
        ..*v.variants[index].screw.geometry()
    };
    v.variants.push(Variant {
        label: format!("pitch {pitch:.4}"),
        screw: ScrewModel::BSeries(BSeriesScrew::new(geometry).unwrap()),
    });
    let added = v.variants.len() - 1;
    (v, added)
}

#[test]
fn rpm_per_inch_is_the_slope_of_variants_past_the_recommended_pitch() {
    for (name, vessel) in boats() {
        let index = vessel.active_variant;
        let rec = recommend_pitch(&vessel, index, &PitchOptions::default()).unwrap();
        let pitch = rec.recommended_pitch.expect(&name);
        let full_throttle = |p: f64| {
            let (v, i) = with_pitch(&vessel, index, p);
            match_engine(&v.system(i), &v.match_criteria)
                .unwrap()
                .meeting_rpm
        };
        // Measured as a propeller shop would: two screws pitched ½ in and 1½ in past it.
        let measured = full_throttle(pitch + 1.5 * INCH) - full_throttle(pitch + 0.5 * INCH);
        let reported = rec.rpm_per_inch.expect(&name);
        assert!(
            (reported - measured).abs() <= 0.05 * measured.abs(),
            "{name}: reported {reported:.1} rpm/in, measured {measured:.1}"
        );
        // Per 10 mm is the same slope; the cure's solve lands within 1 % of rated rpm.
        let per_10mm = rec.rpm_per_10mm.unwrap();
        assert!((per_10mm - reported * 0.010 / INCH).abs() < 1e-9);
        let cure = rec.cure.expect(&name);
        let check = cure.check.expect(&name);
        assert!(
            (check.rpm_margin - cure.target_margin).abs() <= 0.01 * rec.rated_rpm,
            "{name}: cure lands at {:.0} rpm vs target {:.0}",
            check.rpm_margin,
            cure.target_margin
        );
    }
}

#[test]
fn the_recommended_pitch_as_a_variant_is_matched_with_the_light_running_margin() {
    for (name, vessel) in boats() {
        let index = vessel.active_variant;
        let rec = recommend_pitch(&vessel, index, &PitchOptions::default()).unwrap();
        let (v, added) = with_pitch(&vessel, index, rec.recommended_pitch.unwrap());
        let m = match_engine(&v.system(added), &v.match_criteria).unwrap();
        assert_eq!(m.verdict, Verdict::Matched, "{name}: {m:?}");
        let rated = v.engine.rated_rpm;
        // common practice: a clean boat runs free about 2 % past rated; 1 rpm search tolerance.
        assert!(
            m.rpm_margin >= DEFAULT_LIGHT_RUNNING * rated - 1.0,
            "{name}: margin {}",
            m.rpm_margin
        );
        // --light-running 0 asks for exactly rated rpm, and is still matched (no knife-edge).
        let mut exact = vessel.clone();
        exact.match_criteria.light_running = 0.0;
        let rec0 = recommend_pitch(&exact, index, &PitchOptions::default()).unwrap();
        let (v0, added0) = with_pitch(&exact, index, rec0.recommended_pitch.unwrap());
        let m0 = match_engine(&v0.system(added0), &v0.match_criteria).unwrap();
        assert_eq!(m0.verdict, Verdict::Matched, "{name} at 0: {m0:?}");
        assert!(m0.rpm_margin.abs() < 1.0, "{name}: {}", m0.rpm_margin);
    }
}

#[test]
fn every_front_end_shows_the_same_verdict_and_margin_for_every_demo_variant() {
    let store = Store::at("/nonexistent");
    for name in ["marram", "pintle", "sorrel"] {
        let vessel = demo_vessel(name);
        let report = BoatReport::build(&vessel, None, None, &[]).unwrap();
        let text = report.to_text(tidewright::units::UnitSystem::Metric);
        let markdown = report.to_markdown(tidewright::units::UnitSystem::Metric);
        let json: serde_json::Value = serde_json::to_value(report.to_json()).unwrap();
        let mut app = tidewright::tui::open_app(&store, Some(name)).unwrap();
        for (i, variant) in vessel.variants.iter().enumerate() {
            let m = match_engine(&vessel.system(i), &vessel.match_criteria).unwrap();
            let words = format!(
                "{}, margin {}",
                verdict_words(m.verdict),
                signed_rpm(m.rpm_margin)
            );
            assert!(
                text.contains(&words),
                "{name} {}: report text lacks {words}",
                variant.label
            );
            assert!(markdown.contains(&words), "{name}: export lacks {words}");
            let jm = &json["variants"][i]["match"];
            assert_eq!(jm["verdict"], serde_json::json!(m.verdict), "{name}");
            assert!((jm["rpm_margin"].as_f64().unwrap() - m.rpm_margin).abs() < 1e-6);
            let rec = recommend_pitch(&vessel, i, &PitchOptions::default()).unwrap();
            let current = rec.current.unwrap();
            assert_eq!(current.verdict, m.verdict);
            assert!((current.rpm_margin - m.rpm_margin).abs() < 1e-6);
            if let Ok(solved) = app.solution.result.as_mut() {
                solved.vessel.active_variant = i;
            }
            let readout: String = ui::readout::readout_lines(&app)
                .iter()
                .map(|l| l.to_string())
                .collect::<Vec<_>>()
                .join("\n");
            let tui_words = format!("margin {}", signed_rpm(m.rpm_margin));
            assert!(readout.contains(&tui_words), "{name}: TUI {readout}");
            assert!(
                readout.to_lowercase().contains(verdict_words(m.verdict)),
                "{name}: TUI {readout}"
            );
        }
    }
}

/// The Screw pane's recommendation line shows the same rpm per inch as `pitch` (one number
/// from the core's recommendation, never a second computation).
#[test]
fn the_screw_pane_shows_the_pitch_commands_rpm_per_inch() {
    let store = Store::at("/nonexistent");
    for name in ["marram", "pintle", "sorrel"] {
        let app = tidewright::tui::open_app(&store, Some(name)).unwrap();
        let vessel = demo_vessel(name);
        let rec =
            recommend_pitch(&vessel, vessel.active_variant, &PitchOptions::default()).unwrap();
        let slope = rec.rpm_per_inch.expect("a slope");
        let line = app
            .solution
            .recommendation_line(tidewright::units::UnitSystem::Metric)
            .unwrap();
        let words = format!("{}/in", signed_rpm(slope));
        assert!(line.contains(&words), "{name}: {line} lacks {words}");
    }
}
