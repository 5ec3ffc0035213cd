//! The design views' results — sweep, sea-trial calibration, what-if conditions and the repower
//! shortlist (over the engine sheets the loop read from the store) — computed
//! by the solver when a view opens (and again after an edit while it is open) and cached in the
//! app state; drawing only reads them. All values are SI (rpm as rpm).

use crate::profile::{BoatDoc, CalibrationDoc};
use crate::propulsion::solver::conditions::{Condition, ConditionOutcome, UncertaintyBand};
use crate::propulsion::solver::sweep::{SweepOptions, SweepParameter, SweepResult};
use crate::propulsion::solver::trial::Calibration;
use crate::study::Study;
use crate::study::design::FittedBy;
pub use crate::study::design::SweepOver;
use crate::study::progress::Progress;
use crate::study::shortlist::{
    Candidate, Offer, Shortlist, ShortlistError, ShortlistOptions, ShortlistRank,
};
use crate::study::what_if::WhatIfSettings;
use crate::tui::app::Document;

/// Fouling of the "fouled" what-if, fraction of friction: the study's one definition (the
/// case sets the fouling to this; it is not added to the boat's own).
pub const FOULED_EXTRA: f64 = WHAT_IF.fouled;
/// Sea-state margin of the "sea state" what-if, fraction of resistance: the study's one
/// definition (the case sets the margin to this; it is not added to the boat's own).
pub const SEA_STATE_EXTRA: f64 = WHAT_IF.sea_margin;

/// The what-if settings the view uses: the same defaults as `conditions`.
const WHAT_IF: WhatIfSettings = WhatIfSettings::DEFAULT;

/// Which design view is open.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ViewKind {
    /// Candidates of one swept parameter, each with its matching pitch, ranked.
    Sweep,
    /// The sea-trial log against the model, and the fitted correction.
    Calibration,
    /// The boat under other loads, fouling and sea state; the uncertainty band; the checks.
    WhatIf,
    /// Every engine sheet of the store with its offered gears and a screw sized for each, ranked.
    Shortlist,
}

impl ViewKind {
    /// Every view, in the order Tab cycles them.
    pub const ALL: [ViewKind; 4] = [
        ViewKind::Sweep,
        ViewKind::Calibration,
        ViewKind::WhatIf,
        ViewKind::Shortlist,
    ];

    /// The view's title.
    pub fn title(self) -> &'static str {
        match self {
            ViewKind::Sweep => "Sweep",
            ViewKind::Calibration => "Sea-trial calibration",
            ViewKind::WhatIf => "What-if conditions",
            ViewKind::Shortlist => "Repower shortlist",
        }
    }

    /// The next view (wrapping).
    pub fn next(self) -> Self {
        let i = Self::ALL.iter().position(|k| *k == self).unwrap_or(0);
        Self::ALL[(i + 1) % Self::ALL.len()]
    }

    /// The previous view (wrapping).
    pub fn prev(self) -> Self {
        let i = Self::ALL.iter().position(|k| *k == self).unwrap_or(0);
        Self::ALL[(i + Self::ALL.len() - 1) % Self::ALL.len()]
    }
}

/// A sweep of the active variant.
#[derive(Debug, Clone, PartialEq)]
pub struct SweepView {
    /// What was swept.
    pub over: SweepOver,
    /// The active variant's label.
    pub label: String,
    /// The largest diameter the aperture takes with the tip clearance kept, m (diameter sweeps).
    pub max_diameter: Option<f64>,
    /// The ranked candidates, or why the sweep could not be made.
    pub result: Result<SweepResult, String>,
}

