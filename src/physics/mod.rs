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
//! - [`root`]: bracketed root finding with the bracket kept for reports.
//! - [`field`]: field check, readings at a running sprinkler against its design (M10).
//! - [`target`]: the value of one design parameter that gives a target speed or throw.
//! - [`study`]: named parameters, one- and two-axis sweeps, design comparison.

pub mod balance;
pub mod design;
pub mod field;
pub mod fixtures;
pub mod fluid;
pub mod hydraulics;
pub mod jet;
pub mod pipe;
pub mod root;
pub mod study;
pub mod target;
pub mod torque;
