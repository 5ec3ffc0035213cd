//! The real binary's terminal UI in tmux: after a panic, SIGTERM, SIGHUP and a closed terminal
//! the terminal is back in its normal state (cooked mode with echo, main screen, visible
//! cursor, no mouse reporting), and the boat's file is untouched by unsaved edits.
//!
//! Each test runs its own tmux server (its own socket) and ends it, also on failure. Without
//! tmux the tests print why they skip.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};
use std::time::{Duration, Instant};
use tidewright::profile::Store;

/// Text the UI always shows in its readout strip once it is drawn.
const UI_DRAWN: &str = "Screw";
/// The environment variable that makes a debug build panic after its first draw.
const PANIC_VAR: &str = "TIDEWRIGHT_PANIC_AFTER_DRAW";

/// A tmux server of this test's own, ended when dropped.
pub(super) struct Tmux {
    socket: String,
}

impl Tmux {
    /// Starts a server with one 100×30 session running `command`; `None` when tmux is absent.
    pub(super) fn start(name: &str, command: &str) -> Option<Self> {
        if Command::new("tmux").arg("-V").output().is_err() {
            println!("skipped: tmux is not installed (.ci/run installs it)");
            return None;
        }
        let tmux = Self {
            socket: format!("tidewright-robust-{name}-{}", std::process::id()),
        };
        let started = tmux.run(&[
            "new-session",
            "-d",
            "-s",
            "main",
            "-x",
            "100",
            "-y",
            "30",
            command,
        ]);
        assert!(
            started.status.success(),
            "tmux: {}",
            String::from_utf8_lossy(&started.stderr)
        );
        Some(tmux)
    }

    pub(super) fn run(&self, args: &[&str]) -> Output {
        Command::new("tmux")
            .args(["-L", &self.socket, "-f", "/dev/null"])
            .args(args)
            .output()
            .expect("tmux runs")
    }

    /// The pane's text.
    fn screen(&self) -> String {
        String::from_utf8_lossy(&self.run(&["capture-pane", "-p", "-t", "main"]).stdout)
            .into_owned()
    }

    /// A tmux format variable of the pane, e.g. `alternate_on`.
    fn flag(&self, name: &str) -> String {
        let format = format!("#{{{name}}}");
        let out = self.run(&["display-message", "-p", "-t", "main", &format]);
        String::from_utf8_lossy(&out.stdout).trim().to_owned()
    }

    /// Waits up to `seconds` until the screen satisfies `done`; the last screen either way.
    pub(super) fn wait_for(
        &self,
        seconds: f64,
        done: impl Fn(&str) -> bool,
    ) -> Result<String, String> {
        let deadline = Instant::now() + Duration::from_secs_f64(seconds);
        loop {
            let text = self.screen();
            if done(&text) {
                return Ok(text);
            }
            if Instant::now() > deadline {
                return Err(text);
            }
            std::thread::sleep(Duration::from_millis(40));
        }
    }

    /// The pid of the program the pane's shell is running.
    pub(super) fn program_pid(&self) -> u32 {
        let shell: u32 = self.flag("pane_pid").parse().expect("pane pid");
        let children = std::fs::read_to_string(format!("/proc/{shell}/task/{shell}/children"))
            .expect("the shell's children");
        children
            .split_whitespace()
            .next()
            .and_then(|pid| pid.parse().ok())
            .expect("the shell runs the program")
    }

    pub(super) fn send(&self, keys: &str) {
        self.run(&["send-keys", "-t", "main", keys]);
    }
}

impl Drop for Tmux {
    fn drop(&mut self) {
        // The server may have left already (its last session killed); ask for the socket by
        // its usual place then, so that no stale socket file is left behind either.
        let reported = self.flag("socket_path");
        let _ = self.run(&["kill-server"]);
        let socket = if reported.is_empty() {
            let dir = std::env::var_os("TMUX_TMPDIR")
                .map_or_else(|| PathBuf::from("/tmp"), PathBuf::from);
            // This process's uid: the owner of its /proc entry.
            let uid = std::fs::metadata("/proc/self").ok().map(|m| {
                use std::os::unix::fs::MetadataExt;
                m.uid()
            });
            uid.map(|uid| dir.join(format!("tmux-{uid}")).join(&self.socket))
        } else {
            Some(PathBuf::from(reported))
        };
        if let Some(socket) = socket {
            let _ = std::fs::remove_file(socket);
        }
    }
}

