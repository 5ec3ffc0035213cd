//! Integration tests: solver.
