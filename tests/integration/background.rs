//! The long views (shortlist, sweep) solved off the event loop: the app's side through
//! `App::update` and `TestBackend`, the worker on its own, and the real binary in tmux with a
//! catalogue large enough that the progress line shows and Esc stops it.

use crate::tui::{start_session, tmux_on, wait_for};
use crossterm::event::{KeyCode, KeyEvent, KeyModifiers};
use ratatui::Terminal;
use ratatui::backend::TestBackend;
use tidewright::profile::Store;
use tidewright::study::progress::Progress;
use tidewright::study::shortlist::offers_from_store;
use tidewright::tui::analysis::{ViewData, ViewKind};
use tidewright::tui::app::{Action, App, Effect};
use tidewright::tui::ui;
use tidewright::tui::work::{Job, Report, Worker};

fn demo_store() -> Store {
    Store::at(std::env::temp_dir().join("tidewright-background-tests-no-store-here"))
}

/// The demo trawler as the terminal's loop opens it: long views go to a worker.
fn background_app() -> App {
    let mut app = tidewright::tui::open_app(&demo_store(), Some("marram")).expect("demo opens");
    app.background = true;
    app
}

fn key(app: &mut App, code: KeyCode) -> Option<Effect> {
    let action = app.action_for_key(&KeyEvent::new(code, KeyModifiers::NONE))?;
    app.update(action)
}

fn screen(app: &App, width: u16, height: u16) -> String {
    let mut terminal = Terminal::new(TestBackend::new(width, height)).unwrap();
    terminal.draw(|f| ui::render(app, f)).unwrap();
    let buf = terminal.backend().buffer().clone();
    (0..height)
        .map(|y| (0..width).map(|x| buf[(x, y)].symbol()).collect::<String>())
        .collect::<Vec<_>>()
        .join("\n")
}

/// Opens the shortlist as the loop would and returns the job `update` handed out.
fn ask_shortlist(app: &mut App) -> Job {
    assert_eq!(key(app, KeyCode::Char('S')), Some(Effect::LoadEngineSheets));
    let offers = offers_from_store(&demo_store(), None).expect("demo engine sheets");
    match app.update(Action::EngineSheets(offers)) {
        Some(Effect::Solve(job)) => *job,
        other => panic!("expected a solve for the worker, got {other:?}"),
    }
}

#[test]
fn the_shortlist_goes_to_the_worker_and_its_result_fills_the_view() {
    let mut app = background_app();
    let job = ask_shortlist(&mut app);
    assert_eq!(job.kind, ViewKind::Shortlist);
    let computing = app.computing.expect("a solve under way");
    assert_eq!((computing.id, computing.done), (job.id, 0));
    assert!(app.view.is_none());
    let text = screen(&app, 80, 24);
    assert!(text.contains("solving the shortlist"), "{text}");
    assert!(text.contains("Esc cancels"), "{text}");

    // Progress comes in; a stale job's is ignored.
    app.update(Action::Progress {
        id: job.id,
        done: 3,
        total: 11,
    });
    app.update(Action::Progress {
        id: job.id + 7,
        done: 9,
        total: 9,
    });
    let text = screen(&app, 80, 24);
    assert!(text.contains("3 / 11 candidates done"), "{text}");

    // Keys still work while it solves: the units toggle is handled at once.
    let units = app.units;
    key(&mut app, KeyCode::Char('m'));
    assert_ne!(app.units, units, "the units toggle was handled");

    let data = job.run(&Progress::new()).expect("not cancelled");
    assert!(
        app.update(Action::Solved(job.id, Box::new(data.clone())))
            .is_none()
    );
    assert!(app.computing.is_none());
    assert_eq!(app.view, Some(data));
    // The same list the inline solve gives (the CLI's and the headless screen's).
    let mut inline = tidewright::tui::open_app(&demo_store(), Some("marram")).unwrap();
    key(&mut inline, KeyCode::Char('S'));
    inline.update(Action::EngineSheets(
        offers_from_store(&demo_store(), None).unwrap(),
    ));
    assert_eq!(app.view, inline.view);
    let text = screen(&app, 120, 40);
    assert!(!text.contains("solving the shortlist"), "{text}");
}

#[test]
fn esc_cancels_the_solve_and_a_late_result_is_dropped() {
    let mut app = background_app();
    let job = ask_shortlist(&mut app);
    assert_eq!(key(&mut app, KeyCode::Esc), Some(Effect::CancelSolve));
    assert!(app.computing.is_none());
    assert!(app.view_kind().is_none(), "the view is closed");
    let status = app
        .status
        .as_ref()
        .map(|s| s.text.clone())
        .unwrap_or_default();
    assert!(status.contains("cancelled"), "{status}");
    let data = job.run(&Progress::new()).unwrap();
    app.update(Action::Solved(job.id, Box::new(data)));
    assert!(
        app.view.is_none(),
        "a cancelled solve's result is not shown"
    );
}

