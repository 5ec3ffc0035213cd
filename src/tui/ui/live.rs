//! The live feed drawn: the line under the readout (SOG, rpm and heading or course beside the model's
//! speed at that rpm, and the feed's state) and the captured runs in the sea-trial view.

use crate::instruments::feed::FeedState;
use crate::instruments::time::clock_of;
use crate::report::count;
use crate::report::import::rejection_hint;
use crate::tui::app::App;
use crate::tui::live::{Live, interpolate};
use crate::units::{self, Kind};
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};

/// The model's speed at `rpm` for the installation in the water, m/s, and which it is: the
/// as-found one while the boat file has `[as_found]` (the repower is not yet marked done),
/// else the active variant.
fn predicted_at(app: &App, rpm: f64) -> Option<(f64, &'static str)> {
    let found = &app.solution.as_found_speed_by_rpm;
    if !found.is_empty() {
        return interpolate(found, rpm).map(|v| (v, "model as found"));
    }
    interpolate(&app.solution.active()?.speed_by_rpm, rpm).map(|v| (v, "model"))
}

/// The line under the readout: live values beside the model, then the feed's state.
pub fn readout_line(app: &App, live: &Live) -> Line<'static> {
    let system = app.units;
    let theme = &app.theme;
    let mut spans = vec![Span::styled(
        "Live: ",
        Style::default().add_modifier(Modifier::BOLD),
    )];
    let sample = live.last.as_ref();
    let sog = sample.and_then(|s| s.speed_over_ground);
    let rpm = sample.and_then(|s| s.engine_rpm);
    // A heading only from a heading sentence; course over ground is named as what it is.
    let direction = match (
        sample.and_then(|s| s.heading_deg),
        sample.and_then(|s| s.course_over_ground_deg),
    ) {
        (Some(h), _) => format!("heading {h:03.0}°"),
        (None, Some(c)) => format!("course over ground {c:03.0}°"),
        (None, None) => "heading —".into(),
    };
    let mut figures = vec![
        format!(
            "SOG {}",
            sog.map_or("—".into(), |v| units::format(v, Kind::Speed, system))
        ),
        format!("{} rpm", rpm.map_or("—".into(), |r| format!("{r:.0}"))),
        direction,
    ];
    if let Some(stw) = sample.and_then(|s| s.speed_through_water) {
        figures.push(format!("STW {}", units::format(stw, Kind::Speed, system)));
    }
    spans.push(Span::styled(figures.join(" · "), theme.accent));
    match (rpm.and_then(|r| predicted_at(app, r)), sog) {
        (Some((model, which)), Some(sog)) if model > 0.0 => {
            let error = sog - model;
            let error_text = units::format(error.abs(), Kind::Speed, system);
            let sign = if error < 0.0 { "−" } else { "+" };
            spans.push(Span::raw(format!(
                " · {which} {} · error {sign}{error_text} ({sign}{:.1} %)",
                units::format(model, Kind::Speed, system),
                100.0 * error.abs() / model
            )));
        }
        (None, _) if rpm.is_some() => spans.push(Span::raw(" · model: rpm outside the curve")),
        _ => {}
    }
    let state_style = match live.state {
        FeedState::Live => theme.dim,
        _ => theme.warning,
    };
    spans.push(Span::styled(
        format!(" · {} ({})", live.state, live.source),
        state_style,
    ));
    let steady = live.finder.current_segment();
    if let (Some(first), Some(last)) = (steady.first(), steady.last()) {
        spans.push(Span::styled(
            format!(" · steady {:.0} s", last.time_s - first.time_s),
            theme.dim,
        ));
    }
    // Why nothing is captured yet: a steady stretch becomes a run only when it ends, and the
    // last one dropped says what it lacked and which setting of an import would take it.
    let why = match (live.captured.is_empty(), live.finder.rejected().last()) {
        (false, _) => String::new(),
        (true, Some(r)) => {
            let hint = rejection_hint(&r.reason).map_or(String::new(), |h| {
                let h = if h.starts_with("--") {
                    format!("trial --import {h}")
                } else {
                    h.to_string()
                };
                format!("; {h}")
            });
            format!(" (last dropped: {}{hint})", r.reason)
        }
        (true, None) => " (a run is taken when the rpm changes after a steady stretch)".into(),
    };
    spans.push(Span::styled(
        format!(
            " · {} captured{why}",
            count(live.captured.len(), "run", "runs")
        ),
        theme.dim,
    ));
    Line::from(spans)
}

/// The captured runs for the sea-trial view, with the keys that keep, drop and use them.
pub fn captured_lines(app: &App) -> Vec<Line<'static>> {
    let Some(live) = &app.live else {
        return Vec::new();
    };
    let system = app.units;
    let unit = units::unit_label(Kind::Speed, system);
    let mut lines = vec![Line::styled(
        format!(
            "Live feed {} — {}: {} captured, {} kept (x keeps/drops, J/K move, g makes the kept runs the trial log)",
            live.source,
            live.state,
            count(live.captured.len(), "run", "runs"),
            live.captured.iter().filter(|c| c.kept).count()
        ),
        Style::default().add_modifier(Modifier::BOLD),
    )];
    if !live.captured.is_empty() {
        lines.push(Line::styled(
            format!(
                "  {:>3} {:>17} {:>6} {:>7} {:>7} {:>5} {:>9} {:>7}",
                "run", "time", "rpm", "SOG", "STW", "COG", "paired", "kept"
            ),
            app.theme.dim,
        ));
        lines.push(Line::styled(
            format!(
                "  {:>3} {:>17} {:>6} {:>7} {:>7} {:>5} {:>9} {:>7}",
                "", "", "", unit, unit, "°", "", ""
            ),
            app.theme.dim,
        ));
    }
    for (i, c) in live.captured.iter().enumerate() {
        let r = &c.run;
        let speed = |v: Option<f64>| {
            v.filter(|x| x.is_finite()).map_or("—".into(), |x| {
                format!("{:.2}", units::to_display(x, Kind::Speed, system))
            })
        };
        let text = format!(
            "{} {:>3} {:>17} {:>6.0} {:>7} {:>7} {:>5} {:>9} {:>7}",
            if i == live.selected { "▶" } else { " " },
            i + 1,
            format!("{}–{}", clock_of(r.start_s), clock_of(r.end_s)),
            r.engine_rpm,
            speed(Some(r.speed_over_ground)),
            speed(r.speed_through_water),
            r.course_over_ground_deg
                .map_or("—".into(), |d| format!("{d:03.0}")),
            r.pair.map_or("—".into(), |p| format!("run {}", p + 1)),
            if c.kept { "kept" } else { "dropped" },
        );
        let style = if c.kept {
            Style::default()
        } else {
            app.theme.dim
        };
        lines.push(Line::styled(text, style));
    }
    lines.push(Line::raw(""));
    lines
}
