//! Several readings, one fit (model.md M12): the running friction and the
//! brake's coefficients that make the model's speed match readings taken at
//! several pressures, and the effective nozzle size when flows were measured.
//!
//! Each reading i gives an inlet pressure pᵢ and a speed nᵢ (rpm), and
//! perhaps a flow Qᵢ. The parameters are θ = (T_run, c₁, c₂): the bearing's
//! running torque (N·m; the kinetic μ for a washer bearing, whose torque
//! follows the axial load), the brake's viscous c₁ (N·m·s/rad) and quadratic
//! c₂ (N·m·s²/rad²) coefficients, all ≥ 0. The fit minimises
//!
//! ```text
//! S(θ) = Σᵢ (n_model(pᵢ; θ) − nᵢ)²          (rpm²)
//! ```
//!
//! by Levenberg–Marquardt ([`super::lsq`]), n_model being the stable speed of
//! the model at pᵢ nearest the reading (net torque zero, falling). The start
//! is the linear least-squares solution of the torque balance at the
//! measured speeds, T_D(ωᵢ) − T_seal − T_air = T_run + c₁ωᵢ + c₂ωᵢ², which
//! is exact when the readings are. Flows fix the nozzle first and apart: at
//! a given pressure and speed the flow depends on the nozzle only, so the
//! common diameter scale s minimises Σ (Q_model(pᵢ, ωᵢ; s) − Qᵢ)² (m³/s)²;
//! the speeds are then fitted with it. Uncertainty: s² (JᵀJ)⁻¹ with the
//! residual variance s² (n − p degrees of freedom); the 95 % half-widths use
//! Student's t. The speed predicted at another pressure carries the same
//! covariance through its gradient (gᵀ C g).
//!
//! With fewer than four readings not all three can be fitted with a residual
//! left over; the fit takes the running friction first, then c₁, then c₂,
//! as many as leave one degree of freedom, and holds the rest at the design's
//! values (said in the result).

use super::lsq::{jacobian, levenberg_marquardt, t95, LsqError, LsqProblem};
use crate::inverse::field::effective_diameter;
use crate::numeric::root::{brent, Tolerance};
use crate::physics::balance::{rad_s, rpm, SpinModel};
use crate::physics::design::{Bearing, Design, Supply};

/// One reading at the unit.
#[derive(Debug, Clone, PartialEq)]
pub struct SpeedReading {
    /// Inlet gauge pressure, Pa.
    pub inlet_pressure_pa: f64,
    /// Speed, rpm.
    pub rpm: f64,
    /// Total flow, m³/s, when measured.
    pub flow_m3_s: Option<f64>,
    /// When it was taken (ISO 8601 as written), when given.
    pub time: Option<String>,
}

/// A parameter of the speed fit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum FitParam {
    /// The bearing's running friction (running torque, or μ_k of a washer).
    Running,
    /// The brake's viscous coefficient c₁.
    Viscous,
    /// The brake's quadratic coefficient c₂.
    Quadratic,
}

impl FitParam {
    /// All, in the order they are taken.
    pub const ALL: [FitParam; 3] = [FitParam::Running, FitParam::Viscous, FitParam::Quadratic];

    /// The name used on the command line.
    pub fn name(self) -> &'static str {
        match self {
            FitParam::Running => "running",
            FitParam::Viscous => "viscous",
            FitParam::Quadratic => "quadratic",
        }
    }

    /// From a command-line name.
    pub fn from_name(name: &str) -> Option<Self> {
        FitParam::ALL.into_iter().find(|p| p.name() == name)
    }
}

