//! Synthetic instrument logs for tests — invented data, never a reference.
//!
//! [`generate`] sails a made-up boat through a schedule: for each rpm step a throttle ramp,
//! an Out leg, a turn at constant throttle, a Back leg on the reciprocal course and a turn
//! back, with a steady current along the Out course, a first-order lag of speed behind rpm,
//! and seeded Gaussian noise on SOG, COG and rpm (a xorshift64* generator, so the same seed
//! gives the same log on every machine). It writes NMEA 0183 (RMC, VTG, HDT, RPM and
//! optionally VHW and XDR, with correct checksums) and the same samples as CSV, and returns
//! the true mean of each leg.

use super::METRES_PER_SECOND_PER_KNOT;
use super::nmea::{checksum, with_checksum};
use super::time::{civil_from_days, clock_of};
use crate::propulsion::solver::trial::RunDirection;
use std::fmt::Write as _;

/// What goes before each NMEA sentence.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TimePrefix {
    /// Nothing: the time comes from RMC.
    None,
    /// ISO 8601 UTC and a space.
    Iso,
    /// Unix seconds and a comma.
    Epoch,
    /// A TAG block with `c:` unix time.
    TagBlock,
}

/// The schedule and conditions of a synthetic trial (SI; angles degrees true).
#[derive(Debug, Clone, PartialEq)]
pub struct SynthSpec {
    /// Start time, unix s (default 2023-11-14T22:13:20Z).
    pub start_unix_s: f64,
    /// The rpm steps, rpm.
    pub rpm_steps: Vec<f64>,
    /// Length of each leg at steady rpm and course, s.
    pub leg_s: f64,
    /// Length of each 180° turn, s.
    pub turn_s: f64,
    /// Length of each throttle ramp between steps, s.
    pub throttle_s: f64,
    /// Time constant of the speed's lag behind its steady value, s.
    pub speed_time_constant_s: f64,
    /// Course of the Out legs, degrees true.
    pub out_course_deg: f64,
    /// Current along the Out course (negative: against it), m/s.
    pub current: f64,
    /// Standard deviation of the GPS speed noise, m/s.
    pub sog_noise: f64,
    /// Standard deviation of the GPS course noise, degrees.
    pub cog_noise_deg: f64,
    /// Standard deviation of the rpm noise, rpm.
    pub rpm_noise: f64,
    /// Sample period, s.
    pub period_s: f64,
    /// Noise seed.
    pub seed: u64,
    /// Timestamp before each sentence.
    pub time_prefix: TimePrefix,
    /// Talker of the GPS sentences (`GP`, `GN` …).
    pub gps_talker: &'static str,
    /// Write VHW (speed through water and heading).
    pub vhw: bool,
    /// Write the rpm as an XDR tachometer as well as an RPM sentence.
    pub xdr: bool,
}

impl Default for SynthSpec {
    fn default() -> Self {
        Self {
            start_unix_s: 1_700_000_000.0,
            rpm_steps: vec![1500.0, 2000.0],
            leg_s: 120.0,
            turn_s: 40.0,
            throttle_s: 10.0,
            speed_time_constant_s: 6.0,
            out_course_deg: 30.0,
            current: 0.3,
            sog_noise: 0.05,
            cog_noise_deg: 1.5,
            rpm_noise: 5.0,
            period_s: 1.0,
            seed: 12,
            time_prefix: TimePrefix::None,
            gps_talker: "GP",
            vhw: true,
            xdr: false,
        }
    }
}

/// The truth of one steady leg.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SynthLeg {
    /// Engine speed, rpm.
    pub engine_rpm: f64,
    /// Course over ground, degrees true.
    pub course_deg: f64,
    /// Out or Back.
    pub direction: RunDirection,
    /// Steady speed through water, m/s.
    pub speed_through_water: f64,
    /// Steady speed over ground (through water ± current), m/s.
    pub speed_over_ground: f64,
    /// Start of the leg, unix s.
    pub start_s: f64,
    /// End of the leg, unix s.
    pub end_s: f64,
}

/// A synthetic log in both formats, with its truth.
#[derive(Debug, Clone, PartialEq)]
pub struct SynthLog {
    /// NMEA 0183 text, one sentence a line.
    pub nmea: String,
    /// CSV with the header `time_s,rpm,sog_kn,cog_deg,heading_deg,stw_kn,fuel_lph`.
    pub csv: String,
    /// The steady legs, in time order.
    pub legs: Vec<SynthLeg>,
}

/// xorshift64* (Vigna, "An experimental exploration of Marsaglia's xorshift generators,
/// scrambled", ACM TOMS 42(2), 2016) — small, seeded, deterministic.
#[derive(Debug, Clone)]
pub struct XorShift(u64);

