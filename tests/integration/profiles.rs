//! Integration tests: profile files, the store, and the demo fleet.

use std::path::{Path, PathBuf};
use tidewright::profile::store::{self, PendingSave};
use tidewright::profile::{
    BoatDoc, EngineDoc, LoadCondition, Origin, ProfileError, Quantity, Store,
};
use tidewright::units::UnitSystem;

fn fixtures() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures")
}

/// A store in a fresh temporary directory, filled with the demo fleet.
fn demo_store() -> (tempfile::TempDir, Store) {
    let dir = tempfile::tempdir().unwrap();
    let store = Store::at(dir.path().join("profiles"));
    let report = store.init().unwrap();
    assert!(report.kept.is_empty());
    (dir, store)
}

#[test]
fn every_demo_profile_loads_validates_saves_and_reloads_equal() {
    let demo = Store::at("/nonexistent/tidewright-test-store");
    assert!(demo.uses_demo());
    let dir = tempfile::tempdir().unwrap();
    let target = Store::at(dir.path());
    let boats = demo.list_boats().unwrap();
    let engines = demo.list_engines().unwrap();
    assert!(
        boats.len() >= 2 && engines.len() >= 3,
        "{boats:?} {engines:?}"
    );
    for name in &boats {
        let loaded = demo.load_boat(name).unwrap();
        assert!(
            loaded.doc.validate().is_empty(),
            "{name}: {:?}",
            loaded.doc.validate()
        );
        assert_eq!(loaded.origin, Origin::Demo { name: name.clone() });
        let saved = target.save_boat(name, &loaded.doc, None, false).unwrap();
        let again = target.load_boat(name).unwrap();
        assert_eq!(
            again.doc, loaded.doc,
            "{name} changed in a save/load round trip"
        );
        // A second save of the reloaded document writes the same text.
        let text = std::fs::read_to_string(&saved.path).unwrap();
        assert_eq!(again.doc.to_toml(), text, "{name}: saving is not stable");
    }
    for name in &engines {
        let loaded = demo.load_engine(name).unwrap();
        assert!(loaded.doc.validate().is_empty(), "{name}");
        target.save_engine(name, &loaded.doc, None, false).unwrap();
        assert_eq!(target.load_engine(name).unwrap().doc, loaded.doc, "{name}");
    }
    // Every boat's engine sheet is in the fleet.
    for name in &boats {
        let (_, engine) = demo.resolve_boat(name).unwrap();
        assert!(engines.contains(&engine.name));
    }
}

#[test]
fn valid_fixtures_load_and_round_trip_through_text() {
    let dir = fixtures().join("valid/boats");
    for entry in std::fs::read_dir(&dir).unwrap() {
        let path = entry.unwrap().path();
        let (boat, engine) = Store::at("/nonexistent")
            .resolve_boat(path.to_str().unwrap())
            .unwrap();
        let want = if boat.doc.engine == "big" {
            "big"
        } else {
            "small"
        };
        assert_eq!(engine.name, want, "{}", path.display());
        let text = boat.doc.to_toml();
        let again = BoatDoc::from_toml(&text, "again.toml").unwrap();
        assert_eq!(again, boat.doc, "{}", path.display());
    }
}

#[test]
fn the_unit_system_is_remembered_and_edited_values_are_written_in_it() {
    let demo = Store::at("/nonexistent");
    let mut marram = demo.load_boat("marram").unwrap().doc;
    assert_eq!(marram.units, UnitSystem::Imperial);
    // An unedited value keeps the text it was written with.
    assert!(marram.to_toml().contains("beam_waterline = \"12 ft 2 in\""));
    marram.variants[1].pitch.value = 0.4572; // 18 in exactly
    marram.variants[1].pitch.value += 0.0254; // 19 in
    let text = marram.to_toml();
    let line = text
        .lines()
        .filter(|l| l.starts_with("pitch"))
        .nth(1)
        .unwrap()
        .to_owned();
    assert!(
        line.contains("in\""),
        "imperial file written in metric: {line}"
    );
    let again = BoatDoc::from_toml(&text, "x.toml").unwrap();
    assert!((again.variants[1].pitch.value - 19.0 * 0.0254).abs() < 1e-9);

    let pintle = demo.load_boat("pintle").unwrap().doc;
    assert_eq!(pintle.units, UnitSystem::Metric);
    // A file without a `units` key gets its system from the units it uses.
    let tabled = store::load_boat_file(&fixtures().join("valid/boats/tabled.toml")).unwrap();
    assert_eq!(tabled.doc.units, UnitSystem::Imperial);
}

