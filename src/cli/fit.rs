//! `fit` (several readings at different pressures, one fit of the friction
//! and brake) and `coast` (the friction and brake from a coast-down).

use std::io::Write;
use std::path::{Path, PathBuf};

use serde::Serialize;

use super::{load_design, quantity, CliError, Format, Outcome, Output};
use crate::inverse::coast::{fit_coast, CoastData, CoastResult, InertiaSource};
use crate::inverse::fit::{fit, predict, visits, FitParam, FitResult, Fitted, Prediction, Visit};
use crate::inverse::readings::{coast_readings, speed_readings};
use crate::report::fit::{coast_text, fit_text, trend_percent, trend_text};
use crate::scenario::{save_atomic, Scenario};
use crate::units::{Dimension as D, UnitSystem};

/// What `fit` is given.
#[derive(Debug, Clone, Default)]
pub struct FitArgs {
    /// The readings (or a unit's log) CSV.
    pub readings: PathBuf,
    /// Where to write the fitted scenario.
    pub out: Option<PathBuf>,
    /// Pressures to predict the speed at, as typed.
    pub at_pressure: Vec<String>,
    /// Which parameters to fit, comma-separated names.
    pub params: Option<String>,
}

fn read_text(path: &Path) -> Result<String, CliError> {
    std::fs::read_to_string(path)
        .map_err(|e| CliError::Usage(format!("{}: cannot read the file: {e}", path.display())))
}

fn parse_params(text: &str) -> Result<Vec<FitParam>, CliError> {
    let mut out = Vec::new();
    for name in text.split(',').map(str::trim).filter(|s| !s.is_empty()) {
        let p = FitParam::from_name(name).ok_or_else(|| {
            CliError::Usage(format!(
                "--fit {text}: unknown parameter `{name}`; choose from running, viscous, quadratic"
            ))
        })?;
        if !out.contains(&p) {
            out.push(p);
        }
    }
    if out.is_empty() {
        return Err(CliError::Usage(format!(
            "--fit {text}: name at least one of running, viscous, quadratic"
        )));
    }
    Ok(out)
}

#[derive(Debug, Serialize)]
struct ValueJson {
    value: f64,
    std_error: Option<f64>,
    ci95: Option<f64>,
    fitted: bool,
    at_zero: bool,
}

fn value_json(f: &Fitted) -> ValueJson {
    ValueJson {
        value: f.value,
        std_error: f.std_error,
        ci95: f.ci95,
        fitted: f.fitted,
        at_zero: f.at_zero,
    }
}

#[derive(Debug, Serialize)]
struct ResidualJson {
    inlet_pressure_pa: f64,
    measured_rpm: f64,
    model_rpm: f64,
    residual_rpm: f64,
    measured_flow_m3_s: Option<f64>,
    model_flow_m3_s: Option<f64>,
    time: Option<String>,
}

#[derive(Debug, Serialize)]
struct PredictionJson {
    inlet_pressure_pa: f64,
    rpm: Option<f64>,
    rpm_std_error: Option<f64>,
    rpm_ci95: Option<f64>,
}

#[derive(Debug, Serialize)]
struct FitJson {
    scenario: String,
    readings: usize,
    fitted: Vec<&'static str>,
    running_friction_n_m: f64,
    running_friction_std_n_m: Option<f64>,
    mu_kinetic: Option<ValueJson>,
    running: ValueJson,
    viscous_n_m_s: f64,
    viscous: ValueJson,
    quadratic_n_m_s2: f64,
    quadratic: ValueJson,
    nozzle_scale: Option<ValueJson>,
    effective_nozzle_diameter_m: Option<f64>,
    nominal_nozzle_diameter_m: f64,
    rms_residual_rpm: f64,
    dof: usize,
    converged: bool,
    residuals: Vec<ResidualJson>,
    predictions: Vec<PredictionJson>,
    visits: Vec<VisitJson>,
    running_friction_change_percent: Option<f64>,
    written_to: Option<String>,
}

#[derive(Debug, Serialize)]
struct VisitJson {
    date: String,
    readings: usize,
    running_friction_n_m: f64,
}

