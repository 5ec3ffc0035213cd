//! NMEA 0183 text logs: framing, checksum, the sentences a sea trial needs, and a reader that
//! turns a stream of lines into [`Sample`]s.
//!
//! # Lines
//!
//! One sentence a line (`\r\n` or `\n`), optionally preceded by
//! - a TAG block `\c:1700000000,s:GP01*hh\` (NMEA 0183 v4): its `c:` unix time is used
//!   (seconds; a value above 10¹¹ is taken as milliseconds); its checksum is checked;
//! - a timestamp and a space or comma: ISO 8601 (`2023-11-14T22:13:20.5Z`, zone optional, UTC
//!   when absent) or unix seconds (`1700000000.25`; above 10¹¹, milliseconds).
//!
//! Every sentence must end in `*hh`, the XOR of every character between `$` (or `!`) and `*`
//! as two hexadecimal digits (NMEA 0183, section 5.2.1 "Checksum"). A missing or wrong checksum,
//! an unknown talker or sentence type, unreadable fields or bytes that are not ASCII make a line
//! bad: it is counted by reason in the [`LineSummary`], never fatal.
//!
//! # Sentences used
//!
//! - `RMC`: time of day and date (the clock when lines carry no timestamp), fix status, SOG, COG.
//!   A fix flagged `V` (invalid) blanks SOG and COG until the next valid RMC, VTG included.
//! - `VTG`: SOG and COG. `HDT`: true heading. `VHW`: speed through water (knots, else km/h)
//!   and its true heading if given. These four are read by the `nmea` crate.
//! - `HDG` (read here): heading of a magnetic sensor, deviation and variation; true heading =
//!   sensor + deviation + variation (east positive). Without a variation the heading is
//!   magnetic and is used as it is.
//! - `RPM` (read here): `$--RPM,source,number,rpm,pitch %,status` — source `E` engine or `S`
//!   shaft; status `A` valid, `V` invalid (dropped). An rpm below 0 (astern) or above
//!   [`super::bounds::MAX_RPM`] makes the line [`BadLine::RpmOutOfRange`].
//! - `XDR` (read here): transducer quadruples `type,value,unit,name`; type `T` (tachometer)
//!   with unit `R` (rpm) is an engine rpm; the name's trailing number picks the engine
//!   (`ENGINE2` → engine 2; no number → engine 1).
//!
//! A speed over ground or through the water above [`super::bounds::MAX_SPEED_KN`] (a GPS
//! spike) makes its line [`BadLine::SpeedOutOfRange`]. A UTF-8 byte-order mark at the start of
//! a log is skipped.
//!
//! Other valid sentences (GGA, GSV, DPT, MWV, AIS `!AIVDM`, proprietary `$P…`) are counted as
//! ignored.
//!
//! # Time and fill-forward
//!
//! A line's time is its timestamp or TAG time, else the receipt time the caller gives (live
//! feeds), else the time of the last RMC. Lines within 0.5 s of a sample's start
//! ([`TICK_S`]) join that sample; a later line starts the next one. Each field of a sample is
//! the latest value read, carried forward until it is older than the fill-forward limit
//! ([`DEFAULT_MAX_AGE_S`], 5 s), after which it is left out — so a silent engine interface
//! never lends its last rpm to a minute of log. Lines before any time is known are counted as
//! [`BadLine::NoTime`].

use super::bounds::{check_rpm, check_speed};
use super::time::{parse_clock, parse_date, parse_iso8601};
use super::{
    BadLine, ImportOptions, ImportedLog, LineSummary, LogFormat, METRES_PER_SECOND_PER_KNOT, Sample,
};

/// Lines closer in time than this join one sample, s.
pub const TICK_S: f64 = 0.5;

/// Default fill-forward limit: a value older than this is left out of a sample, s.
pub const DEFAULT_MAX_AGE_S: f64 = 5.0;

