//! View 5, Compare: the current design against pinned designs and saved
//! scenarios: the inputs that differ and the key results, with deltas.

use ratatui::layout::Rect;
use ratatui::text::Line;
use ratatui::widgets::{Paragraph, Wrap};
use ratatui::Frame;

use crate::tui::app::App;

/// Draws the Compare view.
pub fn draw(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let mut lines = vec![Line::styled(
        "c pins the current design; o then c adds a saved scenario; x drops the last",
        t.dim(),
    )];
    for p in &app.pins {
        lines.push(Line::raw(format!("  {}", p.label)));
    }
    lines.push(Line::styled(
        "the comparison engine is not in this build yet: differing inputs and deltas will show here once it is",
        t.warning(),
    ));
    frame.render_widget(Paragraph::new(lines).wrap(Wrap { trim: true }), area);
}
