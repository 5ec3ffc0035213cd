//! Integration tests: before and after a repower. The boat file holds the installation in the
//! boat today (`[as_found]`) beside the planned one; the sea trial run on the old installation
//! calibrates the hull through it, and every planned figure is held against the as-found one.
//! The fixture is the demo workboat Pintle with its own installation as found, so the as-found
//! side must give exactly what the demo Pintle gives (the tool's own path, another route).

use tidewright::profile::{BoatDoc, ProfileError, Quantity, Store};
use tidewright::study::Study;

/// The demo fleet only (no store at this path).
fn demo() -> Store {
    Store::at("/nonexistent-tidewright-store")
}

/// The repower fixture: Pintle as found (Brindmoor 3B40, 2.0:1, 450×290) planned for a
/// Brindmoor 4B62 on 2.5:1 with a 480×360 screw; the engine sheets come from the demo fleet.
const FIXTURE: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/tests/fixtures/repower/boats/pintle-repower.toml"
);

fn fixture() -> Study {
    Study::load(&demo(), FIXTURE, None).expect("the repower fixture loads")
}

/// The fixture's document with its planned side changed by `edit`, as a study.
fn replanned(edit: impl Fn(&mut BoatDoc)) -> Study {
    let base = fixture();
    let mut doc = base.doc.clone();
    edit(&mut doc);
    let engine = demo().load_engine(&doc.engine).unwrap().doc;
    Study::from_sides(
        doc,
        engine,
        base.as_found_engine.clone(),
        base.units,
        base.profile_name.clone(),
        None,
    )
    .unwrap()
}

#[test]
fn the_trial_on_the_old_installation_fits_one_factor_whatever_is_planned() {
    let study = fixture();
    assert!(study.baseline.is_some(), "the as-found side is built");
    let index = study.vessel.active_variant;
    let fitted = study.calibration(index, false).unwrap().resistance_factor;
    // The as-found installation is the demo Pintle's own: its fit is the same number.
    let pintle = Study::load(&demo(), "pintle", None).unwrap();
    let own = pintle.calibration(0, false).unwrap().resistance_factor;
    assert_close!(fitted, own, 1e-12);
    for (what, study) in [
        ("engine", replanned(|d| d.engine = "quellan-qd90".into())),
        ("gear", replanned(|d| d.installation.gear_ratio = 3.0)),
        (
            "screw",
            replanned(|d| d.variants[1].pitch = Quantity::new(0.42)),
        ),
    ] {
        for variant in 0..study.vessel.variants.len() {
            let again = study.calibration(variant, false).unwrap().resistance_factor;
            assert_close!(again, fitted, 1e-12);
            let _ = what;
        }
    }
}

/// The defect this replaces: without `[as_found]` the same runs are fitted through whatever
/// the file plans, so a gear change alone moves the factor (the check above can fail).
#[test]
fn without_as_found_the_planned_gear_moves_the_fit() {
    let as_it_is = |d: &mut BoatDoc| {
        d.as_found = None;
        d.engine = "brindmoor-3b40".into();
        d.installation.gear_ratio = 2.0;
        d.active_variant = 0;
    };
    let plain = replanned(as_it_is);
    let geared = replanned(|d| {
        as_it_is(d);
        d.installation.gear_ratio = 2.5;
    });
    let a = plain.calibration(0, false).unwrap().resistance_factor;
    let b = geared.calibration(0, false).unwrap().resistance_factor;
    assert!((a - b).abs() > 0.05, "{a} vs {b}");
}

