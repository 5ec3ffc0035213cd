//! The calm-water resistance curve at every speed the solver can visit.
//!
//! A regression is published over a Froude range; a repower with a bigger engine often puts
//! full throttle past it, where an extrapolated regression can hollow or fall. The curve here
//! is built once per model so that total resistance rises with speed by construction:
//!
//! 1. the model's own method ([`Regime::Method`]);
//! 2. for van Oortmerssen (1971), past its range (Fn 0.50), a hand-over to Holtrop (1984)
//!    blended over [`HAND_OVER_WIDTH`] with a smoothstep weight, so that resistance and its
//!    slope are continuous ([`Regime::HandOver`]), then Holtrop (1984) alone, whose high-speed
//!    branch is published up to Fn 1.0 ([`Regime::Holtrop1984`]); Holtrop–Mennen is its own
//!    continuation there, and a table covers its own rows;
//! 3. past every method's reach — or from the first speed where the curve above stops rising
//!    as fast as [`rise_floor`] asks — a power law R = R₀·(V/V₀)ⁿ that keeps the last valid
//!    log-slope, n ≥ [`MIN_CONTINUATION_EXPONENT`] ([`Regime::Continuation`]).
//!
//! Every regime but the first is an extrapolation, and says so through
//! [`super::SpeedValidity`].

use super::oortmerssen::{self, OortmerssenCoefficients};
use super::resistance::{ResistanceComponents, ResistanceMethod, ResistanceTable};
use super::{HullError, HullForm};
use crate::propulsion::STANDARD_GRAVITY;
use crate::propulsion::water::WaterProperties;

/// Which formula gives the calm-water resistance at one speed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Regime {
    /// The model's own method (in or past its published Froude range).
    Method,
    /// Blending from van Oortmerssen (1971) into Holtrop (1984) past the former's range.
    HandOver,
    /// Holtrop (1984) with its high-speed branch, past van Oortmerssen's range.
    Holtrop1984,
    /// A rising power law across a stretch where the formulas' curve hollows, rejoining them
    /// where they climb above it again.
    Bridge,
    /// The rising power law past every method's reach, or where a method stopped rising.
    Continuation,
}

impl Regime {
    /// What gives the resistance in this regime, in a few words, for tables and charts.
    pub fn words(self, method: &ResistanceMethod) -> &'static str {
        match (self, method) {
            (Regime::Method, ResistanceMethod::HoltropMennen) => "Holtrop-Mennen",
            (Regime::Method, ResistanceMethod::VanOortmerssen) => "van Oortmerssen",
            (Regime::Method, ResistanceMethod::Table(_)) => "table",
            (Regime::HandOver, _) => "hand-over to Holtrop 1984",
            (Regime::Holtrop1984, _) => "Holtrop 1984 high-speed",
            (Regime::Bridge, _) => "bridge over a hollow",
            (Regime::Continuation, _) => "power-law continuation",
        }
    }

    /// The regime as a short phrase for a table row's note ("power-law continuation").
    pub fn phrase(self) -> &'static str {
        match self {
            Regime::Method => "the method",
            Regime::HandOver => "hand-over to Holtrop 1984",
            Regime::Holtrop1984 => "Holtrop 1984 past the method",
            Regime::Bridge => "bridged hollow",
            Regime::Continuation => "power-law continuation",
        }
    }

    /// Whether the regime is an extrapolation past the model's own method (a bridge repairs
    /// the method's own curve and is not).
    pub fn is_extrapolation(self) -> bool {
        !matches!(self, Regime::Method | Regime::Bridge)
    }
}

/// Froude number where van Oortmerssen (1971) hands over to Holtrop (1984): the end of its
/// data (dimensionless).
pub const HAND_OVER_START: f64 = oortmerssen::FROUDE_MAX;
/// Froude width of the hand-over window (dimensionless; our choice: wide enough for a smooth
/// slope, narrow enough to use little of the regression past its data).
pub const HAND_OVER_WIDTH: f64 = 0.06;
/// Highest Froude number of Holtrop (1984)'s high-speed branch: the fastest ships of its
/// sample (Holtrop 1984, Int. Shipbuilding Progress 31(363); dimensionless).
pub const HOLTROP_1984_FROUDE_MAX: f64 = 1.0;
/// Smallest exponent n of the continuation R ∝ Vⁿ: a drag that grows at least with the square
/// of speed, as friction and air do (dimensionless).
pub const MIN_CONTINUATION_EXPONENT: f64 = 2.0;
/// Largest exponent n of the continuation (dimensionless; our bound, so that a steep last
/// slope near hull speed — the "wall" — is kept without letting a kink in a regression
/// dominate everything past it).
pub const MAX_CONTINUATION_EXPONENT: f64 = 8.0;
/// Froude step of the scan that checks the curve rises (dimensionless). The fastest
/// oscillation of the regressions (van Oortmerssen's sin/cos of Fn⁻²) has a period of about
/// 0.08 in Fn where it is not negligible, so 0.005 resolves it.
const SCAN_STEP: f64 = 0.005;
/// Froude number where the scan starts; below it friction, which always rises, dominates.
const SCAN_START: f64 = 0.02;
/// Froude number from which the curve must rise at least as V² (past hull speed, where a
/// displacement hull's resistance climbs its wall, common practice); below it, at least as V.
const WALL_FROUDE: f64 = 0.40;

