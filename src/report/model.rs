//! The report model of one boat, built once from a study: boat, engine, trip, every screw
//! variant's solution (operating rows, match, target-speed cruise, duty, method spread), the
//! checks, the warnings, the calibration in force and the methods. The writers lay it out:
//! `report::text` (text, Markdown, CSV), `report::json` (JSON), `report::export` (Markdown with
//! SVG charts). The model imports none of them.

use super::Display;
use crate::study::baseline::{Baseline, Headline};
use serde::Serialize;

use super::checks::{AppliedCalibration, CheckInputs, DesignChecks};
use crate::propulsion::engine::Duty;
use crate::propulsion::hull::{ResistanceModel, UNRELIABLE_WORDS};
use crate::propulsion::solver::OperatingPoint;
use crate::propulsion::solver::{MatchResult, Trip, Vessel};
use crate::study::solve::{BadStep, SolveOptions, VariantSolution, solve_variant};
use crate::study::{Study, UnknownVariant};
use crate::units::KNOT_MPS;

pub use crate::study::solve::{RpmRow, default_step, rpm_steps};

#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ReportError {
    /// No screw variant has the label asked for.
    #[error("boat {boat:?} has no screw variant {label:?}; its variants are: {known}")]
    UnknownVariant {
        /// The boat.
        boat: String,
        /// The label asked for.
        label: String,
        /// The labels it has, comma-separated.
        known: String,
    },
    /// The rpm step is not a positive number or gives too many rows.
    #[error("rpm step {0} is not usable: expected a positive number giving at most 400 rows")]
    BadStep(f64),
}

impl From<UnknownVariant> for ReportError {
    fn from(e: UnknownVariant) -> Self {
        ReportError::UnknownVariant {
            boat: e.boat,
            label: e.label,
            known: e.known,
        }
    }
}

impl From<BadStep> for ReportError {
    fn from(BadStep(step): BadStep) -> Self {
        ReportError::BadStep(step)
    }
}

/// The engine sheet as the report shows it.
#[derive(Debug, Clone, PartialEq)]
pub struct EngineSummary {
    /// The sheet's name.
    pub name: String,
    /// Rated speed, rpm.
    pub rated_rpm: f64,
    /// Power at rated rpm, W.
    pub rated_power: f64,
    /// Idle speed, rpm.
    pub idle_rpm: f64,
    /// Duty rating, if given.
    pub duty: Option<Duty>,
    /// Full-throttle time limit, s, if given.
    pub full_throttle_limit: Option<f64>,
}

/// Everything the report shows for one screw variant: the study's solution of it.
pub type VariantReport = VariantSolution;

/// Which resistance and interaction methods were used, and why.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MethodSummary {
    /// The resistance method used.
    pub resistance: &'static str,
    /// The interaction method used.
    pub interaction: &'static str,
    /// Why the core picked it when the boat names none; null when the boat names it.
    pub reason: Option<String>,
    /// The alternative method computed beside it, if any.
    pub alternative: Option<&'static str>,
}

impl MethodSummary {
    /// The methods of `vessel`.
    pub fn of(vessel: &Vessel) -> Self {
        let choice = vessel.method_choice.as_ref();
        Self {
            resistance: vessel.resistance.method.name(),
            interaction: vessel.interaction.name(),
            reason: choice.map(|c| c.reason.clone()),
            alternative: choice.and_then(|c| c.alternative.as_ref().map(|m| m.name())),
        }
    }

    /// "Resistance: … · interaction: … (chosen: reason)" for the text report and the TUI.
    pub fn line(&self) -> String {
        let why = match &self.reason {
            Some(reason) => format!("chosen because {reason}"),
            None => "named in the boat file".into(),
        };
        format!(
            "Resistance: {} · interaction: {} ({why})",
            self.resistance, self.interaction
        )
    }
}

/// The report of one boat, in SI.
#[derive(Debug, Clone, PartialEq)]
pub struct BoatReport {
    /// The boat's name.
    pub boat: String,
    /// Its engine sheet.
    pub engine: EngineSummary,
    /// Its trip (target speed, tank).
    pub trip: Trip,
    /// One entry per variant reported.
    pub variants: Vec<VariantReport>,
    /// Warnings from every model involved, without duplicates.
    pub warnings: Vec<String>,
    /// The sea-trial correction applied to every prediction, if the boat has one.
    pub calibration: Option<AppliedCalibration>,
    /// Cavitation, blade loading and shaft checks, when asked for.
    pub checks: Option<DesignChecks>,
    /// The methods used and why.
    pub methods: MethodSummary,
    /// Shafts fitted (1 or 2): on a twin each has its own engine, gear and screw, handed.
    pub shafts: u32,
    /// The boat as it is today, the planned figures are compared with (`None` without
    /// `[as_found]`).
    pub baseline: Option<Baseline>,
    /// The resistance model the variants were solved on: it says why a point is unreliable.
    pub resistance: ResistanceModel,
}

