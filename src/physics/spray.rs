//! Drop-size spectrum of a nozzle, by volume (model.md M8).
//!
//! The spectrum is the Rosin–Rammler (Weibull) form by volume,
//!
//! ```text
//! P(d) = 1 − exp(−ln 2 · (d / d50)^n)
//! ```
//!
//! (ln 2 = 0.693…, so that P(d50) = ½ exactly), truncated to the range
//! [smallest, largest] and renormalised: no water is lost and none is put in
//! drops the user said do not exist. The range is split into bins of equal
//! width in diameter (default [`DEFAULT_BINS`] = 40), each holding the volume
//! fraction between its edges; the fractions sum to 1 (the last one is set to
//! 1 minus the others).
//!
//! # Defaults (assumptions, not published values)
//!
//! - **d50**: a *critical-Weber estimate* made for this project. The jet leaves
//!   at W = √(2 Δp/ρ_w); a drop moving through air at W breaks up above a
//!   Weber number ρ_air W² d/σ ≈ 12 (the classic bag-breakup threshold, from
//!   memory), so aerodynamic break-up caps drops near d_c = 12 σ/(ρ_air W²).
//!   The nozzle size enters through the jet: d50 = (d_n · d_c²)^(1/3), i.e.
//!   d50/d_n = (12/We_n)^(2/3) with We_n = ρ_air W² d_n/σ and σ = 0.0728 N/m.
//!   It gives 1.6 mm for a 2.4 mm nozzle at 280 kPa and falls with pressure as
//!   p^(−2/3), in the range measured for small impact sprinklers. The published
//!   relation of Kincaid, Solomon & Oliphant (1996, Trans. ASAE 39(3)) in nozzle
//!   size and pressure is *not* used: its coefficients were not available to us.
//!   Where drop sizes matter, give d50 or calibrate against a measured wetted
//!   radius ([`calibrate`]).
//! - **spread** n = 2.5, inside the 2–3.5 reported for impact sprinklers by
//!   Li, Kawano & Yu (1994) (from memory).
//! - **largest** drop: the 99.9 % volume quantile of the untruncated spectrum,
//!   d50 · (ln 1000 / ln 2)^(1/n) (2.51 · d50 at n = 2.5).
//! - **smallest** drop: max(d50/10, 0.1 mm), never above half the largest. Finer
//!   mist (a fraction of a percent of the volume) is folded into the first bin.
//!
//! # Calibration
//!
//! Given a measured wetted radius (in calm air), [`calibrate`] finds by Brent's
//! method the factor s on all drop sizes (d50, smallest and largest) for which
//! the largest drop of the farthest-throwing nozzle lands at that radius.

use super::design::SpraySpec;
use super::jet::JetExit;
use super::trajectory::{
    fly_jet, invalid, require_positive, FlightEnv, FlightOptions, ThrowError, Tolerances,
};
use std::f64::consts::LN_2;

/// Default number of drop-size bins per nozzle.
pub const DEFAULT_BINS: usize = 40;
/// Default Rosin–Rammler spread exponent n (Li, Kawano & Yu 1994, from memory).
pub const DEFAULT_SPREAD: f64 = 2.5;
/// Volume fraction below the default largest drop.
pub const LARGEST_QUANTILE: f64 = 0.999;
/// Surface tension of water against air used by the default d50, N/m (about 20 °C).
pub const SURFACE_TENSION_N_M: f64 = 0.0728;
/// Critical Weber number for aerodynamic break-up used by the default d50.
pub const CRITICAL_WEBER: f64 = 12.0;
/// Floor on the smallest drop of a spectrum, m.
pub const SMALLEST_DROP_FLOOR_M: f64 = 1e-4;

/// Rosin–Rammler cumulative volume fraction in drops smaller than `d_m`.
pub fn rosin_rammler_cdf(d_m: f64, d50_m: f64, spread: f64) -> f64 {
    if d_m <= 0.0 {
        return 0.0;
    }
    1.0 - (-LN_2 * (d_m / d50_m).powf(spread)).exp()
}

