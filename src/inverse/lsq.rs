//! Nonlinear least squares by Levenberg–Marquardt, with lower bounds, and the
//! parameter covariance from the Jacobian at the solution.
//!
//! Minimise S(x) = Σ rᵢ(x)². Each step solves
//!
//! ```text
//! (JᵀJ + λ diag(JᵀJ)) δ = −Jᵀ r
//! ```
//!
//! (Marquardt's scaling, so parameters of very different size are handled
//! alike), projects x + δ onto the bounds, and keeps the step if S falls
//! (λ ÷ 3) or raises λ (× 4) and tries again. The Jacobian is by central
//! differences with a step relative to each parameter's scale. At the end
//! the covariance is s² (JᵀJ)⁻¹ over the free parameters, s² = S/(n − p)
//! (the residual variance), the usual linearised estimate (e.g. Press et
//! al., *Numerical Recipes*, §15.5; Nocedal & Wright, *Numerical
//! Optimization*, §10.3). Parameters held at a bound get no uncertainty.
//!
//! Written by hand on nalgebra: argmin's math layer supports nalgebra only up
//! to 0.34, and a second nalgebra is not worth three small fits.

use nalgebra::{DMatrix, DVector};

/// Why a fit could not be made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum LsqError {
    /// The model could not be evaluated at the start.
    #[error("the model cannot be evaluated at the starting values")]
    BadStart,
    /// Fewer residuals than parameters.
    #[error("{residuals} readings cannot fix {parameters} unknowns")]
    TooFew {
        /// Residuals.
        residuals: usize,
        /// Parameters.
        parameters: usize,
    },
}

/// Settings of a fit.
#[derive(Debug, Clone)]
pub struct LsqProblem {
    /// Starting values.
    pub x0: Vec<f64>,
    /// Typical size of each parameter (sets the difference step), > 0.
    pub scale: Vec<f64>,
    /// Lower bound of each parameter (use −∞ for none).
    pub lower: Vec<f64>,
    /// Most iterations.
    pub max_iter: usize,
}

/// The result of a fit.
#[derive(Debug, Clone, PartialEq)]
pub struct LsqFit {
    /// Parameters at the minimum.
    pub x: Vec<f64>,
    /// Residuals there.
    pub residuals: Vec<f64>,
    /// Standard error of each parameter (None at a bound or when the problem
    /// has no residual degrees of freedom or is singular).
    pub std_error: Vec<Option<f64>>,
    /// Covariance over all parameters (zero rows for parameters at a bound).
    pub covariance: Vec<Vec<f64>>,
    /// Residual degrees of freedom, n − p_free.
    pub dof: usize,
    /// Iterations taken.
    pub iterations: usize,
    /// True when the relative fall of S or the step became negligible.
    pub converged: bool,
    /// Which parameters ended at their bound.
    pub at_bound: Vec<bool>,
}

impl LsqFit {
    /// Root mean square of the residuals.
    pub fn rms(&self) -> f64 {
        if self.residuals.is_empty() {
            return 0.0;
        }
        (sum_sq(&self.residuals) / self.residuals.len() as f64).sqrt()
    }
}

fn sum_sq(r: &[f64]) -> f64 {
    r.iter().map(|v| v * v).sum()
}

/// Central-difference Jacobian of `f` at `x`, n × p.
pub fn jacobian(
    f: &dyn Fn(&[f64]) -> Option<Vec<f64>>,
    x: &[f64],
    scale: &[f64],
    lower: &[f64],
    n: usize,
) -> Option<DMatrix<f64>> {
    let p = x.len();
    let mut j = DMatrix::zeros(n, p);
    for (k, ((xk, sk), lk)) in x.iter().zip(scale).zip(lower).enumerate() {
        let h = 1e-5 * xk.abs().max(*sk);
        let up = xk + h;
        // One-sided at the bound.
        let down = (xk - h).max(*lk);
        let step = up - down;
        if step <= 0.0 {
            return None;
        }
        let mut xp = x.to_vec();
        let mut xm = x.to_vec();
        if let (Some(a), Some(b)) = (xp.get_mut(k), xm.get_mut(k)) {
            *a = up;
            *b = down;
        }
        let rp = f(&xp)?;
        let rm = f(&xm)?;
        if rp.len() != n || rm.len() != n {
            return None;
        }
        for (i, (a, b)) in rp.iter().zip(&rm).enumerate() {
            if let Some(cell) = j.get_mut((i, k)) {
                *cell = (a - b) / step;
            }
        }
    }
    Some(j)
}

