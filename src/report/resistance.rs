//! What `tidewright resistance` prints: the hull's resistance curve as text, CSV, Markdown or
//! JSON, every row naming the formula that gives it.

use serde::Serialize;

use super::table::{Column, Table};
use super::{Display, KNOT_MPS};
use crate::study::resistance::{ResistanceCurve, ResistanceRow};
use crate::units::{Kind, UnitSystem};

/// One JSON row of the curve (SI, or the unit in the field's name).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ResistancePointJson {
    /// Boat speed, kn.
    pub speed_kn: f64,
    /// Length Froude number (dimensionless).
    pub froude: f64,
    /// Volume Froude number (dimensionless).
    pub froude_volume: f64,
    /// Speed/length ratio, kn/√ft.
    pub speed_length: f64,
    /// Total resistance, N.
    pub resistance_n: f64,
    /// Viscous resistance (friction × form factor), N.
    pub friction_n: f64,
    /// Wave (residuary) resistance, N.
    pub residuary_n: f64,
    /// Appendage resistance, N.
    pub appendages_n: f64,
    /// Correlation allowance, N.
    pub correlation_n: f64,
    /// Air drag, N.
    pub air_n: f64,
    /// Service margin and fouling, N.
    pub margin_n: f64,
    /// Effective power R·V, kW.
    pub effective_kw: f64,
    /// The formula at this speed.
    pub method: &'static str,
    /// Whether the figure is the method's own inside its range.
    pub in_method_range: bool,
    /// Why not, when not.
    pub reason: Option<String>,
}

/// The JSON document of the curve.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ResistanceJson {
    /// The boat's name.
    pub boat: String,
    /// The boat's resistance method.
    pub method: &'static str,
    /// The rows by rising speed.
    pub points: Vec<ResistancePointJson>,
}

/// The JSON document of `curve`.
pub fn json(curve: &ResistanceCurve) -> ResistanceJson {
    ResistanceJson {
        boat: curve.boat.clone(),
        method: curve.method,
        points: curve
            .rows
            .iter()
            .map(|r| ResistancePointJson {
                speed_kn: r.speed / KNOT_MPS,
                froude: r.froude,
                froude_volume: r.froude_volume,
                speed_length: r.speed_length,
                resistance_n: r.total,
                friction_n: r.friction,
                residuary_n: r.residuary,
                appendages_n: r.appendages,
                correlation_n: r.correlation,
                air_n: r.air,
                margin_n: r.margin,
                effective_kw: r.effective_power / 1000.0,
                method: r.method,
                in_method_range: r.in_method_range,
                reason: r.reason.clone(),
            })
            .collect(),
    }
}

/// The table of the curve in `system`'s units.
fn table(curve: &ResistanceCurve, system: UnitSystem) -> Table {
    let d = Display::new(system);
    let force = d.unit(Kind::Force);
    let mut table = Table::new(vec![
        Column::number("speed", &d.unit(Kind::Speed)),
        Column::number("Fn", ""),
        Column::number("FnV", ""),
        Column::number("S/L", ""),
        Column::number("friction", &force),
        Column::number("wave", &force),
        Column::number("other", &force),
        Column::number("total", &force),
        Column::number("PE", &d.unit(Kind::Power)),
        Column::text("formula"),
    ]);
    for r in &curve.rows {
        table.push(row(r, &d));
    }
    table
}

fn row(r: &ResistanceRow, d: &Display) -> Vec<String> {
    let other = r.appendages + r.correlation + r.air + r.margin;
    let formula = if r.in_method_range {
        r.method.to_owned()
    } else {
        format!("{} (extrapolation)", r.method)
    };
    vec![
        d.number(r.speed, Kind::Speed, 2),
        format!("{:.3}", r.froude),
        format!("{:.3}", r.froude_volume),
        format!("{:.2}", r.speed_length),
        d.figure(r.friction, Kind::Force),
        d.figure(r.residuary, Kind::Force),
        d.figure(other, Kind::Force),
        d.figure(r.total, Kind::Force),
        d.number(r.effective_power, Kind::Power, 1),
        formula,
    ]
}

/// The heading lines: boat, method and what the columns hold.
fn heading(curve: &ResistanceCurve) -> String {
    format!(
        "{}: resistance by {}\n\
         other = appendages + correlation allowance + air + service margin and fouling; \
         PE = effective power R·V\n",
        curve.boat, curve.method
    )
}

/// The first reason the curve leaves its method, for the note under the table.
fn extrapolation_note(curve: &ResistanceCurve) -> Option<String> {
    let first = curve.rows.iter().find(|r| !r.in_method_range)?;
    Some(format!(
        "From {:.2} kn (Fn {:.3}) the figures are extrapolations: {}.",
        first.speed / KNOT_MPS,
        first.froude,
        first
            .reason
            .as_deref()
            .unwrap_or(crate::propulsion::hull::UNRELIABLE_WORDS)
    ))
}

/// Readable text.
pub fn text(curve: &ResistanceCurve, system: UnitSystem) -> String {
    let mut out = heading(curve);
    out.push('\n');
    out.push_str(&table(curve, system).to_text("  "));
    if let Some(note) = extrapolation_note(curve) {
        out.push_str(&format!("\n{note}\n"));
    }
    out
}

/// Markdown.
pub fn markdown(curve: &ResistanceCurve, system: UnitSystem) -> String {
    let mut out = format!("# {}\n\n{}\n", curve.boat, heading(curve));
    out.push_str(&table(curve, system).to_markdown());
    if let Some(note) = extrapolation_note(curve) {
        out.push_str(&format!("\n{note}\n"));
    }
    out
}

/// CSV: the table alone.
pub fn csv(curve: &ResistanceCurve, system: UnitSystem) -> String {
    table(curve, system).to_csv()
}
