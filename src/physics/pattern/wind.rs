//! The 2-D application pattern of a head in wind (model.md M8).
//!
//! Each jet is swept through a full turn at time-uniform azimuths (steady
//! rotation: uniform in angle), and every bin edge is flown at every azimuth.
//! Between two neighbouring azimuths and two neighbouring edges the landing
//! points span a quadrilateral; the bin's water for that part of the turn is
//! spread evenly over its area (sub-points of the bilinear map weighted by its
//! Jacobian) and deposited onto a grid of square cells by area weighting
//! (cloud-in-cell). The grid is sized to hold every landing point with a
//! margin, so every litre lands on it. The wetted radius upwind, downwind and
//! across the wind is read off the grid along those three rays.

use nalgebra::Vector2;
use rayon::prelude::*;
use std::f64::consts::PI;

use super::{validate_options, PatternOptions, AUTO_CELLS, M_S_TO_MM_H};
use crate::physics::breakup::{release_fraction, Breakup, IntactStream};
use crate::physics::design::SpraySpec;
use crate::physics::jet::JetExit;
use crate::physics::spray::{flight_for, flows, no_flow, Spectrum};
use crate::physics::trajectory::{
    fly_from_breakup, invalid, require_positive, FlightEnv, ThrowError,
};

/// A head's 2-D application pattern on a grid of square cells, ground frame,
/// with the spin axis at (0, 0).
#[derive(Debug, Clone, PartialEq)]
pub struct PatternGrid {
    /// x of the grid's lower-left corner, m.
    pub x_min_m: f64,
    /// y of the grid's lower-left corner, m.
    pub y_min_m: f64,
    /// Cell size along x, m.
    pub dx_m: f64,
    /// Cell size along y, m.
    pub dy_m: f64,
    /// Cells along x.
    pub nx: usize,
    /// Cells along y.
    pub ny: usize,
    /// Rate per cell, mm/h, row by row: index `iy * nx + ix`.
    pub rate_mm_h: Vec<f64>,
    /// Total flow the pattern was built from, m³/s.
    pub flow_m3_s: f64,
}

impl PatternGrid {
    /// Rate in cell (`ix`, `iy`), mm/h (0 outside the grid).
    pub fn cell(&self, ix: usize, iy: usize) -> f64 {
        if ix >= self.nx || iy >= self.ny {
            return 0.0;
        }
        self.rate_mm_h
            .get(iy * self.nx + ix)
            .copied()
            .unwrap_or(0.0)
    }

    /// Centre of cell (`ix`, `iy`), m.
    pub fn cell_centre_m(&self, ix: usize, iy: usize) -> (f64, f64) {
        (
            self.x_min_m + (ix as f64 + 0.5) * self.dx_m,
            self.y_min_m + (iy as f64 + 0.5) * self.dy_m,
        )
    }

    /// Rate at (`x_m`, `y_m`), mm/h: bilinear between cell centres, 0 outside.
    pub fn rate_mm_h_at(&self, x_m: f64, y_m: f64) -> f64 {
        let fx = (x_m - self.x_min_m) / self.dx_m - 0.5;
        let fy = (y_m - self.y_min_m) / self.dy_m - 0.5;
        if !(fx > -1.0 && fy > -1.0 && fx < self.nx as f64 && fy < self.ny as f64) {
            return 0.0;
        }
        let (x0, y0) = (fx.floor(), fy.floor());
        let (tx, ty) = (fx - x0, fy - y0);
        let at = |ix: f64, iy: f64| {
            if ix < 0.0 || iy < 0.0 {
                0.0
            } else {
                self.cell(ix as usize, iy as usize)
            }
        };
        (1.0 - tx) * (1.0 - ty) * at(x0, y0)
            + tx * (1.0 - ty) * at(x0 + 1.0, y0)
            + (1.0 - tx) * ty * at(x0, y0 + 1.0)
            + tx * ty * at(x0 + 1.0, y0 + 1.0)
    }

    /// Water landing on the grid, m³/s (Σ rate × cell area).
    pub fn applied_flow_m3_s(&self) -> f64 {
        self.rate_mm_h.iter().sum::<f64>() / M_S_TO_MM_H * self.dx_m * self.dy_m
    }

    /// Rates as rows (one `Vec` per y, lowest y first), mm/h.
    pub fn rows(&self) -> Vec<Vec<f64>> {
        self.rate_mm_h
            .chunks(self.nx.max(1))
            .map(|c| c.to_vec())
            .collect()
    }

