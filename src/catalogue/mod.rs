//! The catalogue of design inputs: every number, choice and name of a
//! [`Design`] that a person sets, written down once.
//!
//! Each [`Input`] says where it sits in the scenario file (its `path`, the one
//! spelling used in messages, comparisons and the interface), what it
//! measures (its [`Unit`]), how it is labelled and explained, what values the
//! model accepts ([`Range`]), how far a nudge moves it ([`Step`]), and how it
//! is read from and written into a design ([`Access`]). An input that lives on
//! every arm (a nozzle's diameter) is one entry with an arm index.
//!
//! Derived from it: the scenario validation's field paths and ranges
//! (`scenario::convert`), the interface's editable list (`tui::fields`), the
//! names, units and search ranges of sweeps and target searches ([`Vary`],
//! `inverse`), the flattened inputs a comparison lists with their labels, and
//! the test helpers that compare two designs.
//!
//! To add an input: add the field to `physics::design`, its entry to
//! `entries/` (in list order), and, when the file needs it, the schema field
//! with its default. The tests walk the catalogue and round-trip every entry
//! through a design and through a saved and re-read scenario.
//!
//! Arrows point down: the catalogue knows the design and the units, not the
//! file, the command line or the interface.

mod entries;
mod vary;

pub use entries::*;
pub use vary::{ArmRule, How, Search, Vary, VaryError};

use crate::physics::design::{Arm, Bearing, Design, Line, Supply, Washer};
use crate::units::{self, Dimension, UnitSystem};

/// The groups of the editable list, in the order they are shown.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Group {
    /// How water reaches the inlet, and the swivel.
    Supply,
    /// The rotor: hub, inertia, and each arm with its nozzle.
    Arms,
    /// Bearing, seal, brake and air drag.
    Friction,
    /// Drop-size spectrum overrides.
    Spray,
    /// Head layout.
    Layout,
    /// Name, water and air, wind.
    Site,
}

impl Group {
    /// Every group, in list order.
    pub const ALL: [Group; 6] = [
        Group::Supply,
        Group::Arms,
        Group::Friction,
        Group::Spray,
        Group::Layout,
        Group::Site,
    ];

    /// The group's heading.
    pub fn title(self) -> &'static str {
        match self {
            Group::Supply => "Supply",
            Group::Arms => "Arms & nozzles",
            Group::Friction => "Friction",
            Group::Spray => "Spray",
            Group::Layout => "Layout",
            Group::Site => "Site",
        }
    }
}

/// What an input's number measures, and how it is shown.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Unit {
    /// A bare number (a coefficient, an exponent, a count).
    None,
    /// A quantity shown in the unit system's unit for the dimension.
    Dim(Dimension),
    /// A quantity kept in SI in both unit systems (the file takes it as a
    /// bare SI number), shown with this SI unit.
    Si(&'static str),
    /// A quantity per another: the numerator's unit per the denominator's,
    /// both in the unit system's units (seal torque per hub pressure).
    Per(Dimension, Dimension),
}

impl Unit {
    /// The dimension of a plain quantity (None for the other kinds).
    pub fn dimension(self) -> Option<Dimension> {
        match self {
            Unit::Dim(d) => Some(d),
            _ => None,
        }
    }

    /// An SI value in the shown unit of `system`.
    pub fn to_display(self, si: f64, system: UnitSystem) -> f64 {
        match self {
            Unit::None | Unit::Si(_) => si,
            Unit::Dim(d) => units::to_display(d, si, system),
            Unit::Per(num, den) => {
                units::to_display(num, si * units::from_display(den, 1.0, system), system)
            }
        }
    }

    /// A value in the shown unit of `system` back to SI.
    pub fn from_display(self, shown: f64, system: UnitSystem) -> f64 {
        match self {
            Unit::None | Unit::Si(_) => shown,
            Unit::Dim(d) => units::from_display(d, shown, system),
            Unit::Per(num, den) => {
                units::from_display(num, shown, system) / units::from_display(den, 1.0, system)
            }
        }
    }

    /// A difference of SI values in the shown unit (no temperature offset).
    pub fn difference_to_display(self, si: f64, system: UnitSystem) -> f64 {
        self.to_display(si, system) - self.to_display(0.0, system)
    }

    /// The shown unit ("" for a bare number).
    pub fn label(self, system: UnitSystem) -> String {
        match self {
            Unit::None => String::new(),
            Unit::Si(s) => s.to_string(),
            Unit::Dim(d) => units::unit_label(d, system).to_string(),
            Unit::Per(num, den) => format!(
                "{}/{}",
                units::unit_label(num, system),
                units::unit_label(den, system)
            ),
        }
    }