/// The table of bad profiles: file, then texts the message must contain (file:line:col, key,
/// what was found, what was expected).
const BAD_BOATS: &[(&str, &[&str])] = &[
    (
        "syntax-error.toml",
        &[
            "syntax-error.toml:6:6:",
            "hull: unclosed table, expected `]`",
        ],
    ),
    (
        "unknown-key.toml",
        &[
            "unknown-key.toml:8:1:",
            "hull.beam_waterlin",
            "unknown field `beam_waterlin`",
            "expected",
        ],
    ),
    (
        "missing-unit.toml",
        &[
            "missing-unit.toml:7:",
            "hull.length_waterline: \"8\"",
            "no unit; expected a length",
        ],
    ),
    (
        "wrong-unit-kind.toml",
        &[
            "wrong-unit-kind.toml:7:23:",
            "hull.length_waterline: \"8 kg\"",
            "unknown unit \"kg\"",
            "expected a length in",
        ],
    ),
    (
        "unknown-unit.toml",
        &[
            "unknown-unit.toml:7:23:",
            "hull.length_waterline: \"8 q\"",
            "unknown unit \"q\"",
        ],
    ),
    (
        "zero-length.toml",
        &[
            "zero-length.toml:7:20:",
            "hull.length_waterline: \"0 m\"",
            "expected a positive length",
        ],
    ),
    (
        "negative-draft.toml",
        &[
            "negative-draft.toml:9:9:",
            "hull.draft: \"-0.6 m\"",
            "expected a positive draft",
        ],
    ),
    (
        "area-ratio.toml",
        &[
            "area-ratio.toml:37:14:",
            "variant[1].area_ratio: 1.7",
            "expected an expanded area ratio AE/A0 above 0 and at most 1.5",
        ],
    ),
    (
        "empty-variants.toml",
        &[
            "empty-variants.toml:32:1:",
            "variant: missing",
            "expected at least one screw variant",
        ],
    ),
    (
        "unsafe-engine-name.toml",
        &[
            "unsafe-engine-name.toml:4:10:",
            "engine: \"../../etc/passwd\": expected a safe profile name",
            "path separator",
        ],
    ),
    (
        "schema-version.toml",
        &[
            "schema-version.toml:2:10:",
            "schema: 2: expected schema = 1",
        ],
    ),
    (
        "wrong-type.toml",
        &[
            "wrong-type.toml:34:10:",
            "variant[1].blades",
            "invalid type: string \"three\", expected a whole number",
        ],
    ),
    // issue 10: what no small-craft screw can be is refused at its position.
    (
        "pitch-ratio.toml",
        &[
            "pitch-ratio.toml:36:9:",
            "variant[1].pitch: \"54 in\" (P/D 3.00)",
            "expected a pitch from 0.3 to 2.0 times the diameter",
        ],
    ),
    (
        "pitch-huge.toml",
        &[
            "pitch-huge.toml:36:9:",
            "variant[1].pitch: \"1e9 in\"",
            "expected a screw pitch from 2 in (50 mm) to 200 in (5 m)",
        ],
    ),
    (
        "pitch-nan.toml",
        &["pitch-nan.toml:36:10:", "variant[1].pitch: \"NaN in\""],
    ),
    (
        "diameter-zero.toml",
        &[
            "diameter-zero.toml:35:12:",
            "variant[1].diameter: \"0 in\"",
            "expected a positive diameter",
        ],
    ),
    (
        "default-condition-missing.toml",
        &[
            "default-condition-missing.toml:12:11:",
            "load.full",
            "missing; expected [load.full]",
        ],
    ),
];

#[test]
fn bad_boats_give_file_line_key_and_what_was_expected() {
    for (file, wanted) in BAD_BOATS {
        let path = fixtures().join("invalid/boats").join(file);
        let err = store::load_boat_file(&path).expect_err(file).to_string();
        for want in *wanted {
            assert!(
                err.contains(want),
                "{file}: message\n  {err}\nlacks\n  {want}"
            );
        }
        assert!(!err.contains('\n'), "{file}: message spans lines: {err}");
    }
}

