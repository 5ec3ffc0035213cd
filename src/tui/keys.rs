//! The one key table: key → [`Command`] per [`Mode`]; it also writes the help overlay, the
//! footer hints and `docs/keys.md`, so the three can never disagree with what the keys do.

use crossterm::event::{KeyCode, KeyEvent, KeyEventKind, KeyModifiers};

use super::analysis::ViewKind;

/// What the keyboard is talking to at the moment.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Mode {
    /// Moving between panes and fields, nudging, switching charts.
    Browse,
    /// Typing a new value into the selected field.
    Edit,
    /// The help overlay is open.
    Help,
    /// Choosing a boat or an engine sheet from the store.
    Pick,
    /// Asking a yes/no question (quit with unsaved changes, overwrite a changed file).
    Confirm,
    /// A design view is open: sweep, sea-trial calibration, what-if or the shortlist.
    View,
}

impl Mode {
    /// Heading used for this mode in the help overlay and docs/keys.md.
    pub fn heading(self) -> &'static str {
        match self {
            Mode::Browse => "Moving and editing",
            Mode::Edit => "Typing a value",
            Mode::Help => "Help overlay",
            Mode::Pick => "Choosing a boat or engine sheet",
            Mode::Confirm => "Questions",
            Mode::View => "Design views (sweep, sea trial, what-if, shortlist)",
        }
    }

    /// Every mode, in the order the help lists them.
    pub const ALL: [Mode; 6] = [
        Mode::Browse,
        Mode::Edit,
        Mode::Pick,
        Mode::Confirm,
        Mode::Help,
        Mode::View,
    ];
}

/// What a key asks for; the app turns it into an [`super::app::Action`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Command {
    /// Focus the pane to the right.
    NextPane,
    /// Focus the pane to the left.
    PrevPane,
    /// Select the field below.
    NextField,
    /// Select the field above.
    PrevField,
    /// Start typing a value for the selected field (or cycle a choice).
    BeginEdit,
    /// Increase the selected value by its step.
    NudgeUp,
    /// Decrease the selected value by its step.
    NudgeDown,
    /// Undo the last change.
    Undo,
    /// Redo the last undone change.
    Redo,
    /// Type a new target speed.
    EditTargetSpeed,
    /// Toggle metric / imperial display.
    ToggleUnits,
    /// Show the next chart.
    NextChart,
    /// Show the previous chart.
    PrevChart,
    /// Make the next screw variant the active one.
    NextVariant,
    /// Make the previous screw variant the active one.
    PrevVariant,
    /// Add a new screw variant (copy of the active one with a new label).
    AddVariant,
    /// Duplicate the active screw variant.
    DuplicateVariant,
    /// Remove the active screw variant (never the last one).
    RemoveVariant,
    /// Add the recommended pitch as a new variant.
    ApplyRecommendation,
    /// Open the sweep view for the active variant.
    OpenSweep,
    /// Open the sea-trial calibration view.
    OpenCalibration,
    /// Open the what-if conditions view.
    OpenWhatIf,
    /// Open the repower shortlist over the store's engine sheets.
    OpenShortlist,
    /// Rank the shortlist by the next figure (fuel → range → top → margin).
    NextRanking,
    /// Make the highlighted shortlist candidate the boat's engine, gear and a new screw variant.
    TakeCandidate,
    /// Show the shortlist's chart of installed power against top speed, or its table again.
    ToggleShortlistChart,
    /// Show or hide the uncertainty band on the power chart.
    ToggleBand,
    /// Mark the repower done: the planned installation becomes the as-found one (asks first).
    SwapSides,
    /// Show the next design view.
    NextView,
    /// Show the previous design view.
    PrevView,
    /// Sweep the next parameter (diameter, gear ratio, blade count, area ratio).
    NextSweepParameter,
    /// Apply the fitted sea-trial correction to the boat.
    ApplyCalibration,
    /// Apply the two-parameter sea-trial fit (a factor varying with speed) to the boat.
    ApplyFroudeCalibration,
    /// Keep or drop the highlighted run captured from the live feed.
    ToggleLiveRun,
    /// Highlight the next captured run.
    NextLiveRun,
    /// Highlight the previous captured run.
    PrevLiveRun,
    /// Make the kept captured runs the boat's trial log (the fit then uses them).
    UseLiveRuns,
    /// Close the design view.
    CloseView,
    /// Save the boat through the store.
    Save,
    /// Open another boat from the store.
    OpenBoat,
    /// Switch the engine sheet from the store.
    SwitchEngine,
    /// Read the boat's file again from disk (asks first when there are unsaved changes).
    Reload,
    /// Open or close the help overlay.
    ToggleHelp,
    /// Quit (asks first when there are unsaved changes).
    Quit,
    /// Apply the typed value, choose the highlighted entry.
    Accept,
    /// Leave the typing, the list or the question without changing anything.
    Cancel,
    /// Delete the character before the cursor.
    DeleteBack,
    /// Answer yes.
    Yes,
    /// Answer no.
    No,
    /// Move the highlight down a list.
    ListDown,
    /// Move the highlight up a list.
    ListUp,
}

