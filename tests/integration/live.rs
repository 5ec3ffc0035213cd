//! The live feed in the terminal UI: a test server on 127.0.0.1 streams a synthetic log of
//! Pintle; the app (fed through `App::update`, drawn on TestBackend) shows the live values
//! beside the model, captures the runs, survives the server closing, reconnects when it comes
//! back, and the captured runs become the trial log and the fit. Loopback only.

use std::io::Write;
use std::net::TcpListener;
use std::time::{Duration, Instant};

use crossterm::event::{KeyCode, KeyEvent, KeyModifiers};
use ratatui::Terminal;
use ratatui::backend::TestBackend;
use tidewright::instruments::feed::{Feed, FeedOptions, FeedSource, FeedState};
use tidewright::instruments::synth::TimePrefix;
use tidewright::profile::Store;
use tidewright::tui::app::{Action, App};
use tidewright::tui::ui;

fn screen(app: &App) -> String {
    let mut terminal = Terminal::new(TestBackend::new(140, 44)).unwrap();
    terminal.draw(|f| ui::render(app, f)).unwrap();
    let buffer = terminal.backend().buffer().clone();
    let mut text = String::new();
    for y in 0..buffer.area.height {
        for x in 0..buffer.area.width {
            text.push_str(buffer[(x, y)].symbol());
        }
        text.push('\n');
    }
    text
}

fn press(app: &mut App, c: char) {
    let key = KeyEvent::new(KeyCode::Char(c), KeyModifiers::NONE);
    if let Some(action) = app.action_for_key(&key) {
        app.update(action);
    }
}

/// Polls `feed` into `app` until `done` holds, at most 5 s.
fn pump(app: &mut App, feed: &Feed, done: impl Fn(&App) -> bool) -> bool {
    let start = Instant::now();
    while start.elapsed() < Duration::from_secs(5) {
        let events = feed.drain();
        if !events.is_empty() {
            app.update(Action::Feed(events));
        }
        if done(app) {
            return true;
        }
        std::thread::sleep(Duration::from_millis(20));
    }
    false
}

/// Serves `text` to one client on `listener`, then closes the connection and the listener.
fn serve_once(listener: TcpListener, text: String, hold: Duration) -> std::thread::JoinHandle<()> {
    std::thread::spawn(move || {
        if let Ok((mut stream, _)) = listener.accept() {
            let _ = stream.write_all(text.as_bytes());
            let _ = stream.flush();
            std::thread::sleep(hold);
        }
    })
}

#[test]
fn before_the_first_run_the_live_line_says_what_takes_one() {
    let log = super::trial_import::pintle_log_with(TimePrefix::Iso);
    // The first stretch of the first leg only: steady, but the rpm never changes after it.
    let first: String = log
        .nmea
        .lines()
        .take(120)
        .map(|l| format!("{l}\r\n"))
        .collect();
    let listener = TcpListener::bind("127.0.0.1:0").unwrap();
    let address = listener.local_addr().unwrap();
    let server = serve_once(listener, first, Duration::from_millis(50));
    let store = Store::at("/nonexistent");
    let mut app = tidewright::tui::open_app(&store, Some("pintle")).unwrap();
    let text = format!("tcp://{address}");
    app.update(Action::LiveStarted(text.clone()));
    let options = FeedOptions {
        reconnect_initial_s: 5.0,
        ..FeedOptions::default()
    };
    let feed = Feed::start(FeedSource::parse(&text).unwrap(), options);
    assert!(pump(&mut app, &feed, |a| {
        let live = a.live.as_ref().unwrap();
        matches!(live.state, FeedState::Reconnecting { .. }) && live.last.is_some()
    }));
    server.join().unwrap();
    assert!(app.live.as_ref().unwrap().captured.is_empty());
    let shown = screen(&app);
    assert!(
        shown.contains("0 runs captured (a run is taken when the rpm changes"),
        "{shown}"
    );
}