/// Diameter below which the fraction `p` ∈ (0, 1) of the volume lies (untruncated).
pub fn rosin_rammler_quantile(p: f64, d50_m: f64, spread: f64) -> f64 {
    let p = p.clamp(0.0, 1.0 - 1e-16);
    d50_m * (-(1.0 - p).ln() / LN_2).powf(1.0 / spread)
}

/// Default volume median diameter from nozzle size and pressure (the
/// critical-Weber estimate in the module docs; an assumption), m.
///
/// `nozzle_diameter_m`: nozzle exit diameter; `nozzle_pressure_pa`: pressure
/// drop across the nozzle; densities from `env`.
pub fn default_d50_m(
    nozzle_diameter_m: f64,
    nozzle_pressure_pa: f64,
    env: &FlightEnv,
) -> Result<f64, ThrowError> {
    require_positive("nozzle diameter (m)", nozzle_diameter_m)?;
    if !(nozzle_pressure_pa.is_finite() && nozzle_pressure_pa > 0.0) {
        return Err(invalid(
            "nozzle pressure (Pa)",
            nozzle_pressure_pa,
            "a positive pressure to estimate d50 from (or give d50)",
        ));
    }
    let rho_a = require_positive("air density (kg/m³)", env.air_density_kg_m3)?;
    let rho_w = require_positive("water density (kg/m³)", env.water_density_kg_m3)?;
    let w2 = 2.0 * nozzle_pressure_pa / rho_w;
    let d_crit = CRITICAL_WEBER * SURFACE_TENSION_N_M / (rho_a * w2);
    Ok((nozzle_diameter_m * d_crit * d_crit).cbrt())
}

/// Where the spectrum's d50 came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum D50Source {
    /// The critical-Weber default (an assumption).
    Default,
    /// Given by the user.
    Given,
}

/// One drop-size bin.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DropBin {
    /// Smallest diameter in the bin, m.
    pub lower_m: f64,
    /// Largest diameter in the bin, m.
    pub upper_m: f64,
    /// Fraction of the nozzle's volume flow carried by drops in this bin.
    pub volume_fraction: f64,
}

/// A nozzle's drop-size spectrum, split into bins.
#[derive(Debug, Clone, PartialEq)]
pub struct Spectrum {
    /// Volume median diameter of the (untruncated) distribution, m, after scaling.
    pub d50_m: f64,
    /// Where d50 came from.
    pub d50_source: D50Source,
    /// Rosin–Rammler spread exponent n.
    pub spread: f64,
    /// Smallest drop, m (lower edge of the first bin).
    pub smallest_m: f64,
    /// Largest drop, m (upper edge of the last bin).
    pub largest_m: f64,
    /// Calibration factor applied to all sizes (1 when not calibrated).
    pub scale: f64,
    /// Bins from small to large; volume fractions sum to 1.
    pub bins: Vec<DropBin>,
}

impl Spectrum {
    /// Builds the spectrum of one jet from the user's overrides in `spec`.
    ///
    /// `bins` ≥ 1; `scale` > 0 multiplies d50, smallest and largest (calibration).
    pub fn for_jet(
        spec: &SpraySpec,
        jet: &JetExit,
        env: &FlightEnv,
        bins: usize,
        scale: f64,
    ) -> Result<Spectrum, ThrowError> {
        if bins == 0 {
            return Err(invalid("drop-size bins", 0.0, "at least 1"));
        }
        require_positive("drop-size scale factor", scale)?;
        let (d50, source) = match spec.d50_m {
            Some(d) => (require_positive("d50 (m)", d)?, D50Source::Given),
            None => (
                default_d50_m(jet.nozzle_diameter_m, jet.nozzle_pressure_pa, env)?,
                D50Source::Default,
            ),
        };
        let spread = match spec.spread {
            Some(n) if n.is_finite() && (0.5..=20.0).contains(&n) => n,
            Some(n) => return Err(invalid("spray spread n", n, "a number from 0.5 to 20")),
            None => DEFAULT_SPREAD,
        };
        let largest = match spec.largest_m {
            Some(d) => require_positive("largest drop (m)", d)?,
            None => rosin_rammler_quantile(LARGEST_QUANTILE, d50, spread),
        };
        let smallest = (d50 / 10.0).max(SMALLEST_DROP_FLOOR_M).min(0.5 * largest);
        Spectrum::from_parts(
            d50 * scale,
            source,
            spread,
            smallest * scale,
            largest * scale,
            bins,
            scale,
        )
    }