/// Why a fit could not be made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FitError {
    /// No readings.
    #[error("no readings to fit")]
    NoReadings,
    /// A reading that is not a positive number.
    #[error("reading {index}: {field} = {value} must be a positive number")]
    Bad {
        /// 1-based reading number.
        index: usize,
        /// Which field.
        field: &'static str,
        /// The value.
        value: f64,
    },
    /// More parameters asked for than the readings can fix.
    #[error("{readings} reading(s) cannot fix {parameters} parameter(s); take readings at more pressures or fit fewer")]
    TooFew {
        /// Readings.
        readings: usize,
        /// Parameters.
        parameters: usize,
    },
    /// The model does not run at the start values for some reading.
    #[error("the model finds no running speed near reading {index} ({rpm:.1} rpm): check the readings against the design")]
    NoSpeed {
        /// 1-based reading number.
        index: usize,
        /// Its speed, rpm.
        rpm: f64,
    },
    /// The least-squares machinery refused.
    #[error("fit: {0}")]
    Lsq(#[from] LsqError),
}

/// A fitted value with its uncertainty.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Fitted {
    /// The value (SI).
    pub value: f64,
    /// Standard error (None when held, at a bound, or with no degrees of freedom).
    pub std_error: Option<f64>,
    /// 95 % half-width (Student's t × standard error).
    pub ci95: Option<f64>,
    /// Fitted (true) or held at the design's value (false).
    pub fitted: bool,
    /// Ended at its lower bound, zero.
    pub at_zero: bool,
}

/// One reading against the fitted model.
#[derive(Debug, Clone, PartialEq)]
pub struct Residual {
    /// Inlet pressure, Pa.
    pub inlet_pressure_pa: f64,
    /// Measured, rpm.
    pub measured_rpm: f64,
    /// The fitted model's speed, rpm.
    pub model_rpm: f64,
    /// Model − measured, rpm.
    pub residual_rpm: f64,
    /// Measured flow, m³/s.
    pub measured_flow_m3_s: Option<f64>,
    /// The fitted model's flow at the measured pressure and speed, m³/s.
    pub model_flow_m3_s: Option<f64>,
    /// When taken.
    pub time: Option<String>,
}

/// The result of a fit.
#[derive(Debug, Clone, PartialEq)]
pub struct FitResult {
    /// The bearing's running parameter: running torque N·m, or μ_k for a washer.
    pub running: Fitted,
    /// True when `running` is a washer's μ_k.
    pub running_is_mu: bool,
    /// Bearing running torque, N·m: the fitted constant, or for a washer the
    /// mean over the readings (its torque follows the load).
    pub running_friction_n_m: f64,
    /// Standard error of `running_friction_n_m`, N·m.
    pub running_friction_std_n_m: Option<f64>,
    /// Brake viscous coefficient c₁, N·m·s/rad.
    pub viscous: Fitted,
    /// Brake quadratic coefficient c₂, N·m·s²/rad².
    pub quadratic: Fitted,
    /// Common nozzle diameter scale from the flows (None without flows).
    pub nozzle_scale: Option<Fitted>,
    /// Area-equivalent nozzle diameter found, m.
    pub effective_diameter_m: Option<f64>,
    /// Area-equivalent nozzle diameter of the design, m.
    pub nominal_diameter_m: f64,
    /// Each reading against the fit.
    pub residuals: Vec<Residual>,
    /// Root mean square of the speed residuals, rpm.
    pub rms_residual_rpm: f64,
    /// Residual degrees of freedom of the speed fit.
    pub dof: usize,
    /// Iterations of the speed fit.
    pub iterations: usize,
    /// The solver stopped on its convergence test.
    pub converged: bool,
    /// The design with the fitted values.
    pub design: Design,
    /// Which parameters were fitted, in order.
    pub params: Vec<FitParam>,
    /// Their covariance, in `params` order.
    pub covariance: Vec<Vec<f64>>,
}

/// The speed the fitted model predicts at a pressure.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Prediction {
    /// Inlet pressure, Pa.
    pub inlet_pressure_pa: f64,
    /// Speed, rpm (None where the model does not run).
    pub rpm: Option<f64>,
    /// Standard error from the fit's covariance, rpm.
    pub std_error_rpm: Option<f64>,
    /// 95 % half-width, rpm.
    pub ci95_rpm: Option<f64>,
}

/// The design at an inlet pressure.
pub fn at_pressure(design: &Design, inlet_pa: f64) -> Design {
    let mut d = design.clone();
    d.supply = Supply::Pressure { inlet_pa };
    d
}

