//! JSON output: pretty-printed, one document per command, never a NaN.

use super::baseline::{BaselineJson, HeadlineJson, baseline_json, headline_json};
use crate::study::baseline::Headline;
use serde::Serialize;

use super::checks::{AppliedCalibration, CavitationJson, DesignChecks, ShaftJson};
use super::finite_or_none;
use super::model::{BoatReport, MethodSummary, unreliable_label};
use super::{CAUTION, KNOT_MPS, LITRE_M3, NAUTICAL_MILE_M};
use crate::propulsion::hull::ResistanceModel;
use crate::propulsion::solver::{CruisePoint, MethodSpread, Verdict};

/// Serialises `value` as pretty JSON with a trailing newline.
///
/// serde_json would write NaN and infinities as `null`, so every report type passes its numbers
/// through [`finite`] when it is built and moves a point with a non-finite value to its list of
/// unsolved points with the reason.
pub fn to_string<T: Serialize>(value: &T) -> anyhow::Result<String> {
    let mut text = serde_json::to_string_pretty(value)?;
    text.push('\n');
    Ok(text)
}

/// The JSON document of the boat report (SI or named units, whatever the display system).
impl BoatReport {
    /// The JSON document (SI or named units, whatever the display system).
    pub fn to_json(&self) -> BoatJson {
        BoatJson {
            boat: self.boat.clone(),
            units: "SI, or the unit named at the end of the field",
            engine: EngineJson {
                name: self.engine.name.clone(),
                rated_rpm: self.engine.rated_rpm,
                rated_kw: self.engine.rated_power / 1e3,
                idle_rpm: self.engine.idle_rpm,
            },
            installation: InstallationJson {
                shafts: self.shafts,
            },
            target_speed_kn: self.trip.target_speed / KNOT_MPS,
            variants: self
                .variants
                .iter()
                .map(|v| {
                    let mut points = Vec::new();
                    let mut unsolved = Vec::new();
                    for row in &v.rows {
                        match &row.outcome {
                            Ok(c) => points.push(PointJson::of(c, &self.resistance)),
                            Err(reason) => unsolved.push(UnsolvedJson {
                                engine_rpm: row.engine_rpm,
                                reason: reason.clone(),
                            }),
                        }
                    }
                    VariantJson {
                        label: v.label.clone(),
                        blades: v.geometry.blades,
                        diameter_m: v.geometry.diameter,
                        pitch_m: v.geometry.pitch,
                        area_ratio: v.geometry.area_ratio,
                        points,
                        unsolved,
                        matching: v.matched.as_ref().ok().map(|m| MatchJson {
                            meeting_rpm: m.meeting_rpm,
                            top_speed_kn: m.top_speed / KNOT_MPS,
                            absorbed_pct_at_rated: m.absorbed_fraction_at_rated * 100.0,
                            verdict: m.verdict,
                            rpm_margin: m.rpm_margin,
                            rpm_margin_is_lower_bound: m.margin_is_lower_bound,
                            top_speed_froude: m.top_validity.froude,
                            top_speed_in_method_range: m.top_speed_in_method_range,
                            top_speed_unreliable_because: m.top_validity.label(),
                        }),
                        match_error: v.matched.as_ref().err().cloned(),
                        cruise: v
                            .cruise
                            .as_ref()
                            .ok()
                            .map(|c| PointJson::of(c, &self.resistance)),
                        cruise_error: v.cruise.as_ref().err().cloned(),
                        duty_note: v.duty.clone(),
                        method_spread: v.method_spread.as_ref().map(MethodSpreadJson::from),
                        cavitation: self
                            .checks
                            .as_ref()
                            .map(|c| c.cavitation_json(&v.label))
                            .unwrap_or_default(),
                        delta: self
                            .baseline
                            .as_ref()
                            .map(|b| headline_json(&Headline::of(v).change_from(&b.figures))),
                    }
                })
                .collect(),
            baseline: self.baseline.as_ref().map(baseline_json),
            calibration: self.calibration.clone(),
            methods: self.methods.clone(),
            cavitation_skipped: self
                .checks
                .as_ref()
                .and_then(|c| c.cavitation.as_ref().err().cloned()),
            shaft: self.checks.as_ref().and_then(DesignChecks::shaft_json),
            shaft_error: self
                .checks
                .as_ref()
                .and_then(|c| c.shaft.as_ref().err().cloned()),
            warnings: self.warnings.clone(),
            caution: CAUTION,
        }
    }
}

