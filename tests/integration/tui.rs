//! Terminal UI: screens drawn to ratatui's TestBackend (insta snapshots plus explicit asserts
//! on what carries meaning), the update function driven without a terminal, docs/keys.md
//! against the key table, and the real binary driven in tmux.

use crossterm::event::{KeyCode, KeyEvent, KeyModifiers};
use ratatui::Terminal;
use ratatui::backend::TestBackend;
use tidewright::profile::{BoatDoc, Store};
use tidewright::propulsion::solver::Verdict;
use tidewright::propulsion::solver::matching::DEFAULT_LIGHT_RUNNING;
use tidewright::tui::app::{Action, App, EditTarget, Effect, Overlay};
use tidewright::tui::chart::ChartKind;
use tidewright::tui::fields::{FieldId, Pane};
use tidewright::tui::keys::{self, Command, Mode};
use tidewright::tui::ui;
use tidewright::units::UnitSystem;

/// A store directory that does not exist, so the embedded demo fleet is used.
fn demo_store() -> Store {
    Store::at(std::env::temp_dir().join("tidewright-tui-tests-no-store-here"))
}

/// The demo trawler (imperial) with its "re-pitched 26x17.5" variant active.
fn demo_app() -> App {
    tidewright::tui::open_app(&demo_store(), Some("marram")).expect("the demo boat opens")
}

fn screen(app: &App, width: u16, height: u16) -> String {
    let mut terminal = Terminal::new(TestBackend::new(width, height)).unwrap();
    terminal.draw(|f| ui::render(app, f)).unwrap();
    let buf = terminal.backend().buffer().clone();
    (0..height)
        .map(|y| {
            let row: String = (0..width)
                .map(|x| buf[(x, y)].symbol().replace('\u{a0}', " "))
                .collect();
            row.trim_end().to_string()
        })
        .collect::<Vec<_>>()
        .join("\n")
}

fn key(app: &mut App, code: KeyCode) -> Option<Effect> {
    let event = KeyEvent::new(code, KeyModifiers::NONE);
    let action = app.action_for_key(&event)?;
    app.update(action)
}

fn keys(app: &mut App, text: &str) {
    for c in text.chars() {
        key(app, KeyCode::Char(c));
    }
}

fn active_pitch(app: &App) -> f64 {
    app.doc.boat.variants[app.doc.boat.active_variant]
        .pitch
        .value
}

fn cruise_rpm(app: &App) -> f64 {
    app.solution
        .active()
        .unwrap()
        .cruise
        .as_ref()
        .expect("target speed solved")
        .point
        .engine_rpm
}

/// Selects `field` in the Screw pane with j presses from the top.
fn select_screw_field(app: &mut App, field: FieldId) {
    while app.focus != Pane::Screw {
        key(app, KeyCode::Tab);
    }
    for _ in 0..10 {
        key(app, KeyCode::Char('k'));
    }
    while app.selected_field() != Some(field) {
        key(app, KeyCode::Char('j'));
    }
}

// ---- update function, no terminal ----

#[test]
fn key_sequence_changes_pitch_and_readout_rpm_moves_the_right_way_and_undo_restores() {
    let mut app = demo_app();
    let pitch0 = active_pitch(&app);
    let rpm0 = cruise_rpm(&app);
    select_screw_field(&mut app, FieldId::Pitch);
    keys(&mut app, "+++++"); // five nudges of 0.1 in (imperial boat)
    let pitch1 = active_pitch(&app);
    assert!(
        (pitch1 - (pitch0 + 5.0 * 0.1 * 0.0254)).abs() < 1e-9,
        "pitch {pitch0} → {pitch1}"
    );
    // More pitch: each turn moves the boat further, so the same speed needs fewer rpm.
    let rpm1 = cruise_rpm(&app);
    assert!(rpm1 < rpm0, "rpm at target speed went {rpm0} → {rpm1}");
    assert!(app.dirty());
    keys(&mut app, "uuuuu");
    assert_eq!(active_pitch(&app), pitch0);
    assert_eq!(cruise_rpm(&app), rpm0);
    assert!(!app.dirty());
    // Redo brings the change back.
    key(&mut app, KeyCode::Char('U'));
    assert!(active_pitch(&app) > pitch0);
}

#[test]
fn less_pitch_needs_more_rpm_in_metric_steps() {
    let mut app = demo_app();
    keys(&mut app, "m");
    let pitch0 = active_pitch(&app);
    let rpm0 = cruise_rpm(&app);
    select_screw_field(&mut app, FieldId::Pitch);
    keys(&mut app, "--"); // two nudges of 2 mm in metric display
    assert!((active_pitch(&app) - (pitch0 - 0.004)).abs() < 1e-6);
    assert!(cruise_rpm(&app) > rpm0);
}

#[test]
fn unit_toggle_changes_display_not_solution() {
    let mut app = demo_app();
    let solved_before = app.solution.clone();
    let doc_before = app.doc.clone();
    let imperial = screen(&app, 120, 40);
    assert!(imperial.contains("17.5 in"), "{imperial}");
    assert!(imperial.contains(" kn"));
    keys(&mut app, "m");
    assert_eq!(app.units, UnitSystem::Metric);
    let metric = screen(&app, 120, 40);
    assert!(
        metric.contains("444 mm") || metric.contains("444.5 mm") || metric.contains("445 mm"),
        "{metric}"
    );
    assert!(!metric.contains("17.5 in"));
    assert!(metric.contains(" kW"), "{metric}");
    assert_eq!(app.solution, solved_before, "solved values must not change");
    assert_eq!(app.doc, doc_before);
    assert!(!app.dirty(), "a display toggle is not an edit");
}

#[test]
fn typed_value_is_validated_and_invalid_input_never_applied() {
    let mut app = demo_app();
    let pitch0 = active_pitch(&app);
    select_screw_field(&mut app, FieldId::Pitch);
    key(&mut app, KeyCode::Enter);
    assert_eq!(app.mode(), Mode::Edit);
    for _ in 0..20 {
        key(&mut app, KeyCode::Backspace);
    }
    keys(&mut app, "19 furlongs");
    let problem = app
        .edit
        .as_ref()
        .unwrap()
        .problem
        .clone()
        .expect("a reason is shown");
    assert!(problem.contains("furlongs"), "{problem}");
    key(&mut app, KeyCode::Enter);
    assert_eq!(
        app.mode(),
        Mode::Edit,
        "Enter does not apply an invalid value"
    );
    assert_eq!(active_pitch(&app), pitch0);
    key(&mut app, KeyCode::Esc);
    assert_eq!(active_pitch(&app), pitch0);
    assert!(!app.dirty());

    // A negative pitch parses but the profile's validation refuses it, with its reason.
    key(&mut app, KeyCode::Enter);
    for _ in 0..20 {
        key(&mut app, KeyCode::Backspace);
    }
    keys(&mut app, "-3 in");
    assert!(
        app.edit
            .as_ref()
            .unwrap()
            .problem
            .as_deref()
            .unwrap_or("")
            .contains("positive")
    );
    key(&mut app, KeyCode::Esc);

    // A valid value with its unit applies.
    key(&mut app, KeyCode::Enter);
    for _ in 0..20 {
        key(&mut app, KeyCode::Backspace);
    }
    keys(&mut app, "480 mm");
    assert_eq!(app.edit.as_ref().unwrap().problem, None);
    key(&mut app, KeyCode::Enter);
    assert_eq!(app.mode(), Mode::Browse);
    assert!((active_pitch(&app) - 0.480).abs() < 1e-12);
}

#[test]
fn target_speed_is_typed_from_the_readout() {
    let mut app = demo_app();
    let rpm0 = cruise_rpm(&app);
    key(&mut app, KeyCode::Char('t'));
    assert_eq!(app.edit.as_ref().unwrap().target, EditTarget::TargetSpeed);
    for _ in 0..20 {
        key(&mut app, KeyCode::Backspace);
    }
    keys(&mut app, "6 kn");
    key(&mut app, KeyCode::Enter);
    assert!((app.doc.boat.trip.target_speed.value - 6.0 * 1852.0 / 3600.0).abs() < 1e-12);
    assert!(cruise_rpm(&app) < rpm0, "a slower target needs fewer rpm");
}

