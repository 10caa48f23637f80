//! Saving over a file a person wrote: only the values that changed change.
//!
//! A scenario file is something its author keeps: comments that say where a
//! number came from, the order and spacing they chose, their own unit tags,
//! `notes`. Rewriting the whole file from a [`Scenario`] would throw all of
//! that away, so every save of a design that came from a file goes through
//! [`edit_in_place`]:
//!
//! 1. the original text is read into a tree of values that remembers where
//!    each value sits in the text (comments and spacing are left alone);
//! 2. the original scenario (with its defaults filled in) and the new one are
//!    written out by the fresh writer and read into the same kind of tree;
//! 3. the trees are walked side by side. A value that means the same (the
//!    same SI quantity within 10⁻⁹, the same text, the same word) is left as
//!    it is written. A changed quantity keeps the file's unit tag and only its
//!    number is rewritten; a changed value of any other kind (a bare
//!    coefficient, `Auto`, a different supply kind) is replaced by the new
//!    value's text in the new scenario's units. A field the file left out
//!    (an optional section at its default) is inserted after the field before
//!    it, in the file's own layout, only when the new value differs from the
//!    default; a field the new scenario drops (`rise`, `layout`) is removed
//!    with its line. An added arm is a copy of the file's last arm (without
//!    its comments) edited to the new values; a removed arm goes with its lines.
//! 4. the edited text is read back and must describe the new scenario; if it
//!    does not (or the original cannot be read), the edit is refused and
//!    [`scenario_text`] falls back to the fresh writer, saying why.
//!
//! A file written from nothing uses the fresh writer
//! ([`Scenario::to_ron_string`]). [`save_scenario`] does either and writes
//! through [`save_atomic`](super::save_atomic).

use std::path::Path;

use super::tags::{
    tidy, Angle, Area, Density, FlowRate, Length, Mass, MomentOfInertia, Pressure, Speed,
    Temperature, Torque,
};
use super::{save_atomic, Scenario, ScenarioError};

mod editor;
mod tree;
mod values;

use editor::*;
use tree::*;
use values::*;

/// How a scenario's text was made.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Written {
    /// The original text with only the changed values edited: comments,
    /// order, blank lines and notes as the author left them.
    InPlace,
    /// Written from nothing: there was no original text.
    Fresh,
    /// Written from nothing because the original text could not be edited in
    /// place; the reason.
    Rewritten(String),
}

/// A scenario's text and how it was made.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ScenarioText {
    /// The text to write.
    pub text: String,
    /// How it was made.
    pub written: Written,
}

/// Why a file could not be edited in place.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{0}")]
pub struct EditError(String);

/// The text for `new`: `original` edited in place when there is one (see the
/// module docs), else the fresh writer's text. Never fails: when the original
/// cannot be edited, the fresh text is returned with the reason.
pub fn scenario_text(original: Option<&str>, new: &Scenario) -> ScenarioText {
    match original {
        None => ScenarioText {
            text: new.to_ron_string(),
            written: Written::Fresh,
        },
        Some(orig) => match edit_in_place(orig, new) {
            Ok(text) => ScenarioText {
                text,
                written: Written::InPlace,
            },
            Err(e) => ScenarioText {
                text: new.to_ron_string(),
                written: Written::Rewritten(e.to_string()),
            },
        },
    }
}

/// Saves `new` to `path` atomically (temp file, sync, rename, `FILE.bak`),
/// as [`scenario_text`] makes it from `original` (the text the design was
/// read from, or None for a design made from nothing).
pub fn save_scenario(
    path: impl AsRef<Path>,
    original: Option<&str>,
    new: &Scenario,
) -> Result<ScenarioText, ScenarioError> {
    let out = scenario_text(original, new);
    save_atomic(path, &out.text)?;
    Ok(out)
}

/// `original` with only the values that differ from `new` changed (see the
/// module docs). Fails when the original is not a readable scenario, or when
/// the edited text would not read back as `new`.
pub fn edit_in_place(original: &str, new: &Scenario) -> Result<String, EditError> {
    let options = ron::Options::default();
    let old_text = original.strip_prefix('\u{feff}').unwrap_or(original);
    let old_scenario = super::parse(old_text, "original", &options)
        .map_err(|e| EditError(format!("the original text does not read: {e}")))?;
    let old_tree = parse_tree(original)
        .map_err(|e| EditError(format!("the original text does not read: {e}")))?;
    let full_tree = fresh_tree(&old_scenario)?;
    let new_tree = fresh_tree(new)?;

    let mut editor = Editor::new(original);
    editor.node(&old_tree, Some(&full_tree), &new_tree)?;
    let text = editor.apply()?;

    // The edit must say exactly what the new scenario says.
    let body = text.strip_prefix('\u{feff}').unwrap_or(&text);
    let back = super::parse(body, "edited text", &options)
        .map_err(|e| EditError(format!("the edited text does not read back: {e}")))?;
    if !same(&fresh_tree(&back)?, &new_tree) {
        return Err(EditError(
            "the edited text does not read back as the new design".to_string(),
        ));
    }
    Ok(text)
}

fn fresh_tree(scenario: &Scenario) -> Result<Node, EditError> {
    parse_tree(&scenario.to_ron_string()).map_err(|e| {
        EditError(format!(
            "internal: the fresh writer's text does not read: {e}"
        ))
    })
}

#[cfg(test)]
#[path = "edit_tests.rs"]
mod tests;
