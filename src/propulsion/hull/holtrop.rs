//! Holtrop & Mennen (1982) and Holtrop (1984) resistance method.
//!
//! RT = RF·(1+k1) + RAPP + RW + RB + RTR + RA, every term in newtons. The speed-independent
//! coefficients are computed once in [`HoltropCoefficients::new`]; evaluating a speed is then
//! a few dozen floating-point operations with no allocation.
//!
//! Two editions differ in the form factor and the low-speed wave term:
//! - [`Edition::Original1982`]: 1+k1 with c12, c13 and LR; m2 = c15·Cp²·exp(−0.1·Fn⁻²); one
//!   wave formula for every Fn (the paper's data reach Fn ≈ 0.45).
//! - [`Edition::Revised1984`]: 1+k1 with c14; m4 = 0.4·c15·exp(−0.034·Fn⁻³·²⁹); a second wave
//!   formula for Fn > 0.55 and a linear blend between Fn 0.40 and 0.55.
//!
//! The correlation allowance RA is applied to S + SAPP, which reproduces both papers' printed
//! totals (see `docs/method.md`).

use super::HullForm;
use super::friction::{ittc1957_friction_coefficient, reynolds_number};
use crate::propulsion::water::WaterProperties;
use crate::propulsion::{STANDARD_GRAVITY, Subject, Warning};

/// Which published version of the method to evaluate.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Edition {
    /// Holtrop & Mennen (1982), Int. Shipbuilding Progress 29(335).
    Original1982,
    /// Holtrop (1984), Int. Shipbuilding Progress 31(363): the revision used by default.
    Revised1984,
}

/// Name used as the `source` of this method's warnings.
pub const SOURCE: &str = "Holtrop-Mennen";

/// Froude number below which the 1984 low-speed wave formula is used alone.
pub const LOW_SPEED_LIMIT_FN: f64 = 0.40;
/// Froude number above which the 1984 high-speed wave formula is used alone.
pub const HIGH_SPEED_LIMIT_FN: f64 = 0.55;

/// Highest Froude number Holtrop & Mennen (1982) give for trawlers, coasters and tugs, the
/// ship type nearest a small motorboat (their table of limitations: Cp 0.55–0.65, L/B 3.9–6.3,
/// B/T 2.1–3.0; from memory).
pub const SMALL_SHIP_FROUDE_MAX: f64 = 0.38;

/// Speed-independent coefficients of the method for one hull (names as in the papers).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct HoltropCoefficients {
    /// Edition these coefficients belong to.
    pub edition: Edition,
    /// Length of run LR, m.
    pub length_of_run: f64,
    /// c12 (1982 form factor).
    pub c12: f64,
    /// c13 = 1 + 0.003·Cstern (1982 form factor).
    pub c13: f64,
    /// c14 = 1 + 0.011·Cstern (1984 form factor).
    pub c14: f64,
    /// Hull form factor 1+k1 of this edition.
    pub form_factor: f64,
    /// c7 (beam–length term of c1).
    pub c7: f64,
    /// c1 (low-speed wave resistance factor).
    pub c1: f64,
    /// c3 (bulb influence).
    pub c3: f64,
    /// c2 = exp(−1.89·√c3) (bulb reduction of wave resistance).
    pub c2: f64,
    /// c5 = 1 − 0.8·AT/(B·T·Cm) (transom influence).
    pub c5: f64,
    /// c15 (slenderness term of m2/m4).
    pub c15: f64,
    /// c16 (prismatic term of m1).
    pub c16: f64,
    /// m1 (low-speed exponent factor).
    pub m1: f64,
    /// c17 (1984 high-speed wave resistance factor).
    pub c17: f64,
    /// m3 (1984 high-speed exponent factor).
    pub m3: f64,
    /// λ (wave-length parameter).
    pub lambda: f64,
    /// c4 = min(TF/L, 0.04) (correlation allowance).
    pub c4: f64,
    /// Model–ship correlation allowance CA (dimensionless).
    pub correlation_allowance: f64,
    // Hull quantities needed at every speed, copied to keep evaluation self-contained.
    length: f64,
    beam: f64,
    draft_forward: f64,
    volume: f64,
    wetted_surface: f64,
    appendage_area: f64,
    appendage_form_factor: f64,
    bulb_area: f64,
    bulb_centre_height: f64,
    transom_area: f64,
    waterplane: f64,
    prismatic: f64,
}

