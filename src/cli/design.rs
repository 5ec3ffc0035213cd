//! Design commands on one boat: `pitch`, `sweep` and `trial`.

use std::io::Write;

use anyhow::Context as _;
use serde::Serialize;

use super::store::{LoadedBoat, load_boat};
use super::{
    Context, DesignArgs, PitchArgs, PlainFormat, RankBy, SweepArgs, SweepOver, UsageError,
};
use crate::profile::store::Saved;
use crate::profile::store::save_boat_file;
use crate::profile::{CalibrationDoc, Origin};
use crate::propulsion::solver::matching::point_at_engine_rpm;
use crate::propulsion::solver::pitch::{
    MatchSummary, PitchCure, PitchOptions, PitchRecommendation, PitchTarget, RepitchLimit,
    recommend_pitch,
};
use crate::propulsion::solver::sweep::{
    RankCriterion, SweepOptions, SweepParameter, SweepResult, USUAL_AREA_RATIOS,
    USUAL_BLADE_COUNTS, gear_ratios_around, sweep as run_sweep,
};
use crate::propulsion::solver::trial::{
    Calibration, CalibrationFit, CalibrationOptions, calibrate,
};
use crate::report::boat::{margin_words, signed_rpm, verdict_words};
use crate::report::checks::CALM_WATER_NOTE;
use crate::report::table::{Column, Table};
use crate::report::{CAUTION, Display, INCH_M, KNOT_MPS, json, percent};
use crate::units::Kind;

/// The variants asked for: one by label, or all.
pub fn variant_indices(loaded: &LoadedBoat, label: Option<&str>) -> anyhow::Result<Vec<usize>> {
    match label {
        None => Ok((0..loaded.vessel.variants.len()).collect()),
        Some(label) => Ok(vec![super::boat::labelled_variant(loaded, label)?]),
    }
}

fn finite_or_none(value: Option<f64>) -> Option<f64> {
    value.filter(|v| v.is_finite())
}

/// One variant's recommendation in JSON.
#[derive(Debug, Serialize)]
struct PitchJson {
    label: String,
    current_pitch_m: f64,
    recommended_pitch_m: Option<f64>,
    change_m: Option<f64>,
    within_repitch_limit: Option<bool>,
    repitch_limit_m: f64,
    rpm_per_inch: Option<f64>,
    rpm_per_10mm: Option<f64>,
    target: String,
    target_rpm: f64,
    target_kw: f64,
    absorbed_kw: Option<f64>,
    /// The current screw's match.
    #[serde(rename = "match")]
    current: Option<MatchSummaryJson>,
    /// The match at the recommended pitch.
    recommended_match: Option<MatchSummaryJson>,
    cure: Option<CureJson>,
    condition: String,
    search: String,
    speed_at_target_kn: Option<f64>,
    froude_at_target: Option<f64>,
    in_method_range: Option<bool>,
    warnings: Vec<String>,
}

impl From<&PitchRecommendation> for PitchJson {
    fn from(r: &PitchRecommendation) -> Self {
        Self {
            label: r.label.clone(),
            current_pitch_m: r.current_pitch,
            recommended_pitch_m: finite_or_none(r.recommended_pitch),
            change_m: finite_or_none(r.change),
            within_repitch_limit: r.within_repitch_limit,
            repitch_limit_m: r.repitch_limit,
            rpm_per_inch: finite_or_none(r.rpm_per_inch),
            rpm_per_10mm: finite_or_none(r.rpm_per_10mm),
            target: r.target.describe(),
            target_rpm: r.target_point.engine_rpm,
            target_kw: r.target_point.brake_power / 1e3,
            absorbed_kw: finite_or_none(r.absorbed_power.map(|w| w / 1e3)),
            current: r.current.as_ref().map(MatchSummaryJson::from),
            recommended_match: r.at_recommended.as_ref().map(MatchSummaryJson::from),
            cure: r.cure.as_ref().map(CureJson::from),
            condition: r.condition.describe(),
            search: stop_text(&r.stop),
            speed_at_target_kn: finite_or_none(r.speed_at_target.map(|v| v / KNOT_MPS)),
            froude_at_target: finite_or_none(r.target_validity.map(|v| v.froude)),
            in_method_range: r.in_method_range,
            warnings: r.warnings.iter().map(ToString::to_string).collect(),
        }
    }
}

