//! `new boat NAME` and `new engine NAME`: a commented template written into the store.

use std::io::Write;

use super::{Context, NewArgs, NewKind, store};
use crate::profile::template::{boat_template, engine_template, unfilled_keys};
use crate::units::UnitSystem;

/// `new boat|engine NAME`: writes the template (metric unless `--units imperial`), never over
/// an existing file, and lists the keys left to fill in.
pub fn run(ctx: &Context, args: &NewArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let store = store::store(ctx);
    let system = ctx.units.unwrap_or(UnitSystem::Metric);
    let fresh_store = store.uses_demo();
    let (what, text) = match args.kind {
        NewKind::Boat => ("boat sheet", boat_template(&args.name, system)),
        NewKind::Engine => ("engine sheet", engine_template(&args.name, system)),
    };
    let path = match args.kind {
        NewKind::Boat => store.create_boat(&args.name, &text)?,
        NewKind::Engine => store.create_engine(&args.name, &text)?,
    };
    let system_name = match system {
        UnitSystem::Metric => "metric",
        UnitSystem::Imperial => "imperial",
    };
    writeln!(
        out,
        "wrote {} ({what}, {system_name} units)",
        path.display()
    )?;
    if fresh_store {
        writeln!(
            out,
            "created the profile store {} (`tidewright init` adds the demo fleet)",
            store
                .root()
                .map(|r| r.display().to_string())
                .unwrap_or_default()
        )?;
    }
    let keys = unfilled_keys(&text);
    writeln!(
        out,
        "fill in {} (each written `KEY = \"FILL IN\"`; the comment beside each says what it wants):",
        if keys.len() == 1 {
            "this key".to_string()
        } else {
            format!("these {} keys", keys.len())
        }
    )?;
    for key in &keys {
        writeln!(out, "  {key}")?;
    }
    writeln!(out, "then run: tidewright check {}", args.name)?;
    Ok(())
}
