//! Target search: the value of one design input that gives a wanted speed
//! (or, through a caller's closure, a wanted wetted radius), the rest fixed.
//!
//! The search runs on the full model: the parameter's physical range is
//! scanned on a grid with the design's present value added to it (solving
//! the design at every point, in parallel). From the present value the
//! search walks outward, up and down, to the first grid interval each way
//! where `result − target` changes sign (a rotor that stalls counts as 0 rpm,
//! one with no equilibrium as faster than any target, so the sign is known
//! where the speed ends), polishes it with Brent's method and keeps it if
//! the polished value meets the target (a jump in the speed, such as a
//! stall, is not a root; the walk goes on past it). Of the two ways, the
//! value nearer the present one wins: the branch continuous with the
//! design. When nothing in the range meets the target, the best grid point
//! is refined by a golden-section search on |result − target| and returned
//! flagged *unreachable*, with the result it gives.
//!
//! The inputs a search may adjust, and the physical range each one scans, are
//! the catalogue entries with a [`Search`] (see `catalogue::entries`): per-arm
//! inputs move all arms together and keep their offsets; the value searched
//! is the mean over arms. Today: deflection −89°…89° (beyond 90° the jets
//! brake), elevation 0…89°, arm radius 1.2 × hub radius (at least 20 mm) to
//! 2.5 m, nozzle 0.2 mm to the arm tube's bore; brakes from 0 to the
//! coefficient that takes the whole stall torque at 1 rpm (viscous
//! c₁ = T_stall/ω₁, quadratic c₂ = T_stall/ω₁², ω₁ = 1 rpm).

use rayon::prelude::*;
use std::convert::Infallible;

use crate::catalogue::{Input, Search, VaryError};
use crate::numeric::minimise::golden_section;
use crate::numeric::root::{brent, RootError, Tolerance};
use crate::physics::balance::{rad_s, rpm, solve, solve_speed, SpinReport, SpinStatus};
use crate::physics::design::Design;
pub use crate::physics::ThrowFn;

/// Points on the scan grid of an input's range.
pub const SCAN_POINTS: usize = 41;

/// The search range of an input a target search may adjust.
fn search_of(input: &Input) -> Result<Search, TargetError> {
    input
        .vary
        .and_then(|v| v.search)
        .ok_or(TargetError::NotAdjustable(input.vary_name()))
}

/// The range searched for the value of `input`, SI (see the module docs).
pub fn range(input: &Input, design: &Design) -> Result<(f64, f64), TargetError> {
    let search = search_of(input)?;
    let arms = &design.rotor.arms;
    if arms.is_empty() {
        return Err(TargetError::NoArms);
    }
    let current = current(input, design)?;
    let values = input.arm_values(design);
    let range = match search {
        // Mean-value range such that every arm stays inside [lo, hi].
        Search::Shifted { lo, hi } => {
            let below = values.iter().map(|v| current - v).fold(f64::MIN, f64::max);
            let above = values.iter().map(|v| v - current).fold(f64::MIN, f64::max);
            (lo + below, hi - above)
        }
        Search::Scaled { bounds } => {
            let pairs = arms
                .iter()
                .zip(&values)
                .map(|(a, v)| (*v, bounds(design, a)));
            let lo = pairs
                .clone()
                .map(|(v, (lo, _))| lo / v)
                .fold(f64::MIN, f64::max);
            let hi = pairs.map(|(v, (_, hi))| hi / v).fold(f64::MAX, f64::min);
            (current * lo, current * hi.max(lo))
        }
        Search::Brake { power } => {
            let stall = solve_speed(design).stall_torque_n_m.max(1e-9);
            let top = stall / rad_s(1.0).powi(power);
            (0.0, top.max(2.0 * current))
        }
    };
    if !(range.0.is_finite() && range.1.is_finite()) || range.0 >= range.1 {
        return Err(TargetError::NoRange {
            name: input.vary_name(),
            lo: range.0,
            hi: range.1,
        });
    }
    Ok(range)
}

