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

mod lookup;
mod table;

pub use lookup::{find, help_entries, hints, keys_of};
pub use table::{KEYS, MOUSE};

#[cfg(test)]
mod tests;
