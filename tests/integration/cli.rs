//! Integration tests: cli. Each runs the real binary with its profile store in a temporary
//! directory (or pointed at a directory that does not exist, so the embedded demo is used);
//! the user's own store is never touched.

use assert_cmd::Command;
use predicates::prelude::*;
use serde_json::Value;
use tidewright::profile::Store;

/// The binary with an empty environment for the store: `--profiles` is always given by a test.
fn tidewright() -> Command {
    let mut cmd = Command::cargo_bin("tidewright").expect("binary built");
    cmd.env_remove("TIDEWRIGHT_PROFILES").env("NO_COLOR", "1");
    cmd
}

fn json_of(output: &[u8]) -> Value {
    serde_json::from_slice(output)
        .unwrap_or_else(|e| panic!("not JSON ({e}): {}", String::from_utf8_lossy(output)))
}

/// KT at J = 0 from the published polynomial: the sum of the terms with s = 0, read straight
/// from the coefficient file (Oosterveld & van Oossanen 1975, the same table as Bernitsas, Ray
/// & Kinley 1981), independently of the crate's own loader.
fn kt_at_zero_advance(blades: f64, area_ratio: f64, pitch_ratio: f64) -> f64 {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/data/bseries-polynomials.csv"
    ))
    .unwrap();
    text.lines()
        .filter(|l| l.starts_with("KT,"))
        .map(|l| l.split(',').collect::<Vec<_>>())
        .filter(|f| f[3] == "0")
        .map(|f| {
            let c: f64 = f[1].parse().unwrap();
            let (t, u, v): (i32, i32, i32) = (
                f[4].parse().unwrap(),
                f[5].parse().unwrap(),
                f[6].parse().unwrap(),
            );
            c * pitch_ratio.powi(t) * area_ratio.powi(u) * blades.powi(v)
        })
        .sum()
}

#[test]
fn help_lists_every_command_and_exits_zero() {
    let assert = tidewright().arg("--help").assert().success();
    let out = String::from_utf8_lossy(&assert.get_output().stdout).to_string();
    for command in [
        "open",
        "report",
        "cruise",
        "check",
        "list",
        "init",
        "openwater",
        "pitch",
        "sweep",
        "trial",
        "conditions",
        "export",
    ] {
        assert!(
            out.contains(command),
            "--help does not list {command}:\n{out}"
        );
    }
    for command in [
        "report",
        "cruise",
        "check",
        "list",
        "init",
        "openwater",
        "pitch",
        "sweep",
        "trial",
        "conditions",
        "export",
    ] {
        tidewright()
            .args([command, "--help"])
            .assert()
            .success()
            .stdout(predicate::str::contains("Usage"));
    }
}

#[test]
fn usage_errors_exit_with_two() {
    tidewright()
        .arg("no-such-command")
        .assert()
        .code(2)
        .stderr(predicate::str::contains("no-such-command"));
    tidewright().args(["cruise", "boat"]).assert().code(2);
    tidewright()
        .args(["report", "boat", "--format", "pdf"])
        .assert()
        .code(2);
    tidewright()
        .args(["openwater", "--blades", "4"])
        .assert()
        .code(2);
}

#[test]
fn openwater_kt_at_zero_advance_is_the_polynomial_constant_sum() {
    let assert = tidewright()
        .args([
            "openwater",
            "--blades",
            "4",
            "--area-ratio",
            "0.55",
            "--pitch-ratio",
            "0.8",
            "--j",
            "0,0.4",
        ])
        .args(["--format", "json"])
        .assert()
        .success();
    let doc = json_of(&assert.get_output().stdout);
    let points = doc["points"].as_array().expect("points");
    assert_eq!(points.len(), 2);
    assert_close!(
        points[0]["kt"].as_f64().unwrap(),
        kt_at_zero_advance(4.0, 0.55, 0.8),
        1e-9
    );
    // η0 = J·KT/(2π·KQ) at every point (open-water efficiency definition).
    for p in points {
        let (j, kt, kq, eta0) = (
            p["j"].as_f64().unwrap(),
            p["kt"].as_f64().unwrap(),
            p["kq"].as_f64().unwrap(),
            p["eta0"].as_f64().unwrap(),
        );
        assert!((eta0 - j * kt / (std::f64::consts::TAU * kq)).abs() < 1e-12);
    }
    assert!(doc["warnings"].is_array());
}

