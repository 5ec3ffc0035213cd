//! CSV instrument logs with a header naming columns and units.
//!
//! # Header convention
//!
//! The first non-empty line is the header (after a UTF-8 byte-order mark, if the file starts
//! with one); fields are separated by `,`, `;` or a tab (whichever the header uses, in that
//! order). A header split by another character (`|`, spaces, `:` …) is refused with a message
//! naming it ([`ImportError::UnknownSeparator`]). Each column is a quantity name, optionally
//! followed by its unit after `_`, or in `[…]` or `(…)`: `sog_kn`, `sog [m/s]`, `fuel (l/h)`.
//! Names and units are case-insensitive.
//!
//! | quantity | names | units (first is the default when none is given) |
//! |---|---|---|
//! | time (required) | `time`, `timestamp`, `t` | `s` (seconds: unix or from the start), `ms`, `iso` (ISO 8601 text); without a unit a value may be either seconds or ISO 8601 |
//! | engine speed (required) | `rpm`, `engine_rpm` | `rpm`, `1/min` |
//! | speed over ground (required) | `sog` | `kn` (`kt`, `kts`, `knots`), `m/s` (`mps`), `km/h` (`kmh`, `kph`), `mph` |
//! | speed through water | `stw` | as SOG |
//! | course over ground | `cog` | `deg` (true) |
//! | heading | `heading`, `hdg` | `deg` (true) |
//! | fuel volume flow | `fuel`, `fuel_rate` | `l/h` (`lph`), `gal/h` (`gph`, US gallon), `m3/s` |
//!
//! A column of another name is ignored. A known quantity with an unknown unit is an error naming
//! the column. A row with the wrong number of fields or a value that is not a number counts as
//! [`BadLine::BadRow`]; an empty field is a missing value. A row whose rpm, SOG or STW is
//! outside [`super::bounds`] counts as [`BadLine::RpmOutOfRange`] or
//! [`BadLine::SpeedOutOfRange`]. Each row is one sample; nothing is
//! carried forward between rows.
//!
//! Example: `time_s,rpm,sog_kn,cog_deg,stw_kn,fuel_lph`.

use super::bounds::{check_rpm, check_speed};
use super::time::parse_iso8601;
use super::{
    BadLine, ImportError, ImportedLog, LineSummary, LogFormat, METRES_PER_SECOND_PER_KNOT, Sample,
};

/// Litres in one US liquid gallon (NIST Handbook 44, Appendix C: 231 in³ = 3.785 411 784 L).
pub const LITRES_PER_US_GALLON: f64 = 3.785_411_784;

/// An example header for messages and docs.
pub const EXAMPLE_HEADER: &str = "time_s,rpm,sog_kn,cog_deg,stw_kn,fuel_lph";

/// The quantity a column gives.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Quantity {
    Time,
    Rpm,
    Sog,
    Stw,
    Cog,
    Heading,
    Fuel,
}

impl Quantity {
    fn name(self) -> &'static str {
        match self {
            Quantity::Time => "time",
            Quantity::Rpm => "rpm",
            Quantity::Sog => "speed over ground",
            Quantity::Stw => "speed through water",
            Quantity::Cog => "course over ground",
            Quantity::Heading => "heading",
            Quantity::Fuel => "fuel rate",
        }
    }

    fn units(self) -> &'static str {
        match self {
            Quantity::Time => "s, ms or iso",
            Quantity::Rpm => "rpm or 1/min",
            Quantity::Sog | Quantity::Stw => "kn, m/s, km/h or mph",
            Quantity::Cog | Quantity::Heading => "deg",
            Quantity::Fuel => "l/h, gal/h or m3/s",
        }
    }
}

/// How a column's text becomes an SI value.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Conversion {
    /// Multiply the number by this factor.
    Scale(f64),
    /// Time: seconds, or ISO 8601 text.
    SecondsOrIso,
    /// Time in ms.
    Milliseconds,
}

const NAMES: &[(&str, Quantity)] = &[
    ("engine_rpm", Quantity::Rpm),
    ("fuel_rate", Quantity::Fuel),
    ("timestamp", Quantity::Time),
    ("heading", Quantity::Heading),
    ("fuel", Quantity::Fuel),
    ("time", Quantity::Time),
    ("rpm", Quantity::Rpm),
    ("sog", Quantity::Sog),
    ("stw", Quantity::Stw),
    ("cog", Quantity::Cog),
    ("hdg", Quantity::Heading),
    ("t", Quantity::Time),
];

