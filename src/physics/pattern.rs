//! Where the water lands: the radial profile and the 2-D pattern (model.md M8).
//!
//! **Radial profile (still air).** Each nozzle's spectrum is split into bins
//! ([`crate::physics::spray`]). A drop of each bin edge is flown; the bin's
//! share of the nozzle flow lands in the ring between the landing distances of
//! its two edge drops, spread evenly over that ring's area:
//!
//! ```text
//! rate = Q · f_bin / (π (r_outer² − r_inner²))      (m/s; × 3.6·10⁶ → mm/h)
//! ```
//!
//! Rings from all bins and nozzles are summed into one piecewise-constant
//! profile. A ring narrower than [`MIN_RING_WIDTH_M`] is widened to that width
//! about its centre (the rate follows from the widened area, so no water is lost).
//!
//! **2-D pattern (wind)**, in [`wind`]: each jet swept through a full turn,
//! its water spread over the quadrilaterals between neighbouring landings and
//! deposited on a grid of square cells.
//!
//! Rotation speed enters only through the jets: the caller passes jets built
//! at the operating point (and at ω = 0 for the throw at rest).
//!
//! **Throw.** Every drop is flown as part of the jet: the intact stream to its
//! breakup point, then the sheltered spray ([`crate::physics::breakup`]). A
//! nozzle's jet breaks up once, so the breakup point is found once per jet and
//! every drop size is flown on from it.
//!
//! **Wetted radius** as the sprinkler testing standards define it (ASAE S398.1,
//! ISO 15886-3; thresholds from memory): the farthest distance from the head at
//! which the application rate is still [`WETTING_THRESHOLD_MM_H`] (0.26 mm/h),
//! or [`SMALL_HEAD_WETTING_THRESHOLD_MM_H`] (0.13 mm/h) for a head of 0.075 L/s
//! or less. The farthest landing of any drop is reported beside it
//! (`farthest_drop_m`). Landing distance grows with drop size in still air, so
//! [`wetted_radius`] flies bin edges from the largest drop inwards and stops
//! for each nozzle at the first ring that alone reaches the threshold: the
//! rings not flown lie inside it and cannot move the answer. (Drops of 5–6 mm,
//! whose drag factor is held, may land slightly out of order; the quick radius
//! then differs from the full profile's by under 0.2 %, as a test checks.)
//!
//! In wind, the wetted radius upwind, downwind and across the wind is read off
//! the 2-D pattern along those three rays ([`wetted_radii_in_wind`]).

use super::breakup::{release_fraction, Breakup, IntactStream};
use super::design::SpraySpec;
use super::jet::JetExit;
use super::spray::{breakup_coefficient, flight_for, flows, no_flow, Spectrum, DEFAULT_BINS};
use super::trajectory::{
    flight_path, fly_from_breakup, invalid, FlightEnv, FlightOptions, FlightPath, ThrowError,
};
use std::f64::consts::PI;

mod wind;

pub use wind::{wetted_radii_in_wind, windy_pattern, PatternGrid, WindRadii};

/// Metres of water per second to millimetres per hour.
pub const M_S_TO_MM_H: f64 = 3.6e6;
/// Narrowest ring a bin is spread over, m.
pub const MIN_RING_WIDTH_M: f64 = 1e-3;
/// Most steps [`RadialProfile::sampled`] takes from the head to the wetted radius.
pub const MAX_PROFILE_SAMPLES: usize = 100_000;
/// Volume fraction of the spectrum below the "small" drop reported per nozzle.
pub const SMALL_DROP_FRACTION: f64 = 0.1;
/// Application rate that still counts as wetted, mm/h (ASAE S398.1, ISO 15886-3; from memory).
pub const WETTING_THRESHOLD_MM_H: f64 = 0.26;
/// The same for a head of at most [`SMALL_HEAD_FLOW_M3_S`], mm/h (same sources).
pub const SMALL_HEAD_WETTING_THRESHOLD_MM_H: f64 = 0.13;
/// Head flow at or below which the smaller threshold applies, m³/s (0.075 L/s).
pub const SMALL_HEAD_FLOW_M3_S: f64 = 0.075e-3;

