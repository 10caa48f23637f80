//! The inverse uses on the command line: `check` (a unit in the field),
//! `target` (the design value that gives a wanted speed or throw), `sweep`
//! (one or two parameters over ranges) and `compare` (designs side by side).

use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};

use serde::Serialize;

use super::text::{csv_number, sig, TextTable};
use super::{
    load_design, positive_number, positive_quantity, positive_quantity_or_bare, positive_rpm,
    quantity, CliError, Format, Outcome, Output, ShowArg,
};
use crate::catalogue::{self, Input};
use crate::inverse::compare::{compare_with_coverage, Comparison, InputValue};
use crate::inverse::field::{
    check, Alone, Cause, CauseEvidence, FieldCheck, FieldReading, FieldTolerances, FlowReading,
    NozzleAlone, RotationReading, ThrowReading,
};
use crate::inverse::sweep::{sweep_with, SweepAxis};
use crate::inverse::target::{target, Goal, TargetResult};
use crate::physics::balance::{solve, SpinReport};
use crate::physics::coverage::{head_throw, layout_overlap, wetted_radius_m};
use crate::physics::design::Design;
use crate::physics::layout::OverlapOptions;
use crate::physics::pattern::PatternOptions;
use crate::report::field as words;
use crate::scenario::{self, save_scenario, Scenario};
use crate::units::{csv_key, format_quantity, to_display, unit_label, Dimension as D, UnitSystem};

/// The dimension an input's values are typed in, `None` for a bare number
/// (coefficients, and brakes, which are SI in both unit systems).
pub fn parameter_dimension(p: &Input) -> Option<D> {
    p.unit.dimension()
}

/// A value of parameter `p` typed on the command line, in SI. Angles may be
/// bare numbers (degrees); brake and friction coefficients are bare SI numbers.
pub fn parameter_value(argument: &str, p: &Input, text: &str) -> Result<f64, CliError> {
    let text = text.trim();
    match parameter_dimension(p) {
        None => text
            .parse::<f64>()
            .ok()
            .filter(|v| v.is_finite())
            .ok_or_else(|| {
                CliError::Usage(format!(
                    "{argument}: `{text}` is not a number ({} takes a bare number)",
                    p.vary_name()
                ))
            }),
        Some(dim) => match text.parse::<f64>() {
            Ok(deg) if dim == D::Angle && deg.is_finite() => Ok(deg.to_radians()),
            _ => quantity(argument, dim, text),
        },
    }
}

/// Largest number of points along one sweep axis.
pub const MAX_POINTS: usize = 100_000;

/// Parse `--points N` or `--points N,M`: the points along each of `axes`
/// axes (one number serves every axis).
pub fn parse_points(text: &str, axes: usize) -> Result<Vec<usize>, CliError> {
    let bad = |why: String| CliError::Usage(format!("--points {text}: {why}"));
    let counts = text
        .split(',')
        .map(|t| {
            t.trim()
                .parse::<usize>()
                .ok()
                .filter(|n| (1..=MAX_POINTS).contains(n))
                .ok_or_else(|| {
                    bad(format!(
                        "`{}` is not a whole number from 1 to {MAX_POINTS}",
                        t.trim()
                    ))
                })
        })
        .collect::<Result<Vec<_>, _>>()?;
    match (counts.as_slice(), axes) {
        ([n], k) => Ok(vec![*n; k]),
        (c, k) if c.len() == k => Ok(c.to_vec()),
        (c, k) => Err(bad(format!(
            "{} counts for {k} --vary axis{}; give one, or one per axis",
            c.len(),
            if k == 1 { "" } else { "es" }
        ))),
    }
}

/// A `NAME=FROM..TO` argument as written.
pub struct NamedRange<'t> {
    /// The catalogue input it names.
    pub input: &'static Input,
    /// The text after `=`.
    pub range: &'t str,
    /// The two ends, when the range has a `..`.
    pub ends: Option<(&'t str, &'t str)>,
}

/// Reads a `NAME=FROM..TO` argument of `option`; a range without `..` is left
/// for the caller to refuse in its own words. `example` closes the messages
/// (`e.g. --vary deflection=0..60 --points 13`).
pub fn named_range<'t>(
    option: &str,
    text: &'t str,
    example: &str,
) -> Result<NamedRange<'t>, CliError> {
    let (name, range) = text.split_once('=').ok_or_else(|| {
        CliError::Usage(format!(
            "{option} {text}: no `=` (write NAME=FROM..TO, {example})"
        ))
    })?;
    let input = catalogue::by_vary_name(name.trim()).ok_or_else(|| {
        CliError::Usage(format!(
            "{option} {text}: unknown input `{}`; known: {}",
            name.trim(),
            catalogue::varied()
                .map(|p| p.vary_name())
                .collect::<Vec<_>>()
                .join(", ")
        ))
    })?;
    Ok(NamedRange {
        input,
        range,
        ends: range.split_once(".."),
    })
}

/// Parse `NAME=FROM..TO` into an axis of `points` values. The old form
/// `NAME=FROM:TO:STEPS` is refused with the new spelling in the message.
pub fn parse_axis(text: &str, points: usize) -> Result<SweepAxis, CliError> {
    let example = "e.g. --vary deflection=0..60 --points 13";
    let bad = |why: &str| {
        CliError::Usage(format!(
            "--vary {text}: {why} (write NAME=FROM..TO, {example})"
        ))
    };
    let NamedRange {
        input: parameter,
        range,
        ends,
    } = named_range("--vary", text, example)?;
    let Some((from, to)) = ends else {
        let parts: Vec<&str> = range.split(':').collect();
        if let [from, to, steps] = parts.as_slice() {
            return Err(CliError::Usage(format!(
                "--vary {text}: a range is now written FROM..TO with the number of points apart: \
                 --vary {}={}..{} --points {}",
                text.split_once('=').map_or("", |(name, _)| name.trim()),
                from.trim(),
                to.trim(),
                steps.trim()
            )));
        }
        return Err(bad("expected FROM..TO"));
    };
    if points == 0 || points > MAX_POINTS {
        return Err(bad("the number of points must be 1 to 100000"));
    }
    Ok(SweepAxis {
        input: parameter,
        from: parameter_value("--vary", parameter, from)?,
        to: parameter_value("--vary", parameter, to)?,
        steps: points,
    })
}

/// Labels for the values of one axis, all at one precision: the fewest
/// decimals (up to 6) that tell neighbours apart and put every label within
/// 1 % of a step of its value.
pub fn axis_labels(values: &[f64]) -> Vec<String> {
    let step = values
        .windows(2)
        .filter_map(|w| match w {
            [a, b] => Some((b - a).abs()),
            _ => None,
        })
        .filter(|d| *d > 0.0)
        .fold(f64::INFINITY, f64::min);
    let scale = values.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    let tolerance = if step.is_finite() {
        0.01 * step
    } else {
        5e-4 * scale.max(1e-12)
    };
    let label = |v: f64, d: usize| {
        let t = format!("{v:.d$}");
        if t.trim_start_matches('-')
            .chars()
            .all(|c| c == '0' || c == '.')
        {
            t.trim_start_matches('-').to_string()
        } else {
            t
        }
    };
    for d in 0..=6 {
        let labels: Vec<String> = values.iter().map(|&v| label(v, d)).collect();
        let close = values
            .iter()
            .zip(&labels)
            .all(|(v, l)| l.parse::<f64>().is_ok_and(|x| (x - v).abs() <= tolerance));
        if close {
            return labels;
        }
    }
    values.iter().map(|&v| label(v, 6)).collect()
}

