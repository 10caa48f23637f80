//! The spinwright command-line entry point: parse, run, exit.

use std::io::IsTerminal;
use std::process::ExitCode;

use clap::Parser;

fn main() -> ExitCode {
    spinwright::crash::install(|| {});
    // Lets the test suite check the crash path end to end.
    if std::env::var_os("SPINWRIGHT_DELIBERATE_PANIC").is_some() {
        panic!("deliberate panic to test the crash report");
    }
    let cli = spinwright::cli::Cli::parse();
    spinwright::cli::main_with(cli, |file| {
        // The interface needs a terminal; piped or redirected, print the report.
        if std::io::stdout().is_terminal() && std::io::stdin().is_terminal() {
            spinwright::tui::run(file)
        } else {
            spinwright::cli::open_without_command(file)
        }
    })
}
