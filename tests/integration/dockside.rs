//! Integration tests: the rough edges a new user met (issue 14), each through the real binary
//! with its exit code and message: `new boat`/`new engine`, `check` by name and every blank at
//! once, display-name lookups with suggestions, non-UTF-8 files, an absurd displacement, gear
//! ratios written "2.5:1", `--step` and `--light-running` values, OS errors printed once, the
//! missing-margin note and the variant limit.

use crate::hardening::{fill, fills};
use assert_cmd::Command;
use std::path::{Path, PathBuf};
use tidewright::profile::Store;
use tidewright::units::UnitSystem;

/// The binary with the store taken only from `--profiles`.
fn tidewright() -> Command {
    let mut cmd = Command::cargo_bin("tidewright").expect("binary built");
    cmd.env_remove("TIDEWRIGHT_PROFILES").env("NO_COLOR", "1");
    cmd
}

/// A store in a fresh temporary directory filled with the demo fleet.
fn demo_store() -> (tempfile::TempDir, PathBuf) {
    let dir = tempfile::tempdir().unwrap();
    let root = dir.path().join("profiles");
    Store::at(&root).init().unwrap();
    (dir, root)
}

/// Runs the binary on `root` with `args`: (exit code, stdout, stderr).
fn run(root: &Path, args: &[&str]) -> (i32, String, String) {
    let output = tidewright()
        .arg("--profiles")
        .arg(root)
        .args(args)
        .output()
        .unwrap();
    (
        output.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&output.stdout).into_owned(),
        String::from_utf8_lossy(&output.stderr).into_owned(),
    )
}

/// Rewrites the demo boat marram with `edit` applied to its text.
fn edit_marram(root: &Path, edit: impl Fn(&str) -> String) -> PathBuf {
    let path = root.join("boats/marram.toml");
    let text = std::fs::read_to_string(&path).unwrap();
    std::fs::write(&path, edit(&text)).unwrap();
    path
}

#[test]
fn new_boat_and_engine_filled_as_sed_would_pass_check_and_report() {
    for (system, flag) in [
        (UnitSystem::Metric, "metric"),
        (UnitSystem::Imperial, "imperial"),
    ] {
        let dir = tempfile::tempdir().unwrap();
        let root = dir.path().join("profiles");
        let (code, out, err) = run(&root, &["new", "boat", "kittiwake", "--units", flag]);
        assert_eq!(code, 0, "{err}");
        let boat_path = root.join("boats/kittiwake.toml");
        assert!(out.contains(&boat_path.display().to_string()), "{out}");
        for key in [
            "engine",
            "hull.draft",
            "load.half.displacement",
            "variant[1].pitch",
        ] {
            assert!(out.lines().any(|l| l.trim() == key), "{key} in {out}");
        }
        let (code, out, err) = run(&root, &["new", "engine", "harbour-diesel", "--units", flag]);
        assert_eq!(code, 0, "{err}");
        assert!(out.contains("rated_rpm"), "{out}");
        // Before filling: every blank at once, the boat's `engine` key among them.
        let (code, out, _) = run(&root, &["check", "kittiwake"]);
        assert_eq!(code, 3, "{out}");
        assert!(out.contains(":13:10: engine: \"FILL IN\""), "{out}");
        assert!(out.matches("FILL IN").count() >= 10, "{out}");
        let (boat_fills, engine_fills) = fills(system);
        let engine_path = root.join("engines/harbour-diesel.toml");
        for (path, values) in [(&boat_path, &boat_fills), (&engine_path, &engine_fills)] {
            let text = std::fs::read_to_string(path).unwrap();
            std::fs::write(path, fill(&text, values)).unwrap();
        }
        let (code, out, err) = run(&root, &["check", "kittiwake", "harbour-diesel"]);
        assert_eq!(code, 0, "{out}{err}");
        assert_eq!(out.matches(": ok").count(), 2, "{out}");
        let (code, out, err) = run(&root, &["report", "kittiwake"]);
        assert_eq!(code, 0, "{err}");
        assert!(out.contains("kittiwake") && out.contains("rpm"), "{out}");
    }
}

#[test]
fn new_never_overwrites_and_refuses_unsafe_names() {
    let (_dir, root) = demo_store();
    let before = std::fs::read(root.join("boats/marram.toml")).unwrap();
    let (code, _, err) = run(&root, &["new", "boat", "marram"]);
    assert_eq!(code, 1);
    assert!(
        err.contains("marram.toml: already exists; not overwritten"),
        "{err}"
    );
    assert_eq!(
        std::fs::read(root.join("boats/marram.toml")).unwrap(),
        before
    );
    let (code, _, err) = run(&root, &["new", "engine", "../escape"]);
    assert_eq!(code, 1);
    assert!(err.contains("\"../escape\" is not allowed"), "{err}");
    assert!(!root.join("escape.toml").exists());
}

