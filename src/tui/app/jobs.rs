//! Results computed off the interface thread: the spray (throw, pattern,
//! layout), the comparison, the field check and the fits are asked of the
//! [`Worker`](crate::tui::worker::Worker) with an id; only the answer to the
//! latest request counts. The spin solution is solved here, at every edit.

use std::time::{Duration, Instant};

use super::{App, Pending};
use crate::physics::balance::solve;
use crate::physics::design::Design;
use crate::tui::views::balance_table;
use crate::tui::worker::{Done, Job};

impl App {
    pub(super) fn id(&mut self) -> u64 {
        self.next_id += 1;
        self.next_id
    }

    pub(super) fn request_spray(&mut self) {
        let id = self.id();
        self.spray_id = id;
        self.computing = self.worker.send(Job::Spray {
            id,
            design: Box::new(self.design.clone()),
            report: Box::new(self.report.clone()),
        });
    }

    /// Takes every finished job off the channel; true when anything changed.
    pub fn poll_worker(&mut self) -> bool {
        let mut changed = false;
        while let Some(done) = self.worker.try_recv() {
            changed |= self.take(done);
        }
        changed | self.poll_asks()
    }

    pub(super) fn take(&mut self, done: Done) -> bool {
        match done {
            Done::Spray { id, result } => {
                if id == self.spray_id {
                    self.spray = Some(result);
                    self.computing = false;
                    return true;
                }
                false
            }
            Done::Compare { id, result } => self.comparison.accept(id, result),
            Done::Field { id, result } => self.field.accept(id, result),
            Done::Fit { id, result } => self.unit.fit.accept(id, result),
            Done::Coast { id, result } => self.unit.coast.accept(id, result),
        }
    }

    /// True while any job the screen waits for is outstanding.
    pub fn busy(&self) -> bool {
        self.computing
            || self.comparison.waiting
            || self.field.waiting
            || self.unit.waiting()
            || self.ask.busy()
    }

    /// Asks for the comparison again (the design or the pins changed).
    pub(super) fn request_comparison(&mut self) {
        if self.pins.is_empty() {
            self.comparison = Pending::default();
            return;
        }
        let id = self.id();
        // The first pin is the baseline the deltas are taken against.
        let mut designs: Vec<(String, Design)> = self
            .pins
            .iter()
            .map(|p| (p.label.clone(), p.design.clone()))
            .collect();
        designs.push(("now".to_string(), self.design.clone()));
        self.comparison.id = id;
        self.comparison.waiting = self.worker.send(Job::Compare { id, designs });
    }

    /// Waits until every outstanding job is in (for tests and scripted runs),
    /// at most `timeout`. Returns false on timeout.
    pub fn settle(&mut self, timeout: Duration) -> bool {
        let end = Instant::now() + timeout;
        while self.busy() {
            let left = end.saturating_duration_since(Instant::now());
            if left.is_zero() {
                return false;
            }
            self.poll_asks();
            // In slices, so a goal or a search on its own thread is seen too.
            if let Some(done) = self
                .worker
                .recv_timeout(left.min(Duration::from_millis(20)))
            {
                self.take(done);
            }
        }
        true
    }

    /// Re-solves after the design changed.
    pub(super) fn resolve(&mut self) {
        self.report = solve(&self.design);
        self.table = balance_table(&self.design, &self.report);
        self.refresh_rows();
        self.request_spray();
        self.request_comparison();
        self.request_field();
        self.request_speed_fit();
        self.request_coast();
    }
}
