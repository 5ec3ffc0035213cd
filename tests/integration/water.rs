//! Integration tests: water.