#[test]
fn bad_engine_sheets_are_named_too() {
    let dir = fixtures().join("invalid/engines");
    let err = store::load_engine_file(&dir.join("unsorted-power.toml"))
        .unwrap_err()
        .to_string();
    for want in [
        "unsorted-power.toml:6:",
        "full_load_power[3].rpm",
        "\"2000 rpm\"",
        "expected rows sorted by rpm",
    ] {
        assert!(err.contains(want), "{err}\nlacks {want}");
    }
    let err = store::load_engine_file(&dir.join("fuel-form-incomplete.toml"))
        .unwrap_err()
        .to_string();
    for want in [
        "fuel-form-incomplete.toml:9:",
        "fuel.rpm",
        "missing; expected `rpm` for form = \"sfc-map\"",
    ] {
        assert!(err.contains(want), "{err}\nlacks {want}");
    }
}

#[test]
fn a_missing_engine_sheet_says_where_it_was_looked_for() {
    let path = fixtures().join("invalid/boats/engine-missing.toml");
    let dir = tempfile::tempdir().unwrap();
    let store = Store::at(dir.path());
    let err = store.resolve_boat(path.to_str().unwrap()).unwrap_err();
    assert!(matches!(err, ProfileError::EngineMissing { .. }), "{err}");
    let text = err.to_string();
    for want in [
        "engine-missing.toml",
        "\"nonesuch\" not found",
        "nonesuch.toml",
        "invalid/engines",
        "profile store",
    ] {
        assert!(text.contains(want), "{text}\nlacks {want}");
    }
}

#[test]
fn unsafe_names_are_refused_by_the_store() {
    let (_dir, store) = demo_store();
    let marram = store.load_boat("marram").unwrap().doc;
    for name in [
        "../escape",
        "boats/x",
        ".hidden",
        "a..b",
        "tab\t",
        "nul",
        "semi;colon",
        "",
    ] {
        let err = store.load_boat(name).unwrap_err();
        assert!(
            matches!(err, ProfileError::UnsafeName { .. }),
            "{name:?}: {err}"
        );
        let err = store.save_boat(name, &marram, None, true).unwrap_err();
        assert!(
            matches!(err, ProfileError::UnsafeName { .. }),
            "{name:?}: {err}"
        );
    }
    assert!(
        !store
            .root()
            .unwrap()
            .parent()
            .unwrap()
            .join("escape.toml")
            .exists()
    );
}

#[test]
fn garbage_input_never_panics() {
    let texts = [
        "",
        "\u{0}\u{1}",
        "schema = 1",
        "schema = \"one\"",
        "[[variant]]\n[[variant]]",
        "schema = 1\nname = \"x\"\nengine = \"y\"\n[hull]\nlength_waterline = \"1e400 m\"",
        "schema = 99999999999999999999",
        "x = [[[[[[[[[[[[1]]]]]]]]]]]]",
    ];
    for text in texts {
        assert!(BoatDoc::from_toml(text, "g.toml").is_err(), "{text:?}");
        assert!(EngineDoc::from_toml(text, "g.toml").is_err(), "{text:?}");
    }
    // Every prefix of a valid file is either valid or a clean error.
    let full = std::fs::read_to_string(fixtures().join("valid/boats/minimal.toml")).unwrap();
    for end in (0..full.len()).filter(|&i| full.is_char_boundary(i)) {
        let _ = BoatDoc::from_toml(&full[..end], "prefix.toml");
    }
}

#[test]
fn an_invalid_document_is_not_saved_and_the_file_is_unchanged() {
    let (_dir, store) = demo_store();
    let loaded = store.load_boat("pintle").unwrap();
    let path = store.boat_path("pintle").unwrap();
    let before = std::fs::read(&path).unwrap();
    let mut doc = loaded.doc.clone();
    doc.variants[0].area_ratio = 2.0;
    let err = store
        .save_boat("pintle", &doc, loaded.origin.stamp(), false)
        .unwrap_err();
    assert!(err.to_string().contains("variant[1].area_ratio"), "{err}");
    doc.variants.clear();
    assert!(
        store
            .save_boat("pintle", &doc, loaded.origin.stamp(), true)
            .is_err()
    );
    assert_eq!(std::fs::read(&path).unwrap(), before);
    assert!(!path.with_extension("toml.bak").exists());
}

