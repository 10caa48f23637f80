//! Dormand & Prince (1980) 5(4) embedded Runge–Kutta pair on a state of six
//! numbers (position and velocity), with local extrapolation (the step is
//! advanced with the 5th-order solution), an RMS error norm with scale
//! `atol + rtol·max(|y|, |y_new|)`, the step factor 0.9·err^(−1/5) kept within
//! 0.2–10, Hairer, Nørsett & Wanner's (1993, II.4) starting step and
//! Shampine's (1986) quartic dense output. The coefficients are as tabulated
//! in scipy.integrate's RK45.
//!
//! The caller owns the loop (limits, events such as touching the ground); this
//! module makes one attempt at a step ([`attempt`]) and evaluates a step's
//! dense output ([`DenseStep`]). The right-hand side must not depend on time.

/// State vector: six numbers (for a drop: position m, then velocity m/s).
pub type State = [f64; 6];

// The right-hand sides here do not depend on time, so the nodes c_i are not needed.
const A21: f64 = 1.0 / 5.0;
const A31: f64 = 3.0 / 40.0;
const A32: f64 = 9.0 / 40.0;
const A41: f64 = 44.0 / 45.0;
const A42: f64 = -56.0 / 15.0;
const A43: f64 = 32.0 / 9.0;
const A51: f64 = 19372.0 / 6561.0;
const A52: f64 = -25360.0 / 2187.0;
const A53: f64 = 64448.0 / 6561.0;
const A54: f64 = -212.0 / 729.0;
const A61: f64 = 9017.0 / 3168.0;
const A62: f64 = -355.0 / 33.0;
const A63: f64 = 46732.0 / 5247.0;
const A64: f64 = 49.0 / 176.0;
const A65: f64 = -5103.0 / 18656.0;
const B1: f64 = 35.0 / 384.0;
const B3: f64 = 500.0 / 1113.0;
const B4: f64 = 125.0 / 192.0;
const B5: f64 = -2187.0 / 6784.0;
const B6: f64 = 11.0 / 84.0;
/// Error weights: 5th-order minus 4th-order weights (k1..k7).
const E: [f64; 7] = [
    -71.0 / 57600.0,
    0.0,
    71.0 / 16695.0,
    -71.0 / 1920.0,
    17253.0 / 339200.0,
    -22.0 / 525.0,
    1.0 / 40.0,
];
/// Dense output: y(t + θh) = y + h Σ_k K_k Σ_j P[k][j] θ^(j+1).
const P: [[f64; 4]; 7] = [
    [
        1.0,
        -8048581381.0 / 2820520608.0,
        8663915743.0 / 2820520608.0,
        -12715105075.0 / 11282082432.0,
    ],
    [0.0, 0.0, 0.0, 0.0],
    [
        0.0,
        131558114200.0 / 32700410799.0,
        -68118460800.0 / 10900136933.0,
        87487479700.0 / 32700410799.0,
    ],
    [
        0.0,
        -1754552775.0 / 470086768.0,
        14199869525.0 / 1410260304.0,
        -10690763975.0 / 1880347072.0,
    ],
    [
        0.0,
        127303824393.0 / 49829197408.0,
        -318862633887.0 / 49829197408.0,
        701980252875.0 / 199316789632.0,
    ],
    [
        0.0,
        -282668133.0 / 205662961.0,
        2019193451.0 / 616988883.0,
        -1453857185.0 / 822651844.0,
    ],
    [
        0.0,
        40617522.0 / 29380423.0,
        -110615467.0 / 29380423.0,
        69997945.0 / 29380423.0,
    ],
];

/// Safety factor on the step-size estimate.
pub const SAFETY: f64 = 0.9;
/// Smallest step change factor.
pub const MIN_FACTOR: f64 = 0.2;
/// Largest step change factor.
pub const MAX_FACTOR: f64 = 10.0;

