use super::super::nmea::with_checksum;
use super::*;
use std::io::Write;
use std::net::TcpListener;

fn quick() -> FeedOptions {
    FeedOptions {
        silence_s: 0.2,
        reconnect_after_silence_s: 5.0,
        reconnect_initial_s: 0.05,
        reconnect_max_s: 0.2,
        connect_timeout_s: 0.5,
        ..FeedOptions::default()
    }
}

/// Lines with their own epoch timestamps, 1 s apart from `t0`.
fn lines(t0: u32, n: u32) -> String {
    (0..n)
        .map(|i| {
            format!(
                "{},{}\r\n{},{}\r\n",
                t0 + i,
                with_checksum("ERRPM,E,1,1500,,A"),
                t0 + i,
                with_checksum("GPHDT,45.0,T")
            )
        })
        .collect()
}

/// Collects events until `done` says so or `limit` passes.
fn collect(feed: &Feed, limit: Duration, done: impl Fn(&[FeedEvent]) -> bool) -> Vec<FeedEvent> {
    let start = Instant::now();
    let mut events = Vec::new();
    while start.elapsed() < limit && !done(&events) {
        events.extend(feed.drain());
        std::thread::sleep(Duration::from_millis(10));
    }
    events
}

fn samples(events: &[FeedEvent]) -> usize {
    events
        .iter()
        .filter(|e| matches!(e, FeedEvent::Sample(_)))
        .count()
}

#[test]
fn addresses() {
    assert_eq!(
        FeedSource::parse("tcp://10.0.0.5:10110"),
        Ok(FeedSource::Tcp("10.0.0.5:10110".into()))
    );
    assert_eq!(
        FeedSource::parse("udp://:10110"),
        Ok(FeedSource::Udp("0.0.0.0:10110".into()))
    );
    assert_eq!(
        FeedSource::parse("log.nmea"),
        Ok(FeedSource::File("log.nmea".into()))
    );
    assert!(FeedSource::parse("tcp://host").is_err());
    assert!(FeedSource::parse("tcp://host:99999").is_err());
    assert!(FeedSource::parse("serial:///dev/ttyUSB0").is_err());
}

#[test]
fn tcp_reconnects_when_the_server_comes_back() {
    let listener = TcpListener::bind("127.0.0.1:0").unwrap();
    let port = listener.local_addr().unwrap().port();
    let server = std::thread::spawn(move || {
        let (mut conn, _) = listener.accept().unwrap();
        conn.write_all(lines(1_700_000_000, 3).as_bytes()).unwrap();
        drop(conn);
        drop(listener);
        std::thread::sleep(Duration::from_millis(250));
        let listener = TcpListener::bind(("127.0.0.1", port)).unwrap();
        let (mut conn, _) = listener.accept().unwrap();
        conn.write_all(lines(1_700_000_100, 3).as_bytes()).unwrap();
        // Stay quiet long enough to show as silent, then close.
        std::thread::sleep(Duration::from_millis(400));
    });
    let feed = Feed::start(
        FeedSource::parse(&format!("tcp://127.0.0.1:{port}")).unwrap(),
        quick(),
    );
    let events = collect(&feed, Duration::from_millis(1800), |e| {
        samples(e) >= 6
            && e.iter()
                .any(|e| matches!(e, FeedEvent::State(FeedState::Silent { .. })))
    });
    server.join().unwrap();
    let states: Vec<&FeedState> = events
        .iter()
        .filter_map(|e| {
            if let FeedEvent::State(s) = e {
                Some(s)
            } else {
                None
            }
        })
        .collect();
    assert_eq!(samples(&events), 6, "{states:?}");
    assert!(
        states
            .iter()
            .filter(|s| matches!(s, FeedState::Live))
            .count()
            >= 2,
        "{states:?}"
    );
    assert!(
        states
            .iter()
            .any(|s| matches!(s, FeedState::Reconnecting { .. })),
        "{states:?}"
    );
    assert!(
        states.iter().any(|s| matches!(s, FeedState::Silent { .. })),
        "{states:?}"
    );
    let first = events
        .iter()
        .find_map(|e| {
            if let FeedEvent::Sample(s) = e {
                Some(*s)
            } else {
                None
            }
        })
        .unwrap();
    assert_eq!(first.engine_rpm, Some(1500.0));
    assert_eq!(first.time_s, 1_700_000_000.0);
}

