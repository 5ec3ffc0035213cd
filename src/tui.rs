//! The dockside terminal UI: Vessel, Powerplant and Screw panes over one live solver, with
//! braille charts, a readout strip for the target speed, and the key table's help.
//!
//! The design follows one rule: keys become [`app::Action`]s through the table in [`keys`];
//! [`app::App::update`] is the only place state changes (each edit re-solves every variant,
//! [`solve`]); I/O comes back as an [`app::Effect`] that the thin loop here carries out; and
//! [`ui::render`] draws a pure function of the state.

pub mod analysis;
pub mod app;
pub mod chart;
pub mod edit;
pub mod fields;
pub mod issues;
pub mod keys;
pub mod live;
pub mod recovery;
pub mod solve;
pub mod theme;
pub mod ui;
pub mod work;

use crate::profile::store::save_boat_file;
use crate::profile::{FileStamp, Loaded, Origin, ProfileError, Store};
use crate::units::UnitSystem;
use anyhow::{Context, anyhow};
use app::{Action, App, Effect, Opened};
use crossterm::event::{self, Event};
use std::path::PathBuf;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

/// How long the loop blocks waiting for a key before it looks at the signal flag; the only
/// wake-up while idle (a few per second costs next to no CPU).
const SIGNAL_CHECK: Duration = Duration::from_millis(250);
/// How often, at most, the boat's file is compared with what was loaded.
const DISK_CHECK: Duration = Duration::from_secs(2);
/// How often the loop looks at a view being solved off the loop (a few times a frame).
const WORK_CHECK: Duration = Duration::from_millis(30);

/// Where the boat being edited is saved.
#[derive(Debug, Clone)]
enum SaveTarget {
    /// A boat of the store, by name.
    Store(String),
    /// A boat file opened by path.
    File(PathBuf),
    /// The read-only demo fleet.
    Demo,
}

/// The loop's own state: where files are, and the stamp of the boat's file at load/save.
struct Session {
    store: Store,
    target: SaveTarget,
    stamp: Option<FileStamp>,
    last_disk_check: Instant,
    /// The live instrument feed, polled without blocking.
    feed: Option<crate::instruments::feed::Feed>,
    /// The boat's name, for the demo's recovery file.
    name: String,
    /// The view being solved off the loop, if any.
    work: Option<work::Worker>,
}

impl Session {
    /// Where this boat's unsaved edits may be kept when the session ends without a save, in
    /// the order they are tried (beside the boat, then the state directory).
    fn recovery_places(&self) -> Vec<PathBuf> {
        recovery::places(self.path().as_deref(), &self.name)
    }

    /// The recovery file, if one is waiting to be offered (in any of its places).
    fn waiting_recovery(&self) -> Option<PathBuf> {
        recovery::find(&self.recovery_places())
    }

    /// Removes the recovery file from every place (after a save or a clean quit); a failure
    /// is only reported.
    fn drop_recovery(&self) -> Option<String> {
        let failures: Vec<String> = self
            .recovery_places()
            .iter()
            .filter_map(|path| {
                recovery::remove(path)
                    .err()
                    .map(|e| format!("cannot remove {}: {e}", path.display()))
            })
            .collect();
        (!failures.is_empty()).then(|| failures.join("; "))
    }

    fn path(&self) -> Option<PathBuf> {
        match &self.target {
            SaveTarget::Store(name) => self.store.boat_path(name).ok(),
            SaveTarget::File(path) => Some(path.clone()),
            SaveTarget::Demo => None,
        }
    }

    /// Whether the boat's file on disk differs from what was loaded or last saved.
    fn changed_on_disk(&self) -> bool {
        let (Some(path), Some(stamp)) = (self.path(), &self.stamp) else {
            return false;
        };
        match std::fs::read(&path) {
            Ok(bytes) => {
                let now = FileStamp::of(&bytes, None);
                now.len != stamp.len || now.hash != stamp.hash
            }
            Err(_) => true,
        }
    }
}

