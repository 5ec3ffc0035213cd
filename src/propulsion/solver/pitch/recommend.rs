//! The pitch recommendation: the searched pitch with the matches around it, the rpm-per-inch
//! slope, the cure of the current screw, the re-pitch limit and the caution.

use super::{
    DesignError, INCH, PITCH_CAUTION, PitchOptions, PitchTarget, SearchStop, TargetPoint,
    bseries_geometry, rebuilt_screw, system_with, target_pitch,
};
use crate::propulsion::hull::SpeedValidity;
use crate::propulsion::screw::ScrewGeometry;
use crate::propulsion::solver::matching::{
    MatchResult, Verdict, match_engine, point_at_engine_rpm,
};
use crate::propulsion::solver::{Installation, Vessel};
use crate::propulsion::{Subject, Warning};

/// The loading condition a recommendation or a what-if case was made for.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ConditionSummary {
    /// The condition's name, e.g. "as loaded in the boat file" or "full load".
    pub label: String,
    /// Displacement volume, m³.
    pub displacement_volume: f64,
    /// Service margin on total resistance, fraction.
    pub service_margin: f64,
    /// Fouling as added friction, fraction of friction.
    pub fouling: f64,
    /// Sea-trial resistance factor applied (1.0 = none).
    pub resistance_factor: f64,
}

impl ConditionSummary {
    /// The condition of the vessel as it stands, under `label`.
    pub fn of(vessel: &Vessel, label: impl Into<String>) -> Self {
        let margins = vessel.resistance.margins;
        Self {
            label: label.into(),
            displacement_volume: vessel.resistance.hull.input.displacement_volume,
            service_margin: margins.service,
            fouling: margins.fouling,
            resistance_factor: margins.resistance_factor,
        }
    }

    /// One line for the user, e.g. "full load: 13.0 m³, service margin 15 %, fouling 0 %".
    pub fn describe(&self) -> String {
        let mut text = format!(
            "{}: displacement {:.2} m³, service margin {:.0} %, fouling {:.0} %",
            self.label,
            self.displacement_volume,
            self.service_margin * 100.0,
            self.fouling * 100.0
        );
        if (self.resistance_factor - 1.0).abs() > 1e-9 {
            text.push_str(&format!(
                ", sea-trial resistance factor {:.3} applied",
                self.resistance_factor
            ));
        }
        text
    }
}

/// A pitch recommendation for one screw variant.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct PitchRecommendation {
    /// The variant's label.
    pub label: String,
    /// The screw's current pitch, m.
    pub current_pitch: f64,
    /// The pitch that meets the target, m; `None` when the search did not converge.
    pub recommended_pitch: Option<f64>,
    /// Recommended minus current pitch, m.
    pub change: Option<f64>,
    /// Whether |change| is within `repitch_limit`.
    pub within_repitch_limit: Option<bool>,
    /// The re-pitch limit used, m.
    pub repitch_limit: f64,
    /// Change of full-throttle engine rpm per inch of added pitch, rpm/in (negative: more pitch,
    /// fewer rpm): the slope on the load-limited side, measured between the recommended pitch
    /// (or the current one if unsolved) + ½ in and + 1½ in on the rpm at which the screw
    /// absorbs full-load power — the free-running rpm of a governed engine — so it never spans
    /// the governor's pin.
    pub rpm_per_inch: Option<f64>,
    /// The same slope per 10 mm of added pitch, rpm per 10 mm.
    pub rpm_per_10mm: Option<f64>,
    /// The target asked for.
    pub target: PitchTarget,
    /// The engine rpm and brake power the curve must meet.
    pub target_point: TargetPoint,
    /// The engine's rated rpm, rpm.
    pub rated_rpm: f64,
    /// Brake power the propeller curve asks at the target rpm with the recommended pitch, W.
    pub absorbed_power: Option<f64>,
    /// The match of the current screw (direct solve), if it could be solved.
    pub current: Option<MatchSummary>,
    /// The match at the recommended pitch (direct solve), if it could be solved.
    pub at_recommended: Option<MatchSummary>,
    /// The pitch change that cures the current screw's shortfall or excess by the slope, with
    /// a direct solve at the pitch it suggests.
    pub cure: Option<PitchCure>,
    /// The loading condition the recommendation was made for.
    pub condition: ConditionSummary,
    /// How the search stopped.
    pub stop: SearchStop,
    /// Root-finder iterations used (power evaluations, including bracketing).
    pub evaluations: u32,
    /// Boat speed at the target rpm with the recommended pitch, m/s, if solved.
    pub speed_at_target: Option<f64>,
    /// Where that speed lies against the resistance method's range and the displacement
    /// regime, if solved.
    pub target_validity: Option<SpeedValidity>,
    /// Whether the speed the pitch is chosen for is inside the method's range (`None` if the
    /// speed was not solved); false means the recommendation is unreliable and a sea trial decides.
    pub in_method_range: Option<bool>,
    /// Short caution to show beside the recommendation.
    pub caution: String,
    /// Warnings: re-pitch beyond the limit, pitch ratio outside the B-series range, …
    pub warnings: Vec<Warning>,
}