    /// Farthest distance of any grid corner from the spin axis, m.
    pub fn reach_m(&self) -> f64 {
        let xs = [self.x_min_m, self.x_min_m + self.nx as f64 * self.dx_m];
        let ys = [self.y_min_m, self.y_min_m + self.ny as f64 * self.dy_m];
        xs.iter()
            .flat_map(|x| ys.iter().map(move |y| x.hypot(*y)))
            .fold(0.0, f64::max)
    }

    /// Adds `volume` (m³/s) at (`x`, `y`) spread over one cell's area.
    fn deposit(&mut self, x: f64, y: f64, volume: f64) {
        let fx = (x - self.x_min_m) / self.dx_m - 0.5;
        let fy = (y - self.y_min_m) / self.dy_m - 0.5;
        let (x0, y0) = (fx.floor(), fy.floor());
        let (tx, ty) = (fx - x0, fy - y0);
        let clamp = |v: f64, n: usize| (v.max(0.0) as usize).min(n.saturating_sub(1));
        let scale = M_S_TO_MM_H / (self.dx_m * self.dy_m);
        for (ox, oy, w) in [
            (0.0, 0.0, (1.0 - tx) * (1.0 - ty)),
            (1.0, 0.0, tx * (1.0 - ty)),
            (0.0, 1.0, (1.0 - tx) * ty),
            (1.0, 1.0, tx * ty),
        ] {
            let ix = clamp(x0 + ox, self.nx);
            let iy = clamp(y0 + oy, self.ny);
            if let Some(c) = self.rate_mm_h.get_mut(iy * self.nx + ix) {
                *c += volume * w * scale;
            }
        }
    }
}

/// Largest number of cells a 2-D pattern grid may have.
const MAX_GRID_CELLS: usize = 4_000_000;

fn cross(a: Vector2<f64>, b: Vector2<f64>) -> f64 {
    a.x * b.y - a.y * b.x
}

/// If `jet` is `rep` turned by a whole number m of azimuth steps (and has the
/// same nozzle, so the same spectrum), returns m mod `n_az`.
pub(super) fn same_jet_turned(
    rep: &JetExit,
    jet: &JetExit,
    step: f64,
    n_az: usize,
) -> Option<usize> {
    if rep.nozzle_diameter_m != jet.nozzle_diameter_m
        || rep.nozzle_pressure_pa != jet.nozzle_pressure_pa
        || rep.omega_rad_s != jet.omega_rad_s
    {
        return None;
    }
    let angle = |j: &JetExit| j.position_m.y.atan2(j.position_m.x);
    let delta = angle(jet) - angle(rep);
    let m = delta / step;
    let whole = m.round();
    if (m - whole).abs() > 1e-9 {
        return None;
    }
    let turned = rep.turned(whole * step);
    let close = |a: &nalgebra::Vector3<f64>, b: &nalgebra::Vector3<f64>| {
        (a - b).norm() <= 1e-9 * (1.0 + a.norm())
    };
    if !(close(&turned.position_m, &jet.position_m)
        && close(&turned.velocity_m_s, &jet.velocity_m_s))
    {
        return None;
    }
    Some((whole as i64).rem_euclid(n_az as i64) as usize)
}

