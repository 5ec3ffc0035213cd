//! The readout strip: the target speed and, per variant, its match, cruise and verdict.

use super::CAUTION;
use crate::propulsion::hull::UNRELIABLE_WORDS;
use crate::propulsion::solver::Verdict;
use crate::report::text::signed_rpm;
use crate::tui::app::{App, EditTarget};
use crate::tui::edit;
use crate::units::{self, Kind};
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};

fn verdict_text(verdict: Verdict) -> &'static str {
    match verdict {
        Verdict::Over => "OVER-PROPPED",
        Verdict::Matched => "MATCHED",
        Verdict::Under => "UNDER-PROPPED",
    }
}

/// The readout lines: target-speed figures, the active variant's margin and verdict, the caution.
pub fn readout_lines(app: &App) -> Vec<Line<'static>> {
    let system = app.units;
    let theme = &app.theme;
    let target = edit::target_speed(&app.doc.boat);
    let mut lines = Vec::new();
    let target_text = match &app.edit {
        Some(edit) if edit.target == EditTarget::TargetSpeed => format!("{}▏", edit.text),
        _ => units::format(target, Kind::Speed, system),
    };
    let mut first = vec![Span::styled(
        format!("At {target_text}: "),
        Style::default().add_modifier(Modifier::BOLD),
    )];
    match app.solution.active().map(|v| &v.cruise) {
        Some(Ok(c)) => {
            let p = &c.point;
            let figures = [
                format!("{:.0} rpm", p.engine_rpm),
                if p.driven_shafts >= 2 {
                    // Load is each engine's too; fuel and range stay the boat's.
                    let each = units::format(p.brake_power_per_engine, Kind::Power, system);
                    format!("{each} each engine")
                } else {
                    units::format(p.brake_power, Kind::Power, system)
                },
                match app
                    .solution
                    .solved()
                    .and_then(|s| s.checks.duty.as_ref())
                    .and_then(|d| d.split_once("; "))
                {
                    Some((_, duty)) => format!("load {:.0} % ({duty})", p.load_fraction * 100.0),
                    None => format!("load {:.0} %", p.load_fraction * 100.0),
                },
                units::format(p.fuel_volume_flow, Kind::FuelRate, system),
                units::format(c.fuel_per_distance, Kind::FuelPerDistance, system),
                format!(
                    "range {:.0} {}",
                    units::to_display(c.range, Kind::Distance, system),
                    units::unit_label(Kind::Distance, system)
                ),
            ];
            first.push(Span::styled(figures.join(" · "), theme.accent));
            if c.beyond_full_load {
                first.push(Span::styled("  beyond full load!", theme.error));
            }
        }
        Some(Err(why)) => first.push(Span::styled(format!("not reachable: {why}"), theme.error)),
        None => first.push(Span::styled(
            app.solution
                .result
                .as_ref()
                .err()
                .cloned()
                .unwrap_or_default(),
            theme.error,
        )),
    }
    if let Some(problem) = app
        .edit
        .as_ref()
        .filter(|e| e.target == EditTarget::TargetSpeed)
        .and_then(|e| e.problem.as_ref())
    {
        first.push(Span::styled(format!("  ✗ {problem}"), theme.error));
    }
    lines.push(Line::from(first));
    if let Some(variant) = app.solution.active() {
        let line = match &variant.matched {
            Ok(m) => {
                let verdict_style = match m.verdict {
                    Verdict::Matched => theme.accent.add_modifier(Modifier::BOLD),
                    _ => theme.warning.add_modifier(Modifier::BOLD),
                };
                // One margin for every front end: the core's, in the report's words.
                let rated_rpm = app
                    .solution
                    .solved()
                    .map_or(m.meeting_rpm - m.rpm_margin, |s| s.vessel.engine.rated_rpm);
                // Short for the strip; the report's words say the same ("runs free … past rated").
                let bound = if m.margin_is_lower_bound { "≥" } else { "" };
                let mut spans = vec![Span::raw(format!(
                    "{}: margin {bound}{} at rated {rated_rpm:.0} · absorbs {:.0} % · top ",
                    variant.label,
                    signed_rpm(m.rpm_margin),
                    m.absorbed_fraction_at_rated * 100.0,
                ))];
                if m.top_speed_in_method_range {
                    spans.push(Span::raw(format!(
                        "{} · ",
                        units::format(m.top_speed, Kind::Speed, system)
                    )));
                } else {
                    spans.push(Span::styled(
                        format!(
                            "≈{} UNRELIABLE ({})",
                            units::format(m.top_speed, Kind::Speed, system),
                            m.top_validity
                                .brief()
                                .unwrap_or_else(|| UNRELIABLE_WORDS.to_owned())
                        ),
                        theme.warning.add_modifier(Modifier::BOLD),
                    ));
                    spans.push(Span::raw(" · "));
                }
                spans.push(Span::styled(verdict_text(m.verdict), verdict_style));
                // The other method's top speed: the spread is a real uncertainty.
                if let Some(spread) = &variant.method_spread {
                    let name = spread.alternative.split(" (").next().unwrap_or_default();
                    let top = spread
                        .alternative_top_speed
                        .map_or("—".to_string(), |v| units::format(v, Kind::Speed, system));
                    spans.push(Span::raw(format!(" · by {name}: top {top}")));
                }
                Line::from(spans)
            }
            Err(why) => Line::styled(
                format!("{}: no match with the engine: {why}", variant.label),
                theme.error,
            ),
        };
        lines.push(line);
        // The planned screw against the boat as found, in the report's words.
        if let Some(base) = &app.solution.baseline {
            let d = crate::report::Display::new(system);
            let after = crate::study::baseline::Headline::of(variant);
            lines.push(Line::from(vec![
                Span::styled("vs as found: ", theme.dim),
                Span::raw(crate::report::baseline::change_line(
                    &base.figures,
                    &after,
                    &d,
                )),
            ]));
        }
    }
    if let Some(live) = &app.live {
        lines.push(super::live::readout_line(app, live));
    }
    lines.push(Line::styled(CAUTION, theme.dim));
    lines
}