/// Why `point`, solved on `resistance`, is unreliable ([`label`](crate::propulsion::hull::SpeedValidity::label)), or `None`
/// when the core put it inside the method's range; the point's own flag decides.
pub fn unreliable_label(resistance: &ResistanceModel, point: &OperatingPoint) -> Option<String> {
    if point.in_method_range {
        return None;
    }
    Some(
        resistance
            .validity_at(point.speed)
            .label()
            .unwrap_or_else(|| UNRELIABLE_WORDS.to_owned()),
    )
}

/// The loud warning when a variant's full-throttle point lies outside the resistance method.
pub fn full_throttle_warning(label: &str, m: &MatchResult, method: &str, reason: &str) -> String {
    format!(
        "FULL THROTTLE OUTSIDE THE METHOD'S RANGE (screw {label}): at {:.0} rpm the boat would run at {:.1} kn, where {reason}. {method} is not valid there: the top speed, the verdict and any pitch chosen at full throttle are extrapolations — a sea trial (`tidewright trial`) or a resistance table decides",
        m.meeting_rpm,
        m.top_speed / KNOT_MPS
    )
}

impl BoatReport {
    /// Why `point` is unreliable, in the core's words ([`label`](crate::propulsion::hull::SpeedValidity::label)), or `None`
    /// when it lies inside the method's range.
    pub fn unreliable_label(&self, point: &OperatingPoint) -> Option<String> {
        unreliable_label(&self.resistance, point)
    }

    /// Whether the boat has two engines on two shafts.
    pub fn is_twin(&self) -> bool {
        self.shafts >= 2
    }

    /// Solves `vessel` for the report: every variant, or only the one labelled `variant`.
    pub fn build(
        vessel: &Vessel,
        variant: Option<&str>,
        step_rpm: Option<f64>,
        extra_warnings: &[String],
    ) -> Result<Self, ReportError> {
        let indices = variant_indices(vessel, variant)?;
        let engine = &vessel.engine;
        let step = step_rpm.unwrap_or_else(|| default_step(engine.idle_rpm, engine.rated_rpm));
        let rpms = rpm_steps(engine.idle_rpm, engine.rated_rpm, step)?;
        let options = SolveOptions::table(rpms);
        let variants = indices
            .iter()
            .map(|&i| solve_variant(vessel, i, &options))
            .collect();
        Ok(Self::of_solutions(vessel, variants, extra_warnings))
    }

    /// The report of `study`: every variant or the one labelled `variant`, operating rows every
    /// `step_rpm` (a round default when `None`), the study's "estimated: …" notes first among
    /// the warnings, its calibration and the checks with its installation data.
    pub fn of_study(
        study: &Study,
        variant: Option<&str>,
        step_rpm: Option<f64>,
    ) -> Result<Self, ReportError> {
        let indices = study.variants(variant)?;
        let options = SolveOptions::table(study.rpm_rows(step_rpm)?);
        let variants = study.solve_variants(&indices, &options);
        Ok(
            Self::of_solutions(&study.vessel, variants, &study.estimated)
                .with_calibration(study.calibration.clone())
                .with_checks(&study.vessel, &study.inputs)
                .with_baseline(study.baseline_figures()),
        )
    }

    /// The curves of `study` for the charts: every variant every `step_rpm`, no checks.
    pub fn curves_of_study(study: &Study, step_rpm: f64) -> Result<Self, ReportError> {
        let indices = study.variants(None)?;
        let options = SolveOptions::table(study.rpm_rows(Some(step_rpm))?);
        let variants = study.solve_variants(&indices, &options);
        Ok(Self::of_solutions(&study.vessel, variants, &[]))
    }