/// The report as JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BoatJson {
    /// The boat's name.
    pub boat: String,
    /// How the values are expressed.
    pub units: &'static str,
    /// The engine sheet.
    pub engine: EngineJson,
    /// The installation: how many shafts (each with its own engine of this sheet).
    pub installation: InstallationJson,
    /// The trip's target speed, kn.
    pub target_speed_kn: f64,
    /// The variants.
    pub variants: Vec<VariantJson>,
    /// The boat as found (`[as_found]`) with its figures, or null.
    pub baseline: Option<BaselineJson>,
    /// The sea-trial correction applied, or null.
    pub calibration: Option<AppliedCalibration>,
    /// The resistance and interaction methods used and why.
    pub methods: MethodSummary,
    /// Why the cavitation check was skipped, or null.
    pub cavitation_skipped: Option<String>,
    /// The shaft check, or null.
    pub shaft: Option<ShaftJson>,
    /// Why the shaft was not checked, or null.
    pub shaft_error: Option<String>,
    /// Warnings.
    pub warnings: Vec<String>,
    /// The caution.
    pub caution: &'static str,
}

/// The installation in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct InstallationJson {
    /// Shafts fitted, 1 or 2 (a twin has two engines of the sheet, two handed screws).
    pub shafts: u32,
}

/// The engine sheet in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EngineJson {
    /// Name.
    pub name: String,
    /// Rated speed, rpm.
    pub rated_rpm: f64,
    /// Rated power, kW.
    pub rated_kw: f64,
    /// Idle speed, rpm.
    pub idle_rpm: f64,
}

/// One variant in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct VariantJson {
    /// Label.
    pub label: String,
    /// Blade count.
    pub blades: u32,
    /// Diameter, m.
    pub diameter_m: f64,
    /// Pitch, m.
    pub pitch_m: f64,
    /// Expanded area ratio.
    pub area_ratio: f64,
    /// Solved operating points at the rpm steps.
    pub points: Vec<PointJson>,
    /// Rpm steps that could not be solved, with the reason.
    pub unsolved: Vec<UnsolvedJson>,
    /// The match, if found.
    #[serde(rename = "match")]
    pub matching: Option<MatchJson>,
    /// Why the match was not found, if not.
    pub match_error: Option<String>,
    /// The cruise point at the target speed, if solved.
    pub cruise: Option<PointJson>,
    /// Why the cruise point was not solved, if not.
    pub cruise_error: Option<String>,
    /// The engine's duty rating beside the load at the target speed.
    pub duty_note: Option<String>,
    /// Both resistance methods' top speed and target-speed resistance, when both run.
    pub method_spread: Option<MethodSpreadJson>,
    /// Cavitation and blade loading at the target speed and at top speed.
    pub cavitation: Vec<CavitationJson>,
    /// The change from the baseline (this variant − as found), or null without one.
    pub delta: Option<HeadlineJson>,
}

/// One operating point in JSON. Unsuffixed figures are the boat's (every driven screw or
/// running engine together); `_per_screw` and `_per_engine` are each one's.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PointJson {
    /// Engine speed, rpm (each running engine turns at it).
    pub engine_rpm: f64,
    /// Screw speed, rpm (each driven screw turns at it).
    pub prop_rpm: f64,
    /// Boat speed, kn.
    pub speed_kn: f64,
    /// Resistance of the boat, N.
    pub resistance_n: f64,
    /// Thrust of every driven screw together, N.
    pub thrust_n: f64,
    /// Thrust of each driven screw, N.
    pub thrust_n_per_screw: f64,
    /// Advance ratio J (each screw).
    pub j: f64,
    /// KT (each screw).
    pub kt: f64,
    /// KQ (each screw).
    pub kq: f64,
    /// Open-water efficiency η0 (each screw).
    pub eta0: f64,
    /// Delivered power of every driven screw together, kW.
    pub delivered_kw: f64,
    /// Delivered power at each driven screw, kW.
    pub delivered_kw_per_screw: f64,
    /// Brake power of the boat (every running engine together), kW.
    pub brake_kw: f64,
    /// Brake power of each running engine, kW.
    pub brake_kw_per_engine: f64,
    /// Each running engine's load, % of its full-load power at this rpm.
    pub load_pct: f64,
    /// Fuel rate of the boat (every running engine), L/h.
    pub fuel_lph: f64,
    /// Fuel rate of each running engine, L/h.
    pub fuel_lph_per_engine: f64,
    /// Shafts driven by a running engine (1 or 2).
    pub driven_shafts: u32,
    /// Fuel of the boat per nautical mile, L/nm.
    pub fuel_l_per_nm: f64,
    /// Range of the boat with usable fuel less reserve, nm.
    pub range_nm: f64,
    /// Whether the point lies past the full-load curve.
    pub beyond_full_load: bool,
    /// Length Froude number V/√(g·LWL).
    pub froude: f64,
    /// Whether the resistance method is valid at this speed (false: unreliable).
    pub in_method_range: bool,
    /// Why the point is unreliable (the report row's words), or null.
    pub unreliable_because: Option<String>,
}