/// How the rotation was read.
#[derive(Debug, Clone, Default)]
pub struct CheckArgs {
    /// Inlet pressure as typed.
    pub pressure: String,
    /// Speed as typed: rpm bare (`40`) or with a unit (`40rpm`).
    pub rpm: Option<String>,
    /// Time of one turn as typed: seconds bare (`1.5`) or with a unit.
    pub seconds_per_turn: Option<String>,
    /// Turns counted, as typed (a bare number).
    pub turns: Option<String>,
    /// The `--over` times, in order: first for --turns, then for --caught.
    pub over: Vec<String>,
    /// Measured flow as typed.
    pub flow: Option<String>,
    /// Caught volume as typed.
    pub caught: Option<String>,
    /// Measured wetted radius as typed.
    pub throw: Option<String>,
    /// Stopwatch resolution as typed.
    pub stopwatch: Option<String>,
    /// Leave the CSV header out (for appending to a log).
    pub no_header: bool,
    /// A unit's log to append a dated row to.
    pub log: Option<PathBuf>,
    /// The date-time of the row (ISO 8601; now when left out).
    pub at: Option<String>,
}

fn reading(args: &CheckArgs, format: Format) -> Result<FieldReading, CliError> {
    if args.no_header && format != Format::Csv {
        return Err(CliError::Usage(
            "--no-header goes with --format csv (it leaves out the CSV header line)".into(),
        ));
    }
    let pressure = positive_quantity(
        "--pressure",
        D::Pressure,
        &args.pressure,
        "the measured gauge pressure",
    )?;
    let stopwatch = args
        .stopwatch
        .as_deref()
        .map(|s| {
            let v = quantity("--stopwatch", D::Time, s)?;
            if v.is_finite() && v >= 0.0 {
                Ok(v)
            } else {
                Err(CliError::Usage(format!(
                    "--stopwatch {s}: a stopwatch resolution must be zero or more"
                )))
            }
        })
        .transpose()?;
    let mut over = args.over.iter();
    let mut next_over = |what: &str| -> Result<f64, CliError> {
        let text = over.next().ok_or_else(|| {
            CliError::Usage(format!("{what} needs --over TIME (e.g. --over 14.2s)"))
        })?;
        positive_quantity("--over", D::Time, text, "a timed interval")
    };
    let mut rotation =
        match (&args.rpm, &args.seconds_per_turn, &args.turns) {
            (Some(r), None, None) => {
                RotationReading::rpm(positive_rpm("--rpm", r, "the measured speed")?)
            }
            (None, Some(s), None) => RotationReading::seconds_per_turn(positive_quantity_or_bare(
                "--seconds-per-turn",
                D::Time,
                s,
                1.0,
                "the time of one turn",
            )?),
            (None, None, Some(n)) => RotationReading::turns_over(
                positive_number("--turns", n, "the number of turns counted")?,
                next_over("--turns")?,
            ),
            (None, None, None) => return Err(CliError::Usage(
                "give the rotation: --rpm 40, --seconds-per-turn 1.5s, or --turns 10 --over 14.2s"
                    .into(),
            )),
            _ => {
                return Err(CliError::Usage(
                    "give the rotation one way only: --rpm, --seconds-per-turn or --turns".into(),
                ))
            }
        };
    if let Some(res) = stopwatch {
        match &mut rotation {
            RotationReading::SecondsPerTurn {
                stopwatch_resolution_s,
                ..
            }
            | RotationReading::TurnsOver {
                stopwatch_resolution_s,
                ..
            } => *stopwatch_resolution_s = res,
            RotationReading::Rpm { .. } => {
                return Err(CliError::Usage(
                    "--stopwatch goes with --seconds-per-turn or --turns; an --rpm reading is not timed"
                        .into(),
                ))
            }
        }
    }
    let flow = match (&args.flow, &args.caught) {
        (Some(q), None) => Some(FlowReading::rate(positive_quantity(
            "--flow",
            D::Flow,
            q,
            "the measured flow",
        )?)),
        (None, Some(v)) => {
            let volume = positive_quantity("--caught", D::Volume, v, "the caught volume")?;
            Some(FlowReading::caught(volume, next_over("--caught")?))
        }
        (None, None) => None,
        _ => {
            return Err(CliError::Usage(
                "give the flow one way only: --flow or --caught … --over …".into(),
            ))
        }
    };
    // Every --over is used: the first by --turns (when given), the next by --caught.
    if let Some(extra) = over.next() {
        let uses = match (args.turns.is_some(), args.caught.is_some()) {
            (true, true) => "--turns and --caught take one --over each",
            (true, false) => "--turns takes one --over; a second needs --caught VOLUME",
            (false, true) => "--caught takes one --over; another needs --turns COUNT",
            (false, false) => "--over times --turns or --caught, and neither is given",
        };
        return Err(CliError::Usage(format!(
            "--over {extra} is not used: {uses}"
        )));
    }
    let throw = args
        .throw
        .as_deref()
        .map(|t| positive_quantity("--throw", D::Length, t, "the measured wetted radius"))
        .transpose()?
        .map(ThrowReading::new);
    Ok(FieldReading {
        flow,
        throw,
        ..FieldReading::new(pressure, rotation)
    })
}

#[derive(Debug, Serialize)]
struct CheckJson {
    scenario: String,
    inlet_pressure_pa: f64,
    design_inlet_pressure_pa: f64,
    design_rpm: Option<f64>,
    expected_rpm: Option<f64>,
    measured_rpm: f64,
    measured_rpm_band: [f64; 2],
    deviation_percent: Option<f64>,
    direction: Option<&'static str>,
    implied_running_torque_n_m: Option<f64>,
    design_running_torque_n_m: Option<f64>,
    implied_nozzle_diameter_m: Option<f64>,
    nominal_nozzle_diameter_m: Option<f64>,
    measured_flow_m3_s: Option<f64>,
    expected_throw_m: Option<f64>,
    measured_throw_m: Option<f64>,
    resisting_n_m: SplitJson,
    causes: Vec<CauseJson>,
    findings: Vec<FindingJson>,
}

#[derive(Debug, Serialize)]
struct SplitJson {
    bearing_n_m: f64,
    seal_n_m: f64,
    brake_n_m: f64,
    air_n_m: f64,
    drive_n_m: f64,
    excess_n_m: f64,
}