fn running_of(design: &Design) -> f64 {
    match design.friction.bearing {
        Bearing::Measured { running_n_m, .. } => running_n_m,
        Bearing::Washer(w) => w.mu_kinetic,
    }
}

/// The design with a parameter set (a measured bearing's breakaway is kept
/// at least as large as its running torque).
pub fn with_param(design: &Design, p: FitParam, v: f64) -> Design {
    let mut d = design.clone();
    match p {
        FitParam::Running => match &mut d.friction.bearing {
            Bearing::Measured {
                running_n_m,
                breakaway_n_m,
            } => {
                *running_n_m = v;
                *breakaway_n_m = breakaway_n_m.max(v);
            }
            Bearing::Washer(w) => {
                w.mu_kinetic = v;
                w.mu_static = w.mu_static.max(v);
            }
        },
        FitParam::Viscous => d.friction.brake.viscous = v,
        FitParam::Quadratic => d.friction.brake.quadratic = v,
    }
    d
}

fn get_param(design: &Design, p: FitParam) -> f64 {
    match p {
        FitParam::Running => running_of(design),
        FitParam::Viscous => design.friction.brake.viscous,
        FitParam::Quadratic => design.friction.brake.quadratic,
    }
}

fn with_nozzle_scale(design: &Design, s: f64) -> Design {
    let mut d = design.clone();
    for a in &mut d.rotor.arms {
        a.nozzle.diameter_m *= s;
    }
    d
}

/// The stable speed of `design` nearest ω_guess (net torque falling through
/// zero), rad/s: stepped out by 25 % until net changes sign, then Brent.
pub fn speed_near(design: &Design, omega_guess: f64) -> Option<f64> {
    let model = SpinModel::new(design);
    let net = |w: f64| model.net(w);
    let w0 = omega_guess.max(1e-6);
    let f0 = net(w0);
    if !f0.is_finite() {
        return None;
    }
    if f0 == 0.0 {
        return Some(w0);
    }
    let (mut lo, mut hi) = (w0, w0);
    if f0 > 0.0 {
        // Speeds up: the root lies above.
        loop {
            hi *= 1.25;
            let f = net(hi);
            if f < 0.0 {
                break;
            }
            if hi > 1e4 * w0 || !f.is_finite() {
                return None;
            }
            lo = hi;
        }
    } else {
        loop {
            lo /= 1.25;
            let f = net(lo);
            if f > 0.0 {
                break;
            }
            if lo < 1e-4 * w0 || !f.is_finite() {
                return None;
            }
            hi = lo;
        }
    }
    let scale = f0.abs().max(1e-12);
    brent(
        net,
        lo,
        hi,
        Tolerance {
            x: 1e-12 * hi,
            f: 1e-13 * scale,
            max_iter: 200,
        },
    )
    .ok()
}

fn validate(readings: &[SpeedReading]) -> Result<(), FitError> {
    if readings.is_empty() {
        return Err(FitError::NoReadings);
    }
    for (i, r) in readings.iter().enumerate() {
        let bad = |field, value: f64| {
            (!(value.is_finite() && value > 0.0)).then_some(FitError::Bad {
                index: i + 1,
                field,
                value,
            })
        };
        if let Some(e) = bad("pressure", r.inlet_pressure_pa)
            .or_else(|| bad("rpm", r.rpm))
            .or_else(|| r.flow_m3_s.and_then(|q| bad("flow", q)))
        {
            return Err(e);
        }
    }
    Ok(())
}

/// The parameters fitted by default for `n` readings: as many as leave one
/// degree of freedom, at least one.
pub fn default_params(n: usize) -> Vec<FitParam> {
    let k = n.saturating_sub(1).clamp(1, 3);
    FitParam::ALL.iter().take(k).copied().collect()
}

