//! Integration tests: water.

use tidewright::propulsion::water::{
    STANDARD_ATMOSPHERE, WaterError, WaterKind, air_density, fresh_water_density, water_properties,
};

fn rel(got: f64, want: f64) -> f64 {
    (got - want).abs() / want.abs()
}

#[test]
fn ittc_table_values_at_15_c() {
    // ITTC Recommended Procedure 7.5-02-01-03 (2011), 15 °C: density within 0.01 %,
    // kinematic viscosity within 0.1 %.
    let fresh = water_properties(WaterKind::Fresh, 15.0).unwrap();
    assert_close!(fresh.density, 999.1026, 1e-4);
    assert_close!(fresh.kinematic_viscosity, 1.1386e-6, 1e-3);
    let sea = water_properties(WaterKind::Sea, 15.0).unwrap();
    assert_close!(sea.density, 1026.021, 1e-4);
    assert_close!(sea.kinematic_viscosity, 1.1892e-6, 1e-3);
}

#[test]
fn fresh_water_density_maximum_near_4_c() {
    // Tanaka et al. (2001): the density maximum of water lies at 3.98 °C, 999.975 kg/m³.
    let at_max = fresh_water_density(3.983035);
    assert_close!(at_max, 999.97495, 1e-9);
    assert!(fresh_water_density(2.0) < at_max && fresh_water_density(6.0) < at_max);
}

#[test]
fn sea_water_density_agrees_with_teos10() {
    // TEOS-10 via the gsw crate: standard sea water of practical salinity 35 has absolute
    // salinity 35.16504 g/kg; at sea pressure 0 dbar in-situ and potential temperature agree.
    const ABSOLUTE_SALINITY: f64 = 35.16504;
    for t in [2.0, 10.0, 15.0, 20.0, 30.0, 38.0] {
        let ct = gsw::conversions::ct_from_pt(ABSOLUTE_SALINITY, t).unwrap();
        let teos10 = gsw::volume::rho(ABSOLUTE_SALINITY, ct, 0.0).unwrap();
        let ours = water_properties(WaterKind::Sea, t).unwrap().density;
        // EOS-80 and TEOS-10 agree to a few ppm here; 0.002 % leaves room for neither more.
        assert!(
            rel(ours, teos10) < 2e-5,
            "{t} °C: {ours} vs TEOS-10 {teos10}"
        );
    }
}

#[test]
fn viscosity_falls_and_sea_water_is_more_viscous() {
    let mut previous = f64::INFINITY;
    for t in [0.0, 10.0, 20.0, 30.0, 40.0] {
        let fresh = water_properties(WaterKind::Fresh, t).unwrap();
        let sea = water_properties(WaterKind::Sea, t).unwrap();
        assert!(fresh.kinematic_viscosity < previous);
        assert!(sea.kinematic_viscosity > fresh.kinematic_viscosity);
        assert!(sea.density > fresh.density);
        assert!(sea.vapour_pressure < fresh.vapour_pressure);
        previous = fresh.kinematic_viscosity;
    }
}

#[test]
fn vapour_pressure_at_20_c() {
    // IAPWS-IF97 saturation line; NIST Chemistry WebBook gives 2.3393 kPa at 20 °C (from memory).
    let p = water_properties(WaterKind::Fresh, 20.0)
        .unwrap()
        .vapour_pressure;
    assert_close!(p, 2339.3, 1e-3);
}

#[test]
fn temperature_outside_0_to_40_c_is_an_error() {
    for t in [-1.0, 40.5, f64::NAN, f64::INFINITY] {
        let err = water_properties(WaterKind::Fresh, t).unwrap_err();
        assert!(matches!(err, WaterError::TemperatureOutOfRange { .. }));
        assert!(err.to_string().contains("0–40 °C"));
    }
}

#[test]
fn air_density_ideal_gas() {
    // ISO 2533 standard atmosphere at sea level: 1.2250 kg/m³ at 15 °C and 101 325 Pa.
    assert_close!(air_density(15.0, STANDARD_ATMOSPHERE), 1.2250, 1e-4);
    // Ideal gas: density proportional to pressure over absolute temperature.
    assert_close!(
        air_density(30.0, 0.9 * STANDARD_ATMOSPHERE),
        1.2250 * 0.9 * 288.15 / 303.15,
        1e-4
    );
}

#[test]
fn fresh_water_at_other_temperatures() {
    // ITTC 7.5-02-01-03 (2011) fresh-water table, which tabulates Tanaka et al. (2001) density
    // and IAPWS-2008 viscosity; the figures at 10, 20 and 30 °C are from memory of that table
    // (they agree with the CRC Handbook's water table to the digits given).
    for (temperature_c, density, kinematic_viscosity) in [
        (10.0, 999.7026, 1.3063e-6),
        (20.0, 998.2067, 1.0034e-6),
        (30.0, 995.6488, 0.8008e-6),
    ] {
        let fresh = water_properties(WaterKind::Fresh, temperature_c).unwrap();
        assert_close!(fresh.density, density, 1e-4);
        assert_close!(fresh.kinematic_viscosity, kinematic_viscosity, 2e-3);
    }
}
