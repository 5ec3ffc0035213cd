//! The resistance model of a boat: a method, air drag and margins, evaluated at any speed.

use super::holtrop::{self, Edition};
use super::oortmerssen;
use super::regime::{self, CurveShape, Regime};
use super::{HullError, HullForm};
use crate::propulsion::water::WaterProperties;
use crate::propulsion::{STANDARD_GRAVITY, Subject, Warning};

/// Resistance at one speed split into its components, all in newtons.
#[derive(Debug, Clone, Copy, PartialEq, Default, serde::Serialize)]
pub struct ResistanceComponents {
    /// Frictional resistance of the bare hull by ITTC-1957 (without form factor), N.
    pub friction: f64,
    /// Form factor 1+k1 applied to friction (dimensionless).
    pub form_factor: f64,
    /// Appendage resistance, N.
    pub appendages: f64,
    /// Wave-making and wave-breaking resistance, N.
    pub wave: f64,
    /// Extra pressure resistance of a bulbous bow near the surface, N.
    pub bulb: f64,
    /// Extra pressure resistance of an immersed transom, N.
    pub transom: f64,
    /// Model–ship correlation (roughness) allowance, N.
    pub correlation: f64,
    /// Air and wind resistance of the superstructure, N.
    pub air: f64,
    /// Service margin (fouling, sea state) added on top, N.
    pub margin: f64,
    /// Total resistance: calibrated calm water, air and the margins on top, N.
    pub total: f64,
}

/// A user resistance table: speed (m/s) → total calm-water hull resistance (N), sorted by speed.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ResistanceTable {
    /// Rows of (speed m/s, resistance N), strictly increasing in speed.
    pub rows: Vec<(f64, f64)>,
}

/// Which calm-water resistance method to use.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub enum ResistanceMethod {
    /// Holtrop & Mennen (1982) with Holtrop (1984) revisions.
    HoltropMennen,
    /// Van Oortmerssen (1971), the small-ship regression.
    VanOortmerssen,
    /// A user-supplied table, interpolated.
    Table(ResistanceTable),
}

/// Air drag of the above-water boat: ½·ρair·Cd·A·(V + headwind)².
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct AirDrag {
    /// Air density, kg/m³.
    pub air_density: f64,
    /// Drag coefficient based on frontal area (dimensionless).
    pub drag_coefficient: f64,
    /// Frontal (transverse projected) area above water, m².
    pub frontal_area: f64,
    /// Headwind speed relative to ground, m/s (0 for calm air).
    pub headwind: f64,
}

/// Allowances added to calm-water resistance.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Margins {
    /// Service margin on total resistance (fouling, sea state), fraction (0.15 = +15 %).
    pub service: f64,
    /// Hull fouling as added frictional resistance, fraction of friction (0.2 = +20 %).
    pub fouling: f64,
    /// Sea-trial calibration factor on the calm, clean-hull water resistance (1.0 = none);
    /// fouling and the service margin are added on top of the calibrated resistance.
    pub resistance_factor: f64,
    /// A factor that varies with Froude number instead, when the trial fitted one (it then
    /// replaces `resistance_factor`).
    pub froude_factor: Option<FroudeFactor>,
}

impl Default for Margins {
    fn default() -> Self {
        Self {
            service: 0.0,
            fouling: 0.0,
            resistance_factor: 1.0,
            froude_factor: None,
        }
    }
}

/// A sea-trial factor that varies with length Froude number: `low` up to `froude_low`, `high`
/// from `froude_high`, straight between. Outside the trial's speeds it is held, never
/// extrapolated: a trial says nothing of the hull where it did not run.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct FroudeFactor {
    /// Froude number of the slowest trial speed (dimensionless).
    pub froude_low: f64,
    /// The factor there and below (dimensionless).
    pub low: f64,
    /// Froude number of the fastest trial speed (dimensionless).
    pub froude_high: f64,
    /// The factor there and above (dimensionless).
    pub high: f64,
}

