//! Bracketed root finding on top of the `roots` crate.
//!
//! `roots` 0.0.8 uses one epsilon for both |f| and |Δx|; the physics needs a
//! step tolerance on x and a residual tolerance on f scaled to the problem, so
//! [`Tolerance`] carries both. Failures carry the bracket that was tried, so a
//! report can say where the search looked. [`grow_bracket`] finds a bracket
//! to give it, walking outward from a point until the function changes sign.

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

/// Walks from `x0`, where `f` has the value `f0` (not zero), through
/// `points` in order until `f` is no longer of `f0`'s sign (zero, the other
/// sign, or NaN). Returns (the last point still of `f0`'s sign, `x0` if none,
/// the first point past), a bracket for [`brent`] in the order walked, or
/// `None` when the points run out first.
///
/// `points` says how the walk grows: [`doubling`] steps, or any sequence
/// (a geometric one with a cap for a scale factor).
pub fn grow_bracket(
    mut f: impl FnMut(f64) -> f64,
    x0: f64,
    f0: f64,
    points: impl IntoIterator<Item = f64>,
) -> Option<(f64, f64)> {
    let mut inside = x0;
    for x in points {
        let fx = f(x);
        let same_sign = if f0 > 0.0 { fx > 0.0 } else { fx < 0.0 };
        if !same_sign {
            return Some((inside, x));
        }
        inside = x;
    }
    None
}

/// The points x0 + dir·step0·2ᵏ, k = 0 … `count` − 1: steps that double
/// away from `x0` in the direction of the sign of `dir`.
pub fn doubling(x0: f64, dir: f64, step0: f64, count: usize) -> impl Iterator<Item = f64> {
    std::iter::successors(Some(step0), |s| Some(2.0 * s))
        .take(count)
        .map(move |s| x0 + dir * s)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn doubling_steps_bracket_a_far_root() {
        // x − 100 from x0 = 0: steps 1, 2, 4, …, 64 stay below, 128 is past.
        let f = |x: f64| x - 100.0;
        let pts: Vec<f64> = doubling(0.0, 1.0, 1.0, 4).collect();
        assert_eq!(pts, [1.0, 2.0, 4.0, 8.0]);
        let (inside, past) = grow_bracket(f, 0.0, f(0.0), doubling(0.0, 1.0, 1.0, 20)).unwrap();
        assert_eq!((inside, past), (64.0, 128.0));
        let tol = Tolerance {
            x: 1e-13,
            f: 1e-13,
            max_iter: 100,
        };
        assert!((brent(f, inside, past, tol).unwrap() - 100.0).abs() < 1e-12);
        // Downward, and running out of points.
        let g = |x: f64| x + 3.0;
        assert_eq!(
            grow_bracket(g, 0.0, g(0.0), doubling(0.0, -1.0, 1.0, 5)),
            Some((-2.0, -4.0))
        );
        assert_eq!(
            grow_bracket(g, 0.0, g(0.0), doubling(0.0, -1.0, 1.0, 2)),
            None
        );
    }

    #[test]
    fn a_geometric_walk_with_a_cap() {
        // √x − 2 is negative up to x = 4: ×1.5 from 1 capped at 3 never gets there.
        let f = |x: f64| x.sqrt() - 2.0;
        let capped =
            std::iter::successors(Some(1.5), |h: &f64| (*h < 3.0).then(|| (h * 1.5).min(3.0)));
        assert_eq!(grow_bracket(f, 1.0, f(1.0), capped), None);
        let open = std::iter::successors(Some(1.5), |h: &f64| Some(h * 1.5));
        assert_eq!(grow_bracket(f, 1.0, f(1.0), open), Some((3.375, 5.0625)));
    }

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
