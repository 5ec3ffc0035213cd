//! The application state and the one function that changes it, [`App::update`].
//!
//! Keys become [`Action`]s through the key table; `update` edits the document, re-builds the
//! vessel and re-solves every variant at once (see [`super::solve`]); anything that touches
//! files comes back as an [`Effect`] for the event loop to carry out.

use super::analysis::{self, SweepOver, ViewData, ViewInputs, ViewKind};
use super::chart::ChartKind;
use super::edit;
use super::fields::{self, FieldId, FieldValue, Pane};
use super::issues::Issues;
use super::keys::{self, Command, Mode};
use super::solve::Solution;
use super::theme::Theme;
use crate::profile::{BoatDoc, EngineDoc};
use crate::propulsion::solver::conditions::UncertaintyBand;
use crate::study::shortlist::{Offer, ShortlistRank};
use crate::units::{self, UnitSystem};
use crossterm::event::{KeyCode, KeyEvent, KeyEventKind, KeyModifiers};

/// Longest undo history kept, in edits.
const UNDO_LIMIT: usize = 200;

/// Everything that can happen to the app: from keys, and from the loop reporting an effect.
#[derive(Debug, Clone)]
pub enum Action {
    /// A command from the key table.
    Command(Command),
    /// A character typed into the value being edited.
    Type(char),
    /// The terminal was resized (nothing to change; the loop redraws).
    Resize,
    /// The loop read the store's boat list for the open-boat picker.
    BoatList(Vec<String>),
    /// The loop read the store's engine list for the engine picker.
    EngineList(Vec<String>),
    /// The loop read every engine sheet of the store for the shortlist view.
    EngineSheets(Vec<Offer>),
    /// The loop opened a boat (with its engine sheet).
    BoatOpened(Box<Opened>),
    /// The loop loaded an engine sheet to use for this boat.
    EngineLoaded(Box<EngineDoc>, String),
    /// The loop saved the boat; the text says where.
    Saved(String),
    /// The loop found the boat's file changed by another program since it was loaded.
    FileChanged,
    /// A save was refused because the file changed on disk since it was loaded.
    SaveConflict,
    /// Something the loop tried failed; the text says what and why.
    Failed(String),
    /// The loop started a live instrument feed from this address.
    LiveStarted(String),
    /// The loop read these events from the live feed.
    Feed(Vec<crate::instruments::feed::FeedEvent>),
    /// The loop found a recovery file (unsaved edits from a dropped session); the text names it.
    RecoveryFound(String),
    /// The loop read the recovery file back: it becomes the document, unsaved.
    Recovered(Box<BoatDoc>),
    /// The loop reloaded the boat's file from disk (the reload key).
    Reloaded(Box<Opened>),
    /// Something the loop did that is worth a line of news.
    Notice(String),
}

/// A boat opened by the loop, ready to edit.
#[derive(Debug, Clone)]
pub struct Opened {
    /// The boat's name in the store (or its path).
    pub name: String,
    /// The boat document.
    pub boat: BoatDoc,
    /// Its engine sheet.
    pub engine: EngineDoc,
    /// Whether the boat can be saved (a store boat) or is read-only (the embedded demo).
    pub savable: bool,
}

/// I/O the loop carries out for `update`.
#[derive(Debug, Clone, PartialEq)]
pub enum Effect {
    /// Save the boat through the store; `overwrite` even if it changed on disk.
    Save {
        /// The document to write.
        boat: Box<BoatDoc>,
        /// Write even though the file changed on disk since it was loaded.
        overwrite: bool,
    },
    /// List the store's boats.
    ListBoats,
    /// Open the named boat.
    OpenBoat(String),
    /// List the store's engine sheets.
    ListEngines,
    /// Load the named engine sheet.
    LoadEngine(String),
    /// Read every engine sheet of the store, for the shortlist.
    LoadEngineSheets,
    /// Leave the program.
    Quit,
    /// Read the recovery file back into the document.
    RestoreRecovery,
    /// Remove the recovery file.
    DiscardRecovery,
    /// Read the boat's file again from disk, dropping unsaved edits.
    Reload,
}

