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

use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use ratatui::crossterm::event::{
    Event, KeyCode, KeyEvent, KeyEventKind, KeyModifiers, MouseButton, MouseEvent, MouseEventKind,
};
use ratatui::layout::{Position, Rect};

mod readings;

pub use readings::{parse_turn_times, UnitReadings};

use super::fields::{self, Arms, ChoiceHint, Field, Kind, Row, Stride};
use super::layout::{self, Areas};
use super::theme::Theme;
use super::worker::{Done, Job, SprayResult, Worker};
use crate::catalogue;
use crate::inverse::compare::Comparison;
use crate::inverse::field::{FieldCheck, FieldReading, FlowReading, RotationReading, ThrowReading};
use crate::physics::balance::{solve, table_top_speed, SpinModel, SpinReport, TableRow};
use crate::physics::checks::{cautions, Caution, Rules};
use crate::physics::design::{Arm, Bearing, Design, Washer, WasherRule};
use crate::scenario::{self, Scenario, ScenarioError};
use crate::units::{self, Dimension as D, UnitSystem};

/// Rows of the torque–speed table behind the Balance chart.
pub const TABLE_POINTS: usize = 41;

/// Top speed of the Balance chart and table, rad/s: twice the highest
/// equilibrium (so the operating point sits mid-chart and a far-off runaway
/// does not squash it); without one, the speed at which the tips reach 10 m/s.
pub fn balance_top_speed(report: &SpinReport, design: &Design) -> f64 {
    let full = table_top_speed(report);
    match report.equilibria.last() {
        Some(e) if e.omega_rad_s > 0.0 => (2.0 * e.omega_rad_s).min(full.max(e.omega_rad_s * 1.2)),
        _ => {
            // No equilibrium to centre on: stop where the tips reach 10 m/s,
            // well past any working speed (common practice: tips run a few m/s).
            let r_max = design
                .rotor
                .arms
                .iter()
                .map(|a| a.radius_m)
                .fold(0.0, f64::max);
            if r_max > 0.0 {
                full.min(10.0 / r_max)
            } else {
                full
            }
        }
    }
}

/// Drive and resisting torque from rest to [`balance_top_speed`], `points` rows.
pub fn balance_table(design: &Design, report: &SpinReport, points: usize) -> Vec<TableRow> {
    let model = SpinModel::new(design);
    let top = balance_top_speed(report, design);
    let n = points.max(2);
    (0..n)
        .map(|k| model.point(top * k as f64 / (n - 1) as f64))
        .collect()
}
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

    fn index(self) -> usize {
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
}

/// A design kept for comparison.
#[derive(Debug, Clone)]
pub struct Pinned {
    /// Column heading.
    pub label: String,
    /// The design.
    pub design: Design,
}

/// Readings typed in the Field view (SI).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Measured {
    /// Inlet gauge pressure, Pa.
    pub pressure_pa: Option<f64>,
    /// Rotation, as taken.
    pub rotation: Option<RotationReading>,
    /// Flow, if measured.
    pub flow: Option<FlowReading>,
    /// Wetted radius, m, if measured.
    pub throw_m: Option<f64>,
}

impl Measured {
    /// The readings for a field check, once pressure and rotation are in.
    pub fn reading(&self) -> Option<FieldReading> {
        Some(FieldReading {
            flow: self.flow,
            throw: self.throw_m.map(ThrowReading::new),
            ..FieldReading::new(self.pressure_pa?, self.rotation?)
        })
    }
}