#[derive(Debug, Serialize)]
struct CauseJson {
    cause: &'static str,
    explains_rpm: Option<f64>,
    impossible: bool,
    design_n_m: Option<f64>,
    share: Option<f64>,
    factor_alone: Option<f64>,
    needed_n_m: Option<f64>,
    nozzle_scale: Option<f64>,
    text: String,
}

#[derive(Debug, Serialize)]
struct FindingJson {
    kind: &'static str,
    finding: String,
    evidence: String,
    fault: bool,
}

fn cause_json(c: &Cause, dev: Option<f64>, units: UnitSystem) -> CauseJson {
    let (design_n_m, share, factor, needed, scale) = match c.evidence {
        CauseEvidence::Part {
            design_n_m,
            share,
            alone,
            ..
        } => {
            let (f, n) = match alone {
                Alone::Factor { factor, needed_n_m } => (Some(factor), Some(needed_n_m)),
                Alone::Added { needed_n_m } => (None, Some(needed_n_m)),
                Alone::NegativeFriction | Alone::Absent => (None, None),
            };
            (Some(design_n_m), Some(share), f, n, None)
        }
        CauseEvidence::NozzleFromFlow { scale, .. }
        | CauseEvidence::NozzleUnmeasured(NozzleAlone::Clogged { scale, .. }) => {
            (None, None, None, None, Some(scale))
        }
        _ => (None, None, None, None, None),
    };
    CauseJson {
        cause: c.kind.key(),
        explains_rpm: c.explains_rpm,
        impossible: c.impossible(),
        design_n_m,
        share,
        factor_alone: factor,
        needed_n_m: needed,
        nozzle_scale: scale,
        text: words::cause_text(c, dev, units),
    }
}

fn check_json(design: &Design, c: &FieldCheck, units: UnitSystem) -> CheckJson {
    let dev = words::deviation_rpm(c);
    let p = c.split.parts;
    CheckJson {
        scenario: design.name.clone(),
        inlet_pressure_pa: c.inlet_pressure_pa,
        design_inlet_pressure_pa: c.design_inlet_pressure_pa,
        design_rpm: c.design_rpm,
        expected_rpm: c.expected_rpm,
        measured_rpm: c.measured_rpm,
        measured_rpm_band: c.measured_rpm_band,
        deviation_percent: c.deviation_percent,
        direction: c
            .findings
            .first()
            .and_then(|f| f.direction())
            .map(|d| d.key()),
        implied_running_torque_n_m: c
            .friction
            .map(|f| f.implied_running_torque_n_m)
            .filter(|t| *t >= 0.0),
        design_running_torque_n_m: c.friction.map(|f| f.design_running_torque_n_m),
        implied_nozzle_diameter_m: c.flow.as_ref().and_then(|f| f.implied_effective_diameter_m),
        nominal_nozzle_diameter_m: c.flow.as_ref().map(|f| f.nominal_effective_diameter_m),
        measured_flow_m3_s: c.flow.as_ref().map(|f| f.measured_m3_s),
        expected_throw_m: c.throw.and_then(|t| t.expected_m),
        measured_throw_m: c.throw.map(|t| t.measured_m),
        resisting_n_m: SplitJson {
            bearing_n_m: p.bearing_n_m,
            seal_n_m: p.seal_n_m,
            brake_n_m: p.brake_n_m,
            air_n_m: p.air_n_m,
            drive_n_m: c.split.drive_n_m,
            excess_n_m: c.split.excess_n_m,
        },
        causes: c.causes.iter().map(|k| cause_json(k, dev, units)).collect(),
        findings: c
            .findings
            .iter()
            .map(|f| FindingJson {
                kind: f.kind.key(),
                finding: words::finding_text(f, units),
                evidence: words::finding_evidence(f, units),
                fault: f.fault,
            })
            .collect(),
    }
}

fn throw_of(design: &Design) -> Option<f64> {
    wetted_radius_m(design, &solve(design)).ok()
}

/// The text report of a field check.
pub fn check_text(design: &Design, c: &FieldCheck, units: UnitSystem) -> String {
    words::check_text(&design.name, c, units)
}

