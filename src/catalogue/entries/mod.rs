//! The entries of the catalogue, in the order the interface lists them, one
//! file per group of the list.
//!
//! One `NAME = Input { … };` per input. Each file's list is built from the
//! same lines, and [`ALL`] joins the files in list order, so an entry written
//! once is everywhere at once.

use std::f64::consts::PI;

use std::sync::LazyLock;

use super::Input;
use crate::physics::design::{Bearing, Inertia, Supply};

pub(super) const DEG: f64 = PI / 180.0;

macro_rules! catalogue {
    ($($(#[$doc:meta])* $name:ident = $entry:expr;)*) => {
        $($(#[$doc])* pub static $name: Input = $entry;)*
        /// This file's inputs, in list order.
        pub(super) static LIST: &[&Input] = &[$(&$name),*];
    };
}

/// A design-wide number input with no sweep.
macro_rules! number {
    ($path:expr, $label:expr, $help:expr, $group:expr, $unit:expr, $range:expr, $step:expr,
     |$d:ident| $get:expr, |$dm:ident, $v:ident| $set:expr) => {
        Input {
            path: $path,
            label: $label,
            help: $help,
            group: $group,
            unit: $unit,
            access: Access::Number {
                get: |$d| $get,
                set: |$dm, $v| $set,
            },
            range: $range,
            step: $step,
            vary: None,
            editable: true,
        }
    };
}

/// A number every arm has.
macro_rules! arm {
    ($path:expr, $label:expr, $help:expr, $unit:expr, $range:expr, $step:expr,
     |$a:ident| $field:expr) => {
        Input {
            path: $path,
            label: $label,
            help: $help,
            group: Group::Arms,
            unit: $unit,
            access: Access::Arm {
                get: |$a| $field,
                set: |$a, v| $field = v,
            },
            range: $range,
            step: $step,
            vary: None,
            editable: true,
        }
    };
}

pub(super) fn pressure_of(s: &Supply) -> Option<f64> {
    match s {
        Supply::Pressure { inlet_pa } => Some(*inlet_pa),
        _ => None,
    }
}

pub(super) fn flow_of(s: &Supply) -> Option<f64> {
    match s {
        Supply::Flow { total_m3_s } => Some(*total_m3_s),
        _ => None,
    }
}

pub(super) fn estimate(i: &Inertia) -> Option<(f64, f64, f64)> {
    match *i {
        Inertia::Estimate {
            tube_density_kg_m3,
            tube_wall_m,
            tip_mass_kg,
        } => Some((tube_density_kg_m3, tube_wall_m, tip_mass_kg)),
        Inertia::Given { .. } => None,
    }
}

pub(super) fn measured(b: &Bearing) -> Option<(f64, f64)> {
    match *b {
        Bearing::Measured {
            running_n_m,
            breakaway_n_m,
        } => Some((running_n_m, breakaway_n_m)),
        Bearing::Washer(_) => None,
    }
}

mod arms;
mod friction;
mod site;
mod supply;

pub use arms::*;
pub use friction::*;
pub use site::*;
pub use supply::*;

/// Every input, in list order.
pub static ALL: LazyLock<Vec<&'static Input>> =
    LazyLock::new(|| [supply::LIST, arms::LIST, friction::LIST, site::LIST].concat());
