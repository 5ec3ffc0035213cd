//! The chart model: which chart is shown, and its series in display units with the marker
//! glyphs that tell variants apart as well as colour (drawn in `ui/chart.rs`).

use ratatui::style::Style;
use ratatui::symbols::Marker;

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
        if crate::units::text_style() == crate::units::TextStyle::Ascii {
            // The marks the ASCII chart draws (crate::tui::ui::ascii::plot_mark).
            return match self {
                Glyph::Dot => "o",
                Glyph::Bar => "x",
                Glyph::Block => "#",
                Glyph::Quarter => "+",
            };
        }
        match self {
            Glyph::Dot => "•",
            Glyph::Bar => "▄",
            Glyph::Block => "█",
            Glyph::Quarter => "▖",
        }
    }

    pub(crate) fn marker(self) -> Marker {
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
        } else {
            // Start at a round value at or below the first point (a curve from 229 rpm on a
            // 3000 rpm axis starts at 0, one from 640 on a 900 rpm span at 600).
            let step = 10f64.powf((x[1] - x[0]).log10().floor());
            x[0] = (x[0] / step).floor() * step;
        }
        if !(y[1].is_finite() && y[1] > y[0]) {
            y = [0.0, 1.0];
        }
        (x, [y[0], y[1] * 1.05])
    }
}

/// The glyph that marks variant `index` on the charts and in the legend.
pub fn variant_glyph(index: usize) -> Glyph {
    Glyph::FOR_VARIANTS[index % Glyph::FOR_VARIANTS.len()]
}