#[test]
fn variants_can_be_added_duplicated_chosen_and_removed() {
    let mut app = demo_app();
    let count = app.doc.boat.variants.len();
    keys(&mut app, "d");
    assert_eq!(app.doc.boat.variants.len(), count + 1);
    assert_eq!(app.doc.boat.active_variant, count);
    assert_eq!(
        app.solution.solved().unwrap().variants.len(),
        count + 1,
        "every variant re-solved"
    );
    keys(&mut app, "a");
    assert_eq!(app.doc.boat.variants.len(), count + 2);
    keys(&mut app, "]");
    assert_eq!(
        app.doc.boat.active_variant, 0,
        "] wraps to the first variant"
    );
    keys(&mut app, "xxxxx");
    assert_eq!(app.doc.boat.variants.len(), 1, "the last variant stays");
    assert!(
        app.status
            .as_ref()
            .unwrap()
            .text
            .contains("last screw variant")
    );
}

#[test]
fn recommended_pitch_is_added_as_a_variant() {
    let mut app = demo_app();
    let recommended = app
        .solution
        .recommended_pitch()
        .expect("the demo variant gets a recommendation");
    let count = app.doc.boat.variants.len();
    keys(&mut app, "p");
    assert_eq!(app.doc.boat.variants.len(), count + 1);
    assert_eq!(active_pitch(&app), recommended);
    // At the recommended pitch the screw is matched and runs free at least the default
    // light-running margin past rated rpm (common practice: about 2 %), less a tolerance of
    // 1 rpm for the pitch search.
    let m = app.solution.active().unwrap().matched.clone().unwrap();
    assert_eq!(m.verdict, Verdict::Matched, "{m:?}");
    let rated = app.solution.solved().unwrap().vessel.engine.rated_rpm;
    assert!(
        m.rpm_margin >= DEFAULT_LIGHT_RUNNING * rated - 1.0,
        "margin {}",
        m.rpm_margin
    );
    assert!(screen(&app, 120, 40).to_lowercase().contains("matched"));
}

#[test]
fn quitting_with_unsaved_changes_asks_first() {
    let mut app = demo_app();
    assert_eq!(
        key(&mut app, KeyCode::Char('q')),
        Some(Effect::Quit),
        "nothing to lose: quits"
    );
    select_screw_field(&mut app, FieldId::Pitch);
    keys(&mut app, "+");
    assert_eq!(key(&mut app, KeyCode::Char('q')), None);
    assert!(matches!(app.overlay, Overlay::Confirm(_)));
    assert_eq!(key(&mut app, KeyCode::Char('n')), None);
    assert_eq!(app.overlay, Overlay::None);
    key(&mut app, KeyCode::Char('q'));
    assert_eq!(key(&mut app, KeyCode::Char('y')), Some(Effect::Quit));
}

#[test]
fn the_demo_is_read_only_and_a_store_boat_saves_through_an_effect() {
    let mut app = demo_app();
    assert_eq!(key(&mut app, KeyCode::Char('s')), None);
    assert!(app.status.as_ref().unwrap().text.contains("read-only"));
    app.savable = true;
    match key(&mut app, KeyCode::Char('s')) {
        Some(Effect::Save {
            overwrite: false, ..
        }) => {}
        other => panic!("expected a save effect, got {other:?}"),
    }
    app.update(Action::SaveConflict);
    assert!(matches!(app.overlay, Overlay::Confirm(_)));
    match key(&mut app, KeyCode::Char('y')) {
        Some(Effect::Save {
            overwrite: true, ..
        }) => {}
        other => panic!("expected an overwrite, got {other:?}"),
    }
    app.update(Action::Saved("here".into()));
    assert!(!app.dirty());
    app.update(Action::FileChanged);
    assert!(app.changed_on_disk);
    assert!(screen(&app, 80, 24).contains("file changed on disk"));
}

#[test]
fn engine_sheet_switches_from_the_store_list() {
    let mut app = demo_app();
    assert_eq!(key(&mut app, KeyCode::Char('e')), Some(Effect::ListEngines));
    let store = demo_store();
    app.update(Action::EngineList(store.list_engines().unwrap()));
    assert_eq!(app.mode(), Mode::Pick);
    let Overlay::Pick { entries, .. } = &app.overlay else {
        panic!()
    };
    let other = entries
        .iter()
        .position(|e| *e != app.doc.boat.engine)
        .unwrap();
    for _ in 0..other {
        key(&mut app, KeyCode::Down);
    }
    let Some(Effect::LoadEngine(name)) = key(&mut app, KeyCode::Enter) else {
        panic!("no load")
    };
    let loaded = store.load_engine(&name).unwrap();
    app.update(Action::EngineLoaded(Box::new(loaded.doc), name.clone()));
    assert_eq!(app.doc.boat.engine, name);
    assert!(app.dirty());
    assert!(screen(&app, 120, 40).contains(&name));
}

// ---- screens ----

fn assert_common(text: &str) {
    assert!(text.contains("tidewright"));
    assert!(text.contains("marram"));
    assert!(text.contains("At 7.0 kn:"), "readout missing:\n{text}");
    assert!(text.contains("rpm ·"));
    assert!(text.contains("load "));
    assert!(text.contains("range "));
    assert!(text.contains("margin "));
    // The demo's active screw is matched and governed at rated rpm: its headroom is the
    // free-running rpm past rated, not a bare +0.
    if text.contains("MATCHED") {
        assert!(
            text.contains("margin +"),
            "light-running margin missing:\n{text}"
        );
    }
    assert!(
        text.contains("MATCHED") || text.contains("OVER-PROPPED") || text.contains("UNDER-PROPPED")
    );
    assert!(text.contains("Estimates only"), "caution missing:\n{text}");
    assert!(text.contains("naval architect"), "caution cut:\n{text}");
    assert!(
        text.contains("? help") && text.contains("q quit"),
        "footer:\n{text}"
    );
}

#[test]
fn screw_pane_at_80x24() {
    let app = demo_app();
    let text = screen(&app, 80, 24);
    assert_common(&text);
    for label in [
        "Screw",
        "Blades",
        "Diameter",
        "26.0 in",
        "Pitch",
        "17.5 in",
        "Area ratio",
        "Recommended pitch",
    ] {
        assert!(text.contains(label), "{label} missing:\n{text}");
    }
    insta::assert_snapshot!("screw_80x24", text);
}

#[test]
fn vessel_and_powerplant_panes_at_80x24() {
    let mut app = demo_app();
    key(&mut app, KeyCode::Tab); // Screw → Vessel
    assert_eq!(app.focus, Pane::Vessel);
    let vessel = screen(&app, 80, 24);
    assert_common(&vessel);
    for label in [
        "Vessel",
        "Displacement",
        "31300 lb",
        "Waterline length",
        "38.00 ft",
        "Draft aft",
    ] {
        assert!(vessel.contains(label), "{label} missing:\n{vessel}");
    }
    // Hull values the user left out are shown as estimates, with the marker.
    for _ in 0..6 {
        key(&mut app, KeyCode::Char('j'));
    }
    assert_eq!(app.selected_field(), Some(FieldId::WettedSurface));
    let wetted = screen(&app, 80, 24);
    assert!(wetted.contains("ft²~"), "{wetted}");
    assert!(wetted.contains("~ estimated"), "{wetted}");
    insta::assert_snapshot!("vessel_80x24", vessel);

    key(&mut app, KeyCode::Char('l'));
    assert_eq!(app.focus, Pane::Powerplant);
    let power = screen(&app, 80, 24);
    for label in [
        "Powerplant",
        "Engine sheet",
        "quellan-qd90",
        "Rated rpm",
        "2600 rpm",
        "Gear ratio",
        "2.50",
    ] {
        assert!(power.contains(label), "{label} missing:\n{power}");
    }
    insta::assert_snapshot!("powerplant_80x24", power);
}

#[test]
fn all_panes_and_each_chart_at_120x40() {
    let mut app = demo_app();
    let expect = [
        (
            ChartKind::PowerVsRpm,
            vec![
                "Power vs engine rpm",
                "engine rpm",
                "full load",
                "rated 2600 rpm",
                "hp",
            ],
        ),
        (
            ChartKind::SpeedVsRpm,
            vec!["Speed vs engine rpm", "kn", "no sea-trial log"],
        ),
        (ChartKind::FuelVsRpm, vec!["Fuel vs engine rpm", "US gal/h"]),
        (
            ChartKind::RangeVsSpeed,
            vec!["Range vs speed", "speed kn", "nm"],
        ),
    ];
    for (kind, words) in expect {
        assert_eq!(app.chart, kind);
        let text = screen(&app, 120, 40);
        assert_common(&text);
        for pane in ["Vessel", "Powerplant", "Screw"] {
            assert!(text.contains(pane), "{pane} pane missing");
        }
        for word in words {
            assert!(text.contains(word), "{word} missing from {kind:?}:\n{text}");
        }
        // The legend names every variant, with its glyph, so no colour is needed.
        for (label, glyph) in [
            ("old 26x19", "•"),
            ("re-pitched 26x17.5", "▄"),
            ("flat 26x15", "▖"),
        ] {
            assert!(
                text.contains(&format!("{glyph} {label}")),
                "legend lacks {label}:\n{text}"
            );
        }
        assert!(
            text.chars().any(|c| ('\u{2801}'..='\u{28FF}').contains(&c)),
            "no braille curve"
        );
        insta::assert_snapshot!(format!("chart_{kind:?}_120x40"), text);
        key(&mut app, KeyCode::Char('c'));
    }
    assert_eq!(
        app.chart,
        ChartKind::PowerVsRpm,
        "c cycles through the four charts"
    );
}

