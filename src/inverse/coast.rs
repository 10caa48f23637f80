//! Coast-down (model.md M12): the dry running friction and the brake's
//! viscous coefficient from a rotor slowing after the water is shut off.
//!
//! With no water there is no drive, and the rotor slows as
//!
//! ```text
//! I dω/dt = −(T_c + c₁ω + (c₂ + k_a)ω²),   ω > 0;   dθ/dt = ω
//! ```
//!
//! I the rotor inertia (the design's: given, or estimated with the arms
//! drained), T_c the dry running friction (bearing under the rotor's weight
//! alone plus the seal at no pressure, N·m), c₁ the brake's viscous
//! coefficient (N·m·s/rad), c₂ its quadratic coefficient (held at the
//! design's) and k_a ω² the air drag on the arms (M5, from the design). Once
//! ω reaches zero the rotor stays stopped (T_c holds it). With T_c and c₁
//! alone (c₂ = k_a = 0) the solution is, a = T_c/c₁, τ = I/c₁:
//!
//! ```text
//! ω(t) = (ω₀ + a) e^{−t/τ} − a,   θ(t) = (ω₀ + a) τ (1 − e^{−t/τ}) − a t,
//! t_stop = τ ln(1 + ω₀/a)
//! ```
//!
//! The model is integrated by classical RK4 (4000 steps over the record);
//! the time of the k-th turn is where θ = 2πk (cubic Hermite between steps).
//! Fitted: ω₀, T_c, c₁ (all ≥ 0) by Levenberg–Marquardt ([`super::lsq`]),
//! minimising Σ (t_model,k − t_k)² for turn times, or Σ (n_model(tᵢ) − nᵢ)²
//! for timed speed readings.
//!
//! Assumptions (stated in every result): the water torque is gone at time
//! zero (the first time is a pass of the mark at or just after shut-off);
//! the inertia is the design's; no wind; the arms hold no water.

use super::lsq::{levenberg_marquardt, t95, LsqProblem};
use crate::physics::balance::{rotor_inertia_kg_m2, rpm, SpinModel};
use crate::physics::design::{Design, Inertia};
use crate::physics::torque::air_drag_torque;
use std::f64::consts::TAU;

/// What was measured while the rotor slowed.
#[derive(Debug, Clone, PartialEq)]
pub enum CoastData {
    /// Times of completed turns after time zero, s, rising.
    TurnTimes(Vec<f64>),
    /// (time s, speed rpm) pairs.
    Speeds(Vec<(f64, f64)>),
}

/// Where the inertia came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum InertiaSource {
    /// The design gives it.
    Given,
    /// Estimated from the design's arms, drained of water.
    Estimated,
    /// Given on the command line.
    Override,
}

/// Why a coast-down could not be fitted.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum CoastError {
    /// Too few points.
    #[error("a coast-down needs at least 4 points (turn times or speeds); {0} given")]
    TooFew(usize),
    /// A time or speed that is not a positive finite number, or times that do not rise.
    #[error("coast-down point {index}: {why}")]
    Bad {
        /// 1-based point.
        index: usize,
        /// What is wrong.
        why: String,
    },
    /// The inertia is not positive.
    #[error("the rotor inertia {0} kg·m² must be a positive number")]
    Inertia(f64),
    /// No start found.
    #[error("no friction and brake reproduce these times: check that they are of completed turns")]
    NoStart,
    /// The least squares failed.
    #[error("coast-down fit: {0}")]
    Lsq(#[from] super::lsq::LsqError),
}

/// A fitted value.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Value {
    /// Value (SI).
    pub value: f64,
    /// Standard error.
    pub std_error: Option<f64>,
    /// 95 % half-width.
    pub ci95: Option<f64>,
    /// Ended at zero (its bound).
    pub at_zero: bool,
}

/// One point against the fit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CoastResidual {
    /// Turn number (turn times) or time, s (speeds).
    pub at: f64,
    /// Measured: turn time s, or speed rpm.
    pub measured: f64,
    /// The model's.
    pub model: f64,
}

/// The result of a coast-down fit.
#[derive(Debug, Clone, PartialEq)]
pub struct CoastResult {
    /// Dry running friction T_c, N·m.
    pub running_friction_n_m: Value,
    /// Brake viscous coefficient c₁, N·m·s/rad.
    pub viscous_n_m_s: Value,
    /// Speed at time zero, rad/s.
    pub omega0_rad_s: Value,
    /// Brake quadratic coefficient held, N·m·s²/rad².
    pub quadratic_n_m_s2: f64,
    /// Air drag coefficient k_a (T_air = k_a ω²), N·m·s²/rad².
    pub air_n_m_s2: f64,
    /// Inertia used, kg·m².
    pub inertia_kg_m2: f64,
    /// Where it came from.
    pub inertia_source: InertiaSource,
    /// Time from zero to standstill of the fitted model, s (None if it
    /// does not stop within 100 times the record).
    pub stop_time_s: Option<f64>,
    /// Each point against the fit.
    pub residuals: Vec<CoastResidual>,
    /// RMS residual: s for turn times, rpm for speeds.
    pub rms_residual: f64,
    /// True for turn times (residuals in s), false for speeds (rpm).
    pub turn_times: bool,
    /// Residual degrees of freedom.
    pub dof: usize,
}