fn fit_json(
    name: &str,
    r: &FitResult,
    preds: &[Prediction],
    visits: &[Visit],
    written: Option<String>,
) -> FitJson {
    FitJson {
        scenario: name.to_string(),
        readings: r.residuals.len(),
        fitted: r.params.iter().map(|p| p.name()).collect(),
        running_friction_n_m: r.running_friction_n_m,
        running_friction_std_n_m: r.running_friction_std_n_m,
        mu_kinetic: r.running_is_mu.then(|| value_json(&r.running)),
        running: value_json(&r.running),
        viscous_n_m_s: r.viscous.value,
        viscous: value_json(&r.viscous),
        quadratic_n_m_s2: r.quadratic.value,
        quadratic: value_json(&r.quadratic),
        nozzle_scale: r.nozzle_scale.as_ref().map(value_json),
        effective_nozzle_diameter_m: r.effective_diameter_m,
        nominal_nozzle_diameter_m: r.nominal_diameter_m,
        rms_residual_rpm: r.rms_residual_rpm,
        dof: r.dof,
        converged: r.converged,
        residuals: r
            .residuals
            .iter()
            .map(|x| ResidualJson {
                inlet_pressure_pa: x.inlet_pressure_pa,
                measured_rpm: x.measured_rpm,
                model_rpm: x.model_rpm,
                residual_rpm: x.residual_rpm,
                measured_flow_m3_s: x.measured_flow_m3_s,
                model_flow_m3_s: x.model_flow_m3_s,
                time: x.time.clone(),
            })
            .collect(),
        predictions: preds
            .iter()
            .map(|p| PredictionJson {
                inlet_pressure_pa: p.inlet_pressure_pa,
                rpm: p.rpm,
                rpm_std_error: p.std_error_rpm,
                rpm_ci95: p.ci95_rpm,
            })
            .collect(),
        visits: visits
            .iter()
            .map(|v| VisitJson {
                date: v.date.clone(),
                readings: v.readings,
                running_friction_n_m: v.running_friction_n_m,
            })
            .collect(),
        running_friction_change_percent: trend_percent(visits),
        written_to: written,
    }
}

fn write_scenario(
    path: &Path,
    design: &crate::physics::design::Design,
    units: UnitSystem,
    notes: &str,
) -> Result<String, CliError> {
    let text = Scenario::from_design(design, units, notes).to_ron_string();
    save_atomic(path, &text)?;
    Ok(path.display().to_string())
}

