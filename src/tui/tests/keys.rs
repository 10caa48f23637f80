//! The key table at work: every key dispatches in its place, and the bottom
//! line, the help screen and the popups name the table's keys.

use super::*;
use crate::tui::app::{new_form, Input, InputTarget, Picker, SearchPanel};
use crate::tui::keys::{self, Scope, KEYS};
use crate::tui::views::{help_lines, keys_here};

#[test]
fn every_key_of_the_table_dispatches_in_its_place_without_panicking() {
    let dir = tempfile::tempdir().unwrap();
    let mut a = app();
    a.base_dir = dir.path().to_path_buf();
    a.path = Some(dir.path().join("design.ron"));
    for b in KEYS {
        let (mode, view) = match b.scope {
            Scope::Everywhere | Scope::Normal => (Mode::Normal, View::Balance),
            Scope::InView(v) => (Mode::Normal, v),
            Scope::Typing => (
                Mode::Typing(Input {
                    target: InputTarget::SaveAs,
                    text: dir.path().join("typed.ron").display().to_string(),
                }),
                View::Balance,
            ),
            Scope::Help => (Mode::Help(3), View::Balance),
            Scope::Picker => (
                Mode::Picker(Picker {
                    files: vec![dir.path().join("missing.ron")],
                    selected: 0,
                }),
                View::Balance,
            ),
            Scope::QuitQuestion => (Mode::Confirm(Confirm::QuitUnsaved), View::Balance),
            Scope::Question => (
                Mode::Confirm(Confirm::OverwriteExisting(dir.path().join("out.ron"))),
                View::Balance,
            ),
            Scope::SearchForm | Scope::SearchRunning | Scope::SearchResults => {
                (Mode::Search(search_panel(b.scope, &a)), View::Balance)
            }
        };
        for k in b.keys {
            a.mode = mode.clone();
            a.view = view;
            a.quit = false;
            a.event(&Event::Key(k.example()));
            // The screen after it draws too.
            screen(&mut a, 80, 24);
        }
    }
    assert!(a.settle(SETTLE));
}

/// The design search's panel for one of its scopes, on `a`'s design.
fn search_panel(scope: Scope, a: &App) -> SearchPanel {
    match scope {
        Scope::SearchRunning => SearchPanel::Running,
        Scope::SearchResults => SearchPanel::Results(0),
        _ => SearchPanel::Form(new_form(&[&cat::DEFLECTION], &a.design, None, a.units)),
    }
}

/// The bottom line of a screen drawn `w` wide.
fn bottom_line(a: &mut App, w: u16, h: u16) -> String {
    screen(a, w, h)
        .lines()
        .last()
        .unwrap_or_default()
        .trim_matches('"')
        .to_string()
}

#[test]
fn the_bottom_line_names_the_keys_of_the_table_in_every_mode() {
    let dir = tempfile::tempdir().unwrap();
    let mut a = app();
    let modes = [
        Mode::Normal,
        Mode::Typing(Input {
            target: InputTarget::SaveAs,
            text: String::new(),
        }),
        Mode::Help(0),
        Mode::Picker(Picker {
            files: vec![dir.path().join("a.ron")],
            selected: 0,
        }),
        Mode::Confirm(Confirm::QuitUnsaved),
        Mode::Confirm(Confirm::OverwriteExisting(dir.path().join("b.ron"))),
        Mode::Search(search_panel(Scope::SearchForm, &a)),
        Mode::Search(search_panel(Scope::SearchRunning, &a)),
        Mode::Search(search_panel(Scope::SearchResults, &a)),
    ];
    for mode in modes {
        for view in View::ALL {
            a.mode = mode.clone();
            a.view = view;
            let shown = keys_here(&a);
            assert!(!shown.is_empty());
            for (k, word) in &shown {
                // Each is an entry of the table that works here, and each of
                // its keys reaches that entry.
                let b = KEYS
                    .iter()
                    .find(|b| b.hint_key == *k && b.hint.iter().any(|(_, w)| w == word))
                    .unwrap_or_else(|| panic!("{k} {word} is not in the table"));
                for key in b.keys {
                    let found = keys::find(a.key_place(), view, &key.example());
                    assert_eq!(found.map(|f| f.action), Some(b.action), "{k} in {mode:?}");
                }
            }
            // Drawn wide enough, the bottom line shows them all, in order.
            if matches!(a.mode, Mode::Normal | Mode::Typing(_)) {
                let line = bottom_line(&mut a, 400, 30);
                let mut at = 0;
                for (k, word) in &shown {
                    let item = format!(" {k} {word} ");
                    let i = line[at..]
                        .find(&item)
                        .unwrap_or_else(|| panic!("{item} in {line}"));
                    at += i + item.len();
                }
            }
        }
    }
}