fn current(input: &Input, design: &Design) -> Result<f64, TargetError> {
    let search = search_of(input)?;
    let v = input.varied_value(design).ok_or(TargetError::NoArms)?;
    if matches!(search, Search::Scaled { .. }) && v <= 0.0 {
        return Err(TargetError::NoRange {
            name: input.vary_name(),
            lo: v,
            hi: v,
        });
    }
    Ok(v)
}

/// The scan grid over `range`: linear for shifted angles, geometric for
/// scaled sizes, zero then geometric for brakes.
fn grid(search: Search, (lo, hi): (f64, f64)) -> Vec<f64> {
    let n = SCAN_POINTS;
    let t = |k: usize| k as f64 / (n - 1) as f64;
    match search {
        Search::Shifted { .. } => (0..n).map(|k| lo + (hi - lo) * t(k)).collect(),
        Search::Scaled { .. } => (0..n).map(|k| lo * (hi / lo).powf(t(k))).collect(),
        Search::Brake { .. } => {
            let floor = hi * 1e-7;
            std::iter::once(lo)
                .chain((0..n - 1).map(|k| floor * (hi / floor).powf(k as f64 / (n - 2) as f64)))
                .collect()
        }
    }
}

/// What the search aims at.
#[derive(Clone, Copy)]
pub enum Goal<'a> {
    /// An operating speed, rpm.
    Rpm(f64),
    /// A wetted radius, m, computed by the caller's closure on each trial design
    /// (None when the design gives no throw, e.g. it stalls).
    Throw {
        /// The wanted wetted radius, m.
        radius_m: f64,
        /// The wetted radius of a design, m.
        throw: &'a ThrowFn,
    },
}

impl Goal<'_> {
    fn target(&self) -> f64 {
        match *self {
            Goal::Rpm(r) => r,
            Goal::Throw { radius_m, .. } => radius_m,
        }
    }

    fn metric(&self, design: &Design) -> Option<f64> {
        match self {
            Goal::Rpm(_) => solve_speed(design)
                .operating
                .map(|op| rpm(op.omega_rad_s()))
                .filter(|r| r.is_finite()),
            Goal::Throw { throw, .. } => throw(design).filter(|r| r.is_finite()),
        }
    }

    /// result − target with the speed ended by a stall counted as 0 rpm and a
    /// rotor with no equilibrium counted as far above any target (rpm goal);
    /// the wetted radius − target (throw goal). None when there is nothing
    /// to sign.
    fn signed(&self, design: &Design, want: f64) -> Option<f64> {
        match self {
            Goal::Rpm(_) => {
                let r = solve_speed(design);
                match (r.status, r.operating) {
                    (_, Some(op)) => Some(rpm(op.omega_rad_s()) - want).filter(|g| g.is_finite()),
                    (SpinStatus::StallsAtRest, None) => Some(-want),
                    (SpinStatus::NoEquilibrium, None) => Some(1e3 * want),
                    (SpinStatus::Running, None) => None,
                }
            }
            Goal::Throw { .. } => self.metric(design).map(|m| m - want),
        }
    }

    /// The report key of the achieved value: `achieved_rpm` or `achieved_throw_m`.
    pub fn achieved_key(&self) -> &'static str {
        match self {
            Goal::Rpm(_) => "achieved_rpm",
            Goal::Throw { .. } => "achieved_throw_m",
        }
    }
}

