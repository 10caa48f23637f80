//! The interface's state and everything that changes it.
//!
//! [`App`] owns the design being edited, its spin solution (solved on this
//! thread at every edit: it takes well under a millisecond), the throw and
//! pattern results (computed on the [`Worker`] thread), and the state of the
//! screen: which field is selected, which view is shown, what is being typed,
//! which question is being asked. Only [`App::event`] and
//! [`App::poll_worker`] change it; drawing (in [`super::views`]) only reads.
//!
//! Every edit builds a candidate design and passes it through the same
//! validation a scenario file gets (`Scenario::from_design` → `to_design`),
//! so the interface never holds a design a file could not hold. A refused
//! value leaves the design as it was and says why on the message line.
//!
//! The work is split by concern, each file an `impl App` block of its own:
//! `state.rs` (views, modes, questions, pins), `dispatch.rs`
//! (keys, through the key table, and the mouse), `edit.rs` (nudging, typing,
//! arms), `screen.rs` (the list and the views), `files.rs` (open, save, the
//! picker, quitting), `pins.rs` (Compare's pins), `jobs.rs` (the worker's
//! results and re-solving), `measured.rs` and `readings.rs` (the Field view),
//! `ask.rs` (goals), `search_form.rs` (the design search), `task.rs` (their
//! threads) and `undo.rs` (undo and redo).

use std::path::{Path, PathBuf};

use ratatui::layout::Rect;

mod ask;
mod dispatch;
mod edit;
mod files;
mod jobs;
mod measured;
mod pins;
mod readings;
mod screen;
mod search_form;
mod state;
mod task;
mod undo;

pub use ask::{parse_goal, Ask, Want};
pub use files::scenario_files;
pub use measured::{parse_flow, parse_rotation, Measured};
pub use readings::{parse_turn_times, UnitReadings};
pub use search_form::{new_form, Candidate, Found, Item, SearchForm, SearchPanel, OBJECTIVES};
pub use state::{
    Confirm, Input, InputTarget, Level, Measure, Message, Mode, Pending, Picker, Pinned, View,
    MAX_PINS,
};
pub use undo::History;

use super::fields::{self, Arms, Field, Row};
use super::layout::{self, Areas};
use super::theme::Theme;
use super::views::balance_table;
use super::worker::{SprayResult, Worker};
use crate::inverse::compare::Comparison;
use crate::inverse::field::FieldCheck;
use crate::physics::balance::{solve, SpinReport, TableRow};
use crate::physics::checks::{cautions, Caution, Rules};
use crate::physics::design::{Bearing, Design};
use crate::scenario::{self, Scenario, ScenarioError};
use crate::units::UnitSystem;

/// The whole interface state. Drawing and the tests in `crate::tui` read its
/// fields; only the methods in `app/` change them.
#[derive(Debug)]
pub struct App {
    // The design and its file.
    /// The design being edited (always valid).
    pub(in crate::tui) design: Design,
    /// Edited since last saved.
    pub(in crate::tui) dirty: bool,
    /// The design as last opened or saved (undoing back to it is not an edit).
    as_saved: Design,
    /// The file it came from or was saved to.
    pub(in crate::tui) path: Option<PathBuf>,
    /// Where the file picker looks (`scenarios/` below it, and itself).
    pub(in crate::tui) base_dir: PathBuf,
    /// The scenario's notes, kept for saving.
    notes: String,
    /// The file's text as last read or written (to notice changes on disk).
    disk_text: Option<String>,
    /// The text the design was read from (its file's, or the built-in
    /// example's): saving edits it in place, keeping its comments.
    source_text: Option<String>,

    // What the model says about it.
    /// Spin solution of the design.
    pub(in crate::tui) report: SpinReport,
    /// Torque–speed table of the design (the Balance view's).
    pub(in crate::tui) table: Vec<TableRow>,
    /// Throw, pattern and layout (possibly of an earlier edit while `computing`).
    pub(in crate::tui) spray: Option<Box<SprayResult>>,
    /// A newer spray result has been asked for.
    pub(in crate::tui) computing: bool,
    spray_id: u64,
    next_id: u64,
    worker: Worker,

    // The screen.
    /// Unit system for everything shown.
    pub(in crate::tui) units: UnitSystem,
    /// The view on the right.
    pub(in crate::tui) view: View,
    /// Whether the list edits the arms together (one block) or apart.
    pub(in crate::tui) arms: Arms,
    /// The list's rows.
    pub(in crate::tui) rows: Vec<Row>,
    /// Index of the selected row (always a field).
    pub(in crate::tui) selected: usize,
    /// First row shown in the list.
    pub(in crate::tui) list_offset: usize,
    /// Scroll of the view on the right (table rows, compare lines).
    pub(in crate::tui) pane_scroll: usize,
    /// Keyboard mode.
    pub(in crate::tui) mode: Mode,
    /// The message line.
    pub(in crate::tui) message: Option<Message>,
    /// Terminal size.
    pub(in crate::tui) size: (u16, u16),
    /// Colours.
    pub(in crate::tui) theme: Theme,
    /// Set when the program should end.
    pub(in crate::tui) quit: bool,

