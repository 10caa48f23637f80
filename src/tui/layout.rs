//! Where everything goes on the screen, as a pure function of its size, so
//! drawing and mouse handling agree on it without drawing storing anything.

use ratatui::layout::{Constraint, Layout, Rect};

use super::app::View;

/// The screen's parts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Areas {
    /// The top line: name, unsaved marker, headline.
    pub top: Rect,
    /// The left pane, with its border.
    pub left: Rect,
    /// The rows of the field list inside the left pane.
    pub list: Rect,
    /// The view tabs.
    pub tabs: Rect,
    /// The view under the tabs.
    pub view: Rect,
    /// The message and typing line.
    pub message: Rect,
    /// The bottom line: the keys that work here.
    pub bottom: Rect,
}

/// Width of the left pane for a screen `width` wide.
pub fn left_width(width: u16) -> u16 {
    (width * 2 / 7).clamp(30, 46).min(width / 2)
}

/// Lays out a screen of `area`.
pub fn areas(area: Rect) -> Areas {
    let [top, main, message, bottom] = Layout::vertical([
        Constraint::Length(1),
        Constraint::Min(1),
        Constraint::Length(1),
        Constraint::Length(1),
    ])
    .areas(area);
    let [left, right] = Layout::horizontal([
        Constraint::Length(left_width(area.width)),
        Constraint::Min(1),
    ])
    .areas(main);
    // The left pane has a border on its right only.
    let list = Rect {
        width: left.width.saturating_sub(1),
        ..left
    };
    let [tabs, view] = Layout::vertical([Constraint::Length(1), Constraint::Min(1)]).areas(right);
    Areas {
        top,
        left,
        list,
        tabs,
        view,
        message,
        bottom,
    }
}

/// The tab labels as drawn in tabs `width` wide, with the columns each one
/// takes (relative to the tabs' x).
pub fn tab_spans(width: u16) -> Vec<(View, String, u16, u16)> {
    let mut x = 1u16;
    let pad = if width >= 60 { " " } else { "" };
    View::ALL
        .iter()
        .enumerate()
        .map(|(i, v)| {
            let label = format!("{pad}{} {}{pad}", i + 1, v.title());
            let w = label.chars().count() as u16;
            let span = (*v, label, x, x + w);
            x += w + 1;
            span
        })
        .collect()
}

/// Which tab column `column` falls on, if any.
pub fn tab_at(tabs: Rect, column: u16) -> Option<usize> {
    let rel = column.checked_sub(tabs.x)?;
    tab_spans(tabs.width)
        .iter()
        .position(|(_, _, a, b)| rel >= *a && rel < *b)
}
