//! The interface driven without a terminal: scripted key and mouse events
//! against [`App`], the screen drawn to a test backend.
//!
//! Snapshots are few on purpose (see DEVELOPERS.md, "The interface"):
//! - `matrix.rs`: ONE size × units matrix on the built-in example that pins
//!   the layout of every view; and a few snapshots that pin numbers on a
//!   fixed design (a field check, a readings fit, three pins, the rate map's
//!   colours) plus the help screen.
//! - everything else asserts behaviour: what a key does, what a view says,
//!   in which unit, so a change to the model rewrites only the snapshots.

use std::time::Duration;

use ratatui::backend::TestBackend;
use ratatui::crossterm::event::{
    Event, KeyCode, KeyEvent, KeyModifiers, MouseButton, MouseEvent, MouseEventKind,
};
use ratatui::Terminal;

use super::fields::{self, Arms, Field, Row};
use super::theme::Theme;
use super::{draw, layout};
use crate::catalogue as cat;
use crate::physics::balance::{rpm, solve};
use crate::scenario;
use crate::tui::app::{App, Confirm, Mode, View};
use crate::units::UnitSystem;

mod ask;
mod compare;
mod editing;
mod field;
mod files;
mod keys;
mod matrix;
mod views;

const SETTLE: Duration = Duration::from_secs(120);

fn app() -> App {
    let mut a = App::open(None).expect("the built-in example opens");
    a.theme = Theme { no_color: false };
    assert!(a.settle(SETTLE), "worker did not finish");
    a
}

fn screen(app: &mut App, w: u16, h: u16) -> String {
    app.event(&Event::Resize(w, h));
    let mut term = Terminal::new(TestBackend::new(w, h)).expect("test terminal");
    term.draw(|f| draw(app, f)).expect("draw");
    format!("{}", term.backend())
}

fn key(code: KeyCode) -> Event {
    Event::Key(KeyEvent::new(code, KeyModifiers::NONE))
}

fn shift(code: KeyCode) -> Event {
    Event::Key(KeyEvent::new(code, KeyModifiers::SHIFT))
}

fn typed(app: &mut App, text: &str) {
    for c in text.chars() {
        app.event(&key(KeyCode::Char(c)));
    }
}

fn clear_input(app: &mut App) {
    app.event(&Event::Key(KeyEvent::new(
        KeyCode::Char('u'),
        KeyModifiers::CONTROL,
    )));
}

fn select(app: &mut App, f: Field) {
    app.event(&key(KeyCode::Home));
    for _ in 0..400 {
        if app.selected_field() == Some(f) {
            return;
        }
        app.event(&key(KeyCode::Down));
    }
    panic!("{f:?} not reachable with Down");
}

/// Selects `f` and types `text` into it (the old value cleared first).
fn type_into(app: &mut App, f: Field, text: &str) {
    select(app, f);
    app.event(&key(KeyCode::Enter));
    clear_input(app);
    typed(app, text);
    app.event(&key(KeyCode::Enter));
}

/// The arms stand `step_deg` apart, the first at 0°.
fn assert_evenly_spread(app: &App, step_deg: f64) {
    let az: Vec<f64> = app
        .design
        .rotor
        .arms
        .iter()
        .map(|arm| arm.azimuth_rad.to_degrees())
        .collect();
    for (k, z) in az.iter().enumerate() {
        assert!((z - step_deg * k as f64).abs() < 1e-9, "{az:?}");
    }
}

fn op_rpm(app: &App) -> f64 {
    rpm(app
        .report
        .operating
        .as_ref()
        .expect("the example runs")
        .omega_rad_s())
}

