//! Rendering snapshots (every view, 80×24 and 160×48, metric and US) and
//! scripted event sequences that drive the state without a terminal.

use std::time::Duration;

use ratatui::backend::TestBackend;
use ratatui::crossterm::event::{
    Event, KeyCode, KeyEvent, KeyModifiers, MouseButton, MouseEvent, MouseEventKind,
};
use ratatui::Terminal;

use super::app::{App, Confirm, Mode, View};
use super::fields::{self, Arms, Field, Row};
use super::theme::Theme;
use super::{draw, layout};
use crate::catalogue as cat;
use crate::physics::balance::rpm;
use crate::scenario;
use crate::units::UnitSystem;

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

fn op_rpm(app: &App) -> f64 {
    rpm(app
        .report
        .operating
        .as_ref()
        .expect("the example runs")
        .omega_rad_s())
}

#[test]
fn snapshots_of_every_view_in_both_sizes_and_unit_systems() {
    let mut a = app();
    for (n, view) in View::ALL.iter().enumerate() {
        a.event(&key(KeyCode::Char(char::from(b'1' + n as u8))));
        assert_eq!(a.view, *view);
        for units in [UnitSystem::Metric, UnitSystem::Us] {
            a.set_units(units);
            for (w, h) in [(80u16, 24u16), (160, 48)] {
                let name = format!(
                    "{}_{}_{w}x{h}",
                    view.title().to_lowercase(),
                    match units {
                        UnitSystem::Metric => "metric",
                        UnitSystem::Us => "us",
                    }
                );
                insta::assert_snapshot!(name, screen(&mut a, w, h));
            }
        }
    }
}

#[test]
fn snapshot_of_the_help_overlay_and_a_question() {
    let mut a = app();
    a.event(&key(KeyCode::Char('?')));
    insta::assert_snapshot!("help_80x24", screen(&mut a, 80, 24));
    insta::assert_snapshot!("help_160x48", screen(&mut a, 160, 48));
    a.event(&key(KeyCode::Esc));
    assert_eq!(a.mode, Mode::Normal);
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('q')));
    assert_eq!(a.mode, Mode::Confirm(Confirm::QuitUnsaved));
    assert!(a.settle(SETTLE));
    insta::assert_snapshot!("quit_unsaved_80x24", screen(&mut a, 80, 24));
}

#[test]
fn snapshot_of_a_windy_pattern_and_a_stalled_rotor() {
    let mut a = app();
    a.event(&key(KeyCode::Char('3')));
    select(&mut a, Field::of(&cat::WIND_SPEED));
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "3m/s");
    a.event(&key(KeyCode::Enter));
    assert!((a.design.wind.speed_m_s - 3.0).abs() < 1e-9);
    assert!(a.computing, "a windy pattern goes to the worker");
    assert!(a.settle(SETTLE));
    let s = a.spray.as_ref().unwrap();
    assert!(matches!(s.layout, Some(Ok(_))));
    insta::assert_snapshot!("pattern_windy_80x24", screen(&mut a, 80, 24));

    // Nozzles turned past radial (95°) on every arm: they brake, it cannot start.
    let mut b = app();
    select(&mut b, Field::of(&cat::DEFLECTION));
    b.event(&key(KeyCode::Enter));
    clear_input(&mut b);
    typed(&mut b, "95deg");
    b.event(&key(KeyCode::Enter));
    assert!(b.report.operating.is_none(), "95° deflection stalls it");
    assert!(b.settle(SETTLE));
    insta::assert_snapshot!("balance_stalled_80x24", screen(&mut b, 80, 24));
}

