//! Every key the interface takes, written once.
//!
//! [`KEYS`] is the one table: each entry names its keys, where they work
//! (the keyboard mode and, when normal, the views), the word the bottom line
//! shows for them and when, the line the help screen gives them, and the
//! [`Action`] they start. Dispatch ([`find`], called by the app), the bottom
//! hint line ([`hints`]) and the help screen ([`help_entries`]) are all read
//! from it, so adding a key is one entry here (plus, for a new kind of
//! action, an [`Action`] variant and its arm in the app's dispatch).

use ratatui::crossterm::event::KeyCode;

use super::app::{Measure, View};
use super::fields::{Arms, Kind};

/// A key as the table names it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Key {
    /// The key with any modifiers held.
    Any(KeyCode),
    /// The key without Shift, Alt or Ctrl (a character may carry Shift,
    /// as `S` and `?` do).
    Plain(KeyCode),
    /// The key with Shift and without Alt or Ctrl.
    Shift(KeyCode),
    /// The key with Alt or Ctrl held.
    AltOrCtrl(KeyCode),
    /// The character with Ctrl held.
    Ctrl(char),
    /// Any character without Ctrl (typed into a value).
    AnyChar,
    /// Any key no other entry of the same place takes.
    Other,
}

/// Where a key works: a keyboard mode, and in the normal mode the views.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Scope {
    /// Every mode (typing and questions included).
    Everywhere,
    /// Moving about and editing, in every view.
    Normal,
    /// Moving about and editing, in one view only.
    InView(View),
    /// Typing a value or a file name.
    Typing,
    /// The help screen.
    Help,
    /// The file picker.
    Picker,
    /// Asked whether to quit with unsaved changes.
    QuitQuestion,
    /// Asked any other yes/no question (open over unsaved changes, overwrite).
    Question,
    /// The design search's form (`e`).
    SearchForm,
    /// A design search running.
    SearchRunning,
    /// The designs a search found.
    SearchResults,
}

impl Scope {
    /// The heading of the help screen's section for keys of this scope.
    pub fn section(self) -> &'static str {
        match self {
            Scope::Everywhere | Scope::Normal | Scope::InView(_) => "Keys",
            Scope::Typing => "Typing a value or a file name",
            Scope::Help => "This help",
            Scope::Picker => "Choosing a file (o)",
            Scope::QuitQuestion | Scope::Question => "Questions",
            Scope::SearchForm | Scope::SearchRunning | Scope::SearchResults => {
                "The design search (e)"
            }
        }
    }
}

/// What a key does. The app's dispatch gives each its meaning.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Action {
    /// Quit, asking first when there are unsaved changes.
    Quit,
    /// Select a field: ↑ ↓ one at a time, Home and End the first and last.
    Select,
    /// Nudge the selected value a fine step (← back, → on); choices change.
    NudgeFine,
    /// Nudge a coarse step (ten fine steps).
    NudgeCoarse,
    /// Nudge a finer step (a tenth of a fine step).
    NudgeFiner,
    /// Type the selected value (a choice changes instead).
    StartTyping,
    /// Add an arm, a copy of the selected one.
    AddArm,
    /// Remove the selected arm.
    RemoveArm,
    /// Edit the arms together or apart.
    ToggleArms,
    /// Copy the selected arm to every arm.
    CopyArm,
    /// Scroll the view on the right (Page Up back, Page Down on).
    ScrollView,
    /// Type a reading in the Field view.
    Measure(Measure),
    /// Add the readings above to the table of readings.
    AddReadingRow,
    /// Drop the last row of the table of readings.
    DropReadingRow,
    /// Keep the readings when another file opens.
    KeepReadings,
    /// Pick the previous (`[`) or next (`]`) pin.
    PickPin,
    /// Move the picked pin left (`<`) or right (`>`).
    MovePin,
    /// Drop the picked pin.
    DropPin,
    /// Switch view: Tab on, Shift+Tab back, a digit to that view.
    SwitchView,
    /// Switch between metric and US units.
    ToggleUnits,
    /// Save to the file the design came from.
    Save,
    /// Save under another name.
    SaveAs,
    /// Open the file picker.
    Open,
    /// Pin the current design for Compare.
    PinDesign,
    /// Show the help screen.
    ShowHelp,
    /// Keep the typed text.
    FinishTyping,
    /// Cancel typing.
    CancelTyping,
    /// Delete the last character typed.
    DeleteChar,
    /// Clear the typed text.
    ClearTyping,
    /// Add the character to the typed text.
    TypeChar,
    /// Scroll the help a line (↑ back, ↓ on).
    HelpLine,
    /// Scroll the help a page.
    HelpPage,
    /// Close the help.
    CloseHelp,
    /// Move in the file picker.
    PickerMove,
    /// Open the highlighted file.
    PickerOpen,
    /// Pin the highlighted file for Compare.
    PickerPin,
    /// Close the picker.
    PickerClose,
    /// Save, then quit.
    SaveAndQuit,
    /// Answer yes.
    Yes,
    /// Answer no.
    No,
    /// Ask which value of the selected input gives a speed or a throw.
    AskGoal,
    /// Mark the selected input free for a design search, or unmark it.
    MarkFree,
    /// Open the design search's form.
    OpenSearch,
    /// Take back the last edit (`z`), or make it again (`Z`).
    Undo,
    /// Move between the form's lines.
    FormLine,
    /// Change what the search makes largest.
    FormObjective,
    /// Run the search from the design on screen.
    RunSearch,
    /// Close the search's form or its results.
    CloseSearch,
    /// Stop waiting for a running search.
    CancelSearch,
    /// Choose among the designs found.
    ResultMove,
    /// Pin the chosen design for Compare.
    PinFound,
    /// Apply the chosen design (an edit `z` takes back).
    ApplyFound,
    /// Back from the designs found to the form.
    BackToGoals,
}

