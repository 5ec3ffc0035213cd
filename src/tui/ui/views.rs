//! The design views over the panes: the frame with its tabs, the helpers they share, and the
//! check lines (also summed up in the Screw pane). One file per view below.

pub mod calibration;
pub mod shortlist;
pub mod sweep;
pub mod what_if;

use calibration::calibration_lines;
use shortlist::shortlist_lines;
use sweep::sweep_lines;
use what_if::what_if_lines;

use super::CAUTION;
use crate::propulsion::screw::cavitation::{CavitationReport, PASCALS_PER_PSI};
use crate::propulsion::solver::Verdict;
use crate::tui::analysis::{ViewData, ViewKind};
use crate::tui::app::App;
use crate::tui::solve::{CheckPoint, Checks};
use crate::units::{self, Kind, UnitSystem};
use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::style::{Modifier, Style};
use ratatui::text::Line;
use ratatui::widgets::{Block, Borders, Clear, Paragraph, Widget, Wrap};

/// The mark beside a check past its limit (readable without colour).
pub const PAST_LIMIT: &str = "⚠ PAST LIMIT";

pub(crate) fn dash() -> String {
    "—".to_string()
}

/// A number in display units without its unit, or a dash.
pub(crate) fn number(
    value: Option<f64>,
    kind: Kind,
    system: UnitSystem,
    decimals: usize,
) -> String {
    match value.map(|v| units::to_display(v, kind, system)) {
        Some(v) if v.is_finite() => format!("{v:.decimals$}"),
        _ => dash(),
    }
}

/// The legend of a ≈-marked top speed.
pub(crate) const UNRELIABLE_TOP_LEGEND: &str = crate::report::what_if::UNRELIABLE_TOP_NOTE;

/// A top speed, marked ≈ when it lies outside the resistance method's range (unreliable).
pub(crate) fn top_speed(
    value: Option<f64>,
    in_range: Option<bool>,
    system: UnitSystem,
    decimals: usize,
) -> String {
    let text = number(value, Kind::Speed, system, decimals);
    if in_range == Some(false) && value.is_some() {
        format!("≈{text}")
    } else {
        text
    }
}

pub(crate) fn short_verdict(verdict: Option<Verdict>) -> &'static str {
    match verdict {
        Some(Verdict::Over) => "OVER",
        Some(Verdict::Matched) => "matched",
        Some(Verdict::Under) => "UNDER",
        None => "—",
    }
}

pub(crate) fn heading(app: &App, text: impl Into<String>) -> Line<'static> {
    Line::styled(text.into(), app.theme.focus.add_modifier(Modifier::BOLD))
}

/// Draws the open view over `area` (the panes, chart and readout).
pub fn draw_view(app: &App, kind: ViewKind, scroll: u16, area: Rect, buf: &mut Buffer) {
    Clear.render(area, buf);
    let tabs: Vec<String> = ViewKind::ALL
        .iter()
        .map(|k| {
            if *k == kind {
                format!("[{}]", k.title())
            } else {
                k.title().to_string()
            }
        })
        .collect();
    let block = Block::default()
        .borders(Borders::ALL)
        .border_style(app.theme.focus)
        .title(format!(" {} ", tabs.join(" · ")));
    let inner = block.inner(area);
    block.render(area, buf);
    if draw_power_chart(app, inner, buf) {
        return;
    }
    let (lines, highlighted) = view_lines_marked(app, inner.width as usize);
    let heights: Vec<u16> = lines
        .iter()
        .map(|l| super::field_list::wrapped_height(&l.to_string(), inner.width))
        .collect();
    let wrapped: u16 = heights.iter().sum();
    let last_top = wrapped.saturating_sub(inner.height);
    // The shortlist scrolls just far enough to keep its highlighted row on screen.
    let scroll = match highlighted {
        Some(row) => {
            let bottom: u16 = heights[..=row].iter().sum();
            bottom.saturating_sub(inner.height)
        }
        None => scroll,
    };
    Paragraph::new(lines)
        .wrap(Wrap { trim: false })
        .scroll((scroll.min(last_top), 0))
        .render(inner, buf);
}