/// Which rpm a log's sample carries.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, serde::Serialize)]
pub enum RpmSource {
    /// Engine number (RPM source `E`, or an XDR tachometer).
    Engine(u8),
    /// Shaft number (RPM source `S`).
    Shaft(u8),
}

impl std::fmt::Display for RpmSource {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            RpmSource::Engine(n) => write!(f, "E{n}"),
            RpmSource::Shaft(n) => write!(f, "S{n}"),
        }
    }
}

/// Talker identifiers of NMEA 0183 (from memory of the standard's talker table; proprietary
/// `P` sentences are handled apart).
const TALKERS: &[&str] = &[
    "AB", "AD", "AG", "AI", "AN", "AP", "AR", "AS", "AT", "AX", "BD", "BI", "BN", "CA", "CD", "CR",
    "CS", "CT", "CV", "CX", "DE", "DF", "DU", "EC", "EI", "EP", "ER", "FD", "FE", "FR", "FS", "GA",
    "GB", "GI", "GL", "GN", "GP", "GQ", "HC", "HD", "HE", "HF", "HN", "HS", "II", "IN", "JA", "JB",
    "JC", "JD", "JE", "JF", "JG", "JH", "JI", "JJ", "JK", "JL", "JM", "JN", "JO", "JP", "JR", "LC",
    "NL", "NV", "NW", "RA", "RB", "RC", "RI", "SA", "SD", "SG", "SN", "SS", "TC", "TI", "TR", "UP",
    "U0", "U1", "U2", "U3", "U4", "U5", "U6", "U7", "U8", "U9", "VD", "VM", "VR", "VS", "VW", "WD",
    "WI", "WL", "YC", "YD", "YF", "YL", "YP", "YR", "YT", "YV", "YX", "ZA", "ZC", "ZQ", "ZV",
];

/// Sentence types of NMEA 0183 this import does not use but accepts as valid (from memory of
/// the standard's sentence list).
const KNOWN_UNUSED: &[&str] = &[
    "AAM", "ABK", "ABM", "ACA", "ACK", "ACS", "AIR", "AKD", "ALA", "ALM", "ALR", "APA", "APB",
    "BBM", "BEC", "BOD", "BWC", "BWR", "BWW", "CUR", "DBK", "DBS", "DBT", "DCN", "DDC", "DOR",
    "DPT", "DSC", "DSE", "DTM", "ETL", "EVE", "FIR", "FSI", "GBS", "GEN", "GFA", "GGA", "GLC",
    "GLL", "GMP", "GNS", "GRS", "GSA", "GST", "GSV", "HDM", "HMR", "HMS", "HSC", "HTC", "HTD",
    "LCD", "LRF", "LRI", "LR1", "LR2", "LR3", "MDA", "MSK", "MSS", "MTW", "MWD", "MWV", "OSD",
    "RMA", "RMB", "ROR", "ROT", "RSA", "RSD", "RTE", "SFI", "SSD", "STN", "TLB", "TLL", "TRF",
    "TTD", "TTM", "TUT", "TXT", "VBW", "VDM", "VDO", "VDR", "VLW", "VPW", "VSD", "VTX", "VWR",
    "VWT", "WCV", "WNC", "WPL", "XDR", "XTE", "XTR", "ZDA", "ZDL", "ZFO", "ZTG",
];

/// XOR of the bytes of `body` (the characters between `$`/`!` and `*`), NMEA 0183 §5.2.1.
pub fn checksum(body: &str) -> u8 {
    body.bytes().fold(0, |c, b| c ^ b)
}

/// `$` + `body` + `*hh` with its checksum: a complete sentence (without line end).
pub fn with_checksum(body: &str) -> String {
    format!("${body}*{:02X}", checksum(body))
}

