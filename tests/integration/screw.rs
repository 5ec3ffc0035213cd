//! Integration tests: screw — B-series open water, Reynolds correction, cavitation checks.

use std::f64::consts::PI;
use tidewright::propulsion::screw::cavitation::{
    self, CavitationInput, KELLER_CONSTANT_SINGLE_SCREW, KELLER_CONSTANT_TWIN_SCREW,
    SMALL_CRAFT_BLADE_LOADING_LIMIT,
};
use tidewright::propulsion::screw::{
    BSeriesScrew, ScrewError, ScrewGeometry, ScrewModel, open_water_rows,
};

/// A B-series screw of unit diameter (the coefficients depend on Z, AE/A0 and P/D only).
fn b_series(blades: u32, area_ratio: f64, pitch_ratio: f64) -> BSeriesScrew {
    BSeriesScrew::new(ScrewGeometry {
        blades,
        diameter: 1.0,
        pitch: pitch_ratio,
        area_ratio,
    })
    .expect("valid geometry")
}

#[test]
fn torque_matches_kuiper_1992_chart_readings() {
    // Source: Kuiper, G. (1992), The Wageningen Propeller Series, MARIN publication 92-001,
    // open-water diagrams; readings in ../shared/reference/bseries-chart-readings.md.
    // Tolerance: the stated reading tolerance of 0.01 in 10·KQ, plus 0.002 for the width of the
    // printed curves and the interpolation by eye between the plotted P/D lines.
    let readings = [
        (2, 0.30, 1.4, 0.8, 0.47),
        (3, 0.65, 1.2, 0.7, 0.51),
        (3, 0.65, 0.8, 0.3, 0.31),
        (6, 0.65, 1.2, 0.8, 0.51),
        (6, 0.65, 1.4, 0.5, 0.99),
        (2, 0.30, 1.2, 1.0, 0.20),
    ];
    for (blades, area_ratio, pitch_ratio, j, ten_kq) in readings {
        let got = 10.0
            * b_series(blades, area_ratio, pitch_ratio)
                .coefficients(j, None)
                .torque_coefficient;
        assert!(
            (got - ten_kq).abs() <= 0.012,
            "B{blades}-{area_ratio} P/D {pitch_ratio} J {j}: 10KQ {got:.4} vs chart {ten_kq}"
        );
    }
}

#[test]
fn thrust_and_efficiency_near_the_open_water_diagrams() {
    // from memory: KT and η0 as read from the B-series open-water diagrams (Kuiper 1992;
    // Principles of Naval Architecture vol. II, 1988), recalled, not re-read from a copy.
    // Tolerances are those of recall: ±0.02 in KT, ±0.03 in η0.
    // (J, KT, η0) points; NaN where η0 is not defined.
    type Points = &'static [(f64, f64, f64)];
    let cases: [(u32, f64, f64, Points); 3] = [
        // B4-70, P/D 1.0: KT(0) ≈ 0.45, peak η0 ≈ 0.69 near J = 0.8.
        (
            4,
            0.70,
            1.0,
            &[(0.0, 0.45, f64::NAN), (0.4, 0.31, 0.41), (0.8, 0.13, 0.69)],
        ),
        // B3-50, P/D 0.8: KT(0) ≈ 0.32, peak η0 ≈ 0.66 near J = 0.6.
        (
            3,
            0.50,
            0.8,
            &[(0.0, 0.32, f64::NAN), (0.4, 0.20, 0.49), (0.6, 0.12, 0.66)],
        ),
        // B5-75, P/D 1.2: KT(0) ≈ 0.56, η0 ≈ 0.72 at J = 1.0.
        (
            5,
            0.75,
            1.2,
            &[(0.0, 0.56, f64::NAN), (0.6, 0.34, 0.51), (1.0, 0.14, 0.72)],
        ),
    ];
    for (blades, area_ratio, pitch_ratio, points) in cases {
        let screw = b_series(blades, area_ratio, pitch_ratio);
        for &(j, kt, eta0) in points {
            let point = screw.coefficients(j, None);
            let label = format!("B{blades}-{area_ratio} P/D {pitch_ratio} J {j}");
            assert!(
                (point.thrust_coefficient - kt).abs() <= 0.02,
                "{label}: KT {point:?}"
            );
            if eta0.is_finite() {
                let got = point.efficiency().expect("thrusting point");
                assert!((got - eta0).abs() <= 0.03, "{label}: η0 {got:.3} vs {eta0}");
            }
        }
    }
}