impl FroudeFactor {
    /// The factor at Froude number `froude` (dimensionless).
    pub fn at(&self, froude: f64) -> f64 {
        let span = self.froude_high - self.froude_low;
        if span.is_nan() || span <= 0.0 || froude <= self.froude_low {
            return self.low;
        }
        if froude >= self.froude_high {
            return self.high;
        }
        self.low + (self.high - self.low) * (froude - self.froude_low) / span
    }
}

impl Margins {
    /// The calibration factor at Froude number `froude` (dimensionless).
    pub fn factor_at(&self, froude: f64) -> f64 {
        self.froude_factor
            .map_or(self.resistance_factor, |f| f.at(froude))
    }
}

/// Everything needed to evaluate a boat's resistance at any speed.
///
/// Built by [`ResistanceModel::new`], which also finds the shape of the physical curve
/// (hand-over and continuation, [`CurveShape`]); a new hull, method or water goes through
/// [`ResistanceModel::with_hull`], [`ResistanceModel::with_method`] or
/// [`ResistanceModel::with_water`] so the shape follows.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ResistanceModel {
    /// The resolved hull.
    pub hull: HullForm,
    /// The calm-water method.
    pub method: ResistanceMethod,
    /// The water the boat floats in.
    pub water: WaterProperties,
    /// Air drag, or `None` to ignore it.
    pub air: Option<AirDrag>,
    /// Margins and calibration.
    pub margins: Margins,
    /// Where the method hands over and where the continuation starts, found once.
    #[serde(skip)]
    shape: CurveShape,
    /// The speed-independent parts of the in-range decision, found once with the shape.
    #[serde(skip)]
    validity: ValidityScale,
}

impl ResistanceTable {
    /// Checks that the table has at least two rows, finite non-negative values and strictly
    /// increasing speeds.
    pub fn validate(&self) -> Result<(), HullError> {
        if self.rows.len() < 2 {
            return Err(HullError::BadTable(format!(
                "needs at least two rows (speed, resistance), got {}",
                self.rows.len()
            )));
        }
        for (i, &(speed, resistance)) in self.rows.iter().enumerate() {
            if !(speed.is_finite() && speed >= 0.0 && resistance.is_finite() && resistance >= 0.0) {
                return Err(HullError::BadTable(format!(
                    "row {}: speed {speed} m/s and resistance {resistance} N must be finite and not negative",
                    i + 1
                )));
            }
        }
        if let Some(i) = self.rows.windows(2).position(|w| w[1].0 <= w[0].0) {
            return Err(HullError::BadTable(format!(
                "speeds must increase strictly from row to row; row {} ({} m/s) is not above row {} ({} m/s)",
                i + 2,
                self.rows[i + 1].0,
                i + 1,
                self.rows[i].0
            )));
        }
        Ok(())
    }

    /// Resistance at `speed` m/s by linear interpolation, N; an error outside the table.
    pub fn interpolate(&self, speed: f64) -> Result<f64, HullError> {
        self.validate()?;
        let (min, max) = (self.rows[0].0, self.rows[self.rows.len() - 1].0);
        if !(min..=max).contains(&speed) {
            return Err(HullError::OutsideTable { speed, min, max });
        }
        // Rows are few (a tank test has 5–20), so a linear scan beats a binary search's setup.
        let upper = self
            .rows
            .iter()
            .position(|&(v, _)| v >= speed)
            .unwrap_or(self.rows.len() - 1);
        if upper == 0 {
            return Ok(self.rows[0].1);
        }
        let (v0, r0) = self.rows[upper - 1];
        let (v1, r1) = self.rows[upper];
        Ok(r0 + (r1 - r0) * (speed - v0) / (v1 - v0))
    }
}

impl AirDrag {
    /// Air drag ½·ρair·Cd·A·(V + headwind)·|V + headwind| at boat speed `speed` m/s, N.
    ///
    /// The signed square lets a following wind stronger than the boat push it along.
    pub fn force(&self, speed: f64) -> f64 {
        let relative = speed + self.headwind;
        0.5 * self.air_density
            * self.drag_coefficient
            * self.frontal_area
            * relative
            * relative.abs()
    }
}