/// The wetting threshold for a head of total flow `flow_m3_s`, mm/h.
pub fn wetting_threshold_mm_h(flow_m3_s: f64) -> f64 {
    if flow_m3_s <= SMALL_HEAD_FLOW_M3_S {
        SMALL_HEAD_WETTING_THRESHOLD_MM_H
    } else {
        WETTING_THRESHOLD_MM_H
    }
}

/// Settings for throw and pattern calculations.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PatternOptions {
    /// Drop-size bins per nozzle.
    pub bins: usize,
    /// Trajectory accuracy.
    pub flight: FlightOptions,
    /// Azimuths per turn for the 2-D pattern.
    pub azimuths: usize,
    /// Grid cell size of the 2-D pattern, m; `None`: the pattern's larger
    /// extent / [`AUTO_CELLS`].
    pub cell_m: Option<f64>,
}

/// Cells across the larger extent of a 2-D pattern when no cell size is given.
pub const AUTO_CELLS: f64 = 120.0;

impl Default for PatternOptions {
    fn default() -> Self {
        PatternOptions {
            bins: DEFAULT_BINS,
            flight: FlightOptions::pattern(),
            azimuths: 72,
            cell_m: None,
        }
    }
}

/// Throw of one nozzle in still air.
#[derive(Debug, Clone, PartialEq)]
pub struct NozzleThrow {
    /// The nozzle's drop spectrum.
    pub spectrum: Spectrum,
    /// Landing distance from the spin axis of each bin-edge drop, m (small to large).
    pub edge_distances_m: Vec<f64>,
    /// Landing distance of the largest drop (the farthest drop), m.
    pub throw_largest_m: f64,
    /// Where the jet broke up.
    pub breakup: Breakup,
    /// Highest point of the largest drop's path above ground, m.
    pub peak_height_m: f64,
    /// Landing distance of the volume-median (d50 of the spectrum) drop, m.
    pub throw_median_m: f64,
    /// Landing distance of the "small" drop, m.
    pub throw_small_m: f64,
    /// Volume-median drop of the (truncated) spectrum, m.
    pub median_drop_m: f64,
    /// The "small" drop: [`SMALL_DROP_FRACTION`] of the volume is in finer drops, m.
    pub small_drop_m: f64,
    /// Nozzle flow, m³/s.
    pub flow_m3_s: f64,
}

/// One ring of the radial profile.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Ring {
    /// Inner radius, m.
    pub inner_m: f64,
    /// Outer radius, m.
    pub outer_m: f64,
    /// Application rate over the ring, mm/h.
    pub rate_mm_h: f64,
}

impl Ring {
    /// Ring area, m².
    pub fn area_m2(&self) -> f64 {
        PI * (self.outer_m * self.outer_m - self.inner_m * self.inner_m)
    }
}

/// A sampled point of the profile, for tables and charts.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ProfilePoint {
    /// Distance from the head, m.
    pub r_m: f64,
    /// Application rate, mm/h.
    pub rate_mm_h: f64,
}

/// A single head's application rate against distance, in still air.
///
/// Piecewise constant: contiguous rings from the innermost landing to the
/// wetted radius (gaps between landings are rings of rate 0); zero elsewhere.
#[derive(Debug, Clone, PartialEq)]
pub struct RadialProfile {
    /// Contiguous rings, inner to outer.
    pub rings: Vec<Ring>,
    /// Total flow the profile was built from, m³/s.
    pub flow_m3_s: f64,
}

