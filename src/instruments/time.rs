//! Calendar arithmetic for log timestamps: UTC civil date and time ↔ unix seconds.
//!
//! Small on purpose (no time-zone database): logs give UTC, or an ISO 8601 offset we apply.

/// Days from 1970-01-01 to the proleptic Gregorian date `year-month-day`.
///
/// The days-from-civil algorithm of H. Hinnant, "chrono-Compatible Low-Level Date Algorithms"
/// (public domain).
pub fn days_from_civil(year: i64, month: u32, day: u32) -> i64 {
    let y = if month <= 2 { year - 1 } else { year };
    let era = y.div_euclid(400);
    let yoe = y - era * 400;
    let m = i64::from(month);
    let doy = (153 * (if m > 2 { m - 3 } else { m + 9 }) + 2) / 5 + i64::from(day) - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    era * 146_097 + doe - 719_468
}

/// The civil date `(year, month, day)` of a day count from 1970-01-01 (inverse of
/// [`days_from_civil`], same source).
pub fn civil_from_days(days: i64) -> (i64, u32, u32) {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let day = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let month = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    let year = yoe + era * 400 + i64::from(month <= 2);
    (year, month, day)
}

/// The UTC date `YYYY-MM-DD` of unix time `time_s`, s; a time before year 0 or after 9999 (a
/// log's nonsense timestamp) gives that year's first or last day rather than an overflow.
pub fn date_of(time_s: f64) -> String {
    let first = days_from_civil(0, 1, 1) as f64;
    let last = days_from_civil(9999, 12, 31) as f64;
    let days = (time_s / 86_400.0).floor();
    let days = if days.is_nan() {
        0.0
    } else {
        days.clamp(first, last)
    };
    let (y, m, d) = civil_from_days(days as i64);
    format!("{y:04}-{m:02}-{d:02}")
}

/// `hh:mm:ss` UTC of unix time `time_s`, s.
pub fn clock_of(time_s: f64) -> String {
    let secs = time_s.rem_euclid(86_400.0).floor() as u64;
    format!("{:02}:{:02}:{:02}", secs / 3600, secs / 60 % 60, secs % 60)
}

fn digits(text: &str, range: std::ops::Range<usize>) -> Option<u32> {
    let part = text.get(range)?;
    part.bytes()
        .all(|b| b.is_ascii_digit())
        .then(|| part.parse().ok())?
}

/// Parses `YYYY-MM-DD` into days from 1970-01-01.
pub fn parse_date(text: &str) -> Option<i64> {
    if text.len() != 10 || text.get(4..5) != Some("-") || text.get(7..8) != Some("-") {
        return None;
    }
    let (y, m, d) = (
        digits(text, 0..4)?,
        digits(text, 5..7)?,
        digits(text, 8..10)?,
    );
    ((1..=12).contains(&m) && (1..=31).contains(&d)).then(|| days_from_civil(i64::from(y), m, d))
}

/// Parses `hh:mm:ss[.fff]` into seconds of the day.
pub fn parse_clock(text: &str) -> Option<f64> {
    if text.len() < 8 || text.get(2..3) != Some(":") || text.get(5..6) != Some(":") {
        return None;
    }
    let (h, m) = (digits(text, 0..2)?, digits(text, 3..5)?);
    let s: f64 = text[6..]
        .parse()
        .ok()
        .filter(|s: &f64| (0.0..61.0).contains(s))?;
    (h < 24 && m < 60).then(|| f64::from(h * 3600 + m * 60) + s)
}

/// Parses an ISO 8601 date-time `YYYY-MM-DDThh:mm:ss[.fff][Z|±hh:mm]` (a space may stand for
/// `T`; no zone means UTC) into unix seconds.
pub fn parse_iso8601(text: &str) -> Option<f64> {
    let date = parse_date(text.get(0..10)?)?;
    let sep = text.get(10..11)?;
    if sep != "T" && sep != " " && sep != "t" {
        return None;
    }
    let rest = &text[11..];
    let (clock, offset_s) = if let Some(c) = rest.strip_suffix(['Z', 'z']) {
        (c, 0.0)
    } else if let Some(pos) = rest.rfind(['+', '-']).filter(|&p| p >= 8) {
        let zone = &rest[pos + 1..];
        let (h, m) = match zone.len() {
            5 if zone.get(2..3) == Some(":") => (digits(zone, 0..2)?, digits(zone, 3..5)?),
            4 => (digits(zone, 0..2)?, digits(zone, 2..4)?),
            2 => (digits(zone, 0..2)?, 0),
            _ => return None,
        };
        let sign = if &rest[pos..pos + 1] == "+" {
            1.0
        } else {
            -1.0
        };
        (&rest[..pos], sign * f64::from(h * 3600 + m * 60))
    } else {
        (rest, 0.0)
    };
    Some(date as f64 * 86_400.0 + parse_clock(clock)? - offset_s)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_nonsense_time_gives_a_date_at_the_end_of_the_range() {
        // Found by the feed_framing fuzz target: a timestamp of 1e300 s overflowed the day count.
        assert_eq!(date_of(1e300), "9999-12-31");
        assert_eq!(date_of(-1e300), "0000-01-01");
        assert_eq!(date_of(f64::NAN), "1970-01-01");
        assert_eq!(date_of(1_700_000_000.0), "2023-11-14");
    }

    #[test]
    fn text_that_is_not_ascii_is_refused_not_sliced_apart() {
        // Found by the log_readers fuzz target: a byte-order mark inside a date's field.
        assert_eq!(parse_date("2023\u{feff}1114"), None);
        assert_eq!(parse_clock("12\u{feff}3456"), None);
        assert_eq!(parse_iso8601("2023-11-14T22:13:20+1\u{e9}0"), None);
        assert_eq!(
            parse_iso8601("2023-11-14T22:13:20+01:00"),
            Some(1_700_000_000.0 - 3600.0)
        );
    }

    #[test]
    fn unix_epoch_and_a_known_date() {
        assert_eq!(days_from_civil(1970, 1, 1), 0);
        // 1 700 000 000 s after the epoch is 2023-11-14T22:13:20Z (POSIX time: 19675 days of
        // 86 400 s plus 80 000 s; checked by hand: 19675 × 86400 + 80000 = 1 700 000 000).
        assert_eq!(days_from_civil(2023, 11, 14), 19_675);
        assert_eq!(date_of(1_700_000_000.0), "2023-11-14");
        assert_eq!(clock_of(1_700_000_000.0), "22:13:20");
        assert_eq!(civil_from_days(19_675), (2023, 11, 14));
        // 2000 was a leap year (Gregorian rule: divisible by 400), so 29 February exists.
        assert_eq!(
            days_from_civil(2000, 3, 1) - days_from_civil(2000, 2, 28),
            2
        );
    }

    #[test]
    fn iso8601_forms() {
        assert_eq!(parse_iso8601("2023-11-14T22:13:20Z"), Some(1_700_000_000.0));
        assert_eq!(parse_iso8601("2023-11-14 22:13:20"), Some(1_700_000_000.0));
        assert_eq!(
            parse_iso8601("2023-11-14T23:13:20+01:00"),
            Some(1_700_000_000.0)
        );
        assert_eq!(
            parse_iso8601("2023-11-14T22:13:20.5Z"),
            Some(1_700_000_000.5)
        );
        assert_eq!(parse_iso8601("2023-13-14T22:13:20Z"), None);
        assert_eq!(parse_iso8601("2023-11-14T25:13:20Z"), None);
        assert_eq!(parse_iso8601("yesterday"), None);
    }
}
