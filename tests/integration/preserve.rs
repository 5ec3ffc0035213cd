//! Integration tests: a save keeps the user's file. Every save of a boat or an engine sheet
//! (the store's saves, a boat saved by path, `trial --save`) keeps comments, key order and blank
//! lines; only the lines of changed values change, and the file reads back to the document
//! saved.

use crate::hardening::{fill, fills};
use assert_cmd::Command;
use proptest::prelude::*;
use tidewright::profile::store::save_boat_file;
use tidewright::profile::template::{boat_template, engine_template};
use tidewright::profile::{BoatDoc, EngineDoc, Quantity, Store, VariantDoc};
use tidewright::units::{Kind, UnitSystem};

/// The lines of `old` missing from `new` and the lines of `new` missing from `old`, by the
/// longest common subsequence of lines (what `diff` shows as `-` and `+`).
fn line_diff(old: &str, new: &str) -> (Vec<String>, Vec<String>) {
    let a: Vec<&str> = old.lines().collect();
    let b: Vec<&str> = new.lines().collect();
    let mut common = vec![vec![0usize; b.len() + 1]; a.len() + 1];
    for i in (0..a.len()).rev() {
        for j in (0..b.len()).rev() {
            common[i][j] = if a[i] == b[j] {
                common[i + 1][j + 1] + 1
            } else {
                common[i + 1][j].max(common[i][j + 1])
            };
        }
    }
    let (mut removed, mut added) = (Vec::new(), Vec::new());
    let (mut i, mut j) = (0, 0);
    while i < a.len() || j < b.len() {
        if i < a.len() && j < b.len() && a[i] == b[j] {
            i += 1;
            j += 1;
        } else if j < b.len() && (i == a.len() || common[i][j + 1] >= common[i + 1][j]) {
            added.push(b[j].to_owned());
            j += 1;
        } else {
            removed.push(a[i].to_owned());
            i += 1;
        }
    }
    (removed, added)
}

/// Each comment in `text`: whole comment lines and what follows `#` after a value.
fn comments(text: &str) -> Vec<String> {
    text.lines()
        .filter_map(|line| line.find('#').map(|at| line[at..].trim().to_owned()))
        .collect()
}

/// A store holding the filled boat and engine templates of `system` (boat "kittiwake", engine
/// "harbour-diesel"), and their texts.
fn template_store(system: UnitSystem) -> (tempfile::TempDir, Store, String, String) {
    let (boat_values, engine_values) = fills(system);
    let boat = fill(&boat_template("Kittiwake", system), &boat_values);
    let engine = fill(&engine_template("Harbour Diesel", system), &engine_values);
    let dir = tempfile::tempdir().unwrap();
    let store = Store::at(dir.path());
    store.create_boat("kittiwake", &boat).unwrap();
    store.create_engine("harbour-diesel", &engine).unwrap();
    (dir, store, boat, engine)
}

#[test]
fn the_boat_template_saved_after_an_edit_differs_only_on_the_edited_line() {
    for (system, old, new) in [
        (UnitSystem::Metric, "\"480 mm\"", "\"500 mm\""),
        (UnitSystem::Imperial, "\"19 in\"", "\"20 in\""),
    ] {
        let (_dir, store, original, _) = template_store(system);
        let loaded = store.load_boat("kittiwake").unwrap();
        let mut doc = loaded.doc.clone();
        doc.variants[0].pitch =
            Quantity::from_text(new.trim_matches('"'), Kind::ScrewLength).unwrap();
        store
            .save_boat("kittiwake", &doc, loaded.origin.stamp(), false)
            .unwrap();
        let saved = std::fs::read_to_string(store.boat_path("kittiwake").unwrap()).unwrap();
        let (removed, added) = line_diff(&original, &saved);
        assert_eq!(removed.len(), 1, "{system:?}: {removed:?} {added:?}");
        assert!(
            removed[0].starts_with(&format!("pitch = {old}")),
            "{removed:?}"
        );
        // The same line, comment and spacing kept, with the new value.
        assert_eq!(added, vec![removed[0].replacen(old, new, 1)], "{system:?}");
        assert_eq!(
            store.load_boat("kittiwake").unwrap().doc,
            doc,
            "{system:?}: reads back to the document saved"
        );
    }
}

