//! Designs pinned for the Compare view: pin, drop, pick and reorder.

use std::path::Path;

use super::{App, Pinned, MAX_PINS};
use crate::physics::design::Design;

impl App {
    pub(super) fn pin(&mut self, label: String, design: Design) {
        if self.pins.len() >= MAX_PINS {
            self.error(format!(
                "{MAX_PINS} designs are pinned already; press x in Compare to drop one"
            ));
            return;
        }
        self.pins.push(Pinned {
            label: label.clone(),
            design,
        });
        self.request_comparison();
        self.info(format!("pinned {label} for Compare (view 5)"));
    }

    pub(super) fn pin_current(&mut self) {
        // The first free number: labels stay apart after a pin is dropped.
        let label = (1..)
            .map(|k| format!("pin {k}"))
            .find(|l| self.pins.iter().all(|p| p.label != *l))
            .unwrap_or_default();
        self.pin(label, self.design.clone());
    }

    pub(super) fn pin_file(&mut self, path: &Path) {
        match App::read(path) {
            Ok((_, design, _)) => {
                let label = path.file_name().map_or_else(
                    || path.display().to_string(),
                    |n| n.to_string_lossy().into_owned(),
                );
                self.pin(label, design);
            }
            Err(e) => self.error(format!("cannot open: {e}")),
        }
    }

    /// Drops the selected pin.
    pub(super) fn unpin(&mut self) {
        if self.pins.is_empty() {
            self.error("nothing is pinned");
            return;
        }
        let k = self.pin_selected.min(self.pins.len() - 1);
        let gone = self.pins.remove(k);
        self.pin_selected = k.min(self.pins.len().saturating_sub(1));
        self.request_comparison();
        self.info(format!("dropped {}", gone.label));
    }

    /// Selects the next (or previous) pin for the Compare keys.
    pub(super) fn select_pin(&mut self, next: bool) {
        let n = self.pins.len();
        if n == 0 {
            self.error("nothing is pinned");
            return;
        }
        let k = self.pin_selected.min(n - 1);
        self.pin_selected = if next { (k + 1) % n } else { (k + n - 1) % n };
        let label = self.pins.get(self.pin_selected).map(|p| p.label.clone());
        self.info(format!("selected {}", label.unwrap_or_default()));
    }

    /// Moves the selected pin one column right (`later`) or left; the first
    /// pin is the one the deltas are taken against.
    pub(super) fn move_pin(&mut self, later: bool) {
        let n = self.pins.len();
        if n < 2 {
            self.error("pin two designs or more to reorder them");
            return;
        }
        let k = self.pin_selected.min(n - 1);
        let to = if later { k + 1 } else { k.wrapping_sub(1) };
        if to >= n {
            self.info("that pin is at the end already");
            return;
        }
        self.pins.swap(k, to);
        self.pin_selected = to;
        self.request_comparison();
        let label = self
            .pins
            .get(to)
            .map(|p| p.label.clone())
            .unwrap_or_default();
        self.info(format!("moved {label} to column {}", to + 1));
    }
}