/// Opens `arg` (a boat name in the store or a path), or the store's first boat when `None`.
fn open(
    store: &Store,
    arg: Option<&str>,
) -> Result<(Opened, SaveTarget, Option<FileStamp>), ProfileError> {
    let name = match arg {
        Some(a) => a.to_string(),
        None => match store.list_boats()?.into_iter().next() {
            Some(first) => first,
            None => {
                return Err(ProfileError::NotFound {
                    kind: "boat",
                    name: "(any)".into(),
                    place: store
                        .root()
                        .map_or("the demo fleet".into(), |r| r.display().to_string()),
                });
            }
        },
    };
    let (boat, engine): (Loaded<_>, Loaded<_>) = store.resolve_boat(&name)?;
    let as_found_engine = store.as_found_engine_for(&boat)?.map(|e| e.doc);
    let (target, stamp) = match &boat.origin {
        Origin::Demo { .. } => (SaveTarget::Demo, None),
        Origin::File { path, stamp } => {
            if crate::profile::store::is_path_argument(&name) {
                (SaveTarget::File(path.clone()), Some(stamp.clone()))
            } else {
                (SaveTarget::Store(boat.name.clone()), Some(stamp.clone()))
            }
        }
    };
    let savable = !matches!(target, SaveTarget::Demo);
    Ok((
        Opened {
            name: boat.name,
            boat: boat.doc,
            engine: engine.doc,
            as_found_engine,
            savable,
        },
        target,
        stamp,
    ))
}

/// The app for `boat` of `store` (or its first boat), as the terminal UI starts it; for tests
/// and benchmarks that drive [`App::update`] and [`ui::draw`] without a terminal.
pub fn open_app(store: &Store, boat: Option<&str>) -> Result<App, ProfileError> {
    let (opened, _, _) = open(store, boat)?;
    let units = opened.boat.units;
    Ok(App::new(opened, units, theme::Theme::plain()))
}

/// The terminal UI's first screen for `boat` of `store` drawn once, `width` × `height` cells, as
/// text lines without a terminal (`tidewright screen`: a smoke test on a machine or emulator
/// with no terminal, and a look at the layout from a script).
pub fn draw_headless(
    store: &Store,
    boat: Option<&str>,
    units: Option<UnitSystem>,
    width: u16,
    height: u16,
) -> anyhow::Result<String> {
    use ratatui::{Terminal, backend::TestBackend};
    let (opened, _, _) = open(store, boat).context("opening the boat")?;
    let units = units.unwrap_or(opened.boat.units);
    let app = App::new(opened, units, theme::Theme::plain());
    let mut terminal = Terminal::new(TestBackend::new(width, height))?;
    terminal.draw(|frame| ui::render(&app, frame))?;
    let buf = terminal.backend().buffer();
    let mut text = String::new();
    for y in 0..height {
        let row: String = (0..width)
            .map(|x| buf[(x, y)].symbol().replace('\u{a0}', " "))
            .collect();
        text.push_str(row.trim_end());
        text.push('\n');
    }
    Ok(text)
}

/// Runs the terminal UI on `store`, opening `boat` (a name in the store or a path to a boat
/// file), or the store's first boat — the embedded demo fleet's when the store does not exist.
/// `units` sets the display units at start; `None` uses the units the boat's file is written in.
pub fn run(store: &Store, boat: Option<&str>, units: Option<UnitSystem>) -> anyhow::Result<()> {
    run_with_feed(store, boat, units, None)
}