impl XorShift {
    /// A generator from `seed` (0 is replaced, the state must not be zero).
    pub fn new(seed: u64) -> Self {
        Self(if seed == 0 {
            0x9E37_79B9_7F4A_7C15
        } else {
            seed
        })
    }

    /// Next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
    }

    /// Uniform in (0, 1].
    pub fn uniform(&mut self) -> f64 {
        ((self.next_u64() >> 11) as f64 + 1.0) / (1u64 << 53) as f64
    }

    /// Standard normal (Box–Muller).
    pub fn normal(&mut self) -> f64 {
        let (u1, u2) = (self.uniform(), self.uniform());
        (-2.0 * u1.ln()).sqrt() * (std::f64::consts::TAU * u2).cos()
    }
}

/// One instant of the boat.
struct State {
    time_s: f64,
    rpm: f64,
    heading_deg: f64,
    stw: f64,
}

/// Makes a log from `speed_through_water_at(rpm)` (m/s) and optionally
/// `fuel_volume_flow_at(rpm)` (m³/s).
pub fn generate(
    spec: &SynthSpec,
    speed_through_water_at: impl Fn(f64) -> f64,
    fuel_volume_flow_at: Option<&dyn Fn(f64) -> f64>,
) -> SynthLog {
    let dt = spec.period_s;
    let mut states = Vec::new();
    let mut legs = Vec::new();
    let first_rpm = spec.rpm_steps.first().copied().unwrap_or(0.0);
    let mut state = State {
        time_s: spec.start_unix_s,
        rpm: first_rpm,
        heading_deg: spec.out_course_deg,
        stw: speed_through_water_at(first_rpm),
    };
    let lag = 1.0 - (-dt / spec.speed_time_constant_s).exp();
    let step =
        |state: &mut State, states: &mut Vec<(f64, f64, f64, f64)>, rpm: f64, heading: f64| {
            state.rpm = rpm;
            state.heading_deg = heading;
            state.stw += (speed_through_water_at(rpm) - state.stw) * lag;
            states.push((state.time_s, state.rpm, state.heading_deg, state.stw));
            state.time_s += dt;
        };
    let ticks = |seconds: f64| (seconds / dt).round() as usize;
    let back_course = (spec.out_course_deg + 180.0).rem_euclid(360.0);
    for &rpm in &spec.rpm_steps {
        let from = state.rpm;
        for i in 0..ticks(spec.throttle_s) {
            let f = (i + 1) as f64 / ticks(spec.throttle_s) as f64;
            step(
                &mut state,
                &mut states,
                from + (rpm - from) * f,
                spec.out_course_deg,
            );
        }
        for (course, direction) in [
            (spec.out_course_deg, RunDirection::Out),
            (back_course, RunDirection::Back),
        ] {
            let start_s = state.time_s;
            for _ in 0..ticks(spec.leg_s) {
                step(&mut state, &mut states, rpm, course);
            }
            let stw = speed_through_water_at(rpm);
            let sign = if direction == RunDirection::Out {
                1.0
            } else {
                -1.0
            };
            legs.push(SynthLeg {
                engine_rpm: rpm,
                course_deg: course,
                direction,
                speed_through_water: stw,
                speed_over_ground: stw + sign * spec.current,
                start_s,
                end_s: state.time_s - dt,
            });
            for i in 0..ticks(spec.turn_s) {
                let f = (i + 1) as f64 / ticks(spec.turn_s) as f64;
                step(&mut state, &mut states, rpm, course + 180.0 * f);
            }
        }
    }
    let mut rng = XorShift::new(spec.seed);
    let mut nmea = String::new();
    let mut csv = String::from("time_s,rpm,sog_kn,cog_deg,heading_deg,stw_kn,fuel_lph\n");
    // Invented position for the RMC sentences.
    let (mut lat, mut lon) = (43.25_f64, -8.5_f64);
    for (time_s, rpm, heading, stw) in states {
        let (hs, hc) = heading.to_radians().sin_cos();
        let (cs, cc) = spec.out_course_deg.to_radians().sin_cos();
        let (east, north) = (stw * hs + spec.current * cs, stw * hc + spec.current * cc);
        let sog = east.hypot(north) + spec.sog_noise * rng.normal();
        let cog =
            (east.atan2(north).to_degrees() + spec.cog_noise_deg * rng.normal()).rem_euclid(360.0);
        let rpm_read = rpm + spec.rpm_noise * rng.normal();
        lat += north * dt / 111_120.0;
        lon += east * dt / (111_120.0 * lat.to_radians().cos());
        let sog_kn = sog.max(0.0) / METRES_PER_SECOND_PER_KNOT;
        let stw_kn = stw / METRES_PER_SECOND_PER_KNOT;
        let fuel = fuel_volume_flow_at.map(|f| f(rpm));
        let days = (time_s / 86_400.0).floor() as i64;
        let (y, m, d) = civil_from_days(days);
        let hms = clock_of(time_s).replace(':', "");
        let talker = spec.gps_talker;
        let mut sentences = vec![
            format!(
                "{talker}RMC,{hms}.00,A,{},{},{sog_kn:.2},{cog:.1},{d:02}{m:02}{:02},,,A",
                nmea_angle(lat, 2, 'N', 'S'),
                nmea_angle(lon, 3, 'E', 'W'),
                y.rem_euclid(100)
            ),
            format!(
                "{talker}VTG,{cog:.1},T,,M,{sog_kn:.2},N,{:.2},K,A",
                sog * 3.6
            ),
            format!("HEHDT,{:.1},T", heading.rem_euclid(360.0)),
            format!("ERRPM,E,1,{rpm_read:.0},,A"),
        ];
        if spec.vhw {
            sentences.push(format!(
                "VWVHW,{:.1},T,,M,{stw_kn:.2},N,{:.2},K",
                heading.rem_euclid(360.0),
                stw * 3.6
            ));
        }
        if spec.xdr {
            sentences.push(format!("IIXDR,T,{rpm_read:.0},R,ENGINE1"));
        }
        for body in sentences {
            let sentence = with_checksum(&body);
            match spec.time_prefix {
                TimePrefix::None => {}
                TimePrefix::Iso => {
                    let _ = write!(nmea, "{y:04}-{m:02}-{d:02}T{}Z ", clock_of(time_s));
                }
                TimePrefix::Epoch => {
                    let _ = write!(nmea, "{time_s:.3},");
                }
                TimePrefix::TagBlock => {
                    let tag = format!("c:{}", time_s.round() as i64);
                    let _ = write!(nmea, "\\{tag}*{:02X}\\", checksum(&tag));
                }
            }
            nmea.push_str(&sentence);
            nmea.push_str("\r\n");
        }
        let heading = heading.rem_euclid(360.0);
        let fuel_lph = fuel
            .map(|f| format!("{:.3}", f * 3.6e6))
            .unwrap_or_default();
        let _ = writeln!(
            csv,
            "{time_s:.1},{rpm_read:.0},{sog_kn:.3},{cog:.1},{heading:.1},{stw_kn:.3},{fuel_lph}"
        );
    }
    SynthLog { nmea, csv, legs }
}