/// The verdict and margin of one screw, as the match gives them.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct MatchSummary {
    /// The screw's pitch, m.
    pub pitch: f64,
    /// Full-throttle engine rpm, rpm.
    pub meeting_rpm: f64,
    /// The match's margin at full throttle, rpm (see [`MatchResult::rpm_margin`]).
    pub rpm_margin: f64,
    /// Whether the margin is only a lower bound.
    pub margin_is_lower_bound: bool,
    /// The verdict.
    pub verdict: Verdict,
    /// Brake power absorbed at rated rpm, fraction of rated power.
    pub absorbed_fraction_at_rated: f64,
}

impl MatchSummary {
    /// The summary of `result` for a screw of `pitch` (m).
    pub fn of(result: &MatchResult, pitch: f64) -> Self {
        Self {
            pitch,
            meeting_rpm: result.meeting_rpm,
            rpm_margin: result.rpm_margin,
            margin_is_lower_bound: result.margin_is_lower_bound,
            verdict: result.verdict,
            absorbed_fraction_at_rated: result.absorbed_fraction_at_rated,
        }
    }
}

/// The re-pitch that the rpm-per-inch slope gives for the current screw, checked by a solve.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PitchCure {
    /// The margin the recommendation reaches, rpm (the target's).
    pub target_margin: f64,
    /// Target margin minus the current screw's margin, rpm (positive: rpm to gain).
    pub rpm_to_cure: f64,
    /// Pitch change by the slope, m (negative: take pitch off).
    pub change: f64,
    /// The match solved directly at current pitch + `change`, if it could be solved.
    pub check: Option<MatchSummary>,
}
/// The match with pitch `pitch` (m).
fn match_at(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    pitch: f64,
) -> Result<MatchResult, DesignError> {
    let screw = rebuilt_screw(ScrewGeometry { pitch, ..base })?;
    let system = system_with(vessel, &screw, installation);
    Ok(match_engine(&system, &vessel.match_criteria)?)
}

/// The rpm at which the screw of pitch `pitch` absorbs the full-load power (the free-running
/// rpm of a governed engine, the full-throttle rpm otherwise), rpm; `None` if not found.
fn loaded_rpm(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    pitch: f64,
) -> Option<f64> {
    let m = match_at(vessel, base, installation, pitch).ok()?;
    (!m.margin_is_lower_bound).then_some(m.rpm_margin + vessel.engine.rated_rpm)
}

/// Where the slope is measured: from this much added pitch …, m.
pub const SLOPE_NEAR: f64 = 0.5 * INCH;

/// … to this much added pitch, m (the load-limited side of a recommended pitch).
pub const SLOPE_FAR: f64 = 1.5 * INCH;

/// Full-throttle rpm change per metre of added pitch on the load-limited side of `pitch`:
/// the secant of [`loaded_rpm`] between `pitch` + [`SLOPE_NEAR`] and + [`SLOPE_FAR`], rpm/m.
/// The loaded rpm is smooth in pitch (no governor pin), so the secant never spans the pin.
fn rpm_per_metre(
    vessel: &Vessel,
    base: ScrewGeometry,
    installation: Installation,
    pitch: f64,
) -> Option<f64> {
    let near = loaded_rpm(vessel, base, installation, pitch + SLOPE_NEAR)?;
    let far = loaded_rpm(vessel, base, installation, pitch + SLOPE_FAR)?;
    let slope = (far - near) / (SLOPE_FAR - SLOPE_NEAR);
    (slope.is_finite() && slope < 0.0).then_some(slope)
}

/// Recommends the pitch of variant `index` of `vessel` for `options.target`, for the vessel's
/// own condition (named "as loaded in the boat file").
pub fn recommend_pitch(
    vessel: &Vessel,
    index: usize,
    options: &PitchOptions,
) -> Result<PitchRecommendation, DesignError> {
    recommend_pitch_for_condition(
        vessel,
        index,
        options,
        ConditionSummary::of(vessel, "as loaded in the boat file"),
    )
}