/// A fresh store with the demo fleet, and the command line that opens its marram in the UI,
/// then reports the exit code and the terminal modes from the same terminal.
fn store_and_command(env: &str) -> (tempfile::TempDir, Store, String) {
    let dir = tempfile::tempdir().expect("temporary directory");
    let store = Store::at(dir.path().join("profiles"));
    store.init().expect("init the demo fleet");
    let bin = env!("CARGO_BIN_EXE_tidewright");
    let command = format!(
        "{env} {bin} --profiles '{}' open marram; echo \"EXIT=$?\"; \
         stty -a | tr ' ;' '\\n\\n' | grep -x -e '-\\?icanon' -e '-\\?echo' | tr '\\n' ' '; echo MODES; sleep 30",
        store.root().unwrap().display()
    );
    (dir, store, command)
}

/// Asserts that the terminal is back to normal after the program left, given the screen.
fn assert_restored(tmux: &Tmux, screen: &str, how: &str) {
    let modes = screen
        .lines()
        .find(|line| line.contains("MODES"))
        .unwrap_or_else(|| panic!("{how}: no mode line:\n{screen}"));
    assert!(
        modes.contains("icanon") && !modes.contains("-icanon"),
        "{how}: terminal left in raw mode: {modes}"
    );
    assert!(
        modes.split_whitespace().any(|m| m == "echo"),
        "{how}: echo left off: {modes}"
    );
    assert_eq!(
        tmux.flag("alternate_on"),
        "0",
        "{how}: still on the alternate screen"
    );
    assert_eq!(tmux.flag("cursor_flag"), "1", "{how}: cursor left hidden");
    assert_eq!(
        tmux.flag("mouse_any_flag"),
        "0",
        "{how}: mouse reporting left on"
    );
    assert!(
        !screen.contains("At 7.0 kn"),
        "{how}: the UI's screen is still shown:\n{screen}"
    );
}

/// The store's temporary files next to the boat.
pub(super) fn temporaries(boats: &Path) -> Vec<PathBuf> {
    std::fs::read_dir(boats)
        .unwrap()
        .map(|e| e.unwrap().path())
        .filter(|p| p.file_name().unwrap().to_string_lossy().ends_with(".tmp"))
        .collect()
}

/// Starts the UI, waits for it and makes one unsaved edit (a screw variant added).
pub(super) fn start_and_edit(
    name: &str,
    env: &str,
) -> Option<(Tmux, tempfile::TempDir, PathBuf, Vec<u8>)> {
    let (dir, store, command) = store_and_command(env);
    let tmux = Tmux::start(name, &command)?;
    if let Err(text) = tmux.wait_for(8.0, |t| t.contains(UI_DRAWN) && t.contains("kn")) {
        panic!("{name}: the UI did not come up:\n{text}");
    }
    assert_eq!(
        tmux.flag("alternate_on"),
        "1",
        "{name}: the UI uses the alternate screen"
    );
    let path = store.boat_path("marram").unwrap();
    let before = std::fs::read(&path).unwrap();
    tmux.send("a");
    if let Err(text) = tmux.wait_for(3.0, |t| t.contains("unsaved")) {
        panic!("{name}: the edit did not show:\n{text}");
    }
    Some((tmux, dir, path, before))
}