/// A question waiting for y/n.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Question {
    /// Quit although there are unsaved changes?
    QuitUnsaved,
    /// Overwrite the file that another program changed?
    OverwriteChanged,
    /// Open another boat although there are unsaved changes?
    OpenUnsaved,
    /// Restore the unsaved edits of a session that ended without a save (y), or discard them?
    RestoreRecovery,
    /// Reload the boat's file from disk although there are unsaved changes?
    ReloadUnsaved,
}

impl Question {
    /// The question as shown.
    pub fn text(self) -> &'static str {
        match self {
            Question::QuitUnsaved => "There are unsaved changes. Quit without saving?",
            Question::OverwriteChanged => {
                "The boat's file was changed by another program since it was opened. Overwrite it?"
            }
            Question::OpenUnsaved => "There are unsaved changes. Open another boat and drop them?",
            Question::RestoreRecovery => {
                "Unsaved edits from a session that ended without saving (terminal dropped or stopped) were kept. Restore them (y), or discard them (n)?"
            }
            Question::ReloadUnsaved => {
                "There are unsaved changes. Reload the boat's file from disk and drop them?"
            }
        }
    }
}

/// What a picker is choosing.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PickKind {
    /// A boat to open.
    Boat,
    /// An engine sheet for this boat.
    Engine,
}

/// An overlay over the main screen.
#[derive(Debug, Clone, PartialEq)]
pub enum Overlay {
    /// Nothing over the screen.
    None,
    /// The help overlay, scrolled down by `scroll` lines.
    Help {
        /// Lines scrolled past.
        scroll: u16,
    },
    /// A list to choose from.
    Pick {
        /// What is being chosen.
        kind: PickKind,
        /// The entries.
        entries: Vec<String>,
        /// The highlighted entry.
        highlighted: usize,
    },
    /// A y/n question.
    Confirm(Question),
    /// A design view over the panes and charts; its results are in [`App::view`].
    View {
        /// Which view.
        kind: ViewKind,
        /// Lines scrolled past.
        scroll: u16,
    },
}

/// What is being typed into.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EditTarget {
    /// A field of a pane.
    Field(FieldId),
    /// The trip's target speed (from the readout strip).
    TargetSpeed,
}

/// The value being typed, validated on every keystroke.
#[derive(Debug, Clone, PartialEq)]
pub struct EditBuffer {
    /// What it will change.
    pub target: EditTarget,
    /// The text typed so far.
    pub text: String,
    /// Why the text is not valid, or `None` when Enter would apply it.
    pub problem: Option<String>,
}

/// How serious a status message is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Level {
    /// Information: saved, opened.
    Info,
    /// Something went wrong; nothing was changed.
    Error,
}

/// The one line of news under the readout.
#[derive(Debug, Clone, PartialEq)]
pub struct Status {
    /// The message.
    pub text: String,
    /// How serious it is.
    pub level: Level,
}

/// The document under edit: the boat and the engine sheet it uses.
#[derive(Debug, Clone, PartialEq)]
pub struct Document {
    /// The boat.
    pub boat: BoatDoc,
    /// Its engine sheet.
    pub engine: EngineDoc,
}