/// The `Reconnecting` states among `events`: (attempt, delay in s).
fn reconnects(events: &[FeedEvent]) -> Vec<(u32, f64)> {
    events
        .iter()
        .filter_map(|e| match e {
            FeedEvent::State(FeedState::Reconnecting { attempt, in_s, .. }) => {
                Some((*attempt, *in_s))
            }
            _ => None,
        })
        .collect()
}

#[test]
fn a_server_that_closes_at_once_is_redialled_ever_more_slowly() {
    let listener = TcpListener::bind("127.0.0.1:0").unwrap();
    let port = listener.local_addr().unwrap().port();
    // Five connections closed at once, one that delivers two seconds of sentences, then
    // the listener closed.
    let server = std::thread::spawn(move || {
        for i in 0..6 {
            let Ok((mut conn, _)) = listener.accept() else {
                return;
            };
            if i == 5 {
                conn.write_all(lines(1_700_000_000, 2).as_bytes()).unwrap();
            }
        }
    });
    let feed = Feed::start(
        FeedSource::parse(&format!("tcp://127.0.0.1:{port}")).unwrap(),
        quick(),
    );
    let events = collect(&feed, Duration::from_millis(3000), |e| {
        reconnects(e).len() >= 6
    });
    drop(feed);
    server.join().unwrap();
    // quick(): 0.05 s doubling to 0.2 s. Dying young never resets the delay; the connection
    // that delivered does, so the attempt after it starts again from the first delay.
    assert_eq!(
        reconnects(&events)[..6],
        [(1, 0.05), (2, 0.1), (3, 0.2), (4, 0.2), (5, 0.2), (1, 0.05)],
        "{events:?}"
    );
    let shown = FeedState::Reconnecting {
        attempt: 3,
        in_s: 4.0,
        reason: "the server closed the connection".into(),
    }
    .to_string();
    assert_eq!(
        shown,
        "reconnecting in 4 s (the server closed the connection)"
    );
}

#[test]
fn udp_datagrams_become_samples() {
    let probe = UdpSocket::bind("127.0.0.1:0").unwrap();
    let port = probe.local_addr().unwrap().port();
    drop(probe);
    let feed = Feed::start(
        FeedSource::parse(&format!("udp://127.0.0.1:{port}")).unwrap(),
        quick(),
    );
    collect(&feed, Duration::from_millis(500), |e| {
        e.contains(&FeedEvent::State(FeedState::Live))
    });
    let sender = UdpSocket::bind("127.0.0.1:0").unwrap();
    for line in lines(1_700_000_000, 4).lines() {
        sender
            .send_to(line.as_bytes(), ("127.0.0.1", port))
            .unwrap();
    }
    let events = collect(&feed, Duration::from_millis(1000), |e| samples(e) >= 4);
    assert_eq!(samples(&events), 4, "{events:?}");
}

#[test]
fn file_replays_at_its_own_pace_sped_up() {
    let spec = super::super::synth::SynthSpec {
        rpm_steps: vec![1500.0],
        leg_s: 60.0,
        turn_s: 20.0,
        ..Default::default()
    };
    let log = super::super::synth::generate(&spec, |rpm| rpm / 500.0, None);
    let mut file = tempfile::NamedTempFile::new().unwrap();
    file.write_all(log.nmea.as_bytes()).unwrap();
    let expected = import(log.nmea.as_bytes(), None, &ImportOptions::default())
        .unwrap()
        .samples
        .len();
    // About 170 s of log at 400× is about 0.43 s.
    let options = FeedOptions {
        replay_speedup: 400.0,
        ..quick()
    };
    let start = Instant::now();
    let feed = Feed::start(FeedSource::File(file.path().to_owned()), options);
    let events = collect(&feed, Duration::from_millis(1800), |e| {
        e.iter()
            .any(|e| matches!(e, FeedEvent::State(FeedState::Closed { .. })))
    });
    let elapsed = start.elapsed().as_secs_f64();
    assert_eq!(samples(&events), expected);
    assert!(elapsed > 0.3, "replayed too fast: {elapsed} s");
    assert!(events.contains(&FeedEvent::State(FeedState::Closed {
        reason: "end of file".into()
    })));
}

#[test]
fn dropping_the_feed_stops_the_thread_without_blocking() {
    let feed = Feed::start(FeedSource::Tcp("127.0.0.1:9".into()), quick());
    let start = Instant::now();
    drop(feed);
    assert!(start.elapsed() < Duration::from_millis(50));
}
