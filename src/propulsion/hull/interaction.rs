//! Hull–propeller interaction: wake fraction, thrust deduction, relative rotative efficiency.

use super::HullForm;
use super::friction::{ittc1957_friction_coefficient, reynolds_number};
use crate::propulsion::water::WaterProperties;

/// Interaction coefficients at one speed (all dimensionless).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Interaction {
    /// Taylor wake fraction w: Va = V·(1 − w).
    pub wake_fraction: f64,
    /// Thrust deduction fraction t: T = R/(1 − t).
    pub thrust_deduction: f64,
    /// Relative rotative efficiency ηR.
    pub relative_rotative_efficiency: f64,
}

/// How the interaction coefficients are found.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub enum InteractionMethod {
    /// Holtrop (1984) single-screw formulas, speed dependent through CV.
    Holtrop1984SingleScrew,
    /// Holtrop (1984) twin-screw formulas, the wake speed dependent through CV.
    Holtrop1984TwinScrew,
    /// Taylor's single-screw wake w = 0.5·Cb − 0.05 with Taylor's t = k·w, k = 0.6, and ηR = 1.0.
    Taylor,
    /// Van Oortmerssen (1971) small-ship regression of t, w and ηR on Cp, Fn, lcb, L/B, L/D.
    VanOortmerssen,
    /// Values the user gives.
    User(Interaction),
}

/// What the interaction estimate needs to know about the screw and stern.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ScrewAtStern {
    /// Screw diameter, m.
    pub diameter: f64,
    /// Pitch ratio P/D.
    pub pitch_ratio: f64,
    /// Expanded area ratio AE/A0.
    pub area_ratio: f64,
    /// Number of blades.
    pub blades: u32,
}

/// Taylor's k in t = k·w, the middle of 0.50–0.70 for a streamlined rudder (dimensionless).
pub const TAYLOR_THRUST_DEDUCTION_RATIO: f64 = 0.6;

/// Largest wake fraction returned; above it the regressions are far outside their data.
pub const MAX_WAKE_FRACTION: f64 = 0.59;
/// Largest thrust deduction returned.
pub const MAX_THRUST_DEDUCTION: f64 = 0.49;
/// Smallest relative rotative efficiency returned.
pub const MIN_RELATIVE_ROTATIVE_EFFICIENCY: f64 = 0.9;
/// Largest relative rotative efficiency returned.
pub const MAX_RELATIVE_ROTATIVE_EFFICIENCY: f64 = 1.1;

impl Interaction {
    /// These coefficients held inside their physical ranges.
    ///
    /// A negative wake or thrust deduction, a wake near 0.6 (the flow nearly stopped at the
    /// disc) or a thrust deduction near 0.5 (the screw needing twice the towed resistance) are
    /// never seen behind a single-screw displacement hull; they only arise when a regression is
    /// pushed far outside its data (a small boat with a large screw, say). Holding them keeps
    /// the thrust identity solvable and the result on the side of experience.
    pub fn clamped(self) -> Self {
        Self {
            wake_fraction: self.wake_fraction.clamp(0.0, MAX_WAKE_FRACTION),
            thrust_deduction: self.thrust_deduction.clamp(0.0, MAX_THRUST_DEDUCTION),
            relative_rotative_efficiency: self.relative_rotative_efficiency.clamp(
                MIN_RELATIVE_ROTATIVE_EFFICIENCY,
                MAX_RELATIVE_ROTATIVE_EFFICIENCY,
            ),
        }
    }
}

/// An interaction method refused for the boat's shaft count.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum InteractionShaftsError {
    /// A single-screw estimate asked for a twin-screw boat.
    #[error(
        "interaction: {method} is for single-screw boats only; for a twin-screw boat use \
         Holtrop (1984) twin screw or user values (w, t, ηR)"
    )]
    SingleScrewOnly {
        /// The method's display name.
        method: &'static str,
    },
    /// The twin-screw estimate asked for a single-screw boat.
    #[error(
        "interaction: Holtrop (1984) twin screw is for twin-screw boats only; for a single-screw \
         boat use Holtrop (1984) single screw, van Oortmerssen, Taylor or user values"
    )]
    TwinScrewOnly,
}