#[test]
fn an_interrupted_save_leaves_the_old_file_intact() {
    let (_dir, store) = demo_store();
    let loaded = store.load_boat("marram").unwrap();
    let path = store.boat_path("marram").unwrap();
    let before = std::fs::read(&path).unwrap();
    let mut doc = loaded.doc.clone();
    // 20 in: a pitch the file writes exactly, so the reloaded document equals it bit for bit.
    doc.variants[0].pitch = Quantity::new(20.0 * 0.0254);
    // The new content reaches a temporary file, but the rename never happens.
    let pending: PendingSave = store
        .prepare_boat("marram", &doc, loaded.origin.stamp(), false)
        .unwrap();
    drop(pending);
    assert_eq!(std::fs::read(&path).unwrap(), before);
    // A crash would leave the temporary behind: it is neither listed nor read.
    let boats_dir = path.parent().unwrap();
    let mut stray = tempfile::Builder::new()
        .prefix(".tidewright-")
        .suffix(".tmp")
        .tempfile_in(boats_dir)
        .unwrap();
    std::io::Write::write_all(&mut stray, doc.to_toml().as_bytes()).unwrap();
    let _kept = stray.keep().unwrap();
    assert_eq!(
        store.list_boats().unwrap(),
        ["marram", "pintle", "samphire", "sorrel"]
    );
    assert_eq!(store.load_boat("marram").unwrap().doc, loaded.doc);
    // The completed save replaces the file and keeps the old one as a backup.
    let saved = store
        .save_boat("marram", &doc, loaded.origin.stamp(), false)
        .unwrap();
    assert_eq!(
        std::fs::read(saved.backup.as_ref().unwrap()).unwrap(),
        before
    );
    assert_eq!(store.load_boat("marram").unwrap().doc, doc);
}

#[test]
fn a_file_changed_on_disk_is_not_overwritten_unless_forced() {
    let (_dir, store) = demo_store();
    let loaded = store.load_boat("sorrel").unwrap();
    let path = store.boat_path("sorrel").unwrap();
    let edited = std::fs::read_to_string(&path)
        .unwrap()
        .replace("name = \"Sorrel\"", "name = \"Sorrel II\"");
    std::fs::write(&path, &edited).unwrap();
    let err = store
        .save_boat("sorrel", &loaded.doc, loaded.origin.stamp(), false)
        .unwrap_err();
    assert!(matches!(err, ProfileError::ChangedOnDisk { .. }), "{err}");
    assert!(err.to_string().contains("changed on disk"));
    assert_eq!(std::fs::read_to_string(&path).unwrap(), edited);
    // A boat from the demo saved over an existing file counts as a change too.
    assert!(matches!(
        store.save_boat("sorrel", &loaded.doc, None, false),
        Err(ProfileError::ChangedOnDisk { .. })
    ));
    let saved = store
        .save_boat("sorrel", &loaded.doc, loaded.origin.stamp(), true)
        .unwrap();
    assert_eq!(
        std::fs::read_to_string(saved.backup.unwrap()).unwrap(),
        edited
    );
    // The stamp of the save allows the next save.
    store
        .save_boat("sorrel", &loaded.doc, Some(&saved.stamp), false)
        .unwrap();
}

#[test]
fn init_never_overwrites_and_boats_resolve_by_name_or_path() {
    let dir = tempfile::tempdir().unwrap();
    let store = Store::at(dir.path());
    std::fs::create_dir_all(dir.path().join("boats")).unwrap();
    let mine = "# my own\n";
    std::fs::write(dir.path().join("boats/marram.toml"), mine).unwrap();
    let report = store.init().unwrap();
    assert_eq!(report.kept, [dir.path().join("boats/marram.toml")]);
    assert_eq!(report.created.len(), 7);
    assert_eq!(
        std::fs::read_to_string(dir.path().join("boats/marram.toml")).unwrap(),
        mine
    );
    assert_eq!(
        store.list_engines().unwrap(),
        [
            "brindmoor-3b40",
            "brindmoor-4b62",
            "harrowby-h48",
            "quellan-qd90"
        ]
    );

    // A boat file outside the store finds its engine beside its folder, then in the store.
    let outside = tempfile::tempdir().unwrap();
    std::fs::create_dir_all(outside.path().join("boats")).unwrap();
    let boat_path = outside.path().join("boats/pintle-copy.toml");
    std::fs::copy(dir.path().join("boats/pintle.toml"), &boat_path).unwrap();
    let (boat, engine) = store.resolve_boat(boat_path.to_str().unwrap()).unwrap();
    assert_eq!(boat.name, "pintle-copy");
    assert!(matches!(&engine.origin, Origin::File { path, .. } if path.starts_with(dir.path())));
    std::fs::create_dir_all(outside.path().join("engines")).unwrap();
    let local = outside.path().join("engines/brindmoor-3b40.toml");
    std::fs::copy(dir.path().join("engines/brindmoor-3b40.toml"), &local).unwrap();
    let (_, engine) = store.resolve_boat(boat_path.to_str().unwrap()).unwrap();
    assert!(matches!(&engine.origin, Origin::File { path, .. } if *path == local));
    let err = store.resolve_boat("nosuchboat").unwrap_err();
    assert!(
        err.to_string().contains("no boat named \"nosuchboat\""),
        "{err}"
    );
}