/// The whole state of the terminal UI: plain data, changed only by [`App::update`].
#[derive(Debug, Clone)]
pub struct App {
    /// The boat's name in the store, or its path.
    pub name: String,
    /// The document being edited.
    pub doc: Document,
    /// The document as last saved or opened, to tell unsaved changes.
    pub saved: Document,
    /// Whether saving is possible (false for the embedded demo).
    pub savable: bool,
    /// The solved results for the current document, every variant.
    pub solution: Solution,
    /// The document's validation problems and core warnings, each tied to its field; found
    /// once per edit with the solution (drawing only looks them up).
    pub issues: Issues,
    /// The pane with the keyboard.
    pub focus: Pane,
    /// The selected row of each pane.
    pub selected: [usize; 3],
    /// The value being typed, if any.
    pub edit: Option<EditBuffer>,
    /// Earlier documents, the latest last.
    pub undo: Vec<Document>,
    /// Undone documents, the latest undone last.
    pub redo: Vec<Document>,
    /// The display unit system.
    pub units: UnitSystem,
    /// The chart shown.
    pub chart: ChartKind,
    /// The overlay shown.
    pub overlay: Overlay,
    /// The status line.
    pub status: Option<Status>,
    /// Styles (colour or NO_COLOR).
    pub theme: Theme,
    /// Set when the boat's file changed on disk since it was opened or saved.
    pub changed_on_disk: bool,
    /// The parameter the sweep view sweeps.
    pub sweep_over: SweepOver,
    /// The open design view's results, solved when it opened and after each edit since.
    pub view: Option<ViewData>,
    /// Whether the power chart shows the uncertainty band.
    pub band_shown: bool,
    /// The uncertainty band, kept while the power chart shows it or the what-if view is open.
    pub band: Option<Result<UncertaintyBand, String>>,
    /// The live instrument feed, when one was started (`open --nmea`).
    pub live: Option<super::live::Live>,
    /// The store's engine sheets, as the loop last read them for the shortlist (empty: not yet).
    pub offers: Vec<Offer>,
    /// The shortlist view's ranking.
    pub shortlist_rank: ShortlistRank,
    /// The highlighted row of the shortlist view (0 = the first candidate).
    pub shortlist_row: usize,
}

impl App {
    /// A new app editing `opened`, showing units in `units`.
    pub fn new(opened: Opened, units: UnitSystem, theme: Theme) -> Self {
        let doc = Document {
            boat: opened.boat,
            engine: opened.engine,
        };
        let solution = Solution::solve(&doc.boat, &doc.engine);
        let issues = Issues::compute(&doc.boat, &solution);
        Self {
            name: opened.name,
            saved: doc.clone(),
            doc,
            savable: opened.savable,
            solution,
            issues,
            focus: Pane::Screw,
            selected: [0; 3],
            edit: None,
            undo: Vec::new(),
            redo: Vec::new(),
            units,
            chart: ChartKind::default(),
            overlay: Overlay::None,
            status: None,
            theme,
            changed_on_disk: false,
            sweep_over: SweepOver::default(),
            view: None,
            band_shown: false,
            band: None,
            live: None,
            offers: Vec::new(),
            shortlist_rank: ShortlistRank::default(),
            shortlist_row: 0,
        }
    }

    /// Whether the document differs from what was last saved or opened.
    pub fn dirty(&self) -> bool {
        self.doc != self.saved
    }

    /// The keyboard mode for the current state.
    pub fn mode(&self) -> Mode {
        match (&self.overlay, &self.edit) {
            (Overlay::Help { .. }, _) => Mode::Help,
            (Overlay::Pick { .. }, _) => Mode::Pick,
            (Overlay::Confirm(_), _) => Mode::Confirm,
            (Overlay::View { .. }, _) => Mode::View,
            (Overlay::None, Some(_)) => Mode::Edit,
            (Overlay::None, None) => Mode::Browse,
        }
    }

    /// The action a key press asks for in the current mode, if any.
    pub fn action_for_key(&self, key: &KeyEvent) -> Option<Action> {
        if key.kind == KeyEventKind::Release {
            return None;
        }
        let mode = self.mode();
        if let Some(command) = keys::lookup(mode, key) {
            return Some(Action::Command(command));
        }
        match (mode, key.code) {
            (Mode::Edit, KeyCode::Char(c))
                if !key
                    .modifiers
                    .intersects(KeyModifiers::CONTROL | KeyModifiers::ALT) =>
            {
                Some(Action::Type(c))
            }
            _ => None,
        }
    }

    /// The fields of the focused pane.
    pub fn pane_fields(&self, pane: Pane) -> Vec<FieldId> {
        fields::fields_of(pane, &self.doc.boat)
    }