impl RadialProfile {
    /// Builds the profile from rings that may overlap, each with its flow, m³/s.
    fn from_pieces(pieces: &[(f64, f64, f64)], flow_m3_s: f64) -> RadialProfile {
        let mut cuts: Vec<f64> = pieces.iter().flat_map(|&(a, b, _)| [a, b]).collect();
        cuts.sort_by(f64::total_cmp);
        cuts.dedup();
        // Sweep: rate changes at each piece's edges.
        let mut delta = vec![0.0; cuts.len()];
        for &(a, b, q) in pieces {
            let rate = q / (PI * (b * b - a * a)) * M_S_TO_MM_H;
            if let (Ok(i), Ok(j)) = (
                cuts.binary_search_by(|c| c.total_cmp(&a)),
                cuts.binary_search_by(|c| c.total_cmp(&b)),
            ) {
                if let Some(d) = delta.get_mut(i) {
                    *d += rate;
                }
                if let Some(d) = delta.get_mut(j) {
                    *d -= rate;
                }
            }
        }
        let mut rings = Vec::with_capacity(cuts.len().saturating_sub(1));
        let mut rate = 0.0;
        for ((&inner_m, &outer_m), d) in cuts.iter().zip(cuts.iter().skip(1)).zip(&delta) {
            rate += d;
            rings.push(Ring {
                inner_m,
                outer_m,
                rate_mm_h: rate.max(0.0),
            });
        }
        RadialProfile { rings, flow_m3_s }
    }

    /// Application rate at distance `r_m` from the head, mm/h.
    pub fn rate_mm_h_at(&self, r_m: f64) -> f64 {
        let i = self.rings.partition_point(|ring| ring.outer_m <= r_m);
        match self.rings.get(i) {
            Some(ring) if ring.inner_m <= r_m => ring.rate_mm_h,
            _ => 0.0,
        }
    }

    /// Outer edge of the wetted area, m.
    pub fn outer_radius_m(&self) -> f64 {
        self.rings.last().map_or(0.0, |r| r.outer_m)
    }

    /// Farthest distance at which the rate is at least `threshold_mm_h`, m
    /// (0 when it is nowhere reached).
    pub fn wetted_radius_m(&self, threshold_mm_h: f64) -> f64 {
        self.rings
            .iter()
            .rev()
            .find(|r| r.rate_mm_h >= threshold_mm_h)
            .map_or(0.0, |r| r.outer_m)
    }

    /// The ring with the highest rate, if any water lands.
    pub fn peak(&self) -> Option<Ring> {
        self.rings
            .iter()
            .copied()
            .filter(|r| r.rate_mm_h > 0.0)
            .reduce(|a, b| if b.rate_mm_h > a.rate_mm_h { b } else { a })
    }

    /// Water landing on the profile, m³/s (Σ rate × ring area).
    pub fn applied_flow_m3_s(&self) -> f64 {
        self.rings
            .iter()
            .map(|r| r.rate_mm_h / M_S_TO_MM_H * r.area_m2())
            .sum()
    }

    /// The profile sampled every `step_m` from the head out to the wetted
    /// radius; for a reach of more than [`MAX_PROFILE_SAMPLES`] steps the step
    /// is widened so that the list stays that long (a head with a throw of
    /// 10⁹ m would otherwise ask for billions of points).
    pub fn sampled(&self, step_m: f64) -> Vec<ProfilePoint> {
        let outer = self.outer_radius_m();
        if !(step_m.is_finite() && step_m > 0.0 && outer.is_finite()) || outer <= 0.0 {
            return Vec::new();
        }
        let step_m = step_m.max(outer / MAX_PROFILE_SAMPLES as f64);
        let n = (outer / step_m).ceil() as usize;
        (0..=n)
            .map(|i| {
                let r = (i as f64 * step_m).min(outer);
                ProfilePoint {
                    r_m: r,
                    rate_mm_h: self.rate_mm_h_at(r),
                }
            })
            .collect()
    }
}

/// Throw and radial profile of one head in still air.
#[derive(Debug, Clone, PartialEq)]
pub struct ThrowReport {
    /// Per nozzle, in the order of the jets given; `None` for a jet that does not flow.
    pub nozzles: Vec<Option<NozzleThrow>>,
    /// The radial application profile.
    pub profile: RadialProfile,
    /// Wetted radius by the testing standards' threshold, m (module docs).
    pub wetted_radius_m: f64,
    /// The rate threshold the wetted radius was read at, mm/h.
    pub wetting_threshold_mm_h: f64,
    /// Farthest landing of any drop, m.
    pub farthest_drop_m: f64,
    /// Highest point of any nozzle's drop paths above ground, m.
    pub peak_height_m: f64,
    /// Depth applied in one turn at the peak ring, mm (`None` when ω = 0).
    pub peak_depth_per_turn_mm: Option<f64>,
    /// Jet breakup coefficient used (the scenario's, a calibration's, or the default).
    pub breakup_coefficient: f64,
    /// Total flow of the head, m³/s.
    pub total_flow_m3_s: f64,
}

