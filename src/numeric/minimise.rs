//! Golden-section search for the minimum of a function of one variable.
//!
//! Given a bracket [a, b] holding a minimum, two interior points
//! c = b − φ(b − a) and d = a + φ(b − a), φ = (√5 − 1)/2, are compared and
//! the bracket shrinks to [a, d] when f(c) ≤ f(d), else to [c, b]; one of the
//! old points is reused, so each step costs one evaluation and shrinks the
//! bracket by φ ≈ 0.618 (Press et al., *Numerical Recipes*, §10.2). No
//! derivative is needed and a function that is flat or rough in places
//! (a misfit over binned data) is handled as well as the bracket allows.

/// Where a golden-section search ended.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Golden {
    /// Lower end of the final bracket.
    pub lo: f64,
    /// Upper end of the final bracket.
    pub hi: f64,
    /// The two interior points with their values, (x, f(x)), lower first.
    pub inner: [(f64, f64); 2],
}

impl Golden {
    /// The middle of the final bracket.
    pub fn middle(&self) -> f64 {
        0.5 * (self.lo + self.hi)
    }
}

/// Golden-section search for a minimum of `f` on [`lo`, `hi`].
///
/// Stops when the bracket is no wider than `x_tol` or after `max_iter`
/// steps, whichever comes first (`x_tol` = 0: a fixed number of steps).
/// Takes 2 + (steps) evaluations. `f` may fail; its first error is returned.
pub fn golden_section<E>(
    mut f: impl FnMut(f64) -> Result<f64, E>,
    lo: f64,
    hi: f64,
    x_tol: f64,
    max_iter: usize,
) -> Result<Golden, E> {
    let g = (5f64.sqrt() - 1.0) / 2.0;
    let (mut a, mut b) = (lo, hi);
    let mut c = b - g * (b - a);
    let mut d = a + g * (b - a);
    let mut fc = f(c)?;
    let mut fd = f(d)?;
    for _ in 0..max_iter {
        if (b - a).abs() <= x_tol {
            break;
        }
        if fc <= fd {
            b = d;
            d = c;
            fd = fc;
            c = b - g * (b - a);
            fc = f(c)?;
        } else {
            a = c;
            c = d;
            fc = fd;
            d = a + g * (b - a);
            fd = f(d)?;
        }
    }
    Ok(Golden {
        lo: a,
        hi: b,
        inner: [(c, fc), (d, fd)],
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::convert::Infallible;

    fn ok(f: impl Fn(f64) -> f64) -> impl FnMut(f64) -> Result<f64, Infallible> {
        move |x| Ok(f(x))
    }

    /// A parabola's vertex: (x − 1.3)² + 2 has its minimum at x = 1.3. Near a
    /// smooth minimum f changes by only ~(δx)², so in floating point the
    /// minimum is located to about √ε·|x| ≈ 1.5e-8·|x| however narrow the
    /// bracket gets (Press et al., §10.2); the checks allow 1e-7.
    #[test]
    fn parabola_vertex() {
        let g = golden_section(ok(|x| (x - 1.3).powi(2) + 2.0), 0.0, 4.0, 1e-9, 200).unwrap();
        assert!(g.hi - g.lo <= 1e-9);
        assert!((g.middle() - 1.3).abs() < 1e-7, "{}", g.middle());
        assert!(g
            .inner
            .iter()
            .all(|&(x, fx)| x >= g.lo && x <= g.hi && fx >= 2.0));
    }

    /// cos x has its minimum −1 at x = π (to √ε, as above).
    #[test]
    fn cosine_near_pi() {
        let g = golden_section(ok(f64::cos), 2.0, 4.5, 1e-10, 200).unwrap();
        assert!(
            (g.middle() - std::f64::consts::PI).abs() < 1e-7,
            "{}",
            g.middle()
        );
        assert!((g.inner[0].1 + 1.0).abs() < 1e-15);
    }

    /// Each step shrinks the bracket by the inverse golden ratio, so a fixed
    /// number of steps leaves a known width and takes 2 + n evaluations.
    #[test]
    fn shrinks_by_the_golden_ratio_per_step() {
        let mut calls = 0;
        let g = golden_section(
            |x: f64| -> Result<f64, Infallible> {
                calls += 1;
                Ok((x - 0.7).abs())
            },
            0.0,
            1.0,
            0.0,
            20,
        )
        .unwrap();
        assert_eq!(calls, 22);
        // φ = (√5 − 1)/2 ≈ 0.618034 (1/φ = 1 + φ).
        let want = 0.618_034_f64.powi(20);
        assert!(((g.hi - g.lo) / want - 1.0).abs() < 1e-6, "{}", g.hi - g.lo);
        assert!((g.middle() - 0.7).abs() < want);
    }

    #[test]
    fn the_first_error_is_returned() {
        let r = golden_section(
            |x: f64| if x > 0.5 { Err("too far") } else { Ok(x) },
            0.0,
            1.0,
            1e-6,
            100,
        );
        assert_eq!(r, Err("too far"));
    }
}
