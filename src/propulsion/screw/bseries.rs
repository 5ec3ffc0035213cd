//! Wageningen B-series open-water polynomials (Oosterveld & van Oossanen 1975).
//!
//! The published form is K = Σ C·J^s·(P/D)^t·(AE/A0)^u·Z^v, nominally at Rn(0.75R) = 2·10⁶,
//! with a Reynolds-number correction ΔK = Σ C·x^p·J^s·(P/D)^t·(AE/A0)^u·Z^v, x = log10(Rn) − 0.301,
//! for Rn > 2·10⁶. The terms are data (`data/bseries-polynomials.csv`); for a given screw every
//! term but J^s (and x^p) is a constant, so each screw keeps the sums collapsed into cubics in J.

use super::{OpenWaterPoint, ScrewError, ScrewGeometry, ScrewModel};
use crate::propulsion::{Subject, Warning};
use std::sync::OnceLock;

/// The published coefficient table, copied from the project's reference folder.
const COEFFICIENT_CSV: &str = include_str!("../../../data/bseries-polynomials.csv");

/// The nominal Reynolds number of the polynomials, Rn(0.75R); the correction applies above it.
pub const NOMINAL_REYNOLDS: f64 = 2.0e6;

/// Highest power of J in the table (s = 0..3).
const J_TERMS: usize = 4;
/// Highest power of x = log10(Rn) − 0.301 in the correction terms (p = 0..2).
const X_TERMS: usize = 3;

/// The source named in every warning this model raises.
const SOURCE: &str = "B-series";

/// Which sum a published term belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Series {
    Thrust,
    Torque,
    ThrustCorrection,
    TorqueCorrection,
}

/// One published term C·x^p·J^s·(P/D)^t·(AE/A0)^u·Z^v.
#[derive(Debug, Clone, Copy)]
struct Term {
    series: Series,
    coefficient: f64,
    reynolds_power: usize,
    advance_power: usize,
    pitch_power: i32,
    area_power: i32,
    blade_power: i32,
}

/// The parsed table, or why it could not be parsed.
fn coefficient_table() -> Result<&'static [Term], ScrewError> {
    static TABLE: OnceLock<Result<Vec<Term>, String>> = OnceLock::new();
    TABLE
        .get_or_init(|| parse_coefficients(COEFFICIENT_CSV))
        .as_deref()
        .map_err(|message| ScrewError::BadCoefficients(message.clone()))
}

/// Parses the CSV (`series,C,p,s,t,u,v`, `#` comments, one header line).
fn parse_coefficients(text: &str) -> Result<Vec<Term>, String> {
    let mut terms = Vec::new();
    let mut header_seen = false;
    for (index, raw) in text.lines().enumerate() {
        let line = raw.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        if !header_seen {
            if line.replace(' ', "") != "series,C,p,s,t,u,v" {
                return Err(format!(
                    "line {}: expected header series,C,p,s,t,u,v",
                    index + 1
                ));
            }
            header_seen = true;
            continue;
        }
        terms.push(parse_term(line).map_err(|e| format!("line {}: {e}", index + 1))?);
    }
    let count = |series| terms.iter().filter(|t| t.series == series).count();
    // Oosterveld & van Oossanen (1975) give 39 KT and 47 KQ terms; anything else is a damaged copy.
    if count(Series::Thrust) != 39 || count(Series::Torque) != 47 {
        return Err(format!(
            "expected 39 KT and 47 KQ terms, found {} and {}",
            count(Series::Thrust),
            count(Series::Torque)
        ));
    }
    Ok(terms)
}