/// A key as written in the table: a code with modifiers, and how it is shown to the user.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Key {
    /// The key code.
    pub code: KeyCode,
    /// Modifiers that must be held (only Ctrl is distinguished; Shift is in the character).
    pub ctrl: bool,
    /// How the key is written in help, footer and docs.
    pub label: &'static str,
}

const fn ch(c: char, label: &'static str) -> Key {
    Key {
        code: KeyCode::Char(c),
        ctrl: false,
        label,
    }
}
const fn ctrl(c: char, label: &'static str) -> Key {
    Key {
        code: KeyCode::Char(c),
        ctrl: true,
        label,
    }
}
const fn code(code: KeyCode, label: &'static str) -> Key {
    Key {
        code,
        ctrl: false,
        label,
    }
}

/// One row of the key table.
#[derive(Debug, Clone, Copy)]
pub struct Binding {
    /// The mode in which the keys apply.
    pub mode: Mode,
    /// The keys, first is the one shown in the footer.
    pub keys: &'static [Key],
    /// What they do.
    pub command: Command,
    /// A short word for the footer.
    pub hint: &'static str,
    /// A sentence for the help overlay and docs/keys.md.
    pub help: &'static str,
    /// Whether the footer shows it.
    pub in_footer: bool,
    /// The design views whose footer shows it (View mode only); empty: every view's.
    pub views: &'static [ViewKind],
}

const fn bind(
    mode: Mode,
    keys: &'static [Key],
    command: Command,
    hint: &'static str,
    help: &'static str,
    in_footer: bool,
) -> Binding {
    Binding {
        mode,
        keys,
        command,
        hint,
        help,
        in_footer,
        views: &[],
    }
}

/// The same binding, shown in the footer of `views` only (a key that acts in one view).
const fn only_in(binding: Binding, views: &'static [ViewKind]) -> Binding {
    Binding { views, ..binding }
}

use Command as C;
use Mode as M;

