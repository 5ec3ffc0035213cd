//! The what-if view: the conditions cases and the uncertainty band.

use super::{UNRELIABLE_TOP_LEGEND, check_lines, dash, heading, number, short_verdict, top_speed};
use crate::propulsion::solver::conditions::ConditionOutcome;
use crate::report::what_if::{missing_loads_line, shown_outcomes};
use crate::tui::app::App;
use crate::units::{self, Kind, UnitSystem};
use ratatui::style::{Modifier, Style};
use ratatui::text::Line;

pub(crate) fn what_if_lines(
    app: &App,
    view: &crate::tui::analysis::WhatIfView,
    width: usize,
) -> Vec<Line<'static>> {
    let system = app.units;
    let mut lines = vec![heading(
        app,
        format!("{} under each condition (same screw)", view.label),
    )];
    match &view.outcomes {
        Ok(outcomes) => {
            // The rows the report shows: no load case that only repeats the boat as given.
            let shown: Vec<ConditionOutcome> = shown_outcomes(outcomes)
                .into_iter()
                .map(|i| outcomes[i].clone())
                .collect();
            lines.extend(outcome_table(app, &shown, width));
            if let Some(line) = missing_loads_line(&app.doc.boat.load) {
                lines.push(Line::styled(line, app.theme.dim));
            }
        }
        Err(why) => lines.push(Line::styled(
            format!("no comparison: {why}"),
            app.theme.error,
        )),
    }
    lines.push(Line::default());
    lines.push(heading(app, "Uncertainty (displacement ±10 %, wake ±0.05)"));
    match &app.band {
        Some(Ok(band)) => {
            let f = |p: Option<f64>| {
                p.map_or_else(dash, |p| units::format(p, Kind::ScrewLength, system))
            };
            let mut text = format!(
                "Recommended pitch {} with range {} to {}",
                f(band.pitch_nominal),
                f(band.pitch_low),
                f(band.pitch_high)
            );
            if band.unsolved_cases > 0 {
                text.push_str(&format!(" ({} cases unsolved)", band.unsolved_cases));
            }
            lines.push(Line::styled(text, app.theme.accent));
            if let Some(condition) = app.solution.recommendation_condition(system) {
                lines.push(Line::styled(format!("made for {condition}"), app.theme.dim));
            }
            lines.push(Line::styled(
                "b draws the band on the power chart",
                app.theme.dim,
            ));
        }
        Some(Err(why)) => lines.push(Line::styled(format!("no band: {why}"), app.theme.error)),
        None => {}
    }
    if let Some(solved) = app.solution.solved() {
        lines.push(Line::default());
        lines.push(heading(app, "Cavitation, shaft and engine duty"));
        lines.extend(check_lines(app, &solved.checks));
    }
    lines
}

fn outcome_table(app: &App, outcomes: &[ConditionOutcome], width: usize) -> Vec<Line<'static>> {
    let system = app.units;
    let label_width = 14;
    let cell = ((width.saturating_sub(label_width)) / outcomes.len().max(1)).clamp(7, 12);
    let density = app
        .solution
        .solved()
        .map_or(1025.0, |s| s.vessel.resistance.water.density);
    let row = |label: String, cells: Vec<String>, style: Style| {
        let mut text = format!("{label:<label_width$}");
        for c in cells {
            let c: String = c.chars().take(cell - 1).collect();
            text.push_str(&format!("{c:>cell$}"));
        }
        Line::styled(text, style)
    };
    let u = |k: Kind| units::unit_label(k, system);
    let bold = Style::default().add_modifier(Modifier::BOLD);
    let mut lines = vec![row(
        String::new(),
        outcomes.iter().map(|o| o.condition.label.clone()).collect(),
        bold,
    )];
    let each = |f: &dyn Fn(&ConditionOutcome) -> String| outcomes.iter().map(f).collect();
    lines.push(row(
        format!("displ. {}", u(Kind::Mass)),
        each(&|o| {
            number(
                Some(o.condition.displacement_volume * density),
                Kind::Mass,
                system,
                if system == UnitSystem::Metric { 2 } else { 0 },
            )
        }),
        Style::default(),
    ));
    lines.push(row(
        "verdict".into(),
        each(&|o| short_verdict(o.verdict).to_string()),
        bold,
    ));
    lines.push(row(
        "full-thr. rpm".into(),
        each(&|o| o.full_throttle_rpm.map_or_else(dash, |r| format!("{r:.0}"))),
        Style::default(),
    ));
    lines.push(row(
        format!("top {}", u(Kind::Speed)),
        each(&|o| top_speed(o.top_speed, o.top_speed_in_method_range, system, 2)),
        Style::default(),
    ));
    lines.push(row(
        "absorbed %".into(),
        each(&|o| {
            o.absorbed_fraction_at_rated
                .map_or_else(dash, |a| format!("{:.0}", a * 100.0))
        }),
        Style::default(),
    ));
    lines.push(row(
        "cruise rpm".into(),
        each(&|o| o.cruise_rpm.map_or_else(dash, |r| format!("{r:.0}"))),
        Style::default(),
    ));
    lines.push(row(
        format!("power {}", u(Kind::Power)),
        each(&|o| number(o.cruise_power, Kind::Power, system, 1)),
        Style::default(),
    ));
    lines.push(row(
        format!("fuel {}", u(Kind::FuelRate)),
        each(&|o| number(o.cruise_fuel_volume_flow, Kind::FuelRate, system, 2)),
        Style::default(),
    ));
    lines.push(Line::styled(
        format!(
            "cruise = at the target speed {}; fouled adds {:.0} % friction, sea state {:.0} % margin",
            units::format(
                app.solution
                    .solved()
                    .map_or(0.0, |s| s.vessel.trip.target_speed),
                Kind::Speed,
                system
            ),
            crate::tui::analysis::FOULED_EXTRA * 100.0,
            crate::tui::analysis::SEA_STATE_EXTRA * 100.0
        ),
        app.theme.dim,
    ));
    if outcomes
        .iter()
        .any(|o| o.top_speed_in_method_range == Some(false))
    {
        lines.push(Line::styled(UNRELIABLE_TOP_LEGEND, app.theme.warning));
    }
    for o in outcomes {
        if let Some(p) = &o.problem {
            lines.push(Line::styled(
                format!("{}: {p}", o.condition.label),
                app.theme.warning,
            ));
        }
        // What a case leaves out (one engine out: the trailing screw's drag).
        for w in &o.warnings {
            lines.push(Line::styled(format!("† {}", w.message), app.theme.warning));
        }
    }
    lines
}