/// The 2-D application pattern of one head, with the wind in `env`.
///
/// Each flowing jet is swept through `opts.azimuths` time-uniform azimuths
/// (`JetExit::turned`); every bin edge is flown at each and the water deposited
/// as described in the module docs. Runs the flights in parallel; jets that
/// are turned copies of one another (by whole azimuth steps) share flights.
pub fn windy_pattern(
    jets: &[JetExit],
    spec: &SpraySpec,
    env: &FlightEnv,
    opts: &PatternOptions,
) -> Result<PatternGrid, ThrowError> {
    validate_options(opts)?;
    if opts.azimuths < 3 {
        return Err(invalid(
            "azimuths per turn",
            opts.azimuths as f64,
            "at least 3",
        ));
    }
    let flowing: Vec<&JetExit> = jets.iter().filter(|j| flows(j)).collect();
    if flowing.is_empty() {
        return Err(no_flow());
    }
    let spectra = flowing
        .iter()
        .map(|jet| Spectrum::for_jet(spec, jet, &env.still(), opts.bins))
        .collect::<Result<Vec<_>, ThrowError>>()?;
    let n_az = opts.azimuths;
    let flight = flight_for(spec, &opts.flight);
    // Jets that are copies of an earlier one turned by a whole number of
    // azimuth steps (identical arms evenly spaced) sweep the same flights:
    // fly each such family once. source[j] = (representative, azimuth shift).
    let step = 2.0 * PI / n_az as f64;
    let mut source: Vec<(usize, usize)> = Vec::with_capacity(flowing.len());
    for (j, jet) in flowing.iter().enumerate() {
        let found = (0..j).find_map(|i| {
            let (rep_index, _) = *source.get(i)?;
            if rep_index != i {
                return None;
            }
            let rep = flowing.get(i)?;
            same_jet_turned(rep, jet, step, n_az).map(|shift| (i, shift))
        });
        source.push(found.unwrap_or((j, 0)));
    }
    // Flights of representatives only; flown[r][k][e]: representative r,
    // azimuth k, bin edge e.
    let tasks: Vec<(usize, usize)> = (0..flowing.len())
        .filter(|&j| source.get(j).is_some_and(|s| s.0 == j))
        .flat_map(|j| (0..n_az).map(move |k| (j, k)))
        .collect();
    // Where each edge's drops leave the stream, at azimuth 0: the intact
    // stream does not feel the wind, so at azimuth k it is the same turned.
    let releases = flowing
        .iter()
        .zip(&spectra)
        .map(|(jet, spectrum)| {
            let stream = IntactStream::new(jet, env, &flight.jet)?;
            spectrum
                .edges_m()
                .iter()
                .map(|&d| Ok((d, stream.release(release_fraction(d, spectrum.largest_m))?)))
                .collect::<Result<Vec<(f64, Breakup)>, ThrowError>>()
        })
        .collect::<Result<Vec<_>, ThrowError>>()?;
    let flown = tasks
        .par_iter()
        .map(|&(j, k)| {
            let Some(edges) = releases.get(j) else {
                return Ok(Vec::new());
            };
            let angle = 2.0 * PI * k as f64 / n_az as f64;
            edges
                .iter()
                .map(|(d, from)| {
                    fly_from_breakup(&from.turned(angle), *d, env, &flight)
                        .map(|l| Vector2::new(l.point_m.x, l.point_m.y))
                })
                .collect::<Result<Vec<Vector2<f64>>, ThrowError>>()
        })
        .collect::<Result<Vec<Vec<Vector2<f64>>>, ThrowError>>()?;
    let rep_rows: Vec<&[Vec<Vector2<f64>>]> = flown.chunks(n_az).collect();
    let reps: Vec<usize> = (0..flowing.len())
        .filter(|&j| source.get(j).is_some_and(|s| s.0 == j))
        .collect();

    // Grid extent.
    let (mut lo, mut hi) = (
        Vector2::new(f64::INFINITY, f64::INFINITY),
        Vector2::new(f64::NEG_INFINITY, f64::NEG_INFINITY),
    );
    for p in flown.iter().flatten() {
        lo = lo.inf(p);
        hi = hi.sup(p);
    }
    let span = (hi - lo).max().max(1e-2);
    let mut cell = match opts.cell_m {
        Some(c) => require_positive("pattern cell size (m)", c)?,
        None => span / AUTO_CELLS,
    };
    let count = |cell: f64| ((hi.x - lo.x) / cell).ceil() as usize + 4;
    while count(cell) * (((hi.y - lo.y) / cell).ceil() as usize + 4) > MAX_GRID_CELLS {
        cell *= 1.5;
    }
    let nx = count(cell);
    let ny = ((hi.y - lo.y) / cell).ceil() as usize + 4;
    let total: f64 = flowing.iter().map(|j| j.flow_m3_s).sum();
    let mut grid = PatternGrid {
        x_min_m: lo.x - 2.0 * cell,
        y_min_m: lo.y - 2.0 * cell,
        dx_m: cell,
        dy_m: cell,
        nx,
        ny,
        rate_mm_h: vec![0.0; nx * ny],
        flow_m3_s: total,
    };

    let mut weights = Vec::new();
    for (j, (jet, spectrum)) in flowing.iter().zip(&spectra).enumerate() {
        let Some(&(rep, shift)) = source.get(j) else {
            continue;
        };
        let Some(rows) = reps
            .iter()
            .position(|&r| r == rep)
            .and_then(|p| rep_rows.get(p))
        else {
            continue;
        };
        let per_az = jet.flow_m3_s / n_az as f64;
        for k in 0..n_az {
            let (Some(a), Some(b)) = (
                rows.get((k + shift) % n_az),
                rows.get((k + 1 + shift) % n_az),
            ) else {
                continue;
            };
            for (e, bin) in spectrum.bins.iter().enumerate() {
                let volume = per_az * bin.volume_fraction;
                if volume <= 0.0 {
                    continue;
                }
                let (Some(&p00), Some(&p10), Some(&p01), Some(&p11)) =
                    (a.get(e), a.get(e + 1), b.get(e), b.get(e + 1))
                else {
                    continue;
                };
                // u along drop size (p00 → p10), v along azimuth (p00 → p01).
                let len_u = (p10 - p00).norm().max((p11 - p01).norm());
                let len_v = (p01 - p00).norm().max((p11 - p10).norm());
                let nu = ((len_u / cell).ceil() as usize).clamp(1, 32);
                let nv = ((len_v / cell).ceil() as usize).clamp(1, 64);
                weights.clear();
                let mut sum = 0.0;
                for iu in 0..nu {
                    let u = (iu as f64 + 0.5) / nu as f64;
                    for iv in 0..nv {
                        let v = (iv as f64 + 0.5) / nv as f64;
                        let du = (p10 - p00) * (1.0 - v) + (p11 - p01) * v;
                        let dv = (p01 - p00) * (1.0 - u) + (p11 - p10) * u;
                        let jac = cross(du, dv).abs();
                        let point = p00 * ((1.0 - u) * (1.0 - v))
                            + p10 * (u * (1.0 - v))
                            + p01 * ((1.0 - u) * v)
                            + p11 * (u * v);
                        weights.push((point, jac));
                        sum += jac;
                    }
                }
                let equal = sum.is_nan() || sum <= 1e-12 * cell * cell;
                let n = weights.len() as f64;
                for &(point, jac) in &weights {
                    let w = if equal { 1.0 / n } else { jac / sum };
                    grid.deposit(point.x, point.y, volume * w);
                }
            }
        }
    }
    Ok(grid)
}

