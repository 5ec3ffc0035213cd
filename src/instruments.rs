//! Boat instruments: sea-trial logs and live feeds turned into steady runs.
//!
//! This layer reads what the boat's own instruments say — NMEA 0183 text ([`nmea`]) or a CSV
//! logger's file ([`csvlog`]) — into one time series of [`Sample`]s, finds the steady runs in it
//! ([`runs`]) and turns them into the core's
//! [`TrialRun`](crate::propulsion::solver::trial::TrialRun)s. [`feed`] reads the same sentences
//! live from TCP, UDP or a file replayed in real time; [`synth`] writes synthetic logs for tests.
//!
//! SI inside: speeds in m/s, times in seconds (unix time where the log gives a date), fuel
//! volume flow in m³/s; angles are degrees true 0–360 in fields named `_deg` and engine speed is
//! rpm in fields named `rpm`. The layer knows no terminal and no profile files.
//!
//! # Example
//!
//! ```
//! use tidewright::instruments::{import, runs::RunOptions, synth};
//!
//! // A synthetic log of a boat doing 2.5 m/s at 1500 rpm and 3.5 m/s at 2000 rpm.
//! let spec = synth::SynthSpec::default();
//! let log = synth::generate(&spec, |rpm| rpm / 1500.0 * 2.5 - (rpm - 1500.0).max(0.0) / 1000.0 * 0.5, None);
//! let imported = import(log.nmea.as_bytes(), None, &Default::default()).unwrap();
//! let found = imported.find_runs(&RunOptions::default()).unwrap();
//! assert!(found.pair_count() >= 2);
//! ```

pub mod bounds;
pub mod csvlog;
pub mod feed;
pub mod nmea;
pub mod runs;
pub mod synth;
pub mod time;

use std::collections::BTreeMap;
use std::fmt;

/// Metres per second in one knot (1852 m per hour; BIPM SI Brochure, 9th ed., Table 8).
pub const METRES_PER_SECOND_PER_KNOT: f64 = 1852.0 / 3600.0;

/// One instant of the instruments, every quantity optional (SI; angles in degrees true).
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct Sample {
    /// Time of the sample, s (unix time when the log gives a date, else the log's own clock).
    pub time_s: f64,
    /// Engine speed of the selected engine, rpm.
    pub engine_rpm: Option<f64>,
    /// Speed over ground from GPS, m/s (`None` without a valid fix).
    pub speed_over_ground: Option<f64>,
    /// Course over ground, degrees true 0–360.
    pub course_over_ground_deg: Option<f64>,
    /// Heading, degrees true 0–360 (magnetic where the compass gave no variation; see [`nmea`]).
    pub heading_deg: Option<f64>,
    /// Speed through the water from the log (paddle wheel or ultrasonic), m/s.
    pub speed_through_water: Option<f64>,
    /// Fuel volume flow, m³/s.
    pub fuel_volume_flow: Option<f64>,
}

/// The format of an instrument log.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum LogFormat {
    /// NMEA 0183 sentences, one a line, optionally after a timestamp or TAG block.
    Nmea,
    /// CSV with a header naming columns and units (see [`csvlog`]).
    Csv,
}

impl fmt::Display for LogFormat {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            LogFormat::Nmea => "nmea",
            LogFormat::Csv => "csv",
        })
    }
}

/// Why a line of a log was not used.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum BadLine {
    /// Bytes that are not ASCII text (binary garbage, a wrong file).
    NotText,
    /// The line does not start with `$` or `!` (after any timestamp or TAG block).
    NotASentence,
    /// No `*hh` checksum at the end (a cut line, or a talker that sends none).
    MissingChecksum,
    /// The checksum does not match the XOR of the characters between `$` and `*`.
    BadChecksum,
    /// The talker identifier is not one of NMEA 0183's.
    UnknownTalker,
    /// The sentence type is not one NMEA 0183 defines.
    UnknownSentence,
    /// A known sentence whose fields could not be read (too few, not numbers).
    BadFields,
    /// The timestamp or TAG block before the sentence could not be read.
    BadTimestamp,
    /// A CSV row with the wrong number of fields or a value that is not a number.
    BadRow,
    /// A line with no time: before the first RMC in a log without timestamps.
    NoTime,
    /// An engine or shaft rpm below 0 or above [`bounds::MAX_RPM`].
    RpmOutOfRange,
    /// A speed over ground or through the water below 0 or above [`bounds::MAX_SPEED_KN`].
    SpeedOutOfRange,
}