/// The least log-slope d ln R / d ln V a calm-water curve must keep at Froude number `froude`
/// before the continuation takes over (dimensionless).
pub fn rise_floor(froude: f64) -> f64 {
    if froude < WALL_FROUDE {
        1.0
    } else {
        MIN_CONTINUATION_EXPONENT
    }
}

/// Most bridges one curve holds; a curve that hollows more often is continued from the next.
pub const MAX_BRIDGES: usize = 4;
/// Smallest exponent of a bridge (dimensionless): below hull speed the curve must still rise
/// at least as fast as friction, about V^1.8, and a bridge at V^1.5 stays below it.
const MIN_BRIDGE_EXPONENT: f64 = 1.5;

/// A power law R = R₀·(V/V₀)ⁿ carrying the curve across a hollow of the formulas.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct Bridge {
    /// Where the bridge leaves the formulas, m/s.
    pub start_speed: f64,
    /// The resistance there, N.
    pub start_resistance: f64,
    /// Where it meets them again, m/s (0 for an unused slot).
    pub end_speed: f64,
    /// Its exponent n, set so that it meets them exactly (dimensionless).
    pub exponent: f64,
}

/// The speed-independent description of one model's curve: where each regime lies.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct CurveShape {
    /// Froude window (start, end) of the hand-over to Holtrop (1984), or `None` when the
    /// method needs none (Holtrop–Mennen continues itself; a table has its rows).
    pub hand_over: Option<(f64, f64)>,
    /// Speed from which the power-law continuation gives the resistance, m/s.
    pub continuation_speed: f64,
    /// Calm, clean-hull resistance at `continuation_speed` (no calibration factor), N.
    pub continuation_resistance: f64,
    /// Exponent n of the continuation R ∝ Vⁿ (dimensionless).
    pub continuation_exponent: f64,
    /// The regime the continuation starts from (its viscous parts are kept past it).
    pub continued_from: Regime,
    /// Power-law bridges over hollows of the formulas' curve (unused ones are empty).
    pub bridges: [Bridge; MAX_BRIDGES],
    /// How many of `bridges` are laid (the rest are empty).
    #[serde(skip)]
    bridges_laid: usize,
    /// Van Oortmerssen's coefficients for this hull, computed once.
    #[serde(skip)]
    oortmerssen: Option<OortmerssenCoefficients>,
    /// What the shape was found for, so a debug build catches a model changed behind it.
    #[serde(skip)]
    fingerprint: [f64; 6],
}

/// The inputs a shape depends on, as numbers (method, hull size, wetted surface, water).
fn fingerprint(hull: &HullForm, method: &ResistanceMethod, water: &WaterProperties) -> [f64; 6] {
    let method = match method {
        ResistanceMethod::HoltropMennen => -1.0,
        ResistanceMethod::VanOortmerssen => -2.0,
        ResistanceMethod::Table(table) => table.rows.iter().map(|&(v, r)| v + r).sum(),
    };
    [
        method,
        hull.input.length_waterline,
        hull.input.displacement_volume,
        hull.wetted_surface.value,
        water.density,
        water.kinematic_viscosity,
    ]
}

/// What the formulas are evaluated on: the hull, the method and the water.
type Formula<'a> = (&'a HullForm, &'a ResistanceMethod, &'a WaterProperties);

