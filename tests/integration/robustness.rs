//! Integration tests: robustness — property tests over arbitrary and random inputs (no panic,
//! no NaN, errors that say where), fault tests of the profile store, and terminal restoration.
//!
//! Each proptest runs a bounded number of cases so that the whole module stays fast in debug.

use proptest::test_runner::Config;

mod loader;
mod screw;
mod solver;
mod store;
mod terminal;
mod units;

/// The proptest configuration of this module: `cases` cases, and no regression files written
/// into the source tree (a failure found here becomes a named test instead).
fn cases(cases: u32) -> Config {
    Config {
        cases,
        failure_persistence: None,
        ..Config::default()
    }
}
