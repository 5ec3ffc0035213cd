//! `trial BOAT --import FILE`: a synthetic log made from the demo boat Pintle with a known
//! calm-water resistance factor is imported, its runs found and paired, and the fit recovers
//! the factor; corrupted logs give a summary, a non-zero exit code and save nothing.
//!
//! The truth here is the generator's own input (invented data, never a reference): the checks
//! are that the import and the fit give back what was put in.

use assert_cmd::Command;
use serde_json::Value;
use tidewright::instruments::synth::{self, SynthLog, SynthSpec, TimePrefix};
use tidewright::profile::Store;
use tidewright::propulsion::solver::matching::point_at_engine_rpm;
use tidewright::study::Study;
use tidewright::units::KNOT_MPS;

/// The calm-water resistance factor the log is made with.
const TRUE_FACTOR: f64 = 1.2;

fn tidewright() -> Command {
    let mut cmd = Command::cargo_bin("tidewright").expect("binary built");
    cmd.env_remove("TIDEWRIGHT_PROFILES").env("NO_COLOR", "1");
    cmd
}

/// A synthetic trial of Pintle: its solved speed through water at each rpm with margins off and
/// the calm-water resistance ×1.2; three rpm steps out and back in a 0.3 m/s current, with GPS
/// noise and throttle transients.
pub fn pintle_log() -> SynthLog {
    pintle_log_with(TimePrefix::None)
}

/// [`pintle_log`] with `time_prefix` before each sentence.
pub fn pintle_log_with(time_prefix: TimePrefix) -> SynthLog {
    let study = Study::load(&Store::at("/nonexistent"), "pintle", None).unwrap();
    let mut vessel = study.uncalibrated_vessel().unwrap();
    vessel.resistance.margins.service = 0.0;
    vessel.resistance.margins.fouling = 0.0;
    vessel.resistance.margins.resistance_factor = TRUE_FACTOR;
    let index = vessel.active_variant;
    let system = vessel.system(index);
    let spec = SynthSpec {
        rpm_steps: vec![1400.0, 1900.0, 2400.0],
        time_prefix,
        ..SynthSpec::default()
    };
    synth::generate(
        &spec,
        |rpm| point_at_engine_rpm(&system, rpm).unwrap().speed,
        None,
    )
}

/// A store made by `init` in a temporary directory, and its Pintle file.
fn store() -> (tempfile::TempDir, String, std::path::PathBuf) {
    let dir = tempfile::tempdir().unwrap();
    let root = dir.path().join("store");
    tidewright()
        .args(["--profiles", root.to_str().unwrap(), "init"])
        .assert()
        .success();
    let boat = root.join("boats/pintle.toml");
    (dir, root.display().to_string(), boat)
}

fn write_log(dir: &tempfile::TempDir, name: &str, content: &[u8]) -> String {
    let path = dir.path().join(name);
    std::fs::write(&path, content).unwrap();
    path.display().to_string()
}

/// `trial pintle --import FILE --format json` on `store`, which must succeed: its document.
fn import_json(store: &str, file: &str) -> Value {
    let assert = tidewright()
        .args([
            "--profiles",
            store,
            "trial",
            "pintle",
            "--import",
            file,
            "--format",
            "json",
        ])
        .assert()
        .success();
    serde_json::from_slice(&assert.get_output().stdout).unwrap()
}

#[test]
fn import_recovers_each_run_pairs_them_and_fits_the_factor() {
    let (dir, store, _) = store();
    let log = pintle_log();
    let file = write_log(&dir, "trial.nmea", log.nmea.as_bytes());
    let doc = import_json(&store, &file);
    let runs = doc["log"]["runs"].as_array().unwrap();
    assert_eq!(runs.len(), log.legs.len(), "{}", doc["log"]);
    assert_eq!(doc["log"]["pairs"], 3);
    for (run, leg) in runs.iter().zip(&log.legs) {
        // The bound: each run's mean speed within 0.05 kn of the truth.
        let error_kn = run["sog_kn"].as_f64().unwrap() - leg.speed_over_ground / KNOT_MPS;
        assert!(error_kn.abs() < 0.05, "{run}: {error_kn:+.3} kn");
        assert!(run["paired_with"].is_u64(), "{run}");
    }
    let fit = &doc["fit"];
    let factor = fit["resistance_factor"].as_f64().unwrap();
    // The bound: the fitted factor within 1 % of the one the log was made with.
    assert!(
        (factor / TRUE_FACTOR - 1.0).abs() < 0.01,
        "fitted ×{factor:.4}, made with ×{TRUE_FACTOR}"
    );
    assert_eq!(fit["points"].as_array().unwrap().len(), 3);
    assert!(
        fit["points"]
            .as_array()
            .unwrap()
            .iter()
            .all(|p| p["two_way"] == true)
    );
}