/// The key table. Typing printable characters in [`Mode::Edit`] is handled beside it: every
/// character not bound here goes into the value being typed.
#[rustfmt::skip]
pub const BINDINGS: &[Binding] = &[
    bind(M::Browse, &[code(KeyCode::Up, "↑"), ch('k', "k")], C::PrevField, "field", "select the field above", false),
    bind(M::Browse, &[code(KeyCode::Down, "↓"), ch('j', "j")], C::NextField, "field", "select the field below", true),
    bind(M::Browse, &[code(KeyCode::Right, "→"), ch('l', "l"), code(KeyCode::Tab, "Tab")], C::NextPane, "pane", "focus the next pane (Vessel → Powerplant → Screw)", true),
    bind(M::Browse, &[code(KeyCode::Left, "←"), ch('h', "h"), code(KeyCode::BackTab, "Shift-Tab")], C::PrevPane, "pane", "focus the previous pane", false),
    bind(M::Browse, &[code(KeyCode::Enter, "Enter")], C::BeginEdit, "edit", "type a value with its unit for the selected field (choices: next choice)", true),
    bind(M::Browse, &[ch('+', "+"), ch('=', "=")], C::NudgeUp, "nudge", "increase the selected value by its step (pitch 0.1 in / 2 mm, diameter 0.5 in / 10 mm, gear 0.01 …)", true),
    bind(M::Browse, &[ch('-', "-"), ch('_', "_")], C::NudgeDown, "", "decrease the selected value by its step", false),
    bind(M::Browse, &[ch('u', "u"), ctrl('z', "Ctrl-z")], C::Undo, "undo", "undo the last change", true),
    bind(M::Browse, &[ctrl('r', "Ctrl-r"), ch('U', "U")], C::Redo, "redo", "redo the last undone change", false),
    bind(M::Browse, &[ch('t', "t")], C::EditTargetSpeed, "target", "type the target cruising speed", true),
    bind(M::Browse, &[ch('m', "m")], C::ToggleUnits, "units", "toggle metric / imperial display (solved values are unchanged)", true),
    bind(M::Browse, &[ch('c', "c")], C::NextChart, "chart", "next chart: power, speed, fuel, range", true),
    bind(M::Browse, &[ch('C', "C")], C::PrevChart, "", "previous chart", false),
    bind(M::Browse, &[ch(']', "]")], C::NextVariant, "variant", "make the next screw variant active", true),
    bind(M::Browse, &[ch('[', "[")], C::PrevVariant, "", "make the previous screw variant active", false),
    bind(M::Browse, &[ch('a', "a")], C::AddVariant, "", "add a screw variant (a copy of the active one, new label)", false),
    bind(M::Browse, &[ch('d', "d")], C::DuplicateVariant, "", "duplicate the active screw variant", false),
    bind(M::Browse, &[ch('x', "x")], C::RemoveVariant, "", "remove the active screw variant (the last one stays)", false),
    bind(M::Browse, &[ch('p', "p")], C::ApplyRecommendation, "", "add the recommended pitch as a new screw variant", false),
    bind(M::Browse, &[ch('v', "v")], C::OpenSweep, "sweep", "open the sweep view: diameter, gear, blades or area, each with its matching pitch, ranked", true),
    bind(M::Browse, &[ch('r', "r")], C::OpenCalibration, "", "open the sea-trial view: measured vs predicted speed, fitted resistance factor", false),
    bind(M::Browse, &[ch('w', "w")], C::OpenWhatIf, "", "open the what-if view: loads, fouling, sea state, uncertainty band, cavitation, shaft", false),
    bind(M::Browse, &[ch('S', "S")], C::OpenShortlist, "", "open the repower shortlist: every engine sheet in the store with its offered gears and a screw sized for each, ranked", false),
    bind(M::Browse, &[ch('D', "D")], C::SwapSides, "", "mark the repower done: the planned engine, gear and screw become the installation in the boat, the old one goes into a dated [[history]] (asks first; unsaved until s)", false),
    bind(M::Browse, &[ch('b', "b")], C::ToggleBand, "", "show or hide the uncertainty band (displacement ±10 %, wake ±0.05) on the power chart", false),
    bind(M::Browse, &[ch('s', "s"), ctrl('s', "Ctrl-s")], C::Save, "save", "save the boat through the store (atomic, keeps a backup)", true),
    bind(M::Browse, &[ch('R', "R")], C::Reload, "", "reload the boat's file from disk (asks first if unsaved)", false),
    bind(M::Browse, &[ch('o', "o")], C::OpenBoat, "", "open another boat from the store", false),
    bind(M::Browse, &[ch('e', "e")], C::SwitchEngine, "", "switch the engine sheet from the store", false),
    bind(M::Browse, &[ch('?', "?"), code(KeyCode::F(1), "F1")], C::ToggleHelp, "help", "show every key", true),
    bind(M::Browse, &[ch('q', "q"), ctrl('c', "Ctrl-c")], C::Quit, "quit", "quit (asks first when there are unsaved changes)", true),
    bind(M::View, &[code(KeyCode::Tab, "Tab"), code(KeyCode::Right, "→"), ch('l', "l")], C::NextView, "view", "next view: sweep → sea trial → what-if → shortlist", true),
    bind(M::View, &[code(KeyCode::BackTab, "Shift-Tab"), code(KeyCode::Left, "←"), ch('h', "h")], C::PrevView, "", "previous view", false),
    only_in(bind(M::View, &[ch('n', "n")], C::NextSweepParameter, "parameter", "sweep view: sweep the next parameter (diameter, gear ratio, blade count, area ratio)", true), &[ViewKind::Sweep]),
    only_in(bind(M::View, &[ch('a', "a")], C::ApplyCalibration, "apply fit", "sea-trial view: apply the fitted correction to the boat (unsaved until s; u undoes)", true), &[ViewKind::Calibration]),
    only_in(bind(M::View, &[ch('F', "F")], C::ApplyFroudeCalibration, "", "sea-trial view: apply the two-parameter fit (a factor varying with Froude number between the trial's slowest and fastest speeds) instead of one factor", false), &[ViewKind::Calibration]),
    only_in(bind(M::View, &[ch('x', "x")], C::ToggleLiveRun, "keep/drop", "sea-trial view: keep or drop the highlighted run captured from the live feed (open --nmea)", false), &[ViewKind::Calibration]),
    only_in(bind(M::View, &[ch('J', "J")], C::NextLiveRun, "", "sea-trial view: highlight the next captured run", false), &[ViewKind::Calibration]),
    only_in(bind(M::View, &[ch('K', "K")], C::PrevLiveRun, "", "sea-trial view: highlight the previous captured run", false), &[ViewKind::Calibration]),
    only_in(bind(M::View, &[ch('g', "g")], C::UseLiveRuns, "use runs", "sea-trial view: make the kept captured runs the boat's trial log, refit (a then applies; u undoes)", false), &[ViewKind::Calibration]),
    only_in(bind(M::View, &[ch('r', "r")], C::NextRanking, "rank", "shortlist view: rank by the next figure (fuel → range → top → margin)", true), &[ViewKind::Shortlist]),
    only_in(bind(M::View, &[ch('c', "c")], C::ToggleShortlistChart, "chart", "shortlist view: show each candidate's installed power against its top speed with the hull's effective power (what more power buys), or the table again", true), &[ViewKind::Shortlist]),
    only_in(bind(M::View, &[code(KeyCode::Enter, "Enter")], C::TakeCandidate, "take", "shortlist view: make the highlighted candidate the boat's engine, gear and a new screw variant (unsaved until s; u undoes)", true), &[ViewKind::Shortlist]),
    bind(M::View, &[ch('u', "u"), ctrl('z', "Ctrl-z")], C::Undo, "undo", "undo the last change", true),
    bind(M::View, &[ctrl('r', "Ctrl-r"), ch('U', "U")], C::Redo, "", "redo the last undone change", false),
    bind(M::View, &[ch('m', "m")], C::ToggleUnits, "", "toggle metric / imperial display", false),
    bind(M::View, &[ch('s', "s"), ctrl('s', "Ctrl-s")], C::Save, "", "save the boat through the store", false),
    bind(M::View, &[code(KeyCode::Down, "↓"), ch('j', "j")], C::ListDown, "scroll", "scroll the view down (shortlist view: highlight the next candidate)", true),
    bind(M::View, &[code(KeyCode::Up, "↑"), ch('k', "k")], C::ListUp, "", "scroll the view up (shortlist view: highlight the previous candidate)", false),
    bind(M::View, &[code(KeyCode::Esc, "Esc"), ch('q', "q")], C::CloseView, "close", "close the view", true),
    bind(M::Edit, &[code(KeyCode::Enter, "Enter")], C::Accept, "apply", "apply the typed value (only when it is valid)", true),
    bind(M::Edit, &[code(KeyCode::Esc, "Esc")], C::Cancel, "cancel", "leave the field unchanged", true),
    bind(M::Edit, &[code(KeyCode::Backspace, "Backspace")], C::DeleteBack, "delete", "delete the last character", true),
    bind(M::Pick, &[code(KeyCode::Down, "↓"), ch('j', "j")], C::ListDown, "down", "highlight the next entry", true),
    bind(M::Pick, &[code(KeyCode::Up, "↑"), ch('k', "k")], C::ListUp, "up", "highlight the previous entry", true),
    bind(M::Pick, &[code(KeyCode::Enter, "Enter")], C::Accept, "open", "open the highlighted entry", true),
    bind(M::Pick, &[code(KeyCode::Esc, "Esc"), ch('q', "q")], C::Cancel, "cancel", "close the list", true),
    bind(M::Confirm, &[ch('y', "y")], C::Yes, "yes", "yes", true),
    bind(M::Confirm, &[ch('n', "n"), code(KeyCode::Esc, "Esc")], C::No, "no", "no", true),
    bind(M::Help, &[ch('?', "?"), code(KeyCode::Esc, "Esc"), ch('q', "q"), code(KeyCode::F(1), "F1")], C::ToggleHelp, "close", "close the help", true),
    bind(M::Help, &[code(KeyCode::Down, "↓"), ch('j', "j")], C::ListDown, "scroll", "scroll the help down", true),
    bind(M::Help, &[code(KeyCode::Up, "↑"), ch('k', "k")], C::ListUp, "", "scroll the help up", false),
];

