//! What-if conditions (displacement, fouling, sea state) side by side, and the uncertainty band
//! of the propeller curve over displacement and wake.

use super::Vessel;
use super::cruise::cruise_at_speed;
use super::matching::{Verdict, match_engine, point_at_engine_rpm};
use super::pitch::{ConditionSummary, DesignError, PitchOptions, PitchRecommendation, SearchStop};
use super::pitch::{matching_pitch, recommend_pitch_for_condition};
use crate::propulsion::hull::{HullError, Interaction, InteractionMethod};
use crate::propulsion::{Subject, Warning};
use thiserror::Error;

/// Why a condition could not be applied to the boat.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ConditionError {
    /// A condition value is outside its meaningful range.
    #[error("condition '{label}': {field} = {value} is not valid: {expected}")]
    BadValue {
        /// The condition's label.
        label: String,
        /// The field.
        field: &'static str,
        /// The value given.
        value: f64,
        /// What was expected.
        expected: &'static str,
    },
    /// The hull with the new displacement could not be resolved.
    #[error("condition '{label}': hull: {source}")]
    Hull {
        /// The condition's label.
        label: String,
        /// The hull error.
        source: HullError,
    },
    /// The variant index is past the boat's list of screws.
    #[error("screw variant {index} does not exist: the boat has {count} variants")]
    NoSuchVariant {
        /// The index asked for.
        index: usize,
        /// How many variants the boat has.
        count: usize,
    },
    /// A pitch recommendation for the condition failed.
    #[error("{0}")]
    Design(#[from] DesignError),
}

/// A what-if condition: any field left `None` keeps the boat's own value.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Condition {
    /// The condition's name, e.g. "light", "full load", "fouled".
    pub label: String,
    /// Displacement volume, m³.
    pub displacement_volume: Option<f64>,
    /// Fouling as added friction, fraction of friction.
    pub fouling: Option<f64>,
    /// Service (sea-state) margin on total resistance, fraction.
    pub service_margin: Option<f64>,
    /// One engine out on a twin-screw boat: one engine drives its screw and the other screw
    /// trails as given; `None` runs every engine.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub engine_out: Option<TrailingScrew>,
}

/// How the idle screw of a twin with one engine out turns.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum TrailingScrew {
    /// The gear in neutral: the screw turns freely in the flow.
    Windmilling,
    /// The shaft locked (gear in gear or a shaft brake): the screw does not turn.
    Locked,
}

impl TrailingScrew {
    /// Short description for labels, e.g. "windmilling".
    pub fn describe(self) -> &'static str {
        match self {
            TrailingScrew::Windmilling => "windmilling",
            TrailingScrew::Locked => "locked",
        }
    }
}

/// The warning on an outcome with one engine out: what the case leaves out.
///
/// The idle screw's added drag is not included: no published drag coefficient of a trailing
/// (locked or windmilling) screw on its disc or blade area could be cited here — MacKenzie &
/// Forrester, "Sailboat propeller drag", Ocean Engineering 35 (2008), measured full-scale
/// screws locked and freewheeling (locked drag up to about twice the freewheeling drag), but
/// their coefficients were not at hand. The top speed and the load on the running engine are
/// therefore optimistic. The yaw moment of the one-sided thrust and the rudder drag that holds
/// the course are not modelled either.
pub const ENGINE_OUT_NOT_INCLUDED: &str = "one engine out: the trailing screw's drag is not \
    included (no citable estimate), so top speed is optimistic and the running engine's load \
    understated; the one-sided thrust and the rudder drag holding the course are not modelled";

impl Condition {
    /// A condition with only the displacement volume (m³) changed.
    pub fn displacement(label: impl Into<String>, displacement_volume: f64) -> Self {
        Self {
            label: label.into(),
            displacement_volume: Some(displacement_volume),
            fouling: None,
            service_margin: None,
            engine_out: None,
        }
    }
    /// A condition with only the fouling (fraction of friction) changed.
    pub fn fouled(label: impl Into<String>, fouling: f64) -> Self {
        Self {
            label: label.into(),
            displacement_volume: None,
            fouling: Some(fouling),
            service_margin: None,
            engine_out: None,
        }
    }
    /// A condition with only the sea-state margin (fraction of total resistance) changed.
    pub fn sea_state(label: impl Into<String>, service_margin: f64) -> Self {
        Self {
            label: label.into(),
            displacement_volume: None,
            fouling: None,
            service_margin: Some(service_margin),
            engine_out: None,
        }
    }
    /// One engine out on a twin-screw boat, the idle screw `trailing`.
    pub fn one_engine_out(label: impl Into<String>, trailing: TrailingScrew) -> Self {
        Self {
            label: label.into(),
            displacement_volume: None,
            fouling: None,
            service_margin: None,
            engine_out: Some(trailing),
        }
    }
    /// Light, half-load and full-load conditions from their displacement volumes (m³).
    pub fn load_cases(light: f64, half: f64, full: f64) -> [Condition; 3] {
        [
            Condition::displacement("light", light),
            Condition::displacement("half load", half),
            Condition::displacement("full load", full),
        ]
    }