#[test]
fn import_text_lists_the_runs_then_the_fit_and_save_writes_log_and_calibration() {
    let (dir, store, boat) = store();
    let log = pintle_log();
    let file = write_log(&dir, "trial.nmea", log.nmea.as_bytes());
    let assert = tidewright()
        .args(["--profiles", &store, "trial", "pintle", "--import", &file])
        .assert()
        .success();
    let text = String::from_utf8_lossy(&assert.get_output().stdout).into_owned();
    assert!(
        text.contains("Steady runs: 6 found, 3 reciprocal pair(s)"),
        "{text}"
    );
    assert!(text.contains("STW"), "{text}");
    assert!(text.contains("sea trial against the prediction"), "{text}");
    assert!(text.contains("--import"), "{text}");

    tidewright()
        .args([
            "--profiles",
            &store,
            "trial",
            "pintle",
            "--import",
            &file,
            "--save",
        ])
        .assert()
        .success();
    let saved = std::fs::read_to_string(&boat).unwrap();
    assert!(saved.contains("date = \"2023-11-14\""), "{saved}");
    assert_eq!(saved.matches("[[trial.run]]").count(), 6, "{saved}");
    assert!(saved.contains("[calibration]"), "{saved}");
    // The saved boat reads back and its log refits to the same factor.
    let refit = tidewright()
        .args(["--profiles", &store, "trial", "pintle", "--format", "json"])
        .assert()
        .success();
    let doc: Value = serde_json::from_slice(&refit.get_output().stdout).unwrap();
    let factor = doc["resistance_factor"].as_f64().unwrap();
    assert!((factor / TRUE_FACTOR - 1.0).abs() < 0.01, "{factor}");
}

/// Runs `trial pintle --import` on `content` with `--save`; returns (exit code, stdout, stderr)
/// and checks that the boat file is unchanged.
fn refused(name: &str, content: &[u8]) -> (i32, String, String) {
    let (dir, store, boat) = store();
    let before = std::fs::read(&boat).unwrap();
    let file = write_log(&dir, name, content);
    let output = tidewright()
        .args([
            "--profiles",
            &store,
            "trial",
            "pintle",
            "--import",
            &file,
            "--save",
        ])
        .output()
        .unwrap();
    assert_eq!(
        std::fs::read(&boat).unwrap(),
        before,
        "{name}: file changed"
    );
    assert!(
        !boat.with_extension("toml.bak").exists(),
        "{name}: backup made"
    );
    (
        output.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&output.stdout).into_owned(),
        String::from_utf8_lossy(&output.stderr).into_owned(),
    )
}

#[test]
fn unusable_logs_say_why_exit_non_zero_and_save_nothing() {
    // Empty.
    let (code, _, err) = refused("empty.nmea", b"");
    assert_eq!(code, 1);
    assert!(err.contains("the log is empty"), "{err}");

    // Binary bytes.
    let binary: Vec<u8> = (0..4096u32)
        .map(|i| (i.wrapping_mul(2_654_435_761) >> 13) as u8)
        .collect();
    let (code, out, err) = refused("binary.bin", &binary);
    assert_eq!(code, 1);
    assert!(out.contains("not text (binary bytes)"), "{out}");
    assert!(err.contains("no usable samples"), "{err}");

    // Every checksum wrong, a cut line and a made-up talker: nothing survives.
    let log = pintle_log();
    let damaged: Vec<String> = log
        .nmea
        .lines()
        .take(400)
        .enumerate()
        .map(|(i, line)| match i % 3 {
            0 => format!("{}00", &line[..line.len() - 2]),
            1 => line[..line.len() / 2].to_owned(),
            _ => format!("$QX{}", &line[3..]),
        })
        .collect();
    let (code, out, err) = refused("damaged.nmea", damaged.join("\n").as_bytes());
    assert_eq!(code, 1);
    assert!(out.contains("checksum mismatch"), "{out}");
    assert!(out.contains("no checksum (cut line?)"), "{out}");
    assert!(err.contains("no usable samples"), "{err}");

    // Legs of 40 s: nothing steady for the 60 s a run needs.
    let short = synth::generate(
        &SynthSpec {
            leg_s: 40.0,
            ..SynthSpec::default()
        },
        |rpm| 0.9 + 1.6e-3 * rpm,
        None,
    );
    let (code, out, err) = refused("short.nmea", short.nmea.as_bytes());
    assert_eq!(code, 1);
    assert!(out.contains("Rejected: 4 segment(s)"), "{out}");
    assert!(
        out.contains("too short") && out.contains("(--min-run sets the shortest run kept)"),
        "the rejection names the setting that lets it through:\n{out}"
    );
    assert!(err.contains("no steady run found"), "{err}");
}

