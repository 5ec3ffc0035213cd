//! Integration tests: `order`, the sheet for the propeller shop — the pitch rounded to the
//! shop's step and what that does to the rpm, the `[screw_shop]` section (read, saved,
//! refused with its line), the JSON fields, and the export's section. Each runs the real
//! binary against a temporary store or the embedded demo fleet.

use assert_cmd::Command;
use serde_json::Value;

fn tidewright() -> Command {
    let mut cmd = Command::cargo_bin("tidewright").expect("binary built");
    cmd.env_remove("TIDEWRIGHT_PROFILES").env("NO_COLOR", "1");
    cmd
}

/// A `--profiles` directory that does not exist: the embedded demo fleet.
fn demo() -> (tempfile::TempDir, String) {
    let dir = tempfile::tempdir().unwrap();
    let missing = dir.path().join("none").display().to_string();
    (dir, missing)
}

/// A store made by `init`, with the demo boat `boat`'s file replaced by `text` when given.
fn store_with(boat: &str, text: Option<&str>) -> (tempfile::TempDir, String) {
    let dir = tempfile::tempdir().unwrap();
    let root = dir.path().join("store");
    tidewright::profile::Store::at(&root).init().unwrap();
    if let Some(text) = text {
        std::fs::write(root.join(format!("boats/{boat}.toml")), text).unwrap();
    }
    (dir, root.display().to_string())
}

fn order_json(store: &str, boat: &str) -> Value {
    let out = tidewright()
        .args(["--profiles", store, "order", boat, "--format", "json"])
        .assert()
        .success();
    serde_json::from_slice(&out.get_output().stdout).expect("JSON")
}

const INCH: f64 = 0.0254;

#[test]
fn a_boat_without_a_screw_shop_gets_its_unit_systems_default_step() {
    let (_dir, store) = demo();
    // Common practice: shops cut pitch in half inches, or 10 mm in metric.
    for (boat, step) in [("marram", 0.5 * INCH), ("pintle", 0.010)] {
        let doc = order_json(&store, boat);
        assert!(
            (doc["pitch_step_m"].as_f64().unwrap() - step).abs() < 1e-12,
            "{boat}: {doc}"
        );
        assert_eq!(doc["pitch_step_given"], false, "{boat}");
        // The pitch to cut is a whole number of steps, within half a step of the exact one.
        let pitch = doc["pitch_m"].as_f64().unwrap();
        let exact = doc["pitch_exact_m"].as_f64().unwrap();
        assert!(
            ((pitch / step) - (pitch / step).round()).abs() < 1e-9,
            "{boat}: {pitch}"
        );
        assert!((pitch - exact).abs() <= step / 2.0 + 1e-12, "{boat}");
        assert_eq!(doc["taper"], Value::Null);
        assert_eq!(doc["bore_m"], Value::Null);
    }
    let text = tidewright()
        .args(["--profiles", &store, "order", "pintle"])
        .assert()
        .success();
    let text = String::from_utf8_lossy(&text.get_output().stdout).into_owned();
    assert!(
        text.contains("Taper") && text.contains("not given"),
        "{text}"
    );
    assert!(text.contains("Confirm bore, taper and rotation on the shaft before cutting"));
    assert!(
        text.contains("licensed marine surveyor"),
        "the project's caution: {text}"
    );
}

