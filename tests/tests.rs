//! The integration tests, one module per area.
mod scenario_files;
mod scenario_roundtrip;
mod support;
