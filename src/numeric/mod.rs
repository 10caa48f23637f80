//! Numerical machinery the model stands on, apart from the model itself: no
//! physics here, only methods with their tolerances.
//!
//! - [`root`]: Brent's method (the `roots` crate) with separate tolerances on
//!   x and f, and the bracket kept in errors for reports.
//! - [`ode`]: the Dormand–Prince 5(4) stepper with dense output that flies drops.

pub mod ode;
pub mod root;
