//! Views that take longer than a frame to solve (the shortlist, a sweep), solved on a worker
//! thread so that the event loop keeps drawing and reading keys.
//!
//! `App::update` asks for a solve with [`Job`] (through `Effect::Solve`) and keeps a
//! [`Computing`] for the progress line; the loop starts a [`Worker`] and polls it between
//! keys, handing what it reports back to `update` as actions. Dropping a worker cancels it.

use super::analysis::{self, SweepOver, ViewData, ViewKind};
use super::app::Document;
use crate::study::progress::Progress;
use crate::study::shortlist::{Offer, ShortlistRank};
use std::sync::Arc;
use std::sync::mpsc::{self, Receiver, TryRecvError};

/// Whether a view of `kind` is solved on a worker when the loop has one.
pub fn solved_in_background(kind: ViewKind) -> bool {
    matches!(kind, ViewKind::Shortlist | ViewKind::Sweep)
}

/// One view to solve: a copy of everything it reads, so that the worker shares nothing.
#[derive(Debug, Clone, PartialEq)]
pub struct Job {
    /// The solve's number; a result or progress of another number is stale.
    pub id: u64,
    /// The view.
    pub kind: ViewKind,
    /// The document as edited: boat, engine sheet and the as-found sheet.
    pub doc: Document,
    /// The parameter a sweep sweeps.
    pub over: SweepOver,
    /// The engine sheets a shortlist ranks.
    pub offers: Vec<Offer>,
    /// The shortlist's ranking.
    pub rank: ShortlistRank,
}

impl Job {
    /// Solves the view, counting in `progress`; `None` when cancelled first.
    pub fn run(&self, progress: &Progress) -> Option<ViewData> {
        match self.kind {
            ViewKind::Shortlist => {
                analysis::shortlist_counted(&self.doc, &self.offers, self.rank, progress)
                    .map(|result| ViewData::Shortlist(analysis::ShortlistView { result }))
            }
            ViewKind::Sweep => {
                // A sweep's candidates are solved in one call: the count goes from none to all.
                progress.start(1);
                let view = analysis::sweep_of(self.over, &self.doc);
                progress.step();
                (!progress.is_cancelled()).then_some(ViewData::Sweep(view))
            }
            kind => {
                let inputs = analysis::ViewInputs {
                    over: self.over,
                    offers: &self.offers,
                    rank: self.rank,
                };
                Some(ViewData::compute(kind, inputs, &self.doc))
            }
        }
    }
}

/// A solve under way, as the app shows it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Computing {
    /// The job's number.
    pub id: u64,
    /// The view being solved.
    pub kind: ViewKind,
    /// Candidates solved so far (count).
    pub done: usize,
    /// Candidates in all (count; 0 until the worker has counted them).
    pub total: usize,
}

impl Computing {
    /// The progress line: what is being solved, how far it has got, and how to stop it.
    pub fn line(&self) -> String {
        let what = match self.kind {
            ViewKind::Shortlist => "solving the shortlist",
            ViewKind::Sweep => "solving the sweep",
            _ => "solving the view",
        };
        if self.total == 0 {
            format!("{what}: starting… (Esc cancels)")
        } else {
            format!(
                "{what}: {} / {} candidates done (Esc cancels)",
                self.done, self.total
            )
        }
    }
}

/// What a worker reports to the loop.
#[derive(Debug, Clone, PartialEq)]
pub enum Report {
    /// (done, total) candidates changed.
    Progress(usize, usize),
    /// The view is solved.
    Done(Box<ViewData>),
    /// The thread ended without a result (a defect): nothing more will come.
    Lost,
}

/// A job being solved on its own thread.
#[derive(Debug)]
pub struct Worker {
    id: u64,
    progress: Arc<Progress>,
    result: Receiver<ViewData>,
    shown: (usize, usize),
}

impl Worker {
    /// Starts `job` on a new thread (or, if no thread can be started, solves it here).
    pub fn start(job: Job) -> Self {
        let id = job.id;
        let progress = Arc::new(Progress::new());
        let (sender, result) = mpsc::channel();
        let counted = Arc::clone(&progress);
        let spawned = std::thread::Builder::new()
            .name("tidewright-view".into())
            .spawn({
                let job = job.clone();
                let sender = sender.clone();
                move || {
                    if let Some(data) = job.run(&counted) {
                        // The loop may have dropped the worker (cancelled): nothing to tell.
                        let _ = sender.send(data);
                    }
                }
            });
        if spawned.is_err()
            && let Some(data) = job.run(&progress)
        {
            let _ = sender.send(data);
        }
        Self {
            id,
            progress,
            result,
            shown: (0, 0),
        }
    }

    /// The job's number.
    pub fn id(&self) -> u64 {
        self.id
    }

    /// What happened since the last poll, without waiting: the result when it is in, else the
    /// count when it moved, else `None`.
    pub fn poll(&mut self) -> Option<Report> {
        match self.result.try_recv() {
            Ok(data) => return Some(Report::Done(Box::new(data))),
            Err(TryRecvError::Empty) => {}
            // Only a panic ends the thread without a result while the worker is kept.
            Err(TryRecvError::Disconnected) => return Some(Report::Lost),
        }
        let counts = self.progress.counts();
        (counts != self.shown).then(|| {
            self.shown = counts;
            Report::Progress(counts.0, counts.1)
        })
    }
}

impl Drop for Worker {
    fn drop(&mut self) {
        self.progress.cancel();
    }
}