/// Fit the nozzle scale to the flows (a one-parameter least squares).
fn fit_nozzle(design: &Design, readings: &[SpeedReading]) -> Option<Fitted> {
    let with_flow: Vec<&SpeedReading> = readings.iter().filter(|r| r.flow_m3_s.is_some()).collect();
    if with_flow.is_empty() {
        return None;
    }
    let q_scale = with_flow
        .iter()
        .filter_map(|r| r.flow_m3_s)
        .fold(0.0_f64, f64::max)
        .max(1e-12);
    let f = |x: &[f64]| -> Option<Vec<f64>> {
        let s = *x.first()?;
        let d = with_nozzle_scale(design, s);
        Some(
            with_flow
                .iter()
                .map(|r| {
                    let dp = at_pressure(&d, r.inlet_pressure_pa);
                    let q = SpinModel::new(&dp).state(rad_s(r.rpm)).total_flow_m3_s;
                    (q - r.flow_m3_s.unwrap_or(0.0)) / q_scale
                })
                .collect(),
        )
    };
    let fit = levenberg_marquardt(
        &f,
        &LsqProblem {
            x0: vec![1.0],
            scale: vec![1.0],
            lower: vec![0.01],
            max_iter: 100,
        },
    )
    .ok()?;
    let value = *fit.x.first()?;
    let se = fit.std_error.first().copied().flatten();
    Some(Fitted {
        value,
        std_error: se,
        ci95: se.map(|s| s * t95(fit.dof)),
        fitted: true,
        at_zero: false,
    })
}

/// Least-squares start: the torque balance at the measured speeds, linear in
/// the parameters (for a washer, μ_k enters through the bearing torque per unit μ).
fn linear_start(design: &Design, readings: &[SpeedReading], params: &[FitParam]) -> Vec<f64> {
    let p = params.len();
    let n = readings.len();
    let mut a = nalgebra::DMatrix::zeros(n, p);
    let mut b = nalgebra::DVector::zeros(n);
    for (i, r) in readings.iter().enumerate() {
        let w = rad_s(r.rpm);
        let dp = at_pressure(design, r.inlet_pressure_pa);
        let model = SpinModel::new(&dp);
        let point = model.point(w);
        // Torque per unit of each parameter, and the rest held.
        let per_unit = |k: FitParam| -> f64 {
            match k {
                FitParam::Running => {
                    let x = running_of(design);
                    if x > 0.0 {
                        point.resist.bearing_n_m / x
                    } else {
                        let one = with_param(&dp, FitParam::Running, 1.0);
                        SpinModel::new(&one).point(w).resist.bearing_n_m
                    }
                }
                FitParam::Viscous => w,
                FitParam::Quadratic => w * w,
            }
        };
        let mut held = point.resist.total_n_m();
        for (j, k) in params.iter().enumerate() {
            let u = per_unit(*k);
            if let Some(cell) = a.get_mut((i, j)) {
                *cell = u;
            }
            held -= u * get_param(design, *k);
        }
        if let Some(cell) = b.get_mut(i) {
            *cell = point.drive_n_m - held;
        }
    }
    let x = a
        .clone()
        .svd(true, true)
        .solve(&b, 1e-14)
        .ok()
        .map(|v| v.iter().copied().collect::<Vec<f64>>());
    match x {
        Some(v) if v.iter().all(|x| x.is_finite()) => v.into_iter().map(|x| x.max(0.0)).collect(),
        _ => params.iter().map(|k| get_param(design, *k)).collect(),
    }
}

