//! Sea-trial import from synthetic instrument logs (invented data: the truth is the generator's
//! own input, so these check the import against what was put in, not against the world).

use tidewright::instruments::synth::{self, SynthSpec, TimePrefix};
use tidewright::instruments::{
    BadLine, LogFormat, METRES_PER_SECOND_PER_KNOT, import, runs::NoRunError, runs::RunOptions,
};
use tidewright::propulsion::solver::trial::RunDirection;

/// An invented speed curve: m/s at rpm.
fn curve(rpm: f64) -> f64 {
    0.9 + 1.6e-3 * rpm
}

fn spec() -> SynthSpec {
    SynthSpec {
        rpm_steps: vec![1200.0, 1600.0, 2000.0, 2400.0],
        ..SynthSpec::default()
    }
}

fn check_recovery(text: &str) {
    let log = synth::generate(&spec(), curve, Some(&|rpm: f64| rpm * 1e-9));
    let content = if text == "csv" {
        log.csv.clone()
    } else {
        log.nmea.clone()
    };
    let imported = import(content.as_bytes(), None, &Default::default()).unwrap();
    let found = imported.find_runs(&RunOptions::default()).unwrap();
    assert_eq!(
        found.runs.len(),
        log.legs.len(),
        "{text}: {:?}",
        found.rejected
    );
    assert_eq!(found.pair_count(), 4, "{text}");
    for (run, leg) in found.runs.iter().zip(&log.legs) {
        // The acceptance bound: each run's mean speed within 0.05 kn of the truth.
        let error_kn = (run.speed_over_ground - leg.speed_over_ground) / METRES_PER_SECOND_PER_KNOT;
        assert!(
            error_kn.abs() < 0.05,
            "{text}: {} rpm {:?}: {error_kn:+.3} kn",
            leg.engine_rpm,
            leg.direction
        );
        assert!((run.engine_rpm - leg.engine_rpm).abs() < 3.0);
        assert_eq!(run.direction, Some(leg.direction));
        let stw = run.speed_through_water.unwrap();
        assert!((stw - leg.speed_through_water).abs() < 0.01);
    }
    let trial = found.trial_runs();
    assert!(trial.iter().all(|t| t.direction.is_some()));
    assert_eq!(
        trial
            .iter()
            .filter(|t| t.direction == Some(RunDirection::Out))
            .count(),
        4
    );
    if text == "csv" {
        assert!(trial[0].fuel_volume_flow.is_some());
    }
}

#[test]
fn nmea_log_recovers_each_run_and_pairs_them() {
    check_recovery("nmea");
}

#[test]
fn csv_log_recovers_each_run_and_pairs_them() {
    check_recovery("csv");
}

#[test]
fn every_time_prefix_reads_the_same() {
    for prefix in [TimePrefix::Iso, TimePrefix::Epoch, TimePrefix::TagBlock] {
        let spec = SynthSpec {
            time_prefix: prefix,
            rpm_steps: vec![1500.0],
            gps_talker: "GN",
            xdr: true,
            ..SynthSpec::default()
        };
        let log = synth::generate(&spec, curve, None);
        let imported = import(log.nmea.as_bytes(), None, &Default::default()).unwrap();
        assert_eq!(imported.format, LogFormat::Nmea);
        assert_eq!(imported.date.as_deref(), Some("2023-11-14"), "{prefix:?}");
        assert_eq!(
            imported.summary.bad_total(),
            0,
            "{prefix:?}: {}",
            imported.summary
        );
        let found = imported.find_runs(&RunOptions::default()).unwrap();
        assert_eq!(found.pair_count(), 1, "{prefix:?}");
    }
}

