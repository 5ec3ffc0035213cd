//! Hull particulars as given by the user, and the resolved hull form with estimates flagged.

use super::HullError;
use super::holtrop::{Edition, HoltropCoefficients};
use crate::propulsion::{Resolved, STANDARD_GRAVITY, Subject, Warning};

/// Hull particulars as the user knows them; `None` means "estimate it". All SI.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct HullInput {
    /// Waterline length, m.
    pub length_waterline: f64,
    /// Waterline beam, m.
    pub beam_waterline: f64,
    /// Canoe-body draft at the aft perpendicular, m.
    pub draft_aft: f64,
    /// Canoe-body draft at the forward perpendicular, m.
    pub draft_forward: f64,
    /// Displacement volume, m³.
    pub displacement_volume: f64,
    /// Midship section coefficient Cm (dimensionless).
    pub midship_coefficient: Option<f64>,
    /// Waterplane area coefficient Cwp (dimensionless).
    pub waterplane_coefficient: Option<f64>,
    /// Longitudinal centre of buoyancy, fraction of L forward of ½L (negative = aft).
    pub lcb_fraction: Option<f64>,
    /// Wetted surface of the bare hull, m².
    pub wetted_surface: Option<f64>,
    /// Half angle of entrance of the waterline, degrees.
    pub half_entrance_angle_deg: Option<f64>,
    /// Immersed transom area at rest, m².
    pub transom_area: Option<f64>,
    /// Transverse bulb area at the forward perpendicular, m² (0 for no bulb).
    pub bulb_area: f64,
    /// Height of the bulb's centre above the keel, m.
    pub bulb_centre_height: f64,
    /// Holtrop's stern shape coefficient Cstern (−25 pram … 0 normal … +10 U-shaped).
    pub stern_coefficient: f64,
    /// Wetted area of appendages (rudder, shaft brackets, skeg), m².
    pub appendage_area: f64,
    /// Equivalent appendage form factor 1+k2 (dimensionless).
    pub appendage_form_factor: f64,
}

/// The hull with every coefficient resolved, each flagged given or estimated.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct HullForm {
    /// The user's particulars.
    pub input: HullInput,
    /// Mean draft, m.
    pub draft_mean: f64,
    /// Block coefficient Cb = ∇/(L·B·T).
    pub block_coefficient: f64,
    /// Midship section coefficient Cm.
    pub midship_coefficient: Resolved,
    /// Prismatic coefficient Cp = Cb/Cm.
    pub prismatic_coefficient: f64,
    /// Waterplane area coefficient Cwp.
    pub waterplane_coefficient: Resolved,
    /// LCB, fraction of L forward of ½L.
    pub lcb_fraction: Resolved,
    /// Bare-hull wetted surface, m².
    pub wetted_surface: Resolved,
    /// Half angle of entrance, degrees.
    pub half_entrance_angle_deg: Resolved,
    /// Immersed transom area, m².
    pub transom_area: Resolved,
    /// Warnings raised while resolving (values outside usual ranges).
    pub warnings: Vec<Warning>,
    /// The speed-independent Holtrop (1984) coefficients, computed once by `resolve` because
    /// every resistance and wake evaluation needs them.
    #[serde(skip)]
    holtrop: Option<HoltropCoefficients>,
}

/// Estimate of Cm from Cb: Cm = 1/(1 + (1 − Cb)^3.5) (HSVA, in Schneekluth & Bertram 1998).
pub const MIDSHIP_ESTIMATE: &str = "Cm = 1/(1+(1-Cb)^3.5) (HSVA, Schneekluth & Bertram 1998)";
/// Estimate of Cwp from Cb: Cwp = (1 + 2·Cb)/3 (Schneekluth & Bertram 1998, U-type sections).
pub const WATERPLANE_ESTIMATE: &str = "Cwp = (1+2Cb)/3 (Schneekluth & Bertram 1998)";
/// LCB when none is given: at ½L; no regression without a design speed is used.
pub const LCB_ASSUMPTION: &str = "assumed at 1/2 L (no LCB given)";
/// Wetted surface estimate of Holtrop & Mennen (1982).
pub const WETTED_SURFACE_ESTIMATE: &str = "Holtrop & Mennen (1982) wetted surface";
/// Half angle of entrance estimate of Holtrop (1984).
pub const ENTRANCE_ANGLE_ESTIMATE: &str = "Holtrop (1984) half angle of entrance";
/// Transom area when none is given: no immersed transom.
pub const TRANSOM_ASSUMPTION: &str = "assumed 0 (no transom area given)";

