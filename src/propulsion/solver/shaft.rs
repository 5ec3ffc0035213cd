//! Shaft torque, the smallest solid shaft by plain torsion, and the engine duty note.
//!
//! Plain torsion of a solid round shaft: τ = 16·Q/(π·d³), so the smallest diameter that keeps
//! the torsional yield stress τy a factor SF away is d = (16·Q·SF/(π·τy))^(1/3). In US units
//! with Q from horsepower and rpm this is the familiar d = (321 000·SHP·SF/(St·rpm))^(1/3)
//! (Gerr, "Boat Mechanical Systems Handbook"; derivation in the Westlawn Institute's
//! *Masthead* no. 18, which gives SF 2 for light pleasure craft, 3 for average yachts, up to
//! 7.5 for inspected passenger vessels, keyway allowance included).

use crate::propulsion::engine::{Duty, EngineSheet};
use crate::propulsion::solver::Installation;
use crate::propulsion::{Subject, Warning};
use std::f64::consts::PI;
use thiserror::Error;

/// One pound-force per square inch, Pa (NIST SP 811 appendix B.8: 6.894 757 kPa).
const PSI: f64 = 6_894.757;

/// Safety factor for an average yacht in the plain-torsion formula (Westlawn *Masthead* no. 18).
pub const YACHT_SAFETY_FACTOR: f64 = 3.0;

/// Why a shaft calculation could not be made.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ShaftError {
    /// A value that must be positive and finite was not.
    #[error("{field} must be a positive finite number, got {value}")]
    NotPositive {
        /// The field's name.
        field: &'static str,
        /// The value given (SI).
        value: f64,
    },
    /// The engine sheet gives no torque (no full-load point above 0 rpm).
    #[error("the engine's full-load curve has no point above 0 rpm to take the torque from")]
    NoTorque,
    /// A material name that matches no built-in material, or more than one.
    #[error("shaft material {name:?} is not a known material; expected one of: {known}")]
    UnknownMaterial {
        /// The name given.
        name: String,
        /// The built-in names, comma-separated.
        known: String,
    },
}

/// A shaft material with its torsional (shear) yield strength.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ShaftMaterial {
    /// Generic name, e.g. "stainless 316".
    pub name: String,
    /// Yield strength in torsional shear, Pa.
    pub shear_yield: f64,
    /// Where the value comes from.
    pub source: &'static str,
}

/// Source of the table values used by [`ShaftMaterial::standard`]: the torsional yield values
/// printed beside the 321 000 formula (Gerr, *Boat Mechanical Systems Handbook*; the same
/// values appear in several small-craft shafting tables, from memory).
const SHAFT_TABLE: &str = "typical value: small-craft shafting table beside the 321 000 formula \
    (Gerr, Boat Mechanical Systems Handbook)";
/// Source of the values derived from tensile yield (typical tensile yields recalled, not read
/// from a standard: from memory).
const FROM_MEMORY: &str = "typical value: tensile yield × 0.577 (distortion-energy criterion)";

impl ShaftMaterial {
    /// A material with a user-given torsional yield strength (Pa).
    pub fn custom(name: impl Into<String>, shear_yield: f64) -> Result<Self, ShaftError> {
        if !(shear_yield.is_finite() && shear_yield > 0.0) {
            return Err(ShaftError::NotPositive {
                field: "shear yield strength",
                value: shear_yield,
            });
        }
        Ok(Self {
            name: name.into(),
            shear_yield,
            source: "given by the user",
        })
    }

    /// The built-in materials, generic names only.
    pub fn standard() -> Vec<ShaftMaterial> {
        let m = |name: &str, shear_yield: f64, source| ShaftMaterial {
            name: name.to_string(),
            shear_yield,
            source,
        };
        vec![
            // Torsional yield as tabled for shafting next to the 321 000 formula.
            m("bronze (naval-brass shafting)", 20_000.0 * PSI, SHAFT_TABLE),
            m("stainless 304", 20_000.0 * PSI, SHAFT_TABLE),
            m("nickel-copper alloy 400", 40_000.0 * PSI, SHAFT_TABLE),
            m("nickel-copper alloy K-500", 67_000.0 * PSI, SHAFT_TABLE),
            // From memory: annealed 316 bar yields at about 205 MPa in tension.
            m("stainless 316", 0.577 * 205.0e6, FROM_MEMORY),
            // From memory: 2205 duplex bar yields at about 450 MPa in tension.
            m("duplex stainless", 0.577 * 450.0e6, FROM_MEMORY),
            // From memory: cold-drawn medium-carbon steel (about 0.45 % C) yields near 530 MPa;
            // normalised near 310 MPa — the lower value is used.
            m("carbon steel", 0.577 * 310.0e6, FROM_MEMORY),
        ]
    }

