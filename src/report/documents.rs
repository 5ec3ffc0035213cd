//! The JSON documents of `cruise`, `pitch`, `sweep` and `trial`, and the text line of
//! `cruise`, built from the study's answers (SI, or the unit in the field's name).

use serde::Serialize;

use super::checks::AppliedCalibration;
use super::design::PitchJson;
use super::finite_or_none;
use super::json::PointJson;
use super::model::unreliable_label;
use super::text::cruise_summary;
use super::{CAUTION, Display, KNOT_MPS, LITRE_M3, NAUTICAL_MILE_M};
use crate::profile::store::Saved;
use crate::propulsion::hull::ResistanceModel;
use crate::propulsion::solver::CruisePoint;
use crate::propulsion::solver::pitch::PitchRecommendation;
use crate::propulsion::solver::sweep::SweepResult;
use crate::propulsion::solver::trial::{Calibration, FroudeFit};
use crate::study::Study;

/// The JSON document of `cruise`.
#[derive(Debug, Serialize)]
pub struct CruiseJson<'a> {
    boat: &'a str,
    variant: &'a str,
    #[serde(flatten)]
    point: PointJson,
    calibration: Option<AppliedCalibration>,
    caution: &'static str,
}

/// The point of `cruise` in JSON, or `None` when one of its shown figures is not finite.
pub fn cruise_json<'a>(
    study: &'a Study,
    index: usize,
    point: &CruisePoint,
) -> Option<CruiseJson<'a>> {
    let json_point = PointJson::of(point, &study.vessel.resistance);
    let all_finite = [
        json_point.engine_rpm,
        json_point.speed_kn,
        json_point.brake_kw,
        json_point.load_pct,
        json_point.fuel_lph,
        json_point.fuel_l_per_nm,
        json_point.range_nm,
    ]
    .iter()
    .all(|v| v.is_finite());
    all_finite.then(|| CruiseJson {
        boat: &study.vessel.name,
        variant: &study.vessel.variants[index].label,
        point: json_point,
        calibration: study.calibration.clone(),
        caution: CAUTION,
    })
}

/// The text line of `cruise`: which screw, the point, past full load, or outside the method's
/// range. `screw` names the variant ("screw re-pitched 26x17.5 (the boat file's active one)").
pub fn cruise_line(
    screw: &str,
    point: &CruisePoint,
    d: &Display,
    resistance: &ResistanceModel,
) -> String {
    let mut line = format!("{screw}: {}", cruise_summary(point, d));
    if point.beyond_full_load {
        line.push_str(" — past the engine's full-load curve: not reachable");
    }
    if let Some(why) = unreliable_label(resistance, &point.point) {
        line.push_str(&format!(" — UNRELIABLE: {why}; a sea trial decides"));
    }
    line
}

/// The JSON document of `pitch`.
#[derive(Debug, Serialize)]
pub struct PitchDoc {
    boat: String,
    calibration: Option<AppliedCalibration>,
    /// The boat as found with its figures, or null.
    baseline: Option<super::baseline::BaselineJson>,
    variants: Vec<PitchJson>,
    caution: &'static str,
}

/// The `pitch` document of `recs`.
pub fn pitch_json(study: &Study, recs: &[PitchRecommendation]) -> PitchDoc {
    PitchDoc {
        boat: study.vessel.name.clone(),
        calibration: study.calibration.clone(),
        baseline: study
            .baseline_figures()
            .as_ref()
            .map(super::baseline::baseline_json),
        variants: recs
            .iter()
            .map(|r| {
                let mut json = PitchJson::of(r, study.vessel.resistance.water.density);
                json.delta = study
                    .variant(Some(&r.label))
                    .ok()
                    .zip(r.recommended_pitch.filter(|p| p.is_finite()))
                    .and_then(|(index, pitch)| study.delta_at_pitch(index, pitch))
                    .map(|h| super::baseline::headline_json(&h));
                json
            })
            .collect(),
        caution: CAUTION,
    }
}

/// One sweep candidate in JSON.
#[derive(Debug, Serialize)]
struct CandidateJson {
    rank: usize,
    value: f64,
    blades: u32,
    diameter_m: f64,
    area_ratio: f64,
    gear_ratio: f64,
    pitch_m: Option<f64>,
    top_speed_kn: Option<f64>,
    top_speed_in_method_range: Option<bool>,
    meeting_rpm: Option<f64>,
    eta0_at_target: Option<f64>,
    eta0_at_top: Option<f64>,
    propulsive_efficiency_at_target: Option<f64>,
    fuel_l_per_nm_at_target: Option<f64>,
    problem: Option<String>,
    /// Rank of the group leader it is not told apart from, or null.
    tie_with: Option<usize>,
}

/// The JSON document of `sweep`.
#[derive(Debug, Serialize)]
pub struct SweepDoc<'a> {
    boat: &'a str,
    variant: &'a str,
    parameter: &'static str,
    criterion: &'static str,
    target: String,
    target_speed_kn: f64,
    calibration: Option<AppliedCalibration>,
    /// The tie band (fraction of the group leader's figure), or null without a band.
    tie_band: Option<f64>,
    candidates: Vec<CandidateJson>,
    caution: &'static str,
}