#[test]
fn a_scatter_rejection_names_its_setting_and_that_setting_takes_the_runs() {
    // GPS speed scatter of 0.4 kn (1 kn = 1852/3600 m/s exactly), past the 0.25 kn default.
    let noisy = synth::generate(
        &SynthSpec {
            sog_noise: 0.4 * 1852.0 / 3600.0,
            ..SynthSpec::default()
        },
        |rpm| 0.9 + 1.6e-3 * rpm,
        None,
    );
    let (dir, store, _) = store();
    let file = write_log(&dir, "noisy.nmea", noisy.nmea.as_bytes());
    let run = |extra: &[&str]| {
        let mut args = vec!["--profiles", &store, "trial", "pintle", "--import", &file];
        args.extend_from_slice(extra);
        let out = tidewright().args(&args).output().unwrap();
        (
            out.status.code(),
            String::from_utf8_lossy(&out.stdout).into_owned(),
        )
    };
    let (_, out) = run(&[]);
    assert!(
        out.contains("speed not steady") && out.contains("(--max-scatter sets the limit)"),
        "{out}"
    );
    let (code, wide) = run(&["--max-scatter", "0.8"]);
    assert_eq!(code, Some(0), "{wide}");
    assert!(!wide.contains("speed not steady"), "{wide}");
    let (code, _) = run(&["--max-scatter", "-1"]);
    assert_eq!(code, Some(2), "a negative limit is a usage error");
}

#[test]
fn a_damaged_but_usable_log_is_fitted_with_its_bad_lines_counted() {
    let (dir, store, _) = store();
    let log = pintle_log();
    let text: Vec<String> = log
        .nmea
        .lines()
        .enumerate()
        .map(|(i, line)| {
            if i % 40 == 5 {
                line[..line.len() / 2].to_owned()
            } else {
                line.to_owned()
            }
        })
        .collect();
    let file = write_log(&dir, "cut.nmea", text.join("\n").as_bytes());
    let doc = import_json(&store, &file);
    assert!(
        doc["log"]["lines"]["bad"]["missing_checksum"]
            .as_u64()
            .unwrap()
            > 10
    );
    assert_eq!(doc["log"]["pairs"], 3);
    assert!(doc["fit"]["resistance_factor"].is_f64());
}

#[test]
fn a_bad_min_run_is_a_usage_error() {
    let (dir, store, _) = store();
    let file = write_log(&dir, "x.nmea", b"$GPRMC\n");
    tidewright()
        .args([
            "--profiles",
            &store,
            "trial",
            "pintle",
            "--import",
            &file,
            "--min-run",
            "-3",
        ])
        .assert()
        .code(2);
}

#[test]
fn a_csv_log_with_a_byte_order_mark_imports_detected_or_named() {
    let (dir, store, _) = store();
    let log = pintle_log();
    let mut marked = b"\xEF\xBB\xBF".to_vec();
    marked.extend_from_slice(log.csv.as_bytes());
    let file = write_log(&dir, "marked.csv", &marked);
    let detected = import_json(&store, &file);
    assert_eq!(detected["log"]["format"], "csv", "{}", detected["log"]);
    assert_eq!(detected["log"]["pairs"], 3);
    assert_eq!(detected["log"]["lines"]["bad"], serde_json::json!({}));
    let named = tidewright()
        .args(["--profiles", &store, "trial", "pintle", "--import", &file])
        .args(["--log-format", "csv", "--format", "json"])
        .assert()
        .success();
    let named: Value = serde_json::from_slice(&named.get_output().stdout).unwrap();
    assert_eq!(named["log"]["runs"], detected["log"]["runs"]);
}

#[test]
fn a_foreign_separator_and_out_of_range_values_are_named() {
    let rows = |separator: &str, rpm: &str| {
        let mut text = ["time_s", "rpm", "sog_kn", "cog_deg"].join(separator) + "\n";
        for i in 0..1200 {
            text += &[&i.to_string(), rpm, "6.5", "90"].join(separator);
            text += "\n";
        }
        text
    };
    let (code, _, err) = refused("pipes.csv", rows("|", "2000").as_bytes());
    assert_eq!(code, 1);
    assert!(err.contains("pipes.csv"), "{err}");
    assert!(
        err.contains("line 1: the CSV header's columns are separated by '|'"),
        "{err}"
    );
    assert!(err.contains("',', ';' or a tab"), "{err}");

    let (code, out, err) = refused("astern.csv", rows(",", "-2000").as_bytes());
    assert_eq!(code, 1);
    assert!(out.contains("1200 rpm out of range"), "{out}");
    assert!(
        err.contains("no usable engine rpm: 1200 line(s) gave an rpm out of range"),
        "{err}"
    );
    assert!(err.contains("line 2 first"), "{err}");
}