/// Parses one data row.
fn parse_term(line: &str) -> Result<Term, String> {
    let fields: Vec<&str> = line.split(',').map(str::trim).collect();
    let [series, coefficient, p, s, t, u, v] = fields[..] else {
        return Err(format!("expected 7 fields, got {}", fields.len()));
    };
    let series = match series {
        "KT" => Series::Thrust,
        "KQ" => Series::Torque,
        "dKT" => Series::ThrustCorrection,
        "dKQ" => Series::TorqueCorrection,
        other => return Err(format!("unknown series {other:?} (KT, KQ, dKT or dKQ)")),
    };
    let coefficient: f64 = coefficient
        .parse()
        .map_err(|_| format!("coefficient {coefficient:?} is not a number"))?;
    if !coefficient.is_finite() {
        return Err(format!("coefficient {coefficient} is not finite"));
    }
    let power = |name: &str, text: &str, limit: u32| -> Result<u32, String> {
        let value: u32 = text
            .parse()
            .map_err(|_| format!("exponent {name} = {text:?} is not a whole number"))?;
        if value > limit {
            return Err(format!("exponent {name} = {value} is above {limit}"));
        }
        Ok(value)
    };
    let reynolds_power = power("p", p, X_TERMS as u32 - 1)? as usize;
    let is_correction = matches!(series, Series::ThrustCorrection | Series::TorqueCorrection);
    if !is_correction && reynolds_power != 0 {
        return Err("a KT or KQ term with p ≠ 0".to_string());
    }
    Ok(Term {
        series,
        coefficient,
        reynolds_power,
        advance_power: power("s", s, J_TERMS as u32 - 1)? as usize,
        pitch_power: power("t", t, PITCH_POWERS as u32 - 1)? as i32,
        area_power: power("u", u, OTHER_POWERS as u32 - 1)? as i32,
        blade_power: power("v", v, OTHER_POWERS as u32 - 1)? as i32,
    })
}

/// A cubic in J, coefficients of J⁰..J³.
type Cubic = [f64; J_TERMS];

/// Evaluates a cubic in J by Horner's rule.
fn cubic_at(cubic: &Cubic, j: f64) -> f64 {
    cubic.iter().rev().fold(0.0, |acc, &c| acc * j + c)
}

/// A B-series screw with its polynomials collapsed into polynomials in J for speed.
#[derive(Debug, Clone, PartialEq)]
pub struct BSeriesScrew {
    geometry: ScrewGeometry,
    /// Boxed so that `ScrewModel` stays small; filled once in `new`, only read afterwards.
    cubics: Box<Cubics>,
}

/// The collapsed polynomials of one screw.
#[derive(Debug, Clone, PartialEq)]
struct Cubics {
    /// KT(J) at the nominal Reynolds number.
    thrust: Cubic,
    /// KQ(J) at the nominal Reynolds number.
    torque: Cubic,
    /// ΔKT = Σ_p x^p · cubic_p(J).
    thrust_correction: [Cubic; X_TERMS],
    /// ΔKQ = Σ_p x^p · cubic_p(J).
    torque_correction: [Cubic; X_TERMS],
}

/// Powers of P/D the table may hold (t = 0..6: the published terms go to (P/D)⁶).
const PITCH_POWERS: usize = 7;
/// Powers of AE/A0 and of Z the table may hold (u, v = 0..12).
const OTHER_POWERS: usize = 13;
/// The cubics' coefficients in one list: KT's four, KQ's four, then ΔKT's and ΔKQ's by x^p.
const SLOTS: usize = 2 * J_TERMS * (1 + X_TERMS);

/// The B-series polynomials of one diameter, area ratio and blade count with the pitch left
/// open: each coefficient of a screw's cubics in J as a polynomial in P/D, so that a pitch
/// search builds the screw at each trial pitch without going through the published terms.
#[derive(Debug, Clone)]
pub struct BSeriesPitchFamily {
    /// The diameter, area ratio and blade count (the pitch is not used).
    geometry: ScrewGeometry,
    /// Per cubic coefficient (in [`SLOTS`] order): its coefficients of (P/D)⁰..(P/D)⁶.
    slots: [[f64; PITCH_POWERS]; SLOTS],
}

