//! The command line: a thin layer that reads scenarios, calls the physics
//! core and prints reports (text for a person, JSON or CSV for a script).
//!
//! Exit status: 0 success; 1 when `--strict` is given and the design has a
//! problem worth a script's attention (stalls, no equilibrium); 2 bad input,
//! with a message naming the file, line and field or the argument.

mod check;
mod compare;
mod fit;
mod layout;
mod log;
mod report;
mod search;
mod solve;
mod sweep;
mod table;
mod target;
pub mod text;
mod throw;
mod values;

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
        /// Height of the lowest thing overhead (wire, branch, roof), e.g. 4m or
        /// 13ft: warn when a jet rises above it (overrides the file's `clearance`).
        #[arg(long, value_name = "HEIGHT")]
        clearance: Option<String>,
    },
    /// Torque–speed table from rest to past runaway.
    Table {
        /// The scenario file.
        file: PathBuf,
        /// Number of rows (2 to 100000).
        #[arg(long, default_value_t = 41, allow_negative_numbers = true, value_parser = clap::value_parser!(u32).range(2..=100_000))]
        points: u32,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Trajectories per nozzle, wetted radius and radial application profile.
    Throw {
        /// The scenario file.
        file: PathBuf,
        /// A measured wetted radius (e.g. 7.5m, 25ft): calibrate the jet breakup to it.
        #[arg(long, allow_hyphen_values = true)]
        measured: Option<String>,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Overlap of heads in a layout: CU, DU, application rate, rate map.
    Layout {
        /// The scenario file.
        file: PathBuf,
        /// Layout pattern, overriding the scenario's (needs --spacing).
        #[arg(long, value_enum)]
        pattern: Option<PatternArg>,
        /// Head spacing along a row (e.g. 9m, 30ft).
        #[arg(long, allow_hyphen_values = true)]
        spacing: Option<String>,
        /// Row spacing for a rectangle (e.g. 10m).
        #[arg(long, allow_hyphen_values = true)]
        rows: Option<String>,
        /// Soil intake rate (e.g. 10mm/h, 0.4in/h): warn and suggest cycle-and-soak above it.
        #[arg(long, allow_hyphen_values = true)]
        intake: Option<String>,
        /// Measured catch-can test (CSV) to rate beside the model.
        #[arg(long, value_name = "CSV")]
        catch_cans: Option<PathBuf>,
        /// Fit the spray (jet breakup) to the catch-can leg and report the layout from the fitted model.
        #[arg(long, requires = "catch_cans")]
        fit: bool,
        /// With --fit: fit the median drop size d50 as well.
        #[arg(long, requires = "fit")]
        fit_d50: bool,
        /// Depth the driest quarter should get each watering (e.g. 12mm, 0.5in): the run time and cycles for it.
        #[arg(long, value_name = "DEPTH")]
        target_depth: Option<String>,
        /// Recommend the largest spacing of each pattern meeting the goal (--cu, default 85 %, or --du), in calm air and in the scenario's wind.
        #[arg(long)]
        recommend: bool,
        /// CU goal of --recommend, % (e.g. 85).
        #[arg(
            long,
            requires = "recommend",
            conflicts_with = "du",
            value_name = "PERCENT"
        )]
        cu: Option<String>,
        /// Low-quarter DU goal of --recommend, % (e.g. 75).
        #[arg(long, requires = "recommend", value_name = "PERCENT")]
        du: Option<String>,
        /// Format and units of the report.
        #[command(flatten)]
        out: Output,
    },
    /// Field check: measured pressure and rotation against the design.
    Check {
        /// The scenario file of the unit's design.
        file: PathBuf,
        /// Measured inlet pressure (e.g. 2.8bar, 40psi).
        #[arg(long, allow_hyphen_values = true)]
        pressure: String,
        /// Measured speed: rpm as a bare number (40) or with a unit (40rpm, 4.2rad/s).
        #[arg(long, allow_hyphen_values = true)]
        rpm: Option<String>,
        /// Time of one turn: seconds as a bare number (1.5) or with a unit (1.5s).
        #[arg(long, allow_hyphen_values = true)]
        seconds_per_turn: Option<String>,
        /// Turns counted over --over TIME (a bare number).
        #[arg(long, allow_hyphen_values = true)]
        turns: Option<String>,
        /// Time of the counted turns, then of the caught volume (e.g. 14.2s).
        #[arg(long, action = clap::ArgAction::Append, allow_hyphen_values = true)]
        over: Vec<String>,
        /// Measured total flow (e.g. 12L/min, 3.2gpm).
        #[arg(long, allow_hyphen_values = true)]
        flow: Option<String>,
        /// Volume caught in a bucket over --over TIME (e.g. 5L).
        #[arg(long, allow_hyphen_values = true)]
        caught: Option<String>,
        /// Measured wetted radius (e.g. 7.5m).
        #[arg(long, allow_hyphen_values = true)]
        throw: Option<String>,
        /// Stopwatch resolution for --seconds-per-turn and --turns (default 0.2s).
        #[arg(long, allow_hyphen_values = true)]
        stopwatch: Option<String>,
        /// CSV without its header line, for appending to a log (with --format csv).
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
        /// Wanted operating speed: rpm as a bare number (30) or with a unit (30rpm).
        #[arg(long, allow_hyphen_values = true)]
        rpm: Option<String>,
        /// Wanted wetted radius (e.g. 8m).
        #[arg(long, allow_hyphen_values = true)]
        throw: Option<String>,
        /// What to adjust: deflection, elevation, radius, nozzle, viscous, quadratic (brake: viscous); two, comma-separated (A,B), with --rpm and --throw: A for the throw, B for the speed.
        #[arg(long)]
        adjust: String,
        /// Write the adjusted scenario here (an existing file is kept as .bak).
        #[arg(long)]
        out: Option<PathBuf>,
        /// Exit with status 1 when nothing in the range meets the target.
        #[arg(long)]
        strict: bool,
        /// Format and units of the report.
        #[command(flatten)]
        output: Output,
    },
    /// Sweep one or two design inputs: --vary NAME=FROM..TO --points N.
    Sweep {
        /// The scenario file.
        file: PathBuf,
        /// An input and its range, e.g. deflection=0..60 or pressure=150kPa..400kPa (any catalogue input).
        #[arg(long, required = true, allow_hyphen_values = true)]
        vary: Vec<String>,
        /// Points along each axis, both ends included: N, or N,M for two axes (default 11).
        #[arg(long, default_value = "11")]
        points: String,
        /// Also rate the scenario's layout at each point (CU).
        #[arg(long)]
        layout: bool,
        /// What a two-axis grid shows (default rpm).
        #[arg(long, value_enum)]
        show: Option<ShowArg>,
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
    /// Write the design as one self-contained HTML page: inputs, operating point, warnings, charts.
    Report {
        /// The scenario file.
        file: PathBuf,
        /// The page to write (an existing file is kept as .bak).
        #[arg(long, value_name = "HTML")]
        out: PathBuf,
        /// Unit system of the numbers on the page.
        #[arg(long, value_enum, default_value_t = Units::Metric)]
        units: Units,
    },
    /// Search free inputs for a design that meets goals and maximises an objective.
    Search(search::SearchArgs),
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

/// The figure a two-axis sweep grid shows.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum ShowArg {
    /// Operating speed, rpm.
    Rpm,
    /// Wetted radius.
    Throw,
    /// CU on the scenario's layout, % (needs --layout).
    Cu,
    /// Total flow.
    Flow,
    /// Start margin (stall over breakaway torque).
    Margin,
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

impl CliError {
    /// Whether this is a write to a closed pipe (`spinwright table … | head -1`):
    /// the reader has all it wanted, which is not an error.
    pub fn is_broken_pipe(&self) -> bool {
        match self {
            CliError::Output(e) => e.kind() == std::io::ErrorKind::BrokenPipe,
            CliError::Csv(e) => match e.kind() {
                csv::ErrorKind::Io(io) => io.kind() == std::io::ErrorKind::BrokenPipe,
                _ => false,
            },
            _ => false,
        }
    }
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
            clearance,
        } => {
            let clearance_m = clearance
                .map(|c| {
                    let h = quantity("--clearance", crate::units::Dimension::Length, &c)?;
                    if h > 0.0 {
                        Ok(h)
                    } else {
                        Err(CliError::Usage(format!(
                            "--clearance {c}: give the height above ground of the lowest thing \
                             overhead, more than zero (e.g. 4m or 13ft)"
                        )))
                    }
                })
                .transpose()?;
            solve::run(&file, o, strict, clearance_m, out)
        }
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
                .map(|m| {
                    positive_quantity(
                        "--measured",
                        crate::units::Dimension::Length,
                        &m,
                        "a wetted radius",
                    )
                })
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
            fit,
            fit_d50,
            target_depth,
            recommend,
            cu,
            du,
            out: o,
        } => {
            let recommend = if recommend {
                Some(layout::RecommendArgs {
                    goal: spacing_goal(cu.as_deref(), du.as_deref())?,
                    pattern,
                    rows_m: rows
                        .as_deref()
                        .map(|r| {
                            positive_quantity(
                                "--rows",
                                crate::units::Dimension::Length,
                                r,
                                "a spacing",
                            )
                        })
                        .transpose()?,
                })
            } else {
                None
            };
            // With --recommend and no --spacing, --pattern and --rows shape
            // the recommendation alone.
            let (pattern, rows) = if recommend.is_some() && spacing.is_none() {
                (None, None)
            } else {
                (pattern, rows)
            };
            let target_depth_mm = match target_depth {
                Some(t) => {
                    let m = quantity("--target-depth", crate::units::Dimension::SmallLength, &t)?;
                    if m <= 0.0 {
                        return Err(CliError::Usage(format!(
                            "--target-depth {t}: a depth must be more than zero"
                        )));
                    }
                    Some(1000.0 * m)
                }
                None => None,
            };
            let args = layout::LayoutArgs {
                layout: layout_override(pattern, spacing.as_deref(), rows.as_deref())?,
                intake_mm_h: intake
                    .map(|i| {
                        positive_quantity(
                            "--intake",
                            crate::units::Dimension::ApplicationRate,
                            &i,
                            "a soil intake rate",
                        )
                    })
                    .transpose()?
                    .map(|r| r * crate::physics::pattern::M_S_TO_MM_H),
                catch_cans,
                fit,
                fit_d50,
                target_depth_mm,
                width: layout::terminal_width(),
                colour: layout::colour_wanted(),
                recommend,
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
            let args = check::CheckArgs {
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
            check::run_check(&file, &args, o, out)
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
            strict,
            output,
        } => {
            let adjust = if adjust == "brake" {
                "viscous".to_string()
            } else {
                adjust
            };
            let args = target::TargetArgs {
                rpm,
                throw,
                adjust,
                out: written,
                strict,
            };
            target::run_target(&file, &args, output, out)
        }
        Command::Sweep {
            file,
            vary,
            points,
            layout,
            show,
            out: o,
        } => sweep::run_sweep(
            &file,
            &sweep::SweepArgs {
                vary,
                points,
                layout,
                show,
            },
            o,
            out,
        ),
        Command::Compare { files, out: o } => compare::run_compare(&files, o, out),
        Command::Report {
            file,
            out: page,
            units,
        } => report::run(&file, &page, units.into(), out),
        Command::Search(args) => search::run(&args, out),
        Command::New { file, units, force } => new_scenario(&file, units.into(), force, out),
    }
}

