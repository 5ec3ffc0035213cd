//! tidewright: repower planning for displacement-hull motorboats.
//!
//! The crate is split the way the design asks: [`propulsion`] is the pure physics core (SI
//! `f64` in, results out, no files, no terminal); [`units`] parses and prints quantities with
//! their units; [`profile`] reads and writes boat and engine files; [`report`] formats results;
//! [`cli`] and [`tui`] are the two front ends, both calling the same solver.
//!
//! # Example
//!
//! Match each screw of the built-in demo boat *Marram* against its engine and ask the cruise
//! question for its target speed:
//!
//! ```
//! use tidewright::profile::Store;
//! use tidewright::propulsion::solver::{cruise_at_speed, match_engine};
//!
//! # fn main() -> anyhow::Result<()> {
//! let store = Store::at("/nonexistent/store/so/the/demo/is/used");
//! let (boat, engine) = store.resolve_boat("marram")?;
//! let vessel = boat.doc.to_default_vessel(&engine.doc)?;
//! for (index, variant) in vessel.variants.iter().enumerate() {
//!     let system = vessel.system(index);
//!     let matched = match_engine(&system, &vessel.match_criteria)?;
//!     let cruise = cruise_at_speed(&system, &vessel.trip, vessel.trip.target_speed)?;
//!     println!(
//!         "{}: {:?}, top speed {:.2} m/s, {:.0} rpm at the target speed",
//!         variant.label, matched.verdict, matched.top_speed, cruise.point.engine_rpm
//!     );
//! }
//! # Ok(())
//! # }
//! ```

pub mod cli;
pub mod instruments;
pub mod profile;
pub mod propulsion;
pub mod report;
pub mod study;
pub mod tui;
pub mod units;

/// The version line: the package version and, when the build knew it, its git commit
/// ("0.1.0 (commit 8c8c0b0abc)"; build.rs reads `git rev-parse`).
pub fn version_text() -> &'static str {
    match option_env!("TIDEWRIGHT_COMMIT") {
        Some(commit) => {
            static TEXT: std::sync::OnceLock<String> = std::sync::OnceLock::new();
            TEXT.get_or_init(|| format!("{} (commit {commit})", env!("CARGO_PKG_VERSION")))
        }
        None => env!("CARGO_PKG_VERSION"),
    }
}