    /// Builds a spectrum from explicit sizes (all in m).
    pub fn from_parts(
        d50_m: f64,
        d50_source: D50Source,
        spread: f64,
        smallest_m: f64,
        largest_m: f64,
        bins: usize,
        scale: f64,
    ) -> Result<Spectrum, ThrowError> {
        require_positive("d50 (m)", d50_m)?;
        require_positive("spray spread n", spread)?;
        require_positive("smallest drop (m)", smallest_m)?;
        require_positive("largest drop (m)", largest_m)?;
        if bins == 0 {
            return Err(invalid("drop-size bins", 0.0, "at least 1"));
        }
        if largest_m <= smallest_m {
            return Err(invalid(
                "largest drop (m)",
                largest_m,
                "a size above the smallest drop of the spectrum",
            ));
        }
        let p_lo = rosin_rammler_cdf(smallest_m, d50_m, spread);
        let p_hi = rosin_rammler_cdf(largest_m, d50_m, spread);
        let total = p_hi - p_lo;
        let width = (largest_m - smallest_m) / bins as f64;
        let edge = |i: usize| {
            if i == bins {
                largest_m
            } else {
                smallest_m + width * i as f64
            }
        };
        let mut out = Vec::with_capacity(bins);
        let mut sum = 0.0f64;
        for i in 0..bins {
            let (lo, hi) = (edge(i), edge(i + 1));
            let fraction = if total > 0.0 {
                (rosin_rammler_cdf(hi, d50_m, spread) - rosin_rammler_cdf(lo, d50_m, spread))
                    / total
            } else {
                1.0 / bins as f64
            };
            let fraction = if i + 1 == bins {
                (1.0 - sum).max(0.0)
            } else {
                fraction
            };
            sum += fraction;
            out.push(DropBin {
                lower_m: lo,
                upper_m: hi,
                volume_fraction: fraction,
            });
        }
        Ok(Spectrum {
            d50_m,
            d50_source,
            spread,
            smallest_m,
            largest_m,
            scale,
            bins: out,
        })
    }

    /// Bin edges from smallest to largest drop, m (one more than the bins).
    pub fn edges_m(&self) -> Vec<f64> {
        let mut e: Vec<f64> = self.bins.iter().map(|b| b.lower_m).collect();
        e.push(self.largest_m);
        e
    }

    /// Diameter below which the fraction `p` of this (truncated) spectrum's volume lies, m.
    pub fn diameter_at_fraction(&self, p: f64) -> f64 {
        let p_lo = rosin_rammler_cdf(self.smallest_m, self.d50_m, self.spread);
        let p_hi = rosin_rammler_cdf(self.largest_m, self.d50_m, self.spread);
        let target = p_lo + p.clamp(0.0, 1.0) * (p_hi - p_lo);
        // max/min, not clamp: clamp panics when a bound is NaN.
        rosin_rammler_quantile(target, self.d50_m, self.spread)
            .max(self.smallest_m)
            .min(self.largest_m)
    }
}

/// Landing distance of the largest drop of each jet's spectrum, m (`None` for a
/// jet that does not flow), in still air.
pub fn largest_drop_throws_m(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    flight: &FlightOptions,
    scale: f64,
) -> Result<Vec<Option<f64>>, ThrowError> {
    let still = env.still();
    jets.iter()
        .map(|jet| {
            if !flows(jet) {
                return Ok(None);
            }
            let s = Spectrum::for_jet(spec, jet, &still, 1, scale)?;
            Ok(Some(fly_jet(jet, s.largest_m, &still, flight)?.distance_m))
        })
        .collect()
}