/// One reading from one sentence, SI.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Reading {
    /// RMC: time of day, s; date as days since 1970-01-01; fix; SOG m/s; COG degrees true.
    Fix {
        /// Seconds of the UTC day.
        time_of_day_s: Option<f64>,
        /// Days since 1970-01-01.
        date_days: Option<i64>,
        /// Whether the receiver flags the fix valid.
        valid: bool,
        /// Speed over ground, m/s.
        speed_over_ground: Option<f64>,
        /// Course over ground, degrees true.
        course_over_ground_deg: Option<f64>,
    },
    /// VTG: SOG m/s, COG degrees true.
    Track {
        /// Speed over ground, m/s.
        speed_over_ground: Option<f64>,
        /// Course over ground, degrees true.
        course_over_ground_deg: Option<f64>,
    },
    /// HDT/HDG/VHW heading, degrees (true, or magnetic from an HDG without variation).
    Heading(f64),
    /// VHW speed through water, m/s.
    WaterSpeed(f64),
    /// RPM/XDR engine or shaft speed, rpm (`None` when flagged invalid).
    Rpm(RpmSource, Option<f64>),
}

/// What one line held after framing and checks.
#[derive(Debug, Clone, PartialEq)]
pub struct ParsedLine {
    /// The line's own timestamp or TAG time, unix s.
    pub time_s: Option<f64>,
    /// The readings (empty for a valid sentence this import does not use).
    pub readings: Vec<Reading>,
}

/// Frames, checks and reads one line (without its line end).
pub fn parse_line(line: &[u8]) -> Result<ParsedLine, BadLine> {
    let text = std::str::from_utf8(line).map_err(|_| BadLine::NotText)?;
    if !text.is_ascii() || text.bytes().any(|b| b.is_ascii_control() && b != b'\t') {
        return Err(BadLine::NotText);
    }
    let text = text.trim();
    let (time_s, sentence) = split_prefix(text)?;
    Ok(ParsedLine {
        time_s,
        readings: parse_sentence(sentence)?,
    })
}

/// Unix seconds from a number that may be milliseconds (above 10¹¹).
fn epoch_seconds(value: f64) -> f64 {
    if value > 1e11 { value / 1000.0 } else { value }
}

/// Splits a TAG block or timestamp off the front of a line.
fn split_prefix(text: &str) -> Result<(Option<f64>, &str), BadLine> {
    if let Some(rest) = text.strip_prefix('\\') {
        let end = rest.find('\\').ok_or(BadLine::BadTimestamp)?;
        let (block, sentence) = (&rest[..end], &rest[end + 1..]);
        let (fields, sum) = block.rsplit_once('*').ok_or(BadLine::BadTimestamp)?;
        let sum = u8::from_str_radix(sum, 16).map_err(|_| BadLine::BadTimestamp)?;
        if sum != checksum(fields) {
            return Err(BadLine::BadChecksum);
        }
        let mut time_s = None;
        for field in fields.split(',') {
            if let Some(value) = field.strip_prefix("c:") {
                let value: f64 = value.parse().map_err(|_| BadLine::BadTimestamp)?;
                time_s = Some(epoch_seconds(value));
            }
        }
        // A TAG block may be followed by a timestamp-free sentence only.
        return Ok((time_s, sentence));
    }
    if text.starts_with('$') || text.starts_with('!') {
        return Ok((None, text));
    }
    let Some(start) = text.find(['$', '!', '\\']) else {
        return Err(BadLine::NotASentence);
    };
    let stamp = text[..start].trim_end_matches([' ', ',', ';', '\t']).trim();
    let time_s = parse_iso8601(stamp)
        .or_else(|| {
            stamp
                .parse::<f64>()
                .ok()
                .filter(|v| v.is_finite() && *v >= 0.0)
                .map(epoch_seconds)
        })
        .ok_or(if stamp.starts_with(|c: char| c.is_ascii_digit()) {
            BadLine::BadTimestamp
        } else {
            BadLine::NotASentence
        })?;
    let (tag_time, sentence) = split_prefix(&text[start..])?;
    Ok((tag_time.or(Some(time_s)), sentence))
}

