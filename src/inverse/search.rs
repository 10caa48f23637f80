//! Design search: the values of a few free inputs, each within a range, that
//! meet a set of goals (speed band, least throw, most flow, least start
//! margin, least CU) and make one objective as large as it will go (CU at the
//! layout's spacing, throw, the largest square spacing at a CU goal, or the
//! start margin). model.md M10 gives the method and its rules.
//!
//! Method: multi-start Nelder–Mead (argmin) in the unit cube of the free
//! ranges. Starts are the design's own values (clamped into the ranges) and a
//! Latin hypercube drawn with a fixed seed, so a search is repeatable. The
//! starts run in parallel (rayon). Constraints are ranked feasibility-first:
//! any design that meets every goal ranks above any that does not; among
//! those that meet them, a larger objective ranks higher; among those that do
//! not, a smaller summed relative shortfall ranks higher. The cost handed to
//! Nelder–Mead encodes that ranking (`−objective` when feasible,
//! `PENALTY + shortfall` otherwise), plus a pull back into the ranges for a
//! simplex that steps outside them.
//!
//! Coarse, then fine: in wind, while the optimiser runs, each candidate's CU
//! comes from a coarse 2-D pattern; the best few candidates are then
//! evaluated again with the full model, which picks the answer, and every
//! reported figure (best, runners-up, closest approach, sensitivity) comes
//! from the full model.
//!
//! Pure: no terminal, no files. Free inputs are catalogue inputs with a
//! [`crate::catalogue::Vary`] rule and take their values through
//! [`Input::vary_to`], as sweeps do (per-arm inputs move all arms together).

mod evaluate;
mod finish;
mod goals;

use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::Mutex;

use argmin::core::{Executor, State};
use argmin::solver::neldermead::NelderMead;
use rayon::prelude::*;

use crate::physics::design::Design;
use evaluate::{Cost, Fidelity, Needs, Problem};
use finish::{binding, closest, finish, rank, sensitivity, Finish};
use goals::check;
pub use goals::{
    Closest, Evaluation, Free, GoalKind, Goals, Objective, SearchError, SearchOptions,
    SearchResult, Sensitivity, Shortfall,
};

/// A small deterministic generator (SplitMix64) for the Latin hypercube.
struct SplitMix(u64);

impl SplitMix {
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in [0, 1).
    fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }

    fn below(&mut self, n: usize) -> usize {
        (self.unit() * n as f64) as usize % n.max(1)
    }
}

/// `count` points of a Latin hypercube in `[0, 1)^dims`: each axis cut into
/// `count` equal strata, each stratum used once per axis.
pub fn latin_hypercube(count: usize, dims: usize, seed: u64) -> Vec<Vec<f64>> {
    let mut rng = SplitMix(seed);
    let mut points = vec![vec![0.0; dims]; count];
    for axis in 0..dims {
        let mut strata: Vec<usize> = (0..count).collect();
        // Fisher–Yates shuffle.
        for i in (1..count).rev() {
            let j = rng.below(i + 1);
            strata.swap(i, j);
        }
        for (point, stratum) in points.iter_mut().zip(strata) {
            if let Some(x) = point.get_mut(axis) {
                *x = (stratum as f64 + rng.unit()) / count as f64;
            }
        }
    }
    points
}

/// A starting simplex around `u0`: each axis stepped by 0.2 of its range
/// (inward when the step would leave the range).
fn simplex(u0: &[f64]) -> Vec<Vec<f64>> {
    let mut s = vec![u0.to_vec()];
    for i in 0..u0.len() {
        let mut v = u0.to_vec();
        if let Some(x) = v.get_mut(i) {
            *x = if *x + 0.2 <= 1.0 { *x + 0.2 } else { *x - 0.2 };
        }
        s.push(v);
    }
    s
}

fn run_start(problem: &Problem<'_>, u0: Vec<f64>, max_iters: u64) -> Result<(), SearchError> {
    let solver = NelderMead::new(simplex(&u0))
        .with_sd_tolerance(1e-4)
        .map_err(|e| SearchError::Optimiser(e.to_string()))?;
    let result = Executor::new(Cost { problem }, solver)
        .configure(|state| state.max_iters(max_iters))
        .run()
        .map_err(|e| SearchError::Optimiser(e.to_string()))?;
    // The best point is in the archive already; the state is read only to
    // make sure argmin ended with one.
    let _ = result.state().get_best_param();
    Ok(())
}