#[test]
fn scripted_edit_nudge_type_switch_and_save_reloads_the_same_scenario() {
    let dir = tempfile::tempdir().unwrap();
    let mut a = app();
    a.event(&Event::Resize(80, 24));
    let before = op_rpm(&a);

    // Select the rotor's deflection and nudge it down 1° twice, then coarse down 10°.
    let defl = Field::of(&cat::DEFLECTION);
    select(&mut a, defl);
    let d0 = a.design.rotor.arms[0].nozzle.deflection_rad.to_degrees();
    a.event(&key(KeyCode::Left));
    a.event(&key(KeyCode::Left));
    let d1 = a.design.rotor.arms[0].nozzle.deflection_rad.to_degrees();
    assert!((d1 - (d0 - 2.0)).abs() < 1e-9, "{d0} → {d1}");
    // A coarse step is 10° and lands on a multiple of it: 78° → 70°.
    a.event(&shift(KeyCode::Left));
    let d2 = a.design.rotor.arms[0].nozzle.deflection_rad.to_degrees();
    let want = ((d1 / 10.0).ceil() - 1.0) * 10.0;
    assert!((d2 - want).abs() < 1e-9, "{d1} → {d2}");
    assert!(a.dirty);
    // Less deflection points the jet further back: more torque, faster.
    assert!(op_rpm(&a) > before, "{} vs {before}", op_rpm(&a));

    // Type a pressure with a US unit while showing metric.
    select(&mut a, Field::of(&cat::INLET_PRESSURE));
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "45psi");
    a.event(&key(KeyCode::Enter));
    let want = 45.0 * crate::units::factor::PSI_PA;
    assert_eq!(a.mode, Mode::Normal);
    match a.design.supply {
        crate::physics::design::Supply::Pressure { inlet_pa } => {
            assert!((inlet_pa - want).abs() < 1e-6 * want, "{inlet_pa}")
        }
        other => panic!("{other:?}"),
    }

    // A refused value says why and keeps the old one.
    let kept = a.design.clone();
    select(&mut a, Field::of(&cat::NOZZLE_DIAMETER));
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "-1mm");
    a.event(&key(KeyCode::Enter));
    assert_eq!(a.design, kept);
    let msg = a.message.clone().expect("a refusal message").text;
    assert!(
        msg.contains("refused") && msg.contains("greater than zero"),
        "{msg}"
    );
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "2.8bar");
    a.event(&key(KeyCode::Enter));
    assert_eq!(a.design, kept, "a pressure is not a nozzle size");
    assert!(a.message.as_ref().unwrap().text.contains("length"));

    // A 6.5 in arm radius on arm 3 alone, typed in inches.
    a.event(&key(KeyCode::Char('a')));
    select(&mut a, Field::on_arm(&cat::RADIUS, 2));
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "6.5in");
    a.event(&key(KeyCode::Enter));
    assert!((a.design.rotor.arms[2].radius_m - 0.1651).abs() < 1e-9);
    assert!((a.design.rotor.arms[1].radius_m - 0.1651).abs() > 1e-3);

    // Views switch with Tab and digits.
    a.event(&key(KeyCode::Tab));
    assert_eq!(a.view, View::Throw);
    a.event(&key(KeyCode::Char('3')));
    assert_eq!(a.view, View::Pattern);
    a.event(&Event::Key(KeyEvent::new(
        KeyCode::BackTab,
        KeyModifiers::SHIFT,
    )));
    assert_eq!(a.view, View::Throw);

    // Units toggle.
    a.event(&key(KeyCode::Char('u')));
    assert_eq!(a.units, UnitSystem::Us);

    // Save: no file yet, so it asks for a name.
    a.event(&key(KeyCode::Char('s')));
    assert!(matches!(a.mode, Mode::Typing(_)));
    clear_input(&mut a);
    let path = dir.path().join("tuned.ron");
    typed(&mut a, &path.display().to_string());
    a.event(&key(KeyCode::Enter));
    assert!(!a.dirty, "{:?}", a.message);
    let loaded = scenario::load_file(&path).unwrap().to_design().unwrap();
    assert_eq!(loaded.rotor.arms.len(), 3);
    let close = |x: f64, y: f64| (x - y).abs() <= 1e-9 * x.abs().max(1e-9);
    assert!(close(
        loaded.rotor.arms[2].radius_m,
        a.design.rotor.arms[2].radius_m
    ));
    assert!(close(
        loaded.rotor.arms[0].nozzle.deflection_rad,
        a.design.rotor.arms[0].nozzle.deflection_rad
    ));
    let re = crate::physics::balance::solve(&loaded);
    let r2 = rpm(re.operating.unwrap().omega_rad_s());
    assert!(
        (r2 - op_rpm(&a)).abs() < 1e-6 * r2,
        "{r2} vs {}",
        op_rpm(&a)
    );

    // Quitting clean does not ask.
    a.event(&key(KeyCode::Char('q')));
    assert!(a.quit);
}

#[test]
fn a_file_changed_on_disk_is_not_overwritten_without_asking() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("lawn.ron");
    std::fs::write(&path, scenario::BUILTIN_EXAMPLE).unwrap();
    let mut a = App::open(Some(&path)).unwrap();
    a.event(&key(KeyCode::Right));
    assert!(a.dirty);
    // Someone else edits the file.
    let other = scenario::BUILTIN_EXAMPLE.replace("Lawn rotor", "Edited elsewhere");
    std::fs::write(&path, &other).unwrap();
    a.event(&key(KeyCode::Char('s')));
    assert!(matches!(
        a.mode,
        Mode::Confirm(Confirm::OverwriteChanged(_))
    ));
    a.event(&key(KeyCode::Char('n')));
    assert_eq!(std::fs::read_to_string(&path).unwrap(), other);
    assert!(a.dirty);
    a.event(&key(KeyCode::Char('s')));
    a.event(&key(KeyCode::Char('y')));
    assert!(!a.dirty);
    let text = std::fs::read_to_string(&path).unwrap();
    assert!(text.contains("Lawn rotor"));
    // The old one was kept.
    let bak = std::fs::read_to_string(dir.path().join("lawn.ron.bak")).unwrap();
    assert_eq!(bak, other);
    // Saved by us, unchanged since: no question.
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('s')));
    assert_eq!(a.mode, Mode::Normal);
    assert!(!a.dirty);
    assert!(a.settle(SETTLE));
}

#[test]
fn quitting_with_unsaved_changes_asks_and_can_stay() {
    let mut a = app();
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('q')));
    assert!(!a.quit);
    a.event(&key(KeyCode::Esc));
    assert!(!a.quit);
    assert_eq!(a.mode, Mode::Normal);
    a.event(&key(KeyCode::Char('q')));
    a.event(&key(KeyCode::Char('y')));
    assert!(a.quit);
}