/// Fit the running friction and the brake (and the nozzle, from flows) to readings.
///
/// `params`: which to fit (None: [`default_params`]).
pub fn fit(
    design: &Design,
    readings: &[SpeedReading],
    params: Option<&[FitParam]>,
) -> Result<FitResult, FitError> {
    validate(readings)?;
    let params: Vec<FitParam> = match params {
        Some(p) => p.to_vec(),
        None => default_params(readings.len()),
    };
    if params.len() > readings.len() {
        return Err(FitError::TooFew {
            readings: readings.len(),
            parameters: params.len(),
        });
    }
    let nozzle = fit_nozzle(design, readings);
    let base = match nozzle {
        Some(s) => with_nozzle_scale(design, s.value),
        None => design.clone(),
    };
    let build = |x: &[f64]| -> Design {
        let mut d = base.clone();
        for (k, v) in params.iter().zip(x) {
            d = with_param(&d, *k, *v);
        }
        d
    };
    let model_rpm = |d: &Design, r: &SpeedReading| -> Option<f64> {
        speed_near(&at_pressure(d, r.inlet_pressure_pa), rad_s(r.rpm)).map(rpm)
    };
    let residuals = |x: &[f64]| -> Option<Vec<f64>> {
        let d = build(x);
        readings
            .iter()
            .map(|r| model_rpm(&d, r).map(|m| m - r.rpm))
            .collect()
    };
    let mut x0 = linear_start(&base, readings, &params);
    if residuals(&x0).is_none() {
        x0 = params.iter().map(|k| get_param(&base, *k)).collect();
    }
    if residuals(&x0).is_none() {
        let d = build(&x0);
        let (index, rpm) = readings
            .iter()
            .enumerate()
            .find(|(_, r)| model_rpm(&d, r).is_none())
            .map_or((1, 0.0), |(i, r)| (i + 1, r.rpm));
        return Err(FitError::NoSpeed { index, rpm });
    }
    let scale: Vec<f64> = params
        .iter()
        .zip(&x0)
        .map(|(k, v)| {
            let typical = match k {
                FitParam::Running => 1e-4,
                FitParam::Viscous => 1e-6,
                FitParam::Quadratic => 1e-8,
            };
            v.abs().max(get_param(design, *k).abs()).max(typical)
        })
        .collect();
    let lsq = levenberg_marquardt(
        &residuals,
        &LsqProblem {
            x0,
            scale,
            lower: vec![0.0; params.len()],
            max_iter: 200,
        },
    )?;
    let fitted = build(&lsq.x);
    let t = t95(lsq.dof);
    let value_of = |k: FitParam| -> Fitted {
        match params.iter().position(|p| *p == k) {
            Some(i) => {
                let se = lsq.std_error.get(i).copied().flatten();
                Fitted {
                    value: lsq.x.get(i).copied().unwrap_or(0.0),
                    std_error: se,
                    ci95: se.map(|s| s * t),
                    fitted: true,
                    at_zero: lsq.at_bound.get(i).copied().unwrap_or(false),
                }
            }
            None => Fitted {
                value: get_param(&base, k),
                std_error: None,
                ci95: None,
                fitted: false,
                at_zero: false,
            },
        }
    };
    let running = value_of(FitParam::Running);
    let running_is_mu = matches!(design.friction.bearing, Bearing::Washer(_));
    let (running_friction_n_m, running_friction_std_n_m) = if running_is_mu {
        // Mean bearing torque over the readings, ∝ μ_k.
        let torques: Vec<f64> = readings
            .iter()
            .map(|r| {
                let dp = at_pressure(&fitted, r.inlet_pressure_pa);
                SpinModel::new(&dp).point(rad_s(r.rpm)).resist.bearing_n_m
            })
            .collect();
        let mean = torques.iter().sum::<f64>() / torques.len().max(1) as f64;
        let rel = running
            .std_error
            .filter(|_| running.value > 0.0)
            .map(|s| s / running.value);
        (mean, rel.map(|r| r * mean))
    } else {
        (running.value, running.std_error)
    };
    let res: Vec<Residual> = readings
        .iter()
        .zip(&lsq.residuals)
        .map(|(r, e)| {
            let dp = at_pressure(&fitted, r.inlet_pressure_pa);
            Residual {
                inlet_pressure_pa: r.inlet_pressure_pa,
                measured_rpm: r.rpm,
                model_rpm: r.rpm + e,
                residual_rpm: *e,
                measured_flow_m3_s: r.flow_m3_s,
                model_flow_m3_s: r
                    .flow_m3_s
                    .map(|_| SpinModel::new(&dp).state(rad_s(r.rpm)).total_flow_m3_s),
                time: r.time.clone(),
            }
        })
        .collect();
    let nominal_d = effective_diameter(design, 1.0);
    let cov: Vec<Vec<f64>> = lsq.covariance.clone();
    Ok(FitResult {
        running,
        running_is_mu,
        running_friction_n_m,
        running_friction_std_n_m,
        viscous: value_of(FitParam::Viscous),
        quadratic: value_of(FitParam::Quadratic),
        nozzle_scale: nozzle,
        effective_diameter_m: nozzle.map(|s| nominal_d * s.value),
        nominal_diameter_m: nominal_d,
        rms_residual_rpm: lsq.rms(),
        dof: lsq.dof,
        iterations: lsq.iterations,
        converged: lsq.converged,
        residuals: res,
        design: fitted,
        params,
        covariance: cov,
    })
}

