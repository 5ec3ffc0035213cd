//! JSON output: pretty-printed, one document per command, never a NaN.

use serde::Serialize;

/// Serialises `value` as pretty JSON with a trailing newline.
///
/// serde_json would write NaN and infinities as `null`, so every report type passes its numbers
/// through [`finite`] when it is built and moves a point with a non-finite value to its list of
/// unsolved points with the reason.
pub fn to_string<T: Serialize>(value: &T) -> anyhow::Result<String> {
    let mut text = serde_json::to_string_pretty(value)?;
    text.push('\n');
    Ok(text)
}

/// `value` if finite, otherwise an error naming `field`.
pub fn finite(value: f64, field: &str) -> Result<f64, String> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(format!("{field} is not a finite number ({value})"))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finite_rejects_nan_and_infinity() {
        assert_eq!(finite(1.5, "kt"), Ok(1.5));
        assert!(finite(f64::NAN, "kt").unwrap_err().contains("kt"));
        assert!(finite(f64::INFINITY, "kq").is_err());
    }

    #[test]
    fn output_ends_with_newline() {
        assert_eq!(
            to_string(&serde_json::json!({"a": 1})).unwrap(),
            "{\n  \"a\": 1\n}\n"
        );
    }
}
