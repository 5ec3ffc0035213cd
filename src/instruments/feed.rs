//! The live feed: NMEA 0183 from TCP, UDP or a file replayed in real time, read on a background
//! thread that sends samples and its state over one channel; the caller polls and never blocks.
//!
//! Sources: `tcp://HOST:PORT` (a multiplexer or instrument server; 10110 is the IANA-registered
//! NMEA-0183 port), `udp://:PORT` or `udp://ADDRESS:PORT` (broadcast or unicast datagrams,
//! bound locally), or a file path (NMEA or CSV, replayed at the pace of its own timestamps times
//! [`FeedOptions::replay_speedup`]).
//!
//! States: [`FeedState::Connecting`] → [`FeedState::Live`]; a feed with no data for
//! [`FeedOptions::silence_s`] is [`FeedState::Silent`]; a closed or failed TCP connection (or
//! one silent for [`FeedOptions::reconnect_after_silence_s`]) is [`FeedState::Reconnecting`]
//! with a doubling backoff from [`FeedOptions::reconnect_initial_s`] up to
//! [`FeedOptions::reconnect_max_s`] ([`backoff`]): it keeps growing while connections die
//! before they deliver a sentence (a server that accepts and closes at once), and starts again
//! from the first delay only after one that delivered; [`FeedState::Closed`] is final
//! (stopped, end of a replayed file, or a file that cannot be read).
//!
//! Bytes become lines in [`framing`], the one place that copes with reads ending inside a
//! line and with junk that never ends one.
//!
//! Network lines carry the time they were received unless they hold their own timestamp or
//! TAG block (see [`super::nmea`]), so a receiver's clock quirks do not stall the run finder.

pub mod backoff;
pub mod framing;

use super::nmea::{DEFAULT_MAX_AGE_S, NmeaReader, RpmSource};
use super::{ImportOptions, LineSummary, Sample, import};
use backoff::Backoff;
use framing::LineFramer;
use std::io::{ErrorKind, Read};
use std::net::{TcpStream, ToSocketAddrs, UdpSocket};
use std::path::PathBuf;
use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::mpsc::{Receiver, Sender, channel};
use std::time::{Duration, Instant, SystemTime, UNIX_EPOCH};

/// Where a feed reads from.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum FeedSource {
    /// A TCP server, `HOST:PORT`.
    Tcp(String),
    /// A local UDP address to bind, `ADDRESS:PORT`.
    Udp(String),
    /// A log file replayed in real time.
    File(PathBuf),
}

/// Why a feed address could not be understood.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum FeedError {
    /// A `tcp://` or `udp://` address without a usable port.
    #[error("feed {text:?}: expected tcp://HOST:PORT, udp://:PORT or a file path ({problem})")]
    BadAddress {
        /// The text given.
        text: String,
        /// What is wrong.
        problem: &'static str,
    },
}

impl FeedSource {
    /// Parses `tcp://HOST:PORT`, `udp://:PORT`, `udp://ADDRESS:PORT` or a file path.
    pub fn parse(text: &str) -> Result<Self, FeedError> {
        let bad = |problem| FeedError::BadAddress {
            text: text.to_owned(),
            problem,
        };
        let port_of = |rest: &str| -> Result<(String, u16), FeedError> {
            let (host, port) = rest.rsplit_once(':').ok_or(bad("no :PORT"))?;
            let port: u16 = port
                .parse()
                .map_err(|_| bad("the port is not a number 0–65535"))?;
            Ok((host.trim_matches(['[', ']']).to_owned(), port))
        };
        if let Some(rest) = text.strip_prefix("tcp://") {
            let (host, port) = port_of(rest)?;
            if host.is_empty() || port == 0 {
                return Err(bad("TCP needs a host and a non-zero port"));
            }
            Ok(FeedSource::Tcp(join(&host, port)))
        } else if let Some(rest) = text.strip_prefix("udp://") {
            let (host, port) = port_of(rest)?;
            Ok(FeedSource::Udp(join(
                if host.is_empty() { "0.0.0.0" } else { &host },
                port,
            )))
        } else if text.contains("://") {
            Err(bad("unknown scheme"))
        } else {
            Ok(FeedSource::File(PathBuf::from(text)))
        }
    }
}

fn join(host: &str, port: u16) -> String {
    if host.contains(':') {
        format!("[{host}]:{port}")
    } else {
        format!("{host}:{port}")
    }
}