#[test]
fn the_terminal_is_restored_after_sigterm_and_sighup_and_nothing_is_half_written() {
    for signal in ["TERM", "HUP"] {
        let Some((tmux, _dir, path, before)) = start_and_edit(&signal.to_lowercase(), "") else {
            return;
        };
        let pid = tmux.program_pid();
        let sent = Command::new("kill")
            .args([format!("-{signal}"), pid.to_string()])
            .status()
            .unwrap();
        assert!(sent.success());
        let screen = tmux
            .wait_for(3.0, |t| t.contains("MODES"))
            .unwrap_or_else(|t| panic!("SIG{signal}: the program did not leave:\n{t}"));
        assert_restored(&tmux, &screen, &format!("SIG{signal}"));
        assert_eq!(
            std::fs::read(&path).unwrap(),
            before,
            "SIG{signal}: unsaved edit written"
        );
        assert!(temporaries(path.parent().unwrap()).is_empty());
        let kept = std::fs::read(tidewright::tui::recovery::beside(&path))
            .unwrap_or_else(|e| panic!("SIG{signal}: no recovery file: {e}"));
        assert_ne!(
            kept, before,
            "SIG{signal}: the recovery file lacks the edit"
        );
    }
}

#[test]
fn the_terminal_is_restored_after_a_panic() {
    if !cfg!(debug_assertions) {
        println!("skipped: only debug builds panic on request");
        return;
    }
    let (_dir, _store, command) = store_and_command(&format!("{PANIC_VAR}=1"));
    let Some(tmux) = Tmux::start("panic", &command) else {
        return;
    };
    let screen = tmux
        .wait_for(8.0, |t| t.contains("MODES"))
        .unwrap_or_else(|t| panic!("the program did not end after its panic:\n{t}"));
    assert!(
        screen.contains("EXIT=101"),
        "a panic exits with 101:\n{screen}"
    );
    // The panic message is printed on the restored main screen, readable.
    assert!(
        screen.contains(PANIC_VAR),
        "the panic message is not shown:\n{screen}"
    );
    assert_restored(&tmux, &screen, "panic");
}

/// Waits up to `seconds` for process `pid` to be gone (or a zombie); how long it took.
pub(super) fn wait_gone(pid: u32, seconds: f64) -> Option<Duration> {
    let started = Instant::now();
    while started.elapsed() < Duration::from_secs_f64(seconds) {
        let state = std::fs::read_to_string(format!("/proc/{pid}/stat")).unwrap_or_default();
        // A zombie has left already; only a live process counts.
        if state.is_empty() || state.split_whitespace().nth(2) == Some("Z") {
            return Some(started.elapsed());
        }
        std::thread::sleep(Duration::from_millis(10));
    }
    None
}

/// The CPU time process `pid` has used so far, in clock ticks (utime + stime).
fn cpu_ticks(pid: u32) -> u64 {
    let stat = std::fs::read_to_string(format!("/proc/{pid}/stat")).unwrap_or_default();
    // Fields after the command name in parentheses: state is 3rd, utime 14th, stime 15th.
    let after = stat.rsplit_once(')').map_or("", |(_, rest)| rest);
    let fields: Vec<&str> = after.split_whitespace().collect();
    let get = |i: usize| {
        fields
            .get(i)
            .and_then(|f| f.parse::<u64>().ok())
            .unwrap_or(0)
    };
    get(11) + get(12)
}