/// An angle as NMEA `dddmm.mmmm,H`.
fn nmea_angle(value: f64, degree_digits: usize, positive: char, negative: char) -> String {
    let hemisphere = if value >= 0.0 { positive } else { negative };
    let value = value.abs();
    let degrees = value.floor();
    let minutes = (value - degrees) * 60.0;
    format!(
        "{:0w$}{minutes:07.4},{hemisphere}",
        degrees as u32,
        w = degree_digits
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn same_seed_same_log() {
        let spec = SynthSpec {
            rpm_steps: vec![1500.0],
            ..SynthSpec::default()
        };
        let a = generate(&spec, |rpm| rpm / 500.0, None);
        let b = generate(&spec, |rpm| rpm / 500.0, None);
        assert_eq!(a, b);
        let c = generate(&SynthSpec { seed: 13, ..spec }, |rpm| rpm / 500.0, None);
        assert_ne!(a.nmea, c.nmea);
    }

    #[test]
    fn normal_noise_has_unit_spread() {
        let mut rng = XorShift::new(1);
        let n = 20_000;
        let draws: Vec<f64> = (0..n).map(|_| rng.normal()).collect();
        let mean = draws.iter().sum::<f64>() / n as f64;
        let var = draws.iter().map(|x| (x - mean).powi(2)).sum::<f64>() / n as f64;
        // Standard normal: mean 0, variance 1; sampling error of 20 000 draws ~0.01.
        assert!(mean.abs() < 0.03, "{mean}");
        assert!((var - 1.0).abs() < 0.04, "{var}");
    }

    #[test]
    fn every_sentence_checks() {
        let spec = SynthSpec {
            rpm_steps: vec![1500.0],
            xdr: true,
            ..SynthSpec::default()
        };
        let log = generate(&spec, |rpm| rpm / 500.0, None);
        for line in log.nmea.lines() {
            assert!(
                super::super::nmea::parse_line(line.as_bytes()).is_ok(),
                "{line}"
            );
            assert!(
                line.len() <= 82,
                "NMEA 0183 limits a sentence to 82 characters: {line}"
            );
        }
        assert_eq!(log.legs.len(), 2);
        assert!((log.legs[0].speed_over_ground - 3.3).abs() < 1e-12);
        assert!((log.legs[1].speed_over_ground - 2.7).abs() < 1e-12);
    }

    #[test]
    fn position_format() {
        assert_eq!(nmea_angle(43.5, 2, 'N', 'S'), "4330.0000,N");
        assert_eq!(nmea_angle(-8.25, 3, 'E', 'W'), "00815.0000,W");
    }
}
