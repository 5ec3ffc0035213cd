//! The shortlist view: every engine sheet × offered gear with its screw, ranked, one row
//! highlighted; the highlighted candidate's checks under the table.

use super::{UNRELIABLE_TOP_LEGEND, dash, heading, number, top_speed};
use crate::report::Display;
use crate::report::power_speed::{point_line, power_summary};
use crate::report::shortlist::{candidate_notes, rank_line};
use crate::study::power_speed::{PowerForSpeed, PowerPoint};
use crate::study::shortlist::{Candidate, Shortlist, ShortlistRank};
use crate::tui::analysis::ShortlistView;
use crate::tui::app::App;
use crate::tui::chart::{ChartView, Glyph, Series as TuiSeries, SeriesShape};
use crate::tui::edit::gear_label;
use crate::units::{self, Kind, UnitSystem};
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};

/// The widest engine name the table gives room to, characters.
const ENGINE_WIDTH: usize = 16;

/// The view's lines and the index of the highlighted candidate's line, if any.
pub(crate) fn shortlist_lines(
    app: &App,
    view: &ShortlistView,
) -> (Vec<Line<'static>>, Option<usize>) {
    let system = app.units;
    let choices: Vec<String> = ShortlistRank::ALL
        .iter()
        .map(|r| {
            if *r == app.shortlist_rank {
                format!("[{}]", r.name())
            } else {
                r.name().to_string()
            }
        })
        .collect();
    let mut lines = vec![Line::from(vec![
        Span::styled("r ranks: ", app.theme.dim),
        Span::raw(choices.join(" · ")),
        Span::styled(
            "   Enter takes the highlighted candidate as engine, gear and a new screw variant",
            app.theme.dim,
        ),
    ])];
    let list = match &view.result {
        Ok(list) => list,
        Err(why) => {
            lines.push(Line::styled(
                format!("No shortlist: {why}"),
                app.theme.error,
            ));
            return (lines, None);
        }
    };
    lines.push(heading(
        app,
        format!(
            "Repower shortlist for {} ({} candidates)",
            list.boat,
            list.candidates.len()
        ),
    ));
    let d = Display::new(system);
    lines.push(Line::styled(rank_line(list, &d), app.theme.dim));
    let width = list
        .candidates
        .iter()
        .map(|c| c.engine.chars().count())
        .max()
        .unwrap_or(6)
        .clamp(6, ENGINE_WIDTH);
    let len_unit = units::unit_label(Kind::ScrewLength, system);
    lines.push(Line::styled(
        format!(
            "  {:>2} {:<width$} {:>6} {:>11} {:>2} {:>5} {:>6} {:>6} {:>6} {:>4} {:>9} {:>9} {:>6} {:>4} {}",
            "#",
            "engine",
            "gear",
            format!("D×P {len_unit}"),
            "bl",
            "AE/A0",
            format!("top {}", units::unit_label(Kind::Speed, system)),
            "margin",
            "cruise",
            "load",
            units::unit_label(Kind::FuelRate, system),
            units::unit_label(Kind::FuelPerDistance, system),
            format!("rng {}", units::unit_label(Kind::Distance, system)),
            "prob",
            "tie",
        ),
        Style::default().add_modifier(Modifier::BOLD),
    ));
    let mut highlighted = None;
    for (i, c) in list.candidates.iter().enumerate() {
        let here = i == app.shortlist_row;
        if here {
            highlighted = Some(lines.len());
        }
        let text = candidate_row(i, c, width, system);
        lines.push(if here {
            Line::styled(
                format!("▶ {text}"),
                app.theme.accent.add_modifier(Modifier::REVERSED),
            )
        } else {
            Line::raw(format!("  {text}"))
        });
    }
    if list
        .candidates
        .iter()
        .any(|c| c.top_speed_in_method_range == Some(false))
    {
        lines.push(Line::styled(UNRELIABLE_TOP_LEGEND, app.theme.warning));
    }
    if let Some(c) = list.candidates.get(app.shortlist_row) {
        lines.push(Line::default());
        lines.push(heading(
            app,
            format!(
                "#{} {} ({}) with {}",
                app.shortlist_row + 1,
                c.engine,
                c.engine_name,
                gear_label(c.gear_ratio)
            ),
        ));
        for note in candidate_notes(c, &d) {
            let style = if note.starts_with("problem") {
                app.theme.warning
            } else {
                Style::default()
            };
            lines.push(Line::styled(format!("  {note}"), style));
        }
    }
    (lines, highlighted)
}

