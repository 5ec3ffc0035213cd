//! Integration tests: hull.
