//! What more power buys, laid out: the candidates' installed power at their top speeds and the
//! hull's effective-power curve as a table, a sentence, a plain-text chart (the CLI), an SVG
//! chart (the export) and JSON. Lays out `study::power_speed` only.

use serde::Serialize;

use super::svg::{Chart, Series, SeriesStyle};
use super::table::{Column, Table};
use super::{Display, KNOT_MPS};
use crate::study::power_speed::PowerForSpeed;
use crate::study::shortlist::Shortlist;
use crate::units::Kind;

/// File name of the chart in the export.
pub const CHART_FILE: &str = "power-for-speed.svg";

/// The candidate's mark on the charts and in the table: "#n" by its shortlist position.
fn position_label(list: &Shortlist, engine: &str, gear_ratio: f64) -> String {
    list.position_of(engine, gear_ratio)
        .map_or("#?".into(), |n| format!("#{n}"))
}

/// The table of candidates by rising installed power, with the gain over the least powerful.
pub fn power_table(list: &Shortlist, data: &PowerForSpeed, d: &Display) -> Table {
    let mut table = Table::new(vec![
        Column::number("#", ""),
        Column::text("engine"),
        Column::number("gear", ""),
        Column::number("installed", &d.unit(Kind::Power)),
        Column::number("top", &d.unit(Kind::Speed)),
        Column::number("more power", "%"),
        Column::number("more speed", &d.unit(Kind::Speed)),
        Column::number("R·V share", "%"),
    ]);
    for p in &data.candidates {
        let mark = if p.in_method_range { "" } else { "*" };
        table.push(vec![
            position_label(list, &p.engine, p.gear_ratio)
                .trim_start_matches('#')
                .to_string(),
            p.engine.clone(),
            format!("{:.2}", p.gear_ratio),
            d.number(p.installed_power, Kind::Power, 0),
            format!("{}{mark}", d.number(p.top_speed, Kind::Speed, 1)),
            format!("{:+.0}", p.power_gain * 100.0),
            format!("{:+.1}", d.scaled(p.speed_gain, Kind::Speed)),
            format!("{:.0}", p.effective_share * 100.0),
        ]);
    }
    table
}

/// The finding in one or two sentences: the power step from the least to the most powerful
/// candidate and what it buys, and the hull's exponent at the fastest top speed.
pub fn power_summary(list: &Shortlist, data: &PowerForSpeed, d: &Display) -> String {
    let (Some(base), Some(most)) = (data.base(), data.candidates.last()) else {
        return String::new();
    };
    let mut text = if data.candidates.len() < 2 || most.power_gain <= 0.0 {
        format!(
            "{} {} reaches {} on {}.",
            position_label(list, &base.engine, base.gear_ratio),
            base.engine,
            d.quantity(base.top_speed, Kind::Speed),
            d.quantity(base.installed_power, Kind::Power)
        )
    } else {
        format!(
            "From {} {} ({}, {}) to {} {} ({}, {}): {:+.0} % power for {:+.1} {}.",
            position_label(list, &base.engine, base.gear_ratio),
            base.engine,
            d.quantity(base.installed_power, Kind::Power),
            d.quantity(base.top_speed, Kind::Speed),
            position_label(list, &most.engine, most.gear_ratio),
            most.engine,
            d.quantity(most.installed_power, Kind::Power),
            d.quantity(most.top_speed, Kind::Speed),
            most.power_gain * 100.0,
            d.scaled(most.speed_gain, Kind::Speed),
            d.unit(Kind::Speed),
        )
    };
    if let Some(n) = data.exponent_at_top {
        text.push_str(&format!(
            " At {} the hull's effective power rises as speed^{n:.1}: each 1 % more speed takes about {n:.0} % more power.",
            d.quantity(data.fastest, Kind::Speed)
        ));
    }
    text
}

/// One candidate's point in words: installed power, top speed and the gain over the least
/// powerful candidate (`None` when it reaches no top speed and so is not on the chart).
pub fn point_line(
    list: &Shortlist,
    data: &PowerForSpeed,
    engine: &str,
    gear_ratio: f64,
    d: &Display,
) -> Option<String> {
    let p = data
        .candidates
        .iter()
        .find(|p| p.engine == engine && (p.gear_ratio - gear_ratio).abs() < 1e-9)?;
    let base = data.base()?;
    let unreliable = if p.in_method_range {
        ""
    } else {
        " (unreliable: past the resistance method's range or the displacement-hull speed/length limit)"
    };
    let mut text = format!(
        "{} {} {:.2}:1: {} installed, top speed {}{unreliable}",
        position_label(list, &p.engine, p.gear_ratio),
        p.engine,
        p.gear_ratio,
        d.quantity(p.installed_power, Kind::Power),
        d.quantity(p.top_speed, Kind::Speed),
    );
    if !std::ptr::eq(p, base) {
        text.push_str(&format!(
            "; {:+.0} % power for {:+.1} {} over {}",
            p.power_gain * 100.0,
            d.scaled(p.speed_gain, Kind::Speed),
            d.unit(Kind::Speed),
            position_label(list, &base.engine, base.gear_ratio)
        ));
    }
    text.push_str(&format!("; R·V share {:.0} %", p.effective_share * 100.0));
    Some(text)
}