fn conversion(quantity: Quantity, unit: &str) -> Option<Conversion> {
    use Conversion::*;
    let speed = |u: &str| match u {
        "" | "kn" | "kt" | "kts" | "knot" | "knots" => Some(Scale(METRES_PER_SECOND_PER_KNOT)),
        "m/s" | "mps" | "m_s" => Some(Scale(1.0)),
        "km/h" | "kmh" | "kph" | "km_h" => Some(Scale(1.0 / 3.6)),
        // 1 mile = 1609.344 m (international mile, NIST Handbook 44, Appendix C).
        "mph" | "mi/h" => Some(Scale(1609.344 / 3600.0)),
        _ => None,
    };
    match quantity {
        Quantity::Time => match unit {
            "" | "s" | "iso" | "utc" => Some(SecondsOrIso),
            "ms" => Some(Milliseconds),
            _ => None,
        },
        Quantity::Rpm => matches!(unit, "" | "rpm" | "1/min" | "min-1").then_some(Scale(1.0)),
        Quantity::Sog | Quantity::Stw => speed(unit),
        Quantity::Cog | Quantity::Heading => {
            matches!(unit, "" | "deg" | "degt" | "°" | "degrees").then_some(Scale(1.0))
        }
        Quantity::Fuel => match unit {
            "" | "l/h" | "lph" | "l_h" => Some(Scale(1e-3 / 3600.0)),
            "gal/h" | "gph" | "usgal/h" | "gal_h" => {
                Some(Scale(LITRES_PER_US_GALLON * 1e-3 / 3600.0))
            }
            "m3/s" | "m³/s" => Some(Scale(1.0)),
            _ => None,
        },
    }
}

/// Splits a header field into a known quantity and its unit text (lower case).
fn split_column(column: &str) -> Option<(Quantity, String)> {
    let text = column.trim().trim_matches('"').to_ascii_lowercase();
    if let Some(open) = text.find(['[', '(']) {
        let name = text[..open].trim();
        let unit = text[open + 1..].trim_end_matches([']', ')']).trim();
        let quantity = NAMES.iter().find(|(n, _)| *n == name)?.1;
        return Some((quantity, unit.to_owned()));
    }
    NAMES.iter().find_map(|(name, quantity)| {
        let rest = text.strip_prefix(name)?;
        if rest.is_empty() {
            Some((*quantity, String::new()))
        } else {
            rest.strip_prefix('_')
                .map(|unit| (*quantity, unit.to_owned()))
        }
    })
}

fn delimiter_of(header: &str) -> char {
    [',', ';', '\t']
        .into_iter()
        .find(|d| header.contains(*d))
        .unwrap_or(',')
}

/// Characters a header may be split by that the import does not accept: found only to name
/// them in the message.
const FOREIGN_SEPARATORS: [char; 5] = ['|', ':', ' ', '!', '#'];

/// The separator of a header split by a character that is not `,`, `;` or a tab: the most
/// frequent of [`FOREIGN_SEPARATORS`] when the fields it gives are names and one of them is a
/// quantity the import knows. `None` for a header with an accepted separator, or plain text.
pub fn foreign_separator(line: &str) -> Option<char> {
    if line.contains([',', ';', '\t']) {
        return None;
    }
    let line = line.trim();
    let found = FOREIGN_SEPARATORS
        .into_iter()
        .map(|c| (line.matches(c).count(), c))
        .filter(|(n, _)| *n > 0)
        .max_by_key(|(n, _)| *n)?
        .1;
    let fields: Vec<&str> = line
        .split(found)
        .map(|f| f.trim().trim_matches('"'))
        .filter(|f| !f.is_empty())
        .collect();
    let names = fields.len() >= 2
        && fields
            .iter()
            .all(|f| f.starts_with(|c: char| c.is_ascii_alphabetic()));
    (names && fields.iter().any(|f| split_column(f).is_some())).then_some(found)
}

/// A separator as a message shows it: `'|'`, or "spaces".
pub fn separator_name(separator: char) -> String {
    match separator {
        ' ' => "spaces".to_owned(),
        c => format!("{c:?}"),
    }
}

/// Whether a line looks like a CSV header: two or more fields, each starting with a letter.
pub fn looks_like_header(line: &str) -> bool {
    let delimiter = delimiter_of(line);
    let fields: Vec<&str> = line
        .split(delimiter)
        .map(|f| f.trim().trim_matches('"'))
        .collect();
    fields.len() >= 2
        && fields
            .iter()
            .all(|f| f.starts_with(|c: char| c.is_ascii_alphabetic()))
}

/// A column the import reads.
struct Column {
    index: usize,
    quantity: Quantity,
    conversion: Conversion,
}