#[test]
fn the_baseline_is_the_boat_as_found_and_the_planned_side_carries_the_engine_weight() {
    let study = fixture();
    let baseline = study.baseline_figures().expect("a baseline");
    assert_eq!(baseline.engine, "brindmoor-3b40");
    assert_eq!(baseline.variant, "current 450x290");
    // The as-found figures are the demo Pintle's, solved the usual way.
    let pintle = Study::load(&demo(), "pintle", None).unwrap();
    let own = pintle.solve_variant(0, &Default::default());
    let own = tidewright::study::baseline::Headline::of(&own);
    assert_eq!(baseline.figures, own);
    assert!(own.top_speed.is_some() && own.cruise_rpm.is_some());
    // Dry weights of the demo sheets: 285 kg planned against 195 kg as found, one shaft.
    let change = study.weight_change.expect("estimated from the dry weights");
    assert!(change.estimated);
    assert_close!(change.mass, 90.0, 1e-12);
    let density = study.vessel.resistance.water.density;
    let planned = study.vessel.resistance.hull.input.displacement_volume * density;
    let found = study
        .baseline
        .as_ref()
        .unwrap()
        .vessel
        .resistance
        .hull
        .input
        .displacement_volume
        * density;
    assert_close!(found, 4600.0, 1e-9);
    assert_close!(planned, 4690.0, 1e-9);
    // A weight the file gives wins over the estimate.
    let given = replanned(|d| d.installation.weight_change = Some(Quantity::new(-40.0)));
    let w = given.weight_change.unwrap();
    assert!(!w.estimated);
    assert_close!(w.mass, -40.0, 1e-12);
}

#[test]
fn a_wrong_as_found_variant_or_engine_names_file_line_and_field() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(FIXTURE).unwrap();
    let bad = text.replace("variant = \"current 450x290\"", "variant = \"old screw\"");
    let path = dir.path().join("bad-variant.toml");
    std::fs::write(&path, &bad).unwrap();
    let err = Study::load(&demo(), path.to_str().unwrap(), None).unwrap_err();
    let message = format!("{err:#}");
    let line = bad
        .lines()
        .position(|l| l.contains("\"old screw\""))
        .unwrap()
        + 1;
    assert!(message.contains("as_found.variant"), "{message}");
    assert!(
        message.contains(&format!(":{line}:")),
        "line {line}: {message}"
    );
    assert!(
        message.contains("current 450x290"),
        "the labels it has: {message}"
    );

    let missing = text.replace("engine = \"brindmoor-3b40\"", "engine = \"no-such-sheet\"");
    let path = dir.path().join("missing-engine.toml");
    std::fs::write(&path, &missing).unwrap();
    let err = Study::load(&demo(), path.to_str().unwrap(), None).unwrap_err();
    let message = format!("{err:#}");
    let found = err.chain().any(|e| {
        matches!(
            e.downcast_ref::<ProfileError>(),
            Some(ProfileError::EngineMissing {
                field: "as_found.engine",
                ..
            })
        )
    });
    assert!(found, "{message}");
    let line = missing
        .lines()
        .position(|l| l.contains("no-such-sheet"))
        .unwrap()
        + 1;
    assert!(
        message.contains(&format!(":{line}:")),
        "line {line}: {message}"
    );
}

#[test]
fn as_found_history_and_trial_side_survive_a_write_and_read() {
    let study = fixture();
    let mut doc = study.doc.clone();
    doc.history.push(tidewright::profile::HistoryDoc {
        until: "2026-11-30".into(),
        engine: "brindmoor-3b40".into(),
        gear_ratio: 1.91,
        screw: "3-blade 440 × 280 mm, AE/A0 0.50".into(),
        trial: doc.trial.clone(),
    });
    if let Some(t) = doc.trial.as_mut() {
        t.installation = Some(tidewright::profile::Side::Planned);
    }
    let again = BoatDoc::from_toml(&doc.to_toml(), "written.toml").unwrap();
    assert_eq!(again, doc);
}

fn json_of(args: &[&str]) -> serde_json::Value {
    let out = assert_cmd::Command::cargo_bin("tidewright")
        .unwrap()
        .env_remove("TIDEWRIGHT_PROFILES")
        .args(["--profiles", "/nonexistent-tidewright-store"])
        .args(args)
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap()
}

fn f(v: &serde_json::Value) -> f64 {
    v.as_f64().unwrap_or_else(|| panic!("not a number: {v}"))
}

