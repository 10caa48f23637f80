mod cli;
mod engine_properties;
mod engine_reference;
mod reference_fluid;
mod reference_pipe;