/// Wetted radius in still air: the farthest landing of any jet's largest drop, m.
///
/// Returns an error when no jet flows.
pub fn wetted_radius_m(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    flight: &FlightOptions,
    scale: f64,
) -> Result<f64, ThrowError> {
    largest_drop_throws_m(jets, spec, env, flight, scale)?
        .into_iter()
        .flatten()
        .reduce(f64::max)
        .ok_or_else(no_flow)
}

/// True when a jet carries water (a finite, positive flow).
pub(crate) fn flows(jet: &JetExit) -> bool {
    jet.flow_m3_s.is_finite() && jet.flow_m3_s > 0.0
}

pub(crate) fn no_flow() -> ThrowError {
    ThrowError::InvalidInput {
        field: "nozzles".to_string(),
        detail: "have no flow: there is no spray to throw".to_string(),
    }
}

/// Result of matching the model's wetted radius to a measured one.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Calibration {
    /// Factor on all drop sizes that makes the model match.
    pub scale: f64,
    /// The measured wetted radius, m.
    pub measured_radius_m: f64,
    /// Model wetted radius with the factor applied, m.
    pub model_radius_m: f64,
    /// Model wetted radius before calibration (scale 1), m.
    pub uncalibrated_radius_m: f64,
}

/// Scale range tried by [`calibrate`].
pub const CALIBRATION_SCALE_RANGE: (f64, f64) = (0.1, 10.0);

