//! What the readings imply (model.md M10): the bearing friction at which the
//! measured speed is the model's balance speed, and the common nozzle scale
//! that passes the measured flow. Both are roots found by Brent's method on
//! the full model, bracketed by growing steps ([`crate::numeric::root`]);
//! the numbers varied are the catalogue's inputs.

use super::ImpliedFriction;
use crate::catalogue::{self, Input};
use crate::numeric::root::{brent, doubling, grow_bracket, Tolerance};
use crate::physics::balance::{rad_s, rpm, solve_speed, SpinModel};
use crate::physics::design::{Bearing, Design, Supply};
use crate::physics::torque::{washer_axial_force_n, washer_effective_radius_m};

/// The catalogue input that is the bearing's running friction: a measured
/// bearing's running torque, or a washer's kinetic μ. With its value.
fn knob_of(design: &Design) -> Option<(&'static Input, f64)> {
    [&catalogue::RUNNING, &catalogue::MU_KINETIC]
        .into_iter()
        .find_map(|input| Some((input, input.number(design, None)?)))
}

/// `design` with the running friction `knob` set to `x`.
fn with_knob(design: &Design, knob: &Input, x: f64) -> Design {
    let mut d = design.clone();
    if !knob.set_number(&mut d, None, Some(x)) && *knob == catalogue::RUNNING {
        // A washer that carries no load at this speed: its friction is
        // stood in for by a measured running torque.
        let breakaway = match d.friction.bearing {
            Bearing::Washer(w) if w.mu_kinetic > 0.0 => x.max(0.0) * w.mu_static / w.mu_kinetic,
            _ => x.max(0.0),
        };
        d.friction.bearing = Bearing::Measured {
            running_n_m: x,
            breakaway_n_m: breakaway,
        };
    }
    d
}

/// Root of a decreasing function `f` near `x0`, bracketed by expanding steps.
fn decreasing_root(f: impl Fn(f64) -> f64, x0: f64, step0: f64, f_scale: f64) -> Option<f64> {
    let f0 = f(x0);
    if f0 == 0.0 {
        return Some(x0);
    }
    // f decreasing: root above x0 when f0 > 0.
    let dir = if f0 > 0.0 { 1.0 } else { -1.0 };
    let (_, far) = grow_bracket(&f, x0, f0, doubling(x0, dir, step0, 200))?;
    let (lo, hi) = if dir > 0.0 { (x0, far) } else { (far, x0) };
    let tol = Tolerance {
        x: 1e-15 * lo.abs().max(hi.abs()).max(step0),
        f: 1e-14 * f_scale,
        max_iter: 200,
    };
    brent(&f, lo, hi, tol).ok()
}

/// Bearing torque of `design` turning at ω, N·m.
fn bearing_torque(design: &Design, omega: f64) -> f64 {
    SpinModel::new(design).point(omega).resist.bearing_n_m
}

/// The running-friction value that balances the model at ω, and the design with it.
fn balance_friction(design: &Design, omega: f64) -> Option<(&'static Input, f64, Design)> {
    let model = SpinModel::new(design);
    let point = model.point(omega);
    let scale = point
        .drive_n_m
        .abs()
        .max(point.resist.total_n_m())
        .max(1e-12);
    let (mut knob, mut x0) = knob_of(design)?;
    if let Bearing::Washer(w) = design.friction.bearing {
        let rho = model.fluids.water.density_kg_m3;
        let lever =
            washer_axial_force_n(&w, design, &point.state, rho) * washer_effective_radius_m(&w);
        if lever <= 1e-9 * scale {
            knob = &catalogue::RUNNING;
            x0 = point.resist.bearing_n_m;
        }
    }
    let step0 = if *knob == catalogue::RUNNING {
        x0.abs().max(1e-3 * scale)
    } else {
        x0.abs().max(0.01)
    };
    let net = |x: f64| SpinModel::new(&with_knob(design, knob, x)).net(omega);
    let x = decreasing_root(net, x0, step0, scale)?;
    Some((knob, x, with_knob(design, knob, x)))
}

