//! The Field view's readings beyond the single check: a small table of
//! readings at several pressures fitted together (`inverse::fit`), the
//! coast-down turn times (`inverse::coast`), both fitted on the worker
//! thread; and whether the readings stay when another file is opened (they
//! belong to the unit being checked, so by default they do not).

use super::{App, Pending};
use crate::inverse::coast::CoastResult;
use crate::inverse::fit::{FitResult, SpeedReading};
use crate::tui::worker::Job;

/// Most rows of the readings table (a technician's visit, not a log).
pub const MAX_ROWS: usize = 12;
/// Most coast-down turn times.
pub const MAX_TURNS: usize = 40;

/// Readings of the unit being checked, beyond the single check.
#[derive(Debug, Default)]
pub struct UnitReadings {
    /// Readings at several pressures, in the order added.
    pub rows: Vec<SpeedReading>,
    /// Coast-down: times of completed turns after the water was shut off, s.
    pub coast_times_s: Vec<f64>,
    /// Keep the readings when another file is opened (set on purpose).
    pub keep: bool,
    /// The fit over `rows`.
    pub fit: Pending<Result<FitResult, String>>,
    /// The coast-down fit.
    pub coast: Pending<Result<CoastResult, String>>,
}

impl UnitReadings {
    /// True while a fit is outstanding.
    pub fn waiting(&self) -> bool {
        self.fit.waiting || self.coast.waiting
    }

    /// True when anything is entered (readings, table rows or turn times).
    pub fn any(&self) -> bool {
        !self.rows.is_empty() || !self.coast_times_s.is_empty()
    }
}

/// Reads coast-down turn times: seconds at each completed turn, separated by
/// commas or spaces (`0.9, 1.9, 3.0`), a trailing `s` allowed.
pub fn parse_turn_times(text: &str) -> Result<Vec<f64>, String> {
    let mut times = Vec::new();
    for (k, part) in text
        .split(|c: char| c == ',' || c == ';' || c.is_whitespace())
        .filter(|p| !p.is_empty())
        .enumerate()
    {
        let raw = part.strip_suffix('s').unwrap_or(part);
        match raw.parse::<f64>() {
            Ok(t) if t.is_finite() && t > 0.0 && t < 1e6 => times.push(t),
            _ => {
                return Err(format!(
                    "turn time {} '{part}' is not a time in seconds above zero \
                     (type them like 0.9, 1.9, 3.0)",
                    k + 1
                ))
            }
        }
    }
    if times.len() > MAX_TURNS {
        return Err(format!("at most {MAX_TURNS} turn times"));
    }
    if let Some(k) = times
        .iter()
        .zip(times.iter().skip(1))
        .position(|(a, b)| b <= a)
    {
        return Err(format!(
            "turn time {} is not later than the one before: give the stopwatch \
             reading at each completed turn, rising",
            k + 2
        ));
    }
    Ok(times)
}

impl App {
    /// Adds the reading typed above (pressure, rotation, flow) as a row of
    /// the table and fits the table again.
    pub(super) fn add_reading_row(&mut self) {
        let (Some(p), Some(rot)) = (self.measured.pressure_pa, self.measured.rotation) else {
            self.error("type the pressure (p) and the rotation (r) first, then add them with a");
            return;
        };
        if self.unit.rows.len() >= MAX_ROWS {
            self.error(format!(
                "{MAX_ROWS} readings in the table already; x drops the last"
            ));
            return;
        }
        self.unit.rows.push(SpeedReading {
            inlet_pressure_pa: p,
            rpm: rot.measured_rpm(),
            flow_m3_s: self.measured.flow.map(|f| f.measured_m3_s()),
            time: None,
        });
        let n = self.unit.rows.len();
        self.request_speed_fit();
        self.info(format!(
            "reading {n} added to the table{}",
            if n < 2 {
                "; add readings at other pressures to fit the brake too"
            } else {
                ""
            }
        ));
    }

    /// Drops the last row of the readings table.
    pub(super) fn drop_reading_row(&mut self) {
        if self.unit.rows.pop().is_some() {
            self.request_speed_fit();
            self.info(format!(
                "last reading dropped; {} left in the table",
                self.unit.rows.len()
            ));
        } else {
            self.error("the readings table is empty");
        }
    }

    /// Keeps (or stops keeping) the readings when another file is opened.
    pub(super) fn toggle_keep_readings(&mut self) {
        self.unit.keep = !self.unit.keep;
        self.info(if self.unit.keep {
            "readings kept on purpose: they stay when another file opens (k again to stop)"
        } else {
            "readings belong to this unit: they are cleared when another file opens"
        });
    }

    /// Sets the coast-down turn times from typed text (empty clears them).
    pub(super) fn type_turn_times(&mut self, text: &str) -> Result<(), String> {
        let times = parse_turn_times(text)?;
        self.unit.coast_times_s = times;
        self.request_coast();
        Ok(())
    }

    /// The typed turn times, for editing them again.
    pub(super) fn turn_times_seed(&self) -> String {
        self.unit
            .coast_times_s
            .iter()
            .map(|t| format!("{t}"))
            .collect::<Vec<_>>()
            .join(", ")
    }

    /// Asks the worker for the fit over the table (the design or rows changed).
    pub(super) fn request_speed_fit(&mut self) {
        if self.unit.rows.is_empty() {
            self.unit.fit = Pending::default();
            return;
        }
        let id = self.id();
        self.unit.fit.id = id;
        self.unit.fit.waiting = self.worker.send(Job::Fit {
            id,
            design: Box::new(self.design.clone()),
            readings: self.unit.rows.clone(),
        });
    }

    /// Asks the worker for the coast-down fit (the design or times changed).
    pub(super) fn request_coast(&mut self) {
        if self.unit.coast_times_s.is_empty() {
            self.unit.coast = Pending::default();
            return;
        }
        let id = self.id();
        self.unit.coast.id = id;
        self.unit.coast.waiting = self.worker.send(Job::Coast {
            id,
            design: Box::new(self.design.clone()),
            turn_times_s: self.unit.coast_times_s.clone(),
        });
    }

    /// On opening another file: clears the previous unit's readings unless
    /// they are kept on purpose; returns the words for the status line.
    pub(super) fn readings_on_open(&mut self) -> &'static str {
        let had = self.measured.reading().is_some()
            || self.measured.flow.is_some()
            || self.measured.throw_m.is_some()
            || self.measured.pressure_pa.is_some()
            || self.measured.rotation.is_some()
            || self.unit.any();
        if self.unit.keep {
            return if had {
                "; readings kept on purpose (k in Field stops keeping them)"
            } else {
                ""
            };
        }
        self.measured = super::Measured::default();
        self.unit.rows.clear();
        self.unit.coast_times_s.clear();
        self.unit.fit = Pending::default();
        self.unit.coast = Pending::default();
        if had {
            "; the last unit's readings cleared (k in Field keeps them)"
        } else {
            ""
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn turn_times_read_and_refuse() {
        assert_eq!(
            parse_turn_times("0.9, 1.9 3.0s;4.2").unwrap(),
            vec![0.9, 1.9, 3.0, 4.2]
        );
        assert_eq!(parse_turn_times("  ").unwrap(), Vec::<f64>::new());
        let e = parse_turn_times("0.9, 1.9, 1.5").unwrap_err();
        assert!(e.starts_with("turn time 3 is not later"), "{e}");
        let e = parse_turn_times("0.9, x").unwrap_err();
        assert!(e.starts_with("turn time 2 'x'"), "{e}");
        assert!(parse_turn_times("-1").is_err());
        assert!(parse_turn_times("NaN").is_err());
    }
}