impl InteractionMethod {
    /// The interaction method that goes with a resistance method when the boat names none:
    /// van Oortmerssen's own factors with van Oortmerssen, Holtrop (1984) otherwise (single
    /// screw; see [`InteractionMethod::paired_with_shafts`] for a twin).
    pub fn paired_with(method: &super::ResistanceMethod) -> Self {
        Self::paired_with_shafts(method, 1)
    }

    /// The interaction method that goes with a resistance method and a shaft count (1 or 2)
    /// when the boat names none: on a twin-screw boat Holtrop (1984) twin screw whatever the
    /// resistance method (van Oortmerssen's factors are single-screw only); on a single screw
    /// as [`InteractionMethod::paired_with`].
    pub fn paired_with_shafts(method: &super::ResistanceMethod, shafts: u32) -> Self {
        match method {
            _ if shafts >= 2 => InteractionMethod::Holtrop1984TwinScrew,
            super::ResistanceMethod::VanOortmerssen => InteractionMethod::VanOortmerssen,
            _ => InteractionMethod::Holtrop1984SingleScrew,
        }
    }

    /// Whether the method fits a boat with `shafts` shafts: the single-screw estimates
    /// (Holtrop 1984 single screw, Taylor, van Oortmerssen) are refused for a twin, and
    /// Holtrop's twin-screw formulas for a single screw; user values fit both.
    pub fn check_shafts(&self, shafts: u32) -> Result<(), InteractionShaftsError> {
        match self {
            InteractionMethod::User(_) => Ok(()),
            InteractionMethod::Holtrop1984TwinScrew if shafts < 2 => {
                Err(InteractionShaftsError::TwinScrewOnly)
            }
            InteractionMethod::Holtrop1984TwinScrew => Ok(()),
            single if shafts >= 2 => Err(InteractionShaftsError::SingleScrewOnly {
                method: single.name(),
            }),
            _ => Ok(()),
        }
    }

    /// Short name of the method for display.
    pub fn name(&self) -> &'static str {
        match self {
            InteractionMethod::Holtrop1984SingleScrew => "Holtrop (1984) single screw",
            InteractionMethod::Holtrop1984TwinScrew => "Holtrop (1984) twin screw",
            InteractionMethod::Taylor => "Taylor",
            InteractionMethod::VanOortmerssen => "van Oortmerssen (1971)",
            InteractionMethod::User(_) => "user values",
        }
    }

    /// The interaction coefficients at `speed` (m/s) for this hull, water and screw.
    ///
    /// Always finite and inside the ranges of [`Interaction::clamped`]; no allocation.
    pub fn at_speed(
        &self,
        hull: &HullForm,
        water: &WaterProperties,
        screw: &ScrewAtStern,
        speed: f64,
    ) -> Interaction {
        self.prepared(hull, water, screw).at_speed(speed)
    }

    /// The method readied for `hull`, `water` and `screw`: its speed-independent terms found
    /// once, for a curve that asks at many speeds. Gives the same values as
    /// [`InteractionMethod::at_speed`].
    pub fn prepared<'a>(
        &self,
        hull: &'a HullForm,
        water: &'a WaterProperties,
        screw: &ScrewAtStern,
    ) -> PreparedInteraction<'a> {
        let single_screw = matches!(self, InteractionMethod::Holtrop1984SingleScrew)
            .then(|| SingleScrewTerms::new(hull, water, screw));
        let oortmerssen = matches!(self, InteractionMethod::VanOortmerssen)
            .then(|| super::oortmerssen::PreparedFactors::new(hull, screw));
        PreparedInteraction {
            method: *self,
            hull,
            water,
            screw: *screw,
            single_screw,
            oortmerssen,
        }
    }
}