/// Checks and reads one sentence `$…*hh` (or `!…*hh`).
pub fn parse_sentence(sentence: &str) -> Result<Vec<Reading>, BadLine> {
    let Some(body) = sentence
        .strip_prefix('$')
        .or_else(|| sentence.strip_prefix('!'))
    else {
        return Err(BadLine::NotASentence);
    };
    let Some((body, sum)) = body.rsplit_once('*') else {
        return Err(BadLine::MissingChecksum);
    };
    if sum.len() != 2 {
        return Err(BadLine::MissingChecksum);
    }
    let sum = u8::from_str_radix(sum, 16).map_err(|_| BadLine::MissingChecksum)?;
    if sum != checksum(body) {
        return Err(BadLine::BadChecksum);
    }
    let address = body.split(',').next().unwrap_or("");
    if address.starts_with('P') {
        return Ok(Vec::new()); // proprietary: valid, not ours
    }
    if address.len() != 5
        || !address
            .bytes()
            .all(|b| b.is_ascii_uppercase() || b.is_ascii_digit())
    {
        return Err(BadLine::UnknownSentence);
    }
    let (talker, kind) = address.split_at(2);
    if !TALKERS.contains(&talker) {
        return Err(BadLine::UnknownTalker);
    }
    let fields: Vec<&str> = body.split(',').skip(1).collect();
    match kind {
        "RMC" | "VTG" | "HDT" | "VHW" => read_with_crate(sentence),
        "HDG" => read_hdg(&fields).map(|h| h.into_iter().map(Reading::Heading).collect()),
        "RPM" => read_rpm(&fields).map(|r| vec![r]),
        "XDR" => read_xdr(&fields),
        _ if KNOWN_UNUSED.contains(&kind) => Ok(Vec::new()),
        _ => Err(BadLine::UnknownSentence),
    }
}

fn knots(value: f64) -> f64 {
    value * METRES_PER_SECOND_PER_KNOT
}

/// RMC, VTG, HDT and VHW through the `nmea` crate.
fn read_with_crate(sentence: &str) -> Result<Vec<Reading>, BadLine> {
    use ::nmea::ParseResult;
    let parsed = ::nmea::parse_str(sentence).map_err(|_| BadLine::BadFields)?;
    let finite = |v: Option<f32>| v.map(f64::from).filter(|v| v.is_finite());
    Ok(match parsed {
        ParseResult::RMC(rmc) => {
            let time_of_day_s = rmc.fix_time.and_then(|t| parse_clock(&format!("{t:?}")));
            let date_days = rmc.fix_date.and_then(|d| parse_date(&format!("{d:?}")));
            let valid = !matches!(
                rmc.status_of_fix,
                ::nmea::sentences::rmc::RmcStatusOfFix::Invalid
            );
            vec![Reading::Fix {
                time_of_day_s,
                date_days,
                valid,
                speed_over_ground: finite(rmc.speed_over_ground)
                    .map(|v| check_speed(knots(v)))
                    .transpose()?,
                course_over_ground_deg: finite(rmc.true_course).map(|c| c.rem_euclid(360.0)),
            }]
        }
        ParseResult::VTG(vtg) => vec![Reading::Track {
            speed_over_ground: finite(vtg.speed_over_ground)
                .map(|v| check_speed(knots(v)))
                .transpose()?,
            course_over_ground_deg: finite(vtg.true_course).map(|c| c.rem_euclid(360.0)),
        }],
        ParseResult::HDT(hdt) => finite(hdt.heading)
            .map(|h| Reading::Heading(h.rem_euclid(360.0)))
            .into_iter()
            .collect(),
        ParseResult::VHW(vhw) => {
            let mut readings = Vec::new();
            if let Some(h) = vhw.heading_true.filter(|v| v.is_finite()) {
                readings.push(Reading::Heading(h.rem_euclid(360.0)));
            }
            let stw = vhw
                .relative_speed_knots
                .map(knots)
                .or(vhw.relative_speed_kmph.map(|v| v / 3.6))
                .map(check_speed)
                .transpose()?;
            readings.extend(stw.map(Reading::WaterSpeed));
            readings
        }
        _ => Vec::new(),
    })
}

