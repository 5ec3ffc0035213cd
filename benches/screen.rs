//! Screen benchmark: one field change in the terminal UI → every variant re-solved → the full
//! screen drawn at 120×40 to a `TestBackend`. Budget ≤ 5 ms (docs/performance.md).

use criterion::{Criterion, criterion_group, criterion_main};
use ratatui::Terminal;
use ratatui::backend::TestBackend;
use std::hint::black_box;
use std::time::Duration;
use tidewright::profile::Store;
use tidewright::tui::app::{Action, App};
use tidewright::tui::fields::{FieldId, Pane};
use tidewright::tui::keys::Command;
use tidewright::tui::{open_app, ui};

/// The demo app with the Screw pane's pitch field selected.
fn app_on_pitch(boat: &str) -> App {
    let demo = Store::at("/nonexistent/tidewright-bench-demo");
    let mut app = open_app(&demo, Some(boat)).expect("demo boat opens");
    while app.focus != Pane::Screw {
        app.update(Action::Command(Command::NextPane));
    }
    for _ in 0..app.pane_fields(Pane::Screw).len() {
        if app.selected_field() == Some(FieldId::Pitch) {
            break;
        }
        app.update(Action::Command(Command::NextField));
    }
    assert_eq!(
        app.selected_field(),
        Some(FieldId::Pitch),
        "the pitch field is found"
    );
    app
}

fn screen(c: &mut Criterion) {
    let mut group = c.benchmark_group("screen");
    for boat in ["marram", "pintle"] {
        let mut app = app_on_pitch(boat);
        let mut terminal = Terminal::new(TestBackend::new(120, 40)).expect("test terminal");
        let mut up = true;
        group.bench_function(format!("nudge_resolve_draw_120x40_{boat}"), |b| {
            b.iter(|| {
                // Up and down in turn, so that the boat stays where it started.
                let command = if up {
                    Command::NudgeUp
                } else {
                    Command::NudgeDown
                };
                up = !up;
                app.update(Action::Command(command));
                terminal
                    .draw(|frame| ui::render(black_box(&app), frame))
                    .expect("draw");
            })
        });
        let mut terminal = Terminal::new(TestBackend::new(120, 40)).expect("test terminal");
        group.bench_function(format!("draw_only_120x40_{boat}"), |b| {
            b.iter(|| {
                terminal
                    .draw(|frame| ui::render(black_box(&app), frame))
                    .expect("draw");
            })
        });
    }
    group.finish();
}

fn config() -> Criterion {
    Criterion::default()
        .sample_size(30)
        .warm_up_time(Duration::from_millis(500))
        .measurement_time(Duration::from_secs(2))
}

criterion_group! {
    name = benches;
    config = config();
    targets = screen
}
criterion_main!(benches);