/// Wetted radius of a head in wind along three rays from the head.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WindRadii {
    /// Into the wind (towards where it comes from), m.
    pub upwind_m: f64,
    /// With the wind, m.
    pub downwind_m: f64,
    /// Across the wind, the mean of both sides, m.
    pub crosswind_m: f64,
}

/// Farthest distance along the unit direction (`ux`, `uy`) from the head at
/// which `grid`'s rate is at least `threshold_mm_h`, m.
fn wetted_along(grid: &PatternGrid, ux: f64, uy: f64, threshold_mm_h: f64) -> f64 {
    let step = 0.25 * grid.dx_m.min(grid.dy_m);
    let reach = grid.reach_m();
    if !(step > 0.0 && reach.is_finite()) {
        return 0.0;
    }
    let n = ((reach / step).ceil() as usize).min(1_000_000);
    (0..=n)
        .rev()
        .map(|i| i as f64 * step)
        .find(|&r| grid.rate_mm_h_at(r * ux, r * uy) >= threshold_mm_h)
        .unwrap_or(0.0)
}

/// Wetted radius upwind, downwind and across the wind of a 2-D pattern, read
/// at `threshold_mm_h`; `None` in calm air (`wind_m_s` of zero length).
pub fn wetted_radii_in_wind(
    grid: &PatternGrid,
    wind_m_s: &nalgebra::Vector3<f64>,
    threshold_mm_h: f64,
) -> Option<WindRadii> {
    let w = wind_m_s.xy();
    let speed = w.norm();
    if !(speed.is_finite() && speed > 0.0) {
        return None;
    }
    let (ux, uy) = (w.x / speed, w.y / speed);
    let left = wetted_along(grid, -uy, ux, threshold_mm_h);
    let right = wetted_along(grid, uy, -ux, threshold_mm_h);
    Some(WindRadii {
        upwind_m: wetted_along(grid, -ux, -uy, threshold_mm_h),
        downwind_m: wetted_along(grid, ux, uy, threshold_mm_h),
        crosswind_m: 0.5 * (left + right),
    })
}
