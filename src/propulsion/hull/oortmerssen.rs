//! Van Oortmerssen (1971) resistance and propulsion factors for small ships.
//!
//! G. van Oortmerssen (1971), "A power prediction method and its application to small ships",
//! International Shipbuilding Progress 18(207), 397–415: a regression of model tests of
//! trawlers, tugs, coasters, pilot and survey craft.
//!
//! RT = RF + RA + RR with RF by ITTC-1957 (no form factor: the regression's residual RR holds
//! the viscous pressure part), RA = ½ρV²S·ΔCF with ΔCF = 0.00035, and
//!
//! RR/Δ = C1·exp(−m·Fn⁻²/9) + exp(−m·Fn⁻²)·(C2 + C3·sin Fn⁻² + C4·cos Fn⁻²),
//! m = 0.14347·Cp^−2.1976, Ci = 10⁻³·Σ d_k,i·x_k over the twelve hull terms x_k.
//!
//! The coefficient tables are data (`data/van-oortmerssen-1971.csv`), parsed once. They rest on
//! one public copy of the paper's tables (see `docs/method.md`).

use super::friction::{ittc1957_friction_coefficient, reynolds_number};
use super::interaction::{Interaction, ScrewAtStern};
use super::{HullError, HullForm};
use crate::propulsion::water::WaterProperties;
use crate::propulsion::{STANDARD_GRAVITY, Subject, Warning};
use std::sync::OnceLock;

/// The tables as shipped: resistance table d and propulsion-factor table e.
const COEFFICIENT_CSV: &str = include_str!("../../../data/van-oortmerssen-1971.csv");

/// Name used as the `source` of this method's warnings.
pub const SOURCE: &str = "van Oortmerssen";

/// Roughness allowance ΔCF added to the ITTC-1957 line (dimensionless), as transcribed.
pub const ROUGHNESS_ALLOWANCE: f64 = 0.00035;

/// Highest Froude number of the regression's data (dimensionless).
pub const FROUDE_MAX: f64 = 0.50;

/// Lowest Froude number the regression is evaluated at; below it RR is negligible and the
/// Fn⁻² oscillation of the fit has no physical meaning (dimensionless).
const FROUDE_FLOOR: f64 = 0.05;

/// Number of hull terms (rows) of table d.
const RESISTANCE_TERMS: usize = 12;
/// Number of terms (rows) of table e.
const FACTOR_TERMS: usize = 8;

/// The published sample ranges: (name, min, max) of L/B, B/T, Cp, Cm, lcb %, iE °.
pub const RANGES: [(&str, f64, f64); 6] = [
    ("L/B", 3.0, 6.2),
    ("B/T", 1.9, 4.0),
    ("Cp", 0.50, 0.73),
    ("Cm", 0.70, 0.97),
    ("LCB (% of L from ½L)", -7.0, 2.8),
    ("half angle of entrance (deg)", 10.0, 46.0),
];

/// The input each entry of [`RANGES`] is about, in the same order.
const RANGE_SUBJECTS: [Subject; 6] = [
    Subject::LengthBeamRatio,
    Subject::BeamDraftRatio,
    Subject::PrismaticCoefficient,
    Subject::MidshipCoefficient,
    Subject::Lcb,
    Subject::HalfEntranceAngle,
];

/// The subject of the [`RANGES`] entry named `name` (a name from that table).
fn range_subject(name: &str) -> Subject {
    RANGES
        .iter()
        .position(|(range, _, _)| *range == name)
        .map_or(Subject::General, |i| RANGE_SUBJECTS[i])
}

/// The parsed tables: d[row][C1..C4] and e[row][t, w, ηR].
#[derive(Debug, Clone, PartialEq)]
pub struct Tables {
    /// Table d: 12 hull terms × C1…C4 (each ×10⁻³ when used).
    pub resistance: [[f64; 4]; RESISTANCE_TERMS],
    /// Table e: 8 terms × (t, w, ηR).
    pub factors: [[f64; 3]; FACTOR_TERMS],
}

/// The parsed tables, or why they could not be parsed.
pub fn tables() -> Result<&'static Tables, HullError> {
    static TABLES: OnceLock<Result<Tables, String>> = OnceLock::new();
    TABLES
        .get_or_init(|| parse_tables(COEFFICIENT_CSV))
        .as_ref()
        .map_err(|message| HullError::BadCoefficients(message.clone()))
}

