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
//! §10.2). Drop sizes (d50) stay the design's; the flow is the model's, so a
//! leg that caught much less water overall is matched in shape as far as the
//! throw allows, and the layout report says how the water compares.

use crate::audit::measured_throw_m;
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

/// Fits the breakup coefficient so that the radial profile of `jets` (with
/// `spec`'s other settings, at `omega_rad_s`) matches `leg`.
pub fn fit_leg(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    omega_rad_s: f64,
    opts: &PatternOptions,
    leg: &MeasuredLeg,
) -> Result<LegFit, ThrowError> {
    let with = |c: f64| SpraySpec {
        breakup: Some(c),
        ..*spec
    };
    let mut evaluations = 0usize;
    let mut misfit = |c: f64| -> Result<f64, ThrowError> {
        evaluations += 1;
        let t = radial_pattern(jets, &with(c), env, omega_rad_s, opts)?;
        Ok(leg_misfit_mm_h(&t, leg))
    };
    let before = breakup_coefficient(spec);
    let rms_before = misfit(before)?;
    let (lo, hi) = PLAUSIBLE_BREAKUP;
    let step = (hi - lo) / (SCAN_POINTS - 1) as f64;
    let mut best = (before, rms_before);
    for k in 0..SCAN_POINTS {
        let c = lo + step * k as f64;
        let m = misfit(c)?;
        if m < best.1 {
            best = (c, m);
        }
    }
    // Golden section in the best scan point's neighbourhood.
    let g = (5f64.sqrt() - 1.0) / 2.0;
    let (mut a, mut b) = ((best.0 - step).max(lo), (best.0 + step).min(hi));
    let mut c1 = b - g * (b - a);
    let mut c2 = a + g * (b - a);
    let mut f1 = misfit(c1)?;
    let mut f2 = misfit(c2)?;
    while b - a > BREAKUP_TOLERANCE {
        if f1 <= f2 {
            b = c2;
            c2 = c1;
            f2 = f1;
            c1 = b - g * (b - a);
            f1 = misfit(c1)?;
        } else {
            a = c1;
            c1 = c2;
            f1 = f2;
            c2 = a + g * (b - a);
            f2 = misfit(c2)?;
        }
    }
    for (c, f) in [(c1, f1), (c2, f2)] {
        if f < best.1 {
            best = (c, f);
        }
    }
    let spray = with(best.0);
    let throw = radial_pattern(jets, &spray, env, omega_rad_s, opts)?;
    let rms_after = leg_misfit_mm_h(&throw, leg);
    let at_limit = best.0 - lo < 2.0 * BREAKUP_TOLERANCE || hi - best.0 < 2.0 * BREAKUP_TOLERANCE;
    Ok(LegFit {
        breakup_before: before,
        breakup: best.0,
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
        let fit = fit_leg(&s.jets, &start, &env, s.omega_rad_s, &opts, &leg).unwrap();
        assert_eq!(fit.breakup_before, 11.0);
        assert!((fit.breakup - 7.0).abs() < 0.2, "{}", fit.breakup);
        assert!(fit.rms_after_mm_h < 0.2 * fit.rms_before_mm_h, "{fit:?}");
        assert!(!fit.at_limit);
    }
}
