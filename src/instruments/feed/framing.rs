//! Cutting a byte stream (TCP reads, UDP datagrams) into lines: a read may end inside a line,
//! hold several, or be binary junk without a line end, and none of that may grow memory or
//! lose a whole line.

/// Bytes held without a line end before they are dropped as not a line protocol, bytes.
pub const MAX_PENDING: usize = 4096;

/// Collects bytes and hands back each complete line, without its `\n` and the carriage
/// returns before it.
#[derive(Debug, Clone, Default)]
pub struct LineFramer {
    pending: Vec<u8>,
    dropped: usize,
}

impl LineFramer {
    /// A framer holding nothing.
    pub fn new() -> Self {
        Self::default()
    }

    /// Takes `bytes` and returns the lines they complete (blank lines and a byte-order mark at a
    /// line's start left out); the unfinished rest waits for the next call.
    pub fn push(&mut self, bytes: &[u8]) -> Vec<Vec<u8>> {
        self.pending.extend_from_slice(bytes);
        let Some(end) = self.pending.iter().rposition(|b| *b == b'\n') else {
            if self.pending.len() > MAX_PENDING {
                self.dropped += self.pending.len();
                self.pending.clear();
            }
            return Vec::new();
        };
        let complete: Vec<u8> = self.pending.drain(..=end).collect();
        lines_of(&complete)
    }

    /// Ends the stream: the unfinished last line, if any (a sender that closes without a
    /// final line end).
    pub fn finish(&mut self) -> Vec<Vec<u8>> {
        let rest = std::mem::take(&mut self.pending);
        lines_of(&rest)
    }

    /// Bytes held now, waiting for their line end.
    pub fn pending_len(&self) -> usize {
        self.pending.len()
    }

    /// Bytes dropped so far because no line end came within [`MAX_PENDING`].
    pub fn dropped(&self) -> usize {
        self.dropped
    }
}

fn lines_of(bytes: &[u8]) -> Vec<Vec<u8>> {
    bytes
        .split(|b| *b == b'\n')
        .map(super::super::without_carriage_returns)
        .map(super::super::strip_bom)
        .filter(|l| !l.iter().all(u8::is_ascii_whitespace))
        .map(<[u8]>::to_vec)
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_line_split_across_reads_comes_out_whole() {
        let mut framer = LineFramer::new();
        assert!(framer.push(b"$GPHDT,1").is_empty());
        assert_eq!(
            framer.push(b".0,T*34\r\n$GP"),
            vec![b"$GPHDT,1.0,T*34".to_vec()]
        );
        assert_eq!(framer.pending_len(), 3);
        assert_eq!(
            framer.push(b"X\n\n  \nY\n"),
            vec![b"$GPX".to_vec(), b"Y".to_vec()]
        );
        assert!(framer.push(b"tail").is_empty());
        assert_eq!(framer.finish(), vec![b"tail".to_vec()]);
        assert_eq!(framer.pending_len(), 0);
    }

    #[test]
    fn junk_without_line_ends_is_dropped_not_kept() {
        let mut framer = LineFramer::new();
        for _ in 0..10 {
            assert!(framer.push(&[0xAB; 1000]).is_empty());
            assert!(framer.pending_len() <= MAX_PENDING);
        }
        assert!(framer.dropped() >= 8000);
        assert_eq!(framer.push(b"\xEF\xBB\xBFok\n"), vec![b"ok".to_vec()]);
        // Found by the feed_framing fuzz target: a doubled carriage return stayed in the line.
        assert_eq!(
            framer.push(b"$GPHDT,1.0,T*34\r\r\n"),
            vec![b"$GPHDT,1.0,T*34".to_vec()]
        );
    }
}