/// The sea-trial calibration of the active variant against the uncalibrated model.
#[derive(Debug, Clone, PartialEq)]
pub struct CalibrationView {
    /// The trial's date, if logged.
    pub trial_date: Option<String>,
    /// Number of runs in the log.
    pub runs: usize,
    /// The calibration, or why there is none (no log, nothing predicted).
    pub result: Result<Calibration, String>,
    /// The resistance factor the boat currently applies, if it has a calibration.
    pub applied: Option<f64>,
    /// The `[calibration]` the study writes for this fit (the same path as `trial --save`).
    pub doc: Option<CalibrationDoc>,
    /// The two-parameter fit (a factor varying with Froude number), or why there is none.
    pub froude: Result<crate::propulsion::solver::trial::FroudeFit, String>,
    /// The `[calibration]` for the two-parameter fit (`trial --save --by-froude`).
    pub froude_doc: Option<CalibrationDoc>,
    /// The installation the runs were made with and are fitted through, in words.
    pub installation: String,
}

impl CalibrationView {
    /// The correction to write into the boat document, when the fit improved on the model.
    pub fn correction(&self) -> Option<CalibrationDoc> {
        let cal = self.result.as_ref().ok()?;
        (cal.rms_after < cal.rms_before)
            .then(|| self.doc.clone())
            .flatten()
    }

    /// The two-parameter correction, when it improves on the model.
    pub fn froude_correction(&self) -> Option<CalibrationDoc> {
        let cal = self.result.as_ref().ok()?;
        let fit = self.froude.as_ref().ok()?;
        (fit.rms_after < cal.rms_before)
            .then(|| self.froude_doc.clone())
            .flatten()
    }
}

/// The active variant under each what-if condition, and the uncertainty band.
#[derive(Debug, Clone, PartialEq)]
pub struct WhatIfView {
    /// The active variant's label.
    pub label: String,
    /// "as given", then light / half / full load (those the file gives), fouled and sea state.
    pub outcomes: Result<Vec<ConditionOutcome>, String>,
}

/// The repower shortlist of the boat over the store's engine sheets.
#[derive(Debug, Clone, PartialEq)]
pub struct ShortlistView {
    /// The ranked candidates, or why there is no shortlist.
    pub result: Result<Shortlist, String>,
}

impl ShortlistView {
    /// The candidate at `row`, if the shortlist has one there.
    pub fn candidate(&self, row: usize) -> Option<&Candidate> {
        self.result.as_ref().ok()?.candidates.get(row)
    }

    /// The row of the candidate with this engine sheet and gear ratio, if it is listed.
    pub fn row_of(&self, engine: &str, gear_ratio: f64) -> Option<usize> {
        let position = self.result.as_ref().ok()?.position_of(engine, gear_ratio)?;
        Some(position - 1)
    }

    /// Sorts the candidates again by `rank` (no re-solving: only the order and ties change).
    pub fn rank_by(&mut self, rank: ShortlistRank) {
        if let Ok(list) = &mut self.result {
            list.rank_by(rank);
        }
    }
}

/// What the design views are solved with besides the document.
#[derive(Debug, Clone, Copy)]
pub struct ViewInputs<'a> {
    /// The parameter the sweep view sweeps.
    pub over: SweepOver,
    /// The engine sheets the loop read from the store for the shortlist (empty: not read).
    pub offers: &'a [Offer],
    /// The shortlist's ranking.
    pub rank: ShortlistRank,
}

/// The results of the open view.
#[derive(Debug, Clone, PartialEq)]
pub enum ViewData {
    /// A sweep.
    Sweep(SweepView),
    /// A calibration.
    Calibration(CalibrationView),
    /// The what-if comparison.
    WhatIf(WhatIfView),
    /// The repower shortlist.
    Shortlist(ShortlistView),
}

impl ViewData {
    /// Solves `kind` for the active variant of `boat` (sweeping `inputs.over` for a sweep,
    /// over `inputs.offers` for the shortlist).
    pub fn compute(kind: ViewKind, inputs: ViewInputs<'_>, doc: &Document) -> Self {
        match kind {
            ViewKind::Sweep => ViewData::Sweep(sweep_view(inputs.over, doc)),
            ViewKind::Calibration => ViewData::Calibration(calibration_view(doc)),
            ViewKind::WhatIf => ViewData::WhatIf(what_if_view(doc)),
            ViewKind::Shortlist => ViewData::Shortlist(ShortlistView {
                result: shortlist(doc, inputs.offers, inputs.rank),
            }),
        }
    }