    /// The vessel under this condition.
    ///
    /// A new displacement sinks the hull in parallel: ΔT = Δ∇/(Cwp·L·B) (wall-sided waterline);
    /// a wetted surface the user gave is scaled by (∇'/∇)^(2/3); estimated values are
    /// re-estimated by `HullInput::resolve` for the new draft.
    pub fn apply(&self, vessel: &Vessel) -> Result<Vessel, ConditionError> {
        let bad = |field, value, expected| ConditionError::BadValue {
            label: self.label.clone(),
            field,
            value,
            expected,
        };
        let mut out = vessel.clone();
        if let Some(volume) = self.displacement_volume {
            if !(volume.is_finite() && volume > 0.0) {
                return Err(bad(
                    "displacement volume",
                    volume,
                    "a positive volume in m³",
                ));
            }
            let form = &vessel.resistance.hull;
            let mut input = form.input.clone();
            let old = input.displacement_volume;
            let waterplane =
                form.waterplane_coefficient.value * input.length_waterline * input.beam_waterline;
            if !(waterplane.is_finite() && waterplane > 0.0) {
                return Err(bad(
                    "waterplane area",
                    waterplane,
                    "a positive area from Cwp·L·B",
                ));
            }
            let sinkage = (volume - old) / waterplane;
            input.draft_aft += sinkage;
            input.draft_forward += sinkage;
            if input.draft_aft <= 0.0 || input.draft_forward <= 0.0 {
                return Err(bad(
                    "displacement volume",
                    volume,
                    "a volume that leaves the hull a positive draft",
                ));
            }
            input.displacement_volume = volume;
            if let Some(s) = input.wetted_surface {
                input.wetted_surface = Some(s * (volume / old).powf(2.0 / 3.0));
            }
            let hull = input.resolve().map_err(|source| ConditionError::Hull {
                label: self.label.clone(),
                source,
            })?;
            out.resistance = out.resistance.with_hull(hull);
        }
        if let Some(fouling) = self.fouling {
            if !(fouling.is_finite() && (0.0..=3.0).contains(&fouling)) {
                return Err(bad(
                    "fouling",
                    fouling,
                    "a fraction of friction from 0 to 3",
                ));
            }
            out.resistance.margins.fouling = fouling;
        }
        if let Some(service) = self.service_margin {
            if !(service.is_finite() && (0.0..=2.0).contains(&service)) {
                return Err(bad(
                    "sea-state margin",
                    service,
                    "a fraction of resistance from 0 to 2",
                ));
            }
            out.resistance.margins.service = service;
        }
        if self.engine_out.is_some() {
            if !vessel.installation.is_twin_screw() {
                return Err(bad(
                    "shafts",
                    f64::from(vessel.installation.shafts),
                    "a twin-screw boat (2 shafts) for one engine out",
                ));
            }
            // The hull, its interaction estimate and Keller's constant stay those of the
            // twin-screw stern; only the running screw gives thrust.
            out.installation.idle_shafts = 1;
        }
        Ok(out)
    }
}

