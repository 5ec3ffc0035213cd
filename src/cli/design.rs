//! Design commands on one boat: `pitch`, `sweep` and `trial`.

use std::io::Write;

use super::{
    Context, DesignArgs, PitchArgs, PlainFormat, RankBy, SweepArgs, SweepOver, UsageError,
    load_study, variant_or_active, variants_or_all,
};
use crate::profile::Origin;
use crate::profile::store::{Saved, save_boat_file};
use crate::propulsion::solver::pitch::{PitchOptions, PitchTarget, RepitchLimit};
use crate::propulsion::solver::sweep::{RankCriterion, SweepOptions, SweepParameter};
use crate::propulsion::solver::trial::Calibration;
use crate::propulsion::solver::trial::FroudeFit;
use crate::report::design::{comparison_text, froude_fit_line, pitch_text, sweep_text, trial_text};
use crate::report::documents::{pitch_json, sweep_json, trial_json};
use crate::report::{CAUTION, Display, json};
use crate::study::Study;
use crate::study::design::{FittedBy, SweepInputError, SweepOver as Axis};
use crate::units::Kind;
use anyhow::Context as _;

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
            out.write_all(json::to_string(&pitch_json(&study, &recs))?.as_bytes())?;
        }
        PlainFormat::Text => {
            let d = Display::new(study.units);
            writeln!(out, "{}: pitch recommendation", study.vessel.name)?;
            writeln!(out, "{}", study.calibration_line())?;
            for r in &recs {
                writeln!(out)?;
                out.write_all(pitch_text(r, &d, &study).as_bytes())?;
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
        (None, _) => None,
        (Some(text), Axis::Diameter) => {
            return Err(UsageError(format!(
                "--values {text:?}: a diameter sweep runs from the current screw up to the aperture \
                 (installation.max_screw_diameter less tip_clearance) and takes no list; leave --values out"
            ))
            .into());
        }
        (Some(text), _) => {
            // Gear ratios may be written "2.5:1" as on a gearbox plate.
            let parse = |item: &str| match axis {
                Axis::GearRatio => crate::units::parse_ratio(item).ok(),
                _ => item.parse::<f64>().ok(),
            };
            let list: Option<Vec<f64>> = text
                .split(',')
                .map(str::trim)
                .filter(|s| !s.is_empty())
                .map(parse)
                .collect();
            match list {
                Some(v) if !v.is_empty() && v.iter().all(|x| x.is_finite() && *x > 0.0) => Some(v),
                _ => return Err(UsageError(format!(
                    "--values: expected a comma-separated list of positive numbers (gear ratios as 2.5 or 2.5:1), got {text:?}"
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
    let (on, trial_index) = study.trial_variant(index);
    let label = on.label(trial_index);
    match args.format {
        PlainFormat::Json => {
            out.write_all(json::to_string(&sweep_json(&study, label, &result))?.as_bytes())?;
        }
        PlainFormat::Text => {
            let d = Display::new(study.units);
            writeln!(out, "{}", study.calibration_line())?;
            out.write_all(
                sweep_text(&result, label, &d, study.vessel.installation.shafts).as_bytes(),
            )?;
            writeln!(out, "\nCaution: {CAUTION}")?;
        }
    }
    Ok(())
}

/// Saves `cal` into the boat's file through the store's atomic save.
fn save_calibration(
    study: &Study,
    index: usize,
    cal: &Calibration,
    by_froude: Option<&FroudeFit>,
) -> anyhow::Result<Saved> {
    let Some(Origin::File { path, stamp }) = &study.origin else {
        anyhow::bail!(
            "boat {:?} comes from the built-in demo fleet, which is read-only: run `tidewright init` first to copy it into a profile store, then save the calibration there",
            study.profile_name
        );
    };
    let mut doc = study.doc.clone();
    doc.calibration = Some(match by_froude {
        Some(fit) => study.froude_calibration_doc(index, cal, fit, FittedBy::Command),
        None => study.calibration_doc(index, cal, FittedBy::Command),
    });
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
    let froude = study
        .froude_calibration(index)
        .map_err(|e| format!("{:#}", e.root_cause()));
    if args.by_froude
        && let Err(why) = &froude
    {
        return Err(UsageError(format!("--by-froude: no two-parameter fit: {why}")).into());
    }
    let saved = if args.save {
        let fit = froude.as_ref().ok().filter(|_| args.by_froude);
        Some(save_calibration(study, index, &cal, fit)?)
    } else {
        None
    };
    let label = &study.vessel.variants[index].label;
    match args.format {
        PlainFormat::Json => {
            let doc = trial_json(study, label, &cal, &froude, rms_saved, saved.as_ref());
            out.write_all(json::to_string(&doc)?.as_bytes())?;
        }
        PlainFormat::Text => {
            let d = Display::new(study.units);
            writeln!(
                out,
                "{}: sea trial against the prediction ({})",
                study.vessel.name,
                study.trial_installation_words(index)
            )?;
            if study.baseline.is_some() {
                writeln!(
                    out,
                    "  the runs were made with the {} installation and are fitted through it; the factor belongs to the hull and applies to both sides",
                    study.doc.trial_side().name()
                )?;
            }
            writeln!(out, "  {}", comparison_text(study, rms_saved, &d))?;
            out.write_all(trial_text(&cal, &d).as_bytes())?;
            writeln!(out, "  {}", froude_fit_line(&cal, &froude, &d))?;
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
