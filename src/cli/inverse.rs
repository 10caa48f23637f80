//! The inverse uses on the command line: `check` (a unit in the field),
//! `target` (the design value that gives a wanted speed or throw), `sweep`
//! (one or two parameters over ranges) and `compare` (designs side by side).

use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};

use serde::Serialize;

use super::text::{sig, TextTable};
use super::{load_design, quantity, CliError, Format, Outcome, Output};
use crate::physics::balance::{solve, SpinReport};
use crate::physics::coverage::{
    compare_with_coverage, head_throw, layout_overlap, wetted_radius_m,
};
use crate::physics::design::Design;
use crate::physics::field::{
    check, Alone, Cause, CauseEvidence, FieldCheck, FieldReading, FieldTolerances, FlowReading,
    NozzleAlone, RotationReading, ThrowReading,
};
use crate::physics::layout::OverlapOptions;
use crate::physics::pattern::PatternOptions;
use crate::physics::study::{sweep_with, Comparison, InputValue, Parameter, SweepAxis};
use crate::physics::target::{target, Adjust, Goal, TargetResult};
use crate::report::field as words;
use crate::scenario::{save_atomic, Scenario};
use crate::units::{format_quantity, to_display, unit_label, Dimension as D, UnitSystem};

/// The dimension a parameter's values are typed in, `None` for a bare number.
pub fn parameter_dimension(p: Parameter) -> Option<D> {
    Some(match p {
        Parameter::Deflection | Parameter::Elevation => D::Angle,
        Parameter::Radius | Parameter::Nozzle | Parameter::Bore | Parameter::Height => {
            D::SmallLength
        }
        Parameter::Pressure => D::Pressure,
        Parameter::Flow => D::Flow,
        Parameter::Running | Parameter::Breakaway => D::Torque,
        Parameter::WaterTemperature => D::Temperature,
        Parameter::Wind => D::Speed,
        Parameter::Viscous
        | Parameter::Quadratic
        | Parameter::Mu
        | Parameter::MuStatic
        | Parameter::Cd
        | Parameter::Cv => return None,
    })
}

/// A value of parameter `p` typed on the command line, in SI. Angles may be
/// bare numbers (degrees); brake and friction coefficients are bare SI numbers.
pub fn parameter_value(argument: &str, p: Parameter, text: &str) -> Result<f64, CliError> {
    let text = text.trim();
    match parameter_dimension(p) {
        None => text
            .parse::<f64>()
            .ok()
            .filter(|v| v.is_finite())
            .ok_or_else(|| {
                CliError::Usage(format!(
                    "{argument}: `{text}` is not a number ({} takes a bare number)",
                    p.name()
                ))
            }),
        Some(dim) => match text.parse::<f64>() {
            Ok(deg) if dim == D::Angle && deg.is_finite() => Ok(deg.to_radians()),
            _ => quantity(argument, dim, text),
        },
    }
}

/// Parse `NAME=FROM:TO:STEPS`.
pub fn parse_axis(text: &str) -> Result<SweepAxis, CliError> {
    let bad = |why: &str| {
        CliError::Usage(format!(
            "--vary {text}: {why} (write NAME=FROM:TO:STEPS, e.g. deflection=0:60:13)"
        ))
    };
    let (name, range) = text.split_once('=').ok_or_else(|| bad("no `=`"))?;
    let parameter = Parameter::from_name(name.trim()).ok_or_else(|| {
        CliError::Usage(format!(
            "--vary {text}: unknown parameter `{}`; known: {}",
            name.trim(),
            crate::physics::study::Parameter::ALL
                .iter()
                .map(|p| p.name())
                .collect::<Vec<_>>()
                .join(", ")
        ))
    })?;
    let parts: Vec<&str> = range.split(':').collect();
    let [from, to, steps] = parts.as_slice() else {
        return Err(bad("expected three parts FROM:TO:STEPS"));
    };
    let steps: usize = steps
        .trim()
        .parse()
        .map_err(|_| bad("STEPS is not a whole number"))?;
    if steps == 0 || steps > 100_000 {
        return Err(bad("STEPS must be 1 to 100000"));
    }
    Ok(SweepAxis {
        parameter,
        from: parameter_value("--vary", parameter, from)?,
        to: parameter_value("--vary", parameter, to)?,
        steps,
    })
}

