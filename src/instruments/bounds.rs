//! What an instrument may plausibly say: readings outside these bounds are a sensor fault, a
//! GPS spike or a wrong column, and their line is counted under its own reason
//! ([`BadLine::RpmOutOfRange`], [`BadLine::SpeedOutOfRange`]) instead of being used or lost.

use super::{BadLine, METRES_PER_SECOND_PER_KNOT};

/// Highest engine or shaft speed a log may hold, rpm. The small high-speed marine diesels
/// this tool matches are rated at about 2 000–4 000 rpm (from memory); 10 000 leaves room for
/// any of them and still catches a tachometer reporting pulses instead of revolutions.
pub const MAX_RPM: f64 = 10_000.0;

/// Highest speed over ground or through the water a log may hold, kn. A displacement hull's
/// speed is about 1.34·√(waterline in ft) kn (common practice): 24 kn at a 100 m waterline, so
/// 60 kn is past any hull this tool models and catches GPS spikes.
pub const MAX_SPEED_KN: f64 = 60.0;

/// Whether `rpm` is a speed an engine or shaft of a log may turn ahead (0 to [`MAX_RPM`]).
pub fn rpm_in_range(rpm: f64) -> bool {
    (0.0..=MAX_RPM).contains(&rpm)
}

/// Whether `speed` (m/s) is a boat's speed a log may hold (0 to [`MAX_SPEED_KN`]).
pub fn speed_in_range(speed: f64) -> bool {
    (0.0..=MAX_SPEED_KN * METRES_PER_SECOND_PER_KNOT).contains(&speed)
}

/// `Ok` for an rpm in range, else the reason its line is bad.
pub fn check_rpm(rpm: f64) -> Result<f64, BadLine> {
    if rpm_in_range(rpm) {
        Ok(rpm)
    } else {
        Err(BadLine::RpmOutOfRange)
    }
}

/// `Ok` for a speed (m/s) in range, else the reason its line is bad.
pub fn check_speed(speed: f64) -> Result<f64, BadLine> {
    if speed_in_range(speed) {
        Ok(speed)
    } else {
        Err(BadLine::SpeedOutOfRange)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bounds_reject_what_no_boat_does_and_keep_what_one_does() {
        assert_eq!(check_rpm(-800.0), Err(BadLine::RpmOutOfRange));
        assert_eq!(check_rpm(10_001.0), Err(BadLine::RpmOutOfRange));
        assert_eq!(check_rpm(0.0), Ok(0.0));
        assert_eq!(check_rpm(2_800.0), Ok(2_800.0));
        // 60 kn = 30.87 m/s (1 kn = 1852/3600 m/s, BIPM SI Brochure, Table 8).
        assert!(speed_in_range(30.8));
        assert!(!speed_in_range(30.9));
        assert_eq!(check_speed(-0.1), Err(BadLine::SpeedOutOfRange));
        assert_eq!(check_speed(f64::NAN), Err(BadLine::SpeedOutOfRange));
        assert_eq!(check_rpm(f64::INFINITY), Err(BadLine::RpmOutOfRange));
    }
}