/// Fit by Levenberg–Marquardt. `f` gives the residuals at x (None where the
/// model cannot be evaluated; the step is then refused).
pub fn levenberg_marquardt(
    f: &dyn Fn(&[f64]) -> Option<Vec<f64>>,
    problem: &LsqProblem,
) -> Result<LsqFit, LsqError> {
    let p = problem.x0.len();
    let project = |x: &mut Vec<f64>| {
        for (v, lo) in x.iter_mut().zip(&problem.lower) {
            if *v < *lo {
                *v = *lo;
            }
        }
    };
    let mut x = problem.x0.clone();
    project(&mut x);
    let mut r = f(&x).ok_or(LsqError::BadStart)?;
    let n = r.len();
    if n < p {
        return Err(LsqError::TooFew {
            residuals: n,
            parameters: p,
        });
    }
    let mut s = sum_sq(&r);
    let mut lambda = 1e-3;
    let mut converged = false;
    let mut iterations = 0;
    while iterations < problem.max_iter {
        iterations += 1;
        let Some(j) = jacobian(f, &x, &problem.scale, &problem.lower, n) else {
            break;
        };
        let rv = DVector::from_vec(r.clone());
        let jtj = j.transpose() * &j;
        let g = j.transpose() * &rv;
        // Parameters at their bound that the descent would push past are held
        // this step (an active set), the others stepped together.
        let free: Vec<usize> = (0..p)
            .filter(|&k| {
                let at_lo = match (x.get(k), problem.lower.get(k)) {
                    (Some(v), Some(lo)) => lo.is_finite() && *v <= *lo,
                    _ => false,
                };
                !(at_lo && g.get(k).copied().unwrap_or(0.0) > 0.0)
            })
            .collect();
        if free.is_empty() {
            converged = true;
            break;
        }
        let jtj_f = jtj.select_rows(free.iter()).select_columns(free.iter());
        let g_f = g.select_rows(free.iter());
        let mut improved = false;
        for _ in 0..30 {
            let mut a = jtj_f.clone();
            for k in 0..free.len() {
                let d = jtj_f.get((k, k)).copied().unwrap_or(0.0).max(1e-30);
                if let Some(cell) = a.get_mut((k, k)) {
                    *cell += lambda * d;
                }
            }
            let Some(delta_f) = a.clone().cholesky().map(|c| c.solve(&(-&g_f))) else {
                lambda *= 4.0;
                continue;
            };
            let mut delta = vec![0.0; p];
            for (i, &k) in free.iter().enumerate() {
                if let (Some(cell), Some(v)) = (delta.get_mut(k), delta_f.get(i)) {
                    *cell = *v;
                }
            }
            let mut xn: Vec<f64> = x.iter().zip(&delta).map(|(a, b)| a + b).collect();
            project(&mut xn);
            match f(&xn) {
                Some(rn) if rn.len() == n && sum_sq(&rn) < s => {
                    let sn = sum_sq(&rn);
                    let step_small = x
                        .iter()
                        .zip(&xn)
                        .zip(&problem.scale)
                        .all(|((a, b), sc)| (a - b).abs() <= 1e-9 * a.abs().max(*sc));
                    let fall_small = s - sn <= 1e-10 * s;
                    x = xn;
                    r = rn;
                    s = sn;
                    lambda = (lambda / 3.0).max(1e-12);
                    improved = true;
                    if step_small || fall_small {
                        converged = true;
                    }
                    break;
                }
                _ => lambda *= 4.0,
            }
            if lambda > 1e12 {
                break;
            }
        }
        if !improved {
            // No step lowers S: a minimum to the accuracy of the model.
            converged = true;
            break;
        }
        if converged || s == 0.0 {
            converged = true;
            break;
        }
    }
    // Covariance over the free parameters.
    let at_bound: Vec<bool> = x
        .iter()
        .zip(&problem.lower)
        .zip(&problem.scale)
        .map(|((v, lo), sc)| lo.is_finite() && *v <= lo + 1e-12 * sc)
        .collect();
    let free: Vec<usize> = (0..p)
        .filter(|k| !at_bound.get(*k).copied().unwrap_or(false))
        .collect();
    let dof = n.saturating_sub(free.len());
    let mut cov = vec![vec![0.0; p]; p];
    let mut std_error = vec![None; p];
    if dof > 0 && !free.is_empty() {
        if let Some(j) = jacobian(f, &x, &problem.scale, &problem.lower, n) {
            let jf = j.select_columns(free.iter());
            let jtj = jf.transpose() * &jf;
            if let Some(inv) = jtj.try_inverse() {
                let s2 = s / dof as f64;
                for (a, &ka) in free.iter().enumerate() {
                    for (b, &kb) in free.iter().enumerate() {
                        let v = s2 * inv.get((a, b)).copied().unwrap_or(0.0);
                        if let Some(cell) = cov.get_mut(ka).and_then(|row| row.get_mut(kb)) {
                            *cell = v;
                        }
                    }
                    let v = s2 * inv.get((a, a)).copied().unwrap_or(f64::NAN);
                    if let Some(cell) = std_error.get_mut(ka) {
                        *cell = (v.is_finite() && v >= 0.0).then(|| v.sqrt());
                    }
                }
            }
        }
    }
    Ok(LsqFit {
        x,
        residuals: r,
        std_error,
        covariance: cov,
        dof,
        iterations,
        converged,
        at_bound,
    })
}