impl ResistanceMethod {
    /// Short name of the method for display and for warning sources.
    pub fn name(&self) -> &'static str {
        match self {
            ResistanceMethod::HoltropMennen => "Holtrop-Mennen (1982/1984)",
            ResistanceMethod::VanOortmerssen => "van Oortmerssen (1971)",
            ResistanceMethod::Table(_) => "resistance table",
        }
    }

    /// The published Froude-number range of the method's data (dimensionless), `None` for a
    /// table (its own speed range applies).
    ///
    /// Holtrop–Mennen: 0 to 0.38, the limit Holtrop & Mennen (1982, table of limitations)
    /// give for trawlers, coasters and tugs, the ship type nearest a small motorboat (from
    /// memory). Van Oortmerssen (1971): 0 to 0.50.
    pub fn froude_range(&self) -> Option<(f64, f64)> {
        match self {
            ResistanceMethod::HoltropMennen => Some((0.0, holtrop::SMALL_SHIP_FROUDE_MAX)),
            ResistanceMethod::VanOortmerssen => Some((0.0, oortmerssen::FROUDE_MAX)),
            ResistanceMethod::Table(_) => None,
        }
    }
}

/// The Holtrop edition a [`ResistanceMethod::HoltropMennen`] model evaluates.
pub const HOLTROP_EDITION: Edition = Edition::Revised1984;

/// One knot, m/s (1852 m per hour, by definition).
const KNOT: f64 = 1852.0 / 3600.0;
/// One foot, m (international foot, by definition).
const FOOT: f64 = 0.3048;
/// One long ton, kg (2240 lb × 0.45359237 kg, by definition).
const LONG_TON: f64 = 2240.0 * 0.453_592_37;

/// The words for a prediction the core marks unreliable where its cause is not at hand (a
/// table of candidates carries only the flag): every front end uses them.
pub const UNRELIABLE_WORDS: &str =
    "past the resistance method's range or the displacement-hull speed/length limit";

/// Where one speed lies against the resistance method's range and the displacement regime:
/// the single in-range decision every front end reads.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct SpeedValidity {
    /// Length Froude number V/√(g·LWL) at the speed (dimensionless).
    pub froude: f64,
    /// The method's Froude range (low, high), dimensionless; `None` if it states none.
    pub froude_range: Option<(f64, f64)>,
    /// Speed/length ratio V/√LWL in kn/√ft (dimensionless by convention).
    pub speed_length_ratio: f64,
    /// Common-practice speed/length limit of a displacement hull of this displacement-length
    /// ratio, kn/√ft; `None` for a resistance table (measured data over its own speeds).
    pub speed_length_limit: Option<f64>,
    /// Whether the Froude number is inside the method's range.
    pub froude_in_range: bool,
    /// Whether the speed/length ratio is at or below the limit (true without a limit).
    pub speed_length_in_range: bool,
    /// Which formula gives the resistance at this speed (the method, a hand-over, Holtrop
    /// 1984 past the method, or the power-law continuation).
    pub regime: Regime,
    /// That formula in a few words ("van Oortmerssen", "power-law continuation", …).
    pub regime_words: &'static str,
    /// Exponent n of the continuation R ∝ Vⁿ when `regime` is the continuation (dimensionless).
    pub continuation_exponent: Option<f64>,
    /// Froude number on volume V/√(g·∇^⅓) at the speed (dimensionless).
    pub froude_volume: f64,
    /// All three: the prediction at this speed comes from the method itself, within its
    /// range and the displacement regime.
    pub in_method_range: bool,
}

/// What [`SpeedValidity`] needs of a model that does not change with speed
/// ([`ResistanceModel::validity_scale`]).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct ValidityScale {
    /// The method's Froude range (low, high), dimensionless; `None` if it states none.
    froude_range: Option<(f64, f64)>,
    /// √(LWL in feet).
    length_root: f64,
    /// Speed/length limit of the displacement regime, kn/√ft; `None` for a table.
    speed_length_limit: Option<f64>,
    /// √(g·∇^⅓), m/s.
    volume_root: f64,
}

