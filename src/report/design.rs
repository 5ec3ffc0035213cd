//! Design results laid out: pitch recommendations, sweeps and the sea-trial comparison, as
//! text and JSON over the study's answers.

use serde::Serialize;

use super::table::{Column, Table};
use super::text::{condition_words, margin_words, signed_rpm, verdict_words};
use super::what_if::UNRELIABLE_TOP_NOTE;
use super::{Display, INCH_M, KNOT_MPS, percent};
use crate::propulsion::solver::pitch::{MatchSummary, PitchCure, PitchRecommendation};
use crate::propulsion::solver::sweep::SweepResult;
use crate::propulsion::solver::trial::Calibration;
use crate::study::Study;
use crate::units::Kind;

use super::finite_or_none;

/// One variant's recommendation in JSON.
#[derive(Debug, Serialize)]
pub struct PitchJson {
    label: String,
    current_pitch_m: f64,
    recommended_pitch_m: Option<f64>,
    change_m: Option<f64>,
    within_repitch_limit: Option<bool>,
    repitch_limit_m: f64,
    rpm_per_inch: Option<f64>,
    rpm_per_10mm: Option<f64>,
    target: String,
    target_rpm: f64,
    /// Brake power of each engine at the target, kW.
    target_kw_per_engine: f64,
    /// Brake power each engine's screw absorbs at the recommended pitch, kW.
    absorbed_kw_per_engine: Option<f64>,
    /// The current screw's match.
    #[serde(rename = "match")]
    current: Option<MatchSummaryJson>,
    /// The match at the recommended pitch.
    recommended_match: Option<MatchSummaryJson>,
    cure: Option<CureJson>,
    condition: ConditionJson,
    search: String,
    speed_at_target_kn: Option<f64>,
    froude_at_target: Option<f64>,
    in_method_range: Option<bool>,
    warnings: Vec<String>,
    /// The change from the boat as found at the recommended pitch, or null without a baseline.
    pub(crate) delta: Option<super::baseline::HeadlineJson>,
}

/// The loading a pitch was chosen for, in JSON (displacement as a mass).
#[derive(Debug, Serialize)]
struct ConditionJson {
    /// The condition's name ("as loaded in the boat file", "full load", …).
    label: String,
    /// Displacement, t (the core's volume times the water's density).
    displacement_t: f64,
    /// Service margin, fraction of total resistance (as in the `conditions` document).
    service_margin: f64,
    /// Fouling as added friction, fraction of friction.
    fouling: f64,
    /// Sea-trial resistance factor applied (1 = none).
    resistance_factor: f64,
}

impl PitchJson {
    /// The JSON of `r`, its displacement weighed in water of `water_density` kg/m³.
    pub fn of(r: &PitchRecommendation, water_density: f64) -> Self {
        let c = &r.condition;
        let condition = ConditionJson {
            label: c.label.clone(),
            displacement_t: c.displacement_volume * water_density / 1e3,
            service_margin: c.service_margin,
            fouling: c.fouling,
            resistance_factor: c.resistance_factor,
        };
        Self {
            label: r.label.clone(),
            current_pitch_m: r.current_pitch,
            recommended_pitch_m: finite_or_none(r.recommended_pitch),
            change_m: finite_or_none(r.change),
            within_repitch_limit: r.within_repitch_limit,
            repitch_limit_m: r.repitch_limit,
            rpm_per_inch: finite_or_none(r.rpm_per_inch),
            rpm_per_10mm: finite_or_none(r.rpm_per_10mm),
            target: r.target.describe(),
            target_rpm: r.target_point.engine_rpm,
            target_kw_per_engine: r.target_point.brake_power / 1e3,
            absorbed_kw_per_engine: finite_or_none(r.absorbed_power.map(|w| w / 1e3)),
            current: r.current.as_ref().map(MatchSummaryJson::from),
            recommended_match: r.at_recommended.as_ref().map(MatchSummaryJson::from),
            cure: r.cure.as_ref().map(CureJson::from),
            condition,
            search: stop_text(&r.stop),
            speed_at_target_kn: finite_or_none(r.speed_at_target.map(|v| v / KNOT_MPS)),
            froude_at_target: finite_or_none(r.target_validity.map(|v| v.froude)),
            in_method_range: r.in_method_range,
            warnings: r.warnings.iter().map(ToString::to_string).collect(),
            delta: None,
        }
    }
}