/// The screen as text, then its colours: each cell of the rate map as the
/// nearest of ten steps of the colour scale (0 low … 9 high), `H` a head,
/// `d` dry ground, `q` the driest-quarter mark; other cells blank.
fn screen_with_colours(app: &mut App, w: u16, h: u16) -> String {
    use crate::rate_map::{scale_rgb, DRIEST_RGB, DRY_RGB, HEAD_RGB};
    use ratatui::style::Color;
    app.event(&Event::Resize(w, h));
    let mut term = Terminal::new(TestBackend::new(w, h)).expect("test terminal");
    term.draw(|f| draw(app, f)).expect("draw");
    let steps: Vec<(u8, u8, u8)> = (0..10).map(|k| scale_rgb(f64::from(k) / 9.0)).collect();
    let buf = term.backend().buffer();
    let mut plane = String::new();
    for y in 0..h {
        let mut line = String::new();
        for x in 0..w {
            let c = match buf[(x, y)].fg {
                Color::Rgb(r, g, b) if (r, g, b) == HEAD_RGB => 'H',
                Color::Rgb(r, g, b) if (r, g, b) == DRY_RGB => 'd',
                Color::Rgb(r, g, b) if (r, g, b) == DRIEST_RGB => 'q',
                Color::Rgb(r, g, b) => {
                    let d = |s: &(u8, u8, u8)| {
                        let e = |p: u8, q: u8| (i32::from(p) - i32::from(q)).pow(2);
                        e(s.0, r) + e(s.1, g) + e(s.2, b)
                    };
                    let k = (0..10).min_by_key(|&k| d(&steps[k])).unwrap();
                    char::from(b'0' + k as u8)
                }
                _ => ' ',
            };
            line.push(c);
        }
        plane.push_str(line.trim_end());
        plane.push('\n');
    }
    format!(
        "{}\n--- colours of the rate map ---\n{plane}",
        term.backend()
    )
}

/// Types a reading in the Field view: pressure, rotation, then `a` adds it.
fn add_reading(a: &mut App, pressure: &str, rotation: &str) {
    a.event(&key(KeyCode::Char('p')));
    clear_input(a);
    typed(a, pressure);
    a.event(&key(KeyCode::Enter));
    a.event(&key(KeyCode::Char('r')));
    typed(a, rotation);
    a.event(&key(KeyCode::Enter));
    a.event(&key(KeyCode::Char('n')));
}

fn op_rpm_of(r: &crate::physics::balance::SpinReport) -> f64 {
    rpm(r.operating.as_ref().expect("runs").omega_rad_s())
}

fn alt(code: KeyCode) -> Event {
    Event::Key(KeyEvent::new(code, KeyModifiers::ALT))
}

fn radii(app: &App) -> Vec<f64> {
    app.design.rotor.arms.iter().map(|a| a.radius_m).collect()
}

/// The Field view with a single check: 2.5 bar, 10 turns in 30 s.
fn field_checked(a: &mut App) {
    a.event(&key(KeyCode::Char('4')));
    a.event(&key(KeyCode::Char('p')));
    clear_input(a);
    typed(a, "2.5bar");
    a.event(&key(KeyCode::Enter));
    a.event(&key(KeyCode::Char('r')));
    typed(a, "10/30s");
    a.event(&key(KeyCode::Enter));
    assert!(a.settle(SETTLE));
}

/// The Field view with three readings the design itself makes (at 2, 2.5
/// and 3 bar), fitted.
fn three_readings(a: &mut App) {
    use crate::inverse::fit::at_pressure;
    a.event(&key(KeyCode::Char('4')));
    let design = a.design.clone();
    for bar in [2.0, 2.5, 3.0] {
        let r = solve(&at_pressure(&design, bar * 1e5));
        let speed = op_rpm_of(&r);
        add_reading(a, &format!("{bar}bar"), &format!("{speed:.4}rpm"));
    }
}

/// Compare with three pins: the example, then one radius nudge, then one
/// pressure nudge more.
fn three_pins(a: &mut App) {
    a.event(&key(KeyCode::Char('5')));
    a.event(&key(KeyCode::Char('c')));
    select(a, Field::of(&cat::RADIUS));
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('c')));
    select(a, Field::of(&cat::INLET_PRESSURE));
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('c')));
    assert!(a.settle(SETTLE));
}
