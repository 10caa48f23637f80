//! Drawing: every function here takes the state by `&` and only reads it.
//!
//! [`draw`] lays out the screen ([`super::layout`]) and draws the top line,
//! the field list, the view tabs, the current view (one file each), the
//! message line, the bottom line of keys, and any overlay (help, file
//! picker, a question).

mod balance;
mod compare;
mod field;
mod help;
mod pattern;
mod search_form;
mod throw;

use ratatui::layout::{Constraint, Flex, Layout, Rect};
use ratatui::style::{Modifier, Style};
use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Borders, Clear, Paragraph, Wrap};
use ratatui::Frame;

use super::app::{App, Confirm, InputTarget, Level, Measure, Mode, View};
use super::fields::{self, Field, Kind, Row, Stride};
use super::keys::{self, Action, Scope};
use super::layout;
use crate::physics::balance::{rpm, SpinStatus};
use crate::units::{format_quantity, Dimension as D};

pub use balance::table as balance_table;
pub use compare::differences_per_design as compare_differences;
pub use help::help_lines;

/// Draws the whole screen.
pub fn draw(app: &App, frame: &mut Frame) {
    let a = layout::areas(frame.area());
    draw_top(app, frame, a.top);
    draw_list(app, frame, a.left, a.list);
    draw_tabs(app, frame, a.tabs);
    match app.view {
        View::Balance => balance::draw(app, frame, a.view),
        View::Throw => throw::draw(app, frame, a.view),
        View::Pattern => pattern::draw(app, frame, a.view),
        View::Field => field::draw(app, frame, a.view),
        View::Compare => compare::draw(app, frame, a.view),
    }
    draw_message(app, frame, a.message);
    draw_bottom(app, frame, a.bottom);
    match &app.mode {
        Mode::Help(scroll) => help::draw(app, frame, *scroll),
        Mode::Picker(p) => draw_picker(app, frame, p),
        Mode::Confirm(c) => draw_confirm(app, frame, c),
        Mode::Search(p) => search_form::draw(app, frame, p),
        Mode::Normal | Mode::Typing(_) => {}
    }
}

/// The headline's speed: rpm, or the state in words.
pub fn speed_word(app: &App) -> String {
    match (&app.report.status, &app.report.operating) {
        (SpinStatus::Running, Some(op)) => format!("{:.1} rpm", rpm(op.omega_rad_s())),
        (SpinStatus::StallsAtRest, _) => "stalls at rest".to_string(),
        _ => "no equilibrium".to_string(),
    }
}

fn draw_top(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let waiting = app.computing && app.spray.is_none();
    let throw = match app.spray.as_ref().and_then(|s| s.wetted_radius_m()) {
        Some(r) => format_quantity(D::Length, r, app.units),
        None if waiting => "…".to_string(),
        None => "n/a".to_string(),
    };
    let cu = if app.design.layout.is_none() {
        "no layout".to_string()
    } else {
        match app.spray.as_ref().and_then(|s| s.cu_percent()) {
            Some(c) => format!("{c:.1} %"),
            None if waiting => "…".to_string(),
            None => "n/a".to_string(),
        }
    };
    let margin = app
        .report
        .start_margin
        .map_or("n/a".to_string(), |m| format!("{m:.2}"));
    let wide = area.width >= 110;
    let mut spans = Vec::new();
    if wide {
        spans.push(Span::styled(
            " spinwright ",
            t.bar().add_modifier(Modifier::BOLD),
        ));
    }
    spans.push(Span::raw(" "));
    spans.push(Span::styled(
        app.design.name.clone(),
        Style::default().add_modifier(Modifier::BOLD),
    ));
    if app.dirty {
        spans.push(Span::styled(" ● unsaved", t.warning()));
    }
    let sep = || Span::styled(" │ ", t.dim());
    spans.extend([sep(), Span::raw(speed_word(app))]);
    // The count of warnings (the solver's and the practice checks'), listed
    // in the Balance view.
    let warnings = app.report.warnings.len() + app.cautions().len();
    if warnings > 0 {
        spans.push(Span::styled(
            if wide {
                format!(
                    " ⚠ {warnings} warning{}",
                    if warnings == 1 { "" } else { "s" }
                )
            } else {
                format!(" ⚠ {warnings}")
            },
            t.warning(),
        ));
    }
    spans.extend([
        sep(),
        Span::raw(format!(
            "{} {margin}",
            if wide { "start margin" } else { "margin" }
        )),
        sep(),
        Span::raw(format!("throw {throw}")),
        sep(),
        Span::raw(format!("CU {cu}")),
    ]);
    if app.computing {
        spans.push(Span::styled("  computing…", t.dim()));
    }
    if let Some(goal) = &app.ask.goal {
        spans.push(Span::styled(
            format!("  finding {}…", goal.field.label()),
            t.dim(),
        ));
    }
    frame.render_widget(Paragraph::new(Line::from(spans)), area);
}

