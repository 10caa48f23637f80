//! spinwright: design, tuning and field checks for reaction-driven
//! rotating-arm sprinklers.
//!
//! - [`physics`]: the pure model (SI in, SI out).
//! - [`units`]: quantities typed with units, and values shown in metric or US units.
//! - [`scenario`]: the scenario file (RON with unit tags), its validation into a
//!   [`physics::design::Design`], writing a design back, and safe saving.
//! - [`audit`]: measured catch-can data from CSV, rated like the model's pattern.
//! - [`cli`]: the command line, a thin layer over the above.
//! - [`tui`]: the terminal interface, the other thin layer (the only terminal code).
//! - [`crash`]: the panic hook: terminal restored, crash report written.
#![warn(missing_docs)]

pub mod audit;
pub mod cli;
pub mod crash;
pub mod physics;
pub mod scenario;
pub mod tui;
pub mod units;
