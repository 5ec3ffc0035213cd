//! The reconnect delay of a network feed: doubling while connections keep failing or dying
//! before they deliver a sentence, back to the first delay only after one that delivered.

/// The delays between reconnect attempts.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Backoff {
    initial_s: f64,
    max_s: f64,
    attempt: u32,
}

impl Backoff {
    /// Delays from `initial_s` doubling up to `max_s`, s (a non-finite or negative value is
    /// taken as 0).
    pub fn new(initial_s: f64, max_s: f64) -> Self {
        let clean = |v: f64| if v.is_finite() { v.max(0.0) } else { 0.0 };
        let initial_s = clean(initial_s);
        Self {
            initial_s,
            max_s: clean(max_s).max(initial_s),
            attempt: 0,
        }
    }

    /// Counts one more failed attempt (a connect that failed, or a connection that ended
    /// before it delivered a sentence): its number from 1 and the delay before the next, s.
    pub fn failed(&mut self) -> (u32, f64) {
        self.attempt = self.attempt.saturating_add(1);
        let factor = 2f64.powi(self.attempt.saturating_sub(1).min(30) as i32);
        (self.attempt, (self.initial_s * factor).min(self.max_s))
    }

    /// A connection delivered sentences: the next failure starts from the first delay again.
    pub fn delivered(&mut self) {
        self.attempt = 0;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn doubles_to_the_cap_and_resets_only_when_told() {
        let mut backoff = Backoff::new(1.0, 30.0);
        let delays: Vec<f64> = (0..8).map(|_| backoff.failed().1).collect();
        assert_eq!(delays, [1.0, 2.0, 4.0, 8.0, 16.0, 30.0, 30.0, 30.0]);
        backoff.delivered();
        assert_eq!(backoff.failed(), (1, 1.0));
        let mut odd = Backoff::new(f64::NAN, -3.0);
        assert_eq!(odd.failed(), (1, 0.0));
        for _ in 0..100 {
            assert!(Backoff::new(1.0, 30.0).failed().1.is_finite());
        }
    }
}
