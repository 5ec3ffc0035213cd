//! Before and after, laid out: the as-found figures beside the planned ones and the change,
//! as a text/Markdown table, one line for narrow places and JSON. Lays out `study::baseline`.

use serde::Serialize;

use super::table::{Column, Table};
use super::{Display, KNOT_MPS, LITRE_M3, NAUTICAL_MILE_M};
use crate::study::baseline::{Baseline, Headline};
use crate::units::Kind;

/// The headline figures in JSON units (`null` where not solved).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct HeadlineJson {
    /// Top speed, kn.
    pub top_speed_kn: Option<f64>,
    /// Free-running rpm margin, rpm.
    pub rpm_margin: Option<f64>,
    /// Engine rpm at the target speed.
    pub cruise_rpm: Option<f64>,
    /// Load at the target speed, % of full-load power at that rpm.
    pub cruise_load_pct: Option<f64>,
    /// Fuel of the boat at the target speed, L/h.
    pub fuel_lph: Option<f64>,
    /// Fuel per distance at the target speed, L/nm.
    pub fuel_l_per_nm: Option<f64>,
    /// Range with the reserve at the target speed, nm.
    pub range_nm: Option<f64>,
}

/// The figures (or their change) in JSON units.
pub fn headline_json(h: &Headline) -> HeadlineJson {
    HeadlineJson {
        top_speed_kn: h.top_speed.map(|v| v / KNOT_MPS),
        rpm_margin: h.rpm_margin,
        cruise_rpm: h.cruise_rpm,
        cruise_load_pct: h.cruise_load.map(|l| l * 100.0),
        fuel_lph: h.fuel_rate.map(|q| q / LITRE_M3 * 3600.0),
        fuel_l_per_nm: h.fuel_per_distance.map(|f| f / LITRE_M3 * NAUTICAL_MILE_M),
        range_nm: h.range.map(|r| r / NAUTICAL_MILE_M),
    }
}

/// The baseline in JSON: the as-found installation and its figures.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BaselineJson {
    /// The as-found engine sheet's profile name.
    pub engine: String,
    /// The as-found reduction ratio.
    pub gear_ratio: f64,
    /// The as-found screw variant's label.
    pub variant: String,
    /// The displacement change on the planned side, kg (`null`: none).
    pub weight_change_kg: Option<f64>,
    /// Whether that change is estimated from the engine sheets' dry weights.
    pub weight_change_estimated: Option<bool>,
    /// The as-found figures.
    #[serde(flatten)]
    pub figures: HeadlineJson,
}

/// The baseline in JSON units.
pub fn baseline_json(b: &Baseline) -> BaselineJson {
    BaselineJson {
        engine: b.engine.clone(),
        gear_ratio: b.gear_ratio,
        variant: b.variant.clone(),
        weight_change_kg: b.weight_change.map(|w| w.mass),
        weight_change_estimated: b.weight_change.map(|w| w.estimated),
        figures: headline_json(&b.figures),
    }
}

/// "Brindmoor 3B40 on 2.00:1 with screw current 450x290".
pub fn installation_words(b: &Baseline) -> String {
    format!(
        "{} on {:.2}:1 with screw {}",
        b.engine_name, b.gear_ratio, b.variant
    )
}

/// One row of the before/after table: (figure, as-found cell, planned cell, change cell).
fn rows(before: &Headline, after: &Headline, d: &Display) -> Vec<[String; 4]> {
    let change = after.change_from(before);
    let dash = || "—".to_string();
    let cell = |v: Option<f64>, kind: Kind, decimals: usize| {
        v.map_or_else(dash, |x| d.number(x, kind, decimals))
    };
    let signed = |v: Option<f64>, kind: Kind, decimals: usize| {
        v.map_or_else(dash, |x| sign(x, d.number(x.abs(), kind, decimals)))
    };
    let rpm = |v: Option<f64>| v.map_or_else(dash, |x| format!("{x:.0}"));
    let signed_rpm = |v: Option<f64>| v.map_or_else(dash, |x| sign(x, format!("{:.0}", x.abs())));
    let pct = |v: Option<f64>| v.map_or_else(dash, |x| format!("{:.0}", x * 100.0));
    let signed_pct =
        |v: Option<f64>| v.map_or_else(dash, |x| sign(x, format!("{:.0}", x.abs() * 100.0)));
    let speed = d.unit(Kind::Speed);
    let fuel = d.unit(Kind::FuelRate);
    let per = d.unit(Kind::FuelPerDistance);
    let range = d.unit(Kind::Distance);
    vec![
        [
            format!("top speed ({speed})"),
            cell(before.top_speed, Kind::Speed, 1),
            cell(after.top_speed, Kind::Speed, 1),
            signed(change.top_speed, Kind::Speed, 1),
        ],
        [
            "rpm margin (rpm)".into(),
            signed_rpm(before.rpm_margin),
            signed_rpm(after.rpm_margin),
            signed_rpm(change.rpm_margin),
        ],
        [
            "cruise (rpm)".into(),
            rpm(before.cruise_rpm),
            rpm(after.cruise_rpm),
            signed_rpm(change.cruise_rpm),
        ],
        [
            "load at cruise (%)".into(),
            pct(before.cruise_load),
            pct(after.cruise_load),
            signed_pct(change.cruise_load),
        ],
        [
            format!("fuel at cruise ({fuel})"),
            cell(before.fuel_rate, Kind::FuelRate, 2),
            cell(after.fuel_rate, Kind::FuelRate, 2),
            signed(change.fuel_rate, Kind::FuelRate, 2),
        ],
        [
            format!("fuel per distance ({per})"),
            before
                .fuel_per_distance
                .map_or_else(dash, |v| d.figure(v, Kind::FuelPerDistance)),
            after
                .fuel_per_distance
                .map_or_else(dash, |v| d.figure(v, Kind::FuelPerDistance)),
            signed(change.fuel_per_distance, Kind::FuelPerDistance, 3),
        ],
        [
            format!("range ({range})"),
            cell(before.range, Kind::Distance, 0),
            cell(after.range, Kind::Distance, 0),
            signed(change.range, Kind::Distance, 0),
        ],
    ]
}