#[test]
fn live_feed_shows_values_captures_runs_survives_a_drop_and_reconnects() {
    let log = super::trial_import::pintle_log_with(TimePrefix::Iso);
    let lines: Vec<&str> = log.nmea.lines().collect();
    let half = lines.len() / 2;
    let first: String = lines[..half].iter().map(|l| format!("{l}\r\n")).collect();
    let second: String = lines[half..].iter().map(|l| format!("{l}\r\n")).collect();

    let listener = TcpListener::bind("127.0.0.1:0").unwrap();
    let address = listener.local_addr().unwrap();
    let server = serve_once(listener, first, Duration::from_millis(50));

    let store = Store::at("/nonexistent");
    let mut app = tidewright::tui::open_app(&store, Some("pintle")).unwrap();
    let text = format!("tcp://{address}");
    app.update(Action::LiveStarted(text.clone()));
    let options = FeedOptions {
        reconnect_initial_s: 0.2,
        reconnect_max_s: 0.4,
        ..FeedOptions::default()
    };
    let feed = Feed::start(FeedSource::parse(&text).unwrap(), options);

    // The first half: the values show, runs are captured, and the closed server is noticed.
    assert!(
        pump(&mut app, &feed, |a| {
            let live = a.live.as_ref().unwrap();
            live.captured.len() >= 2 && matches!(live.state, FeedState::Reconnecting { .. })
        }),
        "{:?}",
        app.live.as_ref().map(|l| (&l.state, l.captured.len()))
    );
    server.join().unwrap();
    let shown = screen(&app);
    assert!(shown.contains("Live: SOG"), "{shown}");
    assert!(shown.contains("rpm · heading"), "{shown}");
    assert!(shown.contains("· model "), "{shown}");
    assert!(shown.contains("error "), "{shown}");
    assert!(shown.contains("reconnecting"), "{shown}");
    let captured_first = app.live.as_ref().unwrap().captured.len();

    // The server comes back on the same port: the feed reconnects and the capture goes on.
    let listener = TcpListener::bind(address).unwrap();
    let server = serve_once(listener, second, Duration::from_millis(1500));
    assert!(
        pump(&mut app, &feed, |a| {
            let live = a.live.as_ref().unwrap();
            live.state == FeedState::Live && live.captured.len() == log.legs.len()
        }),
        "{:?}",
        app.live.as_ref().map(|l| (&l.state, l.captured.len()))
    );
    assert!(captured_first < log.legs.len());
    let live = app.live.as_ref().unwrap();
    for (c, leg) in live.captured.iter().zip(&log.legs) {
        // The same bound as the import: each run's mean speed within 0.05 kn of the truth.
        let error_kn =
            (c.run.speed_over_ground - leg.speed_over_ground) / tidewright::units::KNOT_MPS;
        assert!(error_kn.abs() < 0.05, "{error_kn:+.3} kn");
        assert!(c.run.pair.is_some());
    }
    assert!(screen(&app).contains(&format!("live ({text})")));

    // The sea-trial view lists them; drop the last, make the kept runs the log, apply the fit.
    press(&mut app, 'r');
    let shown = screen(&app);
    assert!(shown.contains("6 runs captured, 6 kept"), "{shown}");
    for _ in 0..5 {
        press(&mut app, 'J');
    }
    press(&mut app, 'x');
    assert!(screen(&app).contains("6 runs captured, 5 kept"));
    // The run left of the broken pair counts one way.
    let kept = app.live.as_ref().unwrap().kept_trial_runs();
    assert_eq!(kept.len(), 5);
    assert_eq!(kept[4].direction, None);
    // Drop its partner too: a one-way run carries the current into the fit.
    press(&mut app, 'K');
    press(&mut app, 'x');
    press(&mut app, 'g');
    let trial = app.doc.boat.trial.as_ref().unwrap();
    assert_eq!(trial.runs.len(), 4);
    assert_eq!(trial.date.as_deref(), Some("2023-11-14"));
    assert!(trial.runs.iter().all(|r| r.direction.is_some()));
    press(&mut app, 'a');
    let factor = app.doc.boat.calibration.as_ref().unwrap().resistance_factor;
    // Made with ×1.2 on calm-water resistance (tests/integration/trial_import.rs).
    assert!((factor / 1.2 - 1.0).abs() < 0.01, "{factor}");
    feed.stop();
    server.join().unwrap();
}

