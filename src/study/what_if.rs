//! What-if conditions and the uncertainty band: ONE definition of each case, used by the
//! `conditions` command, the export and the TUI's what-if view alike.
//!
//! The fouled case *sets* the hull's fouling to [`WhatIfSettings::fouled`] (added friction, a
//! fraction of friction resistance) and the seaway case *sets* the sea-state margin to
//! [`WhatIfSettings::sea_margin`] (a fraction of total resistance), as `conditions --help`
//! documents; neither is added to the boat's own margins.

use anyhow::Context as _;

use super::Study;
use crate::profile::LoadCondition;
use crate::propulsion::solver::conditions::{
    Condition, ConditionOutcome, TrailingScrew, UncertaintyBand, UncertaintyRanges,
    compare_conditions, recommend_pitch_under, uncertainty_band,
};
use crate::propulsion::solver::pitch::{PitchOptions, PitchRecommendation, recommend_pitch};

/// What-if settings, as fractions.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WhatIfSettings {
    /// Fouling of the "fouled hull" case, fraction of friction (from memory: a season's growth
    /// on an unpainted bottom adds tens of percent to friction).
    pub fouled: f64,
    /// Sea-state margin of the "seaway" case, fraction of resistance.
    pub sea_margin: f64,
    /// Band: displacement spread either side, fraction.
    pub displacement_spread: f64,
    /// Band: wake-fraction shift either side.
    pub wake_shift: f64,
}

impl Default for WhatIfSettings {
    fn default() -> Self {
        Self::DEFAULT
    }
}

impl WhatIfSettings {
    /// The documented defaults of `conditions`: fouling 30 %, sea-state margin 30 %, band
    /// displacement ±10 % and wake ±0.05.
    pub const DEFAULT: WhatIfSettings = WhatIfSettings {
        fouled: 0.30,
        sea_margin: 0.30,
        displacement_spread: 0.10,
        wake_shift: 0.05,
    };

    /// The ranges of the uncertainty band these settings ask for.
    pub fn ranges(&self) -> UncertaintyRanges {
        UncertaintyRanges {
            displacement_fraction: self.displacement_spread,
            wake_shift: self.wake_shift,
            ..UncertaintyRanges::default()
        }
    }
}

/// One what-if case: the condition solved and a short name for narrow screens.
#[derive(Debug, Clone, PartialEq)]
pub struct WhatIfCase {
    /// The condition, labelled in full ("fouled hull (+30 % friction)").
    pub condition: Condition,
    /// A short name ("fouled").
    pub short: &'static str,
}

/// Everything the what-if comparison shows for one screw.
#[derive(Debug, Clone)]
pub struct WhatIf {
    /// The variant's label.
    pub label: String,
    /// One per condition, the boat as given first.
    pub outcomes: Vec<ConditionOutcome>,
    /// Short names of the outcomes, same order ("as given", "light", …, "fouled", "sea state").
    pub short_labels: Vec<&'static str>,
    /// The pitch recommendation made for each condition, same order.
    pub pitches: Vec<Result<PitchRecommendation, String>>,
    /// The uncertainty band, or why it failed.
    pub band: Result<UncertaintyBand, String>,
    /// Water density used to show displacement as mass, kg/m³.
    pub water_density: f64,
    /// The boat file's default load condition ("half"), which "as given" is.
    pub default_load: String,
    /// Shafts fitted (1 or 2): on a twin the power columns are labelled for the boat or each
    /// engine.
    pub shafts: u32,
    /// The boat as found under the same conditions, same order (`None` without `[as_found]`
    /// or when it cannot be solved).
    pub as_found: Option<Vec<ConditionOutcome>>,
}