/// Recommends the pitch of variant `index` of `vessel`, labelling the result with `condition`
/// (the caller has already applied the condition to `vessel`).
pub fn recommend_pitch_for_condition(
    vessel: &Vessel,
    index: usize,
    options: &PitchOptions,
    condition: ConditionSummary,
) -> Result<PitchRecommendation, DesignError> {
    let base = bseries_geometry(vessel, index)?;
    let search = target_pitch(vessel, base, options)?;
    let target_point = options.target.point(vessel)?;
    let installation = vessel.installation;
    let slope_pitch = search.pitch.unwrap_or(base.pitch);
    let slope = rpm_per_metre(vessel, base, installation, slope_pitch);
    let change = search.pitch.map(|p| p - base.pitch);
    let repitch = options.repitch.unwrap_or(vessel.repitch);
    repitch.check()?;
    let repitch_limit = repitch.for_pitch(base.pitch);
    let within = change.map(|c| c.abs() <= repitch_limit + 1e-12);
    let summary = |pitch: f64| {
        match_at(vessel, base, installation, pitch)
            .ok()
            .map(|m| MatchSummary::of(&m, pitch))
    };
    let current = summary(base.pitch);
    let at_recommended = search.pitch.and_then(summary);
    let rated_rpm = vessel.engine.rated_rpm;
    let target_margin = at_recommended
        .filter(|m| !m.margin_is_lower_bound)
        .map_or(target_point.engine_rpm - rated_rpm, |m| m.rpm_margin);
    let cure = match (current, slope) {
        (Some(now), Some(slope)) if !now.margin_is_lower_bound => {
            let rpm_to_cure = target_margin - now.rpm_margin;
            let change = rpm_to_cure / slope;
            let check = (base.pitch + change > 0.0)
                .then(|| summary(base.pitch + change))
                .flatten();
            Some(PitchCure {
                target_margin,
                rpm_to_cure,
                change,
                check,
            })
        }
        _ => None,
    };

    let mut warnings = Vec::new();
    if let (Some(c), Some(false)) = (change, within) {
        warnings.push(Warning::about(
            Subject::Pitch,
            "pitch recommendation",
            format!(
                "the change of {:+.1} mm ({:+.2} in) is beyond the re-pitch limit of ±{:.1} mm (common practice): a new screw is the answer",
                c * 1000.0,
                c / INCH,
                repitch_limit * 1000.0
            ),
        ));
    }
    if let PitchTarget::RatedPower { fraction } = options.target
        && fraction > 1.0 + 1e-9
    {
        warnings.push(Warning::new(
            "pitch recommendation",
            format!(
                "a target of {:.0} % of rated power at rated rpm overloads the engine: the screw would ask more than the engine's rating",
                fraction * 100.0
            ),
        ));
    }
    if let Some(p) = search.pitch {
        let ratio = p / base.diameter;
        if !(0.5..=1.4).contains(&ratio) {
            warnings.push(Warning::about(
                Subject::PitchRatio,
                "B-series",
                format!("the recommended pitch ratio P/D = {ratio:.2} is outside the series' range 0.5–1.4"),
            ));
        }
    }
    match &search.stop {
        SearchStop::Converged => {}
        SearchStop::BracketLost(reason) => {
            warnings.push(Warning::new(
                "pitch recommendation",
                format!("no pitch recommended: {reason}"),
            ));
        }
        SearchStop::IterationsExhausted => warnings.push(Warning::new(
            "pitch recommendation",
            "no pitch recommended: the search reached its iteration limit",
        )),
    }

    // The pitch is decided at the target rpm: where the boat then runs outside the resistance
    // method's range the whole recommendation rests on an extrapolated resistance.
    let speed_at_target = search.pitch.and_then(|pitch| {
        let screw = rebuilt_screw(ScrewGeometry { pitch, ..base }).ok()?;
        let system = system_with(vessel, &screw, vessel.installation);
        point_at_engine_rpm(&system, target_point.engine_rpm)
            .ok()
            .map(|p| p.speed)
    });
    let target_validity = speed_at_target.map(|v| vessel.resistance.validity_at(v));
    let in_method_range = target_validity.map(|v| v.in_method_range);
    if let Some(reason) = target_validity.and_then(|v| v.reason()) {
        warnings.push(Warning::about(
            Subject::FroudeNumber,
            "pitch recommendation",
            format!(
                "UNRELIABLE: at {:.0} rpm with the recommended pitch the boat runs outside the range of {} ({reason}); the resistance there is an extrapolation, so a sea trial decides the pitch",
                target_point.engine_rpm,
                vessel.resistance.method.name()
            ),
        ));
    }
    let mut caution = PITCH_CAUTION.to_string();
    if in_method_range == Some(false) {
        caution = format!(
            "Unreliable: the pitch is chosen at a speed outside the resistance method's range; a sea trial decides. {caution}"
        );
    }
    if within == Some(false) {
        caution = format!("Beyond the re-pitch limit: a new screw is needed. {caution}");
    }
    Ok(PitchRecommendation {
        label: vessel.variants[index].label.clone(),
        current_pitch: base.pitch,
        recommended_pitch: search.pitch,
        change,
        within_repitch_limit: within,
        repitch_limit,
        rpm_per_inch: slope.map(|s| s * INCH),
        rpm_per_10mm: slope.map(|s| s * 0.010),
        target: options.target,
        target_point,
        rated_rpm,
        absorbed_power: search.absorbed_power,
        current,
        at_recommended,
        cure,
        condition,
        stop: search.stop,
        evaluations: search.evaluations,
        speed_at_target,
        target_validity,
        in_method_range,
        caution,
        warnings,
    })
}