#[test]
fn arms_are_added_removed_and_share_a_nozzle() {
    let mut a = app();
    a.event(&key(KeyCode::Char('a')));
    select(&mut a, Field::on_arm(&cat::NOZZLE_DIAMETER, 1));
    a.event(&key(KeyCode::Right));
    let big = a.design.rotor.arms[1].nozzle.diameter_m;
    assert!(big > a.design.rotor.arms[0].nozzle.diameter_m);
    a.event(&key(KeyCode::Char('*')));
    assert!(a
        .design
        .rotor
        .arms
        .iter()
        .all(|arm| arm.nozzle.diameter_m == big));
    a.event(&key(KeyCode::Char('+')));
    assert_eq!(a.design.rotor.arms.len(), 4);
    let az: Vec<f64> = a
        .design
        .rotor
        .arms
        .iter()
        .map(|arm| arm.azimuth_rad.to_degrees())
        .collect();
    for (k, z) in az.iter().enumerate() {
        assert!((z - 90.0 * k as f64).abs() < 1e-9, "{az:?}");
    }
    assert!(a.rows.contains(&Row::ArmHeading(3)));
    a.event(&key(KeyCode::Char('-')));
    a.event(&key(KeyCode::Char('-')));
    a.event(&key(KeyCode::Char('-')));
    assert_eq!(a.design.rotor.arms.len(), 1);
    a.event(&key(KeyCode::Char('-')));
    assert_eq!(a.design.rotor.arms.len(), 1, "the last arm stays");
    assert!(a
        .message
        .as_ref()
        .unwrap()
        .text
        .contains("at least one arm"));
    assert!(a.settle(SETTLE));
}

#[test]
fn mouse_selects_fields_and_views_and_scrolls() {
    let mut a = app();
    a.event(&Event::Resize(80, 24));
    let areas = a.areas();
    let click = |col, row| {
        Event::Mouse(MouseEvent {
            kind: MouseEventKind::Down(MouseButton::Left),
            column: col,
            row,
            modifiers: KeyModifiers::NONE,
        })
    };
    // The third tab.
    let (_, _, x0, _) = layout::tab_spans(areas.tabs.width)[2];
    a.event(&click(areas.tabs.x + x0, areas.tabs.y));
    assert_eq!(a.view, View::Pattern);
    // The list's row 2 (the first rows are: Supply heading, feed, inlet pressure).
    a.event(&click(areas.list.x + 3, areas.list.y + 2));
    assert_eq!(a.selected_field(), Some(Field::of(&cat::INLET_PRESSURE)));
    // Wheel over the list scrolls it.
    a.event(&Event::Mouse(MouseEvent {
        kind: MouseEventKind::ScrollDown,
        column: areas.list.x + 3,
        row: areas.list.y + 3,
        modifiers: KeyModifiers::NONE,
    }));
    assert_eq!(a.list_offset, 3);
}

#[test]
fn choices_change_the_list_and_every_feed_solves() {
    let mut a = app();
    select(&mut a, Field::of(&cat::SUPPLY));
    a.event(&key(KeyCode::Right));
    assert!(a.rows.contains(&Row::Field(Field::of(&cat::TOTAL_FLOW))));
    a.event(&key(KeyCode::Right));
    assert!(a.rows.contains(&Row::Field(Field::of(&cat::LINE_LENGTH))));
    assert!(a.report.operating.is_some());
    a.event(&key(KeyCode::Right));
    assert!(a
        .rows
        .contains(&Row::Field(Field::of(&cat::INLET_PRESSURE))));
    assert!(a.settle(SETTLE));
}

#[test]
fn rotation_and_flow_are_read_in_the_forms_taken() {
    use super::app::{parse_flow, parse_rotation};
    use crate::inverse::field::{FlowReading, RotationReading};
    let rpm = |r: RotationReading| r.measured_rpm();
    assert!((rpm(parse_rotation("40rpm").unwrap()) - 40.0).abs() < 1e-12);
    let r = parse_rotation("1.5s").unwrap();
    assert!(matches!(r, RotationReading::SecondsPerTurn { .. }));
    assert!((rpm(r) - 40.0).abs() < 1e-12);
    // 10 turns in 14.2 s = 42.25 rpm (model.md M10 example).
    let r = parse_rotation("10/14.2s").unwrap();
    assert!((rpm(r) - 42.253_521_126_760_56).abs() < 1e-9);
    let r = parse_rotation("10 turns in 15 s").unwrap();
    assert!((rpm(r) - 40.0).abs() < 1e-12);
    assert!(parse_rotation("fast").is_err());
    assert!(parse_rotation("0rpm").is_err());
    assert!(parse_rotation("-2s").is_err());

    let m = UnitSystem::Metric;
    let f = parse_flow("12L/min", m).unwrap();
    assert!(matches!(f, FlowReading::Rate { .. }));
    assert!((f.measured_m3_s() - 12e-3 / 60.0).abs() < 1e-15);
    let f = parse_flow("5L in 30s", m).unwrap();
    assert!(matches!(f, FlowReading::Caught { .. }));
    assert!((f.measured_m3_s() - 5e-3 / 30.0).abs() < 1e-15);
    let f = parse_flow("5L/30s", m).unwrap();
    assert!((f.measured_m3_s() - 5e-3 / 30.0).abs() < 1e-15);
    assert!(parse_flow("3.2gpm", m).is_ok());
    assert!(parse_flow("5m", m).is_err());
}

