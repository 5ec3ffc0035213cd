//! Integration tests: robustness — property tests over arbitrary and random inputs (no panic,
//! no NaN, errors that say where), fault tests of the profile store, and terminal restoration.
//!
//! Each proptest runs a bounded number of cases so that the whole module stays fast in debug.

mod screw;
mod units;