    /// Which view these results are for.
    pub fn kind(&self) -> ViewKind {
        match self {
            ViewData::Sweep(_) => ViewKind::Sweep,
            ViewData::Calibration(_) => ViewKind::Calibration,
            ViewData::WhatIf(_) => ViewKind::WhatIf,
            ViewData::Shortlist(_) => ViewKind::Shortlist,
        }
    }
}

fn active_label(boat: &BoatDoc) -> String {
    boat.variants
        .get(boat.active_variant)
        .map(|v| v.label.clone())
        .unwrap_or_default()
}

/// The sweep parameter for `over` of the active variant: the study's one definition.
pub fn sweep_parameter(over: SweepOver, study: &Study) -> Result<SweepParameter, String> {
    study
        .sweep_parameter(study.vessel.active_variant, over, None)
        .map_err(|e| e.to_string())
}

fn sweep_view(over: SweepOver, doc: &Document) -> SweepView {
    let label = active_label(&doc.boat);
    let study = match doc.study() {
        Ok(s) => s,
        Err(why) => {
            return SweepView {
                over,
                label,
                max_diameter: None,
                result: Err(why),
            };
        }
    };
    let parameter = sweep_parameter(over, &study);
    let max_diameter = match &parameter {
        Ok(SweepParameter::Diameter { aperture, .. }) => Some(aperture.max_diameter()),
        _ => None,
    };
    let result = parameter.and_then(|p| {
        study
            .sweep(study.vessel.active_variant, &p, &SweepOptions::default())
            .map_err(|e| format!("{e:#}"))
    });
    SweepView {
        over,
        label,
        max_diameter,
        result,
    }
}

fn calibration_view(doc: &Document) -> CalibrationView {
    let boat = &doc.boat;
    let runs = boat.trial.as_ref().map_or(0, |t| t.runs.len());
    let trial_date = boat.trial.as_ref().and_then(|t| t.date.clone());
    let applied = boat.calibration.as_ref().map(|c| c.resistance_factor);
    let fitted = if runs == 0 {
        Err("this boat has no sea-trial log: add [[trial.run]] entries (rpm, speed, direction) to its file to compare the model with measured speeds".into())
    } else {
        // The study fits against the model without any saved correction, so the view reads
        // the same before and after the correction is applied.
        doc.study().and_then(|study| {
            let index = study.vessel.active_variant;
            // Only worth a line when the runs were made on another installation than planned.
            let words = if study.baseline.is_some() {
                study.trial_installation_words(index)
            } else {
                String::new()
            };
            study
                .calibration(index, false)
                .map(|cal| {
                    let doc = study.calibration_doc(index, &cal, FittedBy::TerminalUi);
                    let froude = study
                        .froude_calibration(index)
                        .map_err(|e| format!("{:#}", e.root_cause()));
                    let froude_doc = froude.as_ref().ok().map(|fit| {
                        study.froude_calibration_doc(index, &cal, fit, FittedBy::TerminalUi)
                    });
                    (cal, doc, froude, froude_doc, words)
                })
                .map_err(|e| format!("{:#}", e.root_cause()))
        })
    };
    let (result, doc, froude, froude_doc, installation) = match fitted {
        Ok((cal, doc, froude, froude_doc, words)) => {
            (Ok(cal), Some(doc), froude, froude_doc, words)
        }
        Err(e) => (Err(e.clone()), None, Err(e), None, String::new()),
    };
    CalibrationView {
        trial_date,
        runs,
        result,
        applied,
        doc,
        froude,
        froude_doc,
        installation,
    }
}