#[test]
fn an_optional_key_given_adds_one_line_in_its_table_and_changes_nothing_else() {
    let (_dir, store, original, _) = template_store(UnitSystem::Metric);
    let loaded = store.load_boat("kittiwake").unwrap();
    let mut doc = loaded.doc.clone();
    doc.installation.shaft_diameter =
        Some(Quantity::from_text("35 mm", Kind::ScrewLength).unwrap());
    // An edit by value, as the terminal UI's nudge makes: written in the file's units.
    doc.trip.tank = Quantity::new(0.9);
    store
        .save_boat("kittiwake", &doc, loaded.origin.stamp(), false)
        .unwrap();
    let saved = std::fs::read_to_string(store.boat_path("kittiwake").unwrap()).unwrap();
    let (removed, added) = line_diff(&original, &saved);
    assert_eq!(removed.len(), 1, "{removed:?}");
    assert!(removed[0].starts_with("tank = \"800 L\""), "{removed:?}");
    assert_eq!(added.len(), 2, "{added:?}");
    assert!(
        added.contains(&"shaft_diameter = \"35 mm\"".to_owned()),
        "{added:?}"
    );
    let tank = added.iter().find(|l| l.starts_with("tank = ")).unwrap();
    assert!(
        tank.ends_with("# fuel tank volume, e.g. \"800 L\""),
        "{tank}"
    );
    // The new key sits in [installation], before [trip].
    let at = |needle: &str| saved.find(needle).unwrap();
    assert!(at("gear_efficiency = ") < at("shaft_diameter = \"35 mm\""));
    assert!(at("shaft_diameter = \"35 mm\"") < at("[trip]"));
    let back = store.load_boat("kittiwake").unwrap().doc;
    assert_eq!(
        back,
        BoatDoc::from_toml(&doc.to_toml(), "canonical").unwrap()
    );
}

#[test]
fn the_engine_template_saved_after_an_edit_differs_only_on_the_edited_line() {
    for system in [UnitSystem::Metric, UnitSystem::Imperial] {
        let (_dir, store, _, original) = template_store(system);
        let loaded = store.load_engine("harbour-diesel").unwrap();
        let mut doc: EngineDoc = loaded.doc.clone();
        doc.idle_rpm = Quantity::from_text("750 rpm", Kind::Rotation).unwrap();
        store
            .save_engine("harbour-diesel", &doc, loaded.origin.stamp(), false)
            .unwrap();
        let saved = std::fs::read_to_string(store.engine_path("harbour-diesel").unwrap()).unwrap();
        let (removed, added) = line_diff(&original, &saved);
        assert_eq!(removed.len(), 1, "{system:?}: {removed:?} {added:?}");
        assert!(
            removed[0].starts_with("idle_rpm = \"800 rpm\""),
            "{removed:?}"
        );
        assert_eq!(added, vec![removed[0].replacen("800 rpm", "750 rpm", 1)]);
        assert_eq!(store.load_engine("harbour-diesel").unwrap().doc, doc);
    }
}

#[test]
fn an_unedited_save_leaves_the_file_byte_for_byte() {
    let (_dir, store, original, _) = template_store(UnitSystem::Imperial);
    let loaded = store.load_boat("kittiwake").unwrap();
    store
        .save_boat("kittiwake", &loaded.doc, loaded.origin.stamp(), false)
        .unwrap();
    let saved = std::fs::read_to_string(store.boat_path("kittiwake").unwrap()).unwrap();
    assert_eq!(saved, original);
}

/// The demo boat pintle with a comment above each table and after a few values.
fn commented_pintle() -> String {
    let demo = tidewright::profile::demo::boat("pintle").unwrap();
    let mut out = String::new();
    for line in demo.lines() {
        if line.starts_with('[') {
            out.push_str(&format!("# about {line}: the owner's note\n"));
        }
        out.push_str(line);
        if line.starts_with("rpm = ") || line.starts_with("shaft_") || line.starts_with("tank") {
            out.push_str("   # measured by the owner");
        }
        out.push('\n');
    }
    out.push_str("\n# the end of the owner's file\n");
    out
}

#[test]
fn trial_save_keeps_every_comment_of_the_file() {
    let dir = tempfile::tempdir().unwrap();
    let root = dir.path().join("store");
    Store::at(&root).init().unwrap();
    let file = root.join("boats/pintle.toml");
    let original = commented_pintle();
    std::fs::write(&file, &original).unwrap();
    Command::cargo_bin("tidewright")
        .unwrap()
        .env_remove("TIDEWRIGHT_PROFILES")
        .args([
            "--profiles",
            &root.display().to_string(),
            "trial",
            "pintle",
            "--save",
        ])
        .assert()
        .success();
    let saved = std::fs::read_to_string(&file).unwrap();
    let (removed, added) = line_diff(&original, &saved);
    assert!(removed.is_empty(), "lines lost: {removed:?}");
    assert!(added.iter().any(|l| l == "[calibration]"), "{added:?}");
    assert!(
        added.iter().all(|l| !l.contains('#')),
        "only the calibration's lines are new: {added:?}"
    );
    assert_eq!(comments(&saved), comments(&original));
    let back = Store::at(&root).load_boat("pintle").unwrap().doc;
    assert!(back.calibration.is_some());
}