/// A match's verdict and margin in JSON (the same fields as the report's `match`).
#[derive(Debug, Serialize)]
struct MatchSummaryJson {
    pitch_m: f64,
    meeting_rpm: f64,
    verdict: crate::propulsion::solver::Verdict,
    rpm_margin: f64,
    rpm_margin_is_lower_bound: bool,
    absorbed_pct_at_rated: f64,
}

impl From<&MatchSummary> for MatchSummaryJson {
    fn from(m: &MatchSummary) -> Self {
        Self {
            pitch_m: m.pitch,
            meeting_rpm: m.meeting_rpm,
            verdict: m.verdict,
            rpm_margin: m.rpm_margin,
            rpm_margin_is_lower_bound: m.margin_is_lower_bound,
            absorbed_pct_at_rated: m.absorbed_fraction_at_rated * 100.0,
        }
    }
}

/// The slope's cure of the current screw in JSON.
#[derive(Debug, Serialize)]
struct CureJson {
    target_rpm_margin: f64,
    rpm_to_cure: f64,
    change_m: f64,
    check: Option<MatchSummaryJson>,
}

impl From<&PitchCure> for CureJson {
    fn from(c: &PitchCure) -> Self {
        Self {
            target_rpm_margin: c.target_margin,
            rpm_to_cure: c.rpm_to_cure,
            change_m: c.change,
            check: c.check.as_ref().map(MatchSummaryJson::from),
        }
    }
}

/// The re-pitch limit (m) in the display unit to a tenth, so that the default ±2 in reads
/// "50.8 mm" as the boat template writes it, not a rounded "51 mm".
pub fn repitch_limit_words(limit: f64, d: &Display) -> String {
    let text = d.number(limit, Kind::ScrewLength, 1);
    let text = text.strip_suffix(".0").unwrap_or(&text);
    format!("{text} {}", d.unit(Kind::ScrewLength))
}

/// How the pitch search ended, in words.
pub fn stop_text(stop: &crate::propulsion::solver::pitch::SearchStop) -> String {
    use crate::propulsion::solver::pitch::SearchStop;
    match stop {
        SearchStop::Converged => "converged".into(),
        SearchStop::BracketLost(reason) => format!("no pitch found: {reason}"),
        SearchStop::IterationsExhausted => "iteration limit reached".into(),
    }
}