/// Every document shows the planned figures beside the as-found ones: its `baseline` is the
/// boat as found and each `delta` the planned figure less it, as the document itself states
/// both (so a delta counted from anything else fails).
#[test]
fn report_shortlist_pitch_and_conditions_carry_the_baseline_and_each_change() {
    let report = json_of(&["report", FIXTURE, "--format", "json"]);
    let base = &report["baseline"];
    assert_eq!(base["engine"], "brindmoor-3b40");
    assert_eq!(base["variant"], "current 450x290");
    assert_close!(f(&base["weight_change_kg"]), 90.0, 1e-12);
    for v in report["variants"].as_array().unwrap() {
        let top = f(&v["match"]["top_speed_kn"]);
        assert_close!(
            f(&v["delta"]["top_speed_kn"]),
            top - f(&base["top_speed_kn"]),
            1e-9
        );
        let cruise = f(&v["cruise"]["engine_rpm"]);
        assert_close!(
            f(&v["delta"]["cruise_rpm"]),
            cruise - f(&base["cruise_rpm"]),
            1e-9
        );
    }

    let shortlist = json_of(&["shortlist", FIXTURE, "--format", "json"]);
    assert_eq!(
        shortlist["baseline"], *base,
        "one baseline for every document"
    );
    for c in shortlist["candidates"].as_array().unwrap() {
        if let Some(top) = c["top_speed_kn"].as_f64() {
            assert_close!(
                f(&c["delta"]["top_speed_kn"]),
                top - f(&base["top_speed_kn"]),
                1e-9
            );
        } else {
            assert!(c["delta"]["top_speed_kn"].is_null());
        }
        if let Some(range) = c["range_nm"].as_f64() {
            assert_close!(
                f(&c["delta"]["range_nm"]),
                range - f(&base["range_nm"]),
                1e-9
            );
        }
    }

    let pitch = json_of(&["pitch", FIXTURE, "--format", "json"]);
    assert_eq!(pitch["baseline"], *base);
    assert!(
        pitch["variants"]
            .as_array()
            .unwrap()
            .iter()
            .all(|v| v["delta"].is_object())
    );

    let conditions = json_of(&["conditions", FIXTURE, "--format", "json"]);
    for c in conditions["conditions"].as_array().unwrap() {
        let (found, delta) = (&c["as_found"], &c["delta"]);
        assert_close!(
            f(&delta["top_speed_kn"]),
            f(&c["top_speed_kn"]) - f(&found["top_speed_kn"]),
            1e-9
        );
    }
    // The as-found boat under the file's own condition is the baseline.
    let as_given = &conditions["conditions"][0]["as_found"];
    assert_close!(f(&as_given["top_speed_kn"]), f(&base["top_speed_kn"]), 1e-9);

    // A boat without [as_found] has none of it.
    let plain = json_of(&["report", "pintle", "--format", "json"]);
    assert!(plain["baseline"].is_null());
    assert!(plain["variants"][0]["delta"].is_null());
}

#[test]
fn text_and_export_show_before_and_after() {
    let out = assert_cmd::Command::cargo_bin("tidewright")
        .unwrap()
        .env_remove("TIDEWRIGHT_PROFILES")
        .args([
            "--profiles",
            "/nonexistent-tidewright-store",
            "report",
            FIXTURE,
        ])
        .output()
        .unwrap();
    let text = String::from_utf8_lossy(&out.stdout).into_owned();
    assert!(text.contains("Before and after"), "{text}");
    assert!(text.contains("As found: Brindmoor 3B40 on 2.00:1 with screw current 450x290"));
    assert!(
        text.contains("estimated from the engine sheets' dry weights"),
        "{text}"
    );
    let dir = tempfile::tempdir().unwrap();
    let out_dir = dir.path().join("export");
    assert_cmd::Command::cargo_bin("tidewright")
        .unwrap()
        .env_remove("TIDEWRIGHT_PROFILES")
        .args([
            "--profiles",
            "/nonexistent-tidewright-store",
            "export",
            FIXTURE,
            "--out",
        ])
        .arg(&out_dir)
        .assert()
        .success();
    let md = std::fs::read_to_string(out_dir.join("report.md")).unwrap();
    assert!(md.contains("## Before and after"), "{md}");
    assert!(
        md.contains("Against the boat as found"),
        "the shortlist's block: {md}"
    );
}