/// Rows the power chart needs at the least; a smaller view keeps the table.
const MIN_CHART_ROWS: u16 = 8;
/// Rows below which the power chart's finding is left out to give the chart room.
const ROOMY_CHART_ROWS: u16 = 14;

/// Draws the shortlist's power-for-speed chart over `inner` when the user asked for it and
/// there is room and something to draw; whether it did.
fn draw_power_chart(app: &App, inner: Rect, buf: &mut Buffer) -> bool {
    let Some(ViewData::Shortlist(view)) = &app.view else {
        return false;
    };
    let (true, Ok(list)) = (app.shortlist_chart, &view.result) else {
        return false;
    };
    let Some(data) = &list.power_for_speed else {
        return false;
    };
    let height = |line: &Line| super::field_list::wrapped_height(&line.to_string(), inner.width);
    let caution_line = Line::styled(CAUTION, app.theme.dim);
    let caution = height(&caution_line);
    let rows_left = |lines: &[Line]| {
        let above: u16 = lines.iter().map(height).sum();
        inner.height.saturating_sub(above + caution)
    };
    // On a short screen the finding gives way to the chart; the highlighted point's words stay.
    let mut lines = shortlist::power_lines(app, list, data, true);
    if rows_left(&lines) < ROOMY_CHART_ROWS {
        lines = shortlist::power_lines(app, list, data, false);
    }
    let chart_rows = rows_left(&lines);
    if chart_rows < MIN_CHART_ROWS {
        return false;
    }
    let above: u16 = lines.iter().map(height).sum();
    let top = Rect {
        height: above,
        ..inner
    };
    let chart = Rect {
        y: inner.y + above,
        height: chart_rows,
        ..inner
    };
    let bottom = Rect {
        y: chart.y + chart_rows,
        height: caution,
        ..inner
    };
    Paragraph::new(lines)
        .wrap(Wrap { trim: false })
        .render(top, buf);
    let chart_view = shortlist::power_chart_view(app, list, data);
    super::chart::ChartWidget {
        view: &chart_view,
        frame_style: app.theme.dim,
    }
    .render(chart, buf);
    Paragraph::new(caution_line)
        .wrap(Wrap { trim: false })
        .render(bottom, buf);
    true
}

/// The open view's lines for a width of `width` columns.
pub fn view_lines(app: &App, width: usize) -> Vec<Line<'static>> {
    view_lines_marked(app, width).0
}

/// The open view's lines and the index of the highlighted one (the shortlist's row), if any.
fn view_lines_marked(app: &App, width: usize) -> (Vec<Line<'static>>, Option<usize>) {
    if let Some(computing) = &app.computing {
        return (
            vec![
                heading(app, computing.kind.title()),
                Line::default(),
                Line::raw(computing.line()),
            ],
            None,
        );
    }
    let (mut lines, highlighted) = match &app.view {
        Some(ViewData::Sweep(v)) => (sweep_lines(app, v), None),
        Some(ViewData::Calibration(v)) => (calibration_lines(app, v), None),
        Some(ViewData::WhatIf(v)) => (what_if_lines(app, v, width), None),
        Some(ViewData::Shortlist(v)) => shortlist_lines(app, v, width),
        None => (vec![Line::raw("nothing solved for this view")], None),
    };
    lines.push(Line::default());
    lines.push(Line::styled(CAUTION, app.theme.dim));
    (lines, highlighted)
}

fn mark(passed: bool) -> &'static str {
    if passed { "ok" } else { PAST_LIMIT }
}

/// One point's cavitation figures: Keller, Burrill, blade loading and tip speed.
pub fn cavitation_text(report: &CavitationReport, system: UnitSystem) -> String {
    let k = &report.keller_area_ratio;
    let b = &report.thrust_loading;
    let l = &report.blade_loading;
    let tip = match system {
        UnitSystem::Metric => format!("{:.1} m/s", report.tip_speed),
        UnitSystem::Imperial => format!("{:.0} ft/s", report.tip_speed / 0.3048),
    };
    format!(
        "Keller AE/A0 {:.2} vs min {:.2} {} · Burrill τc {:.3} vs {:.3} {} · loading {:.1} psi / {:.0} kPa vs {:.0} psi {} · tip {tip}",
        k.value,
        k.limit,
        mark(k.passed),
        b.value,
        b.limit,
        mark(b.passed),
        l.value / PASCALS_PER_PSI,
        l.value / 1000.0,
        l.limit / PASCALS_PER_PSI,
        mark(l.passed),
    )
}