impl BadLine {
    /// Every reason, in report order.
    pub const ALL: [BadLine; 12] = [
        BadLine::NotText,
        BadLine::NotASentence,
        BadLine::MissingChecksum,
        BadLine::BadChecksum,
        BadLine::UnknownTalker,
        BadLine::UnknownSentence,
        BadLine::BadFields,
        BadLine::BadTimestamp,
        BadLine::BadRow,
        BadLine::NoTime,
        BadLine::RpmOutOfRange,
        BadLine::SpeedOutOfRange,
    ];

    /// A short description for a summary.
    pub fn describe(self) -> &'static str {
        match self {
            BadLine::NotText => "not text (binary bytes)",
            BadLine::NotASentence => "not an NMEA sentence",
            BadLine::MissingChecksum => "no checksum (cut line?)",
            BadLine::BadChecksum => "checksum mismatch",
            BadLine::UnknownTalker => "unknown talker",
            BadLine::UnknownSentence => "unknown sentence type",
            BadLine::BadFields => "unreadable fields",
            BadLine::BadTimestamp => "unreadable timestamp",
            BadLine::BadRow => "bad CSV row",
            BadLine::NoTime => "no time yet (before the first RMC)",
            BadLine::RpmOutOfRange => "rpm out of range (below 0 or above 10000)",
            BadLine::SpeedOutOfRange => "speed out of range (below 0 or above 60 kn)",
        }
    }
}

/// Counts of what a log held, line by line.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize)]
pub struct LineSummary {
    /// Non-empty lines read.
    pub lines: usize,
    /// Lines whose data went into the time series.
    pub used: usize,
    /// Valid lines of kinds this import does not need (GGA, GSV, AIS, proprietary …).
    pub ignored: usize,
    /// Bad lines by reason.
    pub bad: BTreeMap<BadLine, usize>,
    /// The first few bad lines: 1-based line number and reason.
    pub first_bad: Vec<(usize, BadLine)>,
    /// RPM sources seen (`E1` engine 1, `S2` shaft 2 …), for choosing an engine.
    pub rpm_sources: Vec<String>,
}

/// How many bad lines [`LineSummary::first_bad`] keeps.
pub const FIRST_BAD_KEPT: usize = 5;

impl LineSummary {
    /// Counts one bad line at 1-based `line_number`.
    pub fn count_bad(&mut self, line_number: usize, reason: BadLine) {
        *self.bad.entry(reason).or_insert(0) += 1;
        if self.first_bad.len() < FIRST_BAD_KEPT {
            self.first_bad.push((line_number, reason));
        }
    }

    /// Total bad lines.
    pub fn bad_total(&self) -> usize {
        self.bad.values().sum()
    }

    /// Bad lines of one reason.
    pub fn bad_count(&self, reason: BadLine) -> usize {
        self.bad.get(&reason).copied().unwrap_or(0)
    }
}

impl fmt::Display for LineSummary {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "{} lines: {} used, {} ignored, {} bad",
            self.lines,
            self.used,
            self.ignored,
            self.bad_total()
        )?;
        let parts: Vec<String> = self
            .bad
            .iter()
            .map(|(reason, n)| format!("{n} {}", reason.describe()))
            .collect();
        if !parts.is_empty() {
            write!(f, " ({})", parts.join(", "))?;
        }
        Ok(())
    }
}

/// Options of an import.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ImportOptions {
    /// The log's format; `None` detects it from the content ([`detect_format`]).
    pub format: Option<LogFormat>,
    /// Which rpm to use; `None` takes engine 1, or the only engine, or the lowest numbered.
    pub rpm_source: Option<nmea::RpmSource>,
    /// Fill-forward limit: a value older than this is dropped from later samples, s (default 5).
    pub max_age_s: Option<f64>,
}

/// An imported log: its time series and what its lines held.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ImportedLog {
    /// The format read.
    pub format: LogFormat,
    /// The samples in log order.
    pub samples: Vec<Sample>,
    /// Line counts.
    pub summary: LineSummary,
    /// The log's date, `YYYY-MM-DD` (UTC, from the first RMC or timestamp), if it has one.
    pub date: Option<String>,
}