impl SpeedValidity {
    /// Why the prediction is unreliable here, as a clause for a sentence ("speed/length ratio
    /// 1.50 is past the displacement-hull limit 1.47; …"), or `None` when it is in range: the
    /// causes in [`SpeedValidity::causes`]'s words, then what gives the resistance there.
    pub fn reason(&self) -> Option<String> {
        if self.in_method_range {
            return None;
        }
        let mut parts = self.causes();
        parts.extend(self.regime_phrase());
        Some(parts.join("; "))
    }

    /// Why the prediction is unreliable here, in a few words for a table row, a screen's strip
    /// or a chart ("speed/length ratio 1.50 is past the displacement-hull limit 1.47; power-law
    /// continuation"), or `None` when it is in range: the same causes as [`SpeedValidity::reason`].
    pub fn label(&self) -> Option<String> {
        if self.in_method_range {
            return None;
        }
        Some(self.with_regime(self.causes(), "; "))
    }

    /// `parts` with the regime's phrase when it is an extrapolation (the plain unreliable
    /// words when nothing else is said), joined by `separator`.
    fn with_regime(&self, mut parts: Vec<String>, separator: &str) -> String {
        if self.regime.is_extrapolation() {
            parts.push(self.regime.phrase().to_owned());
        }
        if parts.is_empty() {
            parts.push(UNRELIABLE_WORDS.to_owned());
        }
        parts.join(separator)
    }

    /// [`SpeedValidity::label`] in as few characters as a one-line screen strip affords
    /// ("S/L 1.50 > 1.47": the speed/length ratio past its limit; "Fn 0.56 > 0.38, power-law
    /// continuation": the Froude number past the method's range),
    /// or `None` when it is in range.
    pub fn brief(&self) -> Option<String> {
        if self.in_method_range {
            return None;
        }
        let mut parts = Vec::new();
        match (self.froude_in_range, self.froude_range) {
            (false, Some((_, high))) if self.froude > high => {
                parts.push(format!("Fn {:.2} > {high:.2}", self.froude));
            }
            (false, Some((low, high))) => {
                parts.push(format!("Fn {:.2} outside {low:.2}–{high:.2}", self.froude))
            }
            _ => {}
        }
        if let (false, Some(limit)) = (self.speed_length_in_range, self.speed_length_limit) {
            parts.push(format!("S/L {:.2} > {limit:.2}", self.speed_length_ratio));
        }
        Some(self.with_regime(parts, ", "))
    }

    /// Each cause that takes this speed out of the method's validity, as a clause: the
    /// method's Froude range, the displacement-hull speed/length limit. Empty when the only
    /// cause is the regime (or none).
    pub fn causes(&self) -> Vec<String> {
        let mut parts = Vec::new();
        if !self.froude_in_range {
            match self.froude_range {
                Some((_, high)) if self.froude > high => parts.push(format!(
                    "Fn {:.2} is past the method's Froude range (to {high:.2})",
                    self.froude
                )),
                Some((low, high)) => parts.push(format!(
                    "Fn {:.2} is outside the method's Froude range {low:.2}–{high:.2}",
                    self.froude
                )),
                None => {}
            }
        }
        if let (false, Some(limit)) = (self.speed_length_in_range, self.speed_length_limit) {
            parts.push(format!(
                "speed/length ratio {:.2} is past the displacement-hull limit {limit:.2}",
                self.speed_length_ratio
            ));
        }
        parts
    }