#[test]
fn field_view_checks_readings_against_the_design() {
    let mut a = app();
    a.event(&key(KeyCode::Char('4')));
    assert_eq!(a.view, View::Field);
    a.event(&key(KeyCode::Char('p')));
    clear_input(&mut a);
    typed(&mut a, "2.5bar");
    a.event(&key(KeyCode::Enter));
    assert!(
        a.field.result.is_none(),
        "no check before the rotation is in"
    );
    a.event(&key(KeyCode::Char('r')));
    typed(&mut a, "10/30s");
    a.event(&key(KeyCode::Enter));
    assert!(a.field.waiting, "the check runs on the worker");
    assert!(a.settle(SETTLE));
    let c = match a.field.result.as_deref() {
        Some(Ok(c)) => c.clone(),
        other => panic!("{other:?}"),
    };
    assert!((c.measured_rpm - 20.0).abs() < 1e-9);
    assert!((c.inlet_pressure_pa - 2.5e5).abs() < 1e-6);
    // Slower than the design at that pressure: more friction than designed.
    let f = c.friction.expect("an implied friction");
    assert!(f.implied_running_torque_n_m > f.design_running_torque_n_m);
    assert!(!c.findings.is_empty());
    insta::assert_snapshot!("field_checked_80x24", screen(&mut a, 80, 24));
    insta::assert_snapshot!("field_checked_160x48", screen(&mut a, 160, 48));
    // A bad reading is refused and the old one kept.
    a.event(&key(KeyCode::Char('r')));
    typed(&mut a, "fast");
    a.event(&key(KeyCode::Enter));
    assert!(a.message.as_ref().unwrap().text.contains("not a rotation"));
    assert!(a.measured.rotation.is_some());
}

#[test]
fn compare_view_shows_what_an_edit_changed() {
    let mut a = app();
    a.event(&key(KeyCode::Char('5')));
    a.event(&key(KeyCode::Char('c')));
    assert_eq!(a.pins.len(), 1);
    select(&mut a, Field::of(&cat::DEFLECTION));
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "5deg");
    a.event(&key(KeyCode::Enter));
    assert!(a.settle(SETTLE));
    let c = match a.comparison.result.as_deref() {
        Some(Ok(c)) => c.clone(),
        other => panic!("{other:?}"),
    };
    assert_eq!(c.names, vec!["pin 1".to_string(), "now".to_string()]);
    assert_eq!(c.inputs.len(), 3, "{:?}", c.inputs);
    assert!(c
        .inputs
        .iter()
        .all(|i| i.path.ends_with("nozzle.deflection")));
    let speed = c.results.iter().find(|r| r.key == "rpm").unwrap();
    // The pin has the old 15° deflection; now, at 5°, it turns faster.
    assert!(speed.deltas[1].unwrap() > 0.0);
    insta::assert_snapshot!("compare_pinned_80x24", screen(&mut a, 80, 24));
    insta::assert_snapshot!("compare_pinned_160x48", screen(&mut a, 160, 48));
    a.event(&key(KeyCode::Char('x')));
    assert!(a.pins.is_empty());
}

#[test]
fn without_colour_nothing_is_coloured_and_the_map_still_reads() {
    use ratatui::style::Color;
    let mut a = app();
    a.theme = Theme { no_color: true };
    a.event(&key(KeyCode::Char('3')));
    a.event(&Event::Resize(160, 48));
    let mut term = Terminal::new(TestBackend::new(160, 48)).unwrap();
    term.draw(|f| draw(&a, f)).unwrap();
    let buf = term.backend().buffer();
    for cell in buf.content() {
        assert_eq!(cell.fg, Color::Reset, "{:?}", cell);
        assert_eq!(cell.bg, Color::Reset, "{:?}", cell);
    }
    // The rate map and its legend tell the rate by water levels, in mm/h,
    // with no bands of the mean.
    let text = format!("{}", term.backend());
    assert!(text.contains("rate mm/h"), "{text}");
    assert!(
        !text.contains("of the mean") && !text.contains("90–110 %"),
        "{text}"
    );
    assert!(text.contains(crate::rate_map::DRIEST_MARK), "{text}");
    assert!(text.contains("() head"), "{text}");
    let levels = crate::rate_map::LEVEL_GLYPHS
        .iter()
        .filter(|g| text.contains(**g))
        .count();
    assert!(levels >= 3, "{levels} levels: {text}");
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

#[test]
fn the_rate_map_in_colour_and_without_at_both_sizes() {
    use crate::physics::design::Layout;
    use ratatui::style::Color;
    let mut a = app();
    a.event(&key(KeyCode::Char('3')));
    for (w, h) in [(80u16, 24u16), (160, 48)] {
        insta::assert_snapshot!(
            format!("rate_map_colour_{w}x{h}"),
            screen_with_colours(&mut a, w, h)
        );
    }
    // A triangle: one head in the middle of the upper edge.
    select(&mut a, Field::of(&cat::LAYOUT));
    for _ in 0..4 {
        if matches!(a.design.layout, Some(Layout::Triangle { .. })) {
            break;
        }
        a.event(&key(KeyCode::Right));
    }
    assert!(matches!(a.design.layout, Some(Layout::Triangle { .. })));
    assert!(a.settle(SETTLE));
    insta::assert_snapshot!(
        "rate_map_triangle_colour_160x48",
        screen_with_colours(&mut a, 160, 48)
    );
    let mut b = app();
    b.theme = Theme { no_color: true };
    b.event(&key(KeyCode::Char('3')));
    for units in [UnitSystem::Metric, UnitSystem::Us] {
        b.set_units(units);
        for (w, h) in [(80u16, 24u16), (160, 48)] {
            let shown = screen_with_colours(&mut b, w, h);
            let (text, colours) = shown.split_once("--- colours").unwrap();
            assert!(colours.lines().skip(1).all(str::is_empty), "{colours}");
            let unit = match units {
                UnitSystem::Metric => "metric",
                UnitSystem::Us => "us",
            };
            let mut term = Terminal::new(TestBackend::new(w, h)).unwrap();
            term.draw(|f| draw(&b, f)).unwrap();
            assert!(term
                .backend()
                .buffer()
                .content()
                .iter()
                .all(|c| c.fg == Color::Reset));
            insta::assert_snapshot!(format!("rate_map_no_color_{unit}_{w}x{h}"), text);
        }
    }
}

#[test]
fn the_picker_opens_a_scenario_or_adds_it_to_compare() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::create_dir(dir.path().join("scenarios")).unwrap();
    let other = scenario::BUILTIN_EXAMPLE.replace("Lawn rotor", "Other rotor");
    std::fs::write(dir.path().join("scenarios").join("other.ron"), &other).unwrap();
    std::fs::write(dir.path().join("here.ron"), scenario::BUILTIN_EXAMPLE).unwrap();
    std::fs::write(dir.path().join("notes.txt"), "not a scenario").unwrap();
    let mut a = app();
    a.base_dir = dir.path().to_path_buf();
    a.event(&key(KeyCode::Char('o')));
    let Mode::Picker(p) = &a.mode else {
        panic!("{:?}", a.mode)
    };
    let names: Vec<String> = p
        .files
        .iter()
        .map(|f| f.file_name().unwrap().to_string_lossy().into_owned())
        .collect();
    assert_eq!(names, ["other.ron", "here.ron"]);
    // c adds it to the comparison without opening it.
    a.event(&key(KeyCode::Char('c')));
    assert_eq!(a.pins.len(), 1);
    assert_eq!(a.pins[0].design.name, "Other rotor");
    assert_eq!(a.design.name, "Lawn rotor");
    // With an unsaved change, opening asks first.
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('o')));
    a.event(&key(KeyCode::Enter));
    assert!(matches!(a.mode, Mode::Confirm(Confirm::OpenUnsaved(_))));
    a.event(&key(KeyCode::Char('y')));
    assert_eq!(a.design.name, "Other rotor");
    assert!(!a.dirty);
    assert!(a.settle(SETTLE));
}