/// [`run`] with a live instrument feed from `feed` (address text and source) shown under the
/// readout and captured into the sea-trial view.
pub fn run_with_feed(
    store: &Store,
    boat: Option<&str>,
    units: Option<UnitSystem>,
    feed: Option<(String, crate::instruments::feed::FeedSource)>,
) -> anyhow::Result<()> {
    let (opened, target, stamp) = open(store, boat).context("opening the boat")?;
    let units = units.unwrap_or(opened.boat.units);
    let name = opened.name.clone();
    let mut app = App::new(opened, units, theme::Theme::from_env());
    // This loop has a worker for the long views (src/tui/work.rs).
    app.background = true;
    let mut session = Session {
        store: store.clone(),
        target,
        stamp,
        last_disk_check: Instant::now(),
        feed: None,
        name,
        work: None,
    };
    if let Some((text, source)) = feed {
        app.update(Action::LiveStarted(text));
        session.feed = Some(crate::instruments::feed::Feed::start(
            source,
            Default::default(),
        ));
    }
    if let Some(path) = session.waiting_recovery() {
        app.update(Action::RecoveryFound(path.display().to_string()));
    }

    // SIGTERM and SIGHUP (a dropped SSH link) set a flag; the loop sees it within
    // SIGNAL_CHECK, writes unsaved edits to the recovery file and leaves. The boat's own file
    // is never written on the way out.
    let stop = Arc::new(AtomicBool::new(false));
    for signal in [signal_hook::consts::SIGTERM, signal_hook::consts::SIGHUP] {
        signal_hook::flag::register(signal, Arc::clone(&stop))
            .context("installing the signal handler")?;
    }
    // A resize comes as SIGWINCH, not as terminal input: its own flag asks for a redraw.
    let resized = Arc::new(AtomicBool::new(false));
    signal_hook::flag::register(signal_hook::consts::SIGWINCH, Arc::clone(&resized))
        .context("installing the signal handler")?;
    let pending = Arc::new(Mutex::new(None));
    let alive = Arc::new(AtomicBool::new(true));
    watch_for_a_stuck_loop(Arc::clone(&pending), Arc::clone(&alive));
    // `init` installs a panic hook that restores the terminal before the default hook prints.
    let mut terminal = ratatui::try_init().context("setting up the terminal (the terminal UI needs an interactive terminal; `tidewright --help` lists the headless commands)")?;
    let input = TerminalInput::open();
    let flags = Flags {
        stop: &stop,
        resized: &resized,
    };
    let ended = event_loop(
        &mut terminal,
        &mut app,
        &mut session,
        flags,
        &input,
        &pending,
    );
    alive.store(false, Ordering::Relaxed);
    match ended {
        Ok(Ended::Quit) => {
            ratatui::restore();
            if let Some(why) = session.drop_recovery() {
                eprintln!("tidewright: {why}");
            }
            Ok(())
        }
        Ok(Ended::Dropped) => {
            let kept = keep_unsaved(&app, &session);
            // The terminal may be gone: restoring it can only fail, and printing that failure
            // to a closed stderr would panic, so the error is dropped.
            let _ = ratatui::try_restore();
            report_kept(kept, &session)
        }
        Err(e) => {
            let kept = keep_unsaved(&app, &session);
            let _ = ratatui::try_restore();
            report_kept(kept, &session)?;
            Err(e)
        }
    }
}

/// Writes the unsaved edits, if any, to the first recovery place that takes them: the place
/// (`None` when there was nothing unsaved), or why no place did.
fn keep_unsaved(app: &App, session: &Session) -> Result<Option<PathBuf>, String> {
    if !app.dirty() {
        return Ok(None);
    }
    recovery::write_first(
        &session.recovery_places(),
        &app.doc.boat.to_toml(),
        recovery::write_text,
    )
    .map(Some)
}

/// Says on stderr where the edits went when it was not beside the boat, and makes a loss an
/// error (a non-zero exit). Written with `writeln!`, whose failure on a gone terminal is
/// dropped: `eprintln!` would panic there.
fn report_kept(kept: Result<Option<PathBuf>, String>, session: &Session) -> anyhow::Result<()> {
    use std::io::Write;
    let first = session.recovery_places().into_iter().next();
    match kept {
        Ok(Some(path)) if Some(&path) != first.as_ref() && session.path().is_some() => {
            let _ = writeln!(
                std::io::stderr(),
                "tidewright: the boat's folder cannot be written; the unsaved edits are kept in {}",
                path.display()
            );
            Ok(())
        }
        Ok(_) => Ok(()),
        Err(why) => Err(anyhow!(
            "the unsaved edits could not be kept anywhere: {why}"
        )),
    }
}