#[test]
fn the_bottom_line_follows_the_selected_field_and_the_view() {
    let mut a = app();
    // A number: nudges and typing.
    select(&mut a, Field::of(&cat::INLET_PRESSURE));
    let k = keys_here(&a);
    for item in [
        ("←→", "nudge"),
        ("⇧←→", "coarse"),
        ("Alt←→", "finer"),
        ("Enter", "type"),
    ] {
        assert!(k.contains(&item), "{item:?} in {k:?}");
    }
    // A choice: ←→ changes it; no steps.
    select(&mut a, Field::of(&cat::SUPPLY));
    let k = keys_here(&a);
    assert!(k.contains(&("←→", "change")), "{k:?}");
    assert!(!k.iter().any(|(_, w)| *w == "coarse" || *w == "nudge"));
    // The Field view's keys only in the Field view.
    assert!(!k.contains(&("p", "pressure")));
    a.event(&key(KeyCode::Char('4')));
    assert!(keys_here(&a).contains(&("p", "pressure")));
    a.event(&key(KeyCode::Char('5')));
    let k = keys_here(&a);
    assert!(k.contains(&("x", "unpin")) && !k.contains(&("p", "pressure")));
}

#[test]
fn the_help_screen_lists_every_entry_of_the_table_and_the_cautions() {
    let text: String = help_lines(200)
        .iter()
        .map(|l| l.to_string())
        .collect::<Vec<_>>()
        .join("\n");
    for b in KEYS {
        let first: String = b
            .help
            .split_whitespace()
            .take(3)
            .collect::<Vec<_>>()
            .join(" ");
        assert!(
            text.lines()
                .any(|l| l.trim_start().starts_with(b.help_key) && l.contains(&first)),
            "{} / {first} missing from the help:\n{text}",
            b.help_key
        );
    }
    for (section, _, _) in keys::help_entries() {
        assert!(text.lines().any(|l| l == section), "{section}");
    }
    for word in ["Safety", "eye protection", "backflow", "power lines"] {
        assert!(text.contains(word), "{word}");
    }
}

#[test]
fn help_closes_on_any_other_key_and_a_question_shows_its_keys() {
    let mut a = app();
    a.event(&key(KeyCode::Char('?')));
    assert_eq!(a.mode, Mode::Help(0));
    a.event(&key(KeyCode::Down));
    a.event(&key(KeyCode::Char('j')));
    assert_eq!(a.mode, Mode::Help(2));
    let s = screen(&mut a, 80, 24);
    assert!(
        s.contains(" help ") && s.contains("↑↓ scroll · any other key closes"),
        "{s}"
    );
    a.event(&key(KeyCode::Esc));
    assert_eq!(a.mode, Mode::Normal);
    // An unsaved change, then q: the question, with the table's answers.
    a.event(&key(KeyCode::Right));
    a.event(&key(KeyCode::Char('q')));
    assert_eq!(a.mode, Mode::Confirm(Confirm::QuitUnsaved));
    let s = screen(&mut a, 80, 24);
    assert!(s.contains("unsaved changes"), "{s}");
    for answer in ["s  save, then quit", "y  quit without saving", "Esc  stay"] {
        assert!(s.contains(answer), "{answer} in {s}");
    }
    let bottom = bottom_line(&mut a, 80, 24);
    for item in ["s save and quit", "y quit without saving", "Esc stay"] {
        assert!(bottom.contains(item), "{item} in {bottom}");
    }
    assert!(a.settle(SETTLE));
}

#[test]
fn every_question_names_the_answers_of_the_table() {
    let dir = tempfile::tempdir().unwrap();
    let mut a = app();
    let yes = keys::keys_of(Scope::Question, crate::tui::keys::Action::Yes);
    let no = keys::keys_of(Scope::Question, crate::tui::keys::Action::No);
    assert!(!yes.is_empty() && !no.is_empty());
    for c in [
        Confirm::OpenUnsaved(dir.path().join("a.ron")),
        Confirm::OverwriteChanged(dir.path().join("b.ron")),
        Confirm::OverwriteExisting(dir.path().join("c.ron")),
    ] {
        a.mode = Mode::Confirm(c.clone());
        let s = screen(&mut a, 100, 30);
        assert!(s.contains(&format!("{yes}  ")), "{c:?}: {s}");
        assert!(s.contains(&format!("{no}  ")), "{c:?}: {s}");
        // And the bottom line says the same keys.
        let bottom = bottom_line(&mut a, 100, 30);
        assert!(bottom.contains(&format!(" {yes} yes")) && bottom.contains(&format!(" {no} no")));
    }
}