const SOURCE: &str = "hull particulars";

fn positive(field: &'static str, value: f64) -> Result<f64, HullError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(HullError::NotPositive { field, value })
    }
}

fn non_negative(field: &'static str, value: f64) -> Result<f64, HullError> {
    if value.is_finite() && value >= 0.0 {
        Ok(value)
    } else {
        Err(HullError::Negative { field, value })
    }
}

fn within(field: &'static str, value: f64, min: f64, max: f64) -> Result<f64, HullError> {
    if value.is_finite() && (min..=max).contains(&value) {
        Ok(value)
    } else {
        Err(HullError::OutOfRange {
            field,
            value,
            min,
            max,
        })
    }
}

impl HullInput {
    /// Validates the particulars and resolves the missing ones from published estimates.
    ///
    /// Errors name the first field that is not usable; warnings (kept in the result) name
    /// values that are possible but unusual for a displacement hull.
    pub fn resolve(&self) -> Result<HullForm, HullError> {
        let mut form = self.resolve_particulars()?;
        form.warnings = form.unusual_values();
        form.holtrop = Some(HoltropCoefficients::new(&form, Edition::Revised1984));
        Ok(form)
    }

    /// [`HullInput::resolve`]'s errors alone, for a file check that keeps no hull: the same
    /// first unusable field, without the warnings and the Holtrop coefficients.
    pub fn check(&self) -> Result<(), HullError> {
        self.resolve_particulars().map(drop)
    }

    /// The checked and estimated particulars of [`HullInput::resolve`], without its warnings
    /// and Holtrop coefficients.
    fn resolve_particulars(&self) -> Result<HullForm, HullError> {
        let length = positive("waterline length", self.length_waterline)?;
        let beam = positive("waterline beam", self.beam_waterline)?;
        let draft_aft = positive("draft aft", self.draft_aft)?;
        let draft_forward = positive("draft forward", self.draft_forward)?;
        let volume = positive("displacement volume", self.displacement_volume)?;
        let bulb_area = non_negative("bulb transverse area", self.bulb_area)?;
        let bulb_height = non_negative("bulb centre height", self.bulb_centre_height)?;
        if bulb_area > 0.0 {
            within("bulb centre height", bulb_height, 0.0, draft_forward)?;
        }
        within(
            "stern shape coefficient",
            self.stern_coefficient,
            -25.0,
            10.0,
        )?;
        let appendage_area = non_negative("appendage wetted area", self.appendage_area)?;
        if appendage_area > 0.0 {
            within(
                "appendage form factor 1+k2",
                self.appendage_form_factor,
                1.0,
                5.0,
            )?;
        }

        let draft_mean = 0.5 * (draft_aft + draft_forward);
        let block = within(
            "block coefficient ∇/(L·B·T)",
            volume / (length * beam * draft_mean),
            0.1,
            1.0,
        )?;

        let midship = match self.midship_coefficient {
            Some(cm) => Resolved::given(within("midship coefficient", cm, block.max(0.3), 1.0)?),
            None => Resolved::estimated(
                (1.0 / (1.0 + (1.0 - block).powf(3.5))).max(block),
                MIDSHIP_ESTIMATE,
            ),
        };
        let prismatic = block / midship.value;
        within("prismatic coefficient Cb/Cm", prismatic, 0.35, 0.98)?;

        let waterplane = match self.waterplane_coefficient {
            Some(cwp) => Resolved::given(within("waterplane coefficient", cwp, 0.3, 1.0)?),
            None => Resolved::estimated((1.0 + 2.0 * block) / 3.0, WATERPLANE_ESTIMATE),
        };
        let lcb = match self.lcb_fraction {
            Some(lcb) => Resolved::given(within("LCB (fraction of L from ½L)", lcb, -0.1, 0.1)?),
            None => Resolved::estimated(0.0, LCB_ASSUMPTION),
        };

        let mut form = HullForm {
            input: self.clone(),
            draft_mean,
            block_coefficient: block,
            midship_coefficient: midship,
            prismatic_coefficient: prismatic,
            waterplane_coefficient: waterplane,
            lcb_fraction: lcb,
            wetted_surface: Resolved::given(0.0),
            half_entrance_angle_deg: Resolved::given(0.0),
            transom_area: Resolved::given(0.0),
            warnings: Vec::new(),
            holtrop: None,
        };

        form.wetted_surface = match self.wetted_surface {
            Some(s) => Resolved::given(positive("wetted surface", s)?),
            None => Resolved::estimated(form.holtrop_wetted_surface(), WETTED_SURFACE_ESTIMATE),
        };
        form.half_entrance_angle_deg = match self.half_entrance_angle_deg {
            Some(ie) => Resolved::given(within("half angle of entrance (deg)", ie, 0.1, 89.0)?),
            None => Resolved::estimated(form.holtrop_entrance_angle_deg(), ENTRANCE_ANGLE_ESTIMATE),
        };
        form.transom_area = match self.transom_area {
            Some(a) => {
                let a = non_negative("transom area", a)?;
                Resolved::given(within("transom area", a, 0.0, beam * draft_aft)?)
            }
            None => Resolved::estimated(0.0, TRANSOM_ASSUMPTION),
        };
        Ok(form)
    }
}

