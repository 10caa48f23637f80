//! Key presses: the key table ([`crate::tui::keys::KEYS`]) says which
//! [`Action`] a key starts where; this file says what each action does.

use std::path::PathBuf;

use ratatui::crossterm::event::{
    Event, KeyCode, KeyEvent, KeyEventKind, MouseButton, MouseEvent, MouseEventKind,
};
use ratatui::layout::Position;

use super::{App, Confirm, Input, InputTarget, Mode, Picker, View};
use crate::tui::fields::Row;
use crate::tui::fields::{self, Stride};
use crate::tui::keys::{self, Action, Context, Scope};
use crate::tui::layout;

impl App {
    /// The key table's place for the present keyboard mode.
    pub(in crate::tui) fn key_place(&self) -> Scope {
        match &self.mode {
            Mode::Normal => Scope::Normal,
            Mode::Typing(_) => Scope::Typing,
            Mode::Help(_) => Scope::Help,
            Mode::Picker(_) => Scope::Picker,
            Mode::Confirm(Confirm::QuitUnsaved) => Scope::QuitQuestion,
            Mode::Confirm(_) => Scope::Question,
        }
    }

    /// What the bottom line's words depend on.
    pub(in crate::tui) fn key_context(&self) -> Context {
        let f = self.selected_field();
        Context {
            kind: f.map(|f| f.kind()),
            per_arm: f.is_some_and(|f| f.input.per_arm()),
            arms: self.arms,
            alike: fields::arms_alike(&self.design).is_ok(),
            view: self.view,
        }
    }

    pub(super) fn key(&mut self, k: &KeyEvent) {
        let action = keys::find(self.key_place(), self.view, k).map(|b| b.action);
        match (std::mem::replace(&mut self.mode, Mode::Normal), action) {
            (_, Some(Action::Quit)) => self.ask_quit(),
            (Mode::Normal, a) => {
                // A new key press clears an old message.
                self.message = None;
                if let Some(a) = a {
                    self.act(a, k);
                }
            }
            (Mode::Typing(input), a) => self.key_typing(a, k, input),
            (Mode::Help(scroll), a) => {
                self.mode = match a {
                    Some(Action::HelpLine) => Mode::Help(scroll_by(scroll, k, 1)),
                    Some(Action::HelpPage) => Mode::Help(scroll_by(scroll, k, 10)),
                    _ => Mode::Normal,
                }
            }
            (Mode::Picker(p), a) => self.key_picker(a, k, p),
            (Mode::Confirm(c), a) => self.key_confirm(a, c),
        }
    }

    /// An action of the normal mode.
    fn act(&mut self, a: Action, k: &KeyEvent) {
        let on = matches!(
            k.code,
            KeyCode::Right | KeyCode::Down | KeyCode::PageDown | KeyCode::Char(']' | '>')
        );
        match a {
            Action::Select => match k.code {
                KeyCode::Home => {
                    self.selected = self.first_field_from(0, true);
                    self.keep_selection_visible();
                }
                KeyCode::End => {
                    self.selected = self.first_field_from(self.rows.len().saturating_sub(1), false);
                    self.keep_selection_visible();
                }
                _ => self.move_selection(on, 1),
            },
            Action::NudgeFine => self.nudge(on, Stride::Fine),
            Action::NudgeCoarse => self.nudge(on, Stride::Coarse),
            Action::NudgeFiner => self.nudge(on, Stride::Finer),
            Action::StartTyping => self.start_typing(),
            Action::AddArm => self.add_arm(),
            Action::RemoveArm => self.remove_arm(),
            Action::ToggleArms => self.toggle_arms(),
            Action::CopyArm => self.copy_arm_to_all(),
            Action::ScrollView => {
                self.pane_scroll = if on {
                    self.pane_scroll.saturating_add(5)
                } else {
                    self.pane_scroll.saturating_sub(5)
                }
            }
            Action::Measure(m) => self.start_input(InputTarget::Measured(m)),
            Action::AddReadingRow => self.add_reading_row(),
            Action::DropReadingRow => self.drop_reading_row(),
            Action::KeepReadings => self.toggle_keep_readings(),
            Action::PickPin => self.select_pin(on),
            Action::MovePin => self.move_pin(on),
            Action::DropPin => self.unpin(),
            Action::SwitchView => {
                let n = View::ALL.len();
                let i = self.view.index();
                match k.code {
                    KeyCode::Tab => self.set_view((i + 1) % n),
                    KeyCode::BackTab => self.set_view((i + n - 1) % n),
                    KeyCode::Char(c @ '1'..='9') => self.set_view(c as usize - '1' as usize),
                    _ => {}
                }
            }
            Action::ToggleUnits => {
                self.units = self.units.toggled();
                self.info(format!("showing {} units", self.units_word()));
            }
            Action::Save => self.save(None, false),
            Action::SaveAs => self.start_save_as(),
            Action::Open => self.open_picker(),
            Action::PinDesign => self.pin_current(),
            Action::ShowHelp => self.mode = Mode::Help(0),
            Action::Quit => self.ask_quit(),
            // Actions of the other modes do nothing here.
            _ => {}
        }
    }