impl ImportedLog {
    /// Finds the steady runs of the log (see [`runs::find_runs`]).
    pub fn find_runs(
        &self,
        options: &runs::RunOptions,
    ) -> Result<runs::FoundRuns, runs::NoRunError> {
        runs::find_runs(&self.samples, options, &self.summary)
    }
}

/// Why a log could not be imported at all.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ImportError {
    /// A CSV header names a column whose unit is not known.
    #[error("CSV column {column:?}: unit {unit:?} is not known; expected {expected}")]
    UnknownUnit {
        /// The column's header text.
        column: String,
        /// The unit found.
        unit: String,
        /// The units accepted for that quantity.
        expected: &'static str,
    },
    /// A CSV header lacks a column the import needs.
    #[error("CSV header has no {needed} column; expected a header such as {example}")]
    MissingColumn {
        /// What is missing (time, rpm, sog).
        needed: &'static str,
        /// An example header.
        example: &'static str,
    },
    /// A CSV header names the same quantity twice.
    #[error("CSV columns {first:?} and {second:?} both give {quantity}")]
    DuplicateColumn {
        /// The quantity.
        quantity: &'static str,
        /// The first column.
        first: String,
        /// The second column.
        second: String,
    },
    /// A CSV header whose columns are split by a character the import does not accept.
    #[error(
        "line {line}: the CSV header's columns are separated by {}; a CSV log's separator must be ',', ';' or a tab",
        csvlog::separator_name(*found)
    )]
    UnknownSeparator {
        /// 1-based line number of the header.
        line: usize,
        /// The separator found.
        found: char,
    },
    /// The file is empty or holds only blank lines.
    #[error("the log is empty")]
    Empty,
}

/// The UTF-8 byte-order mark some editors and loggers put at the start of a text file.
pub const BYTE_ORDER_MARK: &[u8] = b"\xEF\xBB\xBF";

/// `content` without a leading UTF-8 byte-order mark.
pub fn strip_bom(content: &[u8]) -> &[u8] {
    content.strip_prefix(BYTE_ORDER_MARK).unwrap_or(content)
}

/// Detects a log's format from its first non-empty lines: NMEA if a line starts with `$`, `!`,
/// `\` (a TAG block) or a timestamp followed by `$`/`!`; CSV if the first line is a header (text
/// with a `,`, `;` or tab and a letter in every field, or a header split by another character,
/// which the CSV reader then refuses by name). Anything else is read as NMEA so that every line
/// is counted in the summary. A leading byte-order mark is looked past.
pub fn detect_format(content: &[u8]) -> Option<LogFormat> {
    let mut lines = strip_bom(content)
        .split(|b| *b == b'\n')
        .map(without_carriage_returns)
        .filter(|l| !l.iter().all(u8::is_ascii_whitespace))
        .take(20)
        .peekable();
    let first = lines.peek()?;
    if let Ok(text) = std::str::from_utf8(first)
        && (csvlog::looks_like_header(text) || csvlog::foreign_separator(text).is_some())
    {
        return Some(LogFormat::Csv);
    }
    Some(LogFormat::Nmea)
}

/// Imports a log from its bytes: detects or takes the format, reads every line, counts the bad.
pub fn import(
    content: &[u8],
    format: Option<LogFormat>,
    options: &ImportOptions,
) -> Result<ImportedLog, ImportError> {
    let format = format
        .or(options.format)
        .or_else(|| detect_format(content))
        .ok_or(ImportError::Empty)?;
    match format {
        LogFormat::Nmea => Ok(nmea::read_log(content, options)),
        LogFormat::Csv => csvlog::read_log(content),
    }
}

/// Splits bytes into lines without their `\r\n` or `\n`, with 1-based numbers, skipping blanks
/// and a byte-order mark at the start.
pub(crate) fn numbered_lines(content: &[u8]) -> impl Iterator<Item = (usize, &[u8])> {
    strip_bom(content)
        .split(|b| *b == b'\n')
        .enumerate()
        .map(|(i, l)| (i + 1, without_carriage_returns(l)))
        .filter(|(_, l)| !l.iter().all(u8::is_ascii_whitespace))
}

/// A line without the carriage returns before its `\n`: one is the usual line end, and some
/// serial-to-network bridges add another.
pub(crate) fn without_carriage_returns(line: &[u8]) -> &[u8] {
    let end = line.iter().rposition(|b| *b != b'\r').map_or(0, |i| i + 1);
    &line[..end]
}