fn number(field: &str) -> Result<Option<f64>, BadLine> {
    if field.is_empty() {
        return Ok(None);
    }
    field
        .parse::<f64>()
        .ok()
        .filter(|v| v.is_finite())
        .map(Some)
        .ok_or(BadLine::BadFields)
}

/// `$--HDG,heading,deviation,E/W,variation,E/W`.
fn read_hdg(fields: &[&str]) -> Result<Option<f64>, BadLine> {
    if fields.len() < 5 {
        return Err(BadLine::BadFields);
    }
    let signed = |value: &str, side: &str| -> Result<f64, BadLine> {
        let v = number(value)?.unwrap_or(0.0);
        match side {
            "E" | "" => Ok(v),
            "W" => Ok(-v),
            _ => Err(BadLine::BadFields),
        }
    };
    let Some(sensor) = number(fields[0])? else {
        return Ok(None);
    };
    let heading = sensor + signed(fields[1], fields[2])? + signed(fields[3], fields[4])?;
    Ok(Some(heading.rem_euclid(360.0)))
}

/// `$--RPM,source,number,rpm,pitch %,status`.
fn read_rpm(fields: &[&str]) -> Result<Reading, BadLine> {
    if fields.len() < 5 {
        return Err(BadLine::BadFields);
    }
    let n: u8 = fields[1].parse().map_err(|_| BadLine::BadFields)?;
    let source = match fields[0] {
        "E" => RpmSource::Engine(n),
        "S" => RpmSource::Shaft(n),
        _ => return Err(BadLine::BadFields),
    };
    let rpm = number(fields[2])?;
    let valid = match fields[4] {
        "A" => true,
        "V" => false,
        _ => return Err(BadLine::BadFields),
    };
    let rpm = rpm.filter(|_| valid).map(check_rpm).transpose()?;
    Ok(Reading::Rpm(source, rpm))
}

/// `$--XDR,type,value,unit,name[,type,value,unit,name…]`.
fn read_xdr(fields: &[&str]) -> Result<Vec<Reading>, BadLine> {
    if fields.is_empty() || !fields.len().is_multiple_of(4) {
        return Err(BadLine::BadFields);
    }
    let mut readings = Vec::new();
    for quad in fields.chunks(4) {
        if quad[0] == "T" && quad[2] == "R" {
            let digits: String = quad[3]
                .chars()
                .rev()
                .take_while(char::is_ascii_digit)
                .collect::<Vec<_>>()
                .into_iter()
                .rev()
                .collect();
            let n = if digits.is_empty() {
                1
            } else {
                digits.parse().map_err(|_| BadLine::BadFields)?
            };
            let rpm = number(quad[1])?.map(check_rpm).transpose()?;
            readings.push(Reading::Rpm(RpmSource::Engine(n), rpm));
        }
    }
    Ok(readings)
}

/// The automatic rpm choice among `seen` sources: engine 1, else the lowest engine, else the
/// lowest shaft.
pub fn choose_rpm_source(seen: &[RpmSource]) -> Option<RpmSource> {
    let mut engines: Vec<RpmSource> = seen
        .iter()
        .copied()
        .filter(|s| matches!(s, RpmSource::Engine(_)))
        .collect();
    engines.sort();
    if engines.contains(&RpmSource::Engine(1)) {
        return Some(RpmSource::Engine(1));
    }
    engines
        .first()
        .copied()
        .or_else(|| seen.iter().copied().min())
}

/// A value with the time it was read, s.
#[derive(Debug, Clone, Copy, PartialEq)]
struct Stamped {
    value: f64,
    time_s: f64,
}

