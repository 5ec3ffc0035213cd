//! Boat and engine profiles: TOML schema, validation, the profile store and the demo fleet.
//!
//! A profile file is read in three steps, the way the rest of the crate works: the TOML text is
//! deserialised into a raw form that keeps every value's byte span; each quantity string is
//! parsed with [`crate::units::parse`] into SI; the typed document ([`BoatDoc`], [`EngineDoc`])
//! is validated. Errors point at the file, line and column of the offending value. A document
//! builds the core's [`crate::propulsion::solver::Vessel`] with [`BoatDoc::to_vessel`] and is
//! written back with its units by [`BoatDoc::to_toml`] / [`EngineDoc::to_toml`].
//! The file format is described in `docs/profiles.md`.

pub mod boat;
pub mod demo;
pub mod engine;
pub mod error;
mod fields;
pub mod preserve;
pub mod quantity;
pub mod store;
pub mod template;

pub use boat::ScrewShopDoc;
pub use boat::{
    AsFoundDoc, BoatDoc, CalibrationDoc, HistoryDoc, HullDoc, InstallationDoc, InteractionDoc,
    LoadCase, LoadCondition, LoadDoc, ResistanceDoc, ResistanceMethodDoc, Rotation, Side, TrialDoc,
    TrialRunDoc, TripDoc, VariantDoc, WaterDoc, WindageDoc,
};
pub use engine::{DutyDoc, EngineDoc, FuelDoc};
pub use error::{Issue, ProfileError};
pub use quantity::Quantity;
pub use store::{FileStamp, Loaded, Origin, Store};

/// The schema version this build reads and writes (the `schema` key of every file).
pub const SCHEMA_VERSION: i64 = 1;