/// Parses the CSV (`table,row,term,c1,c2,c3,c4`, `#` comments, one header line).
pub fn parse_tables(text: &str) -> Result<Tables, String> {
    let mut resistance = [[f64::NAN; 4]; RESISTANCE_TERMS];
    let mut factors = [[f64::NAN; 3]; FACTOR_TERMS];
    let mut seen_d = [false; RESISTANCE_TERMS];
    let mut seen_e = [false; FACTOR_TERMS];
    let mut header_seen = false;
    for (index, raw) in text.lines().enumerate() {
        let line = raw.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let at = |e: String| format!("line {}: {e}", index + 1);
        if !header_seen {
            if line.replace(' ', "") != "table,row,term,c1,c2,c3,c4" {
                return Err(at("expected header table,row,term,c1,c2,c3,c4".into()));
            }
            header_seen = true;
            continue;
        }
        let fields: Vec<&str> = line.split(',').map(str::trim).collect();
        if fields.len() != 7 {
            return Err(at(format!("expected 7 fields, got {}", fields.len())));
        }
        let row: usize = fields[1]
            .parse()
            .map_err(|_| at(format!("row {:?} is not a whole number", fields[1])))?;
        let number = |text: &str| -> Result<f64, String> {
            match text.parse::<f64>() {
                Ok(x) if x.is_finite() => Ok(x),
                _ => Err(at(format!("coefficient {text:?} is not a finite number"))),
            }
        };
        match fields[0] {
            "d" if row < RESISTANCE_TERMS => {
                for (slot, text) in resistance[row].iter_mut().zip(&fields[3..7]) {
                    *slot = number(text)?;
                }
                seen_d[row] = true;
            }
            "e" if row < FACTOR_TERMS => {
                for (slot, text) in factors[row].iter_mut().zip(&fields[3..6]) {
                    *slot = number(text)?;
                }
                if !fields[6].is_empty() {
                    return Err(at("table e has three columns (t, w, etaR)".into()));
                }
                seen_e[row] = true;
            }
            other => return Err(at(format!("unknown table/row {other:?}/{row}"))),
        }
    }
    // The paper's table d has 12 rows and table e 8; anything else is a damaged copy.
    if !seen_d.iter().all(|&s| s) || !seen_e.iter().all(|&s| s) {
        return Err("expected rows 0–11 of table d and 0–7 of table e".into());
    }
    Ok(Tables {
        resistance,
        factors,
    })
}

/// The hull terms of table d: 1, lcb, lcb², Cp, Cp², L/B, (L/B)², Cwl, Cwl², B/T, (B/T)², Cm.
///
/// lcb in % of L forward of ½L; Cwl = iE·L/B with iE in degrees.
pub fn hull_terms(hull: &HullForm) -> [f64; RESISTANCE_TERMS] {
    let lcb = hull.lcb_percent();
    let cp = hull.prismatic_coefficient;
    let l_b = hull.input.length_waterline / hull.input.beam_waterline;
    let b_t = hull.input.beam_waterline / hull.draft_mean;
    let cwl = hull.half_entrance_angle_deg.value * l_b;
    let cm = hull.midship_coefficient.value;
    [
        1.0,
        lcb,
        lcb * lcb,
        cp,
        cp * cp,
        l_b,
        l_b * l_b,
        cwl,
        cwl * cwl,
        b_t,
        b_t * b_t,
        cm,
    ]
}

/// The speed-independent coefficients of the method for one hull.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct OortmerssenCoefficients {
    /// C1…C4 of the residuary resistance (dimensionless, the 10⁻³ applied).
    pub c: [f64; 4],
    /// m = 0.14347·Cp^−2.1976 (dimensionless).
    pub m: f64,
}

impl OortmerssenCoefficients {
    /// The coefficients for `hull` from the data tables.
    pub fn new(hull: &HullForm) -> Result<Self, HullError> {
        let d = &tables()?.resistance;
        let x = hull_terms(hull);
        let mut c = [0.0; 4];
        for (i, ci) in c.iter_mut().enumerate() {
            *ci = 1e-3 * d.iter().zip(&x).map(|(row, xk)| row[i] * xk).sum::<f64>();
        }
        Ok(Self {
            c,
            m: 0.14347 * hull.prismatic_coefficient.powf(-2.1976),
        })
    }

