//! Commands on one boat: `report`, `cruise`, `pitch`, `sweep`, `trial`, `export`.

use std::io::Write;

use anyhow::Context as _;

use super::design;
use super::store::{LoadedBoat, load_boat};
use super::{
    Context, CruiseArgs, ExportArgs, PlainFormat, ReportArgs, ReportFormat, UsageError, parse_rpm,
};
use crate::profile::Rotation;
use crate::propulsion::solver::cruise::{cruise_at_rpm, cruise_at_speed};
use crate::propulsion::solver::pitch::PitchOptions;
use crate::report::boat::{BoatReport, PointJson, cruise_summary};
use crate::report::export::{Section, export as export_files};
use crate::report::{CAUTION, Display, json};
use crate::units::{self, Kind};

/// Charts use this many rpm steps between idle and rated.
const CHART_STEPS: f64 = 40.0;

fn variant_index(loaded: &LoadedBoat, label: Option<&str>) -> anyhow::Result<usize> {
    let vessel = &loaded.vessel;
    match label {
        None => Ok(vessel
            .active_variant
            .min(vessel.variants.len().saturating_sub(1))),
        Some(label) => labelled_variant(loaded, label),
    }
}

/// The index of the variant `--variant LABEL` names, or a usage error listing the labels.
pub(crate) fn labelled_variant(loaded: &LoadedBoat, label: &str) -> anyhow::Result<usize> {
    let vessel = &loaded.vessel;
    vessel.variant_by_label(label).ok_or_else(|| {
        UsageError(format!(
            "--variant: boat {:?} has no screw variant {label:?}; its variants are: {}",
            vessel.name,
            vessel.variant_labels()
        ))
        .into()
    })
}

/// `report BOAT`.
pub fn report(ctx: &Context, args: &ReportArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let loaded = load_boat(ctx, &args.boat)?;
    if let Some(label) = &args.variant {
        variant_index(&loaded, Some(label))?;
    }
    let step = args
        .step
        .as_deref()
        .map(|s| parse_rpm(s, "--step"))
        .transpose()?;
    let report = BoatReport::build(
        &loaded.vessel,
        args.variant.as_deref(),
        step,
        &loaded.warnings,
    )
    .map_err(|e| UsageError(e.to_string()))?
    .with_calibration(loaded.applied_calibration())
    .with_checks(&loaded.vessel, &loaded.check_inputs());
    let text = match args.format {
        ReportFormat::Text => report.to_text(loaded.units),
        ReportFormat::Csv => report.to_csv(loaded.units),
        ReportFormat::Md => report.to_markdown(loaded.units),
        ReportFormat::Json => json::to_string(&report.to_json())?,
    };
    out.write_all(text.as_bytes())?;
    Ok(())
}

/// The JSON document of `cruise`.
#[derive(Debug, serde::Serialize)]
struct CruiseJson<'a> {
    boat: &'a str,
    variant: &'a str,
    #[serde(flatten)]
    point: PointJson,
    calibration: Option<crate::report::checks::AppliedCalibration>,
    caution: &'static str,
}

/// `cruise BOAT --speed S | --rpm N`.
pub fn cruise(ctx: &Context, args: &CruiseArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let loaded = load_boat(ctx, &args.boat)?;
    let index = variant_index(&loaded, args.variant.as_deref())?;
    let vessel = &loaded.vessel;
    let system = vessel.system(index);
    let point = match (&args.speed, &args.rpm) {
        (Some(speed), _) => {
            let speed = units::parse(speed, Kind::Speed)
                .map_err(|e| UsageError(format!("--speed: {e}")))?;
            if !(speed.is_finite() && speed > 0.0) {
                return Err(UsageError(format!(
                    "--speed: expected a positive boat speed, got {speed} m/s"
                ))
                .into());
            }
            cruise_at_speed(&system, &vessel.trip, speed)
        }
        (None, Some(rpm)) => cruise_at_rpm(&system, &vessel.trip, parse_rpm(rpm, "--rpm")?),
        (None, None) => return Err(UsageError("give --speed or --rpm".into()).into()),
    }
    .with_context(|| {
        format!(
            "cruise point of {} with screw {}",
            vessel.name, vessel.variants[index].label
        )
    })?;
    let json_point = PointJson::from(&point);
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
    if !all_finite {
        anyhow::bail!(
            "the cruise point of {} has a value that is not a finite number",
            vessel.name
        );
    }
    match args.format {
        PlainFormat::Text => {
            let d = Display::new(loaded.units);
            let mut line = cruise_summary(&point, &d);
            if point.beyond_full_load {
                line.push_str(" — past the engine's full-load curve: not reachable");
            }
            if !point.point.in_method_range {
                line.push_str(&format!(
                    " — UNRELIABLE: Fn {:.2}, outside the resistance method's range; a sea trial decides",
                    point.point.froude
                ));
            }
            writeln!(out, "{line}")?;
            writeln!(out, "{}", loaded.calibration_line())?;
            writeln!(out, "Caution: {CAUTION}")?;
        }
        PlainFormat::Json => {
            let doc = CruiseJson {
                boat: &vessel.name,
                variant: &vessel.variants[index].label,
                point: json_point,
                calibration: loaded.applied_calibration(),
                caution: CAUTION,
            };
            out.write_all(json::to_string(&doc)?.as_bytes())?;
        }
    }
    Ok(())
}