/// The same boat and screw under one condition.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ConditionOutcome {
    /// The condition.
    pub condition: ConditionSummary,
    /// Match verdict.
    pub verdict: Option<Verdict>,
    /// Full-throttle (meeting) engine rpm, rpm.
    pub full_throttle_rpm: Option<f64>,
    /// Free-running rpm margin where the full-load curve meets this case's propeller curve,
    /// rpm (negative: short of rated; a governed engine still shows rated rpm above).
    pub rpm_margin: Option<f64>,
    /// Brake power each engine gives at full throttle in this case, W.
    pub full_throttle_power: Option<f64>,
    /// Top speed, m/s.
    pub top_speed: Option<f64>,
    /// Whether the top speed is inside the resistance method's range (false: unreliable).
    pub top_speed_in_method_range: Option<bool>,
    /// Brake power at rated rpm as a fraction of rated power.
    pub absorbed_fraction_at_rated: Option<f64>,
    /// Engine rpm at the target speed, rpm.
    pub cruise_rpm: Option<f64>,
    /// Brake power of the boat (every running engine) at the target speed, W.
    pub cruise_power: Option<f64>,
    /// Load of each running engine at the target speed, fraction of its full-load power.
    pub cruise_load_fraction: Option<f64>,
    /// Engines running (driven shafts) in this condition.
    pub engines_running: u32,
    /// Fuel volume flow at the target speed, m³/s.
    pub cruise_fuel_volume_flow: Option<f64>,
    /// Whether the target speed is beyond the full-load curve in this condition.
    pub cruise_beyond_full_load: Option<bool>,
    /// Why a figure is missing, if one is.
    pub problem: Option<String>,
    /// What the outcome leaves out, e.g. the trailing screw's drag with one engine out.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub warnings: Vec<Warning>,
}

fn check_variant(vessel: &Vessel, index: usize) -> Result<(), ConditionError> {
    if index < vessel.variants.len() {
        Ok(())
    } else {
        Err(ConditionError::NoSuchVariant {
            index,
            count: vessel.variants.len(),
        })
    }
}

/// Solves variant `index` under the boat's own condition and each of `conditions`, in order
/// (the first outcome is the boat as given, labelled "as given").
pub fn compare_conditions(
    vessel: &Vessel,
    index: usize,
    conditions: &[Condition],
) -> Result<Vec<ConditionOutcome>, ConditionError> {
    check_variant(vessel, index)?;
    let mut outcomes = vec![outcome(vessel, index, "as given")];
    for condition in conditions {
        let changed = condition.apply(vessel)?;
        outcomes.push(outcome(&changed, index, &condition.label));
    }
    Ok(outcomes)
}

fn outcome(vessel: &Vessel, index: usize, label: &str) -> ConditionOutcome {
    let system = vessel.system(index);
    let mut problems = Vec::new();
    let mut out = ConditionOutcome {
        condition: ConditionSummary::of(vessel, label),
        verdict: None,
        full_throttle_rpm: None,
        rpm_margin: None,
        full_throttle_power: None,
        top_speed: None,
        top_speed_in_method_range: None,
        absorbed_fraction_at_rated: None,
        cruise_rpm: None,
        cruise_power: None,
        cruise_load_fraction: None,
        engines_running: vessel.installation.driven_shafts(),
        cruise_fuel_volume_flow: None,
        cruise_beyond_full_load: None,
        problem: None,
        warnings: Vec::new(),
    };
    if vessel.installation.idle_shafts > 0 {
        out.warnings.push(Warning::about(
            Subject::Engine,
            "one engine out",
            ENGINE_OUT_NOT_INCLUDED,
        ));
    }
    match match_engine(&system, &vessel.match_criteria) {
        Ok(m) => {
            out.verdict = Some(m.verdict);
            out.full_throttle_rpm = Some(m.meeting_rpm);
            out.rpm_margin = Some(m.rpm_margin);
            out.full_throttle_power = Some(m.top_point.brake_power_per_engine);
            out.top_speed = Some(m.top_speed);
            out.top_speed_in_method_range = Some(m.top_speed_in_method_range);
            out.absorbed_fraction_at_rated = Some(m.absorbed_fraction_at_rated);
        }
        Err(e) => problems.push(format!("match: {e}")),
    }
    match cruise_at_speed(&system, &vessel.trip, vessel.trip.target_speed) {
        Ok(c) => {
            out.cruise_rpm = Some(c.point.engine_rpm);
            out.cruise_power = Some(c.point.brake_power);
            out.cruise_load_fraction = Some(c.point.load_fraction);
            out.cruise_fuel_volume_flow = Some(c.point.fuel_volume_flow);
            out.cruise_beyond_full_load = Some(c.beyond_full_load);
        }
        Err(e) => problems.push(format!("cruise: {e}")),
    }
    if !problems.is_empty() {
        out.problem = Some(problems.join("; "));
    }
    out
}

/// The pitch recommendation of variant `index` made for `condition`.
pub fn recommend_pitch_under(
    vessel: &Vessel,
    index: usize,
    condition: &Condition,
    options: &PitchOptions,
) -> Result<PitchRecommendation, ConditionError> {
    let changed = condition.apply(vessel)?;
    let summary = ConditionSummary::of(&changed, condition.label.clone());
    Ok(recommend_pitch_for_condition(
        &changed, index, options, summary,
    )?)
}