/// Text lines of one recommendation for a boat of `study` (its shafts and water density
/// decide the wording and the displacement shown as a mass). On a twin, identical engines and
/// screws give one answer, said once for each screw.
pub fn pitch_text(r: &PitchRecommendation, d: &Display, study: &Study) -> String {
    let twin = study.vessel.installation.is_twin_screw();
    let mut out = format!(
        "Screw {}{}: current pitch {}\n",
        r.label,
        if twin {
            " (each screw: both shafts carry the same engine, gear and screw, so one answer)"
        } else {
            ""
        },
        d.quantity(r.current_pitch, Kind::ScrewLength)
    );
    out.push_str(&format!(
        "  target: {} ({:.0} rpm, {}{}); condition {}\n",
        r.target.describe(),
        r.target_point.engine_rpm,
        d.quantity(r.target_point.brake_power, Kind::Power),
        if twin { " each engine" } else { "" },
        condition_words(&r.condition, study.vessel.resistance.water.density, d)
    ));
    match (r.recommended_pitch, r.change) {
        (Some(p), Some(c)) if p.is_finite() && c.is_finite() => {
            let sign = if c >= -0.0005 { "+" } else { "−" };
            out.push_str(&format!(
                "  recommended pitch{} {} (change {sign}{}), {}\n",
                if twin { " for each screw" } else { "" },
                d.quantity(p, Kind::ScrewLength),
                d.quantity(c.abs(), Kind::ScrewLength),
                match r.within_repitch_limit {
                    Some(true) => format!(
                        "within the re-pitch limit of ±{}",
                        repitch_limit_words(r.repitch_limit, d)
                    ),
                    _ => format!(
                        "BEYOND the re-pitch limit of ±{}: a new screw is needed",
                        repitch_limit_words(r.repitch_limit, d)
                    ),
                }
            ));
            if let (Some(false), Some(v)) = (r.in_method_range, r.target_validity) {
                out.push_str(&format!(
                    "  UNRELIABLE: at {:.0} rpm this pitch runs the boat at {}, where {} — a sea trial decides\n",
                    r.target_point.engine_rpm,
                    r.speed_at_target
                        .map_or("—".into(), |s| d.quantity(s, Kind::Speed)),
                    v.label()
                        .unwrap_or_else(|| crate::propulsion::hull::UNRELIABLE_WORDS.to_owned())
                ));
            }
        }
        _ => out.push_str(&format!(
            "  no pitch recommended: {}\n",
            d.words(&stop_text(&r.stop))
        )),
    }
    let rated_rpm = r.rated_rpm;
    if let Some(m) = &r.current {
        out.push_str(&format!(
            "  current screw: {}\n",
            summary_words(m, rated_rpm)
        ));
    }
    if let Some(m) = &r.at_recommended {
        out.push_str(&format!(
            "  at the recommended pitch: {}\n",
            summary_words(m, rated_rpm)
        ));
    }
    if let Some(slope) = finite_or_none(r.rpm_per_inch) {
        out.push_str(&format!(
            "  full-throttle rpm changes by {} per inch of added pitch ({} per 10 mm), on the load-limited side\n",
            signed_rpm(slope),
            signed_rpm(slope * 0.010 / INCH_M)
        ));
    }
    if let (Some(c), Some(now)) = (&r.cure, &r.current)
        && c.rpm_to_cure.abs() >= 0.5
    {
        // One answer: the slope only explains the recommendation, with the same margins the
        // lines above give; the solved pitch is the recommendation itself.
        let what = if c.rpm_to_cure > 0.0 {
            format!("{:.0} rpm short of", c.rpm_to_cure)
        } else {
            format!("{:.0} rpm past", -c.rpm_to_cure)
        };
        let sign = if c.change >= -0.0005 { "+" } else { "−" };
        let mut line = format!(
            "  why: the current screw's margin {} is {what} the {} aimed at; by the slope that is about {sign}{} of pitch",
            signed_rpm(now.rpm_margin),
            signed_rpm(c.target_margin),
            d.quantity(c.change.abs(), Kind::ScrewLength)
        );
        match r.recommended_pitch.filter(|p| p.is_finite()) {
            Some(p) => line.push_str(&format!(
                ", a straight-line estimate: the recommended {} above is the pitch solved to the target",
                d.quantity(p, Kind::ScrewLength)
            )),
            None => line.push_str(", a straight-line estimate only"),
        }
        out.push_str(&line);
        out.push('\n');
    }
    for w in &r.warnings {
        out.push_str(&format!("  warning: {w}\n"));
    }
    out.push_str(&format!("  caution: {}\n", r.caution));
    if let Some(line) = pitch_baseline_line(r, study, d) {
        out.push_str(&format!("  {line}\n"));
    }
    out
}

/// "matched, margin +52 rpm (runs free 52 rpm past rated 2600 rpm), absorbs 97 % at rated rpm".
fn summary_words(m: &MatchSummary, rated_rpm: f64) -> String {
    format!(
        "{}, margin {} ({}), absorbs {:.0} % of rated power at rated rpm",
        verdict_words(m.verdict),
        signed_rpm(m.rpm_margin),
        margin_words(m.rpm_margin, m.margin_is_lower_bound, rated_rpm),
        m.absorbed_fraction_at_rated * 100.0
    )
}