#[test]
fn openwater_omits_points_past_zero_thrust_and_never_shows_negative_efficiency() {
    let assert = tidewright()
        .args([
            "openwater",
            "--blades",
            "3",
            "--area-ratio",
            "0.5",
            "--pitch-ratio",
            "0.7",
            "--j-range",
            "0:1.5:0.1",
        ])
        .args(["--format", "json"])
        .assert()
        .success();
    let doc = json_of(&assert.get_output().stdout);
    let points = doc["points"].as_array().unwrap();
    assert!(
        points.len() < 16,
        "J = 1.5 is past zero thrust for P/D 0.7 and must be left out"
    );
    assert!(
        points
            .iter()
            .all(|p| p["kt"].as_f64().unwrap() > 0.0 && p["eta0"].as_f64().unwrap() >= 0.0)
    );
    let warnings = doc["warnings"].as_array().unwrap();
    assert!(
        warnings
            .iter()
            .any(|w| w.as_str().unwrap().contains("past zero thrust")),
        "{warnings:?}"
    );
}

#[test]
fn openwater_text_table_shows_ten_kq() {
    let assert = tidewright()
        .args([
            "openwater",
            "--blades",
            "4",
            "--area-ratio",
            "0.55",
            "--pitch-ratio",
            "0.8",
            "--j",
            "0",
        ])
        .assert()
        .success();
    let out = String::from_utf8_lossy(&assert.get_output().stdout).to_string();
    assert!(out.contains("10·KQ") && out.contains("η0"), "{out}");
    let kt = format!("{:.4}", kt_at_zero_advance(4.0, 0.55, 0.8));
    assert!(out.contains(&kt), "KT {kt} missing:\n{out}");
}

