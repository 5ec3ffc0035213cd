//! The design views' part of [`super::App::update`]: opening and refreshing a view, the
//! shortlist's ranking and taking a candidate, the live feed's commands, applying a fit.

use super::*;
use crate::tui::work;

impl App {
    /// The open view's kind, if a view is open.
    pub fn view_kind(&self) -> Option<ViewKind> {
        match self.overlay {
            Overlay::View { kind, .. } => Some(kind),
            _ => None,
        }
    }

    /// Opens view `kind` and solves it.
    pub(super) fn open_view(&mut self, kind: ViewKind) {
        self.overlay = Overlay::View { kind, scroll: 0 };
        self.refresh_analysis();
    }

    /// Re-solves the open view and the uncertainty band, when they are wanted. The shortlist's
    /// highlight stays on the same engine and gear when it is still listed.
    pub(super) fn refresh_analysis(&mut self) {
        let kind = self.view_kind();
        let was_computing = self.computing.take().is_some();
        match kind {
            Some(kind) if self.background && work::solved_in_background(kind) => {
                self.ask_solve(kind);
            }
            _ => {
                if was_computing {
                    self.outbox = Some(Effect::CancelSolve);
                }
                let highlighted = self.highlighted_candidate();
                let inputs = ViewInputs {
                    over: self.sweep_over,
                    offers: &self.offers,
                    rank: self.shortlist_rank,
                };
                self.view = kind.map(|kind| ViewData::compute(kind, inputs, &self.doc));
                self.keep_highlight(highlighted);
            }
        }
        let band_wanted = self.band_shown || kind == Some(ViewKind::WhatIf);
        self.band = band_wanted.then(|| analysis::band(&self.doc));
    }

    /// Asks the loop to solve view `kind` on its worker; the results so far stay on screen
    /// under the progress line when they are of the same view.
    fn ask_solve(&mut self, kind: ViewKind) {
        self.last_job += 1;
        let id = self.last_job;
        self.computing = Some(Computing {
            id,
            kind,
            done: 0,
            total: 0,
        });
        if self.view.as_ref().map(ViewData::kind) != Some(kind) {
            self.view = None;
        }
        self.outbox = Some(Effect::Solve(Box::new(Job {
            id,
            kind,
            doc: self.doc.clone(),
            over: self.sweep_over,
            offers: self.offers.clone(),
            rank: self.shortlist_rank,
        })));
    }

    /// The engine sheet and gear of the highlighted shortlist candidate, if the view shows one.
    pub(super) fn highlighted_candidate(&self) -> Option<(String, f64)> {
        match &self.view {
            Some(ViewData::Shortlist(view)) => view
                .candidate(self.shortlist_row)
                .map(|c| (c.engine.clone(), c.gear_ratio)),
            _ => None,
        }
    }

    /// Moves the shortlist's highlight to `candidate` (engine, gear) when listed, else keeps
    /// the row within the list.
    pub(super) fn keep_highlight(&mut self, candidate: Option<(String, f64)>) {
        let Some(ViewData::Shortlist(view)) = &self.view else {
            return;
        };
        let count = view.result.as_ref().map_or(0, |l| l.candidates.len());
        let row = candidate.and_then(|(engine, gear)| view.row_of(&engine, gear));
        self.shortlist_row = row
            .unwrap_or(self.shortlist_row)
            .min(count.saturating_sub(1));
    }

    /// Ranks the shortlist by the next figure, the highlight staying on its candidate.
    pub(super) fn next_ranking(&mut self) {
        let all = ShortlistRank::ALL;
        let i = all
            .iter()
            .position(|r| *r == self.shortlist_rank)
            .unwrap_or(0);
        self.shortlist_rank = all[(i + 1) % all.len()];
        let highlighted = self.highlighted_candidate();
        match &mut self.view {
            Some(ViewData::Shortlist(view)) => view.rank_by(self.shortlist_rank),
            // Ranked so when the list being solved comes in.
            _ if self
                .computing
                .is_some_and(|c| c.kind == ViewKind::Shortlist) => {}
            _ => {
                self.set_status(Level::Info, "r ranks the shortlist in the shortlist view");
                return;
            }
        }
        self.keep_highlight(highlighted);
        let name = self.shortlist_rank.name();
        self.set_status(Level::Info, format!("shortlist ranked by {name}"));
    }

