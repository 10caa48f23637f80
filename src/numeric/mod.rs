//! Numerical machinery the model stands on, apart from the model itself: no
//! physics here, only methods with their tolerances.
//!
//! - [`root`]: Brent's method (the `roots` crate) with separate tolerances on
//!   x and f, the bracket kept in errors for reports, and bracket growth.
//! - [`newton`]: Newton's method kept inside a bracket (the nozzle flows and
//!   hub pressure of the hydraulics).
//! - [`minimise`]: golden-section search for a minimum of one variable
//!   (target searches, the catch-can leg fit).
//! - [`ode`]: the Dormand–Prince 5(4) stepper with dense output that flies drops.

pub mod minimise;
pub mod newton;
pub mod ode;
pub mod root;