/// The before/after table of one planned installation against the baseline.
pub fn before_after_table(b: &Baseline, planned: &str, after: &Headline, d: &Display) -> Table {
    let mut table = Table::new(vec![
        Column::text("at the target speed / full throttle"),
        Column::number("as found", ""),
        Column::number(planned, ""),
        Column::number("change", ""),
    ]);
    for row in rows(&b.figures, after, d) {
        table.push(row.to_vec());
    }
    table
}

/// The lines under the heading: what the baseline is and the planned weight change.
pub fn baseline_lines(b: &Baseline, d: &Display) -> Vec<String> {
    let mut lines = vec![format!("As found: {}.", installation_words(b))];
    if let Some(w) = &b.weight_change {
        lines.push(format!("Planned side: {}.", w.words(d.system)));
    }
    lines
}

/// The change in one line for narrow places (the TUI readout, the shortlist's block):
/// "top +0.4 kn · cruise −120 rpm · fuel −0.030 L/nm · range +40 nm · margin +80 rpm".
pub fn change_line(before: &Headline, after: &Headline, d: &Display) -> String {
    let line = figures_line(&after.change_from(before), d, true);
    if line.is_empty() {
        "no figure to compare".into()
    } else {
        line
    }
}

/// Figures (or, with `signed`, changes) in one line: top speed, cruise rpm, fuel per
/// distance, range and rpm margin, each with its unit; those not solved are left out.
pub fn figures_line(h: &Headline, d: &Display, signed: bool) -> String {
    let show = |x: f64, text: String| if signed { sign(x, text) } else { text };
    let with_unit = |x: f64, kind: Kind, decimals: usize| {
        format!(
            "{} {}",
            show(
                x,
                d.number(if signed { x.abs() } else { x }, kind, decimals)
            ),
            d.unit(kind)
        )
    };
    let rpm = |x: f64| {
        format!(
            "{} rpm",
            show(x, format!("{:.0}", if signed { x.abs() } else { x }))
        )
    };
    let mut parts = Vec::new();
    if let Some(v) = h.top_speed {
        parts.push(format!("top {}", with_unit(v, Kind::Speed, 1)));
    }
    if let Some(v) = h.cruise_rpm {
        parts.push(format!("cruise {}", rpm(v)));
    }
    if let Some(v) = h.fuel_per_distance {
        parts.push(format!("fuel {}", with_unit(v, Kind::FuelPerDistance, 3)));
    }
    if let Some(v) = h.range {
        parts.push(format!("range {}", with_unit(v, Kind::Distance, 0)));
    }
    if let Some(v) = h.rpm_margin {
        // A margin is signed of itself (free-running above rated, short of it below).
        parts.push(format!(
            "margin {}",
            sign(v, format!("{:.0}", v.abs())) + " rpm"
        ));
    }
    parts.join(" · ")
}

/// `shown` (the magnitude, formatted) with the sign of `x`: "+" or "−" (U+2212), as the
/// project writes changes.
fn sign(x: f64, shown: String) -> String {
    // A change that rounds to zero is shown unsigned.
    if !shown.chars().any(|c| c.is_ascii_digit() && c != '0') {
        return shown;
    }
    if x < 0.0 {
        format!("−{shown}")
    } else {
        format!("+{shown}")
    }
}