/// The ranges of the uncertainty band.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct UncertaintyRanges {
    /// Displacement spread either side of the given value, fraction (0.10 = ±10 %).
    pub displacement_fraction: f64,
    /// Wake fraction shift either side of the estimate (0.05 = ±0.05).
    pub wake_shift: f64,
    /// Number of engine rpm points from idle to rated (≥ 2).
    pub rpm_points: usize,
}

impl Default for UncertaintyRanges {
    fn default() -> Self {
        Self {
            displacement_fraction: 0.10,
            wake_shift: 0.05,
            rpm_points: 12,
        }
    }
}

/// The band of the propeller curve at one engine rpm.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct BandPoint {
    /// Engine speed, rpm.
    pub engine_rpm: f64,
    /// Brake power of each engine of the boat as given, W (against the engine's envelope).
    pub nominal_power: Option<f64>,
    /// Smallest brake power of each engine over the band's cases, W.
    pub low_power: Option<f64>,
    /// Largest brake power of each engine over the band's cases, W.
    pub high_power: Option<f64>,
    /// Boat speed as given, m/s.
    pub nominal_speed: Option<f64>,
}

/// The propeller curve's band and the recommended pitch's range over it.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct UncertaintyBand {
    /// The ranges used.
    pub ranges: UncertaintyRanges,
    /// Speed at which the wake is frozen before shifting it for the pitch's cases, m/s (the
    /// boat's top speed; the curve's cases shift it at each rpm's own speed).
    pub wake_reference_speed: f64,
    /// The band at each rpm from idle to rated.
    pub points: Vec<BandPoint>,
    /// Recommended pitch of the boat as given, m.
    pub pitch_nominal: Option<f64>,
    /// Smallest recommended pitch over the band's cases, m.
    pub pitch_low: Option<f64>,
    /// Largest recommended pitch over the band's cases, m.
    pub pitch_high: Option<f64>,
    /// Number of band cases whose pitch search did not converge.
    pub unsolved_cases: usize,
    /// The alternative resistance method whose cases the band includes, if any.
    pub alternative_method: Option<&'static str>,
    /// Warnings, e.g. a shifted wake clamped at zero.
    pub warnings: Vec<Warning>,
}

