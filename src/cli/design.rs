//! Design commands on one boat: `pitch`, `sweep` and `trial`.

use std::io::Write;

use anyhow::Context as _;
use serde::Serialize;

use super::{
    Context, DesignArgs, PitchArgs, PlainFormat, RankBy, SweepArgs, SweepOver, UsageError,
    load_study, variant_or_active, variants_or_all,
};
use crate::profile::Origin;
use crate::profile::store::{Saved, save_boat_file};
use crate::propulsion::solver::pitch::{PitchOptions, PitchTarget, RepitchLimit};
use crate::propulsion::solver::sweep::{RankCriterion, SweepOptions, SweepParameter};
use crate::propulsion::solver::trial::Calibration;
use crate::report::design::{
    PitchJson, comparison_text, finite_or_none, pitch_text, sweep_text, trial_text,
};
use crate::report::{CAUTION, Display, KNOT_MPS, json};
use crate::study::Study;
use crate::study::design::{FittedBy, SweepInputError, SweepOver as Axis};
use crate::units::Kind;

/// The pitch options of the command line for `study`; a `--light-running` of 0 or more also
/// becomes the boat's light-running margin, so the verdict's band follows the target asked for.
pub fn pitch_options(args: &PitchArgs, study: &mut Study) -> anyhow::Result<PitchOptions> {
    let rated_rpm = study.vessel.engine.rated_rpm;
    let target = match (args.light_running, args.absorb) {
        (Some(rpm), _) if !rpm.is_finite() => {
            return Err(
                UsageError("--light-running: expected an rpm margin such as 50".into()).into(),
            );
        }
        (Some(rpm), _) if rpm >= 0.0 && rpm < 0.2 * rated_rpm => {
            study.vessel.match_criteria.light_running = rpm / rated_rpm;
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
    let mut repitch: RepitchLimit = study.vessel.repitch;
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

/// `pitch BOAT`.
pub fn pitch(ctx: &Context, args: &PitchArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let mut study = load_study(ctx, &args.boat)?;
    let indices = variants_or_all(&study, args.variant.as_deref())?;
    let options = pitch_options(args, &mut study)?;
    let recs = study.recommendations(&indices, &options)?;
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
                boat: study.vessel.name.clone(),
                calibration: study.calibration.clone(),
                variants: recs.iter().map(PitchJson::from).collect(),
                caution: CAUTION,
            };
            out.write_all(json::to_string(&doc)?.as_bytes())?;
        }
        PlainFormat::Text => {
            let d = Display::new(study.units);
            writeln!(out, "{}: pitch recommendation", study.vessel.name)?;
            writeln!(out, "{}", study.calibration_line())?;
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
    study: &Study,
    index: usize,
    args: &SweepArgs,
) -> anyhow::Result<SweepParameter> {
    let axis = match args.over {
        SweepOver::Diameter => Axis::Diameter,
        SweepOver::Gear => Axis::GearRatio,
        SweepOver::Blades => Axis::Blades,
        SweepOver::Area => Axis::AreaRatio,
    };
    // A diameter sweep runs up to the aperture and takes no list of values.
    let values = match (&args.values, axis) {
        (None, _) | (_, Axis::Diameter) => None,
        (Some(text), _) => {
            let list: Result<Vec<f64>, _> = text
                .split(',')
                .map(str::trim)
                .filter(|s| !s.is_empty())
                .map(str::parse::<f64>)
                .collect();
            match list {
                Ok(v) if !v.is_empty() && v.iter().all(|x| x.is_finite() && *x > 0.0) => Some(v),
                _ => return Err(UsageError(format!(
                    "--values: expected a comma-separated list of positive numbers, got {text:?}"
                ))
                .into()),
            }
        }
    };
    study
        .sweep_parameter(index, axis, values)
        .map_err(|e| match e {
            SweepInputError::FractionalBlades => UsageError(format!("--values: {e}")).into(),
            other => anyhow::Error::new(other),
        })
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
    let study = load_study(ctx, &args.boat)?;
    let index = variant_or_active(&study, args.variant.as_deref())?;
    let parameter = sweep_parameter(&study, index, args)?;
    let criterion = match args.rank {
        RankBy::Fuel => RankCriterion::LeastFuelPerDistance,
        RankBy::Speed => RankCriterion::HighestTopSpeed,
        RankBy::Efficiency => RankCriterion::HighestPropulsiveEfficiency,
    };
    let options = SweepOptions {
        criterion,
        ..SweepOptions::default()
    };
    let result = study.sweep(index, &parameter, &options)?;
    let label = &study.vessel.variants[index].label;
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
                boat: &study.vessel.name,
                variant: label,
                parameter: result.parameter,
                criterion: result.criterion,
                target: result.target.describe(),
                target_speed_kn: result.target_speed / KNOT_MPS,
                calibration: study.calibration.clone(),
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
            let d = Display::new(study.units);
            writeln!(out, "{}", study.calibration_line())?;
            out.write_all(sweep_text(&result, label, &d).as_bytes())?;
            writeln!(out, "\nCaution: {CAUTION}")?;
        }
    }
    Ok(())
}

/// Saves `cal` into the boat's file through the store's atomic save.
fn save_calibration(study: &Study, index: usize, cal: &Calibration) -> anyhow::Result<Saved> {
    let Some(Origin::File { path, stamp }) = &study.origin else {
        anyhow::bail!(
            "boat {:?} comes from the built-in demo fleet, which is read-only: run `tidewright init` first to copy it into a profile store, then save the calibration there",
            study.profile_name
        );
    };
    let mut doc = study.doc.clone();
    doc.calibration = Some(study.calibration_doc(index, cal, FittedBy::Command));
    save_boat_file(path, &doc, Some(stamp), false).with_context(|| {
        format!(
            "cannot save the calibration of boat {:?}",
            study.profile_name
        )
    })
}

/// `trial BOAT`.
pub fn trial(ctx: &Context, args: &DesignArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let study = load_study(ctx, &args.boat)?;
    trial_of(&study, args, out)
}

/// The fit of `study`'s trial log, as `trial` prints and saves it.
pub(super) fn trial_of(
    study: &Study,
    args: &DesignArgs,
    out: &mut dyn Write,
) -> anyhow::Result<()> {
    let index = variant_or_active(study, args.variant.as_deref())?;
    let cal = study.calibration(index, args.fit_wake)?;
    if !(cal.rms_before.is_finite()
        && cal.rms_after.is_finite()
        && cal.resistance_factor.is_finite())
    {
        anyhow::bail!(
            "the sea-trial calibration of {} gave a value that is not a finite number",
            study.vessel.name
        );
    }
    let rms_saved = study.rms_with_saved(index, &cal);
    let saved = if args.save {
        Some(save_calibration(study, index, &cal)?)
    } else {
        None
    };
    let label = &study.vessel.variants[index].label;
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
            let d = Display::new(study.units);
            writeln!(
                out,
                "{}: sea trial against the prediction (screw {label})",
                study.vessel.name
            )?;
            writeln!(out, "  {}", comparison_text(study, rms_saved, &d))?;
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
                    "Not saved: `tidewright trial {}{} --save` writes it into the boat's [calibration]",
                    args.boat,
                    args.import
                        .as_ref()
                        .map(|f| format!(" --import {}", f.display()))
                        .unwrap_or_default()
                )?,
            }
        }
    }
    Ok(())
}