    /// The selected field of the focused pane, if the pane has any.
    pub fn selected_field(&self) -> Option<FieldId> {
        let list = self.pane_fields(self.focus);
        list.get(self.selected[self.focus.index()].min(list.len().saturating_sub(1)))
            .copied()
    }

    /// Applies `action`: the only place the state changes. Returns I/O for the loop to do.
    pub fn update(&mut self, action: Action) -> Option<Effect> {
        match action {
            Action::Command(command) => self.command(command),
            Action::Type(c) => {
                if let Some(edit) = &mut self.edit {
                    edit.text.push(c);
                }
                self.revalidate();
                None
            }
            Action::Resize => None,
            Action::BoatList(entries) => {
                self.open_picker(PickKind::Boat, entries);
                None
            }
            Action::EngineList(entries) => {
                self.open_picker(PickKind::Engine, entries);
                None
            }
            Action::EngineSheets(offers) => {
                self.offers = offers;
                self.shortlist_row = 0;
                self.open_view(ViewKind::Shortlist);
                None
            }
            Action::BoatOpened(opened) => {
                let opened = *opened;
                let (units, theme, chart) = (self.units, self.theme.clone(), self.chart);
                let (band_shown, sweep_over) = (self.band_shown, self.sweep_over);
                let (offers, rank) = (std::mem::take(&mut self.offers), self.shortlist_rank);
                let name = opened.name.clone();
                let live = self.live.take();
                *self = App::new(opened, units, theme);
                self.live = live;
                self.chart = chart;
                self.band_shown = band_shown;
                self.sweep_over = sweep_over;
                self.offers = offers;
                self.shortlist_rank = rank;
                self.refresh_analysis();
                self.set_status(Level::Info, format!("opened {name}"));
                None
            }
            Action::EngineLoaded(engine, name) => {
                let mut next = self.doc.clone();
                edit::set_engine_name(&mut next.boat, &name);
                next.engine = *engine;
                self.commit(next);
                self.set_status(Level::Info, format!("engine sheet {name} in use"));
                None
            }
            Action::Saved(where_) => {
                self.saved = self.doc.clone();
                self.changed_on_disk = false;
                self.set_status(Level::Info, format!("saved {where_}"));
                None
            }
            Action::FileChanged => {
                if !self.changed_on_disk {
                    self.changed_on_disk = true;
                    self.set_status(
                        Level::Error,
                        "the boat's file was changed by another program since it was opened",
                    );
                }
                None
            }
            Action::SaveConflict => {
                self.changed_on_disk = true;
                self.overlay = Overlay::Confirm(Question::OverwriteChanged);
                None
            }
            Action::Failed(why) => {
                self.set_status(Level::Error, why);
                None
            }
            Action::LiveStarted(source) => {
                self.live = Some(super::live::Live::new(source));
                None
            }
            Action::Feed(events) => {
                let new = self.live.as_mut().map_or(0, |live| live.apply(events));
                if new > 0 {
                    self.set_status(
                        Level::Info,
                        format!(
                            "captured {new} steady run(s) from the live feed (r: sea-trial view)"
                        ),
                    );
                }
                None
            }
            Action::RecoveryFound(path) => {
                self.overlay = Overlay::Confirm(Question::RestoreRecovery);
                self.set_status(Level::Info, format!("recovery file {path}"));
                None
            }
            Action::Recovered(boat) => {
                let mut next = self.doc.clone();
                next.boat = *boat;
                self.commit(next);
                self.set_status(
                    Level::Info,
                    "unsaved edits restored (s saves them, u undoes back to the file)",
                );
                None
            }
            Action::Notice(text) => {
                self.set_status(Level::Info, text);
                None
            }
            Action::Reloaded(opened) => {
                let name = opened.name.clone();
                self.update(Action::BoatOpened(opened));
                self.set_status(Level::Info, format!("reloaded {name} from disk"));
                None
            }
        }
    }

    fn set_status(&mut self, level: Level, text: impl Into<String>) {
        self.status = Some(Status {
            text: text.into(),
            level,
        });
    }

