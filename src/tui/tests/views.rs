//! What the views say: units, warnings, wind, stalls, the rate map, odd sizes.

use super::*;

#[test]
fn a_windy_pattern_says_the_wind_and_a_stalled_rotor_says_it_stalls() {
    let mut a = app();
    a.event(&key(KeyCode::Char('3')));
    type_into(&mut a, Field::of(&cat::WIND_SPEED), "3m/s");
    assert!((a.design.wind.speed_m_s - 3.0).abs() < 1e-9);
    assert!(a.computing, "a windy pattern goes to the worker");
    assert!(a.settle(SETTLE));
    let s = a.spray.as_ref().unwrap();
    assert!(matches!(s.layout, Some(Ok(_))));
    let shown = screen(&mut a, 80, 24);
    assert!(shown.contains("wind 3.00 m/s from 0.0°"), "{shown}");
    assert!(
        shown.contains("CU ") && shown.contains("rate mm/h"),
        "{shown}"
    );

    // Nozzles turned past radial (95°) on every arm: they brake, it cannot start.
    let mut b = app();
    type_into(&mut b, Field::of(&cat::DEFLECTION), "95deg");
    assert!(b.report.operating.is_none(), "95° deflection stalls it");
    assert!(b.settle(SETTLE));
    let shown = screen(&mut b, 80, 24);
    let top = shown.lines().next().unwrap();
    assert!(top.contains("stalls at rest ⚠ 1"), "{top}");
    assert!(shown.contains("runaway none"), "{shown}");
    assert!(
        shown.contains("the jets give no drive torque at rest"),
        "{shown}"
    );
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

/// The rate map's rows in the colour plane of [`screen_with_colours`]: the
/// first run of non-blank cells of each row (the legend stands apart).
fn map_rows(shown: &str) -> Vec<String> {
    let (_, colours) = shown.split_once("--- colours").unwrap();
    colours
        .lines()
        .skip(1)
        .filter_map(|l| l.split_whitespace().next().map(str::to_string))
        .collect()
}

#[test]
fn the_rate_map_draws_heads_where_they_stand_in_colour_and_without() {
    use crate::physics::design::Layout;
    use ratatui::style::Color;
    let mut a = app();
    a.event(&key(KeyCode::Char('3')));
    for (w, h) in [(80u16, 24u16), (160, 48)] {
        // A square: a head at each corner, the driest quarter marked,
        // several steps of the scale.
        let rows = map_rows(&screen_with_colours(&mut a, w, h));
        let (top, bottom) = (rows.first().unwrap(), rows.last().unwrap());
        for row in [top, bottom] {
            assert!(row.starts_with("HH") && row.ends_with("HH"), "{rows:#?}");
        }
        assert!(rows.iter().any(|r| r.contains('q')), "{rows:#?}");
        let steps = ('0'..='9')
            .filter(|d| rows.iter().any(|r| r.contains(*d)))
            .count();
        assert!(steps >= 3, "{rows:#?}");
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
    let rows = map_rows(&screen_with_colours(&mut a, 160, 48));
    let top = rows.first().unwrap();
    let at = top.find("HH").expect("a head on the upper edge");
    assert!(
        !top.starts_with("HH") && at > top.len() / 3 && at < 2 * top.len() / 3,
        "{rows:#?}"
    );
    // Without colour: no colour at all, and the legend in the shown unit.
    let mut b = app();
    b.theme = Theme { no_color: true };
    b.event(&key(KeyCode::Char('3')));
    for (units, legend) in [
        (UnitSystem::Metric, "rate mm/h"),
        (UnitSystem::Us, "rate in/h"),
    ] {
        b.set_units(units);
        for (w, h) in [(80u16, 24u16), (160, 48)] {
            let shown = screen_with_colours(&mut b, w, h);
            let (text, colours) = shown.split_once("--- colours").unwrap();
            assert!(colours.lines().skip(1).all(str::is_empty), "{colours}");
            assert!(text.contains(legend), "{legend} in {text}");
            let mut term = Terminal::new(TestBackend::new(w, h)).unwrap();
            term.draw(|f| draw(&b, f)).unwrap();
            assert!(term
                .backend()
                .buffer()
                .content()
                .iter()
                .all(|c| c.fg == Color::Reset));
        }
    }
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
    type_into(&mut a, Field::of(&cat::SQUARE_SPACING), "60m");
    assert!(a.settle(SETTLE));
    let shown = screen(&mut a, 100, 30);
    assert!(shown.contains("heads do not meet"), "{shown}");
    assert!(!shown.contains("CU -"), "{shown}");
}

#[test]
fn every_view_follows_the_unit_system() {
    let mut a = app();
    // Throw: the wetted radius in m, then in ft.
    a.event(&key(KeyCode::Char('2')));
    let s = screen(&mut a, 80, 24);
    assert!(s.contains("wetted radius") && s.contains(" m "), "{s}");
    a.event(&key(KeyCode::Char('u')));
    let s = screen(&mut a, 80, 24);
    let line = s
        .lines()
        .find(|l| l.contains("wetted radius"))
        .unwrap_or_else(|| panic!("{s}"));
    assert!(line.contains(" ft"), "{line}");
    assert!(
        s.lines().next().unwrap().contains(" ft"),
        "the top line's throw"
    );
    // Pattern: the rate in in/h; Balance: torque in lbf·in, pressure in psi.
    a.event(&key(KeyCode::Char('3')));
    let s = screen(&mut a, 80, 24);
    assert!(s.contains("in/h") && !s.contains("mm/h"), "{s}");
    a.event(&key(KeyCode::Char('1')));
    // (The view on the right only: the list keeps each input's own unit.)
    let view = |a: &mut App| -> String {
        screen(a, 160, 48)
            .lines()
            .skip(1)
            .filter_map(|l| l.split_once('│').map(|(_, v)| v.to_string()))
            .collect::<Vec<_>>()
            .join("\n")
    };
    let s = view(&mut a);
    assert!(s.contains("lbf·in") && s.contains("psi"), "{s}");
    assert!(!s.contains("N·m") && !s.contains("kPa"), "{s}");
    a.event(&key(KeyCode::Char('u')));
    let s = view(&mut a);
    assert!(s.contains("N·m") && s.contains("kPa"), "{s}");
}