    /// What gives the resistance here when it is not the method itself, as a phrase
    /// ("resistance continued as R ∝ V^2.4, an extrapolation"); `None` for the method.
    pub fn regime_phrase(&self) -> Option<String> {
        match self.regime {
            Regime::Method => None,
            Regime::Bridge => Some(
                "the method's curve hollows here and is carried across by a rising power law"
                    .to_owned(),
            ),
            Regime::HandOver => Some(format!(
                "resistance handed over to Holtrop (1984) between Fn {:.2} and {:.2}",
                regime::HAND_OVER_START,
                regime::HAND_OVER_START + regime::HAND_OVER_WIDTH
            )),
            Regime::Holtrop1984 => Some(format!(
                "resistance from Holtrop (1984)'s high-speed branch (published to Fn {:.1})",
                regime::HOLTROP_1984_FROUDE_MAX
            )),
            Regime::Continuation => Some(format!(
                "resistance continued as R ∝ V^{:.1} past the methods' reach, an extrapolation",
                self.continuation_exponent
                    .unwrap_or(regime::MIN_CONTINUATION_EXPONENT)
            )),
        }
    }
}

/// Displacement-length ratio D/L = Δ[long tons]/(0.01·LWL[ft])³ of a hull of `displacement_mass`
/// kg on a waterline of `length_waterline` m (dimensionless by convention; common practice).
pub fn displacement_length_ratio(displacement_mass: f64, length_waterline: f64) -> f64 {
    (displacement_mass / LONG_TON) / (0.01 * length_waterline / FOOT).powi(3)
}

/// The highest speed/length ratio V[kn]/√LWL[ft] a displacement hull of displacement-length
/// ratio `displacement_length` reaches before it leaves the displacement regime:
/// 8.26/(D/L)^0.311 (common practice; the powering rule of thumb for displacement motorboats).
pub fn speed_length_limit(displacement_length: f64) -> f64 {
    8.26 / displacement_length.powf(0.311)
}

impl ResistanceModel {
    /// The model of `hull` by `method` in `water`, with `air` drag and `margins`.
    pub fn new(
        hull: HullForm,
        method: ResistanceMethod,
        water: WaterProperties,
        air: Option<AirDrag>,
        margins: Margins,
    ) -> Self {
        let shape = CurveShape::new(&hull, &method, &water);
        let mut model = Self {
            hull,
            method,
            water,
            air,
            margins,
            shape,
            validity: ValidityScale::default(),
        };
        model.validity = model.find_validity_scale();
        model
    }

    /// The same model on another hull (a new load, say); the curve's shape is found anew.
    pub fn with_hull(self, hull: HullForm) -> Self {
        Self::new(hull, self.method, self.water, self.air, self.margins)
    }

    /// The same model by another method; the curve's shape is found anew.
    pub fn with_method(self, method: ResistanceMethod) -> Self {
        Self::new(self.hull, method, self.water, self.air, self.margins)
    }

    /// The same model in other water; the curve's shape is found anew.
    pub fn with_water(self, water: WaterProperties) -> Self {
        Self::new(self.hull, self.method, water, self.air, self.margins)
    }

    /// The shape of the physical curve: hand-over window and continuation.
    pub fn shape(&self) -> &CurveShape {
        &self.shape
    }

    /// The same model for a calm sea and a clean hull: service margin and fouling at zero, the
    /// sea-trial factor kept. A trial is fitted and compared on this model; the margins are
    /// allowances that go on top of it for predictions.
    pub fn calm_water(&self) -> ResistanceModel {
        let mut calm = self.clone();
        calm.margins.service = 0.0;
        calm.margins.fouling = 0.0;
        calm
    }

    /// The Froude range (low, high) in which the method's prediction is published as valid
    /// (dimensionless); `None` when the method states none. A table covers its own speeds.
    pub fn froude_range(&self) -> Option<(f64, f64)> {
        match &self.method {
            ResistanceMethod::Table(table) => {
                let first = table.rows.first()?.0;
                let last = table.rows.last()?.0;
                Some((
                    self.hull.froude_number(first),
                    self.hull.froude_number(last),
                ))
            }
            method => method.froude_range(),
        }
    }