#[test]
fn an_edit_while_solving_asks_again_and_only_the_newest_result_counts() {
    let mut app = background_app();
    let first = ask_shortlist(&mut app);
    // Switch to the sweep view and back: each asks for a new solve.
    let sweep = match key(&mut app, KeyCode::Tab) {
        Some(Effect::Solve(job)) => *job,
        other => panic!("expected the sweep's solve, got {other:?}"),
    };
    assert_eq!(sweep.kind, ViewKind::Sweep);
    assert!(sweep.id > first.id);
    let stale = first.run(&Progress::new()).unwrap();
    app.update(Action::Solved(first.id, Box::new(stale)));
    assert!(app.view.is_none(), "the shortlist's late result is stale");
    let data = sweep.run(&Progress::new()).unwrap();
    app.update(Action::Solved(sweep.id, Box::new(data)));
    assert!(matches!(app.view, Some(ViewData::Sweep(_))));
}

#[test]
fn a_worker_reports_progress_then_its_result() {
    let mut app = background_app();
    let job = ask_shortlist(&mut app);
    let mut worker = Worker::start(job.clone());
    assert_eq!(worker.id(), job.id);
    // Polled as the loop polls it, until the result is in (no time limit asserted here).
    let data = loop {
        match worker.poll() {
            Some(Report::Done(data)) => break *data,
            Some(Report::Lost) => panic!("the worker ended without a result"),
            Some(Report::Progress(done, total)) => assert!(done <= total),
            None => std::thread::sleep(std::time::Duration::from_millis(5)),
        }
    };
    assert_eq!(Some(data), job.run(&Progress::new()));
    // A dropped worker stops at its next candidate: a cancelled count gives no view.
    let cancelled = Progress::new();
    cancelled.cancel();
    assert!(job.run(&cancelled).is_none());
    drop(Worker::start(job));
}

/// A made-up engine sheet for the tmux test's catalogue (never a demo sheet).
fn test_sheet(i: usize) -> String {
    let rated = 40.0 + 3.0 * i as f64;
    format!(
        "schema = 1\nname = \"Test Diesel {i:02}\"\nunits = \"metric\"\nrated_rpm = \"3000 rpm\"\n\
         idle_rpm = \"800 rpm\"\nfuel_density = \"0.84 kg/L\"\ngears = [1.5, 2.0, 2.5, 3.0]\n\
         full_load_power = [[\"1200 rpm\", \"{:.1} kW\"], [\"2000 rpm\", \"{:.1} kW\"], [\"3000 rpm\", \"{rated:.1} kW\"]]\n\n\
         [fuel]\nform = \"willans\"\nfull_load_sfc = \"240 g/kWh\"\nzero_load_fraction = 0.15\n",
        0.5 * rated,
        0.8 * rated
    )
}

#[test]
fn tmux_a_long_shortlist_shows_progress_keeps_keys_and_esc_cancels() {
    if std::process::Command::new("tmux")
        .arg("-V")
        .output()
        .is_err()
    {
        eprintln!("skipped: tmux is not installed (.ci/run installs it)");
        return;
    }
    let store = tempfile::tempdir().unwrap();
    let boats = store.path().join("boats");
    let engines = store.path().join("engines");
    std::fs::create_dir_all(&boats).unwrap();
    std::fs::create_dir_all(&engines).unwrap();
    let demo = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("profiles");
    std::fs::copy(demo.join("boats/marram.toml"), boats.join("marram.toml")).unwrap();
    for entry in std::fs::read_dir(demo.join("engines")).unwrap() {
        let entry = entry.unwrap();
        std::fs::copy(entry.path(), engines.join(entry.file_name())).unwrap();
    }
    // 300 candidates: long enough in a debug build for the progress line to be seen.
    for i in 0..75 {
        std::fs::write(
            engines.join(format!("test-diesel-{i:02}.toml")),
            test_sheet(i),
        )
        .unwrap();
    }
    let bin = env!("CARGO_BIN_EXE_tidewright");
    let session = format!("tidewright-background-{}", std::process::id());
    let command = format!(
        "{bin} --profiles '{}' open marram; sleep 30",
        store.path().display()
    );
    let _kill = start_session(&session, 100, 30, &command);
    wait_for(&session, 5.0, |t| {
        t.contains("Screw") && t.contains("At 7.0 kn")
    })
    .expect("the UI came up");
    tmux_on(&session, &["send-keys", "-t", &session, "S"]);
    // The count moves while the list is solved (or it finished first: then no line is left).
    let shown = wait_for(&session, 5.0, |t| {
        t.contains("candidates done") || t.contains("r ranks:")
    })
    .expect("the shortlist view opened");
    assert!(
        shown.contains("candidates done (Esc cancels)"),
        "the progress line is shown while the list is solved:\n{shown}"
    );
    // Keys are read while it solves: Esc closes the view and cancels the solve at once.
    tmux_on(&session, &["send-keys", "-t", &session, "Escape"]);
    let cancelled =
        wait_for(&session, 3.0, |t| t.contains("cancelled")).expect("Esc cancelled the solve");
    assert!(
        cancelled.contains("At 7.0 kn"),
        "back on the panes:\n{cancelled}"
    );
    // And the app goes on answering: the help overlay opens and closes.
    tmux_on(&session, &["send-keys", "-t", &session, "?"]);
    wait_for(&session, 3.0, |t| t.contains("Esc")).expect("help opens");
    tmux_on(&session, &["send-keys", "-t", &session, "Escape"]);
    tmux_on(&session, &["send-keys", "-t", &session, "q"]);
    wait_for(&session, 3.0, |t| !t.contains("At 7.0 kn")).expect("quit");
}
