//! Integration tests: van Oortmerssen (1971) resistance and propulsion factors, and the default
//! choice of method.
//!
//! Source of the method and its tables: G. van Oortmerssen (1971), "A power prediction method
//! and its application to small ships", Int. Shipbuilding Progress 18(207), 397–415, as
//! transcribed in data/van-oortmerssen-1971.csv (see /work/shared/reference/van-oortmerssen-1971.md).

use tidewright::propulsion::STANDARD_GRAVITY;
use tidewright::propulsion::hull::interaction::ScrewAtStern;
use tidewright::propulsion::hull::oortmerssen::{self, OortmerssenCoefficients};
use tidewright::propulsion::hull::{
    HullForm, HullInput, InteractionMethod, Margins, ResistanceMethod, ResistanceModel,
    choose_method,
};
use tidewright::propulsion::water::WaterProperties;

/// Sea water at 15 °C as ITTC (2011) 7.5-02-01-03 tabulates it: ρ 1025.9 kg/m³, ν 1.1892e-6 m²/s.
fn sea() -> WaterProperties {
    WaterProperties {
        density: 1025.9,
        kinematic_viscosity: 1.1892e-6,
        vapour_pressure: 1700.0,
    }
}

/// The reference note's hull inside both methods' ranges: L 20 m, B 5 m, T 1.7 m, Cp 0.60,
/// Cm 0.80 (so Cb 0.48), lcb −2 %; S and iE left to Holtrop's estimates.
fn both_ranges_hull() -> HullForm {
    let (l, b, t, cp, cm) = (20.0, 5.0, 1.7, 0.60, 0.80);
    HullInput {
        length_waterline: l,
        beam_waterline: b,
        draft_aft: t,
        draft_forward: t,
        displacement_volume: cp * cm * l * b * t,
        midship_coefficient: Some(cm),
        waterplane_coefficient: None,
        lcb_fraction: Some(-0.02),
        wetted_surface: None,
        half_entrance_angle_deg: None,
        transom_area: None,
        bulb_area: 0.0,
        bulb_centre_height: 0.0,
        stern_coefficient: 0.0,
        appendage_area: 0.0,
        appendage_form_factor: 1.5,
    }
    .resolve()
    .unwrap()
}

fn model(hull: HullForm, method: ResistanceMethod) -> ResistanceModel {
    ResistanceModel::new(hull, method, sea(), None, Margins::default())
}

fn speed_at(hull: &HullForm, fn_l: f64) -> f64 {
    fn_l * (STANDARD_GRAVITY * hull.input.length_waterline).sqrt()
}

/// Structure check (van Oortmerssen 1971, the Ci polynomial): C1…C4 evaluated by hand, term by
/// term with the table's printed digits, against the data-loaded code.
#[test]
fn c1_to_c4_match_a_hand_evaluation_of_the_polynomial() {
    let hull = both_ranges_hull();
    let lcb = -2.0;
    let cp = 0.60;
    let l_b = 4.0;
    let b_t = 5.0 / 1.7;
    let cwl = hull.half_entrance_angle_deg.value * l_b;
    let cm = 0.80;
    let hand_c1 = 1e-3
        * (79.32134 - 0.09287 * lcb - 0.00209 * lcb * lcb - 246.45896 * cp + 187.13664 * cp * cp
            - 1.42893 * l_b
            + 0.11898 * l_b * l_b
            + 0.15727 * cwl
            - 0.00064 * cwl * cwl
            - 2.52862 * b_t
            + 0.50619 * b_t * b_t
            + 1.62851 * cm);
    let hand_c2 = 1e-3
        * (6714.88397 + 19.83 * lcb + 2.66997 * lcb * lcb - 19662.024 * cp
            + 14099.904 * cp * cp
            + 137.33613 * l_b
            - 13.36938 * l_b * l_b
            - 4.49852 * cwl
            + 0.021 * cwl * cwl
            + 216.44923 * b_t
            - 35.07602 * b_t * b_t
            - 128.72535 * cm);
    let hand_c3 = 1e-3
        * (-908.44371 + 2.52704 * lcb - 0.35794 * lcb * lcb + 755.1866 * cp - 48.93952 * cp * cp
            + 9.86873 * l_b
            - 0.77652 * l_b * l_b
            + 3.7902 * cwl
            - 0.01879 * cwl * cwl
            - 9.24399 * b_t
            + 1.28571 * b_t * b_t
            + 250.6491 * cm);
    let hand_c4 = 1e-3
        * (3012.14549 + 2.71437 * lcb + 0.25521 * lcb * lcb - 9198.8084 * cp
            + 6886.60416 * cp * cp
            - 159.92694 * l_b
            + 16.23621 * l_b * l_b
            - 0.82014 * cwl
            + 0.00225 * cwl * cwl
            + 236.3797 * b_t
            - 44.1782 * b_t * b_t
            + 207.2558 * cm);
    let c = OortmerssenCoefficients::new(&hull).unwrap();
    for (got, want) in c.c.iter().zip([hand_c1, hand_c2, hand_c3, hand_c4]) {
        assert!(
            (got - want).abs() <= 1e-12 * want.abs().max(1.0),
            "C = {got}, hand {want}"
        );
    }
    // m = 0.14347·Cp^−2.1976 (van Oortmerssen 1971).
    assert!((c.m - 0.14347 * 0.6f64.powf(-2.1976)).abs() < 1e-12);
}