/// The legend line under the table.
pub const SHARE_NOTE: &str = "R·V share: the hull's effective power (resistance × speed) at that top speed over the installed power; the rest goes in the screw, gear and shaft. * top speed past the resistance method's range or the displacement-hull speed/length limit";

/// The SVG chart: the hull's effective power against speed, and each candidate's installed
/// power at its top speed, marked with its shortlist position.
pub fn power_chart(list: &Shortlist, data: &PowerForSpeed, d: &Display) -> Chart {
    let point =
        |speed: f64, power: f64| (d.scaled(speed, Kind::Speed), d.scaled(power, Kind::Power));
    let within: Vec<(f64, f64)> = data
        .hull
        .iter()
        .filter(|h| h.in_method_range)
        .map(|h| point(h.speed, h.effective_power))
        .collect();
    // The extrapolated part starts at the last point inside, so the two lines join.
    let first_outside = data.hull.iter().position(|h| !h.in_method_range);
    let outside: Vec<(f64, f64)> = first_outside
        .map(|i| {
            data.hull[i.saturating_sub(1)..]
                .iter()
                .map(|h| point(h.speed, h.effective_power))
                .collect()
        })
        .unwrap_or_default();
    let mut series = vec![Series {
        name: "hull effective power R·V".into(),
        points: within,
        style: SeriesStyle::Line,
        look: 0,
        labels: Vec::new(),
    }];
    if !outside.is_empty() {
        series.push(Series {
            name: "R·V past the method's range (extrapolated)".into(),
            points: outside,
            style: SeriesStyle::Line,
            look: 4,
            labels: Vec::new(),
        });
    }
    series.push(Series {
        name: "candidate: installed power at top speed".into(),
        points: data
            .candidates
            .iter()
            .map(|p| point(p.top_speed, p.installed_power))
            .collect(),
        style: SeriesStyle::Markers,
        look: 1,
        labels: data
            .candidates
            .iter()
            .map(|p| position_label(list, &p.engine, p.gear_ratio))
            .collect(),
    });
    Chart {
        title: format!("{}: installed power against top speed", list.boat),
        x_label: format!("speed ({})", d.unit(Kind::Speed)),
        y_label: format!("power ({})", d.unit(Kind::Power)),
        series,
    }
}

/// Columns of the plain-text chart's plot area.
const PLOT_WIDTH: usize = 60;
/// Rows of the plain-text chart's plot area.
const PLOT_HEIGHT: usize = 14;

/// The character marking a candidate in the plain-text chart: its position 1–9, then a–z.
fn position_mark(position: Option<usize>) -> char {
    match position {
        Some(n @ 1..=9) => char::from(b'0' + n as u8),
        Some(n @ 10..=35) => char::from(b'a' + (n - 10) as u8),
        _ => '+',
    }
}

