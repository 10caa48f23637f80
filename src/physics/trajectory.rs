//! Throw: the flight of one water drop from the nozzle to the ground (model.md M7).
//!
//! A drop of diameter d leaves the nozzle exit with the jet's absolute velocity
//! and flies in the ground frame under gravity and air drag:
//!
//! ```text
//! dv/dt = g − (3 ρ_air C_D(Re, d) / (4 ρ_w d)) |u| u,   u = v − v_wind,
//! Re = ρ_air |u| d / μ_air,                              dx/dt = v
//! ```
//!
//! with g = (0, 0, −9.806 65) m/s². Buoyancy (ρ_air/ρ_w ≈ 0.12 %) is left out,
//! here and in [`terminal_velocity_m_s`], so the two agree exactly.
//!
//! # Drag law for water drops
//!
//! In [`drag`]: Clift & Gauvin's (1971) rigid-sphere law times a deformation
//! factor fitted to Gunn & Kinzer's (1949) terminal speeds.
//!
//! # Integration
//!
//! Dormand & Prince (1980) 5(4) embedded Runge–Kutta pair with local
//! extrapolation (the step is advanced with the 5th-order solution), an
//! RMS error norm with scale `atol + rtol·max(|y|, |y_new|)`, step factor
//! 0.9·err^(−1/5) kept within 0.2–10, and Shampine's (1986) quartic dense
//! output. Ground contact z = 0 is found on the dense output of the step that
//! crosses it, by Brent's method, so the landing point does not depend on where
//! the steps happen to fall.

use super::breakup::{break_up, drag_factor, Breakup, IntactStream, JetModel};
use super::design::{Wind, GRAVITY_M_S2};
use super::fluid::{AirProps, WaterProps};
use super::jet::JetExit;
use super::InvalidInput;
use crate::numeric::ode::{
    attempt, grow_factor, initial_step, shrink_factor, Attempt, DenseStep, State,
};
use crate::numeric::root::{brent, Tolerance};
use nalgebra::Vector3;

mod drag;

pub use drag::{
    clift_gauvin, deformation_factor, schiller_naumann, DragLaw, DEFORMATION_FIT_MAX_M,
};

/// Errors from the throw, spray and pattern calculations (the layout and
/// uniformity figures fail only on an [`InvalidInput`], which converts into one).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ThrowError {
    /// An input value is out of its valid range.
    #[error("{field} {detail}")]
    InvalidInput {
        /// Which input, in words a technician recognises (with its unit).
        field: String,
        /// What is wrong with it and what is expected.
        detail: String,
    },
    /// A drop did not reach the ground within the time or step limit.
    #[error(
        "a {diameter_mm:.2} mm drop did not land within {limit}; \
         check the nozzle height and the wind"
    )]
    NoLanding {
        /// Drop diameter, mm.
        diameter_mm: f64,
        /// The limit that was hit, in words.
        limit: String,
    },
    /// The measured wetted radius needs an implausible jet.
    #[error(
        "a measured wetted radius of {measured_m:.2} m cannot be explained by a plausible \
         jet: breakup coefficients from {min_breakup} to {max_breakup} give \
         {min_m:.2}–{max_m:.2} m; check the measurement, the nozzle pressure and the jet angles"
    )]
    CalibrationUnreachable {
        /// Measured wetted radius, m.
        measured_m: f64,
        /// Wetted radius with the smallest plausible coefficient, m.
        min_m: f64,
        /// Wetted radius with the largest plausible coefficient, m.
        max_m: f64,
        /// Smallest plausible breakup coefficient.
        min_breakup: f64,
        /// Largest plausible breakup coefficient.
        max_breakup: f64,
    },
}

pub(crate) use super::{invalid, require_positive};

impl From<InvalidInput> for ThrowError {
    fn from(e: InvalidInput) -> Self {
        ThrowError::InvalidInput {
            field: e.field,
            detail: e.detail,
        }
    }
}

/// Checks that a vector's components are all finite.
fn require_finite_vector(field: &str, v: &Vector3<f64>) -> Result<(), ThrowError> {
    if v.iter().all(|c| c.is_finite()) {
        Ok(())
    } else {
        Err(ThrowError::InvalidInput {
            field: field.to_string(),
            detail: "has a component that is not a finite number".to_string(),
        })
    }
}