    /// Where `speed` (m/s) lies against the method's Froude range and the common-practice
    /// speed/length limit of a displacement hull: the one in-range decision of the core.
    ///
    /// A table is measured data, so only its own speed range counts; a regression also has to
    /// stay inside the displacement regime (speed/length limit for the hull's D/L ratio).
    pub fn validity_at(&self, speed: f64) -> SpeedValidity {
        self.validity_with(&self.validity, speed)
    }

    /// The speed-independent parts of [`ResistanceModel::validity_at`] (found with the model),
    /// for asking it at many speeds ([`ResistanceModel::validity_with`]).
    pub fn validity_scale(&self) -> ValidityScale {
        self.validity
    }

    fn find_validity_scale(&self) -> ValidityScale {
        let length = self.hull.input.length_waterline;
        // Every regression method stays inside the displacement regime; a table does not need to.
        let speed_length_limit = (!matches!(self.method, ResistanceMethod::Table(_))).then(|| {
            let mass = self.water.density * self.hull.input.displacement_volume;
            speed_length_limit(displacement_length_ratio(mass, length))
        });
        let volume_length = self.hull.input.displacement_volume.max(0.0).cbrt();
        ValidityScale {
            froude_range: self.froude_range(),
            length_root: (length / FOOT).sqrt(),
            speed_length_limit,
            volume_root: (STANDARD_GRAVITY * volume_length).sqrt(),
        }
    }

    /// [`ResistanceModel::validity_at`] with its speed-independent parts from `scale`, which
    /// must come from this model's [`ResistanceModel::validity_scale`].
    // Inlined so that a caller that reads a few of the fields computes only those.
    #[inline(always)]
    pub fn validity_with(&self, scale: &ValidityScale, speed: f64) -> SpeedValidity {
        let froude = self.hull.froude_number(speed);
        let froude_range = scale.froude_range;
        // A small tolerance keeps a table's own end speeds inside despite rounding.
        let froude_in_range =
            froude_range.is_none_or(|(low, high)| froude >= low - 1e-9 && froude <= high + 1e-9);
        let speed_length_ratio = (speed / KNOT) / scale.length_root;
        let speed_length_limit = scale.speed_length_limit;
        let speed_length_in_range =
            speed_length_limit.is_none_or(|limit| speed_length_ratio <= limit);
        let regime = self.shape.regime_at(&self.hull, speed);
        SpeedValidity {
            froude,
            froude_range,
            speed_length_ratio,
            speed_length_limit,
            froude_in_range,
            speed_length_in_range,
            regime,
            regime_words: regime.words(&self.method),
            continuation_exponent: (regime == Regime::Continuation)
                .then_some(self.shape.continuation_exponent),
            froude_volume: speed / scale.volume_root,
            in_method_range: froude.is_finite()
                && froude_in_range
                && speed_length_in_range
                && !regime.is_extrapolation(),
        }
    }

    /// Total resistance and its components at `speed` (m/s); 0 m/s gives all zeros.
    ///
    /// The components always sum to `total`: friction·form_factor + appendages + wave + bulb +
    /// transom + correlation + air + margin. The calibration factor `resistance_factor`
    /// multiplies the calm-water components (not air); `margin` then holds fouling (fouling ×
    /// calibrated friction) and the service margin (service × (calibrated calm water + air)).
    /// For a table, `friction` is the ITTC-1957 friction
    /// of the resolved wetted surface (form factor 1) and `wave` the rest of the table's value
    /// (the residuary resistance). The calm water follows the physical curve of
    /// [`CurveShape`]: past the method's reach the hand-over and the continuation, where
    /// `wave` holds all but the viscous parts. No allocation.
    // Inlined with the formulas under it (five callers): the components then stay in
    // registers instead of being copied up through each call (docs/performance.md).
    #[inline(always)]
    pub fn resistance(&self, speed: f64) -> Result<ResistanceComponents, HullError> {
        if !speed.is_finite() || speed < 0.0 {
            return Err(HullError::InvalidSpeed(speed));
        }
        if speed == 0.0 {
            let form_factor = match self.method {
                ResistanceMethod::HoltropMennen => self.hull.holtrop_coefficients().form_factor,
                ResistanceMethod::VanOortmerssen | ResistanceMethod::Table(_) => 1.0,
            };
            return Ok(ResistanceComponents {
                form_factor,
                ..Default::default()
            });
        }
        let mut parts = self
            .shape
            .components(&self.hull, &self.method, &self.water, speed)?;
        // The sea-trial factor calibrates the calm, clean-hull water resistance only; air drag
        // is computed from the windage, and fouling and the service margin go on top of the
        // calibrated resistance, so a factor fitted on a calm clean model (trial.rs) is never
        // multiplied by the margins twice.
        let factor = self.margins.factor_at(self.hull.froude_number(speed));
        for force in [
            &mut parts.friction,
            &mut parts.appendages,
            &mut parts.wave,
            &mut parts.bulb,
            &mut parts.transom,
            &mut parts.correlation,
        ] {
            *force *= factor;
        }
        let calm_water = regime::calm_total(&parts);
        parts.air = self.air.map_or(0.0, |air| air.force(speed));
        parts.margin =
            self.margins.fouling * parts.friction + self.margins.service * (calm_water + parts.air);
        parts.total = calm_water + parts.air + parts.margin;
        Ok(parts)
    }

