//! The single field check: the readings typed in the Field view (pressure,
//! rotation, flow, wetted radius), how typed readings are read, and the
//! check asked of the worker.

use super::{App, Pending};
use crate::catalogue;
use crate::inverse::field::{FieldReading, FlowReading, RotationReading, ThrowReading};
use crate::tui::fields::{self, Field};
use crate::tui::worker::Job;
use crate::units::{self, Dimension as D, UnitSystem};

use super::Measure;

/// Readings typed in the Field view (SI).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Measured {
    /// Inlet gauge pressure, Pa.
    pub pressure_pa: Option<f64>,
    /// Rotation, as taken.
    pub rotation: Option<RotationReading>,
    /// Flow, if measured.
    pub flow: Option<FlowReading>,
    /// Wetted radius, m, if measured.
    pub throw_m: Option<f64>,
}

impl Measured {
    /// The readings for a field check, once pressure and rotation are in.
    pub fn reading(&self) -> Option<FieldReading> {
        Some(FieldReading {
            flow: self.flow,
            throw: self.throw_m.map(ThrowReading::new),
            ..FieldReading::new(self.pressure_pa?, self.rotation?)
        })
    }
}

impl App {
    /// Asks for the field check again (the design or the readings changed).
    pub(super) fn request_field(&mut self) {
        let Some(reading) = self.measured.reading() else {
            self.field = Pending::default();
            return;
        };
        let id = self.id();
        self.field.id = id;
        self.field.waiting = self.worker.send(Job::Field {
            id,
            design: Box::new(self.design.clone()),
            reading,
        });
    }

    pub(super) fn type_measured(&mut self, m: Measure, text: &str) {
        let t = text.trim();
        let empty = t.is_empty();
        let result: Result<(), String> = match m {
            Measure::Pressure if empty => {
                self.measured.pressure_pa = None;
                Ok(())
            }
            Measure::Pressure => positive(
                Field::of(&catalogue::INLET_PRESSURE),
                t,
                self.units,
                "pressure",
            )
            .map(|v| self.measured.pressure_pa = Some(v)),
            Measure::Rotation if empty => {
                self.measured.rotation = None;
                Ok(())
            }
            Measure::Rotation => parse_rotation(t).map(|r| self.measured.rotation = Some(r)),
            Measure::Flow if empty => {
                self.measured.flow = None;
                Ok(())
            }
            Measure::Flow => parse_flow(t, self.units).map(|f| self.measured.flow = Some(f)),
            Measure::Coast => match self.type_turn_times(t) {
                Ok(()) => return,
                Err(e) => Err(e),
            },
            Measure::Throw if empty => {
                self.measured.throw_m = None;
                Ok(())
            }
            Measure::Throw => positive(
                Field::of(&catalogue::SQUARE_SPACING),
                t,
                self.units,
                "wetted radius",
            )
            .map(|v| self.measured.throw_m = Some(v)),
        };
        match result {
            Ok(()) => self.request_field(),
            Err(e) => self.error(format!("refused: {e}")),
        }
    }
}

/// Reads a measured rotation: `40rpm`, `1.5s` (one turn), `10/14.2s` or
/// `10 turns in 14.2s` (turns over a time). Timed readings carry the default
/// stopwatch resolution.
pub fn parse_rotation(text: &str) -> Result<RotationReading, String> {
    let t = text.trim();
    let help = "write `40rpm`, `1.5s` (seconds per turn) or `10/14.2s` (turns over a time)";
    let positive = |v: f64, what: &str| {
        if v.is_finite() && v > 0.0 {
            Ok(v)
        } else {
            Err(format!("{what} must be above zero; {help}"))
        }
    };
    let lower = t.to_lowercase();
    if let Some((turns, time)) = over(&lower, &["/", " turns in ", " turns over ", " in "]) {
        let turns: f64 = turns
            .trim()
            .parse()
            .map_err(|_| format!("`{}` is not a count of turns; {help}", turns.trim()))?;
        let seconds =
            units::parse_quantity(D::Time, time.trim()).map_err(|e| format!("{e}; {help}"))?;
        return Ok(RotationReading::turns_over(
            positive(turns, "the turn count")?,
            positive(seconds, "the time")?,
        ));
    }
    if let Ok(w) = units::parse_quantity(D::AngularSpeed, t) {
        return Ok(RotationReading::rpm(positive(
            crate::physics::balance::rpm(w),
            "the speed",
        )?));
    }
    match units::parse_quantity(D::Time, t) {
        Ok(s) => Ok(RotationReading::seconds_per_turn(positive(
            s,
            "the time per turn",
        )?)),
        Err(_) => Err(format!("`{t}` is not a rotation; {help}")),
    }
}

/// A measured quantity typed as a field of its dimension, above zero.
fn positive(f: Field, text: &str, system: UnitSystem, what: &str) -> Result<f64, String> {
    match fields::parse_typed(f, text, system) {
        Ok(Some(v)) if v > 0.0 => Ok(v),
        Ok(_) => Err(format!("a measured {what} must be above zero")),
        Err(e) => Err(e.0),
    }
}

/// Splits `a SEP b` at the first of the separators found (in the order given).
fn over<'a>(text: &'a str, separators: &[&str]) -> Option<(&'a str, &'a str)> {
    separators.iter().find_map(|s| text.split_once(s))
}

/// Reads a measured flow: a rate (`12L/min`, `3.2gpm`, a bare number in the
/// shown unit) or a volume caught over a time (`5L/30s`, `5L in 30s`).
pub fn parse_flow(text: &str, system: UnitSystem) -> Result<FlowReading, String> {
    let t = text.trim();
    let help = "write a rate (`12L/min`) or a volume over a time (`5L in 30s`)";
    let caught = over(t, &[" in ", " over "]).or_else(|| {
        // `5L/30s`: a slash followed by a time, not a rate's `/min`.
        t.rsplit_once('/').filter(|(_, b)| {
            b.trim()
                .starts_with(|c: char| c.is_ascii_digit() || c == '.')
        })
    });
    if let Some((vol, time)) = caught {
        let v = units::parse_quantity(D::Volume, vol.trim()).map_err(|e| format!("{e}; {help}"))?;
        let s = units::parse_quantity(D::Time, time.trim()).map_err(|e| format!("{e}; {help}"))?;
        if !(v > 0.0 && s > 0.0) {
            return Err(format!(
                "the volume and the time must be above zero; {help}"
            ));
        }
        return Ok(FlowReading::caught(v, s));
    }
    match fields::parse_typed(Field::of(&catalogue::TOTAL_FLOW), t, system) {
        Ok(Some(q)) if q > 0.0 => Ok(FlowReading::rate(q)),
        Ok(_) => Err(format!("a measured flow must be above zero; {help}")),
        Err(e) => Err(format!("{}; {help}", e.0)),
    }
}
