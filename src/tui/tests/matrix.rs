//! Every snapshot of the interface, in one place.
//!
//! - The layout matrix: the built-in example, each of the five views, at
//!   three terminal sizes × metric and US units: six files, one per size and
//!   unit system, each holding the five views. They pin where everything
//!   goes; a change to the model rewrites them and nothing else of the kind.
//! - A few snapshots that pin the numbers of the uses built on the model
//!   (a field check, a fit of three readings, three pins in Compare, the rate
//!   map's colours), each on the built-in example at one size.
//! - The help screen, which pins the words of the key table.
//!
//! Everything else is a behaviour test (an assertion) in the other files.

use super::*;

/// The terminal sizes of the matrix: the smallest screen the layout is
/// drawn for, a middling one and a large one.
const SIZES: [(u16, u16); 3] = [(80, 24), (120, 36), (160, 48)];

#[test]
fn layout_matrix_every_view_at_three_sizes_in_both_unit_systems() {
    let mut a = app();
    for units in [UnitSystem::Metric, UnitSystem::Us] {
        a.set_units(units);
        for (w, h) in SIZES {
            let mut all = String::new();
            for (n, view) in View::ALL.iter().enumerate() {
                a.event(&key(KeyCode::Char(char::from(b'1' + n as u8))));
                assert_eq!(a.view, *view);
                all.push_str(&format!("── view {}: {} ──\n", n + 1, view.title()));
                all.push_str(&screen(&mut a, w, h));
                all.push('\n');
            }
            let name = format!("layout_{}_{w}x{h}", units_word(units));
            insta::assert_snapshot!(name, all);
        }
    }
}

fn units_word(units: UnitSystem) -> &'static str {
    match units {
        UnitSystem::Metric => "metric",
        UnitSystem::Us => "us",
    }
}

#[test]
fn numbers_of_a_field_check() {
    let mut a = app();
    field_checked(&mut a);
    assert!(matches!(a.field.result.as_deref(), Some(Ok(_))));
    insta::assert_snapshot!("numbers_field_checked_160x48", screen(&mut a, 160, 48));
}

#[test]
fn numbers_of_a_fit_of_three_readings() {
    let mut a = app();
    three_readings(&mut a);
    assert!(a.settle(SETTLE));
    assert!(matches!(a.unit.fit.result.as_deref(), Some(Ok(_))));
    // The fit is below the table of readings.
    a.event(&key(KeyCode::PageDown));
    insta::assert_snapshot!("numbers_readings_fit_160x48", screen(&mut a, 160, 48));
}

#[test]
fn numbers_of_three_pins_in_compare() {
    let mut a = app();
    three_pins(&mut a);
    assert!(matches!(a.comparison.result.as_deref(), Some(Ok(_))));
    insta::assert_snapshot!("numbers_compare_three_pins_160x48", screen(&mut a, 160, 48));
}

#[test]
fn numbers_of_the_rate_map_in_colour() {
    let mut a = app();
    a.event(&key(KeyCode::Char('3')));
    insta::assert_snapshot!(
        "numbers_rate_map_colour_80x24",
        screen_with_colours(&mut a, 80, 24)
    );
}

#[test]
fn the_help_screen() {
    let mut a = app();
    a.event(&key(KeyCode::Char('?')));
    insta::assert_snapshot!("help_80x24", screen(&mut a, 80, 24));
}