impl Study {
    /// The cases compared: the boat file's load cases, a fouled hull, a seaway and, on a
    /// twin-screw boat, one engine out with the other screw windmilling.
    pub fn what_if_cases(&self, settings: &WhatIfSettings) -> Vec<WhatIfCase> {
        let density = self.vessel.resistance.water.density;
        let mut list: Vec<WhatIfCase> = LoadCondition::ALL
            .iter()
            .filter_map(|&c| {
                let case = self.doc.load.case(c)?;
                let label = match c {
                    LoadCondition::Light => "light",
                    LoadCondition::Half => "half load",
                    LoadCondition::Full => "full load",
                };
                Some(WhatIfCase {
                    condition: Condition::displacement(
                        label,
                        (case.displacement.value + self.displacement_change()) / density,
                    ),
                    short: label,
                })
            })
            .collect();
        list.push(WhatIfCase {
            condition: Condition::fouled(
                format!("fouled hull (+{:.0} % friction)", settings.fouled * 100.0),
                settings.fouled,
            ),
            short: "fouled",
        });
        list.push(WhatIfCase {
            condition: Condition::sea_state(
                format!(
                    "seaway ({:.0} % sea-state margin)",
                    settings.sea_margin * 100.0
                ),
                settings.sea_margin,
            ),
            short: "sea state",
        });
        if self.vessel.installation.is_twin_screw() {
            list.push(WhatIfCase {
                condition: Condition::one_engine_out(
                    "one engine out (other screw windmilling)",
                    TrailingScrew::Windmilling,
                ),
                short: "1 engine",
            });
        }
        list
    }

    /// Variant `index` under every case (the boat as given first), without pitches or band.
    pub fn what_if_outcomes(
        &self,
        index: usize,
        settings: &WhatIfSettings,
    ) -> anyhow::Result<Vec<ConditionOutcome>> {
        let list: Vec<Condition> = self
            .what_if_cases(settings)
            .into_iter()
            .map(|c| c.condition)
            .collect();
        compare_conditions(&self.vessel, index, &list)
            .with_context(|| format!("what-if conditions of {}", self.vessel.name))
    }

    /// The short names of the outcomes of [`Study::what_if_outcomes`], same order.
    pub fn what_if_short_labels(&self, settings: &WhatIfSettings) -> Vec<&'static str> {
        std::iter::once("as given")
            .chain(self.what_if_cases(settings).iter().map(|c| c.short))
            .collect()
    }

    /// The uncertainty band of variant `index` over the settings' displacement and wake ranges.
    pub fn band(&self, index: usize, settings: &WhatIfSettings) -> Result<UncertaintyBand, String> {
        uncertainty_band(
            &self.vessel,
            index,
            &settings.ranges(),
            &PitchOptions::default(),
        )
        .map_err(|e| e.to_string())
    }

    /// The whole what-if comparison of variant `index`: outcomes, a pitch for each, the band.
    pub fn what_if(&self, index: usize, settings: &WhatIfSettings) -> anyhow::Result<WhatIf> {
        let vessel = &self.vessel;
        let cases = self.what_if_cases(settings);
        let outcomes = self.what_if_outcomes(index, settings)?;
        let options = PitchOptions::default();
        let mut pitches = vec![recommend_pitch(vessel, index, &options).map_err(|e| e.to_string())];
        pitches.extend(cases.iter().map(|c| {
            recommend_pitch_under(vessel, index, &c.condition, &options).map_err(|e| e.to_string())
        }));
        Ok(WhatIf {
            label: vessel.variants[index].label.clone(),
            outcomes,
            short_labels: self.what_if_short_labels(settings),
            pitches,
            band: self.band(index, settings),
            water_density: vessel.resistance.water.density,
            default_load: self.doc.load.default.name().to_string(),
            shafts: vessel.installation.shafts,
            as_found: self.baseline.as_deref().and_then(|found| {
                let outcomes = found
                    .what_if_outcomes(super::active_variant(&found.vessel), settings)
                    .ok()?;
                (outcomes.len() == self_cases(self, settings)).then_some(outcomes)
            }),
        })
    }
}

/// How many outcomes a what-if of `study` gives: the boat as given and each case.
fn self_cases(study: &Study, settings: &WhatIfSettings) -> usize {
    study.what_if_cases(settings).len() + 1
}