/// `installations --swap`: the planned side becomes the boat as found, the old installation
/// with its trial goes to a dated [[history]], the weight change lands in the load cases, and
/// the fitted factor (the hull's) stays the same.
#[test]
fn marking_the_repower_done_swaps_the_sides_and_keeps_the_old_one() {
    let dir = tempfile::tempdir().unwrap();
    let boats = dir.path().join("boats");
    std::fs::create_dir_all(&boats).unwrap();
    let path = boats.join("pintle-repower.toml");
    std::fs::copy(FIXTURE, &path).unwrap();
    let before = Study::load(&demo(), path.to_str().unwrap(), None).unwrap();
    let factor = before.calibration(0, false).unwrap().resistance_factor;
    let run = |args: &[&str]| {
        assert_cmd::Command::cargo_bin("tidewright")
            .unwrap()
            .env_remove("TIDEWRIGHT_PROFILES")
            .args([
                "--profiles",
                "/nonexistent-tidewright-store",
                "installations",
            ])
            .arg(&path)
            .args(args)
            .output()
            .unwrap()
    };
    let bad = run(&["--swap", "--date", "30.11.2026"]);
    assert_eq!(bad.status.code(), Some(2), "a bad day is a usage error");
    assert!(String::from_utf8_lossy(&bad.stderr).contains("YYYY-MM-DD"));
    let out = run(&["--swap", "--date", "2026-11-30"]);
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let after = BoatDoc::from_toml(&std::fs::read_to_string(&path).unwrap(), "after").unwrap();
    let found = after.as_found.as_ref().unwrap();
    assert_eq!(found.engine, "brindmoor-4b62");
    assert_close!(found.gear_ratio, 2.5, 1e-12);
    assert_eq!(found.variant, "planned 480x360");
    assert_eq!(after.history.len(), 1);
    let old = &after.history[0];
    assert_eq!(
        (old.until.as_str(), old.engine.as_str()),
        ("2026-11-30", "brindmoor-3b40")
    );
    assert_close!(old.gear_ratio, 2.0, 1e-12);
    assert!(old.screw.contains("450"), "{}", old.screw);
    assert_eq!(
        old.trial, before.doc.trial,
        "the trial moved with its installation"
    );
    assert!(after.trial.is_none());
    assert_close!(
        after.load.half.as_ref().unwrap().displacement.value,
        4690.0,
        1e-9
    );
    // The old trial, fitted through the old installation in history, is still the same
    // hull: the planned side solved before the swap is the boat as found after it.
    let study = Study::load(&demo(), path.to_str().unwrap(), None).unwrap();
    assert!(study.weight_change.is_none());
    let planned_before =
        tidewright::study::baseline::Headline::of(&before.solve_variant(1, &Default::default()));
    assert_eq!(study.baseline_figures().unwrap().figures, planned_before);
    // The sides swapped, the hull's factor did not: the trial in history fitted the same.
    let mut kept = study.doc.clone();
    kept.trial = after.history[0].trial.clone();
    kept.as_found = before.doc.as_found.clone();
    kept.load = before.doc.load.clone();
    let refit = before.rebuilt_with(kept).unwrap();
    assert_close!(
        refit.calibration(0, false).unwrap().resistance_factor,
        factor,
        1e-12
    );
    // A boat without [as_found] has nothing to swap.
    let pintle = Study::load(&demo(), "pintle", None).unwrap();
    assert!(pintle.repower_done("2026-11-30").is_err());
}