impl CurveShape {
    /// The shape of the curve of `method` on `hull` in `water`: the hand-over window, and the
    /// continuation found by scanning the formulas' curve for the first speed where it stops
    /// rising (or the end of the last method's reach).
    pub fn new(hull: &HullForm, method: &ResistanceMethod, water: &WaterProperties) -> Self {
        // The scan costs a couple of hundred evaluations of the formulas, and a shortlist
        // rebuilds the same hull in the same water for every candidate: each thread keeps the
        // last shape it found with what it was found for (the same inputs, the same shape).
        type Found = (HullForm, ResistanceMethod, WaterProperties, CurveShape);
        thread_local! {
            static LAST: std::cell::RefCell<Option<Found>> = const { std::cell::RefCell::new(None) };
        }
        LAST.with(|last| {
            if let Some((h, m, w, shape)) = &*last.borrow()
                && h == hull
                && m == method
                && w == water
            {
                return *shape;
            }
            let shape = Self::scanned(hull, method, water);
            *last.borrow_mut() = Some((hull.clone(), method.clone(), *water, shape));
            shape
        })
    }

    /// [`CurveShape::new`] found by scanning the formulas.
    fn scanned(hull: &HullForm, method: &ResistanceMethod, water: &WaterProperties) -> Self {
        let oortmerssen = match method {
            ResistanceMethod::VanOortmerssen => OortmerssenCoefficients::new(hull).ok(),
            _ => None,
        };
        let mut shape = CurveShape {
            hand_over: matches!(method, ResistanceMethod::VanOortmerssen)
                .then_some((HAND_OVER_START, HAND_OVER_START + HAND_OVER_WIDTH)),
            continuation_speed: f64::INFINITY,
            continuation_resistance: 0.0,
            continuation_exponent: MIN_CONTINUATION_EXPONENT,
            continued_from: Regime::Method,
            bridges: [Bridge::default(); MAX_BRIDGES],
            bridges_laid: 0,
            oortmerssen,
            fingerprint: fingerprint(hull, method, water),
        };
        let formula = (hull, method, water);
        let samples: Vec<(f64, f64)> = match method {
            ResistanceMethod::Table(table) => match table.validate() {
                Ok(()) => table
                    .rows
                    .iter()
                    .copied()
                    .filter(|&(v, _)| v > 0.0)
                    .collect(),
                Err(_) => return shape,
            },
            _ => {
                let speed_of =
                    |froude: f64| froude * (STANDARD_GRAVITY * hull.input.length_waterline).sqrt();
                let steps = ((HOLTROP_1984_FROUDE_MAX - SCAN_START) / SCAN_STEP).round() as usize;
                (0..=steps)
                    .map(|k| speed_of(SCAN_START + k as f64 * SCAN_STEP))
                    .filter_map(|v| shape.formulas(formula, v).ok().map(|r| (v, calm_total(&r))))
                    .collect()
            }
        };
        shape.follow(&samples, |speed| match method {
            // Measured data only has to rise.
            ResistanceMethod::Table(_) => f64::MIN_POSITIVE,
            _ => rise_floor(hull.froude_number(speed)),
        });
        let start = shape.continuation_speed;
        if start.is_finite() {
            shape.continued_from = shape.formula_regime(hull, start);
        }
        shape
    }

    /// Walks the formulas' `samples` (speed m/s, resistance N) by rising speed and sets the
    /// bridges and the continuation: where a segment's log-slope falls below `floor(speed)`,
    /// a power law with the last valid slope (at least the floor) carries the curve until the
    /// formulas climb back above it (a bridge, whose exponent is then set to meet them
    /// exactly) or to the end (the continuation).
    fn follow(&mut self, samples: &[(f64, f64)], floor: impl Fn(f64) -> f64) {
        let Some(&last) = samples.last() else {
            return;
        };
        let mut last_slope = MIN_CONTINUATION_EXPONENT;
        // An open bridge: its start (speed, resistance) and exponent.
        let mut open: Option<(f64, f64, f64)> = None;
        let mut bridges = 0;
        for pair in samples.windows(2) {
            let ((v0, r0), (v1, r1)) = (pair[0], pair[1]);
            if let Some((start_speed, start_resistance, exponent)) = open {
                let carried = start_resistance * (v1 / start_speed).powf(exponent);
                if r1 >= carried {
                    if bridges == MAX_BRIDGES {
                        break;
                    }
                    self.bridges[bridges] = Bridge {
                        start_speed,
                        start_resistance,
                        end_speed: v1,
                        exponent: log_slope((start_speed, start_resistance), (v1, r1)),
                    };
                    bridges += 1;
                    self.bridges_laid = bridges;
                    open = None;
                }
                continue;
            }
            let slope = log_slope((v0, r0), (v1, r1));
            let least = floor(v0);
            if slope >= least {
                last_slope = slope;
            } else {
                let exponent =
                    last_slope.clamp(least.max(MIN_BRIDGE_EXPONENT), MAX_CONTINUATION_EXPONENT);
                open = Some((v0, r0, exponent));
            }
        }
        let (start_speed, start_resistance, exponent) =
            open.unwrap_or((last.0, last.1, last_slope));
        self.continuation_speed = start_speed;
        self.continuation_resistance = start_resistance;
        self.continuation_exponent =
            exponent.clamp(MIN_CONTINUATION_EXPONENT, MAX_CONTINUATION_EXPONENT);
    }