/// The `sweep` document of `result` for the variant labelled `label`.
pub fn sweep_json<'a>(study: &'a Study, label: &'a str, result: &SweepResult) -> SweepDoc<'a> {
    let nm_per_m = NAUTICAL_MILE_M / LITRE_M3;
    SweepDoc {
        boat: &study.vessel.name,
        variant: label,
        parameter: result.parameter,
        criterion: result.criterion,
        target: result.target.describe(),
        target_speed_kn: result.target_speed / KNOT_MPS,
        calibration: study.calibration.clone(),
        tie_band: result.tie_band,
        candidates: result
            .candidates
            .iter()
            .map(|c| CandidateJson {
                rank: c.rank,
                value: c.value,
                blades: c.geometry.blades,
                diameter_m: c.geometry.diameter,
                area_ratio: c.geometry.area_ratio,
                gear_ratio: c.gear_ratio,
                pitch_m: finite_or_none(c.pitch),
                top_speed_kn: finite_or_none(c.top_speed.map(|v| v / KNOT_MPS)),
                top_speed_in_method_range: c.top_speed_in_method_range,
                meeting_rpm: finite_or_none(c.meeting_rpm),
                eta0_at_target: finite_or_none(c.open_water_efficiency_at_target),
                eta0_at_top: finite_or_none(c.open_water_efficiency_at_top),
                propulsive_efficiency_at_target: finite_or_none(c.propulsive_efficiency_at_target),
                fuel_l_per_nm_at_target: finite_or_none(
                    c.fuel_per_distance_at_target.map(|v| v * nm_per_m),
                ),
                problem: c.problem.clone(),
                tie_with: c.tie_with,
            })
            .collect(),
        caution: CAUTION,
    }
}

/// One trial rpm group in JSON.
#[derive(Debug, Serialize)]
struct TrialPointJson {
    engine_rpm: f64,
    runs: usize,
    two_way: bool,
    measured_kn: f64,
    predicted_kn: Option<f64>,
    calibrated_kn: Option<f64>,
    current_kn: Option<f64>,
}

/// Where `trial --save` wrote the calibration.
#[derive(Debug, Serialize)]
struct SavedJson {
    path: String,
    backup: Option<String>,
}

/// The two-parameter trial fit in JSON.
#[derive(Debug, Serialize)]
pub struct FroudeFitJson {
    /// Froude number of the slowest trial speed.
    froude_low: f64,
    /// The factor there and below.
    factor_low: f64,
    /// Froude number of the fastest trial speed.
    froude_high: f64,
    /// The factor there and above.
    factor_high: f64,
    /// RMS error with it, kn.
    rms_after_kn: f64,
}

/// The JSON document of `trial`.
#[derive(Debug, Serialize)]
pub struct TrialDoc<'a> {
    boat: &'a str,
    variant: &'a str,
    compared_with: &'static str,
    rms_before_kn: f64,
    rms_after_kn: f64,
    resistance_factor_before: f64,
    resistance_factor: f64,
    factor_basis: &'static str,
    service_margin: f64,
    fouling: f64,
    wake_fraction: Option<f64>,
    saved_calibration: Option<AppliedCalibration>,
    /// Which installation the runs were made with and are fitted through.
    installation: &'static str,
    /// One standard error of the fitted factor, or null.
    resistance_factor_uncertainty: Option<f64>,
    /// The two-parameter fit (a factor varying with Froude number), or null.
    froude_fit: Option<FroudeFitJson>,
    /// Why there is no two-parameter fit, or null.
    froude_fit_error: Option<String>,
    rms_with_saved_kn: Option<f64>,
    saved: Option<SavedJson>,
    points: Vec<TrialPointJson>,
    warnings: Vec<String>,
}

/// The `trial` document of the fit `cal` of the variant labelled `label`; `rms_saved` is the
/// error with the saved correction (m/s), `saved` where `--save` wrote it.
pub fn trial_json<'a>(
    study: &'a Study,
    label: &'a str,
    cal: &Calibration,
    froude: &Result<FroudeFit, String>,
    rms_saved: Option<f64>,
    saved: Option<&Saved>,
) -> TrialDoc<'a> {
    let kn = |v: Option<f64>| finite_or_none(v.map(|v| v / KNOT_MPS));
    TrialDoc {
        installation: study.doc.trial_side().name(),
        resistance_factor_uncertainty: finite_or_none(Study::factor_uncertainty(cal)),
        froude_fit: froude.as_ref().ok().map(|f| FroudeFitJson {
            froude_low: f.factor.froude_low,
            factor_low: f.factor.low,
            froude_high: f.factor.froude_high,
            factor_high: f.factor.high,
            rms_after_kn: f.rms_after / KNOT_MPS,
        }),
        froude_fit_error: froude.as_ref().err().cloned(),
        boat: &study.vessel.name,
        variant: label,
        compared_with: "uncalibrated model",
        rms_before_kn: cal.rms_before / KNOT_MPS,
        rms_after_kn: cal.rms_after / KNOT_MPS,
        resistance_factor_before: cal.resistance_factor_before,
        resistance_factor: cal.resistance_factor,
        factor_basis: "calm, clean-hull resistance; service margin and fouling on top",
        service_margin: cal.service_margin,
        fouling: cal.fouling,
        wake_fraction: finite_or_none(cal.wake_fraction),
        saved_calibration: study.calibration.clone(),
        rms_with_saved_kn: kn(rms_saved),
        saved: saved.map(|s| SavedJson {
            path: s.path.display().to_string(),
            backup: s.backup.as_ref().map(|b| b.display().to_string()),
        }),
        points: cal
            .points
            .iter()
            .map(|p| TrialPointJson {
                engine_rpm: p.engine_rpm,
                runs: p.runs,
                two_way: p.two_way,
                measured_kn: p.measured_speed / KNOT_MPS,
                predicted_kn: kn(p.predicted_before),
                calibrated_kn: kn(p.predicted_after),
                current_kn: kn(p.current),
            })
            .collect(),
        warnings: cal.warnings.iter().map(ToString::to_string).collect(),
    }
}