    fn open_picker(&mut self, kind: PickKind, entries: Vec<String>) {
        if entries.is_empty() {
            let what = match kind {
                PickKind::Boat => "boats",
                PickKind::Engine => "engine sheets",
            };
            self.set_status(Level::Error, format!("the store holds no {what}"));
            return;
        }
        self.overlay = Overlay::Pick {
            kind,
            entries,
            highlighted: 0,
        };
    }

    fn command(&mut self, command: Command) -> Option<Effect> {
        match self.mode() {
            Mode::Browse => self.browse(command),
            Mode::Edit => {
                match command {
                    Command::Accept => self.accept_edit(),
                    Command::Cancel => self.edit = None,
                    Command::DeleteBack => {
                        if let Some(edit) = &mut self.edit {
                            edit.text.pop();
                        }
                        self.revalidate();
                    }
                    _ => {}
                }
                None
            }
            Mode::Help => {
                if let Overlay::Help { scroll } = &mut self.overlay {
                    match command {
                        Command::ToggleHelp => self.overlay = Overlay::None,
                        Command::ListDown => *scroll = (*scroll + 1).min(120),
                        Command::ListUp => *scroll = scroll.saturating_sub(1),
                        _ => {}
                    }
                }
                None
            }
            Mode::Pick => self.pick(command),
            Mode::Confirm => self.confirm(command),
            Mode::View => self.in_view(command),
        }
    }

    /// The open view's kind, if a view is open.
    pub fn view_kind(&self) -> Option<ViewKind> {
        match self.overlay {
            Overlay::View { kind, .. } => Some(kind),
            _ => None,
        }
    }

    /// Opens view `kind` and solves it.
    fn open_view(&mut self, kind: ViewKind) {
        self.overlay = Overlay::View { kind, scroll: 0 };
        self.refresh_analysis();
    }

    /// Re-solves the open view and the uncertainty band, when they are wanted. The shortlist's
    /// highlight stays on the same engine and gear when it is still listed.
    fn refresh_analysis(&mut self) {
        let kind = self.view_kind();
        let highlighted = self.highlighted_candidate();
        let inputs = ViewInputs {
            over: self.sweep_over,
            offers: &self.offers,
            rank: self.shortlist_rank,
        };
        self.view =
            kind.map(|kind| ViewData::compute(kind, inputs, &self.doc.boat, &self.doc.engine));
        self.keep_highlight(highlighted);
        let band_wanted = self.band_shown || kind == Some(ViewKind::WhatIf);
        self.band = band_wanted.then(|| analysis::band(&self.doc.boat, &self.doc.engine));
    }

    /// The engine sheet and gear of the highlighted shortlist candidate, if the view shows one.
    fn highlighted_candidate(&self) -> Option<(String, f64)> {
        match &self.view {
            Some(ViewData::Shortlist(view)) => view
                .candidate(self.shortlist_row)
                .map(|c| (c.engine.clone(), c.gear_ratio)),
            _ => None,
        }
    }

