//! Before and after: the headline figures of an installation (top speed, margin, cruise rpm,
//! load, fuel, range) for the boat as it is today and for each planned screw or candidate, and
//! the change between them. Defined once here for every front end. All values are SI.

use serde::Serialize;

use super::solve::{SolveOptions, VariantSolution};
use super::{Study, WeightChange, active_variant};

/// The figures a repower is decided on, for one installation (`None` where not solved).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct Headline {
    /// Top speed at the meeting point, m/s.
    pub top_speed: Option<f64>,
    /// Free-running rpm margin at the meeting point, rpm.
    pub rpm_margin: Option<f64>,
    /// Engine rpm at the target speed.
    pub cruise_rpm: Option<f64>,
    /// Load at the target speed, fraction of full-load power at that rpm.
    pub cruise_load: Option<f64>,
    /// Fuel volume flow of the boat at the target speed, m³/s.
    pub fuel_rate: Option<f64>,
    /// Fuel per distance at the target speed, m³/m.
    pub fuel_per_distance: Option<f64>,
    /// Range with the reserve at the target speed, m.
    pub range: Option<f64>,
}

impl Headline {
    /// The figures of one solved variant (cruise figures only when the target is reached
    /// within the engine's envelope).
    pub fn of(solution: &VariantSolution) -> Self {
        let matched = solution.matched.as_ref().ok();
        let cruise = solution
            .cruise
            .as_ref()
            .ok()
            .filter(|c| !c.beyond_full_load);
        Self {
            top_speed: matched.map(|m| m.top_speed),
            rpm_margin: matched.map(|m| m.rpm_margin),
            cruise_rpm: cruise.map(|c| c.point.engine_rpm),
            cruise_load: cruise.map(|c| c.point.load_fraction),
            fuel_rate: cruise.map(|c| c.point.fuel_volume_flow),
            fuel_per_distance: cruise.map(|c| c.fuel_per_distance),
            range: cruise.map(|c| c.range),
        }
        .finite()
    }

    /// The change from `before` to these figures (this − before), where both have a value.
    pub fn change_from(&self, before: &Headline) -> Headline {
        let minus = |a: Option<f64>, b: Option<f64>| Some(a? - b?);
        Headline {
            top_speed: minus(self.top_speed, before.top_speed),
            rpm_margin: minus(self.rpm_margin, before.rpm_margin),
            cruise_rpm: minus(self.cruise_rpm, before.cruise_rpm),
            cruise_load: minus(self.cruise_load, before.cruise_load),
            fuel_rate: minus(self.fuel_rate, before.fuel_rate),
            fuel_per_distance: minus(self.fuel_per_distance, before.fuel_per_distance),
            range: minus(self.range, before.range),
        }
        .finite()
    }

    /// The figures with every non-finite value dropped, so no NaN reaches a table.
    fn finite(self) -> Self {
        let f = |v: Option<f64>| v.filter(|x| x.is_finite());
        Self {
            top_speed: f(self.top_speed),
            rpm_margin: f(self.rpm_margin),
            cruise_rpm: f(self.cruise_rpm),
            cruise_load: f(self.cruise_load),
            fuel_rate: f(self.fuel_rate),
            fuel_per_distance: f(self.fuel_per_distance),
            range: f(self.range),
        }
    }
}

/// The boat as it is today: its installation and its figures, the baseline of a repower.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Baseline {
    /// The as-found engine sheet's profile name.
    pub engine: String,
    /// The as-found engine's display name.
    pub engine_name: String,
    /// The as-found reduction ratio.
    pub gear_ratio: f64,
    /// The label of the as-found screw variant.
    pub variant: String,
    /// The as-found figures.
    pub figures: Headline,
    /// The displacement change the planned side carries, if any.
    pub weight_change: Option<WeightChange>,
}