/// The chart in plain ASCII for the terminal: `.` the hull's effective power, `:` where it is
/// extrapolated, and each candidate by its shortlist position (1–9, then a–z).
pub fn power_text_chart(list: &Shortlist, data: &PowerForSpeed, d: &Display) -> String {
    let speed = |v: f64| d.scaled(v, Kind::Speed);
    let power = |p: f64| d.scaled(p, Kind::Power);
    let x_max = speed(
        data.hull
            .last()
            .map_or(data.fastest, |h| h.speed)
            .max(data.fastest),
    );
    let y_max = data
        .hull
        .iter()
        .map(|h| h.effective_power)
        .chain(data.candidates.iter().map(|p| p.installed_power))
        .map(power)
        .fold(0.0, f64::max);
    // The axis starts at the whole unit at or below the hull curve's first speed.
    let x_min = data
        .hull
        .first()
        .map_or(0.0, |h| speed(h.speed).floor().max(0.0));
    if !(x_max > x_min && y_max > 0.0) {
        return String::new();
    }
    let mut grid = vec![[' '; PLOT_WIDTH]; PLOT_HEIGHT];
    let cell = |x: f64, y: f64| -> Option<(usize, usize)> {
        let col = ((x - x_min) / (x_max - x_min) * (PLOT_WIDTH - 1) as f64).round();
        let row = (y / y_max * (PLOT_HEIGHT - 1) as f64).round();
        (col.is_finite() && row.is_finite() && col >= 0.0 && row >= 0.0)
            .then(|| {
                (
                    col as usize,
                    PLOT_HEIGHT - 1 - (row as usize).min(PLOT_HEIGHT - 1),
                )
            })
            .filter(|(c, _)| *c < PLOT_WIDTH)
    };
    // The curve is drawn at every column, from the hull points on either side of it.
    for col in 0..PLOT_WIDTH {
        let x = x_min + (x_max - x_min) * col as f64 / (PLOT_WIDTH - 1) as f64;
        let after = data.hull.iter().position(|h| speed(h.speed) >= x);
        let Some(i) = after else { continue };
        let h1 = &data.hull[i];
        let Some(h0) = i.checked_sub(1).map(|j| &data.hull[j]) else {
            continue;
        };
        let (x0, y0) = (speed(h0.speed), power(h0.effective_power));
        let (x1, y1) = (speed(h1.speed), power(h1.effective_power));
        let y = if x1 > x0 {
            y0 + (y1 - y0) * (x - x0) / (x1 - x0)
        } else {
            y1
        };
        if let Some((c, r)) = cell(x, y) {
            grid[r][c] = if h1.in_method_range { '.' } else { ':' };
        }
    }
    // The best-placed candidate keeps a cell two candidates share.
    for p in data.candidates.iter().rev() {
        let position = list.position_of(&p.engine, p.gear_ratio);
        if let Some((c, r)) = cell(speed(p.top_speed), power(p.installed_power)) {
            let mark = position_mark(position);
            let taken = grid[r][c];
            let keep = taken.is_ascii_alphanumeric() && taken < mark;
            if !keep {
                grid[r][c] = mark;
            }
        }
    }
    let label_width = 7;
    let mut out = String::new();
    for (r, row) in grid.iter().enumerate() {
        let value = y_max * (PLOT_HEIGHT - 1 - r) as f64 / (PLOT_HEIGHT - 1) as f64;
        let label = if r == 0 || r == PLOT_HEIGHT - 1 || r == PLOT_HEIGHT / 2 {
            format!("{value:.0}")
        } else {
            String::new()
        };
        let line: String = row.iter().collect();
        out.push_str(&format!("  {label:>label_width$} |{}\n", line.trim_end()));
    }
    out.push_str(&format!(
        "  {:>label_width$} +{}\n",
        "",
        "-".repeat(PLOT_WIDTH)
    ));
    let (left, right) = (format!("{x_min:.0}"), format!("{x_max:.1}"));
    out.push_str(&format!(
        "  {:>label_width$}  {left}{}{right} {}\n",
        "",
        " ".repeat(PLOT_WIDTH.saturating_sub(left.len() + right.len())),
        d.unit(Kind::Speed)
    ));
    out.push_str(&format!(
        "  power ({}) against speed: . hull effective power R·V, : extrapolated past the method's range, 1-9 a-z candidates by shortlist position at their installed power and top speed\n",
        d.unit(Kind::Power)
    ));
    out
}

/// One hull point in JSON.
#[derive(Debug, Clone, Serialize)]
pub struct HullPowerJson {
    /// Boat speed, kn.
    pub speed_kn: f64,
    /// Effective power R·V, kW.
    pub effective_kw: f64,
    /// Whether the resistance there is the method's own.
    pub in_method_range: bool,
}

/// One candidate's point in JSON.
#[derive(Debug, Clone, Serialize)]
pub struct PowerPointJson {
    /// 1-based shortlist position.
    pub position: Option<usize>,
    /// The engine sheet's store name.
    pub engine: String,
    /// Reduction ratio.
    pub gear_ratio: f64,
    /// Rated power of all the boat's engines together, kW.
    pub installed_kw: f64,
    /// Top speed, kn.
    pub top_speed_kn: f64,
    /// Whether the top speed is inside the resistance method's range.
    pub top_speed_in_method_range: bool,
    /// More installed power than the least powerful candidate, %.
    pub power_gain_pct: f64,
    /// More top speed than the least powerful candidate, kn.
    pub speed_gain_kn: f64,
    /// Effective power at the top speed over installed power, %.
    pub effective_share_pct: f64,
}

/// The chart's data in JSON.
#[derive(Debug, Clone, Serialize)]
pub struct PowerForSpeedJson {
    /// The hull's effective-power curve.
    pub hull: Vec<HullPowerJson>,
    /// The candidates with a top speed, by rising installed power.
    pub candidates: Vec<PowerPointJson>,
    /// Exponent n of R·V ∝ Vⁿ at the fastest top speed.
    pub exponent_at_top: Option<f64>,
}

/// The chart's data in JSON units (kn, kW, %).
pub fn power_json(list: &Shortlist, data: &PowerForSpeed) -> PowerForSpeedJson {
    PowerForSpeedJson {
        hull: data
            .hull
            .iter()
            .map(|h| HullPowerJson {
                speed_kn: h.speed / KNOT_MPS,
                effective_kw: h.effective_power / 1000.0,
                in_method_range: h.in_method_range,
            })
            .collect(),
        candidates: data
            .candidates
            .iter()
            .map(|p| PowerPointJson {
                position: list.position_of(&p.engine, p.gear_ratio),
                engine: p.engine.clone(),
                gear_ratio: p.gear_ratio,
                installed_kw: p.installed_power / 1000.0,
                top_speed_kn: p.top_speed / KNOT_MPS,
                top_speed_in_method_range: p.in_method_range,
                power_gain_pct: p.power_gain * 100.0,
                speed_gain_kn: p.speed_gain / KNOT_MPS,
                effective_share_pct: p.effective_share * 100.0,
            })
            .collect(),
        exponent_at_top: super::finite_or_none(data.exponent_at_top),
    }
}
