//! The open-water table of one screw: text and JSON.

use super::table::{Column, Table};

/// One row of the open-water table (every value finite; efficiency only where thrust > 0).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct OpenWaterRow {
    /// Advance ratio J.
    pub j: f64,
    /// Thrust coefficient KT.
    pub kt: f64,
    /// Torque coefficient KQ (the text table shows 10·KQ).
    pub kq: f64,
    /// Open-water efficiency η0 = J·KT/(2π·KQ).
    pub eta0: f64,
}

/// The open-water table of a B-series screw with its warnings.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct OpenWaterReport {
    /// Number of blades Z.
    pub blades: u32,
    /// Expanded area ratio AE/A0.
    pub area_ratio: f64,
    /// Pitch ratio P/D.
    pub pitch_ratio: f64,
    /// Blade Reynolds number at 0.75R used for the correction, if any.
    pub reynolds: Option<f64>,
    /// Advance ratio at which KT falls to zero, if found.
    pub zero_thrust_j: Option<f64>,
    /// Rows with positive thrust, in the order asked for.
    pub points: Vec<OpenWaterRow>,
    /// Validity warnings and omitted points.
    pub warnings: Vec<String>,
}

/// The readable text table: J, KT, 10·KQ, η0.
pub fn text(report: &OpenWaterReport) -> String {
    let mut out = format!(
        "Wageningen B-series: Z = {}, AE/A0 = {:.3}, P/D = {:.3}, {}\n",
        report.blades,
        report.area_ratio,
        report.pitch_ratio,
        match report.reynolds {
            Some(rn) => format!("Rn(0.75R) = {rn:.3e} (full-scale correction)"),
            None => "open-water polynomials without Reynolds correction".into(),
        }
    );
    if let Some(j0) = report.zero_thrust_j {
        out.push_str(&format!("zero thrust at J = {j0:.4}\n"));
    }
    out.push('\n');
    let mut table = Table::new(vec![
        Column::number("J", ""),
        Column::number("KT", ""),
        Column::number("10·KQ", ""),
        Column::number("η0", ""),
    ]);
    for p in &report.points {
        table.push(vec![
            format!("{:.3}", p.j),
            format!("{:.4}", p.kt),
            format!("{:.4}", 10.0 * p.kq),
            format!("{:.4}", p.eta0),
        ]);
    }
    out.push_str(&table.to_text("  "));
    if report.points.is_empty() {
        out.push_str("  (no advance ratio in the list gives positive thrust)\n");
    }
    for w in &report.warnings {
        out.push_str(&format!("warning: {w}\n"));
    }
    out
}
