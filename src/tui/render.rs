//! Drawing: a pure function of [`App`]; it reads the state and changes nothing.

use super::app::{App, EditTarget, Level, Overlay, PickKind};
use super::chart::{ChartKind, ChartView, ChartWidget, Glyph, Series, SeriesShape};
use super::field_list::{FieldList, TypedValue};
use super::fields::{self, Pane};
use super::keys::{self, Mode};
use crate::propulsion::solver::Verdict;
use crate::report::boat::signed_rpm;
use crate::units::{self, Kind, UnitSystem};
use ratatui::Frame;
use ratatui::buffer::Buffer;
use ratatui::layout::{Constraint, Layout, Rect};
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Borders, Clear, Paragraph, Widget, Wrap};

/// The smallest terminal the screen is laid out for.
pub const MIN_WIDTH: u16 = 80;
/// The smallest terminal height the screen is laid out for.
pub const MIN_HEIGHT: u16 = 24;

/// The caution shown beside the verdict and the engine load.
pub const CAUTION: &str = "Estimates only: the engine maker's installation limits, local codes and a licensed \
                           marine surveyor or naval architect decide.";

/// Width from which all three panes are shown at once.
const WIDE: u16 = 110;
/// Height from which all three panes are shown at once.
const TALL: u16 = 34;

/// Draws the whole screen for `app`.
pub fn render(app: &App, frame: &mut Frame) {
    draw(app, frame.area(), frame.buffer_mut());
}

/// Draws the whole screen for `app` into `buf` over `area`.
pub fn draw(app: &App, area: Rect, buf: &mut Buffer) {
    if area.width < MIN_WIDTH || area.height < MIN_HEIGHT {
        too_small(area, buf);
        return;
    }
    let readout_text = readout_lines(app);
    let readout_height: u16 = readout_text
        .iter()
        .map(|l| super::field_list::wrapped_height(&l.to_string(), area.width))
        .sum::<u16>()
        .min(6);
    let [header, main, readout, status, footer] = Layout::vertical([
        Constraint::Length(1),
        Constraint::Min(10),
        Constraint::Length(readout_height),
        Constraint::Length(1),
        Constraint::Length(1),
    ])
    .areas(area);
    draw_header(app, header, buf);
    let pane_width = if area.width >= WIDE { 50 } else { 38 };
    let [left, right] =
        Layout::horizontal([Constraint::Length(pane_width), Constraint::Min(20)]).areas(main);
    if area.width >= WIDE && area.height >= TALL {
        // Screw and Powerplant fit whole; the Vessel pane, the longest, scrolls with the selection.
        let rects = Layout::vertical([
            Constraint::Min(7),
            Constraint::Length(12),
            Constraint::Length(13),
        ])
        .split(left);
        for (pane, rect) in Pane::ALL.iter().zip(rects.iter()) {
            draw_pane(app, *pane, *rect, buf);
        }
    } else {
        let [tabs, body] =
            Layout::vertical([Constraint::Length(1), Constraint::Min(3)]).areas(left);
        draw_tabs(app, tabs, buf);
        draw_pane(app, app.focus, body, buf);
    }
    let view = chart_view(app);
    ChartWidget {
        view: &view,
        frame_style: app.theme.dim,
    }
    .render(right, buf);
    Paragraph::new(readout_text)
        .wrap(Wrap { trim: true })
        .render(readout, buf);
    draw_status(app, status, buf);
    draw_footer(app, footer, buf);
    match &app.overlay {
        Overlay::None => {}
        Overlay::Help { scroll } => draw_help(app, *scroll, area, buf),
        Overlay::Pick {
            kind,
            entries,
            highlighted,
        } => draw_picker(app, *kind, entries, *highlighted, area, buf),
        Overlay::Confirm(question) => draw_question(app, question.text(), area, buf),
        Overlay::View { kind, scroll } => {
            // Over the panes, chart and readout; the header, status and footer stay in view.
            let cover = Rect {
                height: main.height + readout.height,
                ..main
            };
            super::views::draw_view(app, *kind, *scroll, cover, buf);
        }
    }
}

