//! How sweeps and target searches vary an input.
//!
//! An input that lives on every arm (deflection, elevation, radius, nozzle,
//! tube bore, height, C_d, C_v) is varied on all arms together, keeping the
//! differences between arms: angles and heights are *shifted* so that their
//! mean takes the new value, lengths and coefficients are *scaled* so that
//! their mean takes it. A design with identical arms simply gets the value on
//! every arm. The supply pressure and flow replace the supply when needed.

use super::Input;
use crate::physics::design::{Arm, Design, Layout, Supply};

/// How sweeps and target searches may vary an input.
#[derive(Debug, Clone, Copy)]
pub struct Vary {
    /// The name on the command line (`--vary NAME=…`, `--adjust NAME`).
    pub name: &'static str,
    /// CSV and JSON column key, with the SI unit in it (`pressure_pa`).
    pub key: &'static str,
    /// How a value goes into the design.
    pub how: How,
    /// The range a target search scans, if it may adjust the input.
    pub search: Option<Search>,
    /// Other names a target search accepts (`brake`).
    pub aliases: &'static [&'static str],
}

/// A relation an arm's new value must keep with the rest of the design:
/// why it is broken, if it is.
pub type ArmCheck = fn(&Design, &Arm, f64) -> Option<&'static str>;

/// How a varied value goes into the design.
#[derive(Debug, Clone, Copy)]
pub enum How {
    /// Set the input itself; the design must have it.
    Field,
    /// Move every arm together so that the mean takes the value.
    Arms {
        /// Shift or scale.
        rule: ArmRule,
        /// A relation to other inputs each arm's new value must keep.
        check: Option<ArmCheck>,
        /// A setter that also moves what goes with the value (used instead
        /// of the input's own).
        set: Option<fn(&mut Arm, f64)>,
    },
    /// The supply pressure: the inlet pressure, or a hose's source pressure;
    /// a fixed-flow supply becomes a fixed inlet pressure.
    SupplyPressure,
    /// The total flow: the supply becomes a fixed total flow.
    SupplyFlow,
    /// The head spacing along a row of whichever layout the design has
    /// (a rectangle keeps its rows).
    LayoutSpacing,
}

impl Vary {
    /// A whole-design input set as it is, that target searches do not adjust.
    pub const fn field(name: &'static str, key: &'static str) -> Vary {
        Vary {
            name,
            key,
            how: How::Field,
            search: None,
            aliases: &[],
        }
    }

    /// A per-arm input moved on all arms together by `rule`, that target
    /// searches do not adjust.
    pub const fn arms(name: &'static str, key: &'static str, rule: ArmRule) -> Vary {
        Vary {
            name,
            key,
            how: How::Arms {
                rule,
                check: None,
                set: None,
            },
            search: None,
            aliases: &[],
        }
    }
}

/// How a per-arm input takes a new mean value.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ArmRule {
    /// Add the same amount to every arm.
    Shift,
    /// Multiply every arm by the same factor.
    Scale,
}

/// The physical range a target search scans (of every arm, so offsets stay inside).
#[derive(Debug, Clone, Copy)]
pub enum Search {
    /// A shifted angle kept within [lo, hi] on every arm, rad; a linear grid.
    Shifted {
        /// Lowest value of any arm.
        lo: f64,
        /// Highest value of any arm.
        hi: f64,
    },
    /// A scaled size kept within each arm's bounds (lo, hi), m; a geometric grid.
    Scaled {
        /// The bounds for one arm of a design.
        bounds: fn(&Design, &Arm) -> (f64, f64),
    },
    /// A brake coefficient from 0 to the value that takes the whole stall
    /// torque at 1 rpm (c = T_stall/ω₁^power); zero then a geometric grid.
    Brake {
        /// 1 for viscous, 2 for quadratic.
        power: i32,
    },
}

/// A value an input cannot take, or an input the design does not have.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("`{name}` = {value} {unit}: {reason}")]
pub struct VaryError {
    /// The input's command-line name.
    pub name: &'static str,
    /// The value tried, SI.
    pub value: f64,
    /// Its SI unit.
    pub unit: &'static str,
    /// What is wrong, in words.
    pub reason: String,
}

fn mean(values: &[f64]) -> Option<f64> {
    (!values.is_empty()).then(|| values.iter().sum::<f64>() / values.len() as f64)
}