impl HullForm {
    /// The speed-independent coefficients of Holtrop (1984) for this hull (cached by `resolve`).
    pub fn holtrop_coefficients(&self) -> HoltropCoefficients {
        self.holtrop
            .unwrap_or_else(|| HoltropCoefficients::new(self, Edition::Revised1984))
    }

    /// LCB in percent of L forward of ½L, the unit of Holtrop's formulas (%).
    pub fn lcb_percent(&self) -> f64 {
        100.0 * self.lcb_fraction.value
    }

    /// Froude number V/√(g·L) at `speed` m/s (dimensionless), on waterline length.
    pub fn froude_number(&self, speed: f64) -> f64 {
        speed / (STANDARD_GRAVITY * self.input.length_waterline).sqrt()
    }

    /// The speed at length Froude number `froude`, m/s (the inverse of `froude_number`).
    pub fn speed_at_froude(&self, froude: f64) -> f64 {
        froude * (STANDARD_GRAVITY * self.input.length_waterline.max(0.0)).sqrt()
    }

    /// Holtrop & Mennen (1982) length of run LR = L·(1 − Cp + 0.06·Cp·lcb/(4·Cp − 1)), m.
    ///
    /// Floored at 5 % of L: combinations of a far-aft LCB and a full Cp drive the regression
    /// negative, which has no meaning; `unusual_values` warns when the floor acts.
    pub fn length_of_run(&self) -> f64 {
        let cp = self.prismatic_coefficient;
        let raw = 1.0 - cp + 0.06 * cp * self.lcb_percent() / (4.0 * cp - 1.0);
        self.input.length_waterline * raw.max(LENGTH_OF_RUN_FLOOR)
    }