    /// Warnings for this model: hull outside the method's published parameter ranges, etc.
    pub fn warnings(&self) -> Vec<Warning> {
        let mut warnings = self.hull.warnings.clone();
        match &self.method {
            ResistanceMethod::HoltropMennen => {
                warnings.extend(holtrop::validity_warnings(&self.hull, HOLTROP_EDITION));
            }
            ResistanceMethod::VanOortmerssen => {
                warnings.extend(oortmerssen::validity_warnings(&self.hull));
            }
            ResistanceMethod::Table(table) => {
                if let Err(e) = table.validate() {
                    warnings.push(Warning::about(
                        Subject::ResistanceTable,
                        SOURCE,
                        e.to_string(),
                    ));
                }
            }
        }
        let m = &self.margins;
        if !(m.resistance_factor.is_finite() && (0.5..=2.0).contains(&m.resistance_factor)) {
            warnings.push(Warning::about(
                Subject::Trial,
                SOURCE,
                format!(
                    "resistance calibration factor {} is far from 1 (0.5–2 expected): check the sea-trial fit",
                    m.resistance_factor
                ),
            ));
        }
        if !(0.0..=1.0).contains(&m.service) || !(0.0..=2.0).contains(&m.fouling) {
            warnings.push(Warning::about(
                Subject::Margins,
                SOURCE,
                format!(
                    "margins service {:.0} % / fouling {:.0} % are unusual (0–100 % / 0–200 %)",
                    m.service * 100.0,
                    m.fouling * 100.0
                ),
            ));
        }
        warnings
    }

    /// Speed-dependent warnings, e.g. a Froude number past the method's range, at `speed` m/s.
    pub fn warnings_at(&self, speed: f64) -> Vec<Warning> {
        let mut warnings = Vec::new();
        match &self.method {
            ResistanceMethod::HoltropMennen => {
                let fn_l = self.hull.froude_number(speed);
                warnings.extend(holtrop::froude_warning(fn_l, HOLTROP_EDITION));
            }
            ResistanceMethod::VanOortmerssen => {
                warnings.extend(oortmerssen::froude_warning(self.hull.froude_number(speed)));
            }
            ResistanceMethod::Table(table) => match table.interpolate(speed) {
                Err(HullError::OutsideTable { .. }) => warnings.push(Warning::about(
                    Subject::ResistanceTable,
                    SOURCE,
                    format!(
                        "{} is outside the resistance table's speeds; the resistance there is continued as R ∝ V^{:.1}, an extrapolation",
                        crate::propulsion::speed_words(speed),
                        if speed > table.rows[table.rows.len() - 1].0 {
                            self.shape.continuation_exponent
                        } else {
                            2.0
                        }
                    ),
                )),
                Err(e) => warnings.push(Warning::about(
                    Subject::ResistanceTable,
                    SOURCE,
                    e.to_string(),
                )),
                Ok(tabulated) => {
                    let friction = regime::ittc_friction(&self.hull, &self.water, speed);
                    if speed > 0.0 && tabulated < friction {
                        warnings.push(Warning::about(
                            Subject::ResistanceTable,
                            SOURCE,
                            format!(
                                "table resistance {tabulated:.0} N at {speed:.2} m/s is below the flat-plate friction \
                                 {friction:.0} N of the wetted surface: check the table's units"
                            ),
                        ));
                    }
                }
            },
        }
        warnings
    }
}