    /// The report of `variants` of `vessel`, already solved by the study; `extra_warnings` lead
    /// the core's.
    pub fn of_solutions(
        vessel: &Vessel,
        variants: Vec<VariantSolution>,
        extra_warnings: &[String],
    ) -> Self {
        let engine = &vessel.engine;
        let mut warnings: Vec<String> = extra_warnings.to_vec();
        let mut add = |w: String| {
            if !warnings.contains(&w) {
                warnings.push(w);
            }
        };
        vessel
            .resistance
            .warnings()
            .iter()
            .for_each(|w| add(w.to_string()));
        vessel
            .resistance
            .warnings_at(vessel.trip.target_speed)
            .iter()
            .for_each(|w| add(w.to_string()));
        match engine.validate() {
            Ok(ws) => ws.iter().for_each(|w| add(w.to_string())),
            Err(e) => add(format!("engine sheet {}: {e}", engine.name)),
        }
        let mut full_throttle_warnings = Vec::new();
        for v in &variants {
            v.warnings
                .iter()
                .for_each(|w| add(format!("{}: {w}", v.label)));
            if let Some(w) = &v.interaction_warning {
                add(format!("{}: {w}", v.label));
            }
            if let Ok(m) = &v.matched
                && let Some(reason) = m.top_validity.reason()
            {
                full_throttle_warnings.push(full_throttle_warning(
                    &v.label,
                    m,
                    vessel.resistance.method.name(),
                    &reason,
                ));
            }
        }
        // The full-throttle warnings lead: the pitch is decided there.
        for w in full_throttle_warnings.into_iter().rev() {
            if !warnings.contains(&w) {
                warnings.insert(0, w);
            }
        }
        Self {
            boat: vessel.name.clone(),
            engine: EngineSummary {
                name: engine.name.clone(),
                rated_rpm: engine.rated_rpm,
                rated_power: engine.rated_power(),
                idle_rpm: engine.idle_rpm,
                duty: engine.duty,
                full_throttle_limit: engine.full_throttle_limit,
            },
            trip: vessel.trip,
            variants,
            warnings,
            calibration: None,
            checks: None,
            methods: MethodSummary::of(vessel),
            shafts: vessel.installation.shafts,
            baseline: None,
            resistance: vessel.resistance.clone(),
        }
    }

    /// The report with the as-found baseline its variants are compared with.
    pub fn with_baseline(mut self, baseline: Option<Baseline>) -> Self {
        self.baseline = baseline;
        self
    }

    /// Each variant's change from the baseline (`None` without one), in variant order.
    pub fn deltas(&self) -> Vec<Option<Headline>> {
        self.variants
            .iter()
            .map(|v| {
                self.baseline
                    .as_ref()
                    .map(|b| Headline::of(v).change_from(&b.figures))
            })
            .collect()
    }

    /// The before/after section: the baseline and, per variant, its figures beside it.
    pub fn before_after_text(&self, d: &Display) -> Option<String> {
        self.before_after(d, "", |t| t.to_text("  "))
    }

    /// The before/after section in Markdown.
    pub fn before_after_markdown(&self, d: &Display) -> Option<String> {
        self.before_after(d, "- ", super::table::Table::to_markdown)
    }

    /// The before/after section with lines led by `bullet` and tables laid out by `table`.
    fn before_after(
        &self,
        d: &Display,
        bullet: &str,
        table: impl Fn(&super::table::Table) -> String,
    ) -> Option<String> {
        let b = self.baseline.as_ref()?;
        let mut out = String::new();
        for line in super::baseline::baseline_lines(b, d) {
            out.push_str(&format!("{bullet}{line}\n"));
        }
        for v in &self.variants {
            out.push('\n');
            let planned = format!("screw {}", v.label);
            out.push_str(&table(&super::baseline::before_after_table(
                b,
                &planned,
                &Headline::of(v),
                d,
            )));
        }
        Some(out)
    }

    /// The report with the sea-trial correction it was solved with, shown wherever it is.
    pub fn with_calibration(mut self, calibration: Option<AppliedCalibration>) -> Self {
        self.calibration = calibration;
        self
    }

    /// The report with the cavitation, blade-loading and shaft checks; a check past its
    /// limit is added to the warnings.
    pub fn with_checks(mut self, vessel: &Vessel, inputs: &CheckInputs) -> Self {
        let checks = DesignChecks::build(vessel, &self.variants, inputs);
        for w in checks.warnings() {
            if !self.warnings.contains(&w) {
                self.warnings.push(w);
            }
        }
        self.checks = Some(checks);
        self
    }
}

fn variant_indices(vessel: &Vessel, label: Option<&str>) -> Result<Vec<usize>, ReportError> {
    match label {
        None => Ok((0..vessel.variants.len()).collect()),
        Some(label) => vessel
            .variant_by_label(label)
            .map(|i| vec![i])
            .ok_or_else(|| ReportError::UnknownVariant {
                boat: vessel.name.clone(),
                label: label.to_string(),
                known: vessel.variant_labels(),
            }),
    }
}