/// A match's verdict and margin in JSON (the same fields as the report's `match`).
#[derive(Debug, Serialize)]
struct MatchSummaryJson {
    pitch_m: f64,
    meeting_rpm: f64,
    verdict: crate::propulsion::solver::Verdict,
    rpm_margin: f64,
    rpm_margin_is_lower_bound: bool,
    absorbed_pct_at_rated: f64,
}

impl From<&MatchSummary> for MatchSummaryJson {
    fn from(m: &MatchSummary) -> Self {
        Self {
            pitch_m: m.pitch,
            meeting_rpm: m.meeting_rpm,
            verdict: m.verdict,
            rpm_margin: m.rpm_margin,
            rpm_margin_is_lower_bound: m.margin_is_lower_bound,
            absorbed_pct_at_rated: m.absorbed_fraction_at_rated * 100.0,
        }
    }
}

/// The slope's cure of the current screw in JSON.
#[derive(Debug, Serialize)]
struct CureJson {
    target_rpm_margin: f64,
    rpm_to_cure: f64,
    change_m: f64,
    check: Option<MatchSummaryJson>,
}

impl From<&PitchCure> for CureJson {
    fn from(c: &PitchCure) -> Self {
        Self {
            target_rpm_margin: c.target_margin,
            rpm_to_cure: c.rpm_to_cure,
            change_m: c.change,
            check: c.check.as_ref().map(MatchSummaryJson::from),
        }
    }
}

fn stop_text(stop: &crate::propulsion::solver::pitch::SearchStop) -> String {
    use crate::propulsion::solver::pitch::SearchStop;
    match stop {
        SearchStop::Converged => "converged".into(),
        SearchStop::BracketLost(reason) => format!("no pitch found: {reason}"),
        SearchStop::IterationsExhausted => "iteration limit reached".into(),
    }
}

/// The pitch options of the command line for `loaded`; a `--light-running` of 0 or more also
/// becomes the boat's light-running margin, so the verdict's band follows the target asked for.
pub fn pitch_options(args: &PitchArgs, loaded: &mut LoadedBoat) -> anyhow::Result<PitchOptions> {
    let rated_rpm = loaded.vessel.engine.rated_rpm;
    let target = match (args.light_running, args.absorb) {
        (Some(rpm), _) if !rpm.is_finite() => {
            return Err(
                UsageError("--light-running: expected an rpm margin such as 50".into()).into(),
            );
        }
        (Some(rpm), _) if rpm >= 0.0 && rpm < 0.2 * rated_rpm => {
            loaded.vessel.match_criteria.light_running = rpm / rated_rpm;
            PitchTarget::Headroom
        }
        (Some(rpm), _) => PitchTarget::LightRunning { rpm_margin: rpm },
        (None, Some(pct)) => {
            let fraction = pct / 100.0;
            // Reject what the search would refuse, as a usage error naming the option.
            if !(fraction.is_finite() && fraction > 0.0 && fraction <= 1.5) {
                return Err(UsageError(format!(
                    "--absorb: expected a percentage of rated power above 0 and at most 150, got {pct}"
                ))
                .into());
            }
            PitchTarget::RatedPower { fraction }
        }
        (None, None) => PitchTarget::Headroom,
    };
    let mut repitch: RepitchLimit = loaded.vessel.repitch;
    if let Some(text) = &args.repitch_limit {
        repitch.length = crate::units::parse(text, Kind::ScrewLength)
            .ok()
            .filter(|v| v.is_finite() && (0.0..=0.3).contains(v))
            .ok_or_else(|| {
                UsageError(format!(
                    "--repitch-limit: expected a length with its unit from 0 to 12in (300mm), such as 2in, got {text:?}"
                ))
            })?;
    }
    if let Some(pct) = args.repitch_fraction {
        if !(pct.is_finite() && pct > 0.0 && pct < 100.0) {
            return Err(UsageError(format!(
                "--repitch-fraction: expected a percentage of pitch above 0 and below 100, got {pct}"
            ))
            .into());
        }
        repitch.fraction = Some(pct / 100.0);
    }
    Ok(PitchOptions {
        target,
        repitch: Some(repitch),
        ..PitchOptions::default()
    })
}