    /// The SI unit, as comparisons and JSON name it ("" for a bare number).
    pub fn si_label(self) -> &'static str {
        match self {
            Unit::None => "",
            Unit::Si(s) => s,
            Unit::Dim(d) => si_unit(d),
            Unit::Per(Dimension::Torque, Dimension::Pressure) => "N·m/Pa",
            Unit::Per(..) => "SI",
        }
    }

    /// An SI value as text with its shown unit (`280 kPa`, `0.40 N·m·s`).
    pub fn format(self, si: f64, system: UnitSystem) -> String {
        match self {
            Unit::None => units::format_number(si),
            Unit::Dim(d) => units::format_quantity(d, si, system),
            Unit::Si(_) | Unit::Per(..) => format!(
                "{} {}",
                units::format_number(self.to_display(si, system)),
                self.label(system)
            ),
        }
    }

    /// Reads a typed value: a bare number in the shown unit, or a number with
    /// a unit of the right kind (`2.8bar`, `0.4N·m·s`, `0.002N·m/kPa`).
    /// Returns SI, or a message saying what was expected.
    pub fn parse(self, text: &str, system: UnitSystem) -> Result<f64, String> {
        let t = text.trim();
        if let Ok(v) = t.parse::<f64>() {
            return if v.is_finite() {
                Ok(self.from_display(v, system))
            } else {
                Err(format!("`{t}` is not a finite number"))
            };
        }
        match self {
            Unit::None => Err(format!("`{t}` is not a number")),
            Unit::Dim(d) => units::parse_quantity(d, t).map_err(|e| e.to_string()),
            Unit::Si(label) => {
                let number = t.strip_suffix(label).map(str::trim);
                match number.and_then(|n| n.parse::<f64>().ok()) {
                    Some(v) if v.is_finite() => Ok(v),
                    _ => Err(format!("`{t}` is not a number in {label}")),
                }
            }
            Unit::Per(num, den) => {
                let bad = || {
                    format!(
                        "`{t}` is not a {} per {} (e.g. 0.002{}/{})",
                        num.name(),
                        den.name(),
                        units::unit_label(num, system),
                        units::unit_label(den, system)
                    )
                };
                let (top, bottom) = t.rsplit_once('/').ok_or_else(bad)?;
                let top = units::parse_quantity(num, top).map_err(|_| bad())?;
                let bottom = units::parse_quantity(den, &format!("1{}", bottom.trim()))
                    .map_err(|_| bad())?;
                let si = top / bottom;
                if si.is_finite() {
                    Ok(si)
                } else {
                    Err(bad())
                }
            }
        }
    }
}

/// The SI unit of a dimension, as comparisons name it.
fn si_unit(d: Dimension) -> &'static str {
    match d {
        Dimension::Length | Dimension::SmallLength => "m",
        Dimension::Pressure => "Pa",
        Dimension::Flow => "m3/s",
        Dimension::Angle => "rad",
        Dimension::Temperature => "°C",
        Dimension::Torque => "N·m",
        Dimension::Mass => "kg",
        Dimension::Area => "m2",
        Dimension::Speed | Dimension::ApplicationRate => "m/s",
        Dimension::Inertia => "kg·m²",
        Dimension::Density => "kg/m3",
        Dimension::Time => "s",
        Dimension::Volume => "m3",
        Dimension::AngularSpeed => "rad/s",
    }
}

/// The values the model accepts for an input, SI. Scenario validation applies
/// it to every value read (with the file's path); sweeps apply it to every
/// value they set. Relations between inputs (an arm reaching past the hub, a
/// nozzle no wider than its tube) are checked where both are known.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Range {
    /// Any finite number of a size the model computes with.
    Any,
    /// Greater than zero.
    Positive,
    /// Zero or more.
    NonNegative,
    /// Between `lo` and `hi` inclusive; `rule` says so in words.
    Between {
        /// Lowest value, SI.
        lo: f64,
        /// Highest value, SI.
        hi: f64,
        /// The rule as a message (`must be between 0° and 90° …`).
        rule: &'static str,
    },
    /// A coefficient above 0 and at most 1.
    Fraction,
    /// Nothing to check (choices, text, counts checked elsewhere).
    Unchecked,
}