/// Two-sided 95 % quantile of Student's t with `dof` degrees of freedom
/// (standard t table, e.g. NIST/SEMATECH e-Handbook of Statistical Methods,
/// table 1.3.6.7.2; values from memory to three decimals; beyond 30
/// interpolated in 1/dof toward the normal 1.960).
pub fn t95(dof: usize) -> f64 {
    const T: [f64; 30] = [
        12.706, 4.303, 3.182, 2.776, 2.571, 2.447, 2.365, 2.306, 2.262, 2.228, 2.201, 2.179, 2.160,
        2.145, 2.131, 2.120, 2.110, 2.101, 2.093, 2.086, 2.080, 2.074, 2.069, 2.064, 2.060, 2.056,
        2.052, 2.048, 2.045, 2.042,
    ];
    match dof {
        0 => f64::INFINITY,
        1..=30 => T.get(dof - 1).copied().unwrap_or(1.96),
        _ => 1.960 + (2.042 - 1.960) * 30.0 / dof as f64,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fits_a_straight_line_exactly() {
        // y = 2 + 3x through four points: the least-squares line is exact.
        let xs = [0.0, 1.0, 2.0, 3.0];
        let ys: Vec<f64> = xs.iter().map(|x| 2.0 + 3.0 * x).collect();
        let f = |p: &[f64]| -> Option<Vec<f64>> {
            Some(
                xs.iter()
                    .zip(&ys)
                    .map(|(x, y)| p[0] + p[1] * x - y)
                    .collect(),
            )
        };
        let fit = levenberg_marquardt(
            &f,
            &LsqProblem {
                x0: vec![0.0, 0.0],
                scale: vec![1.0, 1.0],
                lower: vec![f64::NEG_INFINITY; 2],
                max_iter: 100,
            },
        )
        .unwrap();
        assert!((fit.x[0] - 2.0).abs() < 1e-8 && (fit.x[1] - 3.0).abs() < 1e-8);
        assert!(fit.rms() < 1e-8);
    }

    #[test]
    fn line_uncertainty_matches_the_textbook_formula() {
        // y = a + b x with residual variance s²: var(b) = s² / Σ(x − x̄)²
        // (ordinary least squares, any statistics text).
        let xs = [0.0, 1.0, 2.0, 3.0, 4.0];
        let ys = [1.1, 2.9, 5.2, 6.8, 9.1];
        let f = |p: &[f64]| -> Option<Vec<f64>> {
            Some(
                xs.iter()
                    .zip(&ys)
                    .map(|(x, y)| p[0] + p[1] * x - y)
                    .collect(),
            )
        };
        let fit = levenberg_marquardt(
            &f,
            &LsqProblem {
                x0: vec![1.0, 1.0],
                scale: vec![1.0, 1.0],
                lower: vec![f64::NEG_INFINITY; 2],
                max_iter: 100,
            },
        )
        .unwrap();
        let s2 = fit.residuals.iter().map(|r| r * r).sum::<f64>() / 3.0;
        let sxx: f64 = xs.iter().map(|x| (x - 2.0) * (x - 2.0)).sum();
        let want = (s2 / sxx).sqrt();
        assert!((fit.std_error[1].unwrap() / want - 1.0).abs() < 1e-5);
        assert_eq!(fit.dof, 3);
    }

    #[test]
    fn a_bound_holds_and_gets_no_uncertainty() {
        // Minimise (x − (−1))² + (y − 2)² with x ≥ 0: x = 0 at its bound.
        let f = |p: &[f64]| -> Option<Vec<f64>> { Some(vec![p[0] + 1.0, p[1] - 2.0, 0.1]) };
        let fit = levenberg_marquardt(
            &f,
            &LsqProblem {
                x0: vec![1.0, 0.0],
                scale: vec![1.0, 1.0],
                lower: vec![0.0, f64::NEG_INFINITY],
                max_iter: 100,
            },
        )
        .unwrap();
        assert_eq!(fit.x[0], 0.0);
        assert!(fit.at_bound[0] && fit.std_error[0].is_none());
        assert!((fit.x[1] - 2.0).abs() < 1e-8);
    }
}