/// A target search that cannot be run.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum TargetError {
    /// The design has no arms to adjust.
    #[error("the design has no arms to adjust")]
    NoArms,
    /// The target is not a positive finite number.
    #[error("target {0} is not a positive number")]
    BadTarget(f64),
    /// The input is not one a target search may adjust.
    #[error("`{0}` cannot be adjusted by a target search")]
    NotAdjustable(&'static str),
    /// The input has no usable range on this design.
    #[error("`{name}` has no usable range on this design ({lo} to {hi})")]
    NoRange {
        /// The input's name.
        name: &'static str,
        /// Lower end found.
        lo: f64,
        /// Upper end found.
        hi: f64,
    },
    /// The design could not take a value of the range.
    #[error(transparent)]
    Value(#[from] VaryError),
}

/// The outcome of a target search.
#[derive(Debug, Clone, PartialEq)]
pub struct TargetResult {
    /// What was adjusted.
    pub adjust: &'static Input,
    /// The value found (or the nearest achievable), SI.
    pub value: f64,
    /// SI unit of `value`.
    pub unit: &'static str,
    /// The design's value before the search, SI.
    pub start_value: f64,
    /// The range searched, SI.
    pub range: (f64, f64),
    /// The target asked for (rpm or m).
    pub target: f64,
    /// What the adjusted design gives (rpm or m); None when no value in the
    /// range gives a result at all (the rotor stalls everywhere).
    pub achieved: Option<f64>,
    /// True when `achieved` equals the target (within the search tolerance).
    pub reachable: bool,
    /// The adjusted design.
    pub design: Design,
    /// The adjusted design solved.
    pub report: SpinReport,
    /// A polishing step that failed, if any (the bracket is in it).
    pub search_error: Option<RootError>,
}

/// Relative tolerance on the goal for Brent's method.
const GOAL_TOLERANCE: f64 = 1e-7;

/// Find the value of `adjust` that makes `design` reach `goal`.
pub fn target(
    design: &Design,
    adjust: &'static Input,
    goal: Goal<'_>,
) -> Result<TargetResult, TargetError> {
    let want = goal.target();
    if !(want.is_finite() && want > 0.0) {
        return Err(TargetError::BadTarget(want));
    }
    let search = search_of(adjust)?;
    let start_value = current(adjust, design)?;
    let range = range(adjust, design)?;
    let with = |v: f64| -> Result<Design, VaryError> {
        let mut d = design.clone();
        adjust.vary_to(&mut d, v)?;
        Ok(d)
    };
    // Check the ends once, so that an error is reported, not skipped.
    with(range.0)?;
    with(range.1)?;
    let eval = |v: f64| with(v).ok().and_then(|d| goal.metric(&d));
    // For the bracket scan a stalled rotor counts as 0 rpm and one with no
    // equilibrium as running away (above any target): the sign of
    // result − target stays known where the speed ends.
    let signed = |v: f64| with(v).ok().and_then(|d| goal.signed(&d, want));

    // The grid with the present value in it, so the walk starts there.
    let mut grid = grid(search, range);
    if let Some(k) = grid.iter().position(|&g| g >= start_value) {
        if grid.get(k).is_some_and(|&g| g != start_value) {
            grid.insert(k, start_value);
        }
    }
    let scan: Vec<Option<f64>> = grid.par_iter().map(|&v| signed(v)).collect();
    let start = grid
        .iter()
        .position(|&g| g == start_value)
        .unwrap_or_default();

    // Walk outward from the present value, each way, to the first interval
    // that brackets the target and polishes to a value that meets it.
    let mut search_error = None;
    let meets = |v: f64| {
        eval(v)
            .filter(|m| ((m - want) / want).abs() <= 1e3 * GOAL_TOLERANCE)
            .map(|m| (v, m))
    };
    let mut walk = |steps: &mut dyn Iterator<Item = (usize, usize)>| -> Option<(f64, f64)> {
        for (i, j) in steps {
            let (Some(&v0), Some(&v1)) = (grid.get(i), grid.get(j)) else {
                continue;
            };
            let (Some(Some(g0)), Some(Some(g1))) = (scan.get(i), scan.get(j)) else {
                continue;
            };
            let (g0, g1) = (*g0, *g1);
            if g0 == 0.0 {
                if let Some(hit) = meets(v0) {
                    return Some(hit);
                }
                continue;
            }
            if g1 == 0.0 {
                if let Some(hit) = meets(v1) {
                    return Some(hit);
                }
                continue;
            }
            if g0.signum() == g1.signum() {
                continue;
            }
            let tol = Tolerance {
                x: 1e-13 * (range.1 - range.0),
                f: GOAL_TOLERANCE * want,
                max_iter: 200,
            };
            // A trial that cannot be signed (a refused value) is pushed back
            // toward the end Brent came from.
            let f = |v: f64| signed(v).unwrap_or(g0);
            match brent(f, v0, v1, tol) {
                Ok(v) => {
                    // A jump in the speed (it stalls, or cannot run slower)
                    // is not a root: walk on.
                    if let Some(hit) = meets(v) {
                        return Some(hit);
                    }
                }
                Err(e) => search_error = Some(e),
            }
        }
        None
    };
    let n = grid.len();
    let up = walk(&mut (start..n.saturating_sub(1)).map(|i| (i, i + 1)));
    let down = walk(&mut (1..=start).rev().map(|i| (i, i - 1)));
    let nearest_root = match (up, down) {
        (Some(u), Some(d)) => {
            if (d.0 - start_value).abs() < (u.0 - start_value).abs() {
                Some(d)
            } else {
                Some(u)
            }
        }
        (u, d) => u.or(d),
    };

    let (value, achieved, reachable) = match nearest_root {
        Some((v, m)) => (v, Some(m), true),
        None => match closest_point(
            &grid,
            &grid.par_iter().map(|&v| eval(v)).collect::<Vec<_>>(),
            want,
            &eval,
        ) {
            Some((v, m)) => (v, Some(m), false),
            None => (start_value, None, false),
        },
    };
    let adjusted = with(value)?;
    let report = solve(&adjusted);
    Ok(TargetResult {
        adjust,
        value,
        unit: adjust.unit.si_label(),
        start_value,
        range,
        target: want,
        achieved,
        reachable,
        design: adjusted,
        report,
        search_error,
    })
}

/// Two targets, a speed and a wetted radius, met by two inputs: a nested
/// 1-D solve on the full model (model.md M10). For each trial value of
/// `for_throw`, `for_rpm` is set by [`target`] to give `rpm`; the outer
/// [`target`] on `for_throw` then meets `throw_m` with the throw of that
/// inner design. Returns the outer result (its design has `for_throw` set)
/// and the inner one on it (its design has both set: the answer).
pub fn target_two(
    design: &Design,
    for_throw: &'static Input,
    for_rpm: &'static Input,
    rpm: f64,
    throw_m: f64,
    throw: fn(&Design) -> Option<f64>,
) -> Result<(TargetResult, TargetResult), TargetError> {
    let throw_at = move |d: &Design| -> Option<f64> {
        let r = target(d, for_rpm, Goal::Rpm(rpm)).ok()?;
        if r.reachable {
            throw(&r.design)
        } else {
            None
        }
    };
    let outer = target(
        design,
        for_throw,
        Goal::Throw {
            radius_m: throw_m,
            throw: &throw_at,
        },
    )?;
    let last = target(&outer.design, for_rpm, Goal::Rpm(rpm))?;
    Ok((outer, last))
}

/// The grid point nearest the target, refined by golden section between its
/// neighbours. Returns (value, result).
fn closest_point(
    grid: &[f64],
    scan: &[Option<f64>],
    want: f64,
    eval: &(dyn Fn(f64) -> Option<f64> + Sync),
) -> Option<(f64, f64)> {
    let (k, m) = scan
        .iter()
        .enumerate()
        .filter_map(|(k, m)| m.map(|m| (k, m)))
        .min_by(|a, b| (a.1 - want).abs().total_cmp(&(b.1 - want).abs()))?;
    let v = *grid.get(k)?;
    let lo = *grid.get(k.saturating_sub(1))?;
    let hi = *grid.get(k + 1).unwrap_or(&v);
    let miss = |x: f64| -> Result<f64, Infallible> {
        Ok(eval(x).map_or(f64::INFINITY, |m| (m - want).abs()))
    };
    let Ok(narrowed) = golden_section(miss, lo, hi, 0.0, 40);
    let x = narrowed.middle();
    match eval(x) {
        Some(mx) if (mx - want).abs() < (m - want).abs() => Some((x, mx)),
        _ => Some((v, m)),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::{by_adjust_name, BRAKE_VISCOUS, DEFLECTION, NOZZLE_DIAMETER, RADIUS};
    use crate::physics::fixtures::three_arm_rotor;

    fn rpm_of(d: &Design) -> f64 {
        rpm(solve(d).operating.expect("running").omega_rad_s())
    }

    #[test]
    fn deflection_for_a_lower_speed_round_trips() {
        let d = three_arm_rotor();
        let base = rpm_of(&d);
        let want = 0.6 * base;
        let r = target(&d, &DEFLECTION, Goal::Rpm(want)).unwrap();
        assert!(r.reachable, "{r:?}");
        assert!(r.value > r.start_value, "more deflection, less speed");
        let got = rpm_of(&r.design);
        assert!(((got - want) / want).abs() < 1e-3, "{got} vs {want}");
    }

    #[test]
    fn an_unreachable_speed_gives_the_nearest_and_says_so() {
        let d = three_arm_rotor();
        // Far more than even zero deflection can give with this brake.
        let r = target(&d, &DEFLECTION, Goal::Rpm(1e5)).unwrap();
        assert!(!r.reachable);
        let achieved = r.achieved.unwrap();
        assert!(achieved < 1e5);
        // Nearest: the fastest deflection, straight back (|δ| small).
        assert!(
            r.value.abs() < 3f64.to_radians(),
            "{}",
            r.value.to_degrees()
        );
        assert!(achieved >= rpm_of(&d));
    }

    #[test]
    fn of_two_branches_the_nearer_is_taken() {
        // Speed depends on the deflection through cos δ (drive torque
        // ∝ W cos δ, model.md M2), so a speed below the present one is met at
        // +δ* and at −δ*: a design at +10° gets +δ*, one at −10° gets −δ*.
        for sign in [1.0, -1.0] {
            let mut d = three_arm_rotor();
            for arm in &mut d.rotor.arms {
                arm.nozzle.deflection_rad = sign * 10f64.to_radians();
            }
            let want = 0.5 * rpm_of(&d);
            let r = target(&d, &DEFLECTION, Goal::Rpm(want)).unwrap();
            assert!(r.reachable, "{r:?}");
            assert!(
                r.value * sign > 10f64.to_radians(),
                "{}",
                r.value.to_degrees()
            );
            assert!(((rpm_of(&r.design) - want) / want).abs() < 1e-3);
        }
    }

    #[test]
    fn brake_for_a_target_speed() {
        let d = three_arm_rotor();
        let r = target(&d, &BRAKE_VISCOUS, Goal::Rpm(120.0)).unwrap();
        assert!(r.reachable, "{r:?}");
        assert!(r.value > d.friction.brake.viscous);
        assert!((rpm_of(&r.design) / 120.0 - 1.0).abs() < 1e-3);
    }

    #[test]
    fn throw_goal_uses_the_closure() {
        // A stand-in throw: proportional to arm radius, so the target 2× radius
        // is the radius that makes it 2× the present value.
        let d = three_arm_rotor();
        let throw = |d: &Design| Some(50.0 * d.rotor.arms[0].radius_m);
        let r = target(
            &d,
            &RADIUS,
            Goal::Throw {
                radius_m: 10.0,
                throw: &throw,
            },
        )
        .unwrap();
        assert!(r.reachable);
        assert!((r.value - 0.2).abs() < 1e-6, "{}", r.value);
        assert_eq!(Goal::Rpm(1.0).achieved_key(), "achieved_rpm");
    }

    #[test]
    fn names_and_bad_targets() {
        assert_eq!(by_adjust_name("brake"), Some(&BRAKE_VISCOUS));
        assert_eq!(by_adjust_name("nozzle"), Some(&NOZZLE_DIAMETER));
        let d = three_arm_rotor();
        assert!(matches!(
            target(&d, &NOZZLE_DIAMETER, Goal::Rpm(-3.0)),
            Err(TargetError::BadTarget(_))
        ));
    }
}
