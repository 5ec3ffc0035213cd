//! Integration tests: units.
