//! Benchmarks of the engine (filled in with the solver).

fn main() {}
