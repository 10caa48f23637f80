//! Throw, pattern, layout and catch-can checks against outside references.
mod catch_can_audit;
mod pattern_conservation;
mod throw_rotation;
mod trajectory_reference;
mod uniformity_reference;