#[test]
fn sea_trial_points_are_on_the_speed_chart_when_the_boat_has_a_log() {
    let store = demo_store();
    let with_log = store
        .list_boats()
        .unwrap()
        .into_iter()
        .find(|name| {
            store
                .load_boat(name)
                .unwrap()
                .doc
                .trial
                .is_some_and(|t| !t.runs.is_empty())
        })
        .expect("a demo boat with a trial log");
    let mut app = tidewright::tui::open_app(&store, Some(&with_log)).unwrap();
    app.chart = ChartKind::SpeedVsRpm;
    let text = screen(&app, 120, 40);
    assert!(text.contains("▄ sea trial"), "{text}");
    assert!(!text.contains("no sea-trial log"));
}

#[test]
fn help_overlay_lists_every_key() {
    let mut app = demo_app();
    key(&mut app, KeyCode::Char('?'));
    assert_eq!(app.mode(), Mode::Help);
    let text = screen(&app, 120, 40);
    // The first page and, scrolled with j, the rest of the longer left column.
    let mut scrolled = app.clone();
    for _ in 0..12 {
        key(&mut scrolled, KeyCode::Char('j'));
    }
    let rest = screen(&scrolled, 120, 40);
    for b in keys::BINDINGS {
        assert!(
            text.contains(b.keys[0].label) || rest.contains(b.keys[0].label),
            "{} missing from help:\n{text}\n{rest}",
            b.keys[0].label
        );
    }
    assert!(rest.contains("reload the boat's file"), "{rest}");
    // The marker legend closes the help: on screen, or after scrolling down to it.
    let mut scrolled = app.clone();
    for _ in 0..60 {
        key(&mut scrolled, KeyCode::Down);
    }
    let scrolled_text = screen(&scrolled, 120, 40);
    assert!(scrolled_text.contains("Markers"), "{scrolled_text}");
    insta::assert_snapshot!("help_120x40", text);
    let small = screen(&app, 80, 24);
    assert!(small.contains("Moving and editing"), "{small}");
    assert!(small.contains("select the field above"), "{small}");
    // The overlay clears what it covers: between the header and the footer, every row is the
    // overlay's own (its border, or blank in the margin), with nothing of the screen beside it.
    for size in [(80, 24), (120, 40)] {
        let drawn = screen(&app, size.0, size.1);
        let rows: Vec<&str> = drawn.lines().collect();
        for row in &rows[1..rows.len() - 1] {
            let first = row.chars().next().unwrap_or(' ');
            let last = row.chars().last().unwrap_or(' ');
            assert!(
                first == ' ' && (last == ' ' || row.chars().count() < size.0 as usize),
                "the screen shows beside the help overlay at {size:?}:\n{drawn}"
            );
        }
    }
    insta::assert_snapshot!("help_80x24", small);
    // At 80×24 the list scrolls: the later sections come into view.
    let mut scrolled = String::new();
    for _ in 0..120 {
        key(&mut app, KeyCode::Char('j'));
        scrolled.push_str(&screen(&app, 80, 24));
    }
    for later in [
        "Typing a value",
        "Design views",
        "apply the fitted correction",
        "Markers",
    ] {
        assert!(scrolled.contains(later), "{later} never scrolled into view");
    }
    key(&mut app, KeyCode::Esc);
    assert_eq!(app.mode(), Mode::Browse);
}

#[test]
fn invalid_input_state_at_80x24() {
    let mut app = demo_app();
    select_screw_field(&mut app, FieldId::Pitch);
    key(&mut app, KeyCode::Enter);
    for _ in 0..20 {
        key(&mut app, KeyCode::Backspace);
    }
    keys(&mut app, "18 furlongs");
    let text = screen(&app, 80, 24);
    assert!(text.contains("18 furlongs▏"), "{text}");
    assert!(text.contains("✗ unknown unit"), "{text}");
    assert!(
        text.contains("Enter apply") && text.contains("Esc cancel"),
        "edit footer:\n{text}"
    );
    insta::assert_snapshot!("invalid_input_80x24", text);
}

#[test]
fn too_small_terminal_gets_a_message() {
    let app = demo_app();
    let text = screen(&app, 40, 10);
    assert!(text.contains("needs 80×24 or more"), "{text}");
    assert!(text.contains("This terminal is 40×10"), "{text}");
    insta::assert_snapshot!("too_small_40x10", text);
    for (w, h) in [(1, 1), (79, 24), (80, 23), (0, 0), (200, 5)] {
        screen(&app, w, h);
    }
    // Every overlay at the smallest supported size draws without panicking.
    let mut app = demo_app();
    for step in ["?", "\u{1b}", "o", "e"] {
        if step == "\u{1b}" {
            key(&mut app, KeyCode::Esc);
        } else {
            keys(&mut app, step);
        }
        screen(&app, 80, 24);
    }
}

#[test]
fn no_colour_theme_draws_without_colours() {
    let app = demo_app();
    let mut terminal = Terminal::new(TestBackend::new(120, 40)).unwrap();
    terminal.draw(|f| ui::render(&app, f)).unwrap();
    let buf = terminal.backend().buffer();
    let coloured = buf
        .content()
        .iter()
        .filter(|c| c.fg != ratatui::style::Color::Reset)
        .count();
    assert_eq!(
        coloured, 0,
        "the plain (NO_COLOR) theme must not colour any cell"
    );
}

#[test]
fn docs_keys_md_matches_the_key_table() {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/docs/keys.md");
    let generated = keys::markdown();
    if std::env::var_os("TIDEWRIGHT_WRITE_KEYS").is_some() {
        std::fs::write(path, &generated).unwrap();
    }
    let on_disk = std::fs::read_to_string(path).expect("docs/keys.md exists");
    for b in keys::BINDINGS {
        for k in b.keys {
            assert!(
                on_disk.contains(&format!("`{}`", k.label)),
                "docs/keys.md lacks {}",
                k.label
            );
        }
    }
    assert_eq!(
        on_disk, generated,
        "docs/keys.md is stale: run with TIDEWRIGHT_WRITE_KEYS=1"
    );
}

#[test]
fn every_browse_command_is_reachable_by_a_key() {
    for command in [
        Command::NextPane,
        Command::PrevPane,
        Command::NextField,
        Command::PrevField,
        Command::BeginEdit,
        Command::NudgeUp,
        Command::NudgeDown,
        Command::Undo,
        Command::Redo,
        Command::EditTargetSpeed,
        Command::ToggleUnits,
        Command::NextChart,
        Command::NextVariant,
        Command::AddVariant,
        Command::DuplicateVariant,
        Command::RemoveVariant,
        Command::ApplyRecommendation,
        Command::OpenSweep,
        Command::OpenCalibration,
        Command::OpenWhatIf,
        Command::ToggleBand,
        Command::Save,
        Command::OpenBoat,
        Command::SwitchEngine,
        Command::ToggleHelp,
        Command::Quit,
    ] {
        assert!(
            keys::bindings_for(Mode::Browse).any(|b| b.command == command),
            "{command:?} has no key"
        );
    }
}

// ---- design views: sweep, sea trial, what-if ----

fn pintle_app() -> App {
    tidewright::tui::open_app(&demo_store(), Some("pintle")).expect("the demo workboat opens")
}

fn top_speed(app: &App) -> f64 {
    app.solution
        .active()
        .unwrap()
        .matched
        .as_ref()
        .expect("matched")
        .top_speed
}

