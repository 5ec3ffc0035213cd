//! The live instrument feed's state in the terminal UI: the latest sample, the feed's state,
//! the steady runs captured from the stream, and which of them the user keeps.
//!
//! The event loop polls an [`instruments::feed::Feed`](crate::instruments::feed::Feed) without
//! blocking and hands what it read to [`App::update`](super::app::App::update) as
//! [`Action::Feed`](super::app::Action::Feed); this module only holds and folds it.

use crate::instruments::LineSummary;
use crate::instruments::feed::{FeedEvent, FeedState};
use crate::instruments::runs::{RunEvent, RunFinder, RunOptions, SteadyRun};
use crate::instruments::time::date_of;
use crate::propulsion::solver::trial::TrialRun;
use crate::study::import::trial_doc;

/// A steady run captured from the live stream, kept or dropped by the user.
#[derive(Debug, Clone, PartialEq)]
pub struct Captured {
    /// The run (log time, SI).
    pub run: SteadyRun,
    /// Whether it goes into the trial log when the runs are used.
    pub kept: bool,
}

/// The live feed as the UI sees it.
#[derive(Debug, Clone)]
pub struct Live {
    /// The feed's address as given (`tcp://…`, `udp://…` or a path).
    pub source: String,
    /// The feed's latest state.
    pub state: FeedState,
    /// The latest sample (SI; angles degrees).
    pub last: Option<crate::instruments::Sample>,
    /// The line counts of the feed so far.
    pub lines: Option<LineSummary>,
    /// The run finder over the stream.
    pub finder: RunFinder,
    /// The runs captured, in time order (index-matched to the finder's runs).
    pub captured: Vec<Captured>,
    /// The highlighted captured run.
    pub selected: usize,
}

impl Live {
    /// A live feed from `source` not yet connected.
    pub fn new(source: String) -> Self {
        Self {
            source,
            state: FeedState::Connecting,
            last: None,
            lines: None,
            finder: RunFinder::new(RunOptions::default()),
            captured: Vec::new(),
            selected: 0,
        }
    }

    /// Folds the feed's events in; returns how many runs were newly captured.
    pub fn apply(&mut self, events: Vec<FeedEvent>) -> usize {
        let before = self.captured.len();
        for event in events {
            match event {
                FeedEvent::State(state) => self.state = state,
                FeedEvent::Lines(lines) => self.lines = Some(lines),
                FeedEvent::Sample(sample) => {
                    self.last = Some(sample);
                    if let Some(RunEvent::Accepted(_)) = self.finder.push(&sample) {
                        self.sync();
                    }
                }
            }
        }
        self.captured.len() - before
    }

    /// Copies the finder's runs (pairing may change an earlier one), keeping the user's choices.
    fn sync(&mut self) {
        let runs = self.finder.runs();
        for (i, run) in runs.iter().enumerate() {
            match self.captured.get_mut(i) {
                Some(c) => c.run = *run,
                None => self.captured.push(Captured {
                    run: *run,
                    kept: true,
                }),
            }
        }
    }

    /// Keeps or drops the highlighted run.
    pub fn toggle_selected(&mut self) -> Option<bool> {
        let c = self.captured.get_mut(self.selected)?;
        c.kept = !c.kept;
        Some(c.kept)
    }

    /// Moves the highlight by `step` runs (clamped).
    pub fn move_selection(&mut self, step: isize) {
        let last = self.captured.len().saturating_sub(1);
        self.selected = self.selected.saturating_add_signed(step).min(last);
    }

    /// The kept runs as the core's trial runs: a pair stays a pair (at its mean rpm) only when
    /// both of its runs are kept, else the run left counts one way.
    pub fn kept_trial_runs(&self) -> Vec<TrialRun> {
        self.captured
            .iter()
            .filter(|c| c.kept)
            .map(|c| {
                let partner = c
                    .run
                    .pair
                    .and_then(|p| self.captured.get(p))
                    .filter(|p| p.kept);
                TrialRun {
                    engine_rpm: partner.map_or(c.run.engine_rpm, |p| {
                        0.5 * (c.run.engine_rpm + p.run.engine_rpm)
                    }),
                    speed_over_ground: c.run.speed_over_ground,
                    direction: partner.and(c.run.direction),
                    fuel_volume_flow: c.run.fuel_volume_flow,
                }
            })
            .collect()
    }

    /// The `[trial]` log of the kept runs, dated from the first, or `None` when none is kept.
    pub fn kept_trial_doc(&self) -> Option<crate::profile::TrialDoc> {
        let runs = self.kept_trial_runs();
        let first = self.captured.iter().find(|c| c.kept)?;
        // A stream without its own date carries receive time, which is unix time too.
        let date = (first.run.start_s > 86_400.0 * 365.0).then(|| date_of(first.run.start_s));
        Some(trial_doc(
            &runs,
            date,
            format!(
                "Captured live from {} in the tidewright terminal UI: {} steady run(s) kept; GPS speed over ground.",
                self.source,
                runs.len()
            ),
        ))
    }

    /// The kept runs as (rpm, speed over ground m/s) points for the speed chart.
    pub fn kept_points(&self) -> Vec<(f64, f64)> {
        self.captured
            .iter()
            .filter(|c| c.kept)
            .map(|c| (c.run.engine_rpm, c.run.speed_over_ground))
            .collect()
    }
}

/// `curve` (x ascending) linearly interpolated at `x`; `None` outside it or with gaps.
pub fn interpolate(curve: &[(f64, f64)], x: f64) -> Option<f64> {
    let i = curve.windows(2).position(|w| w[0].0 <= x && x <= w[1].0)?;
    let (a, b) = (curve[i], curve[i + 1]);
    let t = if b.0 > a.0 {
        (x - a.0) / (b.0 - a.0)
    } else {
        0.0
    };
    let y = a.1 + t * (b.1 - a.1);
    y.is_finite().then_some(y)
}