#[test]
fn a_closed_terminal_ends_the_program_at_once_and_keeps_the_edit_for_the_next_open() {
    // A dropped SSH link: the terminal itself goes away and the kernel hangs up the program.
    let Some((tmux, dir, path, before)) = start_and_edit("closed", "") else {
        return;
    };
    let recover = tidewright::tui::recovery::beside(&path);
    let pid = tmux.program_pid();
    let ticks_before = cpu_ticks(pid);
    tmux.run(&["kill-session", "-t", "main"]);
    let took = wait_gone(pid, 3.0).expect("the program still runs 3 s after its terminal closed");
    assert!(
        took < Duration::from_secs(1),
        "the program took {took:?} to leave after its terminal closed"
    );
    // No spin on the way out: a busy loop for the time it took would show as many ticks.
    let ticks_after = cpu_ticks(pid).max(ticks_before);
    println!(
        "closed terminal: gone after {took:?}, {} CPU ticks since the hang-up",
        ticks_after - ticks_before
    );
    assert!(
        ticks_after - ticks_before <= 20,
        "{} clock ticks of CPU after the hang-up",
        ticks_after - ticks_before
    );
    assert_eq!(
        std::fs::read(&path).unwrap(),
        before,
        "the boat's own file was written"
    );
    assert!(temporaries(path.parent().unwrap()).is_empty());
    let kept = std::fs::read(&recover).expect("the recovery file holds the unsaved edit");
    assert_ne!(kept, before, "the recovery file does not hold the edit");

    // The next open offers it; y restores it as an unsaved document.
    let bin = env!("CARGO_BIN_EXE_tidewright");
    let store = dir.path().join("profiles");
    let command = format!(
        "{bin} --profiles '{}' open marram; sleep 30",
        store.display()
    );
    let Some(again) = Tmux::start("closed-again", &command) else {
        return;
    };
    again
        .wait_for(8.0, |t| t.contains("Restore them"))
        .unwrap_or_else(|t| panic!("the next open does not offer the recovery file:\n{t}"));
    again.send("y");
    again
        .wait_for(3.0, |t| t.contains("restored") && t.contains("unsaved"))
        .unwrap_or_else(|t| panic!("y did not restore the edits:\n{t}"));
    // A clean quit (dropping the edits when asked) removes the recovery file.
    again.send("q");
    again
        .wait_for(3.0, |t| t.contains("Quit without saving"))
        .unwrap_or_else(|t| panic!("quit did not ask:\n{t}"));
    again.send("y");
    let deadline = Instant::now() + Duration::from_secs(3);
    while recover.exists() && Instant::now() < deadline {
        std::thread::sleep(Duration::from_millis(40));
    }
    assert!(!recover.exists(), "a clean quit left the recovery file");
}

#[test]
fn under_lc_all_c_every_cell_is_ascii_and_the_charts_still_draw() {
    let (dir, store, _) = store_and_command("");
    let bin = env!("CARGO_BIN_EXE_tidewright");
    let command = format!(
        "LC_ALL=C {bin} --profiles '{}' open marram; sleep 30",
        store.root().unwrap().display()
    );
    let Some(tmux) = Tmux::start("ascii", &command) else {
        return;
    };
    let screen = tmux
        .wait_for(8.0, |t| t.contains(UI_DRAWN) && t.contains("kn"))
        .unwrap_or_else(|t| panic!("the UI did not come up under LC_ALL=C:\n{t}"));
    let odd: String = screen.chars().filter(|c| !c.is_ascii()).collect();
    assert!(odd.is_empty(), "non-ASCII cells {odd:?} in\n{screen}");
    assert!(screen.contains("Power vs engine rpm"), "{screen}");
    // Borders are +-| and the curves are drawn with ASCII marks.
    assert!(screen.contains("+-") && screen.contains('|'), "{screen}");
    let marks = screen.matches(['.', 'o', 'x', '+', '#']).count();
    assert!(marks > 40, "only {marks} chart marks:\n{screen}");
    drop(dir);
}

#[test]
fn a_boat_with_thousands_of_variants_is_refused_at_once_with_the_reason() {
    let (_dir, store, _) = store_and_command("");
    let path = store.boat_path("marram").unwrap();
    let mut text = std::fs::read_to_string(&path).unwrap();
    for i in 0..2000 {
        text.push_str(&format!(
            "\n[[variant]]\nlabel = \"extra {i}\"\nblades = 3\ndiameter = \"26 in\"\npitch = \"18 in\"\narea_ratio = 0.55\n"
        ));
    }
    std::fs::write(
        store
            .boat_path("marram")
            .unwrap()
            .with_file_name("big.toml"),
        text,
    )
    .unwrap();
    let started = Instant::now();
    let out = Command::new(env!("CARGO_BIN_EXE_tidewright"))
        .args([
            "--profiles",
            &store.root().unwrap().display().to_string(),
            "open",
            "big",
        ])
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(!out.status.success(), "{err}");
    assert!(
        // The loader refuses it (profile::boat::MAX_VARIANTS) before the screen opens.
        err.contains("2003 [[variant]] tables") && err.contains("at most 64"),
        "{err}"
    );
    assert!(
        started.elapsed() < Duration::from_secs(3),
        "took {:?}",
        started.elapsed()
    );
}