    /// Bare-hull wetted surface by Holtrop & Mennen (1982), m².
    ///
    /// S = L(2T + B)√Cm (0.453 + 0.4425 Cb − 0.2862 Cm − 0.003467 B/T + 0.3696 Cwp)
    ///     + 2.38 ABT/Cb.
    pub fn holtrop_wetted_surface(&self) -> f64 {
        let (l, b, t) = (
            self.input.length_waterline,
            self.input.beam_waterline,
            self.draft_mean,
        );
        let (cb, cm, cwp) = (
            self.block_coefficient,
            self.midship_coefficient.value,
            self.waterplane_coefficient.value,
        );
        l * (2.0 * t + b)
            * cm.sqrt()
            * (0.453 + 0.4425 * cb - 0.2862 * cm - 0.003467 * b / t + 0.3696 * cwp)
            + 2.38 * self.input.bulb_area / cb
    }

    /// Half angle of entrance by Holtrop (1984), degrees.
    ///
    /// iE = 1 + 89·exp{−(L/B)^0.80856 (1 − Cwp)^0.30484 (1 − Cp − 0.0225 lcb)^0.6367
    ///      (LR/B)^0.34574 (100∇/L³)^0.16302}.
    pub fn holtrop_entrance_angle_deg(&self) -> f64 {
        let (l, b) = (self.input.length_waterline, self.input.beam_waterline);
        let volume = self.input.displacement_volume;
        let cp = self.prismatic_coefficient;
        let exponent = (l / b).powf(0.80856)
            * (1.0 - self.waterplane_coefficient.value)
                .max(0.0)
                .powf(0.30484)
            * (1.0 - cp - 0.0225 * self.lcb_percent())
                .max(0.0)
                .powf(0.6367)
            * (self.length_of_run() / b).powf(0.34574)
            * (100.0 * volume / l.powi(3)).powf(0.16302);
        // A full waterplane (Cwp → 1) sends iE to 90°, where Holtrop's c1 is singular.
        (1.0 + 89.0 * (-exponent).exp()).min(89.0)
    }

    fn unusual_values(&self) -> Vec<Warning> {
        let mut warnings = Vec::new();
        let mut warn = |subject: Subject, message: String| {
            warnings.push(Warning::about(subject, SOURCE, message))
        };
        let (l, b) = (self.input.length_waterline, self.input.beam_waterline);
        let cb = self.block_coefficient;
        if !(0.35..=0.85).contains(&cb) {
            warn(
                Subject::BlockCoefficient,
                format!(
                    "block coefficient {cb:.3} is unusual for a displacement hull (0.35–0.85); check length, beam, draft and displacement"
                ),
            );
        }
        if !(2.0..=12.0).contains(&(l / b)) {
            warn(
                Subject::LengthBeamRatio,
                format!(
                    "L/B = {:.2} is unusual (2–12); check length and beam",
                    l / b
                ),
            );
        }
        let bt = b / self.draft_mean;
        if !(1.2..=6.0).contains(&bt) {
            warn(
                Subject::BeamDraftRatio,
                format!("B/T = {bt:.2} is unusual (1.2–6); check beam and draft"),
            );
        }
        let trim = (self.input.draft_aft - self.input.draft_forward).abs() / self.draft_mean;
        if trim > 0.5 {
            warn(
                Subject::Trim,
                format!(
                    "trim {:.0} % of mean draft is large; the methods assume a hull near even keel",
                    trim * 100.0
                ),
            );
        }
        if self.waterplane_coefficient.value < cb {
            warn(
                Subject::WaterplaneCoefficient,
                format!(
                    "waterplane coefficient {:.3} is below the block coefficient {cb:.3}, which is only possible for a hull wider below the waterline",
                    self.waterplane_coefficient.value
                ),
            );
        }
        if self.waterplane_coefficient.is_estimated() {
            warn(
                Subject::WaterplaneCoefficient,
                format!(
                    "waterplane coefficient not given: estimated {:.3} by (1+2Cb)/3, the weakest input — it runs well below \
                 the 0.70–0.78 usual for these hulls (common practice) and feeds the wetted-surface and entrance-angle \
                 estimates and the sinkage between loads; give hull.waterplane_coefficient",
                    self.waterplane_coefficient.value
                ),
            );
        }
        if self.lcb_fraction.is_estimated() {
            warn(
                Subject::Lcb,
                "LCB not given: assumed at ½L; form factor and entrance angle depend on it, give it if known"
                    .to_string(),
            );
        }
        let cp = self.prismatic_coefficient;
        let raw_run = 1.0 - cp + 0.06 * cp * self.lcb_percent() / (4.0 * cp - 1.0);
        if raw_run < LENGTH_OF_RUN_FLOOR {
            warn(
                Subject::PrismaticCoefficient,
                format!(
                    "Cp {cp:.3} with LCB {:.1} % gives no length of run in Holtrop's regression; 5 % of L used",
                    self.lcb_percent()
                ),
            );
        }
        warnings
    }
}