/// Mean of angles in degrees on the circle, 0–360; `None` for none or when they cancel.
pub fn circular_mean_deg(angles: impl Iterator<Item = f64>) -> Option<f64> {
    let (mut s, mut c, mut n) = (0.0, 0.0, 0usize);
    for a in angles {
        s += a.to_radians().sin();
        c += a.to_radians().cos();
        n += 1;
    }
    if n == 0 || (s * s + c * c).sqrt() < 1e-9 * n as f64 {
        return None;
    }
    Some(s.atan2(c).to_degrees().rem_euclid(360.0))
}

/// Smallest difference between two angles in degrees, 0–180.
pub fn angle_between_deg(a: f64, b: f64) -> f64 {
    let d = (a - b).rem_euclid(360.0);
    d.min(360.0 - d)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn circular_mean_wraps_through_north() {
        // 350° and 10° straddle north: the arithmetic mean 180° is wrong, the circular one is 0°.
        let m = circular_mean_deg([350.0, 10.0].into_iter()).unwrap();
        assert!(angle_between_deg(m, 0.0) < 1e-9, "{m}");
        assert_eq!(circular_mean_deg([90.0, 270.0].into_iter()), None);
        assert_eq!(circular_mean_deg(std::iter::empty()), None);
    }

    #[test]
    fn angle_between_is_the_short_way() {
        assert!((angle_between_deg(10.0, 350.0) - 20.0).abs() < 1e-12);
        assert!((angle_between_deg(0.0, 180.0) - 180.0).abs() < 1e-12);
        assert!((angle_between_deg(45.0, 225.0) - 180.0).abs() < 1e-12);
    }

    #[test]
    fn knot_is_1852_m_per_hour() {
        // BIPM SI Brochure, 9th ed., Table 8: 1 knot = 1852/3600 m/s.
        assert!((METRES_PER_SECOND_PER_KNOT - 0.514_444).abs() < 1e-6);
    }

    #[test]
    fn detection_by_content() {
        assert_eq!(detect_format(b"$GPRMC,x*00\n"), Some(LogFormat::Nmea));
        assert_eq!(
            detect_format(b"\\c:1700000000*51\\$GPRMC\n"),
            Some(LogFormat::Nmea)
        );
        assert_eq!(
            detect_format(b"2023-11-14T22:13:20Z $GPRMC\n"),
            Some(LogFormat::Nmea)
        );
        assert_eq!(
            detect_format(b"time_s,rpm,sog_kn\n1,2,3\n"),
            Some(LogFormat::Csv)
        );
        assert_eq!(detect_format(b"\n\n  \n"), None);
        assert_eq!(detect_format(b"\x00\x01\xff\xfe"), Some(LogFormat::Nmea));
    }

    #[test]
    fn detection_looks_past_a_byte_order_mark() {
        assert_eq!(
            detect_format(b"\xEF\xBB\xBFtime_s,rpm,sog_kn\n1,2,3\n"),
            Some(LogFormat::Csv)
        );
        assert_eq!(
            detect_format(b"\xEF\xBB\xBF$GPHDT,1.0,T*34\n"),
            Some(LogFormat::Nmea)
        );
        // Only a mark at the very start is one; the same bytes later are the line's own.
        assert_eq!(strip_bom(b"a\xEF\xBB\xBF"), b"a\xEF\xBB\xBF");
        let lines: Vec<_> = numbered_lines(b"\xEF\xBB\xBFx\r\r\ny\r").collect();
        assert_eq!(lines, vec![(1, &b"x"[..]), (2, &b"y"[..])]);
    }

    #[test]
    fn a_header_with_another_separator_is_taken_as_csv_to_be_refused_by_name() {
        assert_eq!(
            detect_format(b"time_s|rpm|sog_kn\n0|1500|6\n"),
            Some(LogFormat::Csv)
        );
        let err = import(b"time_s|rpm|sog_kn\n0|1500|6\n", None, &Default::default()).unwrap_err();
        assert_eq!(
            err.to_string(),
            "line 1: the CSV header's columns are separated by '|'; a CSV log's separator must be ',', ';' or a tab"
        );
        // Plain words are not a header: without a quantity's name they stay NMEA's bad lines.
        assert_eq!(detect_format(b"hello world\n"), Some(LogFormat::Nmea));
    }
}
