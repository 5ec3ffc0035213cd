//! Design questions of a study: pitch recommendations, sweeps (the sweep parameter defined
//! once) and the sea-trial comparison and fit (the calibration path defined once).

use anyhow::Context as _;

use super::ties::{TieFigure, TieRule, tie_groups};
use super::{CALM_WATER_NOTE, Study};
use crate::profile::CalibrationDoc;
use crate::propulsion::solver::matching::point_at_engine_rpm;
use crate::propulsion::solver::pitch::{PitchOptions, PitchRecommendation, recommend_pitch};
use crate::propulsion::solver::sweep::{
    RankCriterion, SweepOptions, SweepParameter, SweepResult, USUAL_AREA_RATIOS,
    USUAL_BLADE_COUNTS, gear_ratios_around, sweep,
};
use crate::propulsion::solver::trial::{
    Calibration, CalibrationFit, CalibrationOptions, FroudeFit, calibrate, calibrate_by_froude,
};
use crate::units::KNOT_MPS;

/// What a sweep varies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum SweepOver {
    /// Screw diameter up to the aperture's limit.
    #[default]
    Diameter,
    /// Reduction gear ratio.
    GearRatio,
    /// Number of blades.
    Blades,
    /// Expanded area ratio AE/A0.
    AreaRatio,
}

impl SweepOver {
    /// Every parameter, in the order the key cycles them.
    pub const ALL: [SweepOver; 4] = [
        SweepOver::Diameter,
        SweepOver::GearRatio,
        SweepOver::Blades,
        SweepOver::AreaRatio,
    ];

    /// The next parameter (wrapping).
    pub fn next(self) -> Self {
        let i = Self::ALL.iter().position(|k| *k == self).unwrap_or(0);
        Self::ALL[(i + 1) % Self::ALL.len()]
    }
}

/// Why a sweep parameter could not be made from the boat and the values asked for.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SweepInputError {
    /// A diameter sweep without the aperture's size.
    #[error(
        "boat {0:?} gives no installation.max_screw_diameter, so the aperture limit of a diameter sweep is unknown"
    )]
    NoAperture(String),
    /// The aperture and tip clearance leave no diameter to sweep.
    #[error("installation.max_screw_diameter and tip_clearance of {boat:?}: {reason}")]
    BadAperture {
        /// The boat.
        boat: String,
        /// What the core said.
        reason: String,
    },
    /// Blade counts that are not whole numbers.
    #[error("blade counts must be whole numbers")]
    FractionalBlades,
}

/// What the fit of a sea trial was made by, for the note saved with it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FittedBy {
    /// `tidewright trial --save`.
    Command,
    /// The terminal UI's calibration view.
    TerminalUi,
}

impl FittedBy {
    fn words(self) -> &'static str {
        match self {
            FittedBy::Command => "by `tidewright trial --save`",
            FittedBy::TerminalUi => "in the tidewright terminal UI",
        }
    }
}

impl Study {
    /// The pitch recommendations of variants `indices`, each failure naming its screw.
    pub fn recommendations(
        &self,
        indices: &[usize],
        options: &PitchOptions,
    ) -> anyhow::Result<Vec<PitchRecommendation>> {
        indices
            .iter()
            .map(|&i| {
                recommend_pitch(&self.vessel, i, options)
                    .with_context(|| format!("pitch recommendation for screw {}", self.label(i)))
            })
            .collect()
    }