/// The state the bottom line's words depend on.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Context {
    /// How the selected field is edited (None when nothing is selected).
    pub kind: Option<Kind>,
    /// The selected field belongs to an arm.
    pub per_arm: bool,
    /// Whether the list edits the arms together or apart.
    pub arms: Arms,
    /// The arms are alike (they could be joined).
    pub alike: bool,
    /// The view on the right.
    pub view: View,
}

/// When the bottom line shows an entry's word.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum When {
    /// Always (where the entry works).
    Always,
    /// The selected field is a number.
    Number,
    /// The selected field is a choice.
    Choice,
    /// The selected field is a number or text.
    Typed,
    /// The selected field belongs to an arm.
    PerArm,
    /// An arm's field is selected and the arms are edited together.
    ArmsTogether,
    /// An arm's field is selected and the arms are edited apart.
    ArmsApart,
    /// As [`When::ArmsApart`], with the arms alike.
    ArmsApartAlike,
    /// The view is this one.
    Viewing(View),
}

impl When {
    /// Whether the condition holds.
    pub fn holds(self, c: &Context) -> bool {
        let number = matches!(c.kind, Some(Kind::Number | Kind::OptionalNumber));
        match self {
            When::Always => true,
            When::Number => number,
            When::Choice => c.kind == Some(Kind::Choice),
            When::Typed => number || c.kind == Some(Kind::Text),
            When::PerArm => c.per_arm,
            When::ArmsTogether => c.per_arm && c.arms == Arms::Together,
            When::ArmsApart => c.per_arm && c.arms == Arms::Apart,
            When::ArmsApartAlike => c.per_arm && c.arms == Arms::Apart && c.alike,
            When::Viewing(v) => c.view == v,
        }
    }
}

/// One entry of the key table.
#[derive(Debug, Clone, Copy)]
pub struct Binding {
    /// The keys.
    pub keys: &'static [Key],
    /// Where they work.
    pub scope: Scope,
    /// The keys as the bottom line writes them (short).
    pub hint_key: &'static str,
    /// The bottom line's word for them: the first whose condition holds;
    /// none shown when none holds.
    pub hint: &'static [(When, &'static str)],
    /// The keys as the help screen writes them.
    pub help_key: &'static str,
    /// What they do, for the help screen.
    pub help: &'static str,
    /// What they start.
    pub action: Action,
}

use Key::{AltOrCtrl, Any, Ctrl, Plain, Shift};
use KeyCode::{
    BackTab, Backspace, Char, Down, End, Enter, Esc, Home, Left, PageDown, PageUp, Right, Tab, Up,
};

/// No word on the bottom line.
const NO_HINT: &[(When, &str)] = &[];