#[test]
fn efficiency_stays_below_the_actuator_disc_ideal() {
    // Rankine–Froude momentum theory (e.g. Principles of Naval Architecture vol. II, ch. 6):
    // no screw beats the ideal efficiency ηi = 2 / (1 + √(1 + CT)), CT = 8·KT / (π·J²).
    // Viscous and rotational losses keep the B-series at least a few points below it.
    for (blades, area_ratio, pitch_ratio) in [
        (2, 0.30, 0.6),
        (3, 0.50, 0.8),
        (4, 0.70, 1.0),
        (5, 0.75, 1.2),
        (7, 1.05, 1.4),
    ] {
        let screw = b_series(blades, area_ratio, pitch_ratio);
        let zero_thrust = screw.zero_thrust_advance_ratio(None);
        for step in 1..20 {
            let j = zero_thrust * step as f64 / 20.0;
            let point = screw.coefficients(j, None);
            let thrust_loading = 8.0 * point.thrust_coefficient / (PI * j * j);
            let ideal = 2.0 / (1.0 + (1.0 + thrust_loading).sqrt());
            let eta0 = point.efficiency().expect("below zero thrust");
            assert!(
                eta0 < ideal - 0.02,
                "B{blades}-{area_ratio} P/D {pitch_ratio} J {j:.3}: η0 {eta0:.3} vs ideal {ideal:.3}"
            );
        }
    }
}

#[test]
fn zero_thrust_advance_ratio_near_the_diagrams() {
    // from memory: on the B-series diagrams (Kuiper 1992) the KT curve of a P/D = 1.0 screw
    // crosses zero at J ≈ 1.05–1.10, a little beyond the face pitch because of camber.
    let j0 = b_series(4, 0.70, 1.0).zero_thrust_advance_ratio(None);
    assert!((1.04..=1.11).contains(&j0), "B4-70 P/D 1.0: J0 = {j0}");
    // The same for each screw of the Kuiper readings: J0 lies a few percent beyond P/D.
    for (blades, area_ratio, pitch_ratio) in [(2, 0.30, 1.4), (3, 0.65, 0.8), (6, 0.65, 1.2)] {
        let j0 = b_series(blades, area_ratio, pitch_ratio).zero_thrust_advance_ratio(None);
        let ratio = j0 / pitch_ratio;
        assert!(
            (1.0..=1.15).contains(&ratio),
            "B{blades}-{area_ratio} P/D {pitch_ratio}: J0 = {j0}"
        );
    }
}

#[test]
fn reynolds_correction_vanishes_at_the_nominal_reynolds_number() {
    // Oosterveld & van Oossanen (1975): the polynomials hold at Rn(0.75R) = 2·10⁶ and the
    // correction is built to (nearly) vanish there; just above it, the change must be tiny.
    for (blades, area_ratio, pitch_ratio, j) in [
        (3, 0.65, 1.2, 0.7),
        (4, 0.55, 0.9, 0.5),
        (6, 0.65, 1.4, 0.5),
    ] {
        let screw = b_series(blades, area_ratio, pitch_ratio);
        let base = screw.coefficients(j, None);
        let (thrust_change, torque_change) = screw.reynolds_correction(j, 2.0e6 * (1.0 + 1e-9));
        assert!(
            thrust_change.abs() < 0.003 * base.thrust_coefficient,
            "ΔKT {thrust_change}"
        );
        assert!(
            torque_change.abs() < 0.003 * base.torque_coefficient,
            "ΔKQ {torque_change}"
        );
        // At or below 2·10⁶ nothing is applied.
        assert_eq!(screw.coefficients(j, Some(1.0e6)), base);
    }
}

#[test]
fn reynolds_correction_at_full_scale_raises_efficiency() {
    // Oosterveld & van Oossanen (1975), Kuiper (1992): at full-scale Rn (here 1·10⁷) the
    // thinner boundary layer lowers section drag, so KQ falls slightly, KT rises slightly and
    // η0 rises by a few percent at most.
    for (blades, area_ratio, pitch_ratio, j) in [
        (2, 0.30, 1.4, 0.8),
        (3, 0.65, 0.8, 0.3),
        (4, 0.55, 1.0, 0.6),
        (6, 0.65, 1.2, 0.8),
    ] {
        let screw = b_series(blades, area_ratio, pitch_ratio);
        let model = screw.coefficients(j, None);
        let full = screw.coefficients(j, Some(1.0e7));
        let label = format!("B{blades}-{area_ratio} P/D {pitch_ratio} J {j}");
        assert!(
            full.thrust_coefficient >= model.thrust_coefficient,
            "{label}: KT {full:?}"
        );
        let torque_change = full.torque_coefficient / model.torque_coefficient - 1.0;
        assert!(
            (-0.05..0.0).contains(&torque_change),
            "{label}: KQ change {torque_change}"
        );
        let gain = full.efficiency().unwrap() / model.efficiency().unwrap() - 1.0;
        assert!((0.0..0.05).contains(&gain), "{label}: η0 gain {gain}");
    }
}

