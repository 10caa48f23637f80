//! spinwright: design, tuning and field checks for reaction-driven
//! rotating-arm sprinklers.
//!
//! - [`physics`]: the pure model (SI in, SI out).
//! - [`numeric`]: root finding and the ODE stepper the model stands on (no physics).
//! - [`units`]: quantities typed with units, and values shown in metric or US units.
//! - [`catalogue`]: every design input written once: file path, label, unit,
//!   range, nudge step, get/set; validation, the editable list, sweeps, targets
//!   and comparisons are derived from it.
//! - [`inverse`]: sweeps, target searches and comparisons over catalogue inputs,
//!   the model fitted to readings (several speeds, a coast-down), and catch-can
//!   tests rated beside the model.
//! - [`words`]: typed results (practice cautions) in words, in the chosen units.
//! - [`scenario`]: the scenario file (RON with unit tags), its validation into a
//!   [`physics::design::Design`], writing a design back, and safe saving; the
//!   catch-can CSV reader (`scenario::cans`).
//! - [`rate_map`]: the picture of water on the ground (rate scale, colours,
//!   shading, driest quarter, heads), shared by the command line and the interface.
//! - [`report`]: typed results put into words, in metric or US units, and the
//!   HTML page of a design with its charts (`report::page`).
//! - [`cli`]: the command line, a thin layer over the above.
//! - [`tui`]: the terminal interface, the other thin layer (the only terminal code).
//! - [`crash`]: the panic hook: terminal restored, crash report written.
#![warn(missing_docs)]
// No panic reachable from input in the library proper. The unit tests are
// compiled with `cfg(test)` and may unwrap; the integration tests in tests/ are
// another crate and do not see these attributes.
#![cfg_attr(
    not(test),
    deny(
        clippy::unwrap_used,
        clippy::expect_used,
        clippy::indexing_slicing,
        clippy::panic
    )
)]

pub mod catalogue;
pub mod cli;
pub mod crash;
pub mod inverse;
pub mod numeric;
pub mod physics;
pub mod rate_map;
pub mod report;
pub mod scenario;
pub mod tui;
pub mod units;
pub mod words;
