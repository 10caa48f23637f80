//! The command line's arguments as clap reads them: the commands, their
//! options, and the format and unit choices they share.

use std::path::PathBuf;

use clap::{Args, Parser, Subcommand, ValueEnum};

use super::search;
use crate::units::UnitSystem;

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
