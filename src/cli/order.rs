//! `order BOAT`: the order for the propeller shop of one screw variant.

use std::io::Write;

use super::{Context, OrderArgs, OrderFormat, load_study, variant_or_active};
use crate::report::order::{order_document, order_json, order_text};
use crate::report::{Display, json};

/// `order BOAT [--variant LABEL] [--format text|md|json]`.
pub fn run(ctx: &Context, args: &OrderArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let study = load_study(ctx, &args.boat)?;
    let index = variant_or_active(&study, args.variant.as_deref())?;
    let sheet = study.order(index)?;
    let d = Display::new(study.units);
    let text = match args.format {
        OrderFormat::Text => order_text(&sheet, &d),
        OrderFormat::Md => order_document(&sheet, &d),
        OrderFormat::Json => json::to_string(&order_json(&sheet))?,
    };
    out.write_all(text.as_bytes())?;
    Ok(())
}