/// How the rotation was read.
#[derive(Debug, Clone, Default)]
pub struct CheckArgs {
    /// Inlet pressure as typed.
    pub pressure: String,
    /// rpm as read from a tachometer.
    pub rpm: Option<f64>,
    /// Seconds for one turn.
    pub seconds_per_turn: Option<String>,
    /// Turns counted.
    pub turns: Option<f64>,
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

fn reading(args: &CheckArgs) -> Result<FieldReading, CliError> {
    let pressure = quantity("--pressure", D::Pressure, &args.pressure)?;
    let stopwatch = args
        .stopwatch
        .as_deref()
        .map(|s| quantity("--stopwatch", D::Time, s))
        .transpose()?;
    let mut over = args.over.iter();
    let mut next_over = |what: &str| -> Result<f64, CliError> {
        let text = over.next().ok_or_else(|| {
            CliError::Usage(format!("{what} needs --over TIME (e.g. --over 14.2s)"))
        })?;
        quantity("--over", D::Time, text)
    };
    let mut rotation =
        match (args.rpm, &args.seconds_per_turn, args.turns) {
            (Some(r), None, None) => RotationReading::rpm(r),
            (None, Some(s), None) => {
                RotationReading::seconds_per_turn(quantity("--seconds-per-turn", D::Time, s)?)
            }
            (None, None, Some(n)) => RotationReading::turns_over(n, next_over("--turns")?),
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
            RotationReading::Rpm { .. } => {}
        }
    }
    let flow = match (&args.flow, &args.caught) {
        (Some(q), None) => Some(FlowReading::rate(quantity("--flow", D::Flow, q)?)),
        (None, Some(v)) => {
            let volume = quantity("--caught", D::Volume, v)?;
            Some(FlowReading::caught(volume, next_over("--caught")?))
        }
        (None, None) => None,
        _ => {
            return Err(CliError::Usage(
                "give the flow one way only: --flow or --caught … --over …".into(),
            ))
        }
    };
    let throw = args
        .throw
        .as_deref()
        .map(|t| quantity("--throw", D::Length, t))
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
    let reading = reading(args)?;
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
            let opt = |v: Option<f64>| v.map_or(String::new(), |x| format!("{x}"));
            if !args.no_header {
                w.write_record([
                    "scenario",
                    "inlet_pressure_pa",
                    "measured_rpm",
                    "measured_rpm_lo",
                    "measured_rpm_hi",
                    "expected_rpm",
                    "deviation_percent",
                    "implied_running_torque_n_m",
                    "design_running_torque_n_m",
                    "measured_flow_m3_s",
                    "implied_nozzle_diameter_m",
                    "measured_throw_m",
                    "expected_throw_m",
                    "top_finding",
                ])?;
            }
            let top = result
                .findings
                .iter()
                .find(|f| f.fault)
                .map_or("no fault found".to_string(), |f| {
                    words::finding_text(f, units)
                });
            w.write_record([
                j.scenario.clone(),
                format!("{}", j.inlet_pressure_pa),
                format!("{}", j.measured_rpm),
                format!("{}", j.measured_rpm_band[0]),
                format!("{}", j.measured_rpm_band[1]),
                opt(j.expected_rpm),
                opt(j.deviation_percent),
                opt(j.implied_running_torque_n_m),
                opt(j.design_running_torque_n_m),
                opt(j.measured_flow_m3_s),
                opt(j.implied_nozzle_diameter_m),
                opt(j.measured_throw_m),
                opt(j.expected_throw_m),
                top,
            ])?;
            w.flush()?;
        }
    }
    Ok(Outcome::Done)
}

