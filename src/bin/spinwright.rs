//! The spinwright command-line entry point.

fn main() {}
