//! Design checks shown with a boat's report: cavitation and blade loading of each screw at the
//! target speed and at top speed, the shaft against the engine's torque, and the sea-trial
//! correction in force. The checks are the core's (`screw::cavitation`, `solver::shaft`); this
//! module only gathers their inputs from the report and lays the results out.

use serde::Serialize;

use super::table::{Column, Table};
use super::{Display, INCH_M, KNOT_MPS};
use crate::propulsion::screw::ScrewGeometry;
use crate::propulsion::screw::cavitation::{
    CavitationReport, PASCALS_PER_PSI, SMALL_CRAFT_BLADE_LOADING_LIMIT,
};
use crate::propulsion::solver::Vessel;
use crate::propulsion::solver::checks::keller_constant;
use crate::propulsion::solver::shaft::ShaftCheck;
use crate::study::checks::{cavitation, shaft_check};
use crate::study::solve::VariantSolution as VariantReport;
use crate::units::{Kind, UnitSystem};

pub use crate::study::checks::{CheckPoint, DEFAULT_SHAFT_MATERIAL, shaft_material};
pub use crate::study::{AppliedCalibration, CALM_WATER_NOTE, CheckInputs};

/// One screw checked at one operating point.
#[derive(Debug, Clone, PartialEq)]
pub struct CavitationRow {
    /// Which point.
    pub at: CheckPoint,
    /// Boat speed there, m/s.
    pub speed: f64,
    /// Engine speed there, rpm.
    pub engine_rpm: f64,
    /// The checks, or why they could not be made.
    pub outcome: Result<CavitationReport, String>,
}

/// One screw's cavitation checks.
#[derive(Debug, Clone, PartialEq)]
pub struct VariantChecks {
    /// The variant's label.
    pub label: String,
    /// Its geometry.
    pub geometry: ScrewGeometry,
    /// At the target speed and at top speed (only the points that were solved).
    pub rows: Vec<CavitationRow>,
}

/// Every design check of one boat.
#[derive(Debug, Clone, PartialEq)]
pub struct DesignChecks {
    /// Per screw, or why the cavitation check was skipped for all (no shaft immersion).
    pub cavitation: Result<Vec<VariantChecks>, String>,
    /// The shaft check, or why it could not be made.
    pub shaft: Result<ShaftCheck, String>,
    /// A note on the material used, when it was assumed.
    pub shaft_note: Option<String>,
    /// Shafts fitted (1 or 2): Keller's K and the shaft check's wording follow it.
    pub shafts: u32,
}

impl DesignChecks {
    /// Runs the checks for the variants of `variants` (already solved by the report).
    pub fn build(vessel: &Vessel, variants: &[VariantReport], inputs: &CheckInputs) -> Self {
        let cavitation = match inputs.shaft_immersion {
            None => Err(
                "skipped: the boat file gives no installation.shaft_immersion (depth of the shaft \
                 centreline below the waterline), which sets the static pressure at the screw"
                    .to_string(),
            ),
            Some(immersion) => Ok(variants
                .iter()
                .map(|v| {
                    let mut rows = Vec::new();
                    if let Ok(c) = &v.cruise {
                        rows.push((CheckPoint::Target, c.point));
                    }
                    if let Ok(m) = &v.matched {
                        rows.push((CheckPoint::Top, m.top_point));
                    }
                    VariantChecks {
                        label: v.label.clone(),
                        geometry: v.geometry,
                        rows: rows
                            .into_iter()
                            .map(|(at, p)| CavitationRow {
                                at,
                                speed: p.speed,
                                engine_rpm: p.engine_rpm,
                                outcome: cavitation(vessel, v.geometry, &p, immersion),
                            })
                            .collect(),
                    }
                })
                .collect()),
        };
        let (shaft, shaft_note) = shaft_check(vessel, inputs);
        Self {
            cavitation,
            shaft,
            shaft_note,
            shafts: vessel.installation.shafts,
        }
    }