impl PointJson {
    /// The JSON of `c`, solved on `resistance` (which says why a point is unreliable).
    pub fn of(c: &CruisePoint, resistance: &ResistanceModel) -> Self {
        let p = &c.point;
        let screws = f64::from(p.driven_shafts.max(1));
        Self {
            engine_rpm: p.engine_rpm,
            prop_rpm: p.screw_rps * 60.0,
            speed_kn: p.speed / KNOT_MPS,
            resistance_n: p.resistance,
            thrust_n: p.thrust * screws,
            thrust_n_per_screw: p.thrust,
            j: p.advance_ratio,
            kt: p.thrust_coefficient,
            kq: p.torque_coefficient,
            eta0: p.open_water_efficiency,
            delivered_kw: p.delivered_power * screws / 1e3,
            delivered_kw_per_screw: p.delivered_power / 1e3,
            brake_kw: p.brake_power / 1e3,
            brake_kw_per_engine: p.brake_power_per_engine / 1e3,
            load_pct: p.load_fraction * 100.0,
            fuel_lph: p.fuel_volume_flow / LITRE_M3 * 3600.0,
            fuel_lph_per_engine: p.fuel_volume_flow_per_engine / LITRE_M3 * 3600.0,
            driven_shafts: p.driven_shafts,
            fuel_l_per_nm: c.fuel_per_distance / LITRE_M3 * NAUTICAL_MILE_M,
            range_nm: c.range / NAUTICAL_MILE_M,
            beyond_full_load: c.beyond_full_load,
            froude: p.froude,
            in_method_range: p.in_method_range,
            unreliable_because: unreliable_label(resistance, p),
        }
    }
}

/// Both resistance methods side by side in JSON, when both run.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MethodSpreadJson {
    /// The method used for every figure.
    pub method: &'static str,
    /// The alternative computed beside it.
    pub alternative: &'static str,
    /// Resistance of the boat at the target speed by the chosen method, N.
    pub resistance_at_target_n: Option<f64>,
    /// The same by the alternative, N.
    pub alternative_resistance_at_target_n: Option<f64>,
    /// Top speed by the chosen method, kn.
    pub top_speed_kn: Option<f64>,
    /// Top speed by the alternative, kn.
    pub alternative_top_speed_kn: Option<f64>,
}

impl From<&MethodSpread> for MethodSpreadJson {
    fn from(m: &MethodSpread) -> Self {
        let knots = |v: Option<f64>| finite_or_none(v.map(|v| v / KNOT_MPS));
        Self {
            method: m.method,
            alternative: m.alternative,
            resistance_at_target_n: finite_or_none(m.resistance_at_target),
            alternative_resistance_at_target_n: finite_or_none(m.alternative_resistance_at_target),
            top_speed_kn: knots(m.top_speed),
            alternative_top_speed_kn: knots(m.alternative_top_speed),
        }
    }
}

/// An rpm step that could not be solved.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct UnsolvedJson {
    /// Engine speed asked for, rpm.
    pub engine_rpm: f64,
    /// Why.
    pub reason: String,
}

/// The match in JSON.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MatchJson {
    /// Engine rpm at wide-open throttle.
    pub meeting_rpm: f64,
    /// Top speed, kn.
    pub top_speed_kn: f64,
    /// Power absorbed at rated rpm, % of rated power.
    pub absorbed_pct_at_rated: f64,
    /// over / matched / under.
    pub verdict: Verdict,
    /// The margin at full throttle, rpm: the rpm at which the screw absorbs full-load power
    /// minus rated rpm (negative: shortfall, over-propped; positive: free-running headroom).
    pub rpm_margin: f64,
    /// Whether `rpm_margin` is only a lower bound.
    pub rpm_margin_is_lower_bound: bool,
    /// Length Froude number at the top speed.
    pub top_speed_froude: f64,
    /// Whether the top speed is inside the resistance method's range (false: unreliable).
    pub top_speed_in_method_range: bool,
    /// Why the top speed is unreliable, or null.
    pub top_speed_unreliable_because: Option<String>,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn output_ends_with_newline() {
        assert_eq!(
            to_string(&serde_json::json!({"a": 1})).unwrap(),
            "{\n  \"a\": 1\n}\n"
        );
    }
}