/// The pitch recommendations of the variants asked for, each with its reason when unsolved.
pub fn recommendations(
    loaded: &LoadedBoat,
    indices: &[usize],
    options: &PitchOptions,
) -> anyhow::Result<Vec<PitchRecommendation>> {
    indices
        .iter()
        .map(|&i| {
            recommend_pitch(&loaded.vessel, i, options).with_context(|| {
                format!(
                    "pitch recommendation for screw {}",
                    loaded.vessel.variants[i].label
                )
            })
        })
        .collect()
}

/// Text lines of one recommendation.
pub fn pitch_text(r: &PitchRecommendation, d: &Display) -> String {
    let mut out = format!(
        "Screw {}: current pitch {}\n",
        r.label,
        d.quantity(r.current_pitch, Kind::ScrewLength)
    );
    out.push_str(&format!(
        "  target: {} ({:.0} rpm, {}); condition {}\n",
        r.target.describe(),
        r.target_point.engine_rpm,
        d.quantity(r.target_point.brake_power, Kind::Power),
        r.condition.describe()
    ));
    match (r.recommended_pitch, r.change) {
        (Some(p), Some(c)) if p.is_finite() && c.is_finite() => {
            let sign = if c >= -0.0005 { "+" } else { "−" };
            out.push_str(&format!(
                "  recommended pitch {} (change {sign}{}), {}\n",
                d.quantity(p, Kind::ScrewLength),
                d.quantity(c.abs(), Kind::ScrewLength),
                match r.within_repitch_limit {
                    Some(true) => format!(
                        "within the re-pitch limit of ±{}",
                        d.quantity(r.repitch_limit, Kind::ScrewLength)
                    ),
                    _ => format!(
                        "BEYOND the re-pitch limit of ±{}: a new screw is needed",
                        d.quantity(r.repitch_limit, Kind::ScrewLength)
                    ),
                }
            ));
            if let (Some(false), Some(v)) = (r.in_method_range, r.target_validity) {
                out.push_str(&format!(
                    "  UNRELIABLE: at {:.0} rpm this pitch runs the boat at {} (Fn {:.2}), outside the resistance method's range — a sea trial decides\n",
                    r.target_point.engine_rpm,
                    r.speed_at_target
                        .map_or("—".into(), |s| d.quantity(s, Kind::Speed)),
                    v.froude
                ));
            }
        }
        _ => out.push_str(&format!("  no pitch recommended: {}\n", stop_text(&r.stop))),
    }
    let rated_rpm = r.rated_rpm;
    if let Some(m) = &r.current {
        out.push_str(&format!(
            "  current screw: {}\n",
            summary_words(m, rated_rpm)
        ));
    }
    if let Some(m) = &r.at_recommended {
        out.push_str(&format!(
            "  at the recommended pitch: {}\n",
            summary_words(m, rated_rpm)
        ));
    }
    if let Some(slope) = finite_or_none(r.rpm_per_inch) {
        out.push_str(&format!(
            "  full-throttle rpm changes by {} per inch of added pitch ({} per 10 mm), on the load-limited side\n",
            signed_rpm(slope),
            signed_rpm(slope * 0.010 / INCH_M)
        ));
    }
    if let Some(c) = &r.cure
        && c.rpm_to_cure.abs() >= 0.5
    {
        let what = if c.rpm_to_cure > 0.0 {
            format!("{:.0} rpm shortfall", c.rpm_to_cure)
        } else {
            format!("{:.0} rpm excess", -c.rpm_to_cure)
        };
        let sign = if c.change >= -0.0005 { "+" } else { "−" };
        let mut line = format!(
            "  by that slope the current screw's {what} is cured by {sign}{} of pitch",
            d.quantity(c.change.abs(), Kind::ScrewLength)
        );
        if let Some(check) = &c.check {
            line.push_str(&format!(
                "; solved at {}: {}",
                d.quantity(check.pitch, Kind::ScrewLength),
                summary_words(check, rated_rpm)
            ));
        }
        out.push_str(&line);
        out.push('\n');
    }
    for w in &r.warnings {
        out.push_str(&format!("  warning: {w}\n"));
    }
    out.push_str(&format!("  caution: {}\n", r.caution));
    out
}