fn validate_options(opts: &PatternOptions) -> Result<(), ThrowError> {
    if opts.bins == 0 {
        return Err(invalid("drop-size bins", 0.0, "at least 1"));
    }
    Ok(())
}

/// Throw of one nozzle: flies every bin edge and the median and small drops.
pub fn nozzle_throw(
    jet: &JetExit,
    spec: &SpraySpec,
    env: &FlightEnv,
    opts: &PatternOptions,
) -> Result<NozzleThrow, ThrowError> {
    validate_options(opts)?;
    let still = env.still();
    let flight = flight_for(spec, &opts.flight);
    let spectrum = Spectrum::for_jet(spec, jet, &still, opts.bins)?;
    let stream = IntactStream::new(jet, &still, &flight.jet)?;
    let breakup = stream.release(1.0)?;
    let largest_m = spectrum.largest_m;
    let fly = |d: f64| {
        let from = stream.release(release_fraction(d, largest_m))?;
        fly_from_breakup(&from, d, &still, &flight)
    };
    let edge_distances_m = spectrum
        .edges_m()
        .iter()
        .map(|&d| fly(d).map(|l| l.distance_m))
        .collect::<Result<Vec<f64>, ThrowError>>()?;
    let median_drop_m = spectrum.diameter_at_fraction(0.5);
    let small_drop_m = spectrum.diameter_at_fraction(SMALL_DROP_FRACTION);
    let throw_median_m = fly(median_drop_m)?.distance_m;
    let throw_small_m = fly(small_drop_m)?.distance_m;
    let largest = fly(spectrum.largest_m)?;
    Ok(NozzleThrow {
        spectrum,
        edge_distances_m,
        throw_largest_m: largest.distance_m,
        breakup,
        peak_height_m: largest.apex_m,
        throw_median_m,
        throw_small_m,
        median_drop_m,
        small_drop_m,
        flow_m3_s: jet.flow_m3_s,
    })
}

/// The rings one nozzle's bins land in: (inner m, outer m, flow m³/s).
fn nozzle_rings(t: &NozzleThrow) -> Vec<(f64, f64, f64)> {
    t.spectrum
        .bins
        .iter()
        .zip(
            t.edge_distances_m
                .iter()
                .zip(t.edge_distances_m.iter().skip(1)),
        )
        .filter_map(|(b, (&w0, &w1))| ring_of(w0, w1, t.flow_m3_s * b.volume_fraction))
        .collect()
}

/// The ring between two landing distances that carries `flow_m3_s`, widened
/// to [`MIN_RING_WIDTH_M`] about its centre if narrower; `None` for no flow.
fn ring_of(w0: f64, w1: f64, flow_m3_s: f64) -> Option<(f64, f64, f64)> {
    if flow_m3_s <= 0.0 {
        return None;
    }
    let (mut a, mut c) = (w0.min(w1), w0.max(w1));
    if c - a < MIN_RING_WIDTH_M {
        let mid = 0.5 * (a + c);
        a = (mid - 0.5 * MIN_RING_WIDTH_M).max(0.0);
        c = a + MIN_RING_WIDTH_M;
    }
    Some((a, c, flow_m3_s))
}

/// Rate of a ring piece, mm/h.
fn piece_rate_mm_h(&(a, c, q): &(f64, f64, f64)) -> f64 {
    q / (PI * (c * c - a * a)) * M_S_TO_MM_H
}

/// A head's wetted radius in still air.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WettedRadius {
    /// By the testing standards' threshold, m (module docs).
    pub standard_m: f64,
    /// Farthest landing of any drop, m.
    pub farthest_drop_m: f64,
    /// The threshold used, mm/h.
    pub threshold_mm_h: f64,
}