impl Range {
    /// Why `v` (SI) is outside the range, if it is.
    pub fn refuses(self, v: f64) -> Option<&'static str> {
        if !v.is_finite() {
            return Some("must be a finite number (not inf or NaN)");
        }
        match self {
            Range::Any | Range::Unchecked => None,
            Range::Positive => (v <= 0.0).then_some("must be greater than zero"),
            Range::NonNegative => (v < 0.0).then_some("must not be negative"),
            Range::Between { lo, hi, rule } => {
                let slack = 1e-9 * lo.abs().max(hi.abs());
                (!(lo - slack..=hi + slack).contains(&v)).then_some(rule)
            }
            Range::Fraction => (!(v > 0.0 && v <= 1.0)).then_some("must be above 0 and at most 1"),
        }
    }
}

/// How far a nudge moves an input.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Step {
    /// The fine step, SI; shown rounded to 1, 2 or 5 × 10ⁿ in the display unit.
    pub fine: f64,
    /// The coarse step as a multiple of the shown fine step.
    pub coarse: f64,
}

/// A fine step of `fine` (SI) and a coarse step ten times it.
pub const fn step(fine: f64) -> Step {
    Step { fine, coarse: 10.0 }
}

/// No nudge (choices, text).
pub const NO_STEP: Step = Step {
    fine: 0.0,
    coarse: 0.0,
};

/// How an input is edited.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    /// A number, nudged and typed.
    Number,
    /// A number that may also be `auto` (left to the model).
    OptionalNumber,
    /// One of a few choices.
    Choice,
    /// Free text.
    Text,
}

/// How an input is read from and written into a design. `set` returns false
/// (and leaves the design alone) when the design does not have the input.
#[derive(Clone, Copy)]
pub enum Access {
    /// A number of the design (None: the design does not have it, e.g. a
    /// hose length on a pressure supply).
    Number {
        /// The SI value.
        get: fn(&Design) -> Option<f64>,
        /// Writes the SI value.
        set: fn(&mut Design, f64) -> bool,
    },
    /// A number that may be left to the model (`Some(None)`: auto).
    Optional {
        /// The SI value, or auto.
        get: fn(&Design) -> Option<Option<f64>>,
        /// Writes the SI value, or auto.
        set: fn(&mut Design, Option<f64>) -> bool,
    },
    /// A number every arm has.
    Arm {
        /// The SI value of one arm.
        get: fn(&Arm) -> f64,
        /// Writes the SI value of one arm.
        set: fn(&mut Arm, f64),
    },
    /// A number of an arm that may be left to the model.
    ArmOptional {
        /// The SI value, or auto.
        get: fn(&Arm) -> Option<f64>,
        /// Writes the SI value, or auto.
        set: fn(&mut Arm, Option<f64>),
    },
    /// One of `options` (None: the design does not have the choice).
    Choice {
        /// The options' words, in cycling order.
        options: &'static [&'static str],
        /// The index of the design's option.
        get: fn(&Design) -> Option<usize>,
        /// Switches to option `index`, seeding new values from the seed.
        set: fn(&mut Design, usize, &Seed) -> bool,
    },
    /// Free text.
    Text {
        /// The text.
        get: fn(&Design) -> String,
        /// Writes the text.
        set: fn(&mut Design, &str),
    },
}

/// One design input. See the module docs.
pub struct Input {
    /// Where it sits in the scenario file, dotted; a per-arm input has `[]`
    /// for the arm index (`rotor.arms[].nozzle.diameter`).
    pub path: &'static str,
    /// The short label of the editable list.
    pub label: &'static str,
    /// One line saying what it is (the hint line, the help).
    pub help: &'static str,
    /// The list group it is shown in.
    pub group: Group,
    /// What its number measures.
    pub unit: Unit,
    /// How it is read and written.
    pub access: Access,
    /// The values the model accepts.
    pub range: Range,
    /// The nudge steps.
    pub step: Step,
    /// How sweeps and target searches vary it, if they may.
    pub vary: Option<Vary>,
    /// Whether the interface's list shows it.
    pub editable: bool,
}

impl PartialEq for Input {
    fn eq(&self, other: &Self) -> bool {
        self.path == other.path
    }
}

impl Eq for Input {}

impl std::hash::Hash for Input {
    fn hash<H: std::hash::Hasher>(&self, state: &mut H) {
        self.path.hash(state);
    }
}

impl std::fmt::Debug for Input {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "Input({})", self.path)
    }
}

/// A value of an input.
#[derive(Debug, Clone, PartialEq)]
pub enum Value {
    /// A number, SI (°C for temperatures).
    Number(f64),
    /// Left to the model.
    Auto,
    /// One of a few choices.
    Choice(&'static str),
    /// Free text.
    Text(String),
}

impl Input {
    /// True for an input every arm has.
    pub fn per_arm(&self) -> bool {
        matches!(self.access, Access::Arm { .. } | Access::ArmOptional { .. })
    }