/// Resistance components of the method at one speed, N (coefficients dimensionless).
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct HoltropResistance {
    /// Froude number on waterline length.
    pub froude_number: f64,
    /// Reynolds number on waterline length.
    pub reynolds_number: f64,
    /// ITTC-1957 friction coefficient CF.
    pub friction_coefficient: f64,
    /// Frictional resistance RF (without form factor), N.
    pub friction: f64,
    /// Form factor 1+k1.
    pub form_factor: f64,
    /// Appendage resistance RAPP, N.
    pub appendages: f64,
    /// Wave resistance RW, N.
    pub wave: f64,
    /// Bulb resistance RB, N.
    pub bulb: f64,
    /// Transom resistance RTR, N.
    pub transom: f64,
    /// Correlation allowance resistance RA, N.
    pub correlation: f64,
    /// RT = RF·(1+k1) + RAPP + RW + RB + RTR + RA, N.
    pub total: f64,
}

impl HoltropCoefficients {
    /// The coefficients of `edition` for `hull`.
    pub fn new(hull: &HullForm, edition: Edition) -> Self {
        let input = &hull.input;
        let (l, b, t) = (
            input.length_waterline,
            input.beam_waterline,
            hull.draft_mean,
        );
        let tf = input.draft_forward;
        let volume = input.displacement_volume;
        let cp = hull.prismatic_coefficient;
        let cm = hull.midship_coefficient.value;
        let cb = hull.block_coefficient;
        let lcb = hull.lcb_percent();
        let cstern = input.stern_coefficient;
        let lr = hull.length_of_run();
        let abt = input.bulb_area;
        let hb = input.bulb_centre_height;
        let at = hull.transom_area.value;
        let ie = hull.half_entrance_angle_deg.value;

        let t_l = t / l;
        let c12 = if t_l > 0.05 {
            t_l.powf(0.2228446)
        } else if t_l > 0.02 {
            48.20 * (t_l - 0.02).powf(2.078) + 0.479948
        } else {
            0.479948
        };
        let c13 = 1.0 + 0.003 * cstern;
        let c14 = 1.0 + 0.011 * cstern;
        let form_factor = match edition {
            // Cp ≥ 0.95 is outside any hull of the data and makes the term singular.
            Edition::Original1982 => {
                c13 * (0.93
                    + c12
                        * (b / lr).powf(0.92497)
                        * (0.95 - cp).max(0.01).powf(-0.521448)
                        * (1.0 - cp + 0.0225 * lcb).max(0.0).powf(0.6906))
            }
            Edition::Revised1984 => {
                0.93 + 0.487118
                    * c14
                    * (b / l).powf(1.06806)
                    * t_l.powf(0.46106)
                    * (l / lr).powf(0.121563)
                    * (l.powi(3) / volume).powf(0.36486)
                    * (1.0 - cp).powf(-0.604247)
            }
        };

        let b_l = b / l;
        let c7 = if b_l < 0.11 {
            0.229577 * b_l.powf(0.33333)
        } else if b_l < 0.25 {
            b_l
        } else {
            0.5 - 0.0625 * l / b
        };
        let c1 =
            2_223_105.0 * c7.powf(3.78613) * (t / b).powf(1.07961) * (90.0 - ie).powf(-1.37565);
        let c3 = if abt > 0.0 {
            0.56 * abt.powf(1.5) / (b * t * (0.31 * abt.sqrt() + tf - hb))
        } else {
            0.0
        };
        let c2 = (-1.89 * c3.sqrt()).exp();
        let c5 = 1.0 - 0.8 * at / (b * t * cm);
        let slenderness = l.powi(3) / volume;
        let c15 = if slenderness < 512.0 {
            -1.69385
        } else if slenderness < 1726.91 {
            -1.69385 + (l / volume.cbrt() - 8.0) / 2.36
        } else {
            0.0
        };
        let c16 = if cp < 0.80 {
            8.07981 * cp - 13.8673 * cp * cp + 6.984388 * cp.powi(3)
        } else {
            1.73014 - 0.7067 * cp
        };
        let m1 = 0.0140407 * l / t - 1.75254 * volume.cbrt() / l - 4.79323 * b_l - c16;
        // L/B below 2 has no meaning in c17; such a hull gets a warning and no high-speed term.
        let c17 = 6919.3
            * cm.powf(-1.3346)
            * (volume / l.powi(3)).powf(2.00977)
            * (l / b - 2.0).max(0.0).powf(1.40692);
        let m3 = -7.2035 * b_l.powf(0.326869) * (t / b).powf(0.605375);
        let lambda = if l / b < 12.0 {
            1.446 * cp - 0.03 * l / b
        } else {
            1.446 * cp - 0.36
        };
        let c4 = (tf / l).min(0.04);
        let correlation_allowance = 0.006 * (l + 100.0).powf(-0.16) - 0.00205
            + 0.003 * (l / 7.5).sqrt() * cb.powi(4) * c2 * (0.04 - c4);

        Self {
            edition,
            length_of_run: lr,
            c12,
            c13,
            c14,
            form_factor,
            c7,
            c1,
            c3,
            c2,
            c5,
            c15,
            c16,
            m1,
            c17,
            m3,
            lambda,
            c4,
            correlation_allowance,
            length: l,
            beam: b,
            draft_forward: tf,
            volume,
            wetted_surface: hull.wetted_surface.value,
            appendage_area: input.appendage_area,
            appendage_form_factor: input.appendage_form_factor,
            bulb_area: abt,
            bulb_centre_height: hb,
            transom_area: at,
            waterplane: hull.waterplane_coefficient.value,
            prismatic: cp,
        }
    }