/// The coast-down parameters.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CoastParams {
    /// Inertia, kg·m².
    pub inertia_kg_m2: f64,
    /// Dry running friction, N·m.
    pub running_n_m: f64,
    /// c₁, N·m·s/rad.
    pub viscous: f64,
    /// c₂ + k_a, N·m·s²/rad².
    pub quadratic: f64,
    /// ω at time zero, rad/s.
    pub omega0_rad_s: f64,
}

/// A coast-down integrated to `t_end`: (t, θ, ω) at each step, and the stop time.
#[derive(Debug, Clone)]
pub struct Trace {
    t: Vec<f64>,
    theta: Vec<f64>,
    omega: Vec<f64>,
    /// Time of standstill, s (None if still turning at the end).
    pub stop_s: Option<f64>,
}

fn decel(p: &CoastParams, w: f64) -> f64 {
    if w <= 0.0 {
        return 0.0;
    }
    (p.running_n_m + p.viscous * w + p.quadratic * w * w) / p.inertia_kg_m2
}

/// Integrate the coast-down from time zero to `t_end` in `steps` RK4 steps.
pub fn integrate(p: &CoastParams, t_end: f64, steps: usize) -> Trace {
    let h = t_end / steps.max(1) as f64;
    let mut tr = Trace {
        t: vec![0.0],
        theta: vec![0.0],
        omega: vec![p.omega0_rad_s],
        stop_s: (p.omega0_rad_s <= 0.0).then_some(0.0),
    };
    let (mut t, mut th, mut w) = (0.0, 0.0, p.omega0_rad_s.max(0.0));
    for _ in 0..steps {
        if w <= 0.0 {
            break;
        }
        let f = |w: f64| -decel(p, w);
        let k1 = f(w);
        let k2 = f((w + 0.5 * h * k1).max(0.0));
        let k3 = f((w + 0.5 * h * k2).max(0.0));
        let k4 = f((w + h * k3).max(0.0));
        let wn = w + h / 6.0 * (k1 + 2.0 * k2 + 2.0 * k3 + k4);
        if wn <= 0.0 {
            // Stops inside the step: the deceleration is nearly constant at
            // the end (T_c dominates), so t_stop ≈ t + ω/a, θ gains ω²/(2a).
            let a = decel(p, w).max(1e-300);
            let dt = (w / a).min(h);
            t += dt;
            th += w * dt - 0.5 * a * dt * dt;
            tr.t.push(t);
            tr.theta.push(th);
            tr.omega.push(0.0);
            tr.stop_s = Some(t);
            return tr;
        }
        // θ by Simpson on ω (the same stages).
        let wm = (w + 0.5 * h * k2).max(0.0);
        th += h / 6.0 * (w + 4.0 * wm + wn);
        t += h;
        w = wn;
        tr.t.push(t);
        tr.theta.push(th);
        tr.omega.push(w);
    }
    tr
}

