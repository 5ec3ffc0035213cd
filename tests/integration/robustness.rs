//! Integration tests: robustness — property tests over arbitrary and random inputs (no panic,
//! no NaN, errors that say where), fault tests of the profile store, and terminal restoration.
//!
//! Each proptest runs a bounded number of cases so that the whole module stays fast in debug.

use proptest::test_runner::{Config, RngSeed};

mod loader;
mod read_only;
mod resistance;
mod screw;
mod solver;
mod store;
mod terminal;
mod units;

/// The proptest configuration of this module: `cases` cases, no regression files written into
/// the source tree (a failure found here becomes a named test instead), and a fixed seed so
/// that CI runs the same cases every time; set `PROPTEST_RNG_SEED` to explore other ones.
pub(crate) fn cases(cases: u32) -> Config {
    let default = Config::default();
    let rng_seed = match default.rng_seed {
        RngSeed::Random => RngSeed::Fixed(0x7469_6465_7772_6967),
        chosen => chosen,
    };
    Config {
        cases,
        failure_persistence: None,
        rng_seed,
        ..default
    }
}