/// An interaction method readied for one hull, water and screw ([`InteractionMethod::prepared`]).
#[derive(Debug, Clone, Copy)]
pub struct PreparedInteraction<'a> {
    method: InteractionMethod,
    hull: &'a HullForm,
    water: &'a WaterProperties,
    screw: ScrewAtStern,
    single_screw: Option<SingleScrewTerms>,
    oortmerssen: Option<super::oortmerssen::PreparedFactors>,
}

impl PreparedInteraction<'_> {
    /// The interaction coefficients at `speed` (m/s); always finite and inside the ranges of
    /// [`Interaction::clamped`]; no allocation.
    #[inline(always)]
    pub fn at_speed(&self, speed: f64) -> Interaction {
        let (hull, water, screw) = (self.hull, self.water, &self.screw);
        let raw = match self.method {
            InteractionMethod::Holtrop1984SingleScrew => match &self.single_screw {
                Some(terms) => terms.at_speed(speed),
                None => holtrop_single_screw(hull, water, screw, speed),
            },
            InteractionMethod::Holtrop1984TwinScrew => {
                holtrop_twin_screw(hull, water, screw, speed)
            }
            InteractionMethod::Taylor => {
                // Taylor (1933, "Speed and power of ships"), as given in Principles of Naval
                // Architecture (SNAME 1988, vol. II): single-screw w = 0.50·Cb − 0.05 and
                // t = k·w with k = 0.50–0.70 behind a streamlined rudder; k = 0.6 is the middle
                // of that band (from memory). The earlier t = 0.6·w·(1 + 0.67·w) had no source.
                let wake = 0.5 * hull.block_coefficient - 0.05;
                Interaction {
                    wake_fraction: wake,
                    thrust_deduction: TAYLOR_THRUST_DEDUCTION_RATIO * wake,
                    relative_rotative_efficiency: 1.0,
                }
            }
            InteractionMethod::VanOortmerssen => match &self.oortmerssen {
                Some(factors) => factors.at_speed(speed),
                None => super::oortmerssen::propulsion_factors(hull, screw, speed),
            },
            InteractionMethod::User(values) => values,
        };
        let finite = |x: f64, fallback: f64| if x.is_finite() { x } else { fallback };
        Interaction {
            wake_fraction: finite(raw.wake_fraction, 0.0),
            thrust_deduction: finite(raw.thrust_deduction, 0.0),
            relative_rotative_efficiency: finite(raw.relative_rotative_efficiency, 1.0),
        }
        .clamped()
    }
}

/// A warning when Holtrop (1984) single-screw factors fall outside small-craft practice:
/// t above 0.20 or a hull efficiency ηH = (1−t)/(1−w) below 1 (common practice for small
/// craft: t 0.10–0.20, ηH ≥ 1).
pub fn small_craft_warning(
    method: &InteractionMethod,
    values: &Interaction,
) -> Option<crate::propulsion::Warning> {
    let hull_efficiency = (1.0 - values.thrust_deduction) / (1.0 - values.wake_fraction);
    (matches!(method, InteractionMethod::Holtrop1984SingleScrew)
        && (values.thrust_deduction > 0.20 || hull_efficiency < 1.0))
        .then(|| {
            crate::propulsion::Warning::about(
                crate::propulsion::Subject::Interaction,

                "interaction",
                format!(
                    "Holtrop (1984) single-screw t = {:.3}, w = {:.3}, hull efficiency {hull_efficiency:.3}: unusual for small \
                     craft (common practice t 0.10–0.20 with hull efficiency at least 1); its merchant-ship sample \
                     may overstate t here; van Oortmerssen's factors or trial values may fit better",
                    values.thrust_deduction, values.wake_fraction
                ),
            )
        })
}

/// Holtrop's viscous resistance coefficient CV = (1+k)·CF + CA at `speed` (m/s), with 1+k the
/// hull form factor blended with the appendage form factor by wetted area (dimensionless).
pub fn viscous_coefficient(hull: &HullForm, water: &WaterProperties, speed: f64) -> f64 {
    ViscousTerms::new(hull, water).at_speed(speed)
}

