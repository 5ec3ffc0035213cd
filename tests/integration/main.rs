//! Integration tests, one binary with a module per area so they link once.
//! Every reference check names its published source in a comment beside it.

#[macro_use]
mod support;

mod background;
mod cli;
mod cli_design;
mod design;
mod dockside;
mod export_html;
mod hardening;
mod hull;
mod instruments;
mod live;
mod oortmerssen;
mod order;
mod pitch;
mod preserve;
mod profiles;
mod published;
mod repower;
mod robustness;
mod screw;
mod shortlist;
mod solver;
mod trial_import;
mod tui;
mod twin;
mod units;
mod water;