/// A label and a value on one line `width` wide, the value right-aligned.
fn label_value(indent: usize, label: &str, value: &str, width: usize) -> String {
    let label_w = label.chars().count();
    let value: String = {
        let room = width.saturating_sub(indent + label_w.min(16) + 1);
        let n = value.chars().count();
        if n > room {
            let mut v: String = value.chars().take(room.saturating_sub(1)).collect();
            v.push('…');
            v
        } else {
            value.to_string()
        }
    };
    let used = indent + label_w + value.chars().count();
    let gap = width.saturating_sub(used).max(1);
    let line = format!("{}{label}{}{value}", " ".repeat(indent), " ".repeat(gap));
    line.chars().take(width).collect()
}

fn draw_list(app: &App, frame: &mut Frame, left: Rect, list: Rect) {
    let t = &app.theme;
    frame.render_widget(
        Block::default()
            .borders(Borders::RIGHT)
            .border_style(t.dim()),
        left,
    );
    let w = list.width as usize;
    let typing = match &app.mode {
        Mode::Typing(input) => match input.target {
            InputTarget::Field(f) => Some((f, input.text.as_str())),
            _ => None,
        },
        _ => None,
    };
    let n_arms = app.design.rotor.arms.len();
    let lines: Vec<Line> = app
        .rows
        .iter()
        .enumerate()
        .skip(app.list_offset)
        .take(list.height as usize)
        .map(|(i, row)| match row {
            Row::Group(g) => Line::styled(format!("▍{}", g.title()), t.heading()),
            Row::ArmHeading(k) => {
                let head = format!("  arm {} of {n_arms} ", k + 1);
                let fill = w.saturating_sub(head.chars().count());
                Line::styled(format!("{head}{}", "╌".repeat(fill)), t.dim())
            }
            Row::AllArmsHeading => {
                let head = format!("  all {n_arms} arms alike ");
                let fill = w.saturating_sub(head.chars().count());
                Line::styled(format!("{head}{}", "╌".repeat(fill)), t.dim())
            }
            Row::Field(f) => {
                let indent = if f.input.per_arm() { 3 } else { 2 };
                let value = match typing {
                    Some((tf, text)) if tf == *f => format!("{text}▏"),
                    _ => f.show(&app.design, app.units),
                };
                let mut text = label_value(indent, f.label(), &value, w);
                if let Some(rest) = text.strip_prefix(' ') {
                    if app.ask.marked.contains(&f.input) {
                        // Marked free for a design search (`m`).
                        text = format!("◆{rest}");
                    }
                }
                if i == app.selected {
                    Line::styled(text, t.selected())
                } else {
                    Line::raw(text)
                }
            }
        })
        .collect();
    frame.render_widget(Paragraph::new(lines), list);
}

fn draw_tabs(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let mut spans = vec![Span::raw(" ")];
    for (v, label, _, _) in layout::tab_spans(area.width) {
        let style = if v == app.view {
            t.selected().add_modifier(Modifier::BOLD)
        } else {
            t.dim()
        };
        spans.push(Span::styled(label, style));
        spans.push(Span::raw(" "));
    }
    frame.render_widget(Paragraph::new(Line::from(spans)), area);
}

fn field_hint(app: &App, f: Field) -> String {
    let step = |stride| {
        let s = fields::display_step(f, app.units, stride);
        let label = f.unit().label(app.units);
        let n = crate::units::format_number(s);
        match label.as_str() {
            "" => n,
            "°" => format!("{n}°"),
            _ => format!("{n} {label}"),
        }
    };
    let what = f.describe();
    let arm = match f.arm() {
        Some(k) => format!(" (arm {})", k + 1),
        None if f.all_arms() => {
            let n = app.design.rotor.arms.len();
            if f.input == &crate::catalogue::AZIMUTH {
                format!(" (arm 1; all {n} evenly spread)")
            } else {
                format!(" (all {n} arms)")
            }
        }
        None => String::new(),
    };
    match f.kind() {
        Kind::Choice => format!("{what}{arm} · ←/→ change"),
        Kind::Text => format!("{what} · Enter to type"),
        // The steps first, so a narrow screen still shows them.
        Kind::Number | Kind::OptionalNumber => format!(
            "step ±{} (⇧ ±{}, Alt ±{}) · {what}{arm}{}",
            step(Stride::Fine),
            step(Stride::Coarse),
            step(Stride::Finer),
            if f.kind() == Kind::OptionalNumber {
                " · Enter: a value or auto"
            } else {
                ""
            }
        ),
    }
}

