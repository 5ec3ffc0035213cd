//! A quantity read from a profile (SI value plus the text it was written as), and the reader
//! that turns raw spanned TOML values into SI while remembering where each key was.

use super::error::{Issue, ProfileError};
use crate::units::{self, Kind, UnitError, UnitSystem};
use std::collections::HashMap;
use std::ops::Range;
use toml::Spanned;

/// A dimensional value of a document: SI (or the kind's internal unit), plus the text it was
/// read from so that an unedited value is written back exactly as the user wrote it.
#[derive(Debug, Clone)]
pub struct Quantity {
    /// The value in the kind's internal unit (SI; rpm for rotation, °C for temperature).
    pub value: f64,
    /// The text this value was parsed from, with the value it gave; ignored once `value` changes.
    written: Option<(f64, String)>,
}

impl Quantity {
    /// A quantity with `value` in its kind's internal unit (e.g. set by an editor).
    pub fn new(value: f64) -> Self {
        Self {
            value,
            written: None,
        }
    }

    /// A quantity typed by the user as `text` (e.g. "19 in"); it is saved as typed.
    pub fn from_text(text: &str, kind: Kind) -> Result<Self, UnitError> {
        let value = units::parse(text, kind)?;
        Ok(Self::parsed(value, text.trim()))
    }

    /// A quantity parsed from `text`, which gave `value`.
    pub(crate) fn parsed(value: f64, text: &str) -> Self {
        Self {
            value,
            written: Some((value, text.to_owned())),
        }
    }

    /// The text to write to a file: the original text if unchanged, else formatted in `system`.
    pub fn file_text(&self, kind: Kind, system: UnitSystem) -> String {
        match &self.written {
            Some((v, text)) if v.to_bits() == self.value.to_bits() => text.clone(),
            _ => units::format_for_file(self.value, kind, system),
        }
    }

    /// The text as shown in messages: the original text if unchanged, else the SI value.
    pub(crate) fn shown(&self) -> String {
        match &self.written {
            Some((v, text)) if v.to_bits() == self.value.to_bits() => format!("{text:?}"),
            _ => format!("{}", self.value),
        }
    }
}

/// Two quantities are equal when their values are; how they were written does not matter.
impl PartialEq for Quantity {
    fn eq(&self, other: &Self) -> bool {
        self.value == other.value
    }
}

impl From<f64> for Quantity {
    fn from(value: f64) -> Self {
        Self::new(value)
    }
}

/// Turns raw spanned values into document values, recording each key's span for later errors.
pub(crate) struct Reader<'a> {
    /// The file as shown in messages.
    pub file: &'a str,
    /// The file's text.
    pub source: &'a str,
    /// Byte span of the value of each dotted key read so far.
    pub spans: HashMap<String, Range<usize>>,
    /// Keys of the document written under another key in the file (e.g. `hull.draft`).
    pub aliases: HashMap<String, String>,
}

impl<'a> Reader<'a> {
    /// A reader for `source`, shown in messages as `file`.
    pub fn new(file: &'a str, source: &'a str) -> Self {
        Self {
            file,
            source,
            spans: HashMap::new(),
            aliases: HashMap::new(),
        }
    }

    /// Parses a quantity string of `kind` at `key`.
    pub fn qty(
        &mut self,
        key: &str,
        raw: &Spanned<String>,
        kind: Kind,
    ) -> Result<Quantity, ProfileError> {
        self.spans.insert(key.to_owned(), raw.span());
        let text = raw.get_ref();
        match units::parse(text, kind) {
            Ok(value) if value.is_finite() => Ok(Quantity::parsed(value, text)),
            Ok(_) => Err(self.error(
                key,
                raw.span(),
                Issue::new(key, format!("{text:?}"), "expected a finite number"),
            )),
            Err(e) => {
                let (offset, problem) = describe_unit_error(&e);
                // Point at the offending character inside the quoted string (+1 for the quote).
                let at = raw.span().start + 1 + char_offset_to_byte(text, offset);
                Err(self.error(key, at..at, Issue::new(key, format!("{text:?}"), problem)))
            }
        }
    }