fn candidate_row(i: usize, c: &Candidate, width: usize, system: UnitSystem) -> String {
    let mut engine: String = c.engine.chars().take(width).collect();
    if c.engine.chars().count() > width {
        engine.pop();
        engine.push('…');
    }
    let screw = match c.pitch {
        Some(p) => format!(
            "{}×{}",
            number(
                Some(c.diameter),
                Kind::ScrewLength,
                system,
                screw_decimals(system)
            ),
            number(Some(p), Kind::ScrewLength, system, screw_decimals(system))
        ),
        None => "no pitch".into(),
    };
    format!(
        "{:>2} {:<width$} {:>6} {:>11} {:>2} {:>5.2} {:>6} {:>6} {:>6} {:>4} {:>9} {:>9} {:>6} {:>4} {}",
        i + 1,
        engine,
        gear_label(c.gear_ratio),
        screw,
        c.blades,
        c.area_ratio,
        top_speed(c.top_speed, c.top_speed_in_method_range, system, 1),
        c.rpm_margin
            .filter(|m| m.is_finite())
            .map_or_else(dash, |m| format!("{m:+.0}")),
        c.cruise_rpm
            .filter(|r| r.is_finite())
            .map_or_else(dash, |r| format!("{r:.0}")),
        c.cruise_load
            .filter(|l| l.is_finite())
            .map_or_else(dash, |l| format!("{:.0}%", l * 100.0)),
        number(c.fuel_rate, Kind::FuelRate, system, 2),
        number(c.fuel_per_distance, Kind::FuelPerDistance, system, 2),
        number(c.range, Kind::Distance, system, 0),
        if c.problems.is_empty() {
            dash()
        } else {
            c.problems.len().to_string()
        },
        c.tie_with.map_or(String::new(), |t| format!("= #{t}")),
    )
}

fn screw_decimals(system: UnitSystem) -> usize {
    match system {
        UnitSystem::Metric => 0,
        UnitSystem::Imperial => 1,
    }
}

/// The lines above the shortlist's power chart: the heading, the keys and the finding (when
/// `finding`), then the highlighted candidate's point in words.
pub(crate) fn power_lines(
    app: &App,
    list: &Shortlist,
    data: &PowerForSpeed,
    finding: bool,
) -> Vec<Line<'static>> {
    let d = Display::new(app.units);
    let mut lines = vec![heading(
        app,
        format!("What more power buys on {}", list.boat),
    )];
    if finding {
        lines.push(Line::styled(
            "c the table again · ↑/↓ highlight a candidate · Enter takes it",
            app.theme.dim,
        ));
        lines.push(Line::raw(power_summary(list, data, &d)));
    }
    if let Some(c) = list.candidates.get(app.shortlist_row) {
        let text = point_line(list, data, &c.engine, c.gear_ratio, &d).unwrap_or_else(|| {
            format!(
                "#{} {} {}: no top speed, so not on the chart (the table says why)",
                app.shortlist_row + 1,
                c.engine,
                gear_label(c.gear_ratio)
            )
        });
        lines.push(Line::styled(format!("█ {text}"), app.theme.accent));
    }
    lines
}

/// The power-for-speed chart in display units: the hull's effective power (dotted where
/// extrapolated), every candidate, and the highlighted one in its own glyph.
pub(crate) fn power_chart_view(app: &App, list: &Shortlist, data: &PowerForSpeed) -> ChartView {
    let system = app.units;
    let point = |speed: f64, power: f64| {
        (
            units::to_display(speed, Kind::Speed, system),
            units::to_display(power, Kind::Power, system),
        )
    };
    let hull = |inside: bool| -> Vec<(f64, f64)> {
        data.hull
            .iter()
            .filter(|h| h.in_method_range == inside)
            .map(|h| point(h.speed, h.effective_power))
            .collect()
    };
    let highlighted = list.candidates.get(app.shortlist_row);
    let is_highlighted = |p: &PowerPoint| {
        highlighted
            .is_some_and(|c| c.engine == p.engine && (c.gear_ratio - p.gear_ratio).abs() < 1e-9)
    };
    let mut series = vec![TuiSeries {
        name: Some("━ hull effective power R·V".into()),
        points: hull(true),
        shape: SeriesShape::Line,
        style: app.theme.reference(),
    }];
    let outside = hull(false);
    if !outside.is_empty() {
        series.push(TuiSeries {
            name: Some(format!("{} R·V extrapolated", Glyph::Dot.symbol())),
            points: outside,
            shape: SeriesShape::Points(Glyph::Dot),
            style: app.theme.warning,
        });
    }
    series.push(TuiSeries {
        name: Some(format!(
            "{} candidates (installed power at top speed)",
            Glyph::Bar.symbol()
        )),
        points: data
            .candidates
            .iter()
            .filter(|p| !is_highlighted(p))
            .map(|p| point(p.top_speed, p.installed_power))
            .collect(),
        shape: SeriesShape::Points(Glyph::Bar),
        style: app.theme.series[0],
    });
    let chosen: Vec<(f64, f64)> = data
        .candidates
        .iter()
        .filter(|p| is_highlighted(p))
        .map(|p| point(p.top_speed, p.installed_power))
        .collect();
    if !chosen.is_empty() {
        series.push(TuiSeries {
            name: Some(format!(
                "{} #{} highlighted",
                Glyph::Block.symbol(),
                app.shortlist_row + 1
            )),
            points: chosen,
            shape: SeriesShape::Points(Glyph::Block),
            style: app.theme.accent.add_modifier(Modifier::BOLD),
        });
    }
    ChartView {
        title: "Installed power against top speed".into(),
        x_title: format!("speed {}", units::unit_label(Kind::Speed, system)),
        y_title: units::unit_label(Kind::Power, system).to_string(),
        series,
        note: None,
    }
}