    /// The sweep parameter of `over` for variant `index`: diameters up to the aperture's limit
    /// with its tip clearance, else `values` or the usual list (gear ratios either side of the
    /// boat's, 2–5 blades, four area ratios).
    pub fn sweep_parameter(
        &self,
        index: usize,
        over: SweepOver,
        values: Option<Vec<f64>>,
    ) -> Result<SweepParameter, SweepInputError> {
        let vessel = &self.vessel;
        Ok(match over {
            SweepOver::Diameter => {
                let largest = self
                    .inputs
                    .max_screw_diameter
                    .ok_or_else(|| SweepInputError::NoAperture(vessel.name.clone()))?;
                let clearance = self.inputs.tip_clearance.unwrap_or(0.0);
                let current = vessel.variants[index].screw.geometry().diameter;
                SweepParameter::diameters_up_to(current, largest, clearance).map_err(|e| {
                    SweepInputError::BadAperture {
                        boat: vessel.name.clone(),
                        reason: e.to_string(),
                    }
                })?
            }
            SweepOver::GearRatio => SweepParameter::GearRatio(
                values.unwrap_or_else(|| gear_ratios_around(vessel.installation.gear_ratio)),
            ),
            SweepOver::Blades => {
                let list = values.unwrap_or_else(|| USUAL_BLADE_COUNTS.map(f64::from).to_vec());
                if list.iter().any(|b| b.fract() != 0.0) {
                    return Err(SweepInputError::FractionalBlades);
                }
                SweepParameter::Blades(list.into_iter().map(|b| b as u32).collect())
            }
            SweepOver::AreaRatio => {
                SweepParameter::AreaRatio(values.unwrap_or_else(|| USUAL_AREA_RATIOS.to_vec()))
            }
        })
    }

    /// Sweeps `parameter` for variant `index`, each candidate pitched and ranked.
    pub fn sweep(
        &self,
        index: usize,
        parameter: &SweepParameter,
        options: &SweepOptions,
    ) -> anyhow::Result<SweepResult> {
        let mut result = sweep(&self.vessel, index, parameter, options).context("sweep")?;
        self.mark_sweep_ties(&mut result, options.criterion);
        Ok(result)
    }

    /// Marks the sweep's ties by the one rule of `study::ties` (shared with the shortlist).
    fn mark_sweep_ties(&self, result: &mut SweepResult, criterion: RankCriterion) {
        let Some(spread) = self.power_spread() else {
            return;
        };
        let figure = match criterion {
            RankCriterion::LeastFuelPerDistance => TieFigure::FuelPerDistance,
            RankCriterion::HighestTopSpeed => TieFigure::TopSpeed,
            RankCriterion::HighestPropulsiveEfficiency => TieFigure::PropulsiveEfficiency,
        };
        let fastest = result
            .candidates
            .iter()
            .filter_map(|c| c.top_speed)
            .fold(0.0, f64::max);
        let rule = TieRule::of(figure, spread, self.power_exponent_at(fastest));
        let values: Vec<Option<f64>> = result
            .candidates
            .iter()
            .map(|c| {
                (c.rank > 0).then_some(match criterion {
                    RankCriterion::LeastFuelPerDistance => c.fuel_per_distance_at_target,
                    RankCriterion::HighestTopSpeed => c.top_speed,
                    RankCriterion::HighestPropulsiveEfficiency => c.propulsive_efficiency_at_target,
                })?
            })
            .collect();
        let rated = self.vessel.engine.rated_rpm;
        let groups = tie_groups(&values, |_, lead| rule.tolerance(lead, rated));
        let ranks: Vec<usize> = result.candidates.iter().map(|c| c.rank).collect();
        for (c, group) in result.candidates.iter_mut().zip(groups) {
            c.tie_with = group.map(|position| ranks[position - 1]);
        }
        result.tie_band = Some(rule.band);
    }

    /// The calibration of variant `index` against the boat's trial log, fitted to the
    /// uncalibrated model (a saved correction is left out, so refitting never compounds it).
    pub fn calibration(&self, index: usize, fit_wake: bool) -> anyhow::Result<Calibration> {
        let (on, index) = self.trial_variant(index);
        let vessel = &on.vessel;
        if vessel.trial.is_empty() {
            anyhow::bail!(
                "boat {:?} has no sea-trial log ([trial] runs) to compare with",
                vessel.name
            );
        }
        let plain = on.uncalibrated_vessel()?;
        let options = CalibrationOptions {
            fit: if fit_wake {
                CalibrationFit::ResistanceFactorAndWake
            } else {
                CalibrationFit::ResistanceFactor
            },
            ..CalibrationOptions::default()
        };
        calibrate(&plain.system(index), &plain.trial, &options)
            .with_context(|| format!("sea-trial calibration of {}", vessel.name))
    }

