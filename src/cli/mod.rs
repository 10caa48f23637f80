//! The command line: a thin layer that reads scenarios, calls the physics
//! core and prints reports (text for a person, JSON or CSV for a script).
//!
//! Exit status: 0 success; 1 when `--strict` is given and the design has a
//! problem worth a script's attention (stalls, no equilibrium); 2 bad input,
//! with a message naming the file, line and field or the argument.

mod fit;
mod inverse;
mod layout;
mod log;
mod solve;
mod table;
pub mod text;
mod throw;

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
    /// Trajectories per nozzle, wetted radius and radial application profile.
    Throw {
        /// The scenario file.
        file: PathBuf,
        /// A measured wetted radius (e.g. 7.5m, 25ft): calibrate the drop sizes to it.
        #[arg(long)]
        measured: Option<String>,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Overlap of heads in a layout: CU, DU, application rate, depth map.
    Layout {
        /// The scenario file.
        file: PathBuf,
        /// Layout pattern, overriding the scenario's (needs --spacing).
        #[arg(long, value_enum)]
        pattern: Option<PatternArg>,
        /// Head spacing along a row (e.g. 9m, 30ft).
        #[arg(long)]
        spacing: Option<String>,
        /// Row spacing for a rectangle (e.g. 10m).
        #[arg(long)]
        rows: Option<String>,
        /// Soil intake rate (e.g. 10mm/h, 0.4in/h): warn and suggest cycle-and-soak above it.
        #[arg(long)]
        intake: Option<String>,
        /// Measured catch-can test (CSV) to rate beside the model.
        #[arg(long, value_name = "CSV")]
        catch_cans: Option<PathBuf>,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Field check: measured pressure and rotation against the design.
    Check {
        /// The scenario file of the unit's design.
        file: PathBuf,
        /// Measured inlet pressure (e.g. 2.8bar, 40psi).
        #[arg(long)]
        pressure: String,
        /// Measured speed, rpm.
        #[arg(long)]
        rpm: Option<f64>,
        /// Time of one turn (e.g. 1.5s).
        #[arg(long)]
        seconds_per_turn: Option<String>,
        /// Turns counted over --over TIME.
        #[arg(long)]
        turns: Option<f64>,
        /// Time of the counted turns, then of the caught volume (e.g. 14.2s).
        #[arg(long, action = clap::ArgAction::Append)]
        over: Vec<String>,
        /// Measured total flow (e.g. 12L/min, 3.2gpm).
        #[arg(long)]
        flow: Option<String>,
        /// Volume caught in a bucket over --over TIME (e.g. 5L).
        #[arg(long)]
        caught: Option<String>,
        /// Measured wetted radius (e.g. 7.5m).
        #[arg(long)]
        throw: Option<String>,
        /// Stopwatch resolution (default 0.2s).
        #[arg(long)]
        stopwatch: Option<String>,
        /// CSV without its header line, for appending to a log.
        #[arg(long)]
        no_header: bool,
        /// Append a dated row to this unit's log (CSV; created with a header if missing).
        #[arg(long, value_name = "CSV")]
        log: Option<PathBuf>,
        /// Date-time of the logged row, ISO 8601 (e.g. 2026-05-10T09:30; default now).
        #[arg(long, value_name = "TIME")]
        at: Option<String>,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Fit the running friction and brake to readings at several pressures.
    Fit {
        /// The scenario file of the unit's design.
        file: PathBuf,
        /// Readings CSV (or a unit's log): pressure_kPa|pressure_psi, rpm, optional flow_L_min|flow_gpm, time.
        #[arg(long, value_name = "CSV")]
        readings: PathBuf,
        /// Write the scenario with the fitted values here (an existing file is kept as .bak).
        #[arg(long)]
        out: Option<PathBuf>,
        /// Predict the speed at this pressure (e.g. 3bar, 45psi); may be repeated.
        #[arg(long, action = clap::ArgAction::Append)]
        at_pressure: Vec<String>,
        /// Which to fit: running, viscous, quadratic, comma-separated (default: as many as the readings allow).
        #[arg(long = "fit", value_name = "NAMES")]
        params: Option<String>,
        /// Format and units of the report.
        #[command(flatten)]
        output: Output,
    },
    /// Fit the dry running friction and brake from a coast-down with the water off.
    Coast {
        /// The scenario file of the unit's design.
        file: PathBuf,
        /// Seconds at each completed turn after shut-off, e.g. 0.9,1.9,3.0,4.2.
        #[arg(long, allow_hyphen_values = false)]
        turn_times: Option<String>,
        /// Or a CSV with time_s (seconds after shut-off) and rpm columns.
        #[arg(long, value_name = "CSV")]
        readings: Option<PathBuf>,
        /// Rotor inertia, overriding the design's (e.g. 0.0012kg·m2).
        #[arg(long)]
        inertia: Option<String>,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Find the design value that gives a target speed or wetted radius.
    Target {
        /// The scenario file.
        file: PathBuf,
        /// Wanted operating speed, rpm.
        #[arg(long)]
        rpm: Option<f64>,
        /// Wanted wetted radius (e.g. 8m).
        #[arg(long)]
        throw: Option<String>,
        /// What to adjust: deflection, elevation, radius, nozzle, viscous, quadratic (brake: viscous).
        #[arg(long)]
        adjust: String,
        /// Write the adjusted scenario here (an existing file is kept as .bak).
        #[arg(long)]
        out: Option<PathBuf>,
        /// Format and units of the report.
        #[command(flatten)]
        output: Output,
    },
    /// Sweep one or two parameters: --vary NAME=FROM:TO:STEPS.
    Sweep {
        /// The scenario file.
        file: PathBuf,
        /// A parameter and its range, e.g. deflection=0:60:13 or pressure=150kPa:400kPa:6.
        #[arg(long, required = true)]
        vary: Vec<String>,
        /// Also rate the scenario's layout at each point (CU).
        #[arg(long)]
        layout: bool,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Scenarios side by side: inputs that differ, key results, deltas.
    Compare {
        /// Two or more scenario files; the first is the reference.
        #[arg(required = true, num_args = 2..)]
        files: Vec<PathBuf>,
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

/// Layout patterns on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum PatternArg {
    /// Heads on a square grid S × S.
    Square,
    /// Heads S apart along rows L apart.
    Rectangle,
    /// Equilateral triangles of side S.
    Triangle,
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
        Command::Throw {
            file,
            measured,
            out: o,
        } => {
            let measured = measured
                .map(|m| quantity("--measured", crate::units::Dimension::Length, &m))
                .transpose()?;
            throw::run(&file, measured, o, out)
        }
        Command::Layout {
            file,
            pattern,
            spacing,
            rows,
            intake,
            catch_cans,
            out: o,
        } => {
            let args = layout::LayoutArgs {
                layout: layout_override(pattern, spacing.as_deref(), rows.as_deref())?,
                intake_mm_h: intake
                    .map(|i| quantity("--intake", crate::units::Dimension::ApplicationRate, &i))
                    .transpose()?
                    .map(|r| r * crate::physics::pattern::M_S_TO_MM_H),
                catch_cans,
                width: layout::terminal_width(),
            };
            layout::run(&file, &args, o, out)
        }
        Command::Check {
            file,
            pressure,
            rpm,
            seconds_per_turn,
            turns,
            over,
            flow,
            caught,
            throw,
            stopwatch,
            no_header,
            log,
            at,
            out: o,
        } => {
            let args = inverse::CheckArgs {
                pressure,
                rpm,
                seconds_per_turn,
                turns,
                over,
                flow,
                caught,
                throw,
                stopwatch,
                no_header,
                log,
                at,
            };
            inverse::run_check(&file, &args, o, out)
        }
        Command::Fit {
            file,
            readings,
            out: written,
            at_pressure,
            params,
            output,
        } => fit::run_fit(
            &file,
            &fit::FitArgs {
                readings,
                out: written,
                at_pressure,
                params,
            },
            output,
            out,
        ),
        Command::Coast {
            file,
            turn_times,
            readings,
            inertia,
            out: o,
        } => fit::run_coast(
            &file,
            &fit::CoastArgs {
                turn_times,
                readings,
                inertia,
            },
            o,
            out,
        ),
        Command::Target {
            file,
            rpm,
            throw,
            adjust,
            out: written,
            output,
        } => {
            let adjust = if adjust == "brake" {
                "viscous".to_string()
            } else {
                adjust
            };
            let args = inverse::TargetArgs {
                rpm,
                throw,
                adjust,
                out: written,
            };
            inverse::run_target(&file, &args, output, out)
        }
        Command::Sweep {
            file,
            vary,
            layout,
            out: o,
        } => inverse::run_sweep(&file, &vary, layout, o, out),
        Command::Compare { files, out: o } => inverse::run_compare(&files, o, out),
        Command::New { file, units, force } => new_scenario(&file, units.into(), force, out),
    }
}

/// Parse a quantity typed with units, naming the argument on error.
pub fn quantity(argument: &str, dim: crate::units::Dimension, text: &str) -> Result<f64, CliError> {
    crate::units::parse_quantity(dim, text).map_err(|error| CliError::Quantity {
        argument: argument.to_string(),
        error,
    })
}

fn layout_override(
    pattern: Option<PatternArg>,
    spacing: Option<&str>,
    rows: Option<&str>,
) -> Result<Option<crate::physics::design::Layout>, CliError> {
    use crate::physics::design::Layout;
    use crate::units::Dimension;
    let positive = |arg: &str, text: &str| -> Result<f64, CliError> {
        let v = quantity(arg, Dimension::Length, text)?;
        if v > 0.0 {
            Ok(v)
        } else {
            Err(CliError::Usage(format!(
                "{arg} {text}: a spacing must be more than zero"
            )))
        }
    };
    let Some(spacing) = spacing else {
        return match (pattern, rows) {
            (None, None) => Ok(None),
            _ => Err(CliError::Usage(
                "--pattern and --rows need --spacing".into(),
            )),
        };
    };
    let spacing_m = positive("--spacing", spacing)?;
    Ok(Some(match (pattern, rows) {
        (Some(PatternArg::Rectangle), Some(r)) | (None, Some(r)) => Layout::Rectangle {
            spacing_m,
            rows_m: positive("--rows", r)?,
        },
        (Some(PatternArg::Rectangle), None) => {
            return Err(CliError::Usage("--pattern rectangle needs --rows".into()))
        }
        (Some(PatternArg::Triangle), None) => Layout::Triangle { spacing_m },
        (Some(PatternArg::Square), None) => Layout::Square { spacing_m },
        (None, None) => Layout::Square { spacing_m },
        (Some(_), Some(_)) => {
            return Err(CliError::Usage(
                "--rows goes with --pattern rectangle".into(),
            ))
        }
    }))
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
    let (report, head) = solve::solve_with_throw(&design);
    print!(
        "{}",
        solve::solve_text(&design, &report, head.as_ref(), UnitSystem::Metric)
    );
    Ok(())
}
