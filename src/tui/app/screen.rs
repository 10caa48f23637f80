//! The field list and the views: which row is selected, what the list
//! shows, which view is on the right.

use super::{App, View};
use crate::tui::fields::{self, Field, Row};

impl App {
    /// Rebuilds the list (the design's choices or the arms' showing
    /// changed), keeping the selected input selected.
    pub(super) fn refresh_rows(&mut self) {
        let keep = self.selected_field().map(|f| f.shown_as(self.arms));
        self.rows = fields::rows(&self.design, self.arms);
        self.selected = keep
            .and_then(|f| self.rows.iter().position(|r| *r == Row::Field(f)))
            .unwrap_or_else(|| {
                let i = self.selected.min(self.rows.len().saturating_sub(1));
                self.first_field_from(i, false)
            });
        self.keep_selection_visible();
    }

    pub(super) fn first_field_from(&self, start: usize, forward: bool) -> usize {
        let is_field = |i: usize| matches!(self.rows.get(i), Some(Row::Field(_)));
        if forward {
            (start..self.rows.len()).find(|&i| is_field(i))
        } else {
            (0..=start.min(self.rows.len().saturating_sub(1)))
                .rev()
                .find(|&i| is_field(i))
        }
        .or_else(|| (0..self.rows.len()).find(|&i| is_field(i)))
        .unwrap_or(0)
    }

    pub(super) fn list_height(&self) -> usize {
        self.areas().list.height as usize
    }

    pub(super) fn keep_selection_visible(&mut self) {
        let h = self.list_height().max(1);
        if self.selected < self.list_offset {
            // Show the group or arm heading above a field when there is room.
            self.list_offset = self.selected.saturating_sub(1);
        } else if self.selected >= self.list_offset + h {
            self.list_offset = self.selected + 1 - h;
        }
        let max = self.rows.len().saturating_sub(h);
        self.list_offset = self.list_offset.min(max);
    }

    pub(super) fn move_selection(&mut self, down: bool, by: usize) {
        let mut i = self.selected;
        for _ in 0..by {
            let next = if down {
                (i + 1..self.rows.len()).find(|&j| matches!(self.rows.get(j), Some(Row::Field(_))))
            } else {
                (0..i)
                    .rev()
                    .find(|&j| matches!(self.rows.get(j), Some(Row::Field(_))))
            };
            match next {
                Some(j) => i = j,
                None => break,
            }
        }
        self.selected = i;
        self.keep_selection_visible();
    }

    pub(super) fn select(&mut self, f: Field) {
        if let Some(i) = self.rows.iter().position(|r| *r == Row::Field(f)) {
            self.selected = i;
            self.keep_selection_visible();
        }
    }

    pub(super) fn set_view(&mut self, i: usize) {
        if let Some(v) = View::ALL.get(i) {
            if *v != self.view {
                self.pane_scroll = 0;
            }
            self.view = *v;
        }
    }
}