/// One step with what the dense output needs.
#[derive(Debug, Clone, Copy)]
pub struct DenseStep {
    /// Time at the start of the step.
    pub t0: f64,
    /// Step size.
    pub h: f64,
    /// State at the start of the step.
    pub y0: State,
    /// The seven stage derivatives.
    pub k: [State; 7],
}

impl DenseStep {
    /// State at fraction `theta` ∈ [0, 1] of the step.
    pub fn at(&self, theta: f64) -> State {
        let powers = [theta, theta * theta, theta.powi(3), theta.powi(4)];
        let mut out = self.y0;
        for (k_stage, p_row) in self.k.iter().zip(P.iter()) {
            let w = self.h
                * (p_row[0] * powers[0]
                    + p_row[1] * powers[1]
                    + p_row[2] * powers[2]
                    + p_row[3] * powers[3]);
            if w != 0.0 {
                for (o, ki) in out.iter_mut().zip(k_stage.iter()) {
                    *o += w * ki;
                }
            }
        }
        out
    }

    /// Component `i` of the state at fraction `theta` of the step.
    pub fn component_at(&self, i: usize, theta: f64) -> f64 {
        let powers = [theta, theta * theta, theta.powi(3), theta.powi(4)];
        let mut z = self.y0.get(i).copied().unwrap_or(0.0);
        for (k_stage, p_row) in self.k.iter().zip(P.iter()) {
            let w = p_row[0] * powers[0]
                + p_row[1] * powers[1]
                + p_row[2] * powers[2]
                + p_row[3] * powers[3];
            z += self.h * w * k_stage.get(i).copied().unwrap_or(0.0);
        }
        z
    }
}

/// y + h Σ c_i k_i over a fixed number of stages (unrolled by the compiler).
fn axpy<const N: usize>(y: &State, h: f64, c: [f64; N], k: [&State; N]) -> State {
    let mut sum = [0.0; 6];
    for (cj, kj) in c.iter().zip(k) {
        for (s, kv) in sum.iter_mut().zip(kj) {
            *s += cj * kv;
        }
    }
    let mut out = *y;
    for (o, s) in out.iter_mut().zip(sum) {
        *o += h * s;
    }
    out
}

fn rms_norm(err: &State, y0: &State, y1: &State, rtol: f64, atol: f64) -> f64 {
    let mut sum = 0.0;
    for ((e, a), b) in err.iter().zip(y0).zip(y1) {
        let scale = atol + rtol * a.abs().max(b.abs());
        let e = e / scale;
        sum += e * e;
    }
    (sum / 6.0).sqrt()
}

/// Hairer, Nørsett & Wanner (1993, II.4) starting step for a 5th-order
/// method, at most `max_h`.
pub fn initial_step(
    rhs: &impl Fn(&State) -> State,
    y0: &State,
    f0: &State,
    rtol: f64,
    atol: f64,
    max_h: f64,
) -> f64 {
    let scale: Vec<f64> = y0.iter().map(|v| atol + rtol * v.abs()).collect();
    let norm = |v: &State| -> f64 {
        (v.iter()
            .zip(&scale)
            .map(|(a, s)| (a / s) * (a / s))
            .sum::<f64>()
            / 6.0)
            .sqrt()
    };
    let d0 = norm(y0);
    let d1 = norm(f0);
    let h0 = if d0 < 1e-5 || d1 < 1e-5 {
        1e-6
    } else {
        0.01 * d0 / d1
    };
    let y1 = axpy(y0, h0, [1.0], [f0]);
    let f1 = rhs(&y1);
    let mut diff: State = f1;
    for (d, b) in diff.iter_mut().zip(f0) {
        *d -= b;
    }
    let d2 = norm(&diff) / h0;
    let h1 = if d1 <= 1e-15 && d2 <= 1e-15 {
        (h0 * 1e-3).max(1e-6)
    } else {
        (0.01 / d1.max(d2)).powf(1.0 / 5.0)
    };
    (100.0 * h0).min(h1).min(max_h)
}

