//! Spin-up from rest (model.md M6): I dω/dt = net(ω) integrated by the
//! classical fourth-order Runge–Kutta method until the rotor reaches 90 % and
//! 99 % of its operating speed.

use super::SpinModel;

/// RK4 steps per time scale of the spin-up (see [`spin_up_times`]).
pub const SPIN_UP_STEPS_PER_TIME_SCALE: f64 = 4.0;

/// Time to come up to speed from rest.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SpinUp {
    /// Time to 90 % of the operating speed, s.
    pub t90_s: f64,
    /// Time to 99 % of the operating speed, s.
    pub t99_s: f64,
}

/// RK4 on I dω/dt = net(ω) from rest; times to 90 % and 99 % of `omega_op`.
///
/// The step is a fraction (1/[`SPIN_UP_STEPS_PER_TIME_SCALE`]) of the smaller of two time scales: the settling
/// constant I/|d net/dω| at the operating point and the rise time I·ω_op/net(0).
/// Crossing times are read off the cubic Hermite interpolant of each step.
pub fn spin_up_times(
    model: &SpinModel,
    inertia: f64,
    omega_op: f64,
    net_at_rest: f64,
) -> Option<SpinUp> {
    spin_up_with_step_scale(model, inertia, omega_op, net_at_rest, 1.0)
}

/// [`spin_up_times`] with the step divided by `refine`.
fn spin_up_with_step_scale(
    model: &SpinModel,
    inertia: f64,
    omega_op: f64,
    net_at_rest: f64,
    refine: f64,
) -> Option<SpinUp> {
    if inertia <= 0.0 || omega_op <= 0.0 {
        return None;
    }
    let h = 1e-4 * omega_op;
    let slope = (model.net(omega_op + h) - model.net((omega_op - h).max(0.0))) / (2.0 * h);
    let settle = if slope < 0.0 {
        inertia / -slope
    } else {
        f64::INFINITY
    };
    let rise = if net_at_rest > 0.0 {
        inertia * omega_op / net_at_rest
    } else {
        settle
    };
    let dt = settle.min(rise) / (SPIN_UP_STEPS_PER_TIME_SCALE * refine);
    if !dt.is_finite() || dt <= 0.0 {
        return None;
    }
    let accel = |w: f64| model.net(w) / inertia;
    let targets = [0.9 * omega_op, 0.99 * omega_op];
    let mut times = [None, None];
    let (mut t, mut w, mut a) = (0.0, 0.0, accel(0.0));
    for _ in 0..100_000 {
        let k1 = a;
        let k2 = accel(w + 0.5 * dt * k1);
        let k3 = accel(w + 0.5 * dt * k2);
        let k4 = accel(w + dt * k3);
        let w1 = w + dt / 6.0 * (k1 + 2.0 * k2 + 2.0 * k3 + k4);
        let a1 = accel(w1);
        for (slot, &target) in times.iter_mut().zip(&targets) {
            if slot.is_none() && w1 >= target {
                *slot = Some(t + dt * hermite_crossing(w, w1, a * dt, a1 * dt, target));
            }
        }
        if times.iter().all(Option::is_some) {
            break;
        }
        (t, w, a) = (t + dt, w1, a1);
    }
    match times {
        [Some(t90_s), Some(t99_s)] => Some(SpinUp { t90_s, t99_s }),
        _ => None,
    }
}

/// Fraction s ∈ [0, 1] of a step at which the cubic Hermite interpolant through
/// (w0, m0) and (w1, m1) (slopes per unit s) reaches `target`.
fn hermite_crossing(w0: f64, w1: f64, m0: f64, m1: f64, target: f64) -> f64 {
    let value = |s: f64| {
        let s2 = s * s;
        let s3 = s2 * s;
        (2.0 * s3 - 3.0 * s2 + 1.0) * w0
            + (s3 - 2.0 * s2 + s) * m0
            + (-2.0 * s3 + 3.0 * s2) * w1
            + (s3 - s2) * m1
    };
    let (mut lo, mut hi) = (0.0, 1.0);
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        if value(mid) < target {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

#[cfg(test)]
mod tests {
    use super::super::*;
    use super::*;
    use crate::physics::design::Supply;
    use crate::physics::fixtures::{symmetric_rotor, three_arm_rotor};

    #[test]
    fn linear_net_torque_spins_up_exponentially() {
        // Fixed flow, linear brake: net(ω) = T_s(1 − ω/ω_op) exactly, so
        // ω(t) = ω_op(1 − e^(−t/τ)) with τ = I/(ρQR² + k): t90 = τ ln 10, t99 = τ ln 100.
        let mut d = symmetric_rotor(2, 0.2, 3e-3, 0.2, 0.1, Supply::Flow { total_m3_s: 4e-4 });
        for arm in &mut d.rotor.arms {
            arm.tube.length_m = Some(0.0);
        }
        d.friction.brake.viscous = 0.01;
        let r = solve(&d);
        let rho = SpinModel::new(&d).fluids.water.density_kg_m3;
        let tau = r.inertia_kg_m2 / (rho * 4e-4 * 0.04 + 0.01);
        let s = r.spin_up.expect("spins up");
        assert!(
            (s.t90_s / (tau * 10f64.ln()) - 1.0).abs() < 1e-4,
            "t90 {} vs {}",
            s.t90_s,
            tau * 10f64.ln()
        );
        assert!(
            (s.t99_s / (tau * 100f64.ln()) - 1.0).abs() < 1e-4,
            "t99 {}",
            s.t99_s
        );
    }

    #[test]
    fn spin_up_step_is_converged() {
        let d = three_arm_rotor();
        let model = SpinModel::new(&d);
        let r = solve(&d);
        let op = r.operating.as_ref().expect("running").omega_rad_s();
        let fine_net = model.point(0.0).net_n_m();
        let coarse = r.spin_up.expect("spins up");
        // Halving the step four times changes the times by well under 0.1 %.
        let fine =
            spin_up_with_step_scale(&model, r.inertia_kg_m2, op, fine_net, 16.0).expect("spins up");
        assert!((coarse.t99_s / fine.t99_s - 1.0).abs() < 1e-3);
        assert!((coarse.t90_s / fine.t90_s - 1.0).abs() < 1e-3);
    }
}