    /// The regime that gives the resistance at `speed` m/s on `hull`.
    pub fn regime_at(&self, hull: &HullForm, speed: f64) -> Regime {
        if speed > self.continuation_speed {
            Regime::Continuation
        } else if self.bridge_at(speed).is_some() {
            Regime::Bridge
        } else {
            self.formula_regime(hull, speed)
        }
    }

    /// The bridge that carries `speed` m/s, if any.
    fn bridge_at(&self, speed: f64) -> Option<&Bridge> {
        self.bridges[..self.bridges_laid]
            .iter()
            .find(|b| speed > b.start_speed && speed < b.end_speed)
    }

    /// The regime of the formulas (no continuation) at `speed` m/s.
    fn formula_regime(&self, hull: &HullForm, speed: f64) -> Regime {
        match self.hand_over {
            Some((start, end)) => {
                let froude = hull.froude_number(speed);
                if froude <= start {
                    Regime::Method
                } else if froude < end {
                    Regime::HandOver
                } else {
                    Regime::Holtrop1984
                }
            }
            None => Regime::Method,
        }
    }

    /// Calm, clean-hull components at `speed` m/s (> 0) along the physical curve: the formulas
    /// up to the continuation, the power law past it.
    #[inline(always)]
    pub fn components(
        &self,
        hull: &HullForm,
        method: &ResistanceMethod,
        water: &WaterProperties,
        speed: f64,
    ) -> Result<ResistanceComponents, HullError> {
        debug_assert!(
            self.fingerprint == fingerprint(hull, method, water),
            "the resistance model changed after its curve's shape was found: use its with_* methods"
        );
        let formula = (hull, method, water);
        let (total, regime) = if speed > self.continuation_speed {
            let total = self.continuation_resistance
                * (speed / self.continuation_speed).powf(self.continuation_exponent);
            (total, self.continued_from)
        } else if let Some(bridge) = self.bridge_at(speed) {
            let total =
                bridge.start_resistance * (speed / bridge.start_speed).powf(bridge.exponent);
            (total, self.formula_regime(hull, speed))
        } else {
            return self.formulas(formula, speed);
        };
        // On a power law the viscous parts keep their own physics (they rise with speed at
        // any Froude number); the power law gives the total, and the rest of it is the wave
        // (residuary) part.
        let mut parts = match method {
            ResistanceMethod::Table(_) => ResistanceComponents {
                friction: ittc_friction(hull, water, speed),
                form_factor: 1.0,
                ..Default::default()
            },
            _ => self.formulas_in(formula, regime, speed)?,
        };
        parts.bulb = 0.0;
        parts.transom = 0.0;
        parts.wave = 0.0;
        parts.wave = (total - calm_total(&parts)).max(0.0);
        Ok(parts)
    }

    /// The formulas' components at `speed` m/s, in the regime of that speed.
    #[inline(always)]
    fn formulas(
        &self,
        formula: Formula<'_>,
        speed: f64,
    ) -> Result<ResistanceComponents, HullError> {
        self.formulas_in(formula, self.formula_regime(formula.0, speed), speed)
    }

    /// The formulas' components at `speed` m/s in `regime` (the continuation is never asked of
    /// this function; it is given the regime the continuation starts from).
    #[inline(always)]
    fn formulas_in(
        &self,
        (hull, method, water): Formula<'_>,
        regime: Regime,
        speed: f64,
    ) -> Result<ResistanceComponents, HullError> {
        match (method, regime) {
            (ResistanceMethod::Table(table), _) => table_components(hull, water, table, speed),
            (ResistanceMethod::HoltropMennen, _) | (_, Regime::Holtrop1984) => {
                Ok(holtrop(hull, water, speed))
            }
            (ResistanceMethod::VanOortmerssen, Regime::HandOver) => {
                let (start, end) = self.hand_over.unwrap_or((HAND_OVER_START, HAND_OVER_START));
                let x = ((hull.froude_number(speed) - start) / (end - start)).clamp(0.0, 1.0);
                // Smoothstep: weight and slope of the blend are continuous at both ends.
                let share = x * x * (3.0 - 2.0 * x);
                let low = self.van_oortmerssen(hull, water, speed)?;
                let high = holtrop(hull, water, speed);
                Ok(blend(&low, &high, share))
            }
            (ResistanceMethod::VanOortmerssen, _) => self.van_oortmerssen(hull, water, speed),
        }
    }

