//! tidewright: repower planning for displacement-hull motorboats.
//!
//! The crate is split the way the design asks: [`propulsion`] is the pure physics core (SI
//! `f64` in, results out, no files, no terminal); [`units`] parses and prints quantities with
//! their units; [`profile`] reads and writes boat and engine files; [`report`] formats results;
//! [`cli`] and [`tui`] are the two front ends, both calling the same solver.

pub mod cli;
pub mod profile;
pub mod propulsion;
pub mod report;
pub mod tui;
pub mod units;
