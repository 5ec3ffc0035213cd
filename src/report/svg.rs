//! SVG line charts written as plain text: axes with ticks and unit labels, one polyline or a row
//! of markers per series, and a legend naming each series. Line styles (dashes, marker shapes)
//! tell the series apart as well as colour, so a black-and-white print still reads.

use std::fmt::Write as _;

/// How a series is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SeriesStyle {
    /// A polyline through the points in order.
    Line,
    /// A marker at each point, no line (measurements such as sea-trial runs).
    Markers,
}

/// One named curve of a chart, in display units.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// The legend entry, e.g. "engine full load" or a variant's label.
    pub name: String,
    /// (x, y) points in display units; non-finite points are skipped.
    pub points: Vec<(f64, f64)>,
    /// Line or markers.
    pub style: SeriesStyle,
    /// Which colour and dash pattern to use, so one variant looks the same in every chart.
    pub look: usize,
    /// Text written beside each point, in order (markers only; empty: none).
    pub labels: Vec<String>,
}

/// A line chart: a title, labelled axes and its series.
#[derive(Debug, Clone, PartialEq)]
pub struct Chart {
    /// Title at the top.
    pub title: String,
    /// X axis label with its unit, e.g. "engine speed (rpm)".
    pub x_label: String,
    /// Y axis label with its unit, e.g. "brake power (kW)".
    pub y_label: String,
    /// The curves.
    pub series: Vec<Series>,
}

const WIDTH: f64 = 760.0;
const HEIGHT: f64 = 460.0;
const LEFT: f64 = 72.0;
const RIGHT: f64 = 200.0;
const TOP: f64 = 44.0;
const BOTTOM: f64 = 56.0;
const COLOURS: [&str; 6] = [
    "#1f4e79", "#b03a2e", "#1e8449", "#7d3c98", "#b9770e", "#566573",
];
const DASHES: [&str; 6] = ["", "8 4", "2 3", "10 3 2 3", "4 4", "12 6"];

/// Escapes text for an XML element or attribute.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            c if (c as u32) < 0x20 && c != '\n' && c != '\t' => out.push(' '),
            c => out.push(c),
        }
    }
    out
}

/// "Nice" tick positions (1, 2 or 5 × 10ⁿ apart) covering `min`–`max`, about `target` of them.
pub fn ticks(min: f64, max: f64, target: usize) -> Vec<f64> {
    if !(min.is_finite() && max.is_finite()) || max <= min {
        return vec![min];
    }
    let raw = (max - min) / target.max(1) as f64;
    let magnitude = 10f64.powf(raw.log10().floor());
    let step = [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * magnitude)
        .find(|s| *s >= raw)
        .unwrap_or(10.0 * magnitude);
    let first = (min / step).ceil() as i64;
    let last = (max / step + 1e-9).floor() as i64;
    (first..=last).map(|k| k as f64 * step).collect()
}

/// Widens a data range to tick boundaries; a flat or empty range gets a unit width.
fn padded_range(values: impl Iterator<Item = f64>, from_zero: bool) -> (f64, f64) {
    let (mut lo, mut hi) = values.fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
        (lo.min(v), hi.max(v))
    });
    if !lo.is_finite() || !hi.is_finite() {
        return (0.0, 1.0);
    }
    if from_zero && lo > 0.0 {
        lo = 0.0;
    }
    if hi - lo < 1e-12 {
        hi = lo + 1.0;
    }
    let t = ticks(lo, hi, 6);
    let step = if t.len() >= 2 {
        t[1] - t[0]
    } else {
        (hi - lo) / 6.0
    };
    ((lo / step).floor() * step, (hi / step).ceil() * step)
}

fn tick_label(value: f64, step: f64) -> String {
    let decimals = if step >= 1.0 {
        0
    } else {
        (-step.log10().floor()) as usize
    };
    let text = format!("{value:.decimals$}");
    if text
        .trim_start_matches('-')
        .chars()
        .all(|c| c == '0' || c == '.')
    {
        "0".into()
    } else {
        text
    }
}

