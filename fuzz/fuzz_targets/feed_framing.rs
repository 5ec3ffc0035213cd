//! Fuzz target: the live feed's line framing, with the input cut into reads at places the
//! input itself chooses (its first byte seeds the cuts), as TCP delivers it.
//!
//! The framer must never panic, never hold more than its limit, hand back no line with a line
//! end in it, and — when nothing was dropped — give the same lines however the bytes were cut.
//! Each line then goes through the NMEA reader a live feed uses.

#![no_main]

use libfuzzer_sys::fuzz_target;
use tidewright::instruments::feed::framing::{LineFramer, MAX_PENDING};
use tidewright::instruments::nmea::{DEFAULT_MAX_AGE_S, NmeaReader};

/// The lines of `data` read in pieces whose lengths come from `cuts`.
fn framed(data: &[u8], mut cuts: u64) -> (Vec<Vec<u8>>, usize) {
    let mut framer = LineFramer::new();
    let mut lines = Vec::new();
    let mut rest = data;
    while !rest.is_empty() {
        let take = (1 + (cuts % 97) as usize).min(rest.len());
        cuts = cuts.rotate_left(7) ^ 0x9e37_79b9_7f4a_7c15;
        let (piece, after) = rest.split_at(take);
        lines.extend(framer.push(piece));
        assert!(
            framer.pending_len() <= MAX_PENDING + 97,
            "framer grew to {}",
            framer.pending_len()
        );
        rest = after;
    }
    lines.extend(framer.finish());
    (lines, framer.dropped())
}

fuzz_target!(|data: &[u8]| {
    let Some((&seed, data)) = data.split_first() else {
        return;
    };
    let (lines, dropped) = framed(data, u64::from(seed));
    let (other, other_dropped) = framed(data, u64::from(seed) ^ 0xA5A5_5A5A);
    for line in &lines {
        assert!(!line.contains(&b'\n'), "a line with a line end: {line:?}");
        assert!(
            !line.ends_with(b"\r"),
            "a line with its carriage return: {line:?}"
        );
    }
    if dropped == 0 && other_dropped == 0 {
        assert_eq!(lines, other, "the lines depend on how the bytes were cut");
    }
    let mut reader = NmeaReader::new(None, DEFAULT_MAX_AGE_S);
    for (number, line) in lines.iter().enumerate() {
        if let Some(sample) = reader.push_line(line, number + 1, Some(1_700_000_000.0)) {
            assert!(sample.time_s.is_finite());
        }
    }
    assert_eq!(reader.summary().lines, lines.len());
});