/// Finds the factor on drop sizes for which the model's wetted radius (still
/// air, largest drop) equals `measured_radius_m`.
pub fn calibrate(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    flight: &FlightOptions,
    measured_radius_m: f64,
) -> Result<Calibration, ThrowError> {
    require_positive("measured wetted radius (m)", measured_radius_m)?;
    let radius = |s: f64| wetted_radius_m(jets, spec, env, flight, s);
    let uncalibrated = radius(1.0)?;
    let (lo, hi) = CALIBRATION_SCALE_RANGE;
    let r_lo = radius(lo)?;
    let r_hi = radius(hi)?;
    if !(r_lo <= measured_radius_m && measured_radius_m <= r_hi) {
        return Err(ThrowError::CalibrationUnreachable {
            measured_m: measured_radius_m,
            min_m: r_lo,
            max_m: r_hi,
            min_scale: lo,
            max_scale: hi,
        });
    }
    // Brent on ln s: the throw changes smoothly and much faster at small s.
    let mut failure = None;
    let mut tol = Tolerances {
        x_tol: 1e-9,
        f_tol: 1e-7 * measured_radius_m,
        max_iter: 200,
    };
    let ln_s = roots::find_root_brent(
        lo.ln(),
        hi.ln(),
        |x: f64| match radius(x.exp()) {
            Ok(r) => r - measured_radius_m,
            Err(e) => {
                failure.get_or_insert(e);
                0.0
            }
        },
        &mut tol,
    );
    if let Some(e) = failure {
        return Err(e);
    }
    let scale = ln_s
        .map_err(|e| ThrowError::InvalidInput {
            field: "calibration".to_string(),
            detail: format!(
                "did not converge on drop-size scales {lo:.4} to {hi:.4} (ln {:.4} to {:.4}): {e}",
                lo.ln(),
                hi.ln()
            ),
        })?
        .exp();
    Ok(Calibration {
        scale,
        measured_radius_m,
        model_radius_m: radius(scale)?,
        uncalibrated_radius_m: uncalibrated,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::design::Wind;
    use crate::physics::fluid::{AirProps, WaterProps};
    use nalgebra::Vector3;

    fn env() -> FlightEnv {
        FlightEnv::new(
            &AirProps::at(20.0, 0.0),
            &WaterProps::at(20.0),
            &Wind::default(),
        )
    }

    fn jet() -> JetExit {
        JetExit {
            position_m: Vector3::new(0.16, 0.0, 0.35),
            velocity_m_s: Vector3::new(4.0, -14.0, 8.0),
            flow_m3_s: 1.0e-4,
            nozzle_diameter_m: 2.4e-3,
            nozzle_pressure_pa: 2.8e5,
        }
    }

    #[test]
    fn cdf_is_one_half_at_d50() {
        assert!((rosin_rammler_cdf(1.3e-3, 1.3e-3, 2.7) - 0.5).abs() < 1e-15);
        let d = rosin_rammler_quantile(0.9, 1.3e-3, 2.7);
        assert!((rosin_rammler_cdf(d, 1.3e-3, 2.7) - 0.9).abs() < 1e-12);
    }

    #[test]
    fn bins_sum_to_one_and_cover_the_range() {
        let s =
            Spectrum::for_jet(&SpraySpec::default(), &jet(), &env(), DEFAULT_BINS, 1.0).unwrap();
        assert_eq!(s.bins.len(), 40);
        let sum: f64 = s.bins.iter().map(|b| b.volume_fraction).sum();
        assert!((sum - 1.0).abs() < 1e-14);
        assert!(s.bins.iter().all(|b| b.volume_fraction >= 0.0));
        assert_eq!(s.bins[0].lower_m, s.smallest_m);
        assert_eq!(s.bins[39].upper_m, s.largest_m);
        for w in s.bins.windows(2) {
            assert_eq!(w[0].upper_m, w[1].lower_m);
        }
        // Default largest: 99.9 % quantile, d50·(ln 1000/ln 2)^(1/2.5).
        assert!((s.largest_m / s.d50_m - (1000f64.ln() / LN_2).powf(0.4)).abs() < 1e-12);
    }

    #[test]
    fn default_d50_follows_the_documented_relation() {
        let e = env();
        let d = default_d50_m(2.4e-3, 2.8e5, &e).unwrap();
        let w2 = 2.0 * 2.8e5 / e.water_density_kg_m3;
        let dc = 12.0 * 0.0728 / (e.air_density_kg_m3 * w2);
        assert!((d - (2.4e-3 * dc * dc).cbrt()).abs() < 1e-15);
        assert!(d > 1.4e-3 && d < 1.8e-3);
        // Higher pressure, finer spray: d50 ∝ p^(−2/3).
        let d2 = default_d50_m(2.4e-3, 2.8e5 * 8.0, &e).unwrap();
        assert!((d / d2 - 4.0).abs() < 1e-9);
        assert!(default_d50_m(2.4e-3, 0.0, &e).is_err());
    }

    #[test]
    fn user_overrides_are_used() {
        let spec = SpraySpec {
            d50_m: Some(1.0e-3),
            spread: Some(3.0),
            largest_m: Some(3.0e-3),
        };
        let s = Spectrum::for_jet(&spec, &jet(), &env(), 10, 1.0).unwrap();
        assert_eq!(s.d50_source, D50Source::Given);
        assert_eq!((s.d50_m, s.spread, s.largest_m), (1.0e-3, 3.0, 3.0e-3));
        assert!((s.diameter_at_fraction(1.0) - 3.0e-3).abs() < 1e-12);
        let bad = SpraySpec {
            largest_m: Some(-1.0),
            ..spec
        };
        assert!(Spectrum::for_jet(&bad, &jet(), &env(), 10, 1.0).is_err());
    }

    #[test]
    fn calibration_recovers_a_known_scale() {
        let (e, f) = (env(), FlightOptions::pattern());
        let spec = SpraySpec::default();
        let target = wetted_radius_m(&[jet()], &spec, &e, &f, 0.8).unwrap();
        let c = calibrate(&[jet()], &spec, &e, &f, target).unwrap();
        assert!((c.scale - 0.8).abs() < 1e-4, "{}", c.scale);
        assert!((c.model_radius_m - target).abs() < 1e-5);
        assert!(c.uncalibrated_radius_m > target);
        let far = calibrate(&[jet()], &spec, &e, &f, 500.0).unwrap_err();
        assert!(matches!(far, ThrowError::CalibrationUnreachable { .. }));
    }
}