    // The Compare view.
    /// Designs pinned for comparison.
    pub(in crate::tui) pins: Vec<Pinned>,
    /// The pin the Compare keys act on (dropped, moved).
    pub(in crate::tui) pin_selected: usize,
    /// The comparison of the design with the pinned ones.
    pub(in crate::tui) comparison: Pending<Result<Comparison, String>>,

    // The Field view.
    /// Field-check readings.
    pub(in crate::tui) measured: Measured,
    /// The field check of the design against the readings.
    pub(in crate::tui) field: Pending<Result<FieldCheck, String>>,
    /// Readings at several pressures and the coast-down, with their fits.
    pub(in crate::tui) unit: UnitReadings,

    // Questions asked of the design, and the edits' history.
    /// Goals and design searches.
    pub(in crate::tui) ask: Ask,
    /// The edits undo and redo go through.
    pub(in crate::tui) history: History,
}

impl App {
    /// Opens a scenario file, or the built-in example when `path` is None.
    pub fn open(path: Option<&Path>) -> Result<App, ScenarioError> {
        match path {
            Some(p) => {
                let text = std::fs::read_to_string(p).map_err(|io| ScenarioError::Read {
                    path: p.to_path_buf(),
                    io,
                })?;
                let sc = scenario::load_str(&text, &p.display().to_string())?;
                App::from_scenario(sc, Some(p.to_path_buf()), Some(text))
            }
            None => {
                let mut app = App::from_scenario(scenario::builtin_example(), None, None)?;
                app.source_text = Some(scenario::BUILTIN_EXAMPLE.to_string());
                Ok(app)
            }
        }
    }

    /// The interface on a scenario (already loaded and checked).
    pub fn from_scenario(
        sc: Scenario,
        path: Option<PathBuf>,
        disk_text: Option<String>,
    ) -> Result<App, ScenarioError> {
        let design = sc.to_design()?;
        let report = solve(&design);
        let table = balance_table(&design, &report);
        let arms = edit::arms_shown(&design);
        let rows = fields::rows(&design, arms);
        let mut app = App {
            as_saved: design.clone(),
            design,
            notes: sc.notes.clone(),
            path,
            source_text: disk_text.clone(),
            disk_text,
            dirty: false,
            report,
            table,
            spray: None,
            computing: false,
            spray_id: 0,
            next_id: 1,
            worker: Worker::start(),
            units: UnitSystem::Metric,
            view: View::Balance,
            arms,
            rows,
            selected: 0,
            list_offset: 0,
            pane_scroll: 0,
            mode: Mode::Normal,
            message: None,
            size: (80, 24),
            theme: Theme::from_env(),
            quit: false,
            pins: Vec::new(),
            pin_selected: 0,
            comparison: Pending::default(),
            measured: Measured::default(),
            field: Pending::default(),
            unit: UnitReadings::default(),
            ask: Ask::default(),
            history: History::default(),
            base_dir: std::env::current_dir().unwrap_or_else(|_| PathBuf::from(".")),
        };
        app.selected = app.first_field_from(0, true);
        app.request_spray();
        Ok(app)
    }

    /// The practice checks of the design (speed, start margin, spin-up,
    /// and, once the drop paths are flown, the overhead clearance).
    pub fn cautions(&self) -> Vec<Caution> {
        let rules = Rules::for_design(&self.design);
        let peaks: Option<Vec<Option<f64>>> = self.spray.as_ref().map(|s| {
            let mut peaks = vec![None; self.design.rotor.arms.len()];
            for (arm, paths) in s.arms.iter().zip(&s.paths) {
                if let (Some(slot), Some(p)) = (peaks.get_mut(*arm), paths) {
                    *slot = Some(p.largest.landing.apex_m);
                }
            }
            peaks
        });
        cautions(&self.design, &self.report, peaks.as_deref(), &rules)
    }

    /// The selected field.
    pub fn selected_field(&self) -> Option<Field> {
        match self.rows.get(self.selected) {
            Some(Row::Field(f)) => Some(*f),
            _ => None,
        }
    }

    /// The screen's areas at the current size.
    pub fn areas(&self) -> Areas {
        layout::areas(Rect::new(0, 0, self.size.0, self.size.1))
    }

    pub(super) fn error(&mut self, text: impl Into<String>) {
        self.message = Some(Message {
            level: Level::Error,
            text: text.into(),
        });
    }

    pub(super) fn info(&mut self, text: impl Into<String>) {
        self.message = Some(Message {
            level: Level::Info,
            text: text.into(),
        });
    }

    pub(super) fn units_word(&self) -> &'static str {
        match self.units {
            UnitSystem::Metric => "metric",
            UnitSystem::Us => "US",
        }
    }

    /// Shows the design in another unit system (every number on screen follows).
    pub fn set_units(&mut self, units: UnitSystem) {
        self.units = units;
    }

    /// The bearing's running torque, for labels.
    pub fn bearing_is_measured(&self) -> bool {
        matches!(self.design.friction.bearing, Bearing::Measured { .. })
    }
}
