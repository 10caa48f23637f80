//! The one integration-test binary: outside-reference checks and CLI tests.
mod catch_can_audit;
mod cli;
mod engine_properties;
mod engine_reference;
mod pattern_conservation;
mod reference_fluid;
mod reference_pipe;
mod throw_rotation;
mod trajectory_reference;
mod uniformity_reference;
