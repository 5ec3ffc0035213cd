//! The report of one boat, by its old path: the model (`report::model`), its text writers
//! (`report::text`) and its JSON document (`report::json`), re-exported for callers.

pub use super::json::{BoatJson, EngineJson, MatchJson, PointJson, UnsolvedJson, VariantJson};
pub use super::model::*;
pub use super::text::*;
