//! The shortlist view: every engine sheet × offered gear with its screw, ranked, one row
//! highlighted; the highlighted candidate's checks under the table.

use super::{UNRELIABLE_TOP_LEGEND, dash, heading, number, top_speed};
use crate::report::power_speed::{point_line, power_summary};
use crate::report::shortlist::{candidate_notes, rank_line};
use crate::report::{Display, count};
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

/// The text of one column's cell for candidate `i` (0-based place in the list).
type Cell = Box<dyn Fn(usize, &Candidate) -> String>;

/// One column of the shortlist table: heading, width, and the cell of each candidate.
struct Column {
    /// The heading (its unit in it).
    head: String,
    /// The name in the highlighted candidate's detail line when the column is dropped.
    name: &'static str,
    /// The unit after the value in that line ("" for none).
    unit: String,
    /// Width in characters (cells are right-aligned unless `left`).
    width: usize,
    /// Whether cells are left-aligned.
    left: bool,
    /// The cell of candidate `i` (0-based place in the list).
    cell: Cell,
}

/// The table's columns, most wanted first: the ones a narrow screen keeps. The ranked
/// figure moves up to stay beside the engine and gear.
fn columns(rank: ShortlistRank, system: UnitSystem, engine_width: usize) -> Vec<Column> {
    let len_unit = units::unit_label(Kind::ScrewLength, system);
    let speed = units::unit_label(Kind::Speed, system).to_string();
    let fuel_nm = units::unit_label(Kind::FuelPerDistance, system).to_string();
    let fuel_h = units::unit_label(Kind::FuelRate, system).to_string();
    let distance = units::unit_label(Kind::Distance, system).to_string();
    let col = |head: String, name: &'static str, unit: &str, width: usize, cell: Cell| Column {
        width: width.max(head.chars().count()),
        head,
        name,
        unit: unit.to_string(),
        left: false,
        cell,
    };
    let mut cols = vec![
        col(
            "#".into(),
            "#",
            "",
            3,
            Box::new(|i, c| {
                // "!" beside the place: the candidate falls short or fails a check (the
                // problems and checks are under the table when it is highlighted).
                let fails = !crate::report::shortlist::check_marks(c).is_empty();
                let mark = if c.problems.is_empty() && !fails {
                    ""
                } else {
                    "!"
                };
                format!("{mark}{}", i + 1)
            }),
        ),
        Column {
            left: true,
            ..col(
                "engine".into(),
                "engine",
                "",
                engine_width,
                Box::new(move |_, c| {
                    let mut engine: String = c.engine.chars().take(engine_width).collect();
                    if c.engine.chars().count() > engine_width {
                        engine.pop();
                        engine.push('…');
                    }
                    engine
                }),
            )
        },
        col(
            "gear".into(),
            "gear",
            "",
            6,
            Box::new(|_, c| gear_label(c.gear_ratio)),
        ),
        col(
            fuel_nm.clone(),
            "fuel",
            &fuel_nm,
            7,
            Box::new(move |_, c| number(c.fuel_per_distance, Kind::FuelPerDistance, system, 2)),
        ),
        col(
            format!("top {speed}"),
            "top",
            &speed,
            6,
            Box::new(move |_, c| top_speed(c.top_speed, c.top_speed_in_method_range, system, 1)),
        ),
        col(
            "margin".into(),
            "margin",
            "rpm",
            6,
            Box::new(|_, c| {
                c.rpm_margin
                    .filter(|m| m.is_finite())
                    .map_or_else(dash, |m| format!("{m:+.0}"))
            }),
        ),
        col(
            format!("D×P {len_unit}"),
            "D×P",
            len_unit,
            11,
            Box::new(move |_, c| match c.pitch {
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
            }),
        ),
        col(
            "tie".into(),
            "tie",
            "",
            4,
            Box::new(|_, c| c.tie_with.map_or(String::new(), |t| format!("=#{t}"))),
        ),
        col(
            format!("rng {distance}"),
            "range",
            &distance,
            6,
            Box::new(move |_, c| number(c.range, Kind::Distance, system, 0)),
        ),
        col(
            "cruise".into(),
            "cruise",
            "rpm",
            6,
            Box::new(|_, c| {
                c.cruise_rpm
                    .filter(|r| r.is_finite())
                    .map_or_else(dash, |r| format!("{r:.0}"))
            }),
        ),
        col(
            "load".into(),
            "load",
            "",
            4,
            Box::new(|_, c| {
                c.cruise_load
                    .filter(|l| l.is_finite())
                    .map_or_else(dash, |l| format!("{:.0}%", l * 100.0))
            }),
        ),
        col(
            fuel_h.clone(),
            "fuel",
            &fuel_h,
            6,
            Box::new(move |_, c| number(c.fuel_rate, Kind::FuelRate, system, 2)),
        ),
        col(
            "bl".into(),
            "blades",
            "",
            2,
            Box::new(|_, c| c.blades.to_string()),
        ),
        col(
            "AE/A0".into(),
            "AE/A0",
            "",
            5,
            Box::new(|_, c| format!("{:.2}", c.area_ratio)),
        ),
    ];
    let ranked = match rank {
        ShortlistRank::Fuel => "fuel",
        ShortlistRank::Range => "range",
        ShortlistRank::Top => "top",
        ShortlistRank::Margin => "margin",
    };
    if let Some(at) = cols.iter().position(|c| c.name == ranked) {
        let column = cols.remove(at);
        cols.insert(3, column);
    }
    cols
}