/// What `target` aims at.
#[derive(Debug, Clone)]
pub struct TargetArgs {
    /// Wanted speed, rpm.
    pub rpm: Option<f64>,
    /// Wanted wetted radius as typed.
    pub throw: Option<String>,
    /// The parameter to adjust.
    pub adjust: String,
    /// Where to write the adjusted scenario.
    pub out: Option<PathBuf>,
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
    written_to: Option<String>,
}

fn adjust_dimension(a: Adjust) -> Option<D> {
    parameter_dimension(a.parameter())
}

fn show_adjust(a: Adjust, v: f64, units: UnitSystem) -> String {
    match adjust_dimension(a) {
        Some(dim) => format_quantity(dim, v, units),
        None => format!("{} {}", sig(Some(v), 4), a.unit()),
    }
}

/// Run `target`.
pub fn run_target(
    path: &Path,
    args: &TargetArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let design = load_design(path)?;
    let adjust = Adjust::from_name(&args.adjust).ok_or_else(|| {
        CliError::Usage(format!(
            "--adjust {}: choose one of {}",
            args.adjust,
            Adjust::ALL
                .iter()
                .map(|a| a.name())
                .collect::<Vec<_>>()
                .join(", ")
        ))
    })?;
    let throw_fn = throw_of;
    let goal = match (args.rpm, &args.throw) {
        (Some(r), None) => Goal::Rpm(r),
        (None, Some(t)) => Goal::Throw {
            radius_m: quantity("--throw", D::Length, t)?,
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
    let written = match &args.out {
        Some(p) => {
            let notes = format!(
                "{} adjusted by spinwright target: {} = {}",
                design.name,
                adjust.name(),
                show_adjust(adjust, result.value, UnitSystem::Metric)
            );
            let text = Scenario::from_design(&result.design, units, &notes).to_ron_string();
            save_atomic(p, &text)?;
            Some(p.display().to_string())
        }
        None => None,
    };
    match o.format {
        Format::Json => {
            let j = TargetJson {
                parameter: adjust.name(),
                value: result.value,
                unit: result.unit,
                start_value: result.start_value,
                achieved_rpm: rpm_goal.then_some(result.achieved),
                achieved_throw_m: (!rpm_goal).then_some(result.achieved),
                reachable: result.reachable,
                written_to: written,
            };
            serde_json::to_writer_pretty(&mut *out, &j).map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Text | Format::Csv => {
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
                    adjust.name(),
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
                    adjust.name(),
                    show_adjust(adjust, result.range.0, units),
                    show_adjust(adjust, result.range.1, units),
                    adjust.name(),
                    show_adjust(adjust, result.value, units),
                    result.achieved.map_or("no running speed".into(), what)
                )?;
            }
            if let Some(w) = written {
                writeln!(out, "wrote the adjusted scenario to {w}")?;
            }
        }
    }
    Ok(Outcome::Done)
}

/// Per-point extras of a sweep: wetted radius, and CU when a layout is rated.
#[derive(Debug, Clone, Copy, Default)]
struct Extra {
    wetted_radius_m: Option<f64>,
    cu_percent: Option<f64>,
}

/// Run `sweep`.
pub fn run_sweep(
    path: &Path,
    vary: &[String],
    with_layout: bool,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let design = load_design(path)?;
    let axes = vary
        .iter()
        .map(|v| parse_axis(v))
        .collect::<Result<Vec<_>, _>>()?;
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
    let opt = |v: Option<f64>| v.map_or(String::new(), |x| format!("{x}"));
    match o.format {
        Format::Csv => {
            let mut w = csv::Writer::from_writer(out);
            let mut header: Vec<String> =
                axes.iter().map(|a| a.parameter.key().to_string()).collect();
            header.extend(
                [
                    "status",
                    "rpm",
                    "start_margin",
                    "total_flow_m3_s",
                    "wetted_radius_m",
                ]
                .map(String::from),
            );
            if with_layout {
                header.push("cu_percent".into());
            }
            w.write_record(&header)?;
            for row in &result.rows {
                let e = row.extra.unwrap_or_default();
                let mut rec: Vec<String> = row.values.iter().map(|v| format!("{v}")).collect();
                rec.extend([
                    row.status.key().to_string(),
                    opt(row.rpm),
                    opt(row.start_margin),
                    opt(row.total_flow_m3_s),
                    opt(e.wetted_radius_m),
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
                        m.insert(a.parameter.key().into(), serde_json::json!(v));
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
            let head = |a: &SweepAxis| match parameter_dimension(a.parameter) {
                Some(dim) => format!("{} {}", a.parameter.name(), unit_label(dim, units)),
                None => a.parameter.name().to_string(),
            };
            let show = |a: &SweepAxis, v: f64| match parameter_dimension(a.parameter) {
                Some(dim) => sig(Some(to_display(dim, v, units)), 4),
                None => sig(Some(v), 4),
            };
            writeln!(out, "{}: {} points", design.name, result.rows.len())?;
            if let [a, b] = axes.as_slice() {
                // A grid of rpm: first axis down, second across.
                let mut t = TextTable::new(
                    std::iter::once(format!("rpm: {} \\ {}", head(a), head(b)))
                        .chain(b.values().iter().map(|v| show(b, *v))),
                );
                for (i, va) in a.values().iter().enumerate() {
                    let cells = result
                        .rows
                        .iter()
                        .skip(i * b.steps)
                        .take(b.steps)
                        .map(|r| match r.rpm {
                            Some(x) => format!("{x:.0}"),
                            None => match r.status.key() {
                                "stalls_at_rest" => "stall".into(),
                                "no_equilibrium" => "none".into(),
                                _ => "bad".into(),
                            },
                        });
                    t.row(std::iter::once(show(a, *va)).chain(cells));
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
                for row in &result.rows {
                    let e = row.extra.unwrap_or_default();
                    let mut cells: Vec<String> = axes
                        .iter()
                        .zip(&row.values)
                        .map(|(a, v)| show(a, *v))
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
            let mut w = csv::Writer::from_writer(out);
            let mut header = vec!["kind".to_string(), "name".to_string(), "unit".to_string()];
            header.extend(c.names.iter().cloned());
            header.extend(c.names.iter().skip(1).map(|n| format!("delta {n}")));
            header.extend(c.names.iter().skip(1).map(|n| format!("percent {n}")));
            w.write_record(&header)?;
            for i in &c.inputs {
                let mut rec = vec!["input".to_string(), i.path.clone(), i.unit.to_string()];
                rec.extend(
                    i.values
                        .iter()
                        .map(|v| v.as_ref().map_or(String::new(), ToString::to_string)),
                );
                w.write_record(
                    rec.iter()
                        .chain(std::iter::repeat_n(&String::new(), 2 * (c.names.len() - 1))),
                )?;
            }
            let opt = |v: &Option<f64>| v.map_or(String::new(), |x| format!("{x}"));
            for r in &c.results {
                let mut rec = vec!["result".to_string(), r.key.clone(), r.unit.clone()];
                rec.extend(r.values.iter().map(opt));
                rec.extend(r.deltas.iter().skip(1).map(opt));
                rec.extend(r.percents.iter().skip(1).map(opt));
                w.write_record(&rec)?;
            }
            w.flush()?;
        }
        Format::Text => {
            let mut t = TextTable::new(
                std::iter::once("input (SI)".to_string()).chain(c.names.iter().cloned()),
            );
            for i in &c.inputs {
                t.row(
                    std::iter::once(if i.unit.is_empty() {
                        i.path.clone()
                    } else {
                        format!("{} {}", i.path, i.unit)
                    })
                    .chain(i.values.iter().map(|v| {
                        v.as_ref().map_or("—".to_string(), |v| match v {
                            InputValue::Number(x) => sig(Some(*x), 4),
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
                let cells = res.values.iter().map(|v| sig(*v, 4));
                let deltas =
                    res.deltas
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
                    std::iter::once(format!("{} {}", res.key, res.unit).trim().to_string())
                        .chain(cells)
                        .chain(deltas),
                );
            }
            write!(out, "{}", r.render(2))?;
        }
    }
    Ok(Outcome::Done)
}