/// Settings of a feed.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FeedOptions {
    /// No data for this long shows as silent, s (default 5).
    pub silence_s: f64,
    /// A TCP feed silent for this long is reconnected, s (default 30).
    pub reconnect_after_silence_s: f64,
    /// First reconnect delay, s (default 1); doubles each failed attempt.
    pub reconnect_initial_s: f64,
    /// Longest reconnect delay, s (default 30).
    pub reconnect_max_s: f64,
    /// TCP connect timeout, s (default 5).
    pub connect_timeout_s: f64,
    /// Replay speed of a file: 1 is real time (default 1).
    pub replay_speedup: f64,
    /// Which rpm to use (`None`: automatic, see [`super::nmea::choose_rpm_source`]).
    pub rpm_source: Option<RpmSource>,
    /// Fill-forward limit, s (default 5).
    pub max_age_s: f64,
}

impl Default for FeedOptions {
    fn default() -> Self {
        Self {
            silence_s: 5.0,
            reconnect_after_silence_s: 30.0,
            reconnect_initial_s: 1.0,
            reconnect_max_s: 30.0,
            connect_timeout_s: 5.0,
            replay_speedup: 1.0,
            rpm_source: None,
            max_age_s: DEFAULT_MAX_AGE_S,
        }
    }
}

/// The state of a feed.
#[derive(Debug, Clone, PartialEq)]
pub enum FeedState {
    /// Connecting (or binding, or opening the file).
    Connecting,
    /// Connected and receiving.
    Live,
    /// Connected but no data for this long, s.
    Silent {
        /// Time since the last data, s.
        for_s: f64,
    },
    /// Waiting to reconnect.
    Reconnecting {
        /// Attempt number, from 1.
        attempt: u32,
        /// Delay before the attempt, s.
        in_s: f64,
        /// What went wrong.
        reason: String,
    },
    /// Finished for good.
    Closed {
        /// Why.
        reason: String,
    },
}

impl std::fmt::Display for FeedState {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            FeedState::Connecting => f.write_str("connecting"),
            FeedState::Live => f.write_str("live"),
            FeedState::Silent { for_s } => write!(f, "no data for {for_s:.0} s"),
            FeedState::Reconnecting { in_s, reason, .. } => {
                write!(f, "reconnecting in {in_s:.0} s ({reason})")
            }
            FeedState::Closed { reason } => write!(f, "closed ({reason})"),
        }
    }
}

/// What the feed thread sends.
#[derive(Debug, Clone, PartialEq)]
pub enum FeedEvent {
    /// The state changed.
    State(FeedState),
    /// A sample.
    Sample(Sample),
    /// The line counts so far (sent at most once a second, and at the end).
    Lines(LineSummary),
}

/// A running feed; dropping it stops the thread (which notices within 0.1 s).
#[derive(Debug)]
pub struct Feed {
    events: Receiver<FeedEvent>,
    stop: Arc<AtomicBool>,
}

/// How often the thread wakes to check for stop and silence.
const POLL: Duration = Duration::from_millis(100);

impl Feed {
    /// Starts reading `source` on a background thread.
    pub fn start(source: FeedSource, options: FeedOptions) -> Feed {
        let (tx, events) = channel();
        let stop = Arc::new(AtomicBool::new(false));
        let worker = Worker {
            tx,
            stop: Arc::clone(&stop),
            options,
            reader: NmeaReader::new(options.rpm_source, options.max_age_s),
            last_lines_sent: Instant::now(),
        };
        std::thread::spawn(move || worker.run(source));
        Feed { events, stop }
    }

    /// The next event if one is waiting; never blocks.
    pub fn try_recv(&self) -> Option<FeedEvent> {
        self.events.try_recv().ok()
    }

    /// Every event waiting now.
    pub fn drain(&self) -> Vec<FeedEvent> {
        std::iter::from_fn(|| self.try_recv()).collect()
    }

    /// Asks the thread to stop.
    pub fn stop(&self) {
        self.stop.store(true, Ordering::Relaxed);
    }
}

impl Drop for Feed {
    fn drop(&mut self) {
        self.stop();
    }
}

fn now_unix_s() -> f64 {
    SystemTime::now()
        .duration_since(UNIX_EPOCH)
        .map(|d| d.as_secs_f64())
        .unwrap_or(0.0)
}

struct Worker {
    tx: Sender<FeedEvent>,
    stop: Arc<AtomicBool>,
    options: FeedOptions,
    reader: NmeaReader,
    last_lines_sent: Instant,
}

/// How a connection ended.
enum Ended {
    Stopped,
    Lost(String),
}

impl Worker {
    fn stopped(&self) -> bool {
        self.stop.load(Ordering::Relaxed)
    }