fn draw_message(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let line = match (&app.mode, &app.message) {
        (Mode::Typing(input), _) => {
            let what = match input.target {
                InputTarget::Field(f) => {
                    let unit = match f.unit() {
                        crate::catalogue::Unit::Dim(d) => format!(
                            " with its unit (e.g. {}; a bare number is in {})",
                            d.example(),
                            crate::units::unit_label(d, app.units)
                        ),
                        crate::catalogue::Unit::None => String::new(),
                        u => format!(" (a bare number is in {})", u.label(app.units)),
                    };
                    format!("type {}{unit}", f.label())
                }
                InputTarget::SaveAs => "save as (a .ron file name)".to_string(),
                InputTarget::Measured(Measure::Pressure) => {
                    "measured inlet pressure, e.g. 2.8bar or 40psi".to_string()
                }
                InputTarget::Measured(Measure::Rotation) => {
                    "measured rotation: 40rpm, 1.5s per turn, or 10/14.2s".to_string()
                }
                InputTarget::Measured(Measure::Flow) => {
                    "measured flow: 12L/min, or 5L in 30s".to_string()
                }
                InputTarget::Measured(Measure::Throw) => {
                    "measured wetted radius, e.g. 7.5m or 25ft".to_string()
                }
                InputTarget::Measured(Measure::Coast) => {
                    "coast-down, s at each turn: 0.9, 1.9, 3.0".to_string()
                }
                InputTarget::Goal(f) => search_form::goal_prompt(app, f),
            };
            match input.target {
                InputTarget::Field(_) => Line::styled(format!(" {what}"), t.dim()),
                _ => Line::from(vec![
                    Span::styled(format!(" {what}: "), t.dim()),
                    Span::raw(format!("{}▏", input.text)),
                ]),
            }
        }
        (_, Some(m)) => {
            let style = match m.level {
                Level::Error => t.error(),
                Level::Info => t.good(),
            };
            Line::styled(format!(" {}", m.text), style)
        }
        (_, None) => match app.selected_field() {
            Some(f) => Line::styled(format!(" {}", field_hint(app, f)), t.dim()),
            None => Line::raw(""),
        },
    };
    frame.render_widget(Paragraph::new(line), area);
}

/// The keys that work in the present state, most useful first (from the
/// key table, [`crate::tui::keys`]).
pub fn keys_here(app: &App) -> Vec<(&'static str, &'static str)> {
    keys::hints(app.key_place(), &app.key_context())
}

/// The keys of a popup's bottom border: `keys word · keys word`.
pub fn keys_line(app: &App) -> String {
    let items: Vec<String> = keys_here(app)
        .iter()
        .map(|(k, w)| format!("{k} {w}"))
        .collect();
    format!(" {} ", items.join(" · "))
}

fn draw_bottom(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let mut spans = Vec::new();
    let mut used = 0usize;
    let width = area.width as usize;
    for (key, what) in keys_here(app) {
        let n = key.chars().count() + what.chars().count() + 3;
        if used + n > width {
            break;
        }
        spans.push(Span::styled(
            format!(" {key}"),
            t.bar().add_modifier(Modifier::BOLD),
        ));
        spans.push(Span::styled(format!(" {what} "), t.bar()));
        used += n;
    }
    let fill = width.saturating_sub(used);
    spans.push(Span::styled(" ".repeat(fill), t.bar()));
    frame.render_widget(Paragraph::new(Line::from(spans)), area);
}

/// A centred box `w` × `h` (at most the area), cleared.
pub fn popup(frame: &mut Frame, w: u16, h: u16) -> Rect {
    let area = frame.area();
    let [v] = Layout::vertical([Constraint::Length(h.min(area.height))])
        .flex(Flex::Center)
        .areas(area);
    let [r] = Layout::horizontal([Constraint::Length(w.min(area.width))])
        .flex(Flex::Center)
        .areas(v);
    frame.render_widget(Clear, r);
    r
}

