//! spinwright: design, tuning and field checks for reaction-driven
//! rotating-arm sprinklers.
//!
//! - [`physics`]: the pure model (SI in, SI out).
//! - [`audit`]: measured catch-can data from CSV, rated like the model's pattern.
#![warn(missing_docs)]

pub mod audit;
pub mod physics;