#[test]
fn more_pitch_gives_fewer_rpm_at_full_throttle() {
    // Common practice (every propeller shop's rule of thumb): added pitch loads the engine, so
    // it turns fewer rpm at full throttle; the margin falls as the pitch rises.
    let (_dir, store) = demo();
    for boat in ["marram", "pintle", "sorrel", "samphire"] {
        let doc = order_json(&store, boat);
        let pitches = [
            (
                doc["pitch_exact_m"].as_f64(),
                doc["rpm_margin_exact"].as_f64(),
                doc["full_throttle_rpm_exact"].as_f64(),
            ),
            (
                doc["pitch_m"].as_f64(),
                doc["rpm_margin"].as_f64(),
                doc["full_throttle_rpm"].as_f64(),
            ),
            (
                doc["pitch_other_m"].as_f64(),
                doc["rpm_margin_other"].as_f64(),
                doc["full_throttle_rpm_other"].as_f64(),
            ),
        ];
        let mut points: Vec<(f64, f64, f64)> = pitches
            .into_iter()
            .filter_map(|(p, m, r)| Some((p?, m?, r?)))
            .collect();
        assert!(points.len() >= 2, "{boat}: {doc}");
        points.sort_by(|a, b| a.0.total_cmp(&b.0));
        for pair in points.windows(2) {
            let (low, high) = (pair[0], pair[1]);
            if high.0 - low.0 < 1e-6 {
                continue;
            }
            assert!(high.1 < low.1, "{boat}: margin {low:?} → {high:?}");
            assert!(
                high.2 <= low.2 + 1e-3,
                "{boat}: full-throttle rpm {low:?} → {high:?}"
            );
        }
    }
}

#[test]
fn the_json_has_every_field_of_the_sheet() {
    let (_dir, store) = demo();
    let doc = order_json(&store, "marram");
    for field in [
        "boat",
        "variant",
        "blades",
        "diameter_m",
        "pitch_exact_m",
        "pitch_m",
        "pitch_step_m",
        "pitch_other_m",
        "full_throttle_rpm_exact",
        "full_throttle_rpm",
        "rpm_margin",
        "area_ratio",
        "rotation",
        "shaft_diameter_m",
        "taper",
        "bore_m",
        "keyway",
        "cavitation",
        "shaft",
        "cautions",
    ] {
        assert!(doc.get(field).is_some(), "{field} missing: {doc}");
    }
    assert_eq!(doc["boat"], "Marram");
    assert_eq!(doc["rotation"], "right");
    assert!(
        doc["cavitation"]["points"]
            .as_array()
            .is_some_and(|p| p.len() == 2),
        "{doc}"
    );
    assert!(doc["shaft"]["min_diameter_m"].is_f64(), "{doc}");
    assert!(doc["cautions"].as_array().unwrap().len() >= 2);
    // A twin orders a handed pair: the variant's hand to starboard, the other to port.
    let twin = order_json(&store, "samphire");
    assert_eq!(twin["screws"], 2);
    assert!(
        twin["rotation"].is_string() && twin["port_rotation"].is_string(),
        "{twin}"
    );
    assert_ne!(twin["rotation"], twin["port_rotation"]);
}

#[test]
fn a_screw_shop_section_sets_the_step_and_the_shaft_end() {
    let demo_text = tidewright::profile::demo::boat("pintle").unwrap();
    let text = format!(
        "{demo_text}\n[screw_shop]\npitch_step = \"25 mm\"   # this shop's step\ntaper = \"1:10\"\nbore = \"28 mm\"\nkeyway = \"8 mm\"\n"
    );
    let (_dir, store) = store_with("pintle", Some(&text));
    let doc = order_json(&store, "pintle");
    assert!(
        (doc["pitch_step_m"].as_f64().unwrap() - 0.025).abs() < 1e-12,
        "{doc}"
    );
    assert_eq!(doc["pitch_step_given"], true);
    assert_eq!(doc["taper"], "1:10");
    assert!((doc["bore_m"].as_f64().unwrap() - 0.028).abs() < 1e-12);
    assert_eq!(doc["keyway"], "8 mm");
    let pitch = doc["pitch_m"].as_f64().unwrap();
    assert!(
        ((pitch / 0.025) - (pitch / 0.025).round()).abs() < 1e-9,
        "{pitch}"
    );
    let md = tidewright()
        .args(["--profiles", &store, "order", "pintle", "--format", "md"])
        .assert()
        .success();
    let md = String::from_utf8_lossy(&md.get_output().stdout).into_owned();
    assert!(md.starts_with("# Pintle: Order for the screw shop"), "{md}");
    assert!(md.contains("| Taper | 1:10 |"), "{md}");
    // The section survives a save of the boat, comment and all.
    let root = std::path::Path::new(&store);
    let loaded = tidewright::profile::Store::at(root)
        .load_boat("pintle")
        .unwrap();
    let mut edited = loaded.doc.clone();
    edited.trip.reserve = 0.2;
    tidewright::profile::Store::at(root)
        .save_boat("pintle", &edited, loaded.origin.stamp(), false)
        .unwrap();
    let saved = std::fs::read_to_string(root.join("boats/pintle.toml")).unwrap();
    assert!(
        saved.contains("pitch_step = \"25 mm\"   # this shop's step"),
        "{saved}"
    );
    let back = tidewright::profile::Store::at(root)
        .load_boat("pintle")
        .unwrap()
        .doc;
    assert_eq!(back.screw_shop, edited.screw_shop);
}