/// The command bound to `key` in `mode`, if any.
pub fn lookup(mode: Mode, key: &KeyEvent) -> Option<Command> {
    if key.kind == KeyEventKind::Release {
        return None;
    }
    let ctrl_held = key.modifiers.contains(KeyModifiers::CONTROL);
    BINDINGS
        .iter()
        .filter(|b| b.mode == mode)
        .find(|b| {
            b.keys
                .iter()
                .any(|k| k.code == key.code && k.ctrl == ctrl_held)
        })
        .map(|b| b.command)
}

/// The keys of `mode` shown in the footer, as "key hint" pairs; in a design view, `view`
/// leaves out the keys that act only in another view.
pub fn footer_hints(mode: Mode, view: Option<ViewKind>) -> Vec<(&'static str, &'static str)> {
    BINDINGS
        .iter()
        .filter(|b| b.mode == mode && b.in_footer)
        .filter(|b| b.views.is_empty() || view.is_some_and(|v| b.views.contains(&v)))
        .map(|b| (b.keys[0].label, b.hint))
        .collect()
}

/// The keys of a binding joined for display, e.g. "↑ / k".
pub fn key_labels(binding: &Binding) -> String {
    binding
        .keys
        .iter()
        .map(|k| k.label)
        .collect::<Vec<_>>()
        .join(" / ")
}