/// The air and water a drop flies through.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FlightEnv {
    /// Air density, kg/m³.
    pub air_density_kg_m3: f64,
    /// Air dynamic viscosity, Pa·s.
    pub air_viscosity_pa_s: f64,
    /// Water density (of the drop), kg/m³.
    pub water_density_kg_m3: f64,
    /// Wind velocity in the ground frame, m/s (horizontal; uniform with height).
    pub wind_m_s: Vector3<f64>,
    /// Magnitude of gravity, m/s² (acting along −z).
    pub gravity_m_s2: f64,
}

impl FlightEnv {
    /// Flight through `air` of drops of `water`, in `wind`, under standard gravity.
    pub fn new(air: &AirProps, water: &WaterProps, wind: &Wind) -> Self {
        FlightEnv {
            air_density_kg_m3: air.density_kg_m3,
            air_viscosity_pa_s: air.viscosity_pa_s,
            water_density_kg_m3: water.density_kg_m3,
            wind_m_s: wind.velocity(),
            gravity_m_s2: GRAVITY_M_S2,
        }
    }

    /// The same conditions in still air.
    pub fn still(&self) -> Self {
        FlightEnv {
            wind_m_s: Vector3::zeros(),
            ..*self
        }
    }

    fn validate(&self) -> Result<(), ThrowError> {
        require_positive("air density (kg/m³)", self.air_density_kg_m3)?;
        require_positive("air viscosity (Pa·s)", self.air_viscosity_pa_s)?;
        require_positive("water density (kg/m³)", self.water_density_kg_m3)?;
        require_positive("gravity (m/s²)", self.gravity_m_s2)?;
        require_finite_vector("wind velocity (m/s)", &self.wind_m_s)
    }
}

/// Accuracy and limits of one flight integration.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FlightOptions {
    /// Drag law.
    pub drag: DragLaw,
    /// Relative local error tolerance.
    pub rtol: f64,
    /// Absolute local error tolerance (m for positions, m/s for velocities).
    pub atol: f64,
    /// Give up when the drop is still in the air after this long, s.
    pub max_time_s: f64,
    /// Give up after this many steps (accepted and rejected).
    pub max_steps: usize,
    /// The intact jet and sheltered spray of [`fly_jet`] ([`JetModel::bare_drops`]
    /// flies drops from the nozzle exit with full drag).
    pub jet: JetModel,
}

impl Default for FlightOptions {
    /// Tight tolerances for single trajectories (rtol = atol = 1e-9).
    fn default() -> Self {
        FlightOptions {
            drag: DragLaw::WaterDrop,
            rtol: 1e-9,
            atol: 1e-9,
            max_time_s: 600.0,
            max_steps: 100_000,
            jet: JetModel::default(),
        }
    }
}

impl FlightOptions {
    /// Looser tolerances for patterns with thousands of drops (rtol = atol = 1e-5;
    /// landing distances within 1e-4 relative of the tight default).
    pub fn pattern() -> Self {
        FlightOptions {
            rtol: 1e-5,
            atol: 1e-5,
            ..FlightOptions::default()
        }
    }

    fn validate(&self) -> Result<(), ThrowError> {
        require_positive("relative tolerance", self.rtol)?;
        require_positive("absolute tolerance", self.atol)?;
        require_positive("flight time limit (s)", self.max_time_s)?;
        if self.max_steps == 0 {
            return Err(invalid("step limit", 0.0, "at least 1"));
        }
        self.jet.validate()
    }
}

/// Where and how a drop reached the ground.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Landing {
    /// Landing point in the ground frame, m (z = 0).
    pub point_m: Vector3<f64>,
    /// Horizontal distance of the landing point from the spin axis, m.
    pub distance_m: f64,
    /// Time of flight, s.
    pub time_s: f64,
    /// Drop velocity at impact, m/s.
    pub velocity_m_s: Vector3<f64>,
    /// Highest point of the flight above ground, m (from the step ends).
    pub apex_m: f64,
    /// Accepted integration steps.
    pub steps: usize,
    /// Where the drop started flying as a drop, m: the jet's breakup point
    /// (the nozzle exit for a bare drop).
    pub breakup_point_m: Vector3<f64>,
}

/// One sampled point of a flight path.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PathPoint {
    /// Time since leaving the nozzle, s.
    pub time_s: f64,
    /// Position in the ground frame, m.
    pub position_m: Vector3<f64>,
}

/// A flight path for drawing: points evenly spaced in time, the last one on the ground.
#[derive(Debug, Clone, PartialEq)]
pub struct FlightPath {
    /// Drop diameter, m.
    pub diameter_m: f64,
    /// The landing.
    pub landing: Landing,
    /// Points from the nozzle (first) to the landing point (last).
    pub points: Vec<PathPoint>,
}

