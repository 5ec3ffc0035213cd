//! `trial BOAT --import FILE`: an instrument log's steady runs, then the fit `trial` makes.

use std::io::Write;

use anyhow::Context as _;
use serde::Serialize;

use super::{Context, DesignArgs, LogFormatArg, PlainFormat, UsageError, load_study};
use crate::instruments::LogFormat;
use crate::instruments::runs::RunOptions;
use crate::report::import::{ImportJson, import_text};
use crate::report::json;
use crate::study::import::TrialImport;

/// The run finder's options from the command line, the documented defaults otherwise.
fn run_options(args: &DesignArgs) -> anyhow::Result<RunOptions> {
    let mut options = RunOptions::default();
    if let Some(s) = args.min_run {
        if !(s.is_finite() && s > 0.0 && s <= 3600.0) {
            return Err(UsageError(format!(
                "--min-run: expected seconds above 0 and at most 3600, got {s}"
            ))
            .into());
        }
        options.min_duration_s = s;
    }
    if let Some(rpm) = args.rpm_tolerance {
        if !(rpm.is_finite() && rpm > 0.0 && rpm <= 500.0) {
            return Err(UsageError(format!(
                "--rpm-tolerance: expected rpm above 0 and at most 500, got {rpm}"
            ))
            .into());
        }
        // The rpm given is the tolerance at every rpm: the relative one is turned off.
        options.rpm_tolerance_rpm = rpm;
        options.rpm_tolerance_fraction = 0.0;
    }
    if let Some(kn) = args.max_scatter {
        if !(kn.is_finite() && kn > 0.0 && kn <= 2.0) {
            return Err(UsageError(format!(
                "--max-scatter: expected knots above 0 and at most 2, got {kn}"
            ))
            .into());
        }
        options.max_speed_std = kn * crate::units::KNOT_MPS;
    }
    Ok(options)
}

/// `trial BOAT --import FILE`.
pub fn trial(ctx: &Context, args: &DesignArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let Some(path) = &args.import else {
        return super::design::trial(ctx, args, out);
    };
    let options = run_options(args)?;
    let mut study = load_study(ctx, &args.boat)?;
    let content = std::fs::read(path)
        .with_context(|| format!("cannot read the instrument log {}", path.display()))?;
    let format = args.log_format.map(|f| match f {
        LogFormatArg::Nmea => LogFormat::Nmea,
        LogFormatArg::Csv => LogFormat::Csv,
    });
    let source = path.display().to_string();
    let imported = TrialImport::read(&source, &content, format, &options)?;
    let usable = study.use_imported_trial(&imported);
    match args.format {
        PlainFormat::Text => {
            out.write_all(import_text(&imported).as_bytes())?;
            usable?;
            writeln!(out)?;
            super::design::trial_of(&study, args, out)
        }
        PlainFormat::Json => {
            #[derive(Serialize)]
            struct Doc {
                log: ImportJson,
                fit: Option<serde_json::Value>,
            }
            let mut fit = Vec::new();
            let fitted = match usable {
                Ok(()) => super::design::trial_of(&study, args, &mut fit),
                Err(e) => Err(e.into()),
            };
            let doc = Doc {
                log: ImportJson::of(&imported),
                fit: fitted
                    .as_ref()
                    .ok()
                    .and_then(|()| serde_json::from_slice(&fit).ok()),
            };
            // The log's summary is written even when nothing could be fitted.
            out.write_all(json::to_string(&doc)?.as_bytes())?;
            fitted
        }
    }
}
