//! Shared helpers for the integration tests.

/// Asserts that `got` is within relative tolerance `rel` of `want` (absolute near zero).
#[macro_export]
macro_rules! assert_close {
    ($got:expr, $want:expr, $rel:expr) => {{
        let (got, want, rel): (f64, f64, f64) = ($got, $want, $rel);
        let scale = want.abs().max(1e-12);
        assert!(
            got.is_finite() && ((got - want).abs() / scale) <= rel,
            "{} = {} but expected {} within {} % (off by {:.4} %)",
            stringify!($got),
            got,
            want,
            rel * 100.0,
            (got - want).abs() / scale * 100.0
        );
    }};
}
