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
//! # Defaults
//!
//! - **largest** drop: the nozzle diameter, never above 9 mm. Drops as large as
//!   the jet are what a breaking jet can make at most; the largest drops measured
//!   from sprinklers are about 9 mm, at low pressure (Montero, Tarjuelo &
//!   Carrión 2003, *Irrig. Sci.* 22:47–56). The largest drop sets the wetted radius.
//! - **d50**: the volume median diameter follows the jet's Weber number
//!   We = ρ_air W² d_n / σ (W the jet speed from the nozzle pressure, σ =
//!   0.0728 N/m),
//!
//!   ```text
//!   d50 = 1.45 · d_n · We^(−1/3),   at most 0.8 × the largest drop,
//!   ```
//!
//!   so d50 rises with nozzle size (as d_n^(2/3)) and falls with pressure (as
//!   p^(−1/3)), the trends measured for impact sprinklers by Kincaid, Solomon &
//!   Oliphant (1996, *Trans. ASAE* 39(3):839–845) and Li, Kawano & Yu (1994,
//!   *Trans. ASAE* 37(6)). Their fitted coefficients were not available to us,
//!   so the form is the project's (a Weber scaling) and the constant 1.45 is set
//!   so that a 5 mm nozzle at 300 kPa gives d50 = 0.4 d_n = 2.0 mm, inside the
//!   1–3 mm those papers report for medium nozzles (from memory). It shapes the
//!   radial profile, not the wetted radius; where drop sizes matter, give d50.
//! - **spread** n = 2.5, inside the 2–3.5 reported for impact sprinklers by
//!   Li, Kawano & Yu (1994) (from memory).
//! - **smallest** drop: max(d50/10, 0.1 mm), never above half the largest. Finer
//!   mist (a fraction of a percent of the volume) is folded into the first bin.
//!
//! # Calibration
//!
//! Given a measured wetted radius (in calm air), [`calibrate`] finds by Brent's
//! method the jet breakup coefficient ([`crate::physics::breakup`]) for which the
//! model's wetted radius equals it. Drop sizes stay physical. A reading outside
//! what the plausible coefficients [`PLAUSIBLE_BREAKUP`] can explain is refused,
//! with the range of radii they give.

use super::breakup::{JetModel, DEFAULT_BREAKUP_COEFFICIENT, PLAUSIBLE_BREAKUP};
use super::design::SpraySpec;
use super::jet::JetExit;
use super::pattern::{wetted_radius, WettedRadius};
use super::trajectory::{invalid, require_positive, FlightEnv, FlightOptions, ThrowError};
use crate::numeric::root::{brent, Tolerance};
use std::f64::consts::LN_2;

/// Default number of drop-size bins per nozzle.
pub const DEFAULT_BINS: usize = 40;
/// Default Rosin–Rammler spread exponent n (Li, Kawano & Yu 1994, from memory).
pub const DEFAULT_SPREAD: f64 = 2.5;
/// Largest drop a sprinkler makes, m (Montero, Tarjuelo & Carrión 2003).
pub const LARGEST_DROP_CAP_M: f64 = 9.0e-3;
/// Surface tension of water against air used by the default d50, N/m (about 20 °C).
pub const SURFACE_TENSION_N_M: f64 = 0.0728;
/// Constant of the default d50 = C · d_n · We^(−1/3) (module docs).
pub const D50_WEBER_CONSTANT: f64 = 1.45;
/// The default d50 is at most this fraction of the largest drop.
pub const D50_MAX_OVER_LARGEST: f64 = 0.8;
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

/// Default largest drop of a nozzle, m: its diameter, at most [`LARGEST_DROP_CAP_M`].
pub fn default_largest_m(nozzle_diameter_m: f64) -> f64 {
    nozzle_diameter_m.min(LARGEST_DROP_CAP_M)
}

/// Default volume median diameter from nozzle size and pressure (module
/// docs: d50 = 1.45 d_n We^(−1/3), at most 0.8 × the default largest drop), m.
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
    let weber = rho_a * w2 * nozzle_diameter_m / SURFACE_TENSION_N_M;
    let d50 = D50_WEBER_CONSTANT * nozzle_diameter_m * weber.cbrt().recip();
    Ok(d50.min(D50_MAX_OVER_LARGEST * default_largest_m(nozzle_diameter_m)))
}

/// Where the spectrum's d50 came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum D50Source {
    /// The Weber-scaled default (module docs).
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
    /// Volume median diameter of the (untruncated) distribution, m.
    pub d50_m: f64,
    /// Where d50 came from.
    pub d50_source: D50Source,
    /// Rosin–Rammler spread exponent n.
    pub spread: f64,
    /// Smallest drop, m (lower edge of the first bin).
    pub smallest_m: f64,
    /// Largest drop, m (upper edge of the last bin).
    pub largest_m: f64,
    /// Bins from small to large; volume fractions sum to 1.
    pub bins: Vec<DropBin>,
}

