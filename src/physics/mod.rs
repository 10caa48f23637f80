//! The physics core: pure functions of typed SI inputs, no files, no terminal.
//!
//! One file per part of the model (see `docs/model.md`):
//! - [`design`]: the inputs (M1 frames and sign conventions).
//! - [`fluid`]: water and air properties (M11).
//! - [`pipe`]: friction factors and duct losses (M3, M4).
//! - [`hydraulics`]: nozzle flows, arm losses, supply modes at any speed (M3, M4).
//! - [`torque`]: drive torque by moment of momentum, resisting torque (M2, M5).
//! - [`balance`]: equilibria, start check, runaway, spin-up, power (M6).
//! - [`jet`]: a jet at the nozzle exit, the hand-over to the throw (M7).
//! - [`breakup`]: the intact jet, its breakup point and the sheltered spray (M7).
//! - [`trajectory`]: drop flight with drag and wind, drop drag law, terminal speed (M7).
//! - [`spray`]: drop-size spectrum per nozzle, calibration to a measured throw (M8).
//! - [`pattern`]: radial application profile and the 2-D pattern in wind (M8).
//! - [`layout`]: head layouts, overlap, CU / DU and the soil-intake check (M9).
//! - [`checks`]: practice checks of a solved design (start margin, speed, spin-up, clearance).
//! - [`coverage`]: the spin state handed to throw, pattern and layout (M6 → M7–M9).
//!
//! Uses of the model built on it (the field check, targets, sweeps, fits) are
//! in [`crate::inverse`]; the numerical methods in [`crate::numeric`].

pub mod balance;
pub mod breakup;
pub mod checks;
pub mod coverage;
pub mod design;
pub mod fixtures;
pub mod fluid;
pub mod hydraulics;
pub mod jet;
pub mod layout;
pub mod pattern;
pub mod pipe;
pub mod spray;
pub mod torque;
pub mod trajectory;

/// A value handed to the model that it cannot take: which input, in words a
/// technician recognises (with its unit), and what is wrong with it. The
/// error of the layout and uniformity figures, and one kind of
/// [`trajectory::ThrowError`].
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{field} {detail}")]
pub struct InvalidInput {
    /// Which input, with its unit (`head spacing (m)`).
    pub field: String,
    /// What is wrong with it and what is expected.
    pub detail: String,
}

/// An [`InvalidInput`] for `field` holding `value`, as any error that takes
/// one (the caller's return type decides).
pub(crate) fn invalid<E: From<InvalidInput>>(field: &str, value: f64, expected: &str) -> E {
    let shown = if value.is_finite() {
        format!("{value}")
    } else {
        "not a finite number".to_string()
    };
    E::from(InvalidInput {
        field: field.to_string(),
        detail: format!("is {shown}; expected {expected}"),
    })
}

/// Checks that `value` is finite and strictly positive.
pub(crate) fn require_positive(field: &str, value: f64) -> Result<f64, InvalidInput> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(invalid(field, value, "a positive number"))
    }
}

/// A wetted-radius function supplied by the throw model: the wetted radius of
/// a design, m (None when there is none, e.g. the rotor stalls). Field checks
/// and target searches (in [`crate::inverse`]) take one so they need not run the throw themselves.
pub type ThrowFn = dyn Fn(&design::Design) -> Option<f64> + Sync;