#[test]
fn the_core_calibration_sees_two_way_pairs() {
    // The converted runs group in the core's rule: each rpm once, both directions.
    let log = synth::generate(&spec(), curve, None);
    let imported = import(log.nmea.as_bytes(), None, &Default::default()).unwrap();
    let trial = imported
        .find_runs(&RunOptions::default())
        .unwrap()
        .trial_runs();
    for pair in trial.chunks(2) {
        assert_eq!(pair[0].engine_rpm, pair[1].engine_rpm);
        // Two-way mean removes the 0.3 m/s current: (out + back)/2 = speed through water.
        let two_way = 0.5 * (pair[0].speed_over_ground + pair[1].speed_over_ground);
        assert!((two_way - curve(pair[0].engine_rpm)).abs() < 0.05 * METRES_PER_SECOND_PER_KNOT);
    }
}

#[test]
fn corrupted_log_is_counted_not_fatal() {
    let log = synth::generate(
        &SynthSpec {
            rpm_steps: vec![1500.0],
            ..SynthSpec::default()
        },
        curve,
        None,
    );
    let mut lines: Vec<String> = log.nmea.lines().map(str::to_owned).collect();
    let n = lines.len();
    // Every 50th line: a flipped checksum digit; every 70th: cut in half; every 45th (an HDT): a made-up talker.
    let (mut flipped, mut cut, mut talker) = (0, 0, 0);
    for (i, line) in lines.iter_mut().enumerate() {
        if i % 50 == 7 {
            let last = line.pop().unwrap();
            line.push(if last == '0' { '1' } else { '0' });
            flipped += 1;
        } else if i % 70 == 11 {
            line.truncate(line.len() / 2);
            cut += 1;
        } else if i % 45 == 2 && line.starts_with("$HEHDT") {
            *line = tidewright::instruments::nmea::with_checksum(
                &line[1..line.len() - 3].replacen("HE", "QX", 1),
            );
            talker += 1;
        }
    }
    lines.insert(100, "\u{1}\u{2}garbage\u{7f}".to_owned());
    let text = lines.join("\n");
    let imported = import(text.as_bytes(), None, &Default::default()).unwrap();
    let s = &imported.summary;
    assert_eq!(s.lines, n + 1);
    assert_eq!(s.bad_count(BadLine::BadChecksum), flipped);
    assert_eq!(s.bad_count(BadLine::MissingChecksum), cut);
    assert_eq!(s.bad_count(BadLine::UnknownTalker), talker);
    assert_eq!(s.bad_count(BadLine::NotText), 1);
    assert!(talker > 0 && cut > 0 && flipped > 0);
    // The runs survive the damage.
    assert_eq!(
        imported
            .find_runs(&RunOptions::default())
            .unwrap()
            .pair_count(),
        1
    );
}

#[test]
fn binary_and_empty_files_say_why() {
    let binary: Vec<u8> = (0..4096u32)
        .map(|i| (i.wrapping_mul(2_654_435_761) >> 13) as u8)
        .collect();
    let imported = import(&binary, None, &Default::default()).unwrap();
    assert_eq!(imported.samples.len(), 0);
    assert!(imported.summary.bad_total() > 0);
    assert_eq!(imported.summary.bad_total(), imported.summary.lines);
    let err = imported.find_runs(&RunOptions::default()).unwrap_err();
    assert!(matches!(err, NoRunError::NoSamples { .. }), "{err}");
    assert!(
        err.to_string()
            .starts_with("the log holds no usable samples"),
        "{err}"
    );

    let err = import(b"", None, &Default::default()).unwrap_err();
    assert_eq!(err.to_string(), "the log is empty");
}

#[test]
fn a_log_with_no_steady_run_says_why() {
    // Legs of 40 s: after 20 s of settling, 20 s steady, short of the 60 s needed.
    let spec = SynthSpec {
        leg_s: 40.0,
        rpm_steps: vec![1500.0, 2000.0],
        ..SynthSpec::default()
    };
    let log = synth::generate(&spec, curve, None);
    let imported = import(log.nmea.as_bytes(), None, &Default::default()).unwrap();
    let err = imported.find_runs(&RunOptions::default()).unwrap_err();
    let NoRunError::NoSteadyRun { rejected, .. } = &err else {
        panic!("{err}")
    };
    assert_eq!(rejected.len(), 4, "{err}");
    assert!(err.to_string().contains("too short"), "{err}");
}
