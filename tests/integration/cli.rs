//! Integration tests: cli. Each runs the real binary with its profile store in a temporary
//! directory (or pointed at a directory that does not exist, so the embedded demo is used);
//! the user's own store is never touched.

use assert_cmd::Command;
use predicates::prelude::*;
use serde_json::Value;

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