/// "matched, margin +52 rpm (runs free 52 rpm past rated 2600 rpm), absorbs 97 % at rated rpm".
fn summary_words(m: &MatchSummary, rated_rpm: f64) -> String {
    format!(
        "{}, margin {} ({}), absorbs {:.0} % of rated power at rated rpm",
        verdict_words(m.verdict),
        signed_rpm(m.rpm_margin),
        margin_words(m.rpm_margin, m.margin_is_lower_bound, rated_rpm),
        m.absorbed_fraction_at_rated * 100.0
    )
}

/// `pitch BOAT`.
pub fn pitch(ctx: &Context, args: &PitchArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let mut loaded = load_boat(ctx, &args.boat)?;
    let indices = variant_indices(&loaded, args.variant.as_deref())?;
    let options = pitch_options(args, &mut loaded)?;
    let recs = recommendations(&loaded, &indices, &options)?;
    match args.format {
        PlainFormat::Json => {
            #[derive(Serialize)]
            struct Doc {
                boat: String,
                calibration: Option<crate::report::checks::AppliedCalibration>,
                variants: Vec<PitchJson>,
                caution: &'static str,
            }
            let doc = Doc {
                boat: loaded.vessel.name.clone(),
                calibration: loaded.applied_calibration(),
                variants: recs.iter().map(PitchJson::from).collect(),
                caution: CAUTION,
            };
            out.write_all(json::to_string(&doc)?.as_bytes())?;
        }
        PlainFormat::Text => {
            let d = Display::new(loaded.units);
            writeln!(out, "{}: pitch recommendation", loaded.vessel.name)?;
            writeln!(out, "{}", loaded.calibration_line())?;
            for r in &recs {
                writeln!(out)?;
                out.write_all(pitch_text(r, &d).as_bytes())?;
            }
            writeln!(out, "\nCaution: {CAUTION}")?;
        }
    }
    Ok(())
}

fn sweep_parameter(
    loaded: &LoadedBoat,
    index: usize,
    args: &SweepArgs,
) -> anyhow::Result<SweepParameter> {
    let vessel = &loaded.vessel;
    let values = |default: &[f64]| -> anyhow::Result<Vec<f64>> {
        match &args.values {
            None => Ok(default.to_vec()),
            Some(text) => {
                let list: Result<Vec<f64>, _> = text
                    .split(',')
                    .map(str::trim)
                    .filter(|s| !s.is_empty())
                    .map(str::parse::<f64>)
                    .collect();
                match list {
                    Ok(v) if !v.is_empty() && v.iter().all(|x| x.is_finite() && *x > 0.0) => Ok(v),
                    _ => Err(UsageError(format!("--values: expected a comma-separated list of positive numbers, got {text:?}")).into()),
                }
            }
        }
    };
    Ok(match args.over {
        SweepOver::Diameter => {
            let inst = &loaded.doc.installation;
            let aperture = inst.max_screw_diameter.as_ref().map(|q| q.value).ok_or_else(|| {
                anyhow::anyhow!(
                    "boat {:?} gives no installation.max_screw_diameter, so the aperture limit of a diameter sweep is unknown",
                    vessel.name
                )
            })?;
            let clearance = inst.tip_clearance.as_ref().map_or(0.0, |q| q.value);
            let current = vessel.variants[index].screw.geometry().diameter;
            SweepParameter::diameters_up_to(current, aperture, clearance).with_context(|| {
                format!(
                    "installation.max_screw_diameter and tip_clearance of {:?}",
                    vessel.name
                )
            })?
        }
        SweepOver::Gear => {
            SweepParameter::GearRatio(values(&gear_ratios_around(vessel.installation.gear_ratio))?)
        }
        SweepOver::Blades => {
            let list = values(&USUAL_BLADE_COUNTS.map(f64::from))?;
            if list.iter().any(|b| b.fract() != 0.0) {
                return Err(
                    UsageError("--values: blade counts must be whole numbers".into()).into(),
                );
            }
            SweepParameter::Blades(list.into_iter().map(|b| b as u32).collect())
        }
        SweepOver::Area => SweepParameter::AreaRatio(values(&USUAL_AREA_RATIOS)?),
    })
}