/// Wetted radius of a head in still air, flying only the outer drops that
/// decide it (module docs). The same number as [`radial_pattern`] gives.
pub fn wetted_radius(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    flight: &FlightOptions,
) -> Result<WettedRadius, ThrowError> {
    let still = env.still();
    let flight = flight_for(spec, flight);
    let flowing: Vec<&JetExit> = jets.iter().filter(|j| flows(j)).collect();
    if flowing.is_empty() {
        return Err(no_flow());
    }
    let total: f64 = flowing.iter().map(|j| j.flow_m3_s).sum();
    let threshold = wetting_threshold_mm_h(total);
    let mut pieces = Vec::new();
    let mut farthest = 0.0f64;
    // In still air a jet turned about the axis lands its drops as far out:
    // identical arms are flown once, with their flows added.
    let mut families: Vec<JetExit> = Vec::new();
    for jet in flowing {
        match families.iter_mut().find(|f| same_jet_any_turn(f, jet)) {
            Some(f) => f.flow_m3_s += jet.flow_m3_s,
            None => families.push(*jet),
        }
    }
    for jet in &families {
        let spectrum = Spectrum::for_jet(spec, jet, &still, DEFAULT_BINS)?;
        let stream = IntactStream::new(jet, &still, &flight.jet)?;
        let fly = |d: f64| -> Result<f64, ThrowError> {
            let from = stream.release(release_fraction(d, spectrum.largest_m))?;
            Ok(fly_from_breakup(&from, d, &still, &flight)?.distance_m)
        };
        let edges = spectrum.edges_m();
        let mut outer = None;
        for (bin, d_inner) in spectrum.bins.iter().zip(edges.iter()).rev() {
            let w_outer = match outer {
                Some(w) => w,
                None => {
                    let w = fly(bin.upper_m)?;
                    farthest = farthest.max(w);
                    w
                }
            };
            let w_inner = fly(*d_inner)?;
            outer = Some(w_inner);
            if let Some(piece) = ring_of(w_inner, w_outer, jet.flow_m3_s * bin.volume_fraction) {
                pieces.push(piece);
                if piece_rate_mm_h(&piece) >= threshold {
                    break;
                }
            }
        }
    }
    let profile = RadialProfile::from_pieces(&pieces, total);
    Ok(WettedRadius {
        standard_m: profile.wetted_radius_m(threshold),
        farthest_drop_m: farthest,
        threshold_mm_h: threshold,
    })
}

/// Throw, wetted radius and radial application profile of one head in still air.
///
/// `jets`: every nozzle's jet at the operating point; `omega_rad_s`: rotor
/// speed (for the depth per turn). Wind in `env` is ignored (see [`windy_pattern`]).
pub fn radial_pattern(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    omega_rad_s: f64,
    opts: &PatternOptions,
) -> Result<ThrowReport, ThrowError> {
    validate_options(opts)?;
    if !(omega_rad_s.is_finite() && omega_rad_s >= 0.0) {
        return Err(invalid("rotor speed (rad/s)", omega_rad_s, "zero or more"));
    }
    let nozzles = jets
        .iter()
        .map(|jet| {
            if flows(jet) {
                nozzle_throw(jet, spec, env, opts).map(Some)
            } else {
                Ok(None)
            }
        })
        .collect::<Result<Vec<_>, ThrowError>>()?;
    let flowing: Vec<&NozzleThrow> = nozzles.iter().flatten().collect();
    if flowing.is_empty() {
        return Err(no_flow());
    }
    let total: f64 = flowing.iter().map(|t| t.flow_m3_s).sum();
    let pieces: Vec<(f64, f64, f64)> = flowing.iter().flat_map(|t| nozzle_rings(t)).collect();
    let profile = RadialProfile::from_pieces(&pieces, total);
    let threshold = wetting_threshold_mm_h(total);
    let farthest = flowing
        .iter()
        .map(|t| t.throw_largest_m)
        .fold(0.0, f64::max);
    let peak_height = flowing.iter().map(|t| t.peak_height_m).fold(0.0, f64::max);
    let peak_depth_per_turn_mm = match profile.peak() {
        Some(peak) if omega_rad_s > 0.0 => Some(peak.rate_mm_h / 3600.0 * (2.0 * PI / omega_rad_s)),
        _ => None,
    };
    Ok(ThrowReport {
        nozzles,
        wetted_radius_m: profile.wetted_radius_m(threshold),
        profile,
        wetting_threshold_mm_h: threshold,
        farthest_drop_m: farthest,
        peak_height_m: peak_height,
        peak_depth_per_turn_mm,
        breakup_coefficient: breakup_coefficient(spec),
        total_flow_m3_s: total,
    })
}