/// A boat with three commented screw variants.
fn three_variants() -> String {
    let demo = tidewright::profile::demo::boat("pintle").unwrap();
    let (head, _) = demo.split_once("[[variant]]").unwrap();
    let mut text = head.to_owned();
    for (label, pitch) in [("first", 280), ("second", 290), ("third", 300)] {
        text.push_str(&format!(
            "# the {label} screw\n[[variant]]\nlabel = \"{label}\"   # {label} label\nblades = 3\ndiameter = \"450 mm\"\npitch = \"{pitch} mm\" # {label} pitch\narea_ratio = 0.5\n\n"
        ));
    }
    text
}

#[test]
fn a_variant_removed_and_one_added_keep_the_others_comments() {
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("boats/three.toml");
    std::fs::create_dir_all(file.parent().unwrap()).unwrap();
    let original = three_variants();
    std::fs::write(&file, &original).unwrap();
    let loaded = tidewright::profile::store::load_boat_file(&file).unwrap();
    let mut doc = loaded.doc.clone();
    assert_eq!(doc.variants.len(), 3);
    doc.variants.remove(1);
    doc.variants.push(VariantDoc {
        label: "fourth".into(),
        pitch: Quantity::from_text("310 mm", Kind::ScrewLength).unwrap(),
        ..doc.variants[0].clone()
    });
    save_boat_file(&file, &doc, loaded.origin.stamp(), false).unwrap();
    let saved = std::fs::read_to_string(&file).unwrap();
    for kept in [
        "# the first screw",
        "# first label",
        "# first pitch",
        "# the third screw",
        "# third label",
        "# third pitch",
    ] {
        assert!(saved.contains(kept), "{kept} lost:\n{saved}");
    }
    for gone in ["# second label", "# second pitch", "\"290 mm\""] {
        assert!(!saved.contains(gone), "{gone} kept:\n{saved}");
    }
    // The second variant's lines are gone, the fourth is written after the third, and every
    // other line is as it was.
    let second = "# the second screw\n[[variant]]\nlabel = \"second\"   # second label\nblades = 3\ndiameter = \"450 mm\"\npitch = \"290 mm\" # second pitch\narea_ratio = 0.5\n\n";
    assert!(original.contains(second));
    let fourth = "\n\n[[variant]]\nlabel = \"fourth\"\nblades = 3\ndiameter = \"450 mm\"\npitch = \"310 mm\"\narea_ratio = 0.5";
    let expected = format!("{}{fourth}", original.replace(second, "").trim_end());
    assert_eq!(saved.trim_end(), expected);
    let back = tidewright::profile::store::load_boat_file(&file)
        .unwrap()
        .doc;
    let labels: Vec<&str> = back.variants.iter().map(|v| v.label.as_str()).collect();
    assert_eq!(labels, ["first", "third", "fourth"]);
    assert_eq!(back, doc);
}

proptest! {
    #![proptest_config(crate::robustness::cases(24))]

    /// Whatever is edited, the saved file reads back to the document the writer holds, and no
    /// comment on a line left alone is lost.
    #[test]
    fn a_saved_file_reads_back_to_the_document_saved(
        tank_litres in 50.0f64..900.0,
        pitch_mm in 250.0f64..340.0,
        drop_margin in any::<bool>(),
        calibrate in any::<bool>(),
        trials in 0usize..7,
    ) {
        let dir = tempfile::tempdir().unwrap();
        let file = dir.path().join("boats/pintle.toml");
        std::fs::create_dir_all(file.parent().unwrap()).unwrap();
        let original = commented_pintle();
        std::fs::write(&file, &original).unwrap();
        let loaded = tidewright::profile::store::load_boat_file(&file).unwrap();
        let mut doc = loaded.doc.clone();
        doc.trip.tank = Quantity::new(tank_litres * 1e-3);
        doc.variants[0].pitch = Quantity::new(pitch_mm * 1e-3);
        if drop_margin {
            doc.resistance.service_margin = 0.0;
            doc.resistance.fouling = 0.0;
        }
        if calibrate {
            doc.calibration = Some(tidewright::profile::CalibrationDoc {
                resistance_factor: 1.2,
                wake_fraction: None,
                froude_factor: None,
                trial_date: Some("2024-05-18".into()),
                note: None,
            });
        }
        if let Some(trial) = doc.trial.as_mut() {
            trial.runs.truncate(trials);
        }
        save_boat_file(&file, &doc, loaded.origin.stamp(), false).unwrap();
        let saved = std::fs::read_to_string(&file).unwrap();
        let back = tidewright::profile::store::load_boat_file(&file).unwrap().doc;
        prop_assert_eq!(&back, &BoatDoc::from_toml(&doc.to_toml(), "canonical").unwrap());
        let kept = comments(&saved);
        for comment in comments(&original) {
            // Comments of trial runs removed go with them (one per run's rpm line).
            if comment == "# measured by the owner" || comment.contains("trial.run") {
                continue;
            }
            prop_assert!(kept.contains(&comment), "{} lost:\n{}", comment, saved);
        }
    }
}