impl BSeriesPitchFamily {
    /// The family of `geometry`'s diameter, area ratio and blade count; errors for a
    /// non-physical one (its pitch is not looked at).
    pub fn new(geometry: ScrewGeometry) -> Result<Self, ScrewError> {
        for (field, value) in [
            ("diameter", geometry.diameter),
            ("area ratio", geometry.area_ratio),
        ] {
            if !(value.is_finite() && value > 0.0) {
                return Err(ScrewError::NotPositive { field, value });
            }
        }
        if !(1..=9).contains(&geometry.blades) {
            return Err(ScrewError::BadBladeCount(geometry.blades));
        }
        let powers = |x: f64| -> [f64; OTHER_POWERS] {
            let mut powers = [1.0; OTHER_POWERS];
            for k in 1..OTHER_POWERS {
                powers[k] = powers[k - 1] * x;
            }
            powers
        };
        let (area_powers, blade_powers) = (
            powers(geometry.area_ratio),
            powers(f64::from(geometry.blades)),
        );
        let mut slots = [[0.0; PITCH_POWERS]; SLOTS];
        for term in coefficient_table()? {
            let weight = term.coefficient
                * area_powers[term.area_power as usize]
                * blade_powers[term.blade_power as usize];
            let s = term.advance_power;
            let slot = match term.series {
                Series::Thrust => s,
                Series::Torque => J_TERMS + s,
                Series::ThrustCorrection => 2 * J_TERMS + J_TERMS * term.reynolds_power + s,
                Series::TorqueCorrection => {
                    2 * J_TERMS + J_TERMS * X_TERMS + J_TERMS * term.reynolds_power + s
                }
            };
            let t = term.pitch_power as usize;
            slots[slot][t] += weight;
        }
        Ok(Self { geometry, slots })
    }

    /// The screw of this family with pitch `pitch` (m).
    pub fn at_pitch(&self, pitch: f64) -> Result<BSeriesScrew, ScrewError> {
        if !(pitch.is_finite() && pitch > 0.0) {
            return Err(ScrewError::NotPositive {
                field: "pitch",
                value: pitch,
            });
        }
        let geometry = ScrewGeometry {
            pitch,
            ..self.geometry
        };
        let pitch_ratio = geometry.pitch_ratio();
        if !(pitch_ratio.is_finite() && pitch_ratio > 0.0) {
            return Err(ScrewError::NotPositive {
                field: "pitch ratio",
                value: pitch_ratio,
            });
        }
        let value = |slot: usize| {
            self.slots[slot]
                .iter()
                .rev()
                .fold(0.0, |acc, &c| acc * pitch_ratio + c)
        };
        let cubic = |first: usize| -> Cubic { std::array::from_fn(|s| value(first + s)) };
        let correction = |first: usize| -> [Cubic; X_TERMS] {
            std::array::from_fn(|p| cubic(first + J_TERMS * p))
        };
        Ok(BSeriesScrew {
            geometry,
            cubics: Box::new(Cubics {
                thrust: cubic(0),
                torque: cubic(J_TERMS),
                thrust_correction: correction(2 * J_TERMS),
                torque_correction: correction(2 * J_TERMS + J_TERMS * X_TERMS),
            }),
        })
    }
}

impl BSeriesScrew {
    /// Builds the screw for `geometry`; errors for non-physical geometry (warnings are separate).
    pub fn new(geometry: ScrewGeometry) -> Result<Self, ScrewError> {
        super::table::check_geometry(&geometry)?;
        BSeriesPitchFamily::new(geometry)?.at_pitch(geometry.pitch)
    }

    /// The geometry.
    pub fn geometry(&self) -> &ScrewGeometry {
        &self.geometry
    }

    /// KT, KQ at `j`, with the Reynolds correction when `reynolds` > 2e6 is given.
    pub fn coefficients(&self, j: f64, reynolds: Option<f64>) -> OpenWaterPoint {
        let (thrust_change, torque_change) = match reynolds {
            Some(rn) => self.reynolds_correction(j, rn),
            None => (0.0, 0.0),
        };
        OpenWaterPoint {
            advance_ratio: j,
            thrust_coefficient: cubic_at(&self.cubics.thrust, j) + thrust_change,
            torque_coefficient: cubic_at(&self.cubics.torque, j) + torque_change,
        }
    }

