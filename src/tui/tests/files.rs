//! Files: open, save (comments kept, asking before overwriting), the
//! picker, quitting with unsaved changes, the shipped scenarios.

use super::*;

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

#[test]
fn the_starter_and_every_shipped_scenario_open_with_their_arms_together() {
    for system in [UnitSystem::Metric, UnitSystem::Us] {
        let sc = scenario::load_str(&scenario::starter_text(system), "starter").unwrap();
        let a = App::from_scenario(sc, None, None).unwrap();
        assert_eq!(a.arms, Arms::Together, "starter in {system}");
    }
    let mut n = 0;
    for path in crate::tui::app::scenario_files(std::path::Path::new(env!("CARGO_MANIFEST_DIR"))) {
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