/// The latest value of each field.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
struct Latest {
    rpm: Option<Stamped>,
    sog: Option<Stamped>,
    cog: Option<Stamped>,
    heading: Option<Stamped>,
    stw: Option<Stamped>,
}

/// Reads NMEA lines one at a time into samples (usable live and in batch).
#[derive(Debug, Clone)]
pub struct NmeaReader {
    rpm_source: Option<RpmSource>,
    auto_rpm: bool,
    max_age_s: f64,
    latest: Latest,
    tick_s: Option<f64>,
    rmc_date_days: Option<i64>,
    rmc_time_s: Option<f64>,
    fix_valid: bool,
    first_date: Option<String>,
    summary: LineSummary,
    sources_seen: Vec<RpmSource>,
}

impl NmeaReader {
    /// A reader taking rpm from `rpm_source` (`None`: engine 1, else the first engine seen, else
    /// a shaft), leaving out values older than `max_age_s`, s.
    pub fn new(rpm_source: Option<RpmSource>, max_age_s: f64) -> Self {
        Self {
            rpm_source,
            auto_rpm: rpm_source.is_none(),
            max_age_s,
            latest: Latest::default(),
            tick_s: None,
            rmc_date_days: None,
            rmc_time_s: None,
            fix_valid: true,
            first_date: None,
            summary: LineSummary::default(),
            sources_seen: Vec::new(),
        }
    }

    /// The line counts so far.
    pub fn summary(&self) -> &LineSummary {
        &self.summary
    }

    /// The UTC date `YYYY-MM-DD` of the first dated time read, if any.
    pub fn date(&self) -> Option<&str> {
        self.first_date.as_deref()
    }

    /// Reads one line (1-based `line_number` for the summary); `receipt_time_s` is the clock to
    /// use when the line has no timestamp of its own (live feeds), unix s. Returns the sample
    /// completed by this line, if any.
    pub fn push_line(
        &mut self,
        line: &[u8],
        line_number: usize,
        receipt_time_s: Option<f64>,
    ) -> Option<Sample> {
        self.summary.lines += 1;
        let parsed = match parse_line(line) {
            Ok(p) => p,
            Err(reason) => {
                self.summary.count_bad(line_number, reason);
                return None;
            }
        };
        // The RMC's own clock, for logs without timestamps.
        let mut rmc_time = None;
        for reading in &parsed.readings {
            if let Reading::Fix {
                time_of_day_s: Some(tod),
                date_days,
                ..
            } = reading
            {
                if date_days.is_some() {
                    self.rmc_date_days = *date_days;
                }
                rmc_time = Some(self.rmc_date_days.unwrap_or(0) as f64 * 86_400.0 + tod);
            }
        }
        if rmc_time.is_some() {
            self.rmc_time_s = rmc_time;
        }
        let time_s = parsed.time_s.or(receipt_time_s).or(self.rmc_time_s);
        let Some(time_s) = time_s else {
            self.summary.count_bad(line_number, BadLine::NoTime);
            return None;
        };
        if self.first_date.is_none()
            && (parsed.time_s.is_some() || receipt_time_s.is_some() || self.rmc_date_days.is_some())
        {
            self.first_date = Some(super::time::date_of(time_s));
        }
        let completed = self.advance(time_s);
        if self.apply(&parsed.readings, time_s) {
            self.summary.used += 1;
        } else {
            self.summary.ignored += 1;
        }
        completed
    }

    /// Ends the stream: the last sample, if any.
    pub fn finish(&mut self) -> Option<Sample> {
        let tick = self.tick_s.take()?;
        self.sample_at(tick)
    }

    fn advance(&mut self, time_s: f64) -> Option<Sample> {
        match self.tick_s {
            Some(tick) if time_s >= tick + TICK_S || time_s < tick - TICK_S => {
                self.tick_s = Some(time_s);
                self.sample_at(tick)
            }
            Some(_) => None,
            None => {
                self.tick_s = Some(time_s);
                None
            }
        }
    }

