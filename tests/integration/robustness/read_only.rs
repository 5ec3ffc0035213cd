//! Unsaved edits on a store that cannot be written: after SIGTERM, SIGHUP and a closed
//! terminal the recovery file goes to the user's state directory and the next open offers it
//! from there; with no place writable the program says so and exits non-zero.
//!
//! The store's `boats/` is made read-only with a read-only bind mount: permission bits do not
//! stop root, which these tests often run as. Where `mount` is not allowed the tests skip with
//! a message (the fallback itself is unit-tested in `tui::recovery` with injected failures).

use super::terminal::{Tmux, start_and_edit, temporaries, wait_gone};
use std::path::{Path, PathBuf};
use std::process::Command;

/// `dir` bind-mounted read-only onto itself, unmounted when dropped.
struct ReadOnlyMount {
    dir: PathBuf,
}

impl ReadOnlyMount {
    /// `Err` says why this machine cannot make one.
    fn new(dir: &Path) -> Result<Self, String> {
        let run = |args: &[&str]| -> Result<(), String> {
            let out = Command::new("mount")
                .args(args)
                .output()
                .map_err(|e| format!("mount: {e}"))?;
            if out.status.success() {
                Ok(())
            } else {
                Err(String::from_utf8_lossy(&out.stderr).trim().to_owned())
            }
        };
        let path = dir.to_str().ok_or("a path that is not UTF-8")?;
        run(&["--bind", path, path])?;
        let mount = Self {
            dir: dir.to_owned(),
        };
        run(&["-o", "remount,bind,ro", path])?;
        let probe = dir.join(".probe");
        if std::fs::write(&probe, b"x").is_ok() {
            let _ = std::fs::remove_file(&probe);
            return Err("the read-only bind mount still takes writes".into());
        }
        Ok(mount)
    }
}

impl Drop for ReadOnlyMount {
    fn drop(&mut self) {
        let _ = Command::new("umount").arg(&self.dir).status();
    }
}

/// The recovery files under `dir`, at any depth.
fn recovery_files(dir: &Path) -> Vec<PathBuf> {
    let mut found = Vec::new();
    let Ok(entries) = std::fs::read_dir(dir) else {
        return found;
    };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            found.extend(recovery_files(&path));
        } else if path.to_string_lossy().ends_with(".toml.recover") {
            found.push(path);
        }
    }
    found
}

/// `text` without line ends and spaces: a message wrapped by the terminal compares whole.
fn squeezed(text: &str) -> String {
    text.chars().filter(|c| !c.is_whitespace()).collect()
}

/// How the session is ended.
#[derive(Clone, Copy, Debug)]
enum End {
    Signal(&'static str),
    HangUp,
}

/// Opens marram with `state` as XDG_STATE_HOME, edits, makes `boats/` read-only, ends the
/// session by `end`; returns the screen after (for signals), the read-only mount, the boat
/// file and its content before. `None` when tmux or the mount is not available.
fn edit_then_end_read_only(
    name: &str,
    state: &Path,
    end: End,
) -> Option<(String, ReadOnlyMount, tempfile::TempDir, PathBuf, Vec<u8>)> {
    let env = format!("XDG_STATE_HOME='{}'", state.display());
    let (tmux, dir, path, before) = start_and_edit(name, &env)?;
    let boats = path.parent().unwrap().to_owned();
    let mount = match ReadOnlyMount::new(&boats) {
        Ok(mount) => mount,
        Err(why) => {
            println!("skipped: cannot make a read-only bind mount here: {why}");
            return None;
        }
    };
    let pid = tmux.program_pid();
    let screen = match end {
        End::Signal(signal) => {
            let sent = Command::new("kill")
                .args([format!("-{signal}"), pid.to_string()])
                .status()
                .unwrap();
            assert!(sent.success());
            tmux.wait_for(3.0, |t| t.contains("MODES"))
                .unwrap_or_else(|t| panic!("{name}: the program did not leave:\n{t}"))
        }
        End::HangUp => {
            tmux.run(&["kill-session", "-t", "main"]);
            wait_gone(pid, 3.0).expect("the program still runs 3 s after its terminal closed");
            String::new()
        }
    };
    Some((screen, mount, dir, path, before))
}

#[test]
fn on_a_read_only_store_sigterm_sighup_and_a_hang_up_keep_the_edits_in_the_state_dir() {
    for end in [End::Signal("TERM"), End::Signal("HUP"), End::HangUp] {
        let state = tempfile::tempdir().unwrap();
        let name = format!("ro-{end:?}")
            .to_lowercase()
            .replace(['(', ')', '"'], "");
        let Some((screen, mount, _dir, path, before)) =
            edit_then_end_read_only(&name, state.path(), end)
        else {
            return;
        };
        let kept = recovery_files(state.path());
        assert_eq!(kept.len(), 1, "{end:?}: {kept:?}\n{screen}");
        assert!(
            kept[0]
                .file_name()
                .unwrap()
                .to_string_lossy()
                .starts_with("marram-"),
            "{kept:?}"
        );
        assert_ne!(std::fs::read(&kept[0]).unwrap(), before, "{end:?}: no edit");
        assert_eq!(std::fs::read(&path).unwrap(), before);
        assert!(!tidewright::tui::recovery::beside(&path).exists());
        assert!(temporaries(path.parent().unwrap()).is_empty());
        if let End::Signal(_) = end {
            assert!(screen.contains("EXIT=0"), "{end:?}:\n{screen}");
            assert!(
                squeezed(&screen).contains(&squeezed(
                    "cannot be written; the unsaved edits are kept in"
                )),
                "{end:?}: nothing said where the edits went:\n{screen}"
            );
        }
        drop(mount);
    }
}

#[test]
fn the_next_open_offers_the_edits_kept_in_the_state_dir() {
    let state = tempfile::tempdir().unwrap();
    let Some((_, mount, dir, _, _)) =
        edit_then_end_read_only("ro-again", state.path(), End::Signal("TERM"))
    else {
        return;
    };
    let bin = env!("CARGO_BIN_EXE_tidewright");
    let command = format!(
        "XDG_STATE_HOME='{}' {bin} --profiles '{}' open marram; sleep 30",
        state.path().display(),
        dir.path().join("profiles").display()
    );
    let Some(again) = Tmux::start("ro-next", &command) else {
        return;
    };
    again
        .wait_for(8.0, |t| t.contains("Restore them"))
        .unwrap_or_else(|t| panic!("the next open does not offer the kept edits:\n{t}"));
    again.send("y");
    again
        .wait_for(3.0, |t| t.contains("restored") && t.contains("unsaved"))
        .unwrap_or_else(|t| panic!("y did not restore the edits:\n{t}"));
    drop(mount);
}

#[test]
fn with_no_place_to_keep_the_edits_the_program_says_so_and_exits_non_zero() {
    // A state directory under a regular file cannot be created, whoever runs the test.
    let blocker = tempfile::NamedTempFile::new().unwrap();
    let state = blocker.path().join("state");
    let Some((screen, mount, _dir, path, before)) =
        edit_then_end_read_only("ro-nowhere", &state, End::Signal("TERM"))
    else {
        return;
    };
    assert!(
        squeezed(&screen).contains(&squeezed("the unsaved edits could not be kept anywhere")),
        "{screen}"
    );
    assert!(screen.contains("EXIT=1"), "{screen}");
    assert_eq!(std::fs::read(&path).unwrap(), before);
    drop(mount);
}