    /// Warnings for the report: every check past its limit, and the shaft when too small.
    pub fn warnings(&self) -> Vec<String> {
        let mut out = Vec::new();
        if let Ok(variants) = &self.cavitation {
            for v in variants {
                for row in &v.rows {
                    match &row.outcome {
                        Ok(r) => out.extend(r.warnings.iter().map(|w| {
                            format!(
                                "screw {} at {} ({:.1} kn, {:.0} rpm): {}",
                                v.label,
                                row.at.words(),
                                row.speed / KNOT_MPS,
                                row.engine_rpm,
                                w.message
                            )
                        })),
                        Err(e) => out.push(format!(
                            "screw {} at {}: cavitation not checked: {e}",
                            v.label,
                            row.at.words()
                        )),
                    }
                }
            }
        }
        match &self.shaft {
            Ok(s) => out.extend(s.warnings.iter().map(|w| w.message.clone())),
            Err(e) => out.push(format!("shaft not checked: {e}")),
        }
        out
    }

    /// The cavitation table of one screw (text or Markdown by the caller), or `None` if skipped.
    pub fn cavitation_table(&self, label: &str, d: &Display) -> Option<Table> {
        let v = self
            .cavitation
            .as_ref()
            .ok()?
            .iter()
            .find(|v| v.label == label)?;
        let tip_unit = tip_speed_unit(d.system);
        let mut table = Table::new(vec![
            Column::text("at"),
            Column::number("speed", &d.unit(Kind::Speed)),
            Column::number("engine", "rpm"),
            Column::number("Keller min", "AE/A0"),
            Column::number("σ0.7R", ""),
            Column::number("τc", ""),
            Column::number("Burrill 5 %", "τc"),
            Column::number("loading", "psi"),
            Column::number("loading", "kPa"),
            Column::number("tip speed", tip_unit),
            Column::text("result"),
        ]);
        for row in &v.rows {
            let mut cells = vec![
                row.at.words().to_string(),
                d.number(row.speed, Kind::Speed, 2),
                format!("{:.0}", row.engine_rpm),
            ];
            match &row.outcome {
                Ok(r) => {
                    let mut past = Vec::new();
                    if !r.keller_area_ratio.passed {
                        past.push("Keller");
                    }
                    if !r.thrust_loading.passed {
                        past.push("Burrill");
                    }
                    if !r.blade_loading.passed {
                        past.push("blade loading");
                    }
                    cells.extend([
                        format!("{:.3}", r.keller_area_ratio.limit),
                        format!("{:.2}", r.cavitation_number),
                        format!("{:.3}", r.thrust_loading.value),
                        format!("{:.3}", r.thrust_loading.limit),
                        format!("{:.1}", r.blade_loading.value / PASCALS_PER_PSI),
                        format!("{:.1}", r.blade_loading.value / 1000.0),
                        format!("{:.1}", tip_speed_shown(r.tip_speed, d.system)),
                        if past.is_empty() {
                            "ok".into()
                        } else {
                            format!("PAST LIMIT: {}", past.join(", "))
                        },
                    ]);
                }
                Err(e) => {
                    cells.extend(std::iter::repeat_n("—".to_string(), 7));
                    cells.push(format!("not checked: {e}"));
                }
            }
            table.push(cells);
        }
        Some(table)
    }

    /// The line under the table saying what the checks compare with.
    pub fn cavitation_legend(&self, geometry: &ScrewGeometry) -> String {
        let twin = self.shafts >= 2;
        format!(
            "{} AE/A0 {:.2} against Keller's minimum (K = {}, {}); \
             thrust loading τc against Burrill's 5 % back-cavitation line at 0.7R; mean blade loading \
             against about {:.0} psi ({:.1} kPa, common small-craft practice){}",
            if twin { "each screw's" } else { "screw" },
            geometry.area_ratio,
            keller_constant(self.shafts),
            if twin { "twin screw" } else { "single screw" },
            SMALL_CRAFT_BLADE_LOADING_LIMIT / PASCALS_PER_PSI,
            SMALL_CRAFT_BLADE_LOADING_LIMIT / 1000.0,
            if twin {
                "; each screw carries half the thrust, checked at the shallower shaft's immersion"
            } else {
                ""
            }
        )
    }

