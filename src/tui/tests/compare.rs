//! The Compare view: pins, what each changes, their order.

use super::*;

#[test]
fn compare_view_shows_what_an_edit_changed() {
    let mut a = app();
    a.event(&key(KeyCode::Char('5')));
    a.event(&key(KeyCode::Char('c')));
    assert_eq!(a.pins.len(), 1);
    type_into(&mut a, Field::of(&cat::DEFLECTION), "5deg");
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
    // Both columns and the changed input are on screen at either size.
    for (w, h) in [(80, 24), (160, 48)] {
        let s = screen(&mut a, w, h);
        assert!(s.contains("pin 1") && s.contains("now"), "{s}");
        assert!(s.contains("deflection"), "{s}");
    }
    a.event(&key(KeyCode::Char('x')));
    assert!(a.pins.is_empty());
}

#[test]
fn compare_drops_a_middle_pin_reorders_and_says_what_each_changes() {
    let mut a = app();
    three_pins(&mut a);
    let labels = |a: &App| a.pins.iter().map(|p| p.label.clone()).collect::<Vec<_>>();
    assert_eq!(labels(&a), ["pin 1", "pin 2", "pin 3"]);
    let c = match a.comparison.result.as_deref() {
        Some(Ok(c)) => c.clone(),
        other => panic!("{other:?}"),
    };
    let per = crate::tui::views::compare_differences(&c, |_| Some(3));
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
    let s = screen(&mut a, 160, 48);
    assert!(
        s.contains("pin 1") && s.contains("pin 3") && s.contains("now"),
        "{s}"
    );
}