    /// The two-parameter fit of the trial log (a factor varying with Froude number), fitted
    /// through the installation the runs were made with on the uncalibrated model.
    pub fn froude_calibration(&self, index: usize) -> anyhow::Result<FroudeFit> {
        let (on, index) = self.trial_variant(index);
        let plain = on.uncalibrated_vessel()?;
        calibrate_by_froude(
            &plain.system(index),
            &plain.trial,
            &CalibrationOptions::default(),
        )
        .with_context(|| format!("two-parameter sea-trial fit of {}", on.vessel.name))
    }

    /// The `[calibration]` for the two-parameter fit `fit` (with the one-factor fit `cal`
    /// beside it, whose factor stays as the file's single figure).
    pub fn froude_calibration_doc(
        &self,
        index: usize,
        cal: &Calibration,
        fit: &FroudeFit,
        by: FittedBy,
    ) -> CalibrationDoc {
        let round = |v: f64| (v * 1e4).round() / 1e4;
        let mut doc = self.calibration_doc(index, cal, by);
        doc.wake_fraction = None;
        let f = fit.factor;
        doc.froude_factor = Some(crate::propulsion::hull::FroudeFactor {
            froude_low: round(f.froude_low),
            low: round(f.low),
            froude_high: round(f.froude_high),
            high: round(f.high),
        });
        if let Some(note) = doc.note.as_mut() {
            note.push_str(&format!(
                "; two-parameter fit ×{:.3} at Fn {:.3} to ×{:.3} at Fn {:.3}, RMS {:.3} kn",
                f.low,
                f.froude_low,
                f.high,
                f.froude_high,
                fit.rms_after / KNOT_MPS
            ));
        }
        doc
    }

    /// The RMS speed error (m/s) of the boat as loaded — with its saved correction — at the
    /// trial's rpm groups, or `None` when the boat has no saved correction or nothing solved.
    pub fn rms_with_saved(&self, index: usize, cal: &Calibration) -> Option<f64> {
        self.doc.calibration.as_ref()?;
        let (on, index) = self.trial_variant(index);
        // Compared as the fit is made: the calibrated calm-water model, margins off.
        let mut calm = on.vessel.clone();
        calm.resistance = calm.resistance.calm_water();
        let system = calm.system(index);
        let errors: Vec<f64> = cal
            .points
            .iter()
            .filter_map(|p| {
                point_at_engine_rpm(&system, p.engine_rpm)
                    .ok()
                    .map(|at| at.speed - p.measured_speed)
            })
            .filter(|e| e.is_finite())
            .collect();
        if errors.is_empty() {
            return None;
        }
        Some((errors.iter().map(|e| e * e).sum::<f64>() / errors.len() as f64).sqrt())
    }

    /// One standard error of the fitted resistance factor (dimensionless): the standard error
    /// of the mean speed residual after the fit, rms / √n, over the speed's sensitivity to the
    /// factor, measured between the model before and after the fit. `None` when the fit did
    /// not move the factor (no sensitivity to read) or nothing was predicted.
    pub fn factor_uncertainty(cal: &Calibration) -> Option<f64> {
        let change = cal.resistance_factor - cal.resistance_factor_before;
        let shifts: Vec<f64> = cal
            .points
            .iter()
            .filter_map(|p| Some(p.predicted_after? - p.predicted_before?))
            .filter(|d| d.is_finite())
            .collect();
        if change.abs() < 1e-6 || shifts.is_empty() {
            return None;
        }
        let slope = shifts.iter().sum::<f64>() / shifts.len() as f64 / change;
        let error = cal.rms_after / (cal.points.len() as f64).sqrt();
        let sigma = error / slope.abs();
        (sigma.is_finite() && slope != 0.0).then_some(sigma)
    }