fn too_small(area: Rect, buf: &mut Buffer) {
    let text = vec![
        Line::from(format!(
            "tidewright needs {MIN_WIDTH}×{MIN_HEIGHT} or more."
        )),
        Line::from(format!("This terminal is {}×{}.", area.width, area.height)),
        Line::from("Make it larger, or press q to quit."),
    ];
    Paragraph::new(text)
        .wrap(Wrap { trim: true })
        .render(area, buf);
}

fn draw_header(app: &App, area: Rect, buf: &mut Buffer) {
    let mut spans = vec![
        Span::styled(
            " tidewright ",
            app.theme.focus.add_modifier(Modifier::REVERSED),
        ),
        Span::raw(" "),
        Span::styled(
            app.name.clone(),
            Style::default().add_modifier(Modifier::BOLD),
        ),
    ];
    if app.dirty() {
        spans.push(Span::styled(" ● unsaved", app.theme.warning));
    }
    if !app.savable {
        spans.push(Span::styled(" (demo, read-only)", app.theme.dim));
    }
    if app.changed_on_disk {
        spans.push(Span::styled(" ⚠ file changed on disk", app.theme.error));
    }
    if let Some(cal) = &app.doc.boat.calibration {
        spans.push(Span::styled(
            format!(" · calibrated ×{:.3}", cal.resistance_factor),
            app.theme.accent,
        ));
    }
    let units = match app.units {
        UnitSystem::Metric => "metric",
        UnitSystem::Imperial => "imperial",
    };
    spans.push(Span::styled(format!("  · units {units}"), app.theme.dim));
    Line::from(spans).render(area, buf);
}

fn draw_tabs(app: &App, area: Rect, buf: &mut Buffer) {
    let mut spans = Vec::new();
    for pane in Pane::ALL {
        let style = if pane == app.focus {
            app.theme
                .focus
                .add_modifier(Modifier::REVERSED | Modifier::BOLD)
        } else {
            app.theme.dim
        };
        spans.push(Span::styled(format!(" {} ", pane.title()), style));
        spans.push(Span::raw(" "));
    }
    Line::from(spans).render(area, buf);
}

fn draw_pane(app: &App, pane: Pane, area: Rect, buf: &mut Buffer) {
    let rows = fields::rows(pane, app);
    let focused = app.focus == pane && app.overlay == Overlay::None;
    let typing = match &app.edit {
        Some(edit) if focused && matches!(edit.target, EditTarget::Field(_)) => Some(TypedValue {
            text: &edit.text,
            problem: edit.problem.as_deref(),
        }),
        _ => None,
    };
    let extra = fields::pane_notes(pane, app);
    let selected = app.selected[pane.index()].min(rows.len().saturating_sub(1));
    FieldList {
        title: &pane_title(app, pane),
        rows: &rows,
        selected,
        focused,
        typing,
        footer_lines: &extra,
        theme: &app.theme,
    }
    .render(area, buf);
}

fn pane_title(app: &App, pane: Pane) -> String {
    match pane {
        Pane::Screw => {
            let count = super::edit::variant_count(&app.doc.boat);
            let active = super::edit::active_variant(&app.doc.boat);
            format!("Screw · variant {} of {count}", active + 1)
        }
        _ => pane.title().to_string(),
    }
}

/// The glyph that marks variant `index` on the charts and in the legend.
pub fn variant_glyph(index: usize) -> Glyph {
    Glyph::FOR_VARIANTS[index % Glyph::FOR_VARIANTS.len()]
}

/// A few evenly spread points of `points`, for the variant's marker glyphs.
fn every_nth(points: &[(f64, f64)], count: usize) -> Vec<(f64, f64)> {
    if points.is_empty() {
        return Vec::new();
    }
    let step = (points.len() / count.max(1)).max(1);
    points
        .iter()
        .skip(step / 2)
        .step_by(step)
        .copied()
        .collect()
}