#[test]
fn openwater_bad_input_is_a_clear_usage_error() {
    let base = ["openwater", "--blades", "4", "--area-ratio", "0.55"];
    tidewright()
        .args(base)
        .args(["--pitch-ratio", "0.8", "--j", ""])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("empty"));
    tidewright()
        .args(base)
        .args(["--pitch-ratio", "0", "--j", "0.1"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("--pitch-ratio"));
    tidewright()
        .args(base)
        .args(["--pitch-ratio", "0.8", "--j-range", "1:0:0.1"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("empty"));
    tidewright()
        .args(base)
        .args(["--pitch-ratio", "0.8", "--j", "0.1,abc"])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("abc"));
    tidewright()
        .args([
            "openwater",
            "--blades",
            "0",
            "--area-ratio",
            "0.55",
            "--pitch-ratio",
            "0.8",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("blade"));
}

#[test]
fn openwater_warns_outside_the_series_range() {
    let assert = tidewright()
        .args([
            "openwater",
            "--blades",
            "4",
            "--area-ratio",
            "0.55",
            "--pitch-ratio",
            "1.6",
            "--j",
            "0.5",
        ])
        .args(["--format", "json"])
        .assert()
        .success();
    let doc = json_of(&assert.get_output().stdout);
    let warnings: Vec<String> = doc["warnings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|w| w.as_str().unwrap().to_string())
        .collect();
    assert!(
        warnings
            .iter()
            .any(|w| w.contains("P/D") || w.contains("pitch ratio")),
        "{warnings:?}"
    );
}

/// A `--profiles` directory that does not exist, so the embedded demo fleet is used.
fn demo_store() -> (tempfile::TempDir, String) {
    let dir = tempfile::tempdir().unwrap();
    let missing = dir.path().join("no-store").display().to_string();
    (dir, missing)
}

fn run_json(args: &[&str]) -> Value {
    let assert = tidewright().args(args).assert().success();
    json_of(&assert.get_output().stdout)
}

#[test]
fn twin_json_gives_the_boat_unsuffixed_and_each_screw_per_screw() {
    let (_dir, store) = demo_store();
    let doc = run_json(&[
        "--profiles",
        &store,
        "report",
        "samphire",
        "--format",
        "json",
    ]);
    assert_eq!(doc["installation"]["shafts"], 2);
    let points = doc["variants"][0]["points"].as_array().unwrap();
    assert!(points.len() >= 5);
    let f = |p: &Value, k: &str| p[k].as_f64().unwrap_or_else(|| panic!("{k} in {p}"));
    for p in points {
        assert_eq!(p["driven_shafts"], 2);
        assert_close!(f(p, "thrust_n"), 2.0 * f(p, "thrust_n_per_screw"), 1e-12);
        assert_close!(
            f(p, "delivered_kw"),
            2.0 * f(p, "delivered_kw_per_screw"),
            1e-12
        );
        assert_close!(f(p, "brake_kw"), 2.0 * f(p, "brake_kw_per_engine"), 1e-12);
        assert_close!(f(p, "fuel_lph"), 2.0 * f(p, "fuel_lph_per_engine"), 1e-12);
        // Effective power R·V over the boat's delivered power is the propulsive efficiency
        // ηD = ηH·η0·ηR, below 1 for any real screw (Principles of Naval Architecture vol.
        // II, 1988, §6.3, from memory); with the per-screw power it would come out near 2ηD.
        let effective_kw = f(p, "resistance_n") * f(p, "speed_kn") * 1852.0 / 3600.0 / 1e3;
        let eta_d = effective_kw / f(p, "delivered_kw");
        assert!(eta_d > 0.2 && eta_d < 1.0, "ηD {eta_d} at {p}");
        // Thrust of both screws less the thrust deduction is the boat's resistance.
        assert!(f(p, "thrust_n") > f(p, "resistance_n"), "{p}");
    }
    // Every speed field ends in its unit: the method spread's top speeds are in knots.
    let spread = &doc["variants"][0]["method_spread"];
    {
        assert!(spread.is_object(), "samphire runs both methods: {spread}");
        assert!(spread.get("top_speed").is_none() && spread.get("alternative_top_speed").is_none());
        let top = f(spread, "top_speed_kn");
        let m = &doc["variants"][0]["match"];
        assert_close!(top, f(m, "top_speed_kn"), 1e-6);
    }
}

#[test]
fn report_json_of_the_demo_has_every_field_and_the_intended_verdicts() {
    let (_dir, store) = demo_store();
    let doc = run_json(&["--profiles", &store, "report", "marram", "--format", "json"]);
    assert_eq!(doc["boat"], "Marram");
    assert!(doc["units"].is_string());
    let variants = doc["variants"].as_array().unwrap();
    assert_eq!(variants.len(), 3);
    for v in variants {
        assert!(v["label"].is_string());
        let points = v["points"].as_array().unwrap();
        assert!(points.len() >= 5, "{v}");
        for p in points {
            for field in [
                "engine_rpm",
                "prop_rpm",
                "speed_kn",
                "resistance_n",
                "thrust_n",
                "thrust_n_per_screw",
                "j",
                "kt",
                "kq",
                "eta0",
                "delivered_kw",
                "delivered_kw_per_screw",
                "brake_kw",
                "load_pct",
                "fuel_lph",
            ] {
                assert!(
                    p[field].as_f64().is_some_and(f64::is_finite),
                    "{field} missing or not a number in {p}"
                );
            }
        }
        let m = &v["match"];
        for field in ["meeting_rpm", "top_speed_kn", "absorbed_pct_at_rated"] {
            assert!(
                m[field].as_f64().is_some_and(f64::is_finite),
                "{field} in {m}"
            );
        }
    }
    // The demo fleet is written to show one over-, one matched and one under-propped screw on
    // Marram (profiles/boats/marram.toml); the verdict must follow the absorbed power.
    let verdicts: Vec<&str> = variants
        .iter()
        .map(|v| v["match"]["verdict"].as_str().unwrap())
        .collect();
    assert_eq!(verdicts, ["over", "matched", "under"]);
    for v in variants {
        let absorbed = v["match"]["absorbed_pct_at_rated"].as_f64().unwrap();
        match v["match"]["verdict"].as_str().unwrap() {
            "over" => assert!(absorbed > 100.0),
            "under" => assert!(absorbed < 85.0),
            _ => assert!((85.0..=100.0).contains(&absorbed)),
        }
    }
    assert!(doc["warnings"].is_array());
}

#[test]
fn report_json_is_si_whatever_the_display_units() {
    let (_dir, store) = demo_store();
    let metric = run_json(&[
        "--profiles",
        &store,
        "--units",
        "metric",
        "report",
        "pintle",
        "--format",
        "json",
    ]);
    let imperial = run_json(&[
        "--profiles",
        &store,
        "--units",
        "imperial",
        "report",
        "pintle",
        "--format",
        "json",
    ]);
    // Every number is the same; only the free-text notes are written in the display units.
    assert_eq!(metric["variants"], imperial["variants"]);
    assert_eq!(metric["engine"], imperial["engine"]);
    assert_eq!(metric["target_speed_kn"], imperial["target_speed_kn"]);
}

#[test]
fn report_text_csv_and_markdown_carry_the_table_verdict_and_caution() {
    let (_dir, store) = demo_store();
    let text = tidewright()
        .args(["--profiles", &store, "report", "marram"])
        .assert()
        .success();
    let text = String::from_utf8_lossy(&text.get_output().stdout).to_string();
    for needle in [
        "over-propped",
        "under-propped",
        "matched",
        "top speed",
        "At 7.0 kn",
        "licensed marine surveyor",
        "rpm",
    ] {
        assert!(text.contains(needle), "{needle} missing:\n{text}");
    }
    assert!(!text.contains("NaN"));

    let csv = tidewright()
        .args([
            "--profiles",
            &store,
            "--units",
            "metric",
            "report",
            "marram",
            "--format",
            "csv",
        ])
        .assert()
        .success();
    let csv = String::from_utf8_lossy(&csv.get_output().stdout).to_string();
    let mut lines = csv.lines();
    let header = lines.next().unwrap();
    assert!(
        header.starts_with("variant,engine (rpm),screw (rpm),speed (kn),power (kW)"),
        "{header}"
    );
    let width = header.split(',').count();
    let rows: Vec<&str> = lines.collect();
    assert!(rows.len() >= 15);
    assert!(
        rows.iter().all(|r| r.split(',').count() == width),
        "ragged CSV:\n{csv}"
    );

    let md = tidewright()
        .args(["--profiles", &store, "report", "marram", "--format", "md"])
        .assert()
        .success();
    let md = String::from_utf8_lossy(&md.get_output().stdout).to_string();
    assert!(md.starts_with("# Marram"));
    assert!(md.contains("| ---: |") && md.contains("**Caution.**"));
}

#[test]
fn report_of_one_variant_and_of_an_unknown_one() {
    let (_dir, store) = demo_store();
    let doc = run_json(&[
        "--profiles",
        &store,
        "report",
        "marram",
        "--variant",
        "flat 26x15",
        "--format",
        "json",
    ]);
    assert_eq!(doc["variants"].as_array().unwrap().len(), 1);
    tidewright()
        .args([
            "--profiles",
            &store,
            "report",
            "marram",
            "--variant",
            "nope",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("nope").and(predicate::str::contains("old 26x19")));
    tidewright()
        .args(["--profiles", &store, "report", "no-such-boat"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("no-such-boat"));
}

/// Cross-check of one demo boat at one speed against an independent calculation with the
/// core's pieces: resistance, interaction, open-water polynomials and the identities of
/// design §2.6 (T = R/(1−t), Va = V(1−w), J = Va/(nD), KT = T/(ρn²D⁴), Q = KQ·ρn²D⁵,
/// PD = 2πnQ/ηR, PB = PD/(ηshaft·ηgear), engine rpm = 60·n·gear ratio).
#[test]
fn cruise_at_a_speed_agrees_with_an_independent_calculation() {
    use tidewright::profile::Store;
    let (_dir, store) = demo_store();
    let doc = run_json(&[
        "--profiles",
        &store,
        "cruise",
        "pintle",
        "--speed",
        "6 kn",
        "--format",
        "json",
    ]);

    let (boat, engine) = Store::at(&store).resolve_boat("pintle").unwrap();
    let vessel = boat.doc.to_default_vessel(&engine.doc).unwrap();
    let system = vessel.system(vessel.active_variant);
    let speed = 6.0 * 1852.0 / 3600.0; // 1 kn = 1852 m/h exactly (NIST SP 811 B.8)
    let resistance = vessel.resistance.resistance(speed).unwrap().total;
    let ix = vessel.interaction.at_speed(
        &vessel.resistance.hull,
        &vessel.resistance.water,
        &system.screw_at_stern(),
        speed,
    );
    let thrust = resistance / (1.0 - ix.thrust_deduction);
    let advance_speed = speed * (1.0 - ix.wake_fraction);
    let rho = vessel.resistance.water.density;
    let diameter = system.screw.geometry().diameter;

    assert_close!(doc["speed_kn"].as_f64().unwrap(), 6.0, 1e-6);
    assert_close!(doc["resistance_n"].as_f64().unwrap(), resistance, 1e-6);
    assert_close!(doc["thrust_n"].as_f64().unwrap(), thrust, 1e-6);
    let n = doc["prop_rpm"].as_f64().unwrap() / 60.0;
    let j = doc["j"].as_f64().unwrap();
    assert_close!(j, advance_speed / (n * diameter), 1e-6);
    // Thrust identity: the screw's KT at J gives the required thrust.
    assert_close!(
        doc["kt"].as_f64().unwrap(),
        thrust / (rho * n * n * diameter.powi(4)),
        1e-5
    );
    let reynolds = system.reynolds_correction.then(|| {
        let chord = system.screw.chord_at_075r().unwrap();
        let section_speed =
            (advance_speed.powi(2) + (0.75 * std::f64::consts::PI * n * diameter).powi(2)).sqrt();
        chord * section_speed / vessel.resistance.water.kinematic_viscosity
    });
    let ow = system.screw.coefficients(j, reynolds);
    assert_close!(doc["kt"].as_f64().unwrap(), ow.thrust_coefficient, 1e-4);
    assert_close!(doc["kq"].as_f64().unwrap(), ow.torque_coefficient, 1e-4);
    let torque = ow.torque_coefficient * rho * n * n * diameter.powi(5);
    let delivered = std::f64::consts::TAU * n * torque / ix.relative_rotative_efficiency;
    assert_close!(doc["delivered_kw"].as_f64().unwrap() * 1e3, delivered, 1e-3);
    let inst = vessel.installation;
    assert_close!(
        doc["brake_kw"].as_f64().unwrap() * 1e3,
        delivered / (inst.shaft_efficiency * inst.gear_efficiency),
        1e-3
    );
    assert_close!(
        doc["engine_rpm"].as_f64().unwrap(),
        60.0 * n * inst.gear_ratio,
        1e-9
    );
    let brake = doc["brake_kw"].as_f64().unwrap() * 1e3;
    let rpm = doc["engine_rpm"].as_f64().unwrap();
    assert_close!(
        doc["load_pct"].as_f64().unwrap(),
        100.0 * brake / vessel.engine.full_load_power_at(rpm),
        1e-6
    );
    // Fuel per mile = fuel rate / speed (L/h ÷ kn = L/nm).
    assert_close!(
        doc["fuel_l_per_nm"].as_f64().unwrap(),
        doc["fuel_lph"].as_f64().unwrap() / 6.0,
        1e-6
    );
}

#[test]
fn cruise_both_ways_and_in_text() {
    let (_dir, store) = demo_store();
    let by_speed = run_json(&[
        "--profiles",
        &store,
        "cruise",
        "marram",
        "--speed",
        "7kn",
        "--format",
        "json",
    ]);
    let rpm = by_speed["engine_rpm"].as_f64().unwrap();
    let by_rpm = run_json(&[
        "--profiles",
        &store,
        "cruise",
        "marram",
        "--rpm",
        &format!("{rpm}"),
        "--format",
        "json",
    ]);
    assert_close!(by_rpm["speed_kn"].as_f64().unwrap(), 7.0, 1e-3);
    let text = tidewright()
        .args([
            "--profiles",
            &store,
            "--units",
            "metric",
            "cruise",
            "marram",
            "--rpm",
            "1800",
        ])
        .assert()
        .success();
    let text = String::from_utf8_lossy(&text.get_output().stdout).to_string();
    assert!(text.contains(": 1800 rpm"), "{text}");
    for needle in ["kn", "kW", "load", "L/h", "L/nm", "range", "Caution"] {
        assert!(text.contains(needle), "{needle}: {text}");
    }
    tidewright()
        .args([
            "--profiles",
            &store,
            "cruise",
            "marram",
            "--speed",
            "7 furlongs",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains("--speed"));
    tidewright()
        .args(["--profiles", &store, "cruise", "marram", "--rpm", "-3"])
        .assert()
        .code(2);
}

#[test]
fn list_shows_the_demo_without_a_store_and_the_store_after_init() {
    let dir = tempfile::tempdir().unwrap();
    let root = dir.path().join("store");
    let root_s = root.display().to_string();
    let demo = run_json(&["--profiles", &root_s, "list", "--format", "json"]);
    let boats: Vec<&str> = demo["boats"]
        .as_array()
        .unwrap()
        .iter()
        .map(|b| b.as_str().unwrap())
        .collect();
    assert!(boats.contains(&"marram") && boats.contains(&"pintle"));
    assert!(demo["engines"].as_array().unwrap().len() >= 3);

    tidewright()
        .args(["--profiles", &root_s, "init"])
        .assert()
        .success()
        .stdout(predicate::str::contains("created"));
    assert!(root.join("boats/marram.toml").is_file());
    // A second init keeps what is there, never overwriting.
    std::fs::write(root.join("boats/marram.toml"), "# edited by hand\n").unwrap();
    tidewright()
        .args(["--profiles", &root_s, "init"])
        .assert()
        .success()
        .stdout(predicate::str::contains("kept"));
    assert_eq!(
        std::fs::read_to_string(root.join("boats/marram.toml")).unwrap(),
        "# edited by hand\n"
    );

    std::fs::remove_file(root.join("boats/marram.toml")).unwrap();
    let store = run_json(&["--profiles", &root_s, "list", "--format", "json"]);
    let boats: Vec<&str> = store["boats"]
        .as_array()
        .unwrap()
        .iter()
        .map(|b| b.as_str().unwrap())
        .collect();
    assert!(
        !boats.contains(&"marram") && boats.contains(&"pintle"),
        "{boats:?}"
    );
    tidewright()
        .args(["--profiles", &root_s, "list"])
        .assert()
        .success()
        .stdout(predicate::str::contains("pintle"));
}

#[test]
fn environment_variable_chooses_the_store() {
    let dir = tempfile::tempdir().unwrap();
    let root = dir.path().join("env-store");
    tidewright()
        .env("TIDEWRIGHT_PROFILES", &root)
        .arg("init")
        .assert()
        .success();
    assert!(root.join("engines").is_dir());
}

#[test]
fn check_passes_valid_files_and_locates_problems_in_invalid_ones() {
    let dir = tempfile::tempdir().unwrap();
    let root = dir.path().join("store");
    let root_s = root.display().to_string();
    tidewright()
        .args(["--profiles", &root_s, "init"])
        .assert()
        .success();
    let boat = root.join("boats/pintle.toml");
    let engine = root.join("engines/brindmoor-3b40.toml");
    tidewright()
        .args(["--profiles", &root_s, "check"])
        .arg(&boat)
        .arg(&engine)
        .assert()
        .code(0)
        .stdout(predicate::str::contains("ok"));

    let bad = root.join("boats/bad.toml");
    let text = std::fs::read_to_string(&boat).unwrap().replacen(
        "schema = 1",
        "schema = 1\nhul_typo = 3",
        1,
    );
    std::fs::write(&bad, text).unwrap();
    let assert = tidewright()
        .args(["--profiles", &root_s, "check"])
        .arg(&boat)
        .arg(&bad)
        .assert()
        .code(3);
    let out = String::from_utf8_lossy(&assert.get_output().stdout).to_string();
    let shown = bad.display().to_string();
    assert!(out.contains(&format!("{shown}:")), "{out}");
    assert!(out.contains("hul_typo"), "the unknown key is named: {out}");
    // file:line:column — the typo sits on line 2 of a file whose first line is its comment,
    // so its line is the one after `schema`.
    let line = out.lines().find(|l| l.contains("hul_typo")).unwrap();
    let after = &line[shown.len() + 1..];
    let mut parts = after.split(':');
    assert!(
        parts.next().unwrap().parse::<usize>().is_ok()
            && parts.next().unwrap().parse::<usize>().is_ok(),
        "{line}"
    );

    let neither = dir.path().join("neither.toml");
    std::fs::write(&neither, "name = \"x\"\n").unwrap();
    tidewright()
        .arg("check")
        .arg(&neither)
        .assert()
        .code(3)
        .stdout(predicate::str::contains("boat").and(predicate::str::contains("engine")));
    tidewright()
        .arg("check")
        .arg(dir.path().join("missing.toml"))
        .assert()
        .code(3)
        .stdout(predicate::str::contains("cannot read"));
    let garbage = dir.path().join("garbage.toml");
    std::fs::write(&garbage, "[[[ not toml").unwrap();
    tidewright().arg("check").arg(&garbage).assert().code(3);
}

#[test]
fn pitch_recommends_the_right_side_of_the_current_pitch() {
    let (_dir, store) = demo_store();
    let doc = run_json(&["--profiles", &store, "pitch", "marram", "--format", "json"]);
    let variants = doc["variants"].as_array().unwrap();
    assert_eq!(variants.len(), 3);
    for v in variants {
        for field in [
            "label",
            "current_pitch_m",
            "recommended_pitch_m",
            "change_m",
            "within_repitch_limit",
            "rpm_per_inch",
            "condition",
        ] {
            assert!(!v[field].is_null(), "{field} missing in {v}");
        }
        let change = v["change_m"].as_f64().unwrap();
        assert_close!(
            v["recommended_pitch_m"].as_f64().unwrap() - v["current_pitch_m"].as_f64().unwrap(),
            change,
            1e-9
        );
        // More pitch loads the engine more: fewer full-throttle rpm per inch added.
        assert!(v["rpm_per_inch"].as_f64().unwrap() < 0.0);
        // ±2 in re-pitch limit (common practice).
        assert_eq!(
            v["within_repitch_limit"].as_bool().unwrap(),
            change.abs() <= 0.0508 + 1e-12
        );
    }
    // The over-propped screw needs less pitch, the under-propped one more.
    assert!(variants[0]["change_m"].as_f64().unwrap() < 0.0);
    assert!(variants[2]["change_m"].as_f64().unwrap() > 0.0);
    let text = tidewright()
        .args(["--profiles", &store, "pitch", "marram"])
        .assert()
        .success();
    assert!(
        String::from_utf8_lossy(&text.get_output().stdout).contains("licensed marine surveyor")
    );
}

#[test]
fn trial_calibration_reduces_the_error_on_the_demo_trial_boat() {
    let (_dir, store) = demo_store();
    let doc = run_json(&["--profiles", &store, "trial", "pintle", "--format", "json"]);
    let (before, after) = (
        doc["rms_before_kn"].as_f64().unwrap(),
        doc["rms_after_kn"].as_f64().unwrap(),
    );
    assert!(after < before, "{before} → {after}");
    assert!(doc["resistance_factor"].as_f64().unwrap() > 0.0);
    let points = doc["points"].as_array().unwrap();
    assert!(!points.is_empty());
    assert!(
        points
            .iter()
            .all(|p| p["measured_kn"].is_f64() && p["predicted_kn"].is_f64())
    );
    // A boat without a log is a clear runtime error, not a panic.
    tidewright()
        .args(["--profiles", &store, "trial", "marram"])
        .assert()
        .code(1)
        .stderr(predicate::str::contains("sea-trial"));
}

#[test]
fn sweep_ranks_candidates() {
    let (_dir, store) = demo_store();
    let doc = run_json(&[
        "--profiles",
        &store,
        "sweep",
        "marram",
        "--over",
        "blades",
        "--values",
        "3,4",
        "--format",
        "json",
    ]);
    let candidates = doc["candidates"].as_array().unwrap();
    assert_eq!(candidates.len(), 2);
    assert!(candidates.iter().any(|c| c["rank"] == 1));
    tidewright()
        .args([
            "--profiles",
            &store,
            "sweep",
            "marram",
            "--over",
            "gear",
            "--values",
            "x",
        ])
        .assert()
        .code(2);
    tidewright()
        .args(["--profiles", &store, "sweep", "marram"])
        .assert()
        .success()
        .stdout(predicate::str::contains("rank"));
}

#[test]
fn export_writes_markdown_and_svg_that_parse_as_xml() {
    let (dir, store) = demo_store();
    let out = dir.path().join("export");
    tidewright()
        .args(["--profiles", &store, "export", "pintle", "--out"])
        .arg(&out)
        .assert()
        .success();
    let md = std::fs::read_to_string(out.join("report.md")).unwrap();
    for needle in [
        "# Repower report: Pintle",
        "Engine sheet",
        "Recommended screw",
        "Sea-trial calibration",
        "Caution",
        "power.svg",
    ] {
        assert!(md.contains(needle), "{needle} missing from the report");
    }
    for chart in ["power.svg", "speed.svg", "fuel.svg", "range.svg"] {
        let svg = std::fs::read_to_string(out.join(chart)).unwrap();
        let doc =
            roxmltree::Document::parse(&svg).unwrap_or_else(|e| panic!("{chart} is not XML: {e}"));
        assert_eq!(doc.root_element().tag_name().name(), "svg");
        assert!(
            svg.contains("current 450x290"),
            "{chart} legend names the variant"
        );
        assert!(!svg.contains("NaN"));
    }
    let power = std::fs::read_to_string(out.join("power.svg")).unwrap();
    assert!(power.contains("full load") && power.contains("rpm"));
    let speed = std::fs::read_to_string(out.join("speed.svg")).unwrap();
    assert!(
        speed.contains("sea trial"),
        "trial points on the speed chart"
    );
}

#[test]
fn terminal_ui_entry_points_do_not_panic() {
    let (_dir, store) = demo_store();
    // Without a terminal the UI cannot start; whatever it says, it must not panic.
    let assert = tidewright()
        .args(["--profiles", &store, "open", "marram"])
        .write_stdin("")
        .timeout(std::time::Duration::from_secs(10))
        .assert();
    assert!(!String::from_utf8_lossy(&assert.get_output().stderr).contains("panicked"));
}

/// The coarsest screw the loader accepts (P/D 2.0) on direct drive: the report never shows a
/// negative KQ or NaN, and since resistance rises at every speed (the continuation past the
/// methods) every rpm row is solved — past full load and past the method, and marked so —
/// instead of a solver bracket giving up.
#[test]
fn report_of_a_far_too_coarse_screw_solves_every_row_and_marks_it() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::create_dir_all(dir.path().join("boats")).unwrap();
    let demo = Store::at("/nonexistent");
    let marram = demo.load_boat("marram").unwrap().doc;
    let mut coarse = marram.clone();
    for v in &mut coarse.variants {
        v.pitch.value = 2.0 * v.diameter.value;
    }
    // Direct drive: at rated rpm this screw would push the hull past any speed searched.
    coarse.installation.gear_ratio = 1.0;
    coarse.engine = "quellan-qd90".into();
    let engine_text = demo.load_engine("quellan-qd90").unwrap().doc.to_toml();
    std::fs::create_dir_all(dir.path().join("engines")).unwrap();
    std::fs::write(dir.path().join("engines/quellan-qd90.toml"), engine_text).unwrap();
    std::fs::write(dir.path().join("boats/coarse.toml"), coarse.to_toml()).unwrap();
    let store = dir.path().display().to_string();
    let out = tidewright()
        .args([
            "--profiles",
            &store,
            "report",
            "coarse",
            "--variant",
            "flat 26x15",
        ])
        .assert()
        .success();
    let text = String::from_utf8_lossy(&out.get_output().stdout).to_string();
    assert!(
        !text.contains("NaN") && !text.contains("KQ came out"),
        "{text}"
    );
    assert!(!text.contains("not solved"), "{text}");
    assert!(!text.contains("does not reach"), "{text}");
    let rows: Vec<&str> = text
        .lines()
        .filter(|l| {
            l.trim_start().starts_with(|c: char| c.is_ascii_digit()) && l.contains("past full load")
        })
        .collect();
    assert!(rows.len() >= 10, "{text}");
    assert!(
        rows.iter()
            .all(|r| r.contains("unreliable: Fn ") && r.contains("speed/length ratio")),
        "{text}"
    );
    assert!(text.contains("Match: over-propped"), "{text}");
}

/// The pitch `pitch` recommends, written into the boat file as a variant, reads "matched" in
/// `report` with at least the default light-running margin (2 % of rated rpm, common practice).
#[test]
fn the_recommended_pitch_written_as_a_variant_reads_matched_in_the_report() {
    let (_demo_dir, demo_store) = demo_store();
    let demo = Store::at("/nonexistent");
    for (boat, engine) in [("marram", "quellan-qd90"), ("pintle", "brindmoor-3b40")] {
        let rec = run_json(&["--profiles", &demo_store, "pitch", boat, "--format", "json"]);
        let pitch = rec["variants"][0]["recommended_pitch_m"].as_f64().unwrap();
        let dir = tempfile::tempdir().unwrap();
        for sub in ["boats", "engines"] {
            std::fs::create_dir_all(dir.path().join(sub)).unwrap();
        }
        let mut doc = demo.load_boat(boat).unwrap().doc;
        doc.variants.truncate(1);
        doc.variants[0].pitch.value = pitch;
        doc.variants[0].label = "recommended".into();
        doc.active_variant = 0;
        std::fs::write(dir.path().join(format!("boats/{boat}.toml")), doc.to_toml()).unwrap();
        let engine_doc = demo.load_engine(engine).unwrap().doc;
        let rated = engine_doc.rated_rpm.value;
        std::fs::write(
            dir.path().join(format!("engines/{engine}.toml")),
            engine_doc.to_toml(),
        )
        .unwrap();
        let store = dir.path().display().to_string();
        let report = run_json(&["--profiles", &store, "report", boat, "--format", "json"]);
        let m = &report["variants"][0]["match"];
        assert_eq!(m["verdict"], "matched", "{boat}: {m}");
        let margin = m["rpm_margin"].as_f64().unwrap();
        assert!(margin >= 0.02 * rated - 1.0, "{boat}: margin {margin}");
    }
}
