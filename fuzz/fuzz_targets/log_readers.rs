//! Fuzz target: arbitrary bytes into the log readers — NMEA, CSV and the format detection.
//!
//! No reader may panic. What they give back must hold together: every line is counted once
//! (used, ignored or bad by a reason), the first bad lines point inside the input, and every
//! sample's figures are finite and inside the bounds the readers promise (rpm and speeds
//! within `instruments::bounds`, angles 0–360).

#![no_main]

use libfuzzer_sys::fuzz_target;
use tidewright::instruments::bounds::{rpm_in_range, speed_in_range};
use tidewright::instruments::{ImportOptions, ImportedLog, LogFormat, detect_format, import};

fn check(log: &ImportedLog, data: &[u8]) {
    let summary = &log.summary;
    let lines = data.split(|b| *b == b'\n').count();
    assert!(
        summary.lines <= lines,
        "{} lines counted in {lines}",
        summary.lines
    );
    assert_eq!(
        summary.used + summary.ignored + summary.bad_total(),
        summary.lines,
        "a line counted twice or not at all: {summary}"
    );
    for (line, _) in &summary.first_bad {
        assert!(
            (1..=lines).contains(line),
            "bad line {line} outside 1..={lines}"
        );
    }
    for sample in &log.samples {
        assert!(sample.time_s.is_finite(), "{sample:?}");
        if let Some(rpm) = sample.engine_rpm {
            assert!(rpm_in_range(rpm), "{sample:?}");
        }
        for speed in [sample.speed_over_ground, sample.speed_through_water]
            .into_iter()
            .flatten()
        {
            assert!(speed_in_range(speed), "{sample:?}");
        }
        for angle in [sample.course_over_ground_deg, sample.heading_deg]
            .into_iter()
            .flatten()
        {
            assert!((0.0..=360.0).contains(&angle), "{sample:?}");
        }
        if let Some(fuel) = sample.fuel_volume_flow {
            assert!(fuel.is_finite() && fuel >= 0.0, "{sample:?}");
        }
    }
}

fuzz_target!(|data: &[u8]| {
    let options = ImportOptions::default();
    let detected = detect_format(data);
    for format in [None, Some(LogFormat::Nmea), Some(LogFormat::Csv)] {
        match import(data, format, &options) {
            Ok(log) => {
                if format.is_none() {
                    assert_eq!(Some(log.format), detected, "import and detection disagree");
                }
                check(&log, data);
            }
            // Only the CSV reader refuses a whole file, and its message is never empty.
            Err(error) => {
                assert!(!error.to_string().is_empty());
                assert_ne!(format, Some(LogFormat::Nmea), "NMEA refused: {error}");
            }
        }
    }
});