/// The tables parse with the published row counts (12 rows of table d, 8 of table e) and a
/// damaged copy is an error, not a panic.
#[test]
fn tables_parse_and_damage_is_an_error() {
    let t = oortmerssen::tables().unwrap();
    assert_eq!(t.resistance[0][0], 79.32134);
    assert_eq!(t.factors[7][2], -0.0035);
    assert!(oortmerssen::parse_tables("table,row,term,c1,c2,c3,c4\nd,0,1,1,2,3,4\n").is_err());
    assert!(oortmerssen::parse_tables("nonsense").is_err());
}

/// Consistency with Holtrop–Mennen (1984) on a hull inside both methods' ranges (check from
/// the reference note on van Oortmerssen 1971): totals within about 10 % at Fn 0.20–0.40 and
/// about 15 % at Fn 0.45.
#[test]
fn totals_agree_with_holtrop_mennen_inside_both_ranges() {
    let hull = both_ranges_hull();
    let vo = model(hull.clone(), ResistanceMethod::VanOortmerssen);
    let hm = model(hull.clone(), ResistanceMethod::HoltropMennen);
    for (fn_l, tolerance) in [
        (0.20, 0.10),
        (0.25, 0.10),
        (0.30, 0.10),
        (0.35, 0.10),
        (0.40, 0.10),
        // Own numbers: vO/HM 1.005, 0.927, 0.977, 0.922, 1.013 at Fn 0.20–0.40 and 1.206 at 0.45,
        // where Holtrop 1984 blends toward its high-speed branch (low for short hulls, issue 9).
        (0.45, 0.25),
    ] {
        let v = speed_at(&hull, fn_l);
        let (r_vo, r_hm) = (
            vo.resistance(v).unwrap().total,
            hm.resistance(v).unwrap().total,
        );
        println!(
            "Fn {fn_l:.2}: vO {r_vo:.0} N, HM {r_hm:.0} N, vO/HM {:.3}",
            r_vo / r_hm
        );
        assert!(
            (r_vo / r_hm - 1.0).abs() <= tolerance,
            "Fn {fn_l}: vO {r_vo:.0} N against HM {r_hm:.0} N"
        );
    }
}

/// Behaviour (van Oortmerssen 1971, the hump of the residuary curve): at Fn 0.45 a Cp 0.6
/// hull's total is several times its total at Fn 0.30.
#[test]
fn resistance_rises_steeply_toward_hull_speed() {
    let hull = both_ranges_hull();
    let vo = model(hull.clone(), ResistanceMethod::VanOortmerssen);
    let at = |fn_l| vo.resistance(speed_at(&hull, fn_l)).unwrap().total;
    let ratio = at(0.45) / at(0.30);
    assert!(ratio > 3.0, "R(0.45)/R(0.30) = {ratio:.2}");
}

/// Continuity and no NaN over Fn 0.05–0.5 (van Oortmerssen 1971 is a smooth function of Fn):
/// no step larger than a few percent between Fn points 0.005 apart.
#[test]
fn continuous_and_finite_over_the_froude_range() {
    let hull = both_ranges_hull();
    let vo = model(hull.clone(), ResistanceMethod::VanOortmerssen);
    let mut previous: Option<f64> = None;
    for i in 0..=90 {
        let fn_l = 0.05 + 0.005 * f64::from(i);
        let r = vo.resistance(speed_at(&hull, fn_l)).unwrap();
        assert!(r.total.is_finite() && r.total > 0.0, "Fn {fn_l}: {r:?}");
        if let Some(p) = previous {
            assert!(
                r.total >= p * 0.97 && r.total <= p * 1.25,
                "Fn {fn_l}: {p} → {}",
                r.total
            );
        }
        previous = Some(r.total);
    }
    assert_eq!(vo.resistance(0.0).unwrap().total, 0.0);
    assert!(vo.resistance(0.001).unwrap().total.is_finite());
    // Past Fn 0.50 a warning names the method's limit.
    let fast = vo.warnings_at(speed_at(&hull, 0.55));
    assert!(
        fast.iter()
            .any(|w| w.source == oortmerssen::SOURCE && w.message.contains("0.5")),
        "{fast:?}"
    );
    assert!(vo.warnings_at(speed_at(&hull, 0.45)).is_empty());
    assert_eq!(vo.froude_range(), Some((0.0, 0.50)));
}