#[test]
fn sweep_view_ranks_diameters_up_to_the_aperture_and_switches_parameter() {
    use tidewright::tui::analysis::{SweepOver, ViewData, ViewKind};
    let mut app = demo_app();
    keys(&mut app, "v");
    assert_eq!(app.mode(), Mode::View);
    let Some(ViewData::Sweep(view)) = &app.view else {
        panic!("sweep not solved when the view opened")
    };
    assert_eq!(view.over, SweepOver::Diameter);
    let result = view.result.as_ref().expect("diameter sweep solved");
    // marram: installation.max_screw_diameter = 28 in is the largest candidate.
    let largest = result
        .candidates
        .iter()
        .map(|c| c.value)
        .fold(0.0, f64::max);
    assert!((largest - 28.0 * 0.0254).abs() < 1e-6, "largest {largest}");
    let best = result
        .candidates
        .iter()
        .find(|c| c.rank == 1)
        .expect("a first");
    let best_pitch = best.pitch.expect("best candidate has a pitch");
    for size in [(80, 24), (120, 40)] {
        let text = screen(&app, size.0, size.1);
        assert!(text.contains("Ranked by"), "{text}");
        assert!(text.contains("least fuel per distance"), "{text}");
        assert!(text.contains("◀ best"), "{text}");
        assert!(text.contains("[Sweep]"), "{text}");
        // The best candidate's pitch, as drawn (inches, one decimal).
        assert!(
            text.contains(&format!("{:.1}", best_pitch / 0.0254)),
            "pitch {best_pitch} missing:\n{text}"
        );
        if size == (120, 40) {
            insta::assert_snapshot!("sweep_120x40", text);
        } else {
            insta::assert_snapshot!("sweep_80x24", text);
        }
    }
    keys(&mut app, "n");
    assert_eq!(app.sweep_over, SweepOver::GearRatio);
    let Some(ViewData::Sweep(view)) = &app.view else {
        panic!()
    };
    assert_eq!(view.over, SweepOver::GearRatio);
    assert!(screen(&app, 80, 24).contains("gear ratio for"));
    keys(&mut app, "nn");
    assert!(screen(&app, 80, 24).contains("area ratio AE/A0 for"));
    key(&mut app, KeyCode::Tab);
    assert_eq!(
        app.view.as_ref().map(|v| v.kind()),
        Some(ViewKind::Calibration)
    );
    key(&mut app, KeyCode::Esc);
    assert_eq!(app.mode(), Mode::Browse);
    assert!(app.view.is_none());
}

#[test]
fn calibration_view_on_pintle_lowers_the_rms_and_applying_it_is_undoable() {
    use tidewright::tui::analysis::ViewData;
    let mut app = pintle_app();
    assert!(app.doc.boat.calibration.is_none());
    let before = top_speed(&app);
    keys(&mut app, "r");
    let Some(ViewData::Calibration(view)) = &app.view else {
        panic!("calibration not solved")
    };
    let cal = view.result.as_ref().expect("pintle has a log");
    assert!(
        cal.rms_before > cal.rms_after,
        "RMS before {} after {}",
        cal.rms_before,
        cal.rms_after
    );
    assert!(
        cal.points.iter().all(|p| p.two_way),
        "every rpm run both ways"
    );
    let factor = cal.resistance_factor;
    for size in [(80, 24), (120, 40)] {
        let text = screen(&app, size.0, size.1);
        assert!(text.contains("RMS error: before"), "{text}");
        assert!(text.contains(&format!("×{factor:.3}")), "{text}");
        assert!(text.contains("two-way"), "{text}");
        assert!(
            text.contains("measured") && text.contains("calibrated"),
            "{text}"
        );
        if size == (120, 40) {
            insta::assert_snapshot!("calibration_120x40", text);
        } else {
            insta::assert_snapshot!("calibration_80x24", text);
        }
    }
    keys(&mut app, "a");
    let applied = app
        .doc
        .boat
        .calibration
        .as_ref()
        .expect("correction applied");
    // The correction goes through the study's one calibration path, which writes the factor
    // to four decimals (as `trial --save` does).
    assert!((applied.resistance_factor - factor).abs() <= 0.5e-4);
    assert!(app.dirty(), "applying marks the boat unsaved");
    let after = top_speed(&app);
    // A factor above 1 adds resistance: the same engine reaches a lower top speed.
    assert!(
        factor > 1.0,
        "pintle's log is slower than the model: {factor}"
    );
    assert!(after < before, "top speed {before} → {after}");
    let text = screen(&app, 80, 24);
    assert!(text.contains(&format!("calibrated ×{factor:.3}")), "{text}");
    assert!(text.contains("unsaved"), "{text}");
    key(&mut app, KeyCode::Esc);
    let text = screen(&app, 120, 40);
    assert!(
        text.contains(&format!("calibrated ×{factor:.3}")),
        "header:\n{text}"
    );
    keys(&mut app, "u");
    assert!(app.doc.boat.calibration.is_none());
    assert_eq!(
        top_speed(&app),
        before,
        "undo restores the solved top speed"
    );
    assert!(!app.dirty());
}

#[test]
fn calibration_view_without_a_log_says_so() {
    let mut app = demo_app();
    assert!(app.doc.boat.trial.is_none(), "marram has no trial log");
    keys(&mut app, "r");
    let text = screen(&app, 80, 24);
    assert!(text.contains("no sea-trial log"), "{text}");
    keys(&mut app, "a");
    assert!(app.doc.boat.calibration.is_none());
    assert!(!app.dirty());
}

#[test]
fn what_if_view_heavier_loads_turn_fewer_rpm_and_show_the_band_and_checks() {
    use tidewright::tui::analysis::ViewData;
    let mut app = demo_app();
    // The over-propped "old 26x19": its full-throttle rpm is below the governor in every load.
    keys(&mut app, "[");
    assert_eq!(
        app.doc.boat.variants[app.doc.boat.active_variant].label,
        "old 26x19"
    );
    keys(&mut app, "w");
    let Some(ViewData::WhatIf(view)) = &app.view else {
        panic!("what-if not solved")
    };
    let outcomes = view.outcomes.as_ref().expect("conditions solved");
    let rpm = |label: &str| {
        outcomes
            .iter()
            .find(|o| o.condition.label == label)
            .and_then(|o| o.full_throttle_rpm)
            .unwrap_or_else(|| panic!("{label} solved"))
    };
    // Heavier → more power at the same speed → fewer rpm at full load (issue 5's check).
    assert!(rpm("light") > rpm("half load"), "light vs half");
    assert!(rpm("half load") > rpm("full load"), "half vs full");
    assert!(rpm("fouled") < rpm("as given"), "fouled turns fewer rpm");
    let power = |label: &str| {
        outcomes
            .iter()
            .find(|o| o.condition.label == label)
            .and_then(|o| o.cruise_power)
            .unwrap_or_else(|| panic!("{label} cruise solved"))
    };
    assert!(
        power("full load") > power("light"),
        "heavier needs more power at the same speed"
    );
    assert!(power("sea state") > power("as given"));
    let band = app
        .band
        .as_ref()
        .expect("band solved")
        .as_ref()
        .expect("band ok");
    let (low, high) = (band.pitch_low.unwrap(), band.pitch_high.unwrap());
    assert!(low < high, "the band gives a pitch range");
    for size in [(80, 24), (120, 40)] {
        let mut text = screen(&app, size.0, size.1);
        // Scroll down to see the rest at 80×24.
        for _ in 0..30 {
            keys(&mut app, "j");
            text.push_str(&screen(&app, size.0, size.1));
        }
        for _ in 0..30 {
            keys(&mut app, "k");
        }
        for want in [
            "light",
            "half load",
            "full load",
            "fouled",
            "sea state",
            "full-thr. rpm",
            "cruise rpm",
            "with range",
            "Keller AE/A0",
            "Burrill",
            "psi",
            "kPa",
            "Shaft:",
            "duty",
            "made for half load",
            "OVER",
            "naval architect",
        ] {
            assert!(text.contains(want), "{want} missing at {size:?}:\n{text}");
        }
        let first = screen(&app, size.0, size.1);
        if size == (120, 40) {
            insta::assert_snapshot!("what_if_120x40", first);
        } else {
            insta::assert_snapshot!("what_if_80x24", first);
        }
    }
}

