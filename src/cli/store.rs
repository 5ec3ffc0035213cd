//! Commands on the profile store: `check`, `list`, `init`, and loading a boat for the others.

use std::io::Write;

use super::{CheckArgs, Context, ListArgs};
use crate::propulsion::solver::Vessel;

/// A boat loaded from the store (or a path, or the demo fleet), ready to solve.
#[derive(Debug, Clone)]
pub struct LoadedBoat {
    /// The boat in SI form.
    pub vessel: Vessel,
    /// Where it came from, as shown to the user.
    pub origin: String,
    /// What the profile layer reports: estimated values, unusual inputs.
    pub warnings: Vec<String>,
}

/// Loads the boat named (or at the path) `boat`.
pub fn load_boat(ctx: &Context, boat: &str) -> anyhow::Result<LoadedBoat> {
    let _ = ctx;
    anyhow::bail!("cannot load boat {boat:?}: the profile store is not part of this build yet")
}

/// `check FILE…`.
pub fn check(args: &CheckArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let _ = (args, out);
    anyhow::bail!("the profile store is not part of this build yet")
}

/// `list`.
pub fn list(ctx: &Context, args: &ListArgs, out: &mut dyn Write) -> anyhow::Result<()> {
    let _ = (ctx, args, out);
    anyhow::bail!("the profile store is not part of this build yet")
}

/// `init`.
pub fn init(ctx: &Context, out: &mut dyn Write) -> anyhow::Result<()> {
    let _ = (ctx, out);
    anyhow::bail!("the profile store is not part of this build yet")
}