/// The speed-independent parts of [`viscous_coefficient`].
#[derive(Debug, Clone, Copy)]
struct ViscousTerms {
    length: f64,
    viscosity: f64,
    form_factor: f64,
    correlation_allowance: f64,
}

impl ViscousTerms {
    fn new(hull: &HullForm, water: &WaterProperties) -> Self {
        let input = &hull.input;
        let coefficients = hull.holtrop_coefficients();
        let s_total = hull.wetted_surface.value + input.appendage_area;
        let k_total = coefficients.form_factor
            + (input.appendage_form_factor - coefficients.form_factor) * input.appendage_area
                / s_total;
        Self {
            length: input.length_waterline,
            viscosity: water.kinematic_viscosity,
            form_factor: k_total,
            correlation_allowance: coefficients.correlation_allowance,
        }
    }

    fn at_speed(&self, speed: f64) -> f64 {
        let rn = reynolds_number(speed, self.length, self.viscosity);
        let cf = ittc1957_friction_coefficient(rn);
        self.form_factor * cf + self.correlation_allowance
    }
}

/// Holtrop (1984) twin-screw wake, thrust deduction and ηR (unclamped).
///
/// Holtrop, J. (1984), "A statistical re-analysis of resistance and propulsion data",
/// International Shipbuilding Progress 31(363), pp. 272–276 (formulas from memory, as
/// reproduced in Molland, Turnock & Hudson, *Ship Resistance and Propulsion*, §16.3):
///
/// - w = 0.3095·Cb + 10·CV·Cb − 0.23·D/√(B·T)
/// - t = 0.325·Cb − 0.1885·D/√(B·T)
/// - ηR = 0.9737 + 0.111·(Cp − 0.0225·lcb) − 0.06325·P/D
///
/// with T the mean draft, lcb in % of L forward of midships and CV as in
/// [`viscous_coefficient`]. Range: the merchant-ship sample of Holtrop & Mennen (roughly
/// 0.55 ≤ Cp ≤ 0.85, 3.9 ≤ L/B ≤ 9.5, Fn ≤ 0.45; from memory); twin open shafts with
/// brackets.
pub fn holtrop_twin_screw(
    hull: &HullForm,
    water: &WaterProperties,
    screw: &ScrewAtStern,
    speed: f64,
) -> Interaction {
    let b = hull.input.beam_waterline;
    let cb = hull.block_coefficient;
    let cp = hull.prismatic_coefficient;
    let lcb = hull.lcb_percent();
    let cv = viscous_coefficient(hull, water, speed);
    let diameter_over_section = screw.diameter / (b * hull.draft_mean).sqrt();
    Interaction {
        wake_fraction: 0.3095 * cb + 10.0 * cv * cb - 0.23 * diameter_over_section,
        thrust_deduction: 0.325 * cb - 0.1885 * diameter_over_section,
        relative_rotative_efficiency: 0.9737 + 0.111 * (cp - 0.0225 * lcb)
            - 0.06325 * screw.pitch_ratio,
    }
}

/// Holtrop (1984) single-screw wake, thrust deduction and ηR (unclamped).
///
/// The wake depends on speed through the viscous coefficient CV = (1+k)·CF + CA, with 1+k the
/// hull form factor blended with the appendage form factor by wetted area.
pub fn holtrop_single_screw(
    hull: &HullForm,
    water: &WaterProperties,
    screw: &ScrewAtStern,
    speed: f64,
) -> Interaction {
    SingleScrewTerms::new(hull, water, screw).at_speed(speed)
}

/// The terms of [`holtrop_single_screw`] that do not depend on speed, grouped so that the
/// wake at a speed is formed in the formula's own order (the same rounding as term by term).
#[derive(Debug, Clone, Copy)]
struct SingleScrewTerms {
    viscous: ViscousTerms,
    /// c9·c20.
    c9_c20: f64,
    /// L/TA.
    length_over_draft: f64,
    /// 0.93405·c11.
    c11_term: f64,
    /// 1 − CP1 (floored).
    one_minus_cp1: f64,
    /// 0.27915·c20·√(B/(L·(1 − CP1))).
    beam_term: f64,
    /// c19·c20.
    c19_c20: f64,
    thrust_deduction: f64,
    relative_rotative_efficiency: f64,
}