fn convert(points: &[(f64, f64)], x: Option<Kind>, y: Kind, system: UnitSystem) -> Vec<(f64, f64)> {
    points
        .iter()
        .map(|&(px, py)| {
            let px = x.map_or(px, |k| units::to_display(px, k, system));
            (px, units::to_display(py, y, system))
        })
        .filter(|(px, py)| px.is_finite() && py.is_finite())
        .collect()
}

/// Legend of the dotted part of a curve past the resistance method's range.
const UNRELIABLE_LEGEND: &str = "••• unreliable";

/// The chart for the app's current chart kind, in display units.
pub fn chart_view(app: &App) -> ChartView {
    let system = app.units;
    let kind = app.chart;
    let (x_kind, y_kind, x_title, y_title) = match kind {
        ChartKind::PowerVsRpm => (
            None,
            Kind::Power,
            "engine rpm".to_string(),
            units::unit_label(Kind::Power, system),
        ),
        ChartKind::SpeedVsRpm => (
            None,
            Kind::Speed,
            "engine rpm".to_string(),
            units::unit_label(Kind::Speed, system),
        ),
        ChartKind::FuelVsRpm => (
            None,
            Kind::FuelRate,
            "engine rpm".to_string(),
            units::unit_label(Kind::FuelRate, system),
        ),
        ChartKind::RangeVsSpeed => (
            Some(Kind::Speed),
            Kind::Distance,
            format!("speed {}", units::unit_label(Kind::Speed, system)),
            units::unit_label(Kind::Distance, system),
        ),
    };
    let mut view = ChartView {
        title: kind.title().to_string(),
        x_title,
        y_title: y_title.to_string(),
        series: Vec::new(),
        note: None,
    };
    let solved = match &app.solution.result {
        Ok(s) => s,
        Err(why) => {
            view.note = Some(format!("nothing to draw: {why}"));
            return view;
        }
    };
    let reference = app.theme.reference();
    let max_rpm = solved.envelope.iter().map(|p| p.0).fold(0.0, f64::max);
    if kind == ChartKind::PowerVsRpm {
        view.series.push(Series {
            name: Some("━ full load".into()),
            points: convert(&solved.envelope, None, Kind::Power, system),
            shape: SeriesShape::Line,
            style: reference,
        });
        let rated = solved.vessel.engine.rated_rpm;
        let top = solved.envelope.iter().map(|p| p.1).fold(0.0, f64::max);
        view.series.push(Series {
            name: Some(format!("┆ rated {rated:.0} rpm")),
            points: convert(
                &[(rated, 0.0), (rated, top * 1.02)],
                None,
                Kind::Power,
                system,
            ),
            shape: SeriesShape::Line,
            style: reference.add_modifier(Modifier::DIM),
        });
        if let (true, Some(Ok(band))) = (app.band_shown, &app.band) {
            let low: Vec<(f64, f64)> = band
                .points
                .iter()
                .filter_map(|p| Some((p.engine_rpm, p.low_power?)))
                .collect();
            let high: Vec<(f64, f64)> = band
                .points
                .iter()
                .filter_map(|p| Some((p.engine_rpm, p.high_power?)))
                .collect();
            for (name, points) in [
                (Some("⠤ band ±10 % ∇, ±0.05 w".to_string()), low),
                (None, high),
            ] {
                view.series.push(Series {
                    name,
                    points: convert(&points, None, Kind::Power, system),
                    shape: SeriesShape::Line,
                    style: app.theme.dim,
                });
            }
        }
    }
    let mut meetings = Vec::new();
    for (index, variant) in solved.variants.iter().enumerate() {
        let style = app.theme.series[index % app.theme.series.len()];
        let raw = match kind {
            ChartKind::PowerVsRpm => &variant.power_by_rpm,
            ChartKind::SpeedVsRpm => &variant.speed_by_rpm,
            ChartKind::FuelVsRpm => &variant.fuel_by_rpm,
            ChartKind::RangeVsSpeed => &variant.range_by_speed,
        };
        let mut points = convert(raw, x_kind, y_kind, system);
        if x_kind.is_none() && max_rpm > 0.0 {
            points.retain(|p| p.0 <= max_rpm * 1.04);
        }
        let glyph = variant_glyph(index);
        let active = if index == solved.vessel.active_variant {
            " ◀"
        } else {
            ""
        };
        // Past the first point outside the resistance method's range the curve is an
        // extrapolation: drawn as a chain of dots in the warning colour instead of a line.
        let threshold = variant.unreliable_from.map(|(rpm, speed)| match x_kind {
            Some(kind) => units::to_display(speed, kind, system),
            None => rpm,
        });
        let split = threshold.map_or(points.len(), |x| points.partition_point(|p| p.0 < x));
        let (reliable, unreliable) = (points[..split].to_vec(), points[split..].to_vec());
        view.series.push(Series {
            name: None,
            points: reliable.clone(),
            shape: SeriesShape::Line,
            style,
        });
        view.series.push(Series {
            name: Some(format!("{} {}{active}", glyph.symbol(), variant.label)),
            points: every_nth(&reliable, 6),
            shape: SeriesShape::Points(glyph),
            style,
        });
        if !unreliable.is_empty() {
            let named = !view
                .series
                .iter()
                .any(|s| s.name.as_deref() == Some(UNRELIABLE_LEGEND));
            view.series.push(Series {
                name: named.then(|| UNRELIABLE_LEGEND.to_string()),
                points: unreliable,
                shape: SeriesShape::Points(Glyph::Dot),
                style: app.theme.warning,
            });
        }
        if let Ok(m) = &variant.matched {
            let p = m.top_point;
            let point = match kind {
                ChartKind::PowerVsRpm => (
                    p.engine_rpm,
                    units::to_display(p.brake_power, Kind::Power, system),
                ),
                ChartKind::SpeedVsRpm => (
                    p.engine_rpm,
                    units::to_display(p.speed, Kind::Speed, system),
                ),
                ChartKind::FuelVsRpm => (
                    p.engine_rpm,
                    units::to_display(p.fuel_volume_flow, Kind::FuelRate, system),
                ),
                ChartKind::RangeVsSpeed => {
                    let range = variant.range_by_speed.last().map_or(f64::NAN, |r| r.1);
                    (
                        units::to_display(p.speed, Kind::Speed, system),
                        units::to_display(range, Kind::Distance, system),
                    )
                }
            };
            if point.0.is_finite() && point.1.is_finite() {
                meetings.push(point);
            }
        }
    }
    if !meetings.is_empty() {
        view.series.push(Series {
            name: Some(format!("{} full throttle", Glyph::Block.symbol())),
            points: meetings,
            shape: SeriesShape::Points(Glyph::Block),
            style: reference.add_modifier(Modifier::BOLD),
        });
    }
    if kind == ChartKind::SpeedVsRpm {
        if solved.trial.is_empty() {
            view.note = Some("no sea-trial log for this boat".into());
        } else {
            view.series.push(Series {
                name: Some("▄ sea trial".into()),
                points: convert(&solved.trial, None, Kind::Speed, system),
                shape: SeriesShape::Points(Glyph::Bar),
                style: app.theme.accent,
            });
        }
    }
    if let Some(failure) = solved
        .variants
        .iter()
        .find_map(|v| v.curve_failure.as_ref())
    {
        view.note
            .get_or_insert_with(|| format!("some points not solved: {failure}"));
    }
    view
}

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
    let target = super::edit::target_speed(&app.doc.boat);
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
                units::format(p.brake_power, Kind::Power, system),
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
                            "≈{} UNRELIABLE (Fn {:.2})",
                            units::format(m.top_speed, Kind::Speed, system),
                            m.top_validity.froude
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
    }
    lines.push(Line::styled(CAUTION, theme.dim));
    lines
}

