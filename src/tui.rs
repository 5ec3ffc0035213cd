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
pub mod solve;
pub mod theme;
pub mod ui;

use crate::profile::store::save_boat_file;
use crate::profile::{FileStamp, Loaded, Origin, ProfileError, Store};
use crate::units::UnitSystem;
use anyhow::{Context, anyhow};
use app::{Action, App, Effect, Opened};
use crossterm::event::{self, Event};
use std::path::PathBuf;
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::{Duration, Instant};

/// How long the loop blocks waiting for a key before it looks at the signal flag; the only
/// wake-up while idle (a few per second costs next to no CPU).
const SIGNAL_CHECK: Duration = Duration::from_millis(250);
/// How often, at most, the boat's file is compared with what was loaded.
const DISK_CHECK: Duration = Duration::from_secs(2);

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
}

impl Session {
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
    let mut app = App::new(opened, units, theme::Theme::from_env());
    let mut session = Session {
        store: store.clone(),
        target,
        stamp,
        last_disk_check: Instant::now(),
        feed: None,
    };
    if let Some((text, source)) = feed {
        app.update(Action::LiveStarted(text));
        session.feed = Some(crate::instruments::feed::Feed::start(
            source,
            Default::default(),
        ));
    }

    // SIGTERM and SIGHUP (a dropped SSH link) set a flag; the loop sees it within
    // SIGNAL_CHECK, leaves, and the terminal is restored below. Nothing is saved on the way
    // out, so no file can be left half-written.
    let stop = Arc::new(AtomicBool::new(false));
    for signal in [signal_hook::consts::SIGTERM, signal_hook::consts::SIGHUP] {
        signal_hook::flag::register(signal, Arc::clone(&stop))
            .context("installing the signal handler")?;
    }
    watch_for_a_stuck_loop(Arc::clone(&stop));
    // `init` installs a panic hook that restores the terminal before the default hook prints.
    let mut terminal = ratatui::try_init().context("setting up the terminal (the terminal UI needs an interactive terminal; `tidewright --help` lists the headless commands)")?;
    let result = event_loop(&mut terminal, &mut app, &mut session, &stop);
    ratatui::restore();
    result
}

/// How often the watchdog of [`watch_for_a_stuck_loop`] looks.
const WATCHDOG_PERIOD: Duration = Duration::from_millis(500);
/// How long the loop may take to leave after a stop signal before the watchdog ends it.
const STOP_GRACE: Duration = Duration::from_secs(1);

/// Ends the program when the event loop cannot: once the terminal is gone (a dropped SSH
/// link), crossterm's event poll spins without ever returning (crossterm issue #793), so the
/// loop sees neither the signal flag nor an error. The watchdog leaves for it when a stop was
/// asked more than [`STOP_GRACE`] ago or the terminal no longer answers. Nothing can be
/// half-written: saves are atomic and none is started on the way out.
fn watch_for_a_stuck_loop(stop: Arc<AtomicBool>) {
    std::thread::spawn(move || {
        let mut asked: Option<Instant> = None;
        loop {
            std::thread::sleep(WATCHDOG_PERIOD);
            if stop.load(Ordering::Relaxed) {
                asked.get_or_insert_with(Instant::now);
            }
            if crossterm::terminal::size().is_err() {
                // 128 + SIGHUP: the terminal hung up.
                std::process::exit(129);
            }
            if asked.is_some_and(|at| at.elapsed() >= STOP_GRACE) {
                ratatui::restore();
                // 128 + SIGTERM: stopped by a signal.
                std::process::exit(143);
            }
        }
    });
}

fn event_loop(
    terminal: &mut ratatui::DefaultTerminal,
    app: &mut App,
    session: &mut Session,
    stop: &AtomicBool,
) -> anyhow::Result<()> {
    terminal.draw(|frame| ui::render(app, frame))?;
    // Debug builds only: a panic on demand, so that the robustness tests can prove in tmux
    // that the terminal is restored after one (tests/integration/robustness/terminal.rs).
    #[cfg(debug_assertions)]
    if std::env::var_os("TIDEWRIGHT_PANIC_AFTER_DRAW").is_some() {
        panic!("panic requested by TIDEWRIGHT_PANIC_AFTER_DRAW after the first draw");
    }
    while !stop.load(Ordering::Relaxed) {
        let ready = event::poll(SIGNAL_CHECK)?;
        // The feed's thread queues what it read; taking it never blocks.
        if let Some(events) = session.feed.as_ref().map(|f| f.drain())
            && !events.is_empty()
        {
            app.update(Action::Feed(events));
            terminal.draw(|frame| ui::render(app, frame))?;
        }
        if !ready {
            continue;
        }
        let action = match event::read()? {
            Event::Key(key) => app.action_for_key(&key),
            Event::Resize(..) => Some(Action::Resize),
            _ => None,
        };
        let Some(action) = action else { continue };
        let mut effect = app.update(action);
        while let Some(e) = effect.take() {
            if e == Effect::Quit {
                return Ok(());
            }
            let reply = carry_out(e, session);
            effect = app.update(reply);
        }
        if session.last_disk_check.elapsed() >= DISK_CHECK {
            session.last_disk_check = Instant::now();
            if !app.changed_on_disk && session.changed_on_disk() {
                app.update(Action::FileChanged);
            }
        }
        terminal.draw(|frame| ui::render(app, frame))?;
    }
    Ok(())
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
        Effect::OpenBoat(name) => match open(&session.store, Some(&name)) {
            Ok((opened, target, stamp)) => {
                session.target = target;
                session.stamp = stamp;
                Action::BoatOpened(Box::new(opened))
            }
            Err(e) => failed(&format!("cannot open {name}"), &e),
        },
        Effect::LoadEngine(name) => match session.store.load_engine(&name) {
            Ok(loaded) => Action::EngineLoaded(Box::new(loaded.doc), loaded.name),
            Err(e) => failed(&format!("cannot load engine sheet {name}"), &e),
        },
        Effect::Quit => Action::Resize,
    }
}