/// The columns that fit in `width` characters (two go to the row's marker), most wanted first,
/// in the order of [`columns`]; the rest are returned apart for the detail line.
fn fit(cols: Vec<Column>, width: usize) -> (Vec<Column>, Vec<Column>) {
    let mut used = 2;
    let mut kept = Vec::new();
    let mut dropped = Vec::new();
    for c in cols {
        // Once one column is dropped, every later one goes too, so the table keeps its order.
        if dropped.is_empty() && used + c.width + usize::from(!kept.is_empty()) <= width {
            used += c.width + usize::from(!kept.is_empty());
            kept.push(c);
        } else {
            dropped.push(c);
        }
    }
    (kept, dropped)
}

/// The cells of the `dropped` columns for candidate `i`, named with their units ("range
/// 1603 nm · cruise 1799 rpm"), or `None` when every column fits.
fn detail_line(dropped: &[Column], i: usize, c: &Candidate) -> Option<String> {
    let rest: Vec<String> = dropped
        .iter()
        .map(|col| ((col.cell)(i, c), col))
        .filter(|(cell, _)| !cell.trim().is_empty())
        .map(|(cell, col)| {
            let unit = if col.unit.is_empty() {
                String::new()
            } else {
                format!(" {}", col.unit)
            };
            format!("{} {}{unit}", col.name, cell.trim())
        })
        .collect();
    (!rest.is_empty()).then(|| rest.join(" · "))
}

fn row(cols: &[Column], cells: impl Iterator<Item = String>) -> String {
    cols.iter()
        .zip(cells)
        .map(|(c, cell)| {
            if c.left {
                format!("{cell:<w$}", w = c.width)
            } else {
                format!("{cell:>w$}", w = c.width)
            }
        })
        .collect::<Vec<_>>()
        .join(" ")
        .trim_end()
        .to_string()
}

/// The view's lines for `width` columns and the index of the highlighted candidate's line, if
/// any. The table keeps the columns that fit; the highlighted candidate's detail line gives
/// the others.
pub(crate) fn shortlist_lines(
    app: &App,
    view: &ShortlistView,
    width: usize,
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
            " · Enter takes the highlighted candidate as engine, gear and a new screw variant",
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
            "Repower shortlist for {} ({})",
            list.boat,
            count(list.candidates.len(), "candidate", "candidates")
        ),
    ));
    let d = Display::new(system);
    lines.push(Line::styled(rank_line(list, &d), app.theme.dim));
    let engine_width = list
        .candidates
        .iter()
        .map(|c| c.engine.chars().count())
        .max()
        .unwrap_or(6)
        .clamp(6, ENGINE_WIDTH);
    let (kept, dropped) = fit(columns(app.shortlist_rank, system, engine_width), width);
    lines.push(Line::styled(
        format!("  {}", row(&kept, kept.iter().map(|c| c.head.clone()))),
        Style::default().add_modifier(Modifier::BOLD),
    ));
    let mut highlighted = None;
    for (i, c) in list.candidates.iter().enumerate() {
        let here = i == app.shortlist_row;
        if here {
            highlighted = Some(lines.len());
        }
        let text = row(&kept, kept.iter().map(|col| (col.cell)(i, c)));
        lines.push(if here {
            Line::styled(
                format!("▶ {text}"),
                app.theme.accent.add_modifier(Modifier::REVERSED),
            )
        } else {
            Line::raw(format!("  {text}"))
        });
        // Under the highlighted row, the columns the table had no room for.
        if here && let Some(rest) = detail_line(&dropped, i, c) {
            lines.push(Line::styled(format!("      {rest}"), app.theme.accent));
        }
    }
    if list
        .candidates
        .iter()
        .any(|c| c.top_speed_in_method_range == Some(false))
    {
        lines.push(Line::styled(UNRELIABLE_TOP_LEGEND, app.theme.warning));
    }
    if list
        .candidates
        .iter()
        .any(|c| !c.problems.is_empty() || !crate::report::shortlist::check_marks(c).is_empty())
    {
        lines.push(Line::styled(
            "! beside # the candidate falls short or fails a cavitation or shaft check: see under the table when highlighted",
            app.theme.warning,
        ));
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
