//! Random plausible hulls, every resistance method and the automatic choice, on a dense speed
//! grid up to Froude number 1.2: total resistance and effective power rise at every step, no
//! value is NaN, and no step jumps (the past-hull-speed issue's property).

use proptest::prelude::*;
use tidewright::propulsion::hull::{
    HullInput, Margins, Regime, ResistanceMethod, ResistanceModel, choose_method,
};
use tidewright::propulsion::water::{WaterKind, water_properties};

/// Gravity for the Froude number, m/s² (standard gravity, NIST SP 811).
const GRAVITY: f64 = 9.80665;
/// One long ton, kg (2240 lb × 0.45359237 kg/lb, NIST SP 811).
const LONG_TON: f64 = 2240.0 * 0.453_592_37;
/// One foot, m (NIST SP 811).
const FOOT: f64 = 0.3048;
/// Froude step of the dense grid.
const STEP: f64 = 0.0025;
/// Top of the grid.
const TOP_FROUDE: f64 = 1.2;
/// Largest log-slope d ln R / d ln V allowed between neighbouring grid points: a steep wall
/// near hull speed stays well below it, a jump does not (our bound).
const MAX_LOG_SLOPE: f64 = 12.0;

/// A hull from length, L/B, B/T and displacement-length ratio, or `None` when its block
/// coefficient falls outside 0.35–0.60.
fn hull(length: f64, l_b: f64, b_t: f64, displacement_length: f64) -> Option<HullInput> {
    let beam = length / l_b;
    let draft = beam / b_t;
    let mass = displacement_length * LONG_TON * (0.01 * length / FOOT).powi(3);
    let volume = mass / 1025.0;
    let block = volume / (length * beam * draft);
    (0.35..=0.60)
        .contains(&block)
        .then(|| input(length, beam, draft, volume))
}

/// A hull of these particulars (m, m³) with every estimate left to the resolver.
fn input(length: f64, beam: f64, draft: f64, volume: f64) -> HullInput {
    HullInput {
        length_waterline: length,
        beam_waterline: beam,
        draft_aft: draft,
        draft_forward: draft,
        displacement_volume: volume,
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
        appendage_form_factor: 1.5,
    }
}

/// Checks the curve of `model` on the dense grid and returns the regimes it passed through.
fn check_rises(model: &ResistanceModel, what: &str) -> Result<Vec<Regime>, TestCaseError> {
    let length = model.hull.input.length_waterline;
    let speed_of = |froude: f64| froude * (GRAVITY * length).sqrt();
    let steps = (TOP_FROUDE / STEP).round() as usize;
    let mut previous: Option<(f64, f64)> = None;
    let mut regimes = Vec::new();
    for k in 1..=steps {
        let speed = speed_of(k as f64 * STEP);
        let r = model
            .resistance(speed)
            .map_err(|e| TestCaseError::fail(format!("{what}: {e}")))?;
        let validity = model.validity_at(speed);
        prop_assert!(
            r.total.is_finite() && r.total > 0.0,
            "{what}: R = {} at Fn {}",
            r.total,
            k as f64 * STEP
        );
        prop_assert!(validity.froude.is_finite() && validity.froude_volume.is_finite());
        if !regimes.contains(&validity.regime) {
            regimes.push(validity.regime);
        }
        if let Some((v0, r0)) = previous {
            prop_assert!(
                r.total > r0,
                "{what}: resistance falls from {r0} N to {} N at Fn {:.4}",
                r.total,
                k as f64 * STEP
            );
            prop_assert!(r.total * speed > r0 * v0, "{what}: effective power falls");
            let slope = (r.total / r0).ln() / (speed / v0).ln();
            prop_assert!(
                slope < MAX_LOG_SLOPE,
                "{what}: a jump at Fn {:.4} (log-slope {slope:.1})",
                k as f64 * STEP
            );
        }
        previous = Some((speed, r.total));
    }
    Ok(regimes)
}

proptest! {
    #![proptest_config(super::cases(48))]

    #[test]
    fn resistance_rises_for_every_method_up_to_froude_1_2(
        length in 6.0f64..25.0,
        l_b in 2.5f64..6.0,
        b_t in 1.8f64..5.0,
        displacement_length in 100.0f64..500.0,
        temperature in 2.0f64..30.0,
    ) {
        let input = hull(length, l_b, b_t, displacement_length);
        // Only hulls with a plausible block coefficient count as cases.
        prop_assume!(input.is_some());
        let input = input.expect("assumed");
        let form = input.resolve().map_err(|e| TestCaseError::fail(e.to_string()))?;
        let water = water_properties(WaterKind::Sea, temperature)
            .map_err(|e| TestCaseError::fail(e.to_string()))?;
        let chosen = choose_method(&form).method;
        for method in [ResistanceMethod::HoltropMennen, ResistanceMethod::VanOortmerssen, chosen] {
            let name = method.name();
            let model = ResistanceModel::new(form.clone(), method, water, None, Margins::default());
            let regimes = check_rises(&model, name)?;
            // Past every method's reach the curve is the continuation, and says so.
            prop_assert!(regimes.contains(&Regime::Continuation), "{name}: {regimes:?}");
            prop_assert!(model.shape().continuation_exponent >= 2.0);
        }
    }
}

/// A heavy, short, beamy hull (9.2 m waterline, 11.5 t, L/B 2.7; invented): the case where an
/// extrapolated regression used to fall past Fn 0.5. Both methods rise to Fn 1.2, and the
/// figures past Fn 0.5 are named as extrapolations.
#[test]
fn the_heavy_short_hull_rises_past_hull_speed() {
    let input = HullInput {
        midship_coefficient: Some(0.70),
        waterplane_coefficient: Some(0.72),
        ..input(9.2, 3.4, 0.9, 11_500.0 / 1025.0)
    };
    let form = input.resolve().unwrap();
    let water = water_properties(WaterKind::Sea, 15.0).unwrap();
    for method in [
        ResistanceMethod::HoltropMennen,
        ResistanceMethod::VanOortmerssen,
    ] {
        let model = ResistanceModel::new(form.clone(), method, water, None, Margins::default());
        check_rises(&model, model.method.name()).unwrap();
        let past = model.validity_at(0.6 * (GRAVITY * 9.2_f64).sqrt());
        assert!(!past.in_method_range);
        assert!(past.regime.is_extrapolation(), "{past:?}");
        assert!(past.reason().unwrap().contains("extrapolation"), "{past:?}");
    }
}
