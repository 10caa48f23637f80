//! spinwright: design, tuning and field checks for reaction-driven
//! rotating-arm sprinklers.
//!
//! - [`physics`]: the pure model (SI in, SI out).
#![warn(missing_docs)]

pub mod physics;