pub(super) fn implied_friction(
    nominal: &Design,
    omega: f64,
    band_rpm: [f64; 2],
) -> Option<(ImpliedFriction, Design)> {
    let (knob, x, adjusted) = balance_friction(nominal, omega)?;
    let implied = bearing_torque(&adjusted, omega);
    let design_torque = bearing_torque(nominal, omega);
    let point = SpinModel::new(nominal).point(omega);
    let other = point.resist.total_n_m() - point.resist.bearing_n_m;
    let band_torque =
        |r: f64| balance_friction(nominal, rad_s(r)).map(|(_, _, d)| bearing_torque(&d, rad_s(r)));
    let a = band_torque(band_rpm[0]).unwrap_or(implied);
    let b = band_torque(band_rpm[1]).unwrap_or(implied);
    let model_rpm = solve_speed(&adjusted)
        .operating
        .map(|op| rpm(op.omega_rad_s()));
    let (implied_mu, design_mu) = match (knob, nominal.friction.bearing) {
        (k, Bearing::Washer(w)) if *k == catalogue::MU_KINETIC => (Some(x), Some(w.mu_kinetic)),
        (_, Bearing::Washer(w)) => (None, Some(w.mu_kinetic)),
        _ => (None, None),
    };
    Some((
        ImpliedFriction {
            measured_omega_rad_s: omega,
            implied_running_torque_n_m: implied,
            design_running_torque_n_m: design_torque,
            ratio: (design_torque > 0.0).then(|| implied / design_torque),
            implied_mu_kinetic: implied_mu,
            design_mu_kinetic: design_mu,
            band_n_m: [a.min(b), a.max(b)],
            drive_torque_n_m: point.drive_n_m,
            other_resisting_n_m: other,
            model_rpm,
        },
        adjusted,
    ))
}

pub(super) fn with_pressure(design: &Design, inlet_pa: f64) -> Design {
    let mut d = design.clone();
    d.supply = Supply::Pressure { inlet_pa };
    d
}

pub(super) fn with_nozzle_scale(design: &Design, scale: f64) -> Design {
    let mut d = design.clone();
    let nozzle = &catalogue::NOZZLE_DIAMETER;
    for k in 0..d.rotor.arms.len() {
        if let Some(v) = nozzle.number(&d, Some(k)) {
            nozzle.set_number(&mut d, Some(k), Some(v * scale));
        }
    }
    d
}

pub(super) fn flow_at(design: &Design, omega: f64) -> f64 {
    SpinModel::new(design).state(omega).total_flow_m3_s
}

/// Largest common nozzle scale tried (the arm tubes cap the flow long before).
const MAX_NOZZLE_SCALE: f64 = 20.0;

pub(super) fn nozzle_scale_for(design: &Design, omega: f64, flow: f64) -> Option<f64> {
    let f = |s: f64| flow_at(&with_nozzle_scale(design, s), omega) - flow;
    let f1 = f(1.0);
    if f1 == 0.0 {
        return Some(1.0);
    }
    // Grow by 1.5 up to MAX_NOZZLE_SCALE, or shrink by 1.5 down to 1e-4.
    let (lo, hi) = if f1 < 0.0 {
        let up = std::iter::successors(Some(1.5), |&h: &f64| {
            (h < MAX_NOZZLE_SCALE).then(|| (h * 1.5).min(MAX_NOZZLE_SCALE))
        });
        grow_bracket(f, 1.0, f1, up)?
    } else {
        let down = std::iter::successors(Some(1.0 / 1.5), |&l: &f64| (l >= 1e-4).then(|| l / 1.5));
        let (hi, lo) = grow_bracket(f, 1.0, f1, down)?;
        (lo, hi)
    };
    let tol = Tolerance {
        x: 1e-15 * hi,
        f: 1e-13 * flow,
        max_iter: 200,
    };
    brent(f, lo, hi, tol).ok()
}