#[test]
fn band_is_drawn_on_the_power_chart_and_the_screw_pane_names_the_condition() {
    let mut app = pintle_app();
    let text = screen(&app, 120, 40);
    assert!(
        text.contains("for half load"),
        "recommendation condition:\n{text}"
    );
    // The checks line (cavitation, shaft) is the pane's first note, so it is the last to go
    // when the pane is short; pintle's full throttle lies past the method's range, so the
    // recommendation after it carries its unreliable note (cut at a word with "…" here).
    let notes = ui::panes::pane_notes(Pane::Screw, &app);
    assert!(
        notes[0].contains("Cavitation"),
        "cavitation line: {notes:?}"
    );
    assert!(notes[1].contains("UNRELIABLE"), "{notes:?}");
    assert!(text.contains("Cavitation"), "{text}");
    assert!(!text.contains("band ±10 %"));
    keys(&mut app, "b");
    assert!(app.band_shown);
    let view = ui::chart::chart_view(&app);
    let band: Vec<_> = view
        .series
        .iter()
        .filter(|s| s.style == app.theme.dim && s.points.len() >= 2)
        .collect();
    assert!(band.len() >= 2, "low and high band series");
    let text = screen(&app, 120, 40);
    assert!(text.contains("band ±10 %"), "{text}");
    keys(&mut app, "b");
    assert!(app.band.is_none(), "hidden band is not kept");
}

#[test]
fn every_view_draws_at_small_sizes_without_panicking() {
    let mut app = pintle_app();
    keys(&mut app, "v");
    for _ in 0..3 {
        for _ in 0..4 {
            for (w, h) in [(80, 24), (79, 23), (100, 30), (1, 1)] {
                screen(&app, w, h);
            }
            keys(&mut app, "n");
        }
        key(&mut app, KeyCode::Tab);
    }
}

// ---- the real binary in tmux ----

/// Runs tmux on a server of its own for `session` (socket named after it), so tests neither
/// race each other starting a server nor touch the user's sessions.
pub(crate) fn tmux_on(session: &str, args: &[&str]) -> std::process::Output {
    std::process::Command::new("tmux")
        .args(["-L", session])
        .args(args)
        .output()
        .expect("tmux runs")
}

fn capture(session: &str) -> String {
    String::from_utf8_lossy(&tmux_on(session, &["capture-pane", "-p", "-t", session]).stdout)
        .into_owned()
}

/// Whether this build's command line does not open the terminal UI yet (the CLI is built in
/// another part of the project): it has no `open` command, or says the UI is not built.
fn cli_lacks_the_ui(pane: &str) -> bool {
    let help = std::process::Command::new(env!("CARGO_BIN_EXE_tidewright"))
        .arg("--help")
        .output()
        .map(|o| String::from_utf8_lossy(&o.stdout).into_owned())
        .unwrap_or_default();
    pane.contains("not built yet") || !help.lines().any(|l| l.trim_start().starts_with("open"))
}

/// Ends the session's tmux server when dropped, also when the test fails.
pub(crate) struct KillServer(pub(crate) String);

impl Drop for KillServer {
    fn drop(&mut self) {
        let _ = tmux_on(&self.0, &["kill-server"]);
    }
}

/// Starts `command` in a detached tmux session `session` of `width`×`height` cells, and the
/// guard that kills its server when the test ends.
pub(crate) fn start_session(session: &str, width: u16, height: u16, command: &str) -> KillServer {
    let (w, h) = (width.to_string(), height.to_string());
    let started = tmux_on(
        session,
        &[
            "new-session",
            "-d",
            "-s",
            session,
            "-x",
            &w,
            "-y",
            &h,
            command,
        ],
    );
    assert!(
        started.status.success(),
        "tmux: {}",
        String::from_utf8_lossy(&started.stderr)
    );
    KillServer(session.to_string())
}

/// Polls the pane until `pred` holds, for at most `seconds`.
pub(crate) fn wait_for(
    session: &str,
    seconds: f64,
    pred: impl Fn(&str) -> bool,
) -> Result<String, String> {
    let start = std::time::Instant::now();
    loop {
        let text = capture(session);
        if pred(&text) {
            return Ok(text);
        }
        if start.elapsed().as_secs_f64() > seconds {
            return Err(text);
        }
        std::thread::sleep(std::time::Duration::from_millis(30));
    }
}

/// Opens the demo Marram (from `store`, the demo fleet when nothing is there) in a tmux
/// session named after `name`, `width`×`height`, and waits for its first screen; `None`, said
/// why, when this build's CLI does not open the terminal UI.
fn open_marram(
    name: &str,
    store: &std::path::Path,
    width: u16,
    height: u16,
) -> Option<(String, KillServer)> {
    let bin = env!("CARGO_BIN_EXE_tidewright");
    let session = format!("tidewright-{name}-{}", std::process::id());
    let command = format!(
        "{bin} --profiles '{}' open marram; sleep 30",
        store.display()
    );
    let kill = start_session(&session, width, height, &command);
    match wait_for(&session, 5.0, |t| t.contains("At 7.0 kn")) {
        Ok(_) => Some((session, kill)),
        Err(text) if cli_lacks_the_ui(&text) => {
            eprintln!("skipped: this build's CLI does not open the terminal UI yet:\n{text}");
            None
        }
        Err(text) => panic!("the UI did not come up:\n{text}"),
    }
}

#[test]
fn tmux_open_change_pitch_save_quit() {
    if std::process::Command::new("tmux")
        .arg("-V")
        .output()
        .is_err()
    {
        eprintln!("skipped: tmux is not installed (.ci/run installs it)");
        return;
    }
    let bin = env!("CARGO_BIN_EXE_tidewright");
    let store = tempfile::tempdir().unwrap();
    for sub in ["boats", "engines"] {
        let from = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("profiles")
            .join(sub);
        std::fs::create_dir_all(store.path().join(sub)).unwrap();
        for entry in std::fs::read_dir(from).unwrap() {
            let entry = entry.unwrap();
            std::fs::copy(entry.path(), store.path().join(sub).join(entry.file_name())).unwrap();
        }
    }
    let boat_file = store.path().join("boats/marram.toml");
    let before =
        BoatDoc::from_toml(&std::fs::read_to_string(&boat_file).unwrap(), "before").unwrap();
    let pitch0 = before.variants[before.active_variant].pitch.value;

    let session = format!("tidewright-test-{}", std::process::id());
    let command = format!(
        "{bin} --profiles '{}' open marram; sleep 30",
        store.path().display()
    );
    let _kill = start_session(&session, 100, 30, &command);

    let opened = wait_for(&session, 5.0, |t| {
        t.contains("Screw") && t.contains("At 7.0 kn")
    });
    let text = match opened {
        Ok(text) => text,
        Err(text) if cli_lacks_the_ui(&text) => {
            eprintln!("skipped: this build's CLI does not open the terminal UI yet:\n{text}");
            return;
        }
        Err(text) => panic!("the UI did not come up:\n{text}"),
    };
    assert!(text.contains("marram"));
    // Screw pane has the keyboard: down to Pitch, three nudges of 0.1 in, save, quit.
    for k in ["j", "j", "j", "+", "+", "+"] {
        tmux_on(&session, &["send-keys", "-t", &session, k]);
    }
    wait_for(&session, 3.0, |t| {
        t.contains("17.8 in") && t.contains("unsaved")
    })
    .expect("pitch nudged");
    tmux_on(&session, &["send-keys", "-t", &session, "s"]);
    wait_for(&session, 3.0, |t| t.contains("saved ")).expect("saved");
    tmux_on(&session, &["send-keys", "-t", &session, "q"]);
    // The UI leaves the alternate screen: the boat's panes are gone from the pane.
    wait_for(&session, 3.0, |t| !t.contains("At 7.0 kn")).expect("quit and terminal restored");

    let saved_text = std::fs::read_to_string(&boat_file).unwrap();
    let saved = BoatDoc::from_toml(&saved_text, "saved").expect("saved file loads");
    assert!(
        saved.validate().is_empty(),
        "saved file validates: {:?}",
        saved.validate()
    );
    let pitch1 = saved.variants[saved.active_variant].pitch.value;
    assert!(
        (pitch1 - (pitch0 + 0.3 * 0.0254)).abs() < 1e-9,
        "saved pitch {pitch1}, was {pitch0}"
    );
    assert!(
        store.path().join("boats/marram.toml.bak").exists(),
        "the previous version is kept"
    );
}