    /// m2 = c15·Cp²·exp(−0.1·Fn⁻²) of the 1982 edition at Froude number `fn_l`.
    pub fn m2(&self, fn_l: f64) -> f64 {
        self.c15 * self.prismatic * self.prismatic * (-0.1 / (fn_l * fn_l)).exp()
    }

    /// m4 = 0.4·c15·exp(−0.034·Fn⁻³·²⁹) of the 1984 edition at Froude number `fn_l`.
    pub fn m4(&self, fn_l: f64) -> f64 {
        0.4 * self.c15 * (-0.034 * fn_l.powf(-3.29)).exp()
    }

    /// Low-speed wave resistance formula (Fn < 0.40 in 1984; every Fn in 1982) at Fn, N.
    pub fn low_speed_wave(&self, fn_l: f64, density: f64) -> f64 {
        if fn_l <= 0.0 {
            return 0.0;
        }
        let oscillating = match self.edition {
            Edition::Original1982 => self.m2(fn_l),
            Edition::Revised1984 => self.m4(fn_l),
        };
        let exponent =
            self.m1 * fn_l.powf(-0.9) + oscillating * (self.lambda / (fn_l * fn_l)).cos();
        self.c1 * self.c2 * self.c5 * self.weight(density) * exponent.exp()
    }

    /// 1984 high-speed wave resistance formula (Fn > 0.55) at Fn, N.
    pub fn high_speed_wave(&self, fn_l: f64, density: f64) -> f64 {
        if fn_l <= 0.0 {
            return 0.0;
        }
        let exponent =
            self.m3 * fn_l.powf(-0.9) + self.m4(fn_l) * (self.lambda / (fn_l * fn_l)).cos();
        self.c17 * self.c2 * self.c5 * self.weight(density) * exponent.exp()
    }

    /// Wave resistance RW of this edition at Froude number `fn_l`, N.
    pub fn wave_resistance(&self, fn_l: f64, density: f64) -> f64 {
        match self.edition {
            Edition::Original1982 => self.low_speed_wave(fn_l, density),
            Edition::Revised1984 => {
                if fn_l <= LOW_SPEED_LIMIT_FN {
                    self.low_speed_wave(fn_l, density)
                } else if fn_l >= HIGH_SPEED_LIMIT_FN {
                    self.high_speed_wave(fn_l, density)
                } else {
                    // Holtrop (1984): RW = RWA + (10·Fn − 4)(RWB − RWA)/1.5, with RWA at Fn 0.40
                    // and RWB at Fn 0.55.
                    let at_low = self.low_speed_wave(LOW_SPEED_LIMIT_FN, density);
                    let at_high = self.high_speed_wave(HIGH_SPEED_LIMIT_FN, density);
                    at_low + (10.0 * fn_l - 4.0) * (at_high - at_low) / 1.5
                }
            }
        }
    }

    /// Every component of the method at `speed` m/s in `water`; all zero at zero speed.
    pub fn at_speed(&self, speed: f64, water: &WaterProperties) -> HoltropResistance {
        if speed <= 0.0 || !speed.is_finite() {
            return HoltropResistance {
                form_factor: self.form_factor,
                ..Default::default()
            };
        }
        let rho = water.density;
        let g = STANDARD_GRAVITY;
        let dynamic_pressure = 0.5 * rho * speed * speed;
        let fn_l = speed / (g * self.length).sqrt();
        let rn = reynolds_number(speed, self.length, water.kinematic_viscosity);
        let cf = ittc1957_friction_coefficient(rn);

        let friction = dynamic_pressure * self.wetted_surface * cf;
        let appendages = dynamic_pressure * self.appendage_area * self.appendage_form_factor * cf;
        let wave = self.wave_resistance(fn_l, rho);
        let bulb = self.bulb_resistance(speed, rho);
        let transom = self.transom_resistance(speed, dynamic_pressure);
        let correlation = dynamic_pressure
            * (self.wetted_surface + self.appendage_area)
            * self.correlation_allowance;
        let total = friction * self.form_factor + appendages + wave + bulb + transom + correlation;
        HoltropResistance {
            froude_number: fn_l,
            reynolds_number: rn,
            friction_coefficient: cf,
            friction,
            form_factor: self.form_factor,
            appendages,
            wave,
            bulb,
            transom,
            correlation,
            total,
        }
    }

