//! `check`: a unit in the field, its readings against the design.

use std::io::Write;
use std::path::{Path, PathBuf};

use serde::Serialize;

use super::text::csv_number;
use super::{
    load_design, positive_number, positive_quantity, positive_quantity_or_bare, positive_rpm,
    quantity, CliError, Format, Outcome, Output,
};
use crate::inverse::field::{
    check, Alone, Cause, CauseEvidence, FieldCheck, FieldReading, FieldTolerances, FlowReading,
    NozzleAlone, RotationReading, ThrowReading,
};
use crate::physics::balance::solve;
use crate::physics::coverage::wetted_radius_m;
use crate::physics::design::Design;
use crate::report::field as words;
use crate::units::{csv_key, to_display, Dimension as D, UnitSystem};

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

/// The wetted radius of a design at its reported state, m (`None` when it
/// has none); the throw `check` and `target` compare.
pub(super) fn throw_of(design: &Design) -> Option<f64> {
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
