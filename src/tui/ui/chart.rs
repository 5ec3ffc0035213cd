//! The chart area: the series of the chosen chart in display units, and the braille widget.

use crate::tui::app::App;
use crate::tui::chart::{ChartKind, ChartView, Glyph, Series, SeriesShape, variant_glyph};
use crate::units::{self, Kind, UnitSystem};
use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::style::{Modifier, Style};
use ratatui::symbols::Marker;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Axis, Chart, Dataset, GraphType};
use ratatui::widgets::{Block, Borders, Paragraph, Widget, Wrap};

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
    chart_view_of(app, app.chart)
}

/// The chart of `kind` for the app, in display units.
pub fn chart_view_of(app: &App, kind: ChartKind) -> ChartView {
    let system = app.units;
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
                    units::to_display(p.brake_power_per_engine, Kind::Power, system),
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
        if !app.solution.before_fit.is_empty() {
            view.series.push(Series {
                name: Some(format!("{} before the fit", Glyph::Quarter.symbol())),
                points: convert(&app.solution.before_fit, None, Kind::Speed, system),
                shape: SeriesShape::Points(Glyph::Quarter),
                style: app.theme.dim,
            });
        }
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
        if let Some(live) = app.live.as_ref().filter(|l| !l.captured.is_empty()) {
            view.note = None;
            view.series.push(Series {
                name: Some(format!("{} captured runs", Glyph::Block.symbol())),
                points: convert(&live.kept_points(), None, Kind::Speed, system),
                shape: SeriesShape::Points(Glyph::Block),
                style: app.theme.warning,
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

/// Axis labels: the ends and the middle, with a precision that suits the span.
fn axis_labels(bounds: [f64; 2]) -> Vec<Span<'static>> {
    let span = bounds[1] - bounds[0];
    let decimals = if span >= 100.0 {
        0
    } else if span >= 10.0 {
        1
    } else {
        2
    };
    let mid = 0.5 * (bounds[0] + bounds[1]);
    [bounds[0], mid, bounds[1]]
        .into_iter()
        .map(|v| Span::raw(format!("{v:.decimals$}")))
        .collect()
}

/// The chart widget over a [`ChartView`].
#[derive(Debug, Clone)]
pub struct ChartWidget<'a> {
    /// The chart to draw.
    pub view: &'a ChartView,
    /// Style of the axes and border.
    pub frame_style: Style,
}

impl Widget for ChartWidget<'_> {
    fn render(self, area: Rect, buf: &mut Buffer) {
        let view = self.view;
        let block = Block::default()
            .borders(Borders::ALL)
            .border_style(self.frame_style)
            .title(format!(" {} ", view.title));
        let inner = block.inner(area);
        block.render(area, buf);
        if inner.width < 10 || inner.height < 4 {
            return;
        }
        // The legend and the note go under the plot, so they never hide a curve.
        let mut below: Vec<Line> = Vec::new();
        let legend: Vec<&str> = view
            .series
            .iter()
            .filter_map(|s| s.name.as_deref())
            .collect();
        if !legend.is_empty() {
            // Non-breaking spaces keep each entry whole when the legend wraps.
            let entries: Vec<String> = legend.iter().map(|e| e.replace(' ', "\u{a0}")).collect();
            below.push(Line::raw(entries.join("  ")));
        }
        if let Some(note) = &view.note {
            below.push(Line::styled(note.clone(), self.frame_style));
        }
        let below_height: u16 = below
            .iter()
            .map(|l| super::field_list::wrapped_height(&l.to_string(), inner.width))
            .sum::<u16>()
            .min(inner.height.saturating_sub(6));
        let chart_area = Rect {
            height: inner.height - below_height,
            ..inner
        };
        let below_area = Rect {
            y: inner.y + chart_area.height,
            height: below_height,
            ..inner
        };
        let (x_bounds, y_bounds) = view.bounds();
        let datasets: Vec<Dataset> = view
            .series
            .iter()
            .map(|s| {
                let mut d = Dataset::default().data(&s.points).style(s.style);
                d = match s.shape {
                    SeriesShape::Line => d.marker(Marker::Braille).graph_type(GraphType::Line),
                    SeriesShape::Points(g) => d.marker(g.marker()).graph_type(GraphType::Scatter),
                };
                if let Some(name) = &s.name {
                    d = d.name(name.clone());
                }
                d
            })
            .collect();
        let chart = Chart::new(datasets)
            .x_axis(
                Axis::default()
                    .title(view.x_title.clone())
                    .bounds(x_bounds)
                    .labels(axis_labels(x_bounds))
                    .style(self.frame_style),
            )
            .y_axis(
                Axis::default()
                    .title(view.y_title.clone())
                    .bounds(y_bounds)
                    .labels(axis_labels(y_bounds))
                    .style(self.frame_style),
            )
            .legend_position(None);
        chart.render(chart_area, buf);
        if super::ascii::active() {
            // A character-cell chart: line dots and point glyphs as ASCII marks.
            for y in chart_area.top()..chart_area.bottom() {
                for x in chart_area.left()..chart_area.right() {
                    if let Some(mark) = super::ascii::plot_mark(buf[(x, y)].symbol()) {
                        buf[(x, y)].set_symbol(mark);
                    }
                }
            }
        }
        if below_height > 0 {
            Paragraph::new(below)
                .wrap(Wrap { trim: true })
                .render(below_area, buf);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn view() -> ChartView {
        ChartView {
            title: "Power vs engine rpm".into(),
            x_title: "engine rpm".into(),
            y_title: "kW".into(),
            series: vec![
                Series {
                    name: Some("full load".into()),
                    points: vec![(1000.0, 20.0), (2000.0, 45.0), (3000.0, 60.0)],
                    shape: SeriesShape::Line,
                    style: Style::default(),
                },
                Series {
                    name: Some("• A".into()),
                    points: vec![(1500.0, 8.0), (2500.0, 35.0)],
                    shape: SeriesShape::Points(Glyph::Dot),
                    style: Style::default(),
                },
            ],
            note: Some("no trial log".into()),
        }
    }

    fn draw(view: &ChartView, width: u16, height: u16) -> String {
        let area = Rect::new(0, 0, width, height);
        let mut buf = Buffer::empty(area);
        ChartWidget {
            view,
            frame_style: Style::default(),
        }
        .render(area, &mut buf);
        (0..height)
            .map(|y| {
                (0..width)
                    .map(|x| buf[(x, y)].symbol().replace('\u{a0}', " "))
                    .collect::<String>()
            })
            .collect::<Vec<_>>()
            .join("\n")
    }

    #[test]
    fn draws_braille_axes_legend_and_note() {
        let text = draw(&view(), 60, 16);
        assert!(text.contains("Power vs engine rpm"));
        assert!(text.contains("engine rpm"), "{text}");
        assert!(text.contains("full load"), "{text}");
        assert!(text.contains("• A"), "{text}");
        assert!(text.contains("3000"), "{text}");
        assert!(text.contains("no trial log"), "{text}");
        assert!(
            text.chars().any(|c| ('\u{2801}'..='\u{28FF}').contains(&c)),
            "no braille in\n{text}"
        );
    }

    #[test]
    fn bounds_ignore_non_finite_points_and_survive_empty_series() {
        let mut v = view();
        v.series[0].points.push((f64::NAN, 1e9));
        let (x, y) = v.bounds();
        assert_eq!(x, [1000.0, 3000.0]);
        assert!((y[1] - 63.0).abs() < 1e-9);
        let empty = ChartView {
            series: vec![],
            ..view()
        };
        assert_eq!(empty.bounds(), ([0.0, 1.0], [0.0, 1.05]));
        draw(&empty, 30, 8);
        draw(&view(), 3, 3);
    }

    #[test]
    fn chart_cycle_visits_all() {
        let mut k = ChartKind::default();
        for _ in 0..4 {
            k = k.next();
        }
        assert_eq!(k, ChartKind::PowerVsRpm);
        assert_eq!(ChartKind::PowerVsRpm.prev(), ChartKind::RangeVsSpeed);
    }
}