    /// The built-in material a name means: an exact or unique leading match of the generic
    /// names, ignoring case, `-` and `_` ("stainless-316", "bronze").
    pub fn by_name(name: &str) -> Result<ShaftMaterial, ShaftError> {
        // Compared word by word without building the normal forms: the shortlist asks this of
        // every candidate.
        let all = Self::standard();
        if let Some(m) = all.iter().find(|m| normal(&m.name).eq(normal(name))) {
            return Ok(m.clone());
        }
        let leading = |m: &&ShaftMaterial| {
            let mut known = normal(&m.name);
            let mut wanted = normal(name).peekable();
            wanted.peek().is_some()
                && wanted.all(|c| known.next() == Some(c))
                && matches!(known.next(), Some(' ' | '('))
        };
        let mut matches = all.iter().filter(leading);
        match (matches.next(), matches.next()) {
            (Some(one), None) => Ok(one.clone()),
            _ => Err(ShaftError::UnknownMaterial {
                name: name.to_string(),
                known: all
                    .iter()
                    .map(|m| m.name.as_str())
                    .collect::<Vec<_>>()
                    .join(", "),
            }),
        }
    }
}

/// `name` lower-cased with `-` and `_` as spaces and its words single-spaced, as characters.
fn normal(name: &str) -> impl Iterator<Item = char> + '_ {
    name.split(|c: char| c.is_whitespace() || c == '-' || c == '_')
        .filter(|word| !word.is_empty())
        .enumerate()
        .flat_map(|(index, word)| {
            (index > 0)
                .then_some(' ')
                .into_iter()
                .chain(word.chars().map(|c| c.to_ascii_lowercase()))
        })
}

/// The shaft check for an engine, gear and material.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ShaftCheck {
    /// Largest full-load engine torque on the engine sheet, N·m.
    pub engine_torque: f64,
    /// Engine rpm at which that torque is given, rpm.
    pub engine_torque_rpm: f64,
    /// Torque on the shaft: engine torque × gear ratio × gear efficiency, N·m.
    pub shaft_torque: f64,
    /// The material used.
    pub material: ShaftMaterial,
    /// Safety factor on torsional yield.
    pub safety_factor: f64,
    /// Smallest solid shaft diameter, m.
    pub min_diameter: f64,
    /// The boat's existing shaft diameter, m, if given.
    pub existing_diameter: Option<f64>,
    /// Warnings, e.g. the existing shaft is smaller than the minimum.
    pub warnings: Vec<Warning>,
}

/// The largest full-load torque on the engine sheet and its rpm (N·m, rpm).
///
/// Power is linear between the sheet's points, so torque P/ω is monotone between them and its
/// maximum lies at a point of the sheet.
pub fn max_engine_torque(engine: &EngineSheet) -> Result<(f64, f64), ShaftError> {
    engine
        .full_load_power
        .points
        .iter()
        .filter(|(rpm, power)| *rpm > 0.0 && rpm.is_finite() && power.is_finite())
        .map(|&(rpm, power)| (power / (rpm * std::f64::consts::TAU / 60.0), rpm))
        .max_by(|a, b| a.0.total_cmp(&b.0))
        .filter(|(torque, _)| *torque > 0.0)
        .ok_or(ShaftError::NoTorque)
}

/// The smallest solid shaft diameter (m) for torque `shaft_torque` (N·m) by plain torsion.
pub fn min_shaft_diameter(
    shaft_torque: f64,
    shear_yield: f64,
    safety_factor: f64,
) -> Result<f64, ShaftError> {
    for (field, value) in [
        ("shaft torque", shaft_torque),
        ("shear yield strength", shear_yield),
        ("safety factor", safety_factor),
    ] {
        if !(value.is_finite() && value > 0.0) {
            return Err(ShaftError::NotPositive { field, value });
        }
    }
    Ok((16.0 * shaft_torque * safety_factor / (PI * shear_yield)).cbrt())
}

/// Checks the shaft: torque the engine and gear put on it, the smallest diameter for
/// `material` and `safety_factor`, and a warning when `existing_diameter` (m) is smaller.
///
/// The check is per shaft: each shaft carries the torque of its own engine through its own
/// gear, so on a twin-screw boat (same engine sheet and gear on both) it holds for each shaft
/// and the shaft count does not enter.
pub fn check_shaft(
    engine: &EngineSheet,
    installation: &Installation,
    material: &ShaftMaterial,
    safety_factor: f64,
    existing_diameter: Option<f64>,
) -> Result<ShaftCheck, ShaftError> {
    for (field, value) in [
        ("gear ratio", installation.gear_ratio),
        ("gear efficiency", installation.gear_efficiency),
    ] {
        if !(value.is_finite() && value > 0.0) {
            return Err(ShaftError::NotPositive { field, value });
        }
    }
    if let Some(d) = existing_diameter
        && !(d.is_finite() && d > 0.0)
    {
        return Err(ShaftError::NotPositive {
            field: "existing shaft diameter",
            value: d,
        });
    }
    let (engine_torque, engine_torque_rpm) = max_engine_torque(engine)?;
    let shaft_torque = engine_torque * installation.gear_ratio * installation.gear_efficiency;
    let min_diameter = min_shaft_diameter(shaft_torque, material.shear_yield, safety_factor)?;
    let mut warnings = Vec::new();
    if let Some(d) = existing_diameter
        && d < min_diameter
    {
        warnings.push(Warning::about(
            Subject::Shaft,
            "shaft",
            format!(
                "the existing shaft of {:.1} mm is smaller than the {:.1} mm that {} needs for {:.0} N·m with a safety factor of {:.1}",
                d * 1000.0,
                min_diameter * 1000.0,
                material.name,
                shaft_torque,
                safety_factor
            ),
        ));
    }
    Ok(ShaftCheck {
        engine_torque,
        engine_torque_rpm,
        shaft_torque,
        material: material.clone(),
        safety_factor,
        min_diameter,
        existing_diameter,
        warnings,
    })
}