/// Parse a quantity typed with units, naming the argument on error.
///
/// This is the parser the terminal interface uses for typed values
/// ([`crate::units::parse_quantity`]), so `2.8bar`, `45psi`, `30rpm` and
/// `1.5s` read the same in both.
pub fn quantity(argument: &str, dim: crate::units::Dimension, text: &str) -> Result<f64, CliError> {
    crate::units::parse_quantity(dim, text).map_err(|error| CliError::Quantity {
        argument: argument.to_string(),
        error,
    })
}

/// A quantity that must be more than zero (a reading, a spacing, a target),
/// in SI. `what` names it in the message (`the measured pressure`).
pub fn positive_quantity(
    argument: &str,
    dim: crate::units::Dimension,
    text: &str,
    what: &str,
) -> Result<f64, CliError> {
    let v = quantity(argument, dim, text)?;
    must_be_positive(argument, text, what, v)
}

/// A quantity whose argument names its unit (`--rpm`, `--seconds-per-turn`):
/// a bare number is in that unit (`bare_si` SI per unit), a number with a
/// unit is read as any other quantity. Must be more than zero. SI.
pub fn positive_quantity_or_bare(
    argument: &str,
    dim: crate::units::Dimension,
    text: &str,
    bare_si: f64,
    what: &str,
) -> Result<f64, CliError> {
    let v = match text.trim().parse::<f64>() {
        Ok(bare) => bare * bare_si,
        Err(_) => quantity(argument, dim, text)?,
    };
    must_be_positive(argument, text, what, v)
}