    /// Sends; false when the receiver is gone (the thread then ends).
    fn send(&self, event: FeedEvent) -> bool {
        self.tx.send(event).is_ok()
    }

    fn run(mut self, source: FeedSource) {
        let reason = match source {
            FeedSource::Tcp(address) => self.run_tcp(&address),
            FeedSource::Udp(address) => self.run_udp(&address),
            FeedSource::File(path) => self.run_file(&path),
        };
        self.send(FeedEvent::Lines(self.reader.summary().clone()));
        self.send(FeedEvent::State(FeedState::Closed { reason }));
    }

    /// Waits `seconds` in short sleeps; false if stopped meanwhile.
    fn wait(&self, seconds: f64) -> bool {
        let until = Instant::now() + Duration::from_secs_f64(seconds.max(0.0));
        while Instant::now() < until {
            if self.stopped() {
                return false;
            }
            std::thread::sleep(POLL.min(until.saturating_duration_since(Instant::now())));
        }
        !self.stopped()
    }

    fn backoff(&self) -> Backoff {
        Backoff::new(
            self.options.reconnect_initial_s,
            self.options.reconnect_max_s,
        )
    }

    fn run_tcp(&mut self, address: &str) -> String {
        let mut backoff = self.backoff();
        loop {
            if self.stopped() || !self.send(FeedEvent::State(FeedState::Connecting)) {
                return "stopped".to_owned();
            }
            let reason = match connect(address, self.options.connect_timeout_s) {
                Ok(stream) => {
                    let used_before = self.reader.summary().used;
                    let ended = self.read_stream(stream);
                    // Only a connection that gave sentences proves the server works; one that
                    // dies young must not reset the delay, or a server that accepts and closes
                    // is redialled every first delay forever.
                    if self.reader.summary().used > used_before {
                        backoff.delivered();
                    }
                    match ended {
                        Ended::Stopped => return "stopped".to_owned(),
                        Ended::Lost(reason) => reason,
                    }
                }
                Err(reason) => reason,
            };
            let (attempt, in_s) = backoff.failed();
            if !self.send(FeedEvent::State(FeedState::Reconnecting {
                attempt,
                in_s,
                reason,
            })) || !self.wait(in_s)
            {
                return "stopped".to_owned();
            }
        }
    }

    /// Complete lines go to the reader, stamped with the time they arrived.
    fn take_lines(&mut self, lines: Vec<Vec<u8>>) {
        let now = now_unix_s();
        for line in lines {
            let number = self.reader.summary().lines + 1;
            if let Some(sample) = self.reader.push_line(&line, number, Some(now)) {
                self.send(FeedEvent::Sample(sample));
            }
        }
        self.send_lines_now_and_then();
    }

    fn send_lines_now_and_then(&mut self) {
        if self.last_lines_sent.elapsed() >= Duration::from_secs(1) {
            self.last_lines_sent = Instant::now();
            self.send(FeedEvent::Lines(self.reader.summary().clone()));
        }
    }

    fn flush(&mut self) {
        if let Some(sample) = self.reader.finish() {
            self.send(FeedEvent::Sample(sample));
        }
    }

    fn read_stream(&mut self, mut stream: TcpStream) -> Ended {
        if stream.set_read_timeout(Some(POLL)).is_err() {
            return Ended::Lost("cannot set a read timeout".to_owned());
        }
        self.send(FeedEvent::State(FeedState::Live));
        let mut buffer = [0u8; 4096];
        let mut framer = LineFramer::new();
        let mut last_data = Instant::now();
        // Whole seconds of silence last shown, so the state is sent once a second.
        let mut silent_shown: Option<u64> = None;
        loop {
            if self.stopped() {
                return Ended::Stopped;
            }
            match stream.read(&mut buffer) {
                Ok(0) => {
                    self.take_lines(framer.finish());
                    self.flush();
                    return Ended::Lost("the server closed the connection".to_owned());
                }
                Ok(n) => {
                    if silent_shown.take().is_some() {
                        self.send(FeedEvent::State(FeedState::Live));
                    }
                    last_data = Instant::now();
                    let lines = framer.push(&buffer[..n]);
                    self.take_lines(lines);
                }
                Err(e)
                    if matches!(
                        e.kind(),
                        ErrorKind::WouldBlock | ErrorKind::TimedOut | ErrorKind::Interrupted
                    ) =>
                {
                    let quiet = last_data.elapsed().as_secs_f64();
                    if quiet >= self.options.reconnect_after_silence_s {
                        self.flush();
                        return Ended::Lost(format!("no data for {quiet:.0} s"));
                    }
                    let whole = quiet.floor() as u64;
                    if quiet >= self.options.silence_s && silent_shown != Some(whole) {
                        if silent_shown.is_none() {
                            self.flush();
                        }
                        silent_shown = Some(whole);
                        self.send(FeedEvent::State(FeedState::Silent { for_s: quiet }));
                    }
                }
                Err(e) => {
                    self.flush();
                    return Ended::Lost(e.to_string());
                }
            }
        }
    }