/// End to end over a terminal: `open pintle --nmea tcp://127.0.0.1:PORT` in tmux shows the live
/// line from a loopback server, notices when the server closes, and goes live again when it
/// comes back (loopback only; skipped without tmux).
#[test]
fn tmux_live_feed_shows_values_and_reconnects() {
    use super::tui::{start_session, tmux_on, wait_for};
    if std::process::Command::new("tmux")
        .arg("-V")
        .output()
        .is_err()
    {
        eprintln!("skipped: tmux is not installed (.ci/run installs it)");
        return;
    }
    let log = super::trial_import::pintle_log_with(TimePrefix::Iso);
    let text: String = log
        .nmea
        .lines()
        .take(400)
        .map(|l| format!("{l}\r\n"))
        .collect();
    let listener = TcpListener::bind("127.0.0.1:0").unwrap();
    let address = listener.local_addr().unwrap();
    let server = serve_once(listener, text.clone(), Duration::from_millis(1500));

    let bin = env!("CARGO_BIN_EXE_tidewright");
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("no-store");
    let session = format!("tidewright-live-{}", std::process::id());
    let command = format!(
        "{bin} --profiles '{}' open pintle --nmea tcp://{address}; sleep 30",
        store.display()
    );
    let _kill = start_session(&session, 140, 44, &command);
    let shown = wait_for(&session, 8.0, |t| {
        t.contains("Live: SOG") && t.contains("· model ")
    })
    .expect("the live line with the model beside it");
    assert!(shown.contains(&format!("tcp://{address}")), "{shown}");
    server.join().unwrap();
    // The server is gone: the feed says so rather than freezing.
    wait_for(&session, 8.0, |t| {
        t.contains("reconnecting") || t.contains("no data for") || t.contains("connecting")
    })
    .expect("the dropped feed is shown");
    // Back on the same port: live again.
    let listener = TcpListener::bind(address).unwrap();
    let server = serve_once(listener, text, Duration::from_millis(1500));
    wait_for(&session, 10.0, |t| {
        t.contains(&format!("live (tcp://{address})"))
    })
    .expect("reconnected");
    server.join().unwrap();
    tmux_on(&session, &["send-keys", "-t", &session, "q"]);
}

/// Until the repower is marked done the boat in the water is the as-found one: the live line
/// holds the measured speed against that installation's curve, not the planned screw's; and a
/// direction without a heading sentence is named course over ground.
#[test]
fn live_line_compares_with_the_boat_as_found_and_names_course_over_ground() {
    let fixture = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/fixtures/repower/boats/pintle-repower.toml"
    );
    let store = Store::at("/nonexistent");
    let mut app = tidewright::tui::open_app(&store, Some(fixture)).unwrap();
    app.update(Action::LiveStarted("tcp://127.0.0.1:1".into()));
    let rpm = 2100.0;
    let sample = |heading: Option<f64>| tidewright::instruments::Sample {
        time_s: 0.0,
        engine_rpm: Some(rpm),
        speed_over_ground: Some(7.0 * tidewright::units::KNOT_MPS),
        course_over_ground_deg: Some(93.0),
        heading_deg: heading,
        speed_through_water: None,
        fuel_volume_flow: None,
    };
    app.live.as_mut().unwrap().last = Some(sample(None));
    let shown = screen(&app);
    assert!(shown.contains("course over ground 093°"), "{shown}");
    assert!(!shown.contains("heading 093"), "{shown}");
    // The model named is the as-found one, at the as-found installation's speed for 2100 rpm.
    let found = tidewright::study::Study::load(&store, "pintle", None).unwrap();
    let curve = found
        .solve_variant(0, &tidewright::study::solve::SolveOptions::curves())
        .speed_by_rpm;
    let expected = tidewright::tui::live::interpolate(&curve, rpm).unwrap();
    let text = tidewright::units::format(expected, tidewright::units::Kind::Speed, app.units);
    assert!(
        shown.contains(&format!("model as found {text}")),
        "{text}:\n{shown}"
    );
    app.live.as_mut().unwrap().last = Some(sample(Some(88.0)));
    assert!(screen(&app).contains("heading 088°"));
}