#[test]
fn open_water_rows_flag_points_past_zero_thrust() {
    let model = ScrewModel::BSeries(b_series(3, 0.50, 0.8));
    let j0 = model.zero_thrust_advance_ratio(None);
    let rows = open_water_rows(&model, &[0.2, 0.6, j0 + 0.05, 1.2], None);
    assert_eq!(rows.len(), 4);
    for row in &rows[..2] {
        assert!(!row.past_zero_thrust && row.efficiency.is_some_and(|e| e > 0.0 && e < 1.0));
    }
    for row in &rows[2..] {
        assert!(row.past_zero_thrust && row.efficiency.is_none(), "{row:?}");
    }
    // η0 in a row is the definition J·KT/(2π·KQ).
    let row = rows[1];
    let eta0 = row.advance_ratio * row.thrust_coefficient / (2.0 * PI * row.torque_coefficient);
    assert_close!(row.efficiency.unwrap(), eta0, 1e-12);
}

#[test]
fn bad_geometry_is_a_clear_error() {
    let good = ScrewGeometry {
        blades: 4,
        diameter: 0.6,
        pitch: 0.5,
        area_ratio: 0.55,
    };
    let zero_pitch = BSeriesScrew::new(ScrewGeometry { pitch: 0.0, ..good }).unwrap_err();
    assert_eq!(
        zero_pitch,
        ScrewError::NotPositive {
            field: "pitch",
            value: 0.0
        }
    );
    assert!(
        zero_pitch
            .to_string()
            .contains("pitch must be a positive finite number")
    );
    let negative = BSeriesScrew::new(ScrewGeometry {
        diameter: -0.6,
        ..good
    })
    .unwrap_err();
    assert!(negative.to_string().contains("diameter") && negative.to_string().contains("-0.6"));
    let nan_area = BSeriesScrew::new(ScrewGeometry {
        area_ratio: f64::NAN,
        ..good
    })
    .unwrap_err();
    assert!(matches!(
        nan_area,
        ScrewError::NotPositive {
            field: "area ratio",
            ..
        }
    ));
    for blades in [0, 10] {
        let err = BSeriesScrew::new(ScrewGeometry { blades, ..good }).unwrap_err();
        assert_eq!(err, ScrewError::BadBladeCount(blades));
    }
    // Outside the series' range: built, but with a warning naming value and limit.
    let wide = BSeriesScrew::new(ScrewGeometry { blades: 8, ..good }).unwrap();
    assert!(
        wide.warnings()
            .iter()
            .any(|w| w.message.contains("8 blades") && w.message.contains("2 to 7"))
    );
}

#[test]
fn keller_minimum_area_ratio_by_hand() {
    // Keller's criterion AE/A0 = (1.3 + 0.3·Z)·T/((p0 − pv)·D²) + K, as given in Principles of
    // Naval Architecture vol. II (1988). No published worked example was found to check
    // against, so this is a hand calculation; the constants are from memory: K = 0.2 single
    // screw, K = 0.1 twin screw, pv ≈ 1700 Pa for sea water at 15 °C.
    // Z = 4, T = 200 kN, D = 3 m, shaft 3 m deep, ρ = 1025 kg/m³:
    //   p0 = 101 325 + 1025·9.80665·3 = 131 480.4 Pa; p0 − pv = 129 780.4 Pa
    //   AE/A0 = 2.5·200 000 / (129 780.4·9) + 0.2 = 0.42807 + 0.2 = 0.62807
    let p0 = cavitation::static_pressure_at_shaft(101_325.0, 1025.0, 3.0);
    assert_close!(p0, 131_480.4, 1e-6);
    let area = cavitation::keller_minimum_area_ratio(
        4,
        200_000.0,
        p0 - 1700.0,
        3.0,
        KELLER_CONSTANT_SINGLE_SCREW,
    );
    assert_close!(area, 0.62807, 1e-4);
    // Z = 3, T = 6 kN, D = 0.6 m, shaft 0.8 m deep, twin screw:
    //   p0 − pv = 101 325 + 8041.45 − 1700 = 107 666.5 Pa
    //   AE/A0 = 2.2·6000 / (107 666.5·0.36) + 0.1 = 0.34056 + 0.1 = 0.44056
    let p0 = cavitation::static_pressure_at_shaft(101_325.0, 1025.0, 0.8);
    let area = cavitation::keller_minimum_area_ratio(
        3,
        6000.0,
        p0 - 1700.0,
        0.6,
        KELLER_CONSTANT_TWIN_SCREW,
    );
    assert_close!(area, 0.44056, 1e-4);
}