fn draw_status(app: &App, area: Rect, buf: &mut Buffer) {
    if let Some(status) = &app.status {
        let style = match status.level {
            Level::Info => app.theme.accent,
            Level::Error => app.theme.error,
        };
        Line::styled(status.text.clone(), style).render(area, buf);
    } else if let Some(w) = app.solution.solved().and_then(|s| s.warnings.first()) {
        Line::styled(format!("! {w}"), app.theme.warning).render(area, buf);
    }
}

/// The footer's hints that fit in `width`: the table's order, but help and quit always stay.
pub fn footer_hints_fitting(mode: Mode, width: u16) -> Vec<(&'static str, &'static str)> {
    let hints = keys::footer_hints(mode);
    let cost = |(k, h): &(&str, &str)| k.chars().count() + h.chars().count() + 3;
    let kept_last: Vec<_> = hints
        .iter()
        .filter(|(_, h)| *h == "help" || *h == "quit")
        .copied()
        .collect();
    let mut budget = (width as usize).saturating_sub(kept_last.iter().map(cost).sum());
    let mut out = Vec::new();
    for hint in hints.iter().filter(|(_, h)| *h != "help" && *h != "quit") {
        if cost(hint) > budget {
            break;
        }
        budget -= cost(hint);
        out.push(*hint);
    }
    out.extend(kept_last);
    out
}