/// One sweep as text; with `shafts` 2 each candidate is a pair of screws, one per shaft.
pub fn sweep_text(result: &SweepResult, label: &str, d: &Display, shafts: u32) -> String {
    let mut out = format!(
        "Screw {label}: sweep of {} — ranked by {}\n",
        result.parameter, result.criterion
    );
    out.push_str(&format!(
        "  each candidate{} pitched to {}\n",
        if shafts >= 2 {
            " (each screw of the pair, one per shaft)"
        } else {
            ""
        },
        result.target.describe()
    ));
    let mut table = Table::new(vec![
        Column::number("rank", ""),
        Column::text("screw"),
        Column::number("gear", ""),
        Column::number("pitch", &d.unit(Kind::ScrewLength)),
        Column::number("top speed", &d.unit(Kind::Speed)),
        Column::number("η0 target", ""),
        Column::number("η0 top", ""),
        Column::number("fuel/nm", &d.unit(Kind::FuelPerDistance)),
        Column::text("tie"),
        Column::text("note"),
    ]);
    for c in &result.candidates {
        let opt =
            |v: Option<f64>, f: &dyn Fn(f64) -> String| finite_or_none(v).map_or("—".into(), f);
        table.push(vec![
            if c.rank > 0 {
                c.rank.to_string()
            } else {
                "—".into()
            },
            format!(
                "{} × {}, AE/A0 {:.2}",
                c.geometry.blades,
                d.quantity(c.geometry.diameter, Kind::ScrewLength),
                c.geometry.area_ratio
            ),
            format!("{:.2}", c.gear_ratio),
            opt(c.pitch, &|p| d.number(p, Kind::ScrewLength, 1)),
            opt(c.top_speed, &|v| {
                let prefix = if c.top_speed_in_method_range == Some(false) {
                    "≈"
                } else {
                    ""
                };
                format!("{prefix}{}", d.number(v, Kind::Speed, 2))
            }),
            opt(c.open_water_efficiency_at_target, &|v| format!("{v:.3}")),
            opt(c.open_water_efficiency_at_top, &|v| format!("{v:.3}")),
            opt(c.fuel_per_distance_at_target, &|v| {
                d.figure(v, Kind::FuelPerDistance)
            }),
            c.tie_with.map_or(String::new(), |t| format!("= #{t}")),
            [
                (c.top_speed_in_method_range == Some(false))
                    .then(|| UNRELIABLE_TOP_NOTE.to_string()),
                c.problem.as_deref().map(|p| d.words(p)),
            ]
            .into_iter()
            .flatten()
            .collect::<Vec<_>>()
            .join("; "),
        ]);
    }
    out.push_str(&table.to_text("  "));
    if let Some(band) = result.tie_band {
        out.push_str(&format!(
            "  \"= #n\": not told apart from rank n, the leader of its group: within {:.1} % of its figure, the uncertainty from the band's power spread (the shortlist's rule)\n",
            band * 100.0
        ));
    }
    out
}

/// What the fit is compared with, in words.
pub fn comparison_text(study: &Study, rms_saved: Option<f64>, d: &Display) -> String {
    match (&study.doc.calibration, rms_saved) {
        (None, _) => {
            "compared with the uncalibrated model (the boat has no saved calibration)".into()
        }
        (Some(c), rms) => format!(
            "compared with the uncalibrated model, not with the saved calibration (resistance ×{:.3}{}), so a new fit replaces it and never compounds it{}",
            c.resistance_factor,
            c.wake_fraction
                .map(|w| format!(", wake fraction {w:.3}"))
                .unwrap_or_default(),
            rms.map(|r| format!(
                "; with the saved calibration the RMS error is {}",
                d.quantity(r, Kind::Speed)
            ))
            .unwrap_or_default()
        ),
    }
}

