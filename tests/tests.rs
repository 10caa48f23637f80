mod engine_properties;
mod engine_reference;
