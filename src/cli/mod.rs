//! The command line: a thin layer that reads scenarios, calls the physics
//! core and prints reports (text for a person, JSON or CSV for a script).
//!
//! Exit status: 0 success; 1 when `--strict` is given and the design has a
//! problem worth a script's attention (stalls, no equilibrium); 2 bad input,
//! with a message naming the file, line and field or the argument.

mod args;
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

pub use args::{Cli, Command, Format, Output, PatternArg, ShowArg, Units};
use values::{layout_override, spacing_goal};
pub use values::{
    positive_number, positive_quantity, positive_quantity_or_bare, positive_rpm, quantity,
};

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use crate::physics::design::Design;
use crate::scenario::{self, ScenarioError};
use crate::units::{UnitError, UnitSystem};

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

/// A scenario file read for a command that may write a changed design back
/// over it (`--out`): its text, kept for [`save_design_over`], and the
/// scenario read from it.
pub fn open_for_edit(path: &Path) -> Result<(String, scenario::Scenario), CliError> {
    let original = std::fs::read_to_string(path).map_err(|io| ScenarioError::Read {
        path: path.to_path_buf(),
        io,
    })?;
    let source = scenario::load_str(&original, &path.display().to_string())?;
    Ok((original, source))
}

/// Write `design` to `out` over `original`, the text of the scenario file
/// `from` it was read from: only the values that changed are edited, the
/// comments and the `notes` (the user's, kept as written) stay. When the text
/// cannot be edited in place the file is written anew, and a note on stderr
/// says so. Returns the path written, for the report (None when no `out`
/// was asked for: nothing is written then).
pub fn save_design_over(
    out: Option<&Path>,
    from: &Path,
    original: &str,
    notes: &str,
    design: &Design,
    units: UnitSystem,
) -> Result<Option<String>, CliError> {
    let Some(out) = out else {
        return Ok(None);
    };
    let new = scenario::Scenario::from_design(design, units, notes);
    let saved = scenario::save_scenario(out, Some(original), &new)?;
    if let scenario::Written::Rewritten(why) = &saved.written {
        // Rare (the text could not be edited in place): say so, as the
        // file's comments did not survive.
        eprintln!(
            "note: {} was written anew, without the comments of {}: {why}",
            out.display(),
            from.display()
        );
    }
    Ok(Some(out.display().to_string()))
}

/// A progress bar on stderr for `len` steps counted in `what` (`points`,
/// `starts`), when stderr is a terminal; `None` otherwise.
pub fn progress_bar(len: usize, what: &str) -> Option<indicatif::ProgressBar> {
    use std::io::IsTerminal;
    if !std::io::stderr().is_terminal() {
        return None;
    }
    let bar = indicatif::ProgressBar::new(len as u64);
    bar.set_style(
        indicatif::ProgressStyle::with_template(&format!(
            "{{bar:40}} {{pos}}/{{len}} {what}, {{eta}} left"
        ))
        .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
    );
    Some(bar)
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
