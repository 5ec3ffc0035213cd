//! Writes the seed corpora of the `log_readers` and `feed_framing` targets: short synthetic
//! trials from the project's own generator (`instruments::synth`), as NMEA with each kind of
//! time prefix and as CSV, plain and behind a byte-order mark.
//!
//! Run from `fuzz/`: `cargo run --example seed_corpus` (writes `corpus/log_readers/` and
//! `corpus/feed_framing/`).

use std::path::Path;
use tidewright::instruments::synth::{SynthSpec, TimePrefix, generate};

fn main() -> std::io::Result<()> {
    let logs = Path::new("corpus/log_readers");
    let frames = Path::new("corpus/feed_framing");
    std::fs::create_dir_all(logs)?;
    std::fs::create_dir_all(frames)?;
    let prefixes = [
        ("rmc", TimePrefix::None),
        ("iso", TimePrefix::Iso),
        ("epoch", TimePrefix::Epoch),
        ("tag", TimePrefix::TagBlock),
    ];
    let mut written = 0;
    for (index, (name, time_prefix)) in prefixes.into_iter().enumerate() {
        // One short rpm step, a leg of 20 s: a few kilobytes, small enough to mutate quickly.
        let spec = SynthSpec {
            rpm_steps: vec![1200.0 + 400.0 * index as f64],
            leg_s: 20.0,
            turn_s: 5.0,
            time_prefix,
            vhw: index % 2 == 0,
            xdr: index % 2 == 1,
            seed: index as u64 + 1,
            ..SynthSpec::default()
        };
        let log = generate(&spec, |rpm| rpm / 600.0, None);
        std::fs::write(logs.join(format!("{name}.nmea")), &log.nmea)?;
        // The feed sees the bytes after a first byte that chooses the cuts.
        let mut framed = vec![index as u8 * 37];
        framed.extend_from_slice(log.nmea.as_bytes());
        std::fs::write(frames.join(format!("{name}.bin")), framed)?;
        written += 2;
        if index == 0 {
            std::fs::write(logs.join("trial.csv"), &log.csv)?;
            let mut marked = b"\xEF\xBB\xBF".to_vec();
            marked.extend_from_slice(log.csv.as_bytes());
            std::fs::write(logs.join("marked.csv"), marked)?;
            std::fs::write(logs.join("pipes.csv"), log.csv.replace(',', "|"))?;
            written += 3;
        }
    }
    println!("wrote {written} seeds under corpus/");
    Ok(())
}
