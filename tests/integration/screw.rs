//! Integration tests: screw.