    fn key_typing(&mut self, a: Option<Action>, k: &KeyEvent, mut input: Input) {
        match a {
            Some(Action::CancelTyping) => self.message = None,
            Some(Action::FinishTyping) => self.finish_input(input),
            Some(Action::DeleteChar) => {
                input.text.pop();
                self.mode = Mode::Typing(input);
            }
            Some(Action::ClearTyping) => {
                input.text.clear();
                self.mode = Mode::Typing(input);
            }
            Some(Action::TypeChar) => {
                if let KeyCode::Char(c) = k.code {
                    if input.text.chars().count() < 200 {
                        input.text.push(c);
                    }
                }
                self.mode = Mode::Typing(input);
            }
            _ => self.mode = Mode::Typing(input),
        }
    }

    fn key_picker(&mut self, a: Option<Action>, k: &KeyEvent, mut p: Picker) {
        match a {
            Some(Action::PickerClose) => {}
            Some(Action::PickerMove) => {
                p.selected = if k.code == KeyCode::Up {
                    p.selected.saturating_sub(1)
                } else {
                    (p.selected + 1).min(p.files.len().saturating_sub(1))
                };
                self.mode = Mode::Picker(p);
            }
            Some(Action::PickerOpen) => {
                if let Some(f) = p.files.get(p.selected).cloned() {
                    if self.dirty {
                        self.mode = Mode::Confirm(Confirm::OpenUnsaved(f));
                    } else {
                        self.open_file(&f);
                    }
                }
            }
            Some(Action::PickerPin) => {
                if let Some(f) = p.files.get(p.selected).cloned() {
                    self.pin_file(&f);
                }
            }
            _ => self.mode = Mode::Picker(p),
        }
    }

    fn key_confirm(&mut self, a: Option<Action>, c: Confirm) {
        match (a, c) {
            (Some(Action::SaveAndQuit), Confirm::QuitUnsaved) => {
                self.save(None, false);
                if !self.dirty && self.mode == Mode::Normal {
                    self.quit = true;
                }
            }
            (Some(Action::Yes), Confirm::QuitUnsaved) => self.quit = true,
            (Some(Action::Yes), Confirm::OpenUnsaved(p)) => self.open_file(&p),
            (Some(Action::Yes), Confirm::OverwriteChanged(p) | Confirm::OverwriteExisting(p)) => {
                self.save(Some(p), true)
            }
            (Some(Action::No), Confirm::OverwriteChanged(_) | Confirm::OverwriteExisting(_)) => {
                self.info("not saved")
            }
            (Some(Action::No), _) => {}
            (_, c) => self.mode = Mode::Confirm(c),
        }
    }

    pub(super) fn finish_input(&mut self, input: Input) {
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
}

/// The help's scroll moved `by` lines back (↑, k, Page Up) or on.
fn scroll_by(scroll: u16, k: &KeyEvent, by: u16) -> u16 {
    if matches!(k.code, KeyCode::Up | KeyCode::PageUp | KeyCode::Char('k')) {
        scroll.saturating_sub(by)
    } else {
        scroll.saturating_add(by)
    }
}
impl App {
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

    pub(super) fn mouse(&mut self, m: &MouseEvent) {
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
}