    /// Residuary resistance over displacement weight RR/Δ at Froude number `fn_l`
    /// (dimensionless); 0 at Fn = 0 and floored at 0.
    pub fn residuary_over_weight(&self, fn_l: f64) -> f64 {
        if fn_l.is_nan() || fn_l <= 0.0 {
            return 0.0;
        }
        let x = fn_l.max(FROUDE_FLOOR).powi(-2);
        let [c1, c2, c3, c4] = self.c;
        // e^(−m·x) is the ninth power of e^(−m·x/9): one exponential instead of two.
        let ninth = (-self.m * x / 9.0).exp();
        let eighth_power = {
            let square = ninth * ninth;
            let fourth = square * square;
            fourth * fourth
        };
        let (sin, cos) = x.sin_cos();
        let value = c1 * ninth + eighth_power * ninth * (c2 + c3 * sin + c4 * cos);
        // Below the floor the fit's value is scaled with Fn² toward 0 (wave resistance vanishes).
        let scale = (fn_l / FROUDE_FLOOR).min(1.0).powi(2);
        (value * scale).max(0.0)
    }
}

/// The method's components at one speed, N.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct OortmerssenResistance {
    /// ITTC-1957 friction of the bare hull, N.
    pub friction: f64,
    /// Appendage friction ½ρV²·Sapp·(1+k2)·CF, as in Holtrop–Mennen, N.
    pub appendages: f64,
    /// Roughness allowance ½ρV²·(S+Sapp)·ΔCF, N.
    pub correlation: f64,
    /// Residuary resistance RR, N.
    pub residuary: f64,
}

/// Every component at `speed` m/s in `water` for `hull`.
#[inline(always)]
pub fn at_speed(
    hull: &HullForm,
    coefficients: &OortmerssenCoefficients,
    speed: f64,
    water: &WaterProperties,
) -> OortmerssenResistance {
    if !(speed > 0.0 && speed.is_finite()) {
        return OortmerssenResistance::default();
    }
    let input = &hull.input;
    let rho = water.density;
    let dynamic_pressure = 0.5 * rho * speed * speed;
    let rn = reynolds_number(speed, input.length_waterline, water.kinematic_viscosity);
    let cf = ittc1957_friction_coefficient(rn);
    let s = hull.wetted_surface.value;
    let weight = rho * STANDARD_GRAVITY * input.displacement_volume;
    OortmerssenResistance {
        friction: dynamic_pressure * s * cf,
        appendages: dynamic_pressure * input.appendage_area * input.appendage_form_factor * cf,
        correlation: dynamic_pressure * (s + input.appendage_area) * ROUGHNESS_ALLOWANCE,
        residuary: weight * coefficients.residuary_over_weight(hull.froude_number(speed)),
    }
}

/// Whether every hull parameter of `hull` lies inside the published sample ranges.
pub fn hull_in_range(hull: &HullForm) -> bool {
    outside_ranges(hull).is_empty()
}

/// The hull parameters outside the published sample: (name, value, min, max).
pub fn outside_ranges(hull: &HullForm) -> Vec<(&'static str, f64, f64, f64)> {
    let input = &hull.input;
    let values = [
        input.length_waterline / input.beam_waterline,
        input.beam_waterline / hull.draft_mean,
        hull.prismatic_coefficient,
        hull.midship_coefficient.value,
        hull.lcb_percent(),
        hull.half_entrance_angle_deg.value,
    ];
    RANGES
        .iter()
        .zip(values)
        .filter(|((_, min, max), value)| !(*min..=*max).contains(value))
        .map(|(&(name, min, max), value)| (name, value, min, max))
        .collect()
}

/// Warnings for a hull outside the regression's sample, one per parameter.
pub fn validity_warnings(hull: &HullForm) -> Vec<Warning> {
    let mut warnings: Vec<Warning> = outside_ranges(hull)
        .into_iter()
        .map(|(what, value, min, max)| {
            Warning::about(
                range_subject(what),
                SOURCE,
                format!(
                    "{what} = {value:.3} is outside {min}–{max}, the range of the small ships van Oortmerssen \
                     fitted; the result is an extrapolation: calibrate it with a sea trial or use a resistance table"
                ),
            )
        })
        .collect();
    if let Err(e) = tables() {
        warnings.push(Warning::new(SOURCE, e.to_string()));
    }
    warnings
}

