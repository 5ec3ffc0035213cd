//! Integration tests: profiles.
