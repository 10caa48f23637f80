//! Undo and redo of design edits (`z`, `Z`).
//!
//! Every edit the interface keeps goes through [`App::apply`], which hands
//! the design it replaces to [`History::kept`]; undo puts that design back
//! (and keeps the undone one for redo). Opening another file starts a fresh
//! history: an undo never brings back another file's design.

use super::App;
use crate::physics::design::Design;

/// Most edits kept for undo (older ones are forgotten).
pub const MAX_UNDO: usize = 100;

/// The designs an undo and a redo go back to.
#[derive(Debug, Default)]
pub struct History {
    undo: Vec<Design>,
    redo: Vec<Design>,
}

impl History {
    /// Records the design an edit replaced; a new edit ends the redo chain.
    pub fn kept(&mut self, before: Design) {
        if self.undo.len() >= MAX_UNDO {
            self.undo.remove(0);
        }
        self.undo.push(before);
        self.redo.clear();
    }

    /// Forgets every step (another file was opened).
    pub fn clear(&mut self) {
        self.undo.clear();
        self.redo.clear();
    }

    /// Edits that can be undone.
    pub fn undo_steps(&self) -> usize {
        self.undo.len()
    }

    /// Undone edits that can be made again.
    pub fn redo_steps(&self) -> usize {
        self.redo.len()
    }
}

impl App {
    /// Takes back the last edit (`redo` false) or makes the last undone edit
    /// again (`redo` true). The design put back was valid when it was kept.
    pub(super) fn undo(&mut self, redo: bool) {
        let (from, word) = if redo {
            (self.history.redo.pop(), "redone")
        } else {
            (self.history.undo.pop(), "undone")
        };
        let Some(design) = from else {
            self.info(if redo {
                "nothing to redo"
            } else {
                "nothing to undo"
            });
            return;
        };
        let now = std::mem::replace(&mut self.design, design);
        if redo {
            self.history.undo.push(now);
        } else {
            self.history.redo.push(now);
        }
        // Undoing every edit since the last save leaves nothing unsaved.
        self.dirty = self.design != self.as_saved;
        self.resolve();
        self.info(format!(
            "{word} ({} more to undo, {} to redo)",
            self.history.undo.len(),
            self.history.redo.len()
        ));
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario;

    #[test]
    fn history_keeps_the_newest_steps_and_a_new_edit_ends_redo() {
        let base = scenario::builtin_example().to_design().unwrap();
        let named = |k: usize| Design {
            name: format!("step {k}"),
            ..base.clone()
        };
        let mut h = History::default();
        for k in 0..MAX_UNDO + 5 {
            h.kept(named(k));
        }
        assert_eq!(h.undo_steps(), MAX_UNDO);
        // The oldest went first.
        assert_eq!(h.undo.first().map(|d| d.name.as_str()), Some("step 5"));
        h.redo.push(named(999));
        assert_eq!(h.redo_steps(), 1);
        h.kept(named(1000));
        assert_eq!(h.redo_steps(), 0);
        h.clear();
        assert_eq!((h.undo_steps(), h.redo_steps()), (0, 0));
    }
}