/// The shortlist of `boat` over `offers` (each sheet's offered gears, else the boat's own),
/// ranked by `rank`: the study's one definition, as `tidewright shortlist` gives it.
fn shortlist(doc: &Document, offers: &[Offer], rank: ShortlistRank) -> Result<Shortlist, String> {
    shortlist_counted(doc, offers, rank, &Progress::new())
        .unwrap_or_else(|| Err("the shortlist was cancelled".into()))
}

/// The shortlist of the document over `offers`, each candidate counted in `progress`; `None`
/// when `progress` was cancelled before it was done.
pub fn shortlist_counted(
    doc: &Document,
    offers: &[Offer],
    rank: ShortlistRank,
    progress: &Progress,
) -> Option<Result<Shortlist, String>> {
    if offers.is_empty() {
        return Some(Err(
            "no engine sheets were read from the store (S reads them)".into(),
        ));
    }
    let study = match doc.study() {
        Ok(study) => study,
        Err(why) => return Some(Err(why)),
    };
    let options = ShortlistOptions { gears: None, rank };
    match study.shortlist_counted(offers, &options, progress) {
        Err(ShortlistError::Cancelled) => None,
        other => Some(other.map_err(|e| e.to_string())),
    }
}

/// The sweep view of the document over `over` (the work a background solve does for the sweep).
pub fn sweep_of(over: SweepOver, doc: &Document) -> SweepView {
    sweep_view(over, doc)
}

/// The what-if conditions of `study`: the study's one definition of the cases.
pub fn conditions(study: &Study) -> Vec<Condition> {
    study
        .what_if_cases(&WHAT_IF)
        .into_iter()
        .map(|c| c.condition)
        .collect()
}

fn what_if_view(doc: &Document) -> WhatIfView {
    let label = active_label(&doc.boat);
    let outcomes = doc.study().and_then(|study| {
        let shorts = study.what_if_short_labels(&WHAT_IF);
        study
            .what_if_outcomes(study.vessel.active_variant, &WHAT_IF)
            .map(|outcomes| short_named(outcomes, &shorts))
            .map_err(|e| format!("{:#}", e.root_cause()))
    });
    WhatIfView { label, outcomes }
}

/// The outcomes under the short names the narrow table shows.
fn short_named(mut outcomes: Vec<ConditionOutcome>, shorts: &[&str]) -> Vec<ConditionOutcome> {
    for (o, short) in outcomes.iter_mut().zip(shorts) {
        o.condition.label = (*short).to_string();
    }
    outcomes
}

