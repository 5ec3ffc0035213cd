//! The solved results the screen shows, computed once per edit for every variant and cached:
//! the propeller curves, the match against the engine and the cruise point at the target speed.
//! The solving is the study's (`study::solve`, the same the report reads); this module keeps
//! the cached [`Solution`] and its lines for the Screw pane. All values are SI (rpm as rpm).

use crate::study::Study;
use crate::study::solve::SolveOptions;
use crate::tui::app::Document;
use crate::units::{self, Kind, UnitSystem};

pub use crate::study::checks::CheckPoint;
pub use crate::study::solve::{CURVE_POINTS, Checks, Solved, VariantSolution};

/// The cached solution: solved, or why the document could not be built into a vessel.
#[derive(Debug, Clone, PartialEq)]
pub struct Solution {
    /// The results, or the reason there are none.
    pub result: Result<Solved, String>,
    /// (engine rpm, speed m/s) of the active variant without the boat's sea-trial calibration,
    /// when it has one: the speed chart shows the curve before and after the fit. Empty
    /// otherwise.
    pub before_fit: Vec<(f64, f64)>,
    /// The boat as found, the planned figures are compared with (`None` without `[as_found]`).
    pub baseline: Option<crate::study::baseline::Baseline>,
    /// (engine rpm, speed m/s) of the as-found installation, the one in the water until the
    /// repower is marked done; empty without `[as_found]`.
    pub as_found_speed_by_rpm: Vec<(f64, f64)>,
}

impl Solution {
    /// Builds the vessel from the document and solves every variant.
    pub fn solve(doc: &Document) -> Self {
        let boat = &doc.boat;
        let study = doc.study();
        let baseline = study.as_ref().ok().and_then(Study::baseline_figures);
        // The boat in the water today is the as-found one: live speeds are held against it.
        let as_found_speed_by_rpm = study
            .as_ref()
            .ok()
            .and_then(|s| s.baseline.as_deref())
            .map(|found| {
                found
                    .solve_variant(found.vessel.active_variant, &SolveOptions::curves())
                    .speed_by_rpm
            })
            .unwrap_or_default();
        let result = study.map(|study| study.into_solved(&SolveOptions::curves()));
        let before_fit = match &boat.calibration {
            None => Vec::new(),
            Some(_) => {
                let mut plain = boat.clone();
                plain.calibration = None;
                doc.study_of(&plain)
                    .map(|study| {
                        study
                            .solve_variant(study.vessel.active_variant, &SolveOptions::curves())
                            .speed_by_rpm
                    })
                    .unwrap_or_default()
            }
        };
        Self {
            result,
            before_fit,
            baseline,
            as_found_speed_by_rpm,
        }
    }

    /// The solved results, if the document built.
    pub fn solved(&self) -> Option<&Solved> {
        self.result.as_ref().ok()
    }

    /// The active variant's results.
    pub fn active(&self) -> Option<&VariantSolution> {
        let s = self.solved()?;
        s.variants.get(s.vessel.active_variant)
    }

    /// The recommended pitch for the active variant, m, when the design core found one.
    pub fn recommended_pitch(&self) -> Option<f64> {
        self.solved()?
            .recommendation
            .as_ref()
            .ok()?
            .recommended_pitch
    }

    /// The loading condition the recommendation was made for in a few words, in `system`'s
    /// units, e.g. "half load 4.60 t, margin 15 %, fouling 10 %, calibrated ×1.114".
    pub fn recommendation_condition(&self, system: UnitSystem) -> Option<String> {
        let solved = self.solved()?;
        let margins = solved.vessel.resistance.margins;
        let mass = solved
            .recommendation_mass
            .map(|m| format!(" {}", units::format(m, Kind::Mass, system)))
            .unwrap_or_default();
        let mut text = format!(
            "{} load{mass}, margin {:.0} %, fouling {:.0} %",
            solved.recommendation_load,
            margins.service * 100.0,
            margins.fouling * 100.0
        );
        if (margins.resistance_factor - 1.0).abs() > 1e-9 {
            text.push_str(&format!(", calibrated ×{:.3}", margins.resistance_factor));
        }
        Some(text)
    }

    /// The recommendation line of the Screw pane, in `system`'s units.
    pub fn recommendation_line(&self, system: UnitSystem) -> Option<String> {
        let rec = match &self.solved()?.recommendation {
            Ok(rec) => rec,
            Err(why) => return Some(format!("No pitch recommendation: {why}")),
        };
        let Some(pitch) = rec.recommended_pitch else {
            return Some(format!(
                "No pitch found for the target: {}",
                crate::report::design::stop_text(&rec.stop)
            ));
        };
        let change = rec.change.unwrap_or(0.0);
        let sign = if change >= 0.0 { "+" } else { "−" };
        let limit = match rec.within_repitch_limit {
            Some(true) => "within re-pitch limit",
            Some(false) => "BEYOND re-pitch limit: new screw",
            None => "",
        };
        // The slope the shop will see (one-sided, on the load-limited side), as in `pitch`.
        let slope = rec
            .rpm_per_inch
            .filter(|s| s.is_finite())
            .map(|s| format!("; {}/in", crate::report::text::signed_rpm(s)))
            .unwrap_or_default();
        let unreliable = match (rec.in_method_range, rec.target_validity) {
            // After the key, so a cut pane keeps "p adds it"; the cause before the advice.
            (Some(false), Some(v)) => format!(
                ". UNRELIABLE: {}, a sea trial decides",
                v.brief()
                    .unwrap_or_else(|| crate::propulsion::hull::UNRELIABLE_WORDS.to_owned())
            ),
            _ => String::new(),
        };
        Some(format!(
            "Recommended pitch {} ({sign}{}, {limit}{slope}) for {} load; p adds it{unreliable}",
            units::format(pitch, Kind::ScrewLength, system),
            units::format(change.abs(), Kind::ScrewLength, system),
            self.solved()?.recommendation_load,
        ))
    }
}
