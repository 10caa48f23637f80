//! Newton's method kept inside a bracket (a safeguarded Newton–bisection).
//!
//! For an increasing f with f(lo) < 0 < f(hi), each step is the Newton step
//! x − f(x)/f′(x) when that lands strictly inside the current bracket, and the
//! bracket's midpoint otherwise; the bracket shrinks to the side where f
//! changes sign (Press et al., *Numerical Recipes*, §9.4, `rtsafe`). It
//! converges quadratically from a good start and never leaves the bracket.

/// Safeguarded Newton on an increasing function `f` with `f(lo) < 0 < f(hi)`.
///
/// `f` returns (value, slope). Starts at `start` (moved into the bracket),
/// stops when |f| is at most `f_tol` or the step or the bracket is at most
/// `x_tol`, after 100 steps at most, and returns the last point with its
/// value and slope: (x, f(x), f′(x)).
pub fn bracketed_newton(
    mut f: impl FnMut(f64) -> (f64, f64),
    mut lo: f64,
    mut hi: f64,
    start: f64,
    x_tol: f64,
    f_tol: f64,
) -> (f64, f64, f64) {
    // max/min, not clamp: clamp panics when a bound is NaN.
    let mut x = start.max(lo).min(hi);
    let (mut fx, mut dfx) = f(x);
    for _ in 0..100 {
        if fx.abs() <= f_tol {
            break;
        }
        if fx < 0.0 {
            lo = x;
        } else {
            hi = x;
        }
        let newton = if dfx > 0.0 { x - fx / dfx } else { f64::NAN };
        let next = if newton.is_finite() && newton > lo && newton < hi {
            newton
        } else {
            0.5 * (lo + hi)
        };
        let small = (next - x).abs() <= x_tol || hi - lo <= x_tol;
        x = next;
        (fx, dfx) = f(x);
        if small {
            break;
        }
    }
    (x, fx, dfx)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Wallis's equation x³ − 2x − 5 = 0, the classic test of Newton's
    /// method; its real root is 2.0945514815423265… (Press et al.,
    /// *Numerical Recipes*, §9.4, and any numerical-analysis text).
    #[test]
    fn wallis_equation() {
        let mut calls = 0;
        let (x, fx, dfx) = bracketed_newton(
            |x| {
                calls += 1;
                (x * x * x - 2.0 * x - 5.0, 3.0 * x * x - 2.0)
            },
            2.0,
            3.0,
            2.0,
            1e-15,
            1e-14,
        );
        assert!((x - 2.094_551_481_542_326_5).abs() < 1e-14, "{x}");
        assert!(fx.abs() < 1e-13);
        assert!((dfx - (3.0 * x * x - 2.0)).abs() < 1e-12);
        // Quadratic convergence from x = 2: a handful of steps, not the
        // fifty a bisection to 1e-15 would take.
        assert!(calls <= 8, "{calls} evaluations");
    }

    /// A start outside the bracket is moved into it; a Newton step that would
    /// leave the bracket (arctan's flat tails throw Newton far from x = 3)
    /// falls back to bisection and still finds the root at 0.
    #[test]
    fn bisects_when_newton_would_leave() {
        let (x, _, _) = bracketed_newton(
            |x: f64| (x.atan(), 1.0 / (1.0 + x * x)),
            -2.0,
            3.0,
            10.0,
            1e-15,
            1e-15,
        );
        assert!(x.abs() < 1e-14, "{x}");
    }

    /// A flat or wrong-signed slope gives no Newton step: bisection only.
    #[test]
    fn zero_slope_bisects() {
        let (x, _, _) = bracketed_newton(|x| (x - 0.25, 0.0), 0.0, 1.0, 0.5, 1e-12, 0.0);
        assert!((x - 0.25).abs() < 1e-11, "{x}");
    }
}
