//! The interface's small types: views, keyboard modes, questions, messages,
//! pins, and a result the worker is computing.

use std::path::PathBuf;

use crate::physics::design::Design;
use crate::tui::fields::Field;

/// Most scenarios pinned for comparison at once.
pub const MAX_PINS: usize = 4;

/// The five views on the right.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum View {
    /// Torque against speed, and the table.
    Balance,
    /// Side view of the trajectories.
    Throw,
    /// Radial profile and the layout's rate map.
    Pattern,
    /// Measured against expected.
    Field,
    /// The design against pinned and saved scenarios.
    Compare,
}

impl View {
    /// The views in tab order.
    pub const ALL: [View; 5] = [
        View::Balance,
        View::Throw,
        View::Pattern,
        View::Field,
        View::Compare,
    ];

    /// The tab title.
    pub fn title(self) -> &'static str {
        match self {
            View::Balance => "Balance",
            View::Throw => "Throw",
            View::Pattern => "Pattern",
            View::Field => "Field",
            View::Compare => "Compare",
        }
    }

    pub(super) fn index(self) -> usize {
        View::ALL.iter().position(|v| *v == self).unwrap_or(0)
    }
}

/// How serious a message is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Level {
    /// Information (saved, opened).
    Info,
    /// A refused value or a failed save.
    Error,
}

/// A line for the message bar.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Message {
    /// How serious.
    pub level: Level,
    /// The text.
    pub text: String,
}

/// What typed text is for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum InputTarget {
    /// A field of the design.
    Field(Field),
    /// A file name to save as.
    SaveAs,
    /// A measurement in the Field view.
    Measured(Measure),
    /// A goal for the input (`g`): a speed or a wetted radius.
    Goal(Field),
}

/// The measurements typed in the Field view.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Measure {
    /// Inlet pressure.
    Pressure,
    /// Rotation: rpm, seconds per turn, or turns over a time.
    Rotation,
    /// Flow: a rate, or a volume caught over a time (optional).
    Flow,
    /// Wetted radius (optional).
    Throw,
    /// Coast-down: seconds at each completed turn after the water is shut off.
    Coast,
}

/// Text being typed.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Input {
    /// What it is for.
    pub target: InputTarget,
    /// The text so far.
    pub text: String,
}

/// A question waiting for an answer.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Confirm {
    /// Quit with unsaved changes?
    QuitUnsaved,
    /// Open another file with unsaved changes?
    OpenUnsaved(PathBuf),
    /// The file changed on disk since it was opened: overwrite?
    OverwriteChanged(PathBuf),
    /// Save over another existing file?
    OverwriteExisting(PathBuf),
}

/// The file picker.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Picker {
    /// Scenario files found.
    pub files: Vec<PathBuf>,
    /// The highlighted one.
    pub selected: usize,
}

/// What the keyboard is doing.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Mode {
    /// Moving about and nudging.
    Normal,
    /// Typing a value.
    Typing(Input),
    /// The help overlay, scrolled by this many lines.
    Help(u16),
    /// Choosing a file.
    Picker(Picker),
    /// Asking a question.
    Confirm(Confirm),
    /// The design search's form, progress or results.
    Search(super::SearchPanel),
}

/// A design kept for comparison.
#[derive(Debug, Clone)]
pub struct Pinned {
    /// Column heading.
    pub label: String,
    /// The design.
    pub design: Design,
}

/// A result the worker is computing, with the id of the request that counts.
#[derive(Debug, Clone)]
pub struct Pending<T> {
    /// The latest result (possibly of an earlier request while `waiting`).
    pub result: Option<Box<T>>,
    /// A newer result has been asked for.
    pub waiting: bool,
    pub(super) id: u64,
}

impl<T> Pending<T> {
    /// Takes `result` when it answers the latest request (`id`); true when taken.
    pub(super) fn accept(&mut self, id: u64, result: Box<T>) -> bool {
        if id != self.id {
            return false;
        }
        self.result = Some(result);
        self.waiting = false;
        true
    }
}

impl<T> Default for Pending<T> {
    fn default() -> Self {
        Pending {
            result: None,
            waiting: false,
            id: 0,
        }
    }
}
