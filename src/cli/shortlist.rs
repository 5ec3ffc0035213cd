//! `shortlist BOAT`: every candidate engine and gear with its screw, ranked.

use std::io::Write;

use clap::{Args, ValueEnum};

use super::{Context, ReportFormat, UsageError, load_study, store};
use crate::report::shortlist::{shortlist_csv, shortlist_json, shortlist_markdown, shortlist_text};
use crate::report::{Display, json};
use crate::study::shortlist::{ShortlistOptions, ShortlistRank, offers_from_store};

/// How the shortlist is ranked.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum ShortlistRankArg {
    /// Least fuel per nautical mile at the target speed (or over the boat's trip profile).
    Fuel,
    /// Longest range with the reserve at the target speed.
    Range,
    /// Highest top speed.
    Top,
    /// Largest free-running rpm margin.
    Margin,
}

impl From<ShortlistRankArg> for ShortlistRank {
    fn from(rank: ShortlistRankArg) -> Self {
        match rank {
            ShortlistRankArg::Fuel => ShortlistRank::Fuel,
            ShortlistRankArg::Range => ShortlistRank::Range,
            ShortlistRankArg::Top => ShortlistRank::Top,
            ShortlistRankArg::Margin => ShortlistRank::Margin,
        }
    }
}

/// Arguments of `shortlist`.
#[derive(Debug, Args)]
pub struct ShortlistArgs {
    /// A boat name in the profile store, or a path to a boat file.
    pub boat: String,
    /// Engine sheets to compare, comma-separated store names (default: every sheet).
    #[arg(long, value_name = "NAME,…", conflicts_with = "all")]
    pub engines: Option<String>,
    /// Compare every engine sheet in the store (the default).
    #[arg(long)]
    pub all: bool,
    /// Gear ratios to try with every engine, comma-separated (default: each sheet's `gears`,
    /// else the boat's own ratio).
    #[arg(long, value_name = "LIST")]
    pub gears: Option<String>,
    /// Ranking.
    #[arg(long, value_enum, default_value_t = ShortlistRankArg::Fuel)]
    pub rank: ShortlistRankArg,
    /// Output format.
    #[arg(long, value_enum, default_value_t = ReportFormat::Text)]
    pub format: ReportFormat,
}

/// `shortlist BOAT`.
pub fn run(ctx: &Context, args: &ShortlistArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let study = load_study(ctx, &args.boat)?;
    let names: Option<Vec<String>> = args.engines.as_ref().map(|list| {
        list.split(',')
            .map(|n| n.trim().to_string())
            .filter(|n| !n.is_empty())
            .collect()
    });
    if names.as_ref().is_some_and(|n| n.is_empty()) {
        return Err(UsageError("--engines: expected engine sheet names such as a,b".into()).into());
    }
    let gears =
        match &args.gears {
            None => None,
            Some(list) => Some(
                list.split(',')
                    .map(|g| {
                        g.trim().parse::<f64>().ok().filter(|g| g.is_finite()).ok_or_else(|| {
                        UsageError(format!(
                            "--gears: {:?} is not a number; expected ratios such as 2.0,2.5",
                            g.trim()
                        ))
                    })
                    })
                    .collect::<Result<Vec<f64>, UsageError>>()?,
            ),
        };
    if let Some(bad) = gears.iter().flatten().find(|g| !(**g > 1.0 && **g <= 6.0)) {
        return Err(UsageError(format!(
            "--gears: {bad} is not a reduction ratio; expected each above 1 and at most 6"
        ))
        .into());
    }
    let offers = offers_from_store(&store::store(ctx), names.as_deref())?;
    let options = ShortlistOptions {
        gears,
        rank: args.rank.into(),
    };
    let list = study.shortlist(&offers, &options)?;
    let d = Display::new(study.units);
    match args.format {
        ReportFormat::Json => out.write_all(json::to_string(&shortlist_json(&list))?.as_bytes())?,
        ReportFormat::Text => out.write_all(shortlist_text(&list, &d).as_bytes())?,
        ReportFormat::Csv => out.write_all(shortlist_csv(&list, &d).as_bytes())?,
        ReportFormat::Md => out.write_all(shortlist_markdown(&list, &d).as_bytes())?,
    }
    Ok(())
}
