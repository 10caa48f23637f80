//! View 4, Field: measured inlet pressure and rotation against what the
//! design expects, the friction that would explain the difference, findings.

use ratatui::layout::Rect;
use ratatui::text::Line;
use ratatui::widgets::{Paragraph, Wrap};
use ratatui::Frame;

use crate::tui::app::App;
use crate::units::{format_quantity, Dimension as D};

/// Draws the Field view.
pub fn draw(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let m = &app.measured;
    let lines = vec![
        Line::styled("measured at the unit (p pressure, r rotation)", t.heading()),
        Line::raw(format!(
            "  inlet pressure  {}",
            m.pressure_pa.map_or("—".to_string(), |p| format_quantity(
                D::Pressure,
                p,
                app.units
            ))
        )),
        Line::raw(format!(
            "  rotation        {}",
            m.rotation
                .map_or("—".to_string(), |r| format!("{:.1} rpm", r.rpm()))
        )),
        Line::raw(""),
        Line::styled(
            "the field-check engine is not in this build yet: expected against measured, \
             implied friction and findings will show here once it is",
            t.warning(),
        ),
    ];
    frame.render_widget(Paragraph::new(lines).wrap(Wrap { trim: true }), area);
}