/// The active variant's propeller curve as a band over displacement ±10 % and wake ±0.05, with
/// the recommended pitch's range over the same cases.
pub fn band(doc: &Document) -> Result<UncertaintyBand, String> {
    let study = doc.study()?;
    study.band(study.vessel.active_variant, &WHAT_IF)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::profile::Store;

    fn demo(name: &str) -> crate::tui::app::App {
        let store = Store::at(std::env::temp_dir().join("tidewright-analysis-tests-no-store"));
        crate::tui::open_app(&store, Some(name)).expect("demo boat opens")
    }

    #[test]
    fn diameter_sweep_reaches_the_profiles_largest_screw() {
        let app = demo("pintle");
        let study = Study::of_documents(&app.doc.boat, &app.doc.engine).unwrap();
        let Ok(SweepParameter::Diameter { aperture, .. }) =
            sweep_parameter(SweepOver::Diameter, &study)
        else {
            panic!("a diameter sweep")
        };
        // pintle: max_screw_diameter = 500 mm with 60 mm tip clearance.
        assert!((aperture.max_diameter() - 0.5).abs() < 1e-12);
        let mut boat = app.doc.boat.clone();
        boat.installation.max_screw_diameter = None;
        let study = Study::of_documents(&boat, &app.doc.engine).unwrap();
        let err = sweep_parameter(SweepOver::Diameter, &study).unwrap_err();
        assert!(err.contains("max_screw_diameter"), "{err}");
    }

    #[test]
    fn what_if_conditions_are_the_files_loads_then_fouled_and_sea_state() {
        let app = demo("pintle");
        let study = Study::of_documents(&app.doc.boat, &app.doc.engine).unwrap();
        let vessel = &study.vessel;
        let list = conditions(&study);
        let labels: Vec<&str> = list.iter().map(|c| c.label.as_str()).collect();
        assert_eq!(
            labels,
            [
                "light",
                "half load",
                "full load",
                "fouled hull (+30 % friction)",
                "seaway (30 % sea-state margin)"
            ]
        );
        // pintle's light load is 4.2 t in sea water.
        let light = list[0].displacement_volume.unwrap();
        assert!((light * vessel.resistance.water.density - 4200.0).abs() < 1e-6);
        // One definition with `conditions`: the cases set fouling and margin, never add to
        // the boat's own (pintle's are 10 % and 15 %).
        assert!((list[3].fouling.unwrap() - FOULED_EXTRA).abs() < 1e-12);
        assert!((list[4].service_margin.unwrap() - SEA_STATE_EXTRA).abs() < 1e-12);
    }

    #[test]
    fn a_correction_is_offered_only_when_the_fit_improves() {
        let app = demo("pintle");
        let inputs = ViewInputs {
            over: SweepOver::Diameter,
            offers: &[],
            rank: ShortlistRank::Fuel,
        };
        let ViewData::Calibration(view) =
            ViewData::compute(ViewKind::Calibration, inputs, &app.doc)
        else {
            panic!("calibration view")
        };
        let correction = view.correction().expect("pintle's fit improves");
        assert_eq!(correction.trial_date.as_deref(), Some("2024-05-18"));
        let mut worse = view.clone();
        if let Ok(cal) = &mut worse.result {
            cal.rms_after = cal.rms_before;
        }
        assert!(worse.correction().is_none());
    }

    #[test]
    fn views_cycle_both_ways() {
        for kind in ViewKind::ALL {
            assert_eq!(kind.next().prev(), kind);
        }
        assert_eq!(SweepOver::AreaRatio.next(), SweepOver::Diameter);
    }

    #[test]
    fn what_if_view_shows_the_numbers_of_conditions_for_every_demo_boat() {
        // One definition of the cases: the view and the report model of `conditions` agree.
        let store = Store::at(std::env::temp_dir().join("tidewright-analysis-tests-no-store"));
        let boats = store.list_boats().expect("the demo fleet lists");
        assert!(boats.len() >= 2, "{boats:?}");
        for name in boats {
            let mut app = demo(&name);
            // Open the view as the user does: the `w` key → its action → App::update.
            let w = crossterm::event::KeyEvent::new(
                crossterm::event::KeyCode::Char('w'),
                crossterm::event::KeyModifiers::NONE,
            );
            let action = app.action_for_key(&w).expect("`w` opens the what-if view");
            app.update(action);
            let Some(ViewData::WhatIf(view)) = app.view.clone() else {
                panic!("{name}: `w` did not open the what-if view")
            };
            let outcomes = view.outcomes.expect("the view solves");
            let study = Study::of_documents(&app.doc.boat, &app.doc.engine).unwrap();
            let model = study
                .what_if(study.vessel.active_variant, &WhatIfSettings::default())
                .unwrap();
            let json = crate::report::what_if::what_if_json(&study, &model);
            assert_eq!(outcomes.len(), json.conditions.len(), "{name}");
            for (o, row) in outcomes.iter().zip(&json.conditions) {
                let kn = o.top_speed.map(|v| v / crate::units::KNOT_MPS);
                assert_eq!(kn, row.top_speed_kn, "{name} {}", row.label);
                assert_eq!(o.cruise_rpm, row.cruise_rpm, "{name} {}", row.label);
                assert_eq!(o.verdict, row.verdict, "{name} {}", row.label);
            }
        }
    }
}