#[test]
fn tiny_and_odd_terminal_sizes_draw_without_panicking() {
    let mut a = app();
    select(&mut a, Field::of(&cat::DEFLECTION));
    a.event(&key(KeyCode::Char('c')));
    assert!(a.settle(SETTLE));
    for (w, h) in [
        (1u16, 1u16),
        (10, 3),
        (30, 8),
        (45, 12),
        (79, 23),
        (200, 60),
    ] {
        for n in 0..5u8 {
            a.event(&key(KeyCode::Char(char::from(b'1' + n))));
            let text = screen(&mut a, w, h);
            assert_eq!(text.lines().count(), h as usize);
        }
        a.event(&key(KeyCode::Char('?')));
        screen(&mut a, w, h);
        a.event(&key(KeyCode::Esc));
    }
}

#[test]
fn saving_changes_only_the_edited_value_and_keeps_every_comment() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("lawn.ron");
    std::fs::write(&path, scenario::BUILTIN_EXAMPLE).unwrap();
    let mut a = App::open(Some(&path)).unwrap();
    // Shown in US units; the file stays in its own units.
    a.event(&key(KeyCode::Char('u')));
    select(&mut a, Field::of(&cat::INLET_PRESSURE));
    a.event(&key(KeyCode::Right));
    assert!(a.dirty);
    a.event(&key(KeyCode::Char('s')));
    assert!(!a.dirty, "{:?}", a.message);
    let msg = a.message.clone().unwrap().text;
    assert!(msg.contains("comments kept"), "{msg}");
    let text = std::fs::read_to_string(&path).unwrap();
    let before: Vec<&str> = scenario::BUILTIN_EXAMPLE.lines().collect();
    let after: Vec<&str> = text.lines().collect();
    assert_eq!(before.len(), after.len());
    let changed: Vec<(&&str, &&str)> = before.iter().zip(&after).filter(|(x, y)| x != y).collect();
    assert_eq!(changed.len(), 1, "{changed:#?}");
    assert!(
        changed[0].1.contains("supply: Pressure(kPa("),
        "{changed:?}"
    );

    // Save as: the new file keeps the comments too.
    let other = dir.path().join("copy.ron");
    a.event(&key(KeyCode::Char('S')));
    clear_input(&mut a);
    typed(&mut a, &other.display().to_string());
    a.event(&key(KeyCode::Enter));
    assert_eq!(std::fs::read_to_string(&other).unwrap(), text);
    assert!(a.settle(SETTLE));
}

#[test]
fn practice_warnings_show_in_the_status_line_and_the_balance_view() {
    // The old starter: unbraked, nozzles 15° off straight back, 2,050 rpm.
    let text = scenario::starter_text(UnitSystem::Metric)
        .replace("deflection: deg(70)", "deflection: deg(15)")
        .replace("viscous: 0.005", "viscous: 0.0");
    let sc = scenario::load_str(&text, "fast").unwrap();
    let mut a = App::from_scenario(sc, None, None).unwrap();
    assert!(a.settle(SETTLE));
    let keys: Vec<&str> = a.cautions().iter().map(|c| c.key()).collect();
    assert_eq!(keys, ["fast_spin", "fast_tip", "spin_pressure"]);
    let s = screen(&mut a, 160, 48);
    let top = s.lines().next().unwrap();
    assert!(top.contains("rpm ⚠ 3 warnings"), "{top}");
    assert!(s.contains("⚠ runs at 2049 rpm"), "{s}");
    let s = screen(&mut a, 80, 24);
    assert!(s.lines().next().unwrap().contains("rpm ⚠ 3"), "{s}");
}

