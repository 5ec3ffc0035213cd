//! Water and air properties (ITTC Recommended Procedure 7.5-02-01-03).
//!
//! Fresh-water density: Tanaka et al. (2001), as adopted by ITTC 7.5-02-01-03 (2011).
//! Fresh-water viscosity: the Sharqawy, Lienhard & Zubair (2010) fit to IAPWS 2008 (±0.05 %).
//! Sea-water density: UNESCO (1981) EOS-80 at one atmosphere (Millero & Poisson 1981).
//! Sea-water viscosity: Sharqawy, Lienhard & Zubair (2010), eq. for μsw.
//! Vapour pressure: IAPWS-IF97 saturation line, lowered for sea water by Sharqawy et al. (2010).
//! Air: ideal gas law for dry air.

use thiserror::Error;

/// Which kind of water the boat floats in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum WaterKind {
    /// Fresh water (salinity 0).
    Fresh,
    /// Standard sea water (salinity 35 g/kg).
    Sea,
}

/// Physical properties of the water at one temperature.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct WaterProperties {
    /// Density, kg/m³.
    pub density: f64,
    /// Kinematic viscosity, m²/s.
    pub kinematic_viscosity: f64,
    /// Saturation vapour pressure, Pa.
    pub vapour_pressure: f64,
}

/// Why water properties could not be computed.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum WaterError {
    /// The temperature lies outside the procedure's tables.
    #[error("water temperature {temperature_c} °C is outside 0–40 °C covered by ITTC 7.5-02-01-03")]
    TemperatureOutOfRange {
        /// The temperature given, °C.
        temperature_c: f64,
    },
}

/// Standard atmospheric pressure at sea level, Pa (ISO 2533; NIST SP 811).
pub const STANDARD_ATMOSPHERE: f64 = 101_325.0;

/// Specific gas constant of dry air, J/(kg·K) (ISO 2533 standard atmosphere).
pub const DRY_AIR_GAS_CONSTANT: f64 = 287.052_87;

/// Salinity of standard sea water used by ITTC 7.5-02-01-03, kg/kg (35 g/kg).
pub const STANDARD_SEA_SALINITY: f64 = 0.035;

/// Practical salinity of standard sea water (PSS-78, dimensionless), for EOS-80 density.
pub const STANDARD_SEA_PRACTICAL_SALINITY: f64 = 35.0;

/// Lowest water temperature covered, °C.
pub const MIN_TEMPERATURE_C: f64 = 0.0;
/// Highest water temperature covered, °C.
pub const MAX_TEMPERATURE_C: f64 = 40.0;

const KELVIN_OFFSET: f64 = 273.15;

/// Density, kinematic viscosity and vapour pressure of `kind` water at `temperature_c` °C.
pub fn water_properties(
    kind: WaterKind,
    temperature_c: f64,
) -> Result<WaterProperties, WaterError> {
    if !(MIN_TEMPERATURE_C..=MAX_TEMPERATURE_C).contains(&temperature_c) {
        return Err(WaterError::TemperatureOutOfRange { temperature_c });
    }
    let t = temperature_c;
    let (density, dynamic_viscosity, vapour_pressure) = match kind {
        WaterKind::Fresh => (
            fresh_water_density(t),
            fresh_water_dynamic_viscosity(t),
            saturation_vapour_pressure(t),
        ),
        WaterKind::Sea => {
            let s = STANDARD_SEA_SALINITY;
            (
                sea_water_density(t, STANDARD_SEA_PRACTICAL_SALINITY),
                sea_water_dynamic_viscosity(t, s),
                sea_water_vapour_pressure(t, s),
            )
        }
    };
    Ok(WaterProperties {
        density,
        kinematic_viscosity: dynamic_viscosity / density,
        vapour_pressure,
    })
}

/// Density of dry air at `temperature_c` °C and `pressure_pa` Pa, kg/m³ (ideal gas).
pub fn air_density(temperature_c: f64, pressure_pa: f64) -> f64 {
    pressure_pa / (DRY_AIR_GAS_CONSTANT * (temperature_c + KELVIN_OFFSET))
}

/// Fresh-water density at `t` °C, kg/m³ (Tanaka et al. 2001, ITTC 7.5-02-01-03).
pub fn fresh_water_density(t: f64) -> f64 {
    const A1: f64 = -3.983_035; // °C
    const A2: f64 = 301.797; // °C
    const A3: f64 = 522_528.9; // °C²
    const A4: f64 = 69.348_81; // °C
    const A5: f64 = 999.974_950; // kg/m³
    A5 * (1.0 - (t + A1).powi(2) * (t + A2) / (A3 * (t + A4)))
}

/// Fresh-water dynamic viscosity at `t` °C, Pa·s (Sharqawy et al. 2010 fit to IAPWS 2008).
pub fn fresh_water_dynamic_viscosity(t: f64) -> f64 {
    4.2844e-5 + 1.0 / (0.157 * (t + 64.993).powi(2) - 91.296)
}