/// Wetted radius with the rotor held still against the rotor at speed.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ThrowComparison {
    /// Wetted radius with the jets at ω = 0, m.
    pub at_rest_m: f64,
    /// Wetted radius with the jets at the operating point, m.
    pub running_m: f64,
    /// Change from rest to running, % of the throw at rest (negative: shorter).
    pub change_percent: f64,
}

/// Compares the wetted radius of jets computed at rest (`at_rest`, ω = 0) and
/// at speed (`running`): the throw a reaction rotor gives up by turning.
pub fn throw_at_rest_and_running(
    at_rest: &[JetExit],
    running: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    opts: &PatternOptions,
) -> Result<ThrowComparison, ThrowError> {
    validate_options(opts)?;
    let rest = wetted_radius(at_rest, spec, env, &opts.flight)?.standard_m;
    let run = wetted_radius(running, spec, env, &opts.flight)?.standard_m;
    Ok(ThrowComparison {
        at_rest_m: rest,
        running_m: run,
        change_percent: if rest > 0.0 {
            100.0 * (run - rest) / rest
        } else {
            0.0
        },
    })
}

/// Flight paths of one nozzle's largest, median and small drops, for drawing.
#[derive(Debug, Clone, PartialEq)]
pub struct NozzlePaths {
    /// The largest drop.
    pub largest: FlightPath,
    /// The volume-median drop.
    pub median: FlightPath,
    /// The small drop.
    pub small: FlightPath,
}

/// Flight paths (each `samples` points) of the drops named in a nozzle's throw.
pub fn nozzle_paths(
    jet: &JetExit,
    throw: &NozzleThrow,
    spec: &SpraySpec,
    env: &FlightEnv,
    flight: &FlightOptions,
    samples: usize,
) -> Result<NozzlePaths, ThrowError> {
    let still = env.still();
    let flight = &flight_for(spec, flight);
    let path = |d: f64| {
        let release = release_fraction(d, throw.spectrum.largest_m);
        flight_path(jet, d, release, &still, flight, samples)
    };
    Ok(NozzlePaths {
        largest: path(throw.spectrum.largest_m)?,
        median: path(throw.median_drop_m)?,
        small: path(throw.small_drop_m)?,
    })
}

/// True when `jet` is `a` turned about +z by some angle (same nozzle, height,
/// distance from the axis and velocity in the arm's own frame), to 1e-12.
fn same_jet_any_turn(a: &JetExit, jet: &JetExit) -> bool {
    let local = |j: &JetExit| {
        let r = j.position_m.xy();
        let n = r.norm();
        let (c, s) = if n > 0.0 {
            (r.x / n, r.y / n)
        } else {
            (1.0, 0.0)
        };
        let v = j.velocity_m_s;
        [
            n,
            j.position_m.z,
            v.x * c + v.y * s,
            -v.x * s + v.y * c,
            v.z,
            j.nozzle_diameter_m,
            j.nozzle_pressure_pa,
            j.omega_rad_s,
        ]
    };
    let (p, q) = (local(a), local(jet));
    p.iter()
        .zip(&q)
        .all(|(x, y)| (x - y).abs() <= 1e-12 * x.abs().max(y.abs()).max(1e-300))
        && a.position_m.xy().norm() > 0.0
}

#[cfg(test)]
#[path = "pattern_tests.rs"]
mod tests;
