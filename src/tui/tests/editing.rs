//! Editing: nudging, typing, choices, the arms, the mouse.

use super::*;

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
    type_into(&mut a, Field::of(&cat::INLET_PRESSURE), "45psi");
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
    type_into(&mut a, Field::of(&cat::NOZZLE_DIAMETER), "-1mm");
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
    type_into(&mut a, Field::on_arm(&cat::RADIUS, 2), "6.5in");
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
    assert_evenly_spread(&a, 90.0);
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
    type_into(&mut a, Field::of(&cat::RADIUS), "250mm");
    assert_eq!(radii(&a), vec![0.25; 3], "{:?}", a.message);
    // One nudge moves every arm too, and the azimuths stay evenly spread.
    a.event(&key(KeyCode::Right));
    assert_eq!(radii(&a), vec![0.255; 3]);
    assert_evenly_spread(&a, 120.0);
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
    type_into(&mut a, Field::on_arm(&cat::RADIUS, 1), "300mm");
    let r = radii(&a);
    assert_eq!(r[1], 0.3);
    assert!(r[0] != 0.3 && r[2] != 0.3, "{r:?}");
    // The arms differ: joining is refused and says why; the join is not
    // offered on the key line.
    assert!(!crate::tui::views::keys_here(&a).contains(&("a", "join arms")));
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
    assert!(crate::tui::views::keys_here(&a).contains(&("a", "join arms")));
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
