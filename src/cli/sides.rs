//! `installations BOAT [--swap]`: the installation in the boat now, the planned one and the
//! earlier ones; `--swap` marks the repower done (the planned side becomes the as-found one,
//! the old one goes into a dated `[[history]]`).

use std::io::Write;

use anyhow::Context as _;
use clap::Args;
use serde::Serialize;

use super::{Context, PlainFormat, UsageError, load_study};
use crate::profile::Origin;
use crate::profile::store::save_boat_file;
use crate::report::baseline::{BaselineJson, baseline_json, figures_line, installation_words};
use crate::report::{CAUTION, Display, json};
use crate::study::Study;
use crate::study::baseline::{Headline, SwapError};
use crate::study::solve::SolveOptions;

/// Arguments of `installations`.
#[derive(Debug, Args)]
pub struct InstallationsArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// Mark the repower done: the planned engine, gear and active screw become the as-found
    /// installation and the old one is kept in a dated [[history]] entry (saved; NAME.toml.bak
    /// keeps the previous file).
    #[arg(long)]
    pub swap: bool,
    /// The day the repower was done, YYYY-MM-DD (default: today).
    #[arg(long, value_name = "DAY", requires = "swap")]
    pub date: Option<String>,
    /// Output format.
    #[arg(long, value_enum, default_value_t = PlainFormat::Text)]
    pub format: PlainFormat,
}

/// The JSON of `installations`.
#[derive(Debug, Serialize)]
struct InstallationsJson {
    boat: String,
    as_found: Option<BaselineJson>,
    planned: PlannedJson,
    history: Vec<HistoryJson>,
    swapped_on: Option<String>,
    caution: &'static str,
}

#[derive(Debug, Serialize)]
struct PlannedJson {
    engine: String,
    gear_ratio: f64,
    variant: String,
    #[serde(flatten)]
    figures: crate::report::baseline::HeadlineJson,
}

#[derive(Debug, Serialize)]
struct HistoryJson {
    until: String,
    engine: String,
    gear_ratio: f64,
    screw: String,
    trial_runs: usize,
}

/// `installations BOAT [--swap] [--date DAY]`.
pub fn installations(
    ctx: &Context,
    args: &InstallationsArgs,
    out: &mut dyn Write,
) -> anyhow::Result<()> {
    let mut study = load_study(ctx, &args.boat)?;
    let mut swapped_on = None;
    if args.swap {
        let date = match &args.date {
            Some(d) => d.clone(),
            None => crate::study::design::today_iso()
                .context("the system clock is before 1970: give --date YYYY-MM-DD")?,
        };
        let doc = study.repower_done(&date).map_err(|e| match e {
            SwapError::BadDate(_) => anyhow::Error::new(UsageError(e.to_string())),
            other => anyhow::Error::new(other),
        })?;
        let Some(Origin::File { path, stamp }) = &study.origin else {
            anyhow::bail!(
                "boat {:?} comes from the built-in demo fleet, which is read-only: run `tidewright init` first to copy it into a profile store",
                study.profile_name
            );
        };
        let saved = save_boat_file(path, &doc, Some(stamp), false)
            .with_context(|| format!("cannot save boat {:?}", study.profile_name))?;
        writeln!(
            out,
            "Marked the repower done on {date}: {} is the installation in the boat now; the old one is in [[history]] (saved {})",
            study.vessel.engine.name,
            saved.path.display()
        )?;
        study = load_study(ctx, &args.boat)?;
        swapped_on = Some(date);
    }
    let d = Display::new(study.units);
    let index = crate::study::active_variant(&study.vessel);
    let planned = Headline::of(&study.solve_variant(index, &SolveOptions::default()));
    let base = study.baseline_figures();
    match args.format {
        PlainFormat::Json => {
            let doc = InstallationsJson {
                boat: study.vessel.name.clone(),
                as_found: base.as_ref().map(baseline_json),
                planned: PlannedJson {
                    engine: study.doc.engine.clone(),
                    gear_ratio: study.vessel.installation.gear_ratio,
                    variant: study.label(index).to_string(),
                    figures: crate::report::baseline::headline_json(&planned),
                },
                history: study
                    .doc
                    .history
                    .iter()
                    .map(|h| HistoryJson {
                        until: h.until.clone(),
                        engine: h.engine.clone(),
                        gear_ratio: h.gear_ratio,
                        screw: h.screw.clone(),
                        trial_runs: h.trial.as_ref().map_or(0, |t| t.runs.len()),
                    })
                    .collect(),
                swapped_on,
                caution: CAUTION,
            };
            out.write_all(json::to_string(&doc)?.as_bytes())?;
        }
        PlainFormat::Text => {
            writeln!(out, "{}: installations", study.vessel.name)?;
            out.write_all(sides_text(&study, &planned, &d).as_bytes())?;
            writeln!(out, "\nCaution: {CAUTION}")?;
        }
    }
    Ok(())
}

/// Both sides and the history in words.
fn sides_text(study: &Study, planned: &Headline, d: &Display) -> String {
    let index = crate::study::active_variant(&study.vessel);
    let mut out = String::new();
    match study.baseline_figures() {
        Some(b) => {
            out.push_str(&format!(
                "  in the boat now (as found): {}\n    {}\n",
                installation_words(&b),
                figures_line(&b.figures, d, false)
            ));
        }
        None if study.doc.as_found.is_some() => out.push_str(
            "  in the boat now (as found): the [as_found] engine sheet could not be read\n",
        ),
        None => out.push_str(
            "  no [as_found] installation: the file's one installation is both the boat today and the plan\n",
        ),
    }
    out.push_str(&format!(
        "  planned: {} on {:.2}:1 with screw {}\n    {}\n",
        study.vessel.engine.name,
        study.vessel.installation.gear_ratio,
        study.label(index),
        figures_line(planned, d, false)
    ));
    if let Some(w) = &study.weight_change {
        out.push_str(&format!("    {}\n", w.words(study.units)));
    }
    if study.doc.history.is_empty() {
        out.push_str("  history: none yet (`installations BOAT --swap` records one when the repower is done)\n");
    }
    for h in &study.doc.history {
        out.push_str(&format!(
            "  until {}: {} on {:.2}:1, {}{}\n",
            h.until,
            h.engine,
            h.gear_ratio,
            h.screw,
            h.trial
                .as_ref()
                .map(|t| format!(", sea trial of {} runs kept with it", t.runs.len()))
                .unwrap_or_default()
        ));
    }
    out
}