impl Study {
    /// The baseline of the repower (`None` without `[as_found]` or its engine sheet).
    pub fn baseline_figures(&self) -> Option<Baseline> {
        let found = self.baseline.as_deref()?;
        let index = active_variant(&found.vessel);
        let solution = found.solve_variant(index, &SolveOptions::default());
        Some(Baseline {
            engine: found.doc.engine.clone(),
            engine_name: found.vessel.engine.name.clone(),
            gear_ratio: found.vessel.installation.gear_ratio,
            variant: found.label(index).to_string(),
            figures: Headline::of(&solution),
            weight_change: self.weight_change,
        })
    }
}

impl Study {
    /// The figures of variant `index` with its pitch set to `pitch` m (a recommended pitch),
    /// or `None` when the boat cannot be built with it.
    pub fn headline_at_pitch(&self, index: usize, pitch: f64) -> Option<Headline> {
        let mut doc = self.doc.clone();
        doc.variants.get_mut(index)?.pitch = crate::profile::Quantity::new(pitch);
        let study = self.rebuilt_with(doc).ok()?;
        Some(Headline::of(
            &study.solve_variant(index, &SolveOptions::default()),
        ))
    }

    /// The change from the baseline of variant `index` at `pitch` m (`None` without one).
    pub fn delta_at_pitch(&self, index: usize, pitch: f64) -> Option<Headline> {
        let base = self.baseline_figures()?;
        Some(
            self.headline_at_pitch(index, pitch)?
                .change_from(&base.figures),
        )
    }
}

/// Why the sides of a repower cannot be swapped.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SwapError {
    /// The boat file has no `[as_found]`: one installation is both sides.
    #[error(
        "boat {0:?} has no [as_found] installation: there is nothing to swap (add [as_found] with the engine, gear_ratio and variant in the boat now)"
    )]
    NoAsFound(String),
    /// The date is not YYYY-MM-DD.
    #[error("--date: expected a day as YYYY-MM-DD, got {0:?}")]
    BadDate(String),
}

impl Study {
    /// The boat file after the repower is done on `date` (YYYY-MM-DD): the planned engine,
    /// gear and active screw become the as-found side, the old installation (with the trial
    /// log run on it) goes into a dated `[[history]]` entry, and the load cases take the
    /// weight change. The calibration, a property of the hull, stays.
    pub fn repower_done(&self, date: &str) -> Result<crate::profile::BoatDoc, SwapError> {
        let valid_date = date.len() == 10
            && date.char_indices().all(|(i, c)| match i {
                4 | 7 => c == '-',
                _ => c.is_ascii_digit(),
            });
        if !valid_date {
            return Err(SwapError::BadDate(date.to_string()));
        }
        let found = self
            .doc
            .as_found
            .as_ref()
            .ok_or_else(|| SwapError::NoAsFound(self.doc.name.clone()))?;
        let d = crate::report::Display::new(self.doc.units);
        let screw = self
            .doc
            .variants
            .iter()
            .find(|v| v.label == found.variant)
            .map_or_else(
                || format!("screw {}", found.variant),
                |v| {
                    format!(
                        "{} ({}-blade {} × {} pitch, AE/A0 {:.2})",
                        v.label,
                        v.blades,
                        d.quantity(v.diameter.value, crate::units::Kind::ScrewLength),
                        d.quantity(v.pitch.value, crate::units::Kind::ScrewLength),
                        v.area_ratio
                    )
                },
            );
        let moved_trial = self.doc.trial_side() == crate::profile::Side::AsFound;
        let mut doc = self
            .doc
            .with_displacement_change(self.displacement_change());
        doc.history.push(crate::profile::HistoryDoc {
            until: date.to_string(),
            engine: found.engine.clone(),
            gear_ratio: found.gear_ratio,
            screw,
            trial: if moved_trial { doc.trial.take() } else { None },
        });
        doc.as_found = Some(crate::profile::AsFoundDoc {
            engine: doc.engine.clone(),
            gear_ratio: doc.installation.gear_ratio,
            variant: doc.active().map_or_else(String::new, |v| v.label.clone()),
            shaft_efficiency: None,
            gear_efficiency: None,
        });
        doc.installation.weight_change = None;
        if let Some(trial) = doc.trial.as_mut() {
            // A log run on the planned side is now a log of the boat as found.
            trial.installation = None;
        }
        Ok(doc)
    }
}