/// A result the worker is computing, with the id of the request that counts.
#[derive(Debug, Clone)]
pub struct Pending<T> {
    /// The latest result (possibly of an earlier request while `waiting`).
    pub result: Option<Box<T>>,
    /// A newer result has been asked for.
    pub waiting: bool,
    id: u64,
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

/// The whole interface state.
#[derive(Debug)]
pub struct App {
    /// The design being edited (always valid).
    pub design: Design,
    /// The scenario's notes, kept for saving.
    pub notes: String,
    /// The file it came from or was saved to.
    pub path: Option<PathBuf>,
    /// The file's text as last read or written (to notice changes on disk).
    disk_text: Option<String>,
    /// The text the design was read from (its file's, or the built-in
    /// example's): saving edits it in place, keeping its comments.
    source_text: Option<String>,
    /// Edited since last saved.
    pub dirty: bool,
    /// Spin solution of the design.
    pub report: SpinReport,
    /// Torque–speed table of the design.
    pub table: Vec<TableRow>,
    /// Throw, pattern and layout (possibly of an earlier edit while `computing`).
    pub spray: Option<Box<SprayResult>>,
    /// A newer spray result has been asked for.
    pub computing: bool,
    spray_id: u64,
    next_id: u64,
    worker: Worker,
    /// Unit system for everything shown.
    pub units: UnitSystem,
    /// The view on the right.
    pub view: View,
    /// Whether the list edits the arms together (one block) or apart.
    pub arms: Arms,
    /// The list's rows.
    pub rows: Vec<Row>,
    /// Index of the selected row (always a field).
    pub selected: usize,
    /// First row shown in the list.
    pub list_offset: usize,
    /// Scroll of the view on the right (table rows, compare lines).
    pub pane_scroll: usize,
    /// Keyboard mode.
    pub mode: Mode,
    /// The message line.
    pub message: Option<Message>,
    /// Terminal size.
    pub size: (u16, u16),
    /// Colours.
    pub theme: Theme,
    /// Set when the program should end.
    pub quit: bool,
    /// Designs pinned for comparison.
    pub pins: Vec<Pinned>,
    /// The pin the Compare keys act on (dropped, moved).
    pub pin_selected: usize,
    /// The comparison of the design with the pinned ones.
    pub comparison: Pending<Result<Comparison, String>>,
    /// Field-check readings.
    pub measured: Measured,
    /// Where the file picker looks (`scenarios/` below it, and itself).
    pub base_dir: PathBuf,
    /// The field check of the design against the readings.
    pub field: Pending<Result<FieldCheck, String>>,
    /// Readings at several pressures and the coast-down, with their fits.
    pub unit: UnitReadings,
}

/// Where a file picker looks: `scenarios/` and the current folder.
pub fn scenario_files(base: &Path) -> Vec<PathBuf> {
    let mut files = Vec::new();
    for dir in [base.join("scenarios"), base.to_path_buf()] {
        let Ok(entries) = std::fs::read_dir(&dir) else {
            continue;
        };
        let mut here: Vec<PathBuf> = entries
            .flatten()
            .map(|e| e.path())
            .filter(|p| p.is_file() && p.extension().is_some_and(|x| x == "ron"))
            .collect();
        here.sort();
        files.extend(here);
    }
    files
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
        let table = balance_table(&design, &report, TABLE_POINTS);
        let arms = arms_shown(&design);
        let rows = fields::rows(&design, arms);
        let mut app = App {
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

    fn id(&mut self) -> u64 {
        self.next_id += 1;
        self.next_id
    }

    fn request_spray(&mut self) {
        let id = self.id();
        self.spray_id = id;
        self.computing = self.worker.send(Job::Spray {
            id,
            design: Box::new(self.design.clone()),
            report: Box::new(self.report.clone()),
        });
    }

    /// Takes every finished job off the channel; true when anything changed.
    pub fn poll_worker(&mut self) -> bool {
        let mut changed = false;
        while let Some(done) = self.worker.try_recv() {
            changed |= self.take(done);
        }
        changed
    }

    fn take(&mut self, done: Done) -> bool {
        match done {
            Done::Spray { id, result } => {
                if id == self.spray_id {
                    self.spray = Some(result);
                    self.computing = false;
                    return true;
                }
                false
            }
            Done::Compare { id, result } => {
                if id == self.comparison.id {
                    self.comparison.result = Some(result);
                    self.comparison.waiting = false;
                    return true;
                }
                false
            }
            Done::Field { id, result } => {
                if id == self.field.id {
                    self.field.result = Some(result);
                    self.field.waiting = false;
                    return true;
                }
                false
            }
            Done::Fit { id, result } => {
                if id == self.unit.fit.id {
                    self.unit.fit.result = Some(result);
                    self.unit.fit.waiting = false;
                    return true;
                }
                false
            }
            Done::Coast { id, result } => {
                if id == self.unit.coast.id {
                    self.unit.coast.result = Some(result);
                    self.unit.coast.waiting = false;
                    return true;
                }
                false
            }
        }
    }

    /// True while any job the screen waits for is outstanding.
    pub fn busy(&self) -> bool {
        self.computing || self.comparison.waiting || self.field.waiting || self.unit.waiting()
    }

    /// Asks for the comparison again (the design or the pins changed).
    fn request_comparison(&mut self) {
        if self.pins.is_empty() {
            self.comparison = Pending::default();
            return;
        }
        let id = self.id();
        // The first pin is the baseline the deltas are taken against.
        let mut designs: Vec<(String, Design)> = self
            .pins
            .iter()
            .map(|p| (p.label.clone(), p.design.clone()))
            .collect();
        designs.push(("now".to_string(), self.design.clone()));
        self.comparison.id = id;
        self.comparison.waiting = self.worker.send(Job::Compare { id, designs });
    }

    /// Asks for the field check again (the design or the readings changed).
    fn request_field(&mut self) {
        let Some(reading) = self.measured.reading() else {
            self.field = Pending::default();
            return;
        };
        let id = self.id();
        self.field.id = id;
        self.field.waiting = self.worker.send(Job::Field {
            id,
            design: Box::new(self.design.clone()),
            reading,
        });
    }

    /// Waits until every outstanding job is in (for tests and scripted runs),
    /// at most `timeout`. Returns false on timeout.
    pub fn settle(&mut self, timeout: Duration) -> bool {
        let end = Instant::now() + timeout;
        while self.busy() {
            let left = end.saturating_duration_since(Instant::now());
            if left.is_zero() {
                return false;
            }
            if let Some(done) = self.worker.recv_timeout(left) {
                self.take(done);
            }
        }
        true
    }

    /// Re-solves after the design changed.
    fn resolve(&mut self) {
        self.report = solve(&self.design);
        self.table = balance_table(&self.design, &self.report, TABLE_POINTS);
        self.refresh_rows();
        self.request_spray();
        self.request_comparison();
        self.request_field();
        self.request_speed_fit();
        self.request_coast();
    }

    /// Rebuilds the list (the design's choices or the arms' showing
    /// changed), keeping the selected input selected.
    fn refresh_rows(&mut self) {
        let keep = self.selected_field().map(|f| f.shown_as(self.arms));
        self.rows = fields::rows(&self.design, self.arms);
        self.selected = keep
            .and_then(|f| self.rows.iter().position(|r| *r == Row::Field(f)))
            .unwrap_or_else(|| {
                let i = self.selected.min(self.rows.len().saturating_sub(1));
                self.first_field_from(i, false)
            });
        self.keep_selection_visible();
    }

    /// Validates a candidate design as a file would be and keeps it, or
    /// refuses it with the reason. Returns true when kept.
    fn apply(&mut self, candidate: Design) -> bool {
        match Scenario::from_design(&candidate, self.units, &self.notes).to_design() {
            Ok(valid) => {
                self.design = valid;
                self.dirty = true;
                self.resolve();
                true
            }
            Err(e) => {
                self.refuse(&e);
                false
            }
        }
    }

    fn refuse(&mut self, e: &ScenarioError) {
        let problems = e.problems();
        let text = if problems.is_empty() {
            e.to_string()
        } else {
            problems
                .iter()
                .map(|p| format!("{} ({} = {})", p.rule, p.path, p.value))
                .collect::<Vec<_>>()
                .join("; ")
        };
        self.error(format!("refused, value kept: {text}"));
    }

    fn error(&mut self, text: impl Into<String>) {
        self.message = Some(Message {
            level: Level::Error,
            text: text.into(),
        });
    }

    fn info(&mut self, text: impl Into<String>) {
        self.message = Some(Message {
            level: Level::Info,
            text: text.into(),
        });
    }

    fn first_field_from(&self, start: usize, forward: bool) -> usize {
        let is_field = |i: usize| matches!(self.rows.get(i), Some(Row::Field(_)));
        if forward {
            (start..self.rows.len()).find(|&i| is_field(i))
        } else {
            (0..=start.min(self.rows.len().saturating_sub(1)))
                .rev()
                .find(|&i| is_field(i))
        }
        .or_else(|| (0..self.rows.len()).find(|&i| is_field(i)))
        .unwrap_or(0)
    }

    fn list_height(&self) -> usize {
        self.areas().list.height as usize
    }

    fn keep_selection_visible(&mut self) {
        let h = self.list_height().max(1);
        if self.selected < self.list_offset {
            // Show the group or arm heading above a field when there is room.
            self.list_offset = self.selected.saturating_sub(1);
        } else if self.selected >= self.list_offset + h {
            self.list_offset = self.selected + 1 - h;
        }
        let max = self.rows.len().saturating_sub(h);
        self.list_offset = self.list_offset.min(max);
    }

    fn move_selection(&mut self, down: bool, by: usize) {
        let mut i = self.selected;
        for _ in 0..by {
            let next = if down {
                (i + 1..self.rows.len()).find(|&j| matches!(self.rows.get(j), Some(Row::Field(_))))
            } else {
                (0..i)
                    .rev()
                    .find(|&j| matches!(self.rows.get(j), Some(Row::Field(_))))
            };
            match next {
                Some(j) => i = j,
                None => break,
            }
        }
        self.selected = i;
        self.keep_selection_visible();
    }

    /// Handles one terminal event.
    pub fn event(&mut self, ev: &Event) {
        match ev {
            Event::Key(k) if k.kind == KeyEventKind::Press => self.key(k),
            Event::Mouse(m) => self.mouse(m),
            Event::Resize(w, h) => {
                self.size = (*w, *h);
                self.keep_selection_visible();
            }
            _ => {}
        }
    }

    fn key(&mut self, k: &KeyEvent) {
        if k.modifiers.contains(KeyModifiers::CONTROL) && k.code == KeyCode::Char('c') {
            self.ask_quit();
            return;
        }
        match std::mem::replace(&mut self.mode, Mode::Normal) {
            Mode::Normal => self.key_normal(k),
            Mode::Typing(input) => self.key_typing(k, input),
            Mode::Help(scroll) => self.key_help(k, scroll),
            Mode::Picker(p) => self.key_picker(k, p),
            Mode::Confirm(c) => self.key_confirm(k, c),
        }
    }

    fn key_help(&mut self, k: &KeyEvent, scroll: u16) {
        self.mode = match k.code {
            KeyCode::Down | KeyCode::Char('j') => Mode::Help(scroll.saturating_add(1)),
            KeyCode::Up | KeyCode::Char('k') => Mode::Help(scroll.saturating_sub(1)),
            KeyCode::PageDown => Mode::Help(scroll.saturating_add(10)),
            KeyCode::PageUp => Mode::Help(scroll.saturating_sub(10)),
            _ => Mode::Normal,
        };
    }

    fn key_normal(&mut self, k: &KeyEvent) {
        let shift = k.modifiers.contains(KeyModifiers::SHIFT);
        // A new key press clears an old message.
        self.message = None;
        match k.code {
            KeyCode::Up => self.move_selection(false, 1),
            KeyCode::Down => self.move_selection(true, 1),
            KeyCode::Home => {
                self.selected = self.first_field_from(0, true);
                self.keep_selection_visible();
            }
            KeyCode::End => {
                self.selected = self.first_field_from(self.rows.len().saturating_sub(1), false);
                self.keep_selection_visible();
            }
            KeyCode::Left | KeyCode::Right => {
                let finer = k
                    .modifiers
                    .intersects(KeyModifiers::ALT | KeyModifiers::CONTROL);
                let stride = if finer {
                    Stride::Finer
                } else if shift {
                    Stride::Coarse
                } else {
                    Stride::Fine
                };
                self.nudge(k.code == KeyCode::Right, stride);
            }
            KeyCode::Enter => self.start_typing(),
            KeyCode::Tab => self.set_view((self.view.index() + 1) % View::ALL.len()),
            KeyCode::BackTab => {
                self.set_view((self.view.index() + View::ALL.len() - 1) % View::ALL.len())
            }
            KeyCode::PageDown => self.pane_scroll = self.pane_scroll.saturating_add(5),
            KeyCode::PageUp => self.pane_scroll = self.pane_scroll.saturating_sub(5),
            KeyCode::Char(c) => self.key_char(c),
            KeyCode::Esc => {}
            _ => {}
        }
    }

    fn key_char(&mut self, c: char) {
        match c {
            '1'..='5' => self.set_view(c as usize - '1' as usize),
            '?' => self.mode = Mode::Help(0),
            'u' => {
                self.units = self.units.toggled();
                self.info(format!("showing {} units", self.units_word()));
            }
            's' => self.save(None, false),
            'S' => self.start_save_as(),
            'o' => self.open_picker(),
            'c' => self.pin_current(),
            'q' => self.ask_quit(),
            '+' => self.add_arm(),
            '-' => self.remove_arm(),
            '*' => self.copy_arm_to_all(),
            'a' => self.toggle_arms(),
            'x' if self.view == View::Compare => self.unpin(),
            '[' | ']' if self.view == View::Compare => self.select_pin(c == ']'),
            '<' | '>' if self.view == View::Compare => self.move_pin(c == '>'),
            'p' if self.view == View::Field => {
                self.start_input(InputTarget::Measured(Measure::Pressure))
            }
            'r' if self.view == View::Field => {
                self.start_input(InputTarget::Measured(Measure::Rotation))
            }
            'f' if self.view == View::Field => {
                self.start_input(InputTarget::Measured(Measure::Flow))
            }
            't' if self.view == View::Field => {
                self.start_input(InputTarget::Measured(Measure::Throw))
            }
            'n' if self.view == View::Field => self.add_reading_row(),
            'x' if self.view == View::Field => self.drop_reading_row(),
            'd' if self.view == View::Field => {
                self.start_input(InputTarget::Measured(Measure::Coast))
            }
            'k' if self.view == View::Field => self.toggle_keep_readings(),
            _ => {}
        }
    }

    fn units_word(&self) -> &'static str {
        match self.units {
            UnitSystem::Metric => "metric",
            UnitSystem::Us => "US",
        }
    }

    fn set_view(&mut self, i: usize) {
        if let Some(v) = View::ALL.get(i) {
            if *v != self.view {
                self.pane_scroll = 0;
            }
            self.view = *v;
        }
    }

    fn hint(&self) -> ChoiceHint {
        let state = self
            .report
            .operating
            .as_ref()
            .map_or(&self.report.at_rest, |op| &op.point.state);
        let running = self
            .report
            .operating
            .as_ref()
            .map_or(self.report.breakaway_torque_n_m, |op| {
                op.point.resist.bearing_n_m
            });
        ChoiceHint {
            inlet_pa: state.inlet_pressure_pa.max(1.0e3),
            flow_m3_s: state.total_flow_m3_s.max(1.0e-6),
            inertia_kg_m2: self.report.inertia_kg_m2.max(1.0e-6),
            running_n_m: running.max(1.0e-4),
            breakaway_n_m: self.report.breakaway_torque_n_m.max(running).max(1.0e-4),
            // A plastic-on-brass washer like the shipped scenarios' (common practice).
            washer: Washer {
                mu_kinetic: 0.10,
                mu_static: 0.15,
                inner_m: 4.0e-3,
                outer_m: 8.0e-3,
                thrust_area_m2: 110.0e-6,
                rotor_mass_kg: 0.25,
                radius_rule: WasherRule::UniformWear,
            },
            spacing_m: self
                .spray
                .as_ref()
                .and_then(|s| s.wetted_radius_m())
                .filter(|r| *r > 0.5)
                .map_or(8.0, |r| (r * 10.0).round() / 10.0),
        }
    }

    fn nudge(&mut self, forward: bool, stride: Stride) {
        let Some(f) = self.selected_field() else {
            return;
        };
        let mut cand = self.design.clone();
        match f.kind() {
            Kind::Choice => {
                if f.cycle(&mut cand, forward, &self.hint()) {
                    self.apply(cand);
                }
            }
            Kind::Text => {}
            Kind::Number | Kind::OptionalNumber => {
                let now = f.number(&self.design).or_else(|| self.auto_value(f));
                let Some(v) = now else { return };
                let next = fields::nudged(f, v, self.units, forward, stride);
                if f.set_number(&mut cand, Some(next)) {
                    self.apply(cand);
                }
            }
        }
    }

    /// What the model uses for an `auto` spray value (to nudge from).
    fn auto_value(&self, f: Field) -> Option<f64> {
        let spec = self
            .spray
            .as_ref()
            .and_then(|s| s.throw.as_ref().ok())
            .and_then(|t| t.nozzles.iter().flatten().next())
            .map(|n| &n.spectrum);
        let input = f.input;
        if input == &catalogue::D50 {
            Some(spec.map_or(1.5e-3, |s| s.d50_m))
        } else if input == &catalogue::SPREAD {
            Some(spec.map_or(2.5, |s| s.spread))
        } else if input == &catalogue::LARGEST {
            Some(spec.map_or(4.0e-3, |s| s.largest_m))
        } else {
            None
        }
    }

    fn start_typing(&mut self) {
        let Some(f) = self.selected_field() else {
            return;
        };
        if f.kind() == Kind::Choice {
            self.nudge(true, Stride::Fine);
            return;
        }
        self.start_input(InputTarget::Field(f));
    }

    fn start_input(&mut self, target: InputTarget) {
        let text = match target {
            InputTarget::Field(f) => f.typing_seed(&self.design, self.units),
            InputTarget::SaveAs => self.suggested_name().display().to_string(),
            InputTarget::Measured(Measure::Pressure) => self
                .measured
                .pressure_pa
                .map(|p| {
                    let shown = units::to_display(D::Pressure, p, self.units);
                    format!(
                        "{}{}",
                        units::format_number(shown),
                        units::unit_label(D::Pressure, self.units)
                    )
                })
                .unwrap_or_default(),
            InputTarget::Measured(Measure::Throw) => self
                .measured
                .throw_m
                .map(|m| {
                    let shown = units::to_display(D::Length, m, self.units);
                    format!(
                        "{}{}",
                        units::format_number(shown),
                        units::unit_label(D::Length, self.units)
                    )
                })
                .unwrap_or_default(),
            InputTarget::Measured(Measure::Coast) => self.turn_times_seed(),
            InputTarget::Measured(Measure::Rotation | Measure::Flow) => String::new(),
        };
        self.mode = Mode::Typing(Input { target, text });
    }

    fn suggested_name(&self) -> PathBuf {
        if let Some(p) = &self.path {
            return p.clone();
        }
        let slug: String = self
            .design
            .name
            .chars()
            .map(|c| {
                if c.is_ascii_alphanumeric() {
                    c.to_ascii_lowercase()
                } else {
                    '-'
                }
            })
            .collect();
        let slug = slug.trim_matches('-').to_string();
        let slug = if slug.is_empty() {
            "scenario".to_string()
        } else {
            slug
        };
        PathBuf::from(format!("{slug}.ron"))
    }

    fn key_typing(&mut self, k: &KeyEvent, mut input: Input) {
        match k.code {
            KeyCode::Esc => {
                self.message = None;
            }
            KeyCode::Enter => self.finish_input(input),
            KeyCode::Backspace => {
                input.text.pop();
                self.mode = Mode::Typing(input);
            }
            KeyCode::Char('u') if k.modifiers.contains(KeyModifiers::CONTROL) => {
                input.text.clear();
                self.mode = Mode::Typing(input);
            }
            KeyCode::Char(c) => {
                if input.text.chars().count() < 200 {
                    input.text.push(c);
                }
                self.mode = Mode::Typing(input);
            }
            _ => self.mode = Mode::Typing(input),
        }
    }

    fn finish_input(&mut self, input: Input) {
        match input.target {
            InputTarget::Field(f) => {
                self.type_value(f, &input.text);
            }
            InputTarget::SaveAs => {
                let t = input.text.trim();
                if t.is_empty() {
                    self.error("no file name given; not saved");
                } else {
                    let mut p = PathBuf::from(t);
                    if p.extension().is_none() {
                        p.set_extension("ron");
                    }
                    self.save(Some(p), false);
                }
            }
            InputTarget::Measured(m) => self.type_measured(m, &input.text),
        }
    }

    /// Sets a field from typed text (with its unit); refuses with the reason.
    pub fn type_value(&mut self, f: Field, text: &str) -> bool {
        let mut cand = self.design.clone();
        if f.input == &catalogue::NAME {
            let name = text.trim();
            if name.is_empty() {
                self.error("refused, value kept: the name must not be empty");
                return false;
            }
            cand.name = name.to_string();
            return self.apply(cand);
        }
        match fields::parse_typed(f, text, self.units) {
            Ok(v) => {
                if f.set_number(&mut cand, v) {
                    self.apply(cand)
                } else {
                    false
                }
            }
            Err(e) => {
                self.error(format!("refused, value kept: {}", e.0));
                false
            }
        }
    }

    fn type_measured(&mut self, m: Measure, text: &str) {
        let t = text.trim();
        let empty = t.is_empty();
        let result: Result<(), String> = match m {
            Measure::Pressure if empty => {
                self.measured.pressure_pa = None;
                Ok(())
            }
            Measure::Pressure => {
                match fields::parse_typed(Field::of(&catalogue::INLET_PRESSURE), t, self.units) {
                    Ok(Some(p)) if p > 0.0 => {
                        self.measured.pressure_pa = Some(p);
                        Ok(())
                    }
                    Ok(_) => Err("a measured pressure must be above zero".to_string()),
                    Err(e) => Err(e.0),
                }
            }
            Measure::Rotation if empty => {
                self.measured.rotation = None;
                Ok(())
            }
            Measure::Rotation => parse_rotation(t).map(|r| self.measured.rotation = Some(r)),
            Measure::Flow if empty => {
                self.measured.flow = None;
                Ok(())
            }
            Measure::Flow => parse_flow(t, self.units).map(|f| self.measured.flow = Some(f)),
            Measure::Coast => match self.type_turn_times(t) {
                Ok(()) => return,
                Err(e) => Err(e),
            },
            Measure::Throw if empty => {
                self.measured.throw_m = None;
                Ok(())
            }
            Measure::Throw => {
                match fields::parse_typed(Field::of(&catalogue::SQUARE_SPACING), t, self.units) {
                    Ok(Some(r)) if r > 0.0 => {
                        self.measured.throw_m = Some(r);
                        Ok(())
                    }
                    Ok(_) => Err("a measured wetted radius must be above zero".to_string()),
                    Err(e) => Err(e.0),
                }
            }
        };
        match result {
            Ok(()) => self.request_field(),
            Err(e) => self.error(format!("refused: {e}")),
        }
    }

    fn add_arm(&mut self) {
        let k = self.selected_field().and_then(Field::arm).unwrap_or(0);
        let Some(arm) = self.design.rotor.arms.get(k).copied() else {
            return;
        };
        if self.design.rotor.arms.len() >= 12 {
            self.error("twelve arms is the most this list takes");
            return;
        }
        let mut cand = self.design.clone();
        cand.rotor.arms.insert(k + 1, arm);
        fields::respace(&mut cand);
        let n = cand.rotor.arms.len();
        if !self.apply(cand) {
            return;
        }
        if self.arms == Arms::Together {
            self.info(format!(
                "added an arm like the others: {n} arms, evenly spread"
            ));
        } else {
            self.select(Field::on_arm(&catalogue::NOZZLE_DIAMETER, k + 1));
            self.info(format!(
                "added arm {} (a copy of arm {}); arms respaced evenly",
                k + 2,
                k + 1
            ));
        }
    }

    fn remove_arm(&mut self) {
        let together = self.arms == Arms::Together;
        let k = match self.selected_field() {
            // With the arms together the last one goes (they are alike).
            Some(f) if together && f.input.per_arm() => {
                self.design.rotor.arms.len().saturating_sub(1)
            }
            Some(f) => match f.arm() {
                Some(k) => k,
                None => {
                    self.error("select a field of the arm to remove");
                    return;
                }
            },
            None => return,
        };
        if self.design.rotor.arms.len() <= 1 {
            self.error("a rotor needs at least one arm");
            return;
        }
        let mut cand = self.design.clone();
        cand.rotor.arms.remove(k);
        fields::respace(&mut cand);
        let n = cand.rotor.arms.len();
        if self.apply(cand) {
            if together {
                self.info(format!("removed an arm: {n} left, evenly spread"));
            } else {
                self.select(Field::on_arm(&catalogue::NOZZLE_DIAMETER, k.min(n - 1)));
                self.info(format!("removed arm {}; arms respaced evenly", k + 1));
            }
        }
    }

    /// Makes every arm a copy of the selected one: radius, height, rise,
    /// tube and nozzle; each arm keeps its azimuth.
    fn copy_arm_to_all(&mut self) {
        if self.arms == Arms::Together {
            self.info("the arms are edited together and alike already (a splits them)");
            return;
        }
        let Some(k) = self.selected_field().and_then(Field::arm) else {
            self.error("select a field of the arm to copy to every arm");
            return;
        };
        let Some(from) = self.design.rotor.arms.get(k).copied() else {
            return;
        };
        let mut cand = self.design.clone();
        for a in &mut cand.rotor.arms {
            *a = Arm {
                azimuth_rad: a.azimuth_rad,
                ..from
            };
        }
        if self.apply(cand) {
            let join = if fields::arms_alike(&self.design).is_ok() {
                "; a joins them into one block"
            } else {
                ""
            };
            self.info(format!(
                "arm {} copied to every arm (radius, height, rise, tube, nozzle; azimuths kept){join}",
                k + 1
            ));
        }
    }

    /// Splits the arms into blocks of their own, or joins them into one
    /// block when they are alike (refused, saying what differs, when not).
    fn toggle_arms(&mut self) {
        match self.arms {
            Arms::Together => {
                self.arms = Arms::Apart;
                self.refresh_rows();
                self.info("arms apart: each arm is edited on its own; a joins them when alike");
            }
            Arms::Apart => match fields::arms_alike(&self.design) {
                Ok(()) => {
                    self.arms = Arms::Together;
                    self.refresh_rows();
                    let n = self.design.rotor.arms.len();
                    self.info(format!("arms together: one block edits all {n} arms"));
                }
                Err(why) => self.error(format!(
                    "arms not joined: {why}; * copies the selected arm to every arm"
                )),
            },
        }
    }

    fn select(&mut self, f: Field) {
        if let Some(i) = self.rows.iter().position(|r| *r == Row::Field(f)) {
            self.selected = i;
            self.keep_selection_visible();
        }
    }

    fn ask_quit(&mut self) {
        if self.dirty {
            self.mode = Mode::Confirm(Confirm::QuitUnsaved);
        } else {
            self.quit = true;
        }
    }

    fn key_confirm(&mut self, k: &KeyEvent, c: Confirm) {
        let yes = matches!(k.code, KeyCode::Char('y'));
        let no = matches!(k.code, KeyCode::Esc | KeyCode::Char('n'));
        match c {
            Confirm::QuitUnsaved => match k.code {
                KeyCode::Char('s') => {
                    self.save(None, false);
                    if !self.dirty && self.mode == Mode::Normal {
                        self.quit = true;
                    }
                }
                KeyCode::Char('y') | KeyCode::Char('q') => self.quit = true,
                _ if no => {}
                _ => self.mode = Mode::Confirm(c),
            },
            Confirm::OpenUnsaved(p) => {
                if yes {
                    self.open_file(&p);
                } else if !no {
                    self.mode = Mode::Confirm(Confirm::OpenUnsaved(p));
                }
            }
            Confirm::OverwriteChanged(p) | Confirm::OverwriteExisting(p) if yes => {
                self.save(Some(p), true)
            }
            other => {
                if no {
                    self.info("not saved");
                } else {
                    self.mode = Mode::Confirm(other);
                }
            }
        }
    }

    fn start_save_as(&mut self) {
        self.start_input(InputTarget::SaveAs);
    }

    /// Saves to `target` (or the file it came from). Unless `force`, a file
    /// changed on disk since it was read, or another existing file, is not
    /// overwritten without asking.
    pub fn save(&mut self, target: Option<PathBuf>, force: bool) {
        let Some(path) = target.or_else(|| self.path.clone()) else {
            self.start_save_as();
            return;
        };
        if !force {
            let same = self.path.as_ref().is_some_and(|p| *p == path);
            if same {
                let now = std::fs::read_to_string(&path).ok();
                if now.is_some() && now != self.disk_text {
                    self.mode = Mode::Confirm(Confirm::OverwriteChanged(path));
                    return;
                }
            } else if path.exists() {
                self.mode = Mode::Confirm(Confirm::OverwriteExisting(path));
                return;
            }
        }
        let new = Scenario::from_design(&self.design, self.units, &self.notes);
        match scenario::save_scenario(&path, self.source_text.as_deref(), &new) {
            Ok(saved) => {
                let how = match &saved.written {
                    scenario::Written::InPlace => "changed values only, comments kept".to_string(),
                    scenario::Written::Fresh => format!("{} units", self.units_word()),
                    scenario::Written::Rewritten(why) => {
                        format!("written anew in {} units: {why}", self.units_word())
                    }
                };
                self.info(format!("saved {} ({how})", path.display()));
                self.path = Some(path);
                let text = saved.text;
                self.source_text = Some(text.clone());
                self.disk_text = Some(text);
                self.dirty = false;
            }
            Err(e) => self.error(format!("not saved: {e}")),
        }
    }

    fn open_picker(&mut self) {
        let base = &self.base_dir;
        let here = std::env::current_dir().unwrap_or_else(|_| PathBuf::from("."));
        let files: Vec<PathBuf> = scenario_files(base)
            .into_iter()
            .map(|p| p.strip_prefix(&here).map(Path::to_path_buf).unwrap_or(p))
            .collect();
        if files.is_empty() {
            self.error("no .ron scenarios in scenarios/ or the current folder");
            return;
        }
        self.mode = Mode::Picker(Picker { files, selected: 0 });
    }

    fn key_picker(&mut self, k: &KeyEvent, mut p: Picker) {
        match k.code {
            KeyCode::Esc => {}
            KeyCode::Up => {
                p.selected = p.selected.saturating_sub(1);
                self.mode = Mode::Picker(p);
            }
            KeyCode::Down => {
                p.selected = (p.selected + 1).min(p.files.len().saturating_sub(1));
                self.mode = Mode::Picker(p);
            }
            KeyCode::Enter => {
                if let Some(f) = p.files.get(p.selected).cloned() {
                    if self.dirty {
                        self.mode = Mode::Confirm(Confirm::OpenUnsaved(f));
                    } else {
                        self.open_file(&f);
                    }
                }
            }
            KeyCode::Char('c') => {
                if let Some(f) = p.files.get(p.selected).cloned() {
                    self.pin_file(&f);
                }
            }
            _ => self.mode = Mode::Picker(p),
        }
    }

    /// Replaces the design with a file's (the unit system and view stay).
    pub fn open_file(&mut self, path: &Path) {
        match App::read(path) {
            Ok((sc, design, text)) => {
                self.design = design;
                self.notes = sc.notes;
                self.path = Some(path.to_path_buf());
                self.source_text = Some(text.clone());
                self.disk_text = Some(text);
                self.dirty = false;
                self.arms = arms_shown(&self.design);
                self.selected = 0;
                self.list_offset = 0;
                // The readings belong to the unit being checked.
                let readings = self.readings_on_open();
                self.resolve();
                self.selected = self.first_field_from(0, true);
                self.keep_selection_visible();
                self.info(format!("opened {}{readings}", path.display()));
            }
            Err(e) => self.error(format!("cannot open: {e}")),
        }
    }

    fn read(path: &Path) -> Result<(Scenario, Design, String), ScenarioError> {
        let text = std::fs::read_to_string(path).map_err(|io| ScenarioError::Read {
            path: path.to_path_buf(),
            io,
        })?;
        let sc = scenario::load_str(&text, &path.display().to_string())?;
        let design = sc.to_design()?;
        Ok((sc, design, text))
    }

    fn pin(&mut self, label: String, design: Design) {
        if self.pins.len() >= MAX_PINS {
            self.error(format!(
                "{MAX_PINS} designs are pinned already; press x in Compare to drop one"
            ));
            return;
        }
        self.pins.push(Pinned {
            label: label.clone(),
            design,
        });
        self.request_comparison();
        self.info(format!("pinned {label} for Compare (view 5)"));
    }

    fn pin_current(&mut self) {
        // The first free number: labels stay apart after a pin is dropped.
        let label = (1..)
            .map(|k| format!("pin {k}"))
            .find(|l| self.pins.iter().all(|p| p.label != *l))
            .unwrap_or_default();
        self.pin(label, self.design.clone());
    }

    fn pin_file(&mut self, path: &Path) {
        match App::read(path) {
            Ok((_, design, _)) => {
                let label = path.file_name().map_or_else(
                    || path.display().to_string(),
                    |n| n.to_string_lossy().into_owned(),
                );
                self.pin(label, design);
            }
            Err(e) => self.error(format!("cannot open: {e}")),
        }
    }

    /// Drops the selected pin.
    fn unpin(&mut self) {
        if self.pins.is_empty() {
            self.error("nothing is pinned");
            return;
        }
        let k = self.pin_selected.min(self.pins.len() - 1);
        let gone = self.pins.remove(k);
        self.pin_selected = k.min(self.pins.len().saturating_sub(1));
        self.request_comparison();
        self.info(format!("dropped {}", gone.label));
    }

    /// Selects the next (or previous) pin for the Compare keys.
    fn select_pin(&mut self, next: bool) {
        let n = self.pins.len();
        if n == 0 {
            self.error("nothing is pinned");
            return;
        }
        let k = self.pin_selected.min(n - 1);
        self.pin_selected = if next { (k + 1) % n } else { (k + n - 1) % n };
        let label = self.pins.get(self.pin_selected).map(|p| p.label.clone());
        self.info(format!("selected {}", label.unwrap_or_default()));
    }

    /// Moves the selected pin one column right (`later`) or left; the first
    /// pin is the one the deltas are taken against.
    fn move_pin(&mut self, later: bool) {
        let n = self.pins.len();
        if n < 2 {
            self.error("pin two designs or more to reorder them");
            return;
        }
        let k = self.pin_selected.min(n - 1);
        let to = if later { k + 1 } else { k.wrapping_sub(1) };
        if to >= n {
            self.info("that pin is at the end already");
            return;
        }
        self.pins.swap(k, to);
        self.pin_selected = to;
        self.request_comparison();
        let label = self
            .pins
            .get(to)
            .map(|p| p.label.clone())
            .unwrap_or_default();
        self.info(format!("moved {label} to column {}", to + 1));
    }

    fn mouse(&mut self, m: &MouseEvent) {
        let at = Position::new(m.column, m.row);
        let a = self.areas();
        match m.kind {
            MouseEventKind::Down(MouseButton::Left) => {
                if !matches!(self.mode, Mode::Normal) {
                    return;
                }
                if a.list.contains(at) {
                    let i = self.list_offset + (m.row - a.list.y) as usize;
                    if matches!(self.rows.get(i), Some(Row::Field(_))) {
                        self.selected = i;
                        self.message = None;
                    }
                } else if a.tabs.contains(at) {
                    if let Some(i) = layout::tab_at(a.tabs, m.column) {
                        self.set_view(i);
                    }
                }
            }
            MouseEventKind::ScrollDown | MouseEventKind::ScrollUp => {
                let down = m.kind == MouseEventKind::ScrollDown;
                if let Mode::Help(s) = self.mode {
                    self.mode = Mode::Help(if down {
                        s.saturating_add(2)
                    } else {
                        s.saturating_sub(2)
                    });
                } else if a.list.contains(at) || a.left.contains(at) {
                    let h = self.list_height();
                    let max = self.rows.len().saturating_sub(h);
                    self.list_offset = if down {
                        (self.list_offset + 3).min(max)
                    } else {
                        self.list_offset.saturating_sub(3)
                    };
                } else if a.view.contains(at) {
                    self.pane_scroll = if down {
                        self.pane_scroll.saturating_add(3)
                    } else {
                        self.pane_scroll.saturating_sub(3)
                    };
                }
            }
            _ => {}
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

/// How the list first shows a design's arms: together when they are alike.
fn arms_shown(design: &Design) -> Arms {
    if fields::arms_alike(design).is_ok() {
        Arms::Together
    } else {
        Arms::Apart
    }
}

/// Reads a measured rotation: `40rpm`, `1.5s` (one turn), `10/14.2s` or
/// `10 turns in 14.2s` (turns over a time). Timed readings carry the default
/// stopwatch resolution.
pub fn parse_rotation(text: &str) -> Result<RotationReading, String> {
    let t = text.trim();
    let help = "write `40rpm`, `1.5s` (seconds per turn) or `10/14.2s` (turns over a time)";
    let positive = |v: f64, what: &str| {
        if v.is_finite() && v > 0.0 {
            Ok(v)
        } else {
            Err(format!("{what} must be above zero; {help}"))
        }
    };
    let lower = t.to_lowercase();
    if let Some((turns, time)) = over(&lower, &["/", " turns in ", " turns over ", " in "]) {
        let turns: f64 = turns
            .trim()
            .parse()
            .map_err(|_| format!("`{}` is not a count of turns; {help}", turns.trim()))?;
        let seconds =
            units::parse_quantity(D::Time, time.trim()).map_err(|e| format!("{e}; {help}"))?;
        return Ok(RotationReading::turns_over(
            positive(turns, "the turn count")?,
            positive(seconds, "the time")?,
        ));
    }
    if let Ok(w) = units::parse_quantity(D::AngularSpeed, t) {
        return Ok(RotationReading::rpm(positive(
            crate::physics::balance::rpm(w),
            "the speed",
        )?));
    }
    match units::parse_quantity(D::Time, t) {
        Ok(s) => Ok(RotationReading::seconds_per_turn(positive(
            s,
            "the time per turn",
        )?)),
        Err(_) => Err(format!("`{t}` is not a rotation; {help}")),
    }
}

/// Splits `a SEP b` at the first of the separators found (in the order given).
fn over<'a>(text: &'a str, separators: &[&str]) -> Option<(&'a str, &'a str)> {
    separators.iter().find_map(|s| text.split_once(s))
}

/// Reads a measured flow: a rate (`12L/min`, `3.2gpm`, a bare number in the
/// shown unit) or a volume caught over a time (`5L/30s`, `5L in 30s`).
pub fn parse_flow(text: &str, system: UnitSystem) -> Result<FlowReading, String> {
    let t = text.trim();
    let help = "write a rate (`12L/min`) or a volume over a time (`5L in 30s`)";
    let caught = over(t, &[" in ", " over "]).or_else(|| {
        // `5L/30s`: a slash followed by a time, not a rate's `/min`.
        t.rsplit_once('/').filter(|(_, b)| {
            b.trim()
                .starts_with(|c: char| c.is_ascii_digit() || c == '.')
        })
    });
    if let Some((vol, time)) = caught {
        let v = units::parse_quantity(D::Volume, vol.trim()).map_err(|e| format!("{e}; {help}"))?;
        let s = units::parse_quantity(D::Time, time.trim()).map_err(|e| format!("{e}; {help}"))?;
        if !(v > 0.0 && s > 0.0) {
            return Err(format!(
                "the volume and the time must be above zero; {help}"
            ));
        }
        return Ok(FlowReading::caught(v, s));
    }
    match fields::parse_typed(Field::of(&catalogue::TOTAL_FLOW), t, system) {
        Ok(Some(q)) if q > 0.0 => Ok(FlowReading::rate(q)),
        Ok(_) => Err(format!("a measured flow must be above zero; {help}")),
        Err(e) => Err(format!("{}; {help}", e.0)),
    }
}