/// One attempted step of size `h` from `y` (with `f0` = rhs(y)) at time `t`.
#[derive(Debug, Clone, Copy)]
pub struct Attempt {
    /// The 5th-order state at the end of the step.
    pub y_new: State,
    /// RMS error norm relative to the tolerances (≤ 1: accept).
    pub err_norm: f64,
    /// The step, for dense output; `k[6]` is rhs(y_new).
    pub step: DenseStep,
}

/// Makes one Dormand–Prince step attempt.
pub fn attempt(
    rhs: &impl Fn(&State) -> State,
    t: f64,
    y: &State,
    f0: &State,
    h: f64,
    rtol: f64,
    atol: f64,
) -> Attempt {
    let k1 = *f0;
    let k2 = rhs(&axpy(y, h, [A21], [&k1]));
    let k3 = rhs(&axpy(y, h, [A31, A32], [&k1, &k2]));
    let k4 = rhs(&axpy(y, h, [A41, A42, A43], [&k1, &k2, &k3]));
    let k5 = rhs(&axpy(y, h, [A51, A52, A53, A54], [&k1, &k2, &k3, &k4]));
    let k6 = rhs(&axpy(
        y,
        h,
        [A61, A62, A63, A64, A65],
        [&k1, &k2, &k3, &k4, &k5],
    ));
    let y_new = axpy(y, h, [B1, B3, B4, B5, B6], [&k1, &k3, &k4, &k5, &k6]);
    let k7 = rhs(&y_new);
    let ks = [k1, k2, k3, k4, k5, k6, k7];
    let mut err: State = [0.0; 6];
    for (k, e) in ks.iter().zip(E.iter()) {
        for (s, kv) in err.iter_mut().zip(k) {
            *s += e * kv;
        }
    }
    for s in &mut err {
        *s *= h;
    }
    Attempt {
        y_new,
        err_norm: rms_norm(&err, y, &y_new, rtol, atol),
        step: DenseStep {
            t0: t,
            h,
            y0: *y,
            k: ks,
        },
    }
}

/// Factor on the step after an accepted step of error norm `err_norm`.
pub fn grow_factor(err_norm: f64) -> f64 {
    if err_norm == 0.0 {
        MAX_FACTOR
    } else {
        (SAFETY * err_norm.powf(-0.2)).min(MAX_FACTOR)
    }
}

/// Factor on the step after a rejected step of error norm `err_norm` (> 1).
pub fn shrink_factor(err_norm: f64) -> f64 {
    if err_norm.is_finite() {
        (SAFETY * err_norm.powf(-0.2)).max(MIN_FACTOR)
    } else {
        MIN_FACTOR
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// y'' = −y (as position and velocity in the first axis): one period of
    /// the harmonic oscillator, with the dense output between steps.
    #[test]
    fn oscillator_comes_back_after_one_period() {
        let rhs = |y: &State| [y[3], 0.0, 0.0, -y[0], 0.0, 0.0];
        let (rtol, atol) = (1e-10, 1e-10);
        let mut y: State = [1.0, 0.0, 0.0, 0.0, 0.0, 0.0];
        let mut f = rhs(&y);
        let mut t = 0.0;
        let mut h = initial_step(&rhs, &y, &f, rtol, atol, 1.0);
        let period = 2.0 * std::f64::consts::PI;
        while t < period {
            let h_now = h.min(period - t);
            let a = attempt(&rhs, t, &y, &f, h_now, rtol, atol);
            if a.err_norm > 1.0 {
                h = h_now * shrink_factor(a.err_norm);
                continue;
            }
            // Dense output halfway matches the exact solution.
            let mid = a.step.component_at(0, 0.5);
            assert!((mid - (t + 0.5 * h_now).cos()).abs() < 1e-7);
            t += h_now;
            y = a.y_new;
            f = a.step.k[6];
            h = h_now * grow_factor(a.err_norm);
        }
        assert!((y[0] - 1.0).abs() < 1e-8 && y[3].abs() < 1e-8, "{y:?}");
    }
}