/// One sweep as text.
fn sweep_text(result: &SweepResult, label: &str, d: &Display) -> String {
    let mut out = format!(
        "Screw {label}: sweep of {} — ranked by {}\n",
        result.parameter, result.criterion
    );
    out.push_str(&format!(
        "  each candidate pitched to {}\n",
        result.target.describe()
    ));
    let mut table = Table::new(vec![
        Column::number("rank", ""),
        Column::text("screw"),
        Column::number("gear", ""),
        Column::number("pitch", &d.unit(Kind::ScrewLength)),
        Column::number("top speed", &d.unit(Kind::Speed)),
        Column::number("η0 target", ""),
        Column::number("η0 top", ""),
        Column::number("fuel/nm", &d.unit(Kind::FuelPerDistance)),
        Column::text("note"),
    ]);
    for c in &result.candidates {
        let opt =
            |v: Option<f64>, f: &dyn Fn(f64) -> String| finite_or_none(v).map_or("—".into(), f);
        table.push(vec![
            if c.rank > 0 {
                c.rank.to_string()
            } else {
                "—".into()
            },
            format!(
                "{} × {}, AE/A0 {:.2}",
                c.geometry.blades,
                d.quantity(c.geometry.diameter, Kind::ScrewLength),
                c.geometry.area_ratio
            ),
            format!("{:.2}", c.gear_ratio),
            opt(c.pitch, &|p| d.number(p, Kind::ScrewLength, 1)),
            opt(c.top_speed, &|v| {
                let prefix = if c.top_speed_in_method_range == Some(false) {
                    "≈"
                } else {
                    ""
                };
                format!("{prefix}{}", d.number(v, Kind::Speed, 2))
            }),
            opt(c.open_water_efficiency_at_target, &|v| format!("{v:.3}")),
            opt(c.open_water_efficiency_at_top, &|v| format!("{v:.3}")),
            opt(c.fuel_per_distance_at_target, &|v| {
                d.number(v, Kind::FuelPerDistance, 2)
            }),
            [
                (c.top_speed_in_method_range == Some(false))
                    .then(|| super::conditions::UNRELIABLE_TOP_NOTE.to_string()),
                c.problem.clone(),
            ]
            .into_iter()
            .flatten()
            .collect::<Vec<_>>()
            .join("; "),
        ]);
    }
    out.push_str(&table.to_text("  "));
    out
}

/// One candidate in JSON.
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
}

/// `sweep BOAT`.
pub fn sweep(ctx: &Context, args: &SweepArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let loaded = load_boat(ctx, &args.boat)?;
    let index = match &args.variant {
        Some(label) => variant_indices(&loaded, Some(label))?[0],
        None => loaded
            .vessel
            .active_variant
            .min(loaded.vessel.variants.len() - 1),
    };
    let parameter = sweep_parameter(&loaded, index, args)?;
    let criterion = match args.rank {
        RankBy::Fuel => RankCriterion::LeastFuelPerDistance,
        RankBy::Speed => RankCriterion::HighestTopSpeed,
        RankBy::Efficiency => RankCriterion::HighestPropulsiveEfficiency,
    };
    let options = SweepOptions {
        criterion,
        ..SweepOptions::default()
    };
    let result = run_sweep(&loaded.vessel, index, &parameter, &options).context("sweep")?;
    let label = &loaded.vessel.variants[index].label;
    match args.format {
        PlainFormat::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                boat: &'a str,
                variant: &'a str,
                parameter: &'static str,
                criterion: &'static str,
                target: String,
                target_speed_kn: f64,
                calibration: Option<crate::report::checks::AppliedCalibration>,
                candidates: Vec<CandidateJson>,
                caution: &'static str,
            }
            let nm_per_m = crate::report::NAUTICAL_MILE_M / crate::report::LITRE_M3;
            let doc = Doc {
                boat: &loaded.vessel.name,
                variant: label,
                parameter: result.parameter,
                criterion: result.criterion,
                target: result.target.describe(),
                target_speed_kn: result.target_speed / KNOT_MPS,
                calibration: loaded.applied_calibration(),
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
                        propulsive_efficiency_at_target: finite_or_none(
                            c.propulsive_efficiency_at_target,
                        ),
                        fuel_l_per_nm_at_target: finite_or_none(
                            c.fuel_per_distance_at_target.map(|v| v * nm_per_m),
                        ),
                        problem: c.problem.clone(),
                    })
                    .collect(),
                caution: CAUTION,
            };
            out.write_all(json::to_string(&doc)?.as_bytes())?;
        }
        PlainFormat::Text => {
            let d = Display::new(loaded.units);
            writeln!(out, "{}", loaded.calibration_line())?;
            out.write_all(sweep_text(&result, label, &d).as_bytes())?;
            writeln!(out, "\nCaution: {CAUTION}")?;
        }
    }
    Ok(())
}

