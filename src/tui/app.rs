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
use super::work::{Computing, Job};
use crate::profile::{BoatDoc, EngineDoc};
use crate::propulsion::solver::conditions::UncertaintyBand;
use crate::study::shortlist::{Offer, ShortlistRank};
use crate::units::{self, UnitSystem};
use crossterm::event::{KeyCode, KeyEvent, KeyEventKind, KeyModifiers};

mod action;
mod views;
pub use action::*;

/// Longest undo history kept, in edits.
const UNDO_LIMIT: usize = 200;

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
    /// Whether the shortlist view shows its power-for-speed chart instead of the table.
    pub shortlist_chart: bool,
    /// Which sea-trial fit `a`/`F` last asked to apply (kept across the replace question).
    pub pending_fit: FitChoice,
    /// Whether the shortlist and sweep views are solved on a worker (the terminal's loop has
    /// one); false solves them inside `update`, as the headless screen and the tests do.
    pub background: bool,
    /// The view solve under way on the worker, for the progress line.
    pub computing: Option<Computing>,
    /// The number of the last solve asked for.
    pub last_job: u64,
    /// A solve (or its cancelling) for the loop, handed out by `update` with its effect.
    outbox: Option<Effect>,
}

/// Which sea-trial fit to apply.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum FitChoice {
    /// One resistance factor.
    #[default]
    OneFactor,
    /// A factor varying with Froude number (two parameters).
    ByFroude,
}

impl App {
    /// A new app editing `opened`, showing units in `units`.
    pub fn new(opened: Opened, units: UnitSystem, theme: Theme) -> Self {
        let doc = Document {
            boat: opened.boat,
            engine: opened.engine,
            as_found_engine: opened.as_found_engine,
        };
        let solution = Solution::solve(&doc);
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
            shortlist_chart: false,
            pending_fit: FitChoice::OneFactor,
            background: false,
            computing: None,
            last_job: 0,
            outbox: None,
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
        let effect = self.apply(action);
        // A solve asked for on the way goes out once the loop has carried out the effect.
        effect.or_else(|| self.outbox.take())
    }

    fn apply(&mut self, action: Action) -> Option<Effect> {
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
            Action::Progress { id, done, total } => {
                if let Some(computing) = self.computing.as_mut().filter(|c| c.id == id) {
                    computing.done = done;
                    computing.total = total;
                }
                None
            }
            Action::Solved(id, data) => {
                if self.computing.is_some_and(|c| c.id == id) {
                    self.computing = None;
                    let highlighted = self.highlighted_candidate();
                    let mut data = *data;
                    // The ranking may have changed while the list was solved.
                    if let ViewData::Shortlist(view) = &mut data {
                        view.rank_by(self.shortlist_rank);
                    }
                    self.view = Some(data);
                    self.keep_highlight(highlighted);
                }
                None
            }
            Action::SolveLost(id) => {
                if self.computing.is_some_and(|c| c.id == id) {
                    self.computing = None;
                    self.set_status(Level::Error, "the view could not be solved");
                }
                None
            }
            Action::BoatOpened(opened) => {
                let opened = *opened;
                let (units, theme, chart) = (self.units, self.theme.clone(), self.chart);
                let (band_shown, sweep_over) = (self.band_shown, self.sweep_over);
                let (offers, rank) = (std::mem::take(&mut self.offers), self.shortlist_rank);
                let name = opened.name.clone();
                let live = self.live.take();
                let (background, last_job) = (self.background, self.last_job);
                *self = App::new(opened, units, theme);
                self.live = live;
                self.background = background;
                self.last_job = last_job;
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
            Command::SwapSides => {
                if self.doc.boat.as_found.is_some() {
                    self.overlay = Overlay::Confirm(Question::SwapSides);
                } else {
                    self.set_status(
                        Level::Error,
                        "no [as_found] installation in this boat's file: there is nothing to swap (see docs/profiles.md)",
                    );
                }
            }
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
            (Question::ReplaceCalibration, answer) => {
                // The question came from the sea-trial view: back to it either way.
                self.overlay = Overlay::View {
                    kind: ViewKind::Calibration,
                    scroll: 0,
                };
                if answer == Command::Yes {
                    self.apply_calibration_anyway();
                } else {
                    self.set_status(Level::Info, "the saved sea-trial correction is kept");
                }
                None
            }
            (Question::SwapSides, Command::Yes) => {
                self.swap_sides();
                None
            }
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
        self.solution = Solution::solve(&self.doc);
        self.issues = Issues::compute(&self.doc.boat, &self.solution);
        self.refresh_analysis();
        let count = self.pane_fields(self.focus).len();
        let row = &mut self.selected[self.focus.index()];
        *row = (*row).min(count.saturating_sub(1));
    }
}