#[test]
fn tmux_what_if_view_shows_the_cruise_rpm_of_conditions_json() {
    if std::process::Command::new("tmux")
        .arg("-V")
        .output()
        .is_err()
    {
        eprintln!("skipped: tmux is not installed (.ci/run installs it)");
        return;
    }
    let bin = env!("CARGO_BIN_EXE_tidewright");
    // No store at the path: the boat comes from the built-in demo fleet, the same for both runs.
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("no-store");
    let conditions = std::process::Command::new(bin)
        .args(["--profiles"])
        .arg(&store)
        .args(["conditions", "marram", "--format", "json"])
        .output()
        .expect("tidewright runs");
    assert!(
        conditions.status.success(),
        "{}",
        String::from_utf8_lossy(&conditions.stderr)
    );
    let doc: serde_json::Value = serde_json::from_slice(&conditions.stdout).unwrap();
    let all = doc["conditions"].as_array().expect("conditions listed");
    assert_eq!(all.len(), 6, "as given, three loads, fouled, sea state");
    // The screen leaves out the load case that only repeats the boat as given (half load).
    let expected: Vec<String> = all
        .iter()
        .filter(|c| c["repeats_as_given"] == serde_json::Value::Bool(false))
        .map(|c| {
            format!(
                "{:.0}",
                c["cruise_rpm"].as_f64().expect("cruise rpm solved")
            )
        })
        .collect();
    assert_eq!(
        expected.len(),
        5,
        "as given, light, full, fouled, sea state"
    );

    let Some((session, _kill)) = open_marram("whatif", &store, 100, 30) else {
        return;
    };
    tmux_on(&session, &["send-keys", "-t", &session, "w"]);
    let text =
        wait_for(&session, 5.0, |t| t.contains("cruise rpm")).expect("`w` opens the what-if view");
    let row: Vec<String> = text
        .lines()
        .find_map(|l| l.trim_start_matches('│').strip_prefix("cruise rpm"))
        .expect("a cruise rpm row")
        .split_whitespace()
        .map(|cell| cell.trim_end_matches('│').to_string())
        .filter(|cell| !cell.is_empty())
        .collect();
    // The screen and `conditions --format json` are one definition of each case.
    assert_eq!(row, expected, "what-if screen:\n{text}");
}

/// The real binary: `S` opens the shortlist, `c` its power chart, whose finding is the one
/// `tidewright shortlist` prints (one definition in the study layer).
#[test]
fn tmux_shortlist_power_chart_says_what_the_cli_says() {
    if std::process::Command::new("tmux")
        .arg("-V")
        .output()
        .is_err()
    {
        eprintln!("skipped: tmux is not installed (.ci/run installs it)");
        return;
    }
    let bin = env!("CARGO_BIN_EXE_tidewright");
    let dir = tempfile::tempdir().unwrap();
    let store = dir.path().join("no-store");
    let cli = std::process::Command::new(bin)
        .arg("--profiles")
        .arg(&store)
        .args(["shortlist", "marram"])
        .output()
        .expect("tidewright runs");
    let text = String::from_utf8_lossy(&cli.stdout).into_owned();
    // "From #8 brindmoor-3b40 (53.6 hp, 8.4 kn) to #5 …": its first words fit any screen.
    let finding = text
        .lines()
        .find(|l| l.trim_start().starts_with("From #"))
        .expect("the CLI's finding")
        .trim()
        .split(" to ")
        .next()
        .unwrap()
        .to_string();
    let Some((session, _kill)) = open_marram("power", &store, 120, 40) else {
        return;
    };
    tmux_on(&session, &["send-keys", "-t", &session, "S"]);
    wait_for(&session, 10.0, |t| t.contains("Repower shortlist for"))
        .expect("S opens the shortlist");
    tmux_on(&session, &["send-keys", "-t", &session, "c"]);
    let screen = wait_for(&session, 5.0, |t| {
        t.contains("Installed power against top speed")
    })
    .expect("c shows the power chart");
    assert!(
        screen.contains(&finding),
        "{finding:?} not on screen:\n{screen}"
    );
    tmux_on(&session, &["send-keys", "-t", &session, "c"]);
    wait_for(&session, 5.0, |t| t.contains("Repower shortlist for")).expect("c again: the table");
}

#[test]
fn tmux_sigterm_and_sighup_restore_the_terminal() {
    if std::process::Command::new("tmux")
        .arg("-V")
        .output()
        .is_err()
    {
        eprintln!("skipped: tmux is not installed (.ci/run installs it)");
        return;
    }
    let bin = env!("CARGO_BIN_EXE_tidewright");
    for signal in ["TERM", "HUP"] {
        let session = format!("tidewright-sig-{signal}-{}", std::process::id());
        let store = std::env::temp_dir().join("tidewright-tui-tests-no-store-here");
        // After the program ends, the shell prints whether the terminal is back in cooked
        // mode (stty shows "icanon", not "-icanon").
        let command = format!(
            "{bin} --profiles '{}' open marram; echo EXIT=$?; stty -a | grep -o -- '-\\?icanon' | head -1; sleep 30",
            store.display()
        );
        let _kill = start_session(&session, 100, 30, &command);
        match wait_for(&session, 5.0, |t| t.contains("At 7.0 kn")) {
            Ok(_) => {}
            Err(text) if cli_lacks_the_ui(&text) => {
                eprintln!("skipped: this build's CLI does not open the terminal UI yet");
                return;
            }
            Err(text) => panic!("UI did not come up:\n{text}"),
        }
        let pid_out = tmux_on(
            &session,
            &["list-panes", "-t", &session, "-F", "#{pane_pid}"],
        );
        let shell_pid = String::from_utf8_lossy(&pid_out.stdout).trim().to_string();
        let child = std::process::Command::new("pgrep")
            .args(["-P", &shell_pid])
            .output()
            .unwrap();
        let pid = String::from_utf8_lossy(&child.stdout)
            .lines()
            .next()
            .unwrap_or("")
            .trim()
            .to_string();
        assert!(!pid.is_empty(), "found the program's pid");
        std::process::Command::new("kill")
            .args([&format!("-{signal}"), &pid])
            .status()
            .unwrap();
        let text = wait_for(&session, 3.0, |t| {
            t.contains("EXIT=") && t.contains("icanon")
        })
        .expect("the program left");
        assert!(
            text.contains("icanon") && !text.contains("-icanon"),
            "terminal left in raw mode after SIG{signal}:\n{text}"
        );
        assert!(
            !text.contains("At 7.0 kn"),
            "alternate screen not left:\n{text}"
        );
    }
}