/// The speed the fitted model gives at `inlet_pa`, with its uncertainty.
pub fn predict(result: &FitResult, inlet_pa: f64) -> Prediction {
    let d = at_pressure(&result.design, inlet_pa);
    let guess = result
        .residuals
        .iter()
        .min_by(|a, b| {
            (a.inlet_pressure_pa - inlet_pa)
                .abs()
                .total_cmp(&(b.inlet_pressure_pa - inlet_pa).abs())
        })
        .map_or(10.0, |r| rad_s(r.model_rpm));
    let speed = speed_near(&d, guess).map(rpm);
    let x: Vec<f64> = result
        .params
        .iter()
        .map(|k| get_param(&result.design, *k))
        .collect();
    let scale: Vec<f64> = x.iter().map(|v| v.abs().max(1e-9)).collect();
    let lower = vec![0.0; x.len()];
    let f = |p: &[f64]| -> Option<Vec<f64>> {
        let mut dd = d.clone();
        for (k, v) in result.params.iter().zip(p) {
            dd = with_param(&dd, *k, *v);
        }
        speed_near(&dd, guess).map(|w| vec![rpm(w)])
    };
    let se = speed.and_then(|_| {
        let j = jacobian(&f, &x, &scale, &lower, 1)?;
        let mut var = 0.0;
        for (a, ca) in result.covariance.iter().enumerate() {
            for (b, c) in ca.iter().enumerate() {
                var += j.get((0, a)).copied().unwrap_or(0.0)
                    * c
                    * j.get((0, b)).copied().unwrap_or(0.0);
            }
        }
        (var.is_finite() && var >= 0.0 && result.dof > 0).then(|| var.sqrt())
    });
    Prediction {
        inlet_pressure_pa: inlet_pa,
        rpm: speed,
        std_error_rpm: se,
        ci95_rpm: se.map(|s| s * t95(result.dof)),
    }
}

/// One visit in a unit's log: the running friction fitted to its readings
/// alone, the brake and nozzles held at the design's values (a change of the
/// brake between visits shows here as a change of running friction).
#[derive(Debug, Clone, PartialEq)]
pub struct Visit {
    /// The date (YYYY-MM-DD) of the readings.
    pub date: String,
    /// Readings that day.
    pub readings: usize,
    /// Running friction that day, N·m (mean bearing torque for a washer).
    pub running_friction_n_m: f64,
}

/// The running friction visit by visit (readings grouped by the date of
/// their `time`), oldest first; empty with fewer than two dated visits.
pub fn visits(design: &Design, readings: &[SpeedReading]) -> Vec<Visit> {
    let mut dates: Vec<String> = readings
        .iter()
        .filter_map(|r| {
            r.time
                .as_deref()
                .and_then(|t| t.get(..10))
                .map(str::to_string)
        })
        .collect();
    dates.sort();
    dates.dedup();
    if dates.len() < 2 {
        return Vec::new();
    }
    dates
        .into_iter()
        .filter_map(|date| {
            let day: Vec<SpeedReading> = readings
                .iter()
                .filter(|r| r.time.as_deref().and_then(|t| t.get(..10)) == Some(date.as_str()))
                .cloned()
                .collect();
            let f = fit(design, &day, Some(&[FitParam::Running])).ok()?;
            Some(Visit {
                date,
                readings: day.len(),
                running_friction_n_m: f.running_friction_n_m,
            })
        })
        .collect()
}
