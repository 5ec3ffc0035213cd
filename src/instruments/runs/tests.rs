use super::*;

fn steady(t0: f64, seconds: usize, rpm: f64, sog: f64, cog: f64) -> Vec<Sample> {
    (0..seconds)
        .map(|i| Sample {
            time_s: t0 + i as f64,
            engine_rpm: Some(rpm),
            speed_over_ground: Some(sog),
            course_over_ground_deg: Some(cog),
            ..Sample::default()
        })
        .collect()
}

#[test]
fn default_tolerance_is_the_larger_of_the_two() {
    // common practice: ±1.5 % or ±25 rpm, whichever is larger.
    let o = RunOptions::default();
    assert_eq!(o.rpm_tolerance(1000.0), 25.0);
    assert!((o.rpm_tolerance(3000.0) - 45.0).abs() < 1e-12);
}

#[test]
fn two_reciprocal_legs_pair_and_average() {
    let mut samples = steady(0.0, 100, 1500.0, 3.0, 10.0);
    samples.extend(steady(100.0, 100, 1510.0, 2.0, 185.0));
    let found = find_runs(&samples, &RunOptions::default(), &LineSummary::default()).unwrap();
    assert_eq!(found.runs.len(), 2);
    // 100 samples, first 20 s settle: 80 samples over 79 s.
    assert_eq!(found.runs[0].samples, 80);
    assert_eq!(found.pair_count(), 1);
    let trial = found.trial_runs();
    assert_eq!(trial[0].direction, Some(RunDirection::Out));
    assert_eq!(trial[1].direction, Some(RunDirection::Back));
    assert_eq!(trial[0].engine_rpm, 1505.0);
    assert_eq!(trial[1].speed_over_ground, 2.0);
}

#[test]
fn same_course_runs_do_not_pair() {
    let mut samples = steady(0.0, 100, 1500.0, 3.0, 10.0);
    samples.extend(steady(100.0, 100, 1800.0, 3.5, 10.0));
    samples.extend(steady(200.0, 100, 1500.0, 3.0, 100.0));
    let found = find_runs(&samples, &RunOptions::default(), &LineSummary::default()).unwrap();
    assert_eq!(found.runs.len(), 3);
    assert_eq!(found.pair_count(), 0);
}

#[test]
fn rejections_name_their_reason() {
    // 50 s steady: 30 s after settling, too short.
    let short = steady(0.0, 50, 1500.0, 3.0, 10.0);
    let err = find_runs(&short, &RunOptions::default(), &LineSummary::default()).unwrap_err();
    let NoRunError::NoSteadyRun { rejected, .. } = &err else {
        panic!("{err}")
    };
    assert!(
        matches!(rejected[0].reason, RejectReason::TooShort { .. }),
        "{err}"
    );
    assert!(
        err.to_string()
            .contains("too short: steady 29 s of 60 s needed"),
        "{err}"
    );

    // Speed still rising 0.01 m/s each second: 0.8 m/s over the run.
    let mut rising = steady(0.0, 100, 1500.0, 3.0, 10.0);
    for (i, s) in rising.iter_mut().enumerate() {
        s.speed_over_ground = Some(2.0 + 0.01 * i as f64);
    }
    let err = find_runs(&rising, &RunOptions::default(), &LineSummary::default()).unwrap_err();
    let NoRunError::NoSteadyRun { rejected, .. } = &err else {
        panic!("{err}")
    };
    assert!(matches!(
        rejected[0].reason,
        RejectReason::SpeedNotSteady { .. } | RejectReason::SpeedDrifting { .. }
    ));

    // No fix for half the run.
    let mut nofix = steady(0.0, 100, 1500.0, 3.0, 10.0);
    for s in nofix.iter_mut().skip(50) {
        s.speed_over_ground = None;
    }
    let err = find_runs(&nofix, &RunOptions::default(), &LineSummary::default()).unwrap_err();
    let NoRunError::NoSteadyRun { rejected, .. } = &err else {
        panic!("{err}")
    };
    assert!(matches!(rejected[0].reason, RejectReason::NoGpsFix { .. }));

    // rpm creeping up 0.4 rpm/s: within 25 rpm of the mean all along, 40 rpm over the run.
    let mut creeping = steady(0.0, 120, 1500.0, 3.0, 10.0);
    for (i, s) in creeping.iter_mut().enumerate() {
        s.engine_rpm = Some(1480.0 + 0.4 * i as f64);
    }
    let err = find_runs(&creeping, &RunOptions::default(), &LineSummary::default()).unwrap_err();
    let NoRunError::NoSteadyRun { rejected, .. } = &err else {
        panic!("{err}")
    };
    assert!(
        matches!(rejected[0].reason, RejectReason::RpmDrifting { .. }),
        "{err}"
    );
}

#[test]
fn missing_quantities_have_their_own_errors() {
    let none = find_runs(&[], &RunOptions::default(), &LineSummary::default());
    assert!(matches!(none, Err(NoRunError::NoSamples { .. })));
    let mut s = steady(0.0, 100, 1500.0, 3.0, 10.0);
    s.iter_mut().for_each(|s| s.engine_rpm = None);
    assert!(matches!(
        find_runs(&s, &RunOptions::default(), &LineSummary::default()),
        Err(NoRunError::NoRpm { .. })
    ));
    let mut s = steady(0.0, 100, 1500.0, 3.0, 10.0);
    s.iter_mut().for_each(|s| s.speed_over_ground = None);
    assert!(matches!(
        find_runs(&s, &RunOptions::default(), &LineSummary::default()),
        Err(NoRunError::NoSpeed { .. })
    ));
}

#[test]
fn live_push_reports_each_run_when_it_ends() {
    let mut finder = RunFinder::new(RunOptions::default());
    let mut events = Vec::new();
    for s in steady(0.0, 100, 1500.0, 3.0, 10.0)
        .iter()
        .chain(&steady(100.0, 100, 2000.0, 4.0, 10.0))
    {
        events.extend(finder.push(s));
    }
    assert_eq!(events, vec![RunEvent::Accepted(0)]);
    assert_eq!(finder.current_segment().len(), 100);
    assert_eq!(finder.finish(), Some(RunEvent::Accepted(1)));
    assert_eq!(finder.runs()[1].engine_rpm, 2000.0);
}

#[test]
fn a_gap_splits_a_run() {
    let mut samples = steady(0.0, 50, 1500.0, 3.0, 10.0);
    samples.extend(steady(60.0, 50, 1500.0, 3.0, 10.0));
    let err = find_runs(&samples, &RunOptions::default(), &LineSummary::default()).unwrap_err();
    let NoRunError::NoSteadyRun { rejected, .. } = err else {
        panic!()
    };
    assert_eq!(rejected.len(), 2);
}