#[test]
fn full_throttle_past_the_method_is_marked_in_the_readout_and_the_chart() {
    // The fixture "stubby" reaches full throttle past Fn 0.5, beyond Holtrop–Mennen's Fn ≤ 0.45
    // (from memory) and the common-practice speed/length limit: the readout must not show its
    // top speed as a plain figure, and the speed curve changes style past the first such point.
    let store =
        Store::at(std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures/valid"));
    let mut app = tidewright::tui::open_app(&store, Some("stubby")).expect("the fixture opens");
    app.chart = ChartKind::SpeedVsRpm;
    let readout: String = ui::readout::readout_lines(&app)
        .iter()
        .map(ToString::to_string)
        .collect::<Vec<_>>()
        .join("\n");
    assert!(readout.contains("UNRELIABLE (Fn"), "{readout}");
    let view = ui::chart::chart_view(&app);
    assert!(
        view.series
            .iter()
            .any(|s| s.name.as_deref() == Some("••• unreliable") && !s.points.is_empty()),
        "{view:?}"
    );
    let recommendation = app
        .solution
        .recommendation_line(UnitSystem::Metric)
        .unwrap();
    assert!(
        recommendation.contains("UNRELIABLE") && recommendation.contains("a sea trial decides"),
        "{recommendation}"
    );
    let text = screen(&app, 100, 30);
    assert!(text.contains("••• unreliable"), "{text}");
    insta::assert_snapshot!("stubby_unreliable_100x30", text);
}

#[test]
fn twin_powerplant_pane_at_80x24_shows_shafts_and_each_engine() {
    let mut app = tidewright::tui::open_app(&demo_store(), Some("samphire"))
        .expect("the twin demo boat opens");
    while app.focus != Pane::Powerplant {
        key(&mut app, KeyCode::Tab);
    }
    let power = screen(&app, 80, 24);
    for label in ["Powerplant", "Shafts", "brindmoor-3b40", "each engine"] {
        assert!(power.contains(label), "{label} missing:\n{power}");
    }
    // The Shafts field nudges between 1 and 2 only, and writes installation.shafts.
    assert_eq!(
        tidewright::tui::fields::file_key(FieldId::Shafts, &app.doc.boat),
        "installation.shafts"
    );
    let mut boat = app.doc.boat.clone();
    tidewright::tui::edit::nudge(FieldId::Shafts, &mut boat, 1.0, UnitSystem::Metric)
        .expect_err("3 shafts refused");
    assert_eq!(boat.installation.shafts, 2);
    tidewright::tui::edit::nudge(FieldId::Shafts, &mut boat, -1.0, UnitSystem::Metric).unwrap();
    assert_eq!(boat.installation.shafts, 1);
    insta::assert_snapshot!("powerplant_twin_80x24", power);
}

#[test]
fn at_120x40_the_power_and_speed_charts_are_on_screen_together() {
    let app = demo_app();
    let wide = screen(&app, 120, 40);
    for kind in [ChartKind::PowerVsRpm, ChartKind::SpeedVsRpm] {
        assert!(
            wide.contains(kind.title()),
            "{} missing:\n{wide}",
            kind.title()
        );
    }
    insta::assert_snapshot!("two_charts_120x40", wide);
    // Smaller, one chart; the other is a key (c) away.
    let small = screen(&app, 100, 30);
    assert!(small.contains(ChartKind::PowerVsRpm.title()));
    assert!(!small.contains(ChartKind::SpeedVsRpm.title()), "{small}");
    // The rpm axis starts at a round value, not at the first solved point.
    let axis = wide
        .lines()
        .find(|l| l.contains("1340"))
        .unwrap_or_default();
    let chart_part = axis.split("││").nth(1).unwrap_or_default();
    assert!(chart_part.trim_start().starts_with("0 "), "{axis}");
}

#[test]
fn a_change_on_disk_is_shown_and_r_reloads_asking_first_when_unsaved() {
    let mut app = demo_app();
    app.update(tidewright::tui::app::Action::FileChanged);
    assert!(screen(&app, 100, 30).contains("file changed on disk"));
    // Clean: R asks the loop to reload at once.
    assert_eq!(key(&mut app, KeyCode::Char('R')), Some(Effect::Reload));
    // Unsaved edits: R asks first; n keeps them, y reloads.
    keys(&mut app, "a");
    assert!(app.dirty());
    assert_eq!(key(&mut app, KeyCode::Char('R')), None);
    assert_eq!(app.mode(), Mode::Confirm);
    assert_eq!(key(&mut app, KeyCode::Char('n')), None);
    assert!(app.dirty());
    key(&mut app, KeyCode::Char('R'));
    assert_eq!(key(&mut app, KeyCode::Char('y')), Some(Effect::Reload));
}

/// The demo trawler with the shortlist view open over the demo fleet's engine sheets, as the
/// loop opens it: `S` asks for the sheets, the loop reads them, the view solves.
fn shortlist_app() -> App {
    let mut app = demo_app();
    let effect = key(&mut app, KeyCode::Char('S'));
    assert_eq!(effect, Some(Effect::LoadEngineSheets));
    let offers = tidewright::study::shortlist::offers_from_store(&demo_store(), None)
        .expect("the demo fleet has engine sheets");
    assert!(app.update(Action::EngineSheets(offers)).is_none());
    app
}

fn shortlist_of(app: &App) -> tidewright::study::shortlist::Shortlist {
    match &app.view {
        Some(tidewright::tui::analysis::ViewData::Shortlist(v)) => {
            v.result.clone().expect("the demo shortlist solves")
        }
        other => panic!("not the shortlist view: {other:?}"),
    }
}

#[test]
fn shortlist_view_sorts_and_takes_a_candidate_in_one_undoable_edit() {
    let mut app = shortlist_app();
    assert_eq!(app.mode(), Mode::View);
    let list = shortlist_of(&app);
    // The view's candidates are the study's, as `tidewright shortlist` ranks them by fuel.
    let study = tidewright::study::Study::of_documents(&app.doc.boat, &app.doc.engine).unwrap();
    let offers = tidewright::study::shortlist::offers_from_store(&demo_store(), None).unwrap();
    let cli = study
        .shortlist(&offers, &Default::default())
        .expect("the study's shortlist");
    assert_eq!(list.candidates, cli.candidates);
    assert!(list.candidates.len() >= 4, "{}", list.candidates.len());

    // r cycles fuel → range → top → margin; each order is the ranked figure's.
    for (rank, higher_first) in [
        ("range", true),
        ("top", true),
        ("margin", true),
        ("fuel", false),
    ] {
        key(&mut app, KeyCode::Char('r'));
        let list = shortlist_of(&app);
        assert_eq!(list.rank.name(), rank);
        let values: Vec<f64> = list
            .candidates
            .iter()
            .filter_map(|c| c.ranked_value(list.rank, false))
            .collect();
        assert!(values.len() >= 2, "{rank}");
        for pair in values.windows(2) {
            if higher_first {
                assert!(pair[0] >= pair[1], "{rank}: {values:?}");
            } else {
                assert!(pair[0] <= pair[1], "{rank}: {values:?}");
            }
        }
        assert_eq!(list.candidates[0].tie_with, None, "{rank}");
    }

    // Highlight the first candidate on another engine than the boat's, then take it.
    let before = app.doc.clone();
    let list = shortlist_of(&app);
    let row = list
        .candidates
        .iter()
        .position(|c| c.engine != app.doc.boat.engine && c.pitch.is_some())
        .expect("a candidate on another engine");
    for _ in 0..row {
        key(&mut app, KeyCode::Char('j'));
    }
    assert_eq!(app.shortlist_row, row);
    let chosen = list.candidates[row].clone();
    assert!(key(&mut app, KeyCode::Enter).is_none());
    // The status says what was taken and, whole, which keys save and undo it, at 80 columns.
    let small = screen(&app, 80, 24);
    assert!(
        small.contains("(unsaved: s saves, u undoes)"),
        "the status is cut:\n{small}"
    );
    let boat = &app.doc.boat;
    assert_eq!(boat.engine, chosen.engine);
    assert!((boat.installation.gear_ratio - chosen.gear_ratio).abs() < 1e-12);
    assert_eq!(boat.variants.len(), before.boat.variants.len() + 1);
    let active = &boat.variants[boat.active_variant];
    assert!(
        active
            .label
            .starts_with(&format!("shortlist {} ", chosen.engine)),
        "{}",
        active.label
    );
    assert!((active.diameter.value - chosen.diameter).abs() < 1e-12);
    assert!((active.pitch.value - chosen.pitch.unwrap()).abs() < 1e-12);
    assert!((active.area_ratio - chosen.area_ratio).abs() < 1e-12);
    assert_ne!(
        app.doc.engine, before.engine,
        "the candidate's engine sheet is in use"
    );
    assert!(app.dirty());
    // The highlight stays on the candidate taken, though the shortlist was solved again.
    let again = shortlist_of(&app);
    assert_eq!(again.candidates[app.shortlist_row].engine, chosen.engine);

    // s saves it through the store (a store boat; the demo itself is read-only).
    app.savable = true;
    match key(&mut app, KeyCode::Char('s')) {
        Some(Effect::Save { boat, .. }) => assert_eq!(*boat, app.doc.boat),
        other => panic!("s did not save: {other:?}"),
    }
    // u undoes the whole take at once.
    key(&mut app, KeyCode::Char('u'));
    assert_eq!(app.doc, before);
}

#[test]
fn shortlist_view_draws_at_both_sizes_and_small_ones() {
    let mut app = shortlist_app();
    key(&mut app, KeyCode::Char('j'));
    let list = shortlist_of(&app);
    let big = screen(&app, 120, 40);
    assert!(big.contains("Repower shortlist for"), "{big}");
    // The highlighted second row ("!" before its place when a check fails).
    let highlighted = |text: &str| {
        text.lines()
            .position(|r| r.contains("▶   2 ") || r.contains("▶  !2 "))
    };
    assert!(
        highlighted(&big).is_some(),
        "the second row is highlighted:\n{big}"
    );
    assert!(big.contains("naval architect"), "the caution stays:\n{big}");
    assert!(
        big.contains("! beside # the candidate falls short or fails"),
        "{big}"
    );
    insta::assert_snapshot!("shortlist_120x40", big);
    for (width, height) in [(80, 24), (100, 30), (120, 40)] {
        let text = screen(&app, width, height);
        let rows: Vec<&str> = text.lines().collect();
        // One line per candidate: no row wraps onto the next line.
        let heading = rows
            .iter()
            .position(|r| r.contains("# engine"))
            .unwrap_or_else(|| panic!("no table heading at {width}:\n{text}"));
        // Candidate k+1's row follows candidate k's at once (after the highlighted one, its
        // detail line): no row wraps onto a second line.
        let place = |k: usize| {
            let c = &list.candidates[k];
            rows.iter()
                .position(|r| r.contains(&format!("{} {}", k + 1, c.engine)))
                .unwrap_or_else(|| panic!("no row of #{} at {width}:\n{text}", k + 1))
        };
        assert_eq!(place(0), heading + 1, "{text}");
        assert_eq!(place(1), place(0) + 1, "{text}");
        let detail = usize::from(
            rows[place(1) + 1]
                .trim_start_matches('│')
                .starts_with("      "),
        );
        assert_eq!(place(2), place(1) + 1 + detail, "{text}");
        // The old unexplained column is gone; a candidate that falls short is marked "!".
        assert!(!rows[heading].contains("prob"), "{text}");
        // The view's own keys, and none of another view's.
        let footer = rows.last().unwrap();
        assert!(
            footer.contains("Enter take") && !footer.contains("parameter"),
            "{footer}"
        );
        assert!(!footer.contains("apply fit"), "{footer}");
    }
    let small = screen(&app, 80, 24);
    assert!(
        highlighted(&small).is_some(),
        "the highlighted row stays on screen:\n{small}"
    );
    // The columns dropped at 80 are in the highlighted candidate's detail line, under its row.
    let rows: Vec<&str> = small.lines().collect();
    let at = highlighted(&small).unwrap();
    assert!(
        rows[at + 1].contains("cruise ") && rows[at + 1].contains("blades 3"),
        "{small}"
    );
    insta::assert_snapshot!("shortlist_80x24", small);
    for (w, h) in [(40, 10), (20, 5), (1, 1)] {
        screen(&app, w, h);
    }
    // An empty store is said so, not a crash.
    app.update(Action::Failed("no shortlist: the store is empty".into()));
}

/// `c` in the shortlist view shows each candidate's installed power against its top speed over
/// the hull's effective power, the highlighted candidate in words and in its own glyph.
#[test]
fn shortlist_view_shows_what_more_power_buys_on_one_chart() {
    let mut app = shortlist_app();
    let list = shortlist_of(&app);
    let data = list
        .power_for_speed
        .clone()
        .expect("the demo candidates reach top speeds");
    key(&mut app, KeyCode::Char('j'));
    key(&mut app, KeyCode::Char('c'));
    assert!(app.shortlist_chart);
    let big = screen(&app, 120, 40);
    assert!(big.contains("What more power buys on"), "{big}");
    assert!(big.contains("Installed power against top speed"), "{big}");
    assert!(big.contains("hull effective power"), "{big}");
    assert!(big.contains("#2 highlighted"), "{big}");
    // The words name the highlighted candidate, the second by the ranking.
    let second = &list.candidates[1];
    if data
        .candidates
        .iter()
        .any(|p| p.engine == second.engine && p.gear_ratio == second.gear_ratio)
    {
        assert!(big.contains(&format!("█ #2 {}", second.engine)), "{big}");
    }
    assert!(big.contains("naval architect"), "the caution stays:\n{big}");
    insta::assert_snapshot!("shortlist_power_chart_120x40", big);
    let small = screen(&app, 80, 24);
    insta::assert_snapshot!("shortlist_power_chart_80x24", small);
    // Too short for a chart: the table stays, nothing breaks.
    let tiny = screen(&app, 80, 12);
    assert!(
        !tiny.contains("Installed power against top speed"),
        "{tiny}"
    );
    for (w, h) in [(40, 10), (20, 5), (1, 1)] {
        screen(&app, w, h);
    }
    // c again: the table.
    key(&mut app, KeyCode::Char('c'));
    assert!(screen(&app, 120, 40).contains("Repower shortlist for"));
}

/// After the sea-trial fit is applied, the speed chart shows the curve before the fit beside the
/// fitted one, under the trial points (issue: "before and after the fit").
#[test]
fn the_speed_chart_shows_the_curve_before_the_fit_once_one_is_applied() {
    let mut app = pintle_app();
    app.chart = ChartKind::SpeedVsRpm;
    assert!(app.solution.before_fit.is_empty());
    assert!(!screen(&app, 120, 40).contains("before the fit"));
    keys(&mut app, "r");
    keys(&mut app, "a");
    assert!(app.doc.boat.calibration.is_some());
    assert!(!app.solution.before_fit.is_empty());
    // The plain model is faster than the calibrated one (factor above 1) at every rpm shown.
    let fitted = &app.solution.active().unwrap().speed_by_rpm;
    let (rpm, plain) = app.solution.before_fit[app.solution.before_fit.len() / 2];
    let calibrated = fitted
        .iter()
        .min_by(|a, b| (a.0 - rpm).abs().total_cmp(&(b.0 - rpm).abs()))
        .unwrap()
        .1;
    assert!(
        plain > calibrated,
        "{plain} vs {calibrated} m/s at {rpm} rpm"
    );
    keys(&mut app, "q");
    let text = screen(&app, 120, 40);
    assert!(text.contains("before the fit"), "{text}");
    assert!(text.contains("sea trial"), "{text}");
}

/// The repower fixture (the demo Pintle as found, a 4B62 on 2.5:1 planned) in the UI.
fn repower_app() -> App {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/fixtures/repower/boats/pintle-repower.toml"
    );
    tidewright::tui::open_app(&demo_store(), Some(path)).expect("the repower fixture opens")
}

