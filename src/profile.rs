//! Boat and engine profiles: TOML schema, validation, the profile store and the demo fleet.