    /// Moves the shortlist's highlight to `candidate` (engine, gear) when listed, else keeps
    /// the row within the list.
    fn keep_highlight(&mut self, candidate: Option<(String, f64)>) {
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
    fn next_ranking(&mut self) {
        let all = ShortlistRank::ALL;
        let i = all
            .iter()
            .position(|r| *r == self.shortlist_rank)
            .unwrap_or(0);
        self.shortlist_rank = all[(i + 1) % all.len()];
        let highlighted = self.highlighted_candidate();
        match &mut self.view {
            Some(ViewData::Shortlist(view)) => view.rank_by(self.shortlist_rank),
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
    fn take_candidate(&mut self) {
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

    fn in_view(&mut self, command: Command) -> Option<Effect> {
        self.status = None;
        let Overlay::View { kind, scroll } = &mut self.overlay else {
            return None;
        };
        let kind = *kind;
        match command {
            Command::CloseView => {
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
            Command::ApplyCalibration => self.apply_calibration(),
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

    fn live_command(&mut self, command: Command) {
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
                    next.boat.trial = Some(trial);
                    self.commit(next);
                    self.set_status(
                        Level::Info,
                        format!("{runs} captured run(s) are the trial log now (a applies the fit; u undoes)"),
                    );
                }
                None => self.set_status(Level::Error, "no captured run is kept"),
            },
            _ => {}
        }
    }

    fn apply_calibration(&mut self) {
        let Some(ViewData::Calibration(view)) = &self.view else {
            self.set_status(
                Level::Info,
                "a applies the fitted correction in the sea-trial view (Tab to it)",
            );
            return;
        };
        let Some(correction) = view.correction() else {
            let why = match &view.result {
                Err(why) => why.clone(),
                Ok(_) => {
                    "the fit does not improve on the model, so there is nothing to apply".into()
                }
            };
            self.set_status(Level::Error, format!("no correction applied: {why}"));
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

    fn undo(&mut self) {
        match self.undo.pop() {
            Some(previous) => {
                let current = std::mem::replace(&mut self.doc, previous);
                self.redo.push(current);
                self.resolve();
            }
            None => self.set_status(Level::Info, "nothing to undo"),
        }
    }

    fn redo(&mut self) {
        match self.redo.pop() {
            Some(next) => {
                let current = std::mem::replace(&mut self.doc, next);
                self.undo.push(current);
                self.resolve();
            }
            None => self.set_status(Level::Info, "nothing to redo"),
        }
    }

    fn toggle_units(&mut self) {
        self.units = match self.units {
            UnitSystem::Metric => UnitSystem::Imperial,
            UnitSystem::Imperial => UnitSystem::Metric,
        };
    }

    fn save(&mut self) -> Option<Effect> {
        if !self.savable {
            self.set_status(
                Level::Error,
                "the embedded demo is read-only: run `tidewright init` to copy it into a store",
            );
            return None;
        }
        Some(Effect::Save {
            boat: Box::new(self.doc.boat.clone()),
            overwrite: false,
        })
    }

    fn browse(&mut self, command: Command) -> Option<Effect> {
        self.status = None;
        match command {
            Command::NextPane => self.focus = self.focus.next(),
            Command::PrevPane => self.focus = self.focus.prev(),
            Command::NextField | Command::PrevField => {
                let count = self.pane_fields(self.focus).len();
                let row = &mut self.selected[self.focus.index()];
                *row = if command == Command::NextField {
                    (*row + 1).min(count.saturating_sub(1))
                } else {
                    row.saturating_sub(1)
                };
            }
            Command::BeginEdit => return self.begin_edit(),
            Command::NudgeUp => self.nudge(1.0),
            Command::NudgeDown => self.nudge(-1.0),
            Command::Undo => self.undo(),
            Command::Redo => self.redo(),
            Command::EditTargetSpeed => {
                let value = edit::target_speed(&self.doc.boat);
                self.edit = Some(EditBuffer {
                    target: EditTarget::TargetSpeed,
                    text: units::format(value, units::Kind::Speed, self.units),
                    problem: None,
                });
            }
            Command::ToggleUnits => self.toggle_units(),
            Command::NextChart => self.chart = self.chart.next(),
            Command::PrevChart => self.chart = self.chart.prev(),
            Command::NextVariant | Command::PrevVariant => {
                let count = edit::variant_count(&self.doc.boat);
                if count > 1 {
                    let mut next = self.doc.clone();
                    let active = edit::active_variant(&next.boat);
                    let index = if command == Command::NextVariant {
                        (active + 1) % count
                    } else {
                        (active + count - 1) % count
                    };
                    edit::set_active_variant(&mut next.boat, index);
                    self.commit(next);
                }
            }
            Command::AddVariant | Command::DuplicateVariant => {
                let mut next = self.doc.clone();
                let label =
                    edit::duplicate_active_variant(&mut next.boat, command == Command::AddVariant);
                self.commit(next);
                self.set_status(Level::Info, format!("added variant {label}"));
            }
            Command::RemoveVariant => {
                let mut next = self.doc.clone();
                match edit::remove_active_variant(&mut next.boat) {
                    Ok(label) => {
                        self.commit(next);
                        self.set_status(Level::Info, format!("removed variant {label}"));
                    }
                    Err(why) => self.set_status(Level::Error, why),
                }
            }
            Command::ApplyRecommendation => match self.solution.recommended_pitch() {
                Some(pitch) => {
                    let mut next = self.doc.clone();
                    let label = edit::add_variant_with_pitch(&mut next.boat, pitch, self.units);
                    self.commit(next);
                    self.set_status(
                        Level::Info,
                        format!("added variant {label} with the recommended pitch"),
                    );
                }
                None => self.set_status(
                    Level::Error,
                    "no pitch recommendation for the active variant",
                ),
            },
            Command::Save => return self.save(),
            Command::OpenSweep => self.open_view(ViewKind::Sweep),
            Command::OpenCalibration => self.open_view(ViewKind::Calibration),
            Command::OpenWhatIf => self.open_view(ViewKind::WhatIf),
            Command::OpenShortlist => return Some(Effect::LoadEngineSheets),
            Command::ToggleBand => {
                self.band_shown = !self.band_shown;
                self.refresh_analysis();
                if self.band_shown {
                    if self.chart != ChartKind::PowerVsRpm {
                        self.chart = ChartKind::PowerVsRpm;
                    }
                    self.set_status(
                        Level::Info,
                        "power chart: band over displacement ±10 % and wake ±0.05 shown (b hides it)",
                    );
                }
            }
            Command::OpenBoat => {
                if self.dirty() {
                    self.overlay = Overlay::Confirm(Question::OpenUnsaved);
                    return None;
                }
                return Some(Effect::ListBoats);
            }
            Command::SwitchEngine => return Some(Effect::ListEngines),
            Command::Reload => {
                if self.dirty() {
                    self.overlay = Overlay::Confirm(Question::ReloadUnsaved);
                    return None;
                }
                return Some(Effect::Reload);
            }
            Command::ToggleHelp => self.overlay = Overlay::Help { scroll: 0 },
            Command::Quit => {
                if self.dirty() {
                    self.overlay = Overlay::Confirm(Question::QuitUnsaved);
                    return None;
                }
                return Some(Effect::Quit);
            }
            _ => {}
        }
        None
    }

    fn pick(&mut self, command: Command) -> Option<Effect> {
        let Overlay::Pick {
            kind,
            entries,
            highlighted,
        } = &mut self.overlay
        else {
            return None;
        };
        match command {
            Command::ListDown => {
                *highlighted = (*highlighted + 1).min(entries.len().saturating_sub(1))
            }
            Command::ListUp => *highlighted = highlighted.saturating_sub(1),
            Command::Cancel => self.overlay = Overlay::None,
            Command::Accept => {
                let name = entries.get(*highlighted).cloned();
                let kind = *kind;
                self.overlay = Overlay::None;
                return name.map(|name| match kind {
                    PickKind::Boat => Effect::OpenBoat(name),
                    PickKind::Engine => Effect::LoadEngine(name),
                });
            }
            _ => {}
        }
        None
    }

    fn confirm(&mut self, command: Command) -> Option<Effect> {
        let Overlay::Confirm(question) = self.overlay else {
            return None;
        };
        self.overlay = Overlay::None;
        match (question, command) {
            (Question::QuitUnsaved, Command::Yes) => Some(Effect::Quit),
            (Question::OverwriteChanged, Command::Yes) => Some(Effect::Save {
                boat: Box::new(self.doc.boat.clone()),
                overwrite: true,
            }),
            (Question::OverwriteChanged, _) => {
                self.set_status(
                    Level::Error,
                    "not saved: the file on disk was left as it is",
                );
                None
            }
            (Question::OpenUnsaved, Command::Yes) => Some(Effect::ListBoats),
            (Question::RestoreRecovery, Command::Yes) => Some(Effect::RestoreRecovery),
            (Question::RestoreRecovery, _) => Some(Effect::DiscardRecovery),
            (Question::ReloadUnsaved, Command::Yes) => Some(Effect::Reload),
            _ => None,
        }
    }

    fn begin_edit(&mut self) -> Option<Effect> {
        let field = self.selected_field()?;
        match fields::value(field, &self.doc.boat) {
            FieldValue::Number { value, kind } => {
                self.edit = Some(EditBuffer {
                    target: EditTarget::Field(field),
                    text: fields::format_number(value, kind, self.units),
                    problem: None,
                });
            }
            FieldValue::Choice { .. } => {
                let mut next = self.doc.clone();
                match edit::next_choice(field, &mut next.boat) {
                    Ok(()) => self.commit(next),
                    Err(why) => self.set_status(Level::Error, why),
                }
            }
            // The engine sheet comes from the store: the loop lists what there is.
            FieldValue::Engine(_) => return Some(Effect::ListEngines),
            FieldValue::Text(text) => {
                self.edit = Some(EditBuffer {
                    target: EditTarget::Field(field),
                    text,
                    problem: None,
                });
            }
            FieldValue::ReadOnly(_) => {
                let estimated = fields::kind_of(field).is_some();
                if estimated {
                    self.edit = Some(EditBuffer {
                        target: EditTarget::Field(field),
                        text: String::new(),
                        problem: None,
                    });
                    self.revalidate();
                } else {
                    self.set_status(
                        Level::Info,
                        format!("{} is not edited here", fields::label(field)),
                    );
                }
            }
        }
        None
    }

    /// Parses the edit buffer and records why it is not valid.
    fn revalidate(&mut self) {
        let Some(edit) = &self.edit else { return };
        let problem = match edit.target {
            EditTarget::TargetSpeed => edit::parse_target_speed(&edit.text).err(),
            EditTarget::Field(field) => {
                let mut probe = self.doc.clone();
                edit::set_from_text(field, &mut probe.boat, &edit.text).err()
            }
        };
        if let Some(edit) = &mut self.edit {
            edit.problem = problem;
        }
    }

    fn accept_edit(&mut self) {
        let Some(edit) = self.edit.clone() else {
            return;
        };
        // Parsed and validated once, on the copy that is committed; a problem is shown with
        // its reason and never applied.
        let mut next = self.doc.clone();
        let result = match edit.target {
            EditTarget::TargetSpeed => edit::parse_target_speed(&edit.text)
                .map(|speed| edit::set_target_speed(&mut next.boat, speed)),
            EditTarget::Field(field) => edit::set_from_text(field, &mut next.boat, &edit.text),
        };
        match result {
            Ok(()) => {
                self.edit = None;
                self.commit(next);
            }
            Err(why) => {
                if let Some(e) = &mut self.edit {
                    e.problem = Some(why);
                }
            }
        }
    }

    fn nudge(&mut self, direction: f64) {
        let Some(field) = self.selected_field() else {
            return;
        };
        let mut next = self.doc.clone();
        match edit::nudge(field, &mut next.boat, direction, self.units) {
            Ok(()) => self.commit(next),
            Err(why) => self.set_status(Level::Error, why),
        }
    }

    /// Makes `next` the document, keeping the old one for undo, and re-solves.
    fn commit(&mut self, next: Document) {
        if next == self.doc {
            return;
        }
        let previous = std::mem::replace(&mut self.doc, next);
        self.undo.push(previous);
        if self.undo.len() > UNDO_LIMIT {
            self.undo.remove(0);
        }
        self.redo.clear();
        self.resolve();
    }

    fn resolve(&mut self) {
        self.solution = Solution::solve(&self.doc.boat, &self.doc.engine);
        self.issues = Issues::compute(&self.doc.boat, &self.solution);
        self.refresh_analysis();
        let count = self.pane_fields(self.focus).len();
        let row = &mut self.selected[self.focus.index()];
        *row = (*row).min(count.saturating_sub(1));
    }
}