    /// Parses an optional quantity string.
    pub fn opt_qty(
        &mut self,
        key: &str,
        raw: &Option<Spanned<String>>,
        kind: Kind,
    ) -> Result<Option<Quantity>, ProfileError> {
        raw.as_ref().map(|r| self.qty(key, r, kind)).transpose()
    }

    /// Reads a plain number at `key`.
    pub fn num(&mut self, key: &str, raw: &Spanned<f64>) -> f64 {
        self.spans.insert(key.to_owned(), raw.span());
        *raw.get_ref()
    }

    /// Reads a gear ratio written as a number (2.5) or as text ("2.5:1") at `key`.
    pub fn ratio(&mut self, key: &str, raw: &Spanned<toml::Value>) -> Result<f64, ProfileError> {
        self.spans.insert(key.to_owned(), raw.span());
        let found = raw.get_ref().to_string();
        let problem = match raw.get_ref() {
            toml::Value::Float(v) => return Ok(*v),
            toml::Value::Integer(v) => return Ok(*v as f64),
            toml::Value::String(text) => match units::parse_ratio(text) {
                Ok(v) => return Ok(v),
                Err(UnitError::BadRatio { reason, .. }) => reason,
                Err(e) => e.to_string(),
            },
            _ => "expected engine turns per screw turn, such as 2.5 or \"2.5:1\"".to_owned(),
        };
        Err(self.error(key, raw.span(), Issue::new(key, found, problem)))
    }

    /// Reads an optional plain number.
    pub fn opt_num(&mut self, key: &str, raw: &Option<Spanned<f64>>) -> Option<f64> {
        raw.as_ref().map(|r| self.num(key, r))
    }

    /// Reads a string value at `key`, recording its span.
    pub fn text(&mut self, key: &str, raw: &Spanned<String>) -> String {
        self.spans.insert(key.to_owned(), raw.span());
        raw.get_ref().clone()
    }

    /// Reads one of the `choices` (file spelling → value) at `key`.
    pub fn choice<T: Copy>(
        &mut self,
        key: &str,
        raw: &Spanned<String>,
        choices: &[(&str, T)],
    ) -> Result<T, ProfileError> {
        self.spans.insert(key.to_owned(), raw.span());
        let text = raw.get_ref();
        choices
            .iter()
            .find(|(name, _)| name == text)
            .map(|(_, v)| *v)
            .ok_or_else(|| {
                let names: Vec<String> = choices.iter().map(|(n, _)| format!("{n:?}")).collect();
                self.error(
                    key,
                    raw.span(),
                    Issue::new(
                        key,
                        format!("{text:?}"),
                        format!("expected one of {}", names.join(", ")),
                    ),
                )
            })
    }

    /// An invalid-value error at `span`.
    pub fn error(&self, _key: &str, span: Range<usize>, issue: Issue) -> ProfileError {
        ProfileError::invalid(self.file, self.source, Some(span), issue)
    }

    /// Turns a document issue into an error located at its key (or the nearest enclosing key).
    pub fn locate(&self, mut issue: Issue) -> ProfileError {
        if let Some(alias) = self.aliases.get(&issue.key) {
            issue.key = alias.clone();
        }
        let mut key = issue.key.as_str();
        let span = loop {
            if let Some(span) = self.spans.get(key) {
                break Some(span.clone());
            }
            match key.rfind(['.', '[']) {
                Some(i) => key = &key[..i],
                // Nothing to point at (a missing table): point at the end, where it would go.
                None => break Some(self.source.len()..self.source.len()),
            }
        };
        ProfileError::invalid(self.file, self.source, span, issue)
    }
}

/// The character offset and the explanation of a unit error (without repeating the text).
fn describe_unit_error(error: &UnitError) -> (usize, String) {
    match error {
        UnitError::NoNumber { position, .. } => (*position, "expected a number first".to_owned()),
        UnitError::MissingUnit {
            kind_name,
            examples,
            ..
        } => (
            0,
            format!("no unit; expected {kind_name} with a unit such as {examples}"),
        ),
        UnitError::UnknownUnit {
            unit,
            position,
            kind_name,
            examples,
            ..
        } => (
            *position,
            format!("unknown unit {unit:?}; expected {kind_name} in {examples}"),
        ),
        UnitError::Trailing { rest, position, .. } => (
            *position,
            format!("unexpected {rest:?} after the quantity; expected one value with its unit"),
        ),
        #[allow(unreachable_patterns)]
        other => (0, other.to_string()),
    }
}