/// The lines of the active variant's checks, for the what-if view.
pub(crate) fn check_lines(app: &App, checks: &Checks) -> Vec<Line<'static>> {
    let system = app.units;
    let mut lines = Vec::new();
    for (point, report) in &checks.cavitation {
        let at = match point {
            CheckPoint::Target => "at target speed",
            CheckPoint::Top => "at top speed",
        };
        match report {
            Ok(r) => {
                let style = if r.all_passed() {
                    Style::default()
                } else {
                    app.theme.error.add_modifier(Modifier::BOLD)
                };
                lines.push(Line::styled(
                    format!("{at}: {}", cavitation_text(r, system)),
                    style,
                ));
            }
            Err(why) => lines.push(Line::styled(
                format!("{at}: not checked: {why}"),
                app.theme.warning,
            )),
        }
    }
    if let Some(depth) = checks.shaft_immersion {
        lines.push(Line::styled(
            format!(
                "shaft immersion {}",
                units::format(depth, Kind::Length, system)
            ),
            app.theme.dim,
        ));
    }
    lines.push(match &checks.shaft {
        Ok(s) => {
            let existing = s.existing_diameter.map_or_else(
                || "the boat file gives no shaft diameter".to_string(),
                |d| {
                    format!(
                        "boat's shaft {} {}",
                        units::format(d, Kind::ScrewLength, system),
                        if d >= s.min_diameter {
                            "ok"
                        } else {
                            "⚠ SMALLER THAN THE MINIMUM"
                        }
                    )
                },
            );
            let text = format!(
                "Shaft: {:.0} N·m on the shaft needs at least {} of {} (safety factor {:.0}); {existing}",
                s.shaft_torque,
                units::format(s.min_diameter, Kind::ScrewLength, system),
                s.material.name,
                s.safety_factor
            );
            if checks.shaft_too_small() {
                Line::styled(text, app.theme.error.add_modifier(Modifier::BOLD))
            } else {
                Line::raw(text)
            }
        }
        Err(why) => Line::styled(format!("Shaft not checked: {why}"), app.theme.warning),
    });
    if let Some(note) = &checks.shaft_note {
        lines.push(Line::styled(format!("Shaft: {note}"), app.theme.dim));
    }
    if let Some(duty) = &checks.duty {
        lines.push(Line::raw(format!(
            "Engine duty at the target speed: {duty}"
        )));
    }
    lines
}

/// The one-line cavitation and shaft summary for the Screw pane.
pub fn screw_pane_check_line(checks: &Checks) -> String {
    let mut failed: Vec<String> = Vec::new();
    for (point, report) in &checks.cavitation {
        if let Ok(r) = report {
            let mut what = Vec::new();
            if !r.keller_area_ratio.passed {
                what.push("Keller");
            }
            if !r.thrust_loading.passed {
                what.push("Burrill");
            }
            if !r.blade_loading.passed {
                what.push("loading");
            }
            if !what.is_empty() {
                let at = match point {
                    CheckPoint::Target => "target",
                    CheckPoint::Top => "top",
                };
                failed.push(format!("{} at {at}", what.join("+")));
            }
        }
    }
    let mut text = if failed.is_empty() {
        let checked = checks.cavitation.iter().filter(|(_, r)| r.is_ok()).count();
        if checked == 0 {
            "Cavitation not checked (w)".to_string()
        } else {
            "Cavitation ok at target and top (w)".to_string()
        }
    } else {
        format!("⚠ Cavitation: {} (w)", failed.join(", "))
    };
    if checks.shaft_too_small() {
        text.push_str(" ⚠ shaft too small");
    }
    text
}