#[test]
fn burrill_line_near_the_published_chart() {
    // from memory: Burrill's 5 % back-cavitation line ("suggested upper limit for merchant
    // ship propellers") as read from the Burrill diagram (Burrill 1943, Trans. IMarE 55;
    // reproduced in Principles of Naval Architecture vol. II): τc ≈ 0.10 at σ0.7R = 0.2,
    // ≈ 0.18 at 0.5, ≈ 0.28 at 1.0. Reading tolerance ±0.02 in τc.
    for (sigma, tau) in [(0.2, 0.10), (0.5, 0.18), (1.0, 0.28)] {
        let got = cavitation::burrill_five_percent_thrust_loading(sigma);
        assert!(
            (got - tau).abs() <= 0.02,
            "σ0.7R {sigma}: τc {got:.3} vs chart {tau}"
        );
    }
    // The line rises with the cavitation number.
    let line: Vec<f64> = (1..=20)
        .map(|i| cavitation::burrill_five_percent_thrust_loading(0.1 * i as f64))
        .collect();
    assert!(line.windows(2).all(|w| w[1] > w[0]));
}

#[test]
fn burrill_definitions_and_taylor_projected_area() {
    // Cavitation Notes (MIT handout after Principles of Naval Architecture pp. 181–183):
    // σ0.7R = (patm + ρgh − pv)/(½ρV²R), V²R = Va² + (0.7πnD)², τc = T/(½ρV²R·Ap), and
    // Taylor's Ap/AD = 1.067 − 0.229·P/D. UFC 4-159-03 eq. 22 gives Ap/AD = 0.838 at P/D = 1.0.
    assert_close!(cavitation::projected_area_taylor(1.0, 1.0), 0.838, 1e-9);
    let speed = cavitation::relative_speed_at_07r(4.0, 20.0, 0.6);
    assert_close!(speed, (16.0 + (0.7 * PI * 12.0_f64).powi(2)).sqrt(), 1e-12);
    // Hand calculation: p0 − pv = 100 000 Pa, ρ = 1000 kg/m³, V = 20 m/s → σ = 100 000/200 000 = 0.5;
    // T = 10 kN on Ap = 0.25 m² → τc = 10 000/(200 000·0.25) = 0.2.
    assert_close!(
        cavitation::cavitation_number_at_07r(100_000.0, 1000.0, 20.0),
        0.5,
        1e-12
    );
    assert_close!(
        cavitation::thrust_loading_coefficient(10_000.0, 1000.0, 20.0, 0.25),
        0.2,
        1e-12
    );
}

#[test]
fn blade_loading_and_tip_speed() {
    // NIST SP 811: 1 psi = 6.894 757 kPa; the small-craft ceiling of about 10 psi is common practice.
    assert_close!(SMALL_CRAFT_BLADE_LOADING_LIMIT, 68_947.57, 1e-9);
    assert_close!(cavitation::blade_loading(6894.757, 1.0), 6894.757, 1e-12);
    // Tip speed π·n·D: 1500 rpm (25 rev/s) on a 0.6 m screw = 47.12 m/s.
    assert_close!(cavitation::tip_speed(25.0, 0.6), 47.1239, 1e-5);
}

#[test]
fn cavitation_report_warns_when_a_screw_is_too_small() {
    let input = CavitationInput {
        geometry: ScrewGeometry {
            blades: 3,
            diameter: 0.6,
            pitch: 0.55,
            area_ratio: 0.50,
        },
        thrust: 4_000.0,
        advance_speed: 3.0,
        shaft_speed_rps: 18.0,
        shaft_immersion: 0.8,
        water_density: 1025.0,
        vapour_pressure: 1700.0,
        atmospheric_pressure: 101_325.0,
        keller_constant: KELLER_CONSTANT_SINGLE_SCREW,
        blade_loading_limit: SMALL_CRAFT_BLADE_LOADING_LIMIT,
        tip_speed_limit: None,
    };
    let easy = cavitation::check_cavitation(&input).unwrap();
    assert!(
        easy.all_passed() && easy.warnings.is_empty(),
        "{:?}",
        easy.warnings
    );
    // A quarter of the area for four times the thrust: past Keller, Burrill and the loading limit.
    let hard = cavitation::check_cavitation(&CavitationInput {
        thrust: 16_000.0,
        geometry: ScrewGeometry {
            area_ratio: 0.30,
            ..input.geometry
        },
        ..input
    })
    .unwrap();
    assert!(
        !hard.keller_area_ratio.passed && !hard.thrust_loading.passed && !hard.blade_loading.passed
    );
    assert!(hard.burrill_minimum_area_ratio.unwrap() > 0.30);
    assert!(hard.warnings.len() >= 3, "{:?}", hard.warnings);
    let bad = cavitation::check_cavitation(&CavitationInput {
        water_density: 0.0,
        ..input
    })
    .unwrap_err();
    assert!(bad.to_string().contains("water density"));
}