fn char_offset_to_byte(text: &str, chars: usize) -> usize {
    text.char_indices()
        .nth(chars)
        .map_or(text.len(), |(i, _)| i)
}

/// Writes a quantity as a spanned string for serialisation.
pub(crate) fn out(q: &Quantity, kind: Kind, system: UnitSystem) -> Spanned<String> {
    Spanned::new(0..0, q.file_text(kind, system))
}

/// Writes a plain number as a spanned value for serialisation.
pub(crate) fn out_num(value: f64) -> Spanned<f64> {
    Spanned::new(0..0, value)
}

/// Writes a string as a spanned value for serialisation.
pub(crate) fn out_text(text: &str) -> Spanned<String> {
    Spanned::new(0..0, text.to_owned())
}

/// Guesses the unit system of a file without a `units` key from the units its values use.
pub(crate) fn guess_system<'t>(texts: impl Iterator<Item = &'t str>) -> UnitSystem {
    const IMPERIAL: &[&str] = &["ft", "in", "lb", "lbs", "hp", "gal", "psi", "lbf", "F"];
    // Units used alike in both systems say nothing about the file's system.
    const NEUTRAL: &[&str] = &["kn", "kt", "rpm", "h", "min", "s", "nm", "deg", "C"];
    let (mut imperial, mut metric) = (0, 0);
    for text in texts {
        let words: Vec<&str> = text
            .split(|c: char| !c.is_alphabetic())
            .filter(|w| !w.is_empty())
            .collect();
        if text.contains(['\'', '"']) || words.iter().any(|w| IMPERIAL.contains(w)) {
            imperial += 1;
        } else if words.iter().any(|w| !NEUTRAL.contains(w)) {
            metric += 1;
        }
    }
    if imperial > metric {
        UnitSystem::Imperial
    } else {
        UnitSystem::Metric
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn equality_ignores_how_the_value_was_written() {
        assert_eq!(Quantity::parsed(0.3048, "1 ft"), Quantity::new(0.3048));
        assert_ne!(Quantity::parsed(0.3048, "1 ft"), Quantity::new(0.3));
    }

    #[test]
    fn typed_values_are_saved_as_typed() {
        let q = Quantity::from_text(" 19 in ", Kind::ScrewLength).unwrap();
        assert!((q.value - 19.0 * 0.0254).abs() < 1e-12);
        assert_eq!(q.file_text(Kind::ScrewLength, UnitSystem::Metric), "19 in");
        assert!(Quantity::from_text("19 kg", Kind::ScrewLength).is_err());
    }

    #[test]
    fn unchanged_values_keep_their_text() {
        let mut q = Quantity::parsed(11.2014, "36 ft 9 in");
        assert_eq!(q.file_text(Kind::Length, UnitSystem::Metric), "36 ft 9 in");
        q.value = 11.0;
        assert_ne!(q.shown(), "\"36 ft 9 in\"");
    }

    #[test]
    fn unit_system_is_guessed_from_the_units_used() {
        let imperial = ["36 ft 9 in", "24 in", "80 hp", "7 kn"];
        assert_eq!(guess_system(imperial.into_iter()), UnitSystem::Imperial);
        let metric = ["11.2 m", "610 mm", "60 kW", "7 kn"];
        assert_eq!(guess_system(metric.into_iter()), UnitSystem::Metric);
    }

    #[test]
    fn issues_are_located_at_the_nearest_known_key() {
        let source = "[hull]\nlength = \"3 m\"\n";
        let mut reader = Reader::new("x.toml", source);
        reader.spans.insert("hull".into(), 0..6);
        reader.spans.insert("hull.length".into(), 16..21);
        let err = reader.locate(Issue::new("hull.length", "\"3 m\"", "expected more"));
        assert_eq!(err.location().map(|l| l.line), Some(2));
        let err = reader.locate(Issue::new("hull.beam", "", "missing"));
        assert_eq!(err.location().map(|l| l.line), Some(1));
    }
}