    fn run_udp(&mut self, address: &str) -> String {
        let mut backoff = self.backoff();
        let socket = loop {
            if self.stopped() {
                return "stopped".to_owned();
            }
            self.send(FeedEvent::State(FeedState::Connecting));
            match UdpSocket::bind(address).and_then(|s| s.set_read_timeout(Some(POLL)).map(|()| s))
            {
                Ok(socket) => break socket,
                Err(e) => {
                    let (attempt, in_s) = backoff.failed();
                    let reason = format!("cannot listen on udp {address}: {e}");
                    if !self.send(FeedEvent::State(FeedState::Reconnecting {
                        attempt,
                        in_s,
                        reason,
                    })) || !self.wait(in_s)
                    {
                        return "stopped".to_owned();
                    }
                }
            }
        };
        self.send(FeedEvent::State(FeedState::Live));
        let mut buffer = [0u8; 65_536];
        let mut last_data = Instant::now();
        let mut silent = false;
        loop {
            if self.stopped() {
                return "stopped".to_owned();
            }
            match socket.recv(&mut buffer) {
                Ok(n) => {
                    if silent {
                        self.send(FeedEvent::State(FeedState::Live));
                        silent = false;
                    }
                    last_data = Instant::now();
                    // A datagram is whole: its last line needs no line end.
                    let mut framer = LineFramer::new();
                    let mut lines = framer.push(&buffer[..n]);
                    lines.extend(framer.finish());
                    self.take_lines(lines);
                }
                Err(e)
                    if matches!(
                        e.kind(),
                        ErrorKind::WouldBlock | ErrorKind::TimedOut | ErrorKind::Interrupted
                    ) =>
                {
                    let quiet = last_data.elapsed().as_secs_f64();
                    if quiet >= self.options.silence_s && !silent {
                        silent = true;
                        self.flush();
                        self.send(FeedEvent::State(FeedState::Silent { for_s: quiet }));
                    }
                }
                Err(e) => return format!("udp {address}: {e}"),
            }
        }
    }

    fn run_file(&mut self, path: &std::path::Path) -> String {
        self.send(FeedEvent::State(FeedState::Connecting));
        let content = match std::fs::read(path) {
            Ok(c) => c,
            Err(e) => return format!("cannot read {}: {e}", path.display()),
        };
        let options = ImportOptions {
            rpm_source: self.options.rpm_source,
            max_age_s: Some(self.options.max_age_s),
            ..ImportOptions::default()
        };
        let log = match import(&content, None, &options) {
            Ok(log) => log,
            Err(e) => return format!("{}: {e}", path.display()),
        };
        self.reader = NmeaReader::new(None, self.options.max_age_s);
        self.send(FeedEvent::Lines(log.summary.clone()));
        self.send(FeedEvent::State(FeedState::Live));
        let started = Instant::now();
        let speedup = if self.options.replay_speedup > 0.0 {
            self.options.replay_speedup
        } else {
            1.0
        };
        let first = log.samples.first().map_or(0.0, |s| s.time_s);
        for sample in &log.samples {
            let due = (sample.time_s - first).max(0.0) / speedup;
            if !self.wait(due - started.elapsed().as_secs_f64())
                || !self.send(FeedEvent::Sample(*sample))
            {
                return "stopped".to_owned();
            }
        }
        self.send(FeedEvent::Lines(log.summary));
        "end of file".to_owned()
    }
}

fn connect(address: &str, timeout_s: f64) -> Result<TcpStream, String> {
    let addresses = address
        .to_socket_addrs()
        .map_err(|e| format!("cannot resolve {address}: {e}"))?;
    let mut last = format!("no address for {address}");
    for a in addresses {
        match TcpStream::connect_timeout(&a, Duration::from_secs_f64(timeout_s.max(0.01))) {
            Ok(stream) => return Ok(stream),
            Err(e) => last = format!("cannot connect to {address}: {e}"),
        }
    }
    Err(last)
}

#[cfg(test)]
mod tests;