impl SingleScrewTerms {
    fn new(hull: &HullForm, water: &WaterProperties, screw: &ScrewAtStern) -> Self {
        let input = &hull.input;
        let (l, b) = (input.length_waterline, input.beam_waterline);
        let ta = input.draft_aft;
        let d = screw.diameter;
        let s = hull.wetted_surface.value;
        let cb = hull.block_coefficient;
        let cp = hull.prismatic_coefficient;
        let cm = hull.midship_coefficient.value;
        let lcb = hull.lcb_percent();
        let cstern = input.stern_coefficient;

        let c8 = if b / ta < 5.0 {
            b * s / (l * d * ta)
        } else {
            s * (7.0 * b / ta - 25.0) / (l * d * (b / ta - 3.0))
        };
        let c9 = if c8 < 28.0 {
            c8
        } else {
            32.0 - 16.0 / (c8 - 24.0)
        };
        let ta_d = ta / d;
        let c11 = if ta_d < 2.0 {
            ta_d
        } else {
            0.0833333 * ta_d.powi(3) + 1.33333
        };
        let c19 = if cp < 0.7 {
            0.12997 / (0.95 - cb) - 0.11056 / (0.95 - cp)
        } else {
            0.18567 / (1.3571 - cm) - 0.71276 + 0.38648 * cp
        };
        let c20 = 1.0 + 0.015 * cstern;
        // CP1 < 1 always for Cp ≤ 0.98 and |lcb| ≤ 10 %; the floor only guards the square root.
        let one_minus_cp1 = (1.0 - (1.45 * cp - 0.315 - 0.0225 * lcb)).max(0.05);
        let thrust_deduction =
            0.25014 * (b / l).powf(0.28956) * ((b * hull.draft_mean).sqrt() / d).powf(0.2624)
                / (1.0 - cp + 0.0225 * lcb).max(0.01).powf(0.01762)
                + 0.0015 * cstern;
        let relative_rotative_efficiency =
            0.9922 - 0.05908 * screw.area_ratio + 0.07424 * (cp - 0.0225 * lcb);
        Self {
            viscous: ViscousTerms::new(hull, water),
            c9_c20: c9 * c20,
            length_over_draft: l / ta,
            c11_term: 0.93405 * c11,
            one_minus_cp1,
            beam_term: 0.27915 * c20 * (b / (l * one_minus_cp1)).sqrt(),
            c19_c20: c19 * c20,
            thrust_deduction,
            relative_rotative_efficiency,
        }
    }

    /// Holtrop (1984) single-screw w, t and ηR at `speed` m/s (unclamped).
    fn at_speed(&self, speed: f64) -> Interaction {
        let cv = self.viscous.at_speed(speed);
        let wake_fraction = self.c9_c20
            * cv
            * self.length_over_draft
            * (0.050776 + self.c11_term * cv / self.one_minus_cp1)
            + self.beam_term
            + self.c19_c20;
        Interaction {
            wake_fraction,
            thrust_deduction: self.thrust_deduction,
            relative_rotative_efficiency: self.relative_rotative_efficiency,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clamping_keeps_values_physical_and_leaves_normal_ones_alone() {
        let normal = Interaction {
            wake_fraction: 0.25,
            thrust_deduction: 0.18,
            relative_rotative_efficiency: 1.01,
        };
        assert_eq!(normal.clamped(), normal);
        let wild = Interaction {
            wake_fraction: -0.2,
            thrust_deduction: 0.7,
            relative_rotative_efficiency: 0.5,
        };
        let held = wild.clamped();
        assert_eq!(held.wake_fraction, 0.0);
        assert_eq!(held.thrust_deduction, MAX_THRUST_DEDUCTION);
        assert_eq!(
            held.relative_rotative_efficiency,
            MIN_RELATIVE_ROTATIVE_EFFICIENCY
        );
    }
}
