//! Commands on one boat: `report`, `cruise`, `pitch`, `sweep`, `trial`, `export`.

use std::io::Write;

use anyhow::Context as _;

use super::{
    Context, CruiseArgs, ExportArgs, ExportFormat, PlainFormat, ReportArgs, ReportFormat,
    UsageError, load_study, parse_rpm, variant_or_active,
};
use crate::propulsion::solver::cruise::{cruise_at_rpm, cruise_at_speed};
use crate::report::documents::{cruise_json, cruise_line};
use crate::report::export::{ExportFile, design_sections, document as export_document};
use crate::report::html::{HTML_FILE, to_html};
use crate::report::model::BoatReport;
use crate::report::{CAUTION, Display, json};
use crate::units::{self, Kind};

/// Charts use this many rpm steps between idle and rated.
const CHART_STEPS: f64 = 40.0;

/// `report BOAT`.
pub fn report(ctx: &Context, args: &ReportArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let study = load_study(ctx, &args.boat)?;
    if args.variant.is_some() {
        variant_or_active(&study, args.variant.as_deref())?;
    }
    let step = args
        .step
        .as_deref()
        .map(|s| parse_rpm(s, "--step"))
        .transpose()?;
    let report = BoatReport::of_study(&study, args.variant.as_deref(), step)
        .map_err(|e| UsageError(e.to_string()))?;
    let text = match args.format {
        ReportFormat::Text => report.to_text(study.units),
        ReportFormat::Csv => report.to_csv(study.units),
        ReportFormat::Md => report.to_markdown(study.units),
        ReportFormat::Json => json::to_string(&report.to_json())?,
    };
    out.write_all(text.as_bytes())?;
    Ok(())
}

/// `resistance BOAT [--to SPEED] [--step SPEED]`.
pub fn resistance(
    ctx: &Context,
    args: &super::ResistanceArgs,
    out: &mut dyn Write,
) -> anyhow::Result<()> {
    let speed = |text: &Option<String>, option: &str| -> anyhow::Result<Option<f64>> {
        let Some(text) = text else { return Ok(None) };
        let value =
            units::parse(text, Kind::Speed).map_err(|e| UsageError(format!("{option}: {e}")))?;
        if !(value.is_finite() && value > 0.0) {
            return Err(UsageError(format!(
                "{option}: expected a positive boat speed such as 12kn, got {text:?}"
            ))
            .into());
        }
        Ok(Some(value))
    };
    let (to, step) = (speed(&args.to, "--to")?, speed(&args.step, "--step")?);
    let study = load_study(ctx, &args.boat)?;
    let curve = study
        .resistance_curve(to, step)
        .map_err(|e| UsageError(format!("{}: {e}", study.vessel.name)))?;
    use crate::report::resistance as writer;
    let text = match args.format {
        ReportFormat::Text => writer::text(&curve, study.units),
        ReportFormat::Csv => writer::csv(&curve, study.units),
        ReportFormat::Md => writer::markdown(&curve, study.units),
        ReportFormat::Json => json::to_string(&writer::json(&curve))?,
    };
    out.write_all(text.as_bytes())?;
    Ok(())
}

/// `cruise BOAT --speed S | --rpm N`.
pub fn cruise(ctx: &Context, args: &CruiseArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let study = load_study(ctx, &args.boat)?;
    let index = variant_or_active(&study, args.variant.as_deref())?;
    let vessel = &study.vessel;
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
    let Some(doc) = cruise_json(&study, index, &point) else {
        anyhow::bail!(
            "the cruise point of {} has a value that is not a finite number",
            vessel.name
        );
    };
    match args.format {
        PlainFormat::Text => {
            // Name the screw: the file's active variant can change with a save from the TUI.
            let label = &vessel.variants[index].label;
            let screw = if args.variant.is_some() {
                format!("Screw {label}")
            } else {
                format!("Screw {label} (the boat file's active variant)")
            };
            writeln!(
                out,
                "{}",
                cruise_line(
                    &screw,
                    &point,
                    &Display::new(study.units),
                    &vessel.resistance
                )
            )?;
            writeln!(out, "{}", study.calibration_line())?;
            writeln!(out, "Caution: {CAUTION}")?;
        }
        PlainFormat::Json => out.write_all(json::to_string(&doc)?.as_bytes())?,
    }
    Ok(())
}

/// `export BOAT --out DIR [--format md|html]`.
pub fn export(ctx: &Context, args: &ExportArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let study = load_study(ctx, &args.boat)?;
    let vessel = &study.vessel;
    let report = BoatReport::of_study(&study, None, None)?;
    let engine = &vessel.engine;
    let fine_step = ((engine.rated_rpm - engine.idle_rpm) / CHART_STEPS).max(1.0);
    let curves = BoatReport::curves_of_study(&study, fine_step)?;
    // With a sea-trial calibration the speed chart also shows the curves before the fit.
    let before_fit = match &study.calibration {
        Some(_) => Some(BoatReport::curves_of_study(
            &study.without_calibration()?,
            fine_step,
        )?),
        None => None,
    };
    let mut sections = design_sections(&study, &Display::new(study.units));
    let shortlist = crate::report::shortlist::export_of_store(&study, &super::store::store(ctx));
    sections.push(shortlist.0);
    let mut doc = export_document(
        vessel,
        &report,
        &curves,
        before_fit.as_ref(),
        &sections,
        study.units,
    );
    doc.charts.extend(shortlist.1);
    let files = match args.format {
        ExportFormat::Md => doc.into_files(),
        ExportFormat::Html => vec![ExportFile {
            name: HTML_FILE.into(),
            contents: to_html(&doc),
        }],
    };
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
