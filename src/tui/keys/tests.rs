//! The key table walked: help lines, no key taken twice, the bottom line.

use super::lookup::applies;
use super::*;
use ratatui::crossterm::event::{KeyCode, KeyEvent, KeyModifiers};

/// Every mode's scope.
const PLACES: [Scope; 9] = [
    Scope::Normal,
    Scope::Typing,
    Scope::Help,
    Scope::Picker,
    Scope::QuitQuestion,
    Scope::Question,
    Scope::SearchForm,
    Scope::SearchRunning,
    Scope::SearchResults,
];

/// Key presses to try: every key of the table with every set of modifiers.
fn presses() -> Vec<KeyEvent> {
    let mods = [
        KeyModifiers::NONE,
        KeyModifiers::SHIFT,
        KeyModifiers::ALT,
        KeyModifiers::CONTROL,
        KeyModifiers::SHIFT | KeyModifiers::ALT,
        KeyModifiers::SHIFT | KeyModifiers::CONTROL,
    ];
    let mut codes: Vec<KeyCode> = Vec::new();
    for b in KEYS {
        for k in b.keys {
            let code = k.example().code;
            if !codes.contains(&code) {
                codes.push(code);
            }
        }
    }
    codes
        .iter()
        .flat_map(|c| mods.iter().map(move |m| KeyEvent::new(*c, *m)))
        .collect()
}

#[test]
fn every_key_has_a_help_line_and_finds_its_own_entry() {
    for b in KEYS {
        assert!(!b.keys.is_empty(), "{:?} has no key", b.action);
        assert!(
            !b.help.trim().is_empty() && !b.help_key.trim().is_empty(),
            "{:?} has no help line",
            b.action
        );
        let place = match b.scope {
            Scope::Everywhere | Scope::InView(_) => Scope::Normal,
            s => s,
        };
        let view = match b.scope {
            Scope::InView(v) => v,
            _ => View::Balance,
        };
        for k in b.keys {
            let found = find(place, view, &k.example()).map(|f| (f.scope, f.action));
            assert_eq!(found, Some((b.scope, b.action)), "{k:?} in {:?}", b.scope);
        }
    }
    let help = help_entries();
    assert_eq!(help.len(), KEYS.len());
}

#[test]
fn no_two_entries_take_the_same_key_in_the_same_place() {
    for place in PLACES {
        for view in View::ALL {
            for k in presses() {
                let takers: Vec<&Binding> = KEYS
                    .iter()
                    .filter(|b| applies(b.scope, place, view))
                    .filter(|b| {
                        b.keys
                            .iter()
                            .any(|key| *key != Key::Other && key.matches(&k))
                    })
                    .collect();
                assert!(
                    takers.len() <= 1,
                    "{k:?} in {place:?}/{view:?} is taken by {:?}",
                    takers.iter().map(|b| b.action).collect::<Vec<_>>()
                );
            }
            let others = KEYS
                .iter()
                .filter(|b| applies(b.scope, place, view) && b.keys.contains(&Key::Other))
                .count();
            assert!(others <= 1, "two catch-alls in {place:?}");
        }
    }
}

#[test]
fn the_hint_line_names_only_keys_of_the_table() {
    let kinds = [
        None,
        Some(Kind::Number),
        Some(Kind::OptionalNumber),
        Some(Kind::Choice),
        Some(Kind::Text),
    ];
    for place in PLACES {
        for view in View::ALL {
            for kind in kinds {
                for arms in [Arms::Together, Arms::Apart] {
                    for (per_arm, alike) in [(false, false), (true, false), (true, true)] {
                        let c = Context {
                            kind,
                            per_arm,
                            arms,
                            alike,
                            view,
                        };
                        let shown = hints(place, &c);
                        assert!(!shown.is_empty(), "{place:?}: an empty bottom line");
                        for (k, word) in shown {
                            assert!(!k.is_empty() && !word.is_empty());
                            // The keys named are an entry's that works here.
                            let entry = KEYS
                                .iter()
                                .find(|b| b.hint_key == k && applies(b.scope, place, view))
                                .unwrap_or_else(|| panic!("{k} is no key here"));
                            assert!(entry.hint.iter().any(|(_, w)| *w == word));
                            for key in entry.keys {
                                let f = find(place, view, &key.example());
                                assert_eq!(f.map(|f| f.action), Some(entry.action), "{k}");
                            }
                        }
                    }
                }
            }
        }
    }
}