/// The band of variant `index`'s propeller curve over displacement × (1 ± f) and wake ± s,
/// and, when the method choice computes an alternative resistance method, that method at the
/// three displacements, with the pitch recommendation's range over the same cases.
///
/// A wake estimated by a speed-dependent method is frozen at the target speed before it is
/// shifted (`InteractionMethod::User` with the estimate's t and ηR); the unshifted cases keep
/// the boat's own method, so the nominal curve is inside the band.
pub fn uncertainty_band(
    vessel: &Vessel,
    index: usize,
    ranges: &UncertaintyRanges,
    pitch_options: &PitchOptions,
) -> Result<UncertaintyBand, ConditionError> {
    check_variant(vessel, index)?;
    let bad = |field, value, expected| ConditionError::BadValue {
        label: "uncertainty band".into(),
        field,
        value,
        expected,
    };
    if !(ranges.displacement_fraction.is_finite()
        && (0.0..0.9).contains(&ranges.displacement_fraction))
    {
        return Err(bad(
            "displacement spread",
            ranges.displacement_fraction,
            "a fraction from 0 to 0.9",
        ));
    }
    if !(ranges.wake_shift.is_finite() && (0.0..0.5).contains(&ranges.wake_shift)) {
        return Err(bad(
            "wake shift",
            ranges.wake_shift,
            "a wake fraction shift from 0 to 0.5",
        ));
    }
    if ranges.rpm_points < 2 {
        return Err(bad("rpm points", ranges.rpm_points as f64, "at least 2"));
    }
    let mut warnings = Vec::new();
    let volume = vessel.resistance.hull.input.displacement_volume;
    let factors = [
        1.0 - ranges.displacement_fraction,
        1.0,
        1.0 + ranges.displacement_fraction,
    ];
    let loads: Vec<Vessel> = factors
        .iter()
        .map(|f| Condition::displacement("band", volume * f).apply(vessel))
        .collect::<Result<_, _>>()?;
    // The other resistance method, where the method choice computes one, at the three
    // displacements: the spread between published methods is a real uncertainty.
    let others: Vec<Vessel> = match vessel.with_alternative_method() {
        Some(other) => factors
            .iter()
            .map(|f| Condition::displacement("band", volume * f).apply(&other))
            .collect::<Result<_, _>>()?,
        None => Vec::new(),
    };
    // The wake is shifted either side of the model's own estimate at the speed in question
    // (each rpm's speed for the curve, top speed for the pitch), so the band has a lower and
    // an upper edge at every rpm and the nominal lies between them.
    let mut clamped = false;
    let shifted_at = |loaded: &Vessel, speed: f64, clamped: &mut bool| -> Vec<Vessel> {
        let system = loaded.system(index);
        let frozen: Interaction = loaded.interaction.at_speed(
            &loaded.resistance.hull,
            &loaded.resistance.water,
            &system.screw_at_stern(),
            speed,
        );
        [-ranges.wake_shift, ranges.wake_shift]
            .into_iter()
            .filter(|shift| *shift != 0.0)
            .map(|shift| {
                let mut wake = frozen.wake_fraction + shift;
                if wake < 0.0 {
                    *clamped = true;
                    wake = 0.0;
                }
                let mut shifted = loaded.clone();
                shifted.interaction = InteractionMethod::User(Interaction {
                    wake_fraction: wake,
                    ..frozen
                });
                shifted
            })
            .collect()
    };

    let engine = &vessel.engine;
    let (idle, rated) = (engine.idle_rpm.max(1.0), engine.rated_rpm);
    let nominal_system = vessel.system(index);
    let power_of = |case: &Vessel, rpm: f64| {
        point_at_engine_rpm(&case.system(index), rpm)
            .ok()
            .map(|p| p.brake_power_per_engine)
    };
    let points = (0..ranges.rpm_points)
        .map(|i| {
            let rpm = idle + (rated - idle) * i as f64 / (ranges.rpm_points - 1) as f64;
            let nominal = point_at_engine_rpm(&nominal_system, rpm).ok();
            let mut powers: Vec<f64> = loads
                .iter()
                .chain(&others)
                .filter_map(|case| power_of(case, rpm))
                .chain(nominal.map(|p| p.brake_power_per_engine))
                .collect();
            if let Some(speed) = nominal.map(|p| p.speed) {
                for loaded in &loads {
                    for case in shifted_at(loaded, speed, &mut clamped) {
                        powers.extend(power_of(&case, rpm));
                    }
                }
            }
            BandPoint {
                engine_rpm: rpm,
                nominal_power: nominal.map(|p| p.brake_power_per_engine),
                low_power: powers.iter().copied().reduce(f64::min),
                high_power: powers.iter().copied().reduce(f64::max),
                nominal_speed: nominal.map(|p| p.speed),
            }
        })
        .collect();

    // The pitch is chosen at full throttle: its wake cases are shifted about the wake at the
    // boat's own top speed (the target speed when it has none).
    let reference_speed = match_engine(&nominal_system, &vessel.match_criteria)
        .map(|m| m.top_speed)
        .unwrap_or(vessel.trip.target_speed);
    let mut cases: Vec<Vessel> = Vec::with_capacity(12);
    for loaded in &loads {
        cases.push(loaded.clone());
        cases.extend(shifted_at(loaded, reference_speed, &mut clamped));
    }
    cases.extend(others.iter().cloned());
    if clamped {
        warnings.push(Warning::about(
            Subject::Interaction,
            "uncertainty band",
            "a shifted wake fraction below 0 was clamped at 0",
        ));
    }

    let (pitch_nominal, _) = matching_pitch(vessel, index, pitch_options)?;
    let mut pitches = Vec::new();
    let mut unsolved_cases = 0;
    for case in &cases {
        match matching_pitch(case, index, pitch_options)? {
            (Some(p), SearchStop::Converged) => pitches.push(p),
            _ => unsolved_cases += 1,
        }
    }
    pitches.extend(pitch_nominal);
    if unsolved_cases > 0 {
        warnings.push(Warning::new(
            "uncertainty band",
            format!(
                "{unsolved_cases} of {} cases found no pitch: the pitch range covers the rest only",
                cases.len()
            ),
        ));
    }
    Ok(UncertaintyBand {
        ranges: *ranges,
        wake_reference_speed: reference_speed,
        points,
        pitch_nominal,
        pitch_low: pitches.iter().copied().reduce(f64::min),
        pitch_high: pitches.iter().copied().reduce(f64::max),
        unsolved_cases,
        alternative_method: vessel
            .with_alternative_method()
            .map(|v| v.resistance.method.name()),
        warnings,
    })
}