impl Input {
    /// The command-line name of a varied input (its path otherwise).
    pub fn vary_name(&self) -> &'static str {
        self.vary.map_or(self.path, |v| v.name)
    }

    /// The CSV/JSON key of a varied input (its path otherwise).
    pub fn vary_key(&self) -> &'static str {
        self.vary.map_or(self.path, |v| v.key)
    }

    fn vary_error(&self, value: f64, reason: impl Into<String>) -> VaryError {
        VaryError {
            name: self.vary_name(),
            value,
            unit: self.unit.si_label(),
            reason: reason.into(),
        }
    }

    /// Each arm's value of a per-arm input.
    pub fn arm_values(&self, design: &Design) -> Vec<f64> {
        (0..design.rotor.arms.len())
            .filter_map(|k| self.number(design, Some(k)))
            .collect()
    }

    /// The value a sweep or search starts from, SI: the mean over arms for a
    /// per-arm input; the inlet or source pressure for the supply pressure.
    /// None when the design does not have it (a washer coefficient on a
    /// measured bearing, a pressure on a fixed-flow supply, no arms).
    pub fn varied_value(&self, design: &Design) -> Option<f64> {
        match self.vary.map(|v| v.how) {
            Some(How::Arms { .. }) => mean(&self.arm_values(design)),
            Some(How::LayoutSpacing) => design.layout.map(|l| l.spacing_m()),
            Some(How::SupplyPressure) => match design.supply {
                Supply::Pressure { inlet_pa } => Some(inlet_pa),
                Supply::Line(line) => Some(line.source_pa),
                Supply::Flow { .. } => None,
            },
            _ => self.number(design, None),
        }
    }

    /// Sets a varied input to `value` (SI) on `design`. Per-arm inputs move
    /// every arm by the same shift or scale so that their mean becomes
    /// `value`. The design is left unchanged on error.
    pub fn vary_to(&self, design: &mut Design, value: f64) -> Result<(), VaryError> {
        if !value.is_finite() {
            return Err(self.vary_error(value, "not a finite number"));
        }
        let Some(vary) = self.vary else {
            return Err(self.vary_error(value, "cannot be varied"));
        };
        match vary.how {
            How::Arms { rule, check, set } => self.vary_arms(design, value, rule, check, set),
            How::SupplyPressure => {
                if value < 0.0 {
                    return Err(self.vary_error(value, "must be zero or more"));
                }
                match &mut design.supply {
                    Supply::Line(line) => line.source_pa = value,
                    other => *other = Supply::Pressure { inlet_pa: value },
                }
                Ok(())
            }
            How::LayoutSpacing => {
                if let Some(reason) = self.range.refuses(value) {
                    return Err(self.vary_error(value, reason));
                }
                match &mut design.layout {
                    Some(
                        Layout::Square { spacing_m }
                        | Layout::Rectangle { spacing_m, .. }
                        | Layout::Triangle { spacing_m },
                    ) => {
                        *spacing_m = value;
                        Ok(())
                    }
                    None => Err(self.vary_error(value, "the design has no layout")),
                }
            }
            How::SupplyFlow => {
                if value <= 0.0 {
                    return Err(self.vary_error(value, "must be above zero"));
                }
                design.supply = Supply::Flow { total_m3_s: value };
                Ok(())
            }
            How::Field => {
                if let Some(reason) = self.range.refuses(value) {
                    return Err(self.vary_error(value, reason));
                }
                if self.set_number(design, None, Some(value)) {
                    Ok(())
                } else {
                    Err(self.vary_error(value, self.missing()))
                }
            }
        }
    }

    /// Why the design lacks this input: `the design's friction.bearing is not Washer`.
    fn missing(&self) -> String {
        let parts: Vec<&str> = self.path.split('.').collect();
        match parts
            .iter()
            .position(|p| p.starts_with(|c: char| c.is_ascii_uppercase()))
        {
            Some(k) => format!(
                "the design's `{}` is not `{}`",
                parts.get(..k).unwrap_or_default().join("."),
                parts.get(k).copied().unwrap_or_default()
            ),
            None => format!("the design has no `{}`", self.path),
        }
    }

    fn vary_arms(
        &self,
        design: &mut Design,
        value: f64,
        rule: ArmRule,
        check: Option<ArmCheck>,
        set: Option<fn(&mut Arm, f64)>,
    ) -> Result<(), VaryError> {
        let values = self.arm_values(design);
        let Some(current) = mean(&values) else {
            return Err(self.vary_error(value, "the design has no arms"));
        };
        let new: Vec<f64> = match rule {
            ArmRule::Shift => values.iter().map(|v| v + (value - current)).collect(),
            ArmRule::Scale => {
                if current <= 0.0 {
                    return Err(
                        self.vary_error(value, "the design's value is zero: cannot scale it")
                    );
                }
                if value <= 0.0 {
                    return Err(self.vary_error(value, "must be above zero"));
                }
                values.iter().map(|v| v * value / current).collect()
            }
        };
        for (k, (arm, &v)) in design.rotor.arms.iter().zip(&new).enumerate() {
            if let Some(reason) = self.range.refuses(v) {
                return Err(self.vary_error(
                    value,
                    format!(
                        "puts {} = {v} outside its range: {reason}",
                        self.path_at(Some(k))
                    ),
                ));
            }
            if let Some(reason) = check.and_then(|c| c(design, arm, v)) {
                return Err(self.vary_error(value, reason));
            }
        }
        for (k, v) in new.into_iter().enumerate() {
            match (set, design.rotor.arms.get_mut(k)) {
                (Some(set), Some(arm)) => set(arm, v),
                _ => {
                    self.set_number(design, Some(k), Some(v));
                }
            }
        }
        Ok(())
    }
}
