//! The scenario as an editable list, derived from the [`catalogue`]: which
//! fields a design has, in what order, and how far a nudge moves each.
//!
//! Values live in SI in the design; a field knows its [`Unit`] so the list can
//! show it in the chosen unit system and read typed values with their unit.
//! Nudge steps are given in SI by the catalogue and shown as a round number in
//! the display unit (a 0.1 mm step on a nozzle becomes 0.005 in in US units).
//! Nothing here checks ranges: every candidate design goes through the
//! scenario validation in [`super::app`] before it is kept.

use crate::catalogue::{self, Input, Unit, Value};
use crate::physics::design::{Arm, Design};
use crate::units::UnitSystem;

pub use crate::catalogue::{Group, Kind, Seed as ChoiceHint};

/// One editable field: a catalogue input, on one arm for a per-arm input.
/// A per-arm input without an arm is the whole rotor's: it reads the first
/// arm and writes every arm (the arms are alike, see [`arms_alike`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Field {
    /// The catalogue entry.
    pub input: &'static Input,
    arm: Option<usize>,
}

/// How the list shows the arms.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Arms {
    /// One block that edits every arm at once (the arms are alike).
    Together,
    /// A block for each arm, edited one by one.
    Apart,
}

/// A line of the list: a group heading, an arm heading, or a field.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Row {
    /// A group heading.
    Group(Group),
    /// The heading of arm `n` (from 0).
    ArmHeading(usize),
    /// The heading of the block that edits every arm at once.
    AllArmsHeading,
    /// An editable field.
    Field(Field),
}

/// The rows of the list for a design (which fields exist depends on its
/// choices): the catalogue's editable inputs the design has, with a heading
/// where the group or the arm changes. With the arms [`Arms::Together`] the
/// per-arm inputs appear once, as whole-rotor fields.
pub fn rows(design: &Design, arms: Arms) -> Vec<Row> {
    let mut out = Vec::new();
    let mut group = None;
    let mut arm = None;
    for (input, k) in catalogue::present(design) {
        if !input.editable {
            continue;
        }
        let k = match (arms, k) {
            (Arms::Together, Some(0)) => None,
            (Arms::Together, Some(_)) => continue,
            (_, k) => k,
        };
        if group != Some(input.group) {
            group = Some(input.group);
            out.push(Row::Group(input.group));
        }
        if input.per_arm() && arms == Arms::Together {
            // `usize::MAX` marks the whole-rotor block as begun.
            if arm != Some(usize::MAX) {
                arm = Some(usize::MAX);
                out.push(Row::AllArmsHeading);
            }
        } else if k.is_some() && k != arm {
            arm = k;
            out.extend(k.map(Row::ArmHeading));
        }
        out.push(Row::Field(Field { input, arm: k }));
    }
    out
}

/// Whether the arms are alike: the same radius, height, rise, tube and
/// nozzle on every arm, and the azimuths evenly spread from the first arm's.
/// `Err` says what differs, in the list's words.
pub fn arms_alike(design: &Design) -> Result<(), String> {
    let arms = &design.rotor.arms;
    let Some(first) = arms.first() else {
        return Ok(());
    };
    let mut differ: Vec<&'static str> = Vec::new();
    for input in catalogue::all().iter().filter(|i| i.per_arm()) {
        if *input == &catalogue::AZIMUTH {
            continue;
        }
        let a = input.get(design, Some(0));
        if (1..arms.len()).any(|k| input.get(design, Some(k)) != a)
            && !differ.contains(&input.label)
        {
            differ.push(input.label);
        }
    }
    // Anything of an arm the catalogue does not list still counts.
    let same = arms.iter().all(|a| {
        Arm {
            azimuth_rad: first.azimuth_rad,
            ..*a
        } == *first
    });
    if !differ.is_empty() {
        return Err(format!("the arms differ in {}", differ.join(", ")));
    }
    if !same {
        return Err("the arms differ".to_string());
    }
    let n = arms.len() as f64;
    let turn = 2.0 * std::f64::consts::PI;
    let even = arms.iter().enumerate().all(|(k, a)| {
        let off = (a.azimuth_rad - first.azimuth_rad - turn * k as f64 / n).rem_euclid(turn);
        // Within 0.01°: a file keeps azimuths to six figures (308.571°).
        off.min(turn - off) < 0.01_f64.to_radians()
    });
    if even {
        Ok(())
    } else {
        Err("the azimuths are not evenly spread".to_string())
    }
}

