//! Bracketed root finding on top of the `roots` crate.
//!
//! `roots` 0.0.8 uses one epsilon for both |f| and |Δx|; the physics needs a
//! step tolerance on x and a residual tolerance on f scaled to the problem, so
//! [`Tolerance`] carries both. Failures carry the bracket that was tried, so a
//! report can say where the search looked.

use roots::{find_root_brent, Convergency, SearchError};

/// Separate stopping tolerances for x and f, and an iteration limit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tolerance {
    /// Stop when the bracket is narrower than this (units of x).
    pub x: f64,
    /// Stop when |f| is below this (units of f).
    pub f: f64,
    /// Give up after this many iterations.
    pub max_iter: usize,
}

impl Convergency<f64> for Tolerance {
    fn is_root_found(&mut self, y: f64) -> bool {
        y.abs() <= self.f
    }
    fn is_converged(&mut self, x1: f64, x2: f64) -> bool {
        (x1 - x2).abs() <= self.x
    }
    fn is_iteration_limit_reached(&mut self, iter: usize) -> bool {
        iter >= self.max_iter
    }
}

/// A root search that did not succeed, with the bracket it was given.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[error("root search on [{lo:.6e}, {hi:.6e}] failed: {reason}")]
pub struct RootError {
    /// Lower end of the bracket tried.
    pub lo: f64,
    /// Upper end of the bracket tried.
    pub hi: f64,
    /// What went wrong, in words.
    pub reason: &'static str,
}

/// Brent's method on [lo, hi], which must bracket a sign change of `f`.
pub fn brent(
    f: impl FnMut(f64) -> f64,
    lo: f64,
    hi: f64,
    tol: Tolerance,
) -> Result<f64, RootError> {
    let mut tol = tol;
    find_root_brent(lo, hi, f, &mut tol).map_err(|e| RootError {
        lo,
        hi,
        reason: match e {
            SearchError::NoConvergency => "no convergence within the iteration limit",
            SearchError::NoBracketing => "the ends do not bracket a sign change",
            SearchError::ZeroDerivative => "zero derivative",
        },
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finds_a_cube_root_to_tight_tolerance() {
        let tol = Tolerance {
            x: 1e-15,
            f: 1e-15,
            max_iter: 200,
        };
        let r = brent(|x| x * x * x - 2.0, 0.0, 2.0, tol).unwrap();
        assert!((r - 2f64.cbrt()).abs() < 1e-14);
    }

    #[test]
    fn reports_the_bracket_when_there_is_no_sign_change() {
        let tol = Tolerance {
            x: 1e-12,
            f: 1e-12,
            max_iter: 50,
        };
        let err = brent(|x| x * x + 1.0, -1.0, 1.0, tol).unwrap_err();
        assert_eq!((err.lo, err.hi), (-1.0, 1.0));
        assert!(err.to_string().contains("bracket"));
    }
}
