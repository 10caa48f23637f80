//! The command line: a thin layer that reads scenarios, calls the physics
//! core and prints reports (text for a person, JSON or CSV for a script).
//!
//! Exit status: 0 success; 1 when `--strict` is given and the design has a
//! problem worth a script's attention (stalls, no equilibrium); 2 bad input,
//! with a message naming the file, line and field or the argument.

mod solve;
mod table;
pub mod text;

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::{Args, Parser, Subcommand, ValueEnum};

use crate::physics::design::Design;
use crate::scenario::{self, ScenarioError};
use crate::units::{UnitError, UnitSystem};

/// Design, tune and check reaction-driven rotating-arm sprinklers.
#[derive(Debug, Parser)]
#[command(name = "spinwright", version, about, long_about = None)]
pub struct Cli {
    /// A scenario to open in the terminal interface (the built-in example when left out).
    pub file: Option<PathBuf>,
    /// What to do; without a command the terminal interface opens.
    #[command(subcommand)]
    pub command: Option<Command>,
}

/// The commands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Operating point, start check, torques, flows and throw.
    Solve {
        /// The scenario file.
        file: PathBuf,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
        /// Exit with status 1 when the design stalls or finds no equilibrium.
        #[arg(long)]
        strict: bool,
    },
    /// Torque–speed table from rest to past runaway.
    Table {
        /// The scenario file.
        file: PathBuf,
        /// Number of rows (at least 2).
        #[arg(long, default_value_t = 41, value_parser = clap::value_parser!(u32).range(2..=100_000))]
        points: u32,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Write a commented starter scenario.
    New {
        /// Where to write it (refused if it exists, unless --force).
        file: PathBuf,
        /// Unit system of the starter file.
        #[arg(long, value_enum, default_value_t = Units::Metric)]
        units: Units,
        /// Overwrite an existing file (the old one is kept as FILE.bak).
        #[arg(long)]
        force: bool,
    },
}

/// Output options shared by the report commands.
#[derive(Debug, Clone, Copy, Args)]
pub struct Output {
    /// Report format.
    #[arg(long, value_enum, default_value_t = Format::Text)]
    pub format: Format,
    /// Unit system for text and CSV (JSON is always SI with the unit in each key).
    #[arg(long, value_enum, default_value_t = Units::Metric)]
    pub units: Units,
}

/// Report formats.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Format {
    /// Aligned text for a person.
    Text,
    /// JSON, SI units, unit in every key.
    Json,
    /// Comma-separated values with units in the header.
    Csv,
}

/// Unit systems on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Units {
    /// mm, m, kPa, L/min, N·m, °C.
    Metric,
    /// in, ft, psi, gpm, lbf·in, °F.
    Us,
}

impl From<Units> for UnitSystem {
    fn from(u: Units) -> Self {
        match u {
            Units::Metric => UnitSystem::Metric,
            Units::Us => UnitSystem::Us,
        }
    }
}

/// Why a command could not run (all exit with status 2).
#[derive(Debug, thiserror::Error)]
pub enum CliError {
    /// A scenario file could not be read or is invalid.
    #[error("{0}")]
    Scenario(#[from] ScenarioError),
    /// A command-line quantity is malformed.
    #[error("argument {argument}: {error}")]
    Quantity {
        /// The argument, e.g. `--pressure`.
        argument: String,
        /// What is wrong with it.
        error: UnitError,
    },
    /// A command-line argument is wrong in some other way.
    #[error("{0}")]
    Usage(String),
    /// Writing the report failed.
    #[error("cannot write the report: {0}")]
    Output(#[from] std::io::Error),
    /// Writing CSV failed.
    #[error("cannot write CSV: {0}")]
    Csv(#[from] csv::Error),
}

/// What a command reports back to `main`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Outcome {
    /// All well.
    Done,
    /// The design has a problem and `--strict` was given.
    DesignProblem,
}

/// Load and validate a scenario file into a design.
pub fn load_design(path: &Path) -> Result<Design, CliError> {
    let scenario = scenario::load_file(path)?;
    Ok(scenario.to_design()?)
}

/// Run a parsed command line, writing reports to `out`.
pub fn run(command: Command, out: &mut dyn Write) -> Result<Outcome, CliError> {
    match command {
        Command::Solve {
            file,
            out: o,
            strict,
        } => solve::run(&file, o, strict, out),
        Command::Table {
            file,
            points,
            out: o,
        } => table::run(&file, points as usize, o, out),
        Command::New { file, units, force } => new_scenario(&file, units.into(), force, out),
    }
}

fn new_scenario(
    path: &Path,
    units: UnitSystem,
    force: bool,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    if path.exists() && !force {
        return Err(CliError::Usage(format!(
            "{} already exists; choose another name or add --force (the old file is kept as .bak)",
            path.display()
        )));
    }
    scenario::save_atomic(path, &scenario::starter_text(units))?;
    writeln!(out, "wrote a starter scenario to {}", path.display())?;
    Ok(Outcome::Done)
}

/// The whole program after argument parsing; returns the exit status.
///
/// Without a command, `open_interface` is called with the file to open (or
/// `None` for the built-in example).
pub fn main_with(
    cli: Cli,
    open_interface: impl FnOnce(Option<PathBuf>) -> Result<(), String>,
) -> ExitCode {
    let stdout = std::io::stdout();
    let mut lock = stdout.lock();
    let result = match cli.command {
        Some(command) => run(command, &mut lock).map_err(|e| format!("{e:#}")),
        None => open_interface(cli.file).map(|()| Outcome::Done),
    };
    match result {
        Ok(Outcome::Done) => ExitCode::SUCCESS,
        Ok(Outcome::DesignProblem) => ExitCode::from(1),
        Err(message) => {
            let _ = lock.flush();
            eprintln!("spinwright: {message}");
            ExitCode::from(2)
        }
    }
}

/// Without a command: the solve report of the file (or the built-in example),
/// printed as text. The terminal interface replaces this on a terminal.
pub fn open_without_command(file: Option<PathBuf>) -> Result<(), String> {
    let design = match &file {
        Some(path) => load_design(path).map_err(|e| format!("{e:#}"))?,
        None => scenario::builtin_example()
            .to_design()
            .map_err(|e| format!("{e:#}"))?,
    };
    let report = crate::physics::balance::solve(&design);
    print!(
        "{}",
        solve::solve_text(&design, &report, UnitSystem::Metric)
    );
    Ok(())
}
