//! The spray fitted to a measured radial leg of catch cans.
//!
//! A radial leg gives the application rate qᵢ (mm/h) at distances rᵢ from one
//! head. The model's radial profile q(r; C_b) depends on the jet breakup
//! coefficient C_b (model.md M7: the intact jet's length over
//! d·√(ρ_w/ρ_air)), which sets where the drops leave the jet and so how far
//! they fly. The fit minimises the misfit
//!
//! ```text
//! S(C_b) = Σ (q(rᵢ; C_b) − qᵢ)²,   reported as rms = √(S/n), mm/h
//! ```
//!
//! over C_b in [`PLAUSIBLE_BREAKUP`] (2–22). One parameter: a scan on a
//! coarse grid finds the basin (the profile is piecewise constant in r, so S
//! is not smooth enough for a derivative method from afar), then a
//! golden-section search narrows it (Press et al., *Numerical Recipes*,
//! §10.2). Optionally the median drop size d50 too, by coordinate descent
//! (C_b, then d50 within half to twice the model's, then C_b again); else
//! the drop sizes stay the design's. The flow is the model's, so a leg that
//! caught much less water overall is matched in shape as far as the throw
//! allows, and the layout report says how the water compares.

use super::audit::measured_throw_m;
use crate::numeric::minimise::golden_section;
use crate::physics::breakup::PLAUSIBLE_BREAKUP;
use crate::physics::design::SpraySpec;
use crate::physics::jet::JetExit;
use crate::physics::layout::MeasuredLeg;
use crate::physics::pattern::{radial_pattern, PatternOptions, ThrowReport};
use crate::physics::spray::breakup_coefficient;
use crate::physics::trajectory::{FlightEnv, ThrowError};

/// Points of the coarse scan over [`PLAUSIBLE_BREAKUP`].
pub const SCAN_POINTS: usize = 11;
/// The golden-section search stops when its bracket is this narrow.
pub const BREAKUP_TOLERANCE: f64 = 0.005;

/// The result of fitting the breakup coefficient to a leg.
#[derive(Debug, Clone, PartialEq)]
pub struct LegFit {
    /// The coefficient before the fit (the design's, or the default 11).
    pub breakup_before: f64,
    /// The fitted coefficient.
    pub breakup: f64,
    /// The model's median drop size before the fit (its first flowing
    /// nozzle's), m.
    pub d50_before_m: Option<f64>,
    /// The fitted median drop size, m (`None` unless d50 was fitted).
    pub d50_m: Option<f64>,
    /// Rms of model − measured over the cans before the fit, mm/h.
    pub rms_before_mm_h: f64,
    /// The same after the fit, mm/h.
    pub rms_after_mm_h: f64,
    /// True when the fit ended at an end of the plausible range: the leg is
    /// not explained by the jet's breakup alone.
    pub at_limit: bool,
    /// Model evaluations taken.
    pub evaluations: usize,
    /// The spray settings with the fitted coefficient.
    pub spray: SpraySpec,
    /// The fitted model's throw and radial profile.
    pub throw: ThrowReport,
    /// The leg's measured throw (farthest can at the fitted model's wetting
    /// threshold), m.
    pub measured_throw_m: Option<f64>,
}

/// Rms of the model's profile against the leg's cans, mm/h.
pub fn leg_misfit_mm_h(throw: &ThrowReport, leg: &MeasuredLeg) -> f64 {
    let points = leg.points();
    if points.is_empty() {
        return 0.0;
    }
    let s: f64 = points
        .iter()
        .map(|&(r, q)| {
            let d = throw.profile.rate_mm_h_at(r) - q;
            d * d
        })
        .sum();
    (s / points.len() as f64).sqrt()
}

/// The best of a scan of `points` values over [lo, hi], narrowed by a
/// golden-section search to `tol` around it: (x, f(x)).
fn scan_and_narrow(
    f: &mut dyn FnMut(f64) -> Result<f64, ThrowError>,
    lo: f64,
    hi: f64,
    points: usize,
    tol: f64,
    start: (f64, f64),
) -> Result<(f64, f64), ThrowError> {
    let step = (hi - lo) / (points.max(2) - 1) as f64;
    let mut best = start;
    for k in 0..points.max(2) {
        let c = lo + step * k as f64;
        let m = f(c)?;
        if m < best.1 {
            best = (c, m);
        }
    }
    let (a, b) = ((best.0 - step).max(lo), (best.0 + step).min(hi));
    let narrowed = golden_section(&mut *f, a, b, tol, usize::MAX)?;
    for (c, v) in narrowed.inner {
        if v < best.1 {
            best = (c, v);
        }
    }
    Ok(best)
}