/// A note on the engine's duty rating beside the load at `engine_rpm` and `brake_power` (W).
pub fn duty_note(engine: &EngineSheet, engine_rpm: f64, brake_power: f64) -> String {
    let full = engine.full_load_power_at(engine_rpm);
    if !(full.is_finite() && full > 0.0 && brake_power.is_finite() && brake_power >= 0.0) {
        return "load unknown: no full-load power at this rpm".to_string();
    }
    let load = brake_power / full * 100.0;
    let mut note = match engine.duty {
        Some(Duty::Continuous) => format!("{load:.0} % load; continuous duty rating"),
        Some(Duty::Intermittent) => {
            let limit = engine
                .full_throttle_limit
                .map(|s| format!(", full throttle limited to {:.0} min", s / 60.0))
                .unwrap_or_default();
            format!("{load:.0} % load; intermittent duty rating{limit}")
        }
        None => format!("{load:.0} % load; the engine sheet states no duty rating"),
    };
    if let Some(mcp) = engine.max_continuous_power
        && brake_power > mcp * (1.0 + 1e-9)
    {
        note.push_str(&format!(
            " — above the maximum continuous power of {:.1} kW: not for sustained running",
            mcp / 1000.0
        ));
    }
    note
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn plain_torsion_gives_back_the_stress() {
        // τ = 16·Q/(π·d³) (solid round shaft in torsion; any strength-of-materials text)
        let d = min_shaft_diameter(1500.0, 120e6, 3.0).unwrap();
        let stress = 16.0 * 1500.0 / (PI * d.powi(3));
        assert!((stress * 3.0 - 120e6).abs() / 120e6 < 1e-12);
    }

    #[test]
    fn us_formula_constant_is_321_000() {
        // Westlawn Masthead no. 18: d = (321 000·SHP·SF/(St·rpm))^(1/3), d in inches, St in psi.
        // 42 SHP at 2000 rpm, SF 3, St 20 000 psi → about one inch, by hand:
        // (321 000·42·3/(20 000·2000))^(1/3) = 1.0112^(1/3) = 1.004 in.
        let hp = 745.699_872; // W per mechanical horsepower (NIST SP 811 B.8)
        let torque = 42.0 * hp / (2000.0 * std::f64::consts::TAU / 60.0);
        let d = min_shaft_diameter(torque, 20_000.0 * PSI, 3.0).unwrap();
        let d_in = d / 0.0254;
        let formula = (321_000.0_f64 * 42.0 * 3.0 / (20_000.0 * 2000.0)).cbrt();
        assert!(
            (d_in - formula).abs() / formula < 1e-3,
            "{d_in} vs {formula}"
        );
        assert!((d_in - 1.0).abs() < 0.02);
    }

    #[test]
    fn rejects_non_positive_inputs() {
        assert!(matches!(
            min_shaft_diameter(1.0, 0.0, 3.0),
            Err(ShaftError::NotPositive {
                field: "shear yield strength",
                ..
            })
        ));
        assert!(ShaftMaterial::custom("x", f64::NAN).is_err());
    }

    #[test]
    fn standard_materials_are_found_by_name() {
        assert!(ShaftMaterial::by_name("Duplex Stainless").is_ok());
        assert!(ShaftMaterial::by_name("unobtainium").is_err());
        // Names as profiles write them: case, `-` and `_` do not matter; a unique start is enough.
        assert_eq!(
            ShaftMaterial::by_name("stainless-316").unwrap().name,
            "stainless 316"
        );
        assert_eq!(
            ShaftMaterial::by_name("Bronze").unwrap().name,
            "bronze (naval-brass shafting)"
        );
        assert_eq!(
            ShaftMaterial::by_name("nickel_copper alloy K-500")
                .unwrap()
                .name,
            "nickel-copper alloy K-500"
        );
        // "stainless" alone could be 304 or 316: refused, naming the choices.
        let err = ShaftMaterial::by_name("stainless").unwrap_err().to_string();
        assert!(
            err.contains("stainless 304") && err.contains("stainless 316"),
            "{err}"
        );
        assert!(ShaftMaterial::by_name("").is_err());
        assert!(ShaftMaterial::by_name(" - ").is_err());
        // Spaces around and between words do not matter; a start must end on a whole word.
        assert_eq!(
            ShaftMaterial::by_name("  Carbon   STEEL ").unwrap().name,
            "carbon steel"
        );
        assert!(ShaftMaterial::by_name("stainless 3").is_err());
        assert!(ShaftMaterial::by_name("nickel copper alloy").is_err());
        assert!(ShaftMaterial::by_name("carbon steel extra").is_err());
    }
}
