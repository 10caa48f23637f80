mod reference_fluid;
mod reference_pipe;