/// How the event loop ended.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Ended {
    /// The user quit.
    Quit,
    /// The terminal hung up or reads failed, or SIGHUP/SIGTERM came.
    Dropped,
}

/// What waiting on the terminal found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Input {
    /// Bytes to read.
    Ready,
    /// Nothing within the time.
    Timeout,
    /// The terminal hung up (a dropped link, a closed terminal) or the wait failed.
    HungUp,
}

/// The terminal's input, watched with poll(2) before crossterm reads it: crossterm's reader
/// spins without returning once a terminal reads EOF or EIO (it retries a zero-byte read
/// forever), so the hang-up is seen here first and crossterm is never asked again.
struct TerminalInput {
    /// `/dev/tty` when standard input is not the terminal (crossterm reads it then too).
    tty: Option<std::fs::File>,
}

impl TerminalInput {
    fn open() -> Self {
        use std::io::IsTerminal;
        let tty = if std::io::stdin().is_terminal() {
            None
        } else {
            std::fs::File::open("/dev/tty").ok()
        };
        Self { tty }
    }

    fn wait(&self, timeout: Duration) -> Input {
        match &self.tty {
            Some(file) => wait_on(file, timeout),
            None => wait_on(&std::io::stdin(), timeout),
        }
    }
}

/// Waits up to `timeout` for `fd` to be readable or hung up.
fn wait_on(fd: &impl std::os::fd::AsFd, timeout: Duration) -> Input {
    use rustix::event::{PollFd, PollFlags, Timespec, poll};
    let mut fds = [PollFd::new(fd, PollFlags::IN)];
    let time = Timespec {
        tv_sec: timeout.as_secs() as _,
        tv_nsec: timeout.subsec_nanos() as _,
    };
    match poll(&mut fds, Some(&time)) {
        Ok(0) => Input::Timeout,
        Ok(_) => {
            let got = fds[0].revents();
            if got.intersects(PollFlags::HUP | PollFlags::ERR | PollFlags::NVAL) {
                Input::HungUp
            } else {
                Input::Ready
            }
        }
        Err(rustix::io::Errno::INTR) => Input::Timeout,
        Err(_) => Input::HungUp,
    }
}

/// How often the watchdog of [`watch_for_a_stuck_loop`] looks.
const WATCHDOG_PERIOD: Duration = Duration::from_millis(500);
/// How long the loop may take to leave after the terminal hung up before the watchdog ends it.
const STOP_GRACE: Duration = Duration::from_secs(1);

/// The recovery file's places and the unsaved document's text, kept current by the loop for
/// the watchdog.
type Pending = Arc<Mutex<Option<(Vec<PathBuf>, BoatDocText)>>>;
/// A boat document written out as its TOML text.
type BoatDocText = String;

/// A backstop for the one case the loop cannot see: a hang-up in the instant between the
/// poll and crossterm's read, which leaves crossterm spinning. When the terminal has hung up
/// and the loop has not left [`STOP_GRACE`] later, the watchdog writes the recovery file and
/// ends the program. It starts no process and touches no terminal.
fn watch_for_a_stuck_loop(pending: Pending, alive: Arc<AtomicBool>) {
    std::thread::spawn(move || {
        let input = TerminalInput::open();
        let mut hung_up: Option<Instant> = None;
        while alive.load(Ordering::Relaxed) {
            std::thread::sleep(WATCHDOG_PERIOD);
            if input.wait(Duration::ZERO) == Input::HungUp {
                hung_up.get_or_insert_with(Instant::now);
            }
            if hung_up.is_some_and(|at| at.elapsed() >= STOP_GRACE) && alive.load(Ordering::Relaxed)
            {
                let mut lost = false;
                if let Ok(guard) = pending.lock()
                    && let Some((places, text)) = guard.as_ref()
                    && let Err(why) = recovery::write_first(places, text, recovery::write_text)
                {
                    use std::io::Write;
                    let _ = writeln!(
                        std::io::stderr(),
                        "tidewright: the unsaved edits could not be kept anywhere: {why}"
                    );
                    lost = true;
                }
                // 128 + SIGHUP: the terminal hung up; 1 when the edits are lost as well.
                std::process::exit(if lost { 1 } else { 129 });
            }
        }
    });
}