fn draw_picker(app: &App, frame: &mut Frame, p: &super::app::Picker) {
    let t = &app.theme;
    let h = (p.files.len() as u16 + 4).min(frame.area().height.saturating_sub(2));
    let r = popup(frame, 60, h);
    let block = Block::bordered()
        .title(Line::from(" open a scenario "))
        .title_bottom(Line::from(keys_line(app)))
        .border_style(t.heading());
    let inner = block.inner(r);
    frame.render_widget(block, r);
    let visible = inner.height as usize;
    let start = p.selected.saturating_sub(visible.saturating_sub(1));
    let lines: Vec<Line> = p
        .files
        .iter()
        .enumerate()
        .skip(start)
        .take(visible)
        .map(|(i, f)| {
            let text = format!(" {}", f.display());
            if i == p.selected {
                Line::styled(text, t.selected())
            } else {
                Line::raw(text)
            }
        })
        .collect();
    frame.render_widget(Paragraph::new(lines), inner);
}

fn draw_confirm(app: &App, frame: &mut Frame, c: &Confirm) {
    let t = &app.theme;
    // The answers' keys come from the key table.
    let (quit, ask) = (Scope::QuitQuestion, Scope::Question);
    let answer = |place, action, what: &str| format!("{}  {what}", keys::keys_of(place, action));
    let (title, question, answers) = match c {
        Confirm::QuitUnsaved => (
            " unsaved changes ",
            "The design has changes that are not saved.".to_string(),
            [
                answer(quit, Action::SaveAndQuit, "save, then quit"),
                answer(quit, Action::Yes, "quit without saving"),
                answer(quit, Action::No, "stay"),
            ]
            .join("\n"),
        ),
        Confirm::OpenUnsaved(p) => (
            " unsaved changes ",
            format!("Open {} and drop the unsaved changes?", p.display()),
            [
                answer(ask, Action::Yes, "open it"),
                answer(
                    ask,
                    Action::No,
                    &format!(
                        "stay (then {} to save)",
                        keys::keys_of(Scope::Normal, Action::Save)
                    ),
                ),
            ]
            .join("\n"),
        ),
        Confirm::OverwriteChanged(p) => (
            " changed on disk ",
            format!(
                "{} has changed on disk since it was opened or saved here.",
                p.display()
            ),
            [
                answer(
                    ask,
                    Action::Yes,
                    "overwrite it (the old file is kept as .bak)",
                ),
                answer(
                    ask,
                    Action::No,
                    &format!(
                        "do not save ({} saves under another name)",
                        keys::keys_of(Scope::Normal, Action::SaveAs)
                    ),
                ),
            ]
            .join("\n"),
        ),
        Confirm::OverwriteExisting(p) => (
            " file exists ",
            format!("{} already exists.", p.display()),
            [
                answer(
                    ask,
                    Action::Yes,
                    "overwrite it (the old file is kept as .bak)",
                ),
                answer(ask, Action::No, "do not save"),
            ]
            .join("\n"),
        ),
    };
    let text = format!("{question}\n\n{answers}");
    let r = popup(frame, 64, 9);
    let block = Block::bordered()
        .title(Line::from(title))
        .border_style(t.warning());
    frame.render_widget(
        Paragraph::new(text).wrap(Wrap { trim: false }).block(block),
        r,
    );
}

/// Rounds a value for display in a table cell: 3 significant figures.
pub fn num(v: f64) -> String {
    crate::units::format_number(v)
}

/// A message shown in a view while its results are being computed, or why they are missing.
pub fn waiting_line(app: &App) -> Line<'static> {
    if app.computing {
        Line::styled(" computing…", app.theme.dim())
    } else {
        Line::styled(" no results", app.theme.dim())
    }
}

/// The fixed-width headings of a table's columns with units.
pub fn unit(dim: D, app: &App) -> &'static str {
    crate::units::unit_label(dim, app.units)
}

/// Draws `lines` in `area` scrolled by the view's scroll, clamped.
pub fn scrolled(app: &App, lines: Vec<Line<'static>>, frame: &mut Frame, area: Rect) {
    let max = lines.len().saturating_sub(area.height as usize);
    let s = app.pane_scroll.min(max);
    let shown: Vec<Line> = lines.into_iter().skip(s).collect();
    frame.render_widget(Paragraph::new(shown), area);
}

/// Rows `lines` take when wrapped to `width` (by characters; word wrapping
/// can take a row or so more).
pub fn wrapped_rows(lines: &[Line], width: u16) -> u16 {
    let w = width.max(1) as usize;
    lines
        .iter()
        .map(|l| l.width().div_ceil(w).max(1) as u16)
        .sum()
}