    /// How it is edited.
    pub fn kind(&self) -> Kind {
        match self.access {
            Access::Number { .. } | Access::Arm { .. } => Kind::Number,
            Access::Optional { .. } | Access::ArmOptional { .. } => Kind::OptionalNumber,
            Access::Choice { .. } => Kind::Choice,
            Access::Text { .. } => Kind::Text,
        }
    }

    /// The path of the input on arm `arm` (from 0; ignored for a design-wide input).
    pub fn path_at(&self, arm: Option<usize>) -> String {
        match (self.per_arm(), arm) {
            (true, Some(k)) => self.path.replacen("[]", &format!("[{k}]"), 1),
            _ => self.path.to_string(),
        }
    }

    /// The last part of the path: the field name as the file writes it.
    pub fn file_field(&self) -> &'static str {
        self.path.rsplit('.').next().unwrap_or(self.path)
    }

    /// The value in `design` (of arm `arm` for a per-arm input); None when the
    /// design does not have it.
    pub fn get(&self, design: &Design, arm: Option<usize>) -> Option<Value> {
        let arm_of = || design.rotor.arms.get(arm?);
        Some(match self.access {
            Access::Number { get, .. } => Value::Number(get(design)?),
            Access::Optional { get, .. } => get(design)?.map_or(Value::Auto, Value::Number),
            Access::Arm { get, .. } => Value::Number(get(arm_of()?)),
            Access::ArmOptional { get, .. } => get(arm_of()?).map_or(Value::Auto, Value::Number),
            Access::Choice { options, get, .. } => {
                Value::Choice(options.get(get(design)?).copied()?)
            }
            Access::Text { get, .. } => Value::Text(get(design)),
        })
    }

    /// The SI number, when the design has one (not auto, not a choice).
    pub fn number(&self, design: &Design, arm: Option<usize>) -> Option<f64> {
        match self.get(design, arm)? {
            Value::Number(v) => Some(v),
            _ => None,
        }
    }

    /// Writes a number (SI; `None` sets an optional input to auto). Returns
    /// false, with the design unchanged, when the design does not have it.
    pub fn set_number(&self, design: &mut Design, arm: Option<usize>, value: Option<f64>) -> bool {
        match (self.access, value) {
            (Access::Number { set, .. }, Some(v)) => set(design, v),
            (Access::Optional { get, set }, v) => get(design).is_some() && set(design, v),
            (Access::Arm { set, .. }, Some(v)) => {
                match arm.and_then(|k| design.rotor.arms.get_mut(k)) {
                    Some(a) => {
                        set(a, v);
                        true
                    }
                    None => false,
                }
            }
            (Access::ArmOptional { set, .. }, v) => {
                match arm.and_then(|k| design.rotor.arms.get_mut(k)) {
                    Some(a) => {
                        set(a, v);
                        true
                    }
                    None => false,
                }
            }
            _ => false,
        }
    }

    /// Switches a choice to option `index`. False when not a choice, or the
    /// design does not have it.
    pub fn set_choice(&self, design: &mut Design, index: usize, seed: &Seed) -> bool {
        match self.access {
            Access::Choice { options, get, set } => {
                index < options.len() && get(design).is_some() && set(design, index, seed)
            }
            _ => false,
        }
    }

    /// Steps a choice to its next (`forward`) or previous option.
    pub fn cycle(&self, design: &mut Design, forward: bool, seed: &Seed) -> bool {
        let Access::Choice { options, get, .. } = self.access else {
            return false;
        };
        let (Some(i), n) = (get(design), options.len()) else {
            return false;
        };
        let next = if forward {
            (i + 1) % n
        } else {
            (i + n - 1) % n
        };
        self.set_choice(design, next, seed)
    }

    /// Writes text. False when not a text input.
    pub fn set_text(&self, design: &mut Design, text: &str) -> bool {
        match self.access {
            Access::Text { set, .. } => {
                set(design, text);
                true
            }
            _ => false,
        }
    }

    /// The value as text in `system` (`280 kPa`, `auto`, `washer`).
    pub fn show(&self, design: &Design, arm: Option<usize>, system: UnitSystem) -> String {
        match self.get(design, arm) {
            None => "—".to_string(),
            Some(v) => self.show_value(&v, system),
        }
    }