/// The right-hand side of the flight equations for one drop.
struct Drop {
    /// 3 ρ_air F(d) / (4 ρ_w d), 1/m.
    k: f64,
    /// Breakup point the sheltering is measured from, m.
    origin: Vector3<f64>,
    /// Relaxation length of the sheltered spray's drag, m (0: full drag throughout).
    relaxation_m: f64,
    /// Drag factor at the breakup point.
    initial_drag_factor: f64,
    /// ρ_air d / μ_air, s/m (Re per unit relative speed).
    re_per_speed: f64,
    drag: DragLaw,
    wind: Vector3<f64>,
    g: f64,
}

impl Drop {
    fn new(diameter_m: f64, env: &FlightEnv, drag: DragLaw) -> Self {
        Drop {
            origin: Vector3::zeros(),
            relaxation_m: 0.0,
            initial_drag_factor: 1.0,
            k: 3.0 * env.air_density_kg_m3 * drag.size_factor(diameter_m)
                / (4.0 * env.water_density_kg_m3 * diameter_m),
            re_per_speed: env.air_density_kg_m3 * diameter_m / env.air_viscosity_pa_s,
            drag,
            wind: env.wind_m_s,
            g: env.gravity_m_s2,
        }
    }

    /// Drag deceleration per unit relative speed, 1/s: (3 ρ_a C_D/(4 ρ_w d)) |u|.
    fn drag_rate(&self, speed: f64) -> f64 {
        if speed <= 0.0 || self.drag == DragLaw::None {
            return 0.0;
        }
        self.k * self.drag.sphere(self.re_per_speed * speed) * speed
    }

    fn rhs(&self, y: &State) -> State {
        let u = [y[3] - self.wind.x, y[4] - self.wind.y, y[5] - self.wind.z];
        let speed = (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]).sqrt();
        let mut c = self.drag_rate(speed);
        if self.relaxation_m > 0.0 {
            let s = ((y[0] - self.origin.x).powi(2)
                + (y[1] - self.origin.y).powi(2)
                + (y[2] - self.origin.z).powi(2))
            .sqrt();
            c *= drag_factor(s, self.relaxation_m, self.initial_drag_factor);
        }
        [y[3], y[4], y[5], -c * u[0], -c * u[1], -self.g - c * u[2]]
    }
}