#[test]
fn a_bad_pitch_step_names_the_file_line_and_field() {
    let demo_text = tidewright::profile::demo::boat("pintle").unwrap();
    for step in ["\"60 mm\"", "\"0 mm\"", "\"-5 mm\""] {
        let text = format!("{demo_text}\n[screw_shop]\npitch_step = {step}\n");
        let line = text
            .lines()
            .position(|l| l.starts_with("pitch_step"))
            .unwrap()
            + 1;
        let (_dir, store) = store_with("pintle", Some(&text));
        let out = tidewright()
            .args(["--profiles", &store, "order", "pintle"])
            .assert()
            .code(1);
        let err = String::from_utf8_lossy(&out.get_output().stderr).into_owned();
        assert!(
            err.contains(&format!("pintle.toml:{line}:")),
            "{step}: {err}"
        );
        assert!(err.contains("screw_shop.pitch_step"), "{step}: {err}");
        assert!(err.contains("50 mm"), "{step}: says the limit: {err}");
    }
}

#[test]
fn the_export_has_the_order_section() {
    let (dir, store) = demo();
    let out = dir.path().join("export");
    tidewright()
        .args(["--profiles", &store, "export", "marram", "--out"])
        .arg(&out)
        .assert()
        .success();
    let md = std::fs::read_to_string(out.join("report.md")).unwrap();
    let at = md.find("## Order for the screw shop").expect("the section");
    let section = &md[at..];
    assert!(section.contains("| Pitch step |"), "{section}");
    assert!(
        section.contains("Confirm bore, taper and rotation"),
        "{section}"
    );
    // The HTML page lays out the same section, its cautions as quotes and no stray marks.
    tidewright()
        .args([
            "--profiles",
            &store,
            "export",
            "marram",
            "--format",
            "html",
            "--out",
        ])
        .arg(&out)
        .assert()
        .success();
    let html = std::fs::read_to_string(out.join("report.html")).unwrap();
    let at = html
        .find("Order for the screw shop</h2>")
        .expect("the section");
    let end = html[at..].find("</section>").map_or(html.len(), |e| at + e);
    let section = &html[at..end];
    assert_eq!(section.matches("<blockquote>").count(), 2, "{section}");
    assert!(!section.contains("<p>&gt;</p>"), "{section}");
}

/// `order` and `pitch` write the re-pitch limit alike (the template's 50.8 mm, never "51 mm").
#[test]
fn order_and_pitch_agree_on_the_repitch_limit() {
    let run = |cmd: &str| {
        let out = assert_cmd::Command::cargo_bin("tidewright")
            .unwrap()
            .env_remove("TIDEWRIGHT_PROFILES")
            .args(["--profiles", "/nonexistent-tidewright-store", cmd])
            .arg(concat!(
                env!("CARGO_MANIFEST_DIR"),
                "/tests/fixtures/repower/boats/pintle-repower.toml"
            ))
            .output()
            .unwrap();
        String::from_utf8_lossy(&out.stdout).into_owned()
    };
    let limit = |text: &str| {
        text.split("re-pitch limit of ±").nth(1).map(|rest| {
            rest.split(' ')
                .take(2)
                .collect::<Vec<_>>()
                .join(" ")
                .trim_end_matches([':', ','])
                .to_string()
        })
    };
    let (order, pitch) = (run("order"), run("pitch"));
    assert_eq!(limit(&order), limit(&pitch), "{order}\n{pitch}");
    assert_eq!(limit(&pitch).as_deref(), Some("50.8 mm"), "{pitch}");
}