/// A warning when Froude number `fn_l` is past the regression's data (Fn ≤ 0.50).
pub fn froude_warning(fn_l: f64) -> Option<Warning> {
    (fn_l > FROUDE_MAX).then(|| {
        Warning::about(
            Subject::FroudeNumber,
            SOURCE,
            format!(
                "Froude number {fn_l:.3} is above {FROUDE_MAX}, the fastest in the method's data; \
                 the residuary resistance is an extrapolation there"
            ),
        )
    })
}

/// The propulsion-factor terms of table e: 1, Cp, Cp², Fn·Cp, Fn²·Cp, lcb·Cp, L/B, L/D.
pub fn factor_terms(hull: &HullForm, diameter: f64, fn_l: f64) -> [f64; FACTOR_TERMS] {
    let cp = hull.prismatic_coefficient;
    let l = hull.input.length_waterline;
    [
        1.0,
        cp,
        cp * cp,
        fn_l * cp,
        fn_l * fn_l * cp,
        hull.lcb_percent() * cp,
        l / hull.input.beam_waterline,
        l / diameter,
    ]
}

/// Van Oortmerssen's single-screw t, w and ηR at `speed` m/s (unclamped; NaN when the tables
/// are damaged, which `InteractionMethod::at_speed` replaces by neutral values).
pub fn propulsion_factors(hull: &HullForm, screw: &ScrewAtStern, speed: f64) -> Interaction {
    PreparedFactors::new(hull, screw).at_speed(speed)
}

/// [`propulsion_factors`] readied for one hull and screw: each factor's terms that do not
/// change with speed summed once, for a curve that asks at many speeds.
#[derive(Debug, Clone, Copy)]
pub struct PreparedFactors {
    /// Per factor (t, w, ηR): the sum of its terms without Fn (dimensionless).
    fixed: [f64; 3],
    /// Per factor: the coefficient of Fn (the Fn·Cp term's, times Cp).
    per_froude: [f64; 3],
    /// Per factor: the coefficient of Fn² (the Fn²·Cp term's, times Cp).
    per_froude_squared: [f64; 3],
    /// √(g·LWL), m/s: speed over it is the Froude number.
    froude_root: f64,
}

impl PreparedFactors {
    /// The factors of `hull` with `screw`; NaN factors when the tables are damaged.
    pub fn new(hull: &HullForm, screw: &ScrewAtStern) -> Self {
        let froude_root = (STANDARD_GRAVITY * hull.input.length_waterline).sqrt();
        let Ok(tables) = tables() else {
            return Self {
                fixed: [f64::NAN; 3],
                per_froude: [f64::NAN; 3],
                per_froude_squared: [f64::NAN; 3],
                froude_root,
            };
        };
        // The terms at Fn 0 have 0 in both Fn terms, so their sum is the fixed part.
        let terms = factor_terms(hull, screw.diameter, 0.0);
        let cp = hull.prismatic_coefficient;
        let column = |j: usize| -> f64 {
            tables
                .factors
                .iter()
                .zip(&terms)
                .map(|(row, term)| row[j] * term)
                .sum()
        };
        // Terms 3 and 4 of `factor_terms` are Fn·Cp and Fn²·Cp.
        let rows = &tables.factors;
        Self {
            fixed: [column(0), column(1), column(2)],
            per_froude: [rows[3][0] * cp, rows[3][1] * cp, rows[3][2] * cp],
            per_froude_squared: [rows[4][0] * cp, rows[4][1] * cp, rows[4][2] * cp],
            froude_root,
        }
    }

    /// t, w and ηR at `speed` m/s (unclamped; NaN when the tables are damaged).
    pub fn at_speed(&self, speed: f64) -> Interaction {
        // The regression's data end at Fn 0.50; past it the factors are held at their Fn 0.50
        // value.
        let fn_l = (speed / self.froude_root).min(FROUDE_MAX);
        let factor = |j: usize| {
            self.fixed[j] + fn_l * (self.per_froude[j] + fn_l * self.per_froude_squared[j])
        };
        Interaction {
            thrust_deduction: factor(0),
            wake_fraction: factor(1),
            relative_rotative_efficiency: factor(2),
        }
    }
}