#[test]
fn pattern_view_says_when_heads_do_not_meet() {
    let mut a = app();
    a.event(&key(KeyCode::Char('3')));
    select(&mut a, Field::of(&cat::SQUARE_SPACING));
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "60m");
    a.event(&key(KeyCode::Enter));
    assert!(a.settle(SETTLE));
    let shown = screen(&mut a, 100, 30);
    assert!(shown.contains("heads do not meet"), "{shown}");
    assert!(!shown.contains("CU -"), "{shown}");
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

#[test]
fn several_readings_are_fitted_on_the_worker() {
    use crate::inverse::fit::at_pressure;
    let mut a = app();
    a.event(&key(KeyCode::Char('4')));
    // Readings made by the design itself at three pressures: the fit must
    // give back the design's running friction with no residual.
    let design = a.design.clone();
    for bar in [2.0, 2.5, 3.0] {
        let r = solve(&at_pressure(&design, bar * 1e5));
        let speed = op_rpm_of(&r);
        add_reading(&mut a, &format!("{bar}bar"), &format!("{speed:.4}rpm"));
    }
    assert_eq!(a.unit.rows.len(), 3);
    assert!(a.unit.fit.waiting, "the fit runs on the worker");
    assert!(a.settle(SETTLE));
    let f = match a.unit.fit.result.as_deref() {
        Some(Ok(f)) => f.clone(),
        other => panic!("{other:?}"),
    };
    assert_eq!(f.residuals.len(), 3);
    assert!(f.rms_residual_rpm < 0.05, "{}", f.rms_residual_rpm);
    let screen80 = screen(&mut a, 80, 24);
    assert!(screen80.contains("readings table"), "{screen80}");
    insta::assert_snapshot!("field_readings_table_80x24", screen80);
    a.event(&key(KeyCode::PageDown));
    insta::assert_snapshot!("field_readings_fit_160x48", screen(&mut a, 160, 48));
    // x drops the last row and the fit is made again over two.
    a.event(&key(KeyCode::Char('x')));
    assert_eq!(a.unit.rows.len(), 2);
    assert!(a.settle(SETTLE));
    assert!(matches!(a.unit.fit.result.as_deref(), Some(Ok(f)) if f.residuals.len() == 2));
    // n with no rotation typed is refused with what to do.
    a.event(&key(KeyCode::Char('r')));
    a.event(&key(KeyCode::Enter));
    a.event(&key(KeyCode::Char('n')));
    assert!(a
        .message
        .as_ref()
        .unwrap()
        .text
        .contains("type the pressure"));
    assert_eq!(a.unit.rows.len(), 2);
}

fn op_rpm_of(r: &crate::physics::balance::SpinReport) -> f64 {
    rpm(r.operating.as_ref().expect("runs").omega_rad_s())
}

use crate::physics::balance::solve;

#[test]
fn a_coast_down_is_entered_and_fitted() {
    use crate::inverse::coast::{fit_coast, CoastData};
    let mut a = app();
    a.event(&key(KeyCode::Char('4')));
    a.event(&key(KeyCode::Char('d')));
    typed(&mut a, "0.9, 1.9, 3.0, 4.2, 5.6, 7.3");
    a.event(&key(KeyCode::Enter));
    assert_eq!(a.unit.coast_times_s, vec![0.9, 1.9, 3.0, 4.2, 5.6, 7.3]);
    assert!(a.settle(SETTLE));
    let direct = fit_coast(
        &a.design,
        &CoastData::TurnTimes(a.unit.coast_times_s.clone()),
        None,
    )
    .map_err(|e| e.to_string());
    assert_eq!(a.unit.coast.result.as_deref(), Some(&direct));
    let c = direct.expect("these times fit");
    assert!(c.running_friction_n_m.value >= 0.0);
    let s = screen(&mut a, 80, 24);
    assert!(s.contains("coast-down (d)"), "{s}");
    insta::assert_snapshot!("field_coast_80x24", s);
    // Times that do not rise are refused; the old ones are kept.
    a.event(&key(KeyCode::Char('d')));
    clear_input(&mut a);
    typed(&mut a, "1, 2, 1.5");
    a.event(&key(KeyCode::Enter));
    assert!(a.message.as_ref().unwrap().text.contains("not later"));
    assert_eq!(a.unit.coast_times_s.len(), 6);
    // Typing it empty clears it.
    a.event(&key(KeyCode::Char('d')));
    clear_input(&mut a);
    a.event(&key(KeyCode::Enter));
    assert!(a.unit.coast_times_s.is_empty());
    assert!(a.unit.coast.result.is_none());
}

