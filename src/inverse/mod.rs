//! Uses built on the forward model that vary a design: sweeps of one or two
//! inputs, the input value that reaches a target speed or throw, and designs
//! side by side. What may be varied, its name, unit and range come from the
//! [`crate::catalogue`].

pub mod compare;
pub mod sweep;
pub mod target;
