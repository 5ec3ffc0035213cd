//! `conditions BOAT`: the same boat and screw light, half and fully loaded, fouled and in a
//! seaway, side by side, and the uncertainty band over displacement and wake.

use std::io::Write;

use super::{ConditionsArgs, Context, PlainFormat, UsageError, load_study, variant_or_active};
use crate::report::what_if::{what_if_json, what_if_text};
use crate::report::{Display, json};
use crate::study::what_if::WhatIfSettings;

/// The what-if settings of the command line, checked.
pub fn settings(args: &ConditionsArgs) -> anyhow::Result<WhatIfSettings> {
    let check = |value: f64, option: &str, low: f64, high: f64, what: &str| {
        if value.is_finite() && value >= low && value <= high {
            Ok(value)
        } else {
            Err(UsageError(format!(
                "{option}: expected {what} from {low} to {high}, got {value}"
            )))
        }
    };
    Ok(WhatIfSettings {
        fouled: check(args.fouled, "--fouled", 0.0, 300.0, "added friction in %")? / 100.0,
        sea_margin: check(
            args.sea_margin,
            "--sea-margin",
            0.0,
            200.0,
            "a margin on resistance in %",
        )? / 100.0,
        displacement_spread: check(
            args.spread,
            "--spread",
            0.0,
            89.0,
            "a displacement spread in %",
        )? / 100.0,
        wake_shift: check(
            args.wake_shift,
            "--wake-shift",
            0.0,
            0.49,
            "a wake-fraction shift",
        )?,
    })
}

/// `conditions BOAT`.
pub fn run(ctx: &Context, args: &ConditionsArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let study = load_study(ctx, &args.boat)?;
    let index = variant_or_active(&study, args.variant.as_deref())?;
    let settings = settings(args)?;
    let result = study.what_if(index, &settings)?;
    let text = match args.format {
        PlainFormat::Text => what_if_text(&study, &result, &Display::new(study.units)),
        PlainFormat::Json => json::to_string(&what_if_json(&study, &result))?,
    };
    out.write_all(text.as_bytes())?;
    Ok(())
}