#[test]
fn readings_are_cleared_when_another_file_opens_unless_kept() {
    let dir = tempfile::tempdir().unwrap();
    let other = dir.path().join("other.ron");
    std::fs::write(
        &other,
        scenario::BUILTIN_EXAMPLE.replace("Lawn rotor", "Other rotor"),
    )
    .unwrap();
    let mut a = app();
    a.event(&key(KeyCode::Char('4')));
    add_reading(&mut a, "2.5bar", "30rpm");
    a.event(&key(KeyCode::Char('d')));
    typed(&mut a, "1, 2.1, 3.3, 4.6");
    a.event(&key(KeyCode::Enter));
    assert!(a.settle(SETTLE));
    assert!(a.measured.reading().is_some() && a.unit.any());
    a.open_file(&other);
    assert_eq!(a.design.name, "Other rotor");
    assert!(a.measured.reading().is_none());
    assert!(a.measured.pressure_pa.is_none());
    assert!(!a.unit.any());
    assert!(a.field.result.is_none() && a.unit.fit.result.is_none());
    let msg = &a.message.as_ref().unwrap().text;
    assert!(
        msg.contains("readings cleared") && msg.contains("k in Field keeps"),
        "{msg}"
    );
    assert!(a.settle(SETTLE));
    // Kept on purpose: k, then open; the readings re-check the new design.
    add_reading(&mut a, "2.5bar", "30rpm");
    a.event(&key(KeyCode::Char('k')));
    assert!(a.unit.keep);
    assert!(a.message.as_ref().unwrap().text.contains("kept on purpose"));
    let s = screen(&mut a, 80, 24);
    assert!(s.contains("· kept") && s.contains("opens (k)"), "{s}");
    a.open_file(&other);
    assert!(a
        .message
        .as_ref()
        .unwrap()
        .text
        .contains("readings kept on purpose"));
    assert!(a.measured.reading().is_some());
    assert_eq!(a.unit.rows.len(), 1);
    assert!(a.field.waiting || a.field.result.is_some());
    assert!(a.settle(SETTLE));
    assert!(matches!(a.field.result.as_deref(), Some(Ok(_))));
}

fn alt(code: KeyCode) -> Event {
    Event::Key(KeyEvent::new(code, KeyModifiers::ALT))
}

fn radii(app: &App) -> Vec<f64> {
    app.design.rotor.arms.iter().map(|a| a.radius_m).collect()
}

#[test]
fn one_edit_of_the_whole_rotor_changes_all_three_arms() {
    let mut a = app();
    assert_eq!(a.design.rotor.arms.len(), 3);
    assert_eq!(
        a.arms,
        Arms::Together,
        "the example opens with its arms together"
    );
    assert!(a.rows.contains(&Row::AllArmsHeading));
    assert!(!a.rows.iter().any(|r| matches!(r, Row::ArmHeading(_))));
    select(&mut a, Field::of(&cat::RADIUS));
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "250mm");
    a.event(&key(KeyCode::Enter));
    assert_eq!(radii(&a), vec![0.25; 3], "{:?}", a.message);
    // One nudge moves every arm too, and the azimuths stay evenly spread.
    a.event(&key(KeyCode::Right));
    assert_eq!(radii(&a), vec![0.255; 3]);
    let az: Vec<f64> = a
        .design
        .rotor
        .arms
        .iter()
        .map(|arm| arm.azimuth_rad.to_degrees())
        .collect();
    for (k, z) in az.iter().enumerate() {
        assert!((z - 120.0 * k as f64).abs() < 1e-9, "{az:?}");
    }
    // Adding an arm keeps them together and alike, four evenly spread.
    a.event(&key(KeyCode::Char('+')));
    assert_eq!(a.design.rotor.arms.len(), 4);
    assert_eq!(fields::arms_alike(&a.design), Ok(()));
    a.message = None;
    let s = screen(&mut a, 160, 48);
    assert!(s.contains("all 4 arms alike"), "{s}");
    assert!(s.contains("(all 4 arms)"), "{s}");
    assert!(a.settle(SETTLE));
}

#[test]
fn arms_split_for_one_arm_and_join_back_only_when_alike() {
    let mut a = app();
    a.event(&key(KeyCode::Char('a')));
    assert_eq!(a.arms, Arms::Apart);
    assert!(a.rows.contains(&Row::ArmHeading(2)));
    select(&mut a, Field::on_arm(&cat::RADIUS, 1));
    a.event(&key(KeyCode::Enter));
    clear_input(&mut a);
    typed(&mut a, "300mm");
    a.event(&key(KeyCode::Enter));
    let r = radii(&a);
    assert_eq!(r[1], 0.3);
    assert!(r[0] != 0.3 && r[2] != 0.3, "{r:?}");
    // The arms differ: joining is refused and says why; the join is not
    // offered on the key line.
    assert!(!super::views::keys_here(&a).contains(&("a", "join arms")));
    a.event(&key(KeyCode::Char('a')));
    assert_eq!(a.arms, Arms::Apart);
    let msg = a.message.clone().unwrap().text;
    assert!(
        msg.contains("not joined") && msg.contains("radius"),
        "{msg}"
    );
    // `*` makes every arm a copy of arm 2 (azimuths kept); then they join.
    let az: Vec<f64> = a.design.rotor.arms.iter().map(|x| x.azimuth_rad).collect();
    a.event(&key(KeyCode::Char('*')));
    assert_eq!(radii(&a), vec![0.3; 3]);
    let az2: Vec<f64> = a.design.rotor.arms.iter().map(|x| x.azimuth_rad).collect();
    assert_eq!(az, az2);
    let msg = a.message.clone().unwrap().text;
    assert!(msg.contains("radius, height, rise, tube, nozzle"), "{msg}");
    assert!(super::views::keys_here(&a).contains(&("a", "join arms")));
    a.event(&key(KeyCode::Char('a')));
    assert_eq!(a.arms, Arms::Together);
    // The selection stays on the radius, now the whole rotor's.
    assert_eq!(a.selected_field(), Some(Field::of(&cat::RADIUS)));
    assert!(a.settle(SETTLE));
}