const fn key(
    keys: &'static [Key],
    scope: Scope,
    hint_key: &'static str,
    hint: &'static [(When, &'static str)],
    help_key: &'static str,
    help: &'static str,
    action: Action,
) -> Binding {
    Binding {
        keys,
        scope,
        hint_key,
        hint,
        help_key,
        help,
        action,
    }
}

/// Every key the interface takes, in the order the bottom line and the help
/// screen give them (the most useful first).
pub const KEYS: &[Binding] = &[
    // Moving about and editing.
    key(
        &[Plain(Char('?'))],
        Scope::Normal,
        "?",
        &[(When::Always, "help")],
        "?",
        "this help, with the safety cautions",
        Action::ShowHelp,
    ),
    key(
        &[Any(Up), Any(Down), Any(Home), Any(End)],
        Scope::Normal,
        "↑↓",
        &[(When::Always, "field")],
        "↑ ↓  Home End",
        "select a field in the list",
        Action::Select,
    ),
    key(
        &[Plain(Left), Plain(Right)],
        Scope::Normal,
        "←→",
        &[(When::Choice, "change"), (When::Number, "nudge")],
        "← →",
        "nudge the value a fine step (choices: change)",
        Action::NudgeFine,
    ),
    key(
        &[Shift(Left), Shift(Right)],
        Scope::Normal,
        "⇧←→",
        &[(When::Number, "coarse")],
        "Shift+← →",
        "nudge a coarse step (ten fine steps)",
        Action::NudgeCoarse,
    ),
    key(
        &[AltOrCtrl(Left), AltOrCtrl(Right)],
        Scope::Normal,
        "Alt←→",
        &[(When::Number, "finer")],
        "Alt+← →",
        "nudge a finer step (a tenth of a fine step; Ctrl+← → too); the message line shows all three",
        Action::NudgeFiner,
    ),
    key(
        &[Any(Enter)],
        Scope::Normal,
        "Enter",
        &[(When::Typed, "type")],
        "Enter",
        "type a value with its unit: 2.8bar, 45psi, 6.5in, 22deg, auto; a bare number is taken in the unit shown",
        Action::StartTyping,
    ),
    key(
        &[Plain(Char('g'))],
        Scope::Normal,
        "g",
        &[(When::Number, "goal")],
        "g",
        "which value of the selected input gives a goal: type a speed (30rpm) or a throw (11m, 36ft); the value nearest the present one is applied, or the nearest reachable named",
        Action::AskGoal,
    ),
    key(
        &[Plain(Char('+'))],
        Scope::Normal,
        "+",
        &[(When::PerArm, "arm")],
        "+",
        "add an arm (a copy of the selected one); arms are spread evenly",
        Action::AddArm,
    ),
    key(
        &[Plain(Char('-'))],
        Scope::Normal,
        "-",
        &[(When::PerArm, "arm")],
        "-",
        "remove the selected arm; arms are spread evenly",
        Action::RemoveArm,
    ),
    key(
        &[Plain(Char('a'))],
        Scope::Normal,
        "a",
        &[
            (When::ArmsTogether, "split arms"),
            (When::ArmsApartAlike, "join arms"),
        ],
        "a",
        "arms together (one block edits every arm, azimuths evenly spread) / apart (each arm on its own); joining needs the arms alike",
        Action::ToggleArms,
    ),
    key(
        &[Plain(Char('*'))],
        Scope::Normal,
        "*",
        &[(When::ArmsApart, "arm to all")],
        "*",
        "arms apart: copy the selected arm (radius, height, rise, tube, nozzle) to every arm; azimuths kept",
        Action::CopyArm,
    ),
    key(
        &[Any(PageUp), Any(PageDown)],
        Scope::Normal,
        "PgUp/Dn",
        &[(When::Viewing(View::Balance), "table")],
        "PgUp PgDn",
        "scroll the table or the view (the mouse wheel too; over the list it scrolls the list)",
        Action::ScrollView,
    ),
    // The Field view.
    key(
        &[Plain(Char('p'))],
        Scope::InView(View::Field),
        "p",
        &[(When::Always, "pressure")],
        "p",
        "type the measured inlet pressure (2.8bar, 40psi)",
        Action::Measure(Measure::Pressure),
    ),
    key(
        &[Plain(Char('r'))],
        Scope::InView(View::Field),
        "r",
        &[(When::Always, "rotation")],
        "r",
        "type the measured rotation (40rpm, 1.5s per turn, 10/14.2s)",
        Action::Measure(Measure::Rotation),
    ),
    key(
        &[Plain(Char('f'))],
        Scope::InView(View::Field),
        "f",
        &[(When::Always, "flow")],
        "f",
        "type the measured flow (12L/min, 5L in 30s)",
        Action::Measure(Measure::Flow),
    ),
    key(
        &[Plain(Char('t'))],
        Scope::InView(View::Field),
        "t",
        &[(When::Always, "throw")],
        "t",
        "type the measured wetted radius (7.5m, 25ft)",
        Action::Measure(Measure::Throw),
    ),
    key(
        &[Plain(Char('n'))],
        Scope::InView(View::Field),
        "n",
        &[(When::Always, "row")],
        "n",
        "add the reading above to the table of readings; the table is fitted (running friction, brake)",
        Action::AddReadingRow,
    ),
    key(
        &[Plain(Char('x'))],
        Scope::InView(View::Field),
        "x",
        &[(When::Always, "drop row")],
        "x",
        "drop the last row of the table of readings",
        Action::DropReadingRow,
    ),
    key(
        &[Plain(Char('d'))],
        Scope::InView(View::Field),
        "d",
        &[(When::Always, "coast-down")],
        "d",
        "type the coast-down, seconds at each completed turn after the water is shut off (0.9, 1.9, 3.0)",
        Action::Measure(Measure::Coast),
    ),
    key(
        &[Plain(Char('k'))],
        Scope::InView(View::Field),
        "k",
        &[(When::Always, "keep")],
        "k",
        "keep the readings when another file opens (they are cleared otherwise)",
        Action::KeepReadings,
    ),
    // The Compare view.
    key(
        &[Plain(Char('[')), Plain(Char(']'))],
        Scope::InView(View::Compare),
        "[ ]",
        &[(When::Always, "pick pin")],
        "[ ]",
        "pick a pin (▸): the one before / after",
        Action::PickPin,
    ),
    key(
        &[Plain(Char('<')), Plain(Char('>'))],
        Scope::InView(View::Compare),
        "< >",
        &[(When::Always, "move")],
        "< >",
        "move the picked pin left / right (the first is the baseline)",
        Action::MovePin,
    ),
    key(
        &[Plain(Char('x'))],
        Scope::InView(View::Compare),
        "x",
        &[(When::Always, "unpin")],
        "x",
        "drop the picked pin",
        Action::DropPin,
    ),
    // Everywhere in the normal mode.
    key(
        &[
            Any(Tab),
            Any(BackTab),
            Plain(Char('1')),
            Plain(Char('2')),
            Plain(Char('3')),
            Plain(Char('4')),
            Plain(Char('5')),
        ],
        Scope::Normal,
        "Tab/1-5",
        &[(When::Always, "view")],
        "Tab  Shift+Tab  1-5",
        "switch view: Balance, Throw, Pattern, Field, Compare (or click a tab)",
        Action::SwitchView,
    ),
    key(
        &[Plain(Char('u'))],
        Scope::Normal,
        "u",
        &[(When::Always, "units")],
        "u",
        "switch between metric and US units",
        Action::ToggleUnits,
    ),
    key(
        &[Plain(Char('s'))],
        Scope::Normal,
        "s",
        &[(When::Always, "save")],
        "s",
        "save: only changed values change, comments stay; the old file is kept as .bak",
        Action::Save,
    ),
    key(
        &[Plain(Char('S'))],
        Scope::Normal,
        "S",
        &[(When::Always, "save as")],
        "S",
        "save under another name",
        Action::SaveAs,
    ),
    key(
        &[Plain(Char('o'))],
        Scope::Normal,
        "o",
        &[(When::Always, "open")],
        "o",
        "open a scenario from scenarios/ or this folder",
        Action::Open,
    ),
    key(
        &[Plain(Char('c'))],
        Scope::Normal,
        "c",
        &[(When::Always, "pin")],
        "c",
        "pin the current design for Compare",
        Action::PinDesign,
    ),
    key(
        &[Plain(Char('m'))],
        Scope::Normal,
        "m",
        &[(When::Number, "mark free")],
        "m",
        "mark the selected input free for a design search (◆ in the list), or unmark it",
        Action::MarkFree,
    ),
    key(
        &[Plain(Char('e'))],
        Scope::Normal,
        "e",
        &[(When::Always, "search")],
        "e",
        "design search from the design on screen: the marked inputs (or the selected one) with their ranges, the goals, what to make largest",
        Action::OpenSearch,
    ),
    key(
        &[Plain(Char('z')), Plain(Char('Z'))],
        Scope::Normal,
        "z",
        &[(When::Always, "undo")],
        "z  Z",
        "undo / redo the last edit (a goal's answer and an applied search result too)",
        Action::Undo,
    ),
    key(
        &[Plain(Char('q'))],
        Scope::Normal,
        "q",
        &[(When::Always, "quit")],
        "q",
        "quit (asks first when there are unsaved changes)",
        Action::Quit,
    ),
    key(
        &[Ctrl('c')],
        Scope::Everywhere,
        "^C",
        NO_HINT,
        "Ctrl+C",
        "quit from anywhere, typing included (asks first when there are unsaved changes)",
        Action::Quit,
    ),
    // Typing.
    key(
        &[Any(Enter)],
        Scope::Typing,
        "Enter",
        &[(When::Always, "keep")],
        "Enter",
        "keep the value (a refused value leaves the old one and says why)",
        Action::FinishTyping,
    ),
    key(
        &[Any(Esc)],
        Scope::Typing,
        "Esc",
        &[(When::Always, "cancel")],
        "Esc",
        "cancel",
        Action::CancelTyping,
    ),
    key(
        &[Any(Backspace)],
        Scope::Typing,
        "Bksp",
        &[(When::Always, "delete")],
        "Backspace",
        "delete the last character",
        Action::DeleteChar,
    ),
    key(
        &[Ctrl('u')],
        Scope::Typing,
        "^U",
        &[(When::Always, "clear")],
        "Ctrl+U",
        "clear the text",
        Action::ClearTyping,
    ),
    key(
        &[Key::AnyChar],
        Scope::Typing,
        "",
        NO_HINT,
        "characters",
        "are typed; a bare number is taken in the unit shown",
        Action::TypeChar,
    ),
    // The help screen.
    key(
        &[Any(Up), Any(Down), Plain(Char('k')), Plain(Char('j'))],
        Scope::Help,
        "↑↓",
        &[(When::Always, "scroll")],
        "↑ ↓  k j",
        "scroll a line",
        Action::HelpLine,
    ),
    key(
        &[Any(PageUp), Any(PageDown)],
        Scope::Help,
        "PgUp/Dn",
        NO_HINT,
        "PgUp PgDn",
        "scroll a page",
        Action::HelpPage,
    ),
    key(
        &[Key::Other],
        Scope::Help,
        "any other key",
        &[(When::Always, "closes")],
        "any other key",
        "closes the help",
        Action::CloseHelp,
    ),
    // The file picker.
    key(
        &[Any(Up), Any(Down)],
        Scope::Picker,
        "↑↓",
        &[(When::Always, "choose")],
        "↑ ↓",
        "choose a file",
        Action::PickerMove,
    ),
    key(
        &[Any(Enter)],
        Scope::Picker,
        "Enter",
        &[(When::Always, "open")],
        "Enter",
        "open it (asks first when there are unsaved changes)",
        Action::PickerOpen,
    ),
    key(
        &[Plain(Char('c'))],
        Scope::Picker,
        "c",
        &[(When::Always, "add to Compare")],
        "c",
        "pin it for Compare instead",
        Action::PickerPin,
    ),
    key(
        &[Any(Esc)],
        Scope::Picker,
        "Esc",
        &[(When::Always, "close")],
        "Esc",
        "close the picker",
        Action::PickerClose,
    ),
    // Questions.
    key(
        &[Plain(Char('s'))],
        Scope::QuitQuestion,
        "s",
        &[(When::Always, "save and quit")],
        "s",
        "unsaved changes on quitting: save, then quit",
        Action::SaveAndQuit,
    ),
    key(
        &[Plain(Char('y')), Plain(Char('q'))],
        Scope::QuitQuestion,
        "y",
        &[(When::Always, "quit without saving")],
        "y  q",
        "unsaved changes on quitting: quit without saving",
        Action::Yes,
    ),
    key(
        &[Any(Esc), Plain(Char('n'))],
        Scope::QuitQuestion,
        "Esc",
        &[(When::Always, "stay")],
        "Esc  n",
        "unsaved changes on quitting: stay",
        Action::No,
    ),
    key(
        &[Plain(Char('y'))],
        Scope::Question,
        "y",
        &[(When::Always, "yes")],
        "y",
        "other questions (open over unsaved changes, overwrite a file): yes",
        Action::Yes,
    ),
    key(
        &[Plain(Char('n')), Any(Esc)],
        Scope::Question,
        "n/Esc",
        &[(When::Always, "no")],
        "n  Esc",
        "other questions: no",
        Action::No,
    ),
    // The design search.
    key(
        &[Any(Up), Any(Down), Any(Tab), Any(BackTab)],
        Scope::SearchForm,
        "↑↓",
        &[(When::Always, "line")],
        "↑ ↓  Tab",
        "form: move between its lines; type over a line's text (Backspace, Ctrl+U clear)",
        Action::FormLine,
    ),
    key(
        &[Plain(Left), Plain(Right)],
        Scope::SearchForm,
        "←→",
        &[(When::Always, "objective")],
        "← →",
        "form, last line: what to make largest (throw, start margin, CU, spacing)",
        Action::FormObjective,
    ),
    key(
        &[Any(Enter)],
        Scope::SearchForm,
        "Enter",
        &[(When::Always, "search")],
        "Enter",
        "form: run the search (a wrong line is named and the form stays)",
        Action::RunSearch,
    ),
    key(
        &[Any(Esc)],
        Scope::SearchForm,
        "Esc",
        &[(When::Always, "close form")],
        "Esc",
        "form: close it; what was typed is offered again next time",
        Action::CloseSearch,
    ),
    key(
        &[Any(Backspace)],
        Scope::SearchForm,
        "Bksp",
        NO_HINT,
        "Backspace",
        "form: delete the last character of the line",
        Action::DeleteChar,
    ),
    key(
        &[Ctrl('u')],
        Scope::SearchForm,
        "^U",
        NO_HINT,
        "Ctrl+U",
        "form: clear the line",
        Action::ClearTyping,
    ),
    key(
        &[Key::AnyChar],
        Scope::SearchForm,
        "",
        NO_HINT,
        "characters",
        "form: are typed into the line (40deg..85deg, 25..35, 10m, 20L/min, 1.5, 80)",
        Action::TypeChar,
    ),
    key(
        &[Any(Esc)],
        Scope::SearchRunning,
        "Esc",
        &[(When::Always, "stop waiting")],
        "Esc",
        "while it runs: stop waiting for it; the design stays as it was",
        Action::CancelSearch,
    ),
    key(
        &[Any(Up), Any(Down)],
        Scope::SearchResults,
        "↑↓",
        &[(When::Always, "pick design")],
        "↑ ↓",
        "found: choose the best design or a runner-up",
        Action::ResultMove,
    ),
    key(
        &[Plain(Char('c'))],
        Scope::SearchResults,
        "c",
        &[(When::Always, "pin for Compare")],
        "c",
        "found: pin the chosen design for Compare",
        Action::PinFound,
    ),
    key(
        &[Any(Enter)],
        Scope::SearchResults,
        "Enter",
        &[(When::Always, "apply")],
        "Enter",
        "found: apply the chosen design (z takes it back)",
        Action::ApplyFound,
    ),
    key(
        &[Plain(Char('e'))],
        Scope::SearchResults,
        "e",
        &[(When::Always, "goals")],
        "e",
        "found: back to the form",
        Action::BackToGoals,
    ),
    key(
        &[Any(Esc)],
        Scope::SearchResults,
        "Esc",
        &[(When::Always, "close list")],
        "Esc",
        "found: close",
        Action::CloseSearch,
    ),
];

/// What the mouse does, for the help screen (the mouse is not in [`KEYS`]:
/// it acts where it points).
pub const MOUSE: &[(&str, &str)] = &[
    ("click", "select a field, or a view by its tab"),
    (
        "wheel",
        "scroll what is under the pointer: the list, the table or the view",
    ),
];

mod lookup;

pub use lookup::{find, help_entries, hints, keys_of};

#[cfg(test)]
mod tests;