/// Run `fit`.
pub fn run_fit(
    path: &Path,
    args: &FitArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let design = load_design(path)?;
    let text = read_text(&args.readings)?;
    let readings = speed_readings(&args.readings.display().to_string(), &text)
        .map_err(|e| CliError::Usage(e.to_string()))?;
    let params = args.params.as_deref().map(parse_params).transpose()?;
    let pressures = args
        .at_pressure
        .iter()
        .map(|p| {
            let v = quantity("--at-pressure", D::Pressure, p)?;
            if v > 0.0 {
                Ok(v)
            } else {
                Err(CliError::Usage(format!(
                    "--at-pressure {p}: a pressure above zero is needed"
                )))
            }
        })
        .collect::<Result<Vec<f64>, CliError>>()?;
    let result = fit(&design, &readings, params.as_deref())
        .map_err(|e| CliError::Usage(format!("{}: {e}", args.readings.display())))?;
    let predictions: Vec<Prediction> = pressures.iter().map(|p| predict(&result, *p)).collect();
    let by_visit = visits(&design, &readings);
    let units: UnitSystem = o.units.into();
    let written = match &args.out {
        Some(p) => Some(write_scenario(
            p,
            &result.design,
            units,
            &format!(
                "{} with the friction and brake fitted by spinwright fit to {}",
                design.name,
                args.readings.display()
            ),
        )?),
        None => None,
    };
    match o.format {
        Format::Json => {
            serde_json::to_writer_pretty(
                &mut *out,
                &fit_json(&design.name, &result, &predictions, &by_visit, written),
            )
            .map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Text | Format::Csv => {
            write!(
                out,
                "{}",
                fit_text(&design.name, &result, &predictions, units)
            )?;
            write!(out, "{}", trend_text(&by_visit, units))?;
            if let Some(w) = written {
                writeln!(out, "wrote the fitted scenario to {w}")?;
            }
        }
    }
    Ok(Outcome::Done)
}

/// What `coast` is given.
#[derive(Debug, Clone, Default)]
pub struct CoastArgs {
    /// Turn times, comma-separated, as typed.
    pub turn_times: Option<String>,
    /// A CSV with `time_s` and `rpm`.
    pub readings: Option<PathBuf>,
    /// Rotor inertia as typed, overriding the design's.
    pub inertia: Option<String>,
}

#[derive(Debug, Serialize)]
struct CoastJson {
    scenario: String,
    running_friction_n_m: f64,
    running_friction_ci95_n_m: Option<f64>,
    viscous_n_m_s: f64,
    viscous_ci95_n_m_s: Option<f64>,
    quadratic_n_m_s2_held: f64,
    air_n_m_s2: f64,
    start_rpm: f64,
    stop_time_s: Option<f64>,
    inertia_kg_m2: f64,
    inertia: &'static str,
    rms_residual_s: Option<f64>,
    rms_residual_rpm: Option<f64>,
    dof: usize,
    assumptions: Vec<&'static str>,
}

fn coast_json(name: &str, r: &CoastResult) -> CoastJson {
    CoastJson {
        scenario: name.to_string(),
        running_friction_n_m: r.running_friction_n_m.value,
        running_friction_ci95_n_m: r.running_friction_n_m.ci95,
        viscous_n_m_s: r.viscous_n_m_s.value,
        viscous_ci95_n_m_s: r.viscous_n_m_s.ci95,
        quadratic_n_m_s2_held: r.quadratic_n_m_s2,
        air_n_m_s2: r.air_n_m_s2,
        start_rpm: r.omega0_rad_s.value * 60.0 / std::f64::consts::TAU,
        stop_time_s: r.stop_time_s,
        inertia_kg_m2: r.inertia_kg_m2,
        inertia: match r.inertia_source {
            InertiaSource::Given => "given",
            InertiaSource::Estimated => "estimated_drained",
            InertiaSource::Override => "command_line",
        },
        rms_residual_s: r.turn_times.then_some(r.rms_residual),
        rms_residual_rpm: (!r.turn_times).then_some(r.rms_residual),
        dof: r.dof,
        assumptions: vec![
            "no water torque from time zero",
            "inertia as stated",
            "brake quadratic coefficient held at the design's",
            "air drag from the design",
            "no wind",
        ],
    }
}

fn parse_times(text: &str) -> Result<Vec<f64>, CliError> {
    text.split(',')
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .enumerate()
        .map(|(i, t)| {
            let t = t.strip_suffix('s').unwrap_or(t).trim();
            t.parse::<f64>()
                .ok()
                .filter(|v| v.is_finite())
                .ok_or_else(|| {
                    CliError::Usage(format!(
                        "--turn-times: item {} `{t}` is not a time in seconds (write e.g. 0.9,1.9,3.0)",
                        i + 1
                    ))
                })
        })
        .collect()
}

/// Run `coast`.
pub fn run_coast(
    path: &Path,
    args: &CoastArgs,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let design = load_design(path)?;
    let data = match (&args.turn_times, &args.readings) {
        (Some(t), None) => CoastData::TurnTimes(parse_times(t)?),
        (None, Some(file)) => {
            let text = read_text(file)?;
            CoastData::Speeds(
                coast_readings(&file.display().to_string(), &text)
                    .map_err(|e| CliError::Usage(e.to_string()))?,
            )
        }
        _ => {
            return Err(CliError::Usage(
                "give the coast-down one way: --turn-times 0.9,1.9,3.0,… or --readings FILE.csv (time_s, rpm)"
                    .into(),
            ))
        }
    };
    let inertia = args
        .inertia
        .as_deref()
        .map(|i| quantity("--inertia", D::Inertia, i))
        .transpose()?;
    let result = fit_coast(&design, &data, inertia).map_err(|e| CliError::Usage(e.to_string()))?;
    let units: UnitSystem = o.units.into();
    match o.format {
        Format::Json => {
            serde_json::to_writer_pretty(&mut *out, &coast_json(&design.name, &result))
                .map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Text | Format::Csv => {
            write!(out, "{}", coast_text(&design.name, &result, units))?;
        }
    }
    Ok(Outcome::Done)
}