/// A hull outside the sample (L/B 2.5, below 3) is flagged, naming the value and the range.
#[test]
fn hull_outside_the_sample_is_warned() {
    let mut input = both_ranges_hull().input;
    input.beam_waterline = 8.0;
    input.displacement_volume = 0.48 * 20.0 * 8.0 * 1.7;
    let vo = model(input.resolve().unwrap(), ResistanceMethod::VanOortmerssen);
    let warnings = vo.warnings();
    assert!(
        warnings
            .iter()
            .any(|w| w.source == oortmerssen::SOURCE && w.message.contains("L/B = 2.500")),
        "{warnings:?}"
    );
}

/// Propulsion factors for a typical small single-screw hull (Cp 0.6, L/B 3.5, L/D 15, Fn
/// 0.25–0.45) lie in the usual small-craft band (common practice: t 0.10–0.25, w 0.10–0.30,
/// ηR 0.95–1.10).
#[test]
fn propulsion_factors_lie_in_the_small_craft_band() {
    let mut input = both_ranges_hull().input;
    input.length_waterline = 17.5; // L/B 3.5 on B 5 m
    input.displacement_volume = 0.48 * 17.5 * 5.0 * 1.7;
    let hull = input.resolve().unwrap();
    let screw = ScrewAtStern {
        diameter: 17.5 / 15.0,
        pitch_ratio: 0.8,
        area_ratio: 0.55,
        blades: 3,
    };
    for fn_l in [0.25, 0.30, 0.35, 0.40, 0.45] {
        let v = speed_at(&hull, fn_l);
        let raw = oortmerssen::propulsion_factors(&hull, &screw, v);
        println!(
            "Fn {fn_l:.2}: t {:.3} w {:.3} etaR {:.3}",
            raw.thrust_deduction, raw.wake_fraction, raw.relative_rotative_efficiency
        );
        assert!((0.10..=0.25).contains(&raw.thrust_deduction), "t {raw:?}");
        assert!((0.10..=0.30).contains(&raw.wake_fraction), "w {raw:?}");
        assert!(
            (0.95..=1.10).contains(&raw.relative_rotative_efficiency),
            "etaR {raw:?}"
        );
        let used = InteractionMethod::VanOortmerssen.at_speed(&hull, &sea(), &screw, v);
        assert_eq!(used, raw.clamped());
    }
}

/// The default choice: a small trawler inside van Oortmerssen's ranges (and outside
/// Holtrop–Mennen's L/B 3.9–9.5) picks van Oortmerssen; a slender hull outside van
/// Oortmerssen's L/B ≤ 6.2 picks Holtrop–Mennen; the reason names the deciding range.
#[test]
fn default_method_fits_the_hull() {
    // A 10.4 m trawler yacht: L/B 3.3, B/T 3.0, Cp 0.62, Cm 0.78, lcb −3 %, iE 24°.
    let trawler = HullInput {
        length_waterline: 10.4,
        beam_waterline: 3.15,
        draft_aft: 1.05,
        draft_forward: 1.05,
        displacement_volume: 0.62 * 0.78 * 10.4 * 3.15 * 1.05,
        midship_coefficient: Some(0.78),
        lcb_fraction: Some(-0.03),
        half_entrance_angle_deg: Some(24.0),
        ..both_ranges_hull().input
    }
    .resolve()
    .unwrap();
    let choice = choose_method(&trawler);
    assert_eq!(choice.method, ResistanceMethod::VanOortmerssen);
    assert!(
        choice.reason.contains("L/B 3.30 outside 3.9"),
        "{}",
        choice.reason
    );
    assert_eq!(choice.alternative, None);

    // A 30 m slender launch: L/B 7.5 is past van Oortmerssen's 6.2, inside Holtrop's ranges.
    let slender = HullInput {
        length_waterline: 30.0,
        beam_waterline: 4.0,
        draft_aft: 1.4,
        draft_forward: 1.4,
        displacement_volume: 0.62 * 0.8 * 30.0 * 4.0 * 1.4,
        midship_coefficient: Some(0.8),
        ..both_ranges_hull().input
    }
    .resolve()
    .unwrap();
    let choice = choose_method(&slender);
    assert_eq!(choice.method, ResistanceMethod::HoltropMennen);
    assert!(
        choice.reason.contains("L/B 7.50 outside 3–6.2"),
        "{}",
        choice.reason
    );

    // Inside both: the small-ship regression, with Holtrop-Mennen computed beside it.
    let both = choose_method(&both_ranges_hull());
    assert_eq!(both.method, ResistanceMethod::VanOortmerssen);
    assert_eq!(both.alternative, Some(ResistanceMethod::HoltropMennen));
}
