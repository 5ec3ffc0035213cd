//! Braille line charts from `(x, y)` series, with variants told apart by marker glyphs and
//! labels as well as colour.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::style::Style;
use ratatui::symbols::Marker;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Axis, Block, Borders, Chart, Dataset, GraphType, Paragraph, Widget, Wrap};

/// Which chart the chart area shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum ChartKind {
    /// Brake power against engine rpm, with the full-load envelope and rated rpm.
    #[default]
    PowerVsRpm,
    /// Boat speed against engine rpm, with sea-trial points.
    SpeedVsRpm,
    /// Fuel rate against engine rpm.
    FuelVsRpm,
    /// Range against boat speed.
    RangeVsSpeed,
}

impl ChartKind {
    /// All charts in the order the chart key cycles through them.
    pub const ALL: [ChartKind; 4] = [
        ChartKind::PowerVsRpm,
        ChartKind::SpeedVsRpm,
        ChartKind::FuelVsRpm,
        ChartKind::RangeVsSpeed,
    ];

    /// The next chart in the cycle.
    pub fn next(self) -> Self {
        let i = Self::ALL.iter().position(|c| *c == self).unwrap_or(0);
        Self::ALL[(i + 1) % Self::ALL.len()]
    }

    /// The previous chart in the cycle.
    pub fn prev(self) -> Self {
        let i = Self::ALL.iter().position(|c| *c == self).unwrap_or(0);
        Self::ALL[(i + Self::ALL.len() - 1) % Self::ALL.len()]
    }

    /// The chart's title.
    pub fn title(self) -> &'static str {
        match self {
            ChartKind::PowerVsRpm => "Power vs engine rpm",
            ChartKind::SpeedVsRpm => "Speed vs engine rpm",
            ChartKind::FuelVsRpm => "Fuel vs engine rpm",
            ChartKind::RangeVsSpeed => "Range vs speed",
        }
    }
}

/// How a series is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SeriesShape {
    /// A braille line through the points.
    Line,
    /// Separate points drawn with a one-per-cell glyph.
    Points(Glyph),
}

/// One-per-cell glyphs for point series: distinct without colour.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Glyph {
    /// `•`
    Dot,
    /// `▄`
    Bar,
    /// `█`
    Block,
    /// A quarter block, `▖` and its turns.
    Quarter,
}

impl Glyph {
    /// The glyphs given to screw variants in turn.
    pub const FOR_VARIANTS: [Glyph; 3] = [Glyph::Dot, Glyph::Bar, Glyph::Quarter];

    /// The character drawn, also written in the legend.
    pub fn symbol(self) -> &'static str {
        match self {
            Glyph::Dot => "•",
            Glyph::Bar => "▄",
            Glyph::Block => "█",
            Glyph::Quarter => "▖",
        }
    }

    fn marker(self) -> Marker {
        match self {
            Glyph::Dot => Marker::Dot,
            Glyph::Bar => Marker::Bar,
            Glyph::Block => Marker::Block,
            Glyph::Quarter => Marker::Quadrant,
        }
    }
}

/// A series in display units.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// Name for the legend; `None` keeps it out of the legend.
    pub name: Option<String>,
    /// Points (x, y) in display units.
    pub points: Vec<(f64, f64)>,
    /// Line or points.
    pub shape: SeriesShape,
    /// Colour (empty without colour).
    pub style: Style,
}

/// A chart ready to draw: titles with units and series in display units.
#[derive(Debug, Clone, PartialEq)]
pub struct ChartView {
    /// The chart's title, e.g. "Power vs engine rpm".
    pub title: String,
    /// The x axis title with its unit, e.g. "engine rpm".
    pub x_title: String,
    /// The y axis title with its unit, e.g. "power kW".
    pub y_title: String,
    /// The series in drawing order.
    pub series: Vec<Series>,
    /// A line under the chart saying why it is empty or what it leaves out.
    pub note: Option<String>,
}

impl ChartView {
    /// Bounds of all finite points, padded a little; a unit range when there are none.
    pub fn bounds(&self) -> ([f64; 2], [f64; 2]) {
        let mut x = [f64::INFINITY, f64::NEG_INFINITY];
        let mut y = [0.0_f64, f64::NEG_INFINITY];
        for (px, py) in self.series.iter().flat_map(|s| s.points.iter()) {
            if px.is_finite() && py.is_finite() {
                x = [x[0].min(*px), x[1].max(*px)];
                y = [y[0].min(*py), y[1].max(*py)];
            }
        }
        if !(x[0].is_finite() && x[1] > x[0]) {
            x = [0.0, 1.0];
        }
        if !(y[1].is_finite() && y[1] > y[0]) {
            y = [0.0, 1.0];
        }
        (x, [y[0], y[1] * 1.05])
    }
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