impl Trace {
    /// Time at which θ reaches `angle`, s (None if it never does).
    pub fn time_at_angle(&self, angle: f64) -> Option<f64> {
        let i = self.theta.partition_point(|&th| th < angle);
        if i == 0 {
            return (angle <= 0.0).then_some(0.0);
        }
        let (t0, t1) = (*self.t.get(i - 1)?, *self.t.get(i)?);
        let (a0, a1) = (*self.theta.get(i - 1)?, *self.theta.get(i)?);
        let (w0, w1) = (*self.omega.get(i - 1)?, *self.omega.get(i)?);
        let h = t1 - t0;
        // Cubic Hermite θ(s), s ∈ [0, 1], with slopes ω·h; bisection.
        let theta = |s: f64| {
            let (s2, s3) = (s * s, s * s * s);
            (2.0 * s3 - 3.0 * s2 + 1.0) * a0
                + (s3 - 2.0 * s2 + s) * h * w0
                + (-2.0 * s3 + 3.0 * s2) * a1
                + (s3 - s2) * h * w1
        };
        let (mut lo, mut hi) = (0.0, 1.0);
        for _ in 0..50 {
            let mid = 0.5 * (lo + hi);
            if theta(mid) < angle {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        Some(t0 + 0.5 * (lo + hi) * h)
    }

    /// Speed at time `t`, rad/s (zero once stopped; None past the end).
    pub fn omega_at(&self, t: f64) -> Option<f64> {
        if let Some(s) = self.stop_s {
            if t >= s {
                return Some(0.0);
            }
        }
        let i = self.t.partition_point(|&x| x < t);
        if i == 0 {
            return self.omega.first().copied();
        }
        let (t0, t1) = (*self.t.get(i - 1)?, *self.t.get(i)?);
        let (w0, w1) = (*self.omega.get(i - 1)?, *self.omega.get(i)?);
        Some(w0 + (w1 - w0) * (t - t0) / (t1 - t0))
    }
}

/// Steps per integration.
const STEPS: usize = 4000;

fn validate(data: &CoastData) -> Result<(), CoastError> {
    let times: Vec<f64> = match data {
        CoastData::TurnTimes(t) => t.clone(),
        CoastData::Speeds(s) => s.iter().map(|(t, _)| *t).collect(),
    };
    if times.len() < 4 {
        return Err(CoastError::TooFew(times.len()));
    }
    let mut last = if matches!(data, CoastData::TurnTimes(_)) {
        0.0
    } else {
        -1.0
    };
    for (i, t) in times.iter().enumerate() {
        if !t.is_finite() || *t <= last {
            return Err(CoastError::Bad {
                index: i + 1,
                why: format!(
                    "time {t} s must be a number above the one before it{}",
                    if i == 0 && matches!(data, CoastData::TurnTimes(_)) {
                        " (and above zero)"
                    } else {
                        ""
                    }
                ),
            });
        }
        last = *t;
    }
    if let CoastData::Speeds(s) = data {
        for (i, (_, r)) in s.iter().enumerate() {
            if !r.is_finite() || *r < 0.0 {
                return Err(CoastError::Bad {
                    index: i + 1,
                    why: format!("speed {r} rpm must be zero or more"),
                });
            }
        }
    }
    Ok(())
}

/// The inertia a coast-down uses: the design's given inertia, or its estimate
/// with the arms drained.
pub fn coast_inertia(design: &Design) -> (f64, InertiaSource) {
    match design.rotor.inertia {
        Inertia::Given { kg_m2 } => (kg_m2, InertiaSource::Given),
        Inertia::Estimate { .. } => (rotor_inertia_kg_m2(design, 0.0), InertiaSource::Estimated),
    }
}

/// Fit a coast-down. `inertia_kg_m2` overrides the design's.
pub fn fit_coast(
    design: &Design,
    data: &CoastData,
    inertia_kg_m2: Option<f64>,
) -> Result<CoastResult, CoastError> {
    validate(data)?;
    let (inertia, source) = match inertia_kg_m2 {
        Some(i) => (i, InertiaSource::Override),
        None => coast_inertia(design),
    };
    if !(inertia.is_finite() && inertia > 0.0) {
        return Err(CoastError::Inertia(inertia));
    }
    let air = air_drag_torque(design, &SpinModel::new(design).fluids.air, 1.0);
    let c2 = design.friction.brake.quadratic;
    let quad = c2 + air;
    let t_last = match data {
        CoastData::TurnTimes(t) => t.last().copied().unwrap_or(1.0),
        CoastData::Speeds(s) => s.last().map_or(1.0, |x| x.0),
    };
    let t_end = 1.5 * t_last;
    let params = |x: &[f64]| CoastParams {
        inertia_kg_m2: inertia,
        omega0_rad_s: x.first().copied().unwrap_or(0.0),
        running_n_m: x.get(1).copied().unwrap_or(0.0),
        viscous: x.get(2).copied().unwrap_or(0.0),
        quadratic: quad,
    };
    let model = |x: &[f64]| -> Option<Vec<f64>> {
        let tr = integrate(&params(x), t_end, STEPS);
        match data {
            CoastData::TurnTimes(ts) => ts
                .iter()
                .enumerate()
                .map(|(k, t)| tr.time_at_angle(TAU * (k + 1) as f64).map(|m| m - t))
                .collect(),
            CoastData::Speeds(s) => s
                .iter()
                .map(|(t, r)| tr.omega_at(*t).map(|w| rpm(w) - r))
                .collect(),
        }
    };
    let x0 = start(data, inertia).ok_or(CoastError::NoStart)?;
    // Ease the friction off until the start turns as many times as measured.
    let mut x0 = x0;
    let mut tries = 0;
    while model(&x0).is_none() {
        tries += 1;
        if tries > 40 {
            return Err(CoastError::NoStart);
        }
        if let Some(w) = x0.first_mut() {
            *w *= 1.1;
        }
        for v in x0.iter_mut().skip(1) {
            *v *= 0.7;
        }
    }
    let scale = vec![
        x0.first().copied().unwrap_or(1.0).abs().max(1e-3),
        x0.get(1).copied().unwrap_or(0.0).abs().max(1e-7),
        x0.get(2).copied().unwrap_or(0.0).abs().max(1e-8),
    ];
    let lsq = levenberg_marquardt(
        &model,
        &LsqProblem {
            x0,
            scale,
            lower: vec![0.0; 3],
            max_iter: 200,
        },
    )?;
    let t = t95(lsq.dof);
    let value = |i: usize| {
        let se = lsq.std_error.get(i).copied().flatten();
        Value {
            value: lsq.x.get(i).copied().unwrap_or(0.0),
            std_error: se,
            ci95: se.map(|s| s * t),
            at_zero: lsq.at_bound.get(i).copied().unwrap_or(false),
        }
    };
    let p = params(&lsq.x);
    let stop = integrate(&p, 100.0 * t_last, 100 * STEPS).stop_s;
    let residuals: Vec<CoastResidual> = match data {
        CoastData::TurnTimes(ts) => ts
            .iter()
            .zip(&lsq.residuals)
            .enumerate()
            .map(|(k, (t, r))| CoastResidual {
                at: (k + 1) as f64,
                measured: *t,
                model: t + r,
            })
            .collect(),
        CoastData::Speeds(s) => s
            .iter()
            .zip(&lsq.residuals)
            .map(|((t, m), r)| CoastResidual {
                at: *t,
                measured: *m,
                model: m + r,
            })
            .collect(),
    };
    Ok(CoastResult {
        omega0_rad_s: value(0),
        running_friction_n_m: value(1),
        viscous_n_m_s: value(2),
        quadratic_n_m_s2: c2,
        air_n_m_s2: air,
        inertia_kg_m2: inertia,
        inertia_source: source,
        stop_time_s: stop,
        rms_residual: lsq.rms(),
        turn_times: matches!(data, CoastData::TurnTimes(_)),
        residuals,
        dof: lsq.dof,
    })
}

/// A start from the data: speeds per interval, a straight line ω(t) through
/// them, its slope as a constant friction, half of it moved to the brake.
fn start(data: &CoastData, inertia: f64) -> Option<Vec<f64>> {
    let pts: Vec<(f64, f64)> = match data {
        CoastData::TurnTimes(ts) => {
            let mut prev = 0.0;
            ts.iter()
                .map(|t| {
                    let p = ((prev + t) / 2.0, TAU / (t - prev));
                    prev = *t;
                    p
                })
                .collect()
        }
        CoastData::Speeds(s) => s
            .iter()
            .map(|(t, r)| (*t, r * TAU / 60.0))
            .filter(|(_, w)| *w > 0.0)
            .collect(),
    };
    if pts.len() < 2 {
        return None;
    }
    let n = pts.len() as f64;
    let mt = pts.iter().map(|p| p.0).sum::<f64>() / n;
    let mw = pts.iter().map(|p| p.1).sum::<f64>() / n;
    let sxx: f64 = pts.iter().map(|p| (p.0 - mt).powi(2)).sum();
    let sxy: f64 = pts.iter().map(|p| (p.0 - mt) * (p.1 - mw)).sum();
    let slope = if sxx > 0.0 { sxy / sxx } else { 0.0 };
    let w0 = (mw - slope * mt).max(pts.first()?.1);
    let decel = (-slope).max(1e-6 * w0);
    let torque = inertia * decel;
    Some(vec![w0, 0.5 * torque, 0.5 * torque / mw.max(1e-6)])
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn constant_friction_stops_on_time() {
        // T_c alone: ω falls linearly, t_stop = I ω₀ / T_c, θ_stop = I ω₀² / (2 T_c).
        let p = CoastParams {
            inertia_kg_m2: 2e-3,
            running_n_m: 0.01,
            viscous: 0.0,
            quadratic: 0.0,
            omega0_rad_s: 10.0,
        };
        let tr = integrate(&p, 5.0, 4000);
        assert!((tr.stop_s.unwrap() - 2.0).abs() < 1e-9);
        assert!((tr.theta.last().unwrap() - 10.0).abs() < 1e-9);
        // Half-way in angle (5 rad): 5 = 10t − 2.5t², t = 2 − √2.
        let t = tr.time_at_angle(5.0).unwrap();
        assert!((t - (2.0 - 2f64.sqrt())).abs() < 1e-9, "{t}");
    }
}