    fn weight(&self, density: f64) -> f64 {
        self.volume * density * STANDARD_GRAVITY
    }

    /// RB = 0.11·exp(−3·PB⁻²)·FnI³·ABT^1.5·ρg/(1 + FnI²), N.
    fn bulb_resistance(&self, speed: f64, density: f64) -> f64 {
        let abt = self.bulb_area;
        if abt <= 0.0 {
            return 0.0;
        }
        let g = STANDARD_GRAVITY;
        // A bulb whose centre is more than 2/3 of the forward draft up is fully emergent in
        // Holtrop's PB; the immersion terms are floored at zero to keep the formula defined.
        let immersion = (self.draft_forward - 1.5 * self.bulb_centre_height).max(0.0);
        let inverse_pb = immersion / (0.56 * abt.sqrt());
        let depth = (self.draft_forward - self.bulb_centre_height - 0.25 * abt.sqrt()).max(0.0);
        let fn_i = speed / (g * depth + 0.15 * speed * speed).sqrt();
        0.11 * (-3.0 * inverse_pb * inverse_pb).exp() * fn_i.powi(3) * abt.powf(1.5) * density * g
            / (1.0 + fn_i * fn_i)
    }

    /// RTR = ½ρV²·AT·c6 with c6 = 0.2(1 − 0.2·FnT) for FnT < 5, else 0, N.
    fn transom_resistance(&self, speed: f64, dynamic_pressure: f64) -> f64 {
        let at = self.transom_area;
        if at <= 0.0 {
            return 0.0;
        }
        let fn_t =
            speed / (2.0 * STANDARD_GRAVITY * at / (self.beam * (1.0 + self.waterplane))).sqrt();
        let c6 = if fn_t < 5.0 {
            0.2 * (1.0 - 0.2 * fn_t)
        } else {
            0.0
        };
        dynamic_pressure * at * c6
    }
}

/// Warnings when `hull` lies outside the parameter ranges of the data the method was fitted to.
///
/// Ranges (Holtrop & Mennen 1982, table of limits over all ship types; from memory): Cp
/// 0.55–0.85, L/B 3.9–9.5, B/T 2.1–4.0. Small displacement motorboats often fall outside.
pub fn validity_warnings(hull: &HullForm, edition: Edition) -> Vec<Warning> {
    let mut warnings = Vec::new();
    let outside = |what: &str, value: f64, min: f64, max: f64| {
        Warning::about(
            range_subject(what),
            SOURCE,
            format!(
                "{what} = {value:.3} is outside {min}–{max}, the range of the ships Holtrop & Mennen fitted; \
                 the result is an extrapolation (common for small motorboats): calibrate it with a sea trial \
                 or use a resistance table if you have one"
            ),
        )
    };
    for (what, value, min, max) in outside_ranges(hull) {
        warnings.push(outside(what, value, min, max));
    }
    let l_b = hull.input.length_waterline / hull.input.beam_waterline;
    let coefficients = HoltropCoefficients::new(hull, edition);
    if coefficients.m1 >= 0.0 {
        warnings.push(Warning::new(
            SOURCE,
            format!(
                "m1 = {:.3} is not negative: the wave formula does not vanish at low speed for this hull; \
                 its wave resistance is not trustworthy",
                coefficients.m1
            ),
        ));
    }
    if edition == Edition::Revised1984 && l_b <= 2.0 {
        warnings.push(Warning::about(
            Subject::LengthBeamRatio,
            SOURCE,
            format!("L/B = {l_b:.2} ≤ 2: the high-speed wave formula (Fn > 0.55) gives no wave resistance"),
        ));
    }
    warnings
}

/// The input each entry of [`RANGES`] is about, in the same order.
const RANGE_SUBJECTS: [Subject; 3] = [
    Subject::PrismaticCoefficient,
    Subject::LengthBeamRatio,
    Subject::BeamDraftRatio,
];