/// The calibration of variant `index` against the boat's trial log, fitted to the
/// uncalibrated model (a saved correction is left out, so refitting never compounds it).
pub fn calibration(
    loaded: &LoadedBoat,
    index: usize,
    fit_wake: bool,
) -> anyhow::Result<Calibration> {
    let vessel = &loaded.vessel;
    if vessel.trial.is_empty() {
        anyhow::bail!(
            "boat {:?} has no sea-trial log ([trial] runs) to compare with",
            vessel.name
        );
    }
    let plain = loaded.uncalibrated_vessel()?;
    let options = CalibrationOptions {
        fit: if fit_wake {
            CalibrationFit::ResistanceFactorAndWake
        } else {
            CalibrationFit::ResistanceFactor
        },
        ..CalibrationOptions::default()
    };
    calibrate(&plain.system(index), &plain.trial, &options)
        .with_context(|| format!("sea-trial calibration of {}", vessel.name))
}

/// The RMS speed error (m/s) of the boat as loaded — with its saved correction — at the
/// trial's rpm groups, or `None` when the boat has no saved correction or nothing solved.
pub fn rms_with_saved(loaded: &LoadedBoat, index: usize, cal: &Calibration) -> Option<f64> {
    loaded.doc.calibration.as_ref()?;
    // Compared as the fit is made: the calibrated calm-water model, margins off.
    let mut calm = loaded.vessel.clone();
    calm.resistance = calm.resistance.calm_water();
    let system = calm.system(index);
    let errors: Vec<f64> = cal
        .points
        .iter()
        .filter_map(|p| {
            point_at_engine_rpm(&system, p.engine_rpm)
                .ok()
                .map(|at| at.speed - p.measured_speed)
        })
        .filter(|e| e.is_finite())
        .collect();
    if errors.is_empty() {
        return None;
    }
    Some((errors.iter().map(|e| e * e).sum::<f64>() / errors.len() as f64).sqrt())
}

/// What the fit is compared with, in words.
pub fn comparison_text(loaded: &LoadedBoat, rms_saved: Option<f64>, d: &Display) -> String {
    match (&loaded.doc.calibration, rms_saved) {
        (None, _) => {
            "compared with the uncalibrated model (the boat has no saved calibration)".into()
        }
        (Some(c), rms) => format!(
            "compared with the uncalibrated model, not with the saved calibration (resistance ×{:.3}{}), so a new fit replaces it and never compounds it{}",
            c.resistance_factor,
            c.wake_fraction
                .map(|w| format!(", wake fraction {w:.3}"))
                .unwrap_or_default(),
            rms.map(|r| format!(
                "; with the saved calibration the RMS error is {}",
                d.quantity(r, Kind::Speed)
            ))
            .unwrap_or_default()
        ),
    }
}