#[test]
fn display_names_are_found_and_near_misses_suggested() {
    let (_dir, root) = demo_store();
    edit_marram(&root, |t| {
        t.replace("name = \"Marram\"", "name = \"Sea Lark\"")
    });
    let (code, out, err) = run(&root, &["report", "sea lark"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.starts_with("Sea Lark"), "{out}");
    let (code, _, err) = run(&root, &["cruise", "Sea Lurk", "--rpm", "1800"]);
    assert_eq!(code, 1);
    assert!(err.contains("no boat named \"Sea Lurk\""), "{err}");
    assert!(err.contains("did you mean marram (Sea Lark)?"), "{err}");
    // A stem in capitals is the stem; a far-off name gets no made-up suggestion.
    assert_eq!(run(&root, &["report", "MARRAM"]).0, 0);
    let (code, _, err) = run(&root, &["report", "zzzzzz"]);
    assert_eq!(code, 1);
    assert!(!err.contains("did you mean"), "{err}");
}

#[test]
fn an_engine_written_as_its_file_name_and_a_boat_as_name_dot_toml_are_found() {
    let (_dir, root) = demo_store();
    edit_marram(&root, |t| {
        t.replace(
            "engine = \"quellan-qd90\"",
            "engine = \"quellan-qd90.toml\"",
        )
    });
    let (code, out, err) = run(&root, &["check", "marram"]);
    assert_eq!(code, 0, "{out}{err}");
    // Run from a directory with no marram.toml: the store's boat of that name.
    let (code, _, err) = run(&root, &["report", "marram.toml"]);
    assert_eq!(code, 0, "{err}");
}

#[test]
fn a_latin1_byte_is_named_with_its_line_and_column() {
    let (_dir, root) = demo_store();
    let path = root.join("boats/marram.toml");
    let text = std::fs::read(&path).unwrap();
    let at = text.windows(8).position(|w| w == b"\"Marram\"").unwrap() + 2;
    let mut latin1 = text.clone();
    latin1[at] = 0xE9; // "é" in ISO 8859-1, not UTF-8 on its own
    std::fs::write(&path, &latin1).unwrap();
    let line = text[..at].iter().filter(|&&b| b == b'\n').count() + 1;
    let column = at
        - text[..at]
            .iter()
            .rposition(|&b| b == b'\n')
            .map_or(0, |i| i + 1)
        + 1;
    let (code, out, _) = run(&root, &["check", path.to_str().unwrap()]);
    assert_eq!(code, 3);
    let want = format!(
        "{}:{line}:{column}: not UTF-8 text (byte 0xE9); save the file as UTF-8",
        path.display()
    );
    assert!(out.contains(&want), "{out}");
    let (code, _, err) = run(&root, &["report", "marram"]);
    assert_eq!(code, 1);
    assert!(
        err.contains(&want) && !err.contains("stream did not contain"),
        "{err}"
    );
}

#[test]
fn a_one_pound_displacement_names_its_field_and_a_readable_block_coefficient() {
    let (_dir, root) = demo_store();
    let path = edit_marram(&root, |t| t.replace("\"28400 lb\"", "\"1 lb\""));
    let (code, out, _) = run(&root, &["check", "marram"]);
    assert_eq!(code, 3, "{out}");
    // Cb = ∇/(L·B·T): 1 lb in sea water over a 36 ft × 12 ft × 2.8 ft box is about 1e-5,
    // far below any hull (0.35–0.85 for small craft, common practice).
    assert!(
        out.contains(&format!(
            "{}:23:16: load.light.displacement: \"1 lb\"",
            path.display()
        )),
        "{out}"
    );
    assert!(
        out.contains("block coefficient") && out.contains("expected 0.1–1"),
        "{out}"
    );
    let longest_digits = out
        .split(|c: char| !c.is_ascii_digit())
        .map(str::len)
        .max()
        .unwrap_or(0);
    assert!(longest_digits <= 8, "a long number in {out}");
    assert_eq!(
        tidewright::propulsion::hull::significant(1.527_3e-5),
        "0.0000153"
    );
    assert_eq!(tidewright::propulsion::hull::significant(1450.2), "1450");
}

#[test]
fn gear_ratios_read_as_text_and_the_wrong_way_round_is_refused_in_place() {
    let (_dir, root) = demo_store();
    let path = edit_marram(&root, |t| {
        t.replace("gear_ratio = 2.5", "gear_ratio = \"2.5:1\"")
    });
    let (code, out, _) = run(&root, &["check", "marram"]);
    assert_eq!(code, 0, "{out}");
    edit_marram(&root, |t| t.replace("\"2.5:1\"", "\"1:2.5\""));
    let (code, out, _) = run(&root, &["check", "marram"]);
    assert_eq!(code, 3);
    assert!(
        out.contains(&format!(
            "{}:49:14: installation.gear_ratio",
            path.display()
        )) && out.contains("wrong way round"),
        "{out}"
    );
}

#[test]
fn a_negative_step_is_refused_by_name_and_light_running_takes_a_unit() {
    let dir = tempfile::tempdir().unwrap();
    let demo = dir.path().join("none");
    let (code, _, err) = run(&demo, &["report", "marram", "--step", "-100"]);
    assert_eq!(code, 2);
    assert!(
        err.contains("--step: expected a positive rpm step, got -100"),
        "{err}"
    );
    assert!(!err.contains("unexpected argument"), "{err}");
    let plain = run(&demo, &["pitch", "marram", "--light-running", "100"]);
    let with_unit = run(&demo, &["pitch", "marram", "--light-running", "100rpm"]);
    assert_eq!(with_unit.0, 0, "{}", with_unit.2);
    assert_eq!(plain.1, with_unit.1);
    let (code, _, err) = run(&demo, &["pitch", "marram", "--light-running", "fast"]);
    assert_eq!(code, 2);
    assert!(
        err.contains("--light-running: expected an rpm margin"),
        "{err}"
    );
}

#[test]
fn an_os_error_is_printed_once() {
    let dir = tempfile::tempdir().unwrap();
    let missing = dir.path().join("nowhere/boat.toml");
    let (code, _, err) = run(dir.path(), &["report", missing.to_str().unwrap()]);
    assert_eq!(code, 1);
    assert_eq!(err.matches("No such file or directory").count(), 1, "{err}");
    assert!(err.contains(&missing.display().to_string()), "{err}");
}

#[test]
fn a_boat_without_resistance_margins_gets_one_note_in_check() {
    let (_dir, root) = demo_store();
    edit_marram(&root, |t| {
        t.replace("[resistance]\nservice_margin = 0.1\nfouling = 0.0\n", "")
    });
    let (code, out, _) = run(&root, &["check", "marram"]);
    assert_eq!(code, 0, "{out}");
    let notes: Vec<&str> = out.lines().filter(|l| l.contains(": note: ")).collect();
    assert_eq!(notes.len(), 1, "{out}");
    assert!(
        notes[0].contains("no service margin or fouling applied"),
        "{out}"
    );
    // The demo boat as shipped has its margins and no note.
    let (_dir, root) = demo_store();
    assert!(!run(&root, &["check", "marram"]).1.contains("note:"));
}

#[test]
fn more_variants_than_any_boat_needs_are_refused_at_the_first_extra() {
    let (_dir, root) = demo_store();
    let path = edit_marram(&root, |t| {
        let mut text = t.to_owned();
        for i in 0..62 {
            text.push_str(&format!(
                "\n[[variant]]\nlabel = \"v{i}\"\nblades = 3\ndiameter = \"26 in\"\npitch = \"18 in\"\narea_ratio = 0.55\n"
            ));
        }
        text
    });
    let text = std::fs::read_to_string(&path).unwrap();
    let line = text[..text.find("label = \"v61\"").unwrap()]
        .matches('\n')
        .count()
        + 1;
    let started = std::time::Instant::now();
    let (code, out, _) = run(&root, &["check", "marram"]);
    assert!(started.elapsed().as_secs() < 5);
    assert_eq!(code, 3);
    assert!(
        out.contains(&format!("{}:{line}:9: variant[65]", path.display()))
            && out.contains("65 [[variant]] tables; expected at most 64"),
        "{out}"
    );
}

/// `sweep --values` that cannot be read is refused (exit 2) instead of running the default list;
/// a diameter sweep refuses a list it would ignore; gear ratios may be written as on a gearbox
/// plate ("2.5:1").
#[test]
fn sweep_values_are_read_or_refused_never_ignored() {
    let demo = "/nonexistent-tidewright-store";
    for (over, values) in [
        ("gear", "banana"),
        ("blades", "three"),
        ("diameter", "24in"),
    ] {
        tidewright()
            .args([
                "--profiles",
                demo,
                "sweep",
                "marram",
                "--over",
                over,
                "--values",
                values,
            ])
            .assert()
            .code(2)
            .stderr(predicates::str::contains("--values"));
    }
    let out = tidewright()
        .args([
            "--profiles",
            demo,
            "sweep",
            "marram",
            "--over",
            "gear",
            "--values",
            "2.5:1,3:1",
        ])
        .assert()
        .success();
    let text = String::from_utf8_lossy(&out.get_output().stdout).to_string();
    assert!(text.contains("2.50") && text.contains("3.00"), "{text}");
    // Fuel per distance at the unit's own precision, so close rows differ (three figures).
    assert!(text.contains("US gal/nm"), "{text}");
}

/// `cruise` names the screw it answered for, and says when it is the file's active variant
/// (a save from the terminal UI can change which one that is).
#[test]
fn cruise_names_the_screw_it_answers_for() {
    let demo = "/nonexistent-tidewright-store";
    let out = tidewright()
        .args(["--profiles", demo, "cruise", "marram", "--speed", "7kn"])
        .assert()
        .success();
    let text = String::from_utf8_lossy(&out.get_output().stdout).to_string();
    assert!(
        text.starts_with("Screw re-pitched 26x17.5 (the boat file's active variant): "),
        "{text}"
    );
    let out = tidewright()
        .args([
            "--profiles",
            demo,
            "cruise",
            "marram",
            "--speed",
            "7kn",
            "--variant",
            "flat 26x15",
        ])
        .assert()
        .success();
    let text = String::from_utf8_lossy(&out.get_output().stdout).to_string();
    assert!(text.starts_with("Screw flat 26x15: "), "{text}");
}