fn draw_footer(app: &App, area: Rect, buf: &mut Buffer) {
    let mut spans = Vec::new();
    for (key, hint) in footer_hints_fitting(app.mode(), area.width) {
        spans.push(Span::styled(
            key,
            app.theme.focus.add_modifier(Modifier::BOLD),
        ));
        spans.push(Span::styled(format!(" {hint}  "), app.theme.dim));
    }
    Line::from(spans).render(area, buf);
}

fn centred(area: Rect, width: u16, height: u16) -> Rect {
    let width = width.min(area.width);
    let height = height.min(area.height);
    Rect {
        x: area.x + (area.width - width) / 2,
        y: area.y + (area.height - height) / 2,
        width,
        height,
    }
}

/// Width of the key column in the help overlay.
const HELP_KEY_WIDTH: usize = 18;

/// The help overlay's lines for the modes given: every binding, its help wrapped to `width`.
fn help_lines(app: &App, modes: &[Mode], width: usize) -> Vec<Line<'static>> {
    let help_width = width.saturating_sub(HELP_KEY_WIDTH + 1).max(1);
    let mut lines = Vec::new();
    for mode in modes {
        lines.push(Line::styled(
            mode.heading().to_string(),
            app.theme.focus.add_modifier(Modifier::BOLD),
        ));
        for b in keys::bindings_for(*mode) {
            let keys = keys::key_labels(b);
            for (index, part) in wrap_words(b.help, help_width).into_iter().enumerate() {
                let key_column = if index == 0 { keys.as_str() } else { "" };
                lines.push(Line::from(vec![
                    Span::styled(
                        format!("{key_column:<HELP_KEY_WIDTH$} "),
                        Style::default().add_modifier(Modifier::BOLD),
                    ),
                    Span::raw(part),
                ]));
            }
        }
    }
    lines
}

/// `text` broken at spaces into lines of at most `width` characters (a longer word is split).
fn wrap_words(text: &str, width: usize) -> Vec<String> {
    let mut lines = Vec::new();
    let mut current = String::new();
    for word in text.split_whitespace() {
        let mut word: Vec<char> = word.chars().collect();
        while word.len() > width {
            if !current.is_empty() {
                lines.push(std::mem::take(&mut current));
            }
            lines.push(word.drain(..width).collect());
        }
        let word: String = word.into_iter().collect();
        let needed =
            current.chars().count() + usize::from(!current.is_empty()) + word.chars().count();
        if needed > width && !current.is_empty() {
            lines.push(std::mem::take(&mut current));
        }
        if !current.is_empty() {
            current.push(' ');
        }
        current.push_str(&word);
    }
    if !current.is_empty() || lines.is_empty() {
        lines.push(current);
    }
    lines
}

fn marker_lines(app: &App) -> Vec<Line<'static>> {
    vec![
        Line::default(),
        Line::styled("Markers", app.theme.focus.add_modifier(Modifier::BOLD)),
        Line::raw(format!(
            "{}  value estimated (the reason shows when selected)",
            super::field_list::ESTIMATED_MARK
        )),
        Line::raw(format!(
            "{}  value with a warning",
            super::field_list::WARNING_MARK
        )),
    ]
}