/// The flags the signal handlers set.
#[derive(Clone, Copy)]
struct Flags<'a> {
    /// SIGTERM or SIGHUP came.
    stop: &'a AtomicBool,
    /// SIGWINCH came: the terminal changed size.
    resized: &'a AtomicBool,
}

fn event_loop(
    terminal: &mut ratatui::DefaultTerminal,
    app: &mut App,
    session: &mut Session,
    flags: Flags,
    input: &TerminalInput,
    pending: &Pending,
) -> anyhow::Result<Ended> {
    if terminal.draw(|frame| ui::render(app, frame)).is_err() {
        return Ok(Ended::Dropped);
    }
    // Debug builds only: a panic on demand, so that the robustness tests can prove in tmux
    // that the terminal is restored after one (tests/integration/robustness/terminal.rs).
    #[cfg(debug_assertions)]
    if std::env::var_os("TIDEWRIGHT_PANIC_AFTER_DRAW").is_some() {
        panic!("panic requested by TIDEWRIGHT_PANIC_AFTER_DRAW after the first draw");
    }
    while !flags.stop.load(Ordering::Relaxed) {
        let mut redraw = flags.resized.swap(false, Ordering::Relaxed);
        // While a view is solved off the loop, its progress is looked at a few times a frame.
        let wait = if session.work.is_some() {
            WORK_CHECK
        } else {
            SIGNAL_CHECK
        };
        match input.wait(wait) {
            Input::HungUp => return Ok(Ended::Dropped),
            Input::Timeout => {}
            Input::Ready => {
                // Every event crossterm has read is handled now: one read of the terminal can
                // hold several keys, and the terminal will not wake the poll for them again.
                // A read error is a terminal gone bad: leave at once rather than retry.
                loop {
                    match event::poll(Duration::ZERO) {
                        Ok(true) => {}
                        Ok(false) => break,
                        Err(_) => return Ok(Ended::Dropped),
                    }
                    let Ok(event) = event::read() else {
                        return Ok(Ended::Dropped);
                    };
                    let action = match event {
                        Event::Key(key) => app.action_for_key(&key),
                        Event::Resize(..) => Some(Action::Resize),
                        _ => None,
                    };
                    let Some(action) = action else { continue };
                    let mut effect = app.update(action);
                    while let Some(e) = effect.take() {
                        if e == Effect::Quit {
                            return Ok(Ended::Quit);
                        }
                        let reply = carry_out(e, session);
                        effect = app.update(reply);
                    }
                    redraw = true;
                }
                note_pending(app, session, pending);
            }
        }
        if let Some(worker) = session.work.as_mut()
            && let Some(report) = worker.poll()
        {
            let id = worker.id();
            let action = match report {
                work::Report::Progress(done, total) => Action::Progress { id, done, total },
                work::Report::Done(data) => Action::Solved(id, data),
                work::Report::Lost => Action::SolveLost(id),
            };
            if !matches!(action, Action::Progress { .. }) {
                session.work = None;
            }
            app.update(action);
            redraw = true;
        }
        // The feed's thread queues what it read; taking it never blocks.
        if let Some(events) = session.feed.as_ref().map(|f| f.drain())
            && !events.is_empty()
        {
            app.update(Action::Feed(events));
            redraw = true;
        }
        // On the timer too, so that a change by another program shows without a key press.
        if session.last_disk_check.elapsed() >= DISK_CHECK {
            session.last_disk_check = Instant::now();
            if !app.changed_on_disk && session.changed_on_disk() {
                app.update(Action::FileChanged);
                redraw = true;
            }
        }
        if redraw && terminal.draw(|frame| ui::render(app, frame)).is_err() {
            return Ok(Ended::Dropped);
        }
    }
    Ok(Ended::Dropped)
}

/// Keeps the watchdog's copy of the unsaved document current.
fn note_pending(app: &App, session: &Session, pending: &Pending) {
    let next = if app.dirty() {
        Some((session.recovery_places(), app.doc.boat.to_toml()))
    } else {
        None
    };
    if let Ok(mut guard) = pending.lock() {
        *guard = next;
    }
}

