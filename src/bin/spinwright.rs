//! The spinwright command-line entry point: parse, run, exit.

use std::process::ExitCode;

use clap::Parser;

fn main() -> ExitCode {
    let cli = spinwright::cli::Cli::parse();
    spinwright::cli::main_with(cli, spinwright::cli::open_without_command)
}