/// A speed argument (`--rpm 40`, `--rpm 40rpm`, `--rpm 4.2rad/s`) in rpm,
/// more than zero. `40rpm` gives exactly 40, not 40 through rad/s and back.
pub fn positive_rpm(argument: &str, text: &str, what: &str) -> Result<f64, CliError> {
    use crate::units::factor::RPM_RAD_S;
    let rad_s = positive_quantity_or_bare(
        argument,
        crate::units::Dimension::AngularSpeed,
        text,
        RPM_RAD_S,
        what,
    )?;
    Ok(crate::scenario::tags::tidy(rad_s / RPM_RAD_S))
}

/// A bare positive number (a count of turns).
pub fn positive_number(argument: &str, text: &str, what: &str) -> Result<f64, CliError> {
    let v = text.trim().parse::<f64>().map_err(|_| {
        CliError::Usage(format!(
            "{argument} {text}: {what} is a bare number (e.g. {argument} 10)"
        ))
    })?;
    must_be_positive(argument, text, what, v)
}

fn must_be_positive(argument: &str, text: &str, what: &str, v: f64) -> Result<f64, CliError> {
    if !v.is_finite() {
        Err(CliError::Usage(format!(
            "{argument} {text}: {what} must be a finite number"
        )))
    } else if v <= 0.0 {
        Err(CliError::Usage(format!(
            "{argument} {text}: {what} must be more than zero"
        )))
    } else {
        Ok(v)
    }
}