impl Spectrum {
    /// Builds the spectrum of one jet from the user's overrides in `spec`
    /// (`bins` ≥ 1).
    pub fn for_jet(
        spec: &SpraySpec,
        jet: &JetExit,
        env: &FlightEnv,
        bins: usize,
    ) -> Result<Spectrum, ThrowError> {
        if bins == 0 {
            return Err(invalid("drop-size bins", 0.0, "at least 1"));
        }
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
            None => default_largest_m(require_positive(
                "nozzle diameter (m)",
                jet.nozzle_diameter_m,
            )?),
        };
        let smallest = (d50 / 10.0).max(SMALLEST_DROP_FLOOR_M).min(0.5 * largest);
        Spectrum::from_parts(d50, source, spread, smallest, largest, bins)
    }

    /// Builds a spectrum from explicit sizes (all in m).
    pub fn from_parts(
        d50_m: f64,
        d50_source: D50Source,
        spread: f64,
        smallest_m: f64,
        largest_m: f64,
        bins: usize,
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

/// The breakup coefficient of `spec` (its `breakup` setting, else the
/// published default).
pub fn breakup_coefficient(spec: &SpraySpec) -> f64 {
    spec.breakup.unwrap_or(DEFAULT_BREAKUP_COEFFICIENT)
}

/// `flight` with the jet model of `spec`, unless `flight` flies bare drops
/// (then drops still leave the nozzle exit with full drag).
pub fn flight_for(spec: &SpraySpec, flight: &FlightOptions) -> FlightOptions {
    if flight.jet.is_intact() {
        FlightOptions {
            jet: JetModel {
                breakup_coefficient: breakup_coefficient(spec),
                ..flight.jet
            },
            ..*flight
        }
    } else {
        *flight
    }
}

/// Result of matching the model's wetted radius to a measured one.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Calibration {
    /// Jet breakup coefficient that makes the model match.
    pub breakup_coefficient: f64,
    /// The coefficient before calibration (the scenario's, or the default).
    pub uncalibrated_breakup_coefficient: f64,
    /// The measured wetted radius, m.
    pub measured_radius_m: f64,
    /// Model wetted radius with the calibrated coefficient, m.
    pub model_radius_m: f64,
    /// Model wetted radius before calibration, m.
    pub uncalibrated_radius_m: f64,
}

impl Calibration {
    /// `spec` with the calibrated breakup coefficient.
    pub fn applied_to(&self, spec: &SpraySpec) -> SpraySpec {
        SpraySpec {
            breakup: Some(self.breakup_coefficient),
            ..*spec
        }
    }
}