/// The readout holds the planned screw against the boat as found; the sea-trial view fits
/// through the old installation (the demo Pintle's own factor) and asks before replacing a
/// saved factor that the new fit does not agree with; `D` marks the repower done, undoably.
#[test]
fn repower_readout_trial_apply_and_swap_in_the_ui() {
    let mut app = repower_app();
    assert!(app.doc.as_found_engine.is_some());
    let text = screen(&app, 120, 40);
    assert!(text.contains("vs as found: top"), "{text}");
    let small = screen(&app, 80, 24);
    assert!(
        small.contains("naval architect decide"),
        "the caution stays whole:\n{small}"
    );

    // The fit is the demo Pintle's (its own installation is the fixture's as-found one).
    let pintle = tidewright::study::Study::load(&demo_store(), "pintle", None).unwrap();
    let own = pintle.calibration(0, false).unwrap().resistance_factor;
    keys(&mut app, "r");
    match &app.view {
        Some(tidewright::tui::analysis::ViewData::Calibration(v)) => {
            assert_close!(v.result.as_ref().unwrap().resistance_factor, own, 1e-12);
        }
        other => panic!("not the sea-trial view: {other:?}"),
    }
    // A saved factor far from the fit: `a` asks, `n` keeps it, `a` `y` replaces it.
    let mut saved = app.doc.boat.clone();
    saved.calibration = Some(tidewright::profile::CalibrationDoc {
        resistance_factor: 1.4,
        wake_fraction: None,
        froude_factor: None,
        trial_date: None,
        note: None,
    });
    app.doc.boat = saved;
    keys(&mut app, "a");
    assert_eq!(app.mode(), Mode::Confirm);
    keys(&mut app, "n");
    assert_close!(
        app.doc.boat.calibration.as_ref().unwrap().resistance_factor,
        1.4,
        1e-12
    );
    keys(&mut app, "a");
    keys(&mut app, "y");
    let applied = app.doc.boat.calibration.as_ref().unwrap().resistance_factor;
    assert!((applied - own).abs() < 1e-3, "{applied} vs {own}");
    // The same fit again is applied without a question.
    keys(&mut app, "a");
    assert_ne!(app.mode(), Mode::Confirm);
    key(&mut app, KeyCode::Esc);

    // D, y: the planned side is the boat as found now, the old one in history; u undoes.
    let before = app.doc.clone();
    keys(&mut app, "D");
    assert_eq!(app.mode(), Mode::Confirm);
    keys(&mut app, "y");
    let found = app.doc.boat.as_found.as_ref().unwrap();
    assert_eq!(found.engine, "brindmoor-4b62");
    assert_eq!(app.doc.boat.history.len(), 1);
    assert_eq!(app.doc.boat.history[0].engine, "brindmoor-3b40");
    assert!(
        app.doc.boat.trial.is_none(),
        "the trial went with the old installation"
    );
    keys(&mut app, "u");
    assert_eq!(app.doc, before);
    // A boat without [as_found] says there is nothing to swap.
    let mut plain = pintle_app();
    keys(&mut plain, "D");
    assert_ne!(plain.mode(), Mode::Confirm);
}

/// `F` in the sea-trial view applies the two-parameter fit: the saved correction then varies
/// with Froude number, and the readout's calibration says so.
#[test]
fn the_two_parameter_fit_is_applied_with_f() {
    let mut app = pintle_app();
    keys(&mut app, "r");
    keys(&mut app, "F");
    let saved = app.doc.boat.calibration.as_ref().expect("applied");
    let f = saved.froude_factor.expect("the two-parameter fit");
    assert!(f.froude_low < f.froude_high);
    assert!(app.dirty());
    keys(&mut app, "u");
    assert!(app.doc.boat.calibration.is_none());
}