/// The calibration as text.
pub fn trial_text(cal: &Calibration, d: &Display) -> String {
    let mut table = Table::new(vec![
        Column::number("engine", "rpm"),
        Column::number("runs", ""),
        Column::number("measured", &d.unit(Kind::Speed)),
        Column::number("predicted", &d.unit(Kind::Speed)),
        Column::number("calibrated", &d.unit(Kind::Speed)),
        Column::number("current", &d.unit(Kind::Speed)),
    ]);
    let opt =
        |v: Option<f64>| finite_or_none(v).map_or("—".into(), |v| d.number(v, Kind::Speed, 2));
    for p in &cal.points {
        table.push(vec![
            format!("{:.0}", p.engine_rpm),
            format!("{}{}", p.runs, if p.two_way { " (two-way)" } else { "" }),
            d.number(p.measured_speed, Kind::Speed, 2),
            opt(p.predicted_before),
            opt(p.predicted_after),
            opt(p.current),
        ]);
    }
    let mut out = table.to_text("  ");
    out.push_str(&format!(
        "  RMS error {} before, {} after; resistance factor {:.3} (uncalibrated model {:.3})",
        d.quantity(cal.rms_before, Kind::Speed),
        d.quantity(cal.rms_after, Kind::Speed),
        cal.resistance_factor,
        cal.resistance_factor_before
    ));
    if let Some(w) = cal.wake_fraction {
        out.push_str(&format!(", wake fraction {w:.3}"));
    }
    out.push('\n');
    out.push_str(&format!(
        "  The factor multiplies the calm, clean-hull resistance at the trial's condition: the trial is compared with the model without the boat's service margin ({}) and fouling ({}), which every prediction then adds on top of the calibrated resistance.\n",
        percent(cal.service_margin, 0),
        percent(cal.fouling, 0)
    ));
    for w in &cal.warnings {
        out.push_str(&format!("  warning: {w}\n"));
    }
    out
}

/// "Against the boat as found (…): top +0.4 kn · …" at the recommended pitch, if there is a
/// baseline and a recommendation.
pub fn pitch_baseline_line(r: &PitchRecommendation, study: &Study, d: &Display) -> Option<String> {
    let base = study.baseline_figures()?;
    let index = study.variant(Some(&r.label)).ok()?;
    let pitch = r.recommended_pitch.filter(|p| p.is_finite())?;
    let after = study.headline_at_pitch(index, pitch)?;
    Some(format!(
        "against the boat as found ({}) at {}: {}",
        super::baseline::installation_words(&base),
        d.quantity(pitch, Kind::ScrewLength),
        super::baseline::change_line(&base.figures, &after, d)
    ))
}

/// The two-parameter fit (a factor varying with speed) beside the single factor, both RMS:
/// "two-parameter fit: ×1.10 at
/// Fn 0.33 to ×1.19 at Fn 0.45, RMS 0.007 kn (one factor ×1.148 ± 0.004: 0.009 kn)".
pub fn froude_fit_line(
    cal: &Calibration,
    froude: &Result<crate::propulsion::solver::trial::FroudeFit, String>,
    d: &Display,
) -> String {
    let sigma = Study::factor_uncertainty(cal)
        .map(|s| format!(" ± {s:.3}"))
        .unwrap_or_default();
    match froude {
        Ok(f) => format!(
            "two-parameter fit: ×{:.3} at Fn {:.3} to ×{:.3} at Fn {:.3}, RMS {} (one factor ×{:.3}{sigma}: RMS {}){}",
            f.factor.low,
            f.factor.froude_low,
            f.factor.high,
            f.factor.froude_high,
            d.quantity(f.rms_after, Kind::Speed),
            cal.resistance_factor,
            d.quantity(cal.rms_after, Kind::Speed),
            if f.rms_after < cal.rms_after {
                "; `--save --by-froude` saves it"
            } else {
                "; it does not improve on one factor"
            }
        ),
        Err(why) => format!(
            "no two-parameter fit: {why} (one factor ×{:.3}{sigma})",
            cal.resistance_factor
        ),
    }
}