    /// KT(J) and KQ(J) at Rn(0.75R) = `reynolds` (the nominal 2·10⁶ when `None`) as two cubics
    /// in J, coefficients of J⁰..J³ (dimensionless): the correction's powers of
    /// x = log10(Rn) − 0.301 folded in once, so that a root search at one Rn pays for the
    /// logarithm once instead of at every J. Agrees with [`BSeriesScrew::coefficients`] to
    /// rounding.
    #[inline(always)]
    pub fn cubics_at(&self, reynolds: Option<f64>) -> ([f64; J_TERMS], [f64; J_TERMS]) {
        let (mut thrust, mut torque) = (self.cubics.thrust, self.cubics.torque);
        let Some(x) = reynolds
            .filter(|rn| rn.is_finite() && *rn > NOMINAL_REYNOLDS)
            .map(|rn| crate::propulsion::numeric::log10(rn) - 0.301)
        else {
            return (thrust, torque);
        };
        let fold = |cubics: &[Cubic; X_TERMS], s: usize| {
            cubics
                .iter()
                .rev()
                .fold(0.0, |acc, cubic| acc * x + cubic[s])
        };
        for s in 0..J_TERMS {
            thrust[s] += fold(&self.cubics.thrust_correction, s);
            torque[s] += fold(&self.cubics.torque_correction, s);
        }
        (thrust, torque)
    }

    /// The Reynolds-number correction (ΔKT, ΔKQ) at `j` for Rn(0.75R) = `reynolds`;
    /// (0, 0) at or below the nominal 2·10⁶ or for a non-finite Rn.
    pub fn reynolds_correction(&self, j: f64, reynolds: f64) -> (f64, f64) {
        if !(reynolds.is_finite() && reynolds > NOMINAL_REYNOLDS) {
            return (0.0, 0.0);
        }
        let x = crate::propulsion::numeric::log10(reynolds) - 0.301;
        let sum = |cubics: &[Cubic; X_TERMS]| {
            cubics
                .iter()
                .rev()
                .fold(0.0, |acc, cubic| acc * x + cubic_at(cubic, j))
        };
        (
            sum(&self.cubics.thrust_correction),
            sum(&self.cubics.torque_correction),
        )
    }

    /// The J where KT = 0.
    ///
    /// KT falls monotonically with J over the useful range, so the first sign change on a scan
    /// from J = 0 brackets the root, which bisection then pins to 1e-12. Returns 0 when KT ≤ 0
    /// already at J = 0, and the end of the scan (J = 3) when KT never reaches zero before it
    /// (only for geometry far outside the series).
    pub fn zero_thrust_advance_ratio(&self, reynolds: Option<f64>) -> f64 {
        const SCAN_END: f64 = 3.0;
        const STEP: f64 = 0.02;
        let thrust = |j: f64| self.coefficients(j, reynolds).thrust_coefficient;
        if thrust(0.0) <= 0.0 {
            return 0.0;
        }
        let mut low = 0.0;
        let steps = (SCAN_END / STEP).round() as usize;
        for i in 1..=steps {
            let high = i as f64 * STEP;
            if thrust(high) <= 0.0 {
                let (mut below, mut above) = (low, high);
                while above - below > 1e-12 {
                    let mid = 0.5 * (below + above);
                    if thrust(mid) > 0.0 {
                        below = mid;
                    } else {
                        above = mid;
                    }
                }
                return 0.5 * (below + above);
            }
            low = high;
        }
        SCAN_END
    }

    /// Chord at 0.75R, m: c = 2.073·(AE/A0)·D/Z.
    pub fn chord_at_075r(&self) -> f64 {
        2.073 * self.geometry.area_ratio * self.geometry.diameter / self.geometry.blades as f64
    }

    /// Validity warnings (Z 2–7, AE/A0 0.30–1.05, P/D 0.5–1.4).
    pub fn warnings(&self) -> Vec<Warning> {
        let g = &self.geometry;
        let mut warnings = Vec::new();
        if !(2..=7).contains(&g.blades) {
            warnings.push(Warning::about(
                Subject::Blades,
                SOURCE,
                format!(
                    "{} blades is outside the series' range of 2 to 7 blades; KT and KQ are extrapolated",
                    g.blades
                ),
            ));
        }
        if !(0.30..=1.05).contains(&g.area_ratio) {
            warnings.push(Warning::about(
                Subject::AreaRatio,
                SOURCE,
                format!(
                    "area ratio AE/A0 = {:.3} is outside the series' range 0.30 to 1.05; KT and KQ are extrapolated",
                    g.area_ratio
                ),
            ));
        }
        let pitch_ratio = g.pitch_ratio();
        if !(0.5..=1.4).contains(&pitch_ratio) {
            warnings.push(Warning::about(
                Subject::PitchRatio,
                SOURCE,
                format!(
                    "pitch ratio P/D = {pitch_ratio:.3} is outside the series' range 0.5 to 1.4; KT and KQ are extrapolated"
                ),
            ));
        }
        warnings
    }
}