/// Reads a whole CSV log.
pub fn read_log(content: &[u8]) -> Result<ImportedLog, ImportError> {
    let mut lines = super::numbered_lines(content);
    let (header_line, header) = lines.next().ok_or(ImportError::Empty)?;
    let header = String::from_utf8_lossy(header);
    if let Some(found) = foreign_separator(&header) {
        return Err(ImportError::UnknownSeparator {
            line: header_line,
            found,
        });
    }
    let delimiter = delimiter_of(&header);
    let mut columns: Vec<Column> = Vec::new();
    let names: Vec<&str> = header.split(delimiter).collect();
    for (index, name) in names.iter().enumerate() {
        let Some((quantity, unit)) = split_column(name) else {
            continue;
        };
        let conversion = conversion(quantity, &unit).ok_or_else(|| ImportError::UnknownUnit {
            column: name.trim().to_owned(),
            unit: unit.clone(),
            expected: quantity.units(),
        })?;
        if let Some(first) = columns.iter().find(|c| c.quantity == quantity) {
            return Err(ImportError::DuplicateColumn {
                quantity: quantity.name(),
                first: names[first.index].trim().to_owned(),
                second: name.trim().to_owned(),
            });
        }
        columns.push(Column {
            index,
            quantity,
            conversion,
        });
    }
    for (needed, quantity) in [
        ("time", Quantity::Time),
        ("rpm", Quantity::Rpm),
        ("sog", Quantity::Sog),
    ] {
        if !columns.iter().any(|c| c.quantity == quantity) {
            return Err(ImportError::MissingColumn {
                needed,
                example: EXAMPLE_HEADER,
            });
        }
    }
    let mut summary = LineSummary {
        lines: 1,
        ignored: 1,
        ..LineSummary::default()
    };
    let mut samples = Vec::new();
    let mut dated = false;
    for (number, line) in lines {
        summary.lines += 1;
        let Ok(text) = std::str::from_utf8(line) else {
            summary.count_bad(number, BadLine::NotText);
            continue;
        };
        let fields: Vec<&str> = text
            .split(delimiter)
            .map(|f| f.trim().trim_matches('"'))
            .collect();
        if fields.len() != names.len() {
            summary.count_bad(number, BadLine::BadRow);
            continue;
        }
        match read_row(&fields, &columns) {
            Ok((sample, iso)) => {
                dated |= iso || sample.time_s > 1e8;
                summary.used += 1;
                samples.push(sample);
            }
            Err(reason) => summary.count_bad(number, reason),
        }
    }
    let date = samples
        .first()
        .filter(|_| dated)
        .map(|s| super::time::date_of(s.time_s));
    Ok(ImportedLog {
        format: LogFormat::Csv,
        samples,
        summary,
        date,
    })
}