    /// "Shaft: …" lines for the report.
    pub fn shaft_lines(&self, d: &Display) -> Vec<String> {
        let mut lines = Vec::new();
        match &self.shaft {
            Ok(s) => {
                let existing = match s.existing_diameter {
                    Some(e) if e < s.min_diameter => format!(
                        "; the existing {} shaft is SMALLER",
                        d.quantity(e, Kind::ScrewLength)
                    ),
                    Some(e) => format!(
                        "; the existing {} shaft is enough",
                        d.quantity(e, Kind::ScrewLength)
                    ),
                    None => "; the boat file gives no existing shaft diameter".into(),
                };
                let (heading, engine) = if self.shafts >= 2 {
                    ("Shaft (each shaft)", "each engine's torque")
                } else {
                    ("Shaft", "engine torque")
                };
                lines.push(format!(
                    "{heading}: {engine} {} at {:.0} rpm, {} on the shaft through the gear; smallest solid shaft {} for {} with a safety factor of {:.1} (plain torsion){existing}",
                    d.quantity(s.engine_torque, Kind::Torque),
                    s.engine_torque_rpm,
                    d.quantity(s.shaft_torque, Kind::Torque),
                    d.quantity(s.min_diameter, Kind::ScrewLength),
                    s.material.name,
                    s.safety_factor
                ));
                lines.push(format!(
                    "  material value: torsional yield {:.0} MPa ({})",
                    s.material.shear_yield / 1e6,
                    s.material.source
                ));
            }
            Err(e) => lines.push(format!("Shaft: not checked — {e}")),
        }
        if let Some(note) = &self.shaft_note {
            lines.push(format!("  note: {note}"));
        }
        lines
    }
}

/// Tip speed unit: m/s, or ft/s in imperial.
fn tip_speed_unit(system: UnitSystem) -> &'static str {
    match system {
        UnitSystem::Metric => "m/s",
        UnitSystem::Imperial => "ft/s",
    }
}

/// Tip speed (m/s) in the display unit.
fn tip_speed_shown(speed: f64, system: UnitSystem) -> f64 {
    match system {
        UnitSystem::Metric => speed,
        UnitSystem::Imperial => speed / (12.0 * INCH_M),
    }
}

/// One check point in JSON (SI or the unit in the field's name).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CavitationJson {
    /// "target_speed" or "top_speed".
    pub at: CheckPoint,
    /// Boat speed, kn.
    pub speed_kn: f64,
    /// Engine speed, rpm.
    pub engine_rpm: f64,
    /// The screw's AE/A0.
    pub area_ratio: f64,
    /// Keller's minimum AE/A0.
    pub keller_min_area_ratio: Option<f64>,
    /// Whether AE/A0 ≥ Keller's minimum.
    pub keller_passed: Option<bool>,
    /// Cavitation number at 0.7R.
    pub sigma_07r: Option<f64>,
    /// Thrust loading coefficient τc.
    pub thrust_loading: Option<f64>,
    /// Burrill's 5 % τc at this σ.
    pub burrill_limit: Option<f64>,
    /// Whether τc is on Burrill's safe side.
    pub burrill_passed: Option<bool>,
    /// AE/A0 that would meet Burrill's line.
    pub burrill_min_area_ratio: Option<f64>,
    /// Mean blade loading, psi.
    pub blade_loading_psi: Option<f64>,
    /// Mean blade loading, kPa.
    pub blade_loading_kpa: Option<f64>,
    /// The limit it is compared with, psi.
    pub blade_loading_limit_psi: f64,
    /// Whether the loading is under the limit.
    pub blade_loading_passed: Option<bool>,
    /// Tip speed, m/s.
    pub tip_speed_mps: Option<f64>,
    /// Whether every check passed.
    pub all_passed: Option<bool>,
    /// Why the checks could not be made.
    pub error: Option<String>,
}

impl CavitationJson {
    /// The JSON of one check point of a screw with `geometry`.
    pub fn of(row: &CavitationRow, geometry: &ScrewGeometry) -> Self {
        let r = row.outcome.as_ref().ok();
        Self {
            at: row.at,
            speed_kn: row.speed / KNOT_MPS,
            engine_rpm: row.engine_rpm,
            area_ratio: geometry.area_ratio,
            keller_min_area_ratio: r.map(|r| r.keller_area_ratio.limit),
            keller_passed: r.map(|r| r.keller_area_ratio.passed),
            sigma_07r: r.map(|r| r.cavitation_number),
            thrust_loading: r.map(|r| r.thrust_loading.value),
            burrill_limit: r.map(|r| r.thrust_loading.limit),
            burrill_passed: r.map(|r| r.thrust_loading.passed),
            burrill_min_area_ratio: r
                .and_then(|r| r.burrill_minimum_area_ratio)
                .filter(|v| v.is_finite()),
            blade_loading_psi: r.map(|r| r.blade_loading.value / PASCALS_PER_PSI),
            blade_loading_kpa: r.map(|r| r.blade_loading.value / 1000.0),
            blade_loading_limit_psi: SMALL_CRAFT_BLADE_LOADING_LIMIT / PASCALS_PER_PSI,
            blade_loading_passed: r.map(|r| r.blade_loading.passed),
            tip_speed_mps: r.map(|r| r.tip_speed),
            all_passed: r.map(CavitationReport::all_passed),
            error: row.outcome.as_ref().err().cloned(),
        }
    }
}