/// The bindings of `mode`, in table order.
pub fn bindings_for(mode: Mode) -> impl Iterator<Item = &'static Binding> {
    BINDINGS.iter().filter(move |b| b.mode == mode)
}

/// docs/keys.md, generated from the table.
pub fn markdown() -> String {
    let mut out = String::from(
        "# Keys of the terminal UI\n\n\
         Generated from the key table in `src/tui/keys.rs` (a test checks that this file matches it).\n\
         Everything is reachable from the keyboard; the footer shows the keys that apply now and `?`\n\
         opens this list on screen.\n",
    );
    for mode in Mode::ALL {
        out.push_str(&format!(
            "\n## {}\n\n| Keys | What they do |\n| --- | --- |\n",
            mode.heading()
        ));
        for b in bindings_for(mode) {
            let keys = b
                .keys
                .iter()
                .map(|k| format!("`{}`", k.label))
                .collect::<Vec<_>>()
                .join(", ");
            out.push_str(&format!("| {keys} | {} |\n", b.help));
        }
        if mode == Mode::Edit {
            out.push_str("| any other character | is typed into the value; the reason is shown while it is not valid |\n");
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn press(code: KeyCode, modifiers: KeyModifiers) -> KeyEvent {
        KeyEvent::new(code, modifiers)
    }

    #[test]
    fn no_key_is_bound_twice_in_one_mode() {
        for mode in Mode::ALL {
            let mut seen = Vec::new();
            for b in bindings_for(mode) {
                for k in b.keys {
                    assert!(
                        !seen.contains(&(k.code, k.ctrl)),
                        "{} bound twice in {mode:?}",
                        k.label
                    );
                    seen.push((k.code, k.ctrl));
                }
            }
        }
    }

    #[test]
    fn lookup_respects_mode_and_ctrl() {
        let q = press(KeyCode::Char('q'), KeyModifiers::NONE);
        assert_eq!(lookup(Mode::Browse, &q), Some(Command::Quit));
        assert_eq!(lookup(Mode::Pick, &q), Some(Command::Cancel));
        assert_eq!(lookup(Mode::Edit, &q), None, "q is typed while editing");
        let ctrl_r = press(KeyCode::Char('r'), KeyModifiers::CONTROL);
        assert_eq!(lookup(Mode::Browse, &ctrl_r), Some(Command::Redo));
        let plain_r = press(KeyCode::Char('r'), KeyModifiers::NONE);
        assert_eq!(
            lookup(Mode::Browse, &plain_r),
            Some(Command::OpenCalibration)
        );
        let plain_z = press(KeyCode::Char('z'), KeyModifiers::NONE);
        assert_eq!(lookup(Mode::Browse, &plain_z), None, "only Ctrl-z undoes");
    }

    #[test]
    fn every_mode_can_be_left() {
        for mode in [Mode::Edit, Mode::Pick, Mode::Help, Mode::View] {
            assert!(
                bindings_for(mode).any(|b| b.keys.iter().any(|k| k.code == KeyCode::Esc)),
                "{mode:?} has no Esc"
            );
        }
    }

    #[test]
    fn markdown_lists_every_label() {
        let md = markdown();
        for b in BINDINGS {
            for k in b.keys {
                assert!(
                    md.contains(&format!("`{}`", k.label)),
                    "{} missing",
                    k.label
                );
            }
        }
    }
}