/// The calibration as text.
pub fn trial_text(cal: &Calibration, d: &Display) -> String {
    let mut table = Table::new(vec![
        Column::number("engine", "rpm"),
        Column::number("runs", ""),
        Column::number("measured", &d.unit(Kind::Speed)),
        Column::number("predicted", &d.unit(Kind::Speed)),
        Column::number("calibrated", &d.unit(Kind::Speed)),
        Column::number("current", &d.unit(Kind::Speed)),
    ]);
    let opt =
        |v: Option<f64>| finite_or_none(v).map_or("—".into(), |v| d.number(v, Kind::Speed, 2));
    for p in &cal.points {
        table.push(vec![
            format!("{:.0}", p.engine_rpm),
            format!("{}{}", p.runs, if p.two_way { " (two-way)" } else { "" }),
            d.number(p.measured_speed, Kind::Speed, 2),
            opt(p.predicted_before),
            opt(p.predicted_after),
            opt(p.current),
        ]);
    }
    let mut out = table.to_text("  ");
    out.push_str(&format!(
        "  RMS error {} before, {} after; resistance factor {:.3} (uncalibrated model {:.3})",
        d.quantity(cal.rms_before, Kind::Speed),
        d.quantity(cal.rms_after, Kind::Speed),
        cal.resistance_factor,
        cal.resistance_factor_before
    ));
    if let Some(w) = cal.wake_fraction {
        out.push_str(&format!(", wake fraction {w:.3}"));
    }
    out.push('\n');
    out.push_str(&format!(
        "  The factor multiplies the calm, clean-hull resistance at the trial's condition: the trial is compared with the model without the boat's service margin ({}) and fouling ({}), which every prediction then adds on top of the calibrated resistance.\n",
        percent(cal.service_margin, 0),
        percent(cal.fouling, 0)
    ));
    for w in &cal.warnings {
        out.push_str(&format!("  warning: {w}\n"));
    }
    out
}

/// Days since 1970-01-01 as a proleptic Gregorian (year, month, day): H. Hinnant's
/// `civil_from_days` ("chrono-Compatible Low-Level Date Algorithms", 2013).
pub fn civil_from_days(days: i64) -> (i64, u32, u32) {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let day = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let month = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    let year = yoe + era * 400 + i64::from(month <= 2);
    (year, month, day)
}

/// Today's date (UTC) from the system clock as YYYY-MM-DD, if the clock is after 1970.
fn today_iso() -> Option<String> {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .ok()?
        .as_secs();
    let (y, m, d) = civil_from_days((secs / 86_400) as i64);
    Some(format!("{y:04}-{m:02}-{d:02}"))
}

/// The `[calibration]` written by `trial --save`.
fn calibration_doc(loaded: &LoadedBoat, index: usize, cal: &Calibration) -> CalibrationDoc {
    let rpms = cal.points.iter().map(|p| p.engine_rpm);
    let (low, high) = rpms.fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), r| {
        (lo.min(r), hi.max(r))
    });
    let fitted = if cal.wake_fraction.is_some() {
        "resistance factor and wake fraction"
    } else {
        "resistance factor"
    };
    let on = today_iso().map(|d| format!(" on {d}")).unwrap_or_default();
    // Four decimals are far finer than a trial can resolve and keep the file readable.
    let round = |v: f64| (v * 1e4).round() / 1e4;
    CalibrationDoc {
        resistance_factor: round(cal.resistance_factor),
        wake_fraction: cal.wake_fraction.map(round),
        trial_date: loaded.doc.trial.as_ref().and_then(|t| t.date.clone()),
        note: Some(format!(
            "{fitted} fitted{on} by `tidewright trial --save` {CALM_WATER_NOTE} to {} rpm groups from {low:.0} to {high:.0} rpm, screw {}; RMS error {:.3} kn before, {:.3} kn after",
            cal.points.len(),
            loaded.vessel.variants[index].label,
            cal.rms_before / KNOT_MPS,
            cal.rms_after / KNOT_MPS
        )),
    }
}

/// Saves `cal` into the boat's file through the store's atomic save.
fn save_calibration(loaded: &LoadedBoat, index: usize, cal: &Calibration) -> anyhow::Result<Saved> {
    let Origin::File { path, stamp } = &loaded.origin else {
        anyhow::bail!(
            "boat {:?} comes from the built-in demo fleet, which is read-only: run `tidewright init` first to copy it into a profile store, then save the calibration there",
            loaded.profile_name
        );
    };
    let mut doc = loaded.doc.clone();
    doc.calibration = Some(calibration_doc(loaded, index, cal));
    save_boat_file(path, &doc, Some(stamp), false).with_context(|| {
        format!(
            "cannot save the calibration of boat {:?}",
            loaded.profile_name
        )
    })
}

