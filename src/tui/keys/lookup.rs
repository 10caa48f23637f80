//! Reading the key table: which entry a key press starts ([`find`]), the
//! bottom line's words ([`hints`]) and the help screen's lines
//! ([`help_entries`]).

use ratatui::crossterm::event::{KeyCode, KeyEvent, KeyModifiers};

use super::{Action, Binding, Context, Key, Scope, KEYS};
use crate::tui::app::View;

impl Key {
    /// Whether the key press `k` is this key.
    pub fn matches(self, k: &KeyEvent) -> bool {
        let m = k.modifiers;
        let ctrl = m.contains(KeyModifiers::CONTROL);
        let alt = m.contains(KeyModifiers::ALT);
        let shift = m.contains(KeyModifiers::SHIFT);
        match self {
            Key::Any(code) => k.code == code,
            Key::Plain(code @ KeyCode::Char(_)) => k.code == code && !ctrl && !alt,
            Key::Plain(code) => k.code == code && !ctrl && !alt && !shift,
            Key::Shift(code) => k.code == code && shift && !ctrl && !alt,
            Key::AltOrCtrl(code) => k.code == code && (ctrl || alt),
            Key::Ctrl(c) => {
                ctrl && matches!(k.code, KeyCode::Char(x) if x.eq_ignore_ascii_case(&c))
            }
            Key::AnyChar => matches!(k.code, KeyCode::Char(_)) && !ctrl,
            Key::Other => true,
        }
    }

    /// A key press that is this key (for tests and scripted runs).
    pub fn example(self) -> KeyEvent {
        let (code, mods) = match self {
            Key::Any(code) | Key::Plain(code) => (code, KeyModifiers::NONE),
            Key::Shift(code) => (code, KeyModifiers::SHIFT),
            Key::AltOrCtrl(code) => (code, KeyModifiers::ALT),
            Key::Ctrl(c) => (KeyCode::Char(c), KeyModifiers::CONTROL),
            Key::AnyChar => (KeyCode::Char('7'), KeyModifiers::NONE),
            Key::Other => (KeyCode::F(9), KeyModifiers::NONE),
        };
        KeyEvent::new(code, mods)
    }
}

/// Whether an entry of `scope` works in `place` (a mode's scope, with the
/// view when normal).
pub(super) fn applies(scope: Scope, place: Scope, view: View) -> bool {
    match scope {
        Scope::Everywhere => true,
        Scope::Normal => place == Scope::Normal,
        Scope::InView(v) => place == Scope::Normal && view == v,
        s => s == place,
    }
}

/// The entry a key press starts in `place` (the keyboard mode's scope:
/// `Normal`, `Typing`, `Help`, `Picker`, `QuitQuestion`, `Question` or one
/// of the design search's) with
/// `view` on the right; a catch-all ([`Key::Other`]) only when no other
/// entry takes the key.
pub fn find(place: Scope, view: View, k: &KeyEvent) -> Option<&'static Binding> {
    let here = || KEYS.iter().filter(|b| applies(b.scope, place, view));
    here()
        .find(|b| {
            b.keys
                .iter()
                .any(|key| *key != Key::Other && key.matches(k))
        })
        .or_else(|| here().find(|b| b.keys.contains(&Key::Other)))
}

/// The bottom line: (keys, word) of the entries that work in `place` and
/// whose word's condition holds, in table order.
pub fn hints(place: Scope, c: &Context) -> Vec<(&'static str, &'static str)> {
    KEYS.iter()
        .filter(|b| applies(b.scope, place, c.view) && b.scope != Scope::Everywhere)
        .filter_map(|b| {
            b.hint
                .iter()
                .find(|(when, _)| when.holds(c))
                .map(|(_, word)| (b.hint_key, *word))
        })
        .collect()
}

/// The help screen's entries: (section, keys, what they do), in table order
/// within sections that follow the table's order; an entry for one view
/// says which.
pub fn help_entries() -> Vec<(&'static str, &'static str, String)> {
    let mut sections: Vec<&'static str> = Vec::new();
    for b in KEYS {
        if !sections.contains(&b.scope.section()) {
            sections.push(b.scope.section());
        }
    }
    sections
        .into_iter()
        .flat_map(|s| {
            KEYS.iter()
                .filter(move |b| b.scope.section() == s)
                .map(move |b| {
                    let what = match b.scope {
                        Scope::InView(v) => format!("{} view: {}", v.title(), b.help),
                        _ => b.help.to_string(),
                    };
                    (s, b.help_key, what)
                })
        })
        .collect()
}

/// The keys of `action` in `place`, as the bottom line writes them (for a
/// popup that names its answers); empty when the table has none there.
pub fn keys_of(place: Scope, action: Action) -> &'static str {
    KEYS.iter()
        .find(|b| b.scope == place && b.action == action)
        .map_or("", |b| b.hint_key)
}