    /// Makes the highlighted candidate the boat's engine, gear and a new active screw variant:
    /// one edit, undone by `u` and saved by `s`.
    pub(super) fn take_candidate(&mut self) {
        let Some(ViewData::Shortlist(view)) = &self.view else {
            self.set_status(
                Level::Info,
                "Enter takes the highlighted candidate in the shortlist view",
            );
            return;
        };
        let candidate = match &view.result {
            Err(why) => {
                let why = format!("no candidate to take: {why}");
                self.set_status(Level::Error, why);
                return;
            }
            Ok(_) => match view.candidate(self.shortlist_row) {
                Some(c) => c.clone(),
                None => return,
            },
        };
        let what = format!(
            "{} with {}",
            candidate.engine,
            edit::gear_label(candidate.gear_ratio)
        );
        if candidate.pitch.is_none() {
            let why = candidate
                .problems
                .first()
                .cloned()
                .unwrap_or_else(|| "no pitch meets the target".into());
            self.set_status(Level::Error, format!("{what} not taken: {why}"));
            return;
        }
        let Some(offer) = self.offers.iter().find(|o| o.name == candidate.engine) else {
            self.set_status(
                Level::Error,
                format!(
                    "{what} not taken: its engine sheet is no longer read (S reads them again)"
                ),
            );
            return;
        };
        if self.doc.boat.variants.len() >= crate::profile::boat::MAX_VARIANTS {
            self.set_status(
                Level::Error,
                format!(
                    "{what} not taken: the boat has {} screw variants, the most a boat file holds",
                    crate::profile::boat::MAX_VARIANTS
                ),
            );
            return;
        }
        let Some(screw) = candidate
            .boat
            .variants
            .get(candidate.boat.active_variant)
            .cloned()
        else {
            return;
        };
        let mut next = self.doc.clone();
        let label = edit::add_shortlist_variant(
            &mut next.boat,
            &candidate.engine,
            candidate.gear_ratio,
            screw,
        );
        next.engine = offer.doc.clone();
        self.commit(next);
        self.set_status(
            Level::Info,
            format!("{what} and screw variant {label} in use (unsaved: s saves, u undoes)"),
        );
    }

    pub(super) fn in_view(&mut self, command: Command) -> Option<Effect> {
        self.status = None;
        let Overlay::View { kind, scroll } = &mut self.overlay else {
            return None;
        };
        let kind = *kind;
        match command {
            Command::CloseView => {
                if let Some(computing) = self.computing {
                    self.set_status(Level::Info, format!("{} cancelled", computing.kind.title()));
                }
                self.overlay = Overlay::None;
                self.view = None;
                self.refresh_analysis();
            }
            Command::NextView | Command::PrevView => {
                let to = if command == Command::NextView {
                    kind.next()
                } else {
                    kind.prev()
                };
                // The shortlist needs the store's engine sheets: the loop reads them first.
                if to == ViewKind::Shortlist && self.offers.is_empty() {
                    return Some(Effect::LoadEngineSheets);
                }
                self.open_view(to);
            }
            Command::ListDown | Command::ListUp if kind == ViewKind::Shortlist => {
                let count = match &self.view {
                    Some(ViewData::Shortlist(v)) => {
                        v.result.as_ref().map_or(0, |l| l.candidates.len())
                    }
                    _ => 0,
                };
                self.shortlist_row = if command == Command::ListDown {
                    (self.shortlist_row + 1).min(count.saturating_sub(1))
                } else {
                    self.shortlist_row.saturating_sub(1)
                };
            }
            Command::ListDown => *scroll = (*scroll + 1).min(80),
            Command::ListUp => *scroll = scroll.saturating_sub(1),
            Command::NextRanking => self.next_ranking(),
            Command::ToggleShortlistChart if kind == ViewKind::Shortlist => {
                self.shortlist_chart = !self.shortlist_chart;
            }
            Command::ToggleShortlistChart => self.set_status(
                Level::Info,
                "c shows what more power buys in the shortlist view",
            ),
            Command::TakeCandidate => self.take_candidate(),
            Command::NextSweepParameter => {
                if kind == ViewKind::Sweep {
                    self.sweep_over = self.sweep_over.next();
                    self.refresh_analysis();
                } else {
                    self.set_status(
                        Level::Info,
                        "n switches the swept parameter in the sweep view",
                    );
                }
            }
            Command::ApplyCalibration => {
                self.pending_fit = FitChoice::OneFactor;
                self.apply_calibration();
            }
            Command::ApplyFroudeCalibration => {
                self.pending_fit = FitChoice::ByFroude;
                self.apply_calibration();
            }
            Command::ToggleLiveRun
            | Command::NextLiveRun
            | Command::PrevLiveRun
            | Command::UseLiveRuns => self.live_command(command),
            Command::Undo => self.undo(),
            Command::Redo => self.redo(),
            Command::ToggleUnits => self.toggle_units(),
            Command::Save => return self.save(),
            _ => {}
        }
        None
    }

