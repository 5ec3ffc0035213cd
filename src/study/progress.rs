//! How far a long question has got, for a front end that shows it, and its request to stop.

use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};

/// A count of work done out of a total, shared between the thread that works and the one that
/// shows it, with a flag the showing side sets to stop the work. No lock: atomics only.
#[derive(Debug, Default)]
pub struct Progress {
    done: AtomicUsize,
    total: AtomicUsize,
    cancelled: AtomicBool,
}

impl Progress {
    /// A fresh count: nothing done out of nothing, not cancelled.
    pub fn new() -> Self {
        Self::default()
    }

    /// Starts a count of `total` steps (count).
    pub fn start(&self, total: usize) {
        self.done.store(0, Ordering::Relaxed);
        self.total.store(total, Ordering::Relaxed);
    }

    /// One more step done.
    pub fn step(&self) {
        self.done.fetch_add(1, Ordering::Relaxed);
    }

    /// (steps done, total steps) so far (counts).
    pub fn counts(&self) -> (usize, usize) {
        (
            self.done.load(Ordering::Relaxed),
            self.total.load(Ordering::Relaxed),
        )
    }

    /// Asks the work to stop at its next step.
    pub fn cancel(&self) {
        self.cancelled.store(true, Ordering::Relaxed);
    }

    /// Whether the work was asked to stop.
    pub fn is_cancelled(&self) -> bool {
        self.cancelled.load(Ordering::Relaxed)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn counts_steps_and_carries_the_stop() {
        let progress = Progress::new();
        progress.start(3);
        progress.step();
        progress.step();
        assert_eq!(progress.counts(), (2, 3));
        assert!(!progress.is_cancelled());
        progress.cancel();
        assert!(progress.is_cancelled());
    }
}