/// `trial BOAT`.
pub fn trial(ctx: &Context, args: &DesignArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let loaded = load_boat(ctx, &args.boat)?;
    let index = match &args.variant {
        Some(label) => variant_indices(&loaded, Some(label))?[0],
        None => loaded
            .vessel
            .active_variant
            .min(loaded.vessel.variants.len() - 1),
    };
    let cal = calibration(&loaded, index, args.fit_wake)?;
    if !(cal.rms_before.is_finite()
        && cal.rms_after.is_finite()
        && cal.resistance_factor.is_finite())
    {
        anyhow::bail!(
            "the sea-trial calibration of {} gave a value that is not a finite number",
            loaded.vessel.name
        );
    }
    let rms_saved = rms_with_saved(&loaded, index, &cal);
    let saved = if args.save {
        Some(save_calibration(&loaded, index, &cal)?)
    } else {
        None
    };
    let label = &loaded.vessel.variants[index].label;
    match args.format {
        PlainFormat::Json => {
            #[derive(Serialize)]
            struct PointJson {
                engine_rpm: f64,
                runs: usize,
                two_way: bool,
                measured_kn: f64,
                predicted_kn: Option<f64>,
                calibrated_kn: Option<f64>,
                current_kn: Option<f64>,
            }
            #[derive(Serialize)]
            struct SavedJson {
                path: String,
                backup: Option<String>,
            }
            #[derive(Serialize)]
            struct Doc<'a> {
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
                saved_calibration: Option<crate::report::checks::AppliedCalibration>,
                rms_with_saved_kn: Option<f64>,
                saved: Option<SavedJson>,
                points: Vec<PointJson>,
                warnings: Vec<String>,
            }
            let kn = |v: Option<f64>| finite_or_none(v.map(|v| v / KNOT_MPS));
            let doc = Doc {
                boat: &loaded.vessel.name,
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
                saved_calibration: loaded.applied_calibration(),
                rms_with_saved_kn: kn(rms_saved),
                saved: saved.as_ref().map(|s| SavedJson {
                    path: s.path.display().to_string(),
                    backup: s.backup.as_ref().map(|b| b.display().to_string()),
                }),
                points: cal
                    .points
                    .iter()
                    .map(|p| PointJson {
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
            };
            out.write_all(json::to_string(&doc)?.as_bytes())?;
        }
        PlainFormat::Text => {
            let d = Display::new(loaded.units);
            writeln!(
                out,
                "{}: sea trial against the prediction (screw {label})",
                loaded.vessel.name
            )?;
            writeln!(out, "  {}", comparison_text(&loaded, rms_saved, &d))?;
            out.write_all(trial_text(&cal, &d).as_bytes())?;
            match &saved {
                Some(s) => {
                    writeln!(out, "Saved the correction in {}", s.path.display())?;
                    if let Some(b) = &s.backup {
                        writeln!(out, "  previous version kept as {}", b.display())?;
                    }
                    writeln!(
                        out,
                        "  every later report, cruise, pitch, sweep, conditions and export applies it"
                    )?;
                }
                None => writeln!(
                    out,
                    "Not saved: `tidewright trial {} --save` writes it into the boat's [calibration]",
                    args.boat
                )?,
            }
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn civil_dates_from_day_counts() {
        // Day numbers checked against the Unix epoch and the Gregorian calendar: 1970-01-01 is
        // day 0, 2000-03-01 day 11 017 (after a century leap day), 2024-02-29 day 19 782.
        assert_eq!(civil_from_days(0), (1970, 1, 1));
        assert_eq!(civil_from_days(11_017), (2000, 3, 1));
        assert_eq!(civil_from_days(11_016), (2000, 2, 29));
        assert_eq!(civil_from_days(19_782), (2024, 2, 29));
        assert_eq!(civil_from_days(-1), (1969, 12, 31));
    }
}