/// The shaft check in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ShaftJson {
    /// Largest full-load engine torque, N·m.
    pub engine_torque_nm: f64,
    /// Its rpm.
    pub engine_torque_rpm: f64,
    /// Torque on the shaft, N·m.
    pub shaft_torque_nm: f64,
    /// Material name.
    pub material: String,
    /// Torsional yield used, MPa.
    pub shear_yield_mpa: f64,
    /// Source of the material value.
    pub material_source: &'static str,
    /// Safety factor.
    pub safety_factor: f64,
    /// Smallest solid shaft, m.
    pub min_diameter_m: f64,
    /// Existing shaft, m.
    pub existing_diameter_m: Option<f64>,
    /// Whether the existing shaft is at least the minimum (null when not given).
    pub existing_is_enough: Option<bool>,
    /// A note on an assumed material.
    pub note: Option<String>,
}

impl DesignChecks {
    /// The shaft check in JSON, if it was made.
    pub fn shaft_json(&self) -> Option<ShaftJson> {
        let s = self.shaft.as_ref().ok()?;
        Some(ShaftJson {
            engine_torque_nm: s.engine_torque,
            engine_torque_rpm: s.engine_torque_rpm,
            shaft_torque_nm: s.shaft_torque,
            material: s.material.name.clone(),
            shear_yield_mpa: s.material.shear_yield / 1e6,
            material_source: s.material.source,
            safety_factor: s.safety_factor,
            min_diameter_m: s.min_diameter,
            existing_diameter_m: s.existing_diameter,
            existing_is_enough: s.existing_diameter.map(|e| e >= s.min_diameter),
            note: self.shaft_note.clone(),
        })
    }

    /// The cavitation rows of one screw in JSON (empty when skipped).
    pub fn cavitation_json(&self, label: &str) -> Vec<CavitationJson> {
        self.cavitation
            .as_ref()
            .ok()
            .and_then(|vs| vs.iter().find(|v| v.label == label))
            .map(|v| {
                v.rows
                    .iter()
                    .map(|r| CavitationJson::of(r, &v.geometry))
                    .collect()
            })
            .unwrap_or_default()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn material_names_from_files_find_the_built_in_materials() {
        assert_eq!(
            shaft_material("stainless-316").unwrap().name,
            "stainless 316"
        );
        assert_eq!(
            shaft_material("Bronze").unwrap().name,
            "bronze (naval-brass shafting)"
        );
        assert_eq!(
            shaft_material("nickel_copper alloy K-500").unwrap().name,
            "nickel-copper alloy K-500"
        );
        // "stainless" alone could be 304 or 316: refused, naming the choices.
        let err = shaft_material("stainless").unwrap_err();
        assert!(err.contains("stainless 304") && err.contains("installation.shaft_material"));
        assert!(shaft_material("unobtainium").is_err());
        assert!(shaft_material("").is_err());
    }

    #[test]
    fn calibration_line_names_factor_date_and_note() {
        let c = AppliedCalibration {
            resistance_factor: 1.1144,
            wake_fraction: None,
            froude_factor: None,
            trial_date: Some("2024-05-18".into()),
            note: Some("fitted".into()),
        };
        assert_eq!(
            c.line(),
            "calibration applied: resistance ×1.114 (sea trial 2024-05-18; fitted) on calm, clean-hull resistance, margins on top"
        );
        assert!(!c.fitted_with_margins());
        // A note written by `trial --save` before the fit worked on calm water is flagged.
        let old = AppliedCalibration {
            note: Some("resistance factor fitted on 2025-01-02 by `tidewright trial --save` to 3 rpm groups".into()),
            ..c.clone()
        };
        assert!(old.fitted_with_margins());
        assert!(
            old.line()
                .contains("run `tidewright trial BOAT --save` again")
        );
    }
}
