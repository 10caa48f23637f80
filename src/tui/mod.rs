//! The terminal interface: one live screen over a scenario.
//!
//! - [`app`]: the state and every change to it ([`App::event`]).
//! - [`fields`]: the editable list — what each field is, its unit and steps.
//! - [`keys`]: the one key table; dispatch, the bottom line and the help
//!   screen are read from it.
//! - [`views`]: drawing, one file per view; drawing only reads.
//! - [`worker`]: throw, pattern and layout on a thread of their own.
//! - [`layout`]: where things go, shared by drawing and mouse handling.
//! - [`theme`]: colours, and `NO_COLOR`.
//!
//! This is the only place in the crate that touches the terminal. The
//! terminal is put back by one function, [`reset_terminal`], on every way
//! out: a normal quit, an error, and (through the panic hook) a panic.

pub mod app;
pub mod fields;
pub mod keys;
pub mod layout;
pub mod theme;
pub mod views;
pub mod worker;

use std::io::{self, Write};
use std::path::PathBuf;
use std::time::Duration;

use ratatui::backend::CrosstermBackend;
use ratatui::crossterm::event::{self, DisableMouseCapture, EnableMouseCapture};
use ratatui::crossterm::terminal::{
    disable_raw_mode, enable_raw_mode, EnterAlternateScreen, LeaveAlternateScreen,
};
use ratatui::crossterm::{cursor, execute};
use ratatui::Terminal;

pub use app::App;
pub use views::draw;

/// Puts the terminal back as it was: mouse capture off, main screen back,
/// raw mode off, cursor shown. Safe to call more than once and from the
/// panic hook; every step is tried even if an earlier one fails.
pub fn reset_terminal() {
    let mut out = io::stdout();
    let _ = execute!(out, DisableMouseCapture);
    let _ = execute!(out, LeaveAlternateScreen);
    let _ = disable_raw_mode();
    let _ = execute!(out, cursor::Show);
    let _ = out.flush();
}

/// The crash hook with the terminal put back first (see [`crate::crash`]).
fn install_panic_hook() {
    crate::crash::install(reset_terminal);
}

fn setup() -> io::Result<Terminal<CrosstermBackend<io::Stdout>>> {
    enable_raw_mode()?;
    let mut out = io::stdout();
    execute!(out, EnterAlternateScreen, EnableMouseCapture, cursor::Hide)?;
    Terminal::new(CrosstermBackend::new(out))
}

/// Opens the interface on `file` (the built-in example when None) and runs
/// it until the user quits. The terminal is restored on every exit path.
pub fn run(file: Option<PathBuf>) -> Result<(), String> {
    // Load before touching the terminal, so a bad file is a plain message.
    let mut app = App::open(file.as_deref()).map_err(|e| format!("{e:#}"))?;
    install_panic_hook();
    let result = match setup() {
        Ok(mut terminal) => event_loop(&mut terminal, &mut app),
        Err(e) => Err(e),
    };
    reset_terminal();
    result.map_err(|e| format!("terminal: {e}"))
}

fn event_loop(
    terminal: &mut Terminal<CrosstermBackend<io::Stdout>>,
    app: &mut App,
) -> io::Result<()> {
    let size = terminal.size()?;
    app.size = (size.width, size.height);
    let mut redraw = true;
    while !app.quit {
        if redraw {
            terminal.draw(|f| draw(app, f))?;
            redraw = false;
        }
        // Wake often enough to take worker results without a busy loop.
        if event::poll(Duration::from_millis(40))? {
            let ev = event::read()?;
            app.event(&ev);
            redraw = true;
            // Take whatever else is queued before drawing (key repeat).
            while event::poll(Duration::ZERO)? {
                let ev = event::read()?;
                app.event(&ev);
            }
        }
        if app.poll_worker() {
            redraw = true;
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests;