const LENGTH_OF_RUN_FLOOR: f64 = 0.05;

#[cfg(test)]
mod tests {
    use super::*;

    fn boat() -> HullInput {
        HullInput {
            length_waterline: 10.0,
            beam_waterline: 3.4,
            draft_aft: 0.9,
            draft_forward: 0.9,
            displacement_volume: 11.0,
            midship_coefficient: None,
            waterplane_coefficient: None,
            lcb_fraction: None,
            wetted_surface: None,
            half_entrance_angle_deg: None,
            transom_area: None,
            bulb_area: 0.0,
            bulb_centre_height: 0.0,
            stern_coefficient: 0.0,
            appendage_area: 0.0,
            appendage_form_factor: 0.0,
        }
    }

    #[test]
    fn missing_values_are_estimated_and_flagged() {
        let hull = boat().resolve().unwrap();
        let cb = 11.0 / (10.0 * 3.4 * 0.9);
        assert!((hull.block_coefficient - cb).abs() < 1e-12);
        // HSVA Cm estimate, by hand.
        let cm = 1.0 / (1.0 + (1.0f64 - cb).powf(3.5));
        assert!((hull.midship_coefficient.value - cm).abs() < 1e-12);
        assert_eq!(
            hull.midship_coefficient.estimated_by,
            Some(MIDSHIP_ESTIMATE)
        );
        assert_eq!(
            hull.transom_area,
            Resolved::estimated(0.0, TRANSOM_ASSUMPTION)
        );
        assert!(hull.lcb_fraction.is_estimated());
        assert!(
            hull.warnings
                .iter()
                .any(|w| w.message.contains("LCB not given"))
        );
        let ie = hull.half_entrance_angle_deg.value;
        assert!(ie > 5.0 && ie < 60.0, "iE {ie}");
    }

    #[test]
    fn impossible_particulars_are_refused_with_the_field_named() {
        let mut input = boat();
        input.displacement_volume = 40.0; // more than L·B·T
        let err = input.resolve().unwrap_err();
        assert!(err.to_string().contains("block coefficient"), "{err}");
        let mut input = boat();
        input.appendage_area = -1.0;
        assert_eq!(
            input.resolve().unwrap_err(),
            HullError::Negative {
                field: "appendage wetted area",
                value: -1.0
            }
        );
        let mut input = boat();
        input.draft_forward = f64::NAN;
        assert!(matches!(
            input.resolve(),
            Err(HullError::NotPositive {
                field: "draft forward",
                ..
            })
        ));
    }

    #[test]
    fn the_check_alone_finds_what_resolving_finds() {
        let changes: [fn(&mut HullInput); 7] = [
            |_| {},
            |h| h.displacement_volume = 40.0,
            |h| h.appendage_area = -1.0,
            |h| h.draft_forward = f64::NAN,
            |h| h.midship_coefficient = Some(1.5),
            |h| h.half_entrance_angle_deg = Some(95.0),
            |h| h.transom_area = Some(100.0),
        ];
        for change in changes {
            let mut input = boat();
            change(&mut input);
            // As messages: a NaN field is not equal to itself.
            let message = |r: Result<(), HullError>| r.map_err(|e| e.to_string());
            assert_eq!(
                message(input.check()),
                message(input.resolve().map(drop)),
                "{input:?}"
            );
        }
    }
}
