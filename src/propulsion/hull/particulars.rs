//! Hull particulars as given by the user, and the resolved hull form with estimates flagged.

use super::HullError;
use crate::propulsion::{Resolved, Warning};

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
}

impl HullInput {
    /// Validates the particulars and resolves the missing ones from published estimates.
    pub fn resolve(&self) -> Result<HullForm, HullError> {
        let _ = self;
        unimplemented!("hull helper")
    }
}