const SOURCE: &str = "resistance";

#[cfg(test)]
mod tests {
    use super::*;

    /// A speed's validity with the given causes (the numbers are the demo's marram at full
    /// throttle: Fn 0.45 inside van Oortmerssen's range to 0.50, speed/length 1.50 past 1.47).
    fn validity(froude: f64, speed_length_ratio: f64, regime: Regime) -> SpeedValidity {
        let froude_range = Some((0.0, 0.50));
        let speed_length_limit = Some(1.47);
        let froude_in_range = froude <= 0.50;
        let speed_length_in_range = speed_length_ratio <= 1.47;
        SpeedValidity {
            froude,
            froude_range,
            speed_length_ratio,
            speed_length_limit,
            froude_in_range,
            speed_length_in_range,
            regime,
            regime_words: "",
            continuation_exponent: None,
            froude_volume: 0.0,
            in_method_range: froude_in_range && speed_length_in_range && !regime.is_extrapolation(),
        }
    }

    #[test]
    fn the_words_name_the_cause_that_holds_and_only_it() {
        let by_length = validity(0.45, 1.50, Regime::Method);
        for words in [by_length.label(), by_length.reason(), by_length.brief()] {
            let words = words.unwrap();
            assert!(words.contains("1.50") && words.contains("1.47"), "{words}");
            assert!(
                !words.contains("Fn") && !words.contains("Froude"),
                "{words}"
            );
        }
        assert_eq!(
            by_length.label().unwrap(),
            "speed/length ratio 1.50 is past the displacement-hull limit 1.47"
        );
        let by_froude = validity(0.55, 1.40, Regime::Method);
        let label = by_froude.label().unwrap();
        assert_eq!(label, "Fn 0.55 is past the method's Froude range (to 0.50)");
        assert!(by_froude.reason().unwrap().starts_with(&label));
        assert_eq!(by_froude.brief().unwrap(), "Fn 0.55 > 0.50");
        let both = validity(0.60, 1.90, Regime::Continuation);
        let label = both.label().unwrap();
        assert!(
            label.contains("Froude range")
                && label.contains("speed/length")
                && label.ends_with("power-law continuation"),
            "{label}"
        );
        let inside = validity(0.30, 1.00, Regime::Method);
        assert_eq!(
            (inside.label(), inside.reason(), inside.brief()),
            (None, None, None)
        );
    }

    #[test]
    fn table_interpolates_between_rows() {
        let table = ResistanceTable {
            rows: vec![(0.0, 0.0), (2.0, 1000.0), (4.0, 5000.0)],
        };
        assert_eq!(table.interpolate(3.0).unwrap(), 3000.0);
        assert_eq!(table.interpolate(0.0).unwrap(), 0.0);
        assert!(table.interpolate(4.1).is_err());
        let bad = ResistanceTable {
            rows: vec![(0.0, 0.0), (2.0, f64::NAN)],
        };
        assert!(matches!(bad.validate(), Err(HullError::BadTable(_))));
    }

    #[test]
    fn tailwind_faster_than_the_boat_pushes() {
        let air = AirDrag {
            air_density: 1.2,
            drag_coefficient: 1.0,
            frontal_area: 2.0,
            headwind: -3.0,
        };
        assert!(air.force(1.0) < 0.0);
        assert_eq!(air.force(3.0), 0.0);
        assert!((air.force(5.0) - 0.5 * 1.2 * 2.0 * 4.0).abs() < 1e-12);
    }
}
