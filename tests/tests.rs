//! Integration tests, one binary: each module is a file in tests/.
mod engine_properties;
mod engine_reference;
mod inverse;