/// Fits the breakup coefficient (and with `fit_d50` the median drop size
/// d50 as well) so that the radial profile of `jets` (with `spec`'s other
/// settings, at `omega_rad_s`) matches `leg`.
///
/// With d50: coordinate descent, breakup then d50 then breakup again, d50
/// within half to twice the model's (and below 0.8 of the largest drop,
/// [`crate::physics::spray::D50_MAX_OVER_LARGEST`]).
pub fn fit_leg(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    omega_rad_s: f64,
    opts: &PatternOptions,
    leg: &MeasuredLeg,
    fit_d50: bool,
) -> Result<LegFit, ThrowError> {
    let mut evaluations = 0usize;
    let mut misfit = |s: &SpraySpec| -> Result<f64, ThrowError> {
        evaluations += 1;
        let t = radial_pattern(jets, s, env, omega_rad_s, opts)?;
        Ok(leg_misfit_mm_h(&t, leg))
    };
    let before = breakup_coefficient(spec);
    let start = radial_pattern(jets, spec, env, omega_rad_s, opts)?;
    let rms_before = leg_misfit_mm_h(&start, leg);
    let spectra: Vec<&crate::physics::spray::Spectrum> = start
        .nozzles
        .iter()
        .flatten()
        .map(|n| &n.spectrum)
        .collect();
    let d50_before = spectra.first().map(|s| s.d50_m);
    let (lo, hi) = PLAUSIBLE_BREAKUP;
    let mut spray = *spec;
    let mut best = (before, rms_before);
    let rounds = if fit_d50 { 2 } else { 1 };
    let mut d50_m = None;
    for round in 0..rounds {
        let base = spray;
        let (points, a, b) = if round == 0 {
            (SCAN_POINTS, lo, hi)
        } else {
            (5, (best.0 - 2.0).max(lo), (best.0 + 2.0).min(hi))
        };
        best = scan_and_narrow(
            &mut |c| {
                misfit(&SpraySpec {
                    breakup: Some(c),
                    ..base
                })
            },
            a,
            b,
            points,
            BREAKUP_TOLERANCE,
            best,
        )?;
        spray.breakup = Some(best.0);
        if fit_d50 && round == 0 {
            let (Some(d0), Some(largest)) = (
                d50_before,
                spectra.iter().map(|s| s.largest_m).reduce(f64::min),
            ) else {
                break;
            };
            let top = (2.0 * d0).min(crate::physics::spray::D50_MAX_OVER_LARGEST * largest);
            let bottom = 0.5 * d0;
            if top <= bottom {
                break;
            }
            let base = spray;
            let found = scan_and_narrow(
                &mut |d| {
                    misfit(&SpraySpec {
                        d50_m: Some(d),
                        ..base
                    })
                },
                bottom,
                top,
                SCAN_POINTS,
                1e-3 * d0,
                (base.d50_m.unwrap_or(d0), best.1),
            )?;
            if found.1 < best.1 {
                spray.d50_m = Some(found.0);
                d50_m = Some(found.0);
                best.1 = found.1;
            }
        }
    }
    spray.breakup = Some(best.0);
    let throw = radial_pattern(jets, &spray, env, omega_rad_s, opts)?;
    let rms_after = leg_misfit_mm_h(&throw, leg);
    let at_limit = best.0 - lo < 2.0 * BREAKUP_TOLERANCE || hi - best.0 < 2.0 * BREAKUP_TOLERANCE;
    Ok(LegFit {
        breakup_before: before,
        breakup: best.0,
        d50_before_m: d50_before,
        d50_m,
        rms_before_mm_h: rms_before,
        rms_after_mm_h: rms_after,
        at_limit,
        evaluations,
        spray,
        measured_throw_m: measured_throw_m(leg, throw.wetting_threshold_mm_h),
        throw,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::balance::solve;
    use crate::physics::coverage::{flight_env, spraying_state};
    use crate::physics::fixtures;

    #[test]
    fn recovers_a_known_breakup_coefficient() {
        let design = fixtures::three_arm_rotor();
        let report = solve(&design);
        let s = spraying_state(&design, &report);
        let env = flight_env(&design);
        let opts = PatternOptions::default();
        // A leg made by the model with C_b = 7, cans every 0.5 m.
        let truth = SpraySpec {
            breakup: Some(7.0),
            ..design.spray
        };
        let t = radial_pattern(&s.jets, &truth, &env, s.omega_rad_s, &opts).unwrap();
        let cans: Vec<(f64, f64)> = (1..40)
            .map(|k| 0.5 * k as f64)
            .take_while(|r| *r < t.wetted_radius_m + 1.0)
            .map(|r| (r, t.profile.rate_mm_h_at(r)))
            .collect();
        let leg = MeasuredLeg::new(cans).unwrap();
        let start = SpraySpec {
            breakup: None,
            ..design.spray
        };
        let fit = fit_leg(&s.jets, &start, &env, s.omega_rad_s, &opts, &leg, false).unwrap();
        assert_eq!(fit.breakup_before, 11.0);
        assert!((fit.breakup - 7.0).abs() < 0.2, "{}", fit.breakup);
        assert!(fit.rms_after_mm_h < 0.2 * fit.rms_before_mm_h, "{fit:?}");
        assert!(!fit.at_limit);
        assert_eq!(fit.d50_m, None);
        // With d50 free as well: still at least as close, d50 near the model's.
        let both = fit_leg(&s.jets, &start, &env, s.omega_rad_s, &opts, &leg, true).unwrap();
        assert!(both.rms_after_mm_h <= fit.rms_after_mm_h + 1e-9, "{both:?}");
        assert!((both.breakup - 7.0).abs() < 0.2, "{}", both.breakup);
        // The leg was made with the model's own d50: it stays, or moves little.
        let d0 = both.d50_before_m.unwrap();
        let d = both.d50_m.unwrap_or(d0);
        assert!((d / d0 - 1.0).abs() < 0.1, "{d} against {d0}");
    }
}