/// Run `check`.
pub fn run_check(
    path: &Path,
    args: &CheckArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let design = load_design(path)?;
    let reading = reading(args, o.format)?;
    let result = check(
        &design,
        &reading,
        &FieldTolerances::default(),
        Some(&throw_of),
    )
    .map_err(|e| CliError::Usage(e.to_string()))?;
    let units: UnitSystem = o.units.into();
    if let Some(log) = &args.log {
        super::log::append(log, &result, args.at.as_deref(), units)?;
    } else if args.at.is_some() {
        return Err(CliError::Usage("--at goes with --log FILE".into()));
    }
    match o.format {
        Format::Json => {
            serde_json::to_writer_pretty(&mut *out, &check_json(&design, &result, units))
                .map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Text => {
            write!(out, "{}", check_text(&design, &result, units))?;
            if let Some(log) = &args.log {
                writeln!(out, "appended a row to the log {}", log.display())?;
            }
        }
        Format::Csv => {
            let j = check_json(&design, &result, units);
            let mut w = csv::WriterBuilder::new()
                .has_headers(false)
                .from_writer(out);
            // (column name, dimension, SI value): shown in the chosen units,
            // the unit in the column name.
            let dims: [(&str, Option<D>, Option<f64>); 12] = [
                (
                    "inlet_pressure",
                    Some(D::Pressure),
                    Some(j.inlet_pressure_pa),
                ),
                ("measured_rpm", None, Some(j.measured_rpm)),
                (
                    "measured_rpm_lo",
                    None,
                    j.measured_rpm_band.first().copied(),
                ),
                ("measured_rpm_hi", None, j.measured_rpm_band.get(1).copied()),
                ("expected_rpm", None, j.expected_rpm),
                ("deviation_percent", None, j.deviation_percent),
                (
                    "implied_running_torque",
                    Some(D::Torque),
                    j.implied_running_torque_n_m,
                ),
                (
                    "design_running_torque",
                    Some(D::Torque),
                    j.design_running_torque_n_m,
                ),
                ("measured_flow", Some(D::Flow), j.measured_flow_m3_s),
                (
                    "implied_nozzle_diameter",
                    Some(D::SmallLength),
                    j.implied_nozzle_diameter_m,
                ),
                ("measured_throw", Some(D::Length), j.measured_throw_m),
                ("expected_throw", Some(D::Length), j.expected_throw_m),
            ];
            if !args.no_header {
                let mut header = vec!["scenario".to_string()];
                header.extend(dims.iter().map(|(name, dim, _)| match dim {
                    Some(dim) => csv_key(name, *dim, units),
                    None => (*name).to_string(),
                }));
                header.push("top_finding".to_string());
                w.write_record(&header)?;
            }
            let top = result
                .findings
                .iter()
                .find(|f| f.fault)
                .map_or("no fault found".to_string(), |f| {
                    words::finding_text(f, units)
                });
            let mut record = vec![j.scenario.clone()];
            record.extend(dims.iter().map(|(_, dim, v)| {
                v.map_or(String::new(), |x| match dim {
                    Some(dim) => csv_number(to_display(*dim, x, units)),
                    None => csv_number(x),
                })
            }));
            record.push(top);
            w.write_record(&record)?;
            w.flush()?;
        }
    }
    Ok(Outcome::Done)
}

/// What `target` aims at.
#[derive(Debug, Clone)]
pub struct TargetArgs {
    /// Wanted speed as typed: rpm bare (`30`) or with a unit (`30rpm`).
    pub rpm: Option<String>,
    /// Wanted wetted radius as typed.
    pub throw: Option<String>,
    /// The parameter to adjust.
    pub adjust: String,
    /// Where to write the adjusted scenario.
    pub out: Option<PathBuf>,
    /// Exit 1 when the target is out of reach.
    pub strict: bool,
}

/// Start margin below which a target's result is warned of (common practice:
/// a rotor that barely starts when new stops starting as it wears).
pub const TARGET_MARGIN_WARNING: f64 = 1.5;

/// What the adjusted design gives, and how touchy it is.
#[derive(Debug, Clone, Default, Serialize)]
struct Resulting {
    rpm: Option<f64>,
    wetted_radius_m: Option<f64>,
    start_margin: Option<f64>,
    total_flow_m3_s: Option<f64>,
    /// rpm per SI unit of the adjusted value (central difference over a
    /// tenth of the input's step).
    rpm_per_unit: Option<f64>,
    warnings: Vec<String>,
}

fn resulting(result: &TargetResult, units: UnitSystem) -> Resulting {
    let report = &result.report;
    let (rpm_op, margin, flow) = crate::inverse::sweep::summarize(report);
    let adjust = result.adjust;
    let h = 0.1 * adjust.step.fine;
    let speed_at = |v: f64| {
        let mut d = result.design.clone();
        adjust.vary_to(&mut d, v).ok()?;
        crate::physics::balance::solve_speed(&d)
            .operating
            .map(|op| crate::physics::balance::rpm(op.omega_rad_s()))
    };
    let (lo, hi) = (speed_at(result.value - h), speed_at(result.value + h));
    let slope = match (lo, hi) {
        (Some(a), Some(b)) if h > 0.0 => Some((b - a) / (2.0 * h)),
        _ => None,
    };
    let mut warnings = Vec::new();
    if let Some(m) = margin.filter(|m| *m < TARGET_MARGIN_WARNING) {
        warnings.push(format!(
            "start margin {m:.2} is below {TARGET_MARGIN_WARNING}: it may not start once worn"
        ));
    }
    if let Some(base) = rpm_op.filter(|r| *r > 0.0) {
        let worst = [lo, hi]
            .into_iter()
            .flatten()
            .map(|r| (r - base).abs() / base)
            .fold(0.0f64, f64::max);
        let unreliable = lo.is_none() || hi.is_none();
        if worst > 0.05 || unreliable {
            warnings.push(format!(
                "touchy: a tenth of a step ({}) moves the speed by {}",
                show_adjust(adjust, h, units),
                if unreliable {
                    "so much the rotor stops or runs away".to_string()
                } else {
                    format!("{:.0} %", 100.0 * worst)
                }
            ));
        }
    }
    Resulting {
        rpm: rpm_op,
        wetted_radius_m: throw_of(&result.design),
        start_margin: margin,
        total_flow_m3_s: flow,
        rpm_per_unit: slope,
        warnings,
    }
}

#[derive(Debug, Serialize)]
struct TargetJson {
    parameter: &'static str,
    value: f64,
    unit: &'static str,
    start_value: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    achieved_rpm: Option<Option<f64>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    achieved_throw_m: Option<Option<f64>>,
    reachable: bool,
    rpm: Option<f64>,
    wetted_radius_m: Option<f64>,
    start_margin: Option<f64>,
    total_flow_m3_s: Option<f64>,
    rpm_per_unit: Option<f64>,
    warnings: Vec<String>,
    written_to: Option<String>,
}

fn show_adjust(a: &Input, v: f64, units: UnitSystem) -> String {
    match parameter_dimension(a) {
        Some(dim) => format_quantity(dim, v, units),
        None => format!("{} {}", sig(Some(v), 4), a.unit.si_label())
            .trim()
            .to_string(),
    }
}

/// Run `target`.
pub fn run_target(
    path: &Path,
    args: &TargetArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    // The file's text is kept: `--out` edits it in place (comments and notes kept).
    let original = std::fs::read_to_string(path).map_err(|io| scenario::ScenarioError::Read {
        path: path.to_path_buf(),
        io,
    })?;
    let source = scenario::load_str(&original, &path.display().to_string())?;
    let design = source.to_design()?;
    if let Some((first, second)) = args.adjust.split_once(',') {
        return run_two_targets(&design, args, first.trim(), second.trim(), o, out);
    }
    let adjust = catalogue::by_adjust_name(&args.adjust).ok_or_else(|| {
        CliError::Usage(format!(
            "--adjust {}: choose one of {}",
            args.adjust,
            catalogue::adjustable()
                .map(|a| a.vary_name())
                .collect::<Vec<_>>()
                .join(", ")
        ))
    })?;
    let throw_fn = throw_of;
    let goal = match (&args.rpm, &args.throw) {
        (Some(r), None) => Goal::Rpm(positive_rpm("--rpm", r, "the wanted speed")?),
        (None, Some(t)) => Goal::Throw {
            radius_m: positive_quantity("--throw", D::Length, t, "the wanted wetted radius")?,
            throw: &throw_fn,
        },
        _ => {
            return Err(CliError::Usage(
                "give one target: --rpm 30 or --throw 8m".into(),
            ))
        }
    };
    let rpm_goal = matches!(goal, Goal::Rpm(_));
    let result: TargetResult =
        target(&design, adjust, goal).map_err(|e| CliError::Usage(e.to_string()))?;
    let units: UnitSystem = o.units.into();
    let res = resulting(&result, units);
    let written = match &args.out {
        Some(p) => {
            // The notes are the user's: kept as written. Only the adjusted
            // value's text changes in the file.
            let new = Scenario::from_design(&result.design, units, &source.notes);
            let saved = save_scenario(p, Some(&original), &new)?;
            if let scenario::Written::Rewritten(why) = &saved.written {
                // Rare (the text could not be edited in place): say so, as
                // the file's comments did not survive.
                eprintln!(
                    "note: {} was written anew, without the comments of {}: {why}",
                    p.display(),
                    path.display()
                );
            }
            Some(p.display().to_string())
        }
        None => None,
    };
    match o.format {
        Format::Json => {
            let j = TargetJson {
                parameter: adjust.vary_name(),
                value: result.value,
                unit: result.unit,
                start_value: result.start_value,
                achieved_rpm: rpm_goal.then_some(result.achieved),
                achieved_throw_m: (!rpm_goal).then_some(result.achieved),
                reachable: result.reachable,
                rpm: res.rpm,
                wetted_radius_m: res.wetted_radius_m,
                start_margin: res.start_margin,
                total_flow_m3_s: res.total_flow_m3_s,
                rpm_per_unit: res.rpm_per_unit,
                warnings: res.warnings.clone(),
                written_to: written,
            };
            serde_json::to_writer_pretty(&mut *out, &j).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Csv => {
            let dim = adjust.unit.dimension();
            let key = |name: &str| match dim {
                Some(dim) => csv_key(name, dim, units),
                // A bare coefficient: SI, its unit spelt in the key.
                None => format!(
                    "{name}{}",
                    adjust
                        .vary_key()
                        .strip_prefix(adjust.vary_name())
                        .unwrap_or("")
                ),
            };
            let value = |v: f64| match dim {
                Some(dim) => csv_number(to_display(dim, v, units)),
                None => csv_number(v),
            };
            let achieved_key = if rpm_goal {
                "achieved_rpm".to_string()
            } else {
                csv_key("achieved_throw", D::Length, units)
            };
            let achieved = result.achieved.map_or(String::new(), |a| {
                if rpm_goal {
                    csv_number(a)
                } else {
                    csv_number(to_display(D::Length, a, units))
                }
            });
            let mut w = csv::Writer::from_writer(out);
            w.write_record([
                "parameter".to_string(),
                key("value"),
                key("start_value"),
                achieved_key,
                "reachable".to_string(),
                "written_to".to_string(),
            ])?;
            w.write_record([
                adjust.vary_name().to_string(),
                value(result.value),
                value(result.start_value),
                achieved,
                result.reachable.to_string(),
                written.unwrap_or_default(),
            ])?;
            w.flush()?;
        }
        Format::Text => {
            let what = |v: f64| {
                if rpm_goal {
                    format!("{v:.1} rpm")
                } else {
                    format_quantity(D::Length, v, units)
                }
            };
            if result.reachable {
                writeln!(
                    out,
                    "{}: {} {} (was {}) gives {}",
                    design.name,
                    adjust.vary_name(),
                    show_adjust(adjust, result.value, units),
                    show_adjust(adjust, result.start_value, units),
                    result.achieved.map_or("—".into(), what)
                )?;
            } else {
                writeln!(
                    out,
                    "{}: {} is out of reach by {} over {} to {}; the nearest is {} = {}, giving {}",
                    design.name,
                    what(result.target),
                    adjust.vary_name(),
                    show_adjust(adjust, result.range.0, units),
                    show_adjust(adjust, result.range.1, units),
                    adjust.vary_name(),
                    show_adjust(adjust, result.value, units),
                    result.achieved.map_or("no running speed".into(), what)
                )?;
            }
            let opt = |v: Option<String>| v.unwrap_or_else(|| "—".into());
            writeln!(
                out,
                "  then: {} · wetted radius {} · start margin {} · flow {}",
                opt(res.rpm.map(|r| format!("{r:.1} rpm"))),
                opt(res
                    .wetted_radius_m
                    .map(|r| format_quantity(D::Length, r, units))),
                opt(res.start_margin.map(|m| format!("{m:.2}"))),
                opt(res
                    .total_flow_m3_s
                    .map(|q| format_quantity(D::Flow, q, units))),
            )?;
            if let Some(k) = res.rpm_per_unit {
                // rpm per display unit of the adjusted input.
                let (per, unit) = match parameter_dimension(adjust) {
                    Some(dim) => (
                        k / to_display(dim, 1.0, units),
                        unit_label(dim, units).to_string(),
                    ),
                    None => (k, adjust.unit.si_label().to_string()),
                };
                writeln!(out, "  sensitivity: {} rpm per {unit}", sig(Some(per), 3))?;
            }
            for w in &res.warnings {
                writeln!(out, "  warning: {w}")?;
            }
            if let Some(w) = written {
                writeln!(out, "wrote the adjusted scenario to {w}")?;
            }
        }
    }
    Ok(if args.strict && !result.reachable {
        Outcome::DesignProblem
    } else {
        Outcome::Done
    })
}

/// Per-point extras of a sweep: wetted radius, and CU when a layout is rated.
#[derive(Debug, Clone, Copy, Default)]
struct Extra {
    wetted_radius_m: Option<f64>,
    cu_percent: Option<f64>,
}

fn adjustable(name: &str) -> Result<&'static Input, CliError> {
    let name = if name == "brake" { "viscous" } else { name };
    catalogue::by_adjust_name(name).ok_or_else(|| {
        CliError::Usage(format!(
            "--adjust {name}: choose from {}",
            catalogue::adjustable()
                .map(|a| a.vary_name())
                .collect::<Vec<_>>()
                .join(", ")
        ))
    })
}

/// `target --rpm R --throw L --adjust A,B`: A meets the throw, B the speed
/// (a nested solve, model.md M10).
fn run_two_targets(
    design: &Design,
    args: &TargetArgs,
    first: &str,
    second: &str,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let (Some(r), Some(t)) = (&args.rpm, &args.throw) else {
        return Err(CliError::Usage(
            "two inputs to adjust need two targets: --rpm 30 --throw 11m --adjust deflection,nozzle"
                .into(),
        ));
    };
    if args.out.is_some() || o.format == Format::Csv {
        return Err(CliError::Usage(
            "two targets report in text or JSON and write no scenario (adjust one at a time for --out or CSV)"
                .into(),
        ));
    }
    let rpm = positive_rpm("--rpm", r, "the wanted speed")?;
    let throw_m = positive_quantity("--throw", D::Length, t, "the wanted wetted radius")?;
    let (a, b) = (adjustable(first)?, adjustable(second)?);
    if std::ptr::eq(a, b) {
        return Err(CliError::Usage(format!(
            "--adjust {first},{second}: two different inputs, one per target"
        )));
    }
    let (outer, inner) = crate::inverse::target::target_two(design, a, b, rpm, throw_m, throw_of)
        .map_err(|e| CliError::Usage(e.to_string()))?;
    let units: UnitSystem = o.units.into();
    let res = resulting(&inner, units);
    let met = outer.reachable && inner.reachable;
    match o.format {
        Format::Json => {
            let j = serde_json::json!({
                "parameters": [a.vary_name(), b.vary_name()],
                "values": [outer.value, inner.value],
                "units": [outer.unit, inner.unit],
                "start_values": [outer.start_value, inner.start_value],
                "reachable": met,
                "rpm": res.rpm,
                "wetted_radius_m": res.wetted_radius_m,
                "start_margin": res.start_margin,
                "total_flow_m3_s": res.total_flow_m3_s,
                "warnings": res.warnings,
            });
            serde_json::to_writer_pretty(&mut *out, &j).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        _ => {
            let opt = |v: Option<String>| v.unwrap_or_else(|| "—".into());
            writeln!(
                out,
                "{}: {} {} (was {}) and {} {} (was {}) {} {:.1} rpm and {}",
                design.name,
                a.vary_name(),
                show_adjust(a, outer.value, units),
                show_adjust(a, outer.start_value, units),
                b.vary_name(),
                show_adjust(b, inner.value, units),
                show_adjust(b, inner.start_value, units),
                if met { "give" } else { "come nearest to" },
                rpm,
                format_quantity(D::Length, throw_m, units),
            )?;
            writeln!(
                out,
                "  then: {} · wetted radius {} · start margin {} · flow {}",
                opt(res.rpm.map(|r| format!("{r:.1} rpm"))),
                opt(res
                    .wetted_radius_m
                    .map(|r| format_quantity(D::Length, r, units))),
                opt(res.start_margin.map(|m| format!("{m:.2}"))),
                opt(res
                    .total_flow_m3_s
                    .map(|q| format_quantity(D::Flow, q, units))),
            )?;
            for w in &res.warnings {
                writeln!(out, "  warning: {w}")?;
            }
        }
    }
    Ok(if args.strict && !met {
        Outcome::DesignProblem
    } else {
        Outcome::Done
    })
}

/// Options of `sweep`.
#[derive(Debug, Clone)]
pub struct SweepArgs {
    /// `--vary NAME=FROM..TO`, one or two.
    pub vary: Vec<String>,
    /// `--points N` or `N,M`.
    pub points: String,
    /// Rate the scenario's layout at each point.
    pub layout: bool,
    /// The figure of a two-axis grid.
    pub show: Option<ShowArg>,
}

/// Run `sweep`.
pub fn run_sweep(
    path: &Path,
    args: &SweepArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let with_layout = args.layout;
    let counts = parse_points(&args.points, args.vary.len())?;
    let axes = args
        .vary
        .iter()
        .zip(&counts)
        .map(|(v, &n)| parse_axis(v, n))
        .collect::<Result<Vec<_>, _>>()?;
    let show = args.show.unwrap_or(ShowArg::Rpm);
    if args.show.is_some() && (axes.len() != 2 || o.format != Format::Text) {
        return Err(CliError::Usage(
            "--show picks the figure of a two-axis text grid; one axis, CSV and JSON show every figure"
                .into(),
        ));
    }
    if show == ShowArg::Cu && !with_layout {
        return Err(CliError::Usage("--show cu needs --layout".into()));
    }
    let design = load_design(path)?;
    if with_layout && design.layout.is_none() {
        return Err(CliError::Usage(format!(
            "{}: --layout needs a layout in the scenario",
            path.display()
        )));
    }
    let total: usize = axes.iter().map(|a| a.steps).product();
    let bar = if std::io::stderr().is_terminal() {
        let bar = indicatif::ProgressBar::new(total as u64);
        bar.set_style(
            indicatif::ProgressStyle::with_template("{bar:40} {pos}/{len} points, {eta} left")
                .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
        );
        Some(bar)
    } else {
        None
    };
    let progress = |done: usize, _total: usize| {
        if let Some(b) = &bar {
            b.set_position(done as u64);
        }
    };
    let extra = |d: &Design, report: &SpinReport| {
        let wetted = wetted_radius_m(d, report).ok();
        let cu = if with_layout {
            d.layout.and_then(|layout| {
                let opts = PatternOptions::default();
                let head = head_throw(d, report, &opts, None).ok()?;
                layout_overlap(d, &head, &layout, &opts, &OverlapOptions::default())
                    .ok()
                    .map(|r| r.uniformity.cu_percent)
            })
        } else {
            None
        };
        Extra {
            wetted_radius_m: wetted,
            cu_percent: cu,
        }
    };
    let result = sweep_with(&design, &axes, &extra, &progress)
        .map_err(|e| CliError::Usage(e.to_string()))?;
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    let opt = |v: Option<f64>| v.map_or(String::new(), csv_number);
    match o.format {
        Format::Csv => {
            // Values in the chosen units, the unit in each column name; a
            // bare-number parameter keeps its SI key and value.
            let units: UnitSystem = o.units.into();
            let mut w = csv::Writer::from_writer(out);
            let mut header: Vec<String> = axes
                .iter()
                .map(|a| match a.input.unit {
                    catalogue::Unit::Dim(dim) => csv_key(a.input.vary_name(), dim, units),
                    _ => a.input.vary_key().to_string(),
                })
                .collect();
            header.extend([
                "status".to_string(),
                "rpm".to_string(),
                "start_margin".to_string(),
                csv_key("total_flow", D::Flow, units),
                csv_key("wetted_radius", D::Length, units),
            ]);
            if with_layout {
                header.push("cu_percent".into());
            }
            w.write_record(&header)?;
            let shown = |dim: D, v: Option<f64>| opt(v.map(|x| to_display(dim, x, units)));
            for row in &result.rows {
                let e = row.extra.unwrap_or_default();
                let mut rec: Vec<String> = axes
                    .iter()
                    .zip(&row.values)
                    .map(|(a, v)| csv_number(a.input.unit.to_display(*v, units)))
                    .collect();
                rec.extend([
                    row.status.key().to_string(),
                    opt(row.rpm),
                    opt(row.start_margin),
                    shown(D::Flow, row.total_flow_m3_s),
                    shown(D::Length, e.wetted_radius_m),
                ]);
                if with_layout {
                    rec.push(opt(e.cu_percent));
                }
                w.write_record(&rec)?;
            }
            w.flush()?;
        }
        Format::Json => {
            let rows: Vec<serde_json::Value> = result
                .rows
                .iter()
                .map(|row| {
                    let e = row.extra.unwrap_or_default();
                    let mut m = serde_json::Map::new();
                    for (a, v) in axes.iter().zip(&row.values) {
                        m.insert(a.input.vary_key().into(), serde_json::json!(v));
                    }
                    m.insert("status".into(), serde_json::json!(row.status.key()));
                    m.insert("rpm".into(), serde_json::json!(row.rpm));
                    m.insert("start_margin".into(), serde_json::json!(row.start_margin));
                    m.insert(
                        "total_flow_m3_s".into(),
                        serde_json::json!(row.total_flow_m3_s),
                    );
                    m.insert(
                        "wetted_radius_m".into(),
                        serde_json::json!(e.wetted_radius_m),
                    );
                    if with_layout {
                        m.insert("cu_percent".into(), serde_json::json!(e.cu_percent));
                    }
                    serde_json::Value::Object(m)
                })
                .collect();
            serde_json::to_writer_pretty(&mut *out, &rows).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Text => {
            let units: UnitSystem = o.units.into();
            let head = |a: &SweepAxis| match parameter_dimension(a.input) {
                Some(dim) => format!("{} {}", a.input.vary_name(), unit_label(dim, units)),
                None => a.input.vary_name().to_string(),
            };
            let labels = |a: &SweepAxis| {
                let shown: Vec<f64> = a
                    .values()
                    .iter()
                    .map(|&v| match parameter_dimension(a.input) {
                        Some(dim) => to_display(dim, v, units),
                        None => v,
                    })
                    .collect();
                axis_labels(&shown)
            };
            writeln!(out, "{}: {} points", design.name, result.rows.len())?;
            if let [a, b] = axes.as_slice() {
                // A grid of the chosen figure: first axis down, second across.
                let title = match show {
                    ShowArg::Rpm => "rpm".to_string(),
                    ShowArg::Throw => format!("wetted radius {}", unit_label(D::Length, units)),
                    ShowArg::Cu => "CU %".to_string(),
                    ShowArg::Flow => format!("flow {}", unit_label(D::Flow, units)),
                    ShowArg::Margin => "start margin".to_string(),
                };
                let mut t = TextTable::new(
                    std::iter::once(format!("{title}: {} \\ {}", head(a), head(b)))
                        .chain(labels(b)),
                );
                let status_word = |r: &crate::inverse::sweep::SweepRow<Extra>| match r.status.key()
                {
                    "stalls_at_rest" => "stall".to_string(),
                    "no_equilibrium" => "none".to_string(),
                    "invalid" => "bad".to_string(),
                    _ => "–".to_string(),
                };
                for (i, la) in labels(a).into_iter().enumerate() {
                    let cells = result.rows.iter().skip(i * b.steps).take(b.steps).map(|r| {
                        let e = r.extra.unwrap_or_default();
                        let figure = match show {
                            ShowArg::Rpm => r.rpm.map(|x| format!("{x:.0}")),
                            ShowArg::Throw => e
                                .wetted_radius_m
                                .map(|x| sig(Some(to_display(D::Length, x, units)), 3)),
                            ShowArg::Cu => e.cu_percent.map(|x| format!("{x:.1}")),
                            ShowArg::Flow => r
                                .total_flow_m3_s
                                .map(|x| sig(Some(to_display(D::Flow, x, units)), 3)),
                            ShowArg::Margin => r.start_margin.map(|x| format!("{x:.2}")),
                        };
                        match (figure, r.status.key()) {
                            (Some(f), "running") => f,
                            (Some(f), _) if show != ShowArg::Rpm => f,
                            _ => status_word(r),
                        }
                    });
                    t.row(std::iter::once(la).chain(cells));
                }
                write!(out, "{}", t.render(0))?;
                writeln!(
                    out,
                    "(stall: stalls at rest; none: no equilibrium; bad: value refused)"
                )?;
            } else {
                let mut headers: Vec<String> = axes.iter().map(head).collect();
                headers.extend([
                    "status".to_string(),
                    "rpm".to_string(),
                    "start margin".to_string(),
                    format!("flow {}", unit_label(D::Flow, units)),
                    format!("wetted radius {}", unit_label(D::Length, units)),
                ]);
                if with_layout {
                    headers.push("CU %".into());
                }
                let mut t = TextTable::new(headers);
                let axis_labels: Vec<Vec<String>> = axes.iter().map(labels).collect();
                for (k, row) in result.rows.iter().enumerate() {
                    let e = row.extra.unwrap_or_default();
                    let mut cells: Vec<String> = axis_labels
                        .iter()
                        .map(|l| l.get(k).cloned().unwrap_or_default())
                        .collect();
                    cells.extend([
                        row.status.key().replace('_', " "),
                        sig(row.rpm, 3),
                        sig(row.start_margin, 3),
                        sig(
                            row.total_flow_m3_s.map(|q| to_display(D::Flow, q, units)),
                            3,
                        ),
                        sig(
                            e.wetted_radius_m.map(|r| to_display(D::Length, r, units)),
                            3,
                        ),
                    ]);
                    if with_layout {
                        cells.push(sig(e.cu_percent, 3));
                    }
                    t.row(cells);
                }
                write!(out, "{}", t.render(0))?;
            }
        }
    }
    Ok(Outcome::Done)
}

/// Whether a larger value of a result key is better (None: neither).
pub fn larger_is_better(key: &str) -> Option<bool> {
    match key {
        "start_margin" | "cu_percent" | "du_lq_percent" | "wetted_radius_m" => Some(true),
        _ => None,
    }
}

/// Run `compare`.
pub fn run_compare(paths: &[PathBuf], o: Output, out: &mut dyn Write) -> Result<Outcome, CliError> {
    let designs = paths
        .iter()
        .map(|p| load_design(p))
        .collect::<Result<Vec<_>, _>>()?;
    let names: Vec<String> = paths
        .iter()
        .map(|p| {
            p.file_stem().map_or_else(
                || p.display().to_string(),
                |s| s.to_string_lossy().into_owned(),
            )
        })
        .collect();
    let pairs: Vec<(&str, &Design)> = names
        .iter()
        .map(String::as_str)
        .zip(designs.iter())
        .collect();
    let c: Comparison =
        compare_with_coverage(&pairs).map_err(|e| CliError::Usage(e.to_string()))?;
    match o.format {
        Format::Json => {
            let j = serde_json::json!({
                "designs": c.names,
                "status": c.statuses.iter().map(|s| s.key()).collect::<Vec<_>>(),
                "inputs": c.inputs.iter().map(|i| serde_json::json!({
                    "path": i.path,
                    "unit": i.unit,
                    "values": i.values.iter().map(|v| match v {
                        Some(InputValue::Number(x)) => serde_json::json!(x),
                        Some(InputValue::Text(t)) => serde_json::json!(t),
                        None => serde_json::Value::Null,
                    }).collect::<Vec<_>>(),
                })).collect::<Vec<_>>(),
                "results": c.results.iter().map(|r| serde_json::json!({
                    "key": r.key, "unit": r.unit, "values": r.values, "deltas": r.deltas, "percents": r.percents,
                })).collect::<Vec<_>>(),
            });
            serde_json::to_writer_pretty(&mut *out, &j).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Csv => {
            let units: UnitSystem = o.units.into();
            let mut w = csv::Writer::from_writer(out);
            let mut header = vec!["kind".to_string(), "name".to_string(), "unit".to_string()];
            header.extend(c.names.iter().cloned());
            header.extend(c.names.iter().skip(1).map(|n| format!("delta {n}")));
            header.extend(c.names.iter().skip(1).map(|n| format!("percent {n}")));
            w.write_record(&header)?;
            for i in &c.inputs {
                let shown = ShownInput::new(i, units);
                let mut rec = vec!["input".to_string(), shown.name, shown.unit.clone()];
                rec.extend(i.values.iter().map(|v| match v {
                    Some(InputValue::Number(x)) => csv_number((shown.value)(*x)),
                    Some(InputValue::Text(t)) => t.clone(),
                    None => String::new(),
                }));
                w.write_record(
                    rec.iter()
                        .chain(std::iter::repeat_n(&String::new(), 2 * (c.names.len() - 1))),
                )?;
            }
            let opt = |v: &Option<f64>| v.map_or(String::new(), csv_number);
            for r in &c.results {
                let shown = ShownResult::new(r, units);
                let mut rec = vec!["result".to_string(), shown.name, shown.unit];
                rec.extend(shown.values.iter().map(opt));
                rec.extend(shown.deltas.iter().skip(1).map(opt));
                rec.extend(r.percents.iter().skip(1).map(opt));
                w.write_record(&rec)?;
            }
            w.flush()?;
        }
        Format::Text => {
            let units: UnitSystem = o.units.into();
            let mut t =
                TextTable::new(std::iter::once("input".to_string()).chain(c.names.iter().cloned()));
            for i in &c.inputs {
                let shown = ShownInput::new(i, units);
                t.row(
                    std::iter::once(
                        format!("{} {}", shown.name, shown.unit)
                            .trim_end()
                            .to_string(),
                    )
                    .chain(i.values.iter().map(|v| {
                        v.as_ref().map_or("—".to_string(), |v| match v {
                            InputValue::Number(x) => sig(Some((shown.value)(*x)), 4),
                            InputValue::Text(s) => s.clone(),
                        })
                    })),
                );
            }
            if c.inputs.is_empty() {
                writeln!(out, "The inputs are the same.")?;
            } else {
                writeln!(out, "Inputs that differ")?;
                write!(out, "{}", t.render(2))?;
            }
            writeln!(
                out,
                "\nResults (deltas against {})",
                c.names.first().map_or("", String::as_str)
            )?;
            let mut r = TextTable::new(
                std::iter::once("result".to_string())
                    .chain(c.names.iter().cloned())
                    .chain(c.names.iter().skip(1).map(|n| format!("Δ {n}"))),
            );
            for res in &c.results {
                let better = larger_is_better(&res.key);
                let shown = ShownResult::new(res, units);
                let cells = shown.values.iter().map(|v| sig(*v, 4));
                let deltas = shown
                    .deltas
                    .iter()
                    .zip(&res.percents)
                    .skip(1)
                    .map(|(d, p)| match (d, p) {
                        (Some(d), Some(p)) => {
                            let mark = match better {
                                Some(up) if *d != 0.0 => {
                                    if (*d > 0.0) == up {
                                        " better"
                                    } else {
                                        " worse"
                                    }
                                }
                                _ => "",
                            };
                            format!("{} ({p:+.1} %){mark}", sig(Some(*d), 3))
                        }
                        (Some(d), None) => sig(Some(*d), 3),
                        _ => "—".to_string(),
                    });
                r.row(
                    std::iter::once(format!("{} {}", shown.name, shown.unit).trim().to_string())
                        .chain(cells)
                        .chain(deltas),
                );
            }
            write!(out, "{}", r.render(2))?;
        }
    }
    Ok(Outcome::Done)
}

/// SI unit suffixes of the comparison's field paths and result keys, longest first.
const SI_SUFFIXES: [&str; 11] = [
    "_kg_m3", "_kg_m2", "_m3_s", "_n_m", "_m_s", "_pa", "_rad", "_m2", "_kg", "_c", "_m",
];

/// A name without its SI unit suffix (`total_flow_m3_s` → `total_flow`);
/// a name that is all unit (`rotor.inertia.kg_m2`) is kept.
fn without_si_suffix(name: &str) -> &str {
    SI_SUFFIXES
        .iter()
        .find_map(|sfx| {
            name.strip_suffix(sfx)
                .filter(|rest| !rest.is_empty() && !rest.ends_with('.'))
                .filter(|rest| !rest.ends_with(".kg"))
        })
        .unwrap_or(name)
}

/// A compared input as shown: its name without the SI suffix, its unit and
/// values in the chosen unit system (SI kept for a bare number).
struct ShownInput {
    name: String,
    unit: String,
    value: Box<dyn Fn(f64) -> f64>,
}

impl ShownInput {
    /// The catalogue says each input's unit: no guessing from the path.
    fn new(difference: &crate::inverse::compare::InputDifference, units: UnitSystem) -> Self {
        let unit = difference.input.unit;
        ShownInput {
            name: without_si_suffix(&difference.path).to_string(),
            unit: unit.label(units),
            value: Box::new(move |x| unit.to_display(x, units)),
        }
    }
}

/// A compared result in the chosen unit system: values and deltas converted
/// (deltas as differences of the shown values), percentages unchanged.
struct ShownResult {
    name: String,
    unit: String,
    values: Vec<Option<f64>>,
    deltas: Vec<Option<f64>>,
}

impl ShownResult {
    fn new(r: &crate::inverse::compare::ResultComparison, units: UnitSystem) -> Self {
        let dim = match r.unit.as_str() {
            "m3/s" => Some(D::Flow),
            "N·m" => Some(D::Torque),
            "m" => Some(D::Length),
            "Pa" => Some(D::Pressure),
            _ => None,
        };
        match dim {
            Some(dim) => {
                let values: Vec<Option<f64>> = r
                    .values
                    .iter()
                    .map(|v| v.map(|x| to_display(dim, x, units)))
                    .collect();
                let first = values.first().copied().flatten();
                let deltas = values
                    .iter()
                    .map(|v| match (v, first) {
                        (Some(v), Some(f)) => Some(v - f),
                        _ => None,
                    })
                    .collect();
                ShownResult {
                    name: without_si_suffix(&r.key).to_string(),
                    unit: unit_label(dim, units).to_string(),
                    values,
                    deltas,
                }
            }
            None => ShownResult {
                name: r.key.clone(),
                unit: r.unit.clone(),
                values: r.values.clone(),
                deltas: r.deltas.clone(),
            },
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn axis_labels_share_one_precision() {
        assert_eq!(axis_labels(&[0.0, 10.0, 20.0]), vec!["0", "10", "20"]);
        assert_eq!(
            axis_labels(&[150.0, 150.0 + 250.0 / 3.0, 150.0 + 500.0 / 3.0, 400.0]),
            vec!["150", "233", "317", "400"]
        );
        assert_eq!(axis_labels(&[0.0, 0.25, 0.5]), vec!["0.00", "0.25", "0.50"]);
        assert_eq!(axis_labels(&[-0.1, 0.0, 0.1]), vec!["-0.1", "0.0", "0.1"]);
        assert_eq!(parse_points("13,6", 2).unwrap(), vec![13, 6]);
        assert_eq!(parse_points("7", 2).unwrap(), vec![7, 7]);
        assert!(parse_points("0", 1).is_err());
        assert!(parse_points("3,4", 1).is_err());
        assert!(parse_points("x", 1).is_err());
    }

    #[test]
    fn compared_names_lose_their_si_suffix_only() {
        assert_eq!(without_si_suffix("total_flow_m3_s"), "total_flow");
        assert_eq!(without_si_suffix("stall_torque_n_m"), "stall_torque");
        assert_eq!(
            without_si_suffix("rotor.arms[0].nozzle.diameter_m"),
            "rotor.arms[0].nozzle.diameter"
        );
        assert_eq!(without_si_suffix("wind.speed_m_s"), "wind.speed");
        assert_eq!(
            without_si_suffix("rotor.inertia.kg_m2"),
            "rotor.inertia.kg_m2"
        );
        assert_eq!(without_si_suffix("rpm"), "rpm");
        assert_eq!(without_si_suffix("start_margin"), "start_margin");
    }
}