/// The uniformity goal of `layout --recommend`: `--cu` or `--du` in %,
/// CU 85 % when neither is given.
fn spacing_goal(
    cu: Option<&str>,
    du: Option<&str>,
) -> Result<crate::physics::layout::SpacingGoal, CliError> {
    use crate::physics::layout::SpacingGoal;
    let percent = |arg: &str, text: &str| -> Result<f64, CliError> {
        let t = text.trim().trim_end_matches('%').trim();
        match t.parse::<f64>() {
            Ok(v) if v.is_finite() && v > 0.0 && v <= 100.0 => Ok(v),
            _ => Err(CliError::Usage(format!(
                "{arg} {text}: a goal in percent above 0 and at most 100 (e.g. {arg} 85)"
            ))),
        }
    };
    Ok(match (cu, du) {
        (_, Some(d)) => SpacingGoal::DuLq(percent("--du", d)?),
        (Some(c), None) => SpacingGoal::Cu(percent("--cu", c)?),
        (None, None) => SpacingGoal::Cu(85.0),
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
        positive_quantity(arg, Dimension::Length, text, "a spacing")
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
    let result = match (cli.command, cli.file) {
        (Some(_), Some(file)) => Err(format!(
            "{}: a file before the command only opens the interface; give it after the command (spinwright solve FILE)",
            file.display()
        )),
        (Some(command), None) => match run(command, &mut lock).and_then(|outcome| {
            lock.flush()?;
            Ok(outcome)
        }) {
            // The reader closed the pipe (`| head`): it has what it wanted.
            Err(e) if e.is_broken_pipe() => Ok(Outcome::Done),
            other => other.map_err(|e| format!("{e:#}")),
        },
        (None, file) => open_interface(file).map(|()| Outcome::Done),
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
    let text = solve::solve_text(&design, &report, head.as_ref(), UnitSystem::Metric);
    let mut stdout = std::io::stdout().lock();
    match stdout
        .write_all(text.as_bytes())
        .and_then(|()| stdout.flush())
    {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => {
            Err(format!("cannot write the report: {e}"))
        }
        _ => Ok(()),
    }
}