/// Run a design search. `progress(done, total)` is called after each start
/// finishes (and once more after the sensitivity table), from any worker.
pub fn search(
    design: &Design,
    free: &[Free],
    goals: &Goals,
    objective: Objective,
    options: &SearchOptions,
    progress: &(dyn Fn(usize, usize) + Sync),
) -> Result<SearchResult, SearchError> {
    let never = AtomicBool::new(false);
    search_until(design, free, goals, objective, options, progress, &never)
}

/// [`search`] that a caller on another thread can stop: once `stop` is set,
/// every start ends at its next candidate and the search returns
/// [`SearchError::Stopped`] instead of a result.
pub fn search_until(
    design: &Design,
    free: &[Free],
    goals: &Goals,
    objective: Objective,
    options: &SearchOptions,
    progress: &(dyn Fn(usize, usize) + Sync),
    stop: &AtomicBool,
) -> Result<SearchResult, SearchError> {
    let mut goals = *goals;
    if objective == Objective::Spacing && goals.cu_percent.is_none() {
        goals.cu_percent = Some(85.0);
    }
    check(design, free, &goals, objective)?;
    let needs = Needs {
        layout_cu: objective == Objective::Cu
            || (goals.cu_percent.is_some() && objective != Objective::Spacing),
        spacing_goal: (objective == Objective::Spacing)
            .then_some(goals.cu_percent)
            .flatten(),
    };
    let problem = Problem {
        design,
        free,
        goals,
        objective,
        needs,
        screen: if options.screen {
            Fidelity::Screen
        } else {
            Fidelity::Full
        },
        archive: Mutex::new(Vec::new()),
        count: AtomicUsize::new(0),
        stop,
    };
    // Starts: the design's own values (clamped into the ranges), then a
    // Latin hypercube.
    let own: Vec<f64> = free
        .iter()
        .map(|f| {
            f.input
                .varied_value(design)
                .unwrap_or(0.5 * (f.from + f.to))
        })
        .collect();
    let mut starts = vec![problem.unit(&own)];
    starts.extend(latin_hypercube(
        options.starts.saturating_sub(1),
        free.len(),
        options.seed,
    ));
    let total = starts.len() + 1;
    let done = AtomicUsize::new(0);
    let ran = starts
        .into_par_iter()
        .map(|u0| {
            let r = run_start(&problem, u0, options.max_iters);
            progress(done.fetch_add(1, Ordering::Relaxed) + 1, total);
            r
        })
        .collect::<Result<Vec<()>, SearchError>>();
    if problem.stopped() {
        return Err(SearchError::Stopped);
    }
    ran?;
    let mut ranked = problem
        .archive
        .lock()
        .map(|mut a| std::mem::take(&mut *a))
        .unwrap_or_default();
    rank(&mut ranked);

    // Every figure from here on comes from the full model.
    let Finish {
        best,
        runners_up,
        checked,
    } = finish(&problem, &ranked, &own, options);
    let binding = binding(&best);
    let at_range_end = free
        .iter()
        .zip(problem.unit(&best.values))
        .filter(|(_, u)| !(0.005..=0.995).contains(u))
        .map(|(f, _)| f.input)
        .collect();
    let closest = closest(&problem, &best, &ranked, &checked);
    if problem.stopped() {
        return Err(SearchError::Stopped);
    }
    let sensitivity = sensitivity(&problem, free, &best, options.perturbation);
    progress(total, total);

    let mut best_design = design.clone();
    for (f, &v) in free.iter().zip(&best.values) {
        f.input.vary_to(&mut best_design, v)?;
    }
    Ok(SearchResult {
        free: free.to_vec(),
        objective,
        best,
        design: best_design,
        runners_up,
        binding,
        at_range_end,
        closest,
        sensitivity,
        evaluations: problem.count.load(Ordering::Relaxed),
    })
}

#[cfg(test)]
#[path = "search_tests.rs"]
mod tests;