    /// The study and variant the trial log was run with: the as-found installation's screw
    /// when the log belongs to it (whatever variant is asked), else variant `index` here.
    pub fn trial_variant(&self, index: usize) -> (&Study, usize) {
        let on = self.trial_study();
        if std::ptr::eq(on, self) {
            (self, index)
        } else {
            (on, super::active_variant(&on.vessel))
        }
    }

    /// Which installation the trial log is fitted through, in words: "the as-found
    /// installation (ENGINE, G:1, screw LABEL)" or "screw LABEL".
    pub fn trial_installation_words(&self, index: usize) -> String {
        let (on, index) = self.trial_variant(index);
        if std::ptr::eq(on, self) {
            format!("screw {}", self.label(index))
        } else {
            format!(
                "the as-found installation ({}, {:.2}:1, screw {})",
                on.vessel.engine.name,
                on.vessel.installation.gear_ratio,
                on.label(index)
            )
        }
    }

    /// The `[calibration]` to write into the boat file for fit `cal` of variant `index`.
    pub fn calibration_doc(&self, index: usize, cal: &Calibration, by: FittedBy) -> CalibrationDoc {
        let rpms = cal.points.iter().map(|p| p.engine_rpm);
        let (low, high) = rpms.fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), r| {
            (lo.min(r), hi.max(r))
        });
        let fitted = if cal.wake_fraction.is_some() {
            "resistance factor and wake fraction"
        } else {
            "resistance factor"
        };
        let on = today_iso().map(|d| format!(" on {d}")).unwrap_or_default();
        // Four decimals are far finer than a trial can resolve and keep the file readable.
        let round = |v: f64| (v * 1e4).round() / 1e4;
        CalibrationDoc {
            resistance_factor: round(cal.resistance_factor),
            wake_fraction: cal.wake_fraction.map(round),
            froude_factor: None,
            trial_date: self.doc.trial.as_ref().and_then(|t| t.date.clone()),
            note: Some(format!(
                "{fitted} fitted{on} {} {CALM_WATER_NOTE} to {} rpm groups from {low:.0} to {high:.0} rpm, {}; RMS error {:.3} kn before, {:.3} kn after",
                by.words(),
                cal.points.len(),
                self.trial_installation_words(index),
                cal.rms_before / KNOT_MPS,
                cal.rms_after / KNOT_MPS
            )),
        }
    }
}

/// Days since 1970-01-01 as a proleptic Gregorian (year, month, day): H. Hinnant's
/// `civil_from_days` ("chrono-Compatible Low-Level Date Algorithms", 2013).
pub fn civil_from_days(days: i64) -> (i64, u32, u32) {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let day = (doy - (153 * mp + 2) / 5 + 1) as u32;
    let month = if mp < 10 { mp + 3 } else { mp - 9 } as u32;
    let year = yoe + era * 400 + i64::from(month <= 2);
    (year, month, day)
}

/// Today's date (UTC) from the system clock as YYYY-MM-DD, if the clock is after 1970.
pub(crate) fn today_iso() -> Option<String> {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .ok()?
        .as_secs();
    let (y, m, d) = civil_from_days((secs / 86_400) as i64);
    Some(format!("{y:04}-{m:02}-{d:02}"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn civil_dates_from_day_counts() {
        // Day numbers checked against the Unix epoch and the Gregorian calendar: 1970-01-01 is
        // day 0, 2000-03-01 day 11 017 (after a century leap day), 2024-02-29 day 19 782.
        assert_eq!(civil_from_days(0), (1970, 1, 1));
        assert_eq!(civil_from_days(11_017), (2000, 3, 1));
        assert_eq!(civil_from_days(11_016), (2000, 2, 29));
        assert_eq!(civil_from_days(19_782), (2024, 2, 29));
        assert_eq!(civil_from_days(-1), (1969, 12, 31));
    }
}