/// The sections of the export that come from the design stage: the recommended screw, the
/// pitch of every variant and the sea-trial calibration.
fn design_sections(loaded: &LoadedBoat, d: &Display) -> Vec<Section> {
    let vessel = &loaded.vessel;
    let mut sections = Vec::new();
    let active = vessel
        .active_variant
        .min(vessel.variants.len().saturating_sub(1));
    let indices: Vec<usize> = (0..vessel.variants.len()).collect();
    match design::recommendations(loaded, &indices, &PitchOptions::default()) {
        Ok(recs) => {
            let mut body = String::new();
            if let Some(rec) = recs.get(active) {
                let g = vessel.variants[active].screw.geometry();
                let hand = match loaded.doc.variants.get(active).and_then(|v| v.rotation) {
                    Some(Rotation::Right) => ", right hand",
                    Some(Rotation::Left) => ", left hand",
                    None => ", hand of rotation not given",
                };
                match rec.recommended_pitch.filter(|p| p.is_finite()) {
                    Some(p) => body.push_str(&format!(
                        "**Recommended screw** (from variant {}): {} blades × {} diameter × {} pitch, AE/A0 {:.2}{hand}.\n\n",
                        rec.label,
                        g.blades,
                        d.quantity(g.diameter, Kind::ScrewLength),
                        d.quantity(p, Kind::ScrewLength),
                        g.area_ratio
                    )),
                    None => body.push_str(&format!("No pitch could be recommended for the active variant {}.\n\n", rec.label)),
                }
            }
            for rec in &recs {
                body.push_str("```text\n");
                body.push_str(&design::pitch_text(rec, d));
                body.push_str("```\n\n");
            }
            sections.push(Section {
                title: "Pitch recommendation".into(),
                body,
            });
        }
        Err(e) => sections.push(Section {
            title: "Pitch recommendation".into(),
            body: format!("Not available: {e:#}"),
        }),
    }
    let what_if = super::conditions::what_if(
        loaded,
        active,
        &super::conditions::WhatIfSettings::default(),
    );
    sections.push(Section {
        title: "What-if conditions".into(),
        body: match what_if {
            Ok(w) => w.to_markdown(d),
            Err(e) => format!("Not available: {e:#}"),
        },
    });
    if !vessel.trial.is_empty() {
        let body = match design::calibration(loaded, active, false) {
            Ok(cal) => format!(
                "{}.\n\n{}.\n\n```text\n{}```\n",
                loaded.calibration_line(),
                design::comparison_text(loaded, design::rms_with_saved(loaded, active, &cal), d),
                design::trial_text(&cal, d)
            ),
            Err(e) => format!("Not available: {e:#}"),
        };
        sections.push(Section {
            title: "Sea-trial calibration".into(),
            body,
        });
    }
    sections
}

/// `export BOAT --out DIR`.
pub fn export(ctx: &Context, args: &ExportArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let loaded = load_boat(ctx, &args.boat)?;
    let vessel = &loaded.vessel;
    let report = BoatReport::build(vessel, None, None, &loaded.warnings)?
        .with_calibration(loaded.applied_calibration())
        .with_checks(vessel, &loaded.check_inputs());
    let engine = &vessel.engine;
    let fine_step = ((engine.rated_rpm - engine.idle_rpm) / CHART_STEPS).max(1.0);
    let curves = BoatReport::build(vessel, None, Some(fine_step), &[])?;
    let sections = design_sections(&loaded, &Display::new(loaded.units));
    let files = export_files(vessel, &report, &curves, &sections, loaded.units);
    std::fs::create_dir_all(&args.out)
        .with_context(|| format!("cannot create {}", args.out.display()))?;
    for file in &files {
        let path = args.out.join(&file.name);
        std::fs::write(&path, &file.contents)
            .with_context(|| format!("cannot write {}", path.display()))?;
        writeln!(out, "wrote {}", path.display())?;
    }
    Ok(())
}