/// Integrates one drop to the ground. `shelter` = (relaxation length m,
/// initial drag factor): a relaxation length > 0 shelters it as a drop of a
/// fresh spray that broke up at `start_m` ([`drag_factor`]). `record`
/// receives every accepted step.
fn integrate(
    start_m: &Vector3<f64>,
    velocity_m_s: &Vector3<f64>,
    diameter_m: f64,
    env: &FlightEnv,
    opts: &FlightOptions,
    shelter: (f64, f64),
    mut record: Option<&mut Vec<DenseStep>>,
) -> Result<Landing, ThrowError> {
    require_finite_vector("nozzle position (m)", start_m)?;
    require_finite_vector("jet velocity (m/s)", velocity_m_s)?;
    require_positive("drop diameter (m)", diameter_m)?;
    env.validate()?;
    opts.validate()?;
    if start_m.z < 0.0 {
        return Err(invalid(
            "nozzle height above ground (m)",
            start_m.z,
            "zero or more",
        ));
    }
    let drop = Drop {
        origin: *start_m,
        relaxation_m: shelter.0,
        initial_drag_factor: shelter.1,
        ..Drop::new(diameter_m, env, opts.drag)
    };
    let mut y: State = [
        start_m.x,
        start_m.y,
        start_m.z,
        velocity_m_s.x,
        velocity_m_s.y,
        velocity_m_s.z,
    ];
    let landed_at_start = |y: &State| {
        let point = Vector3::new(y[0], y[1], 0.0);
        Landing {
            point_m: point,
            distance_m: point.xy().norm(),
            time_s: 0.0,
            velocity_m_s: Vector3::new(y[3], y[4], y[5]),
            apex_m: y[2],
            steps: 0,
            breakup_point_m: *start_m,
        }
    };
    if y[2] == 0.0 && y[5] <= 0.0 {
        return Ok(landed_at_start(&y));
    }
    let rhs = |y: &State| drop.rhs(y);
    let mut f = rhs(&y);
    let mut h = initial_step(&rhs, &y, &f, opts.rtol, opts.atol, opts.max_time_s);
    let mut t = 0.0;
    let mut apex = y[2];
    let mut accepted = 0usize;
    let mut attempts = 0usize;
    let mut rejected_last = false;
    loop {
        attempts += 1;
        if attempts > opts.max_steps {
            return Err(ThrowError::NoLanding {
                diameter_mm: diameter_m * 1e3,
                limit: format!("{} integration steps", opts.max_steps),
            });
        }
        if t >= opts.max_time_s {
            return Err(ThrowError::NoLanding {
                diameter_mm: diameter_m * 1e3,
                limit: format!("{} s of flight", opts.max_time_s),
            });
        }
        let min_step = 10.0 * f64::EPSILON * t.abs().max(1e-3);
        if h < min_step {
            return Err(ThrowError::NoLanding {
                diameter_mm: diameter_m * 1e3,
                limit: "the smallest step the integrator can take".to_string(),
            });
        }
        let Attempt {
            y_new,
            err_norm,
            step,
        } = attempt(&rhs, t, &y, &f, h, opts.rtol, opts.atol);
        if !err_norm.is_finite() || err_norm > 1.0 {
            h *= shrink_factor(err_norm);
            rejected_last = true;
            continue;
        }
        // A drop that starts on the ground going up must leave it before the
        // crossing test below can bracket its landing.
        if y[2] <= 0.0 && y_new[2] <= 0.0 {
            h *= 0.5;
            continue;
        }
        accepted += 1;
        if let Some(rec) = record.as_deref_mut() {
            rec.push(step);
        }
        if y_new[2] <= 0.0 {
            // Ground contact inside this step: z(θ) has z(0) > 0 ≥ z(1).
            let theta = if y_new[2] == 0.0 {
                1.0
            } else {
                let tol = Tolerance {
                    x: 1e-13,
                    f: 0.0,
                    max_iter: 200,
                };
                brent(|th| step.component_at(2, th), 0.0, 1.0, tol).unwrap_or(1.0)
            };
            let yl = step.at(theta);
            let point = Vector3::new(yl[0], yl[1], 0.0);
            return Ok(Landing {
                point_m: point,
                distance_m: point.xy().norm(),
                time_s: t + theta * h,
                velocity_m_s: Vector3::new(yl[3], yl[4], yl[5]),
                apex_m: apex,
                steps: accepted,
                breakup_point_m: *start_m,
            });
        }
        apex = apex.max(y_new[2]);
        t += h;
        y = y_new;
        f = step.k[6];
        let factor = grow_factor(err_norm);
        h *= if rejected_last {
            factor.min(1.0)
        } else {
            factor
        };
        rejected_last = false;
    }
}

/// Flies one drop of diameter `diameter_m` from `start_m` with initial velocity
/// `velocity_m_s` (ground frame) until it touches z = 0, with full drag all
/// the way (a lone drop; no intact jet, no sheltering).
pub fn fly(
    start_m: &Vector3<f64>,
    velocity_m_s: &Vector3<f64>,
    diameter_m: f64,
    env: &FlightEnv,
    opts: &FlightOptions,
) -> Result<Landing, ThrowError> {
    integrate(
        start_m,
        velocity_m_s,
        diameter_m,
        env,
        opts,
        (0.0, 1.0),
        None,
    )
}

/// A drop's flight after the intact stream: the stream's own landing when it
/// reached the ground intact, else the drop flown from the breakup point in
/// the sheltered spray. Times and the apex count from the nozzle.
pub fn fly_from_breakup(
    breakup: &Breakup,
    diameter_m: f64,
    env: &FlightEnv,
    opts: &FlightOptions,
) -> Result<Landing, ThrowError> {
    fly_after_breakup(breakup, diameter_m, env, opts, None)
}

fn fly_after_breakup(
    breakup: &Breakup,
    diameter_m: f64,
    env: &FlightEnv,
    opts: &FlightOptions,
    record: Option<&mut Vec<DenseStep>>,
) -> Result<Landing, ThrowError> {
    if breakup.landed_intact {
        require_positive("drop diameter (m)", diameter_m)?;
        let point = breakup.point_m;
        return Ok(Landing {
            point_m: point,
            distance_m: point.xy().norm(),
            time_s: breakup.time_s,
            velocity_m_s: breakup.velocity_m_s,
            apex_m: breakup.apex_m,
            steps: 0,
            breakup_point_m: point,
        });
    }
    let mut landing = integrate(
        &breakup.point_m,
        &breakup.velocity_m_s,
        diameter_m,
        env,
        opts,
        (breakup.relaxation_m, breakup.initial_drag_factor),
        record,
    )?;
    landing.time_s += breakup.time_s;
    landing.apex_m = landing.apex_m.max(breakup.apex_m);
    Ok(landing)
}