/// Spreads the arms evenly around the hub, the first arm's azimuth kept.
pub fn respace(design: &mut Design) {
    let n = design.rotor.arms.len();
    let first = design.rotor.arms.first().map_or(0.0, |a| a.azimuth_rad);
    let turn = 2.0 * std::f64::consts::PI;
    for (k, a) in design.rotor.arms.iter_mut().enumerate() {
        a.azimuth_rad = (first + turn * k as f64 / n as f64).rem_euclid(turn);
    }
}

impl Field {
    /// The field of a design-wide input, or of a per-arm input on every arm
    /// at once (the whole rotor).
    pub const fn of(input: &'static Input) -> Field {
        Field { input, arm: None }
    }

    /// The field of a per-arm input on arm `k` (from 0).
    pub const fn on_arm(input: &'static Input, k: usize) -> Field {
        Field {
            input,
            arm: Some(k),
        }
    }

    /// The group the field belongs to.
    pub fn group(self) -> Group {
        self.input.group
    }

    /// The arm a field belongs to, if any (None for a whole-rotor field).
    pub fn arm(self) -> Option<usize> {
        self.arm
    }

    /// True for a per-arm input edited on every arm at once.
    pub fn all_arms(self) -> bool {
        self.input.per_arm() && self.arm.is_none()
    }

    /// The same input as the list shows it with the arms `arms`: a whole-rotor
    /// field when together, arm 1's (or the arm's own) when apart.
    pub fn shown_as(self, arms: Arms) -> Field {
        match (arms, self.input.per_arm()) {
            (Arms::Together, true) => Field::of(self.input),
            (Arms::Apart, true) if self.arm.is_none() => Field::on_arm(self.input, 0),
            _ => self,
        }
    }

    /// The arm read for the value: the field's own, arm 1 for a whole-rotor field.
    fn read_arm(self) -> Option<usize> {
        if self.all_arms() {
            Some(0)
        } else {
            self.arm
        }
    }

    /// The short label shown in the list.
    pub fn label(self) -> &'static str {
        self.input.label
    }

    /// A longer description for the hint line.
    pub fn describe(self) -> &'static str {
        self.input.help
    }

    /// How the field is edited.
    pub fn kind(self) -> Kind {
        self.input.kind()
    }

    /// What the field's number measures.
    pub fn unit(self) -> Unit {
        self.input.unit
    }

    /// The value of the field in `design` (a number of NaN, shown `n/a`, when
    /// the design does not have it).
    pub fn get(self, design: &Design) -> Value {
        self.input
            .get(design, self.read_arm())
            .unwrap_or(Value::Number(f64::NAN))
    }

    /// The SI value of a numeric field, if the design has it.
    pub fn number(self, design: &Design) -> Option<f64> {
        self.input.number(design, self.read_arm())
    }

    /// Writes a number (SI; `None` sets an optional field to auto). Returns
    /// false when the design has no such field. A whole-rotor field sets every
    /// arm to the value; its azimuth turns the first arm and spreads the
    /// others evenly after it.
    pub fn set_number(self, design: &mut Design, value: Option<f64>) -> bool {
        if !self.all_arms() {
            return self.input.set_number(design, self.arm, value);
        }
        if self.input == &catalogue::AZIMUTH {
            let ok = self.input.set_number(design, Some(0), value);
            respace(design);
            return ok;
        }
        let n = design.rotor.arms.len();
        n > 0 && (0..n).all(|k| self.input.set_number(design, Some(k), value))
    }

    /// Steps a choice field to its next (`forward`) or previous option.
    /// `hint` supplies values for a newly chosen option (the current state's
    /// pressure, flow and bearing torques), so the design stays near where it was.
    pub fn cycle(self, design: &mut Design, forward: bool, hint: &ChoiceHint) -> bool {
        self.input.cycle(design, forward, hint)
    }

    /// The value as shown in the list, in `system`.
    pub fn show(self, design: &Design, system: UnitSystem) -> String {
        self.input.show_value(&self.get(design), system)
    }

    /// The value as it is offered for typing: the number in the display unit
    /// with the unit.
    pub fn typing_seed(self, design: &Design, system: UnitSystem) -> String {
        match self.get(design) {
            Value::Number(v) => {
                let unit = self.unit();
                let label = unit.label(system);
                let label = if label == "°" {
                    "deg".to_string()
                } else {
                    label
                };
                format!("{}{label}", trim_number(unit.to_display(v, system)))
            }
            Value::Auto => "auto".to_string(),
            Value::Choice(c) => c.to_string(),
            Value::Text(t) => t,
        }
    }
}