/// Carries out one effect and reports back as an action.
fn carry_out(effect: Effect, session: &mut Session) -> Action {
    let failed = |what: &str, e: &dyn std::fmt::Display| Action::Failed(format!("{what}: {e}"));
    match effect {
        Effect::Save { boat, overwrite } => {
            let result = match &session.target {
                SaveTarget::Store(name) => {
                    session
                        .store
                        .save_boat(name, &boat, session.stamp.as_ref(), overwrite)
                }
                SaveTarget::File(path) => {
                    save_boat_file(path, &boat, session.stamp.as_ref(), overwrite)
                }
                SaveTarget::Demo => {
                    return failed("not saved", &anyhow!("the demo fleet is read-only"));
                }
            };
            match result {
                Ok(saved) => {
                    session.stamp = Some(saved.stamp);
                    // The edits are in the boat's file now: nothing is left to recover.
                    let _ = session.drop_recovery();
                    let backup = saved
                        .backup
                        .map(|b| format!(" (previous kept as {})", b.display()))
                        .unwrap_or_default();
                    Action::Saved(format!("{}{backup}", saved.path.display()))
                }
                Err(ProfileError::ChangedOnDisk { .. }) => Action::SaveConflict,
                Err(e) => failed("not saved", &e),
            }
        }
        Effect::ListBoats => match session.store.list_boats() {
            Ok(list) => Action::BoatList(list),
            Err(e) => failed("cannot list the boats", &e),
        },
        Effect::ListEngines => match session.store.list_engines() {
            Ok(list) => Action::EngineList(list),
            Err(e) => failed("cannot list the engine sheets", &e),
        },
        // Only the sheets are read here; the view solves its shortlist from them in update.
        Effect::LoadEngineSheets => {
            match crate::study::shortlist::offers_from_store(&session.store, None) {
                Ok(offers) => Action::EngineSheets(offers),
                Err(e) => Action::Failed(format!("no shortlist: {e:#}")),
            }
        }
        Effect::OpenBoat(name) => match open(&session.store, Some(&name)) {
            Ok((opened, target, stamp)) => {
                session.target = target;
                session.stamp = stamp;
                session.name = opened.name.clone();
                Action::BoatOpened(Box::new(opened))
            }
            Err(e) => failed(&format!("cannot open {name}"), &e),
        },
        Effect::LoadEngine(name) => match session.store.load_engine(&name) {
            Ok(loaded) => Action::EngineLoaded(Box::new(loaded.doc), loaded.name),
            Err(e) => failed(&format!("cannot load engine sheet {name}"), &e),
        },
        Effect::Quit => Action::Resize,
        Effect::Solve(job) => {
            // A new solve replaces the one under way, which stops at its next candidate.
            session.work = Some(work::Worker::start(*job));
            Action::Resize
        }
        Effect::CancelSolve => {
            session.work = None;
            Action::Resize
        }
        Effect::RestoreRecovery => {
            let Some(path) = session.waiting_recovery() else {
                return Action::Failed("no recovery file".into());
            };
            match recovery::read(&path) {
                Ok(boat) => Action::Recovered(Box::new(boat)),
                Err(why) => Action::Failed(format!("not restored: {why}")),
            }
        }
        Effect::DiscardRecovery => match session.drop_recovery() {
            None => Action::Notice("the recovery file was discarded".into()),
            Some(why) => Action::Failed(why),
        },
        Effect::Reload => {
            let again = match &session.target {
                SaveTarget::Store(name) => name.clone(),
                SaveTarget::File(path) => path.display().to_string(),
                SaveTarget::Demo => session.name.clone(),
            };
            match open(&session.store, Some(&again)) {
                Ok((opened, target, stamp)) => {
                    session.target = target;
                    session.stamp = stamp;
                    Action::Reloaded(Box::new(opened))
                }
                Err(e) => failed(&format!("cannot reload {again}"), &e),
            }
        }
    }
}