impl Chart {
    /// The chart as a standalone SVG document.
    pub fn to_svg(&self) -> String {
        let finite = |s: &Series| {
            s.points
                .iter()
                .copied()
                .filter(|(x, y)| x.is_finite() && y.is_finite())
                .collect::<Vec<_>>()
        };
        let data: Vec<Vec<(f64, f64)>> = self.series.iter().map(finite).collect();
        let (x_min, x_max) = padded_range(data.iter().flatten().map(|p| p.0), false);
        let (y_min, y_max) = padded_range(data.iter().flatten().map(|p| p.1), true);
        let plot_w = WIDTH - LEFT - RIGHT;
        let plot_h = HEIGHT - TOP - BOTTOM;
        let px = |x: f64| LEFT + (x - x_min) / (x_max - x_min) * plot_w;
        let py = |y: f64| TOP + plot_h - (y - y_min) / (y_max - y_min) * plot_h;

        let mut svg = String::new();
        let _ = writeln!(svg, r#"<?xml version="1.0" encoding="UTF-8"?>"#);
        let _ = writeln!(
            svg,
            r#"<svg xmlns="http://www.w3.org/2000/svg" width="{WIDTH}" height="{HEIGHT}" viewBox="0 0 {WIDTH} {HEIGHT}" font-family="sans-serif" font-size="12">"#
        );
        let _ = writeln!(svg, "<title>{}</title>", escape(&self.title));
        let _ = writeln!(
            svg,
            r##"<rect x="0" y="0" width="{WIDTH}" height="{HEIGHT}" fill="#ffffff"/>"##
        );
        let _ = writeln!(
            svg,
            r#"<text x="{}" y="24" font-size="15" font-weight="bold" text-anchor="middle">{}</text>"#,
            LEFT + plot_w / 2.0,
            escape(&self.title)
        );

        // Grid, ticks and tick labels.
        let x_ticks = ticks(x_min, x_max, 8);
        let x_step = if x_ticks.len() > 1 {
            x_ticks[1] - x_ticks[0]
        } else {
            1.0
        };
        let y_ticks = ticks(y_min, y_max, 6);
        let y_step = if y_ticks.len() > 1 {
            y_ticks[1] - y_ticks[0]
        } else {
            1.0
        };
        let _ = writeln!(
            svg,
            r##"<g class="grid" stroke="#dddddd" stroke-width="1">"##
        );
        for &t in &x_ticks {
            let _ = writeln!(
                svg,
                r#"<line x1="{0:.1}" y1="{1:.1}" x2="{0:.1}" y2="{2:.1}"/>"#,
                px(t),
                TOP,
                TOP + plot_h
            );
        }
        for &t in &y_ticks {
            let _ = writeln!(
                svg,
                r#"<line x1="{1:.1}" y1="{0:.1}" x2="{2:.1}" y2="{0:.1}"/>"#,
                py(t),
                LEFT,
                LEFT + plot_w
            );
        }
        let _ = writeln!(svg, "</g>");
        let _ = writeln!(
            svg,
            r##"<g class="axes" stroke="#000000" stroke-width="1.2">"##
        );
        let _ = writeln!(
            svg,
            r#"<line x1="{LEFT}" y1="{0:.1}" x2="{1:.1}" y2="{0:.1}"/>"#,
            TOP + plot_h,
            LEFT + plot_w
        );
        let _ = writeln!(
            svg,
            r#"<line x1="{LEFT}" y1="{TOP}" x2="{LEFT}" y2="{:.1}"/>"#,
            TOP + plot_h
        );
        for &t in &x_ticks {
            let _ = writeln!(
                svg,
                r#"<line x1="{0:.1}" y1="{1:.1}" x2="{0:.1}" y2="{2:.1}"/>"#,
                px(t),
                TOP + plot_h,
                TOP + plot_h + 5.0
            );
        }
        for &t in &y_ticks {
            let _ = writeln!(
                svg,
                r#"<line x1="{1:.1}" y1="{0:.1}" x2="{2:.1}" y2="{0:.1}"/>"#,
                py(t),
                LEFT - 5.0,
                LEFT
            );
        }
        let _ = writeln!(svg, "</g>");
        let _ = writeln!(svg, r#"<g class="tick-labels">"#);
        for &t in &x_ticks {
            let _ = writeln!(
                svg,
                r#"<text x="{:.1}" y="{:.1}" text-anchor="middle">{}</text>"#,
                px(t),
                TOP + plot_h + 19.0,
                tick_label(t, x_step)
            );
        }
        for &t in &y_ticks {
            let _ = writeln!(
                svg,
                r#"<text x="{:.1}" y="{:.1}" text-anchor="end">{}</text>"#,
                LEFT - 8.0,
                py(t) + 4.0,
                tick_label(t, y_step)
            );
        }
        let _ = writeln!(svg, "</g>");
        let _ = writeln!(
            svg,
            r#"<text class="x-label" x="{:.1}" y="{:.1}" text-anchor="middle">{}</text>"#,
            LEFT + plot_w / 2.0,
            HEIGHT - 14.0,
            escape(&self.x_label)
        );
        let _ = writeln!(
            svg,
            r#"<text class="y-label" x="18" y="{0:.1}" text-anchor="middle" transform="rotate(-90 18 {0:.1})">{1}</text>"#,
            TOP + plot_h / 2.0,
            escape(&self.y_label)
        );

        // Curves first, then markers, so that no curve hides a marker drawn on it.
        let mut order: Vec<usize> = (0..self.series.len()).collect();
        order.sort_by_key(|&k| matches!(self.series[k].style, SeriesStyle::Markers));
        for (series, points) in order.iter().map(|&k| (&self.series[k], &data[k])) {
            let i = series.look;
            let colour = COLOURS[i % COLOURS.len()];
            let _ = writeln!(
                svg,
                r#"<g class="series"><title>{}</title>"#,
                escape(&series.name)
            );
            match series.style {
                SeriesStyle::Line if points.len() >= 2 => {
                    let coords: Vec<String> = points
                        .iter()
                        .map(|&(x, y)| format!("{:.1},{:.1}", px(x), py(y)))
                        .collect();
                    let dash = DASHES[i % DASHES.len()];
                    let dash_attr = if dash.is_empty() {
                        String::new()
                    } else {
                        format!(r#" stroke-dasharray="{dash}""#)
                    };
                    let _ = writeln!(
                        svg,
                        r#"<polyline fill="none" stroke="{colour}" stroke-width="2"{dash_attr} points="{}"/>"#,
                        coords.join(" ")
                    );
                }
                _ => {
                    for &(x, y) in points {
                        let _ = writeln!(svg, "{}", marker(i, px(x), py(y), colour));
                    }
                }
            }
            // Labels go with the finite points they belong to, so a skipped point skips its own.
            let labelled = series
                .points
                .iter()
                .zip(&series.labels)
                .filter(|((x, y), _)| x.is_finite() && y.is_finite());
            for (&(x, y), label) in labelled {
                let _ = writeln!(
                    svg,
                    r#"<text class="point-label" x="{:.1}" y="{:.1}" font-size="11" fill="{colour}">{}</text>"#,
                    px(x) + 6.0,
                    py(y) - 6.0,
                    escape(label)
                );
            }
            let _ = writeln!(svg, "</g>");
        }
        if data.iter().all(Vec::is_empty) {
            let _ = writeln!(
                svg,
                r#"<text x="{:.1}" y="{:.1}" text-anchor="middle">no solved points to plot</text>"#,
                LEFT + plot_w / 2.0,
                TOP + plot_h / 2.0
            );
        }

        // Legend: a sample of each line style beside its name, the name wrapped to the space
        // right of the plot so that no entry runs off the image.
        let legend_x = LEFT + plot_w + 16.0;
        let _ = writeln!(svg, r#"<g class="legend">"#);
        let mut y = TOP + 10.0;
        for series in &self.series {
            let i = series.look;
            let colour = COLOURS[i % COLOURS.len()];
            match series.style {
                SeriesStyle::Line => {
                    let dash = DASHES[i % DASHES.len()];
                    let dash_attr = if dash.is_empty() {
                        String::new()
                    } else {
                        format!(r#" stroke-dasharray="{dash}""#)
                    };
                    let _ = writeln!(
                        svg,
                        r#"<line x1="{legend_x:.1}" y1="{y:.1}" x2="{:.1}" y2="{y:.1}" stroke="{colour}" stroke-width="2"{dash_attr}/>"#,
                        legend_x + 26.0
                    );
                }
                SeriesStyle::Markers => {
                    let _ = writeln!(svg, "{}", marker(i, legend_x + 13.0, y, colour));
                }
            }
            let lines = wrap(&series.name, LEGEND_CHARS);
            let _ = write!(
                svg,
                r#"<text x="{:.1}" y="{:.1}">"#,
                legend_x + 32.0,
                y + 4.0
            );
            for (k, line) in lines.iter().enumerate() {
                let dy = if k == 0 { 0.0 } else { LEGEND_LINE };
                let _ = write!(
                    svg,
                    r#"<tspan x="{:.1}" dy="{dy:.1}">{}</tspan>"#,
                    legend_x + 32.0,
                    escape(line)
                );
            }
            let _ = writeln!(svg, "</text>");
            y += 20.0 + LEGEND_LINE * (lines.len().max(1) - 1) as f64;
        }
        let _ = writeln!(svg, "</g>");
        svg.push_str("</svg>\n");
        svg
    }
}

/// Characters of a legend line: the space right of the plot less the sample, at about 6.5 px
/// per character of the 12 px font (common practice for sans-serif).
const LEGEND_CHARS: usize = ((RIGHT - 16.0 - 32.0 - 4.0) / 6.5) as usize;
/// Height of a wrapped legend line, px.
const LEGEND_LINE: f64 = 14.0;

/// `text` broken at spaces into lines of at most `width` characters (a longer word stands
/// alone on its line).
fn wrap(text: &str, width: usize) -> Vec<String> {
    let mut lines: Vec<String> = Vec::new();
    for word in text.split_whitespace() {
        match lines.last_mut() {
            Some(line) if line.chars().count() + 1 + word.chars().count() <= width => {
                line.push(' ');
                line.push_str(word);
            }
            _ => lines.push(word.to_owned()),
        }
    }
    lines
}

/// A marker whose shape depends on the series index (circle, square, triangle, …).
fn marker(index: usize, x: f64, y: f64, colour: &str) -> String {
    match index % 3 {
        0 => format!(
            r#"<circle cx="{x:.1}" cy="{y:.1}" r="4" fill="none" stroke="{colour}" stroke-width="1.8"/>"#
        ),
        1 => format!(
            r#"<rect x="{:.1}" y="{:.1}" width="8" height="8" fill="none" stroke="{colour}" stroke-width="1.8"/>"#,
            x - 4.0,
            y - 4.0
        ),
        _ => format!(
            r#"<polygon points="{x:.1},{:.1} {:.1},{:.1} {:.1},{:.1}" fill="none" stroke="{colour}" stroke-width="1.8"/>"#,
            y - 5.0,
            x - 4.5,
            y + 4.0,
            x + 4.5,
            y + 4.0
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn chart() -> Chart {
        Chart {
            title: "Power <vs> rpm & more".into(),
            x_label: "engine speed (rpm)".into(),
            y_label: "brake power (kW)".into(),
            series: vec![
                Series {
                    name: "engine full load".into(),
                    points: vec![(800.0, 20.0), (2600.0, 80.0)],
                    style: SeriesStyle::Line,
                    look: 0,
                    labels: Vec::new(),
                },
                Series {
                    name: "variant \"A\"".into(),
                    points: vec![(900.0, 3.0), (2500.0, f64::NAN), (2400.0, 70.0)],
                    style: SeriesStyle::Line,
                    look: 1,
                    labels: Vec::new(),
                },
                Series {
                    name: "trial".into(),
                    points: vec![(1500.0, 30.0)],
                    style: SeriesStyle::Markers,
                    look: 2,
                    labels: Vec::new(),
                },
            ],
        }
    }

    #[test]
    fn a_series_keeps_its_look_whatever_its_position() {
        let mut c = chart();
        c.series.remove(0);
        let svg = c.to_svg();
        // The variant was second in `chart()`; without the engine line it is first, but keeps
        // look 1, so it is drawn in the second colour with the second dash pattern.
        assert!(svg.contains(COLOURS[1]) && svg.contains(DASHES[1]));
        assert!(!svg.contains(COLOURS[0]));
    }

    #[test]
    fn ticks_are_round_numbers_inside_the_range() {
        assert_eq!(ticks(0.0, 10.0, 5), vec![0.0, 2.0, 4.0, 6.0, 8.0, 10.0]);
        // A raw step of 234 rounds up to 500.
        assert_eq!(
            ticks(780.0, 2650.0, 8),
            vec![1000.0, 1500.0, 2000.0, 2500.0]
        );
        assert_eq!(ticks(1.0, 1.0, 5), vec![1.0]);
    }

    #[test]
    fn svg_escapes_text_skips_nan_and_names_every_series() {
        let svg = chart().to_svg();
        assert!(svg.contains("Power &lt;vs&gt; rpm &amp; more"));
        assert!(svg.contains("variant &quot;A&quot;"));
        assert!(!svg.contains("NaN"));
        assert_eq!(svg.matches("<polyline").count(), 2);
        assert!(
            svg.contains("<polygon"),
            "the third series' markers are triangles"
        );
        assert!(svg.contains("brake power (kW)"));
        assert!(svg.trim_end().ends_with("</svg>"));
    }

    #[test]
    fn markers_are_drawn_over_every_curve() {
        let mut c = chart();
        // The markers first in the list: they must still come after both curves in the file.
        c.series.rotate_right(1);
        let svg = c.to_svg();
        let marker = svg.find("<polygon").expect("the triangle markers");
        let last_curve = svg.rfind("<polyline").expect("the curves");
        assert!(marker > last_curve, "a curve drawn over the markers");
    }

    #[test]
    fn a_long_legend_entry_is_wrapped_whole_inside_the_image() {
        let mut c = chart();
        c.series[2].name = "past the method's range: unreliable, a sea trial decides".into();
        let svg = c.to_svg();
        let legend = &svg[svg.find(r#"<g class="legend">"#).unwrap()..];
        let words: Vec<String> = legend
            .split("<tspan")
            .skip(1)
            .map(|t| {
                t[t.find('>').unwrap() + 1..t.find("</tspan>").unwrap()].replace("&apos;", "'")
            })
            .collect();
        assert!(words.iter().all(|w| w.chars().count() <= LEGEND_CHARS));
        let joined = words.join(" ");
        assert!(
            joined.contains("past the method's range: unreliable, a sea trial decides"),
            "{joined}"
        );
        // The longest line fits between the sample and the image's right edge.
        let widest = LEGEND_CHARS as f64 * 6.5;
        assert!(WIDTH - RIGHT + 16.0 + 32.0 + widest <= WIDTH);
    }

    #[test]
    fn an_empty_chart_still_draws_axes_and_says_so() {
        let svg = Chart {
            title: "t".into(),
            x_label: "x".into(),
            y_label: "y".into(),
            series: vec![],
        }
        .to_svg();
        assert!(svg.contains("no solved points"));
    }
}