/// One row as a sample, and whether its time was ISO 8601 text; else why the row is bad.
fn read_row(fields: &[&str], columns: &[Column]) -> Result<(Sample, bool), BadLine> {
    let bad_row = || BadLine::BadRow;
    let mut sample = Sample::default();
    let mut time = None;
    let mut iso = false;
    for column in columns {
        let text = fields[column.index];
        if text.is_empty() {
            continue;
        }
        let value = match column.conversion {
            Conversion::Scale(factor) => {
                text.parse::<f64>()
                    .ok()
                    .filter(|v| v.is_finite())
                    .ok_or_else(bad_row)?
                    * factor
            }
            Conversion::Milliseconds => {
                text.parse::<f64>()
                    .ok()
                    .filter(|v| v.is_finite())
                    .ok_or_else(bad_row)?
                    / 1000.0
            }
            Conversion::SecondsOrIso => match text.parse::<f64>() {
                Ok(v) if v.is_finite() => v,
                _ => {
                    iso = true;
                    parse_iso8601(text).ok_or_else(bad_row)?
                }
            },
        };
        match column.quantity {
            Quantity::Time => time = Some(value),
            Quantity::Rpm => sample.engine_rpm = Some(check_rpm(value)?),
            Quantity::Sog => sample.speed_over_ground = Some(check_speed(value)?),
            Quantity::Stw => sample.speed_through_water = Some(check_speed(value)?),
            Quantity::Cog => sample.course_over_ground_deg = Some(value.rem_euclid(360.0)),
            Quantity::Heading => sample.heading_deg = Some(value.rem_euclid(360.0)),
            Quantity::Fuel => sample.fuel_volume_flow = Some(value).filter(|v| *v >= 0.0),
        }
    }
    sample.time_s = time.ok_or_else(bad_row)?;
    Ok((sample, iso))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_the_documented_header_with_units() {
        let log = b"time_s,rpm,sog_kn,cog_deg,stw_kn,fuel_lph\n0,1500,6.0,90,5.5,3.6\n1,1510,6.2,91,,3.6\n";
        let imported = read_log(log).unwrap();
        assert_eq!(imported.samples.len(), 2);
        let s = imported.samples[0];
        // 6 kn = 6 × 1852/3600 m/s (BIPM SI Brochure, Table 8).
        assert!((s.speed_over_ground.unwrap() - 6.0 * 1852.0 / 3600.0).abs() < 1e-12);
        // 3.6 l/h = 1e-6 m³/s exactly.
        assert!((s.fuel_volume_flow.unwrap() - 1e-6).abs() < 1e-18);
        assert_eq!(imported.samples[1].speed_through_water, None);
        assert_eq!(imported.date, None);
        assert_eq!(imported.summary.used, 2);
    }

    #[test]
    fn other_units_and_spellings() {
        let log = "Time (iso);RPM;SOG [m/s];hdg_deg;fuel_gph\n2023-11-14T22:13:20Z;1200;3.0;45;1\n";
        let imported = read_log(log.as_bytes()).unwrap();
        let s = imported.samples[0];
        assert_eq!(s.time_s, 1_700_000_000.0);
        assert_eq!(s.speed_over_ground, Some(3.0));
        assert_eq!(s.heading_deg, Some(45.0));
        // 1 US gal/h = 3.785411784 L / 3600 s (NIST Handbook 44, Appendix C).
        assert!((s.fuel_volume_flow.unwrap() - 3.785_411_784e-3 / 3600.0).abs() < 1e-15);
        assert_eq!(imported.date.as_deref(), Some("2023-11-14"));
        let mph = read_log(b"t,rpm,sog_mph\n0,1000,1\n").unwrap();
        assert!((mph.samples[0].speed_over_ground.unwrap() - 0.447_04).abs() < 1e-12);
    }

    #[test]
    fn unknown_unit_names_the_column() {
        let err = read_log(b"time_s,rpm,sog_furlong/fortnight\n").unwrap_err();
        assert_eq!(
            err.to_string(),
            "CSV column \"sog_furlong/fortnight\": unit \"furlong/fortnight\" is not known; expected kn, m/s, km/h or mph"
        );
        let err = read_log(b"time_s,sog_kn\n").unwrap_err();
        assert!(
            matches!(err, ImportError::MissingColumn { needed: "rpm", .. }),
            "{err}"
        );
        let err = read_log(b"time_s,rpm,sog_kn,sog_m/s\n").unwrap_err();
        assert!(matches!(err, ImportError::DuplicateColumn { .. }), "{err}");
    }

    #[test]
    fn bad_rows_are_counted() {
        let log = b"time_s,rpm,sog_kn,note\n0,1500,6,ok\n1,fast,6,x\n2,1500\n3,1500,6,x\n";
        let imported = read_log(log).unwrap();
        assert_eq!(imported.samples.len(), 2);
        assert_eq!(imported.summary.bad_count(BadLine::BadRow), 2);
        assert_eq!(
            imported.summary.first_bad,
            vec![(3, BadLine::BadRow), (4, BadLine::BadRow)]
        );
    }

    #[test]
    fn a_byte_order_mark_before_the_header_is_skipped() {
        let imported = read_log(b"\xEF\xBB\xBFtime_s,rpm,sog_kn\n0,2000,6.5\n").unwrap();
        assert_eq!(imported.samples.len(), 1);
        assert_eq!(imported.samples[0].engine_rpm, Some(2000.0));
    }

    #[test]
    fn a_header_split_by_another_character_is_refused_by_name() {
        for (log, name) in [
            (&b"time_s|rpm|sog_kn\n0|1|2\n"[..], "'|'"),
            (b"\n\ntime_s rpm sog_kn\n0 1 2\n", "spaces"),
            (b"time:rpm:sog\n", "':'"),
        ] {
            let err = read_log(log).unwrap_err();
            let ImportError::UnknownSeparator { found, line } = err else {
                panic!("{err}")
            };
            assert_eq!(separator_name(found), name);
            assert_eq!(line, if name == "spaces" { 3 } else { 1 });
        }
        assert_eq!(foreign_separator("time_s,rpm|x,sog"), None);
        assert_eq!(foreign_separator("hello world"), None);
    }

    #[test]
    fn out_of_range_values_are_counted_under_their_own_reason() {
        // 70 kn is past the 60 kn bound; -800 rpm is below 0.
        let log = b"time_s,rpm,sog_kn,stw_kn\n0,1500,6,\n1,-800,6,\n2,1500,70,\n3,1500,6,-1\n4,1500,6,6\n";
        let imported = read_log(log).unwrap();
        assert_eq!(imported.samples.len(), 2);
        assert_eq!(imported.summary.bad_count(BadLine::RpmOutOfRange), 1);
        assert_eq!(imported.summary.bad_count(BadLine::SpeedOutOfRange), 2);
        assert_eq!(imported.summary.bad_count(BadLine::BadRow), 0);
        assert_eq!(imported.summary.first_bad[0], (3, BadLine::RpmOutOfRange));
    }

    #[test]
    fn header_detection() {
        assert!(looks_like_header("time_s,rpm,sog_kn"));
        assert!(!looks_like_header("0,1500,6"));
        assert!(!looks_like_header("$GPRMC,1,2"));
        assert!(!looks_like_header("time"));
    }
}