/// Sea-water density at `t` °C and practical salinity `salinity_psu`, kg/m³, at one atmosphere.
///
/// The UNESCO (1981) international equation of state EOS-80 at zero sea pressure
/// (Millero & Poisson 1981). It agrees with TEOS-10 within a few parts per million over
/// 0–40 °C for standard sea water, closer than the Sharqawy et al. (2010) density fit.
pub fn sea_water_density(t: f64, salinity_psu: f64) -> f64 {
    let s = salinity_psu;
    let pure = 999.842_594 + 6.793_952e-2 * t - 9.095_290e-3 * t.powi(2) + 1.001_685e-4 * t.powi(3)
        - 1.120_083e-6 * t.powi(4)
        + 6.536_332e-9 * t.powi(5);
    let a = 8.244_93e-1 - 4.089_9e-3 * t + 7.643_8e-5 * t.powi(2) - 8.246_7e-7 * t.powi(3)
        + 5.387_5e-9 * t.powi(4);
    let b = -5.724_66e-3 + 1.022_7e-4 * t - 1.654_6e-6 * t.powi(2);
    let c = 4.831_4e-4;
    pure + a * s + b * s * s.sqrt() + c * s * s
}

/// Sea-water dynamic viscosity at `t` °C and salinity `s` kg/kg, Pa·s (Sharqawy et al. 2010).
pub fn sea_water_dynamic_viscosity(t: f64, s: f64) -> f64 {
    let a = 1.541 + 1.998e-2 * t - 9.52e-5 * t * t;
    let b = 7.974 - 7.561e-2 * t + 4.724e-4 * t * t;
    fresh_water_dynamic_viscosity(t) * (1.0 + a * s + b * s * s)
}

/// Saturation vapour pressure of pure water at `t` °C, Pa (IAPWS-IF97 region 4).
pub fn saturation_vapour_pressure(t: f64) -> f64 {
    const N: [f64; 10] = [
        0.116_705_214_527_67e4,
        -0.724_213_166_984_83e6,
        -0.170_738_469_400_92e2,
        0.120_208_247_024_70e5,
        -0.323_255_503_223_33e7,
        0.149_151_086_135_30e2,
        -0.482_326_573_615_91e4,
        0.405_113_405_420_57e6,
        -0.238_555_575_678_49,
        0.650_175_348_447_98e3,
    ];
    let temperature_k = t + KELVIN_OFFSET;
    let theta = temperature_k + N[8] / (temperature_k - N[9]);
    let a = theta * theta + N[0] * theta + N[1];
    let b = N[2] * theta * theta + N[3] * theta + N[4];
    let c = N[5] * theta * theta + N[6] * theta + N[7];
    let p_mpa = (2.0 * c / (-b + (b * b - 4.0 * a * c).sqrt())).powi(4);
    p_mpa * 1.0e6
}

/// Vapour pressure of sea water of salinity `s` kg/kg at `t` °C, Pa (Sharqawy et al. 2010).
pub fn sea_water_vapour_pressure(t: f64, s: f64) -> f64 {
    let s_g_per_kg = s * 1000.0;
    saturation_vapour_pressure(t) / (1.0 + 0.57357 * s_g_per_kg / (1000.0 - s_g_per_kg))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn rel(got: f64, want: f64) -> f64 {
        (got - want).abs() / want.abs()
    }

    #[test]
    fn fresh_water_at_15_c_matches_ittc_table() {
        // ITTC 7.5-02-01-03 (2011), table at 15 °C: 999.1026 kg/m³, 1.1386e-6 m²/s.
        let w = water_properties(WaterKind::Fresh, 15.0).unwrap();
        assert!(rel(w.density, 999.1026) < 1e-4, "{}", w.density);
        assert!(
            rel(w.kinematic_viscosity, 1.1386e-6) < 1e-3,
            "{}",
            w.kinematic_viscosity
        );
    }

    #[test]
    fn vapour_pressure_matches_iapws_if97_check_value() {
        // IAPWS-IF97 (2007 revision), Table 35: T = 300 K → ps = 0.353658941e-2 MPa.
        let p = saturation_vapour_pressure(300.0 - KELVIN_OFFSET);
        assert!(rel(p, 3536.58941) < 1e-8, "{p}");
    }

    #[test]
    fn temperature_outside_tables_is_an_error() {
        assert!(water_properties(WaterKind::Sea, 41.0).is_err());
        assert!(water_properties(WaterKind::Fresh, -0.5).is_err());
        assert!(water_properties(WaterKind::Fresh, f64::NAN).is_err());
    }

    #[test]
    fn air_density_at_15_c_standard_atmosphere() {
        // ISO 2533 standard atmosphere at sea level: 1.2250 kg/m³ at 15 °C, 101 325 Pa.
        assert!(rel(air_density(15.0, STANDARD_ATMOSPHERE), 1.2250) < 1e-4);
    }
}
