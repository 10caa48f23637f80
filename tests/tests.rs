//! The one integration-test binary: outside-reference checks, file and CLI tests.
mod catch_can_audit;
mod cli;
mod engine_properties;
mod engine_reference;
mod extreme_designs;
mod field_fit;
mod fuzz;
mod inverse;
mod pattern_conservation;
mod reference_fluid;
mod reference_pipe;
mod scenario_files;
mod scenario_roundtrip;
mod support;
mod throw_rotation;
mod trajectory_reference;
mod uniformity_reference;