    pub(super) fn live_command(&mut self, command: Command) {
        let Some(live) = self.live.as_mut() else {
            self.set_status(
                Level::Info,
                "no live feed: `tidewright open BOAT --nmea tcp://HOST:PORT` captures runs",
            );
            return;
        };
        match command {
            Command::NextLiveRun => live.move_selection(1),
            Command::PrevLiveRun => live.move_selection(-1),
            Command::ToggleLiveRun => match live.toggle_selected() {
                Some(kept) => {
                    let n = live.selected + 1;
                    let word = if kept { "kept" } else { "dropped" };
                    self.set_status(Level::Info, format!("captured run {n} {word}"));
                }
                None => self.set_status(Level::Info, "no run captured yet"),
            },
            Command::UseLiveRuns => match live.kept_trial_doc() {
                Some(trial) => {
                    let runs = trial.runs.len();
                    let mut next = self.doc.clone();
                    // Runs captured on board today belong to the installation in the boat.
                    let mut trial = trial;
                    trial.installation = next
                        .boat
                        .as_found
                        .as_ref()
                        .map(|_| crate::profile::Side::AsFound);
                    next.boat.trial = Some(trial);
                    self.commit(next);
                    self.set_status(
                        Level::Info,
                        format!(
                            "{} the trial log now (a applies the fit; u undoes)",
                            if runs == 1 {
                                "1 captured run is".to_string()
                            } else {
                                format!("{runs} captured runs are")
                            }
                        ),
                    );
                }
                None => self.set_status(Level::Error, "no captured run is kept"),
            },
            _ => {}
        }
    }

    pub(super) fn apply_calibration(&mut self) {
        let Some(ViewData::Calibration(view)) = &self.view else {
            self.set_status(
                Level::Info,
                "a applies the fitted correction in the sea-trial view (Tab to it)",
            );
            return;
        };
        let Some(correction) = self.chosen_correction(view) else {
            let why = match &view.result {
                Err(why) => why.clone(),
                Ok(_) => {
                    "the fit does not improve on the model, so there is nothing to apply".into()
                }
            };
            self.set_status(Level::Error, format!("no correction applied: {why}"));
            return;
        };
        // A saved correction is a measurement of the hull: a new fit replaces it without a
        // question only when the two agree within the new fit's own uncertainty.
        if let (Some(saved), Ok(cal)) = (&self.doc.boat.calibration, &view.result) {
            let sigma = crate::study::Study::factor_uncertainty(cal).unwrap_or(0.0);
            let difference = (saved.resistance_factor - correction.resistance_factor).abs();
            if difference > sigma && difference > 1e-4 {
                self.set_status(
                    Level::Info,
                    format!(
                        "saved ×{:.3} against the new fit ×{:.3} ± {sigma:.3} (one standard error)",
                        saved.resistance_factor, correction.resistance_factor
                    ),
                );
                self.overlay = Overlay::Confirm(Question::ReplaceCalibration);
                return;
            }
        }
        self.apply_calibration_anyway();
    }

    /// The correction of the fit chosen (`a` one factor, `F` the two-parameter fit).
    fn chosen_correction(
        &self,
        view: &crate::tui::analysis::CalibrationView,
    ) -> Option<crate::profile::CalibrationDoc> {
        match self.pending_fit {
            FitChoice::OneFactor => view.correction(),
            FitChoice::ByFroude => view.froude_correction(),
        }
    }

    /// Applies the sea-trial view's fitted correction, replacing any saved one.
    pub(super) fn apply_calibration_anyway(&mut self) {
        let Some(ViewData::Calibration(view)) = &self.view else {
            return;
        };
        let Some(correction) = self.chosen_correction(view) else {
            return;
        };
        let factor = correction.resistance_factor;
        let mut next = self.doc.clone();
        next.boat.calibration = Some(correction);
        if next == self.doc {
            self.set_status(
                Level::Info,
                format!("calibration ×{factor:.3} is already applied"),
            );
            return;
        }
        self.commit(next);
        self.set_status(
            Level::Info,
            format!(
                "calibration ×{factor:.3} applied to every prediction (unsaved: s saves, u undoes)"
            ),
        );
    }
}

impl App {
    /// Marks the repower done in the document (one undoable edit): the study's swap.
    pub(super) fn swap_sides(&mut self) {
        let date = crate::study::design::today_iso().unwrap_or_else(|| "1970-01-01".into());
        let study = match self.doc.study() {
            Ok(study) => study,
            Err(why) => {
                self.set_status(Level::Error, format!("cannot mark the repower done: {why}"));
                return;
            }
        };
        match study.repower_done(&date) {
            Ok(boat) => {
                let mut next = self.doc.clone();
                next.as_found_engine = Some(next.engine.clone());
                next.boat = boat;
                self.commit(next);
                self.set_status(
                    Level::Info,
                    format!("repower marked done on {date}: the old installation is in [[history]] (unsaved: s saves, u undoes)"),
                );
            }
            Err(e) => self.set_status(Level::Error, e.to_string()),
        }
    }
}