/// One row of an open-water table as the `openwater` command shows it.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct OpenWaterRow {
    /// Advance ratio J = Va/(n·D).
    pub advance_ratio: f64,
    /// Thrust coefficient KT.
    pub thrust_coefficient: f64,
    /// Torque coefficient KQ.
    pub torque_coefficient: f64,
    /// Open-water efficiency η0; `None` where it is not defined (no thrust, no torque, J < 0).
    pub efficiency: Option<f64>,
    /// Whether J is at or past the zero-thrust advance ratio (KT ≤ 0): the screw no longer pushes.
    pub past_zero_thrust: bool,
}

/// The open-water table of `screw` at each J in `js`, with Rn(0.75R) = `reynolds` if given.
///
/// Points past zero thrust are flagged and carry no efficiency rather than a negative one.
/// The caller validates `js` (non-empty, finite, J ≥ 0).
pub fn open_water_rows(screw: &ScrewModel, js: &[f64], reynolds: Option<f64>) -> Vec<OpenWaterRow> {
    // The polynomials are cubics in J that turn positive again far past zero thrust, so the
    // sign of KT alone would show a recovered KT and a made-up efficiency there.
    let zero_thrust = match screw {
        ScrewModel::BSeries(b_series) => b_series.zero_thrust_advance_ratio(reynolds),
        ScrewModel::Table(_) => f64::INFINITY,
    };
    js.iter()
        .map(|&j| {
            let point = screw.coefficients(j, reynolds);
            let past_zero_thrust = point.thrust_coefficient <= 0.0 || j > zero_thrust;
            OpenWaterRow {
                advance_ratio: j,
                thrust_coefficient: point.thrust_coefficient,
                torque_coefficient: point.torque_coefficient,
                efficiency: if past_zero_thrust {
                    None
                } else {
                    point.efficiency()
                },
                past_zero_thrust,
            }
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn screw(blades: u32, area_ratio: f64, pitch_ratio: f64) -> BSeriesScrew {
        BSeriesScrew::new(ScrewGeometry {
            blades,
            diameter: 1.0,
            pitch: pitch_ratio,
            area_ratio,
        })
        .expect("valid geometry")
    }

    #[test]
    fn embedded_table_parses_with_the_published_term_counts() {
        let terms = coefficient_table().expect("table parses");
        let count = |s| terms.iter().filter(|t| t.series == s).count();
        assert_eq!(count(Series::Thrust), 39);
        assert_eq!(count(Series::Torque), 47);
        assert_eq!(count(Series::ThrustCorrection), 9);
        assert_eq!(count(Series::TorqueCorrection), 13);
    }

    #[test]
    fn collapsed_cubics_equal_the_term_by_term_sum() {
        let s = screw(4, 0.55, 0.9);
        let g = s.geometry;
        let (pd, z) = (g.pitch_ratio(), f64::from(g.blades));
        for j in [0.0_f64, 0.3, 0.62, 0.9] {
            let (mut kt, mut kq) = (0.0, 0.0);
            for t in coefficient_table().unwrap() {
                let value = t.coefficient
                    * j.powi(t.advance_power as i32)
                    * pd.powi(t.pitch_power)
                    * g.area_ratio.powi(t.area_power)
                    * z.powi(t.blade_power);
                match t.series {
                    Series::Thrust => kt += value,
                    Series::Torque => kq += value,
                    _ => {}
                }
            }
            let point = s.coefficients(j, None);
            assert!((point.thrust_coefficient - kt).abs() < 1e-14);
            assert!((point.torque_coefficient - kq).abs() < 1e-14);
        }
    }

    #[test]
    fn folded_cubics_agree_with_the_corrected_coefficients() {
        let s = screw(4, 0.55, 0.9);
        for reynolds in [None, Some(1.0e6), Some(2.0e6), Some(8.0e6), Some(3.0e7)] {
            let (thrust, torque) = s.cubics_at(reynolds);
            for j in [0.0_f64, 0.3, 0.62, 0.9] {
                let point = s.coefficients(j, reynolds);
                assert!((cubic_at(&thrust, j) - point.thrust_coefficient).abs() < 1e-15);
                assert!((cubic_at(&torque, j) - point.torque_coefficient).abs() < 1e-15);
            }
        }
    }

    #[test]
    fn a_familys_screw_is_the_screw_built_at_that_pitch_term_by_term() {
        let base = ScrewGeometry {
            blades: 3,
            diameter: 0.6,
            pitch: 0.1,
            area_ratio: 0.65,
        };
        let family = BSeriesPitchFamily::new(base).expect("valid family");
        let (j, rn) = (0.55_f64, 8.0e6_f64);
        let x = crate::propulsion::numeric::log10(rn) - 0.301;
        for pitch in [0.3, 0.48, 0.6, 0.75] {
            let geometry = ScrewGeometry { pitch, ..base };
            let built = BSeriesScrew::new(geometry).expect("valid screw");
            let from_family = family.at_pitch(pitch).expect("valid pitch");
            assert_eq!(from_family, built, "pitch {pitch} m");
            // Oosterveld & van Oossanen (1975): K + ΔK summed over the published terms.
            let (pd, z) = (geometry.pitch_ratio(), f64::from(geometry.blades));
            let (mut kt, mut kq) = (0.0, 0.0);
            for t in coefficient_table().unwrap() {
                let value = t.coefficient
                    * x.powi(t.reynolds_power as i32)
                    * j.powi(t.advance_power as i32)
                    * pd.powi(t.pitch_power)
                    * geometry.area_ratio.powi(t.area_power)
                    * z.powi(t.blade_power);
                match t.series {
                    Series::Thrust | Series::ThrustCorrection => kt += value,
                    Series::Torque | Series::TorqueCorrection => kq += value,
                }
            }
            let point = from_family.coefficients(j, Some(rn));
            assert!(
                (point.thrust_coefficient - kt).abs() < 1e-14,
                "pitch {pitch} m"
            );
            assert!(
                (point.torque_coefficient - kq).abs() < 1e-14,
                "pitch {pitch} m"
            );
        }
        assert!(family.at_pitch(0.0).is_err() && family.at_pitch(f64::NAN).is_err());
        assert!(BSeriesPitchFamily::new(ScrewGeometry { blades: 0, ..base }).is_err());
    }

    #[test]
    fn damaged_tables_are_errors_not_panics() {
        assert!(parse_coefficients("series,C,p,s,t,u,v\nKT,abc,0,0,0,0,0\n").is_err());
        assert!(parse_coefficients("series,C,p,s,t,u,v\nKX,1,0,0,0,0,0\n").is_err());
        assert!(parse_coefficients("series,C,p,s,t,u,v\nKT,1,0,7,0,0,0\n").is_err());
        // (P/D)⁷ is past the published terms (and the family's slots).
        assert!(parse_coefficients("series,C,p,s,t,u,v\nKT,1,0,0,7,0,0\n").is_err());
        assert!(parse_coefficients("series,C,p,s,t,u,v\nKT,1,0,0,0,0\n").is_err());
        assert!(parse_coefficients("C,p\n").is_err());
        // Well-formed rows but too few of them.
        assert!(parse_coefficients("series,C,p,s,t,u,v\nKT,1,0,0,0,0,0\n").is_err());
    }

    #[test]
    fn zero_thrust_root_has_zero_thrust() {
        let s = screw(3, 0.5, 1.0);
        let j0 = s.zero_thrust_advance_ratio(None);
        assert!(j0 > 0.5 && j0 < 1.5, "J0 = {j0}");
        assert!(s.coefficients(j0, None).thrust_coefficient.abs() < 1e-10);
        assert!(s.coefficients(j0 - 0.01, None).thrust_coefficient > 0.0);
    }

    #[test]
    fn warnings_name_value_and_limit() {
        let s = screw(8, 1.2, 1.6);
        let text: Vec<String> = s.warnings().iter().map(|w| w.message.clone()).collect();
        assert_eq!(text.len(), 3, "{text:?}");
        assert!(text[0].contains('8') && text[0].contains("2 to 7"));
        assert!(text[1].contains("1.200") && text[1].contains("0.30 to 1.05"));
        assert!(text[2].contains("1.600") && text[2].contains("0.5 to 1.4"));
        assert!(screw(4, 0.55, 1.0).warnings().is_empty());
    }
}