    #[inline(always)]
    fn van_oortmerssen(
        &self,
        hull: &HullForm,
        water: &WaterProperties,
        speed: f64,
    ) -> Result<ResistanceComponents, HullError> {
        let coefficients = match self.oortmerssen {
            Some(c) => c,
            None => OortmerssenCoefficients::new(hull)?,
        };
        let r = oortmerssen::at_speed(hull, &coefficients, speed, water);
        Ok(ResistanceComponents {
            friction: r.friction,
            form_factor: 1.0,
            appendages: r.appendages,
            wave: r.residuary,
            correlation: r.correlation,
            ..Default::default()
        })
    }
}

/// Holtrop (1984)'s components at `speed` m/s.
fn holtrop(hull: &HullForm, water: &WaterProperties, speed: f64) -> ResistanceComponents {
    let r = hull.holtrop_coefficients().at_speed(speed, water);
    ResistanceComponents {
        friction: r.friction,
        form_factor: r.form_factor,
        appendages: r.appendages,
        wave: r.wave,
        bulb: r.bulb,
        transom: r.transom,
        correlation: r.correlation,
        ..Default::default()
    }
}

/// A table's value split into ITTC-1957 friction (form factor 1) and the rest.
fn table_components(
    hull: &HullForm,
    water: &WaterProperties,
    table: &ResistanceTable,
    speed: f64,
) -> Result<ResistanceComponents, HullError> {
    let (first_speed, first_resistance) = table.rows[0];
    // Below a table's first row the resistance goes to zero as V², as friction does.
    let tabulated = if speed < first_speed {
        first_resistance * (speed / first_speed).powi(2)
    } else {
        table.interpolate(speed)?
    };
    let friction = ittc_friction(hull, water, speed);
    Ok(ResistanceComponents {
        friction,
        form_factor: 1.0,
        wave: tabulated - friction,
        ..Default::default()
    })
}

/// (1 − share)·low + share·high for every force; the friction of both is the same ITTC-1957
/// line on the same wetted surface, so blending the form factor keeps the sum exact.
fn blend(
    low: &ResistanceComponents,
    high: &ResistanceComponents,
    share: f64,
) -> ResistanceComponents {
    let mix = |a: f64, b: f64| (1.0 - share) * a + share * b;
    ResistanceComponents {
        friction: low.friction,
        form_factor: mix(low.form_factor, high.form_factor),
        appendages: mix(low.appendages, high.appendages),
        wave: mix(low.wave, high.wave),
        bulb: mix(low.bulb, high.bulb),
        transom: mix(low.transom, high.transom),
        correlation: mix(low.correlation, high.correlation),
        ..Default::default()
    }
}

/// The calm-water sum of `parts`: friction·(1+k) + appendages + wave + bulb + transom +
/// correlation, N.
pub fn calm_total(parts: &ResistanceComponents) -> f64 {
    parts.friction * parts.form_factor
        + parts.appendages
        + parts.wave
        + parts.bulb
        + parts.transom
        + parts.correlation
}

/// d ln R / d ln V between two (speed, resistance) samples (dimensionless); −∞ when the
/// resistance does not stay positive.
fn log_slope((v0, r0): (f64, f64), (v1, r1): (f64, f64)) -> f64 {
    if r0 > 0.0 && r1 > 0.0 && v0 > 0.0 && v1 > v0 {
        (r1 / r0).ln() / (v1 / v0).ln()
    } else {
        f64::NEG_INFINITY
    }
}

/// ITTC-1957 frictional resistance of the bare hull at `speed` m/s, N.
pub fn ittc_friction(hull: &HullForm, water: &WaterProperties, speed: f64) -> f64 {
    let rn = super::friction::reynolds_number(
        speed,
        hull.input.length_waterline,
        water.kinematic_viscosity,
    );
    0.5 * water.density
        * speed
        * speed
        * hull.wetted_surface.value
        * super::friction::ittc1957_friction_coefficient(rn)
}