#[test]
fn demo_boats_build_vessels_in_every_condition_they_give() {
    let demo = Store::at("/nonexistent");
    for name in demo.list_boats().unwrap() {
        let (boat, engine) = demo.resolve_boat(&name).unwrap();
        for condition in LoadCondition::ALL {
            if boat.doc.load.case(condition).is_none() {
                assert!(boat.doc.to_vessel(&engine.doc, condition).is_err());
                continue;
            }
            let vessel = boat.doc.to_vessel(&engine.doc, condition).unwrap();
            assert_eq!(vessel.variants.len(), boat.doc.variants.len());
            assert!(vessel.resistance.hull.input.displacement_volume > 0.0);
        }
    }
    // Heavier load condition, larger displacement volume.
    let (boat, engine) = demo.resolve_boat("marram").unwrap();
    let light = boat
        .doc
        .to_vessel(&engine.doc, LoadCondition::Light)
        .unwrap();
    let full = boat
        .doc
        .to_vessel(&engine.doc, LoadCondition::Full)
        .unwrap();
    assert!(
        full.resistance.hull.input.displacement_volume
            > light.resistance.hull.input.displacement_volume
    );
}

/// The demo fleet's screw variants come out as their labels intend (invented scenario: the
/// intended verdicts are the scenario's design, not reference values).
#[test]
fn demo_screw_variants_get_their_intended_verdicts() {
    use tidewright::propulsion::solver::Verdict;
    use tidewright::propulsion::solver::matching::match_engine;
    let intended: &[(&str, &str, Verdict)] = &[
        ("marram", "old 26x19", Verdict::Over),
        ("marram", "re-pitched 26x17.5", Verdict::Matched),
        ("marram", "flat 26x15", Verdict::Under),
        ("pintle", "current 450x290", Verdict::Matched),
        ("sorrel", "current 19x15", Verdict::Matched),
    ];
    let demo = Store::at("/nonexistent");
    for (boat, label, verdict) in intended {
        let (b, e) = demo.resolve_boat(boat).unwrap();
        let vessel = b.doc.to_default_vessel(&e.doc).unwrap();
        let index = vessel
            .variants
            .iter()
            .position(|v| v.label == *label)
            .unwrap();
        let result = match_engine(&vessel.system(index), &vessel.match_criteria).unwrap();
        assert_eq!(
            result.verdict, *verdict,
            "{boat} {label}: absorbed {:.3}",
            result.absorbed_fraction_at_rated
        );
    }
}

/// A screw inside the loader's physical range but outside the B-series range (P/D 1.5 against
/// 0.5–1.4, Oosterveld & van Oossanen 1975) loads, is warned about and its results are marked.
#[test]
fn a_screw_outside_the_bseries_range_loads_with_a_warning_and_marked_results() {
    use tidewright::report::model::BoatReport;
    let path = fixtures().join("valid/boats/pitch-ratio-1.5.toml");
    let boat = store::load_boat_file(&path).expect("P/D 1.5 is physical");
    let engine = store::load_engine_file(&fixtures().join("valid/engines/small.toml")).unwrap();
    let vessel = boat.doc.to_default_vessel(&engine.doc).unwrap();
    let report = BoatReport::build(&vessel, None, None, &[]).unwrap();
    assert!(
        report.warnings.iter().any(|w| w.contains("P/D = 1.500")),
        "{:?}",
        report.warnings
    );
    let text = report.to_text(tidewright::units::UnitSystem::Imperial);
    assert!(text.contains("[extrapolated"), "{text}");
}