fn draw_help(app: &App, scroll: u16, area: Rect, buf: &mut Buffer) {
    let rect = centred(
        area,
        area.width.saturating_sub(2),
        area.height.saturating_sub(2),
    );
    Clear.render(rect, buf);
    let block = Block::default()
        .borders(Borders::ALL)
        .border_style(app.theme.focus)
        .title(" Keys — ? or Esc closes, j/k scroll ");
    let inner = block.inner(rect);
    block.render(rect, buf);
    let others = [
        Mode::Edit,
        Mode::Pick,
        Mode::Confirm,
        Mode::Help,
        Mode::View,
    ];
    if inner.width >= 110 {
        let [left, right] =
            Layout::horizontal([Constraint::Percentage(55), Constraint::Percentage(45)])
                .areas(inner);
        let left_lines = help_lines(app, &[Mode::Browse], left.width as usize);
        let mut right_lines = help_lines(app, &others, right.width as usize);
        right_lines.extend(marker_lines(app));
        Paragraph::new(left_lines)
            .scroll((scroll, 0))
            .render(left, buf);
        Paragraph::new(right_lines)
            .scroll((scroll, 0))
            .render(right, buf);
    } else {
        // One column, scrolled with j/k, so no help text is cut short at 80 columns.
        let mut lines = help_lines(app, &Mode::ALL, inner.width as usize);
        lines.extend(marker_lines(app));
        let last_top = (lines.len() as u16).saturating_sub(inner.height);
        Paragraph::new(lines)
            .scroll((scroll.min(last_top), 0))
            .render(inner, buf);
    }
}

fn draw_picker(
    app: &App,
    kind: PickKind,
    entries: &[String],
    highlighted: usize,
    area: Rect,
    buf: &mut Buffer,
) {
    let title = match kind {
        PickKind::Boat => " Open a boat ",
        PickKind::Engine => " Engine sheet for this boat ",
    };
    let height = (entries.len() as u16 + 2)
        .min(area.height.saturating_sub(4))
        .max(3);
    let rect = centred(area, 44, height);
    Clear.render(rect, buf);
    let block = Block::default()
        .borders(Borders::ALL)
        .border_style(app.theme.focus)
        .title(title);
    let inner = block.inner(rect);
    block.render(rect, buf);
    let visible = inner.height as usize;
    let first = highlighted.saturating_sub(visible.saturating_sub(1));
    let lines: Vec<Line> = entries
        .iter()
        .enumerate()
        .skip(first)
        .take(visible)
        .map(|(i, e)| {
            if i == highlighted {
                Line::styled(
                    format!("› {e}"),
                    app.theme.focus.add_modifier(Modifier::REVERSED),
                )
            } else {
                Line::raw(format!("  {e}"))
            }
        })
        .collect();
    Paragraph::new(lines).render(inner, buf);
}

fn draw_question(app: &App, question: &str, area: Rect, buf: &mut Buffer) {
    let rect = centred(area, 52, 6);
    Clear.render(rect, buf);
    let block = Block::default()
        .borders(Borders::ALL)
        .border_style(app.theme.warning)
        .title(" Question ");
    let inner = block.inner(rect);
    block.render(rect, buf);
    Paragraph::new(vec![
        Line::raw(question.to_string()),
        Line::styled("y yes · n no", app.theme.focus.add_modifier(Modifier::BOLD)),
    ])
    .wrap(Wrap { trim: true })
    .render(inner, buf);
}

#[cfg(test)]
mod tests {
    use super::wrap_words;

    #[test]
    fn help_text_wraps_at_spaces_and_keeps_every_word() {
        let text = "type a value with its unit for the selected field";
        let lines = wrap_words(text, 20);
        assert!(lines.iter().all(|l| l.chars().count() <= 20), "{lines:?}");
        assert_eq!(lines.join(" "), text);
        assert_eq!(wrap_words("abcdefghij", 4), ["abcd", "efgh", "ij"]);
        assert_eq!(wrap_words("", 10), [""]);
    }
}
