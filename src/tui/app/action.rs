//! What reaches [`super::App::update`] and what it hands back: actions, effects for the loop,
//! questions, overlays and the small state types they carry.

use super::*;

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
    /// The worker solving job `id` has done `done` of `total` candidates.
    Progress {
        /// The job's number.
        id: u64,
        /// Candidates solved (count).
        done: usize,
        /// Candidates in all (count).
        total: usize,
    },
    /// The worker solved job `id`.
    Solved(u64, Box<ViewData>),
    /// The worker of job `id` ended without a result.
    SolveLost(u64),
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
    /// The sheet of the engine in the boat now, when the boat has `[as_found]`.
    pub as_found_engine: Option<EngineDoc>,
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
    /// Solve this view on a worker thread (replacing any solve under way).
    Solve(Box<Job>),
    /// Stop the solve under way.
    CancelSolve,
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
    /// Replace the saved sea-trial correction with a new fit that differs from it by more
    /// than the fit's own uncertainty?
    ReplaceCalibration,
    /// Mark the repower done: the planned installation becomes the one in the boat?
    SwapSides,
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
            Question::ReplaceCalibration => {
                "The new fit differs from the saved sea-trial correction by more than the fit's uncertainty (the status line gives both). Replace the saved correction?"
            }
            Question::SwapSides => {
                "Mark the repower done? The planned engine, gear and screw become the installation in the boat; the old one and its sea trial go into a dated [[history]] entry (unsaved until s; u undoes)."
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
    /// The sheet of the engine in the boat now (`[as_found] engine`), when it names one.
    pub as_found_engine: Option<EngineDoc>,
}

impl Document {
    /// The study of the document: both sides, the planned one solved, the as-found the baseline.
    pub fn study(&self) -> Result<crate::study::Study, String> {
        crate::study::Study::of_sides(&self.boat, &self.engine, self.as_found_engine.as_ref())
    }

    /// The study of `boat` with this document's engine sheets (a probe or a variant of it).
    pub fn study_of(&self, boat: &BoatDoc) -> Result<crate::study::Study, String> {
        crate::study::Study::of_sides(boat, &self.engine, self.as_found_engine.as_ref())
    }
}