    /// A value of this input as text in `system`.
    pub fn show_value(&self, value: &Value, system: UnitSystem) -> String {
        match value {
            Value::Number(v) => self.unit.format(*v, system),
            Value::Auto => "auto".to_string(),
            Value::Choice(c) => (*c).to_string(),
            Value::Text(t) => t.clone(),
        }
    }
}

/// Every input, in list order.
pub fn all() -> &'static [&'static Input] {
    ALL.as_slice()
}

/// The input with this path (`wind.speed`, `rotor.arms[].nozzle.diameter`;
/// an arm index in the path is accepted: `rotor.arms[2].nozzle.diameter`).
pub fn find(path: &str) -> Option<(&'static Input, Option<usize>)> {
    if let Some(i) = ALL.iter().find(|i| i.path == path) {
        return Some((i, None));
    }
    let rest = path.strip_prefix("rotor.arms[")?;
    let (k, tail) = rest.split_once("]")?;
    let k: usize = k.parse().ok()?;
    let generic = format!("rotor.arms[]{tail}");
    ALL.iter()
        .find(|i| i.per_arm() && i.path == generic)
        .map(|i| (*i, Some(k)))
}

/// The inputs `design` has, in list order, each with its arm: design-wide
/// inputs where they stand, the per-arm inputs arm by arm where the first
/// of them stands.
pub fn present(design: &Design) -> Vec<(&'static Input, Option<usize>)> {
    let mut out = Vec::new();
    let mut arms_done = false;
    for input in ALL.iter().copied() {
        if input.per_arm() {
            if !arms_done {
                arms_done = true;
                for k in 0..design.rotor.arms.len() {
                    out.extend(
                        ALL.iter()
                            .copied()
                            .filter(|i| i.per_arm())
                            .map(|i| (i, Some(k))),
                    );
                }
            }
        } else if input.get(design, None).is_some() {
            out.push((input, None));
        }
    }
    out
}

/// The inputs a sweep may vary, in list order.
pub fn varied() -> impl Iterator<Item = &'static Input> {
    ALL.iter().copied().filter(|i| i.vary.is_some())
}

/// The input a sweep names `name` or one of its other names
/// (case-insensitive; `brake` is the viscous brake).
pub fn by_vary_name(name: &str) -> Option<&'static Input> {
    varied()
        .find(|i| i.vary.is_some_and(|v| v.name.eq_ignore_ascii_case(name)))
        .or_else(|| {
            varied().find(|i| {
                i.vary
                    .is_some_and(|v| v.aliases.iter().any(|a| a.eq_ignore_ascii_case(name)))
            })
        })
}

/// The inputs a target search may adjust, in list order.
pub fn adjustable() -> impl Iterator<Item = &'static Input> {
    varied().filter(|i| i.vary.is_some_and(|v| v.search.is_some()))
}

/// The input a target search names `name` or one of its other names
/// (case-insensitive; `brake` is the viscous brake).
pub fn by_adjust_name(name: &str) -> Option<&'static Input> {
    adjustable().find(|i| {
        i.vary.is_some_and(|v| {
            v.name.eq_ignore_ascii_case(name)
                || v.aliases.iter().any(|a| a.eq_ignore_ascii_case(name))
        })
    })
}

/// Values that seed a newly chosen option of a choice (the present state's
/// pressure, flow and bearing torques), so the design stays near where it was.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Seed {
    /// Inlet pressure now, Pa.
    pub inlet_pa: f64,
    /// Total flow now, m³/s.
    pub flow_m3_s: f64,
    /// Inertia now, kg·m².
    pub inertia_kg_m2: f64,
    /// Running bearing torque now, N·m.
    pub running_n_m: f64,
    /// Breakaway torque now, N·m.
    pub breakaway_n_m: f64,
    /// A washer to go back to.
    pub washer: Washer,
    /// A head spacing to start a layout with, m.
    pub spacing_m: f64,
}

fn washer(design: &Design) -> Option<&Washer> {
    match &design.friction.bearing {
        Bearing::Washer(w) => Some(w),
        Bearing::Measured { .. } => None,
    }
}

fn washer_mut(design: &mut Design) -> Option<&mut Washer> {
    match &mut design.friction.bearing {
        Bearing::Washer(w) => Some(w),
        Bearing::Measured { .. } => None,
    }
}

fn line(design: &Design) -> Option<&Line> {
    match &design.supply {
        Supply::Line(l) => Some(l),
        _ => None,
    }
}

fn line_mut(design: &mut Design) -> Option<&mut Line> {
    match &mut design.supply {
        Supply::Line(l) => Some(l),
        _ => None,
    }
}

#[cfg(test)]
mod tests;