/// Finds the jet breakup coefficient, within [`PLAUSIBLE_BREAKUP`], for which
/// the model's wetted radius (still air, the standard's threshold) equals
/// `measured_radius_m`.
pub fn calibrate(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    flight: &FlightOptions,
    measured_radius_m: f64,
) -> Result<Calibration, ThrowError> {
    require_positive("measured wetted radius (m)", measured_radius_m)?;
    let flight = FlightOptions {
        jet: JetModel::default(),
        ..*flight
    };
    let radius = |c: f64| -> Result<f64, ThrowError> {
        let s = SpraySpec {
            breakup: Some(c),
            ..*spec
        };
        wetted_radius(jets, &s, env, &flight).map(|w: WettedRadius| w.standard_m)
    };
    let c0 = breakup_coefficient(spec);
    let uncalibrated = radius(c0)?;
    let (lo, hi) = PLAUSIBLE_BREAKUP;
    let r_lo = radius(lo)?;
    let r_hi = radius(hi)?;
    if !(r_lo <= measured_radius_m && measured_radius_m <= r_hi) {
        return Err(ThrowError::CalibrationUnreachable {
            measured_m: measured_radius_m,
            min_m: r_lo,
            max_m: r_hi,
            min_breakup: lo,
            max_breakup: hi,
        });
    }
    let mut failure = None;
    let tol = Tolerance {
        x: 1e-7,
        f: 1e-6 * measured_radius_m,
        max_iter: 200,
    };
    let found = brent(
        |c: f64| match radius(c) {
            Ok(r) => r - measured_radius_m,
            Err(e) => {
                failure.get_or_insert(e);
                0.0
            }
        },
        lo,
        hi,
        tol,
    );
    if let Some(e) = failure {
        return Err(e);
    }
    let coefficient = found.map_err(|e| ThrowError::InvalidInput {
        field: "calibration".to_string(),
        detail: format!("did not converge on breakup coefficients {lo} to {hi}: {e}"),
    })?;
    Ok(Calibration {
        breakup_coefficient: coefficient,
        uncalibrated_breakup_coefficient: c0,
        measured_radius_m,
        model_radius_m: radius(coefficient)?,
        uncalibrated_radius_m: uncalibrated,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    use nalgebra::Vector3;

    fn env() -> FlightEnv {
        crate::physics::fixtures::flight_env_20c(0.0, 0.0)
    }

    fn jet() -> JetExit {
        JetExit {
            position_m: Vector3::new(0.16, 0.0, 0.35),
            velocity_m_s: Vector3::new(4.0, -14.0, 8.0),
            flow_m3_s: 1.0e-4,
            nozzle_diameter_m: 2.4e-3,
            nozzle_pressure_pa: 2.8e5,
            omega_rad_s: 0.0,
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
        let s = Spectrum::for_jet(&SpraySpec::default(), &jet(), &env(), DEFAULT_BINS).unwrap();
        assert_eq!(s.bins.len(), 40);
        let sum: f64 = s.bins.iter().map(|b| b.volume_fraction).sum();
        assert!((sum - 1.0).abs() < 1e-14);
        assert!(s.bins.iter().all(|b| b.volume_fraction >= 0.0));
        assert_eq!(s.bins[0].lower_m, s.smallest_m);
        assert_eq!(s.bins[39].upper_m, s.largest_m);
        for w in s.bins.windows(2) {
            assert_eq!(w[0].upper_m, w[1].lower_m);
        }
        // Default largest: the nozzle diameter.
        assert_eq!(s.largest_m, 2.4e-3);
    }

    #[test]
    fn default_d50_follows_the_documented_relation() {
        let e = env();
        let d = default_d50_m(5e-3, 3.0e5, &e).unwrap();
        let we = e.air_density_kg_m3 * 2.0 * 3.0e5 / e.water_density_kg_m3 * 5e-3 / 0.0728;
        assert!((d - 1.45 * 5e-3 / we.cbrt()).abs() < 1e-15);
        // The anchor of the constant: d50 ≈ 0.4 d_n for 5 mm at 300 kPa.
        assert!((d / 5e-3 - 0.4).abs() < 0.01, "{d}");
        // Higher pressure, finer spray (d50 ∝ p^(−1/3)); bigger nozzle, bigger drops.
        let d8 = default_d50_m(5e-3, 3.0e5 * 8.0, &e).unwrap();
        assert!((d / d8 - 2.0).abs() < 1e-9);
        assert!(default_d50_m(8e-3, 3.0e5, &e).unwrap() > d);
        // Never above 0.8 of the largest drop, even for a slow small jet.
        let slow = default_d50_m(1e-3, 2.0e3, &e).unwrap();
        assert!((slow - 0.8e-3).abs() < 1e-15);
        assert!(default_d50_m(2.4e-3, 0.0, &e).is_err());
    }

    #[test]
    fn largest_drop_is_the_nozzle_at_most_nine_mm() {
        assert_eq!(default_largest_m(0.5e-3), 0.5e-3);
        assert_eq!(default_largest_m(12e-3), 9e-3);
    }

    #[test]
    fn user_overrides_are_used() {
        let spec = SpraySpec {
            d50_m: Some(1.0e-3),
            spread: Some(3.0),
            largest_m: Some(3.0e-3),
            breakup: None,
        };
        let s = Spectrum::for_jet(&spec, &jet(), &env(), 10).unwrap();
        assert_eq!(s.d50_source, D50Source::Given);
        assert_eq!((s.d50_m, s.spread, s.largest_m), (1.0e-3, 3.0, 3.0e-3));
        assert!((s.diameter_at_fraction(1.0) - 3.0e-3).abs() < 1e-12);
        let bad = SpraySpec {
            largest_m: Some(-1.0),
            ..spec
        };
        assert!(Spectrum::for_jet(&bad, &jet(), &env(), 10).is_err());
    }

    #[test]
    fn calibration_recovers_a_known_breakup_coefficient() {
        let (e, f) = (env(), FlightOptions::pattern());
        let spec = SpraySpec::default();
        let known = SpraySpec {
            breakup: Some(7.0),
            ..spec
        };
        let target = wetted_radius(&[jet()], &known, &e, &f).unwrap().standard_m;
        let c = calibrate(&[jet()], &spec, &e, &f, target).unwrap();
        assert!(
            (c.breakup_coefficient - 7.0).abs() < 1e-3,
            "{}",
            c.breakup_coefficient
        );
        assert!((c.model_radius_m - target).abs() < 1e-4);
        assert!(c.uncalibrated_radius_m > target);
        assert_eq!(c.uncalibrated_breakup_coefficient, 11.0);
        let far = calibrate(&[jet()], &spec, &e, &f, 500.0).unwrap_err();
        assert!(matches!(far, ThrowError::CalibrationUnreachable { .. }));
        assert!(far.to_string().contains("500.00 m"), "{far}");
    }
}