    fn sample_at(&self, tick: f64) -> Option<Sample> {
        let fresh = |s: Option<Stamped>| {
            s.filter(|s| tick - s.time_s <= self.max_age_s)
                .map(|s| s.value)
        };
        let sample = Sample {
            time_s: tick,
            engine_rpm: fresh(self.latest.rpm),
            speed_over_ground: fresh(self.latest.sog),
            course_over_ground_deg: fresh(self.latest.cog),
            heading_deg: fresh(self.latest.heading),
            speed_through_water: fresh(self.latest.stw),
            fuel_volume_flow: None,
        };
        let any = sample.engine_rpm.is_some()
            || sample.speed_over_ground.is_some()
            || sample.heading_deg.is_some()
            || sample.speed_through_water.is_some();
        any.then_some(sample)
    }

    /// Applies readings at `time_s`; true if any went into the series.
    fn apply(&mut self, readings: &[Reading], time_s: f64) -> bool {
        let stamp = |value: Option<f64>| value.map(|value| Stamped { value, time_s });
        let mut used = false;
        for reading in readings {
            match *reading {
                Reading::Fix {
                    valid,
                    speed_over_ground,
                    course_over_ground_deg,
                    ..
                } => {
                    self.fix_valid = valid;
                    let (sog, cog) = if valid {
                        (speed_over_ground, course_over_ground_deg)
                    } else {
                        (None, None)
                    };
                    self.latest.sog = stamp(sog);
                    self.latest.cog = stamp(cog);
                    used = true;
                }
                Reading::Track {
                    speed_over_ground,
                    course_over_ground_deg,
                } => {
                    if self.fix_valid {
                        if speed_over_ground.is_some() {
                            self.latest.sog = stamp(speed_over_ground);
                        }
                        if course_over_ground_deg.is_some() {
                            self.latest.cog = stamp(course_over_ground_deg);
                        }
                    }
                    used = true;
                }
                Reading::Heading(h) => {
                    self.latest.heading = stamp(Some(h));
                    used = true;
                }
                Reading::WaterSpeed(v) => {
                    self.latest.stw = stamp(Some(v));
                    used = true;
                }
                Reading::Rpm(source, rpm) => {
                    if !self.sources_seen.contains(&source) {
                        self.sources_seen.push(source);
                        self.summary.rpm_sources.push(source.to_string());
                        if self.auto_rpm {
                            self.rpm_source = choose_rpm_source(&self.sources_seen);
                        }
                    }
                    if self.rpm_source == Some(source) {
                        self.latest.rpm = stamp(rpm);
                        used = true;
                    }
                }
            }
        }
        used
    }
}

/// Reads a whole NMEA log. With no rpm source given, the whole log is scanned first so the
/// automatic choice ([`choose_rpm_source`]) holds from the first line.
pub fn read_log(content: &[u8], options: &ImportOptions) -> ImportedLog {
    let rpm_source = options.rpm_source.or_else(|| {
        let mut seen = Vec::new();
        for (_, line) in super::numbered_lines(content) {
            if let Ok(parsed) = parse_line(line) {
                for r in parsed.readings {
                    if let Reading::Rpm(source, _) = r
                        && !seen.contains(&source)
                    {
                        seen.push(source);
                    }
                }
            }
        }
        choose_rpm_source(&seen)
    });
    let mut reader = NmeaReader::new(rpm_source, options.max_age_s.unwrap_or(DEFAULT_MAX_AGE_S));
    let mut samples = Vec::new();
    for (number, line) in super::numbered_lines(content) {
        samples.extend(reader.push_line(line, number, None));
    }
    samples.extend(reader.finish());
    ImportedLog {
        format: LogFormat::Nmea,
        samples,
        date: reader.date().map(str::to_owned),
        summary: reader.summary,
    }
}

#[cfg(test)]
mod tests;