/// Flies one drop of diameter `diameter_m` from a nozzle's jet: the intact
/// stream to its breakup point, then the drop in the sheltered spray
/// ([`crate::physics::breakup`]); with `opts.jet` switched off, a bare drop
/// from the nozzle exit.
pub fn fly_jet(
    jet: &JetExit,
    diameter_m: f64,
    env: &FlightEnv,
    opts: &FlightOptions,
) -> Result<Landing, ThrowError> {
    env.validate()?;
    opts.validate()?;
    let breakup = break_up(jet, env, &opts.jet)?;
    fly_after_breakup(&breakup, diameter_m, env, opts, None)
}

/// Flies one drop from a jet exit, released from the stream after
/// `release` (0–1) of its intact length ([`crate::physics::breakup::release_fraction`];
/// 1: at breakup, as [`fly_jet`]), and samples its path at `samples` (≥ 2)
/// instants evenly spaced in time, the first at the nozzle and the last on
/// the ground; the intact stream is part of the path.
pub fn flight_path(
    jet: &JetExit,
    diameter_m: f64,
    release: f64,
    env: &FlightEnv,
    opts: &FlightOptions,
    samples: usize,
) -> Result<FlightPath, ThrowError> {
    if samples < 2 {
        return Err(invalid("path samples", samples as f64, "at least 2"));
    }
    env.validate()?;
    opts.validate()?;
    let breakup = IntactStream::new(jet, env, &opts.jet)?.release(release)?;
    let mut steps = Vec::new();
    let landing = fly_after_breakup(&breakup, diameter_m, env, opts, Some(&mut steps))?;
    let g = env.gravity_m_s2;
    let intact_at =
        |t: f64| jet.position_m + jet.velocity_m_s * t - Vector3::z() * (0.5 * g * t * t);
    let mut points = Vec::with_capacity(samples);
    let last = samples - 1;
    let mut idx = 0usize;
    for i in 0..samples {
        let t = landing.time_s * i as f64 / last as f64;
        let position = if i == 0 {
            jet.position_m
        } else if i == last {
            landing.point_m
        } else if t <= breakup.time_s {
            let p = intact_at(t);
            Vector3::new(p.x, p.y, p.z.max(0.0))
        } else {
            let td = t - breakup.time_s;
            while idx + 1 < steps.len() && steps.get(idx).is_some_and(|s| s.t0 + s.h < td) {
                idx += 1;
            }
            match steps.get(idx) {
                Some(s) => {
                    let theta = ((td - s.t0) / s.h).clamp(0.0, 1.0);
                    let y = s.at(theta);
                    Vector3::new(y[0], y[1], y[2].max(0.0))
                }
                None => landing.point_m,
            }
        };
        points.push(PathPoint {
            time_s: t,
            position_m: position,
        });
    }
    Ok(FlightPath {
        diameter_m,
        landing,
        points,
    })
}

/// Terminal fall speed of a drop of diameter `diameter_m` in still air, m/s.
///
/// Solves g = (3 ρ_air C_D(Re, d) / (4 ρ_w d)) V² for V (no buoyancy, as in
/// the flight equations). For [`DragLaw::None`] there is no terminal speed and
/// an error is returned.
pub fn terminal_velocity_m_s(
    diameter_m: f64,
    env: &FlightEnv,
    drag: DragLaw,
) -> Result<f64, ThrowError> {
    require_positive("drop diameter (m)", diameter_m)?;
    env.validate()?;
    if drag == DragLaw::None {
        return Err(ThrowError::InvalidInput {
            field: "drag law".to_string(),
            detail: "is 'no drag', which has no terminal speed".to_string(),
        });
    }
    let drop = Drop::new(diameter_m, env, drag);
    let residual = |v: f64| drop.drag_rate(v) * v - env.gravity_m_s2;
    let mut hi = 1.0;
    while residual(hi) < 0.0 {
        hi *= 2.0;
        if hi > 1e6 {
            return Err(invalid(
                "drop diameter (m)",
                diameter_m,
                "a size whose terminal speed is below 1000 km/s",
            ));
        }
    }
    let tol = Tolerance {
        x: 1e-12 * hi,
        f: 0.0,
        max_iter: 200,
    };
    brent(residual, 0.0, hi, tol).map_err(|e| ThrowError::InvalidInput {
        field: "terminal speed search".to_string(),
        detail: format!("failed on speeds 0 to {hi:.6e} m/s: {e}"),
    })
}

#[cfg(test)]
#[path = "trajectory_tests.rs"]
mod tests;