/// The subject of the [`RANGES`] entry named `name` (a name from that table).
fn range_subject(name: &str) -> Subject {
    RANGES
        .iter()
        .position(|(range, _, _)| *range == name)
        .map_or(Subject::General, |i| RANGE_SUBJECTS[i])
}

/// The published ranges of the ships Holtrop & Mennen fitted: (name, min, max) of Cp, L/B, B/T.
pub const RANGES: [(&str, f64, f64); 3] =
    [("Cp", 0.55, 0.85), ("L/B", 3.9, 9.5), ("B/T", 2.1, 4.0)];

/// The hull parameters outside [`RANGES`]: (name, value, min, max).
pub fn outside_ranges(hull: &HullForm) -> Vec<(&'static str, f64, f64, f64)> {
    let values = [
        hull.prismatic_coefficient,
        hull.input.length_waterline / hull.input.beam_waterline,
        hull.input.beam_waterline / hull.draft_mean,
    ];
    RANGES
        .iter()
        .zip(values)
        .filter(|((_, min, max), value)| !(*min..=*max).contains(value))
        .map(|(&(name, min, max), value)| (name, value, min, max))
        .collect()
}

/// Highest Froude number at which either edition is taken as valid for small displacement
/// craft (dimensionless): [`SMALL_SHIP_FROUDE_MAX`], the limit of the ship type nearest a small
/// motorboat.
///
/// The 1984 re-analysis reaches higher Froude numbers only through slender high-speed forms
/// (L/B far above these boats'), so a short beamy motorboat is not credited with that reach;
/// the commonly quoted limit of the whole 1982 sample, Fn 0.45 (from memory), is wider still.
pub fn froude_limit(edition: Edition) -> f64 {
    match edition {
        Edition::Original1982 | Edition::Revised1984 => SMALL_SHIP_FROUDE_MAX,
    }
}

/// A warning when Froude number `fn_l` is past the edition's data.
pub fn froude_warning(fn_l: f64, edition: Edition) -> Option<Warning> {
    let limit = froude_limit(edition);
    (fn_l > limit).then(|| {
        Warning::about(
            Subject::FroudeNumber,
            SOURCE,
            format!(
                "Froude number {fn_l:.3} is above {limit}, the fastest Holtrop & Mennen give for \
                 trawlers, coasters and tugs; the wave resistance is an extrapolation there"
            ),
        )
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::propulsion::hull::HullInput;
    use crate::propulsion::water::{WaterKind, water_properties};

    fn small_boat() -> HullForm {
        // Invented 11 m displacement motorboat, only for the continuity and zero checks.
        HullInput {
            length_waterline: 11.0,
            beam_waterline: 3.6,
            draft_aft: 1.0,
            draft_forward: 0.9,
            displacement_volume: 15.0,
            midship_coefficient: None,
            waterplane_coefficient: None,
            lcb_fraction: Some(-0.03),
            wetted_surface: None,
            half_entrance_angle_deg: None,
            transom_area: Some(0.6),
            bulb_area: 0.0,
            bulb_centre_height: 0.0,
            stern_coefficient: 0.0,
            appendage_area: 2.0,
            appendage_form_factor: 2.0,
        }
        .resolve()
        .unwrap()
    }

    #[test]
    fn wave_resistance_is_continuous_at_both_branch_limits() {
        // Holtrop (1984): the blend meets each branch at Fn 0.40 and 0.55 by construction.
        let hull = small_boat();
        let c = HoltropCoefficients::new(&hull, Edition::Revised1984);
        for limit in [LOW_SPEED_LIMIT_FN, HIGH_SPEED_LIMIT_FN] {
            let below = c.wave_resistance(limit - 1e-9, 1025.0);
            let above = c.wave_resistance(limit + 1e-9, 1025.0);
            assert!(
                (below - above).abs() / below < 1e-6,
                "jump at Fn {limit}: {below} vs {above}"
            );
        }
    }

    #[test]
    fn zero_speed_gives_zero_without_nan() {
        let hull = small_boat();
        let water = water_properties(WaterKind::Sea, 15.0).unwrap();
        for edition in [Edition::Original1982, Edition::Revised1984] {
            let r = HoltropCoefficients::new(&hull, edition).at_speed(0.0, &water);
            assert_eq!(r.total, 0.0);
            assert!(r.form_factor.is_finite());
        }
    }

    #[test]
    fn small_boat_is_flagged_outside_the_data() {
        let hull = small_boat();
        let warnings = validity_warnings(&hull, Edition::Revised1984);
        assert!(
            warnings.iter().any(|w| w.message.contains("L/B")),
            "{warnings:?}"
        );
    }
}