/// The two-parameter fit holds the single factor as its special case (equal ends), so its RMS
/// can never be worse; saved with `--save --by-froude`, every prediction uses it, held
/// constant outside the trial's speeds.
#[test]
fn the_two_parameter_fit_never_loses_to_one_factor_and_is_saved_on_request() {
    let study = fixture();
    let index = study.vessel.active_variant;
    let one = study.calibration(index, false).unwrap();
    let two = study.froude_calibration(index).unwrap();
    assert!(
        two.rms_after <= one.rms_after + 1e-9,
        "{} vs {}",
        two.rms_after,
        one.rms_after
    );
    let f = two.factor;
    assert!(f.froude_low < f.froude_high);
    // Held outside the trial's Froude numbers, straight between.
    assert_eq!(f.at(f.froude_low - 0.1), f.low);
    assert_eq!(f.at(f.froude_high + 0.1), f.high);
    assert_close!(
        f.at(0.5 * (f.froude_low + f.froude_high)),
        0.5 * (f.low + f.high),
        1e-12
    );

    let dir = tempfile::tempdir().unwrap();
    let boats = dir.path().join("boats");
    std::fs::create_dir_all(&boats).unwrap();
    let path = boats.join("pintle-repower.toml");
    std::fs::copy(FIXTURE, &path).unwrap();
    let out = assert_cmd::Command::cargo_bin("tidewright")
        .unwrap()
        .env_remove("TIDEWRIGHT_PROFILES")
        .args(["--profiles", "/nonexistent-tidewright-store", "trial"])
        .arg(&path)
        .args(["--save", "--by-froude", "--format", "json"])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(json["installation"], "as-found");
    assert!(
        json["froude_fit"]["rms_after_kn"].as_f64().unwrap()
            <= json["rms_after_kn"].as_f64().unwrap() + 1e-9
    );
    assert!(json["resistance_factor_uncertainty"].as_f64().unwrap() > 0.0);
    let saved = BoatDoc::from_toml(&std::fs::read_to_string(&path).unwrap(), "saved").unwrap();
    let profile = saved
        .calibration
        .unwrap()
        .froude_factor
        .expect("the two-parameter fit saved");
    assert_close!(profile.low, f.low, 1e-3);
    assert_close!(profile.high, f.high, 1e-3);
    // The calibrated model now meets the trial as the fit did.
    let calibrated = Study::load(&demo(), path.to_str().unwrap(), None).unwrap();
    let rms = calibrated.rms_with_saved(index, &one).unwrap();
    assert!(rms < one.rms_after + 0.002, "{rms}");
}

/// An instrument log of today's boat, imported into the repower file, is fitted through the
/// as-found installation (the same factor as on the demo Pintle, whose installation it is)
/// and saved as the as-found side's log.
#[test]
fn an_imported_log_is_the_as_found_installations_and_saved_so() {
    let log = super::trial_import::pintle_log();
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("trial.nmea");
    std::fs::write(&file, log.nmea.as_bytes()).unwrap();
    let boats = dir.path().join("boats");
    std::fs::create_dir_all(&boats).unwrap();
    let path = boats.join("pintle-repower.toml");
    std::fs::copy(FIXTURE, &path).unwrap();
    let fit = |boat: &str, save: bool| {
        let mut cmd = assert_cmd::Command::cargo_bin("tidewright").unwrap();
        cmd.env_remove("TIDEWRIGHT_PROFILES")
            .args([
                "--profiles",
                "/nonexistent-tidewright-store",
                "trial",
                boat,
                "--import",
            ])
            .arg(&file)
            .args(["--format", "json"]);
        if save {
            cmd.arg("--save");
        }
        let out = cmd.output().unwrap();
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let json: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        json
    };
    let own = fit("pintle", false);
    let repower = fit(path.to_str().unwrap(), true);
    let factor = |j: &serde_json::Value| {
        j["fit"]["resistance_factor"]
            .as_f64()
            .or_else(|| j["resistance_factor"].as_f64())
            .unwrap_or_else(|| panic!("{j}"))
    };
    assert_close!(factor(&repower), factor(&own), 1e-9);
    let saved = BoatDoc::from_toml(&std::fs::read_to_string(&path).unwrap(), "saved").unwrap();
    assert_eq!(
        saved.trial.unwrap().installation,
        Some(tidewright::profile::Side::AsFound)
    );
}
