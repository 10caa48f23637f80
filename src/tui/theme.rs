//! Colours and shading, and how they step aside for `NO_COLOR`.
//!
//! With `NO_COLOR` set (to anything non-empty, see no-color.org) every style
//! here is plain or bold/reversed only, and everything that colour would tell
//! is also told by characters: water levels and marks in the rate map
//! (its colours come from [`crate::rate_map`]), letters on the trajectories,
//! markers on the chart.

use ratatui::style::{Color, Modifier, Style};

/// The palette in use.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Theme {
    /// True when colour is off.
    pub no_color: bool,
}

impl Theme {
    /// The theme the environment asks for: no colour when `NO_COLOR` is set and not empty.
    pub fn from_env() -> Theme {
        Theme {
            no_color: std::env::var_os("NO_COLOR").is_some_and(|v| !v.is_empty()),
        }
    }

    /// A colour, or nothing when colour is off.
    pub fn fg(&self, c: Color) -> Style {
        if self.no_color {
            Style::default()
        } else {
            Style::default().fg(c)
        }
    }

    /// Colour for canvas shapes (Reset when colour is off).
    pub fn ink(&self, c: Color) -> Color {
        if self.no_color {
            Color::Reset
        } else {
            c
        }
    }

    /// The top and bottom bars.
    pub fn bar(&self) -> Style {
        if self.no_color {
            Style::default().add_modifier(Modifier::REVERSED)
        } else {
            Style::default().fg(Color::Black).bg(Color::Cyan)
        }
    }

    /// The selected line of a list or table.
    pub fn selected(&self) -> Style {
        if self.no_color {
            Style::default().add_modifier(Modifier::REVERSED)
        } else {
            Style::default().fg(Color::Black).bg(Color::LightYellow)
        }
    }

    /// Headings.
    pub fn heading(&self) -> Style {
        self.fg(Color::LightCyan).add_modifier(Modifier::BOLD)
    }

    /// Secondary text.
    pub fn dim(&self) -> Style {
        if self.no_color {
            Style::default()
        } else {
            Style::default().fg(Color::Gray)
        }
    }

    /// An error message.
    pub fn error(&self) -> Style {
        self.fg(Color::LightRed).add_modifier(Modifier::BOLD)
    }

    /// A warning.
    pub fn warning(&self) -> Style {
        self.fg(Color::Yellow)
    }

    /// A good result.
    pub fn good(&self) -> Style {
        self.fg(Color::LightGreen)
    }

    /// A bad result.
    pub fn bad(&self) -> Style {
        self.fg(Color::LightRed)
    }

    /// Drive torque and the largest drop.
    pub const DRIVE: Color = Color::LightBlue;
    /// Resisting torque.
    pub const RESIST: Color = Color::LightRed;
    /// The operating point and markers.
    pub const MARK: Color = Color::LightYellow;
    /// The median drop.
    pub const MEDIAN: Color = Color::LightGreen;
    /// The small drop.
    pub const SMALL: Color = Color::LightMagenta;
    /// The ground.
    pub const GROUND: Color = Color::Rgb(150, 110, 60);
}