/// The nearest of 1, 2, 5 × 10ⁿ to `x` (in log terms), for round steps.
pub fn nice_step(x: f64) -> f64 {
    if !(x.is_finite() && x > 0.0) {
        return 1.0;
    }
    let exp = x.log10().floor();
    let base = 10f64.powf(exp);
    let m = x / base;
    let candidates: [f64; 4] = [1.0, 2.0, 5.0, 10.0];
    let best = candidates
        .iter()
        .copied()
        .min_by(|a: &f64, b: &f64| (a.ln() - m.ln()).abs().total_cmp(&(b.ln() - m.ln()).abs()))
        .unwrap_or(1.0);
    best * base
}

/// How far one nudge goes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Stride {
    /// A tenth of the fine step (Alt or Ctrl with ← →), for sensitive values.
    Finer,
    /// The catalogue's fine step (← →).
    Fine,
    /// The coarse step (Shift with ← →).
    Coarse,
}

/// Finer steps per fine step.
pub const FINER_PER_FINE: f64 = 10.0;

/// The nudge step of a field in display units of `system`: the catalogue's
/// fine step rounded in the display unit; the coarse step a multiple of it,
/// the finer step a tenth of it.
pub fn display_step(field: Field, system: UnitSystem, stride: Stride) -> f64 {
    let step = field.input.step;
    let fine = nice_step(field.unit().difference_to_display(step.fine, system).abs());
    match stride {
        Stride::Finer => fine / FINER_PER_FINE,
        Stride::Fine => fine,
        Stride::Coarse => fine * step.coarse,
    }
}

/// The value after one nudge: moves to the next multiple of the step in the
/// display unit beyond the value (so values land on round numbers), in SI.
pub fn nudged(field: Field, si: f64, system: UnitSystem, forward: bool, stride: Stride) -> f64 {
    let step = display_step(field, system, stride);
    let unit = field.unit();
    // The next grid point strictly beyond the value (within rounding noise).
    let k = unit.to_display(si, system) / step;
    let k = if forward {
        (k + 1e-9).floor() + 1.0
    } else {
        (k - 1e-9).ceil() - 1.0
    };
    unit.from_display(k * step, system)
}

/// A number without trailing zeros, to six significant figures.
fn trim_number(v: f64) -> String {
    if !v.is_finite() {
        return String::new();
    }
    // Six decimals, more below 1 so that six significant figures remain.
    let decimals = if v != 0.0 && v.abs() < 1.0 {
        (5.0 - v.abs().log10().floor()).clamp(6.0, 12.0) as usize
    } else {
        6
    };
    let s = format!("{v:.decimals$}");
    let s = if v != 0.0 && v.abs() < 1.0e-3 {
        format!("{v:e}")
    } else {
        s
    };
    if s.contains('.') && !s.contains('e') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    }
}

/// Why a typed value could not be read.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct TypedError(pub String);

/// Reads a typed value for a numeric field: a number with a unit of the
/// field's kind (`2.8bar`, `45psi`, `6.5in`, `0.4N·m·s`), a bare number in the
/// unit shown beside the field, or `auto` for an optional field. Returns SI
/// (`None` for auto).
pub fn parse_typed(
    field: Field,
    text: &str,
    system: UnitSystem,
) -> Result<Option<f64>, TypedError> {
    let t = text.trim();
    if field.kind() == Kind::OptionalNumber && t.eq_ignore_ascii_case("auto") {
        return Ok(None);
    }
    match field.unit() {
        Unit::None if t.parse::<f64>().is_err() => Err(TypedError(format!(
            "`{t}` is not a number; {} is a bare number (e.g. 0.96)",
            field.label()
        ))),
        unit => unit.parse(t, system).map(Some).map_err(TypedError),
    }
}

#[cfg(test)]
mod tests;