#[test]
fn the_finer_step_moves_deflection_a_tenth_of_a_degree() {
    let mut a = app();
    select(&mut a, Field::of(&cat::DEFLECTION));
    let d0 = a.design.rotor.arms[0].nozzle.deflection_rad.to_degrees();
    let r0 = op_rpm(&a);
    a.event(&alt(KeyCode::Right));
    let d1 = a.design.rotor.arms[0].nozzle.deflection_rad.to_degrees();
    assert!(d1 > d0 && d1 - d0 <= 0.1 + 1e-9, "{d0} → {d1}");
    assert!(a
        .design
        .rotor
        .arms
        .iter()
        .all(|x| x.nozzle.deflection_rad.to_degrees() == d1));
    let r1 = op_rpm(&a);
    // The fine step moves it ten times as far (and the speed more).
    a.event(&key(KeyCode::Right));
    let d2 = a.design.rotor.arms[0].nozzle.deflection_rad.to_degrees();
    assert!((d2 - d1 - 1.0).abs() <= 0.1 + 1e-9, "{d1} → {d2}");
    assert!((r1 - r0).abs() < (op_rpm(&a) - r1).abs());
    // The hint line shows all three steps.
    a.message = None;
    let s = screen(&mut a, 160, 48);
    assert!(s.contains("step ±1.00° (⇧ ±10.0°, Alt ±0.100°)"), "{s}");
    let s = screen(&mut a, 80, 24);
    assert!(s.contains("step ±1.00° (⇧ ±10.0°, Alt ±0.100°)"), "{s}");
    assert!(a.settle(SETTLE));
}

#[test]
fn compare_drops_a_middle_pin_reorders_and_says_what_each_changes() {
    let mut a = app();
    a.event(&key(KeyCode::Char('5')));
    a.event(&key(KeyCode::Char('c')));
    select(&mut a, Field::of(&cat::RADIUS));
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('c')));
    select(&mut a, Field::of(&cat::INLET_PRESSURE));
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('c')));
    let labels = |a: &App| a.pins.iter().map(|p| p.label.clone()).collect::<Vec<_>>();
    assert_eq!(labels(&a), ["pin 1", "pin 2", "pin 3"]);
    assert!(a.settle(SETTLE));
    let c = match a.comparison.result.as_deref() {
        Some(Ok(c)) => c.clone(),
        other => panic!("{other:?}"),
    };
    let per = super::views::compare_differences(&c, |_| Some(3));
    assert_eq!(
        per[0],
        ("pin 2".to_string(), vec!["radius (all arms)".to_string()])
    );
    assert_eq!(
        per[1],
        (
            "pin 3".to_string(),
            vec![
                "inlet pressure".to_string(),
                "radius (all arms)".to_string()
            ]
        )
    );
    let s = screen(&mut a, 160, 48);
    assert!(s.contains("pin 2 against pin 1: radius (all arms)"), "{s}");
    // Alike on every arm: one row for the rotor, not one per arm.
    assert!(s.contains("arms radius mm  "), "{s}");
    assert!(!s.contains("arm 2 radius"), "{s}");

    // Pick the middle pin and drop it.
    a.event(&key(KeyCode::Char(']')));
    assert_eq!(a.pin_selected, 1);
    a.event(&key(KeyCode::Char('x')));
    assert_eq!(labels(&a), ["pin 1", "pin 3"]);
    // A new pin takes the free number, not a used one.
    a.event(&key(KeyCode::Char('c')));
    assert_eq!(labels(&a), ["pin 1", "pin 3", "pin 2"]);
    // Move the last pin to the front: it becomes the baseline.
    a.event(&key(KeyCode::Char(']')));
    assert_eq!(a.pin_selected, 2);
    a.event(&key(KeyCode::Char('<')));
    a.event(&key(KeyCode::Char('<')));
    assert_eq!(labels(&a), ["pin 2", "pin 1", "pin 3"]);
    assert_eq!(a.pin_selected, 0);
    a.event(&key(KeyCode::Char('<')));
    assert_eq!(
        labels(&a),
        ["pin 2", "pin 1", "pin 3"],
        "the first stays first"
    );
    a.event(&key(KeyCode::Char('>')));
    assert_eq!(labels(&a), ["pin 1", "pin 2", "pin 3"]);
    assert!(a.settle(SETTLE));
    let c = match a.comparison.result.as_deref() {
        Some(Ok(c)) => c.clone(),
        other => panic!("{other:?}"),
    };
    assert_eq!(c.names, ["pin 1", "pin 2", "pin 3", "now"]);
    insta::assert_snapshot!("compare_three_pins_160x48", screen(&mut a, 160, 48));
}

#[test]
fn the_starter_and_every_shipped_scenario_open_with_their_arms_together() {
    for system in [UnitSystem::Metric, UnitSystem::Us] {
        let sc = scenario::load_str(&scenario::starter_text(system), "starter").unwrap();
        let a = App::from_scenario(sc, None, None).unwrap();
        assert_eq!(a.arms, Arms::Together, "starter in {system}");
    }
    let mut n = 0;
    for path in super::app::scenario_files(std::path::Path::new(env!("CARGO_MANIFEST_DIR"))) {
        let a = App::open(Some(&path)).unwrap();
        assert_eq!(
            a.arms,
            Arms::Together,
            "{}: {:?}",
            path.display(),
            fields::arms_alike(&a.design)
        );
        assert!(a.rows.contains(&Row::AllArmsHeading));
        n += 1;
    }
    assert!(n >= 4, "{n} scenarios found");
}
